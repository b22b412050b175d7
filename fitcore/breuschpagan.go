package fitcore

import "fmt"

// BreuschPagan is the studentized Breusch–Pagan test for residual spread
// that changes with x, in Koenker's form: regress the squared residuals e²
// on an intercept and x and take
//
//	LM = n·R²,  p = P(χ²(1) > LM).
//
// Sources: Breusch & Pagan, "A simple test for heteroscedasticity and random
// coefficient variation", Econometrica 47 (1979); Koenker, "A note on
// studentizing a test for heteroscedasticity", Journal of Econometrics 17
// (1981). Koenker's form does not assume normal errors. It equals
// statsmodels' het_breuschpagan with robust=True.
//
// The check is NA with a reason for fewer than 3 readings, non-finite input,
// x without spread, or residuals whose squares are all equal (e.g. all zero).
// Verdict (common practice): p < 0.01 fails, p < 0.05 warns.
func BreuschPagan(x, resid []float64) Check {
	return ckSpread("Breusch–Pagan", x, resid, false)
}

// ckSpread runs the auxiliary regression of e² on x (and on the centred
// x² when quad is true) shared by BreuschPagan and White.
func ckSpread(name string, x, resid []float64, quad bool) Check {
	if s := ckValidate(x, resid, nil, "residual"); s != "" {
		return ckNA(name, s)
	}
	n := len(x)
	df := 1.0
	minN := 3
	if quad {
		df, minN = 2, 4
	}
	if n < minN {
		return ckNA(name, fmt.Sprintf("The %s check needs at least %d readings; there are %d.", name, minN, n))
	}
	xs, ok := ckStandardize(x)
	if !ok {
		return ckNA(name, "All x values are the same, so the spread cannot be related to x.")
	}
	cols := [][]float64{xs}
	if quad {
		if ckDistinct(x) < 3 {
			return ckNA(name, "The White check needs at least 3 different x values.")
		}
		q := make([]float64, n)
		for i, v := range xs {
			q[i] = v * v
		}
		cols = append(cols, q)
	}
	e2 := make([]float64, n)
	for i, e := range resid {
		e2[i] = e * e
	}
	if s := ckFirstNonFinite("squared residual", e2); s != "" {
		return ckNA(name, "A residual is too large to square: "+s)
	}
	r2, ok := ckAuxR2(e2, cols)
	if !ok {
		return ckNA(name, "The residuals are all the same size (for example all zero), so their spread cannot change with x.")
	}
	lm := float64(n) * r2
	p := ckChi2SF(lm, df)
	c := Check{Name: name, Statistic: lm, DF: df, P: p, Verdict: ckVerdict(p, ckWarnP, ckFailP)}
	switch c.Verdict {
	case Fail:
		c.Message = fmt.Sprintf("The scatter of the readings about the line changes along x (%s statistic %.3g, %s).", name, lm, ckFmtP(p))
	case Warn:
		c.Message = fmt.Sprintf("The scatter of the readings about the line may change along x (%s statistic %.3g, %s).", name, lm, ckFmtP(p))
	default:
		c.Message = fmt.Sprintf("The scatter about the line looks even along x (%s statistic %.3g, %s).", name, lm, ckFmtP(p))
	}
	return c
}
