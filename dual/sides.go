package dual

import (
	"sort"

	"lanecert/flow"
)

// maxSideCells bounds nodes times neighbouring pieces of a piece for which
// side tables are built (three int64 and three int32 per cell); larger
// pieces search edge by edge.
const maxSideCells = 1 << 20

// forestRanges fills in the ranges of the lanes in use that are forest
// arcs, piece by piece. Within a piece P with s nodes and n neighbouring
// pieces, side tables (O(s·n) time and memory) give for any cut of P's tree
// the cheapest edge from either side to each neighbour and back; the
// cheapest route from one side to the other through other pieces is then
// one search over the other pieces (P removed: a route that re-enters P's
// far side ends there, one that re-enters the near side is no shorter than
// its part from there), started from the neighbours at their edge costs and
// stopped once it can no longer beat the best route or the cheapest edge
// inside P across the cut.
func (r *ranger) forestRanges(forest []int32, s *Sensitivity) error {
	g := r.g
	sort.SliceStable(forest, func(i, j int) bool {
		return g.comp[g.tail(int(forest[i]))] < g.comp[g.tail(int(forest[j]))]
	})
	var out, in sideTable
	for lo := 0; lo < len(forest); {
		p := g.comp[g.tail(int(forest[lo]))]
		hi := lo + 1
		for hi < len(forest) && g.comp[g.tail(int(forest[hi]))] == p {
			hi++
		}
		lanes := forest[lo:hi]
		lo = hi
		root := r.euler[r.tin[g.tail(int(lanes[0]))]]
		for g.parentArc[root] >= 0 {
			root = g.other(int(g.parentArc[root]), root)
		}
		base, size := r.tin[root], int(r.tout[root]-r.tin[root])
		nOut := int(r.fwdG.start[p+1] - r.fwdG.start[p])
		nIn := int(r.revG.start[p+1] - r.revG.start[p])
		for c := r.revG.start[p]; c < r.revG.start[p+1]; c++ {
			r.inSlot[r.revG.to[c]] = c - r.revG.start[p]
		}
		if size*(nOut+nIn) > maxSideCells {
			// Too many neighbours for tables: search from the smaller
			// side of each cut instead.
			bp := r.newBigPiece(p, base, size)
			via := r.splitHub(p, base, size)
			for _, e := range lanes {
				if err := r.splitSides(int(e), &s.Lanes[e], p, base, nil, nil, bp, via); err != nil {
					return err
				}
			}
		} else {
			r.sideTable(&out, p, base, size, false)
			r.sideTable(&in, p, base, size, true)
			// With many cuts, the routes through a hub bound the searches
			// (two searches per piece; without them, a degenerate optimum
			// of sparse transportation from another solver made every
			// search settle half the pieces).
			var via *splitHub
			if len(lanes) >= minHubSources {
				via = r.splitHub(p, base, size)
				if via.piece >= 0 {
					r.markHub(via.piece, true)
				}
			}
			for _, e := range lanes {
				if err := r.splitSides(int(e), &s.Lanes[e], p, base, &out, &in, nil, via); err != nil {
					return err
				}
			}
			if via != nil && via.piece >= 0 {
				r.markHub(via.piece, false)
			}
		}
		for c := r.revG.start[p]; c < r.revG.start[p+1]; c++ {
			r.inSlot[r.revG.to[c]] = -1
		}
	}
	return nil
}

// sideTable holds, for one piece of s nodes in depth-first order and n
// neighbouring pieces, the cheapest edge (least reduced cost, then least
// edge index; index -1: none) between node sets of the piece and each
// neighbour: row p of sub covers the subtree of the node at position p, row
// p of pre the positions before p, row p of suf the positions from p on.
// Rows have n cells; pre and suf have s+1 rows.
type sideTable struct {
	n                int
	subW, preW, sufW []int64
	subI, preI, sufI []int32
	// rowW, rowI hold the last row asked for.
	rowW []int64
	rowI []int32
}

