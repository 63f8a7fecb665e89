package dual

import (
	"fmt"
	"math"

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
// piece of lanes at a bound between pieces (with distances through the
// best-connected pieces, the hubs, bounding each search when there are
// several sources), and two per lane in use, started from the pieces next
// to one side of its cut (side tables, O(|V|·k) memory per piece at most,
// give the cheapest edges; a hub bounds them when a piece has many cuts)
// and stopped once they cannot beat the best route. Each is O((k + k') log k) at worst and usually stopped
// early. Memory O(|V| + |E|) besides the side tables (at most 2^20 cells).
//
// Every value is exact. When a limit, a node price or the cost (in reduced
// costs) of a cheapest route behind one passes the int64 range, Ranges
// returns an error wrapping flow.ErrOverflow instead; a route that costs
// more than an int64 holds but decides nothing (a saving of 0, a route
// that a cheaper one beats) is no error.
func Ranges(n *flow.Network, y []int64, p []int64) (*Sensitivity, error) {
	return ranges(n, y, p, defaultHubs())
}

// ranges is Ranges with hubs saying which pieces bound the searches from
// many sources (tests compare other rules with the defaults).
func ranges(n *flow.Network, y []int64, p []int64, hubs hubRule) (*Sensitivity, error) {
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
	r.hubs = hubs
	if err := r.buildEdges(); err != nil {
		return nil, err
	}
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
	dist    []int64
	settled []bool
	pred    []int32
	touched []int32
	heap    pieceHeap
	want    []int32 // search number for which a piece is a target
	// viaHub[v] >= 0: the route hubSearch found to v goes from viaSrc
	// through that hub of hub.
	viaHub []int32
	viaSrc int32
	hub    *hubDist
	// hubTrees are the searches from and to the hubs of split pieces,
	// kept (see avoidDist), and avoidBuf scratch for newSplitHub's
	// distances.
	hubTrees []*hubTree
	avoidBuf [2][]int64
	// side is sideSearch's state.
	side     sideState
	stamp    int32
	searches int
	hubs     hubRule
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

// beyond stands for a route whose cost passes the int64 range. The
// searches add distances with saturation (sat), so every distance below
// beyond is exact; a limit or price that needs a route at beyond is
// reported as flow.ErrOverflow (beyondErr), never wrapped around.
const beyond = math.MaxInt64

// sat returns a+b for a distance a >= 0 and a reduced cost b >= 0, or
// beyond when the sum does not fit.
func sat(a, b int64) int64 {
	if b > beyond-a {
		return beyond
	}
	return a + b
}

// beyondErr is the error of a limit or price behind a route at beyond.
func beyondErr() error {
	return fmt.Errorf("dual: a route behind a rate range or node price costs more than an int64 holds: %w", flow.ErrOverflow)
}

// shift returns base+d (plus) or base-d for a route cost d (not unreached),
// or flow.ErrOverflow when d is beyond or the result does not fit.
func shift(base, d int64, plus bool) (int64, error) {
	if d == beyond {
		return 0, beyondErr()
	}
	var v int64
	var err error
	if plus {
		v, err = flow.AddChecked(base, d)
	} else {
		v, err = flow.SubChecked(base, d)
	}
	if err != nil {
		return 0, fmt.Errorf("dual: rate range or node price %w", err)
	}
	return v, nil
}

func newRanger(g *graph, p []int64) *ranger {
	full := make([]int64, g.numNodes())
	copy(full, p)
	r := &ranger{g: g, p: full, k: g.pieces, hubs: defaultHubs()}
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
	r.subtrees()
	r.cover()
	r.reachability()
	nv := k + 1
	r.dist = make([]int64, nv)
	r.settled = make([]bool, nv)
	r.pred = make([]int32, nv)
	r.want = make([]int32, nv)
	r.inSlot = make([]int32, nv)
	r.viaHub = make([]int32, nv)
	for i := range r.dist {
		r.dist[i] = unreached
		r.pred[i] = -1
		r.inSlot[i] = -1
		r.viaHub[i] = -1
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
func (r *ranger) search(sources []int32, targets []int32, sp split, exclude int32, reverse bool) {
	r.searches++
	r.resetSearch()
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
			r.relaxEach(it, sp, exclude, reverse)
			continue
		}
		for c := pg.start[u]; c < pg.start[u+1]; c++ {
			v := pg.to[c]
			if r.settled[v] {
				continue
			}
			nd := sat(it.d, pg.w[c])
			r.relax(v, nd, pg.rep[c])
		}
	}
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
func (r *ranger) relaxEach(it pieceItem, sp split, exclude int32, reverse bool) {
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
		nd := sat(it.d, r.w[i])
		r.relax(v, nd, i)
	}
}

type pieceItem struct {
	d     int64
	piece int32
}

// pieceHeap is a binary min-heap of pieces by (distance, piece) (TestPieceHeapOrder).
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
	i := r.pred[v]
	if h := r.viaHub[v]; h >= 0 {
		i = r.hub.fromPred[h][v]
		if v == r.hub.pieces[h] {
			i = r.intoHub(r.hub, h, r.viaSrc)
		}
	}
	if i >= 0 && int(r.arcOf[i]) < r.g.m {
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
				if lr.CapacityValue, err = flow.SubChecked(diff, rate); err != nil {
					return fmt.Errorf("dual: capacity value %w", err)
				}
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
	if len(order) >= minHubSources && r.hubs.max > 0 {
		hub = r.newHub()
	}
	var targets []int32
	for si, src := range order {
		qs := queries[qStart[si]:qStart[si+1]]
		targets = targets[:0]
		for _, q := range qs {
			if q.kind == 1 {
				targets = append(targets, g.comp[g.head(q.lane)])
			} else {
				targets = append(targets, g.comp[g.tail(q.lane)])
			}
		}
		if hub != nil {
			r.hubSearch(hub, src, targets)
		} else {
			r.search([]int32{src}, targets, split{child: -1}, -1, false)
		}
		for _, q := range qs {
			e := q.lane
			_, _, _, rate := g.arc(e)
			t, h := g.tail(e), g.head(e)
			diff := r.p[h] - r.p[t] // checked above
			lr := &s.Lanes[e]
			var err error
			switch q.kind {
			case 0:
				if d := r.dist[g.comp[t]]; d != unreached {
					if lr.Lower, err = shift(diff, d, false); err != nil {
						return err
					}
					lr.HasLower, lr.ByRoute = true, true
					lr.LowerBy = -1
				}
			case 1:
				if d := r.dist[g.comp[h]]; d != unreached {
					if lr.Upper, err = shift(diff, d, true); err != nil {
						return err
					}
					lr.HasUpper, lr.ByRoute = true, true
					lr.UpperBy = r.firstLane(g.comp[h])
				}
			case 2:
				// One more unit through the lane and back from its head
				// to its tail by the cheapest route (d) saves
				// diff-rate-d. The lane itself, backwards, is such a
				// route (d = diff-rate, saving 0); routes are simple, so
				// it is the only one from the head's piece that uses the
				// lane, and any other is found instead when it is
				// cheaper. No search without the lane is needed.
				if d := r.dist[g.comp[t]]; d != unreached {
					// diff-rate is the lane's reduced cost backwards, at
					// least 0 at capacity; beyond d, no saving.
					if d != beyond {
						lr.CapacityValue = max(0, diff-rate-d)
					}
				}
			}
		}
	}
	return nil
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
		r.search([]int32{a}, targets, split{child: -1}, -1, false)
		for _, v := range vs {
			if r.keeps(v) {
				// An origin that keeps supply keeps one unit less.
				s.Nodes[v].Up, s.Nodes[v].HasUp = 0, true
				continue
			}
			if d := r.dist[g.comp[v]]; d != unreached {
				up, err := shift(r.p[v], d, true)
				if err != nil {
					return err
				}
				s.Nodes[v].Up, s.Nodes[v].HasUp = up, true
			}
		}
		r.search([]int32{a}, targets, split{child: -1}, -1, true)
		for _, v := range vs {
			d := r.dist[g.comp[v]]
			if g.hold >= 0 && g.n.Supply[v] >= 0 {
				// One unit less demanded at an origin (or at a node without
				// supply or demand, which then becomes one) is one more
				// unit of its supply, which it may keep at no cost: the
				// saving is at least 0, and 0 when the route back is
				// missing or costs more than an int64 holds.
				// (A difference below the int64 range is below 0.)
				s.Nodes[v].Down, s.Nodes[v].HasDown = 0, true
				if d != unreached && d != beyond {
					if down, err := flow.SubChecked(r.p[v], d); err == nil {
						s.Nodes[v].Down = max(down, 0)
					}
				}
				continue
			}
			if d != unreached {
				down, err := shift(r.p[v], d, false)
				if err != nil {
					return err
				}
				s.Nodes[v].Down, s.Nodes[v].HasDown = down, true
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
// way). When the cheapest route costs more, in reduced costs, than an
// int64 holds, the error wraps flow.ErrOverflow. Cost: one search,
// O(|E| log |V|).
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
	r.search([]int32{src}, []int32{dst}, sp, int32(e), false)
	if innerBest != nil && (r.dist[dst] == unreached || innerBest.w <= r.dist[dst]) {
		ie := *innerBest
		steps := g.treePath(from, ie.from)
		steps = append(steps, r.edgeStep(ie.arc, ie.from))
		return append(steps, g.treePath(ie.to, to)...), nil
	}
	if src != dst && r.dist[dst] == unreached {
		return nil, nil
	}
	if r.dist[dst] == beyond {
		return nil, beyondErr() // the route found need not be the cheapest
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
