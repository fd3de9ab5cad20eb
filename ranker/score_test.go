package ranker

import (
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"shiftrank/spectrum"
)

func TestStudentTDensity(t *testing.T) {
	// Student t density at 0 and the ratio f(1)/f(0); values of the
	// standard t distribution (Γ function identities, common practice):
	// f_6(0) = Γ(3.5)/(Γ(3)·√(6π)) = 0.38273, f_6(1)/f_6(0) = (7/6)^−3.5.
	if got, want := math.Exp(tConst(6)), 0.38273; math.Abs(got-want) > 5e-5 {
		t.Errorf("t_6(0) = %.5f, want %.5f", got, want)
	}
	if got, want := math.Exp(logTRel(1, 6)), math.Pow(7.0/6, -3.5); math.Abs(got-want) > 1e-12 {
		t.Errorf("t_6(1)/t_6(0) = %.6f, want %.6f", got, want)
	}
	// ν = 1 is the Cauchy density, f(0) = 1/π.
	if got, want := math.Exp(tConst(1)), 1/math.Pi; math.Abs(got-want) > 1e-12 {
		t.Errorf("t_1(0) = %.6f, want 1/π = %.6f", got, want)
	}
}

func TestMultiplicityTable(t *testing.T) {
	// The table's order, not its values, is the check: exact beats
	// compatible beats contradicting (common practice in reading spectra).
	p := func(obs, pred string) float64 {
		v, _ := multiplicityJudge(pat(obs), pat(pred), false, 0, 0)
		return v
	}
	tests := []struct {
		name          string
		better, worse [2]string // {observed, predicted}
	}{
		{"exact q beats q seen as t", [2]string{"q", "q"}, [2]string{"t", "q"}},
		{"dt seen as t (small J unresolved) beats dt seen as q+1 partners", [2]string{"t", "dt"}, [2]string{"quint", "dt"}},
		{"dd seen as t (equal J) beats s seen as t", [2]string{"t", "dd"}, [2]string{"t", "s"}},
		{"dt seen as m beats s seen as d", [2]string{"m", "dt"}, [2]string{"d", "s"}},
		{"exact sept beats sept seen as sext", [2]string{"sept", "sept"}, [2]string{"sext", "sept"}},
		{"singlet seen as s beats singlet seen as m", [2]string{"s", "s"}, [2]string{"m", "s"}},
		// Rotamer- or exchange-broadened multiplets are reported "br s"
		// (the N–CH2 of tertiary amides; common practice): compatible,
		// but less likely than a predicted singlet reported broad, and
		// more likely than a sharp singlet for a predicted quartet.
		{"singlet seen as br s beats q seen as br s", [2]string{"br s", "s"}, [2]string{"br s", "q"}},
		{"q seen as br s beats q seen as s", [2]string{"br s", "q"}, [2]string{"s", "q"}},
	}
	for _, tc := range tests {
		b, w := p(tc.better[0], tc.better[1]), p(tc.worse[0], tc.worse[1])
		if !(b > w) {
			t.Errorf("%s: P(%s|%s) = %.3f, P(%s|%s) = %.3f", tc.name, tc.better[0], tc.better[1], b, tc.worse[0], tc.worse[1], w)
		}
	}
	// Exchangeable H: a broad singlet is the most likely report.
	bs, _ := multiplicityJudge(pat("br s"), pat("br s"), true, 0, 0)
	tt, _ := multiplicityJudge(pat("t"), pat("br s"), true, 0, 0)
	if !(bs > tt) {
		t.Errorf("exchangeable: P(br s) = %.3f not above P(t) = %.3f", bs, tt)
	}
	// Not reported: no evidence either way.
	if v, _ := multiplicityJudge(pat(""), pat("q"), false, 0, 0); v != 1 {
		t.Errorf("unreported multiplicity: P = %v, want 1", v)
	}
}

// pat reads a multiplicity code for a test, as the scorer sees it.
func pat(code string) spectrum.Multiplicity {
	m, err := spectrum.ParseMultiplicity(code)
	if err != nil {
		panic(err)
	}
	return scoredPattern(m)
}

func TestScoredPattern(t *testing.T) {
	tests := []struct {
		code      string
		partners  int
		multiplet bool
	}{
		{"s", 0, false}, {"d", 1, false}, {"q", 3, false},
		{"quint", 4, false}, {"sext", 5, false}, {"sept", 6, false},
		{"dt", 3, false}, {"td", 3, false}, {"ddd", 3, false}, {"dddd", 4, false},
		{"qd", 4, false}, {"br s", 0, false}, {"m", 0, true},
		{"ddddd", 0, true}, {"br ddddd", 0, true},
	}
	for _, tc := range tests {
		p := pat(tc.code)
		assert.Equal(t, tc.multiplet, p.IsMultiplet(), "scoredPattern(%q) multiplet", tc.code)
		assert.Equal(t, tc.partners, p.Partners(), "scoredPattern(%q) partners (n+1 rule)", tc.code)
	}
	assert.True(t, pat("br ddddd").Broad(), "a broad pattern stays broad")
}

