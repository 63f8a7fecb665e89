package flow

import (
	"fmt"
	"io"
	"strings"

	"github.com/xuri/excelize/v2"
)

// XLSXOptions controls ReadXLSX.
type XLSXOptions struct {
	// Table maps header names onto lanecert's columns as for the CSV
	// tables (Table.Columns). Table.DecimalComma does not apply: a
	// workbook stores numbers with a decimal point whatever the display
	// language, and a number typed as text must use a point too.
	Table TableOptions
	// LaneSheet names the worksheet of the lane table (case-insensitive).
	// Empty: "lanes", or the only worksheet of a workbook that has one.
	LaneSheet string
	// NodeSheet names the worksheet of the node table (case-insensitive).
	// Empty: "nodes" if the workbook has such a sheet, else no node table.
	NodeSheet string
}

// Default worksheet names of ReadXLSX.
const (
	defaultLaneSheet = "lanes"
	defaultNodeSheet = "nodes"
)

// ReadXLSX reads a network from an Excel workbook (.xlsx): a lane sheet
// and an optional node sheet with the columns and rules of the CSV lane
// and node tables (see ReadCSVNetwork), through the same code. It returns
// the network and, when the lane sheet has a flow column, its plan.
//
// Each sheet's header is its first non-empty row. Cells are read as saved:
// a number as its stored value (not as formatted: "1,234.50 $" on screen
// is read as 1234.5), a formula as its cached value (a workbook written by
// a program that did not compute its formulas has none, and the cell reads
// as empty), an error value such as #DIV/0! as that text. A number that
// the spreadsheet stored inexactly (0.30000000000000004 for =0.1+0.2) is
// read exactly as stored. An empty header cell names its column "column F"
// (its letter): such a column is carried as an extra column if it holds
// any value, and dropped otherwise. A header merged across columns
// belongs to its first column (the others are empty header cells). Merged
// cells below the header hold their value in the top-left cell only, as
// the workbook stores them. Empty rows are skipped.
//
// Errors are positioned ParseErrors whose Sheet names the worksheet and
// whose Line and Col give the cell (see ParseError). A file that is not a
// readable workbook gives a ParseError without a position. ReadXLSX reads
// the whole workbook into memory; beyond the workbook it takes
// O(|V|+|E|) time and the memory of the sheets' cell texts.
func ReadXLSX(r io.Reader, file string, opt XLSXOptions) (n *Network, plan *RawPlan, err error) {
	laneRows, laneSheet, nodeRows, nodeSheet, err := readWorkbook(r, file, opt)
	if err != nil {
		return nil, nil, err
	}
	lanes := func(known []string) (*table, error) {
		return openSheet(laneRows, file, laneSheet, opt.Table, known)
	}
	var nodes tableOpener
	if nodeSheet != "" {
		nodes = func(known []string) (*table, error) {
			return openSheet(nodeRows, file, nodeSheet, opt.Table, known)
		}
	}
	return readNetwork(lanes, nodes)
}

