// Package storetest is the conformance suite every shiftrank job store must
// pass: the in-memory store and PostgreSQL run the same checks, so the
// embedded default behaves like the durable store.
//
//	func TestMemory(t *testing.T) {
//		storetest.Run(t, func(t *testing.T) storetest.Store { return store.NewMemory() })
//	}
package storetest

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"reflect"
	"strings"
	"sync"
	"sync/atomic"
	"testing"
	"time"

	"shiftrank/store"
)

// Store is the method set the suite exercises: the whole store API.
type Store interface {
	CreateJob(ctx context.Context, j store.Job) (store.Job, bool, error)
	SubmitJob(ctx context.Context, j store.Job, maxQueued int) (store.Job, bool, error)
	GetJob(ctx context.Context, owner, id string) (store.Job, error)
	ListJobs(ctx context.Context, owner string, limit int, cursor string) ([]store.Job, string, error)
	ClaimJob(ctx context.Context, workerID string, lease time.Duration) (store.Job, error)
	RenewLease(ctx context.Context, id, workerID string, lease time.Duration) error
	UpdateProgress(ctx context.Context, id, workerID string, p store.Progress) error
	FinishJob(ctx context.Context, id, workerID string, status store.Status, errMsg string, result *store.Result) error
	ReleaseJob(ctx context.Context, id, workerID string) error
	CancelJob(ctx context.Context, owner, id string) (store.Job, error)
	CancelRequested(ctx context.Context, id string) (bool, error)
	GetResult(ctx context.Context, owner, id string) (store.Result, error)
	History(ctx context.Context, owner, id string) ([]store.StatusChange, error)
	PurgeFinished(ctx context.Context, olderThan time.Duration, limit int) (int, error)

	CreateAPIKey(ctx context.Context, name string) (string, store.APIKey, error)
	ListAPIKeys(ctx context.Context) ([]store.APIKey, error)
	RevokeAPIKey(ctx context.Context, idOrName string) (int, error)
	RotateAPIKeySecret(ctx context.Context, idOrName string) (store.APIKey, error)
	GetAPIKey(ctx context.Context, id string) (store.APIKey, error)
	LookupAPIKey(ctx context.Context, key string) (store.APIKey, error)

	RecordDelivery(ctx context.Context, d store.Delivery) error
	Deliveries(ctx context.Context, jobID string) ([]store.Delivery, error)
	MarkCallbackDone(ctx context.Context, id string) error
	PendingCallbacks(ctx context.Context, olderThan time.Duration, limit int) ([]store.Job, error)
	ClaimCallback(ctx context.Context, id, workerID string, lease time.Duration) (bool, error)

	Ping(ctx context.Context) error
	Close()
}

var (
	_ Store = (*store.Memory)(nil)
	_ Store = (*store.Postgres)(nil)
)

// Run runs the conformance suite, one subtest per behaviour, each on a fresh
// store from newStore (closed by the suite when the subtest ends). The
// stores must have default options (DefaultMaxAttempts).
func Run(t *testing.T, newStore func(t *testing.T) Store) {
	tests := []struct {
		name string
		fn   func(t *testing.T, s Store)
	}{
		{"CreateGet", testCreateGet},
		{"ListCursor", testListCursor},
		{"Idempotency", testIdempotency},
		{"IdempotencyConcurrent", testIdempotencyConcurrent},
		{"ClaimRenewProgress", testClaimRenewProgress},
		{"LeaseExpiry", testLeaseExpiry},
		{"ExpiredUnclaimedLeaseStillHeld", testExpiredUnclaimed},
		{"ClaimOrder", testClaimOrder},
		{"ConcurrentClaims", testConcurrentClaims},
		{"CancelledContext", testCancelledContext},
		{"Finish", testFinish},
		{"NoPartialWrites", testNoPartialWrites},
		{"Release", testRelease},
		{"Cancel", testCancel},
		{"CancelDeadWorker", testCancelDeadWorker},
		{"CancelKeepsResult", testCancelKeepsResult},
		{"APIKeys", testAPIKeys},
		{"MaxAttempts", testMaxAttempts},
		{"Deliveries", testDeliveries},
		{"PendingCallbacks", testPendingCallbacks},
		{"ClaimCallback", testClaimCallback},
		{"ClaimCallbackConcurrent", testClaimCallbackConcurrent},
		{"Ping", testPing},
		{"SubmitLimit", testSubmitLimit},
		{"FairClaim", testFairClaim},
		{"FairClaimOneWorker", testFairClaimOneWorker},
		{"RevokeStopsWork", testRevokeStopsWork},
		{"RotateSecret", testRotateSecret},
		{"PurgeFinished", testPurgeFinished},
		{"StorableText", testStorableText},
		{"LargeResult", testLargeResult},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			s := newStore(t)
			t.Cleanup(s.Close)
			tc.fn(t, s)
		})
	}
}

// request returns a small job request body for sample n.
func request(n int) json.RawMessage {
	return json.RawMessage(fmt.Sprintf(`{"formula": "C4H8O2", "peaks": "2.05 (s, 3H)", "reference": "NB-%04d"}`, n))
}

func newJob(owner string, n int) store.Job {
	return store.Job{
		Owner:       owner,
		Request:     request(n),
		Reference:   fmt.Sprintf("NB-%04d", n),
		CallbackURL: "http://127.0.0.1:9/hook",
	}
}

func mustCreate(t *testing.T, s Store, j store.Job) store.Job {
	t.Helper()
	got, created, err := s.CreateJob(context.Background(), j)
	if err != nil {
		t.Fatalf("CreateJob: %v", err)
	}
	if !created {
		t.Fatalf("CreateJob: created = false for a new job")
	}
	return got
}

func mustGet(t *testing.T, s Store, owner, id string) store.Job {
	t.Helper()
	j, err := s.GetJob(context.Background(), owner, id)
	if err != nil {
		t.Fatalf("GetJob(%q, %s): %v", owner, id, err)
	}
	return j
}

func mustClaim(t *testing.T, s Store, worker string, lease time.Duration) store.Job {
	t.Helper()
	j, err := s.ClaimJob(context.Background(), worker, lease)
	if err != nil {
		t.Fatalf("ClaimJob(%s): %v", worker, err)
	}
	return j
}

func wantErr(t *testing.T, what string, err, target error) {
	t.Helper()
	if !errors.Is(err, target) {
		t.Fatalf("%s: error = %v, want %v", what, err, target)
	}
}

func sameJSON(a, b []byte) bool {
	var x, y any
	if json.Unmarshal(a, &x) != nil || json.Unmarshal(b, &y) != nil {
		return false
	}
	return reflect.DeepEqual(x, y)
}

