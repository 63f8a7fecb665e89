package dual_test

import (
	"fmt"
	"strings"

	"lanecert/dual"
	"lanecert/flow"
)

// A plant ships 30 units to a customer, either directly at 9 per unit or
// through a warehouse at 4 + 3. The plan sends everything direct; the audit
// finds the cheaper route and its saving.
func ExampleCheck() {
	lanes := `lane,from,to,cost,max,flow
direct,Plant,Customer,9,,30
inbound,Plant,Warehouse,4,20,0
outbound,Warehouse,Customer,3,,0
`
	nodes := "node,supply\nPlant,30\nCustomer,-30\n"
	n, raw, err := flow.ReadCSVNetwork(strings.NewReader(lanes), "lanes.csv", strings.NewReader(nodes), "nodes.csv", flow.TableOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	plan, err := raw.Bind(n, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	a, err := dual.Check(n, plan.Flow)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println("verdict:", a.Verdict)
	fmt.Println("plan cost:", n.FormatCost(a.Cost))
	c := a.Cycles[0]
	fmt.Printf("move %s units, saving %s per unit, %s in all:\n", n.FormatQty(c.Units), n.FormatRate(c.SavingPerUnit), n.FormatCost(c.Total))
	for _, s := range c.Steps {
		change := "less"
		if s.Forward {
			change = "more"
		}
		fmt.Printf("  %s on %s\n", change, n.LaneName(s.Lane))
	}
	// Output:
	// verdict: not-optimal
	// plan cost: 270
	// move 20 units, saving 2 per unit, 40 in all:
	//   more on inbound
	//   more on outbound
	//   less on direct
}

// An optimal plan comes with potentials whose dual objective equals its
// cost. The direct lane and the warehouse's outbound lane are in use, so
// p(Customer) = 9 and p(Warehouse) = 9 - 3 = 6; the inbound lane is full and
// its reduced cost 4 + 0 - 6 = -2 says one more unit of its capacity would
// save 2.
func ExampleCheck_optimal() {
	n := &flow.Network{
		Nodes:  []string{"Plant", "Warehouse", "Customer"},
		Supply: []int64{30, 0, -30},
		Tail:   []flow.NodeID{0, 0, 1},
		Head:   []flow.NodeID{2, 1, 2},
		Lower:  []int64{0, 0, 0},
		Upper:  []int64{flow.NoLimit, 20, flow.NoLimit},
		Rate:   []int64{9, 4, 3},
	}
	a, err := dual.Check(n, []int64{10, 20, 20})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println("verdict:", a.Verdict)
	fmt.Println("cost:", n.FormatCost(a.Cost), "dual:", n.FormatCost(a.Dual))
	for v, p := range a.Potential {
		fmt.Printf("potential of %s: %d\n", n.Nodes[v], p)
	}
	fmt.Println("reduced costs:", a.Reduced)
	// Output:
	// verdict: optimal
	// cost: 230 dual: 230
	// potential of Plant: 0
	// potential of Warehouse: 6
	// potential of Customer: 9
	// reduced costs: [0 -2 0]
}
