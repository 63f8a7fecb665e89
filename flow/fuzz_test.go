package flow

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"math/big"
	"os"
	"path/filepath"
	"reflect"
	"slices"
	"strconv"
	"strings"
	"testing"
)

// The fuzz targets check that the readers never panic, that every error is
// positioned (a *ParseError or an ErrorList of them), and that what they
// read survives a round trip: written back as text and read again, it gives
// the same network or plan. Run one with, for example,
//
//	go test ./flow -run '^$' -fuzz '^FuzzReadDIMACS$' -fuzztime 1m
//
// Plain `go test` runs the seed corpora only.

// checkPositioned fails unless err is a *ParseError or an ErrorList of
// them, each in one of files, with a sane position.
func checkPositioned(t *testing.T, err error, files ...string) {
	t.Helper()
	var pe *ParseError
	if !errors.As(err, &pe) {
		t.Fatalf("error %v (%T) is not positioned", err, err)
	}
	list := parseErrors(t, err)
	if len(list) == 0 {
		t.Fatal("empty ErrorList")
	}
	for _, e := range list {
		if !slices.Contains(files, e.File) || e.Line < 0 || e.Col < 0 || (e.Line == 0 && e.Col != 0) || e.Err == nil {
			t.Fatalf("bad position in %#v", e)
		}
		if msg := e.Error(); !strings.HasPrefix(msg, e.File) {
			t.Fatalf("message %q does not start with the file", msg)
		}
	}
}

// referenceTexts returns the contents of the reference files matching pattern.
func referenceTexts(f *testing.F, pattern string) [][]byte {
	paths, err := filepath.Glob(filepath.Join(referenceDir, pattern))
	if err != nil || len(paths) == 0 {
		f.Fatalf("no reference files %s: %v", pattern, err)
	}
	var out [][]byte
	for _, p := range paths {
		b, err := os.ReadFile(p)
		if err != nil {
			f.Fatal(err)
		}
		out = append(out, b)
	}
	return out
}

func FuzzParseDecimal(f *testing.F) {
	for _, s := range []string{"0", "12", "-3.5", "+7", "0.075", ".5", "5.", "1.50", "007", "1e3", "1.5E-2",
		"999999999999999999", "9223372036854775806", "9223372036854775807", "-9223372036854775808",
		"12345678901234567890", "1e-18", "1e-19", "1e19", "1e41", "0.0000000000000000001", "1.0000000000000000000000",
		"", "-", ".", "NaN", "Inf", "1,5", "1.2.3", "0x10", " 1", "1e", "e5", "12,50", "1.000,5"} {
		f.Add(s, false)
		f.Add(s, true)
	}
	for _, text := range referenceTexts(f, "*") {
		for _, tok := range strings.Fields(string(text)) {
			f.Add(tok, false)
		}
	}
	f.Fuzz(func(t *testing.T, s string, comma bool) {
		parse := ParseDecimal
		if comma {
			parse = ParseDecimalComma
		}
		d, err := parse(s)
		if err != nil {
			if !errors.Is(err, ErrNotDecimal) && !errors.Is(err, ErrOverflow) {
				t.Fatalf("ParseDecimal(%q): unexpected error %v", s, err)
			}
			return
		}
		if d.Places < 0 || d.Places > 18 || (d.Places > 0 && d.Mant%10 == 0) || d.Mant == NoLimit || d.Mant == -NoLimit {
			t.Fatalf("ParseDecimal(%q) = %+v: not canonical", s, d)
		}
		// An independent reading of the value: math/big.
		plain := s
		if comma {
			plain = strings.Replace(s, ",", ".", 1)
		}
		if r, ok := new(big.Rat).SetString(plain); ok {
			want := new(big.Rat).SetFrac(big.NewInt(d.Mant), new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(d.Places)), nil))
			if r.Cmp(want) != 0 {
				t.Fatalf("ParseDecimal(%q) = %s; math/big reads %s", s, d, r.RatString())
			}
		}
		text := FormatScaled(d.Mant, int(d.Places))
		if d.String() != text {
			t.Fatalf("String() = %q; FormatScaled %q", d.String(), text)
		}
		d2, err := ParseDecimal(text)
		if err != nil || d2 != d {
			t.Fatalf("ParseDecimal(%q) = %+v; reading %q back gives %+v, %v", s, d, text, d2, err)
		}
	})
}

