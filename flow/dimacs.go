package flow

import (
	"bytes"
	"fmt"
	"io"
	"math"
	"strconv"
)

// ReadDIMACS reads a network in the DIMACS minimum-cost flow format:
//
//	c any comment
//	p min NODES ARCS
//	n ID SUPPLY            (positive supply, negative demand; repeats add up)
//	a SRC DST LOW CAP COST
//
// Nodes are numbered 1..NODES and named by their numbers; lanes are named by
// their 1-based arc number. Numbers may be decimals (parsed exactly); CAP may
// be "inf" for no limit. Errors are positioned (line, column) and collected.
// It runs in O(|V|+|E|) time.
func ReadDIMACS(r io.Reader, file string) (*Network, error) {
	data, err := io.ReadAll(r)
	if err != nil {
		return nil, fmt.Errorf("flow: reading %s: %w", file, err)
	}
	return parseDIMACS(data, file)
}

// parseDIMACS is ReadDIMACS on the file's bytes.
func parseDIMACS(data []byte, file string) (_ *Network, err error) {
	defer func() { err = textColumns(err, file, data) }()
	e := &errs{file: file}
	n := &Network{}
	var supply, lower, upper, rate rawQty
	nodes, arcs := -1, 0
	pLine := 0
	var tok [8]field
	err = eachLine(data, func(line int, text []byte) {
		f := splitFields(text, tok[:0])
		if len(f) == 0 {
			return
		}
		bad := func(i int, what string, err error) {
			c, t := 0, ""
			if i < len(f) {
				c, t = f[i].col, string(f[i].text)
			}
			e.add(line, c, what, t, err)
		}
		switch string(f[0].text) {
		case "c":
			return
		case "p":
			if pLine != 0 {
				bad(0, "p", fmt.Errorf("%w: a second problem line (the first is on line %d)", ErrDuplicate, pLine))
				return
			}
			pLine = line
			if len(f) != 4 || string(f[1].text) != "min" {
				bad(0, "p", fmt.Errorf("%w: want \"p min NODES ARCS\"", ErrSyntax))
				return
			}
			nn, err1 := strconv.Atoi(string(f[2].text))
			na, err2 := strconv.Atoi(string(f[3].text))
			if err1 != nil || nn < 0 || nn > maxDIMACSNodes {
				bad(2, "NODES", fmt.Errorf("%w: want a node count from 0 to %d", ErrSyntax, maxDIMACSNodes))
				return
			}
			if err2 != nil || na < 0 || na > 1<<30 {
				bad(3, "ARCS", fmt.Errorf("%w: want an arc count", ErrSyntax))
				return
			}
			nodes, arcs = nn, na
			n.Nodes = make([]string, nodes)
			for i := range n.Nodes {
				n.Nodes[i] = strconv.Itoa(i + 1)
			}
			supply.mant = make([]int64, nodes)
			supply.places = make([]int8, nodes)
			// An arc line takes at least 12 bytes ("a 1 1 0 0 0\n"): do not
			// trust the announced count beyond what the file can hold.
			c := min(arcs, len(data)/12+1)
			n.Tail = make([]NodeID, 0, c)
			n.Head = make([]NodeID, 0, c)
			lower.mant, lower.places = make([]int64, 0, c), make([]int8, 0, c)
			upper.mant, upper.places = make([]int64, 0, c), make([]int8, 0, c)
			rate.mant, rate.places = make([]int64, 0, c), make([]int8, 0, c)
		case "n":
			if nodes < 0 {
				bad(0, "n", fmt.Errorf("%w: node line before the problem line", ErrSyntax))
				return
			}
			if len(f) != 3 {
				bad(0, "n", fmt.Errorf("%w: want \"n ID SUPPLY\"", ErrSyntax))
				return
			}
			v, ok := nodeRef(f[1].text, nodes)
			if !ok {
				bad(1, "ID", fmt.Errorf("%w: want a node number from 1 to %d", ErrUnknownNode, nodes))
				return
			}
			d, err := ParseDecimal(string(f[2].text))
			if err != nil {
				bad(2, "SUPPLY", err)
				return
			}
			p := max(d.Places, supply.places[v])
			a, err1 := ScaleUp(supply.mant[v], int(p-supply.places[v]))
			b, err2 := ScaleUp(d.Mant, int(p-d.Places))
			s, err3 := AddChecked(a, b)
			if err1 != nil || err2 != nil || err3 != nil || s == math.MinInt64 {
				// MinInt64 has no negation: supplies stay in [-MaxInt64, MaxInt64]
				// like every parsed value.
				bad(2, "SUPPLY", fmt.Errorf("sum of the node's supplies %w", ErrOverflow))
				return
			}
			supply.mant[v], supply.places[v] = s, p
		case "a":
			if nodes < 0 {
				bad(0, "a", fmt.Errorf("%w: arc line before the problem line", ErrSyntax))
				return
			}
			if len(f) != 6 {
				bad(0, "a", fmt.Errorf("%w: want \"a SRC DST LOW CAP COST\"", ErrSyntax))
				return
			}
			t, ok1 := nodeRef(f[1].text, nodes)
			h, ok2 := nodeRef(f[2].text, nodes)
			if !ok1 {
				bad(1, "SRC", fmt.Errorf("%w: want a node number from 1 to %d", ErrUnknownNode, nodes))
			}
			if !ok2 {
				bad(2, "DST", fmt.Errorf("%w: want a node number from 1 to %d", ErrUnknownNode, nodes))
			}
			lo, err3 := ParseDecimal(string(f[3].text))
			if err3 != nil {
				bad(3, "LOW", err3)
			}
			var hi Decimal
			var err4 error
			if s := string(f[4].text); s == "inf" || s == "Inf" {
				hi = Decimal{Mant: NoLimit}
			} else if hi, err4 = ParseDecimal(s); err4 != nil {
				bad(4, "CAP", err4)
			}
			c, err5 := ParseDecimal(string(f[5].text))
			if err5 != nil {
				bad(5, "COST", err5)
			}
			if !ok1 || !ok2 || err3 != nil || err4 != nil || err5 != nil {
				return
			}
			if lo.Mant < 0 {
				bad(3, "LOW", fmt.Errorf("minimum %w", ErrNegative))
				return
			}
			if hi.Mant != NoLimit && hi.Mant < 0 {
				bad(4, "CAP", fmt.Errorf("capacity %w", ErrNegative))
				return
			}
			if hi.Mant != NoLimit && lo.Cmp(hi) > 0 {
				bad(3, "LOW", fmt.Errorf("%w: LOW %s > CAP %s", ErrBounds, lo, hi))
				return
			}
			if len(n.Tail) == arcs {
				bad(0, "a", fmt.Errorf("%w: more arc lines than the %d the problem line announces", ErrSyntax, arcs))
				return
			}
			n.Tail = append(n.Tail, t)
			n.Head = append(n.Head, h)
			lower.add(lo)
			upper.add(hi)
			rate.add(c)
		default:
			bad(0, "line", fmt.Errorf("%w: want a line starting with c, p, n or a", ErrSyntax))
		}
	})
	if err != nil {
		return nil, err
	}
	if pLine == 0 && len(e.list) == 0 {
		if len(bytes.TrimSpace(data)) == 0 {
			return nil, &ParseError{File: file, Err: ErrEmpty}
		}
		return nil, &ParseError{File: file, Err: fmt.Errorf("%w: no \"p min NODES ARCS\" line", ErrSyntax)}
	}
	if len(e.list) == 0 && len(n.Tail) != arcs {
		e.add(pLine, 0, "ARCS", strconv.Itoa(arcs), fmt.Errorf("%w: the problem line announces %d arcs, the file has %d", ErrSyntax, arcs, len(n.Tail)))
	}
	if err := e.list.sortAndErr(); err != nil {
		return nil, err
	}
	if err := n.finishScales(file, &supply, &lower, &upper, &rate); err != nil {
		return nil, err
	}
	return n, nil
}

