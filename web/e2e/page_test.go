package e2e

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"fmt"
	"net/http/httptest"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/cdproto/browser"
	"github.com/chromedp/chromedp"
)

// TestPage walks through the page as a chemist would, against the service:
// submit the example and review its ranking, a rejected formula, a
// cancelled long job, and a service that asks for an API key.
func TestPage(t *testing.T) {
	exe := chromiumPath(t)
	h, _ := newAPI(t, false)
	srv := httptest.NewServer(h)
	t.Cleanup(srv.Close)
	ctx := newBrowser(t, exe)
	p := &page{t: t, ctx: ctx, base: srv.URL, art: artifactsDir(t), errs: watchScripts(ctx)}
	// Scenarios share one browser tab.
	p.run("example", testExample)
	p.run("bad formula", testBadFormula)
	p.run("cancel", testCancel)
	p.run("more candidates than one API page", testManyCandidates)

	// A service that requires API keys.
	hk, key := newAPI(t, true)
	srvKey := httptest.NewServer(hk)
	t.Cleanup(srvKey.Close)
	pk := &page{t: t, ctx: ctx, base: srvKey.URL, art: p.art, errs: p.errs}
	pk.run("api key", func(p *page) { testAPIKey(p, key) })
}

func testAPIKey(p *page, key string) {
	p.open("/")
	p.do("submit without a key",
		chromedp.Click(chromedp.ID("load-example")),
		chromedp.Click(chromedp.ID("submit")))
	p.waitFor("key dialog", `document.querySelector("#key-dialog").open`, 10*time.Second)
	first := p.text("#key-message")
	p.do("enter a wrong key",
		chromedp.SendKeys(chromedp.ID("key-input"), "not-a-key"),
		chromedp.Click(chromedp.ID("key-save")))
	p.waitFor("the dialog again, saying the key was refused", fmt.Sprintf(
		`document.querySelector("#key-dialog").open && document.querySelector("#key-message").textContent !== %q`, first), 10*time.Second)
	msg := p.text("#key-message")
	if !strings.Contains(msg, "did not accept") {
		p.t.Errorf("message for a wrong key = %q, want it to say the key was not accepted", msg)
	}
	p.shot("api-key-wrong-1280")
	p.do("enter the right key",
		chromedp.Evaluate[chromedp.Void](`document.querySelector("#key-input").value = ""`),
		chromedp.SendKeys(chromedp.ID("key-input"), key),
		chromedp.Click(chromedp.ID("key-save")))
	id := jobIDFromURL(p)
	p.waitFor("job done with the key", `document.querySelector("#job-status").dataset.status === "succeeded"`, 90*time.Second)
	var stored string
	p.eval(`sessionStorage.getItem("shiftrank.apiKey") || ""`, &stored)
	if stored != key {
		p.t.Errorf("session storage holds key %q, want the one entered", stored)
	}
	p.t.Logf("job %s ran with the key", id)
	p.do("forget the key", chromedp.Evaluate[chromedp.Void](`sessionStorage.removeItem("shiftrank.apiKey")`))
}

// jobIDFromURL waits for the page to move to /jobs/{id} and returns the id.
func jobIDFromURL(p *page) string {
	p.t.Helper()
	p.waitFor("job page", `/^\/jobs\/[A-Za-z0-9_-]+$/.test(location.pathname)`, 20*time.Second)
	var path string
	p.eval(`location.pathname`, &path)
	return strings.TrimPrefix(path, "/jobs/")
}

