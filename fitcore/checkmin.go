package fitcore

import "fmt"

// Limits of the checks: the least number of readings each needs before
// Analyze gives it a verdict, and the one tolerance for "no scatter". They
// are the one place these numbers are written; every check and the summary
// take them from here, and a check below its minimum is n/a with a message
// that names the minimum and the reason.
//
//	check                          needs                                  source
//	curvature                      n ≥ 4 at 3 or more different x         structural: the quadratic term's t has n − 3 df
//	lack of fit                    repeats at some x, more x levels       structural: pure error needs repeats
//	                               than parameters
//	spread (Breusch–Pagan, White)  n − p ≥ MinResidualDF (4)              common practice (see MinResidualDF)
//	independence (Durbin–Watson,   n − p ≥ MinResidualDF (4)              Durbin–Watson: the bounds tables start at
//	runs)                                                                 n = 6 (Savin & White 1977; from memory);
//	                                                                      runs: also 2 residuals on each side
//	normality (Shapiro–Wilk)       n − p ≥ MinResidualDF (4)              common practice (see MinResidualDF)
//	influence                      n − p ≥ MinInfluenceDF (2)             structural: a deleted residual needs one
//	                                                                      residual df left
//	Box–Cox profile                n ≥ MinBoxCoxN (5)                     see MinBoxCoxN
//
// p is the number of fitted parameters: 2 with an intercept (ordinary,
// weighted and Deming fits), 1 through the origin.
const (
	// MinResidualDF is the least number of residual degrees of freedom,
	// n − p, for the checks that judge the pattern of the residuals:
	// spread, independence and normality. With fewer, the residuals are
	// set by the x values more than by the readings: with one residual
	// degree of freedom (three readings and an intercept) they are always
	// in the same proportions (1 : −2 : 1 for equally spaced x), so
	// Shapiro–Wilk would fail and the others pass whatever was read. Four
	// is common practice, and for Durbin–Watson it is the smallest n (6,
	// with an intercept) of the published bounds (Savin & White,
	// Econometrica 45, 1977; from memory).
	MinResidualDF = 4
	// MinInfluenceDF is the least n − p for the influence check: the
	// studentized residual leaves a reading out and needs a residual
	// degree of freedom left (Belsley, Kuh & Welsch, Regression
	// Diagnostics, 1980, §2.1).
	MinInfluenceDF = 2
	// MinCurvatureN is the least number of readings for the curvature
	// check (also at 3 or more different x): the added quadratic term
	// leaves n − 3 residual degrees of freedom for its t.
	MinCurvatureN = 4
	// MinBoxCoxN is the least number of readings for the Box–Cox profile.
	// λ is one parameter more than the line: with 3 readings some power
	// always puts them on an exact line (the likelihood is unbounded and
	// the interval has no width), with 4 one degree of freedom is left to
	// judge λ by; 5 is common practice.
	MinBoxCoxN = 5
)

// NoScatterTol is the one relative tolerance for "no scatter", shared by
// every check, the summary and the advice: the readings are taken to lie
// on their line to the precision of the arithmetic when
//
//	√(Σw·e²) ≤ NoScatterTol · √(Σw·y²)
//
// with e the residuals and y the readings on the fitted scale (w = 1
// unweighted), that is when the root-mean-square residual is at most 64ε
// (ε = 2⁻⁵² the float64 precision, 64ε ≈ 1.4e-14) of the root mean square
// of the readings. Residuals of readings exactly on a line are a few
// rounding errors of the readings themselves (y = 0.3x + 0.7 at x = 0.1 …
// 1.0 leaves residuals of 1.1e-16, about 0.6ε of the readings); a real
// instrument's scatter is millions of times larger. The root mean square
// of y includes its offset, since the rounding of a reading grows with
// its size. Then every check is n/a with NoScatterSentence.
const NoScatterTol = 64 * 0x1p-52

// NoScatterSentence is the message of every check and assumption when the
// residuals are below NoScatterTol.
const NoScatterSentence = "The readings lie on a straight line to the precision of the arithmetic, so there is no scatter to check."

// noScatterNote is the report's note when the residuals are within
// NoScatterTol of zero without being exactly zero.
const noScatterNote = "The readings lie on a straight line to the precision of the arithmetic: the residuals are rounding errors, so the standard errors, t and p values and intervals describe rounding only, and no detection limits are given."

// ckNoScatter says whether the residuals e of the readings y (fitted
// scale, weights w or nil) are within NoScatterTol of zero.
func ckNoScatter(y, e, w []float64) bool {
	wk := ckWeightScale(w)
	ny := ckWNorm(y, w, wk)
	ne := ckWNorm(e, w, wk)
	if !ckFinite(ny) || !ckFinite(ne) {
		return false
	}
	return ne <= NoScatterTol*ny
}

// ckFewDF is the message of a residual check with fewer than MinResidualDF
// residual degrees of freedom (n readings, p parameters).
func ckFewDF(name string, n, p int) string {
	return fmt.Sprintf("The %s check needs at least %d readings for this fit (%d residual degrees of freedom); there are %d. With fewer, the residuals follow from the x values more than from the readings, so their pattern says nothing.",
		name, MinResidualDF+p, MinResidualDF, n)
}

// ckFewInfluence is the influence assumption below MinInfluenceDF.
func ckFewInfluence(n, p int) Assumption {
	return Assumption{Verdict: NA, Message: fmt.Sprintf("The influence of single readings could not be checked: it needs at least %d readings for this fit; there are %d.", MinInfluenceDF+p, n)}
}

// ckClearInfluence removes the findings from per-reading influence when the
// residuals are rounding noise (ckNoScatter): the leverages stay, the
// residual-based measures are 0 (outlier p 1) and nothing is flagged.
func ckClearInfluence(infl []PointInfluence) {
	for i := range infl {
		p := &infl[i]
		p.Studentized, p.OutlierP, p.CooksD, p.DFFITS = 0, 1, 0, 0
		p.Flagged, p.Reasons = false, nil
	}
}
