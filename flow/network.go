package flow

import (
	"fmt"
	"math"
	"strconv"
)

// NodeID indexes a node of a Network (0-based).
type NodeID = int32

// LaneID indexes a lane of a Network (0-based, in input order).
type LaneID = int32

// NoLimit is the Upper bound of a lane without a capacity.
const NoLimit int64 = math.MaxInt64

// Network is a minimum-cost flow network stored as a struct of arrays:
// lane a runs from Tail[a] to Head[a] with bounds [Lower[a], Upper[a]] and
// unit rate Rate[a]. Quantities (Supply, Lower, Upper, plan flows) are
// integers scaled by 10^QtyPlaces, rates by 10^RatePlaces. Parallel lanes
// and self-loops are allowed. The memory is about 40 bytes per lane plus the
// names; Adjacency adds 16 bytes per lane when built.
type Network struct {
	// Nodes holds the node names; index = NodeID.
	Nodes []string
	// Supply is positive at an origin and negative at a destination.
	Supply []int64

	Tail, Head   []NodeID
	Lower, Upper []int64 // Upper[a] == NoLimit: no capacity
	Rate         []int64
	// LaneNames holds lane identifiers; nil means "the lane's number",
	// 1-based (see LaneName).
	LaneNames []string

	QtyPlaces, RatePlaces int

	// Extra holds columns of the lane table that lanecert does not use
	// (mode, carrier, notes), carried into reports. May be nil.
	Extra *ExtraColumns
	// NodeExtra holds extra columns of the node table. May be nil.
	NodeExtra *ExtraColumns

	// Notes say how the input was read where the readers decided something
	// themselves (a decimal comma detected); reports show them.
	Notes []string

	// Grid, when not nil, records that the network was read from a tableau
	// grid (ReadGrid): its origins and destinations in row and column
	// order, so a plan can be read and written in the same shape. Code that
	// adds or removes lanes or nodes must set it to nil.
	Grid *GridShape
}

// ExtraColumns holds carried text columns: Values[i][c] is the value of
// column Names[c] for row i.
type ExtraColumns struct {
	Names  []string
	Values [][]string
}

// NumNodes returns the number of nodes.
func (n *Network) NumNodes() int { return len(n.Nodes) }

// NumLanes returns the number of lanes.
func (n *Network) NumLanes() int { return len(n.Tail) }

// LaneName returns the identifier of lane a: its name from the input, or
// its 1-based number.
func (n *Network) LaneName(a LaneID) string {
	if n.LaneNames != nil {
		return n.LaneNames[a]
	}
	return strconv.Itoa(int(a) + 1)
}

// FormatQty formats a scaled quantity.
func (n *Network) FormatQty(v int64) string {
	if v == NoLimit {
		return "no limit"
	}
	return FormatScaled(v, n.QtyPlaces)
}

// FormatRate formats a scaled rate, potential or reduced cost.
func (n *Network) FormatRate(v int64) string { return FormatScaled(v, n.RatePlaces) }

// FormatCost formats a scaled cost (rate × quantity).
func (n *Network) FormatCost(w Wide) string { return w.Format(n.QtyPlaces + n.RatePlaces) }

// Validate checks the invariants the solvers and checkers rely on: array
// lengths agree, node indices are in range, 0 <= Lower <= Upper. It is O(|V|+|E|).
func (n *Network) Validate() error {
	m := len(n.Tail)
	if len(n.Head) != m || len(n.Lower) != m || len(n.Upper) != m || len(n.Rate) != m {
		return fmt.Errorf("flow: lane arrays differ in length")
	}
	if n.LaneNames != nil && len(n.LaneNames) != m {
		return fmt.Errorf("flow: %d lane names for %d lanes", len(n.LaneNames), m)
	}
	if len(n.Supply) != len(n.Nodes) {
		return fmt.Errorf("flow: %d supplies for %d nodes", len(n.Supply), len(n.Nodes))
	}
	nn := NodeID(len(n.Nodes))
	for a := 0; a < m; a++ {
		if n.Tail[a] < 0 || n.Tail[a] >= nn || n.Head[a] < 0 || n.Head[a] >= nn {
			return fmt.Errorf("flow: lane %s: node out of range", n.LaneName(LaneID(a)))
		}
		if n.Lower[a] < 0 {
			return fmt.Errorf("flow: lane %s: negative minimum", n.LaneName(LaneID(a)))
		}
		if n.Lower[a] > n.Upper[a] {
			return fmt.Errorf("flow: lane %s: minimum above capacity", n.LaneName(LaneID(a)))
		}
	}
	return nil
}

