package dual_test

import (
	"errors"
	"fmt"
	"math"
	"math/big"
	"math/rand/v2"
	"testing"

	"lanecert/dual"
	"lanecert/flow"
	"lanecert/internal/longrun"
	"lanecert/internal/oracle"
	"lanecert/internal/randnet"
)

// hugeRates scales the rates of n so that the largest is near 2^bits, with
// random low digits, keeping signs (rates of 0 stay 0).
func hugeRates(rng *rand.Rand, n *flow.Network, bits int) {
	var most int64 = 1
	for _, r := range n.Rate {
		most = max(most, r, -r)
	}
	k := (int64(1) << bits) / most
	for e, r := range n.Rate {
		switch {
		case r > 0:
			n.Rate[e] = r*k - rng.Int64N(k)
		case r < 0:
			n.Rate[e] = r*k + rng.Int64N(k)
		}
	}
}

// detourNetwork draws a network where routes between the pieces of lanes
// in use are long chains of expensive lanes: a lane from A to B that may
// be short of capacity, chains of one to six lanes from A to B and from B
// back to A with rates from 2^59 to 2^62, and a few lanes joining chain
// nodes at random rates of either sign. Demand at B is met from A; half of
// the networks have more supply than demand (at A or at a chain node).
func detourNetwork(rng *rand.Rand) *flow.Network {
	n := &flow.Network{Nodes: []string{"A", "B"}, Supply: []int64{0, 0}}
	lane := func(t, h int, lo, up, rate int64) {
		n.Tail = append(n.Tail, flow.NodeID(t))
		n.Head = append(n.Head, flow.NodeID(h))
		n.Lower = append(n.Lower, lo)
		n.Upper = append(n.Upper, up)
		n.Rate = append(n.Rate, rate)
	}
	node := func() int {
		n.Nodes = append(n.Nodes, fmt.Sprintf("c%d", len(n.Nodes)))
		n.Supply = append(n.Supply, 0)
		return len(n.Nodes) - 1
	}
	huge := func() int64 { return int64(1)<<59 + rng.Int64N(int64(1)<<62-int64(1)<<59) }
	q := 1 + rng.Int64N(3)
	n.Supply[0], n.Supply[1] = q, -q
	capAB := []int64{flow.NoLimit, q, q - 1, q + 1}[rng.IntN(4)]
	lane(0, 1, 0, capAB, rng.Int64N(int64(1)<<62)-int64(1)<<61)
	chain := func(from, to int) []int {
		k := 1 + rng.IntN(6)
		at, nodes := from, []int{}
		for j := 0; j < k; j++ {
			next := to
			if j < k-1 {
				next = node()
				nodes = append(nodes, next)
			}
			up := flow.NoLimit
			if rng.IntN(3) == 0 {
				up = 1 + rng.Int64N(3)
			}
			lane(at, next, 0, up, huge())
			at = next
		}
		return nodes
	}
	mid := append(chain(0, 1), chain(1, 0)...)
	for j := rng.IntN(3); j > 0 && len(mid) >= 2; j-- {
		a, b := mid[rng.IntN(len(mid))], mid[rng.IntN(len(mid))]
		if a != b {
			lane(a, b, 0, flow.NoLimit, rng.Int64N(int64(1)<<62)-int64(1)<<61)
		}
	}
	if rng.IntN(2) == 0 {
		// Supply beyond demand: at A, or at a chain node (an origin whose
		// routes to the others are long).
		at := 0
		if len(mid) > 0 && rng.IntN(2) == 0 {
			at = mid[rng.IntN(len(mid))]
		}
		n.Supply[at] += 1 + rng.Int64N(2)
	}
	return n
}

// exact holds a plan's lane limits, capacity values and node prices,
// computed from their definitions in big integers (nil: no limit or no
// price), and whether any of them, or a route cost behind one, passes the
// int64 range (then, and only then, Ranges may report flow.ErrOverflow).
type exact struct {
	lower, upper, capValue []*big.Int
	up, down               []*big.Int
	wide                   bool
}

