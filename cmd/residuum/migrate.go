package main

import (
	"context"
	"errors"
	"io"
)

// cmdMigrate is replaced by the real command while the project is being built.
func cmdMigrate(ctx context.Context, args []string, getenv func(string) string, stdin io.Reader, stdout, stderr io.Writer) error {
	return errors.New("migrate: not built yet")
}
