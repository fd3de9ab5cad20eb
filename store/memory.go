package store

import (
	"bytes"
	"compress/flate"
	"context"
	"crypto/subtle"
	"encoding/hex"
	"encoding/json"
	"fmt"
	"io"
	"slices"
	"sort"
	"strings"
	"sync"
	"time"
)

// Memory is the embedded, in-process store: the default when no database is
// configured. It has the same semantics as Postgres (leases, idempotency,
// ownership, cancellation, API keys, deliveries) but keeps everything in
// memory, so nothing survives a restart and it cannot be shared between
// processes. It is safe for concurrent use. The zero value is not usable;
// call NewMemory.
type Memory struct {
	opts     options
	mu       sync.Mutex
	jobs     map[string]*memJob
	byOwner  map[string][]string // job IDs per owner, in creation order
	pending  []string            // non-terminal job IDs, in creation order
	finished []string            // terminal job IDs, in the order they finished
	idem     map[idemKey]string  // (owner, idempotency key) -> job ID
	keys     map[string]*APIKey  // by ID
	keyHash  map[string]string   // hex hash -> key ID
	keyName  map[string]string   // name -> key ID
	lastTime time.Time           // last creation time handed out
	// turns counts claims of queued jobs; lastTurn[owner] is the count at
	// the owner's latest one (fair picking, see ClaimJob).
	turns    uint64
	lastTurn map[string]uint64
}

type memJob struct {
	job        Job
	history    []StatusChange
	result     *packedResult
	deliveries []Delivery

	// The callback claim (ClaimCallback): holder and end.
	cbOwner string
	cbUntil time.Time
}

type idemKey struct{ owner, key string }

// NewMemory returns an empty in-memory store.
func NewMemory(opts ...Option) *Memory {
	return &Memory{
		opts:     buildOptions(opts),
		jobs:     make(map[string]*memJob),
		byOwner:  make(map[string][]string),
		idem:     make(map[idemKey]string),
		keys:     make(map[string]*APIKey),
		keyHash:  make(map[string]string),
		keyName:  make(map[string]string),
		lastTurn: make(map[string]uint64),
	}
}

// Ping always succeeds: the memory store has nothing to reach.
func (m *Memory) Ping(ctx context.Context) error { return ctx.Err() }

// Close does nothing; it exists so both stores share a method set.
func (m *Memory) Close() {}

// creationTime returns the current time, strictly after the previous
// creation time, so that newest-first order equals creation order.
func (m *Memory) creationTime() time.Time {
	t := now()
	if !t.After(m.lastTime) {
		t = m.lastTime.Add(time.Microsecond)
	}
	m.lastTime = t
	return t
}

func copyJob(j Job) Job {
	j.Request = append(json.RawMessage(nil), j.Request...)
	return j
}

func (mj *memJob) record(status Status, at time.Time, worker, note string) {
	mj.history = append(mj.history, StatusChange{Status: status, At: at, Worker: worker, Note: note})
}

// CreateJob stores j as a new queued job owned by j.Owner and returns it with
// its ID, CreatedAt and RequestHash filled (created = true). Fields the store
// owns (status, progress, lease, timestamps) are ignored on input.
//
// Idempotency: if j.IdempotencyKey is set and the owner already has a job with
// that key, CreateJob returns that job with created = false when its
// RequestHash matches, and ErrConflict when it differs. A Request that is not
// valid JSON gives ErrInvalid.
func (m *Memory) CreateJob(ctx context.Context, j Job) (Job, bool, error) {
	return m.SubmitJob(ctx, j, 0)
}

