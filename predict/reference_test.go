package predict

import (
	"bufio"
	"math"
	"os"
	"strconv"
	"strings"
	"testing"

	"shiftrank/molecule"
)

type refRow struct {
	line   int
	name   string
	smiles string
	atoms  []int
	shift  float64
	tol    float64
	h      int
	mult   string
	source string
}

func loadReference(t *testing.T, file string) []refRow {
	t.Helper()
	f, err := os.Open(file)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	var rows []refRow
	sc := bufio.NewScanner(f)
	ln := 0
	for sc.Scan() {
		ln++
		line := sc.Text()
		if line == "" || strings.HasPrefix(line, "#") {
			continue
		}
		c := strings.Split(line, "\t")
		if len(c) != 8 {
			t.Fatalf("%s:%d: %d columns, want 8", file, ln, len(c))
		}
		r := refRow{line: ln, name: c[0], smiles: c[1], mult: c[6], source: c[7]}
		for _, a := range strings.Split(c[2], ",") {
			n, err := strconv.Atoi(a)
			if err != nil {
				t.Fatalf("%s:%d: atoms %q: %v", file, ln, c[2], err)
			}
			r.atoms = append(r.atoms, n)
		}
		var e1, e2, e3 error
		r.shift, e1 = strconv.ParseFloat(c[3], 64)
		r.tol, e2 = strconv.ParseFloat(c[4], 64)
		r.h, e3 = strconv.Atoi(c[5])
		if e1 != nil || e2 != nil || e3 != nil {
			t.Fatalf("%s:%d: bad number", file, ln)
		}
		rows = append(rows, r)
	}
	return rows
}

// TestReferenceShifts compares predictions with published 1H shifts
// (testdata/reference.tsv names the source of every value): each
// environment within its tolerance, H count and first-order multiplicity
// exact, and the mean absolute error over all rows at most 0.20 ppm.
func TestReferenceShifts(t *testing.T) {
	checkReference(t, "testdata/reference.tsv")
}

// TestHoldoutShifts does the same for handbook compounds that were not used
// to derive the increment tables (testdata/holdout.tsv), an independent
// check of the additive schemes.
func TestHoldoutShifts(t *testing.T) {
	checkReference(t, "testdata/holdout.tsv")
}

// TestValidationShifts reports the error on compounds added after the
// tables were fixed (testdata/validation.tsv); nothing was tuned on them,
// so single misses are logged, not failed: the test requires a mean
// absolute error of at most 0.20 ppm and at least 90 % of the
// environments within their tolerance.
func TestValidationShifts(t *testing.T) {
	checkReferenceMode(t, "testdata/validation.tsv", true)
}

func checkReference(t *testing.T, file string) { checkReferenceMode(t, file, false) }

func checkReferenceMode(t *testing.T, file string, lenient bool) {
	report := t.Errorf
	if lenient {
		report = t.Logf
	}
	misses := 0
	rows := loadReference(t, file)
	p := New(Options{})
	spectra := map[string]*Spectrum{}
	used := map[string]map[int]bool{}
	var sumErr float64
	n := 0
	for _, r := range rows {
		sp, ok := spectra[r.smiles]
		if !ok {
			g, err := molecule.ParseSMILES(r.smiles)
			if err != nil {
				t.Fatalf("%s: %v", r.name, err)
			}
			sp, err = p.Predict(g)
			if err != nil {
				t.Fatalf("%s: %v", r.name, err)
			}
			spectra[r.smiles] = sp
			used[r.smiles] = map[int]bool{}
		}
		best := -1
		for i, e := range sp.Environments {
			if used[r.smiles][i] || e.Exchangeable {
				continue
			}
			hit := false
			for _, a := range r.atoms {
				if containsInt(e.Atoms, a) {
					hit = true
				}
			}
			if hit && (best < 0 || math.Abs(e.Shift-r.shift) < math.Abs(sp.Environments[best].Shift-r.shift)) {
				best = i
			}
		}
		if best < 0 {
			t.Errorf("%s (%s) line %d: no environment on atoms %v", r.name, r.smiles, r.line, r.atoms)
			continue
		}
		used[r.smiles][best] = true
		e := sp.Environments[best]
		d := math.Abs(e.Shift - r.shift)
		sumErr += d
		n++
		if d > r.tol {
			misses++
			report("Predict(%q) %s atoms %v shift = %.2f, want %.2f ± %.2f (source: %s)", r.smiles, r.name, e.Atoms, e.Shift, r.shift, r.tol, r.source)
		}
		if e.H != r.h {
			misses++
			report("Predict(%q) %s atoms %v H = %d, want %d", r.smiles, r.name, e.Atoms, e.H, r.h)
		}
		if r.mult != "*" && e.Multiplicity != r.mult {
			misses++
			report("Predict(%q) %s atoms %v multiplicity = %q (J %v), want %q (source: %s)", r.smiles, r.name, e.Atoms, e.Multiplicity, e.J, r.mult, r.source)
		}
	}
	mae := sumErr / float64(n)
	t.Logf("%s: %d environments of %d compounds, mean absolute error %.3f ppm", file, n, len(spectra), mae)
	if lenient && float64(misses) > 0.10*float64(n) {
		t.Errorf("%s: %d of %d environments miss their tolerance, H count or multiplicity; want at most 10 %%", file, misses, n)
	}
	if mae > 0.20 {
		t.Errorf("mean absolute error %.3f ppm, want ≤ 0.20", mae)
	}
}
