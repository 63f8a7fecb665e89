package flow_test

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"reflect"
	"slices"
	"sync"
	"testing"

	"lanecert/flow"
	"lanecert/internal/certcheck"
	"lanecert/internal/longrun"
	"lanecert/internal/netgen"
	"lanecert/internal/oracle"
	"lanecert/internal/randnet"
)

// cutLane is a lane {tail, head, lower, upper} of a cut test network.
type cutLane [4]int64

// cutNet builds a network with the given node names and supplies and
// lanes of rate 1.
func cutNet(names []string, supply []int64, lanes ...cutLane) *flow.Network {
	n := &flow.Network{Nodes: names, Supply: supply}
	for _, l := range lanes {
		n.Tail = append(n.Tail, flow.NodeID(l[0]))
		n.Head = append(n.Head, flow.NodeID(l[1]))
		n.Lower = append(n.Lower, l[2])
		n.Upper = append(n.Upper, l[3])
		n.Rate = append(n.Rate, 1)
	}
	return n
}

// checkCut runs the independent checker on c.
func checkCut(t *testing.T, n *flow.Network, c *flow.Cut) {
	t.Helper()
	region := slices.Clone(c.Region)
	if c.Hold {
		region = append(region, flow.HoldNode(n))
	}
	if err := certcheck.Cut(n, region, c.Demand, c.Reach, c.Short); err != nil {
		t.Fatalf("certcheck: %v (cut %+v)", err, c)
	}
}

type cutWant struct {
	region         []flow.NodeID
	hold           bool
	demand, reach  int64
	full, out      []flow.LaneID
	short          int64
	feasibleNilCut bool
}

func checkCutWant(t *testing.T, n *flow.Network, w cutWant) {
	t.Helper()
	c, err := flow.FindCut(n)
	if err != nil {
		t.Fatal(err)
	}
	if w.feasibleNilCut {
		if c != nil {
			t.Fatalf("feasible network, got cut %+v", c)
		}
		return
	}
	if c == nil {
		t.Fatal("no cut")
	}
	checkCut(t, n, c)
	got := cutWant{c.Region, c.Hold, c.Demand, c.Reach, c.FullLanes, c.OutLanes, c.Short, false}
	if !reflect.DeepEqual(got, w) {
		t.Fatalf("cut\n got %+v\nwant %+v", got, w)
	}
}

// Published maximum-flow examples, built as supply/demand networks: the
// source is an origin with ample supply (1000), the sink a destination
// with demand 100 > maximum flow, so Short = 100 - maximum flow. The
// expected regions and lanes follow by hand from the cited networks: the
// smallest minimum cut's sink side, the nodes that can still reach the sink
// after a maximum flow.
func TestFindCutPublished(t *testing.T) {
	// Cormen, Leiserson, Rivest, Stein, Introduction to Algorithms,
	// 3rd ed., Figure 26.1(a) (the Lucky Puck network, from memory):
	// maximum flow 23 (Figure 26.6, from memory), minimum cut
	// ({s,v1,v2,v4}, {v3,t}) of capacity 12 + 7 + 4 = 23.
	clrsNames := []string{"s", "v1", "v2", "v3", "v4", "t"}
	clrs3 := []cutLane{
		{0, 1, 0, 16}, {0, 2, 0, 13}, {2, 1, 0, 4}, {1, 3, 0, 12}, {3, 2, 0, 9},
		{2, 4, 0, 14}, {4, 3, 0, 7}, {3, 5, 0, 20}, {4, 5, 0, 4},
	}
	// The 2nd edition's Figure 26.1 also has v1 -> v2 with capacity 10
	// (from memory); the maximum flow is still 23.
	clrs2 := append(slices.Clone(clrs3), cutLane{1, 2, 0, 10})
	// Wikipedia, "Edmonds–Karp algorithm", Example (from memory): nodes
	// A..G, source A, sink G, maximum flow 5; minimum cut
	// ({A,B,C,E}, {D,F,G}) of capacity A->D 3 + C->D 1 + E->G 1.
	ekNames := []string{"A", "B", "C", "D", "E", "F", "G"}
	ek := []cutLane{
		{0, 1, 0, 3}, {0, 3, 0, 3}, {1, 2, 0, 4}, {2, 0, 0, 3}, {2, 3, 0, 1}, {2, 4, 0, 2},
		{3, 4, 0, 2}, {3, 5, 0, 6}, {4, 1, 0, 1}, {4, 6, 0, 1}, {5, 6, 0, 9},
	}
	cases := []struct {
		name string
		n    *flow.Network
		want cutWant
	}{
		{"CLRS 3rd ed. Fig. 26.1", cutNet(clrsNames, []int64{1000, 0, 0, 0, 0, -100}, clrs3...),
			cutWant{region: []flow.NodeID{3, 5}, demand: 100, reach: 23, short: 77, full: []flow.LaneID{3, 6, 8}}},
		{"CLRS 2nd ed. Fig. 26.1", cutNet(clrsNames, []int64{1000, 0, 0, 0, 0, -100}, clrs2...),
			cutWant{region: []flow.NodeID{3, 5}, demand: 100, reach: 23, short: 77, full: []flow.LaneID{3, 6, 8}}},
		{"Edmonds-Karp example", cutNet(ekNames, []int64{1000, 0, 0, 0, 0, 0, -100}, ek...),
			cutWant{region: []flow.NodeID{3, 5, 6}, demand: 100, reach: 5, short: 95, full: []flow.LaneID{1, 4, 9}}},
		// Demand exactly the maximum flow: feasible (origins keep the rest).
		{"CLRS 3rd ed. demand 23", cutNet(clrsNames, []int64{1000, 0, 0, 0, 0, -23}, clrs3...),
			cutWant{feasibleNilCut: true}},
		{"Edmonds-Karp demand 5", cutNet(ekNames, []int64{1000, 0, 0, 0, 0, 0, -5}, ek...),
			cutWant{feasibleNilCut: true}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			checkCutWant(t, c.n, c.want)
			if c.want.feasibleNilCut {
				return
			}
			// Solve's shortfall must agree (no lane minimums here).
			sol, err := flow.Solve(c.n, flow.SolveOptions{})
			if err != nil {
				t.Fatal(err)
			}
			if sol.Status != flow.Infeasible || sol.Shortfall != c.want.short {
				t.Fatalf("Solve: %v, shortfall %d, want infeasible with %d", sol.Status, sol.Shortfall, c.want.short)
			}
		})
	}
}

