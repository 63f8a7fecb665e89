package flow

import (
	"errors"
	"math"
	"math/big"
	"math/rand/v2"
	"strings"
	"testing"

	"lanecert/internal/longrun"
)

// Every expected value in this file follows by hand from the input text:
// Mant is the digits without the point, Places the digits after the point
// (minus the exponent), with trailing zeros after the point dropped.

func TestParseDecimal(t *testing.T) {
	tests := []struct {
		in   string
		want Decimal
		err  error // sentinel, nil for success
	}{
		// Plain numbers and signs.
		{in: "0", want: Decimal{0, 0}},
		{in: "12", want: Decimal{12, 0}},
		{in: "+7", want: Decimal{7, 0}},
		{in: "-3.5", want: Decimal{-35, 1}},
		{in: "0.075", want: Decimal{75, 3}},
		{in: "-0", want: Decimal{}},
		{in: "-0.000", want: Decimal{}},
		// Leading zeros are not digits of the mantissa; trailing zeros after
		// the point are dropped, those before it are kept.
		{in: "007", want: Decimal{7, 0}},
		{in: "000.50", want: Decimal{5, 1}},
		{in: "1.50", want: Decimal{15, 1}},
		{in: "1.500000", want: Decimal{15, 1}},
		{in: "100", want: Decimal{100, 0}},
		{in: "100.0", want: Decimal{100, 0}},
		{in: "0.000001", want: Decimal{1, 6}},
		// A missing integer or fraction part.
		{in: ".5", want: Decimal{5, 1}},
		{in: "-.25", want: Decimal{-25, 2}},
		{in: "5.", want: Decimal{5, 0}},
		// Exponents move the point: 1.5e2 = 150, 1.5E-2 = 0.015.
		{in: "1e3", want: Decimal{1000, 0}},
		{in: "1.5e2", want: Decimal{150, 0}},
		{in: "1.5E-2", want: Decimal{15, 3}},
		{in: "12e-1", want: Decimal{12, 1}},
		{in: "1e+2", want: Decimal{100, 0}},
		{in: "1e-05", want: Decimal{1, 5}},
		{in: "2500e-2", want: Decimal{25, 0}},
		{in: "0e5", want: Decimal{}},
		{in: "1e-18", want: Decimal{1, 18}},
		{in: "1e18", want: Decimal{1e18, 0}},
		// 18 significant digits always fit (999...9 < 2^63 ≈ 9.22e18).
		{in: "999999999999999999", want: Decimal{999999999999999999, 0}},
		{in: "-999999999999999999", want: Decimal{-999999999999999999, 0}},
		{in: "0.999999999999999999", want: Decimal{999999999999999999, 18}},
		{in: "123456789.123456789", want: Decimal{123456789123456789, 9}},
		// 19 digits are read while the mantissa stays below MaxInt64.
		{in: "9223372036854775806", want: Decimal{math.MaxInt64 - 1, 0}},
		{in: "-9223372036854775806", want: Decimal{-(math.MaxInt64 - 1), 0}},
		{in: "922337203685477580.6", want: Decimal{math.MaxInt64 - 1, 1}},
		{in: "9223372036854775800", want: Decimal{9223372036854775800, 0}},
		{in: "922337203685477580e1", want: Decimal{9223372036854775800, 0}},
		{in: "1000000000000000000", want: Decimal{1e18, 0}},
		// Zeros beyond 18 digits after the point change nothing.
		{in: "1.0000000000000000000000", want: Decimal{1, 0}},
		{in: "0.1000000000000000000000", want: Decimal{1, 1}},

		// Too many digits or places: ErrOverflow.
		{in: "12345678901234567890", err: ErrOverflow},            // 20 digits
		{in: "-12345678901234567890", err: ErrOverflow},           // 20 digits
		{in: "1234567890.1234567891", err: ErrOverflow},           // 20 significant digits
		{in: "0.1000000000000000000001", err: ErrOverflow},        // 22 significant digits
		{in: "9223372036854775807", err: ErrOverflow},             // MaxInt64: reserved as NoLimit, never parsed
		{in: "922337203685477.5807", err: ErrOverflow},            // MaxInt64 as a mantissa
		{in: "-9223372036854775808", err: ErrOverflow},            // MinInt64
		{in: "1e19", err: ErrOverflow},                            // 10^19 > MaxInt64
		{in: "99e17", err: ErrOverflow},                           // 9.9e18 > MaxInt64
		{in: "1e-19", err: ErrOverflow},                           // 19 places
		{in: "0.0000000000000000001", err: ErrOverflow},           // 19 places
		{in: "-0.0000000000000000001", err: ErrOverflow},          // 19 places
		{in: "1e-40", err: ErrOverflow},                           // 40 places
		{in: "0.00000000000000000000001e5", want: Decimal{1, 18}}, // 23 - 5 places

		// Not a decimal.
		{in: "", err: ErrNotDecimal},
		{in: "-", err: ErrNotDecimal},
		{in: "+", err: ErrNotDecimal},
		{in: ".", err: ErrNotDecimal},
		{in: "-.", err: ErrNotDecimal},
		{in: "NaN", err: ErrNotDecimal},
		{in: "nan", err: ErrNotDecimal},
		{in: "Inf", err: ErrNotDecimal},
		{in: "-Inf", err: ErrNotDecimal},
		{in: "Infinity", err: ErrNotDecimal},
		{in: "1,5", err: ErrNotDecimal},
		{in: "1,000", err: ErrNotDecimal},
		{in: "1.2.3", err: ErrNotDecimal},
		{in: "0x10", err: ErrNotDecimal},
		{in: "1_000", err: ErrNotDecimal},
		{in: " 1", err: ErrNotDecimal}, // the CSV reader trims cells; ParseDecimal does not
		{in: "1 ", err: ErrNotDecimal},
		{in: "--1", err: ErrNotDecimal},
		{in: "+-1", err: ErrNotDecimal},
		{in: "1e", err: ErrNotDecimal},
		{in: "e5", err: ErrNotDecimal},
		{in: ".e5", err: ErrNotDecimal},
		{in: "1e5.5", err: ErrNotDecimal},
		{in: "1e 5", err: ErrNotDecimal},
		{in: "1e41", err: ErrNotDecimal}, // exponents beyond ±40 are refused outright
		{in: "1e-41", err: ErrNotDecimal},
		{in: "12abc", err: ErrNotDecimal},
		{in: "١٢", err: ErrNotDecimal}, // Arabic-Indic digits
	}
	for _, tc := range tests {
		got, err := ParseDecimal(tc.in)
		if tc.err != nil {
			if !errors.Is(err, tc.err) {
				t.Errorf("ParseDecimal(%q) = %v, %v; want error %v", tc.in, got, err, tc.err)
			}
			continue
		}
		if err != nil || got != tc.want {
			t.Errorf("ParseDecimal(%q) = %+v, %v; want %+v", tc.in, got, err, tc.want)
		}
	}
}

