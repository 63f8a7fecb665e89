package reports

import (
	"bufio"
	"encoding/csv"
	"encoding/json"
	"fmt"
	"io"
	"math/big"
	"strings"

	"github.com/olekukonko/tablewriter"
	"github.com/olekukonko/tablewriter/renderer"
	"github.com/olekukonko/tablewriter/tw"

	"lanecert/dual"
	"lanecert/flow"
)

// Format is an output format.
type Format string

// The formats Write knows.
const (
	Text     Format = "table"
	JSON     Format = "json"
	CSV      Format = "csv"
	Markdown Format = "markdown"
)

// ParseFormat returns the format named s.
func ParseFormat(s string) (Format, error) {
	switch f := Format(strings.ToLower(s)); f {
	case Text, JSON, CSV, Markdown, HTML, DOT, Grid:
		return f, nil
	case "text", "md":
		if f == "md" {
			return Markdown, nil
		}
		return Text, nil
	}
	return "", fmt.Errorf("reports: unknown format %q: want table, json, csv, markdown, html, dot or grid", s)
}

// Options controls the human formats (table and Markdown).
type Options struct {
	// Rows is how many lanes the lane table shows; 0 shows all.
	Rows int
	// MoreHint is appended to the line that counts lanes not shown.
	MoreHint string
	// Nodes adds the per-node table.
	Nodes bool
}

// DOT is the network in the DOT language with lane states (see
// flow.WriteDOT).
const DOT Format = "dot"

// Grid is the audit in the tableau grid of a network read from one (see
// flow.WriteGridAudit).
const Grid Format = "grid"

// Write renders d in format f.
func Write(w io.Writer, d *Document, f Format, opt Options) error {
	switch f {
	case DOT:
		return flow.WriteDOT(w, d.net, d.audit.Flow, d.dotState)
	case Grid:
		if d.net.Grid == nil {
			return fmt.Errorf("reports: the grid format needs a network read from a tableau grid")
		}
		return flow.WriteGridAudit(w, d.net, d.audit.Flow, d.audit.Reduced, d.audit.Potential)
	case JSON:
		return writeJSON(w, d)
	case CSV:
		return writeCSV(w, d)
	case Markdown:
		return writeHuman(w, d, opt, true)
	case HTML:
		return writeHTML(w, d, opt)
	}
	return writeHuman(w, d, opt, false)
}

// writeJSON writes the summary fields, then streams the lanes and nodes
// one entry at a time (a large network's report is never held whole).
func writeJSON(w io.Writer, d *Document) error {
	head, err := json.MarshalIndent(d, "", "  ")
	if err != nil {
		return err
	}
	bw := bufio.NewWriter(w)
	bw.Write(head[:len(head)-2]) // drop "\n}"
	list := func(key string, count int, entry func(i int) any) error {
		fmt.Fprintf(bw, ",\n  %q: [", key)
		for i := 0; i < count; i++ {
			b, err := json.MarshalIndent(entry(i), "    ", "  ")
			if err != nil {
				return err
			}
			if i > 0 {
				bw.WriteByte(',')
			}
			bw.WriteString("\n    ")
			bw.Write(b)
		}
		if count > 0 {
			bw.WriteString("\n  ")
		}
		bw.WriteByte(']')
		return nil
	}
	if err := list("lanes", d.NumLanes(), func(i int) any { return d.Lane(i) }); err != nil {
		return err
	}
	if err := list("nodes", d.NumNodes(), func(i int) any { return d.Node(i) }); err != nil {
		return err
	}
	bw.WriteString("\n}\n")
	return bw.Flush()
}

// CSVHeader is the fixed part of the CSV lane table's header.
var csvHeader = []string{"lane", "from", "to", "cost", "flow", "min", "max", "state", "reduced_cost", "slack_ok"}

