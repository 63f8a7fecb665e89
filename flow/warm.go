package flow

import (
	"fmt"
	"math"
	"slices"
)

// warmStart sets the flows from plan x when x is feasible and builds the
// first tree (see "Warm start" at Solve). It returns false when x is not
// feasible (flows and states may have been written then: coldStart resets
// them); otherwise true, the free arcs left out of the tree (which the
// caller pivots in), whether the tree is proved optimal (no lane with the
// wrong sign of reduced cost and no free arc left out: the final pricing
// is not needed), and true when a cycle without limit was found
// (s.cycle); or an error on overflow.
//
// One pass over the lanes checks x and sets flows, states, the plan's
// cost and, per node, the number of lanes at a bound whose spare
// direction leads to it; a second pass lists those lanes (on a dense
// network, see dense, the counts are skipped and the searches sweep the
// lanes instead). Time and memory O(|V|+|E|) plus the searches.
func (s *simplex) warmStart(x []int64) (bool, []int32, bool, bool, error) {
	n := s.net
	m, nv, nn := s.m, len(n.Nodes), s.nNodes
	if len(x) != m {
		return false, nil, false, false, nil
	}
	netout := make([]int64, nn)
	cnt := make([]int32, nn+1) // lanes at a bound, by node (at v+1)
	// The counts serve the lists of the search by lists only; the search
	// by sweeps notes instead the nodes some lane's spare direction
	// leaves from (a part without one can never be raised; the later
	// pivots may make this out of date, which costs sweeps, not
	// correctness: a part hung from R can still be raised).
	dense := s.dense() || s.sweepAlways
	var lead []bool
	if dense {
		lead = make([]bool, nn)
	}
	free := make([]int32, 0, 64)
	var cs costSum
	tail, head, rate, lower, upper := s.tail[:m], s.head[:m], s.rate[:m], n.Lower[:m], n.Upper[:m]
	flow, state := s.flow[:m], s.state[:m]
	x = x[:m]
	hasLower := false
	var maxRate uint64
	for a := 0; a < m; a++ {
		xa, lo, up := x[a], lower[a], upper[a]
		t, h, r := tail[a], head[a], rate[a]
		// The lane checks of n.Validate and the rate bound are done
		// here; the caller validates when this pass stops early.
		if xa < lo || xa > up || xa == inf || lo < 0 || uint32(t) >= uint32(nv) || uint32(h) >= uint32(nv) || r == math.MinInt64 {
			return false, nil, false, false, nil
		}
		maxRate = max(maxRate, uint64(abs64(r)))
		f, c := xa, up
		if lo != 0 {
			hasLower = true
			f = xa - lo
			if up != NoLimit {
				c = up - lo
			}
		}
		flow[a] = f
		if xa != 0 {
			var err error
			if netout[t], err = AddChecked(netout[t], xa); err != nil {
				return false, nil, false, false, nil
			}
			if netout[h], err = SubChecked(netout[h], xa); err != nil {
				return false, nil, false, false, nil
			}
			if r != 0 {
				cs.add(r, xa)
			}
		}
		switch {
		case c == 0:
			state[a] = stateTree // fixed
		case f == 0:
			state[a] = stateLower // spare: tail -> head
			if dense {
				lead[t] = true
			} else {
				cnt[h+1]++
			}
		case f == c:
			state[a] = stateUpper // spare: head -> tail
			if dense {
				lead[h] = true
			} else {
				cnt[t+1]++
			}
		default:
			state[a] = stateTree
			free = append(free, int32(a))
		}
	}
	for v := 0; v < nv; v++ {
		b := n.Supply[v]
		if s.hold >= 0 && b > 0 {
			if netout[v] < 0 || netout[v] > b {
				return false, nil, false, false, nil
			}
		} else if netout[v] != b {
			return false, nil, false, false, nil
		}
	}
	for i, v := range s.holdFrom {
		a := s.holdStart + i
		b := n.Supply[v]
		f := b - netout[v]
		s.flow[a] = f
		switch f {
		case 0:
			s.state[a] = stateLower
			if dense {
				lead[v] = true
			} else {
				cnt[s.hold+1]++
			}
		case b:
			s.state[a] = stateUpper
			if dense {
				lead[s.hold] = true
			} else {
				cnt[v+1]++
			}
		default:
			s.state[a] = stateTree
			free = append(free, int32(a))
		}
	}
	if hasLower {
		s.setShiftedCaps()
	}
	s.checked = needChecks(int64(nn), int64(maxRate))
	var errCost error
	s.obj, errCost = cs.total()
	s.objOK = errCost == nil
	s.artTotal = 0

	// The forest: the free arcs in index order while they close no
	// cycle.
	uf := make([]int32, nn)
	find := func(v int32) int32 {
		for uf[v] != v {
			uf[v] = uf[uf[v]]
			v = uf[v]
		}
		return v
	}
	join := func(a int32) bool {
		t, h := s.ends(a)
		ra, rb := find(t), find(h)
		if ra == rb {
			return false
		}
		if ra < rb {
			uf[rb] = ra
		} else {
			uf[ra] = rb
		}
		return true
	}
	forest := make([]int32, 0, nn)
	var superbasic []int32
	var fadj adjacency // the forest's
	// makeForest fills forest and superbasic.
	makeForest := func() {
		for v := range uf {
			uf[v] = int32(v)
		}
		forest, superbasic = forest[:0], superbasic[:0]
		for _, a := range free {
			if join(a) {
				forest = append(forest, a)
			} else {
				superbasic = append(superbasic, a)
			}
		}
		fadj.build(s, forest, nn)
	}
	// boundState is the state arc a's flow gives it outside the tree.
	boundState := func(a int32) int8 {
		switch f := s.flow[a]; f {
		case 0:
			return stateLower
		case s.capOf(a):
			return stateUpper
		}
		return stateTree
	}
	// count adds (k = 1) or removes (k = -1) arc a at state st from cnt.
	count := func(a int32, st int8, k int32) {
		t, h := s.ends(a)
		switch st {
		case stateLower:
			cnt[h+1] += k
		case stateUpper:
			cnt[t+1] += k
		}
	}
	// withinDone is set by cancel when its passes inside parts ended
	// with no lane left to cancel.
	withinDone := false
	// cancel pivots arcs into the current tree: first the free arcs of
	// freeTry (left out of the forest) towards lower cost, then the arcs
	// of try (at a bound) when eligible, most violating first. With inner
	// (the tree is then the forest's parts hung from R, whose pivots keep
	// each part's nodes; inner the arcs inside parts, see insideArcs), it
	// then passes over inner for the arcs at a bound with the wrong sign
	// from the new potentials, cancels them the same way, and passes
	// again until there are none (withinDone) or after maxWithinPasses
	// passes. Only the arcs of touched (which must hold every tree arc
	// not artificial and every arc of freeTry and try) and those the
	// passes find can change flow; afterwards their states follow their
	// flows (the tree is dropped), free keeps those strictly between
	// their bounds, and the counts cnt follow the states.
	cancel := func(freeTry, try []int32, touched []int32, inner []int32) (bool, error) {
		before := make([]int8, len(touched))
		for i, a := range touched {
			before[i] = boundState(a)
		}
		if err := s.computePotentialsChecked(); err != nil {
			return false, err
		}
		// The pivots below share one copy of the tree arcs' flows.
		s.beginCopies()
		defer func() {
			if s.copies {
				s.flushCopies()
			}
		}()
		for _, a := range freeTry {
			if s.state[a] != stateTree {
				continue // reached a bound already
			}
			if unb, err := s.pivotFree(a); err != nil || unb {
				return unb, err
			}
		}
		var seen []uint64 // the arcs of touched, once the passes add to them
		withinDone = false
		for pass := 0; ; pass++ {
			// Most violating first (after a perturbation, the lane that
			// left the cycle is among them, and its pivot restores it):
			// a few rounds of picking the most violating arc still
			// eligible, then the rest in order.
			rest := append([]int32(nil), try...)
			for k := 0; len(rest) > 0; k++ {
				best, bestR := -1, int64(0)
				keep := rest[:0]
				for _, a := range rest {
					r, ok, err := s.eligible(a)
					if err != nil {
						return false, err
					}
					if !ok {
						continue
					}
					if k >= maxPicks {
						if unb, err := s.pivot(a, s.state[a], r); err != nil || unb {
							return unb, err
						}
						continue
					}
					if r = abs64(r); best < 0 || r > bestR {
						best, bestR = len(keep), r
					}
					keep = append(keep, a)
				}
				if best < 0 {
					break
				}
				a := keep[best]
				rest = append(keep[:best], keep[best+1:]...)
				r, _ := s.reducedChecked(a)
				if unb, err := s.pivot(a, s.state[a], r); err != nil || unb {
					return unb, err
				}
			}
			if inner == nil || pass == s.maxPasses {
				break
			}
			// The pivots moved the potentials of the parts they went
			// through, and lanes inside those parts may now have the
			// wrong sign: cancel them too, pass after pass, until there
			// are none (see maxWithinPasses). (A cycle inside a part
			// does not pass through R.)
			try = s.partViolations(inner)
			s.withinPasses++
			if len(try) == 0 {
				withinDone = true
				break
			}
			if seen == nil {
				seen = make([]uint64, (s.artStart+63)/64)
				for _, a := range touched {
					seen[a>>6] |= 1 << (a & 63)
				}
			}
			for _, a := range try {
				if seen[a>>6]&(1<<(a&63)) == 0 {
					seen[a>>6] |= 1 << (a & 63)
					before = append(before, s.state[a])
					touched = append(touched, a)
				}
			}
		}
		s.flushCopies()
		free = free[:0]
		for i, a := range touched {
			st := boundState(a)
			s.state[a] = st
			if st == stateTree {
				free = append(free, a)
			}
			if st != before[i] {
				count(a, before[i], -1)
				count(a, st, 1)
			}
		}
		return false, nil
	}
	// cancelInTree pivots the arcs of try into the current tree (see
	// cancel; the tree arcs that are not artificial may change flow).
	// The free lanes outside the tree (superbasic) are touched too, so
	// that they stay in free.
	cancelInTree := func(try []int32) (bool, error) {
		// Each arc once (cancel's counts follow each listed arc): the
		// tree just built may hold an arc of try (at a bound, so
		// degenerate) or a free lane of superbasic; the tree arcs are
		// listed after them.
		touched := make([]int32, 0, len(try)+len(superbasic)+nn)
		for _, list := range [][]int32{try, superbasic} {
			for _, a := range list {
				if !s.isTreeArc(a) {
					touched = append(touched, a)
				}
			}
		}
		for v := 0; v < nn; v++ {
			if a := s.pred[v]; int(a) < s.artStart {
				touched = append(touched, a)
			}
		}
		return cancel(nil, try, touched, nil)
	}
	// setArtTree sets the tree to the forest with each part hung from R
	// by the artificial arc of its smallest node: a strongly feasible
	// tree of free arcs.
	setArtTree := func() {
		s.setForestTree(forest, &fadj, func(v int32) bool { return find(v) == v })
	}
	// parts builds the forest of free lanes; when some free lanes close
	// cycles and cancelFree is set it first cancels those (in a tree of
	// the parts hung from R, which it leaves set: treeSet), so the parts'
	// potentials come from a plan without cycles of free lanes (a plan
	// moved around a few cycles from an optimum is then usually back at
	// it). It returns each node's part and the parts' potentials.
	parts := func(cancelFree bool) (comp []int32, rho []int64, treeSet, unb bool, err error) {
		makeForest()
		if cancelFree && len(superbasic) > 0 {
			setArtTree()
			touched := append([]int32(nil), free...)
			freeTry := append([]int32(nil), superbasic...)
			if unb, err := cancel(freeTry, nil, touched, nil); err != nil || unb {
				return nil, nil, true, unb, err
			}
			makeForest()
			treeSet = true
		}
		comp, rho = s.forestParts(forest, &fadj)
		return comp, rho, treeSet, false, nil
	}
	if dense && s.canSweep(int64(maxRate)) {
		// A dense network: searches by sweeps over the lanes (no lists;
		// see sweepTree), each started from the tree the last one left.
		var buf sweepBuf
		s.swept = true
		viols, tries := 0, 0
		hasTree := false  // the current tree holds the forest, potentials current
		searched := false // and was built by a search that ran to the end
		for {
			comp, rho, treeSet, unb, err := parts(true)
			if err != nil || unb {
				return true, nil, false, unb, err
			}
			hasTree = hasTree || treeSet
			if !hasTree {
				setArtTree()
				s.computePotentials()
				hasTree = true
			}
			res := s.sweepTree(forest, comp, rho, lead, int64(maxRate), searched, viols < maxSweepViols, &buf)
			var try []int32
			searched = len(res.viol) == 0
			switch {
			case len(res.viol) > 0:
				// Lanes at a bound inside a part with the wrong sign of
				// reduced cost close cycles of negative cost with the
				// forest: cancel them first (in the tree the first sweep
				// left, which the next search starts from).
				try = res.viol
				viols++
			case len(res.refused) > 0 && tries < maxSweepTries:
				// Pivot the lanes closing cycles of negative cost into
				// the tree just built, then search again from it.
				try = res.refused
				tries++
			default:
				return true, superbasic, res.optimal && len(superbasic) == 0, false, nil
			}
			if unb, err := cancelInTree(try); err != nil || unb {
				return true, nil, false, unb, err
			}
		}
	}
	if dense {
		s.boundCounts(cnt)
	}
	insideRounds := maxInsideRounds
	if s.noRounds {
		insideRounds = 0
	}
	for round := 0; ; round++ {
		comp, rho, _, unb, err := parts(false)
		if err != nil || unb {
			return true, nil, false, unb, err
		}
		// Cancelling changes the forest, and with it the lanes inside
		// parts: more of them may now have the wrong sign. Many such
		// lanes make the search refuse many more (the parts they join
		// rise against each other), so they are cancelled first: the
		// first round counts them in a pass of its own (there are
		// usually hundreds), and its cancelling passes over the lanes
		// again until none is left inside the parts it started from.
		// The parts of the next round split those (its forest is the
		// tree's lanes strictly between their bounds), with the same
		// potentials up to a constant in each, so it finds none either.
		// A later round that does not follow such passes (after a
		// search, or when they stopped at maxWithinPasses) counts them
		// while listing the lanes for the search, and gives the lists up
		// at the minInsideViol-th.
		var viol, inside, inner []int32
		var pl partLists
		listed := false
		if s.checkRounds && round > 0 {
			s.checkRound(cnt, comp, rho, withinDone)
		}
		switch {
		case round >= insideRounds:
		case round == 0 || len(superbasic) > 0:
			viol, inner = s.insideArcs(comp, rho)
		default:
			if pl, inside = s.buildPartLists(cnt, comp, rho, minInsideViol); len(inside) >= minInsideViol {
				viol, inside = inside, nil // the lists were given up
			} else {
				listed = true
			}
		}
		if len(viol) > 0 || round < insideRounds && len(superbasic) > 0 {
			// Free lanes left out of the forest close cycles with it, and
			// lanes at a bound inside a part with the wrong sign of
			// reduced cost close cycles of negative cost: cancel them in
			// the forest (each part hung from R; the free lanes first, in
			// the direction that lowers the cost, as parts does) and start
			// again. (One tree for both saves a tree and a forest per
			// repair.)
			setArtTree()
			touched := append(append([]int32(nil), free...), viol...)
			freeTry := append([]int32(nil), superbasic...)
			if inner == nil {
				_, inner = s.insideArcs(comp, rho) // (none in checked arithmetic)
			}
			if unb, err := cancel(freeTry, viol, touched, inner); err != nil || unb {
				return true, nil, false, unb, err
			}
			continue
		}
		withinDone = false
		if !listed {
			pl, inside = s.buildPartLists(cnt, comp, rho, 0)
		}
		try, proved, pile := s.completeTree(forest, comp, rho, pl, inside)
		if len(try) > 0 && (round < maxRounds || pile && !s.piled) {
			// Lanes the search found closing cycles of negative cost
			// (across parts, or inside one): pivot them into the tree
			// just built, then search again from the new plan. (Once
			// more after a pile on the search's root part: see
			// pileRefusals.)
			s.piled = s.piled || round >= maxRounds
			if unb, err := cancelInTree(try); err != nil || unb {
				return true, nil, false, unb, err
			}
			continue
		}
		// (Proved: the final pricing is skipped.)
		return true, superbasic, proved && len(superbasic) == 0, false, nil
	}
}

