package session

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"math"
	"math/bits"
	"slices"
	"strings"
	"unicode"
	"unicode/utf8"
	"unsafe"
)

// Limits of StreamCSV, the reader of `pairline fit`. They are larger than
// the session limits (MaxReadings, MaxCSVSize): the command keeps numbers,
// not cells, and no session is made.
const (
	// MaxStreamRows is the most data rows StreamCSV reads.
	MaxStreamRows = 10_000_000
	// MaxStreamSize is the largest text StreamCSV reads, in bytes (blank
	// rows do not count as rows, so the rows alone do not bound the size).
	MaxStreamSize = 1 << 30
	// streamBlock is the size of the blocks of whole rows StreamCSV hands
	// to the scanner; a block grows past it only to hold a whole row.
	streamBlock = 1 << 20
	// streamBlockMax is the largest block: the longest row the scanner
	// reads (MaxCSVFields cells of MaxCSVFieldLen bytes, quoted, with
	// delimiters) and a block besides. Only rows near the limits reach it.
	streamBlockMax = MaxCSVFields*(MaxCSVFieldLen+3) + streamBlock
)

// blockSize is the size of the blocks read; tests make it small to cut
// the text at every kind of place.
var blockSize = streamBlock

// ErrCSVStreamRows is the error of StreamCSV for a file of more than
// MaxStreamRows data rows, wrapped in a *CSVError at the first line too many.
var ErrCSVStreamRows = errors.New("the file has more rows than pairline fit reads")

// StreamResult is what StreamCSV found: the chosen columns as numbers, and
// what the rest of the file held.
type StreamResult struct {
	// X[i], Y[i] are the pairs whose two cells are numbers, read with
	// DecimalComma; Lines[i] is the file line of the pair.
	X, Y  []float64
	Lines []int32
	// Problems are the chosen cells that are not numbers; Row is the index
	// of the pair among all complete rows (as CellProblem.Row of
	// ParsedPairs), Line the file line.
	Problems []StreamProblem
	// The rest as in CSVResult.
	Header         []string
	Width          int
	NumericColumns []int
	Skipped        []SkippedRow
	Blank          int
	Incomplete     int
	Delimiter      rune
	DecimalComma   bool
	HasHeader      bool
	UnitsRow       bool
	Units          []string
	PairlineExport bool
	XCol, YCol     int
	Warnings       []string

	decided *bool // CSVOptions.DecimalComma
}

// StreamProblem is a chosen cell that is not a number, with its file line.
type StreamProblem struct {
	CellProblem
	Line int
}

// StreamOptions are CSVOptions and, for columns chosen by name, a function
// called with the header row (nil without one) once it is known; it
// returns the columns (DetectColumn to detect) or an error.
type StreamOptions struct {
	CSVOptions
	Columns func(header []string) (x, y int, err error)
}

// StreamCSV reads paired readings from CSV or TSV text as ReadCSV does, with
// ReadCSV's rules (delimiter, header, column and decimal-comma detection,
// line ends, quotes, the per-cell and per-row limits) and error sentences,
// and ParseNumberHint for the numbers, but keeps the chosen columns as
// float64 (not as text) and reads r in blocks of whole rows: r must be at
// its start. Pass 1 (counts for the header and column choice) and pass 2
// (the chosen cells as numbers) run together on the choice the first block
// gives (lookAhead); only when the whole text chooses differently, or r
// cannot tell its size, is r sought back to its start and read again for
// pass 2. Either way the result is the same.
//
// Limits: MaxStreamSize bytes, MaxStreamRows data rows. Cost: linear in
// the text, one pass or two; memory about 20 bytes a pair (two float64 and
// an int32 line, made once at the row count estimated from the first
// block's rows per byte, or counted by pass 1), half a byte a pair for the
// cells whose decimal separator is ambiguous, the cells that are not
// numbers, and a buffer of about a MiB.
//
// Text that is not UTF-8 (read as Latin-1) or UTF-16 is read with ReadCSV
// itself, within its limits (MaxCSVSize, MaxReadings): such files come from
// old spreadsheets, not from data loggers of millions of rows.
func StreamCSV(r io.ReadSeeker, opt StreamOptions) (*StreamResult, error) {
	res := &StreamResult{decided: opt.DecimalComma}
	opt.Columns = memoColumns(opt.Columns)
	p1, err := streamPass1(r, opt, res, streamSize(r))
	if err != nil {
		return nil, err
	}
	if p1.fallback {
		return streamFallback(r, opt)
	}
	if err := streamChoose(opt, res, p1); err != nil {
		return nil, err
	}
	if la := p1.ahead; la != nil && la.same(res) {
		return la.result(res)
	}
	p1.ahead = nil // its columns are garbage before pass 2 makes its own
	if err := streamPass2(r, res, p1.rows); err != nil {
		return nil, err
	}
	return res, nil
}

