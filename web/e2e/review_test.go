package e2e

import (
	"context"
	"fmt"
	"io"
	"log/slog"
	"net/http/httptest"
	"slices"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/chromedp"

	"shiftrank/ranker"
	"shiftrank/server"
	"shiftrank/spectrum"
	"shiftrank/store"
	"shiftrank/web"
)

// TestReviewPage checks what a reviewer of a ranking needs: the side-by-side
// comparison of two candidates, the print layout, the report download, a
// cancelled job that keeps its best candidates, and the integral warning.
func TestReviewPage(t *testing.T) {
	exe := chromiumPath(t)
	h, _ := newAPI(t, false)
	srv := httptest.NewServer(h)
	t.Cleanup(srv.Close)
	ctx := newBrowser(t, exe)
	p := &page{t: t, ctx: ctx, base: srv.URL, art: artifactsDir(t), errs: watchScripts(ctx)}
	var id string
	p.run("comparison", func(p *page) { id = testCompare(p) })
	p.run("print layout", func(p *page) { testPrintLayout(p, id) })
	p.run("report download", func(p *page) { testReport(p, id) })
	p.run("integral warning", testIntegralWarning)
	p.run("recent jobs", testRecentJobs)

	cs := httptest.NewServer(keepingAPI(t))
	t.Cleanup(cs.Close)
	pc := &page{t: t, ctx: ctx, base: cs.URL, art: p.art, errs: p.errs}
	pc.run("cancel keeps the best so far", testCancelKeeps)
}

// apiCandidates is the part of GET /v1/jobs/{id}/candidates these tests read.
type apiCandidates struct {
	Formula    string   `json:"formula"`
	Warnings   []string `json:"warnings"`
	Candidates []struct {
		Rank        int     `json:"rank"`
		SMILES      string  `json:"smiles"`
		Score       float64 `json:"score"`
		Probability float64 `json:"probability"`
		Assignments []struct {
			Peak               int     `json:"peak"`
			ObservedShift      float64 `json:"observed_shift"`
			PredictedShift     float64 `json:"predicted_shift"`
			EnvironmentDetails []struct {
				PredictedShift float64 `json:"predicted_shift"`
			} `json:"environment_details"`
		} `json:"assignments"`
	} `json:"candidates"`
	Search struct {
		Status     string `json:"status"`
		StopReason string `json:"stop_reason"`
	} `json:"search"`
}

// submitExample submits the page's example (ethyl acetate) and waits for
// its ranking; it returns the job id.
func submitExample(p *page) string {
	p.open("/")
	// Over all isomers: the search inside the spectrum's readings keeps
	// only ethyl acetate, and a comparison needs a runner-up.
	p.do("load and submit the example", chromedp.Click(chromedp.ID("load-example")),
		chromedp.Evaluate[chromedp.Void](`document.querySelector("details.options").open = true;
			document.querySelector("#all-isomers").checked = true`),
		chromedp.Click(chromedp.ID("submit")))
	id := jobIDFromURL(p)
	waitDone(p)
	p.waitFor("candidates listed", `document.querySelectorAll("#candidate-list .candidate").length > 1`, 30*time.Second)
	return id
}

