package reports

import (
	"math/big"
	"sort"

	"lanecert/dual"
	"lanecert/flow"
)

// Schema names the version of the JSON document.
const Schema = "lanecert.audit/1"

// Inputs names what an audit read, for the report's header.
type Inputs struct {
	Network string `json:"network"`
	Nodes   string `json:"nodes,omitempty"`
	Plan    string `json:"plan"`
	// Tolerance is the rounding tolerance given for the plan, "" for none.
	Tolerance string `json:"tolerance,omitempty"`
	// ShortfallPrice is the price per unit of unmet demand, "" for none.
	ShortfallPrice string `json:"shortfall_price,omitempty"`
}

// Document is an audit as a report: the JSON document, and the source of
// every other format. All numbers are exact decimal strings; potentials and
// reduced costs are in rate units, costs in rate × quantity.
type Document struct {
	Schema        string      `json:"schema"`
	Verdict       string      `json:"verdict"`
	Inputs        Inputs      `json:"inputs"`
	NodeCount     int         `json:"node_count"`
	LaneCount     int         `json:"lane_count"`
	PlanCost      string      `json:"plan_cost"`
	OptimalCost   *string     `json:"optimal_cost"`
	Gap           *string     `json:"gap"`
	GapShare      *string     `json:"gap_share"`
	UniqueOptimum *bool       `json:"unique_optimum"`
	Unbounded     bool        `json:"unbounded"`
	Shortfall     *string     `json:"shortfall"`
	Cut           *CutDoc     `json:"cut"`
	Unmet         []UnmetDoc  `json:"unmet"`
	Solver        *SolverDoc  `json:"solver"`
	DualObjective *string     `json:"dual_objective"`
	DualTerms     *DualTerms  `json:"dual_terms"`
	Potentials    string      `json:"potentials_method,omitempty"`
	Pieces        int         `json:"pieces,omitempty"`
	States        StateCounts `json:"lane_states"`
	BrokenLanes   int         `json:"broken_lanes"`
	Totals        Totals      `json:"totals"`
	Kept          []Kept      `json:"kept_at_origins"`
	Rounded       []Rounded   `json:"rounded"`
	Violations    []Violation `json:"violations"`
	Cycles        []CycleDoc  `json:"cycles"`
	Repair        []ChangeDoc `json:"repair"`
	RangesFor     string      `json:"ranges_for,omitempty"`
	ExtraColumns  []string    `json:"extra_columns"`
	Notes         []string    `json:"notes"`
	// LeftOut says which parts of the report are missing and why (for
	// now: a sum that exact 64-bit arithmetic cannot hold).
	LeftOut   []string `json:"left_out"`
	Caution   string   `json:"caution"`
	order     []int    // lanes, problem lanes first
	net       *flow.Network
	audit     *dual.Audit
	broken    []bool // per lane: breaks complementary slackness
	rangeFlow []int64
	sens      *dual.Sensitivity
}

// SolverDoc says how the optimum was found.
type SolverDoc struct {
	// Start is "plan" when the simplex started from the audited plan,
	// "scratch" otherwise.
	Start  string `json:"start"`
	Pivots int64  `json:"pivots"`
}

// ChangeDoc is one lane that the repair changes: the plan's quantity, the
// optimal plan's, and the cost change rate × (new - old).
type ChangeDoc struct {
	Lane       string `json:"lane"`
	From       string `json:"from"`
	To         string `json:"to"`
	Old        string `json:"old"`
	New        string `json:"new"`
	CostChange string `json:"cost_change"`
}

// DualTerms splits the dual objective.
type DualTerms struct {
	Supply   string `json:"supply"`
	Minimum  string `json:"minimum"`
	Capacity string `json:"capacity"`
}

// StateCounts counts lanes by state.
type StateCounts struct {
	Unused      int `json:"unused"`
	InUse       int `json:"in_use"`
	AtCapacity  int `json:"at_capacity"`
	AtMinimum   int `json:"at_minimum"`
	Fixed       int `json:"fixed"`
	OutOfBounds int `json:"out_of_bounds"`
}

