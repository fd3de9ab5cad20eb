package store_test

import (
	"context"
	"encoding/json"
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
