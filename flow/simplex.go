package flow

import (
	"fmt"
	"math"
	"math/bits"
	"slices"
)

// Status is the outcome of Solve.
type Status int

const (
	// Optimal: an optimal plan was found.
	Optimal Status = iota
	// Infeasible: no plan meets the supplies, demands and bounds.
	Infeasible
	// Unbounded: plans exist, and a cycle of lanes without capacity has a
	// negative total rate, so the cost has no lower bound.
	Unbounded
)

// String returns "optimal", "infeasible" or "unbounded".
func (s Status) String() string {
	switch s {
	case Optimal:
		return "optimal"
	case Infeasible:
		return "infeasible"
	case Unbounded:
		return "unbounded"
	}
	return fmt.Sprintf("Status(%d)", int(s))
}

// CycleStep is one lane of a cycle. Forward means the cycle traverses the
// lane from Tail to Head (more flow on the lane), !Forward from Head to
// Tail (less flow on the lane).
type CycleStep struct {
	Lane    LaneID
	Forward bool
}

// SolveOptions controls Solve. The zero value solves from scratch.
type SolveOptions struct {
	// Start is a plan (scaled flows, one per lane) to start from. When it
	// is feasible (bounds and balances, including the excess-supply rule)
	// the simplex starts from it (see "Warm start" at Solve). Otherwise
	// (including a Start of the wrong length, or one whose node balances
	// overflow, or a lane without capacity carrying NoLimit) the solve
	// starts from scratch and WarmStarted is false.
	Start []int64
	// Progress, if non-nil, is called every 16384 pivots with the number
	// of pivots so far and the cost of the current plan (cost scale
	// QtyPlaces+RatePlaces, lane minimums included; the objective never
	// increases from one call to the next). It is called only in phase
	// two, while the current flows meet every supply and demand: pivots of
	// a phase one (from scratch, while artificial flow remains) are
	// counted but not reported. The cost is kept up to date per pivot
	// (flow moved times reduced cost), not recomputed.
	Progress func(pivots int64, cost Wide)
	// Placing, if non-nil, is called every 16384 pivots while the flows
	// do not yet meet every supply and demand (a cold solve's first
	// phase), with the number of pivots so far and the quantity not yet
	// carried from where it is supplied to where it is demanded (quantity
	// scale; half the total imbalance over the nodes, lane minimums
	// counted as carried). It never increases from one call to the next.
	Placing func(pivots int64, unplaced int64)
	// Keep asks for the final basis in Solution.Basis (when Optimal), to
	// re-solve with lanes added (Basis.Add), and for Solution.Attempt when
	// Infeasible. The solver's state is then kept alive with the Solution;
	// Solution.Flow may share its flow array, so the plan must not be
	// changed while the Basis is in use.
	Keep bool

	// keepSim keeps the solver in Solution.sim and starts warm without
	// sifting (the restricted solves of sift).
	keepSim bool
	// siftAlways sifts whenever the plan allows, whatever the network's
	// size (tests).
	siftAlways bool
	// sweepAlways searches by sweeps whenever a warm start does not sift
	// and the arithmetic allows, whatever the network's size (tests).
	sweepAlways bool
	// noRounds skips the warm start's rounds of cancelling before its
	// search by lists (tests: the search and block search must cope with
	// free lanes closing cycles and lanes with the wrong sign inside
	// parts, and the free lanes left must be pivoted in).
	noRounds bool
	// pileAlways takes every first search of a warm start by lists that
	// refuses an arc for a pile (tests: see pileRefusals).
	pileAlways bool
}

// Solution is the result of Solve.
type Solution struct {
	Status Status
	// Flow is the plan, one scaled quantity per lane; valid when Optimal.
	Flow []int64
	// Potential holds one value per node (rate scale); valid when
	// Optimal. Every lane's reduced cost r = Rate + p(Tail) - p(Head)
	// satisfies the optimality rules of the package (see Solve).
	Potential []int64
	// Cost is the total cost of Flow (scale QtyPlaces+RatePlaces); valid
	// when Optimal.
	Cost Wide
	// Held is the supply each origin keeps (excess-supply rule), one value
	// per node; all zero when total supply does not exceed total demand.
	// Valid when Optimal.
	Held []int64
	// Shortfall, when Infeasible, is the least total demand that no plan
	// within the lane bounds can deliver when origins may ship less than
	// their supply (see Solve for the exact definition); quantity scale.
	Shortfall int64
	// Cycle, when Unbounded, is a cycle of lanes without capacity whose
	// rates sum to a negative number, in traversal order (each step ends
	// where the next begins, the last where the first begins). Every step
	// is Forward.
	Cycle []CycleStep
	// Pivots is the number of simplex pivots made.
	Pivots int64
	// WarmStarted reports that Start was feasible and was used.
	WarmStarted bool
	// InTree[a] is true when lane a is a basic (tree) lane of the final
	// spanning tree; valid when Optimal. Lanes strictly between their
	// bounds are always in the tree; tree lanes may also sit at a bound
	// (degenerate tree).
	InTree []bool
	// Basis is the final basis when Optimal and SolveOptions.Keep was set.
	Basis *Basis
	// Attempt, when Infeasible and SolveOptions.Keep was set, is the
	// solver's last plan, one flow per lane within the lane bounds: it
	// delivers as much of the demand as any plan can (all but Shortfall),
	// origins may keep supply, and some other nodes may be left with flow
	// they cannot pass on. When the solver priced the missing flow
	// (|V|·maxRate fits int64 and supply covers demand) it is usually a
	// cheapest such plan: a good start for the network with priced unmet
	// demand (SolvePricedShortfall).
	Attempt []int64

	sim    *simplex // with SolveOptions.keepSim
	sifted bool     // the warm start sifted (tests)
	swept  bool     // the warm start searched by sweeps (tests)
	piled  bool     // the warm start searched again after a pile (tests)
}

// Arc states. An arc that is not in the tree is at its lower bound
// (stateLower, eligible to enter when its reduced cost is negative), at its
// upper bound (stateUpper, eligible when its reduced cost is positive), or
// fixed (stateTree with no tree membership: never enters). state times the
// reduced cost is negative exactly for eligible arcs.
const (
	stateUpper int8 = -1
	stateTree  int8 = 0
	stateLower int8 = 1
)

// inf is the capacity of an arc without capacity and the "no limit" value
// of a residual. It equals NoLimit, so lane capacities can be read from
// Network.Upper when no lane has a minimum.
const inf = math.MaxInt64

// driftLimit bounds the drift of p(R) in unchecked arithmetic: with
// (2|V|+3)·maxRate <= MaxInt64, potentials stay below 3/4 of MaxInt64.
const driftLimit = math.MaxInt64 / 4

// progressEvery is the number of pivots between Progress calls (a power of
// two).
const progressEvery = 1 << 14

// simplex is the state of a primal network simplex over the extended
// network: nodes 0..n-1 of the Network, the hold node H (index n, only
// under excess supply) and the artificial root R (the last index); arcs
// 0..m-1 are the lanes (shifted so that every lower bound is 0), then one
// hold arc v->H per origin (only under excess supply), then one artificial
// arc between every non-root node and R.
//
// Lane data are read from the Network's arrays (Tail, Head, Rate, and
// Upper as the capacity when no lane has a minimum); only flows and states
// are the solver's own, plus a shifted copy of the capacities when some
// lane has a minimum. Hold and artificial arcs (index a >= m) live in the
// x* arrays at a-m.
//
// The spanning tree is rooted at R and stored as: parent, pred (the tree
// arc joining a node to its parent), up (pred runs from the node to its
// parent), thread (preorder successor, circular), rthread (preorder
// predecessor), size (nodes in the subtree) and last (last node of the
// subtree in preorder).
type simplex struct {
	net *Network

	m         int // lanes
	na        int // all arcs
	holdStart int // first hold arc
	artStart  int // first artificial arc
	artEnd    int // after the last artificial arc (arcs from artEnd on are lanes added by Basis.Add)
	nNodes    int // nodes including H, excluding R
	root      int32
	hold      int32 // H, or -1
	holdFrom  []NodeID

	tail, head []int32 // lanes: the Network's arrays
	rate       []int64 // lanes: Network.Rate
	cost       []int64 // lanes: costs of the current phase (rate, or zero)
	cap        []int64 // lanes: capacity above the minimum (inf: none)
	shifted    bool    // some lane has a minimum: cap is a copy
	xsrc, xtgt []int32 // hold and artificial arcs, at a-m
	xcost      []int64
	xcap       []int64

	flow  []int64 // all arcs, above the minimum
	state []int8  // all arcs

	parent, pred, thread, rthread, size, last []int32
	up                                        []bool
	pot                                       []int64

	// scratch for setTree and setForestTree
	orderBuf, stackBuf []int32
	treeAdj            adjacency

	// scratch for tree updates (indexed by position on the stem)
	stemNode, stemPred, stemSize, stemRthr, stemAfter, stemLast []int32
	stemUp                                                      []bool

	next    int // where block search resumes
	block   int // block size
	checked bool

	// artFixed: artificial arcs keep zero flow; those leaving the tree
	// are fixed (phase two).
	artFixed bool

	treeSet  bool
	pivots   int64
	progress func(int64, Wide)
	placing  func(int64, int64)
	// drift bounds |p(R)| after shifts of the rest of the tree.
	drift int64

	// obj is Σ cost·flow over all arcs for the current phase's costs plus
	// Σ rate·minimum, kept per pivot; objOK is false when it is not known
	// (a phase one without lane costs, or an overflow). artTotal is the
	// total artificial flow.
	obj      Wide
	objOK    bool
	artTotal int64

	cycle []CycleStep

	keep        bool // SolveOptions.Keep
	sweepAlways bool // SolveOptions.sweepAlways
	noRounds    bool // SolveOptions.noRounds
	pileAlways  bool // SolveOptions.pileAlways
	swept       bool // the warm start searched by sweeps
	piled       bool // the warm start searched again after a pile
}

// ends returns the tail and head of arc a.
func (s *simplex) ends(a int32) (int32, int32) {
	if int(a) < s.m {
		return s.tail[a], s.head[a]
	}
	return s.xsrc[int(a)-s.m], s.xtgt[int(a)-s.m]
}

// isArt reports whether arc a is artificial.
func (s *simplex) isArt(a int32) bool {
	return int(a) >= s.artStart && int(a) < s.artEnd
}

// capOf returns the capacity of arc a above its minimum.
func (s *simplex) capOf(a int32) int64 {
	if int(a) < s.m {
		return s.cap[a]
	}
	return s.xcap[int(a)-s.m]
}

// costOf returns the cost of arc a in the current phase.
func (s *simplex) costOf(a int32) int64 {
	if int(a) < s.m {
		return s.cost[a]
	}
	return s.xcost[int(a)-s.m]
}

