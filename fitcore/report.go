package fitcore

// Model names the kind of straight-line fit.
type Model string

// The fit models Analyze understands.
const (
	ModelOLS      Model = "ols"      // ordinary least squares with intercept
	ModelOrigin   Model = "origin"   // least squares through the origin, y = b1·x
	ModelWeighted Model = "weighted" // weighted least squares
	ModelDeming   Model = "deming"   // Deming regression: x carries error too
)

// Transform names the scale the line is fitted on.
type Transform string

// The transforms Analyze understands. Names match the JSON of `pairline fit`.
const (
	TransformNone       Transform = "none"
	TransformLogY       Transform = "log_y"
	TransformSqrtY      Transform = "sqrt_y"
	TransformReciprocal Transform = "reciprocal_y"
	TransformLogLog     Transform = "log_log"
	TransformBoxCox     Transform = "box_cox"
)

// Remedy is what the advice recommends. Besides the transforms it can be a
// weighted fit in the original units: RemedyWeighted (an estimated variance
// power of x), RemedyWeightedX2 (w = 1/x²), RemedyWeightedFitted (w = 1/ŷ²)
// or RemedyWeightedRepeats (w = 1/s² of the repeats at each standard).
// Remedy.Settings gives the fit each stands for.
type Remedy string

// The remedies the advice can return.
const (
	RemedyNone       Remedy = "none"
	RemedyLogY       Remedy = "log_y"
	RemedySqrtY      Remedy = "sqrt_y"
	RemedyReciprocal Remedy = "reciprocal_y"
	RemedyLogLog     Remedy = "log_log"
	RemedyBoxCox     Remedy = "box_cox"
	RemedyWeighted   Remedy = "weighted" // w = |x|^(−p), p estimated (WeightsPowerFit)
	// RemedyWeightedX2 is w = 1/x² (WeightsX2): scatter proportional to x.
	RemedyWeightedX2 Remedy = "weighted_x2"
	// RemedyWeightedFitted is w = 1/ŷ² from a first unweighted fit
	// (WeightsFitted2): scatter proportional to the reading.
	RemedyWeightedFitted Remedy = "weighted_fitted2"
	// RemedyWeightedRepeats is w = 1/s² from the repeats at each standard
	// (WeightsRepeats; every standard needs 2 or more readings).
	RemedyWeightedRepeats Remedy = "weighted_repeats"
)

// WeightScheme says where the weights of a weighted fit come from.
type WeightScheme string

// The weight schemes. Weights are 1/variance, with the variance modelled as
// proportional to the named quantity.
const (
	WeightsNone     WeightScheme = ""        // unweighted
	WeightsGiven    WeightScheme = "given"   // Options.Weights as given
	WeightsX        WeightScheme = "x"       // var ∝ x        → w = 1/x
	WeightsX2       WeightScheme = "x2"      // var ∝ x²       → w = 1/x²
	WeightsFitted2  WeightScheme = "fitted2" // var ∝ ŷ²       → w = 1/ŷ² (from a first OLS pass)
	WeightsRepeats  WeightScheme = "repeats" // var from the spread of repeat readings at each x
	WeightsPowerFit WeightScheme = "power"   // var ∝ |x|^p with p estimated (used by the advice)
)

// Verdict is the outcome of a check.
type Verdict string

// The verdicts. NA means the check could not be run on these data (too few
// points, no repeats, …); its Message says why.
const (
	Pass Verdict = "pass"
	Warn Verdict = "warn"
	Fail Verdict = "fail"
	NA   Verdict = "n/a"
)

// Criteria are acceptance criteria for a calibration line. A nil pointer
// field means the criterion is not used.
type Criteria struct {
	MinRSquared   *float64 `json:"min_r_squared,omitempty" msgpack:"min_r_squared,omitempty"`
	SlopeLow      *float64 `json:"slope_low,omitempty" msgpack:"slope_low,omitempty"`
	SlopeHigh     *float64 `json:"slope_high,omitempty" msgpack:"slope_high,omitempty"`
	InterceptLow  *float64 `json:"intercept_low,omitempty" msgpack:"intercept_low,omitempty"`
	InterceptHigh *float64 `json:"intercept_high,omitempty" msgpack:"intercept_high,omitempty"`
	// MaxResidual is the largest allowed |residual|, in y units, or, when
	// MaxResidualPercentOfSpan is true, in percent of the span of y.
	MaxResidual              *float64 `json:"max_residual,omitempty" msgpack:"max_residual,omitempty"`
	MaxResidualPercentOfSpan bool     `json:"max_residual_percent_of_span,omitempty" msgpack:"max_residual_percent_of_span,omitempty"`
}

