package store

import (
	"bytes"
	"crypto/rand"
	"crypto/sha256"
	"encoding/base32"
	"encoding/base64"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"strconv"
	"strings"
	"time"
	"unicode"
	"unicode/utf8"
)

// Status is the state of a job. A job starts StatusQueued, becomes
// StatusRunning when a worker claims it, and ends in one of the three
// terminal states.
type Status string

// The job states. The string values are part of the public API.
const (
	StatusQueued    Status = "queued"
	StatusRunning   Status = "running"
	StatusSucceeded Status = "succeeded"
	StatusFailed    Status = "failed"
	StatusCancelled Status = "cancelled"
)

// Terminal reports whether s is a final state (succeeded, failed or
// cancelled).
func (s Status) Terminal() bool {
	return s == StatusSucceeded || s == StatusFailed || s == StatusCancelled
}

// Valid reports whether s is one of the five known states.
func (s Status) Valid() bool {
	return s == StatusQueued || s == StatusRunning || s.Terminal()
}

// Errors returned (wrapped) by both stores; test with errors.Is.
var (
	// ErrNotFound: no such job, result, API key or delivery target, or the
	// job belongs to another owner.
	ErrNotFound = errors.New("not found")
	// ErrConflict: an idempotency key reused with a different request, or an
	// API key name already taken.
	ErrConflict = errors.New("conflict")
	// ErrNoJob: ClaimJob found nothing to do.
	ErrNoJob = errors.New("no job available")
	// ErrLeaseLost: the caller no longer holds the job's lease (another
	// worker claimed it, or the job is no longer running).
	ErrLeaseLost = errors.New("lease lost")
	// ErrCancelRequested: returned by RenewLease after renewing the lease,
	// when the job's owner asked for it to be cancelled. The caller still
	// holds the lease and should stop and FinishJob with StatusCancelled.
	ErrCancelRequested = errors.New("cancel requested")
	// ErrUnauthorized: LookupAPIKey got an unknown or revoked key.
	ErrUnauthorized = errors.New("unauthorized")
	// ErrInvalid: an argument the store cannot accept (malformed cursor,
	// request that is not JSON, text with a NUL character or invalid UTF-8,
	// non-terminal status for FinishJob, empty key name, ...).
	ErrInvalid = errors.New("invalid argument")
	// ErrLimit: SubmitJob found the owner's queue full (see SubmitJob).
	ErrLimit = errors.New("limit reached")
	// ErrUnavailable: the database cannot be reached (connection refused or
	// lost, server shutting down or out of connections). Test for it with
	// IsUnavailable, which also recognises the driver's own errors; a
	// retry later may succeed.
	ErrUnavailable = errors.New("store unavailable")
)

// Progress counts a running job's work. TotalEstimate is the ranker's
// estimate of the number of isomers (0 while unknown).
type Progress struct {
	Generated     int64 `json:"generated"`
	Scored        int64 `json:"scored"`
	TotalEstimate int64 `json:"total_estimate"`
}

// Job is a ranking job as stored. Times are UTC with microsecond precision;
// a zero time means "not yet".
type Job struct {
	ID          string          // random, URL-safe (26 lowercase base32 characters); assigned by CreateJob
	Owner       string          // API key ID, "" for anonymous
	Status      Status          // current state
	Request     json.RawMessage // the validated POST /v1/jobs body; must be valid JSON
	Reference   string          // the client's own reference, echoed back
	CallbackURL string          // where to POST the summary when the job ends, "" for none
	Progress    Progress        // last reported progress
	Error       string          // failure message for StatusFailed (or a reason for StatusCancelled)

	CreatedAt  time.Time
	StartedAt  time.Time // first claim
	FinishedAt time.Time // reaching a terminal state

	Attempts        int       // number of times the job was claimed
	LeaseOwner      string    // worker ID of the last claimer, "" if never claimed
	LeaseUntil      time.Time // end of the current lease; zero unless running
	CancelRequested bool      // the owner asked to cancel while it was running

	IdempotencyKey string // client's Idempotency-Key, "" for none
	RequestHash    string // hash of Request used for idempotency; CreateJob fills it if empty

	CallbackDone bool // MarkCallbackDone was called: the callback is settled
}

// Result is the output of a succeeded job. Body is the ranker.Result JSON.
type Result struct {
	JobID        string
	IsomersTotal int64
	Body         json.RawMessage
}

// StatusChange is one row of a job's status history, written on every
// transition (created, claimed, reclaimed after an expired lease, released,
// finished, cancelled).
type StatusChange struct {
	Status Status    // state entered
	At     time.Time // when
	Worker string    // worker involved, "" if none
	Note   string    // short human-readable reason, e.g. "claimed (attempt 1)"
}

// APIKey describes an API key. The key itself is never stored: only Hash,
// its SHA-256 digest. Secret is the per-key HMAC-SHA256 secret for signing
// callbacks (32 random bytes).
type APIKey struct {
	ID        string
	Name      string
	Hash      []byte // sha256 of the key
	Secret    []byte
	CreatedAt time.Time
	RevokedAt time.Time // zero if active
}

