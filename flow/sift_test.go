package flow

import (
	"math"
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
