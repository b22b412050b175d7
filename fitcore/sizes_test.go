package fitcore

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"
)

// The gap between an exact quadratic and its least-squares line on five
// equally spaced points, worked by hand: y = x² at x = 0…4 has the line
// y = 4x − 2 (least squares: mean y 6, Sxy 40, Sxx 10), and x² − 4x + 2 is
// largest in size at x = 0 and 4 (2) and at the vertex x = 2 (−2).
func TestCurvatureGap(t *testing.T) {
	x := []float64{0, 1, 2, 3, 4}
	y := []float64{0, 1, 4, 9, 16}
	gap, pct, _, ok := curvatureGap(x, y, nil, false)
	if !ok || math.Abs(gap-2) > 1e-12 || math.Abs(pct-12.5) > 1e-10 {
		t.Errorf("gap %v (%v %%), ok %v; want 2 (12.5 %% of the span 16)", gap, pct, ok)
	}
	// A straight line has no gap.
	gap, _, _, ok = curvatureGap(x, []float64{1, 3, 5, 7, 9}, nil, false)
	if !ok || gap > 1e-12 {
		t.Errorf("straight line: gap %v, ok %v", gap, ok)
	}
}

// The scatter thirds and the drift, worked by hand on residuals given
// directly (invented). x = 0…8 puts readings 0–2 (x ≤ 8/3) in the lower
// third, 3–5 in the middle and 6–8 in the upper; residuals ±1 below and ±3
// above give RMS 1, √(2/3)·… as computed in each case.
func TestScatterThirdsAndDrift(t *testing.T) {
	x := []float64{0, 1, 2, 3, 4, 5, 6, 7, 8}
	for _, tc := range []struct {
		name           string
		e              []float64
		low, mid, high float64
		ratio, spread  float64
		matters        bool
		drift          float64
		driftMatters   bool
	}{
		// RMS of (1, −1, 1) is 1; of (2, −2, 0) √(8/3); of (3, −3, 3) 3.
		// Drift: slope of e on i by hand is Σ(i − 4)e/Σ(i − 4)² = 4/60,
		// times 8 over s = √(Σe²/7) = √(38/7).
		{"growing", []float64{1, -1, 1, 2, -2, 0, 3, -3, 3}, 1, math.Sqrt(8.0 / 3), 3, 3, 3, true,
			4.0 / 60 * 8 / math.Sqrt(38.0/7), false},
		// Even scatter: every third has RMS 1, ratio 1, and the
		// alternation has Σ(i − 4)e = 0: no drift. A steady rise
		// (e = (i − 4)/4, s = √(60/16/7)) is a drift of 2/s SDs.
		{"even", []float64{-1, 1, -1, 1, -1, 1, -1, 1, -1}, 1, 1, 1, 1, 1, false, 0, false},
		{"drift", []float64{-1, -0.75, -0.5, -0.25, 0, 0.25, 0.5, 0.75, 1}, math.Sqrt((1 + 0.5625 + 0.25) / 3),
			math.Sqrt((0.0625 + 0 + 0.0625) / 3), math.Sqrt((0.25 + 0.5625 + 1) / 3), 1,
			math.Sqrt((1+0.5625+0.25)/3) / math.Sqrt((0.0625+0+0.0625)/3), true, 2 / math.Sqrt(3.75/7), true},
	} {
		var d Departures
		d.scatterThirds(x, tc.e, nil, sizesScale(tc.e, nil), rangeOf)
		d.drift(tc.e, nil, 2, sizesScale(tc.e, nil))
		near := func(a, b float64) bool { return math.Abs(a-b) <= 1e-12*math.Max(1, math.Abs(b)) }
		if !d.KnownScatter || !near(d.ScatterLow, tc.low) || !near(d.ScatterMid, tc.mid) || !near(d.ScatterHigh, tc.high) ||
			!near(d.ScatterRatio, tc.ratio) || !near(d.ScatterSpread, tc.spread) || d.ScatterMatters != tc.matters {
			t.Errorf("%s: scatter %+v; want low %v mid %v high %v ratio %v spread %v matters %v", tc.name, d, tc.low, tc.mid, tc.high, tc.ratio, tc.spread, tc.matters)
		}
		if !d.KnownDrift || !near(d.Drift, tc.drift) || d.DriftMatters != tc.driftMatters {
			t.Errorf("%s: drift %v (matters %v); want %v (%v)", tc.name, d.Drift, d.DriftMatters, tc.drift, tc.driftMatters)
		}
	}
}

