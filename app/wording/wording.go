// Package wording holds the words Pairline shows beside its figures: the
// names of the line's numbers, the intervals and tests, the checks and
// their verdicts, the remedies. The screen, the printable report and the
// `pairline` command take them from here, so that the three read alike. It
// also holds Visible, the one function that shows text from a file without
// letting it act on a terminal or a page. Pure Go.
package wording

import (
	"math"
	"strconv"
	"strings"

	"pairline/app/numfmt"
	"pairline/fitcore"
)

// Names of the line's figures.
const (
	PairsUsed        = "Pairs used (n)"
	Slope            = "Slope"
	Intercept        = "Intercept"
	Estimate         = "Estimate"
	StandardError    = "Standard error"
	TestedAgainst    = "Tested against"
	ResidualSD       = "Residual SD"
	DegreesOfFreedom = "Degrees of freedom"
	CorrelationR     = "Correlation r"
	RSquared         = "R²"
	AdjRSquared      = "Adjusted R²"
	FLine            = "F (line explains y)"
	PofF             = "p of F"
	Covariance       = "Covariance of intercept and slope"
	MeanX            = "Mean of x"
	MeanY            = "Mean of y"
	FitAsAWhole      = "The fit as a whole"
	// MeanReading and NewReading name the two intervals of a prediction:
	// where the line (the mean reading) lies, and where one new reading is
	// expected.
	MeanReading = "Mean reading"
	NewReading  = "One new reading"
	// DetectionLimit and QuantitationLimit are LOD and LOQ (fitcore.Limits).
	DetectionLimit    = "Detection limit"
	QuantitationLimit = "Quantitation limit"
	StandsOut         = "Readings that stand out"
	// ChecksTitle heads the checks of the assumptions.
	ChecksTitle = "Can the line be trusted?"
	// Tests heads the statistical tests behind the checks.
	Tests = "Tests behind the checks"
)

// Names of the checks of the assumptions, one per fitcore.Assumptions field:
// fitcore's names (fitcore.AssumptionID.Name), which its messages use too.
const (
	CheckLinearity    = fitcore.NameLinearity
	CheckSpread       = fitcore.NameSpread
	CheckIndependence = fitcore.NameIndependence
	CheckNormality    = fitcore.NameNormality
	CheckInfluence    = fitcore.NameInfluence
	CheckXExactness   = fitcore.NameXExactness
)

// Percent writes a confidence level in percent, rounded to hide binary
// noise: 0.95 → "95 %", 0.999 → "99.9 %".
func Percent(level float64) string {
	return strconv.FormatFloat(math.Round(level*1e6)/1e4, 'f', -1, 64) + " %"
}

// Interval names a confidence interval: "95 % interval".
func Interval(level float64) string { return Percent(level) + " interval" }

// Range writes an interval's ends: "0.98 to 1.02".
func Range(low, high string) string { return low + " to " + high }

// Ref writes a value the technician typed (a reference value, a query x)
// in full, with a real minus sign.
func Ref(v float64) string {
	if v < 0 {
		return "−" + numfmt.Full(-v)
	}
	return numfmt.Full(v)
}

// TAgainst and PAgainst name the test of a coefficient against a value:
// "t (against 1)", "p (against 1)". ref is written by Ref.
func TAgainst(ref string) string { return "t (against " + ref + ")" }

// PAgainst: see TAgainst.
func PAgainst(ref string) string { return "p (against " + ref + ")" }

// ShowPlainTest says whether the test of a coefficient against 0 is shown
// beside its test against the reference value: only when the reference is
// not 0, else the two are the same test and would show the same numbers twice.
func ShowPlainTest(ref float64) bool { return ref != 0 }

// P writes a p-value in Pairline's one form (numfmt.P): "< 0.001",
// "0.0043", "0.43", "> 0.99".
func P(p float64) string { return numfmt.P(p) }

// PEq is "p = 0.012", "p < 0.001" or "p > 0.99" (numfmt.PEq).
func PEq(p float64) string { return numfmt.PEq(p) }

// SlopeUnit names the unit of a slope, y unit per x unit ("mV per mg/L");
// when both are the same unit the slope is a plain ratio and is said so
// ("ratio"), not "µS/cm per µS/cm". An empty unit is written "y unit",
// "x unit".
func SlopeUnit(yUnit, xUnit string) string {
	y, x := strings.TrimSpace(yUnit), strings.TrimSpace(xUnit)
	if y != "" && y == x {
		return "ratio"
	}
	if y == "" {
		y = "y unit"
	}
	if x == "" {
		x = "x unit"
	}
	return y + " per " + x
}

// DF writes degrees of freedom: whole numbers as such, others (Welch-like
// or weighted) with 4 significant digits.
func DF(df float64) string {
	if df == math.Trunc(df) && math.Abs(df) < 1e15 {
		return strconv.FormatInt(int64(df), 10)
	}
	return numfmt.Sig(df, 4)
}

// Verdict gives the icon and the word of a check's verdict.
func Verdict(v fitcore.Verdict) (icon, word string) {
	switch v {
	case fitcore.Pass:
		icon = "✔"
	case fitcore.Warn:
		icon = "▲"
	case fitcore.Fail:
		icon = "✖"
	default:
		icon = "○"
	}
	return icon, v.Word()
}

// CheckName names an assumption the checks judge (fitcore.AssumptionID.Name).
func CheckName(id fitcore.AssumptionID) string { return id.Name() }

// TestP names the p of a test in the advice table: "p of Breusch–Pagan".
func TestP(name string) string { return "p of " + name }

