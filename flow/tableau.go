package flow

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"strings"
)

// A tableau grid is the transportation layout planners keep in a
// spreadsheet: one CSV file with the origins as rows and the destinations
// as columns, the unit rate of each lane in its cell, a supply column on
// the right and a demand row at the bottom:
//
//	plant,Boston,Chicago,Denver,supply
//	Akron,8,6,,35
//	Butte,9,12,13,50
//	demand,45,20,20,
//
// The first header cell is a free label (it may be empty). The header's
// last cell reads "supply" and the last row's first cell "demand" (both
// case-insensitive); every other header cell names a destination and every
// other row's first cell an origin. An empty rate cell means there is no
// lane (Akron to Denver above); a rate may be negative (a rebate). Supplies
// and demands are required and must not be negative. The corner cell (under
// "supply", right of "demand") is empty or holds the total supply. The
// delimiter (',' ';' or tab) is detected as for the lane table, blank lines
// are skipped, and TableOptions.DecimalComma reads "12,5" (with ';' or tab
// as the delimiter); TableOptions.Columns does not apply.
//
// Names are trimmed, must be non-empty and unique across origins and
// destinations, and must not contain '>': lane a from origin O to
// destination D is named "O>D". Lanes are numbered row by row, left to
// right; they have minimum 0 and no capacity. Origins become nodes 0..r-1
// with Supply = supply, destinations nodes r..r+c-1 with Supply = -demand
// (see the package documentation for the signs). Total supply may exceed
// total demand (origins keep the excess); a total demand above the total
// supply is not an input error but an infeasible network.
//
// A plan grid has the same shape with quantities in the cells (see
// ReadGridPlan and WriteGridPlan).

// GridShape records the rows and columns of a tableau grid: Origins[i] is
// the node of row i, Dests[j] the node of column j (0-based, in file
// order). Label is the grid's first header cell as written.
type GridShape struct {
	Label   string
	Origins []NodeID
	Dests   []NodeID
}

const (
	gridSupply = "supply"
	gridDemand = "demand"
)

// gridLane is a lane as read from a grid cell.
type gridLane struct {
	o, d int32
	rate Decimal
}