func TestLogSum(t *testing.T) {
	xs := []float64{-1000, -3, 2.5, -7, 0, 2.5, -1e6}
	var a, b logSum
	direct := 0.0
	for i, x := range xs {
		direct += math.Exp(x)
		if i%2 == 0 {
			a.add(x)
		} else {
			b.add(x)
		}
	}
	a.merge(b)
	if got, want := a.value(), math.Log(direct); math.Abs(got-want) > 1e-12 {
		t.Errorf("log-sum-exp = %.15f, want %.15f", got, want)
	}
	if a.n != int64(len(xs)) {
		t.Errorf("count %d, want %d", a.n, len(xs))
	}
}

// TestScoreEthylAcetatePattern scores hand-written environments shaped
// like ethyl acetate's against its published peaks (Gottlieb et al.,
// J. Org. Chem. 1997, 62, 7512: δ 4.12 q 2H, 2.05 s 3H, 1.26 t 3H; from
// memory) and checks that the assignment is the chemical one and that a
// swapped prediction scores worse.
func TestScoreEthylAcetatePattern(t *testing.T) {
	peaks := []obsPeak{
		{shift: 4.12, lo: 4.12, hi: 4.12, mult: pat("q"), j: []float64{7.1}, h: 2},
		{shift: 2.05, lo: 2.05, hi: 2.05, mult: pat("s"), h: 3},
		{shift: 1.26, lo: 1.26, hi: 1.26, mult: pat("t"), j: []float64{7.1}, h: 3},
	}
	env := func(h int, shift float64, mult string, j ...float64) predEnv {
		return predEnv{h: h, shift: shift, lo: shift, hi: shift, sigma: 0.15, mult: pat(mult), j: j}
	}
	right := []predEnv{env(3, 1.25, "t", 7.1), env(2, 4.10, "q", 7.1), env(3, 2.02, "s")}
	// Methyl propanoate's pattern: OCH3 s, CH2 q at 2.3, CH3 t.
	wrong := []predEnv{env(3, 3.67, "s"), env(2, 2.32, "q", 7.6), env(3, 1.13, "t", 7.6)}
	sc := newScorer(DefaultModel())
	sRight, a := sc.score(right, peaks)
	want := []int{2, 0, 1}
	for i, p := range want {
		if a.first[i] != p {
			t.Errorf("environment %d on peak %d, want %d", i, a.first[i], p)
		}
	}
	sWrong, _ := sc.score(wrong, peaks)
	if !(sRight > sWrong+3) {
		t.Errorf("score(right) = %.2f, score(wrong) = %.2f: want right ahead by more than 3 nats", sRight, sWrong)
	}
}

func TestScorePenalties(t *testing.T) {
	sc := newScorer(DefaultModel())
	oh := predEnv{h: 1, exchangeable: true}
	ch := predEnv{h: 1}
	if !(sc.unobservedLogP(&oh) > sc.unobservedLogP(&ch)+2) {
		t.Errorf("unobserved OH %.2f not much cheaper than unobserved CH %.2f (exchangeable H often missing in CDCl3; common practice)",
			sc.unobservedLogP(&oh), sc.unobservedLogP(&ch))
	}
	if !(sc.integrationLogP(2, 2.04) > sc.integrationLogP(3, 2.04)) {
		t.Error("integration: 2 H on a 2.04 H peak should beat 3 H")
	}
	if sc.unexplainedLogP(3) >= sc.unexplainedLogP(0.2) {
		t.Error("an unexplained 3 H peak should cost more than a 0.2 H one")
	}
}

// TestScoreDiastereotopicSplit: a CH2 next to a stereocentre whose two H
// appear as two 1 H peaks (common practice for diastereotopic protons)
// is explained by splitting it, not by leaving a peak unexplained.
func TestScoreDiastereotopicSplit(t *testing.T) {
	peaks := []obsPeak{
		{shift: 3.65, lo: 3.65, hi: 3.65, mult: pat("dd"), h: 1},
		{shift: 3.45, lo: 3.45, hi: 3.45, mult: pat("dd"), h: 1},
		{shift: 1.15, lo: 1.15, hi: 1.15, mult: pat("d"), h: 3},
	}
	envs := []predEnv{
		{h: 2, shift: 3.55, lo: 3.55, hi: 3.55, sigma: 0.15, mult: pat("m"), diastereotopic: true},
		{h: 3, shift: 1.15, lo: 1.15, hi: 1.15, sigma: 0.1, mult: pat("d")},
	}
	sc := newScorer(DefaultModel())
	_, a := sc.score(envs, peaks)
	if a.first[0] != 0 || a.second[0] != 1 {
		t.Errorf("CH2 on peaks %d,%d, want split over 0,1", a.first[0], a.second[0])
	}
	envs[0].diastereotopic = false
	s2, a2 := sc.score(envs, peaks)
	if a2.second[0] != -1 {
		t.Errorf("a CH2 not flagged diastereotopic was split (%d,%d)", a2.first[0], a2.second[0])
	}
	envs[0].diastereotopic = true
	s1, _ := sc.score(envs, peaks)
	if !(s1 > s2) {
		t.Errorf("split score %.2f not above unsplit %.2f", s1, s2)
	}
}

