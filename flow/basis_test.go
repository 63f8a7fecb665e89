package flow_test

import (
	"fmt"
	"math"
	"math/big"
	"math/rand/v2"
	"testing"

	"lanecert/flow"
	"lanecert/internal/certcheck"
	"lanecert/internal/longrun"
	"lanecert/internal/oracle"
	"lanecert/internal/randnet"
)

// randomExtras draws k extra lanes between random nodes of n (no minimum;
// some without capacity, some with capacity 0; rates from 0 to 20, and when
// neg from -3, half of them negative lanes without capacity).
func randomExtras(rng *rand.Rand, n *flow.Network, k int, neg bool) []flow.Candidate {
	nv := len(n.Nodes)
	out := make([]flow.Candidate, k)
	for i := range out {
		c := flow.Candidate{Tail: flow.NodeID(rng.IntN(nv)), Head: flow.NodeID(rng.IntN(nv)), Rate: rng.Int64N(21)}
		if neg {
			c.Rate -= 3
		}
		switch rng.IntN(5) {
		case 0:
			c.Upper = flow.NoLimit
		case 1:
			c.Upper = 0
		default:
			c.Upper = 1 + rng.Int64N(30)
		}
		if neg && rng.IntN(2) == 0 {
			c.Upper, c.Rate = flow.NoLimit, -1-rng.Int64N(5) // may close a cycle of negative cost without limit
		}
		out[i] = c
	}
	return out
}

// TestBasisAddRandom re-solves random networks with random extra lanes from
// the kept basis and checks each answer against gonum's LP simplex on the
// extended network (internal/oracle, an independent method): same status,
// same optimal cost, a plan that is feasible for the extended network
// (internal/certcheck) and costs what Add reports. The Basis must not change
// between calls: the same extras asked twice give the same answer.
func TestBasisAddRandom(t *testing.T) {
	rng := rand.New(rand.NewPCG(longrun.Seed(t, 20261202), 7))
	tried, moved, unbounded := 0, 0, 0
	for i := range longrun.Cases(t, 400) {
		o := randnet.RandomOptions(rng)
		n := randnet.Network(rng, o)
		sol, err := flow.Solve(n, flow.SolveOptions{Keep: true})
		if err != nil {
			t.Fatalf("case %d: %v", i, err)
		}
		if sol.Status != flow.Optimal {
			if sol.Basis != nil {
				t.Fatalf("case %d: basis kept for a %v solve", i, sol.Status)
			}
			continue
		}
		if sol.Basis == nil {
			t.Fatalf("case %d: no basis kept", i)
		}
		for j := 0; j < 4; j++ {
			extra := randomExtras(rng, n, 1+rng.IntN(3), j == 3)
			ext := n.WithLanes(extra)
			name := fmt.Sprintf("case %d.%d (%d nodes, %d lanes, extras %+v)", i, j, len(n.Nodes), len(n.Tail), extra)
			got, err := sol.Basis.Add(extra)
			if err != nil {
				t.Fatalf("%s: %v", name, err)
			}
			res, err := oracle.MinCost(ext)
			if err != nil {
				t.Fatalf("%s: oracle: %v", name, err)
			}
			tried++
			if got.Status.String() != res.Status.String() {
				t.Fatalf("%s: status %v, oracle %v", name, got.Status, res.Status)
			}
			if got.Status == flow.Unbounded {
				unbounded++
				checkCycle(t, ext, got.Cycle)
				continue
			}
			if !oracle.SameCost(got.Cost, n.QtyPlaces+n.RatePlaces, res) {
				t.Fatalf("%s: cost %s, oracle %g", name, got.Cost.Format(0), res.CostScaled)
			}
			plan := got.Plan()
			if err := certcheck.Feasible(ext, plan); err != nil {
				t.Fatalf("%s: plan not feasible: %v", name, err)
			}
			if c := planCost(ext, plan); c.String() != got.Cost.Format(0) {
				t.Fatalf("%s: plan costs %s, Add says %s", name, c, got.Cost.Format(0))
			}
			for k := range extra {
				if plan[len(n.Tail)+k] != got.Extra[k] || got.Flow(flow.LaneID(len(n.Tail)+k)) != got.Extra[k] {
					t.Fatalf("%s: extra %d flow %d, plan says %d", name, k, got.Extra[k], plan[len(n.Tail)+k])
				}
			}
			if got.Cost.Cmp(sol.Cost) != 0 {
				moved++
			}
			again, err := sol.Basis.Add(extra)
			if err != nil || again.Cost.Cmp(got.Cost) != 0 || again.Pivots != got.Pivots {
				t.Fatalf("%s: second Add differs: %v", name, err)
			}
		}
	}
	t.Logf("%d extra sets, %d lowered the cost, %d unbounded", tried, moved, unbounded)
	if moved < 50 || unbounded < 5 {
		t.Errorf("only %d cost changes and %d unbounded cases: the test no longer covers them", moved, unbounded)
	}
}

