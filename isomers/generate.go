package isomers

import (
	"context"
	"crypto/sha256"
	"fmt"
	"math/rand/v2"
	"runtime"
	"sync"
	"sync/atomic"

	"shiftrank/molecule"
)

// Options controls a generation run. The zero value applies the
// plausibility filter, uses every core and has no limit.
type Options struct {
	// Filter is the set of plausibility rules applied to each structure.
	// The zero Filter is DefaultFilter (all rules on); set NoFilter() for
	// the complete set of constitutional isomers.
	Filter Filter
	// Limit stops the run after this many emitted structures (0 = no
	// limit).
	Limit int64
	// Workers is the number of goroutines searching; 0 means
	// runtime.GOMAXPROCS(0). The set and, for Generate, the order of the
	// structures do not depend on it.
	Workers int
	// Spec, when not nil, restricts the run to the structures that fit its
	// classes (see Spec); the rules prune the search itself.
	Spec *Spec
	// ChargeSeparated adds the charge-separated groups named by
	// ChargeSeparatedGroups to the neutral valence model (ignored with a
	// Spec, whose classes say which charged atoms there are). Off, the
	// generator makes exactly the neutral constitutional isomers.
	ChargeSeparated bool
	// Require and Forbid are substructure constraints applied to each
	// structure before it is emitted: it must contain every Require
	// fragment and none of the Forbid fragments. Stats.Constrained counts
	// the structures they removed.
	Require, Forbid []*molecule.Fragment
	// NodeLimit, when positive, bounds the search work in nodes. The
	// search tree is split into subtrees (a fixed set for a formula and
	// Spec). GenerateConcurrent and Count run them in rounds: each first
	// gets an equal share of the limit, those cut short run again with
	// the budget left shared among them, until none is cut short or the
	// share stops growing. Generate gives each subtree one equal share.
	// Unlike Limit and the context, it stops the same subtrees at the same
	// place on every run, so a truncated run emits the same structures
	// however many workers run and however loaded the machine is.
	// Stats.Truncated counts the subtrees it cut short.
	NodeLimit int64
	// Seen, when not nil, is a set of structures shared with other runs:
	// a structure already in it is not emitted again, and each emitted
	// structure is added. Runs with an ambiguous Spec use a set of their
	// own when Seen is nil.
	Seen *Seen

	// allKekule emits every Kekulé structure separately (tests only: the
	// oracle comparison of raw multigraphs).
	allKekule bool
}

// Stats describes a finished or stopped run.
type Stats struct {
	// Emitted counts structures passed to yield (or counted by Count).
	Emitted int64
	// Generated counts distinct structures found before the filter.
	Generated int64
	// Removed maps a filter rule name to the number of structures it
	// removed (the first enabled rule that objects is charged). Rules that
	// removed nothing are absent.
	Removed map[string]int64
	// Truncated counts the subtrees that NodeLimit cut short (the run is
	// then not Complete); Nodes counts the search nodes visited.
	Truncated int
	Nodes     int64
	// Constrained counts structures that passed the filter but not the
	// Require and Forbid fragments; Duplicates counts structures not
	// emitted because Seen already held them.
	Constrained, Duplicates int64
	// Complete is false if the run stopped early: Limit reached, yield
	// returned false, or the context ended.
	Complete bool
	// Fraction estimates the share of the search space covered, 0..1
	// (1 when Complete): the search is split into a few hundred subtrees
	// of equal weight, and inside a subtree each branch gets an equal share
	// of its parent's. GenerateConcurrent and Count visit the subtrees in a
	// fixed pseudo-random order, so Emitted/Fraction estimates the total
	// without the bias of always starting from the same corner of the
	// search space (and a Limit takes a spread sample); Generate visits
	// them in order, so its estimate is rougher. For progress and totals,
	// not exact.
	Fraction float64
}

// frontierTarget is the number of subtrees the search is split into
// (at least, when the formula allows it). It is fixed so that the order of
// Generate does not depend on the number of workers.
const frontierTarget = 1024

