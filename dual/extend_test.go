package dual_test

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"lanecert/dual"
	"lanecert/flow"
	"lanecert/internal/certcheck"
	"lanecert/internal/longrun"
	"lanecert/internal/oracle"
	"lanecert/internal/randnet"
)

// setTotal is the total of the network with the candidates of set added
// (LP optimum, by the LP oracle, plus the fixed costs of the candidates it
// uses), in cost units; +Inf when that network is infeasible. Floats only
// in these comparisons.
func setTotal(t *testing.T, n *flow.Network, cs []flow.Candidate, set []int) float64 {
	t.Helper()
	sub := make([]flow.Candidate, len(set))
	for i, k := range set {
		sub[i] = cs[k]
	}
	res, err := oracle.MinCost(n.WithLanes(sub))
	if err != nil {
		t.Fatal(err)
	}
	if res.Status != oracle.Optimal {
		return math.Inf(1)
	}
	total := res.CostScaled
	for i, k := range set {
		if res.Flow[n.NumLanes()+i] > 0.5 {
			total += float64(cs[k].Fixed)
		}
	}
	return total / math.Pow10(n.QtyPlaces+n.RatePlaces)
}

// bruteTotal is the best total (setTotal) over every subset of at most two
// candidates; +Inf when none is feasible.
func bruteTotal(t *testing.T, n *flow.Network, cs []flow.Candidate) float64 {
	t.Helper()
	best := setTotal(t, n, cs, nil)
	for a := range cs {
		best = math.Min(best, setTotal(t, n, cs, []int{a}))
		for b := a + 1; b < len(cs); b++ {
			best = math.Min(best, setTotal(t, n, cs, []int{a, b}))
		}
	}
	return best
}

// bruteSingle returns the least total over the network alone and the
// network with one candidate added, where a candidate's fixed cost counts
// (the total is then the optimum with it plus its fixed cost, or the
// network alone when that is cheaper): gonum's LP simplex
// (internal/oracle) solves each.
func bruteSingle(t *testing.T, n *flow.Network, cs []flow.Candidate) float64 {
	t.Helper()
	scale := math.Pow10(n.QtyPlaces + n.RatePlaces)
	solve := func(sub []flow.Candidate) float64 {
		res, err := oracle.MinCost(n.WithLanes(sub))
		if err != nil {
			t.Fatal(err)
		}
		if res.Status != oracle.Optimal {
			return math.Inf(1)
		}
		return res.CostScaled / scale
	}
	best := solve(nil)
	for _, c := range cs {
		best = math.Min(best, solve([]flow.Candidate{c})+float64(c.Fixed)/scale)
	}
	return best
}

