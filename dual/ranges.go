package dual

import (
	"fmt"
	"math"
	"sort"

	"lanecert/flow"
)

// LaneRange says how far a lane's rate can move before an optimal plan
// stops being optimal (all in rate units). The plan stays optimal for every
// rate in [Lower, Upper]; HasLower (HasUpper) false means no limit below
// (above).
//
//   - An unused lane (at its minimum) has only a lower limit: its break-even
//     rate. At or below it, more of the lane would lower or tie the total
//     cost; the saving per unit is Lower minus the new rate.
//   - A lane in use has both limits; a lane in use on a cycle of lanes in use
//     with zero total cost has Lower = Upper = its rate.
//   - A lane at capacity has only an upper limit, and CapacityValue: what one
//     more unit of capacity would save (its reduced cost, made exact over the
//     residual network), for at least CapacityUnits more units.
//   - A fixed lane (minimum = capacity) has no limits.
//
// The limits are exact also when the plan is degenerate: Lower is the rate
// minus the reduced cost of the cheapest route back through the residual
// network, Upper the rate plus that of the cheapest route forward. ByRoute
// reports whether such a route between pieces of lanes in use was needed
// (false: the limit is a difference of node potentials).
type LaneRange struct {
	Lower, Upper       int64
	HasLower, HasUpper bool
	ByRoute            bool
	CapacityValue      int64
	// LowerBy and UpperBy name a lane that starts or stops being used when
	// the rate passes the limit (-1 when none or the lane itself).
	LowerBy, UpperBy flow.LaneID
}

// NodePrice is a node's marginal landed cost. Up is the cost of one more
// unit demanded at the node (supplied by its piece's anchor: the hold node
// when supply exceeds demand, else the origin with potential 0); Down is
// the saving of one unit less. They differ only for degenerate plans; both
// are exact. HasUp (HasDown) is false when no more (less) can be delivered,
// or when no origin shares the node's piece of network.
type NodePrice struct {
	Up, Down       int64
	HasUp, HasDown bool
}

// Sensitivity holds the ranges of every lane and the prices of every node
// of an optimal plan.
type Sensitivity struct {
	Lanes []LaneRange
	Nodes []NodePrice
	// Routes counts the shortest-route searches that were needed.
	Routes int
}

// Ranges computes the sensitivity of plan y, which must be optimal with
// valid potentials p (as Check returns them). Cost: O(|E| log |E|) when the
// lanes in use form one piece; otherwise searches over the k pieces, on the
// graph with one edge per ordered pair of pieces (k' edges): per source
// piece of unused lanes (with distances through the best-connected piece
// bounding each search, when there are several sources), per lane at
// capacity between pieces, and two per lane in use, started from the
// pieces next to one side of its cut (side tables, O(|V|·k) memory per
// piece at most, give the cheapest edges) and stopped once they cannot beat
// the best route. Each is O((k + k') log k) at worst and usually stopped
// early. Memory O(|V| + |E|) besides the side tables (at most 2^20 cells).
func Ranges(n *flow.Network, y []int64, p []int64) (*Sensitivity, error) {
	return ranges(n, y, p, false)
}

// ranges is Ranges; with checkSums the side searches check every sum for
// overflow even when no route can overflow (tests compare the two).
func ranges(n *flow.Network, y []int64, p []int64, checkSums bool) (*Sensitivity, error) {
	f, err := flow.CheckPlan(n, y)
	if err != nil {
		return nil, err
	}
	if !f.Feasible() {
		return nil, fmt.Errorf("dual: ranges need a feasible plan")
	}
	g := newGraph(n, y, f)
	if _, err := g.forest(); err != nil {
		return nil, err
	}
	r := newRanger(g, p)
	if err := r.buildEdges(); err != nil {
		return nil, err
	}
	r.sumsFit = r.sumsFit && !checkSums
	s := &Sensitivity{Lanes: make([]LaneRange, g.m), Nodes: make([]NodePrice, g.nn)}
	if err := r.lanes(s); err != nil {
		return nil, err
	}
	if err := r.nodes(s); err != nil {
		return nil, err
	}
	s.Routes = r.searches
	return s, nil
}

// ranger answers shortest-route questions over the pieces of a plan.
type ranger struct {
	g *graph
	p []int64 // potentials, the hold node's (0) last
	k int     // pieces

	// Residual arcs that are not forest arcs, by the piece of their
	// from-node: from, to (nodes), w (reduced cost >= 0), arc, fwd.
	start    []int32
	from, to []int32
	w        []int64
	arcOf    []int32
	fwd      []bool
	// Reverse index: edges by the piece of their to-node.
	rstart []int32
	redges []int32

	tin, tout []int32 // forest subtree intervals

	// inner holds the residual edges inside pieces; leave[v] (enter[v]) is
	// the least reduced cost of an inner edge leaving (entering) the subtree
	// of v within its piece, leaveBy/enterBy its arc (-1: none).
	inner            []innerEdge
	leave, enter     []int64
	leaveBy, enterBy []int32

	// reach[c] is the set of strongly connected groups of pieces that group
	// c reaches (nil when there are too many pieces to keep it).
	group []int32
	reach [][]uint64

	// The pieces as a graph: one edge per ordered pair of pieces with an
	// edge between them (fwd by from-piece, rev by to-piece), and per edge
	// the pieces of its ends.
	fwdG, revG pieceGraph
	pFrom, pTo []int32
	arcEdge    []int32 // per arc: its edge between pieces, or -1
	euler      []int32 // nodes in depth-first order (by tin)
	inSlot     []int32 // per piece: its slot among the in-neighbours of the piece being split, or -1

	// Search state, reused.
	dist     []int64
	settled  []bool
	pred     []int32
	touched  []int32
	heap     pieceHeap
	want     []int32 // search number for which a piece is a target
	stamp    int32
	searches int
	// sumsFit: no route of at most k+2 edges (r.w) can overflow, so the
	// side searches add without checks.
	sumsFit bool
}

// pieceGraph is the graph of pieces with parallel edges merged: per piece u
// the edges start[u]..start[u+1]-1 to pieces to[c], each the least (w, edge
// index) of the edges it merges (rep); of maps each edge to its merged edge.
type pieceGraph struct {
	start []int32
	to    []int32
	w     []int64
	rep   []int32
	of    []int32
}

const unreached = int64(-1) << 63

func newRanger(g *graph, p []int64) *ranger {
	full := make([]int64, g.numNodes())
	copy(full, p)
	r := &ranger{g: g, p: full, k: g.pieces}
	return r
}

// reducedDir returns the reduced cost of moving along arc e (forward or
// backward) under r.p.
func (r *ranger) reducedDir(e int, forward bool) (int64, error) {
	g := r.g
	_, _, _, rate := g.arc(e)
	rc, err := flow.AddChecked(rate, r.p[g.tail(e)])
	if err == nil {
		rc, err = flow.SubChecked(rc, r.p[g.head(e)])
	}
	if err != nil {
		return 0, fmt.Errorf("dual: reduced cost %w", err)
	}
	if !forward {
		rc = -rc
	}
	return rc, nil
}

func (r *ranger) isForestArc(e int) bool {
	g := r.g
	return int(g.parentArc[g.head(e)]) == e || int(g.parentArc[g.tail(e)]) == e
}

