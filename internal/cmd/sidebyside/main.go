// Command sidebyside times lanecert's solver side by side with a
// reference solver on DIMACS files and prints the ratios as Markdown
// tables, for BENCHMARKS.md.
//
// In each round, for each file, the reference runs once and then each
// test binary of package flow runs BenchmarkSolveFiles on that file alone
// (a cold solve, then one repair per perturbation seed: the optimum moved
// around 10 cycles), so that all of them meet the same machine load; the
// tables keep each time's minimum over the rounds. Within a round each
// side counts its median solve: the reference's own (the kit's solvers
// report the median of their -n repeats) and the benchmark's med-ns/op
// (the median of its iterations; the mean, ns/op, from binaries built
// before that metric existed). The machines here are
// noisy (the same code moves by tens of percent from minute to minute), so
// only ratios measured this way are reported, never single times.
//
//	go test -c -o /tmp/flow.test ./flow
//	go run ./internal/cmd/sidebyside -ref '/tmp/kit/lemon_mcf -n 5' \
//	    -bench /tmp/flow.test -rounds 3 -seeds 11-22 a.min b.min
//
// On a machine whose cores differ under load, pin the whole run to one
// core (taskset -c 0 sidebyside ...): the reference and the test binaries
// inherit the pinning, so every program meets the same core.
//
// The reference is a command line, split at spaces, to which the file is
// appended; it must print its solve time as "solve_s=SECONDS" (as the
// measuring kit's solvers do). With several test binaries (-bench a,b: two
// builds of the solver) each gets a row per file, and a second table
// compares the last with the first repair by repair (time and pivots).
package main

import (
	"bufio"
	"bytes"
	"cmp"
	"errors"
	"flag"
	"fmt"
	"io"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"slices"
	"strconv"
	"strings"

	"lanecert/internal/stats"
)

func main() {
	if err := run(os.Args[1:], os.Stdout); err != nil {
		fmt.Fprintln(os.Stderr, "sidebyside:", err)
		os.Exit(1)
	}
}

func run(args []string, out io.Writer) error {
	fs := flag.NewFlagSet("sidebyside", flag.ContinueOnError)
	ref := fs.String("ref", "", "reference command (the file is appended); prints solve_s=SECONDS")
	benches := fs.String("bench", "", "test binaries of package flow, comma-separated (go test -c ./flow)")
	rounds := fs.Int("rounds", 3, "alternated rounds")
	seeds := fs.String("seeds", "11-22", "perturbation seeds of the repairs (LANECERT_BENCH_SEEDS)")
	iters := fs.Int("iters", 5, "iterations of each benchmark per round (-test.benchtime Nx)")
	if err := fs.Parse(args); err != nil {
		return err
	}
	files := fs.Args()
	if *ref == "" || *benches == "" || len(files) == 0 || *rounds < 1 || *iters < 1 {
		return errors.New("usage: sidebyside -ref CMD -bench BIN[,BIN...] [-rounds N] [-seeds LIST] [-iters N] FILE.min...")
	}
	bins := strings.Split(*benches, ",")
	refArgs := strings.Fields(*ref)
	scratch, err := os.MkdirTemp("", "sidebyside")
	if err != nil {
		return err
	}
	defer os.RemoveAll(scratch)

	var all []result
	for _, f := range files {
		abs, err := filepath.Abs(f)
		if err != nil {
			return err
		}
		name := strings.TrimSuffix(filepath.Base(f), ".min")
		// BenchmarkSolveFiles reads every .min file of a folder: one
		// folder per file.
		dir := filepath.Join(scratch, name)
		if err := os.MkdirAll(dir, 0o755); err != nil {
			return err
		}
		if err := os.Symlink(abs, filepath.Join(dir, name+".min")); err != nil {
			return err
		}
		res := result{name: name, refSec: math.Inf(1), bins: make([]map[string]timing, len(bins))}
		for i := range bins {
			res.bins[i] = map[string]timing{}
		}
		for r := 0; r < *rounds; r++ {
			sec, err := timeReference(refArgs, abs)
			if err != nil {
				return err
			}
			res.refSec = min(res.refSec, sec)
			for i, b := range bins {
				got, err := timeBench(b, dir, name, *seeds, *iters)
				if err != nil {
					return err
				}
				keepMin(res.bins[i], got)
			}
		}
		all = append(all, res)
	}
	writeTables(out, all, bins)
	return nil
}

