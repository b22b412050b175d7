package session

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"math"
	"reflect"
	"strconv"
	"strings"
	"testing"
	"unicode/utf16"
)

// streamCases are the inputs of the ReadCSV tests (csv_test.go,
// csv_limits_test.go: invented readings, Larkwater Valley Water Board) and
// the seeds of FuzzReadCSV, with a few more that cut across the blocks
// StreamCSV reads in and the decimal-comma vote.
func streamCases() []struct {
	name string
	in   string
	opt  CSVOptions
} {
	lf := "Standard,Reading\n0,0.1\n\n5,5.2\n\"10\",\"9.9\"\n"
	u := utf16.Encode([]rune("Std (µS/cm)\tRead\r\n1,5\t1,6\r\n2,5\t2,4\r\n"))
	le := []byte{0xff, 0xfe}
	for _, c := range u {
		le = append(le, byte(c), byte(c>>8))
	}
	// Rows of about 40 bytes across several 1 MiB blocks, with CRLF, a
	// quoted line end now and then, and ambiguous cells ("1.234").
	var big strings.Builder
	big.WriteString("std;read;note\r\n")
	for i := 0; big.Len() < 3*streamBlock+1000; i++ {
		fmt.Fprintf(&big, "%d,%03d;%d.%03d;\"r%d\r\nsecond line\"\r\n", i%1000+1, i%1000, i%997+1, i%1000, i)
	}
	cases := []struct {
		name string
		in   string
		opt  CSVOptions
	}{
		{"plain comma with header", "Standard,Reading\n0,0.1\n5,5.2\n10,9.9\n", CSVOptions{}},
		{"semicolon and decimal comma, BOM, CRLF", "\ufeffx;y\r\n0,5;1,25\r\n1,5;2,75\r\n", CSVOptions{}},
		{"tab, no header", "1\t2\n3\t4\n", CSVOptions{}},
		{"quotes and units", "\"Std, mg/L\",\"Read\"\n\"1,5\",\"1,4 mg/L\"\n\"2,5\",\"2,6 mg/L\"\n", CSVOptions{}},
		{"blank and incomplete rows", "x,y\n1,2\n\n,,\n3\n4,\n5,6\n", CSVOptions{}},
		{"first two numeric columns", "id,note,std,read\nA,ok,1,1.1\nB,ok,2,2.1\n", CSVOptions{}},
		{"chosen columns", "a,b,c\n1,2,3\n4,5,6\n", CSVOptions{XCol: 2, YCol: 0}},
		{"invalid cells kept", "1;2\n3;n/a\n5;6\n", CSVOptions{}},
		{"thousands with point decimals", "x,y\n\"1,000.5\",2\n\"2,000.5\",4\n", CSVOptions{}},
		{"forced options", "1,234;2\n", CSVOptions{Delimiter: ';', DecimalComma: bp(false), Header: bp(false)}},
		{"forced decimal comma", "1,234;2.500\n3;4\n", CSVOptions{DecimalComma: bp(true)}},
		{"ambiguous both ways", "x;y\n1,234;1.234\n2,5;-1.000\n3;4\n", CSVOptions{}},
		{"unclosed quote", "x,y\n1,\"2\n3,4\n", CSVOptions{}},
		{"bare quote", "x,y\n1,2\"x\n", CSVOptions{}},
		{"empty", "\n\n", CSVOptions{}},
		{"nothing", "", CSVOptions{}},
		{"header only", "x,y\n", CSVOptions{Header: bp(true)}},
		{"one column", "1\n2\n3\n", CSVOptions{}},
		{"missing column", "1,2\n", CSVOptions{XCol: 0, YCol: 5}},
		{"binary", "PAIRLN\x00\xa7", CSVOptions{}},
		{"NUL after a quote error", "x,y\n1,2\"x\n3,4\x00\n", CSVOptions{}},
		{"UTF-16LE", string(le), CSVOptions{}},
		{"Latin-1", "Std (\xb5S/cm);Read\n1;2\n3;4\n", CSVOptions{}},
		{"LF", lf, CSVOptions{}},
		{"CRLF", strings.ReplaceAll(lf, "\n", "\r\n"), CSVOptions{}},
		{"CR", strings.ReplaceAll(lf, "\n", "\r"), CSVOptions{}},
		{"mixed line ends", "Standard,Reading\r\n0,0.1\r\r5,5.2\n\"10\",\"9.9\"", CSVOptions{}},
		{"quoted line ends", "x,y,note\r1,2,\"two\rlines\"\r3,4,\"a\r\nb\"\r5,6,\r", CSVOptions{}},
		{"a cell too long", "x,y\n1," + strings.Repeat("9", MaxCSVFieldLen+1) + "\n", CSVOptions{}},
		{"a quoted cell too long", "x,y\n1,\"" + strings.Repeat("9", MaxCSVFieldLen) + "\"\n", CSVOptions{}},
		{"too many cells", strings.Repeat(",", MaxCSVFields+1), CSVOptions{}},
		{"Pairline export", "x,y,note,excluded,exclude_reason,taken\n\"'=1\",2,,,,\n3,4,,,,\n5,6,,,,\n", CSVOptions{}},
		{"doubled quotes", "a;b\r\n\"1\"\"\";2\r\n", CSVOptions{}},
		{"several blocks", big.String(), CSVOptions{}},
		{"several blocks, y first", big.String(), CSVOptions{XCol: 1, YCol: 0}},
	}
	return cases
}

