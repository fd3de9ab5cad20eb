package spectrum

import (
	"os"
	"path/filepath"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

func TestDetectFormat(t *testing.T) {
	cases := []struct {
		name string
		in   string
		want Format
	}{
		{"journal text", "1H NMR (400 MHz, CDCl3) δ 2.05 (s, 3H)", FormatText},
		{"bare list", "2.05 (s, 3H)", FormatText},
		{"JSON array", " [{\"shift\": 2.05}]", FormatJSON},
		{"JSON object", "\n{\"peaks\": []}", FormatJSON},
		{"JCAMP-DX title", "##TITLE= x", FormatJCAMP},
		{"JCAMP-DX version first", "\r\n##JCAMP-DX= 5.01", FormatJCAMP},
		{"byte-order mark", "\ufeff##TITLE= x", FormatJCAMP},
		{"empty", "", FormatText},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			assert.Equal(t, c.want, DetectFormat([]byte(c.in)))
		})
	}
}

// TestRead reads the same ethyl acetate data (Gottlieb, Kotlyar, Nudelman,
// J. Org. Chem. 1997, 62, 7512, Tables 1 and 2; from memory) in each
// format and gets the same lists.
func TestRead(t *testing.T) {
	text := "1H NMR (400 MHz, CDCl3) δ 4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H), 1.26 (t, J = 7.1 Hz, 3H); " +
		"13C NMR (101 MHz, CDCl3) δ 171.36 (C), 60.49 (CH2), 21.04 (CH3), 14.19 (CH3)"
	js := `[{"mhz": 400, "solvent": "CDCl3", "peaks": [
		{"shift": 4.12, "multiplicity": "q", "j": [7.1], "integral": 2},
		{"shift": 2.05, "multiplicity": "s", "integral": 3},
		{"shift": 1.26, "multiplicity": "t", "j": [7.1], "integral": 3}]},
		{"nucleus": "13C", "mhz": 101, "solvent": "CDCl3", "peaks": [
		{"shift": 171.36, "dept": "C"}, {"shift": 60.49, "dept": "CH2"}, {"shift": 21.04, "dept": "CH3"}, {"shift": 14.19, "dept": "CH3"}]}]`
	fromText, err := Read([]byte(text))
	require.NoError(t, err)
	fromJSON, err := Read([]byte(js))
	require.NoError(t, err)
	require.Len(t, fromText, 2)
	assert.True(t, sameLists(fromText, fromJSON), "text %v\nJSON %v", fromText, fromJSON)
	assert.Equal(t, H1, fromText[0].Nucleus)
	assert.Equal(t, C13, fromText[1].Nucleus)
	assert.Equal(t, 0, fromText[0].Pos)
	assert.Equal(t, len("1H NMR (400 MHz, CDCl3) δ 4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H), 1.26 (t, J = 7.1 Hz, 3H); "), fromText[1].Pos)

	jdx, err := os.ReadFile(filepath.Join("testdata", "peaks", "compound-13c-1h.jdx"))
	require.NoError(t, err)
	fromJCAMP, err := Read(jdx)
	require.NoError(t, err)
	require.Len(t, fromJCAMP, 2)
	assert.Equal(t, C13, fromJCAMP[0].Nucleus)
	assert.Equal(t, H1, fromJCAMP[1].Nucleus)
}

func TestPickAndReadList(t *testing.T) {
	both := []byte("1H NMR (CDCl3) δ 2.05 (s, 3H); 13C NMR (CDCl3) δ 171.4, 21.0")
	h, err := ReadList(both, H1)
	require.NoError(t, err)
	assert.Len(t, h.Peaks, 1)
	c, err := ReadList(both, C13)
	require.NoError(t, err)
	assert.Len(t, c.Peaks, 2)

	onlyC := []byte("13C NMR δ 171.4, 21.0")
	_, err = ReadList(onlyC, H1)
	var pe *PeakError
	require.ErrorAs(t, err, &pe)
	assert.Equal(t, "nucleus", pe.Field)
	assert.Equal(t, "13C", pe.Token)

	two := "1H NMR (CDCl3) δ 2.05 (s, 3H);\n1H NMR (DMSO-d6) δ 1.99 (s, 3H)"
	_, err = ReadList([]byte(two), H1)
	require.ErrorAs(t, err, &pe)
	assert.Equal(t, "nucleus", pe.Field)
	assert.Equal(t, len("1H NMR (CDCl3) δ 2.05 (s, 3H);\n"), pe.Pos, "the second list's position")
	assert.Equal(t, 2, pe.Line)

	lists, err := Read([]byte(two))
	require.NoError(t, err)
	_, found, err := Pick(lists, C13)
	assert.NoError(t, err)
	assert.False(t, found)
}

