package dual

import (
	"fmt"
	"sort"

	"lanecert/flow"
)

// graph is the plan's network extended by the hold node and hold lanes (when
// total supply exceeds total demand). Arcs 0..m-1 are the lanes; arc m+i is
// the hold lane of origin holdOrigin[i]. Nodes 0..nn-1 are the network's;
// node nn is the hold node when hold lanes exist.
type graph struct {
	n          *flow.Network
	x          []int64
	m, nn      int
	holdOrigin []flow.NodeID
	held       []int64 // per hold lane: the supply kept
	hold       int32   // the hold node, or -1
	holdOf     []int32 // per node: its hold arc, or -1

	// The pieces formed by free arcs (strictly between bounds): a BFS forest.
	comp      []int32 // per node
	d         []int64 // per node: potential relative to its piece's root
	parentArc []int32 // per node: tree arc to the parent, -1 at a root
	depth     []int32
	pieces    int
	// freeCycles counts free arcs outside the forest (each closes a cycle).
	freeCycles int
}

func newGraph(n *flow.Network, x []int64, f *flow.Feasibility) *graph {
	g := &graph{n: n, x: x, m: n.NumLanes(), nn: n.NumNodes(), hold: -1}
	if f.Held != nil {
		g.hold = int32(g.nn)
		g.holdOf = make([]int32, g.nn)
		for v := range g.holdOf {
			g.holdOf[v] = -1
			if n.Supply[v] > 0 {
				g.holdOf[v] = int32(g.m + len(g.holdOrigin))
				g.holdOrigin = append(g.holdOrigin, flow.NodeID(v))
				g.held = append(g.held, f.Held[v])
			}
		}
	}
	return g
}

func (g *graph) numNodes() int { return g.nn + btoi(g.hold >= 0) }
func (g *graph) numArcs() int  { return g.m + len(g.holdOrigin) }

func btoi(b bool) int {
	if b {
		return 1
	}
	return 0
}

func (g *graph) tail(e int) int32 {
	if e < g.m {
		return g.n.Tail[e]
	}
	return g.holdOrigin[e-g.m]
}

func (g *graph) head(e int) int32 {
	if e < g.m {
		return g.n.Head[e]
	}
	return g.hold
}

// bounds returns lower, upper, flow and rate of arc e.
func (g *graph) arc(e int) (lo, hi, x, rate int64) {
	if e < g.m {
		return g.n.Lower[e], g.n.Upper[e], g.x[e], g.n.Rate[e]
	}
	i := e - g.m
	return 0, g.n.Supply[g.holdOrigin[i]], g.held[i], 0
}

// residual returns how many units can move along arc e in the given
// direction (flow.NoLimit: no limit).
func (g *graph) residual(e int, forward bool) int64 {
	lo, hi, x, _ := g.arc(e)
	if forward {
		if hi == flow.NoLimit {
			return flow.NoLimit
		}
		return hi - x
	}
	return x - lo
}

func (g *graph) step(e int, forward bool) Step {
	if e < g.m {
		return Step{Lane: flow.LaneID(e), Origin: -1, Forward: forward}
	}
	return Step{Lane: -1, Origin: g.holdOrigin[e-g.m], Forward: forward}
}

// candidate is an arc whose residual direction closes a negative cycle.
type candidate struct {
	arc     int
	forward bool
	cost    int64 // reduced cost along the move: < 0
}

