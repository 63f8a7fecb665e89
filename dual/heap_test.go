package dual

import (
	"cmp"
	"math/rand/v2"
	"slices"
	"testing"

	"lanecert/internal/longrun"
)

// TestPieceHeapOrder pushes, heaps and pops random items, with many equal
// distances and repeated pieces, and checks that the pops come in the
// order of a sort by (distance, piece): the searches' results depend on
// that order only, not on the heap's shape.
func TestPieceHeapOrder(t *testing.T) {
	rng := rand.New(rand.NewPCG(longrun.Seed(t, 47), 13))
	byKey := func(a, b pieceItem) int {
		if c := cmp.Compare(a.d, b.d); c != 0 {
			return c
		}
		return cmp.Compare(a.piece, b.piece)
	}
	for i := range longrun.Cases(t, 500) {
		n := rng.IntN(200)
		spread := int64(1 + rng.IntN(20))
		items := make([]pieceItem, n)
		for j := range items {
			items[j] = pieceItem{rng.Int64N(spread) - spread/2, int32(rng.IntN(30))}
		}
		var h pieceHeap
		if i%2 == 0 {
			for _, it := range items {
				h.push(it)
			}
		} else {
			h = append(h, items...)
			h.init()
		}
		// Pops interleaved with pushes of items larger than the last
		// pop, as a search makes them.
		want := slices.Clone(items)
		var got []pieceItem
		for len(h) > 0 {
			it := h.pop()
			got = append(got, it)
			if rng.IntN(4) == 0 {
				more := pieceItem{it.d + 1 + rng.Int64N(spread), int32(rng.IntN(30))}
				h.push(more)
				want = append(want, more)
			}
		}
		slices.SortFunc(want, byKey)
		if !slices.Equal(got, want) {
			t.Fatalf("case %d: popped %v, want %v", i, got, want)
		}
	}
}
