package dual_test

import (
	"fmt"
	"math/rand/v2"
	"reflect"
	"testing"

	"lanecert/dual"
	"lanecert/flow"
	"lanecert/internal/longrun"
	"lanecert/internal/oracle"
	"lanecert/internal/randnet"
)

// planCost is Σ rate·y under rates.
func planCost(rates, y []int64) flow.Wide {
	var c flow.Wide
	for e, q := range y {
		c, _ = c.AddProduct(rates[e], q)
	}
	return c
}

// stillOptimal reports whether plan y is optimal for n with lane e's rate
// set to rate: exactly, by the residual network's negative cycles
// (oracle.Improvable), not through the LP's float tolerance (a rate one
// unit past a limit on a large plan changes the optimum by less than that
// tolerance sees).
func stillOptimal(t *testing.T, n *flow.Network, y []int64, e int, rate int64) bool {
	t.Helper()
	c := *n
	c.Rate = append([]int64(nil), n.Rate...)
	c.Rate[e] = rate
	return !oracle.Improvable(&c, y)
}

// TestRangesAgainstOracle moves each rate to its reported limit (the plan
// must stay optimal) and one rate unit beyond it (it must not), re-solving
// with the independent LP oracle; lanes without a limit are moved far; the
// capacity value and node prices are checked by changing one unit. Half
// of the networks have negative rates.
func TestRangesAgainstOracle(t *testing.T) {
	rng := rand.New(rand.NewPCG(longrun.Seed(t, 11), 4))
	const far = 1 << 20
	checkedLimits, degenerate := 0, 0
	for i := range longrun.Cases(t, 400) {
		o := randnet.RandomOptions(rng)
		o.NegativeRates = i%2 == 0
		o.Infeasible = false
		if o.Lanes > 14 {
			o.Lanes = 14
		}
		n := randnet.Network(rng, o)
		opt, err := dual.Optimize(n, nil, nil)
		if err != nil {
			t.Fatal(err)
		}
		if opt.Status != flow.Optimal {
			continue
		}
		a, err := dual.Check(n, opt.Flow)
		if err != nil {
			t.Fatal(err)
		}
		if a.Pieces > 1 {
			degenerate++
		}
		s, err := dual.Ranges(n, opt.Flow, a.Potential)
		if err != nil {
			t.Fatalf("case %d: %v", i, err)
		}
		y := opt.Flow
		for e, lr := range s.Lanes {
			if lr.HasLower {
				checkedLimits++
				if !stillOptimal(t, n, y, e, lr.Lower) {
					t.Fatalf("case %d lane %d: not optimal at its lower limit %d (rate %d)", i, e, lr.Lower, n.Rate[e])
				}
				if stillOptimal(t, n, y, e, lr.Lower-1) {
					t.Fatalf("case %d lane %d: still optimal below its lower limit %d", i, e, lr.Lower)
				}
			} else if !stillOptimal(t, n, y, e, n.Rate[e]-far) {
				t.Fatalf("case %d lane %d: no lower limit reported, but a far lower rate breaks the plan", i, e)
			}
			if lr.HasUpper {
				checkedLimits++
				if !stillOptimal(t, n, y, e, lr.Upper) {
					t.Fatalf("case %d lane %d: not optimal at its upper limit %d (rate %d)", i, e, lr.Upper, n.Rate[e])
				}
				if stillOptimal(t, n, y, e, lr.Upper+1) {
					t.Fatalf("case %d lane %d: still optimal above its upper limit %d", i, e, lr.Upper)
				}
			} else if !stillOptimal(t, n, y, e, n.Rate[e]+far) {
				t.Fatalf("case %d lane %d: no upper limit reported, but a far higher rate breaks the plan", i, e)
			}
			if y[e] == n.Upper[e] && n.Lower[e] < n.Upper[e] {
				// One more unit of capacity saves exactly CapacityValue.
				c := *n
				c.Upper = append([]int64(nil), n.Upper...)
				c.Upper[e]++
				res, err := oracle.MinCost(&c)
				if err != nil || res.Status != oracle.Optimal {
					t.Fatalf("oracle: %v %v", res.Status, err)
				}
				want, _ := opt.Cost.Sub(flow.WideFrom(lr.CapacityValue))
				if !oracle.SameCost(want, n.QtyPlaces+n.RatePlaces, res) {
					t.Fatalf("case %d lane %d: capacity value %d, but one more unit gives %v from %s", i, e, lr.CapacityValue, res.CostScaled, n.FormatCost(opt.Cost))
				}
			}
		}
		checkRoutes(t, i, n, y, a.Potential, s, nil)
		checkNodePrices(t, i, n, opt.Cost, a.Potential, s)
	}
	t.Logf("%d limits checked; %d degenerate optima", checkedLimits, degenerate)
	if degenerate < 30 {
		t.Errorf("only %d degenerate optima: the test no longer covers them", degenerate)
	}
}

