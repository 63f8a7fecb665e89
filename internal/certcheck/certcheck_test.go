package certcheck_test

import (
	"errors"
	"math/big"
	"strconv"
	"testing"

	"lanecert/flow"
	"lanecert/internal/certcheck"
)

const inf = flow.NoLimit

// net builds a network from lanes given as {tail, head, lower, upper, rate}
// (0-based nodes).
func net(supply []int64, lanes [][5]int64) *flow.Network {
	n := &flow.Network{Supply: supply}
	for v := range supply {
		n.Nodes = append(n.Nodes, strconv.Itoa(v+1))
	}
	for _, l := range lanes {
		n.Tail = append(n.Tail, flow.NodeID(l[0]))
		n.Head = append(n.Head, flow.NodeID(l[1]))
		n.Lower = append(n.Lower, l[2])
		n.Upper = append(n.Upper, l[3])
		n.Rate = append(n.Rate, l[4])
	}
	return n
}

// glpkSample is GLPK 5.0 examples/sample.min (GLPK Graph and Network
// Routines, Dec 2020, sec. 2.1.5), nodes renumbered from 0.
func glpkSample() *flow.Network {
	return net([]int64{20, 0, 0, 0, 0, 0, 0, 0, -20}, [][5]int64{
		{0, 1, 0, 14, 0}, {0, 3, 0, 23, 0}, {1, 2, 0, 10, 2}, {1, 3, 0, 9, 3},
		{2, 4, 2, 12, 1}, {2, 7, 0, 18, 0}, {3, 4, 0, 26, 0}, {4, 1, 0, 11, 1},
		{4, 5, 0, 25, 5}, {4, 6, 0, 4, 7}, {5, 6, 0, 7, 0}, {5, 7, 4, 8, 0},
		{6, 8, 0, 15, 3}, {7, 8, 0, 20, 9},
	})
}

// glpkPlan is the published optimal plan of glpk_sample (same source; cost 213).
var glpkPlan = []int64{7, 13, 7, 0, 2, 5, 13, 0, 11, 4, 7, 4, 11, 9}

// glpkPotentials are the published potentials of glpk_sample (same source,
// GLPK's pi 1:-12 2:-12 3:-14 4:-12 5:-12 6:-17 7:-20 8:-14 9:-23 with
// reduced cost c - (pi_i - pi_j)) converted to lanecert's sign,
// p = -pi, so that r = c + p(tail) - p(head).
var glpkPotentials = []int64{12, 12, 14, 12, 12, 17, 20, 14, 23}

// dantzig is the transportation problem of Dantzig, Linear Programming and
// Extensions (1963) ch. 3-3 (GLPK 5.0 examples/transp.mod), costs in dollars
// per thousand cases: plants Seattle (0, 350) and San Diego (1, 600),
// markets New York (2, 325), Chicago (3, 300), Topeka (4, 275). Without the
// source's dummy sink, the surplus of 50 is kept under the excess rule.
func dantzig() *flow.Network {
	return net([]int64{350, 600, -325, -300, -275}, [][5]int64{
		{0, 2, 0, inf, 225}, {0, 3, 0, inf, 153}, {0, 4, 0, inf, 162},
		{1, 2, 0, inf, 225}, {1, 3, 0, inf, 162}, {1, 4, 0, inf, 126},
	})
}

// dantzigPlan is the published optimal plan (same source; cost 153675);
// San Diego keeps 50.
var dantzigPlan = []int64{50, 300, 0, 275, 0, 275}

// dantzigPotentials are the published duals (same source): plant values 0,
// market values 225, 153, 126 (reduced cost c - u_i - v_j, so p(plant) =
// -u = 0 and p(market) = v).
var dantzigPotentials = []int64{0, 0, 225, 153, 126}

