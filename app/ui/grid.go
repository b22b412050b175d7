package ui

import (
	"strconv"
	"strings"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/numfmt"
	"pairline/app/session"
	"pairline/app/wording"
)

// renderReadings draws the readings table: quantity names and units on top,
// one row of x and y cells per reading, and the count of usable pairs.
func (c *Shell) renderReadings() app.UI {
	s := c.ctl.sess
	nProblems := len(c.ctl.view.problems) - c.en.heldProblems(c.ctl)
	lo, hi := c.pageRange()
	return app.Section().Class("pl-card pl-readings").Attr("aria-label", "Readings").DataSet("testid", "readings-card").Body(
		app.H2().Text("Readings"),
		app.Div().Class("pl-quantities").Body(
			c.quantity("x", "Known value (x)", s.XName, s.XUnit, session.FieldXName, session.FieldXUnit),
			c.quantity("y", "Instrument value (y)", s.YName, s.YUnit, session.FieldYName, session.FieldYUnit),
		),
		app.Table().Class("pl-grid").Body(
			app.THead().Body(app.Tr().Body(
				app.Th().Text("#"),
				app.Th().Text(colHead(s.XName, s.XUnit, "x")),
				app.Th().Text(colHead(s.YName, s.YUnit, "y")),
				app.Th().Class("pl-note-head").Text("Note"),
			)),
			app.TBody().Body(
				app.Range(make([]struct{}, hi-lo)).Slice(func(i int) app.UI { return c.row(lo + i) }),
			),
		),
		app.If(len(s.Readings) > pageSize, func() app.UI { return c.pager(lo, hi) }),
		app.Div().Class("pl-grid-foot").Body(
			anButton("pl-btn pl-btn-wide", "+ Add reading", "add-row").Disabled(c.ctl.locked()).
				OnClick(func(ctx app.Context, e app.Event) {
					i, err := c.ctl.addRow()
					if err != nil {
						return
					}
					if p := i / pageSize; p != c.page {
						c.page = p
						c.resyncInputs()
					}
					c.afterChange(ctx)
					ctx.Defer(func(ctx app.Context) { focus("x-input-" + strconv.Itoa(i)) })
				}),
			app.P().Class("pl-count").DataSet("testid", "usable-count").DataSet("value", strconv.Itoa(c.ctl.view.usable)).
				Text(countText(c.ctl.view.usable, nProblems)),
		),
	)
}

// pageSize is how many readings the grid shows at once; long sessions are
// paged so that the page stays quick (the statistics use every reading).
const pageSize = 100

func (c *Shell) pageRange() (lo, hi int) {
	n := len(c.ctl.sess.Readings)
	last := max(0, (n-1)/pageSize)
	c.page = min(max(c.page, 0), last)
	lo = c.page * pageSize
	return lo, min(n, lo+pageSize)
}

func (c *Shell) pager(lo, hi int) app.UI {
	n := len(c.ctl.sess.Readings)
	return app.Div().Class("pl-pager").Body(
		anButton("pl-btn pl-btn-quiet", "‹ Previous", "page-prev").
			Disabled(lo == 0).OnClick(func(ctx app.Context, e app.Event) { c.page--; c.resyncInputs() }),
		app.Span().DataSet("testid", "page-info").Text("Readings "+numfmt.Count(lo+1)+"–"+numfmt.Count(hi)+" of "+numfmt.Count(n)),
		anButton("pl-btn pl-btn-quiet", "Next ›", "page-next").
			Disabled(hi >= n).OnClick(func(ctx app.Context, e app.Event) { c.page++; c.resyncInputs() }),
	)
}

func colHead(name, unit, fallback string) string {
	if name == "" {
		name = fallback
	}
	if unit != "" {
		return name + " (" + unit + ")"
	}
	return name
}

func countText(usable, problems int) string {
	t := numfmt.Count(usable) + " usable pair"
	if usable != 1 {
		t += "s"
	}
	switch problems {
	case 0:
	case 1:
		t += " · 1 cell needs attention"
	default:
		t += " · " + numfmt.Count(problems) + " cells need attention"
	}
	return t
}

