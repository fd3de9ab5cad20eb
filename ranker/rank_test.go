package ranker

import (
	"context"
	"encoding/json"
	"errors"
	"strings"
	"sync/atomic"
	"testing"
	"time"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"shiftrank/molecule"
	"shiftrank/spectrum"
)

// ethylAcetate is ethyl acetate in CDCl3 (Gottlieb, Kotlyar, Nudelman,
// J. Org. Chem. 1997, 62, 7512, Table 1; from memory).
const ethylAcetate = "1H NMR (300 MHz, CDCl3) δ 4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H), 1.26 (t, J = 7.1 Hz, 3H)"

func mustPeaks(t testing.TB, s string) spectrum.PeakList {
	t.Helper()
	pl, err := spectrum.ReadList([]byte(s), spectrum.H1)
	if err != nil {
		t.Fatalf("ReadList(%q): %v", s, err)
	}
	return pl
}

// canonical returns the canonical SMILES of s.
func canonical(t testing.TB, s string) string {
	t.Helper()
	return molecule.CanonicalSMILES(molecule.MustParseSMILES(s))
}

func TestRankRequestErrors(t *testing.T) {
	pl := mustPeaks(t, ethylAcetate)
	tests := []struct {
		name  string
		req   Request
		field string
		token string
	}{
		{"unknown element", Request{Formula: "C4H8Xy2", Peaks: pl}, "formula", "Xy"},
		{"empty formula", Request{Formula: "", Peaks: pl}, "formula", ""},
		{"odd electrons", Request{Formula: "C4H7O2", Peaks: pl}, "formula", "C4H7O2"},
		{"no hydrogens", Request{Formula: "CCl4", Peaks: pl}, "formula", "CCl4"},
		{"no peaks", Request{Formula: "C4H8O2"}, "peaks", ""},
		{"bad filter", Request{Formula: "C4H8O2", Peaks: pl, Filter: "plausible,-no-such-rule"}, "filter", "plausible,-no-such-rule"},
		{"bad fragment", Request{Formula: "C4H8O2", Peaks: pl, Require: []string{"C(=O"}}, "require[0]", ""},
		{"bad forbid", Request{Formula: "C4H8O2", Peaks: pl, Forbid: []string{"CO", "C1CC"}}, "forbid[1]", ""},
		{"negative top", Request{Formula: "C4H8O2", Peaks: pl, TopK: -1}, "top", "-1"},
		{"negative budget", Request{Formula: "C4H8O2", Peaks: pl, TimeBudget: -time.Second}, "time_budget", "-1s"},
		{"unknown solvent", Request{Formula: "C4H8O2", Peaks: pl, Solvent: "THF-d8x"}, "solvent", "THF-d8x"},
		{"too many H for the peaks", Request{Formula: "CH4O", Peaks: mustPeaks(t, "5.0 (s, 1H), 4.0 (s, 1H), 3.0 (s, 1H), 2.0 (s, 1H), 1.0 (s, 1H)")}, "peaks", ""},
		{"13C list as the peaks", Request{Formula: "C4H8O2", Peaks: carbonList(t)}, "peaks", "13C"},
		{"1H list as the 13C list", Request{Formula: "C4H8O2", Peaks: pl, Carbon: pl}, "carbon", "1H"},
		{"bad 13C list", Request{Formula: "C4H8O2", Peaks: pl, Carbon: spectrum.PeakList{Nucleus: spectrum.C13,
			Peaks: []spectrum.Peak{{Shift: 300, ShiftLo: 300, ShiftHi: 300, Text: "300"}}}}, "carbon.peaks[0].shift", "300"},
	}
	r := New(Options{Workers: 1})
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := r.Rank(context.Background(), tc.req, nil)
			var re *RequestError
			if !errors.As(err, &re) {
				t.Fatalf("Rank error = %v (%T), want *RequestError", err, err)
			}
			if !strings.HasPrefix(re.Field, tc.field) {
				t.Errorf("Field = %q, want prefix %q (error %v)", re.Field, tc.field, err)
			}
			if tc.token != "" && re.Token != tc.token {
				t.Errorf("Token = %q, want %q (error %v)", re.Token, tc.token, err)
			}
		})
	}
}

// carbonList is the 13C list of ethyl acetate in CDCl3 (Gottlieb, Kotlyar,
// Nudelman, J. Org. Chem. 1997, 62, 7512, Table 2; from memory).
func carbonList(t testing.TB) spectrum.PeakList {
	t.Helper()
	pl, err := spectrum.ReadList([]byte("13C NMR (101 MHz, CDCl3) δ 171.36, 60.49, 21.04, 14.19"), spectrum.C13)
	if err != nil {
		t.Fatal(err)
	}
	return pl
}