func TestParseDecimalErrorText(t *testing.T) {
	// The overflow messages name the text; errors are lowercase.
	for _, tc := range []struct{ in, want string }{
		{"12345678901234567890", `"12345678901234567890" has too many digits`},
		{"1e-19", `"1e-19" has 19 decimal places, at most 18 can be read`},
	} {
		_, err := ParseDecimal(tc.in)
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("ParseDecimal(%q) error %v; want it to contain %q", tc.in, err, tc.want)
		}
	}
}

func TestParseDecimalComma(t *testing.T) {
	tests := []struct {
		in   string
		want Decimal
		err  error
	}{
		{in: "12,50", want: Decimal{125, 1}},
		{in: "-0,075", want: Decimal{-75, 3}},
		{in: ",5", want: Decimal{5, 1}},
		{in: "7", want: Decimal{7, 0}},
		{in: "1,5e2", want: Decimal{150, 0}},
		{in: "1.5", err: ErrNotDecimal}, // a point is not the decimal mark here
		{in: "1.000,5", err: ErrNotDecimal},
		{in: "1,2,3", err: ErrNotDecimal},
	}
	for _, tc := range tests {
		got, err := ParseDecimalComma(tc.in)
		if tc.err != nil {
			if !errors.Is(err, tc.err) {
				t.Errorf("ParseDecimalComma(%q) = %v, %v; want error %v", tc.in, got, err, tc.err)
			}
			continue
		}
		if err != nil || got != tc.want {
			t.Errorf("ParseDecimalComma(%q) = %+v, %v; want %+v", tc.in, got, err, tc.want)
		}
	}
}

