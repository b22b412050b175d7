package ui

// Files out: session file, all sessions, readings and results CSV, and sharing.

import (
	"bytes"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/session"
)

// sessionFile encodes the open session as a session file.
func (c *Shell) sessionFile() ([]byte, error) {
	return session.EncodeBytes([]*session.Session{c.ctl.sess})
}

func (c *Shell) exportSession(ctx app.Context, e app.Event) {
	if c.ctl.sess == nil {
		return
	}
	b, err := c.sessionFile()
	if err != nil {
		c.notice = "The session could not be exported: " + err.Error()
		return
	}
	download(fileBase(c.ctl.sess.Title)+session.FileExtension, session.MediaType, b)
}

func (c *Shell) shareSession(_ app.Context, e app.Event) {
	ctx := c.ui // dispatch through the Shell: the element that asked may be gone by then
	if c.ctl.sess == nil {
		return
	}
	b, err := c.sessionFile()
	if err != nil {
		c.notice = "The session could not be shared: " + err.Error()
		return
	}
	name, title := fileBase(c.ctl.sess.Title)+session.FileExtension, c.ctl.sess.Title
	ctx.Async(func() {
		if err := shareFile(name, session.MediaType, title, b); err != nil {
			ctx.Dispatch(func(ctx app.Context) {
				c.notice = "The session was not shared (" + err.Error() + "). Use “Save session file” instead."
			})
		}
	})
}

// exportAll writes every stored session (not the trash) into one file.
func (c *Shell) exportAll(_ app.Context, e app.Event) {
	ctx := c.ui // dispatch through the Shell: the element that asked may be gone by then
	st := c.ctl.st
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
	if c.ctl.sess == nil {
		return
	}
	var buf bytes.Buffer
	if err := session.WriteReadingsCSV(&buf, c.ctl.sess); err != nil {
		c.notice = "The readings could not be exported: " + err.Error()
		return
	}
	download(fileBase(c.ctl.sess.Title)+" readings.csv", "text/csv", buf.Bytes())
}

// exportResults writes the results of the record as CSV: session.
// WriteResultsCSV, the same table `pairline export-csv --results` writes
// (the line, its checks, the acceptance, each unknown sample by name with
// its conversion and interval; full precision, no cell a formula).
func (c *Shell) exportResults(ctx app.Context, e app.Event) {
	rep := c.ctl.view.report
	if c.ctl.sess == nil || rep == nil {
		return
	}
	// The report holds the screen's own conversion first; the table is
	// about the record's unknowns only (unknownResults).
	adhoc, _ := unknownResults(c.ctl.sess, rep)
	r := *rep
	r.Inverse = rep.Inverse[len(adhoc):]
	var buf bytes.Buffer
	if err := session.WriteResultsCSV(&buf, c.ctl.sess, &r, c.ctl.sess.UnknownQueries()); err != nil {
		c.notice = "The results could not be exported: " + err.Error()
		return
	}
	download(fileBase(c.ctl.sess.Title)+" results.csv", "text/csv", buf.Bytes())
}
