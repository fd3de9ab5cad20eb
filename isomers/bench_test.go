package isomers

import (
	"bytes"
	"context"
	"os/exec"
	"strconv"
	"strings"
	"testing"
	"time"

	"shiftrank/internal/rdkittest"
	"shiftrank/molecule"
)

// benchFormulas: the benchmark set. C10H22 and C8H18O are acyclic
// (DBE 0); C7H8 (DBE 4) and C6H12O2 (DBE 1, two O) exercise rings,
// multiple bonds, heteroatoms and Kekulé merging. C10H8 (DBE 7) is a
// larger set with heteroatom-free aromatics; C7H7NO (DBE 5) has DBE ≥ 3
// and heteroatoms.
var benchFormulas = []string{"C10H22", "C8H18O", "C7H8", "C6H12O2", "C7H7NO", "C16H34"}

// BenchmarkCount measures the search itself (Count: no graphs handed out)
// with the filter off, on all cores.
func BenchmarkCount(b *testing.B) {
	for _, fs := range benchFormulas {
		f := molecule.MustParseFormula(fs)
		b.Run(fs, func(b *testing.B) {
			var total int64
			start := time.Now()
			cpu0, cpuOK := processCPU()
			for i := 0; i < b.N; i++ {
				st, err := Count(context.Background(), f, Options{Filter: NoFilter()})
				if err != nil {
					b.Fatal(err)
				}
				total += st.Emitted
			}
			b.ReportMetric(float64(total)/time.Since(start).Seconds(), "structures/s")
			if cpu1, _ := processCPU(); cpuOK && cpu1 > cpu0 {
				// per CPU-second: the figure to compare on a shared machine
				b.ReportMetric(float64(total)/(cpu1-cpu0).Seconds(), "structures/cpu-s")
			}
			b.ReportMetric(float64(total/int64(b.N)), "structures")
		})
	}
}

// BenchmarkGenerate measures Generate with the default filter: graphs
// built and handed over in deterministic order, as the ranker and the
// isomers command consume them.
func BenchmarkGenerate(b *testing.B) {
	for _, fs := range benchFormulas {
		f := molecule.MustParseFormula(fs)
		b.Run(fs, func(b *testing.B) {
			var total int64
			start := time.Now()
			cpu0, cpuOK := processCPU()
			for i := 0; i < b.N; i++ {
				st, err := Generate(context.Background(), f, Options{Filter: DefaultFilter()}, func(g *molecule.Graph) bool { return true })
				if err != nil {
					b.Fatal(err)
				}
				total += st.Emitted
			}
			b.ReportMetric(float64(total)/time.Since(start).Seconds(), "structures/s")
			if cpu1, _ := processCPU(); cpuOK && cpu1 > cpu0 {
				b.ReportMetric(float64(total)/(cpu1-cpu0).Seconds(), "structures/cpu-s")
			}
		})
	}
}

// BenchmarkAgainstRDKit compares generating the full --filter=none set of
// a formula with RDKit merely parsing and canonicalising the same set
// (timed inside Python, excluding start-up), and prints the ratio.
func BenchmarkAgainstRDKit(b *testing.B) {
	rdkittest.Require(b)
	for _, fs := range []string{"C7H8", "C6H12O2", "C8H18O", "C5H5NO"} {
		f := molecule.MustParseFormula(fs)
		b.Run(fs, func(b *testing.B) {
			var smiles bytes.Buffer
			var c molecule.Canonicalizer
			if _, err := Generate(context.Background(), f, Options{Filter: NoFilter()}, func(g *molecule.Graph) bool {
				s, _ := c.CanonicalSMILES(g)
				smiles.WriteString(s + "\n")
				return true
			}); err != nil {
				b.Fatal(err)
			}
			b.ResetTimer()
			var n int64
			start := time.Now()
			for i := 0; i < b.N; i++ {
				st, err := Count(context.Background(), f, Options{Filter: NoFilter()})
				if err != nil {
					b.Fatal(err)
				}
				n = st.Emitted
			}
			gen := time.Since(start).Seconds() / float64(b.N)
			b.StopTimer()
			cmd := exec.Command(rdkittest.Python, "testdata/rdkit_time.py")
			cmd.Stdin = bytes.NewReader(smiles.Bytes())
			out, err := cmd.Output()
			if err != nil {
				b.Fatalf("rdkit_time.py: %v", err)
			}
			fields := strings.Fields(string(out))
			rd, _ := strconv.ParseFloat(fields[0], 64)
			b.ReportMetric(gen, "generate-s")
			b.ReportMetric(rd, "rdkit-s")
			b.ReportMetric(rd/gen, "rdkit/generate")
			b.ReportMetric(float64(n), "structures")
		})
	}
}
