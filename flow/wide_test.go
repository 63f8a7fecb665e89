package flow

import (
	"errors"
	"math"
	"math/big"
	"math/rand/v2"
	"testing"

	"lanecert/internal/longrun"
)

// The oracle for Wide is math/big: wideBig converts from the two words
// independently of Wide.Big, and the 128-bit range is [-2^127, 2^127-1].

var (
	two64     = new(big.Int).Lsh(big.NewInt(1), 64)
	maxWide   = Wide{hi: math.MaxInt64, lo: math.MaxUint64} // 2^127 - 1
	minWide   = Wide{hi: math.MinInt64, lo: 0}              // -2^127
	maxWideBI = new(big.Int).Sub(new(big.Int).Lsh(big.NewInt(1), 127), big.NewInt(1))
	minWideBI = new(big.Int).Neg(new(big.Int).Lsh(big.NewInt(1), 127))
)

// wideBig returns hi × 2^64 + lo.
func wideBig(w Wide) *big.Int {
	b := new(big.Int).Mul(big.NewInt(w.hi), two64)
	return b.Add(b, new(big.Int).SetUint64(w.lo))
}

func fitsWide(b *big.Int) bool { return b.Cmp(minWideBI) >= 0 && b.Cmp(maxWideBI) <= 0 }

// randWide draws 128-bit values: edges, products of int64s, and raw words.
func randWide(r *rand.Rand) Wide {
	switch r.IntN(4) {
	case 0:
		edges := []Wide{{}, maxWide, minWide, {hi: 0, lo: 1}, {hi: -1, lo: math.MaxUint64},
			{hi: 0, lo: math.MaxUint64}, {hi: -1, lo: 0}, {hi: 1, lo: 0},
			{hi: math.MaxInt64, lo: math.MaxUint64 - 1}, {hi: math.MinInt64, lo: 1}}
		return edges[r.IntN(len(edges))]
	case 1:
		return WideFrom(randInt64(r))
	case 2:
		return MulWide(randInt64(r), randInt64(r))
	}
	return Wide{hi: int64(r.Uint64() >> r.UintN(64)), lo: r.Uint64()}
}

func TestWideAgainstBig(t *testing.T) {
	r := rand.New(rand.NewPCG(longrun.Seed(t, 3), 1))
	for range longrun.Cases(t, 50000) {
		a, b := randInt64(r), randInt64(r)
		if got, want := wideBig(MulWide(a, b)), new(big.Int).Mul(big.NewInt(a), big.NewInt(b)); got.Cmp(want) != 0 {
			t.Fatalf("MulWide(%d, %d) = %s; want %s", a, b, got, want)
		}
		if got := wideBig(WideFrom(a)); got.Cmp(big.NewInt(a)) != 0 {
			t.Fatalf("WideFrom(%d) = %s", a, got)
		}
		w, x := randWide(r), randWide(r)
		bw, bx := wideBig(w), wideBig(x)
		if got := w.Big(); got.Cmp(bw) != 0 {
			t.Fatalf("%+v.Big() = %s; want %s", w, got, bw)
		}
		if got, want := w.Cmp(x), bw.Cmp(bx); got != want {
			t.Fatalf("%s.Cmp(%s) = %d; want %d", bw, bx, got, want)
		}
		if got, want := w.Sign(), bw.Sign(); got != want {
			t.Fatalf("%s.Sign() = %d; want %d", bw, got, want)
		}
		if v, ok := w.Int64(); ok != bw.IsInt64() || (ok && v != bw.Int64()) {
			t.Fatalf("%s.Int64() = %d, %v", bw, v, ok)
		}
		checkOp := func(name string, got Wide, err error, exact *big.Int) {
			t.Helper()
			if fitsWide(exact) {
				if err != nil || wideBig(got).Cmp(exact) != 0 {
					t.Fatalf("%s(%s, %s) = %s, %v; want %s", name, bw, bx, wideBig(got), err, exact)
				}
			} else if !errors.Is(err, ErrOverflow) {
				t.Fatalf("%s(%s, %s) = %s, %v; want ErrOverflow (exact %s)", name, bw, bx, wideBig(got), err, exact)
			}
		}
		s, err := w.Add(x)
		checkOp("Add", s, err, new(big.Int).Add(bw, bx))
		d, err := w.Sub(x)
		checkOp("Sub", d, err, new(big.Int).Sub(bw, bx))
		c, e := randInt64(r), randInt64(r)
		p, err := w.AddProduct(c, e)
		checkOp("AddProduct", p, err, new(big.Int).Add(bw, new(big.Int).Mul(big.NewInt(c), big.NewInt(e))))
		if w != minWide { // -(-2^127) does not fit; Neg is documented for the rest
			if got, want := wideBig(w.Neg()), new(big.Int).Neg(bw); got.Cmp(want) != 0 {
				t.Fatalf("%s.Neg() = %s", bw, got)
			}
		}
		places := r.IntN(25)
		// big.Rat prints the exact quotient with the given digits after the point.
		want := new(big.Rat).SetFrac(bw, new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(places)), nil)).FloatString(places)
		if got := w.Format(places); got != want {
			t.Fatalf("%s.Format(%d) = %q; want %q", bw, places, got, want)
		}
	}
}

