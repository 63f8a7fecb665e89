package randnet

import (
	"fmt"
	"math/rand/v2"
	"reflect"
	"testing"

	"lanecert/flow"
)

// feasible is this test's own plan checker (int64; the values are small):
// bounds, then balances with the excess-supply rule of package flow.
func feasible(n *flow.Network, x []int64) error {
	if len(x) != len(n.Tail) {
		return fmt.Errorf("%d flows for %d lanes", len(x), len(n.Tail))
	}
	for a, f := range x {
		if f < n.Lower[a] || f > n.Upper[a] {
			return fmt.Errorf("lane %d: flow %d outside [%d, %d]", a, f, n.Lower[a], n.Upper[a])
		}
	}
	out := make([]int64, len(n.Nodes))
	for a, f := range x {
		out[n.Tail[a]] += f
		out[n.Head[a]] -= f
	}
	var s, d int64
	for _, b := range n.Supply {
		if b > 0 {
			s += b
		} else {
			d -= b
		}
	}
	if d > s {
		return fmt.Errorf("demand %d above supply %d", d, s)
	}
	for v, o := range out {
		b := n.Supply[v]
		if s > d && b > 0 {
			if o < 0 || o > b {
				return fmt.Errorf("origin %d: net outflow %d outside [0, %d]", v, o, b)
			}
		} else if o != b {
			return fmt.Errorf("node %d: net outflow %d, supply %d", v, o, b)
		}
	}
	return nil
}

// TestNetworkFeatures draws many networks and checks that each is valid,
// matches its kind, is feasible when Infeasible is off (FeasiblePlan finds
// a plan that this test's checker accepts), and that the sample as a whole
// has every feature property tests rely on.
func TestNetworkFeatures(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 1))
	seen := map[string]int{}
	for i := range 2000 {
		o := RandomOptions(rng)
		n := Network(rng, o)
		if err := n.Validate(); err != nil {
			t.Fatalf("case %d %+v: %v", i, o, err)
		}
		if len(n.Nodes) < 2 || len(n.Nodes) > 12 || len(n.Tail) != o.Lanes {
			t.Fatalf("case %d: %d nodes, %d lanes for %+v", i, len(n.Nodes), len(n.Tail), o)
		}
		if n.QtyPlaces != o.QtyPlaces || n.RatePlaces != o.RatePlaces {
			t.Fatalf("case %d: places %d/%d for %+v", i, n.QtyPlaces, n.RatePlaces, o)
		}
		checkKind(t, n, o)
		x, ok := FeasiblePlan(rng, n)
		if !ok && !o.Infeasible {
			t.Fatalf("case %d %+v: no plan for a network feasible by construction", i, o)
		}
		if ok {
			if err := feasible(n, x); err != nil {
				t.Fatalf("case %d %+v: FeasiblePlan: %v", i, o, err)
			}
			seen["feasible"]++
			used := 0
			for a, f := range x {
				if f > n.Lower[a] {
					used++
				}
			}
			if used < len(n.Nodes)-1 {
				seen["degenerate plan"]++
			}
			y := PerturbedPlan(rng, n, x)
			if len(y) != len(x) {
				t.Fatalf("case %d: perturbed plan has %d flows for %d", i, len(y), len(x))
			}
			if reflect.DeepEqual(x, y) {
				t.Fatalf("case %d: perturbed plan equals the plan", i)
			}
			if feasible(n, y) != nil {
				seen["perturbed infeasible"]++
			} else {
				seen["perturbed feasible"]++
			}
		} else {
			seen["infeasible"]++
		}
		s, d, _ := n.Totals()
		if s > d {
			seen["excess supply"]++
		}
		rates := map[int64]int{}
		for a := range n.Tail {
			rates[n.Rate[a]]++
			switch {
			case n.Rate[a] == 0:
				seen["zero rate"]++
			case n.Rate[a] < 0:
				seen["negative rate"]++
			}
			if n.Rate[a]%flow.Pow10(n.RatePlaces) != 0 {
				seen["fractional rate"]++
			}
			if n.Lower[a] > 0 {
				seen["lower bound"]++
			}
			if n.Upper[a] == flow.NoLimit {
				seen["no limit"]++
			} else if n.Upper[a] == n.Lower[a] {
				seen["fixed lane"]++
			}
			if n.Tail[a] == n.Head[a] {
				seen["self-loop"]++
			}
			for b := range a {
				if n.Tail[a] == n.Tail[b] && n.Head[a] == n.Head[b] {
					seen["parallel"]++
					break
				}
			}
		}
		for r, k := range rates {
			if k > 1 && r != 0 {
				seen["tied nonzero rates"]++
				break
			}
		}
	}
	for _, f := range []string{"feasible", "infeasible", "degenerate plan", "perturbed feasible", "perturbed infeasible",
		"excess supply", "zero rate", "negative rate", "fractional rate", "lower bound", "no limit", "fixed lane",
		"self-loop", "parallel", "tied nonzero rates"} {
		if seen[f] == 0 {
			t.Errorf("no network or plan with feature %q", f)
		}
	}
	t.Logf("features: %v", seen)
}

