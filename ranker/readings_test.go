package ranker

import (
	"os"
	"testing"

	"shiftrank/spectrum"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"shiftrank/infer"
	"shiftrank/molecule"
)

// TestReadingsHoldTheTruth reads the published spectra of the real-size
// reference sets (testdata/realsize.json and realsize_holdout.json, each
// entry with its source) and checks that the true structure fits one of
// the readings the constraint inference makes: a reading that excludes the
// truth can never rank it. It logs how often the truth fits the first
// (most plausible) reading.
func TestReadingsHoldTheTruth(t *testing.T) {
	for _, file := range []string{"../testdata/realsize.json", "../testdata/realsize_holdout.json"} {
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
