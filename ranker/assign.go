package ranker

import (
	"math"
	"slices"
)

// An assignProblem is the combinatorial core of scoring one candidate: put
// each predicted environment on an observed peak (or leave it unobserved) so
// that the total cost — a negative log-likelihood — is as small as possible.
//
// The cost splits into two parts:
//
//   - a separable part, one number per (environment, peak) choice: shift
//     residual and multiplicity agreement (whole[i*nPeak+j]), the same for
//     one half of a diastereotopic CH2 (half[...]), and the cost of leaving
//     environment i unobserved (unobs[i]);
//   - a per-peak part that depends only on how many hydrogens the peak ends
//     up holding (peak[j*(maxLoad+1)+L]): the integration term for L > 0 and
//     the unexplained-peak penalty for L = 0.
//
// One peak may hold any number of environments (overlap), a peak may hold
// none (unexplained), an environment may be unobserved, and an environment
// with split[i] set (an even number of H, e.g. a diastereotopic CH2) may put
// half of its hydrogens on each of two different peaks.
//
// The per-peak part is what makes this more than a linear assignment: the
// integration cost of a peak is a function of the sum of the environments on
// it. solve finds the exact optimum by depth-first branch and bound.
type assignProblem struct {
	nEnv, nPeak int
	envH        []int
	split       []bool
	whole       []float64 // nEnv*nPeak
	half        []float64 // nEnv*nPeak, read only where split[i]
	unobs       []float64 // nEnv
	peak        []float64 // nPeak*(maxLoad+1)
	maxLoad     int       // sum of envH
}

// reset sizes the problem for nEnv environments and nPeak peaks with
// maxLoad hydrogens in total, reusing the buffers.
func (p *assignProblem) reset(nEnv, nPeak, maxLoad int) {
	p.nEnv, p.nPeak, p.maxLoad = nEnv, nPeak, maxLoad
	p.envH = grow(p.envH, nEnv)
	p.split = growBool(p.split, nEnv)
	p.whole = growF(p.whole, nEnv*nPeak)
	p.half = growF(p.half, nEnv*nPeak)
	p.unobs = growF(p.unobs, nEnv)
	p.peak = growF(p.peak, nPeak*(maxLoad+1))
}

// peakCost returns the per-peak cost of peak j holding load hydrogens.
func (p *assignProblem) peakCost(j, load int) float64 {
	return p.peak[j*(p.maxLoad+1)+load]
}

// An assignment is a solution: for environment i, first[i] is its peak (-1
// for unobserved) and second[i] the peak holding the other half of a split
// environment (-1 when it is not split).
type assignment struct {
	first, second []int
	cost          float64
}

// evaluate returns the total cost of an assignment (for tests and for the
// explanation's per-peak shares).
func (p *assignProblem) evaluate(first, second []int) float64 {
	return p.evaluateWith(first, second, make([]int, p.nPeak))
}

// evaluateWith is evaluate with a caller-provided zeroed load buffer of
// length nPeak.
func (p *assignProblem) evaluateWith(first, second []int, load []int) float64 {
	c := 0.0
	for i := 0; i < p.nEnv; i++ {
		switch {
		case first[i] < 0:
			c += p.unobs[i]
		case second[i] >= 0:
			c += p.half[i*p.nPeak+first[i]] + p.half[i*p.nPeak+second[i]]
			load[first[i]] += p.envH[i] / 2
			load[second[i]] += p.envH[i] / 2
		default:
			c += p.whole[i*p.nPeak+first[i]]
			load[first[i]] += p.envH[i]
		}
	}
	for j := 0; j < p.nPeak; j++ {
		c += p.peakCost(j, load[j])
	}
	return c
}

// option is one choice for one environment.
type option struct {
	cost   float64
	p1, p2 int // p1 = -1: unobserved; p2 = -1: not split
}

func compareOptions(a, b option) int {
	switch {
	case a.cost < b.cost:
		return -1
	case a.cost > b.cost:
		return 1
	case a.p1 != b.p1:
		return a.p1 - b.p1
	}
	return a.p2 - b.p2
}

// solver holds the scratch space of the branch and bound so that a worker
// can score many candidates without allocating.
type solver struct {
	p       *assignProblem
	order   []int      // environments in search order
	opts    [][]option // per environment (indexed by position in order), sorted by cost
	restMin []float64  // restMin[d] = sum of the cheapest option of order[d:]
	minFrom []float64  // nPeak*(maxLoad+1): min over L' >= L of peakCost(j, L')
	load    []int
	curP1   []int
	curP2   []int
	best    float64
	bestP1  []int
	bestP2  []int
	nodes   int
}

