// Package sqlite implements assess.Store on an embedded SQLite database
// (modernc.org/sqlite, pure Go). It is the default store: one file under the
// data directory, in WAL mode.
//
// Concurrency: one *sql.DB with a few connections. Read methods run in
// read-only (deferred) transactions, which in WAL mode see a consistent
// snapshot and never wait for the writer. Write methods are serialised
// inside the process by a one-slot semaphore and open BEGIN IMMEDIATE
// transactions (_txlock=immediate), so a write transaction holds SQLite's
// write lock from its first statement and cannot fail half-way with
// SQLITE_BUSY when another process (say `residuum migrate`) writes too;
// busy_timeout makes it wait for that process instead.
package sqlite

import (
	"context"
	"database/sql"
	"errors"
	"fmt"
	"strings"
	"time"

	"github.com/pressly/goose/v3"
	"modernc.org/sqlite"
	sqlite3 "modernc.org/sqlite/lib"

	"residuum/assess"
	"residuum/migrations"
)

var _ assess.Store = (*DB)(nil)

// DB is an assess.Store on one SQLite database. Set Now before first use
// to control the clock (tests); it must not be changed while in use.
type DB struct {
	// Now returns the current time; nil means time.Now. The store converts
	// it to UTC and truncates it to the microsecond.
	Now func() time.Time

	db    *sql.DB
	write chan struct{} // one slot: held for the life of a write transaction

	// Statements of the hot read paths, prepared once: database/sql keeps
	// one SQLite statement per connection and reuses it, instead of
	// compiling the SQL text on every call.
	listMembers, listMembersAfter *sql.Stmt
}

// busyTimeoutMS is how long a statement waits for another connection's or
// process's lock before giving up with SQLITE_BUSY (mapped to
// assess.ErrUnavailable).
const busyTimeoutMS = 10000

// dsn returns the driver DSN for path (a file name, a file: URI or
// ":memory:") with the pragmas every connection needs.
func dsn(path string) string {
	params := []string{
		// SQLite enforces REFERENCES (and ON DELETE CASCADE) only when
		// foreign_keys is on, and the setting is per connection.
		"_pragma=foreign_keys(1)",
		// WAL: readers work from a snapshot while the writer appends, so
		// list pages never wait for an assessment being saved. The mode is
		// stored in the file; for :memory: SQLite keeps "memory" instead.
		"_pragma=journal_mode(WAL)",
		// Wait for a lock held by another connection or process instead of
		// failing at once with SQLITE_BUSY.
		fmt.Sprintf("_pragma=busy_timeout(%d)", busyTimeoutMS),
		// Write transactions start with BEGIN IMMEDIATE: the write lock is
		// taken up front (waiting under busy_timeout), so a transaction that
		// read first never fails on upgrading to a write lock. Read-only
		// transactions still use a plain deferred BEGIN.
		"_txlock=immediate",
	}
	sep := "?"
	if strings.Contains(path, "?") {
		sep = "&"
	}
	return path + sep + strings.Join(params, "&")
}

// open opens the database without migrating it.
func open(ctx context.Context, path string) (*sql.DB, error) {
	if path == "" {
		return nil, fmt.Errorf("open sqlite: %w", &assess.InvalidError{Problems: []assess.Problem{
			{Field: "path", Message: `is required (a file name or ":memory:")`}}})
	}
	db, err := sql.Open("sqlite", dsn(path))
	if err != nil {
		return nil, fmt.Errorf("open sqlite %s: %w", path, err)
	}
	if path == ":memory:" || strings.Contains(path, "mode=memory") {
		// Every connection to :memory: is a new, empty database: keep one.
		db.SetMaxOpenConns(1)
		db.SetMaxIdleConns(1)
	} else {
		db.SetMaxOpenConns(8)
		db.SetMaxIdleConns(8)
	}
	db.SetConnMaxIdleTime(0)
	db.SetConnMaxLifetime(0)
	if err := db.PingContext(ctx); err != nil {
		db.Close()
		return nil, fmt.Errorf("open sqlite %s: %w", path, formatError(err))
	}
	return db, nil
}

// Open opens (creating if needed) the SQLite database at path, which is a
// file name, a file: URI or ":memory:", and applies any pending migrations.
func Open(ctx context.Context, path string) (*DB, error) {
	sdb, err := open(ctx, path)
	if err != nil {
		return nil, err
	}
	if _, err := migrate(ctx, sdb); err != nil {
		sdb.Close()
		return nil, fmt.Errorf("open sqlite %s: %w", path, err)
	}
	db := &DB{db: sdb, write: make(chan struct{}, 1)}
	if err := db.prepare(ctx); err != nil {
		sdb.Close()
		return nil, fmt.Errorf("open sqlite %s: %w", path, err)
	}
	return db, nil
}