func grow[T any](b []T, n int) []T {
	if cap(b) < n {
		return make([]T, n)
	}
	return b[:n]
}

// better reports whether (w, i) beats (bw, bi); bi < 0 is no edge.
func better(w int64, i int32, bw int64, bi int32) bool {
	return i >= 0 && (bi < 0 || w < bw || (w == bw && i < bi))
}

// minRow sets dst to the cellwise best of a and b.
func minRow(dw []int64, di []int32, aw []int64, ai []int32, bw []int64, bi []int32) {
	for j := range dw {
		if better(bw[j], bi[j], aw[j], ai[j]) {
			dw[j], di[j] = bw[j], bi[j]
		} else {
			dw[j], di[j] = aw[j], ai[j]
		}
	}
}

// sideTable fills t for piece p (nodes euler[base:base+size]): edges
// leaving p to each neighbour, or with in, edges entering p from each.
// O(size·n + edges of p).
func (r *ranger) sideTable(t *sideTable, p, base int32, size int, in bool) {
	g := r.g
	pg, list := &r.fwdG, []int32(nil)
	lo, hi := r.start[p], r.start[p+1]
	if in {
		pg, list = &r.revG, r.redges[r.rstart[p]:r.rstart[p+1]]
		lo, hi = 0, int32(len(list))
	}
	n := int(pg.start[p+1] - pg.start[p])
	t.n = n
	t.subW, t.subI = grow(t.subW, size*n), grow(t.subI, size*n)
	t.preW, t.preI = grow(t.preW, (size+1)*n), grow(t.preI, (size+1)*n)
	t.sufW, t.sufI = grow(t.sufW, (size+1)*n), grow(t.sufI, (size+1)*n)
	t.rowW, t.rowI = grow(t.rowW, n), grow(t.rowI, n)
	for j := range t.subI {
		t.subI[j] = -1
	}
	for j := 0; j < n; j++ {
		t.preI[j], t.sufI[size*n+j] = -1, -1
	}
	for k := lo; k < hi; k++ {
		i, v := k, int32(0)
		if in {
			i = list[k]
			v = r.to[i]
		} else {
			v = r.from[i]
		}
		c := int(r.tin[v]-base)*n + int(pg.of[i]-pg.start[p])
		if better(r.w[i], i, t.subW[c], t.subI[c]) {
			t.subW[c], t.subI[c] = r.w[i], i
		}
	}
	for q := 0; q < size; q++ {
		a, b := q*n, (q+1)*n
		minRow(t.preW[b:b+n], t.preI[b:b+n], t.preW[a:a+n], t.preI[a:a+n], t.subW[a:a+n], t.subI[a:a+n])
	}
	for q := size - 1; q >= 0; q-- {
		a, b := q*n, (q+1)*n
		minRow(t.sufW[a:a+n], t.sufI[a:a+n], t.sufW[b:b+n], t.sufI[b:b+n], t.subW[a:a+n], t.subI[a:a+n])
	}
	for q := size - 1; q >= 1; q-- {
		v := r.euler[int(base)+q]
		u := g.other(int(g.parentArc[v]), v)
		a, b := q*n, int(r.tin[u]-base)*n
		minRow(t.subW[b:b+n], t.subI[b:b+n], t.subW[b:b+n], t.subI[b:b+n], t.subW[a:a+n], t.subI[a:a+n])
	}
}

// row sets t.rowW, t.rowI to the cheapest edges of the subtree of the node
// at position l (its subtree ends before position end), or of the rest of
// the piece.
func (t *sideTable) row(l, end int, subtree bool) {
	n := t.n
	if subtree {
		copy(t.rowW, t.subW[l*n:(l+1)*n])
		copy(t.rowI, t.subI[l*n:(l+1)*n])
		return
	}
	minRow(t.rowW, t.rowI, t.preW[l*n:(l+1)*n], t.preI[l*n:(l+1)*n], t.sufW[end*n:(end+1)*n], t.sufI[end*n:(end+1)*n])
}

