package predict

import (
	"fmt"
	"math"
	"math/bits"
	"sort"

	"gonum.org/v1/gonum/mat"
)

// MaxSpinSystem is the largest coupled spin system (number of 1H spins) that
// Simulate treats with the full spin Hamiltonian; larger strongly coupled
// systems fall back to first order with a note.
const MaxSpinSystem = 10

// strongRatio is the Δν/J below which a pair of coupled environments is
// strongly coupled and not first order (common practice: first-order
// patterns need Δν/J of about 10 or more; Friebolin, "Basic One- and
// Two-Dimensional NMR Spectroscopy", ch. 4).
const strongRatio = 10.0

// exchangeableWidthHz is the line width used for exchangeable hydrogens in a
// simulated trace (broad singlets; common practice, a few tens of Hz).
const exchangeableWidthHz = 15.0

// SimOptions configures Simulate. Zero values take the defaults.
type SimOptions struct {
	MHz         float64 // spectrometer frequency, default 400
	LineWidthHz float64 // Lorentzian full width at half height, default 1.0
	PPMMin      float64 // trace range; default -0.5 .. 13.0 ppm
	PPMMax      float64
	Points      int // number of trace points, default 8192
	// FirstOrder forces first-order multiplets everywhere.
	FirstOrder bool
}

// Line is one transition of a simulated spectrum.
type Line struct {
	PPM       float64 `json:"ppm"`
	Intensity float64 `json:"intensity"` // area, in hydrogens (all lines sum to the H count)
	Env       int     `json:"env"`       // environment the line belongs to, -1 if mixed
}

// Trace is a simulated spectrum: intensity sampled on an evenly spaced ppm
// axis (PPM ascending from PPMMin to PPMMax), and the individual lines.
type Trace struct {
	PPM       []float64 `json:"ppm"`
	Intensity []float64 `json:"intensity"` // sum of area-normalised Lorentzians, per ppm
	Lines     []Line    `json:"lines"`
	Notes     []string  `json:"notes,omitempty"`
}

