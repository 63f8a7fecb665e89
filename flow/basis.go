package flow

import (
	"fmt"
	"math"
)

// Basis is the optimal spanning-tree basis of a solved network, kept by
// Solve when SolveOptions.Keep is set. Add re-solves the network with extra
// lanes appended, starting from this basis: the extra lanes enter at zero
// flow, so the basis stays a strongly feasible tree and the simplex goes on
// from the optimum instead of rebuilding a tree from a plan.
//
// A Basis is not safe for concurrent use. It holds the network's lane
// arrays (read in place): the network must not change while the Basis is
// in use.
type Basis struct {
	s       *simplex // the optimal state; never changed after Solve
	w       simplex  // working copy, reset by every Add
	maxRate int64    // largest |rate| over the network's lanes
	gen     uint64   // counts Add calls; Added values check it

	// lanes and hold arcs by node, both ends (Distances, Leaving)
	adjStart, adj []int32

	// buffers of w, reused from call to call
	flow, pot                                 []int64
	state                                     []int8
	parent, pred, thread, rthread, size, last []int32
	up                                        []bool
	xsrc, xtgt                                []int32
	xcost, xcap                               []int64
	tarc                                      []treeArc
	tlist                                     []int32
}

// Added is the result of Basis.Add: the optimum of the network with the
// extra lanes appended (lanes NumLanes()..NumLanes()+k-1 of the extended
// network are the extras, in order).
type Added struct {
	// Status is Optimal or Unbounded (a network that had an optimum stays
	// feasible when lanes are added).
	Status Status
	// Cost is the total cost of the plan (cost scale QtyPlaces+RatePlaces);
	// valid when Optimal.
	Cost Wide
	// Extra holds the flows on the extra lanes, in order; valid when
	// Optimal.
	Extra []int64
	// Cycle, when Unbounded, is a cycle of lanes without capacity whose
	// rates sum to a negative number (lane numbers of the extended network).
	Cycle []CycleStep
	// Pivots is the number of pivots made from the kept basis.
	Pivots int64

	b   *Basis
	s   *simplex // the state holding the plan: the kept one or b's copy
	gen uint64
}

// newBasis keeps the optimal state s. O(|E|) for the largest rate.
func newBasis(s *simplex) (*Basis, error) {
	mr, err := maxAbsRate(s.rate)
	if err != nil {
		return nil, err
	}
	return &Basis{s: s, maxRate: mr}, nil
}

