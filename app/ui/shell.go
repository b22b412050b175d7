// Package ui holds Pairline's go-app components. Components keep only UI
// state and render what fitcore and app/session compute; they never compute
// statistics themselves.
package ui

import (
	"bytes"
	"fmt"
	"runtime"
	"slices"
	"strconv"
	"strings"
	"sync"
	"time"
	"unicode"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/session"
	"pairline/app/store"
	"pairline/fitcore"
)

// Register declares the app's pages. The browser and the native build (which
// prerenders the pages) must both call it.
func Register() {
	app.Route("/", func() app.Composer { return &Shell{} })
}

// Shell is the whole app screen: the session being edited, its readings and
// its line, and the list of stored sessions.
type Shell struct {
	app.Compo

	st      store.Store
	storeOK bool
	sess    *session.Session
	view    analysis

	sessions    []store.Summary
	listOpen    bool
	confirmDel  string // id of the session whose deletion is being confirmed
	renaming    string // id of the session being renamed
	renameText  string
	saveState   SaveState // SaveNone before the first save
	saveMessage string    // the detail of a failure (an error's text)
	saveWhy     string    // why it failed: saveRefused, saveUnwritable or saveHeld
	saveFor     string    // ID of the session saveState is about
	notice      string    // a sentence shown in the message strip
	updateReady bool

	saves    *saveQueue
	editSeq  int             // counts edits, to run delayed work only for the latest
	lastSave time.Time       // when the open session was last handed to the saver
	toSave   bool            // an edit waits for its save turn
	queued   map[string]bool // IDs of sessions handed to the saver in this tab
	pairs    session.PairCache
	page     int // page of the readings grid shown (pageSize rows each)

	needSync bool // text fields must be set from the session at the next render

	// ui is the Shell's own context (from OnMount). Work that finishes after
	// an event must dispatch through it: go-app drops a dispatch whose
	// source element has left the page, as a button in a closed list has.
	ui app.Context

	transferState // files in and out, trash, storage, other tabs (transfer.go)

	analysisUI // settings, checks, advice, use of the line, acceptance (settings.go)

	fieldUI // plots, report, undo, theme and demo (theme.go)

	recordUI // the record cards: identity, standards, unknowns, sign-off (recordui.go)

	instState // the instrument view and the due marks (instruments_shell.go)
}

type saveJob struct {
	sum  store.Summary
	body []byte
}

// analysis is what the screen shows of a session: the report (or the reason
// there is none) and the cells that could not be used.
type analysis struct {
	report   *fitcore.Report
	message  string // why there is no report
	problems map[cellKey]string
	usable   int
	digits   int  // most significant digits typed in any usable cell
	stale    bool // readings changed since the report was computed
	// advicePending: the advice is worked out in a later turn and there
	// is no earlier advice to show meanwhile.
	advicePending bool
	// plotsLater: the plots of this report are drawn in the next turn (big
	// sessions: so that no one turn holds up typing for long).
	plotsLater bool

	// stdProblems: why a standard's value or uncertainty is not used
	// (session.StandardUncertainties).
	stdProblems []string

	rows []int     // session row of each usable pair (fitcore's index → grid row)
	x, y []float64 // the usable pairs as read (what fitcore was given)
}

type cellKey struct {
	row int
	col session.Column
}

// OnMount opens the device store and reopens the last session.
func (c *Shell) OnMount(ctx app.Context) {
	c.ui = ctx
	c.updateReady = ctx.AppUpdateAvailable()
	c.saves = newSaveQueue()
	c.mountTransfer(ctx)
	c.netWatch(ctx)
	c.anLoadTemplates(ctx)
	ctx.Async(func() {
		st, err := store.Open()
		if err != nil {
			st = store.NewMemory()
			ctx.Dispatch(func(ctx app.Context) { c.notice = err.Error() })
		} else {
			st.Purge(time.Now())
		}
		sess, err := openLast(st)
		list, _ := st.List()
		ctx.Dispatch(func(ctx app.Context) {
			c.st, c.storeOK = st, err == nil
			c.sessions = list
			if err != nil {
				c.notice = err.Error()
			}
			c.showStored(sess)
			c.startSaver(ctx)
			if len(list) == 0 || list[0].ID != sess.ID {
				c.save(ctx)
			}
			ctx.Async(func() { st.SetLast(sess.ID) })
		})
	})
}

