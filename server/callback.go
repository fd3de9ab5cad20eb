package server

import (
	"bytes"
	"context"
	"crypto/hmac"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"fmt"
	"io"
	"net/http"
	"time"

	"shiftrank/store"
)

// SignatureHeader carries the callback signature: "sha256=" followed by
// the lower-case hex HMAC-SHA256 of the exact request body, keyed with the
// API key's callback secret.
const SignatureHeader = "X-Shiftrank-Signature"

// CallbackPayload is the body POSTed to a job's callback_url when the job
// ends. Attempt counts deliveries from 1.
type CallbackPayload struct {
	Event   string    `json:"event"` // "job.finished"
	Attempt int       `json:"attempt"`
	SentAt  time.Time `json:"sent_at"`
	Job     JobView   `json:"job"`
}

// Sign returns the SignatureHeader value for body under secret.
func Sign(secret, body []byte) string {
	m := hmac.New(sha256.New, secret)
	m.Write(body)
	return "sha256=" + hex.EncodeToString(m.Sum(nil))
}

// VerifySignature reports whether header is the signature of body under
// secret, comparing in constant time.
func VerifySignature(secret, body []byte, header string) bool {
	return hmac.Equal([]byte(Sign(secret, body)), []byte(header))
}

// callbackSecret finds the secret that signs job's callbacks.
func (s *Server) callbackSecret(ctx context.Context, owner string) ([]byte, error) {
	if owner == "" {
		return s.cfg.AnonymousSecret, nil
	}
	k, err := s.st.GetAPIKey(ctx, owner)
	if err != nil {
		return nil, fmt.Errorf("callback secret: %w", err)
	}
	return k.Secret, nil
}

// deliver POSTs the job summary to its callback URL, retrying with
// exponential back-off (CallbackBackoff doubled each time) up to
// CallbackAttempts deliveries. A 2xx answer ends it; so does a 4xx other
// than 408 and 429, since the receiver refused the content. Every attempt
// is recorded in the store.
func (s *Server) deliver(ctx context.Context, job store.Job) {
	log := s.log.With("job", job.ID, "callback", job.CallbackURL)
	secret, err := s.callbackSecret(ctx, job.Owner)
	if err != nil || len(secret) == 0 {
		log.Error("callback not sent: no signing secret", "err", err)
		return
	}
	view := s.jobView(job)
	view.Request = nil
	delay := s.cfg.CallbackBackoff
	for attempt := 1; attempt <= s.cfg.CallbackAttempts; attempt++ {
		code, err := s.post(ctx, job.CallbackURL, secret, CallbackPayload{
			Event: "job.finished", Attempt: attempt, SentAt: time.Now().UTC(), Job: view,
		})
		d := store.Delivery{JobID: job.ID, Attempt: attempt, URL: job.CallbackURL, StatusCode: code, At: time.Now().UTC()}
		if err != nil {
			d.Error = err.Error()
		}
		rctx, cancel := context.WithTimeout(context.WithoutCancel(ctx), 5*time.Second)
		if rerr := s.st.RecordDelivery(rctx, d); rerr != nil {
			log.Error("record callback delivery", "err", rerr)
		}
		cancel()
		if err == nil && code >= 200 && code < 300 {
			log.Info("callback delivered", "attempt", attempt, "status", code)
			return
		}
		if err == nil && code >= 400 && code < 500 && code != http.StatusRequestTimeout && code != http.StatusTooManyRequests {
			log.Warn("callback refused; not retried", "attempt", attempt, "status", code)
			return
		}
		log.Warn("callback failed", "attempt", attempt, "status", code, "err", err)
		if attempt == s.cfg.CallbackAttempts {
			break
		}
		t := time.NewTimer(delay)
		select {
		case <-ctx.Done():
			t.Stop()
			log.Warn("callback abandoned at shutdown", "attempts", attempt)
			return
		case <-t.C:
		}
		delay *= 2
	}
	log.Error("callback given up", "attempts", s.cfg.CallbackAttempts)
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
	req.Header.Set("Content-Type", "application/json")
	req.Header.Set("User-Agent", "shiftrank-callback/1")
	req.Header.Set(SignatureHeader, Sign(secret, body))
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
