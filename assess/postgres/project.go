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

// CreateProject implements assess.Store.
func (db *DB) CreateProject(ctx context.Context, p *assess.Project) error {
	if err := p.Validate(); err != nil {
		return fmt.Errorf("create project: %w", err)
	}
	tx, err := db.beginWrite(ctx)
	if err != nil {
		return fmt.Errorf("create project: %w", err)
	}
	defer tx.Rollback(ctx)
	if err := createProject(ctx, tx, p, db.now()); err != nil {
		return fmt.Errorf("create project: %w", formatError(err))
	}
	if err := tx.Commit(ctx); err != nil {
		return fmt.Errorf("create project: %w", formatError(err))
	}
	return nil
}

// GetProject implements assess.Store.
func (db *DB) GetProject(ctx context.Context, id int64) (*assess.Project, error) {
	tx, err := db.beginRead(ctx)
	if err != nil {
		return nil, fmt.Errorf("get project %d: %w", id, err)
	}
	defer tx.Rollback(ctx)
	p, err := findProject(ctx, tx, id, "")
	if err != nil {
		return nil, fmt.Errorf("get project %d: %w", id, formatError(err))
	}
	return p, nil
}

// ListProjects implements assess.Store.
func (db *DB) ListProjects(ctx context.Context, f assess.ProjectFilter, pg assess.Page) ([]assess.Project, error) {
	pg, err := pg.Normalize()
	if err != nil {
		return nil, fmt.Errorf("list projects: %w", err)
	}
	tx, err := db.beginRead(ctx)
	if err != nil {
		return nil, fmt.Errorf("list projects: %w", err)
	}
	defer tx.Rollback(ctx)
	ps, err := listProjects(ctx, tx, f, pg)
	if err != nil {
		return nil, fmt.Errorf("list projects: %w", formatError(err))
	}
	return ps, nil
}

// UpdateProject implements assess.Store.
func (db *DB) UpdateProject(ctx context.Context, p *assess.Project) error {
	if err := p.Validate(); err != nil {
		return fmt.Errorf("update project %d: %w", p.ID, err)
	}
	tx, err := db.beginWrite(ctx)
	if err != nil {
		return fmt.Errorf("update project %d: %w", p.ID, err)
	}
	defer tx.Rollback(ctx)
	if err := updateProject(ctx, tx, p, db.now()); err != nil {
		return fmt.Errorf("update project %d: %w", p.ID, formatError(err))
	}
	if err := tx.Commit(ctx); err != nil {
		return fmt.Errorf("update project %d: %w", p.ID, formatError(err))
	}
	return nil
}

// DeleteProject implements assess.Store: a hard delete when no assessment
// of the project is issued, otherwise refused or (force) a soft delete.
func (db *DB) DeleteProject(ctx context.Context, id int64, force bool) error {
	tx, err := db.beginWrite(ctx)
	if err != nil {
		return fmt.Errorf("delete project %d: %w", id, err)
	}
	defer tx.Rollback(ctx)
	if err := deleteProject(ctx, tx, id, force, db.now()); err != nil {
		return fmt.Errorf("delete project %d: %w", id, formatError(err))
	}
	if err := tx.Commit(ctx); err != nil {
		return fmt.Errorf("delete project %d: %w", id, formatError(err))
	}
	return nil
}

// projectRow is a projects row as read by RowToStructByName.
type projectRow struct {
	ID          int64      `db:"id"`
	Name        string     `db:"name"`
	SiteAddress string     `db:"site_address"`
	ClientRef   string     `db:"client_ref"`
	Notes       string     `db:"notes"`
	Version     int64      `db:"version"`
	CreatedAt   time.Time  `db:"created_at"`
	UpdatedAt   time.Time  `db:"updated_at"`
	DeletedAt   *time.Time `db:"deleted_at"`
}

func (r projectRow) project() assess.Project {
	return assess.Project{
		ID:          r.ID,
		Name:        r.Name,
		SiteAddress: r.SiteAddress,
		ClientRef:   r.ClientRef,
		Notes:       r.Notes,
		Version:     r.Version,
		CreatedAt:   utc(r.CreatedAt),
		UpdatedAt:   utc(r.UpdatedAt),
		DeletedAt:   utcPtr(r.DeletedAt),
	}
}

// projectColumns is the column list of projectRow.
const projectColumns = `
		id,
		name,
		site_address,
		client_ref,
		notes,
		version,
		created_at,
		updated_at,
		deleted_at`

func createProject(ctx context.Context, tx pgx.Tx, p *assess.Project, now time.Time) error {
	p.Version = 1
	p.CreatedAt, p.UpdatedAt, p.DeletedAt = now, now, nil
	return tx.QueryRow(ctx, `
		INSERT INTO projects (
			name,
			site_address,
			client_ref,
			notes,
			version,
			created_at,
			updated_at
		)
		VALUES ($1, $2, $3, $4, $5, $6, $7)
		RETURNING id`,
		p.Name, p.SiteAddress, p.ClientRef, p.Notes, p.Version, p.CreatedAt, p.UpdatedAt,
	).Scan(&p.ID)
}

