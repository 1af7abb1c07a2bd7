package sqlite

import (
	"testing"
	"time"
)

// TestParseTime checks the fixed-layout time parser against hand-written
// dates (Gregorian calendar rules, common practice: leap years divisible by
// 4, except centuries not divisible by 400) and against time.Parse, the
// general parser it replaces on the list path. Times are compared exactly:
// both sides are whole microseconds.
func TestParseTime(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		in   string
		want time.Time
		ok   bool
	}{
		{"2026-12-01T22:55:12.123456Z", time.Date(2026, 12, 1, 22, 55, 12, 123456000, time.UTC), true},
		{"2024-02-29T00:00:00.000000Z", time.Date(2024, 2, 29, 0, 0, 0, 0, time.UTC), true},
		{"2000-02-29T23:59:59.999999Z", time.Date(2000, 2, 29, 23, 59, 59, 999999000, time.UTC), true},
		{"0001-01-01T00:00:00.000001Z", time.Date(1, 1, 1, 0, 0, 0, 1000, time.UTC), true},
		{"1900-02-29T00:00:00.000000Z", time.Time{}, false}, // 1900 is not a leap year
		{"2026-04-31T00:00:00.000000Z", time.Time{}, false},
		{"2026-13-01T00:00:00.000000Z", time.Time{}, false},
		{"2026-00-01T00:00:00.000000Z", time.Time{}, false},
		{"2026-01-01T24:00:00.000000Z", time.Time{}, false},
		{"2026-01-01T00:60:00.000000Z", time.Time{}, false},
		{"2026-01-01T00:00:60.000000Z", time.Time{}, false},
		{"2026-01-01T00:00:0x.000000Z", time.Time{}, false},
		{"2026-01-01 00:00:00.000000Z", time.Time{}, false},
		{"2026-01-01T00:00:00.000000+01:00", time.Time{}, false},
		{"2026-01-01T00:00:00Z", time.Time{}, false},
		{"", time.Time{}, false},
	} {
		got, err := parseTime([]byte(tc.in))
		if (err == nil) != tc.ok {
			t.Errorf("parseTime(%q) error = %v, want ok %v", tc.in, err, tc.ok)
			continue
		}
		if !got.Equal(tc.want) || got.Location() != time.UTC {
			t.Errorf("parseTime(%q) = %v, want %v in UTC", tc.in, got, tc.want)
		}
		// Same verdict and value as the general parser.
		ref, refErr := decodeTime(tc.in)
		if (refErr == nil) != (err == nil) || !ref.Equal(got) {
			t.Errorf("parseTime(%q) = %v, %v; decodeTime gives %v, %v", tc.in, got, err, ref, refErr)
		}
		if tc.ok {
			if back := encodeTime(got); back != tc.in {
				t.Errorf("encodeTime(parseTime(%q)) = %q", tc.in, back)
			}
		}
	}
}
