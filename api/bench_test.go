package api

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"net/http"
	"net/http/httptest"
	"os"
	"path/filepath"
	"testing"
	"time"

	"residuum/assess"
)

// BenchmarkListMembers measures GET /api/v1/projects/{id}/members for a
// project of 200 members (one page of 200), in process on SQLite.
func BenchmarkListMembers(b *testing.B) {
	e := newEnv(b)
	pid := e.createProject("bench")
	in := readTestdata(b, "beam.json")
	for i := range 200 {
		m := assess.MemberRecord{ProjectID: pid, Label: fmt.Sprintf("B%03d", i), Kind: "beam", Input: in}
		if err := e.store.CreateMember(context.Background(), &m); err != nil {
			b.Fatal(err)
		}
	}
	path := projectPath(pid) + "/members?limit=200"
	b.ReportAllocs()
	b.ResetTimer()
	b.RunParallel(func(pb *testing.PB) {
		for pb.Next() {
			rec := httptest.NewRecorder()
			e.h.ServeHTTP(rec, httptest.NewRequest("GET", path, nil))
			if rec.Code != http.StatusOK {
				b.Fatalf("GET = %d", rec.Code)
			}
		}
	})
}

// BenchmarkPostAssessment measures POST /api/v1/members/{id}/assessments
// (engine run through the queue, result stored) for the test beam, to
// compare with BenchmarkEngineRun: the difference is the service's cost.
func BenchmarkPostAssessment(b *testing.B) {
	e := newEnv(b, withQueue(0, 64, time.Minute))
	pid := e.createProject("bench")
	m := e.createMember(pid, "beam.json", "")
	path := memberPath(m.ID) + "/assessments"
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		rec := httptest.NewRecorder()
		e.h.ServeHTTP(rec, httptest.NewRequest("POST", path, nil))
		if rec.Code != http.StatusCreated {
			b.Fatalf("POST = %d %s", rec.Code, rec.Body.Bytes())
		}
	}
}

// BenchmarkPostAssess measures the stateless POST /api/v1/assess.
func BenchmarkPostAssess(b *testing.B) {
	e := newEnv(b, withQueue(0, 64, time.Minute))
	in := readTestdata(b, "beam.json")
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		rec := httptest.NewRecorder()
		req := httptest.NewRequest("POST", "/api/v1/assess", bytes.NewReader(in))
		req.Header.Set("Content-Type", "application/json")
		e.h.ServeHTTP(rec, req)
		if rec.Code != http.StatusOK {
			b.Fatalf("POST = %d", rec.Code)
		}
	}
}

// BenchmarkEngineRun is the engine alone on the same input (decode, run,
// encode), the reference for the two benchmarks above.
func BenchmarkEngineRun(b *testing.B) {
	raw := readTestdata(b, "beam.json")
	b.ReportAllocs()
	for b.Loop() {
		in, err := assess.DecodeBytes(raw)
		if err != nil {
			b.Fatal(err)
		}
		res, err := assess.Run(context.Background(), in, nil)
		if err != nil {
			b.Fatal(err)
		}
		if _, err := json.Marshal(res); err != nil {
			b.Fatal(err)
		}
	}
}

// The throughput pair below compares the service with the engine on the
// 300 × 600 mm beam of testdata/beam-3side-iso90.json (ISO 834 90 min,
// three sides, 5 mm cells): BenchmarkThroughputService posts assessments
// from parallel clients through the queue (GOMAXPROCS workers) and stores
// them; BenchmarkThroughputEngine runs the engine alone on one goroutine.
// The target: service ops/s ≥ 0.8 × engine ops/s × cores.

func BenchmarkThroughputService(b *testing.B) {
	e := newEnv(b, withQueue(0, 256, time.Minute))
	pid := e.createProject("bench")
	raw, err := os.ReadFile(filepath.Join("..", "testdata", "beam-3side-iso90.json"))
	if err != nil {
		b.Fatal(err)
	}
	m := assess.MemberRecord{ProjectID: pid, Label: "B-throughput", Kind: "beam", Input: raw}
	if err := e.store.CreateMember(context.Background(), &m); err != nil {
		b.Fatal(err)
	}
	path := memberPath(m.ID) + "/assessments"
	b.ResetTimer()
	b.RunParallel(func(pb *testing.PB) {
		for pb.Next() {
			rec := httptest.NewRecorder()
			e.h.ServeHTTP(rec, httptest.NewRequest("POST", path, nil))
			if rec.Code != http.StatusCreated {
				b.Errorf("POST = %d %s", rec.Code, rec.Body.Bytes())
				return
			}
		}
	})
	b.ReportMetric(float64(b.N)/b.Elapsed().Seconds(), "assessments/s")
}

func BenchmarkThroughputEngine(b *testing.B) {
	raw, err := os.ReadFile(filepath.Join("..", "testdata", "beam-3side-iso90.json"))
	if err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		in, err := assess.DecodeBytes(raw)
		if err != nil {
			b.Fatal(err)
		}
		res, err := assess.Run(context.Background(), in, nil)
		if err != nil {
			b.Fatal(err)
		}
		if _, err := assess.MarshalJSON(res); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(b.N)/b.Elapsed().Seconds(), "assessments/s")
}
