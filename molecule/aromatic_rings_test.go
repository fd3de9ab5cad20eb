package molecule

import (
	"bufio"
	"bytes"
	"math/big"
	"math/rand/v2"
	"os/exec"
	"slices"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"shiftrank/internal/rdkittest"
)

// kekulePairs are two Kekulé structures of one constitution each; same
// says whether they are one compound (one Key). The expected answers are
// RDKit's (its canonical SMILES, checked by TestKekulePairsAgainstRDKit)
// and agree with the model in aromatic.go: an aromatic perimeter makes its
// own bonds aromatic but not a bond across it (which keeps its order), and
// a cycle that is not a sum of rings made of π atoms (the envelope of a
// bridged system around an sp3 bridge) is no aromatic ring.
var kekulePairs = []struct {
	name string
	a, b string
	same bool
}{
	{"naphthalene: fusion bond single or double", "C1=CC=C2C=CC=CC2=C1", "C1=CC2=CC=CC=C2C=C1", true},
	{"toluene: the two Kekulé structures", "CC1=CC=CC=C1", "CC1=CC=CC=C1", true},
	{"5-methylcyclopropabenzene: benzene ring fused to a three-membered ring", "CC1=CC=C2C(=C1)C2", "CC1=CC2=C(C=C1)C2", true},
	{"7-azabicyclo[2.2.1]heptatriene: every ring is a pyrrole-type 6π ring", "CC1=CC2=CC=C1N2", "CC1=C2C=CC(=C1)N2", true},
	{"methylazabicyclo[2.1.0]pentadiene: pyrrole perimeter, transannular C–C single or double", "CN1C2=CC=C12", "CN1C2=C1C=C2", false},
	{"bicyclo[2.2.0]hexatriene: benzene perimeter, transannular bond single or double", "C1=CC2=CC=C12", "C1=2C=CC=2C=C1", false},
	{"bicyclo[6.2.0]decapentaene: 10π perimeter, transannular bond single or double", "C1=CC2=CC=CC=CC=C12", "C1=CC2=C1C=CC=CC=C2", false},
	{"biphenylene: benzenoid and radialene-type Kekulé structures", "C1=CC=C2C(=C1)C1=CC=CC=C12", "C1C=CC2=C3C=CC=CC3=C2C=1", false},
	{"1,4-methanobenzene: six-ring around an sp3 bridge is no ring of the molecule", "COC1=C2C=CC(=C1)C2O", "COC1=CC2=CC=C1C2O", false},
}

func TestKekulePairs(t *testing.T) {
	for _, c := range kekulePairs {
		a, b := MustParseSMILES(c.a), MustParseSMILES(c.b)
		require.Equal(t, a.Formula(), b.Formula(), c.name)
		same := Canonicalize(a).Key == Canonicalize(b).Key
		assert.Equal(t, c.same, same, "%s: %s and %s one compound = %v, want %v (source: RDKit canonical SMILES)", c.name, c.a, c.b, same, c.same)
		assert.Equal(t, same, CanonicalSMILES(a) == CanonicalSMILES(b), "%s: CanonicalSMILES must agree with Key", c.name)
	}
}

// TestKekulePairsAgainstRDKit: RDKit gives the two Kekulé structures of
// each pair equal canonical SMILES exactly when the table says same.
func TestKekulePairsAgainstRDKit(t *testing.T) {
	rdkittest.Require(t)
	var in bytes.Buffer
	for _, c := range kekulePairs {
		in.WriteString(c.a + "\t" + c.b + "\n")
	}
	cmd := exec.Command(rdkittest.Python, "testdata/rdkit_canon.py")
	cmd.Stdin = &in
	out, err := cmd.Output()
	require.NoError(t, err, "run RDKit")
	sc := bufio.NewScanner(bytes.NewReader(out))
	i := 0
	for sc.Scan() {
		require.Less(t, i, len(kekulePairs), "RDKit printed more lines than inputs")
		f := strings.Split(sc.Text(), "\t")
		require.Len(t, f, 5, "RDKit output line %q", sc.Text())
		c := kekulePairs[i]
		assert.Equal(t, c.same, f[3] == f[4], "%s: RDKit reads %s and %s", c.name, f[3], f[4])
		i++
	}
	require.Equal(t, len(kekulePairs), i, "RDKit answered every pair")
}