// checkNodePrices changes one node's demand by one unit (and its anchor's
// supply alike, when supply does not exceed demand) and compares the
// optimum's change with the reported prices.
func checkNodePrices(t *testing.T, i int, n *flow.Network, cost flow.Wide, p []int64, s *dual.Sensitivity) {
	t.Helper()
	var supply, demand int64
	for _, b := range n.Supply {
		if b > 0 {
			supply += b
		} else {
			demand -= b
		}
	}
	excess := supply > demand
	comp := components(n)
	for v := range n.Nodes {
		// The origin of least potential (then lowest number) in v's weakly
		// connected piece; without one, no price is defined.
		anchor := -1
		for u := range n.Nodes {
			if comp[u] == comp[v] && n.Supply[u] > 0 && (anchor < 0 || p[u] < p[anchor]) {
				anchor = u
			}
		}
		if anchor < 0 {
			if s.Nodes[v].HasUp || s.Nodes[v].HasDown {
				t.Fatalf("case %d node %d: a price without an origin in its piece", i, v)
			}
			continue
		}
		if excess {
			anchor = -1 // the kept supply serves the extra unit
		}
		for _, dir := range []int64{1, -1} {
			c := *n
			c.Supply = append([]int64(nil), n.Supply...)
			c.Supply[v] -= dir // one more (less) unit demanded at v
			if anchor >= 0 {
				c.Supply[anchor] += dir
			}
			res, err := oracle.MinCost(&c)
			if err != nil {
				t.Fatal(err)
			}
			np := s.Nodes[v]
			has, price := np.HasUp, np.Up
			if dir < 0 {
				has, price = np.HasDown, -np.Down
			}
			if !has {
				if res.Status == oracle.Optimal {
					t.Fatalf("case %d node %d dir %d: reported impossible, oracle finds %v", i, v, dir, res.CostScaled)
				}
				continue
			}
			want, _ := cost.Add(flow.WideFrom(price))
			if res.Status != oracle.Optimal || !oracle.SameCost(want, n.QtyPlaces+n.RatePlaces, res) {
				t.Fatalf("case %d node %d dir %d: price %d predicts %s, oracle %v %v", i, v, dir, price, n.FormatCost(want), res.Status, res.CostScaled)
			}
		}
	}
}

// components numbers the weakly connected pieces of n (union-find).
func components(n *flow.Network) []int {
	parent := make([]int, len(n.Nodes))
	for v := range parent {
		parent[v] = v
	}
	var find func(int) int
	find = func(v int) int {
		for parent[v] != v {
			v = parent[v]
		}
		return v
	}
	for e := range n.Tail {
		a, b := find(int(n.Tail[e])), find(int(n.Head[e]))
		parent[a] = b
	}
	out := make([]int, len(n.Nodes))
	for v := range out {
		out[v] = find(v)
	}
	return out
}

