package dual

import (
	"fmt"
	"sort"

	"lanecert/flow"
)

// Extension is the cheapest way found to add candidate lanes: to make an
// infeasible network feasible, or to lower the cost of a feasible one.
type Extension struct {
	// WasFeasible reports whether the network could meet its demands
	// without candidates; BaseCost is then its optimal cost.
	WasFeasible bool
	BaseCost    flow.Wide
	// Feasible reports whether the chosen lanes make a feasible plan.
	Feasible bool
	// Chosen are the candidates opened (indexes into the candidate list, in
	// order) and Flows their quantities in the best plan found; Plan is that
	// plan over the network's lanes followed by the chosen lanes.
	Chosen []int
	Flows  []int64
	Plan   []int64
	// Cost is the plan's cost including the fixed costs of opened lanes.
	Cost flow.Wide
	// Method says how the answer was found. Exact is true when it is
	// provably the best; otherwise Bound is a lower bound on the best total
	// (HasBound) and the answer is at most Cost - Bound above it.
	Method   string
	Exact    bool
	Bound    flow.Wide
	HasBound bool
	// Solves counts the network simplex runs.
	Solves int
}

// ExtendOptions tunes the search with fixed costs.
type ExtendOptions struct {
	// PairPool is how many of the best single candidates are tried in
	// pairs (default 30).
	PairPool int
	// GreedyRounds bounds the rounds of adding one more lane after the best
	// pair (default 10).
	GreedyRounds int
	// SinglesOnly stops after the best single lane.
	SinglesOnly bool
}

