// Package runqueue runs computations on a bounded pool of workers with a
// bounded waiting room and a time limit per run.
//
// The service sends every engine run through one Queue so that a burst of
// requests cannot start more solver goroutines than there are cores: a
// caller either gets a place (a free worker or a free slot in the waiting
// room) or is told at once that the queue is full (ErrFull), which the HTTP
// layers turn into 503 Service Unavailable with Retry-After.
//
// A run's context is cancelled when the caller's context is cancelled (for
// an HTTP request: the client went away), when the per-run limit elapses, or
// when Close gives up waiting. Functions passed to Do must honour that
// context; the engine checks it in its time loops.
package runqueue

import (
	"context"
	"errors"
	"fmt"
	"runtime"
	"runtime/debug"
	"sync"
	"sync/atomic"
	"time"
)

// ErrFull is returned by Do, without running anything, when every worker is
// busy and the waiting room is full.
var ErrFull = errors.New("runqueue: queue full")

// ErrClosed is returned by Do after Close has been called.
var ErrClosed = errors.New("runqueue: closed")

// ErrTimeout is returned by Do (wrapped) when a run was stopped because it
// took longer than the queue's per-run limit.
var ErrTimeout = errors.New("runqueue: run exceeded its time limit")

// ErrPanic is returned by Do (wrapped) when the function panicked; the panic
// is recovered on the worker so that one bad run cannot stop the process.
var ErrPanic = errors.New("runqueue: run panicked")

// errShutdown is the cancellation cause given to runs still going when
// Close's deadline passes.
var errShutdown = errors.New("runqueue: shut down before the run finished")

// Job states: a queued job is either taken by a worker or abandoned by its
// caller, never both.
const (
	queued int32 = iota
	running
	abandoned
)

type job struct {
	ctx   context.Context
	fn    func(ctx context.Context) error
	state atomic.Int32
	done  chan error // buffered (1): the worker never blocks on it
}

// Queue is a bounded worker pool. Its methods are safe for concurrent use.
type Queue struct {
	workers int
	depth   int
	perRun  time.Duration

	mu     sync.RWMutex // guards closed and the send/close of jobs
	closed bool
	jobs   chan *job     // capacity workers+depth: a send never blocks once a slot is held
	slots  chan struct{} // one token per accepted run, freed when a worker is done with it

	base       context.Context // cancelled when Close gives up waiting
	cancelBase context.CancelCauseFunc
	wg         sync.WaitGroup // running workers
	busy       atomic.Int64   // runs in progress
}

// New starts a Queue with the given number of workers (≤ 0: GOMAXPROCS),
// a waiting room of queueDepth runs beyond the busy workers (< 0 is taken as
// 0: a run is accepted only when a worker is free), and a time limit per run
// measured from the moment a worker picks the run up (≤ 0: no limit).
func New(workers, queueDepth int, perRun time.Duration) *Queue {
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	if queueDepth < 0 {
		queueDepth = 0
	}
	base, cancel := context.WithCancelCause(context.Background())
	q := &Queue{
		workers:    workers,
		depth:      queueDepth,
		perRun:     perRun,
		jobs:       make(chan *job, workers+queueDepth),
		slots:      make(chan struct{}, workers+queueDepth),
		base:       base,
		cancelBase: cancel,
	}
	q.wg.Add(workers)
	for range workers {
		go q.work()
	}
	return q
}

// Workers reports the number of workers.
func (q *Queue) Workers() int { return q.workers }

// Depth reports the size of the waiting room.
func (q *Queue) Depth() int { return q.depth }

// PerRun reports the time limit per run (0: none).
func (q *Queue) PerRun() time.Duration { return max(q.perRun, 0) }

// Busy reports how many runs are in progress right now.
func (q *Queue) Busy() int { return int(q.busy.Load()) }

// Waiting reports how many accepted runs are waiting for a worker right now.
func (q *Queue) Waiting() int { return max(len(q.slots)-q.Busy(), 0) }

