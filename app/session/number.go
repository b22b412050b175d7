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
//
// Most such cells are read without strconv, by the exact fast path of
// Clinger ("How to read floating point numbers accurately", PLDI 1990):
// when the digits form an integer m ≤ 2^53 and there are k ≤ 22 of them
// after the dot, m and 10^k are both exact in float64 and one IEEE
// division m / 10^k is the correctly rounded value, the same bits
// strconv.ParseFloat gives (TestPlainNumberFastPath, FuzzPlainNumber).
func plainNumber(s string) (float64, bool) {
	if len(s) == 0 || len(s) > 24 {
		return 0, false
	}
	m, digits, k, neg, ok := plainDigits(s)
	if !ok {
		return 0, false
	}
	if digits <= 19 && m <= 1<<53 && k <= 22 {
		// 19 digits cannot overflow a uint64.
		if m == 0 && neg {
			return 0, false
		}
		v := float64(m)
		if k > 0 {
			v /= plainPow10[k]
		}
		if neg {
			v = -v
		}
		return v, true
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil || v == 0 && s[0] == '-' {
		return 0, false
	}
	return v, true
}

// plainDigits reads s (not empty) as an optional sign, digits and, after a
// dot, digits other than exactly three: m is the digits as one integer
// (exact for up to 19 of them), k the number after the dot. ok is false
// for any other text.
func plainDigits(s string) (m uint64, digits, k int, neg, ok bool) {
	i := 0
	if s[0] == '-' || s[0] == '+' {
		neg = s[0] == '-'
		i = 1
	}
	start := i
	for i < len(s) && isDigit(s[i]) {
		m = m*10 + uint64(s[i]-'0')
		digits++
		i++
	}
	if i == start {
		return 0, 0, 0, false, false
	}
	if i == len(s) {
		return m, digits, 0, neg, true
	}
	if s[i] != '.' {
		return 0, 0, 0, false, false
	}
	i++
	frac := i
	for i < len(s) && isDigit(s[i]) {
		m = m*10 + uint64(s[i]-'0')
		digits++
		i++
	}
	k = i - frac
	if i != len(s) || k == 0 || k == 3 {
		return 0, 0, 0, false, false
	}
	return m, digits, k, neg, true
}

// plainPow10[k] is 10^k, exact in float64 for k ≤ 22.
var plainPow10 = [23]float64{1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10,
	1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22}

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

// The reasons parseNumber gives in more than one place.
const (
	reasonNotNumber     = "is not a number"
	reasonSepNoDigits   = "has a separator with no digits after it"
	reasonTwoNumbers    = "holds more than one number; put one reading in each cell"
	reasonMixedSeps     = "mixes separators in a way that is not a number"
	reasonLimit         = "is a limit, not a reading: enter the measured value, or leave the cell empty and write the limit in the note"
	reasonSignOnly      = "is a sign without a number"
	reasonNoExpDigits   = "has an exponent with no digits"
	reasonTooLarge      = "is too large to be a reading"
	reasonSpacedDigits  = "holds more than one number, or digits split by spaces that are not groups of three"
	reasonBadGroups     = "has thousands separators that do not split the digits into groups of three"
	reasonHexadecimal   = "looks like a hexadecimal number; Pairline reads decimal numbers only"
	reasonNotUnit       = "has characters after the number that are not a unit"
	reasonNotFinite     = "is not a finite number"
	reasonInvalidText   = "holds characters that are not valid text"
	reasonEmpty         = "is empty"
	reasonTooLongPrefix = "is too long to be a reading (more than "
)

// parseNumber implements ParseNumber and ParseNumberHint (the rules are in
// ParseNumber's comment). Its steps, in order: the text itself
// (numberText), the sign (numberSign), the digit groups and their
// separators (numberGroups), the exponent (numberExponent), the unit
// (numberUnit), the decision which separator is the decimal one
// (numberSplit) and the value (numberValue). Each step returns the reason
// for refusing the text, or "". info is filled as the steps learn it, also
// when a later step refuses the text.
func parseNumber(s string, hint numberHint) (float64, numInfo, *NumberError) {
	var info numInfo
	v, reason := readNumber(s, hint, &info)
	if reason != "" {
		return 0, info, &NumberError{Text: s, Reason: reason}
	}
	return v, info, nil
}

func readNumber(s string, hint numberHint, info *numInfo) (float64, string) {
	t, reason := numberText(s)
	if reason != "" {
		return 0, reason
	}
	neg, t, reason := numberSign(t)
	if reason != "" {
		return 0, reason
	}
	// At most 8 groups stay on the stack; longer numbers grow the slices.
	var groupBuf [8]string
	var sepBuf [8]rune
	groups, seps, i := numberGroups(t, groupBuf[:0], sepBuf[:0])
	if len(groups) == 1 && groups[0] == "" {
		return 0, noDigitsReason(t)
	}
	exp, i, reason := numberExponent(t, i)
	if reason != "" {
		return 0, reason
	}
	if reason := numberUnit(t[i:], groups[0], len(seps)); reason != "" {
		return 0, reason
	}
	intGroups, frac, reason := numberSplit(groups, seps, hint, info)
	if reason != "" {
		return 0, reason
	}
	return numberValue(neg, intGroups, frac, exp, len(t))
}

// numberText refuses text that is too long, not valid UTF-8 or blank, and
// returns it without the spaces around it.
func numberText(s string) (string, string) {
	if len(s) > MaxNumberText {
		return "", reasonTooLongPrefix + strconv.Itoa(MaxNumberText) + " characters)"
	}
	if !utf8.ValidString(s) {
		return "", reasonInvalidText
	}
	t := strings.TrimFunc(s, unicode.IsSpace)
	if t == "" {
		return "", reasonEmpty
	}
	return t, ""
}

// numberSign reads a leading '+', '-' or '−' (U+2212) and refuses a limit
// ('<', '>', '≤', '≥') or a sign alone. t is not empty.
func numberSign(t string) (neg bool, rest string, reason string) {
	switch {
	case strings.HasPrefix(t, "+"):
		t = t[1:]
	case strings.HasPrefix(t, "-"):
		neg, t = true, t[1:]
	case strings.HasPrefix(t, "−"):
		neg, t = true, t[len("−"):]
	case isLimitStart(t):
		return false, t, reasonLimit
	}
	if t == "" {
		return neg, t, reasonSignOnly
	}
	return neg, t, ""
}

func isLimitStart(t string) bool {
	for _, p := range [...]string{"<", ">", "≤", "≥"} {
		if strings.HasPrefix(t, p) {
			return true
		}
	}
	return false
}

// numberGroups reads the mantissa at the start of t: digit groups joined by
// separators, each separator followed directly by a digit. It appends the
// groups and the separators' kinds (sepKind) to groups and seps and returns
// them with the index after the last group. There is always one group more
// than separators; only a leading '.' or ',' may have no digits before it.
func numberGroups(t string, groups []string, seps []rune) ([]string, []rune, int) {
	i, start := 0, 0
	for {
		for i < len(t) && isDigit(t[i]) {
			i++
		}
		groups = append(groups, t[start:i])
		r, n := groupSeparator(t, i, start, len(groups))
		if n == 0 {
			return groups, seps, i
		}
		seps = append(seps, sepKind(r))
		i += n
		start = i
	}
}

// groupSeparator returns the separator at t[i:] and its width when it joins
// the group t[start:i] (the ngroups-th) to a next group, else width 0.
func groupSeparator(t string, i, start, ngroups int) (rune, int) {
	if i >= len(t) {
		return 0, 0
	}
	r, n := utf8.DecodeRuneInString(t[i:])
	if !isSep(r) || i+n >= len(t) || !isDigit(t[i+n]) {
		return 0, 0
	}
	if t[start:i] == "" && (ngroups > 1 || (r != '.' && r != ',')) {
		return 0, 0
	}
	return r, n
}

// noDigitsReason says why text after the sign that starts with no digit is
// not a number.
func noDigitsReason(t string) string {
	low := strings.ToLower(t)
	if strings.HasPrefix(low, "nan") || strings.HasPrefix(low, "inf") || strings.HasPrefix(t, "∞") {
		return reasonNotFinite
	}
	if r, _ := utf8.DecodeRuneInString(t); r == '.' || r == ',' {
		return reasonSepNoDigits
	}
	return reasonNotNumber
}

// numberExponent reads an exponent at t[i:]: 'e' or 'E', an optional sign
// ('+', '-', '−') and digits. It returns the exponent as ParseFloat reads
// it ("" when there is none) and the index after it. An 'e' directly
// followed by a letter starts a unit ("2 eV") and is left to numberUnit.
func numberExponent(t string, i int) (exp string, next int, reason string) {
	if i >= len(t) || (t[i] != 'e' && t[i] != 'E') {
		return "", i, ""
	}
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
		return "e" + esign + t[j:k], k, ""
	case j > i+1 || j >= len(t) || !unicode.IsLetter(rune(t[j])):
		return "", i, reasonNoExpDigits
	}
	return "", i, ""
}

