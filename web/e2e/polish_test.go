package e2e

import (
	"fmt"
	"net/http/httptest"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/chromedp"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"shiftrank/molecule"
)

// TestPolishPage checks the finishing touches of the review page: atom
// numbers drawn on the structure, the formula read back in Hill form, size
// errors at the field, and the plot's labels.
func TestPolishPage(t *testing.T) {
	exe := chromiumPath(t)
	h, _ := newAPI(t, false)
	srv := httptest.NewServer(h)
	t.Cleanup(srv.Close)
	ctx := newBrowser(t, exe)
	p := &page{t: t, ctx: ctx, base: srv.URL, art: artifactsDir(t), errs: watchScripts(ctx)}
	p.run("atom numbers on the drawing", testAtomNumbers)
	p.run("formula read back", testFormulaReadBack)
	p.run("size errors at the field", testSizeErrors)
	p.run("plot labels at 1024 px", testPlotLabels)
}

// apiAtoms is the part of GET /v1/jobs/{id}/candidates the atom-number
// check reads: each assignment's 0-based atom indices in SMILES order.
type apiAtoms struct {
	Candidates []struct {
		SMILES      string `json:"smiles"`
		Assignments []struct {
			Peak          int     `json:"peak"`
			ObservedShift float64 `json:"observed_shift"`
			Atoms         []int   `json:"atoms"`
		} `json:"assignments"`
	} `json:"candidates"`
}

