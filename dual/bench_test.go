package dual_test

import (
	"bytes"
	"fmt"
	"sync"
	"testing"

	"lanecert/dual"
	"lanecert/flow"
	"lanecert/internal/netgen"
)

// benchCase is a generated transportation network with an optimal plan, a
// plan perturbed around 10 cycles, and both written as files.
type benchCase struct {
	name              string
	m, n              int
	once              sync.Once
	net               *flow.Network
	optimal, perturbd []int64
	laneCSV, nodeCSV  []byte
	dimacs, planFlow  []byte
}

// benchCases are the default sizes (10^4 and 10^5 lanes, complete
// transportation networks); bench_large_test.go adds 10^6 with -tags large.
var benchCases = []*benchCase{
	{name: "trans_1e4", m: 100, n: 100},
	{name: "trans_1e5", m: 316, n: 316},
}

func (c *benchCase) load(b *testing.B) {
	c.once.Do(func() {
		c.net = netgen.Transport(uint64(c.m*c.n), c.m, c.n, 0, 1000)
		sol, err := flow.Solve(c.net, flow.SolveOptions{})
		if err != nil || sol.Status != flow.Optimal {
			panic(fmt.Sprint("bench setup: ", sol.Status, err))
		}
		c.optimal = sol.Flow
		c.perturbd = netgen.Perturb(1, c.net, sol.Flow, sol.InTree, 10)
		var buf bytes.Buffer
		if err := flow.WriteLaneCSV(&buf, c.net, c.optimal); err != nil {
			panic(err)
		}
		c.laneCSV = append([]byte(nil), buf.Bytes()...)
		buf.Reset()
		buf.WriteString("node,supply\n")
		for v, s := range c.net.Supply {
			fmt.Fprintf(&buf, "%s,%s\n", c.net.Nodes[v], c.net.FormatQty(s))
		}
		c.nodeCSV = append([]byte(nil), buf.Bytes()...)
		buf.Reset()
		if err := flow.WriteDIMACS(&buf, c.net); err != nil {
			panic(err)
		}
		c.dimacs = append([]byte(nil), buf.Bytes()...)
		buf.Reset()
		if err := flow.WriteDIMACSPlan(&buf, c.net, c.optimal, sol.Cost); err != nil {
			panic(err)
		}
		c.planFlow = append([]byte(nil), buf.Bytes()...)
	})
}

func perLane(b *testing.B, lanes int) {
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(lanes), "ns/lane")
}

// BenchmarkAudit is the certificate check after parsing: an optimal plan
// (potentials and dual objective) and a plan 10 cycles off the optimum
// (violations and improving cycles).
func BenchmarkAudit(b *testing.B) {
	for _, c := range benchCases {
		for _, kind := range []string{"optimal", "perturbed"} {
			b.Run(c.name+"/"+kind, func(b *testing.B) {
				c.load(b)
				x := c.optimal
				if kind == "perturbed" {
					x = c.perturbd
				}
				b.ReportAllocs()
				b.ResetTimer()
				for i := 0; i < b.N; i++ {
					a, err := dual.Check(c.net, x)
					if err != nil {
						b.Fatal(err)
					}
					if (a.Verdict == dual.Optimal) != (kind == "optimal") {
						b.Fatalf("verdict %v", a.Verdict)
					}
				}
				perLane(b, c.net.NumLanes())
			})
		}
	}
}

// BenchmarkParse reads the network and the plan: the lane table with its
// flow column and the node table (CSV), or DIMACS network and f lines.
func BenchmarkParse(b *testing.B) {
	for _, c := range benchCases {
		b.Run(c.name+"/csv", func(b *testing.B) {
			c.load(b)
			b.SetBytes(int64(len(c.laneCSV) + len(c.nodeCSV)))
			b.ReportAllocs()
			b.ResetTimer()
			for i := 0; i < b.N; i++ {
				if _, _, err := parseCSV(c); err != nil {
					b.Fatal(err)
				}
			}
			perLane(b, c.net.NumLanes())
		})
		b.Run(c.name+"/dimacs", func(b *testing.B) {
			c.load(b)
			b.SetBytes(int64(len(c.dimacs) + len(c.planFlow)))
			b.ReportAllocs()
			b.ResetTimer()
			for i := 0; i < b.N; i++ {
				if _, _, err := parseDIMACS(c); err != nil {
					b.Fatal(err)
				}
			}
			perLane(b, c.net.NumLanes())
		})
	}
}

