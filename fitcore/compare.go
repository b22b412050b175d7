package fitcore

import (
	"errors"
	"fmt"
	"math"
)

// CompareAlpha is the significance level of the verdict of CompareLines:
// a change is claimed when the coincidence test gives p < CompareAlpha.
const CompareAlpha = 0.01

// MaxComparePoints is the largest number of readings per line that
// CompareLines accepts; its cost is linear in the number of readings.
const MaxComparePoints = 1_000_000

// Verdicts of CompareLines.
const (
	LinesSame         = "same"
	LinesSlopeChanged = "slope changed"
	LinesMoved        = "line moved"
)

// XDifference is the difference of the converted value at one point of the
// range: a response y = a₂ + b₂·x read on today's line is converted back with
// the previous line, x₁ = (y − a₁)/b₁; Diff = x₁ − x and Percent = 100·Diff/span,
// where span is the width of today's x range.
type XDifference struct {
	X       float64 `json:"x"`
	Diff    float64 `json:"diff"`
	Percent float64 `json:"percent_of_span"`
}

// LineComparison is the result of CompareLines.
type LineComparison struct {
	N1, N2 int // readings of the previous and today's line

	Slope1, Intercept1 float64 // previous line
	Slope2, Intercept2 float64 // today's line
	CommonSlope        float64 // slope of the parallel-lines model

	SSESeparate, SSEParallel, SSECoincident float64

	// Separate lines against parallel lines (equal slopes).
	FSlopes, PSlopes float64
	DF1Slopes        int
	DF2Slopes        int
	// Parallel lines against one common line (equal intercepts given a
	// common slope): the second row of the sequential table.
	FIntercepts, PIntercepts float64
	// Separate lines against one common line (coincidence).
	FCoincident, PCoincident float64
	DF1Coincident            int
	DF2Coincident            int

	Bottom, Middle, Top XDifference

	Verdict string
}

// CompareLines compares today's calibration line (x2, y2) with a previous
// accepted one (x1, y1), both fitted by ordinary least squares.
//
// With n = n₁ + n₂ readings and residual sums of squares
//
//	SSE_sep = SSE₁ + SSE₂                              (four parameters, df n − 4)
//	SSE_par = Syy₁ + Syy₂ − (Sxy₁ + Sxy₂)²/(Sxx₁ + Sxx₂)  (common slope, df n − 3)
//	SSE_one = residual SS of one line through all readings (df n − 2)
//
// where Sxx, Sxy, Syy are centred sums within each line, the tests are
//
//	F_slopes     = (SSE_par − SSE_sep)/1 ÷ (SSE_sep/(n − 4)),  F(1, n − 4)
//	F_intercepts = (SSE_one − SSE_par)/1 ÷ (SSE_sep/(n − 4)),  F(1, n − 4)
//	F_coincident = (SSE_one − SSE_sep)/2 ÷ (SSE_sep/(n − 4)),  F(2, n − 4)
//
// the classical comparison of two straight-line regressions (Kleinbaum,
// Kupper, Muller & Nizam, "Applied Regression Analysis and Other
// Multivariable Methods", chapter on comparing two straight-line regression
// equations; cited from memory). F_slopes and F_intercepts are the rows of
// R's anova(lm(y ~ x), lm(y ~ x + g), lm(y ~ x * g)); F_coincident is
// anova(lm(y ~ x), lm(y ~ x * g)) (checked against R in compare_test.go).
//
// Verdict (a closed test, so its false-alarm rate on identical lines is
// CompareAlpha): "same" when PCoincident ≥ CompareAlpha; otherwise "slope
// changed" when PSlopes < CompareAlpha, else "line moved". The x differences
// are taken at the bottom, middle and top of today's x range.
func CompareLines(x1, y1, x2, y2 []float64) (*LineComparison, error) {
	if len(x1) != len(y1) || len(x2) != len(y2) {
		return nil, errors.New("compare lines: x and y must have the same number of readings")
	}
	if len(x1) > MaxComparePoints || len(x2) > MaxComparePoints {
		return nil, fmt.Errorf("compare lines: at most %d readings per line", MaxComparePoints)
	}
	if len(x1) < 3 || len(x2) < 3 || len(x1)+len(x2) < 5 {
		return nil, errors.New("compare lines: each line needs at least 3 readings")
	}
	s1, err := centredSums(x1, y1)
	if err != nil {
		return nil, err
	}
	s2, err := centredSums(x2, y2)
	if err != nil {
		return nil, err
	}
	if !(s1.sxx > 0) || !(s2.sxx > 0) {
		return nil, errors.New("compare lines: each line needs at least two different x values")
	}
	all := pooledSums(s1, s2)
	n := s1.n + s2.n
	c := &LineComparison{N1: int(s1.n), N2: int(s2.n)}
	c.Slope1, c.Intercept1 = s1.sxy/s1.sxx, s1.my-s1.sxy/s1.sxx*s1.mx
	c.Slope2, c.Intercept2 = s2.sxy/s2.sxx, s2.my-s2.sxy/s2.sxx*s2.mx
	sse1 := math.Max(0, s1.syy-s1.sxy*s1.sxy/s1.sxx)
	sse2 := math.Max(0, s2.syy-s2.sxy*s2.sxy/s2.sxx)
	c.SSESeparate = sse1 + sse2
	sxx, sxy := s1.sxx+s2.sxx, s1.sxy+s2.sxy
	c.CommonSlope = sxy / sxx
	c.SSEParallel = math.Max(c.SSESeparate, s1.syy+s2.syy-sxy*sxy/sxx)
	c.SSECoincident = math.Max(c.SSEParallel, all.syy-all.sxy*all.sxy/all.sxx)
	df := n - 4
	ms := c.SSESeparate / df
	c.DF1Slopes, c.DF2Slopes = 1, int(df)
	c.DF1Coincident, c.DF2Coincident = 2, int(df)
	c.FSlopes = lnRatio(c.SSEParallel-c.SSESeparate, ms)
	c.FIntercepts = lnRatio(c.SSECoincident-c.SSEParallel, ms)
	c.FCoincident = lnRatio((c.SSECoincident-c.SSESeparate)/2, ms)
	c.PSlopes = lnFUpperP(c.FSlopes, 1, df)
	c.PIntercepts = lnFUpperP(c.FIntercepts, 1, df)
	c.PCoincident = lnFUpperP(c.FCoincident, 2, df)
	switch {
	case c.PCoincident >= CompareAlpha:
		c.Verdict = LinesSame
	case c.PSlopes < CompareAlpha:
		c.Verdict = LinesSlopeChanged
	default:
		c.Verdict = LinesMoved
	}
	lo, hi := s2.min, s2.max
	span := hi - lo
	at := func(x float64) XDifference {
		y := c.Intercept2 + c.Slope2*x
		d := XDifference{X: x}
		if c.Slope1 != 0 {
			d.Diff = (y-c.Intercept1)/c.Slope1 - x
		}
		if span > 0 {
			d.Percent = 100 * d.Diff / span
		}
		return d
	}
	c.Bottom, c.Middle, c.Top = at(lo), at(lo+span/2), at(hi)
	return c, nil
}

