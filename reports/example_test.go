package reports_test

import (
	"os"

	"lanecert/dual"
	"lanecert/flow"
	"lanecert/reports"
)

// Render an audit as the lane table in CSV.
func ExampleWrite() {
	n := &flow.Network{
		Nodes:  []string{"Plant", "Customer"},
		Supply: []int64{5, -5},
		Tail:   []flow.NodeID{0, 0},
		Head:   []flow.NodeID{1, 1},
		Lower:  []int64{0, 0},
		Upper:  []int64{flow.NoLimit, 3},
		Rate:   []int64{7, 4},
	}
	a, err := dual.Check(n, []int64{2, 3})
	if err != nil {
		panic(err)
	}
	doc, err := reports.Build(a, nil, reports.Inputs{Network: "example", Plan: "example"}, nil)
	if err != nil {
		panic(err)
	}
	if err := reports.Write(os.Stdout, doc, reports.CSV, reports.Options{}); err != nil {
		panic(err)
	}
	// Output:
	// lane,from,to,cost,flow,min,max,state,reduced_cost,slack_ok
	// 1,Plant,Customer,7,2,0,,in-use,0,yes
	// 2,Plant,Customer,4,3,0,3,at-capacity,-3,yes
}
