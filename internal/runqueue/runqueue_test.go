package runqueue

import (
	"context"
	"errors"
	"runtime"
	"sync"
	"sync/atomic"
	"testing"
	"time"
)

// block returns a run function that signals started, then waits for release
// or for its context to end (returning the context's error).
func block(started chan<- struct{}, release <-chan struct{}) func(context.Context) error {
	return func(ctx context.Context) error {
		started <- struct{}{}
		select {
		case <-release:
			return nil
		case <-ctx.Done():
			return ctx.Err()
		}
	}
}

func TestDoRunsAndReturnsError(t *testing.T) {
	t.Parallel()
	q := New(2, 2, 0)
	defer q.Close(context.Background())
	want := errors.New("engine said no")
	if err := q.Do(context.Background(), func(context.Context) error { return want }); !errors.Is(err, want) {
		t.Errorf("Do(fn returning %v) = %v, want it", want, err)
	}
	ran := false
	if err := q.Do(context.Background(), func(context.Context) error { ran = true; return nil }); err != nil || !ran {
		t.Errorf("Do(ok fn) = %v, ran=%v; want nil, true", err, ran)
	}
}

func TestDefaultWorkersIsGOMAXPROCS(t *testing.T) {
	t.Parallel()
	q := New(0, -3, 0)
	defer q.Close(context.Background())
	if got, want := q.Workers(), runtime.GOMAXPROCS(0); got != want {
		t.Errorf("New(0, ...).Workers() = %d, want GOMAXPROCS %d", got, want)
	}
	if got := q.Depth(); got != 0 {
		t.Errorf("New(_, -3, _).Depth() = %d, want 0", got)
	}
}

// TestFullQueueRejectsAtOnce fills 2 workers and 3 waiting slots; the sixth
// caller must get ErrFull without waiting.
func TestFullQueueRejectsAtOnce(t *testing.T) {
	t.Parallel()
	const workers, depth = 2, 3
	q := New(workers, depth, 0)
	defer q.Close(context.Background())
	started := make(chan struct{}, workers+depth)
	release := make(chan struct{})
	var wg sync.WaitGroup
	errs := make(chan error, workers+depth)
	for range workers {
		wg.Go(func() { errs <- q.Do(context.Background(), block(started, release)) })
	}
	for range workers {
		<-started
	}
	for range depth {
		wg.Go(func() { errs <- q.Do(context.Background(), block(started, release)) })
	}
	deadline := time.Now().Add(5 * time.Second)
	for q.Waiting() < depth {
		if time.Now().After(deadline) {
			t.Fatalf("Waiting() = %d after 5 s, want %d", q.Waiting(), depth)
		}
		time.Sleep(time.Millisecond)
	}
	if got := q.Busy(); got != workers {
		t.Errorf("Busy() = %d, want %d", got, workers)
	}
	t0 := time.Now()
	err := q.Do(context.Background(), func(context.Context) error { t.Error("ran a run that should have been refused"); return nil })
	if !errors.Is(err, ErrFull) {
		t.Errorf("Do on a full queue = %v, want ErrFull", err)
	}
	if d := time.Since(t0); d > time.Second {
		t.Errorf("Do on a full queue took %v, want an immediate answer", d)
	}
	close(release)
	for range depth {
		<-started
	}
	wg.Wait()
	close(errs)
	for err := range errs {
		if err != nil {
			t.Errorf("accepted run returned %v, want nil", err)
		}
	}
}

func TestCallerCancelCancelsRun(t *testing.T) {
	t.Parallel()
	q := New(1, 0, 0)
	defer q.Close(context.Background())
	ctx, cancel := context.WithCancel(context.Background())
	started := make(chan struct{}, 1)
	errc := make(chan error, 1)
	go func() { errc <- q.Do(ctx, block(started, nil)) }()
	<-started
	cancel()
	select {
	case err := <-errc:
		if !errors.Is(err, context.Canceled) {
			t.Errorf("Do after the caller cancelled = %v, want context.Canceled", err)
		}
	case <-time.After(5 * time.Second):
		t.Fatal("run was not cancelled with its caller")
	}
	// The worker is free again.
	if err := q.Do(context.Background(), func(context.Context) error { return nil }); err != nil {
		t.Errorf("Do after a cancelled run = %v, want nil", err)
	}
}

// TestCancelWhileWaitingNeverRuns: a caller that leaves before a worker
// picks its run up gets its context's error and the function is never called.
func TestCancelWhileWaitingNeverRuns(t *testing.T) {
	t.Parallel()
	q := New(1, 1, 0)
	defer q.Close(context.Background())
	started := make(chan struct{}, 1)
	release := make(chan struct{})
	first := make(chan error, 1)
	go func() { first <- q.Do(context.Background(), block(started, release)) }()
	<-started
	ctx, cancel := context.WithCancel(context.Background())
	var called atomic.Bool
	errc := make(chan error, 1)
	go func() { errc <- q.Do(ctx, func(context.Context) error { called.Store(true); return nil }) }()
	for q.Waiting() < 1 {
		time.Sleep(time.Millisecond)
	}
	cancel()
	if err := <-errc; !errors.Is(err, context.Canceled) {
		t.Errorf("Do cancelled while waiting = %v, want context.Canceled", err)
	}
	close(release)
	if err := <-first; err != nil {
		t.Fatalf("first run = %v", err)
	}
	// Push one more run through the single worker so the abandoned one has
	// been taken off the queue before we look.
	if err := q.Do(context.Background(), func(context.Context) error { return nil }); err != nil {
		t.Fatalf("Do = %v", err)
	}
	if called.Load() {
		t.Error("the abandoned run was called")
	}
}