// result holds one file's times: the reference's least solve time and,
// per test binary, the least time of each benchmark (by key: "cold",
// "repair10", "repair10s12", ...).
type result struct {
	name   string
	refSec float64
	bins   []map[string]timing
}

// timing is one benchmark's time per solve and pivots.
type timing struct {
	ns     float64
	pivots float64
}

func keepMin(dst, src map[string]timing) {
	for k, t := range src {
		if old, ok := dst[k]; !ok || t.ns < old.ns {
			dst[k] = t
		}
	}
}

var solveSec = regexp.MustCompile(`solve_s=([0-9.]+)`)

func timeReference(args []string, file string) (float64, error) {
	cmd := exec.Command(args[0], append(args[1:], file)...)
	outp, err := cmd.Output()
	// The kit's solvers exit 2 or 3 on infeasible or unbounded problems;
	// a time is a time.
	var exit *exec.ExitError
	if err != nil && !errors.As(err, &exit) {
		return 0, fmt.Errorf("reference on %s: %w", file, err)
	}
	return parseReference(outp, file)
}

// parseReference reads solve_s=SECONDS from the reference's output.
func parseReference(outp []byte, file string) (float64, error) {
	m := solveSec.FindSubmatch(outp)
	if m == nil {
		return 0, fmt.Errorf("reference on %s: no solve_s= in its output", file)
	}
	sec, err := strconv.ParseFloat(string(m[1]), 64)
	if err != nil || sec < 0 {
		return 0, fmt.Errorf("reference on %s: solve_s=%s: not a time", file, m[1])
	}
	return sec, nil
}

func timeBench(bin, dir, name, seeds string, iters int) (map[string]timing, error) {
	cmd := exec.Command(bin, "-test.run", "^$", "-test.bench", "^BenchmarkSolveFiles$/^"+regexp.QuoteMeta(name)+"$/",
		"-test.benchtime", strconv.Itoa(iters)+"x")
	cmd.Env = append(os.Environ(), "LANECERT_BENCH_DIR="+dir, "LANECERT_BENCH_SEEDS="+seeds)
	outp, err := cmd.CombinedOutput()
	if err != nil {
		return nil, fmt.Errorf("%s on %s: %w\n%s", bin, name, err, outp)
	}
	got, err := parseBench(outp, name)
	if err != nil {
		return nil, fmt.Errorf("%s on %s: %w", bin, name, err)
	}
	return got, nil
}

var benchLine = regexp.MustCompile(`^BenchmarkSolveFiles/(\S+?)/(cold|repair10\S*?)(?:-\d+)?\s+\d+\s+([0-9.]+) ns/op\b(.*)$`)
var pivotsField = regexp.MustCompile(`([0-9.]+) pivots`)
var medianField = regexp.MustCompile(`([0-9.]+) med-ns/op`)