// ReadGrid reads a network from a tableau grid (see GridShape and the
// format above) and records its shape in Network.Grid. All cell errors are
// collected and returned as an ErrorList of positioned ParseErrors. It runs
// in O(r·c) time for r origins and c destinations, and keeps O(|V|+|E|)
// memory beyond the file's text.
func ReadGrid(r io.Reader, file string, opt TableOptions) (_ *Network, err error) {
	data, err := io.ReadAll(r)
	if err != nil {
		return nil, fmt.Errorf("flow: reading %s: %w", file, err)
	}
	defer func() { err = textColumns(err, file, data) }()
	cr, header, err := openGrid(data, file)
	if err != nil {
		return nil, err
	}
	label := strings.TrimSpace(header[0]) // the reader reuses header's slice
	g := &gridText{file: file, r: cr, comma: opt.DecimalComma, e: &errs{file: file}}
	dests, err := g.header(header)
	if err != nil {
		return nil, err
	}
	k := len(header)
	used := map[string]string{} // name -> "origin"/"destination" (first use)
	for j, d := range dests {
		if _, dup := used[d]; dup {
			line, col := cr.FieldPos(j + 1)
			g.e.add(line, col, "destination", d, fmt.Errorf("%w destination: the header names it twice", ErrDuplicate))
		}
		used[d] = "destination"
	}
	var (
		origins  []string
		supplies []Decimal
		demands  []Decimal
		lanes    []gridLane
		corner   *Decimal
		cornerAt [2]int
		sawDem   bool
		lastLine = 1
	)
	for {
		rec, err := cr.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, g.e.stop(err) // with the errors found before it
		}
		line, _ := cr.FieldPos(0)
		lastLine = line
		if len(rec) != k {
			g.e.add(line, 0, "", "", fmt.Errorf("%w: the row has %d cells, the header %d", ErrSyntax, len(rec), k))
			continue
		}
		label := strings.TrimSpace(rec[0])
		if sawDem {
			g.e.add(line, 0, "", "", fmt.Errorf("%w: a row after the demand row", ErrSyntax))
			continue
		}
		if strings.EqualFold(label, gridDemand) {
			sawDem = true
			for j := 1; j < k-1; j++ {
				d, ok := g.qty(rec, j, "demand", false)
				if ok {
					demands = append(demands, d)
				}
			}
			if s := strings.TrimSpace(rec[k-1]); s != "" {
				if d, ok := g.qty(rec, k-1, "total", false); ok {
					corner = &d
					cornerAt[0], cornerAt[1] = cr.FieldPos(k - 1)
				}
			}
			continue
		}
		o := int32(len(origins))
		if g.name(rec, 0, "origin") {
			if first, dup := used[label]; dup {
				line, col := cr.FieldPos(0)
				g.e.add(line, col, "origin", label, fmt.Errorf("%w: the grid already has a %s of this name", ErrDuplicate, first))
			}
			used[label] = "origin"
		}
		origins = append(origins, label)
		for j := 1; j < k-1; j++ {
			if strings.TrimSpace(rec[j]) == "" {
				continue
			}
			if c, ok := g.dec(rec, j, "rate"); ok {
				lanes = append(lanes, gridLane{o: o, d: int32(j - 1), rate: c})
			}
		}
		if s, ok := g.qty(rec, k-1, "supply", false); ok {
			supplies = append(supplies, s)
		}
		if g.e.full() {
			break
		}
	}
	if !sawDem {
		g.e.add(lastLine, 0, "", "", fmt.Errorf("%w: want a last row labelled %q with the demands", ErrSyntax, gridDemand))
	}
	if len(origins) == 0 {
		g.e.add(lastLine, 0, "", "", fmt.Errorf("%w: the grid has no origin rows", ErrEmpty))
	}
	if err := g.e.list.sortAndErr(); err != nil {
		return nil, err
	}
	n := &Network{Grid: &GridShape{Label: label}}
	var supply, lower, upper, rate rawQty
	for i, o := range origins {
		n.Nodes = append(n.Nodes, o)
		n.Grid.Origins = append(n.Grid.Origins, NodeID(i))
		supply.add(supplies[i])
	}
	for j, d := range dests {
		n.Nodes = append(n.Nodes, d)
		n.Grid.Dests = append(n.Grid.Dests, NodeID(len(origins)+j))
		supply.add(Decimal{Mant: -demands[j].Mant, Places: demands[j].Places})
	}
	n.LaneNames = make([]string, 0, len(lanes))
	for _, l := range lanes {
		n.Tail = append(n.Tail, n.Grid.Origins[l.o])
		n.Head = append(n.Head, n.Grid.Dests[l.d])
		n.LaneNames = append(n.LaneNames, origins[l.o]+">"+dests[l.d])
		lower.add(Decimal{})
		upper.add(Decimal{Mant: NoLimit})
		rate.add(l.rate)
	}
	if err := n.finishScales(file, &supply, &lower, &upper, &rate); err != nil {
		return nil, err
	}
	if corner != nil {
		total, _, err := n.Totals()
		if err != nil {
			return nil, &ParseError{File: file, Line: cornerAt[0], Col: cornerAt[1], Field: "total", Err: err}
		}
		if corner.Cmp(Decimal{Mant: total, Places: int8(n.QtyPlaces)}) != 0 {
			return nil, &ParseError{File: file, Line: cornerAt[0], Col: cornerAt[1], Field: "total", Text: corner.String(),
				Err: fmt.Errorf("the supplies add up to %s: leave the corner cell empty or write their total", n.FormatQty(total))}
		}
	}
	return n, nil
}

// gridText reads the cells of a grid.
type gridText struct {
	file  string
	r     *csv.Reader
	comma bool
	e     *errs
}

