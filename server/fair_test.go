package server_test

import (
	"context"
	"fmt"
	"io"
	"log/slog"
	"net/http"
	"os"
	"runtime"
	"strconv"
	"strings"
	"sync"
	"testing"
	"testing/synctest"
	"time"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"shiftrank/ranker"
	"shiftrank/server"
	"shiftrank/spectrum"
	"shiftrank/store"
)

// sleepRanker takes a fixed (fake, under synctest) time per job and records
// when each formula's jobs started.
type sleepRanker struct {
	d      time.Duration
	mu     sync.Mutex
	starts map[string][]time.Time
}

func (r *sleepRanker) Rank(ctx context.Context, req ranker.Request, progress func(ranker.Progress)) (*ranker.Result, error) {
	if err := ctx.Err(); err != nil {
		return nil, err // a submission-time check
	}
	r.mu.Lock()
	r.starts[req.Formula] = append(r.starts[req.Formula], time.Now())
	r.mu.Unlock()
	t := time.NewTimer(r.d)
	defer t.Stop()
	select {
	case <-ctx.Done():
		return nil, ctx.Err()
	case <-t.C:
	}
	return &ranker.Result{Formula: req.Formula, IsomersTotal: 1, Scored: 1, Complete: true,
		Candidates: []ranker.Candidate{{Rank: 1, SMILES: "CCO", Probability: 1}}, Warnings: []string{}}, nil
}

func (r *sleepRanker) started(formula string) []time.Time {
	r.mu.Lock()
	defer r.mu.Unlock()
	return append([]time.Time(nil), r.starts[formula]...)
}

// TestFairShare: key A floods the queue with 40 jobs of 10 s each on two
// workers; key B's one job, submitted behind them, starts as soon as one
// worker is free, not after A's flood (first come, first served would keep
// it waiting 190 s). While A holds its share of the synchronous slots, A
// gets 429 and B's synchronous calls succeed. Time is the fake clock of
// testing/synctest.
func TestFairShare(t *testing.T) {
	synctest.Test(t, func(t *testing.T) {
		ctx := context.Background()
		st := store.NewMemory()
		keyA, _, err := st.CreateAPIKey(ctx, "eln-flood")
		require.NoError(t, err)
		keyB, _, err := st.CreateAPIKey(ctx, "eln-small")
		require.NoError(t, err)
		const jobLen, workers, flood = 10 * time.Second, 2, 40
		rk := &sleepRanker{d: jobLen, starts: map[string][]time.Time{}}
		srv := server.New(quietLogger(t), st, rk, fastConfig(server.Config{Workers: workers, MaxSyncRequests: 2}))
		srv.Start()
		defer func() {
			sctx, cancel := context.WithTimeout(ctx, time.Second)
			defer cancel()
			_ = srv.Shutdown(sctx)
		}()
		a, b := []string{"Authorization", "Bearer " + keyA}, []string{"Authorization", "Bearer " + keyB}

		for i := range flood {
			job := ethanolJob()
			job["reference"] = fmt.Sprintf("FLOOD-%02d", i)
			require.Equal(t, http.StatusAccepted, serve(srv, "POST", "/v1/jobs", job, a...).status)
		}
		time.Sleep(time.Second) // both workers busy with A's jobs
		require.Len(t, rk.started("C2H6O"), workers)

		submitted := time.Now()
		small := map[string]any{"formula": "C3H8O", "peaks": "3.59 (t, 2H), 2.2 (br s, 1H), 1.57 (sext, 2H), 0.93 (t, 3H)"}
		require.Equal(t, http.StatusAccepted, serve(srv, "POST", "/v1/jobs", small, b...).status)
		for len(rk.started("C3H8O")) == 0 {
			time.Sleep(100 * time.Millisecond)
		}
		wait := rk.started("C3H8O")[0].Sub(submitted)
		fifo := time.Duration(flood-workers)/workers*jobLen + jobLen - time.Second
		t.Logf("key B's job waited %v behind %d queued jobs of key A (%d workers, %v per job; first come, first served: %v)", wait, flood-workers, workers, jobLen, fifo)
		assert.LessOrEqual(t, wait, jobLen, "B's job must start once one of A's running jobs ends")

		// Synchronous share: MaxSyncRequests 2 gives each key 1. A holds its
		// one with a request whose body is still arriving.
		pr, pw := io.Pipe()
		held := make(chan int, 1)
		go func() { held <- serve(srv, "POST", "/v1/predict", pr, a...).status }()
		synctest.Wait()
		r := serve(srv, "POST", "/v1/predict", map[string]any{"smiles": "CCO"}, a...)
		assert.Equal(t, http.StatusTooManyRequests, r.status, "A over its share: %s", r.body)
		assert.Equal(t, server.CodeRateLimited, problemOf(t, r).Code)
		assert.Equal(t, "1", r.header.Get("Retry-After"))
		for i := range 5 {
			r := serve(srv, "POST", "/v1/predict", map[string]any{"smiles": "CCOC(C)=O"}, b...)
			assert.Equal(t, http.StatusOK, r.status, "B's synchronous call %d while A holds its share: %s", i, r.body)
		}
		_, _ = pw.Write([]byte(`{"smiles":"CCO"}`))
		pw.Close()
		assert.Equal(t, http.StatusOK, <-held)
	})
}

