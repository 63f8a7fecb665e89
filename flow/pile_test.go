package flow

import (
	"math"
	"testing"
)

// TestIsPile checks the rule for a pile of refusals at its edges (the
// thresholds are ours, measured in BENCHMARKS.md; see pileRefusals):
// enough refusals, and all but at most one in a hundred through the
// search's root part.
func TestIsPile(t *testing.T) {
	for _, c := range []struct {
		nref, rootRef int
		want          bool
	}{
		{0, 0, false},
		{511, 511, false},     // too few
		{512, 512, true},      // the least pile
		{512, 507, true},      // 5 = 512/100 off the root
		{512, 506, false},     // 6 off the root
		{1003, 1003, true},    // netgen_s2006, perturbation seed 20
		{1420, 1410, true},    // 10 of 1,420 off the root (14 allowed)
		{1420, 1405, false},   // 15 off the root
		{6748, 6744, true},    // the eighth session's pile
		{2698, 2295, false},   // sparse transportation: 85 % through the root
		{49421, 46000, false}, // 93 %
		{math.MaxInt, math.MaxInt - math.MaxInt/100, true}, // the largest count does not wrap
		{math.MaxInt, math.MaxInt - math.MaxInt/100 - 1, false},
	} {
		if got := isPile(c.nref, c.rootRef); got != c.want {
			t.Errorf("isPile(%d, %d) = %v, want %v", c.nref, c.rootRef, got, c.want)
		}
	}
}
