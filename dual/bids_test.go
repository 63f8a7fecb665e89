package dual_test

import (
	"math/rand/v2"
	"testing"

	"lanecert/dual"
	"lanecert/flow"
	"lanecert/internal/longrun"
	"lanecert/internal/oracle"
	"lanecert/internal/randnet"
)

// TestBidsAgainstOracle adds random candidate lanes to random networks
// (half of them with negative rates) and compares each bid's saving alone,
// and the best set's, with the LP oracle's optimum of the extended
// network; a bid's break-even rate must be where using it starts to pay,
// and bids that let the cost fall without limit must stop the evaluation
// with an error.
func TestBidsAgainstOracle(t *testing.T) {
	rng := rand.New(rand.NewPCG(longrun.Seed(t, 5), 5))
	used, unbounded := 0, 0
	for i := range longrun.Cases(t, 300) {
		o := randnet.RandomOptions(rng)
		o.NegativeRates, o.Infeasible = i%2 == 0, false
		n := randnet.Network(rng, o)
		opt, err := dual.Optimize(n, nil, nil)
		if err != nil {
			t.Fatal(err)
		}
		if opt.Status != flow.Optimal || n.NumNodes() < 2 {
			continue
		}
		var cands []flow.Candidate
		bids := 3
		if i%5 == 0 {
			bids = 10 // enough sources for break-even searches through a hub
		}
		for k := 0; k < bids; k++ {
			c := flow.Candidate{ID: "c", Tail: flow.NodeID(rng.IntN(n.NumNodes())), Head: flow.NodeID(rng.IntN(n.NumNodes())),
				Rate: rng.Int64N(5 * max(o.MaxRate, 1)), Upper: flow.NoLimit, Same: -1}
			if rng.IntN(2) == 0 {
				c.Upper = 1 + rng.Int64N(50)
			}
			cands = append(cands, c)
		}
		res, set, err := dual.EvaluateBids(n, opt.Flow, opt.Potential, opt.Cost, cands)
		if err != nil {
			// With negative rates, bids may close a cycle of lanes without
			// capacity whose rates sum below zero: then, and only then,
			// the evaluation stops with an error.
			if lp, _ := oracle.MinCost(n.WithLanes(cands)); !o.NegativeRates || lp.Status != oracle.Unbounded {
				t.Fatalf("case %d: %v (oracle with every bid: %v)", i, err, lp.Status)
			}
			unbounded++
			continue
		}
		places := n.QtyPlaces + n.RatePlaces
		for k, c := range cands {
			lp, err := oracle.MinCost(n.WithLanes([]flow.Candidate{c}))
			if err != nil || lp.Status != oracle.Optimal {
				t.Fatalf("oracle: %v %v", lp.Status, err)
			}
			want, _ := opt.Cost.Sub(res[k].Saving)
			if !oracle.SameCost(want, places, lp) {
				t.Fatalf("case %d bid %d: saving %s, oracle optimum %v from %s", i, k, n.FormatCost(res[k].Saving), lp.CostScaled, n.FormatCost(opt.Cost))
			}
			if res[k].Used {
				used++
			}
			// Break-even: at that rate the bid cannot save; one unit below
			// it, it must (when it has room). Decided exactly: the plan
			// with the bid unused is optimal, or not (oracle.Improvable).
			if res[k].HasBreakEven {
				at := c
				at.Rate = res[k].BreakEven
				if oracle.Improvable(n.WithLanes([]flow.Candidate{at}), append(append([]int64(nil), opt.Flow...), 0)) {
					t.Fatalf("case %d bid %d: saves at its break-even rate %d", i, k, at.Rate)
				}
				at.Rate--
				if !oracle.Improvable(n.WithLanes([]flow.Candidate{at}), append(append([]int64(nil), opt.Flow...), 0)) && at.Upper != 0 && c.Tail != c.Head {
					t.Fatalf("case %d bid %d: no saving one unit below its break-even rate %d (cand %+v)", i, k, res[k].BreakEven, c)
				}
			}
		}
		lp, _ := oracle.MinCost(n.WithLanes(cands))
		want, _ := opt.Cost.Sub(set.Saving)
		if !oracle.SameCost(want, places, lp) {
			t.Fatalf("case %d: set saving %s, oracle %v", i, n.FormatCost(set.Saving), lp.CostScaled)
		}
	}
	if used < 30 || unbounded == 0 {
		t.Errorf("only %d bids used, %d networks made unbounded by their bids: the test no longer covers both", used, unbounded)
	}
}
