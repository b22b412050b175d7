package cli

import (
	"fmt"
	"strings"

	"pairline/app/numfmt"
	"pairline/app/wording"
	"pairline/fitcore"
)

// sig is the number of significant digits the summary shows for estimates.
const sig = 6

func num(v float64) string { return numfmt.Sig(v, sig) }

// The summary's labels are those of the screen and the report
// (app/wording), so that the three read alike.

// summary is the readable form of a fit for a terminal. name, fr.xName and
// fr.yName are already made visible (term); every other text from a file
// reaches it through fitcore's messages, which quote no file text, and the
// caller passes the whole summary through termLines.
func summary(name string, fr *fitResult) string {
	r := fr.report
	var b strings.Builder
	w := func(format string, a ...any) { fmt.Fprintf(&b, format, a...) }
	level := r.Level
	if level == 0 {
		level = fitcore.DefaultLevel
	}

	w("Line fitted to %s\n", name)
	w("  %s: %d", wording.PairsUsed, r.N)
	if r.NSkipped > 0 {
		w(", %d row(s) skipped (see the notes)", r.NSkipped)
	}
	w("; x = %s, y = %s\n", fr.xName, fr.yName)
	w("  Fit: %s; confidence level %s\n\n", wording.Fit(r.Model, r.Transform), wording.Percent(level))
	w("  %s\n\n", wording.Equation(r, num))
	b.WriteString(summaryRest(fr, level))
	return b.String()
}

// row is one labelled figure of a two-column block.
func row(b *strings.Builder, label, value string) {
	fmt.Fprintf(b, "    %-36s %s\n", label, value)
}

// coefBlock is a coefficient as the screen's "More numbers" shows it: the
// estimate, the interval where a technician looks first, the standard
// error, the test against the reference value, and the test against 0 only
// when the reference is not 0 (else it is the same test). The estimate and
// the interval's ends are rounded to the decimal place of the standard
// error's second significant digit, the standard error to two digits
// (numfmt.Estimate, as the line card and the report), each with unit when
// it has one; --json keeps the full precision.
func coefBlock(b *strings.Builder, name string, c fitcore.Coefficient, level float64, unit string) {
	fmt.Fprintf(b, "  %s\n", name)
	est, se := numfmt.Estimate(c.Estimate, c.SE, sig)
	lo, _ := numfmt.Estimate(c.CILow, c.SE, sig)
	hi, _ := numfmt.Estimate(c.CIHigh, c.SE, sig)
	row(b, wording.Estimate, withUnit(est, unit))
	row(b, wording.Interval(level), withUnit(wording.Range(lo, hi), unit))
	row(b, wording.StandardError, withUnit(se, unit))
	ref := wording.Ref(c.Ref)
	row(b, wording.TestedAgainst, ref)
	row(b, wording.TAgainst(ref), numfmt.Sig(c.TRef, 4))
	row(b, wording.PAgainst(ref), wording.P(c.PRef))
	if wording.ShowPlainTest(c.Ref) {
		zero := wording.Ref(0)
		row(b, wording.TAgainst(zero), numfmt.Sig(c.T, 4))
		row(b, wording.PAgainst(zero), wording.P(c.P))
	}
}

// withUnit appends a unit to a shown number ("0.012 mV"), or nothing.
func withUnit(shown, unit string) string {
	if unit == "" {
		return shown
	}
	return shown + " " + unit
}

// units are the units of the slope and of y-scale figures (intercept,
// residual SD): those of the readings for a line in original units (the
// slope as wording.SlopeUnit, "mV per mg/L"); none on a transformed scale,
// whose figures are in the transformed quantity the fit line names.
func (fr *fitResult) units() (slope, y string) {
	if tr := fr.report.Transform; (tr != "" && tr != fitcore.TransformNone) || (fr.xUnit == "" && fr.yUnit == "") {
		return "", ""
	}
	return wording.SlopeUnit(fr.yUnit, fr.xUnit), fr.yUnit
}

// verdict is a verdict's icon and word, padded for a column.
func verdict(v fitcore.Verdict) string {
	icon, word := wording.Verdict(v)
	return fmt.Sprintf("%-14s", icon+" "+word)
}

