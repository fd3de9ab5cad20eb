package server_test

import (
	"context"
	"encoding/json"
	"fmt"
	"net/http"
	"net/http/httptest"
	"sync/atomic"
	"testing"
	"time"

	"shiftrank/server"
	"shiftrank/store"
)

// leaseLostStore loses every lease at the first renewal, as when another
// worker has taken the job over.
type leaseLostStore struct {
	*store.Memory
	finishes atomic.Int32
}

func (s *leaseLostStore) RenewLease(ctx context.Context, id, workerID string, lease time.Duration) error {
	return fmt.Errorf("renew %s: %w", id, store.ErrLeaseLost)
}

func (s *leaseLostStore) FinishJob(ctx context.Context, id, workerID string, status store.Status, msg string, res *store.Result) error {
	s.finishes.Add(1)
	return s.Memory.FinishJob(ctx, id, workerID, status, msg, res)
}

func TestLostLeaseStopsTheJob(t *testing.T) {
	st := &leaseLostStore{Memory: store.NewMemory()}
	rk := &fakeRanker{block: true}
	_, hs := startServer(t, st, rk, server.Config{AllowAnonymous: true, Workers: 1})
	c := client{t: t, base: hs.URL}
	var j server.JobView
	c.do("POST", "/v1/jobs", ethanolJob()).decode(t, &j)
	// The lease (2 s in tests) is renewed after a third of it; the worker
	// must then stop ranking and write nothing.
	deadline := time.Now().Add(5 * time.Second)
	for rk.Calls() == 0 || !rk.stopped() {
		if time.Now().After(deadline) {
			t.Fatal("the ranking did not stop after the lease was lost")
		}
		time.Sleep(20 * time.Millisecond)
	}
	time.Sleep(100 * time.Millisecond)
	if n := st.finishes.Load(); n != 0 {
		t.Errorf("FinishJob called %d times by a worker that lost its lease", n)
	}
}

func TestCallbackRetriesAreBounded(t *testing.T) {
	for _, tc := range []struct {
		name     string
		status   int
		attempts int
	}{
		{"server error is retried up to the limit", http.StatusInternalServerError, 3},
		{"rate limit is retried", http.StatusTooManyRequests, 3},
		{"client error is final", http.StatusBadRequest, 1},
		{"redirect is not followed", http.StatusFound, 3},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var hits atomic.Int32
			recv := httptest.NewServer(http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
				hits.Add(1)
				if tc.status == http.StatusFound {
					w.Header().Set("Location", "http://127.0.0.1:1/elsewhere")
				}
				w.WriteHeader(tc.status)
			}))
			defer recv.Close()
			st := store.NewMemory()
			key, _, err := st.CreateAPIKey(context.Background(), "eln")
			if err != nil {
				t.Fatal(err)
			}
			_, hs := startServer(t, st, &fakeRanker{}, server.Config{CallbackAttempts: 3})
			c := client{t: t, base: hs.URL, key: key}
			job := ethanolJob()
			job["callback_url"] = recv.URL
			var j server.JobView
			c.do("POST", "/v1/jobs", job).decode(t, &j)
			var ds []store.Delivery
			for deadline := time.Now().Add(5 * time.Second); time.Now().Before(deadline); time.Sleep(20 * time.Millisecond) {
				ds, _ = st.Deliveries(context.Background(), j.ID)
				if len(ds) >= tc.attempts {
					break
				}
			}
			time.Sleep(200 * time.Millisecond) // no further attempt may follow
			ds, _ = st.Deliveries(context.Background(), j.ID)
			if len(ds) != tc.attempts || int(hits.Load()) != tc.attempts {
				t.Fatalf("%d deliveries recorded, %d received; want %d", len(ds), hits.Load(), tc.attempts)
			}
			for i, d := range ds {
				if d.Attempt != i+1 || d.StatusCode != tc.status || d.URL != recv.URL {
					t.Errorf("delivery %d = %+v", i, d)
				}
			}
		})
	}
}

func TestOpenAPIServersFollowBaseURL(t *testing.T) {
	srv := server.New(quietLogger(t), store.NewMemory(), &fakeRanker{}, server.Config{BaseURL: "https://nmr.example.org/"})
	rec := httptestRecorder(srv, "GET", "/v1/openapi.json")
	var doc struct {
		Servers []struct{ URL string } `json:"servers"`
	}
	if err := json.Unmarshal(rec.Body.Bytes(), &doc); err != nil {
		t.Fatal(err)
	}
	if len(doc.Servers) != 1 || doc.Servers[0].URL != "https://nmr.example.org" {
		t.Errorf("servers = %+v, want the base URL", doc.Servers)
	}
}

// progressCountingStore counts progress writes.
type progressCountingStore struct {
	*store.Memory
	writes atomic.Int32
}

func (s *progressCountingStore) UpdateProgress(ctx context.Context, id, workerID string, p store.Progress) error {
	s.writes.Add(1)
	return s.Memory.UpdateProgress(ctx, id, workerID, p)
}

// TestProgressWritesThrottled: the ranker reports progress every 10 ms, but
// the store sees at most one write per ProgressEvery.
func TestProgressWritesThrottled(t *testing.T) {
	st := &progressCountingStore{Memory: store.NewMemory()}
	rk := &fakeRanker{block: true}
	cfg := fastConfig(server.Config{AllowAnonymous: true, Workers: 1})
	cfg.ProgressEvery = 250 * time.Millisecond
	srv := server.New(quietLogger(t), st, rk, cfg)
	srv.Start()
	hs := httptest.NewServer(srv)
	defer hs.Close()
	c := client{t: t, base: hs.URL}
	var j server.JobView
	c.do("POST", "/v1/jobs", ethanolJob()).decode(t, &j)
	for deadline := time.Now().Add(5 * time.Second); rk.Calls() == 0; time.Sleep(5 * time.Millisecond) {
		if time.Now().After(deadline) {
			t.Fatal("job never started")
		}
	}
	const run = 1500 * time.Millisecond
	time.Sleep(run)
	n := st.writes.Load()
	c.do("GET", "/v1/jobs/"+j.ID, nil).decode(t, &j)
	ctx, cancel := context.WithTimeout(context.Background(), 100*time.Millisecond)
	defer cancel()
	_ = srv.Shutdown(ctx) // hands the job back
	if most := int32(run/cfg.ProgressEvery) + 1; n < 2 || n > most {
		t.Errorf("%d progress writes in %v with ProgressEvery %v (ranker reporting every 10 ms); want 2..%d", n, run, cfg.ProgressEvery, most)
	}
	if j.Progress.Generated == 0 {
		t.Errorf("progress %+v never reached the store", j.Progress)
	}
}
