package ranker

// topK keeps the k best items seen so far by score, in bounded memory
// (O(k) items, O(log k) per offer). Ties in score are broken by a key
// (the canonical SMILES): the smaller key ranks higher, so the kept set
// and its order do not depend on the order items arrive in. The key is
// asked for only when a tie has to be broken, because computing a
// canonical SMILES for every candidate would be wasteful.
//
// The zero value is not usable; use newTopK. Not safe for concurrent use:
// each worker keeps its own and the results are merged.
type topK[T any] struct {
	k     int
	items []ranked[T] // a min-heap: items[0] is the worst kept
}

// ranked is an item with its score and (lazily computed) tie-break key.
type ranked[T any] struct {
	score  float64
	key    string
	hasKey bool
	keyOf  func(T) string
	item   T
}

func (r *ranked[T]) getKey() string {
	if !r.hasKey {
		r.key, r.hasKey = r.keyOf(r.item), true
	}
	return r.key
}

func newTopK[T any](k int) *topK[T] {
	if k < 1 {
		k = 1
	}
	return &topK[T]{k: k, items: make([]ranked[T], 0, k)}
}

// worse reports whether a ranks below b.
func worse[T any](a, b *ranked[T]) bool {
	if a.score != b.score {
		return a.score < b.score
	}
	return a.getKey() > b.getKey()
}

// wouldKeep reports whether an item of this score could enter the set: it
// lets the caller skip copying items that cannot. An item tying the worst
// kept score may enter (the key decides).
func (h *topK[T]) wouldKeep(score float64) bool {
	return len(h.items) < h.k || score >= h.items[0].score
}

// offer considers item with score; keyOf gives its tie-break key and
// keep makes the copy that is stored (called only if the item is kept).
// It reports whether the item was kept.
func (h *topK[T]) offer(score float64, item T, keyOf func(T) string, keep func(T) T) bool {
	if !h.wouldKeep(score) {
		return false
	}
	r := ranked[T]{score: score, item: item, keyOf: keyOf}
	if len(h.items) == h.k {
		if !worse(&h.items[0], &r) {
			return false
		}
		r.item = keep(item)
		h.items[0] = r
		h.down(0)
		return true
	}
	r.item = keep(item)
	h.items = append(h.items, r)
	h.up(len(h.items) - 1)
	return true
}

func (h *topK[T]) up(i int) {
	for i > 0 {
		p := (i - 1) / 2
		if !worse(&h.items[i], &h.items[p]) {
			return
		}
		h.items[i], h.items[p] = h.items[p], h.items[i]
		i = p
	}
}

func (h *topK[T]) down(i int) {
	n := len(h.items)
	for {
		l := 2*i + 1
		if l >= n {
			return
		}
		m := l
		if r := l + 1; r < n && worse(&h.items[r], &h.items[l]) {
			m = r
		}
		if !worse(&h.items[m], &h.items[i]) {
			return
		}
		h.items[i], h.items[m] = h.items[m], h.items[i]
		i = m
	}
}

// merge offers every item of o to h.
func (h *topK[T]) merge(o *topK[T]) {
	for _, r := range o.items {
		r := r
		if !h.wouldKeep(r.score) {
			continue
		}
		if len(h.items) == h.k {
			if !worse(&h.items[0], &r) {
				continue
			}
			h.items[0] = r
			h.down(0)
			continue
		}
		h.items = append(h.items, r)
		h.up(len(h.items) - 1)
	}
}

// sorted returns the kept items, best first.
func (h *topK[T]) sorted() []ranked[T] {
	out := make([]ranked[T], len(h.items))
	copy(out, h.items)
	// Insertion sort: k is small.
	for i := 1; i < len(out); i++ {
		for j := i; j > 0 && worse(&out[j-1], &out[j]); j-- {
			out[j-1], out[j] = out[j], out[j-1]
		}
	}
	return out
}
