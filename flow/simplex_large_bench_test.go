//go:build large

package flow_test

import (
	"testing"

	"lanecert/flow"
	"lanecert/internal/netgen"
)

// Sizes of 10^6 lanes (go test -tags large -bench SolveLarge).
var largeBenchCases = []*benchCase{
	{name: "transport_1e6", gen: func() *flow.Network { return netgen.Transport(1011, 1000, 1000, 0, 1000) }},
	{name: "transport_sparse_1e6", gen: func() *flow.Network { return netgen.Transport(1012, 50000, 50000, 1000000, 1000) }},
	{name: "general_1e6", gen: func() *flow.Network { return netgen.General(1013, 100000, 1000000, 5000, 5000, 0.3, 100) }},
	// Capacities as in ../shared/peers/gen.py's transport family (capToMin).
	{name: "transport_capped_1e6", gen: func() *flow.Network { return capToMin(netgen.Transport(1014, 1000, 1000, 0, 1000)) }},
}

func BenchmarkSolveLarge(b *testing.B) { benchSolve(b, largeBenchCases) }
