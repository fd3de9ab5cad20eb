package spectrum

import (
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"testing"
)

// wantPeak is the expected form of a peak in the testdata files. It is
// decoded with encoding/json, not with the parser under test.
type wantPeak struct {
	Shift        *float64  `json:"shift"`
	Range        []float64 `json:"range"`
	Multiplicity string    `json:"multiplicity"`
	Apparent     bool      `json:"apparent"`
	J            []float64 `json:"j"`
	Integral     float64   `json:"integral"`
	Count        int       `json:"count"`
	DEPT         string    `json:"dept"`
	Label        string    `json:"label"`
}

type wantList struct {
	Nucleus string     `json:"nucleus"` // "" means 1H
	MHz     float64    `json:"mhz"`
	Solvent string     `json:"solvent"`
	Peaks   []wantPeak `json:"peaks"`
}

type wantErr struct {
	Pos   int    `json:"pos"`
	Line  int    `json:"line"` // 0: not checked
	Token string `json:"token"`
	Field string `json:"field"`
}

// peakCase is one case of testdata/peaks/journal.json (written by
// journal_gen.py, which computes the expected byte positions itself) or
// json.json. Want is the single 1H list expected, Lists the lists of an
// input holding several.
type peakCase struct {
	Name   string     `json:"name"`
	Source string     `json:"source"`
	Input  string     `json:"input"`
	Want   *wantList  `json:"want"`
	Lists  []wantList `json:"lists"`
	Err    *wantErr   `json:"err"`
}

// wantLists returns the lists a case expects.
func (c peakCase) wantLists() []wantList {
	if c.Want != nil {
		return []wantList{*c.Want}
	}
	return c.Lists
}

// checkLists compares parsed lists with the expectation.
func checkLists(t *testing.T, name string, got []PeakList, want []wantList) {
	t.Helper()
	if len(got) != len(want) {
		t.Fatalf("%s: %d lists, want %d: %v", name, len(got), len(want), got)
	}
	for i := range want {
		checkList(t, fmt.Sprintf("%s list %d", name, i), got[i], want[i])
	}
}

// parse1H reads input holding one 1H list.
func parse1H(s string) (PeakList, error) { return ReadList([]byte(s), H1) }

func loadCases(t *testing.T, name string) []peakCase {
	t.Helper()
	b, err := os.ReadFile(filepath.Join("testdata", "peaks", name))
	if err != nil {
		t.Fatal(err)
	}
	var cs []peakCase
	if err := json.Unmarshal(b, &cs); err != nil {
		t.Fatalf("%s: %v", name, err)
	}
	return cs
}

const shiftTol = 1e-9

// checkList compares a parsed list with the expectation; Pos and Text are
// not compared.
func checkList(t *testing.T, name string, got PeakList, want wantList) {
	t.Helper()
	wantNuc := want.Nucleus
	if wantNuc == "" {
		wantNuc = "1H"
	}
	if got.Nucleus.String() != wantNuc || got.MHz != want.MHz || got.Solvent != want.Solvent {
		t.Errorf("%s: header = (%s, %g MHz, %q), want (%s, %g MHz, %q)", name, got.Nucleus, got.MHz, got.Solvent, wantNuc, want.MHz, want.Solvent)
	}
	if len(got.Peaks) != len(want.Peaks) {
		t.Fatalf("%s: %d peaks, want %d: %v", name, len(got.Peaks), len(want.Peaks), got)
	}
	for i, w := range want.Peaks {
		g := got.Peaks[i]
		lo, hi := 0.0, 0.0
		switch {
		case w.Shift != nil:
			lo, hi = *w.Shift, *w.Shift
		case len(w.Range) == 2:
			lo, hi = math.Min(w.Range[0], w.Range[1]), math.Max(w.Range[0], w.Range[1])
		default:
			t.Fatalf("%s: peak %d of the expectation has neither shift nor range", name, i)
		}
		if math.Abs(g.ShiftLo-lo) > shiftTol || math.Abs(g.ShiftHi-hi) > shiftTol || math.Abs(g.Shift-(lo+hi)/2) > shiftTol {
			t.Errorf("%s: peak %d shift = %g (%g..%g), want %g..%g", name, i, g.Shift, g.ShiftLo, g.ShiftHi, lo, hi)
		}
		if g.Multiplicity.Code() != w.Multiplicity || g.Multiplicity.Apparent() != w.Apparent {
			t.Errorf("%s: peak %d multiplicity = %q (apparent %v), want %q (apparent %v)", name, i, g.Multiplicity.Code(), g.Multiplicity.Apparent(), w.Multiplicity, w.Apparent)
		}
		if len(g.J) != len(w.J) {
			t.Errorf("%s: peak %d J = %v, want %v", name, i, g.J, w.J)
		} else {
			for k := range w.J {
				if math.Abs(g.J[k]-w.J[k]) > 1e-9 {
					t.Errorf("%s: peak %d J = %v, want %v", name, i, g.J, w.J)
					break
				}
			}
		}
		if math.Abs(g.Integral-w.Integral) > 1e-9 {
			t.Errorf("%s: peak %d integral = %g, want %g", name, i, g.Integral, w.Integral)
		}
		if g.Count != w.Count || g.DEPT.String() != w.DEPT {
			t.Errorf("%s: peak %d count, DEPT = %d, %q; want %d, %q", name, i, g.Count, g.DEPT, w.Count, w.DEPT)
		}
		if g.Label != w.Label {
			t.Errorf("%s: peak %d label = %q, want %q", name, i, g.Label, w.Label)
		}
	}
}