// TestFindCutMinimums covers infeasibility caused by lane minimums. Every
// expected value is worked out by hand from the definitions at flow.Cut.
func TestFindCutMinimums(t *testing.T) {
	const inf = flow.NoLimit
	abc := []string{"o", "a", "c"}
	cases := []struct {
		name string
		n    *flow.Network
		want cutWant
	}{
		// a has nothing to send but must send 10: region {a}, 0 > 0 - 10.
		{"minimum out of an empty node", cutNet(abc, []int64{5, 0, -5}, cutLane{0, 2, 0, 5}, cutLane{1, 2, 10, 10}),
			cutWant{region: []flow.NodeID{1}, demand: 0, reach: -10, short: 10, out: []flow.LaneID{1}}},
		// Excess supply: o may keep, but must send 10 to c, which uses 5:
		// region {o, H}: demand -20 + 15, reach -10. Seen from T = {c}:
		// 10 forced in, 0 out, demand 5: short 5.
		{"minimum beyond the demand, excess supply", cutNet([]string{"o", "c"}, []int64{20, -5}, cutLane{0, 1, 10, inf}),
			cutWant{region: []flow.NodeID{0}, hold: true, demand: -5, reach: -10, short: 5, out: []flow.LaneID{0}}},
		// Balanced: the same overflow shows as region {o}: demand -5,
		// reach -7.
		{"minimum beyond the demand, balanced", cutNet([]string{"o", "d"}, []int64{5, -5}, cutLane{0, 1, 7, 10}),
			cutWant{region: []flow.NodeID{0}, demand: -5, reach: -7, short: 2, out: []flow.LaneID{0}}},
		// A cycle whose return lane is too small for the forced lane.
		{"minimum around a cycle", cutNet([]string{"u", "v"}, []int64{0, 0}, cutLane{0, 1, 3, inf}, cutLane{1, 0, 0, 1}),
			cutWant{region: []flow.NodeID{0}, demand: 0, reach: -2, short: 2, full: []flow.LaneID{1}, out: []flow.LaneID{0}}},
		// 4 forced into a, which passes on at most 3: region {o, d},
		// demand 10 - 10, reach 3 - 4.
		{"minimum into a bottleneck", cutNet([]string{"o", "a", "d"}, []int64{10, 0, -10},
			cutLane{0, 1, 4, inf}, cutLane{1, 2, 0, 3}, cutLane{0, 2, 0, 100}),
			cutWant{region: []flow.NodeID{0, 2}, demand: 0, reach: -1, short: 1, full: []flow.LaneID{1}, out: []flow.LaneID{0}}},
		// Supply short of demand: every node, reach 0.
		{"short supply", cutNet([]string{"o", "d"}, []int64{5, -10}, cutLane{0, 1, 0, inf}),
			cutWant{region: []flow.NodeID{0, 1}, demand: 5, reach: 0, short: 5}},
		// A self-loop with a minimum changes nothing.
		{"self-loop", cutNet([]string{"o", "d"}, []int64{3, -3}, cutLane{0, 1, 0, 2}, cutLane{1, 1, 5, 5}),
			cutWant{region: []flow.NodeID{1}, demand: 3, reach: 2, short: 1, full: []flow.LaneID{0}}},
		{"feasible minimum", cutNet(abc, []int64{5, 0, -5}, cutLane{0, 1, 2, inf}, cutLane{1, 2, 0, 10}),
			cutWant{feasibleNilCut: true}},
		{"feasible minimum, excess", cutNet([]string{"o", "d"}, []int64{20, -5}, cutLane{0, 1, 3, 10}),
			cutWant{feasibleNilCut: true}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			checkCutWant(t, c.n, c.want)
			sol, err := flow.Solve(c.n, flow.SolveOptions{})
			if err != nil {
				t.Fatal(err)
			}
			if (sol.Status == flow.Infeasible) == c.want.feasibleNilCut {
				t.Fatalf("Solve says %v", sol.Status)
			}
		})
	}
}

