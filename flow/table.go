package flow

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"strings"
)

// ErrNotFinite reports NaN or an infinity where a quantity or rate belongs.
var ErrNotFinite = errors.New("NaN and infinity are not allowed: want a finite decimal")

// TableOptions controls how CSV tables are read.
type TableOptions struct {
	// Columns maps header names found in the file (case-insensitive) onto
	// lanecert's column names, e.g. {"rate_usd": "cost"}.
	Columns map[string]string
	// DecimalComma reads numbers written with a decimal comma ("12,50").
	DecimalComma bool
}

// rowSource yields the rows of a table with the position of each field.
// *csv.Reader is one; a worksheet (xlsx.go) is another, whose positions are
// the sheet row and the column number.
type rowSource interface {
	Read() ([]string, error)
	FieldPos(field int) (line, column int)
}

// table is a table being read (CSV text or a worksheet): the header's
// column indexes by our column name, and the source positioned after the
// header.
type table struct {
	file     string
	sheet    string // worksheet name, "" for CSV
	headLine int    // line (or sheet row) of the header
	r        rowSource
	cols     map[string]int // our name -> field index
	names    []string       // header as written
	extra    []int          // indexes of columns we do not use
	e        *errs
	comma    bool
	// detect is set for CSV tables with ';' or tab delimiters read without
	// DecimalComma: a number with a comma and no point then switches the
	// table to decimal commas (commaLine records where), and mixing the two
	// styles is an error rather than a guess.
	detect               bool
	commaLine, pointLine int
}

// notes says how the table was read where that was detected rather than
// asked for.
func (t *table) notes() []string {
	if t.commaLine > 0 {
		return []string{fmt.Sprintf("%s: numbers read with a decimal comma (detected at line %d; no decimal point appears in the file)", t.file, t.commaLine)}
	}
	return nil
}

// synonyms maps accepted header names onto lanecert's column names.
func synonym(h string) string {
	switch h {
	case "rate":
		return "cost"
	case "capacity", "cap":
		return "max"
	case "minimum", "lower":
		return "min"
	case "quantity", "qty":
		return "flow"
	case "id":
		return "lane"
	case "from_node", "origin":
		return "from"
	case "to_node", "destination":
		return "to"
	}
	return h
}

// newCSVReader strips a UTF-8 byte order mark, rejects empty text, and
// returns a CSV reader whose delimiter (',' ';' or tab) is detected from the
// first line.
func newCSVReader(data []byte, file string) (*csv.Reader, error) {
	data = bytes.TrimPrefix(data, []byte("\xef\xbb\xbf"))
	if len(bytes.TrimSpace(data)) == 0 {
		return nil, &ParseError{File: file, Err: ErrEmpty}
	}
	head := data
	if i := bytes.IndexByte(head, '\n'); i >= 0 {
		head = head[:i]
	}
	delim, err := detectDelimiter(head)
	if err != nil {
		return nil, &ParseError{File: file, Line: 1, Err: err}
	}
	r := csv.NewReader(bytes.NewReader(data))
	r.Comma = delim
	r.ReuseRecord = true
	return r, nil
}

// openTable reads the header of a CSV table (see newCSVReader) and maps the
// header names onto our column names (known lists the names we use; any
// other column is kept as extra).
func openTable(data []byte, file string, opt TableOptions, known []string, e *errs) (*table, error) {
	r, err := newCSVReader(data, file)
	if err != nil {
		return nil, err
	}
	header, err := r.Read()
	if err != nil {
		return nil, csvError(file, err)
	}
	t := &table{file: file, headLine: 1, r: r, e: e, comma: opt.DecimalComma}
	t.detect = !opt.DecimalComma && r.Comma != ','
	return t, t.mapHeader(header, opt, known)
}