// OnAppUpdate is called by go-app once a new version has been installed in
// the background. The technician decides when to reload.
func (c *Shell) OnAppUpdate(ctx app.Context) {
	c.updateReady = ctx.AppUpdateAvailable()
}

// openLast returns the session open before the page was closed, the newest
// stored one when that is gone, or a new one.
func openLast(st store.Store) (*session.Session, error) {
	if id, err := st.Last(); err == nil && id != "" {
		if s, err := load(st, id); err == nil {
			return s, nil
		}
	}
	if list, err := st.List(); err == nil && len(list) > 0 {
		if s, err := load(st, list[0].ID); err == nil {
			return s, nil
		}
	}
	return newSession(time.Now())
}

func load(st store.Store, id string) (*session.Session, error) {
	b, err := st.Load(id)
	if err != nil {
		return nil, err
	}
	f, err := session.Decode(bytes.NewReader(b))
	if err != nil {
		return nil, fmt.Errorf("the stored session could not be read: %w", err)
	}
	if len(f.Sessions) != 1 {
		return nil, fmt.Errorf("the stored record holds %d sessions, not one", len(f.Sessions))
	}
	return f.Sessions[0], nil
}

// newSession starts an empty session with one blank row, ready for typing.
func newSession(now time.Time) (*session.Session, error) {
	s, err := session.New("Session of "+now.Format("2 Jan 2006 15:04"), now, nil)
	if err != nil {
		return nil, err
	}
	s.XName, s.YName = "Reference", "Reading"
	s.AddRow("", "", now)
	return s, nil
}

// show makes s the open session and analyses it. The save status is the
// open session's: opening another one shows that one's (blank, or the
// failure of a save still waiting to be tried again).
func (c *Shell) show(s *session.Session) {
	if c.sess != nil && c.sess != s {
		switch {
		case s.ID == c.sess.ID:
			// Another version of the same session replaces the open one,
			// as chosen (an import's "replace", the other tab's version):
			// what this tab had not written yet must not overwrite it.
			c.toSave = false
			c.saves.drop(s.ID)
		case c.toSave:
			c.save(c.ui) // the last edit of the session being left, before its save turn
		}
		if c.sess.ID != s.ID && c.saveState == SaveFailed && c.saveWhy != saveHeld {
			c.notice = leftUnsaved(c.sess.Title, c.saveWhy, c.saveMessage)
		}
	}
	if c.saveFor != s.ID {
		c.saveFor = s.ID
		c.saveState, c.saveMessage, c.saveWhy = SaveNone, "", ""
		if msg, ok := c.saves.failure(s.ID); ok {
			c.saveState, c.saveMessage, c.saveWhy = SaveFailed, msg, saveRefused
		}
	}
	c.sess = s
	c.undoSync()
	c.page = 0
	c.recKey, c.recLast = "", nil
	c.opened(s)
	c.analyse()
	c.resyncInputs()
	c.collectAfterLoad()
	c.lookUpLast()
}

// showStored shows s, a session just read from (or written to) the device:
// unless a save of it is still waiting or was refused, its status is
// "saved", since what is shown is what the device holds.
func (c *Shell) showStored(s *session.Session) {
	c.show(s)
	if c.saveState == SaveNone && !c.saves.pending(s.ID) {
		c.saveState = SaveSaved
	}
}