func testExample(p *page) {
	p.open("/")
	p.shot("form-empty-1280")
	p.do("load example", chromedp.Click(chromedp.ID("load-example")))
	var rows int
	p.eval(`document.querySelectorAll("#peak-rows tr").length`, &rows)
	if rows != 3 {
		p.t.Fatalf("peak table has %d rows after loading the example, want 3", rows)
	}
	if got := p.text("#formula-dbe"); got != "DBE 1" {
		p.t.Errorf("live DBE for C4H8O2 = %q, want %q (DBE = 1 + (2·4 − 8)/2 = 1; common practice)", got, "DBE 1")
	}
	p.shot("form-example-1280")
	p.do("submit", chromedp.Click(chromedp.ID("submit")))
	id := jobIDFromURL(p)
	p.waitFor("job done", `document.querySelector("#job-status").dataset.status === "succeeded"`, 90*time.Second)
	p.waitFor("a drawn structure", `document.querySelector("#candidate-list .structure svg") !== null`, 60*time.Second)
	var drawnBy bool
	p.eval(`document.querySelector("#candidate-list .structure").innerHTML.includes("xmlns:rdkit")`, &drawnBy)
	if !drawnBy {
		p.t.Errorf("candidate drawing is not RDKit's SVG")
	}
	p.waitFor("the detail drawing", `document.querySelector("#detail-structure svg") !== null`, 30*time.Second)

	var bar string
	p.eval(`document.querySelector("#job-progress").getAttribute("aria-valuenow")`, &bar)
	if bar != "100" {
		p.t.Errorf("progress bar at %s %% when the job is done, want 100", bar)
	}

	var api struct {
		JobID        string `json:"job_id"`
		IsomersTotal int64  `json:"isomers_total"`
		Candidates   []struct {
			Rank        int     `json:"rank"`
			SMILES      string  `json:"smiles"`
			Probability float64 `json:"probability"`
			Assignments []struct {
				ObservedShift  float64   `json:"observed_shift"`
				ObservedRange  []float64 `json:"observed_range"`
				PredictedShift float64   `json:"predicted_shift"`
				ObservedH      float64   `json:"observed_h"`
				ExpectedH      int       `json:"expected_h"`
				ScoreShare     float64   `json:"score_share"`
				Atoms          []int     `json:"atoms"`
			} `json:"assignments"`
		} `json:"candidates"`
	}
	getJSON(p.t, p.base+"/v1/jobs/"+id+"/candidates", &api)
	if len(api.Candidates) == 0 {
		p.t.Fatalf("API returned no candidates for job %s", id)
	}

	// The list shows each candidate's SMILES and probability as the API has them.
	var listed []struct {
		SMILES string `json:"smiles"`
		Prob   string `json:"prob"`
	}
	p.eval(`[...document.querySelectorAll("#candidate-list .candidate")].map(li => ({
		smiles: li.querySelector(".smiles code").textContent,
		prob: li.querySelector(".prob-num").textContent}))`, &listed)
	if len(listed) != len(api.Candidates) {
		p.t.Errorf("page lists %d candidates, API has %d", len(listed), len(api.Candidates))
	}
	for i := range min(len(listed), len(api.Candidates)) {
		c := api.Candidates[i]
		if listed[i].SMILES != c.SMILES {
			p.t.Errorf("candidate %d SMILES on the page %q, API %q", i+1, listed[i].SMILES, c.SMILES)
		}
		if want := pct(c.Probability); listed[i].Prob != want {
			p.t.Errorf("candidate %d probability on the page %q, API %v (%q)", i+1, listed[i].Prob, c.Probability, want)
		}
	}

	// Open the explanation of the top candidate and compare its table to the API.
	p.do("select candidate 1", chromedp.Click(chromedp.CSS("#candidate-list .candidate .pick")))
	p.waitFor("explanation rows", `document.querySelectorAll("#explain-rows tr.assign").length > 0`, 10*time.Second)
	var table []struct {
		Obs, Pred, H, Share string
	}
	p.eval(`[...document.querySelectorAll("#explain-rows tr.assign")].map(tr => ({
		Obs: tr.querySelector(".obs-shift").textContent,
		Pred: tr.querySelector(".pred-value").textContent,
		H: tr.querySelector(".hcount").textContent,
		Share: (tr.querySelector(".share-num") || {}).textContent || ""}))`, &table)
	top := api.Candidates[0]
	if len(table) != len(top.Assignments) {
		p.t.Fatalf("explanation table has %d rows, API has %d assignments", len(table), len(top.Assignments))
	}
	for i, a := range top.Assignments {
		want := fmt.Sprintf("%.2f", a.ObservedShift)
		if len(a.ObservedRange) == 2 && a.ObservedRange[0] != a.ObservedRange[1] {
			want = fmt.Sprintf("%.2f–%.2f", max(a.ObservedRange[0], a.ObservedRange[1]), min(a.ObservedRange[0], a.ObservedRange[1]))
		}
		if table[i].Obs != want {
			p.t.Errorf("row %d observed δ %q, API %q", i+1, table[i].Obs, want)
		}
		if want := fmt.Sprintf("%.2f", a.PredictedShift); table[i].Pred != want {
			p.t.Errorf("row %d predicted δ %q, API %q", i+1, table[i].Pred, want)
		}
		obsH := "—"
		if a.ObservedH != 0 {
			obsH = fmt.Sprintf("%.1f", a.ObservedH)
		}
		if want := fmt.Sprintf("%s / %d", obsH, a.ExpectedH); table[i].H != want {
			p.t.Errorf("row %d H %q, API %q", i+1, table[i].H, want)
		}
		if want := signed(a.ScoreShare); table[i].Share != want {
			p.t.Errorf("row %d share of score %q, API %v (%q)", i+1, table[i].Share, a.ScoreShare, want)
		}
	}

	// Rows are reachable from the keyboard: Enter on a focused row marks it.
	p.do("keyboard select of row 2",
		chromedp.Focus(chromedp.CSS(`#explain-rows tr.assign[data-index="1"]`)),
		chromedp.KeyEvent("\r"))
	p.waitFor("row 2 selected by keyboard", `document.querySelector('#explain-rows tr.assign[data-index="1"]').getAttribute("aria-selected") === "true"`, 5*time.Second)
	p.do("keyboard unselect of row 2", chromedp.KeyEvent("\r"))
	p.waitFor("row 2 unselected", `document.querySelector('#explain-rows tr.assign[data-index="1"]').getAttribute("aria-selected") === "false"`, 5*time.Second)

	// Selecting a row marks its atoms in the drawing.
	var before, after string
	p.eval(`document.querySelector("#detail-structure").innerHTML`, &before)
	p.do("select row 1", chromedp.Click(chromedp.CSS("#explain-rows tr.assign")))
	p.waitFor("highlighted drawing", fmt.Sprintf(`document.querySelector("#detail-structure").innerHTML !== %q &&
		document.querySelector("#detail-structure svg") !== null`, before), 10*time.Second)
	p.eval(`document.querySelector("#detail-structure").innerHTML`, &after)
	// RDKit marks a highlighted atom with an ellipse of class atom-N.
	for _, a := range top.Assignments[0].Atoms {
		if !regexp.MustCompile(fmt.Sprintf(`<ellipse[^>]*class=["']atom-%d["']`, a)).MatchString(after) {
			p.t.Errorf("drawing after selecting row 1 does not mark atom %d (the API's atoms for that peak: %v)", a, top.Assignments[0].Atoms)
		}
	}
	if strings.Contains(before, "<ellipse") {
		p.t.Errorf("drawing marks atoms before any row is selected")
	}
	var plotLinks int
	p.eval(`document.querySelectorAll("#plot svg line.link").length`, &plotLinks)
	if plotLinks < len(top.Assignments) {
		p.t.Errorf("plot joins %d assignments, want at least %d", plotLinks, len(top.Assignments))
	}
	p.do("zoom to the marked peak", chromedp.Click(chromedp.ID("zoom-peak")))
	p.waitFor("zoomed axis", `Number(document.querySelector("#zoom-hi").value) - Number(document.querySelector("#zoom-lo").value) < 2`, 5*time.Second)
	p.shotOf("#plot", "plot-zoomed")
	p.do("fit the plot", chromedp.Click(chromedp.ID("zoom-fit")))
	if len(api.Candidates) > 1 {
		p.do("overlay candidate 2", chromedp.SetValue(chromedp.ID("compare"), "1"),
			chromedp.Evaluate[chromedp.Void](`document.querySelector("#compare").dispatchEvent(new Event("change"))`))
		p.waitFor("overlay trace", `document.querySelector("#plot path.over-trace") !== null`, 5*time.Second)
	}
	p.shot("results-1280")

	// Copy a SMILES.
	p.do("copy SMILES", chromedp.Click(chromedp.CSS("#candidate-list .candidate .copy")))
	p.waitFor("copy confirmed", `document.querySelector("#candidate-list .candidate .copy").textContent === "Copied"`, 5*time.Second)

	// Download the ranking as CSV and JSON and compare both with the API.
	dl := p.t.TempDir()
	if _, err := chromedp.CallBrowser(p.ctx, browser.SetDownloadBehavior, browser.SetDownloadBehaviorParams{
		Behavior: browser.SetDownloadBehaviorBehaviorAllow, DownloadPath: dl}); err != nil {
		p.t.Fatalf("allow downloads: %v", err)
	}
	p.do("download CSV and JSON", chromedp.Click(chromedp.ID("dl-csv")), chromedp.Click(chromedp.ID("dl-json")))
	csvPath := filepath.Join(dl, "shiftrank-"+id+".csv")
	jsonPath := filepath.Join(dl, "shiftrank-"+id+".json")
	csvData, jsonData := waitFile(p.t, csvPath), waitFile(p.t, jsonPath)
	recs, err := csv.NewReader(bytes.NewReader(csvData)).ReadAll()
	if err != nil {
		p.t.Fatalf("downloaded CSV: %v", err)
	}
	if len(recs) != len(api.Candidates)+1 || recs[0][0] != "rank" || recs[0][1] != "smiles" || recs[0][2] != "probability" {
		p.t.Fatalf("downloaded CSV has %d rows (header %v), want a header and %d candidates", len(recs), recs[0], len(api.Candidates))
	}
	for i, c := range api.Candidates {
		r := recs[i+1]
		prob, _ := strconv.ParseFloat(r[2], 64)
		if r[0] != strconv.Itoa(c.Rank) || r[1] != c.SMILES || prob != c.Probability {
			p.t.Errorf("CSV row %d = %v, API rank %d %s probability %v", i+1, r[:3], c.Rank, c.SMILES, c.Probability)
		}
	}
	var saved struct {
		JobID      string            `json:"job_id"`
		Candidates []json.RawMessage `json:"candidates"`
	}
	if err := json.Unmarshal(jsonData, &saved); err != nil {
		p.t.Fatalf("downloaded JSON: %v", err)
	}
	if saved.JobID != id || len(saved.Candidates) != len(api.Candidates) {
		p.t.Errorf("downloaded JSON names job %q with %d candidates, want %q with %d", saved.JobID, len(saved.Candidates), id, len(api.Candidates))
	}

	// The deep link survives a reload.
	p.do("reload job page", chromedp.Reload())
	p.waitFor("job done after reload", `document.querySelector("#job-status").dataset.status === "succeeded" &&
		document.querySelectorAll("#candidate-list .candidate").length > 0`, 30*time.Second)

	// Narrow screen.
	p.do("narrow viewport", chromedp.EmulateViewport(400, 860, chromedp.EmulateScale(1)))
	p.waitFor("narrow layout", `document.documentElement.scrollWidth <= 420`, 10*time.Second)
	p.shot("results-400")
	p.do("back to the form", chromedp.Navigate(p.base+"/"))
	p.waitFor("form", `document.querySelector("#peak-rows tr") !== null`, 10*time.Second)
	p.do("load example", chromedp.Click(chromedp.ID("load-example")))
	p.waitFor("narrow form", `document.documentElement.scrollWidth <= 420`, 10*time.Second)
	p.shot("form-example-400")
	p.do("wide viewport", chromedp.EmulateViewport(1280, 800))
}

