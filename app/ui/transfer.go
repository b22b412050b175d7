package ui

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
	"pairline/app/store"
)

// transferState is the Shell's state for files in and out, the trash, the
// storage figures and other tabs. It is embedded in Shell.
type transferState struct {
	importErr    string          // why the last import was refused; nothing stored changed
	importReport string          // what the last import did
	importing    string          // name of the file being read; "" when idle
	progress     float64         // 0 … 1 while importing
	conflict     *importConflict // imported sessions whose ID is already stored
	choice       *columnChoice   // a table with more than two columns of numbers
	usage        store.Usage
	usageKnown   bool
	usageAt      time.Time
	trash        []store.Summary
	trashOpen    bool
	elsewhere    *changedElsewhere
	channel      app.Value // BroadcastChannel("pairline"), or nil
	seenID       string    // the session whose stored version is seen
	seen         int64     // Modified (Unix ms) of the stored version this tab has
	shareOK      bool      // the browser can share files (Web Share API level 2)
	importSeq    int       // counts finished imports (data-seq, for tests and screen readers)
	listMore     int       // sessions the list draws beyond the first listPage
	importPhase  string    // what the import is doing now: "reading", "saving", …
	importTiming string    // how long the steps of the last table import took
}

// importConflict asks, one session at a time, what to do with imported
// sessions whose ID is already on the device.
type importConflict struct {
	file    string
	pending []*session.Session
	stored  map[string]store.Summary
	added   int
}

// columnChoice asks which columns hold x and y.
type columnChoice struct {
	file   string
	data   []byte
	labels []string // one per column
	x, y   int
}

// chunkLines is how many lines of a CSV file are read between two pauses
// that let the browser draw and handle input (Go's WebAssembly runs on the
// page's only thread).
const chunkLines = 1000

// sessionAccept is what the file input offers: session files and tables.
const sessionAccept = session.FileExtension + "," + session.MediaType + ",.csv,.tsv,.txt,text/csv,text/tab-separated-values,text/plain"

// mountTransfer installs what the browser offers for files: drag and drop
// onto the page, paste of a block into the grid, files opened from the
// operating system (launchQueue), other tabs (BroadcastChannel) and sharing.
// Natively (prerendering) app.Window() is inert and nothing is installed.
func (c *Shell) mountTransfer(ctx app.Context) {
	win := app.Window()
	doc := win.Get("document")
	if !doc.Truthy() {
		return
	}
	c.shareOK = canShareFiles()
	// Leaving the app (another app, the tab closed, the tablet put to
	// sleep) writes an edit still waiting for its save turn at once: a big
	// session is otherwise saved only once typing pauses.
	flush := app.FuncOf(func(this app.Value, args []app.Value) any {
		if doc.Get("visibilityState").String() == "hidden" || (len(args) > 0 && args[0].Get("type").String() == "pagehide") {
			c.ui.Dispatch(func(ctx app.Context) {
				if c.toSave {
					c.save(ctx)
				}
			})
		}
		return nil
	})
	doc.Call("addEventListener", "visibilitychange", flush)
	win.Call("addEventListener", "pagehide", flush)
	doc.Call("addEventListener", "dragover", app.FuncOf(func(this app.Value, args []app.Value) any {
		if len(args) > 0 && hasFiles(args[0]) {
			args[0].Call("preventDefault")
		}
		return nil
	}))
	doc.Call("addEventListener", "drop", app.FuncOf(func(this app.Value, args []app.Value) any {
		if len(args) == 0 || !hasFiles(args[0]) {
			return nil
		}
		args[0].Call("preventDefault")
		files := args[0].Get("dataTransfer").Get("files")
		if files.Length() > 0 {
			f := files.Index(0)
			ctx.Dispatch(func(ctx app.Context) { c.importFile(ctx, f) })
		}
		return nil
	}))
	doc.Call("addEventListener", "paste", app.FuncOf(func(this app.Value, args []app.Value) any {
		if len(args) == 0 {
			return nil
		}
		e := args[0]
		id := e.Get("target").Get("dataset").Get("testid")
		if id.Type() != app.TypeString || !strings.HasPrefix(id.String(), "x-input-") {
			return nil
		}
		row, err := strconv.Atoi(strings.TrimPrefix(id.String(), "x-input-"))
		if err != nil {
			return nil
		}
		text := e.Get("clipboardData").Call("getData", "text/plain").String()
		if t := strings.TrimRight(text, "\r\n"); !strings.ContainsAny(t, "\t\n") {
			return nil // one value: the browser pastes it into the cell as usual
		}
		e.Call("preventDefault")
		ctx.Dispatch(func(ctx app.Context) { c.pasteBlock(ctx, row, text) })
		return nil
	}))
	if lq := win.Get("launchQueue"); lq.Truthy() {
		lq.Call("setConsumer", app.FuncOf(func(this app.Value, args []app.Value) any {
			if len(args) == 0 || args[0].Get("files").Length() == 0 {
				return nil
			}
			handle := args[0].Get("files").Index(0)
			ctx.Async(func() {
				f, err := awaitJS(handle.Call("getFile"))
				ctx.Dispatch(func(ctx app.Context) {
					if err != nil {
						c.importErr = "The file could not be opened: " + err.Error()
						return
					}
					c.importFile(ctx, f)
				})
			})
			return nil
		}))
	}
	c.mountTabs(ctx)
	c.refreshUsageWhenReady(ctx, 0)
}

