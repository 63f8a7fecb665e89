package main

import (
	"errors"
	"fmt"
	"io"
	"os"

	"github.com/spf13/cobra"

	"lanecert/dual"
	"lanecert/flow"
	"lanecert/reports"
)

type extendOptions struct {
	in         auditOptions
	candidates string
	perKm      string
	perUnit    string
	nearest    int
	oneLane    bool
	format     string
	output     string
}

func newExtendCmd(s streams, runF func(*extendOptions) error) *cobra.Command {
	o := &extendOptions{}
	cmd := &cobra.Command{
		Use:   "extend NETWORK [PLAN]",
		Short: "Find the cheapest lanes to add: to meet demand that cannot be met, or to lower cost",
		Long: `Find the cheapest lanes to open from a candidate file (--candidates: from,
to, rate, and optionally max, min, fixed for a one-off opening cost, and an
id). When the network cannot meet its demands the report first proves it:
the short region, its demand, what can reach it and the units short.

Without fixed costs the answer is one minimum-cost flow over the network and
all candidates (exact); a candidate with a minimum must carry it when
opened, so up to 6 of them are tried in every combination (exact), more as
with fixed costs. With fixed costs it is the best single lane and
best pair, then lanes added one at a time while that helps, with a lower
bound on the best possible total. --one-lane looks only for the best single
lane (exact among single lanes, with or without fixed costs).

Without a candidate file, when the node table has lat and lon columns and
the network is short, candidate lanes are proposed from the origins nearest
to the short region's destinations, priced by --per-km and --per-unit on
the great-circle (haversine) distance: their rates are estimates.

Exit status: 0 a feasible plan exists (with or without new lanes), 3 not even
with the candidates, 4 bad input or usage.`,
		Args: cobra.RangeArgs(1, 2),
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := o.in.positional(args); err != nil {
				return err
			}
			if runF != nil {
				return runF(o)
			}
			return runExtend(o, s)
		},
	}
	addInputFlags(cmd, &o.in)
	f := cmd.Flags()
	f.StringVar(&o.candidates, "candidates", "", "candidate lanes (CSV: from, to, rate, optional max, min, fixed, id)")
	f.StringVar(&o.perKm, "per-km", "", "estimated rate per unit and kilometre, for proposed lanes")
	f.StringVar(&o.perUnit, "per-unit", "0", "estimated fixed rate per unit, for proposed lanes")
	f.IntVar(&o.nearest, "nearest", 3, "proposed lanes per short destination, from its nearest origins")
	f.BoolVar(&o.oneLane, "one-lane", false, "look only for the best single lane to add (exact; faster on long candidate files)")
	f.StringVar(&o.format, "format", "table", "output format: table, json or markdown")
	f.StringVarP(&o.output, "output", "o", "", "write the report to this file (atomically) instead of standard output")
	return cmd
}

func runExtend(o *extendOptions, s streams) error {
	format, err := reports.ParseFormat(o.format)
	if err != nil {
		return err
	}
	in, err := load(&o.in)
	if err != nil {
		return err
	}
	n := in.Net
	cut, err := flow.FindCut(n)
	if err != nil {
		return err
	}
	var cands []flow.Candidate
	var km []float64
	switch {
	case o.candidates != "":
		fh, err := os.Open(o.candidates)
		if err != nil {
			return err
		}
		cands, err = flow.ReadCandidates(fh, o.candidates, n, o.in.files.Table)
		fh.Close()
		if err != nil {
			return err
		}
	case cut != nil:
		lat, lon, ok, err := flow.Coordinates(n)
		if err != nil {
			return err
		}
		if !ok {
			return errors.New("no candidates: give --candidates, or lat and lon columns in the node table with --per-km to propose lanes")
		}
		if o.perKm == "" {
			return errors.New("proposing lanes from coordinates needs a rate model: --per-km (and --per-unit)")
		}
		perKm, err1 := flow.ParseDecimal(o.perKm)
		perUnit, err2 := flow.ParseDecimal(o.perUnit)
		if err1 != nil || err2 != nil || perKm.Mant < 0 || perUnit.Mant < 0 {
			return fmt.Errorf("--per-km %q, --per-unit %q: want non-negative decimals", o.perKm, o.perUnit)
		}
		if cands, km, err = flow.ProposeLanes(n, cut.Region, lat, lon, flow.RateModel{PerKm: perKm, PerUnit: perUnit}, o.nearest); err != nil {
			return err
		}
	default:
		return errors.New("no candidates: give --candidates (the network can meet its demands, so there is no short region to propose lanes for)")
	}
	x, err := dual.Extend(n, cands, dual.ExtendOptions{Cut: cut, CutKnown: true, SinglesOnly: o.oneLane})
	if err != nil {
		return err
	}
	doc := reports.BuildExtend(n, cands, km, cut, x)
	if err := emit(o.output, o.in.inputs(o.candidates), s, func(w io.Writer) error { return reports.WriteExtend(w, doc, format) }); err != nil {
		return err
	}
	if !x.Feasible {
		return &statusError{exitNetworkInfeasible}
	}
	return nil
}
