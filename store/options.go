package store

import "strconv"

// DefaultMaxAttempts is how many claims a job gets before ClaimJob stops
// handing it out again after an expired lease (see WithMaxAttempts).
const DefaultMaxAttempts = 5

// Option configures a store; pass options to NewMemory, Open or OpenSchema.
type Option func(*options)

type options struct {
	maxAttempts int
	maxRunning  int // per owner; 0 = no limit
	maxFinished int // Memory only; 0 = no limit
}

// DefaultMaxFinished is how many finished jobs the memory store keeps by
// default (see WithMaxFinished).
const DefaultMaxFinished = 1000

func buildOptions(opts []Option) options {
	o := options{maxAttempts: DefaultMaxAttempts, maxFinished: DefaultMaxFinished}
	for _, opt := range opts {
		opt(&o)
	}
	return o
}

// WithMaxAttempts limits how often a job is taken up again after its worker
// lost the lease: when a job that has been claimed n times is found with an
// expired lease, ClaimJob fails it (StatusFailed, with an error saying so)
// instead of handing it out once more, so a job that kills its worker every
// time cannot cycle forever. Releases by ReleaseJob count as claims too. n <= 0
// means no limit. The default is DefaultMaxAttempts.
func WithMaxAttempts(n int) Option {
	return func(o *options) { o.maxAttempts = n }
}

// abandonedMessage is the error of a job failed by the attempt limit.
func abandonedMessage(attempts int) string {
	return "abandoned after " + strconv.Itoa(attempts) + " attempts: the worker's lease expired"
}

// WithMaxRunningPerOwner limits how many jobs of one owner (API key, or the
// anonymous owner) run at once across every process sharing the store:
// ClaimJob passes over the queued jobs of an owner that has n running. n <=
// 0 means no limit (the default). Whatever the limit, ClaimJob picks
// fairly between owners (see ClaimJob).
func WithMaxRunningPerOwner(n int) Option {
	return func(o *options) { o.maxRunning = max(n, 0) }
}

// WithMaxFinished bounds the finished jobs the memory store keeps: when a
// job finishes beyond n, the jobs that finished longest ago are forgotten
// (their status, result, history and idempotency key). A job whose callback
// is still being delivered is passed over until it is settled, so the
// bound holds except while more than n callbacks are unsettled. n <= 0
// means no bound. The default is DefaultMaxFinished. PostgreSQL ignores
// it; bound it by age with PurgeFinished.
func WithMaxFinished(n int) Option {
	return func(o *options) { o.maxFinished = max(n, 0) }
}