// Add solves the network with the extra lanes appended (their Tail, Head,
// Rate and Upper; Lower must be 0 and ID, Fixed, Same and Line are not
// read), starting from the kept optimal basis with nothing on the extras.
// The Basis itself is not changed, so Add may be called once per candidate
// set; the returned Added is valid until the next call of Add.
//
// When no extra lane has a negative reduced cost against the kept
// potentials the kept plan stays optimal and nothing is copied. Otherwise
// the state is copied (O(|V|+|E|), a memory copy) and the simplex runs
// from it: typically a few pivots and one pass over the lanes to prove
// optimality.
func (b *Basis) Add(extra []Candidate) (*Added, error) {
	b.gen++
	s := b.s
	mr := b.maxRate
	for i, c := range extra {
		if c.Lower != 0 {
			return nil, fmt.Errorf("flow: add lanes: extra lane %d has a minimum (%d); only lanes starting at zero flow can be added to a basis", i+1, c.Lower)
		}
		if c.Upper < 0 {
			return nil, fmt.Errorf("flow: add lanes: extra lane %d has a negative capacity", i+1)
		}
		if int(c.Tail) < 0 || int(c.Tail) >= len(s.net.Nodes) || int(c.Head) < 0 || int(c.Head) >= len(s.net.Nodes) {
			return nil, fmt.Errorf("flow: add lanes: extra lane %d joins a node outside the network", i+1)
		}
		if c.Rate == math.MinInt64 {
			return nil, fmt.Errorf("flow: add lanes: extra lane %d rate: %w", i+1, ErrOverflow)
		}
		mr = max(mr, abs64(c.Rate))
	}
	if int64(s.na)+int64(len(extra)) > math.MaxInt32 {
		return nil, fmt.Errorf("flow: add lanes: %d lanes exceed the solver's int32 indices: %w", s.na+len(extra), ErrOverflow)
	}
	checked := s.checked || needChecks(int64(s.nNodes), mr)
	out := &Added{Status: Optimal, Extra: make([]int64, len(extra)), b: b, s: s, gen: b.gen}
	// Any extra lane eligible to enter? (Zero flow: eligible when its
	// reduced cost is negative and it has room.)
	eligible := false
	for _, c := range extra {
		if c.Upper == 0 {
			continue
		}
		r, err := AddChecked(c.Rate, s.pot[c.Tail])
		if err == nil {
			r, err = SubChecked(r, s.pot[c.Head])
		}
		if err != nil || r < 0 {
			eligible = true
			break
		}
	}
	if !eligible {
		if err := b.keptCost(out); err != nil {
			return nil, err
		}
		return out, nil
	}
	w := b.reset(extra)
	w.checked = checked
	unb, err := w.run()
	if err != nil {
		return nil, err
	}
	out.s, out.Pivots = w, w.pivots
	m := s.m
	lane := func(a int32) LaneID {
		if int(a) < m {
			return LaneID(a)
		}
		return LaneID(m + int(a) - s.na)
	}
	if unb {
		out.Status = Unbounded
		for _, st := range w.cycle {
			out.Cycle = append(out.Cycle, CycleStep{Lane: lane(int32(st.Lane)), Forward: st.Forward})
		}
		out.Extra = nil
		return out, nil
	}
	for i := range extra {
		out.Extra[i] = w.flow[s.na+i]
	}
	if w.objOK {
		out.Cost = w.obj
		return out, nil
	}
	c, err := totalCost(s.rate, w.flow[:m])
	if err != nil {
		return nil, err
	}
	if s.shifted {
		lc, err := totalCost(s.rate, s.net.Lower)
		if err == nil {
			c, err = c.Add(lc)
		}
		if err != nil {
			return nil, err
		}
	}
	for i, e := range extra {
		if c, err = c.Add(MulWide(e.Rate, out.Extra[i])); err != nil {
			return nil, fmt.Errorf("flow: add lanes: total cost: %w", err)
		}
	}
	out.Cost = c
	return out, nil
}

// keptCost sets out.Cost to the kept optimum's cost.
func (b *Basis) keptCost(out *Added) error {
	s := b.s
	if s.objOK {
		out.Cost = s.obj
		return nil
	}
	c, err := totalCost(s.rate, s.flow[:s.m])
	if err == nil && s.shifted {
		var lc Wide
		if lc, err = totalCost(s.rate, s.net.Lower); err == nil {
			c, err = c.Add(lc)
		}
	}
	out.Cost = c
	return err
}

// reset copies the kept state into the working copy and appends the extra
// lanes as arcs na..na+k-1 at zero flow.
func (b *Basis) reset(extra []Candidate) *simplex {
	s, w := b.s, &b.w
	*w = *s
	k := len(extra)
	b.flow = append(append(b.flow[:0], s.flow...), make([]int64, k)...)
	b.state = append(b.state[:0], s.state...)
	for _, c := range extra {
		st := stateLower
		if c.Upper == 0 {
			st = stateTree // fixed
		}
		b.state = append(b.state, st)
	}
	b.pot = append(b.pot[:0], s.pot...)
	b.parent = append(b.parent[:0], s.parent...)
	b.pred = append(b.pred[:0], s.pred...)
	b.thread = append(b.thread[:0], s.thread...)
	b.rthread = append(b.rthread[:0], s.rthread...)
	b.size = append(b.size[:0], s.size...)
	b.last = append(b.last[:0], s.last...)
	b.up = append(b.up[:0], s.up...)
	b.xsrc = append(b.xsrc[:0], s.xsrc...)
	b.xtgt = append(b.xtgt[:0], s.xtgt...)
	b.xcost = append(b.xcost[:0], s.xcost...)
	b.xcap = append(b.xcap[:0], s.xcap...)
	for _, c := range extra {
		b.xsrc = append(b.xsrc, c.Tail)
		b.xtgt = append(b.xtgt, c.Head)
		b.xcost = append(b.xcost, c.Rate)
		cp := c.Upper
		if cp == NoLimit {
			cp = inf
		}
		b.xcap = append(b.xcap, cp)
	}
	w.flow, w.state, w.pot = b.flow, b.state, b.pot
	w.parent, w.pred, w.thread, w.rthread = b.parent, b.pred, b.thread, b.rthread
	w.size, w.last, w.up = b.size, b.last, b.up
	w.xsrc, w.xtgt, w.xcost, w.xcap = b.xsrc, b.xtgt, b.xcost, b.xcap
	// The tree arcs' copies are w's own, all unloaded (epoch 0 marks none).
	if len(b.tarc) != len(s.tarc) {
		b.tarc = make([]treeArc, len(s.tarc))
		b.tlist = make([]int32, 0, len(s.tarc))
	} else {
		clear(b.tarc)
	}
	w.tarc, w.tlist, w.epoch, w.copies = b.tarc, b.tlist[:0], 0, false
	w.na = s.na + k
	w.next = s.na // block search starts at the extra lanes
	w.pivots = 0
	w.progress = nil
	w.cycle = nil
	return w
}

