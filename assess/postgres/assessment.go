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

// CreateAssessment implements assess.Store. The revision number comes from
// the member's last_revision counter, incremented while the member row is
// locked FOR UPDATE in the same transaction as the insert, so concurrent
// creates for one member are numbered one after the other.
func (db *DB) CreateAssessment(ctx context.Context, a *assess.AssessmentRecord) error {
	if err := a.Validate(); err != nil {
		return fmt.Errorf("create assessment: %w", err)
	}
	tx, err := db.beginWrite(ctx)
	if err != nil {
		return fmt.Errorf("create assessment: %w", err)
	}
	defer tx.Rollback(ctx)
	if err := createAssessment(ctx, tx, a, db.now()); err != nil {
		return fmt.Errorf("create assessment of member %d: %w", a.MemberID, formatError(err))
	}
	if err := tx.Commit(ctx); err != nil {
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
	defer tx.Rollback(ctx)
	a, err := findAssessment(ctx, tx, "a.id = $1", id)
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
	defer tx.Rollback(ctx)
	a, err := findAssessment(ctx, tx, "a.member_id = $1 AND a.revision = $2", memberID, rev)
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
	defer tx.Rollback(ctx)
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
	defer tx.Rollback(ctx)
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
	defer tx.Rollback(ctx)
	a, err := issueAssessment(ctx, tx, id, db.now())
	if err != nil {
		return nil, fmt.Errorf("issue assessment %d: %w", id, formatError(err))
	}
	if err := tx.Commit(ctx); err != nil {
		return nil, fmt.Errorf("issue assessment %d: %w", id, formatError(err))
	}
	return a, nil
}

func createAssessment(ctx context.Context, tx pgx.Tx, a *assess.AssessmentRecord, now time.Time) error {
	// lockLiveMember holds the member row FOR UPDATE until commit: a second
	// create for the same member waits here and then sees the new counter.
	m, err := lockLiveMember(ctx, tx, a.MemberID)
	if err != nil {
		return err
	}
	if err := tx.QueryRow(ctx, `
		UPDATE members
		SET last_revision = last_revision + 1
		WHERE id = $1
		RETURNING last_revision`, a.MemberID).Scan(&a.Revision); err != nil {
		return err
	}
	a.ProjectID = m.ProjectID
	a.CreatedAt, a.IssuedAt = now, nil
	switch a.State {
	case "":
		a.State = assess.StateDraft
	case assess.StateIssued:
		issued := now
		a.IssuedAt = &issued
	}
	return tx.QueryRow(ctx, `
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
		VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12, $13, $14)
		RETURNING id`,
		a.MemberID, a.Revision, string(a.Input), string(a.Result), a.MethodVersion, a.InputHash,
		a.Author, string(a.State), a.CreatedAt, a.IssuedAt,
		a.SaggingRatio, a.HoggingRatio, a.DamageClass, a.Action,
	).Scan(&a.ID)
}

// assessmentRow is an assessments row joined to its member's project, as
// read by RowToStructByName.
type assessmentRow struct {
	ID            int64      `db:"id"`
	MemberID      int64      `db:"member_id"`
	ProjectID     int64      `db:"project_id"`
	Revision      int        `db:"revision"`
	Input         []byte     `db:"input"`
	Result        []byte     `db:"result"`
	MethodVersion string     `db:"method_version"`
	InputHash     string     `db:"input_sha256"`
	Author        string     `db:"author"`
	State         string     `db:"state"`
	CreatedAt     time.Time  `db:"created_at"`
	IssuedAt      *time.Time `db:"issued_at"`
	SaggingRatio  *float64   `db:"sagging_ratio"`
	HoggingRatio  *float64   `db:"hogging_ratio"`
	DamageClass   string     `db:"damage_class"`
	Action        string     `db:"action"`
}

func (r assessmentRow) assessment() assess.AssessmentRecord {
	return assess.AssessmentRecord{
		ID:            r.ID,
		MemberID:      r.MemberID,
		ProjectID:     r.ProjectID,
		Revision:      r.Revision,
		Input:         r.Input,
		Result:        r.Result,
		MethodVersion: r.MethodVersion,
		InputHash:     r.InputHash,
		Author:        r.Author,
		State:         assess.AssessmentState(r.State),
		CreatedAt:     utc(r.CreatedAt),
		IssuedAt:      utcPtr(r.IssuedAt),
		SaggingRatio:  r.SaggingRatio,
		HoggingRatio:  r.HoggingRatio,
		DamageClass:   r.DamageClass,
		Action:        r.Action,
	}
}

// assessmentColumns is the column list of assessmentRow; summaryColumns is
// the same with NULL in place of the JSON.
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
		NULL::json AS input,
		NULL::json AS result,
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

// findAssessment returns the one assessment matching where (a condition on
// "a", the assessments table, with bound parameters args), with its JSON.
func findAssessment(ctx context.Context, tx pgx.Tx, where string, args ...any) (*assess.AssessmentRecord, error) {
	rows, _ := tx.Query(ctx, `SELECT`+assessmentColumns+`
		FROM assessments a
		JOIN members m ON m.id = a.member_id
		WHERE `+where, args...)
	r, err := pgx.CollectExactlyOneRow(rows, pgx.RowToStructByName[assessmentRow])
	if errors.Is(err, pgx.ErrNoRows) {
		return nil, assess.ErrNotFound
	}
	if err != nil {
		return nil, err
	}
	a := r.assessment()
	return &a, nil
}

func collectAssessments(rows pgx.Rows) ([]assess.AssessmentRecord, error) {
	rs, err := pgx.CollectRows(rows, pgx.RowToStructByName[assessmentRow])
	if err != nil {
		return nil, err
	}
	as := make([]assess.AssessmentRecord, len(rs))
	for i, r := range rs {
		as[i] = r.assessment()
	}
	return as, nil
}

func listAssessments(ctx context.Context, tx pgx.Tx, memberID int64, pg assess.Page) ([]assess.AssessmentRecord, error) {
	if _, err := findMember(ctx, tx, memberID, ""); err != nil {
		return nil, err
	}
	var a args
	where := []string{"a.member_id = " + a.add(memberID)}
	if pg.AfterID > 0 {
		where = append(where, "a.id > "+a.add(pg.AfterID))
	}
	rows, _ := tx.Query(ctx, `SELECT`+summaryColumns+`
		FROM assessments a
		JOIN members m ON m.id = a.member_id
		WHERE `+strings.Join(where, " AND ")+`
		ORDER BY a.id
		LIMIT `+a.add(pg.Limit)+` OFFSET `+a.add(pg.Offset), a...)
	return collectAssessments(rows)
}

func listLatestAssessments(ctx context.Context, tx pgx.Tx, projectID int64) ([]assess.AssessmentRecord, error) {
	if _, err := findProject(ctx, tx, projectID, ""); err != nil {
		return nil, err
	}
	rows, _ := tx.Query(ctx, `SELECT`+summaryColumns+`
		FROM members m
		JOIN assessments a ON a.member_id = m.id AND a.revision = m.last_revision
		WHERE m.project_id = $1
		ORDER BY m.id`, projectID)
	return collectAssessments(rows)
}

func issueAssessment(ctx context.Context, tx pgx.Tx, id int64, now time.Time) (*assess.AssessmentRecord, error) {
	a, err := findAssessment(ctx, tx, "a.id = $1", id)
	if err != nil {
		return nil, err
	}
	// Lock in the order project → assessment, then read the row again
	// under its lock: a concurrent issue of the same draft waits here.
	if _, err := lockLiveProject(ctx, tx, a.ProjectID); err != nil {
		return nil, err
	}
	a, err = findAssessment(ctx, tx, "a.id = $1 FOR UPDATE OF a", id)
	if err != nil {
		return nil, err
	}
	if a.State == assess.StateIssued {
		return nil, fmt.Errorf("revision %d of member %d is already issued: %w",
			a.Revision, a.MemberID, assess.ErrConflict)
	}
	if _, err := tx.Exec(ctx, `
		UPDATE assessments
		SET state = 'issued',
			issued_at = $1
		WHERE id = $2`, now, id); err != nil {
		return nil, err
	}
	issued := now
	a.State, a.IssuedAt = assess.StateIssued, &issued
	return a, nil
}
