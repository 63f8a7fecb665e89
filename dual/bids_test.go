package dual_test

import (
	"fmt"
	"math/rand/v2"
	"slices"
	"testing"

	"lanecert/dual"
	"lanecert/flow"
	"lanecert/internal/longrun"
	"lanecert/internal/oracle"
	"lanecert/internal/randnet"
)

// TestBidsAgainstOracle adds random candidate lanes to random networks
// (half of them with negative rates; some bids with a minimum) and compares
// each bid's saving alone, and the best set's, with the LP oracle's
// optimum of the extended network (for the set: the best over every choice
// of the bids with a minimum, with all the others); a bid's break-even
// rate must be where using it starts to pay, and bids that let the cost
// fall without limit must stop the evaluation with an error.
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
			if i%4 == 1 && k < 2 {
				// A bid with a minimum: once added, it carries at least that.
				c.Lower = 1 + rng.Int64N(min(c.Upper, 20))
			}
			cands = append(cands, c)
		}
		// The sets the best set is chosen from: every bid without a
		// minimum, with each choice of those with one.
		var withMin, base []int
		for k, c := range cands {
			if c.Lower > 0 {
				withMin = append(withMin, k)
			} else {
				base = append(base, k)
			}
		}
		var choices []*oracle.Result
		for mask := 0; mask < 1<<len(withMin); mask++ {
			var sub []flow.Candidate
			for k, c := range cands {
				if c.Lower == 0 || mask&(1<<slices.Index(withMin, k)) != 0 {
					sub = append(sub, c)
				}
			}
			lp, err := oracle.MinCost(n.WithLanes(sub))
			if err != nil {
				t.Fatal(err)
			}
			choices = append(choices, &lp)
		}
		res, set, err := dual.EvaluateBids(n, opt.Flow, opt.Potential, opt.Cost, cands)
		if err != nil {
			// With negative rates, bids may close a cycle of lanes without
			// capacity whose rates sum below zero: then, and only then,
			// the evaluation stops with an error (a bid alone, or one of
			// the sets above).
			fell := false
			for _, lp := range choices {
				fell = fell || lp.Status == oracle.Unbounded
			}
			for _, c := range cands {
				lp, _ := oracle.MinCost(n.WithLanes([]flow.Candidate{c}))
				fell = fell || lp.Status == oracle.Unbounded
			}
			if !o.NegativeRates || !fell {
				t.Fatalf("case %d: %v (no bid or set lets the cost fall without limit)", i, err)
			}
			unbounded++
			continue
		}
		places := n.QtyPlaces + n.RatePlaces
		for k, c := range cands {
			lp, err := oracle.MinCost(n.WithLanes([]flow.Candidate{c}))
			if err != nil {
				t.Fatal(err)
			}
			if lp.Status == oracle.Infeasible && c.Lower > 0 {
				// Its minimum cannot be carried.
				if res[k].Feasible {
					t.Fatalf("case %d bid %d: feasible alone, oracle: infeasible", i, k)
				}
				continue
			}
			if lp.Status != oracle.Optimal || !res[k].Feasible {
				t.Fatalf("case %d bid %d: feasible %v, oracle %v", i, k, res[k].Feasible, lp.Status)
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
			if res[k].HasBreakEven && c.Lower == 0 {
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
		// The best set: the cheapest of the choices (exact costs where the
		// oracle proved them).
		var best *oracle.Result
		for _, lp := range choices {
			if lp.Status != oracle.Optimal {
				continue
			}
			if best == nil || (lp.Exact && best.Exact && lp.ExactCost.Cmp(best.ExactCost) < 0) || (!(lp.Exact && best.Exact) && lp.CostScaled < best.CostScaled) {
				best = lp
			}
		}
		if (best != nil) != set.Feasible {
			t.Fatalf("case %d: set feasible %v, oracle finds a feasible choice %v", i, set.Feasible, best != nil)
		}
		if best == nil {
			continue
		}
		want, _ := opt.Cost.Sub(set.Saving)
		if !oracle.SameCost(want, places, *best) {
			t.Fatalf("case %d: set saving %s, oracle's best choice %v", i, n.FormatCost(set.Saving), best.CostScaled)
		}
	}
	if used < 30 || unbounded == 0 {
		t.Errorf("only %d bids used, %d networks made unbounded by their bids: the test no longer covers both", used, unbounded)
	}
}

// TestBidSetManyMinimums: with more bids with a minimum than are tried in
// every combination, they are added one at a time while the cost falls.
// Seven bids on the one lane's route, each with a minimum of 2 units:
// only the cheapest pays (it takes all 10 units, at 1 instead of 10); any
// other would force 2 units at its dearer rate. Saving worked by hand:
// 10·(10 − 1) = 90.
func TestBidSetManyMinimums(t *testing.T) {
	const no = flow.NoLimit
	n := &flow.Network{
		Nodes: []string{"o", "d"}, Supply: []int64{10, -10},
		Tail: []flow.NodeID{0}, Head: []flow.NodeID{1},
		Rate: []int64{10}, Lower: []int64{0}, Upper: []int64{no},
	}
	var cands []flow.Candidate
	for k := range 7 {
		cands = append(cands, flow.Candidate{ID: fmt.Sprint("b", k), Tail: 0, Head: 1, Rate: int64(7 - k), Lower: 2, Upper: no, Same: -1})
	}
	opt, err := dual.Optimize(n, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	_, set, err := dual.EvaluateBids(n, opt.Flow, opt.Potential, opt.Cost, cands)
	if err != nil {
		t.Fatal(err)
	}
	want := []int64{0, 0, 0, 0, 0, 0, 10}
	if !set.Feasible || set.Saving.Cmp(flow.WideFrom(90)) != 0 || !slices.Equal(set.Flows, want) {
		t.Fatalf("set: feasible %v, saving %s, flows %v; want saving 90, flows %v", set.Feasible, set.Saving.Format(0), set.Flows, want)
	}
}
