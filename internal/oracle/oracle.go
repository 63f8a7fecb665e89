// Package oracle solves minimum-cost flow problems as general linear
// programs with gonum's simplex method (gonum.org/v1/gonum/optimize/convex/lp).
// It shares no code with lanecert's network solvers or with package dual,
// so tests can compare their optimal costs against it.
//
// The oracle works in float64 on the network's scaled integers. It is meant
// for the small networks of property tests (up to a few dozen nodes and
// lanes; the dense simplex costs O((|V|+|E|)^3) per pivot), and its answers
// are compared with exact values only through SameCost, with a named
// tolerance. Floats never decide a verdict elsewhere in lanecert. Where a
// test needs an exact verdict on one plan (is it optimal?), Improvable
// decides it in integers from the residual network (Residual,
// NegativeCycle), written here from the definition.
//
// The problem and its signs are those of package flow: minimise
// Σ Rate[a]·x[a] subject to Lower[a] <= x[a] <= Upper[a] and, for every
// node v, outflow minus inflow equal to Supply[v] (> 0 at an origin, < 0 at
// a destination). When total supply exceeds total demand each origin may
// keep part of its supply (outflow minus inflow in [0, Supply[v]]); when
// total demand exceeds total supply the problem is infeasible.
package oracle

import (
	"errors"
	"fmt"
	"math"
	"math/big"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/optimize/convex/lp"

	"lanecert/flow"
)

// Status is the outcome of MinCost.
type Status int

const (
	// Optimal: an optimal plan was found.
	Optimal Status = iota
	// Infeasible: no plan meets the bounds and balances.
	Infeasible
	// Unbounded: plans exist and their cost has no lower bound (a cycle of
	// negative total rate whose lanes have no capacity).
	Unbounded
)

// String returns "optimal", "infeasible" or "unbounded".
func (s Status) String() string {
	switch s {
	case Optimal:
		return "optimal"
	case Infeasible:
		return "infeasible"
	case Unbounded:
		return "unbounded"
	}
	return fmt.Sprintf("Status(%d)", int(s))
}

// Result is the answer of MinCost.
type Result struct {
	Status Status
	// Cost is the optimal cost in true units: CostScaled / 10^(QtyPlaces+RatePlaces).
	Cost float64
	// CostScaled is the optimal cost in the network's cost scale
	// (QtyPlaces+RatePlaces decimal places).
	CostScaled float64
	// Flow is an optimal plan in scaled quantities, one value per lane; nil
	// unless Status is Optimal. Values are floats near integers.
	Flow []float64
	// Exact reports that Flow, rounded to integers (Plan), is a feasible
	// plan that Improvable proves optimal, so that ExactCost, its cost in
	// integers, is the optimum itself: SameCost then compares exactly.
	// False when the rounded plan fails either test or its cost overflows
	// (SameCost then falls back to its tolerances).
	Exact     bool
	Plan      []int64
	ExactCost flow.Wide
}

const (
	// SimplexTol is the tolerance passed to lp.Simplex: the simplex stops
	// when no reduced cost is below -SimplexTol. The scaled integer data of
	// test networks keep reduced costs far from it.
	SimplexTol = 1e-9
	// PhaseOneTol is the relative tolerance on the optimum of the phase-one
	// problem (the total of the artificial variables, divided by
	// 1 + Σ|b|): above it the problem is infeasible.
	PhaseOneTol = 1e-9
	// SupportTol is the value above which a phase-one variable counts as
	// positive (in the support of the phase-one vertex).
	SupportTol = 1e-9
	// PivotTol is the smallest pivot accepted when testing columns for
	// linear independence; node-lane matrices have entries 0 and ±1.
	PivotTol = 1e-9
	// SameCostRelTol is the relative tolerance of SameCost.
	SameCostRelTol = 1e-9
	// SameCostAbsTol is the absolute tolerance of SameCost, in scaled cost
	// units; it matters only near a cost of 0.
	SameCostAbsTol = 1e-6
)

// ErrSolver reports that gonum's simplex failed for a numerical reason
// (singular basis, failed linear solve) or contradicted the oracle's own
// phase-one test. It is a failure of the oracle, not a property of the
// network.
var ErrSolver = errors.New("lp solver failed")

