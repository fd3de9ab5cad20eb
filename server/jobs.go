package server

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"net/http"
	"strconv"
	"strings"
	"time"

	"github.com/go-chi/chi/v5"

	"shiftrank/ranker"
	"shiftrank/store"
)

// Caution is shown with every ranking the API returns.
const Caution = ranker.Caution

// JobView is the JSON form of a job. The names id, status, progress,
// created_at, started_at, finished_at, error and reference are part of the
// public contract.
type JobView struct {
	ID         string       `json:"id"`
	Status     store.Status `json:"status"`
	Progress   ProgressView `json:"progress"`
	CreatedAt  *time.Time   `json:"created_at"`
	StartedAt  *time.Time   `json:"started_at"`
	FinishedAt *time.Time   `json:"finished_at"`
	Error      *string      `json:"error"`
	Reference  string       `json:"reference"`
	Attempts   int          `json:"attempts"`
	// CancelRequested is set while a running job is being stopped.
	CancelRequested bool            `json:"cancel_requested"`
	Request         json.RawMessage `json:"request,omitempty"`
	// Formula is the formula of the request, as submitted.
	Formula string `json:"formula,omitempty"`
	// SearchStatus is the search status of a succeeded job's ranking
	// ("complete", "complete within the constraints", "stopped early"; see
	// CandidateList.Search), or of the ranking kept from a job cancelled
	// while it ran ("stopped early" with SearchStopReason "cancelled on
	// request"), and SearchStopReason what stopped a search that stopped
	// early. Only GET /v1/jobs/{id} fills them.
	SearchStatus     string   `json:"search_status,omitempty"`
	SearchStopReason string   `json:"search_stop_reason,omitempty"`
	Links            JobLinks `json:"links"`
}

// ProgressView is a running job's progress: structures generated, scored,
// and an estimate of the total (0 while unknown).
type ProgressView struct {
	Generated     int64 `json:"generated"`
	Scored        int64 `json:"scored"`
	TotalEstimate int64 `json:"total_estimate"`
}

// JobLinks are the URLs of a job's resources.
type JobLinks struct {
	Self       string `json:"self"`
	Candidates string `json:"candidates"`
	Cancel     string `json:"cancel"`
}

func timePtr(t time.Time) *time.Time {
	if t.IsZero() {
		return nil
	}
	u := t.UTC()
	return &u
}

func (s *Server) jobView(j store.Job) JobView {
	v := JobView{
		ID:     j.ID,
		Status: j.Status,
		Progress: ProgressView{
			Generated:     j.Progress.Generated,
			Scored:        j.Progress.Scored,
			TotalEstimate: j.Progress.TotalEstimate,
		},
		CreatedAt:       timePtr(j.CreatedAt),
		StartedAt:       timePtr(j.StartedAt),
		FinishedAt:      timePtr(j.FinishedAt),
		Reference:       j.Reference,
		Attempts:        j.Attempts,
		CancelRequested: j.CancelRequested,
		Request:         j.Request,
		Links: JobLinks{
			Self:       s.location("/v1/jobs/" + j.ID),
			Candidates: s.location("/v1/jobs/" + j.ID + "/candidates"),
			Cancel:     s.location("/v1/jobs/" + j.ID + "/cancel"),
		},
	}
	var req struct {
		Formula string `json:"formula"`
	}
	if json.Unmarshal(j.Request, &req) == nil {
		v.Formula = req.Formula
	}
	if j.Error != "" {
		e := j.Error
		v.Error = &e
	}
	return v
}

func (s *Server) limits() limits {
	return limits{maxHeavyAtoms: s.cfg.MaxHeavyAtoms, maxCandidates: s.cfg.MaxCandidates, timeBudget: s.cfg.TimeBudget}
}

const (
	maxIdempotencyKeyLen = 255
	maxCursorLen         = 200 // a cursor is about 60 characters
)

