package ranker

import (
	"context"
	"math"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"shiftrank/molecule"
	"shiftrank/predict"
	"shiftrank/spectrum"
)

// carbonJob returns a job holding only the 13C list text (journal
// notation).
func carbonJob(t testing.TB, list string) *job {
	t.Helper()
	pl, err := spectrum.ReadList([]byte(list), spectrum.C13)
	require.NoError(t, err, "ReadList(%q)", list)
	j := &job{}
	j.prepareCarbon(pl)
	return j
}

// carbonScoreOf returns the 13C log-likelihood of smiles against the
// job's 13C list under the default model.
func carbonScoreOf(t testing.TB, j *job, smiles string) float64 {
	t.Helper()
	g := molecule.MustParseSMILES(smiles)
	sp, err := predict.New(predict.Options{}).Carbon(g)
	require.NoError(t, err, "Carbon(%s)", smiles)
	s, a := newCarbonScorer(DefaultCarbonModel()).score(toCarbons(sp, nil), j.cobs)
	require.True(t, a.proven, "assignment of %s not proven optimal", smiles)
	return s
}

// TestCarbonScoreTellsIsomersApart: with the published 13C list of the
// true compound, its structure scores clearly better than a named isomer
// whose 1H spectrum is alike in kind (both with methyl singlets or the
// same spin systems) but whose carbons differ.
func TestCarbonScoreTellsIsomersApart(t *testing.T) {
	tests := []struct {
		name         string
		list         string // observed 13C list of the true compound
		truth, wrong string
		source       string
	}{
		{"2-butanone, not butanal", "13C NMR (CDCl3) δ 209.3, 36.9, 29.4, 7.9", "CCC(C)=O", "CCCC=O",
			"Pretsch, Bühlmann, Badertscher, Structure Determination of Organic Compounds, 13C tables (from memory; predict/testdata/carbon_validation.json)"},
		{"butanal, not 2-butanone", "13C NMR (CDCl3) δ 202.8, 45.8, 15.7, 13.7", "CCCC=O", "CCC(C)=O",
			"Silverstein, Webster, Kiemle, Spectrometric Identification of Organic Compounds, 13C appendix (from memory; predict/testdata/carbon_validation.json)"},
		{"methyl benzoate, not phenyl acetate", "13C NMR (CDCl3) δ 167.1, 132.9, 130.2, 129.6 (2C), 128.4 (2C), 52.0", "COC(=O)c1ccccc1", "CC(=O)Oc1ccccc1",
			"Pretsch et al., 13C tables (from memory; predict/testdata/carbon_validation.json)"},
		{"ethyl benzoate, not benzyl acetate", "13C NMR (101 MHz, CDCl3) δ 166.6, 132.8, 130.5, 129.5 (2C), 128.3 (2C), 60.9, 14.3", "CCOC(=O)c1ccccc1", "CC(=O)OCc1ccccc1",
			"testdata/realsize.json, ethyl benzoate (handbook reference data, from memory)"},
		{"benzyl acetate, not ethyl benzoate", "13C NMR (101 MHz, CDCl3) δ 170.9, 136.0, 128.6 (2C), 128.3, 128.2 (2C), 66.3, 21.0", "CC(=O)OCc1ccccc1", "CCOC(=O)c1ccccc1",
			"testdata/realsize.json, benzyl acetate (handbook reference data, from memory)"},
		{"phenylacetic acid, not p-toluic acid", "13C NMR (101 MHz, CDCl3) δ 178.0, 133.2, 129.3 (2C), 128.6 (2C), 127.3, 41.0", "O=C(O)Cc1ccccc1", "Cc1ccc(C(=O)O)cc1",
			"testdata/realsize.json, phenylacetic acid (handbook reference data, from memory)"},
		{"4-acetylpyridine, not 3-acetylpyridine", "13C NMR (101 MHz, CDCl3) δ 197.6, 151.0 (2C), 142.7, 121.3 (2C), 26.7", "CC(=O)c1ccncc1", "CC(=O)c1cccnc1",
			"testdata/realsize.json, 4-acetylpyridine (handbook reference data, from memory)"},
		{"4-methoxyacetophenone, not methyl p-toluate", "13C NMR (101 MHz, CDCl3) δ 196.8, 163.5, 130.6 (2C), 130.3, 113.7 (2C), 55.5, 26.3", "COc1ccc(C(C)=O)cc1", "COC(=O)c1ccc(C)cc1",
			"testdata/realsize.json, 4-methoxyacetophenone (handbook reference data, from memory)"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			j := carbonJob(t, tc.list)
			right, wrong := carbonScoreOf(t, j, tc.truth), carbonScoreOf(t, j, tc.wrong)
			assert.Greater(t, right-wrong, 3.0, "13C score(%s) = %.2f, score(%s) = %.2f: want the true structure ahead by more than 3 nats (source: %s)",
				tc.truth, right, tc.wrong, wrong, tc.source)
		})
	}
}