// TestMultiplicityMIsNeutral: an observed "m" must not prefer a candidate
// whose predicted pattern is vaguer ("m") over one with a precise coupled
// pattern ("dd"): both were not resolved in the observation.
func TestMultiplicityMIsNeutral(t *testing.T) {
	m := pat("m")
	a, _ := multiplicityJudge(m, pat("dd"), false, 0, 0)
	b, _ := multiplicityJudge(m, pat("m"), false, 0, 0)
	if a != b {
		t.Errorf("P(m | dd) = %.3f, P(m | m) = %.3f: want equal", a, b)
	}
	s, _ := multiplicityJudge(m, pat("s"), false, 0, 0)
	if !(s < a) {
		t.Errorf("P(m | s) = %.3f not below P(m | dd) = %.3f", s, a)
	}
}

// TestMultiplicityOptionalCouplings: splitting by N–H/O–H (slow exchange)
// or by a small allylic ⁴J is compatible, not a contradiction, but still
// less likely than the predicted pattern (common practice).
func TestMultiplicityOptionalCouplings(t *testing.T) {
	for _, tc := range []struct {
		name            string
		obs, pred       string
		slow, longRange int
		wantCompatible  bool
	}{
		{"amide NCH2 d from the NH", "d", "s", 1, 0, true},
		{"propenyl =CH dq", "dq", "d", 0, 3, true},
		{"two more partners than the NH gives", "t", "s", 1, 0, false},
		{"no optional partners", "d", "s", 0, 0, false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			p, why := multiplicityJudge(pat(tc.obs), pat(tc.pred), false, tc.slow, tc.longRange)
			exact, _ := multiplicityJudge(pat(tc.pred), pat(tc.pred), false, tc.slow, tc.longRange)
			assert.Less(t, p, exact, why)
			if tc.wantCompatible {
				assert.GreaterOrEqual(t, p, 0.1, why)
			} else {
				assert.Less(t, p, 0.03, why)
			}
		})
	}
	// The N–H itself reported as a triplet next to a CH2.
	p, why := multiplicityJudge(pat("br t"), pat("br s"), true, 2, 0)
	assert.Greater(t, p, pExchOther, why)
}

// TestSharedMissIsNotDiscounted: a peak reported over a range bounds the
// shift of every hydrogen in it. Two 1 H environments share coumarin's
// "7.55–7.46 (m, 2H)" (testdata/realsize.json names the source): one
// predicted inside the range, one 3 ppm away. The far one must cost
// clearly more than the ~7 nats the per-peak weight of ½ used to leave
// (the cost of a resolved 1 H peak missed by as much), while a miss within
// SharedMiss σ keeps its discount (errors that move both together).
func TestSharedMissIsNotDiscounted(t *testing.T) {
	peak := obsPeak{shift: 7.505, lo: 7.46, hi: 7.55, mult: pat("m"), h: 2}
	env := func(shift float64) predEnv {
		return predEnv{h: 1, shift: shift, lo: shift, hi: shift, sigma: 0.15, mult: pat("dd")}
	}
	sc := newScorer(DefaultModel())
	plain := DefaultModel()
	plain.SharedMiss = math.Inf(1)
	old := newScorer(plain)
	w := sc.weight(1, peak.h)
	require.InDelta(t, 0.5, w, 1e-12)

	far := env(4.50)
	cost := sc.pairCost(sc.pairTerms(&far, &peak), w)
	oldCost := old.pairCost(old.pairTerms(&far, &peak), w)
	assert.InDelta(t, 7.3, oldCost, 0.5, "the plain weighting: about 7 nats for a 3 ppm miss")
	assert.Greater(t, cost, 11.0, "a 3 ppm miss outside a reported range")
	// It costs what it would on a resolved 1 H peak of its own, up to the
	// discounted part within SharedMiss σ.
	alone := obsPeak{shift: 7.505, lo: 7.46, hi: 7.55, mult: pat("m"), h: 1}
	full := sc.pairCost(sc.pairTerms(&far, &alone), 1)
	assert.Less(t, cost, full, "still less than a peak of its own")
	assert.Greater(t, cost, full-3, "but not by more than the discounted part")

	near := env(7.75) // 0.2 ppm beyond the range: 1.3 σ
	assert.InDelta(t, old.pairCost(old.pairTerms(&near, &peak), w), sc.pairCost(sc.pairTerms(&near, &peak), w), 1e-12,
		"a miss within SharedMiss σ keeps the per-peak discount")
	inside := env(7.50)
	assert.InDelta(t, old.pairCost(old.pairTerms(&inside, &peak), w), sc.pairCost(sc.pairTerms(&inside, &peak), w), 1e-12,
		"inside the range: nothing beyond the prediction's own σ")
}
