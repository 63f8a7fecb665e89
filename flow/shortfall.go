package flow

import (
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"
)

// UnmetNode is the name of the virtual origin added by WithShortfall.
const UnmetNode = "(unmet)"

// UnmetLanePrefix starts the names of the virtual lanes added by
// WithShortfall: "unmet:" followed by the destination's name.
const UnmetLanePrefix = "unmet:"

// WithShortfall returns a copy of n in which every destination (Supply < 0)
// may leave demand unmet at a price per unit. The copy has one more node,
// the virtual origin "(unmet)" (last, number NumNodes() of n), with supply
// equal to the total demand D, and one more lane per destination v, in node
// order after the lanes of n (lane n.NumLanes()+k for the k-th
// destination): "unmet:<name of v>" from the virtual origin to v, minimum
// 0, capacity -Supply[v], rate prices[v] when prices is non-nil and
// prices[v] >= 0, else price (rate scale of n). Flow on that lane is demand
// of v left unmet. Lane names of n are kept (numbers become their text),
// so are the scales and the extra columns (empty for the new rows).
//
// prices is nil or has one entry per node of n; entries of origins and
// transshipment nodes are ignored. price must not be negative.
//
// # Excess supply
//
// The copy has total supply S + D against total demand D (S is the total
// supply of n). Whenever S > 0 the copy has excess supply, so the
// excess-supply rule of the package applies to it: the virtual origin
// ships only the unmet demand and keeps the rest, and the real origins
// may keep supply too, even when S == D in n (where n itself forces them to
// ship everything). That is the intended meaning: with a shortfall price
// nobody is forced to ship at a loss; an origin ships only what serves a
// destination more cheaply than leaving its demand unmet. When S == 0 the
// copy is balanced and the virtual origin ships all of D.
//
// # What it fixes
//
// Demand that cannot be reached (a Cut without Hold whose region holds the
// unmet destinations) no longer blocks a plan: with no lane minimums the
// copy always has a feasible plan. Minimums are not relaxed: a minimum
// that forces flow out of nodes with nothing to send, or into nodes that
// cannot pass it on or use it, keeps the copy infeasible (FindCut on the
// copy shows where).
//
// When every unit price exceeds the sum of |Rate| over all lanes of n, no
// rerouting can cost more than leaving a unit unmet, so every optimal plan
// of the copy leaves the least possible total unmet: FindCut(n).Short
// when the copy is feasible (and 0 when n is feasible, with the optimal
// cost of n).
//
// It returns an error for an invalid n, a bad price or prices, a name
// clash with the virtual node or lanes, or overflow. Time and memory
// O(|V|+|E|).
func WithShortfall(n *Network, price int64, prices []int64) (*Network, error) {
	if err := n.Validate(); err != nil {
		return nil, err
	}
	return withShortfall(n, price, prices, true)
}

// SolvePricedShortfall solves WithShortfall(n, price, nil) and keeps the
// optimum's basis (SolveOptions.Keep): lanes 0..NumLanes()-1 are n's, the
// next unmet ones (one per destination, in node order, from the virtual
// origin, node NumNodes() of n). The priced network is built without lane
// names (it is never shown), which spares a string per lane. start, if not
// nil, is a plan of n (such as Solution.Attempt) extended by ExtendPlan
// into a warm start; when that is not feasible for the priced network the
// solve starts from scratch. It returns the solution and the number of
// unmet lanes. Time: one solve of the priced network plus O(|V|+|E|).
func SolvePricedShortfall(n *Network, price int64, start []int64) (*Solution, int, error) {
	if price < 0 {
		return nil, 0, fmt.Errorf("flow: shortfall price %d is negative", price)
	}
	if start != nil && len(start) != len(n.Tail) {
		return nil, 0, fmt.Errorf("flow: priced shortfall: start has %d flows for %d lanes", len(start), len(n.Tail))
	}
	ext, err := withShortfall(n, price, nil, false)
	if err != nil {
		return nil, 0, err
	}
	opt := SolveOptions{Keep: true}
	if start != nil {
		opt.Start = ExtendPlan(n, ext, start)
	}
	sol, err := Solve(ext, opt)
	if err != nil {
		return nil, 0, err
	}
	return sol, len(ext.Tail) - len(n.Tail), nil
}