// quoteCSV writes fields as one CSV record with every field quoted, so that
// no delimiter or quote inside a field counts. A CR LF inside a value is
// written CR CR LF: encoding/csv reads a CR LF line ending as LF.
func quoteCSV(w *bytes.Buffer, fields ...string) {
	for i, s := range fields {
		if i > 0 {
			w.WriteByte(',')
		}
		s = strings.ReplaceAll(s, `"`, `""`)
		s = strings.ReplaceAll(s, "\r\n", "\r\r\n")
		w.WriteString(`"` + s + `"`)
	}
	w.WriteByte('\n')
}

// writeCSVNetwork writes n as a lane table and a node table.
func writeCSVNetwork(n *Network, comma bool) (lanes, nodes []byte) {
	num := func(v int64, places int) string {
		s := FormatScaled(v, places)
		if comma {
			s = strings.Replace(s, ".", ",", 1)
		}
		return s
	}
	var lb, nb bytes.Buffer
	head := []string{"from", "to", "cost", "min", "max"}
	if n.LaneNames != nil {
		head = append([]string{"lane"}, head...)
	}
	if n.Extra != nil {
		head = append(head, n.Extra.Names...)
	}
	quoteCSV(&lb, head...)
	for a := range n.Tail {
		var rec []string
		if n.LaneNames != nil {
			rec = append(rec, n.LaneNames[a])
		}
		upper := "" // no limit
		if n.Upper[a] != NoLimit {
			upper = num(n.Upper[a], n.QtyPlaces)
		}
		rec = append(rec, n.Nodes[n.Tail[a]], n.Nodes[n.Head[a]], num(n.Rate[a], n.RatePlaces), num(n.Lower[a], n.QtyPlaces), upper)
		if n.Extra != nil {
			rec = append(rec, n.Extra.Values[a]...)
		}
		quoteCSV(&lb, rec...)
	}
	head = []string{"node", "supply"}
	if n.NodeExtra != nil {
		head = append(head, n.NodeExtra.Names...)
	}
	quoteCSV(&nb, head...)
	for v, name := range n.Nodes {
		rec := []string{name, num(n.Supply[v], n.QtyPlaces)}
		if n.NodeExtra != nil {
			vals := n.NodeExtra.Values[v]
			if vals == nil {
				vals = make([]string, len(n.NodeExtra.Names))
			}
			rec = append(rec, vals...)
		}
		quoteCSV(&nb, rec...)
	}
	return lb.Bytes(), nb.Bytes()
}

// writeDIMACS writes n in the DIMACS format. A supply beyond 10^17 (scaled)
// is split over several n lines, which add up when read; every single
// value then has at most 18 digits.
func writeDIMACS(n *Network) []byte {
	var b bytes.Buffer
	fmt.Fprintf(&b, "c written back\np min %d %d\n", n.NumNodes(), n.NumLanes())
	const chunk = int64(1e17)
	for v, s := range n.Supply {
		for s != 0 {
			c := min(max(s, -chunk), chunk)
			fmt.Fprintf(&b, "n %d %s\n", v+1, FormatScaled(c, n.QtyPlaces))
			s -= c
		}
	}
	for a := range n.Tail {
		capacity := "inf"
		if n.Upper[a] != NoLimit {
			capacity = FormatScaled(n.Upper[a], n.QtyPlaces)
		}
		fmt.Fprintf(&b, "a %d %d %s %s %s\n", n.Tail[a]+1, n.Head[a]+1, FormatScaled(n.Lower[a], n.QtyPlaces), capacity, FormatScaled(n.Rate[a], n.RatePlaces))
	}
	return b.Bytes()
}

