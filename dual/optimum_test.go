package dual_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"lanecert/dual"
	"lanecert/flow"
	"lanecert/internal/longrun"
	"lanecert/internal/oracle"
	"lanecert/internal/randnet"
)

// extreme returns the smallest (sign = +1) or largest (sign = -1) quantity
// lane a can carry among the optimal plans of n, by the LP oracle on rates
// M·rate + sign·[lane = a]: with integral data every vertex's cost is an
// integer, so M larger than any quantity range keeps the optimum among the
// optimal plans (a lexicographic objective; common practice).
func extreme(t *testing.T, n *flow.Network, a int, sign int64, m int64) float64 {
	t.Helper()
	c := *n
	c.Rate = make([]int64, len(n.Rate))
	for e, r := range n.Rate {
		c.Rate[e] = m * r
	}
	c.Rate[a] += sign
	res, err := oracle.MinCost(&c)
	if err != nil {
		t.Fatalf("oracle: %v", err)
	}
	if res.Status == oracle.Unbounded && sign < 0 {
		// A zero-cost cycle without capacity through lane a: its quantity
		// has no upper limit among the optimal plans.
		return math.Inf(1)
	}
	if res.Status != oracle.Optimal {
		t.Fatalf("oracle: %v", res.Status)
	}
	return res.Flow[a]
}

// TestOptimizeAgainstOracle: on random networks Optimize finds the
// oracle's optimal cost and status, warm and cold starts agree, the optimal
// plan passes the audit as optimal, and Unique agrees with the oracle's
// range of each lane over the optimal plans.
func TestOptimizeAgainstOracle(t *testing.T) {
	rng := rand.New(rand.NewPCG(longrun.Seed(t, 7), 2026))
	uniqueSeen, multiSeen := 0, 0
	for i := range longrun.Cases(t, 1200) {
		n := randnet.Random(rng)
		res, err := oracle.MinCost(n)
		if err != nil {
			t.Fatalf("case %d: oracle: %v", i, err)
		}
		x, feasible := randnet.FeasiblePlan(rng, n)
		cold, err := dual.Optimize(n, nil, nil)
		if err != nil {
			t.Fatalf("case %d: cold: %v", i, err)
		}
		want := map[oracle.Status]flow.Status{oracle.Optimal: flow.Optimal, oracle.Infeasible: flow.Infeasible, oracle.Unbounded: flow.Unbounded}[res.Status]
		if cold.Status != want {
			t.Fatalf("case %d: status %v, oracle %v", i, cold.Status, res.Status)
		}
		if want != flow.Optimal {
			continue
		}
		places := n.QtyPlaces + n.RatePlaces
		if !oracle.SameCost(cold.Cost, places, res) {
			t.Fatalf("case %d: cost %s, oracle %v", i, n.FormatCost(cold.Cost), res.CostScaled)
		}
		if feasible {
			warm, err := dual.Optimize(n, x, nil)
			if err != nil {
				t.Fatalf("case %d: warm: %v", i, err)
			}
			if warm.Cost.Cmp(cold.Cost) != 0 {
				t.Fatalf("case %d: warm cost %s, cold %s", i, n.FormatCost(warm.Cost), n.FormatCost(cold.Cost))
			}
		}
		if len(n.Tail) > 16 || i%3 != 0 {
			continue
		}
		// Unique against the oracle: the plan is the only optimum exactly
		// when no lane can vary over the optimal plans.
		var span int64 = 1
		for _, b := range n.Supply {
			if b > 0 {
				span += b
			}
		}
		for e, u := range n.Upper {
			if u != flow.NoLimit {
				span += u
			} else {
				span += n.Lower[e]
			}
		}
		varies := false
		for e := range n.Tail {
			lo, hi := extreme(t, n, e, 1, 4*span), extreme(t, n, e, -1, 4*span)
			if hi-lo > 0.5 {
				varies = true
				break
			}
		}
		if cold.Unique == varies {
			t.Fatalf("case %d: Unique = %v, but the oracle finds lanes varying = %v", i, cold.Unique, varies)
		}
		if cold.Unique {
			uniqueSeen++
		} else {
			multiSeen++
		}
	}
	if uniqueSeen < 20 || multiSeen < 20 {
		t.Errorf("too few cases of each kind: %d unique, %d not", uniqueSeen, multiSeen)
	}
}

// TestRepairChanges: the repair of the demo-like example moves flow off the
// direct lane; changes are listed largest saving first.
func TestRepairChanges(t *testing.T) {
	n := &flow.Network{
		Nodes:  []string{"Plant", "Warehouse", "Customer"},
		Supply: []int64{30, 0, -30},
		Tail:   []flow.NodeID{0, 0, 1},
		Head:   []flow.NodeID{2, 1, 2},
		Lower:  []int64{0, 0, 0},
		Upper:  []int64{flow.NoLimit, 20, flow.NoLimit},
		Rate:   []int64{9, 4, 3},
	}
	x := []int64{30, 0, 0}
	o, err := dual.Optimize(n, x, nil)
	if err != nil {
		t.Fatal(err)
	}
	// By hand: 20 units go Plant-Warehouse-Customer at 7 instead of 9.
	if c, _ := o.Cost.Int64(); c != 230 || !o.WarmStarted {
		t.Fatalf("cost %d warm %v, want 230 warm", c, o.WarmStarted)
	}
	ch, err := o.Changes(n, x)
	if err != nil {
		t.Fatal(err)
	}
	if len(ch) != 3 || ch[0].Lane != 0 || ch[0].New != 10 {
		t.Fatalf("changes %+v", ch)
	}
	if c, _ := ch[0].CostChange.Int64(); c != -180 { // 9 × (10 - 30)
		t.Fatalf("first change costs %d, want -180", c)
	}
	gap, _ := o.Gap(flow.WideFrom(270))
	if g, _ := gap.Int64(); g != 40 {
		t.Fatalf("gap %d, want 40", g)
	}
}
