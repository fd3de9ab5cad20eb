package isomers

import (
	"fmt"
	"math/bits"
	"strings"

	"shiftrank/molecule"
)

// Rule is one plausibility rule of the filter: a stable kebab-case name and
// the chemical reason for removing the structures it matches.
type Rule struct {
	Name   string
	Reason string
}

type ruleDef struct {
	Rule
	// violates reports whether m breaks the rule.
	violates func(o *outputBuilder, m *mol) bool
	// need lists features (feature bits) every structure breaking the
	// rule has; the rule is skipped when one is absent.
	need feature
}

// feature is a set of cheap structural facts computed once per structure.
type feature uint16

const (
	fRing   feature = 1 << iota // at least one ring
	fRing2                      // at least two rings
	fDouble                     // a double bond
	fTriple                     // a triple bond
	fAllene                     // a carbon with two double bonds
	fOH                         // a hydroxyl
	fOHSH                       // a hydroxyl or a thiol
	fO                          // an oxygen
	fO2                         // two oxygens
	fN                          // a nitrogen
	fHal                        // a halogen
	fHyper                      // hypervalent S or P
	fP3                         // P(III)
	fS2                         // S(II)
)

// features computes the feature set of m.
func features(m *mol) feature {
	var f feature
	if m.edges >= m.n {
		f |= fRing
	}
	if m.edges >= m.n+1 {
		f |= fRing2
	}
	nO := 0
	for i := 0; i < m.n; i++ {
		nd := 0
		for k := 0; k < int(m.deg[i]); k++ {
			switch m.bo[i][k] {
			case 2:
				f |= fDouble
				nd++
			case 3:
				f |= fTriple
			}
		}
		switch e := m.el[i]; {
		case e == molecule.C && nd == 2:
			f |= fAllene
		case e == molecule.O:
			f |= fO
			nO++
			if m.hcount(i) > 0 {
				f |= fOH | fOHSH
			}
		case e == molecule.N:
			f |= fN
		case e.IsHalogen():
			f |= fHal
		case e == molecule.S && m.valence(i) == 2:
			f |= fS2
			if m.hcount(i) > 0 {
				f |= fOHSH
			}
		case e == molecule.S:
			f |= fHyper
		case e == molecule.P && m.valence(i) == 5:
			f |= fHyper
		case e == molecule.P:
			f |= fP3
		}
	}
	if nO >= 2 {
		f |= fO2
	}
	return f
}

// numRules is the number of rules in ruleTable.
const numRules = 24

