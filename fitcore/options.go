package fitcore

import (
	"fmt"
	"math"
)

// Defaults and ranges of the options. They are the one place these numbers
// are written; the app, the command and the session validation use them.
const (
	// DefaultLevel is the confidence level used when Options.Level is 0.
	DefaultLevel = 0.95
	// MinLevel and MaxLevel bound Options.Level. Below 0.5 an "interval"
	// covers the truth less often than not; above 0.9999 the t and χ²
	// quantiles behind the intervals and the Box–Cox profile leave the range
	// where they are accurate (common practice: 0.90, 0.95 and 0.99 are the
	// levels calibration procedures ask for).
	MinLevel = 0.5
	MaxLevel = 0.9999
	// MaxBoxCoxLambda bounds |Options.BoxCoxLambda|. Powers beyond ±5 raise
	// readings to sizes no calibration uses and overflow for ordinary values
	// (common practice: Box–Cox profiles are searched over −2…2).
	MaxBoxCoxLambda = 5.0
	// MinVarianceRatio and MaxVarianceRatio bound Options.VarianceRatio
	// (Deming's δ); outside them one variable's errors are a million times
	// the other's and ordinary or inverse least squares is the honest fit.
	MinVarianceRatio = 1e-6
	MaxVarianceRatio = 1e6
	// MaxMagnitude bounds the size of every reading, of every x to predict
	// at, of every reading of an unknown to read back, of the reference
	// values and of the reading uncertainties. The report gives sums of
	// squares (Sxx, the ANOVA table) and variances in the units of the
	// readings; beyond about 1e150 those overflow float64 (1.8e308) for
	// ordinary numbers of readings. No instrument reads such values in
	// sensible units, so they are refused with the advice to rescale.
	MaxMagnitude = 1e150
)

// levelOrDefault returns level when it lies in [MinLevel, MaxLevel] and
// DefaultLevel otherwise (NaN included). Every internal function that takes
// a quantile at a level goes through it, so none can be handed a level its
// quantile functions reject (gonum panics for levels near 0 or 1).
func levelOrDefault(level float64) float64 {
	if level >= MinLevel && level <= MaxLevel {
		return level
	}
	return DefaultLevel
}

// OptionError reports an option value that is out of range, unknown, or
// does not go with another option. Option is the option's key as the
// session file and the command spell it with underscores ("level",
// "box_cox_lambda", "variance_ratio", "model", "weights", "transform",
// "slope_ref", "intercept_ref", "x_uncertainty", "y_uncertainty"); Value is
// the value given, as text; Want says what is accepted. It wraps ErrBadOption.
type OptionError struct {
	Option string
	Value  string
	Want   string
}

// Error gives one sentence naming the option, the value and the accepted range.
func (e *OptionError) Error() string {
	return fmt.Sprintf("%v: %s = %s: %s", ErrBadOption, e.Option, e.Value, e.Want)
}

// Unwrap returns ErrBadOption so errors.Is works.
func (e *OptionError) Unwrap() error { return ErrBadOption }

func optErr(option, value, want string, args ...any) *OptionError {
	return &OptionError{Option: option, Value: value, Want: fmt.Sprintf(want, args...)}
}

// Normalize fills the defaults of o (model ols, transform none, level
// DefaultLevel, Deming δ = 1, a weighted model from the weights) and checks
// every value against its range and against the other options. It is the one
// validation of options: Analyze calls it, and so do the session validation
// and the command before they accept a value. The error is an *OptionError.
//
// It runs in stages, each needing what the one before settled: the
// defaults and the level, the names (model, transform, weights), the
// model and weights together, the model's own settings (Deming's δ,
// Box–Cox's λ), and last the numbers given with the readings. On an error
// the options are returned as far as they were filled.
func (o Options) Normalize() (Options, error) {
	for _, stage := range []func(*Options) error{
		(*Options).fillDefaults,
		(*Options).checkNames,
		(*Options).reconcileWeights,
		(*Options).checkModelSettings,
		(*Options).checkMagnitudes,
	} {
		if err := stage(&o); err != nil {
			return o, err
		}
	}
	return o, nil
}

// fillDefaults gives the empty model, transform and level their defaults
// and checks the level: 0 means DefaultLevel, anything else outside
// [MinLevel, MaxLevel] (NaN included) is refused.
func (o *Options) fillDefaults() error {
	if o.Model == "" {
		o.Model = ModelOLS
	}
	if o.Transform == "" {
		o.Transform = TransformNone
	}
	if o.Level == 0 {
		o.Level = DefaultLevel
	}
	if !(o.Level >= MinLevel && o.Level <= MaxLevel) {
		return optErr("level", formatValue(o.Level), "the confidence level must be from %g to %g (for example 0.95 for 95 %%)", MinLevel, MaxLevel)
	}
	return nil
}

