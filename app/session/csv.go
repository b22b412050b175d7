package session

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"slices"
	"strconv"
	"strings"
	"time"
	"unicode"
	"unicode/utf16"
	"unicode/utf8"
)

// MaxCSVSize is the largest CSV or TSV file ReadCSV imports, in bytes (the
// limits are in validate.go).
const MaxCSVSize = MaxFileSize

// PreviewRows is the number of data rows CSVResult.Rows keeps.
const PreviewRows = 100

// DetectColumn as CSVOptions.XCol or YCol asks ReadCSV to choose the column.
const DetectColumn = -1

// CSVOptions configure ReadCSV. The zero value detects everything.
type CSVOptions struct {
	// Delimiter separates fields: ',', ';' or '\t'; 0 detects it (see ReadCSV).
	Delimiter rune
	// DecimalComma says whether the numbers use a decimal comma; nil detects it.
	DecimalComma *bool
	// Header says whether the first row holds column names; nil detects it.
	Header *bool
	// XCol and YCol are the columns (from 0) holding x and y. DetectColumn
	// (or any negative value) picks the first numeric column not used by the
	// other; XCol == YCol (as in the zero value) detects both.
	XCol, YCol int
	// PairlineExport says whether the text is Pairline's own readings export,
	// whose text cells were neutralised against formulas (see WriteTable):
	// then the added apostrophe is taken off again. nil detects it from the
	// header row.
	PairlineExport *bool
	// UnitsRow says whether the row after the header holds the units of
	// the columns (as loggers and spreadsheets write: "conductivity,reading"
	// then "µS/cm,µS/cm"); nil detects it. Without a header there is no
	// units row.
	UnitsRow *bool
}

// SkippedRow is a data row that gave no reading, and why.
type SkippedRow struct {
	Line   int    `json:"line"` // from 1, as an editor shows it
	Reason string `json:"reason"`
}

// CSVResult is what ReadCSV found. X and Y hold the chosen cells as text,
// so that cells that are not numbers are kept and shown; Lines[i] is the
// file line of X[i] and Y[i].
type CSVResult struct {
	Header []string `json:"header"`
	// Rows are the first PreviewRows non-blank data rows, all columns, for
	// showing the table; the readings are X and Y.
	Rows  [][]string `json:"rows"`
	X, Y  []string   `json:"-"`
	Lines []int      `json:"lines"`
	// Width is the number of columns of the widest row (header included).
	Width int `json:"width"`
	// NumericColumns are the columns (from 0) in which at least half of the
	// non-empty data cells are numbers: the columns x and y are chosen from.
	NumericColumns []int        `json:"numeric_columns"`
	Skipped        []SkippedRow `json:"skipped"`
	Blank          int          `json:"blank"`      // blank rows between data rows
	Incomplete     int          `json:"incomplete"` // rows without an x or a y cell
	Delimiter      rune         `json:"delimiter"`
	DecimalComma   bool         `json:"decimal_comma"`
	HasHeader      bool         `json:"has_header"`
	// PairlineExport is true when the text is Pairline's own readings export
	// (its header row names the columns note, excluded, exclude_reason and
	// taken after x and y); neutralised cells were then read back as written.
	PairlineExport bool `json:"pairline_export"`
	XCol, YCol     int  `json:"-"` // the columns used, from 0
	// UnitsRow is true when the row after the header held the units of the
	// columns; Units are its cells (nil without one).
	UnitsRow bool     `json:"units_row"`
	Units    []string `json:"units"`
	// XName, XUnit, YName and YUnit are the names and units of the x and y
	// columns as the file gives them (header cell, units row; for
	// Pairline's own export the "name (unit)" of its header), trimmed;
	// empty when the file gives none or the text is longer than
	// MaxShortText. Import puts them into a session that has none.
	XName string `json:"x_name"`
	XUnit string `json:"x_unit"`
	YName string `json:"y_name"`
	YUnit string `json:"y_unit"`
	// For Pairline's own export, the other columns of each reading,
	// parallel to X and Y: note, excluded, exclude_reason and taken (nil
	// for other files). Import restores them.
	Notes    []string    `json:"-"`
	Excluded []bool      `json:"-"`
	Reasons  []string    `json:"-"`
	Taken    []time.Time `json:"-"`
	// Warnings are things worth a look: a file that was not UTF-8, columns
	// that mix decimal commas and points.
	Warnings []string `json:"warnings"`
}

// CSVError is a problem with a CSV or TSV file at a line and column (both
// from 1, the column counted in characters; 0 when not known). Err wraps
// one of the ErrCSV… sentinels.
type CSVError struct {
	Line, Column int
	Err          error
}

func (e *CSVError) Error() string {
	switch {
	case e.Line > 0 && e.Column > 0:
		return fmt.Sprintf("line %d, column %d: %v", e.Line, e.Column, e.Err)
	case e.Line > 0:
		return fmt.Sprintf("line %d: %v", e.Line, e.Err)
	}
	return e.Err.Error()
}

func (e *CSVError) Unwrap() error { return e.Err }

// The problems ReadCSV reports, each wrapped in a *CSVError.
var (
	ErrCSVTooLarge   = errors.New("the file is larger than Pairline imports")
	ErrCSVNotText    = errors.New("the file is not a text table (is it a spreadsheet or session file? save it as CSV first)")
	ErrCSVQuote      = errors.New("a quote mark (\") is not closed, or stands inside a value; put quotes around the whole value or remove the mark")
	ErrCSVNoData     = errors.New("the file holds no readings")
	ErrCSVColumns    = errors.New("no two columns of numbers were found; choose the x and y columns")
	ErrCSVNoColumn   = errors.New("the chosen column does not exist")
	ErrCSVManyRows   = errors.New("the file has more rows than one session may hold")
	ErrCSVSameColum  = errors.New("x and y cannot be the same column")
	ErrCSVManyFields = errors.New("a row has more cells than Pairline reads")
	ErrCSVLongField  = errors.New("a cell is longer than Pairline reads")
)

