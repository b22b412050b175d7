package ui

import (
	"strconv"
	"strings"
	"testing"
)

// rowWordsOracle is rowWords as it was written before it was split into
// stages (readingWordEnd, rowList, rowNumber, listSep): one loop, kept as
// the oracle the stages are checked against.
func rowWordsOracle(s string, rows []int) string {
	if !strings.Contains(s, "eading") {
		return s
	}
	var b strings.Builder
	b.Grow(len(s) + 8)
	i := 0
	for i < len(s) {
		j := strings.Index(s[i:], "eading")
		if j < 0 {
			break
		}
		j += i
		// "Reading"/"reading" as a word of its own.
		if j == 0 || (s[j-1] != 'R' && s[j-1] != 'r') || (j >= 2 && isWordByte(s[j-2])) {
			b.WriteString(s[i : j+6])
			i = j + 6
			continue
		}
		k := j + 6
		if k < len(s) && s[k] == 's' {
			k++
		}
		if k >= len(s) || s[k] != ' ' {
			b.WriteString(s[i:k])
			i = k
			continue
		}
		k++
		b.WriteString(s[i:k])
		i = k
		// The list of numbers.
		for {
			d := i
			for d < len(s) && s[d] >= '0' && s[d] <= '9' {
				d++
			}
			if d == i || d-i > 9 || s[i] == '0' {
				break // not a number fitcore writes (none has a leading zero)
			}
			if strings.HasPrefix(s[d:], " more") {
				break // a count, not a reading
			}
			n, _ := strconv.Atoi(s[i:d])
			if n >= 1 && n <= len(rows) {
				b.WriteString(strconv.Itoa(rows[n-1] + 1))
			} else {
				b.WriteString(s[i:d])
			}
			i = d
			sep := ""
			switch {
			case strings.HasPrefix(s[i:], ", "):
				sep = ", "
			case strings.HasPrefix(s[i:], " and "):
				sep = " and "
			}
			if sep == "" || i+len(sep) >= len(s) || s[i+len(sep)] < '0' || s[i+len(sep)] > '9' {
				break
			}
			b.WriteString(sep)
			i += len(sep)
		}
	}
	b.WriteString(s[i:])
	return b.String()
}

// FuzzRowWordsMatchesOracle: the staged rowWords writes what the single
// loop wrote, for any text and any numbering.
func FuzzRowWordsMatchesOracle(f *testing.F) {
	for _, s := range []string{"Readings 9 and 11 stand out.", "Reading 1, 2 and 3 more", "reading 0", "Readings 1, , 2",
		"Reading 99999999999", "Readings 4, 8 and 12. Reading 3 also.", "Rereading 5", "Readings", "readings 7 and ", "xReading 2"} {
		f.Add(s, uint8(3))
	}
	f.Fuzz(func(t *testing.T, s string, shift uint8) {
		rows := make([]int, 40)
		for i := range rows {
			rows[i] = i*2 + int(shift)
		}
		if got, want := rowWords(s, rows), rowWordsOracle(s, rows); got != want {
			t.Fatalf("rowWords(%q) = %q, the single loop wrote %q", s, got, want)
		}
	})
}
