package session

// decimalCell reads the plain decimal cell that files of readings hold —
// an optional '+' or '-', digits, optionally one '.' or ',' and digits,
// optionally an exponent ('e' or 'E', an optional '+' or '-', digits) —
// without the full parser. It gives what parseNumber(s, hintDot) gives: the
// value, the decimal separator and whether the text is in the ambiguous
// form ("1,234", "12.345e3"); for that form, alt is what
// parseNumber(s, hintComma) gives. Unambiguous text reads the same under
// every hint.
//
// The value is Clinger's exact fast path ("How to read floating point
// numbers accurately", PLDI 1990): the digits as one integer m ≤ 2^53 and a
// power of ten 10^k with |k| ≤ 22 are both exact in float64, so one IEEE
// multiplication or division m·10^k is the correctly rounded value, the
// bits strconv.ParseFloat gives for the same text (FuzzDecimalCell checks
// it against strconv.ParseFloat and the full parser under each hint). ok is
// false for any other text, for more than 19 digits, an exponent of more than four digits, beyond those bounds,
// and for a negative zero (all of which the full parser reads).
func decimalCell(s string) (v float64, info numInfo, alt float64, ok bool) {
	// One pass over the bytes, in locals (the cell of every row of a big
	// file comes through here): sign, digits, separator and digits, exponent.
	n := len(s)
	if n == 0 || n > 32 {
		return 0, info, 0, false
	}
	i, neg := 0, false
	if c := s[0]; c == '-' || c == '+' {
		neg, i = c == '-', 1
	}
	intStart := i
	var m uint64 // exact for up to 19 digits; more are refused below
	for ; i < n && s[i]-'0' <= 9; i++ {
		m = m*10 + uint64(s[i]-'0')
	}
	ni, nf, sep := i-intStart, 0, byte(0)
	if ni == 0 {
		return 0, info, 0, false
	}
	if i < n && (s[i] == '.' || s[i] == ',') {
		sep = s[i]
		i++
		fracStart := i
		for ; i < n && s[i]-'0' <= 9; i++ {
			m = m*10 + uint64(s[i]-'0')
		}
		if nf = i - fracStart; nf == 0 {
			return 0, info, 0, false
		}
	}
	if ni+nf > 19 || m == 0 && neg {
		return 0, info, 0, false
	}
	exp := 0
	if i < n {
		if exp, ok = cellExponent(s[i:]); !ok {
			return 0, info, 0, false
		}
	}
	// The exponent of the digits read as one integer, the separator a
	// decimal one (point) or a thousands one (grouped).
	point, grouped := exp-nf, exp
	amb := sep != 0 && nf == 3 && ni <= 3 && s[intStart] != '0'
	info.ambiguous = amb
	switch {
	case sep == 0:
		v, ok = exactValue(m, grouped, neg)
	case sep == ',' && amb: // with the decimal point, "1,234" is 1234
		v, ok = exactValue(m, grouped, neg)
	default:
		info.dec = rune(sep)
		v, ok = exactValue(m, point, neg)
	}
	if ok && amb {
		k := grouped // "1.234" with the decimal comma is 1234
		if sep == ',' {
			k = point
		}
		alt, ok = exactValue(m, k, neg)
	}
	return v, info, alt, ok
}

// cellExponent reads the exponent that ends a plain decimal cell: 'e' or
// 'E', an optional '+' or '-', at least one digit, nothing after; ok is
// false for other text and for exponents above 9999.
func cellExponent(t string) (exp int, ok bool) {
	if t[0] != 'e' && t[0] != 'E' {
		return 0, false
	}
	i, neg := 1, false
	if i < len(t) && (t[i] == '-' || t[i] == '+') {
		neg, i = t[i] == '-', i+1
	}
	if i == len(t) || len(t)-i > 4 {
		return 0, false
	}
	for ; i < len(t); i++ {
		if t[i]-'0' > 9 {
			return 0, false
		}
		exp = 10*exp + int(t[i]-'0')
	}
	if neg {
		exp = -exp
	}
	return exp, true
}

// exactValue is ±m·10^k when m ≤ 2^53 and |k| ≤ 22, where it is one
// correctly rounded operation on exact operands; ok is false otherwise.
func exactValue(m uint64, k int, neg bool) (float64, bool) {
	if m > 1<<53 || k < -22 || k > 22 {
		return 0, false
	}
	v := float64(m)
	if k > 0 {
		v *= plainPow10[k]
	} else if k < 0 {
		v /= plainPow10[-k]
	}
	if neg {
		v = -v
	}
	return v, true
}
