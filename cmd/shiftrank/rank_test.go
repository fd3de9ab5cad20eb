package main

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"shiftrank/molecule"
)

// runCmd runs the command line args and returns stdout, stderr and the
// error.
func runCmd(t *testing.T, stdin string, args ...string) (string, string, error) {
	t.Helper()
	var out, errb bytes.Buffer
	e := env{getenv: func(string) string { return "" }, stdin: strings.NewReader(stdin), stdout: &out, stderr: &errb}
	err := run(context.Background(), args, e)
	return out.String(), errb.String(), err
}

// Ethyl acetate in CDCl3: Gottlieb, Kotlyar, Nudelman, J. Org. Chem. 1997,
// 62, 7512, Table 1 (from memory).
const ethylAcetatePeaks = "1H NMR (300 MHz, CDCl3) δ 4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H), 1.26 (t, J = 7.1 Hz, 3H)"

// ethylAcetateCanon is ethyl acetate's canonical SMILES.
func ethylAcetateCanon() string {
	return molecule.CanonicalSMILES(molecule.MustParseSMILES("CCOC(C)=O"))
}

func TestRankCommandReadable(t *testing.T) {
	out, _, err := runCmd(t, "", "rank", "--formula", "C4H8O2", "--peaks", ethylAcetatePeaks, "--top", "3")
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"C4H8O2 (DBE 1)", ethylAcetateCanon(), "probability", "multiplicity:", "Caution: A ranking is a hypothesis"} {
		if !strings.Contains(out, want) {
			t.Errorf("output lacks %q:\n%s", want, out)
		}
	}
}

func TestRankCommandJSONFromStdinAndFile(t *testing.T) {
	out, _, err := runCmd(t, ethylAcetatePeaks, "rank", "--formula", "C4H8O2", "--peaks", "-", "--json", "--top", "2")
	if err != nil {
		t.Fatal(err)
	}
	var res struct {
		Formula    string `json:"formula"`
		Complete   bool   `json:"complete"`
		Candidates []struct {
			Rank   int    `json:"rank"`
			SMILES string `json:"smiles"`
		} `json:"candidates"`
		Warnings []string `json:"warnings"`
	}
	if err := json.Unmarshal([]byte(out), &res); err != nil {
		t.Fatalf("--json output is not JSON: %v\n%s", err, out)
	}
	if res.Formula != "C4H8O2" || len(res.Candidates) < 1 || res.Candidates[0].SMILES != ethylAcetateCanon() {
		t.Errorf("unexpected result %+v", res)
	}
	file := filepath.Join(t.TempDir(), "peaks.txt")
	if err := os.WriteFile(file, []byte(ethylAcetatePeaks), 0o600); err != nil {
		t.Fatal(err)
	}
	out2, _, err := runCmd(t, "", "rank", "--formula", "C4H8O2", "--peaks", "@"+file, "--json", "--top", "2")
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(out2, `"smiles": "`+ethylAcetateCanon()+`"`) {
		t.Errorf("@FILE ranking differs:\n%s", out2)
	}
}

func TestRankCommandBadInput(t *testing.T) {
	tests := []struct {
		name string
		args []string
		want string // in the message
	}{
		{"unknown element", []string{"--formula", "C4H8Xx", "--peaks", "4.12 (q, 2H)"}, `"Xx"`},
		{"bad multiplicity", []string{"--formula", "C4H8O2", "--peaks", "4.12 (qz, 2H)"}, "qz"},
		{"bad fragment", []string{"--formula", "C4H8O2", "--peaks", "4.12 (q, 2H)", "--require", "C(=O"}, "require[0]"},
		{"missing formula", []string{"--peaks", "4.12 (q, 2H)"}, "--formula"},
		{"missing file", []string{"--formula", "C4H8O2", "--peaks", "@/nonexistent/peaks.txt"}, "peaks"},
		{"top zero", []string{"--formula", "C4H8O2", "--peaks", "1.0 (s, 8H)", "--top", "0"}, "--top"},
		{"unknown flag", []string{"--formula", "C4H8O2", "--peaks", "1.0 (s, 8H)", "--bogus"}, "bogus"},
		{"13C list only", []string{"--formula", "C4H8O2", "--peaks", "13C NMR δ 171.4, 60.5, 21.0, 14.2"}, "no 1H peak list"},
		{"two 1H lists", []string{"--formula", "C4H8O2", "--peaks", "1H NMR δ 2.05 (s, 3H); 1H NMR δ 1.99 (s, 3H)"}, "second 1H peak list"},
		{"bad 13C section", []string{"--formula", "C4H8O2", "--peaks", "1H NMR δ 2.05 (s, 3H); 13C NMR δ 171.4 (2H)"}, "integral in a 13C list"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, _, err := runCmd(t, "", append([]string{"rank"}, tc.args...)...)
			var u usageError
			if !errors.As(err, &u) {
				t.Fatalf("error %v, want bad input (exit 2)", err)
			}
			if !strings.Contains(err.Error(), tc.want) {
				t.Errorf("error %q does not name %q", err, tc.want)
			}
		})
	}
}

