package server

import (
	"context"
	"crypto/rand"
	"encoding/hex"
	"fmt"
	"log/slog"
	"net"
	"net/http"
	"os"
	"runtime"
	"strings"
	"sync"
	"time"

	"github.com/go-chi/chi/v5"

	"shiftrank/molecule"
)

// Config holds the service's limits and tuning. The zero value of each
// field means its documented default.
type Config struct {
	// Workers is the number of jobs run at once (default runtime.NumCPU()).
	// A negative value starts no workers (a process that only serves the API).
	Workers int
	// MaxHeavyAtoms bounds the non-hydrogen atoms of a formula
	// (default molecule.DefaultMaxHeavyAtoms).
	MaxHeavyAtoms int
	// MaxCandidates bounds the isomers scored per job (default 2,000,000).
	MaxCandidates int64
	// TimeBudget bounds the ranking time per job (default 60 s); the ranker
	// returns its best candidates so far when it runs out.
	TimeBudget time.Duration
	// MaxBodyBytes bounds a request body (default 1 MiB).
	MaxBodyBytes int64
	// MaxCountLimit bounds the structures POST /v1/isomers:count enumerates
	// (default 1,000,000).
	MaxCountLimit int64
	// MaxSyncRequests bounds the synchronous computations (POST /v1/predict
	// and /v1/isomers:count) run at once (default runtime.NumCPU()); a
	// request beyond it gets 503 with Retry-After, so that they cannot crowd
	// out the job workers.
	MaxSyncRequests int
	// MaxSyncPerKey bounds the synchronous computations one API key (or the
	// anonymous owner) runs at once (default half of MaxSyncRequests, at
	// least 1); a request beyond it gets 429 with Retry-After, so that one
	// key cannot take every slot from the others. Negative: no per-key
	// bound.
	MaxSyncPerKey int
	// MaxQueuedPerKey bounds the jobs one API key (or the anonymous owner)
	// has waiting in the queue (default 100); a submission beyond it gets
	// 429 with Retry-After. Negative: no bound. Jobs are picked fairly
	// between keys whatever this is (see store.Memory.ClaimJob); a bound on
	// running jobs per key is a store option (store.WithMaxRunningPerOwner).
	MaxQueuedPerKey int
	// Retention is how long finished jobs are kept (default 7 days; their
	// callbacks must be settled too); a sweep every RetentionSweep (default
	// 10 minutes) deletes older ones. Negative: keep them forever. The
	// memory store also bounds their number (store.WithMaxFinished).
	Retention      time.Duration
	RetentionSweep time.Duration
	// CallbackAllow lists callback targets allowed besides public addresses
	// on ports 80 and 443 (see CallbackAllow).
	CallbackAllow CallbackAllow
	// Resolver looks up callback hosts (default net.DefaultResolver).
	Resolver Resolver
	// AllowedHosts, when set, are the only Host header values (host:port,
	// as a browser sends them) accepted on anonymous requests, and the only
	// origins (their host:port) an anonymous request's Origin header may
	// name: a page of another site, or a name rebound to a loopback address,
	// cannot use the anonymous API. Empty: no check.
	AllowedHosts []string
	// ThrottleLogEvery is how often one kind of refusal (a busy server, a
	// key over its share, an unreachable store) is logged at most
	// (default 1 minute); the others are counted.
	ThrottleLogEvery time.Duration
	// Now is the clock (default time.Now), for callback timestamps and
	// throttled logging.
	Now func() time.Time
	// BaseURL is the public base URL (scheme and host, optional path
	// prefix, no trailing slash) used for Location headers and in callback
	// payloads. "" means relative Locations.
	BaseURL string
	// AllowAnonymous lets requests without an API key in; they act as the
	// anonymous owner. Requests with a key are still checked.
	AllowAnonymous bool
	// AnonymousSecret signs callbacks of anonymous jobs. Without it,
	// anonymous jobs may not set callback_url.
	AnonymousSecret []byte
	// Lease is how long a claimed job stays with its worker without a
	// renewal (default 30 s). A job whose worker dies is taken up again
	// after this.
	Lease time.Duration
	// CancelPoll is how often a running job checks for a cancel request
	// (default 300 ms).
	CancelPoll time.Duration
	// ProgressEvery throttles progress writes (default 1 s).
	ProgressEvery time.Duration
	// IdleMin and IdleMax bound the back-off of an idle worker's polling
	// (default 100 ms and 2 s).
	IdleMin, IdleMax time.Duration
	// CallbackAttempts bounds callback deliveries per job (default 6);
	// CallbackBackoff is the first retry delay, doubled each time up to
	// maxCallbackDelay (default 1 s). CallbackTimeout bounds one delivery
	// (default 10 s).
	CallbackAttempts int
	CallbackBackoff  time.Duration
	CallbackTimeout  time.Duration
	// CallbackSweep is how often this process looks for callbacks that a
	// stopped or dead process left unsettled, and resumes them (default
	// 30 s; negative: never). See Server.RetryWindow.
	CallbackSweep time.Duration
	// CallbackClient sends callbacks (default: a client that follows no
	// redirects and connects only to the targets the callback rules allow;
	// see CallbackAllow). A client given here is used as it is.
	CallbackClient *http.Client
	// WorkerID names this process's workers in leases and status history
	// (default host-pid-random).
	WorkerID string
	// Web serves everything outside /v1 and the health endpoints (the web
	// page). nil means a plain text page.
	Web http.Handler
}

