// Command lanecert audits freight shipment plans: it proves a plan feasible
// and cheapest by linear-programming duality, or shows the violated bounds,
// the lanes that break optimality and the reroute that saves money.
//
// Exit status: 0 optimal, 1 not optimal, 2 plan infeasible, 3 network
// infeasible, 4 bad input or usage.
package main

import "os"

func main() {
	os.Exit(int(run(os.Args[1:], streams{in: os.Stdin, out: os.Stdout, err: os.Stderr})))
}
