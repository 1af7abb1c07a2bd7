package api

import (
	"net/http"
	"slices"
	"strings"
	"testing"

	"github.com/go-chi/chi/v5"
)

// TestOpenAPICoversEveryRoute walks the router and the document: every
// route has an operation and every operation a route, so the document
// cannot drift from the code.
func TestOpenAPICoversEveryRoute(t *testing.T) {
	t.Parallel()
	doc, _ := loadSpec(t)
	var inCode []string
	r := newRouter(Deps{Fallback: http.NotFoundHandler()})
	err := chi.Walk(r, func(method, route string, _ http.Handler, _ ...func(http.Handler) http.Handler) error {
		route = strings.TrimSuffix(route, "/")
		if route == "" || strings.HasSuffix(route, "/*") {
			return nil // the fallback (web pages), not part of the API
		}
		inCode = append(inCode, method+" "+route)
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	var inDoc []string
	for path, item := range doc.Paths.Map() {
		for method := range item.Operations() {
			inDoc = append(inDoc, method+" "+path)
		}
	}
	slices.Sort(inCode)
	slices.Sort(inDoc)
	for _, op := range inCode {
		if !slices.Contains(inDoc, op) {
			t.Errorf("route %s is not in openapi.yaml", op)
		}
	}
	for _, op := range inDoc {
		if !slices.Contains(inCode, op) {
			t.Errorf("openapi.yaml documents %s, which no route serves", op)
		}
	}
	if len(inCode) < 19 {
		t.Errorf("walked %d routes, want at least the 19 of routes.go: %v", len(inCode), inCode)
	}
}

// TestOpenAPIIs31 checks that the served document is OpenAPI 3.1 and that
// every operation has an id and documents its errors as problem+json.
func TestOpenAPIIs31(t *testing.T) {
	t.Parallel()
	doc, _ := loadSpec(t)
	if !doc.IsOpenAPI31OrLater() || !strings.HasPrefix(doc.OpenAPI, "3.1") {
		t.Errorf("openapi = %q, want 3.1.x", doc.OpenAPI)
	}
	for path, item := range doc.Paths.Map() {
		for method, op := range item.Operations() {
			if op.OperationID == "" {
				t.Errorf("%s %s has no operationId", method, path)
			}
			for code, ref := range op.Responses.Map() {
				if code[0] != '4' && code[0] != '5' {
					continue
				}
				if ref.Value == nil || ref.Value.Content.Get("application/problem+json") == nil {
					t.Errorf("%s %s %s is not documented as application/problem+json", method, path, code)
				}
			}
		}
	}
}
