package session

import (
	"bytes"
	"errors"
	"reflect"
	"strconv"
	"strings"
	"testing"
	"time"
)

// TestReadCSVLineEnds: LF, CRLF and a lone CR (old Mac spreadsheets) end
// rows alike; a CR-only file used to read as one row ("only a header row").
// Invented readings.
func TestReadCSVLineEnds(t *testing.T) {
	lf := "Standard,Reading\n0,0.1\n\n5,5.2\n\"10\",\"9.9\"\n"
	for name, text := range map[string]string{
		"LF":    lf,
		"CRLF":  strings.ReplaceAll(lf, "\n", "\r\n"),
		"CR":    strings.ReplaceAll(lf, "\n", "\r"),
		"mixed": "Standard,Reading\r\n0,0.1\r\r5,5.2\n\"10\",\"9.9\"",
	} {
		res, err := ReadCSV(strings.NewReader(text), CSVOptions{})
		if err != nil {
			t.Errorf("%s: %v", name, err)
			continue
		}
		if !res.HasHeader || !reflect.DeepEqual(res.X, []string{"0", "5", "10"}) || !reflect.DeepEqual(res.Y, []string{"0.1", "5.2", "9.9"}) ||
			!reflect.DeepEqual(res.Lines, []int{2, 4, 5}) || res.Blank != 1 {
			t.Errorf("%s: header %v x %q y %q lines %v blank %d", name, res.HasHeader, res.X, res.Y, res.Lines, res.Blank)
		}
	}
	// A line end inside quotes belongs to the value and still counts as a line.
	res, err := ReadCSV(strings.NewReader("x,y,note\r1,2,\"two\rlines\"\r3,4,\"a\r\nb\"\r5,6,\r"), CSVOptions{})
	if err != nil || !reflect.DeepEqual(res.Lines, []int{2, 4, 6}) || res.Rows[0][2] != "two\rlines" {
		t.Errorf("quoted line ends: %v, %+v", err, res)
	}
}

// TestReadCSVLimits: each limit of the reader stops it with an error that
// names the line and the limit, and what it allocated follows the size of
// the text, not the number of cells.
func TestReadCSVLimits(t *testing.T) {
	millionHeader := strings.Repeat("c,", 1_000_000) + "c\n" + strings.Repeat("1,2\n", 40_000)
	commas := strings.Repeat(",", 16<<20)
	longCell := "x,y\n1," + strings.Repeat("9", MaxCSVFieldLen+1) + "\n"
	longQuoted := "x,y\n1,\"" + strings.Repeat("9", MaxCSVFieldLen) + "\"\n"
	manyRows := "x,y\n" + strings.Repeat("1,2\n", MaxReadings+1)
	for _, tc := range []struct {
		name      string
		text      string
		want      error
		line, col int
		limit     int
	}{
		{"a million-column header", millionHeader, ErrCSVManyFields, 1, 2*MaxCSVFields + 1, MaxCSVFields},
		{"16 MiB of commas", commas, ErrCSVManyFields, 1, MaxCSVFields + 1, MaxCSVFields},
		{"a cell too long", longCell, ErrCSVLongField, 2, 3, MaxCSVFieldLen},
		{"a quoted cell too long", longQuoted, ErrCSVLongField, 2, 3, MaxCSVFieldLen},
		{"too many rows", manyRows, ErrCSVManyRows, MaxReadings + 2, 0, MaxReadings},
	} {
		var err error
		n := allocated(func() { _, err = ReadCSV(strings.NewReader(tc.text), CSVOptions{}) })
		var ce *CSVError
		if !errors.As(err, &ce) || !errors.Is(err, tc.want) {
			t.Errorf("%s: got %v; want %v", tc.name, err, tc.want)
			continue
		}
		if ce.Line != tc.line || ce.Column != tc.col || !strings.Contains(err.Error(), strconv.Itoa(tc.limit)) {
			t.Errorf("%s: line %d column %d %q; want line %d column %d naming %d", tc.name, ce.Line, ce.Column, err, tc.line, tc.col, tc.limit)
		}
		if limit := uint64(3*len(tc.text) + 8<<20); n > limit {
			t.Errorf("%s: ReadCSV allocated %d bytes for %d bytes of text", tc.name, n, len(tc.text))
		}
	}

	// Just within the limits: rows of MaxCSVFields cells, mostly empty.
	wide := "a,b" + strings.Repeat(",", MaxCSVFields-2) + "\n" + strings.Repeat("1,2"+strings.Repeat(",", MaxCSVFields-2)+"\n", 4000)
	var res *CSVResult
	var err error
	n := allocated(func() { res, err = ReadCSV(strings.NewReader(wide), CSVOptions{}) })
	if err != nil || len(res.X) != 4000 || res.Width != MaxCSVFields || len(res.Header) != MaxCSVFields {
		t.Fatalf("rows of %d cells: %v", MaxCSVFields, err)
	}
	// 4 million cells; at 16 bytes a cell that alone would be 64 MB.
	if limit := uint64(3*len(wide) + 8<<20); n > limit {
		t.Errorf("rows of %d cells: ReadCSV allocated %d bytes for %d bytes of text", MaxCSVFields, n, len(wide))
	}
}

