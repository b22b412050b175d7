package ui

// The plots card as a go-app component, as the other cards are: its data
// come in as exported fields (the four plots as drawn, with where each drew
// its points, the level of the bands, whether the drawing is older than the
// report, the reading selected and what its panel shows), never a pointer
// into the Shell or the session, and what the technician does goes out as a
// PlotAction through OnAction; the Shell applies it (applyPlot, plots.go).
// The card computes nothing: the drawing is plDraw's, from fitcore's
// report, and the panel's figures are fitcore's, formatted by the Shell
// (plotsUI.point).
//
// A handler reads what it acts on from its component when it runs (the
// reading shown is Panel.Row), never from a variable of the render that
// made it: go-app v10.1.11 keeps an element's first handler when a new one
// comes from the same function literal, and updates the component's fields
// in place.

import (
	"math"
	"strconv"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/numfmt"
	"pairline/app/plot"
)

// Kinds of PlotAction.
const (
	paTap     = "tap"     // show reading Row in the panel, placed at At (a tap on a plot, or "Go through the readings")
	paStep    = "step"    // show reading Row in the panel where it is (previous, next)
	paClose   = "close"   // close the panel
	paReason  = "reason"  // the reason typed for leaving the reading out is Text
	paExclude = "exclude" // leave reading Row out of the line, for the reason typed
	paInclude = "include" // put reading Row back into the line
)

// PlotAction is one thing asked for on the plots card.
type PlotAction struct {
	Kind string
	Row  int        // the session row acted on
	Text string     // what was typed
	At   panelPlace // where the panel opens (paTap)
}

// pointFact is one figure of the reading panel: fitcore's value, as shown,
// with a line of plain meaning ("" none).
type pointFact struct {
	TestID, Label string
	Value         float64
	Shown         string
	Meaning       string
}

// pointPanel is what the reading panel shows of one reading.
type pointPanel struct {
	Row, Rows    int    // the session row shown and how many rows the session has
	XHead, YHead string // the column headings
	X, Y, Note   string // the reading as typed
	Excluded     bool
	Status       string      // "Used in the line.", "Left out of the line: …", "Not used: …"
	Facts        []pointFact // the plain figures, shown at once
	More         []pointFact // the technical ones, behind "Show the numbers"
	Flagged      bool
	Slip         string   // the slipped decimal point sentence, "" none
	Reasons      []string // fitcore's reasons for the flag
	Reason       string   // the reason typed so far for leaving it out
	Msg          string   // why the last action was refused, "" none
	At           panelPlace
}

// plotsCard draws four plots, a legend, and the panel of the tapped reading.
type plotsCard struct {
	app.Compo

	Empty bool    // no line yet: the card says when the plots come
	Plots plSet   // the drawing
	Level float64 // the confidence level of the bands
	Stale bool    // the plots shown are older than the report
	First int     // the reading "Go through the readings" opens on
	Rows  int     // how many rows the session has (a tap finds only these)

	Sel   int        // the selected reading's row, −1 none
	Panel pointPanel // what its panel shows (when Sel ≥ 0)

	OnAction func(PlotAction)
}

func (r *plotsCard) act(a PlotAction) {
	if r.OnAction != nil {
		r.OnAction(a)
	}
}

// Render draws the card.
func (r *plotsCard) Render() app.UI {
	if r.Empty {
		return app.Section().Class("pl-card pl-plots").Attr("aria-label", "Plots").Body(
			app.H2().Text("Plots"),
			anPText("pl-plot-empty", "The plots appear once there are at least 3 usable pairs of readings."),
		)
	}
	ps := r.Plots
	return app.Section().Class("pl-card pl-plots").Attr("aria-label", "Plots").Body(
		app.H2().Text("Plots"),
		app.Div().Class("pl-plot-hintrow").Body(
			anPText("pl-plot-hint", "Tap a point to see that reading and to leave it out of the line or put it back."),
			// The same panel without a tap (keyboard, screen reader): it
			// opens on the first flagged reading, or the first reading.
			anButton("pl-btn pl-btn-quiet", "Go through the readings", "plot-point-open").
				Hidden(r.Sel >= 0).OnClick(func(ctx app.Context, e app.Event) {
				r.act(PlotAction{Kind: paTap, Row: r.First, At: placePanel(app.Null(), 0)})
			}),
		),
		// The notes and the grid keep their places whether shown or not, so
		// that go-app never re-mounts the plots because a sibling came or went.
		app.P().Class("pl-stale").DataSet("testid", "plot-stale").Hidden(!r.Stale).
			Text(staleText(r.Stale)),
		app.P().Class("pl-plot-thinned").DataSet("testid", "plot-thinned").DataSet("value", strconv.Itoa(ps.Drawn)).
			Hidden(ps.Drawn >= ps.Total).Text(thinText(ps)),
		app.Div().Class("pl-plots-grid").OnClick(r.onTap).Body(
			plFigure("Readings and the fitted line", ps.Fit, ps.plRing("plot-fit", r.Sel), plLegend(r.Level)),
			plFigure("Residuals against fitted values", ps.Residuals, ps.plRing("plot-residuals", r.Sel), nil),
			plFigure("Residuals in the order entered", ps.Order, ps.plRing("plot-order", r.Sel), nil),
			plFigure("Normal Q–Q plot of the residuals", ps.QQ, ps.plRing("plot-qq", r.Sel), nil),
			// Last in the markup and floating over the page (position
			// fixed, web/plots.css), so that showing it moves no plot.
			app.If(r.Sel >= 0, r.renderPanel),
		),
	)
}

