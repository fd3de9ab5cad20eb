package e2e

import (
	"bytes"
	"context"
	"encoding/csv"
	"encoding/json"
	"fmt"
	"html"
	"io"
	"log/slog"
	"net/http/httptest"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/cdproto/browser"
	"github.com/chromedp/cdproto/emulation"
	"github.com/chromedp/chromedp"
	"github.com/stretchr/testify/require"

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

// testPrintLayout emulates print media at A4 width (794 CSS px at 96 dpi)
// and checks the printed result: no control buttons, no clipped lists, every
// column of the table peak by peak, with the search status and the caution.
func testPrintLayout(p *page, id string) {
	p.do("open the job", chromedp.Navigate(p.base+"/jobs/"+id))
	waitDone(p)
	p.waitFor("drawings", `document.querySelector("#candidate-list .structure svg") !== null`, 30*time.Second)
	p.do("A4 viewport", chromedp.EmulateViewport(794, 1123))
	if _, err := chromedp.Call(p.ctx, emulation.SetEmulatedMedia, emulation.SetEmulatedMediaParams{Media: "print"}); err != nil {
		p.t.Fatalf("emulate print media: %v", err)
	}
	defer func() {
		if _, err := chromedp.Call(p.ctx, emulation.SetEmulatedMedia, emulation.SetEmulatedMediaParams{}); err != nil {
			p.t.Errorf("back to screen media: %v", err)
		}
		p.do("wide viewport", chromedp.EmulateViewport(1280, 800))
	}()
	var controls []string
	p.eval(`[...document.querySelectorAll("button, select, input")].filter(b => b.getClientRects().length > 0).map(b => b.id || b.textContent.trim())`, &controls)
	if len(controls) > 0 {
		p.t.Errorf("printed page shows controls: %v", controls)
	}
	var clipped []string
	p.eval(`[...document.querySelectorAll("#candidate-list, #view-job .table-wrap, #compare-panel, #results-warnings")].filter(e =>
		e.getClientRects().length > 0 && (e.scrollHeight > e.clientHeight + 1 || e.scrollWidth > e.clientWidth + 1)).map(e => e.id || e.className)`, &clipped)
	if len(clipped) > 0 {
		p.t.Errorf("printed page clips: %v", clipped)
	}
	var heads []string
	p.eval(`[...document.querySelectorAll("#explain-table thead th")].filter(th => th.getClientRects().length > 0 &&
		th.getBoundingClientRect().right <= document.documentElement.clientWidth + 1).map(th => th.textContent)`, &heads)
	want := []string{"Observed δ", "Assigned to", "Predicted δ", "Δδ", "Multiplicity (obs. / pred.)", "H (obs. / exp.)", "Share of score"}
	if !slices.Equal(heads, want) {
		p.t.Errorf("printed table columns %q, want all of %q inside the page", heads, want)
	}
	var cands, shown int
	p.eval(`document.querySelectorAll("#candidate-list .candidate").length`, &cands)
	p.eval(`[...document.querySelectorAll("#candidate-list .candidate")].filter(li => li.getClientRects().length > 0).length`, &shown)
	if shown != cands {
		p.t.Errorf("printed page shows %d of %d candidates", shown, cands)
	}
	for _, sel := range []string{"#results-caution", "#search-scope-head", "#job-status"} {
		var vis bool
		p.eval(fmt.Sprintf(`document.querySelector(%q).getClientRects().length > 0`, sel), &vis)
		if !vis {
			p.t.Errorf("printed page hides %s", sel)
		}
	}
	p.shot("print-a4")
}

// testReport downloads the filing report, the CSV and the JSON, and
// checks that they carry the same header: reference, formula, solvent,
// MHz, peak list, search status, warnings and the caution.
func testReport(p *page, id string) {
	p.do("open the job", chromedp.Navigate(p.base+"/jobs/"+id))
	waitDone(p)
	p.waitFor("drawings", `document.querySelector("#candidate-list .structure svg") !== null`, 30*time.Second)
	var api apiCandidates
	getJSON(p.t, p.base+"/v1/jobs/"+id+"/candidates?limit=100", &api)
	dl := p.t.TempDir()
	if _, err := chromedp.CallBrowser(p.ctx, browser.SetDownloadBehavior, browser.SetDownloadBehaviorParams{
		Behavior: browser.SetDownloadBehaviorBehaviorAllow, DownloadPath: dl}); err != nil {
		p.t.Fatalf("allow downloads: %v", err)
	}
	p.do("download the report, CSV, JSON and drawings", chromedp.Click(chromedp.ID("dl-report")), chromedp.Click(chromedp.ID("dl-csv")),
		chromedp.Click(chromedp.ID("dl-json")), chromedp.Click(chromedp.ID("dl-svg")), chromedp.Click(chromedp.ID("dl-png")))
	report := string(waitFile(p.t, filepath.Join(dl, "shiftrank-"+id+"-report.html")))
	ref := "Saltmarsh Row / SR-0412, distillate fraction 2" // the page's example
	for _, want := range []string{ref, ">C4H8O2<", ">CDCl3<", "400 MHz", "4.12 (q, J = 7.1 Hz, 2H)", "2.05 (s, 3H)",
		api.Search.Status, "Caution: A ranking is a hypothesis", `id="report-warnings"`, "#1 peak by peak"} {
		if !strings.Contains(report, want) {
			p.t.Errorf("report lacks %q", want)
		}
	}
	if n := strings.Count(report, "<svg"); n < min(5, len(api.Candidates)) {
		p.t.Errorf("report draws %d structures, want the top %d", n, min(5, len(api.Candidates)))
	}
	for _, c := range api.Candidates[:min(5, len(api.Candidates))] {
		if !strings.Contains(report, fmt.Sprintf(`probability <span class="prob">%s</span>`, html.EscapeString(pct(c.Probability)))) {
			p.t.Errorf("report lacks #%d's probability %s", c.Rank, pct(c.Probability))
		}
	}
	if n := strings.Count(report[strings.Index(report, `id="report-table"`):], "<tr>") - 1; n != len(api.Candidates[0].Assignments) {
		p.t.Errorf("report's table of #1 has %d rows, want %d", n, len(api.Candidates[0].Assignments))
	}

	recs, err := csv.NewReader(bytes.NewReader(waitFile(p.t, filepath.Join(dl, "shiftrank-"+id+".csv")))).ReadAll()
	if err != nil || len(recs) < 2 {
		p.t.Fatalf("CSV: %v (%d rows)", err, len(recs))
	}
	col := func(name string) string {
		i := slices.Index(recs[0], name)
		if i < 0 {
			p.t.Errorf("CSV lacks the column %s", name)
			return ""
		}
		return recs[1][i]
	}
	for name, want := range map[string]string{"reference": ref, "formula": "C4H8O2", "solvent": "CDCl3", "mhz": "400",
		"search_status": api.Search.Status, "job_id": id, "probability_text": pct(api.Candidates[0].Probability)} {
		if got := col(name); got != want {
			p.t.Errorf("CSV %s = %q, want %q", name, got, want)
		}
	}
	if got := col("peaks_1h"); !strings.Contains(got, "4.12 (q, J = 7.1 Hz, 2H)") {
		p.t.Errorf("CSV peaks_1h = %q, want the observed list", got)
	}
	if got := col("caution"); !strings.Contains(got, "hypothesis") {
		p.t.Errorf("CSV caution = %q", got)
	}
	var js struct {
		Report map[string]any `json:"report"`
	}
	if err := json.Unmarshal(waitFile(p.t, filepath.Join(dl, "shiftrank-"+id+".json")), &js); err != nil {
		p.t.Fatalf("JSON: %v", err)
	}
	for _, k := range []string{"reference", "formula", "solvent", "mhz", "peaks_1h", "search_status", "warnings", "caution", "constraints_off"} {
		if _, ok := js.Report[k]; !ok {
			p.t.Errorf("JSON report header lacks %s", k)
		}
	}
	if js.Report["reference"] != ref || js.Report["formula"] != "C4H8O2" {
		p.t.Errorf("JSON report header = %v", js.Report)
	}
	if svg := string(waitFile(p.t, filepath.Join(dl, "shiftrank-"+id+"-1.svg"))); !strings.Contains(svg, "<svg") {
		p.t.Errorf("drawing SVG download is not SVG: %.80s", svg)
	}
	if png := waitFile(p.t, filepath.Join(dl, "shiftrank-"+id+"-1.png")); !bytes.HasPrefix(png, []byte("\x89PNG")) {
		p.t.Errorf("drawing PNG download is not a PNG")
	}
}

// TestExportHeader checks the export header of report.js against a fixed
// review state, in the browser: every field, the stop reason only for a
// search that stopped early, and the constraints switched off.
func TestExportHeader(t *testing.T) {
	exe := chromiumPath(t)
	srv := httptest.NewServer(web.Handler())
	t.Cleanup(srv.Close)
	ctx := newBrowser(t, exe)
	p := &page{t: t, ctx: ctx, base: srv.URL, art: artifactsDir(t), errs: watchScripts(ctx)}
	p.open("/")
	for _, tc := range []struct {
		name   string
		review string
		want   map[string]any
	}{
		{"complete search", `{id: "j1", mhz: 400, req: {reference: "NB-7/3", formula: "C4H8O2", solvent: "CDCl3", mhz: 400},
			data: {formula: "C4H8O2", solvent: "CDCl3", mhz: 400, warnings: ["w1"], caution: "c",
				search: {status: "complete", stop_reason: "x", scope: "all isomers", constraints: [{id: "a", enabled: true}, {id: "b", enabled: false}]}},
			observed: [{shift: 4.12, multiplicity: "q", j: [7.1], integral: 2}, {shift: 7.3, hi: 7.35, lo: 7.25, multiplicity: "m", h: 5, excluded: true}],
			carbon: [{shift: 171.1, dept: "C"}]}`,
			map[string]any{"job_id": "j1", "reference": "NB-7/3", "formula": "C4H8O2", "solvent": "CDCl3", "mhz": 400.0,
				"peaks_1h": "4.12 (q, J = 7.1 Hz, 2H); 7.35–7.25 (m, 5H) [not scored]", "peaks_13c": "171.1 (C)",
				"search_status": "complete", "search_stop_reason": "", "search_scope": "all isomers", "search_summary": "",
				"constraints_on": []any{"a"}, "constraints_off": []any{"b"}, "warnings": []any{"w1"}, "caution": "c"}},
		{"stopped early, no request at hand", `{id: "j2", mhz: 600, data: {formula: "C3H8O", search: {status: "stopped early", stop_reason: "cancelled on request"}}}`,
			map[string]any{"job_id": "j2", "reference": "", "formula": "C3H8O", "solvent": "", "mhz": 600.0, "peaks_1h": "", "peaks_13c": "",
				"search_status": "stopped early", "search_stop_reason": "cancelled on request", "search_scope": "", "search_summary": "",
				"constraints_on": []any{}, "constraints_off": []any{}, "warnings": []any{}, "caution": ""}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			q := &page{t: t, ctx: p.ctx, base: p.base, art: p.art, errs: p.errs}
			var got map[string]any
			q.eval(`import("/static/report.js").then(m => m.exportHeader(`+tc.review+`))`, &got)
			require.Equal(t, tc.want, got)
		})
	}
}