// maxPicks bounds the rounds of picking the most violating arc when a
// warm start cancels cycles of negative cost.
const maxPicks = 32

// maxInsideRounds bounds the rounds of a warm start that cancel lanes
// inside parts with the wrong sign of reduced cost, and minInsideViol is
// the number of such lanes from which a round after the first one runs.
// A round costs a pass over the lanes and a rebuild of the forest, much
// less than a search; when the perturbation of a plan leaves many such
// lanes after the first round, the search refuses hundreds of lanes and
// block search then needs thousands of pivots (netgen_a1e5, seed 11:
// 148 lanes after the first round, 3,149 pivots; with the extra rounds
// 163 pivots; see BENCHMARKS.md, fourth session). Since the passes
// inside parts (maxWithinPasses), a round after the first runs only after
// a search or when those passes stopped at their bound.
const (
	maxInsideRounds = 8
	minInsideViol   = 16
)

// maxWithinPasses bounds the passes over the lanes inside parts of one
// cancelling in the rounds of a warm start (see cancel in warmStart). A
// pass reads only those lanes (listed by the round's check: a few
// thousand on the general networks of BENCHMARKS.md), where a round
// after the first rebuilt the forest, listed all lanes and rebuilt the
// tree and its potentials for two or three pivots; and the passes also
// cancel the lanes between the parts the next forest splits a part into,
// which the search would refuse. On the 180 repairs of the general
// networks of BENCHMARKS.md (fifteenth session) a cancelling made 1-10
// passes, the last one finding nothing. Repairs that used to run later
// rounds took 0.46-0.65x the instructions (cachegrind), the others
// about the same, and the worst repair of each network against LEMON
// went from 0.20-0.28 to 0.13-0.20.
const maxWithinPasses = 16

