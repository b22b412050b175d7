package session

import "testing"

// rowEndForward is rowEnd as it was first written, one pass forward over
// the block keeping the quote state: the oracle of the backward search.
func rowEndForward(p []byte) int {
	in, end := false, 0
	for i, c := range p {
		switch c {
		case '"':
			in = !in
		case '\n':
			if !in {
				end = i + 1
			}
		case '\r':
			if !in && i+1 < len(p) && p[i+1] != '\n' {
				end = i + 1
			}
		}
	}
	return end
}

// scanCases are texts cut at every kind of place: line ends of three
// kinds, quotes with line ends inside, a CR at the end, doubled quotes.
var scanCases = []string{
	"", "\n", "\r", "\r\n", "a", "a\nb", "a\rb", "a\r", "a\r\n", "\"a\nb\"\n", "\"a\nb\"\nc",
	"x,\"1\r\n2\"\r\n3,4\r", "\"\"\"\n\"\n", "\"unclosed\nrow\n", "1,2\n\n\r\r\n3,4",
	"x;y\r\n\"a\"\"\rb\";1\r\n2;3\n",
}

// TestRowEndAgainstForward: the backward search finds the forward scan's
// row end on every prefix of the scan cases.
func TestRowEndAgainstForward(t *testing.T) {
	for _, s := range scanCases {
		for i := 0; i <= len(s); i++ {
			p := []byte(s[:i])
			if got, want := rowEnd(p), rowEndForward(p); got != want {
				t.Errorf("rowEnd(%q) = %d, the forward scan %d", p, got, want)
			}
		}
	}
}

// TestLineEndsAgainstLineAt: lineEnds counts what lineAt counts.
func TestLineEndsAgainstLineAt(t *testing.T) {
	for _, s := range scanCases {
		if got, want := lineEnds(s), lineAt(s, len(s))-1; got != want {
			t.Errorf("lineEnds(%q) = %d, lineAt %d", s, got, want)
		}
	}
}

// FuzzRowEnd: rowEnd and lineEnds agree with their oracles on any text.
func FuzzRowEnd(f *testing.F) {
	for _, s := range scanCases {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, p []byte) {
		if got, want := rowEnd(p), rowEndForward(p); got != want {
			t.Fatalf("rowEnd(%q) = %d, the forward scan %d", p, got, want)
		}
		s := string(p)
		if got, want := lineEnds(s), lineAt(s, len(s))-1; got != want {
			t.Fatalf("lineEnds(%q) = %d, lineAt %d", s, got, want)
		}
	})
}
