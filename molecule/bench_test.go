package molecule

import (
	"syscall"
	"testing"
	"time"
)

// cpuTime returns the process's user+system CPU time. Benchmarks report
// CPU ns/op besides wall-clock ns/op because the machine is shared: the
// CPU figure is what one core spends per operation.
func cpuTime() time.Duration {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return 0
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}

// loop runs f b.N times and reports cpu-ns/op.
func loop(b *testing.B, f func()) {
	b.ReportAllocs()
	start := cpuTime()
	n := 0
	for b.Loop() {
		f()
		n++
	}
	if n > 0 {
		b.ReportMetric(float64(cpuTime()-start)/float64(n), "cpu-ns/op")
	}
}

// benchMolecules are typical of what the isomer generator and predictor
// canonicalise: small acyclic, cyclic and aromatic molecules.
var benchMolecules = []struct{ name, smiles string }{
	{"ethanol", "CCO"},
	{"hexane", "CCCCCC"},
	{"2,2,4-trimethylpentane", "CC(C)CC(C)(C)C"},
	{"octan-1-ol", "CCCCCCCCO"},
	{"ethyl acetate", "CCOC(C)=O"},
	{"cyclohexane", "C1CCCCC1"},
	{"toluene", "Cc1ccccc1"},
	{"naphthalene", "c1ccc2ccccc2c1"},
	{"icosane", "CCCCCCCCCCCCCCCCCCCC"},
	{"neopentane", "CC(C)(C)C"},
	{"adamantane", "C1C2CC3CC1CC(C2)C3"},
	{"cubane", "C12C3C4C1C5C2C3C45"},
}

func BenchmarkCanonicalizerKey(b *testing.B) {
	for _, m := range benchMolecules {
		g := MustParseSMILES(m.smiles)
		b.Run(m.name, func(b *testing.B) {
			var c Canonicalizer
			loop(b, func() { _ = c.Key(g) })
		})
	}
}

func BenchmarkCanonicalizerAppendKey(b *testing.B) {
	for _, m := range benchMolecules {
		g := MustParseSMILES(m.smiles)
		b.Run(m.name, func(b *testing.B) {
			var c Canonicalizer
			var buf []byte
			loop(b, func() { buf = c.AppendKey(buf[:0], g) })
		})
	}
}

func BenchmarkCanonicalize(b *testing.B) {
	for _, m := range benchMolecules {
		g := MustParseSMILES(m.smiles)
		b.Run(m.name, func(b *testing.B) {
			loop(b, func() { _ = Canonicalize(g) })
		})
	}
}

func BenchmarkCanonicalSMILES(b *testing.B) {
	for _, m := range benchMolecules {
		g := MustParseSMILES(m.smiles)
		b.Run(m.name, func(b *testing.B) {
			var c Canonicalizer
			loop(b, func() { _, _ = c.CanonicalSMILES(g) })
		})
	}
}

func BenchmarkParseSMILES(b *testing.B) {
	for _, m := range benchMolecules {
		b.Run(m.name, func(b *testing.B) {
			loop(b, func() { _, _ = ParseSMILES(m.smiles) })
		})
	}
}

func BenchmarkAromaticBonds(b *testing.B) {
	for _, m := range benchMolecules {
		g := MustParseSMILES(m.smiles)
		b.Run(m.name, func(b *testing.B) {
			var a aromaticity
			loop(b, func() { _ = a.perceive(g) })
		})
	}
}

func BenchmarkFragmentMatches(b *testing.B) {
	f := MustParseFragment("C(=O)[OH]")
	for _, m := range benchMolecules {
		g := MustParseSMILES(m.smiles)
		b.Run(m.name, func(b *testing.B) {
			loop(b, func() { _ = f.Matches(g) })
		})
	}
}
