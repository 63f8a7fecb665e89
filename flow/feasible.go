package flow

import "fmt"

// ViolationKind says which rule of feasibility a plan breaks.
type ViolationKind int

const (
	// BelowMinimum: a lane carries less than its minimum (or a negative quantity).
	BelowMinimum ViolationKind = iota
	// AboveCapacity: a lane carries more than its capacity.
	AboveCapacity
	// Unbalanced: a node's outflow minus inflow differs from its supply, or
	// for an origin allowed to keep excess supply, lies outside [0, supply].
	Unbalanced
	// ShortSupply: total demand exceeds total supply, so no plan is feasible.
	ShortSupply
)

func (k ViolationKind) String() string {
	switch k {
	case BelowMinimum:
		return "below-minimum"
	case AboveCapacity:
		return "above-capacity"
	case Unbalanced:
		return "unbalanced"
	case ShortSupply:
		return "short-supply"
	}
	return fmt.Sprintf("ViolationKind(%d)", int(k))
}

// Violation is one broken rule. For a lane, Lane >= 0 and Node == -1; for a
// node, Node >= 0 and Lane == -1; for ShortSupply both are -1. The allowed
// range is [Min, Max] (Max == NoLimit: no upper limit) and Actual is the
// plan's value: a lane's quantity, a node's outflow minus inflow, or for
// ShortSupply the total supply (Min = Max = total demand).
type Violation struct {
	Kind     ViolationKind
	Lane     LaneID
	Node     NodeID
	Min, Max int64
	Actual   int64
}

// Feasibility is the exact feasibility check of a plan.
type Feasibility struct {
	// NetOut[v] is outflow minus inflow at node v.
	NetOut []int64
	// Held[v] is the supply origin v keeps (Supply[v] - NetOut[v]) when total
	// supply exceeds total demand; nil otherwise.
	Held []int64
	// TotalSupply and TotalDemand are both >= 0.
	TotalSupply, TotalDemand int64
	// Violations lists the broken rules: lanes in lane order, then nodes in
	// node order, then ShortSupply.
	Violations []Violation
}

// Excess returns total supply minus total demand, or 0 when demand is
// not below supply.
func (f *Feasibility) Excess() int64 {
	if f.TotalSupply > f.TotalDemand {
		return f.TotalSupply - f.TotalDemand
	}
	return 0
}

// Feasible reports whether the plan breaks no rule.
func (f *Feasibility) Feasible() bool { return len(f.Violations) == 0 }

// CheckPlan checks flow (scaled quantities, one per lane) against n exactly:
// every lane in [Lower, Upper] and not negative, every node balanced (see
// the package documentation for the excess-supply rule). It returns
// ErrOverflow when a node's outflow minus inflow does not fit 64 bits.
// O(|V|+|E|) time.
func CheckPlan(n *Network, flow []int64) (*Feasibility, error) {
	if len(flow) != n.NumLanes() {
		return nil, fmt.Errorf("flow: plan has %d quantities for %d lanes", len(flow), n.NumLanes())
	}
	f := &Feasibility{NetOut: make([]int64, n.NumNodes())}
	var err error
	if f.TotalSupply, f.TotalDemand, err = n.Totals(); err != nil {
		return nil, err
	}
	for a, x := range flow {
		lo := n.Lower[a]
		switch {
		case x < lo:
			f.Violations = append(f.Violations, Violation{Kind: BelowMinimum, Lane: LaneID(a), Node: -1, Min: lo, Max: n.Upper[a], Actual: x})
		case x > n.Upper[a]:
			f.Violations = append(f.Violations, Violation{Kind: AboveCapacity, Lane: LaneID(a), Node: -1, Min: lo, Max: n.Upper[a], Actual: x})
		}
		t, h := n.Tail[a], n.Head[a]
		if f.NetOut[t], err = AddChecked(f.NetOut[t], x); err != nil {
			return nil, fmt.Errorf("flow: outflow of node %q %w", n.Nodes[t], err)
		}
		if f.NetOut[h], err = SubChecked(f.NetOut[h], x); err != nil {
			return nil, fmt.Errorf("flow: inflow of node %q %w", n.Nodes[h], err)
		}
	}
	excess := f.TotalSupply > f.TotalDemand
	if excess {
		f.Held = make([]int64, n.NumNodes())
	}
	for v, b := range n.Supply {
		out := f.NetOut[v]
		lo, hi := b, b
		if excess && b > 0 {
			lo = 0
			f.Held[v] = b - out // both in [-MaxInt64, MaxInt64]; checked below
			if out < 0 && b-out < 0 {
				return nil, fmt.Errorf("flow: kept supply at node %q %w", n.Nodes[v], ErrOverflow)
			}
		}
		if out < lo || out > hi {
			f.Violations = append(f.Violations, Violation{Kind: Unbalanced, Lane: -1, Node: NodeID(v), Min: lo, Max: hi, Actual: out})
		}
	}
	if f.TotalDemand > f.TotalSupply {
		f.Violations = append(f.Violations, Violation{Kind: ShortSupply, Lane: -1, Node: -1, Min: f.TotalDemand, Max: f.TotalDemand, Actual: f.TotalSupply})
	}
	return f, nil
}
