// Package pgtest gives tests a PostgreSQL database of their own: a fresh
// schema in the database named by TEST_DATABASE_URL, dropped when the test
// ends.
//
// When TEST_DATABASE_URL is unset or the database cannot be reached, tests
// fail if CI=true and are skipped otherwise, with a message saying how to run
// them. Typical use:
//
//	url := pgtest.URL(t)            // fresh schema, search_path set in url
//	st, err := store.Open(ctx, url) // or hand url to child processes as DATABASE_URL
package pgtest

import (
	"context"
	"crypto/rand"
	"encoding/hex"
	"net/url"
	"os"
	"strings"
	"testing"
	"time"

	"github.com/jackc/pgx/v5"

	"shiftrank/store"
)

// EnvURL names the environment variable holding the test database URL, e.g.
// postgres://postgres@127.0.0.1:5432/test?sslmode=disable.
const EnvURL = "TEST_DATABASE_URL"

// BaseURL returns TEST_DATABASE_URL after checking that the database answers.
// If it is unset or unreachable the test fails when CI=true and is skipped
// otherwise.
func BaseURL(t testing.TB) string {
	t.Helper()
	base := os.Getenv(EnvURL)
	if base == "" {
		unavailable(t, EnvURL+" is not set")
	}
	ctx, cancel := context.WithTimeout(context.Background(), 5*time.Second)
	defer cancel()
	conn, err := pgx.Connect(ctx, base)
	if err == nil {
		err = conn.Ping(ctx)
		conn.Close(ctx)
	}
	if err != nil {
		unavailable(t, "cannot reach "+EnvURL+": "+err.Error())
	}
	return base
}

func unavailable(t testing.TB, why string) {
	t.Helper()
	const how = "run PostgreSQL tests with " + EnvURL +
		"=postgres://postgres@127.0.0.1:5432/test?sslmode=disable go test ./..."
	if os.Getenv("CI") == "true" {
		t.Fatalf("PostgreSQL required in CI: %s (%s)", why, how)
	}
	t.Skipf("skipping PostgreSQL test: %s; %s", why, how)
}

// Schema creates a fresh, empty schema with a random name in the test
// database, registers its removal with t.Cleanup, and returns the base URL
// and the schema name (for store.OpenSchema).
func Schema(t testing.TB) (base, schema string) {
	t.Helper()
	base = BaseURL(t)
	b := make([]byte, 8)
	_, _ = rand.Read(b)
	schema = "test_" + hex.EncodeToString(b)
	ctx := context.Background()
	if err := store.CreateSchema(ctx, base, schema); err != nil {
		t.Fatalf("pgtest: %v", err)
	}
	t.Cleanup(func() {
		if err := store.DropSchema(context.Background(), base, schema); err != nil {
			t.Errorf("pgtest: %v", err)
		}
	})
	return base, schema
}

// URL creates a fresh schema like Schema and returns a connection URL whose
// search_path is that schema, so store.Open (or a child process given it as
// DATABASE_URL) works inside it. Processes given the same URL share the
// schema and so the queue.
func URL(t testing.TB) string {
	t.Helper()
	base, schema := Schema(t)
	return WithSearchPath(t, base, schema)
}

// WithSearchPath returns base with its search_path set to schema. base may be
// a postgres:// URL or a key=value connection string.
func WithSearchPath(t testing.TB, base, schema string) string {
	t.Helper()
	if !strings.HasPrefix(base, "postgres://") && !strings.HasPrefix(base, "postgresql://") {
		return base + " search_path=" + schema
	}
	u, err := url.Parse(base)
	if err != nil {
		t.Fatalf("pgtest: parse %s: %v", EnvURL, err)
	}
	q := u.Query()
	q.Set("search_path", schema)
	u.RawQuery = q.Encode()
	return u.String()
}