// Revoked reports whether the key has been revoked.
func (k APIKey) Revoked() bool { return !k.RevokedAt.IsZero() }

// Delivery records one attempt to POST a job's summary to its callback URL.
// StatusCode is the HTTP status received (0 if no response); Error the
// transport error, "" if none.
type Delivery struct {
	JobID      string
	Attempt    int
	URL        string
	StatusCode int
	Error      string
	At         time.Time
}

// List limits for ListJobs.
const (
	DefaultListLimit = 50   // used when limit <= 0
	MaxListLimit     = 1000 // larger limits are reduced to this
)

// KeyPrefix starts every API key made by CreateAPIKey.
const KeyPrefix = "sr_"

// maxNameLen bounds API key names, in bytes.
const maxNameLen = 100

var idEncoding = base32.StdEncoding.WithPadding(base32.NoPadding)

// randomBytes returns n bytes from crypto/rand.
func randomBytes(n int) []byte {
	b := make([]byte, n)
	// crypto/rand.Read never returns an error on supported platforms (Go 1.24+).
	_, _ = rand.Read(b)
	return b
}

// RevokedMessage is the error of a queued job cancelled because its API
// key was revoked.
const RevokedMessage = "cancelled: the API key was revoked"

// newSecret returns a new callback-signing secret: 32 random bytes.
func newSecret() []byte { return randomBytes(32) }

// newJobID returns a random job ID: 16 bytes as 26 lowercase base32 characters.
func newJobID() string {
	return strings.ToLower(idEncoding.EncodeToString(randomBytes(16)))
}

// newKeyID returns a random API key ID, "k" followed by 16 hex digits.
func newKeyID() string {
	return "k" + hex.EncodeToString(randomBytes(8))
}

// newAPIKey returns a new key (KeyPrefix and 32 random bytes in lowercase
// base32) and its SHA-256 hash.
func newAPIKey() (string, []byte) {
	key := KeyPrefix + strings.ToLower(idEncoding.EncodeToString(randomBytes(32)))
	return key, HashKey(key)
}

// HashKey returns the SHA-256 digest of an API key, the form in which keys
// are stored and looked up.
func HashKey(key string) []byte {
	h := sha256.Sum256([]byte(key))
	return h[:]
}

// HashRequest returns the hex SHA-256 of a request body. CreateJob uses it
// when Job.RequestHash is empty; callers that canonicalise the body before
// hashing may set RequestHash themselves.
func HashRequest(body []byte) string {
	h := sha256.Sum256(body)
	return hex.EncodeToString(h[:])
}

// now returns the current time in the precision both stores keep.
func now() time.Time {
	return time.Now().UTC().Truncate(time.Microsecond)
}

// prepareJob validates j for CreateJob and fills the fields the store owns.
// Both stores accept exactly the text PostgreSQL can keep: no NUL
// characters, valid UTF-8, and JSON without \u0000 or unpaired surrogate
// escapes.
func prepareJob(j Job) (Job, error) {
	if len(j.Request) == 0 || !json.Valid(j.Request) {
		return Job{}, fmt.Errorf("create job: request is not valid JSON: %w", ErrInvalid)
	}
	if !storableJSON(j.Request) {
		return Job{}, fmt.Errorf("create job: request has a NUL character, an unpaired surrogate or invalid UTF-8: %w", ErrInvalid)
	}
	for _, f := range []struct{ name, v string }{
		{"owner", j.Owner}, {"reference", j.Reference}, {"callback URL", j.CallbackURL},
		{"idempotency key", j.IdempotencyKey}, {"request hash", j.RequestHash},
	} {
		if !storableText(f.v) {
			return Job{}, fmt.Errorf("create job: %s has a NUL character or invalid UTF-8: %w", f.name, ErrInvalid)
		}
	}
	if j.RequestHash == "" {
		j.RequestHash = HashRequest(j.Request)
	}
	j.ID = newJobID()
	j.Status = StatusQueued
	j.Progress = Progress{}
	j.Error = ""
	j.StartedAt, j.FinishedAt, j.LeaseUntil = time.Time{}, time.Time{}, time.Time{}
	j.Attempts = 0
	j.LeaseOwner = ""
	j.CancelRequested = false
	j.CallbackDone = false
	j.Request = append(json.RawMessage(nil), j.Request...)
	return j, nil
}

// checkFinish validates FinishJob's arguments.
func checkFinish(id string, status Status, result *Result) error {
	if !status.Terminal() {
		return fmt.Errorf("finish job %s: status %q is not terminal: %w", id, status, ErrInvalid)
	}
	if result != nil && (len(result.Body) == 0 || !json.Valid(result.Body) || !storableJSON(result.Body)) {
		return fmt.Errorf("finish job %s: result body is not storable JSON: %w", id, ErrInvalid)
	}
	return nil
}

