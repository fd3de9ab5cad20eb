package isomers

import (
	"context"
	"math"
	"math/rand/v2"

	"shiftrank/molecule"
)

// SizeEstimate is an estimate of a run's size made before the run, by
// Knuth's method (D. E. Knuth, "Estimating the efficiency of backtrack
// programs", Math. Comp. 29 (1975) 121–136): random root-to-leaf probes of
// the same search tree, each multiplying the branching factors it meets.
// Every probe's product is an unbiased estimate of the tree's size; the
// mean over the probes is reported with its standard error. On trees as
// uneven as the constrained isomer search the error can be large: the
// estimate tells thousands from millions, not 4,000 from 5,000.
type SizeEstimate struct {
	// Structures estimates the structures the run emits (after the
	// plausibility filter and the Require/Forbid fragments; a structure
	// that an ambiguous Spec reaches twice counts twice).
	Structures float64 `json:"structures"`
	// Nodes estimates the search nodes the run visits (compare
	// Options.NodeLimit).
	Nodes float64 `json:"nodes"`
	// RelErr is the relative standard error of Structures (0 when every
	// probe agreed or none found a structure).
	RelErr float64 `json:"rel_err"`
	// Probes is the number of random probes the estimate rests on.
	Probes int `json:"probes"`
	// Exact is true when the tree was small enough to be walked whole:
	// Structures and Nodes are then the run's exact figures.
	Exact bool `json:"exact"`
}

// DefaultEstimateProbes is the number of probes Estimate makes when asked
// for none.
const DefaultEstimateProbes = 200

// Estimate estimates, without running it, the size of the run Generate
// would make for f and opts (opts.Limit and opts.NodeLimit are ignored),
// from probes random probes of its search tree (DefaultEstimateProbes when
// probes ≤ 0). The probes' random choices come from seed, so the same
// input gives the same estimate on any machine. A tree of at most
// exactWalk nodes is walked whole instead, giving exact figures. Its work
// is about probes × (heavy atoms) search nodes; ctx stops it early with
// ctx.Err().
func Estimate(ctx context.Context, f molecule.Formula, opts Options, probes int, seed uint64) (SizeEstimate, error) {
	if probes <= 0 {
		probes = DefaultEstimateProbes
	}
	opts.Limit, opts.NodeLimit = 0, 0
	r, _, err := prepare(ctx, f, opts)
	if err != nil {
		return SizeEstimate{}, err
	}
	if len(r.tasks) == 0 {
		return SizeEstimate{Exact: true}, nil
	}
	r.seen = nil // duplicates of an ambiguous Spec are counted, not tracked
	ws := r.newWorker()
	ws.s.poll = func() bool { return ctx.Err() == nil }
	found := 0
	ws.s.emit = func(m *mol) bool {
		if ws.process(r, m) {
			found++
		}
		return true
	}

	// A small tree is walked whole: cheaper than the probes and exact.
	ws.s.nodeCap = exactWalk
	exact := true
	var nodes int64
	for i := range r.tasks {
		ws.runTask(&r.tasks[i])
		nodes = ws.nodes + int64(ws.s.nodes)
		if ws.truncated > 0 || ws.s.stopped || nodes > exactWalk {
			exact = false
			break
		}
		ws.s.nodeCap = exactWalk - int(nodes)
	}
	if err := ctx.Err(); err != nil {
		return SizeEstimate{}, err
	}
	if exact {
		return SizeEstimate{Structures: float64(found), Nodes: float64(nodes), Exact: true}, nil
	}

	ws.s.nodeCap = 0
	rng := rand.New(rand.NewPCG(seed, 0x6b6e757468))
	s := ws.s
	var sum, sumSq, nodeSum float64
	var kids []aug
	order := make([]int, len(r.tasks))
	for i := range order {
		order[i] = i
	}
	for p := 0; p < probes; p++ {
		if err := ctx.Err(); err != nil {
			return SizeEstimate{}, err
		}
		// Stratified over the subtrees: the probes visit them in turn
		// (in a random order), each weighted by the number of subtrees.
		if p%len(order) == 0 {
			rng.Shuffle(len(order), func(i, j int) { order[i], order[j] = order[j], order[i] })
		}
		t := &r.tasks[order[p%len(order)]]
		s.stopped = false
		s.reset(t.assign, t.root, t.path)
		mult := float64(len(r.tasks))
		est, nodeEst := 0.0, 0.0
		for {
			found = 0
			kids = s.children(kids[:0])
			nodeEst += mult
			est += mult * float64(found)
			if len(kids) == 0 || s.stopped {
				break
			}
			a := kids[rng.IntN(len(kids))]
			mult *= float64(len(kids))
			s.pushAtom(a.c, a.att[:a.na], a.ord[:a.na])
		}
		sum += est
		sumSq += est * est
		nodeSum += nodeEst
	}
	n := float64(probes)
	mean := sum / n
	out := SizeEstimate{Structures: mean, Nodes: nodeSum / n, Probes: probes}
	if mean > 0 && probes > 1 {
		v := (sumSq - n*mean*mean) / (n - 1)
		out.RelErr = math.Sqrt(max(v, 0)/n) / mean
	}
	return out, nil
}

// exactWalk is the largest search (in nodes) Estimate walks whole.
const exactWalk = 5000
