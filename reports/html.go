package reports

import (
	"crypto/sha256"
	"encoding/base64"
	"fmt"
	"html/template"
	"io"
	"strconv"
	"strings"

	"lanecert/dual"
)

// The HTML report: one self-contained HTML5 file (no external scripts,
// fonts, images or styles) with the verdict and its numbers, the
// certificate in words, the repair, a drawing of the network (svg.go),
// charts (charts.go), and the lane and node tables. All user text goes
// through html/template, which escapes it for its context. A
// Content-Security-Policy allows no fetch at all and runs only the page's
// own script (by its SHA-256), so even text that slipped through unescaped
// could not load or run anything.
//
// Sorting by a column header and the "problem lanes only" filter are a few
// lines of inline JavaScript; without it the page reads the same. Numbers
// sort by their decimal value for display only.
//
// The tables fit a 1200 pixel wide window without sideways scrolling:
// numbers never wrap and use tabular digits, names wrap at spaces and after
// the separators in breakAfter, and the columns carried over from the
// input (mode, carrier, ...) sit behind a "show more columns" box, since
// there may be any number of them. The box works by CSS alone (:has());
// a browser without :has() shows every column. Hidden columns stay in the
// page, and print shows every column in a smaller type.

// HTML is the self-contained HTML report (see WriteHTML).
const HTML Format = "html"

// htmlScript sorts the tables by a clicked header and filters the lane
// table to problem lanes. It is hashed into the page's
// Content-Security-Policy, so it must stay a constant.
const htmlScript = `
(function () {
  "use strict";
  function key(cell, numeric) {
    var t = cell.textContent.trim();
    if (!numeric) { return t.toLowerCase(); }
    if (t === "no limit") { return Infinity; }
    var v = parseFloat(t);
    return isNaN(v) ? -Infinity : v;
  }
  Array.prototype.forEach.call(document.querySelectorAll("table.sortable"), function (table) {
    var heads = table.tHead.rows[0].cells;
    Array.prototype.forEach.call(heads, function (th, col) {
      var button = th.querySelector("button");
      if (!button) { return; }
      button.addEventListener("click", function () {
        var numeric = th.getAttribute("data-sort") === "num";
        var up = th.getAttribute("aria-sort") !== "ascending";
        Array.prototype.forEach.call(heads, function (h) { h.removeAttribute("aria-sort"); });
        th.setAttribute("aria-sort", up ? "ascending" : "descending");
        var body = table.tBodies[0];
        var rows = Array.prototype.slice.call(body.rows);
        rows.sort(function (a, b) {
          var x = key(a.cells[col], numeric), y = key(b.cells[col], numeric), c = 0;
          if (x < y) { c = -1; } else if (x > y) { c = 1; }
          if (!up) { c = -c; }
          return c || (Number(a.getAttribute("data-order")) - Number(b.getAttribute("data-order")));
        });
        rows.forEach(function (r) { body.appendChild(r); });
      });
    });
  });
  var box = document.getElementById("problem-only");
  var table = document.getElementById("lane-table");
  if (box && table) {
    box.addEventListener("change", function () { table.classList.toggle("only-problems", box.checked); });
  }
})();
`

// htmlPolicy is the page's Content-Security-Policy: nothing is fetched,
// inline styles are allowed, and only htmlScript runs.
func htmlPolicy() string {
	sum := sha256.Sum256([]byte(htmlScript))
	return "default-src 'none'; style-src 'unsafe-inline'; img-src data:; script-src 'sha256-" + base64.StdEncoding.EncodeToString(sum[:]) + "'"
}

// fact is one line of the numbers section.
type fact struct {
	ID, Key, Value string
}

type htmlStep struct {
	N        int
	Change   string // "more", "less", "keep-more", "keep-less"
	Text     string
	Lane     string
	From, To string
	Rate     string
}

type htmlCycle struct {
	N       int
	Summary string
	Steps   []htmlStep
}

// htmlCell is one table cell. A number is right-aligned and never wraps;
// other text may wrap at spaces and after the separators in breakAfter.
type htmlCell struct {
	Text   string
	Class  string // extra class, such as "bad"
	Num    bool
	Detail bool // hidden on screen until "show" is ticked
}

