package flow

import (
	"errors"
	"fmt"
	"reflect"
	"strings"
	"testing"
)

// Positions in these tests are counted by hand from the input text: lines
// from 1 (the header is line 1), columns as 1-based byte offsets of the
// field's first byte (the opening quote of a quoted field), as encoding/csv
// reports them. Col 0 means the whole line, Line 0 the whole file.

// wantErr is one expected positioned error.
type wantErr struct {
	line, col int
	field     string
	err       error // sentinel, tested with errors.Is
}

// parseErrors returns the positioned errors of err, failing the test if
// err is neither a *ParseError nor an ErrorList.
func parseErrors(t *testing.T, err error) []*ParseError {
	t.Helper()
	var list ErrorList
	if errors.As(err, &list) {
		return list
	}
	var pe *ParseError
	if errors.As(err, &pe) {
		return []*ParseError{pe}
	}
	t.Fatalf("error %v (%T) is not a *ParseError or ErrorList", err, err)
	return nil
}

// checkErrs asserts that err holds exactly the errors of want, in order,
// all in file.
func checkErrs(t *testing.T, err error, file string, want []wantErr) {
	t.Helper()
	if err == nil {
		t.Fatalf("no error; want %v", want)
	}
	got := parseErrors(t, err)
	if len(got) != len(want) {
		t.Fatalf("got %d errors; want %d:\n%v", len(got), len(want), err)
	}
	for i, w := range want {
		g := got[i]
		if g.File != file || g.Line != w.line || g.Col != w.col || g.Field != w.field || !errors.Is(g, w.err) {
			t.Errorf("error %d = {%s %d:%d field %q: %v}; want {%s %d:%d field %q: %v}",
				i, g.File, g.Line, g.Col, g.Field, g.Err, file, w.line, w.col, w.field, w.err)
		}
	}
}

func readNet(t *testing.T, lanes, nodes string, opt TableOptions) (*Network, *RawPlan) {
	t.Helper()
	n, p, err := readNetErr(lanes, nodes, opt)
	if err != nil {
		t.Fatalf("ReadCSVNetwork: %v", err)
	}
	if err := n.Validate(); err != nil {
		t.Fatalf("Validate: %v", err)
	}
	return n, p
}

// readNetErr reads lanes.csv and, when nodes is not empty, nodes.csv.
func readNetErr(lanes, nodes string, opt TableOptions) (*Network, *RawPlan, error) {
	if nodes == "" {
		return ReadCSVNetwork(strings.NewReader(lanes), "lanes.csv", nil, "", opt)
	}
	return ReadCSVNetwork(strings.NewReader(lanes), "lanes.csv", strings.NewReader(nodes), "nodes.csv", opt)
}