func statuses(h []store.StatusChange) []store.Status {
	out := make([]store.Status, len(h))
	for i, c := range h {
		out[i] = c.Status
	}
	return out
}

func mustHistory(t *testing.T, s Store, owner, id string) []store.StatusChange {
	t.Helper()
	h, err := s.History(context.Background(), owner, id)
	if err != nil {
		t.Fatalf("History(%s): %v", id, err)
	}
	return h
}

func testCreateGet(t *testing.T, s Store) {
	ctx := context.Background()
	before := time.Now().Add(-time.Minute)
	in := newJob("k1", 1)
	in.IdempotencyKey = "idem-1"
	in.Status = store.StatusSucceeded // ignored: new jobs are queued
	j := mustCreate(t, s, in)
	if len(j.ID) < 16 || strings.ContainsAny(j.ID, "/?#&% ") {
		t.Errorf("ID = %q, want a long URL-safe random ID", j.ID)
	}
	if j.Status != store.StatusQueued {
		t.Errorf("Status = %q, want queued", j.Status)
	}
	if j.CreatedAt.Before(before) || !j.StartedAt.IsZero() || !j.FinishedAt.IsZero() {
		t.Errorf("times = %v/%v/%v, want created now, not started or finished", j.CreatedAt, j.StartedAt, j.FinishedAt)
	}
	if j.RequestHash != store.HashRequest(in.Request) {
		t.Errorf("RequestHash = %q, want HashRequest of the body", j.RequestHash)
	}
	got := mustGet(t, s, "k1", j.ID)
	if got.ID != j.ID || got.Owner != "k1" || got.Reference != in.Reference || got.CallbackURL != in.CallbackURL ||
		got.IdempotencyKey != "idem-1" || got.Status != store.StatusQueued || !got.CreatedAt.Equal(j.CreatedAt) {
		t.Errorf("GetJob = %+v, want the created job %+v", got, j)
	}
	if !sameJSON(got.Request, in.Request) {
		t.Errorf("Request = %s, want %s", got.Request, in.Request)
	}
	if h := mustHistory(t, s, "k1", j.ID); !reflect.DeepEqual(statuses(h), []store.Status{store.StatusQueued}) {
		t.Errorf("History = %+v, want one queued entry", h)
	}

	_, err := s.GetJob(ctx, "k2", j.ID)
	wantErr(t, "GetJob of another owner", err, store.ErrNotFound)
	_, err = s.GetJob(ctx, "", j.ID)
	wantErr(t, "GetJob anonymous of an owned job", err, store.ErrNotFound)
	_, err = s.GetJob(ctx, "k1", "nosuchjob")
	wantErr(t, "GetJob unknown", err, store.ErrNotFound)
	_, err = s.History(ctx, "k2", j.ID)
	wantErr(t, "History of another owner", err, store.ErrNotFound)

	for _, bad := range []string{"", "{", `{"a":1} x`} {
		_, _, err = s.CreateJob(ctx, store.Job{Owner: "k1", Request: json.RawMessage(bad)})
		wantErr(t, fmt.Sprintf("CreateJob(request %q)", bad), err, store.ErrInvalid)
	}
	jobs, _, err := s.ListJobs(ctx, "k1", 0, "")
	if err != nil || len(jobs) != 1 {
		t.Errorf("ListJobs after rejected creates = %d jobs, %v; want 1", len(jobs), err)
	}

	anon := mustCreate(t, s, newJob("", 2))
	if got := mustGet(t, s, "", anon.ID); got.Owner != "" {
		t.Errorf("anonymous job owner = %q", got.Owner)
	}
	_, err = s.GetJob(ctx, "k1", anon.ID)
	wantErr(t, "GetJob of an anonymous job by a key", err, store.ErrNotFound)
}

func testListCursor(t *testing.T, s Store) {
	ctx := context.Background()
	var want []string // newest first
	for i := range 7 {
		j := mustCreate(t, s, newJob("k1", i))
		want = append([]string{j.ID}, want...)
		mustCreate(t, s, newJob("k2", 100+i))
		time.Sleep(2 * time.Millisecond) // distinct creation times
	}
	var got []string
	cursor := ""
	for page := 0; ; page++ {
		jobs, next, err := s.ListJobs(ctx, "k1", 3, cursor)
		if err != nil {
			t.Fatalf("ListJobs page %d: %v", page, err)
		}
		if wantLen := min(3, 7-3*page); len(jobs) != wantLen {
			t.Fatalf("ListJobs page %d: %d jobs, want %d", page, len(jobs), wantLen)
		}
		for _, j := range jobs {
			if j.Owner != "k1" {
				t.Fatalf("ListJobs(k1) returned a job of %q", j.Owner)
			}
			got = append(got, j.ID)
		}
		if next == "" {
			break
		}
		if page > 3 {
			t.Fatalf("ListJobs: cursor never ends")
		}
		cursor = next
	}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("ListJobs pages = %v, want newest first %v", got, want)
	}
	all, next, err := s.ListJobs(ctx, "k1", 0, "")
	if err != nil || len(all) != 7 || next != "" {
		t.Errorf("ListJobs(limit 0) = %d jobs, next %q, %v; want all 7, no next page", len(all), next, err)
	}
	exact, next, err := s.ListJobs(ctx, "k1", 7, "")
	if err != nil || len(exact) != 7 || next != "" {
		t.Errorf("ListJobs(limit 7 of 7) = %d jobs, next %q, %v; want 7 and no next page", len(exact), next, err)
	}
	none, next, err := s.ListJobs(ctx, "nobody", 10, "")
	if err != nil || len(none) != 0 || next != "" {
		t.Errorf("ListJobs(unknown owner) = %v, %q, %v; want empty", none, next, err)
	}
	for _, bad := range []string{"!!!", "bm90LWEtY3Vyc29y", "MTIzNA"} {
		_, _, err = s.ListJobs(ctx, "k1", 3, bad)
		wantErr(t, fmt.Sprintf("ListJobs(cursor %q)", bad), err, store.ErrInvalid)
	}
}