// TestNeutralise: text cells that a spreadsheet would run as a formula get
// an apostrophe (OWASP "CSV Injection" guidance, from memory: prefix cells
// starting with = + - @ tab or CR with a single quote and quote the
// field); numbers stay numbers, and the change can be undone exactly.
func TestNeutralise(t *testing.T) {
	for _, tc := range []struct {
		in, want string
		dc       bool
	}{
		{"=SUM(A1:A9)", "'=SUM(A1:A9)", false},
		{"=1+2", "'=1+2", false},
		{"+41 79 000", "'+41 79 000", false},
		{"-2+3+cmd|' /C calc'!A0", "'-2+3+cmd|' /C calc'!A0", false},
		{"@SUM(1)", "'@SUM(1)", false},
		{"\tx", "'\tx", false},
		{"\rx", "'\rx", false},
		{"-", "'-", false},
		{"-5 mg/L", "'-5 mg/L", false},
		{"'=x", "''=x", false},
		{"-12.5", "-12.5", false},
		{"+3", "+3", false},
		{"-1,5e-3", "-1,5e-3", true},
		{"-1.5E+3", "-1.5E+3", false},
		{"12.5", "12.5", false},
		{"probe A", "probe A", false},
		{"'quoted", "'quoted", false},
		{"", "", false},
	} {
		got := Neutralise(tc.in, tc.dc)
		if got != tc.want {
			t.Errorf("Neutralise(%q) = %q, want %q", tc.in, got, tc.want)
		}
		if back := unneutralise(got); back != tc.in {
			t.Errorf("unneutralise(%q) = %q, want %q", got, back, tc.in)
		}
	}
}

// TestExportNeutralisedAndReadBack: the readings export neutralises every
// text cell, header included (x, y, notes, reasons, names), and an import
// of the file gives back the cells as typed.
func TestExportNeutralisedAndReadBack(t *testing.T) {
	now := time.Date(2025, 3, 14, 9, 0, 0, 0, time.UTC)
	s, _ := New("Formula cells (invented)", now, &counter{})
	s.XName, s.YName = "=HYPERLINK(\"http://example.invalid\")", "+Reading"
	s.Readings = []Reading{
		{X: "=1+2", Y: "-3", Note: "@cmd"},
		{X: "1", Y: "-2+3+cmd|' /C calc'!A0", Excluded: true, ExcludeReason: "-dropped"},
		{X: "2", Y: "4.1", Note: "\tindented"},
		{X: "3", Y: "6.0"},
	}
	var buf bytes.Buffer
	if err := WriteReadingsCSV(&buf, s); err != nil {
		t.Fatal(err)
	}
	for _, line := range strings.Split(buf.String(), "\n") {
		for _, cell := range strings.Split(line, ",") {
			c := strings.TrimPrefix(cell, `"`)
			if c != "" && strings.ContainsAny(c[:1], "=+@\t\r") {
				t.Errorf("cell %q of line %q would run as a formula", cell, line)
			}
			if strings.HasPrefix(c, "-") && !isNumberText(c, false) {
				t.Errorf("cell %q of line %q would run as a formula", cell, line)
			}
		}
	}
	res, err := ReadCSV(&buf, CSVOptions{XCol: 0, YCol: 1})
	if err != nil {
		t.Fatal(err)
	}
	if !res.PairlineExport || res.Header[0] != s.XName || res.Header[1] != s.YName {
		t.Errorf("header %q, Pairline's export %v", res.Header, res.PairlineExport)
	}
	wantX, wantY := []string{"=1+2", "1", "2", "3"}, []string{"-3", "-2+3+cmd|' /C calc'!A0", "4.1", "6.0"}
	if !reflect.DeepEqual(res.X, wantX) || !reflect.DeepEqual(res.Y, wantY) {
		t.Errorf("read back x %q y %q; want %q %q", res.X, res.Y, wantX, wantY)
	}
	if res.Rows[0][2] != "@cmd" || res.Rows[1][4] != "-dropped" || res.Rows[2][2] != "\tindented" {
		t.Errorf("notes and reasons read back as %q", res.Rows)
	}
	// Another file that happens to start a cell with an apostrophe keeps it.
	other, err := ReadCSV(strings.NewReader("x,y\n'=1,2\n3,4\n"), CSVOptions{XCol: 0, YCol: 1})
	if err != nil || other.PairlineExport || other.X[0] != "'=1" {
		t.Errorf("a file Pairline did not write: %v %+v", err, other)
	}
}