// solve returns the optimal assignment of p. The returned slices are owned
// by the solver and valid until the next call.
//
// The search visits environments in decreasing order of H (they constrain
// the integrals most) and, for each, its options from cheapest up. A branch
// is cut when its cost so far, plus the cheapest option of every remaining
// environment, plus for every peak the least per-peak cost reachable from
// its current load (loads only grow), cannot beat the best complete
// assignment found so far. The first complete assignment is the greedy one,
// so the search starts with a good bound. Because every cut is by a valid
// lower bound, the result is the exact optimum.
func (s *solver) solve(p *assignProblem) assignment {
	s.p = p
	n, m := p.nEnv, p.nPeak
	s.order = grow(s.order, n)
	for i := range s.order {
		s.order[i] = i
	}
	slices.SortStableFunc(s.order, func(a, b int) int {
		return p.envH[b] - p.envH[a]
	})
	if cap(s.opts) < n {
		s.opts = make([][]option, n)
	}
	s.opts = s.opts[:n]
	for d, i := range s.order {
		o := s.opts[d][:0]
		o = append(o, option{cost: p.unobs[i], p1: -1, p2: -1})
		for j := 0; j < m; j++ {
			o = append(o, option{cost: p.whole[i*m+j], p1: j, p2: -1})
		}
		if p.split[i] && p.envH[i]%2 == 0 {
			for j := 0; j < m; j++ {
				for k := j + 1; k < m; k++ {
					o = append(o, option{cost: p.half[i*m+j] + p.half[i*m+k], p1: j, p2: k})
				}
			}
		}
		slices.SortFunc(o, compareOptions)
		s.opts[d] = o
	}
	s.restMin = growF(s.restMin, n+1)
	s.restMin[n] = 0
	for d := n - 1; d >= 0; d-- {
		s.restMin[d] = s.restMin[d+1] + s.opts[d][0].cost
	}
	w := p.maxLoad + 1
	s.minFrom = growF(s.minFrom, m*w)
	for j := 0; j < m; j++ {
		mn := math.Inf(1)
		for l := p.maxLoad; l >= 0; l-- {
			if c := p.peak[j*w+l]; c < mn {
				mn = c
			}
			s.minFrom[j*w+l] = mn
		}
	}
	s.load = grow(s.load, m)
	clear(s.load)
	s.curP1 = grow(s.curP1, n)
	s.curP2 = grow(s.curP2, n)
	s.bestP1 = grow(s.bestP1, n)
	s.bestP2 = grow(s.bestP2, n)
	s.nodes = 0

	// Greedy incumbent: every environment takes its cheapest option.
	for d, i := range s.order {
		s.bestP1[i], s.bestP2[i] = s.opts[d][0].p1, s.opts[d][0].p2
	}
	s.best = p.evaluateWith(s.bestP1, s.bestP2, s.load) + 1e-12
	clear(s.load)

	pb := 0.0
	for j := 0; j < m; j++ {
		pb += s.minFrom[j*w]
	}
	s.search(0, 0, pb)
	s.best -= 1e-12
	// Recompute the cost of the optimum exactly (the search accumulates
	// sums in a different order).
	cost := p.evaluateWith(s.bestP1, s.bestP2, s.load)
	clear(s.load)
	return assignment{first: s.bestP1, second: s.bestP2, cost: cost}
}

// search extends the partial assignment of order[:d] (separable cost cur,
// per-peak lower bound pb).
func (s *solver) search(d int, cur, pb float64) {
	s.nodes++
	p := s.p
	if d == p.nEnv {
		total := cur
		for j := 0; j < p.nPeak; j++ {
			total += p.peakCost(j, s.load[j])
		}
		if total < s.best {
			s.best = total
			copy(s.bestP1, s.curP1)
			copy(s.bestP2, s.curP2)
		}
		return
	}
	i := s.order[d]
	h := p.envH[i]
	w := p.maxLoad + 1
	rest := s.restMin[d+1]
	for _, o := range s.opts[d] {
		c := cur + o.cost
		// minFrom is non-decreasing in the load, so no option lowers the
		// per-peak bound below pb, and options are sorted by separable cost:
		// once this bound fails, it fails for every later option too.
		if c+rest+pb >= s.best {
			break
		}
		nb := pb
		switch {
		case o.p1 < 0:
		case o.p2 < 0:
			j := o.p1
			nb += s.minFrom[j*w+s.load[j]+h] - s.minFrom[j*w+s.load[j]]
		default:
			j, k := o.p1, o.p2
			nb += s.minFrom[j*w+s.load[j]+h/2] - s.minFrom[j*w+s.load[j]]
			nb += s.minFrom[k*w+s.load[k]+h/2] - s.minFrom[k*w+s.load[k]]
		}
		if c+rest+nb >= s.best {
			continue
		}
		s.curP1[i], s.curP2[i] = o.p1, o.p2
		switch {
		case o.p1 < 0:
		case o.p2 < 0:
			s.load[o.p1] += h
		default:
			s.load[o.p1] += h / 2
			s.load[o.p2] += h / 2
		}
		s.search(d+1, c, nb)
		switch {
		case o.p1 < 0:
		case o.p2 < 0:
			s.load[o.p1] -= h
		default:
			s.load[o.p1] -= h / 2
			s.load[o.p2] -= h / 2
		}
	}
}

func grow(s []int, n int) []int {
	if cap(s) < n {
		return make([]int, n)
	}
	return s[:n]
}

func growF(s []float64, n int) []float64 {
	if cap(s) < n {
		return make([]float64, n)
	}
	return s[:n]
}

func growBool(s []bool, n int) []bool {
	if cap(s) < n {
		return make([]bool, n)
	}
	return s[:n]
}
