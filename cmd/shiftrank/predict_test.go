package main

import (
	"encoding/json"
	"errors"
	"strings"
	"testing"
)

func TestPredictCommandJSON(t *testing.T) {
	// Ethanol in CDCl3: 3.72 (q, 2H), 1.25 (t, 3H), OH broad (Gottlieb,
	// Kotlyar, Nudelman, J. Org. Chem. 1997, 62, 7512; from memory).
	out, _, err := runCmd(t, "", "predict", "CCO", "--json")
	if err != nil {
		t.Fatal(err)
	}
	var res struct {
		SMILES       string `json:"smiles"`
		Environments []struct {
			Atoms          []int     `json:"atoms"`
			H              int       `json:"h"`
			Shift          float64   `json:"shift"`
			Sigma          float64   `json:"sigma"`
			Multiplicity   string    `json:"multiplicity"`
			J              []float64 `json:"j"`
			Exchangeable   bool      `json:"exchangeable"`
			Diastereotopic bool      `json:"diastereotopic"`
			Neighbours     []int     `json:"neighbours"`
			Breakdown      []struct {
				Term string  `json:"term"`
				PPM  float64 `json:"ppm"`
			} `json:"breakdown"`
		} `json:"environments"`
	}
	if err := json.Unmarshal([]byte(out), &res); err != nil {
		t.Fatalf("not JSON: %v\n%s", err, out)
	}
	if res.SMILES != "CCO" || len(res.Environments) != 3 {
		t.Fatalf("unexpected result: %s", out)
	}
	byAtom := map[int]int{}
	for i, e := range res.Environments {
		for _, a := range e.Atoms {
			byAtom[a] = i
		}
	}
	ch2 := res.Environments[byAtom[1]]
	ch3 := res.Environments[byAtom[0]]
	oh := res.Environments[byAtom[2]]
	if ch2.H != 2 || ch2.Multiplicity != "q" || len(ch2.J) != 1 || len(ch2.Neighbours) != 1 || ch2.Neighbours[0] != byAtom[0] || len(ch2.Breakdown) == 0 {
		t.Errorf("CH2: %+v", ch2)
	}
	if ch3.H != 3 || ch3.Multiplicity != "t" {
		t.Errorf("CH3: %+v", ch3)
	}
	if !oh.Exchangeable || oh.Multiplicity != "br s" || len(oh.Neighbours) != 0 {
		t.Errorf("OH: %+v", oh)
	}
}

func TestPredictCommandTable(t *testing.T) {
	out, _, err := runCmd(t, "", "predict", "--mhz", "600", "CN(C)C=O")
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"600 MHz", "restricted rotation", "base", "confirm"} {
		if !strings.Contains(out, want) {
			t.Errorf("output lacks %q:\n%s", want, out)
		}
	}
}

func TestPredictCommandBadInput(t *testing.T) {
	for _, args := range [][]string{
		{"predict", "C1CC"},   // unclosed ring
		{"predict", "CC[Xe]"}, // unsupported element
		{"predict", "CC.O"},   // two molecules
		{"predict"},           // missing SMILES
		{"predict", "CC", "--mhz", "-3"},
	} {
		_, _, err := runCmd(t, "", args...)
		var u usageError
		if err == nil || !errors.As(err, &u) {
			t.Errorf("%v: error %v, want bad input (exit 2)", args, err)
		}
	}
	_, _, err := runCmd(t, "", "predict", "CC[Xe]")
	// "Xe" starts at the 4th character of "CC[Xe]" (counted from 1).
	if err == nil || !strings.Contains(err.Error(), `at character 4 ("Xe")`) {
		t.Errorf("unsupported element error should name the 1-based character position 4: %v", err)
	}
}

// TestPredictCommandCarbon: predict prints the 13C prediction after the
// 1H one. Ethanol in CDCl3: CH2 58.3, CH3 18.4 ppm (Gottlieb, Kotlyar,
// Nudelman, J. Org. Chem. 1997, 62, 7512, Table 2; from memory); the
// predictor's σ is the tolerance.
func TestPredictCommandCarbon(t *testing.T) {
	out, _, err := runCmd(t, "", "predict", "CCO", "--json")
	if err != nil {
		t.Fatal(err)
	}
	var res struct {
		Carbon struct {
			Signals []struct {
				Atoms     []int   `json:"atoms"`
				Carbons   int     `json:"carbons"`
				Class     string  `json:"class"`
				Shift     float64 `json:"shift"`
				Sigma     float64 `json:"sigma"`
				Breakdown []struct {
					Term string  `json:"term"`
					PPM  float64 `json:"ppm"`
				} `json:"breakdown"`
			} `json:"signals"`
		} `json:"carbon"`
	}
	if err := json.Unmarshal([]byte(out), &res); err != nil {
		t.Fatalf("not JSON: %v\n%s", err, out)
	}
	if len(res.Carbon.Signals) != 2 {
		t.Fatalf("want 2 carbon signals:\n%s", out)
	}
	want := map[int]struct {
		class string
		ppm   float64
	}{1: {"CH2", 58.3}, 0: {"CH3", 18.4}}
	for _, s := range res.Carbon.Signals {
		w := want[s.Atoms[0]]
		if s.Class != w.class || s.Carbons != 1 || len(s.Breakdown) == 0 || s.Shift < w.ppm-2*s.Sigma || s.Shift > w.ppm+2*s.Sigma {
			t.Errorf("atom %d: %+v, want %s at %.1f ± 2σ (Gottlieb et al. 1997)", s.Atoms[0], s, w.class, w.ppm)
		}
	}

	// The table: two equivalent aromatic CH pairs of ethyl benzoate are
	// shown with their carbon count.
	out, _, err = runCmd(t, "", "predict", "CCOC(=O)c1ccccc1")
	if err != nil {
		t.Fatal(err)
	}
	i, k := strings.Index(out, "predicted 1H NMR"), strings.Index(out, "predicted 13C NMR")
	if i < 0 || k < i {
		t.Fatalf("13C table missing or before the 1H table:\n%s", out)
	}
	for _, want := range []string{"class", "C=O (ester)", "aromatic CH, atoms 7,11", "ipso"} {
		if !strings.Contains(out[k:], want) {
			t.Errorf("13C table lacks %q:\n%s", want, out[k:])
		}
	}
}