// Solve finds a minimum-cost plan for n with a primal network simplex on
// exact int64 arithmetic.
//
// The problem: minimise Σ Rate[a]·x[a] over plans x with Lower[a] <= x[a]
// <= Upper[a] and, for every node v, outflow minus inflow equal to
// Supply[v]; when total supply exceeds total demand an origin's outflow
// minus inflow may lie anywhere in [0, Supply[v]] (it holds the rest,
// Held[v]). When total demand exceeds total supply the problem is
// Infeasible.
//
// Optimality (the package's sign convention): with
// r(a) = Rate[a] + p(Tail[a]) - p(Head[a]), a lane strictly between its
// bounds has r = 0, a lane at its minimum r >= 0, a lane at capacity
// r <= 0 (a lane with Lower == Upper may have any r). Under excess supply,
// an origin holding part of its supply has p = 0, one holding nothing
// p >= 0, one holding all of it p <= 0: these are the rules of a virtual
// hold lane v -> H with rate 0 and capacity Supply[v] into a hold node H
// with p(H) = 0.
//
// Normalisation of Potential: potentials are fixed only up to a constant
// on each weakly connected component of the network (lanes joining nodes;
// under excess supply every origin is also joined to H). Each component is
// shifted so that p(H) = 0 when it holds H; otherwise so that the smallest
// potential among its origins is 0, or, with no origin, the smallest
// potential among its nodes. The result depends only on n and opt.
//
// Shortfall (Infeasible): let b'(v) be Supply[v] minus the minimums of the
// lanes leaving v plus the minimums of the lanes entering v. Over plans
// within the lane bounds in which every node with b'(v) >= 0 (including
// H under excess supply) has outflow minus inflow at most its Supply
// (possibly absorbing flow) and every node with b'(v) < 0 has outflow minus
// inflow at least its Supply, Shortfall is the least total, over the nodes
// with b'(v) < 0, of (outflow minus inflow) minus Supply: the demand no
// plan can deliver. Without lane minimums, that is total demand minus the
// largest amount the origins can deliver to the destinations.
//
// Method: spanning-tree bases with an artificial root, strongly feasible
// trees (Cunningham's rule for the leaving arc, which prevents cycling)
// and block search for the entering arc (blocks of about sqrt(|E|) arcs).
// A cold start first minimises with artificial arcs of cost
// M = |V|·maxRate + 1 (or, when sums of that size could overflow, with
// cost 1 on the artificial arcs and 0 on the lanes); an artificial arc
// that leaves the tree is not priced again (when artificial flow remains at
// the end, a phase one with every artificial arc free settles the
// shortfall). It then finishes with artificial arcs of cost 0 that keep
// zero flow, so no potential carries M. Flows and potentials are exact
// int64; a sum that could overflow returns an error wrapping ErrOverflow,
// never a wrong answer. The cost
// is kept per pivot (flow moved times the entering lane's reduced cost)
// in 128 bits, not recomputed at the end.
//
// Warm start (opt.Start feasible): one pass over the lanes checks the
// lanes (as n.Validate) and the plan, sets the flows, the plan's cost and
// the lanes strictly between their bounds (free), and counts the lanes at
// a bound per node. The free lanes, in lane order while they close no
// cycle, form a forest. A second pass finds the lanes at a bound inside a
// part of the forest whose reduced cost, from the forest alone, has the
// wrong sign: each closes a cycle of negative cost with the forest. In a
// tree of the forest's parts hung from R, the free lanes that close a
// cycle are pivoted in (towards lower cost), then those lanes, most
// violating first, which cancels the cycles. That changes the forest;
// while free lanes still close cycles or one pass finds at least
// minInsideViol lanes with the wrong sign, they are cancelled again (up to
// maxInsideRounds rounds; free lanes left then are pivoted in after the
// search). A pass then lists the
// lanes at a bound between parts under the part their spare direction
// leads to (zero flow: the head's; full: the tail's), each with the part
// at its other end and the offset between the two parts that gives it
// reduced cost 0. The parts are joined into a strongly feasible tree by a
// label-correcting shortest-path search over those lists (first-in
// first-out, with subtree disassembly) that gives every part the highest
// potentials its lanes at a bound allow, hanging it below a neighbour
// through such a lane with reduced cost 0 in the direction in which it
// can still move; the search starts from H under excess supply, else from
// the largest part, and parts it cannot reach hang from R by artificial
// arcs of zero flow (never used again). From an optimal plan this gives
// an optimal tree. When no lane inside a part had to be cancelled, lanes
// the search finds closing cycles of negative cost (it refuses them) are
// pivoted into that tree and the lists and the search are made once more
// from the new plan (one round of cancelling in all, maxRounds; one more
// when the first search refused a pile of lanes on its root part, see
// pileRefusals); then block search finishes. A plan that is optimal
// except for a few cycles thus needs four or five passes over the lanes,
// one or two searches over the lanes at a bound, a few pivots per cycle
// and the final pricing (skipped when the last search, refusing nothing,
// reached every part: its tree is then optimal).
//
// On a dense network (at least 32,768 lanes and 32 per node, see
// siftMinLanes) whose supply equals its demand and whose lanes have no
// minimum, the warm start sifts instead: it solves, from the plan, the
// network restricted to the lanes the plan uses and the two cheapest lanes
// at each node, makes that optimum the whole network's tree and prices
// every lane once; the lanes with the wrong sign of reduced cost are added
// to the restricted optimum's basis (Basis.Add) and the pricing is
// repeated until it finds none, which proves the tree optimal without a
// final pricing (block search takes over after six pricings, or when the
// restricted network would pass a quarter of the lanes). A plan that is
// optimal except for a few cycles costs one pass that checks it, two or
// three pricing passes and a few pivots on a network of a few lanes per
// node. On sparse networks the restricted optimum's potentials are far
// from the whole network's, and the search above serves better.
//
// On a large dense network (at least 786,432 lanes and 64 per node, see
// sweepMinLanes) that does not sift the warm start lists nothing: the same
// search runs as sweeps over the lanes in index order with the potentials
// kept per node (each sweep a pass of pricing; after a full sweep only the
// lanes with a small reduced cost are read again while no part has risen
// by more), and it starts from the current tree. The first sweep also
// finds the lanes with the wrong sign inside parts; they are pivoted in
// (in the tree of the search so far) and the search goes on from there.
// Lanes a search refuses are pivoted into its tree and the search is run
// again from that tree, up to maxSweepTries times. When the last search
// finds no lane with the wrong sign of reduced cost its tree is optimal
// and the final pricing is skipped; otherwise block search finishes. Cold
// and warm solves reach the same optimal cost (the plans and potentials
// may differ where the optimum is not unique).
//
// Cost: each pivot takes O(sqrt(|E|)) arc scans plus time linear in the
// length of the cycle and the size of the moved subtree; the number of
// pivots is finite but not polynomially bounded in the worst case (in
// practice a small multiple of |V|); a warm start adds O(|V|+|E|) to build
// its first tree (each search by lists is capped at about eight passes
// over the lanes at a bound, each search by sweeps at 12 full sweeps).
// Memory: the solver reads the Network's lane arrays in place and keeps 9
// bytes per lane (flows and states; plus 8 more, a copy of the capacities
// above the minimums, when some lane has a minimum) and about 150 bytes
// per node; a warm start adds 16 bytes per lane at a bound while it builds
// its tree (by sweeps: 20 bytes for each of at most |E|/8 lanes read
// again; by sifting: 1 bit per lane plus the restricted network, at most a
// quarter of the lanes). The Solution adds 1 byte per lane (InTree), and 8
// per lane for Flow only when some lane has a minimum (otherwise Flow is
// the solver's flow array).
//
// The error is non-nil only when n is invalid (n.Validate) or a value
// overflows; infeasible and unbounded problems are Status values.
func Solve(n *Network, opt SolveOptions) (*Solution, error) {
	// A warm start validates the lanes in its first pass (one pass less);
	// otherwise, or when that pass stops early, n.Validate does.
	tryWarm := opt.Start != nil && len(opt.Start) == len(n.Tail) && sameShape(n)
	validated := false
	validate := func() error {
		if validated {
			return nil
		}
		validated = true
		return n.Validate()
	}
	if !tryWarm {
		if err := validate(); err != nil {
			return nil, err
		}
	}
	supply, demand, err := n.Totals()
	if err != nil {
		return nil, err
	}
	s, err := newSimplex(n, supply > demand, supply-demand)
	if err != nil {
		return nil, err
	}
	s.progress, s.placing = opt.Progress, opt.Placing
	s.keep = opt.Keep
	s.sweepAlways, s.noRounds, s.pileAlways = opt.sweepAlways, opt.noRounds, opt.pileAlways
	sol := &Solution{}

	warm, proved := false, false
	var superbasic []int32
	if tryWarm && supply == demand && !opt.keepSim && (opt.siftAlways || s.siftable()) {
		if warm, proved, err = s.sift(opt.Start); err != nil {
			return nil, err
		}
		sol.sifted = warm
	}
	if tryWarm && supply >= demand && !warm {
		var unb bool
		warm, superbasic, proved, unb, err = s.warmStart(opt.Start)
		if err != nil {
			return nil, err
		}
		if unb {
			sol.WarmStarted = true
			return s.unbounded(sol, s.cycle), nil
		}
	}
	sol.WarmStarted = warm
	sol.swept = warm && s.swept
	sol.piled = warm && s.piled
	if warm {
		if err := s.computePotentialsChecked(); err != nil {
			return nil, err
		}
		// Lanes strictly between their bounds outside the tree: pivot
		// each in, towards lower cost, until it or a tree arc reaches a
		// bound.
		for _, a := range superbasic {
			unb, err := s.pivotFree(a)
			if err != nil {
				return nil, err
			}
			if unb {
				return s.unbounded(sol, s.cycle), nil
			}
		}
	} else {
		if err := validate(); err != nil {
			return nil, err
		}
		maxRate, err := maxAbsRate(n.Rate)
		if err != nil {
			return nil, err
		}
		// Big-M fits when 4(N+1)·maxRate + 4 is representable (bounds on
		// the potentials and reduced costs with artificial cost
		// N·maxRate+1).
		nn := int64(s.nNodes)
		bigM, okM := int64(0), false
		if v, err := MulChecked(4*(nn+1), maxRate); err == nil && v <= math.MaxInt64-4 {
			bigM, okM = nn*maxRate+1, true
		}
		s.checked = needChecks(nn, maxRate)
		if supply < demand {
			// Infeasible in any case; find the shortfall.
			s.setShiftedCaps()
			if err := s.phaseOne(); err != nil {
				return nil, err
			}
			return s.infeasible(sol)
		}
		s.setShiftedCaps()
		if err := s.coldStart(); err != nil {
			return nil, err
		}
		if okM {
			s.setCosts(true, bigM)
		} else {
			s.setCosts(false, 1)
		}
		// An artificial arc that leaves the tree does not come back (it is
		// fixed at zero flow): fewer pivots. When artificial flow remains,
		// a phase one with all of them free settles the shortfall.
		s.artFixed = true
		s.computePotentials()
		unb, err := s.run()
		if err != nil {
			return nil, err
		}
		if unb {
			// Unbounded only if feasible: finish a phase one from here.
			cyc := s.cycle
			if err := s.freeArtificial().phaseOne(); err != nil {
				return nil, err
			}
			if s.artFlow() > 0 {
				return s.infeasible(sol)
			}
			return s.unbounded(sol, cyc), nil
		}
		if s.artFlow() > 0 {
			if err := s.freeArtificial().phaseOne(); err != nil {
				return nil, err
			}
			return s.infeasible(sol)
		}
		s.enterPhaseTwo()
		if err := s.computePotentialsChecked(); err != nil {
			return nil, err
		}
	}
	if !proved {
		// (A warm start that proved its tree optimal skips the final
		// pricing.)
		unb, err := s.run()
		if err != nil {
			return nil, err
		}
		if unb {
			return s.unbounded(sol, s.cycle), nil
		}
	}
	if sol, err = s.optimal(sol); err != nil {
		return nil, err
	}
	if opt.Keep {
		if sol.Basis, err = newBasis(s); err != nil {
			return nil, err
		}
	}
	if opt.keepSim {
		sol.sim = s
	}
	return sol, nil
}

// sameShape reports whether n's arrays have the lengths n.Validate
// requires (the per-lane checks are left to the caller).
func sameShape(n *Network) bool {
	m := len(n.Tail)
	return len(n.Head) == m && len(n.Lower) == m && len(n.Upper) == m && len(n.Rate) == m &&
		(n.LaneNames == nil || len(n.LaneNames) == m) && len(n.Supply) == len(n.Nodes)
}

// maxAbsRate returns the largest |rate|, or ErrOverflow for a rate of
// MinInt64.
func maxAbsRate(rate []int64) (int64, error) {
	var mx int64
	for _, r := range rate {
		if r == math.MinInt64 {
			return 0, fmt.Errorf("flow: solve: rate %d: %w", r, ErrOverflow)
		}
		mx = max(mx, abs64(r))
	}
	return mx, nil
}

// needChecks reports whether potentials over nn nodes with rates up to
// maxRate need checked arithmetic: phase two skips the checks when
// (2N+3)·maxRate is representable.
func needChecks(nn, maxRate int64) bool {
	v, err := MulChecked(2*nn+3, maxRate)
	return err != nil || v < 0
}

// newSimplex builds the extended network. Lane flows are zero and lane
// states are not set (coldStart or warmStart sets them); capacities are
// read from n.Upper until setShiftedCaps. The tree is not set.
func newSimplex(n *Network, hold bool, excess int64) (*simplex, error) {
	nv, m := len(n.Nodes), len(n.Tail)
	s := &simplex{net: n, m: m, hold: -1}
	nNodes := nv
	if hold {
		s.hold = int32(nv)
		for v, b := range n.Supply {
			if b > 0 {
				s.holdFrom = append(s.holdFrom, NodeID(v))
			}
		}
		nNodes++
	}
	nh := len(s.holdFrom)
	if int64(nNodes)+1 > math.MaxInt32 || int64(m)+int64(nh)+int64(nNodes) > math.MaxInt32 {
		return nil, fmt.Errorf("flow: solve: %d nodes and %d lanes exceed the solver's int32 indices: %w", nv, m, ErrOverflow)
	}
	s.nNodes = nNodes
	s.root = int32(nNodes)
	s.holdStart = m
	s.artStart = m + nh
	na := m + nh + nNodes
	s.na = na
	s.artEnd = na
	s.tail, s.head, s.rate, s.cost, s.cap = n.Tail, n.Head, n.Rate, n.Rate, n.Upper
	nx := nh + nNodes
	s.xsrc = make([]int32, nx)
	s.xtgt = make([]int32, nx)
	s.xcost = make([]int64, nx)
	s.xcap = make([]int64, nx)
	s.flow = make([]int64, na)
	s.state = make([]int8, na)
	for i, v := range s.holdFrom {
		s.xsrc[i], s.xtgt[i] = v, s.hold
		s.xcap[i] = n.Supply[v]
	}
	for v := 0; v < nNodes; v++ {
		j := nh + v
		s.xsrc[j], s.xtgt[j] = int32(v), s.root
		s.xcap[j] = inf
	}
	nt := nNodes + 1
	s.parent = make([]int32, nt)
	s.pred = make([]int32, nt)
	s.thread = make([]int32, nt)
	s.rthread = make([]int32, nt)
	s.size = make([]int32, nt)
	s.last = make([]int32, nt)
	s.up = make([]bool, nt)
	s.pot = make([]int64, nt)
	s.stemNode = make([]int32, nt)
	s.stemPred = make([]int32, nt)
	s.stemSize = make([]int32, nt)
	s.stemRthr = make([]int32, nt)
	s.stemAfter = make([]int32, nt)
	s.stemLast = make([]int32, nt)
	s.stemUp = make([]bool, nt)
	s.block = max(10, int(math.Sqrt(float64(na))))
	s.pred[s.root] = -1
	s.parent[s.root] = -1
	return s, nil
}

// setShiftedCaps copies the lane capacities above the minimums when some
// lane has a minimum (otherwise n.Upper serves: NoLimit == inf). O(|E|).
func (s *simplex) setShiftedCaps() {
	n := s.net
	hasLower := false
	for _, l := range n.Lower {
		if l != 0 {
			hasLower = true
			break
		}
	}
	if !hasLower || s.shifted {
		return
	}
	s.shifted = true
	s.cap = make([]int64, s.m)
	for a, u := range n.Upper {
		if u == NoLimit {
			s.cap[a] = inf
		} else {
			s.cap[a] = u - n.Lower[a]
		}
	}
}

// initLanes puts every lane and hold arc at zero flow (above the minimum):
// at the lower bound, or fixed when its capacity is zero. O(|E|).
func (s *simplex) initLanes() {
	clear(s.flow[:s.artStart])
	for a, c := range s.cap {
		if c == 0 {
			s.state[a] = stateTree // fixed
		} else {
			s.state[a] = stateLower
		}
	}
	for a := s.holdStart; a < s.artStart; a++ {
		s.state[a] = stateLower // capacity Supply > 0
	}
}

