package ui

import (
	"encoding/json"
	"slices"
	"strconv"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/session"
)

// fieldUI is the state of the parts made for work in the field: the plots,
// the report, undo, the theme and the demo. It is embedded in Shell.
type fieldUI struct {
	plotsUI
	reportUI
	undoUI
	themeUI
	demoUI
}

// Themes. The class goes on the app's root element; web/themes.css sets the
// colour variables of web/pairline.css for it.
const (
	themeStandard = "standard"
	themeOutdoor  = "outdoor" // black on white, heavier rules: text contrast at least 7:1 in sunlight
	themeDark     = "dark"    // light on dark, for dawn and dusk work
	themeKey      = "pairline.theme"
)

type themeUI struct {
	thName   string
	thLoaded bool
}

// themeClass returns the class of the chosen theme, reading the choice
// from localStorage the first time (natively there is none: standard).
func (c *Shell) themeClass() string {
	if !c.thLoaded {
		c.thLoaded = true
		if ls := app.Window().Get("localStorage"); ls.Truthy() {
			if v := ls.Call("getItem", themeKey); v.Truthy() {
				c.thName = v.String()
			}
		}
	}
	switch c.thName {
	case themeOutdoor, themeDark:
	default:
		c.thName = themeStandard
	}
	return "pl-theme-" + c.thName
}

func (c *Shell) onTheme(ctx app.Context, e app.Event) {
	v := ctx.JSSrc().Get("value").String()
	switch v {
	case themeStandard, themeOutdoor, themeDark:
	default:
		return
	}
	c.thName = v
	if ls := app.Window().Get("localStorage"); ls.Truthy() {
		ls.Call("setItem", themeKey, v)
	}
}

// undoDepth is how many earlier states undo keeps for the open session;
// each is a copy of the readings, so a very big session keeps fewer
// (undoReadings readings in all, and never fewer than 5 states).
const (
	undoDepth    = 20
	undoReadings = 1_000_000
)

// undoDepthFor is the number of states kept for a session of n readings.
func undoDepthFor(n int) int {
	return max(5, min(undoDepth, undoReadings/max(n, 1)))
}

// undoUI keeps the states of the open session before its last edits (deep
// copies without the history). One entry per history entry: typing a cell
// key by key is one edit in the history, and one step of undo.
type undoUI struct {
	unSess  *session.Session   // the session the stack belongs to
	unBase  *session.Session   // copy of its state after the last edit
	unHist  int                // len(History) at unBase
	unStack []*session.Session // earlier states, newest last
	unMsg   string
}

// snapshot copies what an edit can change in s, without the history.
func snapshot(s *session.Session) *session.Session {
	c := *s
	c.History = nil
	c.Readings = slices.Clone(s.Readings)
	if s.Location != nil {
		l := *s.Location
		c.Location = &l
	}
	if s.DecimalComma != nil {
		d := *s.DecimalComma
		c.DecimalComma = &d
	}
	// Settings hold pointers; a JSON round trip copies them deeply.
	if b, err := json.Marshal(s.Settings); err == nil {
		var st session.Settings
		if json.Unmarshal(b, &st) == nil {
			c.Settings = st
		}
	}
	return &c
}

// undoSync starts a fresh stack when another session (or another copy of
// it, from a file or another tab) is open.
func (c *Shell) undoSync() {
	if c.sess != nil && c.unSess != c.sess {
		c.unSess, c.unBase, c.unHist, c.unStack, c.unMsg = c.sess, snapshot(c.sess), len(c.sess.History), nil, ""
	}
}

// undoTrack is called by edited after every change: a change that added to
// the history pushes the state before it.
func (c *Shell) undoTrack() {
	if c.sess == nil {
		return
	}
	if c.unSess != c.sess {
		c.undoSync()
		return
	}
	if len(c.sess.History) > c.unHist && c.unBase != nil {
		c.unStack = append(c.unStack, c.unBase)
		if d := undoDepthFor(len(c.sess.Readings)); len(c.unStack) > d {
			c.unStack = slices.Delete(c.unStack, 0, len(c.unStack)-d)
		}
	}
	c.unBase, c.unHist = snapshot(c.sess), len(c.sess.History)
	c.unMsg = ""
}

// undo restores the state before the last edit. The history keeps every
// entry and records the undo as one more.
func (c *Shell) undo(ctx app.Context, e app.Event) {
	if c.sess == nil || len(c.unStack) == 0 {
		return
	}
	now := time.Now().UTC()
	prev := c.unStack[len(c.unStack)-1]
	c.unStack = c.unStack[:len(c.unStack)-1]
	what := "the last change"
	if h := c.sess.History; len(h) > 0 {
		last := h[len(h)-1]
		what = last.Field
		if last.Row >= 0 {
			what += " of reading " + strconv.Itoa(last.Row+1)
		}
	}
	restored := snapshot(prev)
	restored.History = append(slices.Clone(c.sess.History), session.Edit{At: now, Field: "undo", Row: -1, Old: "", New: "undid " + what})
	restored.Modified = now
	stack := c.unStack
	c.show(restored)
	c.resyncInputs()
	c.unSess, c.unBase, c.unHist, c.unStack = restored, snapshot(restored), len(restored.History), stack
	c.unMsg = "Undone: " + what + "."
	c.plSel = 0
	c.save(ctx)
}

// renderTools is the strip under the bar: demo, report, undo and theme.
func (c *Shell) renderTools() app.UI {
	c.undoSync()
	th := c.thName
	opt := func(v, label string) app.UI {
		return app.Option().Value(v).Selected(th == v).Text(label)
	}
	return app.Div().Class("pl-tools").Body(
		app.Button().Class("pl-btn pl-btn-quiet").Text("Try the demo").DataSet("testid", "demo-open").
			Attr("title", "Adds four invented sessions of a fictional water board").OnClick(c.loadDemo),
		app.Button().Class("pl-btn pl-btn-quiet").Text("Report").DataSet("testid", "report-open").
			Disabled(c.sess == nil).OnClick(c.openReport),
		app.Button().Class("pl-btn pl-btn-quiet").Text("↶ Undo").DataSet("testid", "undo").
			DataSet("depth", strconv.Itoa(len(c.unStack))).
			Attr("aria-label", "Undo the last change ("+strconv.Itoa(len(c.unStack))+" can be undone)").
			Disabled(len(c.unStack) == 0).OnClick(c.undo),
		app.If(c.unMsg != "", func() app.UI {
			return app.Span().Class("pl-tools-msg").Attr("role", "status").DataSet("testid", "undo-message").Text(c.unMsg)
		}),
		app.Label().Class("pl-theme").Body(
			app.Span().Text("Screen"),
			app.Select().DataSet("testid", "theme-select").Attr("aria-label", "Screen colours").OnChange(c.onTheme).Body(
				opt(themeStandard, "Standard"),
				opt(themeOutdoor, "Outdoor, high contrast"),
				opt(themeDark, "Dark"),
			),
		),
	)
}