// resyncInputs asks the next render to make every text field show the open
// session's values. go-app v10.1.11 does not clear an input's value when the
// new value is empty (it removes the attribute, which leaves the typed value
// in place), so switching to a session with empty cells would otherwise show
// the previous session's text. Go-app keeps an input's element from one
// render to the next, so setting the property before it diffs is enough.
func (c *Shell) resyncInputs() { c.needSync = true }

// afterRender runs fn once the render under way is on the page (a timer of
// 0 ms). Natively there is no page and fn does not run.
func afterRender(fn func()) {
	if !app.Window().Get("document").Truthy() {
		return
	}
	var f app.Func
	f = app.FuncOf(func(this app.Value, args []app.Value) any {
		fn()
		f.Release()
		return nil
	})
	app.Window().Call("setTimeout", f, 0)
}

// syncInputs runs at the start of Render when a sync is pending. Natively
// (prerendering) there is no document and it does nothing.
func (c *Shell) syncInputs() {
	if !c.needSync || c.sess == nil {
		return
	}
	c.needSync = false
	doc := app.Window().Get("document")
	if !doc.Truthy() {
		return
	}
	s := c.sess
	want := map[string]string{
		"session-title": s.Title,
		"x-name":        s.XName, "x-unit": s.XUnit,
		"y-name": s.YName, "y-unit": s.YUnit,
		"record-site": s.Site, "record-instrument": s.Instrument.Description, "record-serial": s.Instrument.Serial,
		"record-identifier": s.Instrument.ID, "record-operator": s.Operator, "record-notes": s.Notes,
		"record-interval": "", "record-temperature": "", "record-temperature-unit": "",
	}
	if s.Instrument.IntervalDays > 0 {
		want["record-interval"] = strconv.Itoa(s.Instrument.IntervalDays)
	}
	if i := conditionIndex(s, session.ConditionTemperature); i >= 0 {
		want["record-temperature"], want["record-temperature-unit"] = s.Conditions[i].Value, s.Conditions[i].Unit
	}
	lo, hi := c.pageRange()
	for i := lo; i < hi; i++ {
		n := strconv.Itoa(i)
		want["x-input-"+n], want["y-input-"+n] = s.Readings[i].X, s.Readings[i].Y
		want["reading-note-"+strconv.Itoa(i+1)] = s.Readings[i].Note
	}
	for id, v := range want {
		el := doc.Call("querySelector", `[data-testid="`+id+`"]`)
		if el.Truthy() && el.Get("value").String() != v {
			el.Set("value", v)
		}
	}
	// The fields of the record's list items (standards, conditions), by
	// item and field.
	items := map[string]string{}
	for i, st := range s.Standards {
		exp := ""
		if !st.Expiry.IsZero() {
			exp = st.Expiry.UTC().Format("2006-01-02")
		}
		pre := `[data-testid="standard-item"][data-index="` + strconv.Itoa(i) + `"] [data-testid="standard-`
		items[pre+`name"]`], items[pre+`certificate"]`], items[pre+`value"]`] = st.Name, st.Certificate, st.Value
		items[pre+`uncertainty"]`], items[pre+`expiry"]`] = st.Uncertainty, exp
	}
	for i, cd := range s.Conditions {
		pre := `[data-testid="condition-item"][data-index="` + strconv.Itoa(i) + `"] [data-testid="condition-`
		items[pre+`name"]`], items[pre+`value"]`], items[pre+`unit"]`] = cd.Name, cd.Value, cd.Unit
	}
	for q, v := range items {
		el := doc.Call("querySelector", q)
		if el.Truthy() && el.Get("value").String() != v {
			el.Set("value", v)
		}
	}
	// The fields of the settings and criteria cards are known once this
	// render has drawn them: an undone criterion must leave its box empty.
	afterRender(c.anResync)
}

// analyse runs fitcore on the usable pairs of the open session.
func (c *Shell) analyse() { c.analyseNow(false) }