// shiftedSupply returns b'(v) for every non-root node: Supply minus the
// minimums leaving plus the minimums entering; H gets -excess.
func (s *simplex) shiftedSupply() ([]int64, error) {
	n := s.net
	b := make([]int64, s.nNodes)
	copy(b, n.Supply)
	var err error
	if s.shifted {
		for a, l := range n.Lower {
			if l == 0 {
				continue
			}
			if b[n.Tail[a]], err = SubChecked(b[n.Tail[a]], l); err != nil {
				return nil, fmt.Errorf("flow: solve: supply net of lane minimums at node %s: %w", n.Nodes[n.Tail[a]], err)
			}
			if b[n.Head[a]], err = AddChecked(b[n.Head[a]], l); err != nil {
				return nil, fmt.Errorf("flow: solve: supply net of lane minimums at node %s: %w", n.Nodes[n.Head[a]], err)
			}
		}
	}
	if s.hold >= 0 {
		sup, dem, _ := n.Totals()
		b[s.hold] = -(sup - dem)
	}
	return b, nil
}

// coldStart sets the artificial tree: every node hangs from R by its
// artificial arc, directed to R when b' >= 0 and from R otherwise, carrying
// |b'|. It is strongly feasible.
func (s *simplex) coldStart() error {
	s.initLanes()
	b, err := s.shiftedSupply()
	if err != nil {
		return err
	}
	var total int64
	for _, x := range b {
		if total, err = AddChecked(total, abs64(x)); err != nil || x == math.MinInt64 {
			return fmt.Errorf("flow: solve: total supply net of lane minimums: %w", ErrOverflow)
		}
	}
	s.artTotal = total
	s.initArtTree(b)
	return nil
}

func (s *simplex) initArtTree(b []int64) {
	r := s.root
	for v := 0; v < s.nNodes; v++ {
		a := int32(s.artStart + v)
		j := int(a) - s.m
		if b[v] >= 0 {
			s.xsrc[j], s.xtgt[j] = int32(v), r
			s.flow[a] = b[v]
			s.up[v] = true
		} else {
			s.xsrc[j], s.xtgt[j] = r, int32(v)
			s.flow[a] = -b[v]
			s.up[v] = false
		}
		s.state[a] = stateTree
		s.parent[v] = r
		s.pred[v] = a
		s.size[v] = 1
		s.last[v] = int32(v)
		s.thread[v] = int32(v + 1)
		s.rthread[v] = int32(v - 1)
	}
	s.treeSet = true
	s.size[r] = int32(s.nNodes + 1)
	if s.nNodes == 0 {
		s.thread[r], s.rthread[r], s.last[r] = r, r, r
		return
	}
	s.thread[r] = 0
	s.rthread[0] = r
	s.thread[s.nNodes-1] = r
	s.rthread[r] = int32(s.nNodes - 1)
	s.last[r] = int32(s.nNodes - 1)
}

// setCosts sets the costs of phase one: the lanes' rates (or 0 when
// !real) and artCost on the artificial arcs; hold arcs cost 0. With real
// costs the objective is known from the current flows (lanes at zero
// flow above their minimums, as after coldStart).
func (s *simplex) setCosts(real bool, artCost int64) {
	if real {
		s.cost = s.rate
	} else {
		s.cost = make([]int64, s.m)
	}
	for a := s.holdStart; a < s.artStart; a++ {
		s.xcost[a-s.m] = 0
	}
	for a := s.artStart; a < s.artEnd; a++ {
		s.xcost[a-s.m] = artCost
	}
	s.objOK = false
	if real {
		base, err := s.lowerCost()
		if err == nil {
			s.obj, err = base.Add(MulWide(artCost, s.artTotal))
		}
		s.objOK = err == nil
	}
}

// lowerCost returns Σ rate·minimum over the lanes. O(|E|) when some lane
// has a minimum.
func (s *simplex) lowerCost() (Wide, error) {
	if !s.shifted {
		return Wide{}, nil
	}
	return totalCost(s.rate, s.net.Lower)
}

// phaseOne minimises the total artificial flow from the current tree (lane
// and hold costs 0, artificial cost 1). It cannot be unbounded.
func (s *simplex) phaseOne() error {
	if !s.treeSet {
		if err := s.coldStart(); err != nil {
			return err
		}
	}
	s.setCosts(false, 1)
	s.artFixed = false
	saved := s.checked
	s.checked = false
	s.computePotentials()
	_, err := s.run()
	s.checked = saved
	return err
}

// freeArtificial lets the artificial arcs fixed outside the tree enter
// again (at zero flow) and returns s.
func (s *simplex) freeArtificial() *simplex {
	for v := 0; v < s.nNodes; v++ {
		if a := int32(s.artStart + v); s.pred[v] != a && s.state[a] == stateTree {
			s.state[a] = stateLower
		}
	}
	return s
}

// artFlow returns the total flow on the artificial arcs (each is at most
// |b'(v)|, and their sum was checked when the tree was built).
func (s *simplex) artFlow() int64 {
	var t int64
	for a := s.artStart; a < s.artEnd; a++ {
		t += s.flow[a]
	}
	return t
}

// enterPhaseTwo gives the artificial arcs cost 0 and keeps them at zero
// flow: those in the tree are directed to R (zero flow, no capacity, so
// any cycle through R is blocked on its way down), the others are fixed.
// The objective becomes the plan's cost (recomputed in O(|E|) when phase
// one had no lane costs).
func (s *simplex) enterPhaseTwo() {
	s.cost = s.rate
	for v := 0; v < s.nNodes; v++ {
		a := s.artStart + v
		j := a - s.m
		s.xcost[j] = 0
		if s.pred[v] == int32(a) {
			if !s.up[v] {
				s.xsrc[j], s.xtgt[j] = int32(v), s.root
				s.up[v] = true
			}
		} else {
			s.state[a] = stateTree
		}
	}
	s.artFixed = true
	s.artTotal = 0
	if !s.objOK {
		base, err := s.lowerCost()
		var c Wide
		if err == nil {
			c, err = totalCost(s.rate, s.flow[:s.m])
		}
		if err == nil {
			s.obj, err = base.Add(c)
		}
		s.objOK = err == nil
	}
}

// computePotentials sets p(R) = 0 and every other potential from its
// parent so that tree arcs have reduced cost 0 (unchecked; used when the
// potentials are known to be small).
func (s *simplex) computePotentials() {
	r := s.root
	s.pot[r] = 0
	s.drift = 0
	for v := s.thread[r]; v != r; v = s.thread[v] {
		a := s.pred[v]
		if s.up[v] {
			s.pot[v] = s.pot[s.parent[v]] - s.costOf(a)
		} else {
			s.pot[v] = s.pot[s.parent[v]] + s.costOf(a)
		}
	}
}

func (s *simplex) computePotentialsChecked() error {
	if !s.checked {
		s.computePotentials()
		return nil
	}
	r := s.root
	s.pot[r] = 0
	s.drift = 0
	var err error
	for v := s.thread[r]; v != r; v = s.thread[v] {
		a := s.pred[v]
		if s.up[v] {
			s.pot[v], err = SubChecked(s.pot[s.parent[v]], s.costOf(a))
		} else {
			s.pot[v], err = AddChecked(s.pot[s.parent[v]], s.costOf(a))
		}
		if err != nil {
			return fmt.Errorf("flow: solve: node potential: %w", err)
		}
	}
	return nil
}

// run pivots until no arc is eligible. It returns true when an unbounded
// cycle was found (recorded in s.cycle).
func (s *simplex) run() (bool, error) {
	for {
		var in int32
		var r int64
		if s.checked {
			var err error
			in, r, err = s.findEnteringChecked()
			if err != nil {
				return false, err
			}
		} else {
			in, r = s.findEntering()
		}
		if in < 0 {
			return false, nil
		}
		unb, err := s.pivot(in, s.state[in], r)
		if err != nil || unb {
			return unb, err
		}
	}
}

// findEntering returns an eligible arc and its reduced cost by block
// search, or -1: the arcs are scanned cyclically from where the last
// search stopped, in blocks of s.block arcs; the most violating arc of the
// first block holding one is chosen. Lanes and the other arcs are scanned
// as runs of one cyclic order; the artificial arcs are left out while they
// are fixed outside the tree (artFixed: none of them can enter).
func (s *simplex) findEntering() (int32, int64) {
	na, m := s.na, s.m
	skipLo, skipHi := na, na // arcs not scanned
	if s.artFixed {
		skipLo, skipHi = s.artStart, s.artEnd
	}
	total := na - (skipHi - skipLo)
	best, bestV := int32(-1), int64(0)
	cnt := s.block
	e := s.next
	if e >= skipLo && e < skipHi {
		e = skipHi
	}
	if e == na {
		e = 0
	}
	for done := 0; done < total; {
		end := na
		switch {
		case e < m:
			end = m
		case e < skipLo:
			end = skipLo
		}
		end = min(end, e+total-done)
		stop := -1
		if e < m {
			best, bestV, cnt, stop = scanArcs(s.state[:m], s.cost[:m], s.tail[:m], s.head[:m], s.pot, e, end, 0, best, bestV, cnt, s.block)
		} else {
			best, bestV, cnt, stop = scanArcs(s.state[m:], s.xcost, s.xsrc, s.xtgt, s.pot, e-m, end-m, m, best, bestV, cnt, s.block)
		}
		if stop >= 0 {
			if stop == skipLo {
				stop = skipHi
			}
			if stop == na {
				stop = 0
			}
			s.next = stop
			return best, bestV * int64(s.state[best])
		}
		done += end - e
		e = end
		if e == skipLo {
			e = skipHi
		}
		if e == na {
			e = 0
		}
	}
	if best >= 0 {
		s.next = 0
		return best, bestV * int64(s.state[best])
	}
	return -1, 0
}

// scanArcs is the inner loop of findEntering over arcs lo..hi-1 of one
// run (arc numbers base+lo..base+hi-1): it keeps the most violating arc
// (best, with state times reduced cost bestV) and counts down the block;
// stop is the arc after the block end when a block ends holding an
// eligible arc, else -1.
func scanArcs(state []int8, cost []int64, src, tgt []int32, pot []int64, lo, hi, base int, best int32, bestV int64, cnt, block int) (int32, int64, int, int) {
	for lo < hi {
		end := min(hi, lo+cnt)
		if i, v := scanBlock(state[lo:end], cost[lo:end], src[lo:end], tgt[lo:end], pot, bestV); i >= 0 {
			best, bestV = int32(base+lo+i), v
		}
		cnt -= end - lo
		lo = end
		if cnt == 0 {
			if best >= 0 {
				return best, bestV, cnt, base + end
			}
			cnt = block
		}
	}
	return best, bestV, cnt, -1
}

// scanBlock returns the index in state of the arc with the least
// state·reduced cost below bestV, and that value, or -1.
func scanBlock(state []int8, cost []int64, src, tgt []int32, pot []int64, bestV int64) (int, int64) {
	best := -1
	cost, src, tgt = cost[:len(state)], src[:len(state)], tgt[:len(state)]
	for i, st := range state {
		v := int64(st) * (cost[i] + pot[src[i]] - pot[tgt[i]])
		if v < bestV {
			bestV, best = v, i
		}
	}
	return best, bestV
}

// findEnteringChecked is findEntering with overflow checks on the reduced
// costs (for networks whose rates are close to the int64 limit).
func (s *simplex) findEnteringChecked() (int32, int64, error) {
	na := s.na
	best, bestV := -1, int64(0)
	cnt := s.block
	for i := 0; i < na; i++ {
		e := s.next + i
		if e >= na {
			e -= na
		}
		if s.state[e] == stateTree {
			cnt--
		} else {
			r, err := s.reducedChecked(int32(e))
			if err != nil {
				return -1, 0, err
			}
			if (s.state[e] == stateLower && r < 0) || (s.state[e] == stateUpper && r > 0) {
				v := -abs64(r)
				if r == math.MinInt64 {
					v = r
				}
				if best < 0 || v < bestV {
					bestV, best = v, e
				}
			}
			cnt--
		}
		if cnt == 0 {
			if best >= 0 {
				s.next = e + 1
				if s.next >= na {
					s.next = 0
				}
				r, _ := s.reducedChecked(int32(best))
				return int32(best), r, nil
			}
			cnt = s.block
		}
	}
	if best >= 0 {
		r, _ := s.reducedChecked(int32(best))
		return int32(best), r, nil
	}
	return -1, 0, nil
}

// reduced returns the reduced cost of arc a in unchecked arithmetic (for
// potentials known to be small, as in findEntering).
func (s *simplex) reduced(a int32) int64 {
	if int(a) < s.m {
		return s.cost[a] + s.pot[s.tail[a]] - s.pot[s.head[a]]
	}
	j := int(a) - s.m
	return s.xcost[j] + s.pot[s.xsrc[j]] - s.pot[s.xtgt[j]]
}

func (s *simplex) reducedChecked(e int32) (int64, error) {
	t, h := s.ends(e)
	r, err := AddChecked(s.costOf(e), s.pot[t])
	if err == nil {
		r, err = SubChecked(r, s.pot[h])
	}
	if err != nil {
		return 0, fmt.Errorf("flow: solve: reduced cost: %w", err)
	}
	return r, nil
}