// Totals are the network's total supply and demand and the supply kept.
type Totals struct {
	Supply string `json:"supply"`
	Demand string `json:"demand"`
	Kept   string `json:"kept"`
}

// Kept is supply an origin keeps when supply exceeds demand.
type Kept struct {
	Node     string `json:"node"`
	Quantity string `json:"quantity"`
}

// Rounded is a plan quantity rounded under the tolerance.
type Rounded struct {
	Lane  string `json:"lane"`
	Given string `json:"given"`
	Used  string `json:"used"`
}

// Violation is a broken bound or balance. Max is null when there is no
// upper limit.
type Violation struct {
	Kind   string  `json:"kind"`
	Lane   string  `json:"lane,omitempty"`
	Node   string  `json:"node,omitempty"`
	Min    string  `json:"min"`
	Max    *string `json:"max"`
	Actual string  `json:"actual"`
}

// CycleDoc is an improving cycle. Units and TotalSaving are null when the
// cycle is unbounded.
type CycleDoc struct {
	SavingPerUnit string    `json:"saving_per_unit"`
	Units         *string   `json:"units"`
	TotalSaving   *string   `json:"total_saving"`
	Unbounded     bool      `json:"unbounded"`
	Steps         []StepDoc `json:"steps"`
}

// StepDoc is one step of a cycle: Change is "more" or "less" on a lane, or
// "keep-more" / "keep-less" at an origin (Lane empty).
type StepDoc struct {
	Lane   string `json:"lane,omitempty"`
	From   string `json:"from"`
	To     string `json:"to"`
	Rate   string `json:"rate"`
	Change string `json:"change"`
}

// LaneDoc is one lane of the audit table. Max is null when there is no
// capacity; ReducedCost and SlackOK are null when the plan is infeasible.
type LaneDoc struct {
	ID          string            `json:"id"`
	From        string            `json:"from"`
	To          string            `json:"to"`
	Cost        string            `json:"cost"`
	Flow        string            `json:"flow"`
	Min         string            `json:"min"`
	Max         *string           `json:"max"`
	State       string            `json:"state"`
	ReducedCost *string           `json:"reduced_cost"`
	SlackOK     *bool             `json:"slack_ok"`
	Range       *RangeDoc         `json:"range,omitempty"`
	Extra       map[string]string `json:"extra,omitempty"`
}

// NodeDoc is one node: its supply (negative: demand), outflow minus inflow,
// and potential (null when the plan is infeasible).
type NodeDoc struct {
	ID        string  `json:"id"`
	Supply    string  `json:"supply"`
	NetOut    string  `json:"net_out"`
	Potential *string `json:"potential"`
	// ShadowPrice is the cost of one more unit demanded here, PriceIfLess
	// the saving of one unit less (from the ranges; absent without them).
	ShadowPrice *string `json:"shadow_price,omitempty"`
	PriceIfLess *string `json:"price_if_less,omitempty"`
}

// RangeDoc is a lane's rate range in the optimal plan: the plan stays
// optimal for rates from Lower to Upper (null: no limit). For an unused lane
// Lower is its break-even rate; for a lane at capacity CapacityValue is the
// saving of one more unit of capacity. ByRoute says the limit came from a
// route through the residual network rather than a potential difference.
// LowerBy and UpperBy name a lane that starts or stops being used past the
// limit.
type RangeDoc struct {
	State         string  `json:"state"`
	Lower         *string `json:"lower"`
	Upper         *string `json:"upper"`
	ByRoute       bool    `json:"by_route"`
	CapacityValue *string `json:"capacity_value,omitempty"`
	LowerBy       *string `json:"lower_by,omitempty"`
	UpperBy       *string `json:"upper_by,omitempty"`
}

func sp(s string) *string { return &s }