// Classes is the cell's class attribute ("" for none).
func (c htmlCell) Classes() string {
	var cls []string
	if c.Num {
		cls = append(cls, "num")
	}
	if c.Class != "" {
		cls = append(cls, c.Class)
	}
	if c.Detail {
		cls = append(cls, "detail")
	}
	return strings.Join(cls, " ")
}

// Wrapped is the cell's text as HTML: numbers as they are, other text with
// break points (see breakable).
func (c htmlCell) Wrapped() template.HTML {
	if c.Num {
		return template.HTML(template.HTMLEscapeString(c.Text))
	}
	return breakable(c.Text)
}

// breakAfter lists the separators after which a long name may wrap (the
// browser already wraps at spaces and after hyphens).
const breakAfter = "_/\\.:|"

// breakable escapes s and adds a <wbr> (a break point with no text of its
// own, so copied text and sort keys stay s) after each run of separators
// in breakAfter that is followed by more of the name. Time O(len(s)).
func breakable(s string) template.HTML {
	var b strings.Builder
	start := 0
	for i := 0; i+1 < len(s); i++ {
		next := s[i+1]
		if strings.IndexByte(breakAfter, s[i]) < 0 || strings.IndexByte(breakAfter, next) >= 0 || next == ' ' {
			continue
		}
		b.WriteString(template.HTMLEscapeString(s[start : i+1]))
		b.WriteString("<wbr>")
		start = i + 1
	}
	b.WriteString(template.HTMLEscapeString(s[start:]))
	return template.HTML(b.String())
}

type htmlCol struct {
	Name   string
	Sort   string // "num" or "text"
	Detail bool   // hidden on screen until "show" is ticked
}

func textCol(name string) htmlCol { return htmlCol{Name: name, Sort: "text"} }
func numCol(name string) htmlCol  { return htmlCol{Name: name, Sort: "num"} }

type htmlRow struct {
	Order int
	Class string
	State string
	Cells []htmlCell
}

// attrEscaper escapes an attribute value as html/template does.
var attrEscaper = strings.NewReplacer("\x00", "\uFFFD", `"`, "&#34;", "&", "&amp;", "'", "&#39;", "+", "&#43;", "<", "&lt;", ">", "&gt;")

// tableBody renders rows as the lines of a table body, with data-state and
// class attributes when withState is set: the same bytes as a template
// range over the rows would write, but without a reflective call per cell
// (a page of 10^5 lanes took 8 s in the template, most of its time).
// Time and memory O(size of the rows).
func tableBody(rows []htmlRow, withState bool) template.HTML {
	var b strings.Builder
	for _, r := range rows {
		b.WriteString(`<tr data-order="`)
		b.WriteString(strconv.Itoa(r.Order))
		b.WriteByte('"')
		if withState {
			b.WriteString(` data-state="`)
			attrEscaper.WriteString(&b, r.State)
			b.WriteByte('"')
			if r.Class != "" {
				b.WriteString(` class="`)
				attrEscaper.WriteString(&b, r.Class)
				b.WriteByte('"')
			}
		}
		b.WriteByte('>')
		for _, c := range r.Cells {
			b.WriteString("<td")
			if cls := c.Classes(); cls != "" {
				b.WriteString(` class="`)
				attrEscaper.WriteString(&b, cls)
				b.WriteByte('"')
			}
			b.WriteByte('>')
			b.WriteString(string(c.Wrapped()))
			b.WriteString("</td>")
		}
		b.WriteString("</tr>\n")
	}
	return template.HTML(b.String())
}

