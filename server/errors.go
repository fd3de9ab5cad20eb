package server

import (
	"encoding/json"
	"errors"
	"fmt"
	"net/http"
	"strconv"
	"time"

	"shiftrank/store"
)

// Code classifies an application error. Each code maps to one HTTP status
// in codeStatus.
type Code string

// Error codes.
const (
	CodeInvalid          Code = "invalid"            // 400: the request is malformed or fails validation
	CodeUnauthorized     Code = "unauthorized"       // 401: missing, unknown or revoked API key
	CodeForbidden        Code = "forbidden"          // 403: an anonymous request from a foreign origin or host
	CodeNotFound         Code = "not_found"          // 404: no such resource for this caller
	CodeMethod           Code = "method_not_allowed" // 405
	CodeConflict         Code = "conflict"           // 409: idempotency clash or wrong job state
	CodeTooLarge         Code = "too_large"          // 413: request body over the limit
	CodeUnsupportedMedia Code = "unsupported_media"  // 415: body is not JSON
	CodeRateLimited      Code = "rate_limited"       // 429: the caller's share is used up; retry after Retry-After
	CodeUnavailable      Code = "unavailable"        // 503: the store cannot be reached or the server is busy; retry after Retry-After
	CodeInternal         Code = "internal"           // 500: a bug; details are logged, not sent
)

// codeStatus is the one table mapping error codes to HTTP statuses.
var codeStatus = map[Code]int{
	CodeInvalid:          http.StatusBadRequest,
	CodeUnauthorized:     http.StatusUnauthorized,
	CodeForbidden:        http.StatusForbidden,
	CodeNotFound:         http.StatusNotFound,
	CodeMethod:           http.StatusMethodNotAllowed,
	CodeConflict:         http.StatusConflict,
	CodeTooLarge:         http.StatusRequestEntityTooLarge,
	CodeUnsupportedMedia: http.StatusUnsupportedMediaType,
	CodeRateLimited:      http.StatusTooManyRequests,
	CodeUnavailable:      http.StatusServiceUnavailable,
	CodeInternal:         http.StatusInternalServerError,
}

// statusCode is the code of a problem for an HTTP status that no handler
// of ours chose (a 4xx or 5xx from the web page's file server).
func statusCode(status int) Code {
	for c, st := range codeStatus {
		if st == status {
			return c
		}
	}
	if status >= 500 {
		return CodeInternal
	}
	return CodeInvalid
}

// FieldError names one bad field of a request. Field is a JSON Pointer
// (RFC 6901) into the request body, e.g. "/formula" or "/options/require/1".
// Position and Token are set when the parser of that field reports them:
// Position is a 0-based byte offset into the field's string value.
type FieldError struct {
	Field    string `json:"field"`
	Detail   string `json:"detail"`
	Position *int   `json:"position,omitempty"`
	Token    string `json:"token,omitempty"`
}

// Error is the application error type. Detail is safe to show to clients;
// Err, if set, is logged but never sent. RetryAfter, if positive, is sent
// as the Retry-After header (whole seconds, rounded up).
type Error struct {
	Code       Code
	Detail     string
	Fields     []FieldError
	Err        error
	RetryAfter time.Duration
}

func (e *Error) Error() string {
	s := string(e.Code) + ": " + e.Detail
	if e.Err != nil {
		s += ": " + e.Err.Error()
	}
	return s
}

func (e *Error) Unwrap() error { return e.Err }

func errorf(code Code, format string, args ...any) *Error {
	return &Error{Code: code, Detail: fmt.Sprintf(format, args...)}
}

// storeRetryAfter is the Retry-After of a 503 for a store that cannot be
// reached.
const storeRetryAfter = 5 * time.Second

// internal wraps an unexpected error: a 500, or a 503 with Retry-After
// when the store cannot be reached (store.IsUnavailable).
func internal(err error) *Error {
	if store.IsUnavailable(err) {
		return &Error{Code: CodeUnavailable, Detail: "the job store cannot be reached; retry later", Err: err, RetryAfter: storeRetryAfter}
	}
	return &Error{Code: CodeInternal, Detail: "internal error; the server logged the details", Err: err}
}

func invalidFields(fields []FieldError) *Error {
	detail := "the request has 1 invalid field"
	if len(fields) != 1 {
		detail = fmt.Sprintf("the request has %d invalid fields", len(fields))
	}
	return &Error{Code: CodeInvalid, Detail: detail, Fields: fields}
}

// Problem is an RFC 9457 problem details object with the "code" and
// "errors" extension members.
type Problem struct {
	Type     string       `json:"type"`
	Title    string       `json:"title"`
	Status   int          `json:"status"`
	Detail   string       `json:"detail,omitempty"`
	Instance string       `json:"instance,omitempty"`
	Code     Code         `json:"code"`
	Errors   []FieldError `json:"errors,omitempty"`
}

// writeError sends err as a problem. Errors that are not *Error are
// internal: they are logged and replaced by a generic message. Internal
// errors are logged at ERROR; 503s at WARN, at most once per
// Config.ThrottleLogEvery for each kind, since an outage or a busy spell
// would otherwise log every request.
func (s *Server) writeError(w http.ResponseWriter, r *http.Request, err error) {
	var ae *Error
	if !errors.As(err, &ae) {
		ae = internal(err)
	}
	status, ok := codeStatus[ae.Code]
	if !ok {
		status = http.StatusInternalServerError
	}
	switch {
	case status == http.StatusServiceUnavailable:
		s.throttle.warn(s.log, "unavailable:"+ae.Detail, "request refused: "+ae.Detail, "method", r.Method, "path", r.URL.Path, "err", ae.Err)
	case status >= 500:
		s.log.Error("request failed", "method", r.Method, "path", r.URL.Path, "err", err)
	}
	if ae.Code == CodeUnauthorized {
		w.Header().Set("WWW-Authenticate", `Bearer realm="shiftrank"`)
	}
	if ae.RetryAfter > 0 {
		w.Header().Set("Retry-After", strconv.Itoa(int((ae.RetryAfter+time.Second-1)/time.Second)))
	}
	s.writeProblem(w, r, Problem{Status: status, Detail: ae.Detail, Code: ae.Code, Errors: ae.Fields})
}

// writeProblem sends p, filling its type, title and instance.
func (s *Server) writeProblem(w http.ResponseWriter, r *http.Request, p Problem) {
	p.Type = "about:blank"
	p.Title = http.StatusText(p.Status)
	p.Instance = r.URL.Path
	w.Header().Set("Content-Type", "application/problem+json")
	w.Header().Set("Cache-Control", "no-store")
	w.Header().Set("X-Content-Type-Options", "nosniff")
	w.WriteHeader(p.Status)
	enc := json.NewEncoder(w)
	enc.SetEscapeHTML(false)
	if err := enc.Encode(p); err != nil {
		s.log.Debug("write problem", "err", err)
	}
}

// writeJSON sends v with the given status.
func (s *Server) writeJSON(w http.ResponseWriter, status int, v any) {
	w.Header().Set("Content-Type", "application/json")
	w.Header().Set("Cache-Control", "no-store")
	w.WriteHeader(status)
	enc := json.NewEncoder(w)
	enc.SetEscapeHTML(false)
	if err := enc.Encode(v); err != nil {
		s.log.Debug("write response", "err", err)
	}
}