// batchSize is the number of structures handed over at once.
const batchSize = 256

// task is one subtree of the search: the structure reached from a single
// atom by a sequence of augmentations.
type task struct {
	assign int
	root   uint8
	path   []aug
	weight float64
}

// frontier splits the search into tasks, level by level, in a
// deterministic order.
func frontier(ctx context.Context, p *plan) ([]task, error) {
	var roots []task
	for ai, a := range p.assigns {
		for ci := range p.colours {
			if a.count[ci] > 0 {
				roots = append(roots, task{assign: ai, root: uint8(ci)})
			}
		}
	}
	tasks := roots
	s := newSearcher(p)
	s.emit = func(*mol) bool { return true }
	// Leave at least the last two levels to the workers.
	for depth := 1; depth < p.n-2 && len(tasks) < frontierTarget; depth++ {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		var next []task
		for _, t := range tasks {
			s.reset(t.assign, t.root, t.path)
			kids := s.children(nil)
			for _, k := range kids {
				path := make([]aug, len(t.path)+1)
				copy(path, t.path)
				path[len(t.path)] = k
				next = append(next, task{assign: t.assign, root: t.root, path: path})
			}
		}
		tasks = next
	}
	for i := range tasks {
		tasks[i].weight = 1 / float64(len(tasks))
	}
	return tasks, nil
}

// runner holds what the workers of one run share.
type runner struct {
	p       *plan
	filter  Filter
	tasks   []task
	nextT   atomic.Int64
	stop    atomic.Bool
	emitted atomic.Int64
	limit   int64
	ctx     context.Context
	require []*molecule.Fragment
	forbid  []*molecule.Fragment
	seen    *Seen
	nodeCap int
	// ordered is set by Generate, whose consumer tests Seen in subtree
	// order so that a truncated run's output does not depend on timing.
	ordered bool
	// buffered is set by budgeted runs, which test Seen when a subtree's
	// structures are released.
	buffered bool

	allKekule bool
}

// taskNodeCap divides a node limit over the subtrees (0: no limit).
func taskNodeCap(limit int64, tasks int) int {
	if limit <= 0 || tasks == 0 {
		return 0
	}
	return int(max(1, limit/int64(tasks)))
}

// workerState is what one worker accumulates.
type workerState struct {
	s           *searcher
	out         outputBuilder
	generated   int64
	removed     [numRules]int64
	emitted     int64
	constrained int64
	duplicates  int64
	truncated   int
	nodes       int64
	canon       molecule.Canonicalizer
	key         []byte
}

func prepare(ctx context.Context, f molecule.Formula, opts Options) (*runner, int, error) {
	if err := ctx.Err(); err != nil {
		return nil, 0, err
	}
	if f.HeavyAtoms() > 0 && !f.EvenElectron() {
		return nil, 0, fmt.Errorf("isomers: formula %s has an odd number of electrons: no neutral closed-shell structure", f)
	}
	p, err := newPlan(f, &opts)
	if err != nil {
		return nil, 0, err
	}
	tasks, err := frontier(ctx, p)
	if err != nil {
		return nil, 0, err
	}
	w := opts.Workers
	if w <= 0 {
		w = runtime.GOMAXPROCS(0)
	}
	if w > len(tasks) && len(tasks) > 0 {
		w = len(tasks)
	}
	if w < 1 {
		w = 1
	}
	r := &runner{p: p, filter: opts.Filter, tasks: tasks, limit: opts.Limit, ctx: ctx, allKekule: opts.allKekule,
		nodeCap: taskNodeCap(opts.NodeLimit, len(tasks)),
		require: opts.Require, forbid: opts.Forbid, seen: opts.Seen}
	if r.seen == nil && p.ambiguous {
		r.seen = NewSeen()
	}
	return r, w, nil
}