// SubmitJob is CreateJob with a bound on the owner's queue: when j.Owner
// already has maxQueued jobs queued (not yet running), it creates nothing
// and returns ErrLimit. A repeat of an earlier submission with the same
// idempotency key still returns that job. maxQueued <= 0 means no bound.
func (m *Memory) SubmitJob(ctx context.Context, j Job, maxQueued int) (Job, bool, error) {
	if err := ctx.Err(); err != nil {
		return Job{}, false, fmt.Errorf("create job: %w", err)
	}
	j, err := prepareJob(j)
	if err != nil {
		return Job{}, false, err
	}
	m.mu.Lock()
	defer m.mu.Unlock()
	if j.IdempotencyKey != "" {
		if id, ok := m.idem[idemKey{j.Owner, j.IdempotencyKey}]; ok {
			old := m.jobs[id].job
			if old.RequestHash != j.RequestHash {
				return Job{}, false, fmt.Errorf("create job: idempotency key %q used with a different request: %w", j.IdempotencyKey, ErrConflict)
			}
			return copyJob(old), false, nil
		}
	}
	if maxQueued > 0 {
		queued := 0
		for _, id := range m.pending {
			if mj := m.jobs[id]; mj.job.Owner == j.Owner && mj.job.Status == StatusQueued {
				queued++
			}
		}
		if queued >= maxQueued {
			return Job{}, false, fmt.Errorf("create job: %d jobs of this owner are queued: %w", queued, ErrLimit)
		}
	}
	j.CreatedAt = m.creationTime()
	mj := &memJob{job: j}
	mj.record(StatusQueued, j.CreatedAt, "", "created")
	m.jobs[j.ID] = mj
	m.byOwner[j.Owner] = append(m.byOwner[j.Owner], j.ID)
	m.pending = append(m.pending, j.ID)
	if j.IdempotencyKey != "" {
		m.idem[idemKey{j.Owner, j.IdempotencyKey}] = j.ID
	}
	return copyJob(j), true, nil
}

// owned returns the job id of owner, or ErrNotFound. Callers hold m.mu.
func (m *Memory) owned(owner, id string) (*memJob, error) {
	mj, ok := m.jobs[id]
	if !ok || mj.job.Owner != owner {
		return nil, fmt.Errorf("job %s: %w", id, ErrNotFound)
	}
	return mj, nil
}

// GetJob returns owner's job id; ErrNotFound if it does not exist or belongs
// to another owner.
func (m *Memory) GetJob(ctx context.Context, owner, id string) (Job, error) {
	if err := ctx.Err(); err != nil {
		return Job{}, fmt.Errorf("get job %s: %w", id, err)
	}
	m.mu.Lock()
	defer m.mu.Unlock()
	mj, err := m.owned(owner, id)
	if err != nil {
		return Job{}, fmt.Errorf("get %w", err)
	}
	return copyJob(mj.job), nil
}

// ListJobs returns up to limit of owner's jobs, newest first (by creation
// time, ties by ID), starting after cursor ("" for the first page). next is
// the cursor for the following page, "" when there are no more jobs. limit
// <= 0 means DefaultListLimit; limits above MaxListLimit are reduced. A
// cursor not made by ListJobs gives ErrInvalid.
func (m *Memory) ListJobs(ctx context.Context, owner string, limit int, cur string) ([]Job, string, error) {
	if err := ctx.Err(); err != nil {
		return nil, "", fmt.Errorf("list jobs: %w", err)
	}
	limit = clampLimit(limit)
	c, hasCursor, err := decodeCursor(cur)
	if err != nil {
		return nil, "", err
	}
	m.mu.Lock()
	defer m.mu.Unlock()
	ids := m.byOwner[owner]
	jobs := make([]Job, 0, min(limit, len(ids)))
	for i := len(ids) - 1; i >= 0; i-- {
		j := m.jobs[ids[i]].job
		if hasCursor && !c.before(j) {
			continue
		}
		if len(jobs) == limit {
			return jobs, encodeCursor(jobs[len(jobs)-1]), nil
		}
		jobs = append(jobs, copyJob(j))
	}
	return jobs, "", nil
}