func writeCSV(w io.Writer, d *Document) error {
	cw := csv.NewWriter(w)
	head := append(append([]string(nil), csvHeader...), d.ExtraColumns...)
	if err := cw.Write(SafeCells(head)); err != nil {
		return err
	}
	for e := 0; e < d.NumLanes(); e++ {
		l := d.Lane(e)
		rec := []string{l.ID, l.From, l.To, l.Cost, l.Flow, l.Min, deref(l.Max, ""), l.State, deref(l.ReducedCost, ""), boolText(l.SlackOK)}
		for _, c := range d.ExtraColumns {
			rec = append(rec, l.Extra[c])
		}
		if err := cw.Write(SafeCells(rec)); err != nil {
			return err
		}
	}
	cw.Flush()
	return cw.Error()
}

// dotState names a lane's state for the DOT drawing: breaking a bound or
// complementary slackness first, then full, unused or used.
func (d *Document) dotState(e flow.LaneID) string {
	switch st := d.audit.State[e]; {
	case st == dual.OutOfBounds || d.broken[e]:
		return flow.LaneBreaking
	case st == dual.AtCapacity:
		return flow.LaneFull
	case st == dual.Unused:
		return flow.LaneUnused
	}
	return flow.LaneUsed
}

// SafeCells neutralises spreadsheet formula injection: a cell that starts
// with '=', '+', '-', '@', tab or carriage return and is not a plain number
// gets a leading apostrophe, following the OWASP guidance on CSV injection.
func SafeCells(rec []string) []string {
	out := make([]string, len(rec))
	for i, c := range rec {
		out[i] = c
		if c == "" || strings.IndexByte("=+-@\t\r", c[0]) < 0 || isNumber(c) {
			continue
		}
		out[i] = "'" + c
	}
	return out
}

func isNumber(s string) bool {
	i := 0
	if i < len(s) && (s[i] == '-' || s[i] == '+') {
		i++
	}
	digits, point := 0, false
	for ; i < len(s); i++ {
		switch {
		case s[i] >= '0' && s[i] <= '9':
			digits++
		case s[i] == '.' && !point:
			point = true
		default:
			return false
		}
	}
	return digits > 0
}

func deref(p *string, def string) string {
	if p == nil {
		return def
	}
	return *p
}

func boolText(b *bool) string {
	switch {
	case b == nil:
		return ""
	case *b:
		return "yes"
	}
	return "no"
}

// verdictLine says the verdict in words.
func verdictLine(d *Document) string {
	switch d.Verdict {
	case "optimal":
		return "OPTIMAL: no plan for this network costs less."
	case "not-optimal":
		return "NOT OPTIMAL: a cheaper plan exists; the reroutes below prove it."
	case VerdictNetworkInfeasible:
		return "NETWORK INFEASIBLE: no plan can meet the demands with these lanes and bounds."
	}
	return "PLAN INFEASIBLE: the plan breaks the bounds or balances listed below."
}