func hasFiles(e app.Value) bool {
	dt := e.Get("dataTransfer")
	if !dt.Truthy() {
		return false
	}
	types := dt.Get("types")
	for i := 0; i < types.Length(); i++ {
		if types.Index(i).String() == "Files" {
			return true
		}
	}
	return false
}

// importFile reads a File (from the input, a drop or the launch queue) and
// imports it: a session file when it starts with the magic bytes or is named
// .pairline, otherwise a CSV/TSV table.
func (c *Shell) importFile(ctx app.Context, f app.Value) {
	ctx = c.ui // dispatch through the Shell: the element that asked may be gone by then
	name := f.Get("name").String()
	if size := int64(f.Get("size").Float()); size > session.MaxFileSize {
		c.importFailed(name, fmt.Errorf("%w (%d MiB; at most %d MiB)", session.ErrTooLarge, size>>20, session.MaxFileSize>>20))
		return
	}
	if c.st == nil {
		c.importErr = "Pairline is still opening its storage; try again in a moment."
		return
	}
	c.importErr, c.importReport, c.choice, c.conflict = "", "", nil, nil
	c.importing, c.progress, c.importPhase = name, 0, "reading"
	ctx.Async(func() {
		data, err := readFile(f)
		if err != nil {
			ctx.Dispatch(func(ctx app.Context) { c.importFailed(name, fmt.Errorf("the file could not be read: %w", err)) })
			return
		}
		c.importData(ctx, name, data, -1, -1)
	})
}

// importData imports file bytes (off the UI goroutine). xCol and yCol are
// the chosen columns of a table, or −1 to detect them.
func (c *Shell) importData(ctx app.Context, name string, data []byte, xCol, yCol int) {
	if bytes.HasPrefix(data, session.Magic[:]) || strings.HasSuffix(strings.ToLower(name), session.FileExtension) {
		c.importSessionFile(ctx, name, data)
		return
	}
	c.importCSV(ctx, name, data, xCol, yCol)
}

// importFailed shows why a file was refused. Nothing stored has changed.
func (c *Shell) importFailed(name string, err error) {
	c.importing, c.choice = "", nil
	c.importSeq++
	c.importErr = "“" + name + "” was not imported, and nothing stored was changed: " + err.Error()
}

