package flow

import (
	"errors"
	"fmt"
	"io"
	"sort"
	"strconv"
)

// Columns of the lane table and the node table.
var (
	laneColumns = []string{"lane", "from", "to", "cost", "min", "max", "flow"}
	nodeColumns = []string{"node", "supply", "demand"}
	planColumns = []string{"lane", "from", "to", "flow"}
)

// nodeIndex numbers node names in order of first appearance.
type nodeIndex struct {
	ids   map[string]NodeID
	names []string
}

func (x *nodeIndex) id(name string) NodeID {
	if id, ok := x.ids[name]; ok {
		return id
	}
	id := NodeID(len(x.names))
	x.ids[name] = id
	x.names = append(x.names, name)
	return id
}

// RawPlan is a plan as read, one decimal per lane, before it is put on the
// network's quantity scale by Bind.
type RawPlan struct {
	File string
	q    rawQty
}

// Len returns the number of lanes the plan covers.
func (p *RawPlan) Len() int { return len(p.q.mant) }

// ReadCSVNetwork reads a lane table and, if nodes is not nil, a node table
// (see the package documentation of the formats in cmd/lanecert and the
// README). It returns the network and, when the lane table has a flow
// column, the plan it carries (otherwise nil).
//
// Lane table columns (case-insensitive, any order): from, to, cost (the unit
// rate), and optionally lane (identifier, default the 1-based row number),
// min (default 0), max (empty: no limit), flow. Node table: node and supply
// (signed: positive supply, negative demand), or supply and demand (both
// non-negative; the node's supply is their difference). A node that appears
// only in lanes is a transshipment node with supply 0. Nodes are numbered
// in order of first appearance: node table first, then lanes.
//
// All errors are collected and returned together as an ErrorList of
// positioned ParseErrors. It runs in O(|V|+|E|) time.
func ReadCSVNetwork(lanes io.Reader, lanesFile string, nodes io.Reader, nodesFile string, opt TableOptions) (*Network, *RawPlan, error) {
	data, err := io.ReadAll(lanes)
	if err != nil {
		return nil, nil, fmt.Errorf("flow: reading %s: %w", lanesFile, err)
	}
	return readCSVNetwork(data, lanesFile, nodes, nodesFile, opt)
}

// readCSVNetwork is ReadCSVNetwork on the lane table's bytes.
func readCSVNetwork(data []byte, lanesFile string, nodes io.Reader, nodesFile string, opt TableOptions) (_ *Network, _ *RawPlan, err error) {
	var nd []byte // the node table's bytes, once read
	defer func() {
		err = textColumns(err, lanesFile, data)
		if nd != nil {
			err = textColumns(err, nodesFile, nd)
		}
	}()
	lanes := func(known []string) (*table, error) {
		return openTable(data, lanesFile, opt, known, &errs{file: lanesFile})
	}
	var nodeTable tableOpener
	if nodes != nil {
		nodeTable = func(known []string) (*table, error) {
			var err error
			nd, err = io.ReadAll(nodes)
			if err != nil {
				return nil, fmt.Errorf("flow: reading %s: %w", nodesFile, err)
			}
			return openTable(nd, nodesFile, opt, known, &errs{file: nodesFile})
		}
	}
	return readNetwork(lanes, nodeTable)
}

// tableOpener opens one table of a network's input (the CSV text of a
// file, or a worksheet) with the given known column names; its errs
// collects the row errors.
type tableOpener func(known []string) (*table, error)