// forest builds the pieces of free arcs by breadth-first search from the
// nodes in order. Free arcs that close a cycle of non-zero cost are returned
// as candidates. O(|V|+|E|).
func (g *graph) forest() ([]candidate, error) {
	nv, na := g.numNodes(), g.numArcs()
	start := make([]int32, nv+1)
	free := func(e int) bool {
		lo, hi, x, _ := g.arc(e)
		return lo < x && x < hi
	}
	for e := 0; e < na; e++ {
		if free(e) {
			start[g.tail(e)+1]++
			start[g.head(e)+1]++
		}
	}
	for v := 0; v < nv; v++ {
		start[v+1] += start[v]
	}
	adj := make([]int32, start[nv])
	pos := append([]int32(nil), start[:nv]...)
	for e := 0; e < na; e++ {
		if free(e) {
			t, h := g.tail(e), g.head(e)
			adj[pos[t]] = int32(e)
			pos[t]++
			adj[pos[h]] = int32(e)
			pos[h]++
		}
	}
	g.comp = make([]int32, nv)
	g.d = make([]int64, nv)
	g.parentArc = make([]int32, nv)
	g.depth = make([]int32, nv)
	for v := range g.comp {
		g.comp[v] = -1
	}
	var bad []candidate
	queue := make([]int32, 0, nv)
	for r := 0; r < nv; r++ {
		if g.comp[r] >= 0 {
			continue
		}
		c := int32(g.pieces)
		g.pieces++
		g.comp[r], g.parentArc[r] = c, -1
		queue = append(queue[:0], int32(r))
		for qi := 0; qi < len(queue); qi++ {
			u := queue[qi]
			for _, e32 := range adj[start[u]:start[u+1]] {
				e := int(e32)
				t, h := g.tail(e), g.head(e)
				_, _, _, rate := g.arc(e)
				w := h
				if u == h {
					w = t
				}
				if g.comp[w] < 0 {
					var err error
					if w == h {
						g.d[w], err = flow.AddChecked(g.d[u], rate)
					} else {
						g.d[w], err = flow.SubChecked(g.d[u], rate)
					}
					if err != nil {
						return nil, fmt.Errorf("dual: potentials %w", err)
					}
					g.comp[w], g.parentArc[w], g.depth[w] = c, int32(e), g.depth[u]+1
					queue = append(queue, w)
					continue
				}
				if u != t || int32(e) == g.parentArc[u] || int32(e) == g.parentArc[w] {
					continue // tree arcs; other arcs once, from their tail
				}
				g.freeCycles++
				r, err := g.reduced(e)
				if err != nil {
					return nil, err
				}
				if r < 0 {
					bad = append(bad, candidate{arc: e, forward: true, cost: r})
				} else if r > 0 {
					bad = append(bad, candidate{arc: e, forward: false, cost: -r})
				}
			}
		}
	}
	return bad, nil
}

// reduced returns rate + d(tail) - d(head) under the current d.
func (g *graph) reduced(e int) (int64, error) {
	_, _, _, rate := g.arc(e)
	r, err := flow.AddChecked(rate, g.d[g.tail(e)])
	if err == nil {
		r, err = flow.SubChecked(r, g.d[g.head(e)])
	}
	if err != nil {
		return 0, fmt.Errorf("dual: reduced cost %w", err)
	}
	return r, nil
}

// treePath returns the steps of the forest path from a to b (same piece).
func (g *graph) treePath(a, b int32) []Step {
	var up, down []Step
	for a != b {
		if g.depth[a] >= g.depth[b] {
			e := int(g.parentArc[a])
			// moving from a to its parent along e
			up = append(up, g.step(e, g.tail(e) == a))
			a = g.other(e, a)
		} else {
			e := int(g.parentArc[b])
			// moving from b's parent to b along e
			down = append(down, g.step(e, g.head(e) == b))
			b = g.other(e, b)
		}
	}
	for i := len(down) - 1; i >= 0; i-- {
		up = append(up, down[i])
	}
	return up
}

func (g *graph) other(e int, v int32) int32 {
	if t := g.tail(e); t != v {
		return t
	}
	return g.head(e)
}

// fundamental returns the cycle closed by moving along candidate c and back
// through the forest.
func (g *graph) fundamental(c candidate) []Step {
	t, h := g.tail(c.arc), g.head(c.arc)
	steps := []Step{g.step(c.arc, c.forward)}
	if c.forward {
		return append(steps, g.treePath(h, t)...)
	}
	return append(steps, g.treePath(t, h)...)
}

func (g *graph) arcOf(s Step) int {
	if s.Lane >= 0 {
		return int(s.Lane)
	}
	return int(g.holdOf[s.Origin])
}

