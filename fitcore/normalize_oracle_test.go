package fitcore

import (
	"fmt"
	"math"
	"testing"
)

// normalizeOracle is Options.Normalize as it was before it was split into
// stages (one function of cyclomatic complexity 39), kept unchanged as the
// oracle of TestNormalizeMatchesOracle and FuzzNormalizeMatchesOracle.
func (o Options) normalizeOracle() (Options, error) {
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
		return o, optErr("level", formatValue(o.Level), "the confidence level must be from %g to %g (for example 0.95 for 95 %%)", MinLevel, MaxLevel)
	}
	if _, err := ParseModel(string(o.Model)); err != nil {
		return o, err
	}
	if _, err := ParseTransform(string(o.Transform)); err != nil {
		return o, err
	}
	if _, err := parseEnum("weights", string(o.Weights), WeightScheme("").Values()); err != nil {
		return o, err
	}
	if o.Model == ModelWeighted && o.Weights == WeightsNone {
		if o.GivenWeights == nil {
			return o, optErr("weights", "none", "a weighted fit needs weights: give them, or say where they come from (x, x2, fitted2, repeats or power)")
		}
		o.Weights = WeightsGiven
	}
	if o.Model == ModelOLS && o.Weights != WeightsNone {
		o.Model = ModelWeighted
	}
	if o.Model == ModelOrigin && o.Weights != WeightsNone {
		return o, optErr("weights", string(o.Weights), "a line through the origin is fitted without weights; choose the weighted model instead")
	}
	if o.Model == ModelDeming {
		if o.Weights != WeightsNone {
			return o, optErr("weights", string(o.Weights), "Deming regression does not take weights")
		}
		if o.VarianceRatio == 0 {
			o.VarianceRatio = 1
		}
	}
	if o.VarianceRatio != 0 && !(o.VarianceRatio >= MinVarianceRatio && o.VarianceRatio <= MaxVarianceRatio) {
		return o, optErr("variance_ratio", formatValue(o.VarianceRatio), "the variance ratio of Deming regression must be from %g to %g (1 when x and y errors are alike)", MinVarianceRatio, MaxVarianceRatio)
	}
	if o.BoxCoxLambda != nil {
		l := *o.BoxCoxLambda
		if !(math.Abs(l) <= MaxBoxCoxLambda) {
			return o, optErr("box_cox_lambda", formatValue(l), "the Box–Cox power must be from %g to %g", -MaxBoxCoxLambda, MaxBoxCoxLambda)
		}
		if o.Transform != TransformBoxCox {
			return o, optErr("box_cox_lambda", formatValue(l), "a Box–Cox power goes only with the box_cox transform (this fit uses %s)", o.Transform)
		}
	}
	for _, r := range []struct {
		name string
		p    *float64
	}{{"slope_ref", o.SlopeRef}, {"intercept_ref", o.InterceptRef}} {
		if r.p != nil && !(math.Abs(*r.p) <= MaxMagnitude) {
			return o, optErr(r.name, formatValue(*r.p), "a reference value must be a finite number of at most %g in size", MaxMagnitude)
		}
	}
	for _, u := range []struct {
		name string
		v    float64
	}{{"x_uncertainty", o.XUncertainty}, {"y_uncertainty", o.YUncertainty}} {
		if !(u.v >= 0 && u.v <= MaxMagnitude) {
			return o, optErr(u.name, formatValue(u.v), "a reading uncertainty must be zero or a positive number of at most %g", MaxMagnitude)
		}
	}
	for i, v := range o.PredictX {
		if !(math.Abs(v) <= MaxMagnitude) {
			return o, optErr("predict_x", formatValue(v), "x value %d to predict at must be a finite number of at most %g in size; rescale the units", i+1, MaxMagnitude)
		}
	}
	for i, u := range o.XStandardUncertainties {
		if !(u >= 0 && u <= MaxMagnitude) {
			return o, optErr("x_standard_uncertainties", formatValue(u), "the standard uncertainty of known value %d must be zero or a positive number of at most %g", i+1, MaxMagnitude)
		}
	}
	for i, q := range o.Inverse {
		for j, v := range q.Y {
			if !(math.Abs(v) <= MaxMagnitude) {
				return o, optErr("inverse_y", formatValue(v), "reading %d of unknown %d must be a finite number of at most %g in size; rescale the units", j+1, i+1, MaxMagnitude)
			}
		}
	}
	return o, nil
}