// A bend that the test sees at once but that is small in units: y = x +
// 0.002·x² with a tiny scatter on 200 readings (invented). The curvature p
// is far below CheckFailP, the gap (by hand, for x spread evenly over
// [0, L]: x² − (Lx − L²/6) is L²/6 at the ends, so 0.002·100/6 = 0.033;
// the 20 discrete levels give a little less) is a fraction of the allowed residual 0.5, so linearity is a Check with
// the sentence that says so; with an allowed residual of 0.02 it fails.
func TestSmallBendIsACheck(t *testing.T) {
	var x, y []float64
	for i := range 200 {
		v := float64(i%20) / 19 * 10
		x = append(x, v)
		y = append(y, v+0.002*v*v+0.0005*math.Sin(float64(7*i)))
	}
	for _, tc := range []struct {
		allowed float64
		want    Verdict
	}{{0.5, Warn}, {0.02, Fail}} {
		lim := tc.allowed
		rep, err := Analyze(x, y, Options{Acceptance: &Criteria{MaxResidual: &lim}})
		if err != nil {
			t.Fatal(err)
		}
		if rep.Checks.Curvature.P >= CheckFailP {
			t.Fatalf("curvature p %v, want clear evidence", rep.Checks.Curvature.P)
		}
		d := rep.Departures
		if d == nil || math.Abs(d.CurvatureGap-0.2/6) > 3e-3 || math.Abs(d.CurvatureGapOfAllowed-d.CurvatureGap/lim) > 1e-12 {
			t.Fatalf("departures %+v; want a gap of about 0.033", d)
		}
		a := rep.Assumptions.Linearity
		if a.Verdict != tc.want {
			t.Errorf("allowed %v: linearity %s (%s), want %s", lim, a.Verdict, a.Message, tc.want)
		}
		small := strings.Contains(a.Message, "statistically clear but small")
		if small != (tc.want == Warn) {
			t.Errorf("allowed %v: message %q", lim, a.Message)
		}
		if tc.want == Warn && rep.Checks.Curvature.Verdict != Warn {
			t.Errorf("the curvature test row says %s beside a Check", rep.Checks.Curvature.Verdict)
		}
	}
}

// TestCkAllFiniteAndSafeScale: ckAllFinite says what ckFirstNonFinite says
// and ckSafeScale (four running maxima) gives what one running maximum
// gives, on random arrays of every length up to 40 with NaN, ±Inf, signed
// zeros, subnormals and huge values put anywhere.
func TestCkAllFiniteAndSafeScale(t *testing.T) {
	r := rand.New(rand.NewPCG(8, 8))
	specials := []float64{math.NaN(), math.Inf(1), math.Inf(-1), 0, math.Copysign(0, -1), 5e-324, math.MaxFloat64, -1e300, 1e-300}
	oneMax := func(v []float64) float64 {
		var m float64
		for _, a := range v {
			m = max(m, math.Abs(a))
		}
		if m == 0 || !isFiniteNum(m) || (m >= 0x1p-100 && m <= 0x1p100) {
			return 1
		}
		_, e := math.Frexp(m)
		return math.Ldexp(1, -max(e, -1000))
	}
	for trial := range 20000 {
		v := make([]float64, r.IntN(41))
		for i := range v {
			v[i] = r.NormFloat64() * math.Pow(2, float64(r.IntN(400)-200))
			if r.IntN(8) == 0 {
				v[i] = specials[r.IntN(len(specials))]
			}
		}
		if got, want := ckAllFinite(v), ckFirstNonFinite("x", v) == ""; got != want {
			t.Fatalf("trial %d: ckAllFinite(%v) = %v, ckFirstNonFinite says %v", trial, v, got, want)
		}
		if got, want := ckSafeScale(v), oneMax(v); math.Float64bits(got) != math.Float64bits(want) {
			t.Fatalf("trial %d: ckSafeScale(%v) = %v, one running maximum %v", trial, v, got, want)
		}
	}
}
