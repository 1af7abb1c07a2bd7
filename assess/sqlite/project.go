package sqlite

import (
	"context"
	"database/sql"
	"errors"
	"fmt"
	"strings"

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
	defer tx.Rollback()
	if err := createProject(ctx, tx, p); err != nil {
		return fmt.Errorf("create project: %w", formatError(err))
	}
	if err := tx.Commit(); err != nil {
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
	defer tx.Rollback()
	p, err := findProject(ctx, tx, id)
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
	defer tx.Rollback()
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
	defer tx.Rollback()
	if err := updateProject(ctx, tx, p); err != nil {
		return fmt.Errorf("update project %d: %w", p.ID, formatError(err))
	}
	if err := tx.Commit(); err != nil {
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
	defer tx.Rollback()
	if err := deleteProject(ctx, tx, id, force); err != nil {
		return fmt.Errorf("delete project %d: %w", id, formatError(err))
	}
	if err := tx.Commit(); err != nil {
		return fmt.Errorf("delete project %d: %w", id, formatError(err))
	}
	return nil
}

func createProject(ctx context.Context, tx *txn, p *assess.Project) error {
	p.Version = 1
	p.CreatedAt, p.UpdatedAt, p.DeletedAt = tx.now, tx.now, nil
	err := tx.QueryRowContext(ctx, `
		INSERT INTO projects (
			name,
			site_address,
			client_ref,
			notes,
			version,
			created_at,
			updated_at
		)
		VALUES (?, ?, ?, ?, ?, ?, ?)
		RETURNING id`,
		p.Name, p.SiteAddress, p.ClientRef, p.Notes, p.Version,
		encodeTime(p.CreatedAt), encodeTime(p.UpdatedAt),
	).Scan(&p.ID)
	return err
}

// projectColumns is the column list scanProject reads.
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

func scanProject(row interface{ Scan(...any) error }) (*assess.Project, error) {
	var (
		p                assess.Project
		created, updated string
		deleted          sql.NullString
	)
	if err := row.Scan(&p.ID, &p.Name, &p.SiteAddress, &p.ClientRef, &p.Notes, &p.Version,
		&created, &updated, &deleted); err != nil {
		return nil, err
	}
	var err error
	if p.CreatedAt, err = decodeTime(created); err != nil {
		return nil, err
	}
	if p.UpdatedAt, err = decodeTime(updated); err != nil {
		return nil, err
	}
	if p.DeletedAt, err = decodeNullTime(deleted); err != nil {
		return nil, err
	}
	return &p, nil
}

func findProject(ctx context.Context, tx *txn, id int64) (*assess.Project, error) {
	row := tx.QueryRowContext(ctx, `SELECT`+projectColumns+`
		FROM projects
		WHERE id = ?`, id)
	p, err := scanProject(row)
	if errors.Is(err, sql.ErrNoRows) {
		return nil, fmt.Errorf("project %d: %w", id, assess.ErrNotFound)
	}
	return p, err
}

// findLiveProject returns the project if it exists and is not soft-deleted:
// ErrNotFound or ErrConflict otherwise. Every write below a project calls it.
func findLiveProject(ctx context.Context, tx *txn, id int64) (*assess.Project, error) {
	p, err := findProject(ctx, tx, id)
	if err != nil {
		return nil, err
	}
	if p.DeletedAt != nil {
		return nil, fmt.Errorf("project %d is deleted: %w", id, assess.ErrConflict)
	}
	return p, nil
}

func listProjects(ctx context.Context, tx *txn, f assess.ProjectFilter, pg assess.Page) ([]assess.Project, error) {
	where, args := []string{"1 = 1"}, []any{}
	switch {
	case f.OnlyDeleted:
		where = append(where, "deleted_at IS NOT NULL")
	case !f.IncludeDeleted:
		where = append(where, "deleted_at IS NULL")
	}
	if pg.AfterID > 0 {
		where, args = append(where, "id > ?"), append(args, pg.AfterID)
	}
	args = append(args, pg.Limit, pg.Offset)
	rows, err := tx.QueryContext(ctx, `SELECT`+projectColumns+`
		FROM projects
		WHERE `+strings.Join(where, " AND ")+`
		ORDER BY id
		LIMIT ? OFFSET ?`, args...)
	if err != nil {
		return nil, err
	}
	defer rows.Close()
	ps := []assess.Project{}
	for rows.Next() {
		p, err := scanProject(rows)
		if err != nil {
			return nil, err
		}
		ps = append(ps, *p)
	}
	return ps, rows.Err()
}

func updateProject(ctx context.Context, tx *txn, p *assess.Project) error {
	cur, err := findLiveProject(ctx, tx, p.ID)
	if err != nil {
		return err
	}
	if cur.Version != p.Version {
		return fmt.Errorf("project %d: version %d is stale (stored %d): %w",
			p.ID, p.Version, cur.Version, assess.ErrConflict)
	}
	res, err := tx.ExecContext(ctx, `
		UPDATE projects
		SET name = ?,
			site_address = ?,
			client_ref = ?,
			notes = ?,
			version = version + 1,
			updated_at = ?
		WHERE id = ? AND version = ?`,
		p.Name, p.SiteAddress, p.ClientRef, p.Notes, encodeTime(tx.now), p.ID, p.Version)
	if err != nil {
		return err
	}
	if n, err := res.RowsAffected(); err != nil {
		return err
	} else if n != 1 {
		return fmt.Errorf("project %d: version %d is stale: %w", p.ID, p.Version, assess.ErrConflict)
	}
	got, err := findProject(ctx, tx, p.ID)
	if err != nil {
		return err
	}
	*p = *got
	return nil
}

func deleteProject(ctx context.Context, tx *txn, id int64, force bool) error {
	p, err := findProject(ctx, tx, id)
	if err != nil {
		return err
	}
	if p.DeletedAt != nil {
		return fmt.Errorf("project %d is already deleted: %w", id, assess.ErrNotFound)
	}
	var issued int
	if err := tx.QueryRowContext(ctx, `
		SELECT count(*)
		FROM assessments a
		JOIN members m ON m.id = a.member_id
		WHERE m.project_id = ? AND a.state = 'issued'`, id).Scan(&issued); err != nil {
		return err
	}
	switch {
	case issued == 0:
		// Nothing of record: remove the project, its members and drafts.
		_, err = tx.ExecContext(ctx, `
			DELETE FROM projects
			WHERE id = ?`, id)
	case !force:
		return fmt.Errorf("project %d has %d issued assessment(s); delete with force to archive it: %w",
			id, issued, assess.ErrConflict)
	default:
		_, err = tx.ExecContext(ctx, `
			UPDATE projects
			SET deleted_at = ?,
				updated_at = ?,
				version = version + 1
			WHERE id = ?`, encodeTime(tx.now), encodeTime(tx.now), id)
	}
	return err
}
