package session

import (
	"fmt"
	"reflect"
	"strings"
	"testing"
)

// nextOracle is csvScanner.next as it was before it was split into stages
// (one function of cyclomatic complexity 43), kept unchanged as the oracle
// of TestCSVScannerMatchesOracle and FuzzCSVScannerMatchesOracle.
func (s *csvScanner) nextOracle() (fields []string, line int, err *CSVError) {
	t, d := s.text, s.delim
	// Empty lines are blank rows; they are passed over here at a few
	// nanoseconds each and counted in s.empty.
	for s.pos < len(t) && (t[s.pos] == '\n' || t[s.pos] == '\r') {
		if t[s.pos] == '\r' && s.pos+1 < len(t) && t[s.pos+1] == '\n' {
			s.pos++
		}
		s.pos++
		s.line++
		s.empty++
	}
	if s.pos >= len(t) {
		return nil, 0, nil
	}
	line = s.line
	s.fields = s.fields[:0]
	s.truncated = false
	for {
		start := s.pos
		if len(s.fields) == MaxCSVFields {
			return nil, line, &CSVError{Line: s.line, Column: columnAt(t, start),
				Err: fmt.Errorf("%w (at most %d cells in a row)", ErrCSVManyFields, MaxCSVFields)}
		}
		var f string
		if start < len(t) && t[start] == '"' {
			startLine := s.line
			var unq []byte // the field without its doubled quotes, when it has any
			doubled := false
			i, seg := start+1, start+1
			for {
				j := strings.IndexByte(t[i:], '"')
				if j < 0 {
					return nil, line, &CSVError{Line: startLine,
						Err: fmt.Errorf("%w (the quoted value that starts on this line is never closed)", ErrCSVQuote)}
				}
				s.countLines(t[i : i+j])
				i += j
				if i-start > MaxCSVFieldLen {
					return nil, line, &CSVError{Line: startLine, Column: columnAt(t, start),
						Err: fmt.Errorf("%w (at most %d bytes in a cell)", ErrCSVLongField, MaxCSVFieldLen)}
				}
				if i+1 < len(t) && t[i+1] == '"' {
					doubled = true
					if !s.raw {
						unq = append(unq, t[seg:i+1]...)
					}
					i += 2
					seg = i
					continue
				}
				break
			}
			switch {
			case doubled && s.raw:
				f = t[start : i+1]
			case doubled:
				f = string(append(unq, t[seg:i]...))
			default:
				f = t[seg:i]
			}
			s.pos = i + 1
			if s.pos < len(t) && t[s.pos] != '\n' && t[s.pos] != '\r' && !s.atDelim(s.pos) {
				return nil, line, &CSVError{Line: s.line, Column: columnAt(t, s.pos),
					Err: fmt.Errorf("%w (extra text after a closing quote)", ErrCSVQuote)}
			}
		} else {
			// The field ends at a line end or the delimiter; a quote inside
			// it is an error. The scan stops one byte past the longest
			// field allowed.
			stop := min(len(t), start+MaxCSVFieldLen+1)
			i := start
			for i < stop && !s.special[t[i]] {
				i++
			}
			for i < stop && t[i] != '\n' && t[i] != '\r' && !s.atDelim(i) {
				if t[i] == '"' {
					return nil, line, &CSVError{Line: s.line, Column: columnAt(t, i),
						Err: fmt.Errorf("%w (a quote mark inside a value that does not start with one)", ErrCSVQuote)}
				}
				i++ // a byte that starts like a delimiter of several bytes
				for i < stop && !s.special[t[i]] {
					i++
				}
			}
			if i-start > MaxCSVFieldLen {
				return nil, line, &CSVError{Line: s.line, Column: columnAt(t, start),
					Err: fmt.Errorf("%w (at most %d bytes in a cell)", ErrCSVLongField, MaxCSVFieldLen)}
			}
			f = t[start:i]
			s.pos = i
		}
		s.fields = append(s.fields, f)
		if len(s.fields) == s.keep && s.pos < len(t) && s.atDelim(s.pos) {
			s.skipRest()
		}
		switch {
		case s.pos >= len(t):
			return s.fields, line, nil
		case t[s.pos] == '\n':
			s.pos++
			s.line++
			return s.fields, line, nil
		case t[s.pos] == '\r':
			s.pos++
			if s.pos < len(t) && t[s.pos] == '\n' {
				s.pos++
			}
			s.line++
			return s.fields, line, nil
		}
		s.pos += len(d) // the delimiter
	}
}

// scannerState is what a call of next leaves behind besides its result:
// the callers (readTable, StreamCSV) read pos, line, empty and truncated.
type scannerState struct {
	Pos, Line, Empty int
	Truncated        bool
}