func (r *ranger) buildEdges() error {
	g := r.g
	type edge struct {
		from, to int32
		w        int64
		arc      int32
		fwd      bool
	}
	// Count first, so that both lists are allocated once at their size.
	nInner, nOuter := 0, 0
	for e, na := 0, g.numArcs(); e < na; e++ {
		lo, hi, x, _ := g.arc(e)
		if lo == hi || r.isForestArc(e) {
			continue
		}
		d := 0
		if x < hi {
			d++
		}
		if x > lo {
			d++
		}
		if g.comp[g.tail(e)] == g.comp[g.head(e)] {
			nInner += d
		} else {
			nOuter += d
		}
	}
	// Edges inside one piece only matter for lanes of that piece (covering,
	// below); searches over pieces use the edges between pieces.
	r.inner = make([]innerEdge, 0, nInner)
	es := make([]edge, 0, nOuter)
	add := func(t, h int32, w int64, e int, fwd bool) {
		if g.comp[t] == g.comp[h] {
			r.inner = append(r.inner, innerEdge{from: t, to: h, w: w, arc: int32(e)})
		} else {
			es = append(es, edge{t, h, w, int32(e), fwd})
		}
	}
	for e, na := 0, g.numArcs(); e < na; e++ {
		lo, hi, x, _ := g.arc(e)
		if lo == hi || r.isForestArc(e) {
			continue
		}
		t, h := g.tail(e), g.head(e)
		if x < hi {
			w, err := r.reducedDir(e, true)
			if err != nil {
				return err
			}
			if w < 0 {
				return fmt.Errorf("%w: potentials are not valid for the plan (lane %d)", ErrInternal, e)
			}
			add(t, h, w, e, true)
		}
		if x > lo {
			w, err := r.reducedDir(e, false)
			if err != nil {
				return err
			}
			if w < 0 {
				return fmt.Errorf("%w: potentials are not valid for the plan (lane %d)", ErrInternal, e)
			}
			add(h, t, w, e, false)
		}
	}
	k := r.k
	r.start = make([]int32, k+1)
	r.rstart = make([]int32, k+1)
	for _, e := range es {
		r.start[g.comp[e.from]+1]++
		r.rstart[g.comp[e.to]+1]++
	}
	for i := 0; i < k; i++ {
		r.start[i+1] += r.start[i]
		r.rstart[i+1] += r.rstart[i]
	}
	ne := len(es)
	r.from, r.to, r.w = make([]int32, ne), make([]int32, ne), make([]int64, ne)
	r.arcOf, r.fwd = make([]int32, ne), make([]bool, ne)
	r.redges = make([]int32, ne)
	pos := append([]int32(nil), r.start[:k]...)
	rpos := append([]int32(nil), r.rstart[:k]...)
	for _, e := range es {
		i := pos[g.comp[e.from]]
		pos[g.comp[e.from]]++
		r.from[i], r.to[i], r.w[i], r.arcOf[i], r.fwd[i] = e.from, e.to, e.w, e.arc, e.fwd
		r.redges[rpos[g.comp[e.to]]] = i
		rpos[g.comp[e.to]]++
	}
	r.pFrom, r.pTo = make([]int32, ne), make([]int32, ne)
	for i := range r.from {
		r.pFrom[i], r.pTo[i] = g.comp[r.from[i]], g.comp[r.to[i]]
	}
	r.arcEdge = make([]int32, g.numArcs())
	for a := range r.arcEdge {
		r.arcEdge[a] = -1
	}
	for i, a := range r.arcOf {
		r.arcEdge[a] = int32(i) // arcs between pieces are at a bound: one edge each
	}
	r.fwdG = r.contract(r.start, nil, r.pTo)
	r.revG = r.contract(r.rstart, r.redges, r.pFrom)
	var maxW int64
	for _, w := range r.w {
		maxW = max(maxW, w)
	}
	r.sumsFit = maxW <= math.MaxInt64/int64(k+3)
	r.subtrees()
	r.cover()
	r.reachability()
	nv := k + 1
	r.dist = make([]int64, nv)
	r.settled = make([]bool, nv)
	r.pred = make([]int32, nv)
	r.want = make([]int32, nv)
	r.inSlot = make([]int32, nv)
	for i := range r.dist {
		r.dist[i] = unreached
		r.pred[i] = -1
		r.inSlot[i] = -1
	}
	return nil
}

// contract merges the edges between each ordered pair of pieces: the edges
// of piece u are idx[start[u]..start[u+1]-1] (idx nil: the indices
// themselves), each leading to piece nb[i]. O(|E| + k).
func (r *ranger) contract(start, idx, nb []int32) pieceGraph {
	k := r.k
	pg := pieceGraph{start: make([]int32, k+1), of: make([]int32, len(r.w))}
	slot := make([]int32, k)
	owner := make([]int32, k)
	for i := range owner {
		owner[i] = -1
	}
	for u := 0; u < k; u++ {
		pg.start[u] = int32(len(pg.to))
		for p := start[u]; p < start[u+1]; p++ {
			i := p
			if idx != nil {
				i = idx[p]
			}
			v := nb[i]
			if owner[v] != int32(u) {
				owner[v], slot[v] = int32(u), int32(len(pg.to))
				pg.to = append(pg.to, v)
				pg.w = append(pg.w, r.w[i])
				pg.rep = append(pg.rep, i)
			} else if c := slot[v]; r.w[i] < pg.w[c] || (r.w[i] == pg.w[c] && i < pg.rep[c]) {
				pg.w[c], pg.rep[c] = r.w[i], i
			}
			pg.of[i] = slot[v]
		}
	}
	pg.start[k] = int32(len(pg.to))
	return pg
}

// subtrees numbers the forest in depth-first order: v's subtree is the
// nodes u with tin[v] <= tin[u] < tout[v].
func (r *ranger) subtrees() {
	g := r.g
	nv := g.numNodes()
	cstart := make([]int32, nv+1)
	for v := 0; v < nv; v++ {
		if e := g.parentArc[v]; e >= 0 {
			cstart[g.other(int(e), int32(v))+1]++
		}
	}
	for v := 0; v < nv; v++ {
		cstart[v+1] += cstart[v]
	}
	kids := make([]int32, cstart[nv])
	pos := append([]int32(nil), cstart[:nv]...)
	for v := 0; v < nv; v++ {
		if e := g.parentArc[v]; e >= 0 {
			u := g.other(int(e), int32(v))
			kids[pos[u]] = int32(v)
			pos[u]++
		}
	}
	r.tin, r.tout = make([]int32, nv), make([]int32, nv)
	r.euler = make([]int32, nv)
	clock := int32(0)
	type frame struct{ v, next int32 }
	var stack []frame
	for root := 0; root < nv; root++ {
		if g.parentArc[root] >= 0 {
			continue
		}
		stack = append(stack[:0], frame{int32(root), cstart[root]})
		r.tin[root] = clock
		r.euler[clock] = int32(root)
		clock++
		for len(stack) > 0 {
			top := &stack[len(stack)-1]
			if top.next < cstart[top.v+1] {
				c := kids[top.next]
				top.next++
				r.tin[c] = clock
				r.euler[clock] = c
				clock++
				stack = append(stack, frame{c, cstart[c]})
				continue
			}
			r.tout[top.v] = clock
			stack = stack[:len(stack)-1]
		}
	}
}

type innerEdge struct {
	from, to int32
	w        int64
	arc      int32
}

// orderByWeight returns the indexes of es in increasing order of w, ties in
// index order: a least-significant-digit radix sort on the bytes the
// largest w needs (w >= 0). O(b·(|es| + 256)) for b such bytes.
func orderByWeight(es []innerEdge) []int32 {
	order := make([]int32, len(es))
	for i := range order {
		order[i] = int32(i)
	}
	var top int64
	for _, e := range es {
		top = max(top, e.w)
	}
	tmp := make([]int32, len(es))
	var count [257]int
	for shift := uint(0); shift < 64 && top>>shift != 0; shift += 8 {
		count = [257]int{}
		for _, i := range order {
			count[int(byte(es[i].w>>shift))+1]++
		}
		for d := 0; d < 256; d++ {
			count[d+1] += count[d]
		}
		for _, i := range order {
			d := byte(es[i].w >> shift)
			tmp[count[d]] = i
			count[d]++
		}
		order, tmp = tmp, order
	}
	return order
}

// cover finds, for every forest arc, the cheapest inner edge crossing the
// cut it makes in each direction: edges in order of reduced cost mark the
// tree paths they cross, each tree node once (jump pointers skip nodes
// already marked), until every forest arc is covered. O(|E| + |V|)
// (radix sort on the reduced costs).
func (r *ranger) cover() {
	g := r.g
	nv := g.numNodes()
	order := orderByWeight(r.inner)
	parentNode := func(v int32) int32 {
		if e := g.parentArc[v]; e >= 0 {
			return g.other(int(e), v)
		}
		return v
	}
	isAnc := func(x, v int32) bool { return r.tin[x] <= r.tin[v] && r.tin[v] < r.tout[x] }
	mark := func(best []int64, by []int32, entering bool) {
		jump := make([]int32, nv)
		for v := range jump {
			jump[v] = int32(v)
			best[v] = unreached
			by[v] = -1
		}
		var find func(int32) int32
		find = func(v int32) int32 {
			for jump[v] != v {
				jump[v] = jump[jump[v]]
				v = jump[v]
			}
			return v
		}
		left := 0 // forest arcs not yet covered
		for v := 0; v < nv; v++ {
			if g.parentArc[v] >= 0 {
				left++
			}
		}
		for _, i := range order {
			if left == 0 {
				break
			}
			e := r.inner[i]
			u, w := e.from, e.to
			if entering {
				u, w = w, u
			}
			for x := find(u); !isAnc(x, w); x = find(x) {
				best[x], by[x] = e.w, e.arc
				jump[x] = parentNode(x)
				left--
			}
		}
	}
	r.leave, r.leaveBy = make([]int64, nv), make([]int32, nv)
	r.enter, r.enterBy = make([]int64, nv), make([]int32, nv)
	if nv == 0 {
		return
	}
	mark(r.leave, r.leaveBy, false)
	mark(r.enter, r.enterBy, true)
}

// maxReachPieces bounds the pieces for which reachability sets are kept
// (memory grows with their square).
const maxReachPieces = 20000