// Totals returns the total supply and the total demand (both >= 0), or
// ErrOverflow.
func (n *Network) Totals() (supply, demand int64, err error) {
	for _, b := range n.Supply {
		if b > 0 {
			supply, err = AddChecked(supply, b)
		} else {
			demand, err = AddChecked(demand, -b)
		}
		if err != nil {
			return 0, 0, fmt.Errorf("flow: total supply or demand %w", err)
		}
	}
	return supply, demand, nil
}

// RescaleQty multiplies every quantity by 10^k (k >= 0) and raises
// QtyPlaces by k. Flows given in plans must be rescaled alike.
func (n *Network) RescaleQty(k int) error {
	if k == 0 {
		return nil
	}
	for _, s := range [][]int64{n.Supply, n.Lower} {
		if err := scaleSlice(s, k); err != nil {
			return err
		}
	}
	for a, u := range n.Upper {
		if u == NoLimit {
			continue
		}
		v, err := ScaleUp(u, k)
		if err != nil {
			return fmt.Errorf("flow: capacity of lane %s with %d decimal places: %w", n.LaneName(LaneID(a)), n.QtyPlaces+k, err)
		}
		n.Upper[a] = v
	}
	n.QtyPlaces += k
	return nil
}

// RescaleRate multiplies every rate by 10^k and raises RatePlaces by k.
func (n *Network) RescaleRate(k int) error {
	if err := scaleSlice(n.Rate, k); err != nil {
		return err
	}
	n.RatePlaces += k
	return nil
}

func scaleSlice(s []int64, k int) error {
	for i, v := range s {
		w, err := ScaleUp(v, k)
		if err != nil {
			return fmt.Errorf("flow: value %s with %d more decimal places: %w", FormatScaled(v, 0), k, err)
		}
		s[i] = w
	}
	return nil
}

// Adjacency is a compressed adjacency of a network: the lanes leaving node v
// are OutLanes[OutStart[v]:OutStart[v+1]], the lanes entering it
// InLanes[InStart[v]:InStart[v+1]], each in increasing lane order.
type Adjacency struct {
	OutStart, InStart []int32
	OutLanes, InLanes []LaneID
}

// BuildAdjacency builds the compressed adjacency of n in O(|V|+|E|) time
// and 16 bytes per lane plus 8 per node.
func BuildAdjacency(n *Network) *Adjacency {
	nn, m := len(n.Nodes), len(n.Tail)
	adj := &Adjacency{
		OutStart: make([]int32, nn+1),
		InStart:  make([]int32, nn+1),
		OutLanes: make([]LaneID, m),
		InLanes:  make([]LaneID, m),
	}
	for a := 0; a < m; a++ {
		adj.OutStart[n.Tail[a]+1]++
		adj.InStart[n.Head[a]+1]++
	}
	for v := 0; v < nn; v++ {
		adj.OutStart[v+1] += adj.OutStart[v]
		adj.InStart[v+1] += adj.InStart[v]
	}
	op := append([]int32(nil), adj.OutStart[:nn]...)
	ip := append([]int32(nil), adj.InStart[:nn]...)
	for a := 0; a < m; a++ {
		t, h := n.Tail[a], n.Head[a]
		adj.OutLanes[op[t]] = LaneID(a)
		op[t]++
		adj.InLanes[ip[h]] = LaneID(a)
		ip[h]++
	}
	return adj
}
