package session

import (
	"bytes"
	"errors"
	"fmt"
	"reflect"
	"strconv"
	"strings"
	"testing"
	"time"
	"unicode/utf16"
)

func bp(b bool) *bool { return &b }

func TestReadCSV(t *testing.T) {
	// Invented readings (Larkwater Valley Water Board, invented).
	tests := []struct {
		name         string
		in           string
		opt          CSVOptions
		delim        rune
		decimalComma bool
		header       bool
		x, y         []string
		lines        []int
		blank, inc   int
	}{
		{name: "plain comma with header", in: "Standard,Reading\n0,0.1\n5,5.2\n10,9.9\n",
			delim: ',', header: true, x: []string{"0", "5", "10"}, y: []string{"0.1", "5.2", "9.9"}, lines: []int{2, 3, 4}},
		{name: "semicolon and decimal comma, BOM, CRLF", in: "\ufeffx;y\r\n0,5;1,25\r\n1,5;2,75\r\n",
			delim: ';', decimalComma: true, header: true, x: []string{"0,5", "1,5"}, y: []string{"1,25", "2,75"}, lines: []int{2, 3}},
		{name: "tab, no header", in: "1\t2\n3\t4\n", delim: '\t', x: []string{"1", "3"}, y: []string{"2", "4"}, lines: []int{1, 2}},
		{name: "quotes and units", in: "\"Std, mg/L\",\"Read\"\n\"1,5\",\"1,4 mg/L\"\n\"2,5\",\"2,6 mg/L\"\n",
			delim: ',', decimalComma: true, header: true, x: []string{"1,5", "2,5"}, y: []string{"1,4 mg/L", "2,6 mg/L"}, lines: []int{2, 3}},
		{name: "blank and incomplete rows", in: "x,y\n1,2\n\n,,\n3\n4,\n5,6\n",
			delim: ',', header: true, x: []string{"1", "5"}, y: []string{"2", "6"}, lines: []int{2, 7}, blank: 2, inc: 2},
		{name: "first two numeric columns", in: "id,note,std,read\nA,ok,1,1.1\nB,ok,2,2.1\n",
			delim: ',', header: true, x: []string{"1", "2"}, y: []string{"1.1", "2.1"}, lines: []int{2, 3}},
		{name: "chosen columns", in: "a,b,c\n1,2,3\n4,5,6\n", opt: CSVOptions{XCol: 2, YCol: 0},
			delim: ',', header: true, x: []string{"3", "6"}, y: []string{"1", "4"}, lines: []int{2, 3}},
		{name: "invalid cells kept", in: "1;2\n3;n/a\n5;6\n", delim: ';', decimalComma: true,
			x: []string{"1", "3", "5"}, y: []string{"2", "n/a", "6"}, lines: []int{1, 2, 3}},
		{name: "thousands with point decimals", in: "x,y\n\"1,000.5\",2\n\"2,000.5\",4\n", delim: ',', header: true,
			x: []string{"1,000.5", "2,000.5"}, y: []string{"2", "4"}, lines: []int{2, 3}},
		{name: "forced options", in: "1,234;2\n", opt: CSVOptions{Delimiter: ';', DecimalComma: bp(false), Header: bp(false)},
			delim: ';', x: []string{"1,234"}, y: []string{"2"}, lines: []int{1}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			res, err := ReadCSV(strings.NewReader(tc.in), tc.opt)
			if err != nil {
				t.Fatal(err)
			}
			if res.Delimiter != tc.delim || res.DecimalComma != tc.decimalComma || res.HasHeader != tc.header {
				t.Errorf("delimiter %q, decimal comma %v, header %v; want %q, %v, %v",
					res.Delimiter, res.DecimalComma, res.HasHeader, tc.delim, tc.decimalComma, tc.header)
			}
			if !reflect.DeepEqual(res.X, tc.x) || !reflect.DeepEqual(res.Y, tc.y) || !reflect.DeepEqual(res.Lines, tc.lines) {
				t.Errorf("x %q y %q lines %v; want %q %q %v", res.X, res.Y, res.Lines, tc.x, tc.y, tc.lines)
			}
			if res.Blank != tc.blank || res.Incomplete != tc.inc || len(res.Skipped) != tc.inc {
				t.Errorf("blank %d incomplete %d skipped %v; want %d, %d", res.Blank, res.Incomplete, res.Skipped, tc.blank, tc.inc)
			}
		})
	}
}

