package flow

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
)

const tableauDir = "../testdata/tableau"

func readGridFile(t *testing.T, name string) *Network {
	t.Helper()
	f, err := os.Open(filepath.Join(tableauDir, name))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	n, err := ReadGrid(f, name, TableOptions{})
	if err != nil {
		t.Fatal(err)
	}
	return n
}

// TestGridPowerco reads the Powerco grid, solves it and compares with the
// published optimum: 1020, with the unique plan of winston_powerco.flow
// (Winston, Operations Research: Applications and Algorithms, sec. 7.1;
// see testdata/tableau/README.md). It then writes the plan as a grid,
// reads it back and compares.
func TestGridPowerco(t *testing.T) {
	n := readGridFile(t, "powerco.csv")
	if err := n.Validate(); err != nil {
		t.Fatal(err)
	}
	wantNodes := []string{"Plant 1", "Plant 2", "Plant 3", "City 1", "City 2", "City 3", "City 4"}
	if !reflect.DeepEqual(n.Nodes, wantNodes) {
		t.Fatalf("nodes %q, want %q", n.Nodes, wantNodes)
	}
	if !reflect.DeepEqual(n.Supply, []int64{35, 50, 40, -45, -20, -30, -30}) {
		t.Fatalf("supply %v", n.Supply)
	}
	if n.NumLanes() != 12 || n.LaneName(5) != "Plant 2>City 2" || n.Rate[5] != 12 {
		t.Fatalf("lane 5 is %s rate %d of %d lanes", n.LaneName(5), n.Rate[5], n.NumLanes())
	}
	sol, err := Solve(n, SolveOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if sol.Status != Optimal || sol.Cost.Cmp(WideFrom(1020)) != 0 { // Winston sec. 7.1: $1020
		t.Fatalf("status %v cost %s, want optimal 1020", sol.Status, n.FormatCost(sol.Cost))
	}
	// The published plan (winston_powerco.flow), unique by the README's
	// reduced costs, row by row.
	want := []int64{0, 10, 25, 0, 45, 0, 5, 0, 0, 10, 0, 30}
	if !reflect.DeepEqual(sol.Flow, want) {
		t.Fatalf("plan %v, want %v", sol.Flow, want)
	}
	var buf bytes.Buffer
	if err := WriteGridPlan(&buf, n, sol.Flow); err != nil {
		t.Fatal(err)
	}
	wantText := "Powerco,City 1,City 2,City 3,City 4,supply\n" +
		"Plant 1,0,10,25,0,35\nPlant 2,45,0,5,0,50\nPlant 3,0,10,0,30,40\ndemand,45,20,30,30,\n"
	if buf.String() != wantText {
		t.Fatalf("grid plan:\n%s\nwant:\n%s", buf.String(), wantText)
	}
	raw, err := ReadGridPlan(&buf, "out.csv", n, TableOptions{})
	if err != nil {
		t.Fatal(err)
	}
	p, err := raw.Bind(n, nil)
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(p.Flow, sol.Flow) {
		t.Fatalf("round trip %v, want %v", p.Flow, sol.Flow)
	}
	// The published plan as a hand-written grid (empty cells, no supply
	// column or demand row).
	f, err := os.Open(filepath.Join(tableauDir, "powerco_plan.csv"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	raw, err = ReadGridPlan(f, "powerco_plan.csv", n, TableOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if p, err = raw.Bind(n, nil); err != nil || !reflect.DeepEqual(p.Flow, want) {
		t.Fatalf("published plan %v (%v), want %v", p.Flow, err, want)
	}
}

// TestGridLoadFiles checks that LoadFiles tells a grid and a plan grid by
// their content.
func TestGridLoadFiles(t *testing.T) {
	l, err := LoadFiles(Files{Network: filepath.Join(tableauDir, "powerco.csv"), Plan: filepath.Join(tableauDir, "powerco_plan.csv")})
	if err != nil {
		t.Fatal(err)
	}
	if l.Net.Grid == nil || l.Plan == nil || l.Plan.Flow[2] != 25 { // Plant 1 -> City 3: 25 (winston_powerco.flow)
		t.Fatalf("loaded %+v", l)
	}
	// A lane table is not mistaken for a grid.
	if isGridText([]byte("from,to,cost,supply\na,b,1,2\n")) {
		t.Fatal("lane table read as a grid")
	}
}

func TestGridDecimalComma(t *testing.T) {
	in := "x;D1;D2;supply\nO1;1,5;;2,25\ndemand;1;1,25;\n"
	n, err := ReadGrid(strings.NewReader(in), "g.csv", TableOptions{DecimalComma: true})
	if err != nil {
		t.Fatal(err)
	}
	if n.NumLanes() != 1 || n.Rate[0] != 15 || n.RatePlaces != 1 || !reflect.DeepEqual(n.Supply, []int64{225, -100, -125}) || n.QtyPlaces != 2 {
		t.Fatalf("got %+v", n)
	}
}

func TestGridErrors(t *testing.T) {
	tests := []struct {
		name, in   string
		line, col  int
		sentinel   error
		msgContain string
	}{
		{"empty", "", 0, 0, ErrEmpty, "empty"},
		{"no supply column", "x,A,B,total\nO,1,2,3\ndemand,1,2,\n", 1, 7, ErrMissingColumn, `"total"`},
		{"ragged", "x,A,supply\nO,1\ndemand,1,\n", 2, 0, ErrSyntax, "2 cells"},
		{"rate", "x,A,supply\nO,abc,5\ndemand,1,\n", 2, 3, ErrNotDecimal, `rate "abc"`},
		// "Øst,abc,5": abc at character 5 (byte 6).
		{"rate after characters", "x,A,supply\nØst,abc,5\ndemand,1,\n", 2, 5, ErrNotDecimal, `rate "abc"`},
		{"nan rate", "x,A,supply\nO,NaN,5\ndemand,1,\n", 2, 3, ErrNotFinite, "NaN"},
		{"negative supply", "x,A,supply\nO,1,-5\ndemand,1,\n", 2, 5, ErrNegative, "supply"},
		{"missing supply", "x,A,supply\nO,1,\ndemand,1,\n", 2, 5, ErrNotDecimal, "empty"},
		{"negative demand", "x,A,supply\nO,1,5\ndemand,-1,\n", 3, 8, ErrNegative, "demand"},
		{"missing demand row", "x,A,supply\nO,1,5\n", 2, 0, ErrSyntax, "demand"},
		{"row after demand", "x,A,supply\nO,1,5\ndemand,1,\nP,1,5\n", 4, 0, ErrSyntax, "after"},
		{"duplicate destination", "x,A,A,supply\nO,1,1,5\ndemand,1,1,\n", 1, 5, ErrDuplicate, "twice"},
		{"duplicate origin", "x,A,supply\nO,1,5\nO,1,5\ndemand,1,\n", 3, 1, ErrDuplicate, "origin"},
		{"origin named as destination", "x,A,supply\nA,1,5\ndemand,1,\n", 2, 1, ErrDuplicate, "destination"},
		{"name with >", "x,A>B,supply\nO,1,5\ndemand,1,\n", 1, 3, ErrSyntax, "'>'"},
		{"no origins", "x,A,supply\ndemand,1,\n", 2, 0, ErrEmpty, "no origin"},
		{"corner total", "x,A,supply\nO,1,5\ndemand,5,6\n", 3, 10, nil, "add up to 5"},
		{"short header", "x,supply\n", 1, 0, ErrSyntax, "at least one destination"},
		// A bad rate, then a CSV syntax error: both, the rate first.
		{"error before a syntax error", "x,A,supply\nO,abc,5\nP,1\"x,5\ndemand,1,\n", 2, 3, ErrSyntax, `rate "abc"`},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := ReadGrid(strings.NewReader(tc.in), "g.csv", TableOptions{})
			if err == nil {
				t.Fatal("no error")
			}
			if tc.sentinel != nil && !errors.Is(err, tc.sentinel) {
				t.Fatalf("error %v does not wrap %v", err, tc.sentinel)
			}
			pe := parseErrors(t, err)[0]
			if pe.File != "g.csv" || pe.Line != tc.line || pe.Col != tc.col {
				t.Fatalf("error %v at %d:%d, want %d:%d", err, pe.Line, pe.Col, tc.line, tc.col)
			}
			if !strings.Contains(err.Error(), tc.msgContain) {
				t.Fatalf("error %q lacks %q", err, tc.msgContain)
			}
		})
	}
}

func TestGridPlanErrors(t *testing.T) {
	net := "x,A,B,supply\nO,1,,5\nP,2,3,5\ndemand,4,6,\n"
	n, err := ReadGrid(strings.NewReader(net), "g.csv", TableOptions{})
	if err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		name, in  string
		line, col int
		sentinel  error
	}{
		{"destination order", "x,B,A\nO,,\nP,,\n", 1, 3, ErrUnknownNode},
		{"width", "x,A\nO,1\nP,1\n", 1, 0, ErrSyntax},
		{"origin order", "x,A,B\nP,1,\nO,1,\n", 2, 1, ErrUnknownNode},
		{"missing origin", "x,A,B\nO,1,\n", 2, 0, ErrSyntax},
		{"extra origin", "x,A,B\nO,1,\nP,1,\nQ,1,\n", 4, 1, ErrUnknownNode},
		{"quantity without lane", "x,A,B\nO,1,2\nP,1,\n", 2, 5, ErrUnknownLane},
		{"quantity", "x,A,B\nO,z,\nP,1,\n", 2, 3, ErrNotDecimal},
		{"supply differs", "x,A,B,supply\nO,1,,4\nP,1,,5\n", 2, 6, nil},
		{"demand differs", "x,A,B,supply\nO,1,,\nP,1,,\ndemand,4,7,\n", 4, 10, nil},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := ReadGridPlan(strings.NewReader(tc.in), "p.csv", n, TableOptions{})
			if err == nil {
				t.Fatal("no error")
			}
			if tc.sentinel != nil && !errors.Is(err, tc.sentinel) {
				t.Fatalf("error %v does not wrap %v", err, tc.sentinel)
			}
			pe := parseErrors(t, err)[0]
			if pe.Line != tc.line || pe.Col != tc.col {
				t.Fatalf("error %v at %d:%d, want %d:%d", err, pe.Line, pe.Col, tc.line, tc.col)
			}
		})
	}
	// A zero in a cell without a lane is accepted.
	if _, err := ReadGridPlan(strings.NewReader("x,A,B\nO,1,0\nP,1,2\n"), "p.csv", n, TableOptions{}); err != nil {
		t.Fatal(err)
	}
	// A network without a grid shape is refused.
	n.Grid = nil
	if err := WriteGridPlan(&bytes.Buffer{}, n, make([]int64, n.NumLanes())); err == nil {
		t.Fatal("wrote a grid without a shape")
	}
}