// maxRounds bounds the rounds of a warm start, counted from the first and
// including the rounds that cancel lanes inside parts, after which the
// lanes a search refuses are still cancelled and the search made again.
// With 1, that happens only when the first search comes before any round
// inside parts. A second round (then a third search) cut the pivots but
// cost more than the block search spends on them (the repairs of
// BENCHMARKS.md, third session: 0.74-0.91x of the time with two rounds on
// general, sparse and, in the restricted solves of sifting, dense
// networks). Since the rounds inside parts exist, the first search on the
// generated general and sparse transportation networks always follows one
// of them, so the refusals go to block search. Counting the refusal round
// apart (one search more after the rounds inside parts) made the repairs
// of netgen_a1e5 seed 2006 1.24x slower in all (seventh session); only the
// seed with a pile of refusals gained.
const maxRounds = 1

// isTreeArc reports whether arc a joins one of its ends to its parent.
func (s *simplex) isTreeArc(a int32) bool {
	t, h := s.ends(a)
	return s.pred[t] == a || s.pred[h] == a
}

// pivotFree pivots the free arc a in, towards lower cost; on a tie
// towards less flow (a finite limit, so a zero-cost cycle is never called
// unbounded). A free arc the tree already holds (a tree built after the
// list of free arcs may take one in) is left alone: its cycle would be
// the arc itself, and pivot keeps a tree arc's flow apart from the lane
// arrays while it runs.
func (s *simplex) pivotFree(a int32) (bool, error) {
	if s.isTreeArc(a) {
		return false, nil
	}
	r, err := s.reducedChecked(a)
	if err != nil {
		return false, err
	}
	dir := stateUpper
	if r < 0 {
		dir = stateLower
	}
	return s.pivot(a, dir, r)
}

