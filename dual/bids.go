package dual

import (
	"fmt"
	"slices"

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

// BidSet is the best set of candidates taken together: the optimum with
// every candidate without a minimum added, and the cheapest choice of
// those with a minimum (which must carry it once added; see EvaluateBids).
// Flows[i] is candidate i's quantity (0: not in the set, or unused).
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
// warm-started from y instead, and the set is solved once per choice of
// them (bestBidSet).
func EvaluateBids(n *flow.Network, y, p []int64, cost flow.Wide, cands []flow.Candidate) ([]BidResult, *BidSet, error) {
	pr, err := newPricer(n, y, p)
	if err != nil {
		return nil, nil, err
	}
	out := make([]BidResult, len(cands))
	ws := &warmSolver{n: n, y: y}
	pairs := make([][2]flow.NodeID, len(cands))
	for i, c := range cands {
		pairs[i] = [2]flow.NodeID{c.Tail, c.Head}
	}
	bes, oks, err := pr.breakEvens(pairs)
	if err != nil {
		return nil, nil, err
	}
	for i, c := range cands {
		br := &out[i]
		be, ok := bes[i], oks[i]
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
	best, idx, err := bestBidSet(ws, cands)
	if err != nil {
		return nil, nil, err
	}
	set.Feasible = best.ok
	if set.Feasible {
		for j, k := range idx {
			set.Flows[k] = best.flows[j]
		}
		if set.Saving, err = cost.Sub(best.cost); err != nil {
			return nil, nil, fmt.Errorf("dual: saving %w", err)
		}
	}
	return out, set, nil
}

// bestBidSet returns the optimum of n with the best set of cands added and
// that set (indexes, increasing). A candidate without a minimum can always
// be added (it may carry nothing), so every one is; one with a minimum
// must carry it, so adding it is a choice: every choice of up to
// maxMinChoices of them is solved and the cheapest kept (ties: the first
// in binary order of the choices); with more, they are added one at a
// time, each time the one that lowers the cost most, while one does.
func bestBidSet(ws *warmSolver, cands []flow.Candidate) (withResult, []int, error) {
	withMin, base := byMinimum(cands)
	solve := func(extra []int) (withResult, []int, error) {
		idx := append(append([]int(nil), base...), extra...)
		slices.Sort(idx)
		sub := make([]flow.Candidate, len(idx))
		for j, k := range idx {
			sub[j] = cands[k]
		}
		res, err := ws.with(sub)
		// (The flows may share the solver's memory: copied.)
		res.flows = append([]int64(nil), res.flows...)
		return res, idx, err
	}
	better := func(a, b withResult) bool { return a.ok && (!b.ok || a.cost.Cmp(b.cost) < 0) }
	best, bestIdx, err := solve(nil)
	if err != nil || len(withMin) == 0 {
		return best, bestIdx, err
	}
	if len(withMin) <= maxMinChoices {
		for mask := 1; mask < 1<<len(withMin); mask++ {
			var extra []int
			for j, k := range withMin {
				if mask&(1<<j) != 0 {
					extra = append(extra, k)
				}
			}
			res, idx, err := solve(extra)
			if err != nil {
				return withResult{}, nil, err
			}
			if better(res, best) {
				best, bestIdx = res, idx
			}
		}
		return best, bestIdx, nil
	}
	var chosen []int
	in := make([]bool, len(cands))
	for {
		var step withResult
		var stepIdx []int
		pick := -1
		for _, k := range withMin {
			if in[k] {
				continue
			}
			res, idx, err := solve(append(append([]int(nil), chosen...), k))
			if err != nil {
				return withResult{}, nil, err
			}
			if better(res, best) && (pick < 0 || better(res, step)) {
				step, stepIdx, pick = res, idx, k
			}
		}
		if pick < 0 {
			return best, bestIdx, nil
		}
		best, bestIdx = step, stepIdx
		chosen, in[pick] = append(chosen, pick), true
	}
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
			return withResult{}, fmt.Errorf("dual: with %s added the cost falls without limit (a cycle of lanes without capacity)", laneList(ws.n, "bid", cands))
		}
		return withResult{ok: true, cost: add.Cost, flows: add.Extra}, nil
	}
	sol, err := solveWith(ws.n, ws.y, cands)
	if err != nil {
		return withResult{}, err
	}
	switch sol.Status {
	case flow.Unbounded:
		return withResult{}, fmt.Errorf("dual: with %s added the cost falls without limit (a cycle of lanes without capacity)", laneList(ws.n, "bid", cands))
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

// breakEvens returns, for each pair (tail, head), the rate at or below
// which a new lane from tail to head would be used: minus the cost of the
// cheapest route from head back to tail (ok false: there is none). One
// search per distinct source piece (the head's) towards all its targets,
// through the best-connected piece as a bound when there are many sources
// (as for the ranges of unused lanes).
func (pr *pricer) breakEvens(pairs [][2]flow.NodeID) ([]int64, []bool, error) {
	r := pr.r
	g := r.g
	be, ok := make([]int64, len(pairs)), make([]bool, len(pairs))
	// Pairs by source piece, sources in order of first appearance.
	slot := make([]int32, r.k)
	for i := range slot {
		slot[i] = -1
	}
	var order []int32
	for _, pq := range pairs {
		src, dst := g.comp[pq[1]], g.comp[pq[0]]
		if src != dst && slot[src] < 0 {
			slot[src] = int32(len(order))
			order = append(order, src)
		}
	}
	start := make([]int32, len(order)+1)
	for _, pq := range pairs {
		if src, dst := g.comp[pq[1]], g.comp[pq[0]]; src != dst {
			start[slot[src]+1]++
		}
	}
	for i := range order {
		start[i+1] += start[i]
	}
	idx := make([]int32, start[len(order)])
	fill := append([]int32(nil), start[:len(order)]...)
	for i, pq := range pairs {
		if src, dst := g.comp[pq[1]], g.comp[pq[0]]; src != dst {
			idx[fill[slot[src]]] = int32(i)
			fill[slot[src]]++
		}
	}
	set := func(i int, d int64) error {
		t, h := pairs[i][0], pairs[i][1]
		v, err := flow.SubChecked(r.p[h], r.p[t])
		if err == nil {
			v, err = flow.SubChecked(v, d)
		}
		if err != nil {
			return fmt.Errorf("dual: break-even rate %w", err)
		}
		be[i], ok[i] = v, true
		return nil
	}
	for i, pq := range pairs {
		if g.comp[pq[1]] == g.comp[pq[0]] {
			if err := set(i, 0); err != nil {
				return nil, nil, err
			}
		}
	}
	var hub *hubDist
	if len(order) >= minHubSources {
		hub = r.newHub()
	}
	var targets []int32
	for si, src := range order {
		targets = targets[:0]
		for _, i := range idx[start[si]:start[si+1]] {
			targets = append(targets, g.comp[pairs[i][0]])
		}
		if hub != nil {
			r.hubSearch(hub, src, targets)
		} else {
			r.search([]int32{src}, targets, split{child: -1}, -1, false)
		}
		for _, i := range idx[start[si]:start[si+1]] {
			if d := r.dist[g.comp[pairs[i][0]]]; d != unreached {
				if err := set(int(i), d); err != nil {
					return nil, nil, err
				}
			}
		}
	}
	return be, ok, nil
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
