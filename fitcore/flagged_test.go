package fitcore

import (
	"math"
	"math/rand/v2"
	"reflect"
	"testing"
)

// TestFlaggedInfluenceOnly: with Options.FlaggedInfluenceOnly the report
// is the full analysis's, field for field, except that Influence holds
// just the entries the full report flags, in the same order and equal to
// them (reasons included). The cases cover a slipped decimal point (found
// from the shorter list), outliers and high leverage, weights, a line
// through the origin, a transform, readings on an exact line (nothing
// flagged) and a big record where most readings are skipped as quiet.
func TestFlaggedInfluenceOnly(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 14))
	noisy := func(n int, outliers ...int) (x, y []float64) {
		for i := range n {
			x = append(x, float64(i)*0.5+1)
			y = append(y, 2+0.8*x[i]+0.1*r.NormFloat64())
		}
		for _, i := range outliers {
			y[i] += 3
		}
		return x, y
	}
	type tc struct {
		name string
		x, y []float64
		opt  Options
	}
	var cases []tc
	cases = append(cases, tc{"slipped decimal point",
		[]float64{0, 25, 50, 60, 75, 100, 0, 25, 50, 60, 75, 100},
		[]float64{4.01, 8.02, 11.98, 1.36, 16.03, 19.99, 3.99, 7.98, 12.02, 13.61, 15.98, 20.02}, Options{}})
	x, y := noisy(40, 3, 17)
	cases = append(cases, tc{"outliers", x, y, Options{}})
	x, y = noisy(30)
	x[29], y[29] = 80, 2+0.8*80+2
	cases = append(cases, tc{"high leverage", x, y, Options{}})
	x, y = noisy(25, 5)
	cases = append(cases, tc{"weighted", x, y, Options{Model: ModelWeighted, Weights: WeightsX2}},
		tc{"through the origin", x, y, Options{Model: ModelOrigin}},
		tc{"log scale", x, y, Options{Transform: TransformLogY}})
	cases = append(cases, tc{"exact line", []float64{1, 2, 3, 4, 5}, []float64{3, 5, 7, 9, 11}, Options{}})
	x, y = noisy(20000, 100, 9000, 15000)
	cases = append(cases, tc{"big record", x, y, Options{SkipAdvice: true}})
	for _, c := range cases {
		full, err := Analyze(c.x, c.y, c.opt)
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		o := c.opt
		o.FlaggedInfluenceOnly = true
		short, err := Analyze(c.x, c.y, o)
		if err != nil {
			t.Fatalf("%s, flagged only: %v", c.name, err)
		}
		var want []PointInfluence
		for _, p := range full.Influence {
			if p.Flagged {
				want = append(want, p)
			}
		}
		if len(short.Influence) != len(want) {
			t.Fatalf("%s: %d entries, want the %d flagged", c.name, len(short.Influence), len(want))
		}
		for i := range want {
			if !reflect.DeepEqual(short.Influence[i], want[i]) && !sameNaN(short.Influence[i], want[i]) {
				t.Errorf("%s: entry %d = %+v, the full report's %+v", c.name, i, short.Influence[i], want[i])
			}
		}
		t.Logf("%s: %d of %d readings flagged", c.name, len(want), len(c.x))
		full.Influence, short.Influence = nil, nil
		if !reflect.DeepEqual(full, short) {
			t.Errorf("%s: the rest of the report differs with FlaggedInfluenceOnly", c.name)
		}
		if c.name == "slipped decimal point" && (short.Slip == nil || short.Slip.Index != 3) {
			t.Errorf("the slipped decimal point is not found from the flagged readings: %+v", short.Slip)
		}
	}
}

// sameNaN: a and b are equal where NaN counts as equal to NaN.
func sameNaN(a, b PointInfluence) bool {
	eq := func(u, v float64) bool { return u == v || (math.IsNaN(u) && math.IsNaN(v)) }
	return a.Index == b.Index && eq(a.Leverage, b.Leverage) && eq(a.Residual, b.Residual) && eq(a.Studentized, b.Studentized) &&
		eq(a.OutlierP, b.OutlierP) && eq(a.CooksD, b.CooksD) && eq(a.DFFITS, b.DFFITS) && a.Flagged == b.Flagged && reflect.DeepEqual(a.Reasons, b.Reasons)
}
