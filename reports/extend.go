package reports

import (
	"encoding/json"
	"fmt"
	"io"

	"github.com/olekukonko/tablewriter/tw"

	"lanecert/dual"
	"lanecert/flow"
)

// ExtendSchema names the version of the JSON report of `lanecert extend`.
const ExtendSchema = "lanecert.extend/1"

// ExtendDocument is the report of `lanecert extend`. Numbers are exact
// decimal strings.
type ExtendDocument struct {
	Schema      string     `json:"schema"`
	WasFeasible bool       `json:"was_feasible"`
	BaseCost    *string    `json:"base_cost"`
	Cut         *CutDoc    `json:"cut"`
	Estimated   bool       `json:"estimated_rates"`
	Feasible    bool       `json:"feasible"`
	Added       []AddedDoc `json:"added_lanes"`
	Cost        *string    `json:"cost"`
	Saving      *string    `json:"saving"`
	Method      string     `json:"method"`
	Exact       bool       `json:"exact"`
	Bound       *string    `json:"lower_bound"`
	Candidates  int        `json:"candidates"`
	Caution     string     `json:"caution"`
}

// CutDoc is the proof that demand cannot be met: the region, its net
// demand, what can reach it, the units short, the lanes into it (all full)
// and the lanes out of it with a minimum.
type CutDoc struct {
	Nodes     []string `json:"nodes"`
	Demand    string   `json:"demand"`
	Reach     string   `json:"reachable_supply"`
	Shortfall string   `json:"shortfall"`
	FullLanes []string `json:"full_lanes"`
	OutLanes  []string `json:"lanes_out_with_minimum"`
	// KeptSupply is true when the region also holds the supply origins may
	// keep (only when lane minimums force more into it than it can use; see
	// flow.Cut).
	KeptSupply bool `json:"kept_supply"`
}

// AddedDoc is one candidate lane opened, with its quantity.
type AddedDoc struct {
	ID    string  `json:"id"`
	From  string  `json:"from"`
	To    string  `json:"to"`
	Rate  string  `json:"rate"`
	Fixed string  `json:"fixed_cost"`
	Flow  string  `json:"flow"`
	Km    *string `json:"km,omitempty"`
}

// BuildCut turns a cut into its report form.
func BuildCut(n *flow.Network, c *flow.Cut) *CutDoc {
	d := &CutDoc{Demand: n.FormatQty(c.Demand), Reach: n.FormatQty(c.Reach), Shortfall: n.FormatQty(c.Short),
		Nodes: []string{}, FullLanes: []string{}, OutLanes: []string{}, KeptSupply: c.Hold}
	for _, v := range c.Region {
		d.Nodes = append(d.Nodes, n.Nodes[v])
	}
	for _, a := range c.FullLanes {
		d.FullLanes = append(d.FullLanes, n.LaneName(a))
	}
	for _, a := range c.OutLanes {
		d.OutLanes = append(d.OutLanes, n.LaneName(a))
	}
	return d
}

// BuildExtend assembles the extend report. km, if not nil, gives each
// candidate's estimated length (estimated rates).
func BuildExtend(n *flow.Network, cands []flow.Candidate, km []float64, cut *flow.Cut, x *dual.Extension) *ExtendDocument {
	d := &ExtendDocument{Schema: ExtendSchema, WasFeasible: x.WasFeasible, Feasible: x.Feasible, Method: x.Method,
		Exact: x.Exact, Candidates: len(cands), Estimated: km != nil, Added: []AddedDoc{}, Caution: Caution}
	if x.WasFeasible {
		d.BaseCost = sp(n.FormatCost(x.BaseCost))
	}
	if cut != nil {
		d.Cut = BuildCut(n, cut)
	}
	if x.Feasible {
		d.Cost = sp(n.FormatCost(x.Cost))
		if x.WasFeasible {
			if s, err := x.BaseCost.Sub(x.Cost); err == nil {
				d.Saving = sp(n.FormatCost(s))
			}
		}
	}
	if x.HasBound {
		d.Bound = sp(n.FormatCost(x.Bound))
	}
	for i, k := range x.Chosen {
		c := cands[k]
		a := AddedDoc{ID: c.ID, From: n.Nodes[c.Tail], To: n.Nodes[c.Head], Rate: n.FormatRate(c.Rate),
			Fixed: n.FormatCost(flow.WideFrom(c.Fixed)), Flow: n.FormatQty(x.Flows[i])}
		if km != nil {
			a.Km = sp(fmt.Sprintf("%.1f", km[k]))
		}
		d.Added = append(d.Added, a)
	}
	return d
}

// WriteExtend renders the extend report (table, json or markdown).
func WriteExtend(w io.Writer, d *ExtendDocument, f Format) error {
	if f == JSON || f == CSV {
		enc := json.NewEncoder(w)
		enc.SetIndent("", "  ")
		return enc.Encode(d)
	}
	p := &printer{w: w, md: f == Markdown}
	if p.md {
		p.line("# lanecert extend")
		p.gap()
	}
	if d.Cut != nil {
		c := d.Cut
		p.line("The network cannot meet its demands. Proof: the region below needs %s more units than it holds, but at most %s can reach it, so %s units are short.", c.Demand, c.Reach, c.Shortfall)
		p.kv("Short region", joinAnd(c.Nodes))
		if len(c.FullLanes) > 0 {
			p.kv("Lanes into it", joinAnd(c.FullLanes)+" (full in every plan)")
		} else {
			p.kv("Lanes into it", "none")
		}
		if len(c.OutLanes) > 0 {
			p.kv("Minimums out", joinAnd(c.OutLanes))
		}
		if c.KeptSupply {
			p.line("The region also counts the supply origins may keep: lane minimums push more into it than its demand can use.")
		}
		p.gap()
	} else if d.BaseCost != nil {
		p.kv("Optimal cost now", *d.BaseCost)
	}
	if d.Estimated {
		p.line("Candidate lanes were proposed from coordinates; their rates are ESTIMATES from the rate model, not quotes.")
	}
	switch {
	case !d.Feasible:
		p.line("No set of the %d candidate lanes makes the network feasible.", d.Candidates)
	case len(d.Added) == 0:
		p.line("No candidate lane lowers the cost: keep the network as it is.")
	default:
		p.head("Lanes to add")
		var rows [][]string
		for _, a := range d.Added {
			rows = append(rows, []string{a.ID, a.From, a.To, a.Rate, a.Fixed, a.Flow, deref(a.Km, "")})
		}
		if err := p.table([]string{"lane", "from", "to", "rate", "fixed cost", "units", "km"}, rows,
			[]tw.Align{tw.AlignLeft, tw.AlignLeft, tw.AlignLeft, tw.AlignRight, tw.AlignRight, tw.AlignRight, tw.AlignRight}); err != nil {
			return err
		}
		p.kv("Total cost", *d.Cost+" (with fixed costs)")
		if d.Saving != nil {
			p.kv("Saving", *d.Saving)
		}
	}
	p.kv("Method", d.Method)
	if d.Feasible && !d.Exact && d.Bound != nil {
		p.kv("Lower bound", *d.Bound+" (no choice of lanes costs less; the answer is at most the difference above the best)")
	}
	p.gap()
	p.line("%s", d.Caution)
	return p.err
}
