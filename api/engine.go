package api

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"

	"residuum/assess"
	"residuum/internal/runqueue"
)

// decodeInput decodes and validates one assessment input. Malformed JSON is
// a *badRequest (400); a well-formed input that fails validation is the
// engine's *assess.InvalidError (422).
func decodeInput(raw []byte) (assess.Input, error) {
	if !json.Valid(raw) {
		return assess.Input{}, &badRequest{Msg: "the body is not valid JSON"}
	}
	return assess.DecodeBytes(raw)
}

// prefixProblems puts the problems of an *assess.InvalidError under a parent
// field (input → input.member.depth_mm); other errors pass unchanged.
func prefixProblems(err error, parent string) error {
	var inv *assess.InvalidError
	var bad *badRequest
	switch {
	case errors.As(err, &inv):
		out := &assess.InvalidError{Problems: make([]assess.Problem, len(inv.Problems))}
		for i, p := range inv.Problems {
			f := parent
			if p.Field != "" && p.Field != "(input)" {
				f = parent + "." + p.Field
			}
			out.Problems[i] = assess.Problem{Field: f, Message: p.Message}
		}
		return out
	case errors.As(err, &bad):
		f := parent
		if bad.Field != "" {
			f = parent + "." + bad.Field
		}
		return &badRequest{Field: f, Msg: bad.Msg}
	}
	return err
}

// runEngine runs one assessment on a worker of q. The run is cancelled with
// ctx (the client going away) or when the queue's per-run limit elapses.
func runEngine(ctx context.Context, q *runqueue.Queue, in assess.Input) (*assess.Result, error) {
	var res *assess.Result
	err := q.Do(ctx, func(ctx context.Context) error {
		var err error
		res, err = assess.Run(ctx, in, nil)
		return err
	})
	if err != nil {
		return nil, fmt.Errorf("assess %q: %w", in.Member.Label, err)
	}
	return res, nil
}

// Assess runs the engine on member m's stored input through q and stores
// the result as m's next draft revision, with author as the person who ran
// it. It returns the stored revision with its input and result. Problems
// with the stored input are reported under "input.".
func Assess(ctx context.Context, store assess.Store, q *runqueue.Queue, m *assess.MemberRecord, author string) (*assess.AssessmentRecord, error) {
	in, err := decodeInput(m.Input)
	if err != nil {
		return nil, prefixProblems(err, "input")
	}
	res, err := runEngine(ctx, q, in)
	if err != nil {
		return nil, err
	}
	a, err := assess.NewAssessmentRecord(m.ID, m.Input, res, author)
	if err != nil {
		return nil, err
	}
	if err := store.CreateAssessment(ctx, a); err != nil {
		return nil, fmt.Errorf("store assessment of member %d: %w", m.ID, err)
	}
	return a, nil
}

// resultJSON encodes a result exactly as `residuum assess -format json`
// prints it (both use assess.MarshalJSON).
func resultJSON(res *assess.Result) ([]byte, error) {
	out, err := assess.MarshalJSON(res)
	if err != nil {
		return nil, fmt.Errorf("encode result: %w", err)
	}
	return out, nil
}
