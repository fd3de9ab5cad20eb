package ranker_test

import (
	"context"
	"fmt"

	"shiftrank/molecule"
	"shiftrank/ranker"
	"shiftrank/spectrum"
)

// Rank the isomers of C4H8O2 against the published spectrum of ethyl
// acetate in CDCl3 (Gottlieb, Kotlyar, Nudelman, J. Org. Chem. 1997, 62,
// 7512; from memory).
func ExampleRanker_Rank() {
	pl, err := spectrum.ReadList([]byte("1H NMR (300 MHz, CDCl3) δ 4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H), 1.26 (t, J = 7.1 Hz, 3H)"), spectrum.H1)
	if err != nil {
		fmt.Println(err)
		return
	}
	res, err := ranker.New(ranker.Options{}).Rank(context.Background(), ranker.Request{Formula: "C4H8O2", Peaks: pl, TopK: 3}, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(res.Formula, "all isomers scored:", res.Complete && res.Scored == res.IsomersTotal)
	best := res.Candidates[0]
	ethylAcetate := molecule.CanonicalSMILES(molecule.MustParseSMILES("CCOC(C)=O"))
	fmt.Println("first is ethyl acetate:", best.SMILES == ethylAcetate)
	// Atom numbers index the atoms of best.SMILES in writing order.
	g := molecule.MustParseSMILES(best.SMILES)
	for _, a := range best.Assignments {
		at := g.Atoms[a.Atoms[0]]
		fmt.Printf("δ %.2f %s %dH -> %s%d, predicted %s\n", a.ObservedShift, a.ObservedMultiplicity, a.ExpectedH, at.Element, at.HCount, a.PredictedMultiplicity)
	}
	// Output:
	// C4H8O2 all isomers scored: true
	// first is ethyl acetate: true
	// δ 4.12 q 2H -> C2, predicted q
	// δ 2.05 s 3H -> C3, predicted s
	// δ 1.26 t 3H -> C3, predicted t
}