// mapHeader maps the header names onto our column names.
func (t *table) mapHeader(header []string, opt TableOptions, known []string) error {
	t.cols = map[string]int{}
	t.names = append([]string(nil), header...)
	alias := map[string]string{}
	for k, v := range opt.Columns {
		alias[strings.ToLower(strings.TrimSpace(k))] = strings.ToLower(strings.TrimSpace(v))
	}
	isKnown := map[string]bool{}
	for _, k := range known {
		isKnown[k] = true
	}
	for i, h := range header {
		key := strings.ToLower(strings.TrimSpace(h))
		if a, ok := alias[key]; ok {
			key = a
		} else {
			key = synonym(key)
		}
		if !isKnown[key] {
			t.extra = append(t.extra, i)
			continue
		}
		if j, dup := t.cols[key]; dup {
			line, col := t.r.FieldPos(i)
			return t.errorAt(line, col, "header", h,
				fmt.Errorf("%w: column %q is also given by header %q (column %d)", ErrAmbiguous, key, header[j], j+1))
		}
		t.cols[key] = i
	}
	return nil
}

// errorAt returns a ParseError in t's file (and sheet).
func (t *table) errorAt(line, col int, field, text string, err error) *ParseError {
	return &ParseError{File: t.file, Sheet: t.sheet, Line: line, Col: col, Field: field, Text: text, Err: err}
}

func detectDelimiter(head []byte) (rune, error) {
	counts := map[rune]int{',': 0, ';': 0, '\t': 0}
	inQuote := false
	for _, c := range head {
		switch {
		case c == '"':
			inQuote = !inQuote
		case !inQuote && (c == ',' || c == ';' || c == '\t'):
			counts[rune(c)]++
		}
	}
	best, n, tie := rune(','), 0, false
	for _, d := range []rune{',', ';', '\t'} {
		switch {
		case counts[d] > n:
			best, n, tie = d, counts[d], false
		case counts[d] == n && n > 0:
			tie = true
		}
	}
	if n == 0 {
		return 0, fmt.Errorf("%w: header has a single column; want columns separated by ',' ';' or tab", ErrSyntax)
	}
	if tie {
		return 0, fmt.Errorf("%w: cannot tell the delimiter: the header has as many of two of ',' ';' and tab", ErrAmbiguous)
	}
	return best, nil
}

func csvError(file string, err error) error {
	var pe *csv.ParseError
	if errors.As(err, &pe) {
		return &ParseError{File: file, Line: pe.Line, Col: pe.Column, Err: fmt.Errorf("%w: %v", ErrSyntax, pe.Err)}
	}
	if err == io.EOF {
		return &ParseError{File: file, Err: ErrEmpty}
	}
	return &ParseError{File: file, Err: err}
}

// require reports the columns of want that the header lacks.
func (t *table) require(want ...string) error {
	var missing []string
	for _, w := range want {
		if _, ok := t.cols[w]; !ok {
			missing = append(missing, w)
		}
	}
	if len(missing) == 0 {
		return nil
	}
	return t.errorAt(t.headLine, 0, "header", "",
		fmt.Errorf("%w: want column(s) %s; the header has %s (use a column mapping for other names)",
			ErrMissingColumn, strings.Join(missing, ", "), quoteList(t.names)))
}

func quoteList(s []string) string {
	q := make([]string, len(s))
	for i, x := range s {
		q[i] = fmt.Sprintf("%q", x)
	}
	return strings.Join(q, ", ")
}

// each calls fn for every data row. fn reads fields through row.
func (t *table) each(fn func(row *row)) error {
	rw := &row{t: t}
	for n := 1; ; n++ {
		rec, err := t.r.Read()
		if err == io.EOF {
			return nil
		}
		if err != nil {
			return t.e.stop(err) // with the errors found before it
		}
		if len(rec) == 1 && strings.TrimSpace(rec[0]) == "" {
			continue // blank line
		}
		rw.rec, rw.n = rec, n
		fn(rw)
		if t.e.full() {
			return nil
		}
	}
}

// row is the current data row of a table.
type row struct {
	t   *table
	rec []string
	n   int // 1-based data row number
}

func (r *row) has(col string) bool { _, ok := r.t.cols[col]; return ok }