func (c Config) withDefaults() Config {
	if c.Workers == 0 {
		c.Workers = runtime.NumCPU()
	}
	if c.MaxHeavyAtoms == 0 {
		c.MaxHeavyAtoms = molecule.DefaultMaxHeavyAtoms
	}
	if c.MaxCandidates == 0 {
		c.MaxCandidates = 2_000_000
	}
	if c.TimeBudget == 0 {
		c.TimeBudget = 60 * time.Second
	}
	if c.MaxBodyBytes == 0 {
		c.MaxBodyBytes = 1 << 20
	}
	if c.MaxCountLimit == 0 {
		c.MaxCountLimit = 1_000_000
	}
	if c.MaxSyncRequests <= 0 {
		c.MaxSyncRequests = runtime.NumCPU()
	}
	if c.MaxSyncPerKey == 0 {
		c.MaxSyncPerKey = max(1, c.MaxSyncRequests/2)
	}
	if c.MaxQueuedPerKey == 0 {
		c.MaxQueuedPerKey = DefaultMaxQueuedPerKey
	}
	if c.Retention == 0 {
		c.Retention = DefaultRetention
	}
	if c.RetentionSweep <= 0 {
		c.RetentionSweep = 10 * time.Minute
	}
	if c.Resolver == nil {
		c.Resolver = net.DefaultResolver
	}
	if c.ThrottleLogEvery <= 0 {
		c.ThrottleLogEvery = time.Minute
	}
	if c.Now == nil {
		c.Now = time.Now
	}
	c.BaseURL = strings.TrimRight(c.BaseURL, "/")
	if c.Lease == 0 {
		c.Lease = 30 * time.Second
	}
	if c.CancelPoll == 0 {
		c.CancelPoll = 300 * time.Millisecond
	}
	if c.ProgressEvery == 0 {
		c.ProgressEvery = time.Second
	}
	if c.IdleMin == 0 {
		c.IdleMin = 100 * time.Millisecond
	}
	if c.IdleMax == 0 {
		c.IdleMax = 2 * time.Second
	}
	if c.CallbackAttempts == 0 {
		c.CallbackAttempts = 6
	}
	if c.CallbackBackoff == 0 {
		c.CallbackBackoff = time.Second
	}
	if c.CallbackTimeout == 0 {
		c.CallbackTimeout = 10 * time.Second
	}
	if c.CallbackSweep == 0 {
		c.CallbackSweep = 30 * time.Second
	}

	if c.WorkerID == "" {
		host, _ := os.Hostname()
		var b [4]byte
		_, _ = rand.Read(b[:])
		c.WorkerID = fmt.Sprintf("%s-%d-%s", host, os.Getpid(), hex.EncodeToString(b[:]))
	}
	return c
}

