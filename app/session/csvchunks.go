package session

// Reading a table in chunks of whole lines, so that a screen can pause
// between them (to draw its progress) and still get what ReadCSV gives for
// the whole text: ProbeCSV decides the table's form from its beginning,
// CSVChunks reads it chunk by chunk with that form, CSVTally adds up what
// the chunks skipped. The screen only drives them (app/ui/import_csv.go).

import (
	"bytes"
	"errors"
	"io"
	"unicode"
	"unicode/utf8"
)

// CSVProbeSize is how much of a table ProbeCSV reads to find its
// delimiter, header, decimal mark and columns (cut back to the last whole
// line).
const CSVProbeSize = 64 << 10

// ProbeCSV reads the beginning of data (at most CSVProbeSize bytes, whole
// lines) with ReadCSV to decide the table's delimiter, header, decimal mark
// and columns, and says whether data can be read in chunks of lines:
// only UTF-8 text without quotes (a quoted value may span lines) and
// without lone CR line ends (CSVChunks cuts at LF only, and would miscount
// lines). Text that cannot be chunked is probed whole; so is text whose
// beginning alone fails, so that the error is the whole text's (chunkable
// is then false). data should not start with a byte-order mark (the screen
// takes it off first; CSVChunks counts it as part of the first cell).
func ProbeCSV(data []byte) (probe *CSVResult, chunkable bool, err error) {
	chunkable = utf8.Valid(data) && !bytes.ContainsRune(data, '"') && !hasLoneCR(data)
	head := data
	if chunkable && len(head) > CSVProbeSize {
		if cut := bytes.LastIndexByte(head[:CSVProbeSize], '\n'); cut > 0 {
			head = head[:cut+1]
		}
	}
	probe, err = ReadCSV(bytes.NewReader(head), CSVOptions{})
	if err != nil && len(head) < len(data) {
		chunkable = false
		probe, err = ReadCSV(bytes.NewReader(data), CSVOptions{})
	}
	return probe, chunkable, err
}

// hasLoneCR reports whether data has a CR not followed by LF (a line end
// of old Mac spreadsheets, which ReadCSV reads but CSVChunks does not cut
// at).
func hasLoneCR(data []byte) bool {
	for i := bytes.IndexByte(data, '\r'); i >= 0; {
		if i+1 >= len(data) || data[i+1] != '\n' {
			return true
		}
		j := bytes.IndexByte(data[i+1:], '\r')
		if j < 0 {
			return false
		}
		i += 1 + j
	}
	return false
}

// CSVChunks reads a table that ProbeCSV found chunkable, a given number of
// lines at a time, each chunk with ReadCSV and the form the probe found
// (delimiter, decimal mark, header and units row, in the chunk that holds
// them; Pairline's own export) and the chosen columns. Every chunk's line numbers (Lines, Skipped,
// a *CSVError's Line) are lines of the whole text. A chunk read alone can
// still differ from the whole text (a chunk whose rows are all short may be
// refused); then Next fails and the caller reads the text whole.
//
// Cost: linear in the text; each line is read once.
type CSVChunks struct {
	data       []byte
	delim      rune
	opt        CSVOptions
	lines      int
	start      int // byte offset of the next chunk
	line       int // lines before the next chunk
	blank      int
	headerRows int  // rows of the header and units row, kept in one chunk
	headerDone bool // the chunk with the header was read
}

// NewCSVChunks prepares to read data in chunks of lines lines (at least
// 1) with the form of probe and the columns xCol and yCol (from 0).
func NewCSVChunks(data []byte, probe *CSVResult, xCol, yCol, lines int) *CSVChunks {
	dc, hdr, own, units := probe.DecimalComma, probe.HasHeader, probe.PairlineExport, probe.UnitsRow
	return &CSVChunks{
		data:  data,
		delim: probe.Delimiter,
		opt: CSVOptions{Delimiter: probe.Delimiter, DecimalComma: &dc, Header: &hdr, XCol: xCol, YCol: yCol,
			PairlineExport: &own, UnitsRow: &units},
		lines:      max(lines, 1),
		headerRows: headerRows(hdr, units),
	}
}

// headerRows is the number of rows before the data: the header and the
// units row under it.
func headerRows(header, units bool) int {
	switch {
	case header && units:
		return 2
	case header:
		return 1
	}
	return 0
}

// Next reads the next chunk. It returns the chunk's result, or nil for a
// chunk without a data row (its blank lines count in Blank), and io.EOF
// after the last chunk. Errors are those of ReadCSV, with lines of the
// whole text. The first chunk with cells is made long enough to hold the
// header and the units row together.
func (c *CSVChunks) Next() (*CSVResult, error) {
	if c.start >= len(c.data) {
		return nil, io.EOF
	}
	end, lines, filledLines := c.start, 0, 0
	for end < len(c.data) && (lines < c.lines || !c.headerDone && filledLines > 0 && filledLines < c.headerRows) {
		next := len(c.data)
		if i := bytes.IndexByte(c.data[end:], '\n'); i >= 0 {
			next = end + i + 1
		}
		if hasCells(c.data[end:next], c.delim) {
			filledLines++
		}
		end, lines = next, lines+1
	}
	chunk, offset := c.data[c.start:end], c.line
	c.start, c.line = end, c.line+lines
	res, err := ReadCSV(bytes.NewReader(chunk), c.opt)
	if filledLines > 0 && !c.headerDone {
		// The chunk held the header, if the text has one: no other does.
		c.headerDone = true
		noHdr, noUnits := false, false
		c.opt.Header, c.opt.UnitsRow = &noHdr, &noUnits
	}
	switch {
	case errors.Is(err, ErrCSVNoData):
		if filledLines == 0 {
			c.blank += lines
		}
		return nil, nil
	case err != nil:
		var ce *CSVError
		if errors.As(err, &ce) && ce.Line > 0 {
			ce.Line += offset
		}
		return nil, err
	}
	for i := range res.Lines {
		res.Lines[i] += offset
	}
	for i := range res.Skipped {
		res.Skipped[i].Line += offset
	}
	return res, nil
}

// Done is the share of the text read so far, from 0 to 1.
func (c *CSVChunks) Done() float64 {
	if len(c.data) == 0 {
		return 1
	}
	return float64(c.start) / float64(len(c.data))
}

// Blank is the number of blank lines in the chunks read so far that held
// no data row (a chunk's own blank rows between data rows are its Blank).
func (c *CSVChunks) Blank() int { return c.blank }

// hasCells reports whether some line of chunk has a cell that is not empty:
// a line of delimiters only (";;") is a blank row to ReadCSV, not a header.
func hasCells(chunk []byte, delim rune) bool {
	return len(bytes.TrimFunc(chunk, func(r rune) bool { return r == delim || unicode.IsSpace(r) })) > 0
}

// CSVTally adds up what the chunks of a table (or the one result of a
// table read whole) left out: blank rows, incomplete rows with their lines,
// and the warnings, each once.
type CSVTally struct {
	Blank, Incomplete int
	// Skipped are the lines of the rows that gave no reading, in the order
	// the results were added.
	Skipped  []int
	Warnings []string
}

// Add counts one result.
func (t *CSVTally) Add(res *CSVResult) {
	t.Blank += res.Blank
	t.Incomplete += res.Incomplete
	for _, sk := range res.Skipped {
		t.Skipped = append(t.Skipped, sk.Line)
	}
	for _, w := range res.Warnings {
		known := false
		for _, k := range t.Warnings {
			known = known || k == w
		}
		if !known {
			t.Warnings = append(t.Warnings, w)
		}
	}
}
