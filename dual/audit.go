package dual

import (
	"errors"
	"fmt"

	"lanecert/flow"
)

// Verdict is the outcome of an audit.
type Verdict int

const (
	// Optimal: the plan is feasible and no plan costs less.
	Optimal Verdict = iota
	// NotOptimal: the plan is feasible and an improving cycle exists.
	NotOptimal
	// PlanInfeasible: the plan breaks a bound or a balance.
	PlanInfeasible
)

func (v Verdict) String() string {
	switch v {
	case Optimal:
		return "optimal"
	case NotOptimal:
		return "not-optimal"
	case PlanInfeasible:
		return "plan-infeasible"
	}
	return fmt.Sprintf("Verdict(%d)", int(v))
}

// LaneState classifies a lane's quantity against its bounds.
type LaneState uint8

const (
	// Unused: flow = Lower = 0.
	Unused LaneState = iota
	// AtMinimum: flow = Lower > 0.
	AtMinimum
	// InUse: Lower < flow < Upper.
	InUse
	// AtCapacity: flow = Upper > Lower.
	AtCapacity
	// Fixed: Lower = Upper = flow > 0.
	Fixed
	// OutOfBounds: the flow breaks a bound (the plan is infeasible).
	OutOfBounds
)

func (s LaneState) String() string {
	switch s {
	case Unused:
		return "unused"
	case AtMinimum:
		return "at minimum"
	case InUse:
		return "in use"
	case AtCapacity:
		return "at capacity"
	case Fixed:
		return "fixed"
	case OutOfBounds:
		return "out of bounds"
	}
	return fmt.Sprintf("LaneState(%d)", int(s))
}

// StateOf classifies flow x on a lane with bounds [lo, hi].
func StateOf(x, lo, hi int64) LaneState {
	switch {
	case x < lo || x > hi:
		return OutOfBounds
	case lo == hi && x > 0:
		return Fixed
	case x == lo && lo == 0:
		return Unused
	case x == lo:
		return AtMinimum
	case x == hi:
		return AtCapacity
	}
	return InUse
}

// SlackOK reports whether reduced cost r satisfies complementary slackness
// for a lane in state s (see the package documentation).
func SlackOK(s LaneState, lo, hi, r int64) bool {
	if lo == hi {
		return true
	}
	switch s {
	case InUse:
		return r == 0
	case Unused, AtMinimum:
		return r >= 0
	case AtCapacity:
		return r <= 0
	}
	return false
}

// Step is one lane of a cycle. Forward means more flow on the lane, !Forward
// less. A hold step (Lane == -1) changes the supply kept at Origin: Forward
// keeps more there (the origin ships less).
type Step struct {
	Lane    flow.LaneID
	Origin  flow.NodeID
	Forward bool
}

// Cycle is an improving cycle of the plan's residual network: moving Units
// units around it (more on Forward steps, less on the others) keeps every
// bound and lowers the cost by SavingPerUnit per unit (rate scale), Total in
// all (cost scale). Units == flow.NoLimit means no bound stops the move: the
// cost falls without limit (Total is then 0 and meaningless).
type Cycle struct {
	Steps         []Step
	SavingPerUnit int64
	Units         int64
	Total         flow.Wide
}

// Unbounded reports whether the cycle can carry any number of units.
func (c *Cycle) Unbounded() bool { return c.Units == flow.NoLimit }

// Audit is the result of Check.
type Audit struct {
	Net         *flow.Network
	Flow        []int64
	Feasibility *flow.Feasibility
	Verdict     Verdict

	// Cost is the plan's cost Σ rate·flow (cost scale).
	Cost flow.Wide

	// Potential[v] is node v's potential (rate scale; see the package
	// documentation); nil when the plan is infeasible. For a plan that is not
	// optimal they are the potentials set by the lanes in use.
	Potential []int64
	// Reduced[a] is lane a's reduced cost under Potential; nil when the plan
	// is infeasible.
	Reduced []int64
	// State[a] classifies lane a.
	State []LaneState
	// Broken lists the lanes whose reduced cost breaks complementary
	// slackness under Potential, in lane order; BrokenHolds the origins whose
	// hold lane does.
	Broken      []flow.LaneID
	BrokenHolds []flow.NodeID

	// Dual is the dual objective of Potential; DualParts splits it into the
	// supply term, the minimum (lower bound) term and the capacity term
	// (hold lanes' capacity terms included). Set only when Optimal.
	Dual      flow.Wide
	DualParts DualParts

	// Cycles are improving cycles, best total saving first (at most
	// MaxCycles). Set only when NotOptimal.
	Cycles []Cycle

	// Pieces is the number of connected pieces formed by the lanes strictly
	// between their bounds (and hold lanes of origins keeping part of their
	// supply). Determined reports whether those lanes alone decided the
	// verdict (the linear-time path); otherwise shortest paths over the
	// residual network placed the pieces against each other.
	Pieces     int
	Determined bool
}

// DualParts splits a dual objective.
type DualParts struct {
	Supply, Minimum, Capacity flow.Wide
}

// MaxCycles bounds the number of cycles an audit reports.
const MaxCycles = 5

// maxCandidates bounds how many violating lanes are turned into cycles.
const maxCandidates = 64

// ErrInternal reports a certificate that failed its own check: a bug.
var ErrInternal = errors.New("dual: internal check failed")

// Check audits a plan: flow holds one scaled quantity per lane of n. It
// decides feasibility exactly, then optimality by complementary slackness on
// the plan's residual network, and returns the verdict with its
// certificate. Errors are only overflow (flow.ErrOverflow, wrapped) and
// malformed input.
//
// Time: O(|V|+|E|) when the lanes in use fix the potentials or no lane
// between two of their pieces breaks the sign rules; otherwise a
// Bellman-Ford pass over the k pieces costs O(k·|E|) at worst. Memory: about
// 40 bytes per lane and 40 per node beyond the network and plan.
func Check(n *flow.Network, x []int64) (*Audit, error) {
	if err := n.Validate(); err != nil {
		return nil, err
	}
	f, err := flow.CheckPlan(n, x)
	if err != nil {
		return nil, err
	}
	a := &Audit{Net: n, Flow: x, Feasibility: f}
	if a.Cost, err = Cost(n, x); err != nil {
		return nil, err
	}
	a.State = make([]LaneState, n.NumLanes())
	for e := range a.State {
		a.State[e] = StateOf(x[e], n.Lower[e], n.Upper[e])
	}
	if !f.Feasible() {
		a.Verdict = PlanInfeasible
		return a, nil
	}
	g := newGraph(n, x, f)
	if err := g.solve(a); err != nil {
		return nil, err
	}
	return a, nil
}

// Cost returns Σ rate·flow exactly (cost scale), or ErrOverflow.
func Cost(n *flow.Network, x []int64) (flow.Wide, error) {
	var c flow.Wide
	var err error
	for e, q := range x {
		if c, err = c.AddProduct(n.Rate[e], q); err != nil {
			return flow.Wide{}, fmt.Errorf("dual: plan cost %w", err)
		}
	}
	return c, nil
}
