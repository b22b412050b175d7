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
	if c.MinRSquared != nil {
		res.add(acRSquared(rep.RSquared, *c.MinRSquared))
	}
	if r, ok := acWindow("slope", "slope", rep.Slope.Estimate, c.SlopeLow, c.SlopeHigh); ok {
		res.add(r)
	}
	if rep.Model == ModelOrigin && (c.InterceptLow != nil || c.InterceptHigh != nil) {
		res.add(CriterionResult{Name: "intercept", Value: 0, Limit: "not used", Pass: true,
			Reason: "The line is forced through zero, so the intercept criterion does not apply."})
	} else if r, ok := acWindow("intercept", "intercept", rep.Intercept.Estimate, c.InterceptLow, c.InterceptHigh); ok {
		res.add(r)
	}
	if c.MaxResidual != nil {
		res.add(acMaxResidual(*c.MaxResidual, c.MaxResidualPercentOfSpan, y, residOrig))
	}
	res.Summary = acSummary(res.Results)
	return res
}

// add appends one criterion's result; a failed one fails the line.
func (res *AcceptanceResult) add(r CriterionResult) {
	if !r.Pass {
		res.Pass = false
	}
	res.Results = append(res.Results, r)
}

// acG formats a value or limit of the acceptance criteria (%.6g).
func acG(v float64) string { return strconv.FormatFloat(v, 'g', 6, 64) }

// acRSquared is the criterion R² ≥ lim.
func acRSquared(v, lim float64) CriterionResult {
	g := acG
	r := CriterionResult{Name: "r_squared", Value: v, Limit: "≥ " + g(lim), Pass: v >= lim}
	if r.Pass {
		r.Reason = fmt.Sprintf("R² = %s meets the minimum %s.", g(v), g(lim))
	} else {
		r.Reason = fmt.Sprintf("R² = %s is below the minimum %s: the readings scatter too much about the line.", g(v), g(lim))
	}
	return r
}

// acWindow is the criterion lo ≤ v ≤ hi on the slope or intercept (what);
// either bound may be nil, and ok is false when both are.
func acWindow(name, what string, v float64, lo, hi *float64) (r CriterionResult, ok bool) {
	if lo == nil && hi == nil {
		return r, false
	}
	g := acG
	r = CriterionResult{Name: name, Value: v, Pass: true}
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
	return r, true
}

// acMaxResidual is the criterion max|residual| ≤ lim, in y units or, with
// percent, in percent of the span of y; a failure names the first pair
// with the largest residual.
func acMaxResidual(lim float64, percent bool, y, residOrig []float64) CriterionResult {
	g := acG
	var big float64
	idx := 0
	for i, e := range residOrig {
		if a := math.Abs(e); a > big {
			big, idx = a, i
		}
	}
	v := big
	unit := ""
	if percent {
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
	return r
}

// acSummary is the sentence that sums up the criteria's results.
func acSummary(results []CriterionResult) string {
	failed := 0
	for _, r := range results {
		if !r.Pass {
			failed++
		}
	}
	switch {
	case len(results) == 0:
		return "No acceptance criteria were set."
	case failed == 0:
		return fmt.Sprintf("The line meets all %d acceptance criteria.", len(results))
	default:
		return fmt.Sprintf("The line fails %d of %d acceptance criteria.", failed, len(results))
	}
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
