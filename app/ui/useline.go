package ui

import (
	"strconv"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/numfmt"
	"pairline/app/session"
	"pairline/fitcore"
)

// splitReadings splits typed repeat readings at spaces and semicolons
// (tabs and new lines too; a comma stays inside a number as a decimal
// comma) and parses each as the readings of s are parsed. The error names the
// reading, counted from 1.
func splitReadings(s *session.Session, text string) ([]float64, string) {
	fields := session.SplitRepeats(text)
	out := make([]float64, 0, len(fields))
	for i, f := range fields {
		v, err := parseAs(s, f)
		if err != nil {
			return nil, "Reading " + strconv.Itoa(i+1) + " is not used: " + err.Error() + "."
		}
		out = append(out, v)
	}
	return out, ""
}

// anRequery answers a changed question of "Use the line". Readings and
// settings are unchanged, so the advice is too: the one Analyze run of the
// keystroke leaves it out (SkipAdvice, several times faster) and the
// report keeps the advice already shown. A very big session (requeryLater
// readings and more) waits for typing to pause.
func (c *Shell) anRequery(ctx app.Context) {
	if c.ctl.sess == nil {
		return
	}
	run := func() { c.ctl.requery(c.an.queries) }
	if len(c.ctl.sess.Readings) < requeryLater {
		run()
		return
	}
	c.an.anReqSeq++ // never editSeq: that would cancel an edit's pending save
	seq := c.an.anReqSeq
	ctx.After(requeryIdle, func(ctx app.Context) {
		if seq == c.an.anReqSeq {
			run()
		}
	})
}

// requeryLater and requeryIdle: see anRequery. The checks without the
// advice grow with the readings (figures in DEVELOPERS.md, "Speed in the
// browser").
const (
	requeryLater = 20000
	requeryIdle  = 250 * time.Millisecond
)

// renderUseLine hands the "Use the line" card its data.
func (c *Shell) renderUseLine() app.UI {
	if c.ctl.view.report == nil {
		return nil
	}
	s := c.ctl.sess
	return &useCard{
		Report: c.ctl.view.report, Digits: c.ctl.view.digits,
		XName: s.XName, XUnit: s.XUnit, YName: s.YName, YUnit: s.YUnit,
		InvText: c.an.anInvText, InvErr: c.an.anInvErr, Inverse: len(c.an.anInvY) > 0,
		PredText: c.an.anPredText, PredErr: c.an.anPredErr, Predict: len(c.an.anPredX),
		OnAction: c.cardAction,
	}
}

// applyQuery takes a changed question of "Use the line" (Key "inverse" or
// "predict", typed as Text): parsed as the readings are, then asked of the
// line (anRequery).
func (c *Shell) applyQuery(ctx app.Context, a CardAction) {
	switch a.Key {
	case "inverse":
		c.an.anInvText = a.Text
		c.an.anInvY, c.an.anInvErr = splitReadings(c.ctl.sess, a.Text)
	case "predict":
		c.an.anPredText = a.Text
		c.an.anPredX, c.an.anPredErr = splitReadings(c.ctl.sess, a.Text)
	default:
		return
	}
	c.anRequery(ctx)
}

// useCard draws "Use the line": an unknown's readings converted to x with
// the Fieller interval, y predicted at an x with both intervals, and the
// detection and quantitation limits.
type useCard struct {
	app.Compo

	Report                     *fitcore.Report
	Digits                     int
	XName, XUnit, YName, YUnit string

	InvText, InvErr string // the readings of an unknown as typed, and why they are not used
	Inverse         bool   // they were read: Report.Inverse[0] answers them
	PredText        string // the x values to predict at, as typed
	PredErr         string
	Predict         int // how many: the first Report.Predictions answer them

	OnAction func(CardAction)
}

func (r *useCard) act(a CardAction) {
	if r.OnAction != nil {
		r.OnAction(a)
	}
}

// Render draws the card.
func (r *useCard) Render() app.UI {
	xq, yq := colHead(r.XName, r.XUnit, "x"), colHead(r.YName, r.YUnit, "y")
	return app.Section().Class("pl-card an-use").Attr("aria-label", "Use the line").Body(
		app.H2().Text("Use the line"),
		r.queryField("Readings of an unknown: "+yq, "one or more repeats, e.g. 12.4; 12.6; 12.5", "inverse", r.InvText, r.InvErr),
		r.inverseResult(),
		r.queryField("Predict the reading at: "+xq, "an x value, or several", "predict", r.PredText, r.PredErr),
		r.predictResult(),
		r.limits(),
	)
}

