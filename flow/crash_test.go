package flow_test

import (
	"math/rand/v2"
	"testing"

	"lanecert/flow"
	"lanecert/internal/longrun"
)

// TestCrashSmall checks the first pivots of a cold solve (each
// destination's cheapest entering lane, cheapest first) on networks small
// enough to follow by hand; the expected pivots are worked out in the
// comments. Every case must also reach the optimum (or the unbounded
// cycle) that the solve without those pivots reaches.
func TestCrashSmall(t *testing.T) {
	cases := []struct {
		name   string
		n      *flow.Network
		status flow.Status
		crash  int64 // pivots crash makes
		pivots int64 // all pivots of the solve (Optimal cases)
		cost   int64 // optimal cost (Optimal cases)
	}{
		{
			// Two origins of 10, two destinations of 10. The cheapest
			// lane into node 2 is 0->2 (rate 1), into node 3 is 1->3
			// (rate 2); together they ship everything, and no other
			// lane prices below them: the two crash pivots are the whole
			// solve. Cost 10·1 + 10·2.
			name: "transportation solved by the crash",
			n: build([]int64{10, 10, -10, -10}, [][5]int64{
				{0, 2, 0, noLimit, 1}, {1, 2, 0, noLimit, 5},
				{0, 3, 0, noLimit, 4}, {1, 3, 0, noLimit, 2},
			}),
			status: flow.Optimal, crash: 2, pivots: 2, cost: 30,
		},
		{
			// A plant (0) feeds a cross-dock (1) that feeds two
			// customers (2, 3); the customers' cheapest lanes come from
			// the cross-dock (rates 1 and 2 against 9 and 8 direct). In
			// the artificial tree (cost M on the artificial arcs) the
			// origins and the cross-dock have potential -M, the customers
			// +M. The first crash pivot, 1->2 (reduced cost 1 - 2M),
			// moves no flow: the cross-dock's artificial arc carries
			// none, so it leaves, and the cross-dock hangs below customer
			// 2 with potential M - 1. Lane 1->3 then prices at
			// 2 + (M - 1) - M = 1 > 0 and is skipped: one crash pivot.
			// The solve routes 5 + 5 through the cross-dock at 3 + 1 and
			// 3 + 2: cost 45.
			name: "cross-dock: a degenerate crash pivot",
			n: build([]int64{10, 0, -5, -5}, [][5]int64{
				{0, 1, 0, noLimit, 3}, {1, 2, 0, noLimit, 1}, {1, 3, 0, noLimit, 2},
				{0, 2, 0, noLimit, 9}, {0, 3, 0, noLimit, 8},
			}),
			status: flow.Optimal, crash: 1, pivots: -1, cost: 45,
		},
		{
			// The cheapest lane into node 1 is 2->1 and into node 2 is
			// 1->2 (both rate -5, no capacity: a cycle of cost -10 per
			// unit). Node 1 comes first (equal rates, lower node): its
			// pivot ships node 1's 5 units from node 2, which then hangs
			// node 1 below it. The second pivot closes the cycle
			// 1->2->1 with no limit: unbounded, found by the crash.
			name: "unbounded cycle found by the crash",
			n: build([]int64{10, -5, -5}, [][5]int64{
				{0, 1, 0, noLimit, 1}, {0, 2, 0, noLimit, 1},
				{2, 1, 0, noLimit, -5}, {1, 2, 0, noLimit, -5},
			}),
			status: flow.Unbounded, crash: 2, pivots: -1,
		},
		{
			// Node 2's only entering lane is full at its minimum
			// (lower = upper = 4: fixed) and node 3's cheapest lane has
			// a minimum of 2 (at its minimum it can still enter). One
			// crash pivot: cost 4·1 + 6·3.
			name: "fixed and minimum lanes",
			n: build([]int64{10, 0, -4, -6}, [][5]int64{
				{0, 2, 4, 4, 1}, {0, 3, 2, noLimit, 3}, {0, 3, 0, noLimit, 7},
			}),
			status: flow.Optimal, crash: 1, pivots: -1, cost: 22,
		},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			sol, err := flow.Solve(c.n, flow.SolveOptions{})
			if err != nil {
				t.Fatal(err)
			}
			plain, err := flow.SolveWithoutCrash(c.n)
			if err != nil {
				t.Fatal(err)
			}
			if sol.Status != c.status || plain.Status != c.status {
				t.Fatalf("status %v, without crash %v, want %v", sol.Status, plain.Status, c.status)
			}
			if got := flow.CrashPivots(sol); got != c.crash {
				t.Errorf("crash pivots %d, want %d", got, c.crash)
			}
			if got := flow.CrashPivots(plain); got != 0 {
				t.Errorf("crash pivots %d without crash", got)
			}
			switch c.status {
			case flow.Optimal:
				if c.pivots >= 0 && sol.Pivots != c.pivots {
					t.Errorf("pivots %d, want %d", sol.Pivots, c.pivots)
				}
				checkOptimal(t, c.n, sol)
				checkOptimal(t, c.n, plain)
				want := flow.WideFrom(c.cost)
				if sol.Cost.Cmp(want) != 0 || plain.Cost.Cmp(want) != 0 {
					t.Errorf("cost %s, without crash %s, want %d", sol.Cost.Format(0), plain.Cost.Format(0), c.cost)
				}
			case flow.Unbounded:
				checkCycle(t, c.n, sol.Cycle)
				checkCycle(t, c.n, plain.Cycle)
			}
		})
	}
}

// TestCrashOracle compares cold solves with and without the crash pivots
// on random networks (internal/randnet: transportation, transshipment
// and general networks, lane minimums and capacities, excess supply,
// negative rates): the same status, the same optimal cost and shortfall,
// certificates the independent checks accept, and a cycle of negative
// cost without limit when unbounded. gonum's LP simplex already checks
// the solve with crash (TestSolveRandomOracle); this test checks that
// the crash changes nothing but the path, and that it pivots at all.
func TestCrashOracle(t *testing.T) {
	rng := rand.New(rand.NewPCG(longrun.Seed(t, 20261203), 7))
	crashed, solves := 0, 0
	for i := range longrun.Cases(t, 600) {
		n, name := mixedNetwork(rng, i, 3)
		sol, err := flow.Solve(n, flow.SolveOptions{})
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		plain, err := flow.SolveWithoutCrash(n)
		if err != nil {
			t.Fatalf("%s: without crash: %v", name, err)
		}
		if sol.Status != plain.Status {
			t.Fatalf("%s: status %v, without crash %v", name, sol.Status, plain.Status)
		}
		solves++
		if flow.CrashPivots(sol) > 0 {
			crashed++
		}
		if flow.CrashPivots(sol) > sol.Pivots {
			t.Fatalf("%s: %d crash pivots of %d", name, flow.CrashPivots(sol), sol.Pivots)
		}
		switch sol.Status {
		case flow.Optimal:
			checkOptimal(t, n, sol)
			if sol.Cost.Cmp(plain.Cost) != 0 {
				t.Fatalf("%s: cost %s, without crash %s", name, sol.Cost.Format(0), plain.Cost.Format(0))
			}
			checkOptimal(t, n, plain)
		case flow.Unbounded:
			checkCycle(t, n, sol.Cycle)
		case flow.Infeasible:
			if sol.Shortfall != plain.Shortfall {
				t.Fatalf("%s: shortfall %d, without crash %d", name, sol.Shortfall, plain.Shortfall)
			}
		}
	}
	t.Logf("%d of %d solves made crash pivots", crashed, solves)
	if crashed < solves/2 {
		t.Errorf("only %d of %d solves made crash pivots", crashed, solves)
	}
}
