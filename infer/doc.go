// Package infer reads an observed 1H peak list the way a chemist does
// before drawing any structure, and turns the readings into constraints
// for the isomer generator.
//
// From the shifts, integrals, multiplicities and coupling constants it
// infers, each with a name, a one-line reason citing the peaks it rests on
// and a confidence:
//
//   - hydrogen groups: how many CH3, CH2 and CH carbons and how many
//     exchangeable O–H and N–H the molecule has, with the alternatives
//     where the integrals are ambiguous (a 2H signal may be one CH2 or two
//     equivalent CH; two 1H signals may be the two hydrogens of one CH2);
//   - the hybridisation of each hydrogen-bearing carbon from its shift
//     region (aromatic and alkene C–H, aldehyde H, sp3 C–H);
//   - fragments: monosubstituted and para-disubstituted benzene rings,
//     vinyl groups, 1,2-disubstituted alkenes (coupled pairs with a large
//     J), tert-butyl groups, aldehyde and carboxylic-acid hydrogens;
//   - neighbourhoods: by the n+1 rule a resolved multiplet counts the
//     hydrogens on the neighbouring atoms (a singlet CHn has none), and by
//     additive α-increments (Shoolery's rule and its tables) a shift
//     bounds what the carbon's neighbours can be (4.1 ppm for a CH2 needs
//     an oxygen or nitrogen, or two unsaturated neighbours).
//
// Each reading is a complete division of the formula's heavy atoms into
// classes (isomers.Spec): where the spectrum allows several, Infer returns
// them most plausible first, each in a strict form (every constraint) and
// a relaxed form (hydrogen groups, hybridisation and shift windows only),
// so that a search can widen step by step. The shift and coupling ranges
// are handbook values (named in tables.go), never values taken from test
// data.
//
// The package is pure computation: no I/O.
package infer
