package main

import (
	"bytes"
	"os"
	"path/filepath"
	"reflect"
	"strconv"
	"strings"
	"testing"
)

// benchOutput is go test's output for BenchmarkSolveFiles on one file (the
// format of the testing package; pivots and lanes are reported by the
// benchmark itself).
const benchOutput = `goos: linux
goarch: amd64
pkg: lanecert/flow
cpu: Intel(R) Xeon(R) Processor
BenchmarkSolveFiles/net_a/cold-2         	       5	 136000000 ns/op	    100000 lanes	     27996 pivots	 2366967 B/op	      31 allocs/op
BenchmarkSolveFiles/net_a/repair10-2         	      10	  25107234 ns/op	        20.00 pivots	 8150799 B/op	     157 allocs/op
BenchmarkSolveFiles/net_a/repair10s12-2      	      10	  13683112 ns/op	        11.00 pivots	 5388849 B/op	     102 allocs/op
BenchmarkSolveFiles/net_a/repair10s9-2      	      10	  1500000 ns/op	        3170 pivots	 5388849 B/op	     102 allocs/op
BenchmarkSolveFiles/net_a/repair10s13-2      	      10	  2600000 ns/op	   2100000 med-ns/op	        41.00 pivots	 5388849 B/op	     102 allocs/op
BenchmarkSolveFiles/net_b/cold-2         	       5	 1 ns/op	    1 lanes	     1 pivots
PASS
`

func TestParseBench(t *testing.T) {
	got, err := parseBench([]byte(benchOutput), "net_a")
	if err != nil {
		t.Fatal(err)
	}
	want := map[string]timing{
		"cold":        {136000000, 27996},
		"repair10":    {25107234, 20},
		"repair10s12": {13683112, 11},
		"repair10s9":  {1500000, 3170},
		"repair10s13": {2100000, 41}, // the median, not the mean
	}
	if !reflect.DeepEqual(got, want) {
		t.Fatalf("got %v\nwant %v", got, want)
	}
	if keys := repairKeys(got); !reflect.DeepEqual(keys, []string{"repair10", "repair10s9", "repair10s12", "repair10s13"}) {
		t.Fatalf("repair keys in seed order: %v", keys)
	}
	for _, bad := range []string{
		"PASS\n", // no cold solve
		strings.Replace(benchOutput, "PASS", "--- FAIL: BenchmarkSolveFiles/net_a/repair10\n    wrong answer\nFAIL", 1),
	} {
		if _, err := parseBench([]byte(bad), "net_a"); err == nil {
			t.Fatalf("no error for\n%s", bad)
		}
	}
}

func TestParseReference(t *testing.T) {
	out := "s 24217356\nc solver=NetworkSimplex nodes=10000 arcs=100000\nc parse_s=0.030863 solve_s=0.104533 total_s=0.135397\n"
	if sec, err := parseReference([]byte(out), "x.min"); err != nil || sec != 0.104533 {
		t.Fatalf("%v %v", sec, err)
	}
	for _, bad := range []string{"s 1\n", "solve_s=x\n"} {
		if _, err := parseReference([]byte(bad), "x.min"); err == nil {
			t.Fatalf("no error for %q", bad)
		}
	}
}

// TestRun runs the command with a stand-in reference and two stand-in
// test binaries (shell scripts printing fixed times), so the rounds, the
// minima, the folder handed to the benchmark and the tables are checked
// without timing anything.
func TestRun(t *testing.T) {
	dir := t.TempDir()
	file := filepath.Join(dir, "net_a.min")
	if err := os.WriteFile(file, []byte("p min 1 0\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	// The reference's times: 0.2 s, then 0.1 s (a counter file).
	ref := writeScript(t, dir, "ref", `n=$(cat "$0.n" 2>/dev/null || echo 0); echo $((n+1)) > "$0.n"
[ -f "$1" ] || exit 1
if [ "$n" = 0 ]; then echo "c solve_s=0.2"; else echo "c solve_s=0.1"; fi
exit 2`)
	// A test binary: it must get one folder holding the file, and the
	// seeds; its repair takes 30 ms in round one, 20 ms after.
	bench := func(name string, repairMs int) string {
		return writeScript(t, dir, name, `n=$(cat "$0.n" 2>/dev/null || echo 0); echo $((n+1)) > "$0.n"
[ -f "$LANECERT_BENCH_DIR/net_a.min" ] || { echo "no file"; exit 1; }
[ "$LANECERT_BENCH_SEEDS" = "11-12" ] || { echo "seeds $LANECERT_BENCH_SEEDS"; exit 1; }
r=`+strconv.Itoa(repairMs)+`; if [ "$n" = 0 ]; then r=$((r+10)); fi
echo "BenchmarkSolveFiles/net_a/cold-2 5 50000000 ns/op 100 pivots"
echo "BenchmarkSolveFiles/net_a/repair10-2 5 ${r}000000 ns/op 7.00 pivots"
echo "BenchmarkSolveFiles/net_a/repair10s12-2 5 ${r}000000 ns/op 9.00 pivots"
echo PASS`)
	}
	a, b := bench("a.test", 20), bench("b.test", 10)
	var out bytes.Buffer
	if err := run([]string{"-ref", ref, "-bench", a + "," + b, "-rounds", "2", "-seeds", "11-12", file}, &out); err != nil {
		t.Fatal(err)
	}
	got := out.String()
	// Minima: reference 100 ms; a's repairs 20 ms (0.20), b's 10 ms (0.10);
	// cold 50 ms (0.50); b against a: 0.50 per repair.
	for _, want := range []string{
		"| net_a | a.test | 100.0 | 50.0 | 0.50 | 0.20 0.20 | 0.20 | 0.20 |",
		"| net_a | b.test | 100.0 | 50.0 | 0.50 | 0.10 0.10 | 0.10 | 0.10 |",
		"| net_a | repair10s12 | 20.00 / 9 | 10.00 / 9 | 0.50 |",
		"| net_a | all repairs | 40.0 | 20.0 | 0.500 |",
	} {
		if !strings.Contains(got, want) {
			t.Fatalf("output lacks %q:\n%s", want, got)
		}
	}
	if err := run([]string{"-bench", a, file}, &out); err == nil {
		t.Fatal("no error without -ref")
	}
}

func writeScript(t *testing.T, dir, name, body string) string {
	t.Helper()
	p := filepath.Join(dir, name)
	if err := os.WriteFile(p, []byte("#!/bin/sh\n"+body+"\n"), 0o755); err != nil {
		t.Fatal(err)
	}
	return p
}