type lineSums struct {
	n, mx, my, sxx, sxy, syy, min, max float64
}

// centredSums: means first, then centred sums (two passes, linear cost).
func centredSums(x, y []float64) (lineSums, error) {
	s := lineSums{n: float64(len(x)), min: math.Inf(1), max: math.Inf(-1)}
	for i := range x {
		if math.IsNaN(x[i]) || math.IsInf(x[i], 0) || math.IsNaN(y[i]) || math.IsInf(y[i], 0) ||
			math.Abs(x[i]) > MaxMagnitude || math.Abs(y[i]) > MaxMagnitude {
			return s, fmt.Errorf("compare lines: reading %d is not a finite number within ±%g", i+1, MaxMagnitude)
		}
		s.mx += x[i]
		s.my += y[i]
		s.min, s.max = math.Min(s.min, x[i]), math.Max(s.max, x[i])
	}
	s.mx /= s.n
	s.my /= s.n
	for i := range x {
		dx, dy := x[i]-s.mx, y[i]-s.my
		s.sxx += dx * dx
		s.sxy += dx * dy
		s.syy += dy * dy
	}
	return s, nil
}

// pooledSums combines the centred sums of two groups (the parallel-axis
// identity: S = S₁ + S₂ + n₁n₂/(n₁+n₂)·Δ·Δ).
func pooledSums(a, b lineSums) lineSums {
	n := a.n + b.n
	dx, dy := b.mx-a.mx, b.my-a.my
	k := a.n * b.n / n
	return lineSums{
		n: n, mx: (a.n*a.mx + b.n*b.mx) / n, my: (a.n*a.my + b.n*b.my) / n,
		sxx: a.sxx + b.sxx + k*dx*dx,
		sxy: a.sxy + b.sxy + k*dx*dy,
		syy: a.syy + b.syy + k*dy*dy,
		min: math.Min(a.min, b.min), max: math.Max(a.max, b.max),
	}
}
