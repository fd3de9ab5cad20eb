package e2e

import (
	"context"
	"io"
	"log/slog"
	"net/http"
	"testing"
	"time"

	"shiftrank/ranker"
	"shiftrank/server"
	"shiftrank/store"
	"shiftrank/web"
)

// newAPI starts the real service stack: the HTTP API with its worker pool,
// the in-memory store and the real ranker, with the page mounted as
// `shiftrank serve` mounts it (server.Config.Web). With requireKey the
// service admits only API keys; it returns one it created.
func newAPI(t *testing.T, requireKey bool) (http.Handler, string) {
	t.Helper()
	st := store.NewMemory()
	t.Cleanup(st.Close)
	key := ""
	if requireKey {
		k, _, err := st.CreateAPIKey(context.Background(), "e2e")
		if err != nil {
			t.Fatalf("create API key: %v", err)
		}
		key = k
	}
	srv := server.New(slog.New(slog.NewTextHandler(io.Discard, nil)), st, ranker.New(ranker.Options{}), server.Config{
		Web:            web.Handler(),
		AllowAnonymous: !requireKey,
		Workers:        1,
		// A long budget, so the job the test cancels is still running.
		TimeBudget:    10 * time.Minute,
		ProgressEvery: 200 * time.Millisecond,
		CancelPoll:    100 * time.Millisecond,
	})
	srv.Start()
	t.Cleanup(func() {
		ctx, cancel := context.WithTimeout(context.Background(), 20*time.Second)
		defer cancel()
		if err := srv.Shutdown(ctx); err != nil {
			t.Errorf("shut down the service: %v", err)
		}
	})
	return srv, key
}