// forestParts returns each node's part of the forest (g: its adjacency),
// named by its smallest node, and the potentials within parts: reduced
// cost 0 on forest arcs, 0 at each part's smallest node; all zero (no
// guidance and no overflow risk) when potentials need checked arithmetic.
// O(|V|).
func (s *simplex) forestParts(forest []int32, g *adjacency) (comp []int32, rho []int64) {
	nn := s.nNodes
	comp = make([]int32, nn)
	for v := range comp {
		comp[v] = -1
	}
	rho = make([]int64, nn)
	withRho := !s.checked
	stack := make([]int32, 0, 64)
	for v0 := int32(0); v0 < int32(nn); v0++ {
		if comp[v0] >= 0 {
			continue
		}
		comp[v0] = v0
		stack = append(stack[:0], v0)
		for len(stack) > 0 {
			v := stack[len(stack)-1]
			stack = stack[:len(stack)-1]
			for _, i := range g.pos[g.start[v]:g.start[v+1]] {
				t, h := g.ends[2*i], g.ends[2*i+1]
				w := t
				if w == v {
					w = h
				}
				if comp[w] >= 0 {
					continue
				}
				comp[w] = v0
				// r(a) = cost + p(tail) - p(head) = 0
				switch {
				case !withRho:
				case t == w:
					rho[w] = rho[v] - s.costOf(forest[i])
				default:
					rho[w] = rho[v] + s.costOf(forest[i])
				}
				stack = append(stack, w)
			}
		}
	}
	return comp, rho
}

