package store

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"hash/fnv"
	"time"

	"github.com/jackc/pgx/v5"
	"github.com/jackc/pgx/v5/pgconn"
	"github.com/jackc/pgx/v5/pgxpool"
	"github.com/jackc/pgx/v5/stdlib"
	"github.com/pressly/goose/v3"
	"github.com/pressly/goose/v3/lock"

	"shiftrank/migrations"
)

// Postgres is the durable store: a pgx v5 connection pool on a PostgreSQL
// database (version 13 or later) holding the schema of package migrations.
// It is safe for concurrent use, and several processes may open the same
// database: they share one queue, coordinated by row locks.
//
// Request and Result.Body are stored as jsonb, so they come back with the
// same JSON values but PostgreSQL's normalised layout (whitespace removed,
// object keys reordered); decode them rather than comparing bytes.
type Postgres struct {
	pool *pgxpool.Pool
	opts options
}

// Open connects to the PostgreSQL database at url (a postgres:// URL or a
// key=value connection string, as pgx accepts), applies any pending embedded
// migrations with goose v3 and returns a store serving from a connection
// pool. Migrations from concurrent Open calls are serialised by an advisory
// lock. A search_path parameter in url selects the schema (which must exist;
// see OpenSchema). Options such as WithMaxAttempts configure the store.
// Close the store when done.
func Open(ctx context.Context, url string, opts ...Option) (*Postgres, error) {
	cfg, err := pgxpool.ParseConfig(url)
	if err != nil {
		return nil, fmt.Errorf("open store: parse database url: %w", err)
	}
	return openConfig(ctx, cfg, opts)
}

// OpenSchema is Open confined to one schema of the database: it creates the
// schema if it does not exist, sets every connection's search_path to it,
// and applies the migrations there. Tests use it to give each test, or each
// group of cooperating processes, a fresh schema of its own; pass the same
// schema to share one. Drop it with DropSchema.
func OpenSchema(ctx context.Context, url, schema string, opts ...Option) (*Postgres, error) {
	cfg, err := pgxpool.ParseConfig(url)
	if err != nil {
		return nil, fmt.Errorf("open store: parse database url: %w", err)
	}
	if schema == "" {
		return nil, fmt.Errorf("open store: empty schema name: %w", ErrInvalid)
	}
	if err := CreateSchema(ctx, url, schema); err != nil {
		return nil, fmt.Errorf("open store: %w", err)
	}
	cfg.ConnConfig.RuntimeParams["search_path"] = pgx.Identifier{schema}.Sanitize()
	return openConfig(ctx, cfg, opts)
}

// CreateSchema creates the named schema in the database at url if it does
// not exist yet. It is safe to call from several processes at once.
func CreateSchema(ctx context.Context, url, schema string) error {
	return execOnce(ctx, url, "create schema "+schema, "CREATE SCHEMA IF NOT EXISTS "+pgx.Identifier{schema}.Sanitize())
}

// DropSchema drops the named schema and everything in it from the database
// at url; a missing schema is not an error.
func DropSchema(ctx context.Context, url, schema string) error {
	return execOnce(ctx, url, "drop schema "+schema, "DROP SCHEMA IF EXISTS "+pgx.Identifier{schema}.Sanitize()+" CASCADE")
}

// execOnce runs one statement on a fresh connection.
func execOnce(ctx context.Context, url, what, sql string) error {
	conn, err := pgx.Connect(ctx, url)
	if err != nil {
		return fmt.Errorf("%s: connect: %w", what, err)
	}
	defer conn.Close(context.WithoutCancel(ctx))
	_, err = conn.Exec(ctx, sql)
	var pgErr *pgconn.PgError
	// Concurrent CREATE SCHEMA IF NOT EXISTS can still collide in the
	// catalog; the schema exists either way.
	if errors.As(err, &pgErr) && (pgErr.Code == "23505" || pgErr.Code == "42P06") {
		err = nil
	}
	if err != nil {
		return fmt.Errorf("%s: %w", what, err)
	}
	return nil
}

func openConfig(ctx context.Context, cfg *pgxpool.Config, opts []Option) (*Postgres, error) {
	if err := migrate(ctx, cfg.ConnConfig.Copy()); err != nil {
		return nil, fmt.Errorf("open store: %w", err)
	}
	pool, err := pgxpool.NewWithConfig(ctx, cfg)
	if err != nil {
		return nil, fmt.Errorf("open store: %w", err)
	}
	if err := pool.Ping(ctx); err != nil {
		pool.Close()
		return nil, fmt.Errorf("open store: %w", err)
	}
	return &Postgres{pool: pool, opts: buildOptions(opts)}, nil
}

// migrate applies the embedded migrations through database/sql (pgx's
// stdlib driver), under a session advisory lock whose ID depends on the
// schema they go into, so processes migrating the same schema wait for each
// other and different schemas do not.
func migrate(ctx context.Context, cc *pgx.ConnConfig) error {
	db := stdlib.OpenDB(*cc)
	defer db.Close()
	var schema *string
	if err := db.QueryRowContext(ctx, `SELECT current_schema()`).Scan(&schema); err != nil {
		return fmt.Errorf("migrate: %w", err)
	}
	if schema == nil {
		return fmt.Errorf("migrate: no schema of search_path %q exists: %w", cc.RuntimeParams["search_path"], ErrNotFound)
	}
	h := fnv.New64a()
	h.Write([]byte("shiftrank migrations\x00" + *schema))
	locker, err := lock.NewPostgresSessionLocker(
		lock.WithLockID(int64(h.Sum64()>>1)),
		lock.WithLockTimeout(1, 300), // poll every second, for up to 5 minutes
	)
	if err != nil {
		return fmt.Errorf("migrate: %w", err)
	}
	p, err := goose.NewProvider(goose.DialectPostgres, db, migrations.FS,
		goose.WithSessionLocker(locker),
		goose.WithDisableGlobalRegistry(true),
	)
	if err != nil {
		return fmt.Errorf("migrate: %w", err)
	}
	if _, err := p.Up(ctx); err != nil {
		return fmt.Errorf("migrate: %w", err)
	}
	return nil
}