// streamOracle is ReadCSV and ParsedPairs, as a StreamResult.
func streamOracle(in string, opt CSVOptions) (*StreamResult, error) {
	cr, err := ReadCSV(strings.NewReader(in), opt)
	if err != nil {
		return nil, err
	}
	x, y, lines, problems := ParsedPairs(cr)
	res := &StreamResult{X: x, Y: y, Header: cr.Header, Width: cr.Width, NumericColumns: cr.NumericColumns,
		Skipped: cr.Skipped, Blank: cr.Blank, Incomplete: cr.Incomplete, Delimiter: cr.Delimiter,
		DecimalComma: cr.DecimalComma, HasHeader: cr.HasHeader, UnitsRow: cr.UnitsRow, Units: cr.Units, PairlineExport: cr.PairlineExport,
		XCol: cr.XCol, YCol: cr.YCol, Warnings: cr.Warnings}
	for _, l := range lines {
		res.Lines = append(res.Lines, int32(l))
	}
	for _, p := range problems {
		res.Problems = append(res.Problems, StreamProblem{p, cr.Lines[p.Row]})
	}
	return res, nil
}

// sameStream reports how got differs from want ("" when it does not).
func sameStream(got, want *StreamResult, gerr, werr error) string {
	if (gerr == nil) != (werr == nil) || gerr != nil && gerr.Error() != werr.Error() {
		return fmt.Sprintf("error %v; ReadCSV: %v", gerr, werr)
	}
	if gerr != nil {
		var gc, wc *CSVError
		if errors.As(werr, &wc) != errors.As(gerr, &gc) || wc != nil && (gc.Line != wc.Line || gc.Column != wc.Column) {
			return fmt.Sprintf("error %#v; ReadCSV: %#v", gerr, werr)
		}
		for _, s := range []error{ErrCSVTooLarge, ErrCSVNotText, ErrCSVQuote, ErrCSVNoData, ErrCSVColumns,
			ErrCSVNoColumn, ErrCSVManyRows, ErrCSVManyFields, ErrCSVLongField} {
			if errors.Is(gerr, s) != errors.Is(werr, s) {
				return fmt.Sprintf("error %v; ReadCSV: %v (as to %v)", gerr, werr, s)
			}
		}
		return ""
	}
	if len(got.X) != len(want.X) || len(got.Y) != len(want.Y) {
		return fmt.Sprintf("%d pairs; ReadCSV %d", len(got.X), len(want.X))
	}
	for i := range got.X {
		if math.Float64bits(got.X[i]) != math.Float64bits(want.X[i]) || math.Float64bits(got.Y[i]) != math.Float64bits(want.Y[i]) {
			return fmt.Sprintf("pair %d (line %d) is %v, %v; ReadCSV %v, %v", i, want.Lines[i], got.X[i], got.Y[i], want.X[i], want.Y[i])
		}
	}
	g, w := *got, *want
	g.X, g.Y, w.X, w.Y, g.decided = nil, nil, nil, nil, nil
	for _, r := range []*StreamResult{&g, &w} { // empty is empty, nil or not
		if len(r.Lines) == 0 {
			r.Lines = nil
		}
		if len(r.Problems) == 0 {
			r.Problems = nil
		}
		if len(r.Skipped) == 0 {
			r.Skipped = nil
		}
	}
	if !reflect.DeepEqual(g, w) {
		return fmt.Sprintf("\n got %+v\nwant %+v", g, w)
	}
	return ""
}