func TestDecimalCmp(t *testing.T) {
	tests := []struct {
		a, b Decimal
		want int
	}{
		{Decimal{15, 1}, Decimal{150, 2}, 0},  // 1.5 = 1.50
		{Decimal{15, 1}, Decimal{151, 2}, -1}, // 1.5 < 1.51
		{Decimal{2, 0}, Decimal{1999, 3}, 1},  // 2 > 1.999
		{Decimal{-5, 1}, Decimal{0, 0}, -1},
		{Decimal{0, 0}, Decimal{0, 5}, 0},
		{Decimal{-1, 18}, Decimal{-1, 17}, 1}, // -1e-18 > -1e-17
		// Scaling to common places needs more than 64 bits here:
		// MaxInt64 × 10^18 vs 1 × 10^0.
		{Decimal{math.MaxInt64, 0}, Decimal{1, 18}, 1},
		{Decimal{-math.MaxInt64, 0}, Decimal{-1, 18}, -1},
		{Decimal{999999999999999999, 0}, Decimal{999999999999999999, 18}, 1},
	}
	for _, tc := range tests {
		if got := tc.a.Cmp(tc.b); got != tc.want {
			t.Errorf("%+v.Cmp(%+v) = %d; want %d", tc.a, tc.b, got, tc.want)
		}
		if got := tc.b.Cmp(tc.a); got != -tc.want {
			t.Errorf("%+v.Cmp(%+v) = %d; want %d", tc.b, tc.a, got, -tc.want)
		}
	}
}

func TestDecimalScaledAndString(t *testing.T) {
	tests := []struct {
		d      Decimal
		places int
		want   int64
		err    error
		str    string
	}{
		{Decimal{125, 1}, 3, 12500, nil, "12.5"},
		{Decimal{-5, 2}, 2, -5, nil, "-0.05"},
		{Decimal{7, 0}, 0, 7, nil, "7"},
		{Decimal{9, 0}, 18, 9e18, nil, "9"},
		{Decimal{10, 0}, 18, 0, ErrOverflow, "10"}, // 10^19
		{Decimal{1, 0}, 19, 0, ErrOverflow, "1"},   // 10^19
	}
	for _, tc := range tests {
		got, err := tc.d.Scaled(tc.places)
		if !errors.Is(err, tc.err) || got != tc.want {
			t.Errorf("%+v.Scaled(%d) = %d, %v; want %d, %v", tc.d, tc.places, got, err, tc.want, tc.err)
		}
		if s := tc.d.String(); s != tc.str {
			t.Errorf("%+v.String() = %q; want %q", tc.d, s, tc.str)
		}
	}
	defer func() {
		if recover() == nil {
			t.Error("Scaled(1) of a value with 2 places did not panic")
		}
	}()
	_, _ = Decimal{125, 2}.Scaled(1)
}

func TestFormatScaled(t *testing.T) {
	tests := []struct {
		v      int64
		places int
		want   string
	}{
		{12500, 3, "12.500"}, // the doc comment's examples
		{-5, 2, "-0.05"},
		{7, 0, "7"},
		{0, 0, "0"},
		{0, 2, "0.00"},
		{5, 1, "0.5"},
		{-12, 1, "-1.2"},
		{123, 3, "0.123"},
		{1, 18, "0.000000000000000001"},
		{math.MaxInt64, 0, "9223372036854775807"},
		{math.MinInt64, 0, "-9223372036854775808"},
		{math.MaxInt64, 4, "922337203685477.5807"},
		{math.MinInt64, 19, "-0.9223372036854775808"},
	}
	for _, tc := range tests {
		if got := FormatScaled(tc.v, tc.places); got != tc.want {
			t.Errorf("FormatScaled(%d, %d) = %q; want %q", tc.v, tc.places, got, tc.want)
		}
	}
}