// process runs the filter on a complete structure and reports whether it
// is to be emitted.
func (ws *workerState) process(r *runner, m *mol) bool {
	if !r.allKekule {
		if _, rep := ws.out.kekuleRepresentative(m); !rep {
			return false
		}
	}
	if r.seen != nil && !r.ordered && !r.buffered {
		if !r.seen.add(ws.hash(m)) {
			ws.duplicates++
			return false
		}
	}
	ws.generated++
	if rule := r.filter.check(&ws.out, m); rule >= 0 {
		ws.removed[rule]++
		return false
	}
	if len(r.require) > 0 || len(r.forbid) > 0 {
		g := ws.out.graph(m)
		for _, fr := range r.require {
			if !fr.Matches(g) {
				ws.constrained++
				return false
			}
		}
		for _, fr := range r.forbid {
			if fr.Matches(g) {
				ws.constrained++
				return false
			}
		}
	}
	return true
}

// claim reserves one emission slot under the limit.
func (r *runner) claim() bool {
	if r.limit <= 0 {
		return true
	}
	n := r.emitted.Add(1)
	if n > r.limit {
		r.stop.Store(true)
		return false
	}
	if n == r.limit {
		r.stop.Store(true)
	}
	return true
}

func (r *runner) poll() bool {
	if r.stop.Load() {
		return false
	}
	if r.ctx.Err() != nil {
		r.stop.Store(true)
		return false
	}
	return true
}

func (r *runner) newWorker() *workerState {
	ws := &workerState{s: newSearcher(r.p)}
	ws.s.poll = r.poll
	ws.s.nodeCap = r.nodeCap
	return ws
}

// hash returns the 128-bit hash of m's canonical key (see Seen).
func (ws *workerState) hash(m *mol) [16]byte {
	ws.key = ws.canon.AppendKey(ws.key[:0], ws.out.graph(m))
	h := sha256.Sum256(ws.key)
	var k [16]byte
	copy(k[:], h[:16])
	return k
}

// runTask searches one task's subtree.
func (ws *workerState) runTask(t *task) {
	s := ws.s
	s.stopped = false
	ws.nodes += int64(s.nodes)
	s.nodes = 0
	s.reset(t.assign, t.root, t.path)
	s.expand(t.weight)
	if s.truncated {
		ws.truncated++
		s.truncated = false
	}
}

func (r *runner) stats(workers []*workerState, covered float64, complete bool) Stats {
	st := Stats{Removed: map[string]int64{}}
	for _, ws := range workers {
		st.Generated += ws.generated
		st.Emitted += ws.emitted
		st.Constrained += ws.constrained
		st.Duplicates += ws.duplicates
		st.Truncated += ws.truncated
		st.Nodes += ws.nodes + int64(ws.s.nodes)
		for i, n := range ws.removed {
			if n > 0 {
				st.Removed[ruleTable[i].Name] += n
			}
		}
	}
	st.Complete = complete
	st.Fraction = covered
	if complete {
		st.Fraction = 1
	}
	if st.Fraction > 1 {
		st.Fraction = 1
	}
	return st
}