// BenchmarkAuditFromCSV is parse plus audit, as the command line runs it
// with the solver left out.
func BenchmarkAuditFromCSV(b *testing.B) {
	for _, c := range benchCases {
		b.Run(c.name, func(b *testing.B) {
			c.load(b)
			b.ReportAllocs()
			b.ResetTimer()
			for i := 0; i < b.N; i++ {
				n, x, err := parseCSV(c)
				if err != nil {
					b.Fatal(err)
				}
				if _, err := dual.Check(n, x); err != nil {
					b.Fatal(err)
				}
			}
			perLane(b, c.net.NumLanes())
		})
	}
}

func parseCSV(c *benchCase) (*flow.Network, []int64, error) {
	n, raw, err := flow.ReadCSVNetwork(bytes.NewReader(c.laneCSV), "lanes.csv", bytes.NewReader(c.nodeCSV), "nodes.csv", flow.TableOptions{})
	if err != nil {
		return nil, nil, err
	}
	p, err := raw.Bind(n, nil)
	if err != nil {
		return nil, nil, err
	}
	return n, p.Flow, nil
}

func parseDIMACS(c *benchCase) (*flow.Network, []int64, error) {
	n, err := flow.ReadDIMACS(bytes.NewReader(c.dimacs), "net.min")
	if err != nil {
		return nil, nil, err
	}
	raw, err := flow.ReadDIMACSPlan(bytes.NewReader(c.planFlow), "plan.flow", n)
	if err != nil {
		return nil, nil, err
	}
	p, err := raw.Bind(n, nil)
	if err != nil {
		return nil, nil, err
	}
	return n, p.Flow, nil
}

// rangeCases are 10^5-lane networks for the sensitivity benchmarks.
var rangeCases = []struct {
	name string
	make func() *flow.Network
}{
	{"trans_1e5", func() *flow.Network { return netgen.Transport(7, 316, 316, 0, 1000) }},
	{"trans_sparse_1e5", func() *flow.Network { return netgen.Transport(8, 5000, 5000, 100000, 1000) }},
	{"general_1e5", func() *flow.Network { return netgen.General(9, 10000, 100000, 500, 500, 0.3, 1000) }},
}

// BenchmarkRanges times the ranges of every lane and the prices of every
// node of an optimal plan, next to the solve that found the plan (report
// the ratio of the two from one run).
func BenchmarkRanges(b *testing.B) {
	for _, c := range rangeCases {
		n, sol, a := solvedCase(b, c.make)
		b.Run(c.name+"/solve", func(b *testing.B) {
			for i := 0; i < b.N; i++ {
				if _, err := flow.Solve(n, flow.SolveOptions{}); err != nil {
					b.Fatal(err)
				}
			}
		})
		b.Run(c.name+"/ranges", func(b *testing.B) {
			b.ReportAllocs()
			var s *dual.Sensitivity
			var err error
			for i := 0; i < b.N; i++ {
				if s, err = dual.Ranges(n, sol.Flow, a.Potential); err != nil {
					b.Fatal(err)
				}
			}
			b.ReportMetric(float64(s.Routes), "searches")
			b.ReportMetric(float64(a.Pieces), "pieces")
		})
	}
}

// solvedCase builds a benchmark network and audits its optimal plan.
func solvedCase(b *testing.B, make func() *flow.Network) (*flow.Network, *flow.Solution, *dual.Audit) {
	b.Helper()
	n := make()
	sol, err := flow.Solve(n, flow.SolveOptions{})
	if err != nil || sol.Status != flow.Optimal {
		b.Fatal(sol.Status, err)
	}
	a, err := dual.Check(n, sol.Flow)
	if err != nil {
		b.Fatal(err)
	}
	return n, sol, a
}