func (c *Shell) quantity(col, label, name, unit, nameField, unitField string) app.UI {
	return app.FieldSet().Class("pl-quantity").Body(
		app.Legend().Text(label),
		app.Label().Body(
			app.Span().Text("Quantity"),
			app.Input().Type("text").Value(name).DataSet("testid", col+"-name").
				Attr("placeholder", "e.g. Reference standard").OnChange(c.onField(nameField)),
		),
		app.Label().Body(
			app.Span().Text("Unit"),
			app.Input().Type("text").Value(unit).DataSet("testid", col+"-unit").
				Attr("placeholder", "e.g. µS/cm").OnChange(c.onField(unitField)),
		),
	)
}

func (c *Shell) row(i int) app.UI {
	r := c.ctl.sess.Readings[i]
	yProblem := c.ctl.view.problems[cellKey{i, session.ColumnY}]
	if c.en.heldY(c.ctl, i) {
		yProblem = ""
	}
	reason := ""
	if r.Excluded {
		reason = r.ExcludeReason
	}
	return &readingRow{
		Session:  c.ctl.sess.ID,
		Row:      i,
		X:        r.X,
		Y:        r.Y,
		XProblem: c.ctl.view.problems[cellKey{i, session.ColumnX}],
		YProblem: yProblem,
		Excluded: r.Excluded,
		Reason:   reason,
		Note:     r.Note,
		Locked:   c.ctl.locked(),
		onAction: func(a RowAction) { c.dispatch(func(ctx app.Context) { c.applyRow(ctx, a) }) },
	}
}

// Kinds of RowAction.
const (
	rwType  = "type"  // Text typed into the cell Col of Row (as each key goes in)
	rwNote  = "note"  // the note of Row set to Text
	rwEnter = "enter" // Enter pressed in the cell Col of Row
	rwFocus = "focus" // the focus came into a cell of Row
	rwLeave = "leave" // the focus left the row for another
)

// RowAction is one thing done in a row of the readings grid.
type RowAction struct {
	Kind    string
	Session string // ID of the session the row belongs to
	Row     int
	Col     session.Column
	Text    string
}

// applyRow makes the change a row asked for (through dispatch, on the
// Shell's own context): the cells through the controller, the row being
// entered (entryUI) for the screen.
func (c *Shell) applyRow(ctx app.Context, a RowAction) {
	if c.ctl.sess == nil || c.ctl.sess.ID != a.Session {
		return // a row of a session no longer open
	}
	switch a.Kind {
	case rwType, rwNote:
		if c.ctl.locked() {
			return
		}
		if a.Kind == rwType {
			c.en.enRow, c.en.enIn = a.Row, true // typing in it: the row is being entered
		}
		if err := c.ctl.setCell(a.Row, a.Col, a.Text); err != nil {
			if a.Kind == rwNote {
				c.notice = "The note was not kept: " + err.Error()
			} else {
				c.notice = err.Error()
			}
			return
		}
		c.afterChange(ctx)
	case rwEnter:
		c.enter(ctx, a.Row, a.Col)
	case rwFocus:
		c.en.enRow, c.en.enIn = a.Row, true
	case rwLeave:
		c.en.enIn = false
	}
}

// entryUI is the row the keyboard is in. An empty y cell of that row is
// not called a problem yet: the technician types x, then y. It is marked
// once the focus leaves the row. An empty x cell is marked at once when
// y is filled (the technician went past it).
type entryUI struct {
	enRow int
	enIn  bool // the focus is in a cell of row enRow
}

// heldY: the y cell of row i is empty and waits for its turn.
func (e *entryUI) heldY(k *controller, i int) bool {
	return e.enIn && e.enRow == i && i < len(k.sess.Readings) && strings.TrimSpace(k.sess.Readings[i].Y) == "" &&
		k.view.problems[cellKey{i, session.ColumnY}] != ""
}

// heldProblems is how many problems heldY keeps back (0 or 1).
func (e *entryUI) heldProblems(k *controller) int {
	if e.heldY(k, e.enRow) {
		return 1
	}
	return 0
}