// Extend finds the cheapest set of candidate lanes to open. Without fixed
// costs this is one minimum-cost flow over the network and all candidates,
// exact. With fixed costs it is a fixed-charge problem: the best single lane
// and the best pair (among the PairPool best singles) are found by
// re-solving with them added (warm-started from the optimal plan when the
// network is feasible), then lanes are added greedily while that lowers the
// total; the answer comes with a lower bound from the linear relaxation
// (each candidate's rate raised by its fixed cost spread over the most it
// can carry, rounded down), so the distance to the best is bounded.
func Extend(n *flow.Network, cands []flow.Candidate, opt ExtendOptions) (*Extension, error) {
	if opt.PairPool == 0 {
		opt.PairPool = 30
	}
	if opt.GreedyRounds == 0 {
		opt.GreedyRounds = 10
	}
	x := &Extension{}
	base, err := flow.Solve(n, flow.SolveOptions{})
	if err != nil {
		return nil, err
	}
	x.Solves++
	if base.Status == flow.Unbounded {
		return nil, fmt.Errorf("dual: no optimum: a cycle of lanes without capacity lowers the cost without limit")
	}
	var baseFlow []int64
	if base.Status == flow.Optimal {
		x.WasFeasible, x.BaseCost, baseFlow = true, base.Cost, base.Flow
	}
	fixed := false
	for _, c := range cands {
		if c.Fixed > 0 {
			fixed = true
		}
	}
	// try solves the network with the given candidates and returns the
	// total cost (fixed costs of the lanes used) or ok=false.
	// On an infeasible network every candidate set is solved on the network
	// with unmet demand priced above any route, warm-started from that
	// network's optimum: a set restores feasibility exactly when its optimum
	// leaves nothing unmet.
	var priced *pricedStart
	if !x.WasFeasible {
		if priced, err = newPricedStart(n, cands); err != nil {
			return nil, err
		}
		if priced != nil {
			x.Solves++
		}
	}
	try := func(set []int) (trial, error) {
		sub := make([]flow.Candidate, len(set))
		for i, k := range set {
			sub[i] = cands[k]
		}
		if priced != nil {
			t, err := priced.try(n, set, sub, cands)
			x.Solves++
			return t, err
		}
		ext := n.WithLanes(sub)
		var start []int64
		if baseFlow != nil {
			start = make([]int64, ext.NumLanes())
			copy(start, baseFlow)
			for _, c := range sub {
				if c.Lower > 0 {
					start = nil
					break
				}
			}
		}
		sol, err := flow.Solve(ext, flow.SolveOptions{Start: start})
		x.Solves++
		if err != nil {
			return trial{}, err
		}
		t := trial{set: set, sol: sol}
		switch sol.Status {
		case flow.Unbounded:
			return t, fmt.Errorf("dual: with candidates added the cost falls without limit (a cycle without capacity)")
		case flow.Infeasible:
			t.short = sol.Shortfall
			return t, nil
		}
		t.ok, t.total = true, sol.Cost
		for i, k := range set {
			if sol.Flow[n.NumLanes()+i] > 0 {
				if t.total, err = t.total.Add(flow.WideFrom(cands[k].Fixed)); err != nil {
					return t, fmt.Errorf("dual: total cost %w", err)
				}
			}
		}
		return t, nil
	}
	all := make([]int, len(cands))
	for i := range all {
		all[i] = i
	}
	var best trial
	if x.WasFeasible {
		best = trial{ok: true, total: base.Cost}
	}
	better := func(t trial) bool {
		return t.ok && (!best.ok || t.total.Cmp(best.total) < 0 || (t.total.Cmp(best.total) == 0 && len(t.set) < len(best.set)))
	}
	if !fixed {
		t, err := try(all)
		if err != nil {
			return nil, err
		}
		x.Method, x.Exact = "one minimum-cost flow over the network and every candidate (no fixed costs: exact)", true
		if t.ok {
			best = t
		}
	} else {
		// A single lane that cannot help is not solved: on an infeasible
		// network it must enter the short region from outside with room for
		// the units short; on a feasible one it must cost less than its
		// break-even rate (or carry a minimum).
		hopeless, err := x.hopeless(n, base, cands)
		if err != nil {
			return nil, err
		}
		singles := make([]trial, len(cands))
		for i := range cands {
			if hopeless[i] {
				singles[i] = trial{set: []int{i}, short: -1}
				continue
			}
			if singles[i], err = try([]int{i}); err != nil {
				return nil, err
			}
			if better(singles[i]) {
				best = singles[i]
			}
		}
		if opt.SinglesOnly {
			opt.PairPool, opt.GreedyRounds = 0, 0
		}
		// The pool for pairs: feasible singles by total, then the others by
		// how much they leave short.
		pool := append([]int(nil), all...)
		sort.SliceStable(pool, func(a, b int) bool {
			sa, sb := singles[pool[a]], singles[pool[b]]
			if sa.ok != sb.ok {
				return sa.ok
			}
			if sa.ok {
				return sa.total.Cmp(sb.total) < 0
			}
			if (sa.short < 0) != (sb.short < 0) {
				return sb.short < 0 // lanes not tried come last
			}
			return sa.short < sb.short
		})
		if len(pool) > opt.PairPool {
			pool = pool[:opt.PairPool]
		}
		sort.Ints(pool)
		for a := 0; a < len(pool) && opt.PairPool > 0; a++ {
			for b := a + 1; b < len(pool); b++ {
				t, err := try([]int{pool[a], pool[b]})
				if err != nil {
					return nil, err
				}
				if better(t) {
					best = t
				}
			}
		}
		// Greedy: add the lane that lowers the total most, while any does.
		for round := 0; round < opt.GreedyRounds && best.ok; round++ {
			in := map[int]bool{}
			for _, k := range best.set {
				in[k] = true
			}
			improved := false
			for k := range cands {
				if in[k] {
					continue
				}
				set := append(append([]int(nil), best.set...), k)
				sort.Ints(set)
				t, err := try(set)
				if err != nil {
					return nil, err
				}
				if better(t) {
					best, improved = t, true
				}
			}
			if !improved {
				break
			}
		}
		if opt.SinglesOnly {
			pool = nil
		}
		x.Method = fmt.Sprintf("every single lane that can help, every pair among the %d best singles, then lanes added one at a time while the total fell", len(pool))
		if opt.SinglesOnly {
			x.Method = "the best single lane (every single lane that can help)"
		}
		x.Exact = len(cands) <= 1 || (len(cands) == 2 && !opt.SinglesOnly)
		// Lower bound: the linear relaxation.
		if err := x.bound(n, cands); err != nil {
			return nil, err
		}
		if x.HasBound && best.ok && best.total.Cmp(x.Bound) == 0 {
			x.Exact = true
		}
	}
	if !best.ok {
		return x, nil
	}
	x.Feasible, x.Cost = true, best.total
	if best.sol == nil { // the network alone is best
		x.Plan = baseFlow
		return x, nil
	}
	x.Plan = best.sol.Flow
	for i, k := range best.set {
		if q := best.sol.Flow[n.NumLanes()+i]; q > 0 {
			x.Chosen = append(x.Chosen, k)
			x.Flows = append(x.Flows, q)
		}
	}
	return x, nil
}

// trial is one candidate set solved: the total cost (fixed costs of the
// lanes used included) when ok, else the units still short.
type trial struct {
	set   []int
	sol   *flow.Solution
	total flow.Wide
	ok    bool
	short int64
}

// pricedStart is an infeasible network's optimum with unmet demand priced
// above any route (flow.WithShortfall), the start of every candidate set's
// solve.
type pricedStart struct {
	price int64
	flow  []int64 // lanes of the network, then its unmet lanes
}