// ruleTable lists the rules in the order they are applied and reported.
// The reasons are textbook organic chemistry (common practice); the ring
// size limits cite the literature named in each reason.
var ruleTable = [numRules]ruleDef{
	{Rule{"no-small-ring-triple", "A triple bond needs a linear (180°) arrangement at both carbons; a ring smaller than 8 atoms cannot close without prohibitive strain (cyclooctyne is the smallest isolable cycloalkyne; common practice)."}, smallRingTriple, fTriple | fRing},
	{Rule{"no-small-ring-allene", "The central carbon of an allene (C=C=C) or other cumulene is linear; in rings smaller than 8 atoms such compounds are at best transient intermediates (common practice)."}, smallRingAllene, fAllene | fRing},
	{Rule{"no-bredt-violation", "Bredt's rule: a double bond at the bridgehead of a small bridged bicyclic system cannot have the p orbitals aligned; bridgehead alkenes are isolable only when the bridges total at least 7 atoms (Fawcett's S ≥ 7: Fawcett 1950, Chem. Rev. 47:219, from memory)."}, bredtViolation, fDouble | fRing2},
	{Rule{"no-peroxide", "O–O single bonds (peroxides, hydroperoxides) are weak and thermally or explosively unstable; they are rare as unknowns and are almost never the answer to a routine identification (common practice)."}, peroxide, fO2},
	{Rule{"no-enol", "Keto–enol tautomerism: a hydroxyl on a non-aromatic C=C (enol) or C≡C (ynol) carbon converts to the carbonyl tautomer, which dominates at equilibrium for simple carbonyl compounds. Phenols (aromatic) are kept."}, enol, fOH},
	{Rule{"no-imidic-acid", "Amide–imidic acid tautomerism: HO–C=N converts to the amide H–N–C=O, which dominates at equilibrium. Aromatic hydroxy-heterocycles are kept."}, imidicAcid, fOH | fDouble | fN},
	{Rule{"no-gem-diol", "Two hydroxyls on one sp3 carbon (gem-diol, carbonyl hydrate) lose water to the carbonyl compound; isolable only for strongly electron-poor carbonyls such as chloral (common practice)."}, gemDiol, fO2 | fOH},
	{Rule{"no-hemiacetal", "An sp3 carbon bearing both OH and OR (hemiacetal, hemiketal), or OH and SR/SH, or SH and OR (hemithioacetals), is in equilibrium with the carbonyl compound and the alcohol or thiol and is rarely isolated (cyclic sugar hemiacetals are the notable exception; switch the rule off for carbohydrates)."}, hemiacetal, fOHSH},
	{Rule{"no-hemiaminal", "An sp3 carbon bearing both OH and an amine nitrogen (hemiaminal, carbinolamine) eliminates water to the imine or reverts to carbonyl plus amine; N-hydroxymethyl amides, which are stable, are kept."}, hemiaminal, fOH | fN},
	{Rule{"no-hypohalite", "O–halogen bonds (hypohalites, R–O–X) are strong oxidants that decompose readily; they are not isolated as routine unknowns (common practice)."}, hypohalite, fO | fHal},
	{Rule{"no-antiaromatic-ring", "Small rings with 4n π electrons are antiaromatic: oxirenes, thiirenes and 1H-azirines (a C=C or C=N double bond plus a lone-pair heteroatom in a three-membered ring) and cyclobutadienes or azetes (two double bonds in a four-membered ring) are observed only in matrices or with bulky substituents (Breslow 1973, Acc. Chem. Res. 6:393, from memory)."}, antiaromaticRing, fDouble | fRing},
	{Rule{"no-hypervalent-hydride", "Hydrogen on hypervalent sulfur (S(IV), S(VI)) and on P(V) without a P=O or P=S bond (e.g. SH4, CH3SH3, PH5, H2P(=CH2)R) tautomerise or eliminate H2; stable P(V)–H compounds (phosphinates, H-phosphonates, secondary phosphine oxides and sulfides) carry P=O or P=S and are kept."}, hypervalentHydride, fHyper},
	{Rule{"no-bare-hypervalent", "Hypervalent sulfur (S(IV), S(VI)) or phosphorus (P(V)) with neither a double bond nor an oxygen or halogen neighbour (e.g. tetramethyl-λ4-sulfane, pentamethylphosphorane) is unstable; real hypervalent compounds (sulfoxides, sulfones, SF4, phosphates, PCl5) have electronegative ligands or multiple bonds."}, bareHypervalent, fHyper},
	{Rule{"no-ylide-tautomer", "An OH on P(V) or on hypervalent S that carries a double bond to C or N but none to O or S (HO–PR2=CH2, HO–S(R)=CH2) is the minor prototropic tautomer of the phosphine oxide or sulfoxide (O=PR2–CH3), which dominates (common practice)."}, ylideTautomer, fHyper | fOH},
	{Rule{"no-sulfur-ylide", "Hypervalent sulfur doubly or triply bonded to carbon (sulfonium and sulfoxonium ylides, sulfines, sulfenes) is a reactive intermediate generated in situ, not an isolated unknown (common practice); phosphorus ylides, which are isolable, are kept."}, sulfurYlide, fHyper},
	{Rule{"no-trivalent-p-oh", "P(III)–OH (phosphorous, phosphonous and phosphinous acids and their partial esters) exists almost entirely as the P(V) tautomer with P=O and P–H (H-phosphonates, H-phosphinates, secondary phosphine oxides), which the generator also makes (common practice); trialkyl phosphites without OH are kept."}, trivalentPOH, fP3 | fOH},
	{Rule{"no-sulfenic-acid", "Sulfenic acids R–S–OH and their O–SH isomers are transient: they condense to thiosulfinates or are oxidised, and are isolable only with bulky protecting groups (common practice)."}, sulfenicAcid, fS2 | fO},
	{Rule{"no-hypervalent-hydrate", "An OH on P(V) or hypervalent S with only single bonds (P(OH)5-type ortho acids, R–P(OH)4, R2S(OH)2) loses water to the P=O or S=O compound, as gem-diols do to carbonyls (common practice); phosphoranes and sulfuranes without OH (PCl5, SF4) are kept."}, hypervalentHydrate, fHyper | fOH},
	{Rule{"no-small-aromatic-ring", "A three- or four-membered ring whose atoms all belong to one aromatic π system (a bicyclic aromatic perimeter closed across by a short bond, e.g. azabicyclo[2.1.0]pentadienes) holds a local cyclobutadiene or cyclopropenyl-anion unit under extreme angle strain and is not isolable (common practice); rings fused to an aromatic ring through one bond (cyclopropabenzene, biphenylene) are kept."}, smallAromaticRing, fDouble | fRing},
	{Rule{"no-fused-cyclopropene", "A cyclopropene whose alkene carbon also belongs to another ring (fused across the double bond, bicyclo[n.1.0]alk-1(n+2)-enes, or at one alkene carbon, bicyclo[n.1.0]alk-1-enes) adds the strain of the fusion to the cyclopropene's wide exocyclic angle; such alkenes are transient intermediates trapped only in situ (common practice). Aromatic fusions (cyclopropabenzene), ordinary and spiro-fused cyclopropenes are kept."}, fusedCyclopropene, fDouble | fRing},
	{Rule{"no-small-ring-junction", "Two rings of three or four atoms that share an atom (bicyclo[1.1.0]butanes, bicyclo[2.1.0]pentanes, bicyclo[2.2.0]hexanes, [1.1.1]propellanes, bicyclo[1.1.1]pentanes, spiropentanes, spiro[3.3]heptanes, ladderanes, cubanes) add their strain at the shared atoms (bicyclo[1.1.0]butane about 64 and [1.1.1]propellane about 98 kcal/mol, against 27.5 for cyclopropane; Wiberg 1986, Angew. Chem. Int. Ed. 25:312, from memory); they are made on purpose by special routes and are neither natural products nor routine unknowns (common practice). A single three- or four-membered ring, also fused or bridged to larger rings (pinane, carane, thujane, caryophyllene, bicyclo[2.1.1]hexane), is kept; switch the rule off for building blocks such as bicyclo[1.1.1]pentanes and azaspiro[3.3]heptanes."}, smallRingJunction, fRing2},
	{Rule{"no-four-ring-heteroatom-pair", "A four-membered ring of carbons and two or more O, N or S atoms (1,2- and 1,3-dioxetanes, diazetidines, oxazetidines, dithietanes, oxathietanes, thiazetidines) adds lone-pair repulsion and weak heteroatom bonds to the ring strain: 1,3-dioxetanes have never been isolated, 1,2-dioxetanes cleave to two carbonyl compounds on warming (first isolated by Kopecky and Mumford 1969, Can. J. Chem. 47:709, from memory) and the others are rare laboratory compounds (common practice). Rings with one heteroatom (oxetanes, azetidines, thietanes, β-lactones, β-lactams), uretdiones (1,3-diazetidine-2,4-diones, the stable isocyanate dimers) and rings with P, Si or hypervalent S (β-sultams, Lawesson's reagent) are kept."}, fourRingHeteroatomPair, fRing},
	{Rule{"no-four-ring-hetero-alkene", "A double bond inside a four-membered ring that holds O, N or S (2H-oxetes, 1- and 2-azetines, 2H-thietes, 1,2-diazetes and the benzo-fused benzoxetes and benzothietes) opens electrocyclically to the α,β-unsaturated carbonyl, imine or thiocarbonyl compound or polymerises; such rings are observed at low temperature or with special substitution only (common practice). Exocyclic double bonds (β-lactones, β-lactams, diketene, oxetan-3-one) and cyclobutenes without a ring heteroatom are kept."}, fourRingHeteroAlkene, fRing | fDouble},
	{Rule{"no-cyclopropene", "A C=C double bond in a three-membered ring (cyclopropenes) about doubles the strain of cyclopropane (about 54 against 27.5 kcal/mol, from memory); cyclopropenes with a vinylic C–H dimerise by the ene reaction near room temperature, substituted ones are specialty compounds, and in nature they occur only as the cyclopropene fatty acids (sterculic and malvalic acid) of some seed oils — switch the rule off for those (common practice). Cyclopropenones (2π-aromatic; diphenylcyclopropenone is a stable commercial compound) and the aromatic cyclopropabenzene are kept."}, cyclopropene, fRing | fDouble},
}