// splitSides computes the range of forest lane e of piece p: removing it
// cuts p in two sides; the limits are the cheapest routes between the two
// sides: an inner edge across the cut (from cover) or a route through
// other pieces, found with the side tables of p (out, in) or, without them
// (out nil), with p's edges arranged by bp and the hub via. With the
// tables, the hub via (nil: none; marked by markHub) bounds the searches.
func (r *ranger) splitSides(e int, lr *LaneRange, p, base int32, out, in *sideTable, bp *bigPiece, via *splitHub) error {
	g := r.g
	_, _, _, rate := g.arc(e)
	t, h := g.tail(e), g.head(e)
	child := h
	if int(g.parentArc[t]) == e {
		child = t
	}
	down, downBy := r.leave[child], r.leaveBy[child]
	up, upBy := r.enter[child], r.enterBy[child]
	if child == t {
		down, downBy, up, upBy = up, upBy, down, downBy
	}
	l, end := int(r.tin[child]-base), int(r.tout[child]-base)
	best := func(inner int64, innerBy int32, fromSub bool) (int64, flow.LaneID, bool) {
		d, by := inner, flow.LaneID(-1)
		if innerBy >= 0 && int(innerBy) < g.m {
			by = flow.LaneID(innerBy)
		}
		if inner == 0 {
			return d, by, true // no route is cheaper
		}
		var x int64
		var xi int32
		if out != nil {
			out.row(l, end, fromSub)
			in.row(l, end, !fromSub)
			// As below: the cheapest route through a hub bounds the
			// search, which leaves the hubs out.
			u, ui := unreached, int32(-1)
			if via != nil {
				u, ui = via.route(l, end, fromSub)
			}
			bound := inner
			if u != unreached && (bound == unreached || u < bound) {
				bound = u
			}
			x, xi = r.sideSearch(p, out, in, bound)
			if u != unreached && (x == unreached || x >= u) {
				x, xi = u, ui
			}
		} else {
			// The cheapest route through the hub bounds the search, which
			// then leaves the hub out.
			u, ui := via.route(l, end, fromSub)
			bound := inner
			if u != unreached && (bound == unreached || u < bound) {
				bound = u
			}
			x, xi = r.smallSide(bp, via.piece, l, end, fromSub, bound)
			if u != unreached && (x == unreached || x >= u) {
				x, xi = u, ui // nothing cheaper without the hub
			}
		}
		if x != unreached && (d == unreached || x < d) {
			d, by = x, -1
			if int(r.arcOf[xi]) < g.m {
				by = flow.LaneID(r.arcOf[xi])
			}
			lr.ByRoute = true
		}
		return d, by, d != unreached
	}
	var err error
	d, by, ok := best(down, downBy, child == h)
	if ok {
		if lr.Lower, err = shift(rate, d, false); err != nil {
			return err
		}
		lr.HasLower, lr.LowerBy = true, by
	}
	d, by, ok = best(up, upBy, child == t)
	if ok {
		if lr.Upper, err = shift(rate, d, true); err != nil {
			return err
		}
		lr.HasUpper, lr.UpperBy = true, by
	}
	return nil
}

// sidePiece is a piece's state in sideSearch, kept together so that an
// edge relaxed reads one record at a random place, not five arrays: the
// distances from the near side (fd) and to the far side (bd; unreached:
// none), the edge into the far side that the backward route ends with
// (lab), whether each half has settled the piece, and whether the piece
// is a hub of the piece being split (left out of the searches).
type sidePiece struct {
	fd, bd     int64
	lab        int32
	fset, bset bool
	hub        bool
}