// importSessionFile decodes a session file and stores its sessions in one
// transaction; sessions whose ID is already stored wait for the technician.
func (c *Shell) importSessionFile(ctx app.Context, name string, data []byte) {
	st := c.st
	ctx.Dispatch(func(ctx app.Context) { c.importPhase = "checking the file" })
	f, err := session.Decode(bytes.NewReader(data))
	if err != nil {
		ctx.Dispatch(func(ctx app.Context) { c.importFailed(name, err) })
		return
	}
	stored := map[string]store.Summary{}
	list, err1 := st.List()
	trash, err2 := st.Trash()
	if err := errors.Join(err1, err2); err != nil {
		ctx.Dispatch(func(ctx app.Context) { c.importFailed(name, err) })
		return
	}
	for _, s := range append(list, trash...) {
		stored[s.ID] = s
	}
	var fresh, clash []*session.Session
	for _, s := range f.Sessions {
		if _, ok := stored[s.ID]; ok {
			clash = append(clash, s)
		} else {
			fresh = append(fresh, s)
		}
	}
	if err := saveAll(st, fresh); err != nil {
		ctx.Dispatch(func(ctx app.Context) { c.importFailed(name, err) })
		return
	}
	list, _ = st.List()
	ctx.Dispatch(func(ctx app.Context) {
		c.importing = ""
		c.importSeq++
		c.sessions = list
		for _, w := range f.Warnings {
			c.importReport += w + " "
		}
		if len(fresh) > 0 {
			c.openImported(ctx, fresh[0])
		}
		if len(clash) > 0 {
			c.conflict = &importConflict{file: name, pending: clash, stored: stored, added: len(fresh)}
			return
		}
		c.importReport += importedText(name, len(fresh), 0)
		c.refreshUsage(ctx)
	})
}

func importedText(name string, added, replaced int) string {
	t := "Imported " + plural(added, "session", "sessions") + " from “" + name + "”"
	if replaced > 0 {
		t += ", " + plural(replaced, "session", "sessions") + " replaced"
	}
	return t + "."
}

func plural(n int, one, many string) string {
	if n == 1 {
		return "1 " + one
	}
	return strconv.Itoa(n) + " " + many
}

// saveAll encodes sessions and stores them in one transaction.
func saveAll(st store.Store, ss []*session.Session) error {
	if len(ss) == 0 {
		return nil
	}
	sums := make([]store.Summary, len(ss))
	bodies := make([][]byte, len(ss))
	for i, s := range ss {
		job, err := encodeJob(s)
		if err != nil {
			return err
		}
		sums[i], bodies[i] = job.sum, job.body
		if i%20 == 19 {
			time.Sleep(time.Millisecond) // give the page its turn
		}
	}
	return st.SaveAll(sums, bodies)
}

// openImported shows an imported session and remembers it as the last open.
func (c *Shell) openImported(ctx app.Context, s *session.Session) {
	ctx = c.ui // dispatch through the Shell: the element that asked may be gone by then
	c.show(s)
	c.listOpen = false
	st, id := c.st, s.ID
	ctx.Async(func() { st.SetLast(id) })
}

// resolveConflict handles the first waiting session: "replace" overwrites the
// stored one, "both" keeps both (the imported one gets a new ID), "skip"
// leaves the stored one alone.
func (c *Shell) resolveConflict(ctx app.Context, how string) {
	ctx = c.ui // dispatch through the Shell: the element that asked may be gone by then
	k := c.conflict
	if k == nil || len(k.pending) == 0 {
		c.conflict = nil
		return
	}
	s := k.pending[0]
	k.pending = k.pending[1:]
	if how == "skip" {
		c.afterConflict(ctx, k)
		return
	}
	if how == "both" {
		id, err := session.NewID(nil)
		if err != nil {
			c.importFailed(k.file, err)
			return
		}
		s.ID = id
	}
	st := c.st
	ctx.Async(func() {
		err := saveNow(st, s)
		list, _ := st.List()
		ctx.Dispatch(func(ctx app.Context) {
			c.sessions = list
			if err != nil {
				c.importFailed(k.file, err)
				c.conflict = nil
				return
			}
			k.added++
			c.openImported(ctx, s)
			c.afterConflict(ctx, k)
		})
	})
}