// measure fills in a cycle's saving, units and total saving.
func (g *graph) measure(steps []Step) (Cycle, error) {
	c := Cycle{Steps: steps, Units: flow.NoLimit}
	var cost int64
	var err error
	for _, s := range steps {
		e := g.arcOf(s)
		_, _, _, rate := g.arc(e)
		if s.Forward {
			cost, err = flow.AddChecked(cost, rate)
		} else {
			cost, err = flow.SubChecked(cost, rate)
		}
		if err != nil {
			return c, fmt.Errorf("dual: cycle cost %w", err)
		}
		if r := g.residual(e, s.Forward); r < c.Units {
			c.Units = r
		}
	}
	c.SavingPerUnit = -cost
	if c.Units != flow.NoLimit {
		c.Total = flow.MulWide(c.SavingPerUnit, c.Units)
	}
	return c, nil
}

// walkNode returns the node a step leaves from and the node it reaches.
func (g *graph) ends(s Step) (from, to int32) {
	e := g.arcOf(s)
	if s.Forward {
		return g.tail(e), g.head(e)
	}
	return g.head(e), g.tail(e)
}

// simpleCycles splits a closed walk into simple cycles.
func (g *graph) simpleCycles(walk []Step) [][]Step {
	var out [][]Step
	at := map[int32]int{} // node -> index in stack of the step leaving it
	var stack []Step
	for _, s := range walk {
		from, to := g.ends(s)
		if _, ok := at[from]; !ok {
			at[from] = len(stack)
		}
		stack = append(stack, s)
		if i, ok := at[to]; ok {
			cyc := append([]Step(nil), stack[i:]...)
			for _, t := range stack[i:] {
				f, _ := g.ends(t)
				if f != to {
					delete(at, f)
				}
			}
			stack = stack[:i]
			out = append(out, cyc)
		}
	}
	return out
}

// solve decides optimality and fills in a.
func (g *graph) solve(a *Audit) error {
	bad, err := g.forest()
	if err != nil {
		return err
	}
	a.Pieces = g.pieces - btoi(g.hold >= 0 && g.isolatedHold())
	var offsets []int64
	var bfCycle []Step
	// Bound arcs inside one piece that break the sign rules close a
	// fundamental cycle; between pieces they constrain the pieces' offsets.
	var inter []interArc
	for e, na := 0, g.numArcs(); e < na; e++ {
		lo, hi, x, _ := g.arc(e)
		if lo == hi || (lo < x && x < hi) {
			continue
		}
		r, err := g.reduced(e)
		if err != nil {
			return err
		}
		t, h := g.comp[g.tail(e)], g.comp[g.head(e)]
		atLower := x == lo
		if t == h {
			if atLower && r < 0 {
				bad = append(bad, candidate{arc: e, forward: true, cost: r})
			} else if !atLower && r > 0 {
				bad = append(bad, candidate{arc: e, forward: false, cost: -r})
			}
			continue
		}
		if atLower {
			inter = append(inter, interArc{from: t, to: h, w: r, arc: int32(e), forward: true})
		} else {
			inter = append(inter, interArc{from: h, to: t, w: -r, arc: int32(e), forward: false})
		}
	}
	a.Determined = true
	if len(bad) == 0 {
		for _, ia := range inter {
			if ia.w < 0 {
				a.Determined = false
				break
			}
		}
		if !a.Determined {
			offsets, bfCycle, err = g.bellmanFord(inter)
			if err != nil {
				return err
			}
		}
	}
	optimal := len(bad) == 0 && bfCycle == nil
	// Potentials: the forest's, shifted by the pieces' offsets when optimal.
	p := make([]int64, g.numNodes())
	for v := range p {
		p[v] = g.d[v]
		if optimal && offsets != nil {
			if p[v], err = flow.AddChecked(p[v], offsets[g.comp[v]]); err != nil {
				return fmt.Errorf("dual: potentials %w", err)
			}
		}
	}
	if err := g.normalise(p); err != nil {
		return err
	}
	if err := g.finish(a, p); err != nil {
		return err
	}
	if optimal {
		a.Verdict = Optimal
		return g.dual(a, p)
	}
	a.Verdict = NotOptimal
	return g.cycles(a, p, bad, bfCycle)
}