// sideState is sideSearch's state, reused: one record per piece, the
// pieces touched by the last search, and the two halves' heaps.
type sideState struct {
	pc           []sidePiece
	touched      []int32
	fheap, bheap pieceHeap
}

// reset clears the last search (allocating the records for n pieces on
// first use; hub marks stay).
func (st *sideState) reset(n int) {
	if st.pc == nil {
		st.pc = make([]sidePiece, n)
		for i := range st.pc {
			st.pc[i].fd, st.pc[i].bd, st.pc[i].lab = unreached, unreached, -1
		}
	}
	for _, v := range st.touched {
		x := &st.pc[v]
		x.fd, x.bd, x.lab, x.fset, x.bset = unreached, unreached, -1, false, false
	}
	st.touched = st.touched[:0]
	st.fheap, st.bheap = st.fheap[:0], st.bheap[:0]
}

// markHub sets (on) or clears piece c as a hub that sideSearch leaves out.
func (r *ranger) markHub(c int32, on bool) {
	r.side.reset(r.k + 1)
	r.side.pc[c].hub = on
}

// sideSearch finds the cheapest route from one side of split piece p to
// the other through other pieces: out.row holds the cheapest edges from the
// near side to p's out-neighbours, in.row those from p's in-neighbours into
// the far side; the route is reported by its edge into the far side. It
// searches from both ends at once, forward from the out-neighbours and
// backward from the in-neighbours, until the least distances of the two
// frontiers add up to the best route found or to bound (unreached: no
// bound); routes costing bound or more are not looked for, nor routes
// through the pieces markHub marks. Of routes of equal cost it keeps the
// one entering the far side by the least edge among those found. It
// returns the cost (unreached: none) and that edge. (A search from the
// near side only settled, on another solver's optimum of sparse
// transportation, a third of all pieces per cut; two searches of half the
// radius settle far fewer.)
func (r *ranger) sideSearch(p int32, out, in *sideTable, bound int64) (int64, int32) {
	r.searches++
	st := &r.side
	st.reset(r.k + 1)
	pc := st.pc
	best, bestI := unreached, int32(-1)
	// touch notes piece v's first offer in this search.
	touch := func(x *sidePiece, v int32) {
		if x.fd == unreached && x.bd == unreached {
			st.touched = append(st.touched, v)
		}
	}
	meet := func(x *sidePiece) {
		if x.fd == unreached || x.bd == unreached {
			return
		}
		c := sat(x.fd, x.bd)
		if best == unreached || c < best || c == best && x.lab < bestI {
			best, bestI = c, x.lab
		}
	}
	for j, i := range out.rowI {
		if x := r.fwdG.to[int(r.fwdG.start[p])+j]; i >= 0 && !pc[x].hub {
			touch(&pc[x], x)
			pc[x].fd = out.rowW[j]
			st.fheap.push(pieceItem{out.rowW[j], x})
		}
	}
	for j, i := range in.rowI {
		if y := r.revG.to[int(r.revG.start[p])+j]; i >= 0 && !pc[y].hub {
			py := &pc[y]
			touch(py, y)
			py.bd, py.lab = in.rowW[j], i
			st.bheap.push(pieceItem{in.rowW[j], y})
			meet(py)
		}
	}
	// A piece offered at a distance d from one end such that every route
	// through it costs bound or more, or more than the best route found,
	// could only reach the top of its heap once the search is over: it is
	// left off the heap (useless), only counted (fLeft, bLeft), so that the
	// two heaps compare in size, which decides the side to advance, as if
	// it were on: the search is the same, with smaller heaps.
	useless := func(d int64) bool {
		return bound != unreached && d >= bound || best != unreached && d > best
	}
	fLeft, bLeft := 0, 0
	// top drops the stale entries off a half's heap and returns its least
	// distance (unreached: empty).
	top := func(h *pieceHeap, back bool) int64 {
		for len(*h) > 0 {
			it := (*h)[0]
			x := &pc[it.piece]
			set, d := x.fset, x.fd
			if back {
				set, d = x.bset, x.bd
			}
			if set || it.d != d {
				h.pop()
				continue
			}
			return it.d
		}
		return unreached
	}
	for {
		tf, tb := top(&st.fheap, false), top(&st.bheap, true)
		if tf == unreached || tb == unreached {
			break
		}
		lim := best
		if bound != unreached && (lim == unreached || bound < lim) {
			lim = bound
		}
		if lim != unreached && sat(tf, tb) >= lim {
			break
		}
		if len(st.fheap)+fLeft <= len(st.bheap)+bLeft {
			it := st.fheap.pop()
			u := it.piece
			pc[u].fset = true
			for c := r.fwdG.start[u]; c < r.fwdG.start[u+1]; c++ {
				v := r.fwdG.to[c]
				x := &pc[v]
				if v == p || x.hub || x.fset {
					continue
				}
				nd := sat(it.d, r.fwdG.w[c])
				if x.fd != unreached && nd >= x.fd {
					continue
				}
				touch(x, v)
				x.fd = nd
				if useless(nd) {
					fLeft++
				} else {
					st.fheap.push(pieceItem{nd, v})
				}
				meet(x)
			}
		} else {
			it := st.bheap.pop()
			u := it.piece
			pc[u].bset = true
			lab := pc[u].lab
			for c := r.revG.start[u]; c < r.revG.start[u+1]; c++ {
				v := r.revG.to[c]
				x := &pc[v]
				if v == p || x.hub || x.bset {
					continue
				}
				nd := sat(it.d, r.revG.w[c])
				if x.bd != unreached && (nd > x.bd || nd == x.bd && lab >= x.lab) {
					continue
				}
				touch(x, v)
				x.bd, x.lab = nd, lab
				if useless(nd) {
					bLeft++
				} else {
					st.bheap.push(pieceItem{nd, v})
				}
				meet(x)
			}
		}
	}
	return best, bestI
}

