package fitcore

import (
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"reflect"
	"strings"
	"testing"
)

func near(t *testing.T, name string, got, want, rel float64) {
	t.Helper()
	d := math.Abs(got - want)
	if d > rel*math.Max(math.Abs(want), 1e-300) {
		t.Errorf("%s: got %.15g, want %.15g (rel diff %.2e > %.0e)", name, got, want, d/math.Abs(want), rel)
	}
}

// seededLine is invented data: a straight line with seeded normal noise.
func seededLine(n int, seed uint64, b0, b1, sigma float64) (x, y []float64) {
	r := rand.New(rand.NewPCG(seed, 7))
	x = make([]float64, n)
	y = make([]float64, n)
	for i := range n {
		x[i] = float64(i) + 0.5*r.Float64()
		y[i] = b0 + b1*x[i] + sigma*r.NormFloat64()
	}
	return x, y
}

func meanSDTest(v []float64) (m, s float64) {
	for _, a := range v {
		m += a
	}
	m /= float64(len(v))
	for _, a := range v {
		s += (a - m) * (a - m)
	}
	return m, math.Sqrt(s / float64(len(v)-1))
}

func corr(x, y []float64) float64 {
	mx, sx := meanSDTest(x)
	my, sy := meanSDTest(y)
	var c float64
	for i := range x {
		c += (x[i] - mx) * (y[i] - my)
	}
	return c / float64(len(x)-1) / sx / sy
}

// TestProperties checks textbook identities of the least-squares line
// (Draper & Smith §1.2, §1.6): b1 = r·s_y/s_x; the slope of standardized
// data is r; the line passes through (x̄, ȳ); R² = r².
func TestProperties(t *testing.T) {
	for seed := uint64(1); seed <= 5; seed++ {
		x, y := seededLine(40, seed, 3, -1.7, 2)
		rep, err := Analyze(x, y, Options{SkipAdvice: true})
		if err != nil {
			t.Fatal(err)
		}
		_, sx := meanSDTest(x)
		my, sy := meanSDTest(y)
		mx, _ := meanSDTest(x)
		r := corr(x, y)
		near(t, "slope = r·sy/sx", rep.Slope.Estimate, r*sy/sx, 1e-12)
		near(t, "R", rep.R, r, 1e-12)
		near(t, "R² = r²", rep.RSquared, r*r, 1e-12)
		near(t, "line through means", rep.Intercept.Estimate+rep.Slope.Estimate*mx, my, 1e-12)
		zx := make([]float64, len(x))
		zy := make([]float64, len(y))
		for i := range x {
			zx[i], zy[i] = (x[i]-mx)/sx, (y[i]-my)/sy
		}
		zr, err := Analyze(zx, zy, Options{SkipAdvice: true})
		if err != nil {
			t.Fatal(err)
		}
		near(t, "standardized slope = r", zr.Slope.Estimate, r, 1e-12)
		var sr float64
		for _, e := range rep.Residuals {
			sr += e
		}
		if math.Abs(sr) > 1e-10 {
			t.Errorf("residuals sum to %g, want 0", sr)
		}
	}
}

// TestResidualsWithinTwoSigma: with normal noise about 95 % of the
// residuals lie within 2σ (common practice; 95.4 % for a normal
// distribution). Seeded, so the count is reproducible.
func TestResidualsWithinTwoSigma(t *testing.T) {
	x, y := seededLine(2000, 11, 10, 0.25, 1.5)
	rep, err := Analyze(x, y, Options{SkipAdvice: true})
	if err != nil {
		t.Fatal(err)
	}
	in := 0
	for _, e := range rep.Residuals {
		if math.Abs(e) <= 2*rep.ResidualSE {
			in++
		}
	}
	frac := float64(in) / float64(len(x))
	if frac < 0.94 || frac > 0.97 {
		t.Errorf("%.3f of residuals within 2σ, want about 0.954", frac)
	}
	near(t, "residual SE ≈ σ", rep.ResidualSE, 1.5, 0.05)
}

