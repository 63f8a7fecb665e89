package dual_test

import (
	"errors"
	"math/big"
	"math/rand/v2"
	"os"
	"path/filepath"
	"testing"

	"lanecert/dual"
	"lanecert/flow"
	"lanecert/internal/certcheck"
	"lanecert/internal/longrun"
	"lanecert/internal/oracle"
	"lanecert/internal/randnet"
)

// verify checks every certificate of a with the independent checker.
func verify(t *testing.T, n *flow.Network, x []int64, a *dual.Audit) {
	t.Helper()
	switch a.Verdict {
	case dual.Optimal:
		if err := certcheck.Optimal(n, x, a.Potential, a.Cost.Big(), a.Dual.Big()); err != nil {
			t.Fatalf("optimality certificate rejected: %v", err)
		}
		if len(a.Broken) != 0 || len(a.BrokenHolds) != 0 {
			t.Fatalf("optimal audit lists broken lanes %v, holds %v", a.Broken, a.BrokenHolds)
		}
	case dual.NotOptimal:
		if len(a.Cycles) == 0 {
			t.Fatal("not-optimal audit without a cycle")
		}
		if len(a.Broken)+len(a.BrokenHolds) == 0 {
			t.Fatal("not-optimal audit flags no lane")
		}
		for i, c := range a.Cycles {
			steps := make([]certcheck.Step, len(c.Steps))
			for k, s := range c.Steps {
				steps[k] = certcheck.Step{Lane: s.Lane, Origin: s.Origin, Forward: s.Forward}
			}
			if c.Unbounded() {
				for _, s := range c.Steps {
					if s.Lane < 0 || !s.Forward || n.Upper[s.Lane] != flow.NoLimit {
						t.Fatalf("cycle %d claims no limit but step %+v is bounded", i, s)
					}
				}
				// Check the walk and the saving with a large finite amount.
				if err := certcheck.Cycle(n, x, steps, 1, c.SavingPerUnit, nil); err != nil && !errors.Is(err, certcheck.ErrThetaNotMax) {
					t.Fatalf("unbounded cycle %d rejected: %v", i, err)
				}
				continue
			}
			if err := certcheck.Cycle(n, x, steps, c.Units, c.SavingPerUnit, c.Total.Big()); err != nil {
				t.Fatalf("cycle %d rejected: %v", i, err)
			}
		}
	case dual.PlanInfeasible:
		if certcheck.Feasible(n, x) == nil {
			t.Fatal("plan-infeasible verdict for a plan the checker finds feasible")
		}
		if len(a.Feasibility.Violations) == 0 {
			t.Fatal("plan-infeasible verdict without violations")
		}
	}
}

func readRef(t *testing.T, name, plan string) (*flow.Network, []int64) {
	t.Helper()
	dir := filepath.Join("..", "testdata", "reference")
	fh, err := os.Open(filepath.Join(dir, name+".min"))
	if err != nil {
		t.Fatal(err)
	}
	defer fh.Close()
	n, err := flow.ReadDIMACS(fh, name+".min")
	if err != nil {
		t.Fatal(err)
	}
	ph, err := os.Open(filepath.Join(dir, plan))
	if err != nil {
		t.Fatal(err)
	}
	defer ph.Close()
	rp, err := flow.ReadDIMACSPlan(ph, plan, n)
	if err != nil {
		t.Fatal(err)
	}
	p, err := rp.Bind(n, nil)
	if err != nil {
		t.Fatal(err)
	}
	return n, p.Flow
}

