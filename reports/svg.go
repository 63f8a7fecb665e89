package reports

import (
	"fmt"
	"html/template"
	"math"
	"sort"
	"strings"

	"lanecert/dual"
	"lanecert/flow"
)

// The network drawing of the HTML report: an inline SVG of the nodes and
// lanes, lanes styled by state (colour, dash pattern and end marker, so the
// state never rests on colour alone), width by flow, and the first reroute
// of the certificate highlighted. Floats appear here for geometry only; no
// number in the drawing decides anything, and every coordinate is printed
// with a fixed %.1f so the output is deterministic.

// drawLaneLimit is the largest network drawn whole; above it only the
// problem lanes and the lanes touching their end nodes are drawn (at most
// drawLaneLimit lanes in all).
const drawLaneLimit = 2000

// Lane states of the drawing. The colours are from the Okabe–Ito palette
// (Okabe and Ito, "Color Universal Design", 2002), chosen to stay
// distinguishable under the common colour-vision deficiencies; grey for
// unused lanes lies outside the palette and is neutral. Each state also has
// its own dash pattern and end marker.
type laneStyle struct {
	state  string // class suffix and data-state value
	label  string // legend text
	colour string
	dash   string // stroke-dasharray, "" for a solid line
	order  int    // drawing order: later is on top
}

func laneStyles() []laneStyle {
	return []laneStyle{
		{state: "unused", label: "unused (dotted, open arrow)", colour: "#8C8C8C", dash: "2 4", order: 0},
		{state: "in-use", label: "in use (solid, arrow)", colour: "#0072B2", dash: "", order: 1},
		{state: "at-capacity", label: "at capacity (long dash, arrow with bar)", colour: "#E69F00", dash: "9 3", order: 2},
		{state: "out-of-bounds", label: "out of bounds (short dash, diamond)", colour: "#CC79A7", dash: "4 2", order: 3},
		{state: "broken", label: "breaks optimality (dash-dot, cross)", colour: "#D55E00", dash: "10 3 2 3", order: 4},
	}
}

// drawState is lane e's state in the drawing: out of bounds, breaking
// complementary slackness, at capacity, unused, or in use (in use, at its
// minimum or fixed).
func (d *Document) drawState(e int) string {
	s := d.audit.State[e]
	switch {
	case s == dual.OutOfBounds:
		return "out-of-bounds"
	case d.broken[e]:
		return "broken"
	case s == dual.AtCapacity:
		return "at-capacity"
	case s == dual.Unused:
		return "unused"
	}
	return "in-use"
}

// onCycle marks the lanes on any reroute of the certificate.
func (d *Document) onCycle() []bool {
	on := make([]bool, d.net.NumLanes())
	for _, c := range d.audit.Cycles {
		for _, s := range c.Steps {
			if s.Lane >= 0 {
				on[s.Lane] = true
			}
		}
	}
	return on
}

// problemLanes marks the lanes that are out of bounds, break optimality or
// lie on a reroute.
func (d *Document) problemLanes() []bool {
	p := d.onCycle()
	for e := range p {
		if d.audit.State[e] == dual.OutOfBounds || d.broken[e] {
			p[e] = true
		}
	}
	return p
}

// drawing is the network drawing and the note that goes with it.
type drawing struct {
	SVG   template.HTML
	Note  string
	Lanes int // lanes drawn
	Nodes int // nodes drawn
}

// pt is a point of the drawing (SVG user units).
type pt struct{ x, y float64 }