// ClaimJob hands a job to workerID for lease: a running job whose lease has
// expired (the longest expired first), else a queued job picked fairly
// between owners: of the owners with queued jobs (and, under
// WithMaxRunningPerOwner, fewer running jobs than the limit), the one with
// the fewest running jobs, then the one whose last claimed job was claimed
// longest ago (or never), gets its oldest queued job. One owner's flood
// therefore delays another owner's job by at most one job per worker. The
// job becomes running, its lease owner workerID, its lease end now+lease,
// and Attempts grows by one. An expired job whose owner asked for
// cancellation is finished as cancelled instead of being handed out.
// ErrNoJob if nothing is available.
func (m *Memory) ClaimJob(ctx context.Context, workerID string, lease time.Duration) (Job, error) {
	if err := ctx.Err(); err != nil {
		return Job{}, fmt.Errorf("claim job: %w", err)
	}
	if workerID == "" || lease <= 0 {
		return Job{}, fmt.Errorf("claim job: need a worker ID and a positive lease: %w", ErrInvalid)
	}
	m.mu.Lock()
	defer m.mu.Unlock()
	t := now()
	for {
		mj := m.nextLocked(t)
		if mj == nil {
			return Job{}, fmt.Errorf("claim job: %w", ErrNoJob)
		}
		j := &mj.job
		note := fmt.Sprintf("claimed (attempt %d)", j.Attempts+1)
		if j.Status == StatusRunning {
			if j.CancelRequested {
				m.finishLocked(mj, t, StatusCancelled, "cancelled after the worker's lease expired", "", nil)
				continue
			}
			if m.opts.maxAttempts > 0 && j.Attempts >= m.opts.maxAttempts {
				m.finishLocked(mj, t, StatusFailed, abandonedMessage(j.Attempts), "", nil)
				continue
			}
			note = fmt.Sprintf("reclaimed after lease of %s expired (attempt %d)", j.LeaseOwner, j.Attempts+1)
		}
		if j.Status == StatusQueued {
			m.turns++
			m.lastTurn[j.Owner] = m.turns
		}
		j.Status = StatusRunning
		j.LeaseOwner = workerID
		j.LeaseUntil = t.Add(lease).Truncate(time.Microsecond)
		j.Attempts++
		if j.StartedAt.IsZero() {
			j.StartedAt = t
		}
		mj.record(StatusRunning, t, workerID, note)
		return copyJob(*j), nil
	}
}

// nextLocked picks the job ClaimJob hands out at time t, or nil. Callers
// hold m.mu.
func (m *Memory) nextLocked(t time.Time) *memJob {
	var expired *memJob
	running := map[string]int{}
	var heads []*memJob // each owner's oldest queued job, oldest first
	seen := map[string]bool{}
	for _, id := range m.pending { // creation order
		mj := m.jobs[id]
		switch j := mj.job; j.Status {
		case StatusRunning:
			running[j.Owner]++
			if j.LeaseUntil.Before(t) && (expired == nil || j.LeaseUntil.Before(expired.job.LeaseUntil)) {
				expired = mj
			}
		case StatusQueued:
			if !seen[j.Owner] {
				seen[j.Owner] = true
				heads = append(heads, mj)
			}
		}
	}
	if expired != nil {
		return expired
	}
	var best *memJob
	for _, mj := range heads {
		o := mj.job.Owner
		if m.opts.maxRunning > 0 && running[o] >= m.opts.maxRunning {
			continue
		}
		if best == nil || running[o] < running[best.job.Owner] ||
			running[o] == running[best.job.Owner] && m.lastTurn[o] < m.lastTurn[best.job.Owner] {
			best = mj
		}
	}
	return best
}

// held returns job id if workerID holds its lease, else ErrLeaseLost (or
// ErrNotFound for an unknown ID). Callers hold m.mu.
func (m *Memory) held(id, workerID string) (*memJob, error) {
	mj, ok := m.jobs[id]
	if !ok {
		return nil, fmt.Errorf("job %s: %w", id, ErrNotFound)
	}
	if mj.job.Status != StatusRunning || mj.job.LeaseOwner != workerID {
		return nil, fmt.Errorf("job %s held by %s: %w", id, workerID, ErrLeaseLost)
	}
	return mj, nil
}

// RenewLease extends workerID's lease on job id to now+lease. ErrLeaseLost if
// workerID no longer holds it. If the job's owner asked for cancellation the
// lease is still renewed and the error is ErrCancelRequested.
func (m *Memory) RenewLease(ctx context.Context, id, workerID string, lease time.Duration) error {
	if err := ctx.Err(); err != nil {
		return fmt.Errorf("renew lease: %w", err)
	}
	m.mu.Lock()
	defer m.mu.Unlock()
	mj, err := m.held(id, workerID)
	if err != nil {
		return fmt.Errorf("renew lease: %w", err)
	}
	mj.job.LeaseUntil = now().Add(lease).Truncate(time.Microsecond)
	if mj.job.CancelRequested {
		return fmt.Errorf("renew lease on job %s: %w", id, ErrCancelRequested)
	}
	return nil
}