func testCompare(p *page) string {
	id := submitExample(p)
	var api apiCandidates
	getJSON(p.t, p.base+"/v1/jobs/"+id+"/candidates?limit=100", &api)
	if len(api.Candidates) < 3 {
		p.t.Fatalf("the example ranked %d candidates; the comparison check needs 3", len(api.Candidates))
	}

	// By default #1 is compared with #2, which is drawn over the plot.
	p.waitFor("comparison shown", `!document.querySelector("#compare-panel").hidden`, 10*time.Second)
	if got := p.text("#compare-title"); got != "Side by side: #1 and #2" {
		p.t.Errorf("comparison title %q, want #1 and #2 by default", got)
	}
	var overlay bool
	p.eval(`document.querySelector("#plot path.over-trace") !== null`, &overlay)
	if !overlay {
		p.t.Errorf("#2 is not drawn over the plot by default")
	}
	type row struct {
		Obs, A, B, Verdict string
	}
	var rows []row
	p.eval(`[...document.querySelectorAll("#compare-rows tr")].map(tr => ({
		Obs: tr.querySelector(".obs-shift").textContent, A: tr.querySelector(".side-a").textContent,
		B: tr.querySelector(".side-b").textContent, Verdict: tr.querySelector(".verdict").textContent}))`, &rows)
	if len(rows) != 3 {
		p.t.Fatalf("comparison has %d rows, want one per observed peak (3)", len(rows))
	}
	for i, r := range rows {
		if r.Verdict == "" || !strings.Contains(r.A, "δ") && !strings.Contains(r.A, "unexplained") {
			p.t.Errorf("comparison row %d = %+v: want each side's δ and a verdict in words", i+1, r)
		}
	}
	// Each side's predicted δ is the API's, per environment.
	for _, a := range api.Candidates[0].Assignments {
		for _, e := range a.EnvironmentDetails {
			want := fmt.Sprintf("%.2f", e.PredictedShift)
			if a.Peak < len(rows) && !strings.Contains(rows[a.Peak].A, want) {
				p.t.Errorf("comparison row %d says %q for #1; the API predicts δ %s there", a.Peak+1, rows[a.Peak].A, want)
			}
		}
	}
	p.t.Logf("comparison summary: %s", p.text("#compare-summary"))
	for _, r := range rows {
		p.t.Logf("  δ %s | #1 %s | #2 %s | %s", r.Obs, r.A, r.B, r.Verdict)
	}

	// The numbers are one click away: closed at first, the score difference
	// once opened.
	var open bool
	p.eval(`document.querySelector("#compare-numbers").open`, &open)
	if open {
		p.t.Errorf("the numbers are open by default; they should be one click away")
	}
	p.do("open the numbers", chromedp.Click(chromedp.CSS("#compare-numbers summary")))
	d := api.Candidates[0].Score - api.Candidates[1].Score
	nats := p.text("#compare-nats")
	if want := signed(d) + " nats"; !strings.Contains(nats, want) {
		p.t.Errorf("the numbers say %q, want the score difference %s", nats, want)
	}
	if !strings.Contains(nats, "likelihood ratio") {
		p.t.Errorf("the numbers %q lack the likelihood ratio", nats)
	}
	p.shotOf("#compare-panel", "compare-1-2")

	// Any pair: select #3 and compare it with #2.
	p.do("select #3", chromedp.Click(chromedp.CSS(`#candidate-list .candidate[data-index="2"] .pick`)))
	p.do("compare with #2", chromedp.SetValue(chromedp.ID("compare"), "1"),
		chromedp.Evaluate[chromedp.Void](`document.querySelector("#compare").dispatchEvent(new Event("change"))`))
	p.waitFor("comparison of #3 and #2", `document.querySelector("#compare-title").textContent === "Side by side: #3 and #2"`, 5*time.Second)
	p.do("compare with none", chromedp.SetValue(chromedp.ID("compare"), ""),
		chromedp.Evaluate[chromedp.Void](`document.querySelector("#compare").dispatchEvent(new Event("change"))`))
	p.waitFor("comparison hidden", `document.querySelector("#compare-panel").hidden && !document.querySelector("#plot path.over-trace")`, 5*time.Second)
	checkOwnShifts(p, api)
	p.do("back to #1", chromedp.Click(chromedp.CSS(`#candidate-list .candidate[data-index="0"] .pick`)))
	return id
}

// checkOwnShifts finds a candidate with two environments on one peak and
// checks that the table gives each its own predicted δ, never their mean.
func checkOwnShifts(p *page, api apiCandidates) {
	for ci, c := range api.Candidates {
		for ai, a := range c.Assignments {
			if len(a.EnvironmentDetails) < 2 {
				continue
			}
			p.do("select the candidate", chromedp.Click(chromedp.CSS(fmt.Sprintf(`#candidate-list .candidate[data-index="%d"] .pick`, ci))))
			sel := fmt.Sprintf(`#explain-rows tr.assign[data-index="%d"]`, ai)
			p.waitFor("its table", fmt.Sprintf(`document.querySelector('%s') !== null`, sel), 5*time.Second)
			var got []string
			p.eval(fmt.Sprintf(`[...document.querySelectorAll('%s .pred-env-value')].map(e => e.textContent)`, sel), &got)
			var want []string
			for _, e := range a.EnvironmentDetails {
				want = append(want, fmt.Sprintf("%.2f", e.PredictedShift))
			}
			if strings.Join(got, " ") != strings.Join(want, " ") {
				p.t.Errorf("#%d peak %d: table predicts δ %v, want each environment's own %v", c.Rank, a.Peak+1, got, want)
			}
			var cell string
			p.eval(fmt.Sprintf(`document.querySelector('%s .pred-shift').textContent`, sel), &cell)
			if mean := fmt.Sprintf("%.2f", a.PredictedShift); !slices.Contains(want, mean) && strings.Contains(cell, mean) {
				p.t.Errorf("#%d peak %d: the table shows the mean δ %s (%q)", c.Rank, a.Peak+1, mean, cell)
			}
			p.t.Logf("#%d peak %d: each environment its own δ: %v", c.Rank, a.Peak+1, got)
			return
		}
	}
	p.t.Logf("no candidate puts two environments on one peak; nothing to check")
}