func TestReadCSVErrors(t *testing.T) {
	tests := []struct {
		name       string
		in         string
		opt        CSVOptions
		want       error
		line, col  int
		inSentence string
	}{
		{"unclosed quote", "x,y\n1,\"2\n3,4\n", CSVOptions{}, ErrCSVQuote, 2, 0, "never closed"},
		{"bare quote", "x,y\n1,2\"x\n", CSVOptions{}, ErrCSVQuote, 2, 4, "quote mark"},
		{"empty", "\n\n", CSVOptions{}, ErrCSVNoData, 0, 0, "no readings"},
		{"header only", "x,y\n", CSVOptions{Header: bp(true)}, ErrCSVNoData, 1, 0, "only a header"},
		{"one column", "1\n2\n3\n", CSVOptions{}, ErrCSVColumns, 0, 0, "two columns"},
		{"missing column", "1,2\n", CSVOptions{XCol: 0, YCol: 5}, ErrCSVNoColumn, 0, 0, "column 6"},
		{"binary", "PAIRLN\x00\xa7", CSVOptions{}, ErrCSVNotText, 1, 0, "not a text table"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := ReadCSV(strings.NewReader(tc.in), tc.opt)
			var ce *CSVError
			if !errors.As(err, &ce) || !errors.Is(err, tc.want) {
				t.Fatalf("got %v; want a *CSVError wrapping %v", err, tc.want)
			}
			if ce.Line != tc.line || ce.Column != tc.col || !strings.Contains(err.Error(), tc.inSentence) {
				t.Errorf("got line %d column %d %q; want %d, %d, containing %q", ce.Line, ce.Column, err, tc.line, tc.col, tc.inSentence)
			}
		})
	}
}

func TestReadCSVEncodings(t *testing.T) {
	text := "Std (µS/cm)\tRead\r\n1,5\t1,6\r\n2,5\t2,4\r\n"
	u := utf16.Encode([]rune(text))
	le := []byte{0xff, 0xfe}
	for _, c := range u {
		le = append(le, byte(c), byte(c>>8))
	}
	res, err := ReadCSV(bytes.NewReader(le), CSVOptions{})
	if err != nil || res.Header[0] != "Std (µS/cm)" || !reflect.DeepEqual(res.X, []string{"1,5", "2,5"}) || !res.DecimalComma {
		t.Errorf("UTF-16LE: %+v, %v", res, err)
	}
	latin1 := []byte("Std (\xb5S/cm);Read\n1;2\n3;4\n")
	res, err = ReadCSV(bytes.NewReader(latin1), CSVOptions{})
	if err != nil || res.Header[0] != "Std (µS/cm)" || len(res.Warnings) != 1 {
		t.Errorf("Latin-1: %+v, %v", res, err)
	}
}

func TestReadPaste(t *testing.T) {
	// As a spreadsheet puts two selected columns on the clipboard.
	res, err := ReadPaste("0,10\t0,12\n0,20\t0,19\n0,30\t0,33\n", CSVOptions{})
	if err != nil {
		t.Fatal(err)
	}
	x, y, lines, problems := ParsedPairs(res)
	if !reflect.DeepEqual(x, []float64{0.1, 0.2, 0.3}) || !reflect.DeepEqual(y, []float64{0.12, 0.19, 0.33}) ||
		!reflect.DeepEqual(lines, []int{1, 2, 3}) || len(problems) != 0 {
		t.Errorf("x %v y %v lines %v problems %v", x, y, lines, problems)
	}
}

