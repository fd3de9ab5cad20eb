package predict_test

import (
	"fmt"

	"shiftrank/molecule"
	"shiftrank/predict"
)

// Ethyl acetate, 13C: the additive increments give 171.0 (C=O), 60.4
// (OCH2), 20.7 (CH3CO) and 13.8 (CH3) ppm against 171.4, 60.5, 21.0 and
// 14.2 observed in CDCl3 (Gottlieb, Kotlyar, Nudelman, J. Org. Chem. 1997,
// 62, 7512).
func ExamplePredictor_Carbon() {
	g, err := molecule.ParseSMILES("CCOC(=O)C")
	if err != nil {
		panic(err)
	}
	sp, err := predict.New(predict.Options{}).Carbon(g)
	if err != nil {
		panic(err)
	}
	for _, s := range sp.Signals {
		fmt.Printf("%.1f ppm %-3s ±%.1f atoms %v\n", s.Shift, s.Class, s.Sigma, s.Atoms)
	}
	// Output:
	// 171.0 ppm C   ±1.5 atoms [3]
	// 60.4 ppm CH2 ±1.9 atoms [1]
	// 20.7 ppm CH3 ±1.9 atoms [5]
	// 13.8 ppm CH3 ±1.7 atoms [0]
}
