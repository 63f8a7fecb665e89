package flow

import (
	"fmt"
	"math"
	"slices"
)

// Cut is a certificate that no plan meets the demands: a region (a set of
// nodes) whose net demand exceeds what can reach it. A planner checks it
// with a calculator from the network alone:
//
//	Demand = Σ over the region of -Supply  (demand minus supply)
//	Reach  = Σ Upper of the lanes into the region
//	       - Σ Lower of the lanes out of the region
//	Short  = Demand - Reach > 0
//
// Every plan within the lane bounds brings at most Reach into the region
// (the lanes into it carry at most their capacity, the lanes out of it at
// least their minimum), and the region needs Demand, so at least Short
// units of demand stay unmet, or, equivalently, some node cannot balance.
//
// # Excess supply and the hold node
//
// When total supply exceeds total demand, origins may keep supply (see the
// package documentation). That rule is the virtual hold node H of the
// rules: a destination with demand equal to the excess (total supply minus
// total demand), reached from every origin v by a hold lane of capacity
// Supply[v]. A region may then contain H (Hold is true): H counts in
// Demand with the excess, and Reach counts, for every origin outside the
// region, its supply (the capacity of its hold lane into the region).
// Such a region proves that minimums force more into the real nodes
// outside it, call them T, than T can pass on or use: with the same Short,
//
//	Short = Σ Lower of the lanes into T - Σ Upper of the lanes out of T
//	      - Σ demand of the destinations in T.
//
// Origins in T do not help: an origin may keep supply but cannot take any
// in. Hold regions arise only from lane minimums (without minimums, every
// region of largest Short is a set of real nodes).
type Cut struct {
	// Region lists the real nodes of the region in increasing order. It
	// does not contain the hold node; Hold says whether the region also
	// holds it.
	Region []NodeID
	// Hold reports that the region contains the hold node H (possible only
	// when total supply exceeds total demand). certcheck-style checkers
	// that take a single node list number H as NumNodes().
	Hold bool
	// Demand is the region's net demand: total demand minus total supply
	// of its nodes, plus the excess when Hold (quantity scale; may be
	// negative).
	Demand int64
	// Reach is the most that can reach the region: the capacities of the
	// lanes into it (plus, when Hold, the supplies of the origins outside
	// it) minus the minimums of the lanes out of it (quantity scale; may be
	// negative). No lane into the region lacks a capacity.
	Reach int64
	// Short is Demand - Reach > 0: the least demand no plan can meet (see
	// FindCut for the exact statement).
	Short int64
	// FullLanes lists the lanes into the region, in increasing order. Every
	// best attempt (a plan within the bounds that leaves only Short unmet,
	// origins shipping what they can) runs them at capacity.
	FullLanes []LaneID
	// OutLanes lists the lanes out of the region with a positive minimum,
	// in increasing order. Every best attempt runs them at their minimum.
	OutLanes []LaneID
}

// HoldNode returns the number that stands for the virtual hold node H in
// node lists that may contain it (certcheck.Cut): NumNodes().
func HoldNode(n *Network) NodeID { return NodeID(len(n.Nodes)) }