// summaryRest is the summary after its heading and the line's equation:
// one block per part of the report, in the order the screen shows them,
// each left out when the report has nothing for it, and the caution last.
func summaryRest(fr *fitResult, level float64) string {
	var b strings.Builder
	for _, block := range []func(*strings.Builder, *fitResult, float64){
		lineBlock, checksBlock, testsBlock, standsOutBlock, adviceBlock,
		predictionsBlock, inverseBlock, limitsBlock, acceptanceBlock, notesBlock,
	} {
		block(&b, fr, level)
	}
	b.WriteString("Caution: these statistics describe the readings given. Where the result affects safety\n")
	b.WriteString("(gas detection, structural loads, drinking water), follow the instrument maker's procedure,\n")
	b.WriteString("local codes and licensed practice.\n")
	return b.String()
}

// lineBlock is the coefficients (the intercept only for a line with one)
// and the figures of the fit as a whole, as the screen's "More numbers".
func lineBlock(b *strings.Builder, fr *fitResult, level float64) {
	r := fr.report
	origin := r.Model == fitcore.ModelOrigin
	slopeUnit, yUnit := fr.units()
	coefBlock(b, wording.Slope, r.Slope, level, slopeUnit)
	if !origin {
		coefBlock(b, wording.Intercept, r.Intercept, level, yUnit)
	}
	fmt.Fprintf(b, "  %s\n", wording.FitAsAWhole)
	// Three digits with the unit of y, as the line card.
	row(b, wording.ResidualSD, withUnit(numfmt.Sig(r.ResidualSE, 3), yUnit))
	row(b, wording.DegreesOfFreedom, wording.DF(r.DF))
	row(b, wording.CorrelationR, numfmt.Decimals(r.R, 6))
	row(b, wording.RSquared, numfmt.Decimals(r.RSquared, 6))
	row(b, wording.AdjRSquared, numfmt.Decimals(r.AdjRSquared, 6))
	row(b, wording.FLine, numfmt.Sig(r.F, 4))
	row(b, wording.PofF, wording.P(r.FP))
	if !origin {
		row(b, wording.Covariance, numfmt.Sig(r.CovSlopeIntercept, 4))
	}
	row(b, wording.MeanX, num(r.MeanX))
	row(b, wording.MeanY, num(r.MeanY))
	b.WriteString("\n")
}

// checksBlock is one line per assumption the report judged (fitcore's
// list, in its order): verdict, name, message and what to do.
func checksBlock(b *strings.Builder, fr *fitResult, _ float64) {
	fmt.Fprintf(b, "%s\n", wording.ChecksTitle)
	for _, info := range fitcore.AssumptionList() {
		a := info.Get(fr.report)
		if a == nil {
			continue
		}
		fmt.Fprintf(b, "  %s %-38s %s", verdict(a.Verdict), wording.CheckName(info.ID), oneLine(a.Message))
		if a.Advice != "" {
			fmt.Fprintf(b, " What to do: %s", oneLine(a.Advice))
		}
		b.WriteString("\n")
	}
	b.WriteString("\n")
}

// testsBlock is one line per test behind the checks: verdict, name, the
// statistic and its p (none for a test that could not be computed), and
// its message.
func testsBlock(b *strings.Builder, fr *fitResult, _ float64) {
	fmt.Fprintf(b, "%s\n", wording.Tests)
	for _, t := range fr.report.Present() {
		c := t.Check
		stat := ""
		if c.Verdict != fitcore.NA {
			stat = fmt.Sprintf("%s = %s, %s", t.Symbol, numfmt.Sig(c.Statistic, 4), wording.PEq(c.P))
		}
		fmt.Fprintf(b, "  %s %-20s %-24s %s\n", verdict(c.Verdict), c.Name, stat, oneLine(c.Message))
	}
	b.WriteString("\n")
}

