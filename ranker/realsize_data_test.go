package ranker_test

import (
	"bufio"
	"bytes"
	"fmt"
	"math"
	"os"
	"os/exec"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"

	"shiftrank/internal/rdkittest"
	"shiftrank/molecule"
	"shiftrank/ranker"
	"shiftrank/spectrum"
)

// The real-size reference unknowns (testdata/realsize.json) and their
// hold-out (testdata/realsize_holdout.json) hold published CDCl3 1H and 13C
// peak lists of common compounds with 9–16 heavy atoms; each entry names
// its source. These tests check that every entry is internally consistent
// (structure, formula, integrals, carbon count and symmetry) and agrees
// with RDKit, an outside reference, about formula and identity. They check
// the data, not the ranking.

const (
	realsizeFile        = "realsize.json"
	realsizeHoldoutFile = "realsize_holdout.json"
	// Minimum sizes asked for by the real-size benchmark.
	realsizeMinCompounds = 64
	realsizeMinHoldout   = 20
	// Heavy-atom range of a "real-size" unknown.
	realsizeMinHeavy, realsizeMaxHeavy = 9, 16
	// noExchangeableNote in an entry's name allows its 1H list to lack
	// the signals of exchangeable H (OH, NH, SH), and only those.
	noExchangeableNote = "no exchangeable H listed"
)

// citesYear matches a publication year in a source ("J. Org. Chem. 1997").
var citesYear = regexp.MustCompile(`\b(19|20)\d\d\b`)

// realsizeEntry is one reference compound with its parsed structure.
type realsizeEntry struct {
	file  string
	ref   ranker.Reference
	g     *molecule.Graph // nil if the SMILES does not parse
	canon string          // our canonical SMILES ("" if g is nil)
}

func (e realsizeEntry) String() string { return e.file + ": " + e.ref.Name }

// loadReferenceFile reads testdata/name with ranker.ParseReferenceSet.
func loadReferenceFile(t *testing.T, name string) *ranker.ReferenceSet {
	t.Helper()
	b, err := os.ReadFile("../testdata/" + name)
	if err != nil {
		t.Fatal(err)
	}
	set, err := ranker.ParseReferenceSet(b)
	if err != nil {
		t.Fatalf("testdata/%s: %v", name, err)
	}
	return set
}

// loadRealsize reads both real-size files.
func loadRealsize(t *testing.T) []realsizeEntry {
	t.Helper()
	var out []realsizeEntry
	for _, file := range []string{realsizeFile, realsizeHoldoutFile} {
		for _, ref := range loadReferenceFile(t, file).Compounds {
			e := realsizeEntry{file: file, ref: ref}
			if g, err := molecule.ParseSMILES(ref.SMILES); err == nil {
				e.g = g
				e.canon = molecule.CanonicalSMILES(g)
			}
			out = append(out, e)
		}
	}
	return out
}

func TestRealsizeSetSizes(t *testing.T) {
	for _, tc := range []struct {
		file string
		min  int
	}{
		{realsizeFile, realsizeMinCompounds},
		{realsizeHoldoutFile, realsizeMinHoldout},
	} {
		if n := len(loadReferenceFile(t, tc.file).Compounds); n < tc.min {
			t.Errorf("testdata/%s has %d compounds, want at least %d (real-size benchmark)", tc.file, n, tc.min)
		}
	}
}

// TestRealsizeEntries checks each entry on its own: the structure matches
// the stated formula, the size is in range, the 1H integrals account for
// every hydrogen and the 13C list for every carbon, consistently with the
// structure's symmetry.
func TestRealsizeEntries(t *testing.T) {
	for _, e := range loadRealsize(t) {
		t.Run(e.file+"/"+e.ref.Name, func(t *testing.T) {
			if e.g == nil {
				_, err := molecule.ParseSMILES(e.ref.SMILES)
				t.Fatalf("%s: SMILES %q: %v", e, e.ref.SMILES, err)
			}
			f := e.g.Formula()
			// The stated formula must be the structure's, written in Hill
			// order (C, H, then alphabetical; common practice).
			if f.String() != e.ref.Formula {
				t.Errorf("%s: SMILES %s has formula %s, entry says %s", e, e.ref.SMILES, f, e.ref.Formula)
			}
			if h := f.HeavyAtoms(); h < realsizeMinHeavy || h > realsizeMaxHeavy {
				t.Errorf("%s: %d heavy atoms, want %d–%d", e, h, realsizeMinHeavy, realsizeMaxHeavy)
			}
			if e.ref.Group == "" {
				t.Errorf("%s: no group (compound class)", e)
			}
			// A source either says the values were recalled or cites a
			// publication with its year (the brief's rule for check values).
			if !strings.Contains(strings.ToLower(e.ref.Source), "from memory") && !citesYear.MatchString(e.ref.Source) {
				t.Errorf("%s: source %q neither says \"from memory\" nor cites a publication with its year", e, e.ref.Source)
			}
			checkProtonList(t, e)
			checkCarbonList(t, e)
		})
	}
}

