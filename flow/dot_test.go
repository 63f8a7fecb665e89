package flow

import (
	"bytes"
	"strings"
	"testing"

	"gonum.org/v1/gonum/graph/formats/dot"
	"gonum.org/v1/gonum/graph/formats/dot/ast"
)

// TestWriteDOT writes a network with parallel lanes and a self-loop, parses
// the text back with gonum's DOT parser and checks every lane's edge, label
// and style, and that two writes give the same bytes.
func TestWriteDOT(t *testing.T) {
	n := &Network{
		Nodes:     []string{"Plant \"1\"", "node", "C"},
		Supply:    []int64{5, 0, -5},
		Tail:      []NodeID{0, 0, 1, 1, 2},
		Head:      []NodeID{1, 1, 2, 2, 2},
		Lower:     []int64{0, 0, 0, 0, 0},
		Upper:     []int64{3, NoLimit, 10, 5, 1},
		Rate:      []int64{10, 25, 5, 7, 1},
		LaneNames: []string{"p1", "p2", "q1", "q2", "loop"},
		QtyPlaces: 0, RatePlaces: 1,
	}
	x := []int64{3, 2, 0, 5, 2}
	var buf, again bytes.Buffer
	if err := WriteDOT(&buf, n, x, nil); err != nil {
		t.Fatal(err)
	}
	if err := WriteDOT(&again, n, x, nil); err != nil || !bytes.Equal(buf.Bytes(), again.Bytes()) {
		t.Fatalf("two writes differ (%v)", err)
	}
	file, err := dot.ParseBytes(buf.Bytes())
	if err != nil {
		t.Fatalf("output does not parse: %v\n%s", err, buf.String())
	}
	if len(file.Graphs) != 1 || !file.Graphs[0].Directed {
		t.Fatalf("want one digraph:\n%s", buf.String())
	}
	type edge struct{ from, to, label, style string }
	var got []edge
	for _, st := range file.Graphs[0].Stmts {
		es, ok := st.(*ast.EdgeStmt)
		if !ok {
			continue
		}
		e := edge{from: es.From.(*ast.Node).ID, to: es.To.Vertex.(*ast.Node).ID}
		for _, a := range es.Attrs {
			switch a.Key {
			case "label":
				e.label = a.Val
			case "style":
				e.style = a.Val
			}
		}
		got = append(got, e)
	}
	want := []edge{
		{`"Plant \"1\""`, `"node"`, `"p1\nrate 1.0\nflow 3\nfull"`, "bold"},
		{`"Plant \"1\""`, `"node"`, `"p2\nrate 2.5\nflow 2\nused"`, "solid"},
		{`"node"`, `"C"`, `"q1\nrate 0.5\nflow 0\nunused"`, "dashed"},
		{`"node"`, `"C"`, `"q2\nrate 0.7\nflow 5\nfull"`, "bold"},
		{`"C"`, `"C"`, `"loop\nrate 0.1\nflow 2\nbreaking"`, "dotted"},
	}
	if len(got) != len(want) {
		t.Fatalf("got %d edges, want %d:\n%s", len(got), len(want), buf.String())
	}
	for i := range want {
		if got[i] != want[i] {
			t.Errorf("edge %d: %+v, want %+v", i, got[i], want[i])
		}
	}
	if !strings.Contains(buf.String(), `label="C\ndemand 5"`) {
		t.Errorf("node label missing:\n%s", buf.String())
	}
	// A caller's state function wins; without a plan, no flow line.
	buf.Reset()
	if err := WriteDOT(&buf, n, nil, func(LaneID) string { return LaneBreaking }); err != nil {
		t.Fatal(err)
	}
	if c := strings.Count(buf.String(), "style=dotted"); c != 5 || strings.Contains(buf.String(), "flow") {
		t.Fatalf("%d dotted lanes:\n%s", c, buf.String())
	}
	if err := WriteDOT(&buf, n, []int64{1}, nil); err == nil {
		t.Fatal("short plan accepted")
	}
}
