package flow

import (
	"math"
	"math/bits"
)

// A warm start on a dense network sifts: it solves the network restricted
// to a few lanes (the lanes the plan uses and, for each node, the two
// cheapest lanes at it) from the plan, makes that optimum the
// whole network's tree, and prices every lane once. Lanes with the wrong
// sign of reduced cost are added to the restricted optimum's kept basis
// (Basis.Add: a few pivots from it), until one pricing finds none (the
// tree is then optimal, and no further pass is needed) or after
// siftRounds rounds (block search then finishes on the whole network from
// the last tree). A pricing after the first reads only the lanes that an
// earlier one kept, those with a small reduced cost, while the potentials
// have moved little since (siftKeep). A plan that is optimal except for a
// few cycles moves only on lanes near its own, so the restricted network
// stays small (a few lanes per node): the cost is one pass over the lanes
// that also checks the plan, plus one pricing pass (on the dense
// transportation instances of BENCHMARKS.md), against several passes for
// a search over lists of all the lanes at a bound.
const (
	siftMinLanes = 1 << 15 // sift on networks with at least this many lanes
	siftDegree   = 32      // and at least this many lanes per node
	siftRounds   = 6       // pricing passes before block search takes over
)

// siftable reports whether a warm start on a network whose supply equals
// its demand sifts: a dense network (see siftMinLanes); sift checks the
// rest. (The warm start by sweeps, on dense networks of sweepMinLanes
// lanes and more, serves those with excess supply or lane minimums.)
func (s *simplex) siftable() bool {
	return s.hold < 0 && s.m >= siftMinLanes && s.m >= siftDegree*s.nNodes
}