// pivot pushes flow around the cycle closed by arc in (dir +1: more flow
// on in, -1: less) with the reduced cost r of in, and updates the tree,
// the objective (by the flow moved times r) and the artificial flow.
// It returns true when the cycle has no limit (then s.cycle is set and
// nothing changes).
func (s *simplex) pivot(in int32, dir int8, r int64) (bool, error) {
	s.pivots++
	parent, pred, up, flow := s.parent, s.pred, s.up, s.flow
	first, second := s.ends(in)
	if dir < 0 {
		first, second = second, first
	}
	// Apex and leaving arc in one climb, always from the smaller subtree
	// (the node with the larger subtree is never below the other). The
	// leaving arc follows Cunningham's rule: the last blocking arc met when
	// walking the cycle in the direction of flow from the apex (apex down
	// to first, the entering arc, second up to the apex). Each side is
	// climbed upwards, so the first side keeps its lowest minimum (strict
	// <) and the second side its highest (<=).
	size := s.size
	u, v := first, second
	su, sv := size[u], size[v]
	delta1, delta2 := int64(inf), int64(inf)
	leave1, leave2 := int32(-1), int32(-1)
	for u != v {
		if su < sv {
			a := pred[u]
			var d int64
			if up[u] {
				d = flow[a]
			} else if c := s.capOf(a); c == inf {
				d = inf
			} else {
				d = c - flow[a]
			}
			if d < delta1 {
				delta1, leave1 = d, u
			}
			u = parent[u]
			su = size[u]
		} else {
			a := pred[v]
			var d int64
			if !up[v] {
				d = flow[a]
			} else if c := s.capOf(a); c == inf {
				d = inf
			} else {
				d = c - flow[a]
			}
			if d <= delta2 {
				delta2, leave2 = d, v
			}
			v = parent[v]
			sv = size[v]
		}
	}
	apex := u
	var dIn int64
	if dir > 0 {
		if c := s.capOf(in); c == inf {
			dIn = inf
		} else {
			dIn = c - flow[in]
		}
	} else {
		dIn = flow[in]
	}
	// leave: the node whose pred leaves, or -1 for the entering arc.
	delta, leave, side := delta1, leave1, 1
	if dIn <= delta {
		delta, leave, side = dIn, -1, 0
	}
	if delta2 <= delta {
		delta, leave, side = delta2, leave2, 2
	}
	if delta == inf {
		s.recordCycle(in, first, second, apex)
		return true, nil
	}

	if delta > 0 {
		const maxFlow = math.MaxInt64 - 1
		if dir > 0 {
			if s.capOf(in) == inf && flow[in] > maxFlow-delta {
				return false, s.flowOverflow(in)
			}
			flow[in] += delta
		} else {
			flow[in] -= delta
		}
		top1, top2 := int32(-1), int32(-1) // nodes below the apex
		for u := first; u != apex; u = parent[u] {
			a := pred[u]
			if up[u] {
				flow[a] -= delta
			} else {
				if s.capOf(a) == inf && flow[a] > maxFlow-delta {
					return false, s.flowOverflow(a)
				}
				flow[a] += delta
			}
			top1 = u
		}
		for u := second; u != apex; u = parent[u] {
			a := pred[u]
			if up[u] {
				if s.capOf(a) == inf && flow[a] > maxFlow-delta {
					return false, s.flowOverflow(a)
				}
				flow[a] += delta
			} else {
				flow[a] -= delta
			}
			top2 = u
		}
		if apex == s.root || s.isArt(in) {
			s.trackArtificial(in, dir, top1, top2, delta)
		}
		if s.objOK {
			d := MulWide(delta, r)
			if dir < 0 {
				d = d.Neg()
			}
			var err error
			if s.obj, err = s.obj.Add(d); err != nil {
				s.objOK = false
			}
		}
	}
	if s.pivots&(progressEvery-1) == 0 {
		switch {
		case s.artTotal == 0 && s.objOK && s.progress != nil:
			s.progress(s.pivots, s.obj)
		case s.artTotal > 0 && s.placing != nil:
			s.placing(s.pivots, s.artTotal/2)
		}
	}

	if side == 0 {
		// The entering arc moves to its other bound; the tree stays.
		if dir > 0 {
			s.state[in] = stateUpper
		} else {
			s.state[in] = stateLower
		}
		return false, nil
	}
	out := pred[leave]
	switch {
	case s.artFixed && s.isArt(out):
		s.state[out] = stateTree // fixed from now on
	case flow[out] == 0:
		s.state[out] = stateLower
	default:
		s.state[out] = stateUpper
	}
	s.state[in] = stateTree
	uIn, vIn := first, second
	if side == 2 {
		uIn, vIn = second, first
	}
	sigma := r
	if src, _ := s.ends(in); uIn == src {
		sigma = -r
	}
	return false, s.updateTree(in, uIn, vIn, leave, apex, sigma)
}

// trackArtificial updates artTotal after delta moved around a cycle: the
// artificial arcs on it are the entering arc and the tree arcs of the
// nodes just below R (top1 on the first side, top2 on the second).
func (s *simplex) trackArtificial(in int32, dir int8, top1, top2 int32, delta int64) {
	if s.isArt(in) {
		if dir > 0 {
			s.artTotal += delta
		} else {
			s.artTotal -= delta
		}
	}
	if top1 >= 0 && s.parent[top1] == s.root {
		if s.up[top1] {
			s.artTotal -= delta
		} else {
			s.artTotal += delta
		}
	}
	if top2 >= 0 && s.parent[top2] == s.root {
		if s.up[top2] {
			s.artTotal += delta
		} else {
			s.artTotal -= delta
		}
	}
}

func (s *simplex) flowOverflow(a int32) error {
	if int(a) < s.m {
		return fmt.Errorf("flow: solve: flow on lane %s: %w", s.net.LaneName(LaneID(a)), ErrOverflow)
	}
	return fmt.Errorf("flow: solve: total flow: %w", ErrOverflow)
}

// recordCycle stores the cycle of the entering arc as lane steps in
// traversal order: the entering arc, second up to the apex, the apex down
// to first. All its arcs grow (no capacity), so every step is Forward.
func (s *simplex) recordCycle(in, first, second, apex int32) {
	cyc := []CycleStep{{Lane: in, Forward: true}}
	for u := second; u != apex; u = s.parent[u] {
		cyc = append(cyc, CycleStep{Lane: s.pred[u], Forward: true})
	}
	k := len(cyc)
	for u := first; u != apex; u = s.parent[u] {
		cyc = append(cyc, CycleStep{Lane: s.pred[u], Forward: true})
	}
	for i, j := k, len(cyc)-1; i < j; i, j = i+1, j-1 {
		cyc[i], cyc[j] = cyc[j], cyc[i]
	}
	s.cycle = cyc
}

// updateTree replaces the tree arc pred[uOut] by the entering arc in,
// which joins uIn (inside the subtree S of uOut) to vIn (outside it). The
// path uIn = w0, w1, ..., wk = uOut (the stem) is reversed, S is re-rooted
// at uIn and hung below vIn, and the potentials of S move by sigma.
//
// New preorder of S: the old subtree of w0, then for i = 1..k: w_i, the
// part of its old subtree before w_{i-1}'s subtree, and the part after it.
// S is spliced out of the thread and inserted right after vIn.
func (s *simplex) updateTree(in, uIn, vIn, uOut, apex int32, sigma int64) error {
	par, pred, up := s.parent, s.pred, s.up
	thr, rthr, sz, lst := s.thread, s.rthread, s.size, s.last
	stem, sPred, sSize, sRthr, sAfter, sLast, sUp := s.stemNode, s.stemPred, s.stemSize, s.stemRthr, s.stemAfter, s.stemLast, s.stemUp

	// Record the stem and the old values it needs.
	k := 0
	for w := uIn; ; w = par[w] {
		stem[k] = w
		sPred[k] = pred[w]
		sUp[k] = up[w]
		sSize[k] = sz[w]
		sRthr[k] = rthr[w]
		sLast[k] = lst[w]
		sAfter[k] = thr[lst[w]]
		if w == uOut {
			break
		}
		k++
	}
	sN := sSize[k]
	oldLastS := sLast[k]
	prevS := sRthr[k]
	nextS := sAfter[k]
	oldPar := par[uOut]

	// Relink the thread inside S.
	end := sLast[0]
	for i := 1; i <= k; i++ {
		w := stem[i]
		thr[end] = w
		rthr[w] = end
		end = sRthr[i-1]
		if sLast[i] != sLast[i-1] {
			p := sAfter[i-1]
			thr[end] = p
			rthr[p] = end
			end = sLast[i]
		}
	}
	endS := end
	// Splice S out and insert it after vIn.
	thr[prevS] = nextS
	rthr[nextS] = prevS
	after := thr[vIn]
	thr[vIn] = uIn
	rthr[uIn] = vIn
	thr[endS] = after
	rthr[after] = endS

	// Reverse the stem.
	acc := int32(0)
	for i := k; i >= 1; i-- {
		w := stem[i]
		par[w] = stem[i-1]
		pred[w] = sPred[i-1]
		up[w] = !sUp[i-1]
		acc += sSize[i] - sSize[i-1]
		sz[w] = acc
		lst[w] = endS
	}
	par[uIn] = vIn
	pred[uIn] = in
	srcIn, _ := s.ends(in)
	up[uIn] = srcIn == uIn
	sz[uIn] = sN
	lst[uIn] = endS

	// Old ancestors lose S, new ancestors gain it (unchanged from the apex
	// up).
	for a := oldPar; a != apex; a = par[a] {
		sz[a] -= sN
	}
	for a := vIn; a != apex; a = par[a] {
		sz[a] += sN
	}
	for a := oldPar; a >= 0 && lst[a] == oldLastS; a = par[a] {
		lst[a] = prevS
	}
	for a := vIn; a >= 0 && lst[a] == vIn; a = par[a] {
		lst[a] = endS
	}

	// Potentials of S.
	if sigma != 0 {
		pot := s.pot
		if s.checked {
			u := uIn
			for i := int32(0); i < sN; i++ {
				p, err := AddChecked(pot[u], sigma)
				if err != nil {
					return fmt.Errorf("flow: solve: node potential: %w", err)
				}
				pot[u] = p
				u = thr[u]
			}
		} else if 2*sN <= sz[s.root] || s.drift > driftLimit {
			u := uIn
			for i := int32(0); i < sN; i++ {
				pot[u] += sigma
				u = thr[u]
			}
		} else {
			// Shift the smaller rest of the tree the other way: the same
			// reduced costs; the root's potential drifts by -sigma
			// (bounded by driftLimit, then the subtree is shifted).
			for u := thr[endS]; u != uIn; u = thr[u] {
				pot[u] -= sigma
			}
			s.drift += abs64(sigma)
		}
	}
	return nil
}

// infeasible fills sol for an infeasible problem after phase one.
func (s *simplex) infeasible(sol *Solution) (*Solution, error) {
	var short int64
	for v := 0; v < s.nNodes; v++ {
		a := s.artStart + v
		if s.xsrc[a-s.m] == s.root {
			short += s.flow[a] // bounded by the checked total demand
		}
	}
	sol.Status = Infeasible
	sol.Shortfall = short
	sol.Pivots = s.pivots
	if s.keep {
		sol.Attempt = make([]int64, s.m)
		for a := range sol.Attempt {
			x := s.flow[a]
			if s.shifted {
				x += s.net.Lower[a] // <= Upper, or the flow overflowed
				if x < s.flow[a] {
					return nil, s.flowOverflow(int32(a))
				}
			}
			sol.Attempt[a] = x
		}
	}
	return sol, nil
}

// unbounded fills sol for an unbounded problem with its cycle.
func (s *simplex) unbounded(sol *Solution, cycle []CycleStep) *Solution {
	sol.Status = Unbounded
	sol.Cycle = cycle
	sol.Pivots = s.pivots
	return sol
}

// optimal fills sol from an optimal phase-two tree.
func (s *simplex) optimal(sol *Solution) (*Solution, error) {
	n := s.net
	nv, m := len(n.Nodes), s.m
	sol.Status = Optimal
	sol.Pivots = s.pivots
	if s.shifted {
		sol.Flow = make([]int64, m)
		for a := 0; a < m; a++ {
			x := s.flow[a] + n.Lower[a] // <= Upper when Upper is finite
			if s.cap[a] == inf && x < s.flow[a] {
				return nil, s.flowOverflow(int32(a))
			}
			sol.Flow[a] = x
		}
	} else {
		sol.Flow = s.flow[:m:m]
	}
	var err error
	if s.objOK {
		sol.Cost = s.obj
	} else if sol.Cost, err = totalCost(n.Rate, sol.Flow); err != nil {
		return nil, err
	}
	sol.Held = make([]int64, nv)
	for i, v := range s.holdFrom {
		sol.Held[v] = s.flow[s.holdStart+i]
	}
	sol.InTree = make([]bool, m)
	for v := 0; v < s.nNodes; v++ {
		if a := s.pred[v]; int(a) < m {
			sol.InTree[a] = true
		}
	}
	sol.Potential, err = s.normalPotentials()
	if err != nil {
		return nil, err
	}
	return sol, nil
}

// normalPotentials shifts the tree potentials on each weakly connected
// component (see Solve). When R has a single child the tree joins all
// nodes and the lanes are not read; otherwise one pass over the lanes
// joins the subtrees of R's children that lanes connect.
func (s *simplex) normalPotentials() ([]int64, error) {
	n := s.net
	nv := len(n.Nodes)
	comp := make([]int32, s.nNodes) // union-find parents
	for v := range comp {
		comp[v] = int32(v)
	}
	find := func(v int32) int32 {
		for comp[v] != v {
			comp[v] = comp[comp[v]]
			v = comp[v]
		}
		return v
	}
	union := func(a, b int32) {
		ra, rb := find(a), find(b)
		if ra == rb {
			return
		}
		if ra < rb {
			comp[rb] = ra
		} else {
			comp[ra] = rb
		}
	}
	// Nodes below the same child of R are connected by tree arcs; only
	// lanes between such subtrees need the union-find.
	label := make([]int32, s.nNodes)
	children := 0
	for v := s.thread[s.root]; v != s.root; v = s.thread[v] {
		if p := s.parent[v]; p == s.root {
			label[v] = v
			children++
		} else {
			label[v] = label[p]
			union(v, p)
		}
	}
	if children > 1 {
		for a := 0; a < s.m; a++ {
			if t, h := n.Tail[a], n.Head[a]; label[t] != label[h] {
				union(t, h)
			}
		}
		for _, v := range s.holdFrom {
			union(v, s.hold)
		}
	}
	// Reference potential per component representative.
	const none = 0 // refKind: 0 none yet, 1 from all nodes, 2 from origins, 3 from H
	refKind := make([]int8, s.nNodes)
	ref := make([]int64, s.nNodes)
	for v := 0; v < s.nNodes; v++ {
		c := find(int32(v))
		p := s.pot[v]
		kind := int8(1)
		switch {
		case int32(v) == s.hold:
			kind = 3
		case v < nv && n.Supply[v] > 0:
			kind = 2
		}
		switch {
		case refKind[c] == none || kind > refKind[c]:
			refKind[c], ref[c] = kind, p
		case kind == refKind[c] && kind < 3 && p < ref[c]:
			ref[c] = p
		}
	}
	out := make([]int64, nv)
	var err error
	for v := 0; v < nv; v++ {
		c := find(int32(v))
		if out[v], err = SubChecked(s.pot[v], ref[c]); err != nil {
			return nil, fmt.Errorf("flow: solve: node potential: %w", err)
		}
	}
	return out, nil
}