func TestRankEthylAcetate(t *testing.T) {
	r := New(Options{})
	var calls atomic.Int64
	res, err := r.Rank(context.Background(), Request{Formula: "C4H8O2", Peaks: mustPeaks(t, ethylAcetate), TopK: 5, Unconstrained: true},
		func(Progress) { calls.Add(1) })
	if err != nil {
		t.Fatal(err)
	}
	if !res.Complete || res.IsomersEstimated {
		t.Errorf("Complete = %v, IsomersEstimated = %v for a small formula", res.Complete, res.IsomersEstimated)
	}
	if res.Scored != res.IsomersTotal || res.Scored == 0 {
		t.Errorf("scored %d of %d isomers", res.Scored, res.IsomersTotal)
	}
	if calls.Load() == 0 {
		t.Error("progress never called")
	}
	if len(res.Candidates) != 5 {
		t.Fatalf("%d candidates, want 5", len(res.Candidates))
	}
	sum := 0.0
	for i, c := range res.Candidates {
		if c.Rank != i+1 {
			t.Errorf("candidate %d has rank %d", i, c.Rank)
		}
		if i > 0 && c.Score > res.Candidates[i-1].Score {
			t.Errorf("candidate %d scores %.3f above candidate %d (%.3f)", i+1, c.Score, i, res.Candidates[i-1].Score)
		}
		sum += c.Probability
		// Every scored peak is either assigned or unexplained.
		if n := len(c.Assignments) + len(c.UnexplainedPeaks); n != 3 {
			t.Errorf("%s: %d assigned + unexplained peaks, want 3", c.SMILES, n)
		}
	}
	if sum > 1+1e-9 {
		t.Errorf("probabilities of the top 5 sum to %.6f > 1", sum)
	}
	// The true structure must be first (the reason the product exists).
	if got, want := res.Candidates[0].SMILES, canonical(t, "CCOC(C)=O"); got != want {
		t.Fatalf("first candidate %s, want ethyl acetate %s", got, want)
	}
	// Atom numbers index the candidate's SMILES: the 4.12 q is the OCH2,
	// the 2.05 s the acetyl CH3, the 1.26 t the CH3 next to the CH2.
	for _, c := range res.Candidates {
		g, err := molecule.ParseSMILES(c.SMILES)
		if err != nil {
			t.Fatal(err)
		}
		for _, a := range c.Assignments {
			h := 0
			for _, at := range a.Atoms {
				if at < 0 || at >= len(g.Atoms) || g.Atoms[at].HCount == 0 {
					t.Fatalf("%s: peak %d assigned to atom %d, which carries no H", c.SMILES, a.Peak, at)
				}
				h += g.Atoms[at].HCount
			}
			if h < a.ExpectedH {
				t.Errorf("%s: peak %d expects %d H on atoms %v holding %d", c.SMILES, a.Peak, a.ExpectedH, a.Atoms, h)
			}
		}
	}
	// Read the atoms in the candidate's own SMILES: the 4.12 q on the
	// CH2 bonded to O, the 2.05 s on the CH3 bonded to C=O, the 1.26 t on
	// the CH3 bonded to the CH2.
	g := molecule.MustParseSMILES(res.Candidates[0].SMILES)
	for _, a := range res.Candidates[0].Assignments {
		if len(a.Atoms) != 1 {
			t.Fatalf("peak %d on atoms %v, want one atom", a.Peak, a.Atoms)
		}
		at := a.Atoms[0]
		nextToO := false
		for _, nb := range g.Neighbors(at) {
			nextToO = nextToO || g.Atoms[nb.Atom].Element == molecule.O
		}
		switch a.Peak {
		case 0:
			if g.Atoms[at].HCount != 2 || !nextToO {
				t.Errorf("4.12 q on atom %d, want the OCH2", at)
			}
		case 1:
			if g.Atoms[at].HCount != 3 || nextToO {
				t.Errorf("2.05 s on atom %d, want the acetyl CH3", at)
			}
		case 2:
			if g.Atoms[at].HCount != 3 || nextToO || g.Atoms[g.Neighbors(at)[0].Atom].HCount != 2 {
				t.Errorf("1.26 t on atom %d, want the ethyl CH3", at)
			}
		}
	}
}