// prepare prepares the DB's statements (after migrating: they name tables).
func (db *DB) prepare(ctx context.Context) error {
	var err error
	if db.listMembers, err = db.db.PrepareContext(ctx, listMembersQuery); err != nil {
		return fmt.Errorf("prepare member list: %w", formatError(err))
	}
	if db.listMembersAfter, err = db.db.PrepareContext(ctx, listMembersAfterQuery); err != nil {
		return fmt.Errorf("prepare member list: %w", formatError(err))
	}
	return nil
}

// Migrate applies the pending migrations to the SQLite database at path
// (for `residuum migrate`) and returns one line per migration applied, such
// as "OK   up 00001_schema.sql (1.2ms)"; none if it was up to date.
func Migrate(ctx context.Context, path string) ([]string, error) {
	sdb, err := open(ctx, path)
	if err != nil {
		return nil, err
	}
	defer sdb.Close()
	return migrate(ctx, sdb)
}

// migrate runs the embedded migrations/sqlite files through goose.
func migrate(ctx context.Context, sdb *sql.DB) ([]string, error) {
	p, err := goose.NewProvider(goose.DialectSQLite3, sdb, migrations.SQLite(),
		goose.WithDisableGlobalRegistry(true),
		goose.WithLogger(goose.NopLogger()),
	)
	if err != nil {
		return nil, fmt.Errorf("migrate: %w", err)
	}
	res, err := p.Up(ctx)
	if err != nil {
		return nil, fmt.Errorf("migrate: %w", formatError(err))
	}
	out := make([]string, len(res))
	for i, r := range res {
		out[i] = r.String()
	}
	return out, nil
}

// Close closes the prepared statements and the database.
func (db *DB) Close() error {
	return errors.Join(db.listMembers.Close(), db.listMembersAfter.Close(), db.db.Close())
}

// Ping checks that the database file can be read.
func (db *DB) Ping(ctx context.Context) error {
	var n int
	if err := db.db.QueryRowContext(ctx, `SELECT count(*) FROM sqlite_schema`).Scan(&n); err != nil {
		return fmt.Errorf("ping sqlite: %w: %w", assess.ErrUnavailable, err)
	}
	return nil
}

// txn is a transaction with the time it started, which is the time the
// store writes into every row the transaction touches.
type txn struct {
	*sql.Tx
	now     time.Time
	release func()
}

// Commit commits the transaction and releases the write slot.
func (tx *txn) Commit() error {
	defer tx.done()
	return tx.Tx.Commit()
}

// Rollback rolls the transaction back (a no-op after Commit) and releases
// the write slot.
func (tx *txn) Rollback() error {
	defer tx.done()
	return tx.Tx.Rollback()
}

func (tx *txn) done() {
	if tx.release != nil {
		tx.release()
		tx.release = nil
	}
}

// now returns the store clock in UTC at microsecond resolution.
func (db *DB) now() time.Time {
	now := time.Now
	if db.Now != nil {
		now = db.Now
	}
	return now().UTC().Truncate(time.Microsecond)
}

// beginRead starts a read-only transaction: a consistent snapshot that
// never waits for writers.
func (db *DB) beginRead(ctx context.Context) (*txn, error) {
	tx, err := db.db.BeginTx(ctx, &sql.TxOptions{ReadOnly: true})
	if err != nil {
		return nil, formatError(err)
	}
	return &txn{Tx: tx, now: db.now()}, nil
}

// beginWrite waits for the process's write slot, then starts a BEGIN
// IMMEDIATE transaction.
func (db *DB) beginWrite(ctx context.Context) (*txn, error) {
	select {
	case db.write <- struct{}{}:
	case <-ctx.Done():
		return nil, ctx.Err()
	}
	release := func() { <-db.write }
	tx, err := db.db.BeginTx(ctx, nil)
	if err != nil {
		release()
		return nil, formatError(err)
	}
	return &txn{Tx: tx, now: db.now(), release: release}, nil
}