// Rules returns the filter rules in the order they are applied.
func Rules() []Rule {
	out := make([]Rule, numRules)
	for i := range ruleTable {
		out[i] = ruleTable[i].Rule
	}
	return out
}

// Filter is a set of enabled plausibility rules. The zero value is the
// "plausible" filter (every rule enabled, like DefaultFilter); NoFilter
// switches all of them off. Filter is a comparable value.
type Filter struct {
	off uint32 // disabled rules, so that the zero value enables all
}

const allRules = 1<<numRules - 1

// on returns the set of enabled rules.
func (f Filter) on() uint32 { return allRules &^ f.off }

// DefaultFilter returns the "plausible" filter: every rule enabled. It
// equals the zero Filter.
func DefaultFilter() Filter { return Filter{} }

// NoFilter returns the "none" filter: no rule enabled.
func NoFilter() Filter { return Filter{off: allRules} }

// FilterError reports an unknown rule or a malformed filter expression.
type FilterError struct {
	Input string
	Pos   int    // byte offset of Token in Input
	Token string // the offending item
	Msg   string
}

func (e *FilterError) Error() string {
	return fmt.Sprintf("filter %q: %s at position %d (%q)", e.Input, e.Msg, e.Pos, e.Token)
}

// ParseFilter parses a filter expression: a comma-separated list whose
// first item may be "plausible" (all rules) or "none" (no rule), followed
// by edits "-rule" (disable) or "+rule" (enable); a bare rule name enables
// it. The empty string is "plausible". Examples: "none",
// "plausible,-no-enol", "none,+no-peroxide". Unknown rules or items give a
// *FilterError naming the item and its position.
func ParseFilter(s string) (Filter, error) {
	f := DefaultFilter()
	if strings.TrimSpace(s) == "" {
		return f, nil
	}
	pos := 0
	for i, item := range strings.Split(s, ",") {
		start := pos
		pos += len(item) + 1
		it := strings.TrimSpace(item)
		off := start + strings.Index(item, it)
		switch {
		case it == "plausible" && i == 0:
			f = DefaultFilter()
			continue
		case it == "none" && i == 0:
			f = NoFilter()
			continue
		case it == "plausible" || it == "none":
			return Filter{}, &FilterError{Input: s, Pos: off, Token: it, Msg: "\"plausible\" or \"none\" may only come first"}
		case it == "":
			return Filter{}, &FilterError{Input: s, Pos: off, Token: it, Msg: "empty item"}
		}
		name := it
		enable := true
		if name[0] == '-' || name[0] == '+' {
			enable = name[0] == '+'
			name = name[1:]
		}
		idx := ruleIndex(name)
		if idx < 0 {
			return Filter{}, &FilterError{Input: s, Pos: off, Token: it, Msg: "unknown rule (see Rules)"}
		}
		if enable {
			f.off &^= 1 << idx
		} else {
			f.off |= 1 << idx
		}
	}
	return f, nil
}

