package e2e

import (
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"

	"shiftrank/molecule"
	"shiftrank/spectrum"
)

// The page reads formulas and peak lists itself for live feedback (the DBE,
// the peak table). These checks hold its JavaScript readers to the
// service's Go parsers on the notation the table can express: same DBE,
// same peaks, and text written by the table reads back as the same peaks.
// The peak lists are notation examples; no chemistry is checked here.

var formulaCases = []string{
	"C4H8O2", "C6H6", "C6H5Cl", "CHCl3", "C5H5N", "C2H7NO", "C3H9B", "C4H12Si", "C3H9P", "C2H6S",
	"C7H5F3", "C9H18O2", "H8C4O2", "CH3COOH", " C2H6O ", "C4H9O", "Xy2", "co", "C0H4", "H2", "C2H8",
}

var peakCases = []string{
	"1H NMR (400 MHz, CDCl3) δ 4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H), 1.26 (t, J = 7.1 Hz, 3H)",
	"7.35–7.20 (m, 5H), 3.80 (dd, J = 8.0, 2.1 Hz, 1H), 1.62 (br s, 1H)",
	"9.80 (t, J = 1.8 Hz, 1H), 2.42 (td, J = 7.3, 1.8 Hz, 2H), 1.65 (sext, J = 7.4 Hz, 2H), 0.95 (t, J = 7.4 Hz, 3H)",
	"1H NMR (500 MHz, DMSO-d6) δ 12.1 (br s, 1H), 7.95 (d, J = 8.4 Hz, 2H), 3.05 (sept, J = 6.9 Hz, 1H), 1.20 (d, J = 6.9 Hz, 6H)",
	"5.80 (ddt, J = 17.1, 10.2, 6.7 Hz, 1H), 2.0-1.9 (m, 2H)",
	"4.12 (q, J = 7.1 Hz, 2.04H), 2.05 (s, 3.1H), 1.26 (t, J = 7.1 Hz, 2.97H)",
	"3.65 (quint, J = 6.5 Hz, 1H), 1.45 (dq, J = 13.5, 7.4 Hz, 2H)",
}

type jsRow struct {
	Shift, Mult, J, Integral string
}

type jsPeaks struct {
	MHz, Solvent string
	Rows         []jsRow
	Error        string
	Text         string // formatPeaks(rows)
}

func testClientParsers(p *page) {
	p.open("/")
	// Formulas: the live DBE against molecule.ParseFormula.
	in, _ := json.Marshal(formulaCases)
	var got []struct {
		DBE   *int   `json:"dbe"`
		Error string `json:"error"`
	}
	p.eval(fmt.Sprintf(`import("/static/chem.js").then(m => %s.map(f => m.parseFormula(f)))`, in), &got)
	for i, f := range formulaCases {
		want, err := molecule.ParseFormula(f)
		switch {
		case err != nil && got[i].Error == "":
			p.t.Errorf("page reads formula %q (DBE %v); the service rejects it: %v", f, deref(got[i].DBE), err)
		case err == nil && got[i].Error != "":
			p.t.Errorf("page rejects formula %q (%s); the service reads it with DBE %d", f, got[i].Error, want.DBE())
		case err == nil && (got[i].DBE == nil || *got[i].DBE != want.DBE()):
			p.t.Errorf("page DBE of %q = %v, service %d (DBE = 1 + Σ n(v−2)/2; common practice)", f, deref(got[i].DBE), want.DBE())
		}
	}

	// Peak lists: the table's rows against spectrum.ReadList.
	in, _ = json.Marshal(peakCases)
	var js []jsPeaks
	p.eval(fmt.Sprintf(`import("/static/chem.js").then(m => %s.map(t => {
		const r = m.parsePeaks(t);
		if (r.error) return {Error: r.error};
		return {MHz: r.mhz, Solvent: r.solvent, Text: m.formatPeaks(r.rows),
			Rows: r.rows.map(x => ({Shift: x.shift, Mult: x.mult, J: x.j, Integral: x.integral}))};
	}))`, in), &js)
	for i, text := range peakCases {
		want, err := spectrum.ReadList([]byte(text), spectrum.H1)
		if err != nil {
			p.t.Fatalf("service rejects notation example %q: %v", text, err)
		}
		g := js[i]
		if g.Error != "" {
			p.t.Errorf("page rejects %q: %s", text, g.Error)
			continue
		}
		if want.MHz != 0 && g.MHz != strconv.FormatFloat(want.MHz, 'f', -1, 64) {
			p.t.Errorf("%q: page reads %q MHz from the header, service %v", text, g.MHz, want.MHz)
		}
		if want.Solvent != "" && !strings.EqualFold(g.Solvent, want.Solvent) {
			p.t.Errorf("%q: page reads solvent %q, service %q", text, g.Solvent, want.Solvent)
		}
		comparePeaks(p.t, text, "page table", g.Rows, want.Peaks)
		// What the table writes, the service reads as the same peaks.
		back, err := spectrum.ReadList([]byte(g.Text), spectrum.H1)
		if err != nil {
			p.t.Errorf("service rejects the table's text %q (from %q): %v", g.Text, text, err)
			continue
		}
		if len(back.Peaks) != len(want.Peaks) {
			p.t.Errorf("table text %q has %d peaks for the service, original %d", g.Text, len(back.Peaks), len(want.Peaks))
			continue
		}
		for k := range back.Peaks {
			a, b := back.Peaks[k], want.Peaks[k]
			if a.ShiftLo != b.ShiftLo || a.ShiftHi != b.ShiftHi || a.Multiplicity != b.Multiplicity ||
				fmt.Sprint(a.J) != fmt.Sprint(b.J) || a.Integral != b.Integral {
				p.t.Errorf("table text %q peak %d reads as %+v, original %+v", g.Text, k+1, a, b)
			}
		}
	}
}