// UpdateProgress stores p as job id's progress; ErrLeaseLost unless workerID
// holds the lease.
func (m *Memory) UpdateProgress(ctx context.Context, id, workerID string, p Progress) error {
	if err := ctx.Err(); err != nil {
		return fmt.Errorf("update progress: %w", err)
	}
	m.mu.Lock()
	defer m.mu.Unlock()
	mj, err := m.held(id, workerID)
	if err != nil {
		return fmt.Errorf("update progress: %w", err)
	}
	mj.job.Progress = p
	return nil
}

// FinishJob ends job id with a terminal status, an error message (for failed
// or cancelled jobs) and optionally its result, all at once. ErrLeaseLost
// unless workerID holds the lease; ErrInvalid for a non-terminal status or a
// result body that is not JSON. Nothing changes when it returns an error.
func (m *Memory) FinishJob(ctx context.Context, id, workerID string, status Status, errMsg string, result *Result) error {
	if err := ctx.Err(); err != nil {
		return fmt.Errorf("finish job %s: %w", id, err)
	}
	if err := checkFinish(id, status, result); err != nil {
		return err
	}
	packed := packResult(result) // outside the lock: it compresses
	m.mu.Lock()
	defer m.mu.Unlock()
	mj, err := m.held(id, workerID)
	if err != nil {
		return fmt.Errorf("finish: %w", err)
	}
	m.finishLocked(mj, now(), status, cleanText(errMsg), workerID, packed)
	return nil
}

// packedResult is a result as the memory store keeps it: a body longer
// than compressAbove is DEFLATE-compressed (RFC 1951), which shrinks the
// JSON of a ranking about six times, so that the finished jobs the store
// keeps cost little memory.
type packedResult struct {
	isomersTotal int64
	body         []byte // immutable once stored
	compressed   bool
}

// compressAbove is the body length from which results are compressed.
const compressAbove = 1024

func packResult(r *Result) *packedResult {
	if r == nil {
		return nil
	}
	p := &packedResult{isomersTotal: r.IsomersTotal}
	if len(r.Body) <= compressAbove {
		p.body = append([]byte(nil), r.Body...)
		return p
	}
	var buf bytes.Buffer
	w, err := flate.NewWriter(&buf, flate.BestSpeed)
	if err == nil {
		_, err = w.Write(r.Body)
	}
	if err == nil {
		err = w.Close()
	}
	if err != nil { // not for a valid level and a bytes.Buffer; keep it plain
		p.body = append([]byte(nil), r.Body...)
		return p
	}
	p.body, p.compressed = bytes.Clone(buf.Bytes()), true
	return p
}

// unpack returns the result of job id.
func (p *packedResult) unpack(id string) (Result, error) {
	r := Result{JobID: id, IsomersTotal: p.isomersTotal}
	if !p.compressed {
		r.Body = append(json.RawMessage(nil), p.body...)
		return r, nil
	}
	body, err := io.ReadAll(flate.NewReader(bytes.NewReader(p.body)))
	if err != nil {
		return Result{}, fmt.Errorf("get result %s: decompress: %w", id, err)
	}
	r.Body = body
	return r, nil
}

// finishLocked moves mj to a terminal status. Callers hold m.mu.
func (m *Memory) finishLocked(mj *memJob, t time.Time, status Status, errMsg, worker string, result *packedResult) {
	j := &mj.job
	j.Status = status
	j.Error = errMsg
	j.FinishedAt = t
	j.LeaseUntil = time.Time{}
	if result != nil {
		mj.result = result
	}
	note := string(status)
	if errMsg != "" {
		note += ": " + errMsg
	}
	mj.record(status, t, worker, note)
	if i := slices.Index(m.pending, j.ID); i >= 0 {
		m.pending = slices.Delete(m.pending, i, i+1)
	}
	m.finished = append(m.finished, j.ID)
	m.evictLocked()
}

// settled reports whether nothing remains to be done for a finished job:
// it has no callback, or its callback is settled.
func (mj *memJob) settled() bool {
	return mj.job.CallbackURL == "" || mj.job.CallbackDone
}

// evictLocked forgets the finished jobs beyond WithMaxFinished, those that
// finished longest ago first, passing over jobs whose callback is not
// settled. Callers hold m.mu.
func (m *Memory) evictLocked() {
	excess := len(m.finished) - m.opts.maxFinished
	if m.opts.maxFinished <= 0 || excess <= 0 {
		return
	}
	kept := m.finished[:0]
	for _, id := range m.finished {
		if mj := m.jobs[id]; excess > 0 && mj.settled() {
			m.dropLocked(mj)
			excess--
			continue
		}
		kept = append(kept, id)
	}
	clear(m.finished[len(kept):])
	m.finished = kept
}

