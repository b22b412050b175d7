package fitcore_test

import (
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"pairline/fitcore"
)

// The golden files in testdata/golden are written by
// testdata/refgen/gen_golden.py with Debian's python3-statsmodels and
// python3-scipy (versions recorded in each file's "generator" block). Each
// file names its data source: NIST/SEMATECH e-Handbook datasets, NIST StRD,
// or invented seeded data marked "invented". The data are stored in the
// file, so these tests do not need ../shared.

const goldenDir = "../testdata/golden"

// Tolerances. A value passes when |got − want| ≤ abs + rel·|want|; for a
// p-value (pScaled) rel is multiplied by max(1, |ln p|), because a tail
// probability inherits the relative error of its statistic amplified by
// |d ln p / d ln stat| ≈ |ln p| (χ², F and t tails), so p = 1e-40 is only as
// good as 1e-7·92 relative when the statistic is good to 1e-9.
var (
	tolEstimate  = tol{rel: 1e-9, abs: 1e-12} // estimates, SEs, t, intervals, R², F, SS
	tolP         = tol{rel: 1e-7, abs: 1e-250, pScaled: true}
	tolCheck     = tol{rel: 1e-8, abs: 1e-12} // check statistics (auxiliary regressions)
	tolInfluence = tol{rel: 1e-8, abs: 1e-10}
	// scipy 1.10's Shapiro–Wilk (swilk) works in single precision: its
	// arguments are float32 arrays (see scipy.stats._statlib.swilk.__doc__),
	// so W is good to about 1e-7 and its p, a steep function of W, to about
	// 1e-5 relative. fitcore works in float64; the tolerances are the
	// reference's precision, not fitcore's.
	tolShapiroW = tol{rel: 1e-6, abs: 0}
	tolShapiroP = tol{rel: 1e-4, abs: 1e-9}
	tolBoxCox   = tol{rel: 0, abs: 1e-6} // λ from two different optimisers
	tolInverse  = tol{rel: 1e-8, abs: 1e-12}
)

type tol struct {
	rel, abs float64
	pScaled  bool
}

// boxCoxMin and boxCoxMax are the λ range fitcore.BoxCoxProfile documents searching; an
// interval end outside it is reported as the bound itself.
const boxCoxMin, boxCoxMax = -3.0, 3.0

type goldenFile struct {
	Name      string            `json:"name"`
	Source    string            `json:"source"`
	Invented  bool              `json:"invented"`
	Generator map[string]string `json:"generator"`
	X         []float64         `json:"x"`
	Y         []float64         `json:"y"`
	Fits      []goldenFit       `json:"fits"`
}

type goldenSpec struct {
	Model    string      `json:"model"`
	Weights  string      `json:"weights"`
	Level    float64     `json:"level"`
	PredictX []float64   `json:"predict_x"`
	Inverse  [][]float64 `json:"inverse"`
}

type goldenCoef struct {
	Estimate, SE, T, P float64
	CILow              float64 `json:"ci_low"`
	CIHigh             float64 `json:"ci_high"`
	Ref                float64 `json:"ref"`
	TRef               float64 `json:"t_ref"`
	PRef               float64 `json:"p_ref"`
}

type goldenCheck struct {
	Statistic *float64 `json:"statistic"`
	DF        *float64 `json:"df"`
	DF2       *float64 `json:"df2"`
	P         *float64 `json:"p"`
}