// TestCarbonScoreDEPT: DEPT classes on the observed peaks cost nothing
// when they agree with the structure and widen the gap to a wrong isomer
// whose carbons carry other hydrogen counts. Ethyl acetate in CDCl3:
// 171.4 (C), 60.5 (CH2), 21.0 (CH3), 14.2 (CH3) (Gottlieb, Kotlyar,
// Nudelman, J. Org. Chem. 1997, 62, 7512; from memory); the classes are
// those of the structure (common practice).
func TestCarbonScoreDEPT(t *testing.T) {
	plain := carbonJob(t, "13C NMR (CDCl3) δ 171.4, 60.5, 21.0, 14.2")
	dept := carbonJob(t, "13C NMR (CDCl3) δ 171.4 (C), 60.5 (CH2), 21.0 (CH3), 14.2 (CH3)")
	const truth, wrong = "CCOC(C)=O", "CCC(=O)OC" // ethyl acetate, methyl propanoate
	assert.InDelta(t, carbonScoreOf(t, plain, truth), carbonScoreOf(t, dept, truth), 1e-9,
		"matching DEPT classes must cost nothing")
	gapPlain := carbonScoreOf(t, plain, truth) - carbonScoreOf(t, plain, wrong)
	gapDEPT := carbonScoreOf(t, dept, truth) - carbonScoreOf(t, dept, wrong)
	assert.Greater(t, gapDEPT, gapPlain+2, "DEPT should widen the gap to methyl propanoate (%.2f without, %.2f with)", gapPlain, gapDEPT)

	// One signal on a peak of another class pays the mismatch.
	sc := newCarbonScorer(DefaultCarbonModel())
	ch3 := predCarbon{n: 1, class: predict.CH3, shift: 21.0, sigma: 1.5}
	p := obsCarbon{shift: 21.0, lo: 21.0, hi: 21.0, dept: spectrum.CH3}
	q := p
	q.dept = spectrum.CH2
	assert.InDelta(t, DefaultCarbonModel().DEPTMismatch, sc.deptLogP(&ch3, &p)-sc.deptLogP(&ch3, &q), 1e-12)
}