func writeHuman(w io.Writer, d *Document, opt Options, md bool) error {
	p := &printer{w: w, md: md}
	if md {
		p.line("# lanecert audit")
		p.gap()
		p.line("**%s**", verdictLine(d))
	} else {
		p.line("%s", verdictLine(d))
	}
	p.gap()
	p.kv("Network", netLine(d))
	for _, note := range d.Notes {
		p.kv("Read", note)
	}
	p.kv("Plan", d.Inputs.Plan)
	p.kv("Plan cost", d.PlanCost)
	switch {
	case d.Shortfall != nil:
		p.kv("Shortfall", fmt.Sprintf("at least %s units cannot be delivered by any plan", *d.Shortfall))
		if c := d.Cut; c != nil {
			p.kv("Proof", fmt.Sprintf("the region %s needs %s more units than it holds, but at most %s can reach it", joinAnd(c.Nodes), c.Demand, c.Reach))
			if len(c.FullLanes) > 0 {
				p.kv("Lanes into it", joinAnd(c.FullLanes)+" (full in every plan)")
			}
			if len(c.OutLanes) > 0 {
				p.kv("Minimums out", joinAnd(c.OutLanes))
			}
			if c.KeptSupply {
				p.kv("Note", "the region also counts the supply origins may keep: lane minimums push more into it than its demand can use")
			}
		}
	case d.Unbounded:
		p.kv("Optimal cost", "none: a cycle of lanes without capacity lowers the cost without limit")
	case d.OptimalCost != nil:
		p.kv("Optimal cost", *d.OptimalCost)
		if d.Gap != nil {
			g := *d.Gap
			if d.GapShare != nil {
				g += fmt.Sprintf(" (%s of the optimum)", percent(*d.GapShare))
			}
			p.kv("Gap", g)
		}
		if *d.UniqueOptimum {
			p.kv("Optimum", "unique: no other plan costs as little")
		} else {
			p.kv("Optimum", "not unique: other plans cost as little")
		}
	}
	for _, l := range d.LeftOut {
		p.kv("Left out", l)
	}
	if d.DualObjective != nil {
		p.kv("Dual objective", fmt.Sprintf("%s  (supply terms %s, minimum terms %s, capacity terms %s) = plan cost",
			*d.DualObjective, d.DualTerms.Supply, d.DualTerms.Minimum, d.DualTerms.Capacity))
	}
	s := d.States
	p.kv("Lanes", fmt.Sprintf("%d in use, %d unused, %d at capacity, %d at minimum, %d fixed, %d out of bounds",
		s.InUse, s.Unused, s.AtCapacity, s.AtMinimum, s.Fixed, s.OutOfBounds))
	if d.Potentials != "" {
		how := "set by the lanes in use"
		if d.Potentials == "shortest-paths" {
			how = "lanes in use leave them open; shortest paths over the residual network fix them"
		}
		p.kv("Potentials", fmt.Sprintf("%s (%d piece(s) of lanes strictly between bounds)", how, d.Pieces))
		p.kv("Broken lanes", fmt.Sprintf("%d (reduced cost of the wrong sign for the lane's state)", d.BrokenLanes))
	}
	p.kv("Supply/demand", fmt.Sprintf("total supply %s, total demand %s", d.Totals.Supply, d.Totals.Demand))
	if len(d.Kept) > 0 {
		var parts []string
		for _, k := range d.Kept {
			parts = append(parts, fmt.Sprintf("%s keeps %s", k.Node, k.Quantity))
		}
		p.kv("Kept at origin", fmt.Sprintf("%s in all: %s", d.Totals.Kept, strings.Join(parts, "; ")))
	}
	if len(d.Unmet) > 0 {
		var parts []string
		for _, u := range d.Unmet {
			parts = append(parts, fmt.Sprintf("%s %s (cost %s)", u.Node, u.Units, u.Cost))
		}
		p.kv("Unmet demand", fmt.Sprintf("at the shortfall price %s: %s", d.Inputs.ShortfallPrice, strings.Join(parts, "; ")))
	}
	if d.Inputs.Tolerance != "" {
		p.kv("Tolerance", fmt.Sprintf("%s: %d plan quantities rounded", d.Inputs.Tolerance, len(d.Rounded)))
		for _, r := range d.Rounded {
			p.bullet(fmt.Sprintf("lane %s: %s read as %s", r.Lane, r.Given, r.Used))
		}
	}
	if len(d.Violations) > 0 {
		p.gap()
		p.head("Violations")
		for _, v := range d.Violations {
			p.bullet(violationText(v))
		}
	}
	if len(d.Cycles) > 1 {
		p.gap()
		p.line("Each reroute below stands on its own (they may share lanes): apply one, then audit again, or take the repair further down.")
	}
	for i, c := range d.Cycles {
		p.gap()
		p.head(fmt.Sprintf("Reroute %d", i+1))
		if c.Unbounded {
			p.line("Moving units around this cycle saves %s per unit and no bound stops it: the cost falls without limit.", c.SavingPerUnit)
		} else {
			p.line("Move %s units around this cycle: it saves %s per unit, %s in all.", *c.Units, c.SavingPerUnit, *c.TotalSaving)
		}
		if err := p.table([]string{"change", "lane", "from", "to", "rate"}, stepRows(c), []tw.Align{tw.AlignLeft, tw.AlignLeft, tw.AlignLeft, tw.AlignLeft, tw.AlignRight}); err != nil {
			return err
		}
	}
	if len(d.Repair) > 0 {
		p.gap()
		p.head("Repair")
		how := "the network simplex started from this plan"
		if d.Solver != nil && d.Solver.Start == "scratch" {
			how = "the network simplex solved from scratch"
		}
		p.line("An optimal plan (%s) changes %d lane(s), largest saving first:", how, len(d.Repair))
		var rows [][]string
		for i, c := range d.Repair {
			if opt.Rows > 0 && i == opt.Rows {
				break
			}
			rows = append(rows, []string{c.Lane, c.From, c.To, c.Old, c.New, c.CostChange})
		}
		if err := p.table([]string{"lane", "from", "to", "plan", "optimal", "cost change"}, rows,
			[]tw.Align{tw.AlignLeft, tw.AlignLeft, tw.AlignLeft, tw.AlignRight, tw.AlignRight, tw.AlignRight}); err != nil {
			return err
		}
		if rest := len(d.Repair) - len(rows); rest > 0 {
			p.line("... %d more change(s) not shown%s", rest, opt.MoreHint)
		}
	}
	p.gap()
	p.head("Lanes")
	rows, shown := laneRows(d, opt.Rows)
	if err := p.table([]string{"lane", "from", "to", "rate", "flow", "bounds", "state", "reduced cost", "slackness"}, rows,
		[]tw.Align{tw.AlignLeft, tw.AlignLeft, tw.AlignLeft, tw.AlignRight, tw.AlignRight, tw.AlignRight, tw.AlignLeft, tw.AlignRight, tw.AlignLeft}); err != nil {
		return err
	}
	if rest := d.NumLanes() - shown; rest > 0 {
		p.line("... %d more lane(s) not shown%s", rest, opt.MoreHint)
	}
	if d.RangesFor != "" {
		if err := writeRanges(p, d, opt); err != nil {
			return err
		}
	}
	if opt.Nodes {
		p.gap()
		p.head("Nodes")
		var nrows [][]string
		header := []string{"node", "supply", "net out", "potential"}
		align := []tw.Align{tw.AlignLeft, tw.AlignRight, tw.AlignRight, tw.AlignRight}
		if d.RangesFor != "" {
			header = append(header, "one more unit costs", "one less saves")
			align = append(align, tw.AlignRight, tw.AlignRight)
		}
		for v := 0; v < d.NumNodes(); v++ {
			nd := d.Node(v)
			row := []string{nd.ID, nd.Supply, nd.NetOut, deref(nd.Potential, "-")}
			if d.RangesFor != "" {
				row = append(row, deref(nd.ShadowPrice, "cannot"), deref(nd.PriceIfLess, "cannot"))
			}
			nrows = append(nrows, row)
		}
		if err := p.table(header, nrows, align); err != nil {
			return err
		}
	}
	p.gap()
	p.line("%s", d.Caution)
	return p.err
}