// testIntegralWarning enters integrals adding up to 18 H for C4H8O2
// (8 H): the page warns at the peak field before any run and offers to
// rank anyway.
func testIntegralWarning(p *page) {
	p.open("/")
	p.do("fill integrals of 18 H for an 8 H formula",
		chromedp.SendKeys(chromedp.ID("formula"), "C4H8O2"),
		chromedp.SendKeys(chromedp.ID("peaks-text"), "4.12 (q, J = 7.1 Hz, 6H), 2.05 (s, 6H), 1.26 (t, J = 7.1 Hz, 6H)"),
		chromedp.Click(chromedp.ID("submit")))
	p.waitFor("integral warning", `!document.querySelector("#integral-warning").hidden`, 5*time.Second)
	msg := p.text("#integral-warning-text")
	if !strings.Contains(msg, "18 H") || !strings.Contains(msg, "C4H8O2 has 8 H") {
		p.t.Errorf("integral warning %q, want the sum (18 H) and the formula's 8 H", msg)
	}
	var path string
	var near bool
	p.eval(`location.pathname`, &path)
	p.eval(`document.querySelector("#peaks-text").closest(".field").contains(document.querySelector("#integral-warning"))`, &near)
	if path != "/" || !near {
		p.t.Errorf("after the warning the page is at %q (want still the form) and the warning is at the peak field: %v", path, near)
	}
	p.shot("integral-warning")
	p.do("rank anyway", chromedp.Click(chromedp.ID("integral-proceed")))
	jobIDFromURL(p)

	// Integrals that fit the formula run without a word.
	p.open("/")
	p.do("the example", chromedp.Click(chromedp.ID("load-example")), chromedp.Click(chromedp.ID("submit")))
	jobIDFromURL(p)
}