// ReadCSV imports paired readings from CSV or TSV text.
//
// Text: UTF-8 with or without a byte-order mark, or UTF-16 with a
// byte-order mark (as spreadsheet "Unicode text" exports are). Text that is
// not valid UTF-8 is read as Latin-1, with a warning. Fields follow RFC 4180:
// a field in quotes may hold the delimiter, line ends and doubled quotes
// (""), a quote elsewhere is an error. Rows end at LF, CRLF or a lone CR (as
// old Mac spreadsheets write); a line end inside quotes belongs to the field.
//
// Limits (validate.go): at most MaxCSVSize bytes, MaxCSVFields cells in a row
// (delimiters between empty cells count), MaxCSVFieldLen bytes in a cell and
// MaxReadings data rows; past one, ReadCSV stops with a *CSVError naming the
// line and the limit. The cost is linear in the size of the text: two passes
// over it, and memory for the chosen cells, not for every cell.
//
// Detection, when the options leave it open (common practice, written down):
//   - Delimiter: in the first 100 rows, for each of tab, ';' and ',', the
//     number of rows whose count of that character outside quotes equals its
//     most common count (at least 1). The highest number wins; ties go to
//     tab, then ';', then ',' (so "1,5;2,3" is ';' with decimal commas).
//   - Header: the first row is a header when it has a non-empty cell that is
//     not a number and the next row has more number cells.
//   - Columns: the first two columns in which at least half of the
//     non-empty data cells are numbers.
//   - Decimal comma: the chosen cells vote (a cell like "3,14" or "1.234,5"
//     for the comma, "3.14" or "1,234.5" for the point; "1,234" does not
//     vote); the majority wins, and a tie goes to the comma when the
//     delimiter is ';', otherwise to the point.
//   - Pairline's own export: the header row has x, y, note, excluded,
//     exclude_reason and taken (as WriteReadingsCSV writes it). Its notes,
//     exclusions with their reasons and times are read back too.
//   - Units row: the row after a header is a units row when it has a
//     non-empty cell, no cell that is a number or longer than MaxUnitText
//     bytes, and the row after it has more number cells than the header.
//     Its cells are the units of the columns, not a reading.
//
// Rows whose cells are all empty count as Blank; rows without an x or y
// cell count as Incomplete and are listed in Skipped. Errors are *CSVError.
func ReadCSV(r io.Reader, opt CSVOptions) (*CSVResult, error) {
	data, err := readText(r, MaxCSVSize)
	if err != nil {
		return nil, &CSVError{Err: fmt.Errorf("the file could not be read: %w", err)}
	}
	if len(data) > MaxCSVSize {
		return nil, &CSVError{Err: fmt.Errorf("%w (more than %d MiB)", ErrCSVTooLarge, MaxCSVSize>>20)}
	}
	text, warn, cerr := decodeText(data)
	if cerr != nil {
		return nil, cerr
	}
	return readTable(text, opt, warn)
}

// readText reads at most limit+1 bytes of r into one string, sized from the
// start when r says how much it holds (a bytes.Reader, a file), so that a
// 64 MiB file is not copied while it is read.
func readText(r io.Reader, limit int64) (string, error) {
	var sb strings.Builder
	guess := int64(64 << 10)
	if l, ok := r.(interface{ Len() int }); ok {
		guess = int64(l.Len())
	} else if st, ok := r.(interface{ Stat() (fs.FileInfo, error) }); ok {
		if fi, err := st.Stat(); err == nil && fi.Mode().IsRegular() {
			guess = fi.Size()
		}
	}
	sb.Grow(int(max(0, min(guess, limit+1))))
	_, err := io.Copy(&sb, io.LimitReader(r, limit+1))
	return sb.String(), err
}

// ReadPaste imports a block pasted from a spreadsheet: tab-separated unless
// the options say otherwise or the text has no tab (then as ReadCSV).
func ReadPaste(text string, opt CSVOptions) (*CSVResult, error) {
	if len(text) > MaxCSVSize {
		return nil, &CSVError{Err: fmt.Errorf("%w (more than %d MiB)", ErrCSVTooLarge, MaxCSVSize>>20)}
	}
	if opt.Delimiter == 0 && strings.ContainsRune(text, '\t') {
		opt.Delimiter = '\t'
	}
	t, warn, cerr := decodeText(text)
	if cerr != nil {
		return nil, cerr
	}
	return readTable(t, opt, warn)
}

// decodeText turns the bytes of a file into UTF-8 text. Each conversion
// writes the new text once, at its final size.
func decodeText(data string) (string, []string, *CSVError) {
	var warn []string
	switch {
	case strings.HasPrefix(data, "\xef\xbb\xbf"):
		data = data[3:]
	case strings.HasPrefix(data, "\xff\xfe"), strings.HasPrefix(data, "\xfe\xff"):
		be := data[0] == 0xfe
		data = data[2:]
		if len(data)%2 != 0 {
			return "", nil, &CSVError{Err: fmt.Errorf("%w: the UTF-16 text has an odd number of bytes", ErrCSVNotText)}
		}
		var sb strings.Builder
		sb.Grow(len(data) * 3 / 2)
		var pend rune = -1
		for i := 0; i < len(data); i += 2 {
			u := rune(data[i+1])<<8 | rune(data[i])
			if be {
				u = rune(data[i])<<8 | rune(data[i+1])
			}
			switch {
			case pend >= 0 && utf16.IsSurrogate(u) && u >= 0xdc00:
				sb.WriteRune(utf16.DecodeRune(pend, u))
				pend = -1
				continue
			case pend >= 0:
				sb.WriteRune(utf8.RuneError)
				pend = -1
			}
			if utf16.IsSurrogate(u) && u < 0xdc00 {
				pend = u
				continue
			}
			if utf16.IsSurrogate(u) {
				u = utf8.RuneError
			}
			sb.WriteRune(u)
		}
		if pend >= 0 {
			sb.WriteRune(utf8.RuneError)
		}
		data = sb.String()
	}
	if i := strings.IndexByte(data, 0); i >= 0 {
		return "", nil, &CSVError{Line: lineAt(data, i), Err: ErrCSVNotText}
	}
	if !utf8.ValidString(data) {
		var sb strings.Builder
		sb.Grow(2 * len(data))
		for i := 0; i < len(data); i++ {
			sb.WriteRune(rune(data[i]))
		}
		data = sb.String()
		warn = append(warn, "The file is not UTF-8 text; it was read as Latin-1. Check that units such as µ and ° look right.")
	}
	return data, warn, nil
}

// lineAt is the line (from 1) of byte i of text, counting LF, CRLF and a
// lone CR as line ends, as the reader does.
func lineAt(text string, i int) int {
	line := 1
	for j := 0; j < i; j++ {
		if text[j] == '\n' || (text[j] == '\r' && (j+1 >= len(text) || text[j+1] != '\n')) {
			line++
		}
	}
	return line
}

// columnAt is the column (from 1, in characters) of byte i of text.
func columnAt(text string, i int) int {
	start := strings.LastIndexAny(text[:i], "\r\n") + 1
	return utf8.RuneCountInString(text[start:i]) + 1
}

// detectDelimiter applies the rule documented on ReadCSV. It looks at the
// first 100 non-blank rows only (a lone CR ends a row, as in the reader).
func detectDelimiter(text string) rune {
	return delimiterByCounts(delimiterCounts(text))
}