// testAtomNumbers selects each row of #1's table and checks that the
// drawing marks and numbers the same atoms the table names (1-based: the
// API's index + 1), that the labels do not overlap, and, through RDKit's
// own reading of the SMILES, that the quartet at δ 4.12 of ethyl acetate
// is numbered on the CH2 bonded to O (Gottlieb, Kotlyar, Nudelman, J. Org.
// Chem. 1997, 62, 7512: the OCH2 quartet; from memory).
func testAtomNumbers(p *page) {
	id := submitExample(p)
	var api apiAtoms
	getJSON(p.t, p.base+"/v1/jobs/"+id+"/candidates?limit=1", &api)
	require.NotEmpty(p.t, api.Candidates, "the example's ranking")
	c := api.Candidates[0]
	require.Equal(p.t, "CC(=O)OCC", c.SMILES, "the example's #1 (ethyl acetate)")

	var before int
	p.eval(`document.querySelectorAll("#detail-structure text.atom-number").length`, &before)
	assert.Zero(p.t, before, "atom numbers drawn before a row is selected")

	for i, a := range c.Assignments {
		sel := fmt.Sprintf(`#explain-rows tr.assign[data-index='%d']`, i)
		p.do("select the row", chromedp.Click(chromedp.CSS(sel)))
		want := make([]string, len(a.Atoms))
		for k, x := range a.Atoms {
			want[k] = fmt.Sprint(x + 1)
		}
		p.waitFor("atom numbers drawn", fmt.Sprintf(`document.querySelectorAll("#detail-structure text.atom-number").length === %d`, len(want)), 10*time.Second)
		var got struct {
			Labels, Marked []string
			Table          string
			Overlap        bool
			Far            []float64
		}
		p.eval(`(() => {
			const svg = document.querySelector("#detail-structure svg");
			const labels = [...svg.querySelectorAll("text.atom-number")];
			const boxes = labels.map(t => t.getBBox());
			const overlap = boxes.some((a, i) => boxes.some((b, j) => j > i &&
				a.x < b.x + b.width && b.x < a.x + a.width && a.y < b.y + b.height && b.y < a.y + a.height));
			// Distance of each label from its atom's mark, in radii.
			const far = labels.map(t => {
				const e = svg.querySelector("ellipse.atom-" + t.dataset.atom);
				const b = t.getBBox();
				return Math.hypot(b.x + b.width / 2 - e.cx.baseVal.value, b.y + b.height / 2 - e.cy.baseVal.value) / e.rx.baseVal.value;
			});
			return {Labels: labels.map(t => t.textContent),
				Marked: [...svg.querySelectorAll("ellipse[class^='atom-']")].map(e => String(+e.getAttribute("class").slice(5) + 1)),
				Table: document.querySelector("`+sel+` .env .why").textContent, Overlap: overlap, Far: far};
		})()`, &got)
		assert.Equal(p.t, want, got.Labels, "δ %.2f: numbers drawn, want the API's atoms + 1", a.ObservedShift)
		assert.ElementsMatch(p.t, want, got.Marked, "δ %.2f: atoms marked", a.ObservedShift)
		assert.Equal(p.t, "atom"+map[bool]string{true: "s", false: ""}[len(want) > 1]+" "+strings.Join(want, ", "), got.Table,
			"δ %.2f: the table names the same atoms", a.ObservedShift)
		assert.False(p.t, got.Overlap, "δ %.2f: atom numbers overlap", a.ObservedShift)
		for k, f := range got.Far {
			assert.True(p.t, f > 0.5 && f < 4, "δ %.2f: label %s sits %.1f radii from its atom, want beside it", a.ObservedShift, got.Labels[k], f)
		}
		p.t.Logf("δ %.2f: atoms %v numbered %v", a.ObservedShift, a.Atoms, got.Labels)

		if a.ObservedShift > 4 && a.ObservedShift < 4.2 {
			// RDKit's reading of the SMILES: the numbered atom is a carbon with
			// two H and an O neighbour.
			var facts struct {
				Symbol string
				H      int
				O      bool
			}
			p.eval(fmt.Sprintf(`(async () => {
				const rd = await window.initRDKitModule({ locateFile: () => "/static/vendor/rdkit/RDKit_minimal.wasm" });
				const m = rd.get_mol(%q);
				const j = JSON.parse(m.get_json()).molecules[0];
				m.delete();
				const i = %d;
				const at = j.atoms[i];
				const nb = j.bonds.filter(b => b.atoms.includes(i)).map(b => j.atoms[b.atoms[0] === i ? b.atoms[1] : b.atoms[0]]);
				return {Symbol: at.z === undefined || at.z === 6 ? "C" : String(at.z), H: at.impHs || 0, O: nb.some(n => n.z === 8)};
			})()`, c.SMILES, a.Atoms[0]), &facts)
			assert.Equal(p.t, "C", facts.Symbol, "atom %s of %s", want[0], c.SMILES)
			assert.Equal(p.t, 2, facts.H, "H on atom %s of %s (OCH2)", want[0], c.SMILES)
			assert.True(p.t, facts.O, "atom %s of %s is bonded to O (OCH2)", want[0], c.SMILES)
		}
		if i == 0 {
			p.shotOf("#detail-structure", "atom-numbers")
		}
	}
	// Selecting the row again clears the marks and the numbers.
	last := fmt.Sprintf(`#explain-rows tr.assign[data-index='%d']`, len(c.Assignments)-1)
	p.do("unselect the row", chromedp.Click(chromedp.CSS(last)))
	p.waitFor("numbers cleared", `document.querySelectorAll("#detail-structure text.atom-number").length === 0`, 10*time.Second)
}