// checkKeyName validates an API key name.
func checkKeyName(name string) error {
	if strings.TrimSpace(name) == "" {
		return fmt.Errorf("create api key: empty name: %w", ErrInvalid)
	}
	if len(name) > maxNameLen {
		return fmt.Errorf("create api key: name longer than %d bytes: %w", maxNameLen, ErrInvalid)
	}
	if !utf8.ValidString(name) || strings.ContainsFunc(name, unicode.IsControl) {
		return fmt.Errorf("create api key: name has a control character or invalid UTF-8: %w", ErrInvalid)
	}
	return nil
}

// storableText reports whether s can be kept in a PostgreSQL text column:
// valid UTF-8 without NUL (SQLSTATE 22021 and 22P05 otherwise).
func storableText(s string) bool {
	return utf8.ValidString(s) && strings.IndexByte(s, 0) < 0
}

// cleanText makes s storable, for text the store is handed by its own
// callers (error messages, notes): invalid UTF-8 and NUL become U+FFFD.
func cleanText(s string) string {
	if storableText(s) {
		return s
	}
	return strings.ReplaceAll(strings.ToValidUTF8(s, "\uFFFD"), "\x00", "\uFFFD")
}

// storableJSON reports whether the valid JSON text b can be kept as
// PostgreSQL jsonb: valid UTF-8, no NUL byte, no \u0000 escape and no
// unpaired UTF-16 surrogate escape. Outside strings valid JSON has no
// backslash, so scanning the escapes is enough.
func storableJSON(b []byte) bool {
	if !utf8.Valid(b) || bytes.IndexByte(b, 0) >= 0 {
		return false
	}
	pendingHigh := false // the previous escape was a high surrogate
	for i := 0; i < len(b); i++ {
		if b[i] != '\\' {
			if pendingHigh {
				return false
			}
			continue
		}
		if i+1 >= len(b) {
			return false
		}
		if b[i+1] != 'u' {
			if pendingHigh {
				return false
			}
			i++
			continue
		}
		if i+6 > len(b) {
			return false
		}
		v, err := strconv.ParseUint(string(b[i+2:i+6]), 16, 16)
		if err != nil {
			return false
		}
		switch {
		case v == 0:
			return false
		case v >= 0xD800 && v <= 0xDBFF:
			if pendingHigh {
				return false
			}
			pendingHigh = true
		case v >= 0xDC00 && v <= 0xDFFF:
			if !pendingHigh {
				return false
			}
			pendingHigh = false
		default:
			if pendingHigh {
				return false
			}
		}
		i += 5
	}
	return !pendingHigh
}

// ValidJobID reports whether id has the form of a job ID this store hands
// out (26 characters of lowercase base32). Methods given any other ID
// answer ErrNotFound without asking the database.
func ValidJobID(id string) bool {
	if len(id) != jobIDLen {
		return false
	}
	for i := 0; i < len(id); i++ {
		if c := id[i]; !(c >= 'a' && c <= 'z' || c >= '2' && c <= '7') {
			return false
		}
	}
	return true
}

// jobIDLen is the length of a job ID: 16 random bytes in unpadded base32.
const jobIDLen = 26

// clampLimit applies DefaultListLimit and MaxListLimit.
func clampLimit(limit int) int {
	switch {
	case limit <= 0:
		return DefaultListLimit
	case limit > MaxListLimit:
		return MaxListLimit
	}
	return limit
}

// cursor is the decoded position after which ListJobs continues: the
// (created_at, id) of the last job on the previous page.
type cursor struct {
	at time.Time
	id string
}

// encodeCursor makes the opaque cursor string for the job after which the
// next page starts.
func encodeCursor(j Job) string {
	raw := strconv.FormatInt(j.CreatedAt.UnixMicro(), 10) + "." + j.ID
	return base64.RawURLEncoding.EncodeToString([]byte(raw))
}

// decodeCursor parses a cursor made by encodeCursor; "" means the first page.
func decodeCursor(s string) (cursor, bool, error) {
	if s == "" {
		return cursor{}, false, nil
	}
	raw, err := base64.RawURLEncoding.DecodeString(s)
	if err != nil {
		return cursor{}, false, fmt.Errorf("list jobs: malformed cursor: %w", ErrInvalid)
	}
	micros, id, ok := strings.Cut(string(raw), ".")
	if !ok || id == "" {
		return cursor{}, false, fmt.Errorf("list jobs: malformed cursor: %w", ErrInvalid)
	}
	us, err := strconv.ParseInt(micros, 10, 64)
	if err != nil || !ValidJobID(id) {
		return cursor{}, false, fmt.Errorf("list jobs: malformed cursor: %w", ErrInvalid)
	}
	return cursor{at: time.UnixMicro(us).UTC(), id: id}, true, nil
}

// before reports whether job j sorts after the cursor position in
// newest-first order, i.e. belongs on the next page.
func (c cursor) before(j Job) bool {
	if !j.CreatedAt.Equal(c.at) {
		return j.CreatedAt.Before(c.at)
	}
	return j.ID < c.id
}

// newerFirst orders jobs newest first, ties by ID descending.
func newerFirst(a, b Job) int {
	if c := b.CreatedAt.Compare(a.CreatedAt); c != 0 {
		return c
	}
	return strings.Compare(b.ID, a.ID)
}