type goldenFit struct {
	Spec              goldenSpec  `json:"spec"`
	N                 int         `json:"n"`
	DF                float64     `json:"df"`
	Level             float64     `json:"level"`
	Slope             goldenCoef  `json:"slope"`
	Intercept         *goldenCoef `json:"intercept"`
	CovSlopeIntercept float64     `json:"cov_slope_intercept"`
	ResidualSE        float64     `json:"residual_se"`
	RSquared          float64     `json:"r_squared"`
	AdjRSquared       float64     `json:"adj_r_squared"`
	F                 float64     `json:"f"`
	FP                float64     `json:"f_p"`
	Anova             map[string]struct {
		DF float64 `json:"df"`
		SS float64 `json:"ss"`
	} `json:"anova"`
	Predictions []struct {
		X, Fit float64
		CILow  float64  `json:"ci_low"`
		CIHigh float64  `json:"ci_high"`
		PILow  *float64 `json:"pi_low"`  // null: no weight defined for a new reading
		PIHigh *float64 `json:"pi_high"` //
	} `json:"predictions"`
	Influence *struct {
		Leverage    []*float64 `json:"leverage"`
		Residual    []*float64 `json:"residual"`
		Studentized []*float64 `json:"studentized"`
		CooksD      []*float64 `json:"cooks_distance"`
		DFFITS      []*float64 `json:"dffits"`
		OutlierP    []*float64 `json:"outlier_p"`
	} `json:"influence"`
	Inverse []struct {
		Y       []float64 `json:"y"`
		YMean   float64   `json:"y_mean"`
		M       int       `json:"m"`
		X       float64   `json:"x"`
		SE      float64   `json:"se"`
		Bounded bool      `json:"bounded"`
		Low     *float64  `json:"low"`
		High    *float64  `json:"high"`
	} `json:"inverse"`
	Checks *struct {
		BreuschPagan *goldenCheck `json:"breusch_pagan"`
		White        *goldenCheck `json:"white"`
		DurbinWatson *goldenCheck `json:"durbin_watson"`
		ShapiroWilk  *goldenCheck `json:"shapiro_wilk"`
		Curvature    *goldenCheck `json:"curvature"`
		LackOfFit    *goldenCheck `json:"lack_of_fit"`
	} `json:"checks"`
	BoxCox *struct {
		Lambda  *float64 `json:"lambda"`
		CILow   *float64 `json:"ci_low"`
		CIHigh  *float64 `json:"ci_high"`
		AtBound bool     `json:"lambda_at_bound"`
	} `json:"box_cox"`
}

func loadGoldens(t testing.TB) []goldenFile {
	t.Helper()
	paths, err := filepath.Glob(filepath.Join(goldenDir, "golden_*.json"))
	if err != nil || len(paths) == 0 {
		t.Fatalf("no golden files in %s (regenerate with testdata/refgen/gen_golden.py): %v", goldenDir, err)
	}
	var out []goldenFile
	for _, p := range paths {
		b, err := os.ReadFile(p)
		if err != nil {
			t.Fatal(err)
		}
		var g goldenFile
		if err := json.Unmarshal(b, &g); err != nil {
			t.Fatalf("%s: %v", p, err)
		}
		if g.Source == "" || g.Generator["statsmodels"] == "" {
			t.Fatalf("%s: golden file lacks its source or generator versions", p)
		}
		out = append(out, g)
	}
	return out
}

// goldenOptions turns a golden fit's spec into Analyze options.
func goldenOptions(t testing.TB, s goldenSpec) fitcore.Options {
	t.Helper()
	opt := fitcore.Options{Level: s.Level, PredictX: s.PredictX}
	switch s.Model {
	case "ols":
		opt.Model = fitcore.ModelOLS
	case "origin":
		opt.Model = fitcore.ModelOrigin
	case "weighted":
		opt.Model = fitcore.ModelWeighted
		opt.Weights = fitcore.WeightScheme(s.Weights)
	default:
		t.Fatalf("golden spec with unknown model %q", s.Model)
	}
	for _, q := range s.Inverse {
		opt.Inverse = append(opt.Inverse, fitcore.InverseQuery{Y: q})
	}
	return opt
}

// cmp records one comparison; src names the reference beside the check.
type cmp struct {
	t   *testing.T
	src string
}

func (c cmp) near(what string, got, want float64, tl tol) {
	c.t.Helper()
	if math.IsNaN(got) || math.IsInf(got, 0) {
		c.t.Errorf("%s: got non-finite %v, want %.15g [%s]", what, got, want, c.src)
		return
	}
	rel := tl.rel
	if tl.pScaled && want > 0 {
		rel *= math.Max(1, -math.Log(want))
	}
	if d := math.Abs(got - want); d > tl.abs+rel*math.Abs(want) {
		c.t.Errorf("%s: got %.15g, want %.15g (rel diff %.2e, tolerance rel %.1e abs %.0e) [%s]",
			what, got, want, d/math.Abs(want), rel, tl.abs, c.src)
	}
}

// nearPtr compares against a golden value that may be null (not finite in
// the reference library); then got must only be finite (the Report never
// carries NaN or Inf).
func (c cmp) nearPtr(what string, got float64, want *float64, tl tol) {
	c.t.Helper()
	if want == nil {
		if math.IsNaN(got) || math.IsInf(got, 0) {
			c.t.Errorf("%s: got non-finite %v where the reference is undefined [%s]", what, got, c.src)
		}
		return
	}
	c.near(what, got, *want, tl)
}

