package isomers

import (
	"context"
	"errors"
	"fmt"
	"sort"
	"sync"
	"testing"

	"shiftrank/molecule"
)

// TestHandbookCounts: constitutional isomer counts with the filter off.
// C3H8O 3, C4H10O 7, C5H12O 14 (alcohols + ethers), C4H8 5, C5H10 10
// (alkenes + cycloalkanes), C3H4 3, C4H6 9: handbook values, common
// practice. C6H6 217: the isomer-enumeration literature (graph-theoretic
// count of C6H6 constitutions, from memory); every one of these is also
// checked against the brute-force oracle and RDKit in rdkit_test.go.
func TestHandbookCounts(t *testing.T) {
	cases := []struct {
		formula string
		want    int64
	}{
		{"C3H8O", 3}, {"C4H10O", 7}, {"C5H12O", 14}, {"C4H8", 5}, {"C5H10", 10},
		{"C3H4", 3}, {"C4H6", 9}, {"C6H6", 217},
	}
	for _, c := range cases {
		st, err := Count(context.Background(), molecule.MustParseFormula(c.formula), Options{Filter: NoFilter()})
		if err != nil {
			t.Fatal(err)
		}
		if st.Emitted != c.want || st.Generated != c.want || !st.Complete || st.Fraction != 1 {
			t.Errorf("Count(%s) = %d (generated %d, complete %v, fraction %v), want %d (source: handbook, common practice)", c.formula, st.Emitted, st.Generated, st.Complete, st.Fraction, c.want)
		}
	}
}

// collect returns the canonical SMILES Generate emits, in order.
func collect(t *testing.T, f molecule.Formula, opts Options) ([]string, Stats) {
	t.Helper()
	var out []string
	st, err := Generate(context.Background(), f, opts, func(g *molecule.Graph) bool {
		out = append(out, molecule.CanonicalSMILES(g))
		return true
	})
	if err != nil {
		t.Fatal(err)
	}
	return out, st
}

func TestGenerateDeterministicAndComplete(t *testing.T) {
	for _, fs := range []string{"C6H12O2", "C7H8", "C5H9NO", "C4H7ClO"} {
		f := molecule.MustParseFormula(fs)
		for _, filter := range []Filter{NoFilter(), DefaultFilter()} {
			a, sa := collect(t, f, Options{Filter: filter, Workers: 1})
			b, sb := collect(t, f, Options{Filter: filter, Workers: 3})
			if fmt.Sprint(a) != fmt.Sprint(b) {
				t.Errorf("%s/%s: Generate order differs between 1 and 3 workers", fs, filter)
			}
			if sa.Emitted != int64(len(a)) || sb.Emitted != sa.Emitted || sa.Generated != sb.Generated {
				t.Errorf("%s/%s: stats %+v vs %+v", fs, filter, sa, sb)
			}
			removed := int64(0)
			for _, n := range sa.Removed {
				removed += n
			}
			if sa.Generated != sa.Emitted+removed {
				t.Errorf("%s/%s: generated %d != emitted %d + removed %d", fs, filter, sa.Generated, sa.Emitted, removed)
			}
			seen := map[string]bool{}
			for _, s := range a {
				if seen[s] {
					t.Errorf("%s/%s: %s emitted twice", fs, filter, s)
				}
				seen[s] = true
			}
			// GenerateConcurrent gives the same set
			var mu sync.Mutex
			var c []string
			sc, err := GenerateConcurrent(context.Background(), f, Options{Filter: filter, Workers: 2}, func(w int, g *molecule.Graph) bool {
				s := molecule.CanonicalSMILES(g)
				mu.Lock()
				c = append(c, s)
				mu.Unlock()
				return w >= 0 && w < 2
			})
			if err != nil || !sc.Complete {
				t.Fatalf("GenerateConcurrent(%s): %v", fs, err)
			}
			sort.Strings(c)
			as := append([]string(nil), a...)
			sort.Strings(as)
			if fmt.Sprint(as) != fmt.Sprint(c) {
				t.Errorf("%s/%s: GenerateConcurrent set differs from Generate (%d vs %d)", fs, filter, len(c), len(as))
			}
			cnt, _ := Count(context.Background(), f, Options{Filter: filter})
			if cnt.Emitted != int64(len(a)) {
				t.Errorf("%s/%s: Count = %d, Generate %d", fs, filter, cnt.Emitted, len(a))
			}
		}
	}
}

