package flow

import (
	"errors"
	"math"
	"strings"
	"testing"
)

// lane is tail, head, lower, upper.
type lane [4]int64

// mkNet builds a network with nodes named 1..len(supply).
func mkNet(supply []int64, lanes ...lane) *Network {
	n := &Network{Supply: supply}
	for v := range supply {
		n.Nodes = append(n.Nodes, string(rune('1'+v)))
	}
	for _, l := range lanes {
		n.Tail = append(n.Tail, NodeID(l[0]))
		n.Head = append(n.Head, NodeID(l[1]))
		n.Lower = append(n.Lower, l[2])
		n.Upper = append(n.Upper, l[3])
		n.Rate = append(n.Rate, 1)
	}
	return n
}

// Every expected value below follows from the case by hand: NetOut[v] is
// the flow on lanes leaving v minus the flow on lanes entering v.
func TestCheckPlan(t *testing.T) {
	const inf = NoLimit
	lv := func(k ViolationKind, a LaneID, lo, hi, x int64) Violation {
		return Violation{Kind: k, Lane: a, Node: -1, Min: lo, Max: hi, Actual: x}
	}
	nv := func(v NodeID, lo, hi, x int64) Violation {
		return Violation{Kind: Unbalanced, Lane: -1, Node: v, Min: lo, Max: hi, Actual: x}
	}
	tests := []struct {
		name string
		net  *Network
		flow []int64
		want Feasibility
	}{
		{name: "balanced", net: mkNet([]int64{5, -5}, lane{0, 1, 0, 10}), flow: []int64{5},
			want: Feasibility{NetOut: []int64{5, -5}, TotalSupply: 5, TotalDemand: 5}},
		{name: "below minimum", net: mkNet([]int64{5, -5}, lane{0, 1, 6, 10}), flow: []int64{5},
			want: Feasibility{NetOut: []int64{5, -5}, TotalSupply: 5, TotalDemand: 5,
				Violations: []Violation{lv(BelowMinimum, 0, 6, 10, 5)}}},
		{name: "above capacity", net: mkNet([]int64{5, -5}, lane{0, 1, 0, 4}), flow: []int64{5},
			want: Feasibility{NetOut: []int64{5, -5}, TotalSupply: 5, TotalDemand: 5,
				Violations: []Violation{lv(AboveCapacity, 0, 0, 4, 5)}}},
		{name: "at both bounds", net: mkNet([]int64{8, -8}, lane{0, 1, 3, 3}, lane{0, 1, 0, 5}), flow: []int64{3, 5},
			want: Feasibility{NetOut: []int64{8, -8}, TotalSupply: 8, TotalDemand: 8}},
		// A negative flow is below the minimum 0, and moves -1 out of node 1.
		{name: "negative flow", net: mkNet([]int64{0, 0}, lane{0, 1, 0, inf}), flow: []int64{-1},
			want: Feasibility{NetOut: []int64{-1, 1},
				Violations: []Violation{lv(BelowMinimum, 0, 0, inf, -1), nv(0, 0, 0, -1), nv(1, 0, 0, 1)}}},
		// 5 in, 4 out at node 2: -1; node 3 receives 4 of 5.
		{name: "unbalanced", net: mkNet([]int64{5, 0, -5}, lane{0, 1, 0, 10}, lane{1, 2, 0, 10}), flow: []int64{5, 4},
			want: Feasibility{NetOut: []int64{5, -1, -4}, TotalSupply: 5, TotalDemand: 5,
				Violations: []Violation{nv(1, 0, 0, -1), nv(2, -5, -5, -4)}}},
		// Supply 20, demand 15: origin 2 keeps 5.
		{name: "excess kept", net: mkNet([]int64{10, 10, -15}, lane{0, 2, 0, inf}, lane{1, 2, 0, inf}), flow: []int64{10, 5},
			want: Feasibility{NetOut: []int64{10, 5, -15}, Held: []int64{0, 5, 0}, TotalSupply: 20, TotalDemand: 15}},
		{name: "origin keeps all", net: mkNet([]int64{10, 10, -10}, lane{0, 2, 0, inf}, lane{1, 2, 0, inf}), flow: []int64{10, 0},
			want: Feasibility{NetOut: []int64{10, 0, -10}, Held: []int64{0, 10, 0}, TotalSupply: 20, TotalDemand: 10}},
		// Origin 1 ships 7 to 3 and 3 through origin 2: nets 10 and 8-3 = 5.
		{name: "through an origin", net: mkNet([]int64{10, 10, -15}, lane{0, 2, 0, inf}, lane{1, 2, 0, inf}, lane{0, 1, 0, inf}),
			flow: []int64{7, 8, 3},
			want: Feasibility{NetOut: []int64{10, 5, -15}, Held: []int64{0, 5, 0}, TotalSupply: 20, TotalDemand: 15}},
		// Origin 2 absorbs 3 from origin 1: net -3 is outside [0, 10].
		{name: "origin absorbs", net: mkNet([]int64{10, 10, -5}, lane{0, 2, 0, inf}, lane{1, 2, 0, inf}, lane{0, 1, 0, inf}),
			flow: []int64{5, 0, 3},
			want: Feasibility{NetOut: []int64{8, -3, -5}, Held: []int64{2, 13, 0}, TotalSupply: 20, TotalDemand: 5,
				Violations: []Violation{nv(1, 0, 10, -3)}}},
		// Origin 1 sends 12 of its 10.
		{name: "origin over its supply", net: mkNet([]int64{10, 10, -5}, lane{0, 2, 0, inf}, lane{1, 2, 0, inf}, lane{0, 1, 0, inf}),
			flow: []int64{5, 0, 7},
			want: Feasibility{NetOut: []int64{12, -7, -5}, Held: []int64{-2, 17, 0}, TotalSupply: 20, TotalDemand: 5,
				Violations: []Violation{nv(0, 0, 10, 12), nv(1, 0, 10, -7)}}},
		// With excess, a destination still balances exactly.
		{name: "destination over its demand", net: mkNet([]int64{10, -5}, lane{0, 1, 0, inf}), flow: []int64{10},
			want: Feasibility{NetOut: []int64{10, -10}, Held: []int64{0, 0}, TotalSupply: 10, TotalDemand: 5,
				Violations: []Violation{nv(1, -5, -5, -10)}}},
		// Demand 8 > supply 5: no plan is feasible.
		{name: "short supply", net: mkNet([]int64{5, -8}, lane{0, 1, 0, inf}), flow: []int64{5},
			want: Feasibility{NetOut: []int64{5, -5}, TotalSupply: 5, TotalDemand: 8,
				Violations: []Violation{nv(1, -8, -8, -5), {Kind: ShortSupply, Lane: -1, Node: -1, Min: 8, Max: 8, Actual: 5}}}},
		{name: "order: lanes, nodes, short supply", net: mkNet([]int64{5, -8}, lane{0, 1, 0, 4}, lane{0, 1, 1, 9}),
			flow: []int64{5, 0},
			want: Feasibility{NetOut: []int64{5, -5}, TotalSupply: 5, TotalDemand: 8,
				Violations: []Violation{lv(AboveCapacity, 0, 0, 4, 5), lv(BelowMinimum, 1, 1, 9, 0), nv(1, -8, -8, -5),
					{Kind: ShortSupply, Lane: -1, Node: -1, Min: 8, Max: 8, Actual: 5}}}},
		{name: "self-loop", net: mkNet([]int64{0}, lane{0, 0, 0, 3}), flow: []int64{3},
			want: Feasibility{NetOut: []int64{0}}},
		{name: "no lanes", net: mkNet([]int64{0, 0}), flow: []int64{},
			want: Feasibility{NetOut: []int64{0, 0}}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got, err := CheckPlan(tc.net, tc.flow)
			if err != nil {
				t.Fatal(err)
			}
			eq(t, "Feasibility", *got, tc.want)
			if got.Feasible() != (len(tc.want.Violations) == 0) {
				t.Errorf("Feasible() = %v", got.Feasible())
			}
			excess := max(tc.want.TotalSupply-tc.want.TotalDemand, 0)
			eq(t, "Excess", got.Excess(), excess)
		})
	}
}

