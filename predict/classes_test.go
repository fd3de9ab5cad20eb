package predict

import (
	"encoding/json"
	"flag"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"shiftrank/molecule"
)

var classRows = flag.Bool("classes.rows", false, "TestClassShifts: log every entry with its prediction")

// classFile is one file of testdata/classes (see the README there).
type classFile struct {
	Class   string       `json:"class"`
	Title   string       `json:"title"`
	Tuning  []classEntry `json:"tuning"`
	Holdout []classEntry `json:"holdout"`
}

type classEntry struct {
	Name    string    `json:"name"`
	SMILES  string    `json:"smiles"`
	Atoms   []int     `json:"atoms"`
	H       int       `json:"h"`
	Shift   float64   `json:"shift"`
	Parts   []float64 `json:"parts"`
	Solvent string    `json:"solvent"`
	Source  string    `json:"source"`
}

// classStats summarises the errors of one part of one class.
type classStats struct {
	n                int
	sumAbs, max      float64
	over05, within2σ int
	worst            string
}

func (s *classStats) add(err, sigma float64, what string) {
	a := math.Abs(err)
	s.n++
	s.sumAbs += a
	if a > 0.5 {
		s.over05++
	}
	if a <= 2*sigma {
		s.within2σ++
	}
	if a > s.max {
		s.max, s.worst = a, what
	}
}

func (s *classStats) mae() float64 { return s.sumAbs / float64(max(s.n, 1)) }

// holdoutTarget lists the classes whose hold-out part meets issue 10's
// per-class target (mean absolute error ≤ 0.25 ppm); the test fails if one
// of them falls back above it. Classes not listed are reported only.
var holdoutTarget = map[string]bool{
	"ring amides":                    true,
	"ring alkenes":                   true,
	"geminal electronegative":        true,
	"nitrogen-rich azoles":           true,
	"three- and four-membered rings": true,
	"sulfur neighbours":              true,
	"next to CF2/CF3":                true,
	"geminal alkene methyls":         true,
}

