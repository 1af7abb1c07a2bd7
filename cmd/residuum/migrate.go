package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"path/filepath"

	"residuum/assess/postgres"
	"residuum/assess/sqlite"
)

const migrateHelp = `usage: residuum migrate [flags]

Applies the pending database migrations to the store (SQLite under -data,
or PostgreSQL when a database URL is given) and exits.

Flags:
`

// cmdMigrate applies the migrations and prints one line per migration applied.
func cmdMigrate(ctx context.Context, args []string, getenv func(string) string, stdin io.Reader, stdout, stderr io.Writer) error {
	var sc storeConfig
	e := newEnvFlags("migrate", getenv, stderr)
	sc.define(e)
	e.fs.Usage = func() {
		fmt.Fprint(stderr, migrateHelp)
		e.fs.PrintDefaults()
	}
	if err := e.parse(args); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			return nil
		}
		return err
	}
	var (
		lines []string
		err   error
	)
	if sc.DatabaseURL != "" {
		lines, err = postgres.Migrate(ctx, sc.DatabaseURL)
	} else {
		if err := os.MkdirAll(sc.DataDir, 0o750); err != nil {
			return fmt.Errorf("data folder: %w", err)
		}
		lines, err = sqlite.Migrate(ctx, filepath.Join(sc.DataDir, sqliteFile))
	}
	if err != nil {
		return fmt.Errorf("%s: %w", sc.describe(), err)
	}
	for _, l := range lines {
		fmt.Fprintln(stdout, l)
	}
	fmt.Fprintf(stdout, "residuum: %s is up to date (%d migration(s) applied now)\n", sc.describe(), len(lines))
	return nil
}