func testIdempotency(t *testing.T, s Store) {
	ctx := context.Background()
	in := newJob("k1", 1)
	in.IdempotencyKey = "sample-NB-0001"
	first := mustCreate(t, s, in)

	again, created, err := s.CreateJob(ctx, in)
	if err != nil || created || again.ID != first.ID {
		t.Errorf("repeat CreateJob = %s, created %v, %v; want %s, false, nil", again.ID, created, err, first.ID)
	}
	other := in
	other.Request = request(2)
	_, _, err = s.CreateJob(ctx, other)
	wantErr(t, "CreateJob same key, different body", err, store.ErrConflict)

	otherOwner := in
	otherOwner.Owner = "k2"
	j2 := mustCreate(t, s, otherOwner)
	if j2.ID == first.ID {
		t.Errorf("same idempotency key for another owner returned the first owner's job")
	}
	noKey := newJob("k1", 1)
	a := mustCreate(t, s, noKey)
	b := mustCreate(t, s, noKey)
	if a.ID == b.ID {
		t.Errorf("two creates without an idempotency key gave one job")
	}
	jobs, _, err := s.ListJobs(ctx, "k1", 0, "")
	if err != nil || len(jobs) != 3 {
		t.Errorf("ListJobs(k1) = %d jobs, %v; want 3", len(jobs), err)
	}
}

func testIdempotencyConcurrent(t *testing.T, s Store) {
	ctx := context.Background()
	in := newJob("k1", 1)
	in.IdempotencyKey = "burst"
	const n = 8
	var (
		wg      sync.WaitGroup
		mu      sync.Mutex
		ids     = map[string]int{}
		created int
	)
	for range n {
		wg.Go(func() {
			j, c, err := s.CreateJob(ctx, in)
			if err != nil {
				t.Errorf("CreateJob: %v", err)
				return
			}
			mu.Lock()
			defer mu.Unlock()
			ids[j.ID]++
			if c {
				created++
			}
		})
	}
	wg.Wait()
	if len(ids) != 1 || created != 1 {
		t.Errorf("%d concurrent creates with one key: %d distinct jobs, %d created; want 1 and 1", n, len(ids), created)
	}
}

func testClaimRenewProgress(t *testing.T, s Store) {
	ctx := context.Background()
	_, err := s.ClaimJob(ctx, "w1", time.Minute)
	wantErr(t, "ClaimJob on an empty queue", err, store.ErrNoJob)

	j := mustCreate(t, s, newJob("k1", 1))
	c := mustClaim(t, s, "w1", time.Minute)
	if c.ID != j.ID || c.Status != store.StatusRunning || c.LeaseOwner != "w1" || c.Attempts != 1 {
		t.Fatalf("claimed %+v, want job %s running under w1, attempt 1", c, j.ID)
	}
	if c.StartedAt.IsZero() || c.LeaseUntil.Before(time.Now().Add(30*time.Second)) {
		t.Errorf("claim: StartedAt %v, LeaseUntil %v; want started, lease about a minute ahead", c.StartedAt, c.LeaseUntil)
	}
	_, err = s.ClaimJob(ctx, "w2", time.Minute)
	wantErr(t, "second ClaimJob while leased", err, store.ErrNoJob)

	wantErr(t, "RenewLease by a non-holder", s.RenewLease(ctx, j.ID, "w2", time.Minute), store.ErrLeaseLost)
	wantErr(t, "RenewLease unknown job", s.RenewLease(ctx, "nosuchjob", "w1", time.Minute), store.ErrNotFound)
	if err := s.RenewLease(ctx, j.ID, "w1", 2*time.Minute); err != nil {
		t.Fatalf("RenewLease by the holder: %v", err)
	}
	if got := mustGet(t, s, "k1", j.ID); got.LeaseUntil.Before(time.Now().Add(90 * time.Second)) {
		t.Errorf("after RenewLease(2m) LeaseUntil = %v, want about 2 minutes ahead", got.LeaseUntil)
	}

	p := store.Progress{Generated: 1200, Scored: 800, TotalEstimate: 5000}
	if err := s.UpdateProgress(ctx, j.ID, "w1", p); err != nil {
		t.Fatalf("UpdateProgress: %v", err)
	}
	wantErr(t, "UpdateProgress by a non-holder", s.UpdateProgress(ctx, j.ID, "w2", store.Progress{Generated: 1}), store.ErrLeaseLost)
	if got := mustGet(t, s, "k1", j.ID); got.Progress != p {
		t.Errorf("Progress = %+v, want %+v", got.Progress, p)
	}
	if cr, err := s.CancelRequested(ctx, j.ID); err != nil || cr {
		t.Errorf("CancelRequested = %v, %v; want false", cr, err)
	}
	_, err = s.ClaimJob(ctx, "", time.Minute)
	wantErr(t, "ClaimJob without worker ID", err, store.ErrInvalid)
}

func testLeaseExpiry(t *testing.T, s Store) {
	ctx := context.Background()
	j := mustCreate(t, s, newJob("k1", 1))
	mustClaim(t, s, "w1", 150*time.Millisecond)
	time.Sleep(400 * time.Millisecond) // w1 "died"
	c := mustClaim(t, s, "w2", time.Minute)
	if c.ID != j.ID || c.LeaseOwner != "w2" || c.Attempts != 2 {
		t.Fatalf("after expiry claimed %+v, want job %s under w2, attempt 2", c, j.ID)
	}
	wantErr(t, "RenewLease by the expired holder", s.RenewLease(ctx, j.ID, "w1", time.Minute), store.ErrLeaseLost)
	wantErr(t, "UpdateProgress by the expired holder", s.UpdateProgress(ctx, j.ID, "w1", store.Progress{Scored: 1}), store.ErrLeaseLost)
	err := s.FinishJob(ctx, j.ID, "w1", store.StatusSucceeded, "", &store.Result{IsomersTotal: 1, Body: json.RawMessage(`{"stale":true}`)})
	wantErr(t, "FinishJob by the expired holder", err, store.ErrLeaseLost)
	_, err = s.GetResult(ctx, "k1", j.ID)
	wantErr(t, "GetResult after a lost FinishJob", err, store.ErrNotFound)

	res := &store.Result{IsomersTotal: 7, Body: json.RawMessage(`{"formula":"C4H8O2","candidates":[]}`)}
	if err := s.FinishJob(ctx, j.ID, "w2", store.StatusSucceeded, "", res); err != nil {
		t.Fatalf("FinishJob by the new holder: %v", err)
	}
	h := mustHistory(t, s, "k1", j.ID)
	want := []store.Status{store.StatusQueued, store.StatusRunning, store.StatusRunning, store.StatusSucceeded}
	if !reflect.DeepEqual(statuses(h), want) {
		t.Fatalf("History = %+v, want %v", h, want)
	}
	if h[1].Worker != "w1" || h[2].Worker != "w2" || h[3].Worker != "w2" {
		t.Errorf("History workers = %q, %q, %q; want w1, w2, w2", h[1].Worker, h[2].Worker, h[3].Worker)
	}
	for i := 1; i < len(h); i++ {
		if h[i].At.Before(h[i-1].At) {
			t.Errorf("History not in time order: %v before %v", h[i].At, h[i-1].At)
		}
	}
}

