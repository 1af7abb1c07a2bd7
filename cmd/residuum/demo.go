package main

import (
	"context"
	"errors"
	"io"
)

// cmdDemo is replaced by the real command while the project is being built.
func cmdDemo(ctx context.Context, args []string, getenv func(string) string, stdin io.Reader, stdout, stderr io.Writer) error {
	return errors.New("demo: not built yet")
}