// checkProtonList parses the 1H list with spectrum.ReadList and checks that
// the integrals sum to the formula's H count. Only exchangeable H (on N, O
// or S) may be missing, and only when the entry's name says so.
func checkProtonList(t *testing.T, e realsizeEntry) {
	t.Helper()
	pl, err := spectrum.ReadList([]byte(e.ref.Peaks), spectrum.H1)
	if err != nil {
		t.Errorf("%s: 1H list: %v", e, err)
		return
	}
	if pl.Solvent != "CDCl3" {
		t.Errorf("%s: 1H solvent %q, want CDCl3", e, pl.Solvent)
	}
	if pl.MHz <= 0 {
		t.Errorf("%s: 1H header gives no spectrometer frequency", e)
	}
	sum := 0.0
	for _, p := range pl.Peaks {
		if p.Integral <= 0 {
			t.Errorf("%s: 1H peak %q has no integral", e, p.Text)
		}
		sum += p.Integral
	}
	hTotal := e.g.Formula().HydrogenCount()
	exch := 0
	for _, a := range e.g.Atoms {
		if a.Element == molecule.N || a.Element == molecule.O || a.Element == molecule.S {
			exch += a.HCount
		}
	}
	missing := float64(hTotal) - sum
	switch {
	case math.Abs(missing) < 0.01:
	case missing > 0 && strings.Contains(e.ref.Name, noExchangeableNote) && missing <= float64(exch)+0.01:
	default:
		t.Errorf("%s: 1H integrals sum to %.2f H, the structure (%s) has %d H (%d exchangeable; a list may omit them only with %q in the name)",
			e, sum, e.g.Formula(), hTotal, exch, noExchangeableNote)
	}
}

// checkCarbonList parses the 13C list and checks that the signals, counting
// "(nC)" multiplicities, account for every carbon, that the shifts are in
// range and listed high to low, and that the signals fit the structure's
// symmetry: every signal covers carbons of one symmetry class
// (automorphism orbit), so the multiplicities can be distributed over the
// classes exactly. Diastereotopic or rotamer-split carbons give more
// signals than classes, which fits; two carbons of different classes that
// coincide are written as two signals ("128.5 (2C), 128.5 (2C)").
func checkCarbonList(t *testing.T, e realsizeEntry) {
	t.Helper()
	if e.ref.Carbon == "" {
		t.Errorf("%s: no 13C list", e)
		return
	}
	cl, err := parseCarbonList(e.ref.Carbon)
	if err != nil {
		t.Errorf("%s: 13C list: %v", e, err)
		return
	}
	if cl.solvent != "CDCl3" {
		t.Errorf("%s: 13C solvent %q, want CDCl3", e, cl.solvent)
	}
	nC := e.g.Formula().Count(molecule.C)
	total := 0
	var sizes []int
	for i, s := range cl.signals {
		total += s.n
		sizes = append(sizes, s.n)
		if s.shift < 0 || s.shift > 230 {
			t.Errorf("%s: 13C shift %.1f outside 0–230 ppm", e, s.shift)
		}
		if i > 0 && s.shift > cl.signals[i-1].shift {
			t.Errorf("%s: 13C shift %.1f listed after %.1f: journal lists run high to low", e, s.shift, cl.signals[i-1].shift)
		}
	}
	if len(cl.signals) > nC {
		t.Errorf("%s: %d 13C signals for %d carbons", e, len(cl.signals), nC)
	}
	if total != nC {
		t.Errorf("%s: 13C signals count %d carbons with their (nC), the structure (%s) has %d", e, total, e.g.Formula(), nC)
		return
	}
	orbits := carbonOrbitSizes(e.g)
	if !packSignals(sizes, orbits) {
		t.Errorf("%s: 13C multiplicities %v do not fit the carbon symmetry classes %v of %s", e, sizes, orbits, e.canon)
	}
}

