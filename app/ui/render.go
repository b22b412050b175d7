package ui

import (
	"strconv"
	"strings"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/numfmt"
	"pairline/app/session"
)

func digitsOf(text string) int { return numfmt.DigitsOf(text) }

// Render draws the whole screen.
func (c *Shell) Render() app.UI {
	c.syncInputs()
	return app.Div().Class("pl-app", c.theme.class()).Body(
		// The bar and the tools strip are one banner landmark; everything
		// else sits in a landmark too (the messages region, main, the
		// report dialog), so that a screen reader can move between them.
		app.Header().Class("pl-head").Body(c.renderBar(), c.renderTools()),
		app.Section().Class("pl-notes").Attr("aria-label", "Messages").Body(c.renderNotes()...),
		app.If(c.ctl.sess == nil, func() app.UI {
			return app.Main().Class("pl-main").Body(anPText("pl-wait", "Opening your sessions…"))
		}).Else(func() app.UI {
			// A sealed record takes no input until the technician starts
			// its next revision: the fieldset disables every control in
			// it (it is laid out as if absent: web/record.css).
			return app.Main().Class("pl-main").Body(
				c.renderJumps(),
				app.FieldSet().Class("pl-lockset").Disabled(c.ctl.locked()).Body(
					c.renderRecord(),
					c.renderReadings(),
					c.renderLine(),
					c.renderPlots(),
					c.renderChecks(), c.renderAdvice(),
					c.renderAcceptance(), c.renderUseLine(),
					c.renderUnknowns(),
				),
				c.renderSign(),
				app.FieldSet().Class("pl-lockset").Disabled(c.ctl.locked()).Body(c.renderSettings()),
				c.renderTransfer(),
			)
		}),
		app.If(c.rp.rpOpen && c.ctl.sess != nil, c.renderReport),
	)
}

// renderNotes draws the strips that come and go above the cards (a new
// version, a notice, files in and out) and the list of stored sessions.
func (c *Shell) renderNotes() []app.UI {
	return []app.UI{
		app.Div().Class("pl-slot").Body(app.If(c.updateReady, func() app.UI {
			return app.Div().Class("pl-strip pl-strip-update").DataSet("testid", "update-ready").Body(
				app.Span().Text("A new version of Pairline is ready. Your readings are saved; reload when it suits you."),
				app.Button().Class("pl-btn").Text("Reload now").OnClick(func(ctx app.Context, e app.Event) { ctx.Reload() }),
			)
		})),
		// Parts that come and go sit in fixed slots (.pl-slot, display:
		// contents): go-app compares children by position, so a strip that
		// appears before <main> would otherwise make it rebuild all of <main>.
		app.Div().Class("pl-slot").Body(app.If(c.notice != "", func() app.UI {
			return app.Div().Class("pl-strip").Attr("role", "status").Text(c.notice)
		})),
		c.renderTransferStrips(),
		app.Div().Class("pl-slot").Body(app.If(c.listOpen, c.renderSessions)),
		app.Div().Class("pl-slot").Body(app.If(c.inst.instOpen, c.renderInstruments)),
	}
}

func (c *Shell) renderBar() app.UI {
	title := ""
	if c.ctl.sess != nil {
		title = c.ctl.sess.Title
	}
	return app.Div().Class("pl-bar").DataSet("testid", "app-bar").Body(
		// The mark is decoration beside the name: aria-hidden, and an alt
		// that is not empty (go-app leaves an empty alt out of the markup,
		// which makes an image without a text alternative).
		app.Img().Class("pl-mark").Src("/web/icons/icon.svg").Alt("Pairline mark").Attr("aria-hidden", "true"),
		app.H1().Class("pl-name").Text("Pairline"),
		app.Input().Class("pl-title").Type("text").Value(title).
			Attr("aria-label", "Session title").DataSet("testid", "session-title").Disabled(c.ctl.locked()).
			OnChange(c.onField(session.FieldTitle)),
		app.Span().Class("pl-save").DataSet("testid", "save-status").DataSet("state", c.ctl.saveState.String()).
			Attr("role", "status").Text(c.ctl.saveText()),
		anButton("pl-btn pl-btn-quiet", "Try again", "save-retry").
			Hidden(!c.ctl.retryable()).OnClick(func(ctx app.Context, e app.Event) { c.ctl.retrySave() }),
		app.Div().Class("pl-bar-acts").Body(c.renderBarActions()...),
	)
}

