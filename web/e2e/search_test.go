package e2e

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"fmt"
	"net/http/httptest"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/cdproto/browser"
	"github.com/chromedp/cdproto/emulation"
	"github.com/chromedp/chromedp"
)

// Ethyl phenylacetate, C10H12O2, 1H in CDCl3 as commonly reported (from
// memory; the check values below come from the service's own API, not
// from this list). Ten heavy atoms: the service searches only the isomers
// fitting the readings of this spectrum unless told otherwise.
const (
	phenylacetateFormula = "C10H12O2"
	phenylacetatePeaks   = "7.35–7.25 (m, 5H), 4.15 (q, J = 7.1 Hz, 2H), 3.61 (s, 2H), 1.25 (t, J = 7.1 Hz, 3H)"
	// stopBudget is a search budget (generator nodes) far below what all
	// isomers of C10H12O2 need, but enough to score some.
	stopBudget = "20000"
)

// TestSearchPage checks that the page says how far a search went: a
// search inside the spectrum's constraints, with the constraint panel and
// a re-run with one constraint off; a search that stopped early, in the
// badge and the exports; and the 13C field, its errors and its plot.
func TestSearchPage(t *testing.T) {
	exe := chromiumPath(t)
	h, _ := newAPI(t, false)
	srv := httptest.NewServer(h)
	t.Cleanup(srv.Close)
	ctx := newBrowser(t, exe)
	p := &page{t: t, ctx: ctx, base: srv.URL, art: artifactsDir(t), errs: watchScripts(ctx)}
	p.run("constrained search and its constraints", testConstrained)
	p.run("search stopped early", testStoppedEarly)
	p.run("13C field", testCarbonField)
	p.run("advanced options errors", testOptionErrors)
}

// apiSearch is the part of GET /v1/jobs/{id}/candidates these tests read.
type apiSearch struct {
	Search struct {
		Scope       string `json:"scope"`
		Status      string `json:"status"`
		StopReason  string `json:"stop_reason"`
		Constraints []struct {
			ID      string `json:"id"`
			Reason  string `json:"reason"`
			Enabled bool   `json:"enabled"`
		} `json:"constraints"`
		Readings []struct {
			Name string `json:"name"`
		} `json:"readings"`
	} `json:"search"`
	Total int `json:"total"`
}

type apiJob struct {
	Status           string `json:"status"`
	SearchStatus     string `json:"search_status"`
	SearchStopReason string `json:"search_stop_reason"`
	Request          struct {
		CarbonPeaks json.RawMessage `json:"carbon_peaks"`
		Options     struct {
			Disable    []string `json:"disable"`
			AllIsomers bool     `json:"all_isomers"`
			MaxNodes   int64    `json:"max_nodes"`
		} `json:"options"`
	} `json:"request"`
}

// waitDone waits for the job page to show a finished ranking.
func waitDone(p *page) {
	p.t.Helper()
	p.waitFor("job done", `document.querySelector("#job-status").dataset.status === "succeeded" &&
		!document.querySelector("#results").hidden`, 120*time.Second)
}

