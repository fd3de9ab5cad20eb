// Package isomers generates every constitutional isomer of a molecular
// formula, exactly once, as a stream.
//
// A structure is a connected graph of the formula's heavy (non-hydrogen)
// atoms with bond orders 1 to 3, neutral atoms, and implicit hydrogens:
// each atom takes one of its element's valences (C 4, N 3, O 2, S 2/4/6,
// P 3/5, Si 4, B 3, halogens 1), its hydrogen count is that valence minus
// its bond-order sum, and the hydrogen counts add up to the formula's.
// Stereoisomers (E/Z, R/S) are not constitutional isomers and are not
// distinguished; the valence state of S and P is part of the constitution.
// Kekulé structures that differ only by shifting the double bonds of a
// Hückel (4n+2) aromatic system (molecule.AromaticBonds) are one compound
// and come out once.
//
// The search is isomorph-free: canonical augmentation by adding one atom
// at a time (McKay 1998, "Isomorph-free exhaustive generation",
// J. Algorithms 26:306–324), with the package's own exact canonical
// labelling of small coloured multigraphs in the inner loop. Nothing is
// stored per structure, so memory does not grow with the number of
// isomers. The search tree is split into subtrees handed to all cores;
// Generate releases them in a fixed order, GenerateConcurrent as they
// come, and Count only counts.
//
// A plausibility filter (Rules, Filter, DefaultFilter, ParseFilter)
// removes structures that a chemist would not propose for an isolated,
// stable unknown (small-ring alkynes, Bredt's-rule violations, peroxides,
// enols, hemiacetals, ...); each rule has a name, a written reason, and
// its removal count in Stats.Removed.
//
// The package is pure computation: no I/O, no global mutable state.
package isomers