// reachability groups the pieces into strongly connected groups (Tarjan)
// and records which groups each reaches, so searches need not wait for
// pieces they can never reach. O(k + r + k·k/64).
func (r *ranger) reachability() {
	k := r.k
	if k > maxReachPieces {
		return
	}
	r.group = make([]int32, k)
	index := make([]int32, k)
	low := make([]int32, k)
	onStack := make([]bool, k)
	for i := range index {
		index[i] = -1
	}
	var stack []int32
	next, groups := int32(0), int32(0)
	type frame struct{ v, e int32 }
	var calls []frame
	for root := 0; root < k; root++ {
		if index[root] >= 0 {
			continue
		}
		calls = append(calls[:0], frame{int32(root), r.start[root]})
		index[root], low[root] = next, next
		next++
		stack = append(stack, int32(root))
		onStack[root] = true
		for len(calls) > 0 {
			f := &calls[len(calls)-1]
			v := f.v
			if f.e < r.start[v+1] {
				w := r.g.comp[r.to[f.e]]
				f.e++
				if index[w] < 0 {
					index[w], low[w] = next, next
					next++
					stack = append(stack, w)
					onStack[w] = true
					calls = append(calls, frame{w, r.start[w]})
				} else if onStack[w] && index[w] < low[v] {
					low[v] = index[w]
				}
				continue
			}
			if low[v] == index[v] {
				for {
					w := stack[len(stack)-1]
					stack = stack[:len(stack)-1]
					onStack[w] = false
					r.group[w] = groups
					if w == v {
						break
					}
				}
				groups++
			}
			calls = calls[:len(calls)-1]
			if len(calls) > 0 {
				u := calls[len(calls)-1].v
				if low[v] < low[u] {
					low[u] = low[v]
				}
			}
		}
	}
	// Tarjan numbers groups sinks first: each group's successors have
	// smaller numbers, so one pass in increasing order suffices.
	words := (int(groups) + 63) / 64
	r.reach = make([][]uint64, groups)
	members := make([][]int32, groups)
	for c := 0; c < k; c++ {
		members[r.group[c]] = append(members[r.group[c]], int32(c))
	}
	for gr := int32(0); gr < groups; gr++ {
		set := make([]uint64, words)
		set[gr/64] |= 1 << (gr % 64)
		for _, c := range members[gr] {
			for i := r.start[c]; i < r.start[c+1]; i++ {
				if sg := r.group[r.g.comp[r.to[i]]]; sg != gr {
					for j, x := range r.reach[sg] {
						set[j] |= x
					}
				}
			}
		}
		r.reach[gr] = set
	}
}

// reaches reports whether piece a can reach piece b (true when unknown).
func (r *ranger) reaches(a, b int32) bool {
	if r.reach == nil || int(a) >= r.k || int(b) >= r.k {
		return true
	}
	gb := r.group[b]
	return r.reach[r.group[a]][gb/64]&(1<<(gb%64)) != 0
}

// split describes a piece cut in two by removing one forest arc: the nodes
// of the subtree of child form the virtual piece k.
type split struct {
	piece int32
	child int32 // -1: no split
}

func (r *ranger) pieceOf(v int32, sp split) int32 {
	c := r.g.comp[v]
	if sp.child >= 0 && c == sp.piece && r.tin[sp.child] <= r.tin[v] && r.tin[v] < r.tout[sp.child] {
		return int32(r.k)
	}
	return c
}

// search runs Dijkstra over the pieces from the pieces of sources (distance
// 0), skipping arc exclude (-1: none), until every target piece is settled.
// Reverse searches follow edges backwards. It returns the distances (use
// dist[piece], unreached when not reached) valid until the next search.
// Without a split it follows the merged edges between pieces (O(k + merged
// edges) per search at worst, with a binary heap); with one, every edge.
func (r *ranger) search(sources []int32, targets []int32, sp split, exclude int32, reverse bool) error {
	r.searches++
	for _, v := range r.touched {
		r.dist[v], r.settled[v], r.pred[v] = unreached, false, -1
	}
	r.touched = r.touched[:0]
	r.heap = r.heap[:0]
	r.stamp++
	for _, s := range sources {
		if r.dist[s] != 0 {
			r.dist[s] = 0
			r.touched = append(r.touched, s)
			r.heap.push(pieceItem{0, s})
		}
	}
	left := 0
	for _, t := range targets {
		if r.want[t] == r.stamp {
			continue
		}
		if sp.child < 0 && len(sources) == 1 {
			a, b := sources[0], t
			if reverse {
				a, b = b, a
			}
			if !r.reaches(a, b) {
				continue
			}
		}
		r.want[t] = r.stamp
		left++
	}
	// The piece whose own edges must be followed one by one: the one the
	// excluded arc leaves (in the search's direction).
	exPiece := int32(-1)
	if exclude >= 0 && int(exclude) < len(r.arcEdge) {
		if ex := r.arcEdge[exclude]; ex >= 0 {
			exPiece = r.pFrom[ex]
			if reverse {
				exPiece = r.pTo[ex]
			}
		}
	}
	pg := &r.fwdG
	if reverse {
		pg = &r.revG
	}
	for len(r.heap) > 0 && left > 0 {
		it := r.heap.pop()
		u := it.piece
		if r.settled[u] || it.d != r.dist[u] {
			continue
		}
		r.settled[u] = true
		if r.want[u] == r.stamp {
			left--
		}
		if sp.child >= 0 || u == exPiece {
			if err := r.relaxEach(it, sp, exclude, reverse); err != nil {
				return err
			}
			continue
		}
		for c := pg.start[u]; c < pg.start[u+1]; c++ {
			v := pg.to[c]
			if r.settled[v] {
				continue
			}
			nd, err := flow.AddChecked(it.d, pg.w[c])
			if err != nil {
				return fmt.Errorf("dual: route cost %w", err)
			}
			r.relax(v, nd, pg.rep[c])
		}
	}
	return nil
}

// relax offers distance nd to piece v by edge i; ties go to the lower edge
// index.
func (r *ranger) relax(v int32, nd int64, i int32) {
	switch {
	case r.dist[v] == unreached:
		r.touched = append(r.touched, v)
	case nd < r.dist[v]:
	case nd == r.dist[v] && i < r.pred[v]:
		r.pred[v] = i
		return
	default:
		return
	}
	r.dist[v], r.pred[v] = nd, i
	r.heap.push(pieceItem{nd, v})
}

// relaxEach relaxes the edges leaving (reverse: entering) the settled piece
// it one by one, sorting their ends into the sides of a split piece.
func (r *ranger) relaxEach(it pieceItem, sp split, exclude int32, reverse bool) error {
	u := it.piece
	real := u
	if int(u) == r.k {
		real = sp.piece
	}
	var list []int32
	lo, hi := r.start[real], r.start[real+1]
	n := int(hi - lo)
	if reverse {
		list = r.redges[r.rstart[real]:r.rstart[real+1]]
		n = len(list)
	}
	for j := 0; j < n; j++ {
		i := lo + int32(j)
		if reverse {
			i = list[j]
		}
		if r.arcOf[i] == exclude {
			continue
		}
		a, b := r.from[i], r.to[i]
		if reverse {
			a, b = b, a
		}
		if r.pieceOf(a, sp) != u {
			continue
		}
		v := r.pieceOf(b, sp)
		if v == u || r.settled[v] {
			continue
		}
		nd, err := flow.AddChecked(it.d, r.w[i])
		if err != nil {
			return fmt.Errorf("dual: route cost %w", err)
		}
		r.relax(v, nd, i)
	}
	return nil
}

type pieceItem struct {
	d     int64
	piece int32
}

// pieceHeap is a binary min-heap of pieces by (distance, piece).
type pieceHeap []pieceItem

func (a pieceItem) less(b pieceItem) bool {
	return a.d < b.d || (a.d == b.d && a.piece < b.piece)
}

func (h *pieceHeap) push(it pieceItem) {
	q := append(*h, it)
	i := len(q) - 1
	for i > 0 {
		p := (i - 1) / 2
		if !q[i].less(q[p]) {
			break
		}
		q[i], q[p] = q[p], q[i]
		i = p
	}
	*h = q
}

// init orders h as a heap. O(len(h)).
func (h *pieceHeap) init() {
	q := *h
	for i := len(q)/2 - 1; i >= 0; i-- {
		q.down(i)
	}
}

// down moves q[i] down to its place.
func (q pieceHeap) down(i int) {
	n := len(q)
	for {
		c := 2*i + 1
		if c >= n {
			return
		}
		if c+1 < n && q[c+1].less(q[c]) {
			c++
		}
		if !q[c].less(q[i]) {
			return
		}
		q[i], q[c] = q[c], q[i]
		i = c
	}
}