func TestFeasible(t *testing.T) {
	// Hand-made cases worked from the definitions in the package doc.
	tests := []struct {
		name string
		n    *flow.Network
		x    []int64
		want error
	}{
		{"glpk sample published plan", glpkSample(), glpkPlan, nil},
		{"dantzig published plan, surplus kept", dantzig(), dantzigPlan, nil},
		{"wrong length", glpkSample(), glpkPlan[:3], certcheck.ErrShape},
		{"below minimum", net([]int64{0, 0}, [][5]int64{{0, 1, 2, 5, 1}}), []int64{1}, certcheck.ErrBound},
		{"above capacity", net([]int64{6, -6}, [][5]int64{{0, 1, 0, 5, 1}}), []int64{6}, certcheck.ErrBound},
		{"negative flow", net([]int64{0, 0}, [][5]int64{{0, 1, 0, inf, 1}}), []int64{-1}, certcheck.ErrBound},
		{"unbalanced", net([]int64{3, -3}, [][5]int64{{0, 1, 0, inf, 1}}), []int64{2}, certcheck.ErrBalance},
		{"demand above supply", net([]int64{3, -4}, [][5]int64{{0, 1, 0, inf, 1}}), []int64{3}, certcheck.ErrShortSupply},
		{"origin keeps part", net([]int64{5, -3}, [][5]int64{{0, 1, 0, inf, 1}}), []int64{3}, nil},
		{"origin ships more than its supply", net([]int64{5, 2, -3}, [][5]int64{{0, 1, 0, inf, 1}, {1, 2, 0, inf, 1}}), []int64{6, 3}, certcheck.ErrBalance},
		{"origin receives net", net([]int64{5, 2, -3}, [][5]int64{{0, 1, 0, inf, 1}, {1, 2, 0, inf, 1}}), []int64{5, 3}, certcheck.ErrBalance},
		{"destination over-served under excess", net([]int64{5, -3}, [][5]int64{{0, 1, 0, inf, 1}}), []int64{4}, certcheck.ErrBalance},
		{"self-loop", net([]int64{0}, [][5]int64{{0, 0, 1, 3, 1}}), []int64{2}, nil},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			err := certcheck.Feasible(tc.n, tc.x)
			if tc.want == nil && err != nil || tc.want != nil && !errors.Is(err, tc.want) {
				t.Fatalf("got %v, want %v", err, tc.want)
			}
		})
	}
}

func big1(v int64) *big.Int { return big.NewInt(v) }