// TestPublished audits published optimal plans. Sources are those of
// testdata/reference/README (copied from the shared reference set); each
// optimum is the published one.
func TestPublished(t *testing.T) {
	cases := []struct {
		name, plan string
		cost       int64
		source     string
	}{
		{"dantzig_trnsport", "dantzig_trnsport.flow", 153675, "Dantzig, Linear Programming and Extensions (1963) ch. 3-3"},
		{"dantzig_trnsport", "dantzig_trnsport.alt.flow", 153675, "Dantzig 1963 ch. 3-3, second (degenerate) optimal plan"},
		{"glpk_sample", "glpk_sample.flow", 213, "GLPK 5.0 Graph and Network Routines sec. 2.1.5"},
		{"dimacs_lpsolve_example", "dimacs_lpsolve_example.flow", 14, "lp_solve 5.5 reference guide, DIMACS minimum cost flow problems"},
		{"winston_powerco", "winston_powerco.flow", 1020, "Winston, Operations Research, Powerco example (edition from memory)"},
		{"lpsolve_asn5", "lpsolve_asn5.flow", 118, "lp_solve 5.5 reference guide, DIMACS assignment problems"},
		{"scipy_lsa_doc3", "scipy_lsa_doc3.flow", 5, "SciPy 1.10 linear_sum_assignment documentation"},
		{"nx_simple_digraph", "nx_simple_digraph.flow", 24, "NetworkX 2.8 test_mincost.py::test_simple_digraph"},
		{"nx_transshipment", "nx_transshipment.flow", 41, "NetworkX 2.8 test_mincost.py::test_transshipment"},
		{"lemon_mcf_case1", "lemon_mcf_case1.computed.flow", 5240, "LEMON 1.3 test/min_cost_flow_test.cc case -1"},
		{"lemon_mcf_case2", "lemon_mcf_case2.computed.flow", 7620, "LEMON 1.3 test/min_cost_flow_test.cc case -2"},
		{"ampl_net1", "ampl_net1.flow", 18190, "Fourer, Gay, Kernighan, AMPL 2nd ed. ch. 15 net1 (costs x10)"},
	}
	for _, c := range cases {
		t.Run(c.plan, func(t *testing.T) {
			n, x := readRef(t, c.name, c.plan)
			a, err := dual.Check(n, x)
			if err != nil {
				t.Fatal(err)
			}
			if a.Verdict != dual.Optimal {
				t.Fatalf("%s: verdict %v, want optimal (%s)", c.plan, a.Verdict, c.source)
			}
			if got, _ := a.Cost.Int64(); got != c.cost {
				t.Errorf("cost %d, want %d (%s)", got, c.cost, c.source)
			}
			if a.Dual.Cmp(a.Cost) != 0 {
				t.Errorf("dual %s != cost %s", a.Dual.Big(), a.Cost.Big())
			}
			verify(t, n, x, a)
		})
	}
}

// TestPublishedPotentials compares potentials where the source publishes
// them and the optimum's potentials are unique up to the normalisation.
func TestPublishedPotentials(t *testing.T) {
	// GLPK 5.0 Graph and Network Routines sec. 2.1.5 prints pi 1:-12 2:-12
	// 3:-14 4:-12 5:-12 6:-17 7:-20 8:-14 9:-23 with reduced cost
	// c - (pi_i - pi_j); ours is c + p_i - p_j, so p = -pi, shifted so the
	// origin (node 1) has 0.
	glpkPi := []int64{-12, -12, -14, -12, -12, -17, -20, -14, -23}
	n, x := readRef(t, "glpk_sample", "glpk_sample.flow")
	a, err := dual.Check(n, x)
	if err != nil {
		t.Fatal(err)
	}
	for v, pi := range glpkPi {
		if want := -pi - 12; a.Potential[v] != want {
			t.Errorf("glpk_sample node %d: potential %d, want %d", v+1, a.Potential[v], want)
		}
	}
	// Dantzig 1963 ch. 3-3 (also GAMS TRNSPORT): market values 225, 153,
	// 126 per thousand cases (here in dollars, x1000 scale of the file) with
	// plant values 0.
	n, x = readRef(t, "dantzig_trnsport", "dantzig_trnsport.flow")
	if a, err = dual.Check(n, x); err != nil {
		t.Fatal(err)
	}
	for v, want := range map[int]int64{0: 0, 1: 0, 2: 225, 3: 153, 4: 126} {
		if a.Potential[v] != want {
			t.Errorf("dantzig node %d: potential %d, want %d", v+1, a.Potential[v], want)
		}
	}
	// Published reduced costs 36 (Seattle-Topeka, arc 3) and 9 (San
	// Diego-Chicago, arc 5).
	if a.Reduced[2] != 36 || a.Reduced[4] != 9 {
		t.Errorf("dantzig reduced costs %d, %d; want 36, 9", a.Reduced[2], a.Reduced[4])
	}
	// Winston, Powerco: u = (0, 3, 3), v = (6, 6, 10, 2) in the c - u - v
	// convention (edition from memory); ours: p(plant) = k - u, p(city) = k + v.
	n, x = readRef(t, "winston_powerco", "winston_powerco.flow")
	if a, err = dual.Check(n, x); err != nil {
		t.Fatal(err)
	}
	u, vv := []int64{0, 3, 3}, []int64{6, 6, 10, 2}
	k := a.Potential[0] + u[0]
	for i, ui := range u {
		if a.Potential[i] != k-ui {
			t.Errorf("powerco plant %d: potential %d, want %d", i+1, a.Potential[i], k-ui)
		}
	}
	for j, vj := range vv {
		if a.Potential[3+j] != k+vj {
			t.Errorf("powerco city %d: potential %d, want %d", j+1, a.Potential[3+j], k+vj)
		}
	}
}