// TestCarbonScoreMissingLines: a list missing a quaternary carbon (weak
// lines, often not reported; common practice) costs the true structure
// less than one missing a CH, and an extra line costs more than either.
// (Scores of different lists are compared here only because the lines
// removed are matched equally well; a ranking compares candidates on one
// list.)
// Ethyl benzoate in CDCl3 (testdata/realsize.json, from memory): 166.6
// (C=O), 132.8 (para CH), 130.5 (ipso C), 129.5 (2C), 128.3 (2C), 60.9,
// 14.3.
func TestCarbonScoreMissingLines(t *testing.T) {
	const smi = "CCOC(=O)c1ccccc1"
	full := carbonScoreOf(t, carbonJob(t, "13C NMR (CDCl3) δ 166.6, 132.8, 130.5, 129.5 (2C), 128.3 (2C), 60.9, 14.3"), smi)
	noCq := carbonScoreOf(t, carbonJob(t, "13C NMR (CDCl3) δ 166.6, 132.8, 129.5 (2C), 128.3 (2C), 60.9, 14.3"), smi)
	noCH := carbonScoreOf(t, carbonJob(t, "13C NMR (CDCl3) δ 166.6, 130.5, 129.5 (2C), 128.3 (2C), 60.9, 14.3"), smi)
	extra := carbonScoreOf(t, carbonJob(t, "13C NMR (CDCl3) δ 166.6, 132.8, 130.5, 129.5 (2C), 128.3 (2C), 60.9, 38.0, 14.3"), smi)
	assert.Greater(t, noCq, noCH, "missing ipso C (%.2f) should cost less than missing para CH (%.2f)", noCq, noCH)
	assert.Less(t, extra-full, noCH-full, "an extra line (%.2f) should cost more than a missing CH (%.2f)", extra-full, noCH-full)
}

// TestCarbonScoreCounts: "(2C)" peaks take a signal of two equivalent
// carbons, or two coinciding signals, at no overlap cost; a peak without
// a count in a counted list takes one carbon.
func TestCarbonScoreCounts(t *testing.T) {
	sc := newCarbonScorer(DefaultCarbonModel())
	two := obsCarbon{shift: 128.0, lo: 128.0, hi: 128.0, count: 2}
	one := obsCarbon{shift: 128.0, lo: 128.0, hi: 128.0, count: 1}
	unknown := obsCarbon{shift: 128.0, lo: 128.0, hi: 128.0}
	pair := []predCarbon{{n: 1, class: predict.CH, shift: 128.0, sigma: 1.5}, {n: 1, class: predict.CH, shift: 128.0, sigma: 1.5}}
	sym := []predCarbon{{n: 2, class: predict.CH, shift: 128.0, sigma: 1.5}}
	s2pair, a := sc.score(pair, []obsCarbon{two})
	assert.Equal(t, []int{0, 0}, a.first[:2], "both signals on the (2C) peak")
	s2sym, _ := sc.score(sym, []obsCarbon{two})
	assert.InDelta(t, s2sym, s2pair-sc.shiftLogP(&pair[1], &two), 1e-9, "the second signal on a (2C) peak adds only its shift term")
	s1sym, _ := sc.score(sym, []obsCarbon{one})
	assert.InDelta(t, DefaultCarbonModel().CountPerCarbon, s2sym-s1sym, 1e-9, "two carbons on a (1C) peak")
	sU, _ := sc.score(sym, []obsCarbon{unknown})
	assert.InDelta(t, s2sym, sU, 1e-9, "no count given: not scored")

	j := carbonJob(t, "13C NMR δ 130.0 (2C), 128.0")
	assert.Equal(t, []int{2, 1}, []int{j.cobs[0].count, j.cobs[1].count}, "an uncounted peak in a counted list is one carbon")
	j = carbonJob(t, "13C NMR δ 130.0, 128.0")
	assert.Equal(t, []int{0, 0}, []int{j.cobs[0].count, j.cobs[1].count}, "no counts in the list: unknown")
}

