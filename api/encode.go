package api

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"log/slog"
	"mime"
	"net/http"
	"strconv"
	"strings"
	"sync"
	"unicode/utf8"

	"github.com/go-chi/chi/v5"

	"residuum/assess"
)

// MaxBodyBytes is the largest request body the API reads (1 MiB); a larger
// one is answered with 413.
const MaxBodyBytes = 1 << 20

// readBody returns the request body after checking its media type
// (application/json, any charset parameter ignored) and its size. An empty
// body is returned as nil without a media-type check, so that handlers
// whose body is optional can accept a bare POST.
func readBody(w http.ResponseWriter, r *http.Request) ([]byte, error) {
	body, err := io.ReadAll(http.MaxBytesReader(w, r.Body, MaxBodyBytes))
	if err != nil {
		var big *http.MaxBytesError
		if errors.As(err, &big) {
			return nil, err
		}
		return nil, &badRequest{Msg: "the request body could not be read"}
	}
	if len(bytes.TrimSpace(body)) == 0 {
		return nil, nil
	}
	if !isJSON(r.Header.Get("Content-Type")) {
		return nil, fmt.Errorf("content type %q: %w", r.Header.Get("Content-Type"), errUnsupportedMedia)
	}
	return body, nil
}

// isJSON reports whether a Content-Type header names application/json.
func isJSON(contentType string) bool {
	mt, _, err := mime.ParseMediaType(contentType)
	return err == nil && mt == "application/json"
}

// decode reads a required JSON body into a value of type T, rejecting
// unknown fields and trailing data. Syntax and type errors are reported as
// *badRequest naming the field where the decoder knows it.
func decode[T any](w http.ResponseWriter, r *http.Request) (T, error) {
	var v T
	body, err := readBody(w, r)
	if err != nil {
		return v, err
	}
	if body == nil {
		return v, &badRequest{Msg: "a JSON request body is required"}
	}
	return v, unmarshalStrict(body, &v)
}

// unmarshalStrict decodes one JSON value from data into v, rejecting unknown
// fields and anything after the value.
func unmarshalStrict(data []byte, v any) error {
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.DisallowUnknownFields()
	if err := dec.Decode(v); err != nil {
		return jsonError(err)
	}
	if dec.More() {
		return &badRequest{Msg: "the body must hold a single JSON value"}
	}
	if _, err := dec.Token(); err != io.EOF {
		return &badRequest{Msg: "the body must hold a single JSON value"}
	}
	return nil
}

// jsonError turns a json decoding error into a *badRequest that names the
// field, without echoing the input back.
func jsonError(err error) error {
	var (
		syn *json.SyntaxError
		typ *json.UnmarshalTypeError
	)
	switch {
	case errors.As(err, &syn):
		return &badRequest{Msg: fmt.Sprintf("malformed JSON at byte %d", syn.Offset)}
	case errors.As(err, &typ):
		field := typ.Field
		return &badRequest{Field: field, Msg: fmt.Sprintf("must be a JSON %s, got %s", jsonKind(typ.Type.Kind().String()), typ.Value)}
	case errors.Is(err, io.EOF), errors.Is(err, io.ErrUnexpectedEOF):
		return &badRequest{Msg: "the JSON body ends too early"}
	case strings.HasPrefix(err.Error(), "json: unknown field "):
		name := strings.Trim(strings.TrimPrefix(err.Error(), "json: unknown field "), `"`)
		return &badRequest{Field: name, Msg: "is not a known field"}
	default:
		return &badRequest{Msg: "the body is not valid JSON for this request"}
	}
}

// jsonKind names a Go kind as the JSON type a client should send.
func jsonKind(k string) string {
	switch k {
	case "string":
		return "string"
	case "bool":
		return "boolean"
	case "struct", "map":
		return "object"
	case "slice", "array":
		return "array"
	default:
		return "number"
	}
}

// marshal encodes v as JSON followed by a newline, without HTML escaping so
// that text like "<" stays readable.
func marshal(v any) ([]byte, error) {
	var buf bytes.Buffer
	enc := json.NewEncoder(&buf)
	enc.SetEscapeHTML(false)
	if err := enc.Encode(v); err != nil {
		return nil, err
	}
	return buf.Bytes(), nil
}

// encode writes v as JSON with the given status. It encodes into a buffer
// first, so an encoding failure becomes a 500 rather than half a body.
func encode(w http.ResponseWriter, r *http.Request, log *slog.Logger, status int, v any) {
	body, err := marshal(v)
	if err != nil {
		serveError(w, r, log, fmt.Errorf("encode response: %w", err))
		return
	}
	writeJSON(w, status, body)
}

// bufPool holds the byte slices that hand-written encoders (the member
// list) append a response body to; a slice goes back once the body has been
// written. Only the buffer is reused, never its contents.
var bufPool = sync.Pool{New: func() any { b := make([]byte, 0, 64<<10); return &b }}

