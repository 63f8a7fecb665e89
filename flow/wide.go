package flow

import (
	"math"
	"math/big"
	"math/bits"
)

// Wide is an exact signed 128-bit integer used for totals over many lanes
// (costs, dual objectives). The zero value is 0. Add and AddProduct report
// ErrOverflow instead of wrapping.
type Wide struct {
	hi int64
	lo uint64
}

// WideFrom returns v as a Wide.
func WideFrom(v int64) Wide {
	if v < 0 {
		return Wide{hi: -1, lo: uint64(v)}
	}
	return Wide{lo: uint64(v)}
}

// Add returns w+x, or ErrOverflow.
func (w Wide) Add(x Wide) (Wide, error) {
	lo, c := bits.Add64(w.lo, x.lo, 0)
	hi := w.hi + x.hi + int64(c)
	// Signed overflow of the high word.
	if (w.hi >= 0) == (x.hi >= 0) && (hi >= 0) != (w.hi >= 0) {
		return Wide{}, ErrOverflow
	}
	return Wide{hi: hi, lo: lo}, nil
}

// Neg returns -w.
func (w Wide) Neg() Wide {
	lo, b := bits.Sub64(0, w.lo, 0)
	return Wide{hi: -w.hi - int64(b), lo: lo}
}

// Sub returns w-x, or ErrOverflow.
func (w Wide) Sub(x Wide) (Wide, error) {
	if x.hi == math.MinInt64 && x.lo == 0 {
		// -x = 2^127 does not fit: w - x = (w + 2^127 - 1) + 1 fits only when w < 0.
		if w.hi >= 0 {
			return Wide{}, ErrOverflow
		}
		s, _ := w.Add(Wide{hi: math.MaxInt64, lo: math.MaxUint64}) // w < 0: cannot overflow
		return s.Add(Wide{lo: 1})
	}
	return w.Add(x.Neg())
}

// MulWide returns a×b exactly (it always fits 128 bits).
func MulWide(a, b int64) Wide {
	neg := (a < 0) != (b < 0)
	ua, ub := uint64(a), uint64(b)
	if a < 0 {
		ua = -ua
	}
	if b < 0 {
		ub = -ub
	}
	hi, lo := bits.Mul64(ua, ub)
	w := Wide{hi: int64(hi), lo: lo}
	if neg {
		w = w.Neg()
	}
	return w
}

// AddProduct returns w + a×b, or ErrOverflow.
func (w Wide) AddProduct(a, b int64) (Wide, error) { return w.Add(MulWide(a, b)) }

// Sign returns -1, 0 or +1.
func (w Wide) Sign() int {
	switch {
	case w.hi < 0:
		return -1
	case w.hi == 0 && w.lo == 0:
		return 0
	}
	return 1
}

// Cmp compares w and x and returns -1, 0 or +1.
func (w Wide) Cmp(x Wide) int {
	switch {
	case w.hi < x.hi:
		return -1
	case w.hi > x.hi:
		return 1
	case w.lo < x.lo:
		return -1
	case w.lo > x.lo:
		return 1
	}
	return 0
}

// Int64 returns w and whether it fits an int64.
func (w Wide) Int64() (int64, bool) {
	v := int64(w.lo)
	if (w.hi == 0 && v >= 0) || (w.hi == -1 && v < 0) {
		return v, true
	}
	return 0, false
}

// Big returns w as a big.Int.
func (w Wide) Big() *big.Int {
	neg := w.hi < 0
	if neg {
		w = w.Neg()
	}
	b := new(big.Int).SetUint64(uint64(w.hi))
	b.Lsh(b, 64)
	b.Or(b, new(big.Int).SetUint64(w.lo))
	if neg {
		b.Neg(b)
	}
	return b
}

// Format formats w / 10^places exactly with places digits after the point
// (see FormatScaled).
func (w Wide) Format(places int) string {
	if v, ok := w.Int64(); ok {
		return FormatScaled(v, places)
	}
	s := w.Big().String()
	neg := s[0] == '-'
	if neg {
		s = s[1:]
	}
	if places == 0 {
		if neg {
			return "-" + s
		}
		return s
	}
	return fixedPoint(s, places, neg)
}
