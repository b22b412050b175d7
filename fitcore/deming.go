package fitcore

import (
	"fmt"
	"math"
)

// demingSlope is the Deming slope for centred sums and variance ratio
// δ = var(y errors)/var(x errors):
//
//	b1 = (D + √(D² + 4δ·Sxy²)) / (2·Sxy),  D = Syy − δ·Sxx
//
// evaluated as 2δ·Sxy/(√(D²+4δSxy²) − D) when D < 0 to avoid cancellation.
// δ = 1 gives orthogonal regression. Source: Deming, Statistical Adjustment
// of Data (1943); Linnet, Clin. Chem. 39 (1993) 424–432.
func demingSlope(sxx, syy, sxy, delta float64) float64 {
	if sxy == 0 {
		return math.NaN()
	}
	d := syy - delta*sxx
	q := math.Hypot(d, 2*math.Sqrt(delta)*sxy)
	if d >= 0 {
		return (d + q) / (2 * sxy)
	}
	return 2 * delta * sxy / (q - d)
}

// fitDeming fits Deming regression with variance ratio delta (original
// units) and estimates the variances of the slope and of the line at x̄ by
// the leave-one-out jackknife, var_J(θ) = (n−1)/n·Σ(θ_(i) − θ̄_(·))²
// (Linnet 1993). The leave-one-out sums are downdated in O(1) each,
// Sxx_(i) = Sxx − n/(n−1)·(x_i − x̄)² and likewise for Syy and Sxy, so the
// jackknife costs O(n). Residuals are vertical, y − ŷ.
func fitDeming(x, y []float64, delta float64) (*lineFit, error) {
	f, err := fitLS(x, y, nil, false)
	if err != nil {
		return nil, err
	}
	ds := math.Ldexp(delta, 2*lg2(f.ky)-2*lg2(f.kx))
	b1 := demingSlope(f.sxx, f.syy, f.sxy, ds)
	if !isFiniteNum(b1) {
		if f.sxy == 0 {
			return nil, fmt.Errorf("%w: x and y are uncorrelated (Sxy = 0), so the Deming line is undetermined", ErrDegenerate)
		}
		// Only an extreme ratio of units and δ gets here (δ is bounded by
		// Normalize): say so rather than blame the readings.
		return nil, fmt.Errorf("%w: the Deming line cannot be computed with variance ratio %s for readings of these sizes; rescale the units of x or y", ErrOutOfRange, formatValue(delta))
	}
	f.b1 = b1
	n := f.n
	nf := float64(n)
	c := nf / (nf - 1)
	var sb, sa lnKSum
	bs := make([]float64, n)
	as := make([]float64, n)
	for i := range n {
		dx := x[i]*f.kx - f.xc
		dy := y[i]*f.ky - f.a
		bi := demingSlope(f.sxx-c*dx*dx, f.syy-c*dy*dy, f.sxy-c*dx*dy, ds)
		if !isFiniteNum(bi) {
			return nil, &DataError{Index: i, Column: "x", Value: x[i], Err: ErrDegenerate,
				Hint: "Leaving this reading out leaves no Deming line, so the jackknife standard errors cannot be computed."}
		}
		// Line value at the full-data x̄ for the fit without reading i.
		ai := f.a - dy/(nf-1) + bi*dx/(nf-1)
		bs[i], as[i] = bi, ai
		sb.add(bi)
		sa.add(ai)
	}
	mb, ma := sb.val()/nf, sa.val()/nf
	var vb, va, cab lnKSum
	for i := range n {
		db, da := bs[i]-mb, as[i]-ma
		vb.add(db * db)
		va.add(da * da)
		cab.add(db * da)
	}
	k := (nf - 1) / nf
	f.v1, f.va, f.cab = k*vb.val(), k*va.val(), k*cab.val()
	f.b0 = ckFMA(-b1, f.xc, f.a)
	f.sse = f.residualSS(x, y)
	f.df = nf - 2
	return f, nil
}

// inferDeming fills the inference of a Deming line: jackknife standard
// errors, t on n − 2 degrees of freedom, residual SE from the vertical
// residuals, r the Pearson correlation, R² = r², and F = r²(n−2)/(1−r²)
// the test of zero correlation. No ANOVA table: the Deming line does not
// split the sum of squares.
func inferDeming(f *lineFit, level, slopeRef, interceptRef float64, rep *Report) {
	rep.DF = f.df
	rep.ResidualSE = f.unscale(math.Sqrt(f.s2()), 0, -1, 0)
	rep.Slope = lnCoefficient(f.slope(), f.unscale(math.Sqrt(f.v1), 1, -1, 0), f.df, level, slopeRef)
	vb0 := f.va + f.xc*f.xc*f.v1 - 2*f.xc*f.cab
	rep.Intercept = lnCoefficient(f.intercept(), f.unscale(math.Sqrt(math.Max(vb0, 0)), 0, -1, 0), f.df, level, interceptRef)
	rep.CovSlopeIntercept = f.unscale(f.cab-f.xc*f.v1, 1, -2, 0)
	rep.MeanX, rep.MeanY = f.unscale(f.xc, -1, 0, 0), f.unscale(f.a, 0, -1, 0)
	rep.Sxx = f.unscale(f.sxx, -2, 0, 0)
	r := f.pearsonR()
	rep.RSquared = r * r
	n := float64(f.n)
	rep.AdjRSquared = 1 - (1-rep.RSquared)*(n-1)/f.df
	rep.F = lnRatio(rep.RSquared*f.df, 1-rep.RSquared)
	rep.FP = lnFUpperP(rep.F, 1, f.df)
	rep.Anova = []AnovaRow{}
	rep.Notes = append(rep.Notes, "Deming regression: standard errors by the leave-one-out jackknife; residuals are vertical distances to the line.")
}