// analyseNow runs fitcore; quick leaves out the transform advice (it re-fits
// the readings several times) and keeps the advice shown before, marked as
// being updated.
func (c *Shell) analyseNow(quick bool) {
	prev := c.view.report
	x, y, rows, problems := c.pairs.Pairs(c.sess)
	a := analysis{problems: make(map[cellKey]string, len(problems)), usable: len(rows), rows: rows, x: x, y: y}
	for _, p := range problems {
		a.problems[cellKey{p.Row, p.Column}] = p.Reason
	}
	for _, r := range rows {
		a.digits = max(a.digits, digitsOf(c.sess.Readings[r].X), digitsOf(c.sess.Readings[r].Y))
	}
	opt := c.sess.Settings.Options()
	c.anQueries(&opt, x)
	c.plotQueries(&opt, x)
	// The record's unknowns come after the screen's own conversion
	// (unknownResults splits them again), with the standards'
	// uncertainties carried into their intervals.
	opt.Inverse = append(opt.Inverse, c.sess.UnknownQueries().Queries...)
	opt.XStandardUncertainties, a.stdProblems = c.sess.StandardUncertainties(x)
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
	c.view = a
}

// completeNow adds the advice (and the Box–Cox profile) to the report of
// a quick analysis (fitcore.Complete: the same report a full analysis
// gives, without fitting the readings again).
func (c *Shell) completeNow() {
	rep := c.view.report
	if rep == nil || !c.view.stale {
		c.analyse()
		return
	}
	r := *rep
	if err := fitcore.Complete(&r, c.view.x, c.view.y, c.sess.Settings.Options()); err != nil {
		c.analyse()
		return
	}
	renumberAdvice(r.Advice, c.view.rows)
	c.view.report = &r
	c.view.stale, c.view.advicePending = false, false
	c.view.plotsLater = true
}

// adviceLater is the number of readings from which an edit's transform
// advice (it refits the readings several ways) and plots come one turn
// after its line and checks (the measurements behind it are in
// DEVELOPERS.md, "Speed in the browser").
const adviceLater = 3000

// saveEvery is the longest a run of edits waits to be written to the
// device while someone keeps typing into a big session; savePause is the
// pause in typing after which a big session is written (encoding and
// storing grow with the readings: not on every keystroke).
const (
	saveEvery = time.Second
	savePause = 300 * time.Millisecond
)

// saveAtOnce is the number of readings below which an edit is saved in its
// own turn (encoding that many is quick; figures in DEVELOPERS.md).
const saveAtOnce = 500

// edited is called after every change to the open session. The work is
// split into turns of the browser's event loop so that a keystroke never
// waits for more than one of them:
//
//  1. at once: the readings are paired and fitted with their checks (with
//     the advice and plots too below adviceLater readings), and the
//     screen shows it;
//  2. below adviceLater nothing more; from it, once that frame is drawn:
//     the advice, and in the turn after that the plots;
//  3. below saveAtOnce readings at once; otherwise once that frame is
//     drawn (from adviceLater readings: once typing pauses for savePause):
//     the session is encoded and handed to the saver.
//
// A turn that finds a newer edit leaves its work to that edit (a save
// still goes ahead when the last one is saveEvery old).
func (c *Shell) edited(ctx app.Context) {
	c.editSeq++
	c.undoTrack()
	seq := c.editSeq
	big := len(c.sess.Readings) >= adviceLater
	c.analyseNow(big)
	if c.st != nil && !c.heldByOtherTab() {
		if c.saveState != SaveFailed {
			c.saveState = SaveSaving // from now: the edit is not on the device yet
		} // a failure stays shown until a save succeeds
		c.toSave = true
	}
	if len(c.sess.Readings) < saveAtOnce {
		c.save(c.ui) // cheap: in the keystroke's own turn, so a reload right after keeps it
		return
	}
	stateWas := c.saveState.String() + "\x00" + c.saveMessage
	saveTurn := func(ctx app.Context) {
		if seq == c.editSeq || time.Since(c.lastSave) >= saveEvery {
			c.save(c.ui)
		}
		c.keepScreen(ctx, stateWas)
	}
	if !big {
		c.afterFrame(saveTurn)
		return
	}
	laterSave := func() {
		if c.ui.Src() == nil || time.Since(c.lastSave) >= saveEvery {
			c.afterFrame(saveTurn)
			return
		}
		c.ui.After(savePause, func(ctx app.Context) {
			if seq == c.editSeq {
				saveTurn(ctx)
			}
		})
	}
	c.afterFrame(func(app.Context) {
		if seq != c.editSeq {
			laterSave()
			return
		}
		c.completeNow()
		c.afterFrame(func(app.Context) {
			if seq == c.editSeq {
				c.view.plotsLater = false
			}
			laterSave()
		})
	})
}

