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
// it. solve finds the exact optimum by depth-first branch and bound with two
// Lagrangian bounds (one pricing the peaks' hydrogens, one the
// environments' choices).
type assignProblem struct {
	nEnv, nPeak int
	envH        []int
	split       []bool
	whole       []float64 // nEnv*nPeak
	half        []float64 // nEnv*nPeak, read only where split[i]
	unobs       []float64 // nEnv
	peak        []float64 // nPeak*(maxLoad+1)
	maxLoad     int       // sum of envH
	// splitOK[j*nPeak+k] reports whether a split environment may put its
	// halves on peaks j and k (the model limits how far apart they are).
	splitOK []bool
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
	p.splitOK = growBool(p.splitOK, nPeak*nPeak)
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
	// proven is false when the search hit maxNodes: the assignment is
	// the best found, not proven optimal.
	proven bool
	// bound is a proven lower bound of the optimal cost: equal to cost
	// when proven, otherwise the best root bound, so cost − bound bounds
	// how far from optimal an unproven assignment can be.
	bound float64
}

// maxNodes caps the search of one assignment (well under a second). Real
// spectra of small molecules need a few hundred nodes on average and
// rarely more than 10^5 (strychnine's 21 peaks about 17,000); a capped
// search is reported with its lower bound, never hidden.
const maxNodes = 1 << 20

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
	rc     float64 // reduced cost: cost minus the Lagrange prices of its H
	p1, p2 int     // p1 = -1: unobserved; p2 = -1: not split
}

// solver holds the scratch space of the branch and bound so that a worker
// can score many candidates without allocating.
type solver struct {
	p      *assignProblem
	order  []int      // environments in search order
	opts   [][]option // per environment (indexed by position in order)
	lambda []float64  // Lagrange price of one hydrogen on each peak, nats
	restG  []float64  // restG[d] = sum of the least reduced cost of order[d:]
	phi    []float64  // nPeak*(maxLoad+1): per-peak part of the bound
	load   []int
	curP1  []int
	curP2  []int
	best   float64
	bestP1 []int
	bestP2 []int
	tmpP1  []int
	tmpP2  []int
	xLoad  []int
	nodes  int
	limit  int // node budget of the current search
	rootLB float64
	// seen maps a search state (depth and per-peak loads, packed) to the
	// least separable cost it was reached with: the rest of the search
	// depends only on that state, so reaching it again at no lower cost
	// cannot lead to a better assignment.
	seen     stateMemo
	wide     wideMemo // the same for states that do not pack into 64 bits
	state    []uint16
	packable bool
	bits     uint
	// full makes solve skip its shortcuts (the quick search, a proof by
	// either bound alone) and always search with both bounds, so that
	// tests reach every stage on small problems.
	full bool

	// The second bound (see tuneMu) prices the environments instead of
	// the peaks: mu[i] for environment i, muRest[d] the environments'
	// part of the bound over order[d:], and kTab[(d*nPeak+j)*(maxLoad+1)+ℓ]
	// the least cost of peak j, holding ℓ hydrogens already, over the
	// choices of order[d:] at those prices.
	mu     []float64
	muRest []float64
	kTab   []float64
	useMu  bool
	muLB   float64
	dpVal  []float64
	dpNext []float64
	dpPick []int8
	cover  []float64
	bestMu []float64
}

// lagrangeRounds is the number of subgradient steps that tune the prices.
const lagrangeRounds = 30

