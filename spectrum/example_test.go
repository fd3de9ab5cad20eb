package spectrum_test

import (
	"fmt"

	"shiftrank/spectrum"
)

// Ethyl acetate in CDCl3 as a journal reports it (1H and 13C shifts
// from Gottlieb, Kotlyar, Nudelman, J. Org. Chem. 1997, 62, 7512, Tables
// 1 and 2; from memory).
func ExampleRead() {
	lists, err := spectrum.Read([]byte("1H NMR (400 MHz, CDCl3) δ 4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H), 1.26 (t, J = 7.1 Hz, 3H); " +
		"13C NMR (101 MHz, CDCl3) δ 171.36 (C), 60.49 (CH2), 21.04 (CH3), 14.19 (CH3)."))
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, pl := range lists {
		fmt.Println(pl.Nucleus, pl.MHz, pl.Solvent)
		for _, p := range pl.Peaks {
			fmt.Printf("  %.2f ppm mult=%q J=%v integral=%g DEPT=%q\n", p.Shift, p.Multiplicity, p.J, p.Integral, p.DEPT)
		}
	}
	// Output:
	// 1H 400 CDCl3
	//   4.12 ppm mult="q" J=[7.1] integral=2 DEPT=""
	//   2.05 ppm mult="s" J=[] integral=3 DEPT=""
	//   1.26 ppm mult="t" J=[7.1] integral=3 DEPT=""
	// 13C 101 CDCl3
	//   171.36 ppm mult="" J=[] integral=0 DEPT="C"
	//   60.49 ppm mult="" J=[] integral=0 DEPT="CH2"
	//   21.04 ppm mult="" J=[] integral=0 DEPT="CH3"
	//   14.19 ppm mult="" J=[] integral=0 DEPT="CH3"
}

func ExampleParseText_error() {
	_, err := spectrum.ParseText("δ 4.12 (q, 2H), 2.05 (s, J = 7.1 Hz, 3H)")
	fmt.Println(err)
	// Output:
	// peak list: j: J given for a singlet at position 26 ("J = 7.1 Hz")
}

func ExamplePeakList_String() {
	lists, _ := spectrum.ParseText("δH (CDCl3; 500 MHz) 7.20-7.35 (5 H, m), 5.1 (brs, 1 H); δC 128.5 (2 × CH), 64.9 (CH2)")
	for _, pl := range lists {
		fmt.Println(pl)
	}
	// Output:
	// 1H NMR (500 MHz, CDCl3) δ 7.35–7.2 (m, 5H), 5.1 (br s, 1H)
	// 13C NMR δ 128.5 (2C, CH), 64.9 (CH2)
}

func ExampleParseJSON() {
	lists, err := spectrum.ParseJSON([]byte(`[
		{"mhz": 400, "solvent": "CDCl3", "peaks": [
			{"shift": 4.12, "multiplicity": "q", "j": [7.1], "integral": 2},
			{"range": [7.35, 7.20], "multiplicity": "m", "integral": 5}]},
		{"nucleus": "13C", "mhz": 101, "peaks": [
			{"shift": 129.3, "dept": "CH", "count": 2}]}]`))
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, pl := range lists {
		fmt.Println(pl)
	}
	// Output:
	// 1H NMR (400 MHz, CDCl3) δ 4.12 (q, J = 7.1 Hz, 2H), 7.35–7.2 (m, 5H)
	// 13C NMR (101 MHz) δ 129.3 (2C, CH)
}

func ExampleParseJCAMP() {
	// An invented demo record.
	jdx := `##TITLE= SR-DEMO-0100 demo peak assignments
##JCAMP-DX= 5.01
##DATA TYPE= NMR PEAK ASSIGNMENTS
##.OBSERVE FREQUENCY= 400.13
##.OBSERVE NUCLEUS= ^1H
##.SOLVENT NAME= CDCl3
##XUNITS= PPM
##PEAK ASSIGNMENTS= (XYMA)
(4.12, 30, Q, <OCH2>)
(2.05, 100, S, <CH3CO>)
(1.26, 45, T, <CH3>)
##END=
`
	lists, err := spectrum.ParseJCAMP([]byte(jdx))
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(lists[0])
	// Output:
	// 1H NMR (400.13 MHz, CDCl3) δ 4.12 (q, OCH2), 2.05 (s, CH3CO), 1.26 (t, CH3)
}

// Ethanol (C2H6O) whose OH signal was not observed; fractional integrals
// as measured. Shifts from Gottlieb et al. 1997 (from memory).
func ExampleScaleIntegrals() {
	pl, _ := must1H("δ 3.72 (q, J = 7.0 Hz, 2.04H), 1.25 (t, J = 7.0 Hz, 3.1H)")
	implied, warnings, err := spectrum.ScaleIntegrals(pl, 6)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("%.2f\n", implied)
	for _, w := range warnings {
		fmt.Println(w)
	}
	// Output:
	// [1.98 3.01]
	// integrals sum to 5.0 H of 6: one exchangeable H not observed?
}

func ExampleFlagSolvent() {
	pl, _ := must1H("1H NMR (DMSO-d6) δ 7.9 (d, J = 8 Hz, 2H), 3.34 (br s), 2.50 (quint), 2.35 (s, 3H)")
	for _, f := range spectrum.FlagSolvent(pl, "") {
		fmt.Printf("peak %d at %.2f: %s %s (exclude %v)\n", f.Peak, pl.Peaks[f.Peak].Shift, f.Signal.Kind, f.Signal.Name, f.Exclude)
	}
	// Output:
	// peak 1 at 3.34: water H2O (exclude true)
	// peak 2 at 2.50: residual DMSO-d5 (exclude true)
}

func ExampleParseMultiplicity() {
	for _, s := range []string{"brs", "doublet of triplets", "app. t", "p", "hept", "ABq"} {
		m, err := spectrum.ParseMultiplicity(s)
		if err != nil {
			fmt.Println(err)
			continue
		}
		fmt.Printf("%q -> %q partners=%d apparent=%v\n", s, m.Code(), m.Partners(), m.Apparent())
	}
	// Output:
	// "brs" -> "br s" partners=0 apparent=false
	// "doublet of triplets" -> "dt" partners=3 apparent=false
	// "app. t" -> "t" partners=2 apparent=true
	// "p" -> "quint" partners=4 apparent=false
	// "hept" -> "sept" partners=6 apparent=false
	// "ABq" -> "m" partners=0 apparent=false
}

func ExampleCanonicalSolvent() {
	for _, s := range []string{"chloroform-d", "[D6]DMSO", "methanol-d4", "CCl4"} {
		c, ok := spectrum.CanonicalSolvent(s)
		fmt.Printf("%s -> %q %v\n", s, c, ok)
	}
	// Output:
	// chloroform-d -> "CDCl3" true
	// [D6]DMSO -> "DMSO-d6" true
	// methanol-d4 -> "CD3OD" true
	// CCl4 -> "" false
}

// must1H reads journal text holding one 1H list, for the examples.
func must1H(s string) (spectrum.PeakList, error) { return spectrum.ReadList([]byte(s), spectrum.H1) }