func testConstrained(p *page) {
	p.open("/")
	p.do("fill ethyl phenylacetate",
		chromedp.SendKeys(chromedp.ID("formula"), phenylacetateFormula),
		chromedp.SendKeys(chromedp.ID("peaks-text"), phenylacetatePeaks),
		chromedp.Click(chromedp.ID("submit")))
	id := jobIDFromURL(p)
	waitDone(p)
	var job apiJob
	getJSON(p.t, p.base+"/v1/jobs/"+id, &job)
	var api apiSearch
	getJSON(p.t, p.base+"/v1/jobs/"+id+"/candidates?limit=1", &api)
	if api.Search.Scope != "constrained" || api.Search.Status != "complete within the constraints" {
		p.t.Fatalf("the service searched %q with status %q; this check needs a constrained, complete search", api.Search.Scope, api.Search.Status)
	}
	if job.SearchStatus != api.Search.Status {
		p.t.Errorf("job view search_status %q, candidates say %q", job.SearchStatus, api.Search.Status)
	}
	p.waitFor("badge says constrained", `document.querySelector("#job-status").dataset.search === "constrained"`, 10*time.Second)
	if got := p.text("#job-status"); !strings.Contains(got, "complete within") {
		p.t.Errorf("badge %q, want it to say the search was complete within the readings", got)
	}
	if got := p.text("#search-scope"); !strings.Contains(got, "searched only isomers fitting the spectrum’s readings") {
		p.t.Errorf("result header %q, want it to say only isomers fitting the readings were searched", got)
	}
	if got := p.text("#candidate-scope-note"); !strings.Contains(got, "readings") {
		p.t.Errorf("candidate list note %q, want it to name the readings", got)
	}
	if got := p.text("#results-caution"); !strings.Contains(got, "hypothesis") {
		p.t.Errorf("caution with the results %q, want the caution text", got)
	}

	// The constraint panel lists every constraint of the search report.
	var listed []struct {
		ID, Label string
		On        bool
	}
	p.eval(`[...document.querySelectorAll("#constraint-list li[data-id]")].map(li => ({
		ID: li.dataset.id, Label: li.querySelector("label").textContent, On: li.querySelector("input").checked}))`, &listed)
	if len(listed) != len(api.Search.Constraints) || len(listed) == 0 {
		p.t.Fatalf("panel lists %d constraints, the service read %d", len(listed), len(api.Search.Constraints))
	}
	for i, c := range api.Search.Constraints {
		if listed[i].ID != c.ID || !strings.Contains(listed[i].Label, c.Reason) || listed[i].On != c.Enabled {
			p.t.Errorf("panel constraint %d = %+v, API %s (%q, enabled %v)", i+1, listed[i], c.ID, c.Reason, c.Enabled)
		}
	}
	var readings int
	p.eval(`document.querySelectorAll("#reading-rows tr").length`, &readings)
	if readings != len(api.Search.Readings) {
		p.t.Errorf("panel lists %d readings, the service searched %d", readings, len(api.Search.Readings))
	}
	// The size estimated before the run is shown with the readings.
	if got := p.text("#constraints-count"); !strings.Contains(got, "estimated before the run") || !strings.Contains(got, "search nodes") {
		p.t.Errorf("constraint panel summary %q, want the search size estimated before the run", got)
	}
	var estCell string
	p.eval(`document.querySelector("#reading-rows tr td:nth-child(5)").textContent`, &estCell)
	if !strings.Contains(estCell, "/") {
		p.t.Errorf("first reading's estimate cell %q, want structures / nodes", estCell)
	}
	var open bool
	p.eval(`document.querySelector("#constraints").open`, &open)
	if !open {
		p.t.Errorf("constraint panel closed after a constrained search, want it open")
	}
	p.shot("constrained-1280")

	// Switch the last constraint off from the keyboard and run again.
	off := api.Search.Constraints[len(api.Search.Constraints)-1].ID
	p.do("switch a constraint off with the space bar",
		chromedp.Focus(chromedp.CSS(fmt.Sprintf(`#constraint-list li[data-id=%q] input`, off))),
		chromedp.KeyEvent(" "))
	p.waitFor("re-run offered", `!document.querySelector("#rerun-constraints").disabled`, 5*time.Second)
	p.do("run again", chromedp.Click(chromedp.ID("rerun-constraints")))
	p.waitFor("new job page", fmt.Sprintf(`location.pathname !== "/jobs/%s" && /^\/jobs\//.test(location.pathname)`, id), 20*time.Second)
	id2 := jobIDFromURL(p)
	var job2 apiJob
	getJSON(p.t, p.base+"/v1/jobs/"+id2, &job2)
	if !slices.Equal(job2.Request.Options.Disable, []string{off}) || job2.Request.Options.AllIsomers {
		p.t.Errorf("re-run sent options.disable %v, all_isomers %v; want [%s] and false", job2.Request.Options.Disable, job2.Request.Options.AllIsomers, off)
	}
	waitDone(p)
	var stillOff bool
	p.eval(fmt.Sprintf(`!document.querySelector('#constraint-list li[data-id=%q] input').checked`, off), &stillOff)
	if !stillOff {
		p.t.Errorf("after the re-run the panel shows %s switched on, want off", off)
	}

	// And over all isomers.
	p.do("run again over all isomers", chromedp.Click(chromedp.ID("rerun-all")))
	p.waitFor("third job page", fmt.Sprintf(`location.pathname !== "/jobs/%s" && /^\/jobs\//.test(location.pathname)`, id2), 20*time.Second)
	id3 := jobIDFromURL(p)
	var job3 apiJob
	getJSON(p.t, p.base+"/v1/jobs/"+id3, &job3)
	if !job3.Request.Options.AllIsomers || len(job3.Request.Options.Disable) != 0 {
		p.t.Errorf("all-isomers re-run sent all_isomers %v, disable %v; want true and none", job3.Request.Options.AllIsomers, job3.Request.Options.Disable)
	}
	p.do("cancel the all-isomers run", chromedp.Click(chromedp.ID("cancel-job")))
	p.waitFor("cancelled or done", `["cancelled", "succeeded"].includes(document.querySelector("#job-status").dataset.status)`, 60*time.Second)

	// Editing the re-run as a new unknown keeps the constraint off, and
	// says so, until it is switched on again.
	p.open("/jobs/" + id2)
	waitDone(p)
	p.do("edit as a new unknown", chromedp.Click(chromedp.ID("resubmit")))
	p.waitFor("form with the switched-off constraint", fmt.Sprintf(`location.pathname === "/" &&
		!document.querySelector("#disable-row").hidden && document.querySelector("#disable-note").textContent.includes(%q)`, off), 10*time.Second)
	var visible bool
	p.eval(`(() => { const r = document.querySelector("#disable-row"); r.closest("details").open = true; return r.offsetParent !== null; })()`, &visible)
	if !visible {
		p.t.Errorf("the note on switched-off constraints is not displayed")
	}
	p.do("switch them on again", chromedp.Click(chromedp.ID("disable-clear")))
	p.waitFor("note gone", `document.querySelector("#disable-row").offsetParent === null`, 5*time.Second)
}

