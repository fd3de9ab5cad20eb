package server_test

import (
	"bytes"
	"context"
	"encoding/json"
	"io"
	"log/slog"
	"net"
	"net/http"
	"net/http/httptest"
	"net/netip"
	"net/url"
	"os"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"shiftrank/ranker"
	"shiftrank/server"
	"shiftrank/store"
	"shiftrank/store/pgtest"
)

// testStore is a store as the tests use it: the server's part plus the
// administrative calls the tests make directly.
type testStore interface {
	server.JobStore
	CreateAPIKey(ctx context.Context, name string) (string, store.APIKey, error)
	RevokeAPIKey(ctx context.Context, idOrName string) (int, error)
	History(ctx context.Context, owner, id string) ([]store.StatusChange, error)
	Deliveries(ctx context.Context, jobID string) ([]store.Delivery, error)
	RotateAPIKeySecret(ctx context.Context, idOrName string) (store.APIKey, error)
	Close()
}

var (
	_ server.JobStore = (*store.Memory)(nil)
	_ server.JobStore = (*store.Postgres)(nil)
	_ server.Ranker   = (*ranker.Ranker)(nil)
)

// stores lists the store implementations every API test runs against.
// The PostgreSQL case skips (fails under CI=true) without TEST_DATABASE_URL.
func stores() map[string]func(t *testing.T) testStore {
	return map[string]func(t *testing.T) testStore{
		"memory":   func(t *testing.T) testStore { return store.NewMemory() },
		"postgres": postgresStore,
	}
}

// forEachStore runs f as a subtest per store.
func forEachStore(t *testing.T, f func(t *testing.T, st testStore)) {
	t.Helper()
	for name, open := range stores() {
		t.Run(name, func(t *testing.T) {
			st := open(t)
			t.Cleanup(st.Close)
			f(t, st)
		})
	}
}

// quietLogger discards logs unless -v is given.
func quietLogger(t testing.TB) *slog.Logger {
	if testing.Verbose() {
		return slog.New(slog.NewTextHandler(os.Stderr, &slog.HandlerOptions{Level: slog.LevelDebug}))
	}
	return slog.New(slog.NewTextHandler(io.Discard, nil))
}

// fakeRanker returns a fixed ranking at once, or, with block set, reports
// progress until its context is cancelled.
type fakeRanker struct {
	block bool
	// partial makes a blocked ranking hand back its fixed ranking with
	// the context's error when cancelled, as a ranker keeping its best so
	// far does.
	partial  bool
	mu       sync.Mutex
	calls    int
	returned int
	reqs     []ranker.Request
}

func (f *fakeRanker) Rank(ctx context.Context, req ranker.Request, progress func(ranker.Progress)) (*ranker.Result, error) {
	if err := ctx.Err(); err != nil {
		// The server checks a request at submission with a cancelled
		// context; like the real ranker, a valid one answers ctx.Err().
		return nil, err
	}
	f.mu.Lock()
	f.calls++
	f.reqs = append(f.reqs, req)
	f.mu.Unlock()
	if f.block {
		var n int64
		for {
			select {
			case <-ctx.Done():
				f.mu.Lock()
				f.returned++
				f.mu.Unlock()
				if f.partial {
					res := fixedRanking(req)
					res.Complete, res.Scored = false, n/2
					return res, ctx.Err()
				}
				return nil, ctx.Err()
			case <-time.After(10 * time.Millisecond):
			}
			n += 100
			progress(ranker.Progress{Generated: n, Scored: n / 2, TotalEstimate: 1_000_000})
		}
	}
	progress(ranker.Progress{Generated: 3, Scored: 3, TotalEstimate: 3})
	return fixedRanking(req), nil
}

