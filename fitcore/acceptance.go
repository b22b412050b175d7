package fitcore

import (
	"fmt"
	"math"
	"strconv"
)

// checkAcceptance compares a fitted line with acceptance criteria. Each
// criterion in use gives one CriterionResult with its value, the limit as
// text and a sentence; the line passes when every criterion passes. The
// largest residual is measured in original y units (y − back-transformed
// fit on a transformed scale) and, with MaxResidualPercentOfSpan, as a
// percentage of the span max(y) − min(y). The criteria themselves are the
// user's (common practice: minimum R², slope and intercept windows, largest
// residual); Pairline sets no defaults.
func checkAcceptance(c *Criteria, rep *Report, y []float64, residOrig []float64) *AcceptanceResult {
	res := &AcceptanceResult{Pass: true, Results: []CriterionResult{}}
	add := func(r CriterionResult) {
		if !r.Pass {
			res.Pass = false
		}
		res.Results = append(res.Results, r)
	}
	g := func(v float64) string { return strconv.FormatFloat(v, 'g', 6, 64) }
	if c.MinRSquared != nil {
		v, lim := rep.RSquared, *c.MinRSquared
		r := CriterionResult{Name: "r_squared", Value: v, Limit: "≥ " + g(lim), Pass: v >= lim}
		if r.Pass {
			r.Reason = fmt.Sprintf("R² = %s meets the minimum %s.", g(v), g(lim))
		} else {
			r.Reason = fmt.Sprintf("R² = %s is below the minimum %s: the readings scatter too much about the line.", g(v), g(lim))
		}
		add(r)
	}
	window := func(name, what string, v float64, lo, hi *float64) {
		if lo == nil && hi == nil {
			return
		}
		r := CriterionResult{Name: name, Value: v, Pass: true}
		switch {
		case lo != nil && hi != nil:
			r.Limit = g(*lo) + " to " + g(*hi)
		case lo != nil:
			r.Limit = "≥ " + g(*lo)
		default:
			r.Limit = "≤ " + g(*hi)
		}
		switch {
		case lo != nil && v < *lo:
			r.Pass = false
			r.Reason = fmt.Sprintf("The %s %s is below the lowest allowed value %s.", what, g(v), g(*lo))
		case hi != nil && v > *hi:
			r.Pass = false
			r.Reason = fmt.Sprintf("The %s %s is above the highest allowed value %s.", what, g(v), g(*hi))
		default:
			r.Reason = fmt.Sprintf("The %s %s is within %s.", what, g(v), r.Limit)
		}
		add(r)
	}
	window("slope", "slope", rep.Slope.Estimate, c.SlopeLow, c.SlopeHigh)
	if rep.Model == ModelOrigin && (c.InterceptLow != nil || c.InterceptHigh != nil) {
		add(CriterionResult{Name: "intercept", Value: 0, Limit: "not used", Pass: true,
			Reason: "The line is forced through zero, so the intercept criterion does not apply."})
	} else {
		window("intercept", "intercept", rep.Intercept.Estimate, c.InterceptLow, c.InterceptHigh)
	}
	if c.MaxResidual != nil {
		var big float64
		idx := 0
		for i, e := range residOrig {
			if a := math.Abs(e); a > big {
				big, idx = a, i
			}
		}
		lim := *c.MaxResidual
		v := big
		unit := ""
		if c.MaxResidualPercentOfSpan {
			lo, hi := rangeOf(y)
			if hi > lo {
				v = 100 * big / (hi - lo)
			}
			unit = " % of the span of y"
		}
		r := CriterionResult{Name: "max_residual", Value: v, Limit: "≤ " + g(lim) + unit, Pass: v <= lim}
		if r.Pass {
			r.Reason = fmt.Sprintf("The largest residual, %s%s, is within the limit %s%s.", g(v), unit, g(lim), unit)
		} else {
			r.Reason = fmt.Sprintf("The residual of pair %d, %s%s, exceeds the limit %s%s: check that reading.", idx+1, g(v), unit, g(lim), unit)
		}
		add(r)
	}
	failed := 0
	for _, r := range res.Results {
		if !r.Pass {
			failed++
		}
	}
	switch {
	case len(res.Results) == 0:
		res.Summary = "No acceptance criteria were set."
	case failed == 0:
		res.Summary = fmt.Sprintf("The line meets all %d acceptance criteria.", len(res.Results))
	default:
		res.Summary = fmt.Sprintf("The line fails %d of %d acceptance criteria.", failed, len(res.Results))
	}
	return res
}

func (fc *fitContext) acceptance() {
	if fc.opt.Acceptance == nil {
		return
	}
	resid := fc.rep.Residuals
	if fc.tr.kind != TransformNone {
		resid = make([]float64, len(fc.y))
		for i := range fc.y {
			fit, ok := fc.tr.backY(fc.rep.Fitted[i])
			if ok {
				resid[i] = fc.y[i] - fit
			}
		}
	}
	fc.rep.Acceptance = checkAcceptance(fc.opt.Acceptance, fc.rep, fc.y, resid)
}
