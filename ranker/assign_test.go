package ranker

import (
	"math"
	"math/rand/v2"
	"os"
	"slices"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"shiftrank/molecule"
	"shiftrank/predict"
)

// bruteForce enumerates every assignment of p (each environment: unobserved,
// one peak, or — when split — two different peaks) and returns the least
// cost. It is the independent check of the branch and bound.
func bruteForce(p *assignProblem) float64 {
	first := make([]int, p.nEnv)
	second := make([]int, p.nEnv)
	best := math.Inf(1)
	var rec func(i int)
	rec = func(i int) {
		if i == p.nEnv {
			if c := p.evaluate(first, second); c < best {
				best = c
			}
			return
		}
		first[i], second[i] = -1, -1
		rec(i + 1)
		for j := 0; j < p.nPeak; j++ {
			first[i], second[i] = j, -1
			rec(i + 1)
			if p.split[i] && p.envH[i]%2 == 0 {
				for k := j + 1; k < p.nPeak; k++ {
					if !p.splitOK[j*p.nPeak+k] {
						continue
					}
					first[i], second[i] = j, k
					rec(i + 1)
				}
			}
		}
	}
	rec(0)
	return best
}

// randomProblem builds an instance shaped like a real one: environments of
// 1–3 H with shifts, peaks with implied H, shift-residual costs, a quadratic
// integration cost and penalties for unexplained peaks and unobserved
// environments.
func randomProblem(r *rand.Rand, nEnv, nPeak int) *assignProblem {
	p := &assignProblem{}
	envH := make([]int, nEnv)
	total := 0
	for i := range envH {
		envH[i] = 1 + r.IntN(3)
		total += envH[i]
	}
	p.reset(nEnv, nPeak, total)
	copy(p.envH, envH)
	envShift := make([]float64, nEnv)
	for i := range envShift {
		envShift[i] = r.Float64() * 10
		p.split[i] = envH[i] == 2 && r.IntN(3) == 0
		p.unobs[i] = 2 + r.Float64()*8
	}
	implied := make([]float64, nPeak)
	peakShift := make([]float64, nPeak)
	for j := range implied {
		implied[j] = 0.5 + r.Float64()*3
		peakShift[j] = r.Float64() * 10
	}
	for i := 0; i < nEnv; i++ {
		for j := 0; j < nPeak; j++ {
			d := (envShift[i] - peakShift[j]) / 0.4
			p.whole[i*nPeak+j] = math.Log1p(d * d / 5)
			p.half[i*nPeak+j] = 0.5*p.whole[i*nPeak+j] + r.Float64()
		}
	}
	for j := 0; j < nPeak; j++ {
		for k := 0; k < nPeak; k++ {
			p.splitOK[j*nPeak+k] = math.Abs(peakShift[j]-peakShift[k]) < 4
		}
	}
	w := total + 1
	for j := 0; j < nPeak; j++ {
		p.peak[j*w] = 3 + 2*implied[j]
		for l := 1; l <= total; l++ {
			d := float64(l) - implied[j]
			p.peak[j*w+l] = d * d / 0.3
		}
	}
	return p
}

// TestSolveMatchesBruteForce checks the branch and bound against brute
// force, once as it runs (shortcuts on) and once with every stage forced
// (full: both bounds tuned and both used in the search), and checks that
// both Lagrangian bounds stay below the true optimum.
func TestSolveMatchesBruteForce(t *testing.T) {
	for _, full := range []bool{false, true} {
		r := rand.New(rand.NewPCG(1, 2))
		s := solver{full: full}
		for trial := 0; trial < 400; trial++ {
			nEnv := 1 + r.IntN(6)
			nPeak := 1 + r.IntN(5)
			p := randomProblem(r, nEnv, nPeak)
			got := s.solve(p)
			want := bruteForce(p)
			require.InDelta(t, want, got.cost, 1e-9, "full=%v trial %d (%d envs, %d peaks): branch and bound vs brute force", full, trial, nEnv, nPeak)
			require.InDelta(t, got.cost, p.evaluate(got.first, got.second), 1e-9, "full=%v trial %d: reported cost vs the assignment's cost", full, trial)
			require.True(t, got.proven, "full=%v trial %d", full, trial)
			require.InDelta(t, got.cost, got.bound, 1e-9, "full=%v trial %d: a proven assignment's bound is its cost", full, trial)
			if full {
				require.LessOrEqual(t, s.rootLB, want+1e-9, "trial %d: peak-priced bound above the optimum", trial)
				require.LessOrEqual(t, s.muLB, want+1e-9, "trial %d: environment-priced bound above the optimum", trial)
			}
		}
	}
}

