package assess

import (
	"encoding/json"
	"errors"
	"fmt"
	"strings"
	"testing"
)

// The limits checked here are the ones documented on the store types
// (assess/store.go); they are our own choices, not from a standard.

func TestInvalidError(t *testing.T) {
	var prob InvalidError
	if err := prob.Err(); err != nil {
		t.Fatalf("empty InvalidError.Err() = %v, want nil", err)
	}
	prob.Add("name", "is required (1–200 characters)")
	prob.Addf("member.layers[0].cover_mm", "must be 10–200 mm, got %g", 4.0)
	err := fmt.Errorf("create project: %w", prob.Err())
	if !errors.Is(err, ErrInvalid) {
		t.Errorf("errors.Is(%v, ErrInvalid) = false", err)
	}
	if errors.Is(err, ErrNotFound) || errors.Is(err, ErrConflict) || errors.Is(err, ErrUnavailable) {
		t.Errorf("%v matches another kind", err)
	}
	var ie *InvalidError
	if !errors.As(err, &ie) || len(ie.Problems) != 2 {
		t.Fatalf("errors.As: %v, %+v", err, ie)
	}
	want := "create project: invalid input: name: is required (1–200 characters); member.layers[0].cover_mm: must be 10–200 mm, got 4"
	if got := err.Error(); got != want {
		t.Errorf("Error() = %q, want %q", got, want)
	}
	b, err := json.Marshal(ie.Problems[1])
	if err != nil {
		t.Fatal(err)
	}
	if got, want := string(b), `{"field":"member.layers[0].cover_mm","message":"must be 10–200 mm, got 4"}`; got != want {
		t.Errorf("Problem JSON = %s, want %s", got, want)
	}
}

func TestPageNormalize(t *testing.T) {
	tests := []struct {
		in      Page
		want    Page
		problem string // field of the expected problem, "" for valid
	}{
		{Page{}, Page{Limit: DefaultPageLimit}, ""},
		{Page{Limit: 1}, Page{Limit: 1}, ""},
		{Page{Limit: 200, AfterID: 9}, Page{Limit: 200, AfterID: 9}, ""},
		{Page{Limit: 10, Offset: 30}, Page{Limit: 10, Offset: 30}, ""},
		{Page{Limit: 201}, Page{}, "limit"},
		{Page{Limit: -1}, Page{}, "limit"},
		{Page{AfterID: -2}, Page{}, "after_id"},
		{Page{Offset: -1}, Page{}, "offset"},
		{Page{AfterID: 1, Offset: 1}, Page{}, "offset"},
	}
	for _, tt := range tests {
		got, err := tt.in.Normalize()
		if tt.problem == "" {
			if err != nil || got != tt.want {
				t.Errorf("%+v.Normalize() = %+v, %v; want %+v, nil", tt.in, got, err, tt.want)
			}
			continue
		}
		var ie *InvalidError
		if !errors.As(err, &ie) || len(ie.Problems) != 1 || ie.Problems[0].Field != tt.problem {
			t.Errorf("%+v.Normalize() error = %v, want one problem for %q", tt.in, err, tt.problem)
		}
	}
}

func TestRecordValidate(t *testing.T) {
	obj := json.RawMessage(`{"a":1}`)
	ratio := func(v float64) *float64 { return &v }
	tests := []struct {
		name   string
		v      interface{ Validate() error }
		fields []string // expected problem fields, in order; none = valid
	}{
		{"project ok", &Project{Name: "P"}, nil},
		{"project 200 multibyte characters", &Project{Name: strings.Repeat("é", 200)}, nil},
		{"project 201 characters", &Project{Name: strings.Repeat("é", 201)}, []string{"name"}},
		{"project empty, long notes", &Project{Notes: strings.Repeat("n", 10001)}, []string{"name", "notes"}},
		{"member ok", &MemberRecord{Label: "B1", Kind: MemberKindSlab, Input: obj}, nil},
		{"member input with spaces", &MemberRecord{Label: "B1", Kind: MemberKindBeam, Input: json.RawMessage(" \n{}")}, nil},
		{"member bad", &MemberRecord{Kind: "column", Input: json.RawMessage(`[]`)}, []string{"label", "kind", "input"}},
		{"assessment ok", &AssessmentRecord{Input: obj, Result: obj, MethodVersion: "1", SaggingRatio: ratio(1.2)}, nil},
		{"assessment ratio 0 and 100", &AssessmentRecord{Input: obj, Result: obj, MethodVersion: "1",
			SaggingRatio: ratio(0), HoggingRatio: ratio(100)}, nil},
		{"assessment bad", &AssessmentRecord{Input: obj, Result: json.RawMessage(`{`), State: "final",
			HoggingRatio: ratio(100.5)}, []string{"result", "method_version", "state", "hogging_ratio"}},
	}
	for _, tt := range tests {
		err := tt.v.Validate()
		var got []string
		var ie *InvalidError
		if errors.As(err, &ie) {
			for _, p := range ie.Problems {
				got = append(got, p.Field)
			}
		} else if err != nil {
			t.Errorf("%s: error %v is not an *InvalidError", tt.name, err)
		}
		if strings.Join(got, ",") != strings.Join(tt.fields, ",") {
			t.Errorf("%s: problems for %v, want %v (%v)", tt.name, got, tt.fields, err)
		}
	}
}
