package web

import (
	"context"
	"crypto/rand"
	"encoding/hex"
	"sync"
	"time"
)

// job is one assessment run started from the pages. Its progress is reported by the engine's
// callback and read by the progress page; Cancel stops it through its context.
type job struct {
	ID        string
	ProjectID int64
	MemberID  int64
	Label     string
	Started   time.Time

	cancel context.CancelFunc

	mu           sync.Mutex // guards the fields below
	stage        string
	frac         float64 // 0–1
	done         bool
	err          error
	cancelled    bool
	revision     int
	assessmentID int64
}

// jobState is a consistent snapshot of a job for a view.
type jobState struct {
	Stage        string
	Frac         float64
	Done         bool
	Err          error
	Cancelled    bool
	Revision     int
	AssessmentID int64
}

func (j *job) progress(stage string, frac float64) {
	j.mu.Lock()
	defer j.mu.Unlock()
	if frac < 0 {
		frac = 0
	}
	if frac > 1 {
		frac = 1
	}
	j.stage, j.frac = stage, frac
}

func (j *job) finish(rev int, id int64, err error) {
	j.mu.Lock()
	defer j.mu.Unlock()
	j.done, j.err, j.revision, j.assessmentID = true, err, rev, id
	if err == nil {
		j.frac = 1
	}
}

func (j *job) snapshot() jobState {
	j.mu.Lock()
	defer j.mu.Unlock()
	return jobState{j.stage, j.frac, j.done, j.err, j.cancelled, j.revision, j.assessmentID}
}

func (j *job) stop() {
	j.mu.Lock()
	j.cancelled = true
	j.mu.Unlock()
	j.cancel()
}

// jobs is the table of runs started in this process. Finished jobs are forgotten an hour after
// they started.
type jobs struct {
	mu sync.Mutex // guards m
	m  map[string]*job
}

func newJobs() *jobs { return &jobs{m: map[string]*job{}} }

const jobKeep = time.Hour

func (js *jobs) add(j *job) {
	var b [12]byte
	_, _ = rand.Read(b[:])
	j.ID = hex.EncodeToString(b[:])
	js.mu.Lock()
	defer js.mu.Unlock()
	for id, o := range js.m {
		if time.Since(o.Started) > jobKeep && o.snapshot().Done {
			delete(js.m, id)
		}
	}
	js.m[j.ID] = j
}

func (js *jobs) get(id string) (*job, bool) {
	js.mu.Lock()
	defer js.mu.Unlock()
	j, ok := js.m[id]
	return j, ok
}

// running returns the unfinished job of a member, if any.
func (js *jobs) running(memberID int64) *job {
	js.mu.Lock()
	defer js.mu.Unlock()
	for _, j := range js.m {
		if j.MemberID == memberID && !j.snapshot().Done {
			return j
		}
	}
	return nil
}
