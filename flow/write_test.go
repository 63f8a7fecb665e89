package flow_test

import (
	"bytes"
	"math/rand/v2"
	"testing"

	"lanecert/flow"
	"lanecert/internal/longrun"
	"lanecert/internal/randnet"
)

// TestWriteDIMACSRoundTrip writes random networks (decimal quantities and
// rates, lanes without capacity, minimums, parallel lanes, named nodes)
// with WriteDIMACS and reads them back with ReadDIMACS: every supply,
// lane, bound and rate must come back equal at the same scale. (Node
// names are written as comments only; the reader names nodes by number.)
func TestWriteDIMACSRoundTrip(t *testing.T) {
	rng := rand.New(rand.NewPCG(longrun.Seed(t, 11), 5))
	for i := range longrun.Cases(t, 200) {
		n := randnet.Network(rng, randnet.RandomOptions(rng))
		var buf bytes.Buffer
		if err := flow.WriteDIMACS(&buf, n); err != nil {
			t.Fatal(err)
		}
		back, err := flow.ReadDIMACS(bytes.NewReader(buf.Bytes()), "round.min")
		if err != nil {
			t.Fatalf("case %d: %v\n%s", i, err, buf.String())
		}
		// The reader keeps the places the file needs; compare values at
		// the original scale.
		qs := flow.Pow10(n.QtyPlaces - back.QtyPlaces)
		rs := flow.Pow10(n.RatePlaces - back.RatePlaces)
		if back.QtyPlaces > n.QtyPlaces || back.RatePlaces > n.RatePlaces {
			t.Fatalf("case %d: places %d/%d, wrote %d/%d", i, back.QtyPlaces, back.RatePlaces, n.QtyPlaces, n.RatePlaces)
		}
		qty := func(x int64) int64 {
			if x == flow.NoLimit {
				return x
			}
			return x * qs
		}
		if len(back.Nodes) != len(n.Nodes) || len(back.Tail) != len(n.Tail) {
			t.Fatalf("case %d: %d nodes, %d lanes; wrote %d, %d", i, len(back.Nodes), len(back.Tail), len(n.Nodes), len(n.Tail))
		}
		for v := range n.Supply {
			if qty(back.Supply[v]) != n.Supply[v] {
				t.Fatalf("case %d: supply of node %d is %d, wrote %d", i, v+1, qty(back.Supply[v]), n.Supply[v])
			}
		}
		for a := range n.Tail {
			if back.Tail[a] != n.Tail[a] || back.Head[a] != n.Head[a] || qty(back.Lower[a]) != n.Lower[a] ||
				qty(back.Upper[a]) != n.Upper[a] || back.Rate[a]*rs != n.Rate[a] {
				t.Fatalf("case %d: lane %d reads %d->%d [%d, %d] rate %d; wrote %d->%d [%d, %d] rate %d", i, a+1,
					back.Tail[a], back.Head[a], qty(back.Lower[a]), qty(back.Upper[a]), back.Rate[a]*rs,
					n.Tail[a], n.Head[a], n.Lower[a], n.Upper[a], n.Rate[a])
			}
		}
	}
}
