package session

import (
	"errors"
	"fmt"
	"reflect"
	"slices"
	"testing"
)

// decideTableOracle is decideTable as it was before it was split into
// stages (one function of cyclomatic complexity 39), kept unchanged as the
// oracle of TestDecideTableMatchesOracle and FuzzDecideTableMatchesOracle.
func decideTableOracle(opt CSVOptions, tc *tableCounts, columns func(header []string) (int, int, error)) (tableChoice, error) {
	var ch tableChoice
	numbers := func(f []string) int {
		n := 0
		for _, c := range f {
			if isNumberCell(c) {
				n++
			}
		}
		return n
	}
	hasText := false
	for _, c := range tc.first {
		if !isBlank(c) && !isNumberCell(c) {
			hasText = true
		}
	}
	// A units row: text only, short cells, and numbers in the row after it.
	looksUnits := tc.rows >= 3 && isUnitsRow(tc.second) && numbers(tc.third) > numbers(tc.first)
	if opt.Header != nil {
		ch.hasHeader = *opt.Header
	} else {
		ch.hasHeader = hasText && (tc.rows == 1 || numbers(tc.second) > numbers(tc.first) || looksUnits)
	}
	if ch.hasHeader {
		if opt.UnitsRow != nil {
			ch.unitsRow = *opt.UnitsRow && tc.rows >= 2
		} else {
			ch.unitsRow = looksUnits
		}
	}
	if ch.unitsRow {
		ch.units = tc.second
		tc.count(tc.second, -1) // the units row was counted as data
		if tc.rows == 2 {
			return ch, &CSVError{Line: tc.firstLine, Err: fmt.Errorf("%w: there are only a header row and a units row", ErrCSVNoData)}
		}
	}
	if ch.hasHeader {
		ch.header = tc.first
	} else {
		tc.count(tc.first, 1)
	}
	if ch.hasHeader && tc.rows == 1 {
		return ch, &CSVError{Line: tc.firstLine, Err: fmt.Errorf("%w: there is only a header row", ErrCSVNoData)}
	}
	if opt.PairlineExport != nil {
		ch.export = *opt.PairlineExport
	} else {
		ch.export = ch.hasHeader && isPairlineExport(ch.header)
	}
	if ch.export && ch.hasHeader {
		for i, h := range ch.header {
			ch.header[i] = unneutralise(h)
		}
	}
	for c := range tc.filled {
		if tc.nums[c] > 0 && 2*tc.nums[c] >= tc.filled[c] {
			ch.numeric = append(ch.numeric, c)
		}
	}
	xc, yc := opt.XCol, opt.YCol
	if columns != nil {
		var err error
		if xc, yc, err = columns(ch.header); err != nil {
			return ch, err
		}
	}
	if xc == yc {
		xc, yc = DetectColumn, DetectColumn
	}
	for _, c := range []int{xc, yc} {
		if c >= tc.width {
			return ch, &CSVError{Err: fmt.Errorf("%w: column %d (the file has %d columns)", ErrCSVNoColumn, c+1, tc.width)}
		}
	}
	pick := func(not int) int {
		for _, c := range ch.numeric {
			if c != not {
				return c
			}
		}
		return DetectColumn
	}
	if xc < 0 {
		xc = pick(yc)
	}
	if yc < 0 {
		yc = pick(xc)
	}
	if xc < 0 || yc < 0 {
		return ch, &CSVError{Err: ErrCSVColumns}
	}
	ch.xc, ch.yc = xc, yc
	return ch, nil
}

// firstPassCounts is the first pass of readTable over text: the counts
// decideTable starts from, or false when the text is no table (an error or
// no row).
func firstPassCounts(text string, delim rune) (*tableCounts, bool) {
	var tc tableCounts
	sc := newCSVScanner(text, delim)
	for {
		sc.raw = tc.rows >= 3
		fields, line, cerr := sc.next()
		if cerr != nil {
			return nil, false
		}
		if fields == nil {
			break
		}
		if !isBlankRow(fields) {
			tc.add(fields, line, slices.Clone)
		}
	}
	return &tc, tc.rows > 0
}

// cloneCounts copies tc deeply: decideTable changes the counts and the
// header's cells.
func cloneCounts(tc *tableCounts) *tableCounts {
	c := *tc
	c.first, c.second, c.third = slices.Clone(tc.first), slices.Clone(tc.second), slices.Clone(tc.third)
	c.filled, c.nums = slices.Clone(tc.filled), slices.Clone(tc.nums)
	return &c
}