func TestFindCutErrors(t *testing.T) {
	const big = math.MaxInt64 / 2
	cases := []struct {
		name string
		n    *flow.Network
		want error
	}{
		{"total supply overflows", cutNet([]string{"a", "b", "c", "d"}, []int64{big, big, big, -1}), flow.ErrOverflow},
		{"minimums overflow", cutNet([]string{"a", "b"}, []int64{-big, 0},
			cutLane{1, 0, big, big}, cutLane{1, 0, big, big}, cutLane{1, 0, big, big}), flow.ErrOverflow},
		{"invalid", cutNet([]string{"a"}, []int64{0}, cutLane{0, 3, 0, 1}), nil},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := flow.FindCut(c.n)
			if err == nil || (c.want != nil && !errors.Is(err, c.want)) {
				t.Fatalf("err %v, want %v", err, c.want)
			}
		})
	}
}

// bruteCut enumerates every region S of n (and H under excess supply) and
// returns the largest Demand(S) - Reach(S) (at least 0, for S empty) and
// the intersection of the regions reaching it, as a bit set (bit NumNodes
// is H). It works straight from the definition at flow.Cut. Values must be
// small (the test networks keep them below 2^40). O(2^|V|·(|V|+|E|)).
func bruteCut(n *flow.Network) (best int64, meet uint64) {
	nv := len(n.Nodes)
	var sup, dem int64
	for _, b := range n.Supply {
		if b > 0 {
			sup += b
		} else {
			dem -= b
		}
	}
	bits := nv
	if sup > dem {
		bits++
	}
	meet = 1<<bits - 1
	for S := uint64(0); S < 1<<bits; S++ {
		in := func(v flow.NodeID) bool { return S&(1<<v) != 0 }
		var d, r int64
		for v := 0; v < nv; v++ {
			if in(flow.NodeID(v)) {
				d -= n.Supply[v]
			}
		}
		if bits > nv && in(flow.NodeID(nv)) {
			d += sup - dem
			for v := 0; v < nv; v++ {
				if !in(flow.NodeID(v)) && n.Supply[v] > 0 {
					r += n.Supply[v]
				}
			}
		}
		unlimited := false
		for a := range n.Tail {
			ti, hi := in(n.Tail[a]), in(n.Head[a])
			if !ti && hi {
				if n.Upper[a] == flow.NoLimit {
					unlimited = true
					break
				}
				r += n.Upper[a]
			} else if ti && !hi {
				r -= n.Lower[a]
			}
		}
		if unlimited {
			continue
		}
		switch v := d - r; {
		case v > best:
			best, meet = v, S
		case v == best:
			meet &= S
		}
	}
	if best == 0 {
		meet = 0
	}
	return best, meet
}

