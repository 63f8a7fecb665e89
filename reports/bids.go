package reports

import (
	"encoding/csv"
	"encoding/json"
	"fmt"
	"io"

	"github.com/olekukonko/tablewriter/tw"

	"lanecert/dual"
	"lanecert/flow"
)

// BidsSchema names the version of the JSON bid report.
const BidsSchema = "lanecert.bids/1"

// BidsDocument is the report of `lanecert bids`. Numbers are exact decimal
// strings; break_even is null when no rate would get the lane used.
type BidsDocument struct {
	Schema      string    `json:"schema"`
	OptimalCost string    `json:"optimal_cost"`
	Bids        []BidDoc  `json:"bids"`
	Set         BidSetDoc `json:"best_set"`
	Caution     string    `json:"caution"`
	net         *flow.Network
}

// BidDoc is one candidate lane.
type BidDoc struct {
	ID            string  `json:"id"`
	From          string  `json:"from"`
	To            string  `json:"to"`
	Rate          string  `json:"rate"`
	Max           *string `json:"max"`
	SameAsLane    *string `json:"same_as_lane"`
	BreakEven     *string `json:"break_even"`
	Used          bool    `json:"used"`
	SavingPerUnit string  `json:"saving_per_unit"`
	Flow          string  `json:"flow"`
	TotalSaving   *string `json:"total_saving"`
	Feasible      bool    `json:"feasible"`
}

// BidSetDoc is the best set of bids taken together.
type BidSetDoc struct {
	Bids     []BidFlowDoc `json:"bids"`
	Saving   *string      `json:"saving"`
	Feasible bool         `json:"feasible"`
}

// BidFlowDoc is one bid of the best set with its quantity.
type BidFlowDoc struct {
	ID   string `json:"id"`
	Flow string `json:"flow"`
}

// BuildBids assembles the bid report.
func BuildBids(n *flow.Network, optCost flow.Wide, cands []flow.Candidate, res []dual.BidResult, set *dual.BidSet) *BidsDocument {
	d := &BidsDocument{Schema: BidsSchema, OptimalCost: n.FormatCost(optCost), Caution: Caution, net: n, Bids: []BidDoc{}}
	for i, c := range cands {
		r := res[i]
		b := BidDoc{ID: c.ID, From: n.Nodes[c.Tail], To: n.Nodes[c.Head], Rate: n.FormatRate(c.Rate),
			Used: r.Used, SavingPerUnit: n.FormatRate(r.SavingPerUnit), Flow: n.FormatQty(r.Flow), Feasible: r.Feasible}
		if c.Upper != flow.NoLimit {
			b.Max = sp(n.FormatQty(c.Upper))
		}
		if c.Same >= 0 {
			b.SameAsLane = sp(n.LaneName(c.Same))
		}
		if r.HasBreakEven {
			b.BreakEven = sp(n.FormatRate(r.BreakEven))
		}
		if r.Feasible {
			b.TotalSaving = sp(n.FormatCost(r.Saving))
		}
		d.Bids = append(d.Bids, b)
	}
	d.Set = BidSetDoc{Bids: []BidFlowDoc{}, Feasible: set.Feasible}
	if set.Feasible {
		d.Set.Saving = sp(n.FormatCost(set.Saving))
		for i, x := range set.Flows {
			if x > 0 {
				d.Set.Bids = append(d.Set.Bids, BidFlowDoc{ID: cands[i].ID, Flow: n.FormatQty(x)})
			}
		}
	}
	return d
}

// WriteBids renders the bid report in format f (table, json, csv or
// markdown; csv is the per-bid table).
func WriteBids(w io.Writer, d *BidsDocument, f Format) error {
	switch f {
	case JSON:
		enc := json.NewEncoder(w)
		enc.SetIndent("", "  ")
		return enc.Encode(d)
	case CSV:
		cw := csv.NewWriter(w)
		if err := cw.Write([]string{"bid", "from", "to", "rate", "max", "same_as_lane", "break_even", "used", "saving_per_unit", "flow", "total_saving"}); err != nil {
			return err
		}
		for _, b := range d.Bids {
			used := "no"
			if b.Used {
				used = "yes"
			}
			if err := cw.Write(SafeCells([]string{b.ID, b.From, b.To, b.Rate, deref(b.Max, ""), deref(b.SameAsLane, ""), deref(b.BreakEven, ""), used, b.SavingPerUnit, b.Flow, deref(b.TotalSaving, "")})); err != nil {
				return err
			}
		}
		cw.Flush()
		return cw.Error()
	}
	p := &printer{w: w, md: f == Markdown}
	if p.md {
		p.line("# lanecert bids")
		p.gap()
	}
	p.kv("Optimal cost now", d.OptimalCost)
	p.gap()
	p.head("Each bid alone")
	var rows [][]string
	for _, b := range d.Bids {
		used := "no"
		if b.Used {
			used = "yes"
		}
		note := ""
		if b.SameAsLane != nil {
			note = "same as lane " + *b.SameAsLane
		}
		if !b.Feasible {
			note = "its minimum makes the network infeasible"
		}
		rows = append(rows, []string{b.ID, b.From, b.To, b.Rate, deref(b.BreakEven, "never"), used, b.SavingPerUnit, b.Flow, deref(b.TotalSaving, "-"), note})
	}
	if err := p.table([]string{"bid", "from", "to", "rate", "break-even", "used", "saving/unit", "units", "total saving", "note"}, rows,
		[]tw.Align{tw.AlignLeft, tw.AlignLeft, tw.AlignLeft, tw.AlignRight, tw.AlignRight, tw.AlignLeft, tw.AlignRight, tw.AlignRight, tw.AlignRight, tw.AlignLeft}); err != nil {
		return err
	}
	p.gap()
	p.head("Best set of bids together")
	switch {
	case !d.Set.Feasible:
		p.line("No choice of bids gives a feasible plan (a bid's minimum cannot be met).")
	case len(d.Set.Bids) == 0:
		p.line("No bid is worth taking: none lowers the cost.")
	default:
		var parts []string
		for _, b := range d.Set.Bids {
			parts = append(parts, fmt.Sprintf("%s (%s units)", b.ID, b.Flow))
		}
		p.line("Take %s: together they save %s.", joinAnd(parts), *d.Set.Saving)
	}
	p.gap()
	p.line("%s", d.Caution)
	return p.err
}

func joinAnd(s []string) string {
	switch len(s) {
	case 0:
		return ""
	case 1:
		return s[0]
	}
	out := s[0]
	for _, x := range s[1 : len(s)-1] {
		out += ", " + x
	}
	return out + " and " + s[len(s)-1]
}
