package main

import (
	"errors"
	"fmt"
	"io"
	"strings"

	"github.com/spf13/cobra"

	"lanecert/dual"
	"lanecert/flow"
	"lanecert/reports"
)

// auditOptions are the audit command's settings.
type auditOptions struct {
	files     flow.Files
	columns   []string
	tolerance string
	format    string
	output    string
	rows      int
	allLanes  bool
	showNodes bool
	noSolve   bool
	rowsSet   bool
	ranges    bool
	noRanges  bool
	shortfall string
	// shownAs, if set, names the inputs in the report instead of the paths.
	shownAs *reports.Inputs
}

const defaultRows = 30

// autoRangeLanes is the largest network whose rate ranges an audit computes
// without being asked (their cost grows faster than the solve's).
const autoRangeLanes = 200000

func addInputFlags(cmd *cobra.Command, o *auditOptions) {
	f := cmd.Flags()
	f.StringVar(&o.files.Network, "network", "", "lane table (CSV) or DIMACS .min file")
	f.StringVar(&o.files.Nodes, "nodes", "", "node table (CSV: node and supply, or supply and demand)")
	f.StringVar(&o.files.Plan, "plan", "", "plan file: CSV keyed by lane or by from,to, or DIMACS f lines (default: the lane table's flow column)")
	f.StringArrayVar(&o.columns, "col", nil, "read a column under another header: OURS=THEIRS, e.g. cost=rate_usd (repeatable)")
	f.BoolVar(&o.files.Table.DecimalComma, "decimal-comma", false, "numbers in the CSV files use a decimal comma (12,50)")
	f.BoolVar(&o.files.Grid, "grid", false, "the network (and a CSV plan) are tableau grids: origins as rows, destinations as columns, rates in the cells, a supply column and a demand row (detected from the header when not given)")
	f.StringVar(&o.files.LaneSheet, "lane-sheet", "", "worksheet of the lane table in an .xlsx network (default: lanes)")
	f.StringVar(&o.files.NodeSheet, "node-sheet", "", "worksheet of the node table in an .xlsx network (default: nodes)")
	f.StringVar(&o.tolerance, "tolerance", "", "round plan quantities lying within this distance of the network's decimal places (for plans from floating-point solvers); the report lists each rounding")
}

func addOutputFlags(cmd *cobra.Command, o *auditOptions) {
	f := cmd.Flags()
	f.StringVar(&o.format, "format", "table", "output format: table, json, csv, markdown, html (one self-contained page with a drawing and charts) dot (the network for Graphviz) or grid (a tableau grid network's audit: quantities, [reduced costs], potentials)")
	f.StringVarP(&o.output, "output", "o", "", "write the report to this file (atomically) instead of standard output")
	f.IntVar(&o.rows, "rows", defaultRows, "lanes shown in the lane table, problem lanes first (0: all)")
	f.BoolVar(&o.allLanes, "all-lanes", false, "show every lane in the lane table")
	f.BoolVar(&o.showNodes, "show-nodes", false, "add the per-node table (balance and potential)")
	f.BoolVar(&o.ranges, "ranges", false, fmt.Sprintf("compute rate ranges and node prices even for networks over %d lanes (they are computed by default below that)", autoRangeLanes))
	f.BoolVar(&o.noRanges, "no-ranges", false, "skip the rate ranges and node prices")
	f.StringVar(&o.shortfall, "shortfall-price", "", "allow demand to go unmet at this price per unit (a shortfall_price column in the node table overrides it per node); the audit then reports unmet units per node and judges the plan with them priced")
	f.BoolVar(&o.noSolve, "no-solve", false, "check the plan and its certificate only: skip solving for the optimal cost, the gap and the repair")
}