func TestWriteReadRoundTrip(t *testing.T) {
	s := sampleSessions(t)[0]
	if err := s.SetCell(0, ColumnNote, "=1+1 \"quoted\", with comma\nand a new line", time.Date(2025, 3, 14, 9, 0, 0, 0, time.UTC)); err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if err := WriteReadingsCSV(&buf, s); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(buf.String(), `"'=1+1 ""quoted"", with comma`) {
		t.Errorf("the note is not neutralised and quoted in\n%s", buf.String())
	}
	res, err := ReadCSV(&buf, CSVOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if !res.HasHeader || res.Header[0] != "Standard (µS/cm)" || res.XCol != 0 || res.YCol != 1 {
		t.Fatalf("header %q, columns %d %d", res.Header, res.XCol, res.YCol)
	}
	var wantX, wantY []string
	for _, r := range s.Readings {
		if r.X != "" && r.Y != "" {
			wantX, wantY = append(wantX, r.X), append(wantY, r.Y)
		}
	}
	if !reflect.DeepEqual(res.X, wantX) || !reflect.DeepEqual(res.Y, wantY) || res.Incomplete != 1 {
		t.Errorf("x %q y %q incomplete %d; want %q %q 1", res.X, res.Y, res.Incomplete, wantX, wantY)
	}
	if got := res.Rows[0][2]; !res.PairlineExport || got != s.Readings[0].Note {
		t.Errorf("note %q (Pairline's export: %v); want it read back as typed", got, res.PairlineExport)
	}
	if res.Rows[3][3] != "yes" || res.Rows[3][4] != s.Readings[3].ExcludeReason {
		t.Errorf("exclusion %q", res.Rows[3])
	}
	// Re-importing Pairline's own export restores the readings as they
	// were: cells, notes, exclusions with their reasons, times, and the
	// names and units of x and y.
	s2, _ := New("re-import (invented)", time.Date(2025, 3, 15, 0, 0, 0, 0, time.UTC), &counter{})
	if _, err := s2.Import(res, time.Date(2025, 3, 15, 0, 0, 0, 0, time.UTC)); err != nil {
		t.Fatal(err)
	}
	var fields []string
	for _, e := range s2.History {
		fields = append(fields, e.Field)
	}
	if want := []string{FieldDecimalComma, FieldXName, FieldXUnit, FieldYName, FieldYUnit, EditImport}; !reflect.DeepEqual(fields, want) ||
		!strings.Contains(s2.History[5].New, "1 left out with their reasons") {
		t.Errorf("history %q (%+v); want %q", fields, s2.History, want)
	}
	if s2.XName != s.XName || s2.XUnit != s.XUnit || s2.YName != s.YName || s2.YUnit != s.YUnit {
		t.Errorf("names and units %q %q %q %q; want %q %q %q %q", s2.XName, s2.XUnit, s2.YName, s2.YUnit, s.XName, s.XUnit, s.YName, s.YUnit)
	}
	var want []Reading
	for _, r := range s.Readings {
		if r.X != "" && r.Y != "" {
			want = append(want, r)
		}
	}
	if !reflect.DeepEqual(s2.Readings, want) {
		t.Errorf("re-imported readings\n%+v\nwant\n%+v", s2.Readings, want)
	}
	x1, y1, _, _ := s.Pairs()
	x2, y2, _, _ := s2.Pairs()
	if !reflect.DeepEqual(x1[:len(x2)], x2) || !reflect.DeepEqual(y1[:len(y2)], y2) {
		t.Errorf("session pairs %v %v, re-imported %v %v", x1, y1, x2, y2)
	}
}

// TestUnitsRow: a header followed by a units row gives the quantities'
// names and units, not two readings that are not numbers.
func TestUnitsRow(t *testing.T) {
	no := false
	tests := []struct {
		name, text                 string
		opt                        CSVOptions
		units                      bool
		xName, xUnit, yName, yUnit string
		n                          int
	}{
		{"logger", "conductivity,reading\nµS/cm,µS/cm\n84,85.9\n147,146.1\n", CSVOptions{}, true, "conductivity", "µS/cm", "reading", "µS/cm", 2},
		{"semicolons, one unit empty", "Temp;Count\n°C;\n21,5;3\n22,0;4\n", CSVOptions{}, true, "Temp", "°C", "Count", "", 2},
		{"three columns: the first two numeric", "time,x,y\ns,m,kg\n0,1,2\n1,2,4\n", CSVOptions{}, true, "time", "s", "x", "m", 2},
		{"no units row", "x,y\n1,2\n3,4\n", CSVOptions{}, false, "x", "", "y", "", 2},
		{"a text data row is not units", "x,y\nabc,def\n1,2\n", CSVOptions{UnitsRow: &no}, false, "x", "", "y", "", 2},
		{"long cell: not units", "x,y\n" + strings.Repeat("u", MaxUnitText+1) + ",m\n1,2\n3,4\n", CSVOptions{}, false, "", "", "", "", 4},
	}
	for _, tc := range tests {
		res, err := ReadCSV(strings.NewReader(tc.text), tc.opt)
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		if res.UnitsRow != tc.units || len(res.X) != tc.n {
			t.Errorf("%s: units row %v, %d readings (%q); want %v, %d", tc.name, res.UnitsRow, len(res.X), res.X, tc.units, tc.n)
			continue
		}
		if tc.xName != "" && (res.XName != tc.xName || res.XUnit != tc.xUnit || res.YName != tc.yName || res.YUnit != tc.yUnit) {
			t.Errorf("%s: %q %q %q %q", tc.name, res.XName, res.XUnit, res.YName, res.YUnit)
		}
	}
	// Into a session: the names and units are set (recorded) when it has
	// none, kept when it has them.
	res, err := ReadCSV(strings.NewReader(tests[0].text), CSVOptions{})
	if err != nil {
		t.Fatal(err)
	}
	s, _ := New("units (invented)", t0, &counter{})
	if err := s.SetField(FieldYName, "Meter", t0); err != nil {
		t.Fatal(err)
	}
	if _, err := s.Import(res, t0); err != nil {
		t.Fatal(err)
	}
	if s.XName != "conductivity" || s.XUnit != "µS/cm" || s.YName != "Meter" || s.YUnit != "µS/cm" || len(s.Readings) != 2 {
		t.Errorf("session %q %q %q %q, %d readings", s.XName, s.XUnit, s.YName, s.YUnit, len(s.Readings))
	}
}

// TestExportExtrasProblems: cells of Pairline's export that cannot be
// taken as they are give a warning naming the line, never a silent change.
func TestExportExtrasProblems(t *testing.T) {
	text := "x,y,note,excluded,exclude_reason,taken\n" +
		"1,2,,yes,,2025-03-14T08:40:00Z\n" +
		"3,4,,maybe,,not a time\n" +
		"5,6," + strings.Repeat("n", MaxNoteText+10) + ",,,\n"
	res, err := ReadCSV(strings.NewReader(text), CSVOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if !res.PairlineExport || len(res.Notes) != 3 {
		t.Fatalf("export %v, %d notes", res.PairlineExport, len(res.Notes))
	}
	if !res.Excluded[0] || res.Reasons[0] == "" || !res.Taken[0].Equal(time.Date(2025, 3, 14, 8, 40, 0, 0, time.UTC)) {
		t.Errorf("row 1: excluded %v reason %q taken %v", res.Excluded[0], res.Reasons[0], res.Taken[0])
	}
	if res.Excluded[1] || !res.Taken[1].IsZero() || len(res.Notes[2]) != MaxNoteText {
		t.Errorf("rows 2, 3: %v %v %d", res.Excluded[1], res.Taken[1], len(res.Notes[2]))
	}
	w := strings.Join(res.Warnings, " ")
	for _, want := range []string{"3 cell(s)", "line 3: excluded is \"maybe\"", "line 3: the time \"not a time\"", "line 4: the note is"} {
		if !strings.Contains(w, want) {
			t.Errorf("warnings %q do not say %q", w, want)
		}
	}
}

func FuzzReadCSV(f *testing.F) {
	for _, s := range []string{"x,y\n1,2\n3,4\n", "\ufeffa;b\r\n1,5;2,5\r\n", "1\t2\n\"3\"\t\"4\n", "", "\xff\xfe1\x00", ",,,\n\n1",
		"x,y\r1,2\r3,4\r", "a;b\r\n\"1\"\"\";2\r\n", "\"x\ry\",1\n2,3\n", strings.Repeat(",", MaxCSVFields+1),
		"x,y,note,excluded,exclude_reason,taken\n\"'=1\",2,,,,\n3,4,,,,\n",
		// Units rows and the extra columns of Pairline's export.
		"conductivity,reading\nµS/cm,µS/cm\n84,85.9\n147,146.1\n", "a;b\n°C;\n1;2\n", "a,b\nm,s\n",
		"x (m),y (s),note,excluded,exclude_reason,taken\n1,2,\"n\"\"q\",yes,,2025-03-14T08:40:00Z\n3,4,,maybe,,not a time\n"} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, b []byte) {
		res, err := ReadCSV(bytes.NewReader(b), CSVOptions{})
		if err != nil {
			var ce *CSVError
			if !errors.As(err, &ce) {
				t.Fatalf("error %v is not a *CSVError", err)
			}
			return
		}
		if len(res.X) != len(res.Y) || len(res.X) != len(res.Lines) || len(res.Skipped) != res.Incomplete {
			t.Fatalf("inconsistent result %+v", res)
		}
		if len(res.Rows) > len(b) || len(res.Rows) > PreviewRows || res.Width > MaxCSVFields || len(res.X) > MaxReadings {
			t.Fatalf("%d rows, %d columns, %d readings from %d bytes", len(res.Rows), res.Width, len(res.X), len(b))
		}
		for _, c := range res.NumericColumns {
			if c < 0 || c >= res.Width {
				t.Fatalf("numeric column %d of %d", c, res.Width)
			}
		}
		if res.PairlineExport && (len(res.Notes) != len(res.X) || len(res.Excluded) != len(res.X) || len(res.Reasons) != len(res.X) || len(res.Taken) != len(res.X)) {
			t.Fatalf("the extra columns of an export do not match the readings: %d readings, %d %d %d %d", len(res.X), len(res.Notes), len(res.Excluded), len(res.Reasons), len(res.Taken))
		}
		if res.UnitsRow && !res.HasHeader {
			t.Fatal("a units row without a header")
		}
		s, _ := New("fuzz", time.Date(2025, 1, 1, 0, 0, 0, 0, time.UTC), &counter{})
		if _, err := s.Import(res, time.Date(2025, 1, 1, 0, 0, 0, 0, time.UTC)); err == nil {
			if err := s.Validate(); err != nil {
				t.Fatalf("an imported session does not validate: %v", err)
			}
		}
		x, y, _, _ := ParsedPairs(res)
		if len(x) != len(y) || len(x) > len(res.X) {
			t.Fatalf("ParsedPairs gave %d and %d values from %d cells", len(x), len(y), len(res.X))
		}
	})
}

