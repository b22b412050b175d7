package ui

// The Shell's side of the record cards (record.go): what each card is
// given, and the actions they send, applied through the session's methods.

import (
	"strconv"
	"strings"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/numfmt"
	"pairline/app/session"
	"pairline/fitcore"
)

// recordUI is the Shell's state of the record cards.
type recordUI struct {
	recLast    *session.Session // the last record of the same instrument (and site), offered
	recKey     string           // instrument key and site recLast was looked up for
	recNoOffer string           // ID of the session whose offer was used or dismissed
}

// refuseLocked says so and returns true when the open record is locked
// (a change from outside the frozen cards: a paste, a rename, a setting).
func (c *Shell) refuseLocked() bool {
	if !c.ctl.locked() {
		return false
	}
	c.notice = "This record is sealed, so it was not changed. To change it, choose “Start revision " + strconv.Itoa(c.ctl.sess.Revision+1) + "” on the sign-off card."
	return true
}

// recordAction applies what a card asked for, on the Shell's own context
// (the card's element may be gone by the time it runs): the controller
// makes the change (controller.record: saved and undone as any other), the
// Shell schedules its later turns, keeps the offer of the last record
// answered, and looks that record up again when the instrument changed.
func (c *Shell) recordAction(a RecordAction) {
	apply := func(ctx app.Context) {
		if c.ctl.sess == nil {
			return
		}
		var last *session.Session
		if a.Kind == raUseLast {
			c.recNoOffer, last = c.ctl.sess.ID, c.recLast
		}
		if err := c.ctl.record(a, last, time.Now()); err != nil {
			c.notice = sentence(err.Error())
			return
		}
		c.afterChange(ctx)
		c.lookUpLast()
	}
	c.dispatch(apply)
}

type uiError string

func (e uiError) Error() string { return string(e) }

const (
	errLocked    = uiError("this record is sealed; start a new revision to change it")
	errNoRepeats = uiError("give at least one reading of the sample (several repeats: separate them with spaces or semicolons)")
)

func conditionIndex(s *session.Session, name string) int {
	for i, cd := range s.Conditions {
		if strings.EqualFold(strings.TrimSpace(cd.Name), name) {
			return i
		}
	}
	return -1
}

// lookUpLast finds, off the UI goroutine, the last stored record of the
// open record's instrument at its site (session.LastRecordFor) when the
// instrument or site changed. The newest 200 stored sessions are read.
func (c *Shell) lookUpLast() {
	s := c.ctl.sess
	if s == nil || c.ctl.st == nil || c.ui.Src() == nil {
		return
	}
	key := session.InstrumentKey(s.Instrument)
	want := strings.ToLower(key + "\x00" + strings.TrimSpace(s.Site))
	if want == c.recKey {
		return
	}
	c.recKey, c.recLast = want, nil
	if key == "" {
		return
	}
	st, id, site, list := c.ctl.st, s.ID, s.Site, c.ctl.sessions
	c.ui.Async(func() {
		var all []*session.Session
		for i, sm := range list {
			if i == 200 {
				break
			}
			if sm.ID == id {
				continue
			}
			if o, err := load(st, sm.ID); err == nil {
				all = append(all, o)
			}
		}
		last := session.LastRecordFor(all, key, site)
		if last == nil && strings.TrimSpace(site) != "" {
			last = session.LastRecordFor(all, key, "")
		}
		c.ui.Dispatch(func(ctx app.Context) {
			if c.ctl.sess != nil && c.ctl.sess.ID == id && c.recKey == want {
				c.recLast = last
			}
		})
	})
}

