package storetest

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"reflect"
	"strings"
	"testing"
	"time"

	"shiftrank/store"
)

// testSubmitLimit: SubmitJob refuses a job beyond the owner's queue bound
// with ErrLimit, counts queued jobs only, leaves other owners alone, and
// still answers an idempotent repeat.
func testSubmitLimit(t *testing.T, s Store) {
	ctx := context.Background()
	first := newJob("k1", 1)
	first.IdempotencyKey = "nb-1"
	a, created, err := s.SubmitJob(ctx, first, 2)
	if err != nil || !created {
		t.Fatalf("SubmitJob 1 of 2 = %v, %v", created, err)
	}
	if _, _, err := s.SubmitJob(ctx, newJob("k1", 2), 2); err != nil {
		t.Fatalf("SubmitJob 2 of 2: %v", err)
	}
	_, _, err = s.SubmitJob(ctx, newJob("k1", 3), 2)
	wantErr(t, "SubmitJob beyond the queue bound", err, store.ErrLimit)
	again, created, err := s.SubmitJob(ctx, first, 2)
	if err != nil || created || again.ID != a.ID {
		t.Errorf("idempotent repeat at the bound = %s, created %v, %v; want %s, false, nil", again.ID, created, err, a.ID)
	}
	if _, _, err := s.SubmitJob(ctx, newJob("k2", 4), 2); err != nil {
		t.Errorf("another owner's SubmitJob while k1's queue is full: %v", err)
	}
	if _, _, err := s.SubmitJob(ctx, newJob("k1", 5), 0); err != nil {
		t.Errorf("SubmitJob without a bound: %v", err)
	}
	// A running job no longer counts as queued.
	mustClaim(t, s, "w1", time.Minute)
	mustClaim(t, s, "w1", time.Minute)
	mustClaim(t, s, "w1", time.Minute)
	if _, _, err := s.SubmitJob(ctx, newJob("k1", 6), 2); err != nil {
		t.Errorf("SubmitJob after k1's jobs started: %v", err)
	}
	jobs, _, err := s.ListJobs(ctx, "k1", 0, "")
	if err != nil || len(jobs) != 4 {
		t.Errorf("k1 has %d jobs, %v; want 4 (the refused one not stored)", len(jobs), err)
	}
}

// testFairClaim: owner A floods the queue before B and C submit one job
// each; with every claimed job still running, the claims alternate between
// owners by their running jobs, then by who was served longest ago.
func testFairClaim(t *testing.T, s Store) {
	var a []string
	for i := range 6 {
		a = append(a, mustCreate(t, s, newJob("ka", i)).ID)
	}
	b := mustCreate(t, s, newJob("kb", 10)).ID
	c := mustCreate(t, s, newJob("kc", 11)).ID
	want := []string{a[0], b, c, a[1], a[2], a[3], a[4], a[5]}
	var got []string
	for range want {
		got = append(got, mustClaim(t, s, "w1", time.Minute).ID)
	}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("claim order = %v, want %v (A's first job, then B's and C's before the rest of A's flood)", got, want)
	}
}

// testFairClaimOneWorker: with one worker (each job finished before the
// next claim), a job submitted behind another owner's flood runs next.
func testFairClaimOneWorker(t *testing.T, s Store) {
	ctx := context.Background()
	var a []string
	for i := range 4 {
		a = append(a, mustCreate(t, s, newJob("ka", i)).ID)
	}
	run := func() string {
		t.Helper()
		j := mustClaim(t, s, "w1", time.Minute)
		if err := s.FinishJob(ctx, j.ID, "w1", store.StatusSucceeded, "", &store.Result{Body: json.RawMessage(`{}`)}); err != nil {
			t.Fatal(err)
		}
		return j.ID
	}
	got := []string{run()}
	b := mustCreate(t, s, newJob("kb", 10)).ID
	for range 4 {
		got = append(got, run())
	}
	if want := []string{a[0], b, a[1], a[2], a[3]}; !reflect.DeepEqual(got, want) {
		t.Errorf("one-worker order = %v, want %v (B's job right after the running one)", got, want)
	}
}