// checkRoutes: each lane's competing route is a residual path between its
// ends, avoids the lane, and costs what its limit says (the break-even rate
// or lower limit is minus the cost of the route back; the upper limit of a
// lane at capacity is the cost of the route forward).
// Only the lanes for which only returns true are checked (nil: all).
func checkRoutes(t *testing.T, i int, n *flow.Network, y, p []int64, s *dual.Sensitivity, only func(e int) bool) {
	t.Helper()
	for e := range n.Tail {
		if n.Lower[e] == n.Upper[e] || (only != nil && !only(e)) {
			continue
		}
		lr := s.Lanes[e]
		atCap := y[e] == n.Upper[e]
		steps, err := dual.Route(n, y, p, flow.LaneID(e), !atCap)
		if err != nil {
			t.Fatal(err)
		}
		has, limit := lr.HasLower, lr.Lower
		from, to := n.Head[e], n.Tail[e]
		if atCap {
			has, limit = lr.HasUpper, lr.Upper
			from, to = to, from
		}
		if (steps != nil || from == to) != has {
			t.Fatalf("case %d lane %d: route %v but limit reported %v", i, e, steps, has)
		}
		if !has {
			continue
		}
		var cost int64
		at := from
		for _, st := range steps {
			if st.Lane == flow.LaneID(e) {
				t.Fatalf("case %d lane %d: route uses the lane itself", i, e)
			}
			if st.Lane < 0 {
				at = -1 // passes the hold node; ends are checked by cost only
				continue
			}
			tl, hd := n.Tail[st.Lane], n.Head[st.Lane]
			if !st.Forward {
				tl, hd = hd, tl
			}
			if at >= 0 && tl != at {
				t.Fatalf("case %d lane %d: route breaks at step %+v", i, e, st)
			}
			at = hd
			if st.Forward {
				cost += n.Rate[st.Lane]
				if y[st.Lane] >= n.Upper[st.Lane] {
					t.Fatalf("case %d lane %d: route step %+v has no room", i, e, st)
				}
			} else {
				cost -= n.Rate[st.Lane]
				if y[st.Lane] <= n.Lower[st.Lane] {
					t.Fatalf("case %d lane %d: route step %+v has no room", i, e, st)
				}
			}
		}
		if at >= 0 && at != to {
			t.Fatalf("case %d lane %d: route ends at %d, want %d", i, e, at, to)
		}
		want := -limit
		if atCap {
			want = limit
		}
		if cost != want {
			t.Fatalf("case %d lane %d: route costs %d, the limit implies %d (steps %+v)", i, e, cost, want, steps)
		}
	}
}

// TestRangesPublished checks break-even rates and capacity values against
// reduced costs published with two optimal solutions whose potentials are
// unique (one piece of lanes in use): an unused lane's break-even rate is
// its rate minus its reduced cost, and one more unit of a full lane's
// capacity is worth minus its reduced cost.
func TestRangesPublished(t *testing.T) {
	cases := []struct {
		name, plan string
		lane       int   // 0-based arc number in the .min file
		reduced    int64 // published, converted to rate + p(from) - p(to)
		full       bool
		source     string
	}{
		// Dantzig, Linear Programming and Extensions (1963) ch. 3-3 (also
		// GAMS TRNSPORT): reduced costs 36 (Seattle-Topeka) and 9 (San
		// Diego-Chicago), in the file's dollar scale.
		{"dantzig_trnsport", "dantzig_trnsport.flow", 2, 36, false, "Dantzig 1963 ch. 3-3"},
		{"dantzig_trnsport", "dantzig_trnsport.flow", 4, 9, false, "Dantzig 1963 ch. 3-3"},
		// GLPK 5.0 Graph and Network Routines sec. 2.1.5: reduced costs
		// c - (pi_i - pi_j), the same number in our convention: 2->4 3
		// (unused), 5->2 1 (unused), 5->7 -1 and 6->7 -3 (at capacity).
		{"glpk_sample", "glpk_sample.flow", 3, 3, false, "GLPK 5.0 graphs sec. 2.1.5"},
		{"glpk_sample", "glpk_sample.flow", 7, 1, false, "GLPK 5.0 graphs sec. 2.1.5"},
		{"glpk_sample", "glpk_sample.flow", 9, -1, true, "GLPK 5.0 graphs sec. 2.1.5"},
		{"glpk_sample", "glpk_sample.flow", 10, -3, true, "GLPK 5.0 graphs sec. 2.1.5"},
	}
	for _, c := range cases {
		n, x := readRef(t, c.name, c.plan)
		a, err := dual.Check(n, x)
		if err != nil {
			t.Fatal(err)
		}
		s, err := dual.Ranges(n, x, a.Potential)
		if err != nil {
			t.Fatal(err)
		}
		lr := s.Lanes[c.lane]
		if c.full {
			if lr.CapacityValue != -c.reduced {
				t.Errorf("%s lane %d: capacity worth %d, want %d (%s)", c.name, c.lane+1, lr.CapacityValue, -c.reduced, c.source)
			}
			continue
		}
		if !lr.HasLower || lr.Lower != n.Rate[c.lane]-c.reduced || lr.ByRoute {
			t.Errorf("%s lane %d: break-even %d (route %v), want %d (%s)", c.name, c.lane+1, lr.Lower, lr.ByRoute, n.Rate[c.lane]-c.reduced, c.source)
		}
	}
}