// renderRecord is the identity and standards cards.
func (c *Shell) renderRecord() app.UI {
	s := c.ctl.sess
	f := recordFields{Site: s.Site, Instrument: s.Instrument.Description, Serial: s.Instrument.Serial, InstrumentID: s.Instrument.ID,
		Operator: s.Operator, Notes: s.Notes}
	if s.Instrument.IntervalDays > 0 {
		f.Interval = strconv.Itoa(s.Instrument.IntervalDays)
	}
	var conds []session.Condition
	var index []int
	for i, cd := range s.Conditions {
		if strings.EqualFold(strings.TrimSpace(cd.Name), session.ConditionTemperature) && f.Temperature == "" && f.TempUnit == "" {
			f.Temperature, f.TempUnit = cd.Value, cd.Unit
			continue
		}
		conds, index = append(conds, cd), append(index, i)
	}
	var offer *lastOffer
	if l := c.recLast; l != nil && c.recNoOffer != s.ID {
		offer = &lastOffer{Title: l.Title, When: l.Created.Local().Format("2 Jan 2006"), What: lastWhat(l)}
	}
	locked := c.ctl.locked()
	return app.Div().Class("pl-slot").Body(
		&identityCard{Fields: f, Conditions: conds, Index: index, Locked: locked, Offer: offer, OnAction: c.recordAction},
		c.renderStandards(locked),
	)
}

// lastWhat says what the last record would give: "3 standards, 2
// conditions, the operator J. Doe".
func lastWhat(l *session.Session) string {
	var parts []string
	if n := len(l.Standards); n > 0 {
		parts = append(parts, plCount(n, "standard"))
	}
	if n := len(l.Conditions); n > 0 {
		parts = append(parts, plCount(n, "condition"))
	}
	if l.Operator != "" {
		parts = append(parts, "the operator "+l.Operator)
	}
	if l.Instrument.IntervalDays > 0 {
		parts = append(parts, "an interval of "+plCount(l.Instrument.IntervalDays, "day"))
	}
	if len(parts) == 0 {
		return "no values to take"
	}
	return strings.Join(parts, ", ")
}

func (c *Shell) renderStandards(locked bool) app.UI {
	s := c.ctl.sess
	expired := map[int]session.StandardExpiry{}
	for _, e := range s.ExpiredStandards() {
		expired[e.Index] = e
	}
	rows := make([]standardRow, len(s.Standards))
	for i, st := range s.Standards {
		rows[i] = standardRow{Standard: st}
		if !st.Expiry.IsZero() {
			rows[i].Expiry = st.Expiry.UTC().Format("2006-01-02")
		}
		if e, ok := expired[i]; ok {
			rows[i].Expired = "Expired: valid until " + e.Expiry.Format("2 Jan 2006") + ", the readings are of " + e.Day.Format("2 Jan 2006") +
				". Do not use a record made with an expired standard until the standard's maker or your procedure allows it."
		}
	}
	return &standardsCard{Standards: rows, Problems: c.ctl.view.stdProblems, Day: s.ReadingsDay().Format("2 Jan 2006"), Locked: locked, OnAction: c.recordAction}
}

// namedInverse is one unknown of the record with fitcore's conversion.
type namedInverse struct {
	Index int // in Session.Unknowns
	Inv   *fitcore.Inverse
}

// unknownResults splits rep.Inverse into the screen's own conversion (the
// "use the line" card's, first when asked) and the record's unknowns,
// which analyseNow asked for after it, in the order of
// Session.UnknownQueries.
func unknownResults(s *session.Session, rep *fitcore.Report) (adhoc []fitcore.Inverse, named []namedInverse) {
	q := s.UnknownQueries()
	if rep == nil || len(rep.Inverse) < len(q.Queries) {
		return nil, nil
	}
	from := len(rep.Inverse) - len(q.Queries)
	for i := range q.Queries {
		named = append(named, namedInverse{Index: q.Index[i], Inv: &rep.Inverse[from+i]})
	}
	return rep.Inverse[:from], named
}