func ruleIndex(name string) int {
	for i := range ruleTable {
		if ruleTable[i].Name == name {
			return i
		}
	}
	return -1
}

// Enabled returns the names of the enabled rules in rule order.
func (f Filter) Enabled() []string {
	var out []string
	for i := range ruleTable {
		if f.on()&(1<<i) != 0 {
			out = append(out, ruleTable[i].Name)
		}
	}
	return out
}

// String returns "plausible", "none", or a ParseFilter expression that
// gives f back.
func (f Filter) String() string {
	switch f {
	case DefaultFilter():
		return "plausible"
	case NoFilter():
		return "none"
	}
	var b strings.Builder
	if len(f.Enabled())*2 >= numRules {
		b.WriteString("plausible")
		for i := range ruleTable {
			if f.on()&(1<<i) == 0 {
				b.WriteString(",-")
				b.WriteString(ruleTable[i].Name)
			}
		}
		return b.String()
	}
	b.WriteString("none")
	for _, n := range f.Enabled() {
		b.WriteString(",+")
		b.WriteString(n)
	}
	return b.String()
}

// Allows reports whether g passes the filter; if not, rule names the first
// enabled rule it breaks. Graphs the generator could not have produced
// (charges, aromatic bond orders, more than MaxAtoms atoms, valences
// outside the element's list) are allowed unchecked with rule "".
func (f Filter) Allows(g *molecule.Graph) (ok bool, rule string) {
	if f.on() == 0 {
		return true, ""
	}
	var m mol
	if !fromGraph(g, &m) {
		return true, ""
	}
	var o outputBuilder
	if i := f.check(&o, &m); i >= 0 {
		return false, ruleTable[i].Name
	}
	return true, ""
}

// check returns the index of the first enabled rule m breaks, or -1.
func (f Filter) check(o *outputBuilder, m *mol) int {
	if f.on() == 0 {
		return -1
	}
	o.aromDone = false
	have := features(m)
	on := f.on()
	for i := range ruleTable {
		r := &ruleTable[i]
		if on&(1<<i) != 0 && have&r.need == r.need && r.violates(o, m) {
			return i
		}
	}
	return -1
}

// ringSize returns the size of the smallest ring containing the bond a–b,
// or 0 if the bond is in no ring (breadth-first search over bit masks,
// not using the bond itself).
func (o *outputBuilder) ringSize(m *mol, a, b int) int {
	bb := uint64(1) << uint(b)
	reach := uint64(1) << uint(a)
	frontier := reach
	for d := 1; frontier != 0; d++ {
		var next uint64
		for f := frontier; f != 0; f &= f - 1 {
			x := bits.TrailingZeros64(f)
			nb := m.adj[x]
			if x == a {
				nb &^= bb
			}
			next |= nb
		}
		next &^= reach
		if next&bb != 0 {
			return d + 1
		}
		reach |= next
		frontier = next
	}
	return 0
}

// pathAvoiding returns the length of the shortest path from a to b that
// does not pass through x, or 0 if there is none.
func (o *outputBuilder) pathAvoiding(m *mol, a, b, x int) int {
	bb := uint64(1) << uint(b)
	reach := uint64(1)<<uint(a) | uint64(1)<<uint(x)
	frontier := uint64(1) << uint(a)
	for d := 1; frontier != 0; d++ {
		var next uint64
		for f := frontier; f != 0; f &= f - 1 {
			next |= m.adj[bits.TrailingZeros64(f)]
		}
		next &^= reach
		if next&bb != 0 {
			return d
		}
		reach |= next
		frontier = next
	}
	return 0
}

// atomRing returns the size of the smallest ring through atom a, or 0.
func (o *outputBuilder) atomRing(m *mol, a int) int {
	best := 0
	for k := 0; k < int(m.deg[a]); k++ {
		if r := o.ringSize(m, a, int(m.nb[a][k])); r > 0 && (best == 0 || r < best) {
			best = r
		}
	}
	return best
}

func isOH(m *mol, x int) bool {
	return m.el[x] == molecule.O && m.deg[x] == 1 && m.bo[x][0] == 1 && m.hcount(x) == 1
}

func allSingle(m *mol, x int) bool {
	return int(m.bsum[x]) == int(m.deg[x])
}

func smallRingTriple(o *outputBuilder, m *mol) bool {
	for i := 0; i < m.n; i++ {
		for k := 0; k < int(m.deg[i]); k++ {
			u := int(m.nb[i][k])
			if u > i && m.bo[i][k] == 3 {
				if r := o.ringSize(m, i, u); r > 0 && r < 8 {
					return true
				}
			}
		}
	}
	return false
}

func smallRingAllene(o *outputBuilder, m *mol) bool {
	for i := 0; i < m.n; i++ {
		if m.el[i] != molecule.C || m.deg[i] != 2 || m.bo[i][0] != 2 || m.bo[i][1] != 2 {
			continue
		}
		if r := o.atomRing(m, i); r > 0 && r < 8 {
			return true
		}
	}
	return false
}