// columnChoosers are the kinds of columns argument decideTable is given:
// none, fixed columns, an error, and columns found by the header's names
// (as StreamCSV's callers choose them).
func columnChoosers(a, b int) []func([]string) (int, int, error) {
	return []func([]string) (int, int, error){
		nil,
		func([]string) (int, int, error) { return a, b, nil },
		func([]string) (int, int, error) { return 0, 0, errors.New("no such column") },
		func(h []string) (int, int, error) { return slices.Index(h, "x"), slices.Index(h, "y"), nil },
	}
}

// sameDecision reports whether decideTable and its oracle decide alike on
// text: the same choice, the same error, and the same counts afterwards.
func sameDecision(text string, opt CSVOptions, columns func([]string) (int, int, error)) (got, want string, same bool) {
	tc, ok := firstPassCounts(text, opt.Delimiter)
	if !ok {
		return "", "", true
	}
	gtc, wtc := cloneCounts(tc), cloneCounts(tc)
	gch, gerr := decideTable(opt, gtc, columns)
	wch, werr := decideTableOracle(opt, wtc, columns)
	got, want = fmt.Sprintf("%+v %v %+v", gch, gerr, *gtc), fmt.Sprintf("%+v %v %+v", wch, werr, *wtc)
	return got, want, got == want && reflect.DeepEqual(gch, wch) && reflect.DeepEqual(gtc, wtc)
}

// decideCases are readTable's texts and tables that reach each rule: a
// header with and without units, only a header (and units), a Pairline
// export header with neutralised names, columns of text, of numbers and
// of both.
func decideCases() []string {
	return append(readTableCases(),
		"x,y\n", "x,y\nmV,mg/L\n", "x,y\nmV,mg/L\n1,2\n", "x,y\nmV,mg/L\n1,2\n3,4\n", "a,b,c\n1,t,3\n4,u,6\nv,w,x\n",
		"x,y,note,excluded,exclude_reason,taken\n'=1,2,'+a,no,,\n", "'=x,y,note,excluded,exclude_reason,taken\n1,2,,,,\n",
		"1,2\n", "1\n2\n3\n", "a\nb\n1\n", "x,y\n1\n2,3,4\n", "y,x\n1,2\n3,4\n", ",\n,\n1,\n")
}

func TestDecideTableMatchesOracle(t *testing.T) {
	yes, no := true, false
	opts := []CSVOptions{
		{}, {Header: &yes}, {Header: &no}, {UnitsRow: &yes}, {UnitsRow: &no}, {Header: &yes, UnitsRow: &yes},
		{PairlineExport: &yes}, {PairlineExport: &no}, {Header: &yes, PairlineExport: &yes},
		{XCol: 1, YCol: 0}, {XCol: 0, YCol: 7}, {XCol: 2, YCol: 2}, {XCol: -1, YCol: 1}, {XCol: 0, YCol: -1},
	}
	for _, text := range decideCases() {
		for _, opt := range opts {
			opt.Delimiter = detectDelimiter(text)
			for i, columns := range columnChoosers(1, 0) {
				if got, want, same := sameDecision(text, opt, columns); !same {
					t.Errorf("%q %+v columns %d:\n got %s\nwant %s", text, opt, i, got, want)
				}
			}
		}
	}
}

// FuzzDecideTableMatchesOracle: decideTable and the body it was split from
// decide alike (choice, error, counts afterwards) on the first pass of any
// text, with any options and any kind of column chooser.
func FuzzDecideTableMatchesOracle(f *testing.F) {
	for _, text := range decideCases() {
		f.Add(text, uint8(0), int8(0), int8(0), uint8(0))
	}
	f.Fuzz(func(t *testing.T, text string, flags uint8, xc, yc int8, chooser uint8) {
		tri := func(k uint8) *bool {
			switch k % 3 {
			case 1:
				v := true
				return &v
			case 2:
				v := false
				return &v
			}
			return nil
		}
		opt := CSVOptions{Delimiter: detectDelimiter(text), Header: tri(flags), UnitsRow: tri(flags / 3), PairlineExport: tri(flags / 9)}
		opt.XCol, opt.YCol = int(xc)%12, int(yc)%12
		columns := columnChoosers(int(xc/12), int(yc/12))[int(chooser)%4]
		if got, want, same := sameDecision(text, opt, columns); !same {
			t.Fatalf("%q %+v columns %d:\n got %s\nwant %s", text, opt, chooser%4, got, want)
		}
	})
}
