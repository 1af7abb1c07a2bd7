package assess

import (
	"errors"
	"fmt"
	"strings"
)

// Error kinds shared by the whole application. Every layer wraps them with
// context (fmt.Errorf("get member %d: %w", id, ErrNotFound)); the HTTP faces
// map them to a status with errors.Is and never show the text of any other
// error to a user.
var (
	// ErrNotFound means the requested project, member or assessment does not
	// exist (HTTP 404).
	ErrNotFound = errors.New("not found")

	// ErrConflict means the request clashes with the stored state: a stale
	// version, an already issued revision, or a delete refused because issued
	// revisions depend on the record (HTTP 409).
	ErrConflict = errors.New("conflict")

	// ErrInvalid means the input failed validation (HTTP 400 or 422). Errors
	// of type *InvalidError match it with errors.Is and list the problems.
	ErrInvalid = errors.New("invalid input")

	// ErrUnavailable means the store cannot be reached right now (database
	// down, network failure, database locked beyond the busy timeout); the
	// request may succeed later (HTTP 503).
	ErrUnavailable = errors.New("store unavailable")
)

// Problem is one validation failure: the JSON path of the offending field
// (for example "member.layers[0].cover_mm" or "name") and a message that
// says what is accepted (for example "must be 10–200 mm, got 4").
type Problem struct {
	Field   string `json:"field"`
	Message string `json:"message"`
}

// InvalidError lists every problem found in one input. It matches
// errors.Is(err, ErrInvalid). The zero value is an empty list; use Add or
// Addf to collect problems and Err to return it only if it is not empty.
type InvalidError struct {
	Problems []Problem
}

// Error lists the problems as "invalid input: field: message; field: message".
func (e *InvalidError) Error() string {
	if e == nil || len(e.Problems) == 0 {
		return ErrInvalid.Error()
	}
	var b strings.Builder
	b.WriteString(ErrInvalid.Error())
	b.WriteString(": ")
	for i, p := range e.Problems {
		if i > 0 {
			b.WriteString("; ")
		}
		if p.Field != "" {
			b.WriteString(p.Field)
			b.WriteString(": ")
		}
		b.WriteString(p.Message)
	}
	return b.String()
}

// Is reports whether target is ErrInvalid, so that errors.Is(err, ErrInvalid)
// holds for every *InvalidError.
func (e *InvalidError) Is(target error) bool { return target == ErrInvalid }

// Add appends a problem for field with the given message.
func (e *InvalidError) Add(field, message string) {
	e.Problems = append(e.Problems, Problem{Field: field, Message: message})
}

// Addf appends a problem for field with a message formatted as by fmt.Sprintf.
func (e *InvalidError) Addf(field, format string, args ...any) {
	e.Add(field, fmt.Sprintf(format, args...))
}

// Err returns e if it holds at least one problem and nil otherwise, so a
// validator can end with "return problems.Err()".
func (e *InvalidError) Err() error {
	if e == nil || len(e.Problems) == 0 {
		return nil
	}
	return e
}
