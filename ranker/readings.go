package ranker

import "shiftrank/infer"

// inferPeaks converts the scored peaks for infer.
func (j *job) inferPeaks() []infer.Peak {
	out := make([]infer.Peak, 0, len(j.obs))
	for k, o := range j.obs {
		pk := infer.Peak{Number: j.scored[k] + 1, Shift: o.shift, Lo: o.lo, Hi: o.hi, H: o.h}
		pk.Pattern = infer.Pattern{Broad: o.mult.broad, Apparent: o.mult.apparent, J: o.j}
		switch o.mult.kind {
		case patFirstOrder:
			pk.Pattern.Kind = infer.FirstOrder
			for g := uint8(0); g < o.mult.ng; g++ {
				pk.Pattern.Lines = append(pk.Pattern.Lines, int(o.mult.groups[g]))
			}
		case patMultiplet:
			pk.Pattern.Kind = infer.Multiplet
		default:
			pk.Pattern.Kind = infer.Unreported
		}
		out = append(out, pk)
	}
	return out
}