// Ping checks that the database is reachable.
func (p *Postgres) Ping(ctx context.Context) error {
	if err := p.pool.Ping(ctx); err != nil {
		return fmt.Errorf("ping database: %w", err)
	}
	return nil
}

// Close closes the pool, waiting for connections in use to be returned.
func (p *Postgres) Close() { p.pool.Close() }

// jobColumns is the column list scanJob reads, in order.
const jobColumns = `id, owner, status, request, reference, callback_url,
	generated, scored, total_estimate, error, created_at, started_at, finished_at,
	lease_owner, lease_until, attempts, cancel_requested,
	coalesce(idempotency_key, ''), request_hash, callback_done`

func scanJob(row pgx.Row) (Job, error) {
	var (
		j                          Job
		status                     string
		request                    []byte
		started, finished, leaseTo *time.Time
	)
	err := row.Scan(&j.ID, &j.Owner, &status, &request, &j.Reference, &j.CallbackURL,
		&j.Progress.Generated, &j.Progress.Scored, &j.Progress.TotalEstimate, &j.Error,
		&j.CreatedAt, &started, &finished,
		&j.LeaseOwner, &leaseTo, &j.Attempts, &j.CancelRequested,
		&j.IdempotencyKey, &j.RequestHash, &j.CallbackDone)
	if err != nil {
		return Job{}, err
	}
	j.Status = Status(status)
	j.Request = json.RawMessage(request)
	j.CreatedAt = j.CreatedAt.UTC()
	j.StartedAt = utc(started)
	j.FinishedAt = utc(finished)
	j.LeaseUntil = utc(leaseTo)
	return j, nil
}

func utc(t *time.Time) time.Time {
	if t == nil {
		return time.Time{}
	}
	return t.UTC()
}

// micros converts a duration to whole microseconds for SQL interval
// arithmetic.
func micros(d time.Duration) int64 { return d.Microseconds() }

// addHistory writes one status-history row.
func addHistory(ctx context.Context, tx pgx.Tx, id string, status Status, worker, note string) error {
	_, err := tx.Exec(ctx,
		`INSERT INTO job_status_history (job_id, status, worker, note) VALUES ($1, $2, $3, $4)`,
		id, string(status), worker, note)
	if err != nil {
		return fmt.Errorf("status history: %w", err)
	}
	return nil
}

// CreateJob stores j as a new queued job owned by j.Owner and returns it with
// its ID, CreatedAt and RequestHash filled (created = true). Fields the store
// owns (status, progress, lease, timestamps) are ignored on input. The job
// row and its first history row are written in one transaction.
//
// Idempotency: if j.IdempotencyKey is set and the owner already has a job with
// that key, CreateJob returns that job with created = false when its
// RequestHash matches, and ErrConflict when it differs; concurrent requests
// with one key create one job. A Request that is not valid JSON gives
// ErrInvalid.
func (p *Postgres) CreateJob(ctx context.Context, j Job) (Job, bool, error) {
	return p.SubmitJob(ctx, j, 0)
}

// Advisory lock keys (the two-key form, whose space is apart from the
// one-key locks of the migrations): lockOwnerSpace with an owner's hash
// serialises the submissions of that owner, lockClaimSpace all claims of
// queued jobs, so that queue bounds, per-owner running limits and the fair order
// hold across processes.
const (
	lockClaimSpace = 0x53524b51 // "SRKQ", with key 0
	lockOwnerSpace = 0x53524b4f // "SRKO", with the owner's hashtext
)

// SubmitJob is CreateJob with a bound on the owner's queue: when j.Owner
// already has maxQueued jobs queued (not yet running), it creates nothing
// and returns ErrLimit. A repeat of an earlier submission with the same
// idempotency key still returns that job. maxQueued <= 0 means no bound.
// Submissions of one owner are serialised by an advisory lock, so
// concurrent ones cannot overrun the bound.
func (p *Postgres) SubmitJob(ctx context.Context, j Job, maxQueued int) (Job, bool, error) {
	j, err := prepareJob(j)
	if err != nil {
		return Job{}, false, err
	}
	var (
		out     Job
		created bool
	)
	err = pgx.BeginFunc(ctx, p.pool, func(tx pgx.Tx) error {
		if maxQueued > 0 {
			if _, err := tx.Exec(ctx, `SELECT pg_advisory_xact_lock($1, hashtext($2))`, lockOwnerSpace, j.Owner); err != nil {
				return err
			}
			if j.IdempotencyKey != "" {
				prev, err := scanJob(tx.QueryRow(ctx, `SELECT `+jobColumns+` FROM jobs
					WHERE owner = $1 AND idempotency_key = $2`, j.Owner, j.IdempotencyKey))
				if err == nil {
					if prev.RequestHash != j.RequestHash {
						return fmt.Errorf("idempotency key %q used with a different request: %w", j.IdempotencyKey, ErrConflict)
					}
					out = prev
					return nil
				}
				if !errors.Is(err, pgx.ErrNoRows) {
					return err
				}
			}
			var queued int
			if err := tx.QueryRow(ctx, `SELECT count(*) FROM jobs WHERE owner = $1 AND status = 'queued'`, j.Owner).Scan(&queued); err != nil {
				return err
			}
			if queued >= maxQueued {
				return fmt.Errorf("%d jobs of this owner are queued: %w", queued, ErrLimit)
			}
		}
		row := tx.QueryRow(ctx, `INSERT INTO jobs
			(id, owner, status, request, reference, callback_url, idempotency_key, request_hash, created_at)
			VALUES ($1, $2, 'queued', $3, $4, $5, NULLIF($6, ''), $7, clock_timestamp())
			ON CONFLICT (owner, idempotency_key) DO NOTHING
			RETURNING `+jobColumns,
			j.ID, j.Owner, []byte(j.Request), j.Reference, j.CallbackURL, j.IdempotencyKey, j.RequestHash)
		out, err = scanJob(row)
		if err == nil {
			created = true
			return addHistory(ctx, tx, out.ID, StatusQueued, "", "created")
		}
		if !errors.Is(err, pgx.ErrNoRows) {
			return err
		}
		// The key is taken: return the job it names, if the request matches.
		out, err = scanJob(tx.QueryRow(ctx, `SELECT `+jobColumns+` FROM jobs
			WHERE owner = $1 AND idempotency_key = $2`, j.Owner, j.IdempotencyKey))
		if err != nil {
			return err
		}
		if out.RequestHash != j.RequestHash {
			return fmt.Errorf("idempotency key %q used with a different request: %w", j.IdempotencyKey, ErrConflict)
		}
		return nil
	})
	if err != nil {
		return Job{}, false, fmt.Errorf("create job: %w", err)
	}
	return out, created, nil
}