func TestLimitAndStop(t *testing.T) {
	f := molecule.MustParseFormula("C8H18O")
	all, _ := collect(t, f, Options{})
	got, st := collect(t, f, Options{Limit: 25})
	if len(got) != 25 || st.Emitted != 25 || st.Complete || st.Fraction <= 0 || st.Fraction >= 1 {
		t.Errorf("Limit 25: got %d, stats %+v", len(got), st)
	}
	if fmt.Sprint(got) != fmt.Sprint(all[:25]) {
		t.Error("Limit 25 is not a prefix of the full sequence")
	}
	n := 0
	st, err := Generate(context.Background(), f, Options{}, func(*molecule.Graph) bool {
		n++
		return n < 10
	})
	if err != nil || n != 10 || st.Complete {
		t.Errorf("yield false after 10: n=%d err=%v stats %+v", n, err, st)
	}
	var m sync.Mutex
	k := 0
	st, err = GenerateConcurrent(context.Background(), f, Options{Limit: 7}, func(int, *molecule.Graph) bool {
		m.Lock()
		k++
		m.Unlock()
		return true
	})
	if err != nil || k != 7 || st.Emitted != 7 || st.Complete {
		t.Errorf("GenerateConcurrent Limit 7: k=%d err=%v stats %+v", k, err, st)
	}
}

func TestCancel(t *testing.T) {
	f := molecule.MustParseFormula("C12H14") // millions of structures
	ctx, cancel := context.WithCancel(context.Background())
	n := 0
	st, err := Generate(ctx, f, Options{}, func(*molecule.Graph) bool {
		n++
		if n == 1000 {
			cancel()
		}
		return true
	})
	if !errors.Is(err, context.Canceled) || st.Complete {
		t.Errorf("Generate after cancel: err=%v stats complete=%v emitted=%d", err, st.Complete, st.Emitted)
	}
	ctx2, cancel2 := context.WithCancel(context.Background())
	var once sync.Once
	st, err = GenerateConcurrent(ctx2, f, Options{}, func(int, *molecule.Graph) bool {
		once.Do(cancel2)
		return true
	})
	if !errors.Is(err, context.Canceled) || st.Complete || st.Fraction >= 1 {
		t.Errorf("GenerateConcurrent after cancel: err=%v stats %+v", err, st)
	}
	ctx3, cancel3 := context.WithCancel(context.Background())
	cancel3()
	if _, err := Count(ctx3, f, Options{}); !errors.Is(err, context.Canceled) {
		t.Errorf("Count with cancelled context: %v", err)
	}
}

func TestFormulaErrors(t *testing.T) {
	odd := molecule.NewFormula(map[molecule.Element]int{molecule.C: 4, molecule.H: 9})
	if _, err := Count(context.Background(), odd, Options{}); err == nil {
		t.Error("C4H9: want an odd-electron error")
	}
	big := molecule.NewFormula(map[molecule.Element]int{molecule.C: MaxAtoms + 1, molecule.H: 2*MaxAtoms + 4})
	if _, err := Count(context.Background(), big, Options{}); err == nil {
		t.Error("too many atoms: want an error")
	}
	// formulas without a structure give zero, not an error
	none := molecule.NewFormula(map[molecule.Element]int{molecule.C: 1, molecule.H: 2})
	st, err := Count(context.Background(), none, Options{})
	if err != nil || st.Emitted != 0 || !st.Complete {
		t.Errorf("CH2: %v %+v, want 0 structures", err, st)
	}
}