// writeRanges prints the rate ranges: problem lanes' order is not needed
// here, so lanes come in input order, cut like the lane table.
func writeRanges(p *printer, d *Document, opt Options) error {
	p.gap()
	p.head("Rate ranges")
	which := "this plan"
	if d.RangesFor != "plan" {
		which = "the optimal plan (the repair above)"
	}
	p.line("Rates at which %s stays optimal (break-even rate for unused lanes; * = found by a route through the residual network):", which)
	var rows [][]string
	for i := 0; i < d.NumLanes(); i++ {
		if opt.Rows > 0 && i == opt.Rows {
			break
		}
		l := d.Lane(i)
		r := l.Range
		lower, upper := deref(r.Lower, "no limit"), deref(r.Upper, "no limit")
		if r.ByRoute {
			lower, upper = star(r.Lower, lower), star(r.Upper, upper)
		}
		rows = append(rows, []string{l.ID, l.From, l.To, l.Cost, strings.ReplaceAll(r.State, "-", " "), lower, upper, deref(r.CapacityValue, "")})
	}
	if err := p.table([]string{"lane", "from", "to", "rate", "state", "lowest rate", "highest rate", "capacity worth"}, rows,
		[]tw.Align{tw.AlignLeft, tw.AlignLeft, tw.AlignLeft, tw.AlignRight, tw.AlignLeft, tw.AlignRight, tw.AlignRight, tw.AlignRight}); err != nil {
		return err
	}
	if rest := d.NumLanes() - len(rows); rest > 0 {
		p.line("... %d more lane(s) not shown%s", rest, opt.MoreHint)
	}
	return nil
}