// Simulate computes a line spectrum of s. Environments that are coupled to
// each other form spin systems; a spin system with a pair of coupled
// environments closer than Δν/J = 10 is strongly coupled and is computed
// exactly from the spin Hamiltonian (shifts and J) when it has at most
// MaxSpinSystem spins, first order otherwise (with a note). For a Spectrum
// predicted with Options.Explain the Hamiltonian uses the couplings between
// individual atoms' hydrogens (so an AA'BB' ring keeps its distinct ortho
// and para couplings); otherwise, and for a Spectrum built by hand, the
// spins of one environment share the mean of its couplings. Strongly
// coupled systems with resolved 19F/31P couplings are drawn first order.
// Exchangeable hydrogens are broad singlets. The total line area equals the
// H count.
func Simulate(s *Spectrum, opts SimOptions) Trace {
	if !(opts.MHz > 0) {
		opts.MHz = DefaultMHz
	}
	if !(opts.LineWidthHz > 0) {
		opts.LineWidthHz = DefaultLineWidthHz
	}
	if opts.PPMMin == 0 && opts.PPMMax == 0 {
		opts.PPMMin, opts.PPMMax = -0.5, 13.0
	}
	if opts.PPMMax <= opts.PPMMin {
		opts.PPMMin, opts.PPMMax = opts.PPMMax, opts.PPMMin
		if opts.PPMMax == opts.PPMMin {
			opts.PPMMax = opts.PPMMin + 1
		}
	}
	if opts.Points < 2 {
		opts.Points = 8192
	}
	var tr Trace
	if s == nil {
		return tr
	}
	envs := s.Environments
	type broad struct{ ppm, area float64 }
	var broads []broad

	// Spin systems: connected components of homonuclear couplings.
	comp := make([]int, len(envs))
	for i := range comp {
		comp[i] = -1
	}
	nComp := 0
	for i := range envs {
		if comp[i] >= 0 {
			continue
		}
		stack := []int{i}
		comp[i] = nComp
		for len(stack) > 0 {
			e := stack[len(stack)-1]
			stack = stack[:len(stack)-1]
			for _, c := range envs[e].Couplings {
				if c.Env >= 0 && c.Env < len(envs) && comp[c.Env] < 0 {
					comp[c.Env] = nComp
					stack = append(stack, c.Env)
				}
			}
		}
		nComp++
	}
	members := make([][]int, nComp)
	for i, c := range comp {
		members[c] = append(members[c], i)
	}
	for _, mem := range members {
		if len(mem) == 1 && envs[mem[0]].Exchangeable {
			broads = append(broads, broad{envs[mem[0]].Shift, float64(envs[mem[0]].H)})
			continue
		}
		strong := false
		spins := 0
		for _, e := range mem {
			spins += envs[e].H
			for _, c := range envs[e].Couplings {
				if c.Env < 0 || c.J <= 0 {
					continue
				}
				dnu := math.Abs(envs[e].Shift-envs[c.Env].Shift) * opts.MHz
				if dnu/c.J < strongRatio {
					strong = true
				}
			}
		}
		if strong && !opts.FirstOrder && spins <= MaxSpinSystem && !hasHetero(envs, mem) {
			var lines []Line
			var err error
			if s.spins != nil {
				lines, err = exactGroupLines(envs, s.spins, mem, opts.MHz)
			} else {
				lines, err = exactLines(envs, mem, opts.MHz)
			}
			if err == nil {
				tr.Lines = append(tr.Lines, lines...)
				continue
			}
			tr.Notes = append(tr.Notes, fmt.Sprintf("spin system of environments %v: %v; first-order fallback", mem, err))
		} else if strong && !opts.FirstOrder {
			why := fmt.Sprintf("%d spins (more than %d)", spins, MaxSpinSystem)
			if spins <= MaxSpinSystem {
				why = "couplings to 19F/31P"
			}
			tr.Notes = append(tr.Notes, fmt.Sprintf("strongly coupled spin system of environments %v: %s, first-order fallback", mem, why))
		}
		for _, e := range mem {
			tr.Lines = append(tr.Lines, firstOrderLines(envs[e], opts.MHz)...)
		}
	}
	sort.SliceStable(tr.Lines, func(i, j int) bool { return tr.Lines[i].PPM < tr.Lines[j].PPM })

	n := opts.Points
	tr.PPM = make([]float64, n)
	tr.Intensity = make([]float64, n)
	step := (opts.PPMMax - opts.PPMMin) / float64(n-1)
	for i := range tr.PPM {
		tr.PPM[i] = opts.PPMMin + float64(i)*step
	}
	add := func(ppm, area, widthHz float64) {
		// Area-normalised Lorentzian in ppm units.
		hw := widthHz / 2 / opts.MHz
		lo := int((ppm - 60*hw - opts.PPMMin) / step)
		hi := int((ppm+60*hw-opts.PPMMin)/step) + 1
		lo = max(lo, 0)
		hi = min(hi, n-1)
		for i := lo; i <= hi; i++ {
			d := tr.PPM[i] - ppm
			tr.Intensity[i] += area * hw / math.Pi / (d*d + hw*hw)
		}
	}
	for _, l := range tr.Lines {
		add(l.PPM, l.Intensity, opts.LineWidthHz)
	}
	for _, b := range broads {
		tr.Lines = append(tr.Lines, Line{PPM: b.ppm, Intensity: b.area, Env: -1})
		add(b.ppm, b.area, exchangeableWidthHz)
	}
	return tr
}

func hasHetero(envs []Environment, mem []int) bool {
	for _, e := range mem {
		for _, c := range envs[e].Couplings {
			if c.Env < 0 && c.Resolved {
				return true
			}
		}
	}
	return false
}

// firstOrderLines splits the environment's signal by each resolved coupling
// in turn (N equivalent spin-1/2 nuclei give N+1 lines with binomial
// intensities).
func firstOrderLines(e Environment, mhz float64) []Line {
	type pl struct{ hz, w float64 }
	lines := []pl{{e.Shift * mhz, float64(e.H)}}
	if !e.Exchangeable {
		for _, c := range e.Couplings {
			if !c.Resolved || c.N <= 0 {
				continue
			}
			next := make([]pl, 0, len(lines)*(c.N+1))
			norm := math.Ldexp(1, -c.N)
			for _, l := range lines {
				for k := 0; k <= c.N; k++ {
					off := (float64(k) - float64(c.N)/2) * c.J
					next = append(next, pl{l.hz + off, l.w * binom(c.N, k) * norm})
				}
			}
			lines = next
		}
	}
	out := make([]Line, len(lines))
	for i, l := range lines {
		out[i] = Line{PPM: l.hz / mhz, Intensity: l.w, Env: e.ID}
	}
	return out
}