// pct formats a probability the way the page does.
func pct(p float64) string {
	v := 100 * p
	switch {
	case v >= 99.95:
		return "> 99.9 %"
	case v > 0 && v < 0.1:
		return "< 0.1 %"
	}
	return fmt.Sprintf("%.1f %%", v)
}

// signed formats a number with an explicit sign the way the page does.
func signed(v float64) string {
	if v >= 0 {
		return fmt.Sprintf("+%.2f", v)
	}
	return fmt.Sprintf("−%.2f", -v)
}

// testManyCandidates keeps more candidates than the API sends in one page
// (100) and checks that the page lists them all.
func testManyCandidates(p *page) {
	p.open("/")
	p.do("fill a ranking with 120 candidates",
		chromedp.SendKeys(chromedp.ID("formula"), "C7H8"),
		chromedp.SendKeys(chromedp.ID("peaks-text"), "7.30–7.10 (m, 5H), 2.35 (s, 3H)"),
		chromedp.Evaluate[chromedp.Void](`document.querySelector("details.options").open = true;
			document.querySelector("#top-k").value = "120";
			document.querySelector("#all-isomers").checked = true`),
		chromedp.Click(chromedp.ID("submit")))
	id := jobIDFromURL(p)
	p.waitFor("job done", `document.querySelector("#job-status").dataset.status === "succeeded" &&
		document.querySelectorAll("#candidate-list .candidate").length > 0`, 90*time.Second)
	var api struct {
		Total int `json:"total"`
	}
	getJSON(p.t, p.base+"/v1/jobs/"+id+"/candidates?limit=1", &api)
	if api.Total <= 100 {
		p.t.Fatalf("the service kept %d candidates; this check needs more than one page of 100", api.Total)
	}
	var listed int
	p.eval(`document.querySelectorAll("#candidate-list .candidate").length`, &listed)
	if listed != api.Total {
		p.t.Errorf("page lists %d candidates, the service kept %d", listed, api.Total)
	}
}