// standsOutBlock names the flagged readings, with the file line each came
// from (fitcore numbers them by pair), their influence figures and why
// they were flagged; nothing when none is.
func standsOutBlock(b *strings.Builder, fr *fitResult, _ float64) {
	var flagged []fitcore.PointInfluence
	for _, p := range fr.report.Influence {
		if p.Flagged {
			flagged = append(flagged, p)
		}
	}
	if len(flagged) == 0 {
		return
	}
	fmt.Fprintf(b, "%s\n", wording.StandsOut)
	for _, p := range flagged {
		line := ""
		if p.Index >= 0 && p.Index < len(fr.lines) {
			line = fmt.Sprintf(" (line %d)", fr.lines[p.Index])
		}
		fmt.Fprintf(b, "  pair %d%s: leverage %s, studentized residual %s, Cook's distance %s",
			p.Index+1, line, numfmt.Sig(p.Leverage, 3), numfmt.Sig(p.Studentized, 3), numfmt.Sig(p.CooksD, 3))
		if len(p.Reasons) > 0 {
			fmt.Fprintf(b, " — %s", oneLine(strings.Join(p.Reasons, "; ")))
		}
		b.WriteString("\n")
	}
	b.WriteString("\n")
}

// adviceBlock is the Box–Cox power when one was estimated, and the advice
// when it offers a remedy: the flag that applies it, its reason, the
// verdicts before and after, and why each other candidate was turned down
// (with --no-advice, a line saying it was not worked out).
func adviceBlock(b *strings.Builder, fr *fitResult, level float64) {
	r := fr.report
	if r.BoxCox != nil {
		fmt.Fprintf(b, "Box–Cox λ = %s (%s %s)\n\n", numfmt.Sig(r.BoxCox.Lambda, 3), wording.Interval(level),
			wording.Range(numfmt.Sig(r.BoxCox.CILow, 3), numfmt.Sig(r.BoxCox.CIHigh, 3)))
	}
	a := r.Advice
	if a == nil && fr.noAdvice {
		b.WriteString("Advice: not worked out (--no-advice): no transform or weighting was tried.\n\n")
		return
	}
	if a == nil || a.Remedy == "" {
		return
	}
	fmt.Fprintf(b, "Advice: %s%s. %s\n", wording.Remedy(a.Remedy), remedyFlag(a.Remedy), oneLine(a.Reason))
	if a.After != nil {
		fmt.Fprintf(b, "  %s\n", beforeAfter(a.Before.Assumptions, a.After.Assumptions))
	}
	for _, c := range a.Candidates {
		if c.Why != "" {
			fmt.Fprintf(b, "  tried %s: %s\n", wording.Remedy(c.Remedy), oneLine(c.Why))
		}
	}
	b.WriteString("\n")
}

// predictionsBlock is ŷ at each x asked for, with the intervals of the
// mean reading and of a new reading.
func predictionsBlock(b *strings.Builder, fr *fitResult, level float64) {
	r := fr.report
	if len(r.Predictions) == 0 {
		return
	}
	fmt.Fprintf(b, "y at a given x (%s)\n", wording.Percent(level))
	for _, p := range r.Predictions {
		fmt.Fprintf(b, "  At x = %s: ŷ = %s; %s: %s; %s: %s", wording.Ref(p.X), num(p.Fit),
			wording.MeanReading, wording.Range(num(p.CILow), num(p.CIHigh)),
			wording.NewReading, wording.Range(num(p.PILow), num(p.PIHigh)))
		if p.Message != "" {
			fmt.Fprintf(b, " — %s", oneLine(p.Message))
		}
		b.WriteString("\n")
	}
	b.WriteString("\n")
}

