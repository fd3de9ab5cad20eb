package spectrum

import (
	"math"
	"os"
	"path/filepath"
	"testing"
)

// jcampCase is one case of testdata/peaks/jcamp.json (written by
// jcamp_gen.py; the expected values are worked out by hand there).
type jcampCase struct {
	Name  string     `json:"name"`
	File  string     `json:"file"`
	Want  *wantList  `json:"want"`
	Lists []wantList `json:"lists"`
	Err   *wantErr   `json:"err"`
}

func TestParseJCAMP(t *testing.T) {
	var cases []jcampCase
	readJSON(t, filepath.Join("testdata", "peaks", "jcamp.json"), &cases)
	for _, c := range cases {
		t.Run(c.Name, func(t *testing.T) {
			b, err := os.ReadFile(filepath.Join("testdata", "peaks", c.File))
			if err != nil {
				t.Fatal(err)
			}
			lists, err := ParseJCAMP(b)
			if c.Err != nil {
				if err == nil {
					t.Fatalf("ParseJCAMP(%s) = %v, want an error", c.File, lists)
				}
				checkErr(t, c.Name, err, *c.Err)
				return
			}
			if err != nil {
				t.Fatalf("ParseJCAMP(%s): %v", c.File, err)
			}
			want := c.Lists
			if c.Want != nil {
				want = []wantList{*c.Want}
			}
			checkLists(t, c.Name, lists, want)
		})
	}
}

func TestParseJCAMPLabels(t *testing.T) {
	// Labels compare without case, spaces, hyphens, slashes and
	// underscores (JCAMP-DX 4.24, McDonald and Wilks 1988).
	in := "##title= SR-DEMO-0012 invented demo\n##JCAMPDX= 4.24\n##.observe_nucleus= ^1H\n" +
		"##X UNITS= ppm\n##Peak-Table= (XY..XY)\n2.05, 100; 1.26, 50\n##end=\n"
	pl, err := ReadList([]byte(in), H1)
	if err != nil {
		t.Fatalf("ParseJCAMP: %v", err)
	}
	if len(pl.Peaks) != 2 || pl.Peaks[0].Shift != 2.05 || pl.Peaks[1].Shift != 1.26 {
		t.Errorf("ParseJCAMP peaks = %v, want 2.05 and 1.26", pl)
	}
}

func TestFirstOrderLines(t *testing.T) {
	// Line patterns of first-order multiplets: the n+1 rule with Pascal's
	// triangle intensities, and a doublet of doublets of four equal lines
	// (common practice). J = 7.0 Hz (and 2.0 Hz for dd) at 400 MHz.
	const mhz = 400.0
	lines := func(hz, y []float64) []jline {
		ls := make([]jline, len(hz))
		for i := range hz {
			ls[i] = jline{ppm: 2 + hz[i]/mhz, y: y[i]}
		}
		return ls
	}
	cases := []struct {
		name string
		hz   []float64 // line positions, Hz, high to low
		y    []float64
		want string
		j    []float64
	}{
		{"singlet", []float64{0}, []float64{1}, "s", nil},
		{"doublet", []float64{3.5, -3.5}, []float64{1, 1}, "d", []float64{7}},
		{"doublet with roof effect", []float64{3.5, -3.5}, []float64{1.4, 1}, "d", []float64{7}},
		{"triplet", []float64{7, 0, -7}, []float64{1, 2, 1}, "t", []float64{7}},
		{"quartet", []float64{10.5, 3.5, -3.5, -10.5}, []float64{1, 3, 3, 1}, "q", []float64{7}},
		{"quintet", []float64{14, 7, 0, -7, -14}, []float64{1, 4, 6, 4, 1}, "quint", []float64{7}},
		{"sextet", []float64{17.5, 10.5, 3.5, -3.5, -10.5, -17.5}, []float64{1, 5, 10, 10, 5, 1}, "sext", []float64{7}},
		{"septet", []float64{21, 14, 7, 0, -7, -14, -21}, []float64{1, 6, 15, 20, 15, 6, 1}, "sept", []float64{7}},
		{"noisy triplet", []float64{7.2, 0, -6.9}, []float64{0.9, 2.1, 1.1}, "t", []float64{7.05}},
		{"doublet of doublets", []float64{4.5, 2.5, -2.5, -4.5}, []float64{1, 1, 1, 1}, "dd", []float64{7, 2}},
		{"1:1:1 is not a triplet", []float64{7, 0, -7}, []float64{1, 1, 1}, "m", nil},
		{"uneven spacing", []float64{7, 0, -3}, []float64{1, 2, 1}, "m", nil},
	}
	for _, c := range cases {
		got, j := firstOrder(lines(c.hz, c.y), mhz)
		if got.Code() != c.want || len(j) != len(c.j) {
			t.Errorf("%s: firstOrder = %q %v, want %q %v", c.name, got, j, c.want, c.j)
			continue
		}
		for k := range j {
			if math.Abs(j[k]-c.j[k]) > 0.051 {
				t.Errorf("%s: J = %v, want %v", c.name, j, c.j)
			}
		}
	}
}