func TestOptimal(t *testing.T) {
	with := func(p []int64, v int, d int64) []int64 {
		q := append([]int64(nil), p...)
		q[v] += d
		return q
	}
	// Excess case worked by hand: origin 0 (10) ships 4 to destination 1
	// at rate 5 (cost 20) and keeps 6, so p(0) = 0, p(1) = 5.
	keep := net([]int64{10, -4}, [][5]int64{{0, 1, 0, inf, 5}})
	tests := []struct {
		name       string
		n          *flow.Network
		x, p       []int64
		cost, dual *big.Int
		want       error
	}{
		// GLPK Graph and Network Routines (Dec 2020) sec. 2.1.5: cost 213.
		{"glpk sample published", glpkSample(), glpkPlan, glpkPotentials, big1(213), big1(213), nil},
		// Potentials are defined up to a constant when supplies sum to 0.
		{"glpk sample shifted potentials", glpkSample(), glpkPlan, []int64{112, 112, 114, 112, 112, 117, 120, 114, 123}, big1(213), big1(213), nil},
		// Dantzig (1963) ch. 3-3: cost 153675.
		{"dantzig published, surplus kept", dantzig(), dantzigPlan, dantzigPotentials, big1(153675), big1(153675), nil},
		{"dantzig, no claims", dantzig(), dantzigPlan, dantzigPotentials, nil, nil, nil},
		{"wrong claimed cost", glpkSample(), glpkPlan, glpkPotentials, big1(212), nil, certcheck.ErrClaimedCost},
		{"wrong claimed dual", glpkSample(), glpkPlan, glpkPotentials, big1(213), big1(214), certcheck.ErrClaimedDual},
		{"potentials short", glpkSample(), glpkPlan, glpkPotentials[:8], nil, nil, certcheck.ErrShape},
		{"plan infeasible", glpkSample(), with(glpkPlan, 0, 1), glpkPotentials, nil, nil, certcheck.ErrBalance},
		// GLPK's pi unconverted: the wrong sign convention.
		{"wrong sign convention", glpkSample(), glpkPlan, []int64{-12, -12, -14, -12, -12, -17, -20, -14, -23}, nil, nil, certcheck.ErrSlackness},
		// Lane 1->2 carries 7 of 14 (strictly between): p(1) + 1 breaks r == 0.
		{"between bounds, r != 0", glpkSample(), glpkPlan, with(glpkPotentials, 0, 1), nil, nil, certcheck.ErrSlackness},
		// Dantzig: Seattle->Topeka is at 0 with r = 36; p(Topeka) + 37 makes r < 0.
		{"at minimum, r < 0", dantzig(), dantzigPlan, with(dantzigPotentials, 4, 37), nil, nil, certcheck.ErrSlackness},
		// 5->7 is at capacity 4 with r = -1; p(7) - 2 makes r = +1.
		{"at capacity, r > 0", glpkSample(), glpkPlan, with(glpkPotentials, 6, -2), nil, nil, certcheck.ErrSlackness},
		{"no capacity, r < 0", net([]int64{3, -3}, [][5]int64{{0, 1, 0, inf, 1}, {0, 1, 0, inf, 2}}), []int64{3, 0}, []int64{0, 3}, nil, nil, certcheck.ErrSlackness},
		{"fixed lane, any r", net([]int64{3, -3}, [][5]int64{{0, 1, 3, 3, 1}}), []int64{3}, []int64{0, 100}, big1(3), big1(3), nil},
		{"origin keeps part, p = 0", keep, []int64{4}, []int64{0, 5}, big1(20), big1(20), nil},
		{"origin keeps part, p != 0", keep, []int64{4}, []int64{1, 6}, nil, nil, certcheck.ErrHoldSlackness},
		// Origin ships all: h = 0 needs p >= 0. Destination 1 takes 4, node 2 keeps 1 of 5.
		{"origin keeps nothing, p < 0", net([]int64{4, -4, 5, -4}, [][5]int64{{0, 1, 0, inf, 1}, {2, 3, 0, inf, 1}}), []int64{4, 4}, []int64{-1, 0, 0, 1}, nil, nil, certcheck.ErrHoldSlackness},
		{"origin keeps all, p > 0", net([]int64{4, 5, -4}, [][5]int64{{0, 2, 0, inf, 1}, {1, 2, 0, inf, 1}}), []int64{4, 0}, []int64{0, 2, 1}, nil, nil, certcheck.ErrHoldSlackness},
		// Origin 1 keeps all 5 with p = -1; its lane at 0 has r = 3 - 1 - 1 = 1.
		// D = -(4·0 + 5·(-1) - 4·1) + min(-1, 0)·5 = 9 - 5 = 4 = cost 4·1.
		{"origin keeps all, p < 0", net([]int64{4, 5, -4}, [][5]int64{{0, 2, 0, inf, 1}, {1, 2, 0, inf, 3}}), []int64{4, 0}, []int64{0, -1, 1}, big1(4), big1(4), nil},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			err := certcheck.Optimal(tc.n, tc.x, tc.p, tc.cost, tc.dual)
			if tc.want == nil && err != nil || tc.want != nil && !errors.Is(err, tc.want) {
				t.Fatalf("got %v, want %v", err, tc.want)
			}
		})
	}
}