// readWorkbook opens the workbook and returns the raw cell texts of the
// lane sheet and of the node sheet (nodeSheet "" when there is none). A
// panic inside the workbook library on malformed input is returned as an
// error.
func readWorkbook(r io.Reader, file string, opt XLSXOptions) (laneRows [][]string, laneSheet string, nodeRows [][]string, nodeSheet string, err error) {
	fileErr := func(err error) error {
		return &ParseError{File: file, Err: fmt.Errorf("%w: not a readable .xlsx workbook: %v", ErrSyntax, err)}
	}
	defer func() {
		if p := recover(); p != nil {
			laneRows, nodeRows = nil, nil
			err = fileErr(fmt.Errorf("%v", p))
		}
	}()
	f, err := excelize.OpenReader(r, excelize.Options{RawCellValue: true})
	if err != nil {
		return nil, "", nil, "", fileErr(err)
	}
	defer f.Close()
	sheets := f.GetSheetList()
	find := func(name string) string {
		for _, s := range sheets {
			if strings.EqualFold(strings.TrimSpace(s), strings.TrimSpace(name)) {
				return s
			}
		}
		return ""
	}
	missing := func(name string) error {
		return &ParseError{File: file, Sheet: name, Err: fmt.Errorf("no such worksheet; the workbook has %s", quoteList(sheets))}
	}
	switch {
	case opt.LaneSheet != "":
		if laneSheet = find(opt.LaneSheet); laneSheet == "" {
			return nil, "", nil, "", missing(opt.LaneSheet)
		}
	case find(defaultLaneSheet) != "":
		laneSheet = find(defaultLaneSheet)
	case len(sheets) == 1:
		laneSheet = sheets[0]
	default:
		return nil, "", nil, "", missing(defaultLaneSheet)
	}
	switch {
	case opt.NodeSheet != "":
		if nodeSheet = find(opt.NodeSheet); nodeSheet == "" {
			return nil, "", nil, "", missing(opt.NodeSheet)
		}
	default:
		nodeSheet = find(defaultNodeSheet)
	}
	if nodeSheet == laneSheet {
		nodeSheet = ""
	}
	if laneRows, err = f.GetRows(laneSheet, excelize.Options{RawCellValue: true}); err != nil {
		return nil, "", nil, "", &ParseError{File: file, Sheet: laneSheet, Err: fmt.Errorf("%w: %v", ErrSyntax, err)}
	}
	if nodeSheet != "" {
		if nodeRows, err = f.GetRows(nodeSheet, excelize.Options{RawCellValue: true}); err != nil {
			return nil, "", nil, "", &ParseError{File: file, Sheet: nodeSheet, Err: fmt.Errorf("%w: %v", ErrSyntax, err)}
		}
	}
	return laneRows, laneSheet, nodeRows, nodeSheet, nil
}

// sheetRows is a worksheet as a rowSource: the non-empty rows after the
// header, padded to the header's width, without the dropped columns. Its
// positions are (sheet row, column number), both 1-based.
type sheetRows struct {
	rows [][]string
	keep []int // sheet column index (0-based) of each field
	next int   // index into rows of the next row to read
	cur  int   // index into rows of the current row
	rec  []string
}

func (s *sheetRows) Read() ([]string, error) {
	for ; s.next < len(s.rows); s.next++ {
		row := s.rows[s.next]
		if blankRow(row) {
			continue
		}
		s.cur = s.next
		s.next++
		s.rec = s.rec[:0]
		for _, c := range s.keep {
			v := ""
			if c < len(row) {
				v = row[c]
			}
			s.rec = append(s.rec, v)
		}
		return s.rec, nil
	}
	return nil, io.EOF
}

func (s *sheetRows) FieldPos(field int) (line, column int) {
	if field < 0 || field >= len(s.keep) {
		return s.cur + 1, 0
	}
	return s.cur + 1, s.keep[field] + 1
}

func blankRow(row []string) bool {
	for _, c := range row {
		if strings.TrimSpace(c) != "" {
			return false
		}
	}
	return true
}

// openSheet makes a table of a worksheet's rows: it finds the header (the
// first non-empty row), names empty header cells by their column letter,
// drops the columns with neither a header nor a value, and maps the header
// as openTable does.
func openSheet(rows [][]string, file, sheet string, opt TableOptions, known []string) (*table, error) {
	t := &table{file: file, sheet: sheet, e: &errs{file: file, sheet: sheet}}
	h := 0
	for h < len(rows) && blankRow(rows[h]) {
		h++
	}
	if h == len(rows) {
		return nil, t.errorAt(0, 0, "", "", ErrEmpty)
	}
	width := 0
	for _, row := range rows[h:] {
		width = max(width, len(row))
	}
	header := make([]string, 0, width)
	src := &sheetRows{rows: rows, next: h + 1, cur: h}
	for c := 0; c < width; c++ {
		name := ""
		if c < len(rows[h]) {
			name = strings.TrimSpace(rows[h][c])
		}
		if name == "" {
			used := false
			for _, row := range rows[h+1:] {
				if c < len(row) && strings.TrimSpace(row[c]) != "" {
					used = true
					break
				}
			}
			if !used {
				continue
			}
			name = "column " + ColumnName(c+1)
		}
		header = append(header, name)
		src.keep = append(src.keep, c)
	}
	t.r, t.headLine = src, h+1
	return t, t.mapHeader(header, opt, known)
}
