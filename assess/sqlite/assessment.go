package sqlite

import (
	"context"
	"database/sql"
	"errors"
	"fmt"
	"strings"

	"residuum/assess"
)

// CreateAssessment implements assess.Store. The revision number comes from
// the member's last_revision counter, incremented in the same BEGIN
// IMMEDIATE transaction as the insert, so concurrent creates are numbered
// one after the other.
func (db *DB) CreateAssessment(ctx context.Context, a *assess.AssessmentRecord) error {
	if err := a.Validate(); err != nil {
		return fmt.Errorf("create assessment: %w", err)
	}
	tx, err := db.beginWrite(ctx)
	if err != nil {
		return fmt.Errorf("create assessment: %w", err)
	}
	defer tx.Rollback()
	if err := createAssessment(ctx, tx, a); err != nil {
		return fmt.Errorf("create assessment of member %d: %w", a.MemberID, formatError(err))
	}
	if err := tx.Commit(); err != nil {
		return fmt.Errorf("create assessment of member %d: %w", a.MemberID, formatError(err))
	}
	return nil
}

// GetAssessment implements assess.Store.
func (db *DB) GetAssessment(ctx context.Context, id int64) (*assess.AssessmentRecord, error) {
	tx, err := db.beginRead(ctx)
	if err != nil {
		return nil, fmt.Errorf("get assessment %d: %w", id, err)
	}
	defer tx.Rollback()
	a, err := findAssessment(ctx, tx, "a.id = ?", id)
	if err != nil {
		return nil, fmt.Errorf("get assessment %d: %w", id, formatError(err))
	}
	return a, nil
}

// GetRevision implements assess.Store.
func (db *DB) GetRevision(ctx context.Context, memberID int64, rev int) (*assess.AssessmentRecord, error) {
	tx, err := db.beginRead(ctx)
	if err != nil {
		return nil, fmt.Errorf("get revision %d of member %d: %w", rev, memberID, err)
	}
	defer tx.Rollback()
	a, err := findAssessment(ctx, tx, "a.member_id = ? AND a.revision = ?", memberID, rev)
	if err != nil {
		return nil, fmt.Errorf("get revision %d of member %d: %w", rev, memberID, formatError(err))
	}
	return a, nil
}

// ListAssessments implements assess.Store.
func (db *DB) ListAssessments(ctx context.Context, memberID int64, pg assess.Page) ([]assess.AssessmentRecord, error) {
	pg, err := pg.Normalize()
	if err != nil {
		return nil, fmt.Errorf("list assessments of member %d: %w", memberID, err)
	}
	tx, err := db.beginRead(ctx)
	if err != nil {
		return nil, fmt.Errorf("list assessments of member %d: %w", memberID, err)
	}
	defer tx.Rollback()
	as, err := listAssessments(ctx, tx, memberID, pg)
	if err != nil {
		return nil, fmt.Errorf("list assessments of member %d: %w", memberID, formatError(err))
	}
	return as, nil
}

// ListLatestAssessments implements assess.Store.
func (db *DB) ListLatestAssessments(ctx context.Context, projectID int64) ([]assess.AssessmentRecord, error) {
	tx, err := db.beginRead(ctx)
	if err != nil {
		return nil, fmt.Errorf("list latest assessments of project %d: %w", projectID, err)
	}
	defer tx.Rollback()
	as, err := listLatestAssessments(ctx, tx, projectID)
	if err != nil {
		return nil, fmt.Errorf("list latest assessments of project %d: %w", projectID, formatError(err))
	}
	return as, nil
}

// IssueAssessment implements assess.Store.
func (db *DB) IssueAssessment(ctx context.Context, id int64) (*assess.AssessmentRecord, error) {
	tx, err := db.beginWrite(ctx)
	if err != nil {
		return nil, fmt.Errorf("issue assessment %d: %w", id, err)
	}
	defer tx.Rollback()
	a, err := issueAssessment(ctx, tx, id)
	if err != nil {
		return nil, fmt.Errorf("issue assessment %d: %w", id, formatError(err))
	}
	if err := tx.Commit(); err != nil {
		return nil, fmt.Errorf("issue assessment %d: %w", id, formatError(err))
	}
	return a, nil
}

func createAssessment(ctx context.Context, tx *txn, a *assess.AssessmentRecord) error {
	m, err := findLiveMember(ctx, tx, a.MemberID)
	if err != nil {
		return err
	}
	if err := tx.QueryRowContext(ctx, `
		UPDATE members
		SET last_revision = last_revision + 1
		WHERE id = ?
		RETURNING last_revision`, a.MemberID).Scan(&a.Revision); err != nil {
		return err
	}
	a.ProjectID = m.ProjectID
	a.CreatedAt, a.IssuedAt = tx.now, nil
	switch a.State {
	case "":
		a.State = assess.StateDraft
	case assess.StateIssued:
		issued := tx.now
		a.IssuedAt = &issued
	}
	return tx.QueryRowContext(ctx, `
		INSERT INTO assessments (
			member_id,
			revision,
			input,
			result,
			method_version,
			input_sha256,
			author,
			state,
			created_at,
			issued_at,
			sagging_ratio,
			hogging_ratio,
			damage_class,
			action
		)
		VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)
		RETURNING id`,
		a.MemberID, a.Revision, string(a.Input), string(a.Result), a.MethodVersion, a.InputHash,
		a.Author, string(a.State), encodeTime(a.CreatedAt), encodeNullTime(a.IssuedAt),
		a.SaggingRatio, a.HoggingRatio, a.DamageClass, a.Action,
	).Scan(&a.ID)
}

