package ui

import (
	"strconv"
	"strings"

	"pairline/fitcore"
)

// One numbering of readings. fitcore names readings by their position
// among the pairs it was given, from 1 ("Readings 9 and 11 stand out"); the
// technician sees the row numbers of the grid, which differ once a blank
// or a left-out row comes before them. rowWords rewrites fitcore's
// sentences once, right after the analysis (renumberReport), so that the
// checks card, the tap panel, the advice and the report all name a reading
// by the one number of its row.

// rowWords rewrites the reading numbers in s: after "Reading " or
// "Readings " (either case), each number of the list that follows ("9",
// "9 and 11", "1, 4, 9, 12, 15 and 3 more") is a position among the pairs
// from 1 and becomes rows[position−1]+1. The count in "… and 3 more" is
// not a reading number and is kept. A number outside rows is kept. The
// cost is linear in len(s).
func rowWords(s string, rows []int) string {
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
		k, list := readingWordEnd(s, i+j)
		b.WriteString(s[i:k])
		i = k
		if list {
			i = rowList(&b, s, i, rows)
		}
	}
	b.WriteString(s[i:])
	return b.String()
}

// readingWordEnd looks at the "eading" at j of s: when it is the word
// "Reading" or "Readings" (either case) followed by a space, it returns the
// index after that space and true (a list of numbers may follow); else the
// index after what was looked at, and false.
func readingWordEnd(s string, j int) (int, bool) {
	if j == 0 || (s[j-1] != 'R' && s[j-1] != 'r') || (j >= 2 && isWordByte(s[j-2])) {
		return j + 6, false
	}
	k := j + 6
	if k < len(s) && s[k] == 's' {
		k++
	}
	if k >= len(s) || s[k] != ' ' {
		return k, false
	}
	return k + 1, true
}

// rowList writes the list of reading numbers at i of s ("9", "9 and 11",
// "1, 4, 9 and 3 more") to b with each number a position among the pairs
// renumbered as a grid row (rowNumber), and returns the index after it.
func rowList(b *strings.Builder, s string, i int, rows []int) int {
	for {
		d := i
		for d < len(s) && s[d] >= '0' && s[d] <= '9' {
			d++
		}
		if d == i || d-i > 9 || s[i] == '0' {
			return i // not a number fitcore writes (none has a leading zero)
		}
		if strings.HasPrefix(s[d:], " more") {
			return i // a count, not a reading
		}
		b.WriteString(rowNumber(s[i:d], rows))
		i = d
		sep := listSep(s[i:])
		if sep == "" || i+len(sep) >= len(s) || s[i+len(sep)] < '0' || s[i+len(sep)] > '9' {
			return i
		}
		b.WriteString(sep)
		i += len(sep)
	}
}

// rowNumber is position num (from 1) as the grid's row number from 1; a
// number outside rows is kept.
func rowNumber(num string, rows []int) string {
	n, _ := strconv.Atoi(num)
	if n >= 1 && n <= len(rows) {
		return strconv.Itoa(rows[n-1] + 1)
	}
	return num
}

// listSep is the separator of a list of numbers that s starts with
// (", " or " and "), or "".
func listSep(s string) string {
	switch {
	case strings.HasPrefix(s, ", "):
		return ", "
	case strings.HasPrefix(s, " and "):
		return " and "
	}
	return ""
}

func isWordByte(c byte) bool {
	return c == '_' || (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || (c >= '0' && c <= '9')
}

// identityRows reports whether fitcore's positions are the grid's rows.
func identityRows(rows []int) bool {
	for i, r := range rows {
		if r != i {
			return false
		}
	}
	return true
}

// renumberReport rewrites the sentences of rep that name readings (the
// assumptions' messages and advice, the tests' messages, the notes, and
// the advice when rep has its own) with the grid's row numbers (rowWords).
// The tests and the assumptions are fitcore's lists (fitcore.CheckList,
// fitcore.AssumptionList), so a new check needs nothing here.
// Call it once per fresh report: a second pass would map the numbers
// again. The numbers of rep are not touched. The unknowns' messages
// ("Reading 2 of this unknown") count an unknown's own repeats and are
// left as they are.
func renumberReport(rep *fitcore.Report, rows []int) {
	if rep == nil || identityRows(rows) {
		return
	}
	renumberAssumptions(&rep.Assumptions, rows)
	for _, ci := range fitcore.CheckList() {
		if c := ci.Get(rep); c != nil {
			c.Message = rowWords(c.Message, rows)
		}
	}
	for i := range rep.Notes {
		rep.Notes[i] = rowWords(rep.Notes[i], rows)
	}
	renumberAdvice(rep.Advice, rows)
}

// renumberAdvice is renumberReport for the advice alone (fitcore.Complete
// adds it to a report whose other sentences were rewritten already).
func renumberAdvice(ad *fitcore.Advice, rows []int) {
	if ad == nil || identityRows(rows) {
		return
	}
	ad.Reason = rowWords(ad.Reason, rows)
	renumberAssumptions(&ad.Before.Assumptions, rows)
	if ad.After != nil {
		renumberAssumptions(&ad.After.Assumptions, rows)
	}
}

// renumberAssumptions rewrites the sentences of every assumption of a, as
// fitcore.AssumptionList lists them.
func renumberAssumptions(a *fitcore.Assumptions, rows []int) {
	for _, as := range fitcore.AssumptionList() {
		if x := as.Of(a); x != nil {
			x.Message, x.Advice = rowWords(x.Message, rows), rowWords(x.Advice, rows)
		}
	}
}