func TestRankDeterministic(t *testing.T) {
	req := Request{Formula: "C5H10O", Peaks: mustPeaks(t, "2.44 (q, J = 7.3 Hz, 4H), 1.05 (t, J = 7.3 Hz, 6H)"), TopK: 8}
	a, err := New(Options{Workers: 1}).Rank(context.Background(), req, nil)
	if err != nil {
		t.Fatal(err)
	}
	b, err := New(Options{Workers: 3}).Rank(context.Background(), req, nil)
	if err != nil {
		t.Fatal(err)
	}
	if len(a.Candidates) != len(b.Candidates) {
		t.Fatalf("%d vs %d candidates", len(a.Candidates), len(b.Candidates))
	}
	for i := range a.Candidates {
		if a.Candidates[i].SMILES != b.Candidates[i].SMILES {
			t.Errorf("rank %d: %s with 1 worker, %s with 3", i+1, a.Candidates[i].SMILES, b.Candidates[i].SMILES)
		}
	}
}

func TestRankBudgetIsNotSilent(t *testing.T) {
	req := Request{Formula: "C8H16O2", Peaks: mustPeaks(t, "4.12 (q, 2H), 2.28 (t, 2H), 1.64 (m, 2H), 1.30 (m, 4H), 1.25 (t, 3H), 0.94 (t, 3H)"),
		MaxCandidates: 500, TopK: 3, Unconstrained: true}
	res, err := New(Options{}).Rank(context.Background(), req, nil)
	if err != nil {
		t.Fatal(err)
	}
	if res.Complete {
		t.Fatalf("Complete = true after a 500-candidate limit (scored %d)", res.Scored)
	}
	if !res.IsomersEstimated || res.IsomersTotal <= res.Generated {
		t.Errorf("IsomersTotal = %d (estimated %v), generated %d: want an estimate above what was generated", res.IsomersTotal, res.IsomersEstimated, res.Generated)
	}
	w := strings.Join(res.Warnings, "\n")
	for _, want := range []string{"Stopped early", "candidate limit", "scored", "constraints"} {
		if !strings.Contains(w, want) {
			t.Errorf("warnings lack %q:\n%s", want, w)
		}
	}
}

func TestRankTimeBudget(t *testing.T) {
	req := Request{Formula: "C10H14O", Peaks: mustPeaks(t, "7.20 (m, 4H), 3.80 (s, 3H), 2.60 (q, 2H), 1.20 (t, 3H), 2.30 (s, 2H)"),
		TimeBudget: 200 * time.Millisecond, TopK: 2, Unconstrained: true}
	res, err := New(Options{}).Rank(context.Background(), req, nil)
	if err != nil {
		t.Fatal(err)
	}
	if res.Complete {
		t.Fatalf("C10H14O complete within 200 ms (scored %d)?", res.Scored)
	}
	if w := strings.Join(res.Warnings, "\n"); !strings.Contains(w, "time budget") {
		t.Errorf("warnings do not mention the time budget:\n%s", w)
	}
}

func TestRankCancelled(t *testing.T) {
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	_, err := New(Options{}).Rank(ctx, Request{Formula: "C8H10", Peaks: mustPeaks(t, "7.05 (s, 4H), 2.31 (s, 6H)")}, nil)
	if !errors.Is(err, context.Canceled) {
		t.Errorf("error %v, want context.Canceled", err)
	}
}

func TestRankSolventPeakExcluded(t *testing.T) {
	// 7.26 is residual CHCl3 in CDCl3 (Gottlieb et al. 1997).
	pl := mustPeaks(t, "1H NMR (400 MHz, CDCl3) δ 7.26 (s, 0.1H), 4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H), 1.26 (t, J = 7.1 Hz, 3H)")
	res, err := New(Options{}).Rank(context.Background(), Request{Formula: "C4H8O2", Peaks: pl, TopK: 1}, nil)
	if err != nil {
		t.Fatal(err)
	}
	if !res.Peaks[0].Excluded {
		t.Errorf("peak at 7.26 not excluded: %+v", res.Peaks[0])
	}
	for _, a := range res.Candidates[0].Assignments {
		if a.Peak == 0 {
			t.Errorf("solvent peak assigned: %+v", a)
		}
	}
}

