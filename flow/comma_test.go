package flow_test

import (
	"errors"
	"strings"
	"testing"

	"lanecert/flow"
)

// TestDecimalCommaDetection: with a ';' delimiter and no flag, a number
// written with a comma switches the table to decimal commas, and the
// network says so; mixing commas and points is an error, not a guess.
func TestDecimalCommaDetection(t *testing.T) {
	read := func(lanes string, opt flow.TableOptions) (*flow.Network, error) {
		n, _, err := flow.ReadCSVNetwork(strings.NewReader(lanes), "lanes.csv", nil, "", opt)
		return n, err
	}
	n, err := read("from;to;cost;max\nA;B;12,50;10\nB;C;3;4,5\n", flow.TableOptions{})
	if err != nil {
		t.Fatal(err)
	}
	// 12,50 -> 12.5 and 4,5 -> 4.5: one rate place, one quantity place.
	if n.Rate[0] != 125 || n.Upper[1] != 45 || len(n.Notes) != 1 || !strings.Contains(n.Notes[0], "decimal comma (detected at line 2") {
		t.Fatalf("rates %v, caps %v, notes %q", n.Rate, n.Upper, n.Notes)
	}
	_, err = read("from;to;cost\nA;B;1.5\nB;C;2,5\n", flow.TableOptions{})
	var pe *flow.ParseError
	if !errors.As(err, &pe) || !errors.Is(err, flow.ErrAmbiguous) || pe.Line != 3 || pe.Field != "cost" {
		t.Fatalf("mixed styles: %v", err)
	}
	// With the flag nothing is detected and nothing is noted.
	n, err = read("from;to;cost\nA;B;1,5\n", flow.TableOptions{DecimalComma: true})
	if err != nil || n.Rate[0] != 15 || len(n.Notes) != 0 {
		t.Fatalf("flag: %v %v %q", err, n.Rate, n.Notes)
	}
	// With a ',' delimiter a comma is never a decimal mark.
	n, err = read("from,to,cost\nA,B,\"1,5\"\n", flow.TableOptions{})
	if err == nil {
		t.Fatalf("a quoted 1,5 in a comma-separated file was read as %v", n.Rate)
	}
}
