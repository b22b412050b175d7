package session

import (
	"math"
	"strconv"
	"strings"
	"testing"
	"unicode"
	"unicode/utf8"
)

// parseNumberOracle is parseNumber as it stood before it was split into
// named steps (commit e3b0f91), kept verbatim as the oracle for
// FuzzParseNumberMatchesOracle: the restructured parser must give the same
// value bits, the same numInfo and the same error text for every input and
// hint.
func parseNumberOracle(s string, hint numberHint) (float64, numInfo, *NumberError) {
	var info numInfo
	fail := func(reason string) (float64, numInfo, *NumberError) {
		return 0, info, &NumberError{Text: s, Reason: reason}
	}
	if len(s) > MaxNumberText {
		return fail("is too long to be a reading (more than " + strconv.Itoa(MaxNumberText) + " characters)")
	}
	if !utf8.ValidString(s) {
		return fail("holds characters that are not valid text")
	}
	t := strings.TrimFunc(s, unicode.IsSpace)
	if t == "" {
		return fail("is empty")
	}
	neg := false
	switch {
	case strings.HasPrefix(t, "+"):
		t = t[1:]
	case strings.HasPrefix(t, "-"):
		neg, t = true, t[1:]
	case strings.HasPrefix(t, "−"):
		neg, t = true, t[len("−"):]
	case strings.HasPrefix(t, "<"), strings.HasPrefix(t, ">"), strings.HasPrefix(t, "≤"), strings.HasPrefix(t, "≥"):
		return fail("is a limit, not a reading: enter the measured value, or leave the cell empty and write the limit in the note")
	}
	if t == "" {
		return fail("is a sign without a number")
	}

	// Mantissa: digit groups joined by separators, each separator followed
	// directly by a digit.
	var groupBuf [8]string
	var sepBuf [8]rune
	groups, seps := groupBuf[:0], sepBuf[:0]
	i := 0
	start := 0
	for {
		for i < len(t) && isDigit(t[i]) {
			i++
		}
		groups = append(groups, t[start:i])
		if i >= len(t) {
			break
		}
		r, n := utf8.DecodeRuneInString(t[i:])
		if !isSep(r) || i+n >= len(t) || !isDigit(t[i+n]) {
			break
		}
		if t[start:i] == "" && (len(groups) > 1 || (r != '.' && r != ',')) {
			break // only a leading '.' or ',' may have no digits before it
		}
		seps = append(seps, sepKind(r))
		i += n
		start = i
	}
	if len(groups) == 1 && groups[0] == "" {
		low := strings.ToLower(t)
		if strings.HasPrefix(low, "nan") || strings.HasPrefix(low, "inf") || strings.HasPrefix(t, "∞") {
			return fail("is not a finite number")
		}
		if r, _ := utf8.DecodeRuneInString(t); r == '.' || r == ',' {
			return fail("has a separator with no digits after it")
		}
		return fail("is not a number")
	}

	// Exponent.
	exp := ""
	if i < len(t) && (t[i] == 'e' || t[i] == 'E') {
		j := i + 1
		esign := ""
		switch {
		case strings.HasPrefix(t[j:], "+"):
			j++
		case strings.HasPrefix(t[j:], "-"):
			esign, j = "-", j+1
		case strings.HasPrefix(t[j:], "−"):
			esign, j = "-", j+len("−")
		}
		k := j
		for k < len(t) && isDigit(t[k]) {
			k++
		}
		switch {
		case k > j:
			exp = "e" + esign + t[j:k]
			i = k
		case j > i+1 || j >= len(t) || !unicode.IsLetter(rune(t[j])):
			return fail("has an exponent with no digits")
		}
	}

	// Unit.
	rest := t[i:]
	spaced := false
	if r := strings.TrimLeftFunc(rest, unicode.IsSpace); len(r) != len(rest) {
		spaced, rest = true, r
	}
	if rest != "" {
		r, _ := utf8.DecodeRuneInString(rest)
		switch {
		case isDigit(byte(r)) && r < utf8.RuneSelf, r == '+', r == '-', r == '−':
			return fail("holds more than one number; put one reading in each cell")
		case (r == 'x' || r == 'X') && !spaced && len(seps) == 0 && groups[0] == "0":
			return fail("looks like a hexadecimal number; Pairline reads decimal numbers only")
		case r == '.' || r == ',':
			return fail("has a separator with no digits after it")
		case !isUnitStart(r):
			return fail("has characters after the number that are not a unit")
		}
		fs := strings.FieldsFunc(rest, unicode.IsSpace)
		for _, f := range fs[1:] {
			c, _ := utf8.DecodeRuneInString(f)
			if (c < utf8.RuneSelf && isDigit(byte(c))) || c == '+' || c == '-' || c == '−' || c == '.' || c == ',' {
				return fail("holds more than one number; put one reading in each cell")
			}
		}
	}

	// Decide which separator is the decimal one.
	intGroups, frac := groups, ""
	var group rune // thousands separator kind, 0 = none
	// kinds counts each separator kind; nk is the number of kinds used.
	var kinds [4]int
	kindIndex := func(k rune) int { return strings.IndexRune(".,' ", k) }
	nk := 0
	for _, k := range seps {
		if kinds[kindIndex(k)] == 0 {
			nk++
		}
		kinds[kindIndex(k)]++
	}
	switch nk {
	case 0:
	case 1:
		k := seps[0]
		switch {
		case k == ' ' || k == '\'' || len(seps) > 1:
			group = k
		default: // one '.' or ','
			g0, g1 := groups[0], groups[1]
			amb := len(g1) == 3 && len(g0) >= 1 && len(g0) <= 3 && g0[0] != '0'
			info.ambiguous = amb
			decimal := true
			if amb {
				switch {
				case k == ',' && hint == hintNone:
					return fail("could mean " + g0 + "." + g1 + " or " + g0 + g1 +
						": type it with a decimal point (" + g0 + "." + g1 + ") or without the separator (" + g0 + g1 + ")")
				case k == ',' && hint == hintDot, k == '.' && hint == hintComma:
					decimal = false
				}
			}
			if decimal {
				intGroups, frac = groups[:1], g1
				info.dec = k
			} else {
				group = k
			}
		}
	case 2:
		last := seps[len(seps)-1]
		if (last != '.' && last != ',') || kinds[kindIndex(last)] != 1 {
			return fail("mixes separators in a way that is not a number")
		}
		group = seps[0]
		intGroups, frac = groups[:len(groups)-1], groups[len(groups)-1]
		info.dec = last
	default:
		return fail("mixes separators in a way that is not a number")
	}
	if group != 0 {
		ok := len(intGroups[0]) >= 1 && len(intGroups[0]) <= 3
		for _, g := range intGroups[1:] {
			ok = ok && len(g) == 3
		}
		if !ok && group == ' ' {
			return fail("holds more than one number, or digits split by spaces that are not groups of three")
		}
		if !ok {
			return fail("has thousands separators that do not split the digits into groups of three")
		}
	}

	var b strings.Builder
	b.Grow(len(t) + 2)
	if neg {
		b.WriteByte('-')
	}
	for _, g := range intGroups {
		b.WriteString(g)
	}
	if frac != "" {
		if b.Len() == 0 || (neg && b.Len() == 1) {
			b.WriteByte('0')
		}
		b.WriteByte('.')
		b.WriteString(frac)
	}
	b.WriteString(exp)
	v, err := strconv.ParseFloat(b.String(), 64)
	if err != nil {
		if ne, ok := err.(*strconv.NumError); ok && ne.Err == strconv.ErrRange && (v > 1 || v < -1) {
			return fail("is too large to be a reading")
		}
		if ne, ok := err.(*strconv.NumError); !ok || ne.Err != strconv.ErrRange {
			return fail("is not a number")
		}
		// Underflow: ParseFloat returns the nearest value (0 or subnormal).
	}
	return v, info, nil
}