// TestExtremeMagnitudes: readings near 1e-140 and 1e140 and x as Unix
// timestamps keep their digits; the slope must match the one from the
// same data at unit scale (scaling by powers of ten changes slope by a
// known factor) and the report must marshal to JSON. Readings whose sums
// of squares cannot be given in their units (near 1e-300 and 1e300) are
// refused with ErrOutOfRange and the advice to rescale.
func TestExtremeMagnitudes(t *testing.T) {
	x0, y0 := seededLine(30, 3, 2, 0.5, 0.1)
	base, err := Analyze(x0, y0, Options{SkipAdvice: true})
	if err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		name   string
		kx, ky float64
		dx     float64
		refuse bool
	}{
		{"tiny", 1e-300, 1e-300, 0, true},
		{"huge", 1e300, 1e300, 0, true},
		{"near the largest float", 1e306, 1e306, 0, true},
		{"small", 1e-140, 1e-140, 0, false},
		{"large", 1e140, 1e140, 0, false},
		{"tiny x huge y", 1e-70, 1e70, 0, false},
		{"covariance beyond float64", 1e-140, 1e140, 0, true}, // y²/x ≈ 1e420
		{"timestamps", 1, 1, 1.7e9, false},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			x := make([]float64, len(x0))
			y := make([]float64, len(y0))
			for i := range x0 {
				x[i] = x0[i]*c.kx + c.dx
				y[i] = y0[i] * c.ky
			}
			var pred []float64
			var inv []InverseQuery
			if !c.refuse {
				pred, inv = []float64{x[3]}, []InverseQuery{{Y: []float64{y[5]}}}
			}
			rep, err := Analyze(x, y, Options{PredictX: pred, Inverse: inv})
			if c.refuse {
				if !errors.Is(err, ErrOutOfRange) || !strings.Contains(err.Error(), "rescale the units") {
					t.Fatalf("want a refusal (ErrOutOfRange, rescale the units), got %v", err)
				}
				return
			}
			if err != nil {
				t.Fatal(err)
			}
			tol := 1e-12
			if c.dx != 0 {
				tol = 1e-6 // x itself is rounded to 2.4e-7 at 1.7e9
			}
			near(t, "slope", rep.Slope.Estimate, base.Slope.Estimate*c.ky/c.kx, tol)
			near(t, "R²", rep.RSquared, base.RSquared, tol)
			near(t, "t", rep.Slope.T, base.Slope.T, tol)
			near(t, "residual SE", rep.ResidualSE, base.ResidualSE*c.ky, tol)
			near(t, "Sxx", rep.Sxx, base.Sxx*c.kx*c.kx, 1e-6)
			if _, err := json.Marshal(rep); err != nil {
				t.Fatalf("report does not marshal: %v", err)
			}
		})
	}
}

// TestPowerOfTwoScaling: scaling x and y by powers of two is exact in
// binary floating point, so every figure of the report must scale exactly
// (the same data computed another way) and every verdict and sentence be
// the same, up to the largest scale the limits allow (2^450 ≈ 2.9e135,
// where the fit runs on internally rescaled values and agrees to
// rounding). Includes a far unknown (1e6 times the range) whose Fieller
// interval must stay bounded.
func TestPowerOfTwoScaling(t *testing.T) {
	x0, y0 := seededLine(25, 3, 2, 0.5, 0.3)
	opt := func(kx, ky float64) Options {
		return Options{PredictX: []float64{2 * kx}, Inverse: []InverseQuery{{Y: []float64{5 * ky}}, {Y: []float64{1e6 * ky}}}}
	}
	base, err := Analyze(x0, y0, opt(1, 1))
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		ex, ey int
		tol    float64
	}{{300, 300, 0}, {-300, -300, 0}, {200, -250, 0}, {-250, 200, 0}, {450, 450, 1e-12}, {-450, 100, 1e-12}} {
		t.Run(fmt.Sprintf("2^%d,2^%d", c.ex, c.ey), func(t *testing.T) {
			kx, ky := math.Ldexp(1, c.ex), math.Ldexp(1, c.ey)
			x, y := scaledCopy(x0, kx), scaledCopy(y0, ky)
			rep, err := Analyze(x, y, opt(kx, ky))
			if err != nil {
				t.Fatal(err)
			}
			eq := func(name string, got, want float64) {
				t.Helper()
				if c.tol == 0 && got != want || c.tol > 0 && math.Abs(got-want) > c.tol*math.Abs(want) {
					t.Errorf("%s = %v, want %v", name, got, want)
				}
			}
			eq("slope", rep.Slope.Estimate, base.Slope.Estimate*ky/kx)
			eq("slope SE", rep.Slope.SE, base.Slope.SE*ky/kx)
			eq("intercept", rep.Intercept.Estimate, base.Intercept.Estimate*ky)
			eq("residual SE", rep.ResidualSE, base.ResidualSE*ky)
			eq("Sxx", rep.Sxx, base.Sxx*kx*kx)
			eq("prediction", rep.Predictions[0].Fit, base.Predictions[0].Fit*ky)
			eq("prediction PI", rep.Predictions[0].PIHigh, base.Predictions[0].PIHigh*ky)
			for i := range base.Inverse {
				if !rep.Inverse[i].Bounded {
					t.Fatalf("inverse %d unbounded: %s", i, rep.Inverse[i].Message)
				}
				eq("inverse x", rep.Inverse[i].X, base.Inverse[i].X*kx)
				eq("inverse high", rep.Inverse[i].High, base.Inverse[i].High*kx)
			}
			if c.tol == 0 && !reflect.DeepEqual(rep.Assumptions, base.Assumptions) {
				t.Errorf("assumptions differ:\n%+v\n%+v", rep.Assumptions, base.Assumptions)
			}
			if rep.Advice.Remedy != base.Advice.Remedy {
				t.Errorf("advice %s, want %s", rep.Advice.Remedy, base.Advice.Remedy)
			}
		})
	}
}

