// Command gennet writes generated benchmark instances for lanecert: a
// network as a DIMACS file and as lane and node tables (CSV), with an
// optimal plan and a plan perturbed around k cycles in both formats.
//
//	go run ./internal/cmd/gennet -kind transport -m 1000 -n 1000 -out DIR
//	go run ./internal/cmd/gennet -kind general -nodes 100000 -lanes 1000000 -out DIR
//
// Files: net.min, opt.flow, pert.flow, lanes.csv (optimal plan in its flow
// column), lanes_pert.csv, nodes.csv. Deterministic for a seed.
package main

import (
	"bufio"
	"flag"
	"fmt"
	"io"
	"os"
	"path/filepath"

	"lanecert/flow"
	"lanecert/internal/netgen"
)

func main() {
	if err := run(); err != nil {
		fmt.Fprintln(os.Stderr, "gennet:", err)
		os.Exit(1)
	}
}

func run() error {
	kind := flag.String("kind", "transport", "transport or general")
	m := flag.Int("m", 100, "transport: origins")
	nn := flag.Int("n", 100, "transport: destinations")
	nodes := flag.Int("nodes", 10000, "general: nodes")
	lanes := flag.Int("lanes", 0, "lanes (transport: 0 = complete)")
	seed := flag.Uint64("seed", 1, "random seed")
	cycles := flag.Int("k", 10, "cycles perturbed in the second plan")
	out := flag.String("out", ".", "output directory")
	flag.Parse()
	var n *flow.Network
	switch *kind {
	case "transport":
		n = netgen.Transport(*seed, *m, *nn, *lanes, 1000)
	case "general":
		if *lanes == 0 {
			*lanes = 10 * *nodes
		}
		n = netgen.General(*seed, *nodes, *lanes, max(1, *nodes/20), max(1, *nodes/20), 0.3, 1000)
	default:
		return fmt.Errorf("unknown kind %q", *kind)
	}
	sol, err := flow.Solve(n, flow.SolveOptions{})
	if err != nil {
		return err
	}
	if sol.Status != flow.Optimal {
		return fmt.Errorf("generated network is %v", sol.Status)
	}
	pert := netgen.Perturb(*seed, n, sol.Flow, sol.InTree, *cycles)
	pertCost := flow.Wide{}
	for a, x := range pert {
		pertCost, _ = pertCost.AddProduct(n.Rate[a], x)
	}
	if err := os.MkdirAll(*out, 0o755); err != nil {
		return err
	}
	files := []struct {
		name  string
		write func(io.Writer) error
	}{
		{"net.min", func(w io.Writer) error { return flow.WriteDIMACS(w, n) }},
		{"opt.flow", func(w io.Writer) error { return flow.WriteDIMACSPlan(w, n, sol.Flow, sol.Cost) }},
		{"pert.flow", func(w io.Writer) error { return flow.WriteDIMACSPlan(w, n, pert, pertCost) }},
		{"lanes.csv", func(w io.Writer) error { return flow.WriteLaneCSV(w, n, sol.Flow) }},
		{"lanes_pert.csv", func(w io.Writer) error { return flow.WriteLaneCSV(w, n, pert) }},
		{"nodes.csv", func(w io.Writer) error {
			if _, err := fmt.Fprintln(w, "node,supply"); err != nil {
				return err
			}
			for v, s := range n.Supply {
				if _, err := fmt.Fprintf(w, "%s,%s\n", n.Nodes[v], n.FormatQty(s)); err != nil {
					return err
				}
			}
			return nil
		}},
	}
	for _, f := range files {
		fh, err := os.Create(filepath.Join(*out, f.name))
		if err != nil {
			return err
		}
		bw := bufio.NewWriter(fh)
		if err := f.write(bw); err != nil {
			fh.Close()
			return err
		}
		if err := bw.Flush(); err != nil {
			fh.Close()
			return err
		}
		if err := fh.Close(); err != nil {
			return err
		}
	}
	fmt.Printf("%d nodes, %d lanes, optimal cost %s, perturbed cost %s\n", n.NumNodes(), n.NumLanes(), n.FormatCost(sol.Cost), n.FormatCost(pertCost))
	return nil
}
