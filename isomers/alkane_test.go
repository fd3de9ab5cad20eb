package isomers

import (
	"context"
	"fmt"
	"testing"

	"shiftrank/molecule"
)

// a000602 is OEIS A000602, the number of alkanes CnH2n+2 (n-node trees
// with maximum degree 4), n = 1..20 (source: OEIS A000602).
var a000602 = []int64{1, 1, 1, 2, 3, 5, 9, 18, 35, 75, 159, 355, 802, 1858, 4347, 10359, 24894, 60523, 148284, 366319}

// alkaneCounts counts trees with maximum degree 4 by Pólya–Cayley
// counting, independently of the generator: r[i] is the number of rooted
// trees with i nodes in which every node has at most 3 children (OEIS
// A000598, alkyl groups), from r = 1 + x·Z(S3; r); unrooted trees are
// counted by their centroid: a single centroid with up to 4 branches each
// smaller than n/2 (Z(S4) over the truncated series), plus, for even n,
// the unordered pairs of n/2-node rooted trees joined at a bicentroid
// edge (Jordan 1869, Cayley 1875; Pólya 1937).
func alkaneCounts(max int) []int64 {
	out, _ := treeCounts(max)
	return out
}

// treeCounts returns the alkane counts of alkaneCounts and the rooted
// series r (r[i]: alkyl groups with i carbons, OEIS A000598).
func treeCounts(max int) ([]int64, []int64) {
	r := make([]int64, max+1)
	r[0] = 1
	sub := func(a []int64, k, n int) int64 { // coefficient of x^n in a(x^k)
		if n%k != 0 {
			return 0
		}
		return a[n/k]
	}
	mul := func(a, b []int64, n int) []int64 {
		c := make([]int64, n+1)
		for i := 0; i <= n; i++ {
			for j := 0; i+j <= n; j++ {
				c[i+j] += a[i] * b[j]
			}
		}
		return c
	}
	scale := func(a []int64, k, n int) []int64 {
		c := make([]int64, n+1)
		for i := 0; i <= n; i++ {
			c[i] = sub(a, k, i)
		}
		return c
	}
	for n := 1; n <= max; n++ {
		// r[n] = [x^(n-1)] (r^3 + 3 r r(x^2) + 2 r(x^3)) / 6, using r[0..n-1]
		m := n - 1
		rr := r[:m+1]
		r2 := scale(rr, 2, m)
		r3 := scale(rr, 3, m)
		cube := mul(mul(rr, rr, m), rr, m)
		mixed := mul(rr, r2, m)
		r[n] = (cube[m] + 3*mixed[m] + 2*r3[m]) / 6
	}
	out := make([]int64, max+1)
	for n := 1; n <= max; n++ {
		m := n - 1
		b := make([]int64, m+1)
		for i := 0; i <= m; i++ {
			if 2*i < n {
				b[i] = r[i]
			}
		}
		b2, b3, b4 := scale(b, 2, m), scale(b, 3, m), scale(b, 4, m)
		bb := mul(b, b, m)
		z := mul(bb, bb, m)[m] + 6*mul(bb, b2, m)[m] + 3*mul(b2, b2, m)[m] + 8*mul(b, b3, m)[m] + 6*b4[m]
		total := z / 24
		if n%2 == 0 {
			h := r[n/2]
			total += h * (h + 1) / 2
		}
		out[n] = total
	}
	return out, r
}

// a000598 is OEIS A000598 (rooted trees with at most 3 children per node:
// alkyl groups CnH2n+1), n = 0..12 (source: OEIS A000598, from memory).
var a000598 = []int64{1, 1, 1, 2, 4, 8, 17, 39, 89, 211, 507, 1238, 3057}

func TestAlkaneCountsPolya(t *testing.T) {
	_, r := treeCounts(12)
	for n, want := range a000598 {
		if r[n] != want {
			t.Errorf("Pólya count of C%d alkyl groups = %d, want %d (source: OEIS A000598)", n, r[n], want)
		}
	}
	got := alkaneCounts(20)
	for n := 1; n <= 20; n++ {
		if got[n] != a000602[n-1] {
			t.Errorf("Pólya count of C%d alkanes = %d, want %d (source: OEIS A000602)", n, got[n], a000602[n-1])
		}
	}
}

func TestAlkanes(t *testing.T) {
	max := 20
	if testing.Short() {
		max = 16
	}
	polya := alkaneCounts(max)
	for n := 1; n <= max; n++ {
		f := molecule.MustParseFormula(fmt.Sprintf("C%dH%d", n, 2*n+2))
		st, err := Count(context.Background(), f, Options{Filter: NoFilter()})
		if err != nil {
			t.Fatal(err)
		}
		if st.Emitted != a000602[n-1] || st.Emitted != polya[n] || !st.Complete {
			t.Errorf("Count(%s) = %d (complete %v), want %d (source: OEIS A000602; Pólya count %d)", f, st.Emitted, st.Complete, a000602[n-1], polya[n])
		}
	}
}

// TestAlcoholsEthersAmines counts acyclic heteroatom families with the
// same Pólya series, independently of the generator: CnH2n+2O holds
// r[n] alcohols (an OH on an alkyl group) and one ether per unordered pair
// of alkyl groups with i + j = n carbons; CnH2n+3N holds r[n+1] amines
// (nitrogen with three slots, each H or an alkyl group, counts like a
// carbon root with up to three branches). r is OEIS A000598.
func TestAlcoholsEthersAmines(t *testing.T) {
	max := 11
	if testing.Short() {
		max = 8
	}
	_, r := treeCounts(max + 1)
	for n := 1; n <= max; n++ {
		ethers := int64(0)
		for i := 1; 2*i <= n; i++ {
			j := n - i
			if i == j {
				ethers += r[i] * (r[i] + 1) / 2
			} else {
				ethers += r[i] * r[j]
			}
		}
		f := molecule.MustParseFormula(fmt.Sprintf("C%dH%dO", n, 2*n+2))
		var alcohols, total int64
		_, err := Generate(context.Background(), f, Options{Filter: NoFilter()}, func(g *molecule.Graph) bool {
			total++
			for _, a := range g.Atoms {
				if a.Element == molecule.O && a.HCount == 1 {
					alcohols++
				}
			}
			return true
		})
		if err != nil {
			t.Fatal(err)
		}
		if alcohols != r[n] || total != r[n]+ethers {
			t.Errorf("%s: %d alcohols of %d, want %d of %d (Pólya count; OEIS A000598)", f, alcohols, total, r[n], r[n]+ethers)
		}
		fa := molecule.MustParseFormula(fmt.Sprintf("C%dH%dN", n, 2*n+3))
		st, err := Count(context.Background(), fa, Options{Filter: NoFilter()})
		if err != nil {
			t.Fatal(err)
		}
		if st.Emitted != r[n+1] {
			t.Errorf("%s: %d amines, want %d (Pólya count; OEIS A000598)", fa, st.Emitted, r[n+1])
		}
	}
}