// delimiterCounts counts the tabs, semicolons and commas outside quotes
// of each of the first 100 non-blank rows of text (a row of only spaces
// is blank; a lone CR ends a row).
func delimiterCounts(text string) [][3]int {
	var counts [][3]int
	var cur [3]int
	inQuote, nonEmpty := false, false
	for i := 0; i < len(text) && len(counts) < 100; i++ {
		c := text[i]
		switch {
		case c == '"':
			inQuote = !inQuote
			nonEmpty = true
		case inQuote:
		case c == '\n' || c == '\r':
			if nonEmpty {
				counts = append(counts, cur)
			}
			cur, nonEmpty = [3]int{}, false
		case c == '\t' || c == ';' || c == ',':
			cur[strings.IndexByte("\t;,", c)]++
		default:
			var n int
			if delimiterVisible(text[i:], &n) {
				nonEmpty = true
			}
			i += n - 1
		}
	}
	if nonEmpty && len(counts) < 100 {
		counts = append(counts, cur)
	}
	return counts
}

// delimiterVisible reports whether the character at the start of s makes
// a row non-blank (anything but white space), with its length in n.
func delimiterVisible(s string, n *int) bool {
	c := s[0]
	*n = 1
	switch {
	case c == ' ' || c == '\v' || c == '\f':
		return false
	case c < utf8.RuneSelf:
		return true
	}
	r, size := utf8.DecodeRuneInString(s)
	*n = size
	return !unicode.IsSpace(r)
}

// delimiterByCounts is the candidate (tab, semicolon, comma, in that order
// of preference) whose most common non-zero count per row is shared by the
// most rows; a comma when none is found.
func delimiterByCounts(counts [][3]int) rune {
	cands := []rune{'\t', ';', ','}
	best, bestScore := ',', 0
	freq := map[int]int{}
	for i, d := range cands {
		clear(freq)
		for _, c := range counts {
			if c[i] > 0 {
				freq[c[i]]++
			}
		}
		score := 0
		for _, f := range freq {
			score = max(score, f)
		}
		if score > bestScore {
			best, bestScore = d, score
		}
	}
	return best
}

// isNumberCell is whether s reads as a number (with the decimal point for
// the ambiguous form). Cells that cannot start a number (a letter, a quote)
// are turned down at once: the column counts check every cell.
func isNumberCell(s string) bool {
	if _, ok := plainNumber(s); ok {
		return true
	}
	t := strings.TrimLeft(s, " \t\n\v\f\r")
	if t == "" || t[0] < utf8.RuneSelf && !strings.ContainsRune("0123456789+-.,", rune(t[0])) {
		return false
	}
	_, _, err := parseNumber(s, hintDot)
	return err == nil
}

// csvScanner splits text into rows of fields (RFC 4180, with LF, CRLF or a
// lone CR ending a row). Fields are parts of the text, not copies, unless
// they hold doubled quotes; the slice of fields is reused from row to row,
// so an empty field costs one slice element and nothing else.
type csvScanner struct {
	text   string
	delim  string
	pos    int
	line   int // line of the next row, from 1
	fields []string
	// special marks the bytes an unquoted field stops at: line ends, the
	// quote and the first byte of the delimiter.
	special [256]bool
	// empty counts the empty lines passed over.
	empty int
	// truncated says that the last row had more fields than keep.
	truncated bool
	// raw asks for a value with doubled quotes as it stands in the text,
	// quotes and all, instead of a new string: for counting cells, where
	// such a value is neither blank nor a number either way.
	raw bool
	// keep, when above 0, is the number of fields wanted from each row: the
	// rest of a row is passed over without splitting it. Only for text that
	// a scanner without keep has read without error.
	keep int
}

func newCSVScanner(text string, delim rune) *csvScanner {
	s := &csvScanner{text: text, delim: string(delim), line: 1}
	s.special['\n'], s.special['\r'], s.special['"'], s.special[s.delim[0]] = true, true, true, true
	return s
}

// next returns the fields of the next row and the line it starts on;
// fields is nil at the end of the text. The fields are valid until the
// next call. A row is read in three steps: the empty lines before it are
// passed over (skipEmptyLines), then each field is read (quotedField or
// plainField, by its first byte) until a line end or the end of the text
// closes the row (endRow).
func (s *csvScanner) next() (fields []string, line int, err *CSVError) {
	s.skipEmptyLines()
	if s.pos >= len(s.text) {
		return nil, 0, nil
	}
	line = s.line
	s.fields = s.fields[:0]
	s.truncated = false
	for {
		if len(s.fields) == MaxCSVFields {
			return nil, line, &CSVError{Line: s.line, Column: columnAt(s.text, s.pos),
				Err: fmt.Errorf("%w (at most %d cells in a row)", ErrCSVManyFields, MaxCSVFields)}
		}
		var f string
		var ferr *CSVError
		if s.pos < len(s.text) && s.text[s.pos] == '"' {
			f, ferr = s.quotedField()
		} else {
			f, ferr = s.plainField()
		}
		if ferr != nil {
			return nil, line, ferr
		}
		s.fields = append(s.fields, f)
		if len(s.fields) == s.keep && s.pos < len(s.text) && s.atDelim(s.pos) {
			s.skipRest()
		}
		if s.endRow() {
			return s.fields, line, nil
		}
		s.pos += len(s.delim)
	}
}

// skipEmptyLines passes over the empty lines at s.pos. They are blank rows;
// passing over them here costs a few nanoseconds each, where a row of one
// empty field would cost a call of next and a blank-row test. They are
// counted in s.empty (and in s.line).
func (s *csvScanner) skipEmptyLines() {
	t := s.text
	for s.pos < len(t) && (t[s.pos] == '\n' || t[s.pos] == '\r') {
		if t[s.pos] == '\r' && s.pos+1 < len(t) && t[s.pos+1] == '\n' {
			s.pos++
		}
		s.pos++
		s.line++
		s.empty++
	}
}

// quotedField reads the quoted field that starts at s.pos and leaves s.pos
// just past its closing quote, where the delimiter, a line end or the end
// of the text must follow. The value is a part of the text unless it holds
// doubled quotes: then it is a new string without them, or (raw) the text
// as it stands, quotes and all. Errors name the line the value starts on,
// since a quoted value may span lines.
func (s *csvScanner) quotedField() (string, *CSVError) {
	t, start, startLine := s.text, s.pos, s.line
	i, seg, doubled, unq := s.closingQuote()
	if i < 0 {
		return "", &CSVError{Line: startLine,
			Err: fmt.Errorf("%w (the quoted value that starts on this line is never closed)", ErrCSVQuote)}
	}
	if i-start > MaxCSVFieldLen {
		return "", &CSVError{Line: startLine, Column: columnAt(t, start),
			Err: fmt.Errorf("%w (at most %d bytes in a cell)", ErrCSVLongField, MaxCSVFieldLen)}
	}
	var f string
	switch {
	case doubled && s.raw:
		f = t[start : i+1]
	case doubled:
		f = string(append(unq, t[seg:i]...))
	default:
		f = t[start+1 : i]
	}
	s.pos = i + 1
	if s.pos < len(t) && t[s.pos] != '\n' && t[s.pos] != '\r' && !s.atDelim(s.pos) {
		return "", &CSVError{Line: s.line, Column: columnAt(t, s.pos),
			Err: fmt.Errorf("%w (extra text after a closing quote)", ErrCSVQuote)}
	}
	return f, nil
}