func testExpiredUnclaimed(t *testing.T, s Store) {
	ctx := context.Background()
	j := mustCreate(t, s, newJob("k1", 1))
	mustClaim(t, s, "w1", 50*time.Millisecond)
	time.Sleep(150 * time.Millisecond)
	// Nobody took the job over, so w1 still holds it.
	if err := s.RenewLease(ctx, j.ID, "w1", time.Minute); err != nil {
		t.Fatalf("RenewLease of an expired, unclaimed lease: %v", err)
	}
	_, err := s.ClaimJob(ctx, "w2", time.Minute)
	wantErr(t, "ClaimJob after the holder renewed", err, store.ErrNoJob)
}

func testClaimOrder(t *testing.T, s Store) {
	a := mustCreate(t, s, newJob("k1", 1))
	time.Sleep(2 * time.Millisecond)
	b := mustCreate(t, s, newJob("k2", 2))
	time.Sleep(2 * time.Millisecond)
	c := mustCreate(t, s, newJob("k1", 3))
	if got := mustClaim(t, s, "w1", 100*time.Millisecond); got.ID != a.ID {
		t.Fatalf("first claim got %s, want the oldest job %s", got.ID, a.ID)
	}
	time.Sleep(300 * time.Millisecond)
	for i, want := range []string{a.ID, b.ID, c.ID} { // abandoned job first, then queued oldest first
		if got := mustClaim(t, s, "w2", time.Minute); got.ID != want {
			t.Errorf("claim %d got %s, want %s", i, got.ID, want)
		}
	}
	_, err := s.ClaimJob(context.Background(), "w2", time.Minute)
	wantErr(t, "ClaimJob with every job leased", err, store.ErrNoJob)
}

func testCancelledContext(t *testing.T, s Store) {
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, _, err := s.CreateJob(ctx, newJob("k1", 1)); !errors.Is(err, context.Canceled) {
		t.Errorf("CreateJob with a cancelled context: %v, want context.Canceled", err)
	}
	if _, _, err := s.CreateAPIKey(ctx, "eln-lab-7"); !errors.Is(err, context.Canceled) {
		t.Errorf("CreateAPIKey with a cancelled context: %v, want context.Canceled", err)
	}
	jobs, _, err := s.ListJobs(context.Background(), "k1", 0, "")
	if err != nil || len(jobs) != 0 {
		t.Errorf("ListJobs after cancelled creates = %d jobs, %v; want none", len(jobs), err)
	}
	if keys, err := s.ListAPIKeys(context.Background()); err != nil || len(keys) != 0 {
		t.Errorf("ListAPIKeys after a cancelled create = %d, %v; want none", len(keys), err)
	}
}

func testConcurrentClaims(t *testing.T, s Store) {
	ctx := context.Background()
	const jobs, workers = 60, 8
	for i := range jobs {
		mustCreate(t, s, newJob("k1", i))
	}
	var (
		wg     sync.WaitGroup
		mu     sync.Mutex
		claims = map[string][]string{} // job -> workers
	)
	for w := range workers {
		worker := fmt.Sprintf("w%d", w)
		wg.Go(func() {
			for {
				j, err := s.ClaimJob(ctx, worker, time.Minute)
				if errors.Is(err, store.ErrNoJob) {
					return
				}
				if err != nil {
					t.Errorf("ClaimJob(%s): %v", worker, err)
					return
				}
				mu.Lock()
				claims[j.ID] = append(claims[j.ID], worker)
				mu.Unlock()
				res := &store.Result{Body: json.RawMessage(`{"by":"` + worker + `"}`)}
				if err := s.FinishJob(ctx, j.ID, worker, store.StatusSucceeded, "", res); err != nil {
					t.Errorf("FinishJob(%s, %s): %v", j.ID, worker, err)
				}
			}
		})
	}
	wg.Wait()
	if len(claims) != jobs {
		t.Errorf("%d workers claimed %d distinct jobs, want %d", workers, len(claims), jobs)
	}
	for id, ws := range claims {
		if len(ws) != 1 {
			t.Errorf("job %s claimed %d times (%v), want once", id, len(ws), ws)
		}
		j := mustGet(t, s, "k1", id)
		if j.Status != store.StatusSucceeded || j.Attempts != 1 {
			t.Errorf("job %s: status %s, attempts %d; want succeeded, 1", id, j.Status, j.Attempts)
		}
		r, err := s.GetResult(ctx, "k1", id)
		if err != nil || !sameJSON(r.Body, []byte(`{"by":"`+ws[0]+`"}`)) {
			t.Errorf("job %s result = %s, %v; want written by %s", id, r.Body, err, ws[0])
		}
	}
}

func testFinish(t *testing.T, s Store) {
	ctx := context.Background()
	ok := mustCreate(t, s, newJob("k1", 1))
	bad := mustCreate(t, s, newJob("k1", 2))
	mustClaim(t, s, "w1", time.Minute)
	mustClaim(t, s, "w1", time.Minute)

	body := json.RawMessage(`{"formula":"C4H8O2","dbe":1,"isomers_total":12,"candidates":[{"rank":1,"smiles":"CCOC(C)=O","score":-3.5}]}`)
	if err := s.FinishJob(ctx, ok.ID, "w1", store.StatusRunning, "", nil); !errors.Is(err, store.ErrInvalid) {
		t.Errorf("FinishJob(running) error = %v, want ErrInvalid", err)
	}
	if err := s.FinishJob(ctx, ok.ID, "w1", store.StatusSucceeded, "", &store.Result{IsomersTotal: 12, Body: body}); err != nil {
		t.Fatalf("FinishJob(succeeded): %v", err)
	}
	j := mustGet(t, s, "k1", ok.ID)
	if j.Status != store.StatusSucceeded || j.FinishedAt.IsZero() || j.FinishedAt.Before(j.StartedAt) || !j.LeaseUntil.IsZero() {
		t.Errorf("finished job = %+v, want succeeded with FinishedAt >= StartedAt and no lease", j)
	}
	r, err := s.GetResult(ctx, "k1", ok.ID)
	if err != nil {
		t.Fatalf("GetResult: %v", err)
	}
	if r.JobID != ok.ID || r.IsomersTotal != 12 || !sameJSON(r.Body, body) {
		t.Errorf("GetResult = %+v (%s), want job %s, 12 isomers, body %s", r, r.Body, ok.ID, body)
	}
	_, err = s.GetResult(ctx, "k2", ok.ID)
	wantErr(t, "GetResult of another owner", err, store.ErrNotFound)
	err = s.FinishJob(ctx, ok.ID, "w1", store.StatusFailed, "again", nil)
	wantErr(t, "FinishJob twice", err, store.ErrLeaseLost)
	wantErr(t, "RenewLease after finish", s.RenewLease(ctx, ok.ID, "w1", time.Minute), store.ErrLeaseLost)

	if err := s.FinishJob(ctx, bad.ID, "w1", store.StatusFailed, "formula: unknown element Xy", nil); err != nil {
		t.Fatalf("FinishJob(failed): %v", err)
	}
	j = mustGet(t, s, "k1", bad.ID)
	if j.Status != store.StatusFailed || j.Error != "formula: unknown element Xy" {
		t.Errorf("failed job status %s error %q, want failed with the message", j.Status, j.Error)
	}
	_, err = s.GetResult(ctx, "k1", bad.ID)
	wantErr(t, "GetResult of a failed job", err, store.ErrNotFound)
	if h := mustHistory(t, s, "k1", bad.ID); h[len(h)-1].Status != store.StatusFailed {
		t.Errorf("last history entry %+v, want failed", h[len(h)-1])
	}
	_, err = s.ClaimJob(ctx, "w2", time.Minute)
	wantErr(t, "ClaimJob with only finished jobs", err, store.ErrNoJob)
}