// inverseBlock is x for each unknown's readings, rounded to its standard
// error (numfmt.Estimate, as the coefficients), with its interval or the
// word that it has no finite one.
func inverseBlock(b *strings.Builder, fr *fitResult, level float64) {
	r := fr.report
	if len(r.Inverse) == 0 {
		return
	}
	fmt.Fprintf(b, "x from readings (%s)\n", wording.Percent(level))
	for _, v := range r.Inverse {
		xs, se := numfmt.Estimate(v.X, v.SE, sig)
		fmt.Fprintf(b, "  An unknown read as %s (mean of %d) is x = %s, %s %s", withUnit(numfmt.Short(v.Y, sig), fr.yUnit), v.M, withUnit(xs, fr.xUnit),
			strings.ToLower(wording.StandardError), withUnit(se, fr.xUnit))
		if v.Bounded {
			lo, _ := numfmt.Estimate(v.Low, v.SE, sig)
			hi, _ := numfmt.Estimate(v.High, v.SE, sig)
			fmt.Fprintf(b, ", %s %s", wording.Interval(level), withUnit(wording.Range(lo, hi), fr.xUnit))
		} else {
			b.WriteString(", no finite interval")
		}
		if v.Message != "" {
			fmt.Fprintf(b, " — %s", oneLine(v.Message))
		}
		b.WriteString("\n")
	}
	b.WriteString("\n")
}

// limitsBlock is the limits of detection and quantitation, to three
// digits as the screen's card of the limits, in the unit of x (or said to
// be in x units when x has none).
func limitsBlock(b *strings.Builder, fr *fitResult, _ float64) {
	l := fr.report.Limits
	switch {
	case l == nil:
	case fr.xUnit != "":
		fmt.Fprintf(b, "%s %s, %s %s\n\n", wording.DetectionLimit, withUnit(numfmt.Sig(l.LOD, 3), fr.xUnit),
			strings.ToLower(wording.QuantitationLimit), withUnit(numfmt.Sig(l.LOQ, 3), fr.xUnit))
	default:
		fmt.Fprintf(b, "%s %s, %s %s (x units)\n\n", wording.DetectionLimit, numfmt.Sig(l.LOD, 3),
			strings.ToLower(wording.QuantitationLimit), numfmt.Sig(l.LOQ, 3))
	}
}

// acceptanceBlock is the stamp of the acceptance criteria and each
// criterion met or not, with its limit and reason.
func acceptanceBlock(b *strings.Builder, fr *fitResult, _ float64) {
	acc := fr.report.Acceptance
	if acc == nil {
		return
	}
	stamp := wording.NotAccepted
	if acc.Pass {
		stamp = wording.Accepted
	}
	fmt.Fprintf(b, "Acceptance criteria: %s. %s\n", stamp, oneLine(acc.Summary))
	for _, c := range acc.Results {
		out := wording.NotMet
		if c.Pass {
			out = wording.Met
		}
		fmt.Fprintf(b, "  %s %s (%s): %s\n", out, c.Name, c.Limit, oneLine(c.Reason))
	}
	b.WriteString("\n")
}

// notesBlock is the report's notes, one a line.
func notesBlock(b *strings.Builder, fr *fitResult, _ float64) {
	if len(fr.report.Notes) == 0 {
		return
	}
	b.WriteString("Notes\n")
	for _, n := range fr.report.Notes {
		fmt.Fprintf(b, "  - %s\n", oneLine(n))
	}
	b.WriteString("\n")
}

// beforeAfter compares the verdicts of the checks now and with the remedy,
// as the screen's advice table does.
func beforeAfter(bf, af fitcore.Assumptions) string {
	var parts []string
	pair := func(name string, x, y fitcore.Assumption) {
		i1, w1 := wording.Verdict(x.Verdict)
		i2, w2 := wording.Verdict(y.Verdict)
		parts = append(parts, fmt.Sprintf("%s %s %s → %s %s", name, i1, w1, i2, w2))
	}
	for _, as := range fitcore.AssumptionList() {
		if x, y := as.Of(&bf), as.Of(&af); x != nil && y != nil {
			pair(wording.CheckName(as.ID), *x, *y)
		}
	}
	return "now → with the remedy: " + strings.Join(parts, "; ")
}

// remedyFlag is the command-line flag that applies a remedy.
func remedyFlag(r fitcore.Remedy) string {
	switch r {
	case fitcore.RemedyNone, "":
		return ""
	}
	if _, t, w := r.Settings(); w != fitcore.WeightsNone {
		return " (--weights " + string(w) + ")"
	} else if t != fitcore.TransformNone {
		return " (--transform " + string(t) + ")"
	}
	return ""
}
