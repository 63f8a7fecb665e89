package reports_test

import (
	"bytes"
	"crypto/sha256"
	"encoding/base64"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"slices"
	"sort"
	"strconv"
	"strings"
	"testing"

	"golang.org/x/net/html"

	"lanecert/dual"
	"lanecert/flow"
	"lanecert/internal/netgen"
	"lanecert/reports"
)

var htmlOpts = reports.Options{Rows: 12, MoreHint: " (all: --all-lanes)", Nodes: true}

func renderHTML(t *testing.T, d *reports.Document, opt reports.Options) []byte {
	t.Helper()
	var buf bytes.Buffer
	if err := reports.Write(&buf, d, reports.HTML, opt); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

func parseHTML(t *testing.T, page []byte) *html.Node {
	t.Helper()
	doc, err := html.Parse(bytes.NewReader(page))
	if err != nil {
		t.Fatal(err)
	}
	return doc
}

func attr(n *html.Node, key string) (string, bool) {
	for _, a := range n.Attr {
		if a.Key == key {
			return a.Val, true
		}
	}
	return "", false
}

func hasClass(n *html.Node, c string) bool {
	v, _ := attr(n, "class")
	for _, f := range strings.Fields(v) {
		if f == c {
			return true
		}
	}
	return false
}

// elements lists the element nodes under n (n included) in document order.
func elements(n *html.Node) []*html.Node {
	var out []*html.Node
	var walk func(*html.Node)
	walk = func(n *html.Node) {
		if n.Type == html.ElementNode {
			out = append(out, n)
		}
		for c := n.FirstChild; c != nil; c = c.NextSibling {
			walk(c)
		}
	}
	walk(n)
	return out
}

func byID(root *html.Node, id string) *html.Node {
	for _, e := range elements(root) {
		if v, ok := attr(e, "id"); ok && v == id {
			return e
		}
	}
	return nil
}

func text(n *html.Node) string {
	var b strings.Builder
	var walk func(*html.Node)
	walk = func(n *html.Node) {
		if n.Type == html.TextNode {
			b.WriteString(n.Data)
		}
		for c := n.FirstChild; c != nil; c = c.NextSibling {
			walk(c)
		}
	}
	walk(n)
	return b.String()
}

// outline is the page's structure: one line per element with its tag, id,
// classes and data- attributes, indented by depth. The charts' SVG
// internals (gonum's drawing) are left out; text is left out.
func outline(root *html.Node) string {
	var b strings.Builder
	var walk func(*html.Node, int)
	walk = func(n *html.Node, depth int) {
		if n.Type == html.ElementNode {
			b.WriteString(strings.Repeat("  ", depth) + n.Data)
			var keys []string
			for _, a := range n.Attr {
				if a.Key == "id" || a.Key == "class" || strings.HasPrefix(a.Key, "data-") {
					keys = append(keys, a.Key)
				}
			}
			sort.Strings(keys)
			for _, k := range keys {
				v, _ := attr(n, k)
				fmt.Fprintf(&b, " %s=%q", k, v)
			}
			b.WriteString("\n")
			if n.Data == "svg" && hasClass(n, "chart-svg") {
				return
			}
			depth++
		}
		for c := n.FirstChild; c != nil; c = c.NextSibling {
			walk(c, depth)
		}
	}
	walk(root, 0)
	return b.String()
}

func goldenHTML(t *testing.T, name string, got []byte) {
	t.Helper()
	path := filepath.Join("testdata", "html", name+".golden")
	if *update {
		if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(path, got, 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run go test ./reports -update to create it)", err)
	}
	if !bytes.Equal(got, want) {
		t.Errorf("%s differs from the golden file; got:\n%s", path, got)
	}
}

// TestHTMLGolden compares each fixture's page structure with
// testdata/html/*.golden (regenerate with -update) and checks that two
// renders of the same audit are byte-identical, charts included.
func TestHTMLGolden(t *testing.T) {
	for _, f := range fixtures() {
		t.Run(f.name, func(t *testing.T) {
			page := renderHTML(t, build(t, f), htmlOpts)
			goldenHTML(t, f.name, []byte(outline(parseHTML(t, page))))
			if again := renderHTML(t, build(t, f), htmlOpts); !bytes.Equal(page, again) {
				t.Error("two renders of the same audit differ")
			}
		})
	}
}

// TestHTMLSelfContained: nothing on the page loads anything, the only
// script is the page's own, and the Content-Security-Policy allows exactly
// that script by its hash.
func TestHTMLSelfContained(t *testing.T) {
	for _, f := range fixtures() {
		t.Run(f.name, func(t *testing.T) {
			page := renderHTML(t, build(t, f), htmlOpts)
			root := parseHTML(t, page)
			var scripts []*html.Node
			var policy string
			for _, e := range elements(root) {
				switch e.Data {
				case "script":
					scripts = append(scripts, e)
				case "link", "img", "iframe", "object", "embed", "image", "use", "foreignObject":
					t.Errorf("element <%s> on the page", e.Data)
				case "meta":
					if v, _ := attr(e, "http-equiv"); v == "Content-Security-Policy" {
						policy, _ = attr(e, "content")
					}
				}
				for _, a := range e.Attr {
					k := strings.ToLower(a.Key)
					if k == "src" || k == "href" || strings.HasPrefix(k, "on") || a.Namespace == "xlink" {
						t.Errorf("<%s %s=%q>: a load or handler attribute", e.Data, a.Key, a.Val)
					}
					if strings.Contains(a.Val, "url(") && !strings.HasPrefix(a.Val, "url(#") {
						t.Errorf("<%s %s=%q>: an external url", e.Data, a.Key, a.Val)
					}
				}
			}
			if len(scripts) != 1 || len(scripts[0].Attr) != 0 {
				t.Fatalf("want one inline script without attributes, got %d", len(scripts))
			}
			sum := sha256.Sum256([]byte(text(scripts[0])))
			want := "script-src 'sha256-" + base64.StdEncoding.EncodeToString(sum[:]) + "'"
			if !strings.Contains(policy, want) || !strings.Contains(policy, "default-src 'none'") {
				t.Errorf("policy %q lacks %q or default-src 'none'", policy, want)
			}
			if bytes.Contains(page, []byte("@import")) || bytes.Contains(page, []byte("@font-face")) {
				t.Error("the page imports styles or fonts")
			}
		})
	}
}

// hostile is a network whose names and carried columns are markup.
func hostile(t *testing.T) *reports.Document {
	t.Helper()
	n := &flow.Network{
		Nodes:     []string{`"><img src=x onerror=alert(1)>`, "Customer & Co", "<b>hub</b>"},
		Supply:    []int64{5, -5, 0},
		Tail:      []flow.NodeID{0, 0, 2},
		Head:      []flow.NodeID{1, 2, 1},
		Lower:     []int64{0, 0, 0},
		Upper:     []int64{flow.NoLimit, flow.NoLimit, flow.NoLimit},
		Rate:      []int64{9, 1, 1},
		LaneNames: []string{"<script>alert(1)</script>", "it's", "x</td><td>y"},
		Extra: &flow.ExtraColumns{Names: []string{"<i>carrier</i>"},
			Values: [][]string{{"<svg onload=alert(2)>"}, {"a&b"}, {`'"`}}},
	}
	a, err := dual.Check(n, []int64{5, 0, 0}) // not optimal: 0 -> 2 -> 1 costs 2 < 9
	if err != nil {
		t.Fatal(err)
	}
	o, err := dual.Optimize(n, []int64{5, 0, 0}, nil)
	if err != nil {
		t.Fatal(err)
	}
	d, err := reports.Build(a, o, reports.Inputs{Network: "<net>", Plan: "plan\"'"}, nil)
	if err != nil {
		t.Fatal(err)
	}
	return d
}

// TestHTMLEscaping: lane ids, node names and carried columns that are
// markup appear on the page as text only.
func TestHTMLEscaping(t *testing.T) {
	page := renderHTML(t, hostile(t), reports.Options{})
	for _, raw := range []string{"<script>alert", "<img src", "<svg onload", "<b>hub", "<i>carrier"} {
		if bytes.Contains(page, []byte(raw)) {
			t.Errorf("raw %q on the page", raw)
		}
	}
	if !bytes.Contains(page, []byte("&lt;script&gt;alert(1)&lt;/script&gt;")) {
		t.Error("the escaped lane id is missing")
	}
	root := parseHTML(t, page)
	scripts := 0
	for _, e := range elements(root) {
		switch e.Data {
		case "script":
			scripts++
		case "img", "b", "i":
			t.Errorf("element <%s> made from user text", e.Data)
		}
		for _, a := range e.Attr {
			if strings.HasPrefix(a.Key, "on") {
				t.Errorf("<%s %s>: event handler made from user text", e.Data, a.Key)
			}
		}
	}
	if scripts != 1 {
		t.Errorf("%d script elements, want only the page's own", scripts)
	}
	// The names survive as text: in the tables, and as data- attributes of
	// the drawing.
	body := text(root)
	for _, s := range []string{"<script>alert(1)</script>", `"><img src=x onerror=alert(1)>`, "<svg onload=alert(2)>", "<i>carrier</i>", "x</td><td>y"} {
		if !strings.Contains(body, s) {
			t.Errorf("text %q missing from the page", s)
		}
	}
	svg := byID(root, "network-drawing")
	if svg == nil {
		t.Fatal("no drawing")
	}
	lanes, nodes := map[string]bool{}, map[string]bool{}
	for _, e := range elements(svg) {
		if v, ok := attr(e, "data-lane"); ok {
			lanes[v] = true
		}
		if v, ok := attr(e, "data-node"); ok {
			nodes[v] = true
		}
	}
	if !lanes["<script>alert(1)</script>"] || !lanes["x</td><td>y"] || !nodes[`"><img src=x onerror=alert(1)>`] {
		t.Errorf("names not kept as attribute values: lanes %v nodes %v", lanes, nodes)
	}
}

// drawn returns the drawing's lanes and nodes (by data- attribute).
func drawn(t *testing.T, root *html.Node) (lanes []*html.Node, nodes []*html.Node) {
	t.Helper()
	svg := byID(root, "network-drawing")
	if svg == nil {
		t.Fatal("no drawing")
	}
	for _, e := range elements(svg) {
		if _, ok := attr(e, "data-lane"); ok {
			lanes = append(lanes, e)
		}
		if _, ok := attr(e, "data-node"); ok {
			nodes = append(nodes, e)
		}
	}
	return lanes, nodes
}

// TestHTMLDrawsEveryLane: the demo (35 lanes, 15 nodes, under the limit) is
// drawn whole, each lane once with its state as a class, and placed by its
// coordinates; the first reroute is highlighted.
func TestHTMLDrawsEveryLane(t *testing.T) {
	d := build(t, fixtures()[0])
	root := parseHTML(t, renderHTML(t, d, htmlOpts))
	lanes, nodes := drawn(t, root)
	if len(lanes) != d.NumLanes() || len(nodes) != d.NumNodes() {
		t.Fatalf("drew %d lanes and %d nodes, want %d and %d", len(lanes), len(nodes), d.NumLanes(), d.NumNodes())
	}
	seen := map[string]bool{}
	for _, e := range lanes {
		id, _ := attr(e, "data-lane")
		state, _ := attr(e, "data-state")
		if seen[id] {
			t.Errorf("lane %s drawn twice", id)
		}
		seen[id] = true
		if !hasClass(e, "lane") || !hasClass(e, "lane-"+state) {
			t.Errorf("lane %s: class %v lacks its state %q", id, e.Attr, state)
		}
	}
	for e := 0; e < d.NumLanes(); e++ {
		if !seen[d.Lane(e).ID] {
			t.Errorf("lane %s not drawn", d.Lane(e).ID)
		}
	}
	svg := byID(root, "network-drawing")
	if v, _ := attr(svg, "data-layout"); v != "coordinates" {
		t.Errorf("layout %q, want coordinates (the demo's node table has lat and lon)", v)
	}
	if byID(root, "drawing-note") != nil {
		t.Error("a small network got the reduced-drawing note")
	}
	if len(d.Cycles) > 0 {
		halos := 0
		for _, e := range elements(svg) {
			if hasClass(e, "cycle-halo") && e.Parent != nil && hasClass(e.Parent, "cycle") {
				halos++
			}
		}
		want := 0
		for _, s := range d.Cycles[0].Steps {
			if s.Lane != "" {
				want++
			}
		}
		if halos != want {
			t.Errorf("%d highlighted steps, want %d (the first reroute's lanes)", halos, want)
		}
	}
}

// nodeX reads a drawn node's x from its shape (rect, circle or diamond).
func nodeX(t *testing.T, g *html.Node) float64 {
	t.Helper()
	for c := g.FirstChild; c != nil; c = c.NextSibling {
		switch c.Data {
		case "rect":
			v, _ := attr(c, "x")
			x, _ := strconv.ParseFloat(v, 64)
			return x + 6
		case "circle":
			v, _ := attr(c, "cx")
			x, _ := strconv.ParseFloat(v, 64)
			return x
		case "path":
			v, _ := attr(c, "d")
			x, _ := strconv.ParseFloat(strings.Fields(strings.TrimPrefix(v, "M"))[0], 64)
			return x
		}
	}
	t.Fatalf("node %v has no shape", g.Attr)
	return 0
}

// TestHTMLLayers: without coordinates, origins sit left of transshipment
// nodes, which sit left of destinations.
func TestHTMLLayers(t *testing.T) {
	d := build(t, fixtures()[1]) // glpk_sample: DIMACS, no coordinates
	root := parseHTML(t, renderHTML(t, d, htmlOpts))
	if v, _ := attr(byID(root, "network-drawing"), "data-layout"); v != "layers" {
		t.Fatalf("layout %q, want layers", v)
	}
	_, nodes := drawn(t, root)
	xs := map[string][]float64{}
	for _, g := range nodes {
		for _, role := range []string{"origin", "transshipment", "destination"} {
			if hasClass(g, "node-"+role) {
				xs[role] = append(xs[role], nodeX(t, g))
			}
		}
	}
	order := []string{"origin", "transshipment", "destination"}
	for i := 0; i+1 < len(order); i++ {
		for j := i + 1; j < len(order); j++ {
			for _, a := range xs[order[i]] {
				for _, b := range xs[order[j]] {
					if a >= b {
						t.Errorf("%s at x=%.1f not left of %s at x=%.1f", order[i], a, order[j], b)
					}
				}
			}
		}
	}
	if len(xs["origin"]) == 0 || len(xs["destination"]) == 0 {
		t.Fatalf("roles drawn: %v", xs)
	}
}

// largeNet is a 50×50 transportation network (2,500 lanes): origin i
// ships 10 units to destination i at rate 10 + |i-j| per unit to j, except
// that origins 0 and 1 swap their destinations, which a reroute undoes.
func largeNet(t *testing.T) *reports.Document {
	t.Helper()
	const k = 50
	rng := rand.New(rand.NewPCG(7, 1))
	n := &flow.Network{}
	for i := 0; i < k; i++ {
		n.Nodes = append(n.Nodes, fmt.Sprintf("O%02d", i))
		n.Supply = append(n.Supply, 10)
	}
	for j := 0; j < k; j++ {
		n.Nodes = append(n.Nodes, fmt.Sprintf("D%02d", j))
		n.Supply = append(n.Supply, -10)
	}
	var x []int64
	for i := 0; i < k; i++ {
		for j := 0; j < k; j++ {
			d := i - j
			if d < 0 {
				d = -d
			}
			n.Tail = append(n.Tail, flow.NodeID(i))
			n.Head = append(n.Head, flow.NodeID(k+j))
			n.Lower = append(n.Lower, 0)
			n.Upper = append(n.Upper, 10+int64(rng.IntN(5)))
			n.Rate = append(n.Rate, 10+int64(d))
			ship := int64(0)
			if (i >= 2 && i == j) || (i == 0 && j == 1) || (i == 1 && j == 0) {
				ship = 10
			}
			x = append(x, ship)
		}
	}
	a, err := dual.Check(n, x)
	if err != nil {
		t.Fatal(err)
	}
	if a.Verdict != dual.NotOptimal {
		t.Fatalf("verdict %v, want not optimal", a.Verdict)
	}
	d, err := reports.Build(a, nil, reports.Inputs{Network: "generated", Plan: "generated"}, nil)
	if err != nil {
		t.Fatal(err)
	}
	return d
}

// TestHTMLLargeNetwork: over 2,000 lanes the drawing shows only the problem
// lanes and the lanes touching their end nodes, with a note saying so.
func TestHTMLLargeNetwork(t *testing.T) {
	d := largeNet(t)
	page := renderHTML(t, d, reports.Options{Rows: 30})
	root := parseHTML(t, page)
	note := byID(root, "drawing-note")
	if note == nil || !strings.Contains(text(note), "problem lane") {
		t.Fatal("no note on the reduced drawing")
	}
	lanes, _ := drawn(t, root)
	if len(lanes) == 0 || len(lanes) >= d.NumLanes() || len(lanes) > 2000 {
		t.Fatalf("drew %d of %d lanes", len(lanes), d.NumLanes())
	}
	// Problem lanes: those the table marks (all are among the first rows,
	// problem lanes first), every one drawn; every drawn lane is a problem
	// lane or touches one's end node.
	ends := map[string]bool{}
	problem := map[string]bool{}
	for _, tr := range elements(byID(root, "lane-table")) {
		if tr.Data != "tr" || !hasClass(tr, "problem") {
			continue
		}
		var cells []string
		for c := tr.FirstChild; c != nil; c = c.NextSibling {
			if c.Data == "td" {
				cells = append(cells, text(c))
			}
		}
		problem[cells[0]] = true
		ends[cells[1]], ends[cells[2]] = true, true
	}
	if len(problem) == 0 {
		t.Fatal("no problem lanes in the table")
	}
	drawnIDs := map[string]bool{}
	for _, e := range lanes {
		id, _ := attr(e, "data-lane")
		drawnIDs[id] = true
	}
	for id := range problem {
		if !drawnIDs[id] {
			t.Errorf("problem lane %s not drawn", id)
		}
	}
	for e := 0; e < d.NumLanes(); e++ {
		l := d.Lane(e)
		if drawnIDs[l.ID] && !problem[l.ID] && !ends[l.From] && !ends[l.To] {
			t.Errorf("lane %s (%s -> %s) drawn but neither a problem lane nor next to one", l.ID, l.From, l.To)
		}
		if !drawnIDs[l.ID] && (ends[l.From] || ends[l.To]) && len(lanes) < 2000 {
			t.Errorf("lane %s touches a problem lane's end but is not drawn", l.ID)
		}
	}
	if again := renderHTML(t, largeNet(t), reports.Options{Rows: 30}); !bytes.Equal(page, again) {
		t.Error("two renders differ")
	}
}

func TestParseFormatHTML(t *testing.T) {
	for _, s := range []string{"html", "HTML"} {
		f, err := reports.ParseFormat(s)
		if err != nil || f != reports.HTML {
			t.Errorf("ParseFormat(%q) = %q, %v", s, f, err)
		}
	}
}

// TestHTMLContent checks the words on the demo's page: the verdict, the
// numbers, each reroute step, the caution and the filter.
func TestHTMLContent(t *testing.T) {
	d := build(t, fixtures()[0])
	root := parseHTML(t, renderHTML(t, d, htmlOpts))
	if got := text(byID(root, "fact-plan-cost")); got != d.PlanCost {
		t.Errorf("plan cost %q, want %q", got, d.PlanCost)
	}
	if d.OptimalCost == nil || !strings.HasPrefix(text(byID(root, "fact-optimal-cost")), *d.OptimalCost) {
		t.Error("optimal cost missing")
	}
	if c := byID(root, "caution"); c == nil || text(c) != d.Caution {
		t.Error("caution missing near the top")
	}
	for i, c := range d.Cycles {
		r := byID(root, fmt.Sprintf("reroute-%d", i+1))
		if r == nil {
			t.Fatalf("reroute %d missing", i+1)
		}
		var steps []*html.Node
		for _, e := range elements(r) {
			if e.Data == "li" {
				steps = append(steps, e)
			}
		}
		if len(steps) != len(c.Steps) {
			t.Fatalf("reroute %d: %d steps, want %d", i+1, len(steps), len(c.Steps))
		}
		for j, s := range c.Steps {
			if v, _ := attr(steps[j], "data-change"); v != s.Change || (s.Lane != "" && !strings.Contains(text(steps[j]), s.Lane)) {
				t.Errorf("reroute %d step %d: %q %q, want %s on %s", i+1, j+1, v, text(steps[j]), s.Change, s.Lane)
			}
		}
		if c.TotalSaving != nil && !strings.Contains(text(r), *c.TotalSaving) {
			t.Errorf("reroute %d: total saving %s missing", i+1, *c.TotalSaving)
		}
	}
	box := byID(root, "problem-only")
	if box == nil || box.Data != "input" {
		t.Error("no problem-lanes checkbox")
	}
	for _, id := range []string{"chart-cost", "chart-repair", "chart-reduced"} {
		fig := byID(root, id)
		if fig == nil {
			t.Errorf("chart %s missing", id)
			continue
		}
		hasSVG := false
		for _, e := range elements(fig) {
			hasSVG = hasSVG || e.Data == "svg"
		}
		if !hasSVG {
			t.Errorf("chart %s has no SVG: %s", id, text(fig))
		}
	}
}

// nodeY reads a drawn node's y from its shape (rect, circle or diamond).
func nodeY(t *testing.T, g *html.Node) float64 {
	t.Helper()
	for c := g.FirstChild; c != nil; c = c.NextSibling {
		switch c.Data {
		case "rect":
			v, _ := attr(c, "y")
			y, _ := strconv.ParseFloat(v, 64)
			return y + 6
		case "circle":
			v, _ := attr(c, "cy")
			y, _ := strconv.ParseFloat(v, 64)
			return y
		case "path": // M x y-7 L ...: the top corner of the diamond
			v, _ := attr(c, "d")
			f := strings.FieldsFunc(v, func(r rune) bool { return r == 'M' || r == 'L' || r == ' ' })
			y, _ := strconv.ParseFloat(f[1], 64)
			return y + 7
		}
	}
	t.Fatalf("node %v has no shape", g.Attr)
	return 0
}

// TestHTMLLayersUncross: three columns joined by perfect matchings in
// reversed and rotated order. Node order alone crosses lanes; the
// barycentre sweeps must order each column so that no two lanes cross.
func TestHTMLLayersUncross(t *testing.T) {
	n := &flow.Network{
		Nodes:  []string{"O0", "O1", "O2", "T0", "T1", "T2", "D0", "D1", "D2"},
		Supply: []int64{1, 1, 1, 0, 0, 0, -1, -1, -1},
	}
	// O_i -> T_(2-i); T_j -> D_((j+1) mod 3).
	for i := 0; i < 3; i++ {
		n.Tail = append(n.Tail, flow.NodeID(i))
		n.Head = append(n.Head, flow.NodeID(3+2-i))
	}
	for j := 0; j < 3; j++ {
		n.Tail = append(n.Tail, flow.NodeID(3+j))
		n.Head = append(n.Head, flow.NodeID(6+(j+1)%3))
	}
	for range n.Tail {
		n.Lower, n.Upper, n.Rate = append(n.Lower, 0), append(n.Upper, flow.NoLimit), append(n.Rate, 1)
	}
	x := []int64{1, 1, 1, 1, 1, 1}
	a, err := dual.Check(n, x)
	if err != nil {
		t.Fatal(err)
	}
	d, err := reports.Build(a, nil, reports.Inputs{Network: "matching", Plan: "matching"}, nil)
	if err != nil {
		t.Fatal(err)
	}
	root := parseHTML(t, renderHTML(t, d, reports.Options{}))
	_, nodes := drawn(t, root)
	y := map[string]float64{}
	for _, g := range nodes {
		id, _ := attr(g, "data-node")
		y[id] = nodeY(t, g)
	}
	crossings := 0
	for e := 0; e < d.NumLanes(); e++ {
		for f := e + 1; f < d.NumLanes(); f++ {
			le, lf := d.Lane(e), d.Lane(f)
			if le.From[0] != lf.From[0] { // lanes between different columns never cross
				continue
			}
			if (y[le.From]-y[lf.From])*(y[le.To]-y[lf.To]) < 0 {
				crossings++
			}
		}
	}
	if crossings != 0 {
		t.Errorf("%d crossings, want 0; node heights %v", crossings, y)
	}
}

// segments splits a cell's text at its <wbr> break points.
func segments(n *html.Node) []string {
	segs := []string{""}
	var walk func(*html.Node)
	walk = func(n *html.Node) {
		switch {
		case n.Type == html.TextNode:
			segs[len(segs)-1] += n.Data
		case n.Type == html.ElementNode && n.Data == "wbr":
			segs = append(segs, "")
		}
		for c := n.FirstChild; c != nil; c = c.NextSibling {
			walk(c)
		}
	}
	walk(n)
	return segs
}

// rowsOf returns the cells of each body row of the table with the given id.
func rowsOf(t *testing.T, root *html.Node, id string) [][]*html.Node {
	t.Helper()
	table := byID(root, id)
	if table == nil {
		t.Fatalf("no #%s", id)
	}
	var rows [][]*html.Node
	for _, e := range elements(table) {
		if e.Data != "tr" || e.Parent == nil || e.Parent.Data != "tbody" {
			continue
		}
		var cells []*html.Node
		for c := e.FirstChild; c != nil; c = c.NextSibling {
			if c.Type == html.ElementNode && c.Data == "td" {
				cells = append(cells, c)
			}
		}
		rows = append(rows, cells)
	}
	return rows
}

// TestHTMLNameBreaks: names wrap after runs of the separators _ / \ . : |
// (a <wbr> there) and nowhere else the page chooses; the text, and so the
// copied text and the sort key, stays the name. Numbers get no break
// points. The expected splits follow the rule in html.go (breakAfter).
func TestHTMLNameBreaks(t *testing.T) {
	split := map[string][]string{
		"Plant_North/Dock.7": {"Plant_", "North/", "Dock.", "7"},
		"DC__East":           {"DC__", "East"},  // one break after a run
		"St. Albans DC":      {"St. Albans DC"}, // a space follows: the browser breaks there
		"Shop:1|B":           {"Shop:", "1|", "B"},
		"end.":               {"end."}, // nothing follows
		`a\b`:                {`a\`, "b"},
		"..x":                {"..", "x"},
		"Co-op":              {"Co-op"}, // browsers break after hyphens themselves
		"L_1":                {"L_", "1"},
		"L.2":                {"L.", "2"},
		"L3":                 {"L3"},
		"Tide/Wick_Freight":  {"Tide/", "Wick_", "Freight"},
		"a<b>/c&d":           {"a<b>/", "c&d"},
	}
	n := &flow.Network{
		Nodes:     []string{"Plant_North/Dock.7", "DC__East", "St. Albans DC", "Shop:1|B", "end.", `a\b`, "..x", "Co-op"},
		Supply:    []int64{5, 0, 0, 0, -5, 0, 0, 0},
		Tail:      []flow.NodeID{0, 1, 0, 0, 2, 3, 5, 6},
		Head:      []flow.NodeID{1, 4, 4, 2, 3, 5, 6, 7},
		Lower:     []int64{0, 0, 0, 0, 0, 0, 0, 0},
		Upper:     []int64{flow.NoLimit, flow.NoLimit, flow.NoLimit, flow.NoLimit, flow.NoLimit, flow.NoLimit, flow.NoLimit, flow.NoLimit},
		Rate:      []int64{1, 1, 9, 1, 1, 1, 1, 1},
		LaneNames: []string{"L_1", "L.2", "L3", "Co-op", "end.", "..x", `a\b`, "a<b>/c&d"},
		Extra: &flow.ExtraColumns{Names: []string{"carrier"},
			Values: [][]string{{"Tide/Wick_Freight"}, {"L3"}, {"St. Albans DC"}, {"Co-op"}, {"L_1"}, {"L.2"}, {"..x"}, {"end."}}},
	}
	plan := []int64{0, 0, 5, 0, 0, 0, 0, 0} // not optimal: 0 -> 1 -> 4 costs 2 < 9
	a, err := dual.Check(n, plan)
	if err != nil {
		t.Fatal(err)
	}
	o, err := dual.Optimize(n, plan, nil)
	if err != nil {
		t.Fatal(err)
	}
	d, err := reports.Build(a, o, reports.Inputs{Network: "breaks", Plan: "breaks"}, nil)
	if err != nil {
		t.Fatal(err)
	}
	root := parseHTML(t, renderHTML(t, d, reports.Options{}))
	checked := 0
	check := func(table string, cells []*html.Node) {
		for _, c := range cells {
			name := text(c)
			if hasClass(c, "num") {
				if segs := segments(c); len(segs) != 1 {
					t.Errorf("#%s: number %q has break points: %q", table, name, segs)
				}
				continue
			}
			want, ok := split[name]
			if !ok {
				continue // words such as the state
			}
			checked++
			if got := segments(c); !slices.Equal(got, want) {
				t.Errorf("#%s: %q breaks as %q, want %q", table, name, got, want)
			}
		}
	}
	for _, id := range []string{"lane-table", "node-table", "repair-table"} {
		for _, r := range rowsOf(t, root, id) {
			check(id, r)
		}
	}
	// 8 lanes x (lane, from, to, carrier) + 8 nodes + the repair's lanes.
	if checked < 8*4+8 {
		t.Errorf("checked %d names, want at least %d", checked, 8*4+8)
	}
}

// TestHTMLDetailColumns: the carried-over columns are marked "detail" in
// the lane table's head and in every row, a "show" box names them, and
// their values are all on the page; a network without them has neither box
// nor detail cells. The other columns are never detail.
func TestHTMLDetailColumns(t *testing.T) {
	for _, f := range fixtures() {
		t.Run(f.name, func(t *testing.T) {
			d := build(t, f)
			root := parseHTML(t, renderHTML(t, d, reports.Options{}))
			table := byID(root, "lane-table")
			if table == nil {
				t.Fatal("no #lane-table")
			}
			var heads []*html.Node
			for _, e := range elements(table) {
				if e.Data == "th" {
					heads = append(heads, e)
				}
			}
			extra := len(d.ExtraColumns)
			core := len(heads) - extra
			for i, h := range heads {
				if hasClass(h, "detail") != (i >= core) {
					t.Errorf("header %d %q: detail %v, want %v", i, text(h), hasClass(h, "detail"), i >= core)
				}
				if i >= core && text(h) != d.ExtraColumns[i-core] {
					t.Errorf("header %d is %q, want %q", i, text(h), d.ExtraColumns[i-core])
				}
			}
			rows := rowsOf(t, root, "lane-table")
			if len(rows) != d.NumLanes() {
				t.Fatalf("%d rows, want %d", len(rows), d.NumLanes())
			}
			for _, r := range rows {
				if len(r) != len(heads) {
					t.Fatalf("row of %d cells under %d headers", len(r), len(heads))
				}
				id := text(r[0])
				var l *reports.LaneDoc
				for e := 0; e < d.NumLanes(); e++ {
					if x := d.Lane(e); x.ID == id {
						l = &x
					}
				}
				if l == nil {
					t.Fatalf("row for unknown lane %q", id)
				}
				for i, c := range r {
					if hasClass(c, "detail") != (i >= core) {
						t.Errorf("lane %s cell %d: detail %v, want %v", id, i, hasClass(c, "detail"), i >= core)
					}
					if i >= core && text(c) != l.Extra[d.ExtraColumns[i-core]] {
						t.Errorf("lane %s %s: %q, want %q", id, d.ExtraColumns[i-core], text(c), l.Extra[d.ExtraColumns[i-core]])
					}
				}
			}
			box := byID(root, "lane-details")
			if extra == 0 {
				if box != nil {
					t.Error("a #lane-details box with no columns to show")
				}
				return
			}
			if box == nil || box.Data != "input" || box.Parent == nil || box.Parent.Data != "label" {
				t.Fatal("no #lane-details checkbox in a label")
			}
			if v, ok := attr(box, "checked"); ok {
				t.Errorf("#lane-details checked=%q by default", v)
			}
			label := text(box.Parent)
			for _, c := range d.ExtraColumns {
				if !strings.Contains(label, c) {
					t.Errorf("the box's label %q does not name column %q", label, c)
				}
			}
		})
	}
}

// BenchmarkHTML times the page of an optimal plan of a sparse
// transportation network with 10^5 lanes and its ranges (every lane in
// the table, as lanecert report writes it); the audit and the ranges are
// not timed. BenchmarkTables times the text and Markdown reports of the
// same plan with every lane (--all-lanes).
func BenchmarkHTML(b *testing.B) {
	benchFormat(b, reports.HTML)
}

func BenchmarkTables(b *testing.B) {
	for _, f := range []reports.Format{reports.Text, reports.Markdown} {
		b.Run(fmt.Sprint(f), func(b *testing.B) { benchFormat(b, f) })
	}
}

func benchFormat(b *testing.B, f reports.Format) {
	n := netgen.Transport(8, 5000, 5000, 100000, 1000)
	sol, err := flow.Solve(n, flow.SolveOptions{})
	if err != nil || sol.Status != flow.Optimal {
		b.Fatal(sol.Status, err)
	}
	a, err := dual.Check(n, sol.Flow)
	if err != nil {
		b.Fatal(err)
	}
	s, err := dual.Ranges(n, sol.Flow, a.Potential)
	if err != nil {
		b.Fatal(err)
	}
	d, err := reports.Build(a, nil, reports.Inputs{Network: "generated", Plan: "generated"}, nil)
	if err != nil {
		b.Fatal(err)
	}
	d.AddRanges(sol.Flow, s, "plan")
	b.ResetTimer()
	var size int
	for i := 0; i < b.N; i++ {
		var buf bytes.Buffer
		if err := reports.Write(&buf, d, f, reports.Options{}); err != nil {
			b.Fatal(err)
		}
		size = buf.Len()
	}
	b.ReportMetric(float64(size), "bytes")
}

// TestHTMLHugeValues renders every format for plans whose rates and
// reduced costs are near the int64 limit, where float64 cannot tell
// neighbouring values apart (gonum's axes and histogram bins then need a
// range made for them). Common practice: hand-made cases.
func TestHTMLHugeValues(t *testing.T) {
	const big = int64(1) << 62
	cases := []struct {
		name string
		rate []int64
		y    []int64
	}{
		// Two unused lanes with one huge reduced cost.
		{"equal", []int64{0, big, big}, []int64{5, 0, 0}},
		// Reduced costs 2^62 and 2^62-1: the same float64.
		{"close", []int64{0, big, big - 1}, []int64{5, 0, 0}},
		// Not optimal: the repair saves about 5·2^62, and the unused
		// lanes' reduced costs are near -2^62.
		{"repair", []int64{big, 0, 1}, []int64{5, 0, 0}},
	}
	for _, c := range cases {
		// Three parallel lanes from a plant to a customer.
		n := &flow.Network{
			Nodes:  []string{"plant", "customer"},
			Supply: []int64{5, -5},
			Tail:   []flow.NodeID{0, 0, 0},
			Head:   []flow.NodeID{1, 1, 1},
			Lower:  []int64{0, 0, 0},
			Upper:  []int64{flow.NoLimit, flow.NoLimit, flow.NoLimit},
			Rate:   c.rate,
		}
		a, err := dual.Check(n, c.y)
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		o, err := dual.Optimize(n, c.y, nil)
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		d, err := reports.Build(a, o, reports.Inputs{Network: c.name}, nil)
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		root := parseHTML(t, renderHTML(t, d, reports.Options{}))
		chart := byID(root, "chart-reduced")
		if chart == nil {
			t.Fatalf("%s: no reduced-cost chart", c.name)
		}
		svgs := 0
		for _, e := range elements(chart) {
			if e.Data == "svg" {
				svgs++
			}
		}
		if svgs != 1 {
			t.Fatalf("%s: %d drawings in the reduced-cost chart, want 1", c.name, svgs)
		}
		for _, f := range []reports.Format{reports.Text, reports.Markdown, reports.JSON, reports.CSV} {
			var buf bytes.Buffer
			if err := reports.Write(&buf, d, f, reports.Options{}); err != nil {
				t.Fatalf("%s, %v: %v", c.name, f, err)
			}
		}
	}
}