// TestRankCommandJCAMPAndCarbon reads a JCAMP-DX file holding 1H and 13C
// peak tables (an invented demo file of the spectrum package) and journal
// text with a 13C section: both lists are scored.
func TestRankCommandJCAMPAndCarbon(t *testing.T) {
	out, _, err := runCmd(t, "", "rank", "--formula", "C4H8O2", "--peaks", "@../../spectrum/testdata/peaks/compound-13c-1h.jdx", "--json", "--top", "1")
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(out, `"smiles": "`+ethylAcetateCanon()+`"`) || !strings.Contains(out, `"carbon_assignments"`) {
		t.Errorf("JCAMP-DX ranking lacks ethyl acetate first or the 13C assignments:\n%s", out)
	}
	// 13C shifts of ethyl acetate in CDCl3: Gottlieb et al. 1997, Table 2
	// (from memory).
	out, _, err = runCmd(t, "", "rank", "--formula", "C4H8O2", "--peaks", ethylAcetatePeaks+"; 13C NMR (75 MHz, CDCl3) δ 171.36, 60.49, 21.04, 14.19", "--top", "1")
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(out, ethylAcetateCanon()) {
		t.Errorf("output lacks ethyl acetate:\n%s", out)
	}
}

func TestBenchCommand(t *testing.T) {
	file := filepath.Join(t.TempDir(), "set.json")
	set := `{"compounds": [
	  {"name": "ethyl acetate", "formula": "C4H8O2", "smiles": "CCOC(C)=O", "peaks": "` + ethylAcetatePeaks + `",
	   "source": "Gottlieb, Kotlyar, Nudelman, J. Org. Chem. 1997, 62, 7512 (from memory)"}]}`
	if err := os.WriteFile(file, []byte(set), 0o600); err != nil {
		t.Fatal(err)
	}
	out, _, err := runCmd(t, "", "bench", file)
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"top-1 100.0 %", "top-3 100.0 %", "mean reciprocal rank 1.000", "calibration"} {
		if !strings.Contains(out, want) {
			t.Errorf("bench output lacks %q:\n%s", want, out)
		}
	}
	if _, _, err := runCmd(t, "", "bench"); err == nil {
		t.Error("bench without a file: no error")
	}
}

// ethylAcetateCarbon is the 13C list of ethyl acetate in CDCl3 without a
// header (Gottlieb, Kotlyar, Nudelman, J. Org. Chem. 1997, 62, 7512,
// Table 2; from memory), DEPT classes being those of the structure.
const ethylAcetateCarbon = "171.36 (C), 60.49 (CH2), 21.04 (CH3), 14.19 (CH3)"

