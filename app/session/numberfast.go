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
// false for any other text, for more than 19 digits, beyond those bounds,
// and for a negative zero (all of which the full parser reads).
func decimalCell(s string) (v float64, info numInfo, alt float64, ok bool) {
	d, ok := decimalDigits(s)
	if !ok {
		return 0, info, 0, false
	}
	// The exponent of the digits read as one integer, the separator a
	// decimal one (point) or a thousands one (grouped).
	point, grouped := d.exp-d.nf, d.exp
	amb := d.sep != 0 && d.nf == 3 && d.ni <= 3 && s[d.intStart] != '0'
	info.ambiguous = amb
	switch {
	case d.sep == 0:
		v, ok = exactValue(d.m, grouped, d.neg)
	case d.sep == ',' && amb: // with the decimal point, "1,234" is 1234
		v, ok = exactValue(d.m, grouped, d.neg)
	default:
		info.dec = rune(d.sep)
		v, ok = exactValue(d.m, point, d.neg)
	}
	if ok && amb {
		k := grouped // "1.234" with the decimal comma is 1234
		if d.sep == ',' {
			k = point
		}
		alt, ok = exactValue(d.m, k, d.neg)
	}
	return v, info, alt, ok
}

// cellDigits is the text of a plain decimal cell taken apart: the sign, the
// digits as one integer m (ni before the separator, nf after it), the
// separator ('.', ',' or 0), the exponent, and where the digits start.
type cellDigits struct {
	m        uint64
	ni, nf   int
	sep      byte
	exp      int
	neg      bool
	intStart int
}

// decimalDigits takes s apart as decimalCell reads it; ok is false for text
// of another form, more than 19 digits or an exponent above 9999.
func decimalDigits(s string) (d cellDigits, ok bool) {
	if len(s) == 0 || len(s) > 32 {
		return d, false
	}
	i := 0
	if s[0] == '-' || s[0] == '+' {
		d.neg, i = s[0] == '-', 1
	}
	d.intStart = i
	i = d.digits(s, i)
	d.ni = i - d.intStart
	if d.ni == 0 {
		return d, false
	}
	if i < len(s) && (s[i] == '.' || s[i] == ',') {
		d.sep = s[i]
		j := d.digits(s, i+1)
		d.nf = j - i - 1
		if d.nf == 0 {
			return d, false
		}
		i = j
	}
	if d.ni+d.nf > 19 || d.m == 0 && d.neg {
		return d, false
	}
	if i < len(s) && (s[i] == 'e' || s[i] == 'E') {
		i++
		eneg := false
		if i < len(s) && (s[i] == '-' || s[i] == '+') {
			eneg, i = s[i] == '-', i+1
		}
		start := i
		for i < len(s) && isDigit(s[i]) && d.exp <= 9999 {
			d.exp = 10*d.exp + int(s[i]-'0')
			i++
		}
		if i == start || d.exp > 9999 {
			return d, false
		}
		if eneg {
			d.exp = -d.exp
		}
	}
	return d, i == len(s)
}

// digits adds the digits of s from i to d.m (exact up to 19 of them; the
// caller refuses more) and returns the index after them.
func (d *cellDigits) digits(s string, i int) int {
	for i < len(s) && isDigit(s[i]) {
		d.m = d.m*10 + uint64(s[i]-'0')
		i++
	}
	return i
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