func testNoPartialWrites(t *testing.T, s Store) {
	ctx := context.Background()
	j := mustCreate(t, s, newJob("k1", 1))
	mustClaim(t, s, "w1", time.Minute)
	before := mustGet(t, s, "k1", j.ID)
	histBefore := mustHistory(t, s, "k1", j.ID)

	err := s.FinishJob(ctx, j.ID, "w1", store.StatusSucceeded, "", &store.Result{Body: json.RawMessage(`{"candidates": [`)})
	wantErr(t, "FinishJob with a malformed result", err, store.ErrInvalid)
	err = s.FinishJob(ctx, j.ID, "w2", store.StatusSucceeded, "", &store.Result{Body: json.RawMessage(`{}`)})
	wantErr(t, "FinishJob by a non-holder", err, store.ErrLeaseLost)
	err = s.FinishJob(ctx, j.ID, "w1", store.Status("done"), "", nil)
	wantErr(t, "FinishJob with an unknown status", err, store.ErrInvalid)

	after := mustGet(t, s, "k1", j.ID)
	if after.Status != store.StatusRunning || after.LeaseOwner != "w1" || !after.FinishedAt.IsZero() || after.Attempts != before.Attempts {
		t.Errorf("job after rejected finishes = %+v, want unchanged %+v", after, before)
	}
	if h := mustHistory(t, s, "k1", j.ID); len(h) != len(histBefore) {
		t.Errorf("history grew from %d to %d entries on rejected finishes", len(histBefore), len(h))
	}
	_, err = s.GetResult(ctx, "k1", j.ID)
	wantErr(t, "GetResult after rejected finishes", err, store.ErrNotFound)
}

func testRelease(t *testing.T, s Store) {
	ctx := context.Background()
	j := mustCreate(t, s, newJob("k1", 1))
	mustClaim(t, s, "w1", time.Minute)
	wantErr(t, "ReleaseJob by a non-holder", s.ReleaseJob(ctx, j.ID, "w2"), store.ErrLeaseLost)
	if err := s.ReleaseJob(ctx, j.ID, "w1"); err != nil {
		t.Fatalf("ReleaseJob: %v", err)
	}
	if got := mustGet(t, s, "k1", j.ID); got.Status != store.StatusQueued || !got.LeaseUntil.IsZero() {
		t.Errorf("released job status %s lease %v, want queued, no lease", got.Status, got.LeaseUntil)
	}
	wantErr(t, "RenewLease after release", s.RenewLease(ctx, j.ID, "w1", time.Minute), store.ErrLeaseLost)
	c := mustClaim(t, s, "w2", time.Minute)
	if c.ID != j.ID || c.Attempts != 2 || c.LeaseOwner != "w2" {
		t.Errorf("re-claimed %+v, want job %s under w2, attempt 2", c, j.ID)
	}
	want := []store.Status{store.StatusQueued, store.StatusRunning, store.StatusQueued, store.StatusRunning}
	if h := mustHistory(t, s, "k1", j.ID); !reflect.DeepEqual(statuses(h), want) {
		t.Errorf("History = %v, want %v", statuses(h), want)
	}

	// A released job whose owner asked to cancel it ends cancelled.
	if _, err := s.CancelJob(ctx, "k1", j.ID); err != nil {
		t.Fatalf("CancelJob: %v", err)
	}
	if err := s.ReleaseJob(ctx, j.ID, "w2"); err != nil {
		t.Fatalf("ReleaseJob with a cancel request: %v", err)
	}
	if got := mustGet(t, s, "k1", j.ID); got.Status != store.StatusCancelled || got.FinishedAt.IsZero() {
		t.Errorf("released cancel-requested job = %s finished %v, want cancelled", got.Status, got.FinishedAt)
	}
}