// drawNetwork draws d's network, or for networks over drawLaneLimit lanes
// the problem lanes and their neighbourhood. Time O(|V|+|E| log |E|) plus
// the layering's sweeps, O(s·|E| log |E|) for a few sweeps s; memory O(|V|+|E|).
func drawNetwork(d *Document) drawing {
	n := d.net
	m := n.NumLanes()
	lanes := make([]int, 0, min(m, drawLaneLimit))
	var note string
	if m <= drawLaneLimit {
		for e := 0; e < m; e++ {
			lanes = append(lanes, e)
		}
	} else {
		lanes, note = reducedLanes(d)
	}
	nodeOn := make([]bool, n.NumNodes())
	if m <= drawLaneLimit {
		for v := range nodeOn {
			nodeOn[v] = true
		}
	}
	for _, e := range lanes {
		nodeOn[n.Tail[e]], nodeOn[n.Head[e]] = true, true
	}
	var nodes []int
	for v, on := range nodeOn {
		if on {
			nodes = append(nodes, v)
		}
	}
	if len(nodes) == 0 {
		if note == "" {
			note = "The network has no nodes to draw."
		}
		return drawing{Note: note}
	}
	const width = 960.0
	pos, height, byMap := placeByCoordinates(n, nodes, width)
	if pos == nil {
		pos, height = placeInLayers(n, d.audit.Flow, nodes, lanes, width)
	}
	var b strings.Builder
	writeSVG(&b, d, lanes, nodes, pos, width, height, byMap)
	return drawing{SVG: template.HTML(b.String()), Note: note, Lanes: len(lanes), Nodes: len(nodes)}
}

// reducedLanes picks the lanes drawn for a large network: the problem
// lanes, then the lanes touching their end nodes, in lane order, at most
// drawLaneLimit in all.
func reducedLanes(d *Document) ([]int, string) {
	n := d.net
	m := n.NumLanes()
	prob := d.problemLanes()
	end := make([]bool, n.NumNodes())
	var lanes []int
	for e := 0; e < m; e++ {
		if prob[e] {
			lanes = append(lanes, e)
			end[n.Tail[e]], end[n.Head[e]] = true, true
		}
	}
	nprob := len(lanes)
	if nprob > drawLaneLimit {
		lanes = lanes[:drawLaneLimit]
	}
	near, left := 0, 0
	for e := 0; e < m; e++ {
		if prob[e] || !(end[n.Tail[e]] || end[n.Head[e]]) {
			continue
		}
		if len(lanes) >= drawLaneLimit {
			left++
			continue
		}
		lanes = append(lanes, e)
		near++
	}
	sort.Ints(lanes)
	var note string
	switch {
	case nprob == 0:
		note = fmt.Sprintf("This network has %d lanes, more than the %d drawn whole, and no problem lanes (none out of bounds, breaking optimality or on a reroute), so no drawing is shown. The tables and charts cover every lane.", m, drawLaneLimit)
	default:
		note = fmt.Sprintf("This network has %d lanes, more than the %d drawn whole: the drawing shows only the %d problem lane(s) (out of bounds, breaking optimality or on a reroute) and %d lane(s) touching their end nodes.", m, drawLaneLimit, min(nprob, drawLaneLimit), near)
		if left > 0 || nprob > drawLaneLimit {
			note += fmt.Sprintf(" %d further lane(s) are left out to keep the drawing readable.", left+max(0, nprob-drawLaneLimit))
		}
		note += " The tables cover every lane."
	}
	return lanes, note
}

const (
	drawMargin = 40.0
	legendBand = 78.0
)

// placeByCoordinates places the nodes by latitude and longitude when every
// drawn node has them: a plain equirectangular projection (x = longitude ×
// cos(mean latitude), y = −latitude) fitted to the box. It returns nil when
// coordinates are missing or unreadable.
func placeByCoordinates(n *flow.Network, nodes []int, width float64) (map[int]pt, float64, bool) {
	lat, lon, ok, err := flow.Coordinates(n)
	if !ok || err != nil {
		return nil, 0, false
	}
	var sumLat float64
	for _, v := range nodes {
		if math.IsNaN(lat[v]) || math.IsNaN(lon[v]) {
			return nil, 0, false
		}
		sumLat += lat[v]
	}
	k := math.Cos(sumLat / float64(len(nodes)) * math.Pi / 180)
	raw := make([]pt, len(nodes))
	minX, minY, maxX, maxY := math.Inf(1), math.Inf(1), math.Inf(-1), math.Inf(-1)
	for i, v := range nodes {
		p := pt{lon[v] * k, -lat[v]}
		raw[i] = p
		minX, maxX = math.Min(minX, p.x), math.Max(maxX, p.x)
		minY, maxY = math.Min(minY, p.y), math.Max(maxY, p.y)
	}
	dx, dy := maxX-minX, maxY-minY
	inner := width - 2*drawMargin - 120 // room for labels on the right
	height := 480.0
	if dx > 0 && dy > 0 {
		height = math.Min(900, math.Max(320, inner*dy/dx+2*drawMargin))
	}
	innerH := height - 2*drawMargin
	scale := 1.0
	switch {
	case dx > 0 && dy > 0:
		scale = math.Min(inner/dx, innerH/dy)
	case dx > 0:
		scale = inner / dx
	case dy > 0:
		scale = innerH / dy
	}
	offX := drawMargin + (inner-dx*scale)/2
	offY := drawMargin + (innerH-dy*scale)/2
	pos := make(map[int]pt, len(nodes))
	for i, v := range nodes {
		pos[v] = pt{offX + (raw[i].x-minX)*scale, offY + (raw[i].y-minY)*scale}
	}
	return pos, height, true
}

