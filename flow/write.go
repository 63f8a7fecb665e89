package flow

import (
	"bufio"
	"encoding/csv"
	"fmt"
	"io"
	"strconv"
)

// WriteLaneCSV writes n's lane table with the quantities x in a flow column:
// lane, from, to, cost, min, max (empty: no limit), flow, then the carried
// columns. It reads back with ReadCSVNetwork. O(|E|).
func WriteLaneCSV(w io.Writer, n *Network, x []int64) error {
	cw := csv.NewWriter(w)
	head := []string{"lane", "from", "to", "cost", "min", "max", "flow"}
	if n.Extra != nil {
		head = append(head, n.Extra.Names...)
	}
	if err := cw.Write(head); err != nil {
		return err
	}
	rec := make([]string, len(head))
	for a := range n.Tail {
		rec = rec[:7]
		rec[0] = n.LaneName(LaneID(a))
		rec[1], rec[2] = n.Nodes[n.Tail[a]], n.Nodes[n.Head[a]]
		rec[3] = n.FormatRate(n.Rate[a])
		rec[4] = n.FormatQty(n.Lower[a])
		rec[5] = ""
		if n.Upper[a] != NoLimit {
			rec[5] = n.FormatQty(n.Upper[a])
		}
		rec[6] = n.FormatQty(x[a])
		if n.Extra != nil {
			rec = append(rec, n.Extra.Values[a]...)
			for len(rec) < len(head) {
				rec = append(rec, "")
			}
		}
		if err := cw.Write(rec); err != nil {
			return err
		}
	}
	cw.Flush()
	return cw.Error()
}

// WriteDIMACS writes n in the DIMACS minimum-cost flow format. Nodes are
// numbered 1..|V| in NodeID order; when the names are not those numbers, c
// lines give each node's name. Decimal quantities and rates are written as
// decimals (ReadDIMACS reads them exactly). O(|V|+|E|).
func WriteDIMACS(w io.Writer, n *Network) error {
	bw := bufio.NewWriter(w)
	fmt.Fprintf(bw, "c written by lanecert\n")
	writeNodeNames(bw, n)
	fmt.Fprintf(bw, "p min %d %d\n", n.NumNodes(), n.NumLanes())
	for v, b := range n.Supply {
		if b != 0 {
			fmt.Fprintf(bw, "n %d %s\n", v+1, n.FormatQty(b))
		}
	}
	for a := range n.Tail {
		hi := "inf"
		if n.Upper[a] != NoLimit {
			hi = n.FormatQty(n.Upper[a])
		}
		fmt.Fprintf(bw, "a %d %d %s %s %s\n", n.Tail[a]+1, n.Head[a]+1, n.FormatQty(n.Lower[a]), hi, n.FormatRate(n.Rate[a]))
	}
	return bw.Flush()
}

func writeNodeNames(bw *bufio.Writer, n *Network) {
	for v, name := range n.Nodes {
		if name != strconv.Itoa(v+1) {
			for v, name := range n.Nodes {
				fmt.Fprintf(bw, "c node %d %s\n", v+1, name)
			}
			return
		}
	}
}

// WriteDIMACSPlan writes the plan x as DIMACS solution lines: an s line with
// the cost, then one f line per lane in lane order (so parallel lanes match
// in order). O(|E|).
func WriteDIMACSPlan(w io.Writer, n *Network, x []int64, cost Wide) error {
	bw := bufio.NewWriter(w)
	fmt.Fprintf(bw, "c written by lanecert\n")
	writeNodeNames(bw, n)
	fmt.Fprintf(bw, "s %s\n", n.FormatCost(cost))
	for a := range n.Tail {
		fmt.Fprintf(bw, "f %d %d %s\n", n.Tail[a]+1, n.Head[a]+1, n.FormatQty(x[a]))
	}
	return bw.Flush()
}
