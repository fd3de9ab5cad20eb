package store_test

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"sync"
	"testing"
	"time"

	"shiftrank/store"
	"shiftrank/store/pgtest"
	"shiftrank/store/storetest"
)

// benchQueue measures the queue round trip of one job (create, claim,
// progress, finish with a result) with 4 concurrent workers, and reports
// jobs/s.
func benchQueue(b *testing.B, s storetest.Store) {
	ctx := context.Background()
	body := json.RawMessage(`{"formula":"C4H8O2","candidates":[{"rank":1,"smiles":"CCOC(C)=O"}]}`)
	start := time.Now()
	b.ResetTimer()
	for range b.N {
		if _, _, err := s.CreateJob(ctx, store.Job{Request: json.RawMessage(`{"formula":"C4H8O2"}`)}); err != nil {
			b.Fatal(err)
		}
	}
	var wg sync.WaitGroup
	for w := range 4 {
		worker := fmt.Sprintf("bench/%d", w)
		wg.Go(func() {
			for {
				j, err := s.ClaimJob(ctx, worker, time.Minute)
				if errors.Is(err, store.ErrNoJob) {
					return
				}
				if err != nil {
					b.Error(err)
					return
				}
				if err := s.UpdateProgress(ctx, j.ID, worker, store.Progress{Generated: 1, Scored: 1}); err != nil {
					b.Error(err)
				}
				if err := s.FinishJob(ctx, j.ID, worker, store.StatusSucceeded, "", &store.Result{IsomersTotal: 1, Body: body}); err != nil {
					b.Error(err)
				}
			}
		})
	}
	wg.Wait()
	b.ReportMetric(float64(b.N)/time.Since(start).Seconds(), "jobs/s")
}

func BenchmarkMemoryQueue(b *testing.B) {
	benchQueue(b, store.NewMemory())
}

func BenchmarkPostgresQueue(b *testing.B) {
	p, err := store.Open(context.Background(), pgtest.URL(b))
	if err != nil {
		b.Fatal(err)
	}
	defer p.Close()
	benchQueue(b, p)
}