func TestReadCSVNetworkLaneErrors(t *testing.T) {
	const hdr = "from,to,cost,min,max\n"
	tests := []struct {
		name  string
		lanes string
		opt   TableOptions
		want  []wantErr
		msg   string // a part of the message, if checked
	}{
		{name: "missing cost", lanes: "from,to\nA,B\n",
			want: []wantErr{{1, 0, "header", ErrMissingColumn}}, msg: `want column(s) cost; the header has "from", "to"`},
		{name: "missing from", lanes: "to,cost\nB,1\n",
			want: []wantErr{{1, 0, "header", ErrMissingColumn}}, msg: "want column(s) from;"},
		{name: "missing from and to", lanes: "origin_city,cost,x\nA,1,2\n",
			want: []wantErr{{1, 0, "header", ErrMissingColumn}}, msg: "want column(s) from, to;"},
		{name: "empty file", lanes: "", want: []wantErr{{0, 0, "", ErrEmpty}}},
		{name: "blank file", lanes: " \n\r\n\n", want: []wantErr{{0, 0, "", ErrEmpty}}},
		{name: "byte order mark only", lanes: "\xef\xbb\xbf", want: []wantErr{{0, 0, "", ErrEmpty}}},
		{name: "header only", lanes: "from,to,cost\n", want: []wantErr{{2, 0, "", ErrEmpty}}},
		{name: "header and blank lines", lanes: "from,to,cost\n\n\n", want: []wantErr{{2, 0, "", ErrEmpty}}},
		// "A,B,abc": A at 1, B at 3, abc at 5.
		{name: "text for cost", lanes: "from,to,cost\nA,B,abc\n", want: []wantErr{{2, 5, "cost", ErrNotDecimal}}},
		{name: "empty cost", lanes: "from,to,cost\nA,B,\n", want: []wantErr{{2, 5, "cost", ErrNotDecimal}}, msg: "the cell is empty"},
		{name: "thousands separator", lanes: "from,to,cost\nA,B,\"1,000\"\n", want: []wantErr{{2, 5, "cost", ErrNotDecimal}}},
		{name: "NaN cost", lanes: "from,to,cost\nA,B,NaN\n", want: []wantErr{{2, 5, "cost", ErrNotFinite}}},
		// "A,B,1,0,Inf": min at 7, max at 9.
		{name: "Inf capacity", lanes: hdr + "A,B,1,0,Inf\n", want: []wantErr{{2, 9, "max", ErrNotFinite}}},
		{name: "-inf minimum", lanes: hdr + "A,B,1,-inf,1\n", want: []wantErr{{2, 7, "min", ErrNotFinite}}},
		{name: "+Infinity cost", lanes: hdr + "A,B,+Infinity,0,1\n", want: []wantErr{{2, 5, "cost", ErrNotFinite}}},
		{name: "min above max", lanes: hdr + "A,B,1,5,4\n", want: []wantErr{{2, 7, "min", ErrBounds}}, msg: "min 5 > max 4"},
		{name: "min above max in decimals", lanes: hdr + "A,B,1,2.5,2.49\n", want: []wantErr{{2, 7, "min", ErrBounds}}},
		{name: "negative min", lanes: hdr + "A,B,1,-1,4\n", want: []wantErr{{2, 7, "min", ErrNegative}}},
		{name: "negative capacity", lanes: hdr + "A,B,1,0,-4\n", want: []wantErr{{2, 9, "max", ErrNegative}}},
		{name: "duplicate lane id", lanes: "lane,from,to,cost\nL1,A,B,1\nL2,B,C,1\nL1,B,C,2\n",
			want: []wantErr{{4, 1, "lane", ErrDuplicate}}, msg: "already used on line 2"},
		{name: "empty lane id", lanes: "lane,from,to,cost\n,A,B,1\n", want: []wantErr{{2, 1, "lane", ErrSyntax}}},
		{name: "empty from", lanes: "from,to,cost\n,B,1\n", want: []wantErr{{2, 1, "from", ErrSyntax}}, msg: "want a name"},
		// "A,  ,1": to starts at 3 (the spaces are part of the cell).
		{name: "blank to", lanes: "from,to,cost\nA,  ,1\n", want: []wantErr{{2, 3, "to", ErrSyntax}}},
		{name: "too few fields", lanes: "from,to,cost\nA,B,1\nA,B\n", want: []wantErr{{3, 1, "", ErrSyntax}}, msg: "wrong number of fields"},
		{name: "too many fields", lanes: "from,to,cost\nA,B,1,2\n", want: []wantErr{{2, 1, "", ErrSyntax}}},
		// `A,B"x,1`: the bare quote is byte 4.
		{name: "bare quote", lanes: "from,to,cost\nA,B\"x,1\n", want: []wantErr{{2, 4, "", ErrSyntax}}, msg: `bare "`},
		// `A,"B,1` + newline is 7 bytes; encoding/csv reports the end of input, column 8.
		{name: "unterminated quote", lanes: "from,to,cost\nA,\"B,1\n", want: []wantErr{{2, 8, "", ErrSyntax}}},
		// "from,to,cost,rate": rate (a synonym of cost) starts at 14.
		{name: "synonym twice", lanes: "from,to,cost,rate\nA,B,1,1\n",
			want: []wantErr{{1, 14, "header", ErrAmbiguous}}, msg: `column "cost" is also given by header "cost" (column 3)`},
		{name: "header case twice", lanes: "From,to,cost,FROM\nA,B,1,C\n", want: []wantErr{{1, 14, "header", ErrAmbiguous}}},
		{name: "mapping twice", lanes: "from,to,cost,rate_usd\nA,B,1,1\n", opt: TableOptions{Columns: map[string]string{"rate_usd": "cost"}},
			want: []wantErr{{1, 14, "header", ErrAmbiguous}}},
		// One ',' and one ';' in the header: no delimiter wins.
		{name: "ambiguous delimiter", lanes: "from;to,cost\nA;B,1\n", want: []wantErr{{1, 0, "", ErrAmbiguous}}},
		{name: "ambiguous delimiter tab", lanes: "from\tto,cost;x\n", want: []wantErr{{1, 0, "", ErrAmbiguous}}},
		{name: "single column", lanes: "from\nA\n", want: []wantErr{{1, 0, "", ErrSyntax}}},
		// Columns in the order cost, from, to: the from error is found
		// first but sorts after the cost error.
		{name: "sorted by column", lanes: "cost,from,to\nx,,B\n",
			want: []wantErr{{2, 1, "cost", ErrNotDecimal}, {2, 3, "from", ErrSyntax}}},
		// ",B,x,1,0": from 1, to 2, cost 4, min 6, max 8. "A,B,1,-1,": min 7.
		{name: "several rows", lanes: hdr + ",B,x,1,0\nA,B,1,-1,\n",
			want: []wantErr{{2, 1, "from", ErrSyntax}, {2, 4, "cost", ErrNotDecimal}, {2, 6, "min", ErrBounds}, {3, 7, "min", ErrNegative}}},
		// `"A, Inc.",B,"x"`: the quoted name is 9 bytes, B at 11, "x" at 13.
		{name: "after a quoted field", lanes: "from,to,cost\n\"A, Inc.\",B,\"x\"\n", want: []wantErr{{2, 13, "cost", ErrNotDecimal}}},
		// Columns count characters, not bytes: "Zürich,Łódź,x" has x at
		// character 13 (byte 15); a tab is one character.
		{name: "characters before the cell", lanes: "from,to,cost\nZürich,Łódź,x\n", want: []wantErr{{2, 13, "cost", ErrNotDecimal}}},
		{name: "characters in a quoted cell", lanes: "from,to,cost\n\"Ölhafen, Süd\",B,x\n", want: []wantErr{{2, 18, "cost", ErrNotDecimal}}},
		{name: "characters before a syntax error", lanes: "from,to,cost\nÄ,B\"x,1\n", want: []wantErr{{2, 4, "", ErrSyntax}}},
		{name: "tab delimiter and characters", lanes: "from\tto\tcost\né\tè\tx\n", want: []wantErr{{2, 5, "cost", ErrNotDecimal}}},
		// A bad cost on line 2, then a CSV syntax error on line 3: both.
		{name: "error before a syntax error", lanes: "from,to,cost\nA,B,x\nA,B\n",
			want: []wantErr{{2, 5, "cost", ErrNotDecimal}, {3, 1, "", ErrSyntax}}},
		{name: "CRLF", lanes: "from,to,cost\r\nA,B,1\r\nA,B,y\r\n", want: []wantErr{{3, 5, "cost", ErrNotDecimal}}},
		{name: "blank line counts as a line", lanes: "from,to,cost\n\nA,B,y\n", want: []wantErr{{3, 5, "cost", ErrNotDecimal}}},
		// Without the option a comma is read as a decimal comma only when no
		// number uses a point (see TestDecimalCommaDetection); mixing is an
		// error at the second style.
		{name: "decimal comma after a decimal point", lanes: "from;to;cost\nA;B;1.5\nB;C;1,5\n", want: []wantErr{{3, 5, "cost", ErrAmbiguous}}},
		{name: "decimal point with the comma option", lanes: "from;to;cost\nA;B;1.5\n", opt: TableOptions{DecimalComma: true},
			want: []wantErr{{2, 5, "cost", ErrNotDecimal}}},
		{name: "20 digits", lanes: "from,to,cost\nA,B,12345678901234567890\n", want: []wantErr{{2, 5, "cost", ErrOverflow}}},
		// 13 places are more than MaxPlaces (12): a whole-file error.
		{name: "rate places", lanes: "from,to,cost\nA,B,0.0000000000001\n", want: []wantErr{{0, 0, "", ErrOverflow}}, msg: "at most 12"},
		{name: "quantity places", lanes: "from,to,cost,max\nA,B,1,0.0000000000001\n", want: []wantErr{{0, 0, "", ErrOverflow}}},
		// 10^18 on the 1-place scale of 0.1 is 10^19 > MaxInt64.
		{name: "scaling overflows", lanes: "from,to,cost\nA,B,1000000000000000000\nB,C,0.1\n",
			want: []wantErr{{0, 0, "cost", ErrOverflow}}, msg: "lane 1"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			n, _, err := readNetErr(tc.lanes, "", tc.opt)
			if err == nil {
				t.Fatalf("no error; network %+v", n)
			}
			checkErrs(t, err, "lanes.csv", tc.want)
			if tc.msg != "" && !strings.Contains(err.Error(), tc.msg) {
				t.Errorf("message %q does not contain %q", err, tc.msg)
			}
			if msg := err.Error(); !strings.HasPrefix(msg, "lanes.csv") || strings.HasSuffix(msg, ".") {
				t.Errorf("message %q: want a lanes.csv prefix and no full stop", msg)
			}
		})
	}
}