func (s *Server) handleCreateJob(w http.ResponseWriter, r *http.Request) {
	c := callerFrom(r.Context())
	idem := r.Header.Get("Idempotency-Key")
	if len(idem) > maxIdempotencyKeyLen || strings.ContainsFunc(idem, func(r rune) bool { return r < 0x20 || r > 0x7e }) {
		s.writeError(w, r, &Error{Code: CodeInvalid, Detail: "bad Idempotency-Key header",
			Fields: []FieldError{{Field: "Idempotency-Key", Detail: fmt.Sprintf("at most %d printable ASCII characters", maxIdempotencyKeyLen)}}})
		return
	}
	var raw json.RawMessage
	if err := decodeJSON(w, r, s.cfg.MaxBodyBytes, &raw); err != nil {
		s.writeError(w, r, err)
		return
	}
	jr, rr, err := decodeJobRequest(raw, s.limits())
	if err != nil {
		var ae *Error
		if errors.As(err, &ae) && jr.CallbackURL != "" && c.secret == nil {
			ae.Fields = append(ae.Fields, anonymousCallbackField())
		}
		s.writeError(w, r, err)
		return
	}
	if jr.CallbackURL != "" && c.secret == nil {
		s.writeError(w, r, invalidFields([]FieldError{anonymousCallbackField()}))
		return
	}
	if fields := s.feasibilityFields(jr, rr); len(fields) > 0 {
		s.writeError(w, r, invalidFields(fields))
		return
	}
	if jr.CallbackURL != "" {
		if err := s.checkCallbackTarget(r.Context(), jr.CallbackURL); err != nil {
			s.writeError(w, r, err)
			return
		}
	}
	canon, hash, err := jr.canonical()
	if err != nil {
		s.writeError(w, r, internal(err))
		return
	}
	job, created, err := s.st.SubmitJob(r.Context(), store.Job{
		Owner:          c.owner,
		Status:         store.StatusQueued,
		Request:        canon,
		Reference:      jr.Reference,
		CallbackURL:    jr.CallbackURL,
		IdempotencyKey: idem,
		RequestHash:    hash,
	}, s.cfg.MaxQueuedPerKey)
	switch {
	case errors.Is(err, store.ErrConflict):
		s.writeError(w, r, &Error{Code: CodeConflict,
			Detail: "this Idempotency-Key was already used with a different request body",
			Fields: []FieldError{{Field: "Idempotency-Key", Detail: "already used with a different body"}}})
		return
	case errors.Is(err, store.ErrLimit):
		s.throttle.warn(s.log, "queue-share:"+c.owner, "job refused: the key's queue is full", "key", ownerName(c.owner), "limit", s.cfg.MaxQueuedPerKey)
		s.writeError(w, r, &Error{Code: CodeRateLimited, RetryAfter: queueRetryAfter,
			Detail: fmt.Sprintf("this API key already has %d jobs waiting, its share of the queue; submit more when some have started", s.cfg.MaxQueuedPerKey)})
		return
	case errors.Is(err, store.ErrInvalid):
		// The checks above keep such text out; this is the last guard.
		s.writeError(w, r, &Error{Code: CodeInvalid, Detail: "the request holds text that cannot be stored (a NUL character or invalid UTF-8)", Err: err})
		return
	case err != nil:
		s.writeError(w, r, internal(fmt.Errorf("create job: %w", err)))
		return
	}
	if created {
		s.notifyWorkers()
	}
	w.Header().Set("Location", s.location("/v1/jobs/"+job.ID))
	status := http.StatusAccepted
	if !created {
		status = http.StatusOK
		w.Header().Set("Idempotent-Replayed", "true")
	}
	s.writeJSON(w, status, s.jobView(job))
}

func anonymousCallbackField() FieldError {
	return FieldError{Field: "/callback_url", Detail: "callbacks are signed with the API key's secret: send an API key to use them"}
}

