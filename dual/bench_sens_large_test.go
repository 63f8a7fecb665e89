//go:build large

package dual_test

import (
	"math/rand/v2"
	"testing"

	"lanecert/dual"
	"lanecert/flow"
)

// candidatesFor draws k candidate lanes between random nodes of n, with
// rates around the network's and half of them capacitated; with fixed, a
// one-off cost too (fixed seed).
func candidatesFor(n *flow.Network, k int, fixed bool) []flow.Candidate {
	rng := rand.New(rand.NewPCG(42, 7))
	cs := make([]flow.Candidate, k)
	for i := range cs {
		c := flow.Candidate{ID: "b", Tail: flow.NodeID(rng.IntN(n.NumNodes())), Head: flow.NodeID(rng.IntN(n.NumNodes())),
			Rate: 1 + rng.Int64N(1000), Upper: flow.NoLimit, Same: -1}
		if rng.IntN(2) == 0 {
			c.Upper = 1 + rng.Int64N(100)
		}
		if fixed {
			c.Fixed = rng.Int64N(20000)
		}
		cs[i] = c
	}
	return cs
}

// BenchmarkSensitivityLarge times, on 10^5-lane networks: one solve, one
// `why` route, 1,000 bids (each re-solved warm from the optimum, then all
// together), and the cut plus the cheapest lanes among 1,000 candidates
// with fixed costs on a squeezed (infeasible) copy.
func BenchmarkSensitivityLarge(b *testing.B) {
	for _, c := range rangeCases {
		n, sol, a := solvedCase(b, c.make)
		b.Run(c.name+"/solve", func(b *testing.B) {
			for i := 0; i < b.N; i++ {
				flow.Solve(n, flow.SolveOptions{})
			}
		})
		b.Run(c.name+"/why", func(b *testing.B) {
			for i := 0; i < b.N; i++ {
				if _, err := dual.Route(n, sol.Flow, a.Potential, flow.LaneID(i%n.NumLanes()), true); err != nil {
					b.Fatal(err)
				}
			}
		})
		cands := candidatesFor(n, 1000, false)
		b.Run(c.name+"/bids1000", func(b *testing.B) {
			for i := 0; i < b.N; i++ {
				if _, _, err := dual.EvaluateBids(n, sol.Flow, a.Potential, sol.Cost, cands); err != nil {
					b.Fatal(err)
				}
			}
		})
		squeezed := *n
		squeezed.Upper = append([]int64(nil), n.Upper...)
		for e := range squeezed.Upper {
			if e%3 == 0 && sol.Flow[e] > 1 {
				squeezed.Upper[e] = sol.Flow[e] / 2
			}
		}
		fixedCands := candidatesFor(n, 1000, true)
		b.Run(c.name+"/cut", func(b *testing.B) {
			for i := 0; i < b.N; i++ {
				if _, err := flow.FindCut(&squeezed); err != nil {
					b.Fatal(err)
				}
			}
		})
		b.Run(c.name+"/cut+single1000fixed", func(b *testing.B) {
			for i := 0; i < b.N; i++ {
				x, err := dual.Extend(&squeezed, fixedCands, dual.ExtendOptions{SinglesOnly: true})
				if err != nil {
					b.Fatal(err)
				}
				b.ReportMetric(float64(x.Solves), "solves")
			}
		})
	}
}