// dropLocked forgets the finished job mj entirely (but not its place in
// m.finished, which the caller removes). Callers hold m.mu.
func (m *Memory) dropLocked(mj *memJob) {
	j := mj.job
	delete(m.jobs, j.ID)
	ids := m.byOwner[j.Owner]
	if i := slices.Index(ids, j.ID); i >= 0 {
		ids = slices.Delete(ids, i, i+1)
	}
	if len(ids) == 0 {
		delete(m.byOwner, j.Owner)
	} else {
		m.byOwner[j.Owner] = ids
	}
	k := idemKey{j.Owner, j.IdempotencyKey}
	if j.IdempotencyKey != "" && m.idem[k] == j.ID {
		delete(m.idem, k)
	}
}

// PurgeFinished deletes up to limit jobs that finished more than olderThan
// ago and whose callback, if any, is settled, oldest first, with their
// results, status history and delivery records, and returns how many it
// deleted. Their idempotency keys are forgotten with them. limit <= 0 means
// DefaultListLimit; it is capped at MaxListLimit.
func (m *Memory) PurgeFinished(ctx context.Context, olderThan time.Duration, limit int) (int, error) {
	if err := ctx.Err(); err != nil {
		return 0, fmt.Errorf("purge finished jobs: %w", err)
	}
	limit = clampLimit(limit)
	cutoff := now().Add(-olderThan)
	m.mu.Lock()
	defer m.mu.Unlock()
	n := 0
	kept := m.finished[:0]
	for _, id := range m.finished {
		if mj := m.jobs[id]; n < limit && mj.job.FinishedAt.Before(cutoff) && mj.settled() {
			m.dropLocked(mj)
			n++
			continue
		}
		kept = append(kept, id)
	}
	clear(m.finished[len(kept):])
	m.finished = kept
	return n, nil
}

// ReleaseJob hands job id back to the queue (status queued, lease cleared),
// e.g. on graceful shutdown; a job with a cancel request is cancelled
// instead. ErrLeaseLost unless workerID holds the lease.
func (m *Memory) ReleaseJob(ctx context.Context, id, workerID string) error {
	if err := ctx.Err(); err != nil {
		return fmt.Errorf("release job %s: %w", id, err)
	}
	m.mu.Lock()
	defer m.mu.Unlock()
	mj, err := m.held(id, workerID)
	if err != nil {
		return fmt.Errorf("release: %w", err)
	}
	t := now()
	if mj.job.CancelRequested {
		m.finishLocked(mj, t, StatusCancelled, "cancelled on release", workerID, nil)
		return nil
	}
	mj.job.Status = StatusQueued
	mj.job.LeaseUntil = time.Time{}
	mj.record(StatusQueued, t, workerID, "released")
	return nil
}

// CancelJob cancels owner's job id and returns it as it is afterwards: a
// queued job becomes cancelled at once; a running job gets CancelRequested
// set (its worker is told through RenewLease and CancelRequested); a job
// already in a terminal state is returned unchanged. ErrNotFound for another
// owner's job.
func (m *Memory) CancelJob(ctx context.Context, owner, id string) (Job, error) {
	if err := ctx.Err(); err != nil {
		return Job{}, fmt.Errorf("cancel job %s: %w", id, err)
	}
	m.mu.Lock()
	defer m.mu.Unlock()
	mj, err := m.owned(owner, id)
	if err != nil {
		return Job{}, fmt.Errorf("cancel %w", err)
	}
	switch mj.job.Status {
	case StatusQueued:
		m.finishLocked(mj, now(), StatusCancelled, "", "", nil)
	case StatusRunning:
		mj.job.CancelRequested = true
	}
	return copyJob(mj.job), nil
}

// CancelRequested reports whether job id's owner asked to cancel it while it
// was running. ErrNotFound for an unknown ID. It takes no owner: it is for
// workers.
func (m *Memory) CancelRequested(ctx context.Context, id string) (bool, error) {
	if err := ctx.Err(); err != nil {
		return false, fmt.Errorf("cancel requested %s: %w", id, err)
	}
	m.mu.Lock()
	defer m.mu.Unlock()
	mj, ok := m.jobs[id]
	if !ok {
		return false, fmt.Errorf("cancel requested: job %s: %w", id, ErrNotFound)
	}
	return mj.job.CancelRequested, nil
}