func (s *Server) handleGetJob(w http.ResponseWriter, r *http.Request) {
	job, err := s.getJob(r, chi.URLParam(r, "id"))
	if err != nil {
		s.writeError(w, r, err)
		return
	}
	v := s.jobView(job)
	if job.Status == store.StatusSucceeded || job.Status == store.StatusCancelled {
		v.SearchStatus, v.SearchStopReason = s.searchStatus(r, job.ID)
	}
	s.writeJSON(w, http.StatusOK, v)
}

// searchStatus reads the search status and stop reason from a finished
// job's stored result (a succeeded job's, or the ranking kept from a job
// cancelled while it ran; a cancelled job without one gives ""). A result without a search report (one stored by an
// older version) or one that cannot be read gives "": the job view does
// not fail for it.
func (s *Server) searchStatus(r *http.Request, id string) (status, reason string) {
	res, err := s.st.GetResult(r.Context(), callerFrom(r.Context()).owner, id)
	if err != nil {
		if !errors.Is(err, store.ErrNotFound) {
			s.log.Warn("job view: read result", "job", id, "err", err)
		}
		return "", ""
	}
	var body struct {
		Search struct {
			Status     string `json:"status"`
			StopReason string `json:"stop_reason"`
		} `json:"search"`
	}
	if err := json.Unmarshal(res.Body, &body); err != nil {
		s.log.Warn("job view: decode result", "job", id, "err", err)
		return "", ""
	}
	if body.Search.Status != ranker.StatusStopped {
		body.Search.StopReason = ""
	}
	return body.Search.Status, body.Search.StopReason
}

func (s *Server) getJob(r *http.Request, id string) (store.Job, error) {
	if !store.ValidJobID(id) {
		return store.Job{}, errorf(CodeNotFound, "no job %q", truncate(id, 40))
	}
	job, err := s.st.GetJob(r.Context(), callerFrom(r.Context()).owner, id)
	if errors.Is(err, store.ErrNotFound) {
		return job, errorf(CodeNotFound, "no job %q", id)
	}
	if err != nil {
		return job, internal(fmt.Errorf("get job %s: %w", id, err))
	}
	return job, nil
}

// JobList is the response of GET /v1/jobs.
type JobList struct {
	Jobs       []JobView `json:"jobs"`
	NextCursor string    `json:"next_cursor,omitempty"`
}

func (s *Server) handleListJobs(w http.ResponseWriter, r *http.Request) {
	q := r.URL.Query()
	limit, err := queryInt(q.Get("limit"), "limit", 20, 1, 100)
	if err != nil {
		s.writeError(w, r, err)
		return
	}
	cursor := q.Get("cursor")
	if len(cursor) > maxCursorLen {
		s.writeError(w, r, &Error{Code: CodeInvalid, Detail: "bad cursor",
			Fields: []FieldError{{Field: "cursor", Detail: "not a cursor this server returned"}}})
		return
	}
	jobs, next, err := s.st.ListJobs(r.Context(), callerFrom(r.Context()).owner, limit, cursor)
	if err != nil {
		if errors.Is(err, store.ErrInvalid) {
			s.writeError(w, r, &Error{Code: CodeInvalid, Detail: "bad cursor",
				Fields: []FieldError{{Field: "cursor", Detail: "not a cursor this server returned"}}})
			return
		}
		s.writeError(w, r, internal(fmt.Errorf("list jobs: %w", err)))
		return
	}
	out := JobList{Jobs: make([]JobView, 0, len(jobs)), NextCursor: next}
	for _, j := range jobs {
		v := s.jobView(j)
		v.Request = nil
		out.Jobs = append(out.Jobs, v)
	}
	s.writeJSON(w, http.StatusOK, out)
}

// queryInt parses an optional integer query parameter within [lo, hi].
func queryInt(s, name string, def, lo, hi int) (int, error) {
	if s == "" {
		return def, nil
	}
	n, err := strconv.Atoi(s)
	if err != nil || n < lo || n > hi {
		return 0, &Error{Code: CodeInvalid, Detail: "bad query parameter " + name,
			Fields: []FieldError{{Field: name, Detail: fmt.Sprintf("must be an integer between %d and %d", lo, hi)}}}
	}
	return n, nil
}

