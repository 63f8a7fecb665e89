// Package randnet generates small seeded random minimum-cost flow networks
// and plans for property tests of lanecert's solvers and checkers.
//
// A network is built around a hidden plan: lanes and bounds are drawn first,
// flow is pushed along random paths within the bounds, and every node's
// supply is set to that plan's outflow minus inflow. The network is
// therefore feasible by construction unless Options.Infeasible asks for a
// change that may break it. Networks have 2 to a few dozen nodes and use
// the sign convention of package flow: Supply > 0 at an origin, < 0 at a
// destination.
//
// The package depends on package flow and the standard library only, so
// that it stays independent of the code it is used to test. All randomness
// comes from the *rand.Rand passed in: the same seed gives the same network.
package randnet

import (
	"fmt"
	"math/rand/v2"

	"lanecert/flow"
)

// Kind selects the shape of a generated network.
type Kind int

const (
	// Transport networks have origins and destinations only; every lane
	// runs from an origin to a destination.
	Transport Kind = iota
	// Transship networks have origins, transshipment nodes and
	// destinations; lanes run forward through the layers (no cycles).
	Transship
	// General networks have lanes between any two nodes, including
	// cycles and the odd self-loop.
	General
)

// String returns the kind's name.
func (k Kind) String() string {
	switch k {
	case Transport:
		return "transport"
	case Transship:
		return "transship"
	case General:
		return "general"
	}
	return fmt.Sprintf("Kind(%d)", int(k))
}

// unitQty is the largest amount, in whole units, drawn for one bound or
// one push of flow. Small values keep totals far from int64 limits and
// make equal amounts (ties) frequent.
const unitQty = 10

// Options controls Network. The zero value is usable: it gives a 2-node
// transport network with one lane.
type Options struct {
	// Nodes is the number of nodes (at least 2; Transship needs 3 for a
	// middle layer and falls back to Transport below that).
	Nodes int
	// Lanes is the number of lanes (at least 1).
	Lanes int
	// Kind is the shape of the network.
	Kind Kind
	// MaxRate bounds the whole-unit part of a rate: |rate| <= MaxRate
	// plus a fraction below one unit. A small MaxRate gives many ties.
	MaxRate int64
	// ZeroRateFrac is the fraction of lanes with rate 0.
	ZeroRateFrac float64
	// ParallelFrac is the fraction of lanes that repeat the tail and head
	// of an earlier lane.
	ParallelFrac float64
	// LowerFrac is the fraction of lanes with a positive minimum.
	LowerFrac float64
	// CapFrac is the fraction of lanes with a finite capacity; the others
	// have Upper == flow.NoLimit.
	CapFrac float64
	// QtyPlaces and RatePlaces are the decimal places of the network
	// (0 to 4 keeps values small).
	QtyPlaces, RatePlaces int
	// ExcessSupply adds supply at one or two origins beyond total demand,
	// so origins may keep part of their supply.
	ExcessSupply bool
	// Infeasible allows a final change that may make the network
	// infeasible: demand above supply, a capacity below the hidden plan,
	// or supply moved between two nodes.
	Infeasible bool
	// NegativeRates allows negative rates. In General networks this can
	// give negative cycles of lanes without capacity (unbounded problems).
	NegativeRates bool
}

// RandomOptions draws Options for a network of 2 to 12 nodes, mixing all
// kinds, decimal places 0 to 3, and each flag with a fixed probability.
func RandomOptions(rng *rand.Rand) Options {
	nodes := 2 + rng.IntN(11)
	o := Options{
		Nodes:         nodes,
		Lanes:         1 + rng.IntN(3*nodes),
		Kind:          Kind(rng.IntN(3)),
		MaxRate:       []int64{1, 3, 10, 100}[rng.IntN(4)],
		ZeroRateFrac:  []float64{0, 0.1, 0.5}[rng.IntN(3)],
		ParallelFrac:  []float64{0, 0.1, 0.3}[rng.IntN(3)],
		LowerFrac:     []float64{0, 0.2, 0.5}[rng.IntN(3)],
		CapFrac:       []float64{0, 0.5, 0.9, 1}[rng.IntN(4)],
		QtyPlaces:     rng.IntN(4),
		RatePlaces:    rng.IntN(4),
		ExcessSupply:  rng.IntN(3) == 0,
		Infeasible:    rng.IntN(5) == 0,
		NegativeRates: rng.IntN(5) == 0,
	}
	return o
}