func (s *csvScanner) state() scannerState {
	return scannerState{s.pos, s.line, s.empty, s.truncated}
}

// scannerRun is every row, line, error and state after each call of next
// (or of nextOracle) on text, with keep and raw set as readTable's second
// pass sets them.
func scannerRun(text string, delim rune, keep int, raw, oracle bool) []string {
	s := newCSVScanner(text, delim)
	s.keep, s.raw = keep, raw
	var out []string
	for range len(text) + 2 {
		var fields []string
		var line int
		var err *CSVError
		if oracle {
			fields, line, err = s.nextOracle()
		} else {
			fields, line, err = s.next()
		}
		out = append(out, fmt.Sprintf("%q %d %v %+v", fields, line, err, s.state()))
		if fields == nil || err != nil {
			break
		}
	}
	return out
}

// scannerCases are the texts of readTable's test and small ones of every
// kind of field and line end; with long, the texts at the limits (a row of
// MaxCSVFields cells, fields of MaxCSVFieldLen bytes), which the fuzz test
// leaves out of its seeds: mutating texts of 64 KiB is slow.
func scannerCases(long bool) []string {
	cases := append(readTableCases(),
		"a,b\r\nc,d\re,f\n\r\n\r\r\n", `"a""b",c`+"\n"+`"x""""",""`, `"a"b,c`, `a"b,c`, `"never`, "\"a\nb\r\nc\",d\n",
		`"a"`+"\r", `""`, `,,,`, "\n,\n", "a;;b||c", "a||b|c||\n\"x\"||\"y\"|")
	if !long {
		return cases
	}
	return append(cases, strings.Repeat("a,", MaxCSVFields+1), strings.Repeat(",", MaxCSVFields-1)+"\n",
		strings.Repeat("x", MaxCSVFieldLen)+",y", strings.Repeat("x", MaxCSVFieldLen+1)+",y",
		`"`+strings.Repeat("x", MaxCSVFieldLen-1)+`",y`, `"`+strings.Repeat("x", MaxCSVFieldLen)+`",y`,
		`"`+strings.Repeat(`""`, MaxCSVFieldLen/2)+`",y`, `"`+strings.Repeat("\n", MaxCSVFieldLen+1)+`"`)
}

func TestCSVScannerMatchesOracle(t *testing.T) {
	for _, text := range scannerCases(true) {
		for _, delim := range []rune{',', ';', '\t', '|', 'µ', '→'} {
			for _, keep := range []int{0, 1, 2, 3} {
				for _, raw := range []bool{false, true} {
					got := scannerRun(text, delim, keep, raw, false)
					want := scannerRun(text, delim, keep, raw, true)
					if !reflect.DeepEqual(got, want) {
						t.Errorf("%.80q delim %q keep %d raw %v:\n got %q\nwant %q", text, delim, keep, raw, got, want)
					}
				}
			}
		}
	}
}

// FuzzCSVScannerMatchesOracle: next and the body it was split from give
// the same rows, lines, errors and scanner state, for any text, delimiter
// (of one byte or several), keep and raw.
func FuzzCSVScannerMatchesOracle(f *testing.F) {
	for _, text := range scannerCases(false) {
		f.Add(text, uint8(0), uint8(0))
	}
	f.Fuzz(func(t *testing.T, text string, delim, flags uint8) {
		d := []rune{',', ';', '\t', '|', 'µ', '→', ' ', 'a'}[int(delim)%8]
		keep, raw := int(flags%5), flags&8 != 0
		got := scannerRun(text, d, keep, raw, false)
		want := scannerRun(text, d, keep, raw, true)
		if !reflect.DeepEqual(got, want) {
			t.Fatalf("%q delim %q keep %d raw %v:\n got %q\nwant %q", text, d, keep, raw, got, want)
		}
	})
}

// BenchmarkCSVScanner reads 10,000 rows of three fields (one of them
// quoted, one with doubled quotes) with next and with the body it was
// split from: the split must not make the reading slower.
func BenchmarkCSVScanner(b *testing.B) {
	var sb strings.Builder
	for i := range 10000 {
		fmt.Fprintf(&sb, "%d.5,\"%d,25\",\"a \"\"b\"\"\"\r\n", i, 2*i)
	}
	text := sb.String()
	for _, oracle := range []bool{false, true} {
		b.Run(map[bool]string{false: "next", true: "oracle"}[oracle], func(b *testing.B) {
			b.SetBytes(int64(len(text)))
			for b.Loop() {
				s := newCSVScanner(text, ',')
				for {
					var fields []string
					if oracle {
						fields, _, _ = s.nextOracle()
					} else {
						fields, _, _ = s.next()
					}
					if fields == nil {
						break
					}
				}
			}
		})
	}
}