// solve returns the optimal assignment of p. The returned slices are owned
// by the solver and valid until the next call.
//
// The bound is Lagrangian. The only coupling between environments is the
// per-peak cost of the summed load; giving each peak j a price λ_j per
// hydrogen, the remaining cost of any partial assignment splits exactly
// into Σ_i [sep_i − λ·h_i] over the remaining environments plus
// Σ_j [f_j(ℓ_j + x_j) + λ_j x_j] over peaks (x_j the load still to come),
// and minimising each term on its own gives a lower bound for every λ.
// The prices are tuned at the root by subgradient ascent (which also
// yields good complete assignments to start from); in the tree both parts
// are precomputed tables, so the bound costs O(1) per node. A depth-first
// search over environments (largest H first, options by reduced cost)
// cuts every branch whose bound cannot beat the best assignment found,
// and every state (depth, loads) already reached at no higher cost, so the
// result is the exact optimum.
//
// These prices alone bound poorly when environments of 2 or more H meet
// peaks of 1 H (a relaxed CH2 can sit half on each of two peaks at the
// price of a whole one); on spectra of 15–20 or more peaks the search then
// ran out of nodes and returned assignments 10 nats or more from the
// optimum. When the prices do not prove the incumbent optimal, a second
// Lagrangian bound prices the environments instead (tuneMu): it leaves
// one exact knapsack per peak over whole hydrogens, is also O(m) per
// node from precomputed tables, and is usually tight on such spectra. A
// search that still runs out of maxNodes nodes returns a local optimum
// with proven = false and a lower bound of the optimal cost.
func (s *solver) solve(p *assignProblem) assignment {
	s.p = p
	n, m := p.nEnv, p.nPeak
	w := p.maxLoad + 1
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
					if p.splitOK[j*m+k] {
						o = append(o, option{cost: p.half[i*m+j] + p.half[i*m+k], p1: j, p2: k})
					}
				}
			}
		}
		s.opts[d] = o
	}
	s.load = grow(s.load, m)
	s.xLoad = grow(s.xLoad, m)
	s.curP1 = grow(s.curP1, n)
	s.curP2 = grow(s.curP2, n)
	s.bestP1 = grow(s.bestP1, n)
	s.bestP2 = grow(s.bestP2, n)
	s.tmpP1 = grow(s.tmpP1, n)
	s.tmpP2 = grow(s.tmpP2, n)
	s.lambda = growF(s.lambda, m)
	s.restG = growF(s.restG, n+1)
	s.phi = growF(s.phi, m*w)
	s.nodes = 0
	s.best = math.Inf(1)
	s.bits = uint(bitsFor(p.maxLoad))
	s.packable = uint(m)*s.bits+uint(bitsFor(n)) <= 64

	// Most candidates are settled by a short search with zero prices (the
	// greedy assignment as incumbent); only if that runs out of nodes are
	// the prices tuned and the search run again to the end.
	clear(s.lambda)
	for d, i := range s.order {
		o := s.opts[d]
		for k := range o {
			o[k].rc = o[k].cost
		}
		slices.SortFunc(o, compareOptions)
		s.bestP1[i], s.bestP2[i] = o[0].p1, o[0].p2
	}
	clear(s.load)
	s.best = p.evaluateWith(s.bestP1, s.bestP2, s.load)
	s.limit = quickNodes
	s.useMu = false
	s.rootLB, s.muLB = math.Inf(-1), math.Inf(-1)
	if s.full || !s.runSearch() {
		s.limit = maxNodes
		s.nodes = 0
		if !s.tunePrices() || s.full {
			// The peaks' prices did not close the gap: polish the
			// incumbent and add the environment-priced bound, which
			// sees that a peak holds whole hydrogens.
			s.improve()
			clear(s.load)
			s.best = p.evaluateWith(s.bestP1, s.bestP2, s.load)
			if s.tuneMu(muRounds, false) < s.best-1e-9 || s.full {
				s.useMu = true
				s.limit = maxNodes / 8
				if !s.runSearch() {
					// A hard problem: tune the prices longer, from
					// where they are and towards the better incumbent
					// the search found, and search to the cap.
					s.limit = maxNodes
					if s.tuneMu(4*muRounds, true) < s.best-1e-9 || s.full {
						s.runSearch()
					} else {
						s.nodes = 0 // the bound meets the incumbent
					}
				}
			}
		}
	}
	proven := s.nodes < s.limit
	if !proven {
		s.improve()
	}
	clear(s.load)
	cost := p.evaluateWith(s.bestP1, s.bestP2, s.load)
	clear(s.load)
	bound := cost
	if !proven {
		bound = math.Min(math.Max(s.rootLB, s.muLB), cost)
	}
	return assignment{first: s.bestP1, second: s.bestP2, cost: cost, bound: bound, proven: proven}
}

// improveRounds bounds the local search of an unproven assignment.
const improveRounds = 64