// Random returns Network(rng, RandomOptions(rng)).
func Random(rng *rand.Rand) *flow.Network {
	return Network(rng, RandomOptions(rng))
}

// Network draws a network. It always satisfies n.Validate(). Unless
// o.Infeasible is set it is feasible; with o.NegativeRates and Kind
// General it may be unbounded. Time O(|V|·(|V|+|E|)) for the hidden plan.
func Network(rng *rand.Rand, o Options) *flow.Network {
	nn := max(o.Nodes, 2)
	m := max(o.Lanes, 1)
	kind := o.Kind
	if kind == Transship && nn < 3 {
		kind = Transport
	}
	qs := flow.Pow10(o.QtyPlaces)
	rs := flow.Pow10(o.RatePlaces)
	n := &flow.Network{
		Nodes:      make([]string, nn),
		Supply:     make([]int64, nn),
		Tail:       make([]flow.NodeID, m),
		Head:       make([]flow.NodeID, m),
		Lower:      make([]int64, m),
		Upper:      make([]int64, m),
		Rate:       make([]int64, m),
		QtyPlaces:  o.QtyPlaces,
		RatePlaces: o.RatePlaces,
	}
	for v := range n.Nodes {
		n.Nodes[v] = fmt.Sprintf("n%d", v+1)
	}

	// Roles: origins [0, no), middles [no, nd), destinations [nd, nn).
	no, nd := 0, 0
	switch kind {
	case Transport:
		no = 1 + rng.IntN(nn-1)
		nd = no
	case Transship:
		no = 1 + rng.IntN(nn-2)
		nd = no + 1 + rng.IntN(nn-no-1)
	}
	pick := func(lo, hi int) flow.NodeID { return flow.NodeID(lo + rng.IntN(hi-lo)) }

	qty := func(maxUnits int64) int64 {
		v := rng.Int64N(maxUnits+1) * qs
		if qs > 1 && rng.IntN(2) == 0 {
			v += rng.Int64N(qs)
		}
		return v
	}
	for a := 0; a < m; a++ {
		if a > 0 && rng.Float64() < o.ParallelFrac {
			b := rng.IntN(a)
			n.Tail[a], n.Head[a] = n.Tail[b], n.Head[b]
		} else {
			switch kind {
			case Transport:
				n.Tail[a], n.Head[a] = pick(0, no), pick(no, nn)
			case Transship:
				switch rng.IntN(4) {
				case 0: // origin to middle
					n.Tail[a], n.Head[a] = pick(0, no), pick(no, nd)
				case 1: // middle to destination
					n.Tail[a], n.Head[a] = pick(no, nd), pick(nd, nn)
				case 2: // middle to a later middle, or origin to destination
					t, h := pick(no, nd), pick(no, nd)
					if t < h {
						n.Tail[a], n.Head[a] = t, h
					} else {
						n.Tail[a], n.Head[a] = pick(0, no), pick(nd, nn)
					}
				default: // origin to destination
					n.Tail[a], n.Head[a] = pick(0, no), pick(nd, nn)
				}
			default:
				t, h := pick(0, nn), pick(0, nn)
				if t == h && rng.IntN(10) != 0 {
					h = (t + 1 + flow.NodeID(rng.IntN(nn-1))) % flow.NodeID(nn)
				}
				n.Tail[a], n.Head[a] = t, h
			}
		}
		if rng.Float64() < o.LowerFrac {
			n.Lower[a] = max(qty(3), 1)
		}
		n.Upper[a] = flow.NoLimit
		if rng.Float64() < o.CapFrac {
			n.Upper[a] = n.Lower[a] + qty(unitQty)
		}
		if rng.Float64() >= o.ZeroRateFrac {
			r := rng.Int64N(max(o.MaxRate, 0)+1) * rs
			if rs > 1 && rng.IntN(2) == 0 {
				r += rng.Int64N(rs)
			}
			if o.NegativeRates && rng.IntN(3) == 0 {
				r = -r
			}
			n.Rate[a] = r
		}
	}

	// Hidden plan: minimums plus flow pushed along random forward paths.
	x := append([]int64(nil), n.Lower...)
	adj := flow.BuildAdjacency(n)
	pushes := 1 + rng.IntN(2*nn)
	for range pushes {
		var start flow.NodeID
		switch kind {
		case General:
			start = pick(0, nn)
		default:
			start = pick(0, no)
		}
		pushPath(rng, n, adj, x, start, kind == General, qty(unitQty))
	}
	for a := 0; a < m; a++ {
		n.Supply[n.Tail[a]] += x[a]
		n.Supply[n.Head[a]] -= x[a]
	}

	if o.ExcessSupply {
		for range 1 + rng.IntN(2) {
			// Some node has Supply >= 0 because the supplies sum to 0; it
			// becomes (or stays) an origin that may keep its extra.
			v := rng.IntN(nn)
			for n.Supply[v] < 0 {
				v = (v + 1) % nn
			}
			n.Supply[v] += max(qty(unitQty), 1)
		}
	}
	if o.Infeasible {
		switch rng.IntN(3) {
		case 0: // more demand somewhere
			n.Supply[rng.IntN(nn)] -= max(qty(unitQty), 1)
		case 1: // a capacity below the hidden plan's flow
			for range m {
				a := rng.IntN(m)
				if x[a] > n.Lower[a] {
					n.Upper[a] = n.Lower[a] + rng.Int64N(x[a]-n.Lower[a])
					break
				}
			}
		default: // supply moved from one node to another
			d := max(qty(unitQty), 1)
			n.Supply[rng.IntN(nn)] += d
			n.Supply[rng.IntN(nn)] -= d
		}
	}
	return n
}

