// Package netgen generates large deterministic minimum-cost flow instances
// for benchmarks: transportation problems (complete or sparse) with
// distance-like rates, and general networks with transshipment nodes,
// capacities and a planted feasible plan. It also perturbs optimal plans
// around cycles (for warm-start benchmarks); flow.WriteDIMACS writes them
// for measuring other solvers (see internal/cmd/gennet).
//
// Every function is deterministic for its seed (math/rand/v2 PCG). The
// instances are feasible and bounded (all rates positive).
package netgen

import (
	"math"
	"math/rand/v2"
	"strconv"

	"lanecert/flow"
)

// Transport returns a balanced transportation network with origins
// 0..m-1 and destinations m..m+n-1 placed at random points of the unit
// square; a lane's rate is 1 + its length scaled to [0, maxRate-1]. lanes
// is the number of lanes: 0 or >= m·n gives the complete network;
// otherwise a north-west-corner skeleton (at most m+n-1 lanes, so the
// problem is feasible) plus random extra lanes. Supplies are 1..100 units,
// the demands share the same total. No lane has a capacity. Time and
// memory O(m+n+lanes).
func Transport(seed uint64, m, n, lanes int, maxRate int64) *flow.Network {
	rng := rand.New(rand.NewPCG(seed, 0x7472616e73))
	nv := m + n
	net := newNet(nv)
	xs, ys := make([]float64, nv), make([]float64, nv)
	for v := range xs {
		xs[v], ys[v] = rng.Float64(), rng.Float64()
	}
	var total int64
	for i := 0; i < m; i++ {
		net.Supply[i] = 1 + rng.Int64N(100)
		total += net.Supply[i]
	}
	// Demands: random weights scaled to the total, remainder to the last.
	w := make([]int64, n)
	var ws int64
	for j := range w {
		w[j] = 1 + rng.Int64N(100)
		ws += w[j]
	}
	var given int64
	for j := 0; j < n; j++ {
		d := total * w[j] / ws
		if j == n-1 {
			d = total - given
		}
		given += d
		net.Supply[m+j] = -d
	}
	rate := func(i, j int) int64 {
		dx, dy := xs[i]-xs[m+j], ys[i]-ys[m+j]
		return 1 + int64(math.Round(math.Sqrt(dx*dx+dy*dy)/math.Sqrt2*float64(maxRate-1)))
	}
	add := func(i, j int) {
		net.Tail = append(net.Tail, flow.NodeID(i))
		net.Head = append(net.Head, flow.NodeID(m+j))
		net.Lower = append(net.Lower, 0)
		net.Upper = append(net.Upper, flow.NoLimit)
		net.Rate = append(net.Rate, rate(i, j))
	}
	if lanes <= 0 || int64(lanes) >= int64(m)*int64(n) {
		for i := 0; i < m; i++ {
			for j := 0; j < n; j++ {
				add(i, j)
			}
		}
		return net
	}
	// North-west corner skeleton.
	seen := make(map[int64]bool, lanes)
	i, j := 0, 0
	si, dj := net.Supply[0], -net.Supply[m]
	for i < m && j < n {
		add(i, j)
		seen[int64(i)*int64(n)+int64(j)] = true
		q := min(si, dj)
		si -= q
		dj -= q
		if si == 0 && i+1 < m {
			i++
			si = net.Supply[i]
		} else if dj == 0 && j+1 < n {
			j++
			dj = -net.Supply[m+j]
		} else {
			break
		}
	}
	for len(net.Tail) < lanes {
		i, j := rng.IntN(m), rng.IntN(n)
		k := int64(i)*int64(n) + int64(j)
		if seen[k] {
			continue
		}
		seen[k] = true
		add(i, j)
	}
	return net
}

// General returns a NETGEN-like network of nodes nodes and lanes lanes:
// sources origins, sinks destinations, the rest transshipment nodes.
// Each source sends its supply (1..1000 units) to random sinks along
// chains through random transshipment nodes (the planted plan); random
// lanes are added up to lanes; a fraction capFrac of the lanes gets a
// capacity no smaller than its planted flow, the others have none. Rates
// are uniform in [1, maxRate]. Lanes are shuffled. Time and memory
// O(nodes+lanes).
func General(seed uint64, nodes, lanes, sources, sinks int, capFrac float64, maxRate int64) *flow.Network {
	rng := rand.New(rand.NewPCG(seed, 0x6e6574))
	net := newNet(nodes)
	planted := []int64{}
	add := func(t, h int, x int64) {
		net.Tail = append(net.Tail, flow.NodeID(t))
		net.Head = append(net.Head, flow.NodeID(h))
		planted = append(planted, x)
	}
	trans := nodes - sources - sinks
	transit := func() int { return sources + sinks + rng.IntN(trans) }
	for s := 0; s < sources; s++ {
		sup := 1 + rng.Int64N(1000)
		net.Supply[s] = sup
		// Split the supply over up to 3 chains.
		parts := 1 + rng.IntN(3)
		for p := 0; p < parts; p++ {
			q := sup / int64(parts)
			if p == parts-1 {
				q = sup - q*int64(parts-1)
			}
			if q == 0 {
				continue
			}
			sink := sources + rng.IntN(sinks)
			net.Supply[sink] -= q
			prev := s
			if trans > 0 {
				for k := 1 + rng.IntN(4); k > 0; k-- {
					v := transit()
					if v != prev {
						add(prev, v, q)
						prev = v
					}
				}
			}
			add(prev, sink, q)
		}
	}
	for len(net.Tail) < lanes {
		t, h := rng.IntN(nodes), rng.IntN(nodes)
		if t == h {
			continue
		}
		add(t, h, 0)
	}
	m := len(net.Tail)
	perm := rng.Perm(m)
	tail, head, x := make([]flow.NodeID, m), make([]flow.NodeID, m), make([]int64, m)
	for i, p := range perm {
		tail[i], head[i], x[i] = net.Tail[p], net.Head[p], planted[p]
	}
	net.Tail, net.Head = tail, head
	net.Lower = make([]int64, m)
	net.Upper = make([]int64, m)
	net.Rate = make([]int64, m)
	for a := 0; a < m; a++ {
		net.Rate[a] = 1 + rng.Int64N(maxRate)
		net.Upper[a] = flow.NoLimit
		if rng.Float64() < capFrac {
			net.Upper[a] = x[a] + rng.Int64N(1000)
		}
	}
	return net
}

