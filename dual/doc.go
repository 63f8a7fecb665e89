// Package dual proves a plan optimal or shows why it is not, by linear
// programming duality on the network flow problem of package flow.
//
// # Sign conventions (used everywhere in lanecert)
//
// A node potential p(v) is the marginal landed cost of one more unit at node
// v: the cost change of the cheapest plan when v's demand grows by one unit
// and the supply of the anchor of its piece of network grows alike. The
// reduced cost of lane a is
//
//	r(a) = rate(a) + p(tail(a)) - p(head(a))
//
// in rate units: what a unit on a costs beyond the landed-cost difference
// of its ends. A plan is optimal if and only if potentials exist with, for
// every lane (complementary slackness):
//
//	Lower < flow < Upper   =>  r(a) = 0
//	flow = Lower < Upper   =>  r(a) >= 0   (unused lanes, lanes at their minimum)
//	flow = Upper > Lower   =>  r(a) <= 0   (lanes at capacity)
//
// A lane with Lower = Upper is fixed and satisfies any sign.
//
// The dual objective of potentials p is
//
//	D(p) = -Σ_v Supply(v)·p(v) + Σ_{r(a)>0} r(a)·Lower(a) + Σ_{r(a)<0} r(a)·Upper(a)
//
// and for any feasible plan, cost ≥ D(p), with equality exactly when the
// conditions above hold. So potentials whose D equals the plan's cost are a
// certificate of optimality anyone can check by hand.
//
// When total supply exceeds total demand, each origin v keeps
// Supply(v) - (outflow - inflow) units at no cost. This is modelled by a
// virtual hold lane from v, rate 0, capacity Supply(v), into a virtual hold
// node H whose demand is the excess and whose potential is 0; the rules above
// apply to hold lanes too (an origin that keeps part of its supply has
// p(v) = 0, one that ships everything has p(v) >= 0).
//
// # Normalisation
//
// Potentials are unique only up to a constant per connected piece of the
// network (and not even then for degenerate plans). lanecert shifts each
// weakly connected piece so that p(H) = 0 in the piece holding the hold node,
// and otherwise so that the smallest potential among the piece's origins (or
// among all its nodes, if it has none) is 0.
//
// # Certificates
//
// Check returns one of three verdicts, each with a certificate: Optimal with
// potentials whose dual objective equals the plan's cost; NotOptimal with
// improving cycles of the residual network (lanes in order, each with more or
// less flow; the saving per unit; how many units can move before a bound is
// hit; the total saving); PlanInfeasible with the violated bounds and
// balances.
//
// # Exact arithmetic
//
// Potentials, reduced costs, limits and prices are int64 values in rate
// units; costs are 128-bit. Every sum is checked: a value that does not fit
// returns an error wrapping flow.ErrOverflow, never a wrapped-around
// number. The route searches of Ranges add with saturation, so a route
// whose cost passes int64 is an error only where a limit or price needs it.
package dual
