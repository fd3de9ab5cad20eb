package server

import (
	"context"
	"crypto/rand"
	"encoding/hex"
	"fmt"
	"log/slog"
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
	// redirects).
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
	if c.CallbackClient == nil {
		c.CallbackClient = &http.Client{
			Timeout: c.CallbackTimeout,
			// A redirect is answered as a failed delivery, not followed:
			// the signed body goes only where the client asked.
			CheckRedirect: func(*http.Request, []*http.Request) error { return http.ErrUseLastResponse },
		}
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
	// syncSlots bounds the synchronous computations run at once.
	syncSlots chan struct{}
}

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
	r.Handle("/*", web)
	return r
}

func (s *Server) apiNotFound(w http.ResponseWriter, r *http.Request) {
	s.writeError(w, r, errorf(CodeNotFound, "no such endpoint; see /v1/openapi.json"))
}

func (s *Server) apiMethodNotAllowed(w http.ResponseWriter, r *http.Request) {
	s.writeError(w, r, errorf(CodeMethod, "method %s is not allowed here; see /v1/openapi.json", r.Method))
}

func plainPage(w http.ResponseWriter, r *http.Request) {
	if r.URL.Path != "/" {
		http.NotFound(w, r)
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
