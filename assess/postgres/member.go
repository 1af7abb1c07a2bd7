package postgres

import (
	"context"
	"errors"
	"fmt"
	"time"

	"github.com/jackc/pgx/v5"

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
	defer tx.Rollback(ctx)
	if err := createMember(ctx, tx, m, db.now()); err != nil {
		return fmt.Errorf("create member: %w", formatError(err))
	}
	if err := tx.Commit(ctx); err != nil {
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
	defer tx.Rollback(ctx)
	m, err := findMember(ctx, tx, id, "")
	if err != nil {
		return nil, fmt.Errorf("get member %d: %w", id, formatError(err))
	}
	return m, nil
}

// ListMembers implements assess.Store.
//
// A listing is one statement on a pooled connection, not a transaction: a
// single SELECT sees one snapshot by itself, and BEGIN READ ONLY … ROLLBACK
// would cost two more round trips. See listMembers for the existence check.
func (db *DB) ListMembers(ctx context.Context, projectID int64, pg assess.Page) ([]assess.MemberRecord, error) {
	pg, err := pg.Normalize()
	if err != nil {
		return nil, fmt.Errorf("list members of project %d: %w", projectID, err)
	}
	ms, err := listMembers(ctx, db.pool, projectID, pg)
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
	defer tx.Rollback(ctx)
	if err := updateMember(ctx, tx, m, db.now()); err != nil {
		return fmt.Errorf("update member %d: %w", m.ID, formatError(err))
	}
	if err := tx.Commit(ctx); err != nil {
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
	defer tx.Rollback(ctx)
	if err := deleteMember(ctx, tx, id); err != nil {
		return fmt.Errorf("delete member %d: %w", id, formatError(err))
	}
	if err := tx.Commit(ctx); err != nil {
		return fmt.Errorf("delete member %d: %w", id, formatError(err))
	}
	return nil
}

// memberRow is a members row as read by RowToStructByName.
type memberRow struct {
	ID        int64     `db:"id"`
	ProjectID int64     `db:"project_id"`
	Label     string    `db:"label"`
	Location  string    `db:"location"`
	Kind      string    `db:"kind"`
	Input     []byte    `db:"input"`
	Version   int64     `db:"version"`
	CreatedAt time.Time `db:"created_at"`
	UpdatedAt time.Time `db:"updated_at"`
}

func (r memberRow) member() assess.MemberRecord {
	return assess.MemberRecord{
		ID:        r.ID,
		ProjectID: r.ProjectID,
		Label:     r.Label,
		Location:  r.Location,
		Kind:      r.Kind,
		Input:     r.Input,
		Version:   r.Version,
		CreatedAt: utc(r.CreatedAt),
		UpdatedAt: utc(r.UpdatedAt),
	}
}

// memberColumns is the column list of memberRow.
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

// memberListColumns is the column list listMembers reads: memberColumns
// without the input document, which a listing does not return (it is most
// of a row's size), and without project_id, which the query fixes.
const memberListColumns = `
		id,
		label,
		location,
		kind,
		version,
		created_at,
		updated_at`

func createMember(ctx context.Context, tx pgx.Tx, m *assess.MemberRecord, now time.Time) error {
	if _, err := lockLiveProject(ctx, tx, m.ProjectID); err != nil {
		return err
	}
	m.Version = 1
	m.CreatedAt, m.UpdatedAt = now, now
	return tx.QueryRow(ctx, `
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
		VALUES ($1, $2, $3, $4, $5, $6, $7, $8)
		RETURNING id`,
		m.ProjectID, m.Label, m.Location, m.Kind, string(m.Input), m.Version, m.CreatedAt, m.UpdatedAt,
	).Scan(&m.ID)
}

// findMember reads a member; lock is "" or a locking clause.
func findMember(ctx context.Context, tx pgx.Tx, id int64, lock string) (*assess.MemberRecord, error) {
	rows, _ := tx.Query(ctx, `SELECT`+memberColumns+`
		FROM members
		WHERE id = $1 `+lock, id)
	r, err := pgx.CollectExactlyOneRow(rows, pgx.RowToStructByName[memberRow])
	if errors.Is(err, pgx.ErrNoRows) {
		return nil, fmt.Errorf("member %d: %w", id, assess.ErrNotFound)
	}
	if err != nil {
		return nil, err
	}
	m := r.member()
	return &m, nil
}

// lockLiveMember locks the member's project FOR SHARE and then the member
// FOR UPDATE, and requires the project not to be soft-deleted.
func lockLiveMember(ctx context.Context, tx pgx.Tx, id int64) (*assess.MemberRecord, error) {
	m, err := findMember(ctx, tx, id, "")
	if err != nil {
		return nil, err
	}
	// A member never changes project, so the ID read without a lock stays
	// valid; lock in the order project → member.
	if _, err := lockLiveProject(ctx, tx, m.ProjectID); err != nil {
		return nil, err
	}
	return findMember(ctx, tx, id, "FOR UPDATE")
}

// querier is what listMembers needs of a pool or a transaction.
type querier interface {
	Query(ctx context.Context, sql string, args ...any) (pgx.Rows, error)
	QueryRow(ctx context.Context, sql string, args ...any) pgx.Row
}

// listMembers reads one page of a project's members, scanning each row's
// columns straight into the record (no reflection). The project's existence
// is checked only when the page comes back empty: a non-empty page proves it
// (members cannot outlive their project), which saves a query on every
// listing. Outside a transaction the check runs on a later snapshot than
// the page; the answer is still one the database gave at some instant: an
// empty page if the project existed then, ErrNotFound if not.
func listMembers(ctx context.Context, q querier, projectID int64, pg assess.Page) ([]assess.MemberRecord, error) {
	query, args := listMembersQuery, []any{projectID, pg.Limit, pg.Offset}
	if pg.AfterID > 0 {
		query, args = listMembersAfterQuery, []any{projectID, pg.AfterID, pg.Limit, pg.Offset}
	}
	rows, err := q.Query(ctx, query, args...)
	if err != nil {
		return nil, err
	}
	defer rows.Close()
	ms := make([]assess.MemberRecord, 0, pg.Limit)
	for rows.Next() {
		m := assess.MemberRecord{ProjectID: projectID}
		if err := rows.Scan(&m.ID, &m.Label, &m.Location, &m.Kind, &m.Version, &m.CreatedAt, &m.UpdatedAt); err != nil {
			return nil, err
		}
		m.CreatedAt, m.UpdatedAt = utc(m.CreatedAt), utc(m.UpdatedAt)
		ms = append(ms, m)
	}
	if err := rows.Err(); err != nil {
		return nil, err
	}
	if len(ms) == 0 {
		var exists bool
		if err := q.QueryRow(ctx, `SELECT EXISTS (SELECT 1 FROM projects WHERE id = $1)`, projectID).Scan(&exists); err != nil {
			return nil, err
		}
		if !exists {
			return nil, fmt.Errorf("project %d: %w", projectID, assess.ErrNotFound)
		}
	}
	return ms, nil
}

// The two forms of the member list query: first page (or offset) and
// keyset page after an ID. Constant text, so pgx's statement cache prepares
// each once per connection.
const (
	listMembersQuery = `SELECT` + memberListColumns + `
		FROM members
		WHERE project_id = $1
		ORDER BY id
		LIMIT $2 OFFSET $3`
	listMembersAfterQuery = `SELECT` + memberListColumns + `
		FROM members
		WHERE project_id = $1 AND id > $2
		ORDER BY id
		LIMIT $3 OFFSET $4`
)

func updateMember(ctx context.Context, tx pgx.Tx, m *assess.MemberRecord, now time.Time) error {
	cur, err := lockLiveMember(ctx, tx, m.ID)
	if err != nil {
		return err
	}
	if cur.Version != m.Version {
		return fmt.Errorf("member %d: version %d is stale (stored %d): %w",
			m.ID, m.Version, cur.Version, assess.ErrConflict)
	}
	if _, err := tx.Exec(ctx, `
		UPDATE members
		SET label = $1,
			location = $2,
			kind = $3,
			input = $4,
			version = version + 1,
			updated_at = $5
		WHERE id = $6`,
		m.Label, m.Location, m.Kind, string(m.Input), now, m.ID); err != nil {
		return err
	}
	got, err := findMember(ctx, tx, m.ID, "")
	if err != nil {
		return err
	}
	*m = *got
	return nil
}

func deleteMember(ctx context.Context, tx pgx.Tx, id int64) error {
	if _, err := lockLiveMember(ctx, tx, id); err != nil {
		return err
	}
	var issued int
	if err := tx.QueryRow(ctx, `
		SELECT count(*)
		FROM assessments
		WHERE member_id = $1 AND state = 'issued'`, id).Scan(&issued); err != nil {
		return err
	}
	if issued > 0 {
		return fmt.Errorf("member %d has %d issued assessment(s): %w", id, issued, assess.ErrConflict)
	}
	_, err := tx.Exec(ctx, `
		DELETE FROM members
		WHERE id = $1`, id)
	return err
}
