package flow

import (
	"fmt"
	"math/big"
)

// Plan is a quantity on every lane of a network, on the network's quantity
// scale.
type Plan struct {
	Flow []int64
	// Rounded lists the lanes whose given quantity was rounded to the
	// network's places under a tolerance (see RawPlan.Bind), in lane order.
	Rounded []Rounding
}

// Rounding records one quantity that a tolerance rounded.
type Rounding struct {
	Lane  LaneID
	Given Decimal // as written in the plan
	Used  int64   // the scaled value used instead
}

// Bind puts p on n's quantity scale and returns the plan. When tol is not
// nil, a quantity with more decimal places than the network uses is rounded
// to the network's places if it lies within tol of the rounded value (a plan
// written by a floating-point solver: 99.9999999 for 100); every such
// rounding is recorded. Any other quantity with more places raises the
// network's QtyPlaces (n is rescaled in place). It is O(|E|).
func (p *RawPlan) Bind(n *Network, tol *Decimal) (*Plan, error) {
	if p.Len() != n.NumLanes() {
		return nil, fmt.Errorf("flow: plan %s has %d quantities for %d lanes", p.File, p.Len(), n.NumLanes())
	}
	target := n.QtyPlaces
	var rounded []Rounding
	need := target
	for a, places := range p.q.places {
		if int(places) <= target {
			continue
		}
		d := Decimal{Mant: p.q.mant[a], Places: places}
		if tol != nil {
			if v, ok := roundWithin(d, target, *tol); ok {
				rounded = append(rounded, Rounding{Lane: LaneID(a), Given: d, Used: v})
				continue
			}
		}
		need = max(need, int(places))
	}
	if need > MaxPlaces {
		return nil, fmt.Errorf("flow: plan %s: quantities need %d decimal places, at most %d are supported (a tolerance rounds a floating-point solver's output): %w", p.File, need, MaxPlaces, ErrOverflow)
	}
	if need > target {
		if err := n.RescaleQty(need - target); err != nil {
			return nil, fmt.Errorf("flow: plan %s needs %d decimal places: %w", p.File, need, err)
		}
		for i := range rounded {
			v, err := ScaleUp(rounded[i].Used, need-target)
			if err != nil {
				return nil, err
			}
			rounded[i].Used = v
		}
	}
	flow := make([]int64, p.Len())
	ri := 0
	for a := range flow {
		if ri < len(rounded) && rounded[ri].Lane == LaneID(a) {
			flow[a] = rounded[ri].Used
			ri++
			continue
		}
		v, err := ScaleUp(p.q.mant[a], need-int(p.q.places[a]))
		if err != nil {
			return nil, fmt.Errorf("flow: plan %s: quantity of lane %s: %w", p.File, n.LaneName(LaneID(a)), err)
		}
		flow[a] = v
	}
	return &Plan{Flow: flow, Rounded: rounded}, nil
}

// roundWithin rounds d to places (half away from zero) and reports whether
// the rounding changed it by at most tol.
func roundWithin(d Decimal, places int, tol Decimal) (int64, bool) {
	k := int(d.Places) - places
	div := pow10[k]
	q, rem := d.Mant/div, d.Mant%div
	if 2*abs64(rem) >= div {
		if d.Mant < 0 {
			q--
		} else {
			q++
		}
	}
	// |d - q| = |d.Mant - q*div| / 10^d.Places <= tol.Mant / 10^tol.Places
	diff := new(big.Int).Sub(big.NewInt(d.Mant), new(big.Int).Mul(big.NewInt(q), big.NewInt(div)))
	diff.Abs(diff)
	lhs := diff.Mul(diff, new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(tol.Places)), nil))
	rhs := new(big.Int).Mul(big.NewInt(abs64(tol.Mant)), new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(d.Places)), nil))
	return q, lhs.Cmp(rhs) <= 0
}

// PlanFromFlows wraps scaled flows as a Plan.
func PlanFromFlows(flow []int64) *Plan { return &Plan{Flow: flow} }
