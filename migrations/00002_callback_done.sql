-- Remember whether a finished job's callback is settled (delivered, refused
-- or given up), so a restarted service can resume the ones that are not.

-- +goose Up
ALTER TABLE jobs ADD COLUMN callback_done boolean NOT NULL DEFAULT false;
CREATE INDEX jobs_callback_pending ON jobs (finished_at, id)
    WHERE callback_url <> '' AND NOT callback_done AND finished_at IS NOT NULL;

-- +goose Down
DROP INDEX jobs_callback_pending;
ALTER TABLE jobs DROP COLUMN callback_done;
