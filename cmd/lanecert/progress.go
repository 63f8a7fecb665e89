package main

import (
	"fmt"
	"io"
	"os"

	"lanecert/dual"
	"lanecert/flow"
)

// progress reports a long solve on a terminal.
type progress struct {
	f       *os.File
	written bool
}

// progressTo returns a progress reporter that writes to w when w is a
// terminal, and nil (no output, no cost) otherwise.
func progressTo(w io.Writer) *progress {
	f, ok := w.(*os.File)
	if !ok {
		return nil
	}
	st, err := f.Stat()
	if err != nil || st.Mode()&os.ModeCharDevice == 0 {
		return nil
	}
	return &progress{f: f}
}

// callbacks returns the solver's progress callbacks (nil when p is nil)
// for network n: while a first plan is sought, the quantity still to
// place; then the current cost.
func (p *progress) callbacks(n *flow.Network) *dual.Progress {
	if p == nil {
		return nil
	}
	return &dual.Progress{
		Cost: func(pivots int64, cost flow.Wide) {
			p.written = true
			fmt.Fprintf(p.f, "\r\033[Klanecert: solving, %d pivots, cost %s", pivots, cost.Format(n.QtyPlaces+n.RatePlaces))
		},
		Placing: func(pivots, unplaced int64) {
			p.written = true
			fmt.Fprintf(p.f, "\r\033[Klanecert: solving, %d pivots, finding a first plan: %s still to place", pivots, n.FormatQty(unplaced))
		},
	}
}

// done clears the progress line.
func (p *progress) done() {
	if p != nil && p.written {
		fmt.Fprint(p.f, "\r\033[K")
	}
}