// header checks a grid's header and returns the destination names.
func (g *gridText) header(header []string) ([]string, error) {
	k := len(header)
	if k < 3 {
		return nil, &ParseError{File: g.file, Line: 1, Field: "header",
			Err: fmt.Errorf("%w: want a label cell, at least one destination and a %q column", ErrSyntax, gridSupply)}
	}
	if last := strings.TrimSpace(header[k-1]); !strings.EqualFold(last, gridSupply) {
		line, col := g.r.FieldPos(k - 1)
		return nil, &ParseError{File: g.file, Line: line, Col: col, Field: "header", Text: last,
			Err: fmt.Errorf("%w: want the last header cell to read %q", ErrMissingColumn, gridSupply)}
	}
	dests := make([]string, 0, k-2)
	for j := 1; j < k-1; j++ {
		g.name(header, j, "destination")
		dests = append(dests, strings.TrimSpace(header[j]))
	}
	return dests, g.e.list.sortAndErr()
}

// name checks the name in rec[j]; it reports false after adding an error.
func (g *gridText) name(rec []string, j int, field string) bool {
	s := strings.TrimSpace(rec[j])
	line, col := g.r.FieldPos(j)
	switch {
	case s == "":
		g.e.add(line, col, field, "", fmt.Errorf("%w: want a name, the cell is empty", ErrSyntax))
		return false
	case strings.Contains(s, ">"):
		g.e.add(line, col, field, s, fmt.Errorf("%w: a grid name must not contain '>' (lanes are named origin>destination)", ErrSyntax))
		return false
	case strings.EqualFold(s, gridSupply) || strings.EqualFold(s, gridDemand):
		g.e.add(line, col, field, s, fmt.Errorf("%w: %q marks the supply column and %q the demand row", ErrAmbiguous, gridSupply, gridDemand))
		return false
	}
	return true
}

// dec parses the decimal in rec[j].
func (g *gridText) dec(rec []string, j int, field string) (Decimal, bool) {
	s := strings.TrimSpace(rec[j])
	var d Decimal
	var err error
	if g.comma {
		d, err = ParseDecimalComma(s)
	} else {
		d, err = ParseDecimal(s)
	}
	if err != nil {
		switch strings.ToLower(strings.TrimLeft(s, "+-")) {
		case "nan", "inf", "infinity":
			err = ErrNotFinite
		}
		line, col := g.r.FieldPos(j)
		g.e.add(line, col, field, s, err)
		return Decimal{}, false
	}
	return d, true
}

// qty parses a non-negative quantity in rec[j]; an empty cell is 0 when
// allowEmpty, else an error.
func (g *gridText) qty(rec []string, j int, field string, allowEmpty bool) (Decimal, bool) {
	if strings.TrimSpace(rec[j]) == "" {
		if allowEmpty {
			return Decimal{}, true
		}
		line, col := g.r.FieldPos(j)
		g.e.add(line, col, field, "", fmt.Errorf("%w: want a decimal, the cell is empty", ErrNotDecimal))
		return Decimal{}, false
	}
	d, ok := g.dec(rec, j, field)
	if ok && d.Mant < 0 {
		line, col := g.r.FieldPos(j)
		g.e.add(line, col, field, rec[j], fmt.Errorf("%s %w", field, ErrNegative))
		return Decimal{}, false
	}
	return d, ok
}

