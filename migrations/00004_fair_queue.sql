-- Fair sharing of the queue between API keys, and retention of finished jobs.

-- +goose Up
-- Each owner's queued jobs, oldest first: the head of every owner's queue
-- (ClaimJob's fair pick) and the queue length per owner (SubmitJob).
CREATE INDEX jobs_owner_queued ON jobs (owner, created_at, id) WHERE status = 'queued';
-- Running jobs per owner (ClaimJob's fair pick and per-owner limit).
CREATE INDEX jobs_owner_running ON jobs (owner) WHERE status = 'running';
-- Finished jobs by age (PurgeFinished).
CREATE INDEX jobs_finished ON jobs (finished_at) WHERE finished_at IS NOT NULL;

-- When each owner last had a queued job claimed: among owners with as many
-- running jobs, the one served longest ago goes first.
CREATE TABLE owner_claims (
    owner       text PRIMARY KEY,  -- api_keys.id, '' for anonymous
    last_claim  timestamptz NOT NULL
);

-- +goose Down
DROP TABLE owner_claims;
DROP INDEX jobs_finished;
DROP INDEX jobs_owner_running;
DROP INDEX jobs_owner_queued;