// testRecentJobs checks the list of recent jobs on the form: reference,
// formula, state, top candidate and its probability.
func testRecentJobs(p *page) {
	p.open("/")
	p.waitFor("recent jobs", `document.querySelectorAll("#recent-list tr").length > 0`, 10*time.Second)
	var rows []struct {
		Ref, Formula, State, Top, Prob string
	}
	p.waitFor("a finished job with its top candidate", `[...document.querySelectorAll("#recent-list tr")].some(tr => tr.querySelector(".top code"))`, 30*time.Second)
	p.eval(`[...document.querySelectorAll("#recent-list tr")].map(tr => ({Ref: tr.querySelector(".ref").textContent,
		Formula: tr.querySelector(".formula").textContent, State: tr.querySelector(".state").textContent,
		Top: tr.querySelector(".top").textContent, Prob: tr.querySelector(".prob").textContent}))`, &rows)
	found := false
	for _, r := range rows {
		p.t.Logf("recent: %+v", r)
		if r.Formula == "C4H8O2" && strings.HasPrefix(r.State, "done") && r.Top == "CC(=O)OCC" && r.Prob != "—" {
			found = true
		}
	}
	if !found {
		p.t.Errorf("no recent job shows C4H8O2, done, with its top candidate CC(=O)OCC and a probability")
	}
	p.shotOf("#recent", "recent-jobs")
}
