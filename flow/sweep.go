package flow

import "slices"

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
