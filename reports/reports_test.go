package reports_test

import (
	"bytes"
	"encoding/json"
	"flag"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"lanecert/dual"
	"lanecert/flow"
	"lanecert/reports"
)

var update = flag.Bool("update", false, "rewrite the golden files")

// fixture is an audit input for the golden files.
type fixture struct {
	name  string
	files flow.Files
	shown reports.Inputs
	tol   string
}

func fixtures() []fixture {
	return []fixture{
		{name: "demo", files: flow.Files{Network: "../cmd/lanecert/demo/lanes.csv", Nodes: "../cmd/lanecert/demo/nodes.csv"},
			shown: reports.Inputs{Network: "demo/lanes.csv", Nodes: "demo/nodes.csv", Plan: "demo/lanes.csv (flow column)"}},
		{name: "glpk_sample", files: flow.Files{Network: "../testdata/reference/glpk_sample.min", Plan: "../testdata/reference/glpk_sample.flow"},
			shown: reports.Inputs{Network: "glpk_sample.min", Plan: "glpk_sample.flow"}},
		{name: "infeasible", files: flow.Files{Network: "../testdata/audit/infeasible_lanes.csv", Nodes: "../testdata/audit/infeasible_nodes.csv",
			Table: flow.TableOptions{DecimalComma: true}},
			shown: reports.Inputs{Network: "infeasible_lanes.csv", Nodes: "infeasible_nodes.csv", Plan: "infeasible_lanes.csv (flow column)"}},
		{name: "tolerance", files: flow.Files{Network: "../testdata/audit/tolerance_lanes.csv", Nodes: "../testdata/audit/tolerance_nodes.csv"},
			shown: reports.Inputs{Network: "tolerance_lanes.csv", Nodes: "tolerance_nodes.csv", Plan: "tolerance_lanes.csv (flow column)"}, tol: "0.000001"},
	}
}

func build(t *testing.T, f fixture) *reports.Document {
	t.Helper()
	if f.tol != "" {
		d, err := flow.ParseDecimal(f.tol)
		if err != nil {
			t.Fatal(err)
		}
		f.files.Tolerance = &d
	}
	in, err := flow.LoadFiles(f.files)
	if err != nil {
		t.Fatal(err)
	}
	a, err := dual.Check(in.Net, in.Plan.Flow)
	if err != nil {
		t.Fatal(err)
	}
	f.shown.Tolerance = f.tol
	var x []int64
	if a.Verdict != dual.PlanInfeasible {
		x = in.Plan.Flow
	}
	o, err := dual.Optimize(in.Net, x, nil)
	if err != nil {
		t.Fatal(err)
	}
	d, err := reports.Build(a, o, f.shown, in.Plan.Rounded)
	if err != nil {
		t.Fatal(err)
	}
	if o.Status == flow.Optimal {
		s, err := dual.Ranges(in.Net, o.Flow, o.Potential)
		if err != nil {
			t.Fatal(err)
		}
		forPlan := "optimal-plan"
		if a.Verdict == dual.Optimal {
			forPlan = "plan"
		}
		d.AddRanges(o.Flow, s, forPlan)
	}
	return d
}