func (c *Shell) afterConflict(ctx app.Context, k *importConflict) {
	if len(k.pending) > 0 {
		return
	}
	c.conflict = nil
	c.importSeq++
	c.importReport = importedText(k.file, k.added, 0)
	c.refreshUsage(ctx)
}

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
	s.XName, s.YName = "Reference", "Reading"
	if probe.HasHeader {
		if xCol < len(probe.Header) && probe.Header[xCol] != "" {
			s.XName = probe.Header[xCol]
		}
		if yCol < len(probe.Header) && probe.Header[yCol] != "" {
			s.YName = probe.Header[yCol]
		}
	}
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

// pasteBlock fills the grid from a block pasted into the x cell of row: the
// first column goes to x, the second to y, one reading per line, overwriting
// the rows below and adding rows as needed.
func (c *Shell) pasteBlock(ctx app.Context, row int, text string) {
	if c.sess == nil {
		return
	}
	res, err := session.ReadPaste(text, session.CSVOptions{})
	if err != nil {
		c.notice = "The pasted block was not used: " + err.Error()
		return
	}
	now := time.Now()
	if len(res.X)+row > session.MaxReadings {
		c.notice = fmt.Sprintf("The pasted block was not used: the session would hold more than %d readings.", session.MaxReadings)
		return
	}
	if c.sess.DecimalComma == nil {
		c.sess.SetField(session.FieldDecimalComma, strconv.FormatBool(res.DecimalComma), now)
	}
	if _, err := c.sess.PasteRows(row, res.X, res.Y, now); err != nil {
		c.notice = "The pasted block was not used: " + err.Error()
		return
	}
	c.notice = "Pasted " + plural(len(res.X), "reading", "readings") + " into rows " + strconv.Itoa(row+1) + "–" + strconv.Itoa(row+len(res.X)) + "."
	if res.Incomplete > 0 {
		c.notice += " " + plural(res.Incomplete, "incomplete line was", "incomplete lines were") + " skipped."
	}
	c.page = row / pageSize
	c.edited(ctx)
	c.collectAfterLoad()
}

// sessionFile encodes the open session as a session file.
func (c *Shell) sessionFile() ([]byte, error) {
	return session.EncodeBytes([]*session.Session{c.sess})
}

func (c *Shell) exportSession(ctx app.Context, e app.Event) {
	if c.sess == nil {
		return
	}
	b, err := c.sessionFile()
	if err != nil {
		c.notice = "The session could not be exported: " + err.Error()
		return
	}
	download(fileBase(c.sess.Title)+session.FileExtension, session.MediaType, b)
}

func (c *Shell) shareSession(ctx app.Context, e app.Event) {
	ctx = c.ui // dispatch through the Shell: the element that asked may be gone by then
	if c.sess == nil {
		return
	}
	b, err := c.sessionFile()
	if err != nil {
		c.notice = "The session could not be shared: " + err.Error()
		return
	}
	name, title := fileBase(c.sess.Title)+session.FileExtension, c.sess.Title
	ctx.Async(func() {
		if err := shareFile(name, session.MediaType, title, b); err != nil {
			ctx.Dispatch(func(ctx app.Context) {
				c.notice = "The session was not shared (" + err.Error() + "). Use “Save session file” instead."
			})
		}
	})
}

// exportAll writes every stored session (not the trash) into one file.
func (c *Shell) exportAll(ctx app.Context, e app.Event) {
	ctx = c.ui // dispatch through the Shell: the element that asked may be gone by then
	st := c.st
	if st == nil {
		return
	}
	ctx.Async(func() {
		list, err := st.List()
		var all []*session.Session
		for _, sm := range list {
			if err != nil {
				break
			}
			var s *session.Session
			if s, err = load(st, sm.ID); err == nil {
				all = append(all, s)
			}
		}
		var buf bytes.Buffer
		if err == nil {
			err = session.Encode(&buf, all)
		}
		ctx.Dispatch(func(ctx app.Context) {
			if err != nil {
				c.notice = "The sessions could not be exported: " + err.Error()
				return
			}
			download("pairline-sessions-"+time.Now().Format("2006-01-02")+session.FileExtension, session.MediaType, buf.Bytes())
		})
	})
}

