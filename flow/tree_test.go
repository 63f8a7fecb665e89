package flow

import (
	"fmt"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"lanecert/internal/longrun"
)

// randomLanes returns a network of nv nodes and m random lanes (self-loops
// and parallel lanes included), no supply: enough for the tree builders.
func randomLanes(rng *rand.Rand, nv, m int) *Network {
	n := &Network{Nodes: make([]string, nv), Supply: make([]int64, nv)}
	for v := range n.Nodes {
		n.Nodes[v] = fmt.Sprint("n", v)
	}
	for range m {
		n.Tail = append(n.Tail, NodeID(rng.IntN(nv)))
		n.Head = append(n.Head, NodeID(rng.IntN(nv)))
		n.Rate = append(n.Rate, rng.Int64N(21)-10)
		n.Lower = append(n.Lower, 0)
		n.Upper = append(n.Upper, 1+rng.Int64N(9))
	}
	return n
}

// TestAdjacency compares the compressed adjacency, by position (built
// into reused arrays) and by arc (undirected), with a direct listing:
// node v's arcs are those with an end at v in list order, a self-loop
// twice; and each position's cached ends with the arc's. (Definition of
// the structure; no outside source needed.)
func TestAdjacency(t *testing.T) {
	rng := rand.New(rand.NewPCG(longrun.Seed(t, 7), 1))
	var g adjacency
	for trial := range longrun.Cases(t, 200) {
		nv := 1 + rng.IntN(12)
		n := randomLanes(rng, nv, rng.IntN(30))
		s, err := newSimplex(n, false, 0)
		if err != nil {
			t.Fatal(err)
		}
		var arcs []int32
		for a := range s.na {
			if rng.IntN(3) > 0 {
				arcs = append(arcs, int32(a))
			}
		}
		rng.Shuffle(len(arcs), func(i, j int) { arcs[i], arcs[j] = arcs[j], arcs[i] })
		nt := s.nNodes + 1
		g.build(s, arcs, nt)
		fs, fa := s.undirected(arcs, nt)
		for i, a := range arcs {
			if tl, hd := s.ends(a); g.ends[2*i] != tl || g.ends[2*i+1] != hd {
				t.Fatalf("trial %d: ends of position %d are %d, %d; arc %d runs %d->%d", trial, i, g.ends[2*i], g.ends[2*i+1], a, tl, hd)
			}
		}
		for v := range nt {
			var want []int32
			for _, a := range arcs {
				tl, hd := s.ends(a)
				if tl == int32(v) {
					want = append(want, a)
				}
				if hd == int32(v) {
					want = append(want, a)
				}
			}
			var got []int32
			for _, i := range g.pos[g.start[v]:g.start[v+1]] {
				got = append(got, arcs[i])
			}
			if !slices.Equal(got, want) {
				t.Fatalf("trial %d node %d: positions give arcs %v, want %v", trial, v, got, want)
			}
			if got := fa[fs[v]:fs[v+1]]; !slices.Equal(got, want) {
				t.Fatalf("trial %d node %d: undirected gives %v, want %v", trial, v, got, want)
			}
		}
		if len(g.start) != nt+1 || int(g.start[nt]) != len(g.pos) || len(g.pos) != 2*len(arcs) || len(fs) != nt+1 || len(fa) != len(g.pos) {
			t.Fatalf("trial %d: %d starts, end %d, %d entries for %d arcs", trial, len(g.start), g.start[nt], len(g.pos), len(arcs))
		}
	}
}

// TestSetForestTree checks that setForestTree builds the same tree as
// setTree given the forest's arcs followed by the artificial arcs of the
// part roots, and that the tree is consistent (checkTree).
func TestSetForestTree(t *testing.T) {
	rng := rand.New(rand.NewPCG(longrun.Seed(t, 7), 2))
	for trial := range longrun.Cases(t, 300) {
		nv := 1 + rng.IntN(15)
		n := randomLanes(rng, nv, rng.IntN(40))
		a, err := newSimplex(n, trial%3 == 0, 0)
		if err != nil {
			t.Fatal(err)
		}
		b, _ := newSimplex(n, trial%3 == 0, 0)
		nn := a.nNodes
		// A random forest over the nodes but R (hold arcs included).
		uf := make([]int32, nn)
		for v := range uf {
			uf[v] = int32(v)
		}
		find := func(v int32) int32 {
			for uf[v] != v {
				v = uf[v]
			}
			return v
		}
		var forest []int32
		for _, e := range rng.Perm(a.artStart) {
			tl, hd := a.ends(int32(e))
			if x, y := find(tl), find(hd); x != y && rng.IntN(4) > 0 {
				uf[max(x, y)] = min(x, y)
				forest = append(forest, int32(e))
			}
		}
		isRoot := func(v int32) bool { return find(v) == v }
		var g adjacency
		g.build(a, forest, nn)
		a.setForestTree(forest, &g, isRoot)
		tree := slices.Clone(forest)
		for v := int32(0); v < int32(nn); v++ {
			if isRoot(v) {
				tree = append(tree, int32(b.artStart)+v)
			}
		}
		b.setTree(tree)
		for name, pair := range map[string][2][]int32{
			"parent": {a.parent, b.parent}, "pred": {a.pred, b.pred}, "thread": {a.thread, b.thread},
			"rthread": {a.rthread, b.rthread}, "size": {a.size, b.size}, "last": {a.last, b.last},
		} {
			if !slices.Equal(pair[0], pair[1]) {
				t.Fatalf("trial %d: %s %v, setTree gives %v", trial, name, pair[0], pair[1])
			}
		}
		if !slices.Equal(a.up, b.up) || !slices.Equal(a.state, b.state) {
			t.Fatalf("trial %d: up or state differ", trial)
		}
		if err := checkTree(a); err != nil {
			t.Fatalf("trial %d: %v", trial, err)
		}
		// Both share the walk: compare with a plain recursive preorder.
		wantParent, wantOrder := naivePreorder(a, tree)
		for v := range wantParent {
			if v != int(a.root) && a.parent[v] != wantParent[v] {
				t.Fatalf("trial %d: parent of %d is %d, want %d", trial, v, a.parent[v], wantParent[v])
			}
		}
		for i, v := range wantOrder {
			if got := a.thread[v]; got != wantOrder[(i+1)%len(wantOrder)] {
				t.Fatalf("trial %d: thread[%d] = %d, want %d", trial, v, got, wantOrder[(i+1)%len(wantOrder)])
			}
		}
	}
}

