package ui

// Files in: the drop zone, the file picker and launch queue, and routing a file to the session or CSV import.

import (
	"bytes"
	"fmt"
	"strconv"
	"strings"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/session"
	"pairline/app/store"
)

// transferState is the Shell's state for files in and out (Shell.xfer).
type transferState struct {
	importErr    string          // why the last import was refused; nothing stored changed
	importReport string          // what the last import did
	importing    string          // name of the file being read; "" when idle
	progress     float64         // 0 … 1 while importing
	conflict     *importConflict // imported sessions whose ID is already stored
	choice       *columnChoice   // a table with more than two columns of numbers
	shareOK      bool            // the browser can share files (Web Share API level 2)
	importSeq    int             // counts finished imports (data-seq, for tests and screen readers)
	listMore     int             // sessions the list draws beyond the first listPage
	importPhase  string          // what the import is doing now: "reading", "saving", …
	importTiming string          // how long the steps of the last table import took
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
	c.xfer.shareOK = canShareFiles()
	// Leaving the app (another app, the tab closed, the tablet put to
	// sleep) writes an edit still waiting for its save turn at once: a big
	// session is otherwise saved only once typing pauses.
	flush := app.FuncOf(func(this app.Value, args []app.Value) any {
		if doc.Get("visibilityState").String() == "hidden" || (len(args) > 0 && args[0].Get("type").String() == "pagehide") {
			c.ui.Dispatch(func(ctx app.Context) {
				if c.ctl.toSave {
					c.ctl.save()
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
						c.xfer.importErr = "The file could not be opened: " + err.Error()
						return
					}
					c.importFile(ctx, f)
				})
			})
			return nil
		}))
	}
	c.tabs.mount(ctx, c.otherTabSaved)
	c.usage.refreshWhenReady(ctx, c.ctl, 0)
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
func (c *Shell) importFile(_ app.Context, f app.Value) {
	ctx := c.ui // dispatch through the Shell: the element that asked may be gone by then
	name := f.Get("name").String()
	if size := int64(f.Get("size").Float()); size > session.MaxFileSize {
		c.xfer.failed(name, fmt.Errorf("%w (%d MiB; at most %d MiB)", session.ErrTooLarge, size>>20, session.MaxFileSize>>20))
		return
	}
	if c.ctl.st == nil {
		c.xfer.importErr = "Pairline is still opening its storage; try again in a moment."
		return
	}
	c.xfer.importErr, c.xfer.importReport, c.xfer.choice, c.xfer.conflict = "", "", nil, nil
	c.xfer.importing, c.xfer.progress, c.xfer.importPhase = name, 0, "reading"
	ctx.Async(func() {
		data, err := readFile(f)
		if err != nil {
			ctx.Dispatch(func(ctx app.Context) { c.xfer.failed(name, fmt.Errorf("the file could not be read: %w", err)) })
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

// failed shows why a file was refused. Nothing stored has changed.
func (t *transferState) failed(name string, err error) {
	t.importing, t.choice = "", nil
	t.importSeq++
	t.importErr = "“" + name + "” was not imported, and nothing stored was changed: " + err.Error()
}