// partArc is an arc at a bound between two parts of the forest, listed
// under the part its spare direction leads to (the head's part at the
// lower bound, the tail's at capacity): arc, d the part at its other end,
// and k the offset of d, less the listing part's offset, that gives the
// arc reduced cost 0 (minus its reduced cost from the parts' potentials
// rho at the lower bound, plus it at capacity; see partSearch for
// offsets).
type partArc struct {
	arc, d int32
	k      int64
}

// partLists lists arcs at a bound between parts by the part they are
// listed under: part c's are list[start[c]:end[c]].
type partLists struct {
	list       []partArc
	start, end []int32
}

// buildPartLists lists the arcs at a bound that join two parts of the
// forest (comp, with potentials within parts rho) by part, in index order;
// the slots come from the per-node counts cnt (at v+1, arcs inside parts
// included). Arcs at a bound inside a part whose reduced cost from rho has
// the wrong sign are returned in viol (none in checked arithmetic, where
// rho is all zero). When giveUp > 0 and viol reaches that many arcs, the
// listing stops there (pl is then incomplete, not to be used) and the rest
// of the pass only collects viol (insideViolationsFrom). One pass over
// the arcs; 16 bytes per listed arc.
func (s *simplex) buildPartLists(cnt, comp []int32, rho []int64, giveUp int) (pl partLists, viol []int32) {
	nn, m := s.nNodes, s.m
	pstart := make([]int32, nn+1)
	for v := 0; v < nn; v++ {
		pstart[comp[v]+1] += cnt[v+1]
	}
	for c := 0; c < nn; c++ {
		pstart[c+1] += pstart[c]
	}
	list := make([]partArc, pstart[nn])
	pstart = pstart[:nn]
	pend := make([]int32, nn)
	copy(pend, pstart)
	check := !s.checked
	// add lists arc a (cost r, state st) unless it lies inside a part.
	// (rc is unchecked: rho is all zero in checked arithmetic.)
	add := func(a int32, t, h int32, r int64, st int8) {
		ct, ch := comp[t], comp[h]
		rc := r + rho[t] - rho[h]
		switch {
		case ct == ch:
			if check && int64(st)*rc < 0 {
				viol = append(viol, a)
			}
		case st == stateLower:
			list[pend[ch]] = partArc{a, ct, -rc}
			pend[ch]++
		default:
			list[pend[ct]] = partArc{a, ch, rc}
			pend[ct]++
		}
	}
	tail, head, rate, state := s.tail[:m], s.head[:m], s.rate[:m], s.state[:m]
	for a, st := range state {
		if st != stateTree {
			add(int32(a), tail[a], head[a], rate[a], st)
			if giveUp > 0 && len(viol) >= giveUp {
				return partLists{}, s.insideViolationsFrom(a+1, comp, rho, viol)
			}
		}
	}
	for a := int32(s.holdStart); a < int32(s.artStart); a++ {
		if st := s.state[a]; st != stateTree {
			t, h := s.ends(a)
			add(a, t, h, s.costOf(a), st)
		}
	}
	return partLists{list, pstart, pend}, viol
}