func (c *Shell) exportCSV(ctx app.Context, e app.Event) {
	if c.sess == nil {
		return
	}
	var buf bytes.Buffer
	if err := session.WriteReadingsCSV(&buf, c.sess); err != nil {
		c.notice = "The readings could not be exported: " + err.Error()
		return
	}
	download(fileBase(c.sess.Title)+" readings.csv", "text/csv", buf.Bytes())
}

// exportResults writes the line's headline figures as CSV (full precision).
func (c *Shell) exportResults(ctx app.Context, e app.Event) {
	rep := c.view.report
	if c.sess == nil || rep == nil {
		return
	}
	rows := [][]string{{"figure", "value"}}
	for _, f := range []struct {
		name string
		v    float64
	}{
		{"pairs used (n)", float64(rep.N)},
		{"slope", rep.Slope.Estimate}, {"slope standard error", rep.Slope.SE},
		{"intercept", rep.Intercept.Estimate}, {"intercept standard error", rep.Intercept.SE},
		{"correlation r", rep.R}, {"r squared", rep.RSquared}, {"residual standard deviation", rep.ResidualSE},
	} {
		rows = append(rows, []string{f.name, numfmt.Full(f.v)})
	}
	// The same writer as the readings, so that no cell reaches a
	// spreadsheet as a formula.
	var buf bytes.Buffer
	if err := session.WriteTable(&buf, rows, false); err != nil {
		c.notice = "The results could not be exported: " + err.Error()
		return
	}
	download(fileBase(c.sess.Title)+" results.csv", "text/csv", buf.Bytes())
}

// download hands bytes to the browser as a file (a Blob behind an object
// URL and a temporary <a download>; blob: URLs are allowed by the CSP).
func download(name, mime string, b []byte) {
	win := app.Window()
	doc := win.Get("document")
	if !doc.Truthy() {
		return
	}
	blob := newBlob(mime, b)
	url := win.Get("URL").Call("createObjectURL", blob)
	a := doc.Call("createElement", "a")
	a.Set("href", url)
	a.Set("download", name)
	a.Set("rel", "noopener")
	doc.Get("body").Call("appendChild", a)
	a.Call("click")
	a.Call("remove")
	// Revoke once the browser has taken the file.
	win.Call("setTimeout", app.FuncOf(func(this app.Value, args []app.Value) any {
		win.Get("URL").Call("revokeObjectURL", url)
		return nil
	}), 60000)
}

func newBlob(mime string, b []byte) app.Value {
	win := app.Window()
	u8 := win.Get("Uint8Array").New(len(b))
	app.CopyBytesToJS(u8, b)
	parts := win.Get("Array").New()
	parts.Call("push", u8)
	opts := win.Get("Object").New()
	opts.Set("type", mime)
	return win.Get("Blob").New(parts, opts)
}

// fileShareData is {files: [File], title} for navigator.share.
func fileShareData(name, mime, title string, b []byte) app.Value {
	win := app.Window()
	u8 := win.Get("Uint8Array").New(len(b))
	app.CopyBytesToJS(u8, b)
	parts := win.Get("Array").New()
	parts.Call("push", u8)
	opts := win.Get("Object").New()
	opts.Set("type", mime)
	files := win.Get("Array").New()
	files.Call("push", win.Get("File").New(parts, name, opts))
	data := win.Get("Object").New()
	data.Set("files", files)
	if title != "" {
		data.Set("title", title)
	}
	return data
}

