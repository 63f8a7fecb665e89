package netgen

import (
	"reflect"
	"testing"

	"lanecert/flow"
	"lanecert/internal/certcheck"
)

func TestGenerators(t *testing.T) {
	cases := []struct {
		name string
		gen  func() *flow.Network
	}{
		{"transport complete", func() *flow.Network { return Transport(1, 30, 40, 0, 1000) }},
		{"transport sparse", func() *flow.Network { return Transport(2, 300, 200, 3000, 1000) }},
		{"general", func() *flow.Network { return General(3, 2000, 12000, 100, 100, 0.3, 100) }},
		{"general capacitated", func() *flow.Network { return General(4, 500, 4000, 20, 30, 1, 1000) }},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			n := c.gen()
			if err := n.Validate(); err != nil {
				t.Fatal(err)
			}
			if !reflect.DeepEqual(n, c.gen()) {
				t.Fatal("not deterministic")
			}
			var total int64
			for _, b := range n.Supply {
				total += b
			}
			if total != 0 {
				t.Fatalf("supplies sum to %d, want 0", total)
			}
			sol, err := flow.Solve(n, flow.SolveOptions{})
			if err != nil {
				t.Fatal(err)
			}
			if sol.Status != flow.Optimal {
				t.Fatalf("status %v", sol.Status)
			}
			y := Perturb(9, n, sol.Flow, sol.InTree, 10)
			if err := certcheck.Feasible(n, y); err != nil {
				t.Fatalf("perturbed plan: %v", err)
			}
			moved := 0
			var cost flow.Wide
			for a := range y {
				if y[a] != sol.Flow[a] {
					moved++
				}
				cost, _ = cost.AddProduct(n.Rate[a], y[a])
			}
			if moved == 0 || cost.Cmp(sol.Cost) < 0 {
				t.Fatalf("perturbed plan moves %d lanes, cost %s vs optimum %s", moved, cost.Format(0), sol.Cost.Format(0))
			}
			w, err := flow.Solve(n, flow.SolveOptions{Start: y})
			if err != nil || !w.WarmStarted || w.Cost.Cmp(sol.Cost) != 0 {
				t.Fatalf("repair: %v warm %v cost %s, want %s", err, w.WarmStarted, w.Cost.Format(0), sol.Cost.Format(0))
			}
			t.Logf("%d lanes: cold %d pivots, repair %d pivots", len(n.Tail), sol.Pivots, w.Pivots)
		})
	}
}
