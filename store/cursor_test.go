package store

import (
	"errors"
	"testing"
	"time"
)

func TestCursorRoundTrip(t *testing.T) {
	tests := []struct {
		name string
		job  Job
	}{
		{"epoch", Job{ID: newJobID(), CreatedAt: time.Unix(0, 0).UTC()}},
		{"now", Job{ID: newJobID(), CreatedAt: now()}},
		{"before epoch", Job{ID: newJobID(), CreatedAt: time.Date(1969, 7, 20, 20, 17, 40, 123000, time.UTC)}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			c, ok, err := decodeCursor(encodeCursor(tc.job))
			if err != nil || !ok || c.id != tc.job.ID || !c.at.Equal(tc.job.CreatedAt) {
				t.Errorf("decodeCursor(encodeCursor(%v, %q)) = %v %q %v %v", tc.job.CreatedAt, tc.job.ID, c.at, c.id, ok, err)
			}
		})
	}
	if _, ok, err := decodeCursor(""); ok || err != nil {
		t.Errorf(`decodeCursor("") = %v, %v; want first page`, ok, err)
	}
	// A cursor must name a job ID: not "a.b", not one with a NUL.
	for _, id := range []string{"a.b", "z9", newJobID() + "\x00", "\x00"} {
		if _, _, err := decodeCursor(encodeCursor(Job{ID: id, CreatedAt: now()})); !errors.Is(err, ErrInvalid) {
			t.Errorf("decodeCursor of a cursor naming %q: %v, want ErrInvalid", id, err)
		}
	}
}

// FuzzDecodeCursor checks that any client-supplied cursor either decodes to
// a position that encodes back to an equivalent cursor, or fails with
// ErrInvalid; never a panic.
func FuzzDecodeCursor(f *testing.F) {
	for _, s := range []string{"", "MTIzNC5hYmM", "LTEuYQ", "!!!", "MTIzNA", "Ljk", "OTk5OTk5OTk5OTk5OTk5OTk5OTk5LmE"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		c, ok, err := decodeCursor(s)
		if err != nil {
			if !errors.Is(err, ErrInvalid) {
				t.Fatalf("decodeCursor(%q) error %v, want ErrInvalid", s, err)
			}
			return
		}
		if !ok {
			if s != "" {
				t.Fatalf("decodeCursor(%q) = first page", s)
			}
			return
		}
		again, ok, err := decodeCursor(encodeCursor(Job{ID: c.id, CreatedAt: c.at}))
		if err != nil || !ok || again.id != c.id || !again.at.Equal(c.at) {
			t.Fatalf("cursor %q: round trip %v %q -> %v %q (%v)", s, c.at, c.id, again.at, again.id, err)
		}
	})
}