// waitFile waits for a download to appear and returns its content.
func waitFile(t *testing.T, path string) []byte {
	t.Helper()
	deadline := time.Now().Add(15 * time.Second)
	for {
		b, err := os.ReadFile(path)
		if err == nil && len(b) > 0 {
			return b
		}
		if time.Now().After(deadline) {
			t.Fatalf("download %s did not arrive: %v", path, err)
		}
		time.Sleep(100 * time.Millisecond)
	}
}

func testBadFormula(p *page) {
	p.open("/")
	// The table and the text follow each other both ways.
	p.do("add a peak in the table",
		chromedp.Click(chromedp.ID("load-example")),
		chromedp.Click(chromedp.ID("add-peak")),
		chromedp.SendKeys(chromedp.ID("peak-3-shift"), "7.35–7.20"),
		chromedp.SendKeys(chromedp.ID("peak-3-mult"), "m"),
		chromedp.SendKeys(chromedp.ID("peak-3-integral"), "5"))
	var text string
	p.eval(`document.querySelector("#peaks-text").value`, &text)
	if want := "7.35–7.20 (m, 5H)"; !strings.HasSuffix(text, want) {
		p.t.Errorf("text after adding a table row = %q, want it to end with %q", text, want)
	}
	p.do("edit the text",
		chromedp.Evaluate[chromedp.Void](`document.querySelector("#peaks-text").value = ""`),
		chromedp.SendKeys(chromedp.ID("peaks-text"), "3.71 (dd, J = 11.2, 4.0 Hz, 1H), 1.10 (d, J = 6.3 Hz, 3H)"))
	var rows [][]string
	p.eval(`[...document.querySelectorAll("#peak-rows tr")].map(tr => [...tr.querySelectorAll("input")].map(i => i.value))`, &rows)
	want := [][]string{{"3.71", "dd", "11.2, 4.0", "1"}, {"1.10", "d", "6.3", "3"}}
	if fmt.Sprint(rows) != fmt.Sprint(want) {
		p.t.Errorf("table after editing the text = %v, want %v", rows, want)
	}
	p.open("/")
	p.do("fill the form",
		chromedp.Click(chromedp.ID("load-example")),
		chromedp.Evaluate[chromedp.Void](`document.querySelector("#formula").value = ""`),
		chromedp.SendKeys(chromedp.ID("formula"), "C4H9O"),
		chromedp.Click(chromedp.ID("submit")),
	)
	p.waitFor("formula message", `document.querySelector("#formula-error").textContent.trim() !== ""`, 20*time.Second)
	msg := p.text("#formula-error")
	var invalid string
	p.eval(`document.querySelector("#formula").getAttribute("aria-invalid")`, &invalid)
	if invalid != "true" {
		p.t.Errorf("formula field aria-invalid = %q after the service rejected it, want true", invalid)
	}
	var still string
	p.eval(`location.pathname`, &still)
	if still != "/" {
		p.t.Errorf("page moved to %s after a rejected submission, want to stay on /", still)
	}
	p.t.Logf("message next to the formula field: %q", msg)
	p.shot("bad-formula-1280")

	// A bad multiplicity and a bad fragment: each message next to its field.
	p.do("bad peak and fragment",
		chromedp.Evaluate[chromedp.Void](`document.querySelector("#formula").value = "C4H8O2";
			document.querySelector("#peaks-text").value = "4.12 (qx, J = 7.1 Hz, 2H), 2.05 (s, 3H)";
			document.querySelector("details.options").open = true;
			document.querySelector("#require").value = "C(=O";
			for (const id of ["formula", "peaks-text", "require"]) document.getElementById(id).dispatchEvent(new Event("input", {bubbles: true}));`),
		chromedp.Click(chromedp.ID("submit")))
	p.waitFor("peak and fragment messages", `document.querySelector("#peaks-error").textContent.trim() !== "" &&
		document.querySelector("#require-error").textContent.trim() !== ""`, 20*time.Second)
	p.t.Logf("message next to the peaks: %q; next to the required fragments: %q", p.text("#peaks-error"), p.text("#require-error"))
	if got := p.text("#formula-error"); got != "" {
		p.t.Errorf("formula message %q stays after the formula was corrected", got)
	}
	p.shot("bad-peaks-1280")
}