// improve polishes the incumbent of a search that ran out of nodes by
// local search: moving one environment to another of its options, or
// exchanging the peaks of two environments, as long as the total cost
// drops. The result is still not proven optimal, but no single move or
// exchange improves it, so an incumbent that piles many hydrogens on one
// small peak while another peak stays empty cannot survive.
func (s *solver) improve() {
	p := s.p
	n := p.nEnv
	eval := func() float64 {
		clear(s.load)
		return p.evaluateWith(s.bestP1, s.bestP2, s.load)
	}
	cur := eval()
	for round := 0; round < improveRounds; round++ {
		improved := false
		for d, i := range s.order {
			for _, o := range s.opts[d] {
				p1, p2 := s.bestP1[i], s.bestP2[i]
				if o.p1 == p1 && o.p2 == p2 {
					continue
				}
				s.bestP1[i], s.bestP2[i] = o.p1, o.p2
				if c := eval(); c < cur-1e-12 {
					cur, improved = c, true
					continue
				}
				s.bestP1[i], s.bestP2[i] = p1, p2
			}
		}
		for a := 0; a < n; a++ {
			for b := a + 1; b < n; b++ {
				if s.bestP2[a] >= 0 || s.bestP2[b] >= 0 || s.bestP1[a] == s.bestP1[b] {
					continue
				}
				s.bestP1[a], s.bestP1[b] = s.bestP1[b], s.bestP1[a]
				if c := eval(); c < cur-1e-12 {
					cur, improved = c, true
					continue
				}
				s.bestP1[a], s.bestP1[b] = s.bestP1[b], s.bestP1[a]
			}
		}
		if !improved {
			return
		}
	}
}

// quickNodes is the node budget of the first, price-free search.
const quickNodes = 64

// runSearch sorts the options by reduced cost at the current prices,
// tabulates the bound and searches until done or s.limit nodes; it
// reports whether the search finished.
func (s *solver) runSearch() bool {
	p := s.p
	n, m := p.nEnv, p.nPeak
	w := p.maxLoad + 1
	for d := range s.order {
		o := s.opts[d]
		h := p.envH[s.order[d]]
		for k := range o {
			o[k].rc = s.reduced(o[k], h)
		}
		slices.SortFunc(o, compareOptions)
	}
	s.restG[n] = 0
	for d := n - 1; d >= 0; d-- {
		s.restG[d] = s.restG[d+1] + s.opts[d][0].rc
	}
	s.fillPhi()
	clear(s.load)
	s.seen.reset()
	if !s.packable {
		s.wide.reset(m + 1)
		if cap(s.state) < m+1 {
			s.state = make([]uint16, m+1)
		}
	}
	pb := 0.0
	for j := 0; j < m; j++ {
		pb += s.phi[j*w]
	}
	s.nodes = 0
	s.search(0, 0, pb)
	return s.nodes < s.limit
}

// reduced returns the cost of option o of an environment of h hydrogens
// minus the prices of the hydrogens it places.
func (s *solver) reduced(o option, h int) float64 {
	switch {
	case o.p1 < 0:
		return o.cost
	case o.p2 < 0:
		return o.cost - s.lambda[o.p1]*float64(h)
	}
	return o.cost - (s.lambda[o.p1]+s.lambda[o.p2])*float64(h/2)
}