// formatError maps SQLite result codes to assess error kinds. Errors that
// already carry a kind, and context errors, are returned unchanged.
func formatError(err error) error {
	if err == nil || isKind(err) || errors.Is(err, context.Canceled) || errors.Is(err, context.DeadlineExceeded) {
		return err
	}
	var se *sqlite.Error
	if !errors.As(err, &se) {
		return err
	}
	switch se.Code() {
	case sqlite3.SQLITE_CONSTRAINT_UNIQUE, sqlite3.SQLITE_CONSTRAINT_PRIMARYKEY,
		sqlite3.SQLITE_CONSTRAINT_TRIGGER:
		return fmt.Errorf("%w: %w", assess.ErrConflict, err)
	case sqlite3.SQLITE_CONSTRAINT_FOREIGNKEY:
		return fmt.Errorf("%w: %w", assess.ErrNotFound, err)
	case sqlite3.SQLITE_CONSTRAINT_CHECK, sqlite3.SQLITE_CONSTRAINT_NOTNULL:
		return fmt.Errorf("%w: %w", assess.ErrInvalid, err)
	}
	switch se.Code() & 0xff { // primary result code
	case sqlite3.SQLITE_CONSTRAINT:
		return fmt.Errorf("%w: %w", assess.ErrConflict, err)
	case sqlite3.SQLITE_BUSY, sqlite3.SQLITE_LOCKED, sqlite3.SQLITE_CANTOPEN,
		sqlite3.SQLITE_IOERR, sqlite3.SQLITE_FULL, sqlite3.SQLITE_READONLY,
		sqlite3.SQLITE_PROTOCOL, sqlite3.SQLITE_NOLFS:
		return fmt.Errorf("%w: %w", assess.ErrUnavailable, err)
	}
	return err
}

// isKind reports whether err already wraps one of the assess error kinds.
func isKind(err error) bool {
	return errors.Is(err, assess.ErrNotFound) || errors.Is(err, assess.ErrConflict) ||
		errors.Is(err, assess.ErrInvalid) || errors.Is(err, assess.ErrUnavailable)
}

// timeLayout is how times are stored: UTC, fixed width, microseconds, so
// that text order is time order.
const timeLayout = "2006-01-02T15:04:05.000000Z"

func encodeTime(t time.Time) string { return t.UTC().Format(timeLayout) }

func encodeNullTime(t *time.Time) any {
	if t == nil {
		return nil
	}
	return encodeTime(*t)
}

func decodeTime(s string) (time.Time, error) {
	t, err := time.Parse(timeLayout, s)
	if err != nil {
		return time.Time{}, fmt.Errorf("stored time %q: %w", s, err)
	}
	return t.UTC(), nil
}

// parseTime decodes a stored time without the general time.Parse: the
// store always writes timeLayout (fixed width, UTC), so the digits sit at
// known offsets. Anything else (say a row written by hand) falls back to
// decodeTime, which reports it.
func parseTime(b []byte) (time.Time, error) {
	// 2006-01-02T15:04:05.000000Z
	// 012345678901234567890123456 (byte offsets)
	if len(b) != len(timeLayout) || b[4] != '-' || b[7] != '-' || b[10] != 'T' || b[13] != ':' ||
		b[16] != ':' || b[19] != '.' || b[26] != 'Z' {
		return decodeTime(string(b))
	}
	year, ok1 := digits(b[0:4])
	month, ok2 := digits(b[5:7])
	day, ok3 := digits(b[8:10])
	hour, ok4 := digits(b[11:13])
	minute, ok5 := digits(b[14:16])
	sec, ok6 := digits(b[17:19])
	usec, ok7 := digits(b[20:26])
	if !(ok1 && ok2 && ok3 && ok4 && ok5 && ok6 && ok7) ||
		month < 1 || month > 12 || day < 1 || day > daysIn(month, year) ||
		hour > 23 || minute > 59 || sec > 59 {
		return decodeTime(string(b))
	}
	return time.Date(year, time.Month(month), day, hour, minute, sec, usec*1000, time.UTC), nil
}

// digits decodes a run of ASCII digits; ok is false if any byte is not one.
func digits(b []byte) (n int, ok bool) {
	for _, c := range b {
		if c < '0' || c > '9' {
			return 0, false
		}
		n = n*10 + int(c-'0')
	}
	return n, true
}

// daysIn is the number of days in a month (1–12) of the Gregorian year.
func daysIn(month, year int) int {
	switch month {
	case 2:
		if year%4 == 0 && (year%100 != 0 || year%400 == 0) {
			return 29
		}
		return 28
	case 4, 6, 9, 11:
		return 30
	}
	return 31
}

func decodeNullTime(s sql.NullString) (*time.Time, error) {
	if !s.Valid {
		return nil, nil
	}
	t, err := decodeTime(s.String)
	if err != nil {
		return nil, err
	}
	return &t, nil
}
