package ui

// The controller: the open session, its analysis, its saving and its undo
// history, with the actions the cards send. It is plain Go (no go-app): the
// Shell gives it the screen's own queries and says when another tab holds
// the session, and schedules the later turns of an edit (Shell.afterChange); the
// tests drive it natively (controller_test.go, undo_property_test.go).

import (
	"strconv"
	"strings"
	"time"

	"pairline/app/session"
	"pairline/app/store"
	"pairline/fitcore"
)

// controller owns the open session and what follows from it. Every change
// goes through one of its actions (the record cards' in
// controller_record.go), which re-analyses, records the step for undo and
// hands the session to the saver.
type controller struct {
	st       store.Store
	storeOK  bool // the device's store opened (not the stand-in in memory)
	sess     *session.Session
	view     analysis
	pairs    session.PairCache
	sessions []store.Summary // the device's list, newest first

	saveState   SaveState // SaveNone before the first save
	saveMessage string    // the detail of a failure (an error's text)
	saveWhy     string    // why it failed: saveRefused, saveUnwritable or saveHeld
	saveFor     string    // ID of the session saveState is about
	saves       *saveQueue
	editSeq     int             // counts edits, to run delayed work only for the latest
	lastSave    time.Time       // when the open session was last handed to the saver
	toSave      bool            // an edit waits for its save turn
	queued      map[string]bool // IDs of sessions handed to the saver in this tab

	undoUI // the undo and redo stacks of the open session (undo.go)

	// unlocked is the ID of the sealed session the technician opened for
	// its next revision ("Start revision N").
	unlocked string

	// adviceUndo holds the settings before the advice was applied (for
	// "back to the plain line"), adviceFor the session they belong to.
	adviceUndo *session.Settings
	adviceFor  string

	// queries adds the screen's own questions (conversions, the plots'
	// grid) to the options of an analysis; nil asks none.
	queries func(o *fitcore.Options, x []float64)
	// held reports whether another tab stored a newer version of the open
	// session and the technician has not chosen yet: nothing is saved
	// meanwhile. nil: never.
	held func() bool
}

// newController returns a controller with no session open, saving into st
// (nil: nothing is saved).
func newController(st store.Store) *controller {
	return &controller{st: st, saves: newSaveQueue()}
}

// locked reports whether the open record is sealed and not opened for its
// next revision: its readings, settings and record cards take no input.
func (k *controller) locked() bool {
	return k.sess != nil && k.sess.Seal != nil && k.unlocked != k.sess.ID
}

// openSession makes s the open session and analyses it. The save status is the
// open session's: opening another one shows that one's (blank, or the
// failure of a save still waiting to be tried again). It returns a notice
// when the session left could not be saved.
func (k *controller) openSession(s *session.Session) (notice string) {
	if k.sess != nil && k.sess != s {
		switch {
		case s.ID == k.sess.ID:
			// Another version of the same session replaces the open one,
			// as chosen (an import's "replace", the other tab's version):
			// what this tab had not written yet must not overwrite it.
			k.toSave = false
			k.saves.drop(s.ID)
		case k.toSave:
			k.save() // the last edit of the session being left, before its save turn
		}
		if k.sess.ID != s.ID && k.saveState == SaveFailed && k.saveWhy != saveHeld {
			notice = leftUnsaved(k.sess.Title, k.saveWhy, k.saveMessage)
		}
	}
	if k.saveFor != s.ID {
		k.saveFor = s.ID
		k.saveState, k.saveMessage, k.saveWhy = SaveNone, "", ""
		if msg, ok := k.saves.failure(s.ID); ok {
			k.saveState, k.saveMessage, k.saveWhy = SaveFailed, msg, saveRefused
		}
	}
	k.sess = s
	k.undoSync()
	k.analyse()
	return notice
}

// markStored says that the open session is what the device holds (it was
// just read from it or written to it): unless a save of it is still
// waiting or was refused, its status is "saved".
func (k *controller) markStored() {
	if k.sess != nil && k.saveState == SaveNone && !k.saves.pending(k.sess.ID) {
		k.saveState = SaveSaved
	}
}

// analyse runs fitcore on the usable pairs of the open session.
func (k *controller) analyse() { k.analyseNow(false) }