// canShareFiles reports whether navigator.share can send files here.
func canShareFiles() bool {
	nav := app.Window().Get("navigator")
	if !nav.Truthy() || !nav.Get("canShare").Truthy() || !app.Window().Get("File").Truthy() {
		return false
	}
	return nav.Call("canShare", fileShareData("probe"+session.FileExtension, session.MediaType, "", []byte{0})).Truthy()
}

// shareFile opens the device's share sheet with one file (blocks; call off
// the UI goroutine).
func shareFile(name, mime, title string, b []byte) error {
	_, err := awaitJS(app.Window().Get("navigator").Call("share", fileShareData(name, mime, title, b)))
	return err
}

// awaitJS waits for a JavaScript promise (off the UI goroutine).
func awaitJS(p app.Value) (app.Value, error) {
	done := make(chan struct{})
	var res app.Value
	var err error
	ok := app.FuncOf(func(this app.Value, args []app.Value) any {
		if len(args) > 0 {
			res = args[0]
		}
		close(done)
		return nil
	})
	bad := app.FuncOf(func(this app.Value, args []app.Value) any {
		err = errors.New("the browser refused")
		if len(args) > 0 && args[0].Truthy() {
			if m := args[0].Get("message"); m.Type() == app.TypeString && m.String() != "" {
				err = errors.New(m.String())
			}
		}
		close(done)
		return nil
	})
	defer ok.Release()
	defer bad.Release()
	p.Call("then", ok, bad)
	<-done
	return res, err
}

// readFile reads a File or Blob (off the UI goroutine).
func readFile(f app.Value) ([]byte, error) {
	buf, err := awaitJS(f.Call("arrayBuffer"))
	if err != nil {
		return nil, err
	}
	u8 := app.Window().Get("Uint8Array").New(buf)
	b := make([]byte, u8.Length())
	app.CopyBytesToGo(b, u8)
	return b, nil
}

// refreshUsageWhenReady waits for the store to open, then reads the usage.
func (c *Shell) refreshUsageWhenReady(ctx app.Context, tries int) {
	if c.st != nil {
		c.refreshUsage(ctx)
		return
	}
	if tries < 100 {
		ctx.After(200*time.Millisecond, func(ctx app.Context) { c.refreshUsageWhenReady(ctx, tries+1) })
	}
}

// refreshUsage asks the browser what is used of the quota (and, through
// store.Usage, for persistent storage).
func (c *Shell) refreshUsage(ctx app.Context) {
	ctx = c.ui // dispatch through the Shell: the element that asked may be gone by then
	st := c.st
	if st == nil {
		return
	}
	c.usageAt = time.Now()
	ctx.Async(func() {
		u, err := st.Usage()
		ctx.Dispatch(func(ctx app.Context) {
			if err == nil {
				c.usage, c.usageKnown = u, true
			}
		})
	})
}

// bytesText is a size for people: 1.2 MB, 640 kB, 512 bytes (SI units).
func bytesText(n int64) string {
	switch {
	case n >= 1e9:
		return numfmt.Sig(float64(n)/1e9, 2) + " GB"
	case n >= 1e6:
		return numfmt.Sig(float64(n)/1e6, 2) + " MB"
	case n >= 1e3:
		return numfmt.Sig(float64(n)/1e3, 2) + " kB"
	}
	return strconv.FormatInt(n, 10) + " bytes"
}

func (c *Shell) usageText() string {
	if !c.usageKnown || c.usage.Quota == 0 {
		return "Sessions are kept in this browser's storage on this device."
	}
	t := "Storage: " + bytesText(c.usage.Used) + " used of " + bytesText(c.usage.Quota) + " allowed."
	if c.usage.Persistent {
		return t + " The browser keeps these data even when the device runs low on space."
	}
	return t + " The browser may clear these data when the device runs low on space: export sessions you need to keep."
}