// newPricedStart solves n with unmet demand priced at one more than the sum
// of all |rates| (lanes and candidates), so that every optimum leaves the
// least possible demand unmet. It returns nil (no error) when the price or
// the costs would overflow, or a candidate has a minimum; Extend then
// solves each set from scratch.
func newPricedStart(n *flow.Network, cands []flow.Candidate) (*pricedStart, error) {
	price := int64(1)
	var err error
	for _, r := range n.Rate {
		if price, err = flow.AddChecked(price, max(r, -r)); err != nil {
			return nil, nil
		}
	}
	for _, c := range cands {
		if c.Lower > 0 {
			return nil, nil
		}
		if price, err = flow.AddChecked(price, max(c.Rate, -c.Rate)); err != nil {
			return nil, nil
		}
	}
	ext, err := flow.WithShortfall(n, price, nil)
	if err != nil {
		return nil, nil // e.g. a node already named like the virtual one
	}
	sol, err := flow.Solve(ext, flow.SolveOptions{})
	if err != nil || sol.Status != flow.Optimal {
		return nil, nil
	}
	return &pricedStart{price: price, flow: sol.Flow}, nil
}

// try solves n with the candidates sub (indexes set) and priced unmet
// demand, from the priced optimum plus nothing on the new lanes.
func (ps *pricedStart) try(n *flow.Network, set []int, sub, cands []flow.Candidate) (trial, error) {
	m := n.NumLanes()
	ext, err := flow.WithShortfall(n.WithLanes(sub), ps.price, nil)
	if err != nil {
		return trial{}, err
	}
	start := make([]int64, ext.NumLanes())
	copy(start, ps.flow[:m])
	copy(start[m+len(sub):], ps.flow[m:])
	sol, err := flow.Solve(ext, flow.SolveOptions{Start: start})
	if err != nil {
		return trial{}, err
	}
	t := trial{set: set}
	if sol.Status != flow.Optimal {
		return t, fmt.Errorf("dual: the network with priced unmet demand has no optimum (%v)", sol.Status)
	}
	for _, q := range sol.Flow[m+len(sub):] {
		t.short += q
	}
	if t.short > 0 {
		return t, nil
	}
	// Nothing unmet: the plan is feasible for n with the candidates, and
	// its cost is the routing cost alone.
	sol.Flow = sol.Flow[:m+len(sub)]
	t.sol, t.ok, t.total = sol, true, sol.Cost
	for i, k := range set {
		if sol.Flow[m+i] > 0 {
			if t.total, err = t.total.Add(flow.WideFrom(cands[k].Fixed)); err != nil {
				return t, fmt.Errorf("dual: total cost %w", err)
			}
		}
	}
	return t, nil
}

// hopeless marks the candidates that cannot improve on the network alone
// when added on their own, from the cut (infeasible network) or the
// break-even rate over the residual network of the optimal plan (feasible).
func (x *Extension) hopeless(n *flow.Network, base *flow.Solution, cands []flow.Candidate) ([]bool, error) {
	out := make([]bool, len(cands))
	if base.Status == flow.Infeasible {
		cut, err := flow.FindCut(n)
		if err != nil || cut == nil || cut.Hold {
			return out, err
		}
		in := make([]bool, n.NumNodes())
		for _, v := range cut.Region {
			in[v] = true
		}
		for i, c := range cands {
			room := c.Upper == flow.NoLimit || c.Upper >= cut.Short
			out[i] = in[c.Tail] || !in[c.Head] || !room
		}
		return out, nil
	}
	a, err := Check(n, base.Flow)
	if err != nil {
		return nil, err
	}
	pr, err := newPricer(n, base.Flow, a.Potential)
	if err != nil {
		return nil, err
	}
	for i, c := range cands {
		if c.Lower > 0 {
			continue
		}
		be, ok, err := pr.breakEven(c.Tail, c.Head)
		if err != nil {
			return nil, err
		}
		out[i] = !ok || c.Rate >= be
	}
	return out, nil
}

// bound solves the linear relaxation of the fixed-charge problem: every
// candidate open, its rate raised by floor(fixed / most it can carry).
func (x *Extension) bound(n *flow.Network, cands []flow.Candidate) error {
	var supply int64
	for _, b := range n.Supply {
		if b > 0 {
			supply += b
		}
	}
	relaxed := make([]flow.Candidate, len(cands))
	for i, c := range cands {
		most := c.Upper
		if most == flow.NoLimit || most > supply {
			most = supply
		}
		c.Lower = 0
		if c.Fixed > 0 && most > 0 {
			var err error
			if c.Rate, err = flow.AddChecked(c.Rate, c.Fixed/most); err != nil {
				return fmt.Errorf("dual: relaxed rate %w", err)
			}
		}
		relaxed[i] = c
	}
	sol, err := flow.Solve(n.WithLanes(relaxed), flow.SolveOptions{})
	x.Solves++
	if err != nil {
		return err
	}
	if sol.Status == flow.Optimal {
		x.Bound, x.HasBound = sol.Cost, true
	}
	return nil
}
