package session

import (
	"strings"
	"testing"
	"unicode"
	"unicode/utf8"
)

// detectDelimiterOracle is detectDelimiter as it was before it was split
// into stages (cyclomatic complexity 23), kept unchanged as the oracle of
// TestDetectDelimiterMatchesOracle and FuzzDetectDelimiterMatchesOracle.
func detectDelimiterOracle(text string) rune {
	cands := []rune{'\t', ';', ','}
	var counts [][3]int
	var cur [3]int
	inQuote, nonEmpty := false, false
	for i := 0; i < len(text) && len(counts) < 100; i++ {
		c := text[i]
		switch {
		case c == '"':
			inQuote = !inQuote
			nonEmpty = true
		case inQuote:
		case c == '\n' || c == '\r':
			if nonEmpty {
				counts = append(counts, cur)
			}
			cur, nonEmpty = [3]int{}, false
		case c == '\t':
			cur[0]++
		case c == ';':
			cur[1]++
		case c == ',':
			cur[2]++
		case c == ' ' || c == '\v' || c == '\f':
		case c < utf8.RuneSelf:
			nonEmpty = true
		default:
			r, n := utf8.DecodeRuneInString(text[i:])
			if !unicode.IsSpace(r) {
				nonEmpty = true
			}
			i += n - 1
		}
	}
	if nonEmpty && len(counts) < 100 {
		counts = append(counts, cur)
	}
	best, bestScore := ',', 0
	freq := map[int]int{}
	for i, d := range cands {
		clear(freq)
		for _, c := range counts {
			if c[i] > 0 {
				freq[c[i]]++
			}
		}
		score := 0
		for _, f := range freq {
			score = max(score, f)
		}
		if score > bestScore {
			best, bestScore = d, score
		}
	}
	return best
}

func TestDetectDelimiterMatchesOracle(t *testing.T) {
	rows := []string{"a,b,c", "1;2;3", "x\ty", "\"q,;\t\",1", "", "   ", "\u00a0", "é,ü;ø", "1,2\r", "\v\f", "\"open"}
	for _, a := range rows {
		for _, b := range rows {
			for _, sep := range []string{"\n", "\r\n", "\r"} {
				text := a + sep + b + sep + a
				if got, want := detectDelimiter(text), detectDelimiterOracle(text); got != want {
					t.Fatalf("detectDelimiter(%q) = %q, want %q", text, got, want)
				}
			}
		}
	}
	// More than 100 rows: only the first 100 non-blank ones count.
	text := strings.Repeat("1;2\n\n", 100) + strings.Repeat("1,2,3\n", 200)
	if got, want := detectDelimiter(text), detectDelimiterOracle(text); got != want || got != ';' {
		t.Fatalf("detectDelimiter(100 rows of ';' then ','): %q, oracle %q", got, want)
	}
	if got, want := detectDelimiter(""), detectDelimiterOracle(""); got != want {
		t.Fatalf("detectDelimiter(\"\") = %q, want %q", got, want)
	}
}

// FuzzDetectDelimiterMatchesOracle: detectDelimiter chooses what the body
// it was split from chooses, for any text.
func FuzzDetectDelimiterMatchesOracle(f *testing.F) {
	f.Add("a,b\n1,2\n")
	f.Add("x;y\r\n\"1;5\";2\r\n")
	f.Add("\t\u2003\n1\t2")
	f.Fuzz(func(t *testing.T, text string) {
		if got, want := detectDelimiter(text), detectDelimiterOracle(text); got != want {
			t.Fatalf("detectDelimiter(%q) = %q, want %q", text, got, want)
		}
	})
}
