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

// squeeze returns a copy of n in which the destination with the largest
// demand (the first such) can receive only 80 % of it: the capacities of
// its inbound lanes sum to that (spread evenly, never above an existing
// capacity). The copy cannot meet its demands; short lists the squeezed
// destination.
func squeeze(n *flow.Network) (*flow.Network, []flow.NodeID) {
	c := *n
	c.Upper = append([]int64(nil), n.Upper...)
	into := make([][]int, n.NumNodes())
	for e, h := range n.Head {
		into[h] = append(into[h], e)
	}
	top := -1
	for v, b := range n.Supply {
		if b < 0 && len(into[v]) > 0 && (top < 0 || b < n.Supply[top]) {
			top = v
		}
	}
	short := []flow.NodeID{flow.NodeID(top)}
	for _, v := range short {
		b := n.Supply[v]
		total := -b * 8 / 10
		each, extra := total/int64(len(into[v])), total%int64(len(into[v]))
		for i, e := range into[v] {
			u := each
			if int64(i) < extra {
				u++
			}
			if c.Upper[e] == flow.NoLimit || u < c.Upper[e] {
				c.Upper[e] = u
			}
		}
	}
	return &c, short
}

// candidatesInto draws k candidate lanes from random origins into the given
// destinations, with capacities of 1 to twice short units (about half of
// them can restore feasibility alone) and fixed costs (fixed seed).
func candidatesInto(n *flow.Network, dests []flow.NodeID, short int64, k int) []flow.Candidate {
	rng := rand.New(rand.NewPCG(43, 8))
	var origins []flow.NodeID
	for v, b := range n.Supply {
		if b > 0 {
			origins = append(origins, flow.NodeID(v))
		}
	}
	cs := make([]flow.Candidate, k)
	for i := range cs {
		cs[i] = flow.Candidate{ID: "t", Tail: origins[rng.IntN(len(origins))], Head: dests[rng.IntN(len(dests))],
			Rate: 1 + rng.Int64N(1000), Upper: 1 + rng.Int64N(2*short), Fixed: rng.Int64N(20000), Same: -1}
	}
	return cs
}

// BenchmarkSensitivityLarge times, on 10^5-lane networks: one solve, one
// `why` route, 1,000 bids (each re-solved warm from the optimum, then all
// together), and the cut plus the cheapest lanes among 1,000 candidates
// with fixed costs on a squeezed (infeasible) copy, random or all into the
// short destinations, and the cheapest single lane among 1,000 random ones
// on the network itself (feasible: the lanes that lower its cost).
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
		squeezed, short := squeeze(n)
		fixedCands := candidatesFor(n, 1000, true)
		cut, err := flow.FindCut(squeezed)
		if err != nil || cut == nil {
			b.Fatal("squeezed network not short", err)
		}
		targeted := candidatesInto(n, short, cut.Short, 1000)
		b.Run(c.name+"/cut", func(b *testing.B) {
			for i := 0; i < b.N; i++ {
				if _, err := flow.FindCut(squeezed); err != nil {
					b.Fatal(err)
				}
			}
		})
		b.Run(c.name+"/cut+single1000fixed", func(b *testing.B) {
			for i := 0; i < b.N; i++ {
				x, err := dual.Extend(squeezed, fixedCands, dual.ExtendOptions{SinglesOnly: true})
				if err != nil {
					b.Fatal(err)
				}
				b.ReportMetric(float64(x.Solves), "solves")
			}
		})
		b.Run(c.name+"/cut+single1000targeted", func(b *testing.B) {
			for i := 0; i < b.N; i++ {
				x, err := dual.Extend(squeezed, targeted, dual.ExtendOptions{SinglesOnly: true})
				if err != nil {
					b.Fatal(err)
				}
				b.ReportMetric(float64(x.Solves), "solves")
			}
		})
		feasible := candidatesFor(n, 1000, true)
		b.Run(c.name+"/feasible+single1000fixed", func(b *testing.B) {
			for i := 0; i < b.N; i++ {
				x, err := dual.Extend(n, feasible, dual.ExtendOptions{SinglesOnly: true})
				if err != nil {
					b.Fatal(err)
				}
				b.ReportMetric(float64(x.Solves), "solves")
			}
		})
	}
}