// costSum accumulates Σ rate·x (x >= 0) exactly: positive and negative
// products are summed apart in 128 bits, with a carry check.
type costSum struct {
	pHi, pLo, nHi, nLo uint64
	over               bool
}

func (c *costSum) add(r, x int64) {
	var k uint64
	if r > 0 {
		hi, lo := bits.Mul64(uint64(r), uint64(x))
		c.pLo, k = bits.Add64(c.pLo, lo, 0)
		c.pHi, k = bits.Add64(c.pHi, hi, k)
	} else {
		hi, lo := bits.Mul64(uint64(-r), uint64(x))
		c.nLo, k = bits.Add64(c.nLo, lo, 0)
		c.nHi, k = bits.Add64(c.nHi, hi, k)
	}
	if k != 0 {
		c.over = true
	}
}

func (c *costSum) total() (Wide, error) {
	if c.over || c.pHi>>63 != 0 || c.nHi>>63 != 0 {
		return Wide{}, fmt.Errorf("flow: solve: total cost: %w", ErrOverflow)
	}
	return Wide{hi: int64(c.pHi), lo: c.pLo}.Sub(Wide{hi: int64(c.nHi), lo: c.nLo})
}

// totalCost returns Σ rate[a]·x[a] (x >= 0) exactly.
func totalCost(rate, x []int64) (Wide, error) {
	var c costSum
	for a, r := range rate {
		if f := x[a]; r != 0 && f != 0 {
			c.add(r, f)
		}
	}
	return c.total()
}

// warmStart sets the flows from plan x when x is feasible and builds the
// first tree (see "Warm start" at Solve). It returns false when x is not
// feasible (flows and states may have been written then: coldStart resets
// them); otherwise true, the free arcs left out of the tree (which the
// caller pivots in), whether the tree is proved optimal (no lane with the
// wrong sign of reduced cost and no free arc left out: the final pricing
// is not needed), and true when a cycle without limit was found
// (s.cycle); or an error on overflow.
//
// One pass over the lanes checks x and sets flows, states, the plan's
// cost and, per node, the number of lanes at a bound whose spare
// direction leads to it; a second pass lists those lanes (on a dense
// network, see dense, the counts are skipped and the searches sweep the
// lanes instead). Time and memory O(|V|+|E|) plus the searches.
func (s *simplex) warmStart(x []int64) (bool, []int32, bool, bool, error) {
	n := s.net
	m, nv, nn := s.m, len(n.Nodes), s.nNodes
	if len(x) != m {
		return false, nil, false, false, nil
	}
	netout := make([]int64, nn)
	cnt := make([]int32, nn+1) // lanes at a bound, by node (at v+1)
	// The counts serve the lists of the search by lists only; the search
	// by sweeps notes instead the nodes some lane's spare direction
	// leaves from (a part without one can never be raised; the later
	// pivots may make this out of date, which costs sweeps, not
	// correctness: a part hung from R can still be raised).
	dense := s.dense() || s.sweepAlways
	var lead []bool
	if dense {
		lead = make([]bool, nn)
	}
	free := make([]int32, 0, 64)
	var cs costSum
	tail, head, rate, lower, upper := s.tail[:m], s.head[:m], s.rate[:m], n.Lower[:m], n.Upper[:m]
	flow, state := s.flow[:m], s.state[:m]
	x = x[:m]
	hasLower := false
	var maxRate uint64
	for a := 0; a < m; a++ {
		xa, lo, up := x[a], lower[a], upper[a]
		t, h, r := tail[a], head[a], rate[a]
		// The lane checks of n.Validate and the rate bound are done
		// here; the caller validates when this pass stops early.
		if xa < lo || xa > up || xa == inf || lo < 0 || uint32(t) >= uint32(nv) || uint32(h) >= uint32(nv) || r == math.MinInt64 {
			return false, nil, false, false, nil
		}
		maxRate = max(maxRate, uint64(abs64(r)))
		f, c := xa, up
		if lo != 0 {
			hasLower = true
			f = xa - lo
			if up != NoLimit {
				c = up - lo
			}
		}
		flow[a] = f
		if xa != 0 {
			var err error
			if netout[t], err = AddChecked(netout[t], xa); err != nil {
				return false, nil, false, false, nil
			}
			if netout[h], err = SubChecked(netout[h], xa); err != nil {
				return false, nil, false, false, nil
			}
			if r != 0 {
				cs.add(r, xa)
			}
		}
		switch {
		case c == 0:
			state[a] = stateTree // fixed
		case f == 0:
			state[a] = stateLower // spare: tail -> head
			if dense {
				lead[t] = true
			} else {
				cnt[h+1]++
			}
		case f == c:
			state[a] = stateUpper // spare: head -> tail
			if dense {
				lead[h] = true
			} else {
				cnt[t+1]++
			}
		default:
			state[a] = stateTree
			free = append(free, int32(a))
		}
	}
	for v := 0; v < nv; v++ {
		b := n.Supply[v]
		if s.hold >= 0 && b > 0 {
			if netout[v] < 0 || netout[v] > b {
				return false, nil, false, false, nil
			}
		} else if netout[v] != b {
			return false, nil, false, false, nil
		}
	}
	for i, v := range s.holdFrom {
		a := s.holdStart + i
		b := n.Supply[v]
		f := b - netout[v]
		s.flow[a] = f
		switch f {
		case 0:
			s.state[a] = stateLower
			if dense {
				lead[v] = true
			} else {
				cnt[s.hold+1]++
			}
		case b:
			s.state[a] = stateUpper
			if dense {
				lead[s.hold] = true
			} else {
				cnt[v+1]++
			}
		default:
			s.state[a] = stateTree
			free = append(free, int32(a))
		}
	}
	if hasLower {
		s.setShiftedCaps()
	}
	s.checked = needChecks(int64(nn), int64(maxRate))
	var errCost error
	s.obj, errCost = cs.total()
	s.objOK = errCost == nil
	s.artTotal = 0

	// The forest: the free arcs in index order while they close no
	// cycle.
	uf := make([]int32, nn)
	find := func(v int32) int32 {
		for uf[v] != v {
			uf[v] = uf[uf[v]]
			v = uf[v]
		}
		return v
	}
	join := func(a int32) bool {
		t, h := s.ends(a)
		ra, rb := find(t), find(h)
		if ra == rb {
			return false
		}
		if ra < rb {
			uf[rb] = ra
		} else {
			uf[ra] = rb
		}
		return true
	}
	forest := make([]int32, 0, nn)
	var superbasic []int32
	var fadj adjacency // the forest's
	// makeForest fills forest and superbasic.
	makeForest := func() {
		for v := range uf {
			uf[v] = int32(v)
		}
		forest, superbasic = forest[:0], superbasic[:0]
		for _, a := range free {
			if join(a) {
				forest = append(forest, a)
			} else {
				superbasic = append(superbasic, a)
			}
		}
		fadj.build(s, forest, nn)
	}
	// boundState is the state arc a's flow gives it outside the tree.
	boundState := func(a int32) int8 {
		switch f := s.flow[a]; f {
		case 0:
			return stateLower
		case s.capOf(a):
			return stateUpper
		}
		return stateTree
	}
	// count adds (k = 1) or removes (k = -1) arc a at state st from cnt.
	count := func(a int32, st int8, k int32) {
		t, h := s.ends(a)
		switch st {
		case stateLower:
			cnt[h+1] += k
		case stateUpper:
			cnt[t+1] += k
		}
	}
	// cancel pivots arcs into the current tree: first the free arcs of
	// freeTry (left out of the forest) towards lower cost, then the arcs
	// of try (at a bound) when eligible, most violating first. Only the
	// arcs of touched (which must hold every tree arc not artificial and
	// every arc of freeTry and try) can change flow; afterwards their
	// states follow their flows (the tree is dropped), free keeps those
	// strictly between their bounds, and the counts cnt follow the
	// states.
	cancel := func(freeTry, try []int32, touched []int32) (bool, error) {
		before := make([]int8, len(touched))
		for i, a := range touched {
			before[i] = boundState(a)
		}
		if err := s.computePotentialsChecked(); err != nil {
			return false, err
		}
		for _, a := range freeTry {
			if s.state[a] != stateTree {
				continue // reached a bound already
			}
			if unb, err := s.pivotFree(a); err != nil || unb {
				return unb, err
			}
		}
		{
			// Most violating first (after a perturbation, the lane that
			// left the cycle is among them, and its pivot restores it):
			// a few rounds of picking the most violating arc still
			// eligible, then the rest in order.
			rest := append([]int32(nil), try...)
			for k := 0; len(rest) > 0; k++ {
				best, bestR := -1, int64(0)
				keep := rest[:0]
				for _, a := range rest {
					st := s.state[a]
					if st == stateTree {
						continue
					}
					var r int64
					if s.checked {
						var err error
						if r, err = s.reducedChecked(a); err != nil {
							return false, err
						}
					} else {
						r = s.reduced(a)
					}
					if int64(st)*r >= 0 {
						continue
					}
					if k >= maxPicks {
						if unb, err := s.pivot(a, st, r); err != nil || unb {
							return unb, err
						}
						continue
					}
					if r = abs64(r); best < 0 || r > bestR {
						best, bestR = len(keep), r
					}
					keep = append(keep, a)
				}
				if best < 0 {
					break
				}
				a := keep[best]
				rest = append(keep[:best], keep[best+1:]...)
				r, _ := s.reducedChecked(a)
				if unb, err := s.pivot(a, s.state[a], r); err != nil || unb {
					return unb, err
				}
			}
		}
		free = free[:0]
		for i, a := range touched {
			st := boundState(a)
			s.state[a] = st
			if st == stateTree {
				free = append(free, a)
			}
			if st != before[i] {
				count(a, before[i], -1)
				count(a, st, 1)
			}
		}
		return false, nil
	}
	// cancelInTree pivots the arcs of try into the current tree (see
	// cancel; the tree arcs that are not artificial may change flow).
	// The free lanes outside the tree (superbasic) are touched too, so
	// that they stay in free.
	cancelInTree := func(try []int32) (bool, error) {
		touched := append(append([]int32(nil), try...), superbasic...)
		for v := 0; v < nn; v++ {
			if a := s.pred[v]; int(a) < s.artStart {
				touched = append(touched, a)
			}
		}
		return cancel(nil, try, touched)
	}
	// setArtTree sets the tree to the forest with each part hung from R
	// by the artificial arc of its smallest node: a strongly feasible
	// tree of free arcs.
	setArtTree := func() {
		s.setForestTree(forest, &fadj, func(v int32) bool { return find(v) == v })
	}
	// parts builds the forest of free lanes; when some free lanes close
	// cycles and cancelFree is set it first cancels those (in a tree of
	// the parts hung from R, which it leaves set: treeSet), so the parts'
	// potentials come from a plan without cycles of free lanes (a plan
	// moved around a few cycles from an optimum is then usually back at
	// it). It returns each node's part and the parts' potentials.
	parts := func(cancelFree bool) (comp []int32, rho []int64, treeSet, unb bool, err error) {
		makeForest()
		if cancelFree && len(superbasic) > 0 {
			setArtTree()
			touched := append([]int32(nil), free...)
			freeTry := append([]int32(nil), superbasic...)
			if unb, err := cancel(freeTry, nil, touched); err != nil || unb {
				return nil, nil, true, unb, err
			}
			makeForest()
			treeSet = true
		}
		comp, rho = s.forestParts(forest, &fadj)
		return comp, rho, treeSet, false, nil
	}
	if dense && s.canSweep(int64(maxRate)) {
		// A dense network: searches by sweeps over the lanes (no lists;
		// see sweepTree), each started from the tree the last one left.
		var buf sweepBuf
		s.swept = true
		viols, tries := 0, 0
		hasTree := false  // the current tree holds the forest, potentials current
		searched := false // and was built by a search that ran to the end
		for {
			comp, rho, treeSet, unb, err := parts(true)
			if err != nil || unb {
				return true, nil, false, unb, err
			}
			hasTree = hasTree || treeSet
			if !hasTree {
				setArtTree()
				s.computePotentials()
				hasTree = true
			}
			res := s.sweepTree(forest, comp, rho, lead, int64(maxRate), searched, viols < maxSweepViols, &buf)
			var try []int32
			searched = len(res.viol) == 0
			switch {
			case len(res.viol) > 0:
				// Lanes at a bound inside a part with the wrong sign of
				// reduced cost close cycles of negative cost with the
				// forest: cancel them first (in the tree the first sweep
				// left, which the next search starts from).
				try = res.viol
				viols++
			case len(res.refused) > 0 && tries < maxSweepTries:
				// Pivot the lanes closing cycles of negative cost into
				// the tree just built, then search again from it.
				try = res.refused
				tries++
			default:
				return true, superbasic, res.optimal && len(superbasic) == 0, false, nil
			}
			if unb, err := cancelInTree(try); err != nil || unb {
				return true, nil, false, unb, err
			}
		}
	}
	if dense {
		s.boundCounts(cnt)
	}
	insideRounds := maxInsideRounds
	if s.noRounds {
		insideRounds = 0
	}
	for round := 0; ; round++ {
		comp, rho, _, unb, err := parts(false)
		if err != nil || unb {
			return true, nil, false, unb, err
		}
		var viol []int32
		if round < insideRounds {
			// Cancelling changes the forest, and with it the lanes
			// inside parts: more of them may now have the wrong sign.
			// Many such lanes make the search refuse many more (the
			// parts they join rise against each other), so after the
			// first round they are cancelled first while they are many.
			if viol = s.insideViolations(comp, rho); round > 0 && len(viol) < minInsideViol {
				viol = nil
			}
		}
		if len(viol) > 0 || round < insideRounds && len(superbasic) > 0 {
			// Free lanes left out of the forest close cycles with it, and
			// lanes at a bound inside a part with the wrong sign of
			// reduced cost close cycles of negative cost: cancel them in
			// the forest (each part hung from R; the free lanes first, in
			// the direction that lowers the cost, as parts does) and start
			// again. (One tree for both saves a tree and a forest per
			// repair.)
			setArtTree()
			touched := append(append([]int32(nil), free...), viol...)
			freeTry := append([]int32(nil), superbasic...)
			if unb, err := cancel(freeTry, viol, touched); err != nil || unb {
				return true, nil, false, unb, err
			}
			continue
		}
		pl, inside := s.buildPartLists(cnt, comp, rho)
		try, proved, pile := s.completeTree(forest, comp, rho, pl, inside)
		if len(try) > 0 && (round < maxRounds || pile && !s.piled) {
			// Lanes the search found closing cycles of negative cost
			// (across parts, or inside one): pivot them into the tree
			// just built, then search again from the new plan. (Once
			// more after a pile on the search's root part: see
			// pileRefusals.)
			s.piled = s.piled || round >= maxRounds
			if unb, err := cancelInTree(try); err != nil || unb {
				return true, nil, false, unb, err
			}
			continue
		}
		// (Proved: the final pricing is skipped.)
		return true, superbasic, proved && len(superbasic) == 0, false, nil
	}
}