// readingRow is one row of the readings table as a component of its own:
// go-app redraws a component only when one of its exported fields changed,
// so an edit redraws the row typed in, not the whole page of rows.
type readingRow struct {
	app.Compo

	Session            string
	Row                int
	X, Y               string
	XProblem, YProblem string
	Excluded           bool
	Reason             string // why a left-out reading is left out
	Note               string
	Locked             bool // the record is sealed: nothing can be typed

	// onAction takes what is done in the row. Unexported: go-app compares
	// a component's exported fields to decide whether to redraw it, and a
	// func is never equal, so an exported one would redraw every row on
	// every edit; it keeps the one given when the row was first drawn.
	onAction func(RowAction)
}

func (r *readingRow) act(a RowAction) {
	if r.onAction != nil && !r.Locked {
		a.Session, a.Row = r.Session, r.Row
		r.onAction(a)
	}
}

// Render draws the row.
func (r *readingRow) Render() app.UI {
	n := strconv.Itoa(r.Row)
	cls := "pl-row"
	if r.Excluded {
		cls += " pl-row-excluded"
	}
	return app.Tr().Class(cls).Body(
		app.Td().Class("pl-rownum").Text(strconv.Itoa(r.Row+1)),
		r.cell(session.ColumnX, "x-input-"+n, r.shownText(session.ColumnX, r.X), r.X, r.XProblem),
		r.cell(session.ColumnY, "y-input-"+n, r.shownText(session.ColumnY, r.Y), r.Y, r.YProblem,
			app.If(r.Excluded, func() app.UI {
				return app.Span().Class("pl-row-reason").DataSet("testid", "row-reason-"+n).
					Text("Left out: " + wording.Visible(r.Reason))
			})),
		r.noteCell(),
	)
}

// noteCell is the note of the reading (at most session.MaxNoteText bytes;
// the CSV's note column). Its test id counts rows from 1, as the grid does.
func (r *readingRow) noteCell() app.UI {
	num := strconv.Itoa(r.Row + 1)
	return app.Td().Class("pl-cellwrap pl-note-cell").Body(
		app.Input().Type("text").Class("pl-cell pl-note").Value(r.Note).
			Attr("autocomplete", "off").Attr("maxlength", strconv.Itoa(session.MaxNoteText)).Attr("placeholder", "note").
			Attr("aria-label", "Note of reading "+num).DataSet("testid", "reading-note-"+num).
			Disabled(r.Locked).
			OnChange(func(ctx app.Context, e app.Event) {
				r.act(RowAction{Kind: rwNote, Col: session.ColumnNote, Text: ctx.JSSrc().Get("value").String()})
			}),
	)
}

// cellClass marks a row's x and y inputs, so that the row finds them.
func cellClass(col session.Column) string {
	if col == session.ColumnY {
		return "pl-cell-y"
	}
	return "pl-cell-x"
}

// shownText is the text a redraw gives the row's cell of col: the
// session's text, unless keys typed into the cell are still on their way to
// the app (keepTyped, typing.go). Natively (prerendering) and before the
// row is on the page it is the session's text.
func (r *readingRow) shownText(col session.Column, text string) string {
	if !app.IsClient || !r.Mounted() {
		return text
	}
	tr := r.JSValue()
	if !tr.Truthy() {
		return text
	}
	return keepTyped(tr.Call("querySelector", "input."+cellClass(col)), text)
}