func golden(t *testing.T, name string, got []byte) {
	t.Helper()
	path := filepath.Join("testdata", name+".golden")
	if *update {
		if err := os.MkdirAll("testdata", 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(path, got, 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run go test ./reports -update to create it)", err)
	}
	if !bytes.Equal(got, want) {
		t.Errorf("%s differs from the golden file; got:\n%s", path, got)
	}
}

// TestGolden renders every fixture in every format and compares the bytes
// with testdata/*.golden (regenerate with -update after a deliberate change).
func TestGolden(t *testing.T) {
	formats := map[reports.Format]string{reports.Text: "txt", reports.JSON: "json", reports.CSV: "csv", reports.Markdown: "md"}
	for _, f := range fixtures() {
		for format, ext := range formats {
			t.Run(f.name+"."+ext, func(t *testing.T) {
				d := build(t, f)
				var buf bytes.Buffer
				if err := reports.Write(&buf, d, format, reports.Options{Rows: 12, MoreHint: " (all: --all-lanes)", Nodes: true}); err != nil {
					t.Fatal(err)
				}
				golden(t, f.name+"."+ext, buf.Bytes())
				// Byte for byte stable: a second build renders the same.
				var again bytes.Buffer
				if err := reports.Write(&again, build(t, f), format, reports.Options{Rows: 12, MoreHint: " (all: --all-lanes)", Nodes: true}); err != nil {
					t.Fatal(err)
				}
				if !bytes.Equal(buf.Bytes(), again.Bytes()) {
					t.Error("two renders of the same audit differ")
				}
			})
		}
	}
}

// TestJSONSchema checks the documented JSON fields and their types.
func TestJSONSchema(t *testing.T) {
	var buf bytes.Buffer
	if err := reports.Write(&buf, build(t, fixtures()[0]), reports.JSON, reports.Options{}); err != nil {
		t.Fatal(err)
	}
	var doc map[string]any
	if err := json.Unmarshal(buf.Bytes(), &doc); err != nil {
		t.Fatal(err)
	}
	for _, k := range []string{"schema", "verdict", "plan_cost", "dual_objective", "lanes", "nodes", "violations", "cycles", "caution"} {
		if _, ok := doc[k]; !ok {
			t.Errorf("JSON lacks %q", k)
		}
	}
	if doc["verdict"] != "not-optimal" {
		t.Errorf("verdict %v", doc["verdict"])
	}
	lane := doc["lanes"].([]any)[0].(map[string]any)
	for _, k := range []string{"id", "from", "to", "cost", "flow", "min", "max", "state", "reduced_cost"} {
		if _, ok := lane[k]; !ok {
			t.Errorf("lane lacks %q", k)
		}
		if v, ok := lane[k].(float64); ok {
			t.Errorf("lane field %q is a JSON number %v: numbers are exact strings", k, v)
		}
	}
	node := doc["nodes"].([]any)[0].(map[string]any)
	for _, k := range []string{"id", "supply", "net_out", "potential"} {
		if _, ok := node[k]; !ok {
			t.Errorf("node lacks %q", k)
		}
	}
}

// TestCSVInjection: cells that a spreadsheet would run as formulas are
// neutralised as the OWASP "CSV Injection" guidance describes (prefix a
// single quote to cells starting with =, +, -, @, tab or carriage return),
// numbers excepted.
func TestCSVInjection(t *testing.T) {
	got := reports.SafeCells([]string{"=1+2", "+x", "-x", "@SUM(A1)", "\tx", "\rx", "-12.5", "+3", "plain", ""})
	want := []string{"'=1+2", "'+x", "'-x", "'@SUM(A1)", "'\tx", "'\rx", "-12.5", "+3", "plain", ""}
	for i := range want {
		if got[i] != want[i] {
			t.Errorf("cell %d: got %q, want %q", i, got[i], want[i])
		}
	}
	var buf bytes.Buffer
	if err := reports.Write(&buf, build(t, fixtures()[2]), reports.CSV, reports.Options{}); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(buf.String(), `'=cmd|' /C calc'!A0`) {
		t.Errorf("formula cell not neutralised:\n%s", buf.String())
	}
}

func TestCautionInEveryHumanFormat(t *testing.T) {
	for _, f := range []reports.Format{reports.Text, reports.Markdown} {
		var buf bytes.Buffer
		if err := reports.Write(&buf, build(t, fixtures()[1]), f, reports.Options{}); err != nil {
			t.Fatal(err)
		}
		if !strings.Contains(buf.String(), "driving-hours") {
			t.Errorf("%s report lacks the caution", f)
		}
	}
}

func TestWriteAtomicRefusesInputs(t *testing.T) {
	dir := t.TempDir()
	in := filepath.Join(dir, "lanes.csv")
	if err := os.WriteFile(in, []byte("keep me"), 0o644); err != nil {
		t.Fatal(err)
	}
	err := reports.WriteAtomic(in, []string{in}, func(w io.Writer) error { return nil })
	if err == nil {
		t.Fatal("WriteAtomic wrote over an input")
	}
	if b, _ := os.ReadFile(in); string(b) != "keep me" {
		t.Fatal("input changed")
	}
	out := filepath.Join(dir, "out.txt")
	if err := reports.WriteAtomic(out, []string{in}, func(w io.Writer) error {
		_, err := w.Write([]byte("done"))
		return err
	}); err != nil {
		t.Fatal(err)
	}
	if b, _ := os.ReadFile(out); string(b) != "done" {
		t.Fatalf("out = %q", b)
	}
	entries, _ := os.ReadDir(dir)
	if len(entries) != 2 {
		t.Fatalf("temporary files left behind: %v", entries)
	}
}
