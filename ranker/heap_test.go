package ranker

import (
	"fmt"
	"math/rand/v2"
	"slices"
	"testing"
)

func TestTopKKeepsBestWithDeterministicTies(t *testing.T) {
	r := rand.New(rand.NewPCG(5, 6))
	type item struct {
		score float64
		name  string
	}
	var all []item
	for i := 0; i < 500; i++ {
		// Few distinct scores, so ties are common.
		all = append(all, item{float64(r.IntN(20)), fmt.Sprintf("c%03d", i)})
	}
	want := slices.Clone(all)
	slices.SortFunc(want, func(a, b item) int {
		if a.score != b.score {
			if a.score > b.score {
				return -1
			}
			return 1
		}
		return cmpStr(a.name, b.name)
	})
	key := func(it item) string { return it.name }
	id := func(it item) item { return it }
	for trial := 0; trial < 5; trial++ {
		r.Shuffle(len(all), func(i, j int) { all[i], all[j] = all[j], all[i] })
		// Two "workers" with their own heaps, merged.
		a, b := newTopK[item](7), newTopK[item](7)
		for i, it := range all {
			h := a
			if i%2 == 1 {
				h = b
			}
			h.offer(it.score, it, key, id)
		}
		a.merge(b)
		got := a.sorted()
		if len(got) != 7 {
			t.Fatalf("kept %d items, want 7", len(got))
		}
		for i := range got {
			if got[i].item != want[i] {
				t.Fatalf("trial %d: rank %d = %v, want %v", trial, i+1, got[i].item, want[i])
			}
		}
	}
}

func cmpStr(a, b string) int {
	switch {
	case a < b:
		return -1
	case a > b:
		return 1
	}
	return 0
}
