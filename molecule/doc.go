// Package molecule provides the chemistry data model shared by every other
// shiftrank package: molecular formulas (parsing, Hill order, ring-plus-
// double-bond equivalents), molecular graphs of heavy atoms with implicit
// hydrogen counts and bond orders 1 to 3, SMILES reading and writing
// (OpenSMILES organic subset, bracket atoms, branches, ring closures,
// aromatic input kekulised), exact canonical labelling by
// individualisation-refinement with automorphism orbits, Hückel aromaticity
// perception, and substructure matching.
//
// The package is pure: it performs no I/O and holds no global mutable state.
package molecule
