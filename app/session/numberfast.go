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
	// The cell of nearly every row of a big file: digits, maybe one
	// separator with other than three digits after it, no exponent. It is
	// read here in one pass over locals; every other cell is taken apart
	// by cellPartsOf.
	if len(s) == 0 || len(s) > 32 {
		return 0, info, 0, false
	}
	i, neg := 0, false
	if c := s[0]; c == '-' || c == '+' {
		neg, i = c == '-', 1
	}
	m, j := addDigits(s, i, 0)
	ni, nf, sep := j-i, 0, byte(0)
	if j < len(s) && (s[j] == '.' || s[j] == ',') {
		sep = s[j]
		m, j = addDigits(s, j+1, m)
		nf = j - i - ni - 1
	}
	if j < len(s) || !plainShape(ni, nf, sep != 0) || m == 0 && neg {
		p, ok := cellPartsOf(s)
		if !ok {
			return 0, info, 0, false
		}
		return p.values()
	}
	info.dec = rune(sep)
	v, ok = exactValue(m, -nf, neg)
	return v, info, 0, ok
}

// plainShape: digits before the separator, and after it (if there is one)
// other than three, 19 digits at most: no exponent, not the ambiguous form.
func plainShape(ni, nf int, sep bool) bool {
	return ni > 0 && ni+nf <= 19 && (!sep || nf > 0 && nf != 3)
}

// cellParts is a plain decimal cell taken apart: the digits as one integer
// m (ni before the separator, nf after it; exact for up to 19 of them), the
// separator ('.', ',' or 0), the exponent and the sign; lead0 says the
// first digit is 0.
type cellParts struct {
	m          uint64
	ni, nf     int
	exp        int
	sep        byte
	neg, lead0 bool
}

// cellPartsOf takes s apart in one pass over its bytes (every cell of a big
// file comes through here): sign, digits, separator and digits, exponent.
// ok is false for text of another form, more than 19 digits and a
// negative zero.
func cellPartsOf(s string) (p cellParts, ok bool) {
	n := len(s)
	if n == 0 || n > 32 {
		return p, false
	}
	i := 0
	if c := s[0]; c == '-' || c == '+' {
		p.neg, i = c == '-', 1
	}
	start := i
	p.m, i = addDigits(s, i, 0)
	if p.ni = i - start; p.ni == 0 {
		return p, false
	}
	p.lead0 = s[start] == '0'
	if i < n && (s[i] == '.' || s[i] == ',') {
		p.sep = s[i]
		p.m, i = addDigits(s, i+1, p.m)
		if p.nf = i - start - p.ni - 1; p.nf == 0 {
			return p, false
		}
	}
	if p.ni+p.nf > 19 || p.m == 0 && p.neg {
		return p, false
	}
	if i < n {
		p.exp, ok = cellExponent(s[i:])
		return p, ok
	}
	return p, true
}

// addDigits adds the digits of s from i on to m and returns it with the
// index after them.
func addDigits(s string, i int, m uint64) (uint64, int) {
	for ; i < len(s) && s[i]-'0' <= 9; i++ {
		m = m*10 + uint64(s[i]-'0')
	}
	return m, i
}

// values is what parseNumber gives for the cell with the decimal point
// (and, in the ambiguous form, alt: with the decimal comma), by the exact
// fast path; ok is false beyond its bounds.
func (p cellParts) values() (v float64, info numInfo, alt float64, ok bool) {
	// The exponent of the digits read as one integer, the separator a
	// decimal one (point) or a thousands one (grouped).
	point, grouped := p.exp-p.nf, p.exp
	amb := p.sep != 0 && p.nf == 3 && p.ni <= 3 && !p.lead0
	info.ambiguous = amb
	switch {
	case p.sep == 0, p.sep == ',' && amb: // with the decimal point, "1,234" is 1234
		v, ok = exactValue(p.m, grouped, p.neg)
	default:
		info.dec = rune(p.sep)
		v, ok = exactValue(p.m, point, p.neg)
	}
	if ok && amb {
		k := grouped // "1.234" with the decimal comma is 1234
		if p.sep == ',' {
			k = point
		}
		alt, ok = exactValue(p.m, k, p.neg)
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
