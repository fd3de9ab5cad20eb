// Package e2e drives shiftrank's web page in a real headless Chromium against
// the service, through the Chrome DevTools Protocol (chromedp).
//
// Run it with Chromium installed (Debian: apt-get install chromium):
//
//	go test -count=1 ./web/e2e
//
// Screenshots go to $SHIFTRANK_ARTIFACTS (or a temporary directory); the test
// logs their paths. With CI=true a missing Chromium fails the test; elsewhere
// it skips.
package e2e

import (
	"context"
	"encoding/json"
	"fmt"
	"net/http"
	"net/http/httptest"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/chromedp/cdproto/runtime"
	"github.com/chromedp/chromedp"

	"shiftrank/web"
)

// chromiumPath returns the browser to drive, or ends the test: a failure in
// CI, a skip elsewhere.
func chromiumPath(t *testing.T) string {
	t.Helper()
	if p := os.Getenv("SHIFTRANK_CHROMIUM"); p != "" {
		return p
	}
	for _, name := range []string{"chromium", "chromium-browser", "google-chrome"} {
		if p, err := exec.LookPath(name); err == nil {
			return p
		}
	}
	if _, err := os.Stat("/usr/bin/chromium"); err == nil {
		return "/usr/bin/chromium"
	}
	msg := "chromium not found: install it (Debian: apt-get install -y chromium) or set SHIFTRANK_CHROMIUM, then run go test ./web/e2e"
	if os.Getenv("CI") == "true" {
		t.Fatal(msg)
	}
	t.Skip(msg)
	return ""
}

func artifactsDir(t *testing.T) string {
	t.Helper()
	dir := os.Getenv("SHIFTRANK_ARTIFACTS")
	if dir == "" {
		return t.TempDir()
	}
	dir = filepath.Join(dir, "web-e2e")
	if err := os.MkdirAll(dir, 0o755); err != nil {
		t.Fatalf("artifacts directory: %v", err)
	}
	return dir
}

// newBrowser starts a headless Chromium with a fresh profile and returns a
// context for one tab in it.
func newBrowser(t *testing.T, exe string) context.Context {
	t.Helper()
	opts := []chromedp.ExecAllocatorOption{
		chromedp.ExecPath(exe),
		chromedp.UserDataDir(t.TempDir()),
		chromedp.Headless,
		chromedp.NoSandbox,
		chromedp.DisableGPU,
		chromedp.NoFirstRun,
		chromedp.NoDefaultBrowserCheck,
		chromedp.Flag("disable-background-networking", true),
		chromedp.Flag("disable-component-update", true),
		chromedp.Flag("disable-sync", true),
		chromedp.Flag("disable-quic", true),
		chromedp.Flag("disable-dev-shm-usage", true),
		chromedp.WindowSize(1280, 800),
	}
	actx, cancelAlloc := chromedp.NewExecAllocator(context.Background(), opts...)
	ctx, cancelCtx := chromedp.NewContext(actx, chromedp.WithLogf(t.Logf))
	t.Cleanup(func() {
		cancelCtx()
		cancelAlloc()
	})
	if err := chromedp.Do(ctx, chromedp.EmulateViewport(1280, 800)); err != nil {
		t.Fatalf("start chromium (%s): %v", exe, err)
	}
	return ctx
}

// scriptErrors collects the page's uncaught exceptions and console.error
// calls, so a test can fail on them.
type scriptErrors struct {
	mu   sync.Mutex
	list []string
}

func (s *scriptErrors) add(msg string) {
	s.mu.Lock()
	s.list = append(s.list, msg)
	s.mu.Unlock()
}

// take returns the errors collected since the last call.
func (s *scriptErrors) take() []string {
	s.mu.Lock()
	defer s.mu.Unlock()
	l := s.list
	s.list = nil
	return l
}

// watchScripts subscribes to the tab's exceptions and console errors.
func watchScripts(ctx context.Context) *scriptErrors {
	se := &scriptErrors{}
	exceptions := chromedp.Events(ctx, runtime.ExceptionThrown)
	console := chromedp.Events(ctx, runtime.ConsoleAPICalled)
	go func() {
		for ev, err := range exceptions {
			if err != nil {
				return
			}
			d := ev.ExceptionDetails
			msg := d.Text
			if d.Exception != nil && d.Exception.Description != "" {
				msg += " " + d.Exception.Description
			}
			se.add(fmt.Sprintf("uncaught exception at %s:%d: %s", d.URL, d.LineNumber+1, msg))
		}
	}()
	go func() {
		for ev, err := range console {
			if err != nil {
				return
			}
			if ev.Type != runtime.ConsoleAPICalledTypeError {
				continue
			}
			var parts []string
			for _, a := range ev.Args {
				if a.Description != "" {
					parts = append(parts, a.Description)
				} else {
					parts = append(parts, string(a.Value))
				}
			}
			se.add("console.error: " + strings.Join(parts, " "))
		}
	}()
	return se
}

// page wraps a browser tab with helpers that fail the test on error.
type page struct {
	t    *testing.T
	ctx  context.Context
	base string
	art  string
	errs *scriptErrors
}