// cell is one x or y input: shown is the text drawn into it (shownText),
// text the session's, which data-value carries.
func (r *readingRow) cell(col session.Column, testid, shown, text, problem string, more ...app.UI) app.UI {
	label := "x"
	if col == session.ColumnY {
		label = "y"
	}
	// The handlers read the row from r when they run: go-app keeps an
	// element's first handler when a new one comes from the same function
	// literal, and updates r's fields in place.
	in := app.Input().Type("text").Class("pl-cell", cellClass(col)).Value(shown).
		Attr("inputmode", "decimal").Attr("autocomplete", "off").Attr("enterkeyhint", "next").
		Attr("aria-label", label+" of reading "+strconv.Itoa(r.Row+1)).
		DataSet("testid", testid).DataSet("row", r.Row).DataSet("value", text).Disabled(r.Locked).
		OnInput(func(ctx app.Context, e app.Event) {
			r.act(RowAction{Kind: rwType, Col: col, Text: takeTyped(ctx.JSSrc())})
		}).
		OnKeyDown(func(ctx app.Context, e app.Event) {
			if e.Get("key").String() != "Enter" {
				return
			}
			e.PreventDefault()
			r.act(RowAction{Kind: rwEnter, Col: col})
		}).
		OnFocus(func(ctx app.Context, e app.Event) {
			if !windowJustReturned() {
				keepCellInView(ctx.JSSrc())
			}
			r.act(RowAction{Kind: rwFocus})
		}).
		OnBlur(func(ctx app.Context, e app.Event) {
			// Moving to the other cell of the same row keeps the row.
			if to := e.Get("relatedTarget"); to.Truthy() && to.Get("dataset").Get("row").String() == strconv.Itoa(r.Row) {
				return
			}
			r.act(RowAction{Kind: rwLeave})
		})
	if problem != "" {
		in = in.Attr("aria-invalid", "true").Attr("title", problem)
	}
	return app.Td().Class("pl-cellwrap").Body(
		in,
		app.If(problem != "", func() app.UI {
			return app.Span().Class("pl-problem").DataSet("testid", testid+"-problem").Text(problem)
		}),
		app.Range(more).Slice(func(i int) app.UI { return more[i] }),
	)
}

// enter moves on after Enter: x → y of the same row, y → x of the next row,
// creating that row when it does not exist yet.
func (c *Shell) enter(ctx app.Context, row int, col session.Column) {
	if col == session.ColumnX {
		focus("y-input-" + strconv.Itoa(row))
		return
	}
	next := row + 1
	if next >= len(c.ctl.sess.Readings) {
		if _, err := c.ctl.addRow(); err != nil {
			return
		}
		c.afterChange(ctx)
	}
	if p := next / pageSize; p != c.page {
		c.page = p
		c.resyncInputs()
	}
	ctx.Defer(func(ctx app.Context) { focus("x-input-" + strconv.Itoa(next)) })
}

// On a phone the on-screen keyboard covers the lower part of the screen
// while a cell is typed in. The cell with the focus is kept in the part of
// the visual viewport (window.visualViewport) that stays visible: below the
// sticky bar and, until the keyboard is up, in the upper part of the
// screen, where the keyboard will not come. When the visual viewport
// changes size (the keyboard opens or closes, the phone turns) the cell is
// placed again.
const (
	// keyboardShare is the part of a phone's screen height an on-screen
	// keyboard leaves visible: in portrait it takes about 40 % (common
	// practice, from memory of phones' keyboards), and a cell is kept
	// above 55 % of the screen until the keyboard is up.
	keyboardShare = 0.55
	// keyboardUp: a visual viewport below this share of the tallest seen
	// means something (the keyboard) covers the rest.
	keyboardUp = 0.8
	// cellGap is the room kept around the cell, in CSS pixels.
	cellGap = 8
)

// fieldView is what the visual viewport watch knows: whether it listens,
// and the tallest visual viewport seen (the screen without a keyboard).
var fieldView struct {
	watching bool
	tallest  float64
	// returned is when (performance.now, ms) the window last got the
	// focus back: the browser then gives the focus again to the cell that
	// had it, and that is no reason to move the page (it would move under
	// a finger or pointer that is pressing something else).
	returned  float64
	following bool // the window's focus is followed (followWindowFocus)
}

// windowReturnMs: a cell's focus within this many milliseconds of the
// window's is the window's focus coming back, not the technician's.
const windowReturnMs = 100

// followWindowFocus starts, once, to note when the window gets the focus
// back (fieldView.returned). The Shell calls it when it mounts.
func followWindowFocus() {
	w := app.Window()
	if fieldView.following || !w.Get("addEventListener").Truthy() {
		return
	}
	fieldView.following = true
	w.Call("addEventListener", "focus", app.FuncOf(func(this app.Value, args []app.Value) any {
		fieldView.returned = w.Get("performance").Call("now").Float()
		return nil
	}))
}