// Flow returns the flow on lane a of the extended network (the network's
// lanes, then the extras) in the plan found. It panics when a later Add has
// replaced the plan.
func (r *Added) Flow(a LaneID) int64 {
	if r.gen != r.b.gen {
		panic("flow: Added.Flow called after a later Basis.Add")
	}
	s := r.s
	m := s.m
	if int(a) < m {
		if s.shifted {
			return s.flow[a] + s.net.Lower[a]
		}
		return s.flow[a]
	}
	return r.Extra[int(a)-m]
}

// Plan returns a copy of the plan found over the extended network (the
// network's lanes, then the extras). It panics when a later Add has
// replaced the plan. O(|E|).
func (r *Added) Plan() []int64 {
	if r.gen != r.b.gen {
		panic("flow: Added.Plan called after a later Basis.Add")
	}
	m := r.s.m
	out := make([]int64, m+len(r.Extra))
	for a := 0; a < m; a++ {
		out[a] = r.Flow(LaneID(a))
	}
	copy(out[m:], r.Extra)
	return out
}

// NoRoute marks a node that Basis.Distances does not reach.
const NoRoute = int64(math.MaxInt64)

// Potential returns the kept optimum's potential of node v (rate scale):
// reduced costs r = Rate + p(Tail) - p(Head) meet the optimality rules of
// Solve. These are the solver's potentials, not normalised as
// Solution.Potential is (they may differ from it by a constant per
// component).
func (b *Basis) Potential(v NodeID) int64 { return b.s.pot[v] }

// residualArcs lists the lanes and hold arcs of the kept state by node
// (both ends), built once. Artificial arcs are left out: in an optimum
// they carry nothing and lead only to the artificial root.
func (b *Basis) residualArcs() {
	if b.adjStart != nil {
		return
	}
	s := b.s
	arcs := make([]int32, s.artStart)
	for a := range arcs {
		arcs[a] = int32(a)
	}
	b.adjStart, b.adj = s.undirected(arcs, s.nNodes)
}

// step returns, for arc a seen from node v, the node across it and the
// reduced cost of moving along it from v (forward when v is its tail:
// more flow; backward: less), or ok false when the arc has no room that
// way. Reversed (rev) looks at the step from the other node to v.
func (s *simplex) step(a, v int32, rev bool) (int32, int64, bool, error) {
	t, h := s.ends(a)
	r, err := AddChecked(s.costOf(a), s.pot[t])
	if err == nil {
		r, err = SubChecked(r, s.pot[h])
	}
	if err != nil {
		return 0, 0, false, fmt.Errorf("flow: reduced cost: %w", err)
	}
	// Moving from t to h needs room above the flow; from h to t, flow.
	fromTail := (v == t) != rev
	if fromTail {
		if c := s.capOf(a); c != inf && s.flow[a] >= c {
			return 0, 0, false, nil
		}
	} else {
		if s.flow[a] <= 0 {
			return 0, 0, false, nil
		}
		r = -r
	}
	o := h
	if v == h {
		o = t
	}
	if t == h {
		return 0, 0, false, nil
	}
	return o, r, true, nil
}

// SrcArcs restricts the arcs Basis.Distances may use at its source.
type SrcArcs int

const (
	// AnyArc allows every arc at the source.
	AnyArc SrcArcs = iota
	// SrcLanes allows only lanes at the source.
	SrcLanes
	// SrcHold allows only the source's hold arc (see Solve's excess-supply
	// rule): holding more of its supply, or less.
	SrcHold
)

