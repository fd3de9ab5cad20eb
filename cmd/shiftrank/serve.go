package main

import (
	"context"
	"encoding/hex"
	"flag"
	"fmt"
	"log/slog"
	"net"
	"net/http"
	"net/url"
	"runtime"
	"strconv"
	"strings"
	"sync"
	"time"

	"shiftrank/molecule"
	"shiftrank/ranker"
	"shiftrank/server"
	"shiftrank/store"
	"shiftrank/web"
)

// serveStore is what serve needs of a store: the server's part and Close.
type serveStore interface {
	server.JobStore
	Close()
}

// runServe runs the HTTP API and the worker pool until ctx is cancelled
// (SIGINT or SIGTERM), then shuts down gracefully: it stops taking work,
// lets running jobs finish for --grace and hands the rest back to the queue.
func runServe(ctx context.Context, args []string, e env) error {
	fs := flag.NewFlagSet("serve", flag.ContinueOnError)
	addr := fs.String("addr", "127.0.0.1:8080", "listen address (host:port); a non-loopback address requires API keys")
	workers := fs.Int("workers", 0, "jobs run at once by this process (0 = number of cores, -1 = none: API only)")
	maxHeavy := fs.Int("max-heavy-atoms", molecule.DefaultMaxHeavyAtoms, "most non-hydrogen atoms accepted in a formula")
	maxCand := fs.Int64("max-candidates", 2_000_000, "most isomers scored per job")
	budget := fs.Duration("time-budget", 60*time.Second, "ranking time per job; the best candidates so far are kept when it runs out")
	maxBody := fs.Int64("max-body", 1<<20, "largest request body accepted, bytes")
	maxSync := fs.Int("max-sync-requests", 0, "synchronous predict and isomer-count requests run at once; more get 503 (0 = number of cores)")
	baseURL := fs.String("base-url", "", "public base URL for Location headers and callbacks, e.g. https://nmr.example.org (default http://ADDR)")
	anon := fs.Bool("allow-anonymous", false, "accept requests without an API key (they share one anonymous owner)")
	lease := fs.Duration("lease", 30*time.Second, "how long a claimed job stays with its worker without renewal; a dead worker's job is taken up again after this")
	grace := fs.Duration("grace", 30*time.Second, "on shutdown, how long running jobs may finish before they are handed back to the queue")
	cbAttempts := fs.Int("callback-attempts", 6, "most deliveries of one job's callback")
	cbBackoff := fs.Duration("callback-backoff", time.Second, "delay before the second callback delivery, doubled before each further one")
	cbTimeout := fs.Duration("callback-timeout", 10*time.Second, "time allowed for one callback delivery")
	cbSweep := fs.Duration("callback-sweep", 30*time.Second, "how often to resume callbacks that a stopped or dead process left undelivered")
	cbAllow := fs.String("callback-allow", "", "comma-separated host names (*.domain), IP addresses and CIDR ranges that callbacks may reach although not public, on any port (an ELN on the internal network)")
	maxQueued := fs.Int("max-queued-per-key", server.DefaultMaxQueuedPerKey, "most jobs one API key may have waiting; more get 429 (-1: no limit)")
	maxRunning := fs.Int("max-running-per-key", 0, "most jobs of one API key running at once across all processes (0: no limit; jobs are picked fairly between keys either way)")
	maxSyncKey := fs.Int("max-sync-per-key", 0, "synchronous requests one API key may run at once; more get 429 (0 = half of --max-sync-requests, -1: no limit)")
	retention := fs.Duration("retention", server.DefaultRetention, "finished jobs older than this are deleted with their results (0: keep them)")
	maxFinished := fs.Int("max-finished", store.DefaultMaxFinished, "in-memory store only: most finished jobs kept; the oldest are forgotten (0: no limit)")
	if err := flagsFromEnv(fs, e.getenv); err != nil {
		return badInput(err)
	}
	page := serveHelp()
	positional, help, err := parseArgs(fs, args, page, e)
	if help || err != nil {
		return err
	}
	if len(positional) > 0 {
		page.writeShort(e.stderr)
		return badInputf("serve: unexpected argument %q", positional[0])
	}
	host, _, err := net.SplitHostPort(*addr)
	if err != nil {
		return badInputf("serve: --addr %q: %v", *addr, err)
	}
	switch {
	case *maxHeavy < 1:
		return badInputf("serve: --max-heavy-atoms must be at least 1")
	case *maxCand < 1:
		return badInputf("serve: --max-candidates must be at least 1")
	case *budget <= 0:
		return badInputf("serve: --time-budget must be positive")
	case *maxBody < 1024:
		return badInputf("serve: --max-body must be at least 1024 bytes")
	case *lease < time.Second:
		return badInputf("serve: --lease must be at least 1s")
	case *maxSync < 0:
		return badInputf("serve: --max-sync-requests must not be negative")
	case *cbAttempts < 1:
		return badInputf("serve: --callback-attempts must be at least 1")
	case *cbBackoff <= 0 || *cbTimeout <= 0 || *cbSweep <= 0:
		return badInputf("serve: --callback-backoff, --callback-timeout and --callback-sweep must be positive")
	case *maxQueued < -1 || *maxQueued == 0:
		return badInputf("serve: --max-queued-per-key must be at least 1, or -1 for no limit")
	case *maxRunning < 0:
		return badInputf("serve: --max-running-per-key must not be negative")
	case *maxSyncKey < -1:
		return badInputf("serve: --max-sync-per-key must be at least 0, or -1 for no limit")
	case *retention < 0:
		return badInputf("serve: --retention must not be negative")
	case *maxFinished < 0:
		return badInputf("serve: --max-finished must not be negative")
	}
	allow, err := server.ParseCallbackAllow(strings.Split(*cbAllow, ","))
	if err != nil {
		return badInputf("serve: --callback-allow: %v", err)
	}
	keep := *retention
	if keep == 0 {
		keep = -1 // the server's "keep forever"
	}
	if *baseURL != "" && !strings.HasPrefix(*baseURL, "http://") && !strings.HasPrefix(*baseURL, "https://") {
		return badInputf("serve: --base-url %q must start with http:// or https://", *baseURL)
	}

	log := slog.New(slog.NewTextHandler(e.stderr, nil))
	var st serveStore
	memory := false
	if dsn := e.getenv("DATABASE_URL"); dsn != "" {
		pg, err := store.Open(ctx, dsn, store.WithMaxRunningPerOwner(*maxRunning))
		if err != nil {
			return fmt.Errorf("serve: %w", err)
		}
		st = pg
		log.Info("store: PostgreSQL; migrations applied")
	} else {
		st = store.NewMemory(store.WithMaxRunningPerOwner(*maxRunning), store.WithMaxFinished(*maxFinished))
		memory = true
		log.Info("store: in memory; jobs will not survive a restart (set DATABASE_URL to keep them in PostgreSQL)", "max_finished", *maxFinished)
	}
	defer st.Close()

	allowAnon := *anon || (memory && isLoopback(host))
	if memory && !allowAnon {
		return badInputf("serve: listening on %s with the in-memory store would require API keys, which need DATABASE_URL; "+
			"listen on a loopback address, set DATABASE_URL, or pass --allow-anonymous", *addr)
	}
	var anonSecret []byte
	if sec := e.getenv("SHIFTRANK_CALLBACK_SECRET"); sec != "" {
		if b, err := hex.DecodeString(sec); err == nil && len(b) >= 16 {
			anonSecret = b
		} else {
			anonSecret = []byte(sec)
		}
	}

	ln, err := net.Listen("tcp", *addr)
	if err != nil {
		return fmt.Errorf("serve: %w", err)
	}
	public := *baseURL
	if public == "" {
		public = "http://" + ln.Addr().String()
	}
	var allowedHosts []string
	if allowAnon && isLoopback(host) {
		allowedHosts = localHosts(ln.Addr().(*net.TCPAddr).Port, *baseURL)
	}

	// Jobs run side by side share the cores: each ranking gets its part.
	nw := *workers
	if nw == 0 {
		nw = runtime.NumCPU()
	}
	rk := ranker.New(ranker.Options{Workers: max(1, runtime.GOMAXPROCS(0)/max(nw, 1))})
	srv := server.New(log, st, rk, server.Config{
		Workers:          *workers,
		MaxHeavyAtoms:    *maxHeavy,
		MaxCandidates:    *maxCand,
		TimeBudget:       *budget,
		MaxBodyBytes:     *maxBody,
		MaxSyncRequests:  *maxSync,
		MaxSyncPerKey:    *maxSyncKey,
		MaxQueuedPerKey:  *maxQueued,
		Retention:        keep,
		BaseURL:          public,
		AllowAnonymous:   allowAnon,
		AnonymousSecret:  anonSecret,
		AllowedHosts:     allowedHosts,
		Lease:            *lease,
		CallbackAttempts: *cbAttempts,
		CallbackBackoff:  *cbBackoff,
		CallbackTimeout:  *cbTimeout,
		CallbackSweep:    *cbSweep,
		CallbackAllow:    allow,
		Web:              web.Handler(),
	})
	srv.Start()
	hs := &http.Server{
		Handler:           srv,
		ReadHeaderTimeout: 10 * time.Second,
		ReadTimeout:       time.Minute,
		IdleTimeout:       2 * time.Minute,
		ErrorLog:          slog.NewLogLogger(log.Handler(), slog.LevelWarn),
	}
	if a := allow.String(); a != "" {
		log.Info("callbacks may also reach these non-public targets, on any port", "callback_allow", a)
	}
	if allowAnon {
		log.Info("requests without an API key are accepted (anonymous)", "hosts", strings.Join(allowedHosts, ","))
	} else {
		log.Info("every request needs an API key (shiftrank apikey create --name NAME)")
	}
	log.Info("listening", "addr", ln.Addr().String(), "url", public)

	served := make(chan error, 1)
	go func() { served <- hs.Serve(ln) }()
	select {
	case err := <-served:
		shutdownPool(srv, *grace)
		return fmt.Errorf("serve: %w", err)
	case <-ctx.Done():
	}
	log.Info("shutting down: no new work; running jobs may finish", "grace", *grace)
	var wg sync.WaitGroup
	wg.Add(1)
	go func() {
		defer wg.Done()
		shutdownPool(srv, *grace)
	}()
	hctx, cancel := context.WithTimeout(context.Background(), 10*time.Second)
	defer cancel()
	if err := hs.Shutdown(hctx); err != nil {
		log.Warn("http shutdown", "err", err)
	}
	wg.Wait()
	log.Info("stopped")
	return nil
}

