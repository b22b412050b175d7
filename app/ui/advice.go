package ui

import (
	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/numfmt"
	"pairline/app/session"
	"pairline/app/wording"
	"pairline/fitcore"
)

// anRemedyName is the plain name of a remedy (wording.RemedyAction).
func anRemedyName(r fitcore.Remedy) string { return wording.RemedyAction(r) }

// anApplied says whether the settings already carry a change of scale or a
// weighting (what the advice applies and revert takes back).
func anApplied(st session.Settings) bool {
	return (st.Transform != "" && st.Transform != fitcore.TransformNone) || st.Weights != fitcore.WeightsNone
}

// anWithRemedy returns the settings with the remedy applied, as the advice
// fitted it: an intercept line on the new scale, or a weighted fit with the
// variance power estimated from the readings.
func anWithRemedy(st session.Settings, ad *fitcore.Advice) session.Settings {
	s := st
	s.BoxCoxLambda = nil
	s.Model, s.Transform, s.Weights = ad.Remedy.Settings()
	if ad.Remedy == fitcore.RemedyBoxCox {
		for _, c := range ad.Candidates {
			if c.Remedy == fitcore.RemedyBoxCox {
				l := c.Lambda
				s.BoxCoxLambda = &l
			}
		}
	}
	return s
}

// anAdvice applies the advice's remedy (apply) or goes back to the plain
// line (controller.applyAdvice, revertAdvice).
func (c *Shell) anAdvice(ctx app.Context, apply bool) {
	if c.ctl.sess == nil || c.refuseLocked() {
		return
	}
	do := c.ctl.revertAdvice
	if apply {
		do = c.ctl.applyAdvice
	}
	if err := do(); err != nil {
		if err != errNoAdvice {
			c.notice = "This setting could not be used: " + err.Error()
		}
		return
	}
	c.afterChange(ctx)
}

// renderAdvice hands the advice card its data.
func (c *Shell) renderAdvice() app.UI {
	if c.ctl.view.report == nil && !anApplied(c.ctl.sess.Settings) {
		return nil
	}
	s := c.ctl.sess
	return &adviceCard{
		Report: c.ctl.view.report, Applied: anApplied(s.Settings), Pending: c.ctl.view.advicePending, Digits: c.ctl.view.digits,
		XName: s.XName, XUnit: s.XUnit, YName: s.YName, YUnit: s.YUnit,
		LineFrom: len(c.an.anPredX), LineN: len(c.an.anLineX), OnAction: c.cardAction,
	}
}

// adviceCard draws the transform or weighting advice: the remedy and its
// reason, the checks and both fits before and after, and one button to
// apply it (or to revert an applied one).
type adviceCard struct {
	app.Compo

	Report  *fitcore.Report // nil: the settings in use leave no line
	Applied bool            // the settings carry a change of scale or a weighting (anApplied)
	Pending bool            // the advice is worked out in a later turn
	Digits  int

	XName, XUnit, YName, YUnit string

	// LineFrom and LineN are where the predictions of the "line in
	// original units" table sit in Report.Predictions (after the use
	// card's own, analysisUI.queries).
	LineFrom, LineN int

	OnAction func(CardAction)
}

func (r *adviceCard) act(a CardAction) {
	if r.OnAction != nil {
		r.OnAction(a)
	}
}

// Render draws the card.
func (r *adviceCard) Render() app.UI {
	rep := r.Report
	if rep == nil {
		// A change of scale the readings cannot take leaves no report: keep
		// the way back visible.
		return app.Section().Class("pl-card an-advice").Attr("aria-label", "Advice").
			DataSet("testid", "advice").DataSet("transform", "none").Body(
			app.H2().Text("Advice"),
			app.P().Text("The fit uses a change of scale or a weighting that these readings cannot take."),
			r.revertButton(),
		)
	}
	if rep.Advice == nil && r.Pending {
		return app.Section().Class("pl-card an-advice").Attr("aria-label", "Advice").
			DataSet("testid", "advice").DataSet("transform", "pending").Body(
			app.H2().Text("Advice"),
			app.P().Text("Working out whether a change of scale or a weighting would help; it follows as soon as typing pauses."),
		)
	}
	ad := rep.Advice
	remedy := fitcore.RemedyNone
	if ad != nil {
		remedy = ad.Remedy
	}
	body := []app.UI{app.H2().Text("Advice")}
	if r.Applied {
		body = append(body, app.P().Class("an-applied").DataSet("testid", "advice-applied").Text(
			"In use: "+anModelText(rep)+", as the advice suggested. The button below goes back to the plain, unweighted line."),
			r.revertButton())
	}
	if ad == nil {
		body = append(body, app.P().Text("No advice could be worked out for this fit."))
	} else {
		body = append(body, app.P().Class("an-reason").DataSet("testid", "advice-reason").Text(ad.Reason))
	}
	if ad != nil && remedy != fitcore.RemedyNone {
		body = append(body,
			app.P().Class("an-remedy").Body(app.Strong().Text("Recommended: "), app.Span().Text(anRemedyName(remedy)+".")),
			r.beforeAfter(rep, ad),
			app.Button().Class("pl-btn pl-btn-wide").DataSet("testid", "advice-apply").
				Text("Use this: "+anRemedyName(remedy)).
				OnClick(func(ctx app.Context, e app.Event) { r.act(CardAction{Kind: caApplyAdvice}) }),
		)
	}
	body = append(body, r.originalUnits(rep))
	return app.Section().Class("pl-card an-advice").Attr("aria-label", "Advice").
		DataSet("testid", "advice").DataSet("transform", string(remedy)).Body(body...)
}