// onTap finds the reading under a tap: a flagged or left-out marker names
// its reading (data-row); otherwise it is the point of that plot nearest
// to the tap within plotTapPx (the plain dots are one path).
func (r *plotsCard) onTap(ctx app.Context, e app.Event) {
	t := e.Get("target")
	if !t.Truthy() || !t.Get("closest").Truthy() {
		return
	}
	if row, ok := r.tapRow(t, e); ok {
		r.act(PlotAction{Kind: paTap, Row: row, At: placePanel(t.Call("closest", ".pl-plot-canvas"), e.Get("clientY").Float())})
	}
}

// tapRow is the session row of the point under the tap on target t, if any.
func (r *plotsCard) tapRow(t app.Value, e app.Event) (int, bool) {
	if el := t.Call("closest", ".pl-plot-points [data-row]"); el.Truthy() {
		if row, err := strconv.Atoi(el.Call("getAttribute", "data-row").String()); err == nil && row >= 0 && row < r.Rows {
			return row, true
		}
	}
	svg := t.Call("closest", ".pl-plot-canvas")
	if svg.Truthy() {
		svg = svg.Call("querySelector", "svg.pl-plot-svg")
	}
	if !svg.Truthy() {
		return 0, false
	}
	ctm := svg.Call("getScreenCTM")
	if !ctm.Truthy() {
		return 0, false
	}
	unit := math.Hypot(ctm.Get("a").Float(), ctm.Get("b").Float()) // CSS px per viewBox unit
	if !(unit > 0) {
		return 0, false
	}
	p := app.Window().Get("DOMPoint").New(e.Get("clientX").Float(), e.Get("clientY").Float()).
		Call("matrixTransform", ctm.Call("inverse"))
	m, ok := plot.Nearest(r.Plots.Marks[svg.Call("getAttribute", "data-testid").String()],
		p.Get("x").Float(), p.Get("y").Float(), plotTapPx/unit)
	if !ok || m.Row < 0 || m.Row >= r.Rows {
		return 0, false
	}
	return m.Row, true
}

// button is one of the panel's buttons: data-act says what it does and
// data-step which reading, from the one shown when it is pressed (−1 the
// previous, 1 the next); a press goes no further (the grid's tap handler).
func (r *plotsCard) button(b app.HTMLButton, kind string, step int) app.HTMLButton {
	return b.DataSet("act", kind).DataSet("step", step).OnClick(func(ctx app.Context, e app.Event) {
		e.StopImmediatePropagation()
		ds := ctx.JSSrc().Get("dataset")
		n, _ := strconv.Atoi(ds.Get("step").String())
		r.act(PlotAction{Kind: ds.Get("act").String(), Row: r.Panel.Row + n})
	})
}

