package server

import (
	"context"
	"time"

	"shiftrank/ranker"
	"shiftrank/store"
)

// JobStore is what the server needs of a job store. store.Memory and
// store.Postgres implement it; see package store for the semantics
// (owner isolation, idempotency, leases).
type JobStore interface {
	SubmitJob(ctx context.Context, j store.Job, maxQueued int) (store.Job, bool, error)
	GetJob(ctx context.Context, owner, id string) (store.Job, error)
	ListJobs(ctx context.Context, owner string, limit int, cursor string) ([]store.Job, string, error)
	CancelJob(ctx context.Context, owner, id string) (store.Job, error)
	GetResult(ctx context.Context, owner, id string) (store.Result, error)

	ClaimJob(ctx context.Context, workerID string, lease time.Duration) (store.Job, error)
	RenewLease(ctx context.Context, id, workerID string, lease time.Duration) error
	UpdateProgress(ctx context.Context, id, workerID string, p store.Progress) error
	FinishJob(ctx context.Context, id, workerID string, status store.Status, errMsg string, result *store.Result) error
	ReleaseJob(ctx context.Context, id, workerID string) error
	CancelRequested(ctx context.Context, id string) (bool, error)

	LookupAPIKey(ctx context.Context, key string) (store.APIKey, error)
	GetAPIKey(ctx context.Context, id string) (store.APIKey, error)
	RecordDelivery(ctx context.Context, d store.Delivery) error
	Deliveries(ctx context.Context, jobID string) ([]store.Delivery, error)
	ClaimCallback(ctx context.Context, id, workerID string, lease time.Duration) (bool, error)
	MarkCallbackDone(ctx context.Context, id string) error
	PendingCallbacks(ctx context.Context, olderThan time.Duration, limit int) ([]store.Job, error)
	PurgeFinished(ctx context.Context, olderThan time.Duration, limit int) (int, error)

	Ping(ctx context.Context) error
}

// Ranker ranks the isomers of a formula against a peak list. progress may
// be called often and from any goroutine; Rank must return soon after ctx
// is cancelled. On cancellation it may return the ranking so far together
// with ctx's error: the worker keeps that partial result with a job
// cancelled on request (any other error discards the result).
// *ranker.Ranker implements it.
type Ranker interface {
	Rank(ctx context.Context, req ranker.Request, progress func(ranker.Progress)) (*ranker.Result, error)
}
