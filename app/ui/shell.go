// Package ui holds Pairline's go-app components. Components keep only UI
// state and render what fitcore and app/session compute; they never compute
// statistics themselves.
package ui

import (
	"bytes"
	"fmt"
	"runtime"
	"strconv"
	"strings"
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
	app.Route("/", func() app.Composer { return newShell() })
}

// Shell is the whole app screen: the session being edited, its readings and
// its line, and the list of stored sessions.
type Shell struct {
	app.Compo

	// The open session, its analysis, saving and undo history, and the
	// actions that change them (controller.go). The Shell reads its state
	// to hand it to the cards; changes go through its actions.
	ctl *controller

	listOpen    bool
	confirmDel  string // id of the session whose deletion is being confirmed
	renaming    string // id of the session being renamed
	renameText  string
	notice      string // a sentence shown in the message strip
	updateReady bool

	page int // page of the readings grid shown (pageSize rows each)

	needSync bool // text fields must be set from the session at the next render

	// ui is the Shell's own context (from OnMount). Work that finishes after
	// an event must dispatch through it: go-app drops a dispatch whose
	// source element has left the page, as a button in a closed list has.
	ui app.Context

	xfer transferState // files in and out (transfer.go)

	tabs tabSync // other tabs with the same session open (tabs.go)

	usage storageUse // the storage figures (storage.go)

	trash trashBin // the sessions list's trash (trash.go)

	theme themeUI // the screen's colours (theme.go)

	net netUI // network and install states (netstatus.go)

	an analysisUI // settings, checks, advice, use of the line, acceptance (settings.go)

	tpl criteriaTemplates // the criteria templates on the device (acceptance.go)

	demoUI // the demo being added (demo.go)

	en entryUI // the row being typed into (grid.go)

	pl plotsUI // the plots: the reading selected, the drawing kept (plots.go)

	rp reportUI // the report dialog (report.go)

	recordUI // the record cards: identity, standards, unknowns, sign-off (recordui.go)

	inst instState // the instrument view and the due marks (instruments_shell.go)
}

