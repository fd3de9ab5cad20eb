package molecule_test

import (
	"fmt"

	"shiftrank/molecule"
)

func ExampleParseFormula() {
	f, err := molecule.ParseFormula("H8C4O2")
	if err != nil {
		panic(err)
	}
	fmt.Println(f, f.DBE())
	_, err = molecule.ParseFormula("C4H9O")
	fmt.Println(err)
	// Output:
	// C4H8O2 1
	// formula "C4H9O": odd number of electrons: no neutral closed-shell structure exists (check the hydrogen count) at position 0 ("C4H9O")
}

func ExampleParseSMILES() {
	g, err := molecule.ParseSMILES("c1ccccc1O")
	if err != nil {
		panic(err)
	}
	fmt.Println(g.Formula(), g.SMILES())
	_, err = molecule.ParseSMILES("CC.O")
	fmt.Println(err)
	// Output:
	// C6H6O C1=CC=CC=C1O
	// SMILES "CC.O": dot-disconnected SMILES: one molecule per SMILES (no salts or mixtures) at position 2 (".")
}

func ExampleCanonicalSMILES() {
	// Two Kekulé structures of o-xylene and an aromatic spelling.
	for _, s := range []string{"CC1=C(C)C=CC=C1", "CC1=CC=CC=C1C", "c1cccc(C)c1C"} {
		fmt.Println(molecule.CanonicalSMILES(molecule.MustParseSMILES(s)))
	}
	// Output:
	// Cc1ccccc1C
	// Cc1ccccc1C
	// Cc1ccccc1C
}

func ExampleCanonicalize() {
	// Toluene: the methyl carbon, ipso, two ortho, two meta and para.
	g := molecule.MustParseSMILES("Cc1ccccc1")
	c := molecule.Canonicalize(g)
	fmt.Println(c.Orbits)
	// Output:
	// [0 1 2 3 4 3 2]
}

func ExampleFragment_Matches() {
	acid := molecule.MustParseFragment("C(=O)[OH]")
	for _, s := range []string{"CC(=O)O", "CC(=O)OC"} {
		fmt.Println(s, acid.Matches(molecule.MustParseSMILES(s)))
	}
	// Output:
	// CC(=O)O true
	// CC(=O)OC false
}

func ExampleRings() {
	ri := molecule.Rings(molecule.MustParseSMILES("c1ccc2ccccc2c1"))
	fmt.Println(len(ri.SSSR), ri.AtomRingSize)
	// Output:
	// 2 [6 6 6 6 6 6 6 6 6 6]
}
