package predict

import (
	"math"
	"testing"
)

// TestSpinTransitionsABQuartet checks the exact solution of two coupled
// spins against the analytic AB quartet (Friebolin, "Basic One- and
// Two-Dimensional NMR Spectroscopy", ch. 4; any NMR textbook): lines at
// ν0 ± D/2 ± J/2 with D = sqrt(Δν² + J²), and the roof effect: inner/outer
// intensity ratio (1 + J/D)/(1 − J/D).
func TestSpinTransitionsABQuartet(t *testing.T) {
	for _, tc := range []struct {
		name     string
		dnuOverJ float64
	}{
		{"Δν/J=0.2", 0.2}, {"Δν/J=0.5", 0.5}, {"Δν/J=1", 1}, {"Δν/J=2", 2}, {"Δν/J=5", 5}, {"Δν/J=20", 20},
	} {
		t.Run(tc.name, func(t *testing.T) {
			j := 8.0
			dnu := tc.dnuOverJ * j
			nu0 := 1000.0
			nu := []float64{nu0 - dnu/2, nu0 + dnu/2}
			J := [][]float64{{0, j}, {j, 0}}
			tl, err := SpinTransitions(nu, J)
			if err != nil {
				t.Fatal(err)
			}
			if len(tl) != 4 {
				t.Fatalf("got %d lines, want 4: %+v", len(tl), tl)
			}
			d := math.Sqrt(dnu*dnu + j*j)
			want := []float64{nu0 - d/2 - j/2, nu0 - d/2 + j/2, nu0 + d/2 - j/2, nu0 + d/2 + j/2}
			for i := range want {
				if math.Abs(tl[i].Hz-want[i]) > 1e-6 {
					t.Errorf("line %d at %.6f Hz, want %.6f (AB quartet, Friebolin ch. 4)", i, tl[i].Hz, want[i])
				}
			}
			ratio := tl[1].Intensity / tl[0].Intensity
			wantRatio := (1 + j/d) / (1 - j/d)
			if math.Abs(ratio-wantRatio) > 1e-6*wantRatio {
				t.Errorf("inner/outer = %.6f, want %.6f", ratio, wantRatio)
			}
			if r2 := tl[2].Intensity / tl[3].Intensity; math.Abs(r2-wantRatio) > 1e-6*wantRatio {
				t.Errorf("inner/outer (upper half) = %.6f, want %.6f", r2, wantRatio)
			}
			sum := 0.0
			for _, l := range tl {
				sum += l.Intensity
			}
			if math.Abs(sum-4) > 1e-9 { // n·2^(n-1) for n = 2
				t.Errorf("total intensity %.6f, want 4", sum)
			}
		})
	}
}

// TestSpinTransitionsA2X3 checks that a weakly coupled ethyl-like system
// (A2X3, Δν/J = 100) reproduces the first-order quartet and triplet with
// binomial intensities (n+1 rule, common practice).
func TestSpinTransitionsA2X3(t *testing.T) {
	j := 7.0
	nuA, nuX := 1400.0, 700.0
	nu := []float64{nuA, nuA, nuX, nuX, nuX}
	J := make([][]float64, 5)
	for i := range J {
		J[i] = make([]float64, 5)
	}
	for a := 0; a < 2; a++ {
		for x := 2; x < 5; x++ {
			J[a][x], J[x][a] = j, j
		}
	}
	tl, err := SpinTransitions(nu, J)
	if err != nil {
		t.Fatal(err)
	}
	// Bin the lines by nearest first-order position.
	bin := map[float64]float64{}
	for _, l := range tl {
		p := math.Round(l.Hz*2) / 2
		bin[p] += l.Intensity
	}
	check := func(pos, want float64) {
		t.Helper()
		got := 0.0
		for p, v := range bin {
			if math.Abs(p-pos) < 0.6 {
				got += v
			}
		}
		if math.Abs(got-want) > 0.05*want {
			t.Errorf("intensity near %.1f Hz = %.3f, want %.3f", pos, got, want)
		}
	}
	// Total 5·2^4 = 80; the two A spins carry 32, the three X spins 48.
	for k, w := range []float64{1, 3, 3, 1} {
		check(nuA+(float64(k)-1.5)*j, 32*w/8)
	}
	for k, w := range []float64{1, 2, 1} {
		check(nuX+(float64(k)-1)*j, 48*w/4)
	}
}

func TestSpinTransitionsErrors(t *testing.T) {
	if _, err := SpinTransitions([]float64{1, 2}, [][]float64{{0}}); err == nil {
		t.Error("bad J shape: want error")
	}
	if _, err := SpinTransitions(make([]float64, 20), nil); err == nil {
		t.Error("20 spins: want error")
	}
}

