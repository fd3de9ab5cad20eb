package ranker

import (
	"shiftrank/infer"
	"shiftrank/spectrum"
)

// inferPeaks converts the scored peaks for infer.
func (j *job) inferPeaks() []infer.Peak {
	out := make([]infer.Peak, 0, len(j.obs))
	for k, o := range j.obs {
		pk := infer.Peak{Number: j.scored[k] + 1, Shift: o.shift, Lo: o.lo, Hi: o.hi, H: o.h}
		m := o.mult
		pk.Pattern = infer.Pattern{Broad: m.Broad(), Apparent: m.Apparent(), J: o.j}
		switch {
		case m.IsFirstOrder():
			pk.Pattern.Kind = infer.FirstOrder
			for g := 0; g < m.NumFactors(); g++ {
				pk.Pattern.Lines = append(pk.Pattern.Lines, m.Factor(g))
			}
		case m.IsMultiplet():
			pk.Pattern.Kind = infer.Multiplet
		default:
			pk.Pattern.Kind = infer.Unreported
		}
		out = append(out, pk)
	}
	return out
}

// inferCarbon converts the 13C list for infer.
func (j *job) inferCarbon() []infer.CarbonPeak {
	var out []infer.CarbonPeak
	for i, p := range j.req.Carbon.Peaks {
		h := -1
		switch p.DEPT {
		case spectrum.CH3:
			h = 3
		case spectrum.CH2:
			h = 2
		case spectrum.CH:
			h = 1
		case spectrum.Cq:
			h = 0
		}
		out = append(out, infer.CarbonPeak{Number: i + 1, Shift: p.Shift, Count: max(p.Count, 1), H: h})
	}
	return out
}
