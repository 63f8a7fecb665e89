package flow_test

import (
	"fmt"
	"math"
	"math/rand/v2"
	"reflect"
	"slices"
	"strings"
	"testing"

	"lanecert/flow"
	"lanecert/internal/certcheck"
	"lanecert/internal/longrun"
	"lanecert/internal/oracle"
	"lanecert/internal/randnet"
)

// TestWithShortfallShape checks the extended network lane by lane.
func TestWithShortfallShape(t *testing.T) {
	n := cutNet([]string{"plant", "hub", "east", "west"}, []int64{50, 0, -30, -40},
		cutLane{0, 1, 0, flow.NoLimit}, cutLane{1, 2, 0, 25}, cutLane{1, 3, 5, 30})
	n.QtyPlaces, n.RatePlaces = 1, 2
	n.Extra = &flow.ExtraColumns{Names: []string{"mode"}, Values: [][]string{{"rail"}, {"road"}, {"road"}}}
	ext, err := flow.WithShortfall(n, 900, []int64{-1, 5, 700, -1})
	if err != nil {
		t.Fatal(err)
	}
	if err := ext.Validate(); err != nil {
		t.Fatal(err)
	}
	want := &flow.Network{
		Nodes:      []string{"plant", "hub", "east", "west", "(unmet)"},
		Supply:     []int64{50, 0, -30, -40, 70},
		Tail:       []flow.NodeID{0, 1, 1, 4, 4},
		Head:       []flow.NodeID{1, 2, 3, 2, 3},
		Lower:      []int64{0, 0, 5, 0, 0},
		Upper:      []int64{flow.NoLimit, 25, 30, 30, 40},
		Rate:       []int64{1, 1, 1, 700, 900}, // east has its own price, west the default
		LaneNames:  []string{"1", "2", "3", "unmet:east", "unmet:west"},
		QtyPlaces:  1,
		RatePlaces: 2,
		Extra:      &flow.ExtraColumns{Names: []string{"mode"}, Values: [][]string{{"rail"}, {"road"}, {"road"}, {""}, {""}}},
	}
	if !reflect.DeepEqual(ext, want) {
		t.Fatalf("got  %+v\nwant %+v", ext, want)
	}
	// The copy shares nothing with n.
	ext.Supply[0], ext.Rate[0], ext.Extra.Values[0][0] = 1, 2, "sea"
	if n.Supply[0] != 50 || n.Rate[0] != 1 || n.Extra.Values[0][0] != "rail" {
		t.Fatal("WithShortfall shares arrays with n")
	}
}

func TestWithShortfallErrors(t *testing.T) {
	n := cutNet([]string{"o", "d"}, []int64{5, -5}, cutLane{0, 1, 0, 9})
	clash := cutNet([]string{"o", "(unmet)"}, []int64{5, -5}, cutLane{0, 1, 0, 9})
	laneClash := cutNet([]string{"o", "d"}, []int64{5, -5}, cutLane{0, 1, 0, 9})
	laneClash.LaneNames = []string{"unmet:d"}
	cases := []struct {
		name   string
		n      *flow.Network
		price  int64
		prices []int64
		want   string
	}{
		{"negative price", n, -1, nil, "negative"},
		{"prices length", n, 1, []int64{1}, "1 shortfall prices for 2 nodes"},
		{"node name", clash, 1, nil, "already named"},
		{"lane name", laneClash, 1, nil, "already named"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := flow.WithShortfall(c.n, c.price, c.prices)
			if err == nil || !strings.Contains(err.Error(), c.want) || !strings.HasPrefix(err.Error(), "flow: ") {
				t.Fatalf("err %v, want %q", err, c.want)
			}
		})
	}
}