// TestCarbonExplanationSums: the per-peak shares of the 13C explanation
// add up to CarbonScore, and the candidate's Score is the 1H score plus
// CarbonScore.
func TestCarbonExplanationSums(t *testing.T) {
	r := New(Options{Workers: 1})
	req := Request{Formula: "C4H8O2", Peaks: mustPeaks(t, ethylAcetate), Carbon: carbonList(t), TopK: 3}
	j, err := r.prepare(req)
	require.NoError(t, err)
	for _, smi := range []string{"CCOC(C)=O", "CCC(=O)OC", "CCCC(=O)O"} {
		c, err := r.explainOne(j, molecule.MustParseSMILES(smi), smi)
		require.NoError(t, err)
		sum := 0.0
		for _, a := range c.CarbonAssignments {
			sum += a.ScoreShare
			assert.InDelta(t, a.ScoreShare, a.Terms.Shift+a.Terms.DEPT+a.Terms.Count+a.Terms.Overlap, 1e-9)
			assert.NotEmpty(t, a.Reason)
		}
		for _, u := range c.UnexplainedCarbonPeaks {
			sum += u.ScoreShare
		}
		for _, u := range c.UnobservedCarbons {
			sum += u.ScoreShare
		}
		assert.InDelta(t, c.CarbonScore, sum, 1e-9, "%s: 13C shares", smi)
		h := 0.0
		for _, a := range c.Assignments {
			h += a.ScoreShare
		}
		for _, u := range c.UnexplainedPeaks {
			h += u.ScoreShare
		}
		for _, u := range c.UnobservedEnvironments {
			h += u.ScoreShare
		}
		assert.InDelta(t, c.Score, h+c.CarbonScore, 1e-9, "%s: Score = 1H + 13C", smi)
		assert.Equal(t, len(j.cobs), len(c.CarbonAssignments)+len(c.UnexplainedCarbonPeaks), "%s: every 13C peak explained or not", smi)
	}
}

// TestRankCarbonListScored: a 13C list given with the 1H list is scored:
// the true structure stays first, its score gains the 13C part, and the
// result lists the 13C peaks without the old "not used" warning.
func TestRankCarbonListScored(t *testing.T) {
	r := New(Options{Workers: 1})
	req := Request{Formula: "C4H8O2", Peaks: mustPeaks(t, ethylAcetate), TopK: 3}
	without, err := r.Rank(context.Background(), req, nil)
	require.NoError(t, err)
	req.Carbon = carbonList(t)
	with, err := r.Rank(context.Background(), req, nil)
	require.NoError(t, err)
	want := canonical(t, "CCOC(C)=O")
	require.NotEmpty(t, with.Candidates)
	require.Equal(t, want, with.Candidates[0].SMILES, "ethyl acetate first with its 13C list")
	require.Equal(t, want, without.Candidates[0].SMILES)
	top := with.Candidates[0]
	assert.InDelta(t, without.Candidates[0].Score+top.CarbonScore, top.Score, 1e-9, "Score = 1H + 13C")
	assert.Len(t, top.CarbonAssignments, 4, "each 13C line of ethyl acetate has its carbon")
	assert.Empty(t, top.UnexplainedCarbonPeaks)
	assert.Empty(t, top.UnobservedCarbons)
	assert.Len(t, with.CarbonPeaks, 4)
	for _, w := range with.Warnings {
		assert.NotContains(t, w, "not used in scoring")
	}
	total := 0.0
	for _, c := range with.Candidates {
		total += c.Probability
	}
	assert.LessOrEqual(t, total, 1+1e-9)
	assert.False(t, math.IsNaN(total))
	if len(with.Candidates) > 1 {
		assert.True(t, strings.Contains(with.Candidates[0].Summary, "13C") || strings.Contains(with.Candidates[0].Summary, "peak"),
			"summary should name the peaks that decide: %s", with.Candidates[0].Summary)
	}
}

func TestRankCarbonWithoutCarbonInFormula(t *testing.T) {
	_, err := New(Options{Workers: 1}).Rank(context.Background(), Request{Formula: "H2O", Peaks: mustPeaks(t, "1H NMR δ 1.56 (s, 2H)"), Carbon: carbonList(t)}, nil)
	var re *RequestError
	require.ErrorAs(t, err, &re)
	assert.Equal(t, "carbon", re.Field)
}