// sift is the warm start by sifting (see siftMinLanes) from the plan x.
// It reports ok false when it does not apply: x is not a feasible plan,
// some lane is invalid or has a minimum, the arithmetic would need checks,
// or a restricted solve is not Optimal (unbounded: the caller's warm
// start finds the cycle); the caller's warm start then sets every lane's
// flow and state again. With ok, the solver's tree is set from the last
// restricted optimum, with its potentials and the plan's cost, and proved
// reports that the last pricing found every lane with the right sign of
// reduced cost (the tree is optimal).
//
// Time O(|V|+|E|) for the first pass and for each pricing of every lane,
// O(|V|) plus the kept lanes for the other pricings, plus the restricted
// solves; memory O(|V|) plus 2 bits per lane, the kept lanes (at most 5
// bytes per lane) and the restricted network.
func (s *simplex) sift(x []int64) (ok, proved bool, err error) {
	n := s.net
	m, nv := s.m, len(n.Nodes)
	if len(x) != m || nv != s.nNodes {
		return false, false, nil
	}
	// The first pass: the checks of warmStart's first pass, the states,
	// the node balances, the lanes the plan uses and each node's two
	// cheapest lanes at zero flow with room (ties: the first).
	best := make([]cheapTwo, nv)
	for v := range best {
		best[v] = cheapTwo{math.MaxInt64, math.MaxInt64, -1, -1}
	}
	netout := make([]int64, nv)
	lanes, maxRate, fine := siftScan(x[:m], n.Lower[:m], n.Upper[:m], s.tail[:m], s.head[:m], s.rate[:m], s.state[:m], netout, best)
	if !fine {
		return false, false, nil
	}
	tail, head, rate, upper := s.tail[:m], s.head[:m], s.rate[:m], n.Upper[:m]
	flow, state := s.flow[:m], s.state[:m]
	for v := 0; v < nv; v++ {
		if netout[v] != n.Supply[v] {
			return false, false, nil
		}
	}
	if needChecks(int64(s.nNodes), int64(maxRate)) {
		return false, false, nil
	}
	inC := make([]uint64, (m+63)/64) // the lanes the plan uses
	for _, a := range lanes {
		inC[a>>6] |= 1 << (a & 63)
	}
	// Each node's two cheapest lanes (at zero flow: none is in use), in
	// index order without repeats, read from a bitmap in order.
	cheap := make([]uint64, len(inC))
	for _, b := range best {
		for _, a := range [2]int32{b.a1, b.a2} {
			if a >= 0 {
				cheap[a>>6] |= 1 << (a & 63)
			}
		}
	}
	for w, word := range cheap {
		word &^= inC[w]
		for ; word != 0; word &= word - 1 {
			lanes = append(lanes, int32(w<<6+bits.TrailingZeros64(word)))
		}
	}
	// Until sift returns, the lanes of the restricted network are marked
	// stateTree, so that the pricings pass them over, and every other
	// lane is at zero flow: stateLower, or stateTree when fixed.
	for _, a := range lanes {
		state[a] = stateTree
	}

	// Round 0: solve the restricted network from the plan.
	sub := &Network{Nodes: n.Nodes, Supply: n.Supply, QtyPlaces: n.QtyPlaces, RatePlaces: n.RatePlaces,
		Tail: make([]NodeID, len(lanes)), Head: make([]NodeID, len(lanes)), Rate: make([]int64, len(lanes)),
		Lower: make([]int64, len(lanes)), Upper: make([]int64, len(lanes))}
	start := make([]int64, len(lanes))
	for j, a := range lanes {
		sub.Tail[j], sub.Head[j], sub.Rate[j], sub.Upper[j] = tail[a], head[a], rate[a], upper[a]
		start[j] = x[a]
	}
	sol, err := Solve(sub, SolveOptions{Start: start, Keep: true, keepSim: true})
	if err != nil {
		return false, false, err
	}
	if sol.Status != Optimal {
		return false, false, nil
	}
	basis, t := sol.Basis, sol.sim
	nc := len(lanes)
	var extra []Candidate // lanes added to the kept basis: arcs t.na.. of Add's state
	pivots, cost := sol.Pivots, sol.Cost
	var viol []int32
	var keep siftKeep
	tau := max(int64(maxRate)/siftTauDiv, 1)
	for round := 1; ; round++ {
		// The restricted optimum (state t: its lanes, then its
		// artificial arcs, then the extras) as the whole network's tree.
		na := basis.s.na
		arc := func(p int32) int32 {
			switch {
			case int(p) < nc:
				return lanes[p]
			case int(p) >= na:
				return lanes[nc+int(p)-na]
			}
			return int32(s.artStart) + p - int32(t.artStart) // artificial
		}
		s.copyTree(t, arc)
		s.obj, s.objOK = cost, true
		s.pivots = pivots

		// Price every lane outside the restricted network (whose lanes
		// have the right sign already), or only those kept by the last
		// pricing of every lane when the potentials have moved little
		// since.
		var partial bool
		viol, partial = keep.price(state, rate, tail, head, s.pot[:nv], tau, viol[:0])
		if partial {
			s.siftKept++
		}
		if done := len(viol) == 0; done || round == siftRounds || len(lanes)+len(viol) > m/4 {
			// The restricted network's lanes take their flows and
			// states from t.
			for j, a := range lanes[:nc] {
				flow[a], state[a] = t.flow[j], t.state[j]
			}
			for i, a := range lanes[nc:] {
				if na+i < len(t.flow) {
					flow[a], state[a] = t.flow[na+i], t.state[na+i]
				} else {
					flow[a], state[a] = 0, stateLower // (Add kept the basis)
				}
			}
			return true, done, nil
		}
		for _, a := range viol {
			state[a] = stateTree // (see lanes)
			lanes = append(lanes, a)
			extra = append(extra, Candidate{Tail: tail[a], Head: head[a], Rate: rate[a], Upper: upper[a]})
		}
		add, err := basis.Add(extra)
		if err != nil {
			return false, false, err
		}
		if add.Status != Optimal {
			return false, false, nil
		}
		t, pivots, cost = add.s, pivots+add.Pivots, add.Cost
	}
}

// cheapTwo holds a node's two cheapest lanes (rates r1 <= r2; lane -1:
// none yet).
type cheapTwo struct {
	r1, r2 int64
	a1, a2 int32
}