// shortLP computes Short with the gonum LP oracle from a different
// definition: the least total supply that must be injected at nodes to
// balance a plan within the lane bounds, when every node may also dispose
// of any amount for free. The network gets a node Z with an injection lane
// Z -> v (rate 1) and a disposal lane v -> Z (rate 0) at every node, all
// other rates 0, and, under excess supply, explicit hold lanes into a hold
// node H with demand equal to the excess, so that it balances. By LP
// duality its optimum is the largest Demand(S) - Reach(S) over regions S
// (the dual objective is the Lovász extension of that region function).
func shortLP(t *testing.T, n *flow.Network) int64 {
	t.Helper()
	nv := len(n.Nodes)
	m := &flow.Network{
		Nodes:      slices.Clone(n.Nodes),
		Supply:     slices.Clone(n.Supply),
		Tail:       slices.Clone(n.Tail),
		Head:       slices.Clone(n.Head),
		Lower:      slices.Clone(n.Lower),
		Upper:      slices.Clone(n.Upper),
		Rate:       make([]int64, len(n.Tail)),
		QtyPlaces:  n.QtyPlaces,
		RatePlaces: 0,
	}
	add := func(tl, hd flow.NodeID, u, r int64) {
		m.Tail, m.Head = append(m.Tail, tl), append(m.Head, hd)
		m.Lower, m.Upper, m.Rate = append(m.Lower, 0), append(m.Upper, u), append(m.Rate, r)
	}
	var total int64
	for _, b := range n.Supply {
		total += b
	}
	if total > 0 {
		h := flow.NodeID(len(m.Nodes))
		m.Nodes = append(m.Nodes, "H")
		m.Supply = append(m.Supply, -total)
		for v := 0; v < nv; v++ {
			if n.Supply[v] > 0 {
				add(flow.NodeID(v), h, n.Supply[v], 0)
			}
		}
	}
	z := flow.NodeID(len(m.Nodes))
	m.Nodes = append(m.Nodes, "Z")
	m.Supply = append(m.Supply, 0)
	if total < 0 {
		m.Supply[z] = -total // Z balances the network: no excess rule in m
	}
	for v := flow.NodeID(0); v < z; v++ {
		add(z, v, flow.NoLimit, 1)
		add(v, z, flow.NoLimit, 0)
	}
	res, err := oracle.MinCost(m)
	if err != nil {
		t.Fatal(err)
	}
	if res.Status != oracle.Optimal {
		t.Fatalf("short LP: %v", res.Status)
	}
	return int64(math.Round(res.CostScaled))
}

// cutRandom draws a small network with independent random supplies and
// many minimums, so both kinds of infeasibility (too little reaching a
// region, too much forced into one) are common, with and without excess.
func cutRandom(rng *rand.Rand) *flow.Network {
	nv := 2 + rng.IntN(7)
	n := &flow.Network{Supply: make([]int64, nv)}
	for v := range nv {
		n.Nodes = append(n.Nodes, fmt.Sprintf("n%d", v+1))
		if rng.IntN(3) != 0 {
			n.Supply[v] = rng.Int64N(21) - 10
		}
	}
	for range rng.IntN(3 * nv) {
		l := int64(0)
		if rng.IntN(3) == 0 {
			l = 1 + rng.Int64N(5)
		}
		u := flow.NoLimit
		if rng.IntN(3) != 0 {
			u = l + rng.Int64N(11)
		}
		n.Tail = append(n.Tail, flow.NodeID(rng.IntN(nv)))
		n.Head = append(n.Head, flow.NodeID(rng.IntN(nv)))
		n.Lower, n.Upper = append(n.Lower, l), append(n.Upper, u)
		n.Rate = append(n.Rate, rng.Int64N(10))
	}
	return n
}

