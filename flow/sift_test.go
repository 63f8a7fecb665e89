package flow

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// TestSiftScanChecks gives siftScan a valid plan on four lanes and then
// the same plan with one fault at a time: each fault must make it refuse
// (ok false), as warmStart's first pass and n.Validate would. The limits
// are those of the package's model (bounds 0 <= x <= upper, NoLimit is no
// capacity and never a flow, nodes in range, no rate of MinInt64).
func TestSiftScanChecks(t *testing.T) {
	type lanes struct {
		x, lower, upper []int64
		tail, head      []NodeID
		rate            []int64
	}
	base := func() lanes {
		return lanes{
			x:     []int64{5, 0, 0, 3},
			lower: []int64{0, 0, 0, 0},
			upper: []int64{5, NoLimit, 9, 4},
			tail:  []NodeID{0, 0, 1, 1},
			head:  []NodeID{1, 2, 2, 2},
			rate:  []int64{4, -7, 2, 1},
		}
	}
	scan := func(l lanes) ([]int32, uint64, []int64, []cheapTwo, bool) {
		state := make([]int8, len(l.x))
		netout := make([]int64, 3)
		best := make([]cheapTwo, 3)
		for v := range best {
			best[v] = cheapTwo{math.MaxInt64, math.MaxInt64, -1, -1}
		}
		used, maxRate, ok := siftScan(l.x, l.lower, l.upper, l.tail, l.head, l.rate, state, netout, best)
		return used, maxRate, netout, best, ok
	}

	used, maxRate, netout, best, ok := scan(base())
	if !ok {
		t.Fatal("valid plan refused")
	}
	// Worked by hand: lanes 0 and 3 carry flow; node 0 sends 5, node 1
	// receives 5 and sends 3, node 2 receives 3; the lanes at zero flow
	// are 1 (0->2, rate -7) and 2 (1->2, rate 2).
	if !slices.Equal(used, []int32{0, 3}) || maxRate != 7 || !slices.Equal(netout, []int64{5, -2, -3}) {
		t.Fatalf("used %v, max rate %d, balances %v", used, maxRate, netout)
	}
	if best[0].a1 != 1 || best[1].a1 != 2 || best[2].a1 != 1 || best[2].a2 != 2 {
		t.Fatalf("cheapest lanes %+v", best)
	}

	faults := []struct {
		name string
		set  func(*lanes)
	}{
		{"minimum", func(l *lanes) { l.lower[2] = 1 }},
		{"negative minimum", func(l *lanes) { l.lower[1] = -1 }},
		{"negative capacity", func(l *lanes) { l.upper[2] = -1 }},
		{"negative flow", func(l *lanes) { l.x[2] = -1 }},
		{"flow above capacity", func(l *lanes) { l.x[3] = 5 }},
		// (Alone on its nodes, so that the balances do not overflow.)
		{"flow NoLimit", func(l *lanes) { l.x = []int64{0, NoLimit, 0, 0} }},
		{"most negative flow", func(l *lanes) { l.x[1] = math.MinInt64 }},
		{"flow NoLimit on a full lane", func(l *lanes) { l.upper[1], l.x[1] = NoLimit, NoLimit }},
		{"tail out of range", func(l *lanes) { l.tail[2] = 3 }},
		{"negative tail", func(l *lanes) { l.tail[2] = -1 }},
		{"head out of range", func(l *lanes) { l.head[0] = 3 }},
		{"negative head", func(l *lanes) { l.head[3] = math.MinInt32 }},
		{"rate MinInt64", func(l *lanes) { l.rate[2] = math.MinInt64 }},
	}
	for _, f := range faults {
		l := base()
		f.set(&l)
		if _, _, _, _, ok := scan(l); ok {
			t.Errorf("%s: accepted", f.name)
		}
	}
}

// TestSiftKeepPrice checks siftKeep.price against what it answers for,
// from a plain pass over the lanes: every lane at stateLower whose reduced
// cost r + p(t) - p(h) is negative, in index order. Each of 400 random
// sets of lanes and potentials is priced 8 times in a row; between
// pricings the potentials move by a spread drawn around the band tau
// (below it, at it, just past it, far past it: one node moves by the whole
// spread, one not at all) and lanes join the restricted network (marked
// stateTree) as sift marks them: the wrong ones and a few others. The
// pricings that read only the kept lanes, those of every lane, and those
// whose band held more than |E|/4 lanes (then none is kept) must all
// occur (bounds of this project's own, so that each path stays
// exercised: 1,147, 1,947 and 106 of them when it was written).
func TestSiftKeepPrice(t *testing.T) {
	rng := rand.New(rand.NewPCG(20261203, 1))
	plain := func(state []int8, rate []int64, tail, head []NodeID, pot []int64) []int32 {
		var v []int32
		for a := range state {
			if state[a] == stateLower && rate[a]+pot[tail[a]]-pot[head[a]] < 0 {
				v = append(v, int32(a))
			}
		}
		return v
	}
	partials, fulls, overfull := 0, 0, 0
	for trial := range 400 {
		nv := 2 + rng.IntN(12)
		m := 1 + rng.IntN(300)
		maxRate := 1 + rng.Int64N(60)
		tail, head := make([]NodeID, m), make([]NodeID, m)
		rate, state := make([]int64, m), make([]int8, m)
		for a := range m {
			tail[a], head[a] = NodeID(rng.IntN(nv)), NodeID(rng.IntN(nv))
			rate[a] = rng.Int64N(2*maxRate+1) - maxRate
			state[a] = stateLower
			if rng.IntN(5) == 0 {
				state[a] = stateTree
			}
		}
		pot := make([]int64, nv)
		for v := range pot {
			pot[v] = rng.Int64N(2*maxRate+1) - maxRate
		}
		tau := 1 + rng.Int64N(maxRate)
		var k siftKeep
		for step := range 8 {
			got, partial := k.price(state, rate, tail, head, pot, tau, nil)
			if want := plain(state, rate, tail, head, pot); !slices.Equal(got, want) {
				t.Fatalf("trial %d, pricing %d (kept only: %v): %v, want %v", trial, step, partial, got, want)
			}
			switch {
			case partial:
				partials++
			case k.ok:
				fulls++
			default:
				overfull++
			}
			var spread int64
			switch rng.IntN(4) {
			case 0:
				spread = rng.Int64N(tau)
			case 1:
				spread = tau
			case 2:
				spread = tau + 1
			default:
				spread = tau + 1 + rng.Int64N(3*maxRate)
			}
			lo, hi := rng.IntN(nv), rng.IntN(nv-1)
			if hi >= lo {
				hi++
			}
			for v := range pot {
				switch v {
				case lo:
				case hi:
					pot[v] += spread
				default:
					pot[v] += rng.Int64N(spread + 1)
				}
			}
			for _, a := range got {
				state[a] = stateTree
			}
			for range rng.IntN(3) {
				state[rng.IntN(m)] = stateTree
			}
		}
	}
	t.Logf("pricings: %d of kept lanes only, %d of every lane keeping the band, %d with too many in it", partials, fulls, overfull)
	if partials < 500 || fulls < 500 || overfull < 50 {
		t.Errorf("pricings: %d of kept lanes only, %d of every lane keeping the band, %d with too many in it; want each path taken", partials, fulls, overfull)
	}
}