// edgeInt64 are values at and next to the ends of the int64 range.
var edgeInt64 = []int64{0, 1, -1, 9, -9, 10, math.MaxInt64, math.MinInt64, math.MaxInt64 - 1,
	math.MinInt64 + 1, 1 << 62, -1 << 62, 1<<32 - 1, 1 << 32, 3037000499, 3037000500, -3037000500,
	999999999999999999, 1e18, -1e18, 922337203685477580}

// randInt64 draws edge values, small values and values of every bit length.
func randInt64(r *rand.Rand) int64 {
	switch r.IntN(4) {
	case 0:
		return edgeInt64[r.IntN(len(edgeInt64))]
	case 1:
		return r.Int64N(2001) - 1000
	default:
		return int64(r.Uint64() >> r.UintN(64))
	}
}

// TestFormatScaledRoundTrip: FormatScaled then ParseDecimal gives the same
// value for every int64 except ±MaxInt64 (MaxInt64 is NoLimit, and parsed
// values keep a symmetric range) and MinInt64, which give ErrOverflow.
func TestFormatScaledRoundTrip(t *testing.T) {
	r := rand.New(rand.NewPCG(longrun.Seed(t, 1), 1))
	for range longrun.Cases(t, 20000) {
		v := randInt64(r)
		p := r.IntN(19)
		s := FormatScaled(v, p)
		d, err := ParseDecimal(s)
		fits := v > -math.MaxInt64 && v < math.MaxInt64
		if err != nil {
			if fits || !errors.Is(err, ErrOverflow) {
				t.Fatalf("ParseDecimal(FormatScaled(%d, %d) = %q): %v", v, p, s, err)
			}
			continue
		}
		if !fits {
			t.Fatalf("ParseDecimal(FormatScaled(%d, %d) = %q) = %+v; want ErrOverflow", v, p, s, d)
		}
		if d.Cmp(Decimal{v, int8(p)}) != 0 || int(d.Places) > p {
			t.Fatalf("ParseDecimal(FormatScaled(%d, %d) = %q) = %+v", v, p, s, d)
		}
		if d.Places > 0 && d.Mant%10 == 0 {
			t.Fatalf("ParseDecimal(%q) = %+v: trailing zero kept", s, d)
		}
		// The scaled value is the original.
		if back, err := d.Scaled(p); err != nil || back != v {
			t.Fatalf("%+v.Scaled(%d) = %d, %v; want %d", d, p, back, err, v)
		}
	}
}

// inRange reports whether b fits [lo, hi].
func inRange(b *big.Int, lo, hi int64) bool {
	return b.Cmp(big.NewInt(lo)) >= 0 && b.Cmp(big.NewInt(hi)) <= 0
}