// TestRandomAgainstOracle audits random plans on random small networks and
// compares the verdict with gonum's LP simplex (internal/oracle): a feasible
// plan is optimal exactly when its cost equals the LP optimum. Every
// certificate must pass the independent checker.
func TestRandomAgainstOracle(t *testing.T) {
	cases := longrun.Cases(t, 1500)
	rng := rand.New(rand.NewPCG(longrun.Seed(t, 2026), 12))
	var optimal, notOptimal, infeasible int
	for i := 0; i < cases; i++ {
		n := randnet.Random(rng)
		x, ok := randnet.FeasiblePlan(rng, n)
		if !ok {
			continue
		}
		if rng.IntN(4) == 0 {
			x = randnet.PerturbedPlan(rng, n, x)
		}
		a, err := dual.Check(n, x)
		if err != nil {
			t.Fatalf("case %d: %v", i, err)
		}
		verify(t, n, x, a)
		if a.Verdict == dual.PlanInfeasible {
			infeasible++
			continue
		}
		res, err := oracle.MinCost(n)
		if err != nil {
			t.Fatalf("case %d: oracle: %v", i, err)
		}
		switch a.Verdict {
		case dual.Optimal:
			optimal++
			if res.Status != oracle.Optimal || !oracle.SameCost(a.Cost, n.QtyPlaces+n.RatePlaces, res) {
				t.Fatalf("case %d: audit says optimal at %s, oracle %v at %v", i, n.FormatCost(a.Cost), res.Status, res.Cost)
			}
		case dual.NotOptimal:
			notOptimal++
			if res.Status == oracle.Optimal && oracle.SameCost(a.Cost, n.QtyPlaces+n.RatePlaces, res) {
				t.Fatalf("case %d: audit says not optimal but the plan's cost %s is the oracle's optimum", i, n.FormatCost(a.Cost))
			}
		}
	}
	t.Logf("%d optimal, %d not optimal, %d infeasible plans", optimal, notOptimal, infeasible)
	if optimal < 50 || notOptimal < 300 || infeasible < 20 {
		t.Errorf("the generator no longer covers every verdict: %d optimal, %d not optimal, %d infeasible", optimal, notOptimal, infeasible)
	}
}