func bredtViolation(o *outputBuilder, m *mol) bool {
	for a := 0; a < m.n; a++ {
		if m.el[a] != molecule.C || m.deg[a] != 3 || m.bsum[a] != 4 {
			continue
		}
		// a has one double bond; all three bonds must be ring bonds
		var nbr [3]int
		dbl := -1
		ok := true
		for k := 0; k < 3; k++ {
			nbr[k] = int(m.nb[a][k])
			if m.bo[a][k] == 2 {
				dbl = nbr[k]
			}
			if o.ringSize(m, a, nbr[k]) == 0 {
				ok = false
			}
		}
		if !ok || dbl < 0 || (m.el[dbl] != molecule.C && m.el[dbl] != molecule.N) {
			continue
		}
		var r [3]int
		r[0] = o.pathAvoiding(m, nbr[0], nbr[1], a) + 2
		r[1] = o.pathAvoiding(m, nbr[0], nbr[2], a) + 2
		r[2] = o.pathAvoiding(m, nbr[1], nbr[2], a) + 2
		if r[0] == 2 || r[1] == 2 || r[2] == 2 {
			continue // not all three pairs close a ring
		}
		// sort
		if r[0] > r[1] {
			r[0], r[1] = r[1], r[0]
		}
		if r[1] > r[2] {
			r[1], r[2] = r[2], r[1]
		}
		if r[0] > r[1] {
			r[0], r[1] = r[1], r[0]
		}
		// Fused (ortho-fused, bicyclo[x.y.0]) systems have r2 = r0 + r1 - 2;
		// bridged systems have a shorter envelope.
		if r[2] >= r[0]+r[1]-2 {
			continue
		}
		s := (r[0]+r[1]+r[2])/2 - 3 // Fawcett's S: atoms in the three bridges
		if s < 7 {
			return true
		}
	}
	return false
}

func peroxide(o *outputBuilder, m *mol) bool {
	for i := 0; i < m.n; i++ {
		if m.el[i] != molecule.O {
			continue
		}
		for k := 0; k < int(m.deg[i]); k++ {
			if m.el[m.nb[i][k]] == molecule.O && m.bo[i][k] == 1 {
				return true
			}
		}
	}
	return false
}

// hydroxylOnMultiple reports whether some OH sits on a carbon with a
// non-aromatic double bond to an atom of element partner (or any triple
// bond when triple is set).
func hydroxylOnMultiple(o *outputBuilder, m *mol, partner molecule.Element, triple bool) bool {
	for x := 0; x < m.n; x++ {
		if !isOH(m, x) {
			continue
		}
		c := int(m.nb[x][0])
		if m.el[c] != molecule.C {
			continue
		}
		for k := 0; k < int(m.deg[c]); k++ {
			u := int(m.nb[c][k])
			switch m.bo[c][k] {
			case 3:
				if triple {
					return true
				}
			case 2:
				if m.el[u] == partner && !o.aromatic(m, c, k) {
					return true
				}
			}
		}
	}
	return false
}

func enol(o *outputBuilder, m *mol) bool {
	return hydroxylOnMultiple(o, m, molecule.C, true)
}

func imidicAcid(o *outputBuilder, m *mol) bool {
	return hydroxylOnMultiple(o, m, molecule.N, false)
}

func gemDiol(o *outputBuilder, m *mol) bool {
	for c := 0; c < m.n; c++ {
		if m.el[c] != molecule.C || !allSingle(m, c) {
			continue
		}
		oh := 0
		for k := 0; k < int(m.deg[c]); k++ {
			if isOH(m, int(m.nb[c][k])) {
				oh++
			}
		}
		if oh >= 2 {
			return true
		}
	}
	return false
}

// hemi reports whether an sp3 carbon carries an OH and a neighbour
// accepted by other.
func hemi(m *mol, other func(c, u int) bool) bool {
	for c := 0; c < m.n; c++ {
		if m.el[c] != molecule.C || !allSingle(m, c) {
			continue
		}
		hasOH, hasOther := false, false
		for k := 0; k < int(m.deg[c]); k++ {
			u := int(m.nb[c][k])
			if isOH(m, u) {
				hasOH = true
				continue
			}
			if other(c, u) {
				hasOther = true
			}
		}
		if hasOH && hasOther {
			return true
		}
	}
	return false
}

func hemiacetal(o *outputBuilder, m *mol) bool {
	// OH with OR, SR or SH
	if hemi(m, func(c, u int) bool {
		return (m.el[u] == molecule.O && m.deg[u] == 2 && allSingle(m, u)) || isDivalentS(m, u)
	}) {
		return true
	}
	// SH with OR
	for c := 0; c < m.n; c++ {
		if m.el[c] != molecule.C || !allSingle(m, c) {
			continue
		}
		sh, or := false, false
		for k := 0; k < int(m.deg[c]); k++ {
			u := int(m.nb[c][k])
			switch {
			case isDivalentS(m, u) && m.deg[u] == 1:
				sh = true
			case m.el[u] == molecule.O && m.deg[u] == 2 && allSingle(m, u):
				or = true
			}
		}
		if sh && or {
			return true
		}
	}
	return false
}

// isDivalentS reports whether x is S(II) with single bonds (thiol or
// thioether sulfur).
func isDivalentS(m *mol, x int) bool {
	return m.el[x] == molecule.S && m.valence(x) == 2 && allSingle(m, x)
}