// planCost is Σ rate·flow in big integers.
func planCost(n *flow.Network, x []int64) *big.Int {
	c := new(big.Int)
	for a, r := range n.Rate {
		c.Add(c, new(big.Int).Mul(big.NewInt(r), big.NewInt(x[a])))
	}
	return c
}

// TestBasisAddStale checks that a plan read after a later Add panics
// instead of answering for the wrong lanes.
func TestBasisAddStale(t *testing.T) {
	n := build([]int64{5, -5}, [][5]int64{{0, 1, 0, noLimit, 10}})
	sol, err := flow.Solve(n, flow.SolveOptions{Keep: true})
	if err != nil || sol.Basis == nil {
		t.Fatalf("solve: %v", err)
	}
	first, err := sol.Basis.Add([]flow.Candidate{{Tail: 0, Head: 1, Rate: 4, Upper: 3}})
	if err != nil {
		t.Fatal(err)
	}
	// By hand: the new lane (rate 4, capacity 3) takes 3 of the 5 units,
	// the old one (rate 10) the other 2.
	if first.Extra[0] != 3 || first.Cost.Cmp(flow.WideFrom(3*4+2*10)) != 0 {
		t.Fatalf("first add: extra %v cost %s", first.Extra, first.Cost.Format(0))
	}
	if _, err := sol.Basis.Add(nil); err != nil {
		t.Fatal(err)
	}
	defer func() {
		if recover() == nil {
			t.Fatal("reading a replaced plan did not panic")
		}
	}()
	first.Flow(0)
}

// TestBasisAddErrors checks the refused extras.
func TestBasisAddErrors(t *testing.T) {
	n := build([]int64{5, -5}, [][5]int64{{0, 1, 0, noLimit, 10}})
	sol, err := flow.Solve(n, flow.SolveOptions{Keep: true})
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []flow.Candidate{
		{Tail: 0, Head: 1, Rate: 1, Lower: 1, Upper: 2},
		{Tail: 0, Head: 2, Rate: 1, Upper: 2},
		{Tail: 0, Head: 1, Rate: 1, Upper: -1},
	} {
		if _, err := sol.Basis.Add([]flow.Candidate{c}); err == nil {
			t.Errorf("extra %+v accepted", c)
		}
	}
}

// A plant ships 10 units to a customer over a lane at rate 7. A carrier
// offers a direct lane at rate 5 for up to 4 units: re-solving from the kept
// basis moves 4 units onto it.
func ExampleBasis_Add() {
	n := &flow.Network{
		Nodes:  []string{"plant", "customer"},
		Supply: []int64{10, -10},
		Tail:   []flow.NodeID{0},
		Head:   []flow.NodeID{1},
		Lower:  []int64{0},
		Upper:  []int64{flow.NoLimit},
		Rate:   []int64{7},
	}
	sol, err := flow.Solve(n, flow.SolveOptions{Keep: true})
	if err != nil {
		panic(err)
	}
	add, err := sol.Basis.Add([]flow.Candidate{{Tail: 0, Head: 1, Rate: 5, Upper: 4}})
	if err != nil {
		panic(err)
	}
	fmt.Println(sol.Cost.Format(0), "->", add.Cost.Format(0), "with", add.Extra[0], "units on the new lane")
	// Output: 70 -> 62 with 4 units on the new lane
}

// resArc is a residual arc with its real cost and room (noLimit: none).
type resArc struct {
	from, to int
	cost     int64
	room     int64
}

// residualOf lists the residual arcs of plan x of n with held supply held
// (the hold node is node len(n.Nodes)), built from the network alone.
func residualOf(n *flow.Network, x, held []int64) []resArc {
	var out []resArc
	for a := range n.Tail {
		t, h := int(n.Tail[a]), int(n.Head[a])
		if t == h {
			continue
		}
		if n.Upper[a] == noLimit {
			out = append(out, resArc{t, h, n.Rate[a], noLimit})
		} else if x[a] < n.Upper[a] {
			out = append(out, resArc{t, h, n.Rate[a], n.Upper[a] - x[a]})
		}
		if x[a] > n.Lower[a] {
			out = append(out, resArc{h, t, -n.Rate[a], x[a] - n.Lower[a]})
		}
	}
	sup, dem, _ := n.Totals()
	if sup > dem {
		hold := len(n.Nodes)
		for v, b := range n.Supply {
			if b <= 0 {
				continue
			}
			if held[v] < b {
				out = append(out, resArc{v, hold, 0, b - held[v]})
			}
			if held[v] > 0 {
				out = append(out, resArc{hold, v, 0, held[v]})
			}
		}
	}
	return out
}