// FuzzReadGrid reads random grids: an error must be positioned; a network
// read must write back as a plan grid that reads again with the same flows.
func FuzzReadGrid(f *testing.F) {
	for _, name := range []string{"powerco.csv"} {
		b, err := os.ReadFile(filepath.Join(tableauDir, name))
		if err != nil {
			f.Fatal(err)
		}
		f.Add(b)
	}
	f.Add([]byte("x;A;supply\nO;1,5;2\ndemand;2;\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		n, err := ReadGrid(bytes.NewReader(data), "g.csv", TableOptions{})
		if err != nil {
			checkPositioned(t, err, "g.csv")
			return
		}
		x := make([]int64, n.NumLanes())
		for a := range x {
			x[a] = int64(a)
		}
		var buf bytes.Buffer
		if err := WriteGridPlan(&buf, n, x); err != nil {
			t.Fatal(err)
		}
		raw, err := ReadGridPlan(&buf, "p.csv", n, TableOptions{})
		if err != nil {
			t.Fatalf("plan grid does not read back: %v\n%s", err, buf.String())
		}
		p, err := raw.Bind(n, nil)
		if err != nil {
			t.Fatal(err)
		}
		if !reflect.DeepEqual(p.Flow, x) {
			t.Fatalf("flows %v, want %v", p.Flow, x)
		}
	})
}
