package fitcore

import (
	"fmt"
	"strings"
)

// The vocabulary of fitcore: every value of each option's enum, in the order
// a screen lists them, its parser, and the checks in display order. The app,
// the command and the session validation take their lists from here.

// Values lists the models in the order a screen offers them.
func (Model) Values() []Model { return []Model{ModelOLS, ModelOrigin, ModelWeighted, ModelDeming} }

// Values lists the transforms in the order a screen offers them.
func (Transform) Values() []Transform {
	return []Transform{TransformNone, TransformLogY, TransformSqrtY, TransformReciprocal, TransformLogLog, TransformBoxCox}
}

// Values lists the weight schemes, WeightsNone first.
func (WeightScheme) Values() []WeightScheme {
	return []WeightScheme{WeightsNone, WeightsGiven, WeightsX, WeightsX2, WeightsFitted2, WeightsRepeats, WeightsPowerFit}
}

// Values lists the remedies the advice can give, RemedyNone first.
func (Remedy) Values() []Remedy {
	return []Remedy{RemedyNone, RemedyLogY, RemedySqrtY, RemedyReciprocal, RemedyLogLog, RemedyBoxCox,
		RemedyWeightedX2, RemedyWeightedFitted, RemedyWeightedRepeats, RemedyWeighted}
}

// Settings gives the fit a remedy stands for: the model, the scale and the
// weights (an intercept line in every case; for RemedyBoxCox the λ is the
// advice candidate's). RemedyNone and an unknown remedy give the plain
// line.
func (r Remedy) Settings() (Model, Transform, WeightScheme) {
	switch r {
	case RemedyLogY, RemedySqrtY, RemedyReciprocal, RemedyLogLog, RemedyBoxCox:
		return ModelOLS, Transform(r), WeightsNone
	case RemedyWeighted:
		return ModelWeighted, TransformNone, WeightsPowerFit
	case RemedyWeightedX2:
		return ModelWeighted, TransformNone, WeightsX2
	case RemedyWeightedFitted:
		return ModelWeighted, TransformNone, WeightsFitted2
	case RemedyWeightedRepeats:
		return ModelWeighted, TransformNone, WeightsRepeats
	}
	return ModelOLS, TransformNone, WeightsNone
}

// Values lists the verdicts from best to "not checked".
func (Verdict) Values() []Verdict { return []Verdict{Pass, Warn, Fail, NA} }

// parseEnum finds s among values, exactly as written (Normalize uses it, so
// a parser accepts what Analyze accepts and no more); empty is accepted only
// when one of the values is empty.
func parseEnum[T ~string](option, s string, values []T) (T, error) {
	var names []string
	for _, v := range values {
		if string(v) == s {
			return v, nil
		}
		if v != "" {
			names = append(names, string(v))
		}
	}
	var zero T
	want := "use " + strings.Join(names[:len(names)-1], ", ") + " or " + names[len(names)-1]
	return zero, &OptionError{Option: option, Value: fmt.Sprintf("%q", s), Want: want}
}

// ParseModel reads a model ("ols", "origin", "weighted", "deming"). "" is
// refused: Normalize, not the parser, fills the default. The error is an
// *OptionError for option "model".
func ParseModel(s string) (Model, error) { return parseEnum("model", s, Model("").Values()) }

// ParseTransform reads a transform ("none", "log_y", …). The error is an
// *OptionError for option "transform".
func ParseTransform(s string) (Transform, error) {
	return parseEnum("transform", s, Transform("").Values())
}

// ParseWeightScheme reads a weight scheme; "" and "none" give WeightsNone.
// The error is an *OptionError for option "weights".
func ParseWeightScheme(s string) (WeightScheme, error) {
	if s == "none" {
		return WeightsNone, nil
	}
	return parseEnum("weights", s, WeightScheme("").Values())
}

// ParseRemedy reads a remedy ("none", "log_y", …, "weighted"). The error is
// an *OptionError for option "remedy".
func ParseRemedy(s string) (Remedy, error) { return parseEnum("remedy", s, Remedy("").Values()) }

// ParseVerdict reads a verdict ("pass", "warn", "fail", "n/a"). The error is
// an *OptionError for option "verdict".
func ParseVerdict(s string) (Verdict, error) { return parseEnum("verdict", s, Verdict("").Values()) }

// AssumptionID names one assumption the checks judge; its value is the key
// of Report.Assumptions in JSON and the id the screen's test hooks use.
type AssumptionID string

// The assumptions, in display order (AssumptionList).
const (
	AssumeLinearity    AssumptionID = "linearity"
	AssumeSpread       AssumptionID = "spread"
	AssumeIndependence AssumptionID = "independence"
	AssumeNormality    AssumptionID = "normality"
	AssumeInfluence    AssumptionID = "influence"
	AssumeXExactness   AssumptionID = "x_exactness"
)

// The one name of each check of an assumption, as the screen, the advice
// table, the report, the command and fitcore's own messages write it
// (app/wording takes them from here). No other name for them is used.
const (
	NameLinearity    = "Straight line"
	NameSpread       = "Even scatter"
	NameIndependence = "Independent readings (in entry order)"
	NameNormality    = "Bell-shaped scatter"
	NameInfluence    = "No single reading dominates"
	NameXExactness   = "x treated as exact"
)

// Name is the one name of the check of assumption id (the id itself for an
// unknown one).
func (id AssumptionID) Name() string {
	switch id {
	case AssumeLinearity:
		return NameLinearity
	case AssumeSpread:
		return NameSpread
	case AssumeIndependence:
		return NameIndependence
	case AssumeNormality:
		return NameNormality
	case AssumeInfluence:
		return NameInfluence
	case AssumeXExactness:
		return NameXExactness
	}
	return string(id)
}