// assessmentColumns is the column list scanAssessment reads; summaryColumns
// is the same without the JSON (NULL in its place).
const (
	assessmentColumns = `
		a.id,
		a.member_id,
		m.project_id,
		a.revision,
		a.input,
		a.result,
		a.method_version,
		a.input_sha256,
		a.author,
		a.state,
		a.created_at,
		a.issued_at,
		a.sagging_ratio,
		a.hogging_ratio,
		a.damage_class,
		a.action`
	summaryColumns = `
		a.id,
		a.member_id,
		m.project_id,
		a.revision,
		NULL,
		NULL,
		a.method_version,
		a.input_sha256,
		a.author,
		a.state,
		a.created_at,
		a.issued_at,
		a.sagging_ratio,
		a.hogging_ratio,
		a.damage_class,
		a.action`
)

func scanAssessment(row interface{ Scan(...any) error }) (*assess.AssessmentRecord, error) {
	var (
		a              assess.AssessmentRecord
		input, result  []byte
		state, created string
		issued         sql.NullString
		sag, hog       sql.Null[float64]
	)
	if err := row.Scan(&a.ID, &a.MemberID, &a.ProjectID, &a.Revision, &input, &result,
		&a.MethodVersion, &a.InputHash, &a.Author, &state, &created, &issued,
		&sag, &hog, &a.DamageClass, &a.Action); err != nil {
		return nil, err
	}
	a.Input, a.Result, a.State = input, result, assess.AssessmentState(state)
	if sag.Valid {
		a.SaggingRatio = &sag.V
	}
	if hog.Valid {
		a.HoggingRatio = &hog.V
	}
	var err error
	if a.CreatedAt, err = decodeTime(created); err != nil {
		return nil, err
	}
	if a.IssuedAt, err = decodeNullTime(issued); err != nil {
		return nil, err
	}
	return &a, nil
}

// findAssessment returns the one assessment matching where (a condition on
// "a", the assessments table, with bound parameters args), with its JSON.
func findAssessment(ctx context.Context, tx *txn, where string, args ...any) (*assess.AssessmentRecord, error) {
	row := tx.QueryRowContext(ctx, `SELECT`+assessmentColumns+`
		FROM assessments a
		JOIN members m ON m.id = a.member_id
		WHERE `+where, args...)
	a, err := scanAssessment(row)
	if errors.Is(err, sql.ErrNoRows) {
		return nil, assess.ErrNotFound
	}
	return a, err
}

func listAssessments(ctx context.Context, tx *txn, memberID int64, pg assess.Page) ([]assess.AssessmentRecord, error) {
	if _, err := findMember(ctx, tx, memberID); err != nil {
		return nil, err
	}
	where, args := []string{"a.member_id = ?"}, []any{memberID}
	if pg.AfterID > 0 {
		where, args = append(where, "a.id > ?"), append(args, pg.AfterID)
	}
	args = append(args, pg.Limit, pg.Offset)
	rows, err := tx.QueryContext(ctx, `SELECT`+summaryColumns+`
		FROM assessments a
		JOIN members m ON m.id = a.member_id
		WHERE `+strings.Join(where, " AND ")+`
		ORDER BY a.id
		LIMIT ? OFFSET ?`, args...)
	if err != nil {
		return nil, err
	}
	return collectAssessments(rows)
}

func listLatestAssessments(ctx context.Context, tx *txn, projectID int64) ([]assess.AssessmentRecord, error) {
	if _, err := findProject(ctx, tx, projectID); err != nil {
		return nil, err
	}
	rows, err := tx.QueryContext(ctx, `SELECT`+summaryColumns+`
		FROM members m
		JOIN assessments a ON a.member_id = m.id AND a.revision = m.last_revision
		WHERE m.project_id = ?
		ORDER BY m.id`, projectID)
	if err != nil {
		return nil, err
	}
	return collectAssessments(rows)
}

func collectAssessments(rows *sql.Rows) ([]assess.AssessmentRecord, error) {
	defer rows.Close()
	as := []assess.AssessmentRecord{}
	for rows.Next() {
		a, err := scanAssessment(rows)
		if err != nil {
			return nil, err
		}
		as = append(as, *a)
	}
	return as, rows.Err()
}

func issueAssessment(ctx context.Context, tx *txn, id int64) (*assess.AssessmentRecord, error) {
	a, err := findAssessment(ctx, tx, "a.id = ?", id)
	if err != nil {
		return nil, err
	}
	if _, err := findLiveProject(ctx, tx, a.ProjectID); err != nil {
		return nil, err
	}
	if a.State == assess.StateIssued {
		return nil, fmt.Errorf("revision %d of member %d is already issued: %w",
			a.Revision, a.MemberID, assess.ErrConflict)
	}
	if _, err := tx.ExecContext(ctx, `
		UPDATE assessments
		SET state = 'issued',
			issued_at = ?
		WHERE id = ?`, encodeTime(tx.now), id); err != nil {
		return nil, err
	}
	issued := tx.now
	a.State, a.IssuedAt = assess.StateIssued, &issued
	return a, nil
}
