package predict

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"shiftrank/molecule"
)

// battery covers ordinary molecules and the oddities the isomer generator
// can make: hypervalent S and P, Si, B, allenes, cumulenes, ketenes, small
// and strained rings, N–N, N–O, peroxides, enols, heteroaromatics, charged
// atoms.
var battery = []string{
	"CCO", "CC(=O)OCC", "CN(C)C=O", "CC(C)(C)OC", "c1ccccc1", "Cc1ccccc1", "c1ccncc1", "C1CCOC1",
	"CS(=O)(=O)C", "CS(=O)C", "OS(=O)(=O)O", "CS(C)(C)C", "C=S(=O)=O", "CS(=O)(=O)N", "CSSC", "CS", "S",
	"CP(C)C", "CP(=O)(C)C", "OP(O)O", "CP(C)(C)(C)C", "C=P(C)(C)C", "P", "CP=O", "COP(=O)(OC)OC", "O=[PH](O)O",
	"C[SiH3]", "[SiH4]", "C[Si](C)(C)O", "C=[SiH2]", "C[SiH](C)C",
	"CB(C)C", "OB(O)c1ccccc1", "B", "CBO", "B1OCCO1",
	"C=C=C", "CC=C=CC", "C=C=CC(C)=O", "C=C=C=C", "C=C=O", "CC=C=NC", "C=C=C=C=C",
	"C1CC1", "C1=CC1", "C1CCC1", "C1CO1", "C1CN1", "C1CS1", "C12CC1C2", "C1=CCC1", "CC1(C)CC1", "C1CC1C=O",
	"NN", "CNNC", "CN=NC", "C=NN", "CC=NNC(C)=O", "N=N",
	"NO", "CON", "CN=O", "CC=NO", "ON=O", "CN(C)O", "C1CON1",
	"OO", "COOC", "CC(C)(C)OO", "C1OOC1",
	"C=CO", "CC(O)=CC(C)=O", "OC=CO",
	"O", "N", "Cl", "F", "C#N", "C=O", "C", "C#C", "C=C", "CC#CC", "C#CC#C",
	"C[N+](C)(C)C", "C[O-]", "[CH3-]", "C[NH3+]",
	"c1ccc2ccccc2c1", "c1ccc2[nH]ccc2c1", "c1ccncn1", "c1cnccn1", "c1nnn[nH]1", "c1cocn1", "c1ccsc1",
	"o1cccc1", "O=Cc1ccccn1", "c1ccc(cc1)-c1ccccc1", "c1cc[nH]c1", "c1cn[nH]c1", "c1c[nH]cn1", "c1cscn1",
	"C1=CC=CC=CC=C1", "C1=CC=C1", "Fc1c(F)c(F)c(F)c(F)c1F", "O=C1C=CC(=O)C=C1", "O=c1cccc[nH]1",
	"NC(=O)N", "CNC(=O)OC", "O=C1CCCN1", "CC(=O)N1CCCC1", "O=C(N)c1ccccc1", "CC(=O)NC(C)=O",
	"FC(F)(F)C(F)(F)F", "FCF", "ClC(Cl)(Cl)Cl", "ICI", "BrC=CBr", "FC=C", "C(F)(F)=C",
	"CC(C)(C)C(C)(C)C", "CCCCCCCCCCCC", "OCC(O)C(O)CO", "C1CC2CCC1C2", "C1CC2CC1CC2",
	"CC(O)C(C)O", "CC(Cl)C(C)Cl", "CSC(=S)SC", "NC(=S)N", "CC(=S)C", "SC=S", "C=NC", "N#CC#N",
}

func mustParse(t testing.TB, s string) *molecule.Graph {
	t.Helper()
	g, err := molecule.ParseSMILES(s)
	if err != nil {
		t.Fatalf("ParseSMILES(%q): %v", s, err)
	}
	return g
}

