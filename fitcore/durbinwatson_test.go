package fitcore

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// TestDurbinWatsonReference compares d with statsmodels durbin_watson, the
// null mean and variance of d (unweighted design) with the dense-matrix
// traces tr(MA), tr(MAMA) of Durbin & Watson (1950) computed by numpy, and
// the beta-approximation p from them with scipy.stats.beta (checks.json).
// The exact p of the check is compared with R in TestDurbinWatsonExactR.
func TestDurbinWatsonReference(t *testing.T) {
	for _, c := range refCases(t) {
		t.Run(c.Name, func(t *testing.T) {
			r := refResid(t, c)
			got := DurbinWatson(c.X, r, c.Origin)
			assertFiniteCheck(t, got)
			refCheck(t, "d", got.Statistic, c.DurbinWatson.D, 1e-9, 1e-12)
			mean, variance, ok := ckDWMoments(c.X, c.Origin)
			if !ok {
				t.Fatal("moments failed")
			}
			refCheck(t, "E[d]", mean, c.DurbinWatson.Mean, 1e-10, 1e-12)
			refCheck(t, "Var[d]", variance, c.DurbinWatson.Var, 1e-8, 1e-12)
			cdf, ok := ckDWBetaCDF(got.Statistic, mean, variance)
			if !ok {
				t.Fatal("beta approximation failed")
			}
			refCheck(t, "p (beta approximation)", ckClampP(2*math.Min(cdf, 1-cdf)), c.DurbinWatson.P, 1e-6, 1e-300)
		})
	}
}

func TestDurbinWatsonEdges(t *testing.T) {
	tests := []struct {
		name     string
		x, resid []float64
		origin   bool
		want     Verdict
	}{
		{"too few", []float64{1, 2, 3}, []float64{1, -2, 1}, false, NA},
		{"zeros", []float64{1, 2, 3, 4, 5}, []float64{0, 0, 0, 0, 0}, false, NA},
		{"alternating", []float64{1, 2, 3, 4, 5, 6, 7, 8, 9, 10}, []float64{1, -1, 1, -1, 1, -1, 1, -1, 1, -1}, false, Warn}, // p = 0.003: warns at 1 %, fails below 0.1 %
		{"through origin, few", []float64{1, 2, 3, 4}, []float64{0.1, -0.2, 0.1, 0.05}, true, Pass},
		{"x all zero through origin", []float64{0, 0, 0, 0, 0}, []float64{1, -1, 1, -1, 1}, true, NA},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := DurbinWatson(tc.x, tc.resid, tc.origin)
			assertFiniteCheck(t, got)
			if got.Verdict != tc.want {
				t.Errorf("verdict %s, want %s (%s)", got.Verdict, tc.want, got.Message)
			}
		})
	}
}

// dwExactRef is testdata/golden/dw_exact.json (testdata/refgen/dw_ref.R).
type dwExactRef struct {
	R      string `json:"r"`
	LMTest string `json:"lmtest"`
	Cases  []struct {
		Name        string    `json:"name"`
		Source      string    `json:"source"`
		Origin      bool      `json:"origin"`
		XJ          []float64 `json:"x"`
		YJ          []float64 `json:"y"`
		WJ          []float64 `json:"w"`
		D           float64   `json:"d"`
		LMTestExact bool      `json:"lmtest_exact"`
		Greater     float64   `json:"greater"`
		TwoSided    float64   `json:"two_sided"`
		Imhof       float64   `json:"imhof"`
	} `json:"cases"`
}

