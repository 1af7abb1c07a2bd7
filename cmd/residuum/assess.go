package main

import (
	"bytes"
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"

	"residuum/assess"
)

// cmdAssess runs one assessment: residuum assess -in FILE [-format json|text].
// Exit status 0 on success, 2 on invalid input (one line per problem on
// stderr as "path.to.field: message (accepted: …)"), 1 on internal failure.
func cmdAssess(ctx context.Context, args []string, getenv func(string) string, stdin io.Reader, stdout, stderr io.Writer) error {
	fs := flag.NewFlagSet("assess", flag.ContinueOnError)
	fs.SetOutput(stderr)
	inPath := fs.String("in", "", "input JSON file (- for stdin)")
	format := fs.String("format", "json", "output format: json | text")
	fs.Usage = func() {
		fmt.Fprint(stderr, "usage: residuum assess -in FILE [-format json|text]\n\nAssess the residual bending capacity of one fire-damaged member.\n\n")
		fs.PrintDefaults()
	}
	if err := fs.Parse(args); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			return nil
		}
		return &exitError{code: 2, err: err}
	}
	if fs.NArg() > 0 {
		fmt.Fprintf(stderr, "assess: unexpected arguments %q\n", fs.Args())
		return &exitError{code: 2, err: fmt.Errorf("unexpected arguments %q", fs.Args())}
	}
	if *inPath == "" {
		fmt.Fprintln(stderr, "assess: -in FILE is required (- reads stdin)")
		return &exitError{code: 2, err: errors.New("-in is required")}
	}
	if *format != "json" && *format != "text" {
		fmt.Fprintf(stderr, "-format: unknown format %q (accepted: json | text)\n", *format)
		return &exitError{code: 2, err: fmt.Errorf("unknown format %q", *format)}
	}
	var r io.Reader = stdin
	if *inPath != "-" {
		f, err := os.Open(*inPath)
		if err != nil {
			fmt.Fprintf(stderr, "-in: cannot open %s: %v\n", *inPath, err)
			return &exitError{code: 2, err: fmt.Errorf("open input: %w", err)}
		}
		defer f.Close()
		r = f
	}
	in, err := assess.Decode(r)
	if err != nil {
		return reportInvalid(err, stderr)
	}
	res, err := assess.Run(ctx, in, nil)
	if err != nil {
		return reportInvalid(err, stderr)
	}
	if *format == "text" {
		if err := res.WriteText(stdout); err != nil {
			return fmt.Errorf("write text: %w", err)
		}
		return nil
	}
	out, err := MarshalResult(res)
	if err != nil {
		return err
	}
	if _, err := stdout.Write(out); err != nil {
		return fmt.Errorf("write output: %w", err)
	}
	return nil
}

// MarshalResult is the JSON printed by -format json: indented by two spaces,
// newline-terminated, no HTML escaping. The API answers with the same bytes
// (assess.MarshalJSON).
func MarshalResult(res *assess.Result) ([]byte, error) {
	b, err := assess.MarshalJSON(res)
	if err != nil {
		return nil, fmt.Errorf("encode result: %w", err)
	}
	return b, nil
}

// reportInvalid prints the problems of an invalid input, one per line, and
// returns exit code 2; other errors pass through (exit 1).
func reportInvalid(err error, stderr io.Writer) error {
	var inv *assess.InvalidError
	if errors.As(err, &inv) {
		var b bytes.Buffer
		for _, p := range inv.Problems {
			field := p.Field
			if field == "" {
				field = "(input)"
			}
			fmt.Fprintf(&b, "%s: %s\n", field, p.Message)
		}
		_, _ = stderr.Write(b.Bytes())
		return &exitError{code: 2, err: err}
	}
	return err
}
