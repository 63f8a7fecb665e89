package flow

import (
	"fmt"
	"math"
	"math/bits"
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
	// noCrash starts a cold solve from the artificial tree without the
	// first pivots of crash (tests: both must reach the same optimum).
	noCrash bool
	// checkRounds checks the counts and the lanes inside parts at each
	// round of a warm start by lists after the first (tests: see
	// checkRound; what is wrong goes to Solution.faults).
	checkRounds bool
	// maxPasses, when positive, replaces maxWithinPasses (tests: the
	// rounds after passes that stopped at their bound).
	maxPasses int
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

	sim      *simplex // with SolveOptions.keepSim
	sifted   bool     // the warm start sifted (tests)
	siftKept int      // pricings of sifting that read only kept lanes (tests)
	swept    bool     // the warm start searched by sweeps (tests)
	piled    bool     // the warm start searched again after a pile (tests)
	crashed  int64    // pivots made by crash (tests)
	within   int      // passes of the warm start inside parts (tests)
	faults   []string // with SolveOptions.checkRounds (tests)
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
	// While copies is set (during run and pivot), tarc[v] holds the flow
	// and capacity of the tree arc pred[v] when tarc[v].mark == epoch
	// (loaded on first use; tlist lists those nodes): the climb and the
	// flow update then read node-indexed memory, and flow[] of those
	// arcs is stale until flushCopies writes it back.
	tarc   []treeArc
	tlist  []int32
	epoch  uint32
	copies bool

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
	noCrash     bool // SolveOptions.noCrash
	swept       bool // the warm start searched by sweeps
	piled       bool // the warm start searched again after a pile
	checkRounds bool // SolveOptions.checkRounds
	maxPasses   int  // maxWithinPasses, or SolveOptions.maxPasses

	withinPasses int      // passes of the warm start inside parts
	faults       []string // found by checkRound
	siftKept     int      // pricings of sift that read only kept lanes
}

// treeArc is the flow and capacity (inf: none) of a node's tree arc,
// valid when mark is the current epoch.
type treeArc struct {
	flow, cap int64
	mark      uint32
}

// beginCopies starts a span of pivots that keep tree arcs' flows in tarc
// (a new epoch: nothing loaded yet). O(1) (O(|V|) once in 2^32 spans).
func (s *simplex) beginCopies() {
	s.epoch++
	if s.epoch == 0 {
		for v := range s.tarc {
			s.tarc[v].mark = 0
		}
		s.epoch = 1
	}
	s.tlist = s.tlist[:0]
	s.copies = true
}

// loadArc loads tarc[v] from the arc arrays.
func (s *simplex) loadArc(v int32) treeArc {
	a := s.pred[v]
	t := treeArc{s.flow[a], s.capOf(a), s.epoch}
	s.tarc[v] = t
	s.tlist = append(s.tlist, v)
	return t
}

