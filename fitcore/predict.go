package fitcore

import (
	"fmt"
	"math"
)

// predictAt returns the fitted y at x (original units) with the confidence
// interval of the mean response and the prediction interval of one new
// reading, at the report level:
//
//	ŷ ± t_{1−α/2,df}·√Var(ŷ)               (confidence)
//	ŷ ± t_{1−α/2,df}·√(Var(ŷ) + s²/w(x))     (prediction)
//
// with Var(ŷ) = s²(1/Σw + (x−x̄)²/Sxx) for least squares (x²/Σwx² through
// the origin) and the jackknife variances for Deming; w(x) = 1 unweighted.
// Source: Draper & Smith §1.4, §9.2. On a transformed scale the interval
// ends are back-transformed (monotone transforms keep coverage); on log
// scales the fit and confidence interval are multiplied by Duan's smearing
// factor so they describe the mean, while the prediction interval is not.
// tc is t_{1−α/2,df} (lnTCrit of the report's level and the fit's df), the
// same for every x, so the caller computes it once.
func (fc *fitContext) predictAt(x, tc float64) Prediction {
	p := Prediction{X: x}
	f, tr := fc.f, fc.tr
	if !isFiniteNum(x) {
		p.Message = "This x is not a finite number."
		return p
	}
	xt, ok := tr.fwdX(x)
	if !ok {
		p.Message = "This x cannot be used on a log scale (it must be above zero)."
		return p
	}
	ys := f.a + f.b1*(xt*f.kx-f.xc)
	vm := math.Max(f.meanVarAt(xt), 0)
	wx, wok := fc.wm.at(xt)
	var msgs []string
	if wok && (fc.wm.scheme == WeightsGiven || fc.wm.scheme == WeightsRepeats) {
		msgs = append(msgs, "a new reading is given the weight of the nearest calibration reading")
	}
	ci := tc * math.Sqrt(vm)
	pi := 0.0
	if wok {
		pi = tc * math.Sqrt(vm+f.s2()/(wx*f.cw))
	} else {
		msgs = append(msgs, "the weighting gives no weight at this x, so no prediction interval")
	}
	iy := 1 / f.ky
	fit, _ := tr.backY(ys * iy)
	p.Fit = fit * tr.smearing
	lo, hi, m1 := fc.backInterval((ys-ci)*iy, (ys+ci)*iy)
	p.CILow, p.CIHigh = lo*tr.smearing, hi*tr.smearing
	if wok {
		var m2 string
		p.PILow, p.PIHigh, m2 = fc.backInterval((ys-pi)*iy, (ys+pi)*iy)
		if m2 != "" && m2 != m1 {
			msgs = append(msgs, m2)
		}
	}
	if m1 != "" {
		msgs = append([]string{m1}, msgs...)
	}
	if lo, hi := fc.xRange(); x < lo || x > hi {
		msgs = append(msgs, fmt.Sprintf("x lies outside the calibrated range %s to %s; the line may not hold there", formatValue(lo), formatValue(hi)))
	}
	p.Message = joinSentences(msgs)
	return p
}

// backInterval back-transforms interval ends from the fitted scale; an end
// that has no value in original units is set to 0 and explained.
func (fc *fitContext) backInterval(lo, hi float64) (float64, float64, string) {
	tr := fc.tr
	a, okA := tr.backY(lo)
	b, okB := tr.backY(hi)
	msg := ""
	if tr.decreasing() {
		a, b, okA, okB = b, a, okB, okA
		if lo <= 0 && hi >= 0 {
			// The interval on the 1/y scale straddles zero: y is unbounded.
			return 0, 0, "the interval on the 1/y scale includes zero, so in original units it is unbounded (shown as 0)"
		}
	}
	if !okA {
		a = 0
		msg = "the lower end has no value in original units (shown as 0)"
	}
	if !okB {
		b = 0
		msg = "the upper end has no value in original units (shown as 0)"
	}
	if !okA && !okB {
		msg = "the interval has no value in original units (shown as 0)"
	}
	return a, b, msg
}

func (fc *fitContext) predictions() {
	if len(fc.opt.PredictX) == 0 {
		return
	}
	fc.rep.Predictions = make([]Prediction, len(fc.opt.PredictX))
	tc := lnTCrit(fc.rep.Level, fc.f.df)
	for i, x := range fc.opt.PredictX {
		fc.rep.Predictions[i] = finitePrediction(fc.predictAt(x, tc))
	}
}

func rangeOf(v []float64) (lo, hi float64) {
	lo, hi = v[0], v[0]
	for _, a := range v[1:] {
		lo, hi = ckMin(lo, a), ckMax(hi, a)
	}
	return lo, hi
}

// joinSentences makes one sentence from clauses.
func joinSentences(parts []string) string {
	if len(parts) == 0 {
		return ""
	}
	s := ""
	for i, p := range parts {
		if i > 0 {
			s += "; "
		}
		s += p
	}
	return upperFirst(s) + "."
}

func upperFirst(s string) string {
	r := []rune(s)
	if len(r) > 0 && r[0] >= 'a' && r[0] <= 'z' {
		r[0] -= 'a' - 'A'
	}
	return string(r)
}

// finitePrediction keeps a prediction whose figures cannot be represented
// (a far x on a log scale, whose back-transform overflows) from reaching
// the report as Inf: the figures are 0 and the message says why.
func finitePrediction(p Prediction) Prediction {
	for _, v := range []float64{p.Fit, p.CILow, p.CIHigh, p.PILow, p.PIHigh} {
		if !isFiniteNum(v) {
			return Prediction{X: p.X, Message: "The prediction at this x is too large to be given in the units of y (it exceeds 1.8e308); this x is far outside the readings."}
		}
	}
	return p
}

// finiteInverse is finitePrediction for an inverse prediction.
func finiteInverse(inv Inverse) Inverse {
	for _, v := range []float64{inv.Y, inv.X, inv.SE, inv.Low, inv.High} {
		if !isFiniteNum(v) {
			return Inverse{Y: 0, M: inv.M, Message: "The x for this unknown is too large to be given in the units of x (it exceeds 1.8e308); its readings are far outside the calibration."}
		}
	}
	return inv
}