// findProject reads a project; lock is "" or a locking clause such as
// "FOR SHARE" or "FOR UPDATE".
func findProject(ctx context.Context, tx pgx.Tx, id int64, lock string) (*assess.Project, error) {
	rows, _ := tx.Query(ctx, `SELECT`+projectColumns+`
		FROM projects
		WHERE id = $1 `+lock, id)
	r, err := pgx.CollectExactlyOneRow(rows, pgx.RowToStructByName[projectRow])
	if errors.Is(err, pgx.ErrNoRows) {
		return nil, fmt.Errorf("project %d: %w", id, assess.ErrNotFound)
	}
	if err != nil {
		return nil, err
	}
	p := r.project()
	return &p, nil
}

// lockLiveProject locks the project FOR SHARE (a concurrent delete waits)
// and requires it to exist and not be soft-deleted: ErrNotFound or
// ErrConflict otherwise. Every write below a project calls it first.
func lockLiveProject(ctx context.Context, tx pgx.Tx, id int64) (*assess.Project, error) {
	p, err := findProject(ctx, tx, id, "FOR SHARE")
	if err != nil {
		return nil, err
	}
	if p.DeletedAt != nil {
		return nil, fmt.Errorf("project %d is deleted: %w", id, assess.ErrConflict)
	}
	return p, nil
}

func listProjects(ctx context.Context, tx pgx.Tx, f assess.ProjectFilter, pg assess.Page) ([]assess.Project, error) {
	var a args
	where := []string{"TRUE"}
	switch {
	case f.OnlyDeleted:
		where = append(where, "deleted_at IS NOT NULL")
	case !f.IncludeDeleted:
		where = append(where, "deleted_at IS NULL")
	}
	if pg.AfterID > 0 {
		where = append(where, "id > "+a.add(pg.AfterID))
	}
	rows, _ := tx.Query(ctx, `SELECT`+projectColumns+`
		FROM projects
		WHERE `+strings.Join(where, " AND ")+`
		ORDER BY id
		LIMIT `+a.add(pg.Limit)+` OFFSET `+a.add(pg.Offset), a...)
	rs, err := pgx.CollectRows(rows, pgx.RowToStructByName[projectRow])
	if err != nil {
		return nil, err
	}
	ps := make([]assess.Project, len(rs))
	for i, r := range rs {
		ps[i] = r.project()
	}
	return ps, nil
}

func updateProject(ctx context.Context, tx pgx.Tx, p *assess.Project, now time.Time) error {
	cur, err := findProject(ctx, tx, p.ID, "FOR UPDATE")
	if err != nil {
		return err
	}
	if cur.DeletedAt != nil {
		return fmt.Errorf("project %d is deleted: %w", p.ID, assess.ErrConflict)
	}
	if cur.Version != p.Version {
		return fmt.Errorf("project %d: version %d is stale (stored %d): %w",
			p.ID, p.Version, cur.Version, assess.ErrConflict)
	}
	if _, err := tx.Exec(ctx, `
		UPDATE projects
		SET name = $1,
			site_address = $2,
			client_ref = $3,
			notes = $4,
			version = version + 1,
			updated_at = $5
		WHERE id = $6`,
		p.Name, p.SiteAddress, p.ClientRef, p.Notes, now, p.ID); err != nil {
		return err
	}
	got, err := findProject(ctx, tx, p.ID, "")
	if err != nil {
		return err
	}
	*p = *got
	return nil
}

func deleteProject(ctx context.Context, tx pgx.Tx, id int64, force bool, now time.Time) error {
	p, err := findProject(ctx, tx, id, "FOR UPDATE")
	if err != nil {
		return err
	}
	if p.DeletedAt != nil {
		return fmt.Errorf("project %d is already deleted: %w", id, assess.ErrNotFound)
	}
	var issued int
	if err := tx.QueryRow(ctx, `
		SELECT count(*)
		FROM assessments a
		JOIN members m ON m.id = a.member_id
		WHERE m.project_id = $1 AND a.state = 'issued'`, id).Scan(&issued); err != nil {
		return err
	}
	switch {
	case issued == 0:
		// Nothing of record: remove the project, its members and drafts.
		// (An assessment issued meanwhile stops the cascade: the trigger
		// on issued rows refuses, and the whole delete fails.)
		_, err = tx.Exec(ctx, `
			DELETE FROM projects
			WHERE id = $1`, id)
	case !force:
		return fmt.Errorf("project %d has %d issued assessment(s); delete with force to archive it: %w",
			id, issued, assess.ErrConflict)
	default:
		_, err = tx.Exec(ctx, `
			UPDATE projects
			SET deleted_at = $1,
				updated_at = $1,
				version = version + 1
			WHERE id = $2`, now, id)
	}
	return err
}
