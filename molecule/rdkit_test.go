package molecule

import (
	"bufio"
	"bytes"
	"os/exec"
	"strings"
	"testing"

	"shiftrank/internal/rdkittest"
)

// rdkitCrossCheckSMILES: varied compounds (aromatics, heteroaromatics,
// hypervalent S and P, rings, triple bonds, halogens). The expected values
// are not written here: RDKit computes them from the input.
var rdkitCrossCheckSMILES = []string{
	"CCO", "OCC", "CC(C)C", "CC(C)(C)C", "C1CCCCC1", "C1CC1", "C1CC2CCC1C2",
	"C=CC=C", "C#CC", "CC#N", "C=C=C", "O=CC", "CC(=O)O", "CC(=O)OC", "COC(C)=O",
	"c1ccccc1", "C1=CC=CC=C1", "Cc1ccccc1", "CC1=CC=CC=C1C", "c1ccc2ccccc2c1",
	"C1=CC2=CC=CC=C2C=C1", "c1ccc2cc3ccccc3cc2c1", "c1ccc2c(c1)ccc1ccccc12",
	"c1ccncc1", "c1cc[nH]c1", "c1ccoc1", "c1ccsc1", "c1cnc[nH]1", "c1cn[nH]c1",
	"c1ccc2[nH]ccc2c1", "c1ccc2occc2c1", "c1cncnc1", "n1ccccc1C(=O)N",
	"O=C1C=CC=CN1", "O=C1C=CC(=O)C=C1", "c1ccc2cccc2cc1",
	"CS(=O)(=O)C", "CS(C)=O", "CP(=O)(C)C", "COP(=O)(OC)OC", "CSC", "CS",
	"ClC(Cl)Cl", "FC(F)(F)c1ccccc1", "Brc1ccc(I)cc1", "ClCCBr",
	"C1=CC=CC=CC=C1", "C1=CC=C1", "Oc1ccccc1", "Nc1ccccc1", "c1ccc(-c2ccccc2)cc1",
	"O=[N+]([O-])c1ccccc1", "[NH4+]", "C[N+](C)(C)C", "CC(=O)[O-]", "[SiH4]", "C[Si](C)(C)C",
	"B(O)(O)c1ccccc1", "OB(O)O", "C1COCCN1", "C1CSCCS1",
	"O=c1cccc[nH]1", "c1ccc2c(c1)-c1ccccc1-2", "C1=CC2=C1C=CC=C2", "C=C1C=CC=C1",
	"C1=CC2=CC=CC2=C1", "[cH+]1cccccc1", "[cH-]1cccc1", "c1cc[n+](C)cc1", "[o+]1ccccc1", "c1cc[n-]c1",
	"c1ccc2c(c1)c1ccccc1c1ccccc21", "c1cc2cccc3c4cccc5cccc(c(c1)c23)c54", "Cn1ccnc1",
	"c1ccc2nonc2c1", "c1nnn[nH]1", "s1cccc1-c1cccs1", "C1=CC=CC=CC=CC=C1",
	"C#Cc1ccccc1", "N#Cc1ccccc1C#N", "CC(=O)c1ccc(O)cc1", "O=C(O)c1ccccc1O",
	"c1ccc2c(c1)[nH]c1ccccc12", "c1ccc2ncccc2c1", "c1cnc2[nH]cnc2n1", "Cc1ccc(S(=O)(=O)N)cc1",
	"C1CC2CC1C=C2", "CC1(C)C2CCC1(C)C(=O)C2", "OCC(O)CO", "C=CC(=O)OC", "CCOP(=S)(OCC)Oc1ccccc1",
}

func TestCanonicalSMILESAgainstRDKit(t *testing.T) {
	rdkittest.Require(t)
	var in bytes.Buffer
	var ours []string
	for _, s := range rdkitCrossCheckSMILES {
		g, err := ParseSMILES(s)
		if err != nil {
			t.Fatalf("ParseSMILES(%q): %v", s, err)
		}
		cs := CanonicalSMILES(g)
		ours = append(ours, cs)
		in.WriteString(s + "\t" + cs + "\n")
	}
	cmd := exec.Command(rdkittest.Python, "testdata/rdkit_canon.py")
	cmd.Stdin = &in
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("run RDKit: %v", err)
	}
	sc := bufio.NewScanner(bytes.NewReader(out))
	i := 0
	for sc.Scan() {
		if i >= len(ours) {
			t.Fatalf("RDKit printed more lines than inputs")
		}
		f := strings.Split(sc.Text(), "\t")
		s, cs := rdkitCrossCheckSMILES[i], ours[i]
		i++
		if f[0] != "ok" {
			t.Errorf("RDKit cannot parse %s of %q (ours %q)", f[1], s, cs)
			continue
		}
		if f[1] != f[2] {
			t.Errorf("CanonicalSMILES(%q) = %q: RDKit formula %s, want %s (RDKit of the input)", s, cs, f[2], f[1])
		}
		if f[3] != f[4] {
			t.Errorf("CanonicalSMILES(%q) = %q: RDKit canonical %s, want %s (RDKit canonical of the input)", s, cs, f[4], f[3])
		}
		g, _ := ParseSMILES(s)
		if got, want := g.Formula(), rdkitFormula(f[1]); got != want {
			t.Errorf("ParseSMILES(%q).Formula() = %s, want %s (RDKit %s)", s, got, want, f[1])
		}
	}
	if i != len(ours) {
		t.Fatalf("RDKit printed %d lines, want %d", i, len(ours))
	}
}

// rdkitFormula reads a formula as RDKit prints it ("C2H3O2-", "H3BO3"),
// ignoring the charge suffix.
func rdkitFormula(s string) Formula {
	if k := strings.IndexAny(s, "+-"); k >= 0 {
		s = s[:k]
	}
	counts := map[Element]int{}
	for i := 0; i < len(s); {
		j := i + 1
		for j < len(s) && s[j] >= 'a' && s[j] <= 'z' {
			j++
		}
		e, _ := ElementBySymbol(s[i:j])
		n := 0
		for j < len(s) && s[j] >= '0' && s[j] <= '9' {
			n = n*10 + int(s[j]-'0')
			j++
		}
		if n == 0 {
			n = 1
		}
		counts[e] += n
		i = j
	}
	return NewFormula(counts)
}