func binom(n, k int) float64 {
	r := 1.0
	for i := 1; i <= k; i++ {
		r = r * float64(n-k+i) / float64(i)
	}
	return r
}

// exactGroupLines solves the spin system of environments mem from the
// group-level couplings recorded by Predict.
func exactGroupLines(envs []Environment, st *spinTable, mem []int, mhz float64) ([]Line, error) {
	inMem := make(map[int]bool, len(mem))
	for _, e := range mem {
		inMem[e] = true
	}
	first := make(map[int]int) // group -> first spin
	var nu []float64
	for gi, gr := range st.groups {
		if !inMem[gr.env] {
			continue
		}
		first[gi] = len(nu)
		for k := 0; k < gr.h; k++ {
			nu = append(nu, envs[gr.env].Shift*mhz)
		}
	}
	n := len(nu)
	J := make([][]float64, n)
	for i := range J {
		J[i] = make([]float64, n)
	}
	for _, pr := range st.pairs {
		fa, oka := first[pr.a]
		fb, okb := first[pr.b]
		if !oka || !okb {
			continue
		}
		for x := 0; x < st.groups[pr.a].h; x++ {
			for y := 0; y < st.groups[pr.b].h; y++ {
				J[fa+x][fb+y] = pr.j
				J[fb+y][fa+x] = pr.j
			}
		}
	}
	return solveLines(envs, mem, nu, J, mhz)
}

// exactLines builds one spin per hydrogen of the member environments and
// solves the spin system. Spins of one environment are treated as
// magnetically equivalent (same coupling to every spin of another
// environment, the mean of that environment's couplings).
func exactLines(envs []Environment, mem []int, mhz float64) ([]Line, error) {
	idx := make(map[int]int, len(mem)) // env -> first spin
	var nu []float64
	for _, e := range mem {
		idx[e] = len(nu)
		for k := 0; k < envs[e].H; k++ {
			nu = append(nu, envs[e].Shift*mhz)
		}
	}
	n := len(nu)
	J := make([][]float64, n)
	for i := range J {
		J[i] = make([]float64, n)
	}
	for _, e := range mem {
		// Total coupling of one spin of e to environment f, spread evenly
		// over f's spins.
		tot := map[int]float64{}
		for _, c := range envs[e].Couplings {
			if c.Env >= 0 {
				tot[c.Env] += c.J * float64(c.N)
			}
		}
		for f, sum := range tot {
			jf := sum / float64(envs[f].H)
			for a := 0; a < envs[e].H; a++ {
				for b := 0; b < envs[f].H; b++ {
					i, j := idx[e]+a, idx[f]+b
					// Average the two directions (they agree for a
					// consistent Spectrum).
					if J[i][j] == 0 {
						J[i][j], J[j][i] = jf, jf
					} else {
						J[i][j] = (J[i][j] + jf) / 2
						J[j][i] = J[i][j]
					}
				}
			}
		}
	}
	return solveLines(envs, mem, nu, J, mhz)
}

// solveLines diagonalises the spin system and returns its lines, with
// areas normalised to the number of spins.
func solveLines(envs []Environment, mem []int, nu []float64, J [][]float64, mhz float64) ([]Line, error) {
	n := len(nu)
	tl, err := SpinTransitions(nu, J)
	if err != nil {
		return nil, err
	}
	total := 0.0
	for _, t := range tl {
		total += t.Intensity
	}
	kept := 0.0
	for _, t := range tl {
		if t.Intensity >= 1e-6*total {
			kept += t.Intensity
		}
	}
	total = kept
	out := make([]Line, 0, len(tl))
	for _, t := range tl {
		if t.Intensity < 1e-6*kept {
			continue
		}
		// Attribute the line to the environment whose shift is nearest.
		best, bd := -1, math.Inf(1)
		for _, e := range mem {
			if d := math.Abs(envs[e].Shift*mhz - t.Hz); d < bd {
				best, bd = e, d
			}
		}
		out = append(out, Line{PPM: t.Hz / mhz, Intensity: t.Intensity * float64(n) / total, Env: best})
	}
	return out, nil
}

// Transition is a line of an exactly solved spin system.
type Transition struct {
	Hz        float64 // transition frequency, Hz (same origin as the spin frequencies)
	Intensity float64 // relative intensity |<f|F+|i>|²
}

