package api

import (
	"fmt"
	"net/http"
	"strings"
	"testing"

	"residuum/assess"
)

// TestCreateProjectContract is a fixed point of the service contract:
// POST /api/v1/projects with {"name": ...} answers 201 with the project,
// including its id, and GET /api/v1/projects lists it.
func TestCreateProjectContract(t *testing.T) {
	t.Parallel()
	e := newEnv(t)
	res := e.do("POST", "/api/v1/projects", `{"name": "Depot fire"}`)
	if res.Code != http.StatusCreated {
		t.Fatalf("POST /api/v1/projects = %d %s, want 201", res.Code, res.Body)
	}
	var p assess.Project
	res.decode(t, &p)
	if p.ID < 1 || p.Name != "Depot fire" || p.Version != 1 {
		t.Errorf("created project = %+v, want id ≥ 1, name %q, version 1", p, "Depot fire")
	}
	if got, want := res.Header.Get("Location"), fmt.Sprintf("/api/v1/projects/%d", p.ID); got != want {
		t.Errorf("Location = %q, want %q", got, want)
	}
	if got, want := res.Header.Get("ETag"), `"v1"`; got != want {
		t.Errorf("ETag = %q, want %q", got, want)
	}
	res = e.do("GET", "/api/v1/projects", nil)
	var l list[assess.Project]
	res.decode(t, &l)
	if res.Code != http.StatusOK || len(l.Items) != 1 || l.Items[0].ID != p.ID || l.Items[0].Name != p.Name {
		t.Errorf("GET /api/v1/projects = %d %+v, want the one project", res.Code, l)
	}
	res = e.do("GET", projectPath(p.ID), nil)
	if res.Code != http.StatusOK || res.Header.Get("ETag") != `"v1"` {
		t.Errorf("GET project = %d ETag %q, want 200 \"v1\"", res.Code, res.Header.Get("ETag"))
	}
}

// TestProjectPagination: pages in creation order, next_after_id chains them.
func TestProjectPagination(t *testing.T) {
	t.Parallel()
	e := newEnv(t)
	var ids []int64
	for i := range 5 {
		ids = append(ids, e.createProject(fmt.Sprintf("P%d", i)))
	}
	var got []int64
	path := "/api/v1/projects?limit=2"
	for pages := 0; ; pages++ {
		if pages > 5 {
			t.Fatal("pagination does not end")
		}
		res := e.do("GET", path, nil)
		var l list[assess.Project]
		res.decode(t, &l)
		for _, p := range l.Items {
			got = append(got, p.ID)
		}
		if l.NextAfterID == nil {
			break
		}
		path = fmt.Sprintf("/api/v1/projects?limit=2&after_id=%d", *l.NextAfterID)
	}
	if fmt.Sprint(got) != fmt.Sprint(ids) {
		t.Errorf("paged ids = %v, want %v (creation order, each once)", got, ids)
	}
	for _, q := range []string{"limit=0", "limit=201", "limit=x", "after_id=-1", "deleted=maybe"} {
		res := e.do("GET", "/api/v1/projects?"+q, nil)
		if res.Code != http.StatusBadRequest {
			t.Errorf("GET /api/v1/projects?%s = %d, want 400", q, res.Code)
			continue
		}
		if p := res.problem(t); len(p.Errors) != 1 || p.Errors[0].Field == "" {
			t.Errorf("?%s: errors = %+v, want one naming the parameter", q, p.Errors)
		}
	}
}

func TestProjectUpdateAndDelete(t *testing.T) {
	t.Parallel()
	e := newEnv(t)
	id := e.createProject("Warehouse")
	path := projectPath(id)
	body := map[string]string{"name": "Warehouse B", "site_address": "1 Made-up Road"}

	if res := e.do("PUT", path, body); res.Code != http.StatusPreconditionRequired {
		t.Errorf("PUT without If-Match = %d, want 428", res.Code)
	} else {
		res.problem(t)
	}
	if res := e.do("PUT", path, body, header("If-Match", `"v7"`)); res.Code != http.StatusPreconditionFailed {
		t.Errorf("PUT with stale If-Match = %d, want 412", res.Code)
	}
	res := e.do("PUT", path, body, header("If-Match", `"v1"`))
	if res.Code != http.StatusOK || res.Header.Get("ETag") != `"v2"` {
		t.Fatalf("PUT with If-Match v1 = %d %s ETag %q, want 200 \"v2\"", res.Code, res.Body, res.Header.Get("ETag"))
	}
	var p assess.Project
	res.decode(t, &p)
	if p.Name != "Warehouse B" || p.SiteAddress != "1 Made-up Road" || p.Version != 2 {
		t.Errorf("updated project = %+v", p)
	}
	if res := e.do("PUT", path, body, header("If-Match", `"v1"`)); res.Code != http.StatusPreconditionFailed {
		t.Errorf("second PUT with the old If-Match = %d, want 412", res.Code)
	}
	if res := e.do("PUT", path, map[string]string{"name": ""}, header("If-Match", "*")); res.Code != http.StatusUnprocessableEntity {
		t.Errorf("PUT with an empty name = %d, want 422", res.Code)
	} else if pr := res.problem(t); len(pr.Errors) == 0 || pr.Errors[0].Field != "name" {
		t.Errorf("PUT empty name: errors = %+v, want field name", pr.Errors)
	}
	if res := e.do("DELETE", path, nil, header("If-Match", `"v1"`)); res.Code != http.StatusPreconditionFailed {
		t.Errorf("DELETE with stale If-Match = %d, want 412", res.Code)
	}
	if res := e.do("DELETE", path, nil); res.Code != http.StatusNoContent {
		t.Errorf("DELETE = %d %s, want 204", res.Code, res.Body)
	}
	if res := e.do("GET", path, nil); res.Code != http.StatusNotFound {
		t.Errorf("GET after DELETE = %d, want 404", res.Code)
	} else {
		res.problem(t)
	}
}