// streamSize is the number of bytes from r's offset to its end, or −1 when
// r cannot tell (it is then read in two passes). r is left where it was.
func streamSize(r io.Seeker) int64 {
	cur, err := r.Seek(0, io.SeekCurrent)
	if err != nil {
		return -1
	}
	end, err := r.Seek(0, io.SeekEnd)
	if _, serr := r.Seek(cur, io.SeekStart); err != nil || serr != nil || end < cur {
		return -1
	}
	return end - cur
}

// memoColumns is f answering each header once: StreamCSV may ask it after
// the first block (for the look-ahead) and again at the end of pass 1.
func memoColumns(f func(header []string) (int, int, error)) func(header []string) (int, int, error) {
	if f == nil {
		return nil
	}
	type answer struct {
		header []string
		x, y   int
		err    error
	}
	var answers []answer
	return func(header []string) (int, int, error) {
		for _, a := range answers {
			if (a.header == nil) == (header == nil) && slices.Equal(a.header, header) {
				return a.x, a.y, a.err
			}
		}
		x, y, err := f(header)
		answers = append(answers, answer{slices.Clone(header), x, y, err})
		return x, y, err
	}
}

// blockReader cuts a text into blocks that end at a row end outside quotes.
type blockReader struct {
	r     io.Reader
	buf   []byte
	eof   bool
	total int64
	err   error
	first bool // the first block: without its byte-order mark, and holding 100 rows
	done  int  // bytes of buf given out as the last block
}

func newBlockReader(r io.Reader) *blockReader {
	return &blockReader{r: io.LimitReader(r, MaxStreamSize+1), first: true}
}

// fill reads until buf holds n bytes or the text ends.
func (b *blockReader) fill(n int) {
	if cap(b.buf) < n {
		b.buf = slices.Grow(b.buf, n-len(b.buf))
	}
	for len(b.buf) < n && !b.eof {
		m, err := b.r.Read(b.buf[len(b.buf):cap(b.buf)])
		b.buf = b.buf[:len(b.buf)+m]
		b.total += int64(m)
		if err == io.EOF {
			b.eof = true
		} else if err != nil {
			b.err, b.eof = err, true
		}
	}
}

// rowEnd is the end (exclusive) of the last row end outside quotes in p,
// 0 when there is none. A CR is a row end only when the byte after it is
// known and not LF, so a CRLF is never cut in two. A line end is outside
// quotes when an even number of quotes comes before it, so the search runs
// back from the end of p (a row's length, not the block's) after one count
// of the quotes.
func rowEnd(p []byte) int {
	quotes := bytes.Count(p, quoteByte) // quotes before p[i], as i runs back
	for i := len(p) - 1; i >= 0; i-- {
		switch p[i] {
		case '"':
			quotes--
		case '\n':
			if quotes%2 == 0 {
				return i + 1
			}
		case '\r':
			if quotes%2 == 0 && i+1 < len(p) && p[i+1] != '\n' {
				return i + 1
			}
		}
	}
	return 0
}

var quoteByte = []byte{'"'}