func newAuditCmd(s streams, runF func(*auditOptions) error) *cobra.Command {
	o := &auditOptions{}
	cmd := &cobra.Command{
		Use:   "audit [NETWORK [PLAN]]",
		Short: "Check a plan: feasible? cheapest? if not, which reroute saves how much",
		Long: `Audit a shipment plan against its network. The network is a lane table
(CSV: from, to, cost, and optional lane, min, max, flow; plus --nodes with
the node table) or a DIMACS minimum-cost flow file. The plan is the lane
table's flow column, or --plan: a CSV keyed by lane or by from,to, or DIMACS
solution lines (f SRC DST FLOW).

The verdict comes with a certificate: node potentials whose dual objective
equals the plan's cost (optimal), improving cycles with their exact saving
(not optimal), or the broken bounds and balances (plan infeasible).

` + exitHelp,
		Args: cobra.MaximumNArgs(2),
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := o.positional(args); err != nil {
				return err
			}
			o.rowsSet = o.rowsSet || cmd.Flags().Changed("rows")
			if runF != nil {
				return runF(o)
			}
			return runAudit(o, s)
		},
	}
	addInputFlags(cmd, o)
	addOutputFlags(cmd, o)
	return cmd
}

// newReportCmd is the audit with an HTML page as its default output.
func newReportCmd(s streams, runF func(*auditOptions) error) *cobra.Command {
	cmd := newAuditCmd(s, runF)
	cmd.Use = "report [NETWORK [PLAN]] -o FILE.html"
	cmd.Short = "Write the audit as one self-contained HTML page (drawing, tables, charts)"
	cmd.Flags().Lookup("format").DefValue = "html"
	if err := cmd.Flags().Set("format", "html"); err != nil {
		panic(err) // the flag is defined just above
	}
	return cmd
}

// positional fills network and plan from the arguments.
func (o *auditOptions) positional(args []string) error {
	if len(args) > 0 {
		if o.files.Network != "" {
			return errors.New("give the network as an argument or with --network, not both")
		}
		o.files.Network = args[0]
	}
	if len(args) > 1 {
		if o.files.Plan != "" {
			return errors.New("give the plan as an argument or with --plan, not both")
		}
		o.files.Plan = args[1]
	}
	if o.files.Network == "" {
		return errors.New("no network: give a lane table or DIMACS file (see lanecert audit --help)")
	}
	return nil
}

// prepare turns the string flags into the library's options.
func (o *auditOptions) prepare() error {
	if len(o.columns) > 0 {
		o.files.Table.Columns = map[string]string{}
		for _, c := range o.columns {
			ours, theirs, ok := strings.Cut(c, "=")
			if !ok || strings.TrimSpace(ours) == "" || strings.TrimSpace(theirs) == "" {
				return fmt.Errorf("--col %q: want OURS=THEIRS, e.g. cost=rate_usd", c)
			}
			o.files.Table.Columns[theirs] = ours
		}
	}
	if o.tolerance != "" {
		d, err := flow.ParseDecimal(o.tolerance)
		if err != nil || d.Mant < 0 {
			return fmt.Errorf("--tolerance %q: want a non-negative decimal such as 0.000001", o.tolerance)
		}
		o.files.Tolerance = &d
	}
	if o.allLanes {
		o.rows, o.rowsSet = 0, true
	}
	if o.rows < 0 {
		return fmt.Errorf("--rows %d: want 0 (all) or more", o.rows)
	}
	return nil
}

