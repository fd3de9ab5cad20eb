-- Jobs, their status history and results, API keys and callback deliveries.

-- +goose Up
CREATE TABLE api_keys (
    id          text PRIMARY KEY,
    name        text NOT NULL UNIQUE,
    hash        bytea NOT NULL UNIQUE CHECK (length(hash) = 32), -- sha256 of the key; the key itself is never stored
    secret      bytea NOT NULL,                                  -- HMAC-SHA256 secret for signing callbacks
    created_at  timestamptz NOT NULL DEFAULT clock_timestamp(),
    revoked_at  timestamptz
);

CREATE TABLE jobs (
    id               text PRIMARY KEY,
    owner            text NOT NULL DEFAULT '',  -- api_keys.id, '' for anonymous
    status           text NOT NULL CHECK (status IN ('queued', 'running', 'succeeded', 'failed', 'cancelled')),
    request          jsonb NOT NULL,
    reference        text NOT NULL DEFAULT '',
    callback_url     text NOT NULL DEFAULT '',
    generated        bigint NOT NULL DEFAULT 0,
    scored           bigint NOT NULL DEFAULT 0,
    total_estimate   bigint NOT NULL DEFAULT 0,
    error            text NOT NULL DEFAULT '',
    created_at       timestamptz NOT NULL DEFAULT clock_timestamp(),
    started_at       timestamptz,
    finished_at      timestamptz,
    lease_owner      text NOT NULL DEFAULT '',
    lease_until      timestamptz,
    attempts         integer NOT NULL DEFAULT 0,
    cancel_requested boolean NOT NULL DEFAULT false,
    idempotency_key  text,                      -- NULL when the client sent none
    request_hash     text NOT NULL DEFAULT '',
    UNIQUE (owner, idempotency_key)
);

-- The caller's own jobs, newest first (ListJobs).
CREATE INDEX jobs_owner_created ON jobs (owner, created_at DESC, id DESC);
-- The queue: queued jobs oldest first, running jobs by lease end (ClaimJob).
CREATE INDEX jobs_queued ON jobs (created_at, id) WHERE status = 'queued';
CREATE INDEX jobs_leased ON jobs (lease_until) WHERE status = 'running';

CREATE TABLE job_status_history (
    id      bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    job_id  text NOT NULL REFERENCES jobs (id) ON DELETE CASCADE,
    status  text NOT NULL,
    at      timestamptz NOT NULL DEFAULT clock_timestamp(),
    worker  text NOT NULL DEFAULT '',
    note    text NOT NULL DEFAULT ''
);
CREATE INDEX job_status_history_job ON job_status_history (job_id, id);

CREATE TABLE job_results (
    job_id         text PRIMARY KEY REFERENCES jobs (id) ON DELETE CASCADE,
    isomers_total  bigint NOT NULL DEFAULT 0,
    result         jsonb NOT NULL,  -- ranker.Result JSON
    created_at     timestamptz NOT NULL DEFAULT clock_timestamp()
);

CREATE TABLE callback_deliveries (
    id           bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    job_id       text NOT NULL REFERENCES jobs (id) ON DELETE CASCADE,
    attempt      integer NOT NULL,
    url          text NOT NULL,
    status_code  integer NOT NULL DEFAULT 0,
    error        text NOT NULL DEFAULT '',
    at           timestamptz NOT NULL DEFAULT clock_timestamp()
);
CREATE INDEX callback_deliveries_job ON callback_deliveries (job_id, id);

-- +goose Down
DROP TABLE callback_deliveries;
DROP TABLE job_results;
DROP TABLE job_status_history;
DROP TABLE jobs;
DROP TABLE api_keys;
