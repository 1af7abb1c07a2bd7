package main

import (
	"context"
	"fmt"
	"io"
)

// programVersion is the release of the residuum program.
const programVersion = "0.1.0"

func cmdVersion(ctx context.Context, args []string, getenv func(string) string, stdin io.Reader, stdout, stderr io.Writer) error {
	fmt.Fprintf(stdout, "residuum %s\n", programVersion)
	return nil
}
