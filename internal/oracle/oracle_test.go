package oracle_test

import (
	"bufio"
	"math"
	"math/big"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"lanecert/flow"
	"lanecert/internal/oracle"
	"lanecert/internal/randnet"
)

// readMin parses the few DIMACS lines used by testdata/*.min: "p min N A",
// "n ID SUPPLY", "a SRC DST LOW CAP COST"; "c" lines are comments. Numbers
// are integers, so both scales are 0.
func readMin(t *testing.T, name string) *flow.Network {
	t.Helper()
	f, err := os.Open(filepath.Join("testdata", name))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	n := &flow.Network{}
	sc := bufio.NewScanner(f)
	line := 0
	num := func(s string) int64 {
		v, err := strconv.ParseInt(s, 10, 64)
		if err != nil {
			t.Fatalf("%s:%d: %v", name, line, err)
		}
		return v
	}
	for sc.Scan() {
		line++
		fs := strings.Fields(sc.Text())
		if len(fs) == 0 {
			continue
		}
		switch {
		case fs[0] == "p" && len(fs) == 4:
			nn := int(num(fs[2]))
			n.Nodes = make([]string, nn)
			n.Supply = make([]int64, nn)
			for v := range nn {
				n.Nodes[v] = strconv.Itoa(v + 1)
			}
		case fs[0] == "n" && len(fs) == 3:
			n.Supply[num(fs[1])-1] = num(fs[2])
		case fs[0] == "a" && len(fs) == 6:
			n.Tail = append(n.Tail, flow.NodeID(num(fs[1])-1))
			n.Head = append(n.Head, flow.NodeID(num(fs[2])-1))
			n.Lower = append(n.Lower, num(fs[3]))
			n.Upper = append(n.Upper, num(fs[4]))
			n.Rate = append(n.Rate, num(fs[5]))
		case fs[0] == "c":
		default:
			t.Fatalf("%s:%d: unexpected line %q", name, line, sc.Text())
		}
	}
	if err := sc.Err(); err != nil {
		t.Fatal(err)
	}
	if err := n.Validate(); err != nil {
		t.Fatalf("%s: %v", name, err)
	}
	return n
}

// dropNode removes node v and its lanes.
func dropNode(n *flow.Network, v flow.NodeID) *flow.Network {
	out := &flow.Network{}
	for u := range n.Nodes {
		if flow.NodeID(u) != v {
			out.Nodes = append(out.Nodes, n.Nodes[u])
			out.Supply = append(out.Supply, n.Supply[u])
		}
	}
	re := func(u flow.NodeID) flow.NodeID {
		if u > v {
			return u - 1
		}
		return u
	}
	for a := range n.Tail {
		if n.Tail[a] == v || n.Head[a] == v {
			continue
		}
		out.Tail = append(out.Tail, re(n.Tail[a]))
		out.Head = append(out.Head, re(n.Head[a]))
		out.Lower = append(out.Lower, n.Lower[a])
		out.Upper = append(out.Upper, n.Upper[a])
		out.Rate = append(out.Rate, n.Rate[a])
	}
	return out
}

func TestMinCostPublished(t *testing.T) {
	tests := []struct {
		file string
		want float64
		edit func(*flow.Network) *flow.Network
	}{
		// Dantzig, Linear Programming and Extensions (1963) ch. 3-3; GLPK 5.0 examples/transp.mod.
		{file: "dantzig_trnsport.min", want: 153675},
		// Same data without the dummy sink (node 6): the 50 surplus cases are
		// kept at the plants by the excess-supply rule; the dummy sink with
		// zero-cost arcs in the source models exactly that, so the optimum is
		// the source's 153675.
		{file: "dantzig_trnsport.min", want: 153675, edit: func(n *flow.Network) *flow.Network { return dropNode(n, 5) }},
		// GLPK 5.0 examples/sample.min; GLPK Graph and Network Routines (Dec 2020) sec. 2.1.5.
		{file: "glpk_sample.min", want: 213},
		// lp_solve 5.5 reference guide, "DIMACS minimum cost flow problems".
		{file: "dimacs_lpsolve_example.min", want: 14},
		// Winston, Operations Research: Applications and Algorithms, Powerco example (edition from memory).
		{file: "winston_powerco.min", want: 1020},
		// lp_solve 5.5 reference guide, "DIMACS assignment problems".
		{file: "lpsolve_asn5.min", want: 118},
		// SciPy 1.10 scipy.optimize.linear_sum_assignment documentation example.
		{file: "scipy_lsa_doc3.min", want: 5},
		// NetworkX 2.8 algorithms/flow/tests/test_mincost.py::test_simple_digraph.
		{file: "nx_simple_digraph.min", want: 24},
		// NetworkX 2.8 test_mincost.py::test_transshipment (negative rates).
		{file: "nx_transshipment.min", want: 41},
		// LEMON 1.3 test/min_cost_flow_test.cc, case "-1".
		{file: "lemon_mcf_case1.min", want: 5240},
		// LEMON 1.3 test/min_cost_flow_test.cc, case "-2".
		{file: "lemon_mcf_case2.min", want: 7620},
		// Fourer, Gay & Kernighan, AMPL 2nd ed. (2003) ch. 15, net1 (costs x10).
		{file: "ampl_net1.min", want: 18190},
	}
	for _, tc := range tests {
		name := tc.file
		if tc.edit != nil {
			name += "/edited"
		}
		t.Run(name, func(t *testing.T) {
			n := readMin(t, tc.file)
			if tc.edit != nil {
				n = tc.edit(n)
			}
			r, err := oracle.MinCost(n)
			if err != nil {
				t.Fatal(err)
			}
			if r.Status != oracle.Optimal {
				t.Fatalf("status %v, want optimal", r.Status)
			}
			if math.Abs(r.Cost-tc.want) > 1e-6*tc.want {
				t.Errorf("cost %v, want %v", r.Cost, tc.want)
			}
			if !oracle.SameCost(flow.WideFrom(int64(tc.want)), 0, r) {
				t.Errorf("SameCost(%v) false for cost %v", tc.want, r.Cost)
			}
			if oracle.SameCost(flow.WideFrom(int64(tc.want)+1), 0, r) {
				t.Errorf("SameCost(%v) true for cost %v", tc.want+1, r.Cost)
			}
			checkFlow(t, n, r)
		})
	}
}

