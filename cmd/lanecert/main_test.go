package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"math/big"
	"math/rand/v2"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"lanecert/dual"
	"lanecert/flow"
	"lanecert/internal/longrun"
	"lanecert/internal/randnet"
)

func runCLI(t *testing.T, args ...string) (exitCode, string, string) {
	t.Helper()
	var out, errb bytes.Buffer
	code := run(args, streams{in: strings.NewReader(""), out: &out, err: &errb})
	return code, out.String(), errb.String()
}

// TestAuditFlags checks flag parsing apart from behaviour.
func TestAuditFlags(t *testing.T) {
	cases := []struct {
		args []string
		want auditOptions
	}{
		{[]string{"lanes.csv"}, auditOptions{rows: defaultRows, format: "table"}},
		{[]string{"net.min", "plan.flow", "--format", "json", "-o", "x.json"}, auditOptions{rows: defaultRows, format: "json", output: "x.json"}},
		{[]string{"--network", "l.csv", "--nodes", "n.csv", "--plan", "p.csv", "--col", "cost=rate_usd", "--tolerance", "1e-6", "--all-lanes", "--show-nodes"},
			auditOptions{rows: defaultRows, format: "table", columns: []string{"cost=rate_usd"}, tolerance: "1e-6", allLanes: true, showNodes: true}},
	}
	wantFiles := [][3]string{{"lanes.csv", "", ""}, {"net.min", "", "plan.flow"}, {"l.csv", "n.csv", "p.csv"}}
	for i, c := range cases {
		var got *auditOptions
		cmd := newAuditCmd(streams{out: &bytes.Buffer{}, err: &bytes.Buffer{}}, func(o *auditOptions) error { got = o; return nil })
		cmd.SetArgs(c.args)
		cmd.SetOut(&bytes.Buffer{})
		if err := cmd.Execute(); err != nil {
			t.Fatalf("%v: %v", c.args, err)
		}
		if f := [3]string{got.files.Network, got.files.Nodes, got.files.Plan}; f != wantFiles[i] {
			t.Errorf("%v: files %v, want %v", c.args, f, wantFiles[i])
		}
		got.files = c.want.files
		if !reflect.DeepEqual(*got, c.want) {
			t.Errorf("%v: options %+v, want %+v", c.args, *got, c.want)
		}
	}
}

func TestAuditUsageErrors(t *testing.T) {
	for _, args := range [][]string{
		{"audit"},
		{"audit", "a.csv", "--network", "b.csv"},
		{"audit", "a.csv", "b.csv", "c.csv"},
		{"audit", "../../testdata/reference/glpk_sample.min", "../../testdata/reference/glpk_sample.flow", "--format", "xml"},
		{"audit", "../../testdata/reference/glpk_sample.min", "../../testdata/reference/glpk_sample.flow", "--col", "cost"},
		{"audit", "../../testdata/reference/glpk_sample.min", "../../testdata/reference/glpk_sample.flow", "--tolerance", "-1"},
		{"audit", "../../testdata/reference/glpk_sample.min"}, // no plan
		{"audit", "missing.csv"},
	} {
		code, _, errText := runCLI(t, args...)
		if code != exitBadInput || !strings.HasPrefix(errText, "lanecert: ") {
			t.Errorf("%v: exit %d, stderr %q; want 4 and a message", args, code, errText)
		}
	}
}

