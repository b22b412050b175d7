package cli

import (
	"fmt"
	"strconv"
	"strings"

	"pairline/app/numfmt"
	"pairline/fitcore"
)

// sig is the number of significant digits the summary shows for estimates.
const sig = 6

func num(v float64) string { return numfmt.Sig(v, sig) }

// pval shows a p-value with 3 significant digits, and very small ones as
// "< 1e-12" (beyond that the digits carry no information a technician uses).
func pval(p float64) string {
	if p < 1e-12 {
		return "< 1e-12"
	}
	return numfmt.Sig(p, 3)
}

// peq is "p = 0.0123" or "p < 1e-12".
func peq(p float64) string {
	if p < 1e-12 {
		return "p < 1e-12"
	}
	return "p = " + numfmt.Sig(p, 3)
}

var modelWords = map[fitcore.Model]string{
	fitcore.ModelOLS:      "least squares with intercept",
	fitcore.ModelOrigin:   "least squares through the origin (y = slope·x)",
	fitcore.ModelWeighted: "weighted least squares",
	fitcore.ModelDeming:   "Deming regression (x readings carry error too)",
}

var transformWords = map[fitcore.Transform]string{
	fitcore.TransformNone:       "readings as entered",
	"":                          "readings as entered",
	fitcore.TransformLogY:       "log of y",
	fitcore.TransformSqrtY:      "square root of y",
	fitcore.TransformReciprocal: "1/y",
	fitcore.TransformLogLog:     "log of x and log of y",
	fitcore.TransformBoxCox:     "Box–Cox power of y",
}

// summary is the readable form of a fit for a terminal.
func summary(name string, fr *fitResult) string {
	r := fr.report
	var b strings.Builder
	w := func(format string, a ...any) { fmt.Fprintf(&b, format, a...) }
	level := r.Level
	if level == 0 {
		level = 0.95
	}
	pct := strconv.FormatFloat(100*level, 'g', 4, 64) + " %"

	w("Straight-line fit of %s\n", name)
	w("  %d pairs used", r.N)
	if r.NSkipped > 0 {
		w(", %d row(s) skipped (see notes)", r.NSkipped)
	}
	w("; x = %s, y = %s\n", fr.xName, fr.yName)
	w("  model: %s; scale: %s; level %s\n\n", modelWords[r.Model], transformWords[r.Transform], pct)
	if r.Model == fitcore.ModelOrigin {
		w("  y = %s·x\n\n", num(r.Slope.Estimate))
	} else {
		sign, ic := "+", r.Intercept.Estimate
		if ic < 0 {
			sign, ic = "−", -ic
		}
		w("  y = %s·x %s %s\n\n", num(r.Slope.Estimate), sign, num(ic))
	}
	b.WriteString(summaryRest(fr, pct))
	return b.String()
}