// sameNetwork fails unless got, read back from what want was written as,
// holds the same values. Written values lose trailing zeros, so got may use
// fewer places; it is rescaled to want's places first.
func sameNetwork(t *testing.T, want, got *Network) {
	t.Helper()
	if got.QtyPlaces > want.QtyPlaces || got.RatePlaces > want.RatePlaces {
		t.Fatalf("places grew: %d,%d -> %d,%d", want.QtyPlaces, want.RatePlaces, got.QtyPlaces, got.RatePlaces)
	}
	if err := got.RescaleQty(want.QtyPlaces - got.QtyPlaces); err != nil {
		t.Fatal(err)
	}
	if err := got.RescaleRate(want.RatePlaces - got.RatePlaces); err != nil {
		t.Fatal(err)
	}
	norm := func(x *ExtraColumns) *ExtraColumns {
		if x == nil {
			return nil
		}
		c := &ExtraColumns{Names: x.Names}
		for _, v := range x.Values {
			if v == nil {
				v = make([]string, len(x.Names))
			}
			c.Values = append(c.Values, v)
		}
		return c
	}
	w, g := *want, *got
	w.NodeExtra, g.NodeExtra = norm(w.NodeExtra), norm(g.NodeExtra)
	w.Notes, g.Notes = nil, nil // how the first file was read, not what it holds
	if !reflect.DeepEqual(w, g) {
		t.Fatalf("first read got %#v (extra %q, node extra %q),\nsecond read got %#v (extra %q, node extra %q)",
			w, derefExtra(w.Extra), derefExtra(w.NodeExtra), g, derefExtra(g.Extra), derefExtra(g.NodeExtra))
	}
}

func derefExtra(x *ExtraColumns) any {
	if x == nil {
		return nil
	}
	return *x
}

func FuzzReadCSVNetwork(f *testing.F) {
	for _, s := range []string{
		"lane,from,to,cost,min,max\nL1,A,B,2.5,1,10\nL2,B,C,1,,\n",
		"from;to;cost\nA;B;12,50\n", "from\tto\tcost\nA\tB\t1\n",
		"\xef\xbb\xbffrom,to,cost\r\nA,B,1\r\n",
		"from,to,cost,note\n\"Port, Inc.\",\"He said \"\"hi\"\"\",1.5,\"a\r\r\nb\"\n",
		"mode,from,carrier,to,cost,notes\ntruck,A, ACME ,B,1,\nrail,B,,C,2,x\n",
		"ID,Origin,DESTINATION,Rate,Lower,Capacity,Qty\nx1,A,B,3,1,5,2\n",
		"from,to,cost,min,max\nA,B,2,0.125,12.5\nB,C,0.75,,3\n",
		"from,to,cost\nA,B,1000000000000000000\nB,C,0.1\n",
		"from,to,cost\nA,B,0.0000000000001\n",
		"", "from,to,cost\n", "from,to\nA,B\n", "from;to,cost\n", "from,to,cost\nA,B\"x,1\n",
		"from,to,cost,min,max\n,B,x,1,0\nA,B,1,-1,-2\n", "lane,from,to,cost\nL1,A,B,1\nL1,B,C,2\n",
	} {
		f.Add([]byte(s), []byte(nil), false)
		f.Add([]byte(s), []byte("node,supply,region\nA,5,EU\nB,-5,\nZ,0,US\n"), false)
		f.Add([]byte(s), []byte("node;supply;demand\nA;1,5;\nB;;1,5\n"), true)
	}
	for _, bad := range []string{"node,supply\nA,1\nA,2\n", "node,supply,demand\nA,-1,2\n", "node\nA\n"} {
		f.Add([]byte("from,to,cost\nA,B,1\n"), []byte(bad), false)
	}
	// The reference networks, as DIMACS text (an error here) and as tables.
	for _, text := range referenceTexts(f, "*.min") {
		f.Add(text, []byte(nil), false)
		if n, err := ReadDIMACS(bytes.NewReader(text), "ref.min"); err == nil {
			lanes, nodes := writeCSVNetwork(n, false)
			f.Add(lanes, nodes, false)
		}
	}
	f.Fuzz(func(t *testing.T, lanes, nodes []byte, comma bool) {
		opt := TableOptions{DecimalComma: comma}
		var nr io.Reader
		nodesFile := ""
		if len(nodes) > 0 {
			nr, nodesFile = bytes.NewReader(nodes), "nodes.csv"
		}
		n, plan, err := ReadCSVNetwork(bytes.NewReader(lanes), "lanes.csv", nr, nodesFile, opt)
		if err != nil {
			checkPositioned(t, err, "lanes.csv", nodesFile)
			return
		}
		if err := n.Validate(); err != nil {
			t.Fatal(err)
		}
		if plan != nil && plan.Len() != n.NumLanes() {
			t.Fatalf("plan of %d for %d lanes", plan.Len(), n.NumLanes())
		}
		l2, n2 := writeCSVNetwork(n, comma)
		back, _, err := ReadCSVNetwork(bytes.NewReader(l2), "lanes.csv", bytes.NewReader(n2), "nodes.csv", opt)
		if err != nil {
			t.Fatalf("reading back: %v\nlanes:\n%s\nnodes:\n%s", err, l2, n2)
		}
		sameNetwork(t, n, back)
	})
}