// placeInLayers places the nodes in columns: origins first, then
// transshipment nodes by the longest path from the origins (cycles broken
// at the node with the fewest unplaced predecessors, lowest index first),
// then destinations. The order inside each column comes from four
// barycentre sweeps (down, up, down, up) that pull each node towards the
// mean position of its neighbours in the columns already swept, which
// usually removes most crossings. Lanes carrying flow weigh ten times as
// much as unused ones, so the plan's routes straighten first.
func placeInLayers(n *flow.Network, x []int64, nodes []int, lanes []int, width float64) (map[int]pt, float64) {
	idx := make(map[int]int, len(nodes)) // node -> index in nodes
	for i, v := range nodes {
		idx[v] = i
	}
	k := len(nodes)
	layer := make([]int, k)
	const origin, trans, dest = 0, 1, 2
	kind := make([]int, k)
	for i, v := range nodes {
		switch {
		case n.Supply[v] > 0:
			kind[i] = origin
		case n.Supply[v] < 0:
			kind[i] = dest
		default:
			kind[i] = trans
		}
	}
	// Longest path over transshipment nodes (Kahn's order with cycle
	// breaking).
	succ := make([][]int, k)
	indeg := make([]int, k)
	type link struct {
		to int
		w  float64
	}
	nbr := make([][]link, k)
	for _, e := range lanes {
		t, h := idx[int(n.Tail[e])], idx[int(n.Head[e])]
		if t == h {
			continue
		}
		w := 0.1
		if x[e] != 0 {
			w = 1
		}
		nbr[t] = append(nbr[t], link{h, w})
		nbr[h] = append(nbr[h], link{t, w})
		if kind[h] == trans && kind[t] != dest {
			succ[t] = append(succ[t], h)
			if kind[t] == trans {
				indeg[h]++
			}
		}
	}
	for i := range layer {
		if kind[i] == trans {
			layer[i] = 1
		}
	}
	done := make([]bool, k)
	var queue []int
	for i := 0; i < k; i++ {
		if kind[i] == trans && indeg[i] == 0 {
			queue = append(queue, i)
		}
	}
	left := 0
	for i := 0; i < k; i++ {
		if kind[i] == trans {
			left++
		}
	}
	for left > 0 {
		if len(queue) == 0 { // a cycle: break it
			best := -1
			for i := 0; i < k; i++ {
				if kind[i] == trans && !done[i] && (best < 0 || indeg[i] < indeg[best]) {
					best = i
				}
			}
			queue = append(queue, best)
		}
		i := queue[0]
		queue = queue[1:]
		if done[i] {
			continue
		}
		done[i] = true
		left--
		for _, h := range succ[i] {
			if done[h] {
				continue
			}
			layer[h] = max(layer[h], layer[i]+1)
			indeg[h]--
			if indeg[h] == 0 {
				queue = append(queue, h)
			}
		}
	}
	last := 0
	for i := range layer {
		last = max(last, layer[i])
	}
	last++
	for i := range layer {
		if kind[i] == dest {
			layer[i] = last
		}
	}
	// Columns, initially in node order; skip empty columns.
	cols := make([][]int, last+1)
	for i := 0; i < k; i++ {
		cols[layer[i]] = append(cols[layer[i]], i)
	}
	var packed [][]int
	for _, c := range cols {
		if len(c) > 0 {
			packed = append(packed, c)
		}
	}
	cols = packed
	col := make([]int, k)
	rel := make([]float64, k) // position inside the column, 0..1
	setRel := func(c []int) {
		for j, i := range c {
			rel[i] = (float64(j) + 0.5) / float64(len(c))
		}
	}
	for ci, c := range cols {
		for _, i := range c {
			col[i] = ci
		}
		setRel(c)
	}
	sweep := func(ci int, fromLeft bool) {
		c := cols[ci]
		bary := make([]float64, k)
		for _, i := range c {
			sum, wsum := 0.0, 0.0
			for _, l := range nbr[i] {
				if (fromLeft && col[l.to] < ci) || (!fromLeft && col[l.to] > ci) {
					sum += l.w * rel[l.to]
					wsum += l.w
				}
			}
			bary[i] = rel[i]
			if wsum > 0 {
				bary[i] = sum / wsum
			}
		}
		sort.SliceStable(c, func(a, b int) bool {
			if bary[c[a]] != bary[c[b]] {
				return bary[c[a]] < bary[c[b]]
			}
			return rel[c[a]] < rel[c[b]]
		})
		setRel(c)
	}
	for s := 0; s < 4; s++ {
		if s%2 == 0 {
			for ci := 1; ci < len(cols); ci++ {
				sweep(ci, true)
			}
		} else {
			for ci := len(cols) - 2; ci >= 0; ci-- {
				sweep(ci, false)
			}
		}
	}
	tallest := 0
	for _, c := range cols {
		tallest = max(tallest, len(c))
	}
	gap := 36.0
	if tallest > 40 {
		gap = math.Max(8, 1440/float64(tallest))
	}
	height := math.Max(320, gap*float64(tallest)+2*drawMargin)
	innerW := width - 2*drawMargin - 140 // labels right of the last column
	innerH := height - 2*drawMargin
	pos := make(map[int]pt, k)
	for ci, c := range cols {
		x := drawMargin + 40
		if len(cols) > 1 {
			x += innerW * float64(ci) / float64(len(cols)-1)
		} else {
			x += innerW / 2
		}
		for j, i := range c {
			pos[nodes[i]] = pt{x, drawMargin + innerH*(float64(j)+0.5)/float64(len(c))}
		}
	}
	return pos, height
}

