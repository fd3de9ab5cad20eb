package store

import "strconv"

// DefaultMaxAttempts is how many claims a job gets before ClaimJob stops
// handing it out again after an expired lease (see WithMaxAttempts).
const DefaultMaxAttempts = 5

// Option configures a store; pass options to NewMemory, Open or OpenSchema.
type Option func(*options)

type options struct {
	maxAttempts int
}

func buildOptions(opts []Option) options {
	o := options{maxAttempts: DefaultMaxAttempts}
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