// closingQuote finds the quote that closes the quoted value at s.pos,
// counting the line ends inside it: its index, or −1 when the value is
// never closed; whether the value held doubled quotes, and then (unless
// raw) the value without them up to seg, where its last part starts. It
// stops at the first quote past MaxCSVFieldLen bytes, so a long value
// costs no more than the limit allows.
func (s *csvScanner) closingQuote() (end, seg int, doubled bool, unq []byte) {
	t, start := s.text, s.pos
	i := start + 1
	seg = i
	for {
		j := strings.IndexByte(t[i:], '"')
		if j < 0 {
			return -1, seg, doubled, nil
		}
		s.countLines(t[i : i+j])
		i += j
		if i-start > MaxCSVFieldLen || i+1 >= len(t) || t[i+1] != '"' {
			break
		}
		doubled = true
		if !s.raw {
			unq = append(unq, t[seg:i+1]...)
		}
		i += 2
		seg = i
	}
	return i, seg, doubled, unq
}

// plainField reads the unquoted field at s.pos: it ends at a line end or
// the delimiter, and a quote inside it is an error. The scan runs over the
// bytes that cannot end it (s.special) in a tight loop and stops one byte
// past the longest field allowed, so a long field costs no more than the
// limit.
func (s *csvScanner) plainField() (string, *CSVError) {
	t, start := s.text, s.pos
	stop := min(len(t), start+MaxCSVFieldLen+1)
	i := start
	for i < stop && !s.special[t[i]] {
		i++
	}
	for i < stop && t[i] != '\n' && t[i] != '\r' && !s.atDelim(i) {
		if t[i] == '"' {
			return "", &CSVError{Line: s.line, Column: columnAt(t, i),
				Err: fmt.Errorf("%w (a quote mark inside a value that does not start with one)", ErrCSVQuote)}
		}
		i++ // a byte that starts like a delimiter of several bytes
		for i < stop && !s.special[t[i]] {
			i++
		}
	}
	if i-start > MaxCSVFieldLen {
		return "", &CSVError{Line: s.line, Column: columnAt(t, start),
			Err: fmt.Errorf("%w (at most %d bytes in a cell)", ErrCSVLongField, MaxCSVFieldLen)}
	}
	s.pos = i
	return t[start:i], nil
}

// endRow reports whether the row ends at s.pos (the end of the text or a
// line end: LF, CRLF or a lone CR, which it passes over); otherwise the
// delimiter stands there and another field follows.
func (s *csvScanner) endRow() bool {
	t := s.text
	switch {
	case s.pos >= len(t):
		return true
	case t[s.pos] == '\n':
		s.pos++
		s.line++
		return true
	case t[s.pos] == '\r':
		s.pos++
		if s.pos < len(t) && t[s.pos] == '\n' {
			s.pos++
		}
		s.line++
		return true
	}
	return false
}

// skipRest moves to the line end that ends the current row, passing over
// quoted values (which may hold line ends) as values.
func (s *csvScanner) skipRest() {
	t := s.text
	s.truncated = true
	for {
		j := strings.IndexAny(t[s.pos:], "\r\n\"")
		if j < 0 {
			s.pos = len(t)
			return
		}
		s.pos += j
		if t[s.pos] != '"' {
			return
		}
		// A quoted value: to its closing quote (doubled quotes stay inside).
		i := s.pos + 1
		for {
			k := strings.IndexByte(t[i:], '"')
			if k < 0 {
				s.pos = len(t)
				return
			}
			s.countLines(t[i : i+k])
			i += k + 1
			if i < len(t) && t[i] == '"' {
				i++
				continue
			}
			break
		}
		s.pos = i
	}
}

// atDelim reports whether the delimiter starts at byte i.
func (s *csvScanner) atDelim(i int) bool {
	if len(s.delim) == 1 {
		return s.text[i] == s.delim[0]
	}
	return strings.HasPrefix(s.text[i:], s.delim)
}

// unraw is the value of a field the scanner gave in raw form: one with a
// quote in it is still quoted, with its quotes doubled.
func unraw(f string) string {
	if strings.IndexByte(f, '"') < 0 {
		return f
	}
	return strings.ReplaceAll(f[1:len(f)-1], `""`, `"`)
}

// countLines adds the line ends in part (inside a quoted field) to s.line.
func (s *csvScanner) countLines(part string) {
	for k := 0; k < len(part); k++ {
		switch part[k] {
		case '\n':
			s.line++
		case '\r':
			if k+1 >= len(part) || part[k+1] != '\n' {
				s.line++
			}
		}
	}
}

// MaxUnitText is the longest cell of a units row, in bytes: a row with a
// longer cell is data (or a second header), not units.
const MaxUnitText = 64

// isUnitsRow: a non-empty cell, and no cell that is a number or longer
// than MaxUnitText.
func isUnitsRow(fields []string) bool {
	any := false
	for _, f := range fields {
		if isBlank(f) {
			continue
		}
		if isNumberCell(f) || len(f) > MaxUnitText {
			return false
		}
		any = true
	}
	return any
}

// quantities fills XName … YUnit from the header and the units row.
func (res *CSVResult) quantities() {
	cell := func(row []string, c int) string {
		if c < 0 || c >= len(row) {
			return ""
		}
		v := strings.TrimSpace(row[c])
		if len(v) > MaxShortText {
			return ""
		}
		return v
	}
	if !res.HasHeader {
		return
	}
	res.XName, res.YName = cell(res.Header, res.XCol), cell(res.Header, res.YCol)
	if res.UnitsRow {
		res.XUnit, res.YUnit = cell(res.Units, res.XCol), cell(res.Units, res.YCol)
	} else if res.PairlineExport {
		// WriteReadingsCSV titles the columns "name (unit)".
		res.XName, res.XUnit = splitTitle(res.XName)
		res.YName, res.YUnit = splitTitle(res.YName)
	}
}

// splitTitle undoes columnTitle: "Standard (µS/cm)" is "Standard" and
// "µS/cm"; a title without a final parenthesis is a name only. The default
// names "x" and "y" columnTitle writes for a session without names are not
// names.
func splitTitle(t string) (name, unit string) {
	if strings.HasSuffix(t, ")") {
		if i := strings.LastIndex(t, " ("); i > 0 {
			name, unit = t[:i], t[i+2:len(t)-1]
		}
	}
	if name == "" {
		name = t
	}
	if name == "x" || name == "y" {
		name = ""
	}
	return name, unit
}

