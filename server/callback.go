package server

import (
	"bytes"
	"context"
	"crypto/hmac"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"log/slog"
	"math/rand/v2"
	"net/http"
	"strconv"
	"time"

	"shiftrank/store"
)

// Callback headers. The signature covers the timestamp and the exact body,
// so a receiver can refuse a replayed callback by its age.
const (
	// SignatureHeader carries "sha256=" followed by the lower-case hex
	// HMAC-SHA256 of TimestampHeader's value, a full stop, and the exact
	// request body, keyed with the API key's callback secret (the secret's
	// bytes: decode the hex that apikey create prints).
	SignatureHeader = "X-Shiftrank-Signature"
	// TimestampHeader carries the time of sending as Unix seconds.
	TimestampHeader = "X-Shiftrank-Timestamp"
)

// DefaultSignatureMaxAge is how old a callback VerifySignature accepts by
// default: it allows for clock skew and a slow network, and is short enough
// that a captured callback cannot be replayed later.
const DefaultSignatureMaxAge = 5 * time.Minute

// CallbackPayload is the body POSTed to a job's callback_url when the job
// ends. Attempt counts deliveries from 1.
type CallbackPayload struct {
	Event   string    `json:"event"` // "job.finished"
	Attempt int       `json:"attempt"`
	SentAt  time.Time `json:"sent_at"`
	Job     JobView   `json:"job"`
}

// Sign returns the SignatureHeader value for body sent with the
// TimestampHeader value timestamp, under secret.
func Sign(secret []byte, timestamp string, body []byte) string {
	m := hmac.New(sha256.New, secret)
	m.Write([]byte(timestamp))
	m.Write([]byte{'.'})
	m.Write(body)
	return "sha256=" + hex.EncodeToString(m.Sum(nil))
}

// Errors of VerifySignature.
var (
	ErrBadSignature = errors.New("callback signature does not match")
	ErrStale        = errors.New("callback timestamp missing, malformed or too far from now")
)

// VerifySignature checks a received callback: signature must be Sign of
// body and timestamp under secret (compared in constant time), and
// timestamp within maxAge of now either way (0 means
// DefaultSignatureMaxAge). It returns nil, ErrStale or ErrBadSignature. A
// receiver that also remembers the signatures it accepted within maxAge
// refuses every replay.
func VerifySignature(secret, body []byte, timestamp, signature string, now time.Time, maxAge time.Duration) error {
	if maxAge <= 0 {
		maxAge = DefaultSignatureMaxAge
	}
	sec, err := strconv.ParseInt(timestamp, 10, 64)
	if err != nil {
		return ErrStale
	}
	if d := now.Sub(time.Unix(sec, 0)); d > maxAge || d < -maxAge {
		return ErrStale
	}
	if !hmac.Equal([]byte(Sign(secret, timestamp, body)), []byte(signature)) {
		return ErrBadSignature
	}
	return nil
}

// errKeyRevoked: the job's API key was revoked; its callbacks are not sent.
var errKeyRevoked = errors.New("the job's API key is revoked")

// callbackSecret finds the secret that signs job's callbacks: errKeyRevoked
// for a revoked key, store.ErrNotFound for one that no longer exists.
func (s *Server) callbackSecret(ctx context.Context, owner string) ([]byte, error) {
	if owner == "" {
		return s.cfg.AnonymousSecret, nil
	}
	k, err := s.st.GetAPIKey(ctx, owner)
	if err != nil {
		return nil, fmt.Errorf("callback secret: %w", err)
	}
	if k.Revoked() {
		return nil, errKeyRevoked
	}
	return k.Secret, nil
}

// Callback delivery limits.
const (
	// maxCallbackDelay caps one back-off delay between deliveries.
	maxCallbackDelay = 10 * time.Minute
	// maxResumed bounds the callbacks one process resumes at once.
	maxResumed = 8
	// sweepBatch is how many unsettled callbacks one sweep reads.
	sweepBatch = 50
)

// backoff returns the delay after delivery attempt n (n >= 1):
// CallbackBackoff doubled n-1 times, at most maxCallbackDelay.
func (s *Server) backoff(n int) time.Duration {
	d := s.cfg.CallbackBackoff
	for i := 1; i < n && d < maxCallbackDelay; i++ {
		d *= 2
	}
	return min(d, maxCallbackDelay)
}

// RetryWindow is the longest the deliveries of one callback take in the
// process that starts them: every attempt running into CallbackTimeout,
// plus every back-off delay. A callback still unsettled this long after
// its job finished has lost the process delivering it; sweeps (every
// CallbackSweep) resume it.
func (s *Server) RetryWindow() time.Duration {
	w := time.Duration(s.cfg.CallbackAttempts) * s.cfg.CallbackTimeout
	for n := 1; n < s.cfg.CallbackAttempts; n++ {
		w += s.backoff(n)
	}
	return w
}

// beginDelivery marks job id's callback as being sent by this process; it
// reports false if it already is.
func (s *Server) beginDelivery(id string) bool {
	s.mu.Lock()
	defer s.mu.Unlock()
	if s.delivering[id] {
		return false
	}
	s.delivering[id] = true
	return true
}

