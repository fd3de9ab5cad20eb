// Package store keeps shiftrank's ranking jobs, their results, API keys and
// callback delivery attempts.
//
// Two implementations share one method set and one behaviour:
//
//   - Memory, the embedded default: in-process, guarded by a mutex, lost on
//     restart. It is what `shiftrank serve` uses when no database is set.
//   - Postgres, durable: a pgx v5 pool on a PostgreSQL database whose schema
//     is created and upgraded by the embedded goose migrations (package
//     shiftrank/migrations) when it is opened.
//
// # Jobs and the queue
//
// CreateJob stores a job in status "queued". Workers take jobs with ClaimJob,
// which hands out a queued job, or a running job whose lease has expired (its
// worker died or stalled), marks it running under the caller's worker ID and
// sets a lease. While it works the holder calls RenewLease
// (before the lease runs out), UpdateProgress, and finally FinishJob or
// ReleaseJob. Each of these succeeds only for the current lease holder; any
// other caller gets ErrLeaseLost, so a job is never run by two workers at once
// and a job whose worker died is taken up by another worker after the lease
// expires. In Postgres the claim uses a row lock with FOR UPDATE SKIP LOCKED,
// so several serve processes on one database share the queue; the database is
// the only shared part and its clock is the one leases are measured against.
//
// ClaimJob prefers jobs abandoned by a dead worker (expired lease), then picks
// a queued job fairly between owners: the owner with the fewest running
// jobs, then the one served longest ago, gets its oldest queued job, so one
// API key's flood delays another's job by at most one job per worker.
// WithMaxRunningPerOwner caps an owner's running jobs; SubmitJob bounds an
// owner's queue (ErrLimit). A job found abandoned after it has been claimed
// DefaultMaxAttempts times (see WithMaxAttempts) is failed instead of being
// run again, so a job that kills its worker cannot cycle forever.
//
// A lease that has expired but that no other worker has claimed yet still
// belongs to its holder: RenewLease, UpdateProgress and FinishJob succeed.
// Worker IDs must be unique across processes (e.g. host, PID and a counter).
//
// # Cancellation
//
// CancelJob cancels a queued job at once. For a running job it sets a cancel
// request: RenewLease then returns ErrCancelRequested (after renewing the
// lease, so the holder can still call FinishJob with StatusCancelled), and
// CancelRequested reports true. If the holder dies instead, the next ClaimJob
// finishes the job as cancelled rather than handing it out again.
//
// # Callbacks
//
// RecordDelivery and Deliveries keep every attempt to POST a finished job's
// summary to its callback URL. When the delivery worker is done with a job
// (delivered, refused, or given up) it calls MarkCallbackDone;
// PendingCallbacks lists finished jobs whose callback is not settled, so a
// restarted service can resume them (at-least-once delivery). Before sending,
// a delivery worker takes the callback with ClaimCallback, a short lease like
// a job's: of several processes resuming one callback, one sends it.
//
// # Retention
//
// PurgeFinished deletes finished jobs older than a given age (with their
// results, history and deliveries) once their callbacks are settled. The
// memory store also keeps at most WithMaxFinished finished jobs
// (DefaultMaxFinished), forgetting those that finished longest ago.
//
// # API keys
//
// Only a key's SHA-256 hash is stored, beside its callback-signing secret
// (RotateAPIKeySecret replaces it). RevokeAPIKey also cancels the key's
// queued jobs, asks its running jobs to stop and settles all its callbacks.
//
// # Text
//
// Both stores accept exactly the text PostgreSQL can keep: strings and JSON
// with a NUL character, invalid UTF-8 or an unpaired surrogate escape are
// ErrInvalid, and an ID that is not of the form the store hands out is
// simply not found (ValidJobID).
//
// # Ownership
//
// Every job has an Owner: the ID of the API key that created it, or "" for
// anonymous use. Methods taking an owner treat a job of another owner exactly
// like a missing one (ErrNotFound), so callers cannot probe for IDs.
//
// # Errors
//
// Errors wrap one of ErrNotFound, ErrConflict, ErrNoJob, ErrLeaseLost,
// ErrCancelRequested, ErrUnauthorized, ErrInvalid or ErrLimit; test them
// with errors.Is. Any other error is a database failure; IsUnavailable tells
// the ones that mean the database could not be reached. A method that
// returns an error has changed nothing.
package store
