package isomers

import (
	"errors"
	"regexp"
	"testing"

	"shiftrank/molecule"
)

// filterCases: for each rule, structures it removes and real compounds it
// keeps. The kept compounds are known, isolable substances (common
// practice: cyclooctyne, 1,2-cyclononadiene, bicyclo[3.3.1]non-1-ene
// (Fawcett's S = 7, isolable), Δ9,10-octalin, norbornene, phenol,
// acetamide, acetaldoxime, 2-hydroxypyridine, ethylene glycol,
// 2-methoxyethanol, ethanolamine, N-(hydroxymethyl)acetamide,
// 2-chloroethanol, cyclopropenone, 2H-azirines, biphenylene,
// DMSO, phosphorous acid, SF4, PCl5, dimethyl sulfone, trimethylphosphine
// oxide, methanesulfinic acid, methylphosphonic acid,
// methylenetriphenylphosphorane (the Wittig reagent), carbon disulfide,
// trimethyl phosphite, dimethylphosphine oxide and sulfide, methyl
// methanesulfenate, 2-mercaptoethanol, 1,1-ethanedithiol, phosphoric
// acid, pentamethoxyphosphorane, methanesulfonic acid, cyclopropabenzene,
// norcarane, methylenecyclopropane, pinane, α-pinene, 3-carene, sabinene,
// β-caryophyllene, bicyclo[2.1.1]hexane, cyclobutane, oxetane, β-propiolactone,
// azetidin-2-one, thietane, 1,3-dimethyluretdione, 1,2-thiazetidine
// 1,1-dioxide (a β-sultam), diketene, oxetan-3-one, cyclobutene,
// benzocyclobutene, diphenylcyclopropenone). Cyclopropene,
// 1-methylcyclopropene, triafulvene and spiro[2.2]pent-1-ene are real but
// rare and unstable; the default filter removes them (no-cyclopropene,
// no-small-ring-junction).
var filterCases = []struct {
	rule   string
	remove []string
	keep   []string
}{
	{"no-small-ring-triple", []string{"C1CC#CC1", "C1CCC#CCC1"}, []string{"C1CCCC#CCC1", "CC#CC", "C#CC1CC1"}},
	{"no-small-ring-allene", []string{"C1CC=C=C1", "C1CCC=C=CC1"}, []string{"C1CCCC=C=CCC1", "C=C=C", "C=C=C1CC1"}},
	{"no-bredt-violation", []string{"C12=CCC(C1)CC2", "C12=CCC(CC1)CC2"}, []string{"C12=CCCC(CCC1)C2", "C1=CC2CCC1C2", "C1CCC2=C(C1)CCCC2", "c1ccc2ccccc2c1"}},
	{"no-peroxide", []string{"COOC", "CCOO"}, []string{"COC", "CC(=O)OC", "O=O"}},
	{"no-enol", []string{"C=CO", "CC(O)=CC", "C#CO"}, []string{"Oc1ccccc1", "CC(C)=O", "C=CCO", "C=COC"}},
	{"no-imidic-acid", []string{"CC(O)=N", "OC=NC"}, []string{"CC(N)=O", "CC=NO", "Oc1ccccn1"}},
	{"no-gem-diol", []string{"CC(O)O", "OC(O)(C)C"}, []string{"OCCO", "OC(=O)CO"}},
	{"no-hemiacetal", []string{"CC(O)OC", "OC1CCCO1", "CC(O)S", "CC(O)SC", "CC(S)OC"}, []string{"COCCO", "CC(=O)O", "COC(C)OC", "OCCS", "CC(S)S"}},
	{"no-hemiaminal", []string{"CC(O)N", "OCN(C)C"}, []string{"NCCO", "OCNC(C)=O", "CC(N)=O"}},
	{"no-hypohalite", []string{"COCl", "CCOBr"}, []string{"ClCCO", "CC(=O)Cl"}},
	{"no-antiaromatic-ring", []string{"C1=CO1", "C1=CS1", "C1=CN1", "C1=CC=C1", "CC1=NC=C1"}, []string{"O=C1C=C1", "C1=NC1", "c1ccc2c(c1)-c1ccccc1-2", "C1=CCC1"}},
	{"no-hypervalent-hydride", []string{"C[SH3]", "[PH5]", "C[SH](=O)(=O)", "C=[PH2]C"}, []string{"CS(C)=O", "O[PH](O)=O", "C[PH](C)=O", "C[PH](C)=S", "CS", "CP"}},
	{"no-ylide-tautomer", []string{"C=P(C)(C)O", "C=S(C)O", "C=P(O)(O)O"}, []string{"CP(C)(C)=O", "CS(=O)O", "CP(=O)(O)O", "C=P(c1ccccc1)(c1ccccc1)c1ccccc1"}},
	{"no-sulfur-ylide", []string{"C=S(C)C", "C=S=O", "C=S(=O)=O", "C#S(C)(O)O"}, []string{"CS(C)=O", "CS(C)(=O)=O", "C=P(c1ccccc1)(c1ccccc1)c1ccccc1", "S=C=S"}},
	{"no-trivalent-p-oh", []string{"OP(O)O", "CP(C)O", "COP(O)OC"}, []string{"COP(OC)OC", "O[PH](O)=O", "C[PH](C)=O", "CP(C)C"}},
	{"no-sulfenic-acid", []string{"CSO", "COS", "CCSO"}, []string{"CSOC", "CS(=O)O", "CSC", "COC"}},
	{"no-hypervalent-hydrate", []string{"OP(O)(O)(O)O", "CP(O)(O)(O)O", "CS(C)(O)O", "OS1(O)CC1"}, []string{"OP(O)(O)=O", "ClP(Cl)(Cl)(Cl)Cl", "COP(OC)(OC)(OC)OC", "CS(=O)(=O)O", "FS(F)(F)F"}},
	{"no-small-aromatic-ring", []string{"Cn1c2ccc21", "Cc1cc2[nH]c12", "Cc1c2ccn12"}, []string{"c1ccc2c(c1)C2", "c1ccc2c(c1)-c1ccccc1-2", "c1ccccc1", "c1ccc2Cn12", "c1[nH]cc2Cc12", "O=C1C=C1"}},
	{"no-fused-cyclopropene", []string{"C1CCC2=C(C1)C2", "C1C2=C1C2", "C1CC2=C1C2", "C1=C2CC=CC12", "C1CC2C=C2C1"}, []string{"O=C1C=C1", "c1ccc2c(c1)C2", "C1CC2CC2C1", "C=C1CC1"}},
	{"no-small-ring-junction", []string{"C1C2CC12", "C1CC2CC12", "C1CC2CCC12", "C1C23CC12C3", "C1C2CC1C2", "C1CC11CC1", "C1CC2(C1)CCC2", "C12C3C4C1C5C2C3C45", "C1=CC11CC1"}, []string{"CC1CCC2CC1C2(C)C", "CC1=CCC2CC1C2(C)C", "CC1=CCC2C(C1)C2(C)C", "CC(C)C12CCC(=C)C1C2", "CC1=CCCC(=C)C2CC(C)(C)C2CC1", "C1CC2CC1C2", "C1CCC1"}},
	{"no-four-ring-heteroatom-pair", []string{"C1OCO1", "CC1(C)OOC1(C)C", "C1NCN1", "C1CNO1", "C1SCS1", "CN1CN(C)C1=O"}, []string{"C1COC1", "O=C1CCO1", "O=C1CCN1", "C1CSC1", "CN1C(=O)N(C)C1=O", "O=S1(=O)CCN1"}},
	{"no-four-ring-hetero-alkene", []string{"C1=COC1", "C1=CNC1", "C1CN=C1", "C1=CSC1", "c1ccc2c(c1)CO2", "c1ccc2c(c1)CS2", "C1CCC2=C(C1)CO2"}, []string{"O=C1CCO1", "C=C1CC(=O)O1", "O=C1COC1", "C1=CCC1", "C1Cc2ccccc21", "O=C1CCN1"}},
	{"no-cyclopropene", []string{"C1=CC1", "CC1=CC1", "CC1(C)C=C1", "CC1=C(C)C1", "C=C1C=C1", "CCCCCCCCC1=C(CCCCCCCC(=O)O)C1"}, []string{"O=C1C=C1", "O=C1C(c2ccccc2)=C1c1ccccc1", "c1ccc2c(c1)C2", "C=C1CC1", "C1=NC1", "CC1(C)CC1C(=O)O"}},
	{"no-bare-hypervalent", []string{"C[S](C)(C)C", "C[P](C)(C)(C)C"}, []string{"FS(F)(F)F", "ClP(Cl)(Cl)(Cl)Cl", "CS(C)(=O)=O", "CS(C)=O", "COP(=O)(OC)OC"}},
}

