-- A claim on a finished job's callback, so that only one serve process at a
-- time delivers it (ClaimCallback): the worker holding it and until when.

-- +goose Up
ALTER TABLE jobs ADD COLUMN callback_claim_owner text NOT NULL DEFAULT '';
ALTER TABLE jobs ADD COLUMN callback_claim_until timestamptz;

-- +goose Down
ALTER TABLE jobs DROP COLUMN callback_claim_until;
ALTER TABLE jobs DROP COLUMN callback_claim_owner;