// TestFindCutRandom checks FindCut on seeded random networks (package
// randnet with and without Options.Infeasible, and cutRandom) against
// three independent references: the exhaustive maximum over all regions
// and the smallest region reaching it (bruteCut), the gonum LP (shortLP),
// and the oracle's own feasibility test. Every cut must pass
// certcheck.Cut, the answer must not change when computed again, and
// Short must equal Solve's Shortfall (a different algorithm and a
// different relaxation: nodes with a surplus after the minimums may absorb
// flow).
func TestFindCutRandom(t *testing.T) {
	rng := rand.New(rand.NewPCG(longrun.Seed(t, 20250301), 1))
	var cuts, holds, nils, minimums int
	for i := range longrun.Cases(t, 600) {
		var n *flow.Network
		switch i % 3 {
		case 0:
			o := randnet.RandomOptions(rng)
			o.Infeasible = true
			o.Nodes = min(o.Nodes, 10)
			n = randnet.Network(rng, o)
		case 1:
			n = randnet.Random(rng)
		default:
			n = cutRandom(rng)
		}
		name := fmt.Sprintf("case %d", i)
		c, err := flow.FindCut(n)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		again, _ := flow.FindCut(n)
		if !reflect.DeepEqual(c, again) {
			t.Fatalf("%s: not deterministic: %+v then %+v", name, c, again)
		}
		best, meet := bruteCut(n)
		var short int64
		var region uint64
		if c != nil {
			checkCut(t, n, c)
			short = c.Short
			for _, v := range c.Region {
				region |= 1 << v
			}
			if c.Hold {
				region |= 1 << len(n.Nodes)
				holds++
			}
			cuts++
		} else {
			nils++
		}
		if short != best || region != meet {
			t.Fatalf("%s: short %d region %b, exhaustive search %d region %b", name, short, region, best, meet)
		}
		if lp := shortLP(t, n); lp != short {
			t.Fatalf("%s: short %d, LP %d", name, short, lp)
		}
		res, err := oracle.MinCost(n)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		if (res.Status == oracle.Infeasible) != (c != nil) {
			t.Fatalf("%s: oracle %v, cut %+v", name, res.Status, c)
		}
		if slices.ContainsFunc(n.Lower, func(l int64) bool { return l > 0 }) {
			minimums++
		}
		if c == nil {
			continue
		}
		sol, err := flow.Solve(n, flow.SolveOptions{})
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		if sol.Status != flow.Infeasible {
			t.Fatalf("%s: Solve %v, cut %+v", name, sol.Status, c)
		}
		if sol.Shortfall != short {
			t.Fatalf("%s: Solve shortfall %d, cut short %d", name, sol.Shortfall, short)
		}
	}
	t.Logf("%d cuts (%d with the hold node), %d feasible, %d networks with minimums", cuts, holds, nils, minimums)
	if cuts < 150 || holds == 0 || nils < 150 || minimums < 150 {
		t.Fatalf("too few cases of a kind: %d cuts, %d hold, %d feasible", cuts, holds, nils)
	}
}

// ExampleFindCut shows a cut a planner can check by hand: two plants ship
// to a market over lanes of capacity 30 and 20, and the market needs 70.
func ExampleFindCut() {
	n := &flow.Network{
		Nodes:  []string{"plant A", "plant B", "market"},
		Supply: []int64{50, 50, -70},
		Tail:   []flow.NodeID{0, 1},
		Head:   []flow.NodeID{2, 2},
		Lower:  []int64{0, 0},
		Upper:  []int64{30, 20},
		Rate:   []int64{4, 5},
	}
	c, err := flow.FindCut(n)
	if err != nil {
		panic(err)
	}
	for _, v := range c.Region {
		fmt.Println("region:", n.Nodes[v])
	}
	for _, a := range c.FullLanes {
		fmt.Printf("lane %s into the region: capacity %d\n", n.LaneName(a), n.Upper[a])
	}
	fmt.Printf("needs %d, at most %d can reach it, short %d\n", c.Demand, c.Reach, c.Short)
	// Output:
	// region: market
	// lane 1 into the region: capacity 30
	// lane 2 into the region: capacity 20
	// needs 70, at most 50 can reach it, short 20
}

// cutBench is a generated network, built once, with every demand raised by
// a tenth so that it is infeasible.
type cutBench struct {
	name string
	gen  func() *flow.Network
	once sync.Once
	net  *flow.Network
}

func (c *cutBench) load() *flow.Network {
	c.once.Do(func() {
		c.net = c.gen()
		for v, b := range c.net.Supply {
			if b < 0 {
				c.net.Supply[v] = b + b/10 - 1
			}
		}
	})
	return c.net
}

// Fixed seeds; sizes in lanes.
var cutBenches = []*cutBench{
	{name: "transport_1e5", gen: func() *flow.Network { return netgen.Transport(1002, 316, 316, 0, 1000) }},
	{name: "transport_sparse_1e5", gen: func() *flow.Network { return netgen.Transport(1003, 5000, 5000, 100000, 1000) }},
	{name: "general_1e5", gen: func() *flow.Network { return netgen.General(1004, 10000, 100000, 500, 500, 0.3, 100) }},
}

func BenchmarkFindCut(b *testing.B) {
	for _, c := range cutBenches {
		b.Run(c.name, func(b *testing.B) {
			n := c.load()
			b.ReportAllocs()
			var short int64
			for b.Loop() {
				cut, err := flow.FindCut(n)
				if err != nil || cut == nil {
					b.Fatalf("%v %v", cut, err)
				}
				short = cut.Short
			}
			b.ReportMetric(float64(short), "short")
		})
	}
}