// exactSensitivity works out what Ranges must return for the optimal plan
// y with potentials p, from the residual network (oracle.Residual) and
// cheapest routes in big integers (oracle.Cheapest), sharing no code with
// package dual:
//
//   - A lane's lower limit is minus the cost of the cheapest route from its
//     head back to its tail (when it has room to carry more), its upper
//     limit the cost of the cheapest route from its tail to its head (when
//     it carries more than its minimum), both avoiding the lane: the plan
//     stays optimal while every residual cycle through the lane costs at
//     least 0.
//   - A lane at capacity saves max(0, -rate - cost of that route back) per
//     unit of capacity added.
//   - A node's prices are those of its weakly connected piece's anchor (the
//     hold node when supply exceeds demand, else the origin of least
//     potential, then lowest number), plus the cheapest route from it (Up),
//     minus the cheapest route back (Down); an origin keeping supply has
//     Up 0, and with a hold node a node without demand has Down at least 0.
//
// A route cost behind a value is its cost in reduced costs (rate plus the
// potential of the start minus that of the end, summed), which Ranges
// adds up.
func exactSensitivity(n *flow.Network, y, p []int64) exact {
	arcs, nodes := oracle.Residual(n, y)
	pot := func(v int) *big.Int {
		if v >= len(p) {
			return new(big.Int) // the hold node
		}
		return big.NewInt(p[v])
	}
	// reduced converts a route cost from a to b into reduced costs.
	reduced := func(cost *big.Int, a, b int) *big.Int {
		d := new(big.Int).Add(cost, pot(a))
		return d.Sub(d, pot(b))
	}
	var x exact
	wide := func(vs ...*big.Int) {
		for _, v := range vs {
			if v != nil && (!v.IsInt64() || v.Int64() == math.MaxInt64) {
				x.wide = true
			}
		}
	}
	m := len(n.Tail)
	x.lower, x.upper, x.capValue = make([]*big.Int, m), make([]*big.Int, m), make([]*big.Int, m)
	for e := range m {
		t, h := int(n.Tail[e]), int(n.Head[e])
		if n.Lower[e] == n.Upper[e] {
			continue
		}
		back := oracle.Cheapest(arcs, nodes, h, t, e)
		if n.Upper[e] == flow.NoLimit || y[e] < n.Upper[e] {
			if back != nil {
				x.lower[e] = new(big.Int).Neg(back)
				wide(x.lower[e], reduced(back, h, t))
			}
		} else {
			x.capValue[e] = new(big.Int)
			if back != nil {
				v := new(big.Int).Neg(back)
				if v.Sub(v, big.NewInt(n.Rate[e])).Sign() > 0 {
					x.capValue[e] = v
				}
			}
		}
		if y[e] > n.Lower[e] {
			if fwd := oracle.Cheapest(arcs, nodes, t, h, e); fwd != nil {
				x.upper[e] = fwd
				wide(fwd, reduced(fwd, t, h))
			}
		}
	}
	// Anchors by union-find over the lanes (and the hold node's arcs).
	nv := len(n.Nodes)
	hold := nodes > nv
	parent := make([]int, nodes)
	for v := range parent {
		parent[v] = v
	}
	find := func(v int) int {
		for parent[v] != v {
			v = parent[v]
		}
		return v
	}
	for _, a := range arcs {
		parent[find(a.From)] = find(a.To)
	}
	for e := range m {
		parent[find(int(n.Tail[e]))] = find(int(n.Head[e]))
	}
	anchor := map[int]int{}
	for v := range nv {
		if n.Supply[v] <= 0 {
			continue
		}
		r := find(v)
		if hold {
			anchor[r] = nv
			continue
		}
		if b, ok := anchor[r]; !ok || p[v] < p[b] {
			anchor[r] = v
		}
	}
	out := make([]int64, nv)
	for e := range m {
		out[n.Tail[e]] += y[e]
		out[n.Head[e]] -= y[e]
	}
	x.up, x.down = make([]*big.Int, nv), make([]*big.Int, nv)
	for v := range nv {
		a, ok := anchor[find(v)]
		if !ok {
			continue
		}
		if hold && n.Supply[v] > 0 && n.Supply[v]-out[v] > 0 {
			x.up[v] = new(big.Int)
		} else if d := oracle.Cheapest(arcs, nodes, a, v, -1); d != nil {
			x.up[v] = new(big.Int).Add(pot(a), d)
			wide(x.up[v], reduced(d, a, v))
		}
		d := oracle.Cheapest(arcs, nodes, v, a, -1)
		if d != nil {
			x.down[v] = new(big.Int).Sub(pot(a), d)
		}
		if hold && n.Supply[v] >= 0 {
			if x.down[v] == nil || x.down[v].Sign() < 0 {
				x.down[v] = new(big.Int)
			}
		} else if d != nil {
			wide(x.down[v], reduced(d, v, a))
		}
	}
	return x
}

