package fitcore_test

import (
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"pairline/fitcore"
)

type standardsCase struct {
	Name     string    `json:"name"`
	Model    string    `json:"model"`
	X        []float64 `json:"x"`
	Y        []float64 `json:"y"`
	UX       []float64 `json:"u_x"`
	UnknownY []float64 `json:"unknown_y"`
	Level    float64   `json:"level"`
	X0       float64   `json:"x0"`
	MCU      float64   `json:"mc_u"`
	MCSE     float64   `json:"mc_se"`
	LinU     float64   `json:"lin_u"`
	SEFit    float64   `json:"se_fit"`
	UC       float64   `json:"u_c"`
	NuEff    float64   `json:"nu_eff"`
	T        float64   `json:"t"`
	Low      float64   `json:"low"`
	High     float64   `json:"high"`
}

func near(got, want, rel float64) bool {
	return math.Abs(got-want) <= rel*math.Abs(want)
}

// TestStandardsMonteCarlo checks Inverse.UStandards, SEFit, SE and the
// interval against testdata/golden/standards_mc.json, written by
// testdata/refgen/standards_mc.py (invented data): a Monte Carlo
// propagation of distributions with numpy (JCGM 101:2008, 10⁶ draws), the
// law of propagation with numpy finite-difference sensitivities (JCGM
// 100:2008 §5.1.2), the fit's SE from statsmodels OLS and the t quantile
// from scipy. Against the Monte Carlo the tolerance is 4 Monte Carlo
// standard errors plus 0.2 % for the curvature of x̂0 in xᵢ that the
// first-order law leaves out; against the finite differences 10⁻⁶
// relative (their truncation and rounding error).
func TestStandardsMonteCarlo(t *testing.T) {
	b, err := os.ReadFile(filepath.Join(goldenDir, "standards_mc.json"))
	if err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Cases []standardsCase `json:"cases"`
	}
	if err := json.Unmarshal(b, &doc); err != nil {
		t.Fatal(err)
	}
	if len(doc.Cases) == 0 {
		t.Fatal("no cases")
	}
	for _, c := range doc.Cases {
		t.Run(c.Name, func(t *testing.T) {
			rep, err := fitcore.Analyze(c.X, c.Y, fitcore.Options{Model: fitcore.Model(c.Model), Level: c.Level,
				Inverse: []fitcore.InverseQuery{{Y: c.UnknownY}}, XStandardUncertainties: c.UX, SkipAdvice: true})
			if err != nil {
				t.Fatal(err)
			}
			inv := rep.Inverse[0]
			if !near(inv.X, c.X0, 1e-9) {
				t.Errorf("x = %.12g, numpy %.12g", inv.X, c.X0)
			}
			if d := math.Abs(inv.UStandards - c.MCU); d > 4*c.MCSE+2e-3*c.MCU {
				t.Errorf("u from the standards = %.8g, Monte Carlo %.8g ± %.2g (difference %.3g)", inv.UStandards, c.MCU, c.MCSE, d)
			}
			if !near(inv.UStandards, c.LinU, 1e-6) {
				t.Errorf("u from the standards = %.12g, finite-difference propagation %.12g", inv.UStandards, c.LinU)
			}
			if !near(inv.SEFit, c.SEFit, 1e-9) {
				t.Errorf("SE of the fit = %.12g, statsmodels %.12g", inv.SEFit, c.SEFit)
			}
			if !near(inv.SE, c.UC, 1e-6) {
				t.Errorf("combined u = %.12g, reference %.12g", inv.SE, c.UC)
			}
			if !inv.Bounded || !near(inv.Low, c.Low, 1e-7) || !near(inv.High, c.High, 1e-7) {
				t.Errorf("interval %.10g … %.10g (bounded %v), reference %.10g … %.10g (t %.8g, ν_eff %.6g)", inv.Low, inv.High, inv.Bounded, c.Low, c.High, c.T, c.NuEff)
			}
			if !strings.Contains(inv.Message, "combined standard uncertainty") {
				t.Errorf("message %q does not say how the interval is made", inv.Message)
			}
		})
	}
}

// TestStandardsFiniteDifference checks each sensitivity ∂x̂0/∂xᵢ of the
// doc comment of XStandardUncertainties against central differences of
// whole refits by Analyze itself: with u(xⱼ) = 1 for one j and 0 for the
// others, UStandards is |∂x̂0/∂xⱼ|. Invented data; the step is 10⁻⁵ of the
// x range and the tolerance 10⁻⁶ relative (common practice for central
// differences of a smooth function).
func TestStandardsFiniteDifference(t *testing.T) {
	x := []float64{0.5, 1.1, 2.0, 3.2, 4.1, 5.0, 6.3}
	y := []float64{2.9, 4.4, 6.1, 8.9, 10.6, 12.7, 15.3}
	for _, model := range []fitcore.Model{fitcore.ModelOLS, fitcore.ModelOrigin} {
		for _, y0 := range []float64{3.3, 9.0, 14.8} {
			x0 := func(xs []float64) float64 {
				rep, err := fitcore.Analyze(xs, y, fitcore.Options{Model: model, Inverse: []fitcore.InverseQuery{{Y: []float64{y0}}}, SkipAdvice: true})
				if err != nil {
					t.Fatal(err)
				}
				return rep.Inverse[0].X
			}
			h := 1e-5 * (6.3 - 0.5)
			for j := range x {
				xp := append([]float64(nil), x...)
				xm := append([]float64(nil), x...)
				xp[j] += h
				xm[j] -= h
				fd := math.Abs(x0(xp)-x0(xm)) / (2 * h)
				u := make([]float64, len(x))
				u[j] = 1
				rep, err := fitcore.Analyze(x, y, fitcore.Options{Model: model, Inverse: []fitcore.InverseQuery{{Y: []float64{y0}}}, XStandardUncertainties: u, SkipAdvice: true})
				if err != nil {
					t.Fatal(err)
				}
				if got := rep.Inverse[0].UStandards; !near(got, fd, 1e-6) {
					t.Errorf("%s, y0 %g, x[%d]: |∂x̂0/∂x| = %.10g, central difference %.10g", model, y0, j, got, fd)
				}
			}
		}
	}
}