// readNetwork reads a lane table and, if nodes is not nil, a node table
// (see ReadCSVNetwork).
func readNetwork(lanes, nodes tableOpener) (*Network, *RawPlan, error) {
	idx := &nodeIndex{ids: map[string]NodeID{}}
	var supply rawQty
	var nodeExtra *ExtraColumns
	var notes []string
	if nodes != nil {
		var err error
		supply, nodeExtra, notes, err = readNodeTable(nodes, idx)
		if err != nil {
			return nil, nil, err
		}
	}
	t, err := lanes(laneColumns)
	if err != nil {
		return nil, nil, err
	}
	e, lanesFile := t.e, t.file
	if err := t.require("from", "to", "cost"); err != nil {
		return nil, nil, err
	}
	n := &Network{}
	var lower, upper, rate rawQty
	var plan *RawPlan
	if _, ok := t.cols["flow"]; ok {
		plan = &RawPlan{File: lanesFile}
	}
	// Lane ids are copied into one arena (so they do not keep the file's
	// lines alive) and checked for repeats by sorting at the end.
	var ids *laneIDs
	if _, ok := t.cols["lane"]; ok {
		ids = &laneIDs{}
	}
	var extra *ExtraColumns
	if len(t.extra) > 0 {
		extra = &ExtraColumns{Names: t.extraNames()}
	}
	rows := 0
	err = t.each(func(r *row) {
		rows++
		ok := true
		from, ok1 := r.name("from")
		to, ok2 := r.name("to")
		ok = ok1 && ok2
		c, ok3 := r.decimal("cost", false, Decimal{})
		lo, ok4 := r.decimal("min", true, Decimal{})
		hi, ok5 := r.decimal("max", true, Decimal{Mant: NoLimit})
		ok = ok && ok3 && ok4 && ok5
		if ok4 && lo.Mant < 0 {
			r.fail("min", fmt.Errorf("minimum %w", ErrNegative))
			ok, ok4 = false, false // no bounds error besides
		}
		if ok5 && hi.Mant != NoLimit && hi.Mant < 0 {
			r.fail("max", fmt.Errorf("capacity %w", ErrNegative))
			ok, ok5 = false, false
		}
		if ok4 && ok5 && hi.Mant != NoLimit && lo.Cmp(hi) > 0 {
			r.fail("min", fmt.Errorf("%w: min %s > max %s", ErrBounds, lo, hi))
			ok = false
		}
		var f Decimal
		if plan != nil {
			var okf bool
			f, okf = r.decimal("flow", true, Decimal{})
			ok = ok && okf
		}
		var id string
		if ids != nil {
			var okl bool
			id, okl = r.name("lane")
			ok = ok && okl
		}
		if !ok {
			return
		}
		n.Tail = append(n.Tail, idx.id(from))
		n.Head = append(n.Head, idx.id(to))
		lower.add(lo)
		upper.add(hi)
		rate.add(c)
		if plan != nil {
			plan.q.add(f)
		}
		if ids != nil {
			line, col := r.pos("lane")
			ids.add(id, line, col)
		}
		if extra != nil {
			extra.Values = append(extra.Values, r.extras())
		}
	})
	if err != nil {
		return nil, nil, err
	}
	if ids != nil {
		n.LaneNames = ids.finish(e)
	}
	if err := e.list.sortAndErr(); err != nil {
		return nil, nil, err
	}
	if rows == 0 {
		return nil, nil, t.errorAt(t.headLine+1, 0, "", "", fmt.Errorf("%w: the lane table has no rows", ErrEmpty))
	}
	n.Nodes = idx.names
	n.Extra = extra
	n.Notes = append(notes, t.notes()...)
	if nodeExtra != nil {
		for len(nodeExtra.Values) < len(n.Nodes) {
			nodeExtra.Values = append(nodeExtra.Values, nil)
		}
		n.NodeExtra = nodeExtra
	}
	for len(supply.mant) < len(n.Nodes) {
		supply.add(Decimal{})
	}
	if err := n.finishScales(lanesFile, &supply, &lower, &upper, &rate); err != nil {
		var pe *ParseError
		if errors.As(err, &pe) && pe.Sheet == "" {
			pe.Sheet = t.sheet
		}
		return nil, nil, err
	}
	return n, plan, nil
}