// MinCost solves the problem described in the package doc. Lower bounds are
// shifted out (x = Lower + y, y >= 0), every finite capacity and every hold
// lane (origin v -> virtual hold node H, bounds [0, Supply[v]], only under
// excess supply) gets a slack variable and an equality row, and the
// node-balance rows are made full rank by dropping one row per weakly
// connected component (after checking that the component's supplies,
// shifted by the lower bounds, sum to zero; H counts as a node). Self-loops
// do not enter the rows: each is fixed at its cheaper bound, or makes the
// problem unbounded (negative rate, no capacity) when it is feasible.
//
// Infeasibility is decided by the oracle's own phase one (minimise the sum
// of one artificial variable per row from the artificial basis), then the
// problem is solved by lp.Simplex. The returned error is non-nil only for
// an invalid network or a solver failure (wrapping ErrSolver).
// Time O(k·(|V|+|E|)^3) for k pivots; memory O((|V|+|E|)^2).
func MinCost(n *flow.Network) (Result, error) {
	if err := n.Validate(); err != nil {
		return Result{}, fmt.Errorf("oracle: %w", err)
	}
	supply, demand, err := n.Totals()
	if err != nil {
		return Result{}, fmt.Errorf("oracle: %w", err)
	}
	if demand > supply {
		return Result{Status: Infeasible}, nil
	}
	nn, m := len(n.Nodes), len(n.Tail)
	hold := supply > demand
	nodes := nn // rows 0..nn-1 are nodes, nn is H when hold
	if hold {
		nodes++
	}

	// Node right-hand sides: b(v) = Supply[v] - Σ_out Lower + Σ_in Lower.
	b := make([]*big.Int, nodes)
	for v := range nn {
		b[v] = big.NewInt(n.Supply[v])
	}
	if hold {
		b[nn] = big.NewInt(demand - supply)
	}
	fixed := make([]float64, m) // flow of lanes not in the LP (self-loops)
	unboundedLoop := false
	type entry struct {
		row int
		val float64
	}
	var colEntries [][]entry // node-row entries per column
	var colCost []float64
	var colUpper []float64 // capacity of the shifted variable, or +Inf
	parent := make([]int, nodes)
	for v := range parent {
		parent[v] = v
	}
	find := func(v int) int {
		for parent[v] != v {
			parent[v] = parent[parent[v]]
			v = parent[v]
		}
		return v
	}
	union := func(u, v int) {
		ru, rv := find(u), find(v)
		if ru < rv {
			parent[rv] = ru
		} else {
			parent[ru] = rv
		}
	}
	laneCol := make([]int, m)
	for a := range m {
		laneCol[a] = -1
		t, h := int(n.Tail[a]), int(n.Head[a])
		if t == h {
			switch {
			case n.Rate[a] >= 0:
				fixed[a] = float64(n.Lower[a])
			case n.Upper[a] == flow.NoLimit:
				unboundedLoop = true
				fixed[a] = float64(n.Lower[a])
			default:
				fixed[a] = float64(n.Upper[a])
			}
			continue
		}
		lo := big.NewInt(n.Lower[a])
		b[t].Sub(b[t], lo)
		b[h].Add(b[h], lo)
		union(t, h)
		laneCol[a] = len(colCost)
		colEntries = append(colEntries, []entry{{t, 1}, {h, -1}})
		colCost = append(colCost, float64(n.Rate[a]))
		up := math.Inf(1)
		if n.Upper[a] != flow.NoLimit {
			up = float64(n.Upper[a] - n.Lower[a])
		}
		colUpper = append(colUpper, up)
	}
	if hold {
		for v, s := range n.Supply {
			if s > 0 {
				union(v, nn)
				colEntries = append(colEntries, []entry{{v, 1}, {nn, -1}})
				colCost = append(colCost, 0)
				colUpper = append(colUpper, float64(s))
			}
		}
	}

	// One redundant row per component: check its balance, then drop the
	// row of its representative (the smallest index).
	sums := make([]*big.Int, nodes)
	for v := range nodes {
		r := find(v)
		if sums[r] == nil {
			sums[r] = new(big.Int)
		}
		sums[r].Add(sums[r], b[v])
	}
	for v := range nodes {
		if find(v) == v && sums[v].Sign() != 0 {
			return Result{Status: Infeasible}, nil
		}
	}
	rowOf := make([]int, nodes)
	rows := 0
	for v := range nodes {
		rowOf[v] = -1
		if find(v) != v {
			rowOf[v] = rows
			rows++
		}
	}
	nodeRows := rows
	nvars := len(colCost)
	for _, u := range colUpper {
		if !math.IsInf(u, 1) {
			rows++
		}
	}
	totalCols := nvars + (rows - nodeRows)

	res := Result{Status: Optimal}
	y := make([]float64, nvars)
	if rows > 0 {
		A := mat.NewDense(rows, totalCols, nil)
		rhs := make([]float64, rows)
		for v := range nodes {
			if rowOf[v] >= 0 {
				rhs[rowOf[v]], _ = new(big.Float).SetInt(b[v]).Float64()
			}
		}
		c := make([]float64, totalCols)
		copy(c, colCost)
		r, s := nodeRows, nvars
		for j, es := range colEntries {
			for _, e := range es {
				if rowOf[e.row] >= 0 {
					A.Set(rowOf[e.row], j, e.val)
				}
			}
			if !math.IsInf(colUpper[j], 1) {
				A.Set(r, j, 1)
				A.Set(r, s, 1)
				rhs[r] = colUpper[j]
				r++
				s++
			}
		}
		basis, feasible, err := phaseOne(A, rhs)
		if err != nil {
			return Result{}, err
		}
		if !feasible {
			return Result{Status: Infeasible}, nil
		}
		if unboundedLoop {
			return Result{Status: Unbounded}, nil
		}
		_, sol, err := simplex(c, A, rhs, basis)
		switch {
		case errors.Is(err, lp.ErrUnbounded):
			return Result{Status: Unbounded}, nil
		case err != nil:
			return Result{}, fmt.Errorf("oracle: %w: %w", ErrSolver, err)
		}
		copy(y, sol[:nvars])
	} else if unboundedLoop {
		// No rows: every node is isolated and balanced; a free negative
		// self-loop makes the cost unbounded.
		return Result{Status: Unbounded}, nil
	}

	res.Flow = make([]float64, m)
	for a := range m {
		if j := laneCol[a]; j >= 0 {
			res.Flow[a] = float64(n.Lower[a]) + y[j]
		} else {
			res.Flow[a] = fixed[a]
		}
		res.CostScaled += float64(n.Rate[a]) * res.Flow[a]
	}
	res.Cost = res.CostScaled / math.Pow(10, float64(n.QtyPlaces+n.RatePlaces))
	res.polish(n)
	return res, nil
}