func (r *useCard) inverseResult() app.UI {
	rep := r.Report
	if !r.Inverse || len(rep.Inverse) == 0 {
		return nil
	}
	inv := rep.Inverse[0]
	sig := numfmt.Precision(r.Digits)
	xu := r.XUnit
	lvl := anPercent(rep.Level)
	el := app.Div().Class("an-answer").DataSet("testid", "inverse-result").
		DataSet("value", numfmt.Full(inv.X)).DataSet("low", numfmt.Full(inv.Low)).DataSet("high", numfmt.Full(inv.High)).
		DataSet("bounded", strconv.FormatBool(inv.Bounded)).DataSet("m", strconv.Itoa(inv.M))
	if !inv.Bounded && inv.SE == 0 && inv.X == 0 {
		// fitcore could not read an x back (a reading off the fitted
		// scale, a zero slope): only its sentence is shown.
		return el.DataSet("failed", "true").Body(
			app.P().Class("an-warn-text").DataSet("testid", "inverse-message").Text("▲ " + inv.Message))
	}
	mean := "The reading " + numfmt.Sig(inv.Y, sig)
	if inv.M > 1 {
		mean = "The mean of " + strconv.Itoa(inv.M) + " readings, " + numfmt.Sig(inv.Y, sig) + ","
	}
	body := []app.UI{
		app.P().Class("an-answer-main").Body(
			app.Span().Text("x̂ = "),
			app.Strong().Class("an-big").Text(numfmt.Sig(inv.X, sig)),
			app.If(xu != "", func() app.UI { return anSpanText("pl-unit", " "+xu) }),
		),
	}
	if inv.Bounded {
		body = append(body, app.P().Body(
			app.Span().Text(lvl+" interval: "),
			anNum("inverse-low", inv.Low, numfmt.Sig(inv.Low, sig)),
			app.Span().Text(" to "),
			anNum("inverse-high", inv.High, numfmt.Sig(inv.High, sig)),
			app.If(xu != "", func() app.UI { return anSpanText("pl-unit", " "+xu) }),
			app.Span().Text(" · standard error "),
			anNum("inverse-se", inv.SE, numfmt.Sig(inv.SE, 3)),
		))
	} else {
		body = append(body, app.P().Class("an-warn-text").DataSet("testid", "inverse-unbounded").Text(
			"▲ No interval can be given: the line is too flat against its scatter to read x back with confidence."))
	}
	body = append(body, anPText("an-hint", mean+" reads back as this x on the line."))
	if inv.Message != "" {
		body = append(body, app.P().Class("an-hint").DataSet("testid", "inverse-message").Text(inv.Message))
	}
	return el.Body(body...)
}

func (r *useCard) predictResult() app.UI {
	rep := r.Report
	n := r.Predict
	if n == 0 || len(rep.Predictions) < n {
		return nil
	}
	sig := numfmt.Precision(r.Digits)
	yu := r.YUnit
	lvl := anPercent(rep.Level)
	preds := rep.Predictions[:n]
	return app.Div().Class("an-answer").DataSet("testid", "predict-result").
		DataSet("value", numfmt.Full(preds[0].Fit)).
		DataSet("ci-low", numfmt.Full(preds[0].CILow)).DataSet("ci-high", numfmt.Full(preds[0].CIHigh)).
		DataSet("pi-low", numfmt.Full(preds[0].PILow)).DataSet("pi-high", numfmt.Full(preds[0].PIHigh)).Body(
		app.Range(preds).Slice(func(i int) app.UI {
			p := preds[i]
			id := "predict-" + strconv.Itoa(i) + "-"
			return app.Div().Class("an-pred").Body(
				app.P().Class("an-answer-main").Body(
					app.Span().Text("At x = "+anFullText(p.X)+": ŷ = "),
					app.Strong().Class("an-big").Body(anNum(id+"fit", p.Fit, numfmt.Sig(p.Fit, sig))),
					app.If(yu != "", func() app.UI { return anSpanText("pl-unit", " "+yu) }),
				),
				app.P().Body(
					app.Span().Text("Mean reading ("+lvl+"): "),
					anNum(id+"ci-low", p.CILow, numfmt.Sig(p.CILow, sig)), app.Span().Text(" to "),
					anNum(id+"ci-high", p.CIHigh, numfmt.Sig(p.CIHigh, sig)),
				),
				app.P().Body(
					app.Span().Text("One new reading ("+lvl+"): "),
					anNum(id+"pi-low", p.PILow, numfmt.Sig(p.PILow, sig)), app.Span().Text(" to "),
					anNum(id+"pi-high", p.PIHigh, numfmt.Sig(p.PIHigh, sig)),
				),
				app.If(p.Message != "", func() app.UI { return anPText("an-hint", p.Message) }),
			)
		}),
	)
}

func (r *useCard) limits() app.UI {
	rep := r.Report
	if rep.Limits == nil {
		return nil
	}
	xu := r.XUnit
	return app.Div().Class("an-limits").DataSet("testid", "limits").
		DataSet("lod", numfmt.Full(rep.Limits.LOD)).DataSet("loq", numfmt.Full(rep.Limits.LOQ)).Body(
		app.H3().Text("Smallest amounts the line can tell apart"),
		app.Table().Class("an-table an-kv").Body(app.TBody().Body(
			anRow("limits-lod", "Detection limit (3.3·s / slope)", rep.Limits.LOD, numfmt.Sig(rep.Limits.LOD, 3), xu),
			anRow("limits-loq", "Quantitation limit (10·s / slope)", rep.Limits.LOQ, numfmt.Sig(rep.Limits.LOQ, 3), xu),
		)),
		anPText("an-hint", "For calibrations: below the detection limit a result cannot be told from zero; below the quantitation limit it is too uncertain to report as a number."),
	)
}

// queryField is one question put to the line (the readings of an unknown,
// or x values to predict at): the field as typed, and the problem shown
// under it. The ids are name+"-input" and name+"-problem".
func (r *useCard) queryField(label, placeholder, name, text, problem string) app.UI {
	return app.Div().Body(
		app.Label().Class("an-field").Body(
			anSpanText("an-field-label", label),
			app.Input().Type("text").Class("an-input").Value(typedValue(name+"-input", text)).
				Attr("inputmode", "decimal").Attr("autocomplete", "off").
				Attr("placeholder", placeholder).
				DataSet("testid", name+"-input").DataSet("query", name).
				OnInput(func(ctx app.Context, e app.Event) {
					src := ctx.JSSrc()
					r.act(CardAction{Kind: caQuery, Key: src.Get("dataset").Get("query").String(), Text: takeTyped(src)})
				}, app.EventScope(name)),
		),
		app.If(problem != "", func() app.UI {
			return app.P().Class("pl-problem").DataSet("testid", name+"-problem").Text(problem)
		}),
	)
}