// GetJob returns owner's job id; ErrNotFound if it does not exist or belongs
// to another owner.
func (p *Postgres) GetJob(ctx context.Context, owner, id string) (Job, error) {
	if !ValidJobID(id) {
		return Job{}, fmt.Errorf("get job %q: %w", id, ErrNotFound)
	}
	j, err := scanJob(p.pool.QueryRow(ctx, `SELECT `+jobColumns+` FROM jobs WHERE id = $1 AND owner = $2`, id, owner))
	if errors.Is(err, pgx.ErrNoRows) {
		return Job{}, fmt.Errorf("get job %s: %w", id, ErrNotFound)
	}
	if err != nil {
		return Job{}, fmt.Errorf("get job %s: %w", id, err)
	}
	return j, nil
}

// ListJobs returns up to limit of owner's jobs, newest first (by creation
// time, ties by ID), starting after cursor ("" for the first page). next is
// the cursor for the following page, "" when there are no more jobs. limit
// <= 0 means DefaultListLimit; limits above MaxListLimit are reduced. A
// cursor not made by ListJobs gives ErrInvalid.
func (p *Postgres) ListJobs(ctx context.Context, owner string, limit int, cur string) ([]Job, string, error) {
	limit = clampLimit(limit)
	c, hasCursor, err := decodeCursor(cur)
	if err != nil {
		return nil, "", err
	}
	var rows pgx.Rows
	if hasCursor {
		rows, err = p.pool.Query(ctx, `SELECT `+jobColumns+` FROM jobs
			WHERE owner = $1 AND (created_at, id) < ($2, $3)
			ORDER BY created_at DESC, id DESC LIMIT $4`, owner, c.at, c.id, limit+1)
	} else {
		rows, err = p.pool.Query(ctx, `SELECT `+jobColumns+` FROM jobs
			WHERE owner = $1 ORDER BY created_at DESC, id DESC LIMIT $2`, owner, limit+1)
	}
	if err != nil {
		return nil, "", fmt.Errorf("list jobs: %w", err)
	}
	jobs, err := pgx.CollectRows(rows, func(r pgx.CollectableRow) (Job, error) { return scanJob(r) })
	if err != nil {
		return nil, "", fmt.Errorf("list jobs: %w", err)
	}
	if len(jobs) > limit {
		jobs = jobs[:limit]
		return jobs, encodeCursor(jobs[limit-1]), nil
	}
	return jobs, "", nil
}

// ClaimJob hands a job to workerID for lease: a running job whose lease has
// expired (the longest expired first), else a queued job picked fairly
// between owners: of the owners with queued jobs (and, under
// WithMaxRunningPerOwner, fewer running jobs than the limit), the one with
// the fewest running jobs, then the one whose last claimed job was claimed
// longest ago (or never), gets its oldest queued job. The job becomes
// running, its lease owner workerID, its lease end now+lease (database
// clock), and Attempts grows by one. Claims are serialised by an advisory
// lock and the row is locked, so concurrent claimers in any number of
// processes never get the same job and the fair order holds across them. An
// expired job whose owner asked for cancellation is finished as cancelled
// instead of being handed out, and one that has used up its attempts
// (WithMaxAttempts) as failed. ErrNoJob if nothing is available.
func (p *Postgres) ClaimJob(ctx context.Context, workerID string, lease time.Duration) (Job, error) {
	if workerID == "" || lease <= 0 {
		return Job{}, fmt.Errorf("claim job: need a worker ID and a positive lease: %w", ErrInvalid)
	}
	for {
		var (
			j       Job
			claimed bool
		)
		err := pgx.BeginFunc(ctx, p.pool, func(tx pgx.Tx) error {
			var (
				id, status, prevOwner string
				cancel                bool
				attempts              int
			)
			// Jobs abandoned by a dead worker first, then the oldest queued
			// job; each query uses its partial index.
			err := tx.QueryRow(ctx, `SELECT id, status, cancel_requested, lease_owner, attempts FROM jobs
				WHERE status = 'running' AND lease_until < clock_timestamp()
				ORDER BY lease_until, id LIMIT 1
				FOR UPDATE SKIP LOCKED`).Scan(&id, &status, &cancel, &prevOwner, &attempts)
			if errors.Is(err, pgx.ErrNoRows) {
				id, err = p.pickQueued(ctx, tx)
				if err != nil {
					return err
				}
				err = tx.QueryRow(ctx, `SELECT id, status, cancel_requested, lease_owner, attempts FROM jobs
					WHERE id = $1 AND status = 'queued'
					FOR UPDATE`, id).Scan(&id, &status, &cancel, &prevOwner, &attempts)
				if errors.Is(err, pgx.ErrNoRows) {
					return errRetryClaim // cancelled since it was picked
				}
			}
			if errors.Is(err, pgx.ErrNoRows) {
				return ErrNoJob
			}
			if err != nil {
				return err
			}
			if Status(status) == StatusRunning && cancel {
				const note = "cancelled after the worker's lease expired"
				_, err := tx.Exec(ctx, `UPDATE jobs SET status = 'cancelled', error = $2,
					finished_at = clock_timestamp(), lease_until = NULL WHERE id = $1`, id, note)
				if err != nil {
					return err
				}
				return addHistory(ctx, tx, id, StatusCancelled, "", note)
			}
			if Status(status) == StatusRunning && p.opts.maxAttempts > 0 && attempts >= p.opts.maxAttempts {
				msg := abandonedMessage(attempts)
				_, err := tx.Exec(ctx, `UPDATE jobs SET status = 'failed', error = $2,
					finished_at = clock_timestamp(), lease_until = NULL WHERE id = $1`, id, msg)
				if err != nil {
					return err
				}
				return addHistory(ctx, tx, id, StatusFailed, "", string(StatusFailed)+": "+msg)
			}
			note := fmt.Sprintf("claimed (attempt %d)", attempts+1)
			if Status(status) == StatusRunning {
				note = fmt.Sprintf("reclaimed after lease of %s expired (attempt %d)", prevOwner, attempts+1)
			} else {
				_, err := tx.Exec(ctx, `INSERT INTO owner_claims (owner, last_claim)
					SELECT owner, clock_timestamp() FROM jobs WHERE id = $1
					ON CONFLICT (owner) DO UPDATE SET last_claim = excluded.last_claim`, id)
				if err != nil {
					return err
				}
			}
			j, err = scanJob(tx.QueryRow(ctx, `UPDATE jobs SET status = 'running', lease_owner = $2,
				lease_until = clock_timestamp() + $3 * interval '1 microsecond',
				attempts = attempts + 1, started_at = coalesce(started_at, clock_timestamp())
				WHERE id = $1 RETURNING `+jobColumns, id, workerID, micros(lease)))
			if err != nil {
				return err
			}
			claimed = true
			return addHistory(ctx, tx, id, StatusRunning, workerID, note)
		})
		if errors.Is(err, errRetryClaim) {
			continue
		}
		if err != nil {
			return Job{}, fmt.Errorf("claim job: %w", err)
		}
		if claimed {
			return j, nil
		}
	}
}

