package ui

import (
	"github.com/maxence-charriere/go-app/v10/pkg/app"
)

// Themes. The class goes on the app's root element; web/themes.css sets the
// colour variables of web/pairline.css for it.
const (
	themeStandard = "standard"
	themeOutdoor  = "outdoor" // black on white, heavier rules: text contrast at least 7:1 in sunlight
	themeDark     = "dark"    // light on dark, for dawn and dusk work
	themeKey      = "pairline.theme"
)

// themeUI is the screen's colours, chosen on the tools strip and kept in
// the browser's localStorage.
type themeUI struct {
	name   string
	loaded bool
}

// class returns the class of the chosen theme, reading the choice from
// localStorage the first time (natively there is none: standard).
func (t *themeUI) class() string {
	if !t.loaded {
		t.loaded = true
		if ls := app.Window().Get("localStorage"); ls.Truthy() {
			if v := ls.Call("getItem", themeKey); v.Truthy() {
				t.name = v.String()
			}
		}
	}
	switch t.name {
	case themeOutdoor, themeDark:
	default:
		t.name = themeStandard
	}
	return "pl-theme-" + t.name
}

// choose takes the theme chosen in the select (its handler).
func (t *themeUI) choose(ctx app.Context, e app.Event) {
	v := ctx.JSSrc().Get("value").String()
	switch v {
	case themeStandard, themeOutdoor, themeDark:
	default:
		return
	}
	t.name = v
	if ls := app.Window().Get("localStorage"); ls.Truthy() {
		ls.Call("setItem", themeKey, v)
	}
}

// renderTools is the strip under the bar: demo, report, undo and redo
// (undo.go), and the theme.
func (c *Shell) renderTools() app.UI {
	th := c.theme.name
	opt := func(v, label string) app.UI {
		return app.Option().Value(v).Selected(th == v).Text(label)
	}
	return app.Div().Class("pl-tools").DataSet("testid", "tools").Body(
		anButton("pl-btn pl-btn-quiet", "Try the demo", "demo-open").
			Attr("title", "Adds four invented sessions of a fictional water board").OnClick(c.loadDemo),
		anButton("pl-btn pl-btn-quiet", "Report", "report-open").
			Disabled(c.ctl.sess == nil).OnClick(func(ctx app.Context, e app.Event) { c.rp.show(ctx, c.ctl, &c.pl) }),
		c.renderUndo(),
		c.net.render(),
		app.Label().Class("pl-theme").Body(
			app.Span().Text("Screen"),
			app.Select().DataSet("testid", "theme-select").Attr("aria-label", "Screen colours").OnChange(c.theme.choose).Body(
				opt(themeStandard, "Standard"),
				opt(themeOutdoor, "Outdoor, high contrast"),
				opt(themeDark, "Dark"),
			),
		),
	)
}
