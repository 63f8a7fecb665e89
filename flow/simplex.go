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
	// the simplex starts from it: its lanes strictly between their bounds
	// form the first tree where they can (without cycles; a lane that
	// would close a cycle is pivoted in or out first), and the rest of the
	// tree is completed with artificial lanes of zero flow. Otherwise
	// (including a Start of the wrong length, or one whose node balances
	// overflow) the solve starts from scratch and WarmStarted is false.
	Start []int64
	// Progress, if non-nil, is called every 16384 pivots with the number
	// of pivots so far.
	Progress func(pivots int64)
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
// of a residual.
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
// The spanning tree is rooted at R and stored as: parent, pred (the tree
// arc joining a node to its parent), up (pred runs from the node to its
// parent), thread (preorder successor, circular), rthread (preorder
// predecessor), size (nodes in the subtree) and last (last node of the
// subtree in preorder).
type simplex struct {
	net *Network

	m         int // lanes
	holdStart int // first hold arc
	artStart  int // first artificial arc
	nNodes    int // nodes including H, excluding R
	root      int32
	hold      int32 // H, or -1
	holdFrom  []NodeID

	src, tgt []int32
	cost     []int64
	cap      []int64
	flow     []int64
	state    []int8

	parent, pred, thread, rthread, size, last []int32
	up                                        []bool
	pot                                       []int64

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
	progress func(int64)
	// drift bounds |p(R)| after shifts of the rest of the tree.
	drift int64

	cycle []CycleStep
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
// potential among its nodes. The result depends only on n and Start.
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
// cost 1 on the artificial arcs and 0 on the lanes), then finishes with
// artificial arcs of cost 0 that keep zero flow, so no potential carries
// M. Flows and potentials are exact int64; a sum that could overflow
// returns an error wrapping ErrOverflow, never a wrong answer.
//
// Cost: each pivot takes O(sqrt(|E|)) arc scans plus time linear in the
// length of the cycle and the size of the moved subtree; the number of
// pivots is finite but not polynomially bounded in the worst case (in
// practice a small multiple of |V|); a warm start adds O(|V|+|E|) to build
// its first tree. Memory: about 42 bytes per lane and 130 bytes per node,
// the Solution included, besides the Network (a warm start adds up to
// about 20 bytes per lane while it builds its tree).
//
// Warm start (opt.Start feasible): its free lanes, taken in lane order
// while they close no cycle, form a forest; components are joined by
// lanes at a bound, chosen breadth-first from the highest bound they put
// on the potentials, or else hang from R by artificial arcs of zero flow
// (never used again). Free lanes closing a cycle are pivoted in; if there
// were any, the tree is rebuilt once from the resulting flows. The lanes
// eligible in that tree are pivoted on in lane order, then block search
// finishes. Cold and warm solves reach the same optimal cost (the plans
// and potentials may differ where the optimum is not unique).
//
// The error is non-nil only when n is invalid (n.Validate) or a value
// overflows; infeasible and unbounded problems are Status values.
func Solve(n *Network, opt SolveOptions) (*Solution, error) {
	if err := n.Validate(); err != nil {
		return nil, err
	}
	supply, demand, err := n.Totals()
	if err != nil {
		return nil, err
	}
	s, err := newSimplex(n, supply > demand, supply-demand)
	if err != nil {
		return nil, err
	}
	s.progress = opt.Progress
	sol := &Solution{}

	maxRate := int64(0)
	for _, r := range n.Rate {
		if r == math.MinInt64 {
			return nil, fmt.Errorf("flow: solve: rate %d: %w", r, ErrOverflow)
		}
		maxRate = max(maxRate, abs64(r))
	}
	// Big-M fits when 4(N+1)·maxRate + 4 is representable (bounds on the
	// potentials and reduced costs with artificial cost N·maxRate+1).
	nn := int64(s.nNodes)
	bigM, okM := int64(0), false
	if v, err := MulChecked(4*(nn+1), maxRate); err == nil && v <= math.MaxInt64-4 {
		bigM, okM = nn*maxRate+1, true
	}
	// Phase two needs (2N+3)·maxRate representable to skip checks.
	if v, err := MulChecked(2*nn+3, maxRate); err != nil || v < 0 {
		s.checked = true
	}

	if supply < demand {
		// Infeasible in any case; find the shortfall.
		if err := s.phaseOne(); err != nil {
			return nil, err
		}
		return s.infeasible(sol)
	}

	warm := false
	var superbasic []int32
	if opt.Start != nil {
		warm, superbasic = s.warmStart(opt.Start)
	}
	sol.WarmStarted = warm
	var eligible []int32
	for round := 0; warm && round < 2; round++ {
		if err := s.computePotentialsChecked(); err != nil {
			return nil, err
		}
		// Lanes strictly between their bounds outside the tree: pivot
		// each in, towards lower cost, until it or a tree arc reaches a
		// bound.
		for _, a := range superbasic {
			r, err := s.reducedChecked(a)
			if err != nil {
				return nil, err
			}
			// Towards lower cost; on a tie, towards less flow (a finite
			// limit, so a zero-cost cycle is never called unbounded).
			dir := stateUpper
			if r < 0 {
				dir = stateLower
			}
			unb, err := s.pivot(a, dir, r)
			if err != nil {
				return nil, err
			}
			if unb {
				sol.Status = Unbounded
				sol.Cycle = s.cycle
				sol.Pivots = s.pivots
				return sol, nil
			}
		}
		var err error
		if eligible, err = s.eligibleArcs(); err != nil {
			return nil, err
		}
		// Those pivots may leave perturbed lanes in the tree (ties) and
		// the duals far off: then rebuild the tree once from the flows,
		// now basic.
		if round > 0 || len(superbasic) == 0 || len(eligible) <= max(64, s.nNodes/16) {
			break
		}
		superbasic = s.buildWarmTree()
	}
	if !warm {
		if err := s.coldStart(); err != nil {
			return nil, err
		}
		if okM {
			s.setCosts(true, bigM)
		} else {
			s.setCosts(false, 1)
		}
		s.computePotentials()
		unb, err := s.run()
		if err != nil {
			return nil, err
		}
		if unb {
			// Unbounded only if feasible: finish a phase one from here.
			cyc := s.cycle
			if err := s.phaseOne(); err != nil {
				return nil, err
			}
			if s.artFlow() > 0 {
				return s.infeasible(sol)
			}
			sol.Status = Unbounded
			sol.Cycle = cyc
			sol.Pivots = s.pivots
			return sol, nil
		}
		if s.artFlow() > 0 {
			return s.infeasible(sol)
		}
		s.enterPhaseTwo()
	}
	if err := s.computePotentialsChecked(); err != nil {
		return nil, err
	}
	unb, err := false, error(nil)
	if warm {
		unb, err = s.warmPass(eligible)
	}
	if !unb && err == nil {
		unb, err = s.run()
	}
	if err != nil {
		return nil, err
	}
	if unb {
		sol.Status = Unbounded
		sol.Cycle = s.cycle
		sol.Pivots = s.pivots
		return sol, nil
	}
	return s.optimal(sol)
}

// newSimplex builds the extended network with every lane at its (shifted)
// lower bound. The tree is not set.
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
	s.src = make([]int32, na)
	s.tgt = make([]int32, na)
	s.cost = make([]int64, na)
	s.cap = make([]int64, na)
	s.flow = make([]int64, na)
	s.state = make([]int8, na)
	copy(s.src, n.Tail)
	copy(s.tgt, n.Head)
	copy(s.cost, n.Rate)
	for a := 0; a < m; a++ {
		if n.Upper[a] == NoLimit {
			s.cap[a] = inf
		} else {
			s.cap[a] = n.Upper[a] - n.Lower[a]
		}
	}
	for i, v := range s.holdFrom {
		a := s.holdStart + i
		s.src[a], s.tgt[a] = v, s.hold
		s.cap[a] = n.Supply[v]
	}
	for v := 0; v < nNodes; v++ {
		a := s.artStart + v
		s.src[a], s.tgt[a] = int32(v), s.root
		s.cap[a] = inf
	}
	for a := range s.state[:s.artStart] {
		if s.cap[a] == 0 {
			s.state[a] = stateTree // fixed
		} else {
			s.state[a] = stateLower
		}
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

// shiftedSupply returns b'(v) for every non-root node: Supply minus the
// minimums leaving plus the minimums entering; H gets -excess.
func (s *simplex) shiftedSupply() ([]int64, error) {
	n := s.net
	b := make([]int64, s.nNodes)
	copy(b, n.Supply)
	var err error
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
	s.initArtTree(b)
	return nil
}

func (s *simplex) initArtTree(b []int64) {
	r := s.root
	for v := 0; v < s.nNodes; v++ {
		a := int32(s.artStart + v)
		if b[v] >= 0 {
			s.src[a], s.tgt[a] = int32(v), r
			s.flow[a] = b[v]
			s.up[v] = true
		} else {
			s.src[a], s.tgt[a] = r, int32(v)
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
// !real) and artCost on the artificial arcs; hold arcs cost 0.
func (s *simplex) setCosts(real bool, artCost int64) {
	if real {
		copy(s.cost, s.net.Rate)
	} else {
		clear(s.cost[:s.m])
	}
	for a := s.artStart; a < len(s.cost); a++ {
		s.cost[a] = artCost
	}
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

// artFlow returns the total flow on the artificial arcs (each is at most
// |b'(v)|, and their sum was checked when the tree was built).
func (s *simplex) artFlow() int64 {
	var t int64
	for a := s.artStart; a < len(s.flow); a++ {
		t += s.flow[a]
	}
	return t
}

// enterPhaseTwo gives the artificial arcs cost 0 and keeps them at zero
// flow: those in the tree are directed to R (zero flow, no capacity, so
// any cycle through R is blocked on its way down), the others are fixed.
func (s *simplex) enterPhaseTwo() {
	copy(s.cost, s.net.Rate)
	for v := 0; v < s.nNodes; v++ {
		a := s.artStart + v
		s.cost[a] = 0
		if s.pred[v] == int32(a) {
			if !s.up[v] {
				s.src[a], s.tgt[a] = int32(v), s.root
				s.up[v] = true
			}
		} else {
			s.state[a] = stateTree
		}
	}
	s.artFixed = true
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
			s.pot[v] = s.pot[s.parent[v]] - s.cost[a]
		} else {
			s.pot[v] = s.pot[s.parent[v]] + s.cost[a]
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
			s.pot[v], err = SubChecked(s.pot[s.parent[v]], s.cost[a])
		} else {
			s.pot[v], err = AddChecked(s.pot[s.parent[v]], s.cost[a])
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

// eligibleArcs returns the arcs eligible to enter, in index order.
func (s *simplex) eligibleArcs() ([]int32, error) {
	var list []int32
	if !s.checked {
		state, cost, src, tgt, pot := s.state, s.cost, s.src, s.tgt, s.pot
		for e := range state {
			if int64(state[e])*(cost[e]+pot[src[e]]-pot[tgt[e]]) < 0 {
				list = append(list, int32(e))
			}
		}
		return list, nil
	}
	for e := range s.state {
		if s.state[e] == stateTree {
			continue
		}
		r, err := s.reducedChecked(int32(e))
		if err != nil {
			return nil, err
		}
		if int64(s.state[e])*r < 0 {
			list = append(list, int32(e))
		}
	}
	return list, nil
}

// warmPass pivots, in index order, on the arcs of list (those eligible in
// the first tree of a warm start), each if still eligible when its turn
// comes; block search then finishes. Near an optimum the eligible arcs are
// few and block search would scan most arcs to find each.
func (s *simplex) warmPass(list []int32) (bool, error) {
	for _, e := range list {
		r, err := s.reducedChecked(e)
		if err != nil {
			return false, err
		}
		if int64(s.state[e])*r >= 0 {
			continue
		}
		if unb, err := s.pivot(e, s.state[e], r); err != nil || unb {
			return unb, err
		}
	}
	return false, nil
}

// findEntering returns an eligible arc and its reduced cost by block
// search, or -1: the arcs are scanned cyclically from where the last
// search stopped, in blocks of s.block arcs; the most violating arc of the
// first block holding one is chosen.
func (s *simplex) findEntering() (int32, int64) {
	state := s.state
	na := len(state)
	cost, src, tgt, pot := s.cost[:na], s.src[:na], s.tgt[:na], s.pot
	best, bestV := -1, int64(0)
	cnt := s.block
	for e := s.next; e < na; e++ {
		v := int64(state[e]) * (cost[e] + pot[src[e]] - pot[tgt[e]])
		if v < bestV {
			bestV, best = v, e
		}
		cnt--
		if cnt == 0 {
			if best >= 0 {
				s.next = e + 1
				return int32(best), bestV * int64(state[best])
			}
			cnt = s.block
		}
	}
	for e := 0; e < s.next; e++ {
		v := int64(state[e]) * (cost[e] + pot[src[e]] - pot[tgt[e]])
		if v < bestV {
			bestV, best = v, e
		}
		cnt--
		if cnt == 0 {
			if best >= 0 {
				s.next = e + 1
				return int32(best), bestV * int64(state[best])
			}
			cnt = s.block
		}
	}
	if best >= 0 {
		s.next = 0
		return int32(best), bestV * int64(state[best])
	}
	return -1, 0
}

// findEnteringChecked is findEntering with overflow checks on the reduced
// costs (for networks whose rates are close to the int64 limit).
func (s *simplex) findEnteringChecked() (int32, int64, error) {
	na := len(s.state)
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

func (s *simplex) reducedChecked(e int32) (int64, error) {
	r, err := AddChecked(s.cost[e], s.pot[s.src[e]])
	if err == nil {
		r, err = SubChecked(r, s.pot[s.tgt[e]])
	}
	if err != nil {
		return 0, fmt.Errorf("flow: solve: reduced cost: %w", err)
	}
	return r, nil
}

// pivot pushes flow around the cycle closed by arc in (dir +1: more flow
// on in, -1: less) with the reduced cost r of in, and updates the tree.
// It returns true when the cycle has no limit (then s.cycle is set and
// nothing changes).
func (s *simplex) pivot(in int32, dir int8, r int64) (bool, error) {
	s.pivots++
	if s.progress != nil && s.pivots&(progressEvery-1) == 0 {
		s.progress(s.pivots)
	}
	parent, pred, up, flow, cp := s.parent, s.pred, s.up, s.flow, s.cap
	first, second := s.src[in], s.tgt[in]
	if dir < 0 {
		first, second = second, first
	}
	// Apex: climb from the smaller subtree.
	u, v := first, second
	for u != v {
		if s.size[u] < s.size[v] {
			u = parent[u]
		} else {
			v = parent[v]
		}
	}
	apex := u

	// Leaving arc (Cunningham): the last blocking arc met when walking the
	// cycle in the direction of flow from the apex: apex down to first,
	// the entering arc, second up to the apex.
	delta := int64(inf)
	leave := int32(-1) // node whose pred leaves; -1: the entering arc
	side := 0
	for u := first; u != apex; u = parent[u] {
		a := pred[u]
		var d int64
		if up[u] {
			d = flow[a]
		} else if cp[a] == inf {
			d = inf
		} else {
			d = cp[a] - flow[a]
		}
		if d < delta {
			delta, leave, side = d, u, 1
		}
	}
	var dIn int64
	if dir > 0 {
		if cp[in] == inf {
			dIn = inf
		} else {
			dIn = cp[in] - flow[in]
		}
	} else {
		dIn = flow[in]
	}
	if dIn <= delta {
		delta, leave, side = dIn, -1, 0
	}
	for u := second; u != apex; u = parent[u] {
		a := pred[u]
		var d int64
		if !up[u] {
			d = flow[a]
		} else if cp[a] == inf {
			d = inf
		} else {
			d = cp[a] - flow[a]
		}
		if d <= delta {
			delta, leave, side = d, u, 2
		}
	}
	if delta == inf {
		s.recordCycle(in, first, second, apex)
		return true, nil
	}

	if delta > 0 {
		const maxFlow = math.MaxInt64 - 1
		if dir > 0 {
			if cp[in] == inf && flow[in] > maxFlow-delta {
				return false, s.flowOverflow(in)
			}
			flow[in] += delta
		} else {
			flow[in] -= delta
		}
		for u := first; u != apex; u = parent[u] {
			a := pred[u]
			if up[u] {
				flow[a] -= delta
			} else {
				if cp[a] == inf && flow[a] > maxFlow-delta {
					return false, s.flowOverflow(a)
				}
				flow[a] += delta
			}
		}
		for u := second; u != apex; u = parent[u] {
			a := pred[u]
			if up[u] {
				if cp[a] == inf && flow[a] > maxFlow-delta {
					return false, s.flowOverflow(a)
				}
				flow[a] += delta
			} else {
				flow[a] -= delta
			}
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
	case s.artFixed && int(out) >= s.artStart:
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
	if uIn == s.src[in] {
		sigma = -r
	}
	return false, s.updateTree(in, uIn, vIn, leave, apex, sigma)
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
	up[uIn] = s.src[in] == uIn
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
		if s.src[a] == s.root {
			short += s.flow[a] // bounded by the checked total demand
		}
	}
	sol.Status = Infeasible
	sol.Shortfall = short
	sol.Pivots = s.pivots
	return sol, nil
}

// optimal fills sol from an optimal phase-two tree.
func (s *simplex) optimal(sol *Solution) (*Solution, error) {
	n := s.net
	nv, m := len(n.Nodes), s.m
	sol.Status = Optimal
	sol.Pivots = s.pivots
	sol.Flow = make([]int64, m)
	var err error
	for a := 0; a < m; a++ {
		x := s.flow[a] + n.Lower[a] // <= Upper when Upper is finite
		if s.cap[a] == inf && x < s.flow[a] {
			return nil, s.flowOverflow(int32(a))
		}
		sol.Flow[a] = x
	}
	if sol.Cost, err = totalCost(n.Rate, sol.Flow); err != nil {
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
// component (see Solve).
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
	for v := s.thread[s.root]; v != s.root; v = s.thread[v] {
		if p := s.parent[v]; p == s.root {
			label[v] = v
		} else {
			label[v] = label[p]
			union(v, p)
		}
	}
	for a := 0; a < s.m; a++ {
		if t, h := n.Tail[a], n.Head[a]; label[t] != label[h] {
			union(t, h)
		}
	}
	for _, v := range s.holdFrom {
		union(v, s.hold)
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

// warmStart builds a strongly feasible tree from plan x when x is feasible:
// lanes (and hold arcs) strictly between their bounds, taken in index order
// while they close no cycle, form a forest; each forest component hangs
// from R by the artificial arc of its smallest node (zero flow, directed to
// R). Artificial arcs then keep zero flow (phase two). It returns false
// when x is not feasible (nothing is changed then), and the free arcs left
// out of the forest, which the caller pivots in.
func (s *simplex) warmStart(x []int64) (bool, []int32) {
	n := s.net
	m, nv := s.m, len(n.Nodes)
	if len(x) != m {
		return false, nil
	}
	netout := make([]int64, nv)
	var err error
	for a := 0; a < m; a++ {
		if x[a] < n.Lower[a] || x[a] > n.Upper[a] {
			return false, nil
		}
		t, h := n.Tail[a], n.Head[a]
		if netout[t], err = AddChecked(netout[t], x[a]); err != nil {
			return false, nil
		}
		if netout[h], err = SubChecked(netout[h], x[a]); err != nil {
			return false, nil
		}
	}
	for v := 0; v < nv; v++ {
		b := n.Supply[v]
		if s.hold >= 0 && b > 0 {
			if netout[v] < 0 || netout[v] > b {
				return false, nil
			}
		} else if netout[v] != b {
			return false, nil
		}
	}
	// Flows and states.
	for a := 0; a < m; a++ {
		s.flow[a] = x[a] - n.Lower[a]
	}
	for i, v := range s.holdFrom {
		s.flow[s.holdStart+i] = n.Supply[v] - netout[v]
	}
	return true, s.buildWarmTree()
}

// buildWarmTree builds a strongly feasible tree for the current flows,
// in which the artificial arcs carry nothing: arcs strictly between their
// bounds, in index order while they close no cycle, form a forest that
// completeForest completes. It returns the free arcs left out of the
// forest (not yet at a bound and not in the tree).
func (s *simplex) buildWarmTree() []int32 {
	n := s.net
	uf := make([]int32, s.nNodes)
	for v := range uf {
		uf[v] = int32(v)
	}
	find := func(v int32) int32 {
		for uf[v] != v {
			uf[v] = uf[uf[v]]
			v = uf[v]
		}
		return v
	}
	var superbasic []int32
	forest := make([]int32, 0, s.nNodes)
	for a := 0; a < s.artStart; a++ {
		f, c := s.flow[a], s.cap[a]
		switch {
		case c == 0:
			s.state[a] = stateTree // fixed
		case f == 0:
			s.state[a] = stateLower
		case f == c:
			s.state[a] = stateUpper
		default:
			s.state[a] = stateTree
			ra, rb := find(s.src[a]), find(s.tgt[a])
			if ra == rb {
				superbasic = append(superbasic, int32(a))
				continue
			}
			if ra < rb {
				uf[rb] = ra
			} else {
				uf[ra] = rb
			}
			forest = append(forest, int32(a))
		}
	}
	tree := s.completeForest(forest, find)
	for _, a := range tree {
		s.state[a] = stateTree
	}
	// Tree adjacency (forest, attaching arcs and the artificial arcs of
	// the component roots) and a depth-first preorder from R.
	r := s.root
	nt := s.nNodes + 1
	start := make([]int32, nt+1)
	for _, a := range tree {
		start[s.src[a]+1]++
		start[s.tgt[a]+1]++
	}
	for v := 0; v < nt; v++ {
		start[v+1] += start[v]
	}
	adj := make([]int32, start[nt])
	fill := append([]int32(nil), start[:nt]...)
	for _, a := range tree {
		adj[fill[s.src[a]]] = a
		fill[s.src[a]]++
		adj[fill[s.tgt[a]]] = a
		fill[s.tgt[a]]++
	}
	order := make([]int32, 0, nt)
	seen := make([]bool, nt)
	seen[r] = true
	stack := append(make([]int32, 0, 64), r)
	for len(stack) > 0 {
		v := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		order = append(order, v)
		// Push children in reverse so they are visited in arc order.
		for i := start[v+1] - 1; i >= start[v]; i-- {
			e := adj[i]
			w := s.src[e]
			if w == v {
				w = s.tgt[e]
			}
			if seen[w] {
				continue
			}
			seen[w] = true
			s.parent[w], s.pred[w], s.up[w] = v, e, s.src[e] == w
			stack = append(stack, w)
		}
	}
	for i, v := range order {
		s.size[v] = 1
		s.thread[v] = order[(i+1)%len(order)]
		s.rthread[v] = order[(i+len(order)-1)%len(order)]
	}
	for i := len(order) - 1; i > 0; i-- {
		v := order[i]
		s.size[s.parent[v]] += s.size[v]
	}
	for i, v := range order {
		s.last[v] = order[i+int(s.size[v])-1]
	}
	s.parent[r], s.pred[r] = -1, -1
	s.treeSet = true
	s.artFixed = true
	copy(s.cost, n.Rate)
	for a := s.artStart; a < len(s.cost); a++ {
		s.cost[a] = 0
	}
	return superbasic
}

// completeForest returns the arcs of a strongly feasible spanning tree
// containing forest (free arcs; find gives their components). Components
// are taken in order of their smallest node; one not yet attached hangs
// from R by the artificial arc of that node (zero flow, directed to R).
// Then, breadth first, every component next to the attached part joins it
// through an arc the tree may hold at a bound (zero flow and directed into
// the attached part, or at capacity and directed out of it); among those
// it takes the one that gives the component the highest potentials, the
// least for which all of them keep the right sign, so the first tree is
// close to dual feasible when x came from an optimal plan. Time
// O(|V|+|E|).
func (s *simplex) completeForest(forest []int32, find func(int32) int32) []int32 {
	nv := s.nNodes
	na := s.artStart
	comp := make([]int32, nv)
	for v := range comp {
		comp[v] = find(int32(v))
	}
	// Members of each component, grouped by representative.
	cstart := make([]int32, nv+1)
	for v := 0; v < nv; v++ {
		cstart[comp[v]+1]++
	}
	for v := 0; v < nv; v++ {
		cstart[v+1] += cstart[v]
	}
	members := make([]int32, nv)
	cfill := append([]int32(nil), cstart[:nv]...)
	for v := 0; v < nv; v++ {
		c := comp[v]
		members[cfill[c]] = int32(v)
		cfill[c]++
	}
	// Potentials within components (rho), from the forest; all zero (no
	// guidance, no overflow risk) when potentials need checked arithmetic.
	rho := make([]int64, nv)
	fstart := make([]int32, nv+1)
	for _, a := range forest {
		fstart[s.src[a]+1]++
		fstart[s.tgt[a]+1]++
	}
	for v := 0; v < nv; v++ {
		fstart[v+1] += fstart[v]
	}
	fadj := make([]int32, fstart[nv])
	ffill := append([]int32(nil), fstart[:nv]...)
	for _, a := range forest {
		fadj[ffill[s.src[a]]] = a
		ffill[s.src[a]]++
		fadj[ffill[s.tgt[a]]] = a
		ffill[s.tgt[a]]++
	}
	done := make([]bool, nv)
	stack := make([]int32, 0, 64)
	for v0 := 0; v0 < nv; v0++ {
		if done[v0] {
			continue
		}
		done[v0] = true
		stack = append(stack[:0], int32(v0))
		for len(stack) > 0 {
			v := stack[len(stack)-1]
			stack = stack[:len(stack)-1]
			for _, a := range fadj[fstart[v]:fstart[v+1]] {
				w := s.src[a]
				if w == v {
					w = s.tgt[a]
				}
				if done[w] {
					continue
				}
				done[w] = true
				// r(a) = cost + p(src) - p(tgt) = 0
				if s.checked {
				} else if s.src[a] == w {
					rho[w] = rho[v] - s.cost[a]
				} else {
					rho[w] = rho[v] + s.cost[a]
				}
				stack = append(stack, w)
			}
		}
	}
	// Arcs at a bound between components, by tail and by head.
	const lo, hi = 0, 1
	var cnt [2][2][]int32 // [lower/upper][by tail/by head] starts
	for i := range cnt {
		for j := range cnt[i] {
			cnt[i][j] = make([]int32, nv+1)
		}
	}
	kind := func(a int) int {
		switch {
		case s.cap[a] == 0 || comp[s.src[a]] == comp[s.tgt[a]]:
			return -1
		case s.flow[a] == 0:
			return lo
		case s.flow[a] == s.cap[a]:
			return hi
		}
		return -1
	}
	for a := 0; a < na; a++ {
		if k := kind(a); k >= 0 {
			cnt[k][0][s.src[a]+1]++
			cnt[k][1][s.tgt[a]+1]++
		}
	}
	var lists [2][2][]int32
	var fills [2][2][]int32
	for i := range cnt {
		for j := range cnt[i] {
			c := cnt[i][j]
			for v := 0; v < nv; v++ {
				c[v+1] += c[v]
			}
			lists[i][j] = make([]int32, c[nv])
			fills[i][j] = append([]int32(nil), c[:nv]...)
		}
	}
	for a := 0; a < na; a++ {
		if k := kind(a); k >= 0 {
			t, h := s.src[a], s.tgt[a]
			lists[k][0][fills[k][0][t]] = int32(a)
			fills[k][0][t]++
			lists[k][1][fills[k][1][h]] = int32(a)
			fills[k][1][h]++
		}
	}
	arcs := func(k, by int, v int32) []int32 {
		return lists[k][by][cnt[k][by][v]:cnt[k][by][v+1]]
	}

	tree := append(make([]int32, 0, nv), forest...)
	attached := make([]bool, nv) // by representative
	best := make([]int64, nv)    // best bound offered to a component
	offered := make([]bool, nv)
	off := make([]int64, nv)
	pot := func(v int32) int64 { return rho[v] + off[comp[v]] }
	var h offerHeap
	offer := func(d int32, b int64, a int32) {
		if attached[d] || (offered[d] && b <= best[d]) {
			return
		}
		offered[d], best[d] = true, b
		h.push(offer{b, d, a})
	}
	// hang offers every unattached neighbour of c a bound through each
	// arc that could hang it below c.
	hang := func(c int32) {
		for _, u := range members[cstart[c]:cstart[c+1]] {
			pu := pot(u)
			// Lower arc w->u: p(w) >= p(u) - cost.
			for _, a := range arcs(lo, 1, u) {
				w := s.src[a]
				offer(comp[w], pu-s.cost[a]-rho[w], a)
			}
			// Upper arc u->w: p(w) >= p(u) + cost.
			for _, a := range arcs(hi, 0, u) {
				w := s.tgt[a]
				offer(comp[w], pu+s.cost[a]-rho[w], a)
			}
		}
	}
	for v0 := int32(0); v0 < int32(nv); v0++ {
		c := comp[v0]
		if attached[c] {
			continue
		}
		tree = append(tree, int32(s.artStart)+v0)
		attached[c] = true
		off[c] = -rho[v0]
		hang(c)
		for len(h) > 0 {
			o := h.pop()
			if attached[o.comp] || o.bound != best[o.comp] {
				continue // stale
			}
			tree = append(tree, o.arc)
			attached[o.comp] = true
			off[o.comp] = o.bound
			hang(o.comp)
		}
	}
	return tree
}

// offer is a bound on the potentials of a component not yet in the tree,
// through an arc that can hang it there.
type offer struct {
	bound int64
	comp  int32
	arc   int32
}

// offerHeap is a binary max-heap of offers (highest bound first, then
// lowest arc index).
type offerHeap []offer

func (o offer) before(p offer) bool {
	return o.bound > p.bound || (o.bound == p.bound && o.arc < p.arc)
}

func (h *offerHeap) push(o offer) {
	*h = append(*h, o)
	q := *h
	i := len(q) - 1
	for i > 0 {
		p := (i - 1) / 2
		if !q[i].before(q[p]) {
			break
		}
		q[i], q[p] = q[p], q[i]
		i = p
	}
}

func (h *offerHeap) pop() offer {
	q := *h
	top := q[0]
	n := len(q) - 1
	q[0] = q[n]
	q = q[:n]
	i := 0
	for {
		l := 2*i + 1
		if l >= n {
			break
		}
		c := l
		if r := l + 1; r < n && q[r].before(q[l]) {
			c = r
		}
		if !q[c].before(q[i]) {
			break
		}
		q[i], q[c] = q[c], q[i]
		i = c
	}
	*h = q
	return top
}

// totalCost returns Σ rate[a]·x[a] (x >= 0) exactly: positive and negative
// products are summed apart in 128 bits (with a carry check), then
// subtracted.
func totalCost(rate, x []int64) (Wide, error) {
	var pHi, pLo, nHi, nLo, c uint64
	over := false
	for a, r := range rate {
		f := x[a]
		if r == 0 || f == 0 {
			continue
		}
		if r > 0 {
			hi, lo := bits.Mul64(uint64(r), uint64(f))
			pLo, c = bits.Add64(pLo, lo, 0)
			pHi, c = bits.Add64(pHi, hi, c)
		} else {
			hi, lo := bits.Mul64(uint64(-r), uint64(f))
			nLo, c = bits.Add64(nLo, lo, 0)
			nHi, c = bits.Add64(nHi, hi, c)
		}
		if c != 0 {
			over = true
		}
	}
	if over || pHi>>63 != 0 || nHi>>63 != 0 {
		return Wide{}, fmt.Errorf("flow: solve: total cost: %w", ErrOverflow)
	}
	return Wide{hi: int64(pHi), lo: pLo}.Sub(Wide{hi: int64(nHi), lo: nLo})
}