// TestExtendAgainstBruteForce: on small networks (infeasible ones among
// them, some with negative rates, some candidates with a minimum that an
// opened lane must carry) the chosen lanes give a feasible plan costing
// what Extend says, no
// single lane or pair does better (brute force with the LP oracle), the
// lower bound lies at or below the best over every set of candidates, and
// an answer called exact is that best.
func TestExtendAgainstBruteForce(t *testing.T) {
	rng := rand.New(rand.NewPCG(longrun.Seed(t, 3), 9))
	fixedCases, madeFeasible, pruned, unbounded := 0, 0, 0, 0
	for i := range longrun.Cases(t, 150) {
		o := randnet.RandomOptions(rng)
		o.NegativeRates = i%3 == 1 // squeezed (even i) or not
		o.Infeasible = false
		n := randnet.Network(rng, o)
		if n.NumNodes() < 2 {
			continue
		}
		if i%2 == 0 {
			// Squeeze capacities so that demand often cannot be met, but
			// new lanes can restore it.
			randnet.Squeeze(rng, n)
		}
		var cs []flow.Candidate
		withFixed := i%3 != 0
		var origins, dests []flow.NodeID
		for v, b := range n.Supply {
			if b > 0 {
				origins = append(origins, flow.NodeID(v))
			} else if b < 0 {
				dests = append(dests, flow.NodeID(v))
			}
		}
		for k := 0; k < 4; k++ {
			c := flow.Candidate{ID: "c", Tail: flow.NodeID(rng.IntN(n.NumNodes())), Head: flow.NodeID(rng.IntN(n.NumNodes())),
				Rate: rng.Int64N(2 * max(o.MaxRate, 1)), Upper: flow.NoLimit, Same: -1}
			if k%2 == 1 && len(origins) > 0 && len(dests) > 0 {
				// A lane from an origin straight to a destination.
				c.Tail, c.Head = origins[rng.IntN(len(origins))], dests[rng.IntN(len(dests))]
			}
			if rng.IntN(2) == 0 {
				c.Upper = 1 + rng.Int64N(200)
			}
			if withFixed {
				c.Fixed = rng.Int64N(1000)
			}
			if i%5 == 2 && k == 2 {
				// A candidate with a minimum: open, it carries at least that.
				c.Lower = 1 + rng.Int64N(min(c.Upper, 30))
			}
			cs = append(cs, c)
		}
		// With negative rates, a set of candidates may close a cycle of
		// lanes without capacity whose rates sum below zero: then, and
		// only then, Extend stops with an error. (Every set is solved:
		// with minimums, the union of all may have no plan at all.)
		if fallingSet(t, n, cs) {
			if _, err := dual.Extend(n, cs, dual.ExtendOptions{}); err != nil {
				unbounded++
				continue
			}
			t.Fatalf("case %d: some set of candidates lets the cost fall without limit, and Extend gave an answer", i)
		}
		x, err := dual.Extend(n, cs, dual.ExtendOptions{})
		if err != nil {
			t.Fatalf("case %d: %v", i, err)
		}
		// The best single lane is exact (also when lanes were skipped by
		// their lower bounds).
		one, err := dual.Extend(n, cs, dual.ExtendOptions{SinglesOnly: true})
		if err != nil {
			t.Fatalf("case %d: singles: %v", i, err)
		}
		pruned += one.Pruned
		if ws := bruteSingle(t, n, cs); !one.Feasible {
			if !math.IsInf(ws, 1) {
				t.Fatalf("case %d: no single lane found, brute force finds %v", i, ws)
			}
		} else if got := float64(one.Cost.Big().Int64()) / math.Pow10(n.QtyPlaces+n.RatePlaces); !one.Exact || len(one.Chosen) > 1 || math.Abs(got-ws) > 1e-6*math.Max(1, math.Abs(ws)) {
			t.Fatalf("case %d: best single %v (exact %v, %d lanes), brute force %v", i, got, one.Exact, len(one.Chosen), ws)
		}
		want := bruteTotal(t, n, cs)
		scale := math.Pow10(n.QtyPlaces + n.RatePlaces)
		if !x.Feasible {
			if !math.IsInf(want, 1) {
				t.Fatalf("case %d: no extension found, brute force finds %v", i, want)
			}
			continue
		}
		if !x.WasFeasible {
			madeFeasible++
		}
		if withFixed {
			fixedCases++
		}
		// The plan is feasible on the network with the chosen lanes and
		// costs what is claimed.
		sub := make([]flow.Candidate, len(x.Chosen))
		for i, k := range x.Chosen {
			sub[i] = cs[k]
		}
		ext := n.WithLanes(sub)
		plan := make([]int64, ext.NumLanes())
		copy(plan, x.Plan[:n.NumLanes()])
		copy(plan[n.NumLanes():], x.Flows)
		if err := certcheck.Feasible(ext, plan); err != nil {
			t.Fatalf("case %d: extended plan infeasible: %v", i, err)
		}
		total, _ := dual.Cost(ext, plan)
		for _, k := range x.Chosen {
			total, _ = total.Add(flow.WideFrom(cs[k].Fixed))
		}
		if total.Cmp(x.Cost) != 0 {
			t.Fatalf("case %d: cost %s, plan and fixed costs give %s", i, n.FormatCost(x.Cost), n.FormatCost(total))
		}
		got := float64(x.Cost.Big().Int64()) / scale
		if got > want+1e-6*math.Max(1, math.Abs(want)) {
			t.Fatalf("case %d: Extend total %v, a single lane or pair gives %v", i, got, want)
		}
		if !withFixed && math.Abs(got-want) > 1e-6*math.Max(1, math.Abs(want)) && got > want {
			t.Fatalf("case %d: without fixed costs the answer must be exact: %v vs %v", i, got, want)
		}
		if x.HasBound && x.Bound.Cmp(x.Cost) > 0 {
			t.Fatalf("case %d: lower bound %s above the answer %s", i, n.FormatCost(x.Bound), n.FormatCost(x.Cost))
		}
		// The bound holds against the best of every set (the answer may
		// miss it), and an answer called exact is that best.
		best := bestOverAllSets(t, n, cs)
		if bound := float64(x.Bound.Big().Int64()) / scale; x.HasBound && bound > best+1e-6*math.Max(1, math.Abs(best)) {
			t.Fatalf("case %d: lower bound %v above the best over every set %v", i, bound, best)
		}
		if x.Exact && math.Abs(got-best) > 1e-6*math.Max(1, math.Abs(best)) {
			t.Fatalf("case %d: called exact at %v, the best over every set is %v", i, got, best)
		}
	}
	t.Logf("%d cases with fixed costs, %d made feasible, %d single lanes skipped by their bounds, %d let the cost fall without limit", fixedCases, madeFeasible, pruned, unbounded)
	if fixedCases < 30 || madeFeasible < 10 {
		t.Errorf("coverage: %d cases with fixed costs, %d made feasible", fixedCases, madeFeasible)
	}
}