// renderPanel shows the selected reading: its cells and note, what the
// line says of it, and the buttons to leave it out or put it back.
func (r *plotsCard) renderPanel() app.UI {
	p := r.Panel
	facts := func(fs []pointFact) []app.UI {
		out := make([]app.UI, len(fs))
		for i, f := range fs {
			out[i] = app.Div().Class("pl-fact").Body(
				app.Dt().Text(f.Label),
				app.Dd().Class("pl-num-sm").DataSet("testid", f.TestID).DataSet("value", numfmt.Full(f.Value)).Text(f.Shown),
				app.If(f.Meaning != "", func() app.UI { return app.Dd().Class("pl-fact-meaning").Text(f.Meaning) }),
			)
		}
		return out
	}
	plain, more := facts(p.Facts), facts(p.More)
	place, top := "bottom", "auto"
	if p.At.top {
		place, top = "top", strconv.FormatFloat(p.At.y, 'f', 0, 64)+"px"
	}
	return app.Aside().Class("pl-point-panel pl-at-"+place).DataSet("testid", "plot-point-panel").DataSet("row", strconv.Itoa(p.Row)).
		DataSet("place", place).
		Style("--pl-panel-h", strconv.FormatFloat(p.At.h, 'f', 0, 64)+"px").Style("--pl-panel-top", top).
		Attr("aria-label", "Reading "+strconv.Itoa(p.Row+1)).Attr("aria-live", "polite").Body(
		app.Div().Class("pl-point-head").Body(
			app.H3().Text("Reading "+strconv.Itoa(p.Row+1)),
			r.button(app.Button().Class("pl-btn pl-btn-quiet").Text("‹").Attr("aria-label", "Previous reading").DataSet("testid", "plot-point-prev").
				Disabled(p.Row == 0), paStep, -1),
			r.button(app.Button().Class("pl-btn pl-btn-quiet").Text("›").Attr("aria-label", "Next reading").DataSet("testid", "plot-point-next").
				Disabled(p.Row >= p.Rows-1), paStep, +1),
			r.button(anButton("pl-btn pl-btn-quiet", "Close", "plot-point-close"), paClose, 0),
		),
		app.Dl().Class("pl-point-facts").Body(
			app.Div().Class("pl-fact").Body(app.Dt().Text(p.XHead), app.Dd().Class("pl-num-sm").DataSet("testid", "plot-point-x").Text(p.X)),
			app.Div().Class("pl-fact").Body(app.Dt().Text(p.YHead), app.Dd().Class("pl-num-sm").DataSet("testid", "plot-point-y").Text(p.Y)),
			app.Range(plain).Slice(func(i int) app.UI { return plain[i] }),
		),
		app.If(p.Note != "", func() app.UI { return anPText("pl-point-note", "Note: "+p.Note) }),
		app.P().Class("pl-point-status").DataSet("testid", "plot-point-status").Text(p.Status),
		app.If(p.Flagged, func() app.UI {
			return app.P().Class("pl-point-flag").DataSet("testid", "plot-point-flagged").
				Text("◆ Flagged: this reading stands out from the line. " + p.Slip)
		}),
		app.If(len(more) > 0, func() app.UI {
			return app.Details().Class("pl-point-more").DataSet("testid", "plot-point-more").Body(
				app.Summary().Text("Show the numbers"),
				app.Dl().Class("pl-point-facts").Body(app.Range(more).Slice(func(i int) app.UI { return more[i] })),
				app.If(len(p.Reasons) > 0, func() app.UI {
					return app.Ul().Class("pl-point-reasons").DataSet("testid", "plot-point-flags").Body(
						app.Range(p.Reasons).Slice(func(i int) app.UI { return app.Li().Text(p.Reasons[i]) }),
					)
				}),
			)
		}),
		app.If(p.Excluded, func() app.UI {
			return r.button(anButton("pl-btn", "Put back into the line", "plot-point-include"), paInclude, 0)
		}).Else(func() app.UI {
			return app.Div().Class("pl-point-exclude").Body(
				app.Label().Body(
					app.Span().Text("Reason for leaving it out"),
					app.Input().Type("text").Value(typedValue("plot-point-reason", p.Reason)).DataSet("testid", "plot-point-reason").
						Attr("placeholder", "e.g. decimal point slipped when typing").
						Attr("enterkeyhint", "done").
						OnInput(func(ctx app.Context, e app.Event) {
							r.act(PlotAction{Kind: paReason, Row: r.Panel.Row, Text: takeTyped(ctx.JSSrc())})
						}).
						OnKeyDown(func(ctx app.Context, e app.Event) {
							// Enter confirms, as the button does (a phone's keyboard covers the button).
							if e.Get("key").String() == "Enter" {
								e.PreventDefault()
								r.act(PlotAction{Kind: paReason, Row: r.Panel.Row, Text: ctx.JSSrc().Get("value").String()})
								r.act(PlotAction{Kind: paExclude, Row: r.Panel.Row})
							}
						}),
				),
				r.button(anButton("pl-btn", "Leave out of the line", "plot-point-exclude"), paExclude, 0),
			)
		}),
		app.If(p.Msg != "", func() app.UI {
			return app.P().Class("pl-point-msg").Attr("role", "alert").DataSet("testid", "plot-point-message").Text(p.Msg)
		}),
	)
}