// fixedRanking is the fake ranker's result: three candidates.
func fixedRanking(req ranker.Request) *ranker.Result {
	return &ranker.Result{
		Formula:      req.Formula,
		IsomersTotal: 3,
		Scored:       3,
		Complete:     true,
		Candidates: []ranker.Candidate{
			{Rank: 1, SMILES: "CCO", Score: -1.5, Probability: 0.9},
			{Rank: 2, SMILES: "COC", Score: -4.0, Probability: 0.08},
			{Rank: 3, SMILES: "OCC", Score: -6.0, Probability: 0.02},
		},
		Warnings: []string{},
	}
}

// stopped reports whether a blocking ranking has returned on its
// context's cancellation.
func (f *fakeRanker) stopped() bool {
	f.mu.Lock()
	defer f.mu.Unlock()
	return f.returned > 0
}

func (f *fakeRanker) Calls() int {
	f.mu.Lock()
	defer f.mu.Unlock()
	return f.calls
}

// fastConfig makes workers and callbacks quick enough for tests.
func fastConfig(cfg server.Config) server.Config {
	if cfg.Workers == 0 {
		cfg.Workers = 2
	}
	cfg.Lease = 2 * time.Second
	cfg.CancelPoll = 50 * time.Millisecond
	cfg.ProgressEvery = 50 * time.Millisecond
	cfg.IdleMin = 10 * time.Millisecond
	cfg.IdleMax = 50 * time.Millisecond
	cfg.CallbackBackoff = 20 * time.Millisecond
	if cfg.CallbackAllow.String() == "" {
		// The tests' callback receivers listen on loopback, which the
		// callback rules refuse unless the operator allows it.
		cfg.CallbackAllow = loopbackAllowed
	}
	return cfg
}

// loopbackAllowed allows callbacks to the loopback addresses.
var loopbackAllowed, _ = server.ParseCallbackAllow([]string{"127.0.0.0/8", "::1"})

// signedBy reports whether the callback request r with body carries a
// valid, current signature under secret.
func signedBy(secret []byte, r *http.Request, body []byte) bool {
	return server.VerifySignature(secret, body, r.Header.Get(server.TimestampHeader), r.Header.Get(server.SignatureHeader), time.Now(), 0) == nil
}

// startServer serves the API over loopback HTTP with its workers running.
func startServer(t *testing.T, st testStore, rk server.Ranker, cfg server.Config) (*server.Server, *httptest.Server) {
	t.Helper()
	srv := server.New(quietLogger(t), st, rk, fastConfig(cfg))
	srv.Start()
	hs := httptest.NewServer(srv)
	t.Cleanup(func() {
		hs.Close()
		ctx, cancel := context.WithTimeout(context.Background(), 5*time.Second)
		defer cancel()
		_ = srv.Shutdown(ctx)
	})
	return srv, hs
}

// client sends requests with an optional API key.
type client struct {
	t    *testing.T
	base string
	key  string
}

type reply struct {
	status int
	header http.Header
	body   []byte
}

func (r reply) decode(t *testing.T, v any) {
	t.Helper()
	if err := json.Unmarshal(r.body, v); err != nil {
		t.Fatalf("decode %s: %v", r.body, err)
	}
}

func (c client) do(method, path string, body any, header ...string) reply {
	c.t.Helper()
	var rd io.Reader
	switch b := body.(type) {
	case nil:
	case string:
		rd = strings.NewReader(b)
	case []byte:
		rd = bytes.NewReader(b)
	default:
		j, err := json.Marshal(b)
		if err != nil {
			c.t.Fatal(err)
		}
		rd = bytes.NewReader(j)
	}
	req, err := http.NewRequest(method, c.base+path, rd)
	if err != nil {
		c.t.Fatal(err)
	}
	if rd != nil {
		req.Header.Set("Content-Type", "application/json")
	}
	if c.key != "" {
		req.Header.Set("Authorization", "Bearer "+c.key)
	}
	for i := 0; i+1 < len(header); i += 2 {
		req.Header.Set(header[i], header[i+1])
	}
	resp, err := http.DefaultClient.Do(req)
	if err != nil {
		c.t.Fatalf("%s %s: %v", method, path, err)
	}
	defer resp.Body.Close()
	b, err := io.ReadAll(resp.Body)
	if err != nil {
		c.t.Fatal(err)
	}
	return reply{status: resp.StatusCode, header: resp.Header, body: b}
}