// bigPiece arranges the edges between a piece p (nodes euler[base:
// base+size]) and other pieces for splits without side tables: by the
// depth-first position of their end in p (leaving: byPos, entering:
// inByPos) and by the other piece, in order of (cost, index) (leaving:
// byNb with slots of r.fwdG, entering: inByNb with slots of r.revG).
// O(size + edges of p) memory; outSlot[piece] is the piece's slot.
type bigPiece struct {
	r                      *ranger
	p, base                int32
	size                   int
	posStart, posEdges     []int32
	inPosStart, inPosEdges []int32
	nbStart, nbEdges       []int32
	inNbStart, inNbEdges   []int32
	outSlot                []int32
}

// group sorts edges into buckets by key (counting sort, stable).
func group(edges []int32, buckets int, key func(int32) int32) (start, out []int32) {
	start = make([]int32, buckets+1)
	for _, i := range edges {
		start[key(i)+1]++
	}
	for b := 0; b < buckets; b++ {
		start[b+1] += start[b]
	}
	out = make([]int32, len(edges))
	pos := append([]int32(nil), start[:buckets]...)
	for _, i := range edges {
		out[pos[key(i)]] = i
		pos[key(i)]++
	}
	return start, out
}

func (r *ranger) newBigPiece(p, base int32, size int) *bigPiece {
	bp := &bigPiece{r: r, p: p, base: base, size: size}
	leaving := make([]int32, 0, r.start[p+1]-r.start[p])
	for i := r.start[p]; i < r.start[p+1]; i++ {
		leaving = append(leaving, i)
	}
	entering := r.redges[r.rstart[p]:r.rstart[p+1]]
	bp.posStart, bp.posEdges = group(leaving, size, func(i int32) int32 { return r.tin[r.from[i]] - base })
	bp.inPosStart, bp.inPosEdges = group(entering, size, func(i int32) int32 { return r.tin[r.to[i]] - base })
	byCost := func(es []int32) {
		sort.Slice(es, func(a, b int) bool {
			i, j := es[a], es[b]
			return r.w[i] < r.w[j] || (r.w[i] == r.w[j] && i < j)
		})
	}
	nOut := int(r.fwdG.start[p+1] - r.fwdG.start[p])
	nIn := int(r.revG.start[p+1] - r.revG.start[p])
	bp.nbStart, bp.nbEdges = group(leaving, nOut, func(i int32) int32 { return r.fwdG.of[i] - r.fwdG.start[p] })
	bp.inNbStart, bp.inNbEdges = group(entering, nIn, func(i int32) int32 { return r.revG.of[i] - r.revG.start[p] })
	for j := 0; j < nOut; j++ {
		byCost(bp.nbEdges[bp.nbStart[j]:bp.nbStart[j+1]])
	}
	for j := 0; j < nIn; j++ {
		byCost(bp.inNbEdges[bp.inNbStart[j]:bp.inNbStart[j+1]])
	}
	bp.outSlot = make([]int32, r.k)
	for c := range bp.outSlot {
		bp.outSlot[c] = -1
	}
	for c := r.fwdG.start[p]; c < r.fwdG.start[p+1]; c++ {
		bp.outSlot[r.fwdG.to[c]] = c - r.fwdG.start[p]
	}
	return bp
}