// TestDeming compares Deming regression and its jackknife standard errors
// with the closed-form Deming slope (Linnet, Clin. Chem. 39, 1993) and a
// brute-force leave-one-out jackknife evaluated in numpy, and the slope with
// scipy.odr (orthogonal distance regression, sx = 1, sy = √δ, sstol =
// partol = 1e-15, which converges only to about 3e-8), all with Debian's
// python3-scipy 1.10 (/usr/bin/python3); invented data.
func TestDeming(t *testing.T) {
	x := []float64{1.0, 2.1, 2.9, 4.2, 5.1, 5.8, 7.2, 8.1, 8.8, 10.2}
	y := []float64{1.3, 2.0, 3.4, 4.1, 5.3, 5.7, 7.4, 7.9, 9.3, 10.0}
	cases := []struct {
		delta, b1, b0, seB1, seB0, odrB1 float64
	}{
		{1.0, 0.9822082601255369, 0.19856623890452507, 0.03769341699031165, 0.20499678291942863, 0.9822082893709458},
		{4.0, 0.9798694858471414, 0.21152304840683644, 0.036863475527477416, 0.20192295286769782, 0.9798694854449993},
	}
	for _, c := range cases {
		rep, err := Analyze(x, y, Options{Model: ModelDeming, VarianceRatio: c.delta, SkipAdvice: true, PredictX: []float64{5}})
		if err != nil {
			t.Fatal(err)
		}
		near(t, "slope", rep.Slope.Estimate, c.b1, 1e-13)
		near(t, "intercept", rep.Intercept.Estimate, c.b0, 1e-12)
		near(t, "SE slope", rep.Slope.SE, c.seB1, 1e-10)
		near(t, "SE intercept", rep.Intercept.SE, c.seB0, 1e-10)
		near(t, "slope vs ODR", rep.Slope.Estimate, c.odrB1, 1e-7)
		if rep.Model != ModelDeming || len(rep.Predictions) != 1 {
			t.Errorf("model %q, %d predictions", rep.Model, len(rep.Predictions))
		}
	}
}

// TestLogTransform compares a log_y fit with statsmodels OLS on ln y, the
// smearing factor mean(exp(e)) (Duan 1983) and the back-transformed
// prediction interval (statsmodels 0.13 get_prediction, exp of the ends);
// invented data.
func TestLogTransform(t *testing.T) {
	x := []float64{1, 2, 3, 4, 5, 6, 7, 8}
	y := []float64{2.1, 2.9, 4.4, 6.0, 8.7, 12.5, 17.0, 25.1}
	rep, err := Analyze(x, y, Options{Transform: TransformLogY, SkipAdvice: true, PredictX: []float64{4.5}})
	if err != nil {
		t.Fatal(err)
	}
	near(t, "slope", rep.Slope.Estimate, 0.3537257429971673, 1e-12)
	near(t, "intercept", rep.Intercept.Estimate, 0.38637727551734935, 1e-12)
	near(t, "smearing", rep.Smearing, 1.0002098576719602, 1e-12)
	p := rep.Predictions[0]
	near(t, "mean prediction", p.Fit, 7.230823677589535, 1e-10)
	near(t, "PI low", p.PILow, 6.79871083923779, 1e-10)
	near(t, "PI high", p.PIHigh, 7.687174004118876, 1e-10)
}

