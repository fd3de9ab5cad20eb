package server_test

import (
	"bufio"
	"bytes"
	"context"
	"fmt"
	"io"
	"net"
	"net/http"
	"net/http/httptest"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"strings"
	"sync"
	"syscall"
	"testing"
	"time"

	"shiftrank/server"
	"shiftrank/store"
	"shiftrank/store/pgtest"
)

// buildBinary builds cmd/shiftrank into a temporary directory.
func buildBinary(t *testing.T) string {
	t.Helper()
	bin := filepath.Join(t.TempDir(), "shiftrank")
	goTool := filepath.Join(runtime.GOROOT(), "bin", "go")
	cmd := exec.Command(goTool, "build", "-o", bin, "shiftrank/cmd/shiftrank")
	if out, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	return bin
}

// createKey runs `shiftrank apikey create` against dsn and returns the key
// (the last line of its output).
func createKey(t *testing.T, bin, dsn, name string) string {
	t.Helper()
	cmd := exec.Command(bin, "apikey", "create", "--name", name)
	cmd.Env = append(os.Environ(), "DATABASE_URL="+dsn)
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("apikey create: %v", err)
	}
	lines := strings.Split(strings.TrimSpace(string(out)), "\n")
	key := strings.TrimSpace(lines[len(lines)-1])
	if !strings.HasPrefix(key, store.KeyPrefix) || strings.ContainsAny(key, " \t") {
		t.Fatalf("apikey create printed %q; want the key alone on the last line", out)
	}
	return key
}

// freePort returns a loopback TCP port that was free a moment ago.
func freePort(t *testing.T) int {
	t.Helper()
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	defer ln.Close()
	return ln.Addr().(*net.TCPAddr).Port
}

// serveProc is a running `shiftrank serve` process.
type serveProc struct {
	name string
	base string
	cmd  *exec.Cmd
	mu   sync.Mutex
	log  bytes.Buffer
	done chan struct{}
}

func (p *serveProc) Log() string {
	p.mu.Lock()
	defer p.mu.Unlock()
	return p.log.String()
}

// startServe starts `shiftrank serve` on a free loopback port with
// DATABASE_URL=dsn and waits until it is ready. The process is killed at
// the end of the test if it still runs.
func startServe(t *testing.T, bin, dsn, name string, args ...string) *serveProc {
	t.Helper()
	port := freePort(t)
	addr := fmt.Sprintf("127.0.0.1:%d", port)
	p := &serveProc{name: name, base: "http://" + addr, done: make(chan struct{})}
	p.cmd = exec.Command(bin, append([]string{"serve", "--addr", addr}, args...)...)
	p.cmd.Env = append(os.Environ(), "DATABASE_URL="+dsn)
	stderr, err := p.cmd.StderrPipe()
	if err != nil {
		t.Fatal(err)
	}
	if err := p.cmd.Start(); err != nil {
		t.Fatal(err)
	}
	go func() {
		sc := bufio.NewScanner(stderr)
		sc.Buffer(make([]byte, 1<<16), 1<<20)
		for sc.Scan() {
			p.mu.Lock()
			p.log.WriteString(sc.Text() + "\n")
			p.mu.Unlock()
		}
		_, _ = io.Copy(io.Discard, stderr)
		_ = p.cmd.Wait()
		close(p.done)
	}()
	t.Cleanup(func() {
		select {
		case <-p.done:
		default:
			_ = p.cmd.Process.Kill()
			<-p.done
		}
		if t.Failed() {
			t.Logf("log of %s:\n%s", p.name, p.Log())
		}
	})
	deadline := time.Now().Add(30 * time.Second)
	for {
		resp, err := http.Get(p.base + "/readyz")
		if err == nil {
			resp.Body.Close()
			if resp.StatusCode == http.StatusOK {
				return p
			}
		}
		select {
		case <-p.done:
			t.Fatalf("%s exited during start:\n%s", name, p.Log())
		default:
		}
		if time.Now().After(deadline) {
			t.Fatalf("%s not ready after 30 s:\n%s", name, p.Log())
		}
		time.Sleep(50 * time.Millisecond)
	}
}

// kill ends the process with SIGKILL: no shutdown code runs.
func (p *serveProc) kill(t *testing.T) {
	t.Helper()
	if err := p.cmd.Process.Kill(); err != nil {
		t.Fatal(err)
	}
	<-p.done
}

// longJob is a ranking that runs until its time budget: it searches all
// isomers (not only those fitting the spectrum), and C9H10O2 has millions
// of them, far more than a few seconds of scoring.
func longJob() map[string]any {
	return map[string]any{
		"formula":   "C9H10O2",
		"peaks":     "7.35 (m, 5H), 5.10 (s, 2H), 2.09 (s, 3H)",
		"options":   map[string]any{"all_isomers": true},
		"reference": "KILL-1",
	}
}