// isolatedHold reports whether the hold node forms a piece of its own.
func (g *graph) isolatedHold() bool {
	c := g.comp[g.hold]
	for v := 0; v < g.nn; v++ {
		if g.comp[v] == c {
			return false
		}
	}
	return true
}

// finish sets potentials, reduced costs and broken lanes of a from p.
func (g *graph) finish(a *Audit, p []int64) error {
	n := g.n
	a.Potential = p[:g.nn]
	a.Reduced = make([]int64, g.m)
	for e := 0; e < g.m; e++ {
		r, err := flow.AddChecked(n.Rate[e], p[n.Tail[e]])
		if err == nil {
			r, err = flow.SubChecked(r, p[n.Head[e]])
		}
		if err != nil {
			return fmt.Errorf("dual: reduced cost of lane %s %w", n.LaneName(flow.LaneID(e)), err)
		}
		a.Reduced[e] = r
		if !SlackOK(a.State[e], n.Lower[e], n.Upper[e], r) {
			a.Broken = append(a.Broken, flow.LaneID(e))
		}
	}
	for i, v := range g.holdOrigin {
		e := g.m + i
		lo, hi, x, _ := g.arc(e)
		r := p[v] - p[g.hold] // p(H) = 0 after normalisation
		if !SlackOK(StateOf(x, lo, hi), lo, hi, r) {
			a.BrokenHolds = append(a.BrokenHolds, v)
		}
	}
	return nil
}

// normalise shifts each weakly connected piece of the extended network (see
// the package documentation) so that its anchor has potential 0.
func (g *graph) normalise(p []int64) error {
	anchor, _ := g.anchors(p)
	shift := make([]int64, len(p))
	for v := range p {
		shift[v] = p[anchor[v]]
	}
	for v := range p {
		var err error
		if p[v], err = flow.SubChecked(p[v], shift[v]); err != nil {
			return fmt.Errorf("dual: potentials %w", err)
		}
	}
	return nil
}

// Anchor kinds, in order of preference.
const (
	anchorAny    int8 = 1 // a piece without origins: its node of least potential
	anchorOrigin int8 = 2 // its origin of least potential (then lowest number)
	anchorHold   int8 = 3 // the hold node
)

// anchors returns, per node of the extended network, the anchor of its
// weakly connected piece under potentials p and the anchor's kind.
// Union-find over all arcs: O((|V|+|E|) α).
func (g *graph) anchors(p []int64) ([]int32, []int8) {
	nv := g.numNodes()
	parent := make([]int32, nv)
	for v := range parent {
		parent[v] = int32(v)
	}
	find := func(v int32) int32 {
		for parent[v] != v {
			parent[v] = parent[parent[v]]
			v = parent[v]
		}
		return v
	}
	for e, na := 0, g.numArcs(); e < na; e++ {
		a, b := find(g.tail(e)), find(g.head(e))
		if a != b {
			parent[max(a, b)] = min(a, b)
		}
	}
	best := make([]int32, nv)
	kind := make([]int8, nv)
	for v := range best {
		best[v] = -1
	}
	for v := 0; v < nv; v++ {
		root := find(int32(v))
		k := anchorAny
		switch {
		case int32(v) == g.hold:
			k = anchorHold
		case g.n.Supply[v] > 0:
			k = anchorOrigin
		}
		if best[root] < 0 || k > kind[root] || (k == kind[root] && p[v] < p[best[root]]) {
			best[root], kind[root] = int32(v), k
		}
	}
	out, outKind := make([]int32, nv), make([]int8, nv)
	for v := range out {
		root := find(int32(v))
		out[v], outKind[v] = best[root], kind[root]
	}
	return out, outKind
}

