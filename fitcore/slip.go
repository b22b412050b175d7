package fitcore

import (
	"pairline/app/numfmt"

	"fmt"
	"math"
	"strings"

	"gonum.org/v1/gonum/stat/distuv"
)

// SlippedDecimal is a reading whose y looks typed with its decimal point in
// the wrong place: y·Factor (Factor 10, 0.1, 100 or 0.01) lies within the
// 95 % prediction interval of the line fitted without it, while y itself is
// an outlier (Bonferroni p < OutlierWarnP, see Influence).
type SlippedDecimal struct {
	Index    int     `json:"index"`    // position in the input, from 0 (the screen shows its row)
	Value    float64 `json:"value"`    // the reading as typed
	Expected float64 `json:"expected"` // the line's value at its x, fitted without it
	Likely   float64 `json:"likely"`   // Value·Factor, what it probably should be
	Factor   float64 `json:"factor"`
	// Clears lists the assumptions (their ids: linearity, spread,
	// independence, normality) that warn or fail with the reading and pass
	// without it (refitted without it, same options).
	Clears []AssumptionID `json:"clears,omitempty"`
}

// slipFactors are the decimal slips looked for, most likely first (common
// practice: one place either way is the usual typing slip).
var slipFactors = [...]float64{10, 0.1, 100, 0.01}

// findSlip looks for a slipped decimal point among the outliers of an
// ordinary (or weighted) straight line in original units: the line is
// refitted without reading i, and y_i·f is compared with that line's 95 %
// prediction interval at x_i, ŷ₍ᵢ₎ ± t(0.975, n−p−1)·s₍ᵢ₎·√(1/w_i + h),
// with h the leverage of x_i in the fit without it (Draper & Smith,
// Applied Regression Analysis, 3rd ed., §3.1 for the interval).
func findSlip(x, y, w []float64, origin bool, infl []PointInfluence) *SlippedDecimal {
	n := len(x)
	p := 2
	if origin {
		p = 1
	}
	if n-p-1 < 2 {
		return nil
	}
	j := slipSuspect(infl)
	if j < 0 {
		return nil
	}
	best := infl[j].Index // infl may hold the flagged readings only
	if y[best] == 0 {
		return nil
	}
	fit, half, ok := slipInterval(x, y, w, origin, best, float64(n-1-p))
	if !ok {
		return nil
	}
	for _, f := range slipFactors {
		if v := y[best] * f; math.Abs(v-fit) <= half {
			return &SlippedDecimal{Index: best, Value: y[best], Expected: fit, Likely: v, Factor: f}
		}
	}
	return nil
}

// slipSuspect is the position in infl of the reading with the smallest
// outlier p below OutlierWarnP (the first of equals), or −1.
func slipSuspect(infl []PointInfluence) int {
	best := -1
	for i, pi := range infl {
		if pi.OutlierP < OutlierWarnP && (best < 0 || pi.OutlierP < infl[best].OutlierP) {
			best = i
		}
	}
	return best
}

// slipInterval refits the line without reading best (df residual degrees
// of freedom) and returns its value at x_best and the half-width of the
// 95 % prediction interval there; ok is false when the refit fails or the
// figures are not finite.
func slipInterval(x, y, w []float64, origin bool, best int, df float64) (fit, half float64, ok bool) {
	xs := make([]float64, 0, len(x)-1)
	ys := make([]float64, 0, len(x)-1)
	var ws []float64
	for j := range x {
		if j == best {
			continue
		}
		xs, ys = append(xs, x[j]), append(ys, y[j])
		if w != nil {
			ws = append(ws, w[j])
		}
	}
	b0, b1, resid, ok := ckLine(xs, ys, ws, origin)
	if !ok {
		return 0, 0, false
	}
	var sse, sw, swx float64
	for j, e := range resid {
		sse += ckW(ws, j) * e * e
		sw += ckW(ws, j)
		swx += ckW(ws, j) * xs[j]
	}
	s := math.Sqrt(sse / df)
	h := slipLeverage(xs, ws, x[best], origin, sw, swx)
	wi := 1.0
	if w != nil {
		wi = w[best]
	}
	half = distuv.StudentsT{Mu: 0, Sigma: 1, Nu: df}.Quantile(0.975) * s * math.Sqrt(1/wi+h)
	fit = b1 * x[best]
	if !origin {
		fit += b0
	}
	if !ckFinite(half) || !ckFinite(fit) {
		return 0, 0, false
	}
	return fit, half, true
}

