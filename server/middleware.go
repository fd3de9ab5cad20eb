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

// limitSync admits a synchronous computation only while fewer than
// Config.MaxSyncRequests run; others get 503 with Retry-After at once
// rather than queueing behind them.
func (s *Server) limitSync(next http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		select {
		case s.syncSlots <- struct{}{}:
		default:
			w.Header().Set("Retry-After", "1")
			s.writeError(w, r, errorf(CodeUnavailable, "the server is busy with other synchronous requests; retry in a moment, or submit a job"))
			return
		}
		defer func() { <-s.syncSlots }()
		next.ServeHTTP(w, r)
	})
}