func testCancel(t *testing.T, s Store) {
	ctx := context.Background()
	queued := mustCreate(t, s, newJob("k1", 1))
	c, err := s.CancelJob(ctx, "k1", queued.ID)
	if err != nil || c.Status != store.StatusCancelled || c.FinishedAt.IsZero() {
		t.Fatalf("CancelJob(queued) = %s finished %v, %v; want cancelled at once", c.Status, c.FinishedAt, err)
	}
	_, err = s.ClaimJob(ctx, "w1", time.Minute)
	wantErr(t, "ClaimJob after cancelling the only job", err, store.ErrNoJob)
	want := []store.Status{store.StatusQueued, store.StatusCancelled}
	if h := mustHistory(t, s, "k1", queued.ID); !reflect.DeepEqual(statuses(h), want) {
		t.Errorf("History = %v, want %v", statuses(h), want)
	}

	running := mustCreate(t, s, newJob("k1", 2))
	mustClaim(t, s, "w1", time.Minute)
	_, err = s.CancelJob(ctx, "k2", running.ID)
	wantErr(t, "CancelJob of another owner's job", err, store.ErrNotFound)
	if cr, _ := s.CancelRequested(ctx, running.ID); cr {
		t.Fatalf("CancelRequested set by another owner's CancelJob")
	}
	c, err = s.CancelJob(ctx, "k1", running.ID)
	if err != nil || c.Status != store.StatusRunning || !c.CancelRequested {
		t.Fatalf("CancelJob(running) = %s, cancel requested %v, %v; want still running with the request set", c.Status, c.CancelRequested, err)
	}
	if cr, err := s.CancelRequested(ctx, running.ID); err != nil || !cr {
		t.Errorf("CancelRequested = %v, %v; want true", cr, err)
	}
	wantErr(t, "RenewLease with a cancel request", s.RenewLease(ctx, running.ID, "w1", time.Minute), store.ErrCancelRequested)
	wantErr(t, "RenewLease with a cancel request by a non-holder", s.RenewLease(ctx, running.ID, "w2", time.Minute), store.ErrLeaseLost)
	if err := s.FinishJob(ctx, running.ID, "w1", store.StatusCancelled, "", nil); err != nil {
		t.Fatalf("FinishJob(cancelled) after the request: %v", err)
	}
	done := mustGet(t, s, "k1", running.ID)
	if done.Status != store.StatusCancelled {
		t.Errorf("status = %s, want cancelled", done.Status)
	}
	again, err := s.CancelJob(ctx, "k1", running.ID)
	if err != nil || again.Status != store.StatusCancelled || !again.FinishedAt.Equal(done.FinishedAt) {
		t.Errorf("CancelJob(cancelled) = %s %v, %v; want unchanged", again.Status, again.FinishedAt, err)
	}
	_, err = s.CancelRequested(ctx, "nosuchjob")
	wantErr(t, "CancelRequested of an unknown job", err, store.ErrNotFound)
	_, err = s.CancelJob(ctx, "k1", "nosuchjob")
	wantErr(t, "CancelJob of an unknown job", err, store.ErrNotFound)
}

// testCancelKeepsResult checks that a job cancelled while it ran can keep
// the ranking its worker had so far: FinishJob with StatusCancelled and a
// result stores both, and GetResult returns the result.
func testCancelKeepsResult(t *testing.T, s Store) {
	ctx := context.Background()
	j := mustCreate(t, s, newJob("k1", 1))
	mustClaim(t, s, "w1", time.Minute)
	if _, err := s.CancelJob(ctx, "k1", j.ID); err != nil {
		t.Fatalf("CancelJob(running): %v", err)
	}
	body := json.RawMessage(`{"candidates":[{"rank":1,"smiles":"CCO"}],"search":{"status":"stopped early"}}`)
	if err := s.FinishJob(ctx, j.ID, "w1", store.StatusCancelled, "cancelled on request; kept", &store.Result{IsomersTotal: 2, Body: body}); err != nil {
		t.Fatalf("FinishJob(cancelled, with a result): %v", err)
	}
	done := mustGet(t, s, "k1", j.ID)
	if done.Status != store.StatusCancelled || done.Error != "cancelled on request; kept" {
		t.Errorf("job = %s %q, want cancelled with its message", done.Status, done.Error)
	}
	res, err := s.GetResult(ctx, "k1", j.ID)
	if err != nil || res.IsomersTotal != 2 || !sameJSON(res.Body, body) {
		t.Errorf("GetResult of a cancelled job with a kept ranking = %+v, %v; want the stored result", res, err)
	}
	_, err = s.GetResult(ctx, "k2", j.ID)
	wantErr(t, "GetResult of another owner's cancelled job", err, store.ErrNotFound)
}

func testCancelDeadWorker(t *testing.T, s Store) {
	ctx := context.Background()
	j := mustCreate(t, s, newJob("k1", 1))
	mustClaim(t, s, "w1", 100*time.Millisecond)
	if _, err := s.CancelJob(ctx, "k1", j.ID); err != nil {
		t.Fatalf("CancelJob: %v", err)
	}
	time.Sleep(300 * time.Millisecond) // w1 died without seeing the request
	_, err := s.ClaimJob(ctx, "w2", time.Minute)
	wantErr(t, "ClaimJob of an expired, cancel-requested job", err, store.ErrNoJob)
	if got := mustGet(t, s, "k1", j.ID); got.Status != store.StatusCancelled || got.FinishedAt.IsZero() {
		t.Errorf("job = %s finished %v, want cancelled", got.Status, got.FinishedAt)
	}
	if h := mustHistory(t, s, "k1", j.ID); h[len(h)-1].Status != store.StatusCancelled {
		t.Errorf("last history entry %+v, want cancelled", h[len(h)-1])
	}
}

func testAPIKeys(t *testing.T, s Store) {
	ctx := context.Background()
	key, k, err := s.CreateAPIKey(ctx, "eln-lab-7")
	if err != nil {
		t.Fatalf("CreateAPIKey: %v", err)
	}
	if !strings.HasPrefix(key, store.KeyPrefix) || len(key) < len(store.KeyPrefix)+43 {
		t.Errorf("key %q: want prefix %q and at least 256 random bits", key, store.KeyPrefix)
	}
	if k.ID == "" || k.Name != "eln-lab-7" || k.Revoked() || k.CreatedAt.IsZero() {
		t.Errorf("CreateAPIKey record = %+v", k)
	}
	if !bytes.Equal(k.Hash, store.HashKey(key)) || len(k.Hash) != 32 {
		t.Errorf("Hash = %x, want sha256 of the key", k.Hash)
	}
	if len(k.Secret) < 32 {
		t.Errorf("Secret has %d bytes, want at least 32", len(k.Secret))
	}
	key2, k2, err := s.CreateAPIKey(ctx, "eln-lab-8")
	if err != nil {
		t.Fatalf("CreateAPIKey: %v", err)
	}
	if key2 == key || k2.ID == k.ID || bytes.Equal(k2.Secret, k.Secret) {
		t.Errorf("two keys share a key, ID or secret")
	}
	_, _, err = s.CreateAPIKey(ctx, "eln-lab-7")
	wantErr(t, "CreateAPIKey with a taken name", err, store.ErrConflict)
	_, _, err = s.CreateAPIKey(ctx, " ")
	wantErr(t, "CreateAPIKey with an empty name", err, store.ErrInvalid)

	got, err := s.LookupAPIKey(ctx, key)
	if err != nil || got.ID != k.ID || !bytes.Equal(got.Secret, k.Secret) {
		t.Errorf("LookupAPIKey = %+v, %v; want %s", got, err, k.ID)
	}
	for _, bad := range []string{"", key + "x", store.KeyPrefix + "0000", string(k.Hash)} {
		_, err = s.LookupAPIKey(ctx, bad)
		wantErr(t, fmt.Sprintf("LookupAPIKey(%q)", bad), err, store.ErrUnauthorized)
	}
	byID, err := s.GetAPIKey(ctx, k2.ID)
	if err != nil || byID.Name != "eln-lab-8" {
		t.Errorf("GetAPIKey = %+v, %v", byID, err)
	}
	_, err = s.GetAPIKey(ctx, "nosuchkey")
	wantErr(t, "GetAPIKey unknown", err, store.ErrNotFound)

	keys, err := s.ListAPIKeys(ctx)
	if err != nil || len(keys) != 2 || keys[0].ID != k.ID || keys[1].ID != k2.ID {
		t.Fatalf("ListAPIKeys = %+v, %v; want both, oldest first", keys, err)
	}
	for _, listed := range keys {
		for _, field := range [][]byte{[]byte(listed.ID), []byte(listed.Name), listed.Hash, listed.Secret} {
			if bytes.Contains(field, []byte(key)) || bytes.Contains(field, []byte(key2)) {
				t.Errorf("ListAPIKeys exposes a key itself: %+v", listed)
			}
		}
	}

	if _, err := s.RevokeAPIKey(ctx, "eln-lab-7"); err != nil {
		t.Fatalf("RevokeAPIKey(name): %v", err)
	}
	_, err = s.LookupAPIKey(ctx, key)
	wantErr(t, "LookupAPIKey of a revoked key", err, store.ErrUnauthorized)
	if _, err := s.RevokeAPIKey(ctx, k.ID); err != nil {
		t.Errorf("RevokeAPIKey twice: %v", err)
	}
	if _, err := s.RevokeAPIKey(ctx, k2.ID); err != nil {
		t.Fatalf("RevokeAPIKey(id): %v", err)
	}
	_, err = s.LookupAPIKey(ctx, key2)
	wantErr(t, "LookupAPIKey of a key revoked by ID", err, store.ErrUnauthorized)
	_, err = s.RevokeAPIKey(ctx, "nosuchkey")
	wantErr(t, "RevokeAPIKey unknown", err, store.ErrNotFound)
	keys, err = s.ListAPIKeys(ctx)
	if err != nil || len(keys) != 2 || !keys[0].Revoked() || !keys[1].Revoked() {
		t.Errorf("ListAPIKeys after revoking = %+v, %v; want both listed, revoked", keys, err)
	}
	if rk, err := s.GetAPIKey(ctx, k.ID); err != nil || !rk.Revoked() {
		t.Errorf("GetAPIKey of a revoked key = %+v, %v; want it, revoked", rk, err)
	}
}

