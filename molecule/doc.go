// Package molecule provides the chemistry data model shared by every other
// shiftrank package: molecular formulas (parsing, Hill order, ring-plus-
// double-bond equivalents), molecular graphs of heavy atoms with implicit
// hydrogen counts and bond orders 1 to 3, SMILES reading and writing
// (OpenSMILES organic subset, bracket atoms, branches, ring closures,
// aromatic input kekulised), exact canonical labelling by
// individualisation-refinement with automorphism orbits, Hückel aromaticity
// perception, rings, and substructure matching.
//
// # Formulas
//
// ParseFormula reads "C4H8O2" or "H8C4O2" into a Formula; Formula.String
// writes Hill order and Formula.DBE gives the ring-plus-double-bond
// equivalents. Bad input gets a *FormulaError with the token and position.
//
// # Graphs and SMILES
//
// A Graph holds heavy atoms (Element, HCount, Charge) and bonds of order
// Single, Double or Triple; graphs passed between packages are kekulised.
// ParseSMILES reads one molecule (kekulising lowercase aromatic input) and
// reports bad input as *SMILESError; Graph.SMILES writes a Kekulé string in
// atom order.
//
// # Canonical forms and symmetry
//
// Canonicalize returns Labels (a canonical numbering), Orbits
// (symmetry-equivalent atoms) and Key (equal exactly for isomorphic
// graphs). It is exact: colour refinement to an equitable partition, then
// a search that individualises the atoms of a cell in turn and keeps the
// lexicographically smallest leaf certificate; automorphisms found when two
// leaves agree prune the search and generate the orbits. CanonicalSMILES
// writes the canonical numbering as SMILES. A Canonicalizer reuses memory
// across calls (one per goroutine).
//
// # Aromaticity
//
// AromaticBonds applies Hückel's rule (4n+2 π electrons) to every simple
// cycle of sp2-like ring atoms that is a ring of the molecule or the
// perimeter of fused rings (not the envelope around an sp3 bridge), with
// per-atom electron counts that do not depend on the Kekulé structure, so
// the Kekulé structures of one aromatic compound share one Key and one
// CanonicalSMILES, while 4n systems (cyclooctatetraene) keep their
// bond-shift isomers apart. Only the bonds of aromatic cycles are
// aromatic: a bond across a perimeter (azulene's fusion bond) keeps its
// order. A ring carbon
// with an exocyclic double bond (2-pyridone, quinones) makes its ring
// non-aromatic: such rings have one Kekulé structure anyway. See
// aromatic.go for the full model.
//
// # Rings and fragments
//
// Rings gives the smallest set of smallest rings and the smallest ring
// through each atom and bond. ParseFragment reads a SMILES substructure
// query (SMARTS meanings for its symbols) and Fragment.Matches tests it
// against a graph.
//
// The package is pure: it performs no I/O and holds no global mutable state.
package molecule
