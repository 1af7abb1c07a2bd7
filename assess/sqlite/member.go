package sqlite

import (
	"bytes"
	"context"
	"database/sql"
	"errors"
	"fmt"

	"residuum/assess"
)

// CreateMember implements assess.Store.
func (db *DB) CreateMember(ctx context.Context, m *assess.MemberRecord) error {
	if err := m.Validate(); err != nil {
		return fmt.Errorf("create member: %w", err)
	}
	tx, err := db.beginWrite(ctx)
	if err != nil {
		return fmt.Errorf("create member: %w", err)
	}
	defer tx.Rollback()
	if err := createMember(ctx, tx, m); err != nil {
		return fmt.Errorf("create member: %w", formatError(err))
	}
	if err := tx.Commit(); err != nil {
		return fmt.Errorf("create member: %w", formatError(err))
	}
	return nil
}

// GetMember implements assess.Store.
func (db *DB) GetMember(ctx context.Context, id int64) (*assess.MemberRecord, error) {
	tx, err := db.beginRead(ctx)
	if err != nil {
		return nil, fmt.Errorf("get member %d: %w", id, err)
	}
	defer tx.Rollback()
	m, err := findMember(ctx, tx, id)
	if err != nil {
		return nil, fmt.Errorf("get member %d: %w", id, formatError(err))
	}
	return m, nil
}

// ListMembers implements assess.Store.
//
// A listing is one prepared statement outside a transaction: in WAL mode a
// single SELECT reads one snapshot by itself, and BEGIN … COMMIT would add
// two statements per call. See listMembers for the existence check.
func (db *DB) ListMembers(ctx context.Context, projectID int64, pg assess.Page) ([]assess.MemberRecord, error) {
	pg, err := pg.Normalize()
	if err != nil {
		return nil, fmt.Errorf("list members of project %d: %w", projectID, err)
	}
	ms, err := db.listMembersPage(ctx, projectID, pg)
	if err != nil {
		return nil, fmt.Errorf("list members of project %d: %w", projectID, formatError(err))
	}
	return ms, nil
}

// UpdateMember implements assess.Store.
func (db *DB) UpdateMember(ctx context.Context, m *assess.MemberRecord) error {
	if err := m.Validate(); err != nil {
		return fmt.Errorf("update member %d: %w", m.ID, err)
	}
	tx, err := db.beginWrite(ctx)
	if err != nil {
		return fmt.Errorf("update member %d: %w", m.ID, err)
	}
	defer tx.Rollback()
	if err := updateMember(ctx, tx, m); err != nil {
		return fmt.Errorf("update member %d: %w", m.ID, formatError(err))
	}
	if err := tx.Commit(); err != nil {
		return fmt.Errorf("update member %d: %w", m.ID, formatError(err))
	}
	return nil
}

// DeleteMember implements assess.Store.
func (db *DB) DeleteMember(ctx context.Context, id int64) error {
	tx, err := db.beginWrite(ctx)
	if err != nil {
		return fmt.Errorf("delete member %d: %w", id, err)
	}
	defer tx.Rollback()
	if err := deleteMember(ctx, tx, id); err != nil {
		return fmt.Errorf("delete member %d: %w", id, formatError(err))
	}
	if err := tx.Commit(); err != nil {
		return fmt.Errorf("delete member %d: %w", id, formatError(err))
	}
	return nil
}

func createMember(ctx context.Context, tx *txn, m *assess.MemberRecord) error {
	if _, err := findLiveProject(ctx, tx, m.ProjectID); err != nil {
		return err
	}
	m.Version = 1
	m.CreatedAt, m.UpdatedAt = tx.now, tx.now
	return tx.QueryRowContext(ctx, `
		INSERT INTO members (
			project_id,
			label,
			location,
			kind,
			input,
			version,
			created_at,
			updated_at
		)
		VALUES (?, ?, ?, ?, ?, ?, ?, ?)
		RETURNING id`,
		m.ProjectID, m.Label, m.Location, m.Kind, string(m.Input), m.Version,
		encodeTime(m.CreatedAt), encodeTime(m.UpdatedAt),
	).Scan(&m.ID)
}

// memberColumns is the column list scanMember reads.
const memberColumns = `
		id,
		project_id,
		label,
		location,
		kind,
		input,
		version,
		created_at,
		updated_at`

// memberListColumns is the column list listMembersPage reads: memberColumns
// without the input document, which a listing does not return (it is most
// of a row's size), and without project_id, which the query fixes. The
// driver takes the connection's mutex several times for every column of
// every row, so the list reads only what it needs, and reads both
// timestamps as one text value, "created updated" (see splitTimes).
const memberListColumns = `
		id,
		label,
		location,
		kind,
		version,
		created_at || ' ' || updated_at`

func scanMember(row interface{ Scan(...any) error }) (*assess.MemberRecord, error) {
	var (
		mr               assess.MemberRecord
		input            []byte
		created, updated string
	)
	if err := row.Scan(&mr.ID, &mr.ProjectID, &mr.Label, &mr.Location, &mr.Kind, &input, &mr.Version,
		&created, &updated); err != nil {
		return nil, err
	}
	mr.Input = input
	var err error
	if mr.CreatedAt, err = decodeTime(created); err != nil {
		return nil, err
	}
	if mr.UpdatedAt, err = decodeTime(updated); err != nil {
		return nil, err
	}
	return &mr, nil
}