func (s *Server) handleCancel(w http.ResponseWriter, r *http.Request) {
	id := chi.URLParam(r, "id")
	owner := callerFrom(r.Context()).owner
	if !store.ValidJobID(id) {
		s.writeError(w, r, errorf(CodeNotFound, "no job %q", truncate(id, 40)))
		return
	}
	before, _ := s.st.GetJob(r.Context(), owner, id)
	job, err := s.st.CancelJob(r.Context(), owner, id)
	switch {
	case errors.Is(err, store.ErrNotFound):
		s.writeError(w, r, errorf(CodeNotFound, "no job %q", id))
		return
	case errors.Is(err, store.ErrConflict):
		s.writeError(w, r, errorf(CodeConflict, "job %q has already finished", id))
		return
	case err != nil:
		s.writeError(w, r, internal(fmt.Errorf("cancel job %s: %w", id, err)))
		return
	}
	if before.Status == store.StatusQueued && job.Status == store.StatusCancelled && job.CallbackURL != "" {
		// No worker will see this job: its callback goes from here.
		s.background(func(ctx context.Context) { s.deliver(ctx, job) })
	}
	s.writeJSON(w, http.StatusAccepted, s.jobView(job))
}

// resultBody is the part of the stored ranker.Result JSON the API reads;
// observed peaks and candidates are passed on byte for byte.
type resultBody struct {
	Formula          string            `json:"formula"`
	DBE              int               `json:"dbe"`
	IsomersTotal     int64             `json:"isomers_total"`
	IsomersEstimated bool              `json:"isomers_estimated"`
	Generated        int64             `json:"generated"`
	Scored           int64             `json:"scored"`
	Complete         bool              `json:"complete"`
	MHz              float64           `json:"mhz"`
	Solvent          string            `json:"solvent"`
	Peaks            []json.RawMessage `json:"peaks"`
	CarbonPeaks      []json.RawMessage `json:"carbon_peaks"`
	Warnings         []string          `json:"warnings"`
	Candidates       []json.RawMessage `json:"candidates"`
	Search           json.RawMessage   `json:"search"`
}

// CandidateList is the response of GET /v1/jobs/{id}/candidates: the
// ranking's summary, the observed peaks as the ranker read them, and one
// page of candidates. Peaks and candidates are exactly as in the ranker's
// JSON output (`rank --json`): each peak has index, shift (ppm), optional
// shift_lo/shift_hi, multiplicity, j (Hz), integral, implied_h (the
// integral scaled to the formula's H count), solvent (the residual signal
// it matches) and excluded (left out of the scoring). The names job_id,
// isomers_total and candidates are part of the public contract.
type CandidateList struct {
	JobID            string            `json:"job_id"`
	Formula          string            `json:"formula"`
	DBE              int               `json:"dbe"`
	IsomersTotal     int64             `json:"isomers_total"`
	IsomersEstimated bool              `json:"isomers_estimated"`
	Generated        int64             `json:"generated"`
	Scored           int64             `json:"scored"`
	Complete         bool              `json:"complete"`
	MHz              float64           `json:"mhz,omitempty"`
	Solvent          string            `json:"solvent,omitempty"`
	Peaks            []json.RawMessage `json:"peaks"`
	// CarbonPeaks are the observed 13C peaks, when the request had them.
	CarbonPeaks []json.RawMessage `json:"carbon_peaks,omitempty"`
	Warnings    []string          `json:"warnings"`
	// Search says what was searched (ranker.SearchReport): all isomers or
	// only those fitting the constraints read from the spectrum, whether
	// the search was complete or stopped early and why, and every
	// constraint and reading. A ranking from a search that stopped early
	// or ran inside inferred constraints says so here.
	Search     json.RawMessage   `json:"search,omitempty"`
	Total      int               `json:"total"`
	Offset     int               `json:"offset"`
	Limit      int               `json:"limit"`
	Candidates []json.RawMessage `json:"candidates"`
	Caution    string            `json:"caution"`
}