// numberUnit checks what follows the number: nothing, or a unit (optionally
// after spaces) that starts with a letter or one of µ ° % ‰ Ω and holds no
// second number after a space. first is the first digit group and nseps the
// number of separators, which tell "0x1F" (hexadecimal) from "0 x".
func numberUnit(rest, first string, nseps int) string {
	spaced := false
	if r := strings.TrimLeftFunc(rest, unicode.IsSpace); len(r) != len(rest) {
		spaced, rest = true, r
	}
	if rest == "" {
		return ""
	}
	r, _ := utf8.DecodeRuneInString(rest)
	switch {
	case startsNumber(r):
		return reasonTwoNumbers
	case (r == 'x' || r == 'X') && !spaced && nseps == 0 && first == "0":
		return reasonHexadecimal
	case r == '.' || r == ',':
		return reasonSepNoDigits
	case !isUnitStart(r):
		return reasonNotUnit
	}
	fs := strings.FieldsFunc(rest, unicode.IsSpace)
	for _, f := range fs[1:] {
		if c, _ := utf8.DecodeRuneInString(f); startsNumber(c) || c == '.' || c == ',' {
			return reasonTwoNumbers
		}
	}
	return ""
}

// startsNumber reports whether r is an ASCII digit or a sign.
func startsNumber(r rune) bool {
	return r < utf8.RuneSelf && isDigit(byte(r)) || r == '+' || r == '-' || r == '−'
}