func (s *Server) endDelivery(id string) {
	s.mu.Lock()
	defer s.mu.Unlock()
	delete(s.delivering, id)
}

// callbackSettled reports whether a recorded delivery ended the callback:
// a 2xx answer, or a 4xx other than 408 and 429 (the receiver refused the
// content; sending it again would not help).
func callbackSettled(code int, transportErr bool) bool {
	if transportErr {
		return false
	}
	return (code >= 200 && code < 300) ||
		(code >= 400 && code < 500 && code != http.StatusRequestTimeout && code != http.StatusTooManyRequests)
}

// deliver POSTs the finished job's summary to its callback URL until the
// callback is settled: a 2xx answer, a final 4xx (see callbackSettled), or
// CallbackAttempts deliveries, between which it waits with exponential
// back-off (see backoff). Then it calls MarkCallbackDone. Every attempt is
// recorded in the store, and deliver continues from the recorded ones, so
// a callback that a stopped process left half done is resumed where it
// stopped (a sweep calls deliver for it). Before each attempt it claims the
// callback in the store for the wait and the attempt, so that of several
// processes resuming one callback only one sends it. Delivery is at least
// once: a process that dies between sending and recording sends that
// attempt again when resumed.
func (s *Server) deliver(ctx context.Context, job store.Job) {
	if !s.beginDelivery(job.ID) {
		return
	}
	defer s.endDelivery(job.ID)
	log := s.log.With("job", job.ID, "callback", job.CallbackURL)

	past, err := s.st.Deliveries(ctx, job.ID)
	if err != nil {
		log.Error("callback: read past deliveries", "err", err)
		return
	}
	attempt, last := 1, time.Time{}
	for _, d := range past {
		if callbackSettled(d.StatusCode, d.Error != "") {
			s.settleCallback(ctx, log, job.ID, "callback already settled", "attempt", d.Attempt, "status", d.StatusCode)
			return
		}
		attempt, last = max(attempt, d.Attempt+1), d.At
	}
	if attempt > s.cfg.CallbackAttempts {
		s.settleCallback(ctx, log, job.ID, "callback given up", "attempts", attempt-1)
		return
	}

	view := s.jobView(job)
	view.Request = nil

	for ; attempt <= s.cfg.CallbackAttempts; attempt++ {
		// The secret is read before every attempt: a key revoked (or a
		// secret rotated) between attempts takes effect at once.
		secret, err := s.callbackSecret(ctx, job.Owner)
		switch {
		case errors.Is(err, errKeyRevoked):
			s.settleCallback(ctx, log, job.ID, "callback not sent: the job's API key is revoked")
			return
		case errors.Is(err, store.ErrNotFound):
			s.settleCallback(ctx, log, job.ID, "callback not sent: the job's API key no longer exists")
			return
		case err != nil:
			log.Error("callback: signing secret", "err", err)
			return
		case len(secret) == 0:
			// Another process may have the anonymous secret; leave it to that one.
			log.Warn("callback not sent: this process has no secret for anonymous callbacks (SHIFTRANK_CALLBACK_SECRET)")
			return
		}
		var wait time.Duration
		if attempt > 1 && !last.IsZero() {
			wait = max(0, time.Until(last.Add(s.backoff(attempt-1))))
		}
		// The claim covers the wait, the attempt, and as long again for the
		// store writes around it.
		ok, err := s.st.ClaimCallback(ctx, job.ID, s.cfg.WorkerID, wait+2*s.cfg.CallbackTimeout)
		if err != nil {
			if ctx.Err() == nil {
				log.Error("callback: claim", "err", err)
			}
			return // a later sweep resumes it
		}
		if !ok {
			log.Info("callback left to another process (or already settled)", "attempt", attempt)
			return
		}
		if wait > 0 {
			// A delivery waiting out its back-off does not hold up Shutdown:
			// its state is in the store, and a sweep resumes it.
			t := time.NewTimer(wait)
			select {
			case <-ctx.Done():
				t.Stop()
				s.pauseCallback(ctx, log, job.ID, attempt)
				return
			case <-s.stopping:
				t.Stop()
				s.pauseCallback(ctx, log, job.ID, attempt)
				return
			case <-t.C:
			}
		}
		actx, cancel := context.WithTimeout(ctx, s.cfg.CallbackTimeout)
		code, err := s.post(actx, job.CallbackURL, secret, CallbackPayload{
			Event: "job.finished", Attempt: attempt, SentAt: s.cfg.Now().UTC(), Job: view,
		})
		cancel()
		if ctx.Err() != nil {
			s.pauseCallback(ctx, log, job.ID, attempt)
			return
		}
		last = time.Now().UTC()
		d := store.Delivery{JobID: job.ID, Attempt: attempt, URL: job.CallbackURL, StatusCode: code, At: last}
		if err != nil {
			d.Error = err.Error()
		}
		rctx, rcancel := context.WithTimeout(context.WithoutCancel(ctx), 5*time.Second)
		if rerr := s.st.RecordDelivery(rctx, d); rerr != nil {
			log.Error("record callback delivery", "err", rerr)
		}
		rcancel()
		var te *TargetError
		switch {
		case err == nil && code >= 200 && code < 300:
			s.settleCallback(ctx, log, job.ID, "callback delivered", "attempt", attempt, "status", code)
			return
		case errors.As(err, &te):
			// The host now resolves to an address the rules refuse: a
			// later attempt would not be allowed either.
			s.settleCallback(ctx, log, job.ID, "callback refused by the target rules; not retried", "attempt", attempt, "reason", te.Error())
			return
		case callbackSettled(code, err != nil):
			s.settleCallback(ctx, log, job.ID, "callback refused; not retried", "attempt", attempt, "status", code)
			return
		}
		log.Warn("callback failed", "attempt", attempt, "status", code, "err", err)
	}
	s.settleCallback(ctx, log, job.ID, "callback given up", "attempts", s.cfg.CallbackAttempts)
}

