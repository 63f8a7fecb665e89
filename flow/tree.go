package flow

import "slices"

// setTree makes tree (nNodes arcs forming a spanning tree of the nodes and
// R, artificial arcs directed to R with zero flow) the current tree:
// states, parent, pred, up, thread, rthread, size and last, by a
// depth-first search from R taking arcs in list order. Phase-two costs.
// O(|V|).
func (s *simplex) setTree(tree []int32) {
	r := s.root
	for _, a := range tree {
		s.state[a] = stateTree
	}
	s.treeAdj.build(s, tree, s.nNodes+1)
	s.parent[r] = -1
	order, stack := s.walk(s.orderBuf[:0], s.stackBuf[:0], r, tree, &s.treeAdj)
	s.orderBuf, s.stackBuf = order, stack
	s.setThreads(order)
}

// walk appends to order the nodes of the tree below v (v first) in the
// preorder of a depth-first search over g, the adjacency of arcs, taking
// each node's arcs in list order, and sets their parent, pred and up; v's
// parent must be set. stack is scratch. O(size of the subtree). Arcs that
// close a cycle would make the walk endless: it panics (an internal error)
// once order holds more entries than there are nodes.
func (s *simplex) walk(order, stack []int32, v int32, arcs []int32, g *adjacency) ([]int32, []int32) {
	start, pos, ends := g.start, g.pos, g.ends
	stack = append(stack, v)
	for len(stack) > 0 {
		v := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		if len(order) == len(s.parent) {
			panic("flow: internal error: the arcs of a tree close a cycle")
		}
		order = append(order, v)
		pv := s.parent[v]
		// Push children in reverse so they are visited in arc order.
		for j := start[v+1] - 1; j >= start[v]; j-- {
			i := pos[j]
			t, h := ends[2*i], ends[2*i+1]
			w := t
			if w == v {
				w = h
			}
			if w == pv {
				continue // (a tree has no parallel arcs)
			}
			s.parent[w], s.pred[w], s.up[w] = v, arcs[i], t == w
			stack = append(stack, w)
		}
	}
	return order, stack
}

// setForestTree sets the tree to the forest (g: its adjacency over the
// nodes but R) with each part hung from R by the artificial arc of its
// part root (isRoot, one node per part): the tree setTree builds from the
// forest's arcs followed by those artificial arcs in node order, without
// listing them. O(|V|).
func (s *simplex) setForestTree(forest []int32, g *adjacency, isRoot func(int32) bool) {
	r := s.root
	for _, a := range forest {
		s.state[a] = stateTree
	}
	order, stack := append(s.orderBuf[:0], r), s.stackBuf[:0]
	for v := int32(0); v < int32(s.nNodes); v++ {
		if !isRoot(v) {
			continue
		}
		a := int32(s.artStart) + v
		s.state[a] = stateTree
		t, _ := s.ends(a)
		s.parent[v], s.pred[v], s.up[v] = r, a, t == v
		order, stack = s.walk(order, stack, v, forest, g)
	}
	s.orderBuf, s.stackBuf = order, stack
	s.setThreads(order)
}

// setThreads sets thread, rthread, size and last from the preorder of the
// tree (parent set), which starts at R. O(|V|).
func (s *simplex) setThreads(order []int32) {
	thread, rthread, size, parent, last := s.thread, s.rthread, s.size, s.parent, s.last
	prev := order[len(order)-1]
	for _, v := range order {
		size[v] = 1
		thread[prev], rthread[v] = v, prev
		prev = v
	}
	for i := len(order) - 1; i > 0; i-- {
		v := order[i]
		size[parent[v]] += size[v]
	}
	for i, v := range order {
		last[v] = order[i+int(size[v])-1]
	}
	s.treeDone()
}

// treeDone finishes setting a tree for phase two: R has no parent, the
// artificial arcs cost 0 and those outside the tree stay out, and the
// lanes cost their rates.
func (s *simplex) treeDone() {
	r := s.root
	s.parent[r], s.pred[r] = -1, -1
	s.treeSet = true
	s.artFixed = true
	s.cost = s.rate
	for a := s.artStart; a < s.artEnd; a++ {
		s.xcost[a-s.m] = 0
	}
}

// adjacency is a compressed undirected adjacency of a list of arcs over
// nodes 0..n-1: the arcs at node v are listed at pos[start[v]:start[v+1]]
// by their position in the list (each arc at both ends, in list order),
// and the ends of the list's i-th arc are ends[2i] (tail) and ends[2i+1]
// (head), read once from the arc arrays (tree and forest arcs lie anywhere
// in them).
type adjacency struct {
	start, pos, ends []int32
}

// build makes g the adjacency of arcs over nodes 0..n-1, reusing g's
// arrays when they are large enough. O(n + len(arcs)).
func (g *adjacency) build(s *simplex, arcs []int32, n int) {
	ends := slices.Grow(g.ends[:0], 2*len(arcs))[:2*len(arcs)]
	start := slices.Grow(g.start[:0], n+1)[:n+1]
	clear(start)
	for i, a := range arcs {
		t, h := s.ends(a)
		ends[2*i], ends[2*i+1] = t, h
		start[t+1]++
		start[h+1]++
	}
	for v := 0; v < n; v++ {
		start[v+1] += start[v]
	}
	pos := slices.Grow(g.pos[:0], int(start[n]))[:start[n]]
	// Fill each node's range from its end backwards (start[v+1] ends
	// there), so that each range keeps list order.
	for i := len(arcs) - 1; i >= 0; i-- {
		t, h := ends[2*i], ends[2*i+1]
		start[t+1]--
		pos[start[t+1]] = int32(i)
		start[h+1]--
		pos[start[h+1]] = int32(i)
	}
	// Now start[v+1] is where v's arcs begin: shift back.
	copy(start[:n], start[1:])
	start[n] = int32(len(pos))
	g.start, g.pos, g.ends = start, pos, ends
}

// undirected returns the arcs as a compressed undirected adjacency over
// nodes 0..n-1 by arc: the arcs at node v are adj[start[v]:start[v+1]],
// each arc listed at both ends. O(n + len(arcs)).
func (s *simplex) undirected(arcs []int32, n int) (start, adj []int32) {
	var g adjacency
	g.build(s, arcs, n)
	for j, i := range g.pos {
		g.pos[j] = arcs[i]
	}
	return g.start, g.pos
}