// gridCells returns the lane of each cell of n's grid, row by row (-1: no
// lane), or an error when n.Grid does not describe n's lanes. O(r·c+|E|).
func gridCells(n *Network) ([]LaneID, error) {
	gs := n.Grid
	if gs == nil {
		return nil, errors.New("flow: the network was not read from a tableau grid (it has no GridShape)")
	}
	row := make([]int32, n.NumNodes())
	col := make([]int32, n.NumNodes())
	for v := range row {
		row[v], col[v] = -1, -1
	}
	for i, v := range gs.Origins {
		if v < 0 || int(v) >= n.NumNodes() {
			return nil, errors.New("flow: grid origin out of range")
		}
		row[v] = int32(i)
	}
	for j, v := range gs.Dests {
		if v < 0 || int(v) >= n.NumNodes() {
			return nil, errors.New("flow: grid destination out of range")
		}
		col[v] = int32(j)
	}
	cells := make([]LaneID, len(gs.Origins)*len(gs.Dests))
	for i := range cells {
		cells[i] = -1
	}
	for a := range n.Tail {
		i, j := row[n.Tail[a]], col[n.Head[a]]
		if i < 0 || j < 0 {
			return nil, fmt.Errorf("flow: lane %s does not run from a grid origin to a grid destination", n.LaneName(LaneID(a)))
		}
		c := int(i)*len(gs.Dests) + int(j)
		if cells[c] >= 0 {
			return nil, fmt.Errorf("flow: lanes %s and %s share a grid cell", n.LaneName(cells[c]), n.LaneName(LaneID(a)))
		}
		cells[c] = LaneID(a)
	}
	return cells, nil
}

// ReadGridPlan reads a plan grid for n, a network read by ReadGrid: the
// same header (label cell free, then n's destinations in order) and the
// same origin rows in order, with a quantity in each lane's cell. An empty
// cell is 0. A cell without a lane must be empty or 0. The supply column
// and the demand row may be left out; when present, each of their cells
// is empty or repeats the network's figure, and the corner cell is empty
// or the total supply. Quantities may carry more decimal places than the
// network (RawPlan.Bind rescales); a negative quantity is read, and left
// to the feasibility check. Errors are positioned; a grid of another
// shape is reported at the first differing name. O(r·c).
func ReadGridPlan(r io.Reader, file string, n *Network, opt TableOptions) (_ *RawPlan, err error) {
	cells, err := gridCells(n)
	if err != nil {
		return nil, err
	}
	data, err := io.ReadAll(r)
	if err != nil {
		return nil, fmt.Errorf("flow: reading %s: %w", file, err)
	}
	defer func() { err = textColumns(err, file, data) }()
	cr, header, err := openGrid(data, file)
	if err != nil {
		return nil, err
	}
	gs := n.Grid
	nd := len(gs.Dests)
	k := len(header)
	hasSupply := k == nd+2 && strings.EqualFold(strings.TrimSpace(header[k-1]), gridSupply)
	if k != nd+1 && !hasSupply {
		return nil, &ParseError{File: file, Line: 1, Field: "header",
			Err: fmt.Errorf("%w: the header has %d cells; the network's grid has a label cell and %d destinations (then, optionally, %q)", ErrSyntax, k, nd, gridSupply)}
	}
	for j, v := range gs.Dests {
		if got := strings.TrimSpace(header[j+1]); got != n.Nodes[v] {
			line, col := cr.FieldPos(j + 1)
			return nil, &ParseError{File: file, Line: line, Col: col, Field: "destination", Text: got,
				Err: fmt.Errorf("%w: want the network's destination %d, %q, here", ErrUnknownNode, j+1, n.Nodes[v])}
		}
	}
	g := &gridText{file: file, r: cr, comma: opt.DecimalComma, e: &errs{file: file}}
	plan := &RawPlan{File: file}
	plan.q.mant = make([]int64, n.NumLanes())
	plan.q.places = make([]int8, n.NumLanes())
	// repeat checks that cell j repeats the network's figure want.
	repeat := func(rec []string, j int, field string, want int64) {
		if strings.TrimSpace(rec[j]) == "" {
			return
		}
		if d, ok := g.dec(rec, j, field); ok && d.Cmp(Decimal{Mant: want, Places: int8(n.QtyPlaces)}) != 0 {
			line, col := cr.FieldPos(j)
			g.e.add(line, col, field, d.String(), fmt.Errorf("the network's %s is %s: leave the cell empty or repeat it", field, n.FormatQty(want)))
		}
	}
	i, sawDem, lastLine := 0, false, 1
	for {
		rec, err := cr.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, g.e.stop(err) // with the errors found before it
		}
		line, col := cr.FieldPos(0)
		lastLine = line
		if len(rec) != k {
			g.e.add(line, 0, "", "", fmt.Errorf("%w: the row has %d cells, the header %d", ErrSyntax, len(rec), k))
			i++
			continue
		}
		label := strings.TrimSpace(rec[0])
		if sawDem {
			g.e.add(line, 0, "", "", fmt.Errorf("%w: a row after the demand row", ErrSyntax))
			continue
		}
		if i >= len(gs.Origins) && strings.EqualFold(label, gridDemand) && hasSupply {
			sawDem = true
			for j, v := range gs.Dests {
				repeat(rec, j+1, "demand", -n.Supply[v])
			}
			if total, _, err := n.Totals(); err == nil {
				repeat(rec, k-1, "total", total)
			}
			continue
		}
		if i >= len(gs.Origins) {
			g.e.add(line, col, "origin", label, fmt.Errorf("%w: the network's grid has %d origins (a demand row needs the supply column)", ErrUnknownNode, len(gs.Origins)))
			i++
			continue
		}
		if want := n.Nodes[gs.Origins[i]]; label != want {
			g.e.add(line, col, "origin", label, fmt.Errorf("%w: want the network's origin %d, %q, here", ErrUnknownNode, i+1, want))
			i++
			continue
		}
		for j := 0; j < nd; j++ {
			s := strings.TrimSpace(rec[j+1])
			if s == "" {
				continue
			}
			d, ok := g.dec(rec, j+1, "quantity")
			if !ok {
				continue
			}
			a := cells[i*nd+j]
			if a < 0 {
				if d.Mant != 0 {
					line, col := cr.FieldPos(j + 1)
					g.e.add(line, col, "quantity", s, fmt.Errorf("%w: no lane runs from %q to %q (its rate cell is empty)", ErrUnknownLane, label, n.Nodes[gs.Dests[j]]))
				}
				continue
			}
			plan.q.mant[a], plan.q.places[a] = d.Mant, d.Places
		}
		if hasSupply {
			repeat(rec, k-1, "supply", n.Supply[gs.Origins[i]])
		}
		i++
		if g.e.full() {
			break
		}
	}
	if i < len(gs.Origins) {
		g.e.add(lastLine, 0, "", "", fmt.Errorf("%w: the plan has %d origin rows, the network's grid %d (next: %q)", ErrSyntax, i, len(gs.Origins), n.Nodes[gs.Origins[i]]))
	}
	if err := g.e.list.sortAndErr(); err != nil {
		return nil, err
	}
	return plan, nil
}