func findMember(ctx context.Context, tx *txn, id int64) (*assess.MemberRecord, error) {
	row := tx.QueryRowContext(ctx, `SELECT`+memberColumns+`
		FROM members
		WHERE id = ?`, id)
	m, err := scanMember(row)
	if errors.Is(err, sql.ErrNoRows) {
		return nil, fmt.Errorf("member %d: %w", id, assess.ErrNotFound)
	}
	return m, err
}

// findLiveMember returns the member if it exists and its project is not
// soft-deleted: ErrNotFound or ErrConflict otherwise.
func findLiveMember(ctx context.Context, tx *txn, id int64) (*assess.MemberRecord, error) {
	m, err := findMember(ctx, tx, id)
	if err != nil {
		return nil, err
	}
	if _, err := findLiveProject(ctx, tx, m.ProjectID); err != nil {
		return nil, err
	}
	return m, nil
}

// listMembersPage reads one page of a project's members. The project's
// existence is checked only when the page comes back empty: a non-empty page
// proves it (members cannot outlive their project), which saves a query on
// every listing. The check reads a later snapshot than the page; the answer
// is still one the database gave at some instant: an empty page if the
// project existed then, ErrNotFound if not.
func (db *DB) listMembersPage(ctx context.Context, projectID int64, pg assess.Page) ([]assess.MemberRecord, error) {
	var (
		rows *sql.Rows
		err  error
	)
	if pg.AfterID > 0 {
		rows, err = db.listMembersAfter.QueryContext(ctx, projectID, pg.AfterID, pg.Limit, pg.Offset)
	} else {
		rows, err = db.listMembers.QueryContext(ctx, projectID, pg.Limit, pg.Offset)
	}
	if err != nil {
		return nil, err
	}
	defer rows.Close()
	ms := make([]assess.MemberRecord, 0, pg.Limit)
	// The timestamps are scanned as raw bytes, reused from row to row, and
	// parsed by parseTime without going through strings.
	var times sql.RawBytes
	for rows.Next() {
		m := assess.MemberRecord{ProjectID: projectID}
		if err := rows.Scan(&m.ID, &m.Label, &m.Location, &m.Kind, &m.Version, &times); err != nil {
			return nil, err
		}
		created, updated := splitTimes(times)
		if m.CreatedAt, err = parseTime(created); err != nil {
			return nil, err
		}
		if m.UpdatedAt, err = parseTime(updated); err != nil {
			return nil, err
		}
		ms = append(ms, m)
	}
	if err := rows.Err(); err != nil {
		return nil, err
	}
	if len(ms) == 0 {
		var exists bool
		if err := db.db.QueryRowContext(ctx, `SELECT EXISTS (SELECT 1 FROM projects WHERE id = ?)`, projectID).Scan(&exists); err != nil {
			return nil, err
		}
		if !exists {
			return nil, fmt.Errorf("project %d: %w", projectID, assess.ErrNotFound)
		}
	}
	return ms, nil
}

// splitTimes splits "created updated" as memberListColumns selects them.
// Stored times (timeLayout) hold no space; the halves of anything else fail
// in parseTime.
func splitTimes(b []byte) (created, updated []byte) {
	if i := bytes.IndexByte(b, ' '); i >= 0 {
		return b[:i], b[i+1:]
	}
	return b, nil
}

// The two forms of the member list query: first page (or offset) and
// keyset page after an ID. Prepared once by Open (DB.prepare).
const (
	listMembersQuery = `SELECT` + memberListColumns + `
		FROM members
		WHERE project_id = ?
		ORDER BY id
		LIMIT ? OFFSET ?`
	listMembersAfterQuery = `SELECT` + memberListColumns + `
		FROM members
		WHERE project_id = ? AND id > ?
		ORDER BY id
		LIMIT ? OFFSET ?`
)

func updateMember(ctx context.Context, tx *txn, m *assess.MemberRecord) error {
	cur, err := findLiveMember(ctx, tx, m.ID)
	if err != nil {
		return err
	}
	if cur.Version != m.Version {
		return fmt.Errorf("member %d: version %d is stale (stored %d): %w",
			m.ID, m.Version, cur.Version, assess.ErrConflict)
	}
	res, err := tx.ExecContext(ctx, `
		UPDATE members
		SET label = ?,
			location = ?,
			kind = ?,
			input = ?,
			version = version + 1,
			updated_at = ?
		WHERE id = ? AND version = ?`,
		m.Label, m.Location, m.Kind, string(m.Input), encodeTime(tx.now), m.ID, m.Version)
	if err != nil {
		return err
	}
	if n, err := res.RowsAffected(); err != nil {
		return err
	} else if n != 1 {
		return fmt.Errorf("member %d: version %d is stale: %w", m.ID, m.Version, assess.ErrConflict)
	}
	got, err := findMember(ctx, tx, m.ID)
	if err != nil {
		return err
	}
	*m = *got
	return nil
}

func deleteMember(ctx context.Context, tx *txn, id int64) error {
	if _, err := findLiveMember(ctx, tx, id); err != nil {
		return err
	}
	var issued int
	if err := tx.QueryRowContext(ctx, `
		SELECT count(*)
		FROM assessments
		WHERE member_id = ? AND state = 'issued'`, id).Scan(&issued); err != nil {
		return err
	}
	if issued > 0 {
		return fmt.Errorf("member %d has %d issued assessment(s): %w", id, issued, assess.ErrConflict)
	}
	_, err := tx.ExecContext(ctx, `
		DELETE FROM members
		WHERE id = ?`, id)
	return err
}
