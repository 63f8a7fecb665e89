package dual

// A split piece p without side tables, or with many cuts, bounds its
// searches through a hub c (splitHub): it needs the distances from c and
// to c on routes that avoid p. For nearly every p the hub is the same
// piece (the one with the most neighbouring pieces; the second one for
// that piece itself), so the two searches from c are made once, without
// leaving anything out, and kept with their trees of cheapest routes
// (hubTree). The distances avoiding p then differ from them only in the
// subtree of p in the tree (a route outside it does not pass p), and only
// those pieces are searched again (avoidDist). Another solver's optimum
// of sparse transportation with 10^6 lanes has 364 such pieces among
// 40,000; each made two searches over all of them.

// hubTree is a search from or to piece src over all pieces (nothing left
// out): dist as routesFrom gives it, and its tree of cheapest routes in
// preorder (order), with tin[v] v's position in order (-1: unreached) and
// the subtree of v at order[tin[v]:tout[v]].
type hubTree struct {
	src       int32
	reverse   bool
	dist      []int64
	order     []int32
	tin, tout []int32
}

// hubTree returns the kept search from (reverse: to) piece src, making it
// on first use. O((k + merged edges) log k) once, then O(1).
func (r *ranger) hubTree(src int32, reverse bool) *hubTree {
	for _, t := range r.hubTrees {
		if t.src == src && t.reverse == reverse {
			return t
		}
	}
	dist, pred := r.routesFrom(src, reverse, -1, true)
	k := int32(r.k)
	// The parent of v is the piece at the other end of the edge that
	// reached it: its tail forward, its head in reverse.
	parent := make([]int32, k)
	cnt := make([]int32, k+1)
	for v := int32(0); v < k; v++ {
		parent[v] = -1
		if e := pred[v]; e >= 0 {
			if reverse {
				parent[v] = r.pTo[e]
			} else {
				parent[v] = r.pFrom[e]
			}
			cnt[parent[v]+1]++
		}
	}
	for v := int32(0); v < k; v++ {
		cnt[v+1] += cnt[v]
	}
	child := make([]int32, cnt[k])
	fill := append([]int32(nil), cnt[:k]...)
	for v := int32(0); v < k; v++ {
		if p := parent[v]; p >= 0 {
			child[fill[p]] = v
			fill[p]++
		}
	}
	t := &hubTree{src: src, reverse: reverse, dist: dist, tin: make([]int32, k), tout: make([]int32, k)}
	for v := range t.tin {
		t.tin[v], t.tout[v] = -1, -1
	}
	// Preorder by an explicit stack; a piece's subtree ends where the
	// walk next leaves it (tout set when its entry is popped the second
	// time).
	type entry struct {
		v    int32
		done bool
	}
	stack := []entry{{src, false}}
	for len(stack) > 0 {
		e := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		if e.done {
			t.tout[e.v] = int32(len(t.order))
			continue
		}
		t.tin[e.v] = int32(len(t.order))
		t.order = append(t.order, e.v)
		stack = append(stack, entry{e.v, true})
		for i := cnt[e.v+1] - 1; i >= cnt[e.v]; i-- {
			stack = append(stack, entry{child[i], false})
		}
	}
	r.hubTrees = append(r.hubTrees, t)
	return t
}

// avoidDist returns what allDist(t.src, t.reverse, skip) returns, from the
// kept search t: its distances outside the subtree of skip, and a search
// over that subtree alone, started from the edges that enter it from the
// rest (skip itself is left out, so unreached). The result is written to
// buf when it is large enough (the caller's scratch). O(s + edges at the
// subtree + s log s) for a subtree of s pieces, plus a copy of k
// distances.
func (r *ranger) avoidDist(t *hubTree, skip int32, buf []int64) []int64 {
	d := append(buf[:0], t.dist...)
	if skip < 0 || t.tin[skip] < 0 {
		return d
	}
	r.searches++
	r.resetSearch()
	lo, hi := t.tin[skip], t.tout[skip]
	inSub := func(v int32) bool { x := t.tin[v]; return x >= lo && x < hi }
	sub := t.order[lo:hi]
	for _, x := range sub {
		d[x] = unreached
	}
	// in lists, per piece, the pieces with an edge to it (forward) or
	// from it (reverse); out the other way round.
	in, out := &r.revG, &r.fwdG
	if t.reverse {
		in, out = out, in
	}
	for _, x := range sub[1:] {
		best := unreached
		for c := in.start[x]; c < in.start[x+1]; c++ {
			u := in.to[c]
			if inSub(u) || t.dist[u] == unreached {
				continue
			}
			if nd := sat(t.dist[u], in.w[c]); best == unreached || nd < best {
				best = nd
			}
		}
		if best != unreached {
			d[x] = best
			r.heap.push(pieceItem{best, x})
		}
	}
	for len(r.heap) > 0 {
		it := r.heap.pop()
		u := it.piece
		if r.settled[u] || it.d != d[u] {
			continue
		}
		r.settled[u] = true
		r.touched = append(r.touched, u)
		for c := out.start[u]; c < out.start[u+1]; c++ {
			v := out.to[c]
			if v == skip || !inSub(v) || r.settled[v] {
				continue
			}
			if nd := sat(it.d, out.w[c]); d[v] == unreached || nd < d[v] {
				d[v] = nd
				r.heap.push(pieceItem{nd, v})
			}
		}
	}
	return d
}