func TestReadCSVNetworkErrorListMessage(t *testing.T) {
	var b strings.Builder
	b.WriteString("from,to,cost\n")
	for i := 0; i < 12; i++ {
		b.WriteString("A,B,x\n") // rows on lines 2..13, cost at column 5
	}
	_, _, err := readNetErr(b.String(), "", TableOptions{})
	var list ErrorList
	if !errors.As(err, &list) || len(list) != 12 {
		t.Fatalf("got %v; want an ErrorList of 12", err)
	}
	for i, e := range list {
		if e.Line != i+2 || e.Col != 5 || !errors.Is(e, ErrNotDecimal) {
			t.Errorf("error %d = %v; want line %d column 5", i, e, i+2)
		}
	}
	lines := strings.Split(err.Error(), "\n")
	if len(lines) != 11 {
		t.Fatalf("message has %d lines; want 10 errors and a count:\n%v", len(lines), err)
	}
	if want := `lanes.csv:2:5: cost "x": want a decimal number such as 12, -3.5 or 0.075`; lines[0] != want {
		t.Errorf("first line %q; want %q", lines[0], want)
	}
	if want := "(and 2 more errors)"; lines[10] != want {
		t.Errorf("last line %q; want %q", lines[10], want)
	}

	// The reader stops collecting at maxKept errors.
	b.Reset()
	b.WriteString("from,to,cost\n")
	for i := 0; i < maxKept+5; i++ {
		b.WriteString("A,B,x\n")
	}
	_, _, err = readNetErr(b.String(), "", TableOptions{})
	if !errors.As(err, &list) || len(list) != maxKept {
		t.Fatalf("got %d errors; want %d", len(list), maxKept)
	}
	if !strings.HasSuffix(err.Error(), fmt.Sprintf("(and %d more errors)", maxKept-maxShown)) {
		t.Errorf("message does not end with the count: %q", err.Error()[len(err.Error())-40:])
	}
}