// rowsAtLeast reports whether text holds n non-blank rows, counted as
// detectDelimiter counts them.
func rowsAtLeast(text []byte, n int) bool {
	rows, in, nonEmpty := 0, false, false
	for i := 0; i < len(text); i++ {
		switch c := text[i]; {
		case c == '"':
			in, nonEmpty = !in, true
		case in:
		case c == '\n' || c == '\r':
			if nonEmpty {
				if rows++; rows >= n {
					return true
				}
			}
			nonEmpty = false
		case c == '\t' || c == ';' || c == ',' || c == ' ' || c == '\v' || c == '\f':
		case c < utf8.RuneSelf:
			nonEmpty = true
		default:
			r, sz := utf8.DecodeRune(text[i:])
			if !unicode.IsSpace(r) {
				nonEmpty = true
			}
			i += sz - 1
		}
	}
	return false
}

// next returns the next block ("" at the end). The block is a view of the
// reader's buffer, valid until the next call: the scanner's fields are
// parsed or cloned before then, so a big file is not copied into strings.
func (b *blockReader) next() string {
	if b.done > 0 {
		b.buf = b.buf[:copy(b.buf, b.buf[b.done:])]
		b.done = 0
	}
	for {
		if len(b.buf) < blockSize {
			b.fill(blockSize)
		}
		if b.first && len(b.buf) >= 3 && string(b.buf[:3]) == "\xef\xbb\xbf" {
			b.buf = b.buf[3:]
		}
		cut := rowEnd(b.buf)
		ok := cut > 0 && (!b.first || rowsAtLeast(b.buf[:cut], 100))
		if b.eof || len(b.buf) >= streamBlockMax {
			cut, ok = len(b.buf), true
		}
		if ok {
			b.first = false
			b.done = cut
			if cut == 0 {
				return ""
			}
			return unsafe.String(&b.buf[0], cut)
		}
		b.fill(2 * len(b.buf))
	}
}

// lineEnds is the number of line ends in s (LF, CRLF, a lone CR), as
// lineAt(s, len(s)) − 1 counts them.
func lineEnds(s string) int {
	n := strings.Count(s, "\n")
	if cr := strings.Count(s, "\r"); cr > 0 {
		n += cr - strings.Count(s, "\r\n")
	}
	return n
}

type pass1 struct {
	tableCounts
	fallback bool
	ahead    *lookAhead // pass 2 run alongside, on the first block's choice
}

// streamPass1 is pass 1 of readTable over blocks, with decodeText's checks
// (a NUL byte, text that is not UTF-8) made block by block in the order
// ReadCSV makes them: the size first, then a NUL, then the table. The
// stages: a UTF-16 byte-order mark sends the file to ReadCSV (fallback),
// each block is checked and scanned (block), then the end is checked
// (finish).
func streamPass1(r io.Reader, opt StreamOptions, res *StreamResult, size int64) (*pass1, error) {
	p := &pass1{}
	var head [2]byte
	n, _ := io.ReadFull(r, head[:])
	if n == 2 && (head == [2]byte{0xff, 0xfe} || head == [2]byte{0xfe, 0xff}) {
		p.fallback = true
		return p, nil
	}
	br := newBlockReader(io.MultiReader(strings.NewReader(string(head[:n])), r))
	st := pass1State{size: size}
	for block := br.next(); block != ""; block = br.next() {
		if br.total > MaxStreamSize {
			return nil, streamTooLarge()
		}
		fallback, err := p.block(block, &st, opt, res)
		if err != nil {
			return nil, err
		}
		if fallback {
			p.fallback = true
			return p, nil
		}
	}
	if err := p.finish(br, &st, opt, res); err != nil {
		return nil, err
	}
	return p, nil
}

// pass1State is what pass 1 carries from block to block: the first error
// of the scan and the first NUL byte (each reported only at the end, so
// that the size is checked first), and the lines before the block.
type pass1State struct {
	scanErr, nulErr *CSVError
	lineOff         int
	size            int64 // of the text, −1 when not known
}

// streamTooLarge is the error of a text above MaxStreamSize.
func streamTooLarge() *CSVError {
	return &CSVError{Err: fmt.Errorf("%w (more than %d MiB)", ErrCSVTooLarge, MaxStreamSize>>20)}
}