func hemiaminal(o *outputBuilder, m *mol) bool {
	return hemi(m, func(c, u int) bool {
		if m.el[u] != molecule.N || !allSingle(m, u) {
			return false
		}
		// amide nitrogen (N–C=O, N–S(=O)): N-hydroxymethyl amides are stable
		for k := 0; k < int(m.deg[u]); k++ {
			w := int(m.nb[u][k])
			if w == c {
				continue
			}
			for j := 0; j < int(m.deg[w]); j++ {
				if m.bo[w][j] == 2 && m.el[m.nb[w][j]] == molecule.O {
					return false
				}
			}
		}
		return true
	})
}

func hypohalite(o *outputBuilder, m *mol) bool {
	for i := 0; i < m.n; i++ {
		if m.el[i] != molecule.O {
			continue
		}
		for k := 0; k < int(m.deg[i]); k++ {
			if m.el[m.nb[i][k]].IsHalogen() {
				return true
			}
		}
	}
	return false
}

// lonePairDonor reports whether x would put a lone pair into a small ring's
// π system: divalent O or S, or nitrogen with single bonds only.
func lonePairDonor(m *mol, x int) bool {
	switch m.el[x] {
	case molecule.O, molecule.S:
		return m.valence(x) == 2 && allSingle(m, x)
	case molecule.N:
		return allSingle(m, x)
	}
	return false
}

func antiaromaticRing(o *outputBuilder, m *mol) bool {
	for a := 0; a < m.n; a++ {
		for k := 0; k < int(m.deg[a]); k++ {
			b := int(m.nb[a][k])
			if b < a || m.bo[a][k] != 2 {
				continue
			}
			ea, eb := m.el[a], m.el[b]
			cc := (ea == molecule.C || ea == molecule.N) && (eb == molecule.C || eb == molecule.N)
			if !cc {
				continue
			}
			// three-membered ring a=b–x–a with a lone-pair donor x
			for j := 0; j < int(m.deg[a]); j++ {
				x := int(m.nb[a][j])
				if x != b && m.order(b, x) > 0 && lonePairDonor(m, x) && !o.aromatic(m, a, k) {
					return true
				}
			}
			// four-membered ring a=b–c=d–a
			for j := 0; j < int(m.deg[b]); j++ {
				c := int(m.nb[b][j])
				if c == a || m.bo[b][j] != 1 {
					continue
				}
				for i := 0; i < int(m.deg[c]); i++ {
					d := int(m.nb[c][i])
					if d == b || d == a || m.bo[c][i] != 2 {
						continue
					}
					// A Kekulé structure of a larger aromatic system (for
					// example biphenylene) may draw the four-membered ring
					// this way; only non-aromatic double bonds count.
					if m.order(d, a) == 1 && !o.aromatic(m, a, k) && !o.aromatic(m, c, i) {
						return true
					}
				}
			}
		}
	}
	return false
}

func hypervalentHydride(o *outputBuilder, m *mol) bool {
	for i := 0; i < m.n; i++ {
		if m.hcount(i) == 0 {
			continue
		}
		switch {
		case m.el[i] == molecule.S && m.valence(i) > 2:
			return true
		case m.el[i] == molecule.P && m.valence(i) == 5 && !doubleTo(m, i, molecule.O, molecule.S):
			return true
		}
	}
	return false
}

func bareHypervalent(o *outputBuilder, m *mol) bool {
	for i := 0; i < m.n; i++ {
		hyper := (m.el[i] == molecule.S && m.valence(i) > 2) || (m.el[i] == molecule.P && m.valence(i) == 5)
		if !hyper || !allSingle(m, i) {
			continue
		}
		electroneg := false
		for k := 0; k < int(m.deg[i]); k++ {
			e := m.el[m.nb[i][k]]
			if e == molecule.O || e.IsHalogen() {
				electroneg = true
				break
			}
		}
		if !electroneg {
			return true
		}
	}
	return false
}

// doubleTo reports whether atom x has a double bond to an atom of element
// a or b.
func doubleTo(m *mol, x int, a, b molecule.Element) bool {
	for k := 0; k < int(m.deg[x]); k++ {
		if e := m.el[m.nb[x][k]]; m.bo[x][k] == 2 && (e == a || e == b) {
			return true
		}
	}
	return false
}

func hypervalentSP(m *mol, x int) bool {
	return (m.el[x] == molecule.S && m.valence(x) > 2) || (m.el[x] == molecule.P && m.valence(x) == 5)
}

func ylideTautomer(o *outputBuilder, m *mol) bool {
	for x := 0; x < m.n; x++ {
		if !hypervalentSP(m, x) || doubleTo(m, x, molecule.O, molecule.S) || !doubleTo(m, x, molecule.C, molecule.N) {
			continue
		}
		for k := 0; k < int(m.deg[x]); k++ {
			if isOH(m, int(m.nb[x][k])) {
				return true
			}
		}
	}
	return false
}

func sulfurYlide(o *outputBuilder, m *mol) bool {
	for x := 0; x < m.n; x++ {
		if m.el[x] != molecule.S || m.valence(x) <= 2 {
			continue
		}
		for k := 0; k < int(m.deg[x]); k++ {
			if m.bo[x][k] >= 2 && m.el[m.nb[x][k]] == molecule.C {
				return true
			}
		}
	}
	return false
}