func TestReadCSVNodeErrors(t *testing.T) {
	const lanes = "from,to,cost\nA,B,1\n"
	tests := []struct {
		name  string
		nodes string
		want  []wantErr
		msg   string
	}{
		{name: "missing node column", nodes: "name,supply\nA,1\n", want: []wantErr{{1, 0, "header", ErrMissingColumn}}},
		{name: "missing supply and demand", nodes: "node,region\nA,x\n", want: []wantErr{{1, 0, "header", ErrMissingColumn}}, msg: "want column(s) supply"},
		{name: "empty", nodes: "\n", want: []wantErr{{0, 0, "", ErrEmpty}}},
		{name: "header only", nodes: "node,supply\n", want: []wantErr{{2, 0, "", ErrEmpty}}},
		// "A,1,-2": supply at 3, demand at 5.
		{name: "negative demand", nodes: "node,supply,demand\nA,1,-2\n", want: []wantErr{{2, 5, "demand", ErrNegative}}},
		{name: "negative supply beside demand", nodes: "node,supply,demand\nA,-1,2\n", want: []wantErr{{2, 3, "supply", ErrNegative}}},
		{name: "duplicate node", nodes: "node,supply\nA,1\nB,2\nA,3\n", want: []wantErr{{4, 1, "node", ErrDuplicate}}, msg: "already listed on data row 1"},
		{name: "empty node", nodes: "node,supply\n,1\n", want: []wantErr{{2, 1, "node", ErrSyntax}}},
		{name: "text for supply", nodes: "node,supply\nA,ten\n", want: []wantErr{{2, 3, "supply", ErrNotDecimal}}},
		{name: "NaN demand", nodes: "node,demand\nA,NaN\n", want: []wantErr{{2, 3, "demand", ErrNotFinite}}},
		// 999999999999999999 on the 18-place scale of the demand overflows.
		{name: "supply minus demand overflows", nodes: "node,supply,demand\nA,999999999999999999,0.000000000000000001\n",
			want: []wantErr{{2, 1, "node", ErrOverflow}}},
		{name: "wrong field count", nodes: "node,supply\nA,1,2\n", want: []wantErr{{2, 1, "", ErrSyntax}}},
		{name: "two errors", nodes: "node,supply\nA,x\n,1\n", want: []wantErr{{2, 3, "supply", ErrNotDecimal}, {3, 1, "node", ErrSyntax}}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, _, err := readNetErr(lanes, tc.nodes, TableOptions{})
			checkErrs(t, err, "nodes.csv", tc.want)
			if tc.msg != "" && !strings.Contains(err.Error(), tc.msg) {
				t.Errorf("message %q does not contain %q", err, tc.msg)
			}
		})
	}
}

func TestReadCSVNetworkDelimiters(t *testing.T) {
	// Expected: nodes in order of appearance A, B, C; the rate 2.5 sets
	// RatePlaces 1 (2.5 -> 25, 1 -> 10); quantities are whole; an empty max
	// is no limit.
	want := &Network{
		Nodes: []string{"A", "B", "C"}, Supply: []int64{0, 0, 0},
		Tail: []NodeID{0, 1}, Head: []NodeID{1, 2},
		Lower: []int64{1, 0}, Upper: []int64{10, NoLimit}, Rate: []int64{25, 10},
		LaneNames: []string{"L1", "L2"}, QtyPlaces: 0, RatePlaces: 1,
	}
	for _, d := range []string{",", ";", "\t"} {
		lanes := strings.ReplaceAll("lane,from,to,cost,min,max\nL1,A,B,2.5,1,10\nL2,B,C,1,,\n", ",", d)
		n, plan := readNet(t, lanes, "", TableOptions{})
		if !reflect.DeepEqual(n, want) {
			t.Errorf("delimiter %q: got %+v; want %+v", d, n, want)
		}
		if plan != nil {
			t.Errorf("delimiter %q: a plan without a flow column", d)
		}
	}
}

