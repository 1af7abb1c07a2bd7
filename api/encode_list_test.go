package api

import (
	"bytes"
	"strings"
	"testing"
	"time"
	"unicode/utf8"

	"residuum/assess"
)

// jsonStringCases are strings that exercise every branch of
// appendJSONString: plain ASCII, the characters JSON must escape (RFC 8259
// §7: quotation mark, reverse solidus, control characters), the ones
// encoding/json escapes by choice (U+2028, U+2029, invalid UTF-8) and the
// HTML characters it leaves alone with SetEscapeHTML(false).
var jsonStringCases = []string{
	"",
	"B12",
	"grid C/3–4, level 2",
	`say "hi"\now`,
	"tab\there\nline\rret\bback\fform",
	"\x00\x01\x1f\x7f",
	"<b>&amp;</b>",
	"line\u2028sep\u2029para",
	"bad \xff utf8 \xc3 end\xe2\x82",
	"emoji 🔥 and ü",
	strings.Repeat("x", 300) + "\"",
}

// TestAppendJSONString compares appendJSONString with encoding/json (the
// encoder the rest of the API uses, through marshal) on the cases above and
// on every single byte: the outputs must be identical, byte for byte.
func TestAppendJSONString(t *testing.T) {
	t.Parallel()
	cases := append([]string{}, jsonStringCases...)
	for c := range 256 {
		cases = append(cases, "a"+string([]byte{byte(c)})+"z")
	}
	for _, s := range cases {
		want, err := marshal(s)
		if err != nil {
			t.Fatal(err)
		}
		got := append(appendJSONString(nil, s), '\n')
		if !bytes.Equal(got, want) {
			t.Errorf("appendJSONString(%q) = %s, encoding/json gives %s", s, got, want)
		}
	}
}

// FuzzAppendJSONString checks appendJSONString against encoding/json on
// arbitrary strings.
func FuzzAppendJSONString(f *testing.F) {
	for _, s := range jsonStringCases {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		want, err := marshal(s)
		if err != nil {
			t.Fatal(err)
		}
		if got := append(appendJSONString(nil, s), '\n'); !bytes.Equal(got, want) {
			t.Errorf("appendJSONString(%q) = %s, encoding/json gives %s", s, got, want)
		}
	})
}

// TestAppendMemberList compares the hand-written member list encoder with
// encoding/json on the memberJSON envelope the API used before: same bytes
// for empty, partial and full pages, tricky strings and times whose
// fractional seconds RFC 3339 output trims (time.Time.MarshalJSON).
func TestAppendMemberList(t *testing.T) {
	t.Parallel()
	times := []time.Time{
		time.Date(2026, 12, 1, 22, 55, 12, 123456000, time.UTC),
		time.Date(2026, 1, 2, 3, 4, 5, 0, time.UTC),             // whole second: no fraction
		time.Date(2024, 2, 29, 23, 59, 59, 100000000, time.UTC), // trailing zeros trimmed: .1
		time.Date(1, 1, 1, 0, 0, 0, 0, time.UTC),
		time.Date(9999, 12, 31, 23, 59, 59, 999999000, time.UTC),
	}
	var all []assess.MemberRecord
	for i, s := range jsonStringCases {
		all = append(all, assess.MemberRecord{
			ID: int64(i + 1), ProjectID: 7, Label: s, Location: jsonStringCases[len(jsonStringCases)-1-i],
			Kind: "beam", Version: int64(i%3 + 1),
			CreatedAt: times[i%len(times)], UpdatedAt: times[(i+1)%len(times)],
			Input: []byte(`{"ignored":true}`), // lists leave the input out
		})
	}
	for _, tc := range []struct {
		name string
		ms   []assess.MemberRecord
		pg   assess.Page
	}{
		{"empty", []assess.MemberRecord{}, assess.Page{Limit: 50}},
		{"nil", nil, assess.Page{Limit: 50}},
		{"partial page", all, assess.Page{Limit: 50}},
		{"full page", all, assess.Page{Limit: len(all)}},
		{"one", all[:1], assess.Page{Limit: 1}},
	} {
		items := make([]memberJSON, len(tc.ms))
		for i := range tc.ms {
			items[i] = newMemberJSON(&tc.ms[i], false)
		}
		want, err := marshal(newList(items, tc.pg, func(m memberJSON) int64 { return m.ID }))
		if err != nil {
			t.Fatal(err)
		}
		got, err := appendMemberList(nil, tc.ms, tc.pg)
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		if !bytes.Equal(got, want) {
			t.Errorf("%s:\n got %s\nwant %s", tc.name, got, want)
		}
		if !utf8.Valid(got) {
			t.Errorf("%s: output is not valid UTF-8", tc.name)
		}
	}
}

// TestAppendMemberListBadYear: like time.Time.MarshalJSON, a year RFC 3339
// cannot write (outside 0–9999) is an error, not a malformed body.
func TestAppendMemberListBadYear(t *testing.T) {
	t.Parallel()
	for _, y := range []int{-1, 10000} {
		ms := []assess.MemberRecord{{ID: 1, ProjectID: 1, Label: "B1", Kind: "beam", Version: 1,
			CreatedAt: time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC), UpdatedAt: time.Date(y, 1, 1, 0, 0, 0, 0, time.UTC)}}
		if _, err := appendMemberList(nil, ms, assess.Page{Limit: 50}); err == nil {
			t.Errorf("year %d: no error", y)
		}
		if _, err := marshal(newMemberJSON(&ms[0], false)); err == nil {
			t.Errorf("year %d: encoding/json gives no error either; the check is out of step", y)
		}
	}
}