// waitJob polls a job until it reaches a terminal state.
func (c client) waitJob(id string, timeout time.Duration) server.JobView {
	c.t.Helper()
	deadline := time.Now().Add(timeout)
	for {
		r := c.do("GET", "/v1/jobs/"+id, nil)
		if r.status != http.StatusOK {
			c.t.Fatalf("GET job %s: %d %s", id, r.status, r.body)
		}
		var j server.JobView
		r.decode(c.t, &j)
		if store.Status(j.Status).Terminal() {
			return j
		}
		if time.Now().After(deadline) {
			c.t.Fatalf("job %s still %s after %v", id, j.Status, timeout)
		}
		time.Sleep(20 * time.Millisecond)
	}
}

const ethanolPeaks = "3.69 (q, 2H), 1.22 (t, 3H), 2.6 (br s, 1H)"

func ethanolJob() map[string]any {
	return map[string]any{"formula": "C2H6O", "peaks": ethanolPeaks, "reference": "NB-0042-a"}
}

// postgresStore opens a PostgreSQL store in a fresh schema dropped at the
// end of the test.
func postgresStore(t *testing.T) testStore {
	t.Helper()
	base, schema := pgtest.Schema(t)
	ctx, cancel := context.WithTimeout(context.Background(), 30*time.Second)
	defer cancel()
	st, err := store.OpenSchema(ctx, base, schema)
	if err != nil {
		t.Fatalf("open PostgreSQL store: %v", err)
	}
	return st
}

// httptestRecorder serves one request in process.
func httptestRecorder(h http.Handler, method, path string) *httptest.ResponseRecorder {
	rec := httptest.NewRecorder()
	h.ServeHTTP(rec, httptest.NewRequest(method, path, nil))
	return rec
}

// fakeResolver answers callback host lookups from a table: each host has a
// list of answers, given in turn, the last one repeating; a host not in the
// table does not exist, and one mapped to nil answers a temporary failure.
type fakeResolver struct {
	mu      sync.Mutex
	answers map[string][][]netip.Addr
	calls   map[string]int
}

func newFakeResolver(answers map[string][]string) *fakeResolver {
	f := &fakeResolver{answers: map[string][][]netip.Addr{}, calls: map[string]int{}}
	for host, addrs := range answers {
		f.add(host, addrs...)
	}
	return f
}

// add appends one answer for host (nil addrs: a temporary failure).
func (f *fakeResolver) add(host string, addrs ...string) {
	f.mu.Lock()
	defer f.mu.Unlock()
	var ans []netip.Addr
	for _, a := range addrs {
		ans = append(ans, netip.MustParseAddr(a))
	}
	f.answers[host] = append(f.answers[host], ans)
}

func (f *fakeResolver) LookupNetIP(ctx context.Context, network, host string) ([]netip.Addr, error) {
	f.mu.Lock()
	defer f.mu.Unlock()
	list, ok := f.answers[host]
	if !ok {
		return nil, &net.DNSError{Err: "no such host", Name: host, IsNotFound: true}
	}
	n := f.calls[host]
	f.calls[host]++
	ans := list[min(n, len(list)-1)]
	if ans == nil {
		return nil, &net.DNSError{Err: "server misbehaving", Name: host, IsTemporary: true}
	}
	return ans, nil
}

// mustAllow parses callback-allow entries.
func mustAllow(t testing.TB, entries ...string) server.CallbackAllow {
	t.Helper()
	a, err := server.ParseCallbackAllow(entries)
	require.NoError(t, err)
	return a
}

