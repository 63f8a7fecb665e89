package dual

import (
	"fmt"
	"sort"
	"strings"

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
	// Solves counts the network simplex runs; Pruned the single lanes not
	// solved because a lower bound showed they could not beat the best.
	Solves int
	Pruned int
}

// ExtendOptions tunes the search with fixed costs.
type ExtendOptions struct {
	// PairPool is how many of the best single candidates are tried in
	// pairs (default 30).
	PairPool int
	// GreedyRounds bounds the rounds of adding one more lane after the best
	// pair (default 10).
	GreedyRounds int
	// SinglesOnly looks for the best single lane only (also without fixed
	// costs); Exact then means that no other single lane is better (no
	// bound is computed).
	SinglesOnly bool
	// Cut is flow.FindCut(n) when CutKnown (nil: the network can meet its
	// demands), so that a caller who has it spares Extend the search.
	Cut      *flow.Cut
	CutKnown bool
}

// Extend finds the cheapest set of candidate lanes to open. Without fixed
// costs this is one minimum-cost flow over the network and all candidates,
// exact. With fixed costs it is a fixed-charge problem: the best single lane
// and the best pair (among the PairPool best singles) are found by
// re-solving with them added, then lanes are added greedily while that
// lowers the total; the answer comes with a lower bound from the linear
// relaxation (each candidate's rate raised by its fixed cost spread over the
// most it can carry, rounded down), so the distance to the best is bounded.
//
// Every candidate set is solved from one kept optimal basis (flow.Basis):
// the network's optimum when it can meet its demands, else the optimum of
// the network with unmet demand priced above any route (flow.WithShortfall),
// where a set restores feasibility exactly when its optimum leaves nothing
// unmet. Each set then costs a copy of the solver's state, the pivots the
// new lanes cause and one pass over the lanes. On an infeasible network a
// single lane that cannot help alone (not entering the short region of the
// cut, or with less room than the units short) is not solved. When the
// priced network cannot be used (candidates with minimums, a price that
// would overflow, infeasibility caused by minimums) each set is solved from
// scratch.
func Extend(n *flow.Network, cands []flow.Candidate, opt ExtendOptions) (*Extension, error) {
	if opt.PairPool == 0 {
		opt.PairPool = 30
	}
	if opt.GreedyRounds == 0 {
		opt.GreedyRounds = 10
	}
	x := &Extension{}
	cut := opt.Cut
	if !opt.CutKnown {
		var err error
		if cut, err = flow.FindCut(n); err != nil {
			return nil, err
		}
	}
	fixed := false
	for _, c := range cands {
		if c.Fixed > 0 {
			fixed = true
		}
	}
	sv := &setSolver{n: n, cands: cands, x: x}
	if cut == nil {
		base, err := flow.Solve(n, flow.SolveOptions{Keep: !hasMinimum(cands)})
		if err != nil {
			return nil, err
		}
		x.Solves++
		switch base.Status {
		case flow.Unbounded:
			return nil, fmt.Errorf("dual: no optimum: a cycle of lanes without capacity lowers the cost without limit")
		case flow.Infeasible:
			return nil, fmt.Errorf("dual: the network has no cut but cannot meet its demands (shortfall %d)", base.Shortfall)
		}
		x.WasFeasible, x.BaseCost = true, base.Cost
		sv.baseFlow, sv.basis = base.Flow, base.Basis
	} else {
		basis, unmet, cost, err := pricedBasis(n, cands)
		if err != nil {
			return nil, err
		}
		if basis != nil {
			x.Solves++
		}
		sv.basis, sv.unmet, sv.base = basis, unmet, cost
	}
	all := make([]int, len(cands))
	for i := range all {
		all[i] = i
	}
	if x.WasFeasible {
		sv.best = trial{ok: true, total: x.BaseCost, plan: sv.baseFlow}
	}
	// Candidates with a minimum carry at least that when opened, so
	// opening one is a choice even without fixed costs.
	withMin, noMin := byMinimum(cands)
	if !fixed && !opt.SinglesOnly && len(withMin) == 0 {
		t, err := sv.try(all)
		if err != nil {
			return nil, err
		}
		sv.consider(t)
		x.Method, x.Exact = "one minimum-cost flow over the network and every candidate (no fixed costs: exact)", true
	} else if !fixed && !opt.SinglesOnly && len(withMin) <= maxMinChoices {
		// Every candidate without a minimum is free to open (it may carry
		// nothing): each choice of those with a minimum is solved with
		// all of them.
		if err := sv.tryChoices(noMin, withMin); err != nil {
			return nil, err
		}
		x.Method = fmt.Sprintf("one minimum-cost flow for each choice of the %d candidates with a minimum, with every other candidate (no fixed costs: exact)", len(withMin))
		x.Exact = true
	} else {
		if !opt.SinglesOnly && hasNegativeRate(n, cands) {
			// Some set of candidates may close a cycle of lanes without
			// capacity whose rates sum below zero, a set the search below
			// might not try (three lanes or more). With it, every
			// candidate without a minimum open closes it too, and keeps
			// the set's plans (such a lane may carry nothing): so each
			// choice of the candidates with a minimum is tried with all
			// of those (with more than maxMinChoices of them: none, and
			// all). (Without negative rates no cycle can.)
			if err := sv.tryChoices(noMin, withMin); err != nil {
				return nil, err
			}
		}
		// On an infeasible network a single lane must enter the short
		// region from outside with room for the units short.
		hopeless := make([]bool, len(cands))
		if cut != nil && !cut.Hold {
			in := make([]bool, n.NumNodes())
			for _, v := range cut.Region {
				in[v] = true
			}
			for i, c := range cands {
				room := c.Upper == flow.NoLimit || c.Upper >= cut.Short
				hopeless[i] = in[c.Tail] || !in[c.Head] || !room
			}
		}
		singles := make([]trial, len(cands))
		order := make([]int, 0, len(cands))
		for i := range cands {
			if hopeless[i] {
				singles[i] = trial{set: []int{i}, short: -1}
				continue
			}
			order = append(order, i)
		}
		// For the best single lane alone, lanes are solved in order of a
		// lower bound on their total, and those whose bound cannot beat
		// the best found are not solved.
		var lb []singleBound
		// (The bounds of an infeasible network cost two searches: not worth
		// it for a handful of lanes.)
		if opt.SinglesOnly && sv.basis != nil && ((cut != nil && !cut.Hold && sv.unmet > 0 && len(order) >= minBoundedLanes) || (cut == nil && x.WasFeasible)) {
			var err error
			if lb, err = sv.singleBounds(cut, order); err != nil {
				return nil, err
			}
			sort.SliceStable(order, func(a, b int) bool {
				la, lb := lb[order[a]], lb[order[b]]
				if la.ok != lb.ok {
					return !la.ok // no bound: solve first
				}
				return la.ok && la.total.Cmp(lb.total) < 0
			})
		}
		for _, i := range order {
			if lb != nil && lb[i].never {
				singles[i] = trial{set: []int{i}, short: -1}
				x.Pruned++
				continue
			}
			if lb != nil && lb[i].ok && sv.best.ok {
				if c := lb[i].total.Cmp(sv.best.total); c > 0 || (c == 0 && !setLess([]int{i}, sv.best.set)) {
					singles[i] = trial{set: []int{i}, short: -1}
					x.Pruned++
					continue
				}
			}
			t, err := sv.try([]int{i})
			if err != nil {
				return nil, err
			}
			singles[i] = sv.consider(t)
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
				t, err := sv.try([]int{pool[a], pool[b]})
				if err != nil {
					return nil, err
				}
				sv.consider(t)
			}
		}
		// Greedy: add the lane that lowers the total most, while any does.
		for round := 0; round < opt.GreedyRounds && sv.best.ok; round++ {
			in := make([]bool, len(cands))
			for _, k := range sv.best.set {
				in[k] = true
			}
			improved := false
			base := sv.best.set
			for k := range cands {
				if in[k] {
					continue
				}
				set := append(append([]int(nil), base...), k)
				sort.Ints(set)
				t, err := sv.try(set)
				if err != nil {
					return nil, err
				}
				if sv.better(t) {
					sv.consider(t)
					improved = true
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
			x.Method = "the best single lane (every single lane that can help, solved in order of a lower bound on its total; lanes whose bound cannot beat the best found are not solved)"
		}
		x.Exact = len(cands) <= 1 || (len(cands) == 2 && !opt.SinglesOnly)
		if opt.SinglesOnly {
			// Every single lane was solved exactly or shown unable to
			// help: the answer is the best single lane.
			x.Exact = true
		} else if err := sv.bound(); err != nil { // the linear relaxation
			return nil, err
		}
		if x.HasBound && sv.best.ok && sv.best.total.Cmp(x.Bound) == 0 {
			x.Exact = true
		}
	}
	best := sv.best
	if !best.ok {
		return x, nil
	}
	x.Feasible, x.Cost, x.Plan = true, best.total, best.plan
	m := n.NumLanes()
	for i, k := range best.set {
		if q := best.plan[m+i]; q > 0 {
			x.Chosen = append(x.Chosen, k)
			x.Flows = append(x.Flows, q)
		}
	}
	return x, nil
}

// laneList names candidate lanes for a message: "bid b7", "bids b1, b2
// and b3" (what says which), each by its ID or, without one, "FROM to
// TO"; after five, how many more.
func laneList(n *flow.Network, what string, cs []flow.Candidate) string {
	const shown = 5
	var names []string
	for i, c := range cs {
		if i == shown {
			names = append(names, fmt.Sprintf("%d more", len(cs)-shown))
			break
		}
		name := c.ID
		if name == "" {
			name = n.Nodes[c.Tail] + " to " + n.Nodes[c.Head]
		}
		names = append(names, name)
	}
	switch len(names) {
	case 0:
		return "no " + what + "s"
	case 1:
		return what + " " + names[0]
	}
	return what + "s " + strings.Join(names[:len(names)-1], ", ") + " and " + names[len(names)-1]
}

// byMinimum splits the candidates' indexes into those with a minimum and
// the others, each in order.
func byMinimum(cands []flow.Candidate) (withMin, noMin []int) {
	for i, c := range cands {
		if c.Lower > 0 {
			withMin = append(withMin, i)
		} else {
			noMin = append(noMin, i)
		}
	}
	return withMin, noMin
}

func hasMinimum(cands []flow.Candidate) bool {
	for _, c := range cands {
		if c.Lower > 0 {
			return true
		}
	}
	return false
}

// trial is one candidate set solved: the total cost (fixed costs of the
// lanes used included) when ok, else the units still short (-1: not tried).
// plan (the network's lanes, then the set's) is filled once the trial is
// the best so far.
type trial struct {
	set   []int
	total flow.Wide
	ok    bool
	short int64
	plan  []int64
	added *flow.Added // when solved from a basis: the plan until the next Add
	flow  []int64     // when solved from scratch: the plan
}

// setSolver solves candidate sets: from a kept basis when there is one
// (the network's, or the priced network's with unmet lanes m..m+unmet-1),
// else from scratch; best is the best trial so far.
type setSolver struct {
	n        *flow.Network
	cands    []flow.Candidate
	x        *Extension
	basis    *flow.Basis
	unmet    int
	base     flow.Wide // the priced optimum's cost (with unmet lanes)
	baseFlow []int64
	best     trial
}

// try solves the network with the candidates of set (increasing indexes).
func (sv *setSolver) try(set []int) (trial, error) {
	n, m := sv.n, sv.n.NumLanes()
	sub := make([]flow.Candidate, len(set))
	for i, k := range set {
		sub[i] = sv.cands[k]
	}
	t := trial{set: set}
	sv.x.Solves++
	var used func(i int) int64
	var cost flow.Wide
	// The priced network can always place its demand (unmet lanes), so a
	// cycle without limit there may belong to a network that still cannot
	// meet its demands with the set: that case is solved from scratch
	// (below), which tells the two apart.
	var add *flow.Added
	if sv.basis != nil {
		var err error
		if add, err = sv.basis.Add(sub); err != nil {
			return t, err
		}
		if add.Status == flow.Unbounded {
			if sv.unmet == 0 {
				return t, fmt.Errorf("dual: with %s added the cost falls without limit (a cycle of lanes without capacity)", laneList(n, "candidate", sub))
			}
			add = nil
			sv.x.Solves++
		}
	}
	if add != nil {
		for k := 0; k < sv.unmet; k++ {
			t.short += add.Flow(flow.LaneID(m + k))
		}
		if t.short > 0 {
			return t, nil
		}
		t.added, cost = add, add.Cost
		used = func(i int) int64 { return add.Extra[i] }
	} else {
		sol, err := flow.Solve(n.WithLanes(sub), flow.SolveOptions{})
		if err != nil {
			return t, err
		}
		switch sol.Status {
		case flow.Unbounded:
			return t, fmt.Errorf("dual: with %s added the cost falls without limit (a cycle of lanes without capacity)", laneList(n, "candidate", sub))
		case flow.Infeasible:
			t.short = sol.Shortfall
			return t, nil
		}
		t.flow, cost = sol.Flow, sol.Cost
		used = func(i int) int64 { return sol.Flow[m+i] }
	}
	t.ok, t.total = true, cost
	for i, k := range set {
		if used(i) > 0 {
			var err error
			if t.total, err = t.total.Add(flow.WideFrom(sv.cands[k].Fixed)); err != nil {
				return t, fmt.Errorf("dual: total cost %w", err)
			}
		}
	}
	return t, nil
}

// tryChoices solves the network with every candidate of noMin and each
// choice of those of withMin (every choice when there are at most
// maxMinChoices, else none and all of them), keeping the best (consider).
func (sv *setSolver) tryChoices(noMin, withMin []int) error {
	every := len(withMin) <= maxMinChoices
	choices := 2
	if every {
		choices = 1 << len(withMin)
	}
	for c := 0; c < choices; c++ {
		set := append([]int(nil), noMin...)
		for j, k := range withMin {
			if (every && c&(1<<j) != 0) || (!every && c == 1) {
				set = append(set, k)
			}
		}
		sort.Ints(set)
		t, err := sv.try(set)
		if err != nil {
			return err
		}
		sv.consider(t)
	}
	return nil
}

// better reports whether t beats the best so far (lower total; on a tie,
// fewer lanes).
func (sv *setSolver) better(t trial) bool {
	b := sv.best
	if !t.ok {
		return false
	}
	if !b.ok {
		return true
	}
	if c := t.total.Cmp(b.total); c != 0 {
		return c < 0
	}
	return setLess(t.set, b.set)
}

// setLess orders sets of candidates: fewer lanes first, then by their
// indexes (lexicographically), so that ties between totals are broken the
// same way whatever the order in which sets are solved.
func setLess(a, b []int) bool {
	if len(a) != len(b) {
		return len(a) < len(b)
	}
	for i := range a {
		if a[i] != b[i] {
			return a[i] < b[i]
		}
	}
	return false
}

// maxMinChoices is the most candidates with a minimum for which Extend,
// without fixed costs, solves every choice of them (2^k solves); with
// more it searches as with fixed costs.
const maxMinChoices = 6

// denseDegree is the number of lanes per node from which the priced
// network is solved from scratch rather than from the network's own
// attempt (measured: BENCHMARKS.md).
const denseDegree = 64

// minBoundedLanes is the number of single lanes to solve on an infeasible
// network from which bounding them first pays.
const minBoundedLanes = 8

// singleBound is a lower bound on the total of a single candidate lane
// (ok false: none known).
type singleBound struct {
	total flow.Wide
	ok    bool
	never bool // the lane cannot restore feasibility
}

// singleBounds bounds from below the total (routing cost plus fixed cost)
// of the network with each single candidate of idx added, on an infeasible
// network solved with priced unmet demand (sv.basis; the virtual origin O
// is the node after n's). Let R be the cut's region, s its shortfall, P0
// the priced optimum, p its potentials and r(c) = rate + p(from) - p(to)
// the candidate's reduced cost. A candidate from u outside R to v inside
// that restores feasibility carries x >= s units; the change from the
// priced optimum splits into cycles conformal to it (no unmet lane grows):
// exactly s units on cycles through the candidate and O, which they reach
// by an unmet lane and leave by O's hold arc (each costs at least
// r(c) + d(v, O) + d(O, u), residual distances in reduced cost), the
// rest on cycles leaving R by a residual arc not into O (each unit at
// least r(c) + delta, delta the least reduced cost of such arcs, at most
// their total room), plus cycles without it (never negative). So
//
//	total >= fixed + P0 + s·(r(c) + d(v,O) + d(O,u)) + min(0, r(c)+delta)·min(cap - s, room).
//
// When O cannot reach u, or v cannot reach O, no unit can go round through
// O and the lane cannot restore feasibility (never).
//
// Two searches and one pass over the lanes; O(1) per candidate.
func (sv *setSolver) singleBounds(cut *flow.Cut, idx []int) ([]singleBound, error) {
	if cut == nil {
		return sv.feasibleBounds(idx)
	}
	n, b := sv.n, sv.basis
	out := make([]singleBound, len(sv.cands))
	o := flow.NodeID(n.NumNodes())
	// Units that lower the unmet demand reach O by an unmet lane (less
	// unmet) and leave it by its hold arc (O keeps more back): in a plan
	// that meets every demand no unmet lane grows.
	toO, err := b.Distances(o, true, flow.SrcLanes)
	if err != nil {
		return nil, err
	}
	fromO, err := b.Distances(o, false, flow.SrcHold)
	if err != nil {
		return nil, err
	}
	region := make([]bool, n.NumNodes()+1)
	for _, v := range cut.Region {
		region[v] = true
	}
	delta, room, found, err := b.Leaving(region, o)
	if err != nil {
		return nil, err
	}
	short := cut.Short
	for _, i := range idx {
		c := sv.cands[i]
		u, v := c.Tail, c.Head
		if !region[v] || region[u] {
			continue
		}
		if toO[v] == flow.NoRoute || fromO[u] == flow.NoRoute {
			// No unit can go round through O: the lane cannot lower the
			// unmet demand at all.
			out[i] = singleBound{never: true}
			continue
		}
		rc, err := flow.AddChecked(c.Rate, b.Potential(u))
		if err == nil {
			rc, err = flow.SubChecked(rc, b.Potential(v))
		}
		var via int64
		if err == nil {
			via, err = flow.AddChecked(rc, toO[v])
		}
		if err == nil {
			via, err = flow.AddChecked(via, fromO[u])
		}
		if err != nil {
			continue // no bound
		}
		t, err := sv.base.Add(flow.MulWide(short, via))
		if err == nil {
			t, err = t.Add(flow.WideFrom(c.Fixed))
		}
		if err != nil {
			continue
		}
		if found {
			per, err := flow.AddChecked(rc, delta)
			if err != nil {
				continue
			}
			if per < 0 {
				units := room
				if c.Upper != flow.NoLimit && (units == flow.NoLimit || c.Upper-short < units) {
					units = c.Upper - short
				}
				if units == flow.NoLimit {
					continue // no bound
				}
				if t, err = t.Add(flow.MulWide(per, units)); err != nil {
					continue
				}
			}
		}
		out[i] = singleBound{total: t, ok: true}
	}
	return out, nil
}

// consider makes t the best when it is better, reading its plan before the
// next solve replaces it, and returns t.
func (sv *setSolver) consider(t trial) trial {
	if !sv.better(t) {
		return t
	}
	m := sv.n.NumLanes()
	switch {
	case t.added != nil:
		p := t.added.Plan()
		t.plan = append(p[:m:m], p[m+sv.unmet:]...)
	case t.flow != nil:
		t.plan = t.flow
	}
	t.added, t.flow = nil, nil
	sv.best = t
	return t
}

// flowLimit returns a quantity that some optimal plan of the fixed-charge
// problem (n with any set of the candidates cands opened, each opened one
// paying its fixed cost) carries on no lane more than, or flow.NoLimit
// when the sum below overflows. With it, a candidate's fixed cost spread
// over the most it can carry is a valid rate in the linear relaxation.
//
// When no rate is negative (lanes and candidates): the total supply plus
// every minimum (lanes' and candidates'). A plan splits into paths from
// origins, carrying at most the total supply, and cycles. A cycle with no
// lane at its minimum can be lowered until one is, without raising the
// cost (its rates sum to at least 0) and without opening a lane, so some
// optimal plan has a lane at its minimum on each of its cycles, and the
// cycles through one lane carry at most that lane's minimum. (With lane
// minimums the total supply alone is not a limit: the minimums can force
// more than the supply round a cycle through a candidate.)
//
// Otherwise: a basic optimal plan of the network with the opened lanes,
// where a lane of the spanning tree carries at most the total supply plus
// what the lanes outside it carry (each at its minimum or at a finite
// capacity) plus what origins keep: twice the total supply plus every
// minimum and every finite capacity.
func flowLimit(n *flow.Network, cands []flow.Candidate) int64 {
	var supply int64
	var err error
	for _, b := range n.Supply {
		if b > 0 {
			if supply, err = flow.AddChecked(supply, b); err != nil {
				return flow.NoLimit
			}
		}
	}
	negative := hasNegativeRate(n, cands)
	limit := supply
	if negative {
		if limit, err = flow.AddChecked(limit, supply); err != nil {
			return flow.NoLimit
		}
	}
	add := func(lower, upper int64) bool {
		if limit, err = flow.AddChecked(limit, lower); err != nil {
			return false
		}
		if negative && upper != flow.NoLimit {
			if limit, err = flow.AddChecked(limit, upper); err != nil {
				return false
			}
		}
		return true
	}
	for a := range n.Tail {
		if !add(n.Lower[a], n.Upper[a]) {
			return flow.NoLimit
		}
	}
	for _, c := range cands {
		if !add(c.Lower, c.Upper) {
			return flow.NoLimit
		}
	}
	return limit
}

// hasNegativeRate reports whether a lane of n or a candidate has a
// negative rate (only then can candidates close a cycle whose rates sum
// below zero).
func hasNegativeRate(n *flow.Network, cands []flow.Candidate) bool {
	for _, r := range n.Rate {
		if r < 0 {
			return true
		}
	}
	for _, c := range cands {
		if c.Rate < 0 {
			return true
		}
	}
	return false
}

// pricedBasis solves n with unmet demand priced at one more than the sum of
// all |rates| (lanes and candidates), so that every optimum leaves the least
// possible demand unmet, and keeps its basis; unmet is the number of unmet
// lanes (after n's lanes) and cost the optimum's cost (unmet demand at its
// price included). It returns a nil basis (no error) when the price or the
// costs would overflow, a candidate has a minimum, or the priced network
// has no optimum (minimums): Extend then solves each set from scratch.
func pricedBasis(n *flow.Network, cands []flow.Candidate) (*flow.Basis, int, flow.Wide, error) {
	none := flow.Wide{}
	if hasMinimum(cands) {
		return nil, 0, none, nil
	}
	price := int64(1)
	var err error
	for _, r := range n.Rate {
		if price, err = flow.AddChecked(price, max(r, -r)); err != nil {
			return nil, 0, none, nil
		}
	}
	for _, c := range cands {
		if price, err = flow.AddChecked(price, max(c.Rate, -c.Rate)); err != nil {
			return nil, 0, none, nil
		}
	}
	// The network's own solve ends with a plan that delivers all it can,
	// usually as cheaply as possible: the priced network starts from it.
	// That pays where the priced network's cold solve is slow (about 2x
	// the network's on sparse and general networks); on dense ones (many
	// lanes per node) the cold solve is cheaper than the two.
	var start []int64
	if n.NumLanes() < denseDegree*n.NumNodes() {
		if own, err := flow.Solve(n, flow.SolveOptions{Keep: true}); err == nil && own.Status == flow.Infeasible {
			start = own.Attempt
		}
	}
	sol, unmet, err := flow.SolvePricedShortfall(n, price, start)
	if err != nil || sol.Status != flow.Optimal {
		return nil, 0, none, nil
	}
	return sol.Basis, unmet, sol.Cost, nil
}

// feasibleBounds bounds from below the total of a feasible network with
// each single candidate of idx added: every unit on the candidate lies on a
// cycle through it whose reduced cost is at least the candidate's, r(c) =
// rate + p(from) - p(to) with the optimum's potentials, and the other
// cycles cost nothing or more, so total >= optimum + fixed + min(0, r(c))·cap
// (no bound for a lane without capacity and r(c) < 0). O(1) per candidate.
func (sv *setSolver) feasibleBounds(idx []int) ([]singleBound, error) {
	b := sv.basis
	out := make([]singleBound, len(sv.cands))
	for _, i := range idx {
		c := sv.cands[i]
		rc, err := flow.AddChecked(c.Rate, b.Potential(c.Tail))
		if err == nil {
			rc, err = flow.SubChecked(rc, b.Potential(c.Head))
		}
		if err != nil {
			continue
		}
		t, err := sv.x.BaseCost.Add(flow.WideFrom(c.Fixed))
		if err != nil {
			continue
		}
		if rc < 0 {
			if c.Upper == flow.NoLimit {
				continue
			}
			if t, err = t.Add(flow.MulWide(rc, c.Upper)); err != nil {
				continue
			}
		}
		out[i] = singleBound{total: t, ok: true}
	}
	return out, nil
}

// bound solves the linear relaxation of the fixed-charge problem: every
// candidate open, its rate raised by floor(fixed / most it can carry),
// where the most is its capacity or flowLimit, the smaller (no raise when
// neither is finite).
func (sv *setSolver) bound() error {
	n, x := sv.n, sv.x
	limit := flowLimit(n, sv.cands)
	relaxed := make([]flow.Candidate, len(sv.cands))
	for i, c := range sv.cands {
		most := min(c.Upper, limit) // (NoLimit is the largest int64)
		if most == flow.NoLimit {
			most = 0 // no raise
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
	x.Solves++
	if sv.basis != nil {
		add, err := sv.basis.Add(relaxed)
		if err != nil {
			return err
		}
		if add.Status != flow.Optimal {
			return nil
		}
		m := n.NumLanes()
		for k := 0; k < sv.unmet; k++ {
			if add.Flow(flow.LaneID(m+k)) > 0 {
				return nil // even every candidate leaves demand unmet
			}
		}
		x.Bound, x.HasBound = add.Cost, true
		return nil
	}
	sol, err := flow.Solve(n.WithLanes(relaxed), flow.SolveOptions{})
	if err != nil {
		return err
	}
	if sol.Status == flow.Optimal {
		x.Bound, x.HasBound = sol.Cost, true
	}
	return nil
}