// TestRangesManyPieces checks networks of 20 to 60 nodes whose optima fall
// into many pieces of lanes in use, so that the limits of unused lanes come
// from searches over many source pieces (with distances through a hub
// piece) and those of lanes in use from routes around cuts of pieces with
// many neighbouring pieces. Every limit must equal the cost of the route
// that dual.Route finds edge by edge (itself checked against the LP oracle
// in TestRangesAgainstOracle), and on a few networks the node prices are
// checked against the oracle directly.
func TestRangesManyPieces(t *testing.T) {
	rng := rand.New(rand.NewPCG(longrun.Seed(t, 23), 5))
	manyPieces := 0
	for i := range longrun.Cases(t, 60) {
		o := randnet.RandomOptions(rng)
		o.NegativeRates = false
		o.Infeasible = false
		o.Nodes = 20 + rng.IntN(41)
		o.Lanes = 2*o.Nodes + rng.IntN(4*o.Nodes)
		n := randnet.Network(rng, o)
		opt, a := optimalAudit(t, n)
		if a == nil {
			continue
		}
		if a.Pieces >= 10 {
			manyPieces++
		}
		s, err := dual.Ranges(n, opt.Flow, a.Potential)
		if err != nil {
			t.Fatalf("case %d: %v", i, err)
		}
		checkRoutes(t, i, n, opt.Flow, a.Potential, s, nil)
		// The hubs only bound the searches: no hub, one, or up to eight
		// of any size must give the same limits and prices (the lanes
		// named by lower_by and upper_by may differ where routes tie;
		// TestRangesHubsAgree checks those).
		for _, hubs := range []int{0, 1, 8} {
			h, err := dual.RangesHubsForTest(n, opt.Flow, a.Potential, hubs)
			if err != nil {
				t.Fatalf("case %d, up to %d hubs: %v", i, hubs, err)
			}
			if e := differentLimits(s, h); e != "" {
				t.Fatalf("case %d: ranges with up to %d hubs differ: %s", i, hubs, e)
			}
			if !balanced(n) {
				continue // byLaneOK does not follow the hold node
			}
			for e, lr := range h.Lanes {
				if by := lr.LowerBy; by >= 0 && by != s.Lanes[e].LowerBy && !byLaneOK(n, opt.Flow, a.Potential, e, int(by), true) {
					t.Fatalf("case %d, lane %d, up to %d hubs: lower_by %d is on no cheapest route", i, e, hubs, by)
				}
				if by := lr.UpperBy; by >= 0 && by != s.Lanes[e].UpperBy && !byLaneOK(n, opt.Flow, a.Potential, e, int(by), false) {
					t.Fatalf("case %d, lane %d, up to %d hubs: upper_by %d is on no cheapest route", i, e, hubs, by)
				}
			}
		}
	}
	if manyPieces < 20 {
		t.Errorf("only %d optima with 10 or more pieces: the test no longer covers them", manyPieces)
	}
}