// errRetryClaim: the job picked was taken out of the queue before it could
// be locked; ClaimJob picks again.
var errRetryClaim = errors.New("picked job left the queue")

// pickQueued takes the claim lock and returns the ID of the queued job
// ClaimJob hands out next (see ClaimJob for the order), or ErrNoJob.
func (p *Postgres) pickQueued(ctx context.Context, tx pgx.Tx) (string, error) {
	if _, err := tx.Exec(ctx, `SELECT pg_advisory_xact_lock($1, 0)`, lockClaimSpace); err != nil {
		return "", err
	}
	var id string
	err := tx.QueryRow(ctx, `SELECT q.id FROM (
			SELECT DISTINCT ON (owner) owner, id, created_at FROM jobs
			WHERE status = 'queued' ORDER BY owner, created_at, id
		) q
		LEFT JOIN (SELECT owner, count(*) AS n FROM jobs WHERE status = 'running' GROUP BY owner) r ON r.owner = q.owner
		LEFT JOIN owner_claims c ON c.owner = q.owner
		WHERE $1 <= 0 OR coalesce(r.n, 0) < $1
		ORDER BY coalesce(r.n, 0), c.last_claim NULLS FIRST, q.created_at, q.id
		LIMIT 1`, p.opts.maxRunning).Scan(&id)
	if errors.Is(err, pgx.ErrNoRows) {
		return "", ErrNoJob
	}
	return id, err
}

// leaseError tells ErrNotFound from ErrLeaseLost after an update by lease
// holder matched no row.
func leaseError(ctx context.Context, q interface {
	QueryRow(context.Context, string, ...any) pgx.Row
}, id, workerID string) error {
	var exists bool
	if err := q.QueryRow(ctx, `SELECT EXISTS (SELECT 1 FROM jobs WHERE id = $1)`, id).Scan(&exists); err != nil {
		return err
	}
	if !exists {
		return fmt.Errorf("job %s: %w", id, ErrNotFound)
	}
	return fmt.Errorf("job %s held by %s: %w", id, workerID, ErrLeaseLost)
}

// RenewLease extends workerID's lease on job id to now+lease. ErrLeaseLost if
// workerID no longer holds it. If the job's owner asked for cancellation the
// lease is still renewed and the error is ErrCancelRequested.
func (p *Postgres) RenewLease(ctx context.Context, id, workerID string, lease time.Duration) error {
	var cancel bool
	err := p.pool.QueryRow(ctx, `UPDATE jobs SET lease_until = clock_timestamp() + $3 * interval '1 microsecond'
		WHERE id = $1 AND status = 'running' AND lease_owner = $2
		RETURNING cancel_requested`, id, workerID, micros(lease)).Scan(&cancel)
	if errors.Is(err, pgx.ErrNoRows) {
		err = leaseError(ctx, p.pool, id, workerID)
	}
	if err != nil {
		return fmt.Errorf("renew lease: %w", err)
	}
	if cancel {
		return fmt.Errorf("renew lease on job %s: %w", id, ErrCancelRequested)
	}
	return nil
}

// UpdateProgress stores pr as job id's progress; ErrLeaseLost unless workerID
// holds the lease.
func (p *Postgres) UpdateProgress(ctx context.Context, id, workerID string, pr Progress) error {
	tag, err := p.pool.Exec(ctx, `UPDATE jobs SET generated = $3, scored = $4, total_estimate = $5
		WHERE id = $1 AND status = 'running' AND lease_owner = $2`,
		id, workerID, pr.Generated, pr.Scored, pr.TotalEstimate)
	if err == nil && tag.RowsAffected() == 0 {
		err = leaseError(ctx, p.pool, id, workerID)
	}
	if err != nil {
		return fmt.Errorf("update progress: %w", err)
	}
	return nil
}

