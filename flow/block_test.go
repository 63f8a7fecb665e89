package flow

import "testing"

// TestBlockSize checks the block of the pivot rule against values worked
// out by hand from its rule, g·sqrt(na) with g = sqrt(40·nn/m) kept within
// [1, 2] and at least 10 arcs (the rule is our own, measured; see
// BENCHMARKS.md).
func TestBlockSize(t *testing.T) {
	for _, c := range []struct {
		name      string
		na, m, nn int
		want      int
	}{
		// g = sqrt(40·10000/100000) = 2: 2·sqrt(100000) = 632.46.
		{"sparse", 100000, 100000, 10000, 632},
		// g = sqrt(40·632/99856) = 0.50, raised to 1: sqrt(100488) = 316.998
		// (317² = 100489).
		{"dense", 100488, 99856, 632, 316},
		// g = sqrt(40·2500/100000) = 1 exactly: sqrt(100000) = 316.2.
		{"40 per node", 100000, 100000, 2500, 316},
		// g = sqrt(40·30/90) = 3.65, lowered to 2: 2·sqrt(100) = 20.
		{"very sparse", 100, 90, 30, 20},
		// No lanes: g = 1; sqrt(4) = 2, raised to the minimum 10.
		{"no lanes", 4, 0, 4, 10},
	} {
		if got := blockSize(c.na, c.m, c.nn); got != c.want {
			t.Errorf("%s: blockSize(%d, %d, %d) = %d, want %d", c.name, c.na, c.m, c.nn, got, c.want)
		}
	}
}