// polish rounds the optimal plan to integers and, when the rounded plan
// is feasible and no cycle of its residual network has a negative cost,
// records it with its exact cost (Exact). Network-flow LPs have integral
// optimal vertices, so rounding fails only through float error.
func (r *Result) polish(n *flow.Network) {
	x := make([]int64, len(r.Flow))
	for a, f := range r.Flow {
		if math.IsNaN(f) || math.Abs(f) >= 1<<62 {
			return
		}
		x[a] = int64(math.Round(f))
	}
	if !feasible(n, x) {
		return
	}
	if _, cycle, ok := negativeCycle(Residual(n, x)); !ok || cycle != nil {
		return
	}
	var cost flow.Wide
	for a, xa := range x {
		var err error
		if cost, err = cost.Add(flow.MulWide(n.Rate[a], xa)); err != nil {
			return
		}
	}
	r.Exact, r.Plan, r.ExactCost = true, x, cost
}

// feasible reports whether integer plan x keeps every lane's bounds and
// every node's balance (under excess supply an origin may keep part of its
// supply: outflow minus inflow in [0, Supply]).
func feasible(n *flow.Network, x []int64) bool {
	supply, demand, err := n.Totals()
	if err != nil {
		return false
	}
	out := make([]*big.Int, len(n.Nodes))
	for v := range out {
		out[v] = new(big.Int)
	}
	for a, xa := range x {
		if xa < n.Lower[a] || (n.Upper[a] != flow.NoLimit && xa > n.Upper[a]) {
			return false
		}
		out[n.Tail[a]].Add(out[n.Tail[a]], big.NewInt(xa))
		out[n.Head[a]].Sub(out[n.Head[a]], big.NewInt(xa))
	}
	for v, b := range n.Supply {
		if supply > demand && b > 0 {
			if out[v].Sign() < 0 || out[v].Cmp(big.NewInt(b)) > 0 {
				return false
			}
		} else if out[v].Cmp(big.NewInt(b)) != 0 {
			return false
		}
	}
	return true
}