// block checks one block for a NUL byte and for text that is not UTF-8
// (fallback: ReadCSV then reads the file), chooses the delimiter at the
// first block, and scans the block while there is no error yet.
func (p *pass1) block(block string, st *pass1State, opt StreamOptions, res *StreamResult) (fallback bool, err error) {
	if st.nulErr == nil {
		if i := strings.IndexByte(block, 0); i >= 0 {
			st.nulErr = &CSVError{Line: st.lineOff + lineAt(block, i), Err: ErrCSVNotText}
		}
	}
	if st.nulErr == nil && !utf8.ValidString(block) {
		return true, nil
	}
	if res.Delimiter == 0 {
		if err := streamDelimiter(block, opt, res); err != nil {
			return false, err
		}
		if st.nulErr == nil && st.size >= 0 {
			p.ahead = newLookAhead(block, opt, res, st.size)
		}
	}
	if st.scanErr == nil && st.nulErr == nil {
		st.scanErr = p.scan(block, st.lineOff, res)
	}
	st.lineOff += lineEnds(block)
	return false, nil
}

// streamDelimiter sets the delimiter from the options or, when they give
// none, from the first block (detectDelimiter), refusing one that cannot
// separate fields.
func streamDelimiter(block string, opt StreamOptions, res *StreamResult) error {
	res.Delimiter = opt.Delimiter
	if res.Delimiter == 0 {
		res.Delimiter = detectDelimiter(block)
	}
	d := res.Delimiter
	if d == '"' || d == '\r' || d == '\n' || !utf8.ValidRune(d) || d == utf8.RuneError {
		return &CSVError{Err: fmt.Errorf("%q cannot separate fields", d)}
	}
	return nil
}

// finish reports, after the last block, a read error, a text too large,
// the first NUL, the first scan error, or a text without data, in that
// order; an empty text gets the delimiter an empty first block would.
func (p *pass1) finish(br *blockReader, st *pass1State, opt StreamOptions, res *StreamResult) error {
	if br.err != nil {
		return &CSVError{Err: fmt.Errorf("the file could not be read: %w", br.err)}
	}
	if br.total > MaxStreamSize {
		return streamTooLarge()
	}
	if st.nulErr != nil {
		return st.nulErr
	}
	if st.scanErr != nil {
		return st.scanErr
	}
	if res.Delimiter == 0 { // an empty text
		res.Delimiter = opt.Delimiter
		if res.Delimiter == 0 {
			res.Delimiter = detectDelimiter("")
		}
	}
	if p.rows == 0 {
		return &CSVError{Err: ErrCSVNoData}
	}
	return nil
}

// scan is the loop of readTable's pass 1 over one block, each row also
// handed to the look-ahead, whose reading of the x and y cells the column
// counts then take instead of reading them again.
func (p *pass1) scan(block string, lineOff int, res *StreamResult) *CSVError {
	sc := newCSVScanner(block, res.Delimiter)
	sc.line += lineOff
	la := p.ahead
	for {
		sc.raw = p.rows >= 3 // the first three rows are kept as they are read
		empty := sc.empty
		fields, line, cerr := sc.next()
		if cerr != nil {
			return cerr
		}
		la.emptyLines(sc.empty - empty)
		if fields == nil {
			return nil
		}
		blank := isBlankRow(fields)
		if !blank && p.rows+1 > MaxStreamRows+1 {
			return &CSVError{Line: line, Err: fmt.Errorf("%w (at most %d)", ErrCSVStreamRows, MaxStreamRows)}
		}
		seen := la.row(fields, line, sc.raw)
		if !blank {
			p.addSeen(fields, line, cloneFields, seen)
		}
	}
}

// lookAhead is pass 2 run inside pass 1, on the header, units row, export
// and columns that decideTable chooses from the first block alone (a
// look-ahead of about a MiB, at least 100 rows). When the choice from the
// whole file is the same, which it is unless the rows after the first block
// change which columns hold numbers or make a chosen column exist, its
// columns are the result and the file is read once; otherwise it is
// dropped and pass 2 reads the file again. Each row gets exactly the steps
// pass 2 gives it (pass2.row), so either way the result is the same.
type lookAhead struct {
	q   pass2
	st  pass2Rows
	res StreamResult // the choice, and what the rows gave under it
	err error        // the first error of pass 2 (the row limit)
}