// TestQueueShare: a key with MaxQueuedPerKey jobs waiting gets 429 with
// Retry-After and problem details; another key is not affected; the refusals
// are logged once, with a count, not once per request.
func TestQueueShare(t *testing.T) {
	forEachStore(t, func(t *testing.T, st testStore) {
		ctx := context.Background()
		keyA, _, err := st.CreateAPIKey(ctx, "eln-a")
		require.NoError(t, err)
		keyB, _, err := st.CreateAPIKey(ctx, "eln-b")
		require.NoError(t, err)
		var logs syncLog
		srv := server.New(logs.logger(), st, &fakeRanker{}, fastConfig(server.Config{Workers: -1, MaxQueuedPerKey: 5}))
		a, b := []string{"Authorization", "Bearer " + keyA}, []string{"Authorization", "Bearer " + keyB}
		for i := range 5 {
			require.Equal(t, http.StatusAccepted, serve(srv, "POST", "/v1/jobs", ethanolJob(), a...).status, "job %d", i)
		}
		for range 20 {
			r := serve(srv, "POST", "/v1/jobs", ethanolJob(), a...)
			require.Equal(t, http.StatusTooManyRequests, r.status, "%s", r.body)
			p := problemOf(t, r)
			assert.Equal(t, server.CodeRateLimited, p.Code)
			secs, err := strconv.Atoi(r.header.Get("Retry-After"))
			assert.True(t, err == nil && secs > 0, "Retry-After %q", r.header.Get("Retry-After"))
		}
		assert.Equal(t, http.StatusAccepted, serve(srv, "POST", "/v1/jobs", ethanolJob(), b...).status, "another key")
		assert.Equal(t, 1, logs.count("queue is full"), "throttling logged once per interval:\n%s", logs.String())
	})
}

// syncLog collects log output.
type syncLog struct {
	mu sync.Mutex
	b  strings.Builder
}

func (l *syncLog) Write(p []byte) (int, error) {
	l.mu.Lock()
	defer l.mu.Unlock()
	return l.b.Write(p)
}

func (l *syncLog) String() string {
	l.mu.Lock()
	defer l.mu.Unlock()
	return l.b.String()
}

func (l *syncLog) count(s string) int { return strings.Count(l.String(), s) }

func (l *syncLog) logger() *slog.Logger { return slog.New(slog.NewTextHandler(l, nil)) }

// TestRetention: finished jobs older than Config.Retention are deleted by
// the periodic sweep; newer ones stay.
func TestRetention(t *testing.T) {
	synctest.Test(t, func(t *testing.T) {
		ctx := context.Background()
		st := store.NewMemory()
		srv := server.New(quietLogger(t), st, &fakeRanker{}, fastConfig(server.Config{AllowAnonymous: true, Workers: 1,
			Retention: time.Hour, RetentionSweep: 10 * time.Minute}))
		srv.Start()
		defer func() {
			sctx, cancel := context.WithTimeout(ctx, time.Second)
			defer cancel()
			_ = srv.Shutdown(sctx)
		}()
		submit := func() string {
			var j server.JobView
			r := serve(srv, "POST", "/v1/jobs", ethanolJob())
			require.Equal(t, http.StatusAccepted, r.status)
			r.decode(t, &j)
			return j.ID
		}
		old := submit()
		time.Sleep(50 * time.Minute)
		recent := submit()
		time.Sleep(30 * time.Minute) // old finished 80 min ago, recent 30
		assert.Equal(t, http.StatusNotFound, serve(srv, "GET", "/v1/jobs/"+old, nil).status, "a job finished 80 min ago, retention 1 h")
		assert.Equal(t, http.StatusOK, serve(srv, "GET", "/v1/jobs/"+recent, nil).status, "a job finished 30 min ago")
	})
}

