package isomers_test

import (
	"context"
	"fmt"

	"shiftrank/isomers"
	"shiftrank/molecule"
)

func ExampleCount() {
	f := molecule.MustParseFormula("C6H6")
	all, _ := isomers.Count(context.Background(), f, isomers.Options{Filter: isomers.NoFilter()})
	plausible, _ := isomers.Count(context.Background(), f, isomers.Options{Filter: isomers.DefaultFilter()})
	fmt.Println(all.Emitted, plausible.Emitted, plausible.Removed["no-small-ring-triple"])
	// Output: 217 28 27
}

func ExampleParseFilter() {
	f, err := isomers.ParseFilter("plausible,-no-hemiacetal")
	if err != nil {
		fmt.Println(err)
		return
	}
	g := molecule.MustParseSMILES("OC1CCCCO1") // tetrahydropyran-2-ol, a cyclic hemiacetal
	ok, _ := f.Allows(g)
	fmt.Println(ok)
	fmt.Println(isomers.DefaultFilter().Allows(g))
	_, err = isomers.ParseFilter("plausible,-no-such-rule")
	fmt.Println(err)
	// Output:
	// true
	// false no-hemiacetal
	// filter "plausible,-no-such-rule": unknown rule (see Rules) at position 10 ("-no-such-rule")
}