func TestResultJSONFieldNames(t *testing.T) {
	res, err := New(Options{}).Rank(context.Background(), Request{Formula: "C4H8O2", Peaks: mustPeaks(t, ethylAcetate), TopK: 2}, nil)
	if err != nil {
		t.Fatal(err)
	}
	b, err := json.Marshal(res)
	if err != nil {
		t.Fatal(err)
	}
	var m map[string]any
	if err := json.Unmarshal(b, &m); err != nil {
		t.Fatal(err)
	}
	// Field names fixed by the rank --json contract.
	for _, k := range []string{"formula", "dbe", "isomers_total", "scored", "complete", "candidates", "warnings"} {
		if _, ok := m[k]; !ok {
			t.Errorf("result JSON lacks %q", k)
		}
	}
	c := m["candidates"].([]any)[0].(map[string]any)
	for _, k := range []string{"rank", "smiles", "score", "probability", "assignments", "unexplained_peaks", "unobserved_environments"} {
		if _, ok := c[k]; !ok {
			t.Errorf("candidate JSON lacks %q", k)
		}
	}
	a := c["assignments"].([]any)[0].(map[string]any)
	for _, k := range []string{"peak", "observed_shift", "predicted_shift", "environments", "atoms", "breakdown",
		"observed_multiplicity", "predicted_multiplicity", "multiplicity_reason", "expected_h", "observed_h", "score_share"} {
		if _, ok := a[k]; !ok {
			t.Errorf("assignment JSON lacks %q", k)
		}
	}
}

func TestRankFragmentConstraints(t *testing.T) {
	pl := mustPeaks(t, ethylAcetate)
	all, err := New(Options{}).Rank(context.Background(), Request{Formula: "C4H8O2", Peaks: pl, TopK: 3, Unconstrained: true}, nil)
	if err != nil {
		t.Fatal(err)
	}
	// Esters only: an O–C(=O) fragment (a substructure query).
	res, err := New(Options{}).Rank(context.Background(), Request{Formula: "C4H8O2", Peaks: pl, TopK: 50, Require: []string{"OC=O"}, Forbid: []string{"[OH]"}, Unconstrained: true}, nil)
	if err != nil {
		t.Fatal(err)
	}
	if !(res.Scored > 0 && res.Scored < all.Scored) {
		t.Fatalf("scored %d with constraints, %d without", res.Scored, all.Scored)
	}
	if !strings.Contains(res.Prior, "fragment constraints") {
		t.Errorf("prior %q does not mention the constraints", res.Prior)
	}
	req := molecule.MustParseFragment("OC=O")
	oh := molecule.MustParseFragment("[OH]")
	for _, c := range res.Candidates {
		g := molecule.MustParseSMILES(c.SMILES)
		if !req.Matches(g) || oh.Matches(g) {
			t.Errorf("%s violates the constraints", c.SMILES)
		}
	}
	if res.Candidates[0].SMILES != canonical(t, "CCOC(C)=O") {
		t.Errorf("first %s, want ethyl acetate", res.Candidates[0].SMILES)
	}
	// Probabilities renormalise over the smaller set.
	if !(res.Candidates[0].Probability >= all.Candidates[0].Probability) {
		t.Errorf("constrained probability %.6f below unconstrained %.6f", res.Candidates[0].Probability, all.Candidates[0].Probability)
	}
}

// TestRankProgressEstimatesTotal checks that the first progress report,
// made before the search starts, carries the size of the search estimated
// by random probes of its tree (isomers.Estimate), and that the estimate
// agrees with what the search then found: within a factor of two of the
// final isomer count over all isomers (a consistency check; the counts
// themselves are checked against published values in isomers), and equal
// to the search report's estimate for a constrained search. The report is
// made synchronously, so the test does not depend on timing.
func TestRankProgressEstimatesTotal(t *testing.T) {
	for _, tc := range []struct {
		name string
		req  Request
	}{
		{"all isomers", Request{Formula: "C9H18O2", Peaks: mustPeaks(t, "4.05 (t, J = 6.7 Hz, 2H), 2.29 (t, J = 7.5 Hz, 2H), 1.62 (m, 4H), 1.30 (m, 4H), 0.90 (t, J = 7.0 Hz, 6H)"), TopK: 1, Unconstrained: true}},
		{"constrained", Request{Formula: "C9H18O2", Peaks: mustPeaks(t, "4.05 (t, J = 6.7 Hz, 2H), 2.29 (t, J = 7.5 Hz, 2H), 1.62 (m, 4H), 1.30 (m, 4H), 0.90 (t, J = 7.0 Hz, 6H)"), TopK: 1}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var first *Progress
			res, err := New(Options{ProgressInterval: time.Hour}).Rank(context.Background(), tc.req, func(p Progress) {
				if first == nil {
					first = &p
				}
			})
			require.NoError(t, err)
			require.True(t, res.Complete, "C9H18O2 ranking incomplete: %v", res.Warnings)
			require.NotNil(t, first, "no progress report")
			assert.Zero(t, first.Scored, "the first report comes before scoring")
			assert.Positive(t, first.TotalEstimate, "the first report carries no size estimate")
			assert.Equal(t, res.Search.EstimatedStructures, first.TotalEstimate, "first report against the search report")
			if !tc.req.Unconstrained {
				return
			}
			ratio := float64(first.TotalEstimate) / float64(res.IsomersTotal)
			assert.True(t, ratio > 0.5 && ratio < 2, "estimated %d isomers before the run, %d found", first.TotalEstimate, res.IsomersTotal)
		})
	}
}

