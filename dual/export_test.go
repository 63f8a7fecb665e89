package dual

import (
	"fmt"

	"lanecert/flow"
)

// SingleBoundsForTest exposes the lower bounds on single candidate lanes of
// an infeasible network (see setSolver.singleBounds): per candidate the
// bound and whether there is one; ok false when the priced network cannot
// be used.
func SingleBoundsForTest(n *flow.Network, cands []flow.Candidate, cut *flow.Cut) (bounds []flow.Wide, has []bool, ok bool, err error) {
	basis, unmet, cost, err := pricedBasis(n, cands)
	if err != nil || basis == nil {
		return nil, nil, false, err
	}
	sv := &setSolver{n: n, cands: cands, x: &Extension{}, basis: basis, unmet: unmet, base: cost}
	idx := make([]int, len(cands))
	for i := range idx {
		idx[i] = i
	}
	lb, err := sv.singleBounds(cut, idx)
	if err != nil {
		return nil, nil, false, err
	}
	bounds, has = make([]flow.Wide, len(cands)), make([]bool, len(cands))
	for i, b := range lb {
		bounds[i], has[i] = b.total, b.ok
	}
	return bounds, has, true, nil
}

// RangesHubsForTest is Ranges with up to max hubs (0: none): the pieces
// with the most neighbouring pieces, whatever their share.
func RangesHubsForTest(n *flow.Network, y []int64, p []int64, max int) (*Sensitivity, error) {
	return ranges(n, y, p, hubRule{max: int32(max), share: 1 << 30, minDegree: 0})
}

// LaneList exposes laneList (names of candidate lanes in messages).
var LaneList = laneList

// AvoidDistForTest compares, on the optimal plan y with potentials p,
// avoidDist from the kept searches of up to three source pieces (the one
// with the most neighbouring pieces, the last and the middle one) with
// allDist leaving out each piece in turn, in both directions. It returns
// the number of comparisons and a description of the first difference
// ("" when none).
func AvoidDistForTest(n *flow.Network, y []int64, p []int64) (int, string, error) {
	f, err := flow.CheckPlan(n, y)
	if err != nil {
		return 0, "", err
	}
	g := newGraph(n, y, f)
	if _, err := g.forest(); err != nil {
		return 0, "", err
	}
	r := newRanger(g, p)
	if err := r.buildEdges(); err != nil {
		return 0, "", err
	}
	srcs := append(r.hubPieces(hubRule{max: 1}, -1), int32(r.k-1), int32(r.k/2))
	compared := 0
	for _, src := range srcs {
		for _, reverse := range []bool{false, true} {
			t := r.hubTree(src, reverse)
			for skip := int32(-1); skip < int32(r.k); skip++ {
				if skip == src {
					continue
				}
				got := r.avoidDist(t, skip, nil)
				want := r.allDist(src, reverse, skip)
				for v := range want {
					if got[v] != want[v] {
						return compared, fmt.Sprintf("source %d, reverse %v, leaving out %d: piece %d at %d, want %d", src, reverse, skip, v, got[v], want[v]), nil
					}
				}
				compared++
			}
		}
	}
	return compared, "", nil
}