// newShell returns the Shell with its controller, which asks the screen's
// own questions (conversions, the plots' grid) in every analysis and saves
// nothing while another tab holds the open session.
func newShell() *Shell {
	c := &Shell{ctl: newController(nil)}
	c.ctl.queries = func(o *fitcore.Options, x []float64) {
		c.an.queries(o, x)
		plotQueries(o, x)
	}
	c.ctl.held = func() bool { return c.tabs.held(c.ctl.sess) }
	return c
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
	if c.ctl.saves == nil {
		c.ctl.saves = newSaveQueue() // mounted again after OnDismount
	}
	c.mountTransfer(ctx)
	c.net.watch(c.dispatch)
	followWindowFocus()
	c.tpl.load(ctx.LocalStorage())
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
			c.ctl.st, c.ctl.storeOK = st, err == nil
			c.ctl.sessions = list
			if err != nil {
				c.notice = err.Error()
			}
			c.showStored(sess)
			c.startSaver(ctx)
			if len(list) == 0 || list[0].ID != sess.ID {
				c.ctl.save()
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

// show makes s the open session (controller.openSession) and sets the screen
// for it: the first page of readings, its record offer, every text field
// written again.
func (c *Shell) show(s *session.Session) {
	if n := c.ctl.openSession(s); n != "" {
		c.notice = n
	}
	c.page = 0
	c.recKey, c.recLast = "", nil
	c.tabs.opened(s)
	c.resyncInputs()
	c.collectAfterLoad()
	c.lookUpLast()
}

// showStored shows s, a session just read from (or written to) the device:
// unless a save of it is still waiting or was refused, its status is
// "saved", since what is shown is what the device holds.
func (c *Shell) showStored(s *session.Session) {
	c.show(s)
	c.ctl.markStored()
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
	if !c.needSync || c.ctl.sess == nil {
		return
	}
	c.needSync = false
	doc := app.Window().Get("document")
	if !doc.Truthy() {
		return
	}
	s := c.ctl.sess
	// Each field by its data-testid (the grid's, the record's), then the
	// fields of the record's list items by item and field: a slice, not a
	// map (a map literal costs app.wasm a call per entry; the order of the
	// writes does not matter).
	interval, temp, tempUnit := "", "", ""
	if s.Instrument.IntervalDays > 0 {
		interval = strconv.Itoa(s.Instrument.IntervalDays)
	}
	if i := conditionIndex(s, session.ConditionTemperature); i >= 0 {
		temp, tempUnit = s.Conditions[i].Value, s.Conditions[i].Unit
	}
	want := []fieldText{
		{"session-title", s.Title},
		{"x-name", s.XName}, {"x-unit", s.XUnit},
		{"y-name", s.YName}, {"y-unit", s.YUnit},
		{"record-site", s.Site}, {"record-instrument", s.Instrument.Description}, {"record-serial", s.Instrument.Serial},
		{"record-identifier", s.Instrument.ID}, {"record-operator", s.Operator}, {"record-notes", s.Notes},
		{"record-interval", interval}, {"record-temperature", temp}, {"record-temperature-unit", tempUnit},
	}
	lo, hi := c.pageRange()
	for i := lo; i < hi; i++ {
		n := strconv.Itoa(i)
		want = append(want, fieldText{"x-input-" + n, s.Readings[i].X}, fieldText{"y-input-" + n, s.Readings[i].Y},
			fieldText{"reading-note-" + strconv.Itoa(i+1), s.Readings[i].Note})
	}
	for i := range want {
		want[i].sel = `[data-testid="` + want[i].sel + `"]`
	}
	for i, st := range s.Standards {
		exp := ""
		if !st.Expiry.IsZero() {
			exp = st.Expiry.UTC().Format("2006-01-02")
		}
		pre := `[data-testid="standard-item"][data-index="` + strconv.Itoa(i) + `"] [data-testid="standard-`
		want = append(want, fieldText{pre + `name"]`, st.Name}, fieldText{pre + `certificate"]`, st.Certificate}, fieldText{pre + `value"]`, st.Value},
			fieldText{pre + `uncertainty"]`, st.Uncertainty}, fieldText{pre + `expiry"]`, exp})
	}
	for i, cd := range s.Conditions {
		pre := `[data-testid="condition-item"][data-index="` + strconv.Itoa(i) + `"] [data-testid="condition-`
		want = append(want, fieldText{pre + `name"]`, cd.Name}, fieldText{pre + `value"]`, cd.Value}, fieldText{pre + `unit"]`, cd.Unit})
	}
	for _, w := range want {
		el := doc.Call("querySelector", w.sel)
		if el.Truthy() && el.Get("value").String() != w.v {
			el.Set("value", w.v)
			el.Set(takenProp, w.v) // a grid cell: the app wrote it (readingRow.shownText)
		}
	}
	// The fields of the settings and criteria cards are known once this
	// render has drawn them: an undone criterion must leave its box empty.
	afterRender(func() { c.an.resync(&c.tpl) })
}

// fieldText is a text field of the screen, by its CSS selector, and the
// text it must show (syncInputs).
type fieldText struct{ sel, v string }

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

// afterChange schedules the later turns of the change the controller has
// just taken (controller.changed did the first). The work of a change is
// split into turns of the browser's event loop so that a keystroke never
// waits for more than one of them:
//
//  1. at once (changed): the readings are paired and fitted with their
//     checks (with the advice and plots too below adviceLater readings),
//     and the screen shows it;
//  2. below adviceLater nothing more; from it, once that frame is drawn:
//     the advice and the plots;
//  3. below saveAtOnce readings at once (changed); otherwise once that
//     frame is drawn (from adviceLater readings: once typing pauses for
//     savePause): the session is encoded and handed to the saver.
//
// A turn that finds a newer edit leaves its work to that edit (a save
// still goes ahead when the last one is saveEvery old).
func (c *Shell) afterChange(ctx app.Context) {
	if c.ctl.sess == nil || len(c.ctl.sess.Readings) < saveAtOnce {
		return // saved in the change's own turn
	}
	seq := c.ctl.editSeq
	big := c.ctl.big()
	stateWas := c.ctl.saveStamp()
	saveTurn := func(ctx app.Context) {
		if seq == c.ctl.editSeq || time.Since(c.ctl.lastSave) >= saveEvery {
			c.ctl.save()
		}
		// A save handed to the saver changes nothing on the page, and a
		// redraw of the whole screen is the costliest part of a turn: none
		// when the save state is still what it was (another change queued
		// for the same frame still redraws it).
		if ctx.Src() != nil && c.ctl.saveStamp() == stateWas {
			ctx.PreventUpdate()
		}
	}
	if !big {
		c.afterFrame(saveTurn)
		return
	}
	laterSave := func() {
		if c.ui.Src() == nil || time.Since(c.ctl.lastSave) >= saveEvery {
			c.afterFrame(saveTurn)
			return
		}
		c.ui.After(savePause, func(ctx app.Context) {
			if seq == c.ctl.editSeq {
				saveTurn(ctx)
			}
		})
	}
	c.afterFrame(func(app.Context) {
		if seq != c.ctl.editSeq {
			laterSave()
			return
		}
		c.ctl.completeNow()
		laterSave()
	})
}

// collectAfterLoad collects the garbage in the turn after a session of
// saveAtOnce readings or more was opened or a block pasted into it, while
// the technician reads the screen: loading leaves megabytes behind, and the
// collection it calls for otherwise falls in the next edits (every
// allocation then helps to mark; DEVELOPERS.md has the figures). Only in
// the browser; nothing on the screen changes.
func (c *Shell) collectAfterLoad() {
	if c.ui.Src() == nil || c.ctl.sess == nil || len(c.ctl.sess.Readings) < saveAtOnce {
		return
	}
	c.afterFrame(func(ctx app.Context) {
		runtime.GC()
		ctx.PreventUpdate()
	})
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

// saveNow writes a session that is not the open one (call off the UI goroutine).
func saveNow(st store.Store, s *session.Session) error {
	job, err := encodeJob(s)
	if err != nil {
		return err
	}
	return st.Save(job.sum, job.body)
}

// startSaver writes queued states one after the other, off the UI
// goroutine (writeNext), and hands each outcome to the controller on it.
func (c *Shell) startSaver(ctx app.Context) {
	st, saves := c.ctl.st, c.ctl.saves
	ctx.Async(func() {
		for {
			w, ok := writeNext(st, saves)
			if !ok {
				return
			}
			ctx.Dispatch(func(ctx app.Context) { c.saveDone(ctx, w.sum, w.err, w.list) })
		}
	})
}

// saveDone shows the outcome of one write: the controller's save status,
// a notice when a session left before failed, the storage figures.
func (c *Shell) saveDone(ctx app.Context, sum store.Summary, err error, list []store.Summary) {
	if n := c.ctl.saved(sum, err, list); n != "" {
		c.notice = n
	}
	if err == nil {
		c.tabs.announce(sum, c.ctl.sess)
		c.usage.refreshStale(c.ui, c.ctl.st)
	}
}

// say shows n in the message strip; "" leaves the strip as it is. The
// Shell's parts that do their work apart (the trash, the files out) are
// given it.
func (c *Shell) say(n string) {
	if n != "" {
		c.notice = n
	}
}

// dispatch runs fn on the UI goroutine through the Shell's own context, in
// a later turn (natively, unmounted: at once, with no context).
func (c *Shell) dispatch(fn func(app.Context)) {
	if c.ui.Src() == nil {
		fn(app.Context{})
		return
	}
	c.ui.Dispatch(fn)
}

// OnDismount stops the saver.
func (c *Shell) OnDismount() {
	if c.ctl.saves != nil {
		c.ctl.saves.close()
		c.ctl.saves = nil
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

// pick returns yes when b holds, otherwise no (a map literal of bool to
// string, as the screen once had, costs a map built on every call).
func pick(b bool, yes, no string) string {
	if b {
		return yes
	}
	return no
}

func isAre(n int) string {
	if n == 1 {
		return "is"
	}
	return "are"
}