// TestMemoryBound: 5,000 jobs, each with the real result of a ranking
// (C4H8O2, top 10: about 44 KB of JSON), finish on the in-memory store
// with its default bound of store.DefaultMaxFinished finished jobs; the
// live heap stays under 32 MiB (measured: 9.7 MiB; without the bound the
// same 5,000 jobs hold 45 MiB, and their results uncompressed would be
// 220 MB).
func TestMemoryBound(t *testing.T) {
	if testing.Short() {
		t.Skip("runs 5,000 jobs; skipped with -short")
	}
	pl, err := spectrum.ReadList([]byte("4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H), 1.26 (t, J = 7.1 Hz, 3H)"), spectrum.H1)
	require.NoError(t, err)
	res, err := ranker.New(ranker.Options{Workers: 1}).Rank(context.Background(), ranker.Request{Formula: "C4H8O2", Peaks: pl, TopK: 10}, nil)
	require.NoError(t, err)
	rk := fixedRanker{res}
	st := store.NewMemory()
	srv := server.New(quietLogger(t), st, rk, fastConfig(server.Config{AllowAnonymous: true, Workers: 4, MaxQueuedPerKey: -1}))
	srv.Start()
	defer func() {
		ctx, cancel := context.WithTimeout(context.Background(), 5*time.Second)
		defer cancel()
		_ = srv.Shutdown(ctx)
	}()
	heap0 := liveHeap()
	const jobs = 5000
	var last string
	for i := range jobs {
		job := map[string]any{"formula": "C4H8O2", "peaks": "4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H), 1.26 (t, J = 7.1 Hz, 3H)",
			"reference": fmt.Sprintf("MEM-%04d", i)}
		r := serve(srv, "POST", "/v1/jobs", job)
		require.Equal(t, http.StatusAccepted, r.status, "%s", r.body)
		var j server.JobView
		r.decode(t, &j)
		last = j.ID
	}
	eventually(t, "all jobs finished", func() bool {
		j, err := st.GetJob(context.Background(), "", last)
		if err != nil || !j.Status.Terminal() {
			return false
		}
		l, _, err := st.ListJobs(context.Background(), "", 1000, "")
		return err == nil && len(l) > 0 && l[len(l)-1].Status.Terminal()
	})
	l, next, err := st.ListJobs(context.Background(), "", store.MaxListLimit, "")
	require.NoError(t, err)
	heap := liveHeap()
	t.Logf("%d jobs finished; %d kept (next page %q); live heap %.1f MiB (%.1f MiB before), RSS %s",
		jobs, len(l), next, float64(heap)/(1<<20), float64(heap0)/(1<<20), rss())
	assert.Equal(t, store.DefaultMaxFinished, len(l), "finished jobs kept")
	assert.Less(t, heap, uint64(32<<20), "live heap after 5,000 finished jobs")
	r := serve(srv, "GET", "/v1/jobs/"+last+"/candidates?limit=3", nil)
	assert.Equal(t, http.StatusOK, r.status, "the newest result is still there: %s", r.body)
}

// fixedRanker returns the same result for every job.
type fixedRanker struct{ res *ranker.Result }

func (f fixedRanker) Rank(ctx context.Context, req ranker.Request, progress func(ranker.Progress)) (*ranker.Result, error) {
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	return f.res, nil
}

// liveHeap returns the bytes of live heap objects after a collection.
func liveHeap() uint64 {
	runtime.GC()
	var m runtime.MemStats
	runtime.ReadMemStats(&m)
	return m.HeapAlloc
}

// rss returns the process's resident set size from /proc, or "unknown".
func rss() string {
	b, err := os.ReadFile("/proc/self/status")
	if err != nil {
		return "unknown"
	}
	for _, line := range strings.Split(string(b), "\n") {
		if v, ok := strings.CutPrefix(line, "VmRSS:"); ok {
			return strings.TrimSpace(v)
		}
	}
	return "unknown"
}
