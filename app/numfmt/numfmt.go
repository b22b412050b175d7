// Package numfmt formats the numbers Pairline shows to people, in one place
// for the whole app and the native command: significant digits tied to the
// precision of the readings, no exponent for everyday magnitudes, a real
// minus sign, and never "NaN" or "Inf".
package numfmt

import (
	"math"
	"strconv"
	"strings"
)

// Sig formats v with sig significant digits (1 ≤ sig ≤ 17). Magnitudes from
// 1e-4 up to 1e9 are written in plain decimal notation, others as a
// technician writes them by hand, "1.50 × 10⁻⁷", never in computer notation
// ("1.5e-07"; Full gives the text a program reads back). Trailing zeros
// after the decimal point are kept, because they state the precision. A
// negative number has the minus sign U+2212. Non-finite values give "—".
func Sig(v float64, sig int) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return "—"
	}
	if sig < 1 {
		sig = 1
	}
	if sig > 17 {
		sig = 17
	}
	if v == 0 {
		if sig == 1 {
			return "0"
		}
		return "0." + strings.Repeat("0", sig-1)
	}
	a := math.Abs(v)
	// Round first, so that 9.9996 with 4 digits becomes 10.00 and not 9.999×.
	r, _ := strconv.ParseFloat(strconv.FormatFloat(a, 'e', sig-1, 64), 64)
	exp := int(math.Floor(math.Log10(r)))
	var s string
	if exp < -4 || exp >= 9 {
		s = handExp(strconv.FormatFloat(a, 'e', sig-1, 64))
	} else {
		dec := sig - 1 - exp
		if dec < 0 {
			dec = 0
		}
		s = strconv.FormatFloat(r, 'f', dec, 64)
	}
	if v < 0 {
		return "−" + s
	}
	return s
}

// handExp rewrites Go's "1.50e-07" as "1.50 × 10⁻⁷".
func handExp(e string) string {
	i := strings.IndexByte(e, 'e')
	if i < 0 {
		return e
	}
	mant, ex := e[:i], e[i+1:]
	var b strings.Builder
	b.WriteString(mant)
	b.WriteString(" × 10")
	if ex != "" && ex[0] == '-' {
		b.WriteString("⁻")
	}
	ex = strings.TrimLeft(ex, "+-0")
	if ex == "" {
		ex = "0"
	}
	const sup = "⁰¹²³⁴⁵⁶⁷⁸⁹"
	for _, c := range ex {
		r := []rune(sup)[c-'0']
		b.WriteRune(r)
	}
	return b.String()
}

// Short is Sig without the trailing zeros after the decimal point (and
// without a bare decimal point): for figures in a sentence, whose digits
// state no precision ("about 13.6", not "13.60").
func Short(v float64, sig int) string {
	s := Sig(v, sig)
	if i := strings.Index(s, " × "); i >= 0 {
		return trimZeros(s[:i]) + s[i:]
	}
	return trimZeros(s)
}

func trimZeros(s string) string {
	if !strings.Contains(s, ".") {
		return s
	}
	s = strings.TrimRight(s, "0")
	return strings.TrimSuffix(s, ".")
}

// P writes a p value in the one form Pairline uses everywhere: two
// significant digits ("0.043", "0.0043", "0.43"), below 0.001 as "< 0.001"
// (beyond that the digits change no decision; common practice), and above
// 0.99 as "> 0.99", so that "1.0" never appears beside "0.996". Not finite
// or outside [0, 1]: "—".
func P(p float64) string {
	switch {
	case math.IsNaN(p) || p < 0 || p > 1:
		return "—"
	case p < 0.001:
		return "< 0.001"
	case p <= 0.99:
		return Sig(p, 2)
	}
	return "> 0.99"
}

// PEq is P in a sentence: "p < 0.001", "p = 0.043", "p > 0.99".
func PEq(p float64) string {
	s := P(p)
	if strings.HasPrefix(s, "<") || strings.HasPrefix(s, ">") {
		return "p " + s
	}
	return "p = " + s
}