// TestCarbonScoreIndependentOfSpelling: a candidate's joint score does
// not depend on the atom order or Kekulé form of its graph (the ranking
// scores generated graphs and explains re-parsed canonical SMILES; the
// benchmark finds the true structure by its score). 2-naphthol in CDCl3
// (testdata/realsize.json, from memory).
func TestCarbonScoreIndependentOfSpelling(t *testing.T) {
	const h1 = "1H NMR (400 MHz, CDCl3) δ 7.80–7.74 (m, 2H), 7.68 (d, J = 8.2 Hz, 1H), 7.44 (ddd, J = 8.2, 6.9, 1.2 Hz, 1H), 7.34 (ddd, J = 8.1, 6.9, 1.2 Hz, 1H), 7.14 (d, J = 2.5 Hz, 1H), 7.11 (dd, J = 8.8, 2.5 Hz, 1H), 5.01 (br s, 1H)"
	c13, err := spectrum.ReadList([]byte("13C NMR (101 MHz, CDCl3) δ 153.3, 134.6, 129.9, 128.9, 127.8, 126.6, 126.4, 123.7, 117.7, 109.6"), spectrum.C13)
	require.NoError(t, err)
	r := New(Options{Workers: 1})
	j, err := r.prepare(Request{Formula: "C10H8O", Peaks: mustPeaks(t, h1), Carbon: c13})
	require.NoError(t, err)
	var scores []float64
	for _, smi := range []string{"Oc1ccc2ccccc2c1", "OC1=CC2=CC=CC=C2C=C1", "OC1=CC=C2C=CC=CC2=C1", canonical(t, "Oc1ccc2ccccc2c1")} {
		c, err := r.explainOne(j, molecule.MustParseSMILES(smi), smi)
		require.NoError(t, err)
		scores = append(scores, c.Score)
	}
	for i := 1; i < len(scores); i++ {
		assert.InDelta(t, scores[0], scores[i], 1e-9, "spelling %d scores %.6f, spelling 0 %.6f", i, scores[i], scores[0])
	}
}

// TestRankCarbonTemperature: with a 13C list the probabilities use the
// joint temperature (CarbonModel.Temperature), without one Model's.
func TestRankCarbonTemperature(t *testing.T) {
	r := New(Options{Workers: 1})
	req := Request{Formula: "C4H8O2", Peaks: mustPeaks(t, ethylAcetate), TopK: 3, Unconstrained: true}
	ratio := func(res *Result) (got, scoreGap float64) {
		require.GreaterOrEqual(t, len(res.Candidates), 2)
		a, b := res.Candidates[0], res.Candidates[1]
		return math.Log(a.Probability / b.Probability), a.Score - b.Score
	}
	res, err := r.Rank(context.Background(), req, nil)
	require.NoError(t, err)
	got, gap := ratio(res)
	assert.InDelta(t, gap/DefaultModel().Temperature, got, 1e-6, "1H only: log p1/p2 = gap / Model.Temperature")
	req.Carbon = carbonList(t)
	res, err = r.Rank(context.Background(), req, nil)
	require.NoError(t, err)
	got, gap = ratio(res)
	assert.InDelta(t, gap/DefaultCarbonModel().Temperature, got, 1e-6, "1H + 13C: log p1/p2 = gap / CarbonModel.Temperature")
}