// collectAfterLoad collects the garbage in the turn after a session of
// saveAtOnce readings or more was opened or a block pasted into it, while
// the technician reads the screen: loading leaves megabytes behind, and the
// collection it calls for otherwise falls in the next edits (every
// allocation then helps to mark; DEVELOPERS.md has the figures). Only in
// the browser; nothing on the screen changes.
func (c *Shell) collectAfterLoad() {
	if c.ui.Src() == nil || c.sess == nil || len(c.sess.Readings) < saveAtOnce {
		return
	}
	c.afterFrame(func(ctx app.Context) {
		runtime.GC()
		ctx.PreventUpdate()
	})
}

// keepScreen tells go-app not to redraw the screen after the turn of ctx
// when the save state is still was (saveState, NUL, saveMessage): a
// save handed to the saver changes nothing on the page, and a redraw of
// the whole screen is the costliest part of a turn. Another change queued
// for the same frame still redraws it.
func (c *Shell) keepScreen(ctx app.Context, was string) {
	if ctx.Src() != nil && c.saveState.String()+"\x00"+c.saveMessage == was {
		ctx.PreventUpdate()
	}
}

// afterFrame runs fn on the UI goroutine in a later turn of the event loop,
// once the frame being prepared is on the page (go-app's Defer runs after
// the frame's updates; the timer then lets the browser paint and handle
// input first); fn gets the context of that turn. Natively, without a
// mounted Shell, fn runs at once with no context (nothing to redraw).
func (c *Shell) afterFrame(fn func(ctx app.Context)) {
	if c.ui.Src() == nil {
		fn(app.Context{})
		return
	}
	c.ui.Defer(func(app.Context) {
		c.ui.After(time.Millisecond, fn)
	})
}

// Why a save failed (Shell.saveWhy).
const (
	saveRefused    = "refused"    // the device's storage refused it (full, private mode, …)
	saveUnwritable = "unwritable" // the session could not be encoded as a record
	saveHeld       = "held"       // another tab stored a newer version; the technician chooses
)

// save encodes the open session and hands it to the saver (saveQueue).
// When it cannot be encoded, the failure is shown and the edit stays marked
// as waiting (toSave), so that nothing later reports it saved.
func (c *Shell) save(ctx app.Context) {
	if c.st == nil || c.sess == nil || c.heldByOtherTab() {
		return
	}
	c.saveFor = c.sess.ID
	if pristine(c.sess) && !c.stored(c.sess.ID) {
		// Nothing typed yet: a session is stored from its first real
		// change, so opening and leaving one piles up no empty records.
		if c.saveState != SaveFailed {
			c.saveState = SaveNone
		}
		c.toSave = false
		return
	}
	job, err := encodeJobInto(c.saves.takeSpare(), c.sess)
	if err != nil {
		c.saveState, c.saveMessage, c.saveWhy = SaveFailed, err.Error(), saveUnwritable
		c.toSave = true
		return
	}
	c.saves.put(job)
	if c.queued == nil {
		c.queued = map[string]bool{}
	}
	c.queued[c.sess.ID] = true
	if c.saveState != SaveFailed || c.saveWhy != saveRefused {
		c.saveState, c.saveMessage, c.saveWhy = SaveSaving, "", ""
	}
	c.lastSave = time.Now()
	c.toSave = false
}

