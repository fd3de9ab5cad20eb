package main

import (
	"bytes"
	"context"
	"encoding/hex"
	"errors"
	"net/http"
	"regexp"
	"strings"
	"sync"
	"testing"
	"time"

	"shiftrank/store"
	"shiftrank/store/pgtest"
)

// syncBuffer is a bytes.Buffer safe for one writer and one reader.
type syncBuffer struct {
	mu sync.Mutex
	b  bytes.Buffer
}

func (s *syncBuffer) Write(p []byte) (int, error) {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.b.Write(p)
}

func (s *syncBuffer) String() string {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.b.String()
}

func testEnv(vars map[string]string, stdout, stderr *syncBuffer) env {
	return env{getenv: func(k string) string { return vars[k] }, stdin: strings.NewReader(""), stdout: stdout, stderr: stderr}
}

func TestServeRefusesKeylessPublicMemoryStore(t *testing.T) {
	var out, errb syncBuffer
	err := runServe(context.Background(), []string{"--addr", "0.0.0.0:0"}, testEnv(nil, &out, &errb))
	var u usageError
	if !errors.As(err, &u) || !strings.Contains(err.Error(), "DATABASE_URL") {
		t.Errorf("serve on 0.0.0.0 with the memory store: err = %v, want a usage error pointing at DATABASE_URL", err)
	}
}

func TestServeFlagErrors(t *testing.T) {
	for _, tc := range []struct {
		args []string
		vars map[string]string
	}{
		{[]string{"--addr", "nonsense"}, nil},
		{[]string{"--time-budget", "0s"}, nil},
		{[]string{"--base-url", "ftp://x"}, nil},
		{[]string{"extra"}, nil},
		{[]string{"--callback-allow", "eln lab"}, nil},
		{[]string{"--max-queued-per-key", "0"}, nil},
		{[]string{"--retention", "-1h"}, nil},
		{nil, map[string]string{"SHIFTRANK_CALLBACK_ALLOW": "10.0.0.0/40"}},
		{nil, map[string]string{"SHIFTRANK_WORKERS": "many"}},
	} {
		var out, errb syncBuffer
		err := runServe(context.Background(), tc.args, testEnv(tc.vars, &out, &errb))
		var u usageError
		if !errors.As(err, &u) {
			t.Errorf("serve %q env %v: err = %v, want a usage error", tc.args, tc.vars, err)
		}
	}
}

func TestServeRunsAndStopsOnCancel(t *testing.T) {
	var out, errb syncBuffer
	ctx, cancel := context.WithCancel(context.Background())
	done := make(chan error, 1)
	go func() {
		done <- runServe(ctx, []string{"--addr", "127.0.0.1:0", "--workers", "1", "--grace", "1s"}, testEnv(nil, &out, &errb))
	}()
	re := regexp.MustCompile(`msg=listening addr=(127\.0\.0\.1:\d+)`)
	var addr string
	for deadline := time.Now().Add(10 * time.Second); addr == ""; time.Sleep(20 * time.Millisecond) {
		if m := re.FindStringSubmatch(errb.String()); m != nil {
			addr = m[1]
		}
		if time.Now().After(deadline) {
			t.Fatalf("serve did not report its address:\n%s", errb.String())
		}
	}
	if !strings.Contains(errb.String(), "will not survive a restart") {
		t.Errorf("no plain warning about the in-memory store:\n%s", errb.String())
	}
	resp, err := http.Get("http://" + addr + "/v1/jobs")
	if err != nil {
		t.Fatal(err)
	}
	resp.Body.Close()
	if resp.StatusCode != http.StatusOK {
		t.Errorf("anonymous GET /v1/jobs on the local default = %d, want 200", resp.StatusCode)
	}
	// A name rebound to the loopback address (DNS rebinding) is refused.
	req, _ := http.NewRequest("GET", "http://"+addr+"/v1/jobs", nil)
	req.Host = "attacker.example:" + addr[strings.LastIndex(addr, ":")+1:]
	if resp, err := http.DefaultClient.Do(req); err != nil {
		t.Fatal(err)
	} else {
		resp.Body.Close()
		if resp.StatusCode != http.StatusForbidden {
			t.Errorf("anonymous GET with Host %s = %d, want 403", req.Host, resp.StatusCode)
		}
	}
	cancel()
	select {
	case err := <-done:
		if err != nil {
			t.Errorf("serve after cancel: %v", err)
		}
	case <-time.After(10 * time.Second):
		t.Fatal("serve did not stop within 10 s of cancel")
	}
}