// Build turns an audit into a Document. rounded lists the plan's rounded
// quantities (may be nil); opt, if not nil, is the comparison with the
// optimum (it adds the optimal cost, the gap and the repair, and turns the
// verdict into network-infeasible when no plan can meet the demands).
func Build(a *dual.Audit, opt *dual.Optimum, in Inputs, rounded []flow.Rounding) (*Document, error) {
	n := a.Net
	d := &Document{
		Schema:       Schema,
		Verdict:      a.Verdict.String(),
		Inputs:       in,
		NodeCount:    n.NumNodes(),
		LaneCount:    n.NumLanes(),
		PlanCost:     n.FormatCost(a.Cost),
		BrokenLanes:  len(a.Broken),
		Kept:         []Kept{},
		Rounded:      []Rounded{},
		Violations:   []Violation{},
		Cycles:       []CycleDoc{},
		Repair:       []ChangeDoc{},
		ExtraColumns: []string{},
		Notes:        append([]string{}, n.Notes...),
		LeftOut:      []string{},
		Caution:      Caution,
		net:          n,
	}
	if a.Verdict == dual.Optimal {
		d.DualObjective = sp(n.FormatCost(a.Dual))
		d.DualTerms = &DualTerms{
			Supply:   n.FormatCost(a.DualParts.Supply),
			Minimum:  n.FormatCost(a.DualParts.Minimum),
			Capacity: n.FormatCost(a.DualParts.Capacity),
		}
	}
	if a.Potential != nil {
		d.Potentials = "lanes-in-use"
		if !a.Determined {
			d.Potentials = "shortest-paths"
		}
		d.Pieces = a.Pieces
	}
	f := a.Feasibility
	var kept int64
	if f.Held != nil {
		for v, h := range f.Held {
			if n.Supply[v] > 0 && h != 0 {
				d.Kept = append(d.Kept, Kept{Node: n.Nodes[v], Quantity: n.FormatQty(h)})
				kept += h
			}
		}
	}
	d.Totals = Totals{Supply: n.FormatQty(f.TotalSupply), Demand: n.FormatQty(f.TotalDemand), Kept: n.FormatQty(kept)}
	for _, r := range rounded {
		d.Rounded = append(d.Rounded, Rounded{Lane: n.LaneName(r.Lane), Given: r.Given.String(), Used: n.FormatQty(r.Used)})
	}
	for _, v := range f.Violations {
		vd := Violation{Kind: v.Kind.String(), Min: n.FormatQty(v.Min), Actual: n.FormatQty(v.Actual)}
		if v.Max != flow.NoLimit {
			vd.Max = sp(n.FormatQty(v.Max))
		}
		if v.Lane >= 0 {
			vd.Lane = n.LaneName(v.Lane)
		}
		if v.Node >= 0 {
			vd.Node = n.Nodes[v.Node]
		}
		d.Violations = append(d.Violations, vd)
	}
	for _, c := range a.Cycles {
		d.Cycles = append(d.Cycles, cycleDoc(n, c))
	}
	if n.Extra != nil {
		d.ExtraColumns = n.Extra.Names
	}
	d.audit = a
	d.broken = make([]bool, n.NumLanes())
	for _, e := range a.Broken {
		d.broken[e] = true
	}
	for e := range a.State {
		counts(&d.States, a.State[e])
	}
	d.order = problemFirst(a)
	if opt != nil {
		if err := d.addOptimum(a, opt); err != nil {
			return nil, err
		}
	}
	return d, nil
}

// NumLanes and NumNodes count the entries Lane and Node give.
func (d *Document) NumLanes() int { return d.net.NumLanes() }

// NumNodes returns the number of nodes.
func (d *Document) NumNodes() int { return d.net.NumNodes() }

// Lane returns lane e's entry. Entries are built on demand, so a report on
// a large network never holds them all.
func (d *Document) Lane(e int) LaneDoc {
	n, a := d.net, d.audit
	l := LaneDoc{
		ID:    n.LaneName(flow.LaneID(e)),
		From:  n.Nodes[n.Tail[e]],
		To:    n.Nodes[n.Head[e]],
		Cost:  n.FormatRate(n.Rate[e]),
		Flow:  n.FormatQty(a.Flow[e]),
		Min:   n.FormatQty(n.Lower[e]),
		State: stateName(a.State[e]),
	}
	if n.Upper[e] != flow.NoLimit {
		l.Max = sp(n.FormatQty(n.Upper[e]))
	}
	if a.Reduced != nil {
		l.ReducedCost = sp(n.FormatRate(a.Reduced[e]))
		ok := !d.broken[e]
		l.SlackOK = &ok
	}
	if n.Extra != nil && e < len(n.Extra.Values) && n.Extra.Values[e] != nil {
		l.Extra = map[string]string{}
		for c, name := range n.Extra.Names {
			l.Extra[name] = n.Extra.Values[e][c]
		}
	}
	if d.sens != nil {
		l.Range = d.rangeDoc(e)
	}
	return l
}