// TestClassShifts reports, for each class of testdata/classes, the mean
// absolute error of the tuning and hold-out parts, the share of
// environments off by more than 0.5 ppm and the share within two predicted
// standard deviations. Every entry must match an environment of the stated
// H count. Run with -classes.rows to see every entry.
func TestClassShifts(t *testing.T) {
	files, err := filepath.Glob("testdata/classes/*.json")
	require.NoError(t, err)
	require.NotEmpty(t, files)
	sort.Strings(files)
	p := New(Options{})
	pe := New(Options{Explain: true})
	var total [2]classStats
	type line struct {
		class string
		part  [2]classStats
	}
	var lines []line
	for _, file := range files {
		raw, err := os.ReadFile(file)
		require.NoError(t, err)
		var cf classFile
		dec := json.NewDecoder(strings.NewReader(string(raw)))
		dec.DisallowUnknownFields()
		require.NoError(t, dec.Decode(&cf), file)
		require.NotEmpty(t, cf.Class, file)
		require.NotEmpty(t, cf.Holdout, "%s: no hold-out part", file)
		ln := line{class: cf.Class}
		spectra := map[string]*Spectrum{}
		used := map[string]map[int]bool{}
		inPart := map[string]int{}
		for part, entries := range [2][]classEntry{cf.Tuning, cf.Holdout} {
			for _, e := range entries {
				where := file + ": " + e.Name
				require.NotEmpty(t, e.Atoms, where)
				require.Positive(t, e.H, where)
				require.NotEmpty(t, e.Source, where)
				if len(e.Parts) > 0 {
					var s float64
					for _, v := range e.Parts {
						s += v
					}
					require.InDelta(t, s/float64(len(e.Parts)), e.Shift, 0.001, "%s: shift must be the mean of parts", where)
				}
				if p0, ok := inPart[e.SMILES]; ok {
					require.Equal(t, p0, part, "%s: a compound is either tuning or hold-out", where)
				}
				inPart[e.SMILES] = part
				sp, ok := spectra[e.SMILES]
				if !ok {
					g, err := molecule.ParseSMILES(e.SMILES)
					require.NoError(t, err, where)
					for _, a := range e.Atoms {
						require.True(t, a >= 0 && a < len(g.Atoms) && g.Atoms[a].HCount > 0, "%s: atom %d carries no H", where, a)
					}
					sp, err = p.Predict(g)
					require.NoError(t, err, where)
					spe, err := pe.Predict(g)
					require.NoError(t, err, where)
					checkSpectrum(t, where, g, spe, true)
					spectra[e.SMILES] = sp
					used[e.SMILES] = map[int]bool{}
				}
				best := -1
				for i, env := range sp.Environments {
					if used[e.SMILES][i] || !sharesAtom(env.Atoms, e.Atoms) {
						continue
					}
					if best < 0 || math.Abs(env.Shift-e.Shift) < math.Abs(sp.Environments[best].Shift-e.Shift) {
						best = i
					}
				}
				if !assert.GreaterOrEqual(t, best, 0, "%s (%s): no unused environment on atoms %v", where, e.SMILES, e.Atoms) {
					continue
				}
				used[e.SMILES][best] = true
				env := sp.Environments[best]
				assert.Equal(t, e.H, env.H, "%s (%s) atoms %v: environment H count", where, e.SMILES, e.Atoms)
				d := env.Shift - e.Shift
				what := e.Name + " " + env.Kind
				ln.part[part].add(d, env.Sigma, what)
				total[part].add(d, env.Sigma, what)
				if *classRows {
					t.Logf("%-8s %-34s %-28s obs %6.2f pred %6.2f σ %.2f err %+.2f", [2]string{"tuning", "holdout"}[part], cf.Class, e.Name, e.Shift, env.Shift, env.Sigma, d)
				}
			}
		}
		lines = append(lines, ln)
	}
	t.Logf("%-31s | %-30s | %-30s", "", "tuning", "hold-out")
	t.Logf("%-31s | %-30s | %-30s", "class", "  n   MAE  >0.5   ≤2σ   max", "  n   MAE  >0.5   ≤2σ   max")
	row := func(s *classStats) string {
		if s.n == 0 {
			return "—"
		}
		return fmt.Sprintf("%3d %5.2f %4.0f%% %4.0f%% %5.2f", s.n, s.mae(), 100*float64(s.over05)/float64(s.n), 100*float64(s.within2σ)/float64(s.n), s.max)
	}
	for i := range lines {
		l := &lines[i]
		mark := ""
		if l.part[1].mae() > 0.25 {
			mark = " | hold-out above 0.25, worst: " + l.part[1].worst
		}
		t.Logf("%-31s | %-30s | %-30s%s", l.class, row(&l.part[0]), row(&l.part[1]), mark)
	}
	t.Logf("%-31s | %-30s | %-30s", "all classes", row(&total[0]), row(&total[1]))
	for i := range lines {
		l := &lines[i]
		if holdoutTarget[l.class] {
			assert.LessOrEqual(t, l.part[1].mae(), 0.25, "class %q hold-out MAE (issue 10 target ≤ 0.25 ppm)", l.class)
		}
	}
}

func sharesAtom(a, b []int) bool {
	for _, x := range b {
		if containsInt(a, x) {
			return true
		}
	}
	return false
}

// TestWideSigmaOutsideTables: hydrogens the increment tables do not cover
// must carry a σ that says so, not a precise-looking default (issue 10).
func TestWideSigmaOutsideTables(t *testing.T) {
	p := New(Options{})
	for _, tc := range []struct {
		name, smiles string
		atom         int
		minSigma     float64
	}{
		{"five-membered heteroaromatic outside the base table ([1,2,4]triazolo[4,3-a]pyridine H3)", "c1ccc2nncn2c1", 6, 0.35},
		{"thioformamide H (N,N-dimethylthioformamide)", "CN(C)C=S", 3, 0.5},
		{"endocyclic conjugated triene (cycloheptatriene H3)", "C1C=CC=CC=C1", 3, 0.4},
		{"cross-conjugated five-membered ring (pyrazol-3-one H4)", "O=C1C=CNN1", 2, 0.4},
		{"beta-lactam CH2 estimated from the beta-lactone parent", "O=C1CCN1", 2, 0.4},
	} {
		sp := predictSMILES(t, p, tc.smiles)
		es := envOn(sp, tc.atom)
		require.Len(t, es, 1, tc.name)
		assert.GreaterOrEqual(t, es[0].Sigma, tc.minSigma, "%s: Predict(%q) σ = %.2f, want ≥ %.2f (outside the tables)", tc.name, tc.smiles, es[0].Sigma, tc.minSigma)
	}
}