// FinishJob ends job id with a terminal status, an error message (for failed
// or cancelled jobs) and optionally its result, in one transaction with the
// history row. ErrLeaseLost unless workerID holds the lease; ErrInvalid for a
// non-terminal status or a result body that is not JSON. Nothing changes when
// it returns an error.
func (p *Postgres) FinishJob(ctx context.Context, id, workerID string, status Status, errMsg string, result *Result) error {
	if err := checkFinish(id, status, result); err != nil {
		return err
	}
	errMsg = cleanText(errMsg)
	err := pgx.BeginFunc(ctx, p.pool, func(tx pgx.Tx) error {
		tag, err := tx.Exec(ctx, `UPDATE jobs SET status = $3, error = $4,
			finished_at = clock_timestamp(), lease_until = NULL
			WHERE id = $1 AND status = 'running' AND lease_owner = $2`, id, workerID, string(status), errMsg)
		if err != nil {
			return err
		}
		if tag.RowsAffected() == 0 {
			return leaseError(ctx, tx, id, workerID)
		}
		if result != nil {
			_, err := tx.Exec(ctx, `INSERT INTO job_results (job_id, isomers_total, result) VALUES ($1, $2, $3)
				ON CONFLICT (job_id) DO UPDATE SET isomers_total = excluded.isomers_total, result = excluded.result`,
				id, result.IsomersTotal, []byte(result.Body))
			if err != nil {
				return fmt.Errorf("store result: %w", err)
			}
		}
		note := string(status)
		if errMsg != "" {
			note += ": " + errMsg
		}
		return addHistory(ctx, tx, id, status, workerID, note)
	})
	if err != nil {
		return fmt.Errorf("finish job %s: %w", id, err)
	}
	return nil
}

// ReleaseJob hands job id back to the queue (status queued, lease cleared),
// e.g. on graceful shutdown; a job with a cancel request is cancelled
// instead. ErrLeaseLost unless workerID holds the lease.
func (p *Postgres) ReleaseJob(ctx context.Context, id, workerID string) error {
	err := pgx.BeginFunc(ctx, p.pool, func(tx pgx.Tx) error {
		var status string
		err := tx.QueryRow(ctx, `UPDATE jobs SET
				status = CASE WHEN cancel_requested THEN 'cancelled' ELSE 'queued' END,
				finished_at = CASE WHEN cancel_requested THEN clock_timestamp() END,
				error = CASE WHEN cancel_requested THEN 'cancelled on release' ELSE error END,
				lease_until = NULL
			WHERE id = $1 AND status = 'running' AND lease_owner = $2
			RETURNING status`, id, workerID).Scan(&status)
		if errors.Is(err, pgx.ErrNoRows) {
			return leaseError(ctx, tx, id, workerID)
		}
		if err != nil {
			return err
		}
		note := "released"
		if Status(status) == StatusCancelled {
			note = "cancelled on release"
		}
		return addHistory(ctx, tx, id, Status(status), workerID, note)
	})
	if err != nil {
		return fmt.Errorf("release job %s: %w", id, err)
	}
	return nil
}

// CancelJob cancels owner's job id and returns it as it is afterwards: a
// queued job becomes cancelled at once; a running job gets CancelRequested
// set (its worker is told through RenewLease and CancelRequested); a job
// already in a terminal state is returned unchanged. ErrNotFound for another
// owner's job.
func (p *Postgres) CancelJob(ctx context.Context, owner, id string) (Job, error) {
	if !ValidJobID(id) {
		return Job{}, fmt.Errorf("cancel job %q: %w", id, ErrNotFound)
	}
	var j Job
	err := pgx.BeginFunc(ctx, p.pool, func(tx pgx.Tx) error {
		var status string
		err := tx.QueryRow(ctx, `SELECT status FROM jobs WHERE id = $1 AND owner = $2 FOR UPDATE`, id, owner).Scan(&status)
		if errors.Is(err, pgx.ErrNoRows) {
			return fmt.Errorf("job %s: %w", id, ErrNotFound)
		}
		if err != nil {
			return err
		}
		switch Status(status) {
		case StatusQueued:
			j, err = scanJob(tx.QueryRow(ctx, `UPDATE jobs SET status = 'cancelled', finished_at = clock_timestamp()
				WHERE id = $1 RETURNING `+jobColumns, id))
			if err != nil {
				return err
			}
			return addHistory(ctx, tx, id, StatusCancelled, "", string(StatusCancelled))
		case StatusRunning:
			j, err = scanJob(tx.QueryRow(ctx, `UPDATE jobs SET cancel_requested = true
				WHERE id = $1 RETURNING `+jobColumns, id))
			return err
		default:
			j, err = scanJob(tx.QueryRow(ctx, `SELECT `+jobColumns+` FROM jobs WHERE id = $1`, id))
			return err
		}
	})
	if err != nil {
		return Job{}, fmt.Errorf("cancel job %s: %w", id, err)
	}
	return j, nil
}

// CancelRequested reports whether job id's owner asked to cancel it while it
// was running. ErrNotFound for an unknown ID. It takes no owner: it is for
// workers.
func (p *Postgres) CancelRequested(ctx context.Context, id string) (bool, error) {
	if !ValidJobID(id) {
		return false, fmt.Errorf("cancel requested: job %q: %w", id, ErrNotFound)
	}
	var cancel bool
	err := p.pool.QueryRow(ctx, `SELECT cancel_requested FROM jobs WHERE id = $1`, id).Scan(&cancel)
	if errors.Is(err, pgx.ErrNoRows) {
		return false, fmt.Errorf("cancel requested: job %s: %w", id, ErrNotFound)
	}
	if err != nil {
		return false, fmt.Errorf("cancel requested: job %s: %w", id, err)
	}
	return cancel, nil
}