// GetResult returns the result of owner's job id; ErrNotFound if the job is
// missing, another owner's, or has no result (yet).
func (m *Memory) GetResult(ctx context.Context, owner, id string) (Result, error) {
	if err := ctx.Err(); err != nil {
		return Result{}, fmt.Errorf("get result %s: %w", id, err)
	}
	m.mu.Lock()
	mj, err := m.owned(owner, id)
	var res *packedResult
	if err == nil {
		res = mj.result
	}
	m.mu.Unlock()
	if err != nil {
		return Result{}, fmt.Errorf("get result: %w", err)
	}
	if res == nil {
		return Result{}, fmt.Errorf("get result: job %s has no result: %w", id, ErrNotFound)
	}
	return res.unpack(id) // outside the lock: it decompresses
}

// History returns the status changes of owner's job id, oldest first.
func (m *Memory) History(ctx context.Context, owner, id string) ([]StatusChange, error) {
	if err := ctx.Err(); err != nil {
		return nil, fmt.Errorf("history %s: %w", id, err)
	}
	m.mu.Lock()
	defer m.mu.Unlock()
	mj, err := m.owned(owner, id)
	if err != nil {
		return nil, fmt.Errorf("history: %w", err)
	}
	return slices.Clone(mj.history), nil
}

func copyKey(k APIKey) APIKey {
	k.Hash = slices.Clone(k.Hash)
	k.Secret = slices.Clone(k.Secret)
	return k
}

// CreateAPIKey makes a new API key called name and returns the key (shown
// once: only its hash is kept) and its record. ErrConflict if the name is
// taken (also by a revoked key), ErrInvalid for an empty or over-long name.
func (m *Memory) CreateAPIKey(ctx context.Context, name string) (string, APIKey, error) {
	if err := ctx.Err(); err != nil {
		return "", APIKey{}, fmt.Errorf("create api key: %w", err)
	}
	if err := checkKeyName(name); err != nil {
		return "", APIKey{}, err
	}
	key, hash := newAPIKey()
	k := APIKey{ID: newKeyID(), Name: name, Hash: hash, Secret: newSecret(), CreatedAt: now()}
	m.mu.Lock()
	defer m.mu.Unlock()
	if _, ok := m.keyName[name]; ok {
		return "", APIKey{}, fmt.Errorf("create api key %q: name taken: %w", name, ErrConflict)
	}
	m.keys[k.ID] = &k
	m.keyHash[hex.EncodeToString(hash)] = k.ID
	m.keyName[name] = k.ID
	return key, copyKey(k), nil
}

// ListAPIKeys returns all keys, revoked ones included, oldest first.
func (m *Memory) ListAPIKeys(ctx context.Context) ([]APIKey, error) {
	if err := ctx.Err(); err != nil {
		return nil, fmt.Errorf("list api keys: %w", err)
	}
	m.mu.Lock()
	defer m.mu.Unlock()
	keys := make([]APIKey, 0, len(m.keys))
	for _, k := range m.keys {
		keys = append(keys, copyKey(*k))
	}
	sort.Slice(keys, func(a, b int) bool {
		if !keys[a].CreatedAt.Equal(keys[b].CreatedAt) {
			return keys[a].CreatedAt.Before(keys[b].CreatedAt)
		}
		return keys[a].ID < keys[b].ID
	})
	return keys, nil
}

// keyByIDOrName finds a key by ID, then by name. Callers hold m.mu.
func (m *Memory) keyByIDOrName(idOrName string) (*APIKey, bool) {
	if k, ok := m.keys[idOrName]; ok {
		return k, true
	}
	if id, ok := m.keyName[idOrName]; ok {
		return m.keys[id], true
	}
	return nil, false
}