// checkFlow checks that r.Flow is integral within 1e-6, meets bounds and
// balances (with the excess-supply rule), and costs r.CostScaled.
func checkFlow(t *testing.T, n *flow.Network, r oracle.Result) {
	t.Helper()
	if len(r.Flow) != len(n.Tail) {
		t.Fatalf("%d flows for %d lanes", len(r.Flow), len(n.Tail))
	}
	x := make([]int64, len(r.Flow))
	var cost float64
	for a, f := range r.Flow {
		x[a] = int64(math.Round(f))
		if math.Abs(f-float64(x[a])) > 1e-6 {
			t.Fatalf("lane %d: flow %v not integral", a, f)
		}
		if x[a] < n.Lower[a] || x[a] > n.Upper[a] {
			t.Fatalf("lane %d: flow %d outside [%d, %d]", a, x[a], n.Lower[a], n.Upper[a])
		}
		cost += float64(n.Rate[a]) * f
	}
	if math.Abs(cost-r.CostScaled) > 1e-6*(1+math.Abs(cost)) {
		t.Errorf("flows cost %v, result says %v", cost, r.CostScaled)
	}
	if want := r.CostScaled / math.Pow(10, float64(n.QtyPlaces+n.RatePlaces)); math.Abs(want-r.Cost) > 1e-9*(1+math.Abs(want)) {
		t.Errorf("Cost %v, CostScaled %v: scales disagree", r.Cost, r.CostScaled)
	}
	out := make([]int64, len(n.Nodes))
	for a := range x {
		out[n.Tail[a]] += x[a]
		out[n.Head[a]] -= x[a]
	}
	s, d, _ := n.Totals()
	for v, o := range out {
		if s > d && n.Supply[v] > 0 {
			if o < 0 || o > n.Supply[v] {
				t.Errorf("origin %d: net outflow %d outside [0, %d]", v, o, n.Supply[v])
			}
		} else if o != n.Supply[v] {
			t.Errorf("node %d: net outflow %d, supply %d", v, o, n.Supply[v])
		}
	}
}

// net builds a network from lanes given as {tail, head, lower, upper, rate}.
func net(supply []int64, lanes [][5]int64) *flow.Network {
	n := &flow.Network{Supply: supply}
	for v := range supply {
		n.Nodes = append(n.Nodes, strconv.Itoa(v+1))
	}
	for _, l := range lanes {
		n.Tail = append(n.Tail, flow.NodeID(l[0]))
		n.Head = append(n.Head, flow.NodeID(l[1]))
		n.Lower = append(n.Lower, l[2])
		n.Upper = append(n.Upper, l[3])
		n.Rate = append(n.Rate, l[4])
	}
	return n
}

const inf = flow.NoLimit

