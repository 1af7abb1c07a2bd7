package assess

import (
	"bytes"
	"context"
	"encoding/json"
	"math"
	"strings"
	"time"
	"unicode/utf8"
)

// Store keeps projects, their members and the members' assessments as
// numbered revisions. Implementations (assess/sqlite, assess/postgres) are
// safe for concurrent use and pass the contract suite in assess/storetest.
//
// Rules common to every method:
//
//   - Errors wrap ErrNotFound, ErrConflict, ErrInvalid (as *InvalidError,
//     listing every problem) or ErrUnavailable (the database cannot be
//     reached; retry later). A cancelled or expired ctx gives an error
//     wrapping ctx.Err(). Anything else is an internal error.
//   - All times are set by the store from its clock, in UTC, truncated to
//     the microsecond (the resolution of PostgreSQL timestamps), so a value
//     returned by a write equals the value read back later.
//   - IDs are assigned by the store and grow with creation order. Every list
//     is ordered by ID ascending, which is creation order, and takes a Page.
//   - JSON (member input, assessment input snapshot and result) is stored
//     and returned byte for byte as given. It must be a JSON object.
//   - A soft-deleted project (DeletedAt set) and everything in it can still
//     be read, but any write to it, its members or its assessments fails
//     with ErrConflict.
type Store interface {
	// CreateProject validates p, stores it and sets p.ID, p.Version (1),
	// p.CreatedAt and p.UpdatedAt. Fields set by the store are ignored on input.
	CreateProject(ctx context.Context, p *Project) error

	// GetProject returns the project with the given ID, soft-deleted or not
	// (check DeletedAt), or ErrNotFound.
	GetProject(ctx context.Context, id int64) (*Project, error)

	// ListProjects returns projects in ID order. By default soft-deleted
	// projects are left out; see ProjectFilter.
	ListProjects(ctx context.Context, f ProjectFilter, pg Page) ([]Project, error)

	// UpdateProject stores p's Name, SiteAddress, ClientRef and Notes if
	// p.Version is the stored version; on success *p is refreshed from the
	// store (Version incremented, UpdatedAt set, CreatedAt as stored). A
	// stale version or a soft-deleted project gives ErrConflict; a missing
	// one ErrNotFound.
	UpdateProject(ctx context.Context, p *Project) error

	// DeleteProject removes a project. If none of its assessments is issued,
	// the project, its members and their draft assessments are deleted for
	// good (there is nothing of record to keep), whatever force says. If any
	// assessment is issued, the delete is refused with ErrConflict unless
	// force is true; then the project is soft-deleted: DeletedAt is set, the
	// rows are kept, and it is listed only with ProjectFilter.IncludeDeleted
	// or OnlyDeleted. Deleting a missing or already soft-deleted project gives
	// ErrNotFound.
	DeleteProject(ctx context.Context, id int64, force bool) error

	// CreateMember validates m, stores it in project m.ProjectID and sets
	// m.ID, m.Version (1), m.CreatedAt and m.UpdatedAt. A missing project gives
	// ErrNotFound.
	CreateMember(ctx context.Context, m *MemberRecord) error

	// GetMember returns the member with the given ID or ErrNotFound.
	GetMember(ctx context.Context, id int64) (*MemberRecord, error)

	// ListMembers returns the members of a project in ID order, without their
	// Input (nil; GetMember returns it). A missing project gives ErrNotFound.
	ListMembers(ctx context.Context, projectID int64, pg Page) ([]MemberRecord, error)

	// UpdateMember stores m's Label, Location, Kind and Input if m.Version is
	// the version the client read (m.ProjectID is ignored: a member never
	// changes project). On success *m is refreshed from the store: Version
	// incremented, UpdatedAt set, ProjectID and CreatedAt as stored. A stale
	// version gives ErrConflict (of several concurrent updates from the same
	// version exactly one succeeds); a missing member ErrNotFound. Stored
	// assessments keep their own input snapshots.
	UpdateMember(ctx context.Context, m *MemberRecord) error

	// DeleteMember deletes a member and its draft assessments. A member with
	// an issued assessment is kept and ErrConflict returned.
	DeleteMember(ctx context.Context, id int64) error

	// CreateAssessment validates a and stores it, with its result, as the
	// next revision of member a.MemberID, all in one transaction: revisions
	// of a member are numbered 1, 2, 3, … without gaps or duplicates even
	// under concurrent creates. The store sets a.ID, a.ProjectID, a.Revision,
	// a.CreatedAt, and a.IssuedAt if a.State is StateIssued. An empty State
	// means StateDraft. A missing member gives ErrNotFound.
	CreateAssessment(ctx context.Context, a *AssessmentRecord) error

	// GetAssessment returns the assessment with the given ID, with Input and
	// Result, or ErrNotFound.
	GetAssessment(ctx context.Context, id int64) (*AssessmentRecord, error)

	// GetRevision returns revision rev of a member, with Input and Result,
	// or ErrNotFound.
	GetRevision(ctx context.Context, memberID int64, rev int) (*AssessmentRecord, error)

	// ListAssessments returns the revisions of a member in ID order (which
	// is revision order) WITHOUT Input and Result (nil): the summary columns
	// are enough for a history table; use GetAssessment for the JSON. A
	// missing member gives ErrNotFound.
	ListAssessments(ctx context.Context, memberID int64, pg Page) ([]AssessmentRecord, error)

	// ListLatestAssessments returns, for each member of the project that has
	// at least one assessment, its highest revision (draft or issued), in
	// member ID order and WITHOUT Input and Result: the rows of the triage
	// table. Join them to ListMembers by MemberID; members without any
	// assessment have no row. A missing project gives ErrNotFound.
	ListLatestAssessments(ctx context.Context, projectID int64) ([]AssessmentRecord, error)

	// IssueAssessment marks a draft as issued, sets IssuedAt and returns the
	// updated record (with Input and Result). An issued revision is never
	// changed again: issuing it twice gives ErrConflict. There is no method
	// that changes a stored result; a re-run is a new revision.
	IssueAssessment(ctx context.Context, id int64) (*AssessmentRecord, error)

	// Ping checks that the database answers (for a readiness probe); it
	// returns an error wrapping ErrUnavailable if it does not.
	Ping(ctx context.Context) error

	// Close releases the store's connections.
	Close() error
}

