package spectrum

import (
	"encoding/json"
	"errors"
	"os"
	"path/filepath"
	"testing"
)

// checkParseError requires a *PeakError whose position lies in the input.
func checkParseError(t *testing.T, err error, n int) {
	t.Helper()
	var pe *PeakError
	if !errors.As(err, &pe) {
		t.Fatalf("error %v (%T) is not a *PeakError", err, err)
	}
	if pe.Pos < 0 || pe.Pos > n {
		t.Fatalf("error position %d outside the input (%d bytes): %v", pe.Pos, n, err)
	}
	if pe.Msg == "" {
		t.Fatalf("error without a message: %+v", pe)
	}
}

// checkValid requires every peak to pass the shared validation.
func checkValid(t *testing.T, pl PeakList) {
	t.Helper()
	if len(pl.Peaks) == 0 || len(pl.Peaks) > MaxPeaks {
		t.Fatalf("%d peaks", len(pl.Peaks))
	}
	for i, p := range pl.Peaks {
		if field, msg := checkPeak(p); msg != "" {
			t.Fatalf("peak %d (%v) invalid: %s: %s", i, p, field, msg)
		}
		if p.ShiftLo > p.ShiftHi || p.Shift < p.ShiftLo || p.Shift > p.ShiftHi {
			t.Fatalf("peak %d shift %g outside %g..%g", i, p.Shift, p.ShiftLo, p.ShiftHi)
		}
	}
}

func addCaseSeeds(f *testing.F, file string) {
	b, err := os.ReadFile(filepath.Join("testdata", "peaks", file))
	if err != nil {
		f.Fatal(err)
	}
	var cs []peakCase
	if err := json.Unmarshal(b, &cs); err != nil {
		f.Fatal(err)
	}
	for _, c := range cs {
		f.Add(c.Input)
	}
}

// FuzzParsePeaks: no panic; errors are positioned *PeakErrors; a parsed
// list is valid and String() parses back to the same list.
func FuzzParsePeaks(f *testing.F) {
	addCaseSeeds(f, "journal.json")
	f.Fuzz(func(t *testing.T, s string) {
		pl, err := ParsePeaks(s)
		if err != nil {
			checkParseError(t, err, len(s))
			return
		}
		checkValid(t, pl)
		out := pl.String()
		again, err := ParsePeaks(out)
		if err != nil {
			t.Fatalf("ParsePeaks(%q) = %v\nString() = %q does not parse: %v", s, pl, out, err)
		}
		if !samePeaks(pl, again) {
			t.Fatalf("round trip of %q:\n got %v\nwant %v", s, again, pl)
		}
	})
}

// FuzzParsePeaksJSON: no panic; errors are positioned *PeakErrors; a
// parsed list is valid and its JSON parses back to the same list.
func FuzzParsePeaksJSON(f *testing.F) {
	addCaseSeeds(f, "json.json")
	f.Fuzz(func(t *testing.T, s string) {
		pl, err := ParsePeaksJSON([]byte(s))
		if err != nil {
			checkParseError(t, err, len(s))
			return
		}
		checkValid(t, pl)
		b, err := json.Marshal(pl)
		if err != nil {
			t.Fatal(err)
		}
		again, err := ParsePeaksJSON(b)
		if err != nil {
			t.Fatalf("ParsePeaksJSON(%q): JSON %s does not parse: %v", s, b, err)
		}
		if !samePeaks(pl, again) {
			t.Fatalf("round trip of %q:\n got %v\nwant %v", s, again, pl)
		}
	})
}

// FuzzParseJCAMP: no panic; errors are positioned *PeakErrors; a parsed
// list is valid and survives the JSON form.
func FuzzParseJCAMP(f *testing.F) {
	files, err := filepath.Glob(filepath.Join("testdata", "peaks", "*.jdx"))
	if err != nil {
		f.Fatal(err)
	}
	for _, file := range files {
		b, err := os.ReadFile(file)
		if err != nil {
			f.Fatal(err)
		}
		f.Add(b)
	}
	f.Fuzz(func(t *testing.T, b []byte) {
		pl, err := ParseJCAMP(b)
		if err != nil {
			var pe *PeakError
			if !errors.As(err, &pe) {
				t.Fatalf("error %v (%T) is not a *PeakError", err, err)
			}
			if pe.Pos < 0 || pe.Pos > len(pe.Input) {
				t.Fatalf("error position %d outside the input: %v", pe.Pos, err)
			}
			return
		}
		checkValid(t, pl)
		jb, err := json.Marshal(pl)
		if err != nil {
			t.Fatal(err)
		}
		again, err := ParsePeaksJSON(jb)
		if err != nil {
			t.Fatalf("JSON %s of a JCAMP-DX list does not parse: %v", jb, err)
		}
		if !samePeaks(pl, again) {
			t.Fatalf("JSON round trip:\n got %v\nwant %v", again, pl)
		}
	})
}