// GetResult returns the result of owner's job id; ErrNotFound if the job is
// missing, another owner's, or has no result (yet).
func (p *Postgres) GetResult(ctx context.Context, owner, id string) (Result, error) {
	if !ValidJobID(id) {
		return Result{}, fmt.Errorf("get result: job %q: %w", id, ErrNotFound)
	}
	var (
		total *int64
		body  []byte
	)
	err := p.pool.QueryRow(ctx, `SELECT r.isomers_total, r.result FROM jobs j
		LEFT JOIN job_results r ON r.job_id = j.id
		WHERE j.id = $1 AND j.owner = $2`, id, owner).Scan(&total, &body)
	if errors.Is(err, pgx.ErrNoRows) {
		return Result{}, fmt.Errorf("get result: job %s: %w", id, ErrNotFound)
	}
	if err != nil {
		return Result{}, fmt.Errorf("get result: job %s: %w", id, err)
	}
	if total == nil {
		return Result{}, fmt.Errorf("get result: job %s has no result: %w", id, ErrNotFound)
	}
	return Result{JobID: id, IsomersTotal: *total, Body: json.RawMessage(body)}, nil
}

// History returns the status changes of owner's job id, oldest first.
func (p *Postgres) History(ctx context.Context, owner, id string) ([]StatusChange, error) {
	if !ValidJobID(id) {
		return nil, fmt.Errorf("history: job %q: %w", id, ErrNotFound)
	}
	rows, err := p.pool.Query(ctx, `SELECT h.status, h.at, h.worker, h.note
		FROM job_status_history h JOIN jobs j ON j.id = h.job_id
		WHERE j.id = $1 AND j.owner = $2 ORDER BY h.id`, id, owner)
	if err != nil {
		return nil, fmt.Errorf("history: job %s: %w", id, err)
	}
	hist, err := pgx.CollectRows(rows, func(r pgx.CollectableRow) (StatusChange, error) {
		var (
			c      StatusChange
			status string
		)
		err := r.Scan(&status, &c.At, &c.Worker, &c.Note)
		c.Status = Status(status)
		c.At = c.At.UTC()
		return c, err
	})
	if err != nil {
		return nil, fmt.Errorf("history: job %s: %w", id, err)
	}
	if len(hist) == 0 { // every job has its "created" row
		return nil, fmt.Errorf("history: job %s: %w", id, ErrNotFound)
	}
	return hist, nil
}

const keyColumns = `id, name, hash, secret, created_at, revoked_at`

func scanKey(row pgx.Row) (APIKey, error) {
	var (
		k       APIKey
		revoked *time.Time
	)
	if err := row.Scan(&k.ID, &k.Name, &k.Hash, &k.Secret, &k.CreatedAt, &revoked); err != nil {
		return APIKey{}, err
	}
	k.CreatedAt = k.CreatedAt.UTC()
	k.RevokedAt = utc(revoked)
	return k, nil
}

// CreateAPIKey makes a new API key called name and returns the key (shown
// once: only its SHA-256 hash is stored) and its record. ErrConflict if the
// name is taken (also by a revoked key), ErrInvalid for an empty or
// over-long name.
func (p *Postgres) CreateAPIKey(ctx context.Context, name string) (string, APIKey, error) {
	if err := checkKeyName(name); err != nil {
		return "", APIKey{}, err
	}
	key, hash := newAPIKey()
	k, err := scanKey(p.pool.QueryRow(ctx, `INSERT INTO api_keys (id, name, hash, secret)
		VALUES ($1, $2, $3, $4) RETURNING `+keyColumns, newKeyID(), name, hash, newSecret()))
	var pgErr *pgconn.PgError
	if errors.As(err, &pgErr) && pgErr.Code == "23505" {
		return "", APIKey{}, fmt.Errorf("create api key %q: name taken: %w", name, ErrConflict)
	}
	if err != nil {
		return "", APIKey{}, fmt.Errorf("create api key %q: %w", name, err)
	}
	return key, k, nil
}

// ListAPIKeys returns all keys, revoked ones included, oldest first.
func (p *Postgres) ListAPIKeys(ctx context.Context) ([]APIKey, error) {
	rows, err := p.pool.Query(ctx, `SELECT `+keyColumns+` FROM api_keys ORDER BY created_at, id`)
	if err != nil {
		return nil, fmt.Errorf("list api keys: %w", err)
	}
	keys, err := pgx.CollectRows(rows, func(r pgx.CollectableRow) (APIKey, error) { return scanKey(r) })
	if err != nil {
		return nil, fmt.Errorf("list api keys: %w", err)
	}
	return keys, nil
}

// RevokeAPIKey revokes the key with that ID or, failing that, that name,
// and stops its work in the same transaction: its queued jobs are cancelled
// (with RevokedMessage as their error), its running jobs get a cancel
// request, and the callbacks of all its jobs are marked settled, so none is
// sent any more. It returns the number of queued jobs it cancelled.
// Revoking a revoked key changes nothing more; ErrNotFound if there is no
// such key.
func (p *Postgres) RevokeAPIKey(ctx context.Context, idOrName string) (int, error) {
	if !storableText(idOrName) {
		return 0, fmt.Errorf("revoke api key %q: %w", idOrName, ErrNotFound)
	}
	var cancelled int
	err := pgx.BeginFunc(ctx, p.pool, func(tx pgx.Tx) error {
		var id string
		err := tx.QueryRow(ctx, `UPDATE api_keys SET revoked_at = coalesce(revoked_at, clock_timestamp())
			WHERE id = (SELECT id FROM api_keys WHERE id = $1 OR name = $1 ORDER BY id = $1 DESC LIMIT 1)
			RETURNING id`, idOrName).Scan(&id)
		if errors.Is(err, pgx.ErrNoRows) {
			return ErrNotFound
		}
		if err != nil {
			return err
		}
		rows, err := tx.Query(ctx, `UPDATE jobs SET status = 'cancelled', error = $2,
				finished_at = clock_timestamp(), callback_done = true
			WHERE owner = $1 AND status = 'queued' RETURNING id`, id, RevokedMessage)
		if err != nil {
			return err
		}
		ids, err := pgx.CollectRows(rows, pgx.RowTo[string])
		if err != nil {
			return err
		}
		for _, jid := range ids {
			if err := addHistory(ctx, tx, jid, StatusCancelled, "", string(StatusCancelled)+": "+RevokedMessage); err != nil {
				return err
			}
		}
		cancelled = len(ids)
		if _, err := tx.Exec(ctx, `UPDATE jobs SET cancel_requested = true WHERE owner = $1 AND status = 'running'`, id); err != nil {
			return err
		}
		_, err = tx.Exec(ctx, `UPDATE jobs SET callback_done = true WHERE owner = $1 AND callback_url <> '' AND NOT callback_done`, id)
		return err
	})
	if err != nil {
		return 0, fmt.Errorf("revoke api key %q: %w", idOrName, err)
	}
	return cancelled, nil
}