// dual computes the dual objective and checks it against the cost.
func (g *graph) dual(a *Audit, p []int64) error {
	n := g.n
	var parts DualParts
	var err error
	for v := 0; v < g.nn; v++ {
		if parts.Supply, err = parts.Supply.Add(flow.MulWide(n.Supply[v], p[v]).Neg()); err != nil {
			return fmt.Errorf("dual: dual objective %w", err)
		}
	}
	for e, r := range a.Reduced {
		switch {
		case r > 0:
			parts.Minimum, err = parts.Minimum.AddProduct(r, n.Lower[e])
		case r < 0:
			parts.Capacity, err = parts.Capacity.AddProduct(r, n.Upper[e])
		}
		if err != nil {
			return fmt.Errorf("dual: dual objective %w", err)
		}
	}
	for _, v := range g.holdOrigin {
		if r := p[v]; r < 0 {
			if parts.Capacity, err = parts.Capacity.AddProduct(r, n.Supply[v]); err != nil {
				return fmt.Errorf("dual: dual objective %w", err)
			}
		}
	}
	d, err := parts.Supply.Add(parts.Minimum)
	if err == nil {
		d, err = d.Add(parts.Capacity)
	}
	if err != nil {
		return fmt.Errorf("dual: dual objective %w", err)
	}
	if d.Cmp(a.Cost) != 0 {
		return fmt.Errorf("%w: dual objective %s differs from plan cost %s", ErrInternal, n.FormatCost(d), n.FormatCost(a.Cost))
	}
	a.Dual, a.DualParts = d, parts
	return nil
}

// cycles turns the candidates into measured cycles and keeps the best.
func (g *graph) cycles(a *Audit, p []int64, bad []candidate, bf []Step) error {
	sort.SliceStable(bad, func(i, j int) bool {
		if bad[i].cost != bad[j].cost {
			return bad[i].cost < bad[j].cost
		}
		return bad[i].arc < bad[j].arc
	})
	if len(bad) > maxCandidates {
		bad = bad[:maxCandidates]
	}
	var walks [][]Step
	for _, c := range bad {
		walks = append(walks, g.fundamental(c))
	}
	if bf != nil {
		walks = append(walks, g.simpleCycles(bf)...)
	}
	var out []Cycle
	for _, w := range walks {
		c, err := g.measure(g.rotate(w, p))
		if err != nil {
			return err
		}
		if c.SavingPerUnit <= 0 || c.Units == 0 {
			continue
		}
		out = append(out, c)
	}
	if len(out) == 0 {
		return fmt.Errorf("%w: no improving cycle found for a plan that is not optimal", ErrInternal)
	}
	sort.SliceStable(out, func(i, j int) bool {
		ci, cj := &out[i], &out[j]
		if ci.Unbounded() != cj.Unbounded() {
			return ci.Unbounded()
		}
		if k := ci.Total.Cmp(cj.Total); k != 0 {
			return k > 0
		}
		if ci.SavingPerUnit != cj.SavingPerUnit {
			return ci.SavingPerUnit > cj.SavingPerUnit
		}
		return len(ci.Steps) < len(cj.Steps)
	})
	// Drop repeats of the same cycle (found from different lanes).
	seen := map[string]bool{}
	for _, c := range out {
		k := cycleKey(c.Steps)
		if seen[k] {
			continue
		}
		seen[k] = true
		a.Cycles = append(a.Cycles, c)
		if len(a.Cycles) == MaxCycles {
			break
		}
	}
	return nil
}

// rotate starts a cycle at its node of lowest potential (then lowest
// number), so reroutes read from the supply side outward.
func (g *graph) rotate(w []Step, p []int64) []Step {
	best := 0
	for i, s := range w {
		v, _ := g.ends(s)
		b, _ := g.ends(w[best])
		if p[v] < p[b] || (p[v] == p[b] && v < b) {
			best = i
		}
	}
	return append(append([]Step(nil), w[best:]...), w[:best]...)
}

// cycleKey identifies a cycle regardless of where it starts.
func cycleKey(steps []Step) string {
	keys := make([]string, len(steps))
	for i, s := range steps {
		keys[i] = fmt.Sprintf("%d/%d/%t", s.Lane, s.Origin, s.Forward)
	}
	sort.Strings(keys)
	return fmt.Sprint(keys)
}