func TestIsLoopback(t *testing.T) {
	for host, want := range map[string]bool{
		"127.0.0.1": true, "127.0.0.2": true, "::1": true, "localhost": true,
		"": false, "0.0.0.0": false, "::": false, "192.0.2.10": false, "example.org": false,
	} {
		if got := isLoopback(host); got != want {
			t.Errorf("isLoopback(%q) = %v, want %v", host, got, want)
		}
	}
}

func TestAPIKeyNeedsDatabase(t *testing.T) {
	for _, args := range [][]string{{"create", "--name", "eln"}, {"list"}, {"revoke", "eln"}} {
		var out, errb syncBuffer
		err := runAPIKey(context.Background(), args, testEnv(nil, &out, &errb))
		var u usageError
		if !errors.As(err, &u) || !strings.Contains(err.Error(), "DATABASE_URL") {
			t.Errorf("apikey %v without DATABASE_URL: err = %v, want a usage error naming DATABASE_URL", args, err)
		}
	}
	var out, errb syncBuffer
	if err := runAPIKey(context.Background(), []string{"create"}, testEnv(nil, &out, &errb)); err == nil || !strings.Contains(err.Error(), "--name") {
		t.Errorf("apikey create without --name: err = %v", err)
	}
	if err := runAPIKey(context.Background(), []string{"rotate"}, testEnv(nil, &out, &errb)); err == nil {
		t.Error("apikey rotate: no error")
	}
}

func TestAPIKeyCommands(t *testing.T) {
	dsn := pgtest.URL(t)
	vars := map[string]string{"DATABASE_URL": dsn}
	var out, errb syncBuffer
	if err := runAPIKey(context.Background(), []string{"create", "--name", "eln-test"}, testEnv(vars, &out, &errb)); err != nil {
		t.Fatalf("apikey create: %v\n%s", err, errb.String())
	}
	lines := strings.Split(strings.TrimSpace(out.String()), "\n")
	key := lines[len(lines)-1]
	if !strings.HasPrefix(key, "sr_") || strings.Contains(key, " ") {
		t.Fatalf("apikey create output %q: want the key alone on the last line", out.String())
	}
	secret := regexp.MustCompile(`callback secret .*: ([0-9a-f]{64})\n`).FindStringSubmatch(out.String())
	if secret == nil {
		t.Fatalf("apikey create output %q: want the callback secret in hex", out.String())
	}
	st, err := store.Open(context.Background(), dsn)
	if err != nil {
		t.Fatal(err)
	}
	defer st.Close()
	k, err := st.LookupAPIKey(context.Background(), key)
	if err != nil || hex.EncodeToString(k.Secret) != secret[1] {
		t.Errorf("printed secret %s is not the key's callback secret (%v)", secret[1], err)
	}
	var rot syncBuffer
	if err := runAPIKey(context.Background(), []string{"rotate-secret", "eln-test"}, testEnv(vars, &rot, &errb)); err != nil {
		t.Fatalf("apikey rotate-secret: %v", err)
	}
	rlines := strings.Split(strings.TrimSpace(rot.String()), "\n")
	if k, err := st.LookupAPIKey(context.Background(), key); err != nil || hex.EncodeToString(k.Secret) != rlines[len(rlines)-1] || rlines[len(rlines)-1] == secret[1] {
		t.Errorf("rotate-secret printed %q; want the key's new secret on the last line (%v)", rot.String(), err)
	}
	var dup syncBuffer
	if err := runAPIKey(context.Background(), []string{"create", "--name", "eln-test"}, testEnv(vars, &dup, &errb)); err == nil {
		t.Error("second key with the same name: no error")
	}
	var list syncBuffer
	if err := runAPIKey(context.Background(), []string{"list"}, testEnv(vars, &list, &errb)); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(list.String(), "eln-test") || strings.Contains(list.String(), key) {
		t.Errorf("apikey list = %q: want the name and never the key", list.String())
	}
	var rev syncBuffer
	if err := runAPIKey(context.Background(), []string{"revoke", "eln-test"}, testEnv(vars, &rev, &errb)); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(rev.String(), "0 queued jobs cancelled") {
		t.Errorf("apikey revoke printed %q; want the number of cancelled jobs", rev.String())
	}
	if err := runAPIKey(context.Background(), []string{"rotate-secret", "eln-test"}, testEnv(vars, &rev, &errb)); err == nil {
		t.Error("rotating a revoked key's secret: no error")
	}
	if err := runAPIKey(context.Background(), []string{"revoke", "no-such-key"}, testEnv(vars, &rev, &errb)); err == nil {
		t.Error("revoking an unknown key: no error")
	}
	list = syncBuffer{}
	_ = runAPIKey(context.Background(), []string{"list"}, testEnv(vars, &list, &errb))
	for _, line := range strings.Split(list.String(), "\n") {
		if f := strings.Fields(line); len(f) == 4 && f[1] == "eln-test" && f[3] == "-" {
			t.Errorf("revoked key still listed as active: %q", line)
		}
	}
}