// Hand-made cases; each expected value is worked by hand from the problem
// definition in the package doc.
func TestMinCostSmall(t *testing.T) {
	tests := []struct {
		name   string
		n      *flow.Network
		status oracle.Status
		cost   float64 // true units
	}{
		{"one lane", net([]int64{3, -3}, [][5]int64{{0, 1, 0, inf, 2}}), oracle.Optimal, 6},
		{"demand above supply", net([]int64{3, -4}, [][5]int64{{0, 1, 0, inf, 2}}), oracle.Infeasible, 0},
		{"capacity too small", net([]int64{3, -3}, [][5]int64{{0, 1, 0, 2, 2}}), oracle.Infeasible, 0},
		{"no route", net([]int64{3, -3}, [][5]int64{{1, 0, 0, inf, 2}}), oracle.Infeasible, 0},
		{"isolated node with supply", net([]int64{3, -3, 1, 0}, [][5]int64{{0, 1, 0, inf, 2}}), oracle.Optimal, 6},
		{"isolated destination", net([]int64{3, -3, 0, -1}, [][5]int64{{0, 1, 0, inf, 2}}), oracle.Infeasible, 0},
		{"minimum forces a cycle", net([]int64{0, 0}, [][5]int64{{0, 1, 2, inf, 3}, {1, 0, 0, inf, 1}}), oracle.Optimal, 8},
		{"negative cycle without capacity", net([]int64{1, -1}, [][5]int64{{0, 1, 0, inf, 1}, {1, 0, 0, inf, -2}}), oracle.Unbounded, 0},
		{"negative cycle with capacity", net([]int64{1, -1}, [][5]int64{{0, 1, 0, inf, 1}, {1, 0, 0, 4, -2}}), oracle.Optimal, 1 - 4},
		{"negative self-loop with capacity", net([]int64{1, -1}, [][5]int64{{0, 1, 0, inf, 1}, {1, 1, 1, 5, -2}}), oracle.Optimal, 1 - 10},
		{"negative self-loop without capacity", net([]int64{1, -1}, [][5]int64{{0, 1, 0, inf, 1}, {1, 1, 0, inf, -2}}), oracle.Unbounded, 0},
		{"negative self-loop, infeasible", net([]int64{2, -1, -1}, [][5]int64{{0, 1, 0, inf, 1}, {1, 1, 0, inf, -2}}), oracle.Infeasible, 0},
		{"self-loop only", net([]int64{0}, [][5]int64{{0, 0, 2, 7, 3}}), oracle.Optimal, 6},
		{"excess kept", net([]int64{5, -2}, [][5]int64{{0, 1, 0, inf, 4}}), oracle.Optimal, 8},
		{"excess, negative rate, destination balances", net([]int64{5, -2}, [][5]int64{{0, 1, 0, inf, -4}}), oracle.Optimal, -8},
		{"excess, origin also receives", net([]int64{5, 3, -4}, [][5]int64{{0, 1, 0, inf, 1}, {1, 2, 0, inf, 1}, {0, 2, 0, inf, 3}}), oracle.Optimal, 5},
		{"fixed lane", net([]int64{2, -2}, [][5]int64{{0, 1, 2, 2, 5}}), oracle.Optimal, 10},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			r, err := oracle.MinCost(tc.n)
			if err != nil {
				t.Fatal(err)
			}
			if r.Status != tc.status {
				t.Fatalf("status %v, want %v", r.Status, tc.status)
			}
			if r.Status != oracle.Optimal {
				if r.Flow != nil {
					t.Errorf("flow %v for status %v", r.Flow, r.Status)
				}
				return
			}
			if math.Abs(r.Cost-tc.cost) > 1e-9 {
				t.Errorf("cost %v, want %v", r.Cost, tc.cost)
			}
			checkFlow(t, tc.n, r)
		})
	}
}

func TestMinCostScales(t *testing.T) {
	// 1.5 units at rate 0.25 cost 0.375 (worked by hand): quantities with
	// 1 place, rates with 2 places, cost with 3.
	n := net([]int64{15, -15}, [][5]int64{{0, 1, 0, inf, 25}})
	n.QtyPlaces, n.RatePlaces = 1, 2
	r, err := oracle.MinCost(n)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(r.Cost-0.375) > 1e-12 || math.Abs(r.CostScaled-375) > 1e-9 {
		t.Errorf("cost %v (scaled %v), want 0.375 (375)", r.Cost, r.CostScaled)
	}
	if !oracle.SameCost(flow.WideFrom(375), 3, r) || oracle.SameCost(flow.WideFrom(376), 3, r) {
		t.Errorf("SameCost wrong around 375 at 3 places")
	}
}

