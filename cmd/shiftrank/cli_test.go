package main

import (
	"errors"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
	"unicode/utf8"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// TestHelpOnStdout: --help and -h of the binary and of every subcommand
// print the help on stdout and succeed (exit status 0), so that
// "shiftrank rank --help | less" works; flags are spelled --name and
// every page has examples (common practice for command-line tools).
func TestHelpOnStdout(t *testing.T) {
	singleDash := regexp.MustCompile(`(?m)^\s+-[a-z]`)
	tests := []struct {
		name  string
		args  []string
		flags bool // the page lists flags
	}{
		{"binary", []string{}, false},
		{"isomers", []string{"isomers"}, true},
		{"predict", []string{"predict"}, true},
		{"rank", []string{"rank"}, true},
		{"bench", []string{"bench"}, true},
		{"serve", []string{"serve"}, true},
		{"apikey", []string{"apikey"}, false},
		{"apikey create", []string{"apikey", "create"}, true},
	}
	for _, tc := range tests {
		for _, h := range []string{"--help", "-h"} {
			t.Run(tc.name+" "+h, func(t *testing.T) {
				out, errOut, err := runCmd(t, "", append(append([]string{}, tc.args...), h)...)
				require.NoError(t, err, "help is not an error (exit 0)")
				assert.Empty(t, errOut, "help goes to stdout only")
				assert.Contains(t, out, "usage: shiftrank")
				assert.Contains(t, out, "Examples:")
				if tc.flags {
					assert.Contains(t, out, "\n  --", "flags listed as --name")
				}
				assert.NotRegexp(t, singleDash, out, "no flag spelled -name")
				for _, l := range strings.Split(out, "\n") {
					assert.LessOrEqual(t, utf8.RuneCountInString(l), lineWidth, "help line too long: %q", l)
				}
			})
		}
	}
	out, _, err := runCmd(t, "", "help", "rank")
	require.NoError(t, err)
	assert.Contains(t, out, "--formula STRING")
}

// TestRankHelpContents: rank's help names the accepted peak formats and
// the flags with their types and defaults.
func TestRankHelpContents(t *testing.T) {
	out, _, err := runCmd(t, "", "rank", "--help")
	require.NoError(t, err)
	for _, want := range []string{
		"--formula STRING", "--peaks STRING", "--carbon STRING", "--top INT", "--time-budget DURATION",
		"--require TEXT", "--json\n", "(default 10)",
		"journal text", "4.12 (q, J = 7.1 Hz, 2H)", "JSON", `"multiplicity": "q"`, "JCAMP-DX", "(CH3)", "DEPT",
		"NB-2291-07", "0-based",
	} {
		assert.Contains(t, out, want, "rank --help")
	}
}

// TestBadUsageOnStderr: bad usage prints the usage lines on stderr,
// nothing on stdout, and is bad input (exit status 2).
func TestBadUsageOnStderr(t *testing.T) {
	tests := []struct {
		name string
		args []string
		want string
	}{
		{"no command", []string{}, "no command"},
		{"unknown command", []string{"frobnicate"}, "unknown command"},
		{"unknown flag", []string{"rank", "--bogus"}, "--bogus"},
		{"missing value", []string{"isomers", "C4H10O", "--limit"}, "--limit"},
		{"bad value", []string{"predict", "CCO", "--mhz", "x"}, "--mhz"},
		{"apikey unknown flag", []string{"apikey", "create", "--bogus"}, "--bogus"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			out, errOut, err := runCmd(t, "", tc.args...)
			var u usageError
			require.True(t, errors.As(err, &u), "error %v, want bad input (exit 2)", err)
			assert.Contains(t, err.Error(), tc.want)
			assert.Empty(t, out, "nothing on stdout")
			assert.Contains(t, errOut, "usage: shiftrank")
		})
	}
}

// TestErrorPositionsOneBased: parse errors count characters from 1, as
// the web page does ("at character 5"), not bytes from 0.
func TestErrorPositionsOneBased(t *testing.T) {
	multiline := filepath.Join(t.TempDir(), "peaks.txt")
	require.NoError(t, os.WriteFile(multiline, []byte("1H NMR (400 MHz, CDCl3) δ 4.12 (q, 2H),\n2.05 (qz, 3H)"), 0o600))
	tests := []struct {
		name string
		args []string
		want string
	}{
		// "Xy" starts at the 5th character of "C4H8Xy2".
		{"formula", []string{"rank", "--formula", "C4H8Xy2", "--peaks", "2.05 (s, 3H)"}, `at character 5 ("Xy")`},
		{"isomers formula", []string{"isomers", "C4H8Xy2"}, `at character 5 ("Xy")`},
		// "(" is the 2nd character of "C(=O".
		{"fragment", []string{"rank", "--formula", "C4H8O2", "--peaks", "2.05 (s, 3H)", "--require", "C(=O"}, `require[0]: unclosed branch '(' at character 2`},
		// "qz" after "δ" (two bytes, one character): character 16.
		{"peaks after δ", []string{"rank", "--formula", "C4H8O2", "--peaks", "1H NMR δ 4.12 (qz, 2H)"}, `at character 16 ("qz")`},
		// second line "2.05 (qz, 3H)": "qz" is its 7th character.
		{"peaks on line 2", []string{"rank", "--formula", "C4H8O2", "--peaks", "@" + multiline}, `at line 2, character 7 ("qz")`},
		{"filter", []string{"isomers", "C4H10O", "--filter", "plausible,-nope"}, `at character 11 ("-nope")`},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, _, err := runCmd(t, "", tc.args...)
			require.Error(t, err)
			var u usageError
			assert.True(t, errors.As(err, &u), "bad input (exit 2): %v", err)
			assert.Contains(t, err.Error(), tc.want)
			assert.NotContains(t, err.Error(), "position", "byte positions are not shown")
		})
	}
}