func star(v *string, s string) string {
	if v == nil {
		return s
	}
	return s + "*"
}

func netLine(d *Document) string {
	s := d.Inputs.Network
	if d.Inputs.Nodes != "" {
		s += " + " + d.Inputs.Nodes
	}
	return fmt.Sprintf("%s (%d nodes, %d lanes)", s, d.NodeCount, d.LaneCount)
}

func violationText(v Violation) string {
	max := "no limit"
	if v.Max != nil {
		max = *v.Max
	}
	switch v.Kind {
	case "below-minimum":
		return fmt.Sprintf("lane %s carries %s, below its minimum %s", v.Lane, v.Actual, v.Min)
	case "above-capacity":
		return fmt.Sprintf("lane %s carries %s, above its capacity %s", v.Lane, v.Actual, max)
	case "unbalanced":
		if v.Max != nil && v.Min == *v.Max {
			switch {
			case strings.HasPrefix(v.Min, "-"):
				return fmt.Sprintf("node %s receives %s net (inflow minus outflow), its demand is %s", v.Node, negate(v.Actual), negate(v.Min))
			case isZero(v.Min) && strings.HasPrefix(v.Actual, "-"):
				return fmt.Sprintf("node %s takes in %s more than it sends on; a node without supply or demand must pass everything on", v.Node, negate(v.Actual))
			case isZero(v.Min):
				return fmt.Sprintf("node %s sends on %s more than it takes in; a node without supply or demand must pass everything on", v.Node, v.Actual)
			}
			return fmt.Sprintf("node %s ships %s net (outflow minus inflow), its supply is %s", v.Node, v.Actual, v.Min)
		}
		return fmt.Sprintf("node %s: outflow minus inflow is %s, want %s to %s", v.Node, v.Actual, v.Min, max)
	}
	return fmt.Sprintf("total demand %s exceeds total supply %s: no plan can meet it", v.Min, v.Actual)
}

// percent turns a share such as "0.023100" into "2.31%" (rounded to two
// places for display; the JSON keeps the share).
func percent(share string) string {
	r, ok := new(big.Rat).SetString(share)
	if !ok {
		return share
	}
	return r.Mul(r, big.NewRat(100, 1)).FloatString(2) + "%"
}

// negate flips the sign of an exact decimal string.
func negate(s string) string {
	switch {
	case strings.HasPrefix(s, "-"):
		return s[1:]
	case isZero(s):
		return s
	}
	return "-" + s
}

func isZero(s string) bool { return strings.Trim(s, "0.") == "" }

func stepRows(c CycleDoc) [][]string {
	var rows [][]string
	for _, s := range c.Steps {
		switch s.Change {
		case "keep-more", "keep-less":
			what := "ship less from origin (keep more)"
			if s.Change == "keep-less" {
				what = "ship more from origin (keep less)"
			}
			rows = append(rows, []string{what, "-", s.From, "-", "0"})
		default:
			sign := "+ more"
			if s.Change == "less" {
				sign = "- less"
			}
			rows = append(rows, []string{sign, s.Lane, s.From, s.To, s.Rate})
		}
	}
	return rows
}

func laneRows(d *Document, limit int) ([][]string, int) {
	n := len(d.order)
	if limit > 0 && limit < n {
		n = limit
	}
	rows := make([][]string, 0, n)
	for _, e := range d.order[:n] {
		l := d.Lane(e)
		slack := "-"
		if l.SlackOK != nil {
			slack = "ok"
			if !*l.SlackOK {
				slack = "BROKEN"
			}
		}
		rows = append(rows, []string{l.ID, l.From, l.To, l.Cost, l.Flow, l.Min + ".." + deref(l.Max, "no limit"),
			strings.ReplaceAll(l.State, "-", " "), deref(l.ReducedCost, "-"), slack})
	}
	return rows, n
}

