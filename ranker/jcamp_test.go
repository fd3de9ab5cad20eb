package ranker

import (
	"os"
	"path/filepath"
	"testing"
)

// jcampCase is one case of testdata/peaks/jcamp.json (written by
// jcamp_gen.py; the expected values are worked out by hand there).
type jcampCase struct {
	Name string    `json:"name"`
	File string    `json:"file"`
	Want *wantList `json:"want"`
	Err  *wantErr  `json:"err"`
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
			pl, err := ParseJCAMP(b)
			if c.Err != nil {
				if err == nil {
					t.Fatalf("ParseJCAMP(%s) = %v, want an error", c.File, pl)
				}
				checkErr(t, c.Name, err, *c.Err)
				return
			}
			if err != nil {
				t.Fatalf("ParseJCAMP(%s): %v", c.File, err)
			}
			checkList(t, c.Name, pl, *c.Want)
		})
	}
}

func TestParseJCAMPLabels(t *testing.T) {
	// Labels compare without case, spaces, hyphens, slashes and
	// underscores (JCAMP-DX 4.24, McDonald and Wilks 1988).
	in := "##title= SR-DEMO-0012 invented demo\n##JCAMPDX= 4.24\n##.observe_nucleus= ^1H\n" +
		"##X UNITS= ppm\n##Peak-Table= (XY..XY)\n2.05, 100; 1.26, 50\n##end=\n"
	pl, err := ParseJCAMP([]byte(in))
	if err != nil {
		t.Fatalf("ParseJCAMP: %v", err)
	}
	if len(pl.Peaks) != 2 || pl.Peaks[0].Shift != 2.05 || pl.Peaks[1].Shift != 1.26 {
		t.Errorf("ParseJCAMP peaks = %v, want 2.05 and 1.26", pl)
	}
}