func esc(s string) string { return template.HTMLEscapeString(s) }

func f1(x float64) string {
	s := fmt.Sprintf("%.1f", x)
	if s == "-0.0" {
		return "0.0"
	}
	return s
}

// writeSVG writes the drawing.
func writeSVG(b *strings.Builder, d *Document, lanes, nodes []int, pos map[int]pt, width, height float64, byMap bool) {
	n, a := d.net, d.audit
	total := height + legendBand
	layout := "layers"
	if byMap {
		layout = "coordinates"
	}
	fmt.Fprintf(b, `<svg id="network-drawing" class="network" xmlns="http://www.w3.org/2000/svg" viewBox="0 0 %s %s" role="img" aria-labelledby="network-title" data-layout="%s" data-lanes="%d" data-nodes="%d">`+"\n",
		f1(width), f1(total), layout, len(lanes), len(nodes))
	fmt.Fprintf(b, `<title id="network-title">Network drawing: %d lane(s), %d node(s), placed by %s</title>`+"\n", len(lanes), len(nodes), layout)
	styles := laneStyles()
	b.WriteString("<defs>\n")
	for _, s := range styles {
		writeMarker(b, s)
	}
	b.WriteString("</defs>\n<style>\n")
	b.WriteString(".lane{fill:none;stroke-linecap:round}\n")
	for _, s := range styles {
		dash := ""
		if s.dash != "" {
			dash = ";stroke-dasharray:" + s.dash
		}
		fmt.Fprintf(b, ".lane-%s{stroke:%s%s}\n", s.state, s.colour, dash)
	}
	b.WriteString(".cycle-halo{fill:none;stroke:#F0E442;stroke-opacity:0.85;stroke-linecap:round}\n")
	b.WriteString(".cycle-step circle{fill:#000}.cycle-step text{fill:#fff;font:bold 10px sans-serif;text-anchor:middle}\n")
	b.WriteString(".node{stroke:#000;stroke-width:1}.node-origin{fill:#009E73}.node-destination{fill:#56B4E9}.node-transshipment{fill:#fff}\n")
	b.WriteString(".node-label{font:11px sans-serif;fill:#000;paint-order:stroke;stroke:#fff;stroke-width:3px}\n")
	b.WriteString(".legend text{font:11px sans-serif;fill:#000}\n</style>\n")

	maxFlow := 0.0
	for _, e := range lanes {
		maxFlow = math.Max(maxFlow, math.Abs(float64(a.Flow[e])))
	}
	widthOf := func(e int) float64 {
		w := 1.0
		if x := math.Abs(float64(a.Flow[e])); maxFlow > 0 && x > 0 {
			w = 1 + 5*math.Sqrt(x/maxFlow)
		}
		if d.broken[e] || a.State[e] == dual.OutOfBounds {
			w = math.Max(w, 2) // problem lanes stay visible
		}
		return w
	}
	// Parallel and opposite lanes between the same two nodes bend apart.
	type pair struct{ lo, hi int32 }
	count := map[pair]int{}
	for _, e := range lanes {
		t, h := n.Tail[e], n.Head[e]
		count[pair{min(t, h), max(t, h)}]++
	}
	seen := map[pair]int{}
	geo := make(map[int]laneGeo, len(lanes))
	for _, e := range lanes {
		t, h := n.Tail[e], n.Head[e]
		key := pair{min(t, h), max(t, h)}
		k := seen[key]
		seen[key]++
		geo[e] = laneGeometry(pos[int(key.lo)], pos[int(key.hi)], pos[int(t)], pos[int(h)], t == h, k, count[key])
	}

	// The first reroute, under the lanes.
	type badge struct {
		at    pt
		label string
	}
	var badges []badge
	if len(a.Cycles) > 0 {
		b.WriteString(`<g class="cycle" id="first-reroute">` + "\n")
		for i, s := range a.Cycles[0].Steps {
			if s.Lane < 0 {
				continue
			}
			g, ok := geo[int(s.Lane)]
			if !ok {
				continue
			}
			dir, sign := "less", "−"
			if s.Forward {
				dir, sign = "more", "+"
			}
			fmt.Fprintf(b, `<path class="cycle-halo cycle-%s" data-step="%d" d="%s" stroke-width="%s"/>`+"\n", dir, i+1, g.d, f1(widthOf(int(s.Lane))+9))
			badges = append(badges, badge{g.mid, fmt.Sprintf("%d%s", i+1, sign)})
		}
		b.WriteString("</g>\n")
	}

	// Lanes, by state (unused at the bottom), then lane order.
	order := append([]int(nil), lanes...)
	rank := map[string]int{}
	for _, s := range styles {
		rank[s.state] = s.order
	}
	state := make(map[int]string, len(lanes))
	for _, e := range lanes {
		state[e] = d.drawState(e)
	}
	sort.SliceStable(order, func(i, j int) bool { return rank[state[order[i]]] < rank[state[order[j]]] })
	onCycle := d.onCycle()
	b.WriteString(`<g class="lanes">` + "\n")
	for _, e := range order {
		st := state[e]
		cls := "lane lane-" + st
		if onCycle[e] {
			cls += " on-reroute"
		}
		name := n.LaneName(flow.LaneID(e))
		title := fmt.Sprintf("lane %s: %s → %s, flow %s, %s", name, n.Nodes[n.Tail[e]], n.Nodes[n.Head[e]],
			n.FormatQty(a.Flow[e]), strings.ReplaceAll(stateName(a.State[e]), "-", " "))
		if a.Reduced != nil {
			title += ", reduced cost " + n.FormatRate(a.Reduced[e])
		}
		if d.broken[e] {
			title += " (breaks optimality)"
		}
		fmt.Fprintf(b, `<path class="%s" data-lane="%s" data-state="%s" d="%s" stroke-width="%s" marker-end="url(#lc-mark-%s)"><title>%s</title></path>`+"\n",
			cls, esc(name), st, geo[e].d, f1(widthOf(e)), st, esc(title))
	}
	b.WriteString("</g>\n")
	if len(badges) > 0 {
		b.WriteString(`<g class="cycle-steps">` + "\n")
		for _, bd := range badges {
			fmt.Fprintf(b, `<g class="cycle-step"><circle cx="%s" cy="%s" r="9"/><text x="%s" y="%s">%s</text></g>`+"\n",
				f1(bd.at.x), f1(bd.at.y), f1(bd.at.x), f1(bd.at.y+3.5), bd.label)
		}
		b.WriteString("</g>\n")
	}

	// Nodes and labels.
	showLabels := len(nodes) <= 120
	b.WriteString(`<g class="nodes">` + "\n")
	for _, v := range nodes {
		p := pos[v]
		role := nodeRole(n.Supply[v])
		title := fmt.Sprintf("%s: %s, supply %s", n.Nodes[v], role, n.FormatQty(n.Supply[v]))
		if a.Potential != nil {
			title += ", potential " + n.FormatRate(a.Potential[v])
		}
		fmt.Fprintf(b, `<g class="node node-%s" data-node="%s">%s<title>%s</title></g>`+"\n", role, esc(n.Nodes[v]), nodeShape(role, p), esc(title))
	}
	b.WriteString("</g>\n")
	if showLabels {
		b.WriteString(`<g class="labels">` + "\n")
		for _, v := range nodes {
			p := pos[v]
			fmt.Fprintf(b, `<text class="node-label" x="%s" y="%s">%s</text>`+"\n", f1(p.x+10), f1(p.y-8), esc(n.Nodes[v]))
		}
		b.WriteString("</g>\n")
	}
	writeLegend(b, styles, height, len(a.Cycles) > 0)
	b.WriteString("</svg>\n")
}