// TestSmallFormulas: single atoms and hypervalent hydrides.
func TestSmallFormulas(t *testing.T) {
	cases := []struct {
		formula string
		want    []string
	}{
		{"CH4", []string{"C"}},
		{"H2O", []string{"O"}},
		{"H2S", []string{"S"}},
		{"HCl", []string{"Cl"}},
		{"Cl2", []string{"ClCl"}},
		{"O2", []string{"O=O"}},
		{"CO2", []string{"O=C=O"}},
		{"CH2O", []string{"C=O"}},
	}
	for _, c := range cases {
		got, _ := collect(t, molecule.MustParseFormula(c.formula), Options{Filter: NoFilter()})
		sort.Strings(got)
		if fmt.Sprint(got) != fmt.Sprint(c.want) {
			t.Errorf("%s: got %v, want %v (common practice)", c.formula, got, c.want)
		}
	}
	// ParseFormula rejects H4S (negative DBE at the lowest valences), but
	// the generator takes the formula value: S(IV) with four H.
	h4s := molecule.NewFormula(map[molecule.Element]int{molecule.S: 1, molecule.H: 4})
	got, _ := collect(t, h4s, Options{Filter: NoFilter()})
	if fmt.Sprint(got) != "[[SH4]]" {
		t.Errorf("H4S: got %v, want [[SH4]]", got)
	}
}

func ExampleGenerate() {
	f := molecule.MustParseFormula("C3H8O")
	st, err := Generate(context.Background(), f, Options{Filter: DefaultFilter()}, func(g *molecule.Graph) bool {
		fmt.Println(molecule.CanonicalSMILES(g))
		return true
	})
	fmt.Println(st.Emitted, st.Complete, err)
	// Output:
	// CC(C)O
	// CCCO
	// COCC
	// 3 true <nil>
}

// TestFractionEstimate: a Limit run of Count covers a share of the search
// space from which Emitted/Fraction estimates the full count (within a
// factor of two here; the estimate is for progress and totals).
func TestFractionEstimate(t *testing.T) {
	f := molecule.MustParseFormula("C8H14O2")
	full, err := Count(context.Background(), f, Options{Filter: DefaultFilter()})
	if err != nil {
		t.Fatal(err)
	}
	part, err := Count(context.Background(), f, Options{Filter: DefaultFilter(), Limit: full.Emitted / 5})
	if err != nil {
		t.Fatal(err)
	}
	est := float64(part.Emitted) / part.Fraction
	if part.Complete || est < float64(full.Emitted)/2 || est > float64(full.Emitted)*2 {
		t.Errorf("C8H14O2: estimate %.0f from %d at fraction %.3f, full count %d", est, part.Emitted, part.Fraction, full.Emitted)
	}
}

// TestCanonicalSMILESDistinct: every emitted structure is a different
// compound for the molecule package too (its canonical SMILES merges
// Kekulé structures by the same aromaticity model), so the isomers
// command never prints a line twice.
func TestCanonicalSMILESDistinct(t *testing.T) {
	formulas := []string{"C8H10", "C8H8", "C6H6O", "C5H5N", "C4H4N2", "C6H4O2"}
	if testing.Short() {
		formulas = formulas[:2]
	}
	for _, fs := range formulas {
		f := molecule.MustParseFormula(fs)
		seen := map[string]bool{}
		var c molecule.Canonicalizer
		_, err := Generate(context.Background(), f, Options{Filter: NoFilter()}, func(g *molecule.Graph) bool {
			s, _ := c.CanonicalSMILES(g)
			if seen[s] {
				t.Errorf("%s: %s emitted twice", fs, s)
			}
			seen[s] = true
			return true
		})
		if err != nil {
			t.Fatal(err)
		}
		t.Logf("%s: %d distinct", fs, len(seen))
	}
}
