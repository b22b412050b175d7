package fitcore

import (
	"encoding/json"
	"math"
	"reflect"
	"strings"
	"testing"
)

// FuzzOptions runs Analyze and Complete over the options (level, Box–Cox
// power, Deming δ, reading uncertainties, reference values, an x to
// predict at, an unknown's reading) and the scale of the data (x and y
// multiplied by 2^ex and 2^ey, shifted by an offset) on an invented
// record of eight readings. Whatever they are: no panic; an error or a
// report with no NaN or Inf anywhere (the scrubbing note never fires),
// every check finite with a known verdict, every assumption worded; and
// Analyze with SkipAdvice followed by Complete equals one Analyze. Found
// inputs are kept in testdata/fuzz/FuzzOptions.
func FuzzOptions(f *testing.F) {
	// The seeds include the inputs that panicked or misled (a level of
	// 1e-300, 5e-324 or 4.6e-216; a Box–Cox power of 500; δ = 1e308; an
	// unknown of 1e160; readings near 1e308).
	f.Add(0.95, 0.5, 1.0, 0.0, 0.0, 1.0, 0.0, 4.5, 5.0, int16(0), int16(0), 0.0, uint8(0))
	f.Add(1e-300, 0.5, 1.0, 0.0, 0.0, 1.0, 0.0, 4.5, 5.0, int16(0), int16(0), 0.0, uint8(5))
	f.Add(5e-324, 0.5, 1.0, 0.0, 0.0, 1.0, 0.0, 4.5, 5.0, int16(0), int16(0), 0.0, uint8(1))
	f.Add(4.6e-216, 0.5, 1.0, 0.1, 0.1, 1.0, 0.0, 4.5, 5.0, int16(0), int16(0), 0.0, uint8(0))
	f.Add(0.95, 500.0, 1.0, 0.0, 0.0, 1.0, 0.0, 4.5, 5.0, int16(0), int16(0), 0.0, uint8(5))
	f.Add(0.95, 0.5, 1e308, 0.0, 0.0, 1.0, 0.0, 4.5, 5.0, int16(0), int16(0), 0.0, uint8(3))
	f.Add(0.95, 0.5, 1.0, 0.0, 0.0, 1.0, 0.0, 4.5, 1e160, int16(0), int16(0), 0.0, uint8(0))
	f.Add(0.9, 0.5, 1.0, 0.0, 0.0, 1.0, 0.0, 4.5, 5.0, int16(1018), int16(1018), 0.0, uint8(0))
	f.Add(0.99, -2.0, 4.0, 0.2, 0.1, 0.9, 0.5, -3.0, 2.0, int16(-1050), int16(400), 1.7e9, uint8(2))
	f.Add(0.95, 0.5, 1.0, 0.0, 0.0, 1.0, 0.0, 4.5, 5.0, int16(0), int16(0), 0.0, uint8(8))
	f.Fuzz(func(t *testing.T, level, lambda, delta, xu, yu, sref, iref, px, iy float64, ex, ey int16, off float64, m uint8) {
		x := []float64{1, 2, 3, 4, 5, 6, 7, 8}
		y := []float64{1.12, 2.31, 2.88, 4.21, 5.07, 5.83, 7.24, 7.91}
		if m&8 != 0 { // readings exactly on a line, up to rounding
			for i, v := range x {
				y[i] = 0.3*v/10 + 0.7
			}
		}
		for i := range x {
			x[i] = math.Ldexp(x[i], int(ex)%1100) + off
			y[i] = math.Ldexp(y[i], int(ey)%1100)
		}
		opt := Options{Level: level, XUncertainty: xu, YUncertainty: yu, SlopeRef: &sref, InterceptRef: &iref,
			PredictX: []float64{px}, Inverse: []InverseQuery{{Y: []float64{iy}}, {Y: []float64{iy, y[2]}}}}
		switch m % 8 {
		case 1:
			opt.Model = ModelOrigin
		case 2:
			opt.Model, opt.Weights = ModelWeighted, WeightsX2
		case 3:
			opt.Model, opt.VarianceRatio = ModelDeming, delta
		case 4:
			opt.Transform = TransformLogY
		case 5:
			opt.Transform, opt.BoxCoxLambda = TransformBoxCox, &lambda
		case 6:
			opt.Transform = TransformBoxCox
		case 7:
			opt.Model, opt.Weights, opt.GivenWeights = ModelWeighted, WeightsGiven, []float64{1, 2, 1, 2, 1, 2, 1, delta}
		}
		rep, err := Analyze(x, y, opt)
		if err != nil {
			if rep != nil {
				t.Fatal("a report came back with the error")
			}
			if len(err.Error()) < 20 {
				t.Fatalf("error without a sentence: %q", err)
			}
			return
		}
		checkFuzzReport(t, rep)
		skip := opt
		skip.SkipAdvice = true
		part, err := Analyze(x, y, skip)
		if err != nil {
			t.Fatalf("SkipAdvice failed where the full analysis did not: %v", err)
		}
		if err := Complete(part, x, y, opt); err != nil {
			t.Fatalf("Complete: %v", err)
		}
		checkFuzzReport(t, part)
		if !reflect.DeepEqual(part, rep) {
			t.Errorf("Analyze with SkipAdvice then Complete differs from Analyze")
		}
	})
}

func checkFuzzReport(t *testing.T, rep *Report) {
	t.Helper()
	if _, err := json.Marshal(rep); err != nil {
		t.Fatalf("report does not marshal: %v", err)
	}
	for _, n := range rep.Notes {
		if strings.Contains(n, "could not be computed on these readings and are shown as 0") {
			t.Fatalf("a NaN or Inf reached the report: %s", n)
		}
	}
	c := rep.Checks
	for _, k := range []Check{c.Curvature, c.BreuschPagan, c.White, c.DurbinWatson, c.Runs, c.ShapiroWilk} {
		assertFiniteCheck(t, k)
		if k.Message == "" {
			t.Fatalf("%s: no message", k.Name)
		}
	}
	for _, k := range []*Check{c.LackOfFit, c.XExactness} {
		if k != nil {
			assertFiniteCheck(t, *k)
		}
	}
	a := rep.Assumptions
	for _, as := range []Assumption{a.Linearity, a.Spread, a.Independence, a.Normality, a.Influence} {
		switch as.Verdict {
		case Pass, Warn, Fail, NA:
		default:
			t.Fatalf("unknown verdict %q", as.Verdict)
		}
		if as.Message == "" {
			t.Fatal("an assumption without a message")
		}
	}
	if rep.Advice != nil && rep.Advice.Reason == "" {
		t.Fatal("advice without a reason")
	}
}