// maxPicks bounds the rounds of picking the most violating arc when a
// warm start cancels cycles of negative cost.
const maxPicks = 32

// maxInsideRounds bounds the rounds of a warm start that cancel lanes
// inside parts with the wrong sign of reduced cost, and minInsideViol is
// the number of such lanes from which a round after the first one runs.
// A round costs a pass over the lanes and a rebuild of the forest, much
// less than a search; when the perturbation of a plan leaves many such
// lanes after the first round, the search refuses hundreds of lanes and
// block search then needs thousands of pivots (netgen_a1e5, seed 11:
// 148 lanes after the first round, 3,149 pivots; with the extra rounds
// 163 pivots; see BENCHMARKS.md, fourth session).
const (
	maxInsideRounds = 8
	minInsideViol   = 16
)

// maxRounds bounds the rounds of a warm start, counted from the first and
// including the rounds that cancel lanes inside parts, after which the
// lanes a search refuses are still cancelled and the search made again.
// With 1, that happens only when the first search comes before any round
// inside parts. A second round (then a third search) cut the pivots but
// cost more than the block search spends on them (the repairs of
// BENCHMARKS.md, third session: 0.74-0.91x of the time with two rounds on
// general, sparse and, in the restricted solves of sifting, dense
// networks). Since the rounds inside parts exist, the first search on the
// generated general and sparse transportation networks always follows one
// of them, so the refusals go to block search. Counting the refusal round
// apart (one search more after the rounds inside parts) made the repairs
// of netgen_a1e5 seed 2006 1.24x slower in all (seventh session); only the
// seed with a pile of refusals gained.
const maxRounds = 1

// pivotFree pivots the free arc a (not in the tree) in, towards lower
// cost; on a tie towards less flow (a finite limit, so a zero-cost cycle
// is never called unbounded).
func (s *simplex) pivotFree(a int32) (bool, error) {
	r, err := s.reducedChecked(a)
	if err != nil {
		return false, err
	}
	dir := stateUpper
	if r < 0 {
		dir = stateLower
	}
	return s.pivot(a, dir, r)
}

// forestParts returns each node's part of the forest (g: its adjacency),
// named by its smallest node, and the potentials within parts: reduced
// cost 0 on forest arcs, 0 at each part's smallest node; all zero (no
// guidance and no overflow risk) when potentials need checked arithmetic.
// O(|V|).
func (s *simplex) forestParts(forest []int32, g *adjacency) (comp []int32, rho []int64) {
	nn := s.nNodes
	comp = make([]int32, nn)
	for v := range comp {
		comp[v] = -1
	}
	rho = make([]int64, nn)
	withRho := !s.checked
	stack := make([]int32, 0, 64)
	for v0 := int32(0); v0 < int32(nn); v0++ {
		if comp[v0] >= 0 {
			continue
		}
		comp[v0] = v0
		stack = append(stack[:0], v0)
		for len(stack) > 0 {
			v := stack[len(stack)-1]
			stack = stack[:len(stack)-1]
			for _, i := range g.pos[g.start[v]:g.start[v+1]] {
				t, h := g.ends[2*i], g.ends[2*i+1]
				w := t
				if w == v {
					w = h
				}
				if comp[w] >= 0 {
					continue
				}
				comp[w] = v0
				// r(a) = cost + p(tail) - p(head) = 0
				switch {
				case !withRho:
				case t == w:
					rho[w] = rho[v] - s.costOf(forest[i])
				default:
					rho[w] = rho[v] + s.costOf(forest[i])
				}
				stack = append(stack, w)
			}
		}
	}
	return comp, rho
}

// partArc is an arc at a bound between two parts of the forest, listed
// under the part its spare direction leads to (the head's part at the
// lower bound, the tail's at capacity): arc, d the part at its other end,
// and k the offset of d, less the listing part's offset, that gives the
// arc reduced cost 0 (minus its reduced cost from the parts' potentials
// rho at the lower bound, plus it at capacity; see partSearch for
// offsets).
type partArc struct {
	arc, d int32
	k      int64
}

// partLists lists arcs at a bound between parts by the part they are
// listed under: part c's are list[start[c]:end[c]].
type partLists struct {
	list       []partArc
	start, end []int32
}

// buildPartLists lists the arcs at a bound that join two parts of the
// forest (comp, with potentials within parts rho) by part, in index order;
// the slots come from the per-node counts cnt (at v+1, arcs inside parts
// included). Arcs at a bound inside a part whose reduced cost from rho has
// the wrong sign are returned in viol (none in checked arithmetic, where
// rho is all zero). One pass over the arcs; 16 bytes per listed arc.
func (s *simplex) buildPartLists(cnt, comp []int32, rho []int64) (pl partLists, viol []int32) {
	nn, m := s.nNodes, s.m
	pstart := make([]int32, nn+1)
	for v := 0; v < nn; v++ {
		pstart[comp[v]+1] += cnt[v+1]
	}
	for c := 0; c < nn; c++ {
		pstart[c+1] += pstart[c]
	}
	list := make([]partArc, pstart[nn])
	pstart = pstart[:nn]
	pend := make([]int32, nn)
	copy(pend, pstart)
	check := !s.checked
	// add lists arc a (cost r, state st) unless it lies inside a part.
	// (rc is unchecked: rho is all zero in checked arithmetic.)
	add := func(a int32, t, h int32, r int64, st int8) {
		ct, ch := comp[t], comp[h]
		rc := r + rho[t] - rho[h]
		switch {
		case ct == ch:
			if check && int64(st)*rc < 0 {
				viol = append(viol, a)
			}
		case st == stateLower:
			list[pend[ch]] = partArc{a, ct, -rc}
			pend[ch]++
		default:
			list[pend[ct]] = partArc{a, ch, rc}
			pend[ct]++
		}
	}
	tail, head, rate, state := s.tail[:m], s.head[:m], s.rate[:m], s.state[:m]
	for a, st := range state {
		if st != stateTree {
			add(int32(a), tail[a], head[a], rate[a], st)
		}
	}
	for a := int32(s.holdStart); a < int32(s.artStart); a++ {
		if st := s.state[a]; st != stateTree {
			t, h := s.ends(a)
			add(a, t, h, s.costOf(a), st)
		}
	}
	return partLists{list, pstart, pend}, viol
}

// insideViolations returns the lanes and hold arcs at a bound inside a
// part (comp) whose reduced cost from the parts' potentials rho has the
// wrong sign: each closes a cycle of negative cost with the forest. One
// pass over the arcs (empty in checked arithmetic, as in buildPartLists).
func (s *simplex) insideViolations(comp []int32, rho []int64) (viol []int32) {
	if s.checked {
		return nil
	}
	m := s.m
	tail, head, rate, state := s.tail[:m], s.head[:m], s.rate[:m], s.state[:m]
	for a, st := range state {
		if t, h := tail[a], head[a]; st != stateTree && comp[t] == comp[h] && int64(st)*(rate[a]+rho[t]-rho[h]) < 0 {
			viol = append(viol, int32(a))
		}
	}
	for a := s.holdStart; a < s.artStart; a++ {
		if t, h := s.ends(int32(a)); s.state[a] != stateTree && comp[t] == comp[h] && int64(s.state[a])*(rho[t]-rho[h]) < 0 {
			viol = append(viol, int32(a))
		}
	}
	return viol
}

// partMembers lists the nodes of each part (comp[v] is v's part, numbered
// by a node), in node order: part c's members are
// members[cstart[c]:cstart[c+1]]. O(nn).
func partMembers(comp []int32, nn int) (cstart, members []int32) {
	cstart = make([]int32, nn+1)
	for v := 0; v < nn; v++ {
		cstart[comp[v]+1]++
	}
	for v := 0; v < nn; v++ {
		cstart[v+1] += cstart[v]
	}
	members = make([]int32, nn)
	cfill := make([]int32, nn)
	copy(cfill, cstart[:nn])
	for v := 0; v < nn; v++ {
		c := comp[v]
		members[cfill[c]] = int32(v)
		cfill[c]++
	}
	return cstart, members
}

// completeTree joins the parts of the forest (comp: each node's part, by
// its smallest node; rho: potentials within parts) into a strongly
// feasible spanning tree and makes it the current tree (see "Warm start"
// at Solve). The arcs at a bound between parts are listed by the part
// their spare direction leads to (pl, from buildPartLists); inside are the
// arcs at a bound inside parts with the wrong sign of reduced cost. It
// returns, sorted, up to maxRefused arcs found closing cycles of negative
// cost: arcs between parts the search refused, and those of inside. It
// also reports whether the first search made a pile of refusals on its
// root part (see pileRefusals) and whether the tree is proved optimal:
// when nothing was refused, one search reached every part and ran to the
// end (not capped, unchecked arithmetic), every listed arc was read after
// the offset of its part was final and kept the right sign, and the lists
// hold every arc at a bound. Time O(|V|) plus the search, capped at about eight passes over
// the lists.
func (s *simplex) completeTree(forest, comp []int32, rho []int64, pl partLists, inside []int32) (refused []int32, proved, pile bool) {
	nn := s.nNodes
	q := newPartSearch(nn, !s.checked)
	q.limit = 8*(len(pl.list)+nn) + 1024
	for _, a := range inside {
		q.refuse(a)
	}
	search := func(r int32) {
		q.start(r, -rho[r])
		for {
			c := q.next()
			if c < 0 {
				break
			}
			q.scanPart(pl.list[pl.start[c]:pl.end[c]], c)
			if q.work > q.limit {
				q.improve = false
			}
		}
	}
	if nn > 0 {
		first := int32(0)
		if s.hold >= 0 {
			first = comp[s.hold]
		} else {
			// The largest part.
			size := make([]int32, nn)
			for _, c := range comp {
				size[c]++
			}
			for c := int32(0); c < int32(nn); c++ {
				if size[c] > size[first] {
					first = c
				}
			}
		}
		q.root = first
		search(first)
		pile = q.nref >= pileRefusals && q.rootRef >= q.nref-q.nref/pileShare || s.pileAlways && q.nref > 0
	}
	// Parts not reached (or dropped after the search was capped) start
	// searches of their own, hanging from R.
	for pass := 0; pass < 2; pass++ {
		for v := int32(0); v < int32(nn); v++ {
			if comp[v] == v && !q.ps[v].act {
				search(v)
			}
		}
	}

	// The tree: forest, the arcs joining parts, and the artificial arcs of
	// the search roots (zero flow, directed to R).
	tree := append(make([]int32, 0, nn), forest...)
	for v := int32(0); v < int32(nn); v++ {
		if comp[v] != v {
			continue
		}
		if q.par[v] >= 0 {
			tree = append(tree, q.par[v])
		} else {
			tree = append(tree, int32(s.artStart)+v)
		}
	}
	s.setTree(tree)
	proved = len(q.refused) == 0 && q.improve && q.cur == 1
	slices.Sort(q.refused)
	return slices.Compact(q.refused), proved, pile
}

// A first search that refuses at least pileRefusals times (counting each
// time an arc is refused), all but at most one in pileShare of them arcs
// that would raise the search's root part, has made a pile: the
// root part's own potentials are wrong (a lane inside it, strictly between
// its bounds, should be at a bound), every part the search hangs below it
// inherits the error, and block search would need thousands of pivots to
// undo the tree built from them. A warm start then cancels the refused
// lanes and searches once more, even after rounds inside parts (which
// maxRounds does not allow otherwise). When the refusals spread over
// other parts, the plan has several wrong lanes, a second search refuses
// as many again, and it does not pay. Counted on the repairs of
// BENCHMARKS.md (eighth session): netgen_a1e5 seed 2006, perturbation
// seed 14, refused 6,748 times, 99.9 % through the root (3,177 pivots;
// 170 with the second search); the sparse transportation instances
// refused up to 49,421 times, at most 94 % through the root; the general
// networks' other repairs refused at most 281 times.
const (
	pileRefusals = 2 * maxRefused
	pileShare    = 100
)

