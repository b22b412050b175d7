package cli

import (
	"fmt"
	"io"
	"strconv"
	"unicode/utf8"

	"pairline/app/wording"
)

// Everything the command prints that came from a file or an argument (CSV
// header names, cell text, session titles, notes, names, units, reasons,
// file names, error details) goes through term, so that escape sequences in
// a file can neither retitle nor clear the terminal nor forge a line of
// output such as "checksum OK". The text summaries make each field visible
// as it is written and pass the whole output through termLines as well.

// term is a field of one line: wording.Visible (control characters,
// newlines included, and bidirectional controls as escapes such as \x1b or
// \u202e).
func term(s string) string { return wording.Visible(s) }

// termLines is a whole text output: every line made visible, the newlines
// between them kept.
func termLines(s string) string { return wording.VisibleLines(s) }

// quoted is a field in quotation marks, made visible.
func quoted(s string) string { return `"` + term(s) + `"` }

// fail writes the one line of an error on stderr: "pairline CMD: " and the
// message, made visible, so that a file name or a value with a newline or
// an escape sequence still gives one readable line.
func fail(stderr io.Writer, cmd string, format string, a ...any) {
	fmt.Fprintf(stderr, "pairline %s: %s\n", cmd, term(fmt.Sprintf(format, a...)))
}

// jsonText escapes in JSON output what encoding/json leaves raw and a
// terminal would obey: DEL, the C1 controls and the bidirectional controls
// become \u escapes. Outside strings JSON is ASCII, so every such character
// is inside a string, where the escape means the same character: the JSON
// decodes to the same values.
func jsonText(b []byte) []byte {
	for i := 0; i < len(b); i++ {
		if b[i] == 0x7f || b[i] >= utf8.RuneSelf {
			return jsonEscape(b, i)
		}
	}
	return b
}

func jsonEscape(b []byte, from int) []byte {
	out := make([]byte, 0, len(b)+16)
	out = append(out, b[:from]...)
	for i := from; i < len(b); {
		r, n := utf8.DecodeRune(b[i:])
		if r == 0x7f || (r >= utf8.RuneSelf && r != utf8.RuneError && wording.Hidden(r)) {
			h := strconv.FormatUint(uint64(r), 16)
			out = append(out, `\u`...)
			for k := len(h); k < 4; k++ {
				out = append(out, '0')
			}
			out = append(out, h...)
		} else {
			out = append(out, b[i:i+n]...)
		}
		i += n
	}
	return out
}
