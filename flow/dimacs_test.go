package flow

import (
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// referenceDir holds published DIMACS examples copied from
// /work/shared/reference (see its README.md for each file's source).
const referenceDir = "../testdata/reference"

// referenceSources names the source of each reference network, as given in
// /work/shared/reference/README.md.
var referenceSources = map[string]string{
	"ampl_net1":              "Fourer, Gay & Kernighan, AMPL 2nd ed. 2003, ch. 15, net1",
	"dantzig_trnsport":       "Dantzig, Linear Programming and Extensions 1963, ch. 3-3; GLPK 5.0 examples/transp.mod",
	"dimacs_lpsolve_example": "lp_solve 5.5 reference guide, DIMACS minimum cost flow problems",
	"glpk_sample":            "GLPK 5.0 examples/sample.min; GLPK Graph and Network Routines §2.1.5",
	"lemon_mcf_case1":        "LEMON 1.3 test/min_cost_flow_test.cc, case -1",
	"lemon_mcf_case2":        "LEMON 1.3 test/min_cost_flow_test.cc, case -2",
	"lpsolve_asn5":           "lp_solve 5.5 reference guide, DIMACS assignment problems",
	"nx_simple_digraph":      "NetworkX 2.8 test_mincost.py::test_simple_digraph",
	"nx_transshipment":       "NetworkX 2.8 test_mincost.py::test_transshipment",
	"scipy_lsa_doc3":         "SciPy 1.10 linear_sum_assignment documentation example",
	"winston_powerco":        "Winston, Operations Research, Powerco example (edition from memory)",
}

// simpleDIMACS is an independent reading of an integer-only DIMACS file
// with strings.Fields and strconv: the oracle for the reference files.
type simpleDIMACS struct {
	nodes, arcs        int
	supply             []int64
	tail, head         []NodeID
	lower, upper, rate []int64
	flow               map[[2]NodeID]int64 // from a .flow file
	cost               int64               // its s line
}

func atoi64(t *testing.T, s string) int64 {
	t.Helper()
	v, err := strconv.ParseInt(s, 10, 64)
	if err != nil {
		t.Fatal(err)
	}
	return v
}

func readSimple(t *testing.T, minText, flowText string) *simpleDIMACS {
	t.Helper()
	s := &simpleDIMACS{flow: map[[2]NodeID]int64{}}
	for _, line := range strings.Split(minText, "\n") {
		f := strings.Fields(line)
		if len(f) == 0 {
			continue
		}
		switch f[0] {
		case "p":
			s.nodes, s.arcs = int(atoi64(t, f[2])), int(atoi64(t, f[3]))
			s.supply = make([]int64, s.nodes)
		case "n":
			s.supply[atoi64(t, f[1])-1] += atoi64(t, f[2])
		case "a":
			s.tail = append(s.tail, NodeID(atoi64(t, f[1])-1))
			s.head = append(s.head, NodeID(atoi64(t, f[2])-1))
			s.lower = append(s.lower, atoi64(t, f[3]))
			s.upper = append(s.upper, atoi64(t, f[4]))
			s.rate = append(s.rate, atoi64(t, f[5]))
		}
	}
	for _, line := range strings.Split(flowText, "\n") {
		f := strings.Fields(line)
		if len(f) == 0 {
			continue
		}
		switch f[0] {
		case "s":
			s.cost = atoi64(t, f[1])
		case "f":
			k := [2]NodeID{NodeID(atoi64(t, f[1]) - 1), NodeID(atoi64(t, f[2]) - 1)}
			if _, dup := s.flow[k]; dup {
				t.Fatalf("oracle: parallel f lines for %v", k)
			}
			s.flow[k] = atoi64(t, f[3])
		}
	}
	return s
}

func readFile(t *testing.T, path string) string {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

// TestReadDIMACSReference reads every reference network and its published
// plans, compares them with the oracle reading, and checks what the README
// states of every plan: it is feasible and costs what its s line says.
func TestReadDIMACSReference(t *testing.T) {
	mins, err := filepath.Glob(filepath.Join(referenceDir, "*.min"))
	if err != nil || len(mins) != len(referenceSources) {
		t.Fatalf("found %d reference networks (%v); want %d", len(mins), err, len(referenceSources))
	}
	for _, path := range mins {
		name := strings.TrimSuffix(filepath.Base(path), ".min")
		t.Run(name, func(t *testing.T) {
			if referenceSources[name] == "" {
				t.Fatalf("no source named for %s", name)
			}
			minText := readFile(t, path)
			n, err := ReadDIMACS(strings.NewReader(minText), path)
			if err != nil {
				t.Fatal(err)
			}
			if err := n.Validate(); err != nil {
				t.Fatal(err)
			}
			plans, _ := filepath.Glob(filepath.Join(referenceDir, name+"*.flow"))
			if len(plans) == 0 {
				t.Fatal("no plan")
			}
			for _, fp := range plans {
				flowText := readFile(t, fp)
				want := readSimple(t, minText, flowText)
				if n.NumNodes() != want.nodes || n.NumLanes() != want.arcs {
					t.Fatalf("%d nodes, %d lanes; the p line says %d, %d", n.NumNodes(), n.NumLanes(), want.nodes, want.arcs)
				}
				eq(t, "Supply", n.Supply, want.supply)
				eq(t, "Tail", n.Tail, want.tail)
				eq(t, "Head", n.Head, want.head)
				eq(t, "Lower", n.Lower, want.lower)
				eq(t, "Upper", n.Upper, want.upper)
				eq(t, "Rate", n.Rate, want.rate)
				eq(t, "places", []int{n.QtyPlaces, n.RatePlaces}, []int{0, 0})
				eq(t, "node name", n.Nodes[n.NumNodes()-1], strconv.Itoa(want.nodes))
				raw, err := ReadDIMACSPlan(strings.NewReader(flowText), fp, n)
				if err != nil {
					t.Fatal(err)
				}
				p, err := raw.Bind(n, nil)
				if err != nil {
					t.Fatal(err)
				}
				cost := Wide{}
				for a, x := range p.Flow {
					if w := want.flow[[2]NodeID{n.Tail[a], n.Head[a]}]; x != w {
						t.Errorf("%s: lane %d flow %d; want %d", fp, a+1, x, w)
					}
					if cost, err = cost.AddProduct(n.Rate[a], x); err != nil {
						t.Fatal(err)
					}
				}
				if v, _ := cost.Int64(); v != want.cost {
					t.Errorf("%s: cost %s; the s line says %d (%s)", fp, cost.Format(0), want.cost, referenceSources[name])
				}
				fe, err := CheckPlan(n, p.Flow)
				if err != nil || !fe.Feasible() {
					t.Errorf("%s: published plan not feasible: %v %+v", fp, err, fe.Violations)
				}
			}
		})
	}
}

func readDIMACS(t *testing.T, text string) *Network {
	t.Helper()
	n, err := ReadDIMACS(strings.NewReader(text), "net.min")
	if err != nil {
		t.Fatalf("ReadDIMACS: %v", err)
	}
	if err := n.Validate(); err != nil {
		t.Fatal(err)
	}
	return n
}

// Columns below are 1-based byte offsets of a line's fields, counted by
// hand; Col 0 is the whole line, Line 0 the whole file.
func TestReadDIMACSErrors(t *testing.T) {
	const p21 = "p min 2 1\n" // two nodes, one arc; the next line is line 2
	tests := []struct {
		name, in string
		want     []wantErr
		msg      string
	}{
		{name: "empty", in: "", want: []wantErr{{0, 0, "", ErrEmpty}}},
		{name: "blank", in: "\n \r\n\t\n", want: []wantErr{{0, 0, "", ErrEmpty}}},
		{name: "no p line", in: "c only a comment\n", want: []wantErr{{0, 0, "", ErrSyntax}}, msg: `no "p min NODES ARCS" line`},
		{name: "second p line", in: "p min 2 0\np min 2 0\n", want: []wantErr{{2, 1, "p", ErrDuplicate}}, msg: "the first is on line 1"},
		{name: "p max", in: "p max 2 1\n", want: []wantErr{{1, 1, "p", ErrSyntax}}},
		{name: "p too short", in: "p min 2\n", want: []wantErr{{1, 1, "p", ErrSyntax}}},
		{name: "p too long", in: "p min 2 0 0\n", want: []wantErr{{1, 1, "p", ErrSyntax}}},
		// "p min x 0": NODES at 7, ARCS at 9.
		{name: "node count", in: "p min x 0\n", want: []wantErr{{1, 7, "NODES", ErrSyntax}}},
		{name: "negative node count", in: "p min -2 0\n", want: []wantErr{{1, 7, "NODES", ErrSyntax}}},
		{name: "arc count", in: "p min 2 -1\n", want: []wantErr{{1, 9, "ARCS", ErrSyntax}}},
		{name: "decimal arc count", in: "p min 2 1.5\n", want: []wantErr{{1, 9, "ARCS", ErrSyntax}}},
		{name: "huge node count", in: "p min 2000000000 0\n", want: []wantErr{{1, 7, "NODES", ErrSyntax}}},
		{name: "n before p", in: "n 1 5\np min 1 0\n", want: []wantErr{{1, 1, "n", ErrSyntax}}},
		{name: "a before p", in: "a 1 2 0 1 1\np min 2 1\n", want: []wantErr{{1, 1, "a", ErrSyntax}}},
		// "n 3 5": ID at 3, SUPPLY at 5.
		{name: "node above range", in: "p min 2 0\nn 3 5\n", want: []wantErr{{2, 3, "ID", ErrUnknownNode}}, msg: "from 1 to 2"},
		{name: "node 0", in: "p min 2 0\nn 0 5\n", want: []wantErr{{2, 3, "ID", ErrUnknownNode}}},
		{name: "node not a number", in: "p min 2 0\nn one 5\n", want: []wantErr{{2, 3, "ID", ErrUnknownNode}}},
		// "a 0 3 0 1 1": SRC 3, DST 5, LOW 7, CAP 9, COST 11.
		{name: "arc source", in: p21 + "a 0 2 0 1 1\n", want: []wantErr{{2, 3, "SRC", ErrUnknownNode}}},
		{name: "arc head", in: p21 + "a 1 3 0 1 1\n", want: []wantErr{{2, 5, "DST", ErrUnknownNode}}},
		{name: "arc both ends", in: p21 + "a 0 3 0 1 1\n", want: []wantErr{{2, 3, "SRC", ErrUnknownNode}, {2, 5, "DST", ErrUnknownNode}}},
		{name: "fewer arcs", in: "p min 2 2\na 1 2 0 1 1\n", want: []wantErr{{1, 0, "ARCS", ErrSyntax}}, msg: "announces 2 arcs, the file has 1"},
		{name: "no arcs", in: "p min 2 1\n", want: []wantErr{{1, 0, "ARCS", ErrSyntax}}},
		{name: "more arcs", in: p21 + "a 1 2 0 1 1\na 2 1 0 1 1\na 2 1 0 1 1\n",
			want: []wantErr{{3, 1, "a", ErrSyntax}, {4, 1, "a", ErrSyntax}}, msg: "more arc lines than the 1"},
		{name: "LOW above CAP", in: p21 + "a 1 2 5 4 1\n", want: []wantErr{{2, 7, "LOW", ErrBounds}}, msg: "LOW 5 > CAP 4"},
		{name: "LOW above CAP in decimals", in: p21 + "a 1 2 0.5 0.25 1\n", want: []wantErr{{2, 7, "LOW", ErrBounds}}},
		{name: "negative CAP", in: p21 + "a 1 2 0 -4 1\n", want: []wantErr{{2, 9, "CAP", ErrNegative}}},
		{name: "negative LOW", in: p21 + "a 1 2 -1 4 1\n", want: []wantErr{{2, 7, "LOW", ErrNegative}}},
		{name: "bad LOW", in: p21 + "a 1 2 x 4 1\n", want: []wantErr{{2, 7, "LOW", ErrNotDecimal}}},
		// Columns count characters: "a 1 2 0 é x" has x at character 11
		// (byte 12).
		{name: "characters before the field", in: p21 + "a 1 2 0 é x\n", want: []wantErr{{2, 9, "CAP", ErrNotDecimal}, {2, 11, "COST", ErrNotDecimal}}},
		{name: "bad CAP", in: p21 + "a 1 2 0 1,5 1\n", want: []wantErr{{2, 9, "CAP", ErrNotDecimal}}},
		{name: "INF is not inf", in: p21 + "a 1 2 0 INF 1\n", want: []wantErr{{2, 9, "CAP", ErrNotDecimal}}},
		{name: "bad COST", in: p21 + "a 1 2 0 4 NaN\n", want: []wantErr{{2, 11, "COST", ErrNotDecimal}}},
		{name: "bad LOW CAP COST", in: p21 + "a 1 2 x y z\n",
			want: []wantErr{{2, 7, "LOW", ErrNotDecimal}, {2, 9, "CAP", ErrNotDecimal}, {2, 11, "COST", ErrNotDecimal}}},
		{name: "bad SUPPLY", in: "p min 2 0\nn 1 abc\n", want: []wantErr{{2, 5, "SUPPLY", ErrNotDecimal}}},
		{name: "SUPPLY digits", in: "p min 2 0\nn 1 99999999999999999999\n", want: []wantErr{{2, 5, "SUPPLY", ErrOverflow}}},
		// 9e18 + 9e18 > MaxInt64 ≈ 9.22e18.
		{name: "SUPPLY sum", in: "p min 2 0\nn 1 9000000000000000000\nn 1 9000000000000000000\n",
			want: []wantErr{{3, 5, "SUPPLY", ErrOverflow}}},
		// -9223372036854775799 - 9 = MinInt64, outside [-MaxInt64, MaxInt64].
		{name: "SUPPLY sum MinInt64", in: "p min 2 0\nn 1 -9223372036854775799\nn 1 -9\n",
			want: []wantErr{{3, 5, "SUPPLY", ErrOverflow}}},
		{name: "a fields", in: p21 + "a 1 2 0 1\n", want: []wantErr{{2, 1, "a", ErrSyntax}}},
		{name: "n fields", in: "p min 2 0\nn 1\n", want: []wantErr{{2, 1, "n", ErrSyntax}}},
		{name: "unknown line", in: "p min 2 0\nx 1 2\n", want: []wantErr{{2, 1, "line", ErrSyntax}}},
		{name: "indented unknown line", in: "p min 2 0\n  q\n", want: []wantErr{{2, 3, "line", ErrSyntax}}},
		{name: "comment without a space", in: "p min 2 0\ncomment\n", want: []wantErr{{2, 1, "line", ErrSyntax}}},
		{name: "plan line in a network", in: "p min 2 0\nf 1 2 3\n", want: []wantErr{{2, 1, "line", ErrSyntax}}},
		{name: "sorted by line", in: "p min 2 0\nn 3 1\nx\nn 1 y\n",
			want: []wantErr{{2, 3, "ID", ErrUnknownNode}, {3, 1, "line", ErrSyntax}, {4, 5, "SUPPLY", ErrNotDecimal}}},
		// 13 places are more than MaxPlaces (12): a whole-file error.
		{name: "rate places", in: p21 + "a 1 2 0 1 0.0000000000001\n", want: []wantErr{{0, 0, "", ErrOverflow}}},
		// 10^18 on the 1-place scale of 0.1 is 10^19 > MaxInt64.
		{name: "scaling overflows", in: "p min 2 2\na 1 2 0 1 1000000000000000000\na 1 2 0 1 0.1\n",
			want: []wantErr{{0, 0, "cost", ErrOverflow}}, msg: "lane 1"},
		// An announced count far beyond the file is an error, not a 30 GB allocation.
		{name: "arc count beyond the file", in: "p min 2 1073741824\n", want: []wantErr{{1, 0, "ARCS", ErrSyntax}}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			n, err := ReadDIMACS(strings.NewReader(tc.in), "net.min")
			if err == nil {
				t.Fatalf("no error; network %+v", n)
			}
			checkErrs(t, err, "net.min", tc.want)
			if tc.msg != "" && !strings.Contains(err.Error(), tc.msg) {
				t.Errorf("message %q does not contain %q", err, tc.msg)
			}
		})
	}
}

func TestReadDIMACSValid(t *testing.T) {
	t.Run("inf capacity", func(t *testing.T) {
		n := readDIMACS(t, "p min 2 2\na 1 2 0 inf 1\na 2 1 1 Inf 1\n")
		eq(t, "Upper", n.Upper, []int64{NoLimit, NoLimit})
		eq(t, "Lower", n.Lower, []int64{0, 1})
	})
	t.Run("repeated n lines add up", func(t *testing.T) {
		// 3 + 2.5 = 5.5 -> 55 on 1 place; -4 - 1.5 = -5.5.
		n := readDIMACS(t, "p min 3 0\nn 1 3\nn 2 -4\nn 1 2.5\nn 2 -1.5\n")
		eq(t, "Supply", n.Supply, []int64{55, -55, 0})
		eq(t, "QtyPlaces", n.QtyPlaces, 1)
	})
	t.Run("decimals", func(t *testing.T) {
		// Quantities 0.5 and 1.5 -> 1 place; rate 0.25 -> 2 places; 3 -> 300.
		n := readDIMACS(t, "p min 2 2\nn 1 2\nn 2 -2\na 1 2 0.5 1.5 0.25\na 1 2 0 2 3\n")
		eq(t, "places", []int{n.QtyPlaces, n.RatePlaces}, []int{1, 2})
		eq(t, "Supply", n.Supply, []int64{20, -20})
		eq(t, "Lower", n.Lower, []int64{5, 0})
		eq(t, "Upper", n.Upper, []int64{15, 20})
		eq(t, "Rate", n.Rate, []int64{25, 300})
	})
	t.Run("layout", func(t *testing.T) {
		// BOM, CRLF, tabs, indentation, comments and blank lines anywhere.
		n := readDIMACS(t, "\xef\xbb\xbfc first\r\n\r\n  p\tmin 3 3\r\nc between\r\n\tn 1 1\r\nn 3 -1\r\na 1 2 0 1 1\r\na 1 2 0 1 2\r\n a 2 2 0 1 0\r\nc\r\n")
		eq(t, "Nodes", n.Nodes, []string{"1", "2", "3"})
		eq(t, "Supply", n.Supply, []int64{1, 0, -1})
		// Parallel arcs and a self-loop stay distinct, in file order.
		eq(t, "Tail", n.Tail, []NodeID{0, 0, 1})
		eq(t, "Head", n.Head, []NodeID{1, 1, 1})
		eq(t, "Rate", n.Rate, []int64{1, 2, 0})
		if n.LaneNames != nil {
			t.Errorf("LaneNames = %q; want nil (arc numbers)", n.LaneNames)
		}
		eq(t, "LaneName", n.LaneName(2), "3")
		if n.Extra != nil || n.NodeExtra != nil {
			t.Error("extra columns from DIMACS")
		}
	})
	t.Run("no nodes", func(t *testing.T) {
		n := readDIMACS(t, "p min 0 0\n")
		if n.NumNodes() != 0 || n.NumLanes() != 0 {
			t.Errorf("got %d nodes %d lanes", n.NumNodes(), n.NumLanes())
		}
	})
	t.Run("no final newline", func(t *testing.T) {
		n := readDIMACS(t, "p min 2 1\na 1 2 0 1 7")
		eq(t, "Rate", n.Rate, []int64{7})
	})
	t.Run("supply sum at -MaxInt64", func(t *testing.T) {
		n := readDIMACS(t, "p min 1 0\nn 1 -9223372036854775799\nn 1 -8\n")
		eq(t, "Supply", n.Supply, []int64{-math.MaxInt64})
	})
}

// dimacsPlanNet has arcs 1: 1->2, 2: 1->2 (parallel), 3: 2->3, 4: 1->3.
const dimacsPlanNet = "p min 3 4\nn 1 5\nn 3 -5\na 1 2 0 5 1\na 1 2 0 5 2\na 2 3 0 10 1\na 1 3 0 5 3\n"

func TestReadDIMACSPlan(t *testing.T) {
	n := readDIMACS(t, dimacsPlanNet)
	tests := []struct {
		name, plan string
		want       []Decimal // per arc
	}{
		{"in order", "s 7\nf 1 2 1\nf 1 2 2\nf 2 3 3\nf 1 3 4\n", []Decimal{{1, 0}, {2, 0}, {3, 0}, {4, 0}}},
		// The k-th f line of a pair goes to the k-th arc of the pair.
		{"out of order", "f 2 3 3\nf 1 3 4\nf 1 2 1\nf 1 2 2\n", []Decimal{{1, 0}, {2, 0}, {3, 0}, {4, 0}}},
		{"pair interleaved", "f 1 2 1\nf 2 3 3\nf 1 2 2\n", []Decimal{{1, 0}, {2, 0}, {3, 0}, {0, 0}}},
		{"reversed", "f 1 3 4\nf 2 3 3\nf 1 2 1\nf 1 2 2\n", []Decimal{{1, 0}, {2, 0}, {3, 0}, {4, 0}}},
		{"arcs not named carry 0", "f 2 3 3\n", []Decimal{{0, 0}, {0, 0}, {3, 0}, {0, 0}}},
		{"one of two parallel arcs", "f 1 3 4\nf 1 2 1\n", []Decimal{{1, 0}, {0, 0}, {0, 0}, {4, 0}}},
		{"empty plan", "", []Decimal{{0, 0}, {0, 0}, {0, 0}, {0, 0}}},
		{"s and c lines ignored", "c solved\ns 99999\ns not a number\nf 1 2 0.5\n", []Decimal{{5, 1}, {0, 0}, {0, 0}, {0, 0}}},
		{"CRLF and tabs", "f\t1 2 1\r\n  f 1 2 2\r\n", []Decimal{{1, 0}, {2, 0}, {0, 0}, {0, 0}}},
	}
	for _, tc := range tests {
		p, err := ReadDIMACSPlan(strings.NewReader(tc.plan), "plan.flow", n)
		if err != nil {
			t.Errorf("%s: %v", tc.name, err)
			continue
		}
		eq(t, tc.name, planValues(p), tc.want)
	}
}

func TestReadDIMACSPlanErrors(t *testing.T) {
	n := readDIMACS(t, dimacsPlanNet)
	tests := []struct {
		name, plan string
		want       []wantErr
		msg        string
	}{
		// "f 1 2 3": SRC 3, DST 5, FLOW 7.
		{name: "third f line for a pair of two", plan: "f 1 2 1\nf 1 2 2\nf 1 2 3\n", want: []wantErr{{3, 1, "f", ErrDuplicate}},
			msg: "more f lines for 1 -> 2 than the 2 arc(s) between them"},
		{name: "second f line for a single arc", plan: "f 2 3 1\nf 2 3 1\n", want: []wantErr{{2, 1, "f", ErrDuplicate}}},
		{name: "no arc for the pair", plan: "f 3 1 1\n", want: []wantErr{{1, 5, "DST", ErrUnknownLane}}, msg: "no arc runs from 3 to 1"},
		{name: "source out of range", plan: "f 4 1 1\n", want: []wantErr{{1, 3, "SRC", ErrUnknownNode}}},
		{name: "head out of range", plan: "f 1 0 1\n", want: []wantErr{{1, 5, "DST", ErrUnknownNode}}},
		{name: "bad flow", plan: "f 1 2 x\n", want: []wantErr{{1, 7, "FLOW", ErrNotDecimal}}},
		// "f ½ 2 x": x at character 7 (byte 8).
		{name: "bad flow after characters", plan: "f ½ 2 x\n", want: []wantErr{{1, 3, "SRC", ErrUnknownNode}, {1, 7, "FLOW", ErrNotDecimal}}},
		{name: "bad flow after a tab", plan: "f\t1\t2\tx\n", want: []wantErr{{1, 7, "FLOW", ErrNotDecimal}}},
		{name: "flow digits", plan: "f 1 2 123456789012345678901\n", want: []wantErr{{1, 7, "FLOW", ErrOverflow}}},
		{name: "f fields", plan: "f 1 2\n", want: []wantErr{{1, 1, "f", ErrSyntax}}},
		{name: "arc line in a plan", plan: "a 1 2 0 1 1\n", want: []wantErr{{1, 1, "line", ErrSyntax}}},
		{name: "sorted", plan: "f 1 2 x\nf 9 9 1\nq\n",
			want: []wantErr{{1, 7, "FLOW", ErrNotDecimal}, {2, 3, "SRC", ErrUnknownNode}, {2, 5, "DST", ErrUnknownNode}, {3, 1, "line", ErrSyntax}}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := ReadDIMACSPlan(strings.NewReader(tc.plan), "plan.flow", n)
			checkErrs(t, err, "plan.flow", tc.want)
			if tc.msg != "" && !strings.Contains(err.Error(), tc.msg) {
				t.Errorf("message %q does not contain %q", err, tc.msg)
			}
		})
	}
}