// WriteGridPlan writes the plan x (scaled flows, one per lane) in n's grid
// shape: the header (n's grid label, the destinations, "supply"), one row
// per origin with each lane's quantity (0 included) and an empty cell where
// there is no lane, the origin's supply on the right, then the demand row
// with an empty corner cell. It reads back with ReadGridPlan, and the text
// is also a valid network grid only where quantities stand for rates.
// It fails when n has no grid shape (see gridCells). O(r·c).
func WriteGridPlan(w io.Writer, n *Network, x []int64) error {
	cells, err := gridCells(n)
	if err != nil {
		return err
	}
	if len(x) != n.NumLanes() {
		return fmt.Errorf("flow: %d quantities for %d lanes", len(x), n.NumLanes())
	}
	gs := n.Grid
	cw := csv.NewWriter(w)
	rec := make([]string, 0, len(gs.Dests)+2)
	rec = append(rec, gs.Label)
	for _, v := range gs.Dests {
		rec = append(rec, n.Nodes[v])
	}
	rec = append(rec, gridSupply)
	if err := cw.Write(rec); err != nil {
		return err
	}
	for i, o := range gs.Origins {
		rec = append(rec[:0], n.Nodes[o])
		for j := range gs.Dests {
			s := ""
			if a := cells[i*len(gs.Dests)+j]; a >= 0 {
				s = n.FormatQty(x[a])
			}
			rec = append(rec, s)
		}
		rec = append(rec, n.FormatQty(n.Supply[o]))
		if err := cw.Write(rec); err != nil {
			return err
		}
	}
	rec = append(rec[:0], gridDemand)
	for _, v := range gs.Dests {
		rec = append(rec, n.FormatQty(-n.Supply[v]))
	}
	rec = append(rec, "")
	if err := cw.Write(rec); err != nil {
		return err
	}
	cw.Flush()
	return cw.Error()
}