// checkNames checks that the model, transform and weight scheme are names
// fitcore knows, before any rule below compares them.
func (o *Options) checkNames() error {
	if _, err := ParseModel(string(o.Model)); err != nil {
		return err
	}
	if _, err := ParseTransform(string(o.Transform)); err != nil {
		return err
	}
	if _, err := parseEnum("weights", string(o.Weights), WeightScheme("").Values()); err != nil {
		return err
	}
	return nil
}

// reconcileWeights makes the model and the weights agree, the one place
// where "weights imply a weighted model" is written: a weighted model with
// no scheme takes the given weights (and needs some), an OLS line with a
// scheme becomes weighted, and the line through the origin and Deming
// regression take no weights.
func (o *Options) reconcileWeights() error {
	if o.Model == ModelWeighted && o.Weights == WeightsNone {
		if o.GivenWeights == nil {
			return optErr("weights", "none", "a weighted fit needs weights: give them, or say where they come from (x, x2, fitted2, repeats or power)")
		}
		o.Weights = WeightsGiven
	}
	if o.Model == ModelOLS && o.Weights != WeightsNone {
		o.Model = ModelWeighted
	}
	if o.Model == ModelOrigin && o.Weights != WeightsNone {
		return optErr("weights", string(o.Weights), "a line through the origin is fitted without weights; choose the weighted model instead")
	}
	if o.Model == ModelDeming && o.Weights != WeightsNone {
		return optErr("weights", string(o.Weights), "Deming regression does not take weights")
	}
	return nil
}

// checkModelSettings fills and checks the settings that belong to one
// model or transform: Deming's variance ratio δ (0 means 1 for Deming; a
// ratio given with another model must still be in range) and a fixed
// Box–Cox λ, which must be in range and goes only with the box_cox
// transform.
func (o *Options) checkModelSettings() error {
	if o.Model == ModelDeming && o.VarianceRatio == 0 {
		o.VarianceRatio = 1
	}
	if o.VarianceRatio != 0 && !(o.VarianceRatio >= MinVarianceRatio && o.VarianceRatio <= MaxVarianceRatio) {
		return optErr("variance_ratio", formatValue(o.VarianceRatio), "the variance ratio of Deming regression must be from %g to %g (1 when x and y errors are alike)", MinVarianceRatio, MaxVarianceRatio)
	}
	if o.BoxCoxLambda != nil {
		l := *o.BoxCoxLambda
		if !(math.Abs(l) <= MaxBoxCoxLambda) {
			return optErr("box_cox_lambda", formatValue(l), "the Box–Cox power must be from %g to %g", -MaxBoxCoxLambda, MaxBoxCoxLambda)
		}
		if o.Transform != TransformBoxCox {
			return optErr("box_cox_lambda", formatValue(l), "a Box–Cox power goes only with the box_cox transform (this fit uses %s)", o.Transform)
		}
	}
	return nil
}

// checkMagnitudes bounds every number given beside the readings (reference
// values, reading uncertainties, x values to predict at, the standards'
// uncertainties, readings of unknowns) by MaxMagnitude, so that no fit
// downstream meets an Inf or NaN it did not make; uncertainties must also
// not be negative. The first value out of range is named, with its place.
func (o *Options) checkMagnitudes() error {
	for _, r := range []struct {
		name string
		p    *float64
	}{{"slope_ref", o.SlopeRef}, {"intercept_ref", o.InterceptRef}} {
		if r.p != nil && !(math.Abs(*r.p) <= MaxMagnitude) {
			return optErr(r.name, formatValue(*r.p), "a reference value must be a finite number of at most %g in size", MaxMagnitude)
		}
	}
	for _, u := range []struct {
		name string
		v    float64
	}{{"x_uncertainty", o.XUncertainty}, {"y_uncertainty", o.YUncertainty}} {
		if !(u.v >= 0 && u.v <= MaxMagnitude) {
			return optErr(u.name, formatValue(u.v), "a reading uncertainty must be zero or a positive number of at most %g", MaxMagnitude)
		}
	}
	for i, v := range o.PredictX {
		if !(math.Abs(v) <= MaxMagnitude) {
			return optErr("predict_x", formatValue(v), "x value %d to predict at must be a finite number of at most %g in size; rescale the units", i+1, MaxMagnitude)
		}
	}
	for i, u := range o.XStandardUncertainties {
		if !(u >= 0 && u <= MaxMagnitude) {
			return optErr("x_standard_uncertainties", formatValue(u), "the standard uncertainty of known value %d must be zero or a positive number of at most %g", i+1, MaxMagnitude)
		}
	}
	for i, q := range o.Inverse {
		for j, v := range q.Y {
			if !(math.Abs(v) <= MaxMagnitude) {
				return optErr("inverse_y", formatValue(v), "reading %d of unknown %d must be a finite number of at most %g in size; rescale the units", j+1, i+1, MaxMagnitude)
			}
		}
	}
	return nil
}