// slipLeverage is the leverage of a new x0 in the weighted fit of xs (Σw
// = sw, Σwx = swx): x0²/Σwx² through the origin, else
// 1/Σw + (x0 − x̄)²/Σw(x − x̄)².
func slipLeverage(xs, ws []float64, x0 float64, origin bool, sw, swx float64) float64 {
	if origin {
		var sxx float64
		for j, v := range xs {
			sxx += ckW(ws, j) * v * v
		}
		return x0 * x0 / sxx
	}
	mx := swx / sw
	var sxx float64
	for j, v := range xs {
		sxx += ckW(ws, j) * (v - mx) * (v - mx)
	}
	return 1/sw + (x0-mx)*(x0-mx)/sxx
}

// slipSentence words a slipped decimal point for the influence assumption,
// the reading numbered from 1.
func slipSentence(s *SlippedDecimal) string {
	msg := fmt.Sprintf("Reading %d looks like a slipped decimal point: %s where the line expects about %s.",
		s.Index+1, ckG4(s.Value), ckG4(s.Expected))
	if len(s.Clears) > 0 {
		names := make([]string, len(s.Clears))
		for i, id := range s.Clears {
			names[i] = "“" + id.Name() + "”"
		}
		msg += fmt.Sprintf(" Without it %s %s.", ckAndList(names), ckPlural(len(names), "passes", "pass"))
	}
	return msg
}

func ckG4(v float64) string { return numfmt.Short(v, 4) }

func ckAndList(v []string) string {
	if len(v) <= 1 {
		return strings.Join(v, "")
	}
	return strings.Join(v[:len(v)-1], ", ") + " and " + v[len(v)-1]
}

// slipClears refits without the reading and names the assumptions that
// are flagged with it and pass without it; it adds to each such
// assumption's message that its result depends on that one reading.
func slipClears(rep *Report, x, y []float64, opt Options, s *SlippedDecimal) {
	xs := make([]float64, 0, len(x)-1)
	ys := make([]float64, 0, len(y)-1)
	for j := range x {
		if j != s.Index {
			xs, ys = append(xs, x[j]), append(ys, y[j])
		}
	}
	o := opt
	o.SkipAdvice = true
	o.PredictX, o.Inverse, o.Acceptance, o.XStandardUncertainties = nil, nil, nil, nil
	o.noSlip = true
	without, err := Analyze(xs, ys, o)
	if err != nil {
		return
	}
	pairs := []struct {
		name      AssumptionID
		with      *Assumption
		withoutIt Assumption
	}{
		{AssumeLinearity, &rep.Assumptions.Linearity, without.Assumptions.Linearity},
		{AssumeSpread, &rep.Assumptions.Spread, without.Assumptions.Spread},
		{AssumeIndependence, &rep.Assumptions.Independence, without.Assumptions.Independence},
		{AssumeNormality, &rep.Assumptions.Normality, without.Assumptions.Normality},
	}
	for _, p := range pairs {
		if (p.with.Verdict == Warn || p.with.Verdict == Fail) && p.withoutIt.Verdict == Pass {
			s.Clears = append(s.Clears, p.name)
			p.with.Message += fmt.Sprintf(" This depends on reading %d alone (it looks like a slipped decimal point): without it this check passes.", s.Index+1)
		}
	}
}
