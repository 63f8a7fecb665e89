package flow

import (
	"errors"
	"io/fs"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"testing"
)

// bindNet: 100 units from node 1 to node 2 over two parallel lanes of
// capacity 200, integer quantities (QtyPlaces 0).
const bindNet = "p min 2 2\nn 1 100\nn 2 -100\na 1 2 0 200 1\na 1 2 0 200 1\n"

func mustDecimal(t *testing.T, s string) *Decimal {
	t.Helper()
	d, err := ParseDecimal(s)
	if err != nil {
		t.Fatal(err)
	}
	return &d
}

func TestBind(t *testing.T) {
	tests := []struct {
		name, plan string
		tol        string // "" for none
		flow       []int64
		places     int // the network's QtyPlaces after Bind
		supply0    int64
		upper0     int64
		rounded    []Rounding
	}{
		{name: "integers", plan: "f 1 2 60\nf 1 2 40\n", flow: []int64{60, 40}, supply0: 100, upper0: 200},
		// |99.9999999 - 100| = 1e-7 <= 1e-6: rounded to 100, recorded.
		{name: "within tolerance", plan: "f 1 2 99.9999999\n", tol: "0.000001",
			flow: []int64{100, 0}, supply0: 100, upper0: 200,
			rounded: []Rounding{{Lane: 0, Given: Decimal{999999999, 7}, Used: 100}}},
		// Without a tolerance the network takes 7 places: 100 -> 10^9.
		{name: "no tolerance rescales", plan: "f 1 2 99.9999999\n",
			flow: []int64{999999999, 0}, places: 7, supply0: 1000000000, upper0: 2000000000},
		// |99.99 - 100| = 0.01 > 0.001: kept exactly, 2 places.
		{name: "outside tolerance is kept", plan: "f 1 2 99.99\n", tol: "0.001",
			flow: []int64{9999, 0}, places: 2, supply0: 10000, upper0: 20000},
		// Exactly at the tolerance rounds (|99.999999 - 100| = 1e-6).
		{name: "at the tolerance", plan: "f 1 2 99.999999\n", tol: "0.000001",
			flow: []int64{100, 0}, supply0: 100, upper0: 200,
			rounded: []Rounding{{Lane: 0, Given: Decimal{99999999, 6}, Used: 100}}},
		// |99.9999989 - 100| = 1.1e-6 > 1e-6.
		{name: "just past the tolerance", plan: "f 1 2 99.9999989\n", tol: "0.000001",
			flow: []int64{999999989, 0}, places: 7, supply0: 1000000000, upper0: 2000000000},
		// One lane rounds to 100, the other needs 1 place: the rounded
		// value is rescaled with the network (100 -> 1000).
		{name: "rounded and rescaled", plan: "f 1 2 99.9999999\nf 1 2 0.5\n", tol: "0.000001",
			flow: []int64{1000, 5}, places: 1, supply0: 1000, upper0: 2000,
			rounded: []Rounding{{Lane: 0, Given: Decimal{999999999, 7}, Used: 1000}}},
		// Half away from zero: 2.5 -> 3, -2.5 -> -3 (tolerance 0.5).
		{name: "half up", plan: "f 1 2 2.5\nf 1 2 -2.5\n", tol: "0.5",
			flow: []int64{3, -3}, supply0: 100, upper0: 200,
			rounded: []Rounding{{Lane: 0, Given: Decimal{25, 1}, Used: 3}, {Lane: 1, Given: Decimal{-25, 1}, Used: -3}}},
		// -0.0000001 rounds to 0.
		{name: "tiny negative", plan: "f 1 2 -0.0000001\n", tol: "1e-6",
			flow: []int64{0, 0}, supply0: 100, upper0: 200,
			rounded: []Rounding{{Lane: 0, Given: Decimal{-1, 7}, Used: 0}}},
		// A tolerance does not touch values the network can hold.
		{name: "tolerance without rounding", plan: "f 1 2 7\n", tol: "0.5", flow: []int64{7, 0}, supply0: 100, upper0: 200},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			n := readDIMACS(t, bindNet)
			raw, err := ReadDIMACSPlan(strings.NewReader(tc.plan), "plan.flow", n)
			if err != nil {
				t.Fatal(err)
			}
			var tol *Decimal
			if tc.tol != "" {
				tol = mustDecimal(t, tc.tol)
			}
			p, err := raw.Bind(n, tol)
			if err != nil {
				t.Fatal(err)
			}
			eq(t, "Flow", p.Flow, tc.flow)
			eq(t, "QtyPlaces", n.QtyPlaces, tc.places)
			eq(t, "Supply", n.Supply, []int64{tc.supply0, -tc.supply0})
			eq(t, "Upper", n.Upper, []int64{tc.upper0, tc.upper0})
			eq(t, "Rounded", p.Rounded, tc.rounded)
		})
	}
}

