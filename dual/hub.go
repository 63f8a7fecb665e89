package dual

import (
	"cmp"
	"slices"
	"sort"
)

// minHubSources is the number of source pieces from which searching via
// hubs (two extra full searches each) pays.
const minHubSources = 8

// hubRule says which pieces become hubs: the piece with the most
// neighbouring pieces, then the next ones in that order while they have at
// least 1/share of the first one's neighbours and at least minDegree, up
// to max hubs in all (0: none, every search runs to its targets).
type hubRule struct {
	max, share, minDegree int32
}

// defaultHubs is the rule Ranges uses.
func defaultHubs() hubRule { return hubRule{max: 8, share: 8, minDegree: 64} }

// hubDist holds the distances to and from the hubs: the pieces with the
// most neighbouring pieces. Every route from piece a to piece b through
// hub h costs at least to[h][a] + from[h][b], and that route exists, so
// the distance from a to b is the least of those sums and of the distance
// with every hub left out.
//
// The pieces of a degenerate optimum are often one or two large pieces
// (most of the lanes in use) and thousands of single nodes around them.
// With one hub, the searches from the nodes next to the second large
// piece were bounded only through the first and ran 30 times as long
// (general_1e5 solved with blocks of twice the usual size); every large
// piece is therefore a hub.
//
// Each hub also keeps its two trees of cheapest routes: toPred[h][v] is the
// first edge (an index into ranger.from) of v's route to the hub,
// fromPred[h][v] the last edge of the hub's route to v (-1 at the hub and
// where unreached), so that the lane a route through a hub enters its
// target by can be named (firstLane).
type hubDist struct {
	pieces           []int32
	index            []int32 // per piece: its hub number, or -1
	to, from         [][]int64
	toPred, fromPred [][]int32
	usable           []bool // per hub, in the current search
}

// newHub chooses the hubs and searches from and to each. O(h·(k + merged
// edges) log k) for h hubs.
func (r *ranger) newHub() *hubDist {
	h := &hubDist{index: make([]int32, r.k)}
	for c := range h.index {
		h.index[c] = -1
	}
	for _, c := range r.hubPieces(r.hubs, -1) {
		to, toPred := r.allDistPred(c, true)
		from, fromPred := r.allDistPred(c, false)
		h.index[c] = int32(len(h.pieces))
		h.pieces = append(h.pieces, c)
		h.to, h.toPred = append(h.to, to), append(h.toPred, toPred)
		h.from, h.fromPred = append(h.from, from), append(h.fromPred, fromPred)
	}
	r.hub = h
	return h
}

// hubPieces returns the hubs rule chooses, leaving out piece skip (-1:
// none): at most rule.max pieces, most neighbouring pieces first (ties:
// least number). O(k log k).
func (r *ranger) hubPieces(rule hubRule, skip int32) []int32 {
	if rule.max <= 0 {
		return nil
	}
	if rule.max == 1 {
		// The first of the order below, without sorting (a split of
		// every piece with many cuts asks for one).
		best, most := int32(-1), int32(-1)
		for c := int32(0); int(c) < r.k; c++ {
			if d := r.fwdG.start[c+1] - r.fwdG.start[c] + r.revG.start[c+1] - r.revG.start[c]; c != skip && d > most {
				best, most = c, d
			}
		}
		if best < 0 {
			return nil
		}
		return []int32{best}
	}
	deg := make([]int32, r.k)
	order := make([]int32, 0, r.k)
	for c := int32(0); int(c) < r.k; c++ {
		if c == skip {
			continue
		}
		deg[c] = r.fwdG.start[c+1] - r.fwdG.start[c] + r.revG.start[c+1] - r.revG.start[c]
		order = append(order, c)
	}
	slices.SortStableFunc(order, func(a, b int32) int { return cmp.Compare(deg[b], deg[a]) })
	var hubs []int32
	for i, c := range order {
		if i > 0 && (i == int(rule.max) || deg[c] < rule.minDegree || int64(rule.share)*int64(deg[c]) < int64(deg[order[0]])) {
			break
		}
		hubs = append(hubs, c)
	}
	return hubs
}

// allDist returns the distances from piece src to every piece (reverse: to
// src from every piece) on routes avoiding piece skip (-1: none), unreached
// where none. O((k + merged edges) log k).
func (r *ranger) allDist(src int32, reverse bool, skip int32) []int64 {
	d, _ := r.routesFrom(src, reverse, skip, false)
	return d
}

// allDistPred is allDist without a piece left out, also returning the
// tree of the routes found: per piece the edge by which the search reached
// it (the least numbered among equally cheap ones; -1 at src and where
// unreached). Forward, that is the last edge of the route from src;
// reverse, the first edge of the route to src.
func (r *ranger) allDistPred(src int32, reverse bool) ([]int64, []int32) {
	return r.routesFrom(src, reverse, -1, true)
}