// testTableTextRandom writes random table rows with the page's formatter
// and checks that the service reads back exactly those peaks.
func testTableTextRandom(p *page) {
	p.open("/")
	rng := rand.New(rand.NewPCG(6, 117))
	mults := []struct {
		code string
		nJ   int
	}{{"s", 0}, {"br s", 0}, {"d", 1}, {"t", 1}, {"q", 1}, {"quint", 1}, {"sext", 1}, {"sept", 1},
		{"dd", 2}, {"dt", 2}, {"td", 2}, {"dq", 2}, {"ddd", 3}, {"m", 0}}
	var rows []jsRow
	for range 300 {
		r := jsRow{}
		hi := float64(rng.IntN(1150)+50) / 100
		if rng.IntN(5) == 0 {
			lo := hi - float64(rng.IntN(40)+1)/100
			r.Shift = fmt.Sprintf("%.2f–%.2f", hi, lo)
		} else {
			r.Shift = fmt.Sprintf("%.2f", hi)
		}
		m := mults[rng.IntN(len(mults))]
		r.Mult = m.code
		var js []string
		for range m.nJ {
			js = append(js, fmt.Sprintf("%.1f", float64(rng.IntN(170)+10)/10))
		}
		r.J = strings.Join(js, ", ")
		switch rng.IntN(3) {
		case 0:
			r.Integral = strconv.Itoa(rng.IntN(6) + 1)
		case 1:
			r.Integral = fmt.Sprintf("%.2f", float64(rng.IntN(600)+1)/100)
		}
		rows = append(rows, r)
	}
	in, _ := json.Marshal(rows)
	var texts []string
	p.eval(fmt.Sprintf(`import("/static/chem.js").then(m => %s.map(r => m.formatPeaks([{shift: r.Shift, mult: r.Mult, j: r.J, integral: r.Integral}])))`, in), &texts)
	for i, text := range texts {
		got, err := spectrum.ReadList([]byte(text), spectrum.H1)
		if err != nil {
			p.t.Errorf("service rejects the table's text %q for row %+v: %v", text, rows[i], err)
			continue
		}
		comparePeaks(p.t, text, "table row", rows[i:i+1], got.Peaks)
	}
}

func deref(p *int) any {
	if p == nil {
		return nil
	}
	return *p
}

func comparePeaks(t *testing.T, text, who string, rows []jsRow, want []spectrum.Peak) {
	t.Helper()
	if len(rows) != len(want) {
		t.Errorf("%q: %s has %d peaks, service %d", text, who, len(rows), len(want))
		return
	}
	for k, r := range rows {
		w := want[k]
		hi, lo, err := shiftOf(r.Shift)
		if err != nil || math.Abs(hi-w.ShiftHi) > 1e-9 || math.Abs(lo-w.ShiftLo) > 1e-9 {
			t.Errorf("%q peak %d: %s δ %q, service %v–%v", text, k+1, who, r.Shift, w.ShiftHi, w.ShiftLo)
		}
		if r.Mult != w.Multiplicity.Code() {
			t.Errorf("%q peak %d: %s multiplicity %q, service %q", text, k+1, who, r.Mult, w.Multiplicity.Code())
		}
		var j []float64
		for _, f := range strings.FieldsFunc(r.J, func(c rune) bool { return c == ',' || c == ' ' }) {
			v, _ := strconv.ParseFloat(f, 64)
			j = append(j, v)
		}
		if fmt.Sprint(j) != fmt.Sprint(w.J) && !(len(j) == 0 && len(w.J) == 0) {
			t.Errorf("%q peak %d: %s J %q, service %v", text, k+1, who, r.J, w.J)
		}
		integral, _ := strconv.ParseFloat(r.Integral, 64)
		if integral != w.Integral {
			t.Errorf("%q peak %d: %s integral %q, service %v", text, k+1, who, r.Integral, w.Integral)
		}
	}
}