// tunePrices runs subgradient ascent on the Lagrangian dual, keeps the
// prices with the highest bound in s.lambda, and records the best complete
// assignment met on the way as the incumbent. It reports whether the bound
// met the incumbent, which is then optimal without a search.
func (s *solver) tunePrices() bool {
	p := s.p
	m := p.nPeak
	w := p.maxLoad + 1
	clear(s.lambda)
	bestLB := math.Inf(-1)
	var saved [16]float64
	keep := saved[:0]
	if m <= len(saved) {
		keep = saved[:m]
	} else {
		keep = make([]float64, m)
	}
	theta, stall, prevLB := 1.0, 0, math.Inf(-1)
	for round := 0; round < lagrangeRounds; round++ {
		// Environment part: each takes its least reduced-cost option.
		lb := 0.0
		clear(s.load)
		for d, i := range s.order {
			h := p.envH[i]
			bo, brc := s.opts[d][0], math.Inf(1)
			for _, o := range s.opts[d] {
				if rc := s.reduced(o, h); rc < brc {
					bo, brc = o, rc
				}
			}
			lb += brc
			s.tmpP1[i], s.tmpP2[i] = bo.p1, bo.p2
			switch {
			case bo.p1 < 0:
			case bo.p2 < 0:
				s.load[bo.p1] += h
			default:
				s.load[bo.p1] += h / 2
				s.load[bo.p2] += h / 2
			}
		}
		// Peak part: each takes its best load at its price.
		for j := 0; j < m; j++ {
			bx, bv := 0, math.Inf(1)
			for l := 0; l < w; l++ {
				if v := p.peak[j*w+l] + s.lambda[j]*float64(l); v < bv {
					bx, bv = l, v
				}
			}
			lb += bv
			s.xLoad[j] = bx
		}
		if lb > bestLB {
			bestLB = lb
			copy(keep, s.lambda)
		}
		// The environments' choices are a complete assignment.
		clear(s.load)
		if c := p.evaluateWith(s.tmpP1, s.tmpP2, s.load); c < s.best {
			s.best = c
			copy(s.bestP1, s.tmpP1)
			copy(s.bestP2, s.tmpP2)
		}
		if bestLB >= s.best-1e-9 {
			// The dual bound meets a complete assignment: it is optimal.
			copy(s.lambda, keep)
			s.rootLB = bestLB
			return true
		}
		// Recount the environments' loads (evaluateWith reset them).
		clear(s.load)
		for i := range s.tmpP1 {
			switch {
			case s.tmpP1[i] < 0:
			case s.tmpP2[i] < 0:
				s.load[s.tmpP1[i]] += p.envH[i]
			default:
				s.load[s.tmpP1[i]] += p.envH[i] / 2
				s.load[s.tmpP2[i]] += p.envH[i] / 2
			}
		}
		// Polyak step towards the incumbent's cost: the subgradient of
		// the dual at λ_j is (best load of peak j) − (load the
		// environments put there).
		norm := 0.0
		for j := 0; j < m; j++ {
			g := float64(s.xLoad[j] - s.load[j])
			norm += g * g
		}
		if norm == 0 {
			break // the relaxation is tight: its solution is optimal
		}
		if lb > prevLB+1e-9 {
			stall = 0
		} else if stall++; stall >= 3 {
			theta /= 2
			stall = 0
		}
		prevLB = math.Max(prevLB, lb)
		t := theta * (s.best - lb) / norm
		if t <= 0 {
			break
		}
		for j := 0; j < m; j++ {
			s.lambda[j] += t * float64(s.xLoad[j]-s.load[j])
		}
	}
	copy(s.lambda, keep)
	s.rootLB = bestLB
	return false
}

// muRounds is the number of subgradient steps that tune the
// environments' prices (four times as many again when the first search
// with them runs out of nodes).
const muRounds = 60

// tuneMu computes the second bound, a Lagrangian relaxation of the other
// constraint: each environment takes exactly one option. Pricing it with
// mu[i] per environment leaves one independent problem per peak: choose
// which environments (whole, or one half of a split one) it holds, at
// cost f_j(load) plus each choice's cost minus its share of mu (a half
// pays mu/2) — a small knapsack solved exactly over loads. Because a
// peak's load is a whole number of hydrogens there, this bound sees what
// the peak-priced one cannot: a 2 H environment cannot be half on one 1 H
// peak and half on another at the whole environment's cost. The bound is
//
//	Σ_i [mu_i + min(0, unobs_i − mu_i)] + Σ_j knapsack_j(mu),
//
// valid for every mu; subgradient ascent tunes mu for the given number of
// rounds, starting from s.mu when warm. tuneMu leaves the best mu in s.mu,
// tabulates the per-depth knapsacks for the search (kTab, muRest) and
// returns the best bound met (also kept in s.muLB).
func (s *solver) tuneMu(rounds int, warm bool) float64 {
	p := s.p
	n, m := p.nEnv, p.nPeak
	w := p.maxLoad + 1
	s.mu = growF(s.mu, n)
	s.bestMu = growF(s.bestMu, n)
	s.cover = growF(s.cover, n)
	s.dpVal = growF(s.dpVal, w)
	s.dpNext = growF(s.dpNext, w)
	if cap(s.dpPick) < n*w {
		s.dpPick = make([]int8, n*w)
	}
	s.dpPick = s.dpPick[:n*w]
	// Start from each environment's cheapest option: every environment
	// is then indifferent to being placed.
	for d, i := range s.order {
		if warm {
			break
		}
		mn := math.Inf(1)
		for _, o := range s.opts[d] {
			mn = math.Min(mn, o.cost)
		}
		s.mu[i] = mn
	}
	best := math.Inf(-1)
	if warm {
		best = s.muLB
		copy(s.bestMu, s.mu)
	}
	theta, stall, prev := 1.0, 0, math.Inf(-1)
	for round := 0; round < rounds; round++ {
		lb := 0.0
		for i := 0; i < n; i++ {
			lb += s.mu[i]
			s.cover[i] = 0
			if r := p.unobs[i] - s.mu[i]; r < 0 {
				lb += r
				s.cover[i] = 1
			}
		}
		for j := 0; j < m; j++ {
			lb += s.peakKnapsack(j)
		}
		if lb > best {
			best = lb
			copy(s.bestMu, s.mu)
		}
		if best >= s.best-1e-9 {
			break
		}
		norm := 0.0
		for i := 0; i < n; i++ {
			g := 1 - s.cover[i]
			norm += g * g
		}
		if norm == 0 {
			break
		}
		if lb > prev+1e-9 {
			stall = 0
		} else if stall++; stall >= 3 {
			theta /= 2
			stall = 0
		}
		prev = math.Max(prev, lb)
		t := theta * (s.best - lb) / norm
		for i := 0; i < n; i++ {
			s.mu[i] += t * (1 - s.cover[i])
		}
	}
	copy(s.mu, s.bestMu)
	s.fillK()
	s.muLB = best
	return best
}

