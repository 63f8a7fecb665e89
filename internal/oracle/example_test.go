package oracle_test

import (
	"fmt"

	"lanecert/flow"
	"lanecert/internal/oracle"
)

// The example network of the lp_solve 5.5 reference guide, "DIMACS minimum
// cost flow problems": 4 units from node 1 to node 4, optimum 14.
func ExampleMinCost() {
	n := &flow.Network{
		Nodes:  []string{"1", "2", "3", "4"},
		Supply: []int64{4, 0, 0, -4},
		Tail:   []flow.NodeID{0, 0, 1, 1, 2},
		Head:   []flow.NodeID{1, 2, 2, 3, 3},
		Lower:  []int64{0, 0, 0, 0, 0},
		Upper:  []int64{4, 2, 2, 3, 5},
		Rate:   []int64{2, 2, 1, 3, 1},
	}
	r, err := oracle.MinCost(n)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("%v %.0f %v\n", r.Status, r.Cost, oracle.SameCost(flow.WideFrom(14), 0, r))
	// Output: optimal 14 true
}