func TestKilledWorkerJobFinishedByAnotherProcess(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the binary and runs two servers; skipped with -short")
	}
	dsn := pgtest.URL(t)
	bin := buildBinary(t)
	key := createKey(t, bin, dsn, "kill-test")
	const lease = 2 * time.Second
	args := []string{"--workers", "1", "--lease", lease.String(), "--time-budget", "5s", "--grace", "1s"}

	a := startServe(t, bin, dsn, "serve A", args...)
	ca := client{t: t, base: a.base, key: key}
	r := ca.do("POST", "/v1/jobs", longJob())
	if r.status != http.StatusAccepted {
		t.Fatalf("submit = %d %s", r.status, r.body)
	}
	var j server.JobView
	r.decode(t, &j)
	for deadline := time.Now().Add(20 * time.Second); ; time.Sleep(50 * time.Millisecond) {
		ca.do("GET", "/v1/jobs/"+j.ID, nil).decode(t, &j)
		if j.Status == store.StatusRunning {
			break
		}
		if time.Now().After(deadline) || store.Status(j.Status).Terminal() {
			t.Fatalf("job did not start running on A: %+v", j)
		}
	}
	// B starts only now, so A is the one running the job.
	b := startServe(t, bin, dsn, "serve B", args...)
	time.Sleep(500 * time.Millisecond)
	a.kill(t)
	killedAt := time.Now()

	cb := client{t: t, base: b.base, key: key}
	done := cb.waitJob(j.ID, 60*time.Second)
	if done.Status != store.StatusSucceeded {
		t.Fatalf("job after the kill = %+v, want succeeded by B", done)
	}
	if done.Attempts != 2 {
		t.Errorf("attempts = %d, want 2 (A, then B)", done.Attempts)
	}
	var cl server.CandidateList
	if r := cb.do("GET", "/v1/jobs/"+j.ID+"/candidates", nil); r.status != http.StatusOK {
		t.Fatalf("candidates = %d %s", r.status, r.body)
	} else {
		r.decode(t, &cl)
	}
	if len(cl.Candidates) == 0 {
		t.Errorf("no candidates after the takeover")
	}

	st, err := store.Open(context.Background(), dsn)
	if err != nil {
		t.Fatal(err)
	}
	defer st.Close()
	owner := ""
	k, err := st.LookupAPIKey(context.Background(), key)
	if err != nil {
		t.Fatal(err)
	}
	owner = k.ID
	hist, err := st.History(context.Background(), owner, j.ID)
	if err != nil {
		t.Fatal(err)
	}
	var running []store.StatusChange
	terminal := 0
	for _, h := range hist {
		t.Logf("history: %s %-9s %-40s %s", h.At.Format("15:04:05.000"), h.Status, h.Worker, h.Note)
		switch {
		case h.Status == store.StatusRunning:
			running = append(running, h)
		case h.Status.Terminal():
			terminal++
		}
	}
	if len(running) != 2 || terminal != 1 {
		t.Fatalf("history has %d running and %d terminal entries, want 2 and 1", len(running), terminal)
	}
	if running[0].Worker == running[1].Worker || running[0].Worker == "" {
		t.Errorf("both claims by worker %q; want A then B", running[0].Worker)
	}
	// B's claim came only once A's lease had run out: never two at once.
	if gap := running[1].At.Sub(running[0].At); gap < lease {
		t.Errorf("B claimed the job %v after A, within A's %v lease", gap, lease)
	}
	if took := time.Since(killedAt); took > 45*time.Second {
		t.Errorf("takeover and run took %v", took)
	}
}

func TestSIGTERMHandsBackRunningJob(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the binary and runs two servers; skipped with -short")
	}
	dsn := pgtest.URL(t)
	bin := buildBinary(t)
	key := createKey(t, bin, dsn, "sigterm-test")
	args := []string{"--workers", "1", "--lease", "2s", "--time-budget", "4s", "--grace", "500ms"}

	a := startServe(t, bin, dsn, "serve A", args...)
	ca := client{t: t, base: a.base, key: key}
	var j server.JobView
	ca.do("POST", "/v1/jobs", longJob()).decode(t, &j)
	for deadline := time.Now().Add(20 * time.Second); ; time.Sleep(50 * time.Millisecond) {
		ca.do("GET", "/v1/jobs/"+j.ID, nil).decode(t, &j)
		if j.Status == store.StatusRunning {
			break
		}
		if time.Now().After(deadline) || store.Status(j.Status).Terminal() {
			t.Fatalf("job did not start running on A: %+v", j)
		}
	}
	start := time.Now()
	if err := a.cmd.Process.Signal(syscall.SIGTERM); err != nil {
		t.Fatal(err)
	}
	select {
	case <-a.done:
	case <-time.After(15 * time.Second):
		t.Fatalf("serve did not exit within 15 s of SIGTERM:\n%s", a.Log())
	}
	if took := time.Since(start); took > 5*time.Second {
		t.Errorf("shutdown took %v with a 500ms grace", took)
	}
	if code := a.cmd.ProcessState.ExitCode(); code != 0 {
		t.Errorf("serve exited with %d after SIGTERM, want 0:\n%s", code, a.Log())
	}
	if !strings.Contains(a.Log(), "handed back") {
		t.Errorf("A's log does not say the job was handed back:\n%s", a.Log())
	}

	b := startServe(t, bin, dsn, "serve B", args...)
	cb := client{t: t, base: b.base, key: key}
	done := cb.waitJob(j.ID, 60*time.Second)
	if done.Status != store.StatusSucceeded || done.Attempts != 2 {
		t.Errorf("job after the hand-back = %+v, want succeeded on the second attempt", done)
	}
	st, err := store.Open(context.Background(), dsn)
	if err != nil {
		t.Fatal(err)
	}
	defer st.Close()
	k, err := st.LookupAPIKey(context.Background(), key)
	if err != nil {
		t.Fatal(err)
	}
	hist, err := st.History(context.Background(), k.ID, j.ID)
	if err != nil {
		t.Fatal(err)
	}
	var seq []store.Status
	for _, h := range hist {
		seq = append(seq, h.Status)
	}
	want := []store.Status{store.StatusQueued, store.StatusRunning, store.StatusQueued, store.StatusRunning, store.StatusSucceeded}
	if fmt.Sprint(seq) != fmt.Sprint(want) {
		t.Errorf("history %v, want %v (created, claimed by A, handed back, claimed by B, done)", seq, want)
	}
}

