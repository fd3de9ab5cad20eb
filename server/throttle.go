package server

import (
	"log/slog"
	"sync"
	"time"
)

// logThrottle logs each kind of repeated warning (a refused request, a
// failing poll) at most once per interval, with the number of the same
// warnings it left out since the last line. A throttled client or an
// outage would otherwise log one line per request.
type logThrottle struct {
	every time.Duration
	now   func() time.Time

	mu    sync.Mutex
	kinds map[string]*throttled
}

type throttled struct {
	last       time.Time
	suppressed int
}

// maxThrottleKinds bounds the kinds remembered; beyond it the oldest
// forgotten ones are dropped (a kind names a reason and, for per-key
// limits, the key, so it grows with the keys in use).
const maxThrottleKinds = 10_000

func newLogThrottle(every time.Duration, now func() time.Time) *logThrottle {
	return &logThrottle{every: every, now: now, kinds: make(map[string]*throttled)}
}

// warn logs msg with args at WARN unless a warning of the same kind was
// logged less than the interval ago; then it only counts it. The count of
// left-out warnings goes with the next line as "suppressed".
func (lt *logThrottle) warn(log *slog.Logger, kind, msg string, args ...any) {
	t := lt.now()
	lt.mu.Lock()
	k, ok := lt.kinds[kind]
	if ok && t.Sub(k.last) < lt.every {
		k.suppressed++
		lt.mu.Unlock()
		return
	}
	if !ok {
		if len(lt.kinds) >= maxThrottleKinds {
			lt.forgetLocked(t)
		}
		k = &throttled{}
		lt.kinds[kind] = k
	}
	suppressed := k.suppressed
	k.last, k.suppressed = t, 0
	lt.mu.Unlock()
	if suppressed > 0 {
		args = append(args, "suppressed", suppressed)
	}
	log.Warn(msg, args...)
}

// forgetLocked drops the kinds last logged an interval or more ago (their
// left-out count is lost with them). Callers hold lt.mu.
func (lt *logThrottle) forgetLocked(t time.Time) {
	for kind, k := range lt.kinds {
		if t.Sub(k.last) >= lt.every {
			delete(lt.kinds, kind)
		}
	}
}
