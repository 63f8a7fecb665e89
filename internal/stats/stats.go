// Package stats holds the summaries that the solver's benchmarks and the
// side-by-side measuring command share.
package stats

import "math"

// Median returns the median of sorted, which must be in ascending order:
// its middle value, or the mean of the middle two for an even length
// (common practice); NaN for an empty slice. O(1).
func Median(sorted []float64) float64 {
	n := len(sorted)
	if n == 0 {
		return math.NaN()
	}
	if n%2 == 1 {
		return sorted[n/2]
	}
	return (sorted[n/2-1] + sorted[n/2]) / 2
}