// TestKilledProcessCallbackDeliveredByAnother: a job finishes while its
// callback receiver is down, and the process that ran it is killed
// (SIGKILL) between delivery attempts. Another process on the same
// database resumes the callback: the receiver gets it once, validly
// signed, as the next attempt, and every attempt is recorded.
func TestKilledProcessCallbackDeliveredByAnother(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the binary and runs two servers; skipped with -short")
	}
	dsn := pgtest.URL(t)
	bin := buildBinary(t)
	key := createKey(t, bin, dsn, "callback-kill-test")
	st, err := store.Open(context.Background(), dsn)
	if err != nil {
		t.Fatal(err)
	}
	defer st.Close()
	ctx := context.Background()
	k, err := st.LookupAPIKey(ctx, key)
	if err != nil {
		t.Fatal(err)
	}
	rc := &switchReceiver{secret: k.Secret}
	recv := httptest.NewServer(rc)
	defer recv.Close()

	// Retry window: 4 × 500 ms timeouts + 300 + 600 + 1200 ms of back-off.
	args := []string{"--workers", "1", "--callback-attempts", "4", "--callback-backoff", "300ms",
		"--callback-timeout", "500ms", "--callback-sweep", "200ms", "--callback-allow", "127.0.0.1"}
	a := startServe(t, bin, dsn, "serve A", args...)
	job := ethanolJob()
	job["callback_url"] = recv.URL + "/eln/hook"
	var j server.JobView
	if r := (client{t: t, base: a.base, key: key}).do("POST", "/v1/jobs", job); r.status != http.StatusAccepted {
		t.Fatalf("submit = %d %s", r.status, r.body)
	} else {
		r.decode(t, &j)
	}
	for deadline := time.Now().Add(30 * time.Second); ; time.Sleep(10 * time.Millisecond) {
		if ds, _ := st.Deliveries(ctx, j.ID); len(ds) > 0 {
			break
		}
		if time.Now().After(deadline) {
			t.Fatalf("no delivery attempt by A within 30 s:\n%s", a.Log())
		}
	}
	a.kill(t)
	ds, err := st.Deliveries(ctx, j.ID)
	if err != nil {
		t.Fatal(err)
	}
	tried := len(ds)
	if tried >= 4 {
		t.Fatalf("A made all %d attempts before it was killed", tried)
	}

	rc.up.Store(true)
	startServe(t, bin, dsn, "serve B", args...)
	for deadline := time.Now().Add(30 * time.Second); ; time.Sleep(20 * time.Millisecond) {
		if _, _, got := rc.counts(); len(got) > 0 {
			break
		}
		if time.Now().After(deadline) {
			t.Fatal("B did not deliver the callback within 30 s")
		}
	}
	time.Sleep(500 * time.Millisecond) // more sweeps: none may send it again
	_, bad, got := rc.counts()
	if bad != 0 || len(got) != 1 {
		t.Fatalf("receiver got %d good and %d badly signed callbacks; want exactly 1 good one", len(got), bad)
	}
	if p := got[0]; p.Attempt != tried+1 || p.Job.ID != j.ID || p.Job.Status != store.StatusSucceeded {
		t.Errorf("resumed payload = %+v, want attempt %d for succeeded job %s", p, tried+1, j.ID)
	}
	ds, err = st.Deliveries(ctx, j.ID)
	if err != nil || len(ds) != tried+1 || ds[tried].StatusCode != http.StatusNoContent {
		t.Errorf("deliveries = %+v, %v; want A's %d and B's one answered 204", ds, err, tried)
	}
	if got, err := st.GetJob(ctx, k.ID, j.ID); err != nil || !got.CallbackDone {
		t.Errorf("callback done = %v, %v after delivery; want true", got.CallbackDone, err)
	}
}
