package main

import (
	"fmt"
	"io"
	"os"

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

// callback returns the solver's progress callback (nil when p is nil);
// places is the network's cost scale.
func (p *progress) callback(places int) func(int64, flow.Wide) {
	if p == nil {
		return nil
	}
	return func(pivots int64, cost flow.Wide) {
		p.written = true
		fmt.Fprintf(p.f, "\rlanecert: solving, %d pivots, cost %s", pivots, cost.Format(places))
	}
}

// done clears the progress line.
func (p *progress) done() {
	if p != nil && p.written {
		fmt.Fprint(p.f, "\r\033[K")
	}
}