// withShortfall is WithShortfall on a valid n; named false leaves the lane
// names out (numbers).
func withShortfall(n *Network, price int64, prices []int64, named bool) (*Network, error) {
	if price < 0 {
		return nil, fmt.Errorf("flow: shortfall price %d is negative", price)
	}
	nv, m := len(n.Nodes), len(n.Tail)
	if prices != nil && len(prices) != nv {
		return nil, fmt.Errorf("flow: %d shortfall prices for %d nodes", len(prices), nv)
	}
	if slices.Contains(n.Nodes, UnmetNode) {
		return nil, fmt.Errorf("flow: a node is already named %q", UnmetNode)
	}
	_, demand, err := n.Totals()
	if err != nil {
		return nil, err
	}
	var dests []NodeID
	for v, b := range n.Supply {
		if b == math.MinInt64 {
			return nil, fmt.Errorf("flow: demand of node %q %w", n.Nodes[v], ErrOverflow)
		}
		if b < 0 {
			dests = append(dests, NodeID(v))
		}
	}
	k := len(dests)

	ext := &Network{
		Nodes:      append(slices.Clip(slices.Clone(n.Nodes)), UnmetNode),
		Supply:     append(slices.Clip(slices.Clone(n.Supply)), demand),
		Tail:       slices.Grow(slices.Clone(n.Tail), k),
		Head:       slices.Grow(slices.Clone(n.Head), k),
		Lower:      slices.Grow(slices.Clone(n.Lower), k),
		Upper:      slices.Grow(slices.Clone(n.Upper), k),
		Rate:       slices.Grow(slices.Clone(n.Rate), k),
		QtyPlaces:  n.QtyPlaces,
		RatePlaces: n.RatePlaces,
	}
	// Only names with the virtual lanes' prefix can clash; numbered lanes
	// (no names) get their numbers as substrings of one string.
	names := map[string]bool{}
	if named {
		ext.LaneNames = make([]string, m, m+k)
	}
	switch {
	case !named:
	case n.LaneNames != nil:
		copy(ext.LaneNames, n.LaneNames)
		for _, name := range n.LaneNames {
			if strings.HasPrefix(name, UnmetLanePrefix) {
				names[name] = true
			}
		}
	default:
		numberNames(ext.LaneNames[:m])
	}
	u := NodeID(nv)
	for _, v := range dests {
		if named {
			name := UnmetLanePrefix + n.Nodes[v]
			if names[name] {
				return nil, fmt.Errorf("flow: a lane is already named %q", name)
			}
			names[name] = true
			ext.LaneNames = append(ext.LaneNames, name)
		}
		r := price
		if prices != nil && prices[v] >= 0 {
			r = prices[v]
		}
		ext.Tail = append(ext.Tail, u)
		ext.Head = append(ext.Head, v)
		ext.Lower = append(ext.Lower, 0)
		ext.Upper = append(ext.Upper, -n.Supply[v]) // Totals checked -Supply fits
		ext.Rate = append(ext.Rate, r)
	}
	if named {
		ext.Extra = extendExtra(n.Extra, k)
		ext.NodeExtra = extendExtra(n.NodeExtra, 1)
	}
	return ext, nil
}

// numberNames sets names[a] to the number a+1, all as substrings of one
// string (one allocation).
func numberNames(names []string) {
	var buf []byte
	ends := make([]int, len(names))
	for a := range names {
		buf = strconv.AppendInt(buf, int64(a)+1, 10)
		ends[a] = len(buf)
	}
	all := string(buf)
	start := 0
	for a, e := range ends {
		names[a] = all[start:e]
		start = e
	}
}

// extendExtra copies x and appends rows empty rows; nil stays nil.
func extendExtra(x *ExtraColumns, rows int) *ExtraColumns {
	if x == nil {
		return nil
	}
	y := &ExtraColumns{Names: slices.Clone(x.Names), Values: make([][]string, 0, len(x.Values)+rows)}
	for _, r := range x.Values {
		y.Values = append(y.Values, slices.Clone(r))
	}
	for range rows {
		y.Values = append(y.Values, make([]string, len(x.Names)))
	}
	return y
}

// ExtendPlan returns plan x of n (one flow per lane of n) extended to
// ext = WithShortfall(n, ...): x followed by the unmet quantity at each
// destination, in the order of ext's virtual lanes: demand minus net
// inflow (inflow minus outflow on the lanes of n) when positive, else 0.
// A destination that sends out more than it receives gets more than its
// demand (the extended plan then breaks that lane's capacity); a value
// beyond int64 is cut to math.MaxInt64. The result is feasible for ext
// exactly when x meets every bound and balance of n except that
// destinations may receive less than their demand (origins may keep
// supply). It panics if len(x) != n.NumLanes() or ext does not extend n.
// Time O(|V|+|E|).
func ExtendPlan(n *Network, ext *Network, x []int64) []int64 {
	m := len(n.Tail)
	if len(x) != m {
		panic(fmt.Sprintf("flow: ExtendPlan: plan has %d quantities for %d lanes", len(x), m))
	}
	if len(ext.Tail) < m || len(ext.Nodes) != len(n.Nodes)+1 {
		panic("flow: ExtendPlan: ext is not an extension of n by WithShortfall")
	}
	// Net inflow per node in 128 bits: |sum| <= |E|·2^63 cannot overflow.
	in := make([]Wide, len(n.Nodes))
	for a, f := range x {
		w := WideFrom(f)
		in[n.Head[a]], _ = in[n.Head[a]].Add(w)
		in[n.Tail[a]], _ = in[n.Tail[a]].Sub(w)
	}
	out := append(slices.Clip(slices.Clone(x)), make([]int64, len(ext.Tail)-m)...)
	for k := m; k < len(ext.Tail); k++ {
		v := ext.Head[k]
		if int(v) >= len(n.Nodes) {
			panic("flow: ExtendPlan: ext is not an extension of n by WithShortfall")
		}
		gap, _ := WideFrom(-n.Supply[v]).Sub(in[v]) // within ±2^127
		switch {
		case gap.Sign() <= 0:
			out[k] = 0
		default:
			if g, ok := gap.Int64(); ok {
				out[k] = g
			} else {
				out[k] = math.MaxInt64
			}
		}
	}
	return out
}