// ReadDIMACSPlan reads a plan as DIMACS solution lines for network n:
//
//	c any comment
//	s COST                 (optional, not used)
//	f SRC DST FLOW
//
// Lanes without an f line carry 0. Parallel lanes between the same pair are
// matched in file order: the k-th f line for a pair goes to the k-th lane of
// that pair. A pair without a lane left for it is an error. O(|E| log |E|)
// at worst, O(|E|) when the f lines follow the arc order.
func ReadDIMACSPlan(r io.Reader, file string, n *Network) (_ *RawPlan, err error) {
	data, err := io.ReadAll(r)
	if err != nil {
		return nil, fmt.Errorf("flow: reading %s: %w", file, err)
	}
	defer func() { err = textColumns(err, file, data) }()
	e := &errs{file: file}
	m := n.NumLanes()
	plan := &RawPlan{File: file}
	plan.q.mant = make([]int64, m)
	plan.q.places = make([]int8, m)
	taken := make([]bool, m)
	next := 0 // fast path: f lines in arc order
	var lk *laneLookup
	var used []int32 // per position in lk.ord: lanes of the pair already taken
	var tok [8]field
	err = eachLine(data, func(line int, text []byte) {
		f := splitFields(text, tok[:0])
		if len(f) == 0 {
			return
		}
		bad := func(i int, what string, err error) {
			c, t := 0, ""
			if i < len(f) {
				c, t = f[i].col, string(f[i].text)
			}
			e.add(line, c, what, t, err)
		}
		switch string(f[0].text) {
		case "c", "s":
			return
		case "f":
		default:
			bad(0, "line", fmt.Errorf("%w: want a line starting with c, s or f", ErrSyntax))
			return
		}
		if len(f) != 4 {
			bad(0, "f", fmt.Errorf("%w: want \"f SRC DST FLOW\"", ErrSyntax))
			return
		}
		t, ok1 := nodeRef(f[1].text, n.NumNodes())
		h, ok2 := nodeRef(f[2].text, n.NumNodes())
		if !ok1 {
			bad(1, "SRC", fmt.Errorf("%w: want a node number from 1 to %d", ErrUnknownNode, n.NumNodes()))
		}
		if !ok2 {
			bad(2, "DST", fmt.Errorf("%w: want a node number from 1 to %d", ErrUnknownNode, n.NumNodes()))
		}
		d, err := ParseDecimal(string(f[3].text))
		if err != nil {
			bad(3, "FLOW", err)
		}
		if !ok1 || !ok2 || err != nil {
			return
		}
		a := -1
		if next < m && n.Tail[next] == t && n.Head[next] == h && !taken[next] {
			a = next
			next++
		} else {
			if lk == nil {
				lk = newLaneLookup(n)
				lk.pair(0, 0)
				used = make([]int32, m)
			}
			ls := lk.pair(t, h)
			if len(ls) == 0 {
				bad(2, "DST", fmt.Errorf("%w: no arc runs from %d to %d", ErrUnknownLane, t+1, h+1))
				return
			}
			base := pairBase(lk, ls)
			for int(used[base]) < len(ls) && taken[ls[used[base]]] {
				used[base]++
			}
			if int(used[base]) == len(ls) {
				bad(0, "f", fmt.Errorf("%w: more f lines for %d -> %d than the %d arc(s) between them", ErrDuplicate, t+1, h+1, len(ls)))
				return
			}
			a = int(ls[used[base]])
			used[base]++
		}
		taken[a] = true
		plan.q.mant[a], plan.q.places[a] = d.Mant, d.Places
	})
	if err != nil {
		return nil, err
	}
	if err := e.list.sortAndErr(); err != nil {
		return nil, err
	}
	return plan, nil
}