// newLookAhead scans the first block into counts of its own and chooses
// from them; nil when the block gives no choice (an error, no rows: pass 1
// reports it, or pass 2 runs). size is the text's, to make the columns
// once at about the row count (the rows per byte of the first block).
func newLookAhead(block string, opt StreamOptions, res *StreamResult, size int64) *lookAhead {
	first := &pass1{}
	if first.scan(block, 0, res) != nil || first.rows == 0 {
		return nil
	}
	ch, err := decideTable(opt.CSVOptions, &first.tableCounts, opt.Columns)
	if err != nil {
		return nil
	}
	n := int64(first.rows)
	if int64(len(block)) < size {
		n = n*size/int64(len(block)) + n/64 + 64
	}
	n = min(n, MaxStreamRows)
	return &lookAhead{res: StreamResult{Delimiter: res.Delimiter, HasHeader: ch.hasHeader, UnitsRow: ch.unitsRow,
		PairlineExport: ch.export, XCol: ch.xc, YCol: ch.yc,
		X: make([]float64, 0, n), Y: make([]float64, 0, n), Lines: make([]int32, 0, n)}}
}

// emptyLines counts n empty lines passed over before the next row as pass
// 2's block does.
func (la *lookAhead) emptyLines(n int) {
	if la != nil && la.err == nil && la.st.seen > 0 {
		la.st.pendingBlank += n
	}
}

// row is pass2.row on one row of pass 1 (raw: its fields as sc.raw gave
// them); it returns the x and y cells it read, for the column counts.
func (la *lookAhead) row(fields []string, line int, raw bool) cellsSeen {
	if la == nil || la.err != nil {
		return cellsSeen{}
	}
	if err := la.q.row(fields, line, raw, &la.st, &la.res); err != nil {
		la.err = err
		return cellsSeen{}
	}
	return la.q.seen
}

// same reports whether the whole file's choice is the look-ahead's.
func (la *lookAhead) same(res *StreamResult) bool {
	g := &la.res
	return g.HasHeader == res.HasHeader && g.UnitsRow == res.UnitsRow && g.PairlineExport == res.PairlineExport &&
		g.XCol == res.XCol && g.YCol == res.YCol
}

// result is res with the look-ahead's columns and counts, finished as pass
// 2 finishes, or pass 2's error.
func (la *lookAhead) result(res *StreamResult) (*StreamResult, error) {
	if la.err != nil {
		return nil, la.err
	}
	g := &la.res
	res.X, res.Y, res.Lines, res.Problems = g.X, g.Y, g.Lines, g.Problems
	res.Skipped, res.Blank, res.Incomplete = g.Skipped, g.Blank, g.Incomplete
	if err := la.q.finish(res); err != nil {
		return nil, err
	}
	return res, nil
}

// cellsSeen are the x and y cells of a data row as pass 2 read them (read:
// the row had both), the columns, and whether each is a number.
type cellsSeen struct {
	read     bool
	x, y     string
	xc, yc   int
	xok, yok bool
}

// addSeen is tableCounts.add with the x and y cells as the look-ahead read
// them: a cell of the same text in the same column is a number when the
// look-ahead read one (isNumberCell and pass 2's reading take the same
// texts), so it is not read twice.
func (tc *tableCounts) addSeen(fields []string, line int, keep func([]string) []string, seen cellsSeen) {
	if !seen.read || tc.rows == 0 {
		tc.add(fields, line, keep)
		return
	}
	tc.rows++
	tc.width = max(tc.width, len(fields))
	switch tc.rows {
	case 2:
		tc.second = keep(fields)
	case 3:
		tc.third = keep(fields)
	}
	for len(tc.filled) < len(fields) {
		tc.filled, tc.nums = append(tc.filled, 0), append(tc.nums, 0)
	}
	for c, f := range fields {
		var num bool
		switch {
		case c == seen.xc && f == seen.x: // not blank: pass 2 read it
			num = seen.xok
		case c == seen.yc && f == seen.y:
			num = seen.yok
		case isBlank(f):
			continue
		default:
			_, _, _, num = decimalCell(f)
			num = num || isNumberCell(f) // decimalCell's cells are numbers to isNumberCell
		}
		tc.filled[c]++
		if num {
			tc.nums[c]++
		}
	}
}