type htmlView struct {
	Policy       string
	Script       template.JS
	Title        string
	VerdictClass string
	VerdictLine  string
	Caution      string
	Facts        []fact
	Proof        []string // the certificate in words
	Violations   []string
	Cut          *CutDoc
	Cycles       []htmlCycle
	RepairHow    string
	Repair       []ChangeDoc
	RepairMore   int
	Drawing      drawing
	Charts       []chart
	LaneCols     []htmlCol
	LaneDetails  string // the names of the hidden lane columns, for the "show" box
	Lanes        []htmlRow
	LaneBody     template.HTML // Lanes rendered (tableBody)
	LaneTotal    int
	LaneMore     int
	Problems     int
	NodeCols     []htmlCol
	Nodes        []htmlRow
	NodeBody     template.HTML // Nodes rendered (tableBody)
	NodeMore     int
	MoreHint     string
}

// writeHTML renders d as one self-contained HTML page. opt.Rows limits the
// lane and node tables (problem lanes first; 0: all); the drawing and the
// charts cover the whole network (the drawing only its problem lanes above
// drawLaneLimit lanes). Time O(|V|+|E| log |E|); memory O(|V|+|E|) for the
// drawing plus the rows shown.
func writeHTML(w io.Writer, d *Document, opt Options) error {
	t, err := template.New("report").Funcs(template.FuncMap{"breakable": breakable}).Parse(htmlPage)
	if err != nil {
		return fmt.Errorf("reports: html template: %w", err)
	}
	v, err := htmlModel(d, opt)
	if err != nil {
		return err
	}
	if err := t.Execute(w, v); err != nil {
		return fmt.Errorf("reports: html: %w", err)
	}
	return nil
}

func htmlModel(d *Document, opt Options) (*htmlView, error) {
	v := &htmlView{
		Policy:       htmlPolicy(),
		Script:       template.JS(htmlScript),
		Title:        "lanecert audit: " + strings.ReplaceAll(d.Verdict, "-", " "),
		VerdictClass: "verdict-" + d.Verdict,
		VerdictLine:  verdictLine(d),
		Caution:      d.Caution,
		Facts:        htmlFacts(d),
		Proof:        htmlProof(d),
		Cut:          d.Cut,
		MoreHint:     opt.MoreHint,
		LaneTotal:    d.NumLanes(),
	}
	for _, x := range d.Violations {
		v.Violations = append(v.Violations, violationText(x))
	}
	for i, c := range d.Cycles {
		v.Cycles = append(v.Cycles, htmlCycleOf(i+1, c))
	}
	if len(d.Repair) > 0 {
		v.RepairHow = "the network simplex started from this plan"
		if d.Solver != nil && d.Solver.Start == "scratch" {
			v.RepairHow = "the network simplex solved from scratch"
		}
		v.Repair = d.Repair
		if opt.Rows > 0 && len(v.Repair) > opt.Rows {
			v.Repair, v.RepairMore = v.Repair[:opt.Rows], len(d.Repair)-opt.Rows
		}
	}
	v.Drawing = drawNetwork(d)
	charts, err := buildCharts(d)
	if err != nil {
		return nil, err
	}
	v.Charts = charts
	htmlLanes(d, opt, v)
	htmlNodes(d, opt, v)
	v.LaneBody, v.NodeBody = tableBody(v.Lanes, true), tableBody(v.Nodes, false)
	return v, nil
}