func (r *row) pos(col string) (int, int) {
	return r.t.r.FieldPos(r.t.cols[col])
}

// text returns the trimmed text of col ("" when the column is absent).
func (r *row) text(col string) string {
	i, ok := r.t.cols[col]
	if !ok {
		return ""
	}
	return strings.TrimSpace(r.rec[i])
}

func (r *row) fail(col string, err error) {
	line, c := r.pos(col)
	r.t.e.add(line, c, col, r.text(col), err)
}

// name reads a required non-empty name.
func (r *row) name(col string) (string, bool) {
	s := r.text(col)
	if s == "" {
		r.fail(col, fmt.Errorf("%w: want a name, the cell is empty", ErrSyntax))
		return "", false
	}
	return s, true
}

// decimal reads a number; empty cells give def with ok=true when allowEmpty.
func (r *row) decimal(col string, allowEmpty bool, def Decimal) (Decimal, bool) {
	s := r.text(col)
	if s == "" {
		if allowEmpty {
			return def, true
		}
		r.fail(col, fmt.Errorf("%w: want a decimal, the cell is empty", ErrNotDecimal))
		return Decimal{}, false
	}
	if t := r.t; t.detect {
		line, _ := r.pos(col)
		hasComma, hasPoint := strings.Contains(s, ","), strings.Contains(s, ".")
		switch {
		case hasComma && !hasPoint && t.pointLine > 0:
			r.fail(col, fmt.Errorf("%w: a decimal comma here, but line %d has a decimal point: say which the file uses (--decimal-comma)", ErrAmbiguous, t.pointLine))
			return Decimal{}, false
		case hasComma && !hasPoint:
			if !t.comma {
				t.comma, t.commaLine = true, line
			}
		case hasPoint && t.comma:
			r.fail(col, fmt.Errorf("%w: a decimal point here, but line %d has a decimal comma: say which the file uses (--decimal-comma)", ErrAmbiguous, t.commaLine))
			return Decimal{}, false
		case hasPoint && t.pointLine == 0:
			t.pointLine = line
		}
	}
	var d Decimal
	var err error
	if r.t.comma {
		d, err = ParseDecimalComma(s)
	} else {
		d, err = ParseDecimal(s)
	}
	if err != nil {
		switch strings.ToLower(strings.TrimLeft(s, "+-")) {
		case "nan", "inf", "infinity":
			err = ErrNotFinite
		}
		r.fail(col, err)
		return Decimal{}, false
	}
	return d, true
}

func (r *row) extras() []string {
	if len(r.t.extra) == 0 {
		return nil
	}
	out := make([]string, len(r.t.extra))
	for k, i := range r.t.extra {
		out[k] = r.rec[i]
	}
	return out
}

func (t *table) extraNames() []string {
	out := make([]string, len(t.extra))
	for k, i := range t.extra {
		out[k] = t.names[i]
	}
	return out
}

// rawQty holds decimals as read: value i is mant[i] × 10^-places[i]. The
// values are scaled in place once the common number of places is known.
type rawQty struct {
	mant   []int64
	places []int8
}

func (q *rawQty) add(d Decimal) {
	q.mant = append(q.mant, d.Mant)
	q.places = append(q.places, d.Places)
}

func (q *rawQty) maxPlaces() int {
	m := 0
	for i, p := range q.places {
		if int(p) > m && q.mant[i] != NoLimit {
			m = int(p)
		}
	}
	return m
}

// scale converts every value to p places in place and returns the values.
// NoLimit stays NoLimit. at(i) names value i in an overflow error.
func (q *rawQty) scale(p int, at func(i int) string) ([]int64, error) {
	for i, m := range q.mant {
		if m == NoLimit {
			continue
		}
		v, err := ScaleUp(m, p-int(q.places[i]))
		if err != nil {
			return nil, fmt.Errorf("%s: %s with %d decimal places: %w", at(i), Decimal{m, q.places[i]}, p, err)
		}
		q.mant[i] = v
	}
	q.places = nil
	return q.mant, nil
}
