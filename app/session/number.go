package session

import (
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"
)

// NumberError says why a cell is not a number. Reason follows the quoted
// text in a sentence: `"abc" is not a number`.
type NumberError struct {
	Text   string // the cell as typed
	Reason string // e.g. "is not a number"
}

func (e *NumberError) Error() string { return strconv.Quote(e.Text) + " " + e.Reason }

// ParseNumber reads a number the way technicians type or paste it. It is
// ParseNumberHint without a hint: the one ambiguous form, a single comma
// followed by exactly three digits ("1,234": 1.234 or 1234?), is refused with
// a sentence asking for an unambiguous form.
//
// The rules (common practice for spreadsheet and instrument exports; the
// tests check them against strconv.ParseFloat, which is the reference for
// plain decimal text):
//
//   - Spaces around the number are ignored. A leading '+', '-' or '−'
//     (U+2212) gives the sign. A leading '<', '>', '≤' or '≥' is a limit, not
//     a number, and is refused.
//   - Decimal separator '.' or ','. Thousands separators '.', ',', space
//     (also no-break and thin spaces) or apostrophe; groups after the first
//     must have exactly three digits and the first one to three.
//   - With both '.' and ',' present, the last one is the decimal separator
//     and must appear once: "1,234.5" and "1.234,5" are 1234.5. A separator
//     that appears more than once is a thousands separator: "1.234.567".
//     After a space or apostrophe thousands separator, a single '.' or ','
//     is the decimal separator: "1 234,5".
//   - A single separator is a decimal separator ("3,14", "0,125", "1234,5",
//     "12.5"), except in the ambiguous form: one to three digits (not
//     starting with 0), the separator, exactly three digits. "1.234" is read
//     as 1.234 without a hint; "1,234" needs the hint.
//   - An exponent 'e' or 'E' with optional sign may follow: "1,5e-3".
//   - A unit may follow, with or without a space: "12.5 µS/cm", "7.1mg/L",
//     "20 °C", "45 %". It must start with a letter or one of µ ° % ‰ Ω and
//     must not hold a second number after a space. The unit is ignored.
//   - Refused: empty cells, NaN and infinity, hexadecimal ("0x1F"), two
//     numbers in one cell, a separator not followed by a digit ("12."),
//     values too large for a float64, and text longer than MaxNumberText.
//
// The error is a *NumberError.
func ParseNumber(s string) (float64, error) {
	if v, ok := plainNumber(s); ok {
		return v, nil
	}
	v, _, err := parseNumber(s, hintNone)
	if err != nil {
		return 0, err
	}
	return v, nil
}

// ParseNumberHint is ParseNumber with a hint for the ambiguous form, taken
// from the context (a file or column that uses decimal commas elsewhere, or
// the session's DecimalComma setting). With decimalComma true, "1,234" is
// 1.234 and "1.234" is 1234; with false, "1,234" is 1234 and "1.234" is
// 1.234. Unambiguous text reads the same whatever the hint: "3,14" is 3.14
// and "3.14" is 3.14 in both cases.
func ParseNumberHint(s string, decimalComma bool) (float64, error) {
	if v, ok := plainNumber(s); ok {
		return v, nil
	}
	h := hintDot
	if decimalComma {
		h = hintComma
	}
	v, _, err := parseNumber(s, h)
	if err != nil {
		return 0, err
	}
	return v, nil
}

// plainNumber reads the text most cells hold — an optional sign, digits,
// and optionally a dot with other than three digits after it ("12.5",
// "-0.0031", "1200") — without the full parser: the grid parses every cell
// on every keystroke. Such text means the same under every rule of
// parseNumber (a dot followed by exactly three digits could be a thousands
// separator, so it is left to the full parser); FuzzPlainNumber checks that
// both agree.
func plainNumber(s string) (float64, bool) {
	if len(s) == 0 || len(s) > 24 {
		return 0, false
	}
	i := 0
	if s[0] == '-' || s[0] == '+' {
		i = 1
	}
	start := i
	for i < len(s) && isDigit(s[i]) {
		i++
	}
	if i == start {
		return 0, false
	}
	if i < len(s) {
		if s[i] != '.' {
			return 0, false
		}
		i++
		frac := i
		for i < len(s) && isDigit(s[i]) {
			i++
		}
		if i != len(s) || i-frac == 0 || i-frac == 3 {
			return 0, false
		}
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil || v == 0 && s[0] == '-' {
		return 0, false
	}
	return v, true
}

type numberHint int

const (
	hintNone numberHint = iota
	hintDot
	hintComma
)

// numInfo tells the CSV reader which decimal separator a cell used.
type numInfo struct {
	dec       rune // '.' or ',' when the text had a decimal separator, else 0
	ambiguous bool // the text was in the ambiguous form
}

func isGroupSpace(r rune) bool {
	return r == ' ' || r == '\u00a0' || r == '\u202f' || r == '\u2009'
}

func isSep(r rune) bool {
	return r == '.' || r == ',' || r == '\'' || r == '’' || isGroupSpace(r)
}

// sepKind folds the separators into four kinds: dot, comma, space (all the
// space characters) and apostrophe (both forms).
func sepKind(r rune) rune {
	switch {
	case isGroupSpace(r):
		return ' '
	case r == '’':
		return '\''
	}
	return r
}

func isDigit(b byte) bool { return '0' <= b && b <= '9' }

func isBlank(s string) bool {
	if s == "" {
		return true
	}
	if c := s[0]; c < utf8.RuneSelf && c != ' ' && (c < '\t' || c > '\r') {
		return false // the common case, without a call per cell
	}
	return strings.TrimFunc(s, unicode.IsSpace) == ""
}

func isUnitStart(r rune) bool {
	return unicode.IsLetter(r) || strings.ContainsRune("µ°%‰Ω", r)
}

func parseNumber(s string, hint numberHint) (float64, numInfo, *NumberError) {
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

// SplitRepeats splits the typed readings of one unknown into its repeats:
// at semicolons and at white space (spaces, tabs, new lines), empty pieces
// left out. A comma stays inside a number (a decimal comma). The screen's
// "Use the line" and `pairline fit --inverse-y` both split with it, so the
// same text gives the same repeats in both.
func SplitRepeats(text string) []string {
	return strings.FieldsFunc(text, func(r rune) bool { return r == ';' || unicode.IsSpace(r) })
}
