// Package certcheck is an independent checker of plans and certificates for
// minimum-cost flow networks, written from the definitions only. It is used
// by tests to judge the output of lanecert's solvers and of package dual
// without sharing their code: every sum and product is done in math/big, so
// none of package flow's checked int64 or 128-bit code paths is involved.
//
// # Definitions
//
// The sign conventions are those of package flow. Supply[v] > 0 at an
// origin, < 0 at a destination; netout(v) is the flow on lanes leaving v
// minus the flow on lanes entering v. A plan x is feasible when
// Lower[a] <= x[a] <= Upper[a] for every lane (Upper == flow.NoLimit: no
// upper bound) and netout(v) == Supply[v] for every node, except when total
// supply S exceeds total demand D: then each origin v may keep part of its
// supply, 0 <= netout(v) <= Supply[v]. Keeping is modelled as a virtual
// hold lane v -> H with rate 0 and bounds [0, Supply[v]] carrying
// h(v) = Supply[v] - netout(v) into a hold node H with demand S - D and
// potential p(H) = 0.
//
// Potentials p are in the rate scale. The reduced cost of lane a is
// r(a) = Rate[a] + p(Tail[a]) - p(Head[a]), that of the hold lane of v is
// p(v). Costs and dual objectives are in the scale QtyPlaces+RatePlaces.
//
// Each checker returns nil or an error wrapping one of the sentinel errors
// below, naming the first violation found (lanes and nodes are scanned in
// index order, so the answer is deterministic).
package certcheck

import (
	"errors"
	"fmt"
	"math/big"

	"lanecert/flow"
)

// Sentinel errors; test with errors.Is.
var (
	// ErrShape: a slice length does not match the network.
	ErrShape = errors.New("length does not match the network")
	// ErrBound: a lane's flow lies outside [Lower, Upper], or the network
	// itself has Lower < 0 or Lower > Upper.
	ErrBound = errors.New("flow outside the lane's bounds")
	// ErrBalance: a node's outflow minus inflow differs from its supply
	// (or, for an origin under excess supply, lies outside [0, Supply]).
	ErrBalance = errors.New("node does not balance")
	// ErrShortSupply: total demand exceeds total supply; no plan is feasible.
	ErrShortSupply = errors.New("total demand exceeds total supply")
	// ErrSlackness: a lane's reduced cost has the wrong sign for its flow.
	ErrSlackness = errors.New("complementary slackness violated")
	// ErrHoldSlackness: an origin's potential has the wrong sign for the
	// amount it keeps.
	ErrHoldSlackness = errors.New("complementary slackness of a hold lane violated")
	// ErrDualGap: the dual objective differs from the plan's cost.
	ErrDualGap = errors.New("dual objective differs from plan cost")
	// ErrClaimedCost: the claimed cost differs from the plan's cost.
	ErrClaimedCost = errors.New("claimed cost differs from plan cost")
	// ErrClaimedDual: the claimed dual objective differs from the dual
	// objective of the potentials.
	ErrClaimedDual = errors.New("claimed dual objective differs from the potentials' dual objective")
	// ErrWalk: the steps of a cycle do not form a closed walk.
	ErrWalk = errors.New("steps do not form a closed walk")
	// ErrThetaNotPositive: the cycle amount theta is <= 0.
	ErrThetaNotPositive = errors.New("cycle amount not positive")
	// ErrThetaTooBig: moving theta around the cycle breaks a bound.
	ErrThetaTooBig = errors.New("cycle amount breaks a lane's bounds")
	// ErrThetaNotMax: after moving theta no lane of the cycle is at a bound.
	ErrThetaNotMax = errors.New("cycle amount is not the largest possible")
	// ErrSaving: the cycle's saving per unit is not positive or differs
	// from the claim, or the total saving differs from saving × theta.
	ErrSaving = errors.New("cycle saving wrong")
)

func bi(v int64) *big.Int { return big.NewInt(v) }