// RunLimits runs the checks of options that bound the queue, each on a
// fresh store made by open with the options it needs.
func RunLimits(t *testing.T, open func(t *testing.T, opts ...store.Option) Store) {
	t.Run("MaxRunningPerOwner", func(t *testing.T) {
		s := open(t, store.WithMaxRunningPerOwner(2))
		t.Cleanup(s.Close)
		ctx := context.Background()
		for i := range 4 {
			mustCreate(t, s, newJob("ka", i))
		}
		b := mustCreate(t, s, newJob("kb", 10))
		var owners []string
		var ids []string
		for range 3 {
			j := mustClaim(t, s, "w1", time.Minute)
			owners = append(owners, j.Owner)
			ids = append(ids, j.ID)
		}
		if want := []string{"ka", "kb", "ka"}; !reflect.DeepEqual(owners, want) {
			t.Errorf("claimed owners %v, want %v", owners, want)
		}
		_, err := s.ClaimJob(ctx, "w1", time.Minute)
		wantErr(t, "ClaimJob with ka at its running limit and kb's queue empty", err, store.ErrNoJob)
		if err := s.FinishJob(ctx, ids[0], "w1", store.StatusSucceeded, "", nil); err != nil {
			t.Fatal(err)
		}
		if j := mustClaim(t, s, "w1", time.Minute); j.Owner != "ka" {
			t.Errorf("after one of ka's jobs ended, claimed %s's job, want ka's", j.Owner)
		}
		if ids[1] != b.ID {
			t.Errorf("second claim %s, want kb's job %s", ids[1], b.ID)
		}
	})
}

// testRevokeStopsWork: revoking a key cancels its queued jobs, asks its
// running jobs to stop, and settles every callback of its jobs.
func testRevokeStopsWork(t *testing.T, s Store) {
	ctx := context.Background()
	_, k, err := s.CreateAPIKey(ctx, "eln-revoked")
	if err != nil {
		t.Fatal(err)
	}
	_, other, err := s.CreateAPIKey(ctx, "eln-kept")
	if err != nil {
		t.Fatal(err)
	}
	done := mustCreate(t, s, newJob(k.ID, 1))
	mustClaim(t, s, "w1", time.Minute)
	if err := s.FinishJob(ctx, done.ID, "w1", store.StatusSucceeded, "", &store.Result{Body: json.RawMessage(`{}`)}); err != nil {
		t.Fatal(err)
	}
	running := mustCreate(t, s, newJob(k.ID, 2))
	mustClaim(t, s, "w1", time.Minute)
	q1 := mustCreate(t, s, newJob(k.ID, 3))
	q2 := mustCreate(t, s, newJob(k.ID, 4))
	kept := mustCreate(t, s, newJob(other.ID, 5))

	n, err := s.RevokeAPIKey(ctx, "eln-revoked")
	if err != nil || n != 2 {
		t.Fatalf("RevokeAPIKey = %d, %v; want 2 queued jobs cancelled", n, err)
	}
	for _, id := range []string{q1.ID, q2.ID} {
		j := mustGet(t, s, k.ID, id)
		if j.Status != store.StatusCancelled || j.Error != store.RevokedMessage || !j.CallbackDone || j.FinishedAt.IsZero() {
			t.Errorf("queued job of the revoked key = %s %q callback done %v; want cancelled, %q, settled", j.Status, j.Error, j.CallbackDone, store.RevokedMessage)
		}
		if h := mustHistory(t, s, k.ID, id); h[len(h)-1].Status != store.StatusCancelled {
			t.Errorf("history of a revoked key's queued job ends with %+v, want cancelled", h[len(h)-1])
		}
	}
	if r := mustGet(t, s, k.ID, running.ID); r.Status != store.StatusRunning || !r.CancelRequested || !r.CallbackDone {
		t.Errorf("running job of the revoked key = %s cancel requested %v callback done %v; want a cancel request and a settled callback", r.Status, r.CancelRequested, r.CallbackDone)
	}
	wantErr(t, "RenewLease of a revoked key's running job", s.RenewLease(ctx, running.ID, "w1", time.Minute), store.ErrCancelRequested)
	if d := mustGet(t, s, k.ID, done.ID); !d.CallbackDone {
		t.Errorf("finished job's pending callback not settled by the revocation")
	}
	if pending, err := s.PendingCallbacks(ctx, 0, 0); err != nil || len(pending) != 0 {
		t.Errorf("PendingCallbacks after revoking = %d jobs, %v; want none", len(pending), err)
	}
	if j := mustGet(t, s, other.ID, kept.ID); j.Status != store.StatusQueued || j.CallbackDone {
		t.Errorf("another key's job = %s callback done %v; want untouched", j.Status, j.CallbackDone)
	}
	if n, err := s.RevokeAPIKey(ctx, k.ID); err != nil || n != 0 {
		t.Errorf("revoking again = %d, %v; want 0, nil", n, err)
	}
}

