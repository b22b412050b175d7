package ui

// CSV import: column choice, chunked reading with progress, and its summary.

import (
	"bytes"
	"errors"
	"fmt"
	"strconv"
	"strings"
	"time"
	"unicode"
	"unicode/utf8"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/numfmt"
	"pairline/app/session"
)

// numericColumns returns the columns of a table in which at least half of
// the non-empty cells are numbers: the rule ReadCSV uses to pick columns,
// counted by ReadCSV in its one pass over the cells (counting here again
// cost columns × rows).
func numericColumns(res *session.CSVResult) []int { return res.NumericColumns }

// probeSize is how much of a table is read first to find its delimiter,
// header, decimal mark and columns.
const probeSize = 64 << 10

// importCSV reads a table into a new session, in chunks of chunkLines lines
// with a pause between them so that the page stays responsive, and stores
// it. The first probeSize bytes decide the delimiter, header, decimal mark
// and columns; with more than two columns of numbers and no choice made yet,
// the technician is asked.
func (c *Shell) importCSV(ctx app.Context, name string, data []byte, xCol, yCol int) {
	st := c.st
	fail := func(err error) { ctx.Dispatch(func(ctx app.Context) { c.importFailed(name, err) }) }
	data = bytes.TrimPrefix(data, []byte("\xef\xbb\xbf"))
	// Chunks are cut at LF; a table with quotes (a value may span lines) or
	// with lone CR line ends (the chunks would miscount lines) is read whole.
	chunked := utf8.Valid(data) && !bytes.ContainsRune(data, '"') && !hasLoneCR(data)
	head := data
	if chunked && len(head) > probeSize {
		cut := bytes.LastIndexByte(head[:probeSize], '\n')
		if cut > 0 {
			head = head[:cut+1]
		}
	}
	probe, err := session.ReadCSV(bytes.NewReader(head), session.CSVOptions{})
	if err != nil && len(head) < len(data) {
		// The beginning alone says nothing useful: read it all for the real error.
		chunked = false
		probe, err = session.ReadCSV(bytes.NewReader(data), session.CSVOptions{})
	}
	if err != nil {
		fail(err)
		return
	}
	labels := columnLabels(probe)
	if xCol < 0 && len(numericColumns(probe)) > 2 {
		ctx.Dispatch(func(ctx app.Context) {
			c.importing = ""
			c.importSeq++
			c.choice = &columnChoice{file: name, data: data, labels: labels, x: probe.XCol, y: probe.YCol}
		})
		return
	}
	if xCol < 0 {
		xCol, yCol = probe.XCol, probe.YCol
	}
	now := time.Now()
	s, err := session.New("Imported from "+name, now, nil)
	if err != nil {
		fail(err)
		return
	}
	// The names and units come from the file (session.Import: the header
	// cells, a units row under them, or the "name (unit)" of Pairline's
	// own export); a file without them gets the usual names afterwards.
	// Room for every line at once: growing a slice of 100,000 readings step
	// by step costs more than the reading itself. (An import is one history
	// entry, so the history needs no room.)
	if lines := bytes.Count(data, []byte("\n")) + 1; lines <= session.MaxReadings {
		s.Readings = make([]session.Reading, 0, lines)
	}
	sum := csvSummary{}
	started := time.Now()
	if chunked {
		ctx.Dispatch(func(ctx app.Context) { c.importPhase = "reading the readings" })
		var parts []*session.CSVResult
		var offsets []int
		shown := time.Now()
		blank, err := readChunks(data, probe, xCol, yCol, chunkLines, func(res *session.CSVResult, offset int) error {
			parts, offsets = append(parts, res), append(offsets, offset)
			return nil
		}, func(done float64) {
			// Every redraw of the page costs time too: show progress a few
			// times a second, but let the page have its turn after every chunk.
			if time.Since(shown) > 150*time.Millisecond {
				shown = time.Now()
				ctx.Dispatch(func(ctx app.Context) { c.progress = 0.8 * done })
			}
			time.Sleep(time.Millisecond)
		})
		// A chunk read alone can differ from the whole file (a chunk whose
		// rows are all short, say): then the whole file decides.
		chunked = err == nil
		for i, res := range parts {
			if !chunked {
				break
			}
			if _, err := s.Import(res, now); err != nil {
				fail(err)
				return
			}
			sum.add(res, offsets[i])
			if i%10 == 9 {
				p := 0.8 + 0.2*float64(i+1)/float64(len(parts))
				ctx.Dispatch(func(ctx app.Context) { c.progress = p })
				time.Sleep(time.Millisecond)
			}
		}
		sum.blank += blank
	}
	if !chunked {
		res, err := session.ReadCSV(bytes.NewReader(data), session.CSVOptions{XCol: xCol, YCol: yCol})
		if err == nil {
			_, err = s.Import(res, now)
		}
		if err != nil {
			fail(err)
			return
		}
		sum.add(res, 0)
	}
	if len(s.Readings) == 0 {
		fail(&session.CSVError{Err: session.ErrCSVNoData})
		return
	}
	if s.XName == "" {
		s.XName = "Reference"
	}
	if s.YName == "" {
		s.YName = "Reading"
	}
	// Encoding, storing and analysing a big session each take a while; a
	// pause between them lets the page draw the progress in between.
	parsed := time.Now()
	ctx.Dispatch(func(ctx app.Context) { c.importPhase = "storing the session" })
	time.Sleep(time.Millisecond)
	job, err := encodeJob(s)
	encoded := time.Now()
	if err == nil {
		time.Sleep(time.Millisecond)
		err = st.Save(job.sum, job.body)
	}
	stored := time.Now()
	if err != nil {
		fail(err)
		return
	}
	ctx.Dispatch(func(ctx app.Context) { c.importPhase = "fitting the line" })
	time.Sleep(time.Millisecond)
	took := time.Since(started)
	list, _ := st.List()
	report := sum.text(name, len(s.Readings), labels, xCol, yCol, took)
	ctx.Dispatch(func(ctx app.Context) {
		c.importing, c.progress = "", 1
		c.importSeq++
		c.sessions = list
		t := time.Now()
		c.openImported(ctx, s)
		// How long each step took, for the record of speed (data-timing).
		c.importTiming = fmt.Sprintf("read=%d encode=%d store=%d analyse=%d ms",
			parsed.Sub(started).Milliseconds(), encoded.Sub(parsed).Milliseconds(), stored.Sub(encoded).Milliseconds(), time.Since(t).Milliseconds())
		c.importReport = report
		c.announceSaved(ctx, job.sum)
	})
}