// TestSimulateFromPrediction: simulated areas equal the H counts; a weakly
// coupled ethyl group is first order (quartet 1:3:3:1, triplet 1:2:1).
func TestSimulateFromPrediction(t *testing.T) {
	p := New(Options{})
	for _, s := range []string{"CCOC(C)=O", "C=Cc1ccccc1", "c1ccncc1", "CCCCCCCC", "CC(C)O", "COc1ccc(Cl)cc1"} {
		g := mustParse(t, s)
		sp, err := p.Predict(g)
		if err != nil {
			t.Fatal(err)
		}
		tr := Simulate(sp, SimOptions{MHz: 400})
		area := 0.0
		for _, l := range tr.Lines {
			area += l.Intensity
		}
		if math.Abs(area-float64(g.HydrogenCount())) > 1e-6 {
			t.Errorf("%s: line areas sum to %.4f, want %d", s, area, g.HydrogenCount())
		}
		// Numerical integral of the trace (Lorentzian tails beyond the
		// window are lost: allow 3 %).
		integ := 0.0
		for i := 1; i < len(tr.PPM); i++ {
			integ += (tr.Intensity[i] + tr.Intensity[i-1]) / 2 * (tr.PPM[i] - tr.PPM[i-1])
		}
		if math.Abs(integ-float64(g.HydrogenCount())) > 0.03*float64(g.HydrogenCount()) {
			t.Errorf("%s: trace integral %.3f, want %d", s, integ, g.HydrogenCount())
		}
	}
	sp, _ := p.Predict(mustParse(t, "CCOC(C)=O"))
	tr := Simulate(sp, SimOptions{MHz: 400})
	var q []float64
	for _, l := range tr.Lines {
		if l.PPM > 4.0 && l.PPM < 4.2 {
			q = append(q, l.Intensity)
		}
	}
	want := []float64{0.25, 0.75, 0.75, 0.25}
	if len(q) != 4 {
		t.Fatalf("ethyl acetate OCH2: %d lines, want 4 (quartet)", len(q))
	}
	for i := range q {
		if math.Abs(q[i]-want[i]) > 1e-9 {
			t.Errorf("quartet line %d: %.3f, want %.3f", i, q[i], want[i])
		}
	}
}

// TestSimulateLargeSpinSystem: a strongly coupled system beyond
// MaxSpinSystem falls back to first order with a note.
func TestSimulateLargeSpinSystem(t *testing.T) {
	sp, err := New(Options{}).Predict(mustParse(t, "CCCCCCCCCC"))
	if err != nil {
		t.Fatal(err)
	}
	tr := Simulate(sp, SimOptions{})
	if len(tr.Notes) == 0 {
		t.Errorf("decane: want a first-order fallback note, got none")
	}
}

// TestExactGroupSpinsWeakLimit: the exact solution built from the
// group-level couplings of a prediction (three ring protons of a
// 1,2,4-trisubstituted benzene with ortho and meta couplings) reproduces
// the first-order multiplets when Δν ≫ J (simulated at 5000 MHz); a check
// of the Hamiltonian against the n+1 rule (common practice).
func TestExactGroupSpinsWeakLimit(t *testing.T) {
	p := New(Options{Explain: true, MHz: 5000})
	sp, err := p.Predict(mustParse(t, "Cc1ccc(Cl)c(Cl)c1"))
	if err != nil {
		t.Fatal(err)
	}
	var ring []int
	for _, e := range sp.Environments {
		if e.Kind == "aromatic CH" {
			ring = append(ring, e.ID)
		}
	}
	if len(ring) != 3 || sp.spins == nil {
		t.Fatalf("want 3 aromatic environments and a spin table, got %v", ring)
	}
	const mhz = 5000
	exact, err := exactGroupLines(sp.Environments, sp.spins, ring, mhz)
	if err != nil {
		t.Fatal(err)
	}
	for _, id := range ring {
		e := sp.Environments[id]
		e.Couplings = append([]Coupling(nil), e.Couplings...)
		for i := range e.Couplings {
			e.Couplings[i].Resolved = true // compare with every coupling, resolved or not
		}
		for _, fl := range firstOrderLines(e, mhz) {
			got := 0.0
			for _, l := range exact {
				if math.Abs(l.PPM-fl.PPM)*mhz < 0.1 {
					got += l.Intensity
				}
			}
			if math.Abs(got-fl.Intensity) > 0.02 {
				t.Errorf("env %d line at %.4f ppm: exact intensity %.3f, first order %.3f", id, fl.PPM, got, fl.Intensity)
			}
		}
	}
}