// testFormulaReadBack types formulas the forgiving ways and checks the
// page shows each back in Hill form, as the service reads it
// (molecule.NormalizeFormula then the Hill formula: C, H, then the others
// alphabetically; common practice), or says the lower case is ambiguous
// where the service refuses it. Then a lower-case formula is ranked and
// the job shows what the service read.
func testFormulaReadBack(p *page) {
	p.open("/")
	cases := []struct {
		name, typed, want string
	}{
		{"strict form: no hint", "C4H8O2", "DBE 1"},
		{"lower case", "c4h8o2", "read as C4H8O2 · DBE 1"},
		{"spaces", "C4 H8 O2", "read as C4H8O2 · DBE 1"},
		{"subscript digits", "C₄H₈O₂", "read as C4H8O2 · DBE 1"},
		{"lower case, other order", "h8c4o2", "read as C4H8O2 · DBE 1"},
		{"lower case chloroform: l is no element", "chcl3", "read as CHCl3 · DBE 0"},
		{"lower case with subscripts and spaces", "c₁₀ h₁₂ o₂", "read as C10H12O2 · DBE 5"},
	}
	for _, tc := range cases {
		p.do(tc.name, chromedp.Evaluate[chromedp.Void](`document.querySelector("#formula").value = ""`),
			chromedp.SendKeys(chromedp.ID("formula"), tc.typed))
		got := p.text("#formula-dbe")
		assert.Equal(p.t, tc.want, got, "%s: %q shown back", tc.name, tc.typed)
		// The page's reading is the service's.
		norm, err := molecule.NormalizeFormula(tc.typed)
		require.NoError(p.t, err, "NormalizeFormula(%q)", tc.typed)
		f, err := molecule.ParseFormula(norm)
		require.NoError(p.t, err, "ParseFormula(%q)", norm)
		var hill string
		p.eval(`document.querySelector("#formula-dbe").dataset.hill || ""`, &hill)
		assert.Equal(p.t, f.String(), hill, "%s: the page's Hill formula of %q against the service's", tc.name, tc.typed)
	}
	ambiguous := []struct {
		name, typed, pair string
	}{
		{"co: cobalt, or carbon and oxygen", "c2h4co", "co"},
		{"si: silicon, or sulfur and iodine", "c2h6si", "si"},
		{"no: nobelium, or nitrogen and oxygen", "c2h5no2", "no"},
	}
	for _, tc := range ambiguous {
		p.do(tc.name, chromedp.Evaluate[chromedp.Void](`document.querySelector("#formula").value = ""`),
			chromedp.SendKeys(chromedp.ID("formula"), tc.typed))
		got := p.text("#formula-dbe")
		up := strings.ToUpper(tc.pair)
		one := up[:1] + tc.pair[1:]
		assert.Contains(p.t, got, "ambiguous", "%s: %q", tc.name, tc.typed)
		assert.Contains(p.t, got, "“"+tc.pair+"”", "%s: the message names the pair", tc.name)
		assert.Contains(p.t, got, up+" or "+one, "%s: the message offers both readings", tc.name)
		_, err := molecule.NormalizeFormula(tc.typed)
		assert.Error(p.t, err, "the service refuses %q too", tc.typed)
	}
	p.shotOf(".field-formula", "formula-ambiguous")

	// Ranked from lower case: the job shows the Hill formula it read.
	p.do("example with a lower-case formula", chromedp.Click(chromedp.ID("load-example")),
		chromedp.Evaluate[chromedp.Void](`document.querySelector("#formula").value = ""`),
		chromedp.SendKeys(chromedp.ID("formula"), "c4h8o2"))
	assert.Equal(p.t, "read as C4H8O2 · DBE 1", p.text("#formula-dbe"))
	p.do("submit", chromedp.Click(chromedp.ID("submit")))
	jobIDFromURL(p)
	p.waitFor("the unknown shown", `document.querySelector("#job-request").textContent.includes("C4H8O2")`, 20*time.Second)
	assert.Contains(p.t, p.text("#job-request"), "C4H8O2 (read from “c4h8o2”)", "the job says what the service read")
}