func (h *pieceHeap) pop() pieceItem {
	q := *h
	top := q[0]
	last := len(q) - 1
	q[0] = q[last]
	q = q[:last]
	q.down(0)
	*h = q
	return top
}

// firstLane returns a lane on the route found to piece v (the last inter-
// piece arc on it), or -1.
func (r *ranger) firstLane(v int32) flow.LaneID {
	if r.dist[v] == unreached {
		return -1
	}
	if i := r.pred[v]; i >= 0 && int(r.arcOf[i]) < r.g.m {
		return flow.LaneID(r.arcOf[i])
	}
	return -1
}

// lanes fills in every lane's range.
func (r *ranger) lanes(s *Sensitivity) error {
	g := r.g
	// Queries without a split: group by source piece.
	type query struct {
		lane int
		kind int8 // 0: break-even (h->t), 1: upper (t->h), 2: capacity value (h->t avoiding the lane)
	}
	// Queries by source piece, sources in order of first appearance.
	type sourced struct {
		src int32
		q   query
	}
	var all []sourced
	add := func(src int32, q query) { all = append(all, sourced{src, q}) }
	var forest []int32 // lanes in use that are forest arcs
	for e := 0; e < g.m; e++ {
		lo, hi, x, rate := g.arc(e)
		lr := &s.Lanes[e]
		lr.LowerBy, lr.UpperBy = -1, -1
		if lo == hi {
			continue
		}
		t, h := g.tail(e), g.head(e)
		diff, err := flow.SubChecked(r.p[h], r.p[t]) // = rate - reduced cost
		if err != nil {
			return fmt.Errorf("dual: potentials %w", err)
		}
		free := lo < x && x < hi
		switch {
		case free && !r.isForestArc(e):
			// A cycle of lanes in use with zero cost: any change breaks it.
			lr.Lower, lr.Upper, lr.HasLower, lr.HasUpper = rate, rate, true, true
		case free:
			forest = append(forest, int32(e))
		case x == lo:
			if g.comp[h] == g.comp[t] {
				lr.Lower, lr.HasLower = diff, true
			} else {
				add(g.comp[h], query{e, 0})
			}
		default: // at capacity
			if g.comp[h] == g.comp[t] {
				lr.Upper, lr.HasUpper = diff, true
				lr.CapacityValue = diff - rate
			} else {
				add(g.comp[t], query{e, 1})
				add(g.comp[h], query{e, 2})
			}
		}
	}
	if err := r.forestRanges(forest, s); err != nil {
		return err
	}
	var order []int32
	slot := make([]int32, r.k) // per source piece: its place in order, or -1
	for i := range slot {
		slot[i] = -1
	}
	for _, a := range all {
		if slot[a.src] < 0 {
			slot[a.src] = int32(len(order))
			order = append(order, a.src)
		}
	}
	qStart := make([]int32, len(order)+1)
	for _, a := range all {
		qStart[slot[a.src]+1]++
	}
	for i := range order {
		qStart[i+1] += qStart[i]
	}
	queries := make([]query, len(all))
	fill := append([]int32(nil), qStart[:len(order)]...)
	for _, a := range all {
		j := slot[a.src]
		queries[fill[j]] = a.q
		fill[j]++
	}
	var hub *hubDist
	if len(order) >= minHubSources {
		var err error
		if hub, err = r.newHub(); err != nil {
			return err
		}
	}
	var targets []int32
	for si, src := range order {
		qs := queries[qStart[si]:qStart[si+1]]
		targets = targets[:0]
		distOnly := true
		for _, q := range qs {
			if q.kind == 1 {
				targets = append(targets, g.comp[g.head(q.lane)])
			} else {
				targets = append(targets, g.comp[g.tail(q.lane)])
			}
			distOnly = distOnly && q.kind == 0
		}
		var err error
		if hub != nil && distOnly {
			err = r.hubSearch(hub, src, targets)
		} else {
			err = r.search([]int32{src}, targets, split{child: -1}, -1, false)
		}
		if err != nil {
			return err
		}
		var again []query
		for _, q := range qs {
			e := q.lane
			_, _, _, rate := g.arc(e)
			t, h := g.tail(e), g.head(e)
			diff := r.p[h] - r.p[t] // checked above
			lr := &s.Lanes[e]
			switch q.kind {
			case 0:
				if d := r.dist[g.comp[t]]; d != unreached {
					lr.Lower, lr.HasLower, lr.ByRoute = diff-d, true, true
					lr.LowerBy = -1
				}
			case 1:
				if d := r.dist[g.comp[h]]; d != unreached {
					lr.Upper, lr.HasUpper, lr.ByRoute = diff+d, true, true
					lr.UpperBy = r.firstLane(g.comp[h])
				}
			case 2:
				// The route found may be the lane itself (backwards): then
				// search again without it.
				if r.routeUses(g.comp[t], int32(e)) {
					again = append(again, q)
					continue
				}
				if d := r.dist[g.comp[t]]; d != unreached {
					lr.CapacityValue = max(0, diff-rate-d)
				}
			}
		}
		for _, q := range again {
			e := q.lane
			_, _, _, rate := g.arc(e)
			t, h := g.tail(e), g.head(e)
			if err := r.search([]int32{g.comp[h]}, []int32{g.comp[t]}, split{child: -1}, int32(e), false); err != nil {
				return err
			}
			if d := r.dist[g.comp[t]]; d != unreached {
				s.Lanes[e].CapacityValue = max(0, r.p[h]-r.p[t]-rate-d)
			}
		}
	}
	return nil
}

// minHubSources is the number of source pieces from which searching via a
// hub (two extra full searches) pays.
const minHubSources = 8

// hubDist holds the distances to and from a hub: the piece with the most
// neighbouring pieces. Every route through the hub from a to b costs at
// least to[a] + from[b], and that route exists, so the distance from a to
// b is the lesser of that and the distance with the hub left out.
type hubDist struct {
	piece    int32
	to, from []int64
}

func (r *ranger) newHub() (*hubDist, error) {
	h := &hubDist{piece: -1}
	most := int32(-1)
	for c := int32(0); int(c) < r.k; c++ {
		if d := r.fwdG.start[c+1] - r.fwdG.start[c] + r.revG.start[c+1] - r.revG.start[c]; d > most {
			h.piece, most = c, d
		}
	}
	var err error
	if h.to, err = r.allDist(h.piece, true, -1); err != nil {
		return nil, err
	}
	if h.from, err = r.allDist(h.piece, false, -1); err != nil {
		return nil, err
	}
	return h, nil
}

// allDist returns the distances from piece src to every piece (reverse: to
// src from every piece) on routes avoiding piece skip (-1: none), unreached
// where none. O((k + merged edges) log k).
func (r *ranger) allDist(src int32, reverse bool, skip int32) ([]int64, error) {
	r.searches++
	r.resetSearch()
	pg := &r.fwdG
	if reverse {
		pg = &r.revG
	}
	r.dist[src] = 0
	r.touched = append(r.touched, src)
	r.heap.push(pieceItem{0, src})
	for len(r.heap) > 0 {
		it := r.heap.pop()
		u := it.piece
		if r.settled[u] || it.d != r.dist[u] {
			continue
		}
		r.settled[u] = true
		for c := pg.start[u]; c < pg.start[u+1]; c++ {
			if pg.to[c] == skip {
				continue
			}
			if err := r.offer(pg.to[c], it.d, pg.w[c]); err != nil {
				return nil, err
			}
		}
	}
	return append([]int64(nil), r.dist[:r.k]...), nil
}

// resetSearch clears the state of the last search.
func (r *ranger) resetSearch() {
	for _, v := range r.touched {
		r.dist[v], r.settled[v], r.pred[v] = unreached, false, -1
	}
	r.touched = r.touched[:0]
	r.heap = r.heap[:0]
}

// offer relaxes piece v to distance d+w, without a predecessor.
func (r *ranger) offer(v int32, d, w int64) error {
	return r.offerFrom(v, d, w, -1)
}

// offerFrom relaxes piece v to distance d+w, recording tag in pred[v] when
// it improves.
func (r *ranger) offerFrom(v int32, d, w int64, tag int32) error {
	if r.settled[v] {
		return nil
	}
	nd, err := flow.AddChecked(d, w)
	if err != nil {
		return fmt.Errorf("dual: route cost %w", err)
	}
	if r.dist[v] == unreached {
		r.touched = append(r.touched, v)
	} else if nd >= r.dist[v] {
		return nil
	}
	r.dist[v], r.pred[v] = nd, tag
	r.heap.push(pieceItem{nd, v})
	return nil
}

