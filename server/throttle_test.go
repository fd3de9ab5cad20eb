package server

import (
	"bytes"
	"log/slog"
	"strings"
	"testing"
	"time"

	"github.com/stretchr/testify/assert"
)

func TestLogThrottle(t *testing.T) {
	var buf bytes.Buffer
	log := slog.New(slog.NewTextHandler(&buf, nil))
	now := time.Date(2026, 12, 1, 9, 0, 0, 0, time.UTC)
	lt := newLogThrottle(time.Minute, func() time.Time { return now })
	for range 100 {
		lt.warn(log, "sync-share:k1", "refused", "key", "k1")
	}
	lt.warn(log, "sync-share:k2", "refused", "key", "k2")
	assert.Equal(t, 2, strings.Count(buf.String(), "msg=refused"), "one line per kind within the interval:\n%s", buf.String())
	now = now.Add(59 * time.Second)
	lt.warn(log, "sync-share:k1", "refused", "key", "k1")
	assert.Equal(t, 2, strings.Count(buf.String(), "msg=refused"))
	now = now.Add(time.Second)
	lt.warn(log, "sync-share:k1", "refused", "key", "k1")
	assert.Equal(t, 3, strings.Count(buf.String(), "msg=refused"))
	assert.Contains(t, buf.String(), "key=k1 suppressed=100", "the next line counts the ones left out")
}