// TestStreamCSVAgainstReadCSV: StreamCSV gives what ReadCSV and
// ParsedPairs give (the oracle: the session reader), number for number and
// error for error, on the inputs of the ReadCSV tests.
func TestStreamCSVAgainstReadCSV(t *testing.T) {
	for _, tc := range streamCases() {
		t.Run(tc.name, func(t *testing.T) {
			want, werr := streamOracle(tc.in, tc.opt)
			for _, size := range []int{streamBlock, 1, 5, 64} {
				if size != streamBlock && len(tc.in) > 1<<16 {
					continue // the big cases cross blocks of the real size
				}
				blockSize = size
				got, gerr := StreamCSV(strings.NewReader(tc.in), StreamOptions{CSVOptions: tc.opt})
				if d := sameStream(got, want, gerr, werr); d != "" {
					t.Errorf("blocks of %d bytes: %s", size, d)
				}
			}
			blockSize = streamBlock
		})
	}
}

// TestStreamCSVColumnsByName: the column function sees the header, and its
// choice is used as CSVOptions.XCol and YCol would be.
func TestStreamCSVColumnsByName(t *testing.T) {
	in := "note,read,std\nok,1.1,1\nok,2.1,2\nok,2.9,3\n"
	var seen []string
	got, err := StreamCSV(strings.NewReader(in), StreamOptions{Columns: func(h []string) (int, int, error) {
		seen = h
		return 2, 1, nil
	}})
	want, werr := streamOracle(in, CSVOptions{XCol: 2, YCol: 1})
	if d := sameStream(got, want, err, werr); d != "" || !reflect.DeepEqual(seen, []string{"note", "read", "std"}) {
		t.Errorf("header %q: %s", seen, d)
	}
	_, err = StreamCSV(strings.NewReader(in), StreamOptions{Columns: func([]string) (int, int, error) {
		return 0, 0, errors.New("no such column")
	}})
	if err == nil || err.Error() != "no such column" {
		t.Errorf("column error: %v", err)
	}
}