// hubSearch sets r.dist[t] for each target piece t to the distance from
// piece src (no predecessors): the lesser of the route through the hub and
// a search from src with the hub left out, stopped once every target not
// yet settled has a route through the hub no dearer than the search's
// frontier.
func (r *ranger) hubSearch(h *hubDist, src int32, targets []int32) error {
	r.searches++
	r.resetSearch()
	r.stamp++
	// via[t]: the cost through the hub (unreached: none), in r.pred's place
	// kept in a local list sorted by decreasing cost, unreachable first.
	type goal struct {
		piece int32
		via   int64
	}
	var goals []goal
	for _, t := range targets {
		if r.want[t] == r.stamp || !r.reaches(src, t) {
			continue
		}
		r.want[t] = r.stamp
		via := unreached
		if src == h.piece {
			via = h.from[t]
		} else if t == h.piece {
			via = h.to[src]
		} else if h.to[src] != unreached && h.from[t] != unreached {
			var err error
			if via, err = flow.AddChecked(h.to[src], h.from[t]); err != nil {
				return fmt.Errorf("dual: route cost %w", err)
			}
		}
		goals = append(goals, goal{t, via})
	}
	sort.Slice(goals, func(i, j int) bool {
		a, b := goals[i], goals[j]
		if (a.via == unreached) != (b.via == unreached) {
			return a.via == unreached
		}
		return a.via > b.via || (a.via == b.via && a.piece < b.piece)
	})
	if src != h.piece {
		r.dist[src] = 0
		r.touched = append(r.touched, src)
		r.heap.push(pieceItem{0, src})
	}
	next := 0 // first goal not settled, in goals' order
	for len(r.heap) > 0 {
		for next < len(goals) && r.settled[goals[next].piece] {
			next++
		}
		if next == len(goals) {
			break
		}
		it := r.heap.pop()
		u := it.piece
		if r.settled[u] || it.d != r.dist[u] {
			continue
		}
		if v := goals[next].via; v != unreached && it.d >= v {
			break // every goal left is reached as cheaply through the hub
		}
		r.settled[u] = true
		for c := r.fwdG.start[u]; c < r.fwdG.start[u+1]; c++ {
			if v := r.fwdG.to[c]; v != h.piece {
				if err := r.offer(v, it.d, r.fwdG.w[c]); err != nil {
					return err
				}
			}
		}
	}
	for _, gl := range goals {
		t := gl.piece
		if gl.via == unreached {
			if !r.settled[t] {
				r.setDist(t, unreached)
			}
			continue
		}
		if !r.settled[t] || gl.via < r.dist[t] {
			r.setDist(t, gl.via)
		}
	}
	return nil
}

// setDist sets a piece's distance after a search.
func (r *ranger) setDist(v int32, d int64) {
	if r.dist[v] == unreached {
		r.touched = append(r.touched, v)
	}
	r.dist[v], r.pred[v] = d, -1
}

// routeUses reports whether the route found to piece v uses arc e.
func (r *ranger) routeUses(v int32, e int32) bool {
	for steps := 0; v >= 0 && r.pred[v] >= 0 && steps <= r.k+1; steps++ {
		i := r.pred[v]
		if r.arcOf[i] == e {
			return true
		}
		v = r.g.comp[r.from[i]]
	}
	return false
}

// maxSideCells bounds nodes times neighbouring pieces of a piece for which
// side tables are built (three int64 and three int32 per cell); larger
// pieces search edge by edge.
const maxSideCells = 1 << 20

// forestRanges fills in the ranges of the lanes in use that are forest
// arcs, piece by piece. Within a piece P with s nodes and n neighbouring
// pieces, side tables (O(s·n) time and memory) give for any cut of P's tree
// the cheapest edge from either side to each neighbour and back; the
// cheapest route from one side to the other through other pieces is then
// one search over the other pieces (P removed: a route that re-enters P's
// far side ends there, one that re-enters the near side is no shorter than
// its part from there), started from the neighbours at their edge costs and
// stopped once it can no longer beat the best route or the cheapest edge
// inside P across the cut.
func (r *ranger) forestRanges(forest []int32, s *Sensitivity) error {
	g := r.g
	sort.SliceStable(forest, func(i, j int) bool {
		return g.comp[g.tail(int(forest[i]))] < g.comp[g.tail(int(forest[j]))]
	})
	var out, in sideTable
	for lo := 0; lo < len(forest); {
		p := g.comp[g.tail(int(forest[lo]))]
		hi := lo + 1
		for hi < len(forest) && g.comp[g.tail(int(forest[hi]))] == p {
			hi++
		}
		lanes := forest[lo:hi]
		lo = hi
		root := r.euler[r.tin[g.tail(int(lanes[0]))]]
		for g.parentArc[root] >= 0 {
			root = g.other(int(g.parentArc[root]), root)
		}
		base, size := r.tin[root], int(r.tout[root]-r.tin[root])
		nOut := int(r.fwdG.start[p+1] - r.fwdG.start[p])
		nIn := int(r.revG.start[p+1] - r.revG.start[p])
		for c := r.revG.start[p]; c < r.revG.start[p+1]; c++ {
			r.inSlot[r.revG.to[c]] = c - r.revG.start[p]
		}
		if size*(nOut+nIn) > maxSideCells {
			// Too many neighbours for tables: search from the smaller
			// side of each cut instead.
			bp := r.newBigPiece(p, base, size)
			via, err := r.newSplitHub(p, base, size)
			if err != nil {
				return err
			}
			for _, e := range lanes {
				if err := r.splitSides(int(e), &s.Lanes[e], p, base, nil, nil, bp, via); err != nil {
					return err
				}
			}
		} else {
			r.sideTable(&out, p, base, size, false)
			r.sideTable(&in, p, base, size, true)
			for _, e := range lanes {
				if err := r.splitSides(int(e), &s.Lanes[e], p, base, &out, &in, nil, nil); err != nil {
					return err
				}
			}
		}
		for c := r.revG.start[p]; c < r.revG.start[p+1]; c++ {
			r.inSlot[r.revG.to[c]] = -1
		}
	}
	return nil
}

// sideTable holds, for one piece of s nodes in depth-first order and n
// neighbouring pieces, the cheapest edge (least reduced cost, then least
// edge index; index -1: none) between node sets of the piece and each
// neighbour: row p of sub covers the subtree of the node at position p, row
// p of pre the positions before p, row p of suf the positions from p on.
// Rows have n cells; pre and suf have s+1 rows.
type sideTable struct {
	n                int
	subW, preW, sufW []int64
	subI, preI, sufI []int32
	// rowW, rowI hold the last row asked for.
	rowW []int64
	rowI []int32
}

func grow[T any](b []T, n int) []T {
	if cap(b) < n {
		return make([]T, n)
	}
	return b[:n]
}

// better reports whether (w, i) beats (bw, bi); bi < 0 is no edge.
func better(w int64, i int32, bw int64, bi int32) bool {
	return i >= 0 && (bi < 0 || w < bw || (w == bw && i < bi))
}

// minRow sets dst to the cellwise best of a and b.
func minRow(dw []int64, di []int32, aw []int64, ai []int32, bw []int64, bi []int32) {
	for j := range dw {
		if better(bw[j], bi[j], aw[j], ai[j]) {
			dw[j], di[j] = bw[j], bi[j]
		} else {
			dw[j], di[j] = aw[j], ai[j]
		}
	}
}

// sideTable fills t for piece p (nodes euler[base:base+size]): edges
// leaving p to each neighbour, or with in, edges entering p from each.
// O(size·n + edges of p).
func (r *ranger) sideTable(t *sideTable, p, base int32, size int, in bool) {
	g := r.g
	pg, list := &r.fwdG, []int32(nil)
	lo, hi := r.start[p], r.start[p+1]
	if in {
		pg, list = &r.revG, r.redges[r.rstart[p]:r.rstart[p+1]]
		lo, hi = 0, int32(len(list))
	}
	n := int(pg.start[p+1] - pg.start[p])
	t.n = n
	t.subW, t.subI = grow(t.subW, size*n), grow(t.subI, size*n)
	t.preW, t.preI = grow(t.preW, (size+1)*n), grow(t.preI, (size+1)*n)
	t.sufW, t.sufI = grow(t.sufW, (size+1)*n), grow(t.sufI, (size+1)*n)
	t.rowW, t.rowI = grow(t.rowW, n), grow(t.rowI, n)
	for j := range t.subI {
		t.subI[j] = -1
	}
	for j := 0; j < n; j++ {
		t.preI[j], t.sufI[size*n+j] = -1, -1
	}
	for k := lo; k < hi; k++ {
		i, v := k, int32(0)
		if in {
			i = list[k]
			v = r.to[i]
		} else {
			v = r.from[i]
		}
		c := int(r.tin[v]-base)*n + int(pg.of[i]-pg.start[p])
		if better(r.w[i], i, t.subW[c], t.subI[c]) {
			t.subW[c], t.subI[c] = r.w[i], i
		}
	}
	for q := 0; q < size; q++ {
		a, b := q*n, (q+1)*n
		minRow(t.preW[b:b+n], t.preI[b:b+n], t.preW[a:a+n], t.preI[a:a+n], t.subW[a:a+n], t.subI[a:a+n])
	}
	for q := size - 1; q >= 0; q-- {
		a, b := q*n, (q+1)*n
		minRow(t.sufW[a:a+n], t.sufI[a:a+n], t.sufW[b:b+n], t.sufI[b:b+n], t.subW[a:a+n], t.subI[a:a+n])
	}
	for q := size - 1; q >= 1; q-- {
		v := r.euler[int(base)+q]
		u := g.other(int(g.parentArc[v]), v)
		a, b := q*n, int(r.tin[u]-base)*n
		minRow(t.subW[b:b+n], t.subI[b:b+n], t.subW[b:b+n], t.subI[b:b+n], t.subW[a:a+n], t.subI[a:a+n])
	}
}

