package spectrum

import (
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// gottlieb1997 restates the residual and water signals of Gottlieb,
// Kotlyar, Nudelman, "NMR Chemical Shifts of Common Laboratory Solvents as
// Trace Impurities", J. Org. Chem. 1997, 62, 7512, Table 1 (values from
// memory).
var gottlieb1997 = []struct {
	solvent  string
	residual float64 // NaN: none (D2O)
	water    float64
}{
	{"CDCl3", 7.26, 1.56},
	{"DMSO-d6", 2.50, 3.33},
	{"acetone-d6", 2.05, 2.84},
	{"CD3OD", 3.31, 4.87},
	{"D2O", math.NaN(), 4.79},
	{"C6D6", 7.16, 0.40},
	{"CD3CN", 1.94, 2.13},
	{"CD2Cl2", 5.32, 1.52},
}

func TestSolventPeaks(t *testing.T) {
	for _, c := range gottlieb1997 {
		sigs := SolventPeaks(c.solvent, H1)
		if len(sigs) == 0 {
			t.Errorf("SolventPeaks(%q) = none", c.solvent)
			continue
		}
		got := map[string]float64{}
		for _, s := range sigs {
			if s.Solvent != c.solvent {
				t.Errorf("SolventPeaks(%q): signal %s has solvent %q", c.solvent, s.Name, s.Solvent)
			}
			if s.Tolerance <= 0 {
				t.Errorf("SolventPeaks(%q): signal %s has no tolerance", c.solvent, s.Name)
			}
			got[s.Kind] = s.Shift
		}
		if !math.IsNaN(c.residual) && math.Abs(got["residual"]-c.residual) > 0.005 {
			t.Errorf("SolventPeaks(%q) residual = %.2f, want %.2f (Gottlieb et al. 1997)", c.solvent, got["residual"], c.residual)
		}
		if math.Abs(got["water"]-c.water) > 0.005 {
			t.Errorf("SolventPeaks(%q) water = %.2f, want %.2f (Gottlieb et al. 1997)", c.solvent, got["water"], c.water)
		}
		if ref, ok := got["reference"]; !ok || ref != 0 {
			t.Errorf("SolventPeaks(%q) reference = %v, want 0.00 (TMS/DSS by definition)", c.solvent, ref)
		}
	}
	if SolventPeaks("CCl4", H1) != nil {
		t.Error("SolventPeaks(CCl4) should be nil: not a known deuterated solvent")
	}
}

func TestCanonicalSolvent(t *testing.T) {
	// Spellings in common use in experimental sections (common practice).
	cases := map[string]string{
		"CDCl3": "CDCl3", "cdcl3": "CDCl3", "chloroform-d": "CDCl3", "CDCl₃": "CDCl3", "deuterochloroform": "CDCl3",
		"DMSO-d6": "DMSO-d6", "[D6]DMSO": "DMSO-d6", "d6-DMSO": "DMSO-d6", "DMSO-D6": "DMSO-d6", "(CD3)2SO": "DMSO-d6", "DMSO": "DMSO-d6",
		"acetone-d6": "acetone-d6", "[D6]acetone": "acetone-d6", "(CD3)2CO": "acetone-d6",
		"CD3OD": "CD3OD", "methanol-d4": "CD3OD", "[D4]methanol": "CD3OD", "MeOD": "CD3OD",
		"D2O": "D2O", "deuterium oxide": "D2O",
		"C6D6": "C6D6", "benzene-d6": "C6D6", "[D6]benzene": "C6D6",
		"CD3CN": "CD3CN", "acetonitrile-d3": "CD3CN",
		"CD2Cl2": "CD2Cl2", "dichloromethane-d2": "CD2Cl2", "methylene chloride-d2": "CD2Cl2",
	}
	for in, want := range cases {
		if got, ok := CanonicalSolvent(in); !ok || got != want {
			t.Errorf("CanonicalSolvent(%q) = %q, %v; want %q", in, got, ok, want)
		}
	}
	for _, in := range []string{"", "CCl4", "THF", "400 MHz", "1H"} {
		if got, ok := CanonicalSolvent(in); ok {
			t.Errorf("CanonicalSolvent(%q) = %q, want not recognised", in, got)
		}
	}
}

func TestFlagSolvent(t *testing.T) {
	// Ethyl acetate in CDCl3 (Gottlieb et al. 1997, from memory) with the
	// residual CHCl3, water and TMS signals as a peak-picking export lists
	// them, and a phenyl multiplet that spans 7.26.
	pl, err := parse1H("1H NMR (400 MHz, CDCl3) δ 7.35–7.20 (m, 5H), 7.26 (s), 4.12 (q, J = 7.1 Hz, 2H), " +
		"2.05 (s, 3H), 1.60 (br s), 1.26 (t, J = 7.1 Hz, 3H), 0.00 (s)")
	if err != nil {
		t.Fatal(err)
	}
	type want struct {
		peak    int
		name    string
		exclude bool
	}
	wants := []want{{0, "CHCl3", false}, {1, "CHCl3", true}, {4, "H2O", true}, {6, "TMS", true}}
	flags := FlagSolvent(pl, "")
	if len(flags) != len(wants) {
		t.Fatalf("FlagSolvent = %+v, want %d flags", flags, len(wants))
	}
	for i, w := range wants {
		f := flags[i]
		if f.Peak != w.peak || f.Signal.Name != w.name || f.Exclude != w.exclude {
			t.Errorf("flag %d = peak %d %s exclude %v, want peak %d %s exclude %v",
				i, f.Peak, f.Signal.Name, f.Exclude, w.peak, w.name, w.exclude)
		}
	}
	kept, idx := ExcludeFlagged(pl, flags)
	if len(kept.Peaks) != 4 || idx[0] != 0 || idx[1] != 2 || idx[2] != 3 || idx[3] != 5 {
		t.Errorf("ExcludeFlagged kept %v (indices %v), want peaks 0, 2, 3, 5", kept, idx)
	}
	// The same list read as DMSO-d6 flags only TMS; 2.05 is not the
	// DMSO residual (2.50).
	if f := FlagSolvent(pl, "DMSO-d6"); len(f) != 1 || f[0].Peak != 6 {
		t.Errorf("FlagSolvent(DMSO-d6) = %+v, want only TMS at peak 6", f)
	}
	// A methoxy singlet 0.05 ppm from the water signal of DMSO-d6 is
	// flagged but kept; a broad one there is water.
	pl3, _ := parse1H("1H NMR (DMSO-d6) δ 3.28 (s, 3H), 3.38 (br s, 2H)")
	if f := FlagSolvent(pl3, ""); len(f) != 2 || f[0].Exclude || !f[1].Exclude {
		t.Errorf("FlagSolvent(DMSO-d6 3.28 s 3H, 3.38 br s) = %+v, want the first kept, the second excluded", f)
	}
	// A compound's triplet at the water shift is not water.
	pl2, _ := parse1H("δ 1.56 (t, J = 7 Hz, 3H)")
	if f := FlagSolvent(pl2, "CDCl3"); len(f) != 1 || f[0].Exclude {
		t.Errorf("FlagSolvent(triplet at 1.56) = %+v, want one non-excluding flag", f)
	}
	if FlagSolvent(pl, "") == nil && pl.Solvent != "" {
		t.Error("FlagSolvent with the list's own solvent found nothing")
	}
	if f := FlagSolvent(PeakList{Peaks: pl.Peaks}, ""); f != nil {
		t.Errorf("FlagSolvent without a solvent = %+v, want nil", f)
	}
}

// gottlieb1997Carbon restates the 13C solvent signals of Gottlieb,
// Kotlyar, Nudelman, J. Org. Chem. 1997, 62, 7512, Table 2, and for CD2Cl2
// of Fulmer et al., Organometallics 2010, 29, 2176, Table 2 (values from
// memory); lines is the number of lines of the C–D multiplet (2n + 1 for n
// deuterons, common practice).
var gottlieb1997Carbon = []struct {
	solvent string
	shift   float64
	lines   int
}{
	{"CDCl3", 77.16, 3},
	{"DMSO-d6", 39.52, 7},
	{"acetone-d6", 29.84, 7},
	{"acetone-d6", 206.26, 1},
	{"CD3OD", 49.00, 7},
	{"C6D6", 128.06, 3},
	{"CD3CN", 1.32, 7},
	{"CD3CN", 118.26, 1},
	{"CD2Cl2", 53.84, 5},
}

func TestCarbonSolventPeaks(t *testing.T) {
	for _, c := range gottlieb1997Carbon {
		t.Run(c.solvent, func(t *testing.T) {
			var found *SolventSignal
			for _, s := range SolventPeaks(c.solvent, C13) {
				assert.Equal(t, C13, s.Nucleus)
				if s.Kind == "residual" && math.Abs(s.Shift-c.shift) < 0.005 {
					found = &s
				}
			}
			require.NotNil(t, found, "SolventPeaks(%q, 13C) has no signal at %.2f ppm (Gottlieb et al. 1997)", c.solvent, c.shift)
			lines := 1
			if found.Multiplicity.NumFactors() == 1 {
				lines = found.Multiplicity.Factor(0)
			}
			assert.Equal(t, c.lines, lines, "SolventPeaks(%q, 13C) %.2f ppm lines", c.solvent, c.shift)
		})
	}
	assert.Empty(t, SolventPeaks("D2O", C13), "D2O has no carbon")
	assert.Nil(t, SolventPeaks("CCl4", C13), "not a known deuterated solvent")
}

// TestFlagSolventCarbon flags the CDCl3 signal in a 13C list of ethyl
// acetate (Gottlieb et al. 1997, Table 2; from memory), whether referenced
// at 77.16 or at the older 77.0 (common practice), and nothing else.
func TestFlagSolventCarbon(t *testing.T) {
	for _, in := range []string{
		"13C NMR (101 MHz, CDCl3) δ 171.36, 77.16, 60.49, 21.04, 14.19",
		"13C NMR (101 MHz, CDCl3) δ 171.36, 77.0, 60.49, 21.04, 14.19",
	} {
		pl, err := ReadList([]byte(in), C13)
		require.NoError(t, err)
		flags := FlagSolvent(pl, "")
		require.Len(t, flags, 1, "%s: flags %v", in, flags)
		assert.Equal(t, 1, flags[0].Peak)
		assert.Equal(t, "CDCl3", flags[0].Signal.Name)
		assert.True(t, flags[0].Exclude)
		kept, idx := ExcludeFlagged(pl, flags)
		assert.Equal(t, C13, kept.Nucleus)
		assert.Equal(t, []int{0, 2, 3, 4}, idx)
	}
}