func TestReadCSVNetworkFormats(t *testing.T) {
	tests := []struct {
		name  string
		lanes string
		opt   TableOptions
		check func(t *testing.T, n *Network)
	}{
		{name: "byte order mark and CRLF", lanes: "\xef\xbb\xbffrom,to,cost\r\nA,B,1\r\nB,C,2\r\n",
			check: func(t *testing.T, n *Network) {
				eq(t, "Nodes", n.Nodes, []string{"A", "B", "C"})
				eq(t, "Rate", n.Rate, []int64{1, 2})
			}},
		{name: "quoted fields", lanes: "from,to,cost,note\n\"Port, Inc.\",\"He said \"\"hi\"\"\",\"1.5\",\"a \"\"b\"\", c\"\n",
			check: func(t *testing.T, n *Network) {
				eq(t, "Nodes", n.Nodes, []string{"Port, Inc.", `He said "hi"`})
				eq(t, "Rate", n.Rate, []int64{15})
				eq(t, "Extra", n.Extra, &ExtraColumns{Names: []string{"note"}, Values: [][]string{{`a "b", c`}}})
			}},
		{name: "delimiters inside quoted header names do not count", lanes: "from;to;cost;\"a,b,c,d\"\nA;B;1;x\n",
			check: func(t *testing.T, n *Network) {
				eq(t, "Extra", n.Extra, &ExtraColumns{Names: []string{"a,b,c,d"}, Values: [][]string{{"x"}}})
			}},
		{name: "synonyms and case", lanes: "ID,Origin,DESTINATION,Rate,Lower,Capacity\nx1,A,B,3,1,5\n",
			check: func(t *testing.T, n *Network) {
				eq(t, "LaneNames", n.LaneNames, []string{"x1"})
				eq(t, "Lower", n.Lower, []int64{1})
				eq(t, "Upper", n.Upper, []int64{5})
				eq(t, "Rate", n.Rate, []int64{3})
				if n.Extra != nil {
					t.Errorf("Extra = %+v; want nil", n.Extra)
				}
			}},
		{name: "more synonyms", lanes: " From_Node , to_node ,COST, minimum ,CAP\nA,B,3,1,5\n",
			check: func(t *testing.T, n *Network) {
				eq(t, "Nodes", n.Nodes, []string{"A", "B"})
				eq(t, "Lower", n.Lower, []int64{1})
				eq(t, "Upper", n.Upper, []int64{5})
			}},
		{name: "column mapping", lanes: "Start,end,Rate_USD,mode\nA,B,4,truck\n",
			opt: TableOptions{Columns: map[string]string{"rate_usd": "cost", "START": "From", " end ": "to"}},
			check: func(t *testing.T, n *Network) {
				eq(t, "Nodes", n.Nodes, []string{"A", "B"})
				eq(t, "Rate", n.Rate, []int64{4})
				eq(t, "Extra", n.Extra, &ExtraColumns{Names: []string{"mode"}, Values: [][]string{{"truck"}}})
			}},
		{name: "mapping overrides a synonym", lanes: "from,to,cost,rate\nA,B,4,9\n",
			opt: TableOptions{Columns: map[string]string{"rate": "surcharge"}},
			check: func(t *testing.T, n *Network) {
				eq(t, "Rate", n.Rate, []int64{4})
				eq(t, "Extra", n.Extra, &ExtraColumns{Names: []string{"rate"}, Values: [][]string{{"9"}}})
			}},
		{name: "extra columns in order, as written", lanes: "mode,from,carrier,to,cost,notes\ntruck,A, ACME ,B,1,\nrail,B,,C,2,x\n",
			check: func(t *testing.T, n *Network) {
				eq(t, "Extra", n.Extra, &ExtraColumns{Names: []string{"mode", "carrier", "notes"},
					Values: [][]string{{"truck", " ACME ", ""}, {"rail", "", "x"}}})
			}},
		{name: "lane ids default to row numbers", lanes: "from,to,cost\nA,B,1\n\nB,C,1\nC,A,1\n",
			check: func(t *testing.T, n *Network) {
				if n.LaneNames != nil {
					t.Errorf("LaneNames = %q; want nil", n.LaneNames)
				}
				eq(t, "names", []string{n.LaneName(0), n.LaneName(1), n.LaneName(2)}, []string{"1", "2", "3"})
			}},
		{name: "parallel lanes and a self-loop stay distinct", lanes: "from,to,cost\nA,B,1\nA,B,2\nA,A,0\n",
			check: func(t *testing.T, n *Network) {
				eq(t, "Tail", n.Tail, []NodeID{0, 0, 0})
				eq(t, "Head", n.Head, []NodeID{1, 1, 0})
				eq(t, "Rate", n.Rate, []int64{1, 2, 0})
			}},
		{name: "cells are trimmed", lanes: "from,to,cost\n A , B , 1.5 \n",
			check: func(t *testing.T, n *Network) {
				eq(t, "Nodes", n.Nodes, []string{"A", "B"})
				eq(t, "Rate", n.Rate, []int64{15})
			}},
		{name: "decimal comma", lanes: "from;to;cost;max\nA;B;12,50;1,5\n", opt: TableOptions{DecimalComma: true},
			check: func(t *testing.T, n *Network) {
				eq(t, "Rate", n.Rate, []int64{125}) // 12.5, RatePlaces 1
				eq(t, "Upper", n.Upper, []int64{15})
				eq(t, "places", []int{n.QtyPlaces, n.RatePlaces}, []int{1, 1})
			}},
		{name: "negative rates are allowed", lanes: "from,to,cost\nA,B,-2\n",
			check: func(t *testing.T, n *Network) { eq(t, "Rate", n.Rate, []int64{-2}) }},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			n, _ := readNet(t, tc.lanes, "", tc.opt)
			tc.check(t, n)
		})
	}
}