// printer writes lines and tables, keeping the first error.
type printer struct {
	w     io.Writer
	md    bool
	err   error
	blank bool // the last line written was empty
}

func (p *printer) line(format string, args ...any) {
	if p.err == nil {
		_, p.err = fmt.Fprintf(p.w, format+"\n", args...)
		p.blank = format == ""
	}
}

// gap writes an empty line unless the last line was one.
func (p *printer) gap() {
	if !p.blank {
		p.line("")
	}
}

func (p *printer) kv(k, v string) {
	if p.md {
		p.line("- **%s:** %s", k, mdEscape(v))
		return
	}
	p.line("%-16s %s", k, v)
}

func (p *printer) head(s string) {
	if p.md {
		p.line("## %s", s)
		p.gap()
		return
	}
	p.line("%s", s)
}

func (p *printer) bullet(s string) {
	if p.md {
		p.line("- %s", mdEscape(s))
		return
	}
	p.line("  - %s", s)
}

func mdEscape(s string) string {
	if strings.ContainsAny(s, mdSpecial) {
		return mdEscaper.Replace(s)
	}
	return s
}

// mdSpecial lists the characters mdEscaper replaces; mdEscaper is built
// once (a Replacer builds its tables on first use, which cost more than
// the replacing when it was made per cell).
const mdSpecial = "|*_<>`"

var mdEscaper = strings.NewReplacer("|", `\|`, "*", `\*`, "_", `\_`, "<", "&lt;", ">", "&gt;", "`", "\\`")

// table renders rows with every tablewriter option set explicitly, so the
// output does not depend on the library's defaults.
func (p *printer) table(header []string, rows [][]string, align []tw.Align) error {
	if p.err != nil {
		return p.err
	}
	var rend tw.Renderer
	if p.md {
		rend = renderer.NewMarkdown()
	} else {
		rend = renderer.NewBlueprint(tw.Rendition{
			Borders: tw.Border{Left: tw.On, Right: tw.On, Top: tw.On, Bottom: tw.On},
			Symbols: tw.NewSymbols(tw.StyleASCII),
			Settings: tw.Settings{
				Separators: tw.Separators{BetweenRows: tw.Off, BetweenColumns: tw.On},
				Lines:      tw.Lines{ShowHeaderLine: tw.On},
			},
		})
	}
	cell := func(a tw.Align) tw.CellConfig {
		return tw.CellConfig{
			Formatting: tw.CellFormatting{AutoWrap: tw.WrapNone, AutoFormat: tw.Off},
			Alignment:  tw.CellAlignment{Global: a, PerColumn: align},
			Padding:    tw.CellPadding{Global: tw.Padding{Left: " ", Right: " ", Overwrite: true}},
		}
	}
	t := tablewriter.NewTable(p.w,
		tablewriter.WithRenderer(rend),
		tablewriter.WithConfig(tablewriter.Config{
			Header:   cell(tw.AlignLeft),
			Row:      cell(tw.AlignLeft),
			Footer:   cell(tw.AlignLeft),
			Behavior: tw.Behavior{TrimSpace: tw.Off, AutoHide: tw.Off},
		}),
	)
	if p.md {
		p.gap()
	}
	t.Header(toAny(header, p.md)...)
	for _, r := range rows {
		if err := t.Append(toAny(r, p.md)...); err != nil {
			p.err = err
			return err
		}
	}
	if err := t.Render(); err != nil {
		p.err = err
		return err
	}
	p.blank = false
	if p.md {
		p.gap()
	}
	return nil
}

func toAny(s []string, md bool) []any {
	out := make([]any, len(s))
	for i, v := range s {
		if md {
			v = mdEscape(v)
		}
		out[i] = v
	}
	return out
}