// TestSolveWideStates: with many peaks and heavy environments (a 6H
// doublet, two 3H methyls...) the search states no longer pack into 64
// bits and the hashed memo that keeps each state is used; the result must
// still match brute force.
func TestSolveWideStates(t *testing.T) {
	r := rand.New(rand.NewPCG(5, 6))
	for trial := 0; trial < 5; trial++ {
		p := randomProblem(r, 5, 13)
		// Heavier environments: rebuild with 3–6 H each.
		h := []int{3 + r.IntN(4), 3 + r.IntN(4), 3 + r.IntN(4), 3 + r.IntN(4), 3 + r.IntN(4)}
		q := &assignProblem{}
		total := 0
		for _, x := range h {
			total += x
		}
		q.reset(p.nEnv, p.nPeak, total)
		copy(q.envH, h)
		for i := range h {
			q.split[i] = p.split[i] && h[i]%2 == 0
		}
		copy(q.whole, p.whole)
		copy(q.half, p.half)
		copy(q.unobs, p.unobs)
		copy(q.splitOK, p.splitOK)
		w := total + 1
		for j := 0; j < q.nPeak; j++ {
			implied := float64(1 + r.IntN(6))
			q.peak[j*w] = 3 + 2*implied
			for l := 1; l <= total; l++ {
				d := float64(l) - implied
				q.peak[j*w+l] = d * d / 0.3
			}
		}
		for _, full := range []bool{false, true} {
			s := solver{full: full}
			got := s.solve(q)
			require.False(t, s.packable, "trial %d: the states should not pack (else this test shows nothing)", trial)
			require.InDelta(t, bruteForce(q), got.cost, 1e-9, "trial %d full=%v: branch and bound vs brute force", trial, full)
		}
	}
}

// TestMuBoundSeesWholeHydrogens: two 2 H environments that fit two 1 H
// peaks each, and must split over them. The peak-priced relaxation may
// place half of a whole CH2 on each peak at the cost of one; the
// environment-priced bound solves each peak over whole hydrogens and
// proves the split optimum at the root.
func TestMuBoundSeesWholeHydrogens(t *testing.T) {
	p := &assignProblem{}
	p.reset(2, 4, 4)
	copy(p.envH, []int{2, 2})
	m := 4
	for i := 0; i < 2; i++ {
		p.split[i] = true
		p.unobs[i] = 20
		for j := 0; j < m; j++ {
			// environment i fits peaks 2i and 2i+1
			c := 8.0
			if j/2 == i {
				c = 0.5
			}
			p.whole[i*m+j] = 1.5 * c // weight capped at 1.5 for 2 H on 1 H
			p.half[i*m+j] = c
		}
	}
	for j := 0; j < m; j++ {
		for k := 0; k < m; k++ {
			p.splitOK[j*m+k] = j != k
		}
	}
	w := 5
	for j := 0; j < m; j++ {
		p.peak[j*w] = 6
		for l := 1; l < w; l++ {
			d := float64(l - 1)
			p.peak[j*w+l] = d * d / (2 * 0.25 * 0.25)
		}
	}
	s := solver{full: true}
	a := s.solve(p)
	want := bruteForce(p)
	require.InDelta(t, want, a.cost, 1e-9)
	require.Equal(t, []int{0, 2}, a.first)
	require.Equal(t, []int{1, 3}, a.second)
	require.InDelta(t, want, s.muLB, 1e-6, "the environment-priced bound is tight here")
	require.Less(t, s.rootLB, want-0.1, "the peak-priced bound is not (else this test shows nothing)")
}