// renderBarActions are the bar's buttons, in a group of their own so that
// a phone can give them one row that scrolls sideways.
func (c *Shell) renderBarActions() []app.UI {
	return []app.UI{
		app.Button().Class("pl-btn pl-btn-quiet").Text(listLabel(c.listOpen, len(c.ctl.sessions))).
			DataSet("testid", "sessions-open").Attr("aria-expanded", strconv.FormatBool(c.listOpen)).
			OnClick(func(ctx app.Context, e app.Event) {
				c.listOpen = !c.listOpen
				c.confirmDel = ""
				if c.listOpen {
					c.inst.instOpen = false
					c.inst.refresh(c.ui, c.ctl) // the due marks
				}
			}),
		anButton("pl-btn pl-btn-quiet", "Instruments", "instruments-open").
			Attr("aria-expanded", strconv.FormatBool(c.inst.instOpen)).OnClick(c.toggleInstruments),
		anButton("pl-btn", "New session", "session-new").OnClick(c.onNew),
	}
}

func listLabel(open bool, n int) string {
	if open {
		return "Close list"
	}
	return "Sessions (" + strconv.Itoa(n) + ")"
}

func (c *Shell) onField(field string) app.EventHandler {
	return func(ctx app.Context, e app.Event) {
		if c.ctl.sess == nil || c.refuseLocked() {
			return
		}
		if err := c.ctl.setField(field, ctx.JSSrc().Get("value").String()); err != nil {
			c.notice = err.Error()
			return
		}
		c.afterChange(ctx)
	}
}

func (c *Shell) onNew(ctx app.Context, e app.Event) {
	s, err := newSession(time.Now())
	if err != nil {
		c.notice = err.Error()
		return
	}
	c.show(s)
	c.listOpen = false
	c.ctl.save()
	st := c.ctl.st
	ctx.Async(func() {
		if st != nil {
			st.SetLast(s.ID)
		}
	})
	ctx.Defer(func(ctx app.Context) { focus("x-input-0") })
}

// focus moves the keyboard focus to the element with that data-testid.
func focus(testid string) {
	el := app.Window().Get("document").Call("querySelector", `[data-testid="`+testid+`"]`)
	if el.Truthy() {
		el.Call("focus")
	}
}

// jumps are the cards the jump bar leads to, by the aria-label of each card.
var jumps = []struct{ label, card string }{
	{"Record", "Record"},
	{"Readings", "Readings"},
	{"Line", "Line"},
	{"Plots", "Plots"},
	{"Checks", "Checks"},
	{"Advice", "Advice"},
	{"Criteria", "Acceptance"},
	{"Use", "Use the line"},
	{"Samples", "Unknown samples"},
	{"Sign-off", "Sign-off"},
	{"Settings", "Fit settings"},
	{"Files", "Files"},
}

// renderJumps draws a row of large buttons that scroll to each card: the
// page is long on a phone, and a gloved hand should not have to scroll
// through the readings to reach the verdict.
func (c *Shell) renderJumps() app.UI {
	return app.Nav().Class("pl-jumps").Attr("aria-label", "Go to").DataSet("testid", "jumps").Body(
		app.Range(jumps).Slice(func(i int) app.UI {
			j := jumps[i]
			return anButton("pl-jump", j.label, "jump-"+strings.ToLower(j.label)).
				OnClick(func(ctx app.Context, e app.Event) { scrollToCard(j.card) }, app.EventScope(j.card))
		}),
	)
}

func scrollToCard(label string) {
	el := app.Window().Get("document").Call("querySelector", `section[aria-label="`+label+`"]`)
	if el.Truthy() {
		el.Call("scrollIntoView", map[string]any{"behavior": "smooth", "block": "start"})
	}
}