// GenerateConcurrent streams every constitutional isomer of f that passes
// opts.Filter to yield, calling it concurrently from opts.Workers
// goroutines (worker is 0..Workers-1) in no particular order. The graph
// belongs to yield only during the call; Clone it to keep it. Every graph
// is kekulised, neutral, connected and valence-satisfying, with implicit
// hydrogen counts; compounds whose Kekulé structures differ only by
// shifted double bonds in a Hückel ring system come once.
//
// Returning false from yield stops the run. The error is ctx.Err() if the
// context ended, or describes a formula the generator cannot handle (more
// than MaxAtoms heavy atoms, odd electron count); Stats is valid either way.
func GenerateConcurrent(ctx context.Context, f molecule.Formula, opts Options, yield func(worker int, g *molecule.Graph) bool) (Stats, error) {
	r, nw, err := prepare(ctx, f, opts)
	if err != nil {
		return Stats{Removed: map[string]int64{}}, err
	}
	if opts.NodeLimit > 0 {
		return r.budgeted(ctx, nw, opts.NodeLimit, yield)
	}
	workers := make([]*workerState, nw)
	covered := make([]float64, nw)
	// a fixed pseudo-random visiting order (see Stats.Fraction)
	order := rand.New(rand.NewPCG(0x5eed, uint64(len(r.tasks)))).Perm(len(r.tasks))
	var wg sync.WaitGroup
	for wi := 0; wi < nw; wi++ {
		ws := r.newWorker()
		workers[wi] = ws
		id := wi
		ws.s.emit = func(m *mol) bool {
			if !ws.process(r, m) {
				return !r.stop.Load()
			}
			if !r.claim() {
				return false
			}
			ws.emitted++
			if yield != nil && !yield(id, ws.out.graph(m)) {
				r.stop.Store(true)
				return false
			}
			return !r.stop.Load()
		}
		wg.Add(1)
		go func() {
			defer wg.Done()
			for !r.stop.Load() {
				ti := r.nextT.Add(1) - 1
				if ti >= int64(len(r.tasks)) {
					return
				}
				ws.s.covered = 0
				ws.runTask(&r.tasks[order[ti]])
				covered[id] += ws.s.covered
			}
		}()
	}
	wg.Wait()
	total := 0.0
	for _, c := range covered {
		total += c
	}
	complete := !r.stop.Load() && int(r.nextT.Load()) >= len(r.tasks)
	st := r.stats(workers, total, complete)
	if st.Truncated > 0 {
		st.Complete = false
		st.Fraction = min(st.Fraction, 1-1e-9)
	}
	if err := ctx.Err(); err != nil {
		st.Complete = false
		return st, err
	}
	return st, nil
}

// Count counts the structures GenerateConcurrent would emit, using all
// workers, without building graphs for them.
func Count(ctx context.Context, f molecule.Formula, opts Options) (Stats, error) {
	return GenerateConcurrent(ctx, f, opts, nil)
}

// result is one batch of structures handed from a worker to the
// consumer of Generate.
type result struct {
	data    []byte // encoded structures, see outputBuilder.encode
	count   int
	gen     int64
	removed [numRules]int64
	covered float64
	constr  int64
	dups    int64
}