// TestDurbinWatsonExactR compares the exact Durbin–Watson p with R: F(d) =
// P(D ≤ d) with lmtest::dwtest(exact = TRUE, alternative = "greater")
// (Pan's algorithm) and with Imhof's integral on the eigenvalues computed
// in R (eigen, integrate), and the check's two-sided p with alternative
// "two.sided" (R and lmtest versions in the file). Weighted sets are fitted
// here by Analyze, so the whitened design, the Pearson residuals and d all
// come from fitcore; R fitted the whitened model √w·y on √w, √w·x. The
// tolerance is 1e-9 absolute (the integral is taken to about 1e-11) or
// 1e-6 relative.
func TestDurbinWatsonExactR(t *testing.T) {
	raw, err := os.ReadFile(filepath.Join("..", "testdata", "golden", "dw_exact.json"))
	if err != nil {
		t.Fatal(err)
	}
	var ref dwExactRef
	if err := json.Unmarshal(raw, &ref); err != nil {
		t.Fatal(err)
	}
	src := ref.R + ", lmtest " + ref.LMTest
	for _, c := range ref.Cases {
		t.Run(c.Name, func(t *testing.T) {
			var dw Check
			if c.Origin && c.WJ != nil {
				// Analyze fits no weighted line through the origin; the
				// check itself takes that design.
				f, err := fitLS(c.XJ, c.YJ, c.WJ, true)
				if err != nil {
					t.Fatal(err)
				}
				_, e := f.fittedResiduals(c.XJ, c.YJ)
				for i := range e {
					e[i] *= math.Sqrt(c.WJ[i])
				}
				dw = DurbinWatsonWeighted(c.XJ, e, c.WJ, true)
			} else {
				opt := Options{SkipAdvice: true}
				if c.Origin {
					opt.Model = ModelOrigin
				}
				if c.WJ != nil {
					opt.Model, opt.Weights, opt.GivenWeights = ModelWeighted, WeightsGiven, c.WJ
				}
				rep, err := Analyze(c.XJ, c.YJ, opt)
				if err != nil {
					t.Fatal(err)
				}
				dw = rep.Checks.DurbinWatson
			}
			refCheck(t, "d ("+src+")", dw.Statistic, c.D, 1e-10, 1e-12)
			dz, ok := newDWDesign(c.XJ, c.WJ, c.Origin)
			if !ok {
				t.Fatal("design failed")
			}
			f, ok := dz.cdf(dw.Statistic)
			if !ok {
				t.Fatal("exact F(d) failed")
			}
			refCheck(t, "F(d) against Imhof in R ("+src+")", f, c.Imhof, 1e-6, 1e-9)
			if c.LMTestExact {
				refCheck(t, "F(d) against dwtest greater ("+src+")", f, c.Greater, 1e-6, 1e-9)
				refCheck(t, "p against dwtest two.sided ("+src+")", dw.P, c.TwoSided, 1e-6, 1e-9)
			}
			if !strings.Contains(dw.Message, "exact") {
				t.Errorf("message does not say the p is exact: %s", dw.Message)
			}
		})
	}
}

// TestDurbinWatsonWeightedMoments: the null mean and variance of d for a
// weighted fit come from the whitened design √W·X. Computed another way:
// the traces tr(MA) and tr((MA)²) with dense matrices (gonum),
// M = I − Z(ZᵀZ)⁻¹Zᵀ, on invented weighted designs, with and without an
// intercept. The unweighted design's moments differ (the old p's error).
func TestDurbinWatsonWeightedMoments(t *testing.T) {
	for _, origin := range []bool{false, true} {
		n := 40
		x := make([]float64, n)
		w := make([]float64, n)
		for i := range x {
			x[i] = 0.5 + 0.3*float64(i) + 0.1*math.Sin(float64(i))
			w[i] = 1 / (x[i] * x[i])
		}
		k := 2
		if origin {
			k = 1
		}
		z := mat.NewDense(n, k, nil)
		for i := range n {
			s := math.Sqrt(w[i])
			if origin {
				z.Set(i, 0, s*x[i])
			} else {
				z.Set(i, 0, s)
				z.Set(i, 1, s*x[i])
			}
		}
		var ztz, inv, h mat.Dense
		ztz.Mul(z.T(), z)
		if err := inv.Inverse(&ztz); err != nil {
			t.Fatal(err)
		}
		h.Product(z, &inv, z.T())
		m := mat.NewDense(n, n, nil)
		a := mat.NewDense(n, n, nil)
		for i := range n {
			for j := range n {
				v := -h.At(i, j)
				if i == j {
					v++
				}
				m.Set(i, j, v)
			}
			a.Set(i, i, 2)
			if i == 0 || i == n-1 {
				a.Set(i, i, 1)
			}
			if i > 0 {
				a.Set(i, i-1, -1)
				a.Set(i-1, i, -1)
			}
		}
		var ma, mama mat.Dense
		ma.Mul(m, a)
		mama.Mul(&ma, &ma)
		p, q := mat.Trace(&ma), mat.Trace(&mama)
		dfr := float64(n - k)
		wantMean := p / dfr
		wantVar := 2 * (q - p*wantMean) / (dfr * (dfr + 2))
		dz, ok := newDWDesign(x, w, origin)
		if !ok {
			t.Fatal("design")
		}
		mean, variance := dz.moments()
		refCheck(t, "E[d] weighted", mean, wantMean, 1e-12, 1e-14)
		refCheck(t, "Var[d] weighted", variance, wantVar, 1e-10, 1e-14)
		if m0, v0, _ := ckDWMoments(x, origin); math.Abs(m0-mean) < 1e-6 && math.Abs(v0-variance) < 1e-6 {
			t.Errorf("weighted and unweighted moments agree (%v, %v): the test cannot tell them apart", mean, variance)
		}
	}
}