// partSearch is the label-correcting search of completeTree over the
// parts of a forest (indexed by their smallest node): a part's lab is
// its offset (p(v) = rho[v] + lab[part]) and par the arc to its parent
// part. The active parts of a search form a tree kept as a preorder list
// (tnx, tpv, dep) so that a part whose offset rises can drop its subtree
// (whose offsets are then out of date) and a cycle of negative cost is
// seen as a part rising below itself. An arc scanned reads its list entry
// (which holds the part at its other end and the offset it gives) and
// that part's state (offset, search number, flags): one cache line at a
// random place per arc.
type partSearch struct {
	ps    []searchPart
	par   []int32
	ppart []int32 // parent part
	tnx   []int32
	tpv   []int32
	dep   []int32
	queue []int32
	qh    int
	qt    int
	// improve: offsets may still rise (false once work passed limit, or
	// in checked arithmetic, where rho is all zero and the first tight
	// arc found is kept).
	improve     bool
	work, limit int
	cur         int32 // the current search's number
	refused     []int32
	// nref counts the arcs refused (each time), rootRef those that would
	// have raised root, the first search's part.
	nref, rootRef int
	root          int32
}

type searchPart struct {
	lab      int64
	srch     int32 // search number; 0: not reached
	act, inq bool
}

func newPartSearch(nn int, improve bool) *partSearch {
	return &partSearch{
		ps:      make([]searchPart, nn),
		par:     make([]int32, nn),
		ppart:   make([]int32, nn),
		tnx:     make([]int32, nn),
		tpv:     make([]int32, nn),
		dep:     make([]int32, nn),
		queue:   make([]int32, nn+1),
		improve: improve,
	}
}

// start begins a new search from part r with offset lab.
func (q *partSearch) start(r int32, lab int64) {
	q.cur++
	q.ps[r].lab, q.ps[r].srch, q.ps[r].act = lab, q.cur, true
	q.par[r] = -1
	q.tnx[r], q.tpv[r], q.dep[r] = -1, -1, 0
	q.push(r)
}

func (q *partSearch) push(c int32) {
	q.ps[c].inq = true
	q.queue[q.qt] = c
	if q.qt++; q.qt == len(q.queue) {
		q.qt = 0
	}
}

// next returns the next active part to scan, or -1 when the queue is
// empty.
func (q *partSearch) next() int32 {
	for q.qh != q.qt {
		c := q.queue[q.qh]
		if q.qh++; q.qh == len(q.queue) {
			q.qh = 0
		}
		q.ps[c].inq = false
		if q.ps[c].act {
			return c
		}
	}
	return -1
}

// scanPart scans the arcs listed under part c. The loop is kept small
// (raising a part is out of line) so that its state stays in registers.
// (c's offset cannot change during the scan: no arc listed under c ends
// in c, and a part rising below itself is refused.)
func (q *partSearch) scanPart(arcs []partArc, c int32) {
	ps := q.ps
	cur, improve := q.cur, q.improve
	lab := ps[c].lab
	q.work += len(arcs)
	for _, b := range arcs {
		pd := &ps[b.d]
		sd := pd.srch
		if sd != 0 && sd != cur {
			continue
		}
		nl := lab + b.k
		if sd == cur && (!improve || nl <= pd.lab) {
			continue
		}
		q.raise(c, b.d, b.arc, nl)
	}
}

// refuse notes arc a as closing a cycle of negative cost (up to
// maxRefused arcs).
func (q *partSearch) refuse(a int32) {
	if len(q.refused) < maxRefused {
		q.refused = append(q.refused, a)
	}
}

// raise gives part d offset nl, hung below part c by arc a (joining d at
// its end in d), unless that closes a cycle of negative cost (refused).
func (q *partSearch) raise(c, d, a int32, nl int64) {
	pd := &q.ps[d]
	if pd.srch == q.cur && pd.act && !q.detach(d, c) {
		q.nref++
		if d == q.root {
			q.rootRef++
		}
		q.refuse(a)
		return
	}
	pd.lab, pd.srch, pd.act = nl, q.cur, true
	q.par[d], q.ppart[d] = a, c
	nx := q.tnx[c]
	q.tnx[c], q.tpv[d], q.tnx[d] = d, c, nx
	if nx >= 0 {
		q.tpv[nx] = d
	}
	q.dep[d] = q.dep[c] + 1
	if !pd.inq {
		q.push(d)
	}
}

// detach drops the subtree of d from the search tree unless c is in it
// (found by climbing from c to the depth of d).
func (q *partSearch) detach(d, c int32) bool {
	dep, tnx, tpv := q.dep, q.tnx, q.tpv
	if dep[c] > dep[d] {
		y := c
		for dep[y] > dep[d] {
			y = q.ppart[y]
		}
		if y == d {
			return false
		}
	}
	y := tnx[d]
	for y >= 0 && dep[y] > dep[d] {
		y = tnx[y]
	}
	p := tpv[d]
	if p >= 0 {
		tnx[p] = y
	}
	if y >= 0 {
		tpv[y] = p
	}
	for z := d; z != y; z = tnx[z] {
		q.ps[z].act = false
	}
	return true
}

// maxRefused caps the arcs closing cycles of negative cost that one
// search of a warm start reports.
const maxRefused = 1024

// A warm start searches by sweeps (sweepTree) instead of lists
// (completeTree) when the network has at least sweepMinLanes lanes and
// sweepDegree lanes per node: there the searches are shallow, and listing
// the lanes at a bound by part (scattered writes over a large array)
// costs more than several sweeps. On smaller networks the lists are
// cheaper. Measured on complete transportation networks (repair of 10
// perturbed cycles, sweeps against lists): 1.3-1.4x slower at 10^5 and
// 2.5·10^5 lanes, about even at 5·10^5, 1.1-2.5x faster at 10^6.
const (
	sweepMinLanes = 3 << 18
	sweepDegree   = 64
)

// dense reports whether a warm start searches by sweeps (when the
// arithmetic allows, canSweep).
func (s *simplex) dense() bool {
	return s.m >= sweepMinLanes && s.m >= sweepDegree*s.nNodes
}

// boundCounts sets cnt[v+1] to the number of lanes and hold arcs at a
// bound whose spare direction leads to v (the head at the lower bound, the
// tail at capacity), from their states. O(|V|+|E|).
func (s *simplex) boundCounts(cnt []int32) {
	clear(cnt)
	for a := 0; a < s.artStart; a++ {
		t, h := s.ends(int32(a))
		switch s.state[a] {
		case stateLower:
			cnt[h+1]++
		case stateUpper:
			cnt[t+1]++
		}
	}
}

// maxSweepViols and maxSweepTries bound the rounds of a warm start by
// sweeps that cancel cycles of negative cost before a search goes on:
// lanes with the wrong sign inside parts found by the first sweep of a
// search (which then stops), and lanes a search refused (pivoted into the
// tree it built, then searched again from it).
const (
	maxSweepViols = 1
	maxSweepTries = 3
)

// maxSweeps bounds the full sweeps (and 4·maxSweeps all sweeps) of one
// sweepTree that may raise a part already reached.
const maxSweeps = 12

// sweepResult is the outcome of sweepTree.
type sweepResult struct {
	// viol holds the arcs at a bound inside a part with the wrong sign of
	// reduced cost when the first sweep stopped there.
	viol []int32
	// refused holds, sorted, up to maxRefused arcs found closing cycles of
	// negative cost (arcs inside a part with the wrong sign, and arcs a
	// search refused); the tree was set.
	refused []int32
	// optimal: the last sweep found every arc at a bound with the right
	// sign of reduced cost, so the tree set is optimal.
	optimal bool
}

// sweepArc is a lane kept for the sweeps of sweepTree that read only
// some lanes: its reduced cost in the direction that must stay
// non-negative is r + p(t) - p(h).
type sweepArc struct {
	t, h int32
	r    int64
}

// sweepBuf holds the lanes kept by sweepTree (capacity |E|/8), reused by
// the searches of one warm start.
type sweepBuf struct {
	kept []sweepArc
	id   []int32
}