// Project is a building or site under assessment.
type Project struct {
	ID          int64      `json:"id"`
	Name        string     `json:"name"`             // required, 1–200 characters
	SiteAddress string     `json:"site_address"`     // up to 500 characters
	ClientRef   string     `json:"client_reference"` // the client's reference, up to 100 characters
	Notes       string     `json:"notes"`            // free text, up to 10 000 characters
	Version     int64      `json:"version"`          // optimistic-concurrency counter, 1 on create
	CreatedAt   time.Time  `json:"created_at"`       // UTC, set by the store
	UpdatedAt   time.Time  `json:"updated_at"`       // UTC, set by the store
	DeletedAt   *time.Time `json:"deleted_at,omitempty"`
}

// Member kinds accepted by the store in MemberRecord.Kind.
const (
	MemberKindBeam = "beam"
	MemberKindSlab = "slab"
)

// MemberRecord is a stored structural member (a beam or a slab) of a project,
// with its assessment input as raw JSON so that storage does not depend on
// the engine's types.
type MemberRecord struct {
	ID        int64           `json:"id"`
	ProjectID int64           `json:"project_id"`
	Label     string          `json:"label"`    // required, 1–200 characters, e.g. "B12"
	Location  string          `json:"location"` // grid line and level, up to 200 characters, e.g. "grid C/3–4, level 2"
	Kind      string          `json:"kind"`     // MemberKindBeam or MemberKindSlab
	Input     json.RawMessage `json:"input"`    // the member's assessment input, a JSON object up to 1 MiB
	Version   int64           `json:"version"`  // optimistic-concurrency counter, 1 on create
	CreatedAt time.Time       `json:"created_at"`
	UpdatedAt time.Time       `json:"updated_at"`
}