// same reports whether a reported value (has, v) is the exact one.
func same(has bool, v int64, want *big.Int) bool {
	if want == nil {
		return !has
	}
	return has && want.IsInt64() && want.Int64() == v
}

// TestRangesNearOverflow runs the ranges on optimal plans of networks whose
// rates are near the int64 limit (2^58 to 2^62), so that the sums along
// routes pass it. Ranges must either fail with flow.ErrOverflow, and only
// when a limit, capacity value or node price (or the route cost behind
// one) does not fit in an int64, or return exactly the values that
// exactSensitivity computes in big integers. A value that wrapped around
// would differ. Both outcomes must occur often.
func TestRangesNearOverflow(t *testing.T) {
	rng := rand.New(rand.NewPCG(longrun.Seed(t, 17), 9))
	ok, failed, solveFailed := 0, 0, 0
	for i := range longrun.Cases(t, 600) {
		var n *flow.Network
		if i%2 == 0 {
			n = detourNetwork(rng)
		} else {
			o := randnet.RandomOptions(rng)
			o.Infeasible = false
			o.NegativeRates = i%3 == 0
			o.MaxRate = 1000
			n = randnet.Network(rng, o)
			hugeRates(rng, n, 58+rng.IntN(5))
		}
		opt, err := dual.Optimize(n, nil, nil)
		if err == nil && opt.Status != flow.Optimal {
			continue
		}
		var a *dual.Audit
		if err == nil {
			a, err = dual.Check(n, opt.Flow)
		}
		if errors.Is(err, flow.ErrOverflow) {
			solveFailed++ // the solve or audit says so; their tests cover it
			continue
		}
		if err != nil {
			t.Fatalf("case %d: %v", i, err)
		}
		y, p := opt.Flow, a.Potential
		// The kept hub searches add with saturation as the full ones do.
		if _, diff, err := dual.AvoidDistForTest(n, y, p); err != nil && !errors.Is(err, flow.ErrOverflow) {
			t.Fatalf("case %d: %v", i, err)
		} else if diff != "" {
			t.Fatalf("case %d: %s", i, diff)
		}
		want := exactSensitivity(n, y, p)
		s, err := dual.Ranges(n, y, p)
		if err != nil {
			if !errors.Is(err, flow.ErrOverflow) {
				t.Fatalf("case %d: %v", i, err)
			}
			if !want.wide {
				t.Fatalf("case %d: %v, but every value and route fits in an int64", i, err)
			}
			failed++
			checkWideRoutes(t, i, n, y, p)
			continue
		}
		ok++
		sameAsExact(t, fmt.Sprintf("case %d", i), s, want)
		checkWideRoutes(t, i, n, y, p)
	}
	t.Logf("%d ranges exact, %d reported overflow; %d solves or audits overflowed", ok, failed, solveFailed)
	if ok < 50 || failed < 50 {
		t.Errorf("%d exact, %d overflowed: the test no longer covers both", ok, failed)
	}
}

// sameAsExact fails the test unless s holds exactly the values of want.
func sameAsExact(t *testing.T, label string, s *dual.Sensitivity, want exact) {
	t.Helper()
	for e, lr := range s.Lanes {
		if !same(lr.HasLower, lr.Lower, want.lower[e]) || !same(lr.HasUpper, lr.Upper, want.upper[e]) {
			t.Fatalf("%s lane %d: limits %d (%v) to %d (%v), exactly %v to %v", label, e, lr.Lower, lr.HasLower, lr.Upper, lr.HasUpper, want.lower[e], want.upper[e])
		}
		if c := want.capValue[e]; c != nil && !same(true, lr.CapacityValue, c) {
			t.Fatalf("%s lane %d: capacity value %d, exactly %v", label, e, lr.CapacityValue, c)
		}
	}
	for v, np := range s.Nodes {
		if !same(np.HasUp, np.Up, want.up[v]) || !same(np.HasDown, np.Down, want.down[v]) {
			t.Fatalf("%s node %d: prices up %d (%v) down %d (%v), exactly %v and %v", label, v, np.Up, np.HasUp, np.Down, np.HasDown, want.up[v], want.down[v])
		}
	}
}