// Remedy says what the advice recommends, as a short instruction.
func Remedy(r fitcore.Remedy) string {
	switch r {
	case fitcore.RemedyNone:
		return "No change recommended"
	case fitcore.RemedyLogY:
		return "Fit ln y against x"
	case fitcore.RemedyLogLog:
		return "Fit on log scales: ln y against ln x"
	case fitcore.RemedySqrtY:
		return "Fit √y against x"
	case fitcore.RemedyReciprocal:
		return "Fit 1/y against x"
	case fitcore.RemedyBoxCox:
		return "Fit on a Box–Cox scale of y"
	case fitcore.RemedyWeighted:
		return "Weight the readings by an estimated power of x"
	case fitcore.RemedyWeightedX2:
		return "Weight the readings by 1/x²"
	case fitcore.RemedyWeightedFitted:
		return "Weight the readings by 1/ŷ²"
	case fitcore.RemedyWeightedRepeats:
		return "Weight the readings by 1/s² of their repeats"
	}
	return string(r)
}

// RemedyAction is Remedy as the end of a sentence ("Recommended: fit ln y
// against x."): the same words, the first letter small.
func RemedyAction(r fitcore.Remedy) string {
	s := Remedy(r)
	if s != "" && s[0] >= 'A' && s[0] <= 'Z' {
		s = string(s[0]+'a'-'A') + s[1:]
	}
	return s
}

// RemedyTag names the fit a remedy gives in a few words, for the heading
// of its column ("After (ln y)", "After (ln y on ln x)", "After (weighted
// 1/x²)"): a log–log fit names both scales.
func RemedyTag(r fitcore.Remedy) string {
	_, t, w := r.Settings()
	switch {
	case w != fitcore.WeightsNone:
		return "weighted " + WeightTag(w)
	case t == fitcore.TransformBoxCox:
		return "power of y"
	case t == fitcore.TransformLogLog:
		return "ln y on ln x"
	case t != fitcore.TransformNone:
		return FittedY(t, nil)
	}
	return ""
}

// WeightTag names a weight scheme in a few symbols: "1/x²", "1/ŷ²",
// "1/s² of repeats", "|x|^−p".
func WeightTag(w fitcore.WeightScheme) string {
	switch w {
	case fitcore.WeightsX:
		return "1/x"
	case fitcore.WeightsX2:
		return "1/x²"
	case fitcore.WeightsFitted2:
		return "1/ŷ²"
	case fitcore.WeightsRepeats:
		return "1/s² of repeats"
	case fitcore.WeightsPowerFit:
		return "|x|^−p"
	case fitcore.WeightsGiven:
		return "as given"
	}
	return ""
}

// Model names the kind of fit.
func Model(m fitcore.Model) string {
	switch m {
	case fitcore.ModelOLS, "":
		return "ordinary least squares"
	case fitcore.ModelOrigin:
		return "least squares through zero"
	case fitcore.ModelWeighted:
		return "weighted least squares"
	case fitcore.ModelDeming:
		return "Deming (errors in x and y)"
	}
	return string(m)
}

// Scale names the scale a transform fits on, "" for the readings as
// entered.
func Scale(t fitcore.Transform) string {
	switch t {
	case fitcore.TransformLogY:
		return "ln y"
	case fitcore.TransformLogLog:
		return "ln y (against ln x)"
	case fitcore.TransformSqrtY:
		return "√y"
	case fitcore.TransformReciprocal:
		return "1/y"
	case fitcore.TransformBoxCox:
		return "Box–Cox"
	}
	return ""
}

// Fit describes a fit: "ordinary least squares", "weighted least squares,
// fitted on the ln y scale".
func Fit(m fitcore.Model, t fitcore.Transform) string {
	s := Model(m)
	if sc := Scale(t); sc != "" {
		s += ", fitted on the " + sc + " scale"
	}
	return s
}

// The acceptance stamp.
const (
	Accepted    = "✔ ACCEPTED"
	NotAccepted = "✖ NOT ACCEPTED"
	// Met and NotMet are the outcome of one acceptance criterion.
	Met    = "✔ met"
	NotMet = "✖ not met"
)

// FittedY names the quantity a fit's line gives, on the scale it was fitted
// on: "y", "ln y", "√y", "1/y", "Box–Cox y (λ = 0.5)".
func FittedY(t fitcore.Transform, lambda *float64) string {
	switch t {
	case fitcore.TransformLogY, fitcore.TransformLogLog:
		return "ln y"
	case fitcore.TransformSqrtY:
		return "√y"
	case fitcore.TransformReciprocal:
		return "1/y"
	case fitcore.TransformBoxCox:
		if lambda != nil {
			return "Box–Cox y (λ = " + numfmt.Sig(*lambda, 3) + ")"
		}
		return "Box–Cox y"
	}
	return "y"
}

// Equation writes the fitted line on the scale it was fitted on, its two
// numbers written by num: "y = a + b · x", "ln y = a + b · ln x" for a
// log–log fit, "y = b · x" through zero. The screen, the report and the
// command all write the line with it.
func Equation(rep *fitcore.Report, num func(float64) string) string {
	x := "x"
	if rep.Transform == fitcore.TransformLogLog {
		x = "ln x"
	}
	lhs := FittedY(rep.Transform, rep.TransformLambda)
	b := num(rep.Slope.Estimate) + " · " + x
	if rep.Model == fitcore.ModelOrigin {
		return lhs + " = " + b
	}
	return lhs + " = " + num(rep.Intercept.Estimate) + " + " + b
}
