package dual

import (
	"fmt"
	"sort"

	"lanecert/flow"
)

// Optimum compares a plan with the cheapest plan for its network.
type Optimum struct {
	// Status is flow.Optimal, flow.Infeasible (no plan meets the demands)
	// or flow.Unbounded (a negative-cost cycle without capacity).
	Status flow.Status
	// Cost and Flow are an optimal plan and its cost (when Optimal). When
	// the given plan was feasible, the solver started from it, so Flow
	// differs from it only where cheaper routing needs it: the repair.
	Cost flow.Wide
	Flow []int64
	// Potential are the optimal plan's potentials (normalised as in the
	// package documentation).
	Potential []int64
	// Unique reports whether Flow is the only optimal plan.
	Unique bool
	// Shortfall is, when Infeasible, the least total of units that cannot
	// be delivered (quantity scale).
	Shortfall int64
	// Cycle is, when Unbounded, a negative-cost cycle of lanes without
	// capacity.
	Cycle []Step
	// WarmStarted reports whether the solver started from the given plan.
	WarmStarted bool
	Pivots      int64
}

// Change is one lane whose quantity a repair changes. CostChange is
// rate × (New - Old) (cost scale).
type Change struct {
	Lane       flow.LaneID
	Old, New   int64
	CostChange flow.Wide
}

// Progress holds callbacks for a long solve (either may be nil): Cost
// with the number of pivots and the current plan's cost once the flows
// meet every supply and demand, Placing with the number of pivots and the
// quantity not yet placed before that (see flow.SolveOptions).
type Progress struct {
	Cost    func(pivots int64, cost flow.Wide)
	Placing func(pivots int64, unplaced int64)
}

// Optimize solves the network with the primal network simplex of package
// flow, starting from the plan x when x is feasible (x may be nil), and
// checks the result's certificate. progress, if not nil, is called now and
// then. Cost: one solve plus O(|V|+|E|).
func Optimize(n *flow.Network, x []int64, progress *Progress) (*Optimum, error) {
	opt := flow.SolveOptions{Start: x}
	if progress != nil {
		opt.Progress, opt.Placing = progress.Cost, progress.Placing
	}
	sol, err := flow.Solve(n, opt)
	if err != nil {
		return nil, err
	}
	o := &Optimum{Status: sol.Status, WarmStarted: sol.WarmStarted, Pivots: sol.Pivots, Shortfall: sol.Shortfall}
	switch sol.Status {
	case flow.Unbounded:
		for _, s := range sol.Cycle {
			o.Cycle = append(o.Cycle, Step{Lane: s.Lane, Origin: -1, Forward: s.Forward})
		}
		return o, nil
	case flow.Infeasible:
		return o, nil
	}
	// Check the solver's plan with the auditor rather than trusting it.
	a, err := Check(n, sol.Flow)
	if err != nil {
		return nil, err
	}
	if a.Verdict != Optimal {
		return nil, fmt.Errorf("%w: the solver's plan audits as %v", ErrInternal, a.Verdict)
	}
	o.Cost, o.Flow, o.Potential = a.Cost, sol.Flow, a.Potential
	if o.Unique, err = Unique(n, sol.Flow, a.Potential); err != nil {
		return nil, err
	}
	return o, nil
}

// Gap returns plan cost minus the optimal cost (cost scale).
func (o *Optimum) Gap(planCost flow.Wide) (flow.Wide, error) {
	g, err := planCost.Sub(o.Cost)
	if err != nil {
		return flow.Wide{}, fmt.Errorf("dual: gap %w", err)
	}
	return g, nil
}

// Changes lists the lanes where Flow differs from x, the largest saving
// (most negative cost change) first, then by lane. O(|E| log |E|).
func (o *Optimum) Changes(n *flow.Network, x []int64) ([]Change, error) {
	var out []Change
	for e, y := range o.Flow {
		if y == x[e] {
			continue
		}
		d, err := flow.SubChecked(y, x[e])
		if err != nil {
			return nil, fmt.Errorf("dual: change of lane %s %w", n.LaneName(flow.LaneID(e)), err)
		}
		out = append(out, Change{Lane: flow.LaneID(e), Old: x[e], New: y, CostChange: flow.MulWide(n.Rate[e], d)})
	}
	sort.SliceStable(out, func(i, j int) bool {
		if c := out[i].CostChange.Cmp(out[j].CostChange); c != 0 {
			return c < 0
		}
		return out[i].Lane < out[j].Lane
	})
	return out, nil
}

// Unique reports whether y is the only optimal plan, given valid potentials
// p for it. Every optimal plan satisfies complementary slackness with p, so
// another one exists exactly when some non-zero circulation moves only along
// residual lanes of reduced cost 0: a cycle among lanes strictly between
// their bounds, or a directed cycle of lanes at a bound with reduced cost 0
// between the pieces those lanes form. O(|V|+|E|).
func Unique(n *flow.Network, y []int64, p []int64) (bool, error) {
	f, err := flow.CheckPlan(n, y)
	if err != nil {
		return false, err
	}
	g := newGraph(n, y, f)
	if _, err := g.forest(); err != nil {
		return false, err
	}
	if g.freeCycles > 0 {
		return false, nil
	}
	pot := func(v int32) int64 {
		if v == g.hold {
			return 0
		}
		return p[v]
	}
	// Directed rules between pieces: residual moves of reduced cost 0.
	k := g.pieces
	indeg := make([]int32, k)
	type edge struct{ from, to int32 }
	var edges []edge
	for e, na := 0, g.numArcs(); e < na; e++ {
		lo, hi, x, rate := g.arc(e)
		if lo == hi || (lo < x && x < hi) {
			continue
		}
		r, err := flow.AddChecked(rate, pot(g.tail(e)))
		if err == nil {
			r, err = flow.SubChecked(r, pot(g.head(e)))
		}
		if err != nil {
			return false, fmt.Errorf("dual: reduced cost %w", err)
		}
		if r != 0 {
			continue
		}
		t, h := g.comp[g.tail(e)], g.comp[g.head(e)]
		if x != lo { // at capacity: the move is backward
			t, h = h, t
		}
		if t == h {
			return false, nil
		}
		edges = append(edges, edge{t, h})
		indeg[h]++
	}
	// Kahn's algorithm: the rules are acyclic iff every piece is removed.
	start := make([]int32, k+1)
	for _, e := range edges {
		start[e.from+1]++
	}
	for i := 0; i < k; i++ {
		start[i+1] += start[i]
	}
	out := make([]int32, len(edges))
	pos := append([]int32(nil), start[:k]...)
	for _, e := range edges {
		out[pos[e.from]] = e.to
		pos[e.from]++
	}
	queue := make([]int32, 0, k)
	for c := 0; c < k; c++ {
		if indeg[c] == 0 {
			queue = append(queue, int32(c))
		}
	}
	for i := 0; i < len(queue); i++ {
		for _, w := range out[start[queue[i]]:start[queue[i]+1]] {
			if indeg[w]--; indeg[w] == 0 {
				queue = append(queue, w)
			}
		}
	}
	return len(queue) == k, nil
}