// finishScales picks the common places of quantities and of rates and
// stores the scaled values in n.
func (n *Network) finishScales(file string, supply, lower, upper, rate *rawQty) error {
	qp := max(supply.maxPlaces(), lower.maxPlaces(), upper.maxPlaces())
	rp := rate.maxPlaces()
	if qp > MaxPlaces || rp > MaxPlaces {
		return &ParseError{File: file, Err: fmt.Errorf("quantities use %d and rates %d decimal places, at most %d are supported: %w", qp, rp, MaxPlaces, ErrOverflow)}
	}
	var err error
	node := func(i int) string { return fmt.Sprintf("node %q", n.Nodes[i]) }
	lane := func(i int) string { return "lane " + n.LaneName(LaneID(i)) }
	// A value that overflows on the common scale is an input error of the
	// file as a whole (its row is no longer known).
	fileErr := func(field string, err error) error { return &ParseError{File: file, Field: field, Err: err} }
	if n.Supply, err = supply.scale(qp, node); err != nil {
		return fileErr("supply", err)
	}
	if n.Lower, err = lower.scale(qp, lane); err != nil {
		return fileErr("min", err)
	}
	if n.Upper, err = upper.scale(qp, lane); err != nil {
		return fileErr("max", err)
	}
	if n.Rate, err = rate.scale(rp, lane); err != nil {
		return fileErr("cost", err)
	}
	n.QtyPlaces, n.RatePlaces = qp, rp
	return nil
}

func readNodeTable(open tableOpener, idx *nodeIndex) (rawQty, *ExtraColumns, []string, error) {
	supply, extra, t, err := readNodeRows(open, idx)
	if err != nil {
		return supply, nil, nil, err
	}
	return supply, extra, t.notes(), nil
}

func readNodeRows(open tableOpener, idx *nodeIndex) (rawQty, *ExtraColumns, *table, error) {
	var supply rawQty
	t, err := open(nodeColumns)
	if err != nil {
		return supply, nil, nil, err
	}
	e := t.e
	if err := t.require("node"); err != nil {
		return supply, nil, nil, err
	}
	_, hasS := t.cols["supply"]
	_, hasD := t.cols["demand"]
	if !hasS && !hasD {
		return supply, nil, nil, t.require("supply")
	}
	var extra *ExtraColumns
	if len(t.extra) > 0 {
		extra = &ExtraColumns{Names: t.extraNames()}
	}
	firstRow := map[string]int{}
	rows := 0
	err = t.each(func(r *row) {
		rows++
		name, ok := r.name("node")
		if ok {
			if first, dup := firstRow[name]; dup {
				r.fail("node", fmt.Errorf("%w node: already listed on data row %d", ErrDuplicate, first))
				ok = false
			} else {
				firstRow[name] = r.n
			}
		}
		var s, d Decimal
		okS, okD := true, true
		if hasS {
			s, okS = r.decimal("supply", true, Decimal{})
		}
		if hasD {
			d, okD = r.decimal("demand", true, Decimal{})
			if okD && d.Mant < 0 {
				r.fail("demand", fmt.Errorf("demand %w (use the supply column for a signed balance)", ErrNegative))
				okD = false
			}
			if okS && hasS && s.Mant < 0 {
				r.fail("supply", fmt.Errorf("supply %w when a demand column is given", ErrNegative))
				okS = false
			}
		}
		if !ok || !okS || !okD {
			return
		}
		p := max(s.Places, d.Places)
		net, err := SubChecked(0, 0)
		a, err1 := ScaleUp(s.Mant, int(p-s.Places))
		b, err2 := ScaleUp(d.Mant, int(p-d.Places))
		if err1 == nil && err2 == nil {
			net, err = SubChecked(a, b)
		}
		if err1 != nil || err2 != nil || err != nil {
			r.fail("node", fmt.Errorf("supply minus demand %w", ErrOverflow))
			return
		}
		idx.id(name)
		supply.add(Decimal{Mant: net, Places: p})
		if extra != nil {
			extra.Values = append(extra.Values, r.extras())
		}
	})
	if err != nil {
		return supply, nil, nil, err
	}
	if err := e.list.sortAndErr(); err != nil {
		return supply, nil, nil, err
	}
	if rows == 0 {
		return supply, nil, nil, t.errorAt(t.headLine+1, 0, "", "", fmt.Errorf("%w: the node table has no rows", ErrEmpty))
	}
	return supply, extra, t, nil
}

