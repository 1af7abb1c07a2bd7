package main

import (
	"context"
	"errors"
	"io"
)

// cmdServe is replaced by the real command while the project is being built.
func cmdServe(ctx context.Context, args []string, getenv func(string) string, stdin io.Reader, stdout, stderr io.Writer) error {
	return errors.New("serve: not built yet")
}