// parseBench reads the benchmark lines of file name from go test's
// output, by key ("cold", "repair10", "repair10s12", ...): the median
// time per solve (med-ns/op) where the line has it, else the mean
// (ns/op), and the pivots. A FAIL line
// (the benchmark checks each cost against the cold optimum) is an error.
func parseBench(outp []byte, name string) (map[string]timing, error) {
	got := map[string]timing{}
	sc := bufio.NewScanner(bytes.NewReader(outp))
	for sc.Scan() {
		line := sc.Text()
		if strings.HasPrefix(line, "FAIL") || strings.HasPrefix(line, "--- FAIL") {
			return nil, fmt.Errorf("benchmark failed:\n%s", outp)
		}
		m := benchLine.FindStringSubmatch(line)
		if m == nil || m[1] != name {
			continue
		}
		ns, err := strconv.ParseFloat(m[3], 64)
		if err != nil {
			return nil, fmt.Errorf("%q: %w", line, err)
		}
		if md := medianField.FindStringSubmatch(m[4]); md != nil {
			if ns, err = strconv.ParseFloat(md[1], 64); err != nil {
				return nil, fmt.Errorf("%q: %w", line, err)
			}
		}
		t := timing{ns: ns, pivots: -1}
		if p := pivotsField.FindStringSubmatch(m[4]); p != nil {
			if t.pivots, err = strconv.ParseFloat(p[1], 64); err != nil {
				return nil, fmt.Errorf("%q: %w", line, err)
			}
		}
		got[m[2]] = t
	}
	if _, ok := got["cold"]; !ok {
		return nil, fmt.Errorf("no cold benchmark in the output:\n%s", outp)
	}
	return got, nil
}

// repairKeys returns the repair keys of t in seed order ("repair10" is
// seed 11 and comes first).
func repairKeys(t map[string]timing) []string {
	var keys []string
	for k := range t {
		if strings.HasPrefix(k, "repair10") {
			keys = append(keys, k)
		}
	}
	slices.SortFunc(keys, func(a, b string) int {
		return cmp.Or(cmp.Compare(len(a), len(b)), cmp.Compare(a, b))
	})
	return keys
}

func writeTables(w io.Writer, all []result, bins []string) {
	fmt.Fprintln(w, "| file | binary | reference ms | cold ms | cold / ref | repairs / ref, sorted | median | worst |")
	fmt.Fprintln(w, "|---|---|---:|---:|---:|---|---:|---:|")
	for _, r := range all {
		refNs := r.refSec * 1e9
		for i, b := range bins {
			t := r.bins[i]
			var ratios []float64
			for _, k := range repairKeys(t) {
				ratios = append(ratios, t[k].ns/refNs)
			}
			slices.Sort(ratios)
			cells := make([]string, len(ratios))
			for j, x := range ratios {
				cells[j] = fmt.Sprintf("%.2f", x)
			}
			worst := math.NaN()
			if len(ratios) > 0 {
				worst = ratios[len(ratios)-1]
			}
			fmt.Fprintf(w, "| %s | %s | %.1f | %.1f | %.2f | %s | %.2f | %.2f |\n", r.name, filepath.Base(b),
				r.refSec*1e3, t["cold"].ns/1e6, t["cold"].ns/refNs, strings.Join(cells, " "), stats.Median(ratios), worst)
		}
	}
	if len(bins) < 2 {
		return
	}
	first, last := 0, len(bins)-1
	fmt.Fprintf(w, "\n%s against %s (ms / pivots; ratio of times):\n\n", filepath.Base(bins[last]), filepath.Base(bins[first]))
	fmt.Fprintln(w, "| file | run | first | last | ratio |")
	fmt.Fprintln(w, "|---|---|---:|---:|---:|")
	for _, r := range all {
		a, b := r.bins[first], r.bins[last]
		var sa, sb float64
		for _, k := range append([]string{"cold"}, repairKeys(a)...) {
			ta, okA := a[k]
			tb, okB := b[k]
			if !okA || !okB {
				continue
			}
			if k != "cold" {
				sa, sb = sa+ta.ns, sb+tb.ns
			}
			fmt.Fprintf(w, "| %s | %s | %.2f / %.0f | %.2f / %.0f | %.2f |\n", r.name, k, ta.ns/1e6, ta.pivots, tb.ns/1e6, tb.pivots, tb.ns/ta.ns)
		}
		if sa > 0 {
			fmt.Fprintf(w, "| %s | all repairs | %.1f | %.1f | %.3f |\n", r.name, sa/1e6, sb/1e6, sb/sa)
		}
	}
}