// SpinTransitions solves the spin-1/2 Hamiltonian
//
//	H = Σ ν_i I_zi + Σ_{i<j} J_ij I_i·I_j   (all in Hz)
//
// for len(nu) spins with frequencies nu (Hz) and the symmetric coupling
// matrix J (Hz; only the upper triangle is read), and returns the allowed
// (ΔM = 1) transitions with their intensities, sorted by frequency. The
// Hamiltonian conserves the total Fz, so each Fz block is diagonalised
// separately with gonum's symmetric eigensolver. Intensities sum to
// n·2^(n-1). It returns an error for more than MaxSpinSystem+4 spins, a J
// matrix of the wrong shape, or a failed diagonalisation.
func SpinTransitions(nu []float64, J [][]float64) ([]Transition, error) {
	n := len(nu)
	if n == 0 {
		return nil, nil
	}
	if n > MaxSpinSystem+4 {
		return nil, fmt.Errorf("predict: %d spins exceeds the exact-simulation limit", n)
	}
	if len(J) != n {
		return nil, fmt.Errorf("predict: coupling matrix has %d rows for %d spins", len(J), n)
	}
	for i := range J {
		if len(J[i]) != n {
			return nil, fmt.Errorf("predict: coupling matrix row %d has %d entries for %d spins", i, len(J[i]), n)
		}
	}
	// Basis state bit i set = spin i is α (m = +1/2). Block k holds the
	// states with k α spins (M = k - n/2).
	blocks := make([][]uint32, n+1)
	pos := make([]int, 1<<n)
	for s := uint32(0); s < 1<<n; s++ {
		k := bits.OnesCount32(s)
		pos[s] = len(blocks[k])
		blocks[k] = append(blocks[k], s)
	}
	energies := make([][]float64, n+1)
	vectors := make([]*mat.Dense, n+1)
	for k := 0; k <= n; k++ {
		states := blocks[k]
		d := len(states)
		h := mat.NewSymDense(d, nil)
		for a, s := range states {
			e := 0.0
			for i := 0; i < n; i++ {
				mi := -0.5
				if s&(1<<i) != 0 {
					mi = 0.5
				}
				e += nu[i] * mi
				for j := i + 1; j < n; j++ {
					mj := -0.5
					if s&(1<<j) != 0 {
						mj = 0.5
					}
					e += J[i][j] * mi * mj
				}
			}
			h.SetSym(a, a, e)
			// Flip-flop terms: J/2 between states differing by swapping
			// an αβ pair.
			for i := 0; i < n; i++ {
				for j := i + 1; j < n; j++ {
					if J[i][j] == 0 {
						continue
					}
					bi, bj := s&(1<<i) != 0, s&(1<<j) != 0
					if bi == bj {
						continue
					}
					t := s ^ (1 << i) ^ (1 << j)
					b := pos[t]
					if b > a {
						h.SetSym(a, b, J[i][j]/2)
					}
				}
			}
		}
		var es mat.EigenSym
		if !es.Factorize(h, true) {
			return nil, fmt.Errorf("predict: eigen decomposition of a %d×%d spin block did not converge", d, d)
		}
		energies[k] = es.Values(nil)
		v := mat.NewDense(d, d, nil)
		es.VectorsTo(v)
		vectors[k] = v
	}
	var out []Transition
	for k := 0; k < n; k++ {
		lo, hi := blocks[k], blocks[k+1]
		// F+ in the product basis: from state s (block k) to s|bit i.
		fp := mat.NewDense(len(hi), len(lo), nil)
		for a, s := range lo {
			for i := 0; i < n; i++ {
				if s&(1<<i) == 0 {
					fp.Set(pos[s|1<<i], a, 1)
				}
			}
		}
		// T = V_hi^T · F+ · V_lo
		var tmp, t mat.Dense
		tmp.Mul(fp, vectors[k])
		t.Mul(vectors[k+1].T(), &tmp)
		for f := range hi {
			for i := range lo {
				amp := t.At(f, i)
				inten := amp * amp
				if inten < 1e-10 {
					continue
				}
				out = append(out, Transition{Hz: energies[k+1][f] - energies[k][i], Intensity: inten})
			}
		}
	}
	sort.Slice(out, func(i, j int) bool { return out[i].Hz < out[j].Hz })
	return out, nil
}