func (r *adviceCard) revertButton() app.UI {
	return app.Button().Class("pl-btn pl-btn-quiet pl-btn-wide").DataSet("testid", "advice-revert").
		Text("Undo: back to the plain line").OnClick(func(ctx app.Context, e app.Event) { r.act(CardAction{Kind: caRevertAdvice}) })
}

// anModelText describes the fit in use.
func anModelText(rep *fitcore.Report) string {
	t := ""
	switch rep.Model {
	case fitcore.ModelOrigin:
		t = "a line through zero"
	case fitcore.ModelWeighted:
		t = "a weighted line"
		if rep.WeightPower != 0 {
			t += " (scatter taken to grow as |x|^" + numfmt.Sig(rep.WeightPower, 2) + ")"
		}
	case fitcore.ModelDeming:
		t = "a Deming line"
	default:
		t = "a least-squares line"
	}
	switch rep.Transform {
	case fitcore.TransformLogY:
		t += " of log y against x"
	case fitcore.TransformLogLog:
		t += " of log y against log x"
	case fitcore.TransformSqrtY:
		t += " of √y against x"
	case fitcore.TransformReciprocal:
		t += " of 1/y against x"
	case fitcore.TransformBoxCox:
		t += " of a power of y against x"
		if rep.TransformLambda != nil {
			t += " (λ = " + numfmt.Sig(*rep.TransformLambda, 3) + ")"
		}
	}
	return t
}

// beforeAfter is the table of the checks and of both fits, before and
// after the remedy.
func (r *adviceCard) beforeAfter(rep *fitcore.Report, ad *fitcore.Advice) app.UI {
	if ad.After == nil {
		return nil
	}
	var cand *fitcore.Candidate
	for i := range ad.Candidates {
		if ad.Candidates[i].Remedy == ad.Remedy {
			cand = &ad.Candidates[i]
		}
	}
	b, a := ad.Before, *ad.After
	row := func(id, name string, vb, va fitcore.Verdict) app.UI {
		return app.Tr().DataSet("testid", "advice-row-"+id).DataSet("before", string(vb)).DataSet("after", string(va)).Body(
			app.Th().Attr("scope", "row").Text(name),
			app.Td().Body(anBadge(vb)),
			app.Td().Body(anBadge(va)),
		)
	}
	sig := numfmt.Precision(r.Digits)
	var rows []app.UI
	for _, as := range fitcore.AssumptionList() {
		if vb, va := as.Of(&b.Assumptions), as.Of(&a.Assumptions); vb != nil && va != nil {
			rows = append(rows, row(string(as.ID), wording.CheckName(as.ID), vb.Verdict, va.Verdict))
		}
	}
	rows = append(rows,
		baNumRow("R²", "advice-r2-", b.RSquared, a.RSquared, numfmt.Decimals(b.RSquared, 4), numfmt.Decimals(a.RSquared, 4)),
		baNumRow(wording.TestP("Breusch–Pagan"), "", b.BreuschPaganP, a.BreuschPaganP, anP(b.BreuschPaganP), anP(a.BreuschPaganP)),
		baNumRow(wording.TestP("Curvature"), "", b.CurvatureP, a.CurvatureP, anP(b.CurvatureP), anP(a.CurvatureP)),
	)
	if cand != nil {
		rows = append(rows,
			baNumRow("Slope", "advice-slope-", rep.Slope.Estimate, cand.Slope, numfmt.Sig(rep.Slope.Estimate, sig), numfmt.Sig(cand.Slope, sig)),
			baNumRow("Intercept", "advice-intercept-", rep.Intercept.Estimate, cand.Intercept, numfmt.Sig(rep.Intercept.Estimate, sig), numfmt.Sig(cand.Intercept, sig)),
		)
	}
	after := "After"
	if tag := wording.RemedyTag(ad.Remedy); tag != "" {
		after = "After (" + tag + ")"
	}
	_, _, weighted := ad.Remedy.Settings()
	return anScroll("Advice, before and after").Body(
		app.Table().Class("an-table an-ba").DataSet("testid", "advice-table").Body(
			app.THead().Body(app.Tr().Body(app.Th().Text(""), app.Th().Text("Now"), app.Th().Text(after))),
			app.TBody().Body(rows...),
		),
		app.If(cand != nil && weighted == fitcore.WeightsNone, func() app.UI {
			return anPText("an-hint", "After: slope and intercept on the new scale.")
		}),
	)
}