// InverseQuery asks for the x behind one observed y, or behind the mean of
// m repeat readings of the same unknown.
type InverseQuery struct {
	Y []float64 `json:"y"`
}

// Options configure Analyze. The zero value is an unweighted OLS fit with
// intercept at the 95 % level, slope tested against 1 and intercept against 0.
type Options struct {
	Model     Model     // default ModelOLS
	Transform Transform // default TransformNone
	// BoxCoxLambda fixes λ for TransformBoxCox; nil estimates it by profile likelihood.
	BoxCoxLambda *float64
	Weights      WeightScheme
	GivenWeights []float64 // used with WeightsGiven; one per pair
	Level        float64   // confidence level, MinLevel ≤ Level ≤ MaxLevel; 0 means DefaultLevel (0.95)
	// SlopeRef and InterceptRef are the values the slope and intercept are
	// tested against (the usual calibration questions: slope = 1, intercept = 0).
	// nil means 1 and 0.
	SlopeRef     *float64
	InterceptRef *float64
	// VarianceRatio is δ = var(y errors)/var(x errors) for Deming regression;
	// 0 means 1 (orthogonal regression).
	VarianceRatio float64
	// XUncertainty and YUncertainty are standard uncertainties of single
	// readings, in their units; when XUncertainty > 0 the x-exactness check
	// compares OLS with Deming.
	XUncertainty float64
	YUncertainty float64
	PredictX     []float64
	Inverse      []InverseQuery
	// XStandardUncertainties are the standard uncertainties u(xᵢ) of the
	// known values xᵢ (the certified values of the standards), one per pair
	// in x units, 0 for a value taken as exact; nil = all exact. They add
	// to the uncertainty of each inverse prediction by the law of
	// propagation of uncertainty (see Inverse.UStandards); nothing else of
	// the fit uses them. They are propagated for ModelOLS and ModelOrigin
	// without a transform; with any other model or transform the inverse
	// prediction says in its Message that they were not included.
	XStandardUncertainties []float64
	Acceptance             *Criteria
	// SkipAdvice leaves out the transform advice and the Box–Cox profile
	// (the two parts that refit the readings several times); Complete adds
	// them to such a report later.
	SkipAdvice bool
	// FlaggedInfluenceOnly keeps in Report.Influence only the readings
	// Influence flags (each with its Index, in input order) instead of one
	// entry per reading: every verdict, message and the slipped decimal
	// point are the same, and a summary of a million readings does not
	// hold a million entries it never shows (88 bytes each).
	FlaggedInfluenceOnly bool

	// noSlip: the refit without a slipped decimal point (slipClears) does
	// not look for another.
	noSlip bool
}

// Coefficient is one estimated parameter with its inference.
type Coefficient struct {
	Estimate float64 `json:"estimate"`
	SE       float64 `json:"se"`
	T        float64 `json:"t"`
	P        float64 `json:"p"`
	CILow    float64 `json:"ci_low"`
	CIHigh   float64 `json:"ci_high"`
	// Ref is the value tested against, TRef = (Estimate−Ref)/SE and PRef its
	// two-sided p.
	Ref  float64 `json:"ref"`
	TRef float64 `json:"t_ref"`
	PRef float64 `json:"p_ref"`
}

// Check is one statistical test of an assumption.
type Check struct {
	Name      string  `json:"name"`
	Statistic float64 `json:"statistic"`
	DF        float64 `json:"df,omitempty"`
	DF2       float64 `json:"df2,omitempty"`
	P         float64 `json:"p"`
	Verdict   Verdict `json:"verdict"`
	Message   string  `json:"message"`
}

// Checks holds every assumption test. LackOfFit is nil when no x repeats.
type Checks struct {
	Curvature    Check  `json:"curvature"`
	LackOfFit    *Check `json:"lack_of_fit"`
	BreuschPagan Check  `json:"breusch_pagan"`
	White        Check  `json:"white"`
	DurbinWatson Check  `json:"durbin_watson"`
	Runs         Check  `json:"runs"`
	ShapiroWilk  Check  `json:"shapiro_wilk"`
	XExactness   *Check `json:"x_exactness,omitempty"`
}

