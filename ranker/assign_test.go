package ranker

import (
	"github.com/stretchr/testify/require"
	"math"
	"math/rand/v2"
	"testing"
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

func TestSolveMatchesBruteForce(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	var s solver
	for trial := 0; trial < 400; trial++ {
		nEnv := 1 + r.IntN(6)
		nPeak := 1 + r.IntN(5)
		p := randomProblem(r, nEnv, nPeak)
		got := s.solve(p)
		want := bruteForce(p)
		if math.Abs(got.cost-want) > 1e-9 {
			t.Fatalf("trial %d (%d envs, %d peaks): branch and bound cost %.12f, brute force %.12f", trial, nEnv, nPeak, got.cost, want)
		}
		if c := p.evaluate(got.first, got.second); math.Abs(c-got.cost) > 1e-9 {
			t.Fatalf("trial %d: reported cost %.12f but the assignment costs %.12f", trial, got.cost, c)
		}
	}
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