// retrySave tries again every save that failed: the open session's state
// as it is now, and the states of other sessions kept since they failed.
func (c *Shell) retrySave(ctx app.Context, e app.Event) {
	c.saves.retry()
	if c.sess != nil && c.saveState == SaveFailed && c.saveWhy != saveHeld {
		c.saveState, c.saveMessage, c.saveWhy = SaveSaving, "", ""
		c.save(c.ui)
	}
}

// retryable says whether "Try again" has something to try: a refused or
// unwritable save of the open session, or a refused state of a session
// left since.
func (c *Shell) retryable() bool {
	return (c.saveState == SaveFailed && c.saveWhy != saveHeld) || c.saves.hasFailed()
}

// saveText is the save status in words: a failure is a plain sentence with
// its detail, and says that nothing on screen is lost.
func (c *Shell) saveText() string {
	switch c.saveState {
	case SaveSaved:
		return "Saved on this device"
	case SaveSaving:
		return "Saving…"
	case SaveFailed:
		switch c.saveWhy {
		case saveHeld:
			return "Not saved: " + c.saveMessage
		case saveUnwritable:
			return "Not saved: this session could not be written as a record (" + c.saveMessage + "). Your changes are kept on screen; Pairline tries again with your next change."
		}
		return "Not saved: this device refused to store the session (" + c.saveMessage + "). Your changes are kept on screen; Pairline tries again with your next change, or tap “Try again”."
	}
	return ""
}

// leftUnsaved is the notice shown when a session whose save failed is left
// for another one.
func leftUnsaved(title, why, detail string) string {
	if why == saveUnwritable {
		return "“" + title + "” could not be written as a record (" + detail + "); its last changes were not stored and are lost when this tab closes."
	}
	return "“" + title + "” is not saved on this device yet (" + detail + "). Its last state is kept here and tried again with your next change, or with “Try again”."
}

// saveQueue holds the states waiting to be written, the newest of each
// session: a newer state of a session replaces its older pending one (which
// is then never written after it), while another session's pending state
// keeps its place. A state the store refused is kept (with why) until a
// newer state of its session comes, or it is tried again: with the next
// state handed in, or on retry. Several goroutines may use it.
type saveQueue struct {
	mu     sync.Mutex
	jobs   []saveJob
	failed map[string]failedJob // by session ID
	wake   chan struct{}
	closed bool
	spare  []byte // the memory of a state already written, for the next one
}

// failedJob is a state the store refused, and its error.
type failedJob struct {
	job saveJob
	err string
}

// takeSpare returns memory for encoding the next state (nil when none).
func (q *saveQueue) takeSpare() []byte {
	if q == nil {
		return nil
	}
	q.mu.Lock()
	defer q.mu.Unlock()
	b := q.spare
	q.spare = nil
	return b
}

// giveBack offers the memory of a state the store has taken a copy of.
func (q *saveQueue) giveBack(b []byte) {
	q.mu.Lock()
	if cap(b) > cap(q.spare) {
		q.spare = b
	}
	q.mu.Unlock()
}

func newSaveQueue() *saveQueue { return &saveQueue{wake: make(chan struct{}, 1)} }

// put queues a state (it supersedes a refused state of its session), and
// before it the states of other sessions refused earlier.
func (q *saveQueue) put(j saveJob) {
	q.mu.Lock()
	delete(q.failed, j.sum.ID)
	q.requeueFailed()
	q.queue(j)
	q.mu.Unlock()
	q.signal()
}