// RevokeAPIKey revokes the key with that ID or name and stops its work: its
// queued jobs are cancelled (with RevokedMessage as their error), its
// running jobs get a cancel request, and the callbacks of all its jobs are
// marked settled, so none is sent any more. It returns the number of queued
// jobs it cancelled. Revoking a revoked key changes nothing more;
// ErrNotFound if there is no such key.
func (m *Memory) RevokeAPIKey(ctx context.Context, idOrName string) (int, error) {
	if err := ctx.Err(); err != nil {
		return 0, fmt.Errorf("revoke api key: %w", err)
	}
	m.mu.Lock()
	defer m.mu.Unlock()
	k, ok := m.keyByIDOrName(idOrName)
	if !ok {
		return 0, fmt.Errorf("revoke api key %q: %w", idOrName, ErrNotFound)
	}
	if k.RevokedAt.IsZero() {
		k.RevokedAt = now()
	}
	t := now()
	var queued []*memJob
	for _, id := range m.byOwner[k.ID] {
		mj := m.jobs[id]
		mj.job.CallbackDone = true
		switch mj.job.Status {
		case StatusQueued:
			queued = append(queued, mj)
		case StatusRunning:
			mj.job.CancelRequested = true
		}
	}
	for _, mj := range queued {
		m.finishLocked(mj, t, StatusCancelled, RevokedMessage, "", nil)
	}
	m.evictLocked()
	return len(queued), nil
}

// RotateAPIKeySecret gives the key with that ID or name a new callback
// secret and returns the key with it; callbacks are signed with the new
// secret from then on. ErrNotFound if there is no such key, ErrConflict if
// it is revoked.
func (m *Memory) RotateAPIKeySecret(ctx context.Context, idOrName string) (APIKey, error) {
	if err := ctx.Err(); err != nil {
		return APIKey{}, fmt.Errorf("rotate api key secret: %w", err)
	}
	m.mu.Lock()
	defer m.mu.Unlock()
	k, ok := m.keyByIDOrName(idOrName)
	if !ok {
		return APIKey{}, fmt.Errorf("rotate api key secret %q: %w", idOrName, ErrNotFound)
	}
	if k.Revoked() {
		return APIKey{}, fmt.Errorf("rotate api key secret %q: the key is revoked: %w", idOrName, ErrConflict)
	}
	k.Secret = newSecret()
	return copyKey(*k), nil
}

// GetAPIKey returns the key with that ID (revoked or not), e.g. to find the
// callback secret of a job's owner. ErrNotFound if there is none.
func (m *Memory) GetAPIKey(ctx context.Context, id string) (APIKey, error) {
	if err := ctx.Err(); err != nil {
		return APIKey{}, fmt.Errorf("get api key: %w", err)
	}
	m.mu.Lock()
	defer m.mu.Unlock()
	k, ok := m.keys[id]
	if !ok {
		return APIKey{}, fmt.Errorf("get api key %s: %w", id, ErrNotFound)
	}
	return copyKey(*k), nil
}

// LookupAPIKey finds the active key whose SHA-256 hash matches key.
// ErrUnauthorized for an unknown or revoked key.
func (m *Memory) LookupAPIKey(ctx context.Context, key string) (APIKey, error) {
	if err := ctx.Err(); err != nil {
		return APIKey{}, fmt.Errorf("lookup api key: %w", err)
	}
	hash := HashKey(key)
	m.mu.Lock()
	defer m.mu.Unlock()
	id, ok := m.keyHash[hex.EncodeToString(hash)]
	if !ok {
		return APIKey{}, fmt.Errorf("lookup api key: %w", ErrUnauthorized)
	}
	k := m.keys[id]
	if subtle.ConstantTimeCompare(k.Hash, hash) != 1 || k.Revoked() {
		return APIKey{}, fmt.Errorf("lookup api key: %w", ErrUnauthorized)
	}
	return copyKey(*k), nil
}

// RecordDelivery stores one callback delivery attempt for d.JobID
// (ErrNotFound for an unknown job). A zero d.At is set to now.
func (m *Memory) RecordDelivery(ctx context.Context, d Delivery) error {
	if err := ctx.Err(); err != nil {
		return fmt.Errorf("record delivery: %w", err)
	}
	if d.At.IsZero() {
		d.At = now()
	}
	d.At = d.At.UTC().Truncate(time.Microsecond)
	d.URL, d.Error = cleanText(d.URL), cleanText(d.Error)
	m.mu.Lock()
	defer m.mu.Unlock()
	mj, ok := m.jobs[d.JobID]
	if !ok {
		return fmt.Errorf("record delivery: job %s: %w", d.JobID, ErrNotFound)
	}
	mj.deliveries = append(mj.deliveries, d)
	return nil
}