// exportExtras reads the note, excluded, exclude_reason and taken cells of
// Pairline's own export, with the problems found in them.
type exportExtras struct {
	problems int
	first    []string // the first few problems, in words
}

// maxListedProblems is the number of problems of an export's extra cells
// named one by one in the warnings; the rest are counted.
const maxListedProblems = 10

func (ex *exportExtras) problem(line int, format string, a ...any) {
	ex.problems++
	if len(ex.first) < maxListedProblems {
		ex.first = append(ex.first, fmt.Sprintf("line %d: ", line)+fmt.Sprintf(format, a...))
	}
}

func (ex *exportExtras) add(res *CSVResult, fields []string, raw bool, line int) {
	get := func(c int) string {
		if c >= len(fields) {
			return ""
		}
		f := fields[c]
		if raw {
			f = unraw(f)
		}
		return unneutralise(f)
	}
	note, exc, reason, taken := get(2), strings.TrimSpace(get(3)), get(4), strings.TrimSpace(get(5))
	if len(note) > MaxNoteText {
		ex.problem(line, "the note is %d bytes long; its first %d bytes were kept", len(note), MaxNoteText)
		note = cutText(note, MaxNoteText)
	}
	if len(reason) > MaxShortText {
		ex.problem(line, "the reason for leaving the reading out is %d bytes long; its first %d bytes were kept", len(reason), MaxShortText)
		reason = cutText(reason, MaxShortText)
	}
	excluded := false
	switch strings.ToLower(exc) {
	case "yes":
		excluded = true
	case "", "no":
	default:
		ex.problem(line, "excluded is %q, not \"yes\" or empty; the reading was imported as used", truncate(exc, 40))
	}
	if excluded && strings.TrimSpace(reason) == "" {
		reason = "left out in the imported file (no reason given)"
	}
	var tk time.Time
	if taken != "" {
		t, err := time.Parse(time.RFC3339Nano, taken)
		if err != nil || checkTime(t, false) != nil {
			ex.problem(line, "the time %q could not be read; the reading was imported without it", truncate(taken, 40))
		} else {
			tk = t.UTC()
		}
	}
	if !excluded {
		reason = ""
	}
	res.Notes = append(res.Notes, note)
	res.Excluded = append(res.Excluded, excluded)
	res.Reasons = append(res.Reasons, reason)
	res.Taken = append(res.Taken, tk)
}

func (ex *exportExtras) warn(res *CSVResult) {
	if ex.problems == 0 {
		return
	}
	w := fmt.Sprintf("%d cell(s) of the notes, exclusions or times could not be taken as they are: %s", ex.problems, strings.Join(ex.first, "; "))
	if ex.problems > len(ex.first) {
		w += fmt.Sprintf("; and %d more", ex.problems-len(ex.first))
	}
	res.Warnings = append(res.Warnings, w+".")
}

// cutText is the first at most n bytes of s, ending on a whole character.
func cutText(s string, n int) string {
	if len(s) <= n {
		return s
	}
	for n > 0 && !utf8.RuneStart(s[n]) {
		n--
	}
	return s[:n]
}

func isBlankRow(fields []string) bool {
	for _, f := range fields {
		if !isBlank(f) {
			return false
		}
	}
	return true
}

// exportColumns are the columns after x and y of WriteReadingsCSV.
var exportColumns = []string{"note", "excluded", "exclude_reason", "taken"}

func isPairlineExport(header []string) bool {
	return len(header) == 2+len(exportColumns) && slices.Equal(header[2:], exportColumns)
}

// readTable reads the table in two linear passes: the first counts, per
// column, the non-empty cells and the number cells (and keeps the first
// rows for the header and the preview), the second takes the chosen
// columns. Neither keeps every cell. The stages: the delimiter
// (tableDelimiter), pass 1 (countTable), the header, units row, export and
// columns (decideTable), pass 2 (takeRows), the names and units
// (quantities) and the decimal mark (chooseDecimalMark).
func readTable(text string, opt CSVOptions, warn []string) (*CSVResult, error) {
	res := &CSVResult{Warnings: warn}
	delim, err := tableDelimiter(text, opt.Delimiter)
	if err != nil {
		return nil, err
	}
	res.Delimiter = delim
	tc, err := countTable(text, delim)
	if err != nil {
		return nil, err
	}
	ch, err := decideTable(opt, tc, nil)
	if err != nil {
		return nil, err
	}
	res.Width, res.HasHeader, res.UnitsRow, res.Header, res.Units = tc.width, ch.hasHeader, ch.unitsRow, ch.header, ch.units
	res.PairlineExport, res.NumericColumns, res.XCol, res.YCol = ch.export, ch.numeric, ch.xc, ch.yc
	if err := takeRows(text, res); err != nil {
		return nil, err
	}
	res.quantities()
	if opt.DecimalComma != nil {
		res.DecimalComma = *opt.DecimalComma
	} else {
		chooseDecimalMark(res)
	}
	return res, nil
}

// tableDelimiter is the delimiter given, or the one detectDelimiter finds
// (given as 0); a rune that cannot separate fields is refused.
func tableDelimiter(text string, given rune) (rune, error) {
	d := given
	if d == 0 {
		d = detectDelimiter(text)
	}
	if d == '"' || d == '\r' || d == '\n' || !utf8.ValidRune(d) || d == utf8.RuneError {
		return 0, &CSVError{Err: fmt.Errorf("%q cannot separate fields", d)}
	}
	return d, nil
}