// Do runs fn on a worker and returns its error. It returns ErrFull at once
// when no worker is free and the waiting room is full, and ErrClosed after
// Close. fn receives a context that is cancelled when ctx is cancelled,
// when the per-run limit elapses (Do then returns an error wrapping
// ErrTimeout) or when Close's deadline passes.
//
// If ctx is cancelled while the run is still waiting, Do returns ctx's error
// and fn is never called. Once fn has started, Do waits for it to return, so
// fn never runs after Do has returned.
func (q *Queue) Do(ctx context.Context, fn func(ctx context.Context) error) error {
	if err := ctx.Err(); err != nil {
		return err
	}
	j := &job{ctx: ctx, fn: fn, done: make(chan error, 1)}
	if err := q.submit(j); err != nil {
		return err
	}
	select {
	case err := <-j.done:
		return err
	case <-ctx.Done():
		if j.state.CompareAndSwap(queued, abandoned) {
			return ctx.Err()
		}
		// A worker has it: fn sees the cancellation through its context.
		return <-j.done
	}
}

func (q *Queue) submit(j *job) error {
	q.mu.RLock()
	defer q.mu.RUnlock()
	if q.closed {
		return ErrClosed
	}
	select {
	case q.slots <- struct{}{}:
		q.jobs <- j // cannot block: len(jobs) ≤ len(slots) ≤ cap(jobs)
		return nil
	default:
		return ErrFull
	}
}

func (q *Queue) work() {
	defer q.wg.Done()
	for j := range q.jobs {
		switch {
		case !j.state.CompareAndSwap(queued, running):
			<-q.slots // the caller gave up while it waited
		case q.base.Err() != nil:
			<-q.slots
			j.done <- errShutdown // Close gave up: do not start new work
		default:
			q.busy.Add(1)
			err := q.run(j)
			q.busy.Add(-1)
			<-q.slots // free the slot before the caller hears back
			j.done <- err
		}
	}
}

// run calls the job's function with a context that ends with the caller's,
// the per-run limit, or the queue's shutdown, and turns a panic into an
// error.
func (q *Queue) run(j *job) (err error) {
	ctx, cancel := context.WithCancelCause(j.ctx)
	defer cancel(nil)
	stop := context.AfterFunc(q.base, func() { cancel(context.Cause(q.base)) })
	defer stop()
	if q.perRun > 0 {
		var cancelT context.CancelFunc
		ctx, cancelT = context.WithTimeoutCause(ctx, q.perRun, ErrTimeout)
		defer cancelT()
	}
	defer func() {
		if r := recover(); r != nil {
			err = fmt.Errorf("%w: %v\n%s", ErrPanic, r, debug.Stack())
		}
	}()
	err = j.fn(ctx)
	if err != nil && j.ctx.Err() == nil {
		switch cause := context.Cause(ctx); {
		case errors.Is(cause, ErrTimeout):
			return fmt.Errorf("stopped after %v: %w", q.perRun, ErrTimeout)
		case errors.Is(cause, errShutdown):
			return fmt.Errorf("%w: %w", errShutdown, err)
		}
	}
	return err
}

// Close stops accepting runs, lets the workers finish the runs in progress
// and those already waiting, and returns when they are done. If ctx ends
// first, Close cancels the remaining runs' contexts and returns ctx's error
// without waiting further. Close is safe to call more than once.
func (q *Queue) Close(ctx context.Context) error {
	q.mu.Lock()
	if !q.closed {
		q.closed = true
		close(q.jobs)
	}
	q.mu.Unlock()

	done := make(chan struct{})
	go func() {
		q.wg.Wait()
		close(done)
	}()
	select {
	case <-done:
		q.cancelBase(nil)
		return nil
	case <-ctx.Done():
		q.cancelBase(errShutdown)
		return fmt.Errorf("runqueue: close: %w", ctx.Err())
	}
}