// Deliveries returns the callback delivery attempts of job jobID in the order
// recorded (empty for a job with none, ErrNotFound for an unknown job). It
// takes no owner: it is for the delivery worker and operators.
func (m *Memory) Deliveries(ctx context.Context, jobID string) ([]Delivery, error) {
	if err := ctx.Err(); err != nil {
		return nil, fmt.Errorf("deliveries: %w", err)
	}
	m.mu.Lock()
	defer m.mu.Unlock()
	mj, ok := m.jobs[jobID]
	if !ok {
		return nil, fmt.Errorf("deliveries: job %s: %w", jobID, ErrNotFound)
	}
	return slices.Clone(mj.deliveries), nil
}

// MarkCallbackDone records that job id's callback is settled (delivered,
// refused by the receiver, or given up), so PendingCallbacks no longer
// returns it. ErrNotFound for an unknown job. It takes no owner: it is for
// the delivery worker.
func (m *Memory) MarkCallbackDone(ctx context.Context, id string) error {
	if err := ctx.Err(); err != nil {
		return fmt.Errorf("mark callback done: %w", err)
	}
	m.mu.Lock()
	defer m.mu.Unlock()
	mj, ok := m.jobs[id]
	if !ok {
		return fmt.Errorf("mark callback done: job %s: %w", id, ErrNotFound)
	}
	mj.job.CallbackDone = true
	m.evictLocked()
	return nil
}

// ClaimCallback takes job id's callback for workerID until lease from now,
// so that one process at a time delivers it. It reports true when the caller
// holds the claim: the job is finished, has a callback URL, its callback is
// not settled (MarkCallbackDone), and no other worker holds an unexpired
// claim. The holder renews by claiming again, and gives the claim up by
// claiming with a zero lease. It reports false, changing nothing, when
// another worker holds the claim or there is nothing to deliver. ErrNotFound
// for an unknown job. It takes no owner: it is for the delivery worker.
func (m *Memory) ClaimCallback(ctx context.Context, id, workerID string, lease time.Duration) (bool, error) {
	if err := ctx.Err(); err != nil {
		return false, fmt.Errorf("claim callback: %w", err)
	}
	m.mu.Lock()
	defer m.mu.Unlock()
	mj, ok := m.jobs[id]
	if !ok {
		return false, fmt.Errorf("claim callback: job %s: %w", id, ErrNotFound)
	}
	t := now()
	j := mj.job
	if j.CallbackURL == "" || j.CallbackDone || j.FinishedAt.IsZero() ||
		(mj.cbOwner != workerID && mj.cbUntil.After(t)) {
		return false, nil
	}
	mj.cbOwner, mj.cbUntil = workerID, t.Add(lease)
	return true, nil
}

// PendingCallbacks returns up to limit finished jobs (any terminal status)
// that have a callback URL whose callback is not yet settled
// (MarkCallbackDone), is not claimed under an unexpired ClaimCallback, and
// that finished more than olderThan ago, oldest first: the callbacks a
// restarted service should resume. A sweeper must still ClaimCallback each
// one before sending it. limit <= 0 means DefaultListLimit; it is capped at
// MaxListLimit.
func (m *Memory) PendingCallbacks(ctx context.Context, olderThan time.Duration, limit int) ([]Job, error) {
	if err := ctx.Err(); err != nil {
		return nil, fmt.Errorf("pending callbacks: %w", err)
	}
	limit = clampLimit(limit)
	t := now()
	cutoff := t.Add(-olderThan)
	m.mu.Lock()
	defer m.mu.Unlock()
	var jobs []Job
	for _, mj := range m.jobs {
		j := mj.job
		if j.CallbackURL != "" && !j.CallbackDone && !j.FinishedAt.IsZero() && j.FinishedAt.Before(cutoff) && !mj.cbUntil.After(t) {
			jobs = append(jobs, j)
		}
	}
	slices.SortFunc(jobs, func(a, b Job) int {
		if c := a.FinishedAt.Compare(b.FinishedAt); c != 0 {
			return c
		}
		return strings.Compare(a.ID, b.ID)
	})
	if len(jobs) > limit {
		jobs = jobs[:limit]
	}
	for i := range jobs {
		jobs[i] = copyJob(jobs[i])
	}
	return jobs, nil
}