// FuzzNeutralise: whatever the text, the written cell does not start a
// formula (unless it is a number), and reading it back gives the text.
func FuzzNeutralise(f *testing.F) {
	for _, s := range []string{"=1", "-1", "'=x", "''-x", "@", "\t", "abc", "-1,5e3"} {
		f.Add(s, false)
	}
	f.Fuzz(func(t *testing.T, s string, dc bool) {
		n := Neutralise(s, dc)
		if n != "" && strings.IndexByte(formulaStart, n[0]) >= 0 && !isNumberText(n, dc) {
			t.Fatalf("Neutralise(%q) = %q starts a formula", s, n)
		}
		if back := unneutralise(n); back != s {
			t.Fatalf("unneutralise(Neutralise(%q)) = %q", s, back)
		}
	})
}

// FuzzWriteTableRead: a table written by WriteTable reads back cell for
// cell with ReadCSV (as Pairline's own export, without detection of the
// header), whatever the cells hold.
func FuzzWriteTableRead(f *testing.F) {
	f.Add("1", "2", "=note", "a\"b", false)
	f.Add("-3", "x\ry", ",", " lead", true)
	f.Fuzz(func(t *testing.T, a, b, c, d string, dc bool) {
		rows := [][]string{{a, b, c, d}, {"1", "2", "3", "4"}}
		for _, cell := range rows[0] {
			if !utf8Valid(cell) || strings.ContainsRune(cell, 0) || len(cell) > 200 {
				return
			}
		}
		if isBlankRow(rows[0]) {
			return
		}
		var buf bytes.Buffer
		if err := WriteTable(&buf, rows, dc); err != nil {
			t.Fatal(err)
		}
		res, err := ReadCSV(&buf, CSVOptions{Delimiter: ',', Header: bp(false), PairlineExport: bp(true), XCol: 0, YCol: 1})
		if err != nil {
			t.Fatalf("%q: %v", buf.String(), err)
		}
		if len(res.Rows) != 2 || !reflect.DeepEqual(res.Rows[0], rows[0]) {
			t.Fatalf("wrote %q, read %q", rows[0], res.Rows)
		}
	})
}

func utf8Valid(s string) bool { return strings.ToValidUTF8(s, "") == s }

// BenchmarkReadCSVMillionColumnHeader: the case that took 42 s (a 1.2 MB
// file: a header of a million columns, then 40,000 short rows); now it
// stops at cell MaxCSVFields+1 of line 1.
func BenchmarkReadCSVMillionColumnHeader(b *testing.B) {
	text := strings.Repeat("c,", 1_000_000) + "c\n" + strings.Repeat("1,2\n", 40_000)
	b.SetBytes(int64(len(text)))
	b.ReportAllocs()
	for b.Loop() {
		if _, err := ReadCSV(strings.NewReader(text), CSVOptions{}); !errors.Is(err, ErrCSVManyFields) {
			b.Fatal(err)
		}
	}
}