// RotateAPIKeySecret gives the key with that ID or name a new callback
// secret and returns the key with it; callbacks are signed with the new
// secret from then on. ErrNotFound if there is no such key, ErrConflict if
// it is revoked.
func (p *Postgres) RotateAPIKeySecret(ctx context.Context, idOrName string) (APIKey, error) {
	if !storableText(idOrName) {
		return APIKey{}, fmt.Errorf("rotate api key secret %q: %w", idOrName, ErrNotFound)
	}
	var k APIKey
	err := pgx.BeginFunc(ctx, p.pool, func(tx pgx.Tx) error {
		var err error
		k, err = scanKey(tx.QueryRow(ctx, `SELECT `+keyColumns+` FROM api_keys
			WHERE id = $1 OR name = $1 ORDER BY id = $1 DESC LIMIT 1 FOR UPDATE`, idOrName))
		if errors.Is(err, pgx.ErrNoRows) {
			return ErrNotFound
		}
		if err != nil {
			return err
		}
		if k.Revoked() {
			return fmt.Errorf("the key is revoked: %w", ErrConflict)
		}
		k, err = scanKey(tx.QueryRow(ctx, `UPDATE api_keys SET secret = $2 WHERE id = $1 RETURNING `+keyColumns, k.ID, newSecret()))
		return err
	})
	if err != nil {
		return APIKey{}, fmt.Errorf("rotate api key secret %q: %w", idOrName, err)
	}
	return k, nil
}

// PurgeFinished deletes up to limit jobs that finished more than olderThan
// ago (database clock) and whose callback, if any, is settled, oldest
// first, with their results, status history and delivery records, and
// returns how many it deleted. Their idempotency keys are forgotten with
// them. limit <= 0 means DefaultListLimit; it is capped at MaxListLimit.
func (p *Postgres) PurgeFinished(ctx context.Context, olderThan time.Duration, limit int) (int, error) {
	tag, err := p.pool.Exec(ctx, `DELETE FROM jobs WHERE id IN (
			SELECT id FROM jobs
			WHERE finished_at < clock_timestamp() - $1 * interval '1 microsecond'
				AND (callback_url = '' OR callback_done)
			ORDER BY finished_at, id LIMIT $2)`, micros(olderThan), clampLimit(limit))
	if err != nil {
		return 0, fmt.Errorf("purge finished jobs: %w", err)
	}
	return int(tag.RowsAffected()), nil
}

// GetAPIKey returns the key with that ID (revoked or not), e.g. to find the
// callback secret of a job's owner. ErrNotFound if there is none.
func (p *Postgres) GetAPIKey(ctx context.Context, id string) (APIKey, error) {
	if !storableText(id) {
		return APIKey{}, fmt.Errorf("get api key %q: %w", id, ErrNotFound)
	}
	k, err := scanKey(p.pool.QueryRow(ctx, `SELECT `+keyColumns+` FROM api_keys WHERE id = $1`, id))
	if errors.Is(err, pgx.ErrNoRows) {
		return APIKey{}, fmt.Errorf("get api key %s: %w", id, ErrNotFound)
	}
	if err != nil {
		return APIKey{}, fmt.Errorf("get api key %s: %w", id, err)
	}
	return k, nil
}

// LookupAPIKey finds the active key whose SHA-256 hash matches key.
// ErrUnauthorized for an unknown or revoked key.
func (p *Postgres) LookupAPIKey(ctx context.Context, key string) (APIKey, error) {
	k, err := scanKey(p.pool.QueryRow(ctx, `SELECT `+keyColumns+` FROM api_keys WHERE hash = $1`, HashKey(key)))
	if errors.Is(err, pgx.ErrNoRows) {
		return APIKey{}, fmt.Errorf("lookup api key: %w", ErrUnauthorized)
	}
	if err != nil {
		return APIKey{}, fmt.Errorf("lookup api key: %w", err)
	}
	if k.Revoked() {
		return APIKey{}, fmt.Errorf("lookup api key: %w", ErrUnauthorized)
	}
	return k, nil
}

// RecordDelivery stores one callback delivery attempt for d.JobID
// (ErrNotFound for an unknown job). A zero d.At is set to now.
func (p *Postgres) RecordDelivery(ctx context.Context, d Delivery) error {
	if !ValidJobID(d.JobID) {
		return fmt.Errorf("record delivery: job %q: %w", d.JobID, ErrNotFound)
	}
	d.URL, d.Error = cleanText(d.URL), cleanText(d.Error)
	var at *time.Time
	if !d.At.IsZero() {
		at = &d.At
	}
	_, err := p.pool.Exec(ctx, `INSERT INTO callback_deliveries (job_id, attempt, url, status_code, error, at)
		VALUES ($1, $2, $3, $4, $5, coalesce($6, clock_timestamp()))`,
		d.JobID, d.Attempt, d.URL, d.StatusCode, d.Error, at)
	var pgErr *pgconn.PgError
	if errors.As(err, &pgErr) && pgErr.Code == "23503" {
		return fmt.Errorf("record delivery: job %s: %w", d.JobID, ErrNotFound)
	}
	if err != nil {
		return fmt.Errorf("record delivery: job %s: %w", d.JobID, err)
	}
	return nil
}