// TestSingleBounds checks the lower bounds used to skip single candidate
// lanes on infeasible networks: every bound is at most the exact total of
// the network with that lane added (gonum's LP simplex, internal/oracle,
// plus the lane's fixed cost), whenever that network is feasible; and the
// best single lane found while skipping lanes is the brute-force best.
// Half of the networks have negative rates (then a lane may let the cost
// fall without limit, which must stop Extend with an error).
func TestSingleBounds(t *testing.T) {
	rng := rand.New(rand.NewPCG(longrun.Seed(t, 17), 3))
	bounded, tight, pruned := 0, 0, 0
	for i, cases, enough := 0, longrun.Cases(t, 400), longrun.Cases(t, 300); i < cases && bounded < enough; i++ {
		o := randnet.RandomOptions(rng)
		o.NegativeRates, o.Infeasible = i%2 == 0, false
		n := randnet.Network(rng, o)
		if n.NumNodes() < 2 {
			continue
		}
		randnet.Squeeze(rng, n)
		cut, err := flow.FindCut(n)
		if err != nil {
			t.Fatal(err)
		}
		if cut == nil || cut.Hold {
			continue
		}
		in := make([]bool, n.NumNodes())
		for _, v := range cut.Region {
			in[v] = true
		}
		var outside []flow.NodeID
		for v := range in {
			if !in[v] {
				outside = append(outside, flow.NodeID(v))
			}
		}
		if len(outside) == 0 {
			continue
		}
		var cs []flow.Candidate
		for k := 0; k < 10; k++ { // at least minBoundedLanes, so bounds are used
			c := flow.Candidate{ID: "c", Tail: outside[rng.IntN(len(outside))], Head: cut.Region[rng.IntN(len(cut.Region))],
				Rate: rng.Int64N(2 * max(o.MaxRate, 1)), Upper: flow.NoLimit, Fixed: rng.Int64N(1000), Same: -1}
			if rng.IntN(3) > 0 {
				c.Upper = cut.Short + rng.Int64N(3*cut.Short+1)
			}
			cs = append(cs, c)
		}
		lb, has, ok, err := dual.SingleBoundsForTest(n, cs, cut)
		if err != nil {
			t.Fatalf("case %d: %v", i, err)
		}
		if !ok {
			continue
		}
		scale := math.Pow10(n.QtyPlaces + n.RatePlaces)
		// The best single lane, with lanes skipped by their bounds, is the
		// brute-force best.
		one, err := dual.Extend(n, cs, dual.ExtendOptions{SinglesOnly: true, Cut: cut, CutKnown: true})
		if err != nil {
			// With negative rates a single lane may close a cycle of
			// negative cost without capacity: then, and only then, Extend
			// stops with an error.
			if all, _ := oracle.MinCost(n.WithLanes(cs)); !o.NegativeRates || all.Status != oracle.Unbounded {
				t.Fatalf("case %d: %v (oracle with every lane: %v)", i, err, all.Status)
			}
			continue
		}
		pruned += one.Pruned
		ws := bruteSingle(t, n, cs)
		if one.Feasible != !math.IsInf(ws, 1) {
			t.Fatalf("case %d: best single found %v, brute force %v", i, one.Feasible, ws)
		}
		if one.Feasible {
			if got := float64(one.Cost.Big().Int64()) / scale; math.Abs(got-ws) > 1e-6*math.Max(1, math.Abs(ws)) {
				t.Fatalf("case %d: best single %v, brute force %v", i, got, ws)
			}
		}
		for k, c := range cs {
			if !has[k] {
				continue
			}
			res, err := oracle.MinCost(n.WithLanes([]flow.Candidate{c}))
			if err != nil {
				t.Fatal(err)
			}
			if res.Status != oracle.Optimal {
				continue // the lane alone does not restore feasibility
			}
			bounded++
			exact := (res.CostScaled + float64(c.Fixed)) / scale
			got := float64(lb[k].Big().Int64()) / scale
			if got > exact+1e-6*math.Max(1, math.Abs(exact)) {
				t.Fatalf("case %d lane %+v: bound %v above the exact total %v (cut %+v)", i, c, got, exact, cut)
			}
			if math.Abs(got-exact) <= 1e-6*math.Max(1, math.Abs(exact)) {
				tight++
			}
		}
	}
	t.Logf("%d bounds checked, %d tight; %d single lanes skipped", bounded, tight, pruned)
	if bounded < 100 || pruned < 30 {
		t.Errorf("only %d bounds checked, %d lanes skipped", bounded, pruned)
	}
}

