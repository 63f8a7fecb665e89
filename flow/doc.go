// Package flow holds the network model of lanecert: nodes with a supply or
// demand, lanes with a unit rate and optional minimum and capacity, and a
// plan that puts a quantity on every lane. It reads networks and plans from
// CSV lane and node tables and from the DIMACS minimum-cost flow format,
// checks a plan's feasibility exactly, and solves minimum-cost flow problems.
//
// # Numbers
//
// Quantities (supplies, bounds, flows) and rates are decimals. They are
// parsed straight into scaled int64 values, never through float64: a network
// keeps one scale for quantities (QtyPlaces decimal places) and one for rates
// (RatePlaces), so 12.5 t with QtyPlaces 3 is stored as 12500. A cost
// (rate times quantity) has QtyPlaces+RatePlaces places. Sums and products
// are checked: an overflow returns ErrOverflow and is never wrapped. Totals
// over many lanes use a 128-bit accumulator (Wide).
//
// # Signs
//
// Supply(v) > 0 marks an origin, Supply(v) < 0 a destination (its demand is
// -Supply(v)), 0 a transshipment node. A plan is feasible when every lane's
// flow lies in [Lower, Upper] and every node's outflow minus inflow equals
// its supply. When total supply exceeds total demand, an origin may keep
// part of its supply: its outflow minus inflow then lies in [0, Supply(v)].
// Every other node balances exactly.
//
// # Solving
//
// Solve is an exact primal network simplex; it starts from a given plan
// when that plan is feasible (a repair) and otherwise from scratch. With
// SolveOptions.Keep the optimal basis is kept (Basis): Basis.Add re-solves
// the network with lanes added, from that basis, which is how candidate
// lanes and carrier bids are priced one by one. FindCut proves that no plan
// can meet the demands (a short region), and WithShortfall and
// SolvePricedShortfall let demand go unmet at a price.
package flow