// TestStandardsOptions: what is refused, what is left out and said so, and
// that zero uncertainties change nothing.
func TestStandardsOptions(t *testing.T) {
	x := []float64{1, 2, 3, 4, 5, 6}
	y := []float64{1.1, 2.3, 2.9, 4.2, 4.9, 6.1}
	q := []fitcore.InverseQuery{{Y: []float64{3.5}}}
	base, err := fitcore.Analyze(x, y, fitcore.Options{Inverse: q, SkipAdvice: true})
	if err != nil {
		t.Fatal(err)
	}
	ones := []float64{0.1, 0.1, 0.1, 0.1, 0.1, 0.1}
	tests := []struct {
		name    string
		opt     fitcore.Options
		wantErr bool
		check   func(inv fitcore.Inverse) string
	}{
		{"wrong length", fitcore.Options{XStandardUncertainties: []float64{1, 2}}, true, nil},
		{"negative", fitcore.Options{XStandardUncertainties: []float64{0, 0, -1, 0, 0, 0}}, true, nil},
		{"not finite", fitcore.Options{XStandardUncertainties: []float64{0, 0, math.NaN(), 0, 0, 0}}, true, nil},
		{"all zero: as without", fitcore.Options{XStandardUncertainties: make([]float64, 6)}, false, func(inv fitcore.Inverse) string {
			if inv != base.Inverse[0] {
				return fmt.Sprintf("%+v, want %+v", inv, base.Inverse[0])
			}
			return ""
		}},
		{"weighted: not included, said so", fitcore.Options{Model: fitcore.ModelWeighted, Weights: fitcore.WeightsX, XStandardUncertainties: ones}, false, func(inv fitcore.Inverse) string {
			if inv.UStandards != 0 || !strings.Contains(inv.Message, "not included") {
				return fmt.Sprintf("UStandards %g, message %q", inv.UStandards, inv.Message)
			}
			return ""
		}},
		{"log transform: not included, said so", fitcore.Options{Transform: fitcore.TransformLogY, XStandardUncertainties: ones}, false, func(inv fitcore.Inverse) string {
			if inv.UStandards != 0 || !strings.Contains(inv.Message, "not included") {
				return fmt.Sprintf("UStandards %g, message %q", inv.UStandards, inv.Message)
			}
			return ""
		}},
		{"ols: larger than without", fitcore.Options{XStandardUncertainties: ones}, false, func(inv fitcore.Inverse) string {
			if !(inv.SE > base.Inverse[0].SE) || inv.SEFit != base.Inverse[0].SE || !(inv.High-inv.Low > base.Inverse[0].High-base.Inverse[0].Low) {
				return fmt.Sprintf("SE %g (fit %g, without %g)", inv.SE, inv.SEFit, base.Inverse[0].SE)
			}
			return ""
		}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			o := tc.opt
			o.Inverse, o.SkipAdvice = q, true
			rep, err := fitcore.Analyze(x, y, o)
			if tc.wantErr {
				var oe *fitcore.OptionError
				if !errors.As(err, &oe) || oe.Option != "x_standard_uncertainties" {
					t.Fatalf("error %v, want an OptionError for x_standard_uncertainties", err)
				}
				return
			}
			if err != nil {
				t.Fatal(err)
			}
			if msg := tc.check(rep.Inverse[0]); msg != "" {
				t.Error(msg)
			}
		})
	}
}

// ExampleOptions_xStandardUncertainties converts an unknown's readings to x
// with the standards' certified uncertainties included (invented data).
func ExampleOptions_xStandardUncertainties() {
	x := []float64{100, 200, 400, 600, 800, 1000} // certified values of the standards
	y := []float64{101, 199, 403, 598, 805, 1002} // meter readings
	u := []float64{0.5, 0.5, 1.0, 1.5, 2.0, 2.5}  // their standard uncertainties, x units
	unknown := fitcore.InverseQuery{Y: []float64{512, 515}}
	rep, err := fitcore.Analyze(x, y, fitcore.Options{Inverse: []fitcore.InverseQuery{unknown}, XStandardUncertainties: u, SkipAdvice: true})
	if err != nil {
		fmt.Println(err)
		return
	}
	inv := rep.Inverse[0]
	fmt.Printf("x = %.1f, u = %.2f (fit %.2f, standards %.2f)\n", inv.X, inv.SE, inv.SEFit, inv.UStandards)
	fmt.Printf("95 %% interval %.1f to %.1f\n", inv.Low, inv.High)
	// Output:
	// x = 512.2, u = 2.25 (fit 2.16, standards 0.62)
	// 95 % interval 505.9 to 518.4
}
