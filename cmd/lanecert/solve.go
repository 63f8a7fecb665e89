package main

import (
	"errors"
	"fmt"
	"io"

	"github.com/spf13/cobra"

	"lanecert/dual"
	"lanecert/flow"
	"lanecert/reports"
)

// planOptions are the settings of solve and repair.
type planOptions struct {
	in     auditOptions // inputs only
	format string
	output string
	repair bool
}

const planExitHelp = `Exit status:
  0  an optimal plan was written
  1  no optimum: a cycle of lanes without capacity lowers the cost without limit
  3  the network is infeasible (no plan can meet the demands)
  4  bad input or usage`

func newSolveCmd(s streams, runF func(*planOptions) error) *cobra.Command {
	o := &planOptions{}
	cmd := &cobra.Command{
		Use:   "solve NETWORK",
		Short: "Write an optimal plan for a network",
		Long: `Solve a network with lanecert's exact network simplex and write an optimal
plan: the lane table with a flow column (CSV), DIMACS s and f lines, or JSON,
chosen by --format or by the output file's extension (.csv, .flow, .json).
Output files are written atomically and never over an input file.

` + planExitHelp,
		Args: cobra.MaximumNArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := o.in.positional(args); err != nil {
				return err
			}
			if runF != nil {
				return runF(o)
			}
			return runPlan(o, s)
		},
	}
	addPlanFlags(cmd, o)
	return cmd
}

func newRepairCmd(s streams, runF func(*planOptions) error) *cobra.Command {
	o := &planOptions{repair: true}
	cmd := &cobra.Command{
		Use:   "repair NETWORK [PLAN]",
		Short: "Write an optimal plan that starts from a given plan",
		Long: `Repair a plan: the network simplex starts from the given plan (when it is
feasible) and moves flow only around improving cycles, so the optimal plan it
writes keeps the given plan wherever cheaper routing does not need a change.
An infeasible plan is solved from scratch (a note on standard error says so).
Formats and writing as for solve; the changed lanes are listed on standard
error.

` + planExitHelp,
		Args: cobra.RangeArgs(1, 2),
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := o.in.positional(args); err != nil {
				return err
			}
			if runF != nil {
				return runF(o)
			}
			return runPlan(o, s)
		},
	}
	addPlanFlags(cmd, o)
	return cmd
}

func addPlanFlags(cmd *cobra.Command, o *planOptions) {
	addInputFlags(cmd, &o.in)
	f := cmd.Flags()
	f.StringVar(&o.format, "format", "", "plan format: csv, dimacs, json or grid (default: from the output file's extension, else csv; a grid for a network read from a tableau grid)")
	f.StringVarP(&o.output, "output", "o", "", "write the plan to this file (atomically) instead of standard output")
}

func runPlan(o *planOptions, s streams) error {
	format, err := reports.PlanFormatFor(o.format, o.output)
	if err != nil {
		return err
	}
	in, err := load(&o.in)
	if err != nil {
		return err
	}
	if in.Net.Grid != nil && o.format == "" && format == reports.PlanCSV {
		format = reports.PlanGrid // a grid comes back as a grid
	}
	var start []int64
	if o.repair {
		if in.Plan == nil {
			return errors.New("no plan: the lane table has no flow column; give one as the second argument")
		}
		f, err := flow.CheckPlan(in.Net, in.Plan.Flow)
		if err != nil {
			return err
		}
		if f.Feasible() {
			start = in.Plan.Flow
		} else {
			fmt.Fprintf(s.err, "lanecert: the plan is infeasible (%d violation(s)); solving from scratch\n", len(f.Violations))
		}
	}
	prog := progressTo(s.err)
	opt, err := dual.Optimize(in.Net, start, prog.callbacks(in.Net))
	prog.done()
	if err != nil {
		return err
	}
	switch opt.Status {
	case flow.Infeasible:
		fmt.Fprintf(s.err, "lanecert: the network is infeasible: at least %s units cannot be delivered by any plan\n", in.Net.FormatQty(opt.Shortfall))
		return &statusError{exitNetworkInfeasible}
	case flow.Unbounded:
		fmt.Fprintf(s.err, "lanecert: no optimum: this cycle of lanes without capacity lowers the cost without limit:\n")
		for _, st := range opt.Cycle {
			fmt.Fprintf(s.err, "  lane %s %s -> %s\n", in.Net.LaneName(st.Lane), in.Net.Nodes[in.Net.Tail[st.Lane]], in.Net.Nodes[in.Net.Head[st.Lane]])
		}
		return &statusError{exitNotOptimal}
	}
	if o.repair && start != nil {
		changes, err := opt.Changes(in.Net, start)
		if err != nil {
			return err
		}
		old, err := dual.Cost(in.Net, start)
		if err != nil {
			return err
		}
		fmt.Fprintf(s.err, "lanecert: plan cost %s, optimal cost %s; %d lane(s) changed\n",
			in.Net.FormatCost(old), in.Net.FormatCost(opt.Cost), len(changes))
		for _, c := range changes {
			fmt.Fprintf(s.err, "  lane %s: %s -> %s (cost change %s)\n", in.Net.LaneName(c.Lane),
				in.Net.FormatQty(c.Old), in.Net.FormatQty(c.New), in.Net.FormatCost(c.CostChange))
		}
	}
	return emit(o.output, o.in.inputs(), s, func(w io.Writer) error { return reports.WritePlan(w, in.Net, opt.Flow, opt.Cost, format) })
}

// optimum solves the loaded network, starting from its plan when that is
// feasible (so ties are kept as in the plan), and turns a network without
// an optimum into the command's error and exit status.
func optimum(in *flow.Loaded, s streams) (*dual.Optimum, error) {
	var start []int64
	if in.Plan != nil {
		if f, err := flow.CheckPlan(in.Net, in.Plan.Flow); err == nil && f.Feasible() {
			start = in.Plan.Flow
		}
	}
	opt, err := dual.Optimize(in.Net, start, nil)
	if err != nil {
		return nil, err
	}
	switch opt.Status {
	case flow.Infeasible:
		fmt.Fprintf(s.err, "lanecert: the network is infeasible: at least %s units cannot be delivered\n", in.Net.FormatQty(opt.Shortfall))
		return nil, &statusError{exitNetworkInfeasible}
	case flow.Unbounded:
		return nil, errors.New("no optimum: a cycle of lanes without capacity lowers the cost without limit")
	}
	return opt, nil
}

// emit writes a command's output to the file named by output (atomically,
// never over one of the inputs) or, when output is empty, to standard
// output.
func emit(output string, inputs []string, s streams, write func(io.Writer) error) error {
	if output != "" {
		return reports.WriteAtomic(output, inputs, write)
	}
	return write(s.out)
}

// load prepares the input options and reads the network and plan.
func load(o *auditOptions) (*flow.Loaded, error) {
	if err := o.prepare(); err != nil {
		return nil, err
	}
	return flow.LoadFiles(o.files)
}

// inputs lists the input files of o plus extra ones, for emit.
func (o *auditOptions) inputs(extra ...string) []string {
	return append([]string{o.files.Network, o.files.Nodes, o.files.Plan}, extra...)
}
