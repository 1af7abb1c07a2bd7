package main

import (
	"context"
	"errors"
	"io"
)

// cmdAssess is replaced by the real command while the project is being built.
func cmdAssess(ctx context.Context, args []string, getenv func(string) string, stdin io.Reader, stdout, stderr io.Writer) error {
	return errors.New("assess: not built yet")
}