func BenchmarkReadCSV100k(b *testing.B) {
	var sb strings.Builder
	sb.WriteString("Standard (mg/L);Reading (mg/L);Note\n")
	for i := 0; i < 100_000; i++ {
		fmt.Fprintf(&sb, "%s;%s;\n", strings.Replace(strconv.FormatFloat(float64(i)/10, 'f', 1, 64), ".", ",", 1),
			strings.Replace(strconv.FormatFloat(float64(i)/10*1.01, 'f', 3, 64), ".", ",", 1))
	}
	data := sb.String()
	b.SetBytes(int64(len(data)))
	b.ReportAllocs()
	for i := 0; i < b.N; i++ {
		res, err := ReadCSV(strings.NewReader(data), CSVOptions{})
		if err != nil || len(res.X) != 100_000 {
			b.Fatal(err)
		}
	}
}

func ExampleReadCSV() {
	// Invented readings of the invented Larkwater Valley Water Board.
	in := "Standard (mg/L);Reading (mg/L)\n0,5;0,52\n1,0;0,97\n\n2,0;\n4,0;4,10\n"
	res, err := ReadCSV(strings.NewReader(in), CSVOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	x, y, lines, _ := ParsedPairs(res)
	fmt.Printf("delimiter %q, decimal comma %v, header %q\n", res.Delimiter, res.DecimalComma, res.Header)
	fmt.Println(x, y, lines)
	fmt.Println(res.Blank, "blank;", res.Skipped)
	// Output:
	// delimiter ';', decimal comma true, header ["Standard (mg/L)" "Reading (mg/L)"]
	// [0.5 1 4] [0.52 0.97 4.1] [2 3 6]
	// 1 blank; [{5 the y cell is empty}]
}