// TestTransformsRoundTrip: every transform's back transform undoes it,
// and transforms refuse readings they cannot take.
func TestTransformsRoundTrip(t *testing.T) {
	l := 0.37
	for _, tc := range []struct {
		kind Transform
		lam  *float64
		bad  float64
	}{
		{TransformLogY, nil, 0}, {TransformSqrtY, nil, -1}, {TransformReciprocal, nil, 0},
		{TransformLogLog, nil, -2}, {TransformBoxCox, &l, 0},
	} {
		tr := &transformer{kind: tc.kind, smearing: 1}
		if tc.lam != nil {
			tr.lambda = *tc.lam
		}
		for _, v := range []float64{0.01, 0.5, 3, 1e5} {
			u, ok := tr.fwdY(v)
			back, ok2 := tr.backY(u)
			if !ok || !ok2 {
				t.Fatalf("%s: %g not accepted", tc.kind, v)
			}
			near(t, string(tc.kind), back, v, 1e-12)
		}
		x := []float64{1, 2, 3, 4}
		y := []float64{1, 2, tc.bad, 4}
		if tc.kind == TransformLogLog {
			x[2], y[2] = tc.bad, 3
		}
		_, err := Analyze(x, y, Options{Transform: tc.kind, BoxCoxLambda: tc.lam, SkipAdvice: true})
		var de *DataError
		if !errors.Is(err, ErrTransformDomain) || !errors.As(err, &de) || de.Index != 2 {
			t.Errorf("%s: want a DataError at index 2 wrapping ErrTransformDomain, got %v", tc.kind, err)
		}
	}
}

// TestPredictInverseLimits checks predictions, inverse prediction with the
// Fieller interval and LOD/LOQ against statsmodels 0.13 get_prediction and
// an independent root search (scipy.optimize.brentq) of the Fieller
// inequality (ȳ0 − b0 − b1·x)² = t²s²(1/m + 1/n + (x−x̄)²/Sxx), computed
// with Debian's python3-statsmodels/scipy; invented calibration data.
func TestPredictInverseLimits(t *testing.T) {
	x := []float64{0, 0, 2, 2, 4, 4, 6, 6, 8, 8, 10, 10}
	y := []float64{0.05, 0.08, 2.1, 1.95, 4.02, 4.11, 6.2, 5.98, 8.05, 8.2, 10.1, 9.9}
	rep, err := Analyze(x, y, Options{SkipAdvice: true, PredictX: []float64{3},
		Inverse: []InverseQuery{{Y: []float64{5.0, 5.1, 4.95}}}})
	if err != nil {
		t.Fatal(err)
	}
	p := rep.Predictions[0]
	near(t, "fit", p.Fit, 3.061666666666667, 1e-12)
	near(t, "CI low", p.CILow, 2.990498697475919, 1e-10)
	near(t, "CI high", p.CIHigh, 3.132834635857415, 1e-10)
	near(t, "PI low", p.PILow, 2.8373331912670294, 1e-10)
	near(t, "PI high", p.PIHigh, 3.2860001420663045, 1e-10)
	inv := rep.Inverse[0]
	near(t, "x̂", inv.X, 4.954999999999999, 1e-12)
	near(t, "SE x̂", inv.SE, 0.061633943384976714, 1e-10)
	near(t, "Fieller low", inv.Low, 4.817634258667913, 1e-9)
	near(t, "Fieller high", inv.High, 5.09233663580433, 1e-9)
	if !inv.Bounded || inv.M != 3 {
		t.Errorf("bounded %v, m %d", inv.Bounded, inv.M)
	}
	near(t, "LOD", rep.Limits.LOD, 0.315088082922854, 1e-12)
	near(t, "LOQ", rep.Limits.LOQ, 0.9548123724934972, 1e-12)
}

// TestFiellerUnbounded: a slope indistinguishable from zero gives no
// bounded interval for x (Fieller 1940); the report says so.
func TestFiellerUnbounded(t *testing.T) {
	x := []float64{1, 2, 3, 4, 5, 6}
	y := []float64{5.0, 4.1, 5.9, 4.4, 5.6, 5.1}
	rep, err := Analyze(x, y, Options{SkipAdvice: true, Inverse: []InverseQuery{{Y: []float64{5}}}})
	if err != nil {
		t.Fatal(err)
	}
	inv := rep.Inverse[0]
	if inv.Bounded || inv.Low != 0 || inv.High != 0 || inv.Message == "" {
		t.Errorf("want unbounded with message, got %+v", inv)
	}
}