func TestCheckPlanErrors(t *testing.T) {
	const maxI = math.MaxInt64
	tests := []struct {
		name string
		net  *Network
		flow []int64
		err  error
		msg  string
	}{
		{name: "length", net: mkNet([]int64{0, 0}, lane{0, 1, 0, 1}), flow: []int64{1, 2}, msg: "plan has 2 quantities for 1 lanes"},
		{name: "outflow", net: mkNet([]int64{0, 0}, lane{0, 1, 0, NoLimit}, lane{0, 1, 0, NoLimit}), flow: []int64{maxI, 1},
			err: ErrOverflow, msg: `outflow of node "1"`},
		// Node 2 receives MaxInt64 + 1 + 1: -MaxInt64-1 = MinInt64 still fits, one more does not.
		{name: "inflow", net: mkNet([]int64{0, 0, 0, 0}, lane{0, 1, 0, NoLimit}, lane{2, 1, 0, NoLimit}, lane{3, 1, 0, NoLimit}),
			flow: []int64{maxI, 1, 1}, err: ErrOverflow, msg: `inflow of node "2"`},
		{name: "total supply", net: mkNet([]int64{maxI, 1, -1}), flow: []int64{}, err: ErrOverflow},
		// Origin 1 (supply MaxInt64) receives 1: it keeps MaxInt64 + 1.
		{name: "kept supply", net: mkNet([]int64{maxI, -1, 0}, lane{2, 0, 0, NoLimit}), flow: []int64{1},
			err: ErrOverflow, msg: `kept supply at node "1"`},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			f, err := CheckPlan(tc.net, tc.flow)
			if err == nil {
				t.Fatalf("no error; got %+v", f)
			}
			if tc.err != nil && !errors.Is(err, tc.err) {
				t.Errorf("error %v; want %v", err, tc.err)
			}
			if !strings.Contains(err.Error(), tc.msg) || !strings.HasPrefix(err.Error(), "flow: ") {
				t.Errorf("error %q; want it to contain %q", err, tc.msg)
			}
		})
	}
}

func TestViolationKindString(t *testing.T) {
	for k, want := range map[ViolationKind]string{
		BelowMinimum: "below-minimum", AboveCapacity: "above-capacity", Unbalanced: "unbalanced",
		ShortSupply: "short-supply", ViolationKind(9): "ViolationKind(9)",
	} {
		if got := k.String(); got != want {
			t.Errorf("%d.String() = %q; want %q", int(k), got, want)
		}
	}
}