// baNumRow is a row of the before-and-after table: the label, then the
// number now (shown as bs, full value vb) and after the remedy; id, when
// not empty, is the start of the cells' test ids (id+"before", id+"after").
func baNumRow(label, id string, vb, va float64, bs, as string) app.UI {
	ib, ia := "", ""
	if id != "" {
		ib, ia = id+"before", id+"after"
	}
	return app.Tr().Body(
		app.Th().Attr("scope", "row").Text(label),
		app.Td().Body(anNum(ib, vb, bs)),
		app.Td().Body(anNum(ia, va, as)),
	)
}

// originalUnits shows a line fitted on a transformed scale back in the
// units of y: fitcore's predictions (with Duan's smearing on log scales) at
// five x across the readings.
func (r *adviceCard) originalUnits(rep *fitcore.Report) app.UI {
	if rep.Transform == fitcore.TransformNone || rep.Transform == "" || r.LineN == 0 {
		return nil
	}
	off := r.LineFrom
	if len(rep.Predictions) < off+r.LineN {
		return nil
	}
	preds := rep.Predictions[off : off+r.LineN]
	sig := numfmt.Precision(r.Digits)
	lvl := anPercent(rep.Level)
	note := ""
	if rep.Smearing != 0 && rep.Smearing != 1 {
		note = "Mean values include the small correction for the log scale (smearing factor " + numfmt.Sig(rep.Smearing, 5) + "). "
	}
	return app.Div().Class("an-orig").DataSet("testid", "original-units").Body(
		app.H3().Text("Line in original units"),
		anPText("an-hint", note+"Intervals are at "+lvl+"."),
		anScroll("Line in original units").Body(
			app.Table().Class("an-table an-tests").Body(
				app.THead().Body(app.Tr().Body(
					app.Th().Text(colHead(r.XName, r.XUnit, "x")),
					app.Th().Text("Fitted "+colHead(r.YName, r.YUnit, "y")),
					app.Th().Text("Mean between"),
					app.Th().Text("New reading between"),
				)),
				app.TBody().Body(app.Range(preds).Slice(func(i int) app.UI {
					p := preds[i]
					return app.Tr().DataSet("testid", "original-units-row").Body(
						app.Th().Attr("scope", "row").Body(anNum("", p.X, numfmt.Sig(p.X, 4))),
						app.Td().Body(anNum("", p.Fit, numfmt.Sig(p.Fit, sig))),
						app.Td().Body(anNum("", p.CILow, numfmt.Sig(p.CILow, sig)), app.Text(" – "), anNum("", p.CIHigh, numfmt.Sig(p.CIHigh, sig))),
						app.Td().Body(anNum("", p.PILow, numfmt.Sig(p.PILow, sig)), app.Text(" – "), anNum("", p.PIHigh, numfmt.Sig(p.PIHigh, sig))),
					)
				})),
			),
		),
	)
}

// anEquation writes the fitted line on the scale it was fitted on
// (wording.Equation).
func anEquation(rep *fitcore.Report, sig int) string {
	return wording.Equation(rep, func(v float64) string { return numfmt.Sig(v, sig) })
}

// anHeadlineUnits gives the units of the headline slope and of y-scale
// figures: on a transformed scale those of the fitted scale, not of the
// readings (xu, yu: the units of the readings).
func anHeadlineUnits(rep *fitcore.Report, xu, yu, slope string) (string, string) {
	if sc := anScaleOf(rep, xu, yu); sc.transformed {
		return sc.slope, sc.y
	}
	return slope, yu
}

// anScroll is a box that scrolls a wide table sideways on a phone. It can
// take the focus (tabindex 0) and is a named region, so that it can be
// scrolled from the keyboard and a screen reader says what it holds.
func anScroll(label string) app.HTMLDiv {
	return app.Div().Class("an-scroll").Attr("tabindex", "0").Attr("role", "region").Attr("aria-label", label)
}