// FindCut returns a cut proving that no plan meets the demands of n, or nil
// when a feasible plan exists (lane bounds, balances and the excess-supply
// rule of the package documentation).
//
// # What Short is
//
// For a set S of nodes (including H when total supply exceeds total
// demand), let viol(S) = Demand(S) - Reach(S) as defined at Cut. By the
// circulation theorem with lower bounds (Hoffman), a plan exists if and
// only if viol(S) <= 0 for every S. FindCut returns the region of largest
// viol, and Short = max over S of viol(S). Equivalently, Short is what
// stays unmet of the shifted demands after a maximum flow in the
// transformed network below; without lane minimums that is exactly total demand minus the most the
// origins can deliver to the destinations through the lanes, the least
// number of units of demand that every plan leaves unmet. Short equals
// Solution.Shortfall of an infeasible Solve, with or without minimums and
// whether supply is short or not (the tests compare them on random
// networks).
//
// Put as a linear program (and checked that way by the tests): Short is
// the least total supply that has to be added at some nodes, while any
// node may also dispose of any surplus, for a plan within the lane bounds
// (and the excess-supply rule) to exist.
//
// When total supply is below total demand, no hold node exists, origins
// may ship less than their supply (the max-flow view) and Short is again
// total demand minus the most that can be delivered, so Short >= total
// demand - total supply. If the supply alone is the binding limit, the
// region is every node that can still send to an unmet destination, often
// all nodes, with Reach = 0 (no lane enters or leaves the whole network)
// and Demand = total demand - total supply; a tighter region appears when
// lane capacities bind harder than the total supply.
//
// # Method
//
// Lane minimums are shifted out: lane a carries Lower[a] plus a flow in
// [0, Upper[a]-Lower[a]] (no limit stays no limit). Node v then has the
// shifted supply b'(v) = Supply[v] - Σ Lower out of v + Σ Lower into v;
// H has b'(H) = -excess. A super source s has an arc to every node with
// b' > 0 (capacity b'), every node with b' < 0 has an arc to a super sink t
// (capacity -b'), and each origin v has its hold lane to H (capacity
// Supply[v]). An arc s->v only caps what v may send: origins may ship less
// than their supply (the excess-supply rule, and the max-flow view when
// supply is short). After a maximum s-t flow (Dinic's algorithm), Short =
// Σ(-b' over b' < 0) - maxflow = Demand(S) - Reach(S) for every minimum cut
// with sink side S (the lane terms add up to Upper into S minus Lower out
// of S), so the minimum cuts are exactly the regions of largest viol.
//
// # Which region
//
// Among all minimum cuts, FindCut returns the smallest region: the nodes
// from which t can still be reached in the residual network of the maximum
// flow. This set is the same for every maximum flow and is contained in
// every region of largest viol, so it is the smallest by inclusion and by
// node count, and it does not depend on the order in which the flow was
// found. It names only the bottleneck a planner has to widen; larger
// regions of the same Short add nodes that do not matter.
//
// # Cost
//
// Dinic's algorithm on flat arrays: O(|V|²·|E|) time in the worst case
// (usually far less; see BenchmarkFindCut), about 40 bytes per lane plus
// 30 per node of memory. Every quantity is an exact int64: the totals of
// b' are checked first, so no flow or residual can overflow; a network
// whose totals do not fit gives an error wrapping ErrOverflow. The result depends only on n. The error is
// non-nil only when n is invalid (Validate) or a value overflows.
func FindCut(n *Network) (*Cut, error) {
	if err := n.Validate(); err != nil {
		return nil, err
	}
	supply, demand, err := n.Totals()
	if err != nil {
		return nil, err
	}
	nv, m := len(n.Nodes), len(n.Tail)
	hold := supply > demand
	excess := supply - demand // both totals >= 0: no overflow

	// Shifted supplies b'.
	nodes := nv
	if hold {
		nodes++
	}
	bs := make([]int64, nodes)
	copy(bs, n.Supply)
	if hold {
		bs[nv] = -excess
	}
	for a := 0; a < m; a++ {
		l := n.Lower[a]
		if l == 0 || n.Tail[a] == n.Head[a] {
			continue
		}
		t, h := n.Tail[a], n.Head[a]
		if bs[t], err = SubChecked(bs[t], l); err != nil {
			return nil, fmt.Errorf("flow: find cut: supply of node %q less lane minimums %w", n.Nodes[t], err)
		}
		if bs[h], err = AddChecked(bs[h], l); err != nil {
			return nil, fmt.Errorf("flow: find cut: supply of node %q plus lane minimums %w", n.Nodes[h], err)
		}
	}
	var srcTotal, sinkTotal int64
	for v, b := range bs {
		if b > 0 {
			srcTotal, err = AddChecked(srcTotal, b)
		} else if b < 0 {
			if b == math.MinInt64 {
				err = ErrOverflow
			} else {
				sinkTotal, err = AddChecked(sinkTotal, -b)
			}
		}
		if err != nil {
			return nil, fmt.Errorf("flow: find cut: total shifted supply at node %d %w", v+1, err)
		}
	}

	g := newCutGraph(nodes+2, 2*(m+nv+nodes))
	s, t := int32(nodes), int32(nodes+1)
	for a := 0; a < m; a++ {
		if n.Tail[a] == n.Head[a] {
			continue // a self-loop neither enters nor leaves any region
		}
		c := NoLimit
		if n.Upper[a] != NoLimit {
			c = n.Upper[a] - n.Lower[a]
		}
		if c > 0 {
			g.addArc(n.Tail[a], n.Head[a], c)
		}
	}
	if hold {
		for v := 0; v < nv; v++ {
			if n.Supply[v] > 0 {
				g.addArc(int32(v), int32(nv), n.Supply[v])
			}
		}
	}
	for v, b := range bs {
		if b > 0 {
			g.addArc(s, int32(v), b)
		} else if b < 0 {
			g.addArc(int32(v), t, -b)
		}
	}
	g.build()
	short := sinkTotal - g.maxFlow(s, t) // the flow is at most srcTotal and sinkTotal
	if short == 0 {
		return nil, nil
	}

	in := g.reachesSink(t)
	c := &Cut{Hold: hold && in[nv]}
	for v := 0; v < nv; v++ {
		if in[v] {
			c.Region = append(c.Region, NodeID(v))
		}
	}
	if err := c.fill(n, in, excess); err != nil {
		return nil, err
	}
	if c.Short != short {
		return nil, fmt.Errorf("flow: find cut: internal error: region gives %d short, maximum flow %d", c.Short, short)
	}
	return c, nil
}

