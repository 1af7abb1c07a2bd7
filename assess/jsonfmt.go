package assess

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
)

// MarshalJSON returns the canonical JSON of a result, newline-terminated,
// with no HTML escaping: objects are indented by two spaces, and lists of
// numbers (or of short lists of numbers, such as [min, °C] samples) stay on
// one line, so the plot data does not run to thousands of lines. The CLI
// prints exactly these bytes and POST /api/v1/assess answers with them.
func MarshalJSON(r *Result) ([]byte, error) {
	var compact bytes.Buffer
	enc := json.NewEncoder(&compact)
	enc.SetEscapeHTML(false)
	if err := enc.Encode(r); err != nil {
		return nil, fmt.Errorf("encode result: %w", err)
	}
	var out bytes.Buffer
	if err := prettyJSON(&out, compact.Bytes()); err != nil {
		return nil, fmt.Errorf("format result: %w", err)
	}
	out.WriteByte('\n')
	return out.Bytes(), nil
}

// prettyJSON re-indents compact JSON, keeping key order and number text.
func prettyJSON(w *bytes.Buffer, data []byte) error {
	if !json.Valid(data) {
		return fmt.Errorf("invalid JSON")
	}
	return writeValue(w, json.RawMessage(bytes.TrimSpace(data)), 0)
}

func writeValue(w *bytes.Buffer, raw json.RawMessage, depth int) error {
	if len(raw) == 0 {
		return io.ErrUnexpectedEOF
	}
	switch raw[0] {
	case '{':
		dec := json.NewDecoder(bytes.NewReader(raw))
		if _, err := dec.Token(); err != nil { // {
			return err
		}
		first := true
		w.WriteByte('{')
		for dec.More() {
			keyTok, err := dec.Token()
			if err != nil {
				return err
			}
			key, _ := keyTok.(string)
			var val json.RawMessage
			if err := dec.Decode(&val); err != nil {
				return err
			}
			if !first {
				w.WriteByte(',')
			}
			first = false
			newline(w, depth+1)
			kb, _ := marshalNoEscape(key)
			w.Write(kb)
			w.WriteString(": ")
			if err := writeValue(w, val, depth+1); err != nil {
				return err
			}
		}
		if !first {
			newline(w, depth)
		}
		w.WriteByte('}')
		return nil
	case '[':
		var elems []json.RawMessage
		if err := json.Unmarshal(raw, &elems); err != nil {
			return err
		}
		if inlineList(elems) {
			w.WriteByte('[')
			for i, e := range elems {
				if i > 0 {
					w.WriteString(", ")
				}
				w.Write(e)
			}
			w.WriteByte(']')
			return nil
		}
		w.WriteByte('[')
		for i, e := range elems {
			if i > 0 {
				w.WriteByte(',')
			}
			newline(w, depth+1)
			if err := writeValue(w, e, depth+1); err != nil {
				return err
			}
		}
		if len(elems) > 0 {
			newline(w, depth)
		}
		w.WriteByte(']')
		return nil
	default:
		w.Write(raw)
		return nil
	}
}

// inlineList reports whether a list holds only numbers/null, or only short
// lists of numbers.
func inlineList(elems []json.RawMessage) bool {
	for _, e := range elems {
		switch e[0] {
		case '{', '"', 't', 'f':
			return false
		case '[':
			if len(e) > 64 || bytes.Count(e, []byte("[")) > 1 || bytes.ContainsAny(e, "{\"") {
				return false
			}
		}
	}
	return true
}

func newline(w *bytes.Buffer, depth int) {
	w.WriteByte('\n')
	for i := 0; i < depth; i++ {
		w.WriteString("  ")
	}
}

func marshalNoEscape(s string) ([]byte, error) {
	var b bytes.Buffer
	enc := json.NewEncoder(&b)
	enc.SetEscapeHTML(false)
	if err := enc.Encode(s); err != nil {
		return nil, err
	}
	return bytes.TrimRight(b.Bytes(), "\n"), nil
}
