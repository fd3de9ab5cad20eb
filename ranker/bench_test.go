package ranker

import (
	"context"
	"os"
	"runtime/metrics"
	"sync"
	"syscall"
	"testing"
	"time"
)

// Accuracy targets of the product (issue: top-1 ≥ 85 %, top-3 ≥ 95 %).
// minTop1 and minTop3 are what the current ranking reaches on
// testdata/accuracy.json less one compound; the test keeps it from
// regressing (a floor at the targets let four compounds slip outside the
// constrained search unnoticed: 97 % passed a test that 100 % had set).
const (
	targetTop1 = 0.85
	targetTop3 = 0.95
	minTop1    = 0.99
	minTop3    = 0.99
)

// minValidationTop1 is the validation set's top-1 (100 %, 28 compounds)
// less one compound.
const minValidationTop1 = 0.96

// TestAccuracy ranks every compound of the reference set (published CDCl3
// spectra; sources in the file) and checks how often the true structure
// comes first. It is an accuracy check against published data, not a
// timing test.
func TestAccuracy(t *testing.T) {
	rep := benchReferenceFile(t, "accuracy.json", 40)
	if rep.Top1 < minTop1 {
		t.Errorf("top-1 %.1f %% below %.1f %% (target %.0f %%)", 100*rep.Top1, 100*minTop1, 100*targetTop1)
	}
	if rep.Top3 < minTop3 {
		t.Errorf("top-3 %.1f %% below %.1f %% (target %.0f %%)", 100*rep.Top3, 100*minTop3, 100*targetTop3)
	}
}

// benchReferenceFile ranks every compound of testdata/name (skipped in
// -short mode), fails on a compound that could not be ranked or a set
// smaller than minCompounds, logs each miss and the summary, and returns
// the report.
func benchReferenceFile(t *testing.T, name string, minCompounds int) *BenchReport {
	t.Helper()
	if testing.Short() {
		t.Skipf("accuracy benchmark over testdata/%s skipped in -short mode; run go test -run %s ./ranker", name, t.Name())
	}
	b, err := os.ReadFile("../testdata/" + name)
	if err != nil {
		t.Fatal(err)
	}
	set, err := ParseReferenceSet(b)
	if err != nil {
		t.Fatal(err)
	}
	if len(set.Compounds) < minCompounds {
		t.Fatalf("testdata/%s has %d compounds, want at least %d", name, len(set.Compounds), minCompounds)
	}
	rep, err := New(Options{}).Bench(context.Background(), set, BenchOptions{TopK: 3, TimeBudget: 60 * time.Second}, nil)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range rep.Cases {
		if c.Error != "" {
			t.Errorf("%s: %s", c.Name, c.Error)
		}
		if c.Rank != 1 {
			t.Logf("miss: %s (%s) true %s at rank %d, first %s (p %.3f)", c.Name, c.Formula, c.SMILES, c.Rank, c.TopSMILES, c.TopProbability)
		}
	}
	t.Logf("%d compounds: top-1 %.1f %%, top-3 %.1f %%, MRR %.3f; mean top probability %.3f vs top-1 rate %.3f (%.1f s)",
		rep.N, 100*rep.Top1, 100*rep.Top3, rep.MRR, rep.MeanTopProbability, rep.Top1, rep.Seconds)
	return rep
}

// peakHeap samples the live heap every few milliseconds until stop is
// called, and returns the largest value seen, bytes.
func peakHeap() (stop func() uint64) {
	s := []metrics.Sample{{Name: "/memory/classes/heap/objects:bytes"}}
	var mu sync.Mutex
	var peak uint64
	done := make(chan struct{})
	var wg sync.WaitGroup
	wg.Add(1)
	go func() {
		defer wg.Done()
		t := time.NewTicker(5 * time.Millisecond)
		defer t.Stop()
		for {
			metrics.Read(s)
			mu.Lock()
			peak = max(peak, s[0].Value.Uint64())
			mu.Unlock()
			select {
			case <-done:
				return
			case <-t.C:
			}
		}
	}()
	return func() uint64 {
		close(done)
		wg.Wait()
		return peak
	}
}

// cpuSeconds returns the user+system CPU time of the process so far.
func cpuSeconds() float64 {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return 0
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano()).Seconds()
}

// BenchmarkRank measures end-to-end throughput: isomers generated,
// predicted and scored per second (all cores), and the peak live heap,
// which must stay flat in the number of candidates.
func BenchmarkRank(b *testing.B) {
	cases := []struct{ formula, peaks string }{
		{"C4H8O2", ethylAcetate},
		// Ethyl butanoate-like list (invented pattern for throughput only).
		{"C6H12O2", "4.12 (q, J = 7.1 Hz, 2H), 2.28 (t, J = 7.4 Hz, 2H), 1.65 (sext, J = 7.4 Hz, 2H), 1.25 (t, J = 7.1 Hz, 3H), 0.95 (t, J = 7.4 Hz, 3H)"},
		// p-Xylene (Pretsch handbook; from memory).
		{"C8H10", "7.05 (s, 4H), 2.31 (s, 6H)"},
	}
	for _, tc := range cases {
		b.Run(tc.formula, func(b *testing.B) {
			pl := mustPeaks(b, tc.peaks)
			r := New(Options{})
			req := Request{Formula: tc.formula, Peaks: pl, TopK: 10, TimeBudget: time.Hour}
			var scored int64
			cpu0 := cpuSeconds()
			stop := peakHeap()
			b.ReportAllocs()
			b.ResetTimer()
			for b.Loop() {
				res, err := r.Rank(context.Background(), req, nil)
				if err != nil {
					b.Fatal(err)
				}
				scored += res.Scored
			}
			b.StopTimer()
			peak := stop()
			cpu := cpuSeconds() - cpu0
			b.ReportMetric(float64(scored)/b.Elapsed().Seconds(), "candidates/s")
			// Per CPU-second of this process: the figure that does not
			// depend on what else the machine runs.
			if cpu > 0 {
				b.ReportMetric(float64(scored)/cpu, "candidates/cpu-s")
			}
			b.ReportMetric(float64(scored)/float64(b.N), "candidates/op")
			b.ReportMetric(float64(peak)/(1<<20), "peak-heap-MiB")
		})
	}
}

// TestValidationAccuracy ranks the validation set (testdata/validation.json:
// handbook CDCl3 spectra of compounds that are in neither the accuracy set
// nor the predictor's tables, added after the increments and the likelihood
// were fixed; sources in the file) and guards the product's top-1 target.
// Its first run gave 92.9 % top-1 and top-3: cyclohexanol and
// 1,1-diethoxyethane were missed because their diastereotopic CH2 pairs
// could not be split over two peaks; the fix for that brought both to rank
// 1, so the set has since informed one change. The top-3 figure is logged,
// not asserted.
func TestValidationAccuracy(t *testing.T) {
	rep := benchReferenceFile(t, "validation.json", 20)
	if rep.Top1 < minValidationTop1 {
		t.Errorf("validation top-1 %.1f %% below %.1f %% (target %.0f %%)", 100*rep.Top1, 100*minValidationTop1, 100*targetTop1)
	}
}