func TestReadCSVNetworkQuotedNewline(t *testing.T) {
	// The first data record spans lines 2-3; the next one is on line 4.
	_, _, err := readNetErr("from,to,cost\n\"Dock\n7\",B,1\nB,C,x\n", "", TableOptions{})
	checkErrs(t, err, "lanes.csv", []wantErr{{4, 5, "cost", ErrNotDecimal}})
	n, _ := readNet(t, "from,to,cost\n\"Dock\n7\",B,1\n", "", TableOptions{})
	eq(t, "Nodes", n.Nodes, []string{"Dock\n7", "B"})
}

func eq[T any](t *testing.T, what string, got, want T) {
	t.Helper()
	if !reflect.DeepEqual(got, want) {
		t.Errorf("%s = %#v; want %#v", what, got, want)
	}
}

func TestReadCSVNetworkFlowColumn(t *testing.T) {
	n, plan := readNet(t, "from,to,cost,qty\nA,B,1,2.5\nB,C,1,\n", "", TableOptions{})
	if plan == nil || plan.Len() != 2 || plan.File != "lanes.csv" {
		t.Fatalf("plan = %+v; want 2 quantities from lanes.csv", plan)
	}
	// 2.5 has 1 place, the network 0: Bind rescales to 1 place.
	p, err := plan.Bind(n, nil)
	if err != nil {
		t.Fatal(err)
	}
	eq(t, "Flow", p.Flow, []int64{25, 0})
	eq(t, "QtyPlaces", n.QtyPlaces, 1)

	_, _, err = readNetErr("from,to,cost,flow\nA,B,1,lots\n", "", TableOptions{})
	checkErrs(t, err, "lanes.csv", []wantErr{{2, 7, "flow", ErrNotDecimal}})
}

func TestReadCSVNodeTable(t *testing.T) {
	tests := []struct {
		name, nodes, lanes string
		want               *Network // only the fields compared below
	}{
		{name: "signed supply", nodes: "node,supply\nA,10\nB,-10\n", lanes: "from,to,cost\nA,B,1\n",
			want: &Network{Nodes: []string{"A", "B"}, Supply: []int64{10, -10}}},
		// Supply minus demand: A 10, B -4, C -6, D 5-2 = 3.
		{name: "supply and demand columns", nodes: "node,supply,demand\nA,10,\nB,,4\nC,0,6\nD,5,2\n",
			lanes: "from,to,cost\nA,B,1\nA,C,1\nD,B,1\n",
			want:  &Network{Nodes: []string{"A", "B", "C", "D"}, Supply: []int64{10, -4, -6, 3}}},
		{name: "demand column only", nodes: "node,demand\nB,4\n", lanes: "from,to,cost\nA,B,1\n",
			want: &Network{Nodes: []string{"B", "A"}, Supply: []int64{-4, 0}}},
		// Node table first (C, A), then new names from the lanes (B, D).
		{name: "numbering", nodes: "node,supply\nC,5\nA,0\n", lanes: "from,to,cost\nA,B,1\nB,D,1\nC,A,1\n",
			want: &Network{Nodes: []string{"C", "A", "B", "D"}, Supply: []int64{5, 0, 0, 0}}},
		{name: "isolated node", nodes: "node,supply\nX,0\n", lanes: "from,to,cost\nA,B,1\n",
			want: &Network{Nodes: []string{"X", "A", "B"}, Supply: []int64{0, 0, 0}}},
		// 1.5 sets QtyPlaces 1 for supplies and bounds alike.
		{name: "decimal supply", nodes: "node,supply\nA,1.5\nB,-1.5\n", lanes: "from,to,cost,max\nA,B,1,2\n",
			want: &Network{Nodes: []string{"A", "B"}, Supply: []int64{15, -15}, QtyPlaces: 1}},
		// 1.5 - 0.5 = 1.0, kept on 1 place.
		{name: "supply and demand with places", nodes: "node,supply,demand\nA,1.5,0.5\nB,,1\n", lanes: "from,to,cost\nA,B,1\n",
			want: &Network{Nodes: []string{"A", "B"}, Supply: []int64{10, -10}, QtyPlaces: 1}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			n, _ := readNet(t, tc.lanes, tc.nodes, TableOptions{})
			eq(t, "Nodes", n.Nodes, tc.want.Nodes)
			eq(t, "Supply", n.Supply, tc.want.Supply)
			eq(t, "QtyPlaces", n.QtyPlaces, tc.want.QtyPlaces)
			if n.NodeExtra != nil {
				t.Errorf("NodeExtra = %+v; want nil", n.NodeExtra)
			}
		})
	}
}