// routesFrom is allDist, returning the tree of allDistPred too when
// withPred is set.
func (r *ranger) routesFrom(src int32, reverse bool, skip int32, withPred bool) ([]int64, []int32) {
	r.searches++
	r.resetSearch()
	pg := &r.fwdG
	if reverse {
		pg = &r.revG
	}
	r.dist[src] = 0
	r.touched = append(r.touched, src)
	r.heap.push(pieceItem{0, src})
	for len(r.heap) > 0 {
		it := r.heap.pop()
		u := it.piece
		if r.settled[u] || it.d != r.dist[u] {
			continue
		}
		r.settled[u] = true
		for c := pg.start[u]; c < pg.start[u+1]; c++ {
			v := pg.to[c]
			if v == skip || r.settled[v] {
				continue
			}
			nd := sat(it.d, pg.w[c])
			r.relax(v, nd, pg.rep[c])
		}
	}
	dist := append([]int64(nil), r.dist[:r.k]...)
	if !withPred {
		return dist, nil
	}
	return dist, append([]int32(nil), r.pred[:r.k]...)
}

// resetSearch clears the state of the last search.
func (r *ranger) resetSearch() {
	for _, v := range r.touched {
		r.dist[v], r.settled[v], r.pred[v], r.viaHub[v] = unreached, false, -1, -1
	}
	r.touched = r.touched[:0]
	r.heap = r.heap[:0]
}

// hubSearch sets r.dist[t] for each target piece t to the distance from
// piece src: the least of the routes through the hubs and of a search from
// src that leaves the hubs out, stopped once every target not yet settled
// has a route through a hub no dearer than the search's frontier. The
// route found to t is the search's (r.pred) or, when r.viaHub[t] >= 0, the
// route through that hub (firstLane reads either). A search from a hub is
// not needed: its distances are known.
func (r *ranger) hubSearch(h *hubDist, src int32, targets []int32) {
	r.searches++
	r.resetSearch()
	r.stamp++
	r.viaSrc = src
	type goal struct {
		piece int32
		via   int64 // the least cost through a hub (unreached: none)
		hub   int32
	}
	var goals []goal
	for _, t := range targets {
		if r.want[t] == r.stamp || !r.reaches(src, t) {
			continue
		}
		r.want[t] = r.stamp
		gl := goal{piece: t, via: unreached, hub: -1}
		for i, hp := range h.pieces {
			d := unreached
			switch {
			case src == hp:
				d = h.from[i][t]
			case t == hp:
				d = h.to[i][src]
			case h.to[i][src] != unreached && h.from[i][t] != unreached:
				d = sat(h.to[i][src], h.from[i][t])
			}
			if d != unreached && (gl.via == unreached || d < gl.via) {
				gl.via, gl.hub = d, int32(i)
			}
		}
		goals = append(goals, gl)
	}
	// Goals by decreasing cost through a hub, those without one first.
	sort.Slice(goals, func(i, j int) bool {
		a, b := goals[i], goals[j]
		if (a.via == unreached) != (b.via == unreached) {
			return a.via == unreached
		}
		return a.via > b.via || (a.via == b.via && a.piece < b.piece)
	})
	if h.index[src] < 0 {
		r.dist[src] = 0
		r.touched = append(r.touched, src)
		r.heap.push(pieceItem{0, src})
	}
	next := 0 // first goal not settled, in goals' order
	for len(r.heap) > 0 {
		for next < len(goals) && r.settled[goals[next].piece] {
			next++
		}
		if next == len(goals) {
			break
		}
		it := r.heap.pop()
		u := it.piece
		if r.settled[u] || it.d != r.dist[u] {
			continue
		}
		if v := goals[next].via; v != unreached && it.d >= v {
			break // every goal left is reached as cheaply through a hub
		}
		r.settled[u] = true
		for c := r.fwdG.start[u]; c < r.fwdG.start[u+1]; c++ {
			v := r.fwdG.to[c]
			if r.settled[v] || h.index[v] >= 0 {
				continue
			}
			nd := sat(it.d, r.fwdG.w[c])
			r.relax(v, nd, r.fwdG.rep[c])
		}
	}
	for _, gl := range goals {
		t := gl.piece
		if gl.via == unreached {
			if !r.settled[t] {
				r.setDist(t, unreached)
			}
			continue
		}
		if !r.settled[t] || gl.via < r.dist[t] {
			r.setDist(t, gl.via)
			r.viaHub[t] = gl.hub
		}
	}
}

// intoHub returns the last edge of the route from piece src to hub i (the
// edge entering the hub; -1 when src is the hub or cannot reach it).
func (r *ranger) intoHub(h *hubDist, i, src int32) int32 {
	last := int32(-1)
	for v, steps := src, 0; v != h.pieces[i] && steps <= r.k; steps++ {
		e := h.toPred[i][v]
		if e < 0 {
			return -1
		}
		last = e
		v = r.g.comp[r.to[e]]
	}
	return last
}

// setDist sets a piece's distance after a search.
func (r *ranger) setDist(v int32, d int64) {
	if r.dist[v] == unreached {
		r.touched = append(r.touched, v)
	}
	r.dist[v], r.pred[v], r.viaHub[v] = d, -1, -1
}