// pauseCallback gives up this process's claim on job id's callback at
// shutdown, so that another process's sweep may resume it without waiting
// for the claim to run out.
func (s *Server) pauseCallback(ctx context.Context, log *slog.Logger, id string, next int) {
	rctx, cancel := context.WithTimeout(context.WithoutCancel(ctx), 2*time.Second)
	defer cancel()
	if _, err := s.st.ClaimCallback(rctx, id, s.cfg.WorkerID, 0); err != nil {
		log.Warn("give up callback claim", "err", err)
	}
	log.Warn("callback paused at shutdown; another process will resume it", "next_attempt", next)
}

// settleCallback marks job id's callback done and logs msg with args.
func (s *Server) settleCallback(ctx context.Context, log *slog.Logger, id, msg string, args ...any) {
	mctx, cancel := context.WithTimeout(context.WithoutCancel(ctx), 5*time.Second)
	defer cancel()
	if err := s.st.MarkCallbackDone(mctx, id); err != nil {
		log.Error("mark callback done", "err", err)
	}
	log.Info(msg, args...)
}

// sweepLoop resumes, every CallbackSweep, the callbacks that other (stopped
// or dead) processes left unsettled, until Shutdown.
func (s *Server) sweepLoop(ctx context.Context) {
	if s.cfg.CallbackSweep < 0 {
		return
	}
	for {
		s.sweepCallbacks(ctx)
		// Jitter keeps the sweeps of many processes apart.
		t := time.NewTimer(s.cfg.CallbackSweep*3/4 + rand.N(s.cfg.CallbackSweep/2+1))
		select {
		case <-s.stopping:
			t.Stop()
			return
		case <-t.C:
		}
	}
}

// sweepCallbacks starts the delivery of callbacks unsettled RetryWindow
// after their job finished, at most maxResumed at a time.
func (s *Server) sweepCallbacks(ctx context.Context) {
	jobs, err := s.st.PendingCallbacks(ctx, s.RetryWindow(), sweepBatch)
	if err != nil {
		if ctx.Err() == nil {
			s.log.Error("callback sweep", "err", err)
		}
		return
	}
	for _, j := range jobs {
		if j.Owner == "" && len(s.cfg.AnonymousSecret) == 0 {
			// An anonymous callback this process cannot sign: the process
			// that accepted the job had the secret, and so may another.
			continue
		}
		select {
		case <-s.stopping:
			return
		case s.resumeSlots <- struct{}{}:
		default:
			return // all slots busy: the next sweep continues
		}
		s.log.Info("resuming an unsettled callback", "job", j.ID, "finished_at", j.FinishedAt)
		// The sweep runs in the worker group, so this Add precedes
		// Shutdown's wait on s.bg (see finish).
		s.bg.Add(1)
		go func() {
			defer s.bg.Done()
			defer func() { <-s.resumeSlots }()
			s.deliver(s.bgCtx, j)
		}()
	}
}

func (s *Server) post(ctx context.Context, url string, secret []byte, p CallbackPayload) (int, error) {
	body, err := json.Marshal(p)
	if err != nil {
		return 0, fmt.Errorf("encode payload: %w", err)
	}
	req, err := http.NewRequestWithContext(ctx, http.MethodPost, url, bytes.NewReader(body))
	if err != nil {
		return 0, fmt.Errorf("build request: %w", err)
	}
	ts := strconv.FormatInt(s.cfg.Now().Unix(), 10)
	req.Header.Set("Content-Type", "application/json")
	req.Header.Set("User-Agent", "shiftrank-callback/1")
	req.Header.Set(TimestampHeader, ts)
	req.Header.Set(SignatureHeader, Sign(secret, ts, body))
	req.Header.Set("X-Shiftrank-Job", p.Job.ID)
	req.Header.Set("X-Shiftrank-Attempt", fmt.Sprint(p.Attempt))
	resp, err := s.cfg.CallbackClient.Do(req)
	if err != nil {
		return 0, err
	}
	_, _ = io.Copy(io.Discard, io.LimitReader(resp.Body, 64<<10))
	resp.Body.Close()
	return resp.StatusCode, nil
}