func testDeliveries(t *testing.T, s Store) {
	ctx := context.Background()
	j := mustCreate(t, s, newJob("k1", 1))
	ds, err := s.Deliveries(ctx, j.ID)
	if err != nil || len(ds) != 0 {
		t.Errorf("Deliveries of a new job = %v, %v; want none", ds, err)
	}
	at := time.Date(2026, 3, 4, 5, 6, 7, 123456000, time.UTC)
	want := []store.Delivery{
		{JobID: j.ID, Attempt: 1, URL: j.CallbackURL, Error: "dial tcp 127.0.0.1:9: connection refused", At: at},
		{JobID: j.ID, Attempt: 2, URL: j.CallbackURL, StatusCode: 503, At: at.Add(2 * time.Second)},
		{JobID: j.ID, Attempt: 3, URL: j.CallbackURL, StatusCode: 204, At: at.Add(6 * time.Second)},
	}
	for _, d := range want {
		if err := s.RecordDelivery(ctx, d); err != nil {
			t.Fatalf("RecordDelivery: %v", err)
		}
	}
	ds, err = s.Deliveries(ctx, j.ID)
	if err != nil {
		t.Fatalf("Deliveries: %v", err)
	}
	if len(ds) != len(want) {
		t.Fatalf("Deliveries = %+v, want %+v", ds, want)
	}
	for i := range want {
		if ds[i].JobID != want[i].JobID || ds[i].Attempt != want[i].Attempt || ds[i].URL != want[i].URL ||
			ds[i].StatusCode != want[i].StatusCode || ds[i].Error != want[i].Error || !ds[i].At.Equal(want[i].At) {
			t.Errorf("Deliveries[%d] = %+v, want %+v", i, ds[i], want[i])
		}
	}
	if err := s.RecordDelivery(ctx, store.Delivery{JobID: j.ID, Attempt: 4, URL: j.CallbackURL, StatusCode: 200}); err != nil {
		t.Fatalf("RecordDelivery without a time: %v", err)
	}
	if ds, _ := s.Deliveries(ctx, j.ID); len(ds) != 4 || ds[3].At.IsZero() {
		t.Errorf("delivery recorded without a time: %+v, want At set", ds)
	}
	wantErr(t, "RecordDelivery for an unknown job", s.RecordDelivery(ctx, store.Delivery{JobID: "nosuchjob", Attempt: 1}), store.ErrNotFound)
	_, err = s.Deliveries(ctx, "nosuchjob")
	wantErr(t, "Deliveries of an unknown job", err, store.ErrNotFound)
}

func testMaxAttempts(t *testing.T, s Store) {
	ctx := context.Background()
	j := mustCreate(t, s, newJob("k1", 1))
	for attempt := 1; attempt <= store.DefaultMaxAttempts; attempt++ {
		c := mustClaim(t, s, fmt.Sprintf("w%d", attempt), 40*time.Millisecond)
		if c.ID != j.ID || c.Attempts != attempt {
			t.Fatalf("claim %d got %s attempt %d, want %s attempt %d", attempt, c.ID, c.Attempts, j.ID, attempt)
		}
		time.Sleep(100 * time.Millisecond) // the worker dies each time
	}
	_, err := s.ClaimJob(ctx, "w-last", time.Minute)
	wantErr(t, "ClaimJob of a job out of attempts", err, store.ErrNoJob)
	got := mustGet(t, s, "k1", j.ID)
	if got.Status != store.StatusFailed || !strings.Contains(got.Error, "abandoned") || got.FinishedAt.IsZero() {
		t.Errorf("job out of attempts = %s %q, want failed as abandoned", got.Status, got.Error)
	}
	if h := mustHistory(t, s, "k1", j.ID); h[len(h)-1].Status != store.StatusFailed {
		t.Errorf("last history entry %+v, want failed", h[len(h)-1])
	}
}

