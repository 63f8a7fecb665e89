//go:build large

package dual_test

// With -tags large the benchmarks add a complete 1000 x 1000
// transportation network (10^6 lanes).
func init() {
	benchCases = append(benchCases, &benchCase{name: "trans_1e6", m: 1000, n: 1000})
}