// FuzzParseNumberMatchesOracle: parseNumber and parseNumberOracle agree on
// every text under every hint: value bits, numInfo and error text.
func FuzzParseNumberMatchesOracle(f *testing.F) {
	for _, s := range []string{"3.14", "3,14", "1 234,5", "1,234.5", "1.234,5", "1,234", "1.234", "12.5 µS/cm",
		"-1e-3", "NaN", "inf", "∞", "0x10", "<5", "≥2", "1e400", "1e-400", ".5", ",5", "12.", "1'234'567.8", "1’234",
		"−2", "−", "+", "7.1mg/L", "1,5e−3", "2e", "2eV", "2e+", "1 2", "1 234 5", "1.2.3,4", "1,2.3'4", "12 mg 3",
		"45 %", "1\u202f234,5", "1,234,567", "01,234", "1.23,4", "12 -3", "  ", "", "\xff", "1e5x", "5 ‰"} {
		f.Add(s, uint8(0))
		f.Add(s, uint8(1))
		f.Add(s, uint8(2))
	}
	f.Fuzz(func(t *testing.T, s string, h uint8) {
		hint := numberHint(h % 3)
		v, info, err := parseNumber(s, hint)
		w, winfo, werr := parseNumberOracle(s, hint)
		if math.Float64bits(v) != math.Float64bits(w) || info != winfo {
			t.Fatalf("parseNumber(%q, %d) = %v (%x), %+v; oracle %v (%x), %+v", s, hint,
				v, math.Float64bits(v), info, w, math.Float64bits(w), winfo)
		}
		if (err == nil) != (werr == nil) || err != nil && (err.Error() != werr.Error() || *err != *werr) {
			t.Fatalf("parseNumber(%q, %d) error %v; oracle %v", s, hint, err, werr)
		}
	})
}

// BenchmarkParseNumberSteps and BenchmarkParseNumberOracle time the
// restructured parser and the oracle on the same cell in one run, so that
// the load of the machine falls on both alike.
func BenchmarkParseNumberSteps(b *testing.B) {
	for b.Loop() {
		_, _, _ = parseNumber("1 234,567 µS/cm", hintNone)
	}
}

func BenchmarkParseNumberOracle(b *testing.B) {
	for b.Loop() {
		_, _, _ = parseNumberOracle("1 234,567 µS/cm", hintNone)
	}
}