func htmlFacts(d *Document) []fact {
	var f []fact
	add := func(id, k, v string) { f = append(f, fact{id, k, v}) }
	add("fact-network", "Network", netLine(d))
	for i, note := range d.Notes {
		add(fmt.Sprintf("fact-read-%d", i+1), "Read", note)
	}
	add("fact-plan", "Plan", d.Inputs.Plan)
	add("fact-plan-cost", "Plan cost", d.PlanCost)
	switch {
	case d.Shortfall != nil:
		add("fact-shortfall", "Shortfall", fmt.Sprintf("at least %s units cannot be delivered by any plan", *d.Shortfall))
	case d.Unbounded:
		add("fact-optimal-cost", "Optimal cost", "none: a cycle of lanes without capacity lowers the cost without limit")
	case d.OptimalCost != nil:
		add("fact-optimal-cost", "Optimal cost", *d.OptimalCost)
		if d.Gap != nil {
			g := *d.Gap
			if d.GapShare != nil {
				g += fmt.Sprintf(" (%s of the optimum)", percent(*d.GapShare))
			}
			add("fact-gap", "Gap", g)
		}
		if d.UniqueOptimum != nil {
			if *d.UniqueOptimum {
				add("fact-unique", "Optimum", "unique: no other plan costs as little")
			} else {
				add("fact-unique", "Optimum", "not unique: other plans cost as little")
			}
		}
	}
	for i, l := range d.LeftOut {
		add(fmt.Sprintf("fact-left-out-%d", i+1), "Left out", l)
	}
	if d.DualObjective != nil {
		add("fact-dual", "Dual objective", fmt.Sprintf("%s = supply terms %s + minimum terms %s + capacity terms %s, equal to the plan cost",
			*d.DualObjective, d.DualTerms.Supply, d.DualTerms.Minimum, d.DualTerms.Capacity))
	}
	s := d.States
	add("fact-lanes", "Lanes", fmt.Sprintf("%d in use, %d unused, %d at capacity, %d at minimum, %d fixed, %d out of bounds",
		s.InUse, s.Unused, s.AtCapacity, s.AtMinimum, s.Fixed, s.OutOfBounds))
	if d.Potentials != "" {
		how := "set by the lanes in use"
		if d.Potentials == "shortest-paths" {
			how = "lanes in use leave them open; shortest paths over the residual network fix them"
		}
		add("fact-potentials", "Potentials", fmt.Sprintf("%s (%d piece(s) of lanes strictly between bounds)", how, d.Pieces))
		add("fact-broken", "Broken lanes", fmt.Sprintf("%d (reduced cost of the wrong sign for the lane's state)", d.BrokenLanes))
	}
	add("fact-totals", "Supply and demand", fmt.Sprintf("total supply %s, total demand %s", d.Totals.Supply, d.Totals.Demand))
	if len(d.Kept) > 0 {
		var parts []string
		for _, k := range d.Kept {
			parts = append(parts, fmt.Sprintf("%s keeps %s", k.Node, k.Quantity))
		}
		add("fact-kept", "Kept at origin", fmt.Sprintf("%s in all: %s", d.Totals.Kept, strings.Join(parts, "; ")))
	}
	if len(d.Unmet) > 0 {
		var parts []string
		for _, u := range d.Unmet {
			parts = append(parts, fmt.Sprintf("%s %s (cost %s)", u.Node, u.Units, u.Cost))
		}
		add("fact-unmet", "Unmet demand", fmt.Sprintf("at the shortfall price %s: %s", d.Inputs.ShortfallPrice, strings.Join(parts, "; ")))
	}
	if d.Inputs.Tolerance != "" {
		var parts []string
		const listed = 20
		for i, r := range d.Rounded {
			if i == listed {
				parts = append(parts, fmt.Sprintf("and %d more", len(d.Rounded)-listed))
				break
			}
			parts = append(parts, fmt.Sprintf("lane %s: %s read as %s", r.Lane, r.Given, r.Used))
		}
		val := fmt.Sprintf("%s: %d plan quantities rounded", d.Inputs.Tolerance, len(d.Rounded))
		if len(parts) > 0 {
			val += " (" + strings.Join(parts, "; ") + ")"
		}
		add("fact-tolerance", "Tolerance", val)
	}
	if d.Solver != nil {
		add("fact-solver", "Solver", fmt.Sprintf("network simplex from %s, %d pivot(s)", d.Solver.Start, d.Solver.Pivots))
	}
	return f
}