// analyseNow runs fitcore; quick leaves out the transform advice (it re-fits
// the readings several times) and keeps the advice shown before, marked as
// being updated.
func (k *controller) analyseNow(quick bool) {
	if k.sess == nil {
		return
	}
	prev := k.view.report
	x, y, rows, problems := k.pairs.Pairs(k.sess)
	a := analysis{problems: make(map[cellKey]string, len(problems)), usable: len(rows), rows: rows, x: x, y: y}
	for _, p := range problems {
		a.problems[cellKey{p.Row, p.Column}] = p.Reason
	}
	for _, r := range rows {
		a.digits = max(a.digits, digitsOf(k.sess.Readings[r].X), digitsOf(k.sess.Readings[r].Y))
	}
	opt := k.sess.Settings.Options()
	if k.queries != nil {
		k.queries(&opt, x)
	}
	// The record's unknowns come after the screen's own conversion
	// (unknownResults splits them again), with the standards'
	// uncertainties carried into their intervals.
	opt.Inverse = append(opt.Inverse, k.sess.UnknownQueries().Queries...)
	opt.XStandardUncertainties, a.stdProblems = k.sess.StandardUncertainties(x)
	opt.SkipAdvice = quick
	rep, err := fitcore.Analyze(x, y, opt)
	if err != nil {
		a.message = plainFitError(err, len(rows))
	} else {
		renumberReport(rep, rows) // before an earlier advice is carried over: it was renumbered already
		a.report = rep
		if quick {
			a.stale = true
			if prev != nil && prev.Advice != nil {
				rep.Advice, rep.BoxCox = prev.Advice, prev.BoxCox
			} else {
				a.advicePending = true
			}
		}
	}
	k.view = a
}

// completeNow adds the advice (and the Box–Cox profile) to the report of
// a quick analysis (fitcore.Complete: the same report a full analysis
// gives, without fitting the readings again).
func (k *controller) completeNow() {
	rep := k.view.report
	if rep == nil || !k.view.stale {
		k.analyse()
		return
	}
	r := *rep
	if err := fitcore.Complete(&r, k.view.x, k.view.y, k.sess.Settings.Options()); err != nil {
		k.analyse()
		return
	}
	renumberAdvice(r.Advice, k.view.rows)
	k.view.report = &r
	k.view.stale, k.view.advicePending = false, false
	k.view.plotsLater = true
}

// requery answers changed questions put to the line (queries: the use
// card's conversions) without changing the readings or settings: the
// advice stays as it is, so the one Analyze run leaves it out (SkipAdvice,
// several times faster) and the report keeps the advice already shown.
func (k *controller) requery(queries func(o *fitcore.Options, x []float64)) {
	if k.sess == nil {
		return
	}
	prev := k.view.report
	if prev == nil || k.view.stale {
		k.analyse()
		return
	}
	x, y, _, _ := k.pairs.Pairs(k.sess)
	opt := k.sess.Settings.Options()
	if queries != nil {
		queries(&opt, x)
	}
	opt.SkipAdvice = true
	rep, err := fitcore.Analyze(x, y, opt)
	if err != nil {
		k.analyse()
		return
	}
	rep.Advice, rep.BoxCox = prev.Advice, prev.BoxCox
	k.view.report = rep
}

// changed is called after every change to the open session: it records
// the step for undo, analyses (from adviceLater readings without the
// advice, which Shell.afterChange adds a turn later) and marks the session as
// being saved; below saveAtOnce readings it hands the session to the saver
// at once (cheap, and a reload right after keeps it), otherwise
// Shell.afterChange does in a later turn.
func (k *controller) changed() {
	k.editSeq++
	k.undoTrack()
	k.analyseNow(k.big())
	if k.st != nil && !k.heldElsewhere() {
		if k.saveState != SaveFailed {
			k.saveState = SaveSaving // from now: the edit is not on the device yet
		} // a failure stays shown until a save succeeds
		k.toSave = true
	}
	if len(k.sess.Readings) < saveAtOnce {
		k.save()
	}
}

// big reports whether the open session is big enough for an edit's advice
// and plots to come a turn after its line (adviceLater).
func (k *controller) big() bool { return k.sess != nil && len(k.sess.Readings) >= adviceLater }

// saveStamp is the save state and its message as one comparable text.
func (k *controller) saveStamp() string { return k.saveState.String() + "\x00" + k.saveMessage }

// heldElsewhere reports whether another tab holds the open session (held),
// and says so in the save state.
func (k *controller) heldElsewhere() bool {
	if k.held == nil || k.sess == nil || !k.held() {
		return false
	}
	k.saveFor, k.saveState, k.saveWhy = k.sess.ID, SaveFailed, saveHeld
	k.saveMessage = "another tab stored a newer version of this session; choose which to keep"
	return true
}

