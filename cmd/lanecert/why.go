package main

import (
	"fmt"
	"io"
	"strings"

	"github.com/spf13/cobra"

	"lanecert/dual"
	"lanecert/flow"
)

type whyOptions struct {
	in   auditOptions
	lane string
}

func newWhyCmd(s streams, runF func(*whyOptions) error) *cobra.Command {
	o := &whyOptions{}
	cmd := &cobra.Command{
		Use:   "why NETWORK [PLAN] LANE",
		Short: "Explain one lane: why it is (un)used and at what rate that would change",
		Long: `Explain one lane of the optimal plan in plain words. For an unused lane: the
cheaper route that serves its destination instead, lane by lane, with the
rates summed against this lane's rate, and the break-even rate. For a lane in
use: the range of its rate over which the plan stays as it is, and the lanes
that compete with it at each end of that range. For a lane at capacity: what
one more unit of capacity would save.

The optimal plan is found from PLAN when it is given and feasible (so ties
are kept as in your plan), otherwise from scratch.`,
		Args: cobra.RangeArgs(2, 3),
		RunE: func(cmd *cobra.Command, args []string) error {
			o.lane = args[len(args)-1]
			if err := o.in.positional(args[:len(args)-1]); err != nil {
				return err
			}
			if runF != nil {
				return runF(o)
			}
			return runWhy(o, s)
		},
	}
	addInputFlags(cmd, &o.in)
	return cmd
}

func runWhy(o *whyOptions, s streams) error {
	in, err := load(&o.in)
	if err != nil {
		return err
	}
	n := in.Net
	lane, ok := findLane(n, o.lane)
	if !ok {
		return fmt.Errorf("no lane %q in %s", o.lane, o.in.files.Network)
	}
	opt, err := optimum(in, s)
	if err != nil {
		return err
	}
	sens, err := dual.Ranges(n, opt.Flow, opt.Potential)
	if err != nil {
		return err
	}
	return explain(s.out, n, opt, sens, lane)
}

// findLane finds a lane by its identifier.
func findLane(n *flow.Network, id string) (flow.LaneID, bool) {
	for a := 0; a < n.NumLanes(); a++ {
		if n.LaneName(flow.LaneID(a)) == id {
			return flow.LaneID(a), true
		}
	}
	return 0, false
}

func explain(w io.Writer, n *flow.Network, opt *dual.Optimum, sens *dual.Sensitivity, e flow.LaneID) error {
	y := opt.Flow
	lr := sens.Lanes[e]
	from, to := n.Nodes[n.Tail[e]], n.Nodes[n.Head[e]]
	rate := n.FormatRate(n.Rate[e])
	state := dual.StateOf(y[e], n.Lower[e], n.Upper[e])
	var b strings.Builder
	fmt.Fprintf(&b, "Lane %s, %s -> %s, rate %s: %s in the optimal plan (%s units", n.LaneName(e), from, to, rate, state, n.FormatQty(y[e]))
	if n.Upper[e] != flow.NoLimit {
		fmt.Fprintf(&b, " of %s", n.FormatQty(n.Upper[e]))
	}
	b.WriteString(").\n")
	if n.Lower[e] == n.Upper[e] {
		b.WriteString("Its quantity is fixed (minimum = capacity): no rate changes it.\n")
	}
	how := "the potentials of its two ends"
	if lr.ByRoute {
		how = "a route through the residual network (the plan is degenerate, so the potentials alone only bound it)"
	}
	if lr.HasLower {
		if state == dual.Unused || state == dual.AtMinimum {
			fmt.Fprintf(&b, "\nBreak-even rate: %s. At or below it, more traffic on this lane would lower (or tie) the total cost, by the difference per unit.\n", n.FormatRate(lr.Lower))
		} else {
			fmt.Fprintf(&b, "\nBelow a rate of %s the plan would send more on this lane.\n", n.FormatRate(lr.Lower))
		}
		fmt.Fprintf(&b, "(Found from %s.)\n", how)
		if err := describeCycle(&b, n, opt, e, true); err != nil {
			return err
		}
	} else if state != dual.AtCapacity && n.Lower[e] < n.Upper[e] {
		b.WriteString("\nNo rate, however low, would put more on this lane: no route can carry the extra units away from its destination or bring them to its origin.\n")
	}
	if lr.HasUpper {
		fmt.Fprintf(&b, "\nAbove a rate of %s the plan would send less on this lane.\n", n.FormatRate(lr.Upper))
		if err := describeCycle(&b, n, opt, e, false); err != nil {
			return err
		}
	} else if y[e] > n.Lower[e] {
		b.WriteString("\nNo rate, however high, would take traffic off this lane: nothing else can serve it.\n")
	}
	if state == dual.AtCapacity {
		fmt.Fprintf(&b, "\nOne more unit of capacity on this lane would save %s.\n", n.FormatRate(lr.CapacityValue))
	}
	b.WriteString("\n" + cautionLine + "\n")
	_, err := io.WriteString(w, b.String())
	return err
}

const cautionLine = "lanecert checks cost optimality only. Loads must still respect weight limits, driving-hours rules, hazardous-goods rules, local regulations and licensed practice."

// describeCycle writes the cycle of one unit more (or less) on lane e and
// its cheapest competing route, with the rates summed.
func describeCycle(b *strings.Builder, n *flow.Network, opt *dual.Optimum, e flow.LaneID, more bool) error {
	route, err := dual.Route(n, opt.Flow, opt.Potential, e, more)
	if err != nil {
		return err
	}
	sign := func(fwd bool) string {
		if fwd {
			return "+1"
		}
		return "-1"
	}
	if more {
		b.WriteString("One more unit on this lane would change the plan like this:\n")
	} else {
		b.WriteString("One unit less on this lane would change the plan like this:\n")
	}
	var total int64
	steps := append([]dual.Step{{Lane: e, Origin: -1, Forward: more}}, route...)
	for _, st := range steps {
		if st.Lane < 0 {
			what := "keeps one more unit"
			if !st.Forward {
				what = "keeps one unit less"
			}
			fmt.Fprintf(b, "  %s origin %s %s (rate 0)\n", sign(st.Forward), n.Nodes[st.Origin], what)
			continue
		}
		r := n.Rate[st.Lane]
		if st.Forward {
			total += r
		} else {
			total -= r
		}
		fmt.Fprintf(b, "  %s on lane %s, %s -> %s, rate %s\n", sign(st.Forward), n.LaneName(st.Lane),
			n.Nodes[n.Tail[st.Lane]], n.Nodes[n.Head[st.Lane]], n.FormatRate(r))
	}
	fmt.Fprintf(b, "  cost change per unit: %s (at today's rate; positive means dearer)\n", n.FormatRate(total))
	return nil
}