// testRotateSecret: a new secret replaces the old one; a revoked key's
// secret is not rotated.
func testRotateSecret(t *testing.T, s Store) {
	ctx := context.Background()
	key, k, err := s.CreateAPIKey(ctx, "eln-rotate")
	if err != nil {
		t.Fatal(err)
	}
	r, err := s.RotateAPIKeySecret(ctx, "eln-rotate")
	if err != nil || r.ID != k.ID || len(r.Secret) < 32 || bytes.Equal(r.Secret, k.Secret) {
		t.Fatalf("RotateAPIKeySecret = %+v, %v; want the key with a new 32-byte secret", r, err)
	}
	got, err := s.GetAPIKey(ctx, k.ID)
	if err != nil || !bytes.Equal(got.Secret, r.Secret) {
		t.Errorf("GetAPIKey after rotating = %x, %v; want the new secret", got.Secret, err)
	}
	if l, err := s.LookupAPIKey(ctx, key); err != nil || !bytes.Equal(l.Secret, r.Secret) {
		t.Errorf("the key itself stops working or keeps the old secret after rotating: %v", err)
	}
	_, err = s.RotateAPIKeySecret(ctx, "nosuchkey")
	wantErr(t, "RotateAPIKeySecret unknown", err, store.ErrNotFound)
	if _, err := s.RevokeAPIKey(ctx, k.ID); err != nil {
		t.Fatal(err)
	}
	_, err = s.RotateAPIKeySecret(ctx, k.ID)
	wantErr(t, "RotateAPIKeySecret of a revoked key", err, store.ErrConflict)
}

// testPurgeFinished: finished jobs with settled callbacks go, with their
// results and idempotency keys; queued jobs and unsettled callbacks stay.
func testPurgeFinished(t *testing.T, s Store) {
	ctx := context.Background()
	finish := func(n int, callback bool) store.Job {
		t.Helper()
		in := newJob("k1", n)
		in.IdempotencyKey = fmt.Sprintf("nb-%d", n)
		if !callback {
			in.CallbackURL = ""
		}
		j := mustCreate(t, s, in)
		if c := mustClaim(t, s, "w1", time.Minute); c.ID != j.ID {
			t.Fatalf("claimed %s, want %s", c.ID, j.ID)
		}
		if err := s.FinishJob(ctx, j.ID, "w1", store.StatusSucceeded, "", &store.Result{Body: json.RawMessage(`{}`)}); err != nil {
			t.Fatal(err)
		}
		return j
	}
	plain := finish(1, false)
	settled := finish(2, true)
	if err := s.MarkCallbackDone(ctx, settled.ID); err != nil {
		t.Fatal(err)
	}
	unsettled := finish(3, true)
	queued := mustCreate(t, s, newJob("k1", 4))
	time.Sleep(2 * time.Millisecond)

	if n, err := s.PurgeFinished(ctx, time.Hour, 0); err != nil || n != 0 {
		t.Errorf("PurgeFinished(older than 1h) = %d, %v; want 0", n, err)
	}
	if n, err := s.PurgeFinished(ctx, 0, 1); err != nil || n != 1 {
		t.Errorf("PurgeFinished(limit 1) = %d, %v; want 1", n, err)
	}
	if n, err := s.PurgeFinished(ctx, 0, 0); err != nil || n != 1 {
		t.Errorf("PurgeFinished = %d, %v; want the one settled job left", n, err)
	}
	for _, id := range []string{plain.ID, settled.ID} {
		_, err := s.GetJob(ctx, "k1", id)
		wantErr(t, "GetJob of a purged job", err, store.ErrNotFound)
		_, err = s.GetResult(ctx, "k1", id)
		wantErr(t, "GetResult of a purged job", err, store.ErrNotFound)
		_, err = s.Deliveries(ctx, id)
		wantErr(t, "Deliveries of a purged job", err, store.ErrNotFound)
	}
	mustGet(t, s, "k1", unsettled.ID)
	mustGet(t, s, "k1", queued.ID)
	again := newJob("k1", 1)
	again.IdempotencyKey = "nb-1"
	if j, created, err := s.CreateJob(ctx, again); err != nil || !created || j.ID == plain.ID {
		t.Errorf("CreateJob with a purged job's idempotency key = %s, created %v, %v; want a new job", j.ID, created, err)
	}
	jobs, _, err := s.ListJobs(ctx, "k1", 0, "")
	if err != nil || len(jobs) != 3 {
		t.Errorf("ListJobs after purging = %d jobs, %v; want 3", len(jobs), err)
	}
}

