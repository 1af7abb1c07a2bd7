-- Residuum store schema for PostgreSQL.
-- JSON is stored as json (not jsonb) so that it is returned byte for byte
-- as it was written. Times are timestamptz (microsecond resolution).

-- +goose Up
CREATE TABLE projects (
    id           bigint      GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    name         text        NOT NULL CHECK (name <> ''),
    site_address text        NOT NULL DEFAULT '',
    client_ref   text        NOT NULL DEFAULT '',
    notes        text        NOT NULL DEFAULT '',
    version      bigint      NOT NULL DEFAULT 1 CHECK (version >= 1),
    created_at   timestamptz NOT NULL,
    updated_at   timestamptz NOT NULL,
    deleted_at   timestamptz
);

CREATE TABLE members (
    id            bigint      GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    project_id    bigint      NOT NULL REFERENCES projects (id) ON DELETE CASCADE,
    label         text        NOT NULL CHECK (label <> ''),
    location      text        NOT NULL DEFAULT '',
    kind          text        NOT NULL CHECK (kind IN ('beam', 'slab')),
    input         json        NOT NULL,
    version       bigint      NOT NULL DEFAULT 1 CHECK (version >= 1),
    -- last_revision is the highest revision number handed out for this
    -- member; CreateAssessment increments it in the same transaction, and
    -- the row lock taken by that UPDATE serialises concurrent creates.
    last_revision integer     NOT NULL DEFAULT 0 CHECK (last_revision >= 0),
    created_at    timestamptz NOT NULL,
    updated_at    timestamptz NOT NULL
);

CREATE INDEX members_project ON members (project_id, id);

CREATE TABLE assessments (
    id             bigint           GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    member_id      bigint           NOT NULL REFERENCES members (id) ON DELETE CASCADE,
    revision       integer          NOT NULL CHECK (revision >= 1),
    input          json             NOT NULL,
    result         json             NOT NULL,
    method_version text             NOT NULL CHECK (method_version <> ''),
    input_sha256   text             NOT NULL DEFAULT '',
    author         text             NOT NULL DEFAULT '',
    state          text             NOT NULL CHECK (state IN ('draft', 'issued')),
    created_at     timestamptz      NOT NULL,
    issued_at      timestamptz,
    sagging_ratio  double precision,
    hogging_ratio  double precision,
    damage_class   text             NOT NULL DEFAULT '',
    action         text             NOT NULL DEFAULT '',
    UNIQUE (member_id, revision),
    CHECK ((state = 'issued') = (issued_at IS NOT NULL))
);

-- Issued revisions are the record: the database itself refuses to change
-- or delete them (also through ON DELETE CASCADE), whatever the Go code does.
-- SQLSTATE 23000 (integrity_constraint_violation) maps to assess.ErrConflict.
-- +goose StatementBegin
CREATE FUNCTION assessments_issued_immutable() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
    IF OLD.state = 'issued' THEN
        RAISE EXCEPTION 'issued assessment % cannot be changed or deleted', OLD.id
            USING ERRCODE = 'integrity_constraint_violation';
    END IF;
    IF TG_OP = 'DELETE' THEN
        RETURN OLD;
    END IF;
    RETURN NEW;
END;
$$;
-- +goose StatementEnd

CREATE TRIGGER assessments_issued_immutable
BEFORE UPDATE OR DELETE ON assessments
FOR EACH ROW EXECUTE FUNCTION assessments_issued_immutable();

-- +goose Down
DROP TRIGGER assessments_issued_immutable ON assessments;
DROP FUNCTION assessments_issued_immutable();
DROP TABLE assessments;
DROP INDEX members_project;
DROP TABLE members;
DROP TABLE projects;