// fallingSet reports whether the network with some set of the candidates
// has plans whose cost falls without limit (the LP oracle over every set).
func fallingSet(t *testing.T, n *flow.Network, cs []flow.Candidate) bool {
	t.Helper()
	for mask := 0; mask < 1<<len(cs); mask++ {
		var sub []flow.Candidate
		for k, c := range cs {
			if mask&(1<<k) != 0 {
				sub = append(sub, c)
			}
		}
		lp, err := oracle.MinCost(n.WithLanes(sub))
		if err != nil {
			t.Fatal(err)
		}
		if lp.Status == oracle.Unbounded {
			return true
		}
	}
	return false
}

// bestOverAllSets is the best total (setTotal) over every set of
// candidates; +Inf when none is feasible. For a handful of candidates.
func bestOverAllSets(t *testing.T, n *flow.Network, cs []flow.Candidate) float64 {
	t.Helper()
	best := math.Inf(1)
	for mask := 0; mask < 1<<len(cs); mask++ {
		var set []int
		for k := range cs {
			if mask&(1<<k) != 0 {
				set = append(set, k)
			}
		}
		best = math.Min(best, setTotal(t, n, cs, set))
	}
	return best
}

// TestExtendBoundCirculation: the lower bound of the linear relaxation
// must stay at or below the best total when the most a candidate can carry
// is more than the total supply: lane minimums that force units round a
// cycle through the candidate (found by the long run of
// TestExtendAgainstBruteForce, LANECERT_LONGRUN=10 LANECERT_LONGRUN_SEED=1,
// case 49, where the bound came out above the answer), and a negative rate
// that makes a cycle through it pay up to the capacity of the other lanes.
// The best total over every set of candidates comes from gonum's LP simplex
// (internal/oracle).
func TestExtendBoundCirculation(t *testing.T) {
	const no = flow.NoLimit
	for _, c := range []struct {
		name         string
		n            *flow.Network
		cs           []flow.Candidate
		beyondSupply int // a candidate whose best plan carries more than the supply
	}{
		{
			name: "minimums",
			n: &flow.Network{
				Nodes: []string{"a", "b", "c"}, Supply: []int64{-23, 5, 18},
				Tail:      []flow.NodeID{2, 2, 0, 2, 0, 1, 0, 0},
				Head:      []flow.NodeID{0, 1, 1, 0, 2, 0, 1, 2},
				Rate:      []int64{961, 9700, 0, 9446, 5500, 0, 5107, 2500},
				Lower:     []int64{0, 0, 20, 3, 31, 30, 1, 24},
				Upper:     []int64{no, no, no, no, no, 70, 24, 104},
				QtyPlaces: 1, RatePlaces: 2,
			},
			cs: []flow.Candidate{
				{ID: "c0", Tail: 0, Head: 0, Rate: 184, Upper: 182, Fixed: 649, Same: -1},
				{ID: "c1", Tail: 2, Head: 0, Rate: 47, Upper: 1, Fixed: 553, Same: -1},
				{ID: "c2", Tail: 1, Head: 1, Rate: 152, Upper: no, Fixed: 739, Same: -1},
				{ID: "c3", Tail: 2, Head: 0, Rate: 185, Upper: 151, Fixed: 686, Same: -1},
			},
			beyondSupply: 3,
		},
		{
			name: "negative rate",
			n: &flow.Network{
				Nodes: []string{"a", "b"}, Supply: []int64{1, -1},
				Tail: []flow.NodeID{0}, Head: []flow.NodeID{1},
				Rate: []int64{10}, Lower: []int64{0}, Upper: []int64{100},
			},
			cs:           []flow.Candidate{{ID: "back", Tail: 1, Head: 0, Rate: -20, Upper: no, Fixed: 500, Same: -1}},
			beyondSupply: 0,
		},
	} {
		t.Run(c.name, func(t *testing.T) {
			x, err := dual.Extend(c.n, c.cs, dual.ExtendOptions{})
			if err != nil {
				t.Fatal(err)
			}
			if !x.Feasible || !x.HasBound {
				t.Fatalf("feasible %v, bound %v", x.Feasible, x.HasBound)
			}
			var supply int64
			for _, b := range c.n.Supply {
				supply += max(b, 0)
			}
			moved := false
			for i, k := range x.Chosen {
				moved = moved || (k == c.beyondSupply && x.Flows[i] > supply)
			}
			if !moved {
				t.Fatalf("the case no longer moves more than the supply (%d) on candidate %d: chosen %v, flows %v", supply, c.beyondSupply, x.Chosen, x.Flows)
			}
			if x.Bound.Cmp(x.Cost) > 0 {
				t.Fatalf("lower bound %s above the answer %s", c.n.FormatCost(x.Bound), c.n.FormatCost(x.Cost))
			}
			scale := math.Pow10(c.n.QtyPlaces + c.n.RatePlaces)
			best := bestOverAllSets(t, c.n, c.cs)
			if bound := float64(x.Bound.Big().Int64()) / scale; bound > best+1e-9*math.Max(1, math.Abs(best)) {
				t.Fatalf("lower bound %v above the best total %v", bound, best)
			}
			if got := float64(x.Cost.Big().Int64()) / scale; math.Abs(got-best) > 1e-9*math.Max(1, math.Abs(best)) {
				t.Fatalf("answer %v, best total %v", got, best)
			}
		})
	}
}

