package main

import (
	"io"
	"os"

	"github.com/spf13/cobra"

	"lanecert/dual"
	"lanecert/flow"
	"lanecert/reports"
)

type bidsOptions struct {
	in     auditOptions
	bids   string
	format string
	output string
}

func newBidsCmd(s streams, runF func(*bidsOptions) error) *cobra.Command {
	o := &bidsOptions{}
	cmd := &cobra.Command{
		Use:   "bids NETWORK [PLAN] BIDS.csv",
		Short: "Price candidate lanes (carrier bids): would each be used, and what would it save",
		Long: `Price a file of candidate lanes not yet in the network (for example new
carrier quotes): columns from, to, rate (or cost), and optionally bid (or
lane, id), min and max. For each: its break-even rate, whether it would be
used, the saving per unit, and the exact total saving if it alone were
added (re-solved from the current optimal plan). Then the best set of bids
taken together and its saving.`,
		Args: cobra.RangeArgs(2, 3),
		RunE: func(cmd *cobra.Command, args []string) error {
			o.bids = args[len(args)-1]
			if err := o.in.positional(args[:len(args)-1]); err != nil {
				return err
			}
			if runF != nil {
				return runF(o)
			}
			return runBids(o, s)
		},
	}
	addInputFlags(cmd, &o.in)
	cmd.Flags().StringVar(&o.format, "format", "table", "output format: table, json, csv or markdown")
	cmd.Flags().StringVarP(&o.output, "output", "o", "", "write the report to this file (atomically) instead of standard output")
	return cmd
}

func runBids(o *bidsOptions, s streams) error {
	format, err := reports.ParseFormat(o.format)
	if err != nil {
		return err
	}
	in, err := load(&o.in)
	if err != nil {
		return err
	}
	n := in.Net
	fh, err := os.Open(o.bids)
	if err != nil {
		return err
	}
	cands, err := flow.ReadCandidates(fh, o.bids, n, o.in.files.Table)
	fh.Close()
	if err != nil {
		return err
	}
	opt, err := optimum(in, s)
	if err != nil {
		return err
	}
	res, set, err := dual.EvaluateBids(n, opt.Flow, opt.Potential, opt.Cost, cands)
	if err != nil {
		return err
	}
	doc := reports.BuildBids(n, opt.Cost, cands, res, set)
	return emit(o.output, o.in.inputs(o.bids), s, func(w io.Writer) error { return reports.WriteBids(w, doc, format) })
}