// checkKind checks the shape promised for o.Kind.
func checkKind(t *testing.T, n *flow.Network, o Options) {
	t.Helper()
	in := make([]bool, len(n.Nodes))
	out := make([]bool, len(n.Nodes))
	for a := range n.Tail {
		out[n.Tail[a]] = true
		in[n.Head[a]] = true
	}
	switch {
	case o.Kind == Transport || o.Kind == Transship && len(n.Nodes) < 3:
		for v := range n.Nodes {
			if in[v] && out[v] {
				t.Fatalf("transport network: node %d has lanes in and out", v)
			}
		}
	case o.Kind == Transship:
		// Acyclic: repeatedly remove nodes without entering lanes.
		indeg := make([]int, len(n.Nodes))
		for a := range n.Tail {
			indeg[n.Head[a]]++
		}
		adj := flow.BuildAdjacency(n)
		var queue []flow.NodeID
		for v, d := range indeg {
			if d == 0 {
				queue = append(queue, flow.NodeID(v))
			}
		}
		done := 0
		for len(queue) > 0 {
			v := queue[0]
			queue = queue[1:]
			done++
			for _, a := range adj.OutLanes[adj.OutStart[v]:adj.OutStart[v+1]] {
				if indeg[n.Head[a]]--; indeg[n.Head[a]] == 0 {
					queue = append(queue, n.Head[a])
				}
			}
		}
		if done != len(n.Nodes) {
			t.Fatalf("transship network has a cycle")
		}
	}
}

func TestDeterministic(t *testing.T) {
	draw := func() (*flow.Network, []int64, []int64) {
		rng := rand.New(rand.NewPCG(42, 1))
		n := Random(rng)
		x, _ := FeasiblePlan(rng, n)
		return n, x, PerturbedPlan(rng, n, x)
	}
	n1, x1, y1 := draw()
	n2, x2, y2 := draw()
	if !reflect.DeepEqual(n1, n2) || !reflect.DeepEqual(x1, x2) || !reflect.DeepEqual(y1, y2) {
		t.Errorf("same seed, different output")
	}
}

// Hand-made networks: FeasiblePlan must find a plan exactly when one
// exists (worked by hand).
func TestFeasiblePlanSmall(t *testing.T) {
	mk := func(supply []int64, lanes [][5]int64) *flow.Network {
		n := &flow.Network{Supply: supply, Nodes: make([]string, len(supply))}
		for _, l := range lanes {
			n.Tail = append(n.Tail, flow.NodeID(l[0]))
			n.Head = append(n.Head, flow.NodeID(l[1]))
			n.Lower = append(n.Lower, l[2])
			n.Upper = append(n.Upper, l[3])
			n.Rate = append(n.Rate, l[4])
		}
		return n
	}
	inf := flow.NoLimit
	tests := []struct {
		name string
		n    *flow.Network
		ok   bool
	}{
		{"direct", mk([]int64{3, -3}, [][5]int64{{0, 1, 0, inf, 1}}), true},
		{"capacity short", mk([]int64{3, -3}, [][5]int64{{0, 1, 0, 2, 1}}), false},
		{"two routes", mk([]int64{3, -3}, [][5]int64{{0, 1, 0, 2, 1}, {0, 1, 0, 1, 1}}), true},
		{"wrong direction", mk([]int64{3, -3}, [][5]int64{{1, 0, 0, inf, 1}}), false},
		{"demand above supply", mk([]int64{3, -4}, [][5]int64{{0, 1, 0, inf, 1}}), false},
		{"minimum needs return lane", mk([]int64{0, 0}, [][5]int64{{0, 1, 2, inf, 1}, {1, 0, 0, inf, 1}}), true},
		{"minimum without return", mk([]int64{0, 0}, [][5]int64{{0, 1, 2, inf, 1}}), false},
		{"minimum above demand, excess absorbs", mk([]int64{5, -2, 0}, [][5]int64{{0, 1, 0, inf, 1}, {0, 2, 1, 1, 1}, {2, 1, 0, inf, 1}}), true},
		{"excess kept", mk([]int64{5, -2}, [][5]int64{{0, 1, 0, inf, 1}}), true},
		{"route through an origin", mk([]int64{5, 1, -4}, [][5]int64{{0, 1, 0, inf, 1}, {1, 2, 0, inf, 1}}), true},
		{"undo a minimum with a reverse route", mk([]int64{2, 0, -2}, [][5]int64{{0, 1, 0, 2, 1}, {1, 2, 0, 2, 1}, {1, 0, 1, 1, 1}, {0, 1, 0, 1, 1}}), true},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			for seed := range uint64(20) {
				rng := rand.New(rand.NewPCG(seed, 1))
				x, ok := FeasiblePlan(rng, tc.n)
				if ok != tc.ok {
					t.Fatalf("seed %d: ok %v, want %v", seed, ok, tc.ok)
				}
				if ok {
					if err := feasible(tc.n, x); err != nil {
						t.Fatalf("seed %d: %v", seed, err)
					}
				}
			}
		})
	}
}

func TestKindString(t *testing.T) {
	for k, want := range map[Kind]string{Transport: "transport", Transship: "transship", General: "general", 9: "Kind(9)"} {
		if k.String() != want {
			t.Errorf("%d: %q, want %q", int(k), k.String(), want)
		}
	}
}

func TestSqueeze(t *testing.T) {
	rng := rand.New(rand.NewPCG(4, 4))
	cut := 0
	for i := 0; i < 50; i++ {
		n := Network(rng, RandomOptions(rng))
		before := append([]int64(nil), n.Upper...)
		Squeeze(rng, n)
		for e, u := range n.Upper {
			was := before[e]
			if u == was {
				continue
			}
			cut++
			want := was / 4
			if was == flow.NoLimit {
				want = 10
			}
			if u != max(want, n.Lower[e]) {
				t.Fatalf("lane %d: capacity %d -> %d (minimum %d)", e, was, u, n.Lower[e])
			}
		}
	}
	if cut == 0 {
		t.Fatal("no capacity was cut")
	}
}