func TestCycle(t *testing.T) {
	// Worked by hand: supply 5 at 0, demand 5 at 2. Plan sends 5 on the
	// expensive direct lane 0->2 (rate 10, cap 8); the route 0->1->2
	// (rates 2 + 3, caps 3 and NoLimit) saves 5 per unit for 3 units.
	n := net([]int64{5, 0, -5}, [][5]int64{{0, 2, 0, 8, 10}, {0, 1, 0, 3, 2}, {1, 2, 0, inf, 3}})
	x := []int64{5, 0, 0}
	good := []certcheck.Step{{Lane: 1, Forward: true}, {Lane: 2, Forward: true}, {Lane: 0, Forward: false}}
	tests := []struct {
		name    string
		x       []int64
		steps   []certcheck.Step
		theta   int64
		perUnit int64
		total   *big.Int
		want    error
	}{
		{"improving cycle", x, good, 3, 5, big1(15), nil},
		{"rotated, no total", x, []certcheck.Step{{Lane: 2, Forward: true}, {Lane: 0, Forward: false}, {Lane: 1, Forward: true}}, 3, 5, nil, nil},
		{"plan infeasible", []int64{4, 0, 0}, good, 3, 5, nil, certcheck.ErrBalance},
		{"empty", x, nil, 3, 5, nil, certcheck.ErrWalk},
		{"lane out of range", x, []certcheck.Step{{Lane: 1, Forward: true}, {Lane: 7, Forward: true}, {Lane: 0, Forward: false}}, 3, 5, nil, certcheck.ErrWalk},
		{"broken walk", x, []certcheck.Step{{Lane: 1, Forward: true}, {Lane: 0, Forward: false}, {Lane: 2, Forward: true}}, 3, 5, nil, certcheck.ErrWalk},
		{"wrong direction", x, []certcheck.Step{{Lane: 1, Forward: true}, {Lane: 2, Forward: true}, {Lane: 0, Forward: true}}, 3, 5, nil, certcheck.ErrWalk},
		{"not closed", x, []certcheck.Step{{Lane: 1, Forward: true}, {Lane: 2, Forward: true}}, 3, 5, nil, certcheck.ErrWalk},
		{"theta zero", x, good, 0, 5, nil, certcheck.ErrThetaNotPositive},
		{"theta too big", x, good, 4, 5, nil, certcheck.ErrThetaTooBig},
		{"theta too small", x, good, 2, 5, nil, certcheck.ErrThetaNotMax},
		{"wrong saving", x, good, 3, 4, nil, certcheck.ErrSaving},
		{"wrong total", x, good, 3, 5, big1(16), certcheck.ErrSaving},
		// The reverse cycle on the plan without flow on 0->1->2: lane 1->2
		// is at its minimum, so any theta breaks it.
		{"reverse cycle, no room", x, []certcheck.Step{{Lane: 0, Forward: true}, {Lane: 2, Forward: false}, {Lane: 1, Forward: false}}, 3, -5, nil, certcheck.ErrThetaTooBig},
		// The reverse cycle on the plan using 0->1->2 fully: it has room
		// (theta 3) but costs 5 more per unit.
		{"cycle costs more", []int64{2, 3, 3}, []certcheck.Step{{Lane: 0, Forward: true}, {Lane: 2, Forward: false}, {Lane: 1, Forward: false}}, 3, -5, nil, certcheck.ErrSaving},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			err := certcheck.Cycle(n, tc.x, tc.steps, tc.theta, tc.perUnit, tc.total)
			if tc.want == nil && err != nil || tc.want != nil && !errors.Is(err, tc.want) {
				t.Fatalf("got %v, want %v", err, tc.want)
			}
		})
	}

	// A cycle that saves nothing, on a plan with room to move: 0->1 at
	// rate 1 against a parallel lane at rate 1 (worked by hand).
	tie := net([]int64{4, -4}, [][5]int64{{0, 1, 0, 4, 1}, {0, 1, 0, 4, 1}})
	err := certcheck.Cycle(tie, []int64{2, 2}, []certcheck.Step{{Lane: 0, Forward: true}, {Lane: 1, Forward: false}}, 2, 0, nil)
	if !errors.Is(err, certcheck.ErrSaving) {
		t.Errorf("zero-saving cycle: got %v, want ErrSaving", err)
	}
	// Self-loop with negative rate and spare capacity: a one-step cycle.
	loop := net([]int64{0}, [][5]int64{{0, 0, 0, 6, -2}})
	if err := certcheck.Cycle(loop, []int64{1}, []certcheck.Step{{Lane: 0, Forward: true}}, 5, 2, big1(10)); err != nil {
		t.Errorf("self-loop cycle: %v", err)
	}
	// A cycle through lanes without capacity only: no theta is maximal.
	free := net([]int64{0, 0}, [][5]int64{{0, 1, 0, inf, -3}, {1, 0, 0, inf, 1}})
	err = certcheck.Cycle(free, []int64{0, 0}, []certcheck.Step{{Lane: 0, Forward: true}, {Lane: 1, Forward: true}}, 9, 2, nil)
	if !errors.Is(err, certcheck.ErrThetaNotMax) {
		t.Errorf("uncapacitated cycle: got %v, want ErrThetaNotMax", err)
	}
}
