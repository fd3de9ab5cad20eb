package spectrum

import (
	"errors"
	"math"
	"strings"
	"testing"
)

func TestScaleIntegrals(t *testing.T) {
	cases := []struct {
		name    string
		peaks   string
		hTotal  int
		implied []float64 // ± 0.02 H
		warn    []string  // substrings, one per expected warning
	}{
		// Ethyl acetate C4H8O2: 2:3:3 (Gottlieb et al. 1997, from memory).
		{"exact", "δ 4.12 (q, 2H), 2.05 (s, 3H), 1.26 (t, 3H)", 8, []float64{2, 3, 3}, nil},
		{"relative areas", "δ 4.12 (q, 1H), 2.05 (s, 1.5H), 1.26 (t, 1.5H)", 8, []float64{2, 3, 3}, nil},
		// Ethanol C2H6O without its OH signal; CH2 3.72, CH3 1.25
		// (Gottlieb et al. 1997, from memory); fractional areas as measured.
		// Least squares to (2, 3): s = (2.04·2 + 3.1·3)/(2.04² + 3.1²) = 0.97157.
		{"exchangeable H missing", "δ 3.72 (q, 2.04H), 1.25 (t, 3.1H)", 6, []float64{1.982, 3.012},
			[]string{"integrals sum to 5.0 H of 6: one exchangeable H not observed?"}},
		// Acetic acid C2H4O2 read without COOH, but an integral given: the
		// 3H singlet alone.
		{"acid H missing", "δ 2.10 (s, 3H)", 4, []float64{3}, []string{"3.0 H of 4: one exchangeable"}},
		{"impurity", "δ 4.12 (q, 2H), 2.05 (s, 3H), 1.26 (t, 3H), 5.30 (s, 0.05H)", 8, []float64{2, 3, 3, 0.05},
			[]string{"minor peak(s) at 5.3 ppm"}},
		{"no integrals", "δ 4.12 (q), 2.05 (s), 1.26 (t)", 8, []float64{0, 0, 0}, []string{"no integrals given"}},
		{"one integral missing", "δ 4.12 (q, 2H), 2.05 (s), 1.26 (t, 3H)", 8, []float64{2, 0, 3},
			[]string{"no integral for the peak(s) at 2.05 ppm: they hold the remaining 3.0 H"}},
		{"poor fit", "δ 4.0 (s, 1H), 3.0 (s, 1H), 2.0 (s, 1.5H)", 5, nil, []string{"poorly"}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			pl, err := parse1H(c.peaks)
			if err != nil {
				t.Fatal(err)
			}
			implied, warns, err := ScaleIntegrals(pl, c.hTotal)
			if err != nil {
				t.Fatalf("ScaleIntegrals: %v", err)
			}
			if c.implied != nil {
				if len(implied) != len(c.implied) {
					t.Fatalf("implied = %v, want %v", implied, c.implied)
				}
				for i := range c.implied {
					if math.Abs(implied[i]-c.implied[i]) > 0.02 {
						t.Errorf("implied = %.3f, want %.3f ± 0.02", implied, c.implied)
						break
					}
				}
			}
			if len(warns) < len(c.warn) {
				t.Errorf("warnings = %q, want %q", warns, c.warn)
			}
			for _, w := range c.warn {
				found := false
				for _, g := range warns {
					found = found || strings.Contains(g, w)
				}
				if !found {
					t.Errorf("warnings = %q, want one containing %q", warns, w)
				}
			}
			if c.warn == nil && len(warns) > 0 {
				t.Errorf("warnings = %q, want none", warns)
			}
		})
	}
}

func TestScaleIntegralsErrors(t *testing.T) {
	in := "δ 7.3 (s, 1H), 5.0 (s, 1H), 3.0 (s, 1H), 2.0 (s, 1H), 1.0 (s, 1H)"
	pl, err := parse1H(in)
	if err != nil {
		t.Fatal(err)
	}
	_, _, err = ScaleIntegrals(pl, 4)
	var pe *PeakError
	if !errors.As(err, &pe) {
		t.Fatalf("ScaleIntegrals(5 peaks, 4 H) error = %v, want a *PeakError", err)
	}
	if pe.Field != "integral" || pe.Token != "1.0 (s, 1H)" || pe.Pos != strings.Index(in, "1.0 (s, 1H)") {
		t.Errorf("error = %+v, want field integral at the fifth peak", pe)
	}
	// Equal peaks far beyond the H count: still an error, never NaN.
	many, _ := parse1H("δ 5 (1H), 4 (1H), 3 (1H), 2 (1H), 1 (1H)")
	if _, _, err := ScaleIntegrals(many, 1); err == nil {
		t.Error("ScaleIntegrals(5 equal peaks, 1 H) gave no error")
	}
	if _, _, err := ScaleIntegrals(pl, 0); err == nil {
		t.Error("ScaleIntegrals(hTotal 0) gave no error")
	}
}