// BenchmarkReadCSVWideRows: the costliest table within the limits per
// byte, rows of MaxCSVFields cells (mostly empty) up to 16 MiB.
func BenchmarkReadCSVWideRows(b *testing.B) {
	row := "1,2" + strings.Repeat(",", MaxCSVFields-2) + "\n"
	text := "a,b" + strings.Repeat(",", MaxCSVFields-2) + "\n" + strings.Repeat(row, (16<<20)/len(row))
	b.SetBytes(int64(len(text)))
	b.ReportAllocs()
	for b.Loop() {
		if _, err := ReadCSV(strings.NewReader(text), CSVOptions{}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkReadCSVManyCells: 250,000 rows (MaxReadings) of 16 short number
// cells, the most cells that all need a number check.
func BenchmarkReadCSVManyCells(b *testing.B) {
	text := strings.Repeat("1.5,2,3,4,5,6,7,8,9,10,11,12,13,14,15,16\n", MaxReadings)
	b.SetBytes(int64(len(text)))
	b.ReportAllocs()
	for b.Loop() {
		if _, err := ReadCSV(strings.NewReader(text), CSVOptions{}); err != nil {
			b.Fatal(err)
		}
	}
}

// TestReadCSVPastThePreview: after the first PreviewRows data rows the
// reader splits rows only as far as the x and y columns; rows whose x and y
// are empty but whose other cells are not, quoted values with line ends
// after y and rows of delimiters still count as they do in the preview.
// The expected counts are worked out from how the rows are made.
func TestReadCSVPastThePreview(t *testing.T) {
	var sb strings.Builder
	sb.WriteString("x,y,note,more\n")
	line := 1
	var wantLines []int
	skipped, blank, wantQuoted := 0, 0, 0
	for i := range 3 * PreviewRows {
		line++
		switch i % 5 {
		case 0:
			sb.WriteString(strconv.Itoa(i) + "," + strconv.Itoa(2*i) + ",\"a note\nover two lines\",\"q\"\"\"\n")
			wantLines = append(wantLines, line)
			line++
		case 1:
			sb.WriteString(",,only a note,\n") // not blank: x and y are empty
			skipped++
		case 2:
			sb.WriteString(",,,\n")
			blank++
		case 3: // a y in quotes with quotes inside: "5" with its quote marks
			sb.WriteString(strconv.Itoa(i) + `,"""5"""` + "\r\n")
			wantLines = append(wantLines, line)
			wantQuoted++
		case 4:
			sb.WriteString("\r")
			blank++
		}
	}
	sb.WriteString("1,2\n")
	wantLines = append(wantLines, line+1)
	res, err := ReadCSV(strings.NewReader(sb.String()), CSVOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(res.Lines, wantLines) || res.Incomplete != skipped || res.Blank != blank || len(res.Rows) != PreviewRows {
		t.Errorf("lines %v…, incomplete %d, blank %d, preview %d; want %v…, %d, %d, %d",
			res.Lines[:4], res.Incomplete, res.Blank, len(res.Rows), wantLines[:4], skipped, blank, PreviewRows)
	}
	quoted := 0
	for _, y := range res.Y {
		if y == `"5"` {
			quoted++
		}
	}
	if res.XCol != 0 || res.YCol != 1 || quoted != wantQuoted {
		t.Errorf("columns %d, %d; %d y cells read as \"5\" with quotes, want %d", res.XCol, res.YCol, quoted, wantQuoted)
	}
	if len(res.Lines) == len(wantLines) && !reflect.DeepEqual(res.Lines, wantLines) {
		for i := range res.Lines {
			if res.Lines[i] != wantLines[i] {
				t.Fatalf("reading %d at line %d, want %d", i, res.Lines[i], wantLines[i])
			}
		}
	}
}

// BenchmarkReadCSVDoubledQuotes: rows of MaxCSVFields quoted cells with
// doubled quotes inside, y in the last column (so every cell is split in
// both passes), 16 MiB.
func BenchmarkReadCSVDoubledQuotes(b *testing.B) {
	row := `"1",` + strings.Repeat(`"""",`, MaxCSVFields-2) + `"2"` + "\n"
	text := `"a","b"` + strings.Repeat(",", MaxCSVFields-2) + "\n" + strings.Repeat(row, (16<<20)/len(row))
	b.SetBytes(int64(len(text)))
	b.ReportAllocs()
	for b.Loop() {
		if res, err := ReadCSV(strings.NewReader(text), CSVOptions{}); err != nil || res.YCol != MaxCSVFields-1 {
			b.Fatal(err)
		}
	}
}