// netOuts returns outflow minus inflow per node.
func netOuts(n *flow.Network, x []int64) []*big.Int {
	out := make([]*big.Int, len(n.Nodes))
	for v := range out {
		out[v] = new(big.Int)
	}
	for a := range n.Tail {
		out[n.Tail[a]].Add(out[n.Tail[a]], bi(x[a]))
		out[n.Head[a]].Sub(out[n.Head[a]], bi(x[a]))
	}
	return out
}

// excess returns total supply minus total demand.
func excess(n *flow.Network) *big.Int {
	e := new(big.Int)
	for _, s := range n.Supply {
		e.Add(e, bi(s))
	}
	return e
}

func checkShape(n *flow.Network) error {
	m := len(n.Tail)
	if len(n.Head) != m || len(n.Lower) != m || len(n.Upper) != m || len(n.Rate) != m {
		return fmt.Errorf("certcheck: lane arrays: %w", ErrShape)
	}
	if len(n.Supply) != len(n.Nodes) {
		return fmt.Errorf("certcheck: %d supplies for %d nodes: %w", len(n.Supply), len(n.Nodes), ErrShape)
	}
	nn := len(n.Nodes)
	for a := range m {
		if int(n.Tail[a]) < 0 || int(n.Tail[a]) >= nn || int(n.Head[a]) < 0 || int(n.Head[a]) >= nn {
			return fmt.Errorf("certcheck: lane %s: node out of range: %w", n.LaneName(flow.LaneID(a)), ErrShape)
		}
	}
	return nil
}

// atUpper reports whether lane a is at a finite capacity.
func atUpper(n *flow.Network, a int, x int64) bool {
	return n.Upper[a] != flow.NoLimit && x == n.Upper[a]
}

// Feasible checks plan x exactly: 0 <= Lower <= x <= Upper on every lane
// and the node balances with the excess-supply rule (see the package doc).
// It returns nil or an error wrapping ErrShape, ErrBound, ErrShortSupply or
// ErrBalance that names the first violation. Time O(|V|+|E|) big-integer
// operations.
func Feasible(n *flow.Network, x []int64) error {
	if err := checkShape(n); err != nil {
		return err
	}
	if len(x) != len(n.Tail) {
		return fmt.Errorf("certcheck: plan has %d flows for %d lanes: %w", len(x), len(n.Tail), ErrShape)
	}
	for a := range n.Tail {
		name := n.LaneName(flow.LaneID(a))
		switch {
		case n.Lower[a] < 0 || n.Lower[a] > n.Upper[a]:
			return fmt.Errorf("certcheck: lane %s: bounds [%d, %d] invalid: %w", name, n.Lower[a], n.Upper[a], ErrBound)
		case x[a] < n.Lower[a]:
			return fmt.Errorf("certcheck: lane %s: flow %d below minimum %d: %w", name, x[a], n.Lower[a], ErrBound)
		case x[a] > n.Upper[a]:
			return fmt.Errorf("certcheck: lane %s: flow %d above capacity %d: %w", name, x[a], n.Upper[a], ErrBound)
		}
	}
	ex := excess(n)
	if ex.Sign() < 0 {
		return fmt.Errorf("certcheck: short by %s: %w", new(big.Int).Neg(ex), ErrShortSupply)
	}
	for v, out := range netOuts(n, x) {
		s := bi(n.Supply[v])
		if ex.Sign() > 0 && n.Supply[v] > 0 {
			if out.Sign() < 0 || out.Cmp(s) > 0 {
				return fmt.Errorf("certcheck: origin %s: net outflow %s outside [0, %s]: %w", n.Nodes[v], out, s, ErrBalance)
			}
			continue
		}
		if out.Cmp(s) != 0 {
			return fmt.Errorf("certcheck: node %s: net outflow %s, supply %s: %w", n.Nodes[v], out, s, ErrBalance)
		}
	}
	return nil
}

