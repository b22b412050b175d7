package ui

// Files out: session file, all sessions, readings and results CSV, and
// sharing. Each takes what it hands out (the open session, its report, the
// store) and returns the sentence for the message strip when it cannot
// ("" when it did); work that finishes later comes back through ctx, the
// Shell's own context (the element that asked may be gone by then), and
// says so through say.

import (
	"bytes"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/session"
	"pairline/app/store"
	"pairline/fitcore"
)

// sessionFile encodes s as a session file.
func sessionFile(s *session.Session) ([]byte, error) {
	return session.EncodeBytes([]*session.Session{s})
}

// exportSession downloads s as a session file.
func exportSession(s *session.Session) string {
	if s == nil {
		return ""
	}
	b, err := sessionFile(s)
	if err != nil {
		return "The session could not be exported: " + err.Error()
	}
	download(fileBase(s.Title)+session.FileExtension, session.MediaType, b)
	return ""
}

// shareSession hands s as a session file to the device's share sheet.
func shareSession(ctx app.Context, s *session.Session, say func(string)) string {
	if s == nil {
		return ""
	}
	b, err := sessionFile(s)
	if err != nil {
		return "The session could not be shared: " + err.Error()
	}
	name, title := fileBase(s.Title)+session.FileExtension, s.Title
	ctx.Async(func() {
		if err := shareFile(name, session.MediaType, title, b); err != nil {
			ctx.Dispatch(func(ctx app.Context) {
				say("The session was not shared (" + err.Error() + "). Use “Save session file” instead.")
			})
		}
	})
	return ""
}

// exportAll writes every session stored in st (not the trash) into one file.
func exportAll(ctx app.Context, st store.Store, say func(string)) {
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
				say("The sessions could not be exported: " + err.Error())
				return
			}
			download("pairline-sessions-"+time.Now().Format("2006-01-02")+session.FileExtension, session.MediaType, buf.Bytes())
		})
	})
}

// exportCSV downloads the readings of s as CSV.
func exportCSV(s *session.Session) string {
	if s == nil {
		return ""
	}
	var buf bytes.Buffer
	if err := session.WriteReadingsCSV(&buf, s); err != nil {
		return "The readings could not be exported: " + err.Error()
	}
	download(fileBase(s.Title)+" readings.csv", "text/csv", buf.Bytes())
	return ""
}

// exportResults writes the results of the record s, with its report rep, as
// CSV: session.WriteResultsCSV, the same table `pairline export-csv
// --results` writes (the line, its checks, the acceptance, each unknown
// sample by name with its conversion and interval; full precision, no cell
// a formula).
func exportResults(s *session.Session, rep *fitcore.Report) string {
	if s == nil || rep == nil {
		return ""
	}
	// The report holds the screen's own conversion first; the table is
	// about the record's unknowns only (unknownResults).
	adhoc, _ := unknownResults(s, rep)
	r := *rep
	r.Inverse = rep.Inverse[len(adhoc):]
	var buf bytes.Buffer
	if err := session.WriteResultsCSV(&buf, s, &r, s.UnknownQueries()); err != nil {
		return "The results could not be exported: " + err.Error()
	}
	download(fileBase(s.Title)+" results.csv", "text/csv", buf.Bytes())
	return ""
}