func TestTransannularBondNotAromatic(t *testing.T) {
	cases := []struct {
		name   string
		smiles string
		a, b   int // atoms of the bond across the perimeter
		arom   bool
	}{
		{"azulene: the 5/7 fusion bond is not on the 10π perimeter", "C1=CC=C2C=CC=C2C=C1", 3, 7, false},
		{"naphthalene: the fusion bond is in both benzene rings", "C1=CC=C2C=CC=CC2=C1", 3, 8, true},
		{"methylazabicyclo[2.1.0]pentadiene: the bond across the pyrrole perimeter", "CN1C2=CC=C12", 2, 5, false},
		{"cyclopropabenzene: the fusion bond is a benzene bond", "C1=CC=C2C(=C1)C2", 3, 4, true},
	}
	for _, c := range cases {
		g := MustParseSMILES(c.smiles)
		bi := g.BondBetween(c.a, c.b)
		require.GreaterOrEqual(t, bi, 0, "%s: no bond %d–%d", c.name, c.a, c.b)
		assert.Equal(t, c.arom, AromaticBonds(g)[bi], "%s (%s): bond %d–%d aromatic (source: Hückel's rule on the perimeter; RDKit agrees)", c.name, c.smiles, c.a, c.b)
	}
}

// smallRingScaffolds: fused, bridged and spiro ring systems with three-
// and four-membered rings, for the reference comparison below.
var smallRingScaffolds = []string{
	"CN1C2=CC=C12", "CN1C2=C1C=C2", "C1=CC2=CC=C12", "C1=2C=CC=2C=C1", "C1=CC2=CC=CC=CC=C12",
	"COC1=C2C=CC(=C1)C2O", "COC1=CC2=CC=C1C2O", "CC1=CC2=CC=C1N2", "C1=CC2=C3C=C1C3C2",
	"CC1=CC=C2C3=C1C23", "C=C1OC2=CC1=C2C", "C=C1OC2C=C1C=2C", "C1=CC=C2C(=C1)C2",
	"C1=CC=C2C(=C1)C1=CC=CC=C12", "C1C=CC2=C3C=CC=CC3=C2C=1", "C1=CC=C2C=CC=C2C=C1",
	"C1=CC2=CC3=CC=C3C=C12", "C12=CC=C1C=CC=C2", "C1=CC2=C3C1=CC=C23", "C1=CC=C2C(=C1)C=C2",
	"C1OC2=CC=C1C=C2", "C1=CC2=CC=CC(=C1)C2", "C12C3=CC=C1C=CC=C23", "N1C2=CC=C1C=C2",
	"C1=CC2=C1N=C2", "O1C2=CC=C1C2", "C1=CC2=CC1=C2", "C1=C2C=CC1=C2",
}

// TestAromaticBondsReference compares AromaticBonds with a brute-force
// reading of the model: every simple cycle of the whole graph, relevant
// cycles found by Gaussian elimination over all shorter cycles, and
// 4n+2 cycles of π atoms in the span of the relevant cycles made of π
// atoms. It checks the shortcuts of the implementation (enumerating only
// the π-atom subgraph, a minimum cycle basis instead of all cycles).
func TestAromaticBondsReference(t *testing.T) {
	r := rand.New(rand.NewPCG(9, 3))
	var graphs []*Graph
	for _, s := range smallRingScaffolds {
		graphs = append(graphs, MustParseSMILES(s))
		for k := 0; k < 3; k++ {
			graphs = append(graphs, decorate(r, MustParseSMILES(s), 1+r.IntN(4)))
		}
	}
	for i := 0; i < 300; i++ {
		graphs = append(graphs, randomHeteroMolecule(r, r.IntN(5)))
	}
	checked := 0
	for _, g := range graphs {
		if g.CheckValence() != nil || len(g.Bonds)-len(g.Atoms)+1 > 7 {
			continue // keep the brute force small
		}
		checked++
		want := referenceAromaticBonds(g)
		got := AromaticBonds(g)
		if !slices.Equal(got, want) {
			t.Errorf("AromaticBonds(%s) = %v, reference %v", g.SMILES(), got, want)
		}
	}
	t.Logf("%d graphs checked", checked)
}