// TestExtendCycleOfThree: three candidates with negative rates and no
// capacity close a cycle only together, so neither a single lane, a pair
// nor the greedy step (each lane alone only adds its fixed cost) finds it,
// and the relaxation (fixed costs spread over the most a lane can carry)
// sees no negative cycle either. The cost with all three open falls
// without limit (gonum's LP simplex agrees), so Extend must say so rather
// than give an answer, let alone call one exact; also when a fourth
// candidate's minimum leaves no plan with every candidate open.
func TestExtendCycleOfThree(t *testing.T) {
	const no = flow.NoLimit
	n := &flow.Network{
		Nodes: []string{"a", "b", "c", "d"}, Supply: []int64{1, 0, 0, -1},
		Tail: []flow.NodeID{0}, Head: []flow.NodeID{3},
		Rate: []int64{10}, Lower: []int64{0}, Upper: []int64{no},
	}
	cs := []flow.Candidate{
		{ID: "ab", Tail: 0, Head: 1, Rate: -5, Upper: no, Fixed: 100, Same: -1},
		{ID: "bc", Tail: 1, Head: 2, Rate: -5, Upper: no, Fixed: 100, Same: -1},
		{ID: "ca", Tail: 2, Head: 0, Rate: -5, Upper: no, Fixed: 100, Same: -1},
	}
	if lp, err := oracle.MinCost(n.WithLanes(cs)); err != nil || lp.Status != oracle.Unbounded {
		t.Fatalf("oracle with all three: %v %v", lp.Status, err)
	}
	for k := range cs {
		if lp, err := oracle.MinCost(n.WithLanes(append(append([]flow.Candidate(nil), cs[:k]...), cs[k+1:]...))); err != nil || lp.Status != oracle.Optimal {
			t.Fatalf("oracle without %s: %v %v", cs[k].ID, lp.Status, err)
		}
	}
	x, err := dual.Extend(n, cs, dual.ExtendOptions{})
	if err == nil {
		t.Fatalf("no error: feasible %v, cost %s, exact %v, chosen %v", x.Feasible, n.FormatCost(x.Cost), x.Exact, x.Chosen)
	}
	if !strings.Contains(err.Error(), "with candidates ab, bc and ca added the cost falls without limit") {
		t.Fatalf("error %q does not say that the three together let the cost fall without limit", err)
	}
	// A fourth candidate whose minimum (20) no plan can carry: with every
	// candidate open there is no plan at all, yet the three still let the
	// cost fall without limit.
	forced := flow.Candidate{ID: "ad", Tail: 0, Head: 3, Rate: 1, Lower: 20, Upper: no, Fixed: 100, Same: -1}
	cs4 := append(append([]flow.Candidate(nil), cs...), forced)
	if lp, err := oracle.MinCost(n.WithLanes(cs4)); err != nil || lp.Status != oracle.Infeasible {
		t.Fatalf("oracle with all four: %v %v", lp.Status, err)
	}
	if x, err := dual.Extend(n, cs4, dual.ExtendOptions{}); err == nil || !strings.Contains(err.Error(), "with candidates ab, bc and ca added the cost falls without limit") {
		t.Fatalf("with a fourth, forced candidate: error %v (answer %+v)", err, x)
	}
}