// sameNormalize reports, for o, whether Normalize and its oracle return
// the same options (printed, so that a NaN equals itself and the pointers
// are the caller's own in both) and the same error.
func sameNormalize(o Options) (got, want string, same bool) {
	g, gerr := o.Normalize()
	w, werr := o.normalizeOracle()
	got, want = fmt.Sprintf("%+v %v", g, gerr), fmt.Sprintf("%+v %v", w, werr)
	return got, want, got == want
}

// normalizeCase builds options from small indexes into lists of values
// that reach every rule of Normalize: each name valid, empty and unknown;
// numbers at, inside and beyond their bounds, NaN and ±Inf.
func normalizeCase(model, transform, weights, level, vr, lambda, nums uint8, given bool) Options {
	f := func(k uint8) float64 {
		return []float64{0, 1, -1, 0.5, MinLevel, MaxLevel, 0.95, MaxMagnitude, -MaxMagnitude, 2 * MaxMagnitude,
			MinVarianceRatio, MaxVarianceRatio, MaxBoxCoxLambda, -MaxBoxCoxLambda, 1.5 * MaxBoxCoxLambda,
			math.NaN(), math.Inf(1), math.Inf(-1), 1e-300}[int(k)%19]
	}
	models := append([]Model{"", "OLS", "linear"}, Model("").Values()...)
	transforms := append([]Transform{"", "log"}, Transform("").Values()...)
	schemes := append([]WeightScheme{"bogus"}, WeightScheme("").Values()...)
	o := Options{
		Model:     models[int(model)%len(models)],
		Transform: transforms[int(transform)%len(transforms)],
		Weights:   schemes[int(weights)%len(schemes)],
		Level:     f(level), VarianceRatio: f(vr),
	}
	if given {
		o.GivenWeights = []float64{1, 2}
	}
	if lambda > 0 {
		l := f(lambda - 1)
		o.BoxCoxLambda = &l
	}
	// nums picks which of the numbers beside the readings are set, and to
	// what: bit 0 the references, 1 the uncertainties, 2 predict_x, 3 the
	// standards' uncertainties, 4 an unknown's readings; bits 5–7 the value.
	v := f(nums >> 5 * 3)
	if nums&1 != 0 {
		o.SlopeRef, o.InterceptRef = &v, &v
	}
	if nums&2 != 0 {
		o.XUncertainty, o.YUncertainty = 0.1, v
	}
	if nums&4 != 0 {
		o.PredictX = []float64{1, v}
	}
	if nums&8 != 0 {
		o.XStandardUncertainties = []float64{0, v}
	}
	if nums&16 != 0 {
		o.Inverse = []InverseQuery{{Y: []float64{1}}, {Y: []float64{2, v}}}
	}
	return o
}

func TestNormalizeMatchesOracle(t *testing.T) {
	n := 0
	for model := range uint8(7) {
		for transform := range uint8(8) {
			for weights := range uint8(8) {
				for _, level := range []uint8{0, 1, 4, 5, 6, 15} {
					for _, vr := range []uint8{0, 1, 10, 11, 2, 15} {
						for _, lambda := range []uint8{0, 1, 13, 15, 16} {
							for _, given := range []bool{false, true} {
								o := normalizeCase(model, transform, weights, level, vr, lambda, uint8(n), given)
								n++
								if got, want, same := sameNormalize(o); !same {
									t.Fatalf("%+v:\n got %s\nwant %s", o, got, want)
								}
							}
						}
					}
				}
			}
		}
	}
}

// FuzzNormalizeMatchesOracle: Normalize and the body it was split from
// return the same options and the same error for any options built from
// the lists of normalizeCase, and for any level, δ and λ.
func FuzzNormalizeMatchesOracle(f *testing.F) {
	f.Add(uint8(0), uint8(0), uint8(0), uint8(0), uint8(0), uint8(0), uint8(0), false, 0.0, 0.0)
	f.Add(uint8(4), uint8(3), uint8(2), uint8(6), uint8(1), uint8(2), uint8(31), true, 0.9, 2.0)
	f.Fuzz(func(t *testing.T, model, transform, weights, level, vr, lambda, nums uint8, given bool, lv, dv float64) {
		o := normalizeCase(model, transform, weights, level, vr, lambda, nums, given)
		if level&0x80 != 0 {
			o.Level = lv
		}
		if vr&0x80 != 0 {
			o.VarianceRatio = dv
		}
		if got, want, same := sameNormalize(o); !same {
			t.Fatalf("%+v:\n got %s\nwant %s", o, got, want)
		}
	})
}
