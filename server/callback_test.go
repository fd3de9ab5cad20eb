package server_test

import (
	"context"
	"encoding/json"
	"io"
	"net/http"
	"net/http/httptest"
	"sync"
	"sync/atomic"
	"testing"
	"time"

	"shiftrank/server"
	"shiftrank/store"
)

// switchReceiver is a callback receiver that is "down" (it drops the
// connection without an answer) until up is set; once up it verifies each
// signature and answers 204.
type switchReceiver struct {
	secret []byte
	up     atomic.Bool

	mu       sync.Mutex
	dropped  int
	badSig   int
	received []server.CallbackPayload
}

func (rc *switchReceiver) ServeHTTP(w http.ResponseWriter, r *http.Request) {
	body, _ := io.ReadAll(r.Body)
	rc.mu.Lock()
	defer rc.mu.Unlock()
	if !rc.up.Load() {
		rc.dropped++
		panic(http.ErrAbortHandler) // the connection closes with no response
	}
	if !signedBy(rc.secret, r, body) {
		rc.badSig++
		http.Error(w, "bad signature", http.StatusUnauthorized)
		return
	}
	var p server.CallbackPayload
	_ = json.Unmarshal(body, &p)
	rc.received = append(rc.received, p)
	w.WriteHeader(http.StatusNoContent)
}

func (rc *switchReceiver) counts() (dropped, bad int, got []server.CallbackPayload) {
	rc.mu.Lock()
	defer rc.mu.Unlock()
	return rc.dropped, rc.badSig, append([]server.CallbackPayload(nil), rc.received...)
}

// TestCallbackResumedByAnotherServer: a job finishes while its callback
// receiver is down; the server that ran it stops mid-retry. Two other
// servers on the same store sweep for unsettled callbacks: exactly one of
// them delivers it, signed, with the attempt count continued from the
// deliveries recorded by the first.
func TestCallbackResumedByAnotherServer(t *testing.T) {
	forEachStore(t, func(t *testing.T, st testStore) {
		ctx := context.Background()
		key, k, err := st.CreateAPIKey(ctx, "eln-callbacks")
		if err != nil {
			t.Fatal(err)
		}
		rc := &switchReceiver{secret: k.Secret}
		recv := httptest.NewServer(rc)
		defer recv.Close()

		cfg := server.Config{
			CallbackAttempts: 4,
			CallbackTimeout:  300 * time.Millisecond,
			CallbackSweep:    50 * time.Millisecond,
		}
		// fastConfig's 20 ms back-off, raised so that the first server is
		// stopped between its attempts.
		firstCfg := fastConfig(cfg)
		firstCfg.CallbackBackoff = 150 * time.Millisecond
		first := server.New(quietLogger(t), st, &fakeRanker{}, firstCfg)
		first.Start()
		hs := httptest.NewServer(first)
		defer hs.Close()
		c := client{t: t, base: hs.URL, key: key}
		job := ethanolJob()
		job["callback_url"] = recv.URL + "/hook"
		var j server.JobView
		if r := c.do("POST", "/v1/jobs", job); r.status != http.StatusAccepted {
			t.Fatalf("POST = %d %s", r.status, r.body)
		} else {
			r.decode(t, &j)
		}
		var ds []store.Delivery
		for deadline := time.Now().Add(10 * time.Second); len(ds) == 0; time.Sleep(5 * time.Millisecond) {
			if time.Now().After(deadline) {
				t.Fatal("no delivery attempt recorded within 10 s")
			}
			ds, _ = st.Deliveries(ctx, j.ID)
		}
		// Stop the first server with no grace: its retries are abandoned.
		stopped, cancel := context.WithCancel(ctx)
		cancel()
		_ = first.Shutdown(stopped)
		ds, err = st.Deliveries(ctx, j.ID)
		if err != nil {
			t.Fatal(err)
		}
		tried := len(ds)
		if tried == 0 || tried >= cfg.CallbackAttempts {
			t.Fatalf("first server recorded %d deliveries, want between 1 and %d", tried, cfg.CallbackAttempts-1)
		}
		for i, d := range ds {
			if d.Attempt != i+1 || d.StatusCode != 0 || d.Error == "" {
				t.Errorf("delivery %d of the first server = %+v, want attempt %d with a transport error", i, d, i+1)
			}
		}
		if got, _ := st.GetJob(ctx, k.ID, j.ID); got.CallbackDone {
			t.Fatal("callback marked done although the receiver never answered")
		}

		rc.up.Store(true)
		for range 2 {
			other := server.New(quietLogger(t), st, &fakeRanker{}, fastConfig(server.Config{
				Workers:          -1,
				CallbackAttempts: cfg.CallbackAttempts,
				CallbackTimeout:  cfg.CallbackTimeout,
				CallbackSweep:    cfg.CallbackSweep,
			}))
			other.Start()
			t.Cleanup(func() {
				ctx, cancel := context.WithTimeout(context.Background(), 5*time.Second)
				defer cancel()
				_ = other.Shutdown(ctx)
			})
		}
		deadline := time.Now().Add(15 * time.Second)
		for {
			if _, _, got := rc.counts(); len(got) > 0 {
				break
			}
			if time.Now().After(deadline) {
				t.Fatal("no resumed callback within 15 s")
			}
			time.Sleep(10 * time.Millisecond)
		}
		time.Sleep(300 * time.Millisecond) // several more sweeps: none may send it again
		_, bad, got := rc.counts()
		if bad != 0 || len(got) != 1 {
			t.Fatalf("receiver got %d good and %d badly signed callbacks; want exactly 1 good one", len(got), bad)
		}
		if p := got[0]; p.Attempt != tried+1 || p.Job.ID != j.ID || p.Job.Status != store.StatusSucceeded || p.Job.Reference != "NB-0042-a" {
			t.Errorf("resumed payload = %+v, want attempt %d for succeeded job %s", p, tried+1, j.ID)
		}
		ds, err = st.Deliveries(ctx, j.ID)
		if err != nil || len(ds) != tried+1 {
			t.Fatalf("deliveries = %+v, %v; want %d (the first server's and one resumed)", ds, err, tried+1)
		}
		if last := ds[tried]; last.Attempt != tried+1 || last.StatusCode != http.StatusNoContent {
			t.Errorf("resumed delivery = %+v, want attempt %d answered 204", last, tried+1)
		}
		if got, _ := st.GetJob(ctx, k.ID, j.ID); !got.CallbackDone {
			t.Error("callback not marked done after it was delivered")
		}
	})
}