// TestCarbonScoreDiastereotopicPair: a diastereotopic pair of carbons may
// take one line of two carbons or two lines, each reading weighted by its
// probability (CarbonModel.DiastereotopicSplit) so neither is free. The
// isopropyl methyls of valine: 19.0 and 17.8 ppm (Pretsch, from memory).
func TestCarbonScoreDiastereotopicPair(t *testing.T) {
	m := DefaultCarbonModel()
	sc := newCarbonScorer(m)
	dia := []predCarbon{{n: 2, class: predict.CH3, shift: 18.4, sigma: 1.5, dia: true}}
	plain := []predCarbon{{n: 2, class: predict.CH3, shift: 18.4, sigma: 1.5}}
	lines := []obsCarbon{{shift: 19.0, lo: 19.0, hi: 19.0}, {shift: 17.8, lo: 17.8, hi: 17.8}}
	one := []obsCarbon{{shift: 18.4, lo: 18.4, hi: 18.4, count: 2}}

	s, a := sc.score(dia, lines)
	require.True(t, a.proven)
	assert.ElementsMatch(t, []int{0, 1}, []int{a.first[0], a.second[0]}, "the pair takes both lines")
	want := math.Log(m.DiastereotopicSplit) + sc.halfShiftLogP(&dia[0], &lines[0]) + sc.halfShiftLogP(&dia[0], &lines[1])
	assert.InDelta(t, want, s, 1e-9, "two lines: log q + one shift term per line")
	sPlain, _ := sc.score(plain, lines)
	assert.Greater(t, s, sPlain, "a pair flagged diastereotopic explains two lines better than an equivalent pair")

	s1, a1 := sc.score(dia, one)
	assert.Equal(t, -1, a1.second[0], "one line of two carbons: not split")
	s1Plain, _ := sc.score(plain, one)
	assert.InDelta(t, math.Log1p(-m.DiastereotopicSplit), s1-s1Plain, 1e-9, "one line costs log(1 − q) against an equivalent pair")

	// Two lines too far apart for a pair are not taken as one.
	far := []obsCarbon{{shift: 28.0, lo: 28.0, hi: 28.0}, {shift: 17.8, lo: 17.8, hi: 17.8}}
	_, af := sc.score(dia, far)
	assert.Equal(t, -1, af.second[0], "lines %.1f ppm apart exceed DiastereotopicGap", far[0].shift-far[1].shift)
}

// TestCarbonExplanationSumsDiastereotopic: the explanation of a split
// pair (valine, each methyl on its own line) adds up to CarbonScore and
// puts one carbon on each line. Valine in D2O: 174.9, 61.1, 29.9, 18.9,
// 17.6 (SDBS-type reference values, from memory; the 1H list is that of
// the same compound, from memory).
func TestCarbonExplanationSumsDiastereotopic(t *testing.T) {
	const h1 = "1H NMR (400 MHz, D2O) δ 3.60 (d, J = 4.4 Hz, 1H), 2.27 (m, 1H), 1.04 (d, J = 7.0 Hz, 3H), 0.98 (d, J = 7.0 Hz, 3H)"
	c13, err := spectrum.ReadList([]byte("13C NMR (101 MHz, D2O) δ 174.9, 61.1, 29.9, 18.9, 17.6"), spectrum.C13)
	require.NoError(t, err)
	r := New(Options{Workers: 1})
	j, err := r.prepare(Request{Formula: "C5H11NO2", Peaks: mustPeaks(t, h1), Carbon: c13})
	require.NoError(t, err)
	const smi = "CC(C)C(N)C(=O)O"
	c, err := r.explainOne(j, molecule.MustParseSMILES(smi), smi)
	require.NoError(t, err)
	sum := 0.0
	split := 0
	for _, a := range c.CarbonAssignments {
		sum += a.ScoreShare
		assert.InDelta(t, a.ScoreShare, a.Terms.Shift+a.Terms.DEPT+a.Terms.Count+a.Terms.Overlap, 1e-9)
		if strings.Contains(a.Reason, "two lines") {
			split++
			assert.Equal(t, 1, a.Carbons, "one methyl on each line: %+v", a)
		}
	}
	for _, u := range c.UnexplainedCarbonPeaks {
		sum += u.ScoreShare
	}
	for _, u := range c.UnobservedCarbons {
		sum += u.ScoreShare
	}
	assert.InDelta(t, c.CarbonScore, sum, 1e-9, "13C shares")
	assert.Equal(t, 2, split, "the methyl pair on two lines")
	assert.Empty(t, c.UnexplainedCarbonPeaks)
}