// Deliveries returns the callback delivery attempts of job jobID in the order
// recorded (empty for a job with none, ErrNotFound for an unknown job). It
// takes no owner: it is for the delivery worker and operators.
func (p *Postgres) Deliveries(ctx context.Context, jobID string) ([]Delivery, error) {
	if !ValidJobID(jobID) {
		return nil, fmt.Errorf("deliveries: job %q: %w", jobID, ErrNotFound)
	}
	rows, err := p.pool.Query(ctx, `SELECT job_id, attempt, url, status_code, error, at
		FROM callback_deliveries WHERE job_id = $1 ORDER BY id`, jobID)
	if err != nil {
		return nil, fmt.Errorf("deliveries: job %s: %w", jobID, err)
	}
	ds, err := pgx.CollectRows(rows, func(r pgx.CollectableRow) (Delivery, error) {
		var d Delivery
		err := r.Scan(&d.JobID, &d.Attempt, &d.URL, &d.StatusCode, &d.Error, &d.At)
		d.At = d.At.UTC()
		return d, err
	})
	if err != nil {
		return nil, fmt.Errorf("deliveries: job %s: %w", jobID, err)
	}
	if len(ds) == 0 {
		var exists bool
		if err := p.pool.QueryRow(ctx, `SELECT EXISTS (SELECT 1 FROM jobs WHERE id = $1)`, jobID).Scan(&exists); err != nil {
			return nil, fmt.Errorf("deliveries: job %s: %w", jobID, err)
		}
		if !exists {
			return nil, fmt.Errorf("deliveries: job %s: %w", jobID, ErrNotFound)
		}
	}
	return ds, nil
}

// MarkCallbackDone records that job id's callback is settled (delivered,
// refused by the receiver, or given up), so PendingCallbacks no longer
// returns it. ErrNotFound for an unknown job. It takes no owner: it is for
// the delivery worker.
func (p *Postgres) MarkCallbackDone(ctx context.Context, id string) error {
	if !ValidJobID(id) {
		return fmt.Errorf("mark callback done: job %q: %w", id, ErrNotFound)
	}
	tag, err := p.pool.Exec(ctx, `UPDATE jobs SET callback_done = true WHERE id = $1`, id)
	if err != nil {
		return fmt.Errorf("mark callback done: job %s: %w", id, err)
	}
	if tag.RowsAffected() == 0 {
		return fmt.Errorf("mark callback done: job %s: %w", id, ErrNotFound)
	}
	return nil
}

// ClaimCallback takes job id's callback for workerID until lease from now
// (database clock), so that one process at a time delivers it. It reports
// true when the caller holds the claim: the job is finished, has a callback
// URL, its callback is not settled (MarkCallbackDone), and no other worker
// holds an unexpired claim. The holder renews by claiming again, and gives
// the claim up by claiming with a zero lease. It reports false, changing
// nothing, when another worker holds the claim or there is nothing to
// deliver. ErrNotFound for an unknown job. The update takes the job's row
// lock, so of two processes claiming at once exactly one wins. It takes no
// owner: it is for the delivery worker.
func (p *Postgres) ClaimCallback(ctx context.Context, id, workerID string, lease time.Duration) (bool, error) {
	if !ValidJobID(id) {
		return false, fmt.Errorf("claim callback: job %q: %w", id, ErrNotFound)
	}
	tag, err := p.pool.Exec(ctx, `UPDATE jobs
		SET callback_claim_owner = $2, callback_claim_until = clock_timestamp() + $3 * interval '1 microsecond'
		WHERE id = $1 AND callback_url <> '' AND NOT callback_done AND finished_at IS NOT NULL
			AND (callback_claim_until IS NULL OR callback_claim_until <= clock_timestamp() OR callback_claim_owner = $2)`,
		id, workerID, micros(lease))
	if err != nil {
		return false, fmt.Errorf("claim callback: job %s: %w", id, err)
	}
	if tag.RowsAffected() == 1 {
		return true, nil
	}
	var exists bool
	if err := p.pool.QueryRow(ctx, `SELECT EXISTS (SELECT 1 FROM jobs WHERE id = $1)`, id).Scan(&exists); err != nil {
		return false, fmt.Errorf("claim callback: job %s: %w", id, err)
	}
	if !exists {
		return false, fmt.Errorf("claim callback: job %s: %w", id, ErrNotFound)
	}
	return false, nil
}

// PendingCallbacks returns up to limit finished jobs (any terminal status)
// that have a callback URL whose callback is not yet settled
// (MarkCallbackDone), is not claimed under an unexpired ClaimCallback, and
// that finished more than olderThan ago (database clock), oldest first: the
// callbacks a restarted service should resume. A sweeper must still
// ClaimCallback each one before sending it. limit <= 0 means
// DefaultListLimit; it is capped at MaxListLimit.
func (p *Postgres) PendingCallbacks(ctx context.Context, olderThan time.Duration, limit int) ([]Job, error) {
	rows, err := p.pool.Query(ctx, `SELECT `+jobColumns+` FROM jobs
		WHERE callback_url <> '' AND NOT callback_done AND finished_at IS NOT NULL
			AND finished_at < clock_timestamp() - $1 * interval '1 microsecond'
			AND (callback_claim_until IS NULL OR callback_claim_until <= clock_timestamp())
		ORDER BY finished_at, id LIMIT $2`, micros(olderThan), clampLimit(limit))
	if err != nil {
		return nil, fmt.Errorf("pending callbacks: %w", err)
	}
	jobs, err := pgx.CollectRows(rows, func(r pgx.CollectableRow) (Job, error) { return scanJob(r) })
	if err != nil {
		return nil, fmt.Errorf("pending callbacks: %w", err)
	}
	return jobs, nil
}