// siftScan is the first pass of sift over the lanes (arrays of equal
// length): it checks the plan x and the lanes as warmStart's first pass
// does (ok false when one fails: x outside [0, upper] or NoLimit, a
// minimum, a node out of range, a rate of math.MinInt64), sets each
// lane's state (at zero flow, or fixed when upper is 0), adds the plan's
// node balances into netout (ok false on overflow), and returns the lanes
// with flow and the largest |rate|; best gets each node's two cheapest
// lanes at zero flow with room (ties: the first). The checks gather into
// one flag, read after the loop, and the balances are summed over the
// lanes with flow afterwards, so that the loop over all lanes stays short
// (20 % faster than stopping at the first failure); a function of its own
// so that the loop's state stays in registers.
func siftScan(x, lower, upper []int64, tail, head []NodeID, rate []int64, state []int8, netout []int64, best []cheapTwo) (used []int32, maxRate uint64, ok bool) {
	m := len(x)
	lower, upper, tail, head, rate, state = lower[:m], upper[:m], tail[:m], head[:m], rate[:m], state[:m]
	nv := uint32(len(best))
	bad := false
	hi, lo := int64(0), int64(0) // rates
	for a, xa := range x {
		up, t, h, r := upper[a], tail[a], head[a], rate[a]
		// (uint64(xa) > uint64(up) is xa < 0 or xa > up when up >= 0.)
		bad = bad || lower[a] != 0 || up < 0 || uint64(xa) > uint64(up) || xa == inf || uint32(t) >= nv || uint32(h) >= nv
		hi, lo = max(hi, r), min(lo, r)
		st := stateLower
		if up == 0 {
			st = stateTree // fixed
		}
		state[a] = st
		if xa != 0 {
			used = append(used, int32(a))
			continue
		}
		if up == 0 {
			continue // (no room)
		}
		if uint32(t) < nv && r < best[t].r2 {
			best[t].offer(r, int32(a))
		}
		if uint32(h) < nv && r < best[h].r2 {
			best[h].offer(r, int32(a))
		}
	}
	if bad || lo == math.MinInt64 {
		return nil, 0, false
	}
	for _, a := range used {
		t, h, xa := tail[a], head[a], x[a]
		var e1, e2 error
		netout[t], e1 = AddChecked(netout[t], xa)
		netout[h], e2 = SubChecked(netout[h], xa)
		if e1 != nil || e2 != nil {
			return nil, 0, false
		}
	}
	return used, uint64(max(hi, -lo)), true
}

// offer keeps lane a of rate r (below r2) among the two cheapest.
func (b *cheapTwo) offer(r int64, a int32) {
	if r < b.r1 {
		b.r2, b.a2, b.r1, b.a1 = b.r1, b.a1, r, a
	} else {
		b.r2, b.a2 = r, a
	}
}

// siftTauDiv sets the band of reduced costs whose lanes a pricing of
// sift keeps: [0, maxRate/siftTauDiv). On the dense transportation
// network of BENCHMARKS.md (trans_a1e5) the potentials of the second and
// third pricings moved by 46-75 and 1-7 (rates up to 965), so that a
// band of 120 (about a fifth of the lanes) lets both read only the kept
// lanes.
const siftTauDiv = 8

// siftKeep holds the lanes that the last pricing of every lane (under the
// potentials ref) found with a reduced cost in [0, tau): each as a
// sweepArc and its index. Every other lane priced then had at least tau,
// or the wrong sign. A change of potentials moves a lane's reduced cost by
// at most the spread of the change (its largest minus its smallest value
// over the nodes), so while that spread stays at most tau, only the kept
// lanes can have turned wrong.
type siftKeep struct {
	kept []sweepArc // room for |E|/4 + 1
	id   []int32
	ref  []int64
	tau  int64
	ok   bool // the lanes kept are all those of the band
}

