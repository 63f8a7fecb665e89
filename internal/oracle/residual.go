package oracle

import (
	"math/big"

	"lanecert/flow"
)

// ResidualArc is an arc of the residual network of a plan: moving one unit
// along it changes Lane (or, when Lane is -1, the supply kept at the
// origin at its From or To end) by +1 (Forward) or -1, at Rate per unit;
// Room units can move (flow.NoLimit: no limit).
type ResidualArc struct {
	From, To int
	Lane     int
	Forward  bool
	Rate     int64
	Room     int64
}

// Residual lists the residual arcs of plan x (feasible for n), lanes in
// order, each forward arc before its backward one; when total supply
// exceeds total demand, node len(n.Nodes) is a hold node H, and origin v
// has an arc v -> H at rate 0 while it keeps less than its supply and
// H -> v while it keeps some. It returns the arcs and the number of nodes
// (H included). Exact; written from the definition, sharing no code with
// lanecert's solvers.
func Residual(n *flow.Network, x []int64) (arcs []ResidualArc, nodes int) {
	nodes = len(n.Nodes)
	for a := range n.Tail {
		t, h := int(n.Tail[a]), int(n.Head[a])
		if n.Upper[a] == flow.NoLimit {
			arcs = append(arcs, ResidualArc{t, h, a, true, n.Rate[a], flow.NoLimit})
		} else if x[a] < n.Upper[a] {
			arcs = append(arcs, ResidualArc{t, h, a, true, n.Rate[a], n.Upper[a] - x[a]})
		}
		if x[a] > n.Lower[a] {
			arcs = append(arcs, ResidualArc{h, t, a, false, -n.Rate[a], x[a] - n.Lower[a]})
		}
	}
	s, d, _ := n.Totals()
	if s > d {
		hold := nodes
		nodes++
		out := make([]int64, len(n.Nodes))
		for a := range n.Tail {
			out[n.Tail[a]] += x[a]
			out[n.Head[a]] -= x[a]
		}
		for v, sv := range n.Supply {
			if sv <= 0 {
				continue
			}
			kept := sv - out[v]
			if kept < sv {
				arcs = append(arcs, ResidualArc{v, hold, -1, true, 0, sv - kept})
			}
			if kept > 0 {
				arcs = append(arcs, ResidualArc{hold, v, -1, false, 0, kept})
			}
		}
	}
	return arcs, nodes
}

// NegativeCycle runs Bellman-Ford over arcs from a virtual root joined to
// every node at cost 0. With no cycle of negative cost it returns the
// distances (potentials for which no arc has a negative reduced cost);
// otherwise such a cycle, as arcs in walk order. O(nodes·len(arcs)). It
// panics when a distance overflows int64 (the small networks of tests
// stay far from it).
func NegativeCycle(arcs []ResidualArc, nodes int) (dist []int64, cycle []ResidualArc) {
	dist, cycle, ok := negativeCycle(arcs, nodes)
	if !ok {
		panic("oracle: residual distance overflows int64")
	}
	return dist, cycle
}

// negativeCycle is NegativeCycle, with ok false instead of a panic.
func negativeCycle(arcs []ResidualArc, nodes int) (dist []int64, cycle []ResidualArc, ok bool) {
	dist = make([]int64, nodes)
	pred := make([]int, nodes)
	for v := range pred {
		pred[v] = -1
	}
	last := -1
	for range nodes + 1 {
		last = -1
		for i, e := range arcs {
			d := dist[e.From] + e.Rate
			if (e.Rate > 0 && d < dist[e.From]) || (e.Rate < 0 && d > dist[e.From]) {
				return nil, nil, false
			}
			if d < dist[e.To] {
				dist[e.To], pred[e.To], last = d, i, e.To
			}
		}
		if last < 0 {
			return dist, nil, true
		}
	}
	v := last
	for range nodes {
		v = arcs[pred[v]].From
	}
	for u := v; ; {
		e := arcs[pred[u]]
		cycle = append([]ResidualArc{e}, cycle...)
		u = e.From
		if u == v {
			break
		}
	}
	return nil, cycle, true
}

// Improvable reports whether plan x (feasible for n) is not optimal: its
// residual network has a cycle of negative cost (the exact optimality
// condition of minimum-cost flow; an unbounded problem has one too, of
// lanes without capacity). It panics when a distance overflows int64.
func Improvable(n *flow.Network, x []int64) bool {
	_, cycle := NegativeCycle(Residual(n, x))
	return cycle != nil
}

// Cheapest returns the cost of a cheapest walk from node from to node to
// over arcs, leaving out the arcs of lane skip (-1: none), in exact
// big-integer arithmetic, so sums beyond int64 are kept; nil when to cannot
// be reached. The arcs must have no cycle of negative cost (the residual
// network of an optimal plan). Bellman-Ford, O(nodes·len(arcs)).
func Cheapest(arcs []ResidualArc, nodes, from, to, skip int) *big.Int {
	dist := make([]*big.Int, nodes)
	dist[from] = new(big.Int)
	rate := new(big.Int)
	for range nodes {
		changed := false
		for _, e := range arcs {
			if dist[e.From] == nil || (skip >= 0 && e.Lane == skip) {
				continue
			}
			d := new(big.Int).Add(dist[e.From], rate.SetInt64(e.Rate))
			if dist[e.To] == nil || d.Cmp(dist[e.To]) < 0 {
				dist[e.To], changed = d, true
			}
		}
		if !changed {
			break
		}
	}
	return dist[to]
}