// TestExtendShortWithCycle: on a network that cannot meet its demand, a
// candidate that closes a cycle of negative cost without capacity but
// delivers nothing leaves the network short: alone it is no answer (the
// best single lane is the one that delivers), while with every candidate
// open the cost falls without limit. (Solving from the priced network,
// whose unmet lanes always place the demand, took that cycle for an answer
// for the whole search.) Totals from gonum's LP simplex (internal/oracle).
func TestExtendShortWithCycle(t *testing.T) {
	const no = flow.NoLimit
	// o supplies 10, d demands 10 but o -> d carries 5; d -> x costs -10
	// per unit without limit, and x is reached from nowhere else.
	n := &flow.Network{
		Nodes: []string{"o", "d", "x"}, Supply: []int64{10, -10, 0},
		Tail: []flow.NodeID{0, 1}, Head: []flow.NodeID{1, 2},
		Rate: []int64{1, -10}, Lower: []int64{0, 0}, Upper: []int64{5, no},
	}
	cs := []flow.Candidate{
		{ID: "loop", Tail: 2, Head: 1, Rate: 1, Upper: no, Fixed: 0, Same: -1},
		{ID: "more", Tail: 0, Head: 1, Rate: 3, Upper: 5, Fixed: 7, Same: -1},
	}
	for k, want := range []oracle.Status{oracle.Infeasible, oracle.Optimal} {
		if lp, err := oracle.MinCost(n.WithLanes(cs[k : k+1])); err != nil || lp.Status != want {
			t.Fatalf("oracle with %s alone: %v %v, want %v", cs[k].ID, lp.Status, err, want)
		}
	}
	one, err := dual.Extend(n, cs, dual.ExtendOptions{SinglesOnly: true})
	if err != nil {
		t.Fatalf("best single lane: %v", err)
	}
	want := setTotal(t, n, cs, []int{1})
	if got := float64(one.Cost.Big().Int64()) / math.Pow10(n.QtyPlaces+n.RatePlaces); !one.Feasible || !one.Exact || len(one.Chosen) != 1 || one.Chosen[0] != 1 || got != want {
		t.Fatalf("best single: feasible %v exact %v chosen %v total %v; want lane 1 at %v", one.Feasible, one.Exact, one.Chosen, got, want)
	}
	if _, err := dual.Extend(n, cs, dual.ExtendOptions{}); err == nil || !strings.Contains(err.Error(), "without limit") {
		t.Fatalf("every candidate open: error %v, want the cost falling without limit", err)
	}
}