// TestRankCommandCarbonFlag: --carbon takes a 13C list (with or without
// a header, inline or @FILE); the text output shows the 13C assignments
// and the JSON output carries them.
func TestRankCommandCarbonFlag(t *testing.T) {
	out, _, err := runCmd(t, "", "rank", "--formula", "C4H8O2", "--peaks", ethylAcetatePeaks, "--carbon", ethylAcetateCarbon, "--top", "2")
	if err != nil {
		t.Fatal(err)
	}
	flat := strings.Join(strings.Fields(out), " ") // details wrap at 100 columns
	for _, want := range []string{"13C list (4 peaks)", "of which 13C", "13C peak", "DEPT CH2 as predicted", ethylAcetateCanon()} {
		if !strings.Contains(flat, want) {
			t.Errorf("output lacks %q:\n%s", want, out)
		}
	}
	file := filepath.Join(t.TempDir(), "carbon.txt")
	if err := os.WriteFile(file, []byte("13C NMR (101 MHz, CDCl3) δ "+ethylAcetateCarbon), 0o600); err != nil {
		t.Fatal(err)
	}
	out, _, err = runCmd(t, "", "rank", "--formula", "C4H8O2", "--peaks", ethylAcetatePeaks, "--carbon", "@"+file, "--json", "--top", "1")
	if err != nil {
		t.Fatal(err)
	}
	var res struct {
		CarbonPeaks []struct {
			Shift float64 `json:"shift"`
			DEPT  string  `json:"dept"`
		} `json:"carbon_peaks"`
		Candidates []struct {
			SMILES            string  `json:"smiles"`
			CarbonScore       float64 `json:"carbon_score"`
			CarbonAssignments []struct {
				Peak           int     `json:"peak"`
				PredictedClass string  `json:"predicted_class"`
				ScoreShare     float64 `json:"score_share"`
			} `json:"carbon_assignments"`
		} `json:"candidates"`
	}
	if err := json.Unmarshal([]byte(out), &res); err != nil {
		t.Fatalf("not JSON: %v\n%s", err, out)
	}
	if len(res.CarbonPeaks) != 4 || res.CarbonPeaks[1].DEPT != "CH2" || len(res.Candidates) != 1 ||
		res.Candidates[0].SMILES != ethylAcetateCanon() || len(res.Candidates[0].CarbonAssignments) != 4 || res.Candidates[0].CarbonScore == 0 {
		t.Errorf("unexpected 13C result: %+v", res)
	}
}

func TestRankCommandCarbonFlagErrors(t *testing.T) {
	tests := []struct {
		name string
		args []string
		want string
	}{
		{"13C in both", []string{"--peaks", ethylAcetatePeaks + "; 13C NMR δ 171.4, 60.5, 21.0, 14.2", "--carbon", "171.4, 60.5, 21.0, 14.2"}, "not both"},
		// "2H" starts at the 14th character of "171.4, 60.5 (2H)".
		{"integral in the 13C list", []string{"--peaks", ethylAcetatePeaks, "--carbon", "171.4, 60.5 (2H)"}, `at character 14 ("2H")`},
		{"1H list in --carbon", []string{"--peaks", ethylAcetatePeaks, "--carbon", "1H NMR δ 2.05 (s, 3H); 13C NMR δ 171.4, 60.5"}, "1H list too"},
		{"missing file", []string{"--peaks", ethylAcetatePeaks, "--carbon", "@/nonexistent/carbon.txt"}, "--carbon"},
		{"bad shift", []string{"--peaks", ethylAcetatePeaks, "--carbon", "171.4, 6x0.5"}, "--carbon"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, _, err := runCmd(t, "", append([]string{"rank", "--formula", "C4H8O2"}, tc.args...)...)
			var u usageError
			if !errors.As(err, &u) {
				t.Fatalf("error %v, want bad input (exit 2)", err)
			}
			if !strings.Contains(err.Error(), tc.want) {
				t.Errorf("error %q does not name %q", err, tc.want)
			}
		})
	}
}

// TestBenchCommandCarbon: bench --carbon scores the 13C lists of the
// reference file; without the flag they are ignored.
func TestBenchCommandCarbon(t *testing.T) {
	file := filepath.Join(t.TempDir(), "set.json")
	set := `{"compounds": [
	  {"name": "ethyl acetate", "formula": "C4H8O2", "smiles": "CCOC(C)=O", "peaks": "` + ethylAcetatePeaks + `",
	   "carbon": "13C NMR (75 MHz, CDCl3) δ 171.36, 60.49, 21.04, 14.19",
	   "source": "Gottlieb, Kotlyar, Nudelman, J. Org. Chem. 1997, 62, 7512 (from memory)"}]}`
	if err := os.WriteFile(file, []byte(set), 0o600); err != nil {
		t.Fatal(err)
	}
	out, _, err := runCmd(t, "", "bench", "--carbon", file)
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"top-1 100.0 %", "scored with the 1H and 13C lists: 1 of 1"} {
		if !strings.Contains(out, want) {
			t.Errorf("bench --carbon output lacks %q:\n%s", want, out)
		}
	}
	out, _, err = runCmd(t, "", "bench", file)
	if err != nil {
		t.Fatal(err)
	}
	if strings.Contains(out, "13C lists") {
		t.Errorf("bench without --carbon used the 13C lists:\n%s", out)
	}
}
