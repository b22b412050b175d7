package ui

import (
	"strconv"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/numfmt"
	"pairline/app/wording"
	"pairline/fitcore"
)

// renderLine hands the line card its data.
func (c *Shell) renderLine() app.UI {
	return &lineCard{
		Report: c.ctl.view.report, Message: c.ctl.view.message, Digits: c.ctl.view.digits, Stale: c.ctl.view.stale,
		XUnit: c.ctl.sess.XUnit, YUnit: c.ctl.sess.YUnit, MoreOpen: c.an.anMoreOpen, OnAction: c.cardAction,
	}
}

// lineCard draws the fitted line's headline numbers and, behind "More
// numbers", every statistic of the fit; or the sentence that says why
// there is no line yet.
type lineCard struct {
	app.Compo

	Report       *fitcore.Report // nil: no line (Message says why)
	Message      string
	Digits       int  // most significant digits typed in a usable cell
	Stale        bool // the readings changed since Report was computed
	XUnit, YUnit string
	MoreOpen     bool // "More numbers" is open
	OnAction     func(CardAction)
}

func (r *lineCard) act(a CardAction) {
	if r.OnAction != nil {
		r.OnAction(a)
	}
}

// Render draws the card.
func (r *lineCard) Render() app.UI {
	rep := r.Report
	if rep == nil {
		return app.Section().Class("pl-card pl-line").Attr("aria-label", "Line").DataSet("testid", "line-card").Body(
			app.H2().Text("Line"),
			app.P().Class("pl-message").DataSet("testid", "result-message").Text(r.Message),
		)
	}
	sig := numfmt.Precision(r.Digits)
	xu, yu := r.XUnit, r.YUnit
	slopeUnit := ""
	if xu != "" || yu != "" {
		slopeUnit = wording.SlopeUnit(yu, xu)
	}
	slopeUnit, yu = anHeadlineUnits(rep, xu, yu, slopeUnit)
	// Each estimate to the decimal place of its standard error's second
	// significant digit (numfmt.Estimate).
	slopeV, slopeU := numfmt.Estimate(rep.Slope.Estimate, rep.Slope.SE, sig)
	icptV, icptU := numfmt.Estimate(rep.Intercept.Estimate, rep.Intercept.SE, sig)
	return app.Section().Class("pl-card pl-line").Attr("aria-label", "Line").DataSet("testid", "line-card").Body(
		app.H2().Text("Line"),
		// Always in the markup, so that its coming and going never makes
		// go-app re-mount the numbers after it.
		app.P().Class("pl-stale").DataSet("testid", "result-stale").Hidden(!r.Stale).Text(staleNote(r.Stale)),
		anPText("pl-equation", anEquation(rep, sig)),
		app.Dl().Class("pl-figures").Body(
			figure("result-n", wording.PairsUsed, float64(rep.N), itoa(rep.N), ""),
			figure("result-slope", wording.Slope, rep.Slope.Estimate, slopeV, slopeUnit+"  ± "+slopeU+" (SE)"),
			figure("result-intercept", wording.Intercept, rep.Intercept.Estimate, icptV, joinUnit(yu, " ± "+icptU+" (SE)")),
			figure("result-r", wording.CorrelationR, rep.R, numfmt.Decimals(rep.R, 6), ""),
			figure("result-r-squared", wording.RSquared, rep.RSquared, numfmt.Decimals(rep.RSquared, 6), ""),
			figure("result-residual-se", wording.ResidualSD, rep.ResidualSE, numfmt.Sig(rep.ResidualSE, 3), yu),
		),
		r.moreNumbers(),
	)
}

