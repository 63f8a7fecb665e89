package dual

import "lanecert/flow"

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