func TestBindErrors(t *testing.T) {
	n := readDIMACS(t, bindNet)
	// 13 places without a tolerance: more than MaxPlaces.
	raw, err := ReadDIMACSPlan(strings.NewReader("f 1 2 0.0000000000001\n"), "plan.flow", n)
	if err != nil {
		t.Fatal(err)
	}
	_, err = raw.Bind(n, nil)
	if !errors.Is(err, ErrOverflow) || !strings.Contains(err.Error(), "tolerance") || !strings.HasPrefix(err.Error(), "flow: plan plan.flow") {
		t.Errorf("Bind: %v; want ErrOverflow mentioning a tolerance", err)
	}
	eq(t, "QtyPlaces", n.QtyPlaces, 0) // untouched

	// The same value within a tolerance is fine.
	p, err := raw.Bind(n, mustDecimal(t, "0.001"))
	if err != nil {
		t.Fatal(err)
	}
	eq(t, "Flow", p.Flow, []int64{0, 0})

	// Rescaling the network overflows: capacity 10^18 on 1 more place.
	big := readDIMACS(t, "p min 2 1\na 1 2 0 1000000000000000000 1\n")
	raw, err = ReadDIMACSPlan(strings.NewReader("f 1 2 0.5\n"), "plan.flow", big)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := raw.Bind(big, nil); !errors.Is(err, ErrOverflow) {
		t.Errorf("Bind: %v; want ErrOverflow", err)
	}

	// A plan read for another network.
	other := readDIMACS(t, "p min 2 1\na 1 2 0 1 1\n")
	raw, err = ReadDIMACSPlan(strings.NewReader(""), "plan.flow", other)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := raw.Bind(n, nil); err == nil || !strings.Contains(err.Error(), "1 quantities for 2 lanes") {
		t.Errorf("Bind: %v; want a length error", err)
	}
}

func TestPlanFromFlows(t *testing.T) {
	p := PlanFromFlows([]int64{1, 2})
	eq(t, "Flow", p.Flow, []int64{1, 2})
	if p.Rounded != nil {
		t.Error("Rounded not nil")
	}
}

// TestReadDIMACSAnnouncedArcs: the announced arc count does not decide how
// much memory is taken before the arcs are seen.
func TestReadDIMACSAnnouncedArcs(t *testing.T) {
	var before, after runtime.MemStats
	runtime.ReadMemStats(&before)
	_, err := ReadDIMACS(strings.NewReader("p min 2 1073741824\n"), "net.min")
	runtime.ReadMemStats(&after)
	checkErrs(t, err, "net.min", []wantErr{{1, 0, "ARCS", ErrSyntax}})
	if got := after.TotalAlloc - before.TotalAlloc; got > 1<<20 {
		t.Errorf("reading a 20-byte file allocated %d bytes", got)
	}
}