// startServeCmd runs serve with args and vars until the test ends and
// returns its address.
func startServeCmd(t *testing.T, args []string, vars map[string]string) string {
	t.Helper()
	var out, errb syncBuffer
	ctx, cancel := context.WithCancel(context.Background())
	done := make(chan error, 1)
	go func() { done <- runServe(ctx, args, testEnv(vars, &out, &errb)) }()
	t.Cleanup(func() {
		cancel()
		select {
		case <-done:
		case <-time.After(10 * time.Second):
			t.Error("serve did not stop within 10 s of cancel")
		}
	})
	re := regexp.MustCompile(`msg=listening addr=(127\.0\.0\.1:\d+)`)
	for deadline := time.Now().Add(20 * time.Second); ; time.Sleep(20 * time.Millisecond) {
		if m := re.FindStringSubmatch(errb.String()); m != nil {
			return m[1]
		}
		select {
		case err := <-done:
			t.Fatalf("serve stopped: %v\n%s", err, errb.String())
		default:
		}
		if time.Now().After(deadline) {
			t.Fatalf("serve did not report its address:\n%s", errb.String())
		}
	}
}

// TestServeAnonymousRules: with a database, even on loopback, a request
// without a key gets 401 unless --allow-anonymous is given (issue 5: anonymous
// access only for the embedded store on loopback, or when asked for).
func TestServeAnonymousRules(t *testing.T) {
	dsn := pgtest.URL(t)
	for _, tc := range []struct {
		args []string
		want int
	}{
		{[]string{"--addr", "127.0.0.1:0", "--workers", "-1"}, http.StatusUnauthorized},
		{[]string{"--addr", "127.0.0.1:0", "--workers", "-1", "--allow-anonymous"}, http.StatusOK},
	} {
		addr := startServeCmd(t, tc.args, map[string]string{"DATABASE_URL": dsn})
		resp, err := http.Get("http://" + addr + "/v1/jobs")
		if err != nil {
			t.Fatal(err)
		}
		resp.Body.Close()
		if resp.StatusCode != tc.want {
			t.Errorf("serve %q with DATABASE_URL: GET /v1/jobs without a key = %d, want %d", tc.args, resp.StatusCode, tc.want)
		}
	}
}