func TestParseNucleus(t *testing.T) {
	for in, want := range map[string]Nucleus{
		"1H": H1, "¹H": H1, "^1H": H1, "H1": H1, "proton": H1,
		"13C": C13, "¹³C": C13, "^13C": C13, "C13": C13, "carbon": C13, " 13c ": C13,
	} {
		got, err := ParseNucleus(in)
		require.NoError(t, err, in)
		assert.Equal(t, want, got, in)
	}
	for _, in := range []string{"19F", "^31P", "", "2H"} {
		_, err := ParseNucleus(in)
		var pe *PeakError
		require.ErrorAs(t, err, &pe, in)
		assert.Equal(t, "nucleus", pe.Field)
	}
	assert.Equal(t, "1H", H1.String())
	assert.Equal(t, "13C", C13.String())
}

// TestShiftRanges checks the nucleus limits against shifts they must
// admit: 1H of a carboxylic acid dimer near 12 ppm and of TMS at 0; 13C of
// cyclopentanone's carbonyl (219 ppm) and iodomethane (about −21 ppm)
// (Pretsch et al., 13C tables; from memory).
func TestShiftRanges(t *testing.T) {
	lo, hi := H1.ShiftRange()
	assert.True(t, lo <= 0 && hi >= 12)
	lo, hi = C13.ShiftRange()
	assert.True(t, lo <= -21 && hi >= 219)
	assert.Equal(t, MaxJ1H, H1.MaxJ())
	assert.True(t, C13.MaxJ() >= 290, "1J(C,F) up to about 290 Hz")
}

func TestParseDEPT(t *testing.T) {
	for in, want := range map[string]DEPT{
		"CH3": CH3, "CH₃": CH3, "ch3": CH3, "CH2": CH2, "CH₂": CH2, "CH": CH,
		"C": Cq, "Cq": Cq, "C_q": Cq, "Cquat": Cq, "quaternary": Cq, "": DEPTUnknown,
	} {
		got, err := ParseDEPT(in)
		require.NoError(t, err, in)
		assert.Equal(t, want, got, in)
	}
	_, err := ParseDEPT("CH4")
	var pe *PeakError
	require.ErrorAs(t, err, &pe)
	assert.Equal(t, "dept", pe.Field)
	for d, h := range map[DEPT]int{CH3: 3, CH2: 2, CH: 1, Cq: 0, DEPTUnknown: -1} {
		assert.Equal(t, h, d.H(), "%s", d)
		back, err := ParseDEPT(d.String())
		require.NoError(t, err)
		assert.Equal(t, d, back)
	}
}

func TestCheck(t *testing.T) {
	ok := PeakList{Nucleus: C13, Peaks: []Peak{{Shift: 129.3, ShiftLo: 129.3, ShiftHi: 129.3, Count: 2, DEPT: CH}}}
	assert.NoError(t, ok.Check())
	cases := []struct {
		name  string
		pl    PeakList
		field string
	}{
		{"empty", PeakList{}, "peaks"},
		{"1H shift too high", PeakList{Peaks: []Peak{{Shift: 20, ShiftLo: 20, ShiftHi: 20}}}, "peaks[0].shift"},
		{"integral in 13C", PeakList{Nucleus: C13, Peaks: []Peak{{Shift: 20, ShiftLo: 20, ShiftHi: 20, Integral: 1}}}, "peaks[0].integral"},
		{"DEPT in 1H", PeakList{Peaks: []Peak{{Shift: 2, ShiftLo: 2, ShiftHi: 2, DEPT: CH3}}}, "peaks[0].dept"},
		{"count in 1H", PeakList{Peaks: []Peak{{Shift: 2, ShiftLo: 2, ShiftHi: 2, Count: 1}}}, "peaks[0].count"},
		{"J above 13C limit", PeakList{Nucleus: C13, Peaks: []Peak{{Shift: 120, ShiftLo: 120, ShiftHi: 120, Multiplicity: Split(2), J: []float64{500}}}}, "peaks[0].j"},
		{"unknown nucleus", PeakList{Nucleus: Nucleus(7), Peaks: ok.Peaks}, "nucleus"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			var pe *PeakError
			require.ErrorAs(t, c.pl.Check(), &pe)
			assert.Equal(t, c.field, pe.Field)
		})
	}
}