// cloneFields copies fields out of the block they point into.
func cloneFields(fields []string) []string {
	out := make([]string, len(fields))
	for i, f := range fields {
		out[i] = strings.Clone(f)
	}
	return out
}

// streamChoose decides the header and the columns between the passes, by
// readTable's own rule (decideTable).
func streamChoose(opt StreamOptions, res *StreamResult, p *pass1) error {
	ch, err := decideTable(opt.CSVOptions, &p.tableCounts, opt.Columns)
	if err != nil {
		return err
	}
	res.Width, res.HasHeader, res.UnitsRow, res.Header, res.Units = p.width, ch.hasHeader, ch.unitsRow, ch.header, ch.units
	res.PairlineExport, res.NumericColumns, res.XCol, res.YCol = ch.export, ch.numeric, ch.xc, ch.yc
	return nil
}

// Kinds of ambiguous cells, two bits a pair cell in pass 2: the value read
// with a decimal point and the one read with a decimal comma differ by a
// factor of 1000 one way or the other; an exception keeps its value.
const (
	ambNone  = 0
	ambTimes = 1 // comma value = round(value × 1000)
	ambDiv   = 2 // comma value = value / 1000
	ambOther = 3 // comma value in pass2.other
)

type pass2 struct {
	amb        []uint64 // 2 bits per cell, cell 2i is X[i], 2i+1 is Y[i]
	other      map[int]float64
	comma, dot int
	seen       cellsSeen // the cells of the last row, for the look-ahead
}

func (q *pass2) setAmb(cell, kind int) {
	for len(q.amb) <= cell/32 {
		q.amb = append(q.amb, 0)
	}
	q.amb[cell/32] |= uint64(kind) << (2 * (cell % 32))
}

// cell parses one chosen cell as ParsedPairs does with the decimal point,
// votes as readTable's decimal-comma rule does, and remembers how the value
// read with a decimal comma differs (cell is its index in amb).
func (q *pass2) cell(s string, cell int) (float64, *NumberError) {
	v, info, alt, ok := decimalCell(s)
	var aerr *NumberError
	if !ok {
		var err *NumberError
		if v, info, err = parseNumber(s, hintDot); err != nil {
			return 0, err
		}
		if info.ambiguous {
			alt, _, aerr = parseNumber(s, hintComma)
		}
	}
	if !info.ambiguous {
		switch info.dec {
		case ',':
			q.comma++
		case '.':
			q.dot++
		}
		return v, nil
	}
	switch {
	case aerr == nil && alt == math.Round(v*1000) && math.Signbit(alt) == math.Signbit(v):
		q.setAmb(cell, ambTimes)
	case aerr == nil && alt == v/1000 && math.Signbit(alt) == math.Signbit(v):
		q.setAmb(cell, ambDiv)
	default:
		if q.other == nil {
			q.other = map[int]float64{}
		}
		if aerr != nil {
			alt = math.NaN() // not seen: the hint changes only the ambiguous form
		}
		q.other[cell] = alt
		q.setAmb(cell, ambOther)
	}
	return v, nil
}

// streamPass2 is pass 2 of readTable over blocks, parsing the chosen cells
// as they come.
func streamPass2(r io.ReadSeeker, res *StreamResult, rows int) error {
	if _, err := r.Seek(0, io.SeekStart); err != nil {
		return &CSVError{Err: fmt.Errorf("the file could not be read again: %w", err)}
	}
	br := newBlockReader(r)
	q := &pass2{}
	// Pass 1 counted the rows: the columns are made once, at their size.
	res.X, res.Y, res.Lines = make([]float64, 0, rows), make([]float64, 0, rows), make([]int32, 0, rows)
	var st pass2Rows
	lineOff := 0
	for block := br.next(); block != ""; block = br.next() {
		sc := newCSVScanner(block, res.Delimiter)
		sc.line += lineOff
		lineOff += lineEnds(block)
		if err := q.block(sc, &st, res); err != nil {
			return err
		}
	}
	if br.err != nil {
		return &CSVError{Err: fmt.Errorf("the file could not be read: %w", br.err)}
	}
	return q.finish(res)
}

