package certcheck_test

import (
	"errors"
	"math/big"
	"math/rand/v2"
	"testing"

	"lanecert/flow"
	"lanecert/internal/certcheck"
	"lanecert/internal/longrun"
	"lanecert/internal/oracle"
	"lanecert/internal/randnet"
)

func planCost(n *flow.Network, x []int64) *big.Int {
	c := new(big.Int)
	for a := range x {
		c.Add(c, new(big.Int).Mul(big.NewInt(n.Rate[a]), big.NewInt(x[a])))
	}
	return c
}

func wide(t *testing.T, b *big.Int) flow.Wide {
	t.Helper()
	if !b.IsInt64() {
		t.Fatalf("cost %s does not fit int64", b)
	}
	return flow.WideFrom(b.Int64())
}

// TestCertificatesRandom builds certificates for random plans with a
// test-local Bellman-Ford on the residual graph and checks them with the
// package and against the LP oracle: with no negative residual cycle the
// distances are potentials that must pass Optimal, and the plan's cost must
// equal the oracle's optimum; a negative cycle avoiding the hold node must
// pass Cycle, and the oracle's optimum must lie below the plan's cost.
// Random perturbations of a passing certificate must fail.
func TestCertificatesRandom(t *testing.T) {
	rng := rand.New(rand.NewPCG(longrun.Seed(t, 7), 1))
	var optimal, cycles, holdCycles int
	for i := range longrun.Cases(t, 300) {
		o := randnet.RandomOptions(rng)
		n := randnet.Network(rng, o)
		x, ok := randnet.FeasiblePlan(rng, n)
		if !ok {
			continue
		}
		if err := certcheck.Feasible(n, x); err != nil {
			t.Fatalf("case %d: FeasiblePlan gave an infeasible plan: %v", i, err)
		}
		r, err := oracle.MinCost(n)
		if err != nil {
			t.Fatalf("case %d: %v", i, err)
		}
		cost := planCost(n, x)
		places := n.QtyPlaces + n.RatePlaces
		arcs, nodes := oracle.Residual(n, x)
		dist, cyc := oracle.NegativeCycle(arcs, nodes)
		if cyc == nil {
			optimal++
			if r.Status != oracle.Optimal || !oracle.SameCost(wide(t, cost), places, r) {
				t.Fatalf("case %d: no improving cycle, plan cost %s, oracle %v %v", i, cost, r.Status, r.CostScaled)
			}
			p := dist[:len(n.Nodes)]
			if nodes > len(n.Nodes) { // shift so that p(H) = 0
				p = make([]int64, len(n.Nodes))
				for v := range p {
					p[v] = dist[v] - dist[len(n.Nodes)]
				}
			}
			if err := certcheck.Optimal(n, x, p, cost, cost); err != nil {
				t.Fatalf("case %d: %v", i, err)
			}
			wrong := new(big.Int).Add(cost, big.NewInt(1))
			if err := certcheck.Optimal(n, x, p, wrong, nil); !errors.Is(err, certcheck.ErrClaimedCost) {
				t.Fatalf("case %d: wrong claimed cost: got %v", i, err)
			}
			if err := certcheck.Optimal(n, x, p, nil, wrong); !errors.Is(err, certcheck.ErrClaimedDual) {
				t.Fatalf("case %d: wrong claimed dual: got %v", i, err)
			}
			continue
		}
		if r.Status == oracle.Optimal && !(r.CostScaled < bigFloat(cost)) {
			t.Fatalf("case %d: improving cycle but oracle optimum %v >= plan cost %s", i, r.CostScaled, cost)
		}
		steps := make([]certcheck.Step, 0, len(cyc))
		theta := flow.NoLimit
		var perUnit int64
		viaHold := false
		for _, e := range cyc {
			if e.Lane < 0 {
				viaHold = true
				break
			}
			steps = append(steps, certcheck.Step{Lane: flow.LaneID(e.Lane), Forward: e.Forward})
			theta = min(theta, e.Room)
			perUnit += e.Rate
		}
		if viaHold {
			holdCycles++
			continue
		}
		if theta == flow.NoLimit {
			if r.Status != oracle.Unbounded {
				t.Fatalf("case %d: negative cycle without capacity, oracle says %v", i, r.Status)
			}
			continue
		}
		cycles++
		saving := -perUnit
		total := new(big.Int).Mul(big.NewInt(saving), big.NewInt(theta))
		if err := certcheck.Cycle(n, x, steps, theta, saving, total); err != nil {
			t.Fatalf("case %d: %v", i, err)
		}
		if err := certcheck.Cycle(n, x, steps, theta+1, saving, nil); !errors.Is(err, certcheck.ErrThetaTooBig) {
			t.Fatalf("case %d: theta+1: got %v", i, err)
		}
		if err := certcheck.Cycle(n, x, steps, theta, saving+1, nil); !errors.Is(err, certcheck.ErrSaving) {
			t.Fatalf("case %d: saving+1: got %v", i, err)
		}
	}
	if optimal == 0 || cycles == 0 {
		t.Errorf("weak sample: %d optimal plans, %d cycles", optimal, cycles)
	}
	t.Logf("%d optimal plans, %d improving cycles, %d through the hold node", optimal, cycles, holdCycles)
}

func bigFloat(b *big.Int) float64 {
	f, _ := new(big.Float).SetInt(b).Float64()
	return f
}