// TestAcceptance checks the criteria logic on a known line.
func TestAcceptance(t *testing.T) {
	x := []float64{0, 2, 4, 6, 8, 10}
	y := []float64{0.1, 2.0, 4.1, 5.9, 8.2, 9.9}
	f := func(v float64) *float64 { return &v }
	cases := []struct {
		name string
		c    Criteria
		pass bool
	}{
		{"all met", Criteria{MinRSquared: f(0.99), SlopeLow: f(0.95), SlopeHigh: f(1.05), MaxResidual: f(0.5)}, true},
		{"R² too low", Criteria{MinRSquared: f(0.99999)}, false},
		{"slope window", Criteria{SlopeHigh: f(0.9)}, false},
		{"residual % of span", Criteria{MaxResidual: f(0.5), MaxResidualPercentOfSpan: true}, false},
	}
	for _, c := range cases {
		rep, err := Analyze(x, y, Options{SkipAdvice: true, Acceptance: &c.c})
		if err != nil {
			t.Fatal(err)
		}
		if rep.Acceptance.Pass != c.pass {
			t.Errorf("%s: pass %v, want %v: %+v", c.name, rep.Acceptance.Pass, c.pass, rep.Acceptance.Results)
		}
		for _, r := range rep.Acceptance.Results {
			if r.Reason == "" {
				t.Errorf("%s: %s has no reason", c.name, r.Name)
			}
		}
	}
}

// TestWeightSchemes: weights 1/x² agree with given weights 1/x², and every
// scheme gives a finite, marshalable report.
func TestWeightSchemes(t *testing.T) {
	x := []float64{1, 1, 2, 2, 4, 4, 8, 8}
	y := []float64{1.1, 0.9, 2.1, 1.8, 4.3, 3.8, 8.9, 7.4}
	g := make([]float64, len(x))
	for i, v := range x {
		g[i] = 1 / (v * v)
	}
	a, err := Analyze(x, y, Options{Weights: WeightsX2, SkipAdvice: true})
	if err != nil {
		t.Fatal(err)
	}
	b, err := Analyze(x, y, Options{Model: ModelWeighted, GivenWeights: g, SkipAdvice: true})
	if err != nil {
		t.Fatal(err)
	}
	near(t, "slope", a.Slope.Estimate, b.Slope.Estimate, 1e-14)
	near(t, "SE", a.Slope.SE, b.Slope.SE, 1e-14)
	for _, s := range []WeightScheme{WeightsX, WeightsX2, WeightsFitted2, WeightsRepeats, WeightsPowerFit} {
		rep, err := Analyze(x, y, Options{Weights: s, SkipAdvice: true, PredictX: []float64{3}, Inverse: []InverseQuery{{Y: []float64{3}}}})
		if err != nil {
			t.Fatalf("%s: %v", s, err)
		}
		if rep.Model != ModelWeighted || len(rep.Weights) != len(x) {
			t.Errorf("%s: model %s, %d weights", s, rep.Model, len(rep.Weights))
		}
		if _, err := json.Marshal(rep); err != nil {
			t.Errorf("%s: %v", s, err)
		}
	}
}

// TestPerfectFit: readings exactly on a line give zero standard errors and
// finite, signed statistics with a note, never Inf or NaN.
func TestPerfectFit(t *testing.T) {
	rep, err := Analyze([]float64{1, 2, 3, 4}, []float64{3, 5, 7, 9}, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if rep.Slope.Estimate != 2 || rep.Slope.SE != 0 || rep.Slope.T <= 0 || len(rep.Notes) == 0 {
		t.Errorf("perfect fit: %+v notes %v", rep.Slope, rep.Notes)
	}
	if _, err := json.Marshal(rep); err != nil {
		t.Fatal(err)
	}
}

// FuzzAnalyze: whatever the readings, Analyze returns an error or a report
// that marshals to JSON, and never panics.
func FuzzAnalyze(f *testing.F) {
	f.Add(1.0, 2.0, 3.0, 1.1, 1.9, 3.2, 0.5, uint8(0))
	f.Add(1e300, -1e300, 0.0, 1e-300, 5.0, -2.0, 1.0, uint8(3))
	f.Add(1.7e9, 1.7e9+1, 1.7e9+2, 1.0, 1.0, 1.5, 2.0, uint8(7))
	models := []Options{
		{}, {Model: ModelOrigin}, {Model: ModelDeming}, {Weights: WeightsX}, {Weights: WeightsPowerFit},
		{Transform: TransformLogY}, {Transform: TransformReciprocal}, {Transform: TransformLogLog}, {Transform: TransformSqrtY},
	}
	f.Fuzz(func(t *testing.T, x1, x2, x3, y1, y2, y3, p float64, m uint8) {
		o := models[int(m)%len(models)]
		o.PredictX = []float64{p}
		o.Inverse = []InverseQuery{{Y: []float64{y2}}}
		o.SkipAdvice = m%2 == 0
		rep, err := Analyze([]float64{x1, x2, x3, p}, []float64{y1, y2, y3, y1 + y3}, o)
		if err != nil {
			return
		}
		if _, err := json.Marshal(rep); err != nil {
			t.Fatalf("report does not marshal: %v", err)
		}
	})
}
