package flow

import (
	"fmt"
	"io"
	"strings"

	"gonum.org/v1/gonum/graph"
	"gonum.org/v1/gonum/graph/encoding"
	"gonum.org/v1/gonum/graph/encoding/dot"
	"gonum.org/v1/gonum/graph/iterator"
)

// This file is flow's one adapter onto gonum's graph interfaces: a
// directed multigraph view of a Network's arrays, without copying them,
// used to write Graphviz DOT.

// Lane states of WriteDOT, each drawn in its own line style.
const (
	LaneUsed     = "used"     // 0 < flow < capacity: solid
	LaneUnused   = "unused"   // flow 0: dashed
	LaneFull     = "full"     // flow at capacity: bold
	LaneBreaking = "breaking" // breaks a rule (bounds, optimality): dotted, red
)

// laneStyle gives the DOT style attributes of a state; other states are
// drawn solid.
func laneStyle(state string) []encoding.Attribute {
	switch state {
	case LaneUnused:
		return []encoding.Attribute{{Key: "style", Value: "dashed"}}
	case LaneFull:
		return []encoding.Attribute{{Key: "style", Value: "bold"}}
	case LaneBreaking:
		return []encoding.Attribute{{Key: "style", Value: "dotted"}, {Key: "color", Value: "red"}}
	}
	return []encoding.Attribute{{Key: "style", Value: "solid"}}
}

// DefaultLaneState returns the state of lane a under the plan x: LaneUnused
// at flow 0, LaneFull at its capacity, else LaneUsed (a flow outside the
// bounds is LaneBreaking).
func DefaultLaneState(n *Network, x []int64) func(LaneID) string {
	return func(a LaneID) string {
		switch f := x[a]; {
		case f < n.Lower[a] || f > n.Upper[a]:
			return LaneBreaking
		case f == 0:
			return LaneUnused
		case f == n.Upper[a]:
			return LaneFull
		}
		return LaneUsed
	}
}

// WriteDOT writes n as a Graphviz digraph named "lanecert": one node per
// network node (its ID is its quoted name; its label adds the supply or
// the demand) and one edge per lane, parallel lanes and self-loops kept.
// A lane's label holds its id, its rate and, when x is not nil, its flow
// and state; its style follows the state (LaneUsed solid, LaneUnused
// dashed, LaneFull bold, LaneBreaking dotted red, others solid). state nil
// means DefaultLaneState(n, x) (or no state when x is nil). The output is
// ordered by node and lane id, so the same input gives the same bytes.
// It takes O(|V|+|E| log |E|) time and builds the text in memory.
func WriteDOT(w io.Writer, n *Network, x []int64, state func(LaneID) string) error {
	if x != nil && len(x) != n.NumLanes() {
		return fmt.Errorf("flow: %d quantities for %d lanes", len(x), n.NumLanes())
	}
	if state == nil && x != nil {
		state = DefaultLaneState(n, x)
	}
	g := &dotGraph{n: n, adj: BuildAdjacency(n), x: x, state: state}
	b, err := dot.MarshalMulti(g, "lanecert", "", "  ")
	if err != nil {
		return fmt.Errorf("flow: writing DOT: %w", err)
	}
	b = append(b, '\n')
	_, err = w.Write(b)
	return err
}

// dotGraph is a graph.DirectedMultigraph over a Network: node IDs are
// NodeIDs, line IDs LaneIDs.
type dotGraph struct {
	n     *Network
	adj   *Adjacency
	x     []int64
	state func(LaneID) string
}

var (
	_ graph.DirectedMultigraph = (*dotGraph)(nil)
	_ graph.Directed           = (*dotGraph)(nil) // tells dot to write a digraph
	_ dot.Attributers          = (*dotGraph)(nil)
	_ graph.Line               = dotLane{}
	_ graph.Edge               = dotLane{}
)

func (g *dotGraph) has(id int64) bool { return id >= 0 && id < int64(g.n.NumNodes()) }

func (g *dotGraph) Node(id int64) graph.Node {
	if !g.has(id) {
		return nil
	}
	return dotNode{g: g, id: NodeID(id)}
}

func (g *dotGraph) Nodes() graph.Nodes {
	return iterator.NewImplicitNodes(0, g.n.NumNodes(), func(id int) graph.Node { return dotNode{g: g, id: NodeID(id)} })
}

// ends returns the distinct other ends of lanes (heads when out, else
// tails) at v, in order of first appearance.
func (g *dotGraph) ends(v int64, out bool) graph.Nodes {
	if !g.has(v) {
		return graph.Empty
	}
	lanes, other := g.adj.InLanes[g.adj.InStart[v]:g.adj.InStart[v+1]], g.n.Tail
	if out {
		lanes, other = g.adj.OutLanes[g.adj.OutStart[v]:g.adj.OutStart[v+1]], g.n.Head
	}
	var nodes []graph.Node
	seen := map[NodeID]bool{}
	for _, a := range lanes {
		if u := other[a]; !seen[u] {
			seen[u] = true
			nodes = append(nodes, dotNode{g: g, id: u})
		}
	}
	return iterator.NewOrderedNodes(nodes)
}

