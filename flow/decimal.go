package flow

import (
	"errors"
	"fmt"
	"math"
	"math/bits"
	"strconv"
	"strings"
)

// ErrOverflow reports a value or an intermediate result that does not fit
// the exact 64-bit (or, for totals, 128-bit) representation.
var ErrOverflow = errors.New("exceeds the exact 64-bit range")

// ErrNotDecimal reports text where a decimal number was expected.
var ErrNotDecimal = errors.New("want a decimal number such as 12, -3.5 or 0.075")

// MaxPlaces is the largest number of decimal places a network may use for
// quantities or for rates. Single values may carry up to 18 places (a plan
// from a floating-point solver), to be rounded with a tolerance.
const MaxPlaces = 12

// maxReadPlaces is the largest number of decimal places ParseDecimal accepts.
const maxReadPlaces = 18

// Decimal is an exact decimal as read: Mant × 10^-Places.
type Decimal struct {
	Mant   int64
	Places int8
}

// ParseDecimal parses a plain decimal: an optional sign, digits, an optional
// point and digits, and an optional exponent (e or E, at most ±40). NaN, Inf,
// empty text, spaces, thousands separators and hexadecimal are rejected. The
// result is exact; a value whose mantissa does not fit below MaxInt64 (more
// than 18 significant digits, some of 19; MaxInt64 is NoLimit) or that needs
// more than 18 places gives ErrOverflow. Trailing zeros after the point are
// dropped, so "1.50" has Places 1.
func ParseDecimal(s string) (Decimal, error) {
	return parseDecimal(s, '.')
}

// ParseDecimalComma is ParseDecimal with a decimal comma ("12,50").
func ParseDecimalComma(s string) (Decimal, error) {
	return parseDecimal(s, ',')
}

func parseDecimal(s string, point byte) (Decimal, error) {
	i := 0
	neg := false
	if i < len(s) && (s[i] == '+' || s[i] == '-') {
		neg = s[i] == '-'
		i++
	}
	var mant uint64
	places := 0
	digits := 0
	seenPoint := false
	overflow := false
	start := i
	for ; i < len(s); i++ {
		c := s[i]
		if c == point && !seenPoint {
			seenPoint = true
			continue
		}
		if c < '0' || c > '9' {
			break
		}
		digits++
		if mant == 0 && c == '0' && !seenPoint {
			continue // leading zero
		}
		if mant > (math.MaxInt64-1-uint64(c-'0'))/10 { // keep mant < MaxInt64 (NoLimit)
			if seenPoint && c == '0' {
				continue // a zero past 18 digits; a later non-zero digit overflows
			}
			overflow = true
			continue
		}
		mant = mant*10 + uint64(c-'0')
		if seenPoint {
			places++
		}
	}
	if digits == 0 || i == start {
		return Decimal{}, ErrNotDecimal
	}
	exp := 0
	if i < len(s) && (s[i] == 'e' || s[i] == 'E') {
		e, err := strconv.Atoi(s[i+1:])
		if err != nil || e > 40 || e < -40 {
			return Decimal{}, ErrNotDecimal
		}
		exp = e
		i = len(s)
	}
	if i != len(s) {
		return Decimal{}, ErrNotDecimal
	}
	if overflow {
		return Decimal{}, fmt.Errorf("%q has too many digits: %w", s, ErrOverflow)
	}
	places -= exp
	// Drop trailing zeros after the point.
	for places > 0 && mant != 0 && mant%10 == 0 {
		mant /= 10
		places--
	}
	if mant == 0 {
		return Decimal{}, nil
	}
	for places < 0 {
		if mant > math.MaxInt64/10 {
			return Decimal{}, fmt.Errorf("%q: %w", s, ErrOverflow)
		}
		mant *= 10
		places++
	}
	if places > maxReadPlaces {
		return Decimal{}, fmt.Errorf("%q has %d decimal places, at most %d can be read: %w", s, places, maxReadPlaces, ErrOverflow)
	}
	v := int64(mant)
	if neg {
		v = -v
	}
	return Decimal{Mant: v, Places: int8(places)}, nil
}

// Cmp compares d and e exactly and returns -1, 0 or +1.
func (d Decimal) Cmp(e Decimal) int {
	p := max(d.Places, e.Places)
	return MulWide(d.Mant, pow10[p-d.Places]).Cmp(MulWide(e.Mant, pow10[p-e.Places]))
}

// Scaled returns d as an integer scaled by 10^places, or ErrOverflow.
// It panics if places < d.Places (a caller's mistake: precision would be lost).
func (d Decimal) Scaled(places int) (int64, error) {
	if places < int(d.Places) {
		panic("flow: Decimal.Scaled would drop places")
	}
	return ScaleUp(d.Mant, places-int(d.Places))
}

// String formats d exactly, as written without trailing zeros.
func (d Decimal) String() string { return FormatScaled(d.Mant, int(d.Places)) }

var pow10 = [...]int64{1, 10, 100, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18}

// Pow10 returns 10^k for 0 <= k <= 18.
func Pow10(k int) int64 { return pow10[k] }

// ScaleUp returns v × 10^k, or ErrOverflow.
func ScaleUp(v int64, k int) (int64, error) {
	if k == 0 {
		return v, nil
	}
	if k < 0 || k >= len(pow10) {
		if v == 0 {
			return 0, nil
		}
		return 0, ErrOverflow
	}
	return MulChecked(v, pow10[k])
}

// AddChecked returns a+b, or ErrOverflow.
func AddChecked(a, b int64) (int64, error) {
	s := a + b
	if (a >= 0) == (b >= 0) && (s >= 0) != (a >= 0) {
		return 0, ErrOverflow
	}
	return s, nil
}

// SubChecked returns a-b, or ErrOverflow.
func SubChecked(a, b int64) (int64, error) {
	if b == math.MinInt64 {
		if a >= 0 {
			return 0, ErrOverflow
		}
		return a - b, nil
	}
	return AddChecked(a, -b)
}

// MulChecked returns a×b, or ErrOverflow.
func MulChecked(a, b int64) (int64, error) {
	if a == 0 || b == 0 {
		return 0, nil
	}
	hi, lo := bits.Mul64(uint64(abs64(a)), uint64(abs64(b)))
	if hi != 0 || lo > math.MaxInt64 || a == math.MinInt64 || b == math.MinInt64 {
		return 0, ErrOverflow
	}
	p := int64(lo)
	if (a < 0) != (b < 0) {
		p = -p
	}
	return p, nil
}

func abs64(a int64) int64 {
	if a < 0 {
		return -a
	}
	return a
}

// FormatScaled formats v / 10^places exactly with exactly places digits
// after the point: FormatScaled(12500, 3) is "12.500", FormatScaled(-5, 2)
// "-0.05", FormatScaled(7, 0) "7".
func FormatScaled(v int64, places int) string {
	if places == 0 {
		return strconv.FormatInt(v, 10)
	}
	neg := v < 0
	u := uint64(v)
	if neg {
		u = -u
	}
	return fixedPoint(strconv.FormatUint(u, 10), places, neg)
}

// fixedPoint places the point in the digit string s.
func fixedPoint(s string, places int, neg bool) string {
	if len(s) <= places {
		s = strings.Repeat("0", places-len(s)+1) + s
	}
	out := s[:len(s)-places] + "." + s[len(s)-places:]
	if neg {
		out = "-" + out
	}
	return out
}