func testCancel(p *page) {
	p.open("/")
	p.do("fill a long job",
		chromedp.SendKeys(chromedp.ID("formula"), longFormula),
		chromedp.SendKeys(chromedp.ID("peaks-text"), longPeaks),
		chromedp.Click(chromedp.ID("submit")),
	)
	id := jobIDFromURL(p)
	p.waitFor("job running with progress", `document.querySelector("#job-status").dataset.status === "running" &&
		Number(document.querySelector('[data-count="generated"] strong').textContent.replace(/,/g, "")) > 0`, 60*time.Second)
	var g1, g2 string
	g1 = p.text(`[data-count="generated"] strong`)
	p.waitFor("progress moving", fmt.Sprintf(`document.querySelector('[data-count="generated"] strong').textContent !== %q`, g1), 20*time.Second)
	g2 = p.text(`[data-count="generated"] strong`)
	p.t.Logf("generated count moved from %s to %s", g1, g2)
	p.shot("running-1280")
	p.do("cancel", chromedp.Click(chromedp.ID("cancel-job")))
	p.waitFor("cancelled", `document.querySelector("#job-status").dataset.status === "cancelled"`, 30*time.Second)
	var job struct {
		Status string `json:"status"`
	}
	getJSON(p.t, p.base+"/v1/jobs/"+id, &job)
	if job.Status != "cancelled" {
		p.t.Errorf("API status of the cancelled job = %q, want cancelled", job.Status)
	}
	var hidden bool
	p.eval(`document.querySelector("#cancel-job").hidden`, &hidden)
	if !hidden {
		p.t.Errorf("cancel button still offered after the job was cancelled")
	}
	p.shot("cancelled-1280")

	// The cancelled unknown goes back into the form for another try.
	p.do("edit as a new unknown", chromedp.Click(chromedp.ID("resubmit")))
	p.waitFor("form filled from the job", fmt.Sprintf(`location.pathname === "/" && document.querySelector("#formula").value === %q &&
		document.querySelectorAll("#peak-rows tr").length === 5`, longFormula), 10*time.Second)
}

// A formula with a very large number of isomers, so the job is still running
// when the test cancels it.
const (
	// C14H28O2 has about 8.5 million plausible isomers (shiftrank isomers
	// --count), far more than a ranking gets through in the test's time; the
	// peaks are those of an ethyl ester of a long chain (invented for the
	// test, not a check value).
	longFormula = "C14H28O2"
	longPeaks   = "4.12 (q, J = 7.1 Hz, 2H), 2.28 (t, J = 7.5 Hz, 2H), 1.61 (m, 2H), 1.26 (m, 19H), 0.88 (t, J = 6.9 Hz, 3H)"
)