// laneIDs collects lane identifiers in one byte arena with their
// positions, for 16 bytes per lane plus the text instead of a map.
type laneIDs struct {
	arena      []byte
	end        []int32
	line, col  []int32
	allNumbers bool
}

func (l *laneIDs) add(id string, line, col int) {
	if len(l.end) == 0 {
		l.allNumbers = true
	}
	if l.allNumbers && id != strconv.Itoa(len(l.end)+1) {
		l.allNumbers = false
	}
	l.arena = append(l.arena, id...)
	l.end = append(l.end, int32(len(l.arena)))
	l.line = append(l.line, int32(line))
	l.col = append(l.col, int32(col))
}

// finish reports repeated ids to e and returns the names: nil when they
// are just the row numbers 1, 2, 3, ... (LaneName gives those anyway).
// O(|E| log |E|).
func (l *laneIDs) finish(e *errs) []string {
	text := string(l.arena)
	names := make([]string, len(l.end))
	start := int32(0)
	for i, end := range l.end {
		names[i] = text[start:end]
		start = end
	}
	order := make([]int32, len(names))
	for i := range order {
		order[i] = int32(i)
	}
	sort.Slice(order, func(i, j int) bool {
		a, b := order[i], order[j]
		if names[a] != names[b] {
			return names[a] < names[b]
		}
		return a < b
	})
	for k := 1; k < len(order); k++ {
		a, b := order[k-1], order[k]
		if names[a] == names[b] {
			first := a
			for k2 := k - 1; k2 > 0 && names[order[k2-1]] == names[b]; k2-- {
				first = order[k2-1]
			}
			e.add(int(l.line[b]), int(l.col[b]), "lane", names[b], fmt.Errorf("%w lane id: already used on line %d", ErrDuplicate, l.line[first]))
		}
	}
	if l.allNumbers {
		return nil
	}
	return names
}

// laneLookup finds lanes by identifier or by (from, to) pair.
type laneLookup struct {
	n     *Network
	names map[string]LaneID
	ord   []LaneID // lanes sorted by (tail, head, id)
	nodes map[string]NodeID
}

func newLaneLookup(n *Network) *laneLookup {
	return &laneLookup{n: n}
}

func (l *laneLookup) byName(s string) (LaneID, bool) {
	if l.n.LaneNames == nil {
		k, err := strconv.Atoi(s)
		if err != nil || k < 1 || k > l.n.NumLanes() {
			return 0, false
		}
		return LaneID(k - 1), true
	}
	if l.names == nil {
		l.names = make(map[string]LaneID, l.n.NumLanes())
		for a, s := range l.n.LaneNames {
			l.names[s] = LaneID(a)
		}
	}
	a, ok := l.names[s]
	return a, ok
}

func (l *laneLookup) node(s string) (NodeID, bool) {
	if l.nodes == nil {
		l.nodes = make(map[string]NodeID, l.n.NumNodes())
		for v, s := range l.n.Nodes {
			l.nodes[s] = NodeID(v)
		}
	}
	v, ok := l.nodes[s]
	return v, ok
}

