// Package ui holds Pairline's go-app components. Components keep only UI
// state and render what fitcore and app/session compute; they never compute
// statistics themselves.
package ui

import (
	"bytes"
	"fmt"
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
	saveState   string // "saved", "saving", "failed", "" before the first save
	saveMessage string
	notice      string // a sentence shown in the message strip
	updateReady bool

	saves   chan saveJob
	editSeq int // counts edits, to run delayed work only for the latest
	page    int // page of the readings grid shown (pageSize rows each)

	needSync bool // text fields must be set from the session at the next render

	// ui is the Shell's own context (from OnMount). Work that finishes after
	// an event must dispatch through it: go-app drops a dispatch whose
	// source element has left the page, as a button in a closed list has.
	ui app.Context

	transferState // files in and out, trash, storage, other tabs (transfer.go)

	analysisUI // settings, checks, advice, use of the line, acceptance (settings.go)

	fieldUI // plots, report, undo, theme and demo (theme.go)
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
	// advicePending: the advice is worked out when typing pauses and there
	// is no earlier advice to show meanwhile.
	advicePending bool

	rows []int // session row of each usable pair (fitcore's index → grid row)
}

type cellKey struct {
	row int
	col session.Column
}

// OnMount opens the device store and reopens the last session.
func (c *Shell) OnMount(ctx app.Context) {
	c.ui = ctx
	c.updateReady = ctx.AppUpdateAvailable()
	c.saves = make(chan saveJob, 1)
	c.mountTransfer(ctx)
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
			c.show(sess)
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

// show makes s the open session and analyses it.
func (c *Shell) show(s *session.Session) {
	c.sess = s
	c.page = 0
	c.opened(s)
	c.analyse()
	c.resyncInputs()
}

// resyncInputs asks the next render to make every text field show the open
// session's values. go-app v10.1.11 does not clear an input's value when the
// new value is empty (it removes the attribute, which leaves the typed value
// in place), so switching to a session with empty cells would otherwise show
// the previous session's text. Go-app keeps an input's element from one
// render to the next, so setting the property before it diffs is enough.
func (c *Shell) resyncInputs() { c.needSync = true }

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
	}
	lo, hi := c.pageRange()
	for i := lo; i < hi; i++ {
		n := strconv.Itoa(i)
		want["x-input-"+n], want["y-input-"+n] = s.Readings[i].X, s.Readings[i].Y
	}
	for id, v := range want {
		el := doc.Call("querySelector", `[data-testid="`+id+`"]`)
		if el.Truthy() && el.Get("value").String() != v {
			el.Set("value", v)
		}
	}
}

// analyse runs fitcore on the usable pairs of the open session.
func (c *Shell) analyse() { c.analyseNow(false) }

// analyseNow runs fitcore; quick leaves out the transform advice (it re-fits
// the readings several times) and keeps the advice shown before, marked as
// being updated.
func (c *Shell) analyseNow(quick bool) {
	prev := c.view.report
	x, y, rows, problems := c.sess.Pairs()
	a := analysis{problems: make(map[cellKey]string, len(problems)), usable: len(rows), rows: rows}
	for _, p := range problems {
		a.problems[cellKey{p.Row, p.Column}] = p.Reason
	}
	for _, r := range rows {
		a.digits = max(a.digits, digitsOf(c.sess.Readings[r].X), digitsOf(c.sess.Readings[r].Y))
	}
	opt := c.sess.Settings.Options()
	c.anQueries(&opt, x)
	c.plotQueries(&opt, x)
	opt.SkipAdvice = quick
	rep, err := fitcore.Analyze(x, y, opt)
	if err != nil {
		a.message = plainFitError(err, len(rows))
	} else {
		a.report = rep
		if quick {
			a.stale = true
			if prev != nil && prev.Advice != nil {
				rep.Advice = prev.Advice
			} else {
				a.advicePending = true
			}
		}
	}
	c.view = a
}

// adviceLater is the number of readings from which the transform advice is
// worked out once typing pauses rather than on every keystroke: measured in
// Chromium, a full analysis with advice takes about 150 ms at 1,000
// readings, the checks alone a few ms.
const adviceLater = 400

// bigSession is the number of readings from which analysing and encoding a
// session takes longer than a keystroke may (measured: tens of ms in the
// browser); such sessions are analysed and saved once typing pauses.
const bigSession = 2000

// idleDelay is the pause in typing after which a big session is analysed
// and saved.
const idleDelay = 250 * time.Millisecond

// edited is called after every change to the open session: the screen is
// re-analysed and the session written to the device at once (for big
// sessions, as soon as typing pauses, so that typing never stalls).
func (c *Shell) edited(ctx app.Context) {
	c.editSeq++
	c.undoTrack()
	seq := c.editSeq
	n := len(c.sess.Readings)
	if n < bigSession {
		c.analyseNow(n >= adviceLater)
		c.save(ctx)
		if n >= adviceLater {
			c.ui.After(idleDelay, func(ctx app.Context) {
				if seq == c.editSeq {
					c.analyse()
				}
			})
		}
		return
	}
	c.view.stale = true
	c.ui.After(idleDelay, func(ctx app.Context) {
		if seq != c.editSeq {
			return
		}
		c.analyse()
		c.save(ctx)
	})
}

// save encodes the open session and hands it to the saver. Only the newest
// state waits: an older pending one is replaced, never written after it.
func (c *Shell) save(ctx app.Context) {
	if c.st == nil || c.sess == nil || c.heldByOtherTab() {
		return
	}
	job, err := encodeJob(c.sess)
	if err != nil {
		c.saveState, c.saveMessage = "failed", "This session could not be saved: "+err.Error()
		return
	}
	select {
	case <-c.saves:
	default:
	}
	c.saves <- job
	c.saveState = "saving"
}

// encodeJob encodes a session as its stored record and summary.
func encodeJob(s *session.Session) (saveJob, error) {
	var buf bytes.Buffer
	if err := session.Encode(&buf, []*session.Session{s}); err != nil {
		return saveJob{}, err
	}
	return saveJob{
		sum:  store.Summary{ID: s.ID, Title: s.Title, Site: s.Site, Modified: s.Modified, Readings: len(s.Readings)},
		body: buf.Bytes(),
	}, nil
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
		for job := range saves {
			err := st.Save(job.sum, job.body)
			list, _ := st.List()
			ctx.Dispatch(func(ctx app.Context) {
				c.sessions = list
				if err != nil {
					c.saveState, c.saveMessage = "failed", err.Error()
					return
				}
				c.announceSaved(ctx, job.sum)
				if len(c.saves) == 0 {
					c.saveState, c.saveMessage = "saved", ""
				}
			})
		}
	})
}

// OnDismount stops the saver.
func (c *Shell) OnDismount() {
	if c.saves != nil {
		close(c.saves)
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