// carbonOrbitSizes returns the sizes of the automorphism orbits of the
// carbon atoms of g (its topological symmetry classes).
func carbonOrbitSizes(g *molecule.Graph) []int {
	c := molecule.Canonicalize(g)
	count := map[int]int{}
	for i, a := range g.Atoms {
		if a.Element == molecule.C {
			count[c.Orbits[i]]++
		}
	}
	var sizes []int
	for _, n := range count {
		sizes = append(sizes, n)
	}
	slices.Sort(sizes)
	return sizes
}

// packSignals reports whether the signal multiplicities can be distributed
// over the orbits so that each orbit is filled exactly. Both sums must be
// equal; the search is tiny (at most 16 carbons).
func packSignals(signals, orbits []int) bool {
	sig := slices.Clone(signals)
	slices.Sort(sig)
	slices.Reverse(sig)
	free := slices.Clone(orbits)
	var place func(k int) bool
	place = func(k int) bool {
		if k == len(sig) {
			for _, f := range free {
				if f != 0 {
					return false
				}
			}
			return true
		}
		tried := map[int]bool{}
		for i, f := range free {
			if f < sig[k] || tried[f] {
				continue
			}
			tried[f] = true
			free[i] -= sig[k]
			if place(k + 1) {
				return true
			}
			free[i] += sig[k]
		}
		return false
	}
	return place(0)
}

// TestRealsizeNoDuplicates checks that no structure appears twice across
// both files (compared by canonical SMILES, so different spellings of one
// constitution collide) and that the hold-out shares no compound with the
// sets the method is tuned and validated on.
func TestRealsizeNoDuplicates(t *testing.T) {
	entries := loadRealsize(t)
	seen := map[string]realsizeEntry{}
	for _, e := range entries {
		if e.g == nil {
			continue // reported by TestRealsizeEntries
		}
		if prev, ok := seen[e.canon]; ok {
			t.Errorf("%s and %s are the same structure (%s)", prev, e, e.canon)
		}
		seen[e.canon] = e
	}
	tuned := map[string]string{}
	for _, file := range []string{"accuracy.json", "validation.json"} {
		for _, ref := range loadReferenceFile(t, file).Compounds {
			g, err := molecule.ParseSMILES(ref.SMILES)
			if err != nil {
				t.Fatalf("testdata/%s: %s: %v", file, ref.Name, err)
			}
			tuned[molecule.CanonicalSMILES(g)] = file + ": " + ref.Name
		}
	}
	for _, e := range entries {
		if e.file != realsizeHoldoutFile || e.g == nil {
			continue
		}
		if other, ok := tuned[e.canon]; ok {
			t.Errorf("hold-out %s is also in %s", e, other)
		}
	}
}

// rdkitRealsizeScript reads "SMILES<TAB>our canonical SMILES" lines and
// prints, per line, "ok<TAB>formula<TAB>heavy atoms<TAB>RDKit canonical of
// the SMILES<TAB>RDKit canonical of ours" or "err<TAB>which".
const rdkitRealsizeScript = `
import sys
from rdkit import Chem, RDLogger
from rdkit.Chem.rdMolDescriptors import CalcMolFormula
RDLogger.DisableLog("rdApp.*")
for line in sys.stdin:
    line = line.rstrip("\n")
    if not line:
        continue
    a, b = line.split("\t")
    ma, mb = Chem.MolFromSmiles(a), Chem.MolFromSmiles(b)
    if ma is None or mb is None:
        print("err\t" + ("input" if ma is None else "ours"))
        continue
    print("ok\t%s\t%d\t%s\t%s" % (CalcMolFormula(ma), ma.GetNumHeavyAtoms(), Chem.MolToSmiles(ma), Chem.MolToSmiles(mb)))
`

