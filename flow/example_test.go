package flow_test

import (
	"errors"
	"fmt"
	"strings"

	"lanecert/flow"
)

// A lane table with three lanes and a node table. Rates 2.50, 1.25 and 4
// share the 2-place rate scale; quantities are whole. Hub is not in the
// node table, so it is a transshipment node numbered after the listed ones.
func ExampleReadCSVNetwork() {
	lanes := `lane,from,to,cost,min,max,mode
L1,Plant,Hub,2.50,0,40,truck
L2,Hub,Store,1.25,5,,rail
L3,Plant,Store,4,0,10,truck
`
	nodes := `node,supply
Plant,30
Store,-30
`
	n, plan, err := flow.ReadCSVNetwork(strings.NewReader(lanes), "lanes.csv", strings.NewReader(nodes), "nodes.csv", flow.TableOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println("flow column:", plan != nil)
	for v, name := range n.Nodes {
		fmt.Printf("node %s supply %s\n", name, n.FormatQty(n.Supply[v]))
	}
	for a := range n.Tail {
		fmt.Printf("lane %s %s -> %s rate %s min %s max %s (%s %s)\n", n.LaneName(flow.LaneID(a)),
			n.Nodes[n.Tail[a]], n.Nodes[n.Head[a]], n.FormatRate(n.Rate[a]),
			n.FormatQty(n.Lower[a]), n.FormatQty(n.Upper[a]), n.Extra.Names[0], n.Extra.Values[a][0])
	}
	// Output:
	// flow column: false
	// node Plant supply 30
	// node Store supply -30
	// node Hub supply 0
	// lane L1 Plant -> Hub rate 2.50 min 0 max 40 (mode truck)
	// lane L2 Hub -> Store rate 1.25 min 5 max no limit (mode rail)
	// lane L3 Plant -> Store rate 4.00 min 0 max 10 (mode truck)
}

// The example network of the lp_solve 5.5 reference guide, "DIMACS minimum
// cost flow problems" (testdata/reference/dimacs_lpsolve_example.min).
const lpSolveExample = `c lp_solve 5.5 reference guide, DIMACS minimum cost flow problems
p min 4 5
n 1 4
n 4 -4
a 1 2 0 4 2
a 1 3 0 2 2
a 2 3 0 2 1
a 2 4 0 3 3
a 3 4 0 5 1
`

func ExampleReadDIMACS() {
	n, err := flow.ReadDIMACS(strings.NewReader(lpSolveExample), "example.min")
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(n.NumNodes(), "nodes,", n.NumLanes(), "lanes, supply", n.Supply)
	for a := range n.Tail {
		fmt.Printf("lane %s: %s -> %s [%d, %d] rate %d\n", n.LaneName(flow.LaneID(a)),
			n.Nodes[n.Tail[a]], n.Nodes[n.Head[a]], n.Lower[a], n.Upper[a], n.Rate[a])
	}

	// Errors are positioned: line 2, column 9 is the capacity "-3".
	_, err = flow.ReadDIMACS(strings.NewReader("p min 2 1\na 1 2 0 -3 1\n"), "bad.min")
	fmt.Println(err, errors.Is(err, flow.ErrNegative))
	// Output:
	// 4 nodes, 5 lanes, supply [4 0 0 -4]
	// lane 1: 1 -> 2 [0, 4] rate 2
	// lane 2: 1 -> 3 [0, 2] rate 2
	// lane 3: 2 -> 3 [0, 2] rate 1
	// lane 4: 2 -> 4 [0, 3] rate 3
	// lane 5: 3 -> 4 [0, 5] rate 1
	// bad.min:2:9: CAP "-3": capacity must not be negative true
}

// The published optimal plan of the lp_solve example (cost 14) is
// feasible; moving one unit onto lane 4 (2 -> 4) without taking it off
// elsewhere unbalances nodes 2 and 4.
func ExampleCheckPlan() {
	n, err := flow.ReadDIMACS(strings.NewReader(lpSolveExample), "example.min")
	if err != nil {
		fmt.Println(err)
		return
	}
	raw, err := flow.ReadDIMACSPlan(strings.NewReader("s 14\nf 1 2 2\nf 1 3 2\nf 2 3 2\nf 2 4 0\nf 3 4 4\n"), "example.flow", n)
	if err != nil {
		fmt.Println(err)
		return
	}
	plan, err := raw.Bind(n, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	cost := flow.Wide{}
	for a, x := range plan.Flow {
		cost, _ = cost.AddProduct(n.Rate[a], x)
	}
	f, _ := flow.CheckPlan(n, plan.Flow)
	fmt.Println("feasible:", f.Feasible(), "cost:", n.FormatCost(cost))

	plan.Flow[3] = 1
	f, _ = flow.CheckPlan(n, plan.Flow)
	fmt.Println("feasible:", f.Feasible())
	for _, v := range f.Violations {
		fmt.Printf("%s node %s: outflow - inflow %d, want [%d, %d]\n", v.Kind, n.Nodes[v.Node], v.Actual, v.Min, v.Max)
	}
	// Output:
	// feasible: true cost: 14
	// feasible: false
	// unbalanced node 2: outflow - inflow 1, want [0, 0]
	// unbalanced node 4: outflow - inflow -5, want [-4, -4]
}

// Decimals are read exactly into a mantissa and a number of places;
// trailing zeros after the point are dropped.
func ExampleParseDecimal() {
	for _, s := range []string{"12.50", "-0.075", "1.5e3", "1,5", "NaN"} {
		d, err := flow.ParseDecimal(s)
		if err != nil {
			fmt.Printf("%s: %v\n", s, err)
			continue
		}
		fmt.Printf("%s: %d × 10^-%d = %s\n", s, d.Mant, d.Places, d)
	}
	// Output:
	// 12.50: 125 × 10^-1 = 12.5
	// -0.075: -75 × 10^-3 = -0.075
	// 1.5e3: 1500 × 10^-0 = 1500
	// 1,5: want a decimal number such as 12, -3.5 or 0.075
	// NaN: want a decimal number such as 12, -3.5 or 0.075
}

// A scaled integer is printed with exactly as many places as its scale.
func ExampleFormatScaled() {
	fmt.Println(flow.FormatScaled(12500, 3))
	fmt.Println(flow.FormatScaled(-5, 2))
	fmt.Println(flow.FormatScaled(7, 0))
	// Output:
	// 12.500
	// -0.05
	// 7
}