// renderTransferStrips draws what an import or another tab asks or reports.
func (c *Shell) renderTransferStrips() app.UI {
	return app.Div().Class("pl-xfer-strips").Body(
		app.If(c.importing != "", func() app.UI {
			return app.Div().Class("pl-strip pl-xfer-progress").Attr("role", "status").Body(
				app.Span().Text("Importing “"+c.importing+"”: "+c.importPhase+"…"),
				app.Progress().Max(1).Value(c.progress).DataSet("testid", "import-progress").
					DataSet("value", numfmt.Full(c.progress)).Attr("aria-label", "Import progress"),
				app.Span().Text(strconv.Itoa(int(c.progress*100))+" %"),
			)
		}),
		app.If(c.importErr != "", func() app.UI {
			return app.Div().Class("pl-strip pl-xfer-error").Attr("role", "alert").Body(
				app.Span().Class("pl-xfer-icon").Attr("aria-hidden", "true").Text("✖"),
				app.Span().DataSet("testid", "import-error").DataSet("seq", c.importSeq).Text(c.importErr),
				app.Button().Class("pl-btn pl-btn-quiet").Text("Dismiss").
					OnClick(func(ctx app.Context, e app.Event) { c.importErr = "" }),
			)
		}),
		app.If(c.conflict != nil && len(c.conflict.pending) > 0, c.renderConflict),
		app.If(c.choice != nil, c.renderColumnChoice),
		app.If(c.elsewhere != nil, c.renderElsewhere),
		app.If(c.saveState == SaveFailed && c.saveMessage == store.ErrQuota.Error(), func() app.UI {
			return app.Div().Class("pl-strip pl-xfer-full").DataSet("testid", "storage-full").Attr("role", "alert").
				Text("⚠ The device is full. The last change was not saved; what was saved before it is kept. Export this session, then delete old sessions to make room.")
		}),
	)
}

func (c *Shell) renderConflict() app.UI {
	k := c.conflict
	s := k.pending[0]
	old := k.stored[s.ID]
	where := ""
	if !old.Deleted.IsZero() {
		where = " (in the trash)"
	}
	return app.Div().Class("pl-strip pl-xfer-ask").Attr("role", "alertdialog").DataSet("testid", "import-conflict").DataSet("seq", c.importSeq).Body(
		app.P().Text(fmt.Sprintf("“%s” from the file (%s, changed %s) is already on this device%s as “%s” (%s, changed %s). Replace the stored one, or keep both?",
			s.Title, plural(len(s.Readings), "reading", "readings"), s.Modified.Local().Format("2 Jan 2006 15:04"),
			where, old.Title, plural(old.Readings, "reading", "readings"), old.Modified.Local().Format("2 Jan 2006 15:04"))),
		app.Div().Class("pl-xfer-actions").Body(
			app.Button().Class("pl-btn").Text("Keep both").DataSet("testid", "import-keep-both").
				OnClick(func(ctx app.Context, e app.Event) { c.resolveConflict(ctx, "both") }),
			app.Button().Class("pl-btn pl-btn-danger").Text("Replace the stored one").DataSet("testid", "import-replace").
				OnClick(func(ctx app.Context, e app.Event) { c.resolveConflict(ctx, "replace") }),
			app.Button().Class("pl-btn pl-btn-quiet").Text("Skip this one").DataSet("testid", "import-skip").
				OnClick(func(ctx app.Context, e app.Event) { c.resolveConflict(ctx, "skip") }),
		),
	)
}