func testPendingCallbacks(t *testing.T, s Store) {
	ctx := context.Background()
	hooked := mustCreate(t, s, newJob("k1", 1))
	plain := newJob("k1", 2)
	plain.CallbackURL = ""
	silent := mustCreate(t, s, plain)
	for _, id := range []string{hooked.ID, silent.ID} {
		c := mustClaim(t, s, "w1", time.Minute)
		if c.ID != id {
			t.Fatalf("claimed %s, want %s", c.ID, id)
		}
		if err := s.FinishJob(ctx, id, "w1", store.StatusSucceeded, "", &store.Result{Body: json.RawMessage(`{}`)}); err != nil {
			t.Fatal(err)
		}
	}
	cancelled := mustCreate(t, s, newJob("k2", 3))
	waiting := mustCreate(t, s, newJob("k1", 4))
	time.Sleep(2 * time.Millisecond)
	if _, err := s.CancelJob(ctx, "k2", cancelled.ID); err != nil {
		t.Fatal(err)
	}
	time.Sleep(2 * time.Millisecond)

	ids := func(jobs []store.Job) []string {
		out := []string{}
		for _, j := range jobs {
			out = append(out, j.ID)
		}
		return out
	}
	pending, err := s.PendingCallbacks(ctx, 0, 0)
	if want := []string{hooked.ID, cancelled.ID}; err != nil || !reflect.DeepEqual(ids(pending), want) {
		t.Fatalf("PendingCallbacks = %v, %v; want finished jobs with a callback %v (not %s without one, not %s still queued)",
			ids(pending), err, want, silent.ID, waiting.ID)
	}
	if one, err := s.PendingCallbacks(ctx, 0, 1); err != nil || len(one) != 1 || one[0].ID != hooked.ID {
		t.Errorf("PendingCallbacks(limit 1) = %v, %v; want the oldest, %s", ids(one), err, hooked.ID)
	}
	if recent, err := s.PendingCallbacks(ctx, time.Hour, 0); err != nil || len(recent) != 0 {
		t.Errorf("PendingCallbacks(older than 1h) = %v, %v; want none", ids(recent), err)
	}
	if err := s.MarkCallbackDone(ctx, hooked.ID); err != nil {
		t.Fatalf("MarkCallbackDone: %v", err)
	}
	if got := mustGet(t, s, "k1", hooked.ID); !got.CallbackDone {
		t.Errorf("CallbackDone = false after MarkCallbackDone")
	}
	pending, err = s.PendingCallbacks(ctx, 0, 0)
	if want := []string{cancelled.ID}; err != nil || !reflect.DeepEqual(ids(pending), want) {
		t.Errorf("PendingCallbacks after MarkCallbackDone = %v, %v; want %v", ids(pending), err, want)
	}
	wantErr(t, "MarkCallbackDone of an unknown job", s.MarkCallbackDone(ctx, "nosuchjob"), store.ErrNotFound)
}

// finishedWithCallback creates a job with a callback URL and runs it to
// success.
func finishedWithCallback(t *testing.T, s Store, n int) store.Job {
	t.Helper()
	j := mustCreate(t, s, newJob("k1", n))
	if c := mustClaim(t, s, "w1", time.Minute); c.ID != j.ID {
		t.Fatalf("claimed %s, want %s", c.ID, j.ID)
	}
	if err := s.FinishJob(context.Background(), j.ID, "w1", store.StatusSucceeded, "", &store.Result{Body: json.RawMessage(`{}`)}); err != nil {
		t.Fatal(err)
	}
	return j
}

func testClaimCallback(t *testing.T, s Store) {
	ctx := context.Background()
	j := finishedWithCallback(t, s, 1)
	queued := mustCreate(t, s, newJob("k1", 2))
	if ok, err := s.ClaimCallback(ctx, queued.ID, "p1", time.Minute); ok || err != nil {
		t.Errorf("ClaimCallback of a queued job = %v, %v; want false, nil", ok, err)
	}
	claim := func(worker string, lease time.Duration) bool {
		t.Helper()
		ok, err := s.ClaimCallback(ctx, j.ID, worker, lease)
		if err != nil {
			t.Fatalf("ClaimCallback(%s): %v", worker, err)
		}
		return ok
	}
	if !claim("p1", 300*time.Millisecond) {
		t.Fatal("first ClaimCallback = false, want true")
	}
	if claim("p2", time.Minute) {
		t.Error("ClaimCallback by p2 while p1 holds an unexpired claim = true, want false")
	}
	if !claim("p1", 300*time.Millisecond) {
		t.Error("renewing ClaimCallback by the holder = false, want true")
	}
	if pending, err := s.PendingCallbacks(ctx, 0, 0); err != nil || len(pending) != 0 {
		t.Errorf("PendingCallbacks while claimed = %d jobs, %v; want none", len(pending), err)
	}
	time.Sleep(400 * time.Millisecond)
	if pending, err := s.PendingCallbacks(ctx, 0, 0); err != nil || len(pending) != 1 {
		t.Errorf("PendingCallbacks after the claim expired = %d jobs, %v; want 1", len(pending), err)
	}
	if !claim("p2", time.Minute) {
		t.Error("ClaimCallback by p2 after p1's claim expired = false, want true")
	}
	if claim("p1", time.Minute) {
		t.Error("ClaimCallback by p1 after p2 took over = true, want false")
	}
	if !claim("p2", 0) {
		t.Error("ClaimCallback by the holder with a zero lease (giving it up) = false, want true")
	}
	if !claim("p1", time.Minute) {
		t.Error("ClaimCallback by p1 after p2 gave the claim up = false, want true")
	}
	if err := s.MarkCallbackDone(ctx, j.ID); err != nil {
		t.Fatal(err)
	}
	if claim("p2", time.Minute) {
		t.Error("ClaimCallback of a settled callback = true, want false")
	}
	_, err := s.ClaimCallback(ctx, "nosuchjob", "p1", time.Minute)
	wantErr(t, "ClaimCallback of an unknown job", err, store.ErrNotFound)
}

// testClaimCallbackConcurrent: of many processes claiming one callback at
// once, exactly one gets it.
func testClaimCallbackConcurrent(t *testing.T, s Store) {
	j := finishedWithCallback(t, s, 1)
	const n = 8
	var (
		wg   sync.WaitGroup
		wins atomic.Int32
	)
	for i := range n {
		wg.Add(1)
		go func() {
			defer wg.Done()
			ok, err := s.ClaimCallback(context.Background(), j.ID, fmt.Sprintf("p%d", i), time.Minute)
			if err != nil {
				t.Errorf("ClaimCallback p%d: %v", i, err)
			}
			if ok {
				wins.Add(1)
			}
		}()
	}
	wg.Wait()
	if got := wins.Load(); got != 1 {
		t.Errorf("%d of %d concurrent ClaimCallback calls won, want exactly 1", got, n)
	}
}

func testPing(t *testing.T, s Store) {
	if err := s.Ping(context.Background()); err != nil {
		t.Errorf("Ping: %v", err)
	}
}