// smallSide finds the cheapest route from one side of the big piece bp.p
// to the other through other pieces, leaving out piece skip (the hub): for
// a cut at the subtree of positions [l, end), from the subtree (fromSub)
// or from the rest. It searches from the smaller side: forward from its
// leaving edges when that is the near side, backward from its entering
// edges when it is the far side; each settled piece is checked for its
// cheapest edge to (from) the other side. Routes costing bound or more are
// not looked for. It returns the cost (unreached: none) and the edge
// entering the far side. O(edges of the smaller side + the pieces settled
// and their merged edges · log k).
func (r *ranger) smallSide(bp *bigPiece, skip int32, l, end int, fromSub bool, bound int64) (int64, int32) {
	r.searches++
	r.resetSearch()
	p, base := bp.p, bp.base
	inSub := func(v int32) bool { q := int(r.tin[v] - base); return l <= q && q < end }
	subSmall := 2*(end-l) <= bp.size
	forward := subSmall == fromSub // search from the near side
	// Positions of the smaller side: one range or two.
	ranges := [][2]int{{l, end}}
	if !subSmall {
		ranges = [][2]int{{0, l}, {end, bp.size}}
	}
	posStart, posEdges, ends := bp.posStart, bp.posEdges, r.pTo
	pg := &r.fwdG
	if !forward {
		posStart, posEdges, ends = bp.inPosStart, bp.inPosEdges, r.pFrom
		pg = &r.revG
	}
	// Backward, pred[v] is the edge entering the far side that v's route
	// starts from.
	// Seed the distances first and heap the seeded pieces once (no stale
	// entries; the order of settling is the same).
	for _, rg := range ranges {
		for _, i := range posEdges[posStart[rg[0]]:posStart[rg[1]]] {
			v := ends[i]
			if v == skip {
				continue
			}
			switch w := r.w[i]; {
			case bound != unreached && w >= bound:
				// Routes costing bound or more are not looked for.
			case r.dist[v] == unreached:
				r.touched = append(r.touched, v)
				r.dist[v], r.pred[v] = w, i
			case w < r.dist[v]:
				r.dist[v], r.pred[v] = w, i
			}
		}
	}
	for _, v := range r.touched {
		r.heap = append(r.heap, pieceItem{r.dist[v], v})
	}
	r.heap.init()
	best, bestI := unreached, int32(-1)
	for len(r.heap) > 0 {
		it := r.heap.pop()
		u := it.piece
		if r.settled[u] || it.d != r.dist[u] {
			continue
		}
		if (bound != unreached && it.d >= bound) || (best != unreached && it.d >= best) {
			break
		}
		r.settled[u] = true
		// u's cheapest edge to the far side (forward) or from the near side.
		var list []int32
		if forward {
			if j := r.inSlot[u]; j >= 0 {
				list = bp.inNbEdges[bp.inNbStart[j]:bp.inNbStart[j+1]]
			}
		} else if j := bp.outSlot[u]; j >= 0 {
			list = bp.nbEdges[bp.nbStart[j]:bp.nbStart[j+1]]
		}
		for _, i := range list {
			var ok bool
			if forward {
				ok = inSub(r.to[i]) != fromSub // enters the far side
			} else {
				ok = inSub(r.from[i]) == fromSub // leaves the near side
			}
			if !ok {
				continue
			}
			val := sat(it.d, r.w[i])
			if best == unreached || val < best {
				best, bestI = val, i
				if !forward {
					bestI = r.pred[u]
				}
			}
			break
		}
		// Pieces at bound or best or more would never be settled: they are
		// not offered.
		limit := bound
		if best != unreached && (limit == unreached || best < limit) {
			limit = best
		}
		// (The costs are read in order, the pieces at random: the limit
		// is tested first.)
		for c := pg.start[u]; c < pg.start[u+1]; c++ {
			nd := sat(it.d, pg.w[c])
			if limit != unreached && nd >= limit {
				continue
			}
			v := pg.to[c]
			if v == p || v == skip || r.settled[v] {
				continue
			}
			if r.dist[v] == unreached {
				r.touched = append(r.touched, v)
			} else if nd >= r.dist[v] {
				continue
			}
			r.dist[v], r.pred[v] = nd, r.pred[u]
			r.heap.push(pieceItem{nd, v})
		}
	}
	if best != unreached && bound != unreached && best >= bound {
		return unreached, -1
	}
	return best, bestI
}