// checkSpectrum verifies the invariants every prediction must satisfy.
func checkSpectrum(t testing.TB, name string, g *molecule.Graph, sp *Spectrum, explain bool) {
	t.Helper()
	if got, want := sp.HydrogenCount(), g.HydrogenCount(); got != want {
		t.Errorf("%s: integrations add up to %d H, formula has %d", name, got, want)
	}
	for i, e := range sp.Environments {
		if e.ID != i {
			t.Errorf("%s: env %d has ID %d", name, i, e.ID)
		}
		if e.H <= 0 || len(e.Atoms) == 0 || e.Kind == "" || e.Multiplicity == "" {
			t.Errorf("%s: env %d incomplete: %+v", name, i, e)
		}
		for _, v := range []float64{e.Shift, e.Sigma, e.ShiftMin, e.ShiftMax} {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				t.Errorf("%s: env %d has a non-finite value: %+v", name, i, e)
			}
		}
		if !(e.Sigma > 0) || e.ShiftMin > e.Shift+1e-9 || e.ShiftMax < e.Shift-1e-9 {
			t.Errorf("%s: env %d sigma/range inconsistent: σ %.2f, %.2f in [%.2f, %.2f]", name, i, e.Sigma, e.Shift, e.ShiftMin, e.ShiftMax)
		}
		if e.Shift < -2 || e.Shift > 20 {
			t.Errorf("%s: env %d shift %.2f out of the 1H range", name, i, e.Shift)
		}
		for _, c := range e.Couplings {
			if c.Env >= len(sp.Environments) || c.Env == i || c.N <= 0 || !(c.J > 0) {
				t.Errorf("%s: env %d bad coupling %+v", name, i, c)
			}
			if e.Exchangeable {
				t.Errorf("%s: exchangeable env %d has a coupling %+v", name, i, c)
			}
			if c.Env >= 0 && sp.Environments[c.Env].Exchangeable {
				t.Errorf("%s: env %d is split by exchangeable env %d", name, i, c.Env)
			}
		}
		if explain {
			if len(e.Breakdown) == 0 {
				t.Errorf("%s: env %d has no breakdown", name, i)
			}
			sum := 0.0
			for _, b := range e.Breakdown {
				sum += b.PPM
			}
			if math.Abs(sum-e.Shift) > 0.02 {
				t.Errorf("%s: env %d breakdown sums to %.3f, shift %.3f: %+v", name, i, sum, e.Shift, e.Breakdown)
			}
		}
	}
}

// TestBatteryInvariants: every molecule of the battery gets a complete
// prediction whose integrations add up to the formula's H count.
func TestBatteryInvariants(t *testing.T) {
	for _, explain := range []bool{false, true} {
		p := New(Options{Explain: explain})
		for _, s := range battery {
			g := mustParse(t, s)
			sp, err := p.Predict(g)
			if err != nil {
				t.Errorf("Predict(%q): %v", s, err)
				continue
			}
			checkSpectrum(t, s, g, sp, explain)
		}
	}
}

// permute returns g with its atoms renumbered by a random permutation and
// its bonds shuffled.
func permute(g *molecule.Graph, r *rand.Rand) *molecule.Graph {
	n := len(g.Atoms)
	perm := r.Perm(n)
	h := molecule.NewGraph(n)
	inv := make([]int, n)
	for newIdx, old := range perm {
		inv[old] = newIdx
	}
	for _, old := range perm {
		a := g.Atoms[old]
		i := h.AddAtom(a.Element, a.HCount)
		h.Atoms[i].Charge = a.Charge
	}
	bonds := slices.Clone(g.Bonds)
	r.Shuffle(len(bonds), func(i, j int) { bonds[i], bonds[j] = bonds[j], bonds[i] })
	for _, b := range bonds {
		h.MustAddBond(inv[b.A], inv[b.B], b.Order)
	}
	return h
}

func signature(sp *Spectrum) []string {
	var out []string
	for _, e := range sp.Environments {
		out = append(out, fmt.Sprintf("%.3f/%.3f/%d/%s/%v/%v/%v", e.Shift, e.Sigma, e.H, e.Multiplicity, e.J, e.Exchangeable, e.Diastereotopic))
	}
	slices.Sort(out)
	return out
}

// TestRenumberingInvariance: the prediction depends on the constitution
// only, not on atom numbering or bond order in the graph.
func TestRenumberingInvariance(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	p := New(Options{})
	for _, s := range battery {
		g := mustParse(t, s)
		sp, err := p.Predict(g)
		if err != nil {
			t.Fatal(err)
		}
		want := signature(sp)
		for k := 0; k < 3; k++ {
			h := permute(g, r)
			sp2, err := p.Predict(h)
			if err != nil {
				t.Fatal(err)
			}
			if got := signature(sp2); !slices.Equal(got, want) {
				t.Errorf("%s renumbered: %v, want %v", s, got, want)
				break
			}
		}
	}
}

// TestSymmetryEquivalence: atoms in one automorphism orbit (exact, from
// molecule.Canonicalize) carry identical predictions.
func TestSymmetryEquivalence(t *testing.T) {
	p := New(Options{})
	for _, s := range battery {
		g := mustParse(t, s)
		sp, err := p.Predict(g)
		if err != nil {
			t.Fatal(err)
		}
		orb := molecule.Canonicalize(g).Orbits
		// Amide N-substituents are split on purpose (restricted rotation).
		w := new(work)
		m := w.analyse(g)
		amide := map[int]bool{}
		for _, gr := range p.makeGroups(m, nil) {
			if gr.syn+gr.anti > 0 {
				amide[gr.atom] = true
			}
		}
		sig := func(a int) string {
			var v []string
			for _, e := range sp.Environments {
				if containsInt(e.Atoms, a) {
					v = append(v, fmt.Sprintf("%d", e.ID))
				}
			}
			return fmt.Sprint(v)
		}
		for a := range g.Atoms {
			if g.Atoms[a].HCount == 0 || orb[a] == a || amide[a] {
				continue
			}
			if sig(a) != sig(orb[a]) {
				t.Errorf("%s: atoms %d and %d are symmetry-equivalent but in environments %s and %s", s, a, orb[a], sig(a), sig(orb[a]))
			}
		}
	}
}

