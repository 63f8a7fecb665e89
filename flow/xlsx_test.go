package flow

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// workbook builds an .xlsx in memory: sheets maps a sheet name to its rows
// (nil cells are left out; an excelize.Cell keeps its formula and cached
// value). merges lists "sheet!A1:B1" ranges to merge.
func workbook(t testing.TB, sheets map[string][][]any, order []string, merges ...string) []byte {
	t.Helper()
	f := excelize.NewFile()
	defer f.Close()
	for i, name := range order {
		if i == 0 {
			if err := f.SetSheetName("Sheet1", name); err != nil {
				t.Fatal(err)
			}
		} else if _, err := f.NewSheet(name); err != nil {
			t.Fatal(err)
		}
		sw, err := f.NewStreamWriter(name)
		if err != nil {
			t.Fatal(err)
		}
		for r, row := range sheets[name] {
			cell, _ := excelize.CoordinatesToCellName(1, r+1)
			if err := sw.SetRow(cell, row); err != nil {
				t.Fatal(err)
			}
		}
		for _, m := range merges {
			sheet, rng, _ := strings.Cut(m, "!")
			if sheet == name {
				from, to, _ := strings.Cut(rng, ":")
				if err := sw.MergeCell(from, to); err != nil {
					t.Fatal(err)
				}
			}
		}
		if err := sw.Flush(); err != nil {
			t.Fatal(err)
		}
	}
	var buf bytes.Buffer
	if err := f.Write(&buf); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

// TestReadXLSX reads a lane and a node sheet with a formula cell (its cached
// value is read), a header merged over two columns, an empty header over a
// used column, a blank row and a title-free header on row 2.
func TestReadXLSX(t *testing.T) {
	data := workbook(t, map[string][][]any{
		"Lanes": {
			nil,
			{"From", "To", "Rate", "Max", "Notes", nil, nil, "Flow"},
			{"a", "b", 2.5, 10, "first", "x", nil, 4},
			{},
			{"b", "c", excelize.Cell{Formula: "1+2", Value: 3}, nil, "second", nil, nil, 4},
			{"a", "c", "7", nil, nil, nil, nil, 0},
		},
		"nodes": {
			{"node", "supply"},
			{"a", 4},
			{"c", -4},
		},
	}, []string{"Lanes", "nodes"}, "Lanes!E2:F2")
	n, raw, err := ReadXLSX(bytes.NewReader(data), "net.xlsx", XLSXOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(n.Nodes, []string{"a", "c", "b"}) || !reflect.DeepEqual(n.Supply, []int64{4, -4, 0}) {
		t.Fatalf("nodes %q supply %v", n.Nodes, n.Supply)
	}
	if !reflect.DeepEqual(n.Rate, []int64{25, 30, 70}) || n.RatePlaces != 1 {
		t.Fatalf("rates %v places %d", n.Rate, n.RatePlaces)
	}
	if !reflect.DeepEqual(n.Upper, []int64{10, NoLimit, NoLimit}) {
		t.Fatalf("capacities %v", n.Upper)
	}
	// The merged header "Notes" names column E; F, holding a value, is
	// "column F"; G, empty throughout, is dropped.
	if n.Extra == nil || !reflect.DeepEqual(n.Extra.Names, []string{"Notes", "column F"}) || n.Extra.Values[0][1] != "x" {
		t.Fatalf("extra %+v", n.Extra)
	}
	p, err := raw.Bind(n, nil)
	if err != nil || !reflect.DeepEqual(p.Flow, []int64{4, 4, 0}) {
		t.Fatalf("plan %v %v", p, err)
	}
}

func TestReadXLSXErrors(t *testing.T) {
	lanes := func(rows ...[]any) map[string][][]any {
		return map[string][][]any{"lanes": append([][]any{{"from", "to", "cost"}}, rows...)}
	}
	tests := []struct {
		name     string
		sheets   map[string][][]any
		order    []string
		opt      XLSXOptions
		msg      string
		sentinel error
	}{
		{"bad cost", lanes([]any{"a", "b", 1}, []any{"a", "b", "abc"}), []string{"lanes"}, XLSXOptions{},
			`net.xlsx: sheet "lanes" cell C3: cost "abc": want a decimal`, ErrNotDecimal},
		{"missing column", map[string][][]any{"lanes": {{"from", "cost"}, {"a", 1}}}, []string{"lanes"}, XLSXOptions{},
			`net.xlsx: sheet "lanes" row 1: header: missing column`, ErrMissingColumn},
		{"empty sheet", map[string][][]any{"lanes": {}}, []string{"lanes"}, XLSXOptions{},
			`net.xlsx: sheet "lanes": the file is empty`, ErrEmpty},
		{"no rows", lanes(), []string{"lanes"}, XLSXOptions{},
			`net.xlsx: sheet "lanes" row 2:`, ErrEmpty},
		{"node sheet", map[string][][]any{"lanes": {{"from", "to", "cost"}, {"a", "b", 1}}, "Nodes": {{"node", "supply"}, {"a", "x"}}},
			[]string{"lanes", "Nodes"}, XLSXOptions{}, `net.xlsx: sheet "Nodes" cell B2: supply "x"`, ErrNotDecimal},
		{"no lane sheet", map[string][][]any{"one": {{"from"}}, "two": {{"to"}}}, []string{"one", "two"}, XLSXOptions{},
			`net.xlsx: sheet "lanes": no such worksheet; the workbook has "one", "two"`, nil},
		{"named sheet missing", lanes([]any{"a", "b", 1}), []string{"lanes"}, XLSXOptions{NodeSheet: "depots"},
			`sheet "depots": no such worksheet`, nil},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			data := workbook(t, tc.sheets, tc.order)
			_, _, err := ReadXLSX(bytes.NewReader(data), "net.xlsx", tc.opt)
			if err == nil {
				t.Fatal("no error")
			}
			if !strings.Contains(err.Error(), tc.msg) {
				t.Fatalf("error %q lacks %q", err, tc.msg)
			}
			if tc.sentinel != nil && !errors.Is(err, tc.sentinel) {
				t.Fatalf("error %v does not wrap %v", err, tc.sentinel)
			}
			checkPositioned(t, err, "net.xlsx")
		})
	}
}