// TestReadAs reads 13C lists that do not name their nucleus, as pasted
// into a field meant for 13C. The shifts are ethyl acetate's in CDCl3
// (Gottlieb, Kotlyar, Nudelman, J. Org. Chem. 1997, 62, 7512, Table 2;
// from memory).
func TestReadAs(t *testing.T) {
	want := []float64{171.36, 60.49, 21.04, 14.19}
	cases := []struct {
		name  string
		in    string
		nuc   Nucleus // of the first list
		lists int
	}{
		{"bare text", "171.36, 60.49, 21.04, 14.19", C13, 1},
		{"text with delta and DEPT", "δ 171.36 (C), 60.49 (CH2), 21.04 (CH3), 14.19 (CH3)", C13, 1},
		{"text with a 13C header", "13C NMR (101 MHz, CDCl3) δ 171.36, 60.49, 21.04, 14.19", C13, 1},
		{"deltaC header", "δC 171.36, 60.49, 21.04, 14.19", C13, 1},
		{"JSON array of peaks", `[{"shift": 171.36, "dept": "C"}, {"shift": 60.49, "dept": "CH2"}, {"shift": 21.04}, {"shift": 14.19, "count": 1}]`, C13, 1},
		{"JSON list object without nucleus", `{"mhz": 101, "peaks": [{"shift": 171.36}, {"shift": 60.49}, {"shift": 21.04}, {"shift": 14.19}]}`, C13, 1},
		{"1H header keeps 1H", "1H NMR δ 4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H), 1.26 (t, J = 7.1 Hz, 3H)", H1, 1},
		{"deltaH keeps 1H", "δH 4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H), 1.26 (t, J = 7.1 Hz, 3H)", H1, 1},
		{"JSON list object naming 1H", `{"nucleus": "1H", "peaks": [{"shift": 2.05, "integral": 3}]}`, H1, 1},
		{"bare text then a 1H section", "171.36, 60.49, 21.04, 14.19; 1H NMR δ 2.05 (s, 3H)", C13, 2},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			lists, err := ReadAs([]byte(c.in), C13)
			require.NoError(t, err)
			require.Len(t, lists, c.lists)
			assert.Equal(t, c.nuc, lists[0].Nucleus)
			if c.nuc != C13 {
				return
			}
			require.Len(t, lists[0].Peaks, len(want))
			for i, p := range lists[0].Peaks {
				assert.InDelta(t, want[i], p.Shift, 1e-9, "peak %d (source: Gottlieb et al. 1997, Table 2)", i)
			}
		})
	}
	t.Run("same as Read for 1H", func(t *testing.T) {
		in := []byte("4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H)")
		a, err := Read(in)
		require.NoError(t, err)
		b, err := ReadAs(in, H1)
		require.NoError(t, err)
		assert.True(t, sameLists(a, b))
	})
	t.Run("integral in a header-less 13C list", func(t *testing.T) {
		_, err := ReadAs([]byte("4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H)"), C13)
		var pe *PeakError
		require.ErrorAs(t, err, &pe)
		assert.Equal(t, "2H", pe.Token)
		assert.Positive(t, pe.Pos)
	})
	t.Run("JCAMP-DX block without a nucleus", func(t *testing.T) {
		jdx := "##TITLE= invented sample\n##JCAMP-DX= 5.01\n##DATA TYPE= NMR PEAK TABLE\n##XUNITS= PPM\n##PEAK TABLE= (XY..XY)\n171.36, 1\n60.49, 1\n21.04, 1\n14.19, 1\n##END=\n"
		lists, err := ReadAs([]byte(jdx), C13)
		require.NoError(t, err)
		require.Len(t, lists, 1)
		assert.Equal(t, C13, lists[0].Nucleus)
		assert.Len(t, lists[0].Peaks, 4)
	})
}