// htmlProof says in words what the certificate proves.
func htmlProof(d *Document) []string {
	switch d.Verdict {
	case "optimal":
		p := []string{
			"Each node has a potential p: its marginal landed cost, the cost of one more unit delivered there. For every lane the reduced cost r = rate + p(from) − p(to) has the sign its state allows: r = 0 on lanes strictly between their bounds, r ≥ 0 on lanes at their minimum (unused lanes included), r ≤ 0 on lanes at capacity.",
		}
		if d.DualObjective != nil {
			p = append(p, fmt.Sprintf("So the dual objective of these potentials, %s (supply terms %s, minimum terms %s, capacity terms %s), equals the plan cost %s. Every plan for this network costs at least the dual objective of any potentials, so no plan costs less than this one. Anyone can check this by hand from the node and lane tables below.",
				*d.DualObjective, d.DualTerms.Supply, d.DualTerms.Minimum, d.DualTerms.Capacity, d.PlanCost))
		}
		return p
	case "not-optimal":
		return []string{fmt.Sprintf("The plan keeps every bound and balance, but %d lane(s) break the sign rule of their state under the potentials the lanes in use set. Each reroute below is a cycle of changes that keeps every bound and balance and lowers the cost: it proves a cheaper plan exists.", d.BrokenLanes)}
	case VerdictNetworkInfeasible:
		p := []string{"No plan can meet the demands with these lanes and bounds."}
		if c := d.Cut; c != nil {
			s := fmt.Sprintf("Proof: the region %s needs %s more units than it holds, but at most %s can reach it, so %s units are short.", joinAnd(c.Nodes), c.Demand, c.Reach, c.Shortfall)
			if len(c.FullLanes) > 0 {
				s += " The lanes into it (" + joinAnd(c.FullLanes) + ") are full in every plan."
			}
			if len(c.OutLanes) > 0 {
				s += " Lanes out of it with a minimum: " + joinAnd(c.OutLanes) + "."
			}
			if c.KeptSupply {
				s += " The region also counts the supply origins may keep: lane minimums push more into it than its demand can use."
			}
			p = append(p, s)
		}
		return p
	}
	return []string{"The plan breaks the bounds or balances listed below, so it is not a plan for this network; its cost proves nothing."}
}

func htmlCycleOf(n int, c CycleDoc) htmlCycle {
	hc := htmlCycle{N: n}
	if c.Unbounded {
		hc.Summary = fmt.Sprintf("Moving units around this cycle saves %s per unit and no bound stops it: the cost falls without limit.", c.SavingPerUnit)
	} else {
		hc.Summary = fmt.Sprintf("Move %s units around this cycle: it saves %s per unit, %s in all.", *c.Units, c.SavingPerUnit, *c.TotalSaving)
	}
	for i, s := range c.Steps {
		st := htmlStep{N: i + 1, Change: s.Change, Lane: s.Lane, From: s.From, To: s.To, Rate: s.Rate}
		switch s.Change {
		case "keep-more":
			st.Text = fmt.Sprintf("ship less from origin %s (keep more there)", s.From)
		case "keep-less":
			st.Text = fmt.Sprintf("ship more from origin %s (keep less there)", s.From)
		case "more":
			st.Text = fmt.Sprintf("more on lane %s (%s → %s, rate %s)", s.Lane, s.From, s.To, s.Rate)
		default:
			st.Text = fmt.Sprintf("less on lane %s (%s → %s, rate %s)", s.Lane, s.From, s.To, s.Rate)
		}
		hc.Steps = append(hc.Steps, st)
	}
	return hc
}

