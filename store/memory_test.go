package store_test

import (
	"context"
	"encoding/json"
	"fmt"
	"slices"
	"testing"
	"time"

	"shiftrank/store"
	"shiftrank/store/storetest"
)

func TestMemory(t *testing.T) {
	storetest.Run(t, func(t *testing.T) storetest.Store { return store.NewMemory() })
}

// testAttemptLimit checks WithMaxAttempts(1) and WithMaxAttempts(0) (no
// limit) on stores made by open.
func testAttemptLimit(t *testing.T, open func(t *testing.T, opts ...store.Option) storetest.Store) {
	ctx := context.Background()
	for _, tc := range []struct {
		name     string
		max      int
		wantNext bool // a second claim after expiry succeeds
	}{
		{"limit 1", 1, false},
		{"no limit", 0, true},
	} {
		t.Run(tc.name, func(t *testing.T) {
			s := open(t, store.WithMaxAttempts(tc.max))
			defer s.Close()
			j, _, err := s.CreateJob(ctx, store.Job{Request: json.RawMessage(`{"formula":"CH4"}`)})
			if err != nil {
				t.Fatal(err)
			}
			for attempt := 1; attempt <= store.DefaultMaxAttempts; attempt++ {
				if _, err := s.ClaimJob(ctx, "w1", 30*time.Millisecond); err != nil {
					t.Fatalf("claim %d: %v", attempt, err)
				}
				time.Sleep(80 * time.Millisecond)
				if !tc.wantNext {
					break
				}
			}
			_, err = s.ClaimJob(ctx, "w2", time.Minute)
			if got := err == nil; got != tc.wantNext {
				t.Errorf("WithMaxAttempts(%d): claim after expiry error = %v, want success %v", tc.max, err, tc.wantNext)
			}
			if got, _ := s.GetJob(ctx, "", j.ID); !tc.wantNext && got.Status != store.StatusFailed {
				t.Errorf("WithMaxAttempts(%d): status %s, want failed", tc.max, got.Status)
			}
		})
	}
}

func TestMemoryAttemptLimit(t *testing.T) {
	testAttemptLimit(t, func(t *testing.T, opts ...store.Option) storetest.Store { return store.NewMemory(opts...) })
}

func TestMemoryLimits(t *testing.T) {
	storetest.RunLimits(t, func(t *testing.T, opts ...store.Option) storetest.Store { return store.NewMemory(opts...) })
}

// TestMemoryMaxFinished: beyond WithMaxFinished the jobs that finished
// longest ago are forgotten, except those whose callback is unsettled,
// which go once it is settled.
func TestMemoryMaxFinished(t *testing.T) {
	ctx := context.Background()
	m := store.NewMemory(store.WithMaxFinished(3))
	var ids []string
	for i := range 6 {
		j := store.Job{Owner: "k1", Request: json.RawMessage(`{"formula":"CH4"}`), IdempotencyKey: fmt.Sprintf("nb-%d", i)}
		if i == 0 {
			j.CallbackURL = "https://eln.example.org/hook"
		}
		created, _, err := m.CreateJob(ctx, j)
		if err != nil {
			t.Fatal(err)
		}
		if _, err := m.ClaimJob(ctx, "w1", time.Minute); err != nil {
			t.Fatal(err)
		}
		if err := m.FinishJob(ctx, created.ID, "w1", store.StatusSucceeded, "", &store.Result{Body: json.RawMessage(`{}`)}); err != nil {
			t.Fatal(err)
		}
		ids = append(ids, created.ID)
	}
	kept := func() []string {
		jobs, _, err := m.ListJobs(ctx, "k1", 0, "")
		if err != nil {
			t.Fatal(err)
		}
		var out []string
		for _, j := range jobs {
			out = append(out, j.ID)
		}
		slices.Reverse(out)
		return out
	}
	// Job 0's callback is unsettled: it stays, and newer jobs go instead.
	if got, want := kept(), []string{ids[0], ids[4], ids[5]}; !slices.Equal(got, want) {
		t.Errorf("kept %v, want %v", got, want)
	}
	if err := m.MarkCallbackDone(ctx, ids[0]); err != nil {
		t.Fatal(err)
	}
	j, _, err := m.CreateJob(ctx, store.Job{Owner: "k1", Request: json.RawMessage(`{"formula":"CH4"}`)})
	if err != nil {
		t.Fatal(err)
	}
	if _, err := m.ClaimJob(ctx, "w1", time.Minute); err != nil {
		t.Fatal(err)
	}
	if err := m.FinishJob(ctx, j.ID, "w1", store.StatusFailed, "", nil); err != nil {
		t.Fatal(err)
	}
	if got, want := kept(), []string{ids[4], ids[5], j.ID}; !slices.Equal(got, want) {
		t.Errorf("after settling job 0's callback and finishing another, kept %v, want %v", got, want)
	}
	// A forgotten job's idempotency key can be used again.
	if j, created, err := m.CreateJob(ctx, store.Job{Owner: "k1", Request: json.RawMessage(`{"formula":"CH4"}`), IdempotencyKey: "nb-1"}); err != nil || !created || j.ID == ids[1] {
		t.Errorf("CreateJob with a forgotten job's idempotency key = %s, %v, %v; want a new job", j.ID, created, err)
	}
}
