package store_test

import (
	"bufio"
	"context"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"os"
	"os/exec"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/jackc/pgx/v5"

	"shiftrank/store"
	"shiftrank/store/pgtest"
	"shiftrank/store/storetest"
)

// openPostgres opens a store in a fresh schema of TEST_DATABASE_URL.
func openPostgres(t *testing.T) *store.Postgres {
	t.Helper()
	url := pgtest.URL(t)
	ctx, cancel := context.WithTimeout(context.Background(), 30*time.Second)
	defer cancel()
	p, err := store.Open(ctx, url)
	if err != nil {
		t.Fatalf("Open: %v", err)
	}
	return p
}

func TestPostgres(t *testing.T) {
	pgtest.BaseURL(t) // skip (or fail in CI) once, not per subtest
	storetest.Run(t, func(t *testing.T) storetest.Store { return openPostgres(t) })
}

func TestPostgresLimits(t *testing.T) {
	pgtest.BaseURL(t)
	storetest.RunLimits(t, func(t *testing.T, opts ...store.Option) storetest.Store {
		p, err := store.Open(context.Background(), pgtest.URL(t), opts...)
		if err != nil {
			t.Fatalf("Open: %v", err)
		}
		return p
	})
}

func TestPostgresAttemptLimit(t *testing.T) {
	pgtest.BaseURL(t)
	testAttemptLimit(t, func(t *testing.T, opts ...store.Option) storetest.Store {
		p, err := store.Open(context.Background(), pgtest.URL(t), opts...)
		if err != nil {
			t.Fatalf("Open: %v", err)
		}
		return p
	})
}

// TestPostgresFinishRollsBack checks that FinishJob is one transaction: when
// the result insert fails inside the database (a CHECK constraint the test
// adds refuses it), the status update and history row written before it
// are rolled back too.
func TestPostgresFinishRollsBack(t *testing.T) {
	base, schema := pgtest.Schema(t)
	ctx := context.Background()
	p, err := store.OpenSchema(ctx, base, schema)
	if err != nil {
		t.Fatal(err)
	}
	defer p.Close()
	conn, err := pgx.Connect(ctx, pgtest.WithSearchPath(t, base, schema))
	if err != nil {
		t.Fatal(err)
	}
	defer conn.Close(ctx)
	if _, err := conn.Exec(ctx, `ALTER TABLE job_results ADD CONSTRAINT test_refuse CHECK (NOT result ? 'refuse')`); err != nil {
		t.Fatal(err)
	}
	j, _, err := p.CreateJob(ctx, store.Job{Owner: "k1", Request: json.RawMessage(`{"formula":"CH4O"}`)})
	if err != nil {
		t.Fatal(err)
	}
	if _, err := p.ClaimJob(ctx, "w1", time.Minute); err != nil {
		t.Fatal(err)
	}
	hist, _ := p.History(ctx, "k1", j.ID)
	err = p.FinishJob(ctx, j.ID, "w1", store.StatusSucceeded, "", &store.Result{Body: json.RawMessage(`{"refuse":true}`)})
	if err == nil {
		t.Fatalf("FinishJob with a result jsonb rejects: no error")
	}
	got, err := p.GetJob(ctx, "k1", j.ID)
	if err != nil || got.Status != store.StatusRunning || got.LeaseOwner != "w1" || !got.FinishedAt.IsZero() {
		t.Errorf("after failed FinishJob job = %+v, %v; want still running under w1", got, err)
	}
	if h, _ := p.History(ctx, "k1", j.ID); len(h) != len(hist) {
		t.Errorf("history has %d entries after failed FinishJob, want %d", len(h), len(hist))
	}
	if _, err := p.GetResult(ctx, "k1", j.ID); !errors.Is(err, store.ErrNotFound) {
		t.Errorf("GetResult after failed FinishJob: %v, want ErrNotFound", err)
	}
	if err := p.FinishJob(ctx, j.ID, "w1", store.StatusSucceeded, "", &store.Result{Body: json.RawMessage(`{}`)}); err != nil {
		t.Errorf("FinishJob after the rollback: %v", err)
	}
}