// save encodes the open session and hands it to the saver (saveQueue).
// When it cannot be encoded, the failure is shown and the edit stays marked
// as waiting (toSave), so that nothing later reports it saved.
func (k *controller) save() {
	if k.st == nil || k.sess == nil || k.heldElsewhere() {
		return
	}
	k.saveFor = k.sess.ID
	if pristine(k.sess) && !k.stored(k.sess.ID) {
		// Nothing typed yet: a session is stored from its first real
		// change, so opening and leaving one piles up no empty records.
		if k.saveState != SaveFailed {
			k.saveState = SaveNone
		}
		k.toSave = false
		return
	}
	job, err := encodeJobInto(k.saves.takeSpare(), k.sess)
	if err != nil {
		k.saveState, k.saveMessage, k.saveWhy = SaveFailed, err.Error(), saveUnwritable
		k.toSave = true
		return
	}
	k.saves.put(job)
	if k.queued == nil {
		k.queued = map[string]bool{}
	}
	k.queued[k.sess.ID] = true
	if k.saveState != SaveFailed || k.saveWhy != saveRefused {
		k.saveState, k.saveMessage, k.saveWhy = SaveSaving, "", ""
	}
	k.lastSave = time.Now()
	k.toSave = false
}

// retrySave tries again every save that failed: the open session's state
// as it is now, and the states of other sessions kept since they failed.
func (k *controller) retrySave() {
	k.saves.retry()
	if k.sess != nil && k.saveState == SaveFailed && k.saveWhy != saveHeld {
		k.saveState, k.saveMessage, k.saveWhy = SaveSaving, "", ""
		k.save()
	}
}

// retryable says whether "Try again" has something to try: a refused or
// unwritable save of the open session, or a refused state of a session
// left since.
func (k *controller) retryable() bool {
	return (k.saveState == SaveFailed && k.saveWhy != saveHeld) || k.saves.hasFailed()
}

// saveText is the save status in words: a failure is a plain sentence with
// its detail, and says that nothing on screen is lost.
func (k *controller) saveText() string {
	switch k.saveState {
	case SaveSaved:
		return "Saved on this device"
	case SaveSaving:
		return "Saving…"
	case SaveFailed:
		switch k.saveWhy {
		case saveHeld:
			return "Not saved: " + k.saveMessage
		case saveUnwritable:
			return "Not saved: this session could not be written as a record (" + k.saveMessage + "). Your changes are kept on screen; Pairline tries again with your next change."
		}
		return "Not saved: this device refused to store the session (" + k.saveMessage + "). Your changes are kept on screen; Pairline tries again with your next change, or tap “Try again”."
	}
	return ""
}

// written is the outcome of one write: what was written, the store's
// error, and the device's list after it.
type written struct {
	sum  store.Summary
	err  error
	list []store.Summary
}

// writeNext writes the oldest queued state to st (call it off the UI
// goroutine: Shell.startSaver loops on it); a refused state is kept whole
// to be tried again. ok is false once the queue is closed.
func writeNext(st store.Store, saves *saveQueue) (w written, ok bool) {
	job, ok := saves.next()
	if !ok {
		return written{}, false
	}
	w.sum, w.err = job.sum, st.Save(job.sum, job.body)
	if w.err != nil {
		saves.fail(job, w.err) // kept whole, to be tried again
	} else {
		saves.giveBack(job.body) // the store keeps its own copy
	}
	w.list, _ = st.List()
	return w, true
}

// saved takes the outcome of one write (writeNext). The save status is the
// open session's; a write of another session (one just left) that fails
// comes back as a notice.
func (k *controller) saved(sum store.Summary, err error, list []store.Summary) (notice string) {
	k.sessions = list
	open := k.sess != nil && k.sess.ID == sum.ID
	if err != nil {
		if open {
			k.saveFor, k.saveState, k.saveMessage, k.saveWhy = sum.ID, SaveFailed, err.Error(), saveRefused
			return ""
		}
		return leftUnsaved(sum.Title, saveRefused, err.Error())
	}
	if !open || k.saves.pending(sum.ID) || k.toSave {
		return ""
	}
	if k.saveState == SaveFailed && k.saveWhy != saveRefused {
		return "" // a newer state could not be encoded, or another tab holds it
	}
	k.saveState, k.saveMessage, k.saveWhy = SaveSaved, "", ""
	return ""
}

// stored reports whether the session with that ID is in the device's list.
func (k *controller) stored(id string) bool {
	if k.queued[id] {
		return true // handed to the saver: the list may not show it yet
	}
	for i := range k.sessions {
		if k.sessions[i].ID == id {
			return true
		}
	}
	return false
}

// The actions. Each changes the open session through its methods (which
// write the history), then runs changed; an error leaves the session as
// it was. A sealed record refuses them (errLocked).

// setCell types text into a cell of the readings.
func (k *controller) setCell(row int, col session.Column, text string) error {
	if err := k.ready(); err != nil {
		return err
	}
	if err := k.sess.SetCell(row, col, text, time.Now()); err != nil {
		return err
	}
	k.changed()
	return nil
}

// addRow adds a blank reading and returns its row.
func (k *controller) addRow() (int, error) {
	if err := k.ready(); err != nil {
		return 0, err
	}
	i := k.sess.AddRow("", "", time.Now())
	k.changed()
	return i, nil
}