// splitHub serves the splits of a piece p without side tables: the hub is
// the piece with the most neighbouring pieces besides p. For the nodes of p
// in depth-first order it holds the cheapest route from each node to the
// hub (out: an edge leaving p, then a route avoiding p) and from the hub
// to each node (in, with the edge entering p), minimised over subtrees
// (sub), earlier positions (pre) and later ones (suf).
type splitHub struct {
	piece                     int32
	outSub, outPre, outSuf    []int64
	inSub, inPre, inSuf       []int64
	inSubBy, inPreBy, inSufBy []int32
}

// splitHub returns the splitHub of piece p (nodes euler[base:
// base+size]) with the other piece that has the most neighbouring pieces
// as its hub (piece -1 when there is no other piece).
func (r *ranger) splitHub(p, base int32, size int) *splitHub {
	c := r.hubPieces(hubRule{max: 1}, p)
	if len(c) == 0 {
		return &splitHub{piece: -1}
	}
	return r.newSplitHub(p, base, size, c[0])
}

// newSplitHub builds the splitHub of piece p (nodes euler[base:base+size])
// with hub c: two searches and O(size + edges of p).
func (r *ranger) newSplitHub(p, base int32, size int, c int32) *splitHub {
	g := r.g
	h := &splitHub{piece: c}
	toHub := r.avoidDist(r.hubTree(h.piece, true), p, r.avoidBuf[0])
	fromHub := r.avoidDist(r.hubTree(h.piece, false), p, r.avoidBuf[1])
	r.avoidBuf[0], r.avoidBuf[1] = toHub, fromHub
	none := func(n int) ([]int64, []int32) {
		w, by := make([]int64, n), make([]int32, n)
		for i := range by {
			w[i], by[i] = unreached, -1
		}
		return w, by
	}
	var outBy []int32
	h.outSub, outBy = none(size)
	h.inSub, h.inSubBy = none(size)
	for i := r.start[p]; i < r.start[p+1]; i++ {
		if d := toHub[r.pTo[i]]; d != unreached || r.pTo[i] == h.piece {
			if r.pTo[i] == h.piece {
				d = 0
			}
			c := sat(r.w[i], d)
			if q := r.tin[r.from[i]] - base; better(c, i, h.outSub[q], outBy[q]) {
				h.outSub[q], outBy[q] = c, i
			}
		}
	}
	for _, i := range r.redges[r.rstart[p]:r.rstart[p+1]] {
		if d := fromHub[r.pFrom[i]]; d != unreached || r.pFrom[i] == h.piece {
			if r.pFrom[i] == h.piece {
				d = 0
			}
			c := sat(d, r.w[i])
			if q := r.tin[r.to[i]] - base; better(c, i, h.inSub[q], h.inSubBy[q]) {
				h.inSub[q], h.inSubBy[q] = c, i
			}
		}
	}
	var outPreBy, outSufBy []int32
	h.outPre, outPreBy = none(size + 1)
	h.outSuf, outSufBy = none(size + 1)
	h.inPre, h.inPreBy = none(size + 1)
	h.inSuf, h.inSufBy = none(size + 1)
	for q := 0; q < size; q++ {
		minRow(h.outPre[q+1:q+2], outPreBy[q+1:q+2], h.outPre[q:q+1], outPreBy[q:q+1], h.outSub[q:q+1], outBy[q:q+1])
		minRow(h.inPre[q+1:q+2], h.inPreBy[q+1:q+2], h.inPre[q:q+1], h.inPreBy[q:q+1], h.inSub[q:q+1], h.inSubBy[q:q+1])
	}
	for q := size - 1; q >= 0; q-- {
		minRow(h.outSuf[q:q+1], outSufBy[q:q+1], h.outSuf[q+1:q+2], outSufBy[q+1:q+2], h.outSub[q:q+1], outBy[q:q+1])
		minRow(h.inSuf[q:q+1], h.inSufBy[q:q+1], h.inSuf[q+1:q+2], h.inSufBy[q+1:q+2], h.inSub[q:q+1], h.inSubBy[q:q+1])
	}
	for q := size - 1; q >= 1; q-- {
		v := r.euler[int(base)+q]
		u := r.tin[g.other(int(g.parentArc[v]), v)] - base
		minRow(h.outSub[u:u+1], outBy[u:u+1], h.outSub[u:u+1], outBy[u:u+1], h.outSub[q:q+1], outBy[q:q+1])
		minRow(h.inSub[u:u+1], h.inSubBy[u:u+1], h.inSub[u:u+1], h.inSubBy[u:u+1], h.inSub[q:q+1], h.inSubBy[q:q+1])
	}
	return h
}

// route returns the cheapest route through the hub from the subtree of
// the node at position l (ending before end; fromSub) or from the rest of
// the piece, to the other side, with the edge entering the far side
// (unreached, -1: none).
func (h *splitHub) route(l, end int, fromSub bool) (int64, int32) {
	if h.piece < 0 {
		return unreached, -1
	}
	pick := func(sub, pre, suf []int64, subBy, preBy, sufBy []int32, subtree bool) (int64, int32) {
		if subtree {
			if subBy != nil {
				return sub[l], subBy[l]
			}
			return sub[l], 0
		}
		a, b := pre[l], suf[end]
		var ai, bi int32
		if preBy != nil {
			ai, bi = preBy[l], sufBy[end]
		}
		if a == unreached || (b != unreached && (b < a || (b == a && bi < ai))) {
			return b, bi
		}
		return a, ai
	}
	o, _ := pick(h.outSub, h.outPre, h.outSuf, nil, nil, nil, fromSub)
	in, by := pick(h.inSub, h.inPre, h.inSuf, h.inSubBy, h.inPreBy, h.inSufBy, !fromSub)
	if o == unreached || in == unreached {
		return unreached, -1
	}
	return sat(o, in), by
}