// Optimal checks a certificate of optimality for plan x and potentials p
// (one per node, rate scale):
//
//   - x is feasible (see Feasible);
//   - every lane satisfies complementary slackness with
//     r = Rate + p(Tail) - p(Head): Lower == Upper allows any r; otherwise
//     x strictly between the bounds needs r == 0, x == Lower needs r >= 0,
//     x == Upper (finite) needs r <= 0. A lane without capacity is never
//     at its upper bound, so r < 0 on it always fails;
//   - when total supply exceeds total demand, every origin's hold
//     h = Supply - netout satisfies 0 < h < Supply -> p == 0, h == 0 ->
//     p >= 0, h == Supply -> p <= 0;
//   - the dual objective
//     D = -Σ_v Supply[v]·p(v) + Σ_lanes (r > 0: r·Lower; r < 0: r·Upper)
//     plus Σ_origins min(p(v), 0)·Supply[v] (this last sum only under
//     excess supply) equals the cost C = Σ Rate·x;
//   - claimedCost, if not nil, equals C; claimedDual, if not nil, equals D.
//
// C and D are in the scale QtyPlaces+RatePlaces. The errors wrap
// ErrShape, the errors of Feasible, ErrSlackness, ErrHoldSlackness,
// ErrClaimedCost, ErrClaimedDual or ErrDualGap, checked in that order.
// Time O(|V|+|E|) big-integer operations.
func Optimal(n *flow.Network, x []int64, p []int64, claimedCost, claimedDual *big.Int) error {
	if err := Feasible(n, x); err != nil {
		return err
	}
	if len(p) != len(n.Nodes) {
		return fmt.Errorf("certcheck: %d potentials for %d nodes: %w", len(p), len(n.Nodes), ErrShape)
	}
	cost, dual := new(big.Int), new(big.Int)
	for v, s := range n.Supply {
		dual.Sub(dual, new(big.Int).Mul(bi(s), bi(p[v])))
	}
	for a := range n.Tail {
		cost.Add(cost, new(big.Int).Mul(bi(n.Rate[a]), bi(x[a])))
		r := bi(n.Rate[a])
		r.Add(r, bi(p[n.Tail[a]]))
		r.Sub(r, bi(p[n.Head[a]]))
		lo, hi := x[a] == n.Lower[a], atUpper(n, a, x[a])
		fixed := n.Lower[a] == n.Upper[a]
		bad := ""
		switch {
		case fixed:
		case !lo && !hi && r.Sign() != 0:
			bad = "strictly between its bounds needs reduced cost 0"
		case lo && r.Sign() < 0:
			bad = "at its minimum needs reduced cost >= 0"
		case hi && r.Sign() > 0:
			bad = "at capacity needs reduced cost <= 0"
		}
		if bad != "" {
			return fmt.Errorf("certcheck: lane %s with flow %d, reduced cost %s: %s: %w", n.LaneName(flow.LaneID(a)), x[a], r, bad, ErrSlackness)
		}
		switch r.Sign() {
		case 1:
			dual.Add(dual, r.Mul(r, bi(n.Lower[a])))
		case -1:
			// r < 0 implies the lane is fixed or at a finite capacity.
			dual.Add(dual, r.Mul(r, bi(n.Upper[a])))
		}
	}
	if excess(n).Sign() > 0 {
		outs := netOuts(n, x)
		for v, s := range n.Supply {
			if s <= 0 {
				continue
			}
			h := new(big.Int).Sub(bi(s), outs[v])
			pv := p[v]
			bad := ""
			switch {
			case h.Sign() > 0 && h.Cmp(bi(s)) < 0 && pv != 0:
				bad = "keeps part of its supply, needs potential 0"
			case h.Sign() == 0 && pv < 0:
				bad = "keeps nothing, needs potential >= 0"
			case h.Cmp(bi(s)) == 0 && pv > 0:
				bad = "keeps all its supply, needs potential <= 0"
			}
			if bad != "" {
				return fmt.Errorf("certcheck: origin %s keeping %s with potential %d: %s: %w", n.Nodes[v], h, pv, bad, ErrHoldSlackness)
			}
			if pv < 0 {
				dual.Add(dual, new(big.Int).Mul(bi(pv), bi(s)))
			}
		}
	}
	if claimedCost != nil && claimedCost.Cmp(cost) != 0 {
		return fmt.Errorf("certcheck: claimed cost %s, plan cost %s: %w", claimedCost, cost, ErrClaimedCost)
	}
	if claimedDual != nil && claimedDual.Cmp(dual) != 0 {
		return fmt.Errorf("certcheck: claimed dual objective %s, potentials give %s: %w", claimedDual, dual, ErrClaimedDual)
	}
	if dual.Cmp(cost) != 0 {
		return fmt.Errorf("certcheck: dual objective %s, plan cost %s: %w", dual, cost, ErrDualGap)
	}
	return nil
}

