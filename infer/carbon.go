package infer

import (
	"fmt"
	"slices"

	"shiftrank/isomers"
	"shiftrank/molecule"
)

// CarbonPeak is one observed 13C signal as Infer reads it.
type CarbonPeak struct {
	// Number is the 1-based position in the 13C list.
	Number int
	// Shift, ppm.
	Shift float64
	// Count is the number of carbons the signal stands for (the "(2C)" of
	// journal text; 1 when not given).
	Count int
	// H is the hydrogens on each of its carbons from DEPT or an edited
	// HSQC (0 for a quaternary carbon), or −1 when not given.
	H int
}

// 13C shift regions, ppm (Pretsch, Bühlmann, Badertscher, Structure
// Determination of Organic Compounds, 13C chart of shift ranges;
// Kalinowski, Berger, Braun, 13C NMR Spectroscopy; from memory):
// carbonyl, imine and other C=X carbons of acids, esters, amides,
// ketones and aldehydes 168–220 (ureas, carbamates and carbonates 150–160
// are left out of this count); only sp3 carbons below 62 (alkynes start
// near 65, acetal carbons near 90); aromatic and alkene carbons 100–165,
// of which 125–165 holds no sp3 and no nitrile carbon (nitriles 115–125).
const (
	carbonylMin    = 168.0
	sp3OnlyMax     = 62.0
	unsatOnlyMin   = 125.0
	unsatOnlyMax   = 165.0
	carbonConfDEPT = 0.97
	carbonConfC    = 0.93
)

// carbonInfo is what a 13C list says, once per Infer call.
type carbonInfo struct {
	peaks []CarbonPeak
	total int  // carbons the list accounts for
	full  bool // total equals the formula's carbon count
	// dept holds the number of carbons with 0..3 H when every signal has
	// its DEPT class and the list is full.
	dept    [4]int
	hasDEPT bool
	// quaternary carbons by region, when the list has DEPT classes:
	// C=X (≥ carbonylMin), unsaturated (unsatOnlyMin–unsatOnlyMax, or
	// between unsatOnlyMax and carbonylMin), sp3 (≤ sp3OnlyMax)
	qCarbonyl, qUnsat, qSP3 int
	// carbonyl counts carbons at ≥ carbonylMin whatever their H
	carbonyl int
}

func (a *analysis) readCarbon(cs []CarbonPeak) {
	if len(cs) == 0 {
		return
	}
	ci := &carbonInfo{peaks: cs, hasDEPT: true}
	var nums []int
	for _, p := range cs {
		n := max(p.Count, 1)
		ci.total += n
		if p.H < 0 || p.H > 3 {
			ci.hasDEPT = false
		} else {
			ci.dept[p.H] += n
		}
		if p.Shift >= carbonylMin {
			ci.carbonyl += n
		}
		if p.H == 0 {
			switch {
			case p.Shift >= carbonylMin:
				ci.qCarbonyl += n
			case p.Shift >= unsatOnlyMin:
				ci.qUnsat += n
			case p.Shift <= sp3OnlyMax:
				ci.qSP3 += n
			}
		}
		nums = append(nums, p.Number)
	}
	ci.full = ci.total == a.f.Count(molecule.C)
	if !ci.full {
		ci.hasDEPT = false
		a.notes = append(a.notes, fmt.Sprintf("the 13C list accounts for %d of the formula's %d carbons: its DEPT counts are not used as constraints", ci.total, a.f.Count(molecule.C)))
	}
	a.carbon = ci
	if ci.hasDEPT {
		a.constraint("carbon-hydrogens", "carbon hydrogen counts",
			fmt.Sprintf("DEPT classes of the 13C list: %d CH3, %d CH2, %d CH, %d C", ci.dept[3], ci.dept[2], ci.dept[1], ci.dept[0]), nil, carbonConfDEPT)
		a.constraint("quaternary-carbons", "quaternary carbons",
			fmt.Sprintf("of the carbons without hydrogen, %d lie at ≥ %.0f ppm (C=O, C=N), %d at %.0f–%.0f ppm (unsaturated) and %d at ≤ %.0f ppm (sp3)",
				ci.qCarbonyl, carbonylMin, ci.qUnsat, unsatOnlyMin, carbonylMin, ci.qSP3, sp3OnlyMax), nil, carbonConfDEPT)
	} else if ci.carbonyl > 0 {
		a.constraint("carbonyl-carbons", "carbonyl carbons",
			fmt.Sprintf("%d carbon(s) of the 13C list at ≥ %.0f ppm: C=O or C=N carbons (acids, esters, amides, ketones, aldehydes)", ci.carbonyl, carbonylMin), nil, carbonConfC)
	}
	_ = nums
}

// carbonFits reports whether a decomposition's carbon hydrogen counts
// agree with the DEPT classes (when given and switched on).
func (a *analysis) carbonFits(parts []part) bool {
	ci := a.carbon
	if ci == nil || !ci.hasDEPT || a.disabled["carbon-hydrogens"] {
		return true
	}
	var n [4]int
	used := 0
	for _, pt := range parts {
		if pt.el == molecule.C && pt.h >= 1 && pt.h <= 3 {
			n[pt.h] += pt.count
			used += pt.count
		}
	}
	n[0] = a.f.Count(molecule.C) - used
	return n == ci.dept
}

// carbonSlots divides the carbons without hydrogen into slots by their
// 13C shift: with DEPT classes exactly, else only the C=O/C=N carbons
// (the list's carbons at ≥ 168 ppm, less the aldehyde carbons read from
// the 1H list). It returns nil when the list says nothing about them.
func (a *analysis) carbonSlots(parts []part, c0 int, ids map[string]bool) []isomers.Slot {
	ci := a.carbon
	if ci == nil || c0 == 0 {
		return nil
	}
	cx := isomers.NeighbourRule{Elements: []molecule.Element{molecule.O, molecule.N, molecule.S}, Double: true, Min: 1, Max: isomers.Unbounded}
	var slots []isomers.Slot
	add := func(name string, n int, s isomers.Slot) {
		if n > 0 {
			s.Name, s.Count = name, n
			slots = append(slots, s)
		}
	}
	switch {
	case ci.hasDEPT && !a.disabled["quaternary-carbons"]:
		ids["quaternary-carbons"] = true
		add("C=O/C=N carbon (13C ≥ 168 ppm)", ci.qCarbonyl, isomers.Slot{Neighbours: []isomers.NeighbourRule{cx}})
		add("unsaturated carbon (13C 125–168 ppm)", ci.qUnsat, isomers.Slot{Bonds: isomers.Unsaturated})
		add("sp3 carbon (13C ≤ 62 ppm)", ci.qSP3, isomers.Slot{Bonds: isomers.SingleBonds})
	case !ci.hasDEPT && ci.carbonyl > 0 && !a.disabled["carbonyl-carbons"]:
		n := ci.carbonyl
		for _, pt := range parts {
			if pt.kind == kFormyl {
				n -= pt.count
			}
		}
		n = min(n, c0)
		if n > 0 {
			ids["carbonyl-carbons"] = true
			add("C=O/C=N carbon (13C ≥ 168 ppm)", n, isomers.Slot{Neighbours: []isomers.NeighbourRule{cx}})
		}
	}
	left := c0
	for _, s := range slots {
		left -= s.Count
	}
	if left < 0 {
		return nil
	}
	if left > 0 {
		slots = append(slots, isomers.Slot{Name: "other carbon without H", Count: left})
	}
	if len(slots) < 2 {
		return nil
	}
	slices.SortStableFunc(slots, func(x, y isomers.Slot) int { return y.Count - x.Count })
	return slots
}
