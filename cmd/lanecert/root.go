package main

import (
	"errors"
	"fmt"
	"io"

	"github.com/spf13/cobra"
)

// exitCode is the process exit status.
type exitCode int

const (
	exitOptimal           exitCode = 0
	exitNotOptimal        exitCode = 1
	exitPlanInfeasible    exitCode = 2
	exitNetworkInfeasible exitCode = 3
	exitBadInput          exitCode = 4
)

// streams are the command's standard streams, injectable for tests.
type streams struct {
	in       io.Reader
	out, err io.Writer
}

// statusError carries an exit status through cobra without an error message.
type statusError struct{ code exitCode }

func (e *statusError) Error() string { return fmt.Sprintf("exit status %d", e.code) }

const exitHelp = `Exit status:
  0  the plan is optimal
  1  the plan is feasible but not optimal
  2  the plan is infeasible (a bound or a balance is broken)
  3  the network is infeasible (no plan can meet the demands)
  4  bad input or usage`

func newRootCmd(s streams) *cobra.Command {
	root := &cobra.Command{
		Use:   "lanecert",
		Short: "Prove a freight plan feasible and cheapest, or show why not",
		Long: `lanecert checks a shipment plan on a freight network (plants, warehouses,
cross-docks, customers; lanes with a unit rate and optional minimum and
capacity) and proves, with a certificate anyone can check, whether the plan is
feasible and whether it is the cheapest. It checks cost optimality only: loads
must still respect weight limits, driving-hours rules, hazardous-goods rules,
local regulations and licensed practice.

` + exitHelp,
		SilenceUsage:  true,
		SilenceErrors: true,
	}
	root.SetOut(s.out)
	root.SetErr(s.err)
	root.SetIn(s.in)
	root.AddCommand(newAuditCmd(s, nil), newReportCmd(s, nil), newSolveCmd(s, nil), newRepairCmd(s, nil), newWhyCmd(s, nil), newBidsCmd(s, nil), newExtendCmd(s, nil), newDemoCmd(s, nil))
	return root
}

// run executes the command line and returns the exit status.
func run(args []string, s streams) exitCode {
	root := newRootCmd(s)
	root.SetArgs(args)
	err := root.Execute()
	if err == nil {
		return exitOptimal
	}
	var se *statusError
	if errors.As(err, &se) {
		return se.code
	}
	fmt.Fprintf(s.err, "lanecert: %v\n", err)
	return exitBadInput
}