// FuzzStreamCSV: on any text StreamCSV agrees with ReadCSV and
// ParsedPairs (the oracle), with the options detected and forced.
func FuzzStreamCSV(f *testing.F) {
	for _, tc := range streamCases() {
		if len(tc.in) < 4096 {
			f.Add([]byte(tc.in), byte(0))
		}
	}
	f.Add([]byte("x;y\n1,234;2\n1.234;3\n"), byte(5))
	f.Fuzz(func(t *testing.T, b []byte, o byte) {
		var opt CSVOptions
		if o&1 != 0 {
			opt.DecimalComma = bp(o&2 != 0)
		}
		if o&4 != 0 {
			opt.Header = bp(o&8 != 0)
		}
		if o&16 != 0 {
			opt.Delimiter = []rune{',', ';', '\t', ','}[o>>6]
		}
		if o&32 != 0 {
			opt.XCol, opt.YCol = 1, 0
		}
		want, werr := streamOracle(string(b), opt)
		got, gerr := StreamCSV(bytes.NewReader(b), StreamOptions{CSVOptions: opt})
		if d := sameStream(got, want, gerr, werr); d != "" {
			t.Error(d)
		}
		// Blocks of a few bytes: cuts after every row, CRLF and quoted
		// line ends at the edges of blocks.
		defer func(n int) { blockSize = n }(blockSize)
		blockSize = 1 + int(o%7)
		got, gerr = StreamCSV(bytes.NewReader(b), StreamOptions{CSVOptions: opt})
		if d := sameStream(got, want, gerr, werr); d != "" {
			t.Errorf("blocks of %d bytes: %s", blockSize, d)
		}
		// A text that cannot tell its size: two passes, no look-ahead.
		got, gerr = StreamCSV(&countingReader{r: bytes.NewReader(b), noSize: true}, StreamOptions{CSVOptions: opt})
		if d := sameStream(got, want, gerr, werr); d != "" {
			t.Errorf("two passes, blocks of %d bytes: %s", blockSize, d)
		}
	})
}

// rowsReader is a text of a header and n rows "i,2i+1", made as it is read.
// With noHeader the header is left out; with sized it tells its size
// (Seek to the end), so StreamCSV reads it once.
type rowsReader struct {
	n, i            int
	buf             []byte
	noHeader, sized bool
	pos             int64 // the offset
	total           int64 // bytes read, over all passes
}

func (r *rowsReader) Read(p []byte) (int, error) {
	for len(r.buf) < len(p) && r.i <= r.n {
		if r.i == 0 {
			if !r.noHeader {
				r.buf = append(r.buf, "x,y\n"...)
			}
		} else {
			r.buf = strconv.AppendInt(r.buf, int64(r.i), 10)
			r.buf = append(r.buf, ',')
			r.buf = strconv.AppendInt(r.buf, int64(2*r.i+1), 10)
			r.buf = append(r.buf, '\n')
		}
		r.i++
	}
	if len(r.buf) == 0 {
		return 0, io.EOF
	}
	n := copy(p, r.buf)
	r.buf = r.buf[:copy(r.buf, r.buf[n:])]
	r.pos += int64(n)
	r.total += int64(n)
	return n, nil
}

func (r *rowsReader) Seek(off int64, whence int) (int64, error) {
	switch {
	case r.sized && off == 0 && whence == io.SeekCurrent:
		return r.pos, nil
	case r.sized && off == 0 && whence == io.SeekEnd:
		size := int64(4)
		if r.noHeader {
			size = 0
		}
		for i := 1; i <= r.n; i++ {
			size += int64(len(strconv.Itoa(i)) + len(strconv.Itoa(2*i+1)) + 2)
		}
		return size, nil
	case r.sized && whence == io.SeekStart && off == r.pos:
		return r.pos, nil // streamSize going back to where it was
	case off != 0 || whence != io.SeekStart:
		return 0, errors.New("only back to the start")
	}
	r.i, r.buf, r.pos = 0, r.buf[:0], 0
	return 0, nil
}

// TestStreamCSVRowLimit: MaxStreamRows+1 rows, made as they are read, are
// refused at the first row too many with a sentence naming the limit.
func TestStreamCSVRowLimit(t *testing.T) {
	if testing.Short() {
		t.Skip("reads 10⁷ rows")
	}
	_, err := StreamCSV(&rowsReader{n: MaxStreamRows + 1}, StreamOptions{})
	var ce *CSVError
	if !errors.As(err, &ce) || !errors.Is(err, ErrCSVStreamRows) {
		t.Fatalf("got %v; want the row limit", err)
	}
	// The header is line 1; data row k is line k+1.
	if ce.Line != MaxStreamRows+2 || !strings.Contains(err.Error(), strconv.Itoa(MaxStreamRows)) {
		t.Errorf("got %q at line %d; want line %d naming %d", err, ce.Line, MaxStreamRows+2, MaxStreamRows)
	}
}