// Server is the HTTP API (an http.Handler) and the worker pool that runs
// jobs. Start the pool with Start and stop it with Shutdown.
type Server struct {
	log    *slog.Logger
	st     JobStore
	rk     Ranker
	cfg    Config
	router chi.Router

	openapi    []byte // the OpenAPI document as served
	openapiErr error

	wake chan struct{} // a job was submitted here: idle workers poll at once

	mu       sync.Mutex
	started  bool
	stopping chan struct{} // closed by Shutdown: claim no more jobs
	hardStop context.CancelCauseFunc
	workers  sync.WaitGroup
	bg       sync.WaitGroup // callback deliveries
	bgCtx    context.Context
	bgCancel context.CancelFunc
	// delivering holds the jobs whose callback this process is sending, so
	// that a sweep does not start a second delivery beside the first.
	delivering map[string]bool
	// resumeSlots bounds the callbacks resumed by sweeps at once.
	resumeSlots chan struct{}
	// syncSlots bounds the synchronous computations run at once;
	// syncByKey counts them per caller (under mu).
	syncSlots chan struct{}
	syncByKey map[string]int
	// throttle limits repeated warnings in the log.
	throttle *logThrottle
}

// Defaults of the fair-sharing and retention settings.
const (
	DefaultMaxQueuedPerKey = 100
	DefaultRetention       = 7 * 24 * time.Hour
)

// New returns a server using st for jobs and rk for rankings. It does not
// start workers; call Start.
func New(logger *slog.Logger, st JobStore, rk Ranker, cfg Config) *Server {
	s := &Server{
		log:         logger,
		st:          st,
		rk:          rk,
		cfg:         cfg.withDefaults(),
		wake:        make(chan struct{}, 1),
		stopping:    make(chan struct{}),
		delivering:  make(map[string]bool),
		resumeSlots: make(chan struct{}, maxResumed),
	}
	s.syncSlots = make(chan struct{}, s.cfg.MaxSyncRequests)
	s.syncByKey = make(map[string]int)
	s.throttle = newLogThrottle(s.cfg.ThrottleLogEvery, s.cfg.Now)
	if s.cfg.CallbackClient == nil {
		s.cfg.CallbackClient = &http.Client{
			Timeout:   s.cfg.CallbackTimeout,
			Transport: s.callbackTransport(),
			// A redirect is answered as a failed delivery, not followed:
			// the signed body goes only where the client asked.
			CheckRedirect: func(*http.Request, []*http.Request) error { return http.ErrUseLastResponse },
		}
	}
	s.bgCtx, s.bgCancel = context.WithCancel(context.Background())
	s.openapi, s.openapiErr = openAPIDoc(s.cfg.BaseURL)
	s.router = s.routes()
	return s
}

// ServeHTTP serves the API.
func (s *Server) ServeHTTP(w http.ResponseWriter, r *http.Request) {
	s.router.ServeHTTP(w, r)
}

// Router returns the chi router (for route listings and tests).
func (s *Server) Router() chi.Routes { return s.router }

func (s *Server) routes() chi.Router {
	r := chi.NewRouter()
	r.Use(s.recoverer, s.logRequests)
	// Every error is a problem document, also for paths and methods no
	// route knows (an unknown method never reaches the subrouters).
	r.NotFound(s.apiNotFound)
	r.MethodNotAllowed(s.apiMethodNotAllowed)
	r.Get("/healthz", s.handleHealthz)
	r.Get("/readyz", s.handleReadyz)
	r.Route("/v1", func(r chi.Router) {
		r.NotFound(s.apiNotFound)
		r.MethodNotAllowed(s.apiMethodNotAllowed)
		r.Get("/openapi.json", s.handleOpenAPI)
		r.Group(func(r chi.Router) {
			r.Use(s.authenticate)
			r.Post("/jobs", s.handleCreateJob)
			r.Get("/jobs", s.handleListJobs)
			r.Get("/jobs/{id}", s.handleGetJob)
			r.Get("/jobs/{id}/candidates", s.handleCandidates)
			r.Get("/jobs/{id}/candidates/{rank}", s.handleCandidate)
			r.Post("/jobs/{id}/cancel", s.handleCancel)
			r.With(s.limitSync).Post("/predict", s.handlePredict)
			r.With(s.limitSync).Post("/isomers:count", s.handleCount)
		})
	})
	web := s.cfg.Web
	if web == nil {
		web = http.HandlerFunc(plainPage)
	}
	r.Handle("/*", s.problemErrors(web))
	return r
}