// Generate streams every constitutional isomer of f that passes
// opts.Filter to yield, from the calling goroutine, in a deterministic
// order: the same formula and options give the same sequence whatever the
// number of workers. The search runs on opts.Workers goroutines; their
// results are buffered (bounded) and released in subtree order. The graph
// belongs to yield only during the call; Clone it to keep it. See
// GenerateConcurrent for the properties of the graphs and the errors.
func Generate(ctx context.Context, f molecule.Formula, opts Options, yield func(g *molecule.Graph) bool) (Stats, error) {
	r, nw, err := prepare(ctx, f, opts)
	if err != nil {
		return Stats{Removed: map[string]int64{}}, err
	}
	r.ordered = true
	chans := make([]chan *result, len(r.tasks))
	for i := range chans {
		chans[i] = make(chan *result, 4)
	}
	// Workers may run at most window subtrees ahead of the consumer, so
	// the buffered results stay bounded however slow yield is.
	window := 4*nw + 4
	tokens := make(chan struct{}, window)
	for i := 0; i < window; i++ {
		tokens <- struct{}{}
	}
	done := make(chan struct{}) // closed when the consumer stops
	var wg sync.WaitGroup
	wss := make([]*workerState, nw)
	for wi := 0; wi < nw; wi++ {
		ws := r.newWorker()
		wss[wi] = ws
		wg.Add(1)
		go func() {
			defer wg.Done()
			for {
				select {
				case <-tokens:
				case <-done:
					return
				}
				ti := r.nextT.Add(1) - 1
				if ti >= int64(len(r.tasks)) {
					return
				}
				ch := chans[ti]
				cur := &result{}
				flush := func() bool {
					cur.gen = ws.generated
					cur.removed = ws.removed
					cur.constr, cur.dups = ws.constrained, ws.duplicates
					ws.generated, ws.constrained, ws.duplicates = 0, 0, 0
					ws.removed = [numRules]int64{}
					cur.covered = ws.s.covered
					ws.s.covered = 0
					select {
					case ch <- cur:
					case <-done:
						r.stop.Store(true)
						return false
					}
					cur = &result{}
					return !r.stop.Load()
				}
				ws.s.emit = func(m *mol) bool {
					if !ws.process(r, m) {
						return !r.stop.Load()
					}
					cur.data = ws.out.encode(cur.data, m)
					if r.seen != nil {
						k := ws.hash(m)
						cur.data = append(cur.data, k[:]...)
					}
					cur.count++
					if cur.count == batchSize {
						return flush()
					}
					return !r.stop.Load()
				}
				ws.s.covered = 0
				if !r.stop.Load() {
					ws.runTask(&r.tasks[ti])
				}
				flush()
				close(ch)
			}
		}()
	}
	// consume in task order
	st := Stats{Removed: map[string]int64{}}
	var removed [numRules]int64
	covered := 0.0
	g := molecule.NewGraph(r.p.n)
	stopped := false
	for ti := 0; ti < len(chans) && !stopped; ti++ {
		for res := range chans[ti] {
			st.Generated += res.gen
			st.Constrained += res.constr
			st.Duplicates += res.dups
			for i, n := range res.removed {
				removed[i] += n
			}
			covered += res.covered
			off := 0
			for i := 0; i < res.count; i++ {
				off = decode(res.data, off, g)
				if r.seen != nil {
					var k [16]byte
					copy(k[:], res.data[off:off+16])
					off += 16
					if !r.seen.add(k) {
						st.Duplicates++
						st.Generated--
						continue
					}
				}
				st.Emitted++
				if !yield(g) || (r.limit > 0 && st.Emitted >= r.limit) || ctx.Err() != nil {
					stopped = true
					break
				}
			}
			if stopped {
				break
			}
		}
		if !stopped {
			tokens <- struct{}{}
		}
	}
	r.stop.Store(true)
	close(done)
	wg.Wait()
	for _, ws := range wss {
		st.Truncated += ws.truncated
		st.Nodes += ws.nodes + int64(ws.s.nodes)
	}
	for i, n := range removed {
		if n > 0 {
			st.Removed[ruleTable[i].Name] = n
		}
	}
	st.Fraction = covered
	st.Complete = !stopped && ctx.Err() == nil && st.Truncated == 0
	if st.Complete {
		st.Fraction = 1
	} else if st.Truncated > 0 {
		st.Fraction = min(st.Fraction, 1-1e-9)
	}
	if st.Fraction > 1 {
		st.Fraction = 1
	}
	if err := ctx.Err(); err != nil {
		st.Complete = false
		return st, err
	}
	return st, nil
}

// taskResult holds what one subtree produced under a node cap.
type taskResult struct {
	data      []byte // encoded structures, each followed by its 16-byte hash when deduplicating
	count     int
	gen       int64
	removed   [numRules]int64
	constr    int64
	nodes     int64
	covered   float64
	truncated bool
}