// fill computes Demand, Reach, Short and the lane lists of c from the
// region membership in (in[NumNodes()] is H when it exists), with checked
// arithmetic.
func (c *Cut) fill(n *Network, in []bool, excess int64) error {
	nv := len(n.Nodes)
	var err error
	add := func(sum *int64, v int64, what string) {
		if err != nil {
			return
		}
		if *sum, err = AddChecked(*sum, v); err != nil {
			err = fmt.Errorf("flow: find cut: %s %w", what, err)
		}
	}
	for _, v := range c.Region {
		add(&c.Demand, -n.Supply[v], "net demand of the region")
	}
	if c.Hold {
		add(&c.Demand, excess, "net demand of the region")
		for v := 0; v < nv; v++ {
			if !in[v] && n.Supply[v] > 0 {
				add(&c.Reach, n.Supply[v], "reach of the region")
			}
		}
	}
	for a := range n.Tail {
		ti, hi := in[n.Tail[a]], in[n.Head[a]]
		switch {
		case !ti && hi:
			if n.Upper[a] == NoLimit {
				return fmt.Errorf("flow: find cut: internal error: lane %s without capacity enters the region", n.LaneName(LaneID(a)))
			}
			c.FullLanes = append(c.FullLanes, LaneID(a))
			add(&c.Reach, n.Upper[a], "reach of the region")
		case ti && !hi && n.Lower[a] > 0:
			c.OutLanes = append(c.OutLanes, LaneID(a))
			add(&c.Reach, -n.Lower[a], "reach of the region")
		}
	}
	if err != nil {
		return err
	}
	if c.Short, err = SubChecked(c.Demand, c.Reach); err != nil {
		return fmt.Errorf("flow: find cut: demand less reach %w", err)
	}
	return nil
}

// cutGraph is a residual network on flat arrays for Dinic's algorithm.
// Arcs come in pairs: arc k^1 is the reverse of arc k, and res[k] is the
// residual capacity (NoLimit for an arc without capacity, which stays
// within int64 because the total flow is bounded by the finite source arcs).
type cutGraph struct {
	nodes int
	from  []int32 // tail of each arc, while building
	to    []int32
	res   []int64
	start []int32 // CSR: arcs leaving v are list[start[v]:start[v+1]]
	list  []int32
	level []int32
	next  []int32 // current arc per node within a phase
}