func hypervalentHydrate(o *outputBuilder, m *mol) bool {
	for x := 0; x < m.n; x++ {
		if !hypervalentSP(m, x) || !allSingle(m, x) {
			continue
		}
		for k := 0; k < int(m.deg[x]); k++ {
			if isOH(m, int(m.nb[x][k])) {
				return true
			}
		}
	}
	return false
}

func trivalentPOH(o *outputBuilder, m *mol) bool {
	for x := 0; x < m.n; x++ {
		if m.el[x] != molecule.P || m.valence(x) != 3 {
			continue
		}
		for k := 0; k < int(m.deg[x]); k++ {
			if isOH(m, int(m.nb[x][k])) {
				return true
			}
		}
	}
	return false
}

func sulfenicAcid(o *outputBuilder, m *mol) bool {
	for x := 0; x < m.n; x++ {
		if !isDivalentS(m, x) {
			continue
		}
		for k := 0; k < int(m.deg[x]); k++ {
			u := int(m.nb[x][k])
			if m.el[u] == molecule.O && (m.hcount(x) > 0 || m.hcount(u) > 0) {
				return true
			}
		}
	}
	return false
}

// aromaticPair reports whether the bond a–b is aromatic.
func (o *outputBuilder) aromaticPair(m *mol, a, b int) bool {
	for k := 0; k < int(m.deg[a]); k++ {
		if int(m.nb[a][k]) == b {
			return o.aromatic(m, a, k)
		}
	}
	return false
}

// smallAromaticRing reports a three- or four-membered ring whose atoms
// all belong to an aromatic system and whose bonds are all aromatic but at
// most one: the short ring closes across the aromatic perimeter (the
// transannular bond of a bicyclic perimeter is not itself aromatic; see
// molecule.AromaticBonds). Biphenylene's four-membered ring has two
// non-aromatic bonds and cyclopropabenzene's ring an sp3 atom, so both
// are kept.
func smallAromaticRing(o *outputBuilder, m *mol) bool {
	arom := func(a, b int) int {
		if o.aromaticPair(m, a, b) {
			return 1
		}
		return 0
	}
	for a := 0; a < m.n; a++ {
		if m.deg[a] < 3 {
			continue // each end of the closing bond has three ring bonds
		}
		for k := 0; k < int(m.deg[a]); k++ {
			b := int(m.nb[a][k])
			for j := 0; j < int(m.deg[b]); j++ {
				c := int(m.nb[b][j])
				if c == a {
					continue
				}
				// three-membered ring a–b–c–a
				if c > b && m.order(c, a) > 0 && o.aromaticAtom(m, a) && o.aromaticAtom(m, b) && o.aromaticAtom(m, c) &&
					arom(a, b)+arom(b, c)+arom(c, a) >= 2 {
					return true
				}
				// four-membered ring a–b–c–d–a
				for i := 0; i < int(m.deg[c]); i++ {
					d := int(m.nb[c][i])
					if d == b || d == a || d < b || m.order(d, a) == 0 {
						continue
					}
					if o.aromaticAtom(m, a) && o.aromaticAtom(m, b) && o.aromaticAtom(m, c) && o.aromaticAtom(m, d) &&
						arom(a, b)+arom(b, c)+arom(c, d)+arom(d, a) >= 3 {
						return true
					}
				}
			}
		}
	}
	return false
}

// aromaticAtom reports whether atom x has an aromatic bond.
func (o *outputBuilder) aromaticAtom(m *mol, x int) bool {
	for k := 0; k < int(m.deg[x]); k++ {
		if o.aromatic(m, x, k) {
			return true
		}
	}
	return false
}

func fusedCyclopropene(o *outputBuilder, m *mol) bool {
	for a := 0; a < m.n; a++ {
		for k := 0; k < int(m.deg[a]); k++ {
			b := int(m.nb[a][k])
			if b < a || m.bo[a][k] != 2 || (m.deg[a] < 3 && m.deg[b] < 3) {
				continue
			}
			for j := 0; j < int(m.deg[a]); j++ {
				x := int(m.nb[a][j])
				if x == b || m.order(b, x) == 0 {
					continue
				}
				// a=b lies in the three-membered ring a–b–x; is the third
				// bond of a or b a ring bond too?
				if (o.thirdRingBond(m, a, b, x) || o.thirdRingBond(m, b, a, x)) && !o.aromatic(m, a, k) {
					return true
				}
			}
		}
	}
	return false
}

// thirdRingBond reports whether atom c (of the ring c–d–x) has a bond
// other than to d and x that lies in a ring.
func (o *outputBuilder) thirdRingBond(m *mol, c, d, x int) bool {
	for k := 0; k < int(m.deg[c]); k++ {
		y := int(m.nb[c][k])
		if y != d && y != x && o.ringSize(m, c, y) > 0 {
			return true
		}
	}
	return false
}

// ringAvoiding reports whether a and b are joined by a path that uses
// neither the bond a–b nor the atom x.
func (o *outputBuilder) ringAvoiding(m *mol, a, b, x int) bool {
	bb := uint64(1) << uint(b)
	reach := uint64(1)<<uint(a) | uint64(1)<<uint(x)
	frontier := uint64(1) << uint(a)
	for frontier != 0 {
		var next uint64
		for f := frontier; f != 0; f &= f - 1 {
			y := bits.TrailingZeros64(f)
			nb := m.adj[y]
			if y == a {
				nb &^= bb
			}
			next |= nb
		}
		next &^= reach
		if next&bb != 0 {
			return true
		}
		reach |= next
		frontier = next
	}
	return false
}

