package ranker

import (
	"context"
	"os"
	"testing"

	"shiftrank/infer"
	"shiftrank/isomers"
)

// BenchmarkReadingSearch measures the generator's work inside the first
// reading of published spectra from testdata/realsize.json (sources named
// there): nodes visited and structures built, bounded by a node limit so
// that one iteration stays short. Run with
// go test -run '^$' -bench ReadingSearch ./ranker.
func BenchmarkReadingSearch(b *testing.B) {
	data, err := os.ReadFile("../testdata/realsize.json")
	if err != nil {
		b.Fatal(err)
	}
	set, err := ParseReferenceSet(data)
	if err != nil {
		b.Fatal(err)
	}
	want := map[string]bool{"2-acetonaphthone": true, "N,N-diethyl-3-methylbenzamide (DEET)": true, "ethyl phenylacetate": true, "dibenzofuran": true}
	r := New(Options{})
	for _, c := range set.Compounds {
		if !want[c.Name] {
			continue
		}
		b.Run(c.Name, func(b *testing.B) {
			j, err := r.prepare(Request{Formula: c.Formula, Peaks: readPeaks(b, c.Peaks)})
			if err != nil {
				b.Fatal(err)
			}
			an := infer.Infer(j.formula, j.inferPeaks(), infer.Options{})
			if len(an.Readings) == 0 {
				b.Fatal("no reading")
			}
			for b.Loop() {
				st, _ := isomers.Count(context.Background(), j.formula, isomers.Options{Spec: &an.Readings[0].Spec, Workers: 1, NodeLimit: 2_000_000})
				b.ReportMetric(float64(st.Nodes), "nodes")
				b.ReportMetric(float64(st.Emitted), "structures")
			}
		})
	}
}
