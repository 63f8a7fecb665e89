package flow

import (
	"fmt"
	"strings"
	"testing"
	"unicode/utf8"
)

func TestClip(t *testing.T) {
	tests := []struct {
		in, want string
	}{
		{"short", "short"},
		{strings.Repeat("a", 40), strings.Repeat("a", 40)},
		{strings.Repeat("a", 41), strings.Repeat("a", 40) + "…"},
		// "é" is two bytes: at bytes 39-40 it would be cut in half, so the
		// cut moves before it.
		{strings.Repeat("a", 39) + "éé", strings.Repeat("a", 39) + "…"},
		{strings.Repeat("ü", 30), strings.Repeat("ü", 20) + "…"},
		{strings.Repeat("€", 20), strings.Repeat("€", 13) + "…"},
	}
	for _, tc := range tests {
		got := clip(tc.in)
		if got != tc.want {
			t.Errorf("clip(%q) = %q, want %q", tc.in, got, tc.want)
		}
		if !utf8.ValidString(got) {
			t.Errorf("clip(%q) = %q: not valid UTF-8", tc.in, got)
		}
	}
}

func TestTextColumns(t *testing.T) {
	data := []byte("\xef\xbb\xbfÄb,c\nx\ty\n€€,z\n")
	mk := func(file string, line, col int) *ParseError {
		return &ParseError{File: file, Line: line, Col: col, Err: ErrSyntax}
	}
	tests := []struct {
		name string
		in   *ParseError
		want int
	}{
		// Line 1 after the byte order mark: "Äb,c"; c is byte 5, character 4.
		{"after the byte order mark", mk("f", 1, 5), 4},
		{"first column", mk("f", 1, 1), 1},
		{"tab is one character", mk("f", 2, 3), 3},
		// "€€,z": z is byte 8, character 4.
		{"three-byte characters", mk("f", 3, 8), 4},
		// Past the end of "€€,z" (8 bytes): the excess is kept.
		{"past the end of the line", mk("f", 3, 10), 6},
		{"another file", mk("g", 3, 8), 8},
		{"a line past the end", mk("f", 9, 8), 8},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			err := textColumns(tc.in, "f", data)
			if err != tc.in || tc.in.Col != tc.want {
				t.Fatalf("col %d, want %d", tc.in.Col, tc.want)
			}
			// A second call changes nothing.
			textColumns(fmt.Errorf("wrapped: %w", tc.in), "f", data)
			if tc.in.Col != tc.want {
				t.Fatalf("second call: col %d, want %d", tc.in.Col, tc.want)
			}
		})
	}

	// A list, unsorted, with two errors on one line and a worksheet error.
	list := ErrorList{mk("f", 3, 8), mk("f", 1, 5), mk("f", 3, 4), {File: "f", Sheet: "s", Line: 3, Col: 8, Err: ErrSyntax}}
	if err := textColumns(fmt.Errorf("reading: %w", list), "f", data); err == nil {
		t.Fatal("nil error")
	}
	for i, want := range []int{4, 4, 2, 8} {
		if list[i].Col != want {
			t.Errorf("list[%d].Col = %d, want %d", i, list[i].Col, want)
		}
	}
	if textColumns(nil, "f", data) != nil {
		t.Error("nil error not kept")
	}
}