// countTable is pass 1: every non-blank row counted into one tableCounts
// (the first three rows kept as they are read). A text without such a row
// is ErrCSVNoData; more than MaxReadings data rows, ErrCSVManyRows.
func countTable(text string, delim rune) (*tableCounts, error) {
	tc := new(tableCounts)
	sc := newCSVScanner(text, delim)
	for {
		sc.raw = tc.rows >= 3
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
	return tc, nil
}

// takeRows is pass 2: the rows again, split only as far as the columns
// used (and, for the first PreviewRows rows, the preview) need, each data
// row handed to rowTaker.take.
func takeRows(text string, res *CSVResult) error {
	t := &rowTaker{res: res}
	sc := newCSVScanner(text, res.Delimiter)
	for {
		if len(res.Rows) >= PreviewRows {
			sc.keep, sc.raw = max(res.XCol, res.YCol)+1, true
			if res.PairlineExport {
				sc.keep = max(sc.keep, 2+len(exportColumns))
			}
		}
		empty := sc.empty
		fields, line, cerr := sc.nextWhole()
		if cerr != nil {
			return cerr // cannot happen: pass 1 read the same text
		}
		if t.seen > 0 {
			t.pendingBlank += sc.empty - empty
		}
		if fields == nil {
			break
		}
		if err := t.take(fields, line, sc.raw); err != nil {
			return err
		}
	}
	t.ex.warn(res)
	return nil
}

// nextWhole is next, except that a row whose kept cells are all empty is
// split again in full (the whole row decides whether it is blank); each
// row is split again at most once.
func (sc *csvScanner) nextWhole() ([]string, int, *CSVError) {
	empty, pos, posLine := sc.empty, sc.pos, sc.line
	fields, line, cerr := sc.next()
	if cerr == nil && sc.truncated && isBlankRow(fields) {
		sc.pos, sc.line, sc.empty, sc.keep = pos, posLine, empty, 0
		fields, line, cerr = sc.next()
	}
	return fields, line, cerr
}

// rowTaker is the state of pass 2: the non-blank rows seen, the blank
// rows since the last of them (counted in Blank only when another row
// follows), the data rows and the extra columns of Pairline's export.
type rowTaker struct {
	res                      *CSVResult
	seen, pendingBlank, data int
	ex                       exportExtras
}

// take counts a blank row, passes over the header and the units row, and
// takes a data row: into the preview while it has room, and its x and y
// cells as a reading, or as a skipped row saying why not. raw says the
// fields were kept as read (sc.raw).
func (t *rowTaker) take(fields []string, line int, raw bool) error {
	res := t.res
	if isBlankRow(fields) {
		if t.seen > 0 {
			t.pendingBlank++
		}
		return nil
	}
	t.seen++
	res.Blank += t.pendingBlank
	t.pendingBlank = 0
	if t.seen == 1 && res.HasHeader || t.seen == 2 && res.UnitsRow {
		return nil
	}
	if t.data++; t.data > MaxReadings {
		return &CSVError{Line: line, Err: fmt.Errorf("%w (at most %d)", ErrCSVManyRows, MaxReadings)}
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
	x, y, why := rowPair(fields, res.XCol, res.YCol, raw, res.PairlineExport)
	if why != "" {
		res.Incomplete++
		res.Skipped = append(res.Skipped, SkippedRow{line, why})
		return nil
	}
	res.X = append(res.X, x)
	res.Y = append(res.Y, y)
	res.Lines = append(res.Lines, line)
	if res.PairlineExport {
		t.ex.add(res, fields, raw, line)
	}
	return nil
}

// chooseDecimalMark sets res.DecimalComma from the chosen cells: decimal
// comma when more cells show a decimal comma than a decimal point (a tie:
// when the delimiter is ';'), cells such as 1,234 that could be either not
// counted. Cells of both kinds add a warning.
func chooseDecimalMark(res *CSVResult) {
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

// ParsedPairs parses the chosen cells of a CSV result with the result's
// DecimalComma and returns the pairs whose cells are both numbers with their
// file lines. For the problems, CellProblem.Row is the index into res.X and
// res.Y (so res.Lines[p.Row] is the file line).
func ParsedPairs(res *CSVResult) (x, y []float64, lines []int, problems []CellProblem) {
	for i := range res.X {
		xv, xerr := ParseNumberHint(res.X[i], res.DecimalComma)
		yv, yerr := ParseNumberHint(res.Y[i], res.DecimalComma)
		if xerr != nil {
			problems = append(problems, CellProblem{Row: i, Column: ColumnX, Text: res.X[i], Reason: reasonOf(xerr)})
		}
		if yerr != nil {
			problems = append(problems, CellProblem{Row: i, Column: ColumnY, Text: res.Y[i], Reason: reasonOf(yerr)})
		}
		if xerr == nil && yerr == nil {
			x, y = append(x, xv), append(y, yv)
			lines = append(lines, res.Lines[i])
		}
	}
	return x, y, lines, problems
}

// Import appends the readings of a CSV result to the session and, when the
// session has not decided how to read "1,234", takes the result's
// DecimalComma. The history gets one "import" entry naming the number of
// readings and the lines they came from, not one entry per cell: the file
// itself is the record of what was read, and a 100,000-row import must not
// become 300,000 history entries. It returns the number of rows added.
func (s *Session) Import(res *CSVResult, now time.Time) (int, error) {
	if len(s.Readings)+len(res.X) > MaxReadings {
		return 0, fmt.Errorf("%w: the session would hold %d readings, at most %d are allowed", ErrBadValue, len(s.Readings)+len(res.X), MaxReadings)
	}
	if s.DecimalComma == nil {
		if err := s.SetField(FieldDecimalComma, strconv.FormatBool(res.DecimalComma), now); err != nil {
			return 0, err
		}
	}
	for _, f := range []struct{ name, cur, v string }{
		{FieldXName, s.XName, res.XName}, {FieldXUnit, s.XUnit, res.XUnit},
		{FieldYName, s.YName, res.YName}, {FieldYUnit, s.YUnit, res.YUnit},
	} {
		if f.cur == "" && f.v != "" && len(f.v) <= MaxShortText && utf8.ValidString(f.v) {
			if err := s.SetField(f.name, f.v, now); err != nil {
				return 0, err
			}
		}
	}
	if len(res.X) == 0 {
		return 0, nil
	}
	s.beforeChange(now)
	first := len(s.Readings)
	taken := now.UTC()
	extras := len(res.Notes) == len(res.X) && len(res.Excluded) == len(res.X) && len(res.Reasons) == len(res.X) && len(res.Taken) == len(res.X)
	s.Readings = slices.Grow(s.Readings, len(res.X))
	excluded := 0
	for i := range res.X {
		r := Reading{X: res.X[i], Y: res.Y[i], Taken: taken}
		if extras {
			r.Note, r.Excluded, r.ExcludeReason = res.Notes[i], res.Excluded[i], res.Reasons[i]
			if !res.Taken[i].IsZero() {
				r.Taken = res.Taken[i]
			}
			if r.Excluded {
				excluded++
			}
		}
		s.Readings = append(s.Readings, r)
	}
	what := fmt.Sprintf("%d readings (rows %d–%d)", len(res.X), first+1, len(s.Readings))
	if len(res.Lines) == len(res.X) {
		what += fmt.Sprintf(" from lines %d–%d", res.Lines[0], res.Lines[len(res.Lines)-1])
	}
	if extras {
		what += fmt.Sprintf(", with their notes and times, %d left out with their reasons", excluded)
	}
	s.record(now, EditImport, -1, "", what)
	return len(res.X), nil
}

// PasteRows puts pasted pairs into the session from row start on: rows
// that exist have their cells set (each change recorded with the text it
// replaced, as typing would be), rows beyond the end are added. The rows
// added get one "paste" entry in the history naming them, not three
// entries each: like an import, the pasted values are in the readings
// themselves, and pasting 10,000 rows must not make 30,000 entries that
// every save then carries. It returns the number of rows added.
func (s *Session) PasteRows(start int, xs, ys []string, now time.Time) (int, error) {
	if start < 0 || start > len(s.Readings) {
		return 0, fmt.Errorf("%w: row %d (the session has %d rows)", ErrNoSuchRow, start+1, len(s.Readings))
	}
	if len(xs) != len(ys) {
		return 0, fmt.Errorf("%w: %d x values and %d y values", ErrBadValue, len(xs), len(ys))
	}
	if start+len(xs) > MaxReadings {
		return 0, fmt.Errorf("%w: the session would hold %d readings, at most %d are allowed", ErrBadValue, start+len(xs), MaxReadings)
	}
	i := 0
	for ; i < len(xs) && start+i < len(s.Readings); i++ {
		if err := s.SetCell(start+i, ColumnX, xs[i], now); err != nil {
			return 0, err
		}
		if err := s.SetCell(start+i, ColumnY, ys[i], now); err != nil {
			return 0, err
		}
	}
	if i == len(xs) {
		return 0, nil
	}
	s.beforeChange(now)
	first := len(s.Readings)
	taken := now.UTC()
	s.Readings = slices.Grow(s.Readings, len(xs)-i)
	for ; i < len(xs); i++ {
		s.Readings = append(s.Readings, Reading{X: xs[i], Y: ys[i], Taken: taken})
	}
	s.record(now, EditPaste, -1, "", fmt.Sprintf("%d readings added (rows %d–%d)", len(s.Readings)-first, first+1, len(s.Readings)))
	return len(s.Readings) - first, nil
}

func columnTitle(name, unit, def string) string {
	if name == "" {
		name = def
	}
	if unit != "" {
		return name + " (" + unit + ")"
	}
	return name
}

// formulaStart holds the characters that make a spreadsheet read a cell as
// a formula (=, +, -, @) or that some spreadsheets drop before doing so
// (tab, CR): the OWASP guidance on CSV injection.
const formulaStart = "=+-@\t\r"

// startsFormula reports whether s, after any leading apostrophes, starts
// with one of formulaStart.
func startsFormula(s string) bool {
	t := strings.TrimLeft(s, "'")
	return t != "" && strings.IndexByte(formulaStart, t[0]) >= 0
}

// isNumberText reports whether s is a number written with only digits,
// signs, separators and an exponent ("-12.5", "+1,5e-3"): such a cell stays
// a number in a spreadsheet and is written as it is.
func isNumberText(s string, decimalComma bool) bool {
	for i := 0; i < len(s); i++ {
		if !strings.ContainsRune("0123456789+-.,eE", rune(s[i])) {
			return false
		}
	}
	_, err := ParseNumberHint(s, decimalComma)
	return err == nil
}

// Neutralise keeps a spreadsheet from running a text cell as a formula
// (common practice, after the OWASP guidance on CSV injection): a cell
// that starts with = + - @, a tab or a CR (after any apostrophes) and is not
// a number gets a leading apostrophe, and WriteTable then puts it in
// quotes. Numbers such as "-12.5" stay as they are. Cells that already
// start with apostrophes before such a character get one more, so that
// ReadCSV, taking one off in a file Pairline wrote, gives back the text as
// it was.
func Neutralise(s string, decimalComma bool) string {
	if startsFormula(s) && !isNumberText(s, decimalComma) {
		return "'" + s
	}
	return s
}

// unneutralise undoes Neutralise.
func unneutralise(s string) string {
	if strings.HasPrefix(s, "'") && startsFormula(s) {
		return s[1:]
	}
	return s
}

// WriteTable writes rows as comma-separated UTF-8 text, one row a line
// (LF), every cell through Neutralise. A cell is put in quotes (RFC 4180,
// doubled quotes inside) when it holds a comma, a quote, a line end or
// spaces at its ends, or when Neutralise changed it. decimalComma is how
// number cells are read (the session's DecimalComma). It is the one CSV
// writer of Pairline: readings and results, in the browser and natively.
func WriteTable(w io.Writer, rows [][]string, decimalComma bool) error {
	var b []byte
	for _, row := range rows {
		for j, cell := range row {
			if j > 0 {
				b = append(b, ',')
			}
			c := Neutralise(cell, decimalComma)
			if c != cell || strings.ContainsAny(c, ",\"\r\n") || strings.TrimSpace(c) != c {
				b = append(b, '"')
				b = append(b, strings.ReplaceAll(c, `"`, `""`)...)
				b = append(b, '"')
			} else {
				b = append(b, c...)
			}
		}
		b = append(b, '\n')
		if len(b) >= 64<<10 {
			if _, err := w.Write(b); err != nil {
				return err
			}
			b = b[:0]
		}
	}
	_, err := w.Write(b)
	return err
}

// WriteReadingsCSV writes the readings of a session with WriteTable: a
// header row, then x and y (titled with their names and units, cell text
// as typed), note, excluded ("yes" or empty), exclude_reason and taken
// (RFC 3339, UTC, empty when not recorded). Text that a spreadsheet would
// take for a formula is neutralised (see Neutralise); ReadCSV recognises the
// header and reads such cells back as they were typed.
func WriteReadingsCSV(w io.Writer, s *Session) error {
	dc := s.DecimalComma != nil && *s.DecimalComma
	rows := make([][]string, 0, len(s.Readings)+1)
	rows = append(rows, append([]string{columnTitle(s.XName, s.XUnit, "x"), columnTitle(s.YName, s.YUnit, "y")}, exportColumns...))
	cells := make([]string, 6*len(s.Readings))
	for i, r := range s.Readings {
		ex, taken := "", ""
		if r.Excluded {
			ex = "yes"
		}
		if !r.Taken.IsZero() {
			taken = r.Taken.UTC().Format(time.RFC3339Nano)
		}
		row := cells[6*i : 6*i+6 : 6*i+6]
		row[0], row[1], row[2], row[3], row[4], row[5] = r.X, r.Y, r.Note, ex, r.ExcludeReason, taken
		rows = append(rows, row)
	}
	return WriteTable(w, rows, dc)
}

// rowPair is the x and y cells of a data row as ReadCSV and StreamCSV take
// them (raw cells unescaped, a Pairline export's neutralised text
// restored), or why the row gives no pair: too few columns, or an empty
// cell.
func rowPair(fields []string, xc, yc int, raw, export bool) (x, y, skip string) {
	if xc >= len(fields) || yc >= len(fields) {
		return "", "", fmt.Sprintf("the row has only %d columns", len(fields))
	}
	x, y = fields[xc], fields[yc]
	if raw {
		x, y = unraw(x), unraw(y)
	}
	switch {
	case isBlank(x) && isBlank(y):
		return "", "", "the x and y cells are empty"
	case isBlank(x):
		return "", "", "the x cell is empty"
	case isBlank(y):
		return "", "", "the y cell is empty"
	}
	if export {
		x, y = unneutralise(x), unneutralise(y)
	}
	return x, y, ""
}

// tableCounts is what the first pass of ReadCSV and StreamCSV learns of a
// table: the number of non-blank rows, the first three of them, the widest
// row, and per column how many cells of the rows after the first are filled
// and how many of those hold numbers.
type tableCounts struct {
	rows                 int
	first, second, third []string
	firstLine            int
	width                int
	filled, nums         []int
}

// add counts a non-blank row read at line; keep copies a row that is kept
// (the first three), since the reader's fields may be reused.
func (tc *tableCounts) add(fields []string, line int, keep func([]string) []string) {
	tc.rows++
	tc.width = max(tc.width, len(fields))
	switch tc.rows {
	case 1:
		tc.first, tc.firstLine = keep(fields), line
		return
	case 2:
		tc.second = keep(fields)
	case 3:
		tc.third = keep(fields)
	}
	tc.count(fields, 1)
}

// count adds (by = 1) or takes away (by = −1) a row's cells from the
// column counts.
func (tc *tableCounts) count(fields []string, by int) {
	for len(tc.filled) < len(fields) {
		tc.filled, tc.nums = append(tc.filled, 0), append(tc.nums, 0)
	}
	for c, f := range fields {
		if !isBlank(f) {
			tc.filled[c] += by
			if isNumberCell(f) {
				tc.nums[c] += by
			}
		}
	}
}

// tableChoice is what decideTable decides between the passes.
type tableChoice struct {
	hasHeader, unitsRow, export bool
	header, units               []string
	numeric                     []int
	xc, yc                      int
}

// decideTable is the one rule of ReadCSV and StreamCSV for a table's
// header, units row, Pairline export, numeric columns and the x and y
// columns, from the first pass's counts (which it changes: the first row
// counts as data when it is no header, the units row does not). columns,
// when not nil, chooses x and y by the header's names.
//
// Each decision takes the ones before it: which of the first rows are a
// header and units (headerRows), the counts made to cover the data rows
// only (settleCounts), whether the file is a Pairline export (exportHeader),
// which columns hold numbers (numericColumns), and from those the x and y
// columns (pickColumns).
func decideTable(opt CSVOptions, tc *tableCounts, columns func(header []string) (int, int, error)) (tableChoice, error) {
	var ch tableChoice
	ch.hasHeader, ch.unitsRow = headerAndUnits(opt, tc)
	if err := ch.settleCounts(tc); err != nil {
		return ch, err
	}
	ch.exportHeader(opt)
	ch.numeric = numericColumns(tc)
	xc, yc, err := pickColumns(opt, tc.width, ch.header, ch.numeric, columns)
	if err != nil {
		return ch, err
	}
	ch.xc, ch.yc = xc, yc
	return ch, nil
}

// numberCells is the number of cells of f that read as numbers.
func numberCells(f []string) int {
	n := 0
	for _, c := range f {
		if isNumberCell(c) {
			n++
		}
	}
	return n
}

// headerAndUnits decides whether the first row is a header and the second a
// units row, as opt says or else from the rows: a header has a cell of
// text and is followed by a row with more numbers (or is the only row, or
// is followed by units); a units row is text only, with short cells, and
// has more numbers after it than the first row has. A units row needs a
// header above it and a row below it.
func headerAndUnits(opt CSVOptions, tc *tableCounts) (hasHeader, unitsRow bool) {
	hasText := false
	for _, c := range tc.first {
		if !isBlank(c) && !isNumberCell(c) {
			hasText = true
		}
	}
	looksUnits := tc.rows >= 3 && isUnitsRow(tc.second) && numberCells(tc.third) > numberCells(tc.first)
	if opt.Header != nil {
		hasHeader = *opt.Header
	} else {
		hasHeader = hasText && (tc.rows == 1 || numberCells(tc.second) > numberCells(tc.first) || looksUnits)
	}
	if !hasHeader {
		return false, false
	}
	if opt.UnitsRow != nil {
		return true, *opt.UnitsRow && tc.rows >= 2
	}
	return true, looksUnits
}

// settleCounts makes the first pass's column counts cover the data rows
// only, now that the header and units are known: the first pass counted
// every row but the first, so the units row is taken away and a first row
// that is no header added. It takes the header and units rows from tc, and
// refuses a table that holds nothing besides them.
func (ch *tableChoice) settleCounts(tc *tableCounts) error {
	if ch.unitsRow {
		ch.units = tc.second
		tc.count(tc.second, -1) // the units row was counted as data
		if tc.rows == 2 {
			return &CSVError{Line: tc.firstLine, Err: fmt.Errorf("%w: there are only a header row and a units row", ErrCSVNoData)}
		}
	}
	if ch.hasHeader {
		ch.header = tc.first
	} else {
		tc.count(tc.first, 1)
	}
	if ch.hasHeader && tc.rows == 1 {
		return &CSVError{Line: tc.firstLine, Err: fmt.Errorf("%w: there is only a header row", ErrCSVNoData)}
	}
	return nil
}

// exportHeader decides whether the table is a Pairline export (as opt says,
// or from the header's names) and then restores the header's neutralised
// text, as the export wrote it to keep a spreadsheet from reading a name as
// a formula.
func (ch *tableChoice) exportHeader(opt CSVOptions) {
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
}

// numericColumns are the columns where at least half of the filled data
// cells (and at least one) are numbers, in order.
func numericColumns(tc *tableCounts) []int {
	var numeric []int
	for c := range tc.filled {
		if tc.nums[c] > 0 && 2*tc.nums[c] >= tc.filled[c] {
			numeric = append(numeric, c)
		}
	}
	return numeric
}

// pickColumns gives the x and y columns: those of opt, or by the header's
// names when columns is not nil; a column asked for twice is detected
// instead; one beyond the widest row is refused; a detected column is the
// first numeric one the other column does not take.
func pickColumns(opt CSVOptions, width int, header []string, numeric []int, columns func(header []string) (int, int, error)) (xc, yc int, err error) {
	xc, yc = opt.XCol, opt.YCol
	if columns != nil {
		if xc, yc, err = columns(header); err != nil {
			return xc, yc, err
		}
	}
	if xc == yc {
		xc, yc = DetectColumn, DetectColumn
	}
	for _, c := range []int{xc, yc} {
		if c >= width {
			return xc, yc, &CSVError{Err: fmt.Errorf("%w: column %d (the file has %d columns)", ErrCSVNoColumn, c+1, width)}
		}
	}
	pick := func(not int) int {
		for _, c := range numeric {
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
		return xc, yc, &CSVError{Err: ErrCSVColumns}
	}
	return xc, yc, nil
}
