package predict

import (
	"syscall"
	"testing"
	"time"

	"shiftrank/molecule"
)

// benchSMILES are molecules of eight heavy atoms of the kinds the isomer
// generator emits for C6–C8 formulas with heteroatoms.
var benchSMILES = []string{
	"CCOC(=O)CCC", // ethyl butanoate
	"OCc1ccccc1",
	"CC(C)CC(=O)OC",
	"CN(C)C(=O)CCCl",
	"C=CC(O)CCC#N",
	"CCC1CCOC1=O",
	"O=Cc1ccncc1",
	"CC(C)(C)OCC=C",
}

// BenchmarkPredict measures the scoring path (Explain off, no
// simulation) on eight-heavy-atom molecules and reports predictions/s.
func BenchmarkPredict(b *testing.B) {
	var gs []*molecule.Graph
	for _, s := range benchSMILES {
		g := molecule.MustParseSMILES(s)
		if len(g.Atoms) != 8 {
			b.Fatalf("%s has %d heavy atoms, want 8", s, len(g.Atoms))
		}
		gs = append(gs, g)
	}
	p := New(Options{})
	b.ReportAllocs()
	cpu0 := cpuTime()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, err := p.Predict(gs[i%len(gs)]); err != nil {
			b.Fatal(err)
		}
	}
	b.StopTimer()
	b.ReportMetric(float64(b.N)/b.Elapsed().Seconds(), "predictions/s")
	// On a shared machine wall-clock rates understate what one core does;
	// report the rate per CPU-second of this process as well (run with
	// -cpu 1 so that it measures one core).
	if cpu := (cpuTime() - cpu0).Seconds(); cpu > 0 {
		b.ReportMetric(float64(b.N)/cpu, "predictions/cpu-s")
	}
}

// cpuTime returns the user+system CPU time of the process.
func cpuTime() time.Duration {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return 0
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}

// BenchmarkPredictExplain is the same with Explain on (the ranker's top K).
func BenchmarkPredictExplain(b *testing.B) {
	var gs []*molecule.Graph
	for _, s := range benchSMILES {
		gs = append(gs, molecule.MustParseSMILES(s))
	}
	p := New(Options{Explain: true})
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, err := p.Predict(gs[i%len(gs)]); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(b.N)/b.Elapsed().Seconds(), "predictions/s")
}