// peakKnapsack solves peak j's problem at prices s.mu: the least cost
// f_j(ℓ) + Σ (option cost − price share) over the environments it holds.
// It adds each chosen environment's share (1 whole, 1/2 for a half) to
// s.cover and returns the cost.
func (s *solver) peakKnapsack(j int) float64 {
	p := s.p
	n, m := p.nEnv, p.nPeak
	w := p.maxLoad + 1
	inf := math.Inf(1)
	v := s.dpVal
	for l := range v {
		v[l] = inf
	}
	v[0] = 0
	top := 0 // the largest load reached so far
	for i := 0; i < n; i++ {
		h := p.envH[i]
		nx := s.dpNext
		copy(nx, v)
		pick := s.dpPick[i*w : (i+1)*w]
		clear(pick)
		rw := p.whole[i*m+j] - s.mu[i]
		split := p.split[i] && h%2 == 0
		rh := p.half[i*m+j] - s.mu[i]/2
		for l := 0; l <= top; l++ {
			if math.IsInf(v[l], 1) {
				continue
			}
			if c := v[l] + rw; l+h < w && c < nx[l+h] {
				nx[l+h], pick[l+h] = c, 1
			}
			if split {
				if c := v[l] + rh; c < nx[l+h/2] {
					nx[l+h/2], pick[l+h/2] = c, 2
				}
			}
		}
		top = min(top+h, w-1)
		s.dpVal, s.dpNext = nx, v
		v = nx
	}
	bl, bv := 0, inf
	for l := 0; l < w; l++ {
		if c := v[l] + p.peakCost(j, l); c < bv {
			bl, bv = l, c
		}
	}
	for i := n - 1; i >= 0 && bl > 0; i-- {
		switch s.dpPick[i*w+bl] {
		case 1:
			s.cover[i]++
			bl -= p.envH[i]
		case 2:
			s.cover[i] += 0.5
			bl -= p.envH[i] / 2
		}
	}
	return bv
}

// fillK tabulates the environment-priced bound for the search:
// kTab[d][j][ℓ] is the least cost of peak j holding ℓ hydrogens, over the
// choices of the environments order[d:] at prices s.mu, and muRest[d]
// their own part.
func (s *solver) fillK() {
	p := s.p
	n, m := p.nEnv, p.nPeak
	w := p.maxLoad + 1
	s.kTab = growF(s.kTab, (n+1)*m*w)
	s.muRest = growF(s.muRest, n+1)
	last := s.kTab[n*m*w : (n+1)*m*w]
	for j := 0; j < m; j++ {
		for l := 0; l < w; l++ {
			last[j*w+l] = p.peakCost(j, l)
		}
	}
	s.muRest[n] = 0
	for d := n - 1; d >= 0; d-- {
		i := s.order[d]
		h := p.envH[i]
		s.muRest[d] = s.muRest[d+1] + s.mu[i] + math.Min(0, p.unobs[i]-s.mu[i])
		next := s.kTab[(d+1)*m*w : (d+2)*m*w]
		cur := s.kTab[d*m*w : (d+1)*m*w]
		split := p.split[i] && h%2 == 0
		for j := 0; j < m; j++ {
			rw := p.whole[i*m+j] - s.mu[i]
			rh := p.half[i*m+j] - s.mu[i]/2
			for l := 0; l < w; l++ {
				c := next[j*w+l]
				if l+h < w {
					c = math.Min(c, next[j*w+l+h]+rw)
				}
				if split && l+h/2 < w {
					c = math.Min(c, next[j*w+l+h/2]+rh)
				}
				cur[j*w+l] = c
			}
		}
	}
}