func shutdownPool(srv *server.Server, grace time.Duration) {
	ctx, cancel := context.WithTimeout(context.Background(), grace)
	defer cancel()
	_ = srv.Shutdown(ctx)
}

// localHosts lists the Host values an anonymous request to a loopback
// listener may carry: the loopback names with the port, and the host of
// the public base URL if one is set.
func localHosts(port int, baseURL string) []string {
	p := strconv.Itoa(port)
	hosts := []string{"127.0.0.1:" + p, "localhost:" + p, "[::1]:" + p}
	if u, err := url.Parse(baseURL); err == nil && u.Host != "" {
		h := u.Host
		if u.Port() == "" {
			if u.Scheme == "https" {
				h = net.JoinHostPort(u.Hostname(), "443")
			} else {
				h = net.JoinHostPort(u.Hostname(), "80")
			}
		}
		hosts = append(hosts, h)
	}
	return hosts
}

// isLoopback reports whether a listen host is a loopback address only
// ("" and 0.0.0.0 listen on every interface).
func isLoopback(host string) bool {
	if host == "localhost" {
		return true
	}
	ip := net.ParseIP(host)
	return ip != nil && ip.IsLoopback()
}

// flagsFromEnv sets each flag of fs from SHIFTRANK_<NAME> (upper case,
// dashes as underscores) when that variable is set. Command-line flags,
// parsed afterwards, win.
func flagsFromEnv(fs *flag.FlagSet, getenv func(string) string) error {
	var err error
	fs.VisitAll(func(f *flag.Flag) {
		name := "SHIFTRANK_" + strings.ToUpper(strings.ReplaceAll(f.Name, "-", "_"))
		if v := getenv(name); v != "" && err == nil {
			if serr := fs.Set(f.Name, v); serr != nil {
				err = fmt.Errorf("serve: %s=%q: %v", name, v, serr)
			}
		}
	})
	return err
}

// serveHelp is the help page of serve.
func serveHelp() helpPage {
	return helpPage{
		name:     "serve",
		synopsis: []string{"shiftrank serve [flags]"},
		about: `Runs the HTTP API (/v1, described at /v1/openapi.json), the web page and the job workers.
With DATABASE_URL set, jobs are kept in PostgreSQL (migrations are applied on start) and several
serve processes may share the database; without it they live in memory only.

Each flag may also be set by the environment: --max-body as SHIFTRANK_MAX_BODY, and so on.
SHIFTRANK_CALLBACK_SECRET (hex or text) signs callbacks of anonymous jobs.`,
		examples: []string{
			"shiftrank serve",
			"shiftrank serve --addr 127.0.0.1:9090 --workers 2 --time-budget 2m",
			"DATABASE_URL=postgres://nmr@db.example.org:5432/shiftrank shiftrank serve --addr 0.0.0.0:8080",
		},
	}
}
