package main

import (
	"context"
	"fmt"
	"io"

	"residuum/assess"
)

// programVersion is the release of the residuum program.
const programVersion = "0.1.0"

// cmdVersion prints the program release and the engine's method version
// (the version every stored result records).
func cmdVersion(ctx context.Context, args []string, getenv func(string) string, stdin io.Reader, stdout, stderr io.Writer) error {
	fmt.Fprintf(stdout, "residuum %s (method %s)\n", programVersion, assess.MethodVersion)
	return nil
}