// Assumption is the combined verdict for one assumption, with the sentence
// a technician reads.
type Assumption struct {
	Verdict Verdict `json:"verdict"`
	Message string  `json:"message"`
	Advice  string  `json:"advice,omitempty"`
}

// Assumptions summarises the checks by assumption.
type Assumptions struct {
	Linearity    Assumption  `json:"linearity"`
	Spread       Assumption  `json:"spread"`
	Independence Assumption  `json:"independence"`
	Normality    Assumption  `json:"normality"`
	Influence    Assumption  `json:"influence"`
	XExactness   *Assumption `json:"x_exactness,omitempty"`
}

// PointInfluence holds the case diagnostics of one reading.
type PointInfluence struct {
	Index       int      `json:"index"` // position in the input, from 0
	Leverage    float64  `json:"leverage"`
	Residual    float64  `json:"residual"`
	Studentized float64  `json:"studentized"` // externally studentized residual
	OutlierP    float64  `json:"outlier_p"`   // Bonferroni-adjusted two-sided p
	CooksD      float64  `json:"cooks_distance"`
	DFFITS      float64  `json:"dffits"`
	Flagged     bool     `json:"flagged"`
	Reasons     []string `json:"reasons,omitempty"`
}

// AnovaRow is one line of the analysis-of-variance table.
type AnovaRow struct {
	Source string  `json:"source"`
	DF     float64 `json:"df"`
	SS     float64 `json:"ss"`
	MS     float64 `json:"ms"`
	F      float64 `json:"f,omitempty"`
	P      float64 `json:"p,omitempty"`
}

// BoxCox is the profile-likelihood estimate of the Box–Cox λ.
type BoxCox struct {
	Lambda float64 `json:"lambda"`
	CILow  float64 `json:"ci_low"`
	CIHigh float64 `json:"ci_high"`
}

// CheckSummary is the short form of the checks used in the advice's
// before/after comparison.
type CheckSummary struct {
	Assumptions   Assumptions `json:"assumptions"`
	RSquared      float64     `json:"r_squared"`
	BreuschPaganP float64     `json:"breusch_pagan_p"`
	CurvatureP    float64     `json:"curvature_p"`
}

// Candidate is one remedy the advice tried.
type Candidate struct {
	Remedy    Remedy       `json:"remedy"`
	Usable    bool         `json:"usable"`
	Why       string       `json:"why,omitempty"` // why not usable, or what it achieved
	Score     float64      `json:"score"`
	Summary   CheckSummary `json:"summary"`
	Slope     float64      `json:"slope"`
	Intercept float64      `json:"intercept"`
	Lambda    float64      `json:"lambda,omitempty"` // Box–Cox λ
	Power     float64      `json:"power,omitempty"`  // variance power for weighted
}

// Advice is the recommended remedy for spread or curvature problems.
type Advice struct {
	Remedy     Remedy        `json:"remedy"`
	Reason     string        `json:"reason"`
	Before     CheckSummary  `json:"before"`
	After      *CheckSummary `json:"after"`
	Candidates []Candidate   `json:"candidates"`
}

// Prediction is the fitted y at x with confidence and prediction intervals,
// in original units.
type Prediction struct {
	X      float64 `json:"x"`
	Fit    float64 `json:"fit"`
	CILow  float64 `json:"ci_low"`
	CIHigh float64 `json:"ci_high"`
	PILow  float64 `json:"pi_low"`
	PIHigh float64 `json:"pi_high"`
	// Message explains an interval end that could not be given (set to 0)
	// or an x outside the range of the readings.
	Message string `json:"message,omitempty"`
}

// Inverse is the x behind an observed y (or the mean of M repeats), with its
// standard error and Fieller interval. Bounded is false when the interval is
// unbounded (slope not significantly different from zero at the level);
// Low and High are then 0 (never ±Inf, so the JSON stays valid) and the
// Message says so.
type Inverse struct {
	Y       float64 `json:"y"` // mean of the repeats
	M       int     `json:"m"`
	X       float64 `json:"x"`
	SE      float64 `json:"se"`
	Low     float64 `json:"low"`
	High    float64 `json:"high"`
	Bounded bool    `json:"bounded"`
	Message string  `json:"message,omitempty"`
	// SEFit and UStandards are the two parts of SE when
	// Options.XStandardUncertainties were propagated (both 0 otherwise):
	// SEFit is the standard error from the scatter of the readings about
	// the line (the SE without the standards), UStandards the standard
	// uncertainty from the standards' values, and SE = √(SEFit² +
	// UStandards²) the combined standard uncertainty. Low and High are then
	// X ± k·SE with k = t at the level and the fit's residual degrees of
	// freedom ν (conservative: the Welch–Satterthwaite ν_eff of JCGM
	// 100:2008 G.4.1 is at least ν), in place of Fieller's interval, and
	// Message says so and gives ν_eff.
	SEFit      float64 `json:"se_fit,omitempty"`
	UStandards float64 `json:"u_standards,omitempty"`
}