// bigPieceNetwork returns a network whose optimum has one piece of chain
// nodes (a path of lanes in use at rate 0) and single-node pieces around
// it, enough of them that the piece's nodes times its neighbouring pieces
// exceed what Ranges keeps tables for (2^20): origin c0 sends one unit to
// each other chain node; every spare node has lanes from and to random
// chain nodes and to other spare nodes, all with positive rates, and
// chain shortcuts and back lanes give routes inside the piece.
func bigPieceNetwork(rng *rand.Rand, chain, spare int) *flow.Network {
	nn := chain + spare
	n := &flow.Network{Nodes: make([]string, nn), Supply: make([]int64, nn)}
	for v := range n.Nodes {
		n.Nodes[v] = fmt.Sprintf("n%d", v)
	}
	n.Supply[0] = int64(chain - 1)
	for v := 1; v < chain; v++ {
		n.Supply[v] = -1
	}
	lane := func(t, h int, rate int64) {
		n.Tail = append(n.Tail, flow.NodeID(t))
		n.Head = append(n.Head, flow.NodeID(h))
		n.Lower = append(n.Lower, 0)
		n.Upper = append(n.Upper, flow.NoLimit)
		n.Rate = append(n.Rate, rate)
	}
	for v := 0; v+1 < chain; v++ {
		lane(v, v+1, 0)
	}
	for x := chain; x < nn; x++ {
		lane(rng.IntN(chain), x, 1+rng.Int64N(50))
		lane(x, rng.IntN(chain), 1+rng.Int64N(50))
		lane(x, chain+rng.IntN(spare), 1+rng.Int64N(20))
	}
	for j := 0; j < chain/10; j++ {
		lane(rng.IntN(chain), rng.IntN(chain), 1+rng.Int64N(200))
	}
	return n
}

// TestRangesBigPiece covers pieces too large for side tables: the limits
// of the chain lanes (all in use) must equal the cost of the route
// dual.Route finds edge by edge.
func TestRangesBigPiece(t *testing.T) {
	rng := rand.New(rand.NewPCG(31, 7))
	for i := 0; i < 2; i++ {
		const chain, spare = 1100, 1000 // 1100 · (1000 + 1000) > 2^20
		n := bigPieceNetwork(rng, chain, spare)
		if err := n.Validate(); err != nil {
			t.Fatal(err)
		}
		opt, err := dual.Optimize(n, nil, nil)
		if err != nil || opt.Status != flow.Optimal {
			t.Fatalf("case %d: %v %v", i, opt.Status, err)
		}
		a, err := dual.Check(n, opt.Flow)
		if err != nil {
			t.Fatal(err)
		}
		if a.Pieces < spare {
			t.Fatalf("case %d: %d pieces, want the spare nodes apart", i, a.Pieces)
		}
		s, err := dual.Ranges(n, opt.Flow, a.Potential)
		if err != nil {
			t.Fatal(err)
		}
		byRoute := 0
		for e := 0; e+1 < chain; e++ {
			if s.Lanes[e].ByRoute {
				byRoute++
			}
		}
		if byRoute < chain/2 {
			t.Errorf("case %d: only %d chain lanes limited by routes", i, byRoute)
		}
		checkRoutes(t, i, n, opt.Flow, a.Potential, s, func(e int) bool { return e+1 < chain })
	}
}