// TestLoadXLSX checks that LoadFiles reads an .xlsx network by its name,
// with a single sheet used as the lane table.
func TestLoadXLSX(t *testing.T) {
	data := workbook(t, map[string][][]any{"Sheet A": {{"from", "to", "cost", "flow"}, {"a", "b", 2, 1}}}, []string{"Sheet A"})
	path := filepath.Join(t.TempDir(), "net.xlsx")
	if err := os.WriteFile(path, data, 0o644); err != nil {
		t.Fatal(err)
	}
	l, err := LoadFiles(Files{Network: path})
	if err != nil {
		t.Fatal(err)
	}
	if l.Net.NumLanes() != 1 || l.Plan == nil || l.Plan.Flow[0] != 1 {
		t.Fatalf("loaded %+v", l)
	}
}

func TestColumnName(t *testing.T) {
	// Spreadsheet column letters (common practice).
	for c, want := range map[int]string{1: "A", 26: "Z", 27: "AA", 52: "AZ", 703: "AAA", 0: ""} {
		if got := ColumnName(c); got != want {
			t.Errorf("ColumnName(%d) = %q, want %q", c, got, want)
		}
	}
}

// FuzzReadXLSX feeds random bytes (and mutated workbooks) to ReadXLSX: it
// must return a positioned error or a valid network, never panic.
func FuzzReadXLSX(f *testing.F) {
	f.Add(workbook(f, map[string][][]any{"lanes": {{"from", "to", "cost"}, {"a", "b", 1}}}, []string{"lanes"}))
	f.Add([]byte("PK\x03\x04"))
	f.Add([]byte("from,to,cost\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		n, _, err := ReadXLSX(bytes.NewReader(data), "f.xlsx", XLSXOptions{})
		if err != nil {
			checkPositioned(t, err, "f.xlsx")
			return
		}
		if err := n.Validate(); err != nil {
			t.Fatal(err)
		}
	})
}
