package postgres

import (
	"context"
	"errors"
	"fmt"
	"strings"
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
func (db *DB) ListMembers(ctx context.Context, projectID int64, pg assess.Page) ([]assess.MemberRecord, error) {
	pg, err := pg.Normalize()
	if err != nil {
		return nil, fmt.Errorf("list members of project %d: %w", projectID, err)
	}
	tx, err := db.beginRead(ctx)
	if err != nil {
		return nil, fmt.Errorf("list members of project %d: %w", projectID, err)
	}
	defer tx.Rollback(ctx)
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

// memberListColumns is memberColumns without the input document, which a
// listing does not return (it is most of a row's size).
var memberListColumns = strings.Replace(memberColumns, "input,", "NULL AS input,", 1)

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

func listMembers(ctx context.Context, tx pgx.Tx, projectID int64, pg assess.Page) ([]assess.MemberRecord, error) {
	if _, err := findProject(ctx, tx, projectID, ""); err != nil {
		return nil, err
	}
	var a args
	where := []string{"project_id = " + a.add(projectID)}
	if pg.AfterID > 0 {
		where = append(where, "id > "+a.add(pg.AfterID))
	}
	rows, _ := tx.Query(ctx, `SELECT`+memberListColumns+`
		FROM members
		WHERE `+strings.Join(where, " AND ")+`
		ORDER BY id
		LIMIT `+a.add(pg.Limit)+` OFFSET `+a.add(pg.Offset), a...)
	rs, err := pgx.CollectRows(rows, pgx.RowToStructByName[memberRow])
	if err != nil {
		return nil, err
	}
	ms := make([]assess.MemberRecord, len(rs))
	for i, r := range rs {
		ms[i] = r.member()
	}
	return ms, nil
}

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