// moreNumbers is the "More numbers" disclosure: every statistic of the
// fit, each with data-value for tests.
func (r *lineCard) moreNumbers() app.UI {
	open := r.MoreOpen
	label := "More numbers ▾"
	if open {
		label = "Fewer numbers ▴"
	}
	return app.Div().Class("an-more").Body(
		anButton("pl-btn pl-btn-quiet an-toggle", label, "more-numbers").
			Attr("aria-expanded", strconv.FormatBool(open)).
			OnClick(func(ctx app.Context, e app.Event) { r.act(CardAction{Kind: caToggle, Key: "more-numbers"}) }),
		app.If(open, r.numbers),
	)
}

func (r *lineCard) numbers() app.UI {
	rep := r.Report
	sig := numfmt.Precision(r.Digits)
	sc := anScaleOf(rep, r.XUnit, r.YUnit)
	lvl := anPercent(rep.Level)
	origin := rep.Model == fitcore.ModelOrigin
	rows := []app.UI{
		anCoefTable("slope", wording.Slope, rep.Slope, sc.slope, lvl, sig),
	}
	if !origin {
		rows = append(rows, anCoefTable("intercept", wording.Intercept, rep.Intercept, sc.y, lvl, sig))
	}
	fit := []app.UI{
		anRow("result-residual-se-full", wording.ResidualSD, rep.ResidualSE, numfmt.Sig(rep.ResidualSE, sig), sc.y),
		anRow("result-df", wording.DegreesOfFreedom, rep.DF, anDF(rep.DF), ""),
		anRow("result-r-full", wording.CorrelationR, rep.R, numfmt.Decimals(rep.R, 6), ""),
		anRow("result-r-squared-full", wording.RSquared, rep.RSquared, numfmt.Decimals(rep.RSquared, 6), ""),
		anRow("result-adj-r-squared", wording.AdjRSquared, rep.AdjRSquared, numfmt.Decimals(rep.AdjRSquared, 6), ""),
		anRow("result-f", wording.FLine, rep.F, numfmt.Sig(rep.F, 4), ""),
		anRow("result-f-p", wording.PofF, rep.FP, anP(rep.FP), ""),
	}
	if !origin {
		fit = append(fit, anRow("result-cov", wording.Covariance, rep.CovSlopeIntercept, numfmt.Sig(rep.CovSlopeIntercept, 4), sc.cov))
	}
	fit = append(fit,
		anRow("result-mean-x", wording.MeanX, rep.MeanX, numfmt.Sig(rep.MeanX, sig), ""),
		anRow("result-mean-y", wording.MeanY, rep.MeanY, numfmt.Sig(rep.MeanY, sig), ""),
	)
	return app.Div().Class("an-numbers").DataSet("testid", "more-numbers-body").Body(
		app.If(sc.transformed, func() app.UI {
			return anPText("an-hint", "These numbers are on the fitted scale ("+sc.yName+"). The table “Line in original units” below the advice gives the line back in "+unitOr(r.YUnit, "y")+".")
		}),
		app.Div().Class("an-coefs").Body(rows...),
		app.Table().Class("an-table an-kv").Body(
			app.Caption().Text(wording.FitAsAWhole),
			app.TBody().Body(fit...),
		),
		anAnova(rep, sig, sc),
	)
}

// staleNote is the note shown while an edit's analysis is being completed.
func staleNote(stale bool) string {
	if stale {
		return "Updating after your last change…"
	}
	return ""
}

func figure(testid, label string, value float64, shown, unit string) app.UI {
	return app.Div().Class("pl-figure").Body(
		app.Dt().Text(label),
		app.Dd().Body(
			app.Span().Class("pl-num").DataSet("testid", testid).DataSet("value", numfmt.Full(value)).Text(shown),
			app.If(unit != "", func() app.UI { return anSpanText("pl-unit", " "+unit) }),
		),
	)
}

func unitOr(u, fallback string) string {
	if u == "" {
		return fallback + " unit"
	}
	return u
}

func joinUnit(unit, rest string) string {
	if unit == "" {
		return rest[1:]
	}
	return unit + rest
}

func itoa(n int) string { return strconv.Itoa(n) }