func nodeRole(supply int64) string {
	switch {
	case supply > 0:
		return "origin"
	case supply < 0:
		return "destination"
	}
	return "transshipment"
}

// nodeShape draws a node: origins are squares, destinations circles,
// transshipment nodes diamonds.
func nodeShape(role string, p pt) string {
	switch role {
	case "origin":
		return fmt.Sprintf(`<rect x="%s" y="%s" width="12.0" height="12.0"/>`, f1(p.x-6), f1(p.y-6))
	case "destination":
		return fmt.Sprintf(`<circle cx="%s" cy="%s" r="6.5"/>`, f1(p.x), f1(p.y))
	}
	return fmt.Sprintf(`<path d="M%s %sL%s %sL%s %sL%s %sZ"/>`, f1(p.x), f1(p.y-7), f1(p.x+7), f1(p.y), f1(p.x), f1(p.y+7), f1(p.x-7), f1(p.y))
}

// writeMarker defines a state's end marker: filled arrow (in use), open
// arrow (unused), arrow with a bar (at capacity), diamond (out of bounds),
// cross (breaks optimality). Markers keep one size whatever the width.
func writeMarker(b *strings.Builder, s laneStyle) {
	var shape string
	switch s.state {
	case "unused":
		shape = fmt.Sprintf(`<path d="M0.5 0.5L7 3.5L0.5 6.5Z" fill="#fff" stroke="%s" stroke-width="1"/>`, s.colour)
	case "in-use":
		shape = fmt.Sprintf(`<path d="M0 0L7 3.5L0 7Z" fill="%s"/>`, s.colour)
	case "at-capacity":
		shape = fmt.Sprintf(`<path d="M0 0L6 3.5L0 7Z" fill="%s"/><rect x="6" y="0" width="1.5" height="7" fill="%s"/>`, s.colour, s.colour)
	case "out-of-bounds":
		shape = fmt.Sprintf(`<path d="M0 3.5L3.5 0L7 3.5L3.5 7Z" fill="%s"/>`, s.colour)
	default:
		shape = fmt.Sprintf(`<path d="M1 1L6 6M6 1L1 6" stroke="%s" stroke-width="1.6"/>`, s.colour)
	}
	fmt.Fprintf(b, `<marker id="lc-mark-%s" viewBox="0 0 8 7" refX="6" refY="3.5" markerUnits="userSpaceOnUse" markerWidth="11" markerHeight="10" orient="auto">%s</marker>`+"\n", s.state, shape)
}

