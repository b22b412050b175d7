package fitcore

import (
	"pairline/app/numfmt"

	"fmt"
	"math"
)

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
// Verdict: p < CheckFailP fails, p < CheckWarnP warns (DEVELOPERS.md "How the checks decide").
func BreuschPagan(x, resid []float64) Check {
	return ckSpread("Breusch–Pagan", x, resid, false, nil)
}

// ckSpread runs the auxiliary regression of e² on x (and on the centred
// x² when quad is true) shared by BreuschPagan and White; pre is what is
// known about x (nil: work it out).
func ckSpread(name string, x, resid []float64, quad bool, pre *ckPre) Check {
	if pre == nil || !pre.residValid {
		if s := ckValidate(x, resid, nil, "residual"); s != "" {
			return ckNA(name, s)
		}
	}
	n := len(x)
	minN := 3
	if quad {
		minN = 4
	}
	if n < minN {
		return ckNA(name, fmt.Sprintf("The %s check needs at least %d readings; there are %d.", name, minN, n))
	}
	if pre == nil {
		pre = ckPrepare(x)
	}
	if !pre.ok {
		return ckNA(name, "All x values are the same, so the spread cannot be related to x.")
	}
	if quad && pre.distinct < 3 {
		return ckNA(name, "The White check needs at least 3 different x values.")
	}
	bs := &pre.basis
	df := 1.0
	if quad {
		df = 2
	}
	sq := pre.sqMoments(resid)
	if !ckFinite(sq.big) {
		for i, e := range resid {
			if !ckFinite(e * e) {
				return ckNA(name, fmt.Sprintf("A residual is too large to square: Reading %d has a squared residual that is not a number (%v).", i+1, e*e))
			}
		}
	}
	r2, ok := ckSpreadR2With(x, resid, bs, quad, &sq, pre)
	if !ok {
		return ckNA(name, "The residuals are all the same size (for example all zero), so their spread cannot change with x.")
	}
	lm := float64(n) * r2
	p := ckChi2SF(lm, df)
	c := Check{Name: name, Statistic: lm, DF: df, P: p, Verdict: ckVerdict(p, ckWarnP, ckFailP)}
	switch c.Verdict {
	case Fail:
		c.Message = fmt.Sprintf("The scatter of the readings about the line changes along x (%s statistic %s, %s).", name, numfmt.Short(lm, 3), ckFmtP(p))
	case Warn:
		c.Message = fmt.Sprintf("The scatter of the readings about the line may change along x (%s statistic %s, %s).", name, numfmt.Short(lm, 3), ckFmtP(p))
	default:
		c.Message = fmt.Sprintf("The scatter about the line looks even along x (%s statistic %s, %s).", name, numfmt.Short(lm, 3), ckFmtP(p))
	}
	return c
}

// ckSqMoments are the largest e², the mean of e² and its root mean
// square deviation, as ckSpreadR2With takes them.
type ckSqMoments struct {
	big, mean, rms float64
}

// ckNewSqMoments works out the moments of e² for the residuals resid: the
// largest and the mean in one pass, then the deviations about the mean
// with the compensated second pass (Chan, Golub & LeVeque).
func ckNewSqMoments(resid []float64) ckSqMoments {
	var m ckSqMoments
	var mean float64
	for _, e := range resid {
		m.big = posMax(m.big, e*e)
		mean += e * e
	}
	n := float64(len(resid))
	mean /= n
	var ss, corr float64
	for _, e := range resid {
		d := e*e - mean
		ss += d * d
		corr += d
	}
	ss -= corr * corr / n
	if ss < 0 {
		ss = 0
	}
	m.mean = mean + corr/n
	m.rms = math.Sqrt(ss / n)
	return m
}

// sqMoments is ckNewSqMoments(resid), worked out once for the checks of
// one run that ask about the same residuals (Breusch–Pagan, then White).
func (p *ckPre) sqMoments(resid []float64) ckSqMoments {
	if len(resid) == 0 {
		return ckNewSqMoments(resid)
	}
	if len(p.sqOf) != len(resid) || &p.sqOf[0] != &resid[0] {
		p.sqOf, p.sq, p.sqFirstOK = resid, ckNewSqMoments(resid), false
	}
	return p.sq
}

// ckSpreadR2With is the R² of the auxiliary regression of v = e²
// standardized (centred and scaled by its rms) on the basis bs,
// R² = 1 − SSE/n, with the moments of e² in sq (ckNewSqMoments); ok is false
// when e² has no spread or a basis member is degenerate. pre, when not nil,
// is where sq came from (sqMoments), and keeps the first pass of the
// projection for the other of Breusch–Pagan and White.
func ckSpreadR2With(x, resid []float64, bs *ckBasis, quad bool, sq *ckSqMoments, pre *ckPre) (float64, bool) {
	n := float64(len(resid))
	mean, rms := sq.mean, sq.rms
	if rms == 0 || !ckFinite(rms) {
		return 0, false
	}
	if !bs.okD || (quad && !bs.okG) {
		return 0, false
	}
	is := 1 / rms
	var f1 ckFirstPass
	switch {
	case pre != nil && pre.sqFirstOK:
		f1 = pre.sqFirst
	case pre != nil:
		// With the quadratic sum as well when White can use it.
		f1 = bs.firstPass(x, nil, bs.okG, resid, true, mean, is)
		pre.sqFirst, pre.sqFirstOK = f1, bs.okG
	default:
		f1 = bs.firstPass(x, nil, quad, resid, true, mean, is)
	}
	f := bs.projectFrom(f1, x, nil, quad, resid, true, mean, is)
	r2 := 1 - f.sse/n
	if r2 < 0 {
		r2 = 0
	}
	if r2 > 1 {
		r2 = 1
	}
	return r2, ckFinite(r2)
}