// TestPostgresStoresKeyHashOnly reads every api_keys column back as text and
// checks that the key itself appears nowhere, only its SHA-256.
func TestPostgresStoresKeyHashOnly(t *testing.T) {
	base, schema := pgtest.Schema(t)
	ctx := context.Background()
	p, err := store.OpenSchema(ctx, base, schema)
	if err != nil {
		t.Fatal(err)
	}
	defer p.Close()
	key, k, err := p.CreateAPIKey(ctx, "eln-lab-7")
	if err != nil {
		t.Fatal(err)
	}
	conn, err := pgx.Connect(ctx, pgtest.WithSearchPath(t, base, schema))
	if err != nil {
		t.Fatal(err)
	}
	defer conn.Close(ctx)
	var row, hash string
	err = conn.QueryRow(ctx, `SELECT a::text, encode(hash, 'hex') FROM api_keys a WHERE id = $1`, k.ID).Scan(&row, &hash)
	if err != nil {
		t.Fatal(err)
	}
	secret := strings.TrimPrefix(key, store.KeyPrefix)
	if strings.Contains(row, secret) || strings.Contains(row, hex.EncodeToString([]byte(key))) {
		t.Errorf("api_keys row %s contains the key", row)
	}
	if sum := sha256.Sum256([]byte(key)); hash != hex.EncodeToString(sum[:]) {
		t.Errorf("stored hash %s, want sha256 of the key %x", hash, sum)
	}
}

// TestPostgresSharedQueue opens two stores on one schema, as two serve
// processes would, and has workers of both claim concurrently: every job is
// run exactly once.
func TestPostgresSharedQueue(t *testing.T) {
	url := pgtest.URL(t)
	ctx := context.Background()
	var stores [2]*store.Postgres
	var wg sync.WaitGroup
	for i := range stores { // concurrent Open: migrations must run once
		wg.Go(func() {
			p, err := store.Open(ctx, url)
			if err != nil {
				t.Errorf("Open %d: %v", i, err)
				return
			}
			stores[i] = p
		})
	}
	wg.Wait()
	if t.Failed() {
		t.FailNow()
	}
	defer stores[0].Close()
	defer stores[1].Close()

	const jobs = 80
	for i := range jobs {
		if _, _, err := stores[i%2].CreateJob(ctx, store.Job{Request: json.RawMessage(fmt.Sprintf(`{"n":%d}`, i))}); err != nil {
			t.Fatal(err)
		}
	}
	var (
		mu   sync.Mutex
		runs = map[string]int{}
	)
	for w := range 6 {
		st := stores[w%2]
		worker := fmt.Sprintf("proc%d-w%d", w%2, w)
		wg.Go(func() {
			for {
				j, err := st.ClaimJob(ctx, worker, time.Minute)
				if errors.Is(err, store.ErrNoJob) {
					return
				}
				if err != nil {
					t.Errorf("ClaimJob: %v", err)
					return
				}
				mu.Lock()
				runs[j.ID]++
				mu.Unlock()
				if err := st.FinishJob(ctx, j.ID, worker, store.StatusSucceeded, "", nil); err != nil {
					t.Errorf("FinishJob: %v", err)
				}
			}
		})
	}
	wg.Wait()
	if len(runs) != jobs {
		t.Errorf("%d jobs run, want %d", len(runs), jobs)
	}
	for id, n := range runs {
		if n != 1 {
			t.Errorf("job %s run %d times", id, n)
		}
	}
}

// TestPostgresDurable closes the store and opens it again, as a restart
// would: jobs, results and keys are still there and the migrations are not
// applied twice.
func TestPostgresDurable(t *testing.T) {
	url := pgtest.URL(t)
	ctx := context.Background()
	p, err := store.Open(ctx, url)
	if err != nil {
		t.Fatal(err)
	}
	j, _, err := p.CreateJob(ctx, store.Job{Owner: "k1", Request: json.RawMessage(`{"formula":"C2H6O"}`), IdempotencyKey: "once"})
	if err != nil {
		t.Fatal(err)
	}
	key, _, err := p.CreateAPIKey(ctx, "eln-lab-7")
	if err != nil {
		t.Fatal(err)
	}
	p.Close()

	p, err = store.Open(ctx, url)
	if err != nil {
		t.Fatalf("reopen: %v", err)
	}
	defer p.Close()
	if got, err := p.GetJob(ctx, "k1", j.ID); err != nil || got.Status != store.StatusQueued {
		t.Errorf("GetJob after reopen = %+v, %v", got, err)
	}
	if again, created, err := p.CreateJob(ctx, store.Job{Owner: "k1", Request: json.RawMessage(`{"formula":"C2H6O"}`), IdempotencyKey: "once"}); err != nil || created || again.ID != j.ID {
		t.Errorf("idempotent CreateJob after reopen = %s, %v, %v; want %s, false", again.ID, created, err, j.ID)
	}
	if _, err := p.LookupAPIKey(ctx, key); err != nil {
		t.Errorf("LookupAPIKey after reopen: %v", err)
	}
}

