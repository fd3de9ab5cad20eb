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
// ClaimJob prefers jobs abandoned by a dead worker (expired lease), then takes
// queued jobs oldest first. A job found abandoned after it has been claimed
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
// # Ownership
//
// Every job has an Owner: the ID of the API key that created it, or "" for
// anonymous use. Methods taking an owner treat a job of another owner exactly
// like a missing one (ErrNotFound), so callers cannot probe for IDs.
//
// # Errors
//
// Errors wrap one of ErrNotFound, ErrConflict, ErrNoJob, ErrLeaseLost,
// ErrCancelRequested, ErrUnauthorized or ErrInvalid; test them with
// errors.Is. Any other error is an internal (database) failure. A method that
// returns an error has changed nothing.
package store