func (s *Server) apiNotFound(w http.ResponseWriter, r *http.Request) {
	s.writeError(w, r, errorf(CodeNotFound, "no such endpoint; see /v1/openapi.json"))
}

// problemErrors turns the error answers of h (the web page: a missing
// file, a POST to the page) into problem documents, so that every error
// of the service has one form.
func (s *Server) problemErrors(h http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		h.ServeHTTP(&problemWriter{ResponseWriter: w, s: s, r: r}, r)
	})
}

// problemWriter replaces an error status written by a handler, and the
// body that follows it, with a problem document.
type problemWriter struct {
	http.ResponseWriter
	s        *Server
	r        *http.Request
	replaced bool
}

func (pw *problemWriter) WriteHeader(code int) {
	if code < 400 || pw.replaced {
		pw.ResponseWriter.WriteHeader(code)
		return
	}
	pw.replaced = true
	detail := http.StatusText(code)
	switch code {
	case http.StatusNotFound:
		detail = "no such page or endpoint; the API is under /v1 (see /v1/openapi.json)"
	case http.StatusMethodNotAllowed:
		detail = fmt.Sprintf("method %s is not allowed here", pw.r.Method)
	}
	pw.s.writeProblem(pw.ResponseWriter, pw.r, Problem{Status: code, Code: statusCode(code), Detail: detail})
}

func (pw *problemWriter) Write(b []byte) (int, error) {
	if pw.replaced {
		return len(b), nil // the handler's own error text
	}
	return pw.ResponseWriter.Write(b)
}

func (pw *problemWriter) Unwrap() http.ResponseWriter { return pw.ResponseWriter }

func (s *Server) apiMethodNotAllowed(w http.ResponseWriter, r *http.Request) {
	s.writeError(w, r, errorf(CodeMethod, "method %s is not allowed here; see /v1/openapi.json", r.Method))
}

func plainPage(w http.ResponseWriter, r *http.Request) {
	if r.URL.Path != "/" {
		http.NotFound(w, r)
		return
	}
	if r.Method != http.MethodGet && r.Method != http.MethodHead {
		w.Header().Set("Allow", "GET, HEAD")
		w.WriteHeader(http.StatusMethodNotAllowed)
		return
	}
	w.Header().Set("Content-Type", "text/plain; charset=utf-8")
	fmt.Fprint(w, "shiftrank: ranks the constitutional isomers of a formula against an observed 1H NMR peak list.\n"+
		"API: POST /v1/jobs; description at /v1/openapi.json.\n"+
		"A ranking is a hypothesis to be confirmed against an authentic sample or further spectra;\n"+
		"not for forensic, clinical or safety decisions on its own.\n")
}

func (s *Server) handleHealthz(w http.ResponseWriter, r *http.Request) {
	s.writeJSON(w, http.StatusOK, map[string]string{"status": "ok"})
}

func (s *Server) handleReadyz(w http.ResponseWriter, r *http.Request) {
	select {
	case <-s.stopping:
		// A load balancer sends new work elsewhere while this one drains.
		s.writeError(w, r, errorf(CodeUnavailable, "the server is shutting down"))
		return
	default:
	}
	ctx, cancel := context.WithTimeout(r.Context(), 2*time.Second)
	defer cancel()
	if err := s.st.Ping(ctx); err != nil {
		s.log.Warn("readiness check", "err", err)
		s.writeError(w, r, errorf(CodeUnavailable, "the job store is not reachable"))
		return
	}
	s.writeJSON(w, http.StatusOK, map[string]string{"status": "ready"})
}

// location returns the URL of path for clients: absolute with BaseURL,
// else relative.
func (s *Server) location(path string) string {
	return s.cfg.BaseURL + path
}