func TestReadCSVNodeTableExtra(t *testing.T) {
	n, _ := readNet(t, "from,to,cost\nA,B,1\nB,C,1\n", "region,node,supply,contact\nEU,A,5,ann\nUS,B,-5,bob\n", TableOptions{})
	eq(t, "Nodes", n.Nodes, []string{"A", "B", "C"})
	// C appears only in the lanes: no values.
	eq(t, "NodeExtra", n.NodeExtra, &ExtraColumns{Names: []string{"region", "contact"}, Values: [][]string{{"EU", "ann"}, {"US", "bob"}, nil}})
	if n.Extra != nil {
		t.Errorf("Extra = %+v; want nil", n.Extra)
	}
}

func TestReadCSVNetworkScales(t *testing.T) {
	// Quantities 0.125 and 12.5 need 3 places: 125 and 12500; 3 -> 3000.
	// Rates 2 and 0.75 need 2 places: 200 and 75. No limit stays NoLimit.
	n, _ := readNet(t, "from,to,cost,min,max\nA,B,2,0.125,12.5\nB,C,0.75,,3\nC,D,1,,\n", "", TableOptions{})
	eq(t, "places", []int{n.QtyPlaces, n.RatePlaces}, []int{3, 2})
	eq(t, "Lower", n.Lower, []int64{125, 0, 0})
	eq(t, "Upper", n.Upper, []int64{12500, 3000, NoLimit})
	eq(t, "Rate", n.Rate, []int64{200, 75, 100})
	eq(t, "FormatQty", n.FormatQty(n.Upper[0]), "12.500")
	eq(t, "FormatQty no limit", n.FormatQty(n.Upper[2]), "no limit")
	eq(t, "FormatRate", n.FormatRate(n.Rate[1]), "0.75")

	// MaxPlaces (12) places are accepted.
	n, _ = readNet(t, "from,to,cost,max\nA,B,0.000000000001,0.000000000001\n", "", TableOptions{})
	eq(t, "places", []int{n.QtyPlaces, n.RatePlaces}, []int{MaxPlaces, MaxPlaces})
	eq(t, "Rate", n.Rate, []int64{1})
	eq(t, "Upper", n.Upper, []int64{1})
}

// planNet has two parallel lanes L1, L2 from A to B and a lane L3 from B to C.
const planNetLanes = "lane,from,to,cost\nL1,A,B,1\nL2,A,B,2\nL3,B,C,1\n"

func readPlan(t *testing.T, n *Network, text string) (*RawPlan, error) {
	t.Helper()
	return ReadCSVPlan(strings.NewReader(text), "plan.csv", n, TableOptions{})
}

// planValues returns the plan's quantities as decimals.
func planValues(p *RawPlan) []Decimal {
	out := make([]Decimal, p.Len())
	for i := range out {
		out[i] = Decimal{p.q.mant[i], p.q.places[i]}
	}
	return out
}

