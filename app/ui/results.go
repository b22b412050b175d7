package ui

import (
	"strconv"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/numfmt"
	"pairline/app/wording"
)

// renderLine draws the fitted line's headline numbers, or the sentence that
// says why there is no line yet.
func (c *Shell) renderLine() app.UI {
	rep := c.view.report
	if rep == nil {
		return app.Section().Class("pl-card pl-line").Attr("aria-label", "Line").DataSet("testid", "line-card").Body(
			app.H2().Text("Line"),
			app.P().Class("pl-message").DataSet("testid", "result-message").Text(c.view.message),
		)
	}
	sig := numfmt.Precision(c.view.digits)
	xu, yu := c.sess.XUnit, c.sess.YUnit
	slopeUnit := ""
	if xu != "" || yu != "" {
		slopeUnit = wording.SlopeUnit(yu, xu)
	}
	slopeUnit, yu = c.anHeadlineUnits(rep, slopeUnit, yu)
	// Each estimate to the decimal place of its standard error's second
	// significant digit (numfmt.Estimate).
	slopeV, slopeU := numfmt.Estimate(rep.Slope.Estimate, rep.Slope.SE, sig)
	icptV, icptU := numfmt.Estimate(rep.Intercept.Estimate, rep.Intercept.SE, sig)
	return app.Section().Class("pl-card pl-line").Attr("aria-label", "Line").DataSet("testid", "line-card").Body(
		app.H2().Text("Line"),
		// Always in the markup, so that its coming and going never makes
		// go-app re-mount the numbers after it.
		app.P().Class("pl-stale").DataSet("testid", "result-stale").Hidden(!c.view.stale).Text(staleNote(c.view.stale)),
		app.P().Class("pl-equation").Text(c.anEquation(rep, sig)),
		app.Dl().Class("pl-figures").Body(
			figure("result-n", wording.PairsUsed, float64(rep.N), itoa(rep.N), ""),
			figure("result-slope", wording.Slope, rep.Slope.Estimate, slopeV, slopeUnit+"  ± "+slopeU+" (SE)"),
			figure("result-intercept", wording.Intercept, rep.Intercept.Estimate, icptV, joinUnit(yu, " ± "+icptU+" (SE)")),
			figure("result-r", wording.CorrelationR, rep.R, numfmt.Decimals(rep.R, 6), ""),
			figure("result-r-squared", wording.RSquared, rep.RSquared, numfmt.Decimals(rep.RSquared, 6), ""),
			figure("result-residual-se", wording.ResidualSD, rep.ResidualSE, numfmt.Sig(rep.ResidualSE, 3), yu),
		),
		c.renderMoreNumbers(),
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
			app.If(unit != "", func() app.UI { return app.Span().Class("pl-unit").Text(" " + unit) }),
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