// TestRangesHubsAgree compares, on networks of 40 to 200 nodes with many
// lanes at capacity and many equal rates (so that optima are degenerate
// and fall into many pieces), the ranges found with no hub (every search
// runs until it settles its targets) against those with one hub and with
// up to eight hubs of any size: the hubs only bound the searches, so every
// limit, capacity value and node price must agree. The lanes named as
// starting or stopping to be used may differ where routes tie.
func TestRangesHubsAgree(t *testing.T) {
	rng := rand.New(rand.NewPCG(longrun.Seed(t, 41), 9))
	withHub := 0
	for i := range longrun.Cases(t, 80) {
		n := tieHeavyNetwork(rng, 40, 161, false) // no hold node: byLaneOK walks lanes only
		opt, a := optimalAudit(t, n)
		if a == nil {
			continue
		}
		if a.Pieces >= 16 {
			withHub++
		}
		base, err := dual.RangesHubsForTest(n, opt.Flow, a.Potential, 0)
		if err != nil {
			t.Fatalf("case %d: %v", i, err)
		}
		for _, hubs := range []int{1, 8} {
			s, err := dual.RangesHubsForTest(n, opt.Flow, a.Potential, hubs)
			if err != nil {
				t.Fatalf("case %d, %d hubs: %v", i, hubs, err)
			}
			if e := differentLimits(base, s); e != "" {
				t.Fatalf("case %d: with no hub and with up to %d hubs: %s", i, hubs, e)
			}
			checked := 0
			for e := range base.Lanes {
				x, y := base.Lanes[e], s.Lanes[e]
				for _, by := range []struct {
					lane, other flow.LaneID
					more        bool
				}{{y.LowerBy, x.LowerBy, true}, {y.UpperBy, x.UpperBy, false}} {
					if by.lane >= 0 && (checked < 40 || by.lane != by.other) {
						checked++
						if !byLaneOK(n, opt.Flow, a.Potential, e, int(by.lane), by.more) {
							t.Fatalf("case %d, lane %d, up to %d hubs: lane %d is on no cheapest route (more %v)", i, e, hubs, by.lane, by.more)
						}
					}
				}
			}
		}
	}
	if withHub < 20 {
		t.Errorf("only %d optima with 16 or more pieces: the test no longer covers the hubs", withHub)
	}
}

// byLaneOK reports whether lane f lies, in a direction it has room for, on
// a cheapest route of the residual network of optimal plan y that avoids
// lane e and runs from e's head to its tail (more) or from its tail to its
// head: the lane a limit names as starting or stopping to be used. Costs
// are reduced costs under p (non-negative on every residual arc at an
// optimum); plain Dijkstra over nodes, written apart from package dual.
func byLaneOK(n *flow.Network, y, p []int64, e, f int, more bool) bool {
	from, to := int(n.Head[e]), int(n.Tail[e])
	if !more {
		from, to = to, from
	}
	type arc struct {
		a, b int
		w    int64
	}
	var arcs []arc
	var fArcs []arc
	for l := range n.Tail {
		if l == e {
			continue
		}
		t, h := int(n.Tail[l]), int(n.Head[l])
		rc := n.Rate[l] + p[t] - p[h]
		if y[l] < n.Upper[l] {
			arcs = append(arcs, arc{t, h, rc})
			if l == f {
				fArcs = append(fArcs, arc{t, h, rc})
			}
		}
		if y[l] > n.Lower[l] {
			arcs = append(arcs, arc{h, t, -rc})
			if l == f {
				fArcs = append(fArcs, arc{h, t, -rc})
			}
		}
	}
	out := make([][]arc, len(n.Nodes)) // by the end a search leaves from
	in := make([][]arc, len(n.Nodes))
	for _, x := range arcs {
		out[x.a] = append(out[x.a], x)
		in[x.b] = append(in[x.b], arc{x.b, x.a, x.w})
	}
	dist := func(src int, reverse bool) []int64 {
		adj := out
		if reverse {
			adj = in
		}
		d := make([]int64, len(n.Nodes))
		done := make([]bool, len(n.Nodes))
		for v := range d {
			d[v] = -1
		}
		d[src] = 0
		for {
			u := -1
			for v := range d {
				if !done[v] && d[v] >= 0 && (u < 0 || d[v] < d[u]) {
					u = v
				}
			}
			if u < 0 {
				return d
			}
			done[u] = true
			for _, x := range adj[u] {
				if d[x.b] < 0 || d[u]+x.w < d[x.b] {
					d[x.b] = d[u] + x.w
				}
			}
		}
	}
	dFrom, dTo := dist(from, false), dist(to, true)
	if dFrom[to] < 0 {
		return false
	}
	for _, x := range fArcs {
		if dFrom[x.a] >= 0 && dTo[x.b] >= 0 && dFrom[x.a]+x.w+dTo[x.b] == dFrom[to] {
			return true
		}
	}
	return false
}