func TestCheckedArithmeticEdges(t *testing.T) {
	const maxI, minI = math.MaxInt64, math.MinInt64
	type op func(a, b int64) (int64, error)
	tests := []struct {
		name string
		f    op
		a, b int64
		want int64
		err  error
	}{
		{"add", AddChecked, maxI, 0, maxI, nil},
		{"add", AddChecked, maxI, 1, 0, ErrOverflow},
		{"add", AddChecked, minI, -1, 0, ErrOverflow},
		{"add", AddChecked, minI, minI, 0, ErrOverflow},
		{"add", AddChecked, maxI, maxI, 0, ErrOverflow},
		{"add", AddChecked, maxI, minI, -1, nil},
		{"add", AddChecked, minI + 1, -1, minI, nil},
		{"add", AddChecked, -1, 0, -1, nil},
		{"sub", SubChecked, 0, minI, 0, ErrOverflow}, // 2^63
		{"sub", SubChecked, -1, minI, maxI, nil},
		{"sub", SubChecked, minI, minI, 0, nil},
		{"sub", SubChecked, minI, 1, 0, ErrOverflow},
		{"sub", SubChecked, maxI, -1, 0, ErrOverflow},
		{"sub", SubChecked, 0, maxI, -maxI, nil},
		{"sub", SubChecked, -2, maxI, 0, ErrOverflow}, // -2-MaxInt64 = MinInt64-1
		{"sub", SubChecked, -1, maxI, minI, nil},
		{"mul", MulChecked, maxI, 1, maxI, nil},
		{"mul", MulChecked, maxI, -1, -maxI, nil},
		{"mul", MulChecked, maxI, 2, 0, ErrOverflow},
		{"mul", MulChecked, minI, 0, 0, nil},
		{"mul", MulChecked, 0, minI, 0, nil},
		{"mul", MulChecked, minI, -1, 0, ErrOverflow}, // 2^63
		{"mul", MulChecked, 1 << 31, 1 << 31, 1 << 62, nil},
		{"mul", MulChecked, 1 << 32, 1 << 31, 0, ErrOverflow},                 // 2^63
		{"mul", MulChecked, 3037000499, 3037000499, 9223372030926249001, nil}, // floor(sqrt(2^63-1))^2
		{"mul", MulChecked, 3037000500, 3037000500, 0, ErrOverflow},           // 9223372037000250000 > 2^63-1
		{"mul", MulChecked, -3037000500, 3037000500, 0, ErrOverflow},
		// MulChecked keeps results in the symmetric range [-MaxInt64,
		// MaxInt64]: products equal to MinInt64 are refused too.
		{"mul", MulChecked, minI, 1, 0, ErrOverflow},
		{"mul", MulChecked, -1 << 62, 2, 0, ErrOverflow},
	}
	for _, tc := range tests {
		got, err := tc.f(tc.a, tc.b)
		if !errors.Is(err, tc.err) || got != tc.want {
			t.Errorf("%s(%d, %d) = %d, %v; want %d, %v", tc.name, tc.a, tc.b, got, err, tc.want, tc.err)
		}
	}
}

// TestCheckedArithmeticAgainstBig compares the checked operations with
// math/big on random operands: a result is returned exactly when the exact
// value fits, ErrOverflow otherwise.
func TestCheckedArithmeticAgainstBig(t *testing.T) {
	r := rand.New(rand.NewPCG(longrun.Seed(t, 2), 1))
	for range longrun.Cases(t, 50000) {
		a, b := randInt64(r), randInt64(r)
		ba, bb := big.NewInt(a), big.NewInt(b)
		check := func(name string, got int64, err error, exact *big.Int, lo int64) {
			t.Helper()
			if inRange(exact, lo, math.MaxInt64) {
				if err != nil || got != exact.Int64() {
					t.Fatalf("%s(%d, %d) = %d, %v; want %s", name, a, b, got, err, exact)
				}
			} else if !errors.Is(err, ErrOverflow) {
				t.Fatalf("%s(%d, %d) = %d, %v; want ErrOverflow (exact %s)", name, a, b, got, err, exact)
			}
		}
		s, err := AddChecked(a, b)
		check("AddChecked", s, err, new(big.Int).Add(ba, bb), math.MinInt64)
		d, err := SubChecked(a, b)
		check("SubChecked", d, err, new(big.Int).Sub(ba, bb), math.MinInt64)
		p, err := MulChecked(a, b)
		check("MulChecked", p, err, new(big.Int).Mul(ba, bb), -math.MaxInt64)
		k := r.IntN(21)
		u, err := ScaleUp(a, k)
		exact := new(big.Int).Mul(ba, new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(k)), nil))
		lo := int64(-math.MaxInt64) // a product, as in MulChecked
		if k == 0 {
			lo = math.MinInt64 // v × 1 is v itself
		}
		check("ScaleUp", u, err, exact, lo)
	}
}

func TestPow10(t *testing.T) {
	want := int64(1)
	for k := 0; k <= 18; k++ {
		if got := Pow10(k); got != want {
			t.Errorf("Pow10(%d) = %d; want %d", k, got, want)
		}
		want *= 10
	}
}
