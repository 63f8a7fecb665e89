package flow

import (
	"fmt"
	"math"
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

	pivots   int64
	progress func(int64)

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
// practice a small multiple of |V|). Memory: about 42 bytes per lane and
// 120 bytes per node besides the Network and the Solution.
//
// The error is non-nil only when n is invalid (n.Validate) or a value
// overflows; infeasible and unbounded problems are Status values.
func Solve(n *Network, opt SolveOptions) (*Solution, error) {
	return solve(n, opt, false)
}

// solve is Solve; twoPhase forces the cost-1 artificial first phase
// (tests reach it with large rates).
func solve(n *Network, opt SolveOptions, twoPhase bool) (*Solution, error) {
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
	if twoPhase {
		okM = false
	}

	if supply < demand {
		// Infeasible in any case; find the shortfall.
		if err := s.phaseOne(); err != nil {
			return nil, err
		}
		return s.infeasible(sol)
	}

	warm := false
	if opt.Start != nil {
		w, err := s.warmStart(opt.Start)
		if err != nil {
			return nil, err
		}
		warm = w
	}
	sol.WarmStarted = warm
	if !warm {
		s.coldStart()
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
	unb, err := s.run()
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
		for _, b := range n.Supply {
			if b > 0 {
				s.holdFrom = append(s.holdFrom, NodeID(len(s.holdFrom)))
			}
		}
		s.holdFrom = s.holdFrom[:0]
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
func (s *simplex) coldStart() {
	b, _ := s.shiftedSupply() // checked by the caller's earlier pass
	s.initArtTree(b)
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
	if s.pred[0] == 0 && s.nNodes > 0 && s.parent[0] == 0 {
		// never: the tree is always set before (kept for clarity)
	}
	if s.thread[s.root] == 0 && s.size[s.root] == 0 {
		s.coldStart()
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
		} else {
			u := uIn
			for i := int32(0); i < sN; i++ {
				pot[u] += sigma
				u = thr[u]
			}
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
		if sol.Flow[a], err = AddChecked(s.flow[a], n.Lower[a]); err != nil {
			return nil, s.flowOverflow(int32(a))
		}
		if sol.Cost, err = sol.Cost.AddProduct(n.Rate[a], sol.Flow[a]); err != nil {
			return nil, fmt.Errorf("flow: solve: total cost: %w", err)
		}
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
	for a := 0; a < s.m; a++ {
		union(n.Tail[a], n.Head[a])
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