// windowJustReturned says whether the window got the focus back a moment
// ago (windowReturnMs).
func windowJustReturned() bool {
	if fieldView.returned == 0 {
		return false
	}
	return app.Window().Get("performance").Call("now").Float()-fieldView.returned < windowReturnMs
}

// narrowOrTouch says whether the screen is a phone's or a tablet's in
// portrait, or is worked by touch: where an on-screen keyboard comes up.
func narrowOrTouch() bool {
	mq := app.Window().Call("matchMedia", "(max-width: 820px), (pointer: coarse)")
	return mq.Truthy() && mq.Get("matches").Bool()
}

// stickyTop is the height of the bars that stay at the top of the screen
// while the page scrolls (the jump bar on a phone, the app bar on a wide
// screen), in CSS pixels.
func stickyTop() float64 {
	w := app.Window()
	doc := w.Get("document")
	h := 0.0
	for _, s := range []string{".pl-jumps", ".pl-bar"} {
		el := doc.Call("querySelector", s)
		if !el.Truthy() {
			continue
		}
		if pos := w.Call("getComputedStyle", el).Get("position").String(); pos != "sticky" && pos != "fixed" {
			continue
		}
		h = max(h, el.Get("offsetHeight").Float())
	}
	return h
}

// visibleBand returns the part of the visual viewport, in the layout
// viewport's coordinates (those of getBoundingClientRect), that a focused
// cell should sit in: below the sticky bars and above the keyboard, or
// above where the keyboard will be when it is not up yet.
func visibleBand() (top, bottom float64, ok bool) {
	vv := app.Window().Get("visualViewport")
	if !vv.Truthy() {
		return 0, 0, false
	}
	off, h := vv.Get("offsetTop").Float(), vv.Get("height").Float()
	fieldView.tallest = max(fieldView.tallest, h)
	visible := h
	if h > keyboardUp*fieldView.tallest {
		visible = keyboardShare * h
	}
	return off + max(stickyTop()-off, 0) + cellGap, off + visible - cellGap, true
}

// keepCellInView scrolls the page so that the grid cell el, which has the
// focus, sits in visibleBand, one row below its top so that the row before
// shows too. Nothing happens on a wide screen worked by mouse, or when the
// cell already sits there.
func keepCellInView(el app.Value) {
	if !el.Truthy() || !narrowOrTouch() {
		return
	}
	watchFieldView()
	top, bottom, ok := visibleBand()
	if !ok {
		return
	}
	r := el.Call("getBoundingClientRect")
	cellTop, cellBottom := r.Get("top").Float(), r.Get("bottom").Float()
	if cellTop >= top && cellBottom <= bottom {
		return
	}
	to := top
	if h := cellBottom - cellTop; top+2*h <= bottom {
		to += h
	}
	app.Window().Call("scrollBy", 0, cellTop-to)
}

// watchFieldView starts, once, to follow the visual viewport: the focused
// grid cell is placed again when it changes size, and the page's style gets
// --pl-kb (the height the keyboard covers at the bottom of the layout
// viewport) and --pl-vvh (the visual viewport's height) for the reading
// panel (web/plots.css).
func watchFieldView() {
	w := app.Window()
	vv := w.Get("visualViewport")
	if fieldView.watching || !vv.Truthy() {
		return
	}
	fieldView.watching = true
	setFieldVars()
	vv.Call("addEventListener", "resize", app.FuncOf(func(this app.Value, args []app.Value) any {
		setFieldVars()
		if el := w.Get("document").Get("activeElement"); el.Truthy() && el.Call("matches", ".pl-grid .pl-cell").Bool() {
			keepCellInView(el)
		}
		return nil
	}))
}

func setFieldVars() {
	w := app.Window()
	vv := w.Get("visualViewport")
	if !vv.Truthy() {
		return
	}
	h := vv.Get("height").Float()
	kb := max(0, w.Get("innerHeight").Float()-h-vv.Get("offsetTop").Float())
	st := w.Get("document").Get("documentElement").Get("style")
	st.Call("setProperty", "--pl-kb", strconv.FormatFloat(kb, 'f', 0, 64)+"px")
	st.Call("setProperty", "--pl-vvh", strconv.FormatFloat(h, 'f', 0, 64)+"px")
}