// Step is one lane of a cycle: traversed from Tail to Head when Forward
// (its flow grows), from Head to Tail otherwise (its flow shrinks). A step
// with Lane < 0 is the hold lane of origin Origin (from Origin to the hold
// node H, rate 0, bounds [0, Supply[Origin]]): Forward keeps more there.
type Step struct {
	Lane    flow.LaneID
	Origin  flow.NodeID
	Forward bool
}

// Cycle checks a certificate that plan x is not optimal: an improving
// cycle. Checked, in order:
//
//   - x is feasible (see Feasible);
//   - steps is non-empty, its lanes exist, and it is a closed walk: each
//     step ends where the next begins and the last ends where the first
//     begins;
//   - theta > 0;
//   - moving theta units around the walk (each Forward step adds theta to
//     its lane, each backward step subtracts theta; a lane used several
//     times moves by the net amount) keeps every lane within its bounds;
//   - at least one lane that moves lands exactly on a bound (its minimum,
//     or a finite capacity), so theta is the largest possible amount;
//   - the saving per unit, -(Σ_forward Rate - Σ_backward Rate), is > 0
//     and equals savingPerUnit (rate scale);
//   - totalSaving, if not nil, equals saving per unit × theta (scale
//     QtyPlaces+RatePlaces).
//
// Hold lanes (see the package doc) take part as steps with Lane < 0; they
// exist only when total supply exceeds total demand. The errors wrap ErrShape, the errors of Feasible,
// ErrWalk, ErrThetaNotPositive, ErrThetaTooBig, ErrThetaNotMax or ErrSaving.
// Time O(|V|+|E|+len(steps)) big-integer operations.
func Cycle(n *flow.Network, x []int64, steps []Step, theta int64, savingPerUnit int64, totalSaving *big.Int) error {
	if err := Feasible(n, x); err != nil {
		return err
	}
	if len(steps) == 0 {
		return fmt.Errorf("certcheck: no steps: %w", ErrWalk)
	}
	m := len(n.Tail)
	hold := flow.NodeID(len(n.Nodes)) // the hold node H
	var supply, demand int64
	for _, b := range n.Supply {
		if b > 0 {
			supply += b
		} else {
			demand -= b
		}
	}
	ends := func(s Step) (from, to flow.NodeID) {
		t, h := hold, hold
		if s.Lane >= 0 {
			t, h = n.Tail[s.Lane], n.Head[s.Lane]
		} else {
			t = s.Origin
		}
		if s.Forward {
			return t, h
		}
		return h, t
	}
	name := func(s Step) string {
		if s.Lane >= 0 {
			return n.LaneName(s.Lane)
		}
		return "hold of " + n.Nodes[s.Origin]
	}
	nodeName := func(v flow.NodeID) string {
		if v == hold {
			return "(hold)"
		}
		return n.Nodes[v]
	}
	for i, s := range steps {
		if s.Lane < 0 {
			if supply <= demand || s.Origin < 0 || int(s.Origin) >= len(n.Nodes) || n.Supply[s.Origin] <= 0 {
				return fmt.Errorf("certcheck: step %d: no hold lane at origin %d: %w", i+1, s.Origin, ErrWalk)
			}
			continue
		}
		if int(s.Lane) >= m {
			return fmt.Errorf("certcheck: step %d: lane index %d out of range: %w", i+1, s.Lane, ErrWalk)
		}
	}
	for i, s := range steps {
		_, to := ends(s)
		next := steps[(i+1)%len(steps)]
		from, _ := ends(next)
		if to != from {
			return fmt.Errorf("certcheck: step %d (lane %s) ends at %s, step %d (lane %s) starts at %s: %w",
				i+1, name(s), nodeName(to), (i+1)%len(steps)+1, name(next), nodeName(from), ErrWalk)
		}
	}
	if theta <= 0 {
		return fmt.Errorf("certcheck: theta %d: %w", theta, ErrThetaNotPositive)
	}
	net := make([]int64, m)                // net traversals per lane
	holdNet := make([]int64, len(n.Nodes)) // net traversals per hold lane
	perUnit := new(big.Int)                // cost change per unit moved
	for _, s := range steps {
		k := int64(-1)
		if s.Forward {
			k = 1
		}
		if s.Lane < 0 {
			holdNet[s.Origin] += k
			continue
		}
		net[s.Lane] += k
		perUnit.Add(perUnit, new(big.Int).Mul(bi(k), bi(n.Rate[s.Lane])))
	}
	bth := bi(theta)
	tight := false
	for i, k := range net {
		a := flow.LaneID(i)
		if k == 0 {
			continue
		}
		y := new(big.Int).Mul(bi(k), bth)
		y.Add(y, bi(x[a]))
		lo, up := bi(n.Lower[a]), bi(n.Upper[a])
		if y.Cmp(lo) < 0 || (n.Upper[a] != flow.NoLimit && y.Cmp(up) > 0) {
			return fmt.Errorf("certcheck: lane %s: flow %d moves to %s, outside [%d, %s]: %w",
				n.LaneName(a), x[a], y, n.Lower[a], n.FormatQty(n.Upper[a]), ErrThetaTooBig)
		}
		if (k < 0 && y.Cmp(lo) == 0) || (k > 0 && n.Upper[a] != flow.NoLimit && y.Cmp(up) == 0) {
			tight = true
		}
	}
	if supply > demand {
		netout := make([]*big.Int, len(n.Nodes))
		for v := range netout {
			netout[v] = new(big.Int)
		}
		for a := range x {
			netout[n.Tail[a]].Add(netout[n.Tail[a]], bi(x[a]))
			netout[n.Head[a]].Sub(netout[n.Head[a]], bi(x[a]))
		}
		for v, k := range holdNet {
			if k == 0 {
				continue
			}
			h := new(big.Int).Sub(bi(n.Supply[v]), netout[v]) // kept now
			y := new(big.Int).Add(h, new(big.Int).Mul(bi(k), bth))
			if y.Sign() < 0 || y.Cmp(bi(n.Supply[v])) > 0 {
				return fmt.Errorf("certcheck: origin %s: kept supply %s moves to %s, outside [0, %d]: %w",
					n.Nodes[v], h, y, n.Supply[v], ErrThetaTooBig)
			}
			if (k < 0 && y.Sign() == 0) || (k > 0 && y.Cmp(bi(n.Supply[v])) == 0) {
				tight = true
			}
		}
	}
	if !tight {
		return fmt.Errorf("certcheck: after moving %d no lane of the cycle is at a bound: %w", theta, ErrThetaNotMax)
	}
	saving := perUnit.Neg(perUnit)
	if saving.Sign() <= 0 {
		return fmt.Errorf("certcheck: saving per unit %s is not positive: %w", saving, ErrSaving)
	}
	if saving.Cmp(bi(savingPerUnit)) != 0 {
		return fmt.Errorf("certcheck: claimed saving per unit %d, lanes give %s: %w", savingPerUnit, saving, ErrSaving)
	}
	if totalSaving != nil {
		want := new(big.Int).Mul(saving, bth)
		if totalSaving.Cmp(want) != 0 {
			return fmt.Errorf("certcheck: claimed total saving %s, saving per unit × theta is %s: %w", totalSaving, want, ErrSaving)
		}
	}
	return nil
}