// pairBase returns the index in lk.ord where the sub-slice ls starts.
func pairBase(lk *laneLookup, ls []LaneID) int {
	if len(ls) == 0 {
		return 0
	}
	return cap(lk.ord) - cap(ls)
}

func nodeRef(b []byte, nodes int) (NodeID, bool) {
	v, err := strconv.Atoi(string(b))
	if err != nil || v < 1 || v > nodes {
		return 0, false
	}
	return NodeID(v - 1), true
}

// field is one whitespace-separated token of a line with its 1-based column.
type field struct {
	text []byte
	col  int
}

func splitFields(line []byte, out []field) []field {
	i := 0
	for i < len(line) {
		for i < len(line) && (line[i] == ' ' || line[i] == '\t' || line[i] == '\r') {
			i++
		}
		if i == len(line) {
			break
		}
		j := i
		for j < len(line) && line[j] != ' ' && line[j] != '\t' && line[j] != '\r' {
			j++
		}
		out = append(out, field{text: line[i:j], col: i + 1})
		i = j
	}
	return out
}

// eachLine calls fn for each line of data (1-based numbers, without the
// line ending). It stops early, without error, once too many parse errors
// were collected by the caller.
func eachLine(data []byte, fn func(line int, text []byte)) error {
	data = bytes.TrimPrefix(data, []byte("\xef\xbb\xbf"))
	line := 0
	for len(data) > 0 {
		line++
		i := bytes.IndexByte(data, '\n')
		var text []byte
		if i < 0 {
			text, data = data, nil
		} else {
			text, data = data[:i], data[i+1:]
		}
		fn(line, text)
	}
	return nil
}

// maxDIMACSNodes bounds the node count a DIMACS problem line may announce:
// every announced node is stored (with its name), so a short file must not
// be able to demand gigabytes.
const maxDIMACSNodes = 1 << 24
