-- Residuum store schema for SQLite.
-- Times are TEXT in UTC, fixed-width RFC 3339 with microseconds
-- ("2006-01-02T15:04:05.000000Z"), so that text order is time order.
-- AUTOINCREMENT keeps IDs from being reused after a hard delete.

-- +goose Up
CREATE TABLE projects (
    id           INTEGER PRIMARY KEY AUTOINCREMENT,
    name         TEXT    NOT NULL CHECK (name <> ''),
    site_address TEXT    NOT NULL DEFAULT '',
    client_ref   TEXT    NOT NULL DEFAULT '',
    notes        TEXT    NOT NULL DEFAULT '',
    version      INTEGER NOT NULL DEFAULT 1 CHECK (version >= 1),
    created_at   TEXT    NOT NULL,
    updated_at   TEXT    NOT NULL,
    deleted_at   TEXT
);

CREATE TABLE members (
    id            INTEGER PRIMARY KEY AUTOINCREMENT,
    project_id    INTEGER NOT NULL REFERENCES projects (id) ON DELETE CASCADE,
    label         TEXT    NOT NULL CHECK (label <> ''),
    location      TEXT    NOT NULL DEFAULT '',
    kind          TEXT    NOT NULL CHECK (kind IN ('beam', 'slab')),
    input         TEXT    NOT NULL CHECK (json_valid(input)),
    version       INTEGER NOT NULL DEFAULT 1 CHECK (version >= 1),
    -- last_revision is the highest revision number handed out for this
    -- member; CreateAssessment increments it in the same transaction.
    last_revision INTEGER NOT NULL DEFAULT 0 CHECK (last_revision >= 0),
    created_at    TEXT    NOT NULL,
    updated_at    TEXT    NOT NULL
);

CREATE INDEX members_project ON members (project_id, id);

CREATE TABLE assessments (
    id             INTEGER PRIMARY KEY AUTOINCREMENT,
    member_id      INTEGER NOT NULL REFERENCES members (id) ON DELETE CASCADE,
    revision       INTEGER NOT NULL CHECK (revision >= 1),
    input          TEXT    NOT NULL CHECK (json_valid(input)),
    result         TEXT    NOT NULL CHECK (json_valid(result)),
    method_version TEXT    NOT NULL CHECK (method_version <> ''),
    input_sha256   TEXT    NOT NULL DEFAULT '',
    author         TEXT    NOT NULL DEFAULT '',
    state          TEXT    NOT NULL CHECK (state IN ('draft', 'issued')),
    created_at     TEXT    NOT NULL,
    issued_at      TEXT,
    sagging_ratio  REAL,
    hogging_ratio  REAL,
    damage_class   TEXT    NOT NULL DEFAULT '',
    action         TEXT    NOT NULL DEFAULT '',
    UNIQUE (member_id, revision),
    CHECK ((state = 'issued') = (issued_at IS NOT NULL))
);

-- Issued revisions are the record: the database itself refuses to change
-- or delete them (also through ON DELETE CASCADE), whatever the Go code does.
-- +goose StatementBegin
CREATE TRIGGER assessments_issued_no_update
BEFORE UPDATE ON assessments
WHEN OLD.state = 'issued'
BEGIN
    SELECT RAISE(ABORT, 'issued assessment cannot be changed');
END;
-- +goose StatementEnd

-- +goose StatementBegin
CREATE TRIGGER assessments_issued_no_delete
BEFORE DELETE ON assessments
WHEN OLD.state = 'issued'
BEGIN
    SELECT RAISE(ABORT, 'issued assessment cannot be deleted');
END;
-- +goose StatementEnd

-- +goose Down
DROP TRIGGER assessments_issued_no_delete;
DROP TRIGGER assessments_issued_no_update;
DROP TABLE assessments;
DROP INDEX members_project;
DROP TABLE members;
DROP TABLE projects;
