package dual

import (
	"fmt"

	"lanecert/flow"
)

// BidResult is what adding one candidate lane alone would do.
type BidResult struct {
	// BreakEven is the rate at or below which the lane would be used
	// (HasBreakEven false: at no rate). SavingPerUnit = BreakEven - rate
	// when positive.
	BreakEven     int64
	HasBreakEven  bool
	SavingPerUnit int64
	// Used reports whether the optimum with this lane added uses it; Flow is
	// its quantity there and Saving the total saving (cost scale, >= 0 unless
	// a positive minimum forces a dearer plan).
	Used   bool
	Flow   int64
	Saving flow.Wide
	// Feasible is false when a positive minimum on the lane makes the network
	// infeasible.
	Feasible bool
}

// BidSet is the best set of candidates taken together: the optimum with all
// of them added. Flows[i] is candidate i's quantity (0: not in the set).
type BidSet struct {
	Flows    []int64
	Saving   flow.Wide
	Feasible bool
}

// EvaluateBids prices candidate lanes against the optimal plan y of n
// (valid potentials p, cost cost): for each, its break-even rate (exact, as
// for LaneRange) and the exact saving if it alone were added, re-solved by
// the network simplex starting from y; then the best set of all of them.
// A candidate at or above its break-even rate, without a minimum, saves
// nothing and is not re-solved. Cost: one search per candidate for the
// break-even rate; for the candidates below it one solve warm-started from
// y that keeps its basis (flow.Basis), then per candidate a copy of the
// solver's state, the pivots the lane causes and one pass over the lanes;
// and one more for the set. Candidates with a minimum are each solved
// warm-started from y instead.
func EvaluateBids(n *flow.Network, y, p []int64, cost flow.Wide, cands []flow.Candidate) ([]BidResult, *BidSet, error) {
	pr, err := newPricer(n, y, p)
	if err != nil {
		return nil, nil, err
	}
	out := make([]BidResult, len(cands))
	ws := &warmSolver{n: n, y: y}
	for i, c := range cands {
		br := &out[i]
		be, ok, err := pr.breakEven(c.Tail, c.Head)
		if err != nil {
			return nil, nil, err
		}
		if ok {
			br.BreakEven, br.HasBreakEven = be, true
			if be > c.Rate {
				br.SavingPerUnit = be - c.Rate
			}
		}
		if c.Lower == 0 && (!ok || c.Rate >= be) {
			// At or above its break-even rate the lane cannot lower the
			// cost: the optimum stays y with nothing on it. No solve needed.
			br.Feasible = true
			continue
		}
		alone, err := ws.with([]flow.Candidate{c})
		if err != nil {
			return nil, nil, err
		}
		br.Feasible = alone.ok
		if br.Feasible {
			br.Flow = alone.flows[0]
			br.Used = br.Flow > 0
			if br.Saving, err = cost.Sub(alone.cost); err != nil {
				return nil, nil, fmt.Errorf("dual: saving %w", err)
			}
		}
	}
	set := &BidSet{Flows: make([]int64, len(cands))}
	all, err := ws.with(cands)
	if err != nil {
		return nil, nil, err
	}
	set.Feasible = all.ok
	if set.Feasible {
		copy(set.Flows, all.flows)
		if set.Saving, err = cost.Sub(all.cost); err != nil {
			return nil, nil, fmt.Errorf("dual: saving %w", err)
		}
	}
	return out, set, nil
}

// warmSolver re-solves n with lanes added: from a kept basis of n's optimum
// (found once, by a solve warm-started from y, when first needed) for lanes
// without minimums, else by a solve warm-started from y.
type warmSolver struct {
	n     *flow.Network
	y     []int64
	basis *flow.Basis
}

// withResult is the optimum of n with lanes added: its cost and the flows
// on the added lanes (ok false: no feasible plan).
type withResult struct {
	ok    bool
	cost  flow.Wide
	flows []int64
}

func (ws *warmSolver) with(cands []flow.Candidate) (withResult, error) {
	if !hasMinimum(cands) {
		if ws.basis == nil {
			sol, err := flow.Solve(ws.n, flow.SolveOptions{Start: ws.y, Keep: true})
			if err != nil {
				return withResult{}, err
			}
			if sol.Status != flow.Optimal {
				return withResult{}, fmt.Errorf("dual: the network has no optimum (%v)", sol.Status)
			}
			ws.basis = sol.Basis
		}
		add, err := ws.basis.Add(cands)
		if err != nil {
			return withResult{}, err
		}
		if add.Status != flow.Optimal {
			return withResult{}, fmt.Errorf("dual: with the bids added the cost falls without limit (a cycle of lanes without capacity)")
		}
		return withResult{ok: true, cost: add.Cost, flows: add.Extra}, nil
	}
	sol, err := solveWith(ws.n, ws.y, cands)
	if err != nil {
		return withResult{}, err
	}
	switch sol.Status {
	case flow.Unbounded:
		return withResult{}, fmt.Errorf("dual: with the bids added the cost falls without limit (a cycle of lanes without capacity)")
	case flow.Infeasible:
		return withResult{}, nil
	}
	return withResult{ok: true, cost: sol.Cost, flows: sol.Flow[ws.n.NumLanes():]}, nil
}

// pricer answers break-even questions about new lanes for an optimal plan.
type pricer struct{ r *ranger }

func newPricer(n *flow.Network, y, p []int64) (*pricer, error) {
	f, err := flow.CheckPlan(n, y)
	if err != nil {
		return nil, err
	}
	g := newGraph(n, y, f)
	if _, err := g.forest(); err != nil {
		return nil, err
	}
	r := newRanger(g, p)
	if err := r.buildEdges(); err != nil {
		return nil, err
	}
	return &pricer{r: r}, nil
}

// breakEven returns the rate at or below which a new lane from t to h would
// be used: minus the cost of the cheapest route from h back to t (ok false:
// there is none).
func (pr *pricer) breakEven(t, h flow.NodeID) (int64, bool, error) {
	r := pr.r
	g := r.g
	src, dst := g.comp[h], g.comp[t]
	d := int64(0)
	if src != dst {
		if err := r.search([]int32{src}, []int32{dst}, split{child: -1}, -1, false); err != nil {
			return 0, false, err
		}
		if r.dist[dst] == unreached {
			return 0, false, nil
		}
		d = r.dist[dst]
	}
	be, err := flow.SubChecked(r.p[h], r.p[t])
	if err == nil {
		be, err = flow.SubChecked(be, d)
	}
	if err != nil {
		return 0, false, fmt.Errorf("dual: break-even rate %w", err)
	}
	return be, true, nil
}

// solveWith solves n with the candidates added, starting from y (and 0 on
// the new lanes, when their minimums allow).
func solveWith(n *flow.Network, y []int64, cands []flow.Candidate) (*flow.Solution, error) {
	ext := n.WithLanes(cands)
	start := make([]int64, ext.NumLanes())
	copy(start, y)
	for _, c := range cands {
		if c.Lower > 0 {
			start = nil // not feasible as it stands: solve from scratch
			break
		}
	}
	return flow.Solve(ext, flow.SolveOptions{Start: start})
}
