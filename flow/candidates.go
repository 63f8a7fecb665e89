package flow

import (
	"fmt"
	"io"
)

// Candidate is a lane that could be added to a network: a carrier's bid or
// a lane that could be opened. Rate, Lower and Upper are on the network's
// scales (see ReadCandidates).
type Candidate struct {
	ID           string
	Tail, Head   NodeID
	Rate         int64
	Lower, Upper int64 // Upper == NoLimit: no capacity
	// Fixed is the one-off cost of opening the lane (cost scale:
	// QtyPlaces+RatePlaces), 0 when none.
	Fixed int64
	// Same names an existing lane with the same ends, bounds and rate, or
	// is -1.
	Same LaneID
	// Line is the candidate's line in its file.
	Line int
}

var candidateColumns = []string{"lane", "from", "to", "cost", "min", "max", "fixed"}

// ReadCandidates reads a table of candidate lanes for network n: from, to,
// cost (the offered rate, also "rate"), and optionally lane (an id, also
// "id" or "bid"; default "bid N" for data row N), min, max and fixed (a
// one-off cost of opening the lane, at most QtyPlaces+RatePlaces places,
// applied after any rescaling of the rates). Nodes must
// exist in n; rates must not be negative; ids must be unique. A rate with
// more decimal places than n's rates rescales n's rates (n is changed); a
// quantity with more places than n's quantities is an error. Errors are
// positioned and collected as an ErrorList. O(rows + |V|).
func ReadCandidates(rd io.Reader, file string, n *Network, opt TableOptions) (_ []Candidate, err error) {
	data, err := io.ReadAll(rd)
	if err != nil {
		return nil, fmt.Errorf("flow: reading %s: %w", file, err)
	}
	defer func() { err = textColumns(err, file, data) }()
	e := &errs{file: file}
	if opt.Columns == nil {
		opt.Columns = map[string]string{}
	}
	if _, ok := opt.Columns["bid"]; !ok {
		opt.Columns["bid"] = "lane"
	}
	t, err := openTable(data, file, opt, candidateColumns, e)
	if err != nil {
		return nil, err
	}
	if err := t.require("from", "to", "cost"); err != nil {
		return nil, err
	}
	lk := newLaneLookup(n)
	ids := map[string]int{}
	type raw struct {
		c      Candidate
		rate   Decimal
		lo, hi Decimal
		fixed  Decimal
	}
	var rows []raw
	err = t.each(func(r *row) {
		var c Candidate
		c.Same = -1
		c.Line, _ = r.t.r.FieldPos(0)
		c.ID = fmt.Sprintf("bid %d", r.n)
		ok := true
		if r.has("lane") {
			id, okID := r.name("lane")
			if okID {
				if first, dup := ids[id]; dup {
					r.fail("lane", fmt.Errorf("%w candidate id: already used on data row %d", ErrDuplicate, first))
					okID = false
				} else {
					ids[id] = r.n
					c.ID = id
				}
			}
			ok = okID
		}
		for _, col := range []string{"from", "to"} {
			name, okN := r.name(col)
			if !okN {
				ok = false
				continue
			}
			v, found := lk.node(name)
			if !found {
				r.fail(col, fmt.Errorf("%w: the network has no node of this name", ErrUnknownNode))
				ok = false
				continue
			}
			if col == "from" {
				c.Tail = v
			} else {
				c.Head = v
			}
		}
		rate, okR := r.decimal("cost", false, Decimal{})
		if okR && rate.Mant < 0 {
			r.fail("cost", fmt.Errorf("rate %w", ErrNegative))
			okR = false
		}
		lo, okL := r.decimal("min", true, Decimal{})
		hi, okH := r.decimal("max", true, Decimal{Mant: NoLimit})
		if okL && lo.Mant < 0 {
			r.fail("min", fmt.Errorf("minimum %w", ErrNegative))
			okL = false
		}
		if okH && hi.Mant != NoLimit && hi.Mant < 0 {
			r.fail("max", fmt.Errorf("capacity %w", ErrNegative))
			okH = false
		}
		if okL && okH && hi.Mant != NoLimit && lo.Cmp(hi) > 0 {
			r.fail("min", fmt.Errorf("%w: min %s > max %s", ErrBounds, lo, hi))
			okL = false
		}
		for _, q := range []struct {
			col string
			d   Decimal
			ok  bool
		}{{"min", lo, okL}, {"max", hi, okH}} {
			if q.ok && q.d.Mant != NoLimit && int(q.d.Places) > n.QtyPlaces && r.has(q.col) {
				r.fail(q.col, fmt.Errorf("%w: %d decimal places, the network's quantities use %d", ErrSyntax, q.d.Places, n.QtyPlaces))
				ok = false
			}
		}
		fixed, okF := r.decimal("fixed", true, Decimal{})
		if okF && fixed.Mant < 0 {
			r.fail("fixed", fmt.Errorf("fixed cost %w", ErrNegative))
			okF = false
		}
		if !ok || !okR || !okL || !okH || !okF {
			return
		}
		rows = append(rows, raw{c: c, rate: rate, lo: lo, hi: hi, fixed: fixed})
	})
	if err != nil {
		return nil, err
	}
	if err := e.list.sortAndErr(); err != nil {
		return nil, err
	}
	places := n.RatePlaces
	for _, rw := range rows {
		places = max(places, int(rw.rate.Places))
	}
	if places > MaxPlaces {
		return nil, &ParseError{File: file, Field: "cost", Err: fmt.Errorf("rates need %d decimal places, at most %d are supported: %w", places, MaxPlaces, ErrOverflow)}
	}
	if places > n.RatePlaces {
		if err := n.RescaleRate(places - n.RatePlaces); err != nil {
			return nil, err
		}
	}
	out := make([]Candidate, len(rows))
	for i, rw := range rows {
		c := rw.c
		var err error
		if c.Rate, err = rw.rate.Scaled(n.RatePlaces); err != nil {
			return nil, &ParseError{File: file, Line: c.Line, Field: "cost", Text: rw.rate.String(), Err: err}
		}
		if c.Lower, err = rw.lo.Scaled(n.QtyPlaces); err != nil {
			return nil, &ParseError{File: file, Line: c.Line, Field: "min", Text: rw.lo.String(), Err: err}
		}
		c.Upper = NoLimit
		if rw.hi.Mant != NoLimit {
			if c.Upper, err = rw.hi.Scaled(n.QtyPlaces); err != nil {
				return nil, &ParseError{File: file, Line: c.Line, Field: "max", Text: rw.hi.String(), Err: err}
			}
		}
		fp := n.QtyPlaces + n.RatePlaces
		if int(rw.fixed.Places) > fp {
			return nil, &ParseError{File: file, Line: c.Line, Field: "fixed", Text: rw.fixed.String(),
				Err: fmt.Errorf("%w: %d decimal places, costs here use %d", ErrSyntax, rw.fixed.Places, fp)}
		}
		if c.Fixed, err = rw.fixed.Scaled(fp); err != nil {
			return nil, &ParseError{File: file, Line: c.Line, Field: "fixed", Text: rw.fixed.String(), Err: err}
		}
		for _, a := range lk.pair(c.Tail, c.Head) {
			if n.Rate[a] == c.Rate && n.Lower[a] == c.Lower && n.Upper[a] == c.Upper {
				c.Same = a
				break
			}
		}
		out[i] = c
	}
	return out, nil
}