func testStoppedEarly(p *page) {
	p.open("/")
	p.do("fill with a small budget over all isomers",
		chromedp.SendKeys(chromedp.ID("formula"), phenylacetateFormula),
		chromedp.SendKeys(chromedp.ID("peaks-text"), phenylacetatePeaks),
		chromedp.Evaluate[chromedp.Void](`document.querySelector("details.options").open = true`),
		chromedp.Click(chromedp.ID("all-isomers")),
		chromedp.SendKeys(chromedp.ID("max-nodes"), stopBudget),
		chromedp.Click(chromedp.ID("submit")))
	id := jobIDFromURL(p)
	waitDone(p)
	var job apiJob
	getJSON(p.t, p.base+"/v1/jobs/"+id, &job)
	if job.SearchStatus != "stopped early" || job.SearchStopReason == "" {
		p.t.Fatalf("service: search_status %q, stop reason %q; this check needs a search that stopped early", job.SearchStatus, job.SearchStopReason)
	}
	if fmt.Sprint(job.Request.Options.MaxNodes) != stopBudget || !job.Request.Options.AllIsomers {
		p.t.Errorf("request sent max_nodes %d, all_isomers %v; want %s and true", job.Request.Options.MaxNodes, job.Request.Options.AllIsomers, stopBudget)
	}
	p.waitFor("badge says stopped early", `document.querySelector("#job-status").dataset.search === "stopped"`, 10*time.Second)
	badge := p.text("#job-status")
	if !strings.Contains(badge, "stopped early") || !strings.Contains(badge, job.SearchStopReason) {
		p.t.Errorf("badge %q, want “stopped early” and the reason %q", badge, job.SearchStopReason)
	}
	var bar struct{ Now, Text, Search string }
	p.eval(`(() => { const b = document.querySelector("#job-progress");
		return {Now: b.getAttribute("aria-valuenow"), Text: b.getAttribute("aria-valuetext"), Search: b.dataset.search}; })()`, &bar)
	if bar.Now == "100" || bar.Search != "stopped" || !strings.Contains(bar.Text, "stopped early") {
		p.t.Errorf("progress bar %+v, want it short of 100 %% and saying the search stopped early", bar)
	}
	if got := p.text("#search-scope"); !strings.Contains(got, "stopped early") {
		p.t.Errorf("result header %q, want it to say the search stopped early", got)
	}
	if got := p.text("#candidate-scope-note"); !strings.Contains(got, "Stopped early") {
		p.t.Errorf("candidate list note %q, want it to say the search stopped early", got)
	}
	p.shot("stopped-early-1280")

	// Printed, the result keeps the search status and the caution and
	// drops the controls.
	if _, err := chromedp.Call(p.ctx, emulation.SetEmulatedMedia, emulation.SetEmulatedMediaParams{Media: "print"}); err != nil {
		p.t.Fatalf("emulate print: %v", err)
	}
	var printed struct{ Scope, Caution, Badge, Downloads bool }
	p.eval(`(() => { const shown = (sel) => { const e = document.querySelector(sel); return !!e && e.offsetParent !== null; };
		return {Scope: shown("#search-scope"), Caution: shown(".caution"), Badge: shown("#job-status"), Downloads: shown(".downloads")}; })()`, &printed)
	if !printed.Scope || !printed.Caution || !printed.Badge || printed.Downloads {
		p.t.Errorf("printed page shows %+v; want the search status, the caution and the badge, without the download buttons", printed)
	}
	if _, err := chromedp.Call(p.ctx, emulation.SetEmulatedMedia, emulation.SetEmulatedMediaParams{}); err != nil {
		p.t.Fatalf("end print emulation: %v", err)
	}

	dl := p.t.TempDir()
	if _, err := chromedp.CallBrowser(p.ctx, browser.SetDownloadBehavior, browser.SetDownloadBehaviorParams{
		Behavior: browser.SetDownloadBehaviorBehaviorAllow, DownloadPath: dl}); err != nil {
		p.t.Fatalf("allow downloads: %v", err)
	}
	p.do("download CSV and JSON", chromedp.Click(chromedp.ID("dl-csv")), chromedp.Click(chromedp.ID("dl-json")))
	recs, err := csv.NewReader(bytes.NewReader(waitFile(p.t, filepath.Join(dl, "shiftrank-"+id+".csv")))).ReadAll()
	if err != nil {
		p.t.Fatalf("downloaded CSV: %v", err)
	}
	col := slices.Index(recs[0], "search_status")
	reason := slices.Index(recs[0], "search_stop_reason")
	if col < 0 || reason < 0 || len(recs) < 2 {
		p.t.Fatalf("CSV header %v with %d rows: want search_status and search_stop_reason columns and rows", recs[0], len(recs))
	}
	for i, r := range recs[1:] {
		if r[col] != "stopped early" || r[reason] != job.SearchStopReason {
			p.t.Errorf("CSV row %d: search_status %q, stop reason %q; want “stopped early”, %q", i+1, r[col], r[reason], job.SearchStopReason)
		}
	}
	var saved struct {
		SearchStatus string `json:"search_status"`
		Search       struct {
			Status string `json:"status"`
		} `json:"search"`
		Caution string `json:"caution"`
	}
	if err := json.Unmarshal(waitFile(p.t, filepath.Join(dl, "shiftrank-"+id+".json")), &saved); err != nil {
		p.t.Fatalf("downloaded JSON: %v", err)
	}
	if saved.SearchStatus != "stopped early" || saved.Search.Status != "stopped early" || saved.Caution == "" {
		p.t.Errorf("downloaded JSON: search_status %q, search.status %q, caution %q", saved.SearchStatus, saved.Search.Status, saved.Caution)
	}
}