// Node returns node v's entry.
func (d *Document) Node(v int) NodeDoc {
	n, a := d.net, d.audit
	nd := NodeDoc{ID: n.Nodes[v], Supply: n.FormatQty(n.Supply[v]), NetOut: n.FormatQty(a.Feasibility.NetOut[v])}
	if a.Potential != nil {
		nd.Potential = sp(n.FormatRate(a.Potential[v]))
	}
	if d.sens != nil {
		np := d.sens.Nodes[v]
		if np.HasUp {
			nd.ShadowPrice = sp(n.FormatRate(np.Up))
		}
		if np.HasDown {
			nd.PriceIfLess = sp(n.FormatRate(np.Down))
		}
	}
	return nd
}

// UnmetDoc is demand left unmet at a node under a shortfall price, and
// what it costs.
type UnmetDoc struct {
	Node  string `json:"node"`
	Units string `json:"units"`
	Cost  string `json:"cost"`
}

// AddCut adds the proof that the network cannot meet its demands.
func (d *Document) AddCut(c *flow.Cut) { d.Cut = BuildCut(d.net, c) }

// AddUnmet lists the demand left unmet: the flow on the lanes after the
// first orig lanes (the shortfall lanes of flow.WithShortfall), per
// destination.
func (d *Document) AddUnmet(x []int64, orig int) {
	n := d.net
	for e := orig; e < n.NumLanes(); e++ {
		if x[e] > 0 {
			d.Unmet = append(d.Unmet, UnmetDoc{Node: n.Nodes[n.Head[e]], Units: n.FormatQty(x[e]), Cost: n.FormatCost(flow.MulWide(n.Rate[e], x[e]))})
		}
	}
}

// AddRanges adds the rate ranges and node prices of the optimal plan y.
// forPlan says which plan they describe ("plan" when the audited plan is
// optimal, "optimal-plan" otherwise).
func (d *Document) AddRanges(y []int64, s *dual.Sensitivity, forPlan string) {
	d.RangesFor, d.rangeFlow, d.sens = forPlan, y, s
}

func (d *Document) rangeDoc(e int) *RangeDoc {
	n, y, lr := d.net, d.rangeFlow, d.sens.Lanes[e]
	rd := &RangeDoc{State: stateName(dual.StateOf(y[e], n.Lower[e], n.Upper[e])), ByRoute: lr.ByRoute}
	if lr.HasLower {
		rd.Lower = sp(n.FormatRate(lr.Lower))
	}
	if lr.HasUpper {
		rd.Upper = sp(n.FormatRate(lr.Upper))
	}
	if y[e] == n.Upper[e] && n.Lower[e] < n.Upper[e] {
		rd.CapacityValue = sp(n.FormatRate(lr.CapacityValue))
	}
	if lr.LowerBy >= 0 {
		rd.LowerBy = sp(n.LaneName(lr.LowerBy))
	}
	if lr.UpperBy >= 0 {
		rd.UpperBy = sp(n.LaneName(lr.UpperBy))
	}
	return rd
}

// VerdictNetworkInfeasible is the verdict when no plan can meet the demands.
const VerdictNetworkInfeasible = "network-infeasible"