func (c *Shell) renderColumnChoice() app.UI {
	ch := c.choice
	pick := func(testid, label string, cur int, set func(int)) app.UI {
		return app.Label().Class("pl-xfer-col").Body(
			app.Span().Text(label),
			app.Select().DataSet("testid", testid).OnChange(func(ctx app.Context, e app.Event) {
				if v, err := strconv.Atoi(ctx.JSSrc().Get("value").String()); err == nil {
					set(v)
				}
			}).Body(
				app.Range(ch.labels).Slice(func(i int) app.UI {
					return app.Option().Value(strconv.Itoa(i)).Selected(i == cur).Text(ch.labels[i])
				}),
			),
		)
	}
	return app.Div().Class("pl-strip pl-xfer-ask").Attr("role", "dialog").DataSet("testid", "import-columns").DataSet("seq", c.importSeq).Body(
		app.P().Text("“"+ch.file+"” has more than two columns of numbers. Which columns hold the known values (x) and the instrument values (y)?"),
		app.Div().Class("pl-xfer-actions").Body(
			pick("import-x-col", "x (known value)", ch.x, func(v int) { ch.x = v }),
			pick("import-y-col", "y (instrument value)", ch.y, func(v int) { ch.y = v }),
			app.Button().Class("pl-btn").Text("Import these columns").DataSet("testid", "import-columns-ok").
				OnClick(func(ctx app.Context, e app.Event) {
					name, data, x, y := ch.file, ch.data, ch.x, ch.y
					if x == y {
						c.importFailed(name, &session.CSVError{Err: session.ErrCSVSameColum})
						return
					}
					c.choice, c.importing, c.progress, c.importPhase = nil, name, 0, "reading"
					ctx = c.ui
					ctx.Async(func() { c.importCSV(ctx, name, data, x, y) })
				}),
			app.Button().Class("pl-btn pl-btn-quiet").Text("Cancel").DataSet("testid", "import-cancel").
				OnClick(func(ctx app.Context, e app.Event) { c.choice = nil }),
		),
	)
}

// renderTransfer draws the card for files: import, export, share, storage.
func (c *Shell) renderTransfer() app.UI {
	return app.Section().Class("pl-card pl-xfer").Attr("aria-label", "Files").Body(
		app.H2().Text("Files"),
		app.Div().Class("pl-xfer-actions").Body(
			app.Label().Class("pl-btn pl-xfer-pick").Body(
				app.Span().Text("Import a file…"),
				app.Input().Type("file").Class("pl-xfer-input").Accept(sessionAccept).
					DataSet("testid", "import-file").Attr("aria-label", "Import a session file or a CSV table").
					OnChange(func(ctx app.Context, e app.Event) {
						files := ctx.JSSrc().Get("files")
						if files.Length() == 0 {
							return
						}
						f := files.Index(0)
						ctx.JSSrc().Set("value", "")
						c.importFile(ctx, f)
					}),
			),
			app.If(c.shareOK, func() app.UI {
				return app.Button().Class("pl-btn").Text("Share session…").DataSet("testid", "export-share").OnClick(c.shareSession)
			}),
			app.Button().Class("pl-btn pl-btn-quiet").Text("Save session file").DataSet("testid", "export-session").OnClick(c.exportSession),
			app.Button().Class("pl-btn pl-btn-quiet").Text("Save all sessions").DataSet("testid", "export-all").OnClick(c.exportAll),
			app.Button().Class("pl-btn pl-btn-quiet").Text("Readings as CSV").DataSet("testid", "export-csv").OnClick(c.exportCSV),
			app.If(c.view.report != nil, func() app.UI {
				return app.Button().Class("pl-btn pl-btn-quiet").Text("Results as CSV").DataSet("testid", "export-results").OnClick(c.exportResults)
			}),
		),
		app.P().Class("pl-xfer-hint").Text("Session files (.pairline) and CSV or tab-separated tables can also be dropped onto the page. A block copied from a spreadsheet can be pasted into an x cell."),
		app.If(c.importReport != "", func() app.UI {
			return app.P().Class("pl-xfer-report").DataSet("testid", "import-report").DataSet("seq", c.importSeq).DataSet("timing", c.importTiming).Attr("role", "status").Text(c.importReport)
		}),
		app.P().Class("pl-xfer-usage").DataSet("testid", "storage-usage").
			DataSet("used", strconv.FormatInt(c.usage.Used, 10)).DataSet("quota", strconv.FormatInt(c.usage.Quota, 10)).
			DataSet("persistent", strconv.FormatBool(c.usage.Persistent)).Text(c.usageText()),
	)
}