// pass2Rows counts the rows of pass 2 across blocks: the non-blank rows
// seen, the blank rows since the last of them (counted in Blank once a
// non-blank row follows), the data rows and the complete ones.
type pass2Rows struct {
	seen, pendingBlank, data, complete int
}

// block reads the rows of one block, keeping only the cells up to the
// chosen columns.
func (q *pass2) block(sc *csvScanner, st *pass2Rows, res *StreamResult) error {
	keep := max(res.XCol, res.YCol) + 1
	for {
		fields, line, empty, cerr := sc.nextKept(keep)
		if cerr != nil {
			return cerr // only if the text changed since pass 1
		}
		if st.seen > 0 {
			st.pendingBlank += sc.empty - empty
		}
		if fields == nil {
			return nil
		}
		if err := q.row(fields, line, true, st, res); err != nil {
			return err
		}
	}
}

// nextKept is the scanner's next row with only its first keep cells; a
// row cut short that turns out blank is read again whole, so that it is
// judged as pass 1 judged it. empty is the count of empty rows before it.
func (sc *csvScanner) nextKept(keep int) (fields []string, line, empty int, cerr *CSVError) {
	sc.keep, sc.raw = keep, true
	empty, pos, posLine := sc.empty, sc.pos, sc.line
	fields, line, cerr = sc.next()
	if cerr == nil && sc.truncated && isBlankRow(fields) {
		sc.pos, sc.line, sc.empty, sc.keep = pos, posLine, empty, 0
		fields, line, cerr = sc.next()
	}
	return fields, line, empty, cerr
}

// row takes one row: blank rows are counted, the header and units rows
// passed over, and a data row's pair read (pair).
func (q *pass2) row(fields []string, line int, raw bool, st *pass2Rows, res *StreamResult) error {
	if isBlankRow(fields) {
		if st.seen > 0 {
			st.pendingBlank++
		}
		return nil
	}
	st.seen++
	q.seen.read = false
	res.Blank += st.pendingBlank
	st.pendingBlank = 0
	if st.seen == 1 && res.HasHeader || st.seen == 2 && res.UnitsRow {
		return nil
	}
	if st.data++; st.data > MaxStreamRows {
		return &CSVError{Line: line, Err: fmt.Errorf("%w (at most %d)", ErrCSVStreamRows, MaxStreamRows)}
	}
	x, y, why := rowPair(fields, res.XCol, res.YCol, raw, res.PairlineExport)
	if why != "" {
		res.Incomplete++
		res.Skipped = append(res.Skipped, SkippedRow{line, why})
		return nil
	}
	q.pair(x, y, line, st, res)
	return nil
}

// pair parses the chosen cells of a complete row: both numbers join the
// columns; a cell that is not one is listed in Problems and the row left
// out.
func (q *pass2) pair(x, y string, line int, st *pass2Rows, res *StreamResult) {
	i := len(res.X)
	xv, xerr := q.cell(x, 2*i)
	yv, yerr := q.cell(y, 2*i+1)
	if xerr != nil {
		res.Problems = append(res.Problems, StreamProblem{CellProblem{Row: st.complete, Column: ColumnX, Text: strings.Clone(x)}, line})
	}
	if yerr != nil {
		res.Problems = append(res.Problems, StreamProblem{CellProblem{Row: st.complete, Column: ColumnY, Text: strings.Clone(y)}, line})
	}
	st.complete++
	q.seen = cellsSeen{read: true, x: x, y: y, xc: res.XCol, yc: res.YCol, xok: xerr == nil, yok: yerr == nil}
	if xerr != nil || yerr != nil {
		q.clear(2 * i)
		q.clear(2*i + 1)
		return
	}
	res.X, res.Y = append(res.X, xv), append(res.Y, yv)
	res.Lines = append(res.Lines, int32(line))
}