// writeCSVPlan writes p keyed by lane id.
func writeCSVPlan(n *Network, p *RawPlan) []byte {
	var b bytes.Buffer
	quoteCSV(&b, "lane", "flow")
	for a := range p.Len() {
		quoteCSV(&b, n.LaneName(LaneID(a)), FormatScaled(p.q.mant[a], int(p.q.places[a])))
	}
	return b.Bytes()
}

func FuzzReadCSVPlan(f *testing.F) {
	for _, s := range []string{
		"lane,flow\nL3,4\nL1,2.5\n", "from,to,flow\nB,C,3\n", "ID,Quantity\nL2,7\n", "lane,flow\nL2,\n",
		"lane;flow\n2;1,5\n", "lane,flow\n1,99.9999999\n3,0.0000000000001\n",
		"from,to,flow\nA,B,1\n", "lane,flow\nL9,1\n", "from,to,flow\nX,Y,1\n", "lane,flow\nL1,1\nL1,2\n",
		"lane,qty_kg\nL1,1\n", "", "lane,flow\n0,1\n",
	} {
		f.Add([]byte(s), false, false)
		f.Add([]byte(s), true, true)
	}
	f.Fuzz(func(t *testing.T, text []byte, numbered, comma bool) {
		// Lanes L1 and L2 run in parallel from A to B; numbered networks
		// have no lane column (ids 1, 2, 3).
		lanes := planNetLanes
		if numbered {
			lanes = "from,to,cost\nA,B,1\nA,B,2\nB,C,1\n"
		}
		n, _, err := ReadCSVNetwork(strings.NewReader(lanes), "lanes.csv", nil, "", TableOptions{})
		if err != nil {
			t.Fatal(err)
		}
		opt := TableOptions{DecimalComma: comma}
		p, err := ReadCSVPlan(bytes.NewReader(text), "plan.csv", n, opt)
		if err != nil {
			checkPositioned(t, err, "plan.csv")
			return
		}
		if p.Len() != n.NumLanes() {
			t.Fatalf("plan of %d for %d lanes", p.Len(), n.NumLanes())
		}
		back, err := ReadCSVPlan(bytes.NewReader(writeCSVPlan(n, p)), "plan.csv", n, TableOptions{})
		if err != nil {
			t.Fatalf("reading back: %v", err)
		}
		if !reflect.DeepEqual(planValues(p), planValues(back)) {
			t.Fatalf("first read got %v, second got %v", planValues(p), planValues(back))
		}
		if _, err := p.Bind(n, nil); err != nil && !errors.Is(err, ErrOverflow) {
			t.Fatalf("Bind: %v", err)
		}
	})
}

// announcedNodes returns the largest node count of the p lines in data.
func announcedNodes(data []byte) int {
	most := 0
	for _, line := range bytes.Split(data, []byte("\n")) {
		f := bytes.Fields(line)
		if len(f) >= 3 && string(f[0]) == "p" {
			if v, err := strconv.Atoi(string(f[2])); err == nil {
				most = max(most, v)
			}
		}
	}
	return most
}