func htmlLanes(d *Document, opt Options, v *htmlView) {
	v.LaneCols = []htmlCol{textCol("lane"), textCol("from"), textCol("to"), numCol("rate"), numCol("flow"),
		numCol("min"), numCol("max"), textCol("state"), numCol("reduced cost"), textCol("slackness")}
	if d.RangesFor != "" {
		v.LaneCols = append(v.LaneCols, numCol("lowest rate"), numCol("highest rate"), numCol("capacity worth"))
	}
	for _, c := range d.ExtraColumns {
		v.LaneCols = append(v.LaneCols, htmlCol{Name: c, Sort: "text", Detail: true})
	}
	v.LaneDetails = strings.Join(d.ExtraColumns, ", ")
	prob := d.problemLanes()
	for _, e := range prob {
		if e {
			v.Problems++
		}
	}
	shown := len(d.order)
	if opt.Rows > 0 && opt.Rows < shown {
		shown = opt.Rows
	}
	v.LaneMore = len(d.order) - shown
	onCycle := d.onCycle()
	for i, e := range d.order[:shown] {
		l := d.Lane(e)
		slack, slackClass := "-", ""
		if l.SlackOK != nil {
			slack = "ok"
			if !*l.SlackOK {
				slack, slackClass = "BROKEN", "bad"
			}
		}
		var cls []string
		if prob[e] {
			cls = append(cls, "problem")
		}
		if d.audit.State[e] == dual.OutOfBounds {
			cls = append(cls, "out-of-bounds")
		}
		if d.broken[e] {
			cls = append(cls, "broken")
		}
		if onCycle[e] {
			cls = append(cls, "on-reroute")
		}
		row := htmlRow{Order: i, Class: strings.Join(cls, " "), State: l.State, Cells: []htmlCell{
			{Text: l.ID}, {Text: l.From}, {Text: l.To}, numCell(l.Cost), numCell(l.Flow), numCell(l.Min),
			numCell(deref(l.Max, "no limit")), {Text: strings.ReplaceAll(l.State, "-", " ")},
			numCell(deref(l.ReducedCost, "-")), {Text: slack, Class: slackClass},
		}}
		if d.RangesFor != "" {
			r := l.Range
			lower, upper := deref(r.Lower, "no limit"), deref(r.Upper, "no limit")
			if r.ByRoute {
				lower, upper = star(r.Lower, lower), star(r.Upper, upper)
			}
			row.Cells = append(row.Cells, numCell(lower), numCell(upper), numCell(deref(r.CapacityValue, "")))
		}
		for _, c := range d.ExtraColumns {
			row.Cells = append(row.Cells, htmlCell{Text: l.Extra[c], Detail: true})
		}
		v.Lanes = append(v.Lanes, row)
	}
}

// numCell is a cell holding a number (or "no limit", "-" and the like in
// a number column).
func numCell(s string) htmlCell { return htmlCell{Text: s, Num: true} }

func htmlNodes(d *Document, opt Options, v *htmlView) {
	v.NodeCols = []htmlCol{textCol("node"), textCol("role"), numCol("supply"), numCol("net out"), numCol("potential")}
	if d.RangesFor != "" {
		v.NodeCols = append(v.NodeCols, numCol("one more unit costs"), numCol("one less saves"))
	}
	shown := d.NumNodes()
	if opt.Rows > 0 && opt.Rows < shown {
		shown = opt.Rows
	}
	v.NodeMore = d.NumNodes() - shown
	for i := 0; i < shown; i++ {
		nd := d.Node(i)
		row := htmlRow{Order: i, Cells: []htmlCell{{Text: nd.ID}, {Text: nodeRole(d.net.Supply[i])}, numCell(nd.Supply),
			numCell(nd.NetOut), numCell(deref(nd.Potential, "-"))}}
		if d.RangesFor != "" {
			row.Cells = append(row.Cells, numCell(deref(nd.ShadowPrice, "cannot")), numCell(deref(nd.PriceIfLess, "cannot")))
		}
		v.Nodes = append(v.Nodes, row)
	}
}