// clear forgets the ambiguity of a cell whose pair was not kept (its index
// is reused by the next pair).
func (q *pass2) clear(cell int) {
	if cell/32 < len(q.amb) {
		q.amb[cell/32] &^= 3 << (2 * (cell % 32))
	}
	delete(q.other, cell)
}

// finish applies the decimal-comma rule of readTable and, with a decimal
// comma, rereads the ambiguous cells; the problems get their reasons with
// the separator chosen.
func (q *pass2) finish(res *StreamResult) error {
	var dc bool
	if res.decided != nil {
		dc = *res.decided
	} else {
		dc = q.comma > q.dot || (q.comma == q.dot && res.Delimiter == ';')
		if q.comma > 0 && q.dot > 0 {
			used := "points"
			if dc {
				used = "commas"
			}
			res.Warnings = append(res.Warnings, fmt.Sprintf(
				"The columns mix decimal commas (%d cells) and decimal points (%d cells); ambiguous cells such as 1,234 were read with decimal %s. Check the readings.",
				q.comma, q.dot, used))
		}
	}
	res.DecimalComma = dc
	if dc {
		for w, word := range q.amb {
			for word != 0 {
				b := bits.TrailingZeros64(word) &^ 1
				cell := 32*w + b/2
				v := &res.X[cell/2]
				if cell%2 == 1 {
					v = &res.Y[cell/2]
				}
				switch (word >> b) & 3 {
				case ambTimes:
					*v = math.Round(*v * 1000)
				case ambDiv:
					*v /= 1000
				case ambOther:
					*v = q.other[cell]
				}
				word &^= 3 << b
			}
		}
	}
	for i := range res.Problems {
		_, err := ParseNumberHint(res.Problems[i].Text, dc)
		if err == nil {
			return fmt.Errorf("line %d: the cell %q reads differently with decimal commas; the file cannot be read in one pass", res.Problems[i].Line, res.Problems[i].Text)
		}
		res.Problems[i].Reason = reasonOf(err)
	}
	return nil
}

// streamFallback reads the whole text with ReadCSV and ParsedPairs.
func streamFallback(r io.ReadSeeker, opt StreamOptions) (*StreamResult, error) {
	if _, err := r.Seek(0, io.SeekStart); err != nil {
		return nil, &CSVError{Err: fmt.Errorf("the file could not be read again: %w", err)}
	}
	co := opt.CSVOptions
	if opt.Columns != nil {
		// As the command did before: a first read finds the header.
		first, err := ReadCSV(r, co)
		if err != nil {
			return nil, err
		}
		if co.XCol, co.YCol, err = opt.Columns(first.Header); err != nil {
			return nil, err
		}
		if _, err := r.Seek(0, io.SeekStart); err != nil {
			return nil, &CSVError{Err: fmt.Errorf("the file could not be read again: %w", err)}
		}
	}
	cr, err := ReadCSV(r, co)
	if err != nil {
		return nil, err
	}
	x, y, lines, problems := ParsedPairs(cr)
	res := &StreamResult{X: x, Y: y, Header: cr.Header, Width: cr.Width, NumericColumns: cr.NumericColumns,
		Skipped: cr.Skipped, Blank: cr.Blank, Incomplete: cr.Incomplete, Delimiter: cr.Delimiter,
		DecimalComma: cr.DecimalComma, HasHeader: cr.HasHeader, UnitsRow: cr.UnitsRow, Units: cr.Units, PairlineExport: cr.PairlineExport,
		XCol: cr.XCol, YCol: cr.YCol, Warnings: cr.Warnings}
	res.Lines = make([]int32, len(lines))
	for i, l := range lines {
		res.Lines[i] = int32(l)
	}
	for _, p := range problems {
		res.Problems = append(res.Problems, StreamProblem{p, cr.Lines[p.Row]})
	}
	return res, nil
}
