package session

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
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
	Header       []string     `json:"header"`
	Rows         [][]string   `json:"rows"` // every non-blank data row, all columns
	X, Y         []string     `json:"-"`
	Lines        []int        `json:"lines"`
	Skipped      []SkippedRow `json:"skipped"`
	Blank        int          `json:"blank"`      // blank rows between data rows
	Incomplete   int          `json:"incomplete"` // rows without an x or a y cell
	Delimiter    rune         `json:"delimiter"`
	DecimalComma bool         `json:"decimal_comma"`
	HasHeader    bool         `json:"has_header"`
	XCol, YCol   int          `json:"-"` // the columns used, from 0
	// Warnings are things worth a look: a file that was not UTF-8, columns
	// that mix decimal commas and points.
	Warnings []string `json:"warnings"`
}

// CSVError is a problem with a CSV or TSV file at a line and column (both
// from 1; 0 when not known). Err wraps one of the ErrCSV… sentinels.
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
	ErrCSVTooLarge  = errors.New("the file is larger than Pairline imports")
	ErrCSVNotText   = errors.New("the file is not a text table (is it a spreadsheet or session file? save it as CSV first)")
	ErrCSVQuote     = errors.New("a quote mark (\") is not closed, or stands inside a value; put quotes around the whole value or remove the mark")
	ErrCSVNoData    = errors.New("the file holds no readings")
	ErrCSVColumns   = errors.New("no two columns of numbers were found; choose the x and y columns")
	ErrCSVNoColumn  = errors.New("the chosen column does not exist")
	ErrCSVManyRows  = errors.New("the file has more rows than one session may hold")
	ErrCSVSameColum = errors.New("x and y cannot be the same column")
)

