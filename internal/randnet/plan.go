package randnet

import (
	"math/rand/v2"

	"lanecert/flow"
)

// residual is a working copy of a network extended by the virtual hold
// node H (index len(n.Nodes)) and one hold arc v -> H with bounds
// [0, Supply[v]] per origin when total supply exceeds total demand.
// Arcs 0..m-1 are the lanes, the rest hold arcs.
type residual struct {
	tail, head []flow.NodeID
	lo, up, x  []int64
	out, in    [][]int // arcs leaving / entering each node, in arc order
	want       []int64 // required outflow minus inflow per node
}

// newResidual returns the extended network with every lane at x and every
// hold arc at 0, or false when total demand exceeds total supply.
func newResidual(n *flow.Network, x []int64) (*residual, bool) {
	supply, demand, err := n.Totals()
	if err != nil || demand > supply {
		return nil, false
	}
	nn := len(n.Nodes)
	r := &residual{
		tail: append([]flow.NodeID(nil), n.Tail...),
		head: append([]flow.NodeID(nil), n.Head...),
		lo:   append([]int64(nil), n.Lower...),
		up:   append([]int64(nil), n.Upper...),
		x:    append([]int64(nil), x...),
		want: append([]int64(nil), n.Supply...),
	}
	nodes := nn
	if supply > demand {
		nodes++
		r.want = append(r.want, demand-supply)
		for v, s := range n.Supply {
			if s > 0 {
				r.tail = append(r.tail, flow.NodeID(v))
				r.head = append(r.head, flow.NodeID(nn))
				r.lo = append(r.lo, 0)
				r.up = append(r.up, s)
				r.x = append(r.x, 0)
			}
		}
	}
	r.out = make([][]int, nodes)
	r.in = make([][]int, nodes)
	for a := range r.tail {
		r.out[r.tail[a]] = append(r.out[r.tail[a]], a)
		r.in[r.head[a]] = append(r.in[r.head[a]], a)
	}
	return r, true
}

// move is one step of a residual path: arc a, forward (x grows) or not.
type move struct {
	a       int
	forward bool
}

// spare returns how much arc a can move in the direction given.
func (r *residual) spare(mv move) int64 {
	if mv.forward {
		return r.up[mv.a] - r.x[mv.a]
	}
	return r.x[mv.a] - r.lo[mv.a]
}

// moves returns the residual steps out of v in a random order.
func (r *residual) moves(rng *rand.Rand, v flow.NodeID) []move {
	var ms []move
	for _, a := range r.out[v] {
		if mv := (move{a, true}); r.spare(mv) > 0 {
			ms = append(ms, mv)
		}
	}
	for _, a := range r.in[v] {
		if mv := (move{a, false}); r.spare(mv) > 0 {
			ms = append(ms, mv)
		}
	}
	rng.Shuffle(len(ms), func(i, j int) { ms[i], ms[j] = ms[j], ms[i] })
	return ms
}

func (r *residual) other(mv move) flow.NodeID {
	if mv.forward {
		return r.head[mv.a]
	}
	return r.tail[mv.a]
}

func (r *residual) apply(mv move, d int64) {
	if mv.forward {
		r.x[mv.a] += d
	} else {
		r.x[mv.a] -= d
	}
}

// FeasiblePlan returns a feasible plan for n and true, or nil and false
// when n has none. It starts from every lane at its minimum and pushes the
// remaining imbalances along randomly chosen residual paths (augmenting
// paths, so the answer "no plan" is exact: no path from a node with surplus
// to a node with a shortfall means a cut that cannot be crossed). Then, with
// probability one half, it pushes random amounts around a few random
// residual cycles, so plans range from degenerate (few lanes in use) to
// spread out. The excess-supply rule of package flow applies. Each push
// settles a node's imbalance or fills a lane; on the small networks of this
// package that is fast.
func FeasiblePlan(rng *rand.Rand, n *flow.Network) ([]int64, bool) {
	r, ok := newResidual(n, n.Lower)
	if !ok {
		return nil, false
	}
	nodes := len(r.want)
	imb := make([]int64, nodes) // still to send (> 0) or receive (< 0)
	copy(imb, r.want)
	for a := range r.tail {
		imb[r.tail[a]] -= r.x[a]
		imb[r.head[a]] += r.x[a]
	}
	for {
		var sources []flow.NodeID
		for v := range nodes {
			if imb[v] > 0 {
				sources = append(sources, flow.NodeID(v))
			}
		}
		if len(sources) == 0 {
			break
		}
		// Depth-first search from all surplus nodes at once, in random order.
		rng.Shuffle(len(sources), func(i, j int) { sources[i], sources[j] = sources[j], sources[i] })
		pred := make([]move, nodes)
		seen := make([]bool, nodes)
		stack := append([]flow.NodeID(nil), sources...)
		for _, s := range sources {
			seen[s] = true
		}
		sink := flow.NodeID(-1)
		for len(stack) > 0 && sink < 0 {
			v := stack[len(stack)-1]
			stack = stack[:len(stack)-1]
			for _, mv := range r.moves(rng, v) {
				w := r.other(mv)
				if seen[w] {
					continue
				}
				seen[w] = true
				pred[w] = mv
				if imb[w] < 0 {
					sink = w
					break
				}
				stack = append(stack, w)
			}
		}
		if sink < 0 {
			return nil, false
		}
		var path []move
		d := -imb[sink]
		v := sink
		for imb[v] <= 0 || len(path) == 0 {
			mv := pred[v]
			path = append(path, mv)
			d = min(d, r.spare(mv))
			if mv.forward {
				v = r.tail[mv.a]
			} else {
				v = r.head[mv.a]
			}
		}
		d = min(d, imb[v])
		for _, mv := range path {
			r.apply(mv, d)
		}
		imb[v] -= d
		imb[sink] += d
	}
	if rng.IntN(2) == 0 {
		for range 1 + rng.IntN(4) {
			r.randomCycle(rng)
		}
	}
	return r.x[:len(n.Tail)], true
}