// phaseOne reports whether A·x = b, x >= 0 has a solution and if so
// returns a feasible basis of A (one column per row). It flips rows so that
// b >= 0, adds one artificial variable per row, and minimises their sum
// from the all-artificial basis with lp.Simplex. The support of the
// phase-one vertex is then extended to a basis by columns of A in index
// order. (lp.Simplex's own phase one can report a degenerate feasible
// problem as infeasible; this path avoids it.)
func phaseOne(A *mat.Dense, b []float64) (basis []int, feasible bool, err error) {
	rows, cols := A.Dims()
	P := mat.NewDense(rows, cols+rows, nil)
	pb := make([]float64, rows)
	c := make([]float64, cols+rows)
	start := make([]int, rows)
	scale := 1.0
	for i := range rows {
		sign := 1.0
		if b[i] < 0 {
			sign = -1
		}
		for j := range cols {
			if v := A.At(i, j); v != 0 {
				P.Set(i, j, sign*v)
			}
		}
		P.Set(i, cols+i, 1)
		pb[i] = sign * b[i]
		scale += pb[i]
		c[cols+i] = 1
		start[i] = cols + i
	}
	opt, x, err := simplex(c, P, pb, start)
	if err != nil {
		// The phase-one problem is feasible and bounded below by 0, so any
		// error is numerical.
		return nil, false, fmt.Errorf("oracle: phase one: %w: %w", ErrSolver, err)
	}
	if opt/scale > PhaseOneTol {
		return nil, false, nil
	}
	var ind independent
	for j := range cols {
		if x[j] > SupportTol {
			if !ind.add(A, j) {
				return nil, false, fmt.Errorf("oracle: %w: phase-one support is dependent", ErrSolver)
			}
		}
	}
	for j := 0; j < cols && len(ind.cols) < rows; j++ {
		if x[j] <= SupportTol {
			ind.add(A, j)
		}
	}
	if len(ind.cols) != rows {
		return nil, false, fmt.Errorf("oracle: %w: rows are not independent", ErrSolver)
	}
	return ind.cols, true, nil
}

// simplex calls lp.Simplex with a starting basis and turns its panics
// (raised when the basis is not feasible, e.g. by rounding) into errors.
// Unbounded problems give lp.ErrUnbounded.
func simplex(c []float64, A *mat.Dense, b []float64, basis []int) (opt float64, x []float64, err error) {
	defer func() {
		if p := recover(); p != nil {
			err = fmt.Errorf("lp.Simplex panicked: %v", p)
		}
	}()
	return lp.Simplex(c, A, b, SimplexTol, basis)
}

// independent collects linearly independent columns by Gaussian
// elimination with a pivot tolerance (PivotTol).
type independent struct {
	cols  []int
	vecs  [][]float64 // reduced columns
	pivot []int       // pivot row of each reduced column
}

// add adds column j of A if it is independent of those collected so far
// and reports whether it did.
func (ind *independent) add(A *mat.Dense, j int) bool {
	v := mat.Col(nil, j, A)
	for k, w := range ind.vecs {
		if f := v[ind.pivot[k]] / w[ind.pivot[k]]; f != 0 {
			for i := range v {
				v[i] -= f * w[i]
			}
		}
	}
	best, at := 0.0, -1
	for i, e := range v {
		if math.Abs(e) > best {
			best, at = math.Abs(e), i
		}
	}
	if best <= PivotTol {
		return false
	}
	ind.cols = append(ind.cols, j)
	ind.vecs = append(ind.vecs, v)
	ind.pivot = append(ind.pivot, at)
	return true
}

// SameCost reports whether the exact cost exact (scaled by 10^places)
// equals the oracle's optimal cost: exactly when the oracle proved its
// rounded plan optimal (r.Exact), otherwise within SameCostRelTol
// (relative) or SameCostAbsTol (absolute, scaled units). places must be
// the network's QtyPlaces+RatePlaces; r.Status must be Optimal, or the
// answer is false.
func SameCost(exact flow.Wide, places int, r Result) bool {
	if r.Status != Optimal {
		return false
	}
	if r.Exact {
		return exact.Cmp(r.ExactCost) == 0
	}
	e, _ := new(big.Float).SetInt(exact.Big()).Float64()
	got := r.Cost * math.Pow(10, float64(places))
	d := math.Abs(e - got)
	return d <= SameCostAbsTol || d <= SameCostRelTol*math.Max(math.Abs(e), math.Abs(got))
}