func (d *Document) addOptimum(a *dual.Audit, o *dual.Optimum) error {
	n := a.Net
	start := "scratch"
	if o.WarmStarted {
		start = "plan"
	}
	d.Solver = &SolverDoc{Start: start, Pivots: o.Pivots}
	switch o.Status {
	case flow.Infeasible:
		d.Verdict = VerdictNetworkInfeasible
		d.Shortfall = sp(n.FormatQty(o.Shortfall))
		return nil
	case flow.Unbounded:
		d.Unbounded = true
		return nil
	}
	d.OptimalCost = sp(n.FormatCost(o.Cost))
	u := o.Unique
	d.UniqueOptimum = &u
	if a.Verdict == dual.PlanInfeasible {
		return nil
	}
	gap, err := o.Gap(a.Cost)
	if err != nil {
		return err
	}
	d.Gap = sp(n.FormatCost(gap))
	if o.Cost.Sign() != 0 {
		r := new(big.Rat).SetFrac(gap.Big(), o.Cost.Big())
		r.Abs(r)
		if gap.Sign() < 0 {
			r.Neg(r)
		}
		d.GapShare = sp(r.FloatString(6))
	}
	changes, err := o.Changes(n, a.Flow)
	if err != nil {
		return err
	}
	for _, c := range changes {
		d.Repair = append(d.Repair, ChangeDoc{
			Lane: n.LaneName(c.Lane), From: n.Nodes[n.Tail[c.Lane]], To: n.Nodes[n.Head[c.Lane]],
			Old: n.FormatQty(c.Old), New: n.FormatQty(c.New), CostChange: n.FormatCost(c.CostChange),
		})
	}
	return nil
}

func stateName(s dual.LaneState) string {
	switch s {
	case dual.Unused:
		return "unused"
	case dual.AtMinimum:
		return "at-minimum"
	case dual.InUse:
		return "in-use"
	case dual.AtCapacity:
		return "at-capacity"
	case dual.Fixed:
		return "fixed"
	}
	return "out-of-bounds"
}

func counts(c *StateCounts, s dual.LaneState) {
	switch s {
	case dual.Unused:
		c.Unused++
	case dual.AtMinimum:
		c.AtMinimum++
	case dual.InUse:
		c.InUse++
	case dual.AtCapacity:
		c.AtCapacity++
	case dual.Fixed:
		c.Fixed++
	default:
		c.OutOfBounds++
	}
}

func cycleDoc(n *flow.Network, c dual.Cycle) CycleDoc {
	cd := CycleDoc{SavingPerUnit: n.FormatRate(c.SavingPerUnit), Unbounded: c.Unbounded()}
	if !c.Unbounded() {
		cd.Units = sp(n.FormatQty(c.Units))
		cd.TotalSaving = sp(n.FormatCost(c.Total))
	}
	for _, s := range c.Steps {
		if s.Lane < 0 {
			ch := "keep-less"
			if s.Forward {
				ch = "keep-more"
			}
			cd.Steps = append(cd.Steps, StepDoc{From: n.Nodes[s.Origin], To: n.Nodes[s.Origin], Rate: "0", Change: ch})
			continue
		}
		ch := "less"
		if s.Forward {
			ch = "more"
		}
		cd.Steps = append(cd.Steps, StepDoc{
			Lane: n.LaneName(s.Lane), From: n.Nodes[n.Tail[s.Lane]], To: n.Nodes[n.Head[s.Lane]],
			Rate: n.FormatRate(n.Rate[s.Lane]), Change: ch,
		})
	}
	return cd
}

// problemFirst orders lanes: out of bounds first, then lanes breaking
// complementary slackness by decreasing size of the break, then the rest,
// each group in lane order.
func problemFirst(a *dual.Audit) []int {
	m := a.Net.NumLanes()
	rank := make([]int8, m)
	for e := 0; e < m; e++ {
		if a.State[e] == dual.OutOfBounds {
			rank[e] = 0
		} else {
			rank[e] = 2
		}
	}
	for _, e := range a.Broken {
		rank[e] = 1
	}
	order := make([]int, m)
	for i := range order {
		order[i] = i
	}
	size := func(e int) int64 {
		if a.Reduced == nil {
			return 0
		}
		r := a.Reduced[e]
		if r < 0 {
			return -r
		}
		return r
	}
	sort.SliceStable(order, func(i, j int) bool {
		ei, ej := order[i], order[j]
		if rank[ei] != rank[ej] {
			return rank[ei] < rank[ej]
		}
		if rank[ei] == 1 && size(ei) != size(ej) {
			return size(ei) > size(ej)
		}
		return ei < ej
	})
	return order
}