// row sets t.rowW, t.rowI to the cheapest edges of the subtree of the node
// at position l (its subtree ends before position end), or of the rest of
// the piece.
func (t *sideTable) row(l, end int, subtree bool) {
	n := t.n
	if subtree {
		copy(t.rowW, t.subW[l*n:(l+1)*n])
		copy(t.rowI, t.subI[l*n:(l+1)*n])
		return
	}
	minRow(t.rowW, t.rowI, t.preW[l*n:(l+1)*n], t.preI[l*n:(l+1)*n], t.sufW[end*n:(end+1)*n], t.sufI[end*n:(end+1)*n])
}

// splitSides computes the range of forest lane e of piece p: removing it
// cuts p in two sides; the limits are the cheapest routes between the two
// sides: an inner edge across the cut (from cover) or a route through
// other pieces, found with the side tables of p (out, in) or, without them
// (out nil), with p's edges arranged by bp and the hub via.
func (r *ranger) splitSides(e int, lr *LaneRange, p, base int32, out, in *sideTable, bp *bigPiece, via *splitHub) error {
	g := r.g
	_, _, _, rate := g.arc(e)
	t, h := g.tail(e), g.head(e)
	child := h
	if int(g.parentArc[t]) == e {
		child = t
	}
	down, downBy := r.leave[child], r.leaveBy[child]
	up, upBy := r.enter[child], r.enterBy[child]
	if child == t {
		down, downBy, up, upBy = up, upBy, down, downBy
	}
	l, end := int(r.tin[child]-base), int(r.tout[child]-base)
	best := func(inner int64, innerBy int32, fromSub bool) (int64, flow.LaneID, bool, error) {
		d, by := inner, flow.LaneID(-1)
		if innerBy >= 0 && int(innerBy) < g.m {
			by = flow.LaneID(innerBy)
		}
		if inner == 0 {
			return d, by, true, nil // no route is cheaper
		}
		target := int32(r.k) // the subtree's virtual piece number
		if fromSub {
			target = p
		}
		var x int64
		var xi int32
		var err error
		if out != nil {
			out.row(l, end, fromSub)
			in.row(l, end, !fromSub)
			x, xi, err = r.sideSearch(p, out, in, target, inner)
		} else {
			// The cheapest route through the hub bounds the search, which
			// then leaves the hub out.
			u, ui, uerr := via.route(l, end, fromSub)
			if uerr != nil {
				return 0, -1, false, uerr
			}
			bound := inner
			if u != unreached && (bound == unreached || u < bound) {
				bound = u
			}
			x, xi, err = r.smallSide(bp, via.piece, l, end, fromSub, bound)
			if err == nil && u != unreached && (x == unreached || x >= u) {
				x, xi = u, ui // nothing cheaper without the hub
			}
		}
		if err != nil {
			return 0, -1, false, err
		}
		if x != unreached && (d == unreached || x < d) {
			d, by = x, -1
			if int(r.arcOf[xi]) < g.m {
				by = flow.LaneID(r.arcOf[xi])
			}
			lr.ByRoute = true
		}
		return d, by, d != unreached, nil
	}
	d, by, ok, err := best(down, downBy, child == h)
	if err != nil {
		return err
	}
	if ok {
		lr.Lower, lr.HasLower, lr.LowerBy = rate-d, true, by
	}
	d, by, ok, err = best(up, upBy, child == t)
	if err != nil {
		return err
	}
	if ok {
		lr.Upper, lr.HasUpper, lr.UpperBy = rate+d, true, by
	}
	return nil
}

// sideSearch finds the cheapest route from one side of split piece p to
// the other through other pieces: out.row holds the cheapest edges from the
// near side to p's out-neighbours, in.row those from p's in-neighbours into
// the far side (numbered target in the edge-by-edge search, whose tie rule
// it follows: of the routes of least cost, the one entering the far side by
// the least edge index among those found before the far side would be
// settled, as search would). Routes costing bound or more are not looked for (unreached: no
// bound). It returns the cost (unreached: none) and the entering edge.
func (r *ranger) sideSearch(p int32, out, in *sideTable, target int32, bound int64) (int64, int32, error) {
	left := 0
	for _, i := range in.rowI {
		if i >= 0 {
			left++
		}
	}
	if left == 0 {
		return unreached, -1, nil
	}
	r.searches++
	for _, v := range r.touched {
		r.dist[v], r.settled[v], r.pred[v] = unreached, false, -1
	}
	r.touched = r.touched[:0]
	r.heap = r.heap[:0]
	for j, i := range out.rowI {
		if i >= 0 {
			x := r.fwdG.to[int(r.fwdG.start[p])+j]
			r.dist[x] = out.rowW[j]
			r.touched = append(r.touched, x)
			r.heap.push(pieceItem{out.rowW[j], x})
		}
	}
	// The far side is a piece of its own here (number target), reached
	// only by the in-neighbours' edges, so ties resolve as in search.
	for len(r.heap) > 0 {
		it := r.heap.pop()
		u := it.piece
		if r.settled[u] || it.d != r.dist[u] {
			continue
		}
		if u == target || (bound != unreached && it.d >= bound) {
			break
		}
		r.settled[u] = true
		if j := r.inSlot[u]; j >= 0 && in.rowI[j] >= 0 {
			left--
			val, err := flow.AddChecked(it.d, in.rowW[j])
			if err != nil {
				return 0, -1, fmt.Errorf("dual: route cost %w", err)
			}
			r.relax(target, val, in.rowI[j])
		}
		if left == 0 {
			break
		}
		for c := r.fwdG.start[u]; c < r.fwdG.start[u+1]; c++ {
			v := r.fwdG.to[c]
			if v == p || r.settled[v] {
				continue
			}
			nd := it.d + r.fwdG.w[c]
			if !r.sumsFit {
				var err error
				if nd, err = flow.AddChecked(it.d, r.fwdG.w[c]); err != nil {
					return 0, -1, fmt.Errorf("dual: route cost %w", err)
				}
			}
			if r.dist[v] == unreached {
				r.touched = append(r.touched, v)
			} else if nd >= r.dist[v] {
				continue
			}
			r.dist[v] = nd
			r.heap.push(pieceItem{nd, v})
		}
	}
	return r.dist[target], r.pred[target], nil
}

// bigPiece arranges the edges between a piece p (nodes euler[base:
// base+size]) and other pieces for splits without side tables: by the
// depth-first position of their end in p (leaving: byPos, entering:
// inByPos) and by the other piece, in order of (cost, index) (leaving:
// byNb with slots of r.fwdG, entering: inByNb with slots of r.revG).
// O(size + edges of p) memory; outSlot[piece] is the piece's slot.
type bigPiece struct {
	r                      *ranger
	p, base                int32
	size                   int
	posStart, posEdges     []int32
	inPosStart, inPosEdges []int32
	nbStart, nbEdges       []int32
	inNbStart, inNbEdges   []int32
	outSlot                []int32
}

// group sorts edges into buckets by key (counting sort, stable).
func group(edges []int32, buckets int, key func(int32) int32) (start, out []int32) {
	start = make([]int32, buckets+1)
	for _, i := range edges {
		start[key(i)+1]++
	}
	for b := 0; b < buckets; b++ {
		start[b+1] += start[b]
	}
	out = make([]int32, len(edges))
	pos := append([]int32(nil), start[:buckets]...)
	for _, i := range edges {
		out[pos[key(i)]] = i
		pos[key(i)]++
	}
	return start, out
}