// TestBasisDistances checks Distances against Bellman-Ford over the
// residual network built independently from the plan (real costs): the
// real cost of the cheapest route is the distance plus p(to) - p(from).
// Leaving is checked against the same residual arcs.
func TestBasisDistances(t *testing.T) {
	rng := rand.New(rand.NewPCG(longrun.Seed(t, 31), 4))
	checked := 0
	for i := range longrun.Cases(t, 300) {
		o := randnet.RandomOptions(rng)
		o.NegativeRates = i%3 == 0
		n := randnet.Network(rng, o)
		sol, err := flow.Solve(n, flow.SolveOptions{Keep: true})
		if err != nil || sol.Status != flow.Optimal || len(n.Nodes) == 0 {
			continue
		}
		arcs := residualOf(n, sol.Flow, sol.Held)
		nv := len(n.Nodes)
		nAll := nv + 1
		b := sol.Basis
		pot := func(v int) int64 {
			if v == nv {
				return 0 // never an end of a distance asked here
			}
			return b.Potential(flow.NodeID(v))
		}
		src := rng.IntN(nv)
		for _, mode := range []struct {
			toSrc bool
			first flow.SrcArcs
		}{{false, flow.AnyArc}, {true, flow.AnyArc}, {false, flow.SrcHold}, {true, flow.SrcLanes}, {false, flow.SrcLanes}, {true, flow.SrcHold}} {
			toSrc := mode.toSrc
			got, err := b.Distances(flow.NodeID(src), toSrc, mode.first)
			if err != nil {
				t.Fatalf("case %d: %v", i, err)
			}
			// Bellman-Ford on real costs; at src only the arcs allowed, and
			// no route back into src.
			const inf = int64(math.MaxInt64)
			d := make([]int64, nAll)
			for v := range d {
				d[v] = inf
			}
			d[src] = 0
			for round := 0; round < nAll; round++ {
				for _, a := range arcs {
					from, to := a.from, a.to
					if toSrc {
						from, to = to, from
					}
					if to == src {
						continue
					}
					hold := a.from == nv || a.to == nv
					if from == src && ((mode.first == flow.SrcLanes && hold) || (mode.first == flow.SrcHold && !hold)) {
						continue
					}
					if d[from] != inf && d[from]+a.cost < d[to] {
						d[to] = d[from] + a.cost
					}
				}
			}
			for v := 0; v < nv; v++ {
				if (got[v] == flow.NoRoute) != (d[v] == inf) {
					t.Fatalf("case %d node %d (%+v): reached %v, Bellman-Ford %v", i, v, mode, got[v] != flow.NoRoute, d[v] != inf)
				}
				if d[v] == inf {
					continue
				}
				real := got[v] + pot(v) - pot(src)
				if toSrc {
					real = got[v] + pot(src) - pot(v)
				}
				if real != d[v] {
					t.Fatalf("case %d node %d (%+v): distance %d is real cost %d, Bellman-Ford %d", i, v, mode, got[v], real, d[v])
				}
			}
		}
		// Leaving: a random region, skip a random node.
		region := make([]bool, nv)
		for v := range region {
			region[v] = rng.IntN(2) == 0
		}
		skip := rng.IntN(nv)
		least, room, found, err := b.Leaving(region, flow.NodeID(skip))
		if err != nil {
			t.Fatal(err)
		}
		wantFound, wantLeast, wantRoom := false, int64(0), int64(0)
		for _, a := range arcs {
			if a.from >= nv || !region[a.from] || (a.to < nv && region[a.to]) || a.to == skip {
				continue
			}
			rc := a.cost + pot(a.from) - pot(a.to)
			if a.to == nv { // hold node: potential 0 only after normalising; use the reduced cost via the plan's rule
				rc = a.cost + pot(a.from) - holdPot(b, n, sol)
			}
			if !wantFound || rc < wantLeast {
				wantLeast = rc
			}
			wantFound = true
			if a.room == noLimit || wantRoom == noLimit {
				wantRoom = noLimit
			} else {
				wantRoom += a.room
			}
		}
		if found != wantFound || (found && (least != wantLeast || room != wantRoom)) {
			t.Fatalf("case %d: Leaving = %d, %d, %v; want %d, %d, %v", i, least, room, found, wantLeast, wantRoom, wantFound)
		}
		checked++
	}
	if checked < 150 {
		t.Errorf("only %d networks checked", checked)
	}
}

// holdPot returns the kept potential of the hold node, recovered from an
// origin that holds part of its supply (reduced cost 0 on its hold arc) or,
// failing that, from the plan's normalisation (Solution.Potential puts the
// hold node at 0): both potentials differ by a constant on the component.
func holdPot(b *flow.Basis, n *flow.Network, sol *flow.Solution) int64 {
	for v, s := range n.Supply {
		if s > 0 {
			// p_kept(v) - p_norm(v) is the constant; p_norm(H) = 0.
			return b.Potential(flow.NodeID(v)) - sol.Potential[v]
		}
	}
	return 0
}