// AssessmentState is the life-cycle state of an assessment revision.
type AssessmentState string

// Assessment states. A draft can be issued once; an issued revision is
// immutable.
const (
	StateDraft  AssessmentState = "draft"
	StateIssued AssessmentState = "issued"
)

// AssessmentRecord is one stored revision of a member's assessment: the input
// it was run with, the result, and the summary columns of the triage table.
type AssessmentRecord struct {
	ID            int64           `json:"id"`
	MemberID      int64           `json:"member_id"`
	ProjectID     int64           `json:"project_id"`          // set by the store from the member
	Revision      int             `json:"revision"`            // 1, 2, 3, … per member, set by the store
	Input         json.RawMessage `json:"input,omitempty"`     // input snapshot, a JSON object up to 1 MiB
	Result        json.RawMessage `json:"result,omitempty"`    // engine result, a JSON object up to 32 MiB
	MethodVersion string          `json:"method_version"`      // required, up to 100 characters
	InputHash     string          `json:"input_sha256"`        // hash of the canonical input, up to 128 characters
	Author        string          `json:"author"`              // who ran it, up to 200 characters
	State         AssessmentState `json:"state"`               // StateDraft or StateIssued
	CreatedAt     time.Time       `json:"created_at"`          // UTC, set by the store
	IssuedAt      *time.Time      `json:"issued_at,omitempty"` // UTC, set by the store on issue
	SaggingRatio  *float64        `json:"sagging_ratio"`       // residual/undamaged sagging capacity, nil if not assessed; 0–100
	HoggingRatio  *float64        `json:"hogging_ratio"`       // residual/undamaged hogging capacity, nil if not assessed; 0–100
	DamageClass   string          `json:"damage_class"`        // up to 50 characters
	Action        string          `json:"action"`              // recommended action, up to 200 characters
}

// ProjectFilter selects projects by deletion state. The zero value lists
// live projects only.
type ProjectFilter struct {
	IncludeDeleted bool // list live and soft-deleted projects
	OnlyDeleted    bool // list soft-deleted projects only (wins over IncludeDeleted)
}

// Page limits a list. Rows are always in ID order; AfterID (keyset: rows
// with ID > AfterID; pass the last ID of the previous page) and Offset
// (skip that many rows) are alternatives — setting both is invalid.
type Page struct {
	Limit   int   // rows per page, 1–MaxPageLimit; 0 means DefaultPageLimit
	AfterID int64 // keyset cursor, ≥ 0
	Offset  int   // rows to skip, ≥ 0
}

// Page limits.
const (
	DefaultPageLimit = 50
	MaxPageLimit     = 200
)

// Normalize returns the page with defaults applied, or an *InvalidError.
func (pg Page) Normalize() (Page, error) {
	var prob InvalidError
	switch {
	case pg.Limit == 0:
		pg.Limit = DefaultPageLimit
	case pg.Limit < 1 || pg.Limit > MaxPageLimit:
		prob.Addf("limit", "must be 1–%d, got %d", MaxPageLimit, pg.Limit)
	}
	if pg.AfterID < 0 {
		prob.Addf("after_id", "must be ≥ 0, got %d", pg.AfterID)
	}
	if pg.Offset < 0 {
		prob.Addf("offset", "must be ≥ 0, got %d", pg.Offset)
	}
	if pg.AfterID > 0 && pg.Offset > 0 {
		prob.Add("offset", "cannot be combined with after_id")
	}
	return pg, prob.Err()
}

// Field limits checked by the Validate methods (characters, or bytes for JSON).
const (
	recMaxNameLen     = 200
	recMaxAddressLen  = 500
	recMaxClientRef   = 100
	recMaxNotesLen    = 10000
	recMaxLocationLen = 200
	recMaxInputBytes  = 1 << 20
	recMaxResultBytes = 32 << 20
	recMaxMethodLen   = 100
	recMaxHashLen     = 128
	recMaxAuthorLen   = 200
	recMaxClassLen    = 50
	recMaxActionLen   = 200
	recMaxRatio       = 100
)