// Word is the one word of a verdict: "Pass", "Warning", "Fail", "Not
// checked". (The warning was once shown as "Check", beside a section of
// checks; one word no section uses avoids the mix-up.)
func (v Verdict) Word() string {
	switch v {
	case Pass:
		return "Pass"
	case Warn:
		return "Warning"
	case Fail:
		return "Fail"
	}
	return "Not checked"
}

// CheckID names one statistical test; its value is the key of
// Report.Checks in JSON.
type CheckID string

// The tests, in display order (CheckList).
const (
	CheckCurvature    CheckID = "curvature"
	CheckLackOfFit    CheckID = "lack_of_fit"
	CheckBreuschPagan CheckID = "breusch_pagan"
	CheckWhite        CheckID = "white"
	CheckDurbinWatson CheckID = "durbin_watson"
	CheckRuns         CheckID = "runs"
	CheckShapiroWilk  CheckID = "shapiro_wilk"
	CheckXExactness   CheckID = "x_exactness"
)

// CheckInfo describes one test: its id, the symbol of its statistic, the
// assumption it informs, and how to take it from a report (nil when the
// report has none, as lack of fit without repeats).
type CheckInfo struct {
	ID         CheckID
	Symbol     string // t, F, χ², d, z, W
	Assumption AssumptionID
	Get        func(*Report) *Check
}

// AssumptionInfo describes one assumption: its id, the tests behind it in
// display order, and how to take it from a set of verdicts (nil when not
// judged, as x exactness without uncertainties).
type AssumptionInfo struct {
	ID    AssumptionID
	Tests []CheckID
	// Of takes the assumption from a set of verdicts: a report's, or the
	// advice's before and after a remedy.
	Of func(*Assumptions) *Assumption
}

// Get takes the assumption from a report (nil when not judged).
func (i AssumptionInfo) Get(r *Report) *Assumption { return i.Of(&r.Assumptions) }

var checkList = []CheckInfo{
	{CheckCurvature, "t", AssumeLinearity, func(r *Report) *Check { return &r.Checks.Curvature }},
	{CheckLackOfFit, "F", AssumeLinearity, func(r *Report) *Check { return r.Checks.LackOfFit }},
	{CheckBreuschPagan, "χ²", AssumeSpread, func(r *Report) *Check { return &r.Checks.BreuschPagan }},
	{CheckWhite, "χ²", AssumeSpread, func(r *Report) *Check { return &r.Checks.White }},
	{CheckDurbinWatson, "d", AssumeIndependence, func(r *Report) *Check { return &r.Checks.DurbinWatson }},
	{CheckRuns, "z", AssumeIndependence, func(r *Report) *Check { return &r.Checks.Runs }},
	{CheckShapiroWilk, "W", AssumeNormality, func(r *Report) *Check { return &r.Checks.ShapiroWilk }},
	{CheckXExactness, "z", AssumeXExactness, func(r *Report) *Check { return r.Checks.XExactness }},
}

var assumptionList = []AssumptionInfo{
	{AssumeLinearity, []CheckID{CheckCurvature, CheckLackOfFit}, func(a *Assumptions) *Assumption { return &a.Linearity }},
	{AssumeSpread, []CheckID{CheckBreuschPagan, CheckWhite}, func(a *Assumptions) *Assumption { return &a.Spread }},
	{AssumeIndependence, []CheckID{CheckDurbinWatson, CheckRuns}, func(a *Assumptions) *Assumption { return &a.Independence }},
	{AssumeNormality, []CheckID{CheckShapiroWilk}, func(a *Assumptions) *Assumption { return &a.Normality }},
	{AssumeInfluence, nil, func(a *Assumptions) *Assumption { return &a.Influence }},
	{AssumeXExactness, []CheckID{CheckXExactness}, func(a *Assumptions) *Assumption { return a.XExactness }},
}

// CheckList gives every test in display order. The slice is a copy.
func CheckList() []CheckInfo { return append([]CheckInfo(nil), checkList...) }

// AssumptionList gives every assumption in display order. The slice is a copy.
func AssumptionList() []AssumptionInfo { return append([]AssumptionInfo(nil), assumptionList...) }

// Info returns the description of the test id (ok false for an unknown id).
func (id CheckID) Info() (CheckInfo, bool) {
	for _, c := range checkList {
		if c.ID == id {
			return c, true
		}
	}
	return CheckInfo{}, false
}

// Symbol is the symbol of the statistic of test id, "statistic" for an
// unknown id.
func (id CheckID) Symbol() string {
	if c, ok := id.Info(); ok {
		return c.Symbol
	}
	return "statistic"
}

// Present gives the tests of r in display order, the absent ones left out.
func (r *Report) Present() []CheckPresent {
	var out []CheckPresent
	for _, c := range checkList {
		if k := c.Get(r); k != nil {
			out = append(out, CheckPresent{CheckInfo: c, Check: k})
		}
	}
	return out
}

// CheckPresent is one test of a report with its description.
type CheckPresent struct {
	CheckInfo
	Check *Check
}

// TestsOf gives the tests of r behind assumption a, in display order, the
// absent ones left out.
func (r *Report) TestsOf(a AssumptionID) []CheckPresent {
	var out []CheckPresent
	for _, c := range r.Present() {
		if c.Assumption == a {
			out = append(out, c)
		}
	}
	return out
}