// insideViolationsFrom appends to viol the lanes from lane from on, then
// the hold arcs, that are at a bound inside a part (comp) and whose
// reduced cost from the parts' potentials rho has the wrong sign: each
// closes a cycle of negative cost with the forest (none in checked
// arithmetic, where rho is all zero: the callers skip it then).
func (s *simplex) insideViolationsFrom(from int, comp []int32, rho []int64, viol []int32) []int32 {
	m := s.m
	tail, head, rate, state := s.tail[:m], s.head[:m], s.rate[:m], s.state[:m]
	for a := from; a < m; a++ {
		if t, h, st := tail[a], head[a], state[a]; st != stateTree && comp[t] == comp[h] && int64(st)*(rate[a]+rho[t]-rho[h]) < 0 {
			viol = append(viol, int32(a))
		}
	}
	for a := s.holdStart; a < s.artStart; a++ {
		if t, h := s.ends(int32(a)); s.state[a] != stateTree && comp[t] == comp[h] && int64(s.state[a])*(rho[t]-rho[h]) < 0 {
			viol = append(viol, int32(a))
		}
	}
	return viol
}

// insideArcs returns the lanes and hold arcs at a bound inside a part
// (comp) whose reduced cost from the parts' potentials rho has the wrong
// sign (as insideViolationsFrom), and all lanes and hold arcs whose ends
// lie in one part, whatever their state: both in index order, both empty
// in checked arithmetic. One pass over the arcs; 4 bytes per arc inside
// parts.
func (s *simplex) insideArcs(comp []int32, rho []int64) (viol, inner []int32) {
	if s.checked {
		return nil, nil
	}
	m := s.m
	tail, head, rate, state := s.tail[:m], s.head[:m], s.rate[:m], s.state[:m]
	for a := 0; a < m; a++ {
		t, h := tail[a], head[a]
		if comp[t] != comp[h] {
			continue
		}
		inner = append(inner, int32(a))
		if st := state[a]; st != stateTree && int64(st)*(rate[a]+rho[t]-rho[h]) < 0 {
			viol = append(viol, int32(a))
		}
	}
	for a := s.holdStart; a < s.artStart; a++ {
		t, h := s.ends(int32(a))
		if comp[t] != comp[h] {
			continue
		}
		inner = append(inner, int32(a))
		if st := s.state[a]; st != stateTree && int64(st)*(rho[t]-rho[h]) < 0 {
			viol = append(viol, int32(a))
		}
	}
	return viol, inner
}

// partViolations returns the arcs of inner at a bound whose reduced cost
// from the current potentials has the wrong sign, in the order of inner.
// O(len(inner)); only in unchecked arithmetic.
func (s *simplex) partViolations(inner []int32) (viol []int32) {
	m := int32(s.m)
	cost, state, pot, tail, head := s.cost[:m], s.state, s.pot, s.tail[:m], s.head[:m]
	for _, a := range inner {
		st := state[a]
		if st == stateTree {
			continue
		}
		var r int64
		if a < m {
			r = cost[a] + pot[tail[a]] - pot[head[a]]
		} else {
			r = s.reduced(a)
		}
		if int64(st)*r < 0 {
			viol = append(viol, a)
		}
	}
	return viol
}

// checkRound records in s.faults what is wrong at the start of a round of
// the warm start after the first (SolveOptions.checkRounds, for tests):
// counts cnt that do not follow the states, and, when the cancelling
// before it ended its passes inside parts with none left (done), a lane
// inside a part of comp whose reduced cost from rho has the wrong sign.
func (s *simplex) checkRound(cnt, comp []int32, rho []int64, done bool) {
	want := make([]int32, len(cnt))
	s.boundCounts(want)
	if !slices.Equal(cnt, want) {
		s.faults = append(s.faults, "counts of lanes at a bound do not follow their states")
	}
	if v, _ := s.insideArcs(comp, rho); done && len(v) > 0 {
		s.faults = append(s.faults, fmt.Sprintf("%d lanes inside parts with the wrong sign after passes that found none", len(v)))
	}
}

// partMembers lists the nodes of each part (comp[v] is v's part, numbered
// by a node), in node order: part c's members are
// members[cstart[c]:cstart[c+1]]. O(nn).
func partMembers(comp []int32, nn int) (cstart, members []int32) {
	cstart = make([]int32, nn+1)
	for v := 0; v < nn; v++ {
		cstart[comp[v]+1]++
	}
	for v := 0; v < nn; v++ {
		cstart[v+1] += cstart[v]
	}
	members = make([]int32, nn)
	cfill := make([]int32, nn)
	copy(cfill, cstart[:nn])
	for v := 0; v < nn; v++ {
		c := comp[v]
		members[cfill[c]] = int32(v)
		cfill[c]++
	}
	return cstart, members
}

