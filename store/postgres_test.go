package store_test

import (
	"context"
	"testing"
	"time"

	"shiftrank/store"
	"shiftrank/store/pgtest"
	"shiftrank/store/storetest"
)

// openPostgres opens a store in a fresh schema of TEST_DATABASE_URL.
func openPostgres(t *testing.T) *store.Postgres {
	t.Helper()
	url := pgtest.URL(t)
	ctx, cancel := context.WithTimeout(context.Background(), 30*time.Second)
	defer cancel()
	p, err := store.Open(ctx, url)
	if err != nil {
		t.Fatalf("Open: %v", err)
	}
	return p
}

func TestPostgres(t *testing.T) {
	pgtest.BaseURL(t) // skip (or fail in CI) once, not per subtest
	storetest.Run(t, func(t *testing.T) storetest.Store { return openPostgres(t) })
}