// price appends to viol, in index order, the lanes at their lower bound
// (state stateLower: sift passes over the others) whose reduced cost
// under pot (one potential per node) is negative. When the potentials
// have moved by a spread of at most the band's since the last pricing of
// every lane, it reads only the kept lanes (and reports partial);
// otherwise it prices every lane and keeps those with a reduced cost in
// [0, tau), unless there are more than |E|/4 + 1. Unchecked arithmetic:
// potentials and rates must leave (2|V|+3)·max(maxRate, 1) representable
// (needChecks), and tau be at most max(maxRate, 1). Time O(|V|) plus O(|E|)
// for a pricing of every lane or O(kept) otherwise; memory 20 bytes per
// lane kept.
func (k *siftKeep) price(state []int8, rate []int64, tail, head []NodeID, pot []int64, tau int64, viol []int32) (_ []int32, partial bool) {
	if k.ok && k.within(pot) {
		for i := 0; i < len(k.kept); i++ {
			if i = sweepKept(k.kept, pot, i); i == len(k.kept) {
				break
			}
			// (A lane that joined the restricted network since is
			// marked stateTree.)
			if a := k.id[i]; state[a] == stateLower {
				viol = append(viol, a)
			}
		}
		return viol, true
	}
	m := len(state)
	if k.kept == nil {
		k.kept = make([]sweepArc, m/4+1)
		k.id = make([]int32, m/4+1)
	}
	k.ref = append(k.ref[:0], pot...)
	k.tau = tau
	var n, end int
	viol, n, end = siftPriceKeep(state, rate, tail, head, pot, tau, viol, k.kept[:cap(k.kept)], k.id[:cap(k.id)])
	k.kept, k.id, k.ok = k.kept[:n], k.id[:n], end == m
	if end < m {
		viol = siftPrice(state, rate, tail, head, pot, end, viol)
	}
	return viol, false
}

// siftPriceKeep prices lanes as siftPrice does from lane 0, and writes
// into kept and id (of equal length), in index order, the lanes with a
// reduced cost in [0, tau). It stops when they are full, and returns
// viol, the count kept and the index of the first lane it did not price
// (len(state) when it priced every lane). Each lane is written into the
// next free place, which only a lane in the band keeps, so that the loop
// does not branch on the band.
func siftPriceKeep(state []int8, rate []int64, tail, head []NodeID, pot []int64, tau int64, viol []int32, kept []sweepArc, id []int32) ([]int32, int, int) {
	m := len(state)
	rate, tail, head = rate[:m], tail[:m], head[:m]
	id = id[:len(kept)]
	n := 0
	for a, st := range state {
		if st != stateLower {
			continue
		}
		t, h, r := tail[a], head[a], rate[a]
		rc := r + pot[t] - pot[h]
		if rc < 0 {
			viol = append(viol, int32(a))
			continue
		}
		kept[n], id[n] = sweepArc{t, h, r}, int32(a)
		if rc < tau {
			n++
		}
		if n == len(kept) {
			return viol, n, a + 1
		}
	}
	return viol, n, m
}

// siftPrice appends to viol, in index order, the lanes from lo on at their
// lower bound (state stateLower) whose reduced cost under pot is
// negative.
func siftPrice(state []int8, rate []int64, tail, head []NodeID, pot []int64, lo int, viol []int32) []int32 {
	m := len(state)
	rate, tail, head = rate[:m], tail[:m], head[:m]
	for a := lo; a < m; a++ {
		if state[a] == stateLower && rate[a]+pot[tail[a]]-pot[head[a]] < 0 {
			viol = append(viol, int32(a))
		}
	}
	return viol
}

// within reports whether the potentials pot have moved from ref by a
// spread of at most tau. (The changes lie within twice the bound on
// potentials, so lo + tau cannot overflow.) O(|V|).
func (k *siftKeep) within(pot []int64) bool {
	lo, hi := int64(math.MaxInt64), int64(math.MinInt64)
	for v, p := range pot {
		d := p - k.ref[v]
		lo, hi = min(lo, d), max(hi, d)
	}
	return hi <= lo+k.tau
}

// copyTree makes the tree of t, a solver over the same nodes (a restricted
// network of s with the same root), the tree of s, with t's potentials
// (the arc costs agree): arc maps t's arcs to s's. The flows and states of
// the lanes are set by the caller. O(|V|).
func (s *simplex) copyTree(t *simplex, arc func(int32) int32) {
	r := s.root
	copy(s.parent, t.parent)
	copy(s.thread, t.thread)
	copy(s.rthread, t.rthread)
	copy(s.size, t.size)
	copy(s.last, t.last)
	copy(s.pot, t.pot)
	s.drift = t.drift
	for v := int32(0); v < r; v++ {
		a := arc(t.pred[v])
		s.pred[v] = a
		src, _ := s.ends(a)
		s.up[v] = src == v
		s.state[a] = stateTree
	}
	s.treeDone()
}