// sweepTree joins the parts of the forest (comp: each node's part, by its
// smallest node; rho: potentials within parts, forest arcs tight) into a
// strongly feasible spanning tree and makes it the current tree. It uses
// the rule of completeTree (each part as high as its lanes at a bound
// allow, hung below a neighbour by a tight lane in the direction in which
// it can still move; cycles of negative cost refused) with sweeps over
// the lanes in index order instead of a queue over lists.
//
// The search starts from the current tree, which must hold the forest
// (with its potentials current and every lane out of the tree or between
// parts at its bound state): each part hangs in it by the tree arc leaving
// it towards R. The parts whose chain of such arcs leads, in the right
// direction, to the main root (the part of H under excess supply, else
// the largest part hanging from R) start reached, with the tree's
// potentials (with allRoots, so do the other parts hanging from R, at
// their tree potentials); the others start unreached, below every reached
// part, except parts with no node in lead (no lane's spare direction
// leaves them: they can never be raised), which hang from R from the
// start. A search from the tree a previous one built therefore starts
// where that one ended. Potentials are kept per node (p = rho plus the part's
// offset), so a sweep is a pass of pricing: a lane at a bound between
// parts with the wrong sign of reduced cost raises the part its spare
// direction leaves from (unless that part is an ancestor of the other in
// the search tree: a cycle of negative cost, refused) and hangs it below
// the other by that lane. Sweeps go on until one raises nothing; a part
// then still unreached hangs from R and the search goes on from it.
// After a full sweep that starts with every part reached, later sweeps
// read only the lanes whose reduced cost was below tau, as long as no
// part has risen by tau since (the others cannot have turned wrong).
// After maxSweeps full sweeps only unreached parts are raised.
//
// When stopViol is set and the first sweep finds lanes inside a part with
// the wrong sign of reduced cost, it stops there and returns them in viol
// (the tree set is the search's so far: parts not yet reached hang from
// R). Unchecked arithmetic only, with (4|V|+4)·maxRate representable
// (canSweep). Time O(|V|) plus O(|E|) per full sweep; memory O(|V|) plus
// 20 bytes per lane read by the partial sweeps.
func (s *simplex) sweepTree(forest, comp []int32, rho []int64, lead []bool, maxRate int64, allRoots, stopViol bool, buf *sweepBuf) sweepResult {
	nn, m := s.nNodes, s.m
	cstart, members := partMembers(comp, nn)
	// Reached potentials lie in [-lim, lim] (longer walks are refused);
	// an unreached part's are rho - unreach, below -lim - maxRate. Sums
	// of three stay below (4|V|+4)·maxRate.
	lim := (int64(nn) + 1) * maxRate
	unreach := (2*int64(nn) + 3) * maxRate
	pot := make([]int64, nn)
	reached := make([]bool, nn)
	ppart := make([]int32, nn)  // parent part in the search tree
	par := make([]int32, nn)    // lane to the parent part (-1: hangs from R)
	at := make([]int32, nn)     // node of the part that lane (or R's arc) joins
	raised := make([]int64, nn) // rise of each part since lanes were kept
	for v := 0; v < nn; v++ {
		pot[v] = rho[v] - unreach
	}
	nparts, nreached := 0, 0
	setRoot := func(c, v0 int32) {
		for _, x := range members[cstart[c]:cstart[c+1]] {
			pot[x] = rho[x] - rho[v0]
		}
		reached[c], ppart[c], par[c], at[c] = true, -1, -1, v0
		nreached++
	}
	// The main root (and, with allRoots, the other parts hanging from R),
	// then the parts below them in the current tree (in preorder, so a
	// part's parent part comes first).
	r := s.root
	main := int32(-1)
	for v := s.thread[r]; v != r; v = s.thread[v] {
		if s.parent[v] != r {
			continue
		}
		c := comp[v]
		if s.hold >= 0 && c == comp[s.hold] {
			main = v
			break
		}
		if main < 0 || cstart[c+1]-cstart[c] > cstart[comp[main]+1]-cstart[comp[main]] {
			main = v
		}
	}
	if main >= 0 {
		setRoot(comp[main], main)
		base := s.pot[r]
		for _, x := range members[cstart[comp[main]]:cstart[comp[main]+1]] {
			pot[x] = s.pot[x] - base
		}
		for v := s.thread[r]; v != r; v = s.thread[v] {
			p := s.parent[v]
			c := comp[v]
			if p == r && allRoots && v != main {
				reached[c], ppart[c], par[c], at[c] = true, -1, -1, v
				nreached++
				for _, x := range members[cstart[c]:cstart[c+1]] {
					pot[x] = s.pot[x] - base
				}
				continue
			}
			if p == r || comp[p] == c || !reached[comp[p]] {
				continue
			}
			// Its tree arc must be a lane or hold arc at a bound whose
			// spare direction leads from v to p.
			a := s.pred[v]
			if st := s.state[a]; int(a) >= s.artStart || st == stateTree || (st == stateLower) != s.up[v] {
				continue
			}
			reached[c], ppart[c], par[c], at[c] = true, comp[p], a, v
			nreached++
			for _, x := range members[cstart[c]:cstart[c+1]] {
				pot[x] = s.pot[x] - base
			}
		}
	}
	// A part none of whose nodes a lane's spare direction leaves from
	// can never be raised: it hangs from R from the start.
	canRise := make([]bool, nn)
	for v := int32(0); v < int32(nn); v++ {
		if lead[v] {
			canRise[comp[v]] = true
		}
	}
	for v := int32(0); v < int32(nn); v++ {
		if comp[v] == v {
			nparts++
			if !reached[v] && !canRise[v] {
				setRoot(v, v)
			}
		}
	}

	var res sweepResult
	improve := true
	// Lanes kept for partial sweeps: those whose reduced cost was below
	// tau in the last full sweep that started with every part reached.
	kept, keptID := buf.kept[:0], buf.id[:0]
	defer func() { buf.kept, buf.id = kept, keptID }()
	full, partial := true, false
	// rmax is the largest rise of a part since lanes were kept, rise the
	// largest single rise in the current sweep.
	var rmax, rise int64
	// raise handles lane or hold arc a, whose spare direction leads from
	// v to u and whose reduced cost has the wrong sign: p(v) < p(u) + w
	// (w = -cost at the lower bound, +cost at capacity). It reports
	// whether a part was raised.
	//
	// An arc it records (in viol or refused) is hidden from later sweeps
	// (its state set to stateTree, which no sweep reads as wrong) until
	// the search ends.
	raise := func(a, u, v int32, w int64, first bool) bool {
		cu, cv := comp[u], comp[v]
		if cu == cv {
			if first && (stopViol || len(res.viol) < maxRefused) {
				res.viol = append(res.viol, a)
				s.state[a] = stateTree
			}
			return false
		}
		if !reached[cu] {
			return false
		}
		nl := pot[u] + w
		if reached[cv] {
			if !improve {
				return false
			}
			for y := cu; y >= 0; y = ppart[y] {
				if y == cv {
					// A cycle of negative cost.
					if len(res.refused) < maxRefused {
						res.refused = append(res.refused, a)
						s.state[a] = stateTree
					}
					return false
				}
			}
		}
		if nl > lim || nl < -lim {
			// Only walks around cycles of negative cost get there.
			if len(res.refused) < maxRefused {
				res.refused = append(res.refused, a)
				s.state[a] = stateTree
			}
			return false
		}
		d := nl - pot[v]
		if reached[cv] {
			rise = max(rise, d)
			if partial {
				raised[cv] += d
				rmax = max(rmax, raised[cv])
			}
		} else {
			nreached++
		}
		for _, x := range members[cstart[cv]:cstart[cv+1]] {
			pot[x] += d
		}
		reached[cv], ppart[cv], par[cv], at[cv] = true, cu, a, v
		return true
	}
	handle := func(a int32, first bool) bool {
		switch s.state[a] {
		case stateLower:
			return raise(a, s.head[a], s.tail[a], -s.rate[a], first)
		case stateUpper:
			return raise(a, s.tail[a], s.head[a], s.rate[a], first)
		}
		return false // hidden (a kept lane)
	}
	// unhide restores the states of the hidden arcs.
	unhide := func() {
		for _, list := range [][]int32{res.viol, res.refused} {
			for _, a := range list {
				if s.flow[a] == 0 {
					s.state[a] = stateLower
				} else {
					s.state[a] = stateUpper
				}
			}
		}
	}

	// tau is maxRate/32, or a quarter of the largest rise in the last
	// sweep if that is more (rises shrink fast from sweep to sweep; a
	// wrong guess costs one partial sweep); above maxRate/16, or past
	// m/8 lanes, no lanes are kept.
	tau0 := max(maxRate/32, 1)
	tau, lastRise := int64(0), int64(0)
	fulls := 0
	for sweeps := 1; ; sweeps++ {
		changed, wrong := false, false
		rise = 0
		if full {
			fulls++
			tau = max(tau0, lastRise/4)
			partial = improve && nreached == nparts && tau <= maxRate/16
			if partial {
				clear(raised)
				rmax = 0
				if kept == nil {
					kept = make([]sweepArc, 0, m/8+1)
					keptID = make([]int32, 0, m/8+1)
				}
				kept, keptID = kept[:0], keptID[:0]
			} else {
				tau = 0
			}
			for a := 0; a < m; a++ {
				if a = sweepLanes(s.state, s.rate, s.tail, s.head, pot, a, m, tau); a == m {
					break
				}
				st := s.state[a]
				if partial && st != stateTree {
					if len(kept) == cap(kept) {
						// Too many lanes to keep: a full sweep next time.
						partial, tau = false, 0
					} else {
						if st == stateLower {
							kept = append(kept, sweepArc{s.tail[a], s.head[a], s.rate[a]})
						} else {
							kept = append(kept, sweepArc{s.head[a], s.tail[a], -s.rate[a]})
						}
						keptID = append(keptID, int32(a))
					}
				}
				if int64(st)*(s.rate[a]+pot[s.tail[a]]-pot[s.head[a]]) < 0 {
					wrong = true
					changed = handle(int32(a), sweeps == 1) || changed
				}
			}
		} else {
			for i := 0; i < len(kept); {
				i = sweepKept(kept, pot, i)
				if i == len(kept) {
					break
				}
				wrong = true
				changed = handle(keptID[i], false) || changed
				i++
			}
		}
		for a := s.holdStart; a < s.artStart; a++ {
			st := s.state[a]
			t, h := s.xsrc[a-s.m], s.xtgt[a-s.m]
			if int64(st)*(pot[t]-pot[h]) >= 0 {
				continue
			}
			wrong = true
			if st == stateLower {
				changed = raise(int32(a), h, t, 0, sweeps == 1) || changed
			} else {
				changed = raise(int32(a), t, h, 0, sweeps == 1) || changed
			}
		}
		if sweeps == 1 && stopViol && len(res.viol) > 0 {
			break
		}
		lastRise = rise
		if partial && rmax >= tau {
			// Lanes left out may have turned wrong.
			lastRise = max(rise, rmax)
			full, partial = true, false
			continue
		}
		if !changed {
			// The parts still unreached hang from R (each may still be
			// raised below another), and the search goes on from them.
			if nreached == nparts {
				res.optimal = !wrong && improve && len(res.viol) == 0 && len(res.refused) == 0
				break
			}
			for v := int32(0); v < int32(nn); v++ {
				if comp[v] == v && !reached[v] {
					setRoot(v, v)
				}
			}
			full, partial = true, false
			continue
		}
		full = !partial
		if fulls >= maxSweeps || sweeps >= 4*maxSweeps {
			improve = false
			full, partial = true, false
		}
	}

	unhide()
	tree := append(make([]int32, 0, nn), forest...)
	for v := int32(0); v < int32(nn); v++ {
		switch {
		case comp[v] != v:
		case !reached[v]:
			tree = append(tree, int32(s.artStart)+v)
		case par[v] >= 0:
			tree = append(tree, par[v])
		default:
			tree = append(tree, int32(s.artStart)+at[v])
		}
	}
	s.setTree(tree)
	if stopViol && len(res.viol) > 0 {
		return res
	}
	res.refused = append(res.refused, res.viol...)
	res.viol = nil
	slices.Sort(res.refused)
	res.refused = slices.Compact(res.refused)
	if len(res.refused) > maxRefused {
		res.refused = res.refused[:maxRefused]
	}
	return res
}

// sweepLanes scans lanes lo..hi-1 and returns the first whose state
// times reduced cost under pot is below tau (lanes in the tree give 0), or
// hi.
func sweepLanes(state []int8, rate []int64, tail, head []int32, pot []int64, lo, hi int, tau int64) int {
	state, rate, tail, head = state[:hi], rate[:hi], tail[:hi], head[:hi]
	for a := lo; a < hi; a++ {
		if int64(state[a])*(rate[a]+pot[tail[a]]-pot[head[a]]) < tau {
			return a
		}
	}
	return hi
}

// sweepKept scans kept[lo:] and returns the first whose reduced cost is
// negative, or len(kept).
func sweepKept(kept []sweepArc, pot []int64, lo int) int {
	for i := lo; i < len(kept); i++ {
		c := kept[i]
		if c.r+pot[c.t]-pot[c.h] < 0 {
			return i
		}
	}
	return len(kept)
}

// canSweep reports whether sweepTree may be used: unchecked arithmetic,
// with (4|V|+4)·maxRate representable.
func (s *simplex) canSweep(maxRate int64) bool {
	if s.checked {
		return false
	}
	v, err := MulChecked(4*int64(s.nNodes)+4, maxRate)
	return err == nil && v >= 0
}

// setTree makes tree (nNodes arcs forming a spanning tree of the nodes and
// R, artificial arcs directed to R with zero flow) the current tree:
// states, parent, pred, up, thread, rthread, size and last, by a
// depth-first search from R taking arcs in list order. Phase-two costs.
// O(|V|).
func (s *simplex) setTree(tree []int32) {
	r := s.root
	for _, a := range tree {
		s.state[a] = stateTree
	}
	s.treeAdj.build(s, tree, s.nNodes+1)
	s.parent[r] = -1
	order, stack := s.walk(s.orderBuf[:0], s.stackBuf[:0], r, tree, &s.treeAdj)
	s.orderBuf, s.stackBuf = order, stack
	s.setThreads(order)
}

// walk appends to order the nodes of the tree below v (v first) in the
// preorder of a depth-first search over g, the adjacency of arcs, taking
// each node's arcs in list order, and sets their parent, pred and up; v's
// parent must be set. stack is scratch. O(size of the subtree). Arcs that
// close a cycle would make the walk endless: it panics (an internal error)
// once order holds more entries than there are nodes.
func (s *simplex) walk(order, stack []int32, v int32, arcs []int32, g *adjacency) ([]int32, []int32) {
	start, pos, ends := g.start, g.pos, g.ends
	stack = append(stack, v)
	for len(stack) > 0 {
		v := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		if len(order) == len(s.parent) {
			panic("flow: internal error: the arcs of a tree close a cycle")
		}
		order = append(order, v)
		pv := s.parent[v]
		// Push children in reverse so they are visited in arc order.
		for j := start[v+1] - 1; j >= start[v]; j-- {
			i := pos[j]
			t, h := ends[2*i], ends[2*i+1]
			w := t
			if w == v {
				w = h
			}
			if w == pv {
				continue // (a tree has no parallel arcs)
			}
			s.parent[w], s.pred[w], s.up[w] = v, arcs[i], t == w
			stack = append(stack, w)
		}
	}
	return order, stack
}

// setForestTree sets the tree to the forest (g: its adjacency over the
// nodes but R) with each part hung from R by the artificial arc of its
// part root (isRoot, one node per part): the tree setTree builds from the
// forest's arcs followed by those artificial arcs in node order, without
// listing them. O(|V|).
func (s *simplex) setForestTree(forest []int32, g *adjacency, isRoot func(int32) bool) {
	r := s.root
	for _, a := range forest {
		s.state[a] = stateTree
	}
	order, stack := append(s.orderBuf[:0], r), s.stackBuf[:0]
	for v := int32(0); v < int32(s.nNodes); v++ {
		if !isRoot(v) {
			continue
		}
		a := int32(s.artStart) + v
		s.state[a] = stateTree
		t, _ := s.ends(a)
		s.parent[v], s.pred[v], s.up[v] = r, a, t == v
		order, stack = s.walk(order, stack, v, forest, g)
	}
	s.orderBuf, s.stackBuf = order, stack
	s.setThreads(order)
}

// setThreads sets thread, rthread, size and last from the preorder of the
// tree (parent set), which starts at R. O(|V|).
func (s *simplex) setThreads(order []int32) {
	thread, rthread, size, parent, last := s.thread, s.rthread, s.size, s.parent, s.last
	prev := order[len(order)-1]
	for _, v := range order {
		size[v] = 1
		thread[prev], rthread[v] = v, prev
		prev = v
	}
	for i := len(order) - 1; i > 0; i-- {
		v := order[i]
		size[parent[v]] += size[v]
	}
	for i, v := range order {
		last[v] = order[i+int(size[v])-1]
	}
	s.treeDone()
}

// treeDone finishes setting a tree for phase two: R has no parent, the
// artificial arcs cost 0 and those outside the tree stay out, and the
// lanes cost their rates.
func (s *simplex) treeDone() {
	r := s.root
	s.parent[r], s.pred[r] = -1, -1
	s.treeSet = true
	s.artFixed = true
	s.cost = s.rate
	for a := s.artStart; a < s.artEnd; a++ {
		s.xcost[a-s.m] = 0
	}
}

// adjacency is a compressed undirected adjacency of a list of arcs over
// nodes 0..n-1: the arcs at node v are listed at pos[start[v]:start[v+1]]
// by their position in the list (each arc at both ends, in list order),
// and the ends of the list's i-th arc are ends[2i] (tail) and ends[2i+1]
// (head), read once from the arc arrays (tree and forest arcs lie anywhere
// in them).
type adjacency struct {
	start, pos, ends []int32
}

// build makes g the adjacency of arcs over nodes 0..n-1, reusing g's
// arrays when they are large enough. O(n + len(arcs)).
func (g *adjacency) build(s *simplex, arcs []int32, n int) {
	ends := slices.Grow(g.ends[:0], 2*len(arcs))[:2*len(arcs)]
	start := slices.Grow(g.start[:0], n+1)[:n+1]
	clear(start)
	for i, a := range arcs {
		t, h := s.ends(a)
		ends[2*i], ends[2*i+1] = t, h
		start[t+1]++
		start[h+1]++
	}
	for v := 0; v < n; v++ {
		start[v+1] += start[v]
	}
	pos := slices.Grow(g.pos[:0], int(start[n]))[:start[n]]
	// Fill each node's range from its end backwards (start[v+1] ends
	// there), so that each range keeps list order.
	for i := len(arcs) - 1; i >= 0; i-- {
		t, h := ends[2*i], ends[2*i+1]
		start[t+1]--
		pos[start[t+1]] = int32(i)
		start[h+1]--
		pos[start[h+1]] = int32(i)
	}
	// Now start[v+1] is where v's arcs begin: shift back.
	copy(start[:n], start[1:])
	start[n] = int32(len(pos))
	g.start, g.pos, g.ends = start, pos, ends
}

// undirected returns the arcs as a compressed undirected adjacency over
// nodes 0..n-1 by arc: the arcs at node v are adj[start[v]:start[v+1]],
// each arc listed at both ends. O(n + len(arcs)).
func (s *simplex) undirected(arcs []int32, n int) (start, adj []int32) {
	var g adjacency
	g.build(s, arcs, n)
	for j, i := range g.pos {
		g.pos[j] = arcs[i]
	}
	return g.start, g.pos
}