func TestWideAddOverflowAt2to127(t *testing.T) {
	one := WideFrom(1)
	p126 := MulWide(math.MinInt64, math.MinInt64) // (-2^63)^2 = 2^126
	tests := []struct {
		name string
		w, x Wide
		sub  bool
		want Wide
		err  error
	}{
		{"max+0", maxWide, Wide{}, false, maxWide, nil},
		{"max+1", maxWide, one, false, Wide{}, ErrOverflow},
		{"max+max", maxWide, maxWide, false, Wide{}, ErrOverflow},
		{"min+(-1)", minWide, WideFrom(-1), false, Wide{}, ErrOverflow},
		{"min+min", minWide, minWide, false, Wide{}, ErrOverflow},
		{"min+max", minWide, maxWide, false, WideFrom(-1), nil},
		{"2^126+2^126", p126, p126, false, Wide{}, ErrOverflow}, // 2^127
		{"2^126+(2^126-1)", p126, Wide{hi: 1<<62 - 1, lo: math.MaxUint64}, false, maxWide, nil},
		{"carry into hi", Wide{lo: math.MaxUint64}, one, false, Wide{hi: 1}, nil},
		{"borrow from hi", Wide{hi: 1}, WideFrom(-1), false, Wide{lo: math.MaxUint64}, nil},
		{"max-(-1)", maxWide, WideFrom(-1), true, Wide{}, ErrOverflow},
		{"min-1", minWide, one, true, Wide{}, ErrOverflow},
		{"min-min", minWide, minWide, true, Wide{}, nil},
		{"0-min", Wide{}, minWide, true, Wide{}, ErrOverflow}, // 2^127
		{"-1-min", WideFrom(-1), minWide, true, maxWide, nil}, // 2^127 - 1
	}
	for _, tc := range tests {
		var got Wide
		var err error
		if tc.sub {
			got, err = tc.w.Sub(tc.x)
		} else {
			got, err = tc.w.Add(tc.x)
		}
		if !errors.Is(err, tc.err) || (err == nil && got != tc.want) {
			t.Errorf("%s: got %s, %v; want %s, %v", tc.name, wideBig(got), err, wideBig(tc.want), tc.err)
		}
	}
}

func TestWideFormat(t *testing.T) {
	tests := []struct {
		w      Wide
		places int
		want   string
	}{
		{WideFrom(12500), 3, "12.500"},
		{WideFrom(-5), 2, "-0.05"},
		{Wide{}, 0, "0"},
		{Wide{hi: 1}, 0, "18446744073709551616"},                 // 2^64
		{Wide{hi: -1}, 2, "-184467440737095516.16"},              // -2^64 / 100
		{Wide{hi: 1}, 25, "0.0000018446744073709551616"},         // 2^64 / 10^25
		{minWide, 0, "-170141183460469231731687303715884105728"}, // -2^127
		{maxWide, 3, "170141183460469231731687303715884105.727"}, // (2^127-1) / 1000
	}
	for _, tc := range tests {
		if got := tc.w.Format(tc.places); got != tc.want {
			t.Errorf("%s.Format(%d) = %q; want %q", wideBig(tc.w), tc.places, got, tc.want)
		}
	}
}