// flushCopies writes the loaded tree arcs' flows back and ends the span.
// O(nodes loaded).
func (s *simplex) flushCopies() {
	pred, tarc, flow := s.pred, s.tarc, s.flow
	for _, v := range s.tlist {
		flow[pred[v]] = tarc[v].flow
	}
	s.copies = false
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
// cost 1 on the artificial arcs and 0 on the lanes). Its first pivots
// need no pricing: each destination's cheapest entering lane enters the
// all-artificial tree, cheapest first, while still eligible (see crash).
// An artificial arc that leaves the tree is not priced again (when
// artificial flow remains at the end, a phase one with every artificial
// arc free settles the shortfall). It then finishes with artificial arcs
// of cost 0 that keep zero flow, so no potential carries M. Flows and
// potentials are exact int64; a sum that could overflow returns an error
// wrapping ErrOverflow, never a wrong answer. The cost is kept per pivot
// (flow moved times the entering lane's reduced cost) in 128 bits, not
// recomputed at the end.
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
// violating first, which cancels the cycles. The pivots move the
// potentials inside the parts they cross: passes over the lanes inside
// parts (listed by the second pass) find those at a bound that now have
// the wrong sign, and pivot them in the same way, until a pass finds
// none (at most maxWithinPasses). The forest of the new plan then splits
// the parts, with the same potentials up to a constant in each, and has
// no such lane. (Should free lanes still close cycles, or a later round
// find at least minInsideViol lanes with the wrong sign, they are
// cancelled again, up to maxInsideRounds rounds; free lanes left then are
// pivoted in after the search.) A pass then lists the lanes at a bound
// between parts under the part their spare direction leads to (zero
// flow: the head's; full: the tail's), each with the part at its other
// end and the offset between the two parts that gives it reduced cost 0.
// The parts are joined into a strongly feasible tree by a
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
// except for a few cycles thus needs four or five passes over the lanes
// and a few over the lanes inside parts, one or two searches over the
// lanes at a bound, a few pivots per cycle
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
// restricted network would pass a quarter of the lanes). A pricing after
// the first reads only the lanes an earlier one found with a small reduced
// cost, as long as the potentials have moved by at most that margin
// since (no other lane can have turned wrong). A plan that is optimal
// except for a few cycles costs one pass that checks it, one pricing pass
// over every lane, two or three over the kept ones, and a few pivots on a
// network of a few lanes per node. On sparse networks the restricted
// optimum's potentials are far from the whole network's, and the search
// above serves better.
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
// practice a small multiple of |V|); a cold start adds O(|V| log |V| + |E|)
// to choose its first pivots, a warm start O(|V|+|E|) to build
// its first tree (each search by lists is capped at about eight passes
// over the lanes at a bound, each search by sweeps at 12 full sweeps).
// Memory: the solver reads the Network's lane arrays in place and keeps 9
// bytes per lane (flows and states; plus 8 more, a copy of the capacities
// above the minimums, when some lane has a minimum) and about 180 bytes
// per node (among them a copy of each tree arc's flow and capacity by
// node, which the pivots read instead of the lane arrays); a warm start
// adds 16 bytes per lane at a bound while it builds its tree and, while
// it cancels inside parts, 4 per lane inside a part and 1 bit per lane
// (by sweeps: 20 bytes for each of at most |E|/8 lanes read again; by
// sifting: 1 bit per lane plus the restricted network, at most a quarter
// of the lanes). The Solution adds 1 byte per lane (InTree), and 8 per
// lane for Flow only when some lane has a minimum (otherwise Flow is the
// solver's flow array).
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
	s.sweepAlways, s.noRounds, s.pileAlways, s.noCrash = opt.sweepAlways, opt.noRounds, opt.pileAlways, opt.noCrash
	s.checkRounds, s.maxPasses = opt.checkRounds, maxWithinPasses
	if opt.maxPasses > 0 {
		s.maxPasses = opt.maxPasses
	}
	sol := &Solution{}

	warm, proved := false, false
	var superbasic []int32
	if tryWarm && supply == demand && !opt.keepSim && (opt.siftAlways || s.siftable()) {
		if warm, proved, err = s.sift(opt.Start); err != nil {
			return nil, err
		}
		sol.sifted, sol.siftKept = warm, s.siftKept
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
	sol.within, sol.faults = s.withinPasses, s.faults
	if warm {
		if err := s.computePotentialsChecked(); err != nil {
			return nil, err
		}
		// Lanes strictly between their bounds outside the tree: pivot
		// each in, towards lower cost, until it or a tree arc reaches a
		// bound (sharing one copy of the tree arcs' flows).
		s.beginCopies()
		for _, a := range superbasic {
			unb, err := s.pivotFree(a)
			if err != nil {
				return nil, err
			}
			if unb {
				s.flushCopies()
				return s.unbounded(sol, s.cycle), nil
			}
		}
		s.flushCopies()
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
		var unb bool
		if !s.noCrash {
			unb, err = s.crash()
			sol.crashed = s.pivots
		}
		if err == nil && !unb {
			unb, err = s.run()
		}
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
	s.tarc = make([]treeArc, nt)
	s.tlist = make([]int32, 0, nt) // a node is listed at most once a span
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
	s.beginCopies()
	defer s.flushCopies()
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

// eligible returns arc a's reduced cost (with overflow checks in checked
// arithmetic) and whether a may enter the tree: it is at a bound (not in
// the tree, not fixed) and its reduced cost has the sign that lowers the
// cost from there.
func (s *simplex) eligible(a int32) (r int64, ok bool, err error) {
	st := s.state[a]
	if st == stateTree {
		return 0, false, nil
	}
	if s.checked {
		if r, err = s.reducedChecked(a); err != nil {
			return 0, false, err
		}
	} else {
		r = s.reduced(a)
	}
	return r, int64(st)*r < 0, nil
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
	if !s.copies {
		s.beginCopies()
		defer s.flushCopies()
	}
	s.pivots++
	parent, pred, up, flow, tarc, ep := s.parent, s.pred, s.up, s.flow, s.tarc, s.epoch
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
			t := tarc[u]
			if t.mark != ep {
				t = s.loadArc(u)
			}
			var d int64
			if up[u] {
				d = t.flow
			} else if t.cap == inf {
				d = inf
			} else {
				d = t.cap - t.flow
			}
			if d < delta1 {
				delta1, leave1 = d, u
			}
			u = parent[u]
			su = size[u]
		} else {
			t := tarc[v]
			if t.mark != ep {
				t = s.loadArc(v)
			}
			var d int64
			if !up[v] {
				d = t.flow
			} else if t.cap == inf {
				d = inf
			} else {
				d = t.cap - t.flow
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
			t := &tarc[u]
			if up[u] {
				t.flow -= delta
			} else {
				if t.cap == inf && t.flow > maxFlow-delta {
					return false, s.flowOverflow(pred[u])
				}
				t.flow += delta
			}
			top1 = u
		}
		for u := second; u != apex; u = parent[u] {
			t := &tarc[u]
			if up[u] {
				if t.cap == inf && t.flow > maxFlow-delta {
					return false, s.flowOverflow(pred[u])
				}
				t.flow += delta
			} else {
				t.flow -= delta
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
	flow[out] = tarc[leave].flow
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
	tarc := s.tarc
	for i := k; i >= 1; i-- {
		w := stem[i]
		par[w] = stem[i-1]
		pred[w] = sPred[i-1]
		tarc[w] = tarc[stem[i-1]]
		up[w] = !sUp[i-1]
		acc += sSize[i] - sSize[i-1]
		sz[w] = acc
		lst[w] = endS
	}
	par[uIn] = vIn
	pred[uIn] = in
	tarc[uIn] = treeArc{s.flow[in], s.capOf(in), s.epoch}
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
