package wording

import (
	"strings"
	"unicode/utf8"
)

// Visible shows text read from a file (a title, a note, a column header, a
// file name) so that it can only be read, never act: every character that a
// terminal or a page would obey instead of showing is replaced by a visible
// escape. Replaced are the C0 controls U+0000–U+001F (tab and newline too:
// a name is shown on one line), DEL U+007F and the C1 controls
// U+0080–U+009F (ESC and CSI start the sequences that retitle, clear or
// rewrite a terminal), the bidirectional controls (U+061C, U+200E, U+200F,
// U+202A–U+202E, U+2066–U+2069, which reorder what follows them; Unicode
// TR #9), the line and paragraph separators U+2028/U+2029, and bytes that
// are not UTF-8. Bytes below 0x80 are written \xNN, other characters \uNNNN
// (lower-case hex, as Go and C write them), invalid bytes \xNN.
// A backslash itself is kept, so Windows paths read as typed. Text without
// such characters is returned unchanged and not copied.
func Visible(s string) string {
	i := firstHidden(s)
	if i < 0 {
		return s
	}
	var b strings.Builder
	b.Grow(len(s) + 8)
	b.WriteString(s[:i])
	for i < len(s) {
		r, n := utf8.DecodeRuneInString(s[i:])
		switch {
		case r == utf8.RuneError && n == 1:
			writeHex(&b, `\x`, uint32(s[i]), 2)
		case r < 0x20 || r == 0x7f:
			writeHex(&b, `\x`, uint32(r), 2)
		case acts(r):
			writeHex(&b, `\u`, uint32(r), 4)
		default:
			b.WriteString(s[i : i+n])
		}
		i += n
	}
	return b.String()
}

// firstHidden is the byte offset of the first character Visible replaces,
// or −1. Valid UTF-8 (the usual case) is scanned byte by byte: every
// character Visible replaces is ASCII or starts with 0xC2 (C1 controls),
// 0xD8 (U+061C) or 0xE2 (U+200E … U+2069).
func firstHidden(s string) int {
	if !utf8.ValidString(s) {
		return firstHiddenSlow(s)
	}
	for i := 0; i < len(s); i++ {
		switch c := s[i]; {
		case c < 0x20 || c == 0x7f:
			return i
		case c == 0xc2 || c == 0xd8 || c == 0xe2:
			if r, _ := utf8.DecodeRuneInString(s[i:]); acts(r) {
				return i
			}
		}
	}
	return -1
}

// firstHiddenSlow is firstHidden for text with bytes that are not UTF-8.
func firstHiddenSlow(s string) int {
	for i := 0; i < len(s); {
		r, n := utf8.DecodeRuneInString(s[i:])
		if (r == utf8.RuneError && n == 1) || r < 0x20 || r == 0x7f || acts(r) {
			return i
		}
		i += n
	}
	return -1
}

// Hidden reports whether Visible replaces the character r: a control
// character, a bidirectional control or a line or paragraph separator.
func Hidden(r rune) bool { return r < 0x20 || r == 0x7f || acts(r) }

// acts reports the non-ASCII characters Visible replaces.
func acts(r rune) bool {
	switch {
	case r >= 0x80 && r <= 0x9f: // C1 controls
		return true
	case r == 0x061c, r == 0x200e, r == 0x200f: // ALM, LRM, RLM
		return true
	case r >= 0x202a && r <= 0x202e: // LRE RLE PDF LRO RLO
		return true
	case r >= 0x2066 && r <= 0x2069: // LRI RLI FSI PDI
		return true
	case r == 0x2028 || r == 0x2029:
		return true
	}
	return false
}

func writeHex(b *strings.Builder, prefix string, v uint32, width int) {
	const hex = "0123456789abcdef"
	b.WriteString(prefix)
	for k := width - 1; k >= 0; k-- {
		b.WriteByte(hex[(v>>(4*k))&0xf])
	}
}

// VisibleLines is Visible for text of several lines: each line is made
// visible and the newlines between them are kept. It is the last pass over
// a whole output, behind the escaping of every field.
func VisibleLines(s string) string {
	if firstHidden(strings.ReplaceAll(s, "\n", " ")) < 0 {
		return s
	}
	lines := strings.Split(s, "\n")
	for i, l := range lines {
		lines[i] = Visible(l)
	}
	return strings.Join(lines, "\n")
}