func TestPredictErrors(t *testing.T) {
	p := New(Options{})
	if _, err := p.Predict(nil); err != ErrEmpty {
		t.Errorf("nil graph: %v, want ErrEmpty", err)
	}
	g := molecule.NewGraph(1)
	g.AddAtom(molecule.Element(200), 0)
	if _, err := p.Predict(g); err == nil {
		t.Error("unknown element: want error")
	}
}

// FuzzPredict builds random valence-satisfying graphs from the fuzz input
// and checks that Predict never panics and the integrations add up.
func FuzzPredict(f *testing.F) {
	f.Add([]byte{3, 3, 5, 1, 0, 2, 3, 1})
	f.Add([]byte{3, 9, 9, 5, 4, 8, 2, 2, 2, 1, 0, 7})
	f.Add([]byte("shiftrank predict fuzz seed"))
	p := New(Options{Explain: true})
	elems := []molecule.Element{molecule.C, molecule.C, molecule.C, molecule.N, molecule.O, molecule.S, molecule.P,
		molecule.Si, molecule.B, molecule.F, molecule.Cl, molecule.Br, molecule.I}
	f.Fuzz(func(t *testing.T, data []byte) {
		g := randomGraph(data, elems)
		if g == nil {
			return
		}
		sp, err := p.Predict(g)
		if err != nil {
			t.Fatalf("Predict: %v", err)
		}
		checkSpectrum(t, g.SMILES(), g, sp, true)
	})
}

// randomGraph decodes bytes into a connected graph: each new atom bonds to
// an earlier one with an order that fits both valences; optional extra
// bonds close rings; hydrogens fill each atom up to its lowest allowed
// valence.
func randomGraph(data []byte, elems []molecule.Element) *molecule.Graph {
	if len(data) < 2 {
		return nil
	}
	n := 1 + int(data[0])%12
	pos := 1
	next := func() int {
		if pos >= len(data) {
			return 0
		}
		v := int(data[pos])
		pos++
		return v
	}
	g := molecule.NewGraph(n)
	maxV := func(i int) int { return g.Atoms[i].Element.MaxValence() }
	used := make([]int, 0, n)
	for i := 0; i < n; i++ {
		e := elems[next()%len(elems)]
		g.AddAtom(e, 0)
		used = append(used, 0)
		if i == 0 {
			continue
		}
		j := next() % i
		o := 1 + next()%3
		o = min(o, maxV(i)-used[i], maxV(j)-used[j])
		if o < 1 {
			// attach to any atom with room, or give up on this atom
			found := false
			for k := 0; k < i; k++ {
				if maxV(k)-used[k] >= 1 && maxV(i)-used[i] >= 1 {
					j, o, found = k, 1, true
					break
				}
			}
			if !found {
				g.Atoms = g.Atoms[:i]
				used = used[:i]
				g.RebuildAdjacency()
				break
			}
		}
		g.MustAddBond(i, j, molecule.Order(o))
		used[i] += o
		used[j] += o
	}
	for k := next() % 3; k > 0; k-- {
		a, b := next()%len(g.Atoms), next()%len(g.Atoms)
		if a != b && g.BondBetween(a, b) < 0 && used[a] < maxV(a) && used[b] < maxV(b) {
			g.MustAddBond(a, b, molecule.Single)
			used[a]++
			used[b]++
		}
	}
	for i := range g.Atoms {
		for _, v := range g.Atoms[i].Element.Valences() {
			if v >= used[i] {
				g.Atoms[i].HCount = min(v-used[i], 4)
				break
			}
		}
	}
	return g
}

// TestExplainDoesNotChangeNumbers: Explain only adds text; shifts,
// multiplicities and couplings are the same with it off (the ranker scores
// with it off and shows the explained prediction).
func TestExplainDoesNotChangeNumbers(t *testing.T) {
	quiet, loud := New(Options{}), New(Options{Explain: true})
	for _, s := range battery {
		g := mustParse(t, s)
		a, err1 := quiet.Predict(g)
		b, err2 := loud.Predict(g)
		if err1 != nil || err2 != nil {
			t.Fatal(err1, err2)
		}
		if sa, sb := signature(a), signature(b); !slices.Equal(sa, sb) {
			t.Errorf("%s: Explain changes the prediction: %v vs %v", s, sa, sb)
		}
	}
}
