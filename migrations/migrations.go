// Package migrations embeds the SQL schema migrations of the two stores, one
// folder per dialect (sqlite/, postgres/). Files are numbered
// NNNNN_name.sql with goose annotations (-- +goose Up / Down) and are applied
// in order by pressly/goose when a store opens; see assess/sqlite.Migrate
// and assess/postgres.Migrate.
package migrations

import (
	"embed"
	"io/fs"
)

//go:embed sqlite/*.sql postgres/*.sql
var files embed.FS

// SQLite returns the migrations for assess/sqlite, with the .sql files at
// the root of the returned file system.
func SQLite() fs.FS { return sub("sqlite") }

// Postgres returns the migrations for assess/postgres, with the .sql files at
// the root of the returned file system.
func Postgres() fs.FS { return sub("postgres") }

func sub(dir string) fs.FS {
	f, err := fs.Sub(files, dir)
	if err != nil {
		// fs.Sub fails only for an invalid path; dir is a constant above.
		panic("migrations: " + err.Error())
	}
	return f
}