// TestRangesWideRouteToHold covers a plan where every lane limit fits in an
// int64 but the only route from two nodes back to the spare supply costs
// more than an int64 holds (common practice: a hand-made case). One unit
// less demanded there is a unit of supply the node may keep, so the saving
// is 0: Ranges must say so, not report an overflow.
func TestRangesWideRouteToHold(t *testing.T) {
	const r = int64(1) << 62
	// A (supply 2) feeds B (demand 1) at rate 0; C reaches A only through
	// X1 and X2, at 2^62 per lane.
	n := &flow.Network{
		Nodes:  []string{"A", "B", "C", "X1", "X2"},
		Supply: []int64{2, -1, 0, 0, 0},
		Tail:   []flow.NodeID{0, 2, 3, 4},
		Head:   []flow.NodeID{1, 3, 4, 0},
		Lower:  []int64{0, 0, 0, 0},
		Upper:  []int64{flow.NoLimit, flow.NoLimit, flow.NoLimit, flow.NoLimit},
		Rate:   []int64{0, r, r, r},
	}
	y := []int64{1, 0, 0, 0}
	a, err := dual.Check(n, y)
	if err != nil {
		t.Fatal(err)
	}
	if a.Verdict != dual.Optimal {
		t.Fatalf("verdict %v, want optimal", a.Verdict)
	}
	want := exactSensitivity(n, y, a.Potential)
	if want.wide {
		t.Fatal("the case no longer has every value within int64")
	}
	s, err := dual.Ranges(n, y, a.Potential)
	if err != nil {
		t.Fatal(err)
	}
	sameAsExact(t, "hold", s, want)
	if c := s.Nodes[2]; !c.HasDown || c.Down != 0 {
		t.Fatalf("C: down %d (%v), want 0", c.Down, c.HasDown)
	}
}

// checkWideRoutes asks dual.Route for every lane's competing routes in
// both directions: each must fail with flow.ErrOverflow only when the
// cheapest route's cost in reduced costs does not fit in an int64, and
// otherwise cost exactly what oracle.Cheapest finds (in big integers).
func checkWideRoutes(t *testing.T, i int, n *flow.Network, y, p []int64) {
	t.Helper()
	arcs, nodes := oracle.Residual(n, y)
	for e := range n.Tail {
		for _, more := range []bool{true, false} {
			if (more && y[e] >= n.Upper[e]) || (!more && y[e] <= n.Lower[e]) {
				continue
			}
			from, to := int(n.Head[e]), int(n.Tail[e])
			if !more {
				from, to = to, from
			}
			want := oracle.Cheapest(arcs, nodes, from, to, e)
			steps, err := dual.Route(n, y, p, flow.LaneID(e), more)
			if err != nil {
				red := new(big.Int)
				if want != nil {
					red.Add(want, big.NewInt(p[from]))
					red.Sub(red, big.NewInt(p[to]))
				}
				if !errors.Is(err, flow.ErrOverflow) || want == nil || (red.IsInt64() && red.Int64() < math.MaxInt64) {
					t.Fatalf("case %d lane %d (more %v): %v; cheapest route %v", i, e, more, err, want)
				}
				continue
			}
			if want == nil {
				if steps != nil {
					t.Fatalf("case %d lane %d (more %v): route %v where none exists", i, e, more, steps)
				}
				continue
			}
			cost := new(big.Int)
			for _, st := range steps {
				if st.Lane < 0 {
					continue // through the hold node, at no cost
				}
				r := big.NewInt(n.Rate[st.Lane])
				if st.Forward {
					cost.Add(cost, r)
				} else {
					cost.Sub(cost, r)
				}
			}
			if cost.Cmp(want) != 0 {
				t.Fatalf("case %d lane %d (more %v): route costs %v, the cheapest %v", i, e, more, cost, want)
			}
		}
	}
}