// testSizeErrors pastes more than the service reads and checks the message
// stands at the field, in KiB/MiB, not in bytes above the buttons: first a
// peak list over the 1 MiB peak-input limit (the page's own check), then
// two lists each under it whose request body is over the service's 1 MiB
// body limit (the service's 413).
func testSizeErrors(p *page) {
	p.open("/")
	p.do("paste 1.2 MiB of peaks", chromedp.SendKeys(chromedp.ID("formula"), "C4H8O2"),
		chromedp.Evaluate[chromedp.Void](`{ const t = document.querySelector("#peaks-text");
			t.value = "1.00 (s), ".repeat(Math.ceil(1.2 * 1048576 / 10));
			t.dispatchEvent(new Event("input", {bubbles: true})) }`))
	note := p.text("#peaks-note")
	assert.Contains(p.t, note, "1.2 MiB", "note under the pasted field")
	p.do("submit", chromedp.Click(chromedp.ID("submit")))
	p.waitFor("error at the peaks", `document.querySelector("#peaks-error").textContent.trim() !== ""`, 10*time.Second)
	msg := p.text("#peaks-error")
	assert.Contains(p.t, msg, "1.2 MiB", "peak field error")
	assert.Contains(p.t, msg, "at most 1 MiB", "peak field error")
	assert.NotContains(p.t, msg, "bytes", "peak field error in human units")
	assert.Empty(p.t, p.text("#form-error"), "nothing above the buttons")
	p.t.Logf("at the peak field: %q", msg)

	// Each list under 1 MiB, the body over it: the service answers 413.
	p.do("two lists of 0.6 and 0.7 MiB", chromedp.Evaluate[chromedp.Void](`{ const t = document.querySelector("#peaks-text");
			t.value = "1.00 (s), ".repeat(Math.ceil(0.6 * 1048576 / 10));
			t.dispatchEvent(new Event("input", {bubbles: true}));
			const c = document.querySelector("#carbon-text");
			c.value = "20.0, ".repeat(Math.ceil(0.7 * 1048576 / 6));
			c.dispatchEvent(new Event("input", {bubbles: true})) }`),
		chromedp.Click(chromedp.ID("submit")))
	p.waitFor("error at the 13C field", `document.querySelector("#carbon_peaks-error").textContent.trim() !== ""`, 20*time.Second)
	msg = p.text("#carbon_peaks-error")
	assert.Contains(p.t, msg, "at most 1 MiB", "13C field error")
	// 122,334 × "20.0, " = 734,004 bytes = 716.8 KiB.
	assert.Contains(p.t, msg, "717 KiB", "13C field error")
	assert.NotContains(p.t, msg, "bytes", "13C field error in human units")
	assert.Empty(p.t, p.text("#form-error"), "nothing above the buttons")
	var path string
	p.eval(`location.pathname`, &path)
	assert.Equal(p.t, "/", path, "the page stays on the form")
	p.t.Logf("at the 13C field: %q", msg)
	p.shot("size-error")
}

// plotCheck is what testPlotLabels reads from the drawn plot.
type plotCheck struct {
	Labels   []string // observed-peak labels, left to right
	Legends  []string
	Clashes  []string // pairs of drawn things that overlap
	MinFont  float64  // smallest rendered font size of any text, px
	Dropped  int      // labels left out for want of room
	SVGWidth float64  // rendered width of the plot, px
}

// readPlot measures the plot as drawn: every text's rendered font size,
// and any overlap of a label or legend with a peak, a trace or another
// label (boxes from getBoundingClientRect, in screen pixels).
const readPlot = `(() => {
	const svg = document.querySelector("#plot svg");
	const r = (e) => e.getBoundingClientRect();
	const meet = (a, b) => a.left < b.right && b.left < a.right && a.top < b.bottom && b.top < a.bottom;
	const labels = [...svg.querySelectorAll("text.peak-label")].sort((a, b) => r(a).left - r(b).left);
	const legends = [...svg.querySelectorAll("text.legend")];
	const peaks = [...svg.querySelectorAll(".obs-group")];
	const traces = [...svg.querySelectorAll("path.pred-trace, path.over-trace")];
	const clashes = [];
	const name = (e) => e.tagName === "text" ? "“" + e.textContent + "”" : e.getAttribute("class") + " " + (e.dataset.peak || "");
	const texts = [...labels, ...legends];
	texts.forEach((a, i) => {
		for (const b of texts.slice(i + 1)) if (meet(r(a), r(b))) clashes.push(name(a) + " / " + name(b));
		for (const b of peaks) if (meet(r(a), r(b))) clashes.push(name(a) + " / peak " + b.dataset.peak);
		for (const b of traces) if (meet(r(a), r(b))) clashes.push(name(a) + " / " + name(b));
	});
	const fonts = [...svg.querySelectorAll("text")].map(t => parseFloat(getComputedStyle(t).fontSize) * svg.getScreenCTM().a);
	return {Labels: labels.map(t => t.textContent), Legends: legends.map(t => t.textContent), Clashes: clashes,
		MinFont: Math.min(...fonts), Dropped: svg.querySelectorAll(".obs-group title").length, SVGWidth: r(svg).width};
})()`

