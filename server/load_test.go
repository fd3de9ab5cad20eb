package server_test

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"io"
	"net/http"
	"net/http/httptest"
	"os"
	"slices"
	"strconv"
	"sync"
	"testing"
	"time"

	"shiftrank/server"
	"shiftrank/store"
	"shiftrank/store/pgtest"
)

// TestLoad submits SHIFTRANK_LOAD_JOBS small jobs (default 60, e.g. 300) from
// concurrent clients to two serve processes sharing one PostgreSQL schema,
// over loopback only, and prints throughput and the p50/p95/p99 latency of
// submission and of completion (submit to signed callback). It checks that
// every job finished exactly once. Run it with
//
//	SHIFTRANK_LOAD_JOBS=300 TEST_DATABASE_URL=postgres://postgres@127.0.0.1:5432/test?sslmode=disable \
//	    go test -run TestLoad -v ./server
//
// It is bounded: at most 2000 jobs, 32 clients and 5 minutes. Without
// SHIFTRANK_LOAD_JOBS it runs 60 jobs, so every test run checks the
// exactly-once property across two processes.
func TestLoad(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the binary and runs two servers; skipped with -short")
	}
	n, _ := strconv.Atoi(os.Getenv("SHIFTRANK_LOAD_JOBS"))
	if n <= 0 {
		n = 60
	}
	n = min(n, 2000)
	clients := 16
	if c, _ := strconv.Atoi(os.Getenv("SHIFTRANK_LOAD_CLIENTS")); c > 0 {
		clients = min(c, 32)
	}
	const limit = 5 * time.Minute
	dsn := pgtest.URL(t)
	bin := buildBinary(t)
	key := createKey(t, bin, dsn, "load-test")
	st, err := store.Open(context.Background(), dsn)
	if err != nil {
		t.Fatal(err)
	}
	defer st.Close()
	k, err := st.LookupAPIKey(context.Background(), key)
	if err != nil {
		t.Fatal(err)
	}

	// The receiver checks each callback's signature and notes when it came.
	var (
		mu      sync.Mutex
		arrived = map[string]time.Time{}
		dups    int
		badSig  int
	)
	all := make(chan struct{})
	recv := httptest.NewServer(http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		body, _ := io.ReadAll(r.Body)
		now := time.Now()
		mu.Lock()
		defer mu.Unlock()
		if !signedBy(k.Secret, r, body) {
			badSig++
			w.WriteHeader(http.StatusUnauthorized)
			return
		}
		var p server.CallbackPayload
		_ = json.Unmarshal(body, &p)
		if _, seen := arrived[p.Job.ID]; seen {
			dups++
		} else {
			arrived[p.Job.ID] = now
			if len(arrived) == n {
				close(all)
			}
		}
		w.WriteHeader(http.StatusNoContent)
	}))
	defer recv.Close()

	// The receiver is on loopback; one key submits every job, so its queue
	// is not bounded here.
	args := []string{"--workers", "2", "--time-budget", "20s", "--callback-allow", "127.0.0.1", "--max-queued-per-key", "-1"}
	procs := []*serveProc{
		startServe(t, bin, dsn, "serve A", args...),
		startServe(t, bin, dsn, "serve B", args...),
	}

	type sub struct {
		id      string
		start   time.Time
		latency time.Duration
	}
	subs := make([]sub, n)
	next := make(chan int)
	var wg sync.WaitGroup
	t0 := time.Now()
	httpc := &http.Client{Timeout: 30 * time.Second}
	var failMu sync.Mutex
	var failures []string
	for c := range clients {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range next {
				u := loadMix[i%len(loadMix)]
				body, _ := json.Marshal(map[string]any{
					"formula": u.formula, "peaks": u.peaks,
					"reference": fmt.Sprintf("LOAD-%04d", i), "callback_url": recv.URL + "/hook",
				})
				req, _ := http.NewRequest("POST", procs[(i+c)%2].base+"/v1/jobs", bytes.NewReader(body))
				req.Header.Set("Content-Type", "application/json")
				req.Header.Set("Authorization", "Bearer "+key)
				start := time.Now()
				resp, err := httpc.Do(req)
				if err != nil {
					failMu.Lock()
					failures = append(failures, err.Error())
					failMu.Unlock()
					continue
				}
				var j server.JobView
				_ = json.NewDecoder(resp.Body).Decode(&j)
				resp.Body.Close()
				if resp.StatusCode != http.StatusAccepted {
					failMu.Lock()
					failures = append(failures, fmt.Sprintf("job %d: status %d", i, resp.StatusCode))
					failMu.Unlock()
					continue
				}
				subs[i] = sub{id: j.ID, start: start, latency: time.Since(start)}
			}
		}()
	}
	for i := range n {
		next <- i
	}
	close(next)
	wg.Wait()
	submitted := time.Since(t0)
	if len(failures) > 0 {
		t.Fatalf("%d submissions failed, e.g. %s", len(failures), failures[0])
	}
	select {
	case <-all:
	case <-time.After(limit):
		mu.Lock()
		got := len(arrived)
		mu.Unlock()
		t.Fatalf("only %d of %d jobs called back within %v", got, n, limit)
	}
	total := time.Since(t0)

	mu.Lock()
	defer mu.Unlock()
	var submitLat, doneLat []time.Duration
	for _, s := range subs {
		submitLat = append(submitLat, s.latency)
		doneLat = append(doneLat, arrived[s.id].Sub(s.start))
	}
	// Every job finished exactly once: one claim, one terminal status.
	ctx := context.Background()
	byWorker := map[string]int{}
	for _, s := range subs {
		hist, err := st.History(ctx, k.ID, s.id)
		if err != nil {
			t.Fatal(err)
		}
		claims, terminal := 0, 0
		for _, h := range hist {
			switch {
			case h.Status == store.StatusRunning:
				claims++
				byWorker[h.Worker]++
			case h.Status == store.StatusSucceeded:
				terminal++
			case h.Status.Terminal():
				t.Errorf("job %s ended %s", s.id, h.Status)
			}
		}
		if claims != 1 || terminal != 1 {
			t.Errorf("job %s: %d claims and %d successes, want exactly 1 of each", s.id, claims, terminal)
		}
	}
	if dups > 0 || badSig > 0 {
		t.Errorf("%d duplicate callbacks, %d with a bad signature", dups, badSig)
	}
	report := fmt.Sprintf("load: %d jobs (C2H6O, C3H8O, C4H8O2 in turn), %d clients, 2 serve processes x 2 workers, one PostgreSQL schema\n"+
		"  submit:     %.0f jobs/s over %v; latency p50 %v  p95 %v  p99 %v\n"+
		"  completion: %.1f jobs/s over %v (submit to callback); latency p50 %v  p95 %v  p99 %v\n"+
		"  claims per worker: %v; every job finished exactly once: %v",
		n, clients,
		float64(n)/submitted.Seconds(), submitted.Round(time.Millisecond),
		pct(submitLat, 50), pct(submitLat, 95), pct(submitLat, 99),
		float64(n)/total.Seconds(), total.Round(time.Millisecond),
		pct(doneLat, 50), pct(doneLat, 95), pct(doneLat, 99),
		byWorker, !t.Failed())
	t.Log(report)
	fmt.Println(report)
}

// loadMix are the unknowns the load test submits in turn: small formulas
// (2 to 56 isomers), so that the figures measure the service, not the
// ranking of a large isomer space.
var loadMix = []struct{ formula, peaks string }{
	{"C2H6O", ethanolPeaks},
	{"C3H8O", "4.01 (sept, J = 6.1 Hz, 1H), 1.20 (d, J = 6.1 Hz, 6H), 1.6 (br s, 1H)"},
	{"C4H8O2", "4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H), 1.26 (t, J = 7.1 Hz, 3H)"},
}

// pct returns the p-th percentile (nearest rank) of ds.
func pct(ds []time.Duration, p int) time.Duration {
	s := slices.Clone(ds)
	slices.Sort(s)
	if len(s) == 0 {
		return 0
	}
	i := (p*len(s)+99)/100 - 1
	d := s[max(0, min(i, len(s)-1))]
	if d >= time.Second {
		return d.Round(10 * time.Millisecond)
	}
	return d.Round(100 * time.Microsecond)
}
