package dual

import (
	"fmt"

	"lanecert/flow"
)

// interArc is a sign rule between two pieces: offset(to) <= offset(from) + w.
type interArc struct {
	from, to int32
	w        int64
	arc      int32
	forward  bool // the residual move this rule stands for
}

// bellmanFord finds offsets for the pieces that satisfy every rule, or a
// negative cycle of rules, expanded into a closed walk of steps through the
// pieces' forests. It is the FIFO Bellman-Ford method from a virtual source
// joined to every piece at cost 0: O(k·r) at worst for k pieces and r rules,
// usually far less.
func (g *graph) bellmanFord(rules []interArc) ([]int64, []Step, error) {
	k := g.pieces
	start := make([]int32, k+1)
	for _, r := range rules {
		start[r.from+1]++
	}
	for i := 0; i < k; i++ {
		start[i+1] += start[i]
	}
	order := make([]int32, len(rules))
	pos := append([]int32(nil), start[:k]...)
	for i, r := range rules {
		order[pos[r.from]] = int32(i)
		pos[r.from]++
	}
	off := make([]int64, k)
	pred := make([]int32, k) // rule index, -1 none
	length := make([]int32, k)
	inQ := make([]bool, k)
	queue := make([]int32, 0, k)
	for c := 0; c < k; c++ {
		pred[c] = -1
		queue = append(queue, int32(c))
		inQ[c] = true
	}
	for head := 0; head < len(queue); head++ {
		u := queue[head]
		inQ[u] = false
		for _, ri := range order[start[u]:start[u+1]] {
			r := &rules[ri]
			nd, err := flow.AddChecked(off[u], r.w)
			if err != nil {
				return nil, nil, fmt.Errorf("dual: potentials %w", err)
			}
			if nd >= off[r.to] {
				continue
			}
			off[r.to], pred[r.to], length[r.to] = nd, ri, length[u]+1
			if int(length[r.to]) >= k {
				if cyc := g.predCycle(rules, pred, r.to, k); cyc != nil {
					return nil, cyc, nil
				}
			}
			if !inQ[r.to] {
				inQ[r.to] = true
				queue = append(queue, r.to)
			}
		}
		if head > 1<<20 && head*2 > len(queue) {
			// Compact the consumed part of the queue.
			queue = append(queue[:0], queue[head+1:]...)
			head = -1
		}
	}
	return off, nil, nil
}

// predCycle looks for a cycle in the predecessor rules reached from piece v
// and returns it as a closed walk of steps, or nil.
func (g *graph) predCycle(rules []interArc, pred []int32, v int32, k int) []Step {
	mark := map[int32]bool{}
	for i := 0; i <= k; i++ {
		if pred[v] < 0 {
			return nil
		}
		if mark[v] {
			break
		}
		mark[v] = true
		v = rules[pred[v]].from
	}
	// v is on the cycle: collect its rules backwards.
	var cyc []int32
	for u := v; ; {
		ri := pred[u]
		cyc = append(cyc, ri)
		u = rules[ri].from
		if u == v {
			break
		}
	}
	// Forward order: reverse, then join consecutive rules through the forest.
	for i, j := 0, len(cyc)-1; i < j; i, j = i+1, j-1 {
		cyc[i], cyc[j] = cyc[j], cyc[i]
	}
	var walk []Step
	for i, ri := range cyc {
		r := rules[ri]
		e := int(r.arc)
		walk = append(walk, g.step(e, r.forward))
		_, to := g.ends(g.step(e, r.forward))
		nr := rules[cyc[(i+1)%len(cyc)]]
		from, _ := g.ends(g.step(int(nr.arc), nr.forward))
		walk = append(walk, g.treePath(to, from)...)
	}
	return walk
}