func (c *Shell) renderUnknowns() app.UI {
	s := c.ctl.sess
	_, named := unknownResults(s, c.ctl.view.report)
	byIndex := map[int]*fitcore.Inverse{}
	for _, n := range named {
		byIndex[n.Index] = n.Inv
	}
	level := fitcore.DefaultLevel
	if c.ctl.view.report != nil {
		level = c.ctl.view.report.Level
	}
	rows := make([]unknownRow, len(s.Unknowns))
	for i, u := range s.Unknowns {
		r := unknownRow{Name: u.Name, Readings: strings.Join(u.Readings, "; ")}
		if inv := byIndex[i]; inv != nil {
			r.Has, r.Value, r.Low, r.High, r.Bounded, r.Message = true, inv.X, inv.Low, inv.High, inv.Bounded, inv.Message
			r.Shown = "x = " + numfmt.Sig(inv.X, 6) + " " + s.XUnit
			if inv.Bounded {
				r.Shown += ", " + rpLevel(level) + " interval " + numfmt.Sig(inv.Low, 6) + " to " + numfmt.Sig(inv.High, 6)
			}
			r.Shown += " (mean of " + plCount(inv.M, "reading") + ")"
		} else if c.ctl.view.report == nil {
			r.Message = "Not converted: there is no line yet."
		}
		rows[i] = r
	}
	return &unknownsCard{Unknowns: rows, Problems: s.UnknownQueries().Problems, Level: rpLevel(level), XUnit: s.XUnit,
		Locked: c.ctl.locked(), OnAction: c.recordAction}
}

// renderSign is the sign-off card.
func (c *Shell) renderSign() app.UI {
	s := c.ctl.sess
	info := sealInfo{Revision: s.Revision, Unlocked: c.ctl.unlocked == s.ID}
	if se := s.Seal; se != nil {
		info.Sealed, info.PerformedBy, info.Digest = true, se.PerformedBy, se.Digest
		info.PerformedAt = se.PerformedAt.Local().Format("2 Jan 2006 15:04")
		if se.ReviewedBy != "" {
			info.ReviewedBy, info.ReviewedAt = se.ReviewedBy, se.ReviewedAt.Local().Format("2 Jan 2006 15:04")
		}
		ok, err := s.VerifySeal()
		info.Valid = ok
		if err != nil {
			info.Problem = err.Error()
		}
	}
	info.RevisionNote = revisionNote(s)
	for _, r := range s.Sealed {
		e := earlierRevision{Revision: r.Revision, Digest: r.Seal.Digest, Results: r.Results, Readings: len(r.Readings)}
		e.Signed = "sealed by " + r.Seal.PerformedBy + ", " + r.Seal.PerformedAt.Local().Format("2 Jan 2006 15:04")
		if r.Seal.ReviewedBy != "" {
			e.Signed += ", reviewed by " + r.Seal.ReviewedBy
		}
		info.Earlier = append(info.Earlier, e)
	}
	return &signCard{Seal: info, OnAction: c.recordAction}
}

// revisionNote says, for a record changed after it was sealed, which
// revision it is and what changed since the seal (the history after the
// last revision entry, in words); "" otherwise.
func revisionNote(s *session.Session) string {
	if len(s.Sealed) == 0 || s.Seal != nil {
		if len(s.Sealed) > 0 && s.Seal != nil {
			return "This is revision " + strconv.Itoa(s.Revision) + ", sealed again after changes to revision " +
				strconv.Itoa(s.Sealed[len(s.Sealed)-1].Revision) + " (kept below as it was signed)."
		}
		return ""
	}
	from := 0
	for i := len(s.History) - 1; i >= 0; i-- {
		if s.History[i].Field == session.EditRevision {
			from = i + 1
			break
		}
	}
	what := describeEdits(s.History[from:])
	prev := s.Sealed[len(s.Sealed)-1].Revision
	return "This is revision " + strconv.Itoa(s.Revision) + ", not sealed yet. Changed since revision " + strconv.Itoa(prev) +
		" was sealed: " + what + ". Revision " + strconv.Itoa(prev) + " stays readable as it was signed."
}