func newCutGraph(nodes, arcs int) *cutGraph {
	return &cutGraph{
		nodes: nodes,
		from:  make([]int32, 0, arcs),
		to:    make([]int32, 0, arcs),
		res:   make([]int64, 0, arcs),
	}
}

func (g *cutGraph) addArc(u, v int32, c int64) {
	g.from = append(g.from, u, v)
	g.to = append(g.to, v, u)
	g.res = append(g.res, c, 0)
}

// build fills the CSR adjacency; arcs of a node keep insertion order.
func (g *cutGraph) build() {
	g.start = make([]int32, g.nodes+1)
	for _, u := range g.from {
		g.start[u+1]++
	}
	for v := 0; v < g.nodes; v++ {
		g.start[v+1] += g.start[v]
	}
	pos := slices.Clone(g.start[:g.nodes])
	g.list = make([]int32, len(g.from))
	for k, u := range g.from {
		g.list[pos[u]] = int32(k)
		pos[u]++
	}
	g.from = nil
	g.level = make([]int32, g.nodes)
	g.next = make([]int32, g.nodes)
}

// maxFlow runs Dinic's algorithm from s to t and returns the flow value:
// breadth-first levels, then augmenting paths along level-increasing arcs
// with a current-arc pointer per node, until t is out of reach. O(|V|²|E|).
func (g *cutGraph) maxFlow(s, t int32) int64 {
	var total int64
	queue := make([]int32, 0, g.nodes)
	path := make([]int32, 0, g.nodes)
	for {
		for v := range g.level {
			g.level[v] = -1
		}
		g.level[s] = 0
		queue = append(queue[:0], s)
		for i := 0; i < len(queue); i++ {
			u := queue[i]
			for _, k := range g.list[g.start[u]:g.start[u+1]] {
				if v := g.to[k]; g.res[k] > 0 && g.level[v] < 0 {
					g.level[v] = g.level[u] + 1
					queue = append(queue, v)
				}
			}
		}
		if g.level[t] < 0 {
			return total
		}
		copy(g.next, g.start[:g.nodes])
		for {
			f := g.augment(s, t, path)
			if f == 0 {
				break
			}
			total += f // bounded by the checked total of the source arcs
		}
	}
}

// augment finds one path of level-increasing arcs with residual capacity
// from s to t, pushes its bottleneck and returns it, or returns 0 when the
// phase is blocked. Dead ends are removed from the level graph.
func (g *cutGraph) augment(s, t int32, path []int32) int64 {
	path = path[:0]
	u := s
	for {
		if u == t {
			f := NoLimit
			for _, k := range path {
				f = min(f, g.res[k])
			}
			for _, k := range path {
				g.res[k] -= f
				g.res[k^1] += f
			}
			return f
		}
		advanced := false
		for ; g.next[u] < g.start[u+1]; g.next[u]++ {
			k := g.list[g.next[u]]
			if v := g.to[k]; g.res[k] > 0 && g.level[v] == g.level[u]+1 {
				path = append(path, k)
				u = v
				advanced = true
				break
			}
		}
		if advanced {
			continue
		}
		if u == s {
			return 0
		}
		g.level[u] = -1 // dead end for the rest of the phase
		k := path[len(path)-1]
		path = path[:len(path)-1]
		u = g.to[k^1]
		g.next[u]++
	}
}

// reachesSink marks the nodes from which t can be reached along arcs with
// residual capacity (a backward search from t). O(|V|+|E|).
func (g *cutGraph) reachesSink(t int32) []bool {
	in := make([]bool, g.nodes)
	in[t] = true
	queue := []int32{t}
	for i := 0; i < len(queue); i++ {
		w := queue[i]
		for _, k := range g.list[g.start[w]:g.start[w+1]] {
			// Arc k leaves w; its reverse k^1 runs from to[k] into w.
			if u := g.to[k]; !in[u] && g.res[k^1] > 0 {
				in[u] = true
				queue = append(queue, u)
			}
		}
	}
	return in
}
