package certcheck_test

import (
	"fmt"
	"math/big"

	"lanecert/flow"
	"lanecert/internal/certcheck"
)

// One lane from an origin with 10 units to a destination needing 4, at
// rate 5: the origin keeps 6 (excess supply), so its potential must be 0,
// and the destination's potential is the rate. Worked by hand.
func ExampleOptimal() {
	n := &flow.Network{
		Nodes:  []string{"plant", "market"},
		Supply: []int64{10, -4},
		Tail:   []flow.NodeID{0},
		Head:   []flow.NodeID{1},
		Lower:  []int64{0},
		Upper:  []int64{flow.NoLimit},
		Rate:   []int64{5},
	}
	x := []int64{4}
	fmt.Println(certcheck.Optimal(n, x, []int64{0, 5}, big.NewInt(20), big.NewInt(20)))
	fmt.Println(certcheck.Optimal(n, x, []int64{1, 6}, nil, nil))
	// Output:
	// <nil>
	// certcheck: origin plant keeping 6 with potential 1: keeps part of its supply, needs potential 0: complementary slackness of a hold lane violated
}