// readChunks reads a table n lines at a time with the delimiter, decimal
// mark and header the probe found and the columns xCol and yCol. It calls
// each with every chunk's result and the number of file lines before the
// chunk (add it to the result's line numbers), then pause with the share of
// the bytes read. It returns the blank lines of chunks that hold no data
// row. Errors are those of session.ReadCSV with file line numbers. The text
// must not hold quotes (a quoted value may span lines) and must be UTF-8
// without a byte-order mark; otherwise read it whole.
func readChunks(data []byte, probe *session.CSVResult, xCol, yCol, n int, each func(*session.CSVResult, int) error, pause func(float64)) (int, error) {
	dc, hdr, noHdr, own := probe.DecimalComma, probe.HasHeader, false, probe.PairlineExport
	opt := session.CSVOptions{Delimiter: probe.Delimiter, DecimalComma: &dc, Header: &hdr, XCol: xCol, YCol: yCol, PairlineExport: &own}
	line, blank := 0, 0
	for start := 0; start < len(data); {
		end, lines := start, 0
		for end < len(data) && lines < n {
			i := bytes.IndexByte(data[end:], '\n')
			if i < 0 {
				end = len(data)
			} else {
				end += i + 1
			}
			lines++
		}
		chunk := data[start:end]
		res, err := session.ReadCSV(bytes.NewReader(chunk), opt)
		filled := hasCells(chunk, probe.Delimiter) // holds the header, if the file has one
		switch {
		case errors.Is(err, session.ErrCSVNoData):
			if !filled {
				blank += lines
			}
		case err != nil:
			var ce *session.CSVError
			if errors.As(err, &ce) && ce.Line > 0 {
				ce.Line += line
			}
			return blank, err
		default:
			if err := each(res, line); err != nil {
				return blank, err
			}
		}
		if filled {
			opt.Header = &noHdr
		}
		start, line = end, line+lines
		if pause != nil {
			pause(float64(end) / float64(len(data)))
		}
	}
	return blank, nil
}

// hasLoneCR reports whether data has a CR not followed by LF (a line end
// of old Mac spreadsheets, which ReadCSV reads but readChunks does not cut at).
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

// hasCells reports whether some line of chunk has a cell that is not empty:
// a line of delimiters only (";;") is a blank row to ReadCSV, not a header.
func hasCells(chunk []byte, delim rune) bool {
	return len(bytes.TrimFunc(chunk, func(r rune) bool { return r == delim || unicode.IsSpace(r) })) > 0
}

// csvSummary adds up the chunks of a table.
type csvSummary struct {
	blank, incomplete int
	skipped           []int // file lines
	warnings          []string
}

func (u *csvSummary) add(res *session.CSVResult, lineOffset int) {
	u.blank += res.Blank
	u.incomplete += res.Incomplete
	for _, sk := range res.Skipped {
		u.skipped = append(u.skipped, sk.Line+lineOffset)
	}
	for _, w := range res.Warnings {
		known := false
		for _, k := range u.warnings {
			known = known || k == w
		}
		if !known {
			u.warnings = append(u.warnings, w)
		}
	}
}

func (u *csvSummary) text(name string, n int, labels []string, xCol, yCol int, took time.Duration) string {
	t := "Imported " + plural(n, "reading", "readings") + " from “" + name + "” into a new session: x from " +
		labelOf(labels, xCol) + ", y from " + labelOf(labels, yCol) + "."
	if u.blank > 0 {
		t += " " + plural(u.blank, "blank row was", "blank rows were") + " left out."
	}
	if u.incomplete > 0 {
		lines := make([]string, 0, 5)
		for i, l := range u.skipped {
			if i == 5 {
				lines = append(lines, "…")
				break
			}
			lines = append(lines, strconv.Itoa(l))
		}
		t += " " + plural(u.incomplete, "incomplete row was", "incomplete rows were") + " skipped (line " + strings.Join(lines, ", ") + ")."
	}
	for _, w := range u.warnings {
		t += " " + w
	}
	if n >= 10000 {
		t += " (" + numfmt.Sig(took.Seconds(), 2) + " s)"
	}
	return t
}

func columnLabels(res *session.CSVResult) []string {
	labels := make([]string, res.Width)
	for j := range labels {
		labels[j] = "column " + strconv.Itoa(j+1)
		if res.HasHeader && j < len(res.Header) && strings.TrimSpace(res.Header[j]) != "" {
			labels[j] += " “" + strings.TrimSpace(res.Header[j]) + "”"
		}
	}
	return labels
}

func labelOf(labels []string, j int) string {
	if j >= 0 && j < len(labels) {
		return labels[j]
	}
	return "column " + strconv.Itoa(j+1)
}