func (c cmp) coef(what string, got fitcore.Coefficient, want goldenCoef) {
	c.t.Helper()
	// The intercept's t is ~0 when its estimate is ~0; an absolute floor of
	// 1e-9 on t keeps the comparison meaningful without a spurious failure.
	tT := tol{rel: tolEstimate.rel, abs: 1e-9}
	c.near(what+".estimate", got.Estimate, want.Estimate, tol{rel: tolEstimate.rel, abs: 1e-9 * want.SE})
	c.near(what+".se", got.SE, want.SE, tolEstimate)
	c.near(what+".t", got.T, want.T, tT)
	c.near(what+".p", got.P, want.P, tolP)
	c.near(what+".ci_low", got.CILow, want.CILow, tol{rel: tolEstimate.rel, abs: 1e-9 * want.SE})
	c.near(what+".ci_high", got.CIHigh, want.CIHigh, tol{rel: tolEstimate.rel, abs: 1e-9 * want.SE})
	c.near(what+".ref", got.Ref, want.Ref, tol{})
	c.near(what+".t_ref", got.TRef, want.TRef, tT)
	c.near(what+".p_ref", got.PRef, want.PRef, tolP)
}

func anovaRow(rep *fitcore.Report, name string) *fitcore.AnovaRow {
	for i := range rep.Anova {
		if strings.EqualFold(rep.Anova[i].Source, name) {
			return &rep.Anova[i]
		}
	}
	return nil
}

func fitName(s goldenSpec) string {
	n := s.Model
	if s.Weights != "" {
		n += "_" + s.Weights
	}
	if s.Level != 0 && s.Level != 0.95 {
		n += fmt.Sprintf("_level%g", s.Level)
	}
	return n
}

// TestGolden compares Analyze with statsmodels/scipy on every golden file.
func TestGolden(t *testing.T) {
	for _, g := range loadGoldens(t) {
		for _, gf := range g.Fits {
			t.Run(g.Name+"/"+fitName(gf.Spec), func(t *testing.T) {
				src := "statsmodels " + g.Generator["statsmodels"] + "/scipy " + g.Generator["scipy"] +
					" on " + g.Source
				c := cmp{t: t, src: src}
				rep, err := fitcore.Analyze(g.X, g.Y, goldenOptions(t, gf.Spec))
				if err != nil {
					t.Fatalf("Analyze: %v [%s]", err, src)
				}
				compareFit(c, rep, gf, len(g.X))
				a := rep.Assumptions
				for _, m := range []string{a.Linearity.Message, a.Spread.Message, a.Independence.Message, a.Normality.Message, a.Influence.Message} {
					if s := repeatedSentence(m); s != "" {
						t.Errorf("the sentence %q appears twice in %q", s, m)
					}
				}
			})
		}
	}
}

// repeatedSentence returns a sentence (its words before any figures in
// brackets) that appears twice in msg, or "".
func repeatedSentence(msg string) string {
	seen := map[string]bool{}
	for _, sent := range strings.SplitAfter(msg, ". ") {
		k := strings.TrimSpace(strings.TrimSuffix(strings.TrimSpace(sent), "."))
		if i := strings.Index(k, " ("); i > 0 {
			k = k[:i]
		}
		if k != "" && seen[k] {
			return k
		}
		seen[k] = true
	}
	return ""
}