func writeLegend(b *strings.Builder, styles []laneStyle, top float64, cycle bool) {
	fmt.Fprintf(b, `<g class="legend" transform="translate(%s %s)">`+"\n", f1(drawMargin), f1(top))
	x, y := 0.0, 10.0
	for i, s := range styles {
		if i == 3 {
			x, y = 0, 32
		}
		fmt.Fprintf(b, `<g class="legend-item" data-legend="%s"><path class="lane lane-%s" d="M%s %sL%s %s" stroke-width="2.5" marker-end="url(#lc-mark-%s)"/><text x="%s" y="%s">%s</text></g>`+"\n",
			s.state, s.state, f1(x), f1(y), f1(x+36), f1(y), s.state, f1(x+44), f1(y+4), esc(s.label))
		x += 300
	}
	x = 600
	if cycle {
		fmt.Fprintf(b, `<g class="legend-item" data-legend="reroute"><path class="cycle-halo" d="M%s %sL%s %s" stroke-width="11"/><text x="%s" y="%s">first reroute (badge: step, + more, − less)</text></g>`+"\n",
			f1(x), f1(y), f1(x+36), f1(y), f1(x+44), f1(y+4))
	}
	y = 54
	x = 0
	for _, role := range []string{"origin", "destination", "transshipment"} {
		fmt.Fprintf(b, `<g class="legend-item node node-%s" data-legend="%s">%s</g><text x="%s" y="%s">%s</text>`+"\n",
			role, role, nodeShape(role, pt{x + 8, y}), f1(x+22), f1(y+4), role)
		x += 150
	}
	fmt.Fprintf(b, `<text x="%s" y="%s">line width grows with the flow</text>`+"\n", f1(x+20), f1(y+4))
	b.WriteString("</g>\n")
}

