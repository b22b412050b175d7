package fitcore

import (
	"math"

	"gonum.org/v1/gonum/mathext"
	"gonum.org/v1/gonum/stat/distuv"
)

// lnTCrit is the two-sided Student t quantile t_{1−α/2, df} for the
// confidence level (α = 1 − level), from gonum's distuv.StudentsT. A level
// outside [MinLevel, MaxLevel] is taken as DefaultLevel (levelOrDefault),
// so the quantile is always finite.
func lnTCrit(level, df float64) float64 {
	if !(df > 0) {
		return 0
	}
	level = levelOrDefault(level)
	return distuv.StudentsT{Mu: 0, Sigma: 1, Nu: df}.Quantile(1 - (1-level)/2)
}

// lnTwoSidedP is P(|T| ≥ |t|) for Student's t with df degrees of freedom,
// taken from the upper tail (Survival) so small p keep their digits.
func lnTwoSidedP(t, df float64) float64 {
	if !(df > 0) || math.IsNaN(t) {
		return 1
	}
	if math.IsInf(t, 0) || math.Abs(t) >= math.MaxFloat64 {
		return 0
	}
	// P(|T| ≥ |t|) = I_{df/(df+t²)}(df/2, 1/2) (Abramowitz & Stegun 26.7.1,
	// 26.5.27), direct so that tiny p are not lost to 1 − CDF.
	p := mathext.RegIncBeta(df/2, 0.5, df/(df+t*t))
	return lnClampP(p)
}

// lnFUpperP is P(F ≥ f) for the F distribution with (d1, d2) degrees of freedom.
func lnFUpperP(f, d1, d2 float64) float64 {
	if !(d1 > 0) || !(d2 > 0) || math.IsNaN(f) {
		return 1
	}
	if math.IsInf(f, 1) || f >= math.MaxFloat64 {
		return 0
	}
	if f <= 0 {
		return 1
	}
	// P(F ≥ f) = I_{d2/(d2+d1·f)}(d2/2, d1/2) (Abramowitz & Stegun 26.6.2).
	return lnClampP(mathext.RegIncBeta(d2/2, d1/2, d2/(d2+d1*f)))
}

func lnClampP(p float64) float64 {
	switch {
	case math.IsNaN(p):
		return 1
	case p < 0:
		return 0
	case p > 1:
		return 1
	}
	return p
}

// ratio divides and maps ±Inf (a zero standard error) to ±MaxFloat64 so a
// perfect fit keeps its sign without a non-finite number; 0/0 is 0.
func lnRatio(num, den float64) float64 {
	if den == 0 {
		switch {
		case num > 0:
			return math.MaxFloat64
		case num < 0:
			return -math.MaxFloat64
		}
		return 0
	}
	r := num / den
	if math.IsInf(r, 1) {
		return math.MaxFloat64
	}
	if math.IsInf(r, -1) {
		return -math.MaxFloat64
	}
	if math.IsNaN(r) {
		return 0
	}
	return r
}

// coefficient assembles the inference of one estimate with standard error
// se on df degrees of freedom: t = est/se, two-sided p, the interval
// est ± t_{1−α/2,df}·se and the test of est against ref,
// t_ref = (est − ref)/se (Draper & Smith §1.4).
func lnCoefficient(est, se, df, level, ref float64) Coefficient {
	tc := lnTCrit(level, df)
	c := Coefficient{Estimate: est, SE: se, Ref: ref}
	c.T = lnRatio(est, se)
	c.P = lnTwoSidedP(c.T, df)
	c.CILow = est - tc*se
	c.CIHigh = est + tc*se
	c.TRef = lnRatio(est-ref, se)
	c.PRef = lnTwoSidedP(c.TRef, df)
	if se == 0 {
		if est == 0 {
			c.P = 1
		}
		if est == ref {
			c.PRef = 1
		}
	}
	return c
}

// inferLS fills the coefficient inference, goodness of fit and ANOVA of a
// least-squares line (OLS, through the origin or weighted) into rep, all in
// original units:
//
//	s² = Σw·e²/df, df = n − 2 (n − 1 through the origin)
//	SE(b1) = s/√Sxx, SE(b0) = s·√(1/Σw + x̄²/Sxx), Cov(b0,b1) = −x̄·s²/Sxx
//	R² = 1 − SSE/SST with SST = Σw(y−ȳ)² (uncentred Σw·y² through the
//	origin, as NIST StRD and statsmodels), adjusted R² = 1 − (1−R²)(n−1)/df
//	(n/df through the origin), F = SSR/s² with SSR = b1²·Sxx on (1, df).
//
// Source: Draper & Smith, Applied Regression Analysis, 3rd ed., §1.3–1.4, §9.2.
func inferLS(f *lineFit, level, slopeRef, interceptRef float64, rep *Report) {
	cw := f.cw
	s2 := f.s2()
	rep.DF = f.df
	rep.ResidualSE = f.unscale(math.Sqrt(s2), 0, -1, 0) / math.Sqrt(cw)
	seB1 := f.unscale(math.Sqrt(f.v1), 1, -1, 0)
	rep.Slope = lnCoefficient(f.slope(), seB1, f.df, level, slopeRef)
	if !f.origin {
		vb0 := f.va + f.xc*f.xc*f.v1 - 2*f.xc*f.cab
		rep.Intercept = lnCoefficient(f.intercept(), f.unscale(math.Sqrt(math.Max(vb0, 0)), 0, -1, 0), f.df, level, interceptRef)
		rep.CovSlopeIntercept = f.unscale(f.cab-f.xc*f.v1, 1, -2, 0)
		rep.MeanX = f.unscale(f.xc, -1, 0, 0)
		rep.MeanY = f.unscale(f.a, 0, -1, 0)
	}
	rep.Sxx = f.unscale(f.sxx, -2, 0, -1)
	ssr := f.b1 * f.b1 * f.sxx
	r2 := 0.0
	if f.syy > 0 {
		r2 = 1 - f.sse/f.syy
	}
	rep.RSquared = math.Max(0, math.Min(1, r2))
	n := float64(f.n)
	if f.origin {
		rep.AdjRSquared = 1 - (1-rep.RSquared)*n/f.df
	} else {
		rep.AdjRSquared = 1 - (1-rep.RSquared)*(n-1)/f.df
	}
	rep.F = lnRatio(ssr, s2)
	rep.FP = lnFUpperP(rep.F, 1, f.df)
	if s2 == 0 {
		rep.FP = 0
		rep.Notes = append(rep.Notes, "The readings lie exactly on a straight line: the residuals are zero, so the standard errors are 0 and the t and F statistics are shown as the largest representable number.")
	}
	u := f.unscale(1, 0, -2, -1)
	totalDF := n - 1
	totalName := "total"
	if f.origin {
		totalDF = n
		totalName = "total (uncorrected)"
	}
	rep.Anova = []AnovaRow{
		{Source: "regression", DF: 1, SS: ssr * u, MS: ssr * u, F: rep.F, P: rep.FP},
		{Source: "residual", DF: f.df, SS: f.sse * u, MS: s2 * u},
		{Source: totalName, DF: totalDF, SS: f.syy * u},
	}
}
