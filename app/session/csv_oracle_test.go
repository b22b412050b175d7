package session

import (
	"fmt"
	"reflect"
	"slices"
	"strings"
	"testing"
	"unicode/utf8"
)

// readTableOracle is readTable as it was before it was split into stages
// (one function of cyclomatic complexity 47), kept unchanged as the oracle
// of TestReadTableMatchesOracle and FuzzReadTableMatchesOracle.
func readTableOracle(text string, opt CSVOptions, warn []string) (*CSVResult, error) {
	res := &CSVResult{Warnings: warn}
	res.Delimiter = opt.Delimiter
	if res.Delimiter == 0 {
		res.Delimiter = detectDelimiter(text)
	}
	if res.Delimiter == '"' || res.Delimiter == '\r' || res.Delimiter == '\n' || !utf8.ValidRune(res.Delimiter) || res.Delimiter == utf8.RuneError {
		return nil, &CSVError{Err: fmt.Errorf("%q cannot separate fields", res.Delimiter)}
	}

	// Pass 1.
	var tc tableCounts
	sc := newCSVScanner(text, res.Delimiter)
	for {
		sc.raw = tc.rows >= 3 // the first three rows are kept as they are read
		fields, line, cerr := sc.next()
		if cerr != nil {
			return nil, cerr
		}
		if fields == nil {
			break
		}
		if isBlankRow(fields) {
			continue
		}
		if tc.rows+1 > MaxReadings+1 {
			return nil, &CSVError{Line: line, Err: fmt.Errorf("%w (at most %d)", ErrCSVManyRows, MaxReadings)}
		}
		tc.add(fields, line, slices.Clone)
	}
	if tc.rows == 0 {
		return nil, &CSVError{Err: ErrCSVNoData}
	}
	ch, err := decideTable(opt, &tc, nil)
	if err != nil {
		return nil, err
	}
	res.Width, res.HasHeader, res.UnitsRow, res.Header, res.Units = tc.width, ch.hasHeader, ch.unitsRow, ch.header, ch.units
	res.PairlineExport, res.NumericColumns, res.XCol, res.YCol = ch.export, ch.numeric, ch.xc, ch.yc
	xc, yc := ch.xc, ch.yc

	// Pass 2: the rows again, split only as far as the columns used (and
	// the preview) need.
	var ex exportExtras
	sc = newCSVScanner(text, res.Delimiter)
	seen, pendingBlank, data := 0, 0, 0
	for {
		if len(res.Rows) >= PreviewRows {
			sc.keep, sc.raw = max(xc, yc)+1, true
			if res.PairlineExport {
				sc.keep = max(sc.keep, 2+len(exportColumns))
			}
		}
		empty, pos, posLine := sc.empty, sc.pos, sc.line
		fields, line, cerr := sc.next()
		if cerr == nil && sc.truncated && isBlankRow(fields) {
			// The cells kept are empty: the whole row decides whether it
			// is blank. Each row is split again at most once.
			sc.pos, sc.line, sc.empty, sc.keep = pos, posLine, empty, 0
			fields, line, cerr = sc.next()
		}
		if cerr != nil {
			return nil, cerr // cannot happen: pass 1 read the same text
		}
		if seen > 0 {
			pendingBlank += sc.empty - empty
		}
		if fields == nil {
			break
		}
		if isBlankRow(fields) {
			if seen > 0 {
				pendingBlank++
			}
			continue
		}
		seen++
		res.Blank += pendingBlank
		pendingBlank = 0
		if seen == 1 && res.HasHeader || seen == 2 && res.UnitsRow {
			continue
		}
		if data++; data > MaxReadings {
			return nil, &CSVError{Line: line, Err: fmt.Errorf("%w (at most %d)", ErrCSVManyRows, MaxReadings)}
		}
		if len(res.Rows) < PreviewRows {
			row := slices.Clone(fields)
			if res.PairlineExport {
				for i, f := range row {
					row[i] = unneutralise(f)
				}
			}
			res.Rows = append(res.Rows, row)
		}
		x, y, why := rowPair(fields, xc, yc, sc.raw, res.PairlineExport)
		if why != "" {
			res.Incomplete++
			res.Skipped = append(res.Skipped, SkippedRow{line, why})
			continue
		}
		res.X = append(res.X, x)
		res.Y = append(res.Y, y)
		res.Lines = append(res.Lines, line)
		if res.PairlineExport {
			ex.add(res, fields, sc.raw, line)
		}
	}
	ex.warn(res)
	res.quantities()

	if opt.DecimalComma != nil {
		res.DecimalComma = *opt.DecimalComma
	} else {
		comma, dot := 0, 0
		for _, cells := range [][]string{res.X, res.Y} {
			for _, c := range cells {
				_, info, err := parseNumber(c, hintDot)
				if err != nil || info.ambiguous {
					continue
				}
				switch info.dec {
				case ',':
					comma++
				case '.':
					dot++
				}
			}
		}
		res.DecimalComma = comma > dot || (comma == dot && res.Delimiter == ';')
		if comma > 0 && dot > 0 {
			used := "points"
			if res.DecimalComma {
				used = "commas"
			}
			res.Warnings = append(res.Warnings, fmt.Sprintf(
				"The columns mix decimal commas (%d cells) and decimal points (%d cells); ambiguous cells such as 1,234 were read with decimal %s. Check the readings.",
				comma, dot, used))
		}
	}
	return res, nil
}

