package predict_test

import (
	"fmt"

	"shiftrank/molecule"
	"shiftrank/predict"
)

// Ethyl acetate: the additive increments give δ 4.12 (q), 2.05 (s) and
// 1.26 (t), as observed in CDCl3 (Gottlieb, Kotlyar, Nudelman, J. Org.
// Chem. 1997, 62, 7512).
func ExamplePredictor_Predict() {
	g, err := molecule.ParseSMILES("CC(=O)OCC")
	if err != nil {
		panic(err)
	}
	sp, err := predict.New(predict.Options{MHz: 400}).Predict(g)
	if err != nil {
		panic(err)
	}
	for _, e := range sp.Environments {
		fmt.Printf("%.2f ppm %-2s %dH J=%v atoms %v\n", e.Shift, e.Multiplicity, e.H, e.J, e.Atoms)
	}
	// Output:
	// 4.12 ppm q  2H J=[7] atoms [4]
	// 2.05 ppm s  3H J=[] atoms [0]
	// 1.26 ppm t  3H J=[7] atoms [5]
}

// A strongly coupled pair of protons (an AB system, Δν = 20 Hz, J = 8 Hz at
// 400 MHz) is simulated exactly: lines at ν0 ± D/2 ± J/2 with
// D = sqrt(Δν² + J²) = 21.5 Hz and the roof effect, inner/outer intensity
// (1 + J/D)/(1 − J/D) = 2.18 (Friebolin ch. 4).
func ExampleSimulate() {
	sp := &predict.Spectrum{Environments: []predict.Environment{
		{ID: 0, H: 1, Shift: 7.00, Couplings: []predict.Coupling{{Env: 1, N: 1, J: 8, Resolved: true}}},
		{ID: 1, H: 1, Shift: 7.05, Couplings: []predict.Coupling{{Env: 0, N: 1, J: 8, Resolved: true}}},
	}}
	tr := predict.Simulate(sp, predict.SimOptions{MHz: 400, PPMMin: 6.5, PPMMax: 7.5, Points: 1001})
	for _, l := range tr.Lines {
		fmt.Printf("%.4f ppm  %.3f\n", l.PPM, l.Intensity)
	}
	// Output:
	// 6.9881 ppm  0.314
	// 7.0081 ppm  0.686
	// 7.0419 ppm  0.686
	// 7.0619 ppm  0.314
}