// completeTree joins the parts of the forest (comp: each node's part, by
// its smallest node; rho: potentials within parts) into a strongly
// feasible spanning tree and makes it the current tree (see "Warm start"
// at Solve). The arcs at a bound between parts are listed by the part
// their spare direction leads to (pl, from buildPartLists); inside are the
// arcs at a bound inside parts with the wrong sign of reduced cost. It
// returns, sorted, up to maxRefused arcs found closing cycles of negative
// cost: arcs between parts the search refused, and those of inside. It
// also reports whether the first search made a pile of refusals on its
// root part (see pileRefusals) and whether the tree is proved optimal:
// when nothing was refused, one search reached every part and ran to the
// end (not capped, unchecked arithmetic), every listed arc was read after
// the offset of its part was final and kept the right sign, and the lists
// hold every arc at a bound. Time O(|V|) plus the search, capped at about
// eight passes over the lists.
func (s *simplex) completeTree(forest, comp []int32, rho []int64, pl partLists, inside []int32) (refused []int32, proved, pile bool) {
	nn := s.nNodes
	q := newPartSearch(nn, !s.checked)
	q.limit = 8*(len(pl.list)+nn) + 1024
	for _, a := range inside {
		q.refuse(a)
	}
	search := func(r int32) {
		q.start(r, -rho[r])
		for {
			c := q.next()
			if c < 0 {
				break
			}
			q.scanPart(pl.list[pl.start[c]:pl.end[c]], c)
			if q.work > q.limit {
				q.improve = false
			}
		}
	}
	if nn > 0 {
		first := int32(0)
		if s.hold >= 0 {
			first = comp[s.hold]
		} else {
			// The largest part.
			size := make([]int32, nn)
			for _, c := range comp {
				size[c]++
			}
			for c := int32(0); c < int32(nn); c++ {
				if size[c] > size[first] {
					first = c
				}
			}
		}
		q.root = first
		search(first)
		pile = isPile(q.nref, q.rootRef) || s.pileAlways && q.nref > 0
	}
	// Parts not reached (or dropped after the search was capped) start
	// searches of their own, hanging from R.
	for pass := 0; pass < 2; pass++ {
		for v := int32(0); v < int32(nn); v++ {
			if comp[v] == v && !q.ps[v].act {
				search(v)
			}
		}
	}

	// The tree: forest, the arcs joining parts, and the artificial arcs of
	// the search roots (zero flow, directed to R).
	tree := append(make([]int32, 0, nn), forest...)
	for v := int32(0); v < int32(nn); v++ {
		if comp[v] != v {
			continue
		}
		if q.par[v] >= 0 {
			tree = append(tree, q.par[v])
		} else {
			tree = append(tree, int32(s.artStart)+v)
		}
	}
	s.setTree(tree)
	proved = len(q.refused) == 0 && q.improve && q.cur == 1
	slices.Sort(q.refused)
	return slices.Compact(q.refused), proved, pile
}

// A first search that refuses at least pileRefusals times (counting each
// time an arc is refused), all but at most one in pileShare of them arcs
// that would raise the search's root part, has made a pile: the
// root part's own potentials are wrong (a lane inside it, strictly between
// its bounds, should be at a bound), every part the search hangs below it
// inherits the error, and block search would need thousands of pivots to
// undo the tree built from them. A warm start then cancels the refused
// lanes and searches once more, even after rounds inside parts (which
// maxRounds does not allow otherwise). When the refusals spread over
// other parts, the plan has several wrong lanes, a second search refuses
// as many again, and it does not pay.
//
// Counted on the repairs of BENCHMARKS.md (fourteenth session: 8
// general networks of 10^5 lanes, 20 perturbations each): the three
// piles, 1,003-1,420 refusals, went 99.3-100 % through the root and made
// 2,674-3,975 pivots; a second search cut the instructions of those
// repairs to 0.54x, 0.56x and 0.99x. Below them the most refusals were
// 187, at most 961 pivots a repair, and a second search there cost more
// than it saved (1.09x and 1.25x the instructions with a threshold of
// 128). The eighth session's pile had 6,748 refusals. The sparse
// transportation instances refused up to 49,421 times, at most 94 %
// through the root.
const (
	pileRefusals = 512
	pileShare    = 100
)

// isPile reports whether a first search that refused nref times, rootRef
// of them through its root part, made a pile (see pileRefusals).
func isPile(nref, rootRef int) bool {
	return nref >= pileRefusals && rootRef >= nref-nref/pileShare
}

