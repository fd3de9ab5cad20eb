package server

import (
	"context"
	"errors"
	"fmt"
	"log/slog"
	"net/http"
	"runtime/debug"
	"strings"
	"time"

	"shiftrank/store"
)

// recoverer turns a panic in a handler into a logged internal error.
func (s *Server) recoverer(next http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		defer func() {
			if v := recover(); v != nil {
				if v == http.ErrAbortHandler {
					panic(v)
				}
				s.log.Error("panic in handler", "method", r.Method, "path", r.URL.Path,
					"panic", fmt.Sprint(v), "stack", string(debug.Stack()))
				s.writeError(w, r, internal(fmt.Errorf("panic: %v", v)))
			}
		}()
		next.ServeHTTP(w, r)
	})
}

type statusWriter struct {
	http.ResponseWriter
	status int
	bytes  int64
}

func (sw *statusWriter) WriteHeader(code int) {
	if sw.status == 0 {
		sw.status = code
	}
	sw.ResponseWriter.WriteHeader(code)
}

func (sw *statusWriter) Write(b []byte) (int, error) {
	if sw.status == 0 {
		sw.status = http.StatusOK
	}
	n, err := sw.ResponseWriter.Write(b)
	sw.bytes += int64(n)
	return n, err
}

func (sw *statusWriter) Unwrap() http.ResponseWriter { return sw.ResponseWriter }

// logRequests logs one line per request.
func (s *Server) logRequests(next http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		start := time.Now()
		sw := &statusWriter{ResponseWriter: w}
		next.ServeHTTP(sw, r)
		if sw.status == 0 {
			sw.status = http.StatusOK
		}
		level := slog.LevelInfo
		if r.URL.Path == "/healthz" || r.URL.Path == "/readyz" {
			level = slog.LevelDebug
		}
		s.log.Log(r.Context(), level, "request", "method", r.Method, "path", r.URL.Path,
			"status", sw.status, "bytes", sw.bytes, "duration", time.Since(start).Round(time.Microsecond),
			"remote", r.RemoteAddr)
	})
}

type ctxKey int

const ownerKey ctxKey = 0

// caller is who makes a request: an API key, or the anonymous owner.
type caller struct {
	owner  string // store.APIKey.ID, "" for anonymous
	secret []byte // HMAC secret for this caller's callbacks; nil if none
}

func callerFrom(ctx context.Context) caller {
	c, _ := ctx.Value(ownerKey).(caller)
	return c
}

// authenticate resolves the Bearer key. Without a key the request proceeds
// as anonymous only when the configuration allows it.
func (s *Server) authenticate(next http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		h := r.Header.Get("Authorization")
		if h == "" {
			if !s.cfg.AllowAnonymous {
				s.writeError(w, r, errorf(CodeUnauthorized, "this server requires an API key: send Authorization: Bearer KEY"))
				return
			}
			if err := s.checkLocalRequest(r); err != nil {
				s.writeError(w, r, err)
				return
			}
			c := caller{owner: "", secret: s.cfg.AnonymousSecret}
			next.ServeHTTP(w, r.WithContext(context.WithValue(r.Context(), ownerKey, c)))
			return
		}
		scheme, key, ok := strings.Cut(h, " ")
		key = strings.TrimSpace(key)
		if !ok || !strings.EqualFold(scheme, "Bearer") || key == "" {
			s.writeError(w, r, errorf(CodeUnauthorized, "the Authorization header must be \"Bearer KEY\""))
			return
		}
		k, err := s.st.LookupAPIKey(r.Context(), key)
		if err != nil {
			if errors.Is(err, store.ErrUnauthorized) || errors.Is(err, store.ErrNotFound) {
				s.writeError(w, r, errorf(CodeUnauthorized, "unknown or revoked API key"))
				return
			}
			s.writeError(w, r, internal(fmt.Errorf("look up api key: %w", err)))
			return
		}
		c := caller{owner: k.ID, secret: k.Secret}
		next.ServeHTTP(w, r.WithContext(context.WithValue(r.Context(), ownerKey, c)))
	})
}

// syncRetryAfter is the Retry-After of a refused synchronous request: such
// requests last about a second.
const syncRetryAfter = time.Second

// limitSync admits a synchronous computation only while the caller runs
// fewer than Config.MaxSyncPerKey of them (else 429: its share is used)
// and fewer than Config.MaxSyncRequests run in all (else 503: the server is
// busy). Both answer at once with Retry-After rather than queueing.
func (s *Server) limitSync(next http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		owner := callerFrom(r.Context()).owner
		if !s.takeSyncShare(owner) {
			s.throttle.warn(s.log, "sync-share:"+owner, "synchronous request refused: the key is at its share", "key", ownerName(owner), "limit", s.cfg.MaxSyncPerKey)
			s.writeError(w, r, &Error{Code: CodeRateLimited, RetryAfter: syncRetryAfter,
				Detail: fmt.Sprintf("this API key already runs %d synchronous requests, its share; retry in a moment, or submit a job", s.cfg.MaxSyncPerKey)})
			return
		}
		defer s.releaseSyncShare(owner)
		select {
		case s.syncSlots <- struct{}{}:
		default:
			s.writeError(w, r, &Error{Code: CodeUnavailable, RetryAfter: syncRetryAfter,
				Detail: "the server is busy with other synchronous requests; retry in a moment, or submit a job"})
			return
		}
		defer func() { <-s.syncSlots }()
		next.ServeHTTP(w, r)
	})
}

// takeSyncShare counts one more synchronous request of owner, unless owner
// is at Config.MaxSyncPerKey.
func (s *Server) takeSyncShare(owner string) bool {
	s.mu.Lock()
	defer s.mu.Unlock()
	if s.cfg.MaxSyncPerKey > 0 && s.syncByKey[owner] >= s.cfg.MaxSyncPerKey {
		return false
	}
	s.syncByKey[owner]++
	return true
}

func (s *Server) releaseSyncShare(owner string) {
	s.mu.Lock()
	defer s.mu.Unlock()
	if s.syncByKey[owner]--; s.syncByKey[owner] <= 0 {
		delete(s.syncByKey, owner)
	}
}

// ownerName names an owner in the log: its key ID, or "anonymous".
func ownerName(owner string) string {
	if owner == "" {
		return "anonymous"
	}
	return owner
}
