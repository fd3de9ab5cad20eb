package isomers

import (
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"shiftrank/molecule"
)

// smallRingCases: natural-product skeletons and everyday small rings the
// default filter must keep, and strained small rings no isolated unknown
// has, which it must remove (rule = the first rule that objects). The
// structures are textbook compounds (common practice); the natural
// products are the terpene skeletons pinane, carane and thujane and the
// sesquiterpene β-caryophyllene, drawn without stereochemistry.
var smallRingCases = []struct {
	name, smiles, rule string // rule "" = kept
}{
	// kept: terpenes with a three- or four-membered ring
	{"pinane (bicyclo[3.1.1]heptane)", "CC1CCC2CC1C2(C)C", ""},
	{"α-pinene", "CC1=CCC2CC1C2(C)C", ""},
	{"β-pinene", "C=C1CCC2CC1C2(C)C", ""},
	{"carane (bicyclo[4.1.0]heptane)", "CC1CCC2C(C1)C2(C)C", ""},
	{"3-carene", "CC1=CCC2C(C1)C2(C)C", ""},
	{"thujane (bicyclo[3.1.0]hexane)", "CC1CCC2(C(C)C)CC12", ""},
	{"sabinene", "CC(C)C12CCC(=C)C1C2", ""},
	{"thujone", "CC1C(=O)CC2(C(C)C)CC12", ""},
	{"β-caryophyllene (cyclobutane fused to a nine-membered ring)", "CC1=CCCC(=C)C2CC(C)(C)C2CC1", ""},
	{"grandisol", "CC(=C)C1CCC1(C)CCO", ""},
	{"chrysanthemic acid", "CC(C)=CC1C(C(=O)O)C1(C)C", ""},
	// kept: everyday small rings
	{"cyclopropane", "C1CC1", ""},
	{"cyclobutane", "C1CCC1", ""},
	{"methylcyclopropyl ketone", "CC(=O)C1CC1", ""},
	{"ethylene oxide", "C1CO1", ""},
	{"propylene oxide", "CC1CO1", ""},
	{"aziridine", "C1CN1", ""},
	{"oxetane", "C1COC1", ""},
	{"oxetan-3-one", "O=C1COC1", ""},
	{"β-propiolactone", "O=C1CCO1", ""},
	{"β-butyrolactone", "CC1CC(=O)O1", ""},
	{"diketene", "C=C1CC(=O)O1", ""},
	{"azetidin-2-one (β-lactam)", "O=C1CCN1", ""},
	{"penam core (4-thia-1-azabicyclo[3.2.0]heptan-7-one)", "O=C1CC2SCCN12", ""},
	{"7-oxabicyclo[4.2.0]octane (oxetane fused to cyclohexane, as in taxanes)", "C1CCC2OCC2C1", ""},
	{"thietane", "C1CSC1", ""},
	{"cyclobutene", "C1=CCC1", ""},
	{"benzocyclobutene", "C1Cc2ccccc21", ""},
	{"cyclopropabenzene", "c1ccc2c(c1)C2", ""},
	{"cyclopropenone", "O=C1C=C1", ""},
	{"diphenylcyclopropenone", "O=C1C(c2ccccc2)=C1c1ccccc1", ""},
	{"methylenecyclopropane", "C=C1CC1", ""},
	{"bicyclo[2.1.1]hexane", "C1CC2CC1C2", ""},
	{"1,3-dimethyluretdione (methyl isocyanate dimer)", "CN1C(=O)N(C)C1=O", ""},
	// removed: two small rings sharing an atom
	{"bicyclo[1.1.0]butane", "C1C2CC12", "no-small-ring-junction"},
	{"bicyclo[2.1.0]pentane (housane)", "C1CC2CC12", "no-small-ring-junction"},
	{"bicyclo[2.2.0]hexane", "C1CC2CCC12", "no-small-ring-junction"},
	{"[1.1.1]propellane", "C1C23CC12C3", "no-small-ring-junction"},
	{"bicyclo[1.1.1]pentane", "C1C2CC1C2", "no-small-ring-junction"},
	{"spiropentane", "C1CC11CC1", "no-small-ring-junction"},
	{"spiro[2.3]hexane", "C1CC11CCC1", "no-small-ring-junction"},
	{"spiro[3.3]heptane", "C1CC2(C1)CCC2", "no-small-ring-junction"},
	{"2-oxabicyclo[2.1.0]pentane (epoxide fused to cyclobutane)", "C1CC2OC12", "no-small-ring-junction"},
	{"cubane", "C12C3C4C1C5C2C3C45", "no-small-ring-junction"},
	// removed: four-membered rings with two heteroatoms
	{"1,3-dioxetane", "C1OCO1", "no-four-ring-heteroatom-pair"},
	{"2,2-dimethyl-1,3-dioxetane", "CC1(C)OCO1", "no-four-ring-heteroatom-pair"},
	{"tetramethyl-1,2-dioxetane (a peroxide)", "CC1(C)OOC1(C)C", "no-peroxide"},
	{"1,3-diazetidine", "C1NCN1", "no-four-ring-heteroatom-pair"},
	{"1,2-oxazetidine", "C1CNO1", "no-four-ring-heteroatom-pair"},
	{"1,3-dithietane", "C1SCS1", "no-four-ring-heteroatom-pair"},
	{"1,3-oxathietane", "C1OCS1", "no-four-ring-heteroatom-pair"},
	// removed: double bond in a four-membered ring with a heteroatom
	{"2H-oxete", "C1=COC1", "no-four-ring-hetero-alkene"},
	{"4-methyl-2H-oxete", "CC1=CCO1", "no-four-ring-hetero-alkene"},
	{"7-oxabicyclo[4.2.0]oct-1(6)-ene (fused oxetene)", "C1CCC2=C(C1)CO2", "no-four-ring-hetero-alkene"},
	{"2-azetine", "C1=CNC1", "no-four-ring-hetero-alkene"},
	{"1-azetine", "C1CN=C1", "no-four-ring-hetero-alkene"},
	{"2H-thiete", "C1=CSC1", "no-four-ring-hetero-alkene"},
	{"2H-benzoxete", "c1ccc2c(c1)CO2", "no-four-ring-hetero-alkene"},
	{"2H-benzothiete", "c1ccc2c(c1)CS2", "no-four-ring-hetero-alkene"},
	// removed: cyclopropenes
	{"cyclopropene", "C1=CC1", "no-cyclopropene"},
	{"1-methylcyclopropene", "CC1=CC1", "no-cyclopropene"},
	{"3,3-dimethylcyclopropene", "CC1(C)C=C1", "no-cyclopropene"},
	{"1,2-dimethylcyclopropene", "CC1=C(C)C1", "no-cyclopropene"},
	{"methyl 2-methylcycloprop-2-ene-1-carboxylate", "COC(=O)C1C=C1C", "no-cyclopropene"},
	{"triafulvene (methylenecyclopropene)", "C=C1C=C1", "no-cyclopropene"},
	{"sterculic acid", "CCCCCCCCC1=C(CCCCCCCC(=O)O)C1", "no-cyclopropene"},
}

func TestFilterSmallRings(t *testing.T) {
	for _, c := range smallRingCases {
		g, err := molecule.ParseSMILES(c.smiles)
		require.NoError(t, err, "%s: ParseSMILES(%q)", c.name, c.smiles)
		ok, rule := DefaultFilter().Allows(g)
		if c.rule == "" {
			assert.True(t, ok, "%s (%s): default filter removes it by %s, want kept (common practice)", c.name, c.smiles, rule)
			continue
		}
		assert.False(t, ok, "%s (%s): default filter keeps it, want removed by %s", c.name, c.smiles, c.rule)
		assert.Equal(t, c.rule, rule, "%s (%s): removed by the wrong rule", c.name, c.smiles)
	}
}