// WithLanes returns a copy of n with the candidates appended as lanes (in
// order, after n's lanes); n is not changed. Lane names of the new lanes are
// the candidates' ids. O(|V|+|E|).
func (n *Network) WithLanes(cs []Candidate) *Network {
	c := *n
	m := n.NumLanes()
	c.Tail = append(append([]NodeID(nil), n.Tail...), make([]NodeID, len(cs))...)
	c.Head = append(append([]NodeID(nil), n.Head...), make([]NodeID, len(cs))...)
	c.Lower = append(append([]int64(nil), n.Lower...), make([]int64, len(cs))...)
	c.Upper = append(append([]int64(nil), n.Upper...), make([]int64, len(cs))...)
	c.Rate = append(append([]int64(nil), n.Rate...), make([]int64, len(cs))...)
	names := make([]string, m, m+len(cs))
	for a := 0; a < m; a++ {
		names[a] = n.LaneName(LaneID(a))
	}
	for i, k := range cs {
		c.Tail[m+i], c.Head[m+i] = k.Tail, k.Head
		c.Lower[m+i], c.Upper[m+i], c.Rate[m+i] = k.Lower, k.Upper, k.Rate
		names = append(names, k.ID)
	}
	c.LaneNames = names
	if n.Extra != nil {
		ex := &ExtraColumns{Names: n.Extra.Names, Values: append(append([][]string(nil), n.Extra.Values...), make([][]string, len(cs))...)}
		c.Extra = ex
	}
	return &c
}
