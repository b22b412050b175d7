package ui

// The render functions of the files card: progress strips, conflict choice, column choice, the card.

import (
	"fmt"
	"strconv"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/numfmt"
	"pairline/app/session"
	"pairline/app/store"
)

// renderTransferStrips draws what an import or another tab asks or reports.
func (c *Shell) renderTransferStrips() app.UI {
	return app.Div().Class("pl-xfer-strips").Body(
		app.If(c.xfer.importing != "", func() app.UI {
			return app.Div().Class("pl-strip pl-xfer-progress").Attr("role", "status").Body(
				app.Span().Text("Importing “"+c.xfer.importing+"”: "+c.xfer.importPhase+"…"),
				app.Progress().Max(1).Value(c.xfer.progress).DataSet("testid", "import-progress").
					DataSet("value", numfmt.Full(c.xfer.progress)).Attr("aria-label", "Import progress"),
				app.Span().Text(strconv.Itoa(int(c.xfer.progress*100))+" %"),
			)
		}),
		app.If(c.xfer.importErr != "", func() app.UI {
			return app.Div().Class("pl-strip pl-xfer-error").Attr("role", "alert").Body(
				app.Span().Class("pl-xfer-icon").Attr("aria-hidden", "true").Text("✖"),
				app.Span().DataSet("testid", "import-error").DataSet("seq", c.xfer.importSeq).Text(c.xfer.importErr),
				app.Button().Class("pl-btn pl-btn-quiet").Text("Dismiss").
					OnClick(func(ctx app.Context, e app.Event) { c.xfer.importErr = "" }),
			)
		}),
		app.If(c.xfer.conflict != nil && len(c.xfer.conflict.pending) > 0, c.renderConflict),
		app.If(c.xfer.choice != nil, c.renderColumnChoice),
		app.If(c.tabs.elsewhere != nil, func() app.UI {
			return c.tabs.render(c.reloadFromStore, c.keepAsCopy, c.ctl.save)
		}),
		app.If(c.ctl.saveState == SaveFailed && c.ctl.saveMessage == store.ErrQuota.Error(), func() app.UI {
			return app.Div().Class("pl-strip pl-xfer-full").DataSet("testid", "storage-full").Attr("role", "alert").
				Text("⚠ The device is full. The last change was not saved; what was saved before it is kept. Export this session, then delete old sessions to make room.")
		}),
	)
}

func (c *Shell) renderConflict() app.UI {
	k := c.xfer.conflict
	s := k.pending[0]
	old := k.stored[s.ID]
	where := ""
	if !old.Deleted.IsZero() {
		where = " (in the trash)"
	}
	return app.Div().Class("pl-strip pl-xfer-ask").Attr("role", "alertdialog").DataSet("testid", "import-conflict").DataSet("seq", c.xfer.importSeq).Body(
		app.P().Text(fmt.Sprintf("“%s” from the file (%s, changed %s) is already on this device%s as “%s” (%s, changed %s). Replace the stored one, or keep both?",
			s.Title, plural(len(s.Readings), "reading", "readings"), s.Modified.Local().Format("2 Jan 2006 15:04"),
			where, old.Title, plural(old.Readings, "reading", "readings"), old.Modified.Local().Format("2 Jan 2006 15:04"))),
		app.Div().Class("pl-xfer-actions").Body(
			anButton("pl-btn", "Keep both", "import-keep-both").
				OnClick(func(ctx app.Context, e app.Event) { c.resolveConflict(ctx, "both") }),
			anButton("pl-btn pl-btn-danger", "Replace the stored one", "import-replace").
				OnClick(func(ctx app.Context, e app.Event) { c.resolveConflict(ctx, "replace") }),
			anButton("pl-btn pl-btn-quiet", "Skip this one", "import-skip").
				OnClick(func(ctx app.Context, e app.Event) { c.resolveConflict(ctx, "skip") }),
		),
	)
}

func (c *Shell) renderColumnChoice() app.UI {
	ch := c.xfer.choice
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
	return app.Div().Class("pl-strip pl-xfer-ask").Attr("role", "dialog").DataSet("testid", "import-columns").DataSet("seq", c.xfer.importSeq).Body(
		app.P().Text("“"+ch.file+"” has more than two columns of numbers. Which columns hold the known values (x) and the instrument values (y)?"),
		app.Div().Class("pl-xfer-actions").Body(
			pick("import-x-col", "x (known value)", ch.x, func(v int) { ch.x = v }),
			pick("import-y-col", "y (instrument value)", ch.y, func(v int) { ch.y = v }),
			anButton("pl-btn", "Import these columns", "import-columns-ok").
				OnClick(func(_ app.Context, e app.Event) {
					name, data, x, y := ch.file, ch.data, ch.x, ch.y
					if x == y {
						c.xfer.failed(name, &session.CSVError{Err: session.ErrCSVSameColum})
						return
					}
					c.xfer.choice, c.xfer.importing, c.xfer.progress, c.xfer.importPhase = nil, name, 0, "reading"
					ctx := c.ui // the import outlives this button: dispatch through the Shell
					ctx.Async(func() { c.importCSV(ctx, name, data, x, y) })
				}),
			anButton("pl-btn pl-btn-quiet", "Cancel", "import-cancel").
				OnClick(func(ctx app.Context, e app.Event) { c.xfer.choice = nil }),
		),
	)
}

