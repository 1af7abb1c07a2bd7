package sqlite

import (
	"context"
	"database/sql"
	"errors"
	"fmt"
	"strings"

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
func (db *DB) ListMembers(ctx context.Context, projectID int64, pg assess.Page) ([]assess.MemberRecord, error) {
	pg, err := pg.Normalize()
	if err != nil {
		return nil, fmt.Errorf("list members of project %d: %w", projectID, err)
	}
	tx, err := db.beginRead(ctx)
	if err != nil {
		return nil, fmt.Errorf("list members of project %d: %w", projectID, err)
	}
	defer tx.Rollback()
	ms, err := listMembers(ctx, tx, projectID, pg)
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

// memberListColumns is memberColumns without the input document, which a
// listing does not return (it is most of a row's size).
var memberListColumns = strings.Replace(memberColumns, "input,", "NULL AS input,", 1)

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

func listMembers(ctx context.Context, tx *txn, projectID int64, pg assess.Page) ([]assess.MemberRecord, error) {
	if _, err := findProject(ctx, tx, projectID); err != nil {
		return nil, err
	}
	where, args := []string{"project_id = ?"}, []any{projectID}
	if pg.AfterID > 0 {
		where, args = append(where, "id > ?"), append(args, pg.AfterID)
	}
	args = append(args, pg.Limit, pg.Offset)
	rows, err := tx.QueryContext(ctx, `SELECT`+memberListColumns+`
		FROM members
		WHERE `+strings.Join(where, " AND ")+`
		ORDER BY id
		LIMIT ? OFFSET ?`, args...)
	if err != nil {
		return nil, err
	}
	defer rows.Close()
	ms := []assess.MemberRecord{}
	for rows.Next() {
		m, err := scanMember(rows)
		if err != nil {
			return nil, err
		}
		ms = append(ms, *m)
	}
	return ms, rows.Err()
}

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