func TestFilterRules(t *testing.T) {
	seen := map[string]bool{}
	for _, c := range filterCases {
		seen[c.rule] = true
		only, err := ParseFilter("none,+" + c.rule)
		if err != nil {
			t.Fatalf("ParseFilter: %v", err)
		}
		for _, s := range c.remove {
			g, err := molecule.ParseSMILES(s)
			if err != nil {
				t.Fatalf("ParseSMILES(%q): %v", s, err)
			}
			if ok, rule := only.Allows(g); ok || rule != c.rule {
				t.Errorf("rule %s: Allows(%q) = %v, %q; want removed", c.rule, s, ok, rule)
			}
		}
		for _, s := range c.keep {
			g, err := molecule.ParseSMILES(s)
			if err != nil {
				t.Fatalf("ParseSMILES(%q): %v", s, err)
			}
			if ok, _ := only.Allows(g); !ok {
				t.Errorf("rule %s: removes real compound %q", c.rule, s)
			}
			if ok, rule := DefaultFilter().Allows(g); !ok {
				t.Errorf("default filter removes real compound %q by %s", s, rule)
			}
		}
	}
	kebab := regexp.MustCompile(`^[a-z]+(-[a-z0-9]+)*$`)
	names := map[string]bool{}
	for _, r := range Rules() {
		if !kebab.MatchString(r.Name) || len(r.Reason) < 40 {
			t.Errorf("rule %q: name must be kebab-case and reason written out (%q)", r.Name, r.Reason)
		}
		if names[r.Name] {
			t.Errorf("rule %q listed twice", r.Name)
		}
		names[r.Name] = true
		if !seen[r.Name] {
			t.Errorf("rule %q has no table test", r.Name)
		}
	}
}