func newNet(nv int) *flow.Network {
	net := &flow.Network{Supply: make([]int64, nv), Nodes: make([]string, nv)}
	for v := range net.Nodes {
		net.Nodes[v] = strconv.Itoa(v + 1)
	}
	return net
}

// Perturb returns a copy of the feasible plan x moved around k cycles, each
// made of a random non-tree lane and the path joining its ends in the
// forest of tree lanes (inTree, as Solution.InTree of an optimal solve).
// Each cycle moves a random amount (at least 1, at most 100 units, within
// every lane's bounds) in the direction that raises the lane's flow when it
// can. Cycles that cannot move are skipped (up to 100·k tries). The result
// is feasible and, from an optimal plan, costs no less. Time O(k·|V|) plus
// O(|V|+|E|).
func Perturb(seed uint64, n *flow.Network, x []int64, inTree []bool, k int) []int64 {
	rng := rand.New(rand.NewPCG(seed, 0x70657274))
	y := append([]int64(nil), x...)
	nv, m := len(n.Nodes), len(n.Tail)
	// Root the tree forest: parent lane and depth per node.
	start := make([]int32, nv+1)
	for a := 0; a < m; a++ {
		if inTree[a] {
			start[n.Tail[a]+1]++
			start[n.Head[a]+1]++
		}
	}
	for v := 0; v < nv; v++ {
		start[v+1] += start[v]
	}
	adj := make([]int32, start[nv])
	fill := append([]int32(nil), start[:nv]...)
	for a := 0; a < m; a++ {
		if inTree[a] {
			adj[fill[n.Tail[a]]] = int32(a)
			fill[n.Tail[a]]++
			adj[fill[n.Head[a]]] = int32(a)
			fill[n.Head[a]]++
		}
	}
	parLane := make([]int32, nv)
	depth := make([]int32, nv)
	for v := range parLane {
		parLane[v] = -2 // unvisited
	}
	stack := []int32{}
	for r := 0; r < nv; r++ {
		if parLane[r] != -2 {
			continue
		}
		parLane[r] = -1
		stack = append(stack[:0], int32(r))
		for len(stack) > 0 {
			v := stack[len(stack)-1]
			stack = stack[:len(stack)-1]
			for _, a := range adj[start[v]:start[v+1]] {
				w := int32(n.Tail[a])
				if w == v {
					w = int32(n.Head[a])
				}
				if parLane[w] != -2 {
					continue
				}
				parLane[w] = a
				depth[w] = depth[v] + 1
				stack = append(stack, w)
			}
		}
	}
	other := func(a int32, v int32) int32 {
		if int32(n.Tail[a]) == v {
			return int32(n.Head[a])
		}
		return int32(n.Tail[a])
	}
	type step struct {
		lane int32
		fwd  bool
	}
	room := func(s step) int64 {
		if s.fwd {
			if n.Upper[s.lane] == flow.NoLimit {
				return math.MaxInt64
			}
			return n.Upper[s.lane] - y[s.lane]
		}
		return y[s.lane] - n.Lower[s.lane]
	}
	var cyc []step
	done := 0
	for try := 0; done < k && try < 100*k && m > 0; try++ {
		a := int32(rng.IntN(m))
		if inTree[a] || n.Tail[a] == n.Head[a] {
			continue
		}
		// Cycle: a from t to h, then the tree path from h back to t.
		t, h := int32(n.Tail[a]), int32(n.Head[a])
		cyc = append(cyc[:0], step{a, true})
		var tail []step
		u, v := h, t
		for u != v {
			if depth[u] >= depth[v] && parLane[u] >= 0 {
				l := parLane[u]
				// from u towards its parent
				cyc = append(cyc, step{l, int32(n.Tail[l]) == u})
				u = other(l, u)
			} else if parLane[v] >= 0 {
				l := parLane[v]
				// towards v from its parent: traversed parent -> v
				tail = append(tail, step{l, int32(n.Head[l]) == v})
				v = other(l, v)
			} else {
				break
			}
		}
		if u != v {
			continue // different trees
		}
		for i := len(tail) - 1; i >= 0; i-- {
			cyc = append(cyc, tail[i])
		}
		if y[a] > n.Lower[a] && rng.IntN(2) == 0 || room(cyc[0]) == 0 {
			for i := range cyc {
				cyc[i].fwd = !cyc[i].fwd
			}
		}
		d := 1 + rng.Int64N(100)
		for _, s := range cyc {
			d = min(d, room(s))
		}
		// A lane used twice cannot occur: the tree path is simple.
		if d <= 0 {
			continue
		}
		for _, s := range cyc {
			if s.fwd {
				y[s.lane] += d
			} else {
				y[s.lane] -= d
			}
		}
		done++
	}
	return y
}
