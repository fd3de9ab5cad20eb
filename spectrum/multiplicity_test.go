package spectrum

import (
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

func TestParseMultiplicity(t *testing.T) {
	// Spellings in common use in experimental sections (common practice).
	cases := []struct {
		in       string
		code     string
		apparent bool
		ok       bool
	}{
		{"s", "s", false, true}, {"S", "s", false, true}, {"singlet", "s", false, true},
		{"d", "d", false, true}, {"t", "t", false, true}, {"q", "q", false, true},
		{"quint", "quint", false, true}, {"p", "quint", false, true}, {"quintet", "quint", false, true},
		{"sext", "sext", false, true}, {"sextet", "sext", false, true},
		{"sept", "sept", false, true}, {"hept", "sept", false, true}, {"septet", "sept", false, true},
		{"oct", "oct", false, true}, {"nonet", "non", false, true},
		{"m", "m", false, true}, {"multiplet", "m", false, true},
		{"dd", "dd", false, true}, {"ddd", "ddd", false, true}, {"dt", "dt", false, true},
		{"td", "td", false, true}, {"dq", "dq", false, true}, {"qd", "qd", false, true}, {"tt", "tt", false, true},
		{"dddd", "dddd", false, true}, {"ddddd", "ddddd", false, true},
		{"doublet of doublets", "dd", false, true}, {"doublet of triplets", "dt", false, true},
		{"triplet of doublets", "td", false, true}, {"doublet of doublet of doublets", "ddd", false, true},
		{"br s", "br s", false, true}, {"brs", "br s", false, true}, {"bs", "br s", false, true},
		{"br", "br s", false, true}, {"br.s", "br s", false, true}, {"br. s", "br s", false, true},
		{"broad singlet", "br s", false, true}, {"br d", "br d", false, true}, {"brd", "br d", false, true},
		{"br t", "br t", false, true}, {"br m", "br m", false, true},
		{"app t", "t", true, true}, {"app. d", "d", true, true}, {"apparent q", "q", true, true},
		{"pseudo-t", "t", true, true}, {"app dt", "dt", true, true}, {"app br s", "br s", true, true},
		{"ABq", "m", false, true}, {"AB q", "m", false, true}, {"AA'BB'", "m", false, true},
		{"", "", false, true}, {"  ", "", false, true},
		{"x", "", false, false}, {"dx", "", false, false}, {"dddddd", "", false, false}, {"ddddddd", "", false, false},
		{"doublet of", "", false, false}, {"of doublets", "", false, false}, {"b", "", false, false},
		{"doublet of doublet of doublet of doublet of doublet of doublets", "", false, false},
	}
	for _, c := range cases {
		t.Run(c.in, func(t *testing.T) {
			m, err := ParseMultiplicity(c.in)
			if !c.ok {
				var pe *PeakError
				require.ErrorAs(t, err, &pe, "ParseMultiplicity(%q)", c.in)
				assert.Equal(t, "multiplicity", pe.Field)
				assert.Equal(t, c.in, pe.Token)
				return
			}
			require.NoError(t, err, "ParseMultiplicity(%q)", c.in)
			assert.Equal(t, c.code, m.Code(), "ParseMultiplicity(%q).Code()", c.in)
			assert.Equal(t, c.apparent, m.Apparent(), "ParseMultiplicity(%q).Apparent()", c.in)
			// String reads back as the same value.
			again, err := ParseMultiplicity(m.String())
			require.NoError(t, err)
			assert.Equal(t, m, again, "ParseMultiplicity(%q) round trip through %q", c.in, m.String())
		})
	}
}

// TestMultiplicityFactors checks the n+1 reading of the codes: a signal
// coupled to n equivalent nuclei of spin ½ has n+1 lines, so "q" means 3
// partners and "dt" 1 + 2 (common practice).
func TestMultiplicityFactors(t *testing.T) {
	cases := []struct {
		code     string
		factors  []int
		partners int
	}{
		{"s", nil, 0}, {"d", []int{2}, 1}, {"t", []int{3}, 2}, {"q", []int{4}, 3},
		{"quint", []int{5}, 4}, {"sext", []int{6}, 5}, {"sept", []int{7}, 6}, {"oct", []int{8}, 7}, {"non", []int{9}, 8},
		{"dd", []int{2, 2}, 2}, {"dt", []int{2, 3}, 3}, {"td", []int{3, 2}, 3}, {"qd", []int{4, 2}, 4},
		{"ddd", []int{2, 2, 2}, 3}, {"m", nil, 0}, {"br s", nil, 0}, {"br t", []int{3}, 2},
	}
	for _, c := range cases {
		t.Run(c.code, func(t *testing.T) {
			m, err := ParseMultiplicity(c.code)
			require.NoError(t, err)
			var got []int
			for i := range m.NumFactors() {
				got = append(got, m.Factor(i))
			}
			assert.Equal(t, c.factors, got, "%q factors", c.code)
			assert.Equal(t, c.partners, m.Partners(), "%q partners (n+1 rule)", c.code)
			if c.code != "m" {
				assert.Equal(t, m.WithBroad(false).WithApparent(false), Split(c.factors...), "Split(%v)", c.factors)
			}
		})
	}
}

func TestMultiplicityValue(t *testing.T) {
	var none Multiplicity
	assert.False(t, none.IsReported())
	assert.Equal(t, "", none.String())
	assert.Equal(t, none, none.WithBroad(true), "the unreported multiplicity has no broad mark")
	assert.True(t, Singlet().IsSinglet())
	assert.True(t, Singlet().WithBroad(true).IsSinglet())
	assert.False(t, Multiplet().IsSinglet())
	assert.True(t, Multiplet().IsMultiplet())
	assert.True(t, Split(2, 3).SamePattern(Split(2, 3).WithBroad(true).WithApparent(true)))
	assert.False(t, Split(2, 3).SamePattern(Split(3, 2)), "dt and td differ")
	assert.Equal(t, "app br dt", Split(2, 3).WithBroad(true).WithApparent(true).String())
	assert.Panics(t, func() { Split(1) })
	assert.Panics(t, func() { Split(5, 2) }, "compound factors are d, t or q")
	assert.Panics(t, func() { Split(2, 2, 2, 2, 2, 2) })
}