// Distances returns, for every node of the network, the least total
// reduced cost of a route from src (towards src when toSrc) through the
// residual network of the kept optimum: along a lane or hold arc (see
// Solve's excess-supply rule) in the direction of more flow while below
// its capacity, or of less flow while above zero (above the minimum).
// Reduced costs are taken with Potential and negated backwards; at an
// optimum they are never negative that way, so this is Dijkstra's search.
// The real cost of a route from x to y is its distance plus p(y) - p(x).
// first restricts the arcs used at src (its first step, or its last when
// toSrc); routes do not come back to src. Nodes not reached get NoRoute. Time O((|V|+|E|) log |V|), memory
// O(|V|+|E|) (the arcs by node are built at the first call and kept).
func (b *Basis) Distances(src NodeID, toSrc bool, first SrcArcs) ([]int64, error) {
	b.residualArcs()
	s := b.s
	nn := s.nNodes
	dist := make([]int64, nn)
	for i := range dist {
		dist[i] = NoRoute
	}
	done := make([]bool, nn)
	h := distHeap{}
	dist[src] = 0
	h.push(distItem{0, int32(src)})
	for len(h) > 0 {
		it := h.pop()
		v := it.v
		if done[v] || it.d != dist[v] {
			continue
		}
		done[v] = true
		for _, a := range b.adj[b.adjStart[v]:b.adjStart[v+1]] {
			if v == int32(src) && ((first == SrcLanes && int(a) >= s.m) || (first == SrcHold && int(a) < s.m)) {
				continue
			}
			o, r, ok, err := s.step(a, v, toSrc)
			if err != nil {
				return nil, err
			}
			if !ok || done[o] {
				continue
			}
			if r < 0 {
				return nil, fmt.Errorf("flow: distances: negative reduced cost %d on a residual arc: the kept basis is not optimal", r)
			}
			nd, err := AddChecked(it.d, r)
			if err != nil {
				return nil, fmt.Errorf("flow: distances: %w", err)
			}
			if nd < dist[o] {
				dist[o] = nd
				h.push(distItem{nd, o})
			}
		}
	}
	return dist[:len(s.net.Nodes)], nil
}

// Leaving describes the residual arcs of the kept optimum from the nodes
// of region (one flag per node of the network) to nodes outside it other
// than skip (-1: none; the hold node counts as outside): the least reduced
// cost of moving along one (see Distances), and the total room along them
// (NoLimit when one has no limit). found is false when there is none.
// O(|V|+|E|).
func (b *Basis) Leaving(region []bool, skip NodeID) (least, room int64, found bool, err error) {
	b.residualArcs()
	s := b.s
	nv := len(s.net.Nodes)
	in := func(v int32) bool { return int(v) < nv && region[v] }
	for v := int32(0); int(v) < nv; v++ {
		if !region[v] {
			continue
		}
		for _, a := range b.adj[b.adjStart[v]:b.adjStart[v+1]] {
			o, r, ok, err := s.step(a, v, false)
			if err != nil {
				return 0, 0, false, err
			}
			if !ok || in(o) || o == int32(skip) {
				continue
			}
			t, _ := s.ends(a)
			spare := s.flow[a] // backward
			if t == v {
				if c := s.capOf(a); c == inf {
					spare = NoLimit
				} else {
					spare = c - s.flow[a]
				}
			}
			if !found || r < least {
				least = r
			}
			found = true
			switch {
			case room == NoLimit || spare == NoLimit:
				room = NoLimit
			default:
				if room, err = AddChecked(room, spare); err != nil {
					room = NoLimit // more than can be counted: no limit
				}
			}
		}
	}
	return least, room, found, nil
}

type distItem struct {
	d int64
	v int32
}

// distHeap is a binary min-heap by (d, v).
type distHeap []distItem

func (a distItem) less(b distItem) bool { return a.d < b.d || (a.d == b.d && a.v < b.v) }

func (q *distHeap) push(it distItem) {
	h := append(*q, it)
	i := len(h) - 1
	for i > 0 {
		p := (i - 1) / 2
		if !h[i].less(h[p]) {
			break
		}
		h[i], h[p] = h[p], h[i]
		i = p
	}
	*q = h
}

func (q *distHeap) pop() distItem {
	h := *q
	top := h[0]
	last := len(h) - 1
	h[0] = h[last]
	h = h[:last]
	for i := 0; ; {
		c := 2*i + 1
		if c >= last {
			break
		}
		if c+1 < last && h[c+1].less(h[c]) {
			c++
		}
		if !h[c].less(h[i]) {
			break
		}
		h[i], h[c] = h[c], h[i]
		i = c
	}
	*q = h
	return top
}