func TestPerRunLimit(t *testing.T) {
	t.Parallel()
	q := New(1, 0, 20*time.Millisecond)
	defer q.Close(context.Background())
	t0 := time.Now()
	err := q.Do(context.Background(), block(make(chan struct{}, 1), nil))
	if !errors.Is(err, ErrTimeout) {
		t.Errorf("Do of a run past its limit = %v, want ErrTimeout", err)
	}
	if d := time.Since(t0); d > 5*time.Second {
		t.Errorf("run past a 20 ms limit took %v to stop", d)
	}
	// A run that finishes in time is unaffected.
	if err := q.Do(context.Background(), func(context.Context) error { return nil }); err != nil {
		t.Errorf("quick run = %v, want nil", err)
	}
}

func TestPanicBecomesError(t *testing.T) {
	t.Parallel()
	q := New(1, 0, 0)
	defer q.Close(context.Background())
	err := q.Do(context.Background(), func(context.Context) error { panic("index out of range in a test") })
	if !errors.Is(err, ErrPanic) {
		t.Errorf("Do(panicking fn) = %v, want ErrPanic", err)
	}
	if err := q.Do(context.Background(), func(context.Context) error { return nil }); err != nil {
		t.Errorf("worker after a panic: Do = %v, want nil", err)
	}
}

// TestCloseDrains: runs in progress and waiting finish; later calls get ErrClosed.
func TestCloseDrains(t *testing.T) {
	t.Parallel()
	q := New(1, 2, 0)
	var finished atomic.Int32
	slow := func(ctx context.Context) error {
		select {
		case <-time.After(30 * time.Millisecond):
			finished.Add(1)
			return nil
		case <-ctx.Done():
			return ctx.Err()
		}
	}
	var wg sync.WaitGroup
	for range 3 {
		wg.Go(func() {
			if err := q.Do(context.Background(), slow); err != nil {
				t.Errorf("Do during Close = %v, want nil", err)
			}
		})
	}
	for q.Busy()+q.Waiting() < 3 {
		time.Sleep(time.Millisecond)
	}
	ctx, cancel := context.WithTimeout(context.Background(), 10*time.Second)
	defer cancel()
	if err := q.Close(ctx); err != nil {
		t.Errorf("Close = %v, want nil", err)
	}
	wg.Wait()
	if got := finished.Load(); got != 3 {
		t.Errorf("runs finished by Close = %d, want 3", got)
	}
	if err := q.Do(context.Background(), slow); !errors.Is(err, ErrClosed) {
		t.Errorf("Do after Close = %v, want ErrClosed", err)
	}
	if err := q.Close(ctx); err != nil {
		t.Errorf("second Close = %v, want nil", err)
	}
}

// TestCloseDeadlineCancelsRuns: a run that would go on forever is cancelled
// when Close's context ends.
func TestCloseDeadlineCancelsRuns(t *testing.T) {
	t.Parallel()
	q := New(1, 1, 0)
	started := make(chan struct{}, 2)
	errc := make(chan error, 2)
	go func() { errc <- q.Do(context.Background(), block(started, nil)) }()
	<-started
	go func() { errc <- q.Do(context.Background(), block(started, nil)) }()
	for q.Waiting() < 1 {
		time.Sleep(time.Millisecond)
	}
	ctx, cancel := context.WithTimeout(context.Background(), 20*time.Millisecond)
	defer cancel()
	if err := q.Close(ctx); !errors.Is(err, context.DeadlineExceeded) {
		t.Errorf("Close past its deadline = %v, want DeadlineExceeded", err)
	}
	for range 2 {
		select {
		case err := <-errc:
			if err == nil {
				t.Error("a run stopped by Close returned nil")
			}
		case <-time.After(5 * time.Second):
			t.Fatal("run not stopped after Close's deadline")
		}
	}
}

// TestConcurrentNeverExceedsWorkers hammers the queue and checks that no more
// than Workers runs are ever in progress and every call is answered.
func TestConcurrentNeverExceedsWorkers(t *testing.T) {
	t.Parallel()
	const workers = 3
	q := New(workers, 4, time.Second)
	defer q.Close(context.Background())
	var inFlight, peak atomic.Int32
	var ok, full atomic.Int32
	var wg sync.WaitGroup
	for range 200 {
		wg.Go(func() {
			err := q.Do(context.Background(), func(context.Context) error {
				n := inFlight.Add(1)
				for {
					p := peak.Load()
					if n <= p || peak.CompareAndSwap(p, n) {
						break
					}
				}
				time.Sleep(100 * time.Microsecond)
				inFlight.Add(-1)
				return nil
			})
			switch {
			case err == nil:
				ok.Add(1)
			case errors.Is(err, ErrFull):
				full.Add(1)
			default:
				t.Errorf("Do = %v", err)
			}
		})
	}
	wg.Wait()
	if p := peak.Load(); p > workers {
		t.Errorf("peak runs in progress = %d, want ≤ %d", p, workers)
	}
	if ok.Load()+full.Load() != 200 || ok.Load() == 0 {
		t.Errorf("ok %d + full %d, want 200 answered and some accepted", ok.Load(), full.Load())
	}
}