func summaryRest(fr *fitResult, pct string) string {
	r := fr.report
	var b strings.Builder
	w := func(format string, a ...any) { fmt.Fprintf(&b, format, a...) }

	w("  %-10s %14s %12s %10s %10s   %s interval\n", "", "estimate", "std. error", "t", "p", pct)
	coef := func(label string, c fitcore.Coefficient) {
		w("  %-10s %14s %12s %10s %10s   %s … %s\n", label, num(c.Estimate), num(c.SE),
			numfmt.Sig(c.T, 4), pval(c.P), num(c.CILow), num(c.CIHigh))
	}
	coef("slope", r.Slope)
	if r.Model != fitcore.ModelOrigin {
		coef("intercept", r.Intercept)
	}
	w("  is the slope %s? t = %s, %s", numfmt.Full(r.Slope.Ref), numfmt.Sig(r.Slope.TRef, 4), peq(r.Slope.PRef))
	if r.Model != fitcore.ModelOrigin {
		w(".  Is the intercept %s? t = %s, %s", numfmt.Full(r.Intercept.Ref), numfmt.Sig(r.Intercept.TRef, 4), peq(r.Intercept.PRef))
	}
	w("\n\n")
	w("  r = %s   R² = %s   adjusted R² = %s\n", numfmt.Sig(r.R, 6), numfmt.Sig(r.RSquared, 6), numfmt.Sig(r.AdjRSquared, 6))
	w("  residual standard error = %s on %s df   F = %s, %s\n\n",
		num(r.ResidualSE), strconv.FormatFloat(r.DF, 'g', -1, 64), numfmt.Sig(r.F, 6), peq(r.FP))

	w("Checks\n")
	check := func(c *fitcore.Check) {
		if c == nil {
			return
		}
		stat := ""
		if c.Verdict != fitcore.NA {
			stat = fmt.Sprintf("statistic = %s, %s", numfmt.Sig(c.Statistic, 4), peq(c.P))
		}
		w("  %-5s %-16s %-32s %s\n", verdictWord(c.Verdict), c.Name, stat, oneLine(c.Message))
	}
	ch := r.Checks
	check(&ch.Curvature)
	check(ch.LackOfFit)
	check(&ch.BreuschPagan)
	check(&ch.White)
	check(&ch.DurbinWatson)
	check(&ch.Runs)
	check(&ch.ShapiroWilk)
	check(ch.XExactness)
	w("\n")

	w("Assumptions\n")
	as := func(label string, a *fitcore.Assumption) {
		if a == nil {
			return
		}
		w("  %-5s %-13s %s", verdictWord(a.Verdict), label, oneLine(a.Message))
		if a.Advice != "" {
			w(" %s", oneLine(a.Advice))
		}
		w("\n")
	}
	as("linearity", &r.Assumptions.Linearity)
	as("spread", &r.Assumptions.Spread)
	as("independence", &r.Assumptions.Independence)
	as("normality", &r.Assumptions.Normality)
	as("influence", &r.Assumptions.Influence)
	as("x exactness", r.Assumptions.XExactness)
	w("\n")

	var flagged []fitcore.PointInfluence
	for _, p := range r.Influence {
		if p.Flagged {
			flagged = append(flagged, p)
		}
	}
	if len(flagged) > 0 {
		w("Readings that stand out\n")
		for _, p := range flagged {
			line := ""
			if p.Index >= 0 && p.Index < len(fr.lines) {
				line = fmt.Sprintf(" (line %d)", fr.lines[p.Index])
			}
			w("  pair %d%s: leverage %s, studentized residual %s, Cook's distance %s",
				p.Index+1, line, numfmt.Sig(p.Leverage, 3), numfmt.Sig(p.Studentized, 3), numfmt.Sig(p.CooksD, 3))
			if len(p.Reasons) > 0 {
				w(" — %s", strings.Join(p.Reasons, "; "))
			}
			w("\n")
		}
		w("\n")
	}

	if r.BoxCox != nil {
		w("Box–Cox λ = %s (%s interval %s … %s)\n\n", numfmt.Sig(r.BoxCox.Lambda, 3), pct,
			numfmt.Sig(r.BoxCox.CILow, 3), numfmt.Sig(r.BoxCox.CIHigh, 3))
	}
	if a := r.Advice; a != nil && a.Remedy != "" {
		if a.Remedy == fitcore.RemedyNone {
			w("Advice: no change needed. %s\n\n", oneLine(a.Reason))
		} else {
			w("Advice: %s. %s\n\n", remedyWords(a.Remedy), oneLine(a.Reason))
		}
	}

	if len(r.Predictions) > 0 {
		w("Predictions (%s)\n", pct)
		w("  %14s %14s %26s %26s\n", "x", "fitted y", "interval for the line", "interval for a reading")
		for _, p := range r.Predictions {
			w("  %14s %14s %26s %26s\n", num(p.X), num(p.Fit),
				num(p.CILow)+" … "+num(p.CIHigh), num(p.PILow)+" … "+num(p.PIHigh))
		}
		w("\n")
	}
	if len(r.Inverse) > 0 {
		w("x from readings (%s)\n", pct)
		for _, v := range r.Inverse {
			w("  y = %s (mean of %d): x = %s, standard error %s, ", num(v.Y), v.M, num(v.X), num(v.SE))
			if v.Bounded {
				w("interval %s … %s", num(v.Low), num(v.High))
			} else {
				w("no finite interval")
			}
			if v.Message != "" {
				w(" — %s", oneLine(v.Message))
			}
			w("\n")
		}
		w("\n")
	}
	if r.Limits != nil {
		w("Detection limit %s, quantitation limit %s (x units)\n\n", num(r.Limits.LOD), num(r.Limits.LOQ))
	}
	if len(r.Notes) > 0 {
		w("Notes\n")
		for _, n := range r.Notes {
			w("  - %s\n", oneLine(n))
		}
		w("\n")
	}
	w("Caution: these statistics describe the readings given. Where the result affects safety\n")
	w("(gas detection, structural loads, drinking water), follow the instrument maker's procedure,\n")
	w("local codes and licensed practice.\n")
	return b.String()
}

func verdictWord(v fitcore.Verdict) string {
	switch v {
	case fitcore.Pass:
		return "ok"
	case fitcore.Warn:
		return "WARN"
	case fitcore.Fail:
		return "FAIL"
	}
	return "n/a"
}

func remedyWords(r fitcore.Remedy) string {
	switch r {
	case fitcore.RemedyLogY:
		return "fit log(y) (--transform log_y)"
	case fitcore.RemedySqrtY:
		return "fit √y (--transform sqrt_y)"
	case fitcore.RemedyReciprocal:
		return "fit 1/y (--transform reciprocal_y)"
	case fitcore.RemedyLogLog:
		return "fit log(y) on log(x) (--transform log_log)"
	case fitcore.RemedyBoxCox:
		return "fit a Box–Cox power of y (--transform box_cox)"
	case fitcore.RemedyWeighted:
		return "use a weighted fit (--weights …)"
	}
	return string(r)
}
