package fitcore

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestDWQuickWindow: a refit of the advice takes the Durbin–Watson p from
// the beta approximation when that p lies outside [CheckFailP/3,
// 5·CheckWarnP]. Outside the window the approximation must give the same
// side of both thresholds as the exact p (Imhof's integral, itself checked
// against R in TestDurbinWatsonExactR), or the advice could judge a remedy
// on a verdict the screen would not show. Residuals are drawn with AR(1)
// correlation ρ from −0.6 to 0.6 so that p covers the whole range, on
// calibration-like designs (standards with repeats) and spread x, seeded.
func TestDWQuickWindow(t *testing.T) {
	r := rand.New(rand.NewPCG(7, 11))
	side := func(p float64) int {
		switch {
		case p < CheckFailP:
			return 2
		case p < CheckWarnP:
			return 1
		}
		return 0
	}
	checked, inWindow := 0, 0
	for _, n := range []int{8, 12, 20, 40, 100, 400, 1000} {
		for trial := 0; trial < 60; trial++ {
			rho := -0.6 + 1.2*r.Float64()
			x := make([]float64, n)
			e := make([]float64, n)
			prev := 0.0
			for i := range x {
				if trial%2 == 0 {
					x[i] = float64(i % 6) // six standards, repeats
				} else {
					x[i] = r.Float64() * 100
				}
				prev = rho*prev + r.NormFloat64()
				e[i] = prev
			}
			dz, ok := newDWDesign(x, nil, false)
			if !ok {
				continue
			}
			// Residuals of the fitted line: e minus its projection.
			res := olsResiduals(x, e)
			d, ok := ckDWStat(res)
			if !ok {
				continue
			}
			mean, variance := dz.moments()
			bcdf, bok := ckDWBetaCDF(d, mean, variance)
			f, fok := dz.cdf(d)
			if !bok || !fok {
				continue
			}
			pb := 2 * math.Min(bcdf, 1-bcdf)
			pe := 2 * math.Min(f, 1-f)
			if dwNearThreshold(pb) {
				inWindow++
				continue
			}
			checked++
			if side(pb) != side(pe) {
				t.Errorf("n=%d ρ=%.2f: beta p %.3g and exact p %.3g fall on different sides of the thresholds", n, rho, pb, pe)
			}
		}
	}
	t.Logf("%d cases outside the window agree; %d inside it are computed exactly", checked, inWindow)
	if checked < 200 || inWindow < 10 {
		t.Fatalf("the draw covers too little: %d outside, %d inside the window", checked, inWindow)
	}
}

// olsResiduals are the residuals of y on [1, x] by least squares.
func olsResiduals(x, y []float64) []float64 {
	var mx, my float64
	for i := range x {
		mx += x[i]
		my += y[i]
	}
	mx /= float64(len(x))
	my /= float64(len(x))
	var sxx, sxy float64
	for i := range x {
		sxx += (x[i] - mx) * (x[i] - mx)
		sxy += (x[i] - mx) * (y[i] - my)
	}
	b := sxy / sxx
	out := make([]float64, len(x))
	for i := range x {
		out[i] = y[i] - my - b*(x[i]-mx)
	}
	return out
}
