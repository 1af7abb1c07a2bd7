package api

import (
	"bytes"
	_ "embed"
	"encoding/json"
	"fmt"
	"net/http"

	"gopkg.in/yaml.v3"
)

// openAPIYAML is the OpenAPI 3.1 description of every route, written in
// YAML for people; it is served as JSON. The tests validate the handlers'
// requests and answers against it.
//
//go:embed openapi.yaml
var openAPIYAML []byte

// openAPIJSON is openAPIYAML converted once, at start-up.
var openAPIJSON = mustYAMLToJSON(openAPIYAML)

// OpenAPI returns the OpenAPI 3.1 document as JSON.
func OpenAPI() []byte { return bytes.Clone(openAPIJSON) }

// mustYAMLToJSON converts the embedded document; it panics only if the file
// compiled into the program is broken, which the tests catch.
func mustYAMLToJSON(y []byte) []byte {
	var doc any
	if err := yaml.Unmarshal(y, &doc); err != nil {
		panic(fmt.Sprintf("api: openapi.yaml: %v", err))
	}
	j, err := json.MarshalIndent(doc, "", "  ")
	if err != nil {
		panic(fmt.Sprintf("api: openapi.yaml as JSON: %v", err))
	}
	return append(j, '\n')
}

// handleOpenAPI serves the OpenAPI document.
func handleOpenAPI() http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		w.Header().Set("Cache-Control", "no-cache")
		writeJSON(w, http.StatusOK, openAPIJSON)
	})
}