// TestPostgresWorkerProcessKilled runs a worker in a child process that
// claims a job and is killed (SIGKILL) before finishing it; after the lease
// expires a worker here takes the job up and finishes it, once.
func TestPostgresWorkerProcessKilled(t *testing.T) {
	url := pgtest.URL(t)
	ctx := context.Background()
	p, err := store.Open(ctx, url)
	if err != nil {
		t.Fatal(err)
	}
	defer p.Close()
	j, _, err := p.CreateJob(ctx, store.Job{Request: json.RawMessage(`{"formula":"C3H6O"}`)})
	if err != nil {
		t.Fatal(err)
	}

	cmd := exec.Command(os.Args[0], "-test.run=^$") // TestMain makes it claimAndWait
	cmd.Env = append(os.Environ(), "STORE_HELPER_URL="+url)
	out, err := cmd.StdoutPipe()
	if err != nil {
		t.Fatal(err)
	}
	cmd.Stderr = os.Stderr
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	line, err := bufio.NewReader(out).ReadString('\n')
	if err != nil || strings.TrimSpace(line) != "claimed "+j.ID {
		_ = cmd.Process.Kill()
		_ = cmd.Wait()
		t.Fatalf("child said %q, %v; want it to claim %s", line, err, j.ID)
	}
	_ = cmd.Process.Kill()
	_ = cmd.Wait()

	if _, err := p.ClaimJob(ctx, "survivor", time.Minute); !errors.Is(err, store.ErrNoJob) {
		t.Fatalf("ClaimJob before the dead worker's lease expired: %v, want ErrNoJob", err)
	}
	deadline := time.Now().Add(10 * time.Second)
	for {
		c, err := p.ClaimJob(ctx, "survivor", time.Minute)
		if err == nil {
			if c.ID != j.ID || c.Attempts != 2 {
				t.Fatalf("claimed %s attempt %d, want %s attempt 2", c.ID, c.Attempts, j.ID)
			}
			break
		}
		if !errors.Is(err, store.ErrNoJob) || time.Now().After(deadline) {
			t.Fatalf("ClaimJob after the worker was killed: %v", err)
		}
		time.Sleep(100 * time.Millisecond)
	}
	if err := p.FinishJob(ctx, j.ID, "survivor", store.StatusSucceeded, "", &store.Result{Body: json.RawMessage(`{}`)}); err != nil {
		t.Fatal(err)
	}
	h, _ := p.History(ctx, "", j.ID)
	var workers []string
	for _, c := range h {
		if c.Status == store.StatusRunning {
			workers = append(workers, c.Worker)
		}
	}
	if len(workers) != 2 || workers[1] != "survivor" || !strings.HasPrefix(workers[0], "child-") {
		t.Errorf("running entries by %v, want the child then survivor", workers)
	}
}

// TestMain runs the child process of TestPostgresWorkerProcessKilled when
// the test binary is started with STORE_HELPER_URL, and the tests otherwise.
func TestMain(m *testing.M) {
	if url := os.Getenv("STORE_HELPER_URL"); url != "" {
		claimAndWait(url)
	}
	os.Exit(m.Run())
}

// claimAndWait is the worker process that TestPostgresWorkerProcessKilled
// kills: it claims one job with a 1 s lease, reports it on stdout, and
// waits to be killed. It never returns.
func claimAndWait(url string) {
	ctx := context.Background()
	p, err := store.Open(ctx, url)
	if err != nil {
		fmt.Fprintln(os.Stderr, "child:", err)
		os.Exit(1)
	}
	j, err := p.ClaimJob(ctx, fmt.Sprintf("child-%d", os.Getpid()), time.Second)
	if err != nil {
		fmt.Fprintln(os.Stderr, "child:", err)
		os.Exit(1)
	}
	fmt.Printf("claimed %s\n", j.ID)
	time.Sleep(time.Minute) // killed long before this ends
	os.Exit(3)
}