// budgeted runs GenerateConcurrent under a node limit in rounds: every
// subtree first gets an equal share of the limit; the subtrees that
// finish release their structures, and those cut short are run again
// from the start with the budget left divided among them, until none is
// cut short or the share stops growing, when the last round's partial
// results are released. Each round's caps depend only on the earlier
// rounds' node counts, so the structures emitted do not depend on the
// number of workers or on timing.
func (r *runner) budgeted(ctx context.Context, nw int, limit int64, yield func(int, *molecule.Graph) bool) (Stats, error) {
	r.buffered = true
	if len(r.tasks) == 0 {
		return Stats{Removed: map[string]int64{}, Complete: ctx.Err() == nil, Fraction: 1}, ctx.Err()
	}
	workers := make([]*workerState, nw)
	for wi := range workers {
		workers[wi] = r.newWorker()
	}
	results := make([]taskResult, len(r.tasks))
	pending := make([]int, len(r.tasks))
	for i := range pending {
		pending[i] = i
	}
	st := Stats{Removed: map[string]int64{}}
	var removed [numRules]int64
	used := int64(0)
	cap := max(1, limit/int64(len(r.tasks)))
	var mu sync.Mutex // serialises releases (Seen, Limit, counters)
	graphs := make([]*molecule.Graph, nw)
	stopped := false
	release := func(w int, res *taskResult) {
		mu.Lock()
		defer mu.Unlock()
		st.Generated += res.gen
		st.Constrained += res.constr
		for i, n := range res.removed {
			removed[i] += n
		}
		if graphs[w] == nil {
			graphs[w] = molecule.NewGraph(r.p.n)
		}
		g := graphs[w]
		off := 0
		released := 0
		defer func() {
			if res.count > 0 {
				st.Fraction += res.covered * float64(released) / float64(res.count)
			} else if !stopped {
				st.Fraction += res.covered
			}
		}()
		for i := 0; i < res.count && !stopped; i++ {
			released++
			off = decode(res.data, off, g)
			if r.seen != nil {
				var k [16]byte
				copy(k[:], res.data[off:off+16])
				off += 16
				if !r.seen.add(k) {
					st.Duplicates++
					st.Generated--
					continue
				}
			}
			if r.limit > 0 && st.Emitted >= r.limit {
				stopped = true
				break
			}
			st.Emitted++
			if yield != nil && !yield(w, g) {
				stopped = true
			}
		}
		res.data = nil
	}
	for len(pending) > 0 && !stopped && ctx.Err() == nil {
		var next atomic.Int64
		var wg sync.WaitGroup
		for wi, ws := range workers {
			ws.s.nodeCap = int(min(cap, int64(1)<<40))
			w := wi
			wg.Add(1)
			go func() {
				defer wg.Done()
				for !r.stop.Load() && ctx.Err() == nil {
					k := next.Add(1) - 1
					if k >= int64(len(pending)) {
						return
					}
					ti := pending[k]
					res := &results[ti]
					*res = taskResult{}
					ws.s.emit = func(m *mol) bool {
						if !ws.process(r, m) {
							return true
						}
						res.data = ws.out.encode(res.data, m)
						if r.seen != nil {
							h := ws.hash(m)
							res.data = append(res.data, h[:]...)
						}
						res.count++
						return true
					}
					g0, c0 := ws.generated, ws.constrained
					rm0 := ws.removed
					n0 := ws.nodes + int64(ws.s.nodes)
					t0 := ws.truncated
					ws.s.covered = 0
					ws.runTask(&r.tasks[ti])
					res.gen, res.constr = ws.generated-g0, ws.constrained-c0
					for i := range res.removed {
						res.removed[i] = ws.removed[i] - rm0[i]
					}
					res.nodes = ws.nodes + int64(ws.s.nodes) - n0
					res.truncated = ws.truncated > t0
					res.covered = ws.s.covered
					if !res.truncated {
						release(w, res)
						if stopped {
							r.stop.Store(true)
						}
					}
				}
			}()
		}
		wg.Wait()
		var again []int
		for _, ti := range pending {
			used += results[ti].nodes
			if results[ti].truncated {
				again = append(again, ti)
			}
		}
		st.Nodes = used
		pending = again
		if len(pending) == 0 {
			break
		}
		share := (limit - used) / int64(len(pending))
		if share <= cap {
			// no more room to grow: release the partial results of
			// this round's cut subtrees
			for _, ti := range pending {
				res := &results[ti]
				st.Truncated++
				if !stopped {
					release(0, res)
				}
			}
			break
		}
		cap = share
	}
	for i, n := range removed {
		if n > 0 {
			st.Removed[ruleTable[i].Name] = n
		}
	}
	st.Complete = st.Truncated == 0 && !stopped && ctx.Err() == nil && !r.stop.Load()
	if st.Complete {
		st.Fraction = 1
	} else {
		st.Fraction = min(max(st.Fraction, 0), 1-1e-9)
	}
	if err := ctx.Err(); err != nil {
		st.Complete = false
		return st, err
	}
	return st, nil
}