// TestSetTreeCycle gives setTree arcs that close a cycle (a triangle
// among three nodes, and the artificial arc of the first): the walk must
// stop with its internal-error panic instead of walking round the cycle
// without end.
func TestSetTreeCycle(t *testing.T) {
	n := &Network{Nodes: []string{"a", "b", "c"}, Supply: make([]int64, 3),
		Tail: []NodeID{0, 1, 2}, Head: []NodeID{1, 2, 0}, Rate: []int64{1, 1, 1},
		Lower: []int64{0, 0, 0}, Upper: []int64{5, 5, 5}}
	s, err := newSimplex(n, false, 0)
	if err != nil {
		t.Fatal(err)
	}
	tree := []int32{0, 1, 2, int32(s.artStart)}
	defer func() {
		r := recover()
		if r == nil {
			t.Fatal("setTree accepted arcs that close a cycle")
		}
		if msg, _ := r.(string); !strings.Contains(msg, "close a cycle") {
			t.Fatalf("setTree panicked with %v, want the cycle's internal error", r)
		}
	}()
	s.setTree(tree)
}

// naivePreorder returns each node's parent and the preorder of a
// depth-first search from R over the tree's arcs, each node's arcs taken
// in list order (the order setTree documents), by plain recursion over
// the whole list. O(|V|·len(tree)).
func naivePreorder(s *simplex, tree []int32) (parent, order []int32) {
	parent = make([]int32, s.nNodes+1)
	seen := make([]bool, s.nNodes+1)
	var visit func(v int32)
	visit = func(v int32) {
		seen[v] = true
		order = append(order, v)
		for _, a := range tree {
			tl, hd := s.ends(a)
			w := int32(-1)
			switch v {
			case tl:
				w = hd
			case hd:
				w = tl
			}
			if w >= 0 && !seen[w] {
				parent[w] = v
				visit(w)
			}
		}
	}
	visit(s.root)
	return parent, order
}

// checkTree checks the tree arrays against each other: the thread visits
// every node once starting at R, rthread is its inverse, each node's
// subtree (size nodes from it along the thread, ending at last) holds
// exactly the nodes whose parent chain reaches it, and pred joins each
// node to its parent with up telling the direction.
func checkTree(s *simplex) error {
	nt := s.nNodes + 1
	order := make([]int32, 0, nt)
	pos := make([]int, nt)
	v := s.root
	for range nt {
		pos[v] = len(order)
		order = append(order, v)
		if s.rthread[s.thread[v]] != v {
			return fmt.Errorf("rthread[thread[%d]] = %d", v, s.rthread[s.thread[v]])
		}
		v = s.thread[v]
	}
	if v != s.root {
		return fmt.Errorf("thread does not return to R after %d nodes", nt)
	}
	seen := make([]bool, nt)
	for _, v := range order {
		if seen[v] {
			return fmt.Errorf("node %d twice on the thread", v)
		}
		seen[v] = true
	}
	for _, v := range order {
		if v == s.root {
			continue
		}
		p := s.parent[v]
		tl, hd := s.ends(s.pred[v])
		if s.up[v] && (tl != v || hd != p) || !s.up[v] && (tl != p || hd != v) {
			return fmt.Errorf("pred of %d is %d->%d, parent %d, up %v", v, tl, hd, p, s.up[v])
		}
		if s.state[s.pred[v]] != stateTree {
			return fmt.Errorf("pred of %d not in the tree", v)
		}
	}
	for _, v := range order {
		k := int(s.size[v])
		if pos[v]+k > nt || order[pos[v]+k-1] != s.last[v] {
			return fmt.Errorf("size %d or last %d wrong at %d", k, s.last[v], v)
		}
		for _, w := range order[pos[v] : pos[v]+k] {
			u := w
			for u != v && u != s.root {
				u = s.parent[u]
			}
			if u != v {
				return fmt.Errorf("%d in the subtree of %d on the thread but not below it", w, v)
			}
		}
	}
	for _, w := range order {
		for u := w; u != s.root; {
			u = s.parent[u]
			if pos[w] < pos[u] || pos[w] >= pos[u]+int(s.size[u]) {
				return fmt.Errorf("%d below %d but outside its subtree on the thread", w, u)
			}
		}
	}
	return nil
}
