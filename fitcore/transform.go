package fitcore

import (
	"fmt"
	"math"
)

// transformer maps readings to the scale the line is fitted on and back.
//
//	log_y        y' = ln y                 (y > 0)
//	sqrt_y       y' = √y                   (y ≥ 0)
//	reciprocal_y y' = 1/y                  (y ≠ 0)
//	log_log      x' = ln x, y' = ln y      (x > 0, y > 0)
//	box_cox      y' = (y^λ − 1)/λ, ln y at λ = 0 (y > 0; Box & Cox, JRSS B 26, 1964)
//
// Predictions come back in original units through the inverse transform.
// On log scales the back-transformed fit is the median; the mean response
// is exp(ŷ')·S with Duan's smearing factor S = mean(exp(e_i)) (Duan, JASA
// 78, 1983), applied to the fitted value and its confidence interval.
type transformer struct {
	kind     Transform
	lambda   float64
	smearing float64 // 1 when not a log scale
}

// isLogY says whether y is on a natural-log scale.
func (t *transformer) isLogY() bool {
	return t.kind == TransformLogY || t.kind == TransformLogLog || (t.kind == TransformBoxCox && t.lambda == 0)
}

func newTransformer(kind Transform, x, y []float64, o Options, rep *Report, sc *anScratch) (*transformer, error) {
	t := &transformer{kind: kind, smearing: 1}
	if kind == TransformBoxCox {
		if o.BoxCoxLambda != nil {
			t.lambda = *o.BoxCoxLambda
		} else {
			if i := firstBad(y, func(v float64) bool { return v > 0 }); i >= 0 {
				return nil, &DataError{Index: i, Column: "y", Value: y[i], Err: ErrTransformDomain,
					Hint: "The Box–Cox transform needs every y above zero."}
			}
			bc, err := sc.boxCox(x, y, o.Level)
			if err != nil {
				return nil, fmt.Errorf("%w: λ for the Box–Cox transform could not be estimated: %v", ErrTransformDomain, err)
			}
			t.lambda = bc.Lambda
			rep.Notes = append(rep.Notes, fmt.Sprintf("Box–Cox λ = %.4g estimated by profile likelihood.", bc.Lambda))
		}
		l := t.lambda
		rep.TransformLambda = &l
	}
	return t, nil
}

func firstBad(v []float64, ok func(float64) bool) int {
	for i, a := range v {
		if !ok(a) {
			return i
		}
	}
	return -1
}

// applyIn returns the readings on the fitted scale (the inputs themselves
// for TransformNone) or a *DataError naming the first reading the
// transform cannot take; y on the fitted scale is written into ybuf when
// its capacity is at least len(y) (a new slice otherwise).
func (t *transformer) applyIn(x, y, ybuf []float64) (xt, yt []float64, err error) {
	xt, yt = x, y
	if t.kind == TransformNone {
		return x, y, nil
	}
	if t.kind == TransformLogLog {
		if i := firstBad(x, func(v float64) bool { return v > 0 }); i >= 0 {
			return nil, nil, &DataError{Index: i, Column: "x", Value: x[i], Err: ErrTransformDomain,
				Hint: "A log–log fit needs every x above zero; choose a transform of y only, or check the reading."}
		}
		xt = make([]float64, len(x))
		for i, v := range x {
			xt[i] = math.Log(v)
		}
	}
	yt = ckGrowF64(ybuf, len(y))
	for i, v := range y {
		u, ok := t.fwdY(v)
		if !ok {
			return nil, nil, &DataError{Index: i, Column: "y", Value: v, Err: ErrTransformDomain, Hint: t.domainSentence()}
		}
		yt[i] = u
	}
	return xt, yt, nil
}

func (t *transformer) domainSentence() string {
	switch t.kind {
	case TransformLogY, TransformLogLog:
		return "A log scale needs every y above zero; choose another transform or check the reading."
	case TransformSqrtY:
		return "A square-root scale needs every y at zero or above; choose another transform or check the reading."
	case TransformReciprocal:
		return "A reciprocal scale cannot take a y of zero; choose another transform or check the reading."
	case TransformBoxCox:
		return "The Box–Cox transform needs every y above zero; choose another transform or check the reading."
	}
	return ""
}

// fwdY maps one y to the fitted scale; ok is false outside the domain or
// when the result is not finite.
func (t *transformer) fwdY(v float64) (float64, bool) {
	var u float64
	switch t.kind {
	case TransformNone:
		u = v
	case TransformLogY, TransformLogLog:
		if !(v > 0) {
			return 0, false
		}
		u = math.Log(v)
	case TransformSqrtY:
		if !(v >= 0) {
			return 0, false
		}
		u = math.Sqrt(v)
	case TransformReciprocal:
		if v == 0 {
			return 0, false
		}
		u = 1 / v
	case TransformBoxCox:
		if !(v > 0) {
			return 0, false
		}
		if t.lambda == 0 {
			u = math.Log(v)
		} else {
			// (y^λ − 1)/λ = expm1(λ·ln y)/λ keeps digits for λ near 0.
			u = math.Expm1(t.lambda*math.Log(v)) / t.lambda
		}
	}
	return u, isFiniteNum(u)
}

// fwdX maps one x to the fitted scale.
func (t *transformer) fwdX(v float64) (float64, bool) {
	if t.kind == TransformLogLog {
		if !(v > 0) {
			return 0, false
		}
		return math.Log(v), true
	}
	return v, true
}

// backX maps a fitted-scale x to original units.
func (t *transformer) backX(u float64) float64 {
	if t.kind == TransformLogLog {
		return math.Exp(u)
	}
	return u
}

// backY maps a fitted-scale y to original units; ok is false when u lies
// outside the range of the transform (no y gives it).
func (t *transformer) backY(u float64) (float64, bool) {
	var v float64
	switch t.kind {
	case TransformNone:
		v = u
	case TransformLogY, TransformLogLog:
		v = math.Exp(u)
	case TransformSqrtY:
		if u < 0 {
			return 0, false
		}
		v = u * u
	case TransformReciprocal:
		if u == 0 {
			return 0, false
		}
		v = 1 / u
	case TransformBoxCox:
		if t.lambda == 0 {
			v = math.Exp(u)
		} else {
			b := t.lambda*u + 1
			if !(b > 0) {
				return 0, false
			}
			v = math.Exp(math.Log1p(t.lambda*u) / t.lambda)
		}
	}
	return v, isFiniteNum(v)
}

// decreasing says whether the back transform reverses order.
func (t *transformer) decreasing() bool { return t.kind == TransformReciprocal }

// setSmearing computes Duan's smearing factor from fitted-scale residuals.
func (t *transformer) setSmearing(resid []float64) {
	t.smearing = 1
	if !t.isLogY() || len(resid) == 0 {
		return
	}
	var acc lnKSum
	for _, e := range resid {
		acc.add(math.Exp(e))
	}
	s := acc.val() / float64(len(resid))
	if isFiniteNum(s) && s > 0 {
		t.smearing = s
	}
}