// pair returns the lanes from t to h in lane order. O(log |E|) after an
// O(|E| log |E|) first call.
func (l *laneLookup) pair(t, h NodeID) []LaneID {
	n := l.n
	if l.ord == nil {
		l.ord = make([]LaneID, n.NumLanes())
		for a := range l.ord {
			l.ord[a] = LaneID(a)
		}
		sort.Slice(l.ord, func(i, j int) bool {
			a, b := l.ord[i], l.ord[j]
			if n.Tail[a] != n.Tail[b] {
				return n.Tail[a] < n.Tail[b]
			}
			if n.Head[a] != n.Head[b] {
				return n.Head[a] < n.Head[b]
			}
			return a < b
		})
	}
	less := func(a LaneID) bool { return n.Tail[a] < t || (n.Tail[a] == t && n.Head[a] < h) }
	i := sort.Search(len(l.ord), func(i int) bool { return !less(l.ord[i]) })
	j := i
	for j < len(l.ord) && n.Tail[l.ord[j]] == t && n.Head[l.ord[j]] == h {
		j++
	}
	return l.ord[i:j]
}

// ReadCSVPlan reads a plan table keyed by lane (column lane) or by pair
// (columns from and to), with a flow column. Lanes the plan does not name
// carry 0. A pair with parallel lanes is ambiguous and is an error, as are
// unknown lanes or nodes and a lane named twice.
func ReadCSVPlan(rd io.Reader, file string, n *Network, opt TableOptions) (_ *RawPlan, err error) {
	data, err := io.ReadAll(rd)
	if err != nil {
		return nil, fmt.Errorf("flow: reading %s: %w", file, err)
	}
	defer func() { err = textColumns(err, file, data) }()
	e := &errs{file: file}
	t, err := openTable(data, file, opt, planColumns, e)
	if err != nil {
		return nil, err
	}
	_, byLane := t.cols["lane"]
	if !byLane {
		if err := t.require("from", "to", "flow"); err != nil {
			return nil, err
		}
	} else if err := t.require("flow"); err != nil {
		return nil, err
	}
	plan := &RawPlan{File: file}
	plan.q.mant = make([]int64, n.NumLanes())
	plan.q.places = make([]int8, n.NumLanes())
	seen := make([]int32, n.NumLanes()) // data row that set the lane, 0 = none
	lk := newLaneLookup(n)
	err = t.each(func(r *row) {
		var a LaneID
		if byLane {
			s, ok := r.name("lane")
			if !ok {
				return
			}
			if a, ok = lk.byName(s); !ok {
				r.fail("lane", fmt.Errorf("%w: no lane has this id in the network", ErrUnknownLane))
				return
			}
		} else {
			fs, ok1 := r.name("from")
			ts, ok2 := r.name("to")
			if !ok1 || !ok2 {
				return
			}
			fv, ok1 := lk.node(fs)
			tv, ok2 := lk.node(ts)
			if !ok1 {
				r.fail("from", fmt.Errorf("%w: the network has no node of this name", ErrUnknownNode))
			}
			if !ok2 {
				r.fail("to", fmt.Errorf("%w: the network has no node of this name", ErrUnknownNode))
			}
			if !ok1 || !ok2 {
				return
			}
			ls := lk.pair(fv, tv)
			switch len(ls) {
			case 0:
				r.fail("to", fmt.Errorf("%w: no lane runs from %q to %q", ErrUnknownLane, fs, ts))
				return
			case 1:
				a = ls[0]
			default:
				ids := make([]string, 0, 4)
				for _, x := range ls[:min(len(ls), 4)] {
					ids = append(ids, n.LaneName(x))
				}
				r.fail("to", fmt.Errorf("%w: %d parallel lanes run from %q to %q (%s); key the plan by lane id", ErrAmbiguous, len(ls), fs, ts, quoteList(ids)))
				return
			}
		}
		f, ok := r.decimal("flow", true, Decimal{})
		if !ok {
			return
		}
		if seen[a] != 0 {
			col := "lane"
			if !byLane {
				col = "to"
			}
			r.fail(col, fmt.Errorf("%w: lane %s is already given on data row %d", ErrDuplicate, n.LaneName(a), seen[a]))
			return
		}
		seen[a] = int32(r.n)
		plan.q.mant[a], plan.q.places[a] = f.Mant, f.Places
	})
	if err != nil {
		return nil, err
	}
	if err := e.list.sortAndErr(); err != nil {
		return nil, err
	}
	return plan, nil
}
