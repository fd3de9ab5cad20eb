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
// When a job with a callback URL ends, its signed summary is POSTed there,
// retried with bounded exponential back-off; every attempt is recorded in
// the store. The deliveries are durable: each server periodically sweeps
// the store for callbacks left unsettled longer than its retry window (their
// process stopped or died) and resumes them from the recorded attempts,
// claiming each under a short lease so that one process sends it.
//
// Errors are RFC 9457 problem details (application/problem+json) with an
// "errors" list naming each bad field. Requests carry an API key as
// "Authorization: Bearer KEY"; each key sees only its own jobs. Anonymous
// access is allowed only when Config.AllowAnonymous is set.
//
// A ranking is a hypothesis to be confirmed against an authentic sample or
// further spectra; it is not for forensic, clinical or safety decisions on
// its own. The OpenAPI description served at /v1/openapi.json says so too.
package server