// Ethyl acetate's 13C shifts in CDCl3 (Gottlieb, Kotlyar, Nudelman, J. Org.
// Chem. 1997, 62, 7512, Table 2; from memory), with DEPT classes.
const ethylAcetateCarbon = "171.36 (C), 60.49 (CH2), 21.04 (CH3), 14.19 (CH3)"

func testCarbonField(p *page) {
	p.open("/")
	p.do("fill ethyl acetate with its 13C list",
		chromedp.Click(chromedp.ID("load-example")),
		chromedp.SendKeys(chromedp.ID("carbon-text"), ethylAcetateCarbon))
	if got := p.text("#carbon-note"); !strings.HasPrefix(got, "4 13C peaks") {
		p.t.Errorf("live note under the 13C field %q, want it to count 4 peaks", got)
	}
	p.do("submit", chromedp.Click(chromedp.ID("submit")))
	id := jobIDFromURL(p)
	waitDone(p)
	var job apiJob
	getJSON(p.t, p.base+"/v1/jobs/"+id, &job)
	var sent string
	if err := json.Unmarshal(job.Request.CarbonPeaks, &sent); err != nil || sent != ethylAcetateCarbon {
		p.t.Errorf("request carbon_peaks %s, want %q", job.Request.CarbonPeaks, ethylAcetateCarbon)
	}
	p.waitFor("13C plot", `!document.querySelector("#carbon-figure").hidden &&
		document.querySelectorAll("#carbon-plot svg .carbon-obs").length === 4`, 10*time.Second)
	var ticks []struct {
		V string
		X float64
	}
	p.eval(`[...document.querySelectorAll("#carbon-plot svg text.tick")].map(t => ({V: t.textContent, X: Number(t.getAttribute("x"))}))`, &ticks)
	slices.SortFunc(ticks, func(a, b struct {
		V string
		X float64
	}) int {
		return int(a.X - b.X)
	})
	if len(ticks) < 2 || !(parseNum(ticks[0].V) > parseNum(ticks[len(ticks)-1].V)) {
		p.t.Errorf("13C axis ticks left to right %v, want ppm running from high (left) to low (right)", ticks)
	}
	var cand struct {
		Candidates []struct {
			CarbonAssignments []json.RawMessage `json:"carbon_assignments"`
		} `json:"candidates"`
	}
	getJSON(p.t, p.base+"/v1/jobs/"+id+"/candidates?limit=1", &cand)
	var predicted int
	p.eval(`document.querySelectorAll("#carbon-plot svg .pred-stick").length`, &predicted)
	if scored := len(cand.Candidates) > 0 && len(cand.Candidates[0].CarbonAssignments) > 0; scored != (predicted > 0) {
		p.t.Errorf("13C plot draws %d predicted carbons; the service's top candidate has %d 13C assignments", predicted, len(cand.Candidates[0].CarbonAssignments))
	}
	if len(cand.Candidates) > 0 && len(cand.Candidates[0].CarbonAssignments) > 0 {
		var rows int
		p.eval(`document.querySelector("#carbon-explain").hidden ? -1 : document.querySelectorAll("#carbon-rows tr").length`, &rows)
		if rows != len(cand.Candidates[0].CarbonAssignments) {
			p.t.Errorf("13C table has %d rows, the service's top candidate %d 13C assignments", rows, len(cand.Candidates[0].CarbonAssignments))
		}
	}
	p.shotOf("#carbon-figure", "carbon-plot")

	dl := p.t.TempDir()
	if _, err := chromedp.CallBrowser(p.ctx, browser.SetDownloadBehavior, browser.SetDownloadBehaviorParams{
		Behavior: browser.SetDownloadBehaviorBehaviorAllow, DownloadPath: dl}); err != nil {
		p.t.Fatalf("allow downloads: %v", err)
	}
	p.do("download the peak lists", chromedp.Click(chromedp.ID("dl-peaks")))
	recs, err := csv.NewReader(bytes.NewReader(waitFile(p.t, filepath.Join(dl, "shiftrank-"+id+"-peaks.csv")))).ReadAll()
	if err != nil {
		p.t.Fatalf("peak list CSV: %v", err)
	}
	n := map[string]int{}
	for _, r := range recs[1:] {
		n[r[0]]++
	}
	if n["1H"] != 3 || n["13C"] != 4 {
		p.t.Errorf("peak list CSV has %d 1H and %d 13C rows, want 3 and 4", n["1H"], n["13C"])
	}

	// Edit as a new unknown: the 13C list comes back into its field.
	p.do("edit as a new unknown", chromedp.Click(chromedp.ID("resubmit")))
	p.waitFor("13C text back in the form", fmt.Sprintf(`location.pathname === "/" && document.querySelector("#carbon-text").value === %q`, ethylAcetateCarbon), 10*time.Second)
}

