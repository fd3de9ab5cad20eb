// Package server provides the shiftrank HTTP API and the worker pool that
// runs ranking jobs.
//
// The API is JSON under /v1: clients submit a job (a molecular formula and
// an observed 1H peak list), poll it, and read the ranked candidates. Jobs
// live in a JobStore (the in-memory default or PostgreSQL); workers claim
// them with a lease, run the Ranker with a context that a cancel request or
// a lost lease cancels, write throttled progress, and store the result.
// Several processes may share one PostgreSQL store: the database is the only
// shared part, and a job whose worker dies is taken up again once its lease
// expires.
//
// Jobs are shared fairly between API keys: each key's queue is bounded
// (429 beyond it), workers pick the key with the fewest running jobs and the
// longest wait, and each key has a share of the synchronous requests.
// Requests are checked at the edge, strictly (case-sensitive members, no
// repeats, no control characters) and as the ranker will check them, so
// nothing is stored that can never run. Finished jobs are deleted after
// Config.Retention.
//
// When a job with a callback URL ends, its signed summary is POSTed there
// (only to public addresses on ports 80 and 443 unless allowed, checked at
// submission and at connect time; see CallbackAllow),
// retried with bounded exponential back-off; every attempt is recorded in
// the store. The deliveries are durable: each server periodically sweeps
// the store for callbacks left unsettled longer than its retry window (their
// process stopped or died) and resumes them from the recorded attempts,
// claiming each under a short lease so that one process sends it.
//
// Errors are RFC 9457 problem details (application/problem+json) with an
// "errors" list naming each bad field. Requests carry an API key as
// "Authorization: Bearer KEY"; each key sees only its own jobs. Anonymous
// access is allowed only when Config.AllowAnonymous is set, and then only
// from the listen address's own origin (Config.AllowedHosts).
//
// A ranking is a hypothesis to be confirmed against an authentic sample or
// further spectra; it is not for forensic, clinical or safety decisions on
// its own. The OpenAPI description served at /v1/openapi.json says so too.
package server