// TestExtendCandidateMinimum: without fixed costs, a candidate with a
// minimum it cannot carry (more than the supply) must not stop the others
// from being opened: every candidate open has no feasible plan, while the
// cheap lane alone lowers the cost. The best total comes from gonum's LP
// simplex over every set (internal/oracle).
func TestExtendCandidateMinimum(t *testing.T) {
	const no = flow.NoLimit
	n := &flow.Network{
		Nodes: []string{"o", "d"}, Supply: []int64{10, -10},
		Tail: []flow.NodeID{0}, Head: []flow.NodeID{1},
		Rate: []int64{10}, Lower: []int64{0}, Upper: []int64{no},
	}
	cs := []flow.Candidate{
		{ID: "cheap", Tail: 0, Head: 1, Rate: 1, Upper: no, Same: -1},
		{ID: "forced", Tail: 0, Head: 1, Rate: 1, Lower: 20, Upper: no, Same: -1},
	}
	if lp, err := oracle.MinCost(n.WithLanes(cs)); err != nil || lp.Status != oracle.Infeasible {
		t.Fatalf("oracle with both: %v %v", lp.Status, err)
	}
	x, err := dual.Extend(n, cs, dual.ExtendOptions{})
	if err != nil {
		t.Fatal(err)
	}
	best := bestOverAllSets(t, n, cs)
	got := float64(x.Cost.Big().Int64()) / math.Pow10(n.QtyPlaces+n.RatePlaces)
	if !x.Feasible || !x.Exact || got != best || len(x.Chosen) != 1 || x.Chosen[0] != 0 {
		t.Fatalf("feasible %v exact %v total %v chosen %v (%s); best over every set %v with the cheap lane", x.Feasible, x.Exact, got, x.Chosen, x.Method, best)
	}
}

// TestLaneList: how messages name candidate lanes (format defined here).
func TestLaneList(t *testing.T) {
	n := &flow.Network{Nodes: []string{"Plant A", "DC B"}}
	c := func(id string) flow.Candidate { return flow.Candidate{ID: id, Tail: 0, Head: 1} }
	for _, tc := range []struct {
		cs   []flow.Candidate
		want string
	}{
		{nil, "no bids"},
		{[]flow.Candidate{c("b7")}, "bid b7"},
		{[]flow.Candidate{c("")}, "bid Plant A to DC B"},
		{[]flow.Candidate{c("b1"), c("b2")}, "bids b1 and b2"},
		{[]flow.Candidate{c("b1"), c(""), c("b3")}, "bids b1, Plant A to DC B and b3"},
		{[]flow.Candidate{c("1"), c("2"), c("3"), c("4"), c("5"), c("6"), c("7")}, "bids 1, 2, 3, 4, 5 and 2 more"},
	} {
		if got := dual.LaneList(n, "bid", tc.cs); got != tc.want {
			t.Errorf("%d lanes: %q, want %q", len(tc.cs), got, tc.want)
		}
	}
}