// ReadCSV imports paired readings from CSV or TSV text.
//
// Text: UTF-8 with or without a byte-order mark, or UTF-16 with a
// byte-order mark (as spreadsheet "Unicode text" exports are). Text that is
// not valid UTF-8 is read as Latin-1, with a warning. Quotes, doubled
// quotes inside quotes, CRLF line ends and blank rows are handled as
// encoding/csv handles them (RFC 4180).
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
//
// Rows whose cells are all empty count as Blank; rows without an x or y
// cell count as Incomplete and are listed in Skipped. Errors are *CSVError.
func ReadCSV(r io.Reader, opt CSVOptions) (*CSVResult, error) {
	data, err := io.ReadAll(io.LimitReader(r, MaxCSVSize+1))
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

// ReadPaste imports a block pasted from a spreadsheet: tab-separated unless
// the options say otherwise or the text has no tab (then as ReadCSV).
func ReadPaste(text string, opt CSVOptions) (*CSVResult, error) {
	if len(text) > MaxCSVSize {
		return nil, &CSVError{Err: fmt.Errorf("%w (more than %d MiB)", ErrCSVTooLarge, MaxCSVSize>>20)}
	}
	if opt.Delimiter == 0 && strings.ContainsRune(text, '\t') {
		opt.Delimiter = '\t'
	}
	t, warn, cerr := decodeText([]byte(text))
	if cerr != nil {
		return nil, cerr
	}
	return readTable(t, opt, warn)
}

func decodeText(data []byte) (string, []string, *CSVError) {
	var warn []string
	switch {
	case bytes.HasPrefix(data, []byte{0xef, 0xbb, 0xbf}):
		data = data[3:]
	case bytes.HasPrefix(data, []byte{0xff, 0xfe}), bytes.HasPrefix(data, []byte{0xfe, 0xff}):
		be := data[0] == 0xfe
		data = data[2:]
		if len(data)%2 != 0 {
			return "", nil, &CSVError{Err: fmt.Errorf("%w: the UTF-16 text has an odd number of bytes", ErrCSVNotText)}
		}
		u := make([]uint16, len(data)/2)
		for i := range u {
			if be {
				u[i] = uint16(data[2*i])<<8 | uint16(data[2*i+1])
			} else {
				u[i] = uint16(data[2*i+1])<<8 | uint16(data[2*i])
			}
		}
		data = []byte(string(utf16.Decode(u)))
	}
	if i := bytes.IndexByte(data, 0); i >= 0 {
		line := 1 + bytes.Count(data[:i], []byte{'\n'})
		return "", nil, &CSVError{Line: line, Err: ErrCSVNotText}
	}
	if !utf8.Valid(data) {
		rs := make([]rune, len(data))
		for i, b := range data {
			rs[i] = rune(b)
		}
		data = []byte(string(rs))
		warn = append(warn, "The file is not UTF-8 text; it was read as Latin-1. Check that units such as µ and ° look right.")
	}
	return string(data), warn, nil
}

// detectDelimiter applies the rule documented on ReadCSV.
func detectDelimiter(text string) rune {
	cands := []rune{'\t', ';', ','}
	var counts [][3]int
	var cur [3]int
	inQuote, nonEmpty := false, false
	for _, c := range text {
		if len(counts) >= 100 {
			break
		}
		switch {
		case c == '"':
			inQuote = !inQuote
			nonEmpty = true
		case inQuote:
		case c == '\n':
			if nonEmpty {
				counts = append(counts, cur)
			}
			cur, nonEmpty = [3]int{}, false
		default:
			for i, d := range cands {
				if c == d {
					cur[i]++
				}
			}
			if !unicode.IsSpace(c) {
				nonEmpty = true
			}
		}
	}
	if nonEmpty && len(counts) < 100 {
		counts = append(counts, cur)
	}
	best, bestScore := ',', 0
	for i, d := range cands {
		freq := map[int]int{}
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

func isNumberCell(s string) bool {
	_, _, err := parseNumber(s, hintDot)
	return err == nil
}

func readTable(text string, opt CSVOptions, warn []string) (*CSVResult, error) {
	res := &CSVResult{Warnings: warn}
	res.Delimiter = opt.Delimiter
	if res.Delimiter == 0 {
		res.Delimiter = detectDelimiter(text)
	}
	if res.Delimiter == '"' || res.Delimiter == '\r' || res.Delimiter == '\n' || !utf8.ValidRune(res.Delimiter) || res.Delimiter == utf8.RuneError {
		return nil, &CSVError{Err: fmt.Errorf("%q cannot separate fields", res.Delimiter)}
	}
	cr := csv.NewReader(strings.NewReader(text))
	cr.Comma = res.Delimiter
	cr.FieldsPerRecord = -1

	type row struct {
		line   int
		fields []string
	}
	var rows []row
	var prevEnd int64
	lineAtPrevEnd := 1
	for {
		rec, err := cr.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			var pe *csv.ParseError
			if errors.As(err, &pe) {
				e := pe.Err
				if errors.Is(e, csv.ErrQuote) || errors.Is(e, csv.ErrBareQuote) {
					e = fmt.Errorf("%w (%v)", ErrCSVQuote, pe.Err)
				}
				if errors.Is(e, ErrCSVQuote) && pe.StartLine > 0 && pe.StartLine < pe.Line {
					// An unclosed quote is found only at the end; point at its start.
					return nil, &CSVError{Line: pe.StartLine, Err: fmt.Errorf("%w (the quoted value that starts on this line is never closed)", ErrCSVQuote)}
				}
				return nil, &CSVError{Line: pe.Line, Column: pe.Column, Err: e}
			}
			return nil, &CSVError{Err: err}
		}
		line, _ := cr.FieldPos(0)
		res.Blank += max(0, line-lineAtPrevEnd)
		end := cr.InputOffset()
		lineAtPrevEnd += strings.Count(text[prevEnd:end], "\n")
		prevEnd = end
		blank := true
		for _, f := range rec {
			if !isBlank(f) {
				blank = false
				break
			}
		}
		if blank {
			res.Blank++
			continue
		}
		if len(rows) > MaxReadings {
			return nil, &CSVError{Line: line, Err: fmt.Errorf("%w (at most %d)", ErrCSVManyRows, MaxReadings)}
		}
		rows = append(rows, row{line, rec})
	}
	// Blank lines before the first row are not "between data rows".
	if len(rows) == 0 {
		return nil, &CSVError{Err: ErrCSVNoData}
	}

	numbers := func(f []string) int {
		n := 0
		for _, c := range f {
			if isNumberCell(c) {
				n++
			}
		}
		return n
	}
	if opt.Header != nil {
		res.HasHeader = *opt.Header
	} else {
		first := rows[0].fields
		hasText := false
		for _, c := range first {
			if !isBlank(c) && !isNumberCell(c) {
				hasText = true
			}
		}
		res.HasHeader = hasText && (len(rows) == 1 || numbers(rows[1].fields) > numbers(first))
	}
	data := rows
	if res.HasHeader {
		res.Header = rows[0].fields
		data = rows[1:]
	}
	if len(data) == 0 {
		return nil, &CSVError{Line: rows[0].line, Err: fmt.Errorf("%w: there is only a header row", ErrCSVNoData)}
	}
	width := len(res.Header)
	for _, r := range data {
		width = max(width, len(r.fields))
	}

	numeric := func(col int) bool {
		num, filled := 0, 0
		for _, r := range data {
			if col < len(r.fields) && !isBlank(r.fields[col]) {
				filled++
				if isNumberCell(r.fields[col]) {
					num++
				}
			}
		}
		return num > 0 && 2*num >= filled
	}
	xc, yc := opt.XCol, opt.YCol
	if xc == yc {
		xc, yc = DetectColumn, DetectColumn
	}
	for _, c := range []int{xc, yc} {
		if c >= width {
			return nil, &CSVError{Err: fmt.Errorf("%w: column %d (the file has %d columns)", ErrCSVNoColumn, c+1, width)}
		}
	}
	pick := func(not int) int {
		for c := 0; c < width; c++ {
			if c != not && numeric(c) {
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
		return nil, &CSVError{Err: ErrCSVColumns}
	}
	res.XCol, res.YCol = xc, yc

	for _, r := range data {
		res.Rows = append(res.Rows, r.fields)
		if xc >= len(r.fields) || yc >= len(r.fields) {
			res.Incomplete++
			res.Skipped = append(res.Skipped, SkippedRow{r.line, fmt.Sprintf("the row has only %d columns", len(r.fields))})
			continue
		}
		x, y := r.fields[xc], r.fields[yc]
		var why string
		switch {
		case isBlank(x) && isBlank(y):
			why = "the x and y cells are empty"
		case isBlank(x):
			why = "the x cell is empty"
		case isBlank(y):
			why = "the y cell is empty"
		}
		if why != "" {
			res.Incomplete++
			res.Skipped = append(res.Skipped, SkippedRow{r.line, why})
			continue
		}
		res.X = append(res.X, x)
		res.Y = append(res.Y, y)
		res.Lines = append(res.Lines, r.line)
	}

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
	if len(res.X) == 0 {
		return 0, nil
	}
	first := len(s.Readings)
	taken := now.UTC()
	s.Readings = slices.Grow(s.Readings, len(res.X))
	for i := range res.X {
		s.Readings = append(s.Readings, Reading{X: res.X[i], Y: res.Y[i], Taken: taken})
	}
	what := fmt.Sprintf("%d readings (rows %d–%d)", len(res.X), first+1, len(s.Readings))
	if len(res.Lines) == len(res.X) {
		what += fmt.Sprintf(" from lines %d–%d", res.Lines[0], res.Lines[len(res.Lines)-1])
	}
	s.record(now, "import", -1, "", what)
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
	first := len(s.Readings)
	taken := now.UTC()
	s.Readings = slices.Grow(s.Readings, len(xs)-i)
	for ; i < len(xs); i++ {
		s.Readings = append(s.Readings, Reading{X: xs[i], Y: ys[i], Taken: taken})
	}
	s.record(now, "paste", -1, "", fmt.Sprintf("%d readings added (rows %d–%d)", len(s.Readings)-first, first+1, len(s.Readings)))
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

// safeText keeps a spreadsheet from running a note as a formula: text that
// starts with = + - @ or a tab or CR gets a leading apostrophe (common
// practice against CSV formula injection).
func safeText(s string) string {
	if s != "" && strings.ContainsRune("=+-@\t\r", rune(s[0])) {
		return "'" + s
	}
	return s
}

// WriteReadingsCSV writes the readings of a session as comma-separated
// UTF-8 text with a header row: x and y (titled with their names and units,
// cell text as typed), note, excluded ("yes" or empty), exclude_reason and
// taken (RFC 3339, UTC, empty when not recorded). Notes and reasons that a
// spreadsheet would take for formulas are prefixed with an apostrophe.
func WriteReadingsCSV(w io.Writer, s *Session) error {
	cw := csv.NewWriter(w)
	_ = cw.Write([]string{columnTitle(s.XName, s.XUnit, "x"), columnTitle(s.YName, s.YUnit, "y"),
		"note", "excluded", "exclude_reason", "taken"})
	for _, r := range s.Readings {
		ex, taken := "", ""
		if r.Excluded {
			ex = "yes"
		}
		if !r.Taken.IsZero() {
			taken = r.Taken.UTC().Format(time.RFC3339Nano)
		}
		if err := cw.Write([]string{r.X, r.Y, safeText(r.Note), ex, safeText(r.ExcludeReason), taken}); err != nil {
			return err
		}
	}
	cw.Flush()
	return cw.Error()
}
