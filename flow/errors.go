package flow

import (
	"bytes"
	"errors"
	"fmt"
	"sort"
	"strings"
	"unicode/utf8"
)

// Sentinel errors wrapped by ParseError, so callers can test with errors.Is.
var (
	ErrEmpty         = errors.New("the file is empty: want a header row and at least one row")
	ErrMissingColumn = errors.New("missing column")
	ErrUnknownNode   = errors.New("unknown node")
	ErrUnknownLane   = errors.New("unknown lane")
	ErrDuplicate     = errors.New("duplicate")
	ErrBounds        = errors.New("minimum above capacity")
	ErrNegative      = errors.New("must not be negative")
	ErrSyntax        = errors.New("malformed line")
	ErrAmbiguous     = errors.New("ambiguous")
)

// ParseError is an input error with its position. Line and Col are 1-based;
// in a text file Col counts characters (UTF-8 code points, a tab as one)
// from the start of the line, as an editor shows them (0 when the whole
// line or file is meant). Field names the column or the DIMACS field.
//
// In a workbook (Sheet != ""), Line is the sheet's row number and Col the
// column number (1 for column A), both 1-based; the message names the cell,
// as in `net.xlsx: sheet "lanes" cell D7: cost "abc": ...`, or the row
// ("row 7") when Col is 0, or only the sheet when Line is 0.
type ParseError struct {
	File      string
	Sheet     string // worksheet of a workbook, "" for text files
	Line, Col int
	Field     string
	Text      string // the offending text, if any
	Err       error

	// chars: Col already counts characters (see textColumns).
	chars bool
}

func (e *ParseError) Error() string {
	var b strings.Builder
	b.WriteString(e.File)
	if e.Sheet != "" {
		fmt.Fprintf(&b, ": sheet %q", clip(e.Sheet))
		switch {
		case e.Line > 0 && e.Col > 0:
			fmt.Fprintf(&b, " cell %s%d", ColumnName(e.Col), e.Line)
		case e.Line > 0:
			fmt.Fprintf(&b, " row %d", e.Line)
		}
	} else if e.Line > 0 {
		fmt.Fprintf(&b, ":%d", e.Line)
		if e.Col > 0 {
			fmt.Fprintf(&b, ":%d", e.Col)
		}
	}
	b.WriteString(": ")
	if e.Field != "" {
		b.WriteString(e.Field)
		if e.Text != "" {
			fmt.Fprintf(&b, " %q", clip(e.Text))
		}
		b.WriteString(": ")
	} else if e.Text != "" {
		fmt.Fprintf(&b, "%q: ", clip(e.Text))
	}
	b.WriteString(e.Err.Error())
	return b.String()
}

func (e *ParseError) Unwrap() error { return e.Err }

// ColumnName returns the spreadsheet name of column c (1-based): 1 is "A",
// 26 "Z", 27 "AA". It returns "" for c < 1.
func ColumnName(c int) string {
	var buf [8]byte
	i := len(buf)
	for c > 0 && i > 0 {
		c--
		i--
		buf[i] = byte('A' + c%26)
		c /= 26
	}
	return string(buf[i:])
}

// clip shortens s to at most 40 bytes, cut at a character boundary, and
// marks the cut with an ellipsis.
func clip(s string) string {
	const max = 40
	if len(s) <= max {
		return s
	}
	i := max
	for i > 0 && !utf8.RuneStart(s[i]) {
		i--
	}
	return s[:i] + "…"
}

// textColumns turns the columns of err's ParseErrors for the text file
// file (whose bytes, as read, are data) from byte offsets, as the parsers
// count them, into character counts: a Col of c becomes one plus the
// number of UTF-8 characters among the line's first c-1 bytes (an invalid
// byte counts as one; bytes past the line's end, as after an unclosed
// quote, count one each). Errors of other files or sheets, and those already
// turned, are left alone; err is returned. One pass over the lines up to
// the last error's; nothing when err has no column past the first.
func textColumns(err error, file string, data []byte) error {
	if err == nil {
		return nil
	}
	var pes []*ParseError
	var list ErrorList
	var pe *ParseError
	switch {
	case errors.As(err, &list):
		pes = list
	case errors.As(err, &pe):
		pes = []*ParseError{pe}
	}
	todo := make([]*ParseError, 0, len(pes))
	for _, e := range pes {
		if e.File == file && e.Sheet == "" && !e.chars && e.Line > 0 {
			e.chars = true
			if e.Col > 1 {
				todo = append(todo, e)
			}
		}
	}
	if len(todo) == 0 {
		return err
	}
	sort.SliceStable(todo, func(i, j int) bool { return todo[i].Line < todo[j].Line })
	data = bytes.TrimPrefix(data, []byte("\xef\xbb\xbf"))
	line, k := 1, 0
	for k < len(todo) && len(data) > 0 {
		text := data
		if i := bytes.IndexByte(data, '\n'); i >= 0 {
			text, data = data[:i], data[i+1:]
		} else {
			data = nil
		}
		for ; k < len(todo) && todo[k].Line == line; k++ {
			e := todo[k]
			nb := min(e.Col-1, len(text))
			e.Col += utf8.RuneCount(text[:nb]) - nb // (a column past the line's end keeps its excess)
		}
		line++
	}
	return err
}

// ErrorList is a list of input errors sorted by file and position. Its
// message shows the first few and counts the rest.
type ErrorList []*ParseError

// maxShown is how many errors an ErrorList message spells out.
const maxShown = 10

// maxKept bounds how many errors a reader collects before it stops.
const maxKept = 1000

func (l ErrorList) Error() string {
	var b strings.Builder
	for i, e := range l {
		if i == maxShown {
			fmt.Fprintf(&b, "\n(and %d more errors)", len(l)-maxShown)
			break
		}
		if i > 0 {
			b.WriteByte('\n')
		}
		b.WriteString(e.Error())
	}
	return b.String()
}

// Unwrap returns the errors, so errors.Is and errors.As see each of them.
func (l ErrorList) Unwrap() []error {
	out := make([]error, len(l))
	for i, e := range l {
		out[i] = e
	}
	return out
}

// sortAndErr sorts l by position and returns it as an error, or nil when
// it is empty.
func (l ErrorList) sortAndErr() error {
	if len(l) == 0 {
		return nil
	}
	sort.SliceStable(l, func(i, j int) bool {
		a, b := l[i], l[j]
		if a.File != b.File {
			return a.File < b.File
		}
		if a.Sheet != b.Sheet {
			return a.Sheet < b.Sheet
		}
		if a.Line != b.Line {
			return a.Line < b.Line
		}
		return a.Col < b.Col
	})
	return l
}

// errs collects parse errors up to maxKept.
type errs struct {
	list  ErrorList
	file  string
	sheet string
}

func (c *errs) add(line, col int, field, text string, err error) {
	if len(c.list) < maxKept {
		c.list = append(c.list, &ParseError{File: c.file, Sheet: c.sheet, Line: line, Col: col, Field: field, Text: text, Err: err})
	}
}

func (c *errs) full() bool { return len(c.list) >= maxKept }

// stop returns the error that ends reading c's file at a CSV syntax error
// err, together with the errors collected before it (sorted).
func (c *errs) stop(err error) error {
	err = csvError(c.file, err)
	var pe *ParseError
	if len(c.list) == 0 || !errors.As(err, &pe) {
		return err
	}
	pe.Sheet = c.sheet
	c.list = append(c.list, pe)
	return c.list.sortAndErr()
}