// TestRequestErrors covers the generic request failures: each is a problem
// document with the documented status.
func TestRequestErrors(t *testing.T) {
	t.Parallel()
	e := newEnv(t)
	id := e.createProject("Errors")
	big := `{"name": "` + strings.Repeat("x", MaxBodyBytes) + `"}`
	tests := []struct {
		name       string
		method     string
		path       string
		body       any
		opts       []reqOpt
		wantStatus int
		wantField  string
	}{
		{"malformed JSON is 400", "POST", "/api/v1/projects", `{"name": `, nil, 400, ""},
		{"an unknown field is 400 naming it", "POST", "/api/v1/projects", `{"name": "a", "colour": "red"}`, nil, 400, "colour"},
		{"a wrong type is 400 naming the field", "POST", "/api/v1/projects", `{"name": 5}`, nil, 400, "name"},
		{"two JSON values are 400", "POST", "/api/v1/projects", `{"name": "a"} {}`, nil, 400, ""},
		{"a missing body is 400", "POST", "/api/v1/projects", nil, nil, 400, ""},
		{"a name too long is 422", "POST", "/api/v1/projects", map[string]string{"name": strings.Repeat("n", 201)}, nil, 422, "name"},
		{"text/plain is 415", "POST", "/api/v1/projects", `{"name": "a"}`, []reqOpt{header("Content-Type", "text/plain")}, 415, ""},
		{"a form is 415", "POST", "/api/v1/projects", `name=a`, []reqOpt{header("Content-Type", "application/x-www-form-urlencoded")}, 415, ""},
		{"more than 1 MiB is 413", "POST", "/api/v1/projects", big, nil, 413, ""},
		{"an id that is not a number is 400", "GET", "/api/v1/projects/abc", nil, nil, 400, "projectID"},
		{"id 0 is 400", "GET", "/api/v1/members/0", nil, nil, 400, "memberID"},
		{"an unknown project is 404", "GET", "/api/v1/projects/999999", nil, nil, 404, ""},
		{"members of an unknown project is 404", "GET", "/api/v1/projects/999999/members", nil, nil, 404, ""},
		{"an unknown member is 404", "GET", "/api/v1/members/424242", nil, nil, 404, ""},
		{"an unknown assessment is 404", "GET", "/api/v1/assessments/424242", nil, nil, 404, ""},
		{"an unknown route is 404", "GET", "/api/v1/nothing-here", nil, nil, 404, ""},
		{"a wrong method is 405", "PATCH", projectPath(id), `{}`, nil, 405, ""},
		{"a weak If-Match is 412", "PUT", projectPath(id), `{"name": "a"}`, []reqOpt{header("If-Match", `W/"v1"`)}, 412, ""},
		{"a foreign If-Match is 412", "PUT", projectPath(id), `{"name": "a"}`, []reqOpt{header("If-Match", `"abc"`)}, 412, ""},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			res := e.do(tt.method, tt.path, tt.body, tt.opts...)
			if res.Code != tt.wantStatus {
				t.Fatalf("%s %s = %d %.300s, want %d", tt.method, tt.path, res.Code, res.Body, tt.wantStatus)
			}
			p := res.problem(t)
			if tt.wantField != "" && (len(p.Errors) == 0 || p.Errors[0].Field != tt.wantField) {
				t.Errorf("errors = %+v, want the first naming %q", p.Errors, tt.wantField)
			}
			if res.contains(strings.Repeat("x", 100)) {
				t.Error("the problem echoes the request body")
			}
		})
	}
}