// TestStreamCSVRowLimitNoHeader: MaxStreamRows+1 data rows without a
// header pass pass 1's count of rows (which leaves room for a header) and
// are refused by pass 2 at the first row too many, read once (the
// look-ahead) or twice, with the same error.
func TestStreamCSVRowLimitNoHeader(t *testing.T) {
	if testing.Short() {
		t.Skip("reads 10⁷ rows twice")
	}
	for _, sized := range []bool{true, false} {
		r := &rowsReader{n: MaxStreamRows + 1, noHeader: true, sized: sized}
		_, err := StreamCSV(r, StreamOptions{})
		var ce *CSVError
		if !errors.As(err, &ce) || !errors.Is(err, ErrCSVStreamRows) || ce.Line != MaxStreamRows+1 {
			t.Errorf("read once %v: got %v; want the row limit at line %d", sized, err, MaxStreamRows+1)
		}
		if once := r.total == r.mustSize(t); once != sized {
			t.Errorf("read once %v: read %d bytes", sized, r.total)
		}
	}
}

func (r *rowsReader) mustSize(t *testing.T) int64 {
	sized := *r
	sized.sized = true
	n, err := sized.Seek(0, io.SeekEnd)
	if err != nil {
		t.Fatal(err)
	}
	return n
}

// TestStreamCSVNumbers: the numbers of a generated text of many rows are
// the integers written, at the lines written.
func TestStreamCSVNumbers(t *testing.T) {
	const n = 300_000 // past MaxReadings, the limit of ReadCSV
	res, err := StreamCSV(&rowsReader{n: n}, StreamOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if len(res.X) != n || !res.HasHeader {
		t.Fatalf("%d pairs, header %v", len(res.X), res.HasHeader)
	}
	for i := range res.X {
		if res.X[i] != float64(i+1) || res.Y[i] != float64(2*i+3) || res.Lines[i] != int32(i+2) {
			t.Fatalf("pair %d: %v, %v at line %d", i, res.X[i], res.Y[i], res.Lines[i])
		}
	}
}

// BenchmarkStreamCSV: a million rows "x,y" of about 20 bytes.
func BenchmarkStreamCSV(b *testing.B) {
	b.ReportAllocs()
	for b.Loop() {
		if _, err := StreamCSV(&rowsReader{n: 1_000_000}, StreamOptions{}); err != nil {
			b.Fatal(err)
		}
	}
}

// TestStreamCSVMemoryBound: everything StreamCSV allocates for n plain rows
// is within 3× the numbers' own size (16 bytes a pair) plus a constant of
// 4 MiB (the block buffer and its growth): the text itself is not kept.
// Measured: 27.4 MB for a million rows, 1.7× the 16 MB of numbers.
func TestStreamCSVMemoryBound(t *testing.T) {
	const n = 400_000
	var res *StreamResult
	var err error
	got := allocated(func() { res, err = StreamCSV(&rowsReader{n: n}, StreamOptions{}) })
	if err != nil || len(res.X) != n {
		t.Fatalf("%v, %d pairs", err, len(res.X))
	}
	if limit := uint64(3*16*n + 4<<20); got > limit {
		t.Errorf("StreamCSV allocated %d bytes for %d pairs; the bound is %d", got, n, limit)
	}
	// The same text from a reader that tells its size: read once, the
	// columns made at the row count estimated from the first block.
	text, err := io.ReadAll(&rowsReader{n: n})
	if err != nil {
		t.Fatal(err)
	}
	got = allocated(func() { res, err = StreamCSV(bytes.NewReader(text), StreamOptions{}) })
	if err != nil || len(res.X) != n {
		t.Fatalf("%v, %d pairs", err, len(res.X))
	}
	if limit := uint64(3*16*n + 4<<20); got > limit {
		t.Errorf("StreamCSV allocated %d bytes for %d pairs read once; the bound is %d", got, n, limit)
	}
	t.Logf("read once: %d bytes allocated for %d pairs", got, n)
}

// bigFileText is n invented rows in the form `make bench-fit` reads
// (gen_fit_big.py: a conductivity probe of the fictional Larkwater Valley
// Water Board against standards, "%.6f,%.7f", about 23 bytes a row).
func bigFileText(n int) []byte {
	b := []byte("standard_uS_cm,probe_uS_cm\n")
	seed := uint64(20261202)
	next := func() float64 {
		seed = seed*6364136223846793005 + 1442695040888963407
		return float64(seed>>11) / (1 << 53)
	}
	for range n {
		x := 1 + 499*next()
		y := 0.98*x + 0.3 + (next()-0.5)*0.035*x
		b = strconv.AppendFloat(b, x, 'f', 6, 64)
		b = append(b, ',')
		b = strconv.AppendFloat(b, y, 'f', 7, 64)
		b = append(b, '\n')
	}
	return b
}

// BenchmarkStreamCSVFile: StreamCSV on a million rows of the form of
// `make bench-fit` (the text made once, in memory, outside the timing).
func BenchmarkStreamCSVFile(b *testing.B) {
	text := bigFileText(1_000_000)
	b.SetBytes(int64(len(text)))
	b.ReportAllocs()
	for b.Loop() {
		if _, err := StreamCSV(bytes.NewReader(text), StreamOptions{}); err != nil {
			b.Fatal(err)
		}
	}
}

// countingReader is a text that counts the bytes read from it; with
// noSize it cannot tell its size, so StreamCSV reads it in two passes.
type countingReader struct {
	r      *bytes.Reader
	read   int64
	noSize bool
}

func (c *countingReader) Read(p []byte) (int, error) {
	n, err := c.r.Read(p)
	c.read += int64(n)
	return n, err
}

func (c *countingReader) Seek(off int64, whence int) (int64, error) {
	if c.noSize && (off != 0 || whence != io.SeekStart) {
		return 0, errors.New("only back to the start")
	}
	return c.r.Seek(off, whence)
}

// TestStreamCSVOnePass: a text whose first block chooses what the whole
// text chooses is read once; one whose later rows change the choice (a
// column of text that holds numbers further down), or that cannot tell its
// size, is read twice. All three give what ReadCSV gives (the oracle).
func TestStreamCSVOnePass(t *testing.T) {
	defer func(n int) { blockSize = n }(blockSize)
	blockSize = 256
	var same, changed strings.Builder
	same.WriteString("id,std,read\n")
	changed.WriteString("id,std,read\n")
	for i := range 600 {
		fmt.Fprintf(&same, "n/a,%d,%d.5\n", i, i)
		id := "n/a"
		if i >= 150 {
			id = strconv.Itoa(i)
		}
		fmt.Fprintf(&changed, "%s,%d,%d.25\n", id, i, i)
	}
	for _, tc := range []struct {
		name   string
		text   string
		noSize bool
		passes int64
	}{
		{"same choice", same.String(), false, 1},
		{"choice changed", changed.String(), false, 2},
		{"size not known", same.String(), true, 2},
	} {
		r := &countingReader{r: bytes.NewReader([]byte(tc.text)), noSize: tc.noSize}
		got, err := StreamCSV(r, StreamOptions{})
		want, werr := streamOracle(tc.text, CSVOptions{})
		if d := sameStream(got, want, err, werr); d != "" {
			t.Errorf("%s: %s", tc.name, d)
		}
		if r.read != tc.passes*int64(len(tc.text)) {
			t.Errorf("%s: read %d bytes of %d, want %d passes", tc.name, r.read, len(tc.text), tc.passes)
		}
	}
}