// readTableCases are the texts both readers get in the table test: every
// ReadCSV test table of this package's tests would do; these cover the
// stages (delimiters, header, units row, export, blank rows, the preview
// limit, decimal marks, errors).
func readTableCases() []string {
	var many strings.Builder
	many.WriteString("x;y\n")
	for i := range 150 {
		fmt.Fprintf(&many, "%d,5;%d\n\n", i, 2*i)
	}
	return []string{
		"", "\n\n", "x,y\n", "1,2\n3,4\n", "x,y\n1,2\n\n\n3,4\n\n",
		"stage;flow\nm;m3/s\n0,5;1,2\n0,6;\n;1,4\n0,7;1,6\n",
		"a\tb\tc\n1\t\t2\n3\t4\t5\n",
		"x (µS/cm),y (µS/cm),note,excluded,exclude_reason,taken\n84,83.1,first,false,,2025-03-14T09:00:00Z\n1413,1420,'=1,true,bubble,\n",
		"1,234;5\n2,5;3\n1.5;2\n",
		"x,y\n\"1,5\",2\n\"a\nb\",3\n4,5\n",
		"x,y\n1,2\n\"unterminated\n",
		many.String(),
		strings.Repeat(";;\n", 5) + "1;2\n" + strings.Repeat(" ; \n", 3) + "3;4\n",
	}
}

func TestReadTableMatchesOracle(t *testing.T) {
	comma, dot, yes, no := true, false, true, false
	opts := []CSVOptions{
		{}, {Delimiter: ';'}, {Delimiter: '"'}, {DecimalComma: &comma}, {DecimalComma: &dot},
		{Header: &yes}, {Header: &no}, {XCol: 1, YCol: 0}, {XCol: 0, YCol: 7}, {UnitsRow: &yes}, {PairlineExport: &no},
	}
	for _, text := range readTableCases() {
		for _, opt := range opts {
			got, gerr := readTable(text, opt, []string{"w."})
			want, werr := readTableOracle(text, opt, []string{"w."})
			if fmt.Sprint(gerr) != fmt.Sprint(werr) || !reflect.DeepEqual(got, want) {
				t.Errorf("%q %+v:\n got %+v, %v\nwant %+v, %v", text, opt, got, gerr, want, werr)
			}
		}
	}
}

// FuzzReadTableMatchesOracle: readTable and the body it was split from
// give the same result or the same error, for any text and options.
func FuzzReadTableMatchesOracle(f *testing.F) {
	for _, text := range readTableCases() {
		f.Add(text, uint8(0), uint8(0), int8(0), int8(0))
	}
	f.Add("A\nA\n0,0", uint8(0), uint8(0), int8(-1), int8(-1))
	f.Fuzz(func(t *testing.T, text string, delim, flags uint8, xc, yc int8) {
		var opt CSVOptions
		opt.Delimiter = []rune{0, ',', ';', '\t', '"', '|'}[int(delim)%6]
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
		opt.DecimalComma, opt.Header, opt.UnitsRow, opt.PairlineExport = tri(flags), tri(flags/3), tri(flags/9), tri(flags/27)
		opt.XCol, opt.YCol = int(xc)%12, int(yc)%12
		got, gerr := readTable(text, opt, nil)
		want, werr := readTableOracle(text, opt, nil)
		if fmt.Sprint(gerr) != fmt.Sprint(werr) || !reflect.DeepEqual(got, want) {
			t.Fatalf("%q %+v:\n got %+v, %v\nwant %+v, %v", text, opt, got, gerr, want, werr)
		}
	})
}