// TestCallbackSettledWhenAttemptsRecordedExhausted: a sweep that finds the
// attempts already used up marks the callback done without sending it.
func TestCallbackSettledWhenAttemptsRecordedExhausted(t *testing.T) {
	st := store.NewMemory()
	ctx := context.Background()
	key, k, err := st.CreateAPIKey(ctx, "eln")
	if err != nil {
		t.Fatal(err)
	}
	var hits atomic.Int32
	recv := httptest.NewServer(http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		hits.Add(1)
		w.WriteHeader(http.StatusServiceUnavailable)
	}))
	defer recv.Close()
	cfg := server.Config{CallbackAttempts: 2, CallbackTimeout: 200 * time.Millisecond, CallbackSweep: 20 * time.Millisecond}
	_, hs := startServer(t, st, &fakeRanker{}, cfg)
	c := client{t: t, base: hs.URL, key: key}
	job := ethanolJob()
	job["callback_url"] = recv.URL
	var j server.JobView
	c.do("POST", "/v1/jobs", job).decode(t, &j)
	for deadline := time.Now().Add(5 * time.Second); ; time.Sleep(10 * time.Millisecond) {
		if got, _ := st.GetJob(ctx, k.ID, j.ID); got.CallbackDone {
			break
		}
		if time.Now().After(deadline) {
			t.Fatal("callback not settled after its attempts ran out")
		}
	}
	time.Sleep(200 * time.Millisecond) // sweeps go on; none may resend it
	if n := hits.Load(); n != 2 {
		t.Errorf("receiver hit %d times, want 2 (CallbackAttempts)", n)
	}
	if pending, err := st.PendingCallbacks(ctx, 0, 0); err != nil || len(pending) != 0 {
		t.Errorf("PendingCallbacks = %d jobs, %v; want none", len(pending), err)
	}
}