// Limits are detection and quantitation limits from a calibration line:
// LOD = 3.3·σ/|b1| and LOQ = 10·σ/|b1| with σ the residual standard error.
type Limits struct {
	LOD float64 `json:"lod"`
	LOQ float64 `json:"loq"`
}

// CriterionResult is one acceptance criterion's outcome.
type CriterionResult struct {
	Name   string  `json:"name"`
	Value  float64 `json:"value"`
	Limit  string  `json:"limit"`
	Pass   bool    `json:"pass"`
	Reason string  `json:"reason"`
}

// AcceptanceResult is the pass/fail verdict of the acceptance criteria.
type AcceptanceResult struct {
	Pass    bool              `json:"pass"`
	Results []CriterionResult `json:"results"`
	Summary string            `json:"summary"`
}

// Report is everything Analyze finds, as plain values. Its JSON form is the
// output of `pairline fit --json` (snake_case keys, documented in README.md).
// Non-finite numbers never appear in it: a statistic that cannot be computed
// makes its check NA with a message.
type Report struct {
	N                 int         `json:"n"`
	NSkipped          int         `json:"n_skipped"`
	Model             Model       `json:"model"`
	Transform         Transform   `json:"transform"`
	Level             float64     `json:"level"`
	Slope             Coefficient `json:"slope"`
	Intercept         Coefficient `json:"intercept"` // zero value for ModelOrigin
	CovSlopeIntercept float64     `json:"cov_slope_intercept"`
	R                 float64     `json:"r"`
	RSquared          float64     `json:"r_squared"`
	AdjRSquared       float64     `json:"adj_r_squared"`
	ResidualSE        float64     `json:"residual_se"`
	DF                float64     `json:"df"`
	F                 float64     `json:"f"`
	FP                float64     `json:"f_p"`
	Anova             []AnovaRow  `json:"anova"`
	MeanX             float64     `json:"mean_x"`
	MeanY             float64     `json:"mean_y"`
	Sxx               float64     `json:"sxx"`

	Fitted    []float64 `json:"fitted"`    // on the fitted scale
	Residuals []float64 `json:"residuals"` // on the fitted scale

	Checks      Checks            `json:"checks"`
	Assumptions Assumptions       `json:"assumptions"`
	Influence   []PointInfluence  `json:"influence"` // one per reading; only the flagged with Options.FlaggedInfluenceOnly
	BoxCox      *BoxCox           `json:"box_cox"`
	Advice      *Advice           `json:"advice"`
	Predictions []Prediction      `json:"predictions"`
	Inverse     []Inverse         `json:"inverse"`
	Limits      *Limits           `json:"limits"`
	Acceptance  *AcceptanceResult `json:"acceptance"`
	Notes       []string          `json:"notes,omitempty"`
	// Slip is a reading that looks typed with a slipped decimal point
	// (see SlippedDecimal); nil when there is none.
	Slip *SlippedDecimal `json:"slipped_decimal,omitempty"`
	// Departures are the sizes of departures from the line in y units (see
	// Departures); nil when they could not be computed.
	Departures *Departures `json:"departures,omitempty"`
	// scrubbed counts the non-finite values scrubReport set to 0.
	scrubbed int

	// TransformLambda is the Box–Cox λ used (given or estimated); nil for
	// other transforms.
	TransformLambda *float64 `json:"transform_lambda,omitempty"`
	// Smearing is Duan's smearing factor applied to mean predictions on a
	// log scale (1 otherwise).
	Smearing float64 `json:"smearing,omitempty"`
	// Weights are the weights used by a weighted fit (nil otherwise), and
	// WeightPower the estimated variance power for WeightsPowerFit.
	Weights     []float64 `json:"weights,omitempty"`
	WeightPower float64   `json:"weight_power,omitempty"`
}