// htmlPage is the report's template. In its style sheet, the lane table's
// number headers have width 1px, so that those columns take no more than
// their widest entry and the names get the rest of the width; the .detail
// cells (carried-over columns) are hidden on screen only, while
// #lane-details is not ticked, so print shows them.
const htmlPage = `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="{{.Policy}}">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="generator" content="lanecert">
<title>{{.Title}}</title>
<style>
:root { --ink: #1b1b1b; --muted: #5a5a5a; --rule: #d0d0d0; --band: #f3f1ec; }
* { box-sizing: border-box; }
body { margin: 0 auto; max-width: 1100px; padding: 1.5rem; font: 15px/1.45 system-ui, -apple-system, "Segoe UI", Roboto, Arial, sans-serif; color: var(--ink); background: #fff; }
h1 { font-size: 1.5rem; margin: 0 0 .4rem; }
h2 { font-size: 1.15rem; margin: 2rem 0 .6rem; padding-bottom: .2rem; border-bottom: 2px solid var(--ink); }
h3 { font-size: 1rem; margin: 1.2rem 0 .4rem; }
.verdict { padding: 1rem 1.2rem; border-left: 10px solid; background: var(--band); }
.verdict-optimal { border-color: #009E73; }
.verdict-not-optimal { border-color: #E69F00; }
.verdict-plan-infeasible, .verdict-network-infeasible { border-color: #D55E00; }
.verdict-line { font-size: 1.2rem; font-weight: 700; margin: 0; }
.caution { margin: 1rem 0; padding: .8rem 1rem; border: 2px solid #000; background: #fff8d6; font-weight: 600; }
.caution::before { content: "Caution: "; }
dl.facts { display: grid; grid-template-columns: max-content 1fr; gap: .25rem 1rem; margin: 0; }
dl.facts dt { font-weight: 600; }
dl.facts dd { margin: 0; font-variant-numeric: tabular-nums; }
.table-wrap { overflow-x: auto; }
table { border-collapse: collapse; width: 100%; font-size: .9rem; }
th, td { padding: .25rem .35rem; border-bottom: 1px solid var(--rule); text-align: left; vertical-align: top; }
th:first-child, td:first-child { padding-left: .5rem; }
td.num, th[data-sort="num"] { padding-left: .25rem; padding-right: .25rem; text-align: right; font-variant-numeric: tabular-nums; }
td.num { white-space: nowrap; }
td.num + td:not(.num), th[data-sort="num"] + th:not([data-sort]) { padding-left: .6rem; }
#lane-table th[data-sort="num"] { width: 1px; }
th button { all: unset; cursor: pointer; font-weight: 700; }
th button:focus-visible { outline: 2px solid #0072B2; }
th[aria-sort="ascending"] button::after { content: " ▲"; }
th[aria-sort="descending"] button::after { content: " ▼"; }
tr.problem td:first-child { box-shadow: inset 4px 0 0 #D55E00; }
td.bad { font-weight: 700; color: #B34700; }
#lane-table.only-problems tbody tr:not(.problem) { display: none; }
@media screen { #lanes:has(#lane-details:not(:checked)) .detail { display: none; } }
.more, .note { color: var(--muted); font-style: italic; }
figure { margin: 1rem 0; }
figcaption { color: var(--muted); font-size: .9rem; }
svg.network, svg.chart-svg { width: 100%; height: auto; border: 1px solid var(--rule); background: #fff; }
svg.chart-svg { max-width: 640px; display: block; }
.controls { margin: .5rem 0; }
footer { margin-top: 2rem; font-size: .85rem; color: var(--muted); }
@media print {
  body { max-width: none; padding: 0; font-size: 10pt; }
  table { font-size: 8pt; }
  #lane-table { font-size: 7.5pt; }
  th, td, td.num, th[data-sort="num"] { padding: .1rem .15rem; }
  th:first-child, td:first-child { padding-left: .4rem; }
  td.num + td:not(.num), th[data-sort="num"] + th:not([data-sort]) { padding-left: .3rem; }
  .controls, th button::after { display: none; }
  th button { all: unset; font-weight: 700; }
  section, figure, tr { break-inside: avoid; }
  h2 { break-after: avoid; }
  .verdict, .caution, svg, tr.problem td:first-child { print-color-adjust: exact; -webkit-print-color-adjust: exact; }
  .table-wrap { overflow: visible; }
}
</style>
</head>
<body>
<header id="verdict" class="verdict {{.VerdictClass}}">
<h1>lanecert audit</h1>
<p class="verdict-line">{{.VerdictLine}}</p>
</header>
<p id="caution" class="caution" role="note">{{.Caution}}</p>
<section id="numbers">
<h2>The numbers</h2>
<dl class="facts">
{{range .Facts}}<dt>{{.Key}}</dt><dd id="{{.ID}}">{{.Value}}</dd>
{{end}}</dl>
</section>
<section id="certificate">
<h2>Certificate</h2>
{{range .Proof}}<p>{{.}}</p>
{{end}}{{if .Violations}}<ul id="violations">
{{range .Violations}}<li>{{.}}</li>
{{end}}</ul>
{{end}}{{range .Cycles}}<div class="reroute" id="reroute-{{.N}}">
<h3>Reroute {{.N}}</h3>
<p>{{.Summary}}</p>
<ol class="steps">
{{range .Steps}}<li class="step-{{.Change}}" data-change="{{.Change}}">{{.Text}}</li>
{{end}}</ol>
</div>
{{end}}</section>
{{if .Repair}}<section id="repair">
<h2>Repair</h2>
<p>An optimal plan ({{.RepairHow}}) changes these lanes, largest saving first:</p>
<div class="table-wrap"><table id="repair-table" class="sortable">
<thead><tr><th scope="col"><button type="button">lane</button></th><th scope="col"><button type="button">from</button></th><th scope="col"><button type="button">to</button></th><th scope="col" data-sort="num"><button type="button">plan</button></th><th scope="col" data-sort="num"><button type="button">optimal</button></th><th scope="col" data-sort="num"><button type="button">cost change</button></th></tr></thead>
<tbody>
{{range $i, $c := .Repair}}<tr data-order="{{$i}}"><td>{{breakable $c.Lane}}</td><td>{{breakable $c.From}}</td><td>{{breakable $c.To}}</td><td class="num">{{$c.Old}}</td><td class="num">{{$c.New}}</td><td class="num">{{$c.CostChange}}</td></tr>
{{end}}</tbody>
</table></div>
{{if .RepairMore}}<p class="more">… {{.RepairMore}} more change(s) not shown{{.MoreHint}}</p>
{{end}}</section>
{{end}}<section id="network">
<h2>Network</h2>
{{if .Drawing.Note}}<p id="drawing-note" class="note">{{.Drawing.Note}}</p>
{{end}}{{if .Drawing.SVG}}<figure id="network-figure">
{{.Drawing.SVG}}<figcaption>Lanes by state: colour, dash pattern and end marker each tell the state. Hover a lane or node for its numbers.</figcaption>
</figure>
{{end}}</section>
<section id="charts">
<h2>Charts</h2>
{{range .Charts}}<figure class="chart" id="{{.ID}}">
<figcaption><strong>{{.Title}}</strong>{{if .Caption}} — {{.Caption}}{{end}}</figcaption>
{{if .SVG}}{{.SVG}}{{else}}<p class="note">{{.Note}}</p>
{{end}}</figure>
{{end}}</section>
<section id="lanes">
<h2>Lanes</h2>
<p class="controls"><label><input type="checkbox" id="problem-only"> problem lanes only</label> ({{.Problems}} out of bounds, breaking optimality or on a reroute).{{if .LaneDetails}} <label><input type="checkbox" id="lane-details"> show more columns ({{.LaneDetails}})</label>.{{end}} Click a column header to sort.</p>
<div class="table-wrap"><table id="lane-table" class="sortable">
<thead><tr>{{range .LaneCols}}<th scope="col"{{if eq .Sort "num"}} data-sort="num"{{end}}{{if .Detail}} class="detail"{{end}}><button type="button">{{.Name}}</button></th>{{end}}</tr></thead>
<tbody>
{{.LaneBody}}</tbody>
</table></div>
{{if .LaneMore}}<p class="more">… {{.LaneMore}} more lane(s) not shown{{.MoreHint}}</p>
{{end}}</section>
<section id="nodes">
<h2>Nodes</h2>
<div class="table-wrap"><table id="node-table" class="sortable">
<thead><tr>{{range .NodeCols}}<th scope="col"{{if eq .Sort "num"}} data-sort="num"{{end}}><button type="button">{{.Name}}</button></th>{{end}}</tr></thead>
<tbody>
{{.NodeBody}}</tbody>
</table></div>
{{if .NodeMore}}<p class="more">… {{.NodeMore}} more node(s) not shown{{.MoreHint}}</p>
{{end}}</section>
<footer>
<p>Potentials and reduced costs are in rate units; costs in rate × quantity. Reduced cost r = rate + p(from) − p(to); p is the marginal landed cost at a node.</p>
<p class="caution">{{.Caution}}</p>
</footer>
<script>{{.Script}}</script>
</body>
</html>
`