func (r *ranger) newBigPiece(p, base int32, size int) *bigPiece {
	bp := &bigPiece{r: r, p: p, base: base, size: size}
	leaving := make([]int32, 0, r.start[p+1]-r.start[p])
	for i := r.start[p]; i < r.start[p+1]; i++ {
		leaving = append(leaving, i)
	}
	entering := r.redges[r.rstart[p]:r.rstart[p+1]]
	bp.posStart, bp.posEdges = group(leaving, size, func(i int32) int32 { return r.tin[r.from[i]] - base })
	bp.inPosStart, bp.inPosEdges = group(entering, size, func(i int32) int32 { return r.tin[r.to[i]] - base })
	byCost := func(es []int32) {
		sort.Slice(es, func(a, b int) bool {
			i, j := es[a], es[b]
			return r.w[i] < r.w[j] || (r.w[i] == r.w[j] && i < j)
		})
	}
	nOut := int(r.fwdG.start[p+1] - r.fwdG.start[p])
	nIn := int(r.revG.start[p+1] - r.revG.start[p])
	bp.nbStart, bp.nbEdges = group(leaving, nOut, func(i int32) int32 { return r.fwdG.of[i] - r.fwdG.start[p] })
	bp.inNbStart, bp.inNbEdges = group(entering, nIn, func(i int32) int32 { return r.revG.of[i] - r.revG.start[p] })
	for j := 0; j < nOut; j++ {
		byCost(bp.nbEdges[bp.nbStart[j]:bp.nbStart[j+1]])
	}
	for j := 0; j < nIn; j++ {
		byCost(bp.inNbEdges[bp.inNbStart[j]:bp.inNbStart[j+1]])
	}
	bp.outSlot = make([]int32, r.k)
	for c := range bp.outSlot {
		bp.outSlot[c] = -1
	}
	for c := r.fwdG.start[p]; c < r.fwdG.start[p+1]; c++ {
		bp.outSlot[r.fwdG.to[c]] = c - r.fwdG.start[p]
	}
	return bp
}

// smallSide finds the cheapest route from one side of the big piece bp.p
// to the other through other pieces, leaving out piece skip (the hub): for
// a cut at the subtree of positions [l, end), from the subtree (fromSub)
// or from the rest. It searches from the smaller side: forward from its
// leaving edges when that is the near side, backward from its entering
// edges when it is the far side; each settled piece is checked for its
// cheapest edge to (from) the other side. Routes costing bound or more are
// not looked for. It returns the cost (unreached: none) and the edge
// entering the far side. O(edges of the smaller side + the pieces settled
// and their merged edges · log k).
func (r *ranger) smallSide(bp *bigPiece, skip int32, l, end int, fromSub bool, bound int64) (int64, int32, error) {
	r.searches++
	r.resetSearch()
	p, base := bp.p, bp.base
	inSub := func(v int32) bool { q := int(r.tin[v] - base); return l <= q && q < end }
	subSmall := 2*(end-l) <= bp.size
	forward := subSmall == fromSub // search from the near side
	// Positions of the smaller side: one range or two.
	ranges := [][2]int{{l, end}}
	if !subSmall {
		ranges = [][2]int{{0, l}, {end, bp.size}}
	}
	posStart, posEdges, ends := bp.posStart, bp.posEdges, r.pTo
	pg := &r.fwdG
	if !forward {
		posStart, posEdges, ends = bp.inPosStart, bp.inPosEdges, r.pFrom
		pg = &r.revG
	}
	// Backward, pred[v] is the edge entering the far side that v's route
	// starts from.
	// Seed the distances first and heap the seeded pieces once (no stale
	// entries; the order of settling is the same).
	for _, rg := range ranges {
		for _, i := range posEdges[posStart[rg[0]]:posStart[rg[1]]] {
			v := ends[i]
			if v == skip {
				continue
			}
			switch w := r.w[i]; {
			case bound != unreached && w >= bound:
				// Routes costing bound or more are not looked for.
			case r.dist[v] == unreached:
				r.touched = append(r.touched, v)
				r.dist[v], r.pred[v] = w, i
			case w < r.dist[v]:
				r.dist[v], r.pred[v] = w, i
			}
		}
	}
	for _, v := range r.touched {
		r.heap = append(r.heap, pieceItem{r.dist[v], v})
	}
	r.heap.init()
	best, bestI := unreached, int32(-1)
	for len(r.heap) > 0 {
		it := r.heap.pop()
		u := it.piece
		if r.settled[u] || it.d != r.dist[u] {
			continue
		}
		if (bound != unreached && it.d >= bound) || (best != unreached && it.d >= best) {
			break
		}
		r.settled[u] = true
		// u's cheapest edge to the far side (forward) or from the near side.
		var list []int32
		if forward {
			if j := r.inSlot[u]; j >= 0 {
				list = bp.inNbEdges[bp.inNbStart[j]:bp.inNbStart[j+1]]
			}
		} else if j := bp.outSlot[u]; j >= 0 {
			list = bp.nbEdges[bp.nbStart[j]:bp.nbStart[j+1]]
		}
		for _, i := range list {
			var ok bool
			if forward {
				ok = inSub(r.to[i]) != fromSub // enters the far side
			} else {
				ok = inSub(r.from[i]) == fromSub // leaves the near side
			}
			if !ok {
				continue
			}
			val, err := flow.AddChecked(it.d, r.w[i])
			if err != nil {
				return 0, -1, fmt.Errorf("dual: route cost %w", err)
			}
			if best == unreached || val < best {
				best, bestI = val, i
				if !forward {
					bestI = r.pred[u]
				}
			}
			break
		}
		// Pieces at bound or best or more would never be settled: they are
		// not offered.
		limit := bound
		if best != unreached && (limit == unreached || best < limit) {
			limit = best
		}
		for c := pg.start[u]; c < pg.start[u+1]; c++ {
			v := pg.to[c]
			if v == p || v == skip || r.settled[v] {
				continue
			}
			nd, err := flow.AddChecked(it.d, pg.w[c])
			if err != nil {
				return 0, -1, fmt.Errorf("dual: route cost %w", err)
			}
			if limit != unreached && nd >= limit {
				continue
			}
			if r.dist[v] == unreached {
				r.touched = append(r.touched, v)
			} else if nd >= r.dist[v] {
				continue
			}
			r.dist[v], r.pred[v] = nd, r.pred[u]
			r.heap.push(pieceItem{nd, v})
		}
	}
	if best != unreached && bound != unreached && best >= bound {
		return unreached, -1, nil
	}
	return best, bestI, nil
}

// splitHub serves the splits of a piece p without side tables: the hub is
// the piece with the most neighbouring pieces besides p. For the nodes of p
// in depth-first order it holds the cheapest route from each node to the
// hub (out: an edge leaving p, then a route avoiding p) and from the hub
// to each node (in, with the edge entering p), minimised over subtrees
// (sub), earlier positions (pre) and later ones (suf).
type splitHub struct {
	piece                     int32
	outSub, outPre, outSuf    []int64
	inSub, inPre, inSuf       []int64
	inSubBy, inPreBy, inSufBy []int32
}

// newSplitHub builds the splitHub of piece p (nodes euler[base:base+size]):
// two searches and O(size + edges of p).
func (r *ranger) newSplitHub(p, base int32, size int) (*splitHub, error) {
	g := r.g
	h := &splitHub{piece: -1}
	most := int32(-1)
	for c := int32(0); int(c) < r.k; c++ {
		if c == p {
			continue
		}
		if d := r.fwdG.start[c+1] - r.fwdG.start[c] + r.revG.start[c+1] - r.revG.start[c]; d > most {
			h.piece, most = c, d
		}
	}
	if h.piece < 0 {
		return h, nil
	}
	toHub, err := r.allDist(h.piece, true, p)
	if err != nil {
		return nil, err
	}
	fromHub, err := r.allDist(h.piece, false, p)
	if err != nil {
		return nil, err
	}
	none := func(n int) ([]int64, []int32) {
		w, by := make([]int64, n), make([]int32, n)
		for i := range by {
			w[i], by[i] = unreached, -1
		}
		return w, by
	}
	var outBy []int32
	h.outSub, outBy = none(size)
	h.inSub, h.inSubBy = none(size)
	for i := r.start[p]; i < r.start[p+1]; i++ {
		if d := toHub[r.pTo[i]]; d != unreached || r.pTo[i] == h.piece {
			if r.pTo[i] == h.piece {
				d = 0
			}
			c, err := flow.AddChecked(r.w[i], d)
			if err != nil {
				return nil, fmt.Errorf("dual: route cost %w", err)
			}
			if q := r.tin[r.from[i]] - base; better(c, i, h.outSub[q], outBy[q]) {
				h.outSub[q], outBy[q] = c, i
			}
		}
	}
	for _, i := range r.redges[r.rstart[p]:r.rstart[p+1]] {
		if d := fromHub[r.pFrom[i]]; d != unreached || r.pFrom[i] == h.piece {
			if r.pFrom[i] == h.piece {
				d = 0
			}
			c, err := flow.AddChecked(d, r.w[i])
			if err != nil {
				return nil, fmt.Errorf("dual: route cost %w", err)
			}
			if q := r.tin[r.to[i]] - base; better(c, i, h.inSub[q], h.inSubBy[q]) {
				h.inSub[q], h.inSubBy[q] = c, i
			}
		}
	}
	var outPreBy, outSufBy []int32
	h.outPre, outPreBy = none(size + 1)
	h.outSuf, outSufBy = none(size + 1)
	h.inPre, h.inPreBy = none(size + 1)
	h.inSuf, h.inSufBy = none(size + 1)
	for q := 0; q < size; q++ {
		minRow(h.outPre[q+1:q+2], outPreBy[q+1:q+2], h.outPre[q:q+1], outPreBy[q:q+1], h.outSub[q:q+1], outBy[q:q+1])
		minRow(h.inPre[q+1:q+2], h.inPreBy[q+1:q+2], h.inPre[q:q+1], h.inPreBy[q:q+1], h.inSub[q:q+1], h.inSubBy[q:q+1])
	}
	for q := size - 1; q >= 0; q-- {
		minRow(h.outSuf[q:q+1], outSufBy[q:q+1], h.outSuf[q+1:q+2], outSufBy[q+1:q+2], h.outSub[q:q+1], outBy[q:q+1])
		minRow(h.inSuf[q:q+1], h.inSufBy[q:q+1], h.inSuf[q+1:q+2], h.inSufBy[q+1:q+2], h.inSub[q:q+1], h.inSubBy[q:q+1])
	}
	for q := size - 1; q >= 1; q-- {
		v := r.euler[int(base)+q]
		u := r.tin[g.other(int(g.parentArc[v]), v)] - base
		minRow(h.outSub[u:u+1], outBy[u:u+1], h.outSub[u:u+1], outBy[u:u+1], h.outSub[q:q+1], outBy[q:q+1])
		minRow(h.inSub[u:u+1], h.inSubBy[u:u+1], h.inSub[u:u+1], h.inSubBy[u:u+1], h.inSub[q:q+1], h.inSubBy[q:q+1])
	}
	return h, nil
}

