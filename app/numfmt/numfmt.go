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
// 1e-4 up to 1e9 are written in plain decimal notation, others with an
// exponent ("1.23×10⁻⁷" is avoided on purpose: "1.23e-7" is what a
// technician can type back in). Trailing zeros after the decimal point are
// kept, because they state the precision. Non-finite values give "—".
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
		s = strconv.FormatFloat(a, 'e', sig-1, 64)
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
	t := strings.TrimSpace(text)
	if i := strings.IndexAny(t, "eE"); i >= 0 {
		t = t[:i]
	}
	digits := make([]byte, 0, len(t))
	for i := 0; i < len(t); i++ {
		if t[i] >= '0' && t[i] <= '9' {
			digits = append(digits, t[i])
		}
	}
	s := strings.TrimLeft(string(digits), "0")
	if s == "" {
		if len(digits) > 0 {
			return 1
		}
		return 0
	}
	return len(s)
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