// TestWithShortfallPrice shows the intended semantics on one lane of rate
// 5 from an origin of 10 to a destination of 10 (worked out by hand): a
// price below the rate leaves the demand unmet and the origin keeps its
// supply; a price above it ships.
func TestWithShortfallPrice(t *testing.T) {
	n := cutNet([]string{"o", "d"}, []int64{10, -10}, cutLane{0, 1, 0, flow.NoLimit})
	n.Rate[0] = 5
	for _, c := range []struct {
		price int64
		flow  []int64
		cost  int64
	}{
		{3, []int64{0, 10}, 30},
		{7, []int64{10, 0}, 50},
	} {
		ext, err := flow.WithShortfall(n, c.price, nil)
		if err != nil {
			t.Fatal(err)
		}
		sol, err := flow.Solve(ext, flow.SolveOptions{})
		if err != nil {
			t.Fatal(err)
		}
		if sol.Status != flow.Optimal || !slices.Equal(sol.Flow, c.flow) || sol.Cost != flow.WideFrom(c.cost) {
			t.Fatalf("price %d: %v %v cost %s, want %v cost %d", c.price, sol.Status, sol.Flow, sol.Cost.Format(0), c.flow, c.cost)
		}
	}
}

// TestWithShortfallMinimums: a minimum out of a node with nothing to send
// is not a shortfall of demand, so the extended network stays infeasible
// and its own cut still names that node (worked out by hand: region {a},
// net demand 0, reach 0 - 10).
func TestWithShortfallMinimums(t *testing.T) {
	n := cutNet([]string{"o", "a", "c"}, []int64{5, 0, -5}, cutLane{0, 2, 0, 5}, cutLane{1, 2, 10, 10})
	ext, err := flow.WithShortfall(n, 100, nil)
	if err != nil {
		t.Fatal(err)
	}
	sol, err := flow.Solve(ext, flow.SolveOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if sol.Status != flow.Infeasible {
		t.Fatalf("extended network %v", sol.Status)
	}
	checkCutWant(t, ext, cutWant{region: []flow.NodeID{1}, demand: 0, reach: -10, short: 10, out: []flow.LaneID{1}})
}

// TestExtendPlan checks the unmet quantities by hand: east needs 30 and
// gets 25; west needs 40, gets 30 and ships 5 back to the hub (net 25);
// in the second plan west gets 45 (over-delivery: 0 unmet).
func TestExtendPlan(t *testing.T) {
	n := cutNet([]string{"plant", "hub", "east", "west"}, []int64{70, 0, -30, -40},
		cutLane{0, 1, 0, flow.NoLimit}, cutLane{1, 2, 0, 25}, cutLane{1, 3, 0, 50}, cutLane{3, 1, 0, 10})
	ext, err := flow.WithShortfall(n, 100, nil)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct{ x, want []int64 }{
		{[]int64{50, 25, 30, 5}, []int64{50, 25, 30, 5, 5, 15}},
		{[]int64{70, 25, 45, 0}, []int64{70, 25, 45, 0, 5, 0}},
		{[]int64{0, 0, 0, 10}, []int64{0, 0, 0, 10, 30, 50}}, // west sends out: 50 > capacity 40
	} {
		got := flow.ExtendPlan(n, ext, c.x)
		if !slices.Equal(got, c.want) {
			t.Fatalf("ExtendPlan(%v) = %v, want %v", c.x, got, c.want)
		}
	}
	// A plan that meets everything except demand is feasible once extended.
	if err := certcheck.Feasible(ext, flow.ExtendPlan(n, ext, []int64{50, 25, 30, 5})); err != nil {
		t.Fatal(err)
	}
	if err := certcheck.Feasible(ext, flow.ExtendPlan(n, ext, []int64{0, 0, 0, 10})); err == nil {
		t.Fatal("over-shipping destination: extended plan passes")
	}
}

// sumAbsRates returns Σ |Rate| over the lanes of n (small test networks).
func sumAbsRates(n *flow.Network) int64 {
	var s int64
	for _, r := range n.Rate {
		s += max(r, -r)
	}
	return s
}

// TestWithShortfallRandom checks on seeded random networks that with every
// unit price above Σ|Rate| (so that leaving a unit unmet always costs more
// than any rerouting, see WithShortfall) the optimum of the extended
// network leaves exactly FindCut's Short unmet (0 when n is feasible, with
// n's optimal cost unchanged). The optimal cost is compared with the gonum
// LP oracle, the unmet total also from the oracle's own plan, and every
// optimal plan passes certcheck.Feasible and round-trips through
// ExtendPlan. Extended networks that stay infeasible must have minimums
// and a cut of their own.
func TestWithShortfallRandom(t *testing.T) {
	rng := rand.New(rand.NewPCG(longrun.Seed(t, 20250302), 1))
	var solved, fixed, still, unbounded int
	for i := range longrun.Cases(t, 400) {
		var n *flow.Network
		switch i % 3 {
		case 0:
			o := randnet.RandomOptions(rng)
			o.Infeasible = true
			n = randnet.Network(rng, o)
		case 1:
			n = randnet.Random(rng)
		default:
			n = cutRandom(rng)
		}
		name := fmt.Sprintf("case %d", i)
		cut, err := flow.FindCut(n)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		var short int64
		if cut != nil {
			short = cut.Short
		}
		price := sumAbsRates(n) + 1 + rng.Int64N(3)
		var prices []int64
		if i%2 == 1 {
			prices = make([]int64, len(n.Nodes))
			for v := range prices {
				prices[v] = price + rng.Int64N(4) // each above Σ|Rate|
				if rng.IntN(4) == 0 {
					prices[v] = -1 // use price
				}
			}
		}
		ext, err := flow.WithShortfall(n, price, prices)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		m := n.NumLanes()
		sol, err := flow.Solve(ext, flow.SolveOptions{})
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		switch sol.Status {
		case flow.Unbounded:
			unbounded++
			continue
		case flow.Infeasible:
			if !slices.ContainsFunc(n.Lower, func(l int64) bool { return l > 0 }) {
				t.Fatalf("%s: extended network without minimums is infeasible", name)
			}
			ec, err := flow.FindCut(ext)
			if err != nil || ec == nil || cut == nil {
				t.Fatalf("%s: extended network infeasible, cuts %+v %+v, %v", name, cut, ec, err)
			}
			checkCut(t, ext, ec)
			still++
			continue
		}
		solved++
		if cut != nil {
			fixed++
		}
		var unmet int64
		for _, f := range sol.Flow[m:] {
			unmet += f
		}
		if unmet != short {
			t.Fatalf("%s: unmet %d, cut short %d", name, unmet, short)
		}
		if err := certcheck.Feasible(ext, sol.Flow); err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		if got := flow.ExtendPlan(n, ext, sol.Flow[:m]); !slices.Equal(got, sol.Flow) {
			t.Fatalf("%s: ExtendPlan %v, solved %v", name, got, sol.Flow)
		}
		res, err := oracle.MinCost(ext)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		if !oracle.SameCost(sol.Cost, ext.QtyPlaces+ext.RatePlaces, res) {
			t.Fatalf("%s: cost %s, oracle %v %g", name, sol.Cost.Format(ext.QtyPlaces+ext.RatePlaces), res.Status, res.Cost)
		}
		var lpUnmet float64
		for _, f := range res.Flow[m:] {
			lpUnmet += f
		}
		if int64(math.Round(lpUnmet)) != short {
			t.Fatalf("%s: oracle leaves %g unmet, cut short %d", name, lpUnmet, short)
		}
		if cut == nil {
			// A feasible network keeps its optimum.
			orig, err := flow.Solve(n, flow.SolveOptions{})
			if err != nil {
				t.Fatalf("%s: %v", name, err)
			}
			if orig.Status != flow.Optimal || orig.Cost != sol.Cost {
				t.Fatalf("%s: original %v cost %s, extended cost %s", name, orig.Status,
					orig.Cost.Format(n.QtyPlaces+n.RatePlaces), sol.Cost.Format(n.QtyPlaces+n.RatePlaces))
			}
		}
	}
	t.Logf("%d solved (%d of them infeasible before), %d still infeasible (minimums), %d unbounded", solved, fixed, still, unbounded)
	if solved < 200 || fixed < 50 || still == 0 {
		t.Fatalf("too few cases of a kind: %d solved, %d fixed, %d still infeasible", solved, fixed, still)
	}
}

// TestSolvePricedShortfall: the unnamed priced network solved with its basis
// kept gives the same status, cost and number of unmet lanes as solving
// WithShortfall's copy, and its plan is feasible for that copy.
func TestSolvePricedShortfall(t *testing.T) {
	rng := rand.New(rand.NewPCG(longrun.Seed(t, 8), 21))
	solved := 0
	for i := range longrun.Cases(t, 200) {
		o := randnet.RandomOptions(rng)
		o.NegativeRates = false
		n := randnet.Network(rng, o)
		price := 1 + rng.Int64N(1000)
		ext, err := flow.WithShortfall(n, price, nil)
		if err != nil {
			continue
		}
		want, err := flow.Solve(ext, flow.SolveOptions{})
		if err != nil {
			t.Fatal(err)
		}
		got, unmet, err := flow.SolvePricedShortfall(n, price, nil)
		if err != nil {
			t.Fatalf("case %d: %v", i, err)
		}
		if got.Status != want.Status || unmet != ext.NumLanes()-n.NumLanes() {
			t.Fatalf("case %d: status %v (%d unmet lanes), want %v (%d)", i, got.Status, unmet, want.Status, ext.NumLanes()-n.NumLanes())
		}
		if got.Status != flow.Optimal {
			continue
		}
		solved++
		if got.Cost.Cmp(want.Cost) != 0 || got.Basis == nil {
			t.Fatalf("case %d: cost %s, want %s", i, got.Cost.Format(0), want.Cost.Format(0))
		}
		if err := certcheck.Feasible(ext, got.Flow); err != nil {
			t.Fatalf("case %d: %v", i, err)
		}
	}
	if solved < 100 {
		t.Errorf("only %d solved", solved)
	}
	// From an infeasible solve's Attempt: within the lane bounds, all but
	// Shortfall delivered (the unmet quantities ExtendPlan adds sum to it
	// when the extension is a feasible start), and the priced solve started
	// from it reaches the cold optimum.
	warm, short := 0, 0
	for i := 0; i < 300; i++ {
		o := randnet.RandomOptions(rng)
		o.NegativeRates = false
		n := randnet.Network(rng, o)
		randnet.Squeeze(rng, n)
		sol, err := flow.Solve(n, flow.SolveOptions{Keep: true})
		if err != nil {
			t.Fatal(err)
		}
		if sol.Status != flow.Infeasible {
			if sol.Attempt != nil {
				t.Fatalf("case %d: Attempt for a %v solve", i, sol.Status)
			}
			continue
		}
		short++
		x := sol.Attempt
		if len(x) != n.NumLanes() {
			t.Fatalf("case %d: Attempt has %d flows", i, len(x))
		}
		for a, f := range x {
			if f < n.Lower[a] || (n.Upper[a] != flow.NoLimit && f > n.Upper[a]) {
				t.Fatalf("case %d: lane %d flow %d outside [%d, %d]", i, a, f, n.Lower[a], n.Upper[a])
			}
		}
		price := int64(1)
		for _, r := range n.Rate {
			price += max(r, -r)
		}
		ext, err := flow.WithShortfall(n, price, nil)
		if err != nil {
			continue
		}
		start := flow.ExtendPlan(n, ext, x)
		if certcheck.Feasible(ext, start) == nil {
			var unmet int64
			for _, q := range start[n.NumLanes():] {
				unmet += q
			}
			if unmet != sol.Shortfall {
				t.Fatalf("case %d: Attempt leaves %d unmet, Shortfall %d", i, unmet, sol.Shortfall)
			}
		}
		cold, err := flow.Solve(ext, flow.SolveOptions{})
		if err != nil {
			t.Fatal(err)
		}
		got, _, err := flow.SolvePricedShortfall(n, price, x)
		if err != nil {
			t.Fatal(err)
		}
		if got.Status != cold.Status || (got.Status == flow.Optimal && got.Cost.Cmp(cold.Cost) != 0) {
			t.Fatalf("case %d: from Attempt %v %s, cold %v %s", i, got.Status, got.Cost.Format(0), cold.Status, cold.Cost.Format(0))
		}
		if got.WarmStarted {
			warm++
		}
	}
	t.Logf("%d short networks, %d priced solves started from the attempt", short, warm)
	if short < 50 || warm < short/2 {
		t.Errorf("only %d short networks, %d warm starts", short, warm)
	}
	if _, _, err := flow.SolvePricedShortfall(build([]int64{1, -1}, [][5]int64{{0, 1, 0, 1, 1}}), -1, nil); err == nil {
		t.Error("negative price accepted")
	}
}