func TestAuditPositionedError(t *testing.T) {
	dir := t.TempDir()
	lanes := filepath.Join(dir, "lanes.csv")
	if err := os.WriteFile(lanes, []byte("from,to,cost,flow\na,b,12;5,1\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	code, _, errText := runCLI(t, "audit", lanes)
	if code != exitBadInput || !strings.Contains(errText, "lanes.csv:2:5: cost \"12;5\"") {
		t.Fatalf("exit %d, stderr %q", code, errText)
	}
}

// TestExitCodes: one input per verdict.
func TestExitCodes(t *testing.T) {
	ref := "../../testdata/reference/"
	cases := []struct {
		args []string
		code exitCode
	}{
		{[]string{"audit", ref + "glpk_sample.min", ref + "glpk_sample.flow"}, exitOptimal},
		{[]string{"demo"}, exitNotOptimal},
		{[]string{"audit", "../../testdata/audit/infeasible_lanes.csv", "--nodes", "../../testdata/audit/infeasible_nodes.csv", "--decimal-comma"}, exitPlanInfeasible},
	}
	for _, c := range cases {
		code, out, errText := runCLI(t, c.args...)
		if code != c.code {
			t.Errorf("%v: exit %d, want %d; stderr %q", c.args, code, c.code, errText)
		}
		if !strings.Contains(out, "cost optimality only") {
			t.Errorf("%v: report lacks the caution", c.args)
		}
	}
}

func TestDemoJSONVerdict(t *testing.T) {
	code, out, _ := runCLI(t, "demo", "--format", "json")
	var doc struct {
		Verdict string `json:"verdict"`
		Cycles  []any  `json:"cycles"`
		Lanes   []any  `json:"lanes"`
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	if code != exitNotOptimal || doc.Verdict != "not-optimal" || len(doc.Cycles) == 0 || len(doc.Lanes) < 30 {
		t.Fatalf("exit %d, verdict %q, %d cycles, %d lanes", code, doc.Verdict, len(doc.Cycles), len(doc.Lanes))
	}
	// Same input, same output.
	_, again, _ := runCLI(t, "demo", "--format", "json")
	if again != out {
		t.Error("two runs of the demo differ")
	}
}

func TestDemoWrite(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "mine")
	if code, _, errText := runCLI(t, "demo", "--write", dir); code != exitOptimal {
		t.Fatalf("exit %d: %s", code, errText)
	}
	code, _, _ := runCLI(t, "audit", filepath.Join(dir, "lanes.csv"), "--nodes", filepath.Join(dir, "nodes.csv"))
	if code != exitNotOptimal {
		t.Fatalf("written demo audits with exit %d, want 1", code)
	}
	// A second write must not overwrite.
	if err := os.WriteFile(filepath.Join(dir, "lanes.csv"), []byte("mine"), 0o644); err != nil {
		t.Fatal(err)
	}
	if code, _, _ := runCLI(t, "demo", "--write", dir); code != exitBadInput {
		t.Fatalf("second write: exit %d, want 4", code)
	}
	if b, _ := os.ReadFile(filepath.Join(dir, "lanes.csv")); string(b) != "mine" {
		t.Fatal("demo --write overwrote a file")
	}
}

func TestOutputNeverOverInput(t *testing.T) {
	dir := t.TempDir()
	src, err := os.ReadFile("../../testdata/reference/glpk_sample.min")
	if err != nil {
		t.Fatal(err)
	}
	net := filepath.Join(dir, "net.min")
	plan := filepath.Join(dir, "plan.flow")
	os.WriteFile(net, src, 0o644)
	p, _ := os.ReadFile("../../testdata/reference/glpk_sample.flow")
	os.WriteFile(plan, p, 0o644)
	if code, _, _ := runCLI(t, "audit", net, plan, "-o", plan); code != exitBadInput {
		t.Fatalf("exit %d, want 4", code)
	}
	if b, _ := os.ReadFile(plan); !bytes.Equal(b, p) {
		t.Fatal("plan file changed")
	}
	out := filepath.Join(dir, "audit.md")
	if code, _, errText := runCLI(t, "audit", net, plan, "-o", out, "--format", "markdown"); code != exitOptimal {
		t.Fatalf("exit %d: %s", code, errText)
	}
	if b, _ := os.ReadFile(out); !bytes.HasPrefix(b, []byte("# lanecert audit")) {
		t.Fatalf("output %q", b)
	}
}

func TestHelpNamesExitCodes(t *testing.T) {
	_, out, _ := runCLI(t, "audit", "--help")
	for _, want := range []string{"0  the plan is optimal", "4  bad input or usage", "--tolerance", "--col"} {
		if !strings.Contains(out, want) {
			t.Errorf("audit --help lacks %q", want)
		}
	}
}

// TestRepairRoundTrip: repair the demo plan, write it in each format, read
// it back and audit it: the verdict must be optimal.
func TestRepairRoundTrip(t *testing.T) {
	dir := t.TempDir()
	if code, _, errText := runCLI(t, "demo", "--write", dir); code != exitOptimal {
		t.Fatalf("demo --write: %d %s", code, errText)
	}
	lanes, nodes := filepath.Join(dir, "lanes.csv"), filepath.Join(dir, "nodes.csv")
	for _, out := range []string{"fixed.csv", "fixed.flow"} {
		path := filepath.Join(dir, out)
		code, _, errText := runCLI(t, "repair", lanes, "--nodes", nodes, "-o", path)
		if code != exitOptimal || !strings.Contains(errText, "lane(s) changed") {
			t.Fatalf("repair -o %s: exit %d, stderr %q", out, code, errText)
		}
		args := []string{"audit", path, "--nodes", nodes}
		if strings.HasSuffix(out, ".flow") {
			args = []string{"audit", lanes, "--nodes", nodes, "--plan", path}
		}
		if code, stdout, _ := runCLI(t, args...); code != exitOptimal {
			t.Fatalf("audit of repaired %s: exit %d\n%s", out, code, stdout)
		}
	}
	code, stdout, _ := runCLI(t, "solve", lanes, "--nodes", nodes, "--format", "json")
	if code != exitOptimal || !strings.Contains(stdout, `"schema": "lanecert.plan/1"`) {
		t.Fatalf("solve --format json: exit %d\n%s", code, stdout)
	}
}

func TestSolveStatuses(t *testing.T) {
	dir := t.TempDir()
	infeasible := filepath.Join(dir, "short.min")
	os.WriteFile(infeasible, []byte("p min 2 1\nn 1 5\nn 2 -5\na 1 2 0 3 1\n"), 0o644)
	code, _, errText := runCLI(t, "solve", infeasible)
	// By hand: 5 demanded, lane capacity 3: 2 units short.
	if code != exitNetworkInfeasible || !strings.Contains(errText, "at least 2 units") {
		t.Fatalf("infeasible: exit %d, stderr %q", code, errText)
	}
	code, out, _ := runCLI(t, "audit", infeasible, "--plan", filepath.Join(dir, "none.flow"))
	if code != exitBadInput {
		t.Fatalf("missing plan file: exit %d %s", code, out)
	}
	plan := filepath.Join(dir, "short.flow")
	os.WriteFile(plan, []byte("f 1 2 3\n"), 0o644)
	code, out, _ = runCLI(t, "audit", infeasible, plan, "--format", "json")
	if code != exitNetworkInfeasible || !strings.Contains(out, `"verdict": "network-infeasible"`) || !strings.Contains(out, `"shortfall": "2"`) {
		t.Fatalf("audit of infeasible network: exit %d\n%s", code, out)
	}
	unbounded := filepath.Join(dir, "loop.min")
	os.WriteFile(unbounded, []byte("p min 2 2\na 1 2 0 inf -3\na 2 1 0 inf 1\n"), 0o644)
	code, _, errText = runCLI(t, "solve", unbounded)
	if code != exitNotOptimal || !strings.Contains(errText, "without limit") {
		t.Fatalf("unbounded: exit %d, stderr %q", code, errText)
	}
}

// TestWhy: the explanation's cycle, summed by hand from the rates it
// lists, equals the lane's rate minus its break-even rate.
func TestWhy(t *testing.T) {
	dir := t.TempDir()
	runCLI(t, "demo", "--write", dir)
	lanes, nodes := filepath.Join(dir, "lanes.csv"), filepath.Join(dir, "nodes.csv")
	code, out, errText := runCLI(t, "why", lanes, "--nodes", nodes, "L09")
	if code != exitOptimal {
		t.Fatalf("exit %d: %s", code, errText)
	}
	var breakEven, change string
	var sum float64 // only to cross-check the printed figures, not a verdict
	for _, line := range strings.Split(out, "\n") {
		if v, ok := strings.CutPrefix(line, "Break-even rate: "); ok {
			breakEven = strings.TrimSuffix(strings.Fields(v)[0], ".")
		}
		if v, ok := strings.CutPrefix(line, "  cost change per unit: "); ok && change == "" {
			change = strings.Fields(v)[0]
		}
		if strings.HasPrefix(line, "  +1 on lane ") || strings.HasPrefix(line, "  -1 on lane ") {
			f := strings.Fields(line)
			var r float64
			fmt.Sscan(f[len(f)-1], &r)
			if f[0] == "-1" {
				r = -r
			}
			sum += r
		}
	}
	// L09's rate is 19.40 (demo/lanes.csv); its break-even plus the cost
	// change of one more unit must give it back.
	be, _ := flow.ParseDecimal(breakEven)
	ch, _ := flow.ParseDecimal(change)
	if be.Mant+ch.Mant != 1940 || be.Places != 2 {
		t.Fatalf("break-even %q + change %q != 19.40\n%s", breakEven, change, out)
	}
	if fmt.Sprintf("%.2f", sum) != change {
		t.Fatalf("listed rates sum to %.2f, printed change %s", sum, change)
	}
	if code, _, _ := runCLI(t, "why", lanes, "--nodes", nodes, "L99"); code != exitBadInput {
		t.Fatalf("unknown lane: exit %d", code)
	}
}

func TestBids(t *testing.T) {
	dir := t.TempDir()
	runCLI(t, "demo", "--write", dir)
	bids := filepath.Join(dir, "bids.csv")
	os.WriteFile(bids, []byte("bid,from,to,rate,max\nQ1,Plant Corvel,DC Quillmoor,6.50,120\nQ2,DC Brightmere,Moorgate Deli,8.35,\n"), 0o644)
	lanes, nodes := filepath.Join(dir, "lanes.csv"), filepath.Join(dir, "nodes.csv")
	code, out, errText := runCLI(t, "bids", lanes, "--nodes", nodes, bids, "--format", "json")
	if code != exitOptimal {
		t.Fatalf("exit %d: %s", code, errText)
	}
	var doc struct {
		Bids []struct {
			ID         string  `json:"id"`
			Used       bool    `json:"used"`
			SameAsLane *string `json:"same_as_lane"`
		} `json:"bids"`
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	// Q2 repeats lane L29 of the demo exactly.
	if len(doc.Bids) != 2 || doc.Bids[1].SameAsLane == nil || *doc.Bids[1].SameAsLane != "L29" {
		t.Fatalf("bids %+v", doc.Bids)
	}
	os.WriteFile(bids, []byte("bid,from,to,rate\nQ1,Plant Nowhere,DC Quillmoor,6.50\n"), 0o644)
	code, _, errText = runCLI(t, "bids", lanes, "--nodes", nodes, bids)
	if code != exitBadInput || !strings.Contains(errText, "bids.csv:2:4: from") {
		t.Fatalf("exit %d, stderr %q", code, errText)
	}
}

// shortDemo writes the demo with Larkspur Stores cut off: its three lanes in
// are capped at 100 + 20 + 10 = 130 units for a demand of 160.
func shortDemo(t *testing.T) (lanes, nodes, dir string) {
	t.Helper()
	dir = t.TempDir()
	runCLI(t, "demo", "--write", dir)
	lanes, nodes = filepath.Join(dir, "lanes.csv"), filepath.Join(dir, "nodes.csv")
	b, _ := os.ReadFile(lanes)
	s := strings.NewReplacer(
		"L25,DC Brightmere,Larkspur Stores,7.20,0,,160", "L25,DC Brightmere,Larkspur Stores,7.20,0,100,160",
		"L27,DC Quillmoor,Larkspur Stores,12.60,0,,0", "L27,DC Quillmoor,Larkspur Stores,12.60,0,20,0",
		"L33,Plant Corvel,Larkspur Stores,19.90,0,80,0", "L33,Plant Corvel,Larkspur Stores,19.90,0,10,0",
	).Replace(string(b))
	short := filepath.Join(dir, "short.csv")
	os.WriteFile(short, []byte(s), 0o644)
	return short, nodes, dir
}

func TestNetworkInfeasibleCut(t *testing.T) {
	lanes, nodes, _ := shortDemo(t)
	code, out, _ := runCLI(t, "audit", lanes, "--nodes", nodes, "--format", "json")
	var doc struct {
		Verdict string `json:"verdict"`
		Cut     struct {
			Nodes     []string `json:"nodes"`
			Demand    string   `json:"demand"`
			Reach     string   `json:"reachable_supply"`
			Shortfall string   `json:"shortfall"`
			FullLanes []string `json:"full_lanes"`
		} `json:"cut"`
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	// By hand: demand 160, capacity in 130, 30 short.
	c := doc.Cut
	if code != exitNetworkInfeasible || doc.Verdict != "network-infeasible" || len(c.Nodes) != 1 || c.Nodes[0] != "Larkspur Stores" ||
		c.Demand != "160" || c.Reach != "130" || c.Shortfall != "30" || strings.Join(c.FullLanes, ",") != "L25,L27,L33" {
		t.Fatalf("exit %d, doc %+v", code, doc)
	}
	// With a shortfall price the plan is judged with unmet demand priced.
	code, out, _ = runCLI(t, "audit", lanes, "--nodes", nodes, "--shortfall-price", "40", "--format", "json")
	if code != exitPlanInfeasible || !strings.Contains(out, `"optimal_cost": "18816.50"`) {
		t.Fatalf("shortfall price: exit %d\n%s", code, out)
	}
}

func TestExtend(t *testing.T) {
	lanes, nodes, dir := shortDemo(t)
	code, out, errText := runCLI(t, "extend", lanes, "--nodes", nodes, "--per-km", "0.05", "--per-unit", "4", "--format", "json")
	if code != exitOptimal {
		t.Fatalf("exit %d: %s", code, errText)
	}
	var doc struct {
		Estimated bool `json:"estimated_rates"`
		Feasible  bool `json:"feasible"`
		Added     []struct {
			To string `json:"to"`
		} `json:"added_lanes"`
		Cut *struct{} `json:"cut"`
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	if !doc.Estimated || !doc.Feasible || doc.Cut == nil || len(doc.Added) == 0 || doc.Added[0].To != "Larkspur Stores" {
		t.Fatalf("doc %+v\n%s", doc, out)
	}
	// --one-lane: the best single lane among the proposed ones, exact.
	code, out, errText = runCLI(t, "extend", lanes, "--nodes", nodes, "--per-km", "0.05", "--per-unit", "4", "--format", "json", "--one-lane")
	var one struct {
		Feasible bool   `json:"feasible"`
		Method   string `json:"method"`
		Exact    bool   `json:"exact"`
		Added    []struct {
			To string `json:"to"`
		} `json:"added_lanes"`
	}
	if code != exitOptimal || json.Unmarshal([]byte(out), &one) != nil {
		t.Fatalf("--one-lane: exit %d: %s\n%s", code, errText, out)
	}
	if !one.Feasible || !one.Exact || len(one.Added) != 1 || one.Added[0].To != "Larkspur Stores" || !strings.Contains(one.Method, "single") {
		t.Fatalf("--one-lane: %+v\n%s", one, out)
	}
	// The demo's candidate file holds no lane into Larkspur Stores: still short.
	code, _, _ = runCLI(t, "extend", lanes, "--nodes", nodes, "--candidates", filepath.Join(dir, "candidates.csv"))
	if code != exitNetworkInfeasible {
		t.Fatalf("exit %d, want 3", code)
	}
	bad := filepath.Join(dir, "bad.csv")
	os.WriteFile(bad, []byte("from,to,rate,fixed\nPlant Corvel,Larkspur Stores,5,-2\n"), 0o644)
	code, _, errText = runCLI(t, "extend", lanes, "--nodes", nodes, "--candidates", bad)
	if code != exitBadInput || !strings.Contains(errText, "bad.csv:2:") || !strings.Contains(errText, "fixed") {
		t.Fatalf("exit %d, stderr %q", code, errText)
	}
}

// TestShortfallPricePerNode: a shortfall_price column overrides the
// default: a price of 1 at Larkspur Stores (below any delivery there) makes
// the optimum cheaper than with the default 1000 everywhere.
func TestShortfallPricePerNode(t *testing.T) {
	lanes, nodes, dir := shortDemo(t)
	b, _ := os.ReadFile(nodes)
	lines := strings.Split(strings.TrimSpace(string(b)), "\n")
	lines[0] += ",shortfall_price"
	for i := 1; i < len(lines); i++ {
		if strings.HasPrefix(lines[i], "Larkspur Stores,") {
			lines[i] += ",1"
		} else {
			lines[i] += ","
		}
	}
	priced := filepath.Join(dir, "priced.csv")
	os.WriteFile(priced, []byte(strings.Join(lines, "\n")+"\n"), 0o644)
	code, out, errText := runCLI(t, "solve", lanes, "--nodes", priced, "--format", "csv")
	if code != exitNetworkInfeasible {
		t.Fatalf("without a price the network is short: exit %d %s %s", code, out, errText)
	}
	optimal := func(nodeFile string) float64 {
		code, out, _ := runCLI(t, "audit", lanes, "--nodes", nodeFile, "--shortfall-price", "1000", "--format", "json", "--no-ranges")
		var doc struct {
			Optimal string `json:"optimal_cost"`
		}
		if code != exitPlanInfeasible || json.Unmarshal([]byte(out), &doc) != nil || !strings.Contains(out, `"shortfall_price": "1000"`) {
			t.Fatalf("exit %d\n%s", code, out)
		}
		var v float64 // only to order two exact costs
		fmt.Sscan(doc.Optimal, &v)
		return v
	}
	if a, b := optimal(priced), optimal(nodes); !(a < b) {
		t.Fatalf("optimum with a per-node price of 1: %v, with 1000 everywhere: %v", a, b)
	}
}

// TestGridRoundTrip: a tableau grid (Winston's Powerco example, see
// testdata/tableau/README.md) solved to a grid, read back, audits optimal.
func TestGridRoundTrip(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "best.csv")
	grid := "../../testdata/tableau/powerco.csv"
	if code, _, errText := runCLI(t, "solve", grid, "-o", out); code != exitOptimal {
		t.Fatalf("solve: exit %d %s", code, errText)
	}
	b, _ := os.ReadFile(out)
	if !strings.HasPrefix(string(b), "Powerco,City 1,") {
		t.Fatalf("not written as a grid:\n%s", b)
	}
	code, text, _ := runCLI(t, "audit", grid, out, "--format", "json", "--no-ranges")
	// Winston, Powerco: optimal cost 1020 (edition from memory).
	if code != exitOptimal || !strings.Contains(text, `"plan_cost": "1020"`) {
		t.Fatalf("audit of the written grid: exit %d\n%s", code, text)
	}
}

func TestReportAndDOT(t *testing.T) {
	dir := t.TempDir()
	page := filepath.Join(dir, "audit.html")
	ref := "../../testdata/reference/"
	if code, _, errText := runCLI(t, "report", ref+"glpk_sample.min", ref+"glpk_sample.flow", "-o", page); code != exitOptimal {
		t.Fatalf("report: exit %d %s", code, errText)
	}
	b, _ := os.ReadFile(page)
	if !bytes.HasPrefix(b, []byte("<!DOCTYPE html>")) || !bytes.Contains(b, []byte("data-lane")) {
		t.Fatalf("not an HTML report: %.200s", b)
	}
	code, out, _ := runCLI(t, "audit", ref+"glpk_sample.min", ref+"glpk_sample.flow", "--format", "dot")
	// 14 arcs in glpk_sample.min: 14 edges in the drawing.
	if code != exitOptimal || !strings.HasPrefix(out, "digraph") || strings.Count(out, " -> ") != 14 {
		t.Fatalf("dot: exit %d, %d edges\n%s", code, strings.Count(out, " -> "), out)
	}
}

// TestGridRepairRoundTrip: Powerco's north-west-corner plan (a starting plan
// by the common north-west-corner rule: cost 1180 by hand) is repaired into
// a grid, read back, and audits optimal at the published 1020 (Winston,
// edition from memory).
func TestGridRepairRoundTrip(t *testing.T) {
	dir := t.TempDir()
	grid := "../../testdata/tableau/powerco.csv"
	nw := filepath.Join(dir, "nw.csv")
	os.WriteFile(nw, []byte("Powerco,City 1,City 2,City 3,City 4\nPlant 1,35,,,\nPlant 2,10,20,20,\nPlant 3,,,10,30\n"), 0o644)
	code, out, _ := runCLI(t, "audit", grid, nw, "--format", "json", "--no-ranges")
	if code != exitNotOptimal || !strings.Contains(out, `"plan_cost": "1180"`) {
		t.Fatalf("north-west plan: exit %d\n%s", code, out)
	}
	fixed := filepath.Join(dir, "fixed.csv")
	if code, _, errText := runCLI(t, "repair", grid, nw, "-o", fixed); code != exitOptimal {
		t.Fatalf("repair: exit %d %s", code, errText)
	}
	b, _ := os.ReadFile(fixed)
	if !strings.HasPrefix(string(b), "Powerco,City 1,") {
		t.Fatalf("repair not written as a grid:\n%s", b)
	}
	code, out, _ = runCLI(t, "audit", grid, fixed, "--format", "json", "--no-ranges")
	if code != exitOptimal || !strings.Contains(out, `"plan_cost": "1020"`) {
		t.Fatalf("repaired grid: exit %d\n%s", code, out)
	}
}

// TestGridAudit: the audit of Powerco's published optimal plan in its
// tableau grid. The bracketed reduced costs are Winston's c - u - v values
// for the non-basic cells with u = (0, 3, 3), v = (6, 6, 10, 2) (Powerco
// example, edition from memory): 2, 7, 3, 2, 5, 3.
func TestGridAudit(t *testing.T) {
	code, out, _ := runCLI(t, "audit", "../../testdata/tableau/powerco.csv", "../../testdata/tableau/powerco_plan.csv", "--format", "grid")
	want := []string{
		"Powerco,City 1,City 2,City 3,City 4,potential",
		"Plant 1,[2],10,25,[7],3",
		"Plant 2,45,[3],5,[2],0",
		"Plant 3,[5],10,[3],30,0",
		"potential,9,9,13,5,",
	}
	if code != exitOptimal || strings.TrimSpace(out) != strings.Join(want, "\n") {
		t.Fatalf("exit %d, got\n%s", code, out)
	}
}

// TestProgressLines: the progress line shows the quantity still to place
// while a first plan is sought, then the cost, each overwriting the last,
// and done clears it; a writer that is not a terminal gets nothing.
func TestProgressLines(t *testing.T) {
	f, err := os.CreateTemp(t.TempDir(), "progress")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	if progressTo(f) != nil {
		t.Fatal("a regular file was taken for a terminal")
	}
	n := &flow.Network{QtyPlaces: 3, RatePlaces: 2}
	p := &progress{f: f}
	cb := p.callbacks(n)
	cb.Placing(16384, 12500)
	cb.Cost(32768, flow.WideFrom(1234567))
	p.done()
	b, err := os.ReadFile(f.Name())
	if err != nil {
		t.Fatal(err)
	}
	want := "\r\033[Klanecert: solving, 16384 pivots, finding a first plan: 12.500 still to place" +
		"\r\033[Klanecert: solving, 32768 pivots, cost 12.34567\r\033[K"
	if string(b) != want {
		t.Fatalf("progress output %q, want %q", b, want)
	}
	var none *progress
	if none.callbacks(n) != nil {
		t.Fatal("callbacks without a terminal")
	}
}

// TestExtendFallsWithoutLimit: a network lane at a negative rate and three
// candidates that close a cycle of negative cost without capacity only
// together. The command must say that the cost falls without limit (exit
// 4), not report that no candidate lowers the cost.
func TestExtendFallsWithoutLimit(t *testing.T) {
	dir := t.TempDir()
	write := func(name, text string) string {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	lanes := write("lanes.csv", "lane,from,to,rate\nL1,a,d,10\nL2,x,a,-30\n")
	nodes := write("nodes.csv", "node,supply\na,1\nb,0\nc,0\nx,0\nd,-1\n")
	cands := write("cands.csv", "id,from,to,rate,fixed\nab,a,b,5,100\nbc,b,c,5,100\ncx,c,x,5,100\n")
	code, out, errText := runCLI(t, "extend", lanes, "--nodes", nodes, "--candidates", cands)
	if code != exitBadInput || !strings.Contains(errText, "with candidates ab, bc and cx added the cost falls without limit") {
		t.Fatalf("exit %d, stdout %q, stderr %q; want 4 and the cost falling without limit", code, out, errText)
	}
}

// TestAuditOverflowLeftOut: plans whose rates are near the int64 limit
// still get their verdict; what exact 64-bit arithmetic cannot hold is
// left out, and every report format says which part and why (common
// practice: hand-made cases, rates 2^62).
func TestAuditOverflowLeftOut(t *testing.T) {
	const r = "4611686018427387904" // 2^62
	cases := []struct {
		name, min, flow, note string
	}{
		// The only other route from 1 to 4 costs 3·2^62, which is the
		// reduced cost of a lane closing it in any spanning tree: the
		// solve cannot run in int64.
		{"solve", "p min 4 4\nn 1 1\nn 4 -1\na 1 4 0 2 0\na 1 2 0 2 " + r + "\na 2 3 0 2 " + r + "\na 3 4 0 2 " + r + "\n",
			"f 1 4 1\n", "the optimal cost, gap and repair"},
		// Lanes 2-1 and 3-1 cost 0 and carry nothing, so potentials of 0
		// price every lane within int64 (each reduced cost at most 2^62);
		// only the route from 1 to 4 around lane 1-4 (three lanes at
		// 2^62) passes the int64 range.
		{"ranges", "p min 4 6\nn 1 1\nn 4 -1\na 2 1 0 2 0\na 3 1 0 2 0\na 1 4 0 2 0\na 1 2 0 2 " + r + "\na 2 3 0 2 " + r + "\na 3 4 0 2 " + r + "\n",
			"f 1 4 1\n", "the rate ranges and node prices"},
	}
	for _, c := range cases {
		dir := t.TempDir()
		net, plan := filepath.Join(dir, "wide.min"), filepath.Join(dir, "wide.flow")
		if err := os.WriteFile(net, []byte(c.min), 0o644); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(plan, []byte(c.flow), 0o644); err != nil {
			t.Fatal(err)
		}
		code, out, errText := runCLI(t, "audit", net, plan, "--format", "json")
		if code != exitOptimal {
			t.Fatalf("%s: exit %d, want %d; stderr %q", c.name, code, exitOptimal, errText)
		}
		var doc struct {
			Verdict string   `json:"verdict"`
			LeftOut []string `json:"left_out"`
			Ranges  string   `json:"ranges_for"`
			Optimal *string  `json:"optimal_cost"`
		}
		if err := json.Unmarshal([]byte(out), &doc); err != nil {
			t.Fatal(err)
		}
		if doc.Verdict != "optimal" || doc.Ranges != "" {
			t.Fatalf("%s: verdict %q, ranges for %q", c.name, doc.Verdict, doc.Ranges)
		}
		if (doc.Optimal == nil) != (c.name == "solve") {
			t.Fatalf("%s: optimal cost %v", c.name, doc.Optimal)
		}
		found := false
		for _, n := range doc.LeftOut {
			found = found || strings.HasPrefix(n, c.note) && strings.Contains(n, flow.ErrOverflow.Error())
		}
		if !found || len(doc.LeftOut) != 1 {
			t.Fatalf("%s: want one part left out, %q: %q", c.name, c.note, doc.LeftOut)
		}
		for _, format := range []string{"table", "markdown", "html"} {
			_, text, _ := runCLI(t, "audit", net, plan, "--format", format)
			if !strings.Contains(text, "Left out") || !strings.Contains(text, c.note) {
				t.Fatalf("%s: the %s report does not say what is left out", c.name, format)
			}
		}
		code, _, errText = runCLI(t, "why", net, plan, "3")
		if code != exitBadInput || !strings.Contains(errText, flow.ErrOverflow.Error()) {
			t.Fatalf("%s: why: exit %d, stderr %q", c.name, code, errText)
		}
	}
}

// TestHugeRatesEveryCommand runs every command on random networks whose
// rates, or else quantities, reach 2^58 to 2^62, so that sums pass the
// int64 range. No command
// may panic or wrap: an exit status of 4 must name the overflow (or one of
// the other known reasons), and every cost the audit states must equal the
// cost of its plan computed here in big integers; the optimal cost must
// equal that of the plan lanecert solve writes. Random networks from
// internal/randnet (common practice: property test).
func TestHugeRatesEveryCommand(t *testing.T) {
	rng := rand.New(rand.NewPCG(longrun.Seed(t, 23), 5))
	dir := t.TempDir()
	net, plan, solved := filepath.Join(dir, "n.min"), filepath.Join(dir, "n.flow"), filepath.Join(dir, "s.flow")
	cands := filepath.Join(dir, "c.csv")
	bigCost := func(n *flow.Network, y []int64) *big.Int {
		c := new(big.Int)
		for e, q := range y {
			c.Add(c, new(big.Int).Mul(big.NewInt(n.Rate[e]), big.NewInt(q)))
		}
		return c
	}
	write := func(path string, f func(io.Writer) error) {
		var buf bytes.Buffer
		if err := f(&buf); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(path, buf.Bytes(), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	overflowed, checked := 0, 0
	codes := map[string]int{}
	for i := range longrun.Cases(t, 80) {
		o := randnet.RandomOptions(rng)
		o.MaxRate, o.QtyPlaces, o.RatePlaces = 1000, 0, 0
		n := randnet.Network(rng, o)
		if i%2 == 0 {
			var most int64 = 1
			for _, r := range n.Rate {
				most = max(most, r, -r)
			}
			k := (int64(1) << (58 + rng.IntN(5))) / most
			for e, r := range n.Rate {
				n.Rate[e] = r*k - rng.Int64N(k) + k/2
			}
		} else {
			// Quantities near the limit instead: supplies, minimums and
			// capacities times one factor keep the network feasible.
			var most int64 = 1
			for _, q := range n.Supply {
				most = max(most, q, -q)
			}
			for e := range n.Tail {
				if n.Upper[e] != flow.NoLimit {
					most = max(most, n.Upper[e])
				}
			}
			k := (int64(1) << (58 + rng.IntN(5))) / most
			for v := range n.Supply {
				n.Supply[v] *= k
			}
			for e := range n.Tail {
				n.Lower[e] *= k
				if n.Upper[e] != flow.NoLimit {
					n.Upper[e] *= k
				}
			}
		}
		y := append([]int64(nil), n.Lower...)
		if opt, err := dual.Optimize(n, nil, nil); err == nil && opt.Status == flow.Optimal {
			copy(y, opt.Flow)
			if e := rng.IntN(len(y)); y[e] < n.Upper[e] {
				y[e]++ // most plans then break a balance or lose optimality
			}
		}
		write(net, func(w io.Writer) error { return flow.WriteDIMACS(w, n) })
		write(cands, func(w io.Writer) error {
			// Candidate lanes (and bids) at rates up to 2^62.
			fmt.Fprintln(w, "from,to,rate,max")
			for range 1 + rng.IntN(4) {
				fmt.Fprintf(w, "%d,%d,%d,%d\n", 1+rng.IntN(len(n.Nodes)), 1+rng.IntN(len(n.Nodes)), rng.Int64N(int64(1)<<62), 1+rng.IntN(5))
			}
			return nil
		})
		write(plan, func(w io.Writer) error { return flow.WriteDIMACSPlan(w, n, y, flow.Wide{}) })
		for _, args := range [][]string{
			{"audit", net, plan, "--format", "json", "--ranges"},
			{"audit", net, plan, "--format", "markdown", "--all-lanes"},
			{"report", net, plan, "-o", filepath.Join(dir, "r.html")},
			{"repair", net, plan, "-o", filepath.Join(dir, "p.flow")},
			{"why", net, plan, "1"},
			{"solve", net, "-o", solved},
			{"extend", net, "--candidates", cands, "--format", "json"},
			{"bids", net, plan, cands, "--format", "json"},
		} {
			code, out, errText := runCLI(t, args...)
			codes[fmt.Sprint(args[0], code)]++
			if code < exitOptimal || code > exitBadInput {
				t.Fatalf("case %d %v: exit %d", i, args[0], code)
			}
			if code == exitBadInput {
				if !strings.Contains(errText, flow.ErrOverflow.Error()) && !strings.Contains(errText, "no optimum") {
					t.Fatalf("case %d %v: %s", i, args[0], errText)
				}
				overflowed++
				continue
			}
			if args[0] != "audit" || args[2] != plan || args[4] != "json" {
				continue
			}
			var doc struct {
				Verdict  string  `json:"verdict"`
				PlanCost string  `json:"plan_cost"`
				Optimal  *string `json:"optimal_cost"`
				Gap      *string `json:"gap"`
			}
			if err := json.Unmarshal([]byte(out), &doc); err != nil {
				t.Fatal(err)
			}
			if want := bigCost(n, y).String(); doc.PlanCost != want {
				t.Fatalf("case %d: plan cost %s, exactly %s", i, doc.PlanCost, want)
			}
			if doc.Optimal == nil {
				continue
			}
			// The plan solve writes (run now, before the next case). A
			// cold solve needs the total supply within int64, which the
			// audit's start from the plan does not: then repair's plan.
			c, _, e := runCLI(t, "solve", net, "-o", solved)
			if c == exitBadInput && strings.Contains(e, "total supply") && strings.Contains(e, flow.ErrOverflow.Error()) {
				c, _, e = runCLI(t, "repair", net, plan, "-o", solved)
			}
			if c != exitOptimal {
				t.Fatalf("case %d: solve exit %d after the audit found the optimum: %s", i, c, e)
			}
			in, err := flow.LoadFiles(flow.Files{Network: net, Plan: solved})
			if err != nil {
				t.Fatal(err)
			}
			opt := bigCost(n, in.Plan.Flow)
			if *doc.Optimal != opt.String() {
				t.Fatalf("case %d: optimal cost %s, the solved plan costs %s", i, *doc.Optimal, opt)
			}
			gap := new(big.Int).Sub(bigCost(n, y), opt)
			if feasible := doc.Verdict == "optimal" || doc.Verdict == "not-optimal"; feasible != (doc.Gap != nil) || (feasible && *doc.Gap != gap.String()) {
				t.Fatalf("case %d (%s): gap %v, exactly %s", i, doc.Verdict, doc.Gap, gap)
			}
			if (doc.Verdict == "optimal") != (gap.Sign() == 0) && doc.Gap != nil {
				t.Fatalf("case %d: verdict %s with a gap of %s", i, doc.Verdict, gap)
			}
			checked++
		}
	}
	t.Logf("%d audits' costs checked exactly; %d runs reported an overflow; exit statuses %v", checked, overflowed, codes)
	if checked < 20 || overflowed < 5 {
		t.Errorf("%d checked, %d overflowed: the test no longer covers both", checked, overflowed)
	}
}