func TestReadCSVPlan(t *testing.T) {
	n, _ := readNet(t, planNetLanes, "", TableOptions{})
	tests := []struct {
		name, plan string
		want       []Decimal
	}{
		{"by lane", "lane,flow\nL3,4\nL1,2.5\n", []Decimal{{25, 1}, {0, 0}, {4, 0}}},
		{"by pair", "from,to,flow\nB,C,3\n", []Decimal{{0, 0}, {0, 0}, {3, 0}}},
		{"synonyms", "ID,Quantity\nL2,7\n", []Decimal{{0, 0}, {7, 0}, {0, 0}}},
		{"empty flow is 0", "lane,flow\nL2,\n", []Decimal{{0, 0}, {0, 0}, {0, 0}}},
		{"header only", "lane,flow\n", []Decimal{{0, 0}, {0, 0}, {0, 0}}},
		{"lane column wins over pairs", "lane,from,to,flow\nL2,A,B,1\n", []Decimal{{0, 0}, {1, 0}, {0, 0}}},
		{"negative flow is read", "lane,flow\nL1,-1\n", []Decimal{{-1, 0}, {0, 0}, {0, 0}}},
	}
	for _, tc := range tests {
		p, err := readPlan(t, n, tc.plan)
		if err != nil {
			t.Errorf("%s: %v", tc.name, err)
			continue
		}
		eq(t, tc.name, planValues(p), tc.want)
	}

	// Without a lane column, lane ids are row numbers.
	m, _ := readNet(t, "from,to,cost\nA,B,1\nA,B,2\n", "", TableOptions{})
	p, err := readPlan(t, m, "lane,flow\n2,5\n")
	if err != nil {
		t.Fatal(err)
	}
	eq(t, "by number", planValues(p), []Decimal{{0, 0}, {5, 0}})
}

func TestReadCSVPlanErrors(t *testing.T) {
	n, _ := readNet(t, planNetLanes, "", TableOptions{})
	numbered, _ := readNet(t, "from,to,cost\nA,B,1\n", "", TableOptions{})
	tests := []struct {
		name, plan string
		net        *Network
		want       []wantErr
		msg        string
	}{
		// "A,B,1": to at 3.
		{name: "parallel lanes", plan: "from,to,flow\nA,B,1\n", want: []wantErr{{2, 3, "to", ErrAmbiguous}},
			msg: `2 parallel lanes run from "A" to "B" ("L1", "L2")`},
		{name: "unknown lane", plan: "lane,flow\nL9,1\n", want: []wantErr{{2, 1, "lane", ErrUnknownLane}}},
		{name: "unknown from", plan: "from,to,flow\nX,C,1\n", want: []wantErr{{2, 1, "from", ErrUnknownNode}}},
		{name: "unknown to", plan: "from,to,flow\nB,Y,1\n", want: []wantErr{{2, 3, "to", ErrUnknownNode}}},
		// "Ä,Ö,1": to at character 3 (byte 4).
		{name: "unknown nodes with characters", plan: "from,to,flow\nÄ,Ö,1\n", want: []wantErr{{2, 1, "from", ErrUnknownNode}, {2, 3, "to", ErrUnknownNode}}},
		{name: "unknown both", plan: "from,to,flow\nX,Y,1\n", want: []wantErr{{2, 1, "from", ErrUnknownNode}, {2, 3, "to", ErrUnknownNode}}},
		{name: "no lane for the pair", plan: "from,to,flow\nC,A,1\n", want: []wantErr{{2, 3, "to", ErrUnknownLane}}, msg: `no lane runs from "C" to "A"`},
		{name: "lane twice", plan: "lane,flow\nL1,1\nL3,1\nL1,2\n", want: []wantErr{{4, 1, "lane", ErrDuplicate}}, msg: "already given on data row 1"},
		{name: "pair twice", plan: "from,to,flow\nB,C,1\nB,C,2\n", want: []wantErr{{3, 3, "to", ErrDuplicate}}},
		{name: "no flow column", plan: "lane,qty_kg\nL1,1\n", want: []wantErr{{1, 0, "header", ErrMissingColumn}}},
		{name: "no key", plan: "to,flow\nB,1\n", want: []wantErr{{1, 0, "header", ErrMissingColumn}}},
		{name: "text flow", plan: "lane,flow\nL1,some\n", want: []wantErr{{2, 4, "flow", ErrNotDecimal}}},
		{name: "empty lane id", plan: "lane,flow\n,1\n", want: []wantErr{{2, 1, "lane", ErrSyntax}}},
		{name: "empty", plan: "", want: []wantErr{{0, 0, "", ErrEmpty}}},
		{name: "row number 0", plan: "lane,flow\n0,1\n", net: numbered, want: []wantErr{{2, 1, "lane", ErrUnknownLane}}},
		{name: "row number past the end", plan: "lane,flow\n2,1\n", net: numbered, want: []wantErr{{2, 1, "lane", ErrUnknownLane}}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			net := n
			if tc.net != nil {
				net = tc.net
			}
			_, err := readPlan(t, net, tc.plan)
			checkErrs(t, err, "plan.csv", tc.want)
			if tc.msg != "" && !strings.Contains(err.Error(), tc.msg) {
				t.Errorf("message %q does not contain %q", err, tc.msg)
			}
		})
	}
}
