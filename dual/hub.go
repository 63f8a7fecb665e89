package dual

import (
	"fmt"
	"sort"

	"lanecert/flow"
)

// minHubSources is the number of source pieces from which searching via a
// hub (two extra full searches) pays.
const minHubSources = 8

// hubDist holds the distances to and from a hub: the piece with the most
// neighbouring pieces. Every route through the hub from a to b costs at
// least to[a] + from[b], and that route exists, so the distance from a to
// b is the lesser of that and the distance with the hub left out.
type hubDist struct {
	piece    int32
	to, from []int64
}

func (r *ranger) newHub() (*hubDist, error) {
	h := &hubDist{piece: -1}
	most := int32(-1)
	for c := int32(0); int(c) < r.k; c++ {
		if d := r.fwdG.start[c+1] - r.fwdG.start[c] + r.revG.start[c+1] - r.revG.start[c]; d > most {
			h.piece, most = c, d
		}
	}
	var err error
	if h.to, err = r.allDist(h.piece, true, -1); err != nil {
		return nil, err
	}
	if h.from, err = r.allDist(h.piece, false, -1); err != nil {
		return nil, err
	}
	return h, nil
}

// allDist returns the distances from piece src to every piece (reverse: to
// src from every piece) on routes avoiding piece skip (-1: none), unreached
// where none. O((k + merged edges) log k).
func (r *ranger) allDist(src int32, reverse bool, skip int32) ([]int64, error) {
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
			if pg.to[c] == skip {
				continue
			}
			if err := r.offer(pg.to[c], it.d, pg.w[c]); err != nil {
				return nil, err
			}
		}
	}
	return append([]int64(nil), r.dist[:r.k]...), nil
}

// resetSearch clears the state of the last search.
func (r *ranger) resetSearch() {
	for _, v := range r.touched {
		r.dist[v], r.settled[v], r.pred[v] = unreached, false, -1
	}
	r.touched = r.touched[:0]
	r.heap = r.heap[:0]
}

// offer relaxes piece v to distance d+w, without a predecessor.
func (r *ranger) offer(v int32, d, w int64) error {
	return r.offerFrom(v, d, w, -1)
}

// offerFrom relaxes piece v to distance d+w, recording tag in pred[v] when
// it improves.
func (r *ranger) offerFrom(v int32, d, w int64, tag int32) error {
	if r.settled[v] {
		return nil
	}
	nd, err := flow.AddChecked(d, w)
	if err != nil {
		return fmt.Errorf("dual: route cost %w", err)
	}
	if r.dist[v] == unreached {
		r.touched = append(r.touched, v)
	} else if nd >= r.dist[v] {
		return nil
	}
	r.dist[v], r.pred[v] = nd, tag
	r.heap.push(pieceItem{nd, v})
	return nil
}

// hubSearch sets r.dist[t] for each target piece t to the distance from
// piece src (no predecessors): the lesser of the route through the hub and
// a search from src with the hub left out, stopped once every target not
// yet settled has a route through the hub no dearer than the search's
// frontier.
func (r *ranger) hubSearch(h *hubDist, src int32, targets []int32) error {
	r.searches++
	r.resetSearch()
	r.stamp++
	// via[t]: the cost through the hub (unreached: none), in r.pred's place
	// kept in a local list sorted by decreasing cost, unreachable first.
	type goal struct {
		piece int32
		via   int64
	}
	var goals []goal
	for _, t := range targets {
		if r.want[t] == r.stamp || !r.reaches(src, t) {
			continue
		}
		r.want[t] = r.stamp
		via := unreached
		if src == h.piece {
			via = h.from[t]
		} else if t == h.piece {
			via = h.to[src]
		} else if h.to[src] != unreached && h.from[t] != unreached {
			var err error
			if via, err = flow.AddChecked(h.to[src], h.from[t]); err != nil {
				return fmt.Errorf("dual: route cost %w", err)
			}
		}
		goals = append(goals, goal{t, via})
	}
	sort.Slice(goals, func(i, j int) bool {
		a, b := goals[i], goals[j]
		if (a.via == unreached) != (b.via == unreached) {
			return a.via == unreached
		}
		return a.via > b.via || (a.via == b.via && a.piece < b.piece)
	})
	if src != h.piece {
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
			break // every goal left is reached as cheaply through the hub
		}
		r.settled[u] = true
		for c := r.fwdG.start[u]; c < r.fwdG.start[u+1]; c++ {
			if v := r.fwdG.to[c]; v != h.piece {
				if err := r.offer(v, it.d, r.fwdG.w[c]); err != nil {
					return err
				}
			}
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
		}
	}
	return nil
}

// setDist sets a piece's distance after a search.
func (r *ranger) setDist(v int32, d int64) {
	if r.dist[v] == unreached {
		r.touched = append(r.touched, v)
	}
	r.dist[v], r.pred[v] = d, -1
}

// routeUses reports whether the route found to piece v uses arc e.
func (r *ranger) routeUses(v int32, e int32) bool {
	for steps := 0; v >= 0 && r.pred[v] >= 0 && steps <= r.k+1; steps++ {
		i := r.pred[v]
		if r.arcOf[i] == e {
			return true
		}
		v = r.g.comp[r.from[i]]
	}
	return false
}