// maxPooledBuf is the largest buffer put back in bufPool, so that one huge
// answer does not pin its memory for good.
const maxPooledBuf = 1 << 20

// getBuf takes an empty buffer from bufPool; give it back with putBuf.
func getBuf() *[]byte {
	b := bufPool.Get().(*[]byte)
	*b = (*b)[:0]
	return b
}

// putBuf returns a buffer to bufPool unless it grew past maxPooledBuf.
func putBuf(b *[]byte) {
	if cap(*b) <= maxPooledBuf {
		bufPool.Put(b)
	}
}

// hexDigits are the lower-case hex digits of \u00XX escapes.
const hexDigits = "0123456789abcdef"

// appendJSONString appends s as a JSON string exactly as encoding/json
// writes it with SetEscapeHTML(false) (see marshal): '"' and '\\' escaped
// with a backslash; \b, \f, \n, \r and \t by name; other bytes below 0x20 as
// \u00XX; U+2028 and U+2029 as \u2028 and \u2029; each byte of invalid
// UTF-8 as \ufffd; everything else, including <, > and &, as is.
// TestAppendJSONString checks it against encoding/json.
func appendJSONString(b []byte, s string) []byte {
	b = append(b, '"')
	start := 0 // s[start:i] is pending, to be copied unchanged
	for i := 0; i < len(s); {
		c := s[i]
		if c < utf8.RuneSelf {
			if c >= 0x20 && c != '"' && c != '\\' {
				i++
				continue
			}
			b = append(b, s[start:i]...)
			switch c {
			case '"', '\\':
				b = append(b, '\\', c)
			case '\b':
				b = append(b, '\\', 'b')
			case '\f':
				b = append(b, '\\', 'f')
			case '\n':
				b = append(b, '\\', 'n')
			case '\r':
				b = append(b, '\\', 'r')
			case '\t':
				b = append(b, '\\', 't')
			default:
				b = append(b, '\\', 'u', '0', '0', hexDigits[c>>4], hexDigits[c&0xf])
			}
			i++
			start = i
			continue
		}
		r, size := utf8.DecodeRuneInString(s[i:])
		switch {
		case r == utf8.RuneError && size == 1:
			b = append(b, s[start:i]...)
			b = append(b, `\ufffd`...)
		case r == '\u2028' || r == '\u2029':
			b = append(b, s[start:i]...)
			b = append(b, '\\', 'u', '2', '0', '2', hexDigits[r&0xf])
		default:
			i += size
			continue
		}
		i += size
		start = i
	}
	b = append(b, s[start:]...)
	return append(b, '"')
}

// writeJSON sends an already encoded JSON body.
func writeJSON(w http.ResponseWriter, status int, body []byte) {
	w.Header().Set("Content-Type", "application/json")
	w.WriteHeader(status)
	_, _ = w.Write(body)
}

// pathID reads a positive integer path parameter.
func pathID(r *http.Request, name string) (int64, error) {
	s := chi.URLParam(r, name)
	id, err := strconv.ParseInt(s, 10, 64)
	if err != nil || id < 1 {
		return 0, &badRequest{Field: name, Msg: fmt.Sprintf("must be a whole number ≥ 1, got %q", s)}
	}
	return id, nil
}

// page reads the limit and after_id query parameters of a list.
func page(r *http.Request) (assess.Page, error) {
	var pg assess.Page
	q := r.URL.Query()
	if s := q.Get("limit"); s != "" {
		n, err := strconv.Atoi(s)
		if err != nil || n < 1 {
			return pg, &badRequest{Field: "limit", Msg: fmt.Sprintf("must be a whole number 1–%d, got %q", assess.MaxPageLimit, s)}
		}
		pg.Limit = n
	}
	if s := q.Get("after_id"); s != "" {
		n, err := strconv.ParseInt(s, 10, 64)
		if err != nil {
			return pg, &badRequest{Field: "after_id", Msg: fmt.Sprintf("must be a whole number ≥ 0, got %q", s)}
		}
		pg.AfterID = n
	}
	pg, err := pg.Normalize()
	var inv *assess.InvalidError
	if errors.As(err, &inv) && len(inv.Problems) > 0 {
		return pg, &badRequest{Field: inv.Problems[0].Field, Msg: inv.Problems[0].Message}
	}
	return pg, err
}

// list is the envelope of every list answer. NextAfterID is the after_id
// that fetches the next page, or null when this page is the last one.
type list[T any] struct {
	Items       []T    `json:"items"`
	NextAfterID *int64 `json:"next_after_id"`
}

// newList wraps one page of items; a full page may be followed by more.
func newList[T any](items []T, pg assess.Page, id func(T) int64) list[T] {
	l := list[T]{Items: items}
	if l.Items == nil {
		l.Items = []T{}
	}
	if len(items) > 0 && len(items) == pg.Limit {
		next := id(items[len(items)-1])
		l.NextAfterID = &next
	}
	return l
}