// route returns the cheapest route through the hub from the subtree of
// the node at position l (ending before end; fromSub) or from the rest of
// the piece, to the other side, with the edge entering the far side
// (unreached, -1: none).
func (h *splitHub) route(l, end int, fromSub bool) (int64, int32, error) {
	if h.piece < 0 {
		return unreached, -1, nil
	}
	pick := func(sub, pre, suf []int64, subBy, preBy, sufBy []int32, subtree bool) (int64, int32) {
		if subtree {
			if subBy != nil {
				return sub[l], subBy[l]
			}
			return sub[l], 0
		}
		a, b := pre[l], suf[end]
		var ai, bi int32
		if preBy != nil {
			ai, bi = preBy[l], sufBy[end]
		}
		if a == unreached || (b != unreached && (b < a || (b == a && bi < ai))) {
			return b, bi
		}
		return a, ai
	}
	o, _ := pick(h.outSub, h.outPre, h.outSuf, nil, nil, nil, fromSub)
	in, by := pick(h.inSub, h.inPre, h.inSuf, h.inSubBy, h.inPreBy, h.inSufBy, !fromSub)
	if o == unreached || in == unreached {
		return unreached, -1, nil
	}
	d, err := flow.AddChecked(o, in)
	if err != nil {
		return 0, -1, fmt.Errorf("dual: route cost %w", err)
	}
	return d, by, nil
}

// nodes fills in the node prices.
func (r *ranger) nodes(s *Sensitivity) error {
	g := r.g
	anchors := r.anchors()
	// Group nodes by their anchor's piece.
	byAnchor := map[int32][]int32{}
	var order []int32
	for v := 0; v < g.nn; v++ {
		if anchors[v] < 0 {
			continue // no supply reaches v: no price
		}
		a := g.comp[anchors[v]]
		if _, ok := byAnchor[a]; !ok {
			order = append(order, a)
		}
		byAnchor[a] = append(byAnchor[a], int32(v))
	}
	for _, a := range order {
		vs := byAnchor[a]
		targets := make([]int32, len(vs))
		for i, v := range vs {
			targets[i] = g.comp[v]
		}
		if err := r.search([]int32{a}, targets, split{child: -1}, -1, false); err != nil {
			return err
		}
		for _, v := range vs {
			if d := r.dist[g.comp[v]]; d != unreached {
				s.Nodes[v].Up, s.Nodes[v].HasUp = r.p[v]+d, true
			}
			if r.keeps(v) {
				// An origin that keeps supply keeps one unit less.
				s.Nodes[v].Up, s.Nodes[v].HasUp = 0, true
			}
		}
		if err := r.search([]int32{a}, targets, split{child: -1}, -1, true); err != nil {
			return err
		}
		for _, v := range vs {
			d := r.dist[g.comp[v]]
			if d != unreached {
				s.Nodes[v].Down, s.Nodes[v].HasDown = r.p[v]-d, true
			}
			if g.hold >= 0 && g.n.Supply[v] >= 0 {
				// One unit less demanded at an origin (or at a node without
				// supply or demand, which then becomes one) is one more
				// unit of its supply, which it may keep at no cost.
				s.Nodes[v].Down, s.Nodes[v].HasDown = max(0, s.Nodes[v].Down), true
				if d == unreached {
					s.Nodes[v].Down = 0
				}
			}
		}
	}
	return nil
}

// keeps reports whether v is an origin keeping part of its supply.
func (r *ranger) keeps(v int32) bool {
	g := r.g
	return g.hold >= 0 && g.n.Supply[v] > 0 && g.held[int(g.holdOf[v])-g.m] > 0
}

// anchors returns, per node, the anchor of its weakly connected piece of the
// network: the hold node, else its origin of least potential (see the
// package documentation); -1 when the piece has no origin.
func (r *ranger) anchors() []int32 {
	out, kind := r.g.anchors(r.p)
	for v := range out {
		if kind[v] < anchorOrigin {
			out[v] = -1 // no supply can reach this piece
		}
	}
	return out
}

// Route returns the cheapest route through the residual network of the
// optimal plan y (valid potentials p) that competes with lane e. With more,
// it runs from the lane's head back to its tail: one more unit on the lane
// and one unit along this route form the cheapest cycle that uses the lane
// more (its cost per unit is the rate minus the lower limit). Without more,
// it runs from the tail to the head: one unit less on the lane and one unit
// along the route (cost: the upper limit minus the rate). The steps avoid
// lane e; nil means no such route exists (or the lane cannot move that
// way). Cost: one search, O(|E| log |V|).
func Route(n *flow.Network, y []int64, p []int64, e flow.LaneID, more bool) ([]Step, error) {
	if (more && y[e] >= n.Upper[e]) || (!more && y[e] <= n.Lower[e]) {
		return nil, nil
	}
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
	t, h := n.Tail[e], n.Head[e]
	from, to := h, t
	if !more {
		from, to = t, h
	}
	sp := split{child: -1}
	if r.isForestArc(int(e)) {
		child := h
		if g.parentArc[t] == int32(e) {
			child = t
		}
		sp = split{piece: g.comp[t], child: child}
	}
	src, dst := r.pieceOf(from, sp), r.pieceOf(to, sp)
	// With a split piece the inner edges across the cut also count: add
	// them to the search as edges of a tiny graph by checking the best one.
	var innerBest *innerEdge
	if sp.child >= 0 {
		for i := range r.inner {
			ie := &r.inner[i]
			if r.pieceOf(ie.from, sp) == src && r.pieceOf(ie.to, sp) == dst && (innerBest == nil || ie.w < innerBest.w) {
				innerBest = ie
			}
		}
	}
	if err := r.search([]int32{src}, []int32{dst}, sp, int32(e), false); err != nil {
		return nil, err
	}
	if innerBest != nil && (r.dist[dst] == unreached || innerBest.w <= r.dist[dst]) {
		ie := *innerBest
		steps := g.treePath(from, ie.from)
		steps = append(steps, r.edgeStep(ie.arc, ie.from))
		return append(steps, g.treePath(ie.to, to)...), nil
	}
	if src != dst && r.dist[dst] == unreached {
		return nil, nil
	}
	// Walk the predecessor edges back from dst, then join them through the
	// pieces' forests.
	var edges []int32
	for v := dst; v != src; {
		i := r.pred[v]
		edges = append(edges, i)
		v = r.pieceOf(r.from[i], sp)
	}
	var steps []Step
	at := from
	for k := len(edges) - 1; k >= 0; k-- {
		i := edges[k]
		steps = append(steps, g.treePath(at, r.from[i])...)
		steps = append(steps, g.step(int(r.arcOf[i]), r.fwd[i]))
		at = r.to[i]
	}
	return append(steps, g.treePath(at, to)...), nil
}

// edgeStep returns the step of arc e leaving node from.
func (r *ranger) edgeStep(e int32, from int32) Step {
	return r.g.step(int(e), r.g.tail(int(e)) == from)
}