// differentLimits describes the first difference between two sensitivity
// results other than the lanes named by LowerBy and UpperBy ("" when none).
func differentLimits(a, b *dual.Sensitivity) string {
	if len(a.Lanes) != len(b.Lanes) || !reflect.DeepEqual(a.Nodes, b.Nodes) {
		return "node prices differ"
	}
	for e := range a.Lanes {
		x, y := a.Lanes[e], b.Lanes[e]
		x.LowerBy, x.UpperBy, y.LowerBy, y.UpperBy = 0, 0, 0, 0
		if x != y {
			return fmt.Sprintf("lane %d: %+v against %+v", e, x, y)
		}
	}
	return ""
}

// balanced reports whether n's supply equals its demand (no hold node).
func balanced(n *flow.Network) bool {
	var sum int64
	for _, b := range n.Supply {
		sum += b
	}
	return sum == 0
}

// optimalAudit solves n and audits its optimal plan (nil audit when n has
// no optimum).
func optimalAudit(t *testing.T, n *flow.Network) (*dual.Optimum, *dual.Audit) {
	t.Helper()
	opt, err := dual.Optimize(n, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	if opt.Status != flow.Optimal {
		return opt, nil
	}
	a, err := dual.Check(n, opt.Flow)
	if err != nil {
		t.Fatal(err)
	}
	return opt, a
}

// TestAvoidDistAgrees checks the distances of a split piece's hub (the
// searches from and to it that avoid the piece) taken from one kept search
// and a search over the piece's subtree in it, against a search over all
// pieces with the piece left out, for every piece, on random networks
// whose optima have many pieces and many equal routes (rates of 0-3).
// The kept search is exact whatever tree of cheapest routes it keeps, so
// the distances must be equal, not close.
func TestAvoidDistAgrees(t *testing.T) {
	rng := rand.New(rand.NewPCG(longrun.Seed(t, 43), 11))
	compared, many := 0, 0
	for i := range longrun.Cases(t, 60) {
		n := tieHeavyNetwork(rng, 20, 121, true)
		opt, a := optimalAudit(t, n)
		if a == nil {
			continue
		}
		if a.Pieces >= 16 {
			many++
		}
		c, diff, err := dual.AvoidDistForTest(n, opt.Flow, a.Potential)
		if err != nil {
			t.Fatalf("case %d: %v", i, err)
		}
		if diff != "" {
			t.Fatalf("case %d: %s", i, diff)
		}
		compared += c
	}
	if compared < 1000 || many < 10 {
		t.Fatalf("only %d comparisons, %d networks with 16 pieces or more", compared, many)
	}
	t.Logf("%d searches compared, %d networks with 16 pieces or more", compared, many)
}

// tieHeavyNetwork returns a random feasible network without negative
// rates whose optimum has many pieces and many equal routes: minNodes to
// minNodes+spread-1 nodes, two to six lanes per node, half to all of them
// capacitated, rates up to 3, 10 or 100; with spare supply at random when
// excess is set, never otherwise.
func tieHeavyNetwork(rng *rand.Rand, minNodes, spread int, excess bool) *flow.Network {
	o := randnet.RandomOptions(rng)
	o.NegativeRates = false
	o.Infeasible = false
	if !excess {
		o.ExcessSupply = false
	}
	o.Nodes = minNodes + rng.IntN(spread)
	o.Lanes = 2*o.Nodes + rng.IntN(4*o.Nodes)
	o.CapFrac = []float64{0.5, 0.9, 1}[rng.IntN(3)]
	o.MaxRate = []int64{3, 10, 100}[rng.IntN(3)]
	return randnet.Network(rng, o)
}