// testPlotLabels draws the example's plot in a 1024 px wide window and
// checks the labels: the legend off the first multiplet, each observed
// peak labelled with its δ, multiplicity and integral (as entered: the
// example is ethyl acetate, Gottlieb et al. 1997, from memory), no label
// over a peak, a trace or another label, no text under 11 px, the δ labels
// switched off and on by a labelled checkbox, and the share bars of #1 and
// #2 drawn to one scale.
func testPlotLabels(p *page) {
	p.do("1024 px window", chromedp.EmulateViewport(1024, 768))
	p.t.Cleanup(func() { _ = chromedp.Do(p.ctx, chromedp.EmulateViewport(1280, 800)) })
	submitExample(p)
	p.waitFor("plot drawn", `document.querySelectorAll("#plot text.peak-label").length === 3`, 10*time.Second)
	var got plotCheck
	p.eval(readPlot, &got)
	p.t.Logf("plot at 1024 px: %+v", got)
	assert.Equal(p.t, []string{"4.12 q 2H", "2.05 s 3H", "1.26 t 3H"}, got.Labels, "observed peaks labelled with δ, multiplicity, integral")
	assert.Equal(p.t, []string{"observed", "predicted: #1", "overlay: #2"}, got.Legends, "legends")
	assert.Empty(p.t, got.Clashes, "labels overlapping peaks, traces or each other")
	assert.GreaterOrEqual(p.t, got.MinFont, 11.0, "smallest text in the plot, px")
	assert.Zero(p.t, got.Dropped, "labels left out")
	p.shotOf("#plot", "plot-1024")

	// Zoomed on the quartet: its lines spread out, the labels still clear.
	p.do("zoom on the quartet", chromedp.Click(chromedp.CSS(`#explain-rows tr.assign[data-index='0']`)),
		chromedp.Click(chromedp.ID("zoom-peak")))
	p.eval(readPlot, &got)
	assert.Empty(p.t, got.Clashes, "zoomed: labels overlapping")
	assert.GreaterOrEqual(p.t, got.MinFont, 11.0, "zoomed: smallest text, px")
	p.do("fit all", chromedp.Click(chromedp.ID("zoom-fit")))

	// The toggle: a checkbox with its label.
	var label string
	p.eval(`document.querySelector("label[for=shift-labels]").textContent.trim()`, &label)
	assert.Equal(p.t, "Label observed peaks with δ and integral", label)
	p.do("labels off", chromedp.Click(chromedp.ID("shift-labels")))
	p.eval(readPlot, &got)
	assert.Equal(p.t, []string{"q", "s", "t"}, got.Labels, "without δ labels: the multiplicities only")
	assert.Empty(p.t, got.Clashes, "labels off: overlaps")
	p.do("labels on", chromedp.Click(chromedp.ID("shift-labels")))
	p.eval(readPlot, &got)
	assert.Len(p.t, got.Labels, 3, "δ labels back")

	// One scale for the share bars: bar width per nat the same for #1 and #2.
	perNat := func(idx int) []float64 {
		p.do("select", chromedp.Click(chromedp.CSS(fmt.Sprintf(`#candidate-list .candidate[data-index="%d"] .pick`, idx))))
		p.waitFor("its table", `document.querySelectorAll("#explain-rows .share-bar").length > 0`, 5*time.Second)
		var out []float64
		p.eval(`[...document.querySelectorAll("#explain-rows td.share")].filter(td => td.querySelector(".share-bar")).map(td => {
			const bar = td.querySelector(".share-bar"), fill = bar.firstElementChild;
			const v = parseFloat(td.querySelector(".share-num").textContent.replace("−", "-"));
			return fill.getBoundingClientRect().width / bar.getBoundingClientRect().width / Math.abs(v);
		}).filter(x => isFinite(x))`, &out)
		return out
	}
	a, b := perNat(0), perNat(1)
	require.NotEmpty(p.t, a, "#1's share bars")
	require.NotEmpty(p.t, b, "#2's share bars")
	for _, v := range append(a[1:], b...) {
		assert.InDelta(p.t, a[0], v, 0.05*a[0], "bar width per nat, #1 %v and #2 %v: one scale", a, b)
	}
	p.do("back to #1", chromedp.Click(chromedp.CSS(`#candidate-list .candidate[data-index="0"] .pick`)))
}