// setField sets a metadata field (a session.Field… name).
func (k *controller) setField(field, value string) error {
	if err := k.ready(); err != nil {
		return err
	}
	if err := k.sess.SetField(field, value, time.Now()); err != nil {
		return err
	}
	k.changed()
	return nil
}

// paste fills the readings from a pasted block from row on (first column
// x, second y, one reading per line), adding rows as needed; it returns
// the sentence that says what was done.
func (k *controller) paste(row int, text string) (string, error) {
	if err := k.ready(); err != nil {
		return "", err
	}
	res, err := session.ReadPaste(text, session.CSVOptions{})
	if err != nil {
		return "", err
	}
	if len(res.X)+row > session.MaxReadings {
		return "", errTooManyReadings
	}
	now := time.Now()
	if k.sess.DecimalComma == nil {
		k.sess.SetField(session.FieldDecimalComma, strconv.FormatBool(res.DecimalComma), now)
	}
	if _, err := k.sess.PasteRows(row, res.X, res.Y, now); err != nil {
		return "", err
	}
	done := "Pasted " + plural(len(res.X), "reading", "readings") + " into rows " + strconv.Itoa(row+1) + "–" + strconv.Itoa(row+len(res.X)) + "."
	if res.Incomplete > 0 {
		done += " " + plural(res.Incomplete, "incomplete line was", "incomplete lines were") + " skipped."
	}
	k.changed()
	return done, nil
}

// exclude leaves a reading out of the fit, for a reason the record shows.
func (k *controller) exclude(row int, reason string) error {
	if err := k.ready(); err != nil {
		return err
	}
	if err := k.sess.Exclude(row, strings.TrimSpace(reason), time.Now()); err != nil {
		return err
	}
	k.changed()
	return nil
}

// include puts a left-out reading back.
func (k *controller) include(row int) error {
	if err := k.ready(); err != nil {
		return err
	}
	if err := k.sess.Include(row, time.Now()); err != nil {
		return err
	}
	k.changed()
	return nil
}

// setSettings stores changed fit settings, tidied (tidySettings) and
// checked by fitcore.Options.Normalize first, so that the session never
// holds settings fitcore refuses.
func (k *controller) setSettings(st session.Settings) error {
	if err := k.ready(); err != nil {
		return err
	}
	st = tidySettings(st)
	if _, err := st.Options().Normalize(); err != nil {
		return err
	}
	if err := k.sess.SetSettings(st, time.Now()); err != nil {
		return err
	}
	k.changed()
	return nil
}

// criteria are the open session's acceptance criteria (none: the zero value).
func (k *controller) criteria() fitcore.Criteria {
	if k.sess != nil && k.sess.Settings.Acceptance != nil {
		return *k.sess.Settings.Acceptance
	}
	return fitcore.Criteria{}
}

// setCriteria stores changed acceptance criteria in the settings.
func (k *controller) setCriteria(c fitcore.Criteria) error {
	if k.sess == nil {
		return errNoSession
	}
	s := k.sess.Settings
	if anCriteriaEmpty(c) {
		s.Acceptance = nil
	} else {
		s.Acceptance = &c
	}
	return k.setSettings(s)
}

// applyAdvice takes the remedy the advice recommends (a change of scale or
// a weighting) into the settings, keeping those before it for revertAdvice.
func (k *controller) applyAdvice() error {
	if k.sess == nil || k.view.report == nil || k.view.report.Advice == nil {
		return errNoAdvice
	}
	before := k.sess.Settings
	if err := k.setSettings(anWithRemedy(before, k.view.report.Advice)); err != nil {
		return err
	}
	k.adviceUndo, k.adviceFor = &before, k.sess.ID
	return nil
}

// revertAdvice stores the settings without the applied remedy: those before
// the last applyAdvice when known (and they had none), otherwise the same
// settings with no transform and no weights.
func (k *controller) revertAdvice() error {
	if k.sess == nil {
		return errNoSession
	}
	s := k.sess.Settings
	if k.adviceUndo != nil && k.adviceFor == k.sess.ID && !anApplied(*k.adviceUndo) {
		s = *k.adviceUndo
	} else {
		s.Transform, s.BoxCoxLambda, s.Weights = fitcore.TransformNone, nil, fitcore.WeightsNone
		if s.Model == fitcore.ModelWeighted {
			s.Model = fitcore.ModelOLS
		}
	}
	k.adviceUndo = nil
	return k.setSettings(s)
}

// ready returns why no action can change the open session now, if so.
func (k *controller) ready() error {
	switch {
	case k.sess == nil:
		return errNoSession
	case k.locked():
		return errLocked
	}
	return nil
}

const (
	errNoSession = uiError("no session is open")
	errNoAdvice  = uiError("there is no advice to apply")
)

var errTooManyReadings = uiError("the session would hold more than " + strconv.Itoa(session.MaxReadings) + " readings")