func referenceAromaticBonds(g *Graph) []bool {
	var a aromaticity
	a.findRingBonds(g)
	pi := make([]int, len(g.Atoms))
	for v := range g.Atoms {
		pi[v] = int(a.piCount(g, v))
	}
	type cyc struct {
		atoms []int
		bonds big.Int
	}
	var cycles []cyc
	seen := map[string]bool{}
	var path []int
	on := make([]bool, len(g.Atoms))
	var dfs func(s, v int)
	dfs = func(s, v int) {
		for _, nb := range g.Neighbors(v) {
			w := nb.Atom
			if w == s && len(path) >= 3 {
				var c cyc
				c.atoms = slices.Clone(path)
				for i, x := range path {
					c.bonds.SetBit(&c.bonds, g.BondBetween(x, path[(i+1)%len(path)]), 1)
				}
				if k := c.bonds.String(); !seen[k] {
					seen[k] = true
					cycles = append(cycles, c)
				}
				continue
			}
			if w < s || on[w] {
				continue
			}
			on[w] = true
			path = append(path, w)
			dfs(s, w)
			path = path[:len(path)-1]
			on[w] = false
		}
	}
	for s := range g.Atoms {
		on[s] = true
		path = append(path[:0], s)
		dfs(s, s)
		on[s] = false
	}
	slices.SortStableFunc(cycles, func(x, y cyc) int { return len(x.atoms) - len(y.atoms) })
	inSpan := func(basis []big.Int, v *big.Int) bool {
		x := new(big.Int).Set(v)
		for {
			if x.Sign() == 0 {
				return true
			}
			hi := x.BitLen() - 1
			reduced := false
			for i := range basis {
				if basis[i].BitLen()-1 == hi {
					x.Xor(x, &basis[i])
					reduced = true
					break
				}
			}
			if !reduced {
				return false
			}
		}
	}
	addTo := func(basis []big.Int, v *big.Int) []big.Int {
		x := new(big.Int).Set(v)
		for x.Sign() != 0 {
			hi := x.BitLen() - 1
			found := false
			for i := range basis {
				if basis[i].BitLen()-1 == hi {
					x.Xor(x, &basis[i])
					found = true
					break
				}
			}
			if !found {
				return append(basis, *x)
			}
		}
		return basis
	}
	allPi := func(c cyc) bool {
		for _, v := range c.atoms {
			if pi[v] < 0 {
				return false
			}
		}
		return true
	}
	var shorter, good []big.Int
	for i := 0; i < len(cycles); {
		l := len(cycles[i].atoms)
		j := i
		for ; j < len(cycles) && len(cycles[j].atoms) == l; j++ {
			if allPi(cycles[j]) && !inSpan(shorter, &cycles[j].bonds) {
				good = addTo(good, &cycles[j].bonds)
			}
		}
		for ; i < j; i++ {
			shorter = addTo(shorter, &cycles[i].bonds)
		}
	}
	arom := make([]bool, len(g.Bonds))
	for _, c := range cycles {
		sum := 0
		for _, v := range c.atoms {
			sum += pi[v]
		}
		if !allPi(c) || sum%4 != 2 || !inSpan(good, &c.bonds) {
			continue
		}
		for b := range g.Bonds {
			if c.bonds.Bit(b) == 1 {
				arom[b] = true
			}
		}
	}
	return arom
}

// BenchmarkAromaticBondsMixedRings: ring systems that hold both π atoms
// and sp3 atoms, where perception needs the minimum cycle basis.
func BenchmarkAromaticBondsMixedRings(b *testing.B) {
	for _, m := range []struct{ name, smiles string }{
		{"toluene", "Cc1ccccc1"},
		{"indane", "C1Cc2ccccc2C1"},
		{"tetralin", "C1CCc2ccccc2C1"},
		{"2,3-dihydrobenzofuran", "C1COc2ccccc21"},
		{"1,4-methanobenzene", "COC1=C2C=CC(=C1)C2O"},
		{"fluorene", "C1c2ccccc2-c2ccccc21"},
	} {
		g := MustParseSMILES(m.smiles)
		b.Run(m.name, func(b *testing.B) {
			var a aromaticity
			loop(b, func() { _ = a.perceive(g) })
		})
	}
}