// testStorableText: both stores refuse (or, for their callers' messages,
// clean) the text PostgreSQL cannot keep, the same way.
func testStorableText(t *testing.T, s Store) {
	ctx := context.Background()
	bad := []struct {
		name string
		edit func(j *store.Job)
	}{
		{"NUL in reference", func(j *store.Job) { j.Reference = "NB\x00-1" }},
		{"invalid UTF-8 in reference", func(j *store.Job) { j.Reference = "NB\xff-1" }},
		{"NUL in callback URL", func(j *store.Job) { j.CallbackURL = "https://eln.example.org/\x00" }},
		{"NUL in idempotency key", func(j *store.Job) { j.IdempotencyKey = "k\x00" }},
		{"\\u0000 in the request", func(j *store.Job) { j.Request = json.RawMessage(`{"reference":"a\u0000b"}`) }},
		{"unpaired high surrogate", func(j *store.Job) { j.Request = json.RawMessage(`{"reference":"a\ud800b"}`) }},
		{"unpaired low surrogate", func(j *store.Job) { j.Request = json.RawMessage(`{"reference":"\udc00"}`) }},
		{"invalid UTF-8 in the request", func(j *store.Job) { j.Request = json.RawMessage("{\"reference\":\"\xc3\x28\"}") }},
	}
	for _, tc := range bad {
		j := newJob("k1", 1)
		tc.edit(&j)
		_, _, err := s.CreateJob(ctx, j)
		wantErr(t, "CreateJob with "+tc.name, err, store.ErrInvalid)
	}
	pair := newJob("k1", 2)
	pair.Request = json.RawMessage(`{"reference":"\ud83e\uddea \u00e9"}`) // a surrogate pair is fine
	j := mustCreate(t, s, pair)
	for _, id := range []string{"\x00", j.ID + "\x00", "a\xffb", strings.ToUpper(j.ID)} {
		_, err := s.GetJob(ctx, "k1", id)
		wantErr(t, fmt.Sprintf("GetJob(%q)", id), err, store.ErrNotFound)
		_, err = s.CancelJob(ctx, "k1", id)
		wantErr(t, fmt.Sprintf("CancelJob(%q)", id), err, store.ErrNotFound)
		_, err = s.GetResult(ctx, "k1", id)
		wantErr(t, fmt.Sprintf("GetResult(%q)", id), err, store.ErrNotFound)
	}
	// A cursor that decodes to an ID with a NUL character.
	_, _, err := s.ListJobs(ctx, "k1", 10, "MTIzNC4A")
	wantErr(t, "ListJobs with a cursor holding a NUL", err, store.ErrInvalid)
	_, _, err = s.CreateAPIKey(ctx, "eln\x00lab")
	wantErr(t, "CreateAPIKey with a NUL in the name", err, store.ErrInvalid)
	_, err = s.RevokeAPIKey(ctx, "eln\x00lab")
	wantErr(t, "RevokeAPIKey with a NUL in the name", err, store.ErrNotFound)

	mustClaim(t, s, "w1", time.Minute)
	if err := s.FinishJob(ctx, j.ID, "w1", store.StatusFailed, "bad token \x00\xff", nil); err != nil {
		t.Fatalf("FinishJob with a NUL in the message: %v", err)
	}
	if got := mustGet(t, s, "k1", j.ID); got.Error != "bad token \uFFFD\uFFFD" {
		t.Errorf("stored error = %q, want NUL and invalid UTF-8 replaced by U+FFFD", got.Error)
	}
	if err := s.RecordDelivery(ctx, store.Delivery{JobID: j.ID, Attempt: 1, URL: j.CallbackURL, Error: "refused\x00"}); err != nil {
		t.Fatalf("RecordDelivery with a NUL in the error: %v", err)
	}
	if ds, err := s.Deliveries(ctx, j.ID); err != nil || len(ds) != 1 || ds[0].Error != "refused\uFFFD" {
		t.Errorf("Deliveries = %+v, %v; want the error with U+FFFD", ds, err)
	}
	if errors.Is(err, store.ErrUnavailable) || store.IsUnavailable(err) {
		t.Errorf("a refused input reads as an unavailable store")
	}
}

// testLargeResult: a result of many kilobytes (kept compressed by the
// memory store) comes back as stored.
func testLargeResult(t *testing.T, s Store) {
	ctx := context.Background()
	j := mustCreate(t, s, newJob("k1", 1))
	mustClaim(t, s, "w1", time.Minute)
	var b strings.Builder
	b.WriteString(`{"candidates":[`)
	for i := range 400 {
		if i > 0 {
			b.WriteString(",")
		}
		fmt.Fprintf(&b, `{"rank":%d,"smiles":"CC(=O)OCC","score":%d.5,"note":"é ✓ %d"}`, i+1, -i, i)
	}
	b.WriteString(`]}`)
	body := json.RawMessage(b.String())
	if err := s.FinishJob(ctx, j.ID, "w1", store.StatusSucceeded, "", &store.Result{IsomersTotal: 56, Body: body}); err != nil {
		t.Fatal(err)
	}
	for range 2 { // reading does not consume it
		r, err := s.GetResult(ctx, "k1", j.ID)
		if err != nil || r.IsomersTotal != 56 || !sameJSON(r.Body, body) {
			t.Fatalf("GetResult of a %d-byte result = %d bytes, isomers %d, %v; want it back unchanged", len(body), len(r.Body), r.IsomersTotal, err)
		}
	}
}