// TestDegenerate covers plans whose lanes in use do not fix the potentials:
// a forest of several pieces, no lane in use at all, and a cycle of lanes in
// use. Expected values are worked by hand from the literals.
func TestDegenerate(t *testing.T) {
	// Two origins a, b and two destinations c, d; every lane capacity 10.
	net := func(rates ...int64) *flow.Network {
		return &flow.Network{
			Nodes:  []string{"a", "b", "c", "d"},
			Supply: []int64{10, 10, -10, -10},
			Tail:   []flow.NodeID{0, 0, 1, 1},
			Head:   []flow.NodeID{2, 3, 2, 3},
			Lower:  []int64{0, 0, 0, 0},
			Upper:  []int64{10, 10, 10, 10},
			Rate:   rates,
		}
	}
	cases := []struct {
		name    string
		rates   []int64
		x       []int64
		verdict dual.Verdict
		saving  int64 // best cycle's saving per unit
	}{
		// a->c, b->d at capacity: every lane at a bound, 4 pieces. Optimal
		// when 1+4 <= 2+3 i.e. always with these rates (5 <= 5: tie).
		{"all at bounds, tie", []int64{1, 2, 3, 4}, []int64{10, 0, 0, 10}, dual.Optimal, 0},
		// Same plan, a->d cheaper: moving 10 units a->d, b->c saves
		// (1+4)-(0+3) = 2 per unit.
		{"all at bounds, improvable", []int64{1, 0, 3, 4}, []int64{10, 0, 0, 10}, dual.NotOptimal, 2},
		// Split plan: a cycle of lanes in use, costs 1+4 vs 2+3: equal.
		{"cycle in use, tie", []int64{1, 2, 3, 4}, []int64{5, 5, 5, 5}, dual.Optimal, 0},
		// Cycle in use with unequal costs: 1+4 vs 2+5 saves 2 per unit.
		{"cycle in use, improvable", []int64{1, 2, 5, 4}, []int64{5, 5, 5, 5}, dual.NotOptimal, 2},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			n := net(c.rates...)
			a, err := dual.Check(n, c.x)
			if err != nil {
				t.Fatal(err)
			}
			if a.Verdict != c.verdict {
				t.Fatalf("verdict %v, want %v", a.Verdict, c.verdict)
			}
			verify(t, n, c.x, a)
			if c.verdict == dual.NotOptimal && a.Cycles[0].SavingPerUnit != c.saving {
				t.Errorf("best saving %d, want %d", a.Cycles[0].SavingPerUnit, c.saving)
			}
		})
	}
}

// TestUnboundedCycle: a negative cycle of lanes without capacity.
func TestUnboundedCycle(t *testing.T) {
	n := &flow.Network{
		Nodes:  []string{"a", "b"},
		Supply: []int64{0, 0},
		Tail:   []flow.NodeID{0, 1},
		Head:   []flow.NodeID{1, 0},
		Lower:  []int64{0, 0},
		Upper:  []int64{flow.NoLimit, flow.NoLimit},
		Rate:   []int64{-3, 1},
	}
	a, err := dual.Check(n, []int64{0, 0})
	if err != nil {
		t.Fatal(err)
	}
	if a.Verdict != dual.NotOptimal || !a.Cycles[0].Unbounded() || a.Cycles[0].SavingPerUnit != 2 {
		t.Fatalf("got %v with cycles %+v; want an unbounded cycle saving 2 per unit", a.Verdict, a.Cycles)
	}
	verify(t, n, []int64{0, 0}, a)
}

// TestOverflow: rates near the int64 limit make the potentials overflow;
// the audit must say so, not wrap.
func TestOverflow(t *testing.T) {
	const big = int64(1) << 62
	n := &flow.Network{
		Nodes:  []string{"a", "b", "c"},
		Supply: []int64{1, 0, -1},
		Tail:   []flow.NodeID{0, 1},
		Head:   []flow.NodeID{1, 2},
		Lower:  []int64{0, 0},
		Upper:  []int64{2, 2},
		Rate:   []int64{big, big},
	}
	_, err := dual.Check(n, []int64{1, 1})
	if !errors.Is(err, flow.ErrOverflow) {
		t.Fatalf("err = %v, want ErrOverflow", err)
	}
}

func TestCostIsExact(t *testing.T) {
	n := &flow.Network{
		Nodes: []string{"a", "b"}, Supply: []int64{0, 0},
		Tail: []flow.NodeID{0, 0}, Head: []flow.NodeID{1, 1},
		Lower: []int64{0, 0}, Upper: []int64{flow.NoLimit, flow.NoLimit},
		Rate: []int64{1 << 62, 1 << 62},
	}
	c, err := dual.Cost(n, []int64{1 << 62, 1 << 62})
	if err != nil {
		t.Fatal(err)
	}
	want := new(big.Int).Lsh(big.NewInt(1), 125) // 2 * 2^62 * 2^62
	if c.Big().Cmp(want) != 0 {
		t.Fatalf("cost %s, want %s", c.Big(), want)
	}
}