func FuzzReadDIMACS(f *testing.F) {
	for _, text := range referenceTexts(f, "*.min") {
		f.Add(text)
	}
	for _, s := range []string{
		"p min 2 2\na 1 2 0 inf 1\na 2 1 1 Inf 1\n", "p min 3 0\nn 1 3\nn 2 -4\nn 1 2.5\nn 2 -1.5\n",
		"p min 2 2\nn 1 2\nn 2 -2\na 1 2 0.5 1.5 0.25\na 1 2 0 2 3\n",
		"\xef\xbb\xbfc first\r\n\r\n  p\tmin 3 3\r\nn 1 1\r\na 1 2 0 1 1\r\na 1 2 0 1 2\r\n a 2 2 0 1 0\r\n",
		"p min 2 0\nn 1 9000000000000000000\nn 1 200000000000000000\n", "p min 2 0\nn 1 -9223372036854775799\nn 1 -8\n",
		"p min 2 2\na 1 2 0 1 1000000000000000000\na 1 2 0 1 0.1\n", "p min 2 1\na 1 2 0 1 0.0000000000001\n",
		"", "c only\n", "p min 2 0\np min 2 0\n", "p min x 0\n", "n 1 5\np min 1 0\n", "p min 2 1\na 0 3 0 1 1\n",
		"p min 2 2\na 1 2 0 1 1\n", "p min 2 1\na 1 2 5 4 1\n", "p min 2 1\na 1 2 0 -4 1\n", "p min 2 1\na 1 2 x y z\n",
		"p min 2 0\nx 1 2\n", "p min 2 1073741824\n",
	} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		if announcedNodes(data) > 1<<16 {
			// Resource guard, not a correctness skip: a network of that
			// many nodes is valid but takes memory per node.
			t.Skip("too many nodes announced")
		}
		n, err := ReadDIMACS(bytes.NewReader(data), "net.min")
		if err != nil {
			checkPositioned(t, err, "net.min")
			return
		}
		if err := n.Validate(); err != nil {
			t.Fatal(err)
		}
		text := writeDIMACS(n)
		back, err := ReadDIMACS(bytes.NewReader(text), "net.min")
		if err != nil {
			t.Fatalf("reading back: %v\n%s", err, text)
		}
		sameNetwork(t, n, back)
	})
}

// writeDIMACSPlan writes f lines grouped by pair in decreasing (head, tail)
// order: not the arc order, but parallel arcs keep their relative order.
func writeDIMACSPlan(n *Network, p *RawPlan) []byte {
	order := make([]int, n.NumLanes())
	for a := range order {
		order[a] = a
	}
	slices.SortStableFunc(order, func(a, b int) int {
		if n.Head[a] != n.Head[b] {
			return int(n.Head[b] - n.Head[a])
		}
		return int(n.Tail[b] - n.Tail[a])
	})
	var b bytes.Buffer
	b.WriteString("s 0\n")
	for _, a := range order {
		fmt.Fprintf(&b, "f %d %d %s\n", n.Tail[a]+1, n.Head[a]+1, FormatScaled(p.q.mant[a], int(p.q.places[a])))
	}
	return b.Bytes()
}

func FuzzReadDIMACSPlan(f *testing.F) {
	for _, text := range referenceTexts(f, "*.flow") {
		f.Add(text)
	}
	for _, s := range []string{
		"s 7\nf 1 2 1\nf 1 2 2\nf 2 3 3\nf 1 3 4\n", "f 2 3 3\nf 1 3 4\nf 1 2 1\nf 1 2 2\n", "f 1 2 1\nf 2 3 3\nf 1 2 2\n",
		"c solved\ns 99999\nf 1 2 0.5\n", "f 1 2 99.9999999\n", "f 1 2 0.0000000000001\n",
		"f 1 2 1\nf 1 2 2\nf 1 2 3\n", "f 3 1 1\n", "f 4 1 1\n", "f 1 2 x\n", "f 1 2\n", "a 1 2 0 1 1\n", "",
	} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		n, err := ReadDIMACS(strings.NewReader(dimacsPlanNet), "net.min")
		if err != nil {
			t.Fatal(err)
		}
		p, err := ReadDIMACSPlan(bytes.NewReader(data), "plan.flow", n)
		if err != nil {
			checkPositioned(t, err, "plan.flow")
			return
		}
		if p.Len() != n.NumLanes() {
			t.Fatalf("plan of %d for %d lanes", p.Len(), n.NumLanes())
		}
		text := writeDIMACSPlan(n, p)
		back, err := ReadDIMACSPlan(bytes.NewReader(text), "plan.flow", n)
		if err != nil {
			t.Fatalf("reading back: %v\n%s", err, text)
		}
		if !reflect.DeepEqual(planValues(p), planValues(back)) {
			t.Fatalf("first read got %v, second got %v\n%s", planValues(p), planValues(back), text)
		}
		if _, err := p.Bind(n, nil); err != nil && !errors.Is(err, ErrOverflow) {
			t.Fatalf("Bind: %v", err)
		}
	})
}
