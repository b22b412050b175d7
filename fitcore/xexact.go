package fitcore

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/stat/distuv"
)

// XExactness asks whether the uncertainty of the x readings matters for the
// slope. Ordinary least squares treats x as exact; when x carries a standard
// uncertainty u_x its slope is biased towards zero (attenuation; Fuller,
// Measurement Error Models, 1987, §1.1). The check compares the OLS slope b
// with the Deming slope (Deming, Statistical Adjustment of Data, 1943;
// Cornbleet & Gochman, Clinical Chemistry 25, 1979):
//
//	b_D = (Syy − δSxx + √((Syy − δSxx)² + 4δSxy²)) / (2Sxy),
//
// with δ = u_y²/u_x² the ratio of the error variances. When yu = 0 the y
// error is taken from the residual standard error s of the OLS line,
// δ = s²/u_x²; that s also contains x error, so δ is somewhat too large and
// the difference is, if anything, understated. The statistic is the shift in
// units of the OLS slope's standard error,
//
//	z = (b_D − b) / SE(b),  SE(b) = s/√Sxx,
//
// and P = 2Φ(−|z|) is the p a z-test of the OLS slope against b_D (taken as
// known) would give. A bias of z standard errors makes the nominal level
// interval for the slope cover the true slope less often: with bias 0.5 SE a
// 95 % interval covers about 92 %, with 1 SE about 83 %. Verdict (our rule,
// from that coverage arithmetic): |z| < 0.5 passes, 0.5 ≤ |z| < 1 warns,
// |z| ≥ 1 fails. level (outside MinLevel…MaxLevel, 0 included, 0.95) is used for the coverage in the
// message.
//
// The check is NA when xu is not positive, inputs are invalid, there are fewer
// than 3 readings, x has no spread or the readings show no trend (Sxy = 0).
func XExactness(x, y []float64, xu, yu float64, level float64) (Check, Assumption) {
	const name = "x exactness"
	na := func(why string) (Check, Assumption) {
		return ckNA(name, why), Assumption{Verdict: NA, Message: why}
	}
	if why := xeInputsNA(x, y, xu, yu); why != "" {
		return na(why)
	}
	level = levelOrDefault(level)
	b, bd, se, why := xeSlopes(x, y, xu, yu)
	if why != "" {
		return na(why)
	}
	c := xeCheck(name, b, bd, se, level)
	a := ckXExactAssumption(c)
	return c, a
}

// xeInputsNA is why XExactness cannot check these inputs, or "".
func xeInputsNA(x, y []float64, xu, yu float64) string {
	if s := ckValidate(x, y, nil, "y value"); s != "" {
		return s
	}
	if !(xu > 0) || !ckFinite(xu) {
		return "No uncertainty was given for the x readings, so their exactness was not checked."
	}
	if !(yu >= 0) || !ckFinite(yu) {
		return fmt.Sprintf("The y uncertainty %v is not a usable number.", yu)
	}
	if n := len(x); n < 3 {
		return fmt.Sprintf("The x exactness check needs at least 3 readings; there are %d.", n)
	}
	return ""
}

// xeSlopes is the OLS slope b with its standard error se and the Deming
// slope bd with δ = u_y²/u_x² (u_y = s when yu is 0), or why they cannot
// be compared.
func xeSlopes(x, y []float64, xu, yu float64) (b, bd, se float64, why string) {
	n := len(x)
	mx, _ := ckMeanSD(x)
	my, _ := ckMeanSD(y)
	var sxx, syy, sxy float64
	for i := range x {
		dx, dy := x[i]-mx, y[i]-my
		sxx += dx * dx
		syy += dy * dy
		sxy += dx * dy
	}
	if !(sxx > 0) || !ckFinite(sxx) || !ckFinite(syy) || !ckFinite(sxy) {
		return 0, 0, 0, "All x values are the same, so no slope can be fitted."
	}
	if sxy == 0 {
		return 0, 0, 0, "The readings show no trend at all, so there is no slope to compare."
	}
	b = sxy / sxx
	sse := syy - b*sxy
	if sse < 0 {
		sse = 0
	}
	s := math.Sqrt(sse / float64(n-2))
	se = s / math.Sqrt(sxx)
	if !(se > 0) || !ckFinite(se) {
		return 0, 0, 0, "The readings lie exactly on a line, so the slope's standard error is zero and no comparison is possible."
	}
	uy := yu
	if uy == 0 {
		uy = s
	}
	delta := (uy * uy) / (xu * xu)
	bd, ok := ckDemingSlope(sxx, syy, sxy, delta)
	if !ok {
		return 0, 0, 0, "The Deming slope could not be computed for these readings."
	}
	return b, bd, se, ""
}

// xeCheck is the check's z = (bd − b)/se, its p, verdict and message with
// the coverage of the level's interval.
func xeCheck(name string, b, bd, se, level float64) Check {
	z := (bd - b) / se
	p := ckZ2(z)
	c := Check{Name: name, Statistic: z, P: p}
	az := math.Abs(z)
	switch {
	case az >= 1:
		c.Verdict = Fail
	case az >= 0.5:
		c.Verdict = Warn
	default:
		c.Verdict = Pass
	}
	zc := distuv.UnitNormal.Quantile(1 - (1-level)/2)
	cover := distuv.UnitNormal.CDF(zc-az) - distuv.UnitNormal.CDF(-zc-az)
	detail := fmt.Sprintf("slope %.6g treating x as exact, %.6g allowing for x error; difference %.2f standard errors", b, bd, z)
	if c.Verdict == Pass {
		c.Message = fmt.Sprintf("The uncertainty of the x readings is too small to matter for the slope (%s).", detail)
	} else {
		c.Message = fmt.Sprintf("The uncertainty of the x readings shifts the slope noticeably (%s); the %.0f %% interval for the slope would cover the true slope only about %.0f %% of the time.", detail, 100*level, 100*cover)
	}
	return c
}

// ckDemingSlope is the closed-form Deming slope for error-variance ratio
// δ = var(y error)/var(x error) from the centred sums (see XExactness). The
// root is written in the form that avoids cancellation when Syy − δSxx < 0.
func ckDemingSlope(sxx, syy, sxy, delta float64) (float64, bool) {
	if !(delta > 0) || !ckFinite(delta) || sxy == 0 {
		return 0, false
	}
	d := syy - delta*sxx
	root := math.Hypot(d, 2*math.Sqrt(delta)*math.Abs(sxy))
	var b float64
	if d >= 0 {
		b = (d + root) / (2 * sxy)
	} else {
		// (d + root)/(2Sxy) = 2δSxy/(root − d), no cancellation.
		b = 2 * delta * sxy / (root - d)
	}
	return b, ckFinite(b)
}

// ckXExactAssumption words the x-exactness check for the technician; z is
// the check's Statistic.
func ckXExactAssumption(c Check) Assumption {
	switch c.Verdict {
	case Pass:
		return Assumption{Verdict: Pass, Message: "The x readings are exact enough: their uncertainty hardly changes the slope."}
	case Warn, Fail:
		return Assumption{Verdict: c.Verdict,
			Message: fmt.Sprintf("The x readings are not exact enough: allowing for their uncertainty moves the slope by %.1f standard errors.", math.Abs(c.Statistic)),
			Advice:  "Use the Deming fit, which allows for error in x as well as y, or calibrate with more exact x standards."}
	}
	return Assumption{Verdict: NA, Message: c.Message}
}