func checkErr(t *testing.T, name string, err error, want wantErr) {
	t.Helper()
	var pe *PeakError
	if !errors.As(err, &pe) {
		t.Fatalf("%s: error = %v (%T), want a *PeakError", name, err, err)
	}
	if pe.Pos != want.Pos || pe.Token != want.Token || pe.Field != want.Field || want.Line != 0 && pe.Line != want.Line {
		t.Errorf("%s: error at %d (line %d) %q field %q (%v), want at %d (line %d) %q field %q",
			name, pe.Pos, pe.Line, pe.Token, pe.Field, err, want.Pos, want.Line, want.Token, want.Field)
	}
}

func TestParseText(t *testing.T) {
	for _, c := range loadCases(t, "journal.json") {
		t.Run(c.Name, func(t *testing.T) {
			lists, err := ParseText(c.Input)
			if c.Err != nil {
				if err == nil {
					t.Fatalf("ParseText(%q) = %v, want an error", c.Input, lists)
				}
				checkErr(t, c.Name, err, *c.Err)
				return
			}
			if err != nil {
				t.Fatalf("ParseText(%q): %v", c.Input, err)
			}
			checkLists(t, c.Name, lists, c.wantLists())
			for _, pl := range lists {
				// Positions point at the peak text in the input.
				for i, p := range pl.Peaks {
					if p.Pos < 0 || p.Pos+len(p.Text) > len(c.Input) || c.Input[p.Pos:p.Pos+len(p.Text)] != p.Text {
						t.Errorf("peak %d: Pos %d, Text %q do not point into the input", i, p.Pos, p.Text)
					}
				}
				// The journal form written by String parses back to the same list.
				again, err := ParseText(pl.String())
				if err != nil {
					t.Fatalf("ParseText(String() = %q): %v", pl.String(), err)
				}
				if len(again) != 1 || !samePeaks(pl, again[0]) {
					t.Errorf("round trip:\n got %v\nwant %v", again, pl)
				}
			}
		})
	}
}

// samePeaks compares two lists ignoring Pos and Text.
func samePeaks(a, b PeakList) bool {
	if a.Nucleus != b.Nucleus || a.MHz != b.MHz || a.Solvent != b.Solvent || len(a.Peaks) != len(b.Peaks) {
		return false
	}
	for i := range a.Peaks {
		p, q := a.Peaks[i], b.Peaks[i]
		p.Pos, p.Text, q.Pos, q.Text = 0, "", 0, ""
		if len(p.J) == 0 {
			p.J = nil
		}
		if len(q.J) == 0 {
			q.J = nil
		}
		if !reflect.DeepEqual(p, q) {
			return false
		}
	}
	return true
}

func TestPeakString(t *testing.T) {
	pl := PeakList{MHz: 400, Solvent: "CDCl3", Peaks: []Peak{
		{Shift: 7.275, ShiftLo: 7.2, ShiftHi: 7.35, Multiplicity: Multiplet(), Integral: 5},
		{Shift: 4.12, ShiftLo: 4.12, ShiftHi: 4.12, Multiplicity: Split(4), J: []float64{7.1}, Integral: 2},
		{Shift: 6.95, ShiftLo: 6.95, ShiftHi: 6.95, Multiplicity: Split(3).WithApparent(true), Integral: 1, Label: "H-4"},
	}}
	want := "1H NMR (400 MHz, CDCl3) δ 7.35–7.2 (m, 5H), 4.12 (q, J = 7.1 Hz, 2H), 6.95 (app t, 1H, H-4)"
	if got := pl.String(); got != want {
		t.Errorf("String() = %q, want %q", got, want)
	}
}

func TestParseTextLimits(t *testing.T) {
	big := make([]byte, MaxPeakInput+1)
	for i := range big {
		big[i] = ' '
	}
	if _, err := ParseText(string(big)); err == nil {
		t.Error("ParseText accepted more than MaxPeakInput bytes")
	}
	if _, err := ParseText("δ 2.05 (s, 3H)\xff"); err == nil {
		t.Error("ParseText accepted invalid UTF-8")
	}
}
