package certcheck_test

import (
	"errors"
	"testing"

	"lanecert/flow"
	"lanecert/internal/certcheck"
)

// TestCut checks the cut checker on networks whose numbers are worked out
// by hand from the definitions at certcheck.Cut.
func TestCut(t *testing.T) {
	// o (supply 10) -> a (capacity 4) and o -> b (no capacity);
	// a -> d (demand 12, minimum 1, capacity 5); b -> d (capacity 3).
	// Region {a, d}: demand 12; o -> a enters a, b -> d enters d, nothing
	// leaves: reach 4 + 3 = 7, short 5. Region {a}: demand 0, reach
	// 4 - 1 (minimum of a -> d) = 3, short -3: no proof.
	n := net([]int64{10, 0, 0, -12}, [][5]int64{
		{0, 1, 0, 4, 1}, {0, 2, 0, inf, 1}, {1, 3, 1, 5, 1}, {2, 3, 0, 3, 1},
	})
	// Excess supply: o (20) -> c (demand 5) with minimum 10; the hold node
	// is number 2. Region {o, H}: demand -20 + 15 = -5, reach -10, short 5.
	ex := net([]int64{20, -5}, [][5]int64{{0, 1, 10, inf, 0}})
	// A minimum out of a node that has nothing to send: region {a},
	// demand 0, reach -10 (lane a -> c), short 10.
	lb := net([]int64{5, 0, -5}, [][5]int64{{0, 2, 0, 5, 0}, {1, 2, 10, 10, 0}})
	cases := []struct {
		name                 string
		n                    *flow.Network
		region               []flow.NodeID
		demand, reach, short int64
		want                 error
	}{
		{"valid", n, []flow.NodeID{1, 3}, 12, 7, 5, nil},
		{"valid, whole network short of supply", n, []flow.NodeID{0, 1, 2, 3}, 2, 0, 2, nil},
		{"valid hold", ex, []flow.NodeID{0, 2}, -5, -10, 5, nil},
		{"valid minimum", lb, []flow.NodeID{1}, 0, -10, 10, nil},
		{"wrong demand", n, []flow.NodeID{1, 3}, 11, 7, 4, certcheck.ErrCutDemand},
		{"wrong reach", n, []flow.NodeID{1, 3}, 12, 8, 4, certcheck.ErrCutReach},
		{"wrong short", n, []flow.NodeID{1, 3}, 12, 7, 6, certcheck.ErrCutShort},
		{"short not positive", n, []flow.NodeID{1}, 0, 3, -3, certcheck.ErrCutShort},
		{"lane without capacity in", n, []flow.NodeID{2, 3}, 12, 0, 12, certcheck.ErrCutUnlimited},
		{"unsorted", n, []flow.NodeID{3, 1}, 12, 7, 5, certcheck.ErrRegion},
		{"repeated", n, []flow.NodeID{1, 1, 3}, 12, 7, 5, certcheck.ErrRegion},
		{"out of range", n, []flow.NodeID{1, 4}, 12, 7, 5, certcheck.ErrRegion},
		{"negative node", n, []flow.NodeID{-1, 3}, 12, 7, 5, certcheck.ErrRegion},
		{"hold without excess", lb, []flow.NodeID{1, 3}, 0, -10, 10, certcheck.ErrRegion},
		{"hold missing", ex, []flow.NodeID{0}, -5, -10, 5, certcheck.ErrCutDemand},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			err := certcheck.Cut(c.n, c.region, c.demand, c.reach, c.short)
			if c.want == nil && err != nil || c.want != nil && !errors.Is(err, c.want) {
				t.Fatalf("err %v, want %v", err, c.want)
			}
		})
	}
}

// TestCutAgreesWithFindCut: every cut flow.FindCut returns for these
// networks passes, and changing any claimed number by one fails.
func TestCutAgreesWithFindCut(t *testing.T) {
	for _, n := range []*flow.Network{
		net([]int64{10, 0, 0, -12}, [][5]int64{{0, 1, 0, 4, 1}, {0, 2, 0, inf, 1}, {1, 3, 1, 5, 1}, {2, 3, 0, 3, 1}}),
		net([]int64{20, -5}, [][5]int64{{0, 1, 10, inf, 0}}),
		glpkSample(),
	} {
		n.Supply[len(n.Supply)-1]-- // one more unit of demand than can be met or balanced
		c, err := flow.FindCut(n)
		if err != nil || c == nil {
			t.Fatalf("FindCut: %+v, %v", c, err)
		}
		region := append([]flow.NodeID(nil), c.Region...)
		if c.Hold {
			region = append(region, flow.HoldNode(n))
		}
		if err := certcheck.Cut(n, region, c.Demand, c.Reach, c.Short); err != nil {
			t.Fatal(err)
		}
		for i, bad := range [][3]int64{
			{c.Demand + 1, c.Reach, c.Short + 1},
			{c.Demand, c.Reach + 1, c.Short - 1},
			{c.Demand, c.Reach, c.Short + 1},
		} {
			if err := certcheck.Cut(n, region, bad[0], bad[1], bad[2]); err == nil {
				t.Fatalf("change %d passes", i)
			}
		}
	}
}