func compareFit(c cmp, rep *fitcore.Report, gf goldenFit, n int) {
	t := c.t
	t.Helper()
	if rep.N != gf.N {
		t.Errorf("n: got %d, want %d [%s]", rep.N, gf.N, c.src)
	}
	c.near("df", rep.DF, gf.DF, tol{})

	// statsmodels OLS/WLS params, bse, tvalues, pvalues, conf_int, t_test.
	c.coef("slope", rep.Slope, gf.Slope)
	if gf.Intercept != nil {
		c.coef("intercept", rep.Intercept, *gf.Intercept)
		c.near("cov_slope_intercept", rep.CovSlopeIntercept, gf.CovSlopeIntercept,
			tol{rel: tolEstimate.rel, abs: 1e-9 * gf.Slope.SE * gf.Intercept.SE})
	}
	// statsmodels sqrt(scale), rsquared, rsquared_adj, fvalue, f_pvalue.
	c.near("residual_se", rep.ResidualSE, gf.ResidualSE, tolEstimate)
	c.near("r_squared", rep.RSquared, gf.RSquared, tolEstimate)
	c.near("adj_r_squared", rep.AdjRSquared, gf.AdjRSquared, tolEstimate)
	c.near("f", rep.F, gf.F, tolEstimate)
	c.near("f_p", rep.FP, gf.FP, tolP)

	// statsmodels ess / ssr and their degrees of freedom.
	for _, name := range []string{"regression", "residual"} {
		want, ok := gf.Anova[name]
		if !ok {
			continue
		}
		row := anovaRow(rep, name)
		if row == nil {
			t.Errorf("anova: no %q row in %+v [%s]", name, rep.Anova, c.src)
			continue
		}
		c.near("anova."+name+".df", row.DF, want.DF, tol{})
		c.near("anova."+name+".ss", row.SS, want.SS,
			tol{rel: tolEstimate.rel, abs: 1e-12 * (gf.Anova["regression"].SS + gf.Anova["residual"].SS)})
	}

	// get_prediction(...).summary_frame(alpha).
	if len(rep.Predictions) != len(gf.Predictions) {
		t.Errorf("predictions: got %d, want %d [%s]", len(rep.Predictions), len(gf.Predictions), c.src)
	} else {
		for i, w := range gf.Predictions {
			g := rep.Predictions[i]
			p := fmt.Sprintf("predictions[%d] (x=%g)", i, w.X)
			scale := 1e-9 * gf.ResidualSE
			c.near(p+".x", g.X, w.X, tol{})
			c.near(p+".fit", g.Fit, w.Fit, tol{rel: tolEstimate.rel, abs: scale})
			c.near(p+".ci_low", g.CILow, w.CILow, tol{rel: tolEstimate.rel, abs: scale})
			c.near(p+".ci_high", g.CIHigh, w.CIHigh, tol{rel: tolEstimate.rel, abs: scale})
			c.nearPtr(p+".pi_low", g.PILow, w.PILow, tol{rel: tolEstimate.rel, abs: scale})
			c.nearPtr(p+".pi_high", g.PIHigh, w.PIHigh, tol{rel: tolEstimate.rel, abs: scale})
		}
	}

	if inf := gf.Influence; inf != nil {
		// get_influence(): hat_matrix_diag, resid_studentized_external,
		// cooks_distance, dffits; outlier_test(method="bonf").
		if len(rep.Influence) != n {
			t.Errorf("influence: got %d rows, want %d [%s]", len(rep.Influence), n, c.src)
		} else {
			resTol := tol{rel: tolInfluence.rel, abs: 1e-9 * gf.ResidualSE}
			for i := 0; i < n; i++ {
				g := rep.Influence[i]
				p := fmt.Sprintf("influence[%d]", i)
				if g.Index != i {
					t.Errorf("%s.index: got %d [%s]", p, g.Index, c.src)
				}
				c.nearPtr(p+".leverage", g.Leverage, inf.Leverage[i], tolInfluence)
				c.nearPtr(p+".residual", g.Residual, inf.Residual[i], resTol)
				c.nearPtr(p+".studentized", g.Studentized, inf.Studentized[i], tolInfluence)
				c.nearPtr(p+".cooks_distance", g.CooksD, inf.CooksD[i], tolInfluence)
				c.nearPtr(p+".dffits", g.DFFITS, inf.DFFITS[i], tolInfluence)
				c.nearPtr(p+".outlier_p", g.OutlierP, inf.OutlierP[i], tolP)
			}
		}
	}

	// Fieller interval by inverting statsmodels' prediction band; SE by the
	// delta method on statsmodels' cov_params.
	if len(gf.Inverse) > 0 {
		if len(rep.Inverse) != len(gf.Inverse) {
			t.Errorf("inverse: got %d, want %d [%s]", len(rep.Inverse), len(gf.Inverse), c.src)
		} else {
			for i, w := range gf.Inverse {
				g := rep.Inverse[i]
				p := fmt.Sprintf("inverse[%d] (y=%v)", i, w.Y)
				c.near(p+".y", g.Y, w.YMean, tolEstimate)
				if g.M != w.M {
					t.Errorf("%s.m: got %d, want %d [%s]", p, g.M, w.M, c.src)
				}
				c.near(p+".x", g.X, w.X, tolInverse)
				c.near(p+".se", g.SE, w.SE, tolInverse)
				if g.Bounded != w.Bounded {
					t.Errorf("%s.bounded: got %v, want %v [%s]", p, g.Bounded, w.Bounded, c.src)
				}
				if w.Bounded {
					c.nearPtr(p+".low", g.Low, w.Low, tolInverse)
					c.nearPtr(p+".high", g.High, w.High, tolInverse)
				}
			}
		}
	}

	if ch := gf.Checks; ch != nil {
		rc := rep.Checks
		// Below fitcore.MinResidualDF residual degrees of freedom the
		// residual-pattern checks are n/a by design (their residuals follow
		// from the x values: NoInt2 has n − p = 1 and statsmodels gives the
		// forced BP = 0, W = 0.75); the reference is then not compared and
		// the check must say n/a.
		if int(rep.DF) < fitcore.MinResidualDF {
			for _, k := range []fitcore.Check{rc.BreuschPagan, rc.White, rc.DurbinWatson, rc.Runs, rc.ShapiroWilk} {
				if k.Verdict != fitcore.NA {
					t.Errorf("%s: %s with %v residual df, want n/a below %d", k.Name, k.Verdict, rep.DF, fitcore.MinResidualDF)
				}
			}
			cp := *ch
			cp.BreuschPagan, cp.White, cp.DurbinWatson, cp.ShapiroWilk = nil, nil, nil, nil
			ch = &cp
		}
		// het_breuschpagan(resid, [1, x], robust=True).
		checkAgainst(c, "breusch_pagan", rc.BreuschPagan, ch.BreuschPagan, tolCheck, tolP)
		// het_white(resid, [1, x]).
		checkAgainst(c, "white", rc.White, ch.White, tolCheck, tolP)
		// durbin_watson(resid): statistic only (statsmodels gives no p).
		// fitcore documents NA below k+2 = 4 readings, where d carries no
		// information about drift.
		if ch.DurbinWatson != nil && n >= 4 {
			c.nearPtr("durbin_watson.statistic", rc.DurbinWatson.Statistic, ch.DurbinWatson.Statistic, tolCheck)
		}
		// scipy.stats.shapiro(resid) (Royston's algorithm AS R94).
		checkAgainst(c, "shapiro_wilk", rc.ShapiroWilk, ch.ShapiroWilk, tolShapiroW, tolShapiroP)
		// OLS with an added centred x² term: t and p of that term.
		checkAgainst(c, "curvature", rc.Curvature, ch.Curvature, tolCheck, tolP)
		// anova_lm(y ~ x, y ~ C(x)).
		if ch.LackOfFit == nil {
			if rc.LackOfFit != nil && rc.LackOfFit.Verdict != fitcore.NA {
				t.Errorf("lack_of_fit: got %+v where the reference has no repeats to test [%s]", *rc.LackOfFit, c.src)
			}
		} else if rc.LackOfFit == nil {
			t.Errorf("lack_of_fit: got nil, want F = %v [%s]", *ch.LackOfFit.Statistic, c.src)
		} else {
			checkAgainst(c, "lack_of_fit", *rc.LackOfFit, ch.LackOfFit, tolCheck, tolP)
		}
	}

	// Profile-likelihood Box–Cox λ (scipy optimiser on statsmodels SSR).
	if bc := gf.BoxCox; bc != nil && !bc.AtBound && bc.Lambda != nil {
		if rep.BoxCox == nil {
			t.Errorf("box_cox: got nil, want λ = %v [%s]", *bc.Lambda, c.src)
		} else {
			c.nearPtr("box_cox.lambda", rep.BoxCox.Lambda, bc.Lambda, tolBoxCox)
			lo, hi := boxCoxMin, boxCoxMax // the reference end lies beyond the searched range
			if bc.CILow != nil && *bc.CILow > boxCoxMin {
				lo = *bc.CILow
			}
			if bc.CIHigh != nil && *bc.CIHigh < boxCoxMax {
				hi = *bc.CIHigh
			}
			c.near("box_cox.ci_low", rep.BoxCox.CILow, lo, tolBoxCox)
			c.near("box_cox.ci_high", rep.BoxCox.CIHigh, hi, tolBoxCox)
		}
	}
}

func checkAgainst(c cmp, name string, got fitcore.Check, want *goldenCheck, ts, tp tol) {
	c.t.Helper()
	if want == nil {
		return // the reference could not run it on these data
	}
	if got.Verdict == fitcore.NA {
		c.t.Errorf("%s: got NA (%s), want statistic %v [%s]", name, got.Message, *want.Statistic, c.src)
		return
	}
	c.nearPtr(name+".statistic", got.Statistic, want.Statistic, ts)
	if want.DF != nil {
		c.near(name+".df", got.DF, *want.DF, tol{})
	}
	if want.DF2 != nil {
		c.near(name+".df2", got.DF2, *want.DF2, tol{})
	}
	if want.P != nil {
		c.nearPtr(name+".p", got.P, want.P, tp)
	}
}