// Estimate writes an estimate with its standard uncertainty u, rounded as
// a technician reports them (GUM, JCGM 100:2008 §7.2.6: the uncertainty to
// at most two significant digits, the estimate to the same decimal place):
// Estimate(1.234567, 0.012345) is "1.235" and "0.012". With u zero or not
// finite the estimate gets sig significant digits and u is "0" or "—".
func Estimate(v, u float64, sig int) (value, unc string) {
	if u == 0 {
		return Sig(v, sig), "0"
	}
	if !(u > 0) || math.IsInf(u, 0) || math.IsNaN(v) || math.IsInf(v, 0) {
		return Sig(v, sig), "—"
	}
	// The decimal place of u's second significant digit, after rounding u
	// (0.0996 is 0.10, whose second digit is at 10⁻²).
	ur, _ := strconv.ParseFloat(strconv.FormatFloat(u, 'e', 1, 64), 64)
	place := int(math.Floor(math.Log10(ur))) - 1
	if place < -300 || place > 300 {
		return Sig(v, sig), Sig(u, 2)
	}
	unc = Sig(ur, 2)
	if v == 0 {
		if place >= 0 {
			return "0", unc
		}
		return "0." + strings.Repeat("0", -place), unc
	}
	mag := int(math.Floor(math.Log10(math.Abs(v))))
	digits := mag - place + 1
	if digits < 1 {
		// The estimate is smaller than its uncertainty's second digit: it
		// rounds to zero at that place.
		if place >= 0 {
			return "0", unc
		}
		return "0." + strings.Repeat("0", -place), unc
	}
	if place < 0 && mag >= -4 && mag < 9 {
		// Plain decimals: exactly -place of them (Sig would agree except
		// where rounding carries into a new digit, 9.96 → 10.0).
		s := strconv.FormatFloat(math.Abs(v), 'f', -place, 64)
		if v < 0 {
			s = "−" + s
		}
		return s, unc
	}
	return Sig(v, min(digits, 17)), unc
}

// Decimals formats v with a fixed number of decimals (for r and R², whose
// scale is fixed), "—" when not finite.
func Decimals(v float64, dec int) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return "—"
	}
	s := strconv.FormatFloat(math.Abs(v), 'f', dec, 64)
	if v < 0 && strings.Trim(s, "0.") != "" {
		return "−" + s
	}
	return s
}

// Full is the shortest text that parses back to exactly v: the value the
// browser tests read from data-value attributes.
func Full(v float64) string {
	return strconv.FormatFloat(v, 'g', -1, 64)
}

// DigitsOf returns the number of significant digits a reading was typed
// with ("12.50" → 4, "0.003" → 1, "1200" → 4); 0 when the text holds no
// digit. Used to tie shown precision to the precision of the readings.
func DigitsOf(text string) int {
	// The digits before an exponent, from the first one that is not 0 on
	// (leading zeros are not significant); a number of zeros only has one.
	// One pass over the bytes, nothing allocated: the screen calls this for
	// both cells of every reading on each edit (20,000 calls at 10,000
	// readings). White space holds no digit and no "e", so it needs no
	// trimming.
	n, seen := 0, false
	for i := 0; i < len(text); i++ {
		c := text[i]
		if c == 'e' || c == 'E' {
			break
		}
		if c >= '0' && c <= '9' {
			seen = true
			if n > 0 || c != '0' {
				n++
			}
		}
	}
	if n == 0 && seen {
		return 1
	}
	return n
}

// Precision returns how many significant digits to show for estimates from
// readings typed with up to maxDigits digits: two more than the readings,
// between 4 and 10 (common practice: carry one or two guard digits beyond
// the data so that rounding in the report does not move the result).
func Precision(maxDigits int) int {
	p := maxDigits + 2
	if p < 4 {
		p = 4
	}
	if p > 10 {
		p = 10
	}
	return p
}

// Count writes a count of things (readings, sessions, cells) in digits,
// grouped by threes with a narrow no-break space (U+202F) from 10,000 up:
// "9999", "10 000", "1 250 000". A space and not a comma or a point,
// because a session may write its decimals with either (ISO 80000-1,
// §7.3.1, and the SI brochure, §5.4.4: digits in groups of three separated
// by a small space, never by a point or a comma; four digits may stay
// together). A negative count has the minus sign U+2212.
func Count(n int) string {
	if n < 0 {
		return "−" + Count(-n)
	}
	s := strconv.Itoa(n)
	if len(s) <= 4 {
		return s
	}
	var b strings.Builder
	b.Grow(len(s) + 3*(len(s)-1)/3)
	lead := len(s) % 3
	if lead == 0 {
		lead = 3
	}
	b.WriteString(s[:lead])
	for i := lead; i < len(s); i += 3 {
		b.WriteString("\u202f")
		b.WriteString(s[i : i+3])
	}
	return b.String()
}