// pushPath pushes up to amount along a random walk over lanes with spare
// capacity, starting at v. The walk stops at a node without such lanes
// (a destination in transport and transshipment networks) or, in general
// networks, after a random number of steps; it uses each lane at most
// once. The amount is cut to the smallest spare capacity on the walk.
func pushPath(rng *rand.Rand, n *flow.Network, adj *flow.Adjacency, x []int64, v flow.NodeID, general bool, amount int64) {
	steps := len(n.Nodes)
	if general {
		steps = 1 + rng.IntN(len(n.Nodes))
	}
	var path []flow.LaneID
	used := make(map[flow.LaneID]bool) // no lane twice: the cut amount must fit every use
	for range steps {
		out := adj.OutLanes[adj.OutStart[v]:adj.OutStart[v+1]]
		var cand []flow.LaneID
		for _, a := range out {
			if x[a] < n.Upper[a] && !used[a] {
				cand = append(cand, a)
			}
		}
		if len(cand) == 0 {
			break
		}
		a := cand[rng.IntN(len(cand))]
		used[a] = true
		path = append(path, a)
		if n.Upper[a]-x[a] < amount {
			amount = n.Upper[a] - x[a]
		}
		v = n.Head[a]
	}
	for _, a := range path {
		x[a] += amount
	}
}

// Squeeze cuts the capacity of about half of n's lanes (chosen by rng) to a
// quarter (a lane without capacity gets 10), never below its minimum, so
// that demand often cannot be met while new lanes could restore it. n is
// changed in place.
func Squeeze(rng *rand.Rand, n *flow.Network) {
	for e := range n.Upper {
		if rng.IntN(2) == 0 {
			u := n.Upper[e]
			if u == flow.NoLimit {
				u = 40
			}
			n.Upper[e] = max(n.Lower[e], u/4)
		}
	}
}