// Strained small rings. The rules below find three- and four-membered
// rings through the neighbour bit masks: a three-membered ring is a bond
// b–c between two neighbours of a; a four-membered ring a–b–c–d is an atom
// c bonded to two neighbours b and d of a.

// eachSmallRing calls f with the atoms of every three-membered ring
// (d = -1) and every four-membered ring (in ring order a–b–c–d) of m, each
// once, until f returns true; it reports whether f did.
func eachSmallRing(m *mol, f func(a, b, c, d int) bool) bool {
	for a := 0; a < m.n; a++ {
		if m.deg[a] < 2 {
			continue
		}
		above := ^uint64(0) << uint(a+1) // atoms after a: a is the ring's smallest atom
		for nb := m.adj[a] & above; nb != 0; nb &= nb - 1 {
			b := bits.TrailingZeros64(nb)
			// three-membered rings a–b–c with b < c
			for c3 := m.adj[b] & m.adj[a] & (^uint64(0) << uint(b+1)); c3 != 0; c3 &= c3 - 1 {
				if f(a, b, bits.TrailingZeros64(c3), -1) {
					return true
				}
			}
			// four-membered rings a–b–c–d with b < d
			for nd := m.adj[a] & (^uint64(0) << uint(b+1)); nd != 0; nd &= nd - 1 {
				d := bits.TrailingZeros64(nd)
				for cs := m.adj[b] & m.adj[d] & above; cs != 0; cs &= cs - 1 {
					if f(a, b, bits.TrailingZeros64(cs), d) {
						return true
					}
				}
			}
		}
	}
	return false
}

// smallRingJunction reports two rings of three or four atoms that share
// an atom (fused, bridged or spiro).
func smallRingJunction(o *outputBuilder, m *mol) bool {
	var count [MaxAtoms]uint8
	return eachSmallRing(m, func(a, b, c, d int) bool {
		shared := false
		for _, x := range [4]int{a, b, c, d} {
			if x < 0 {
				continue
			}
			count[x]++
			shared = shared || count[x] > 1
		}
		return shared
	})
}

// ringHeteroatom reports whether x is a ring heteroatom for the
// four-membered-ring rules: O, N or divalent S.
func ringHeteroatom(m *mol, x int) bool {
	switch m.el[x] {
	case molecule.O, molecule.N:
		return true
	}
	return isDivalentS(m, x)
}

// fourRingHeteroatomPair reports a four-membered ring of carbons and at
// least two O, N or divalent S atoms, except a uretdione
// (1,3-diazetidine-2,4-dione).
func fourRingHeteroatomPair(o *outputBuilder, m *mol) bool {
	return eachSmallRing(m, func(a, b, c, d int) bool {
		if d < 0 {
			return false
		}
		ring := [4]int{a, b, c, d}
		het := 0
		for _, x := range ring {
			switch {
			case ringHeteroatom(m, x):
				het++
			case m.el[x] != molecule.C:
				return false // P, Si, B or hypervalent S in the ring
			}
		}
		if het < 2 {
			return false
		}
		// uretdione: N, C(=O), N, C(=O) around the ring
		for k := 0; k < 2; k++ {
			if m.el[ring[k]] == molecule.N && m.el[ring[k+2]] == molecule.N &&
				doubleTo(m, ring[k+1], molecule.O, molecule.O) && doubleTo(m, ring[(k+3)%4], molecule.O, molecule.O) {
				return false
			}
		}
		return true
	})
}

// fourRingHeteroAlkene reports a four-membered ring with an O, N or S
// ring atom and a double or aromatic bond between two of its ring atoms.
func fourRingHeteroAlkene(o *outputBuilder, m *mol) bool {
	return eachSmallRing(m, func(a, b, c, d int) bool {
		if d < 0 {
			return false
		}
		ring := [4]int{a, b, c, d}
		het := false
		for _, x := range ring {
			e := m.el[x]
			het = het || e == molecule.O || e == molecule.N || e == molecule.S
		}
		if !het {
			return false
		}
		for k, x := range ring {
			y := ring[(k+1)%4]
			if m.order(x, y) == 2 {
				return true
			}
			// a single bond of a Kekulé structure may still be aromatic
			// (benzoxete); only bonds between unsaturated atoms can be
			if m.bsum[x] > m.deg[x] && m.bsum[y] > m.deg[y] && o.aromaticPair(m, x, y) {
				return true
			}
		}
		return false
	})
}

// cyclopropene reports a non-aromatic C=C inside a three-membered ring,
// except in a cyclopropenone.
func cyclopropene(o *outputBuilder, m *mol) bool {
	return eachSmallRing(m, func(a, b, c, d int) bool {
		if d >= 0 {
			return false
		}
		ring := [3]int{a, b, c}
		for k, x := range ring {
			y, z := ring[(k+1)%3], ring[(k+2)%3]
			if m.el[x] != molecule.C || m.el[y] != molecule.C || m.order(x, y) != 2 || o.aromaticPair(m, x, y) {
				continue
			}
			if m.el[z] == molecule.C && doubleTo(m, z, molecule.O, molecule.O) {
				continue // cyclopropenone
			}
			return true
		}
		return false
	})
}