func TestSolveOverlapSplitAndUnobserved(t *testing.T) {
	// Three environments, two peaks. Env 0 (2 H, splittable) fits both
	// 1 H peaks; env 1 (1 H) fits nothing; env 2 (3 H) is far away.
	p := &assignProblem{}
	p.reset(3, 2, 6)
	copy(p.envH, []int{2, 1, 3})
	p.split[0] = true
	m := 2
	p.splitOK[0*m+1] = true
	p.whole[0*m+0], p.whole[0*m+1] = 0.1, 0.1
	p.half[0*m+0], p.half[0*m+1] = 0.05, 0.05
	p.whole[1*m+0], p.whole[1*m+1] = 50, 50
	p.whole[2*m+0], p.whole[2*m+1] = 50, 50
	p.unobs[0], p.unobs[1], p.unobs[2] = 20, 1, 30
	w := 7
	for j := 0; j < 2; j++ {
		p.peak[j*w] = 10
		for l := 1; l < w; l++ {
			d := float64(l - 1)
			p.peak[j*w+l] = 5 * d * d
		}
	}
	var s solver
	a := s.solve(p)
	if a.first[0] != 0 || a.second[0] != 1 {
		t.Errorf("split CH2: peaks %d,%d, want 0,1", a.first[0], a.second[0])
	}
	if a.first[1] != -1 {
		t.Errorf("env 1 on peak %d, want unobserved", a.first[1])
	}
	if a.first[2] != -1 {
		t.Errorf("env 2 on peak %d, want unobserved (cheaper than a 50 residual)", a.first[2])
	}
}

func BenchmarkSolve(b *testing.B) {
	r := rand.New(rand.NewPCG(3, 4))
	probs := make([]*assignProblem, 64)
	for i := range probs {
		probs[i] = randomProblem(r, 5+r.IntN(4), 4+r.IntN(3))
	}
	var s solver
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; b.Loop(); i++ {
		s.solve(probs[i%len(probs)])
	}
}

// TestImproveReachesLocalOptimum: the local search that polishes an
// unproven assignment starts from a poor incumbent (every environment on
// peak 0) and must end no worse than it began, at a point where no single
// move improves the cost, and never below the exact optimum.
func TestImproveReachesLocalOptimum(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	var s solver
	for trial := 0; trial < 200; trial++ {
		p := randomProblem(r, 2+r.IntN(5), 2+r.IntN(4))
		exact := s.solve(p).cost
		for i := range s.bestP1 {
			s.bestP1[i], s.bestP2[i] = 0, -1
		}
		start := p.evaluate(s.bestP1, s.bestP2)
		s.improve()
		got := p.evaluate(s.bestP1, s.bestP2)
		require.LessOrEqual(t, got, start+1e-9, "trial %d: local search made it worse", trial)
		require.GreaterOrEqual(t, got, exact-1e-9, "trial %d: below the exact optimum", trial)
		for d, i := range s.order {
			for _, o := range s.opts[d] {
				p1, p2 := s.bestP1[i], s.bestP2[i]
				s.bestP1[i], s.bestP2[i] = o.p1, o.p2
				c := p.evaluate(s.bestP1, s.bestP2)
				s.bestP1[i], s.bestP2[i] = p1, p2
				require.GreaterOrEqual(t, c, got-1e-9, "trial %d: a single move still improves", trial)
			}
		}
	}
}