// TestRankGeminalMethylsTwoSignals ranks unknowns whose two methyls on one
// atom give two signals (cis and trans on an alkene carbon, or
// diastereotopic in a chiral molecule) over the whole isomer space: the
// true structure must come first, which needs the 6H environment to be
// allowed onto two 3H peaks.
func TestRankGeminalMethylsTwoSignals(t *testing.T) {
	for _, tc := range []struct {
		name, formula, peaks, want, source string
	}{
		{"prenol", "C5H10O", "5.41 (t, J = 7.0 Hz, 1H), 4.14 (d, J = 7.0 Hz, 2H), 1.74 (s, 3H), 1.68 (s, 3H), 1.45 (br s, 1H)",
			"CC(C)=CCO", "3-methylbut-2-en-1-ol in CDCl3; Pretsch, Bühlmann, Badertscher, Structure Determination of Organic Compounds, from memory"},
		{"mesityl oxide", "C6H10O", "6.08 (s, 1H), 2.16 (s, 3H), 2.14 (s, 3H), 1.89 (s, 3H)",
			"CC(C)=CC(C)=O", "4-methylpent-3-en-2-one in CDCl3; Silverstein, Webster, Kiemle, Spectrometric Identification of Organic Compounds, from memory"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			res, err := New(Options{}).Rank(context.Background(), Request{Formula: tc.formula, Peaks: mustPeaks(t, tc.peaks), TopK: 3, Unconstrained: true}, nil)
			require.NoError(t, err)
			require.NotEmpty(t, res.Candidates)
			assert.Equal(t, tc.want, res.Candidates[0].SMILES, "source: %s", tc.source)
		})
	}
}

// TestRankSlowExchangeCoupling: an amide N–CH2 reported as a doublet
// (coupled to the N–H, as secondary amides show in CDCl3) is compatible
// with the amide, so the amide ranks first.
func TestRankSlowExchangeCoupling(t *testing.T) {
	// N-benzylacetamide in CDCl3: 7.36–7.24 (m, 5H), 5.85 (br s, NH),
	// 4.42 (d, J = 5.7 Hz, 2H), 2.02 (s, 3H); Pretsch, Bühlmann,
	// Badertscher, Structure Determination of Organic Compounds, from memory.
	res, err := New(Options{}).Rank(context.Background(), Request{Formula: "C9H11NO", TopK: 3,
		Peaks: mustPeaks(t, "7.36–7.24 (m, 5H), 5.85 (br s, 1H), 4.42 (d, J = 5.7 Hz, 2H), 2.02 (s, 3H)")}, nil)
	require.NoError(t, err)
	require.NotEmpty(t, res.Candidates)
	assert.Equal(t, "CC(=O)NCc1ccccc1", res.Candidates[0].SMILES)
}

// TestRankCancelKeepsBestSoFar: a ranking cancelled while it searches
// hands back what it scored so far, marked as stopped early by the
// cancel, together with the cancel error.
func TestRankCancelKeepsBestSoFar(t *testing.T) {
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	r := New(Options{ProgressInterval: time.Millisecond})
	res, err := r.Rank(ctx, Request{Formula: "C8H8O2", Peaks: mustPeaks(t, "7.35 (m, 5H), 5.10 (s, 2H), 2.09 (s, 1H)"), Unconstrained: true, TopK: 3},
		func(p Progress) {
			if p.Scored > 0 {
				cancel()
			}
		})
	require.ErrorIs(t, err, context.Canceled)
	require.NotNil(t, res, "a cancelled ranking keeps its best candidates")
	assert.False(t, res.Complete)
	assert.Equal(t, StatusStopped, res.Search.Status)
	assert.Equal(t, "cancelled on request", res.Search.StopReason)
	assert.NotEmpty(t, res.Candidates)
}