// queue puts j in the place of its session's pending state, or last.
// The caller holds mu.
func (q *saveQueue) queue(j saveJob) {
	for i := range q.jobs {
		if q.jobs[i].sum.ID == j.sum.ID {
			q.jobs[i] = j
			return
		}
	}
	q.jobs = append(q.jobs, j)
}

// requeueFailed queues the refused states again (a newer pending state of
// the same session wins). The caller holds mu.
func (q *saveQueue) requeueFailed() {
	for id, f := range q.failed {
		if !q.pendingLocked(id) {
			q.jobs = append(q.jobs, f.job)
		}
	}
	q.failed = nil
}

func (q *saveQueue) signal() {
	select {
	case q.wake <- struct{}{}:
	default:
	}
}

// fail keeps a state the store refused, unless a newer state of its
// session is already waiting.
func (q *saveQueue) fail(j saveJob, err error) {
	q.mu.Lock()
	defer q.mu.Unlock()
	if q.pendingLocked(j.sum.ID) {
		return
	}
	if q.failed == nil {
		q.failed = map[string]failedJob{}
	}
	q.failed[j.sum.ID] = failedJob{job: j, err: err.Error()}
}

// retry queues every refused state again.
func (q *saveQueue) retry() {
	if q == nil {
		return
	}
	q.mu.Lock()
	q.requeueFailed()
	q.mu.Unlock()
	q.signal()
}

// hasFailed reports whether any refused state is kept.
func (q *saveQueue) hasFailed() bool {
	if q == nil {
		return false
	}
	q.mu.Lock()
	defer q.mu.Unlock()
	return len(q.failed) > 0
}

// failure returns the error of the refused state of session id, if one is kept.
func (q *saveQueue) failure(id string) (string, bool) {
	if q == nil {
		return "", false
	}
	q.mu.Lock()
	defer q.mu.Unlock()
	f, ok := q.failed[id]
	return f.err, ok
}

// drop forgets the waiting and refused states of session id (another
// version of it replaces them).
func (q *saveQueue) drop(id string) {
	if q == nil {
		return
	}
	q.mu.Lock()
	defer q.mu.Unlock()
	delete(q.failed, id)
	q.jobs = slices.DeleteFunc(q.jobs, func(j saveJob) bool { return j.sum.ID == id })
}

// pending reports whether a state of session id waits to be written.
func (q *saveQueue) pending(id string) bool {
	q.mu.Lock()
	defer q.mu.Unlock()
	return q.pendingLocked(id)
}

func (q *saveQueue) pendingLocked(id string) bool {
	for i := range q.jobs {
		if q.jobs[i].sum.ID == id {
			return true
		}
	}
	return false
}

// next waits for the oldest queued state; false once the queue is closed.
func (q *saveQueue) next() (saveJob, bool) {
	for {
		q.mu.Lock()
		if q.closed {
			q.mu.Unlock()
			return saveJob{}, false
		}
		if len(q.jobs) > 0 {
			j := q.jobs[0]
			q.jobs = q.jobs[1:]
			q.mu.Unlock()
			return j, true
		}
		q.mu.Unlock()
		<-q.wake
	}
}

// len is the number of states waiting.
func (q *saveQueue) len() int {
	q.mu.Lock()
	defer q.mu.Unlock()
	return len(q.jobs)
}

// close stops next.
func (q *saveQueue) close() {
	q.mu.Lock()
	q.closed = true
	q.mu.Unlock()
	q.signal()
}

// encodeJob encodes a session as its stored record and summary.
func encodeJob(s *session.Session) (saveJob, error) { return encodeJobInto(nil, s) }

// encodeJobInto is encodeJob reusing the memory of buf.
func encodeJobInto(buf []byte, s *session.Session) (saveJob, error) {
	body, err := session.EncodeAppend(buf, []*session.Session{s})
	if err != nil {
		return saveJob{}, err
	}
	return saveJob{
		sum:  store.Summary{ID: s.ID, Title: s.Title, Site: s.Site, Modified: s.Modified, Readings: filledReadings(s)},
		body: body,
	}, nil
}