func TestParseJCAMPLineEndings(t *testing.T) {
	b, err := os.ReadFile(filepath.Join("testdata", "peaks", "butanone-assignments.jdx"))
	if err != nil {
		t.Fatal(err)
	}
	var crlf []byte
	for _, c := range b {
		if c == '\n' {
			crlf = append(crlf, '\r')
		}
		crlf = append(crlf, c)
	}
	for name, in := range map[string][]byte{"CRLF": crlf, "byte-order mark": append([]byte("\ufeff"), b...)} {
		pl, err := ReadList(in, H1)
		if err != nil {
			t.Errorf("%s: ParseJCAMP: %v", name, err)
			continue
		}
		if len(pl.Peaks) != 3 || pl.Peaks[0].Label != "CH2" || pl.Solvent != "DMSO-d6" {
			t.Errorf("%s: ParseJCAMP = %v", name, pl)
		}
	}
}

func TestParseJCAMPAssignmentsWithWidth(t *testing.T) {
	// Invented demo record: X in Hz at 400 MHz from TMS at 0 Hz, areas
	// from height × width (3 : 2 : 3).
	in := "##TITLE= SR-DEMO-0013 invented demo\n##JCAMP-DX= 5.01\n##DATA TYPE= NMR PEAK ASSIGNMENTS\n" +
		"##.OBSERVE FREQUENCY= 400\n##.OBSERVE NUCLEUS= ^1H\n##XUNITS= HZ\n" +
		"##.SHIFT REFERENCE= (INTERNAL, TMS, 1, 0.00)\n##PEAK ASSIGNMENTS= (XYMWA)\n" +
		"(1464.0, 30, s, 1.0, <OCH3>)\n(924.0, 10, t, 2.0,\n <CH2>)\n(376.0, 15, t, 2.0, <CH3>)\n##END=\n"
	pl, err := ReadList([]byte(in), H1)
	if err != nil {
		t.Fatalf("ParseJCAMP: %v", err)
	}
	want := []struct {
		shift, integral float64
		mult, label     string
	}{{3.66, 30, "s", "OCH3"}, {2.31, 20, "t", "CH2"}, {0.94, 30, "t", "CH3"}}
	if len(pl.Peaks) != len(want) {
		t.Fatalf("ParseJCAMP = %v, want %d peaks", pl, len(want))
	}
	for i, w := range want {
		p := pl.Peaks[i]
		if math.Abs(p.Shift-w.shift) > 1e-9 || math.Abs(p.Integral-w.integral) > 1e-9 || p.Multiplicity.Code() != w.mult || p.Label != w.label {
			t.Errorf("peak %d = %v (integral %g), want %.2f %s %s integral %g", i, p, p.Integral, w.shift, w.mult, w.label, w.integral)
		}
	}
}
