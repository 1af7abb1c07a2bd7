package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"time"

	"residuum/internal/demo"
	"residuum/internal/runqueue"
)

const demoHelp = `usage: residuum demo [flags]

Stores the invented demo project (a car-park fire with five members) in the
store, runs the first assessment of every member and prints the project's
id. Each call adds a new copy.

Flags:
`

// cmdDemo loads the demo project into the configured store.
func cmdDemo(ctx context.Context, args []string, getenv func(string) string, stdin io.Reader, stdout, stderr io.Writer) error {
	var (
		sc         storeConfig
		runTimeout time.Duration
	)
	e := newEnvFlags("demo", getenv, stderr)
	sc.define(e)
	e.Duration(&runTimeout, "run-timeout", envRunTimeout, defaultRunTimeout, "time limit of one engine run")
	e.fs.Usage = func() {
		fmt.Fprint(stderr, demoHelp)
		e.fs.PrintDefaults()
	}
	if err := e.parse(args); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			return nil
		}
		return err
	}
	st, err := openStore(ctx, sc)
	if err != nil {
		return err
	}
	defer st.Close()
	q := runqueue.New(1, 0, runTimeout)
	defer q.Close(context.Background())
	p, err := demo.Load(ctx, st, demoAssess(st, q))
	if err != nil {
		return err
	}
	fmt.Fprintf(stdout, "residuum: demo project %d loaded into %s: %s\n", p.ID, sc.describe(), p.Name)
	return nil
}
