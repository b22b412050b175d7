package ui

// CSV import: column choice, chunked reading with progress, and its summary.

import (
	"bytes"
	"fmt"
	"io"
	"strconv"
	"strings"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/numfmt"
	"pairline/app/session"
)

// numericColumns returns the columns of a table in which at least half of
// the non-empty cells are numbers: the rule ReadCSV uses to pick columns,
// counted by ReadCSV in its one pass over the cells (counting here again
// cost columns × rows).
func numericColumns(res *session.CSVResult) []int { return res.NumericColumns }

// importCSV reads a table into a new session, in chunks of chunkLines lines
// with a pause between them so that the page stays responsive, and stores
// it. The first session.CSVProbeSize bytes decide the delimiter, header,
// decimal mark and columns (session.ProbeCSV); with more than two columns
// of numbers and no choice made yet, the technician is asked. The chunks are
// read by session.CSVChunks; this function only paces them and shows the
// progress.
func (c *Shell) importCSV(ctx app.Context, name string, data []byte, xCol, yCol int) {
	st := c.st
	fail := func(err error) { ctx.Dispatch(func(ctx app.Context) { c.importFailed(name, err) }) }
	data = bytes.TrimPrefix(data, []byte("\xef\xbb\xbf"))
	probe, chunked, err := session.ProbeCSV(data)
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
	started := time.Now()
	sum, err := c.importReadings(ctx, s, data, probe, chunked, xCol, yCol, now)
	if err != nil {
		fail(err)
		return
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
	report := csvSummaryText(&sum, name, len(s.Readings), labels, xCol, yCol, took)
	ctx.Dispatch(func(ctx app.Context) {
		c.importing, c.progress = "", 1
		c.importSeq++
		c.listChanged(list)
		t := time.Now()
		c.openImported(ctx, s)
		// How long each step took, for the record of speed (data-timing).
		c.importTiming = fmt.Sprintf("read=%d encode=%d store=%d analyse=%d ms",
			parsed.Sub(started).Milliseconds(), encoded.Sub(parsed).Milliseconds(), stored.Sub(encoded).Milliseconds(), time.Since(t).Milliseconds())
		c.importReport = report
		c.announceSaved(ctx, job.sum)
	})
}

// importReadings reads the readings of data into s: in chunks when the
// probe found the file can be read so (importChunks), else, or when the
// chunks disagree with the whole file, in one go. A file without names for
// x and y gets the usual ones. It returns what was left out.
func (c *Shell) importReadings(ctx app.Context, s *session.Session, data []byte, probe *session.CSVResult, chunked bool, xCol, yCol int, now time.Time) (session.CSVTally, error) {
	sum := session.CSVTally{}
	if chunked {
		var err error
		if chunked, err = c.importChunks(ctx, s, &sum, data, probe, xCol, yCol, now); err != nil {
			return sum, err
		}
	}
	if !chunked {
		res, err := session.ReadCSV(bytes.NewReader(data), session.CSVOptions{XCol: xCol, YCol: yCol})
		if err == nil {
			_, err = s.Import(res, now)
		}
		if err != nil {
			return sum, err
		}
		sum.Add(res)
	}
	if len(s.Readings) == 0 {
		return sum, &session.CSVError{Err: session.ErrCSVNoData}
	}
	if s.XName == "" {
		s.XName = "Reference"
	}
	if s.YName == "" {
		s.YName = "Reading"
	}
	return sum, nil
}

// importChunks reads data in chunks of chunkLines lines (session.CSVChunks),
// pausing after each so that the page stays responsive and showing the
// progress a few times a second, then imports them into s. It returns false
// when a chunk read alone differs from the whole file (a chunk whose rows
// are all short, say): then nothing was imported and the whole file decides.
func (c *Shell) importChunks(ctx app.Context, s *session.Session, sum *session.CSVTally, data []byte, probe *session.CSVResult, xCol, yCol int, now time.Time) (bool, error) {
	ctx.Dispatch(func(ctx app.Context) { c.importPhase = "reading the readings" })
	var parts []*session.CSVResult
	shown := time.Now()
	chunks := session.NewCSVChunks(data, probe, xCol, yCol, chunkLines)
	res, err := chunks.Next()
	for ; err == nil; res, err = chunks.Next() {
		if res != nil {
			parts = append(parts, res)
		}
		// Every redraw of the page costs time too: show progress a few
		// times a second, but let the page have its turn after every chunk.
		if time.Since(shown) > 150*time.Millisecond {
			shown = time.Now()
			done := chunks.Done()
			ctx.Dispatch(func(ctx app.Context) { c.progress = 0.8 * done })
		}
		time.Sleep(time.Millisecond)
	}
	if err != io.EOF {
		return false, nil
	}
	for i, res := range parts {
		if _, err := s.Import(res, now); err != nil {
			return true, err
		}
		sum.Add(res)
		if i%10 == 9 {
			p := 0.8 + 0.2*float64(i+1)/float64(len(parts))
			ctx.Dispatch(func(ctx app.Context) { c.progress = p })
			time.Sleep(time.Millisecond)
		}
	}
	sum.Blank += chunks.Blank()
	return true, nil
}

// csvSummaryText is the import's summary in words, from what the chunks
// (or the whole file) left out.
func csvSummaryText(u *session.CSVTally, name string, n int, labels []string, xCol, yCol int, took time.Duration) string {
	t := "Imported " + plural(n, "reading", "readings") + " from “" + name + "” into a new session: x from " +
		labelOf(labels, xCol) + ", y from " + labelOf(labels, yCol) + "."
	if u.Blank > 0 {
		t += " " + plural(u.Blank, "blank row was", "blank rows were") + " left out."
	}
	if u.Incomplete > 0 {
		lines := make([]string, 0, 5)
		for i, l := range u.Skipped {
			if i == 5 {
				lines = append(lines, "…")
				break
			}
			lines = append(lines, strconv.Itoa(l))
		}
		t += " " + plural(u.Incomplete, "incomplete row was", "incomplete rows were") + " skipped (line " + strings.Join(lines, ", ") + ")."
	}
	for _, w := range u.Warnings {
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