// isGridText reports whether data looks like a tableau grid: the last cell
// of its first line reads "supply" and no cell of that line names a lane
// table's from or to column (or their synonyms).
func isGridText(data []byte) bool {
	cr, err := newCSVReader(data, "")
	if err != nil {
		return false
	}
	cr.FieldsPerRecord = -1
	header, err := cr.Read()
	if err != nil || len(header) < 3 {
		return false
	}
	if !strings.EqualFold(strings.TrimSpace(header[len(header)-1]), gridSupply) {
		return false
	}
	for _, h := range header {
		switch synonym(strings.ToLower(strings.TrimSpace(h))) {
		case "from", "to", "node":
			return false
		}
	}
	return true
}

// isPlanTable reports whether data is a plan table (its header has a flow
// column under opt's names) rather than a plan grid.
func isPlanTable(data []byte, opt TableOptions) bool {
	t, err := openTable(bytes.Clone(data), "", opt, planColumns, &errs{})
	if err != nil {
		return false
	}
	_, ok := t.cols["flow"]
	return ok
}

// WriteGridAudit writes an audit of plan x in the grid shape of n: each
// cell holds the lane's quantity when it carries one, its reduced cost in
// square brackets when it carries none ("[3.00]": what a unit on it would
// cost beyond the potentials; negative means the plan is not optimal), and
// nothing where there is no lane. A last column and a last row give the
// origins' and destinations' potentials (reduced cost = rate + potential of
// the origin - potential of the destination). reduced and potential may be
// nil (an infeasible plan): the brackets and potentials are then left out.
func WriteGridAudit(w io.Writer, n *Network, x, reduced, potential []int64) error {
	cells, err := gridCells(n)
	if err != nil {
		return err
	}
	gs := n.Grid
	cw := csv.NewWriter(w)
	rec := []string{gs.Label}
	for _, v := range gs.Dests {
		rec = append(rec, n.Nodes[v])
	}
	rec = append(rec, "potential")
	if err := cw.Write(rec); err != nil {
		return err
	}
	for i, o := range gs.Origins {
		rec = append(rec[:0], n.Nodes[o])
		for j := range gs.Dests {
			s := ""
			if a := cells[i*len(gs.Dests)+j]; a >= 0 {
				switch {
				case x[a] != 0 || reduced == nil:
					s = n.FormatQty(x[a])
				default:
					s = "[" + n.FormatRate(reduced[a]) + "]"
				}
			}
			rec = append(rec, s)
		}
		p := ""
		if potential != nil {
			p = n.FormatRate(potential[o])
		}
		rec = append(rec, p)
		if err := cw.Write(rec); err != nil {
			return err
		}
	}
	rec = append(rec[:0], "potential")
	for _, v := range gs.Dests {
		p := ""
		if potential != nil {
			p = n.FormatRate(potential[v])
		}
		rec = append(rec, p)
	}
	rec = append(rec, "")
	if err := cw.Write(rec); err != nil {
		return err
	}
	cw.Flush()
	return cw.Error()
}

// openGrid reads a grid's header row; the reader allows rows of any length
// (the grid readers check the shape themselves, with positions).
func openGrid(data []byte, file string) (*csv.Reader, []string, error) {
	cr, err := newCSVReader(data, file)
	if err != nil {
		return nil, nil, err
	}
	cr.FieldsPerRecord = -1
	header, err := cr.Read()
	if err != nil {
		return nil, nil, csvError(file, err)
	}
	return cr, header, nil
}