func (g *dotGraph) From(id int64) graph.Nodes { return g.ends(id, true) }
func (g *dotGraph) To(id int64) graph.Nodes   { return g.ends(id, false) }

// lanes returns the lanes from u to v in lane order.
func (g *dotGraph) lanes(uid, vid int64) []LaneID {
	if !g.has(uid) || !g.has(vid) {
		return nil
	}
	var out []LaneID
	for _, a := range g.adj.OutLanes[g.adj.OutStart[uid]:g.adj.OutStart[uid+1]] {
		if int64(g.n.Head[a]) == vid {
			out = append(out, a)
		}
	}
	return out
}

func (g *dotGraph) Lines(uid, vid int64) graph.Lines {
	ls := g.lanes(uid, vid)
	if len(ls) == 0 {
		return graph.Empty
	}
	lines := make([]graph.Line, len(ls))
	for i, a := range ls {
		lines[i] = dotLane{g: g, a: a}
	}
	return iterator.NewOrderedLines(lines)
}

func (g *dotGraph) Edge(uid, vid int64) graph.Edge {
	if ls := g.lanes(uid, vid); len(ls) > 0 {
		return dotLane{g: g, a: ls[0]}
	}
	return nil
}

func (g *dotGraph) HasEdgeFromTo(uid, vid int64) bool { return len(g.lanes(uid, vid)) > 0 }

func (g *dotGraph) HasEdgeBetween(xid, yid int64) bool {
	return g.HasEdgeFromTo(xid, yid) || g.HasEdgeFromTo(yid, xid)
}

func (g *dotGraph) DOTAttributers() (graphAttr, nodeAttr, edgeAttr encoding.Attributer) {
	return attrs{{Key: "rankdir", Value: "LR"}}, attrs{{Key: "shape", Value: "box"}}, attrs{}
}

type attrs []encoding.Attribute

func (a attrs) Attributes() []encoding.Attribute { return a }

// dotNode is node id of the graph.
type dotNode struct {
	g  *dotGraph
	id NodeID
}

func (v dotNode) ID() int64     { return int64(v.id) }
func (v dotNode) DOTID() string { return dotQuote(v.g.n.Nodes[v.id]) }
func (v dotNode) Attributes() []encoding.Attribute {
	n := v.g.n
	label := n.Nodes[v.id]
	switch b := n.Supply[v.id]; {
	case b > 0:
		label += "\nsupply " + n.FormatQty(b)
	case b < 0:
		label += "\ndemand " + n.FormatQty(-b)
	}
	return []encoding.Attribute{{Key: "label", Value: dotQuote(label)}}
}

// dotLane is lane a as a line and an edge.
type dotLane struct {
	g *dotGraph
	a LaneID
}

func (l dotLane) From() graph.Node         { return dotNode{g: l.g, id: l.g.n.Tail[l.a]} }
func (l dotLane) To() graph.Node           { return dotNode{g: l.g, id: l.g.n.Head[l.a]} }
func (l dotLane) ID() int64                { return int64(l.a) }
func (l dotLane) ReversedLine() graph.Line { return l }
func (l dotLane) ReversedEdge() graph.Edge { return l }

func (l dotLane) Attributes() []encoding.Attribute {
	n, a := l.g.n, l.a
	var b strings.Builder
	fmt.Fprintf(&b, "%s\nrate %s", n.LaneName(a), n.FormatRate(n.Rate[a]))
	state := ""
	if l.g.x != nil {
		fmt.Fprintf(&b, "\nflow %s", n.FormatQty(l.g.x[a]))
	}
	if l.g.state != nil {
		state = l.g.state(a)
		if state != "" {
			fmt.Fprintf(&b, "\n%s", state)
		}
	}
	out := []encoding.Attribute{{Key: "label", Value: dotQuote(b.String())}}
	return append(out, laneStyle(state)...)
}

// dotQuote returns s as a DOT double-quoted string: '"' and '\' are
// escaped, a line break becomes \n (a centred line in a Graphviz label),
// other control characters a space.
func dotQuote(s string) string {
	var b strings.Builder
	b.WriteByte('"')
	for _, r := range s {
		switch r {
		case '"', '\\':
			b.WriteByte('\\')
			b.WriteRune(r)
		case '\n':
			b.WriteString(`\n`)
		default:
			if r < ' ' {
				r = ' '
			}
			b.WriteRune(r)
		}
	}
	b.WriteByte('"')
	return b.String()
}
