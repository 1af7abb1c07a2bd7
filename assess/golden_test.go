package assess

import (
	"bytes"
	"context"
	"encoding/json"
	"flag"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"sync"
	"testing"
)

var update = flag.Bool("update", false, "rewrite the golden outputs in testdata/golden (review them by hand)")

// exampleInputs lists the example inputs of the repository's testdata/.
func exampleInputs(t testing.TB) []string {
	t.Helper()
	files, err := filepath.Glob(filepath.Join("..", "testdata", "*.json"))
	if err != nil {
		t.Fatal(err)
	}
	if len(files) < 8 {
		t.Fatalf("found %d example inputs in ../testdata, want at least 8", len(files))
	}
	sort.Strings(files)
	return files
}

var (
	exampleMu    sync.Mutex
	exampleCache = map[string]*Result{}
)

// exampleResult runs an example input once per test binary (TestGolden,
// TestResultInvariants and others share the results).
func exampleResult(t testing.TB, path string) *Result {
	t.Helper()
	exampleMu.Lock()
	defer exampleMu.Unlock()
	if r, ok := exampleCache[path]; ok {
		return r
	}
	r := runFile(t, path)
	exampleCache[path] = r
	return r
}

func runFile(t testing.TB, path string) *Result {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	in, err := Decode(f)
	if err != nil {
		t.Fatalf("%s: decode: %v", path, err)
	}
	res, err := Run(context.Background(), in, nil)
	if err != nil {
		t.Fatalf("%s: run: %v", path, err)
	}
	return res
}

// TestGolden runs every example input and compares the JSON result with its
// golden file (a regression lock, not a verification: the goldens were
// produced by this program and reviewed by hand). Floats are compared
// relatively to 1e-6 (absolute 1e-6 near zero) so that the lock survives
// last-digit differences between platforms; text and structure must match.
func TestGolden(t *testing.T) {
	for _, path := range exampleInputs(t) {
		name := strings.TrimSuffix(filepath.Base(path), ".json")
		t.Run(name, func(t *testing.T) {
			res := exampleResult(t, path)
			got, err := MarshalJSON(res)
			if err != nil {
				t.Fatal(err)
			}
			golden := filepath.Join("testdata", "golden", name+".json")
			if *update {
				if err := os.WriteFile(golden, got, 0o644); err != nil {
					t.Fatal(err)
				}
				var txt bytes.Buffer
				if err := res.WriteText(&txt); err != nil {
					t.Fatal(err)
				}
				if err := os.WriteFile(filepath.Join("testdata", "golden", name+".txt"), txt.Bytes(), 0o644); err != nil {
					t.Fatal(err)
				}
				return
			}
			want, err := os.ReadFile(golden)
			if err != nil {
				t.Fatalf("read golden (run go test -update and review the files): %v", err)
			}
			var g, w any
			if err := json.Unmarshal(got, &g); err != nil {
				t.Fatal(err)
			}
			if err := json.Unmarshal(want, &w); err != nil {
				t.Fatal(err)
			}
			var diffs []string
			compareJSON("", w, g, &diffs)
			if len(diffs) > 0 {
				if len(diffs) > 20 {
					diffs = append(diffs[:20], fmt.Sprintf("… and %d more", len(diffs)-20))
				}
				t.Errorf("result differs from %s:\n%s", golden, strings.Join(diffs, "\n"))
			}
		})
	}
}

// compareJSON walks two decoded JSON values and records differences.
func compareJSON(path string, want, got any, diffs *[]string) {
	switch w := want.(type) {
	case map[string]any:
		g, ok := got.(map[string]any)
		if !ok {
			*diffs = append(*diffs, fmt.Sprintf("%s: want an object, got %T", path, got))
			return
		}
		for k, wv := range w {
			gv, ok := g[k]
			if !ok {
				*diffs = append(*diffs, fmt.Sprintf("%s.%s: missing", path, k))
				continue
			}
			compareJSON(path+"."+k, wv, gv, diffs)
		}
		for k := range g {
			if _, ok := w[k]; !ok {
				*diffs = append(*diffs, fmt.Sprintf("%s.%s: unexpected", path, k))
			}
		}
	case []any:
		g, ok := got.([]any)
		if !ok || len(g) != len(w) {
			*diffs = append(*diffs, fmt.Sprintf("%s: want a list of %d, got %v", path, len(w), lenOf(got)))
			return
		}
		for i := range w {
			compareJSON(fmt.Sprintf("%s[%d]", path, i), w[i], g[i], diffs)
		}
	case float64:
		g, ok := got.(float64)
		if !ok {
			*diffs = append(*diffs, fmt.Sprintf("%s: want %v, got %v", path, w, got))
			return
		}
		if math.Abs(g-w) > 1e-6*math.Max(1, math.Max(math.Abs(w), math.Abs(g))) {
			*diffs = append(*diffs, fmt.Sprintf("%s: want %.9g, got %.9g", path, w, g))
		}
	default:
		if want != got {
			*diffs = append(*diffs, fmt.Sprintf("%s: want %v, got %v", path, want, got))
		}
	}
}

func lenOf(v any) string {
	if a, ok := v.([]any); ok {
		return fmt.Sprintf("a list of %d", len(a))
	}
	return fmt.Sprintf("%T", v)
}