func writeFiles(t *testing.T, files map[string]string) string {
	t.Helper()
	dir := t.TempDir()
	for name, text := range files {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	return dir
}

func TestLoadFiles(t *testing.T) {
	const (
		dimacsNet  = "c two nodes\np min 2 1\nn 1 3\nn 2 -3\na 1 2 0 5 2\n"
		dimacsPlan = "s 6\nf 1 2 3\n"
		csvLanes   = "lane,from,to,cost,max\nL1,1,2,2,5\n"
		csvNodes   = "node,supply\n1,3\n2,-3\n"
		csvPlan    = "lane,flow\nL1,3\n"
	)
	dir := writeFiles(t, map[string]string{
		"net.min": dimacsNet, "plan.flow": dimacsPlan,
		"net.dimacs": dimacsNet, "net.NET": dimacsNet, "plan.sol": dimacsPlan,
		"lanes.csv": csvLanes, "nodes.csv": csvNodes, "plan.csv": csvPlan,
		"lanes.tsv": strings.ReplaceAll(csvLanes, ",", "\t"),
		// No known extension: told apart by the first token.
		"netfile": dimacsNet, "bomnet": "\xef\xbb\xbf" + dimacsNet, "pnet": "p min 2 1\nn 1 3\nn 2 -3\na 1 2 0 5 2\n",
		"lanefile": csvLanes, "planfile": dimacsPlan, "fplan": "f 1 2 3\n", "cplan": "c x\nf 1 2 3\n",
		"csvplanfile": csvPlan,
		// An extension wins over the content.
		"dimacs.txt": dimacsNet, "plan.txt": dimacsPlan,
		"withflow.csv": "lane,from,to,cost,max,flow\nL1,1,2,2,5,2.5\n",
	})
	path := func(name string) string {
		if name == "" {
			return ""
		}
		return filepath.Join(dir, name)
	}
	tests := []struct {
		name, net, nodes, plan string
		tol                    string
		dimacs                 bool    // the network was read as DIMACS (lane names nil)
		flow                   []int64 // nil: no plan
		planFile               string
		err                    error // a sentinel, or nil
	}{
		{name: "DIMACS by extension", net: "net.min", plan: "plan.flow", dimacs: true, flow: []int64{3}, planFile: "plan.flow"},
		{name: "DIMACS .dimacs and .sol", net: "net.dimacs", plan: "plan.sol", dimacs: true, flow: []int64{3}, planFile: "plan.sol"},
		{name: "extension in capitals", net: "net.NET", dimacs: true},
		{name: "DIMACS by content", net: "netfile", plan: "planfile", dimacs: true, flow: []int64{3}, planFile: "planfile"},
		{name: "DIMACS by content after a BOM", net: "bomnet", dimacs: true},
		{name: "DIMACS starting with p", net: "pnet", plan: "fplan", dimacs: true, flow: []int64{3}, planFile: "fplan"},
		{name: "DIMACS plan starting with c", net: "net.min", plan: "cplan", dimacs: true, flow: []int64{3}, planFile: "cplan"},
		{name: "CSV by extension", net: "lanes.csv", nodes: "nodes.csv", plan: "plan.csv", flow: []int64{3}, planFile: "plan.csv"},
		{name: "TSV", net: "lanes.tsv", nodes: "nodes.csv", plan: "plan.csv", flow: []int64{3}, planFile: "plan.csv"},
		{name: "CSV by content", net: "lanefile", nodes: "nodes.csv", plan: "csvplanfile", flow: []int64{3}, planFile: "csvplanfile"},
		{name: "CSV network, DIMACS plan", net: "lanes.csv", nodes: "nodes.csv", plan: "plan.flow", flow: []int64{3}, planFile: "plan.flow"},
		{name: "DIMACS network, CSV plan by number", net: "net.min", plan: "csvplanfile", err: ErrUnknownLane},
		{name: "flow column", net: "withflow.csv", flow: []int64{25}, planFile: filepath.Join(dir, "withflow.csv") + " (flow column)"},
		{name: "plan file over the flow column", net: "withflow.csv", plan: "plan.csv", flow: []int64{3}, planFile: "plan.csv"},
		{name: "flow column with a tolerance", net: "withflow.csv", tol: "0.5", flow: []int64{3}, planFile: filepath.Join(dir, "withflow.csv") + " (flow column)"},
		{name: "no plan", net: "lanes.csv"},
		// dimacs.txt is read as CSV: its header "c two nodes" has one column.
		{name: ".txt is CSV", net: "dimacs.txt", err: ErrSyntax},
		{name: ".txt plan is CSV", net: "net.min", plan: "plan.txt", err: ErrSyntax},
		{name: "missing network", net: "nothere.min", err: fs.ErrNotExist},
		{name: "missing nodes", net: "lanes.csv", nodes: "nothere.csv", err: fs.ErrNotExist},
		{name: "missing plan", net: "net.min", plan: "nothere.flow", err: fs.ErrNotExist},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			f := Files{Network: path(tc.net), Nodes: path(tc.nodes), Plan: path(tc.plan)}
			if tc.tol != "" {
				f.Tolerance = mustDecimal(t, tc.tol)
			}
			got, err := LoadFiles(f)
			if tc.err != nil {
				if !errors.Is(err, tc.err) {
					t.Fatalf("LoadFiles: %v; want %v", err, tc.err)
				}
				return
			}
			if err != nil {
				t.Fatal(err)
			}
			if (got.Net.LaneNames == nil) != tc.dimacs {
				t.Errorf("read as DIMACS: %v; want %v", got.Net.LaneNames == nil, tc.dimacs)
			}
			supply := int64(0) // no node table: lane-only nodes
			if tc.dimacs || tc.nodes != "" {
				supply = 3 * Pow10(got.Net.QtyPlaces)
			}
			eq(t, "Supply", got.Net.Supply[0], supply)
			if tc.flow == nil {
				if got.Plan != nil {
					t.Errorf("Plan = %+v; want none", got.Plan)
				}
				return
			}
			if got.Plan == nil {
				t.Fatal("no plan")
			}
			eq(t, "Flow", got.Plan.Flow, tc.flow)
			want := tc.planFile
			if !strings.Contains(want, string(filepath.Separator)) {
				want = path(want)
			}
			eq(t, "PlanFile", got.PlanFile, want)
		})
	}

	// A node table does not apply to a DIMACS network.
	if _, err := LoadFiles(Files{Network: path("net.min"), Nodes: path("nodes.csv")}); err == nil || !strings.Contains(err.Error(), "a node table does not apply") {
		t.Errorf("LoadFiles with DIMACS and nodes: %v", err)
	}
}