func TestParseFilter(t *testing.T) {
	all := len(Rules())
	cases := []struct {
		in      string
		enabled int
		wantErr bool
		bad     string // offending token when an error is expected
	}{
		{"", all, false, ""},
		{"plausible", all, false, ""},
		{"none", 0, false, ""},
		{"plausible,-no-enol", all - 1, false, ""},
		{" plausible , -no-enol , -no-peroxide", all - 2, false, ""},
		{"none,+no-peroxide", 1, false, ""},
		{"no-peroxide", all, false, ""},
		{"none,no-peroxide,+no-enol", 2, false, ""},
		{"plausible,-no-such-rule", 0, true, "-no-such-rule"},
		{"none,plausible", 0, true, "plausible"},
		{"none,,+no-enol", 0, true, ""},
		{"bogus", 0, true, "bogus"},
	}
	for _, c := range cases {
		f, err := ParseFilter(c.in)
		var fe *FilterError
		if c.wantErr {
			if !errors.As(err, &fe) {
				t.Errorf("ParseFilter(%q) error = %v, want *FilterError", c.in, err)
				continue
			}
			if fe.Token != c.bad || fe.Input[fe.Pos:fe.Pos+len(fe.Token)] != fe.Token {
				t.Errorf("ParseFilter(%q) error token %q at %d, want %q", c.in, fe.Token, fe.Pos, c.bad)
			}
			continue
		}
		if err != nil {
			t.Errorf("ParseFilter(%q): %v", c.in, err)
			continue
		}
		if got := len(f.Enabled()); got != c.enabled {
			t.Errorf("ParseFilter(%q) enables %d rules, want %d", c.in, got, c.enabled)
		}
		back, err := ParseFilter(f.String())
		if err != nil || back != f {
			t.Errorf("ParseFilter(%q).String() = %q does not parse back (%v)", c.in, f.String(), err)
		}
	}
	if (Filter{}) != DefaultFilter() || (Options{}).Filter != DefaultFilter() {
		t.Error("zero Filter must equal DefaultFilter()")
	}
}

func FuzzParseFilter(f *testing.F) {
	for _, s := range []string{"", "plausible", "none", "plausible,-no-enol", "none,+no-peroxide", " none , no-enol ", ",", "-", "+", "none,plausible", "no-such", "plausible,,", "ünï,-x"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		flt, err := ParseFilter(s)
		if err != nil {
			var fe *FilterError
			if !errors.As(err, &fe) {
				t.Fatalf("ParseFilter(%q): %T, want *FilterError", s, err)
			}
			if fe.Pos < 0 || fe.Pos+len(fe.Token) > len(s) || s[fe.Pos:fe.Pos+len(fe.Token)] != fe.Token {
				t.Fatalf("ParseFilter(%q): token %q not at position %d", s, fe.Token, fe.Pos)
			}
			return
		}
		back, err := ParseFilter(flt.String())
		if err != nil || back != flt {
			t.Fatalf("ParseFilter(%q).String() = %q does not parse back", s, flt.String())
		}
	})
}

// TestFilterGates: skipping rules whose required features are absent
// (ruleDef.need) never changes the verdict.
func TestFilterGates(t *testing.T) {
	for _, fs := range []string{"C6H6O", "C3H9O4P", "C4H7NO", "C3H5ClO", "C2H6O2S", "C4H4S", "C5H5N", "C4H8O3", "C3H4BrF"} {
		eachMol(t, fs, func(m *mol) {
			var gated, plain outputBuilder
			want := -1
			for i := range ruleTable {
				if ruleTable[i].violates(&plain, m) {
					want = i
					break
				}
			}
			if got := DefaultFilter().check(&gated, m); got != want {
				t.Fatalf("%s: gated filter says rule %d, ungated %d", fs, got, want)
			}
		})
	}
}