func TestCharPos(t *testing.T) {
	tests := []struct {
		name     string
		s        string
		pos      int
		want     int
		wantLine int
		wantChar int
	}{
		{"start", "C4H8Xy2", 0, 1, 1, 1},
		{"ascii", "C4H8Xy2", 4, 5, 1, 5},
		{"after δ", "δ 4.12 (qz", 9, 9, 1, 9},
		{"inside δ", "δ", 1, 1, 1, 1},
		{"past the end", "CCO", 10, 4, 1, 4},
		// "qz" is at byte 17: "δ" takes two bytes.
		{"second line", "δ 1.0 (s),\n2.0 (qz)", 17, 17, 2, 6},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			assert.Equal(t, tc.want, charPos(tc.s, tc.pos), "charPos(%q, %d)", tc.s, tc.pos)
			l, c := lineCharPos(tc.s, tc.pos)
			assert.Equal(t, [2]int{tc.wantLine, tc.wantChar}, [2]int{l, c}, "lineCharPos(%q, %d)", tc.s, tc.pos)
		})
	}
}

// TestFormatPercent: the human output prints probabilities as the web
// page does. Expected strings are the output of the page's pctText
// (web/static/app.js) under node, whose toFixed rounds as ECMA-262
// Number.prototype.toFixed specifies (an exact half away from zero).
func TestFormatPercent(t *testing.T) {
	tests := []struct {
		name string
		p    float64
		want string
	}{
		{"certain", 1, "> 99.9 %"},
		{"rounds to 100.0", 0.9995, "> 99.9 %"},
		{"just below", 0.99949, "99.9 %"},
		{"0.999", 0.999, "99.9 %"},
		{"half", 0.5, "50.0 %"},
		{"exact half rounds up", 0.1225, "12.3 %"},
		{"0.0125", 0.0125, "1.3 %"},
		{"0.001", 0.001, "0.1 %"},
		{"below 0.1 %", 0.00099, "< 0.1 %"},
		{"tiny", 1e-7, "< 0.1 %"},
		{"zero", 0, "0.0 %"},
		{"many digits", 0.123456, "12.3 %"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			assert.Equal(t, tc.want, formatPercent(tc.p), "formatPercent(%g) (source: pctText in web/static/app.js)", tc.p)
		})
	}
}

// TestRankOutputFits100Columns: the human output of a real ranking (ethyl
// acetate, Gottlieb et al. 1997; with and without its 13C list) keeps
// every line within 100 characters, numbers atoms from 1 and says the
// JSON keeps 0-based indices.
func TestRankOutputFits100Columns(t *testing.T) {
	for i, args := range [][]string{
		{"rank", "--formula", "C4H8O2", "--peaks", ethylAcetatePeaks, "--top", "10"},
		{"rank", "--formula", "C4H8O2", "--peaks", ethylAcetatePeaks, "--carbon", ethylAcetateCarbon, "--top", "10"},
		// a poor fit: long explanations for many candidates
		{"rank", "--formula", "C4H8O2", "--peaks", "4.12 (q, 2H), 2.05 (sext, 3H)", "--top", "10"},
	} {
		out, _, err := runCmd(t, "", args...)
		require.NoError(t, err)
		for _, l := range strings.Split(out, "\n") {
			assert.LessOrEqual(t, utf8.RuneCountInString(l), lineWidth, "line longer than %d characters: %q", lineWidth, l)
		}
		assert.Contains(t, out, "the --json output keeps the 0-based indices")
		if i < 2 {
			assert.Contains(t, out, "> 99.9 %", "ethyl acetate first with the page's probability format")
		}
	}
	// CCOC(C)=O canonicalises to CC(=O)OCC: the OCH2 is atom 5 counted from
	// 1, split by the CH3, atom 6.
	out, _, err := runCmd(t, "", "rank", "--formula", "C4H8O2", "--peaks", ethylAcetatePeaks, "--top", "1")
	require.NoError(t, err)
	assert.Regexp(t, `(?m)^\s+1\s+4\.12 .* 5\s+1$`, out, "peak 1 on atom 5, environment 1")
	assert.Contains(t, out, "3 H on atom 6 ", "the explanation numbers atoms from 1 too")
}

func TestFitLine(t *testing.T) {
	long := "        multiplicity: " + strings.Repeat("word ", 40)
	lines := fitLine(long, 100)
	require.Greater(t, len(lines), 1)
	for i, l := range lines {
		assert.LessOrEqual(t, utf8.RuneCountInString(l), 100)
		if i > 0 {
			assert.True(t, strings.HasPrefix(l, strings.Repeat(" ", 12)+"word"), "hanging indent: %q", l)
		}
	}
	smiles := "  #1 " + strings.Repeat("C", 120) + " (probability 50.0 %)"
	lines = fitLine(smiles, 100)
	assert.Equal(t, []string{"  #1", "      " + strings.Repeat("C", 120), "      (probability 50.0 %)"}, lines, "a long SMILES stays whole")
}

func TestRenumberAtoms(t *testing.T) {
	tests := []struct{ in, want string }{
		{"3 H on atom 5 (vicinal sp3) → q", "3 H on atom 6 (vicinal sp3) → q"},
		{"1 H of atoms 3,4 (ring)", "1 H of atoms 4,5 (ring)"},
		{"env 0: base CH +1.55, env 3: β: OH", "env 1: base CH +1.55, env 4: β: OH"},
		{"no resolved couplings → s", "no resolved couplings → s"},
	}
	for _, tc := range tests {
		assert.Equal(t, tc.want, renumberAtoms(tc.in), "renumberAtoms(%q)", tc.in)
	}
}
