package molecule

import "testing"

func TestFragmentMatches(t *testing.T) {
	// Expected answers: common practice (functional groups present in
	// these textbook structures).
	tests := []struct {
		frag, target string
		want         bool
	}{
		{"C=O", "CC(=O)C", true},
		{"C=O", "CCO", false},
		{"[OH]", "CCO", true},
		{"[OH]", "COC", false},
		{"[CH3]", "CC", true},
		{"[CH3]", "C1CC1", false},
		{"c1ccccc1", "C1=CC=CC=C1C", true},
		{"c1ccccc1", "C1CCCCC1", false},
		{"C1CCCCC1", "c1ccccc1", false},
		{"C=C", "c1ccccc1", false},
		{"C=C", "C=CC", true},
		{"c1ccncc1", "Cc1ccncc1", true},
		{"c1ccncc1", "c1ccccc1", false},
		{"[nH]", "c1cc[nH]c1", true},
		{"C(=O)O", "CC(=O)OC", true},
		{"C(=O)[OH]", "CC(=O)OC", false},
		{"C(=O)[OH]", "CC(=O)O", true},
		{"OO", "COOC", true},
		{"OO", "COC", false},
		{"C#N", "CC#N", true},
		{"CC(C)(C)C", "CC(C)(C)CC", true},
		{"CC(C)(C)C", "CC(C)CC", false},
		{"cO", "Oc1ccccc1", true},
		{"CO", "Oc1ccccc1", false},
		{"c-c", "c1ccc(cc1)-c1ccccc1", true},
		{"c-c", "c1ccccc1", false},
		{"cc", "c1ccccc1", true},
		{"S(=O)(=O)", "CS(C)(=O)=O", true},
		{"Cl", "CCl", true},
		{"Br", "CCl", false},
	}
	for _, tc := range tests {
		f := MustParseFragment(tc.frag)
		if got := f.Matches(MustParseSMILES(tc.target)); got != tc.want {
			t.Errorf("ParseFragment(%q).Matches(%q) = %v, want %v", tc.frag, tc.target, got, tc.want)
		}
	}
	if got := MustParseFragment("CC").Count(MustParseSMILES("CC")); got != 2 {
		t.Errorf("CC in ethane: %d embeddings, want 2", got)
	}
	if _, err := ParseFragment("C.C"); err == nil {
		t.Errorf("ParseFragment(C.C): no error")
	}
}
