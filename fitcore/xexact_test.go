package fitcore

import (
	"fmt"
	"math"
	"testing"
)

// TestXExactnessReference compares the OLS slope, its SE and the Deming
// slope with statsmodels OLS and scipy.odr (which, with constant sx and sy,
// is the Deming fit with δ = sy²/sx²) on an invented data set whose x
// readings carry error (checks.json). ODR is iterative, hence 1e-7.
func TestXExactnessReference(t *testing.T) {
	for _, c := range loadRef(t).XExact {
		t.Run(c.Name, func(t *testing.T) {
			got, a := XExactness(c.X, c.Y, c.XU, c.YU, 0.95)
			assertFiniteCheck(t, got)
			refCheck(t, "z", got.Statistic, c.Z, 1e-6, 1e-6)
			mx, _ := ckMeanSD(c.X)
			my, _ := ckMeanSD(c.Y)
			var sxx, syy, sxy float64
			for i := range c.X {
				sxx += (c.X[i] - mx) * (c.X[i] - mx)
				syy += (c.Y[i] - my) * (c.Y[i] - my)
				sxy += (c.X[i] - mx) * (c.Y[i] - my)
			}
			uy := c.YU
			if uy == 0 {
				uy = c.OLSSE * math.Sqrt(sxx) // = residual SE
			}
			bd, ok := ckDemingSlope(sxx, syy, sxy, uy*uy/(c.XU*c.XU))
			if !ok {
				t.Fatal("Deming slope failed")
			}
			refCheck(t, "Deming slope", bd, c.DemingSlope, 1e-7, 0)
			if a.Verdict != got.Verdict || a.Message == "" {
				t.Errorf("assumption %+v vs check %+v", a, got)
			}
		})
	}
}

func TestXExactnessEdges(t *testing.T) {
	x := []float64{1, 2, 3, 4, 5}
	y := []float64{1.1, 1.9, 3.2, 3.9, 5.1}
	// Invented: 80 readings, x observed with a deterministic ±0.35 rms error.
	xn, yn := make([]float64, 80), make([]float64, 80)
	for i := range xn {
		xt := 1 + 0.05*float64(i)
		xn[i] = xt + 0.35*math.Sqrt2*math.Sin(2.1*float64(i))
		yn[i] = 2*xt + 0.01*math.Cos(3.7*float64(i))
	}
	tests := []struct {
		name   string
		x, y   []float64
		xu, yu float64
		want   Verdict
	}{
		{"no x uncertainty", x, y, 0, 0.1, NA},
		{"tiny x uncertainty", x, y, 1e-6, 0.1, Pass},
		// x error of ±0.35 on a narrow range (sd of x ≈ 1.15), 80 readings:
		// bias/SE ≈ √n·u_x/sd(x) ≈ 2.7 (Fuller 1987, §1.1 attenuation)
		{"large x uncertainty", xn, yn, 0.35, 0.01, Fail},
		{"negative y uncertainty", x, y, 0.1, -1, NA},
		{"exact line", x, []float64{1, 2, 3, 4, 5}, 0.1, 0.1, NA},
		{"no trend", []float64{1, 2, 3}, []float64{1, 2, 1}, 0.1, 0.1, NA},
		{"two points", x[:2], y[:2], 0.1, 0.1, NA},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			c, a := XExactness(tc.x, tc.y, tc.xu, tc.yu, 0.95)
			assertFiniteCheck(t, c)
			if c.Verdict != tc.want || a.Verdict != tc.want {
				t.Errorf("verdict %s/%s, want %s (%s)", c.Verdict, a.Verdict, tc.want, c.Message)
			}
		})
	}
}

func ExampleXExactness() {
	// Invented: a field thermometer (x, ±0.5 °C) against a lab probe (y, ±0.05 °C).
	x := []float64{5.2, 9.6, 15.4, 19.8, 25.3, 29.5}
	y := []float64{5.0, 10.1, 15.0, 20.2, 24.9, 30.1}
	c, a := XExactness(x, y, 0.5, 0.05, 0.95)
	fmt.Println(c.Verdict, a.Verdict)
	// Output: pass pass
}
