package flow

import (
	"cmp"
	"slices"
)

// crash makes the first pivots of a cold solve without pricing, from the
// artificial tree (coldStart) with its potentials set. Each destination
// (a node of negative supply net of lane minimums, hung from R by an
// artificial arc from R) is given its cheapest entering lane: the lane at
// its minimum with room and the least rate (ties: the lowest index). Those
// lanes enter the tree in order of rate, cheapest first (ties: the lower
// destination), each only if the pivots before it left it eligible.
//
// In the artificial tree every lane into a destination is eligible, and
// block search would bring the cheapest ones in one block at a time; here
// they come in after one pass over the lanes. Measured on the instances
// of BENCHMARKS.md (thirteenth session): on the general network
// netgen_a1e5 the cold solve makes 9 % fewer pivots and 11 % fewer
// instructions, on netgen_s2006 1 % and 3 %; on sparse transportation,
// where these pivots are a greedy assignment of each destination to its
// cheapest origin, up to 5 % more pivots (at 10^6 lanes).
//
// It returns true when a pivot finds a cycle without limit (s.cycle is
// then set, as by run). Time O(|V| log |V| + |E|) plus the pivots; memory
// 8 bytes per node.
func (s *simplex) crash() (bool, error) {
	m := s.m
	in := make([]int32, s.nNodes) // each destination's cheapest lane, or -1
	for v := range in {
		in[v] = -1
	}
	head, rate, state := s.head[:m], s.rate[:m], s.state[:m]
	for a, st := range state {
		if st != stateLower {
			continue
		}
		h := head[a]
		if s.up[h] {
			continue // not a destination
		}
		if b := in[h]; b < 0 || rate[a] < rate[b] {
			in[h] = int32(a)
		}
	}
	dest := make([]int32, 0, s.nNodes)
	for v, a := range in {
		if a >= 0 {
			dest = append(dest, int32(v))
		}
	}
	slices.SortStableFunc(dest, func(v, w int32) int { return cmp.Compare(rate[in[v]], rate[in[w]]) })

	s.beginCopies()
	defer s.flushCopies()
	for _, v := range dest {
		a := in[v]
		r, ok, err := s.eligible(a)
		if err != nil {
			return false, err
		}
		if !ok {
			continue
		}
		if unb, err := s.pivot(a, s.state[a], r); err != nil || unb {
			return unb, err
		}
	}
	return false, nil
}
