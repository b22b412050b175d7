package ui

// The report laid over the screen as a go-app component, as the cards and
// the sessions list are: its data come in as exported fields (the report's
// markup, which the Shell builds from the open session and fitcore's
// report with rpBody, and the line of status under its buttons), never a
// pointer into the Shell, and what the technician asks for goes out as a
// ReportAction through OnAction; the Shell applies it (reportUI.apply,
// report.go). The dialog computes nothing: every figure in Body is
// fitcore's or the session's.
//
// A handler reads its kind from the button's data-act when it runs: go-app
// v10.1.11 keeps an element's first handler when a new one comes from the
// same function literal.

import (
	"github.com/maxence-charriere/go-app/v10/pkg/app"
)

// Kinds of ReportAction.
const (
	rdPrint    = "print"     // print the report (or save it as PDF through the print dialog)
	rdSaveHTML = "save-html" // download the report as one self-contained HTML file
	rdClose    = "close"     // close the report
	rdShowAll  = "show-all"  // list every reading on the screen (a long session's report lists the first rpRowsAtOnce)
)

// ReportAction is one thing asked for on the report.
type ReportAction struct {
	Kind string
}

// reportDialog is the printable report over the screen, with print, save
// and close.
type reportDialog struct {
	app.Compo

	Body string // the report's markup (rpBody)
	Msg  string // what the last action did ("Saved … to your downloads."), "" none

	OnAction func(ReportAction)
}

func (r *reportDialog) act(a ReportAction) {
	if r.OnAction != nil {
		r.OnAction(a)
	}
}

// button is one of the dialog's buttons; data-act says what it does, read
// when it is pressed.
func (r *reportDialog) button(b app.HTMLButton, act string) app.HTMLButton {
	return b.DataSet("act", act).OnClick(func(ctx app.Context, e app.Event) {
		r.act(ReportAction{Kind: ctx.JSSrc().Get("dataset").Get("act").String()})
	})
}

// onClick takes the clicks inside the report's markup, which has no
// handlers of its own: its "show all" button lists every reading. Any other
// click draws nothing again.
func (r *reportDialog) onClick(ctx app.Context, e app.Event) {
	t := e.Get("target")
	if !t.Truthy() || !t.Get("closest").Truthy() || !t.Call("closest", `[data-testid="report-readings-all"]`).Truthy() {
		ctx.PreventUpdate()
		return
	}
	r.act(ReportAction{Kind: rdShowAll})
}

// Render draws the dialog: the tools, then the report.
func (r *reportDialog) Render() app.UI {
	return app.Div().Class("pl-report-view").DataSet("testid", "report-view").Attr("role", "dialog").Attr("aria-label", "Report").OnClick(r.onClick).Body(
		app.Div().Class("pl-report-tools").Body(
			r.button(anButton("pl-btn", "Print or save as PDF", "report-print"), rdPrint),
			r.button(anButton("pl-btn", "Save as HTML file", "report-save-html"), rdSaveHTML),
			r.button(anButton("pl-btn pl-btn-quiet", "Close report", "report-close"), rdClose),
			app.If(r.Msg != "", func() app.UI { return app.Span().Attr("role", "status").Text(r.Msg) }),
		),
		app.Raw(r.Body),
	)
}