func parseNum(s string) float64 {
	var v float64
	fmt.Sscan(s, &v)
	return v
}

func testOptionErrors(p *page) {
	bad := "171.36, 60.49 (0C), 21.04"
	p.open("/")
	p.do("fill a zero carbon count and a budget above the limit",
		chromedp.Click(chromedp.ID("load-example")),
		chromedp.SendKeys(chromedp.ID("carbon-text"), bad),
		chromedp.Evaluate[chromedp.Void](`document.querySelector("#max-nodes").value = "999999999999"`),
		chromedp.Click(chromedp.ID("submit")))
	p.waitFor("field messages", `document.querySelector("#carbon_peaks-error").textContent.trim() !== "" &&
		document.querySelector("#max_nodes-error").textContent.trim() !== ""`, 20*time.Second)
	var state struct {
		CarbonInvalid, NodesInvalid string
		OptionsOpen                 bool
		Path                        string
	}
	p.eval(`({CarbonInvalid: document.querySelector("#carbon-text").getAttribute("aria-invalid"),
		NodesInvalid: document.querySelector("#max-nodes").getAttribute("aria-invalid"),
		OptionsOpen: document.querySelector("details.options").open, Path: location.pathname})`, &state)
	if state.CarbonInvalid != "true" || state.NodesInvalid != "true" || !state.OptionsOpen || state.Path != "/" {
		p.t.Errorf("after the refusal: %+v; want both fields marked invalid, the options open and the form still shown", state)
	}
	msg := p.text("#carbon_peaks-error")
	if !strings.Contains(msg, "0C") || !strings.Contains(msg, fmt.Sprintf("character %d", strings.Index(bad, "0C")+1)) {
		p.t.Errorf("message at the 13C field %q, want the token 0C and its position %d", msg, strings.Index(bad, "0C")+1)
	}
	p.t.Logf("at the 13C field: %q; at the budget: %q", msg, p.text("#max_nodes-error"))
	p.shot("option-errors-1280")
}
