package spectrum

import (
	"encoding/json"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// checkParseError requires a *PeakError whose position lies in the input
// and whose line is the line of that position.
func checkParseError(t *testing.T, err error) {
	t.Helper()
	var pe *PeakError
	if !errors.As(err, &pe) {
		t.Fatalf("error %v (%T) is not a *PeakError", err, err)
	}
	if pe.Pos < 0 || pe.Pos > len(pe.Input) {
		t.Fatalf("error position %d outside the input (%d bytes): %v", pe.Pos, len(pe.Input), err)
	}
	if pe.Line != 0 && pe.Line != 1+strings.Count(pe.Input[:pe.Pos], "\n") {
		t.Fatalf("error line %d is not the line of position %d: %v", pe.Line, pe.Pos, err)
	}
	if pe.Msg == "" {
		t.Fatalf("error without a message: %+v", pe)
	}
}

// checkValid requires every list to pass the shared validation.
func checkValid(t *testing.T, lists []PeakList) {
	t.Helper()
	if len(lists) == 0 {
		t.Fatal("no lists and no error")
	}
	for _, pl := range lists {
		if err := pl.Check(); err != nil {
			t.Fatalf("%s list invalid: %v", pl.Nucleus, err)
		}
		for i, p := range pl.Peaks {
			if p.ShiftLo > p.ShiftHi || p.Shift < p.ShiftLo || p.Shift > p.ShiftHi {
				t.Fatalf("peak %d shift %g outside %g..%g", i, p.Shift, p.ShiftLo, p.ShiftHi)
			}
		}
	}
}

// sameLists compares lists ignoring positions and source text.
func sameLists(a, b []PeakList) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if !samePeaks(a[i], b[i]) {
			return false
		}
	}
	return true
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

// jsonRoundTrip requires the JSON form of lists to read back the same.
func jsonRoundTrip(t *testing.T, in string, lists []PeakList) {
	t.Helper()
	b, err := json.Marshal(lists)
	if err != nil {
		t.Fatal(err)
	}
	again, err := ParseJSON(b)
	if err != nil {
		t.Fatalf("lists of %q: JSON %s does not parse: %v", in, b, err)
	}
	if !sameLists(lists, again) {
		t.Fatalf("JSON round trip of %q:\n got %v\nwant %v", in, again, lists)
	}
}

// FuzzParseText: no panic; errors are positioned *PeakErrors; every list
// (1H and 13C) is valid, its String() reads back as the same list, and its
// JSON too.
func FuzzParseText(f *testing.F) {
	addCaseSeeds(f, "journal.json")
	f.Fuzz(func(t *testing.T, s string) {
		lists, err := ParseText(s)
		if err != nil {
			checkParseError(t, err)
			return
		}
		checkValid(t, lists)
		for _, pl := range lists {
			out := pl.String()
			again, err := ParseText(out)
			if err != nil {
				t.Fatalf("ParseText(%q) = %v\nString() = %q does not parse: %v", s, pl, out, err)
			}
			if len(again) != 1 || !samePeaks(pl, again[0]) {
				t.Fatalf("round trip of %q:\n got %v\nwant %v", s, again, pl)
			}
		}
		jsonRoundTrip(t, s, lists)
	})
}

// FuzzParseJSON: no panic; errors are positioned *PeakErrors; parsed
// lists are valid and their JSON parses back to the same lists.
func FuzzParseJSON(f *testing.F) {
	addCaseSeeds(f, "json.json")
	f.Fuzz(func(t *testing.T, s string) {
		lists, err := ParseJSON([]byte(s))
		if err != nil {
			checkParseError(t, err)
			return
		}
		checkValid(t, lists)
		jsonRoundTrip(t, s, lists)
	})
}

// FuzzParseJCAMP: no panic; errors are positioned *PeakErrors; parsed
// lists are valid and survive the JSON form.
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
		lists, err := ParseJCAMP(b)
		if err != nil {
			checkParseError(t, err)
			return
		}
		checkValid(t, lists)
		jsonRoundTrip(t, string(b), lists)
	})
}

// FuzzRead: the one reader gives what the reader of the detected format
// gives, and ReadList of each nucleus agrees with Pick.
func FuzzRead(f *testing.F) {
	addCaseSeeds(f, "journal.json")
	addCaseSeeds(f, "json.json")
	f.Add("##TITLE= x\n##JCAMP-DX= 5.01\n##.OBSERVE NUCLEUS= ^13C\n##XUNITS= PPM\n##PEAK TABLE= (XY..XY)\n77.2,1 21.0,5\n##END=\n")
	f.Fuzz(func(t *testing.T, s string) {
		lists, err := Read([]byte(s))
		var want []PeakList
		var werr error
		switch DetectFormat([]byte(s)) {
		case FormatJCAMP:
			want, werr = ParseJCAMP([]byte(s))
		case FormatJSON:
			in := s
			if rest, ok := strings.CutPrefix(s, "\ufeff"); ok {
				in = "   " + rest
			}
			want, werr = ParseJSON([]byte(in))
		default:
			want, werr = ParseText(s)
		}
		if (err == nil) != (werr == nil) || err == nil && !sameLists(lists, want) {
			t.Fatalf("Read(%q) = %v, %v; the %s reader gives %v, %v", s, lists, err, DetectFormat([]byte(s)), want, werr)
		}
		if err != nil {
			checkParseError(t, err)
			return
		}
		checkValid(t, lists)
		for _, n := range []Nucleus{H1, C13} {
			pl, found, perr := Pick(lists, n)
			one, rerr := ReadList([]byte(s), n)
			switch {
			case perr != nil || !found:
				if rerr == nil {
					t.Fatalf("ReadList(%q, %s) = %v, but Pick finds none or several", s, n, one)
				}
				checkParseError(t, rerr)
			case rerr != nil || !samePeaks(pl, one):
				t.Fatalf("ReadList(%q, %s) = %v, %v; Pick gives %v", s, n, one, rerr, pl)
			}
		}
	})
}

// FuzzReadAs: no panic; errors are positioned *PeakErrors; lists read with
// a 13C default are valid, and when Read reads the same input too, both
// find the same lists at the same positions (only the nucleus of a list
// that names none may differ).
func FuzzReadAs(f *testing.F) {
	addCaseSeeds(f, "journal.json")
	addCaseSeeds(f, "json.json")
	f.Add("171.1 (C), 129.3 (2C, CH), 60.4 (CH2), 14.2")
	f.Fuzz(func(t *testing.T, s string) {
		lists, err := ReadAs([]byte(s), C13)
		if err != nil {
			checkParseError(t, err)
			return
		}
		checkValid(t, lists)
		h, err := Read([]byte(s))
		if err != nil {
			return
		}
		if len(h) != len(lists) {
			t.Fatalf("ReadAs(%q, 13C) found %d lists, Read %d", s, len(lists), len(h))
		}
		for i := range h {
			if h[i].Pos != lists[i].Pos || len(h[i].Peaks) != len(lists[i].Peaks) {
				t.Fatalf("list %d of %q: ReadAs at %d with %d peaks, Read at %d with %d", i, s, lists[i].Pos, len(lists[i].Peaks), h[i].Pos, len(h[i].Peaks))
			}
		}
	})
}