// keepingRanker stands for a ranker that, cancelled, hands back the best
// candidates it has so far with the context's error. It blocks until
// cancelled, then returns a ranking made beforehand by the real ranker.
type keepingRanker struct {
	res *ranker.Result
}

func (k *keepingRanker) Rank(ctx context.Context, req ranker.Request, progress func(ranker.Progress)) (*ranker.Result, error) {
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	var n int64
	for {
		select {
		case <-ctx.Done():
			res := *k.res
			res.Complete = false
			res.Search.Status = ranker.StatusStopped
			return &res, ctx.Err()
		case <-time.After(50 * time.Millisecond):
		}
		n += 10
		progress(ranker.Progress{Generated: n, Scored: n, TotalEstimate: 100000})
	}
}

// keepingAPI is the service with a keepingRanker whose ranking is the real
// ranker's for the page's example.
func keepingAPI(t *testing.T) *server.Server {
	t.Helper()
	rk := ranker.New(ranker.Options{})
	res, err := rk.Rank(context.Background(), ranker.Request{Formula: "C4H8O2",
		Peaks: mustPeaks(t, "4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H), 1.26 (t, J = 7.1 Hz, 3H)")}, nil)
	if err != nil {
		t.Fatalf("rank the example: %v", err)
	}
	st := store.NewMemory()
	t.Cleanup(st.Close)
	srv := server.New(slog.New(slog.NewTextHandler(io.Discard, nil)), st, &keepingRanker{res: res}, server.Config{
		Web: web.Handler(), AllowAnonymous: true, Workers: 1,
		ProgressEvery: 100 * time.Millisecond, CancelPoll: 100 * time.Millisecond,
	})
	srv.Start()
	t.Cleanup(func() {
		ctx, cancel := context.WithTimeout(context.Background(), 10*time.Second)
		defer cancel()
		_ = srv.Shutdown(ctx)
	})
	return srv
}

func testCancelKeeps(p *page) {
	p.open("/")
	p.do("submit the example", chromedp.Click(chromedp.ID("load-example")), chromedp.Click(chromedp.ID("submit")))
	id := jobIDFromURL(p)
	p.waitFor("job running", `document.querySelector("#job-status").dataset.status === "running"`, 30*time.Second)
	p.do("cancel", chromedp.Click(chromedp.ID("cancel-job")))
	p.waitFor("cancelled with candidates", `document.querySelector("#job-status").dataset.status === "cancelled" &&
		!document.querySelector("#results").hidden && document.querySelectorAll("#candidate-list .candidate").length > 0`, 30*time.Second)
	if got := p.text("#job-status"); !strings.Contains(got, "cancelled") || !strings.Contains(got, "kept") {
		p.t.Errorf("badge %q, want it to say cancelled with the best so far kept", got)
	}
	if got := p.text("#job-error"); !strings.Contains(got, "best found before the cancel") {
		p.t.Errorf("job note %q, want it to say the candidates are the best before the cancel", got)
	}
	if got := p.text("#search-scope-head"); !strings.Contains(got, "cancelled on request") {
		p.t.Errorf("result header %q, want the stop reason (cancelled on request)", got)
	}
	var api apiCandidates
	getJSON(p.t, p.base+"/v1/jobs/"+id+"/candidates?limit=100", &api)
	var listed int
	p.eval(`document.querySelectorAll("#candidate-list .candidate").length`, &listed)
	if listed != len(api.Candidates) || api.Search.StopReason != server.StopReasonCancelled {
		p.t.Errorf("page lists %d candidates; the API keeps %d with stop reason %q", listed, len(api.Candidates), api.Search.StopReason)
	}
	p.shot("cancelled-kept-1280")
}

// mustPeaks reads a journal-style 1H list as the service does.
func mustPeaks(t *testing.T, text string) spectrum.PeakList {
	t.Helper()
	l, err := spectrum.ReadList([]byte(text), spectrum.H1)
	if err != nil {
		t.Fatalf("read peaks %q: %v", text, err)
	}
	return l
}

func testPrintLayout(p *page, id string) { p.t.Skip("not yet") }
func testReport(p *page, id string)      { p.t.Skip("not yet") }
func testIntegralWarning(p *page)        { p.t.Skip("not yet") }
func testRecentJobs(p *page)             { p.t.Skip("not yet") }