// renderTransfer hands the files card its data.
func (c *Shell) renderTransfer() app.UI {
	return &filesCard{
		ShareOK: c.xfer.shareOK, HasResults: c.ctl.view.report != nil,
		ImportReport: c.xfer.importReport, ImportSeq: c.xfer.importSeq, ImportTiming: c.xfer.importTiming,
		Usage: c.usage.usage, UsageText: c.usage.text(), OnAction: c.fileAction,
	}
}

// Kinds of FileAction.
const (
	faImport        = "import"         // File was picked
	faShare         = "share"          // share the session file
	faExportSession = "export-session" // save the session file
	faExportAll     = "export-all"     // save every stored session in one file
	faExportCSV     = "export-csv"     // the readings as CSV
	faExportResults = "export-results" // the results as CSV
)

// FileAction is one thing asked for on the files card.
type FileAction struct {
	Kind string
	File app.Value // the file picked (faImport)
}

// fileAction applies what the files card asked for, on the Shell's own
// context (the card's element may be gone by the time it runs).
func (c *Shell) fileAction(a FileAction) {
	apply := func(ctx app.Context) {
		switch a.Kind {
		case faImport:
			c.importFile(ctx, a.File)
		case faShare:
			c.say(shareSession(c.ui, c.ctl.sess, c.say))
		case faExportSession:
			c.say(exportSession(c.ctl.sess))
		case faExportAll:
			exportAll(c.ui, c.ctl.st, c.say)
		case faExportCSV:
			c.say(exportCSV(c.ctl.sess))
		case faExportResults:
			c.say(exportResults(c.ctl.sess, c.ctl.view.report))
		}
	}
	c.dispatch(apply)
}

// filesCard draws the card for files: import, export, share, storage.
type filesCard struct {
	app.Compo

	ShareOK      bool // the browser can share files
	HasResults   bool // there is a line whose results can be exported
	ImportReport string
	ImportSeq    int
	ImportTiming string
	Usage        store.Usage
	UsageText    string

	OnAction func(FileAction)
}

func (r *filesCard) act(a FileAction) {
	if r.OnAction != nil {
		r.OnAction(a)
	}
}

// button is one of the card's buttons; its data-act says what it does,
// read when it is pressed (one function literal for all of them, and
// go-app keeps an element's first handler).
func (r *filesCard) button(cls, label, testid, act string) app.UI {
	return app.Button().Class(cls).Text(label).DataSet("testid", testid).DataSet("act", act).
		OnClick(func(ctx app.Context, e app.Event) {
			r.act(FileAction{Kind: ctx.JSSrc().Get("dataset").Get("act").String()})
		})
}

// Render draws the card.
func (r *filesCard) Render() app.UI {
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
						r.act(FileAction{Kind: faImport, File: f})
					}),
			),
			app.If(r.ShareOK, func() app.UI {
				return r.button("pl-btn", "Share session…", "export-share", faShare)
			}),
			r.button("pl-btn pl-btn-quiet", "Save session file", "export-session", faExportSession),
			r.button("pl-btn pl-btn-quiet", "Save all sessions", "export-all", faExportAll),
			r.button("pl-btn pl-btn-quiet", "Readings as CSV", "export-csv", faExportCSV),
			app.If(r.HasResults, func() app.UI {
				return r.button("pl-btn pl-btn-quiet", "Results as CSV", "export-results", faExportResults)
			}),
		),
		anPText("pl-xfer-hint", "Session files (.pairline) and CSV or tab-separated tables can also be dropped onto the page. A block copied from a spreadsheet can be pasted into an x cell."),
		app.If(r.ImportReport != "", func() app.UI {
			return app.P().Class("pl-xfer-report").DataSet("testid", "import-report").DataSet("seq", r.ImportSeq).DataSet("timing", r.ImportTiming).Attr("role", "status").Text(r.ImportReport)
		}),
		app.P().Class("pl-xfer-usage").DataSet("testid", "storage-usage").
			DataSet("used", strconv.FormatInt(r.Usage.Used, 10)).DataSet("quota", strconv.FormatInt(r.Usage.Quota, 10)).
			DataSet("persistent", strconv.FormatBool(r.Usage.Persistent)).Text(r.UsageText),
	)
}
