// Command residuum assesses the residual bending capacity of fire-damaged
// reinforced-concrete beams and slabs, from the command line or as a service.
//
// Usage:
//
//	residuum assess -in member.json [-format json|text]
//	residuum serve [-addr 127.0.0.1:8080] [-data ./residuum-data]
//	residuum migrate
//	residuum demo
//	residuum version
package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"os/signal"
	"syscall"
)

func main() {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	err := run(ctx, os.Args[1:], os.Getenv, os.Stdin, os.Stdout, os.Stderr)
	stop()
	os.Exit(exitCode(err))
}

// exitError carries the process exit code a command asks for.
type exitError struct {
	code int
	err  error
}

func (e *exitError) Error() string { return e.err.Error() }
func (e *exitError) Unwrap() error { return e.err }

// exitCode maps run's error to the process exit status: 0 on success,
// the code of an *exitError, otherwise 1.
func exitCode(err error) int {
	if err == nil {
		return 0
	}
	var ee *exitError
	if errors.As(err, &ee) {
		return ee.code
	}
	return 1
}

// command is one subcommand: it parses its own flags from args.
type command func(ctx context.Context, args []string, getenv func(string) string, stdin io.Reader, stdout, stderr io.Writer) error

// run is the whole program, with its environment passed in so tests can
// drive it in-process.
func run(ctx context.Context, args []string, getenv func(string) string, stdin io.Reader, stdout, stderr io.Writer) error {
	commands := map[string]command{
		"assess":  cmdAssess,
		"serve":   cmdServe,
		"migrate": cmdMigrate,
		"demo":    cmdDemo,
		"version": cmdVersion,
	}
	if len(args) == 0 || args[0] == "-h" || args[0] == "--help" || args[0] == "help" {
		usage(stderr)
		if len(args) == 0 {
			return &exitError{code: 2, err: errors.New("no command given")}
		}
		return nil
	}
	cmd, ok := commands[args[0]]
	if !ok {
		usage(stderr)
		return &exitError{code: 2, err: fmt.Errorf("unknown command %q", args[0])}
	}
	err := cmd(ctx, args[1:], getenv, stdin, stdout, stderr)
	if err != nil {
		var ee *exitError
		if !errors.As(err, &ee) || ee.code != 2 {
			fmt.Fprintf(stderr, "residuum %s: %v\n", args[0], err)
		}
	}
	return err
}

func usage(w io.Writer) {
	fmt.Fprint(w, `residuum: post-fire residual capacity of reinforced-concrete beams and slabs

Commands:
  assess   assess one member from a JSON input file (-in FILE, - for stdin)
  serve    run the web service and JSON API
  migrate  apply the database migrations and exit
  demo     load the invented demo project into the store
  version  print the method and program version

Run 'residuum COMMAND -h' for a command's flags.
`)
}
