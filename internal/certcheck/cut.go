package certcheck

import (
	"errors"
	"fmt"
	"math/big"

	"lanecert/flow"
)

// Sentinel errors of Cut; test with errors.Is.
var (
	// ErrRegion: the region is not a strictly increasing list of nodes of
	// the network (or names the hold node without excess supply).
	ErrRegion = errors.New("region is not a sorted list of distinct nodes")
	// ErrCutUnlimited: a lane without capacity enters the region, so
	// anything can reach it.
	ErrCutUnlimited = errors.New("a lane without capacity enters the region")
	// ErrCutDemand: the claimed net demand differs from the region's.
	ErrCutDemand = errors.New("claimed net demand differs from the region's")
	// ErrCutReach: the claimed reach differs from the region's.
	ErrCutReach = errors.New("claimed reach differs from the region's")
	// ErrCutShort: the claimed shortfall is not demand minus reach, or is
	// not positive.
	ErrCutShort = errors.New("claimed shortfall is not a positive demand minus reach")
)

// Cut checks a claimed proof of infeasibility: a region of nodes whose net
// demand exceeds what can reach it. From the definitions, in math/big:
//
//	demand = Σ over the region of -Supply[v]
//	reach  = Σ Upper of lanes from outside into the region
//	       - Σ Lower of lanes from the region to outside
//	short  = demand - reach, and short > 0
//
// A lane into the region without capacity (Upper == flow.NoLimit) makes
// the reach unlimited: no proof. Self-loops neither enter nor leave.
//
// Under excess supply (total supply S above total demand D) the region may
// also contain the hold node H of the package doc, numbered
// len(n.Nodes) (flow.HoldNode): H adds S - D to demand, and every origin v
// outside the region adds Supply[v] to reach (its hold lane v -> H, which
// has no minimum). Without excess supply that number is out of range.
//
// Why this proves infeasibility: in a feasible plan (with hold lanes under
// excess supply) the net inflow of the region equals its net demand, and
// the net inflow is at most the capacities into the region minus the
// minimums out of it, so demand <= reach.
//
// It returns nil or an error wrapping ErrShape, ErrRegion, ErrCutUnlimited,
// ErrCutDemand, ErrCutReach or ErrCutShort. Time O(|V|+|E|) big-integer
// operations.
func Cut(n *flow.Network, region []flow.NodeID, demand, reach, short int64) error {
	if err := checkShape(n); err != nil {
		return err
	}
	nv := len(n.Nodes)
	ex := excess(n)
	limit := nv // largest allowed node number + 1
	if ex.Sign() > 0 {
		limit = nv + 1
	}
	in := make([]bool, nv+1)
	for i, v := range region {
		if int(v) < 0 || int(v) >= limit {
			return fmt.Errorf("certcheck: cut: region node %d out of range: %w", v, ErrRegion)
		}
		if i > 0 && v <= region[i-1] {
			return fmt.Errorf("certcheck: cut: region not strictly increasing at position %d: %w", i+1, ErrRegion)
		}
		in[v] = true
	}
	hold := in[nv]

	d := new(big.Int)
	for v := 0; v < nv; v++ {
		if in[v] {
			d.Sub(d, bi(n.Supply[v]))
		}
	}
	r := new(big.Int)
	if hold {
		d.Add(d, ex)
		for v := 0; v < nv; v++ {
			if !in[v] && n.Supply[v] > 0 {
				r.Add(r, bi(n.Supply[v]))
			}
		}
	}
	for a := range n.Tail {
		tIn, hIn := in[n.Tail[a]], in[n.Head[a]]
		switch {
		case !tIn && hIn:
			if n.Upper[a] == flow.NoLimit {
				return fmt.Errorf("certcheck: cut: lane %s: %w", n.LaneName(flow.LaneID(a)), ErrCutUnlimited)
			}
			r.Add(r, bi(n.Upper[a]))
		case tIn && !hIn:
			r.Sub(r, bi(n.Lower[a]))
		}
	}
	if d.Cmp(bi(demand)) != 0 {
		return fmt.Errorf("certcheck: cut: demand %d, region's net demand %s: %w", demand, d, ErrCutDemand)
	}
	if r.Cmp(bi(reach)) != 0 {
		return fmt.Errorf("certcheck: cut: reach %d, region's reach %s: %w", reach, r, ErrCutReach)
	}
	gap := new(big.Int).Sub(d, r)
	if gap.Sign() <= 0 || gap.Cmp(bi(short)) != 0 {
		return fmt.Errorf("certcheck: cut: short %d, demand less reach %s: %w", short, gap, ErrCutShort)
	}
	return nil
}