// TestRealsizeRDKit cross-checks every entry with RDKit: RDKit reads the
// SMILES, gives the stated formula and heavy-atom count, and takes our
// canonical SMILES for the same compound.
func TestRealsizeRDKit(t *testing.T) {
	rdkittest.Require(t)
	entries := loadRealsize(t)
	var in bytes.Buffer
	var checked []realsizeEntry
	for _, e := range entries {
		if e.g == nil {
			continue // reported by TestRealsizeEntries
		}
		fmt.Fprintf(&in, "%s\t%s\n", e.ref.SMILES, e.canon)
		checked = append(checked, e)
	}
	cmd := exec.Command(rdkittest.Python, "-c", rdkitRealsizeScript)
	cmd.Stdin = &in
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("RDKit script: %v: %s", err, stderr.String())
	}
	sc := bufio.NewScanner(bytes.NewReader(out))
	i := 0
	for ; sc.Scan(); i++ {
		if i >= len(checked) {
			t.Fatalf("RDKit answered more lines than the %d asked", len(checked))
		}
		e := checked[i]
		f := strings.Split(sc.Text(), "\t")
		if f[0] != "ok" || len(f) != 5 {
			t.Errorf("%s: RDKit cannot read %s (%s): %q", e, e.ref.SMILES, e.canon, sc.Text())
			continue
		}
		if f[1] != e.ref.Formula {
			t.Errorf("%s: RDKit formula %s, entry says %s", e, f[1], e.ref.Formula)
		}
		if h, _ := strconv.Atoi(f[2]); h != e.g.Formula().HeavyAtoms() {
			t.Errorf("%s: RDKit counts %d heavy atoms, we count %d", e, h, e.g.Formula().HeavyAtoms())
		}
		if f[3] != f[4] {
			t.Errorf("%s: our canonical SMILES %s is %s for RDKit, the entry's %s is %s", e, e.canon, f[4], e.ref.SMILES, f[3])
		}
	}
	if i != len(checked) {
		t.Fatalf("RDKit answered %d of %d lines", i, len(checked))
	}
}

// carbonList is a 13C peak list read by parseCarbonList.
type carbonList struct {
	mhz     float64
	solvent string
	signals []carbonSignal
}

// carbonSignal is one 13C signal: its shift in ppm and the number of
// carbons it stands for ("(2C)"; 1 when not given).
type carbonSignal struct {
	shift float64
	n     int
}

// carbonListError names the token and its byte position in the input.
type carbonListError struct {
	Pos   int
	Token string
	Msg   string
}

func (e *carbonListError) Error() string {
	return fmt.Sprintf("%s at position %d (%q)", e.Msg, e.Pos, e.Token)
}