// run runs one scenario as a subtest on the shared tab and fails it for
// any script error the page raised meanwhile.
func (p *page) run(name string, f func(p *page)) {
	p.t.Run(name, func(t *testing.T) {
		q := &page{t: t, ctx: p.ctx, base: p.base, art: p.art, errs: p.errs}
		q.errs.take()
		f(q)
		for _, e := range q.errs.take() {
			t.Errorf("page script error: %s", e)
		}
	})
}

func (p *page) do(what string, actions ...chromedp.Action[chromedp.Void]) {
	p.t.Helper()
	ctx, cancel := context.WithTimeout(p.ctx, 60*time.Second)
	defer cancel()
	if err := chromedp.Do(ctx, actions...); err != nil {
		p.t.Fatalf("%s: %v", what, err)
	}
}

// eval runs a JavaScript expression and decodes its value into out.
func (p *page) eval(js string, out any) {
	p.t.Helper()
	ctx, cancel := context.WithTimeout(p.ctx, 30*time.Second)
	defer cancel()
	raw, err := chromedp.Run(ctx, chromedp.Evaluate[[]byte](js, chromedp.EvalAwaitPromise))
	if err != nil {
		p.t.Fatalf("evaluate %s: %v", js, err)
	}
	if out != nil {
		if err := json.Unmarshal(raw, out); err != nil {
			p.t.Fatalf("evaluate %s: decode %s: %v", js, raw, err)
		}
	}
}

// waitFor polls a JavaScript predicate until it holds.
func (p *page) waitFor(what, js string, timeout time.Duration) {
	p.t.Helper()
	ctx, cancel := context.WithTimeout(p.ctx, timeout+5*time.Second)
	defer cancel()
	_, err := chromedp.Run(ctx, chromedp.Poll[chromedp.Void](js,
		chromedp.WithPollingInterval(100*time.Millisecond), chromedp.WithPollingTimeout(timeout)))
	if err != nil {
		var state string
		p.eval(`document.querySelector("main").innerText.slice(0, 1500)`, &state)
		p.shot("timeout-" + strings.ReplaceAll(what, " ", "-"))
		p.t.Fatalf("waiting for %s (%s): %v\npage text:\n%s", what, js, err, state)
	}
}

func (p *page) text(sel string) string {
	p.t.Helper()
	var s string
	p.eval(fmt.Sprintf(`(document.querySelector(%q) || {}).textContent || ""`, sel), &s)
	return strings.TrimSpace(s)
}

// shot saves a full-page PNG and logs its path.
func (p *page) shot(name string) {
	p.t.Helper()
	ctx, cancel := context.WithTimeout(p.ctx, 30*time.Second)
	defer cancel()
	buf, err := chromedp.Run(ctx, chromedp.FullScreenshot(100))
	if err != nil {
		p.t.Errorf("screenshot %s: %v", name, err)
		return
	}
	path := filepath.Join(p.art, name+".png")
	if err := os.WriteFile(path, buf, 0o644); err != nil {
		p.t.Errorf("screenshot %s: %v", name, err)
		return
	}
	p.t.Logf("screenshot: %s", path)
}

// shotOf saves a PNG of one element and logs its path.
func (p *page) shotOf(sel, name string) {
	p.t.Helper()
	ctx, cancel := context.WithTimeout(p.ctx, 30*time.Second)
	defer cancel()
	buf, err := chromedp.Run(ctx, chromedp.Screenshot(chromedp.CSS(sel)))
	if err != nil {
		p.t.Errorf("screenshot %s: %v", name, err)
		return
	}
	path := filepath.Join(p.art, name+".png")
	if err := os.WriteFile(path, buf, 0o644); err != nil {
		p.t.Errorf("screenshot %s: %v", name, err)
		return
	}
	p.t.Logf("screenshot: %s", path)
}

func (p *page) open(path string) {
	p.t.Helper()
	p.do("open "+path, chromedp.Navigate(p.base+path))
	p.waitFor("page script", `document.querySelector("#peak-rows tr") !== null`, 20*time.Second)
}

// getJSON fetches an API document directly, as an integration would.
func getJSON(t *testing.T, url string, out any) {
	t.Helper()
	res, err := http.Get(url)
	if err != nil {
		t.Fatalf("GET %s: %v", url, err)
	}
	defer res.Body.Close()
	if res.StatusCode != http.StatusOK {
		t.Fatalf("GET %s: status %d", url, res.StatusCode)
	}
	if err := json.NewDecoder(res.Body).Decode(out); err != nil {
		t.Fatalf("GET %s: decode: %v", url, err)
	}
}

// TestParsers holds the page's formula and peak-list readers to the
// service's, and its plotted line patterns to the n+1 rule (see
// parsers_test.go). It needs only the page, not the API.
func TestParsers(t *testing.T) {
	exe := chromiumPath(t)
	srv := httptest.NewServer(web.Handler())
	t.Cleanup(srv.Close)
	ctx := newBrowser(t, exe)
	p := &page{t: t, ctx: ctx, base: srv.URL, art: artifactsDir(t), errs: watchScripts(ctx)}
	p.run("formulas and peak lists", testClientParsers)
	p.run("table text round trip", testTableTextRandom)
	p.run("first-order multiplets", testMultiplets)
}