// shiftOf reads the table's δ cell: "4.12" or "7.35–7.20" (hi–lo).
func shiftOf(s string) (hi, lo float64, err error) {
	s = strings.ReplaceAll(s, "–", "-")
	if i := strings.Index(s[1:], "-"); i >= 0 {
		a, err1 := strconv.ParseFloat(strings.TrimSpace(s[:i+1]), 64)
		b, err2 := strconv.ParseFloat(strings.TrimSpace(s[i+2:]), 64)
		if err1 != nil || err2 != nil {
			return 0, 0, fmt.Errorf("bad range %q", s)
		}
		return max(a, b), min(a, b), nil
	}
	v, err := strconv.ParseFloat(s, 64)
	return v, v, err
}

// testMultiplets checks the plot's first-order line patterns (plot.js
// multipletLines) against the n+1 rule: n equivalent neighbours split a
// signal into n+1 lines J apart with binomial (Pascal's triangle)
// intensities; each further coupling splits every line again (common
// practice).
func testMultiplets(p *page) {
	p.open("/")
	cases := []struct {
		name  string
		mult  string
		j     []float64
		h     int
		lines []float64 // offsets from the centre, Hz, in increasing order
		w     []float64 // relative intensities, same order
	}{
		{"singlet", "s", nil, 3, []float64{0}, []float64{1}},
		{"doublet", "d", []float64{6.9}, 6, []float64{-3.45, 3.45}, []float64{1, 1}},
		{"triplet", "t", []float64{7.1}, 3, []float64{-7.1, 0, 7.1}, []float64{1, 2, 1}},
		{"quartet", "q", []float64{7.1}, 2, []float64{-10.65, -3.55, 3.55, 10.65}, []float64{1, 3, 3, 1}},
		{"septet", "sept", []float64{6.9}, 1, []float64{-20.7, -13.8, -6.9, 0, 6.9, 13.8, 20.7}, []float64{1, 6, 15, 20, 15, 6, 1}},
		{"doublet of triplets", "dt", []float64{10, 2}, 1, []float64{-7, -5, -3, 3, 5, 7}, []float64{1, 2, 1, 1, 2, 1}},
		{"doublet of doublets", "dd", []float64{11.2, 4.0}, 1, []float64{-7.6, -3.6, 3.6, 7.6}, []float64{1, 1, 1, 1}},
	}
	const mhz, centre = 400.0, 2.0
	for _, tc := range cases {
		in, _ := json.Marshal(map[string]any{"shift": centre, "h": tc.h, "multiplicity": tc.mult, "j": tc.j})
		var got struct {
			Lines []struct{ PPM, W float64 }
		}
		p.eval(fmt.Sprintf(`import("/static/plot.js").then(m => {
			const r = m.multipletLines(%s, %v);
			return {Lines: r.lines.map(l => ({PPM: l.ppm, W: l.w})).sort((a, b) => a.PPM - b.PPM)};
		})`, in, mhz), &got)
		if len(got.Lines) != len(tc.lines) {
			p.t.Errorf("%s (%s, J %v): %d lines, want %d (n+1 rule)", tc.name, tc.mult, tc.j, len(got.Lines), len(tc.lines))
			continue
		}
		var sumW, sumWant float64
		for _, w := range tc.w {
			sumWant += w
		}
		for k, l := range got.Lines {
			sumW += l.W
			if off := (l.PPM - centre) * mhz; math.Abs(off-tc.lines[k]) > 1e-6 {
				p.t.Errorf("%s line %d at %+.3f Hz from the centre, want %+.3f Hz", tc.name, k+1, off, tc.lines[k])
			}
			if want := float64(tc.h) * tc.w[k] / sumWant; math.Abs(l.W-want) > 1e-9 {
				p.t.Errorf("%s line %d intensity %.4f, want %.4f (binomial, total %d H)", tc.name, k+1, l.W, want, tc.h)
			}
		}
		if math.Abs(sumW-float64(tc.h)) > 1e-9 {
			p.t.Errorf("%s: intensities add up to %.4f, want the %d H of the environment", tc.name, sumW, tc.h)
		}
	}
}