// serve sends one request to h in process (no network, so that it works
// inside a testing/synctest bubble) and returns the reply.
func serve(h http.Handler, method, path string, body any, header ...string) reply {
	var rd io.Reader
	switch b := body.(type) {
	case nil:
	case string:
		rd = strings.NewReader(b)
	case []byte:
		rd = bytes.NewReader(b)
	case io.Reader:
		rd = b
	default:
		j, err := json.Marshal(b)
		if err != nil {
			panic(err)
		}
		rd = bytes.NewReader(j)
	}
	req := httptest.NewRequest(method, "http://127.0.0.1:8080"+path, rd)
	if rd != nil {
		req.Header.Set("Content-Type", "application/json")
	}
	for i := 0; i+1 < len(header); i += 2 {
		if header[i+1] == "" {
			req.Header.Del(header[i])
			continue
		}
		if header[i] == "Host" {
			req.Host = header[i+1]
			continue
		}
		req.Header.Set(header[i], header[i+1])
	}
	rec := httptest.NewRecorder()
	h.ServeHTTP(rec, req)
	return reply{status: rec.Code, header: rec.Header(), body: rec.Body.Bytes()}
}

// receiver counts the callbacks it gets.
type receiver struct {
	mu     sync.Mutex
	bodies [][]byte
	reqs   []*http.Request
}

func (rc *receiver) ServeHTTP(w http.ResponseWriter, r *http.Request) {
	body, _ := io.ReadAll(r.Body)
	rc.mu.Lock()
	rc.bodies = append(rc.bodies, body)
	rc.reqs = append(rc.reqs, r)
	rc.mu.Unlock()
	w.WriteHeader(http.StatusNoContent)
}

func (rc *receiver) count() int {
	rc.mu.Lock()
	defer rc.mu.Unlock()
	return len(rc.bodies)
}

// eventually polls cond every 20 ms until it holds. It sets no time limit
// of its own (the machine may be loaded): a hang ends with go test's
// -timeout, whose report names the waiting test.
func eventually(t *testing.T, what string, cond func() bool) {
	t.Helper()
	start := time.Now()
	next := 30 * time.Second
	for !cond() {
		time.Sleep(20 * time.Millisecond)
		if d := time.Since(start); d > next {
			t.Logf("still waiting: %s (%v)", what, d.Round(time.Second))
			next *= 2
		}
	}
}

// tcpProxy forwards connections to a target address until cut.
type tcpProxy struct {
	ln     net.Listener
	target string
	mu     sync.Mutex
	conns  []net.Conn
	closed bool
}

// postgresBehindProxy returns a URL of a fresh test schema reached through
// a TCP proxy, and the proxy, whose cut makes the database unreachable.
func postgresBehindProxy(t *testing.T) (string, *tcpProxy) {
	t.Helper()
	base, schema := pgtest.Schema(t)
	dsn := pgtest.WithSearchPath(t, base, schema)
	u, err := url.Parse(dsn)
	require.NoError(t, err, "the proxy test needs TEST_DATABASE_URL as a postgres:// URL")
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	require.NoError(t, err)
	p := &tcpProxy{ln: ln, target: u.Host}
	go p.accept()
	t.Cleanup(p.cut)
	u.Host = ln.Addr().String()
	return u.String(), p
}

func (p *tcpProxy) accept() {
	for {
		c, err := p.ln.Accept()
		if err != nil {
			return
		}
		up, err := net.Dial("tcp", p.target)
		if err != nil {
			c.Close()
			continue
		}
		p.mu.Lock()
		if p.closed {
			p.mu.Unlock()
			c.Close()
			up.Close()
			return
		}
		p.conns = append(p.conns, c, up)
		p.mu.Unlock()
		go func() { _, _ = io.Copy(up, c); up.Close() }()
		go func() { _, _ = io.Copy(c, up); c.Close() }()
	}
}

// cut closes the listener and every forwarded connection.
func (p *tcpProxy) cut() {
	p.mu.Lock()
	defer p.mu.Unlock()
	if p.closed {
		return
	}
	p.closed = true
	p.ln.Close()
	for _, c := range p.conns {
		c.Close()
	}
}