// TestAssignLargePublishedSpectra scores true structures against published
// spectra of 10–21 peaks and requires the exact optimum: the search must
// finish (proven), and no peak may hold hydrogens far beyond its integral.
// Before the environment-priced bound, strychnine's 21 peaks ran the search
// out of nodes and the returned assignment put three CH2 halves (3 H) on
// its 2 H peak and left the 3.86 doublet unexplained, 11.5 nats above the
// optimum found now.
func TestAssignLargePublishedSpectra(t *testing.T) {
	for _, tc := range []struct {
		name, formula, smiles, peaks string
	}{
		{
			// Strychnine in CDCl3, the usual test compound of 2D NMR
			// teaching texts (H-4 8.09 d ... H-13 1.27 dt; H-17a/b
			// together at 1.90); values from memory.
			name: "strychnine", formula: "C21H22N2O2",
			smiles: "O=C7N2c1ccccc1[C@@]64[C@@H]2[C@@H]3[C@@H](OC/C=C5\\[C@@H]3C[C@@H]6N(CC4)C5)C7",
			peaks: "1H NMR (500 MHz, CDCl3) δ 8.09 (d, J = 7.9 Hz, 1H), 7.24 (td, J = 7.7, 1.2 Hz, 1H), 7.16 (d, J = 7.4 Hz, 1H), " +
				"7.09 (td, J = 7.5, 1.0 Hz, 1H), 5.90 (m, 1H), 4.28 (dt, J = 8.4, 3.3 Hz, 1H), 4.14 (dd, J = 13.8, 7.0 Hz, 1H), " +
				"4.06 (dd, J = 13.8, 5.8 Hz, 1H), 3.96 (m, 1H), 3.86 (d, J = 10.5 Hz, 1H), 3.71 (d, J = 14.8 Hz, 1H), 3.21 (m, 1H), " +
				"3.14 (m, 1H), 3.12 (dd, J = 17.4, 8.5 Hz, 1H), 2.87 (m, 1H), 2.73 (d, J = 14.8 Hz, 1H), 2.67 (dd, J = 17.4, 3.3 Hz, 1H), " +
				"2.35 (dt, J = 14.4, 4.3 Hz, 1H), 1.90 (m, 2H), 1.47 (dt, J = 14.4, 3.9 Hz, 1H), 1.27 (dt, J = 10.4, 3.2 Hz, 1H)",
		},
		{
			// (−)-Menthol, the real-size reference entry
			// (testdata/realsize.json names its source).
			name: "menthol", formula: "C10H20O", smiles: "CC(C)[C@@H]1CC[C@@H](C)C[C@H]1O",
			peaks: realsizePeaks(t, "menthol"),
		},
		{
			name: "linalool", formula: "C10H18O", smiles: "C=CC(C)(O)CCC=C(C)C",
			peaks: realsizePeaks(t, "linalool"),
		},
	} {
		t.Run(tc.name, func(t *testing.T) {
			r := New(Options{})
			j, err := r.prepare(Request{Formula: tc.formula, Peaks: mustPeaks(t, tc.peaks)})
			require.NoError(t, err)
			g, err := molecule.ParseSMILES(tc.smiles)
			require.NoError(t, err)
			sp, err := predict.New(predict.Options{MHz: j.mhz}).Predict(g)
			require.NoError(t, err)
			envs := toEnvs(sp, nil)
			sc := newScorer(r.model)
			_, a := sc.score(envs, j.obs)
			require.True(t, a.proven, "%s: %d environments on %d peaks: search ran out of nodes (cost %.2f, bound %.2f)",
				tc.name, len(envs), len(j.obs), a.cost, a.bound)
			require.InDelta(t, a.cost, a.bound, 1e-9)
			load := make([]int, len(j.obs))
			for i, e := range envs {
				switch {
				case a.first[i] < 0:
				case a.second[i] >= 0:
					load[a.first[i]] += e.h / 2
					load[a.second[i]] += e.h / 2
				default:
					load[a.first[i]] += e.h
				}
			}
			for k, p := range j.obs {
				require.LessOrEqual(t, float64(load[k]), p.h+1.01, "%s: peak %d (δ %.2f, %.1f H) holds %d H", tc.name, k+1, p.shift, p.h, load[k])
			}
			// No single move of one environment improves the optimum.
			first, second := slices.Clone(a.first), slices.Clone(a.second)
			p := &sc.prob
			for i := range envs {
				for _, o := range sc.solver.opts[slices.Index(sc.solver.order, i)] {
					f0, s0 := first[i], second[i]
					first[i], second[i] = o.p1, o.p2
					require.GreaterOrEqual(t, p.evaluate(first, second), a.cost-1e-9, "%s: moving environment %d improves the optimum", tc.name, i)
					first[i], second[i] = f0, s0
				}
			}
		})
	}
}

// realsizePeaks returns the 1H list of the compound of
// testdata/realsize.json whose name starts with name.
func realsizePeaks(t *testing.T, name string) string {
	t.Helper()
	data, err := os.ReadFile("../testdata/realsize.json")
	require.NoError(t, err)
	set, err := ParseReferenceSet(data)
	require.NoError(t, err)
	for _, c := range set.Compounds {
		if strings.HasPrefix(c.Name, name) {
			return c.Peaks
		}
	}
	t.Fatalf("no %q in testdata/realsize.json", name)
	return ""
}