// laneGeo is a lane's path and the midpoint of its curve.
type laneGeo struct {
	d   string
	mid pt
}

// laneGeometry computes a lane's path from p (tail) to q (head). Lanes
// sharing the same two nodes bend apart: the k-th of cnt is offset along
// the normal of the line from lo to hi (the pair's lower node to its higher
// one), so opposite lanes fall on opposite sides. Self-loops are arcs above
// the node. Ends stop short of the node shapes so the markers show.
func laneGeometry(lo, hi, p, q pt, loop bool, k, cnt int) laneGeo {
	const r = 9.0
	if loop || (p.x == q.x && p.y == q.y) {
		h := 28.0 + 10*float64(k)
		c1 := pt{p.x - 18 - 4*float64(k), p.y - h}
		c2 := pt{p.x + 18 + 4*float64(k), p.y - h}
		s, e := pt{p.x - 4, p.y - 7}, pt{p.x + 4, p.y - 7}
		return laneGeo{
			d:   fmt.Sprintf("M%s %sC%s %s %s %s %s %s", f1(s.x), f1(s.y), f1(c1.x), f1(c1.y), f1(c2.x), f1(c2.y), f1(e.x), f1(e.y)),
			mid: pt{p.x, p.y - 0.75*h - 5},
		}
	}
	ux, uy := hi.x-lo.x, hi.y-lo.y
	l := math.Hypot(ux, uy)
	nx, ny := -uy/l, ux/l
	off := 0.0
	if cnt > 1 {
		off = (float64(k) - float64(cnt-1)/2) * 22
	}
	mid := pt{(p.x + q.x) / 2, (p.y + q.y) / 2}
	c := pt{mid.x + 2*off*nx, mid.y + 2*off*ny}
	toward := func(a, b pt, dist float64) pt {
		dx, dy := b.x-a.x, b.y-a.y
		dl := math.Hypot(dx, dy)
		if dl <= dist {
			return a
		}
		return pt{a.x + dx/dl*dist, a.y + dy/dl*dist}
	}
	s, e := toward(p, c, r), toward(q, c, r)
	if off == 0 {
		return laneGeo{d: fmt.Sprintf("M%s %sL%s %s", f1(s.x), f1(s.y), f1(e.x), f1(e.y)), mid: mid}
	}
	return laneGeo{
		d:   fmt.Sprintf("M%s %sQ%s %s %s %s", f1(s.x), f1(s.y), f1(c.x), f1(c.y), f1(e.x), f1(e.y)),
		mid: pt{0.25*p.x + 0.5*c.x + 0.25*q.x, 0.25*p.y + 0.5*c.y + 0.25*q.y},
	}
}