// randomCycle walks randomly along residual steps until it revisits a
// node, then pushes a random amount (at most the cycle's spare) around the
// cycle found. Balances are unchanged.
func (r *residual) randomCycle(rng *rand.Rand) {
	nodes := len(r.want)
	v := flow.NodeID(rng.IntN(nodes))
	at := make([]int, nodes) // 1 + position in walk of each node, 0 if unseen
	var walk []move
	at[v] = 1
	for range 2 * nodes {
		ms := r.moves(rng, v)
		if len(ms) == 0 {
			return
		}
		mv := ms[0]
		walk = append(walk, mv)
		v = r.other(mv)
		if at[v] > 0 {
			cycle := walk[at[v]-1:]
			d := int64(unitQty) * 1000
			for _, c := range cycle {
				d = min(d, r.spare(c))
			}
			// The same arc may appear twice in the cycle (forward and back);
			// then net movement is zero there and bounds are kept anyway.
			d = 1 + rng.Int64N(d)
			for _, c := range cycle {
				r.apply(c, d)
			}
			return
		}
		at[v] = len(walk) + 1
	}
}

// PerturbedPlan returns a copy of plan changed in one random way: one lane
// moved up or down (breaks balance, possibly a bound), flow moved between
// two parallel lanes (keeps balance, may break a bound), or a random amount
// pushed around a cycle of the undirected network (keeps balance, may break
// a bound). The result may be feasible or not; callers decide with an
// independent checker. Time O(|V|+|E|).
func PerturbedPlan(rng *rand.Rand, n *flow.Network, plan []int64) []int64 {
	x := append([]int64(nil), plan...)
	m := len(x)
	if m == 0 {
		return x
	}
	d := 1 + rng.Int64N(unitQty*flow.Pow10(n.QtyPlaces))
	switch rng.IntN(3) {
	case 0:
		if par := parallelPair(rng, n); par[0] >= 0 {
			x[par[0]] -= d
			x[par[1]] += d
			return x
		}
	case 1:
		if cyc := undirectedCycle(rng, n); len(cyc) > 0 {
			for _, mv := range cyc {
				if mv.forward {
					x[mv.a] += d
				} else {
					x[mv.a] -= d
				}
			}
			return x
		}
	}
	a := rng.IntN(m)
	if rng.IntN(2) == 0 {
		x[a] -= d
	} else {
		x[a] += d
	}
	return x
}

func parallelPair(rng *rand.Rand, n *flow.Network) [2]int {
	m := len(n.Tail)
	start := rng.IntN(m)
	for i := range m {
		a := (start + i) % m
		for b := range m {
			if b != a && n.Tail[a] == n.Tail[b] && n.Head[a] == n.Head[b] {
				return [2]int{a, b}
			}
		}
	}
	return [2]int{-1, -1}
}

// undirectedCycle returns the lanes of a cycle of the network with
// directions ignored, as moves: forward when the cycle runs tail to head.
// It grows a spanning forest in lane order from a random start lane and
// closes the cycle with the first lane that joins two forest nodes.
func undirectedCycle(rng *rand.Rand, n *flow.Network) []move {
	nn, m := len(n.Nodes), len(n.Tail)
	parent := make([]int, nn) // lane to the parent, -1 at a root
	depth := make([]int, nn)
	for v := range parent {
		parent[v] = -1
	}
	// Breadth-first search per weakly connected component.
	adj := flow.BuildAdjacency(n)
	seen := make([]bool, nn)
	for s := range nn {
		if seen[s] {
			continue
		}
		seen[s] = true
		queue := []int{s}
		for len(queue) > 0 {
			v := queue[0]
			queue = queue[1:]
			visit := func(a flow.LaneID, w int) {
				if !seen[w] {
					seen[w] = true
					parent[w] = int(a)
					depth[w] = depth[v] + 1
					queue = append(queue, w)
				}
			}
			for _, a := range adj.OutLanes[adj.OutStart[v]:adj.OutStart[v+1]] {
				visit(a, int(n.Head[a]))
			}
			for _, a := range adj.InLanes[adj.InStart[v]:adj.InStart[v+1]] {
				visit(a, int(n.Tail[a]))
			}
		}
	}
	start := rng.IntN(m)
	for i := range m {
		a := (start + i) % m
		t, h := int(n.Tail[a]), int(n.Head[a])
		if parent[h] == a || parent[t] == a {
			continue // a tree lane
		}
		if t == h {
			return []move{{a, true}}
		}
		// Cycle: lane a from t to h, then the tree path from h back to t.
		cyc := []move{{a, true}}
		var up []move   // from h up to the common ancestor
		var down []move // from t up to the common ancestor (reversed later)
		u, w := h, t
		for u != w {
			if depth[u] >= depth[w] {
				b := parent[u]
				// Walking from u to its parent.
				up = append(up, move{b, int(n.Tail[b]) == u})
				u = other(n, b, u)
			} else {
				b := parent[w]
				// Walking from the parent down to w.
				down = append(down, move{b, int(n.Head[b]) == w})
				w = other(n, b, w)
			}
		}
		cyc = append(cyc, up...)
		for i := len(down) - 1; i >= 0; i-- {
			cyc = append(cyc, down[i])
		}
		return cyc
	}
	return nil
}

func other(n *flow.Network, a int, v int) int {
	if int(n.Tail[a]) == v {
		return int(n.Head[a])
	}
	return int(n.Tail[a])
}
