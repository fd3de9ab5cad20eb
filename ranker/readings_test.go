package ranker

import (
	"context"
	"os"
	"testing"

	"shiftrank/spectrum"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"shiftrank/infer"
	"shiftrank/molecule"
)

// TestReadingsHoldTheTruth reads the published spectra of the reference
// sets (testdata/realsize.json, realsize_holdout.json, accuracy.json and
// validation.json, each entry with its source) and checks that the true structure fits one of
// the readings the constraint inference makes: a reading that excludes the
// truth can never rank it. It logs how often the truth fits the first
// (most plausible) reading.
func TestReadingsHoldTheTruth(t *testing.T) {
	for _, file := range []string{"../testdata/realsize.json", "../testdata/realsize_holdout.json", "../testdata/accuracy.json", "../testdata/validation.json"} {
		t.Run(file, func(t *testing.T) {
			b, err := os.ReadFile(file)
			require.NoError(t, err)
			set, err := ParseReferenceSet(b)
			require.NoError(t, err)
			r := New(Options{})
			first := 0
			for _, c := range set.Compounds {
				j, err := r.prepare(Request{Formula: c.Formula, Peaks: readPeaks(t, c.Peaks)})
				require.NoError(t, err, c.Name)
				g, err := molecule.ParseSMILES(c.SMILES)
				require.NoError(t, err, c.Name)
				an := infer.Infer(j.formula, j.inferPeaks(), infer.Options{})
				hit := -1
				for k, rd := range an.Readings {
					if ok, _ := rd.Spec.Explain(g); ok {
						hit = k
						break
					}
				}
				if hit == 0 {
					first++
				}
				assert.GreaterOrEqual(t, hit, 0, "%s (%s): the true structure fits none of the %d readings of its spectrum (source: %s)", c.Name, c.SMILES, len(an.Readings), c.Source)
			}
			t.Logf("%s: the truth fits the first reading for %d of %d compounds", file, first, len(set.Compounds))
		})
	}
}

// readPeaks reads a 1H peak list of a reference entry.
func readPeaks(t testing.TB, s string) spectrum.PeakList {
	t.Helper()
	pl, err := spectrum.ReadList([]byte(s), spectrum.H1)
	if err != nil {
		t.Fatal(err)
	}
	return pl
}

// TestRankEstimatesBeforeTheRun checks that a constrained ranking reports
// the size of each reading's search estimated before it ran (Knuth's
// method, see isomers.Estimate), and that the estimates agree with what
// the searches then did: an exact estimate (a small search walked whole)
// holds at least the structures the reading found (fewer when an earlier
// reading found them first), and the node estimates of readings searched
// completely are within a factor of four of the nodes visited. Spectra:
// the published ones of testdata/realsize.json (sources there).
func TestRankEstimatesBeforeTheRun(t *testing.T) {
	b, err := os.ReadFile("../testdata/realsize.json")
	require.NoError(t, err)
	set, err := ParseReferenceSet(b)
	require.NoError(t, err)
	want := map[string]bool{"ethyl phenylacetate": true, "benzyl acetate": true, "menthol (OH within the 1.48–1.36 multiplet)": true}
	r := New(Options{})
	n := 0
	for _, c := range set.Compounds {
		if !want[c.Name] {
			continue
		}
		n++
		res, err := r.Rank(context.Background(), Request{Formula: c.Formula, Peaks: readPeaks(t, c.Peaks), TopK: 3}, nil)
		require.NoError(t, err, c.Name)
		s := res.Search
		require.Equal(t, ScopeConstrained, s.Scope, c.Name)
		assert.Positive(t, s.EstimatedNodes, "%s: no estimate of the search before the run", c.Name)
		for k, rd := range s.Readings {
			if rd.State == ReadingSkipped || rd.State == ReadingNotNeeded {
				continue
			}
			e := rd.Estimate
			if !assert.NotNil(t, e, "%s reading %d (%s) was searched without an estimate", c.Name, k+1, rd.Name) {
				continue
			}
			t.Logf("%s reading %d: found %d in %d nodes (%s); estimated %.0f ± %.0f%% in %.0f nodes (exact %v)",
				c.Name, k+1, rd.Structures, rd.Nodes, rd.State, e.Structures, 100*e.RelErr, e.Nodes, e.Exact)
			if e.Exact {
				assert.GreaterOrEqual(t, e.Structures, float64(rd.Structures), "%s reading %d: exact estimate below the structures found", c.Name, k+1)
			}
			if rd.State == ReadingComplete && rd.Nodes > 1000 {
				ratio := e.Nodes / float64(rd.Nodes)
				assert.True(t, ratio > 0.25 && ratio < 4, "%s reading %d: %.0f nodes estimated, %d visited", c.Name, k+1, e.Nodes, rd.Nodes)
			}
		}
	}
	require.Equal(t, len(want), n, "compounds of the set found")
}