func abs(x int) int {
	if x < 0 {
		return -x
	}
	return x
}

// fillPhi tabulates phi[j][ℓ] = min over L ≥ ℓ of f_j(L) + λ_j (L − ℓ).
func (s *solver) fillPhi() {
	p := s.p
	w := p.maxLoad + 1
	for j := 0; j < p.nPeak; j++ {
		lam := s.lambda[j]
		// g(L) = f(L) + λL; phi(ℓ) = min_{L≥ℓ} g(L) − λℓ.
		mn := math.Inf(1)
		for l := p.maxLoad; l >= 0; l-- {
			if g := p.peak[j*w+l] + lam*float64(l); g < mn {
				mn = g
			}
			s.phi[j*w+l] = mn - lam*float64(l)
		}
	}
}

func compareOptions(a, b option) int {
	switch {
	case a.rc < b.rc:
		return -1
	case a.rc > b.rc:
		return 1
	case a.p1 != b.p1:
		return a.p1 - b.p1
	}
	return a.p2 - b.p2
}

// search extends the partial assignment of order[:d] (separable cost cur,
// per-peak part of the bound pb).
func (s *solver) search(d int, cur, pb float64) {
	s.nodes++
	if s.nodes >= s.limit {
		return
	}
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
	if s.packable && d > 0 {
		k := uint64(d)
		for j := 0; j < p.nPeak; j++ {
			k = k<<s.bits | uint64(s.load[j])
		}
		if !s.seen.improve(k, cur) {
			return
		}
	} else if d > 0 {
		st := s.state[:p.nPeak+1]
		st[0] = uint16(d)
		h := uint64(d) * 0x9E3779B97F4A7C15
		for j := 0; j < p.nPeak; j++ {
			st[j+1] = uint16(s.load[j])
			h = (h ^ uint64(s.load[j])) * 0x100000001B3
			h ^= h >> 29
		}
		if !s.wide.improve(h, st, cur) {
			return
		}
	}
	i := s.order[d]
	h := p.envH[i]
	w := p.maxLoad + 1
	rest := s.restG[d+1]
	const eps = 1e-12
	var kBase float64
	var kRow []float64
	if s.useMu {
		m := p.nPeak
		kRow = s.kTab[(d+1)*m*w : (d+2)*m*w]
		kBase = cur + s.muRest[d+1]
		for j := 0; j < m; j++ {
			kBase += kRow[j*w+s.load[j]]
		}
	}
	for _, o := range s.opts[d] {
		// The per-peak part can fall by at most λ·h when the option's
		// hydrogens join a peak (phi(ℓ) ≤ phi(ℓ+h) + λh), so cur + rc +
		// rest + pb bounds this option and, options being sorted by rc,
		// every later one.
		if cur+o.rc+rest+pb >= s.best-eps {
			break
		}
		nb := pb
		switch {
		case o.p1 < 0:
		case o.p2 < 0:
			j := o.p1
			nb += s.phi[j*w+s.load[j]+h] - s.phi[j*w+s.load[j]]
		default:
			j, k := o.p1, o.p2
			nb += s.phi[j*w+s.load[j]+h/2] - s.phi[j*w+s.load[j]]
			nb += s.phi[k*w+s.load[k]+h/2] - s.phi[k*w+s.load[k]]
		}
		c := cur + o.cost
		if c+rest+nb >= s.best-eps {
			continue
		}
		if s.useMu {
			mb := kBase + o.cost
			switch {
			case o.p1 < 0:
			case o.p2 < 0:
				j := o.p1
				mb += kRow[j*w+s.load[j]+h] - kRow[j*w+s.load[j]]
			default:
				j, k := o.p1, o.p2
				mb += kRow[j*w+s.load[j]+h/2] - kRow[j*w+s.load[j]]
				mb += kRow[k*w+s.load[k]+h/2] - kRow[k*w+s.load[k]]
			}
			if mb >= s.best-eps {
				continue
			}
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

// stateMemo is an open-addressing hash table from packed search states
// to the least cost they were reached with. reset is O(1): entries carry
// the generation they were written in.
type stateMemo struct {
	keys []uint64
	vals []float64
	gens []uint32
	gen  uint32
	n    int
}

func (t *stateMemo) reset() {
	t.gen++
	t.n = 0
	if t.gen == 0 || len(t.keys) == 0 {
		t.alloc(1024)
	}
}

func (t *stateMemo) alloc(size int) {
	t.keys = make([]uint64, size)
	t.vals = make([]float64, size)
	t.gens = make([]uint32, size)
	t.gen = 1
	t.n = 0
}

// improve records cost for key and reports true if key was new or
// reached before only at a higher cost.
func (t *stateMemo) improve(key uint64, cost float64) bool {
	if 2*(t.n+1) > len(t.keys) {
		t.grow()
	}
	mask := uint64(len(t.keys) - 1)
	i := (key * 0x9E3779B97F4A7C15) >> 20 & mask
	for {
		switch {
		case t.gens[i] != t.gen:
			t.keys[i], t.vals[i], t.gens[i] = key, cost, t.gen
			t.n++
			return true
		case t.keys[i] == key:
			if t.vals[i] <= cost {
				return false
			}
			t.vals[i] = cost
			return true
		}
		i = (i + 1) & mask
	}
}

func (t *stateMemo) grow() {
	keys, vals, gens, gen := t.keys, t.vals, t.gens, t.gen
	t.alloc(2 * len(keys))
	for i := range keys {
		if gens[i] == gen {
			t.improve(keys[i], vals[i])
		}
	}
}

// wideMemo is stateMemo for states (depth and loads) that do not pack
// into 64 bits: it keys them by a hash but keeps each state to compare
// with, so a hash collision can never cut a branch. It holds at most
// wideMemoMax states in 2·wideMemoMax slots of 20 + 2·(peaks+1) bytes
// (about 11 MB for 30 peaks, kept by the worker for the next candidate);
// states met after it is full are searched without the check.
type wideMemo struct {
	stride int
	hashes []uint64
	states []uint16 // stride per slot
	vals   []float64
	gens   []uint32
	gen    uint32
	n      int
}

// wideMemoMax caps the number of states a wideMemo holds.
const wideMemoMax = 1 << 16

func (t *wideMemo) reset(stride int) {
	t.gen++
	t.n = 0
	if t.gen == 0 || stride != t.stride || len(t.hashes) == 0 {
		t.stride = stride
		t.alloc(1024)
	}
}

func (t *wideMemo) alloc(size int) {
	t.hashes = make([]uint64, size)
	t.states = make([]uint16, size*t.stride)
	t.vals = make([]float64, size)
	t.gens = make([]uint32, size)
	t.gen = 1
	t.n = 0
}

// improve records cost for state st (of hash h) and reports true if it
// was new, reached before only at a higher cost, or the memo is full.
func (t *wideMemo) improve(h uint64, st []uint16, cost float64) bool {
	if 2*(t.n+1) > len(t.hashes) {
		if t.n >= wideMemoMax {
			return t.lookup(h, st, cost, false)
		}
		t.grow()
	}
	return t.lookup(h, st, cost, true)
}

func (t *wideMemo) lookup(h uint64, st []uint16, cost float64, insert bool) bool {
	mask := uint64(len(t.hashes) - 1)
	i := (h * 0x9E3779B97F4A7C15) >> 20 & mask
	for {
		switch {
		case t.gens[i] != t.gen:
			if insert {
				t.hashes[i], t.vals[i], t.gens[i] = h, cost, t.gen
				copy(t.states[int(i)*t.stride:], st)
				t.n++
			}
			return true
		case t.hashes[i] == h && slices.Equal(t.states[int(i)*t.stride:int(i+1)*t.stride], st):
			if t.vals[i] <= cost {
				return false
			}
			t.vals[i] = cost
			return true
		}
		i = (i + 1) & mask
	}
}

func (t *wideMemo) grow() {
	hashes, states, vals, gens, gen := t.hashes, t.states, t.vals, t.gens, t.gen
	t.alloc(2 * len(hashes))
	for i := range hashes {
		if gens[i] == gen {
			t.lookup(hashes[i], states[i*t.stride:(i+1)*t.stride], vals[i], true)
		}
	}
}

// bitsFor returns the number of bits needed to hold 0..n.
func bitsFor(n int) int {
	b := 1
	for 1<<b <= n {
		b++
	}
	return b
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