func (s *Server) loadResult(r *http.Request, id string) (resultBody, error) {
	owner := callerFrom(r.Context()).owner
	if !store.ValidJobID(id) {
		return resultBody{}, errorf(CodeNotFound, "no job %q", truncate(id, 40))
	}
	res, err := s.st.GetResult(r.Context(), owner, id)
	if errors.Is(err, store.ErrNotFound) {
		job, err := s.getJob(r, id)
		if err != nil {
			return resultBody{}, err
		}
		return resultBody{}, errorf(CodeConflict, "job %q is %s; candidates exist once it has succeeded (or was cancelled after scoring some)", id, job.Status)
	}
	if err != nil {
		return resultBody{}, internal(fmt.Errorf("get result %s: %w", id, err))
	}
	var body resultBody
	if err := json.Unmarshal(res.Body, &body); err != nil {
		return body, internal(fmt.Errorf("decode stored result %s: %w", id, err))
	}
	if body.Candidates == nil {
		body.Candidates = []json.RawMessage{}
	}
	if body.Warnings == nil {
		body.Warnings = []string{}
	}
	if body.Peaks == nil {
		body.Peaks = []json.RawMessage{}
	}
	if body.IsomersTotal == 0 {
		body.IsomersTotal = res.IsomersTotal
	}
	return body, nil
}

func (s *Server) handleCandidates(w http.ResponseWriter, r *http.Request) {
	id := chi.URLParam(r, "id")
	q := r.URL.Query()
	limit, err := queryInt(q.Get("limit"), "limit", 20, 1, 100)
	if err != nil {
		s.writeError(w, r, err)
		return
	}
	offset, err := queryInt(q.Get("offset"), "offset", 0, 0, 1<<30)
	if err != nil {
		s.writeError(w, r, err)
		return
	}
	body, err := s.loadResult(r, id)
	if err != nil {
		s.writeError(w, r, err)
		return
	}
	page := body.Candidates[min(offset, len(body.Candidates)):min(offset+limit, len(body.Candidates))]
	s.writeJSON(w, http.StatusOK, CandidateList{
		JobID:            id,
		Formula:          body.Formula,
		DBE:              body.DBE,
		IsomersTotal:     body.IsomersTotal,
		IsomersEstimated: body.IsomersEstimated,
		Generated:        body.Generated,
		Scored:           body.Scored,
		Complete:         body.Complete,
		MHz:              body.MHz,
		Solvent:          body.Solvent,
		Peaks:            body.Peaks,
		CarbonPeaks:      body.CarbonPeaks,
		Search:           body.Search,
		Warnings:         body.Warnings,
		Total:            len(body.Candidates),
		Offset:           offset,
		Limit:            limit,
		Candidates:       page,
		Caution:          Caution,
	})
}

func (s *Server) handleCandidate(w http.ResponseWriter, r *http.Request) {
	id := chi.URLParam(r, "id")
	rank, err := strconv.Atoi(chi.URLParam(r, "rank"))
	if err != nil || rank < 1 {
		s.writeError(w, r, &Error{Code: CodeInvalid, Detail: "bad rank",
			Fields: []FieldError{{Field: "rank", Detail: "must be a positive integer (1 is the best candidate)"}}})
		return
	}
	body, err := s.loadResult(r, id)
	if err != nil {
		s.writeError(w, r, err)
		return
	}
	for _, c := range body.Candidates {
		var head struct {
			Rank int `json:"rank"`
		}
		if json.Unmarshal(c, &head) == nil && head.Rank == rank {
			w.Header().Set("Content-Type", "application/json")
			w.Header().Set("Cache-Control", "no-store")
			_, _ = w.Write(append(c, '\n'))
			return
		}
	}
	s.writeError(w, r, errorf(CodeNotFound, "job %q has no candidate of rank %d (it kept %d)", id, rank, len(body.Candidates)))
}