// partSearch is the label-correcting search of completeTree over the
// parts of a forest (indexed by their smallest node): a part's lab is
// its offset (p(v) = rho[v] + lab[part]) and par the arc to its parent
// part. The active parts of a search form a tree kept as a preorder list
// (tnx, tpv, dep) so that a part whose offset rises can drop its subtree
// (whose offsets are then out of date) and a cycle of negative cost is
// seen as a part rising below itself. An arc scanned reads its list entry
// (which holds the part at its other end and the offset it gives) and
// that part's state (offset, search number, flags): one cache line at a
// random place per arc.
type partSearch struct {
	ps    []searchPart
	par   []int32
	ppart []int32 // parent part
	tnx   []int32
	tpv   []int32
	dep   []int32
	queue []int32
	qh    int
	qt    int
	// improve: offsets may still rise (false once work passed limit, or
	// in checked arithmetic, where rho is all zero and the first tight
	// arc found is kept).
	improve     bool
	work, limit int
	cur         int32 // the current search's number
	refused     []int32
	// nref counts the arcs refused (each time), rootRef those that would
	// have raised root, the first search's part.
	nref, rootRef int
	root          int32
}

type searchPart struct {
	lab      int64
	srch     int32 // search number; 0: not reached
	act, inq bool
}

func newPartSearch(nn int, improve bool) *partSearch {
	return &partSearch{
		ps:      make([]searchPart, nn),
		par:     make([]int32, nn),
		ppart:   make([]int32, nn),
		tnx:     make([]int32, nn),
		tpv:     make([]int32, nn),
		dep:     make([]int32, nn),
		queue:   make([]int32, nn+1),
		improve: improve,
	}
}

// start begins a new search from part r with offset lab.
func (q *partSearch) start(r int32, lab int64) {
	q.cur++
	q.ps[r].lab, q.ps[r].srch, q.ps[r].act = lab, q.cur, true
	q.par[r] = -1
	q.tnx[r], q.tpv[r], q.dep[r] = -1, -1, 0
	q.push(r)
}

func (q *partSearch) push(c int32) {
	q.ps[c].inq = true
	q.queue[q.qt] = c
	if q.qt++; q.qt == len(q.queue) {
		q.qt = 0
	}
}

// next returns the next active part to scan, or -1 when the queue is
// empty.
func (q *partSearch) next() int32 {
	for q.qh != q.qt {
		c := q.queue[q.qh]
		if q.qh++; q.qh == len(q.queue) {
			q.qh = 0
		}
		q.ps[c].inq = false
		if q.ps[c].act {
			return c
		}
	}
	return -1
}

// scanPart scans the arcs listed under part c. The loop is kept small
// (raising a part is out of line) so that its state stays in registers.
// (c's offset cannot change during the scan: no arc listed under c ends
// in c, and a part rising below itself is refused.)
func (q *partSearch) scanPart(arcs []partArc, c int32) {
	ps := q.ps
	cur, improve := q.cur, q.improve
	lab := ps[c].lab
	q.work += len(arcs)
	for _, b := range arcs {
		pd := &ps[b.d]
		sd := pd.srch
		if sd != 0 && sd != cur {
			continue
		}
		nl := lab + b.k
		if sd == cur && (!improve || nl <= pd.lab) {
			continue
		}
		q.raise(c, b.d, b.arc, nl)
	}
}

// refuse notes arc a as closing a cycle of negative cost (up to
// maxRefused arcs).
func (q *partSearch) refuse(a int32) {
	if len(q.refused) < maxRefused {
		q.refused = append(q.refused, a)
	}
}

// raise gives part d offset nl, hung below part c by arc a (joining d at
// its end in d), unless that closes a cycle of negative cost (refused).
func (q *partSearch) raise(c, d, a int32, nl int64) {
	pd := &q.ps[d]
	if pd.srch == q.cur && pd.act && !q.detach(d, c) {
		q.nref++
		if d == q.root {
			q.rootRef++
		}
		q.refuse(a)
		return
	}
	pd.lab, pd.srch, pd.act = nl, q.cur, true
	q.par[d], q.ppart[d] = a, c
	nx := q.tnx[c]
	q.tnx[c], q.tpv[d], q.tnx[d] = d, c, nx
	if nx >= 0 {
		q.tpv[nx] = d
	}
	q.dep[d] = q.dep[c] + 1
	if !pd.inq {
		q.push(d)
	}
}

// detach drops the subtree of d from the search tree unless c is in it
// (found by climbing from c to the depth of d).
func (q *partSearch) detach(d, c int32) bool {
	dep, tnx, tpv := q.dep, q.tnx, q.tpv
	if dep[c] > dep[d] {
		y := c
		for dep[y] > dep[d] {
			y = q.ppart[y]
		}
		if y == d {
			return false
		}
	}
	y := tnx[d]
	for y >= 0 && dep[y] > dep[d] {
		y = tnx[y]
	}
	p := tpv[d]
	if p >= 0 {
		tnx[p] = y
	}
	if y >= 0 {
		tpv[y] = p
	}
	for z := d; z != y; z = tnx[z] {
		q.ps[z].act = false
	}
	return true
}

// maxRefused caps the arcs closing cycles of negative cost that one
// search of a warm start reports.
const maxRefused = 1024