// parseCarbonList reads a 13C list in the journal notation of the real-size
// files: "13C NMR (101 MHz, CDCl3) δ 171.2, 134.1, 129.3 (2C), 165.8 (d,
// J = 254.6 Hz), 131.0 (d, J = 9.3 Hz, 2C)". It is a small reader for this
// test only, until the observed-spectrum package reads 13C lists.
func parseCarbonList(s string) (carbonList, error) {
	var cl carbonList
	const prefix = "13C NMR ("
	if !strings.HasPrefix(s, prefix) {
		return cl, &carbonListError{0, s[:min(len(s), len(prefix))], "want header " + prefix}
	}
	closeAt := strings.Index(s, ")")
	delta := strings.Index(s, "δ")
	if closeAt < 0 || delta < closeAt {
		return cl, &carbonListError{0, s[:min(len(s), 24)], "want header \"13C NMR (MHz, solvent) δ\""}
	}
	for _, item := range strings.Split(s[len(prefix):closeAt], ",") {
		item = strings.TrimSpace(item)
		if mhz, ok := strings.CutSuffix(item, " MHz"); ok {
			v, err := strconv.ParseFloat(mhz, 64)
			if err != nil || v <= 0 {
				return cl, &carbonListError{strings.Index(s, item), item, "bad spectrometer frequency"}
			}
			cl.mhz = v
		} else {
			cl.solvent = item
		}
	}
	body := delta + len("δ")
	for _, it := range splitTopLevel(s, body) {
		text := strings.TrimSpace(s[it[0]:it[1]])
		pos := it[0] + strings.Index(s[it[0]:it[1]], text)
		if text == "" {
			return cl, &carbonListError{it[0], "", "empty signal"}
		}
		num, detail, hasDetail := strings.Cut(text, "(")
		num = strings.TrimSpace(num)
		shift, err := strconv.ParseFloat(num, 64)
		if err != nil {
			return cl, &carbonListError{pos, num, "bad shift"}
		}
		sig := carbonSignal{shift: shift, n: 1}
		if hasDetail {
			inner, ok := strings.CutSuffix(detail, ")")
			if !ok {
				return cl, &carbonListError{pos, text, "unclosed parenthesis"}
			}
			for _, d := range strings.Split(inner, ",") {
				d = strings.TrimSpace(d)
				switch {
				case d == "d" || d == "t" || d == "q":
					// C–F coupling multiplicity; kept for the reader.
				case strings.HasPrefix(d, "J = ") && strings.HasSuffix(d, " Hz"):
					if _, err := strconv.ParseFloat(strings.TrimSuffix(strings.TrimPrefix(d, "J = "), " Hz"), 64); err != nil {
						return cl, &carbonListError{pos, d, "bad coupling constant"}
					}
				case strings.HasSuffix(d, "C"):
					n, err := strconv.Atoi(strings.TrimSuffix(d, "C"))
					if err != nil || n < 2 {
						return cl, &carbonListError{pos, d, "bad carbon count (want 2C, 3C, ...)"}
					}
					sig.n = n
				default:
					return cl, &carbonListError{pos, d, "unknown signal detail"}
				}
			}
		}
		cl.signals = append(cl.signals, sig)
	}
	if len(cl.signals) == 0 {
		return cl, &carbonListError{body, "", "no signals"}
	}
	return cl, nil
}

// splitTopLevel returns the [start, end) byte ranges of the comma-separated
// items of s[from:] that lie outside parentheses.
func splitTopLevel(s string, from int) [][2]int {
	var out [][2]int
	depth, start := 0, from
	for i := from; i < len(s); i++ {
		switch s[i] {
		case '(':
			depth++
		case ')':
			depth--
		case ',':
			if depth == 0 {
				out = append(out, [2]int{start, i})
				start = i + 1
			}
		}
	}
	return append(out, [2]int{start, len(s)})
}

func TestParseCarbonList(t *testing.T) {
	for _, tc := range []struct {
		name, in string
		want     []carbonSignal
		wantErr  string
	}{
		{"plain and 2C", "13C NMR (101 MHz, CDCl3) δ 171.2, 129.3 (2C)", []carbonSignal{{171.2, 1}, {129.3, 2}}, ""},
		{"C-F doublet", "13C NMR (101 MHz, CDCl3) δ 165.8 (d, J = 254.6 Hz), 130.9 (d, J = 9.3 Hz, 2C)", []carbonSignal{{165.8, 1}, {130.9, 2}}, ""},
		{"wrong nucleus", "1H NMR (400 MHz, CDCl3) δ 7.26 (s, 1H)", nil, "want header"},
		{"bad shift", "13C NMR (101 MHz, CDCl3) δ 17x.2", nil, "bad shift"},
		{"bad count", "13C NMR (101 MHz, CDCl3) δ 128.1 (1C)", nil, "bad carbon count"},
		{"unknown detail", "13C NMR (101 MHz, CDCl3) δ 128.1 (CH)", nil, "unknown signal detail"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			cl, err := parseCarbonList(tc.in)
			if tc.wantErr != "" {
				if err == nil || !strings.Contains(err.Error(), tc.wantErr) {
					t.Fatalf("parseCarbonList(%q) error = %v, want one containing %q", tc.in, err, tc.wantErr)
				}
				return
			}
			if err != nil {
				t.Fatalf("parseCarbonList(%q): %v", tc.in, err)
			}
			if !slices.Equal(cl.signals, tc.want) || cl.solvent != "CDCl3" || cl.mhz != 101 {
				t.Errorf("parseCarbonList(%q) = %+v, want signals %v in CDCl3 at 101 MHz", tc.in, cl, tc.want)
			}
		})
	}
}
