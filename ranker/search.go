package ranker

import (
	"fmt"
	"strings"

	"shiftrank/infer"
	"shiftrank/isomers"
)

// Search scopes and states (SearchReport.Scope, .Status, ReadingReport.State).
const (
	// ScopeAll: every plausible isomer of the formula was in the search.
	ScopeAll = "all isomers"
	// ScopeConstrained: the search ran inside the readings of the
	// spectrum (constraints inferred from the peak list).
	ScopeConstrained = "constrained"

	// StatusComplete: every isomer of the formula was scored.
	StatusComplete = "complete"
	// StatusCompleteWithin: every structure of every reading was scored;
	// structures outside the readings were not.
	StatusCompleteWithin = "complete within the constraints"
	// StatusStopped: a budget stopped the search before its end.
	StatusStopped = "stopped early"

	// The state of one reading.
	ReadingComplete = "searched completely"
	ReadingPartly   = "searched partly"
	ReadingSkipped  = "not searched"
	// ReadingNotNeeded: a relaxed reading left out because the strict
	// readings explained the spectrum well.
	ReadingNotNeeded = "not needed"
)

// DefaultMaxNodes is the default search budget in generator nodes (about
// 15–40 s of search on two cores; see isomers.Options.NodeLimit). Unlike
// the time budget it stops the search at the same place on any machine.
const DefaultMaxNodes = 30_000_000

// SearchReport says what was searched and how far.
type SearchReport struct {
	// Scope is ScopeAll or ScopeConstrained; Status one of StatusComplete,
	// StatusCompleteWithin, StatusStopped.
	Scope  string `json:"scope"`
	Status string `json:"status"`
	// Summary is the first line of the result, in words.
	Summary string `json:"summary"`
	// StopReason says what stopped an incomplete search: the work budget
	// (nodes), the candidate limit, or the time budget (a safety stop
	// whose point depends on the machine's load).
	StopReason string `json:"stop_reason,omitempty"`
	// Nodes is the generator work spent, NodeBudget the budget.
	Nodes      int64 `json:"nodes"`
	NodeBudget int64 `json:"node_budget"`
	// EstimatedStructures and EstimatedNodes are the size of the search
	// estimated before the run: of the strict readings' searches (the sum
	// of their ReadingReport.Estimate), or of the search over all isomers.
	// An estimate, not a count: see isomers.SizeEstimate.
	EstimatedStructures int64 `json:"estimated_structures,omitempty"`
	EstimatedNodes      int64 `json:"estimated_nodes,omitempty"`
	// Constraints are every constraint read from the spectrum (also the
	// ones switched off), Readings the readings in the order searched.
	Constraints []infer.Constraint `json:"constraints"`
	Readings    []ReadingReport    `json:"readings"`
	// Notes say why the spectrum did not constrain the search, when it
	// did not.
	Notes []string `json:"notes,omitempty"`
}

// ReadingReport is one reading of the spectrum and what its search did.
type ReadingReport struct {
	Name    string  `json:"name"`
	Weight  float64 `json:"weight"`
	Relaxed bool    `json:"relaxed"`
	// Fallback: the reading leaves out a fragment the others use (see
	// infer.Reading.Fallback); searched only when needed, like a relaxed
	// one.
	Fallback    bool     `json:"fallback,omitempty"`
	Constraints []string `json:"constraints"`
	State       string   `json:"state"`
	// Structures counts the new structures the reading's search found
	// (after the plausibility filter and fragment constraints; structures
	// already found by an earlier reading are not counted again).
	Structures int64 `json:"structures"`
	Nodes      int64 `json:"nodes"`
	// Estimate is the size of the reading's search estimated before it
	// ran (Knuth's method, see isomers.Estimate): structures and nodes,
	// with its relative standard error; nil for a reading not searched.
	Estimate *isomers.SizeEstimate `json:"estimate,omitempty"`
}

// summary writes the first line of a result.
func (s *SearchReport) summary(res *Result) string {
	var b strings.Builder
	switch s.Status {
	case StatusComplete:
		fmt.Fprintf(&b, "Complete search over all %d plausible isomers of %s", res.IsomersTotal, res.Formula)
	case StatusCompleteWithin:
		n, skipped := 0, 0
		for _, r := range s.Readings {
			switch r.State {
			case ReadingComplete:
				n++
			case ReadingNotNeeded:
				skipped++
			}
		}
		fmt.Fprintf(&b, "Complete within the constraints read from the spectrum: %d structures in %d reading(s) of %s; isomers outside these readings were not searched", res.Scored, n, res.Formula)
		if skipped > 0 {
			fmt.Fprintf(&b, " (%d wider reading(s), relaxed or without a fragment, were not needed: the others explain the spectrum)", skipped)
		}
	default:
		done, part := 0, 0
		for _, r := range s.Readings {
			switch r.State {
			case ReadingComplete:
				done++
			case ReadingPartly:
				part++
			}
		}
		if s.Scope == ScopeAll {
			fmt.Fprintf(&b, "Stopped early (%s): %d of about %d isomers of %s scored", s.StopReason, res.Scored, res.IsomersTotal, res.Formula)
		} else {
			fmt.Fprintf(&b, "Stopped early (%s): %d of %d readings of the spectrum searched completely, %d partly; %d structures scored", s.StopReason, done, len(s.Readings), part, res.Scored)
		}
	}
	b.WriteString(". Probabilities are over the structures scored.")
	return b.String()
}