func TestSameCost(t *testing.T) {
	tests := []struct {
		exact  int64
		places int
		r      oracle.Result
		want   bool
	}{
		{100, 0, oracle.Result{Status: oracle.Optimal, Cost: 100}, true},
		{100, 0, oracle.Result{Status: oracle.Optimal, Cost: 100 + 1e-8}, true},
		{100, 0, oracle.Result{Status: oracle.Optimal, Cost: 100.001}, false},
		{100, 2, oracle.Result{Status: oracle.Optimal, Cost: 1}, true},
		{0, 2, oracle.Result{Status: oracle.Optimal, Cost: 1e-12}, true},
		{1, 0, oracle.Result{Status: oracle.Optimal, Cost: 0}, false},
		{100, 0, oracle.Result{Status: oracle.Infeasible, Cost: 100}, false},
		{-1e15, 0, oracle.Result{Status: oracle.Optimal, Cost: -1e15 * (1 + 1e-11)}, true},
		// A proved optimum is compared exactly: a float cost within the
		// tolerance does not help a different exact one.
		{1e15, 0, oracle.Result{Status: oracle.Optimal, Cost: 1e15, Exact: true, ExactCost: flow.WideFrom(1e15 + 1)}, false},
		{1e15 + 1, 0, oracle.Result{Status: oracle.Optimal, Cost: 1e15, Exact: true, ExactCost: flow.WideFrom(1e15 + 1)}, true},
	}
	for _, tc := range tests {
		if got := oracle.SameCost(flow.WideFrom(tc.exact), tc.places, tc.r); got != tc.want {
			t.Errorf("SameCost(%d, %d, %+v) = %v, want %v", tc.exact, tc.places, tc.r, got, tc.want)
		}
	}
}

func TestStatusString(t *testing.T) {
	for s, want := range map[oracle.Status]string{oracle.Optimal: "optimal", oracle.Infeasible: "infeasible", oracle.Unbounded: "unbounded", 7: "Status(7)"} {
		if s.String() != want {
			t.Errorf("%d: %q, want %q", int(s), s.String(), want)
		}
	}
}

// TestMinCostRandom compares the oracle with randnet's exact feasibility
// search: both must agree on feasibility, the oracle's plan must be
// feasible, and no feasible plan found may cost less than the optimum; the
// optimum proved exactly (Exact) must be consistent with the float one.
func TestMinCostRandom(t *testing.T) {
	rng := rand.New(rand.NewPCG(20240611, 1))
	count := map[oracle.Status]int{}
	exact := 0
	for i := range 400 {
		o := randnet.RandomOptions(rng)
		n := randnet.Network(rng, o)
		r, err := oracle.MinCost(n)
		if err != nil {
			t.Fatalf("case %d %+v: %v", i, o, err)
		}
		count[r.Status]++
		plan, ok := randnet.FeasiblePlan(rng, n)
		if ok != (r.Status != oracle.Infeasible) {
			t.Fatalf("case %d %+v: FeasiblePlan %v, oracle %v", i, o, ok, r.Status)
		}
		if r.Status != oracle.Optimal {
			continue
		}
		checkFlow(t, n, r)
		var c float64
		for a, x := range plan {
			c += float64(n.Rate[a]) * float64(x)
		}
		if c < r.CostScaled-1e-6*(1+math.Abs(c)) {
			t.Fatalf("case %d: plan cost %v below optimum %v", i, c, r.CostScaled)
		}
		// The exact optimum, when the oracle proves it: its plan rounds
		// r.Flow, it is feasible and improvable by no cycle, its cost is
		// the float cost up to rounding, and no feasible plan costs less.
		if !r.Exact {
			continue
		}
		exact++
		if oracle.Improvable(n, r.Plan) {
			t.Fatalf("case %d: exact plan improvable", i)
		}
		var pc, fc flow.Wide
		for a := range r.Plan {
			if float64(r.Plan[a]) != math.Round(r.Flow[a]) {
				t.Fatalf("case %d lane %d: plan %d, flow %v", i, a, r.Plan[a], r.Flow[a])
			}
			pc, _ = pc.Add(flow.MulWide(n.Rate[a], r.Plan[a]))
			fc, _ = fc.Add(flow.MulWide(n.Rate[a], plan[a]))
		}
		if pc.Cmp(r.ExactCost) != 0 || fc.Cmp(r.ExactCost) < 0 {
			t.Fatalf("case %d: exact cost %s, plan's %s, a feasible plan's %s", i, r.ExactCost.Format(0), pc.Format(0), fc.Format(0))
		}
		if e, _ := new(big.Float).SetInt(r.ExactCost.Big()).Float64(); math.Abs(e-r.CostScaled) > 1e-6*(1+math.Abs(e)) {
			t.Fatalf("case %d: exact cost %v, float cost %v", i, e, r.CostScaled)
		}
	}
	// Network-flow LPs have integral optimal vertices: rounding should
	// almost always give the proved optimum (common practice, no source).
	if exact*100 < count[oracle.Optimal]*95 {
		t.Errorf("only %d of %d optima proved exactly", exact, count[oracle.Optimal])
	}
	for _, s := range []oracle.Status{oracle.Optimal, oracle.Infeasible, oracle.Unbounded} {
		if count[s] == 0 {
			t.Errorf("no %v cases among random networks", s)
		}
	}
	t.Logf("statuses: %v; %d optima proved exactly", count, exact)
}