// filledReadings counts the readings that hold a value (an x, a y or a
// note; a left-out reading counts): the list shows it, so the blank row a
// new session starts with is not "1 reading".
func filledReadings(s *session.Session) int {
	n := 0
	for i := range s.Readings {
		r := &s.Readings[i]
		if r.Excluded || strings.TrimSpace(r.X) != "" || strings.TrimSpace(r.Y) != "" || strings.TrimSpace(r.Note) != "" {
			n++
		}
	}
	return n
}

// pristine reports whether s holds nothing anyone typed: its history has
// only the blank rows added, and every reading is blank.
func pristine(s *session.Session) bool {
	for _, e := range s.History {
		if e.Field != session.EditRowAdded {
			return false
		}
	}
	return filledReadings(s) == 0
}

// stored reports whether the session with that ID is in the device's list.
func (c *Shell) stored(id string) bool {
	if c.queued[id] {
		return true // handed to the saver: the list may not show it yet
	}
	for i := range c.sessions {
		if c.sessions[i].ID == id {
			return true
		}
	}
	return false
}

// saveNow writes a session that is not the open one (call off the UI goroutine).
func saveNow(st store.Store, s *session.Session) error {
	job, err := encodeJob(s)
	if err != nil {
		return err
	}
	return st.Save(job.sum, job.body)
}

// startSaver writes queued states one after the other, off the UI goroutine.
func (c *Shell) startSaver(ctx app.Context) {
	st, saves := c.st, c.saves
	ctx.Async(func() {
		for {
			job, ok := saves.next()
			if !ok {
				return
			}
			err := st.Save(job.sum, job.body)
			if err != nil {
				saves.fail(job, err) // kept whole, to be tried again
			} else {
				saves.giveBack(job.body) // the store keeps its own copy
			}
			list, _ := st.List()
			ctx.Dispatch(func(ctx app.Context) { c.saved(ctx, job.sum, err, list) })
		}
	})
}

// saved shows the outcome of one write. The save status is the open
// session's; a write of another session (one just left) that fails is
// said in the message strip.
func (c *Shell) saved(ctx app.Context, sum store.Summary, err error, list []store.Summary) {
	c.sessions = list
	open := c.sess != nil && c.sess.ID == sum.ID
	if err != nil {
		if open {
			c.saveFor, c.saveState, c.saveMessage, c.saveWhy = sum.ID, SaveFailed, err.Error(), saveRefused
		} else {
			c.notice = leftUnsaved(sum.Title, saveRefused, err.Error())
		}
		return
	}
	c.announceSaved(ctx, sum)
	if !open || c.saves.pending(sum.ID) || c.toSave {
		return
	}
	if c.saveState == SaveFailed && c.saveWhy != saveRefused {
		return // a newer state could not be encoded, or another tab holds it
	}
	c.saveState, c.saveMessage, c.saveWhy = SaveSaved, "", ""
}

// OnDismount stops the saver.
func (c *Shell) OnDismount() {
	if c.saves != nil {
		c.saves.close()
		c.saves = nil
	}
}

func plainFitError(err error, usable int) string {
	if usable < 3 {
		return fmt.Sprintf("A line needs at least 3 usable pairs of readings; there %s %d so far.", isAre(usable), usable)
	}
	return sentence(err.Error())
}

// sentence starts a message with a capital letter and ends it with a full stop.
func sentence(s string) string {
	if s == "" {
		return s
	}
	r := []rune(s)
	r[0] = unicode.ToUpper(r[0])
	s = string(r)
	if !strings.HasSuffix(s, ".") {
		s += "."
	}
	return s
}

func isAre(n int) string {
	if n == 1 {
		return "is"
	}
	return "are"
}
