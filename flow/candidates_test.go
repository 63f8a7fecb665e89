package flow_test

import (
	"errors"
	"strings"
	"testing"

	"lanecert/flow"
)

func candNet(t *testing.T) *flow.Network {
	t.Helper()
	lanes := "lane,from,to,cost,max\nL1,A,B,2.5,10\nL2,B,C,1,\n"
	n, _, err := flow.ReadCSVNetwork(strings.NewReader(lanes), "lanes.csv", nil, "", flow.TableOptions{})
	if err != nil {
		t.Fatal(err)
	}
	return n
}

func TestReadCandidatesErrors(t *testing.T) {
	cases := []struct {
		name, text string
		line, col  int
		field      string
		want       error
	}{
		{"unknown node", "bid,from,to,rate\nQ1,A,Z,3\n", 2, 6, "to", flow.ErrUnknownNode},
		{"negative rate", "bid,from,to,rate\nQ1,A,C,-3\n", 2, 8, "cost", flow.ErrNegative},
		{"text rate", "bid,from,to,rate\nQ1,A,C,cheap\n", 2, 8, "cost", flow.ErrNotDecimal},
		{"duplicate id", "bid,from,to,rate\nQ1,A,C,3\nQ1,C,A,4\n", 3, 1, "lane", flow.ErrDuplicate},
		{"negative capacity", "bid,from,to,rate,max\nQ1,A,C,3,-1\n", 2, 10, "max", flow.ErrNegative},
		{"too many places", "bid,from,to,rate,max\nQ1,A,C,3,1.5\n", 2, 10, "max", flow.ErrSyntax},
		// "Q€,A,C,3,-1": max at character 10 (byte 12).
		{"characters before the cell", "bid,from,to,rate,max\nQ€,A,C,3,-1\n", 2, 10, "max", flow.ErrNegative},
		{"missing rate column", "bid,from,to\nQ1,A,C\n", 1, 0, "header", flow.ErrMissingColumn},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := flow.ReadCandidates(strings.NewReader(c.text), "bids.csv", candNet(t), flow.TableOptions{})
			var pe *flow.ParseError
			if !errors.As(err, &pe) || !errors.Is(err, c.want) {
				t.Fatalf("err = %v, want %v", err, c.want)
			}
			if pe.Line != c.line || pe.Col != c.col || pe.Field != c.field {
				t.Fatalf("at %d:%d %s, want %d:%d %s (%v)", pe.Line, pe.Col, pe.Field, c.line, c.col, c.field, err)
			}
		})
	}
}

func TestReadCandidates(t *testing.T) {
	n := candNet(t)
	text := "id,from,to,cost,max\nQ1,A,C,3.125,\nQ2,A,B,2.5,10\n"
	cs, err := flow.ReadCandidates(strings.NewReader(text), "bids.csv", n, flow.TableOptions{})
	if err != nil {
		t.Fatal(err)
	}
	// 3.125 has three places: the network's rates (2.5, 1) are rescaled.
	if n.RatePlaces != 3 || n.Rate[0] != 2500 || cs[0].Rate != 3125 {
		t.Fatalf("rates %v, candidate %d, places %d", n.Rate, cs[0].Rate, n.RatePlaces)
	}
	if cs[0].Same != -1 || cs[1].Same != 0 || cs[1].ID != "Q2" {
		t.Fatalf("same-as %d %d, id %q", cs[0].Same, cs[1].Same, cs[1].ID)
	}
	ext := n.WithLanes(cs)
	if ext.NumLanes() != 4 || ext.LaneName(2) != "Q1" || n.NumLanes() != 2 {
		t.Fatalf("extended network: %d lanes, name %q", ext.NumLanes(), ext.LaneName(2))
	}
}

func FuzzReadCandidates(f *testing.F) {
	f.Add("bid,from,to,rate\nQ1,A,C,3\n")
	f.Add("bid,from,to,rate,min,max\nQ1,A,C,3,1,2\nQ2,C,A,0,,\n")
	f.Add("from;to;cost\nA;B;1,5\n")
	f.Fuzz(func(t *testing.T, text string) {
		lanes := "lane,from,to,cost,max\nL1,A,B,2.5,10\nL2,B,C,1,\n"
		n, _, err := flow.ReadCSVNetwork(strings.NewReader(lanes), "lanes.csv", nil, "", flow.TableOptions{})
		if err != nil {
			t.Fatal(err)
		}
		cs, err := flow.ReadCandidates(strings.NewReader(text), "bids.csv", n, flow.TableOptions{})
		if err != nil {
			var pe *flow.ParseError
			var el flow.ErrorList
			if !errors.As(err, &pe) && !errors.As(err, &el) {
				t.Fatalf("unpositioned error %T: %v", err, err)
			}
			return
		}
		if err := n.WithLanes(cs).Validate(); err != nil {
			t.Fatalf("candidates make an invalid network: %v", err)
		}
	})
}
