package isomers

import (
	"context"
	"testing"

	"shiftrank/molecule"
)

func TestQuick(t *testing.T) {
	for _, s := range []string{"CH4", "C2H6", "C3H8", "C4H10", "C5H12", "C6H14", "C7H16", "C8H18", "C9H20", "C10H22", "C12H26", "C3H8O", "C4H10O", "C5H12O", "C4H8", "C5H10", "C3H4", "C4H6", "C6H6", "C7H8", "C8H10"} {
		f := molecule.MustParseFormula(s)
		st, err := Count(context.Background(), f, Options{})
		if err != nil {
			t.Fatal(err)
		}
		t.Logf("%s %d", s, st.Emitted)
	}
}