// Validate checks the fields a client sets and returns an *InvalidError
// listing every problem, or nil.
func (p *Project) Validate() error {
	var prob InvalidError
	recCheckText(&prob, "name", p.Name, 1, recMaxNameLen)
	recCheckText(&prob, "site_address", p.SiteAddress, 0, recMaxAddressLen)
	recCheckText(&prob, "client_reference", p.ClientRef, 0, recMaxClientRef)
	recCheckText(&prob, "notes", p.Notes, 0, recMaxNotesLen)
	return prob.Err()
}

// Validate checks the fields a client sets (except ProjectID, which the
// store checks against the stored projects) and returns an *InvalidError
// listing every problem, or nil.
func (m *MemberRecord) Validate() error {
	var prob InvalidError
	recCheckText(&prob, "label", m.Label, 1, recMaxNameLen)
	recCheckText(&prob, "location", m.Location, 0, recMaxLocationLen)
	if m.Kind != MemberKindBeam && m.Kind != MemberKindSlab {
		prob.Addf("kind", "must be %q or %q, got %q", MemberKindBeam, MemberKindSlab, m.Kind)
	}
	recCheckObject(&prob, "input", m.Input, recMaxInputBytes)
	return prob.Err()
}

// Validate checks the fields a client sets (except MemberID, which the
// store checks against the stored members) and returns an *InvalidError
// listing every problem, or nil.
func (a *AssessmentRecord) Validate() error {
	var prob InvalidError
	recCheckObject(&prob, "input", a.Input, recMaxInputBytes)
	recCheckObject(&prob, "result", a.Result, recMaxResultBytes)
	recCheckText(&prob, "method_version", a.MethodVersion, 1, recMaxMethodLen)
	recCheckText(&prob, "input_sha256", a.InputHash, 0, recMaxHashLen)
	recCheckText(&prob, "author", a.Author, 0, recMaxAuthorLen)
	if a.State != "" && a.State != StateDraft && a.State != StateIssued {
		prob.Addf("state", "must be %q or %q, got %q", StateDraft, StateIssued, a.State)
	}
	recCheckRatio(&prob, "sagging_ratio", a.SaggingRatio)
	recCheckRatio(&prob, "hogging_ratio", a.HoggingRatio)
	recCheckText(&prob, "damage_class", a.DamageClass, 0, recMaxClassLen)
	recCheckText(&prob, "action", a.Action, 0, recMaxActionLen)
	return prob.Err()
}

// recCheckText requires s to be valid UTF-8 without NUL bytes and min–max
// characters long.
func recCheckText(prob *InvalidError, field, s string, min, max int) {
	if !utf8.ValidString(s) {
		prob.Add(field, "must be valid UTF-8 text")
		return
	}
	if strings.IndexByte(s, 0) >= 0 {
		prob.Add(field, "must not contain NUL characters")
		return
	}
	n := utf8.RuneCountInString(s)
	switch {
	case n < min && min == 1:
		prob.Addf(field, "is required (1–%d characters)", max)
	case n < min || n > max:
		prob.Addf(field, "must be %d–%d characters, got %d", min, max, n)
	}
}

// recCheckObject requires raw to be a JSON object of at most max bytes.
func recCheckObject(prob *InvalidError, field string, raw json.RawMessage, max int) {
	switch {
	case len(raw) == 0:
		prob.Add(field, "is required (a JSON object)")
	case len(raw) > max:
		prob.Addf(field, "must be at most %d bytes, got %d", max, len(raw))
	case !json.Valid(raw):
		prob.Add(field, "must be valid JSON")
	default:
		if t := bytes.TrimLeft(raw, " \t\r\n"); t[0] != '{' {
			prob.Add(field, "must be a JSON object")
		}
	}
}

// recCheckRatio requires a set ratio to be finite and within 0–recMaxRatio.
func recCheckRatio(prob *InvalidError, field string, r *float64) {
	if r == nil {
		return
	}
	if math.IsNaN(*r) || *r < 0 || *r > recMaxRatio {
		prob.Addf(field, "must be 0–%d or null, got %g", recMaxRatio, *r)
	}
}