func runAudit(o *auditOptions, s streams) error {
	format, err := reports.ParseFormat(o.format)
	if err != nil {
		return err
	}
	in, err := load(o)
	if err != nil {
		return err
	}
	if in.Plan == nil {
		return errors.New("no plan: the lane table has no flow column; give one with --plan")
	}
	orig := in.Net.NumLanes()
	if o.shortfall != "" {
		if err := withShortfall(in, o.shortfall); err != nil {
			return err
		}
	}
	a, err := dual.Check(in.Net, in.Plan.Flow)
	if err != nil {
		return err
	}
	var start []int64
	if a.Verdict != dual.PlanInfeasible {
		start = in.Plan.Flow
	}
	var opt *dual.Optimum
	var leftOut []string // what overflow left out
	if !o.noSolve {
		prog := progressTo(s.err)
		opt, err = dual.Optimize(in.Net, start, prog.callbacks(in.Net))
		prog.done()
		if errors.Is(err, flow.ErrOverflow) {
			// The verdict and its certificate stand without the optimum.
			opt, leftOut = nil, append(leftOut, "the optimal cost, gap and repair: "+err.Error())
		} else if err != nil {
			return err
		}
	}
	var sens *dual.Sensitivity
	if opt != nil && opt.Status == flow.Optimal && !o.noRanges && (o.ranges || in.Net.NumLanes() <= autoRangeLanes) {
		if sens, err = dual.Ranges(in.Net, opt.Flow, opt.Potential); errors.Is(err, flow.ErrOverflow) {
			// The verdict stands; only the ranges cannot be given exactly.
			sens, leftOut = nil, append(leftOut, "the rate ranges and node prices: "+err.Error())
		} else if err != nil {
			return err
		}
	}
	names := reports.Inputs{Network: o.files.Network, Nodes: o.files.Nodes, Plan: in.PlanFile}
	if o.shownAs != nil {
		names = *o.shownAs
	}
	names.Tolerance = o.tolerance
	names.ShortfallPrice = o.shortfall
	doc, err := reports.Build(a, opt, names, in.Plan.Rounded)
	if err != nil {
		return err
	}
	if o.shortfall != "" {
		doc.AddUnmet(in.Plan.Flow, orig)
	}
	doc.LeftOut = append(doc.LeftOut, leftOut...)
	if opt != nil && opt.Status == flow.Infeasible {
		cut, err := flow.FindCut(in.Net)
		if err != nil {
			return err
		}
		if cut != nil {
			doc.AddCut(cut)
		}
	}
	if sens != nil {
		forPlan := "optimal-plan"
		if a.Verdict == dual.Optimal {
			forPlan = "plan"
		}
		doc.AddRanges(opt.Flow, sens, forPlan)
	}
	ropt := reports.Options{Rows: o.rows, MoreHint: " (--all-lanes shows them)", Nodes: o.showNodes}
	if format == reports.HTML && !o.rowsSet {
		ropt.Rows = 0 // the page sorts and filters the whole table
	}
	if err := emit(o.output, o.inputs(), s, func(w io.Writer) error { return reports.Write(w, doc, format, ropt) }); err != nil {
		return err
	}
	return verdictStatus(doc.Verdict)
}

func verdictStatus(v string) error {
	switch v {
	case dual.Optimal.String():
		return nil
	case dual.NotOptimal.String():
		return &statusError{exitNotOptimal}
	case reports.VerdictNetworkInfeasible:
		return &statusError{exitNetworkInfeasible}
	}
	return &statusError{exitPlanInfeasible}
}

// withShortfall replaces the loaded network and plan by their versions with
// priced unmet demand (flow.WithShortfall): price is the default, a
// shortfall_price column of the node table sets it per node.
func withShortfall(in *flow.Loaded, price string) error {
	n := in.Net
	d, err := flow.ParseDecimal(price)
	if err != nil || d.Mant < 0 {
		return fmt.Errorf("--shortfall-price %q: want a non-negative decimal", price)
	}
	per := make([]flow.Decimal, n.NumNodes())
	given := make([]bool, n.NumNodes())
	places := int(d.Places)
	if n.NodeExtra != nil {
		for c, name := range n.NodeExtra.Names {
			if strings.ToLower(strings.TrimSpace(name)) != "shortfall_price" {
				continue
			}
			for v, row := range n.NodeExtra.Values {
				if row == nil || strings.TrimSpace(row[c]) == "" {
					continue
				}
				x, err := flow.ParseDecimal(strings.TrimSpace(row[c]))
				if err != nil || x.Mant < 0 {
					return fmt.Errorf("node %q: shortfall_price %q: want a non-negative decimal", n.Nodes[v], row[c])
				}
				per[v], given[v] = x, true
				places = max(places, int(x.Places))
			}
		}
	}
	if places > n.RatePlaces {
		if err := n.RescaleRate(places - n.RatePlaces); err != nil {
			return err
		}
	}
	p, err := d.Scaled(n.RatePlaces)
	if err != nil {
		return fmt.Errorf("--shortfall-price %q: %w", price, err)
	}
	prices := make([]int64, n.NumNodes())
	for v := range prices {
		prices[v] = -1 // the default
		if given[v] {
			if prices[v], err = per[v].Scaled(n.RatePlaces); err != nil {
				return fmt.Errorf("node %q: shortfall_price: %w", n.Nodes[v], err)
			}
		}
	}
	ext, err := flow.WithShortfall(n, p, prices)
	if err != nil {
		return err
	}
	in.Plan.Flow = flow.ExtendPlan(n, ext, in.Plan.Flow)
	in.Net = ext
	return nil
}
