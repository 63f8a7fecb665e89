package stats

import (
	"math"
	"testing"
)

// TestMedian checks the median of odd and even counts, worked by hand
// (definition above: the mean of the middle two for an even count, as
// is common practice), and NaN for no values.
func TestMedian(t *testing.T) {
	for _, c := range []struct {
		in   []float64
		want float64
	}{
		{[]float64{7}, 7},
		{[]float64{1, 5, 9}, 5},
		{[]float64{1, 2, 3, 10}, 2.5},
		{[]float64{10, 20, 40, 1000}, 30},
	} {
		if got := Median(c.in); got != c.want {
			t.Errorf("Median(%v) = %v, want %v", c.in, got, c.want)
		}
	}
	if !math.IsNaN(Median(nil)) {
		t.Error("Median of no values is not NaN")
	}
}