// sepKinds is the order of the separator kinds in numberSplit's counts.
const sepKinds = ".,' "

// numberSplit decides which separator, if any, is the decimal one. It
// returns the digit groups before the decimal separator and the digits
// after it ("" when there is none), and records the decimal separator and
// the ambiguous form in info.
func numberSplit(groups []string, seps []rune, hint numberHint, info *numInfo) (intGroups []string, frac string, reason string) {
	var kinds [4]int // how often each kind of sepKinds occurs
	nk := 0          // how many kinds occur
	for _, k := range seps {
		ki := strings.IndexRune(sepKinds, k)
		if kinds[ki] == 0 {
			nk++
		}
		kinds[ki]++
	}
	var group rune // the thousands separator's kind, 0 = none
	switch nk {
	case 0:
		return groups, "", ""
	case 1:
		intGroups, frac, group, reason = oneSeparatorKind(groups, seps, hint, info)
		if reason != "" {
			return nil, "", reason
		}
	case 2:
		last := seps[len(seps)-1]
		if (last != '.' && last != ',') || kinds[strings.IndexRune(sepKinds, last)] != 1 {
			return nil, "", reasonMixedSeps
		}
		group = seps[0]
		intGroups, frac = groups[:len(groups)-1], groups[len(groups)-1]
		info.dec = last
	default:
		return nil, "", reasonMixedSeps
	}
	if group != 0 {
		reason = checkGroups(intGroups, group)
	}
	return intGroups, frac, reason
}

// oneSeparatorKind is numberSplit for text with one kind of separator: a
// space or apostrophe, or one that occurs more than once, separates
// thousands; a single '.' or ',' is the decimal separator except in the
// ambiguous form, where the hint decides. It returns the integer groups,
// the fraction digits and the thousands separator's kind (0 for none).
func oneSeparatorKind(groups []string, seps []rune, hint numberHint, info *numInfo) ([]string, string, rune, string) {
	k := seps[0]
	if k == ' ' || k == '\'' || len(seps) > 1 {
		return groups, "", k, ""
	}
	g0, g1 := groups[0], groups[1]
	amb := len(g1) == 3 && len(g0) >= 1 && len(g0) <= 3 && g0[0] != '0'
	info.ambiguous = amb
	if amb {
		switch {
		case k == ',' && hint == hintNone:
			return nil, "", 0, "could mean " + g0 + "." + g1 + " or " + g0 + g1 +
				": type it with a decimal point (" + g0 + "." + g1 + ") or without the separator (" + g0 + g1 + ")"
		case k == ',' && hint == hintDot, k == '.' && hint == hintComma:
			return groups, "", k, ""
		}
	}
	info.dec = k
	return groups[:1], g1, 0, ""
}

// checkGroups refuses integer digits that a thousands separator of kind
// group does not split into a first group of one to three digits and
// further groups of exactly three.
func checkGroups(intGroups []string, group rune) string {
	ok := len(intGroups[0]) >= 1 && len(intGroups[0]) <= 3
	for _, g := range intGroups[1:] {
		ok = ok && len(g) == 3
	}
	switch {
	case ok:
		return ""
	case group == ' ':
		return reasonSpacedDigits
	}
	return reasonBadGroups
}

// numberValue joins the sign, the integer groups, the fraction and the
// exponent into plain decimal text and reads it with strconv.ParseFloat.
// size is the length of the typed text, enough room for the joined one but
// for a leading "-0". An overflow is refused; an underflow gives the
// nearest value (0 or subnormal), as ParseFloat does.
func numberValue(neg bool, intGroups []string, frac, exp string, size int) (float64, string) {
	var b strings.Builder
	b.Grow(size + 2)
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
	if err == nil {
		return v, ""
	}
	if ne, ok := err.(*strconv.NumError); !ok || ne.Err != strconv.ErrRange {
		return 0, reasonNotNumber
	}
	if v > 1 || v < -1 {
		return 0, reasonTooLarge
	}
	return v, ""
}

// SplitRepeats splits the typed readings of one unknown into its repeats:
// at semicolons and at white space (spaces, tabs, new lines), empty pieces
// left out. A comma stays inside a number (a decimal comma). The screen's
// "Use the line" and `pairline fit --inverse-y` both split with it, so the
// same text gives the same repeats in both.
func SplitRepeats(text string) []string {
	return strings.FieldsFunc(text, func(r rune) bool { return r == ';' || unicode.IsSpace(r) })
}
