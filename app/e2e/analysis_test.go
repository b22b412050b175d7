//go:build e2e

package e2e

import (
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/chromedp"

	"pairline/app/numfmt"
	"pairline/app/session"
	"pairline/app/wording"
	"pairline/fitcore"
)

// The data sets below are invented for these tests (the fictional
// Larkwater Valley Water Board); none is a real measurement.

// anCalibration is an invented conductivity probe check against ten
// reference standards (µS/cm): a nearly ideal straight line.
var anCalibration = [][2]string{
	{"0", "1.8"}, {"100", "101.9"}, {"200", "200.7"}, {"300", "302.6"}, {"400", "401.1"},
	{"500", "499.4"}, {"600", "601.8"}, {"700", "700.2"}, {"800", "802.1"}, {"900", "899.0"},
	{"1000", "1001.3"}, {"1200", "1198.8"},
}

// anPercentPairs is invented: y = 2x·(1 + 0.06·ε), ε standard normal from
// a seeded PCG, x log-spaced over two decades, so the scatter is a
// constant percentage of the reading.
func anPercentPairs(n int, seed uint64) [][2]string {
	r := rand.New(rand.NewPCG(seed, 7))
	out := make([][2]string, n)
	for i := range out {
		x := math.Pow(10, 2*float64(i)/float64(n-1))
		y := 2 * x * (1 + 0.06*r.NormFloat64())
		out[i] = [2]string{strconv.FormatFloat(x, 'f', 3, 64), strconv.FormatFloat(y, 'f', 3, 64)}
	}
	return out
}

// anParsed parses the pairs as the app does (session.ParseNumber).
func anParsed(t testing.TB, pairs [][2]string) (x, y []float64) {
	t.Helper()
	for _, p := range pairs {
		a, err := session.ParseNumber(p[0])
		if err != nil {
			t.Fatal(err)
		}
		b, err := session.ParseNumber(p[1])
		if err != nil {
			t.Fatal(err)
		}
		x, y = append(x, a), append(y, b)
	}
	return x, y
}

// anFill types the pairs into the grid through input events on the cells
// (adding rows with the add-row button), as fast as the app takes them.
func anFill(t *testing.T, b *browser, pairs [][2]string) {
	t.Helper()
	anFillRaw(t, b, pairs)
	waitFor(t, b, "the line from the typed pairs", fmt.Sprintf(`tid("result-n")?.dataset.value === "%d"`, len(pairs)), 20*time.Second)
}

// anNumAttr reads a numeric attribute of an element.
func anNumAttr(t *testing.T, b *browser, testid, name string) float64 {
	t.Helper()
	v := attr(t, b, testid, name)
	f, err := strconv.ParseFloat(v, 64)
	if err != nil {
		t.Fatalf("%s has %s %q: %v", testid, name, v, err)
	}
	return f
}

// relClose compares to 1e-12 relative (the browser's wasm and the native
// test may differ in the last bits of math library calls).
func relClose(got, want float64) bool {
	if got == want {
		return true
	}
	return math.Abs(got-want) <= 1e-12*math.Max(math.Abs(want), 1e-300)
}

func anExpect(t *testing.T, b *browser, testid, name string, want float64) {
	t.Helper()
	if got := anNumAttr(t, b, testid, name); !relClose(got, want) {
		t.Errorf("%s %s = %v, fitcore says %v", testid, name, got, want)
	}
}

func anAnalyze(t testing.TB, x, y []float64, o fitcore.Options) *fitcore.Report {
	t.Helper()
	rep, err := fitcore.Analyze(x, y, o)
	if err != nil {
		t.Fatal(err)
	}
	return rep
}

// anCheckVerdicts compares every check row's data-verdict with fitcore's
// Assumptions.
func anCheckVerdicts(t *testing.T, b *browser, a fitcore.Assumptions) {
	t.Helper()
	for id, v := range map[string]fitcore.Verdict{
		"check-linearity": a.Linearity.Verdict, "check-spread": a.Spread.Verdict,
		"check-independence": a.Independence.Verdict, "check-normality": a.Normality.Verdict,
		"check-influence": a.Influence.Verdict,
	} {
		if got := attr(t, b, id, "data-verdict"); got != string(v) {
			t.Errorf("%s data-verdict = %q, fitcore says %q", id, got, v)
		}
	}
	if a.XExactness == nil {
		if exists(t, b, "check-x-exactness") {
			t.Error("check-x-exactness is shown without an x uncertainty")
		}
	} else if got := attr(t, b, "check-x-exactness", "data-verdict"); got != string(a.XExactness.Verdict) {
		t.Errorf("check-x-exactness data-verdict = %q, fitcore says %q", got, a.XExactness.Verdict)
	}
}

// TestAnalysisScreens follows a technician through the analysis cards on an
// invented conductivity calibration: every number on screen equals
// fitcore's for the same readings and settings, the check verdicts match,
// an unknown is converted, a prediction made, acceptance criteria judged
// and saved as a template.
func TestAnalysisScreens(t *testing.T) {
	srv := startServer(t)
	b := newBrowser(t, tablet)
	b.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, b, "the app to start", appReady, 60*time.Second)
	anFill(t, b, anCalibration)
	x, y := anParsed(t, anCalibration)
	rep := anAnalyze(t, x, y, fitcore.Options{})

	// Headline figures and the "More numbers" disclosure.
	anExpect(t, b, "result-slope", "data-value", rep.Slope.Estimate)
	anExpect(t, b, "result-intercept", "data-value", rep.Intercept.Estimate)
	if exists(t, b, "more-numbers-body") {
		t.Error("More numbers must start closed")
	}
	click(t, b, "more-numbers")
	waitFor(t, b, "More numbers to open", `!!tid("more-numbers-body")`, 5*time.Second)
	for id, want := range map[string]float64{
		"result-slope-estimate": rep.Slope.Estimate, "result-slope-se": rep.Slope.SE, "result-slope-t": rep.Slope.T,
		"result-slope-p": rep.Slope.P, "result-slope-ci-low": rep.Slope.CILow, "result-slope-ci-high": rep.Slope.CIHigh,
		"result-slope-t-ref": rep.Slope.TRef, "result-slope-p-ref": rep.Slope.PRef, "result-slope-ref": rep.Slope.Ref,
		// The intercept's reference is 0, so its test against 0 is shown
		// once, as result-intercept-t-ref/-p-ref (app/e2e/wording_test.go).
		"result-intercept-se":     rep.Intercept.SE,
		"result-intercept-ci-low": rep.Intercept.CILow, "result-intercept-ci-high": rep.Intercept.CIHigh,
		"result-intercept-t-ref": rep.Intercept.TRef, "result-intercept-p-ref": rep.Intercept.PRef,
		"result-residual-se-full": rep.ResidualSE, "result-df": rep.DF, "result-r-full": rep.R,
		"result-r-squared-full": rep.RSquared, "result-adj-r-squared": rep.AdjRSquared,
		"result-f": rep.F, "result-f-p": rep.FP, "result-cov": rep.CovSlopeIntercept,
		"anova-0-ss": rep.Anova[0].SS, "anova-1-ss": rep.Anova[1].SS, "anova-2-ss": rep.Anova[2].SS,
		"anova-1-ms": rep.Anova[1].MS, "anova-0-f": rep.Anova[0].F, "anova-1-df": rep.Anova[1].DF,
	} {
		anExpect(t, b, id, "data-value", want)
	}

	// Checks: verdicts as fitcore's, numbers behind a tap.
	anCheckVerdicts(t, b, rep.Assumptions)
	if exists(t, b, "test-curvature-p") {
		t.Error("the test numbers must start hidden")
	}
	click(t, b, "check-linearity-more")
	waitFor(t, b, "the linearity numbers", `!!tid("test-curvature-p")`, 5*time.Second)
	anExpect(t, b, "test-curvature-p", "data-value", rep.Checks.Curvature.P)
	anExpect(t, b, "test-curvature-statistic", "data-value", rep.Checks.Curvature.Statistic)
	click(t, b, "check-spread-more")
	waitFor(t, b, "the spread numbers", `!!tid("test-breusch-pagan-p")`, 5*time.Second)
	anExpect(t, b, "test-breusch-pagan-p", "data-value", rep.Checks.BreuschPagan.P)
	if h := eval[float64](t, b, `tid("check-spread-more").getBoundingClientRect().height`); h < 48 {
		t.Errorf("the numbers button is %v px high, want at least 48", h)
	}
	if got := attr(t, b, "advice", "data-transform"); got != string(rep.Advice.Remedy) {
		t.Errorf("advice data-transform = %q, fitcore says %q", got, rep.Advice.Remedy)
	}

	// Use the line: three repeat readings of an unknown (decimal comma,
	// semicolons and spaces), and a prediction.
	setValue(t, b, "inverse-input", "455,2; 456,0 455.6", "input")
	waitFor(t, b, "the inverse result", `!!tid("inverse-result")`, 10*time.Second)
	setValue(t, b, "predict-input", "650", "input")
	waitFor(t, b, "the prediction", `!!tid("predict-result")`, 10*time.Second)
	q := anAnalyze(t, x, y, fitcore.Options{Inverse: []fitcore.InverseQuery{{Y: []float64{455.2, 456.0, 455.6}}}, PredictX: []float64{650}})
	inv := q.Inverse[0]
	if !inv.Bounded || attr(t, b, "inverse-result", "data-bounded") != "true" {
		t.Errorf("inverse bounded: fitcore %v, screen %q", inv.Bounded, attr(t, b, "inverse-result", "data-bounded"))
	}
	if got := attr(t, b, "inverse-result", "data-m"); got != "3" {
		t.Errorf("inverse used %s readings, want 3", got)
	}
	anExpect(t, b, "inverse-result", "data-value", inv.X)
	anExpect(t, b, "inverse-result", "data-low", inv.Low)
	anExpect(t, b, "inverse-result", "data-high", inv.High)
	p := q.Predictions[0]
	anExpect(t, b, "predict-result", "data-value", p.Fit)
	anExpect(t, b, "predict-result", "data-ci-low", p.CILow)
	anExpect(t, b, "predict-result", "data-pi-high", p.PIHigh)
	if q.Limits == nil {
		t.Fatal("fitcore gives no limits for an untransformed calibration")
	}
	anExpect(t, b, "limits", "data-lod", q.Limits.LOD)
	anExpect(t, b, "limits", "data-loq", q.Limits.LOQ)
	setValue(t, b, "inverse-input", "455.2 abc", "input")
	waitFor(t, b, "the inverse problem", `!!tid("inverse-problem")`, 5*time.Second)

	// Acceptance: no criteria → n/a; a passing set; a failing set.
	if got := attr(t, b, "verdict", "data-verdict"); got != "n/a" {
		t.Errorf("verdict without criteria = %q, want n/a", got)
	}
	if !exists(t, b, "caution") {
		t.Error("no caution beside the verdict")
	}
	setValue(t, b, "acceptance-min-r2", "0.9999", "change")
	waitFor(t, b, "the verdict", `tid("verdict").dataset.verdict !== "n/a"`, 10*time.Second)
	setValue(t, b, "acceptance-slope-low", "0.995", "change")
	setValue(t, b, "acceptance-slope-high", "1.005", "change")
	setValue(t, b, "acceptance-max-residual", "0,2", "change")
	setValue(t, b, "acceptance-residual-percent", "", "click")
	crit := fitcore.Criteria{MinRSquared: ptr(0.9999), SlopeLow: ptr(0.995), SlopeHigh: ptr(1.005), MaxResidual: ptr(0.2), MaxResidualPercentOfSpan: true}
	want := anAnalyze(t, x, y, fitcore.Options{Acceptance: &crit}).Acceptance
	wantV := "fail"
	if want.Pass {
		wantV = "pass"
	}
	// Three results: R², the slope window (one criterion) and the residual.
	waitFor(t, b, "three criteria judged", `tids("verdict-reason").length === 3 &&
		tid("verdict-reason", '[data-name="max_residual"]').textContent.includes("% of the span")`, 10*time.Second)
	if got := attr(t, b, "verdict", "data-verdict"); got != wantV {
		t.Errorf("verdict = %q, fitcore says %q (%s)", got, wantV, want.Summary)
	}
	screenshot(t, b, "analysis-tablet")
	setValue(t, b, "acceptance-max-residual", "0.001", "change")
	crit.MaxResidual = ptr(0.001)
	want = anAnalyze(t, x, y, fitcore.Options{Acceptance: &crit}).Acceptance
	if want.Pass {
		t.Fatal("a residual limit of 0.001 % of the span should fail these invented readings")
	}
	waitFor(t, b, "the failing verdict", `tid("verdict").dataset.verdict === "fail"`, 10*time.Second)

	// Templates: save, reload (localStorage), use in a new session, delete.
	setValue(t, b, "template-name", "Weekly probe check (invented)", "input")
	click(t, b, "template-save")
	waitFor(t, b, "the template", `!!tid("template-item", '[data-name="Weekly probe check (invented)"]')`, 5*time.Second)
	click(t, b, "session-new")
	waitFor(t, b, "a new session", `tid("usable-count").dataset.value === "0"`, 10*time.Second)
	b.do(t, chromedp.Reload())
	waitFor(t, b, "the app after reload", appReady, 30*time.Second)
	anFill(t, b, anCalibration)
	click(t, b, "template-use")
	waitFor(t, b, "the template's verdict", `tid("verdict").dataset.verdict === "fail"`, 10*time.Second)
	if got := valueOf(t, b, "acceptance-max-residual"); got != "0.001" {
		t.Errorf("template residual limit shows %q, want 0.001", got)
	}
	click(t, b, "template-delete")
	click(t, b, "template-delete-confirm")
	waitFor(t, b, "the template to go", `!tid("template-item")`, 5*time.Second)
	if n := eval[int](t, b, `JSON.parse(localStorage.getItem("pairline.acceptance-templates") || "[]").length`); n != 0 {
		t.Errorf("%d templates left in localStorage after delete", n)
	}

	// Settings: an x uncertainty adds the x-exactness check; the level
	// changes the intervals.
	setValue(t, b, "settings-x-uncertainty", "2", "change")
	waitFor(t, b, "the x-exactness check", `!!tid("check-x-exactness")`, 10*time.Second)
	click(t, b, "settings-level-99")
	if !exists(t, b, "more-numbers-body") {
		click(t, b, "more-numbers") // UI state: closed again after the reload
	}
	withX := anAnalyze(t, x, y, fitcore.Options{XUncertainty: 2, Level: 0.99, Acceptance: &crit})
	waitFor(t, b, "the 99 % intervals", fmt.Sprintf(`tid("result-slope-ci-low")?.dataset.value === %q`, strconv.FormatFloat(withX.Slope.CILow, 'g', -1, 64)), 10*time.Second)
	anCheckVerdicts(t, b, withX.Assumptions)
	click(t, b, "settings-model-origin")
	origin := anAnalyze(t, x, y, fitcore.Options{Model: fitcore.ModelOrigin, XUncertainty: 2, Level: 0.99})
	waitFor(t, b, "the line through zero", fmt.Sprintf(`tid("result-slope")?.dataset.value === %q`, strconv.FormatFloat(origin.Slope.Estimate, 'g', -1, 64)), 10*time.Second)
	screenshot(t, b, "analysis-settings-tablet")

	// Weighted (1/ŷ² by default, then 1/x², which the blank standard at
	// x = 0 cannot take: fitcore's sentence is shown and the settings stay
	// reachable), then Deming with a variance ratio.
	click(t, b, "settings-model-weighted")
	wls := anAnalyze(t, x, y, fitcore.Options{Model: fitcore.ModelWeighted, Weights: fitcore.WeightsFitted2, XUncertainty: 2, Level: 0.99})
	waitFor(t, b, "the weighted line", fmt.Sprintf(`tid("result-slope")?.dataset.value === %q`, strconv.FormatFloat(wls.Slope.Estimate, 'g', -1, 64)), 10*time.Second)
	click(t, b, "settings-weights-x2")
	if _, err := fitcore.Analyze(x, y, fitcore.Options{Model: fitcore.ModelWeighted, Weights: fitcore.WeightsX2}); err == nil {
		t.Fatal("fitcore takes 1/x² weights with a reading at x = 0")
	}
	waitFor(t, b, "the sentence instead of a line", `!!tid("result-message") && !!tid("settings-model-deming")`, 10*time.Second)
	click(t, b, "settings-model-deming")
	waitFor(t, b, "the variance ratio field", `!!tid("settings-variance-ratio")`, 10*time.Second)
	setValue(t, b, "settings-variance-ratio", "4", "change")
	dem := anAnalyze(t, x, y, fitcore.Options{Model: fitcore.ModelDeming, VarianceRatio: 4, XUncertainty: 2, Level: 0.99})
	waitFor(t, b, "the Deming line", fmt.Sprintf(`tid("result-slope")?.dataset.value === %q`, strconv.FormatFloat(dem.Slope.Estimate, 'g', -1, 64)), 10*time.Second)
	anExpect(t, b, "result-intercept", "data-value", dem.Intercept.Estimate)

	// Phone size.
	bp := newBrowser(t, phone)
	bp.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, bp, "the app on a phone", appReady, 60*time.Second)
	anFill(t, bp, anCalibration)
	setValue(t, bp, "inverse-input", "455,2; 456,0 455.6", "input")
	setValue(t, bp, "acceptance-min-r2", "0.9999", "change")
	click(t, bp, "more-numbers")
	click(t, bp, "check-influence-more")
	click(t, bp, "check-independence-more")
	waitFor(t, bp, "the inverse result on a phone", `!!tid("inverse-result")`, 10*time.Second)
	screenshot(t, bp, "analysis-phone")
	if w := eval[float64](t, bp, `document.documentElement.scrollWidth`); w > 392 {
		t.Errorf("the page is %v px wide on a 390 px phone: something overflows: %s", w, eval[string](t, bp, `[...document.querySelectorAll('main *')].filter(e => !e.closest('.an-scroll') && e.getBoundingClientRect().right > 392 && !(e.parentElement && e.parentElement.getBoundingClientRect().right > 392)).slice(0, 8).map(e => e.tagName + '.' + e.className + '[' + (e.dataset.testid || '') + '] w=' + Math.round(e.getBoundingClientRect().width) + ' parent=' + e.parentElement.tagName + '.' + e.parentElement.className).join('; ')`))
	}
}

func ptr(v float64) *float64 { return &v }

// TestAnalysisAdvice: on invented readings whose scatter is a constant
// percentage of the reading, the advice (fitcore's) is a log scale (common
// practice: a log scale turns a constant percentage error into an even
// scatter); one tap applies it (the fit changes to fitcore's on that
// scale, and stays after a reload: it is stored with the session), one tap
// reverts.
func TestAnalysisAdvice(t *testing.T) {
	srv := startServer(t)
	b := newBrowser(t, tablet)
	b.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, b, "the app to start", appReady, 60*time.Second)
	pairs := anPercentPairs(40, 3)
	anFill(t, b, pairs)
	x, y := anParsed(t, pairs)
	rep := anAnalyze(t, x, y, fitcore.Options{})
	remedy := rep.Advice.Remedy
	if remedy != fitcore.RemedyLogY && remedy != fitcore.RemedyLogLog {
		t.Fatalf("fitcore advises %q on constant-percentage error, want a log scale", remedy)
	}
	if got := attr(t, b, "advice", "data-transform"); got != string(remedy) {
		t.Fatalf("advice data-transform = %q, fitcore says %q", got, remedy)
	}
	anCheckVerdicts(t, b, rep.Assumptions)
	var cand fitcore.Candidate
	for _, c := range rep.Advice.Candidates {
		if c.Remedy == remedy {
			cand = c
		}
	}
	anExpect(t, b, "advice-slope-after", "data-value", cand.Slope)
	anExpect(t, b, "advice-slope-before", "data-value", rep.Slope.Estimate)
	if got := attr(t, b, "advice-row-spread", "data-after"); got != string(rep.Advice.After.Assumptions.Spread.Verdict) {
		t.Errorf("after-spread verdict %q, fitcore says %q", got, rep.Advice.After.Assumptions.Spread.Verdict)
	}
	screenshot(t, b, "analysis-advice-tablet")

	click(t, b, "advice-apply")
	tr := anAnalyze(t, x, y, fitcore.Options{Transform: fitcore.Transform(remedy)})
	waitFor(t, b, "the fit on the log scale", fmt.Sprintf(`tid("result-slope")?.dataset.value === %q`, strconv.FormatFloat(tr.Slope.Estimate, 'g', -1, 64)), 10*time.Second)
	if !relClose(tr.Slope.Estimate, cand.Slope) {
		t.Errorf("applied slope %v differs from the advice's %v", tr.Slope.Estimate, cand.Slope)
	}
	anCheckVerdicts(t, b, tr.Assumptions)
	if !exists(t, b, "advice-applied") || !exists(t, b, "original-units") {
		t.Error("after applying, the fit in use and the line in original units must be shown")
	}
	if n := eval[int](t, b, `tids("original-units-row").length`); n != 5 {
		t.Errorf("%d rows in original units, want 5", n)
	}
	screenshot(t, b, "analysis-advice-applied-tablet")
	waitFor(t, b, "the save", `tid("save-status").dataset.state === "saved"`, 10*time.Second)
	b.do(t, chromedp.Reload())
	waitFor(t, b, "the app after reload", appReady+` && tid("result-slope")`, 30*time.Second)
	anExpect(t, b, "result-slope", "data-value", tr.Slope.Estimate)
	// The change is in the session's history (shown in the report).
	click(t, b, "report-open")
	waitFor(t, b, "the report", `!!tid("report-view", ' .pl-rt-hist')`, 20*time.Second)
	// In words: the scale the remedy fits on (log y and log–log are transforms of the same name).
	if hist := eval[string](t, b, `tid("report-view", ' .pl-rt-hist').textContent`); !strings.Contains(hist, "Scale set to "+wording.Scale(fitcore.Transform(remedy))) {
		t.Errorf("the history does not record the applied %s: %q", remedy, hist)
	}
	click(t, b, "report-close")

	click(t, b, "advice-revert")
	waitFor(t, b, "the plain line again", fmt.Sprintf(`tid("result-slope")?.dataset.value === %q`, strconv.FormatFloat(rep.Slope.Estimate, 'g', -1, 64)), 10*time.Second)
	if got := attr(t, b, "advice", "data-transform"); got != string(remedy) {
		t.Errorf("after revert the advice is %q, want %q again", got, remedy)
	}
}

// TestAnalysisInfluence: an invented pressure transmitter check with one
// mistyped reading (row 6: 41.7 typed for 14.7) and a blank row before it,
// so that grid rows and pair numbers differ; the influence row names the
// grid row and jumps to it.
func TestAnalysisInfluence(t *testing.T) {
	srv := startServer(t)
	b := newBrowser(t, tablet)
	b.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, b, "the app to start", appReady, 60*time.Second)
	pairs := [][2]string{{"0", "0.1"}, {"2", "2.0"}, {"", ""}, {"4", "4.1"}, {"6", "5.9"}, {"14", "41.7"},
		{"8", "8.1"}, {"10", "9.9"}, {"12", "12.1"}, {"16", "15.9"}, {"18", "18.0"}, {"20", "20.1"}}
	anFillRaw(t, b, pairs)
	var used [][2]string
	for _, p := range pairs {
		if p[0] != "" {
			used = append(used, p)
		}
	}
	waitFor(t, b, "the line", fmt.Sprintf(`tid("result-n")?.dataset.value === "%d"`, len(used)), 20*time.Second)
	x, y := anParsed(t, used)
	rep := anAnalyze(t, x, y, fitcore.Options{})
	anCheckVerdicts(t, b, rep.Assumptions)
	if rep.Assumptions.Influence.Verdict != fitcore.Fail {
		t.Fatalf("fitcore's influence verdict is %q on a mistyped reading, want fail", rep.Assumptions.Influence.Verdict)
	}
	flaggedRow6 := false
	for _, p := range rep.Influence {
		if p.Flagged && p.Index == 4 { // pair 5 (from 0: 4) is grid row 6
			flaggedRow6 = true
		}
	}
	if !flaggedRow6 {
		t.Fatal("fitcore does not flag the mistyped reading")
	}
	click(t, b, "influence-jump-6")
	waitFor(t, b, "the focus on row 6", `document.activeElement && document.activeElement.dataset.testid === "x-input-5"`, 5*time.Second)
	// One numbering: the sentence names the grid's row 6 (fitcore's pair 5),
	// and no note maps one numbering onto another.
	if msg := textOf(t, b, "check-influence-message"); !strings.Contains(msg, "Reading 6 ") || strings.Contains(msg, "Reading 5 ") {
		t.Errorf("the influence sentence says %q, want it to name reading 6 (the grid's row)", msg)
	}
	if exists(t, b, "influence-rows-note") {
		t.Error("a note still maps reading numbers to rows")
	}
	screenshot(t, b, "analysis-influence-tablet")
	// The same screen with the tablet turned (landscape, two columns).
	b.do(t, chromedp.EmulateViewport(1280, 800))
	click(t, b, "check-influence-more")
	screenshot(t, b, "analysis-influence-landscape")
	if w := eval[float64](t, b, `document.documentElement.scrollWidth`); w > 1282 {
		t.Errorf("the page is %v px wide on a 1280 px landscape tablet", w)
	}
}

// anPaste pastes the pairs as one tab-separated block into the first x
// cell (the grid's paste import), as from a spreadsheet.
func anPaste(t *testing.T, b *browser, pairs [][2]string) {
	t.Helper()
	var sb strings.Builder
	for _, p := range pairs {
		sb.WriteString(p[0] + "\t" + p[1] + "\n")
	}
	js, _ := json.Marshal(sb.String())
	eval[bool](t, b, `(() => {
		const dt = new DataTransfer();
		dt.setData('text/plain', `+string(js)+`);
		tid("x-input-0").dispatchEvent(new ClipboardEvent('paste', { clipboardData: dt, bubbles: true, cancelable: true }));
		return true;
	})()`)
	waitFor(t, b, "the line from the pasted pairs", fmt.Sprintf(`tid("result-n")?.dataset.value === "%d"`, len(pairs)), 60*time.Second)
}

// anFillRaw is anFill for pairs that may hold blank rows (no line count wait).
func anFillRaw(t *testing.T, b *browser, pairs [][2]string) {
	t.Helper()
	js, _ := json.Marshal(pairs)
	eval[bool](t, b, `(async (pairs) => {
		const wait = async f => { for (let i = 0; i < 500; i++) { const v = f(); if (v) return v; await new Promise(r => setTimeout(r, 10)); } throw new Error('timed out'); };
		for (let i = 0; i < pairs.length; i++) {
			if (!tid('x-input-' + i)) { tid('add-row').click(); await wait(() => tid('x-input-' + i)); }
			for (const [col, v] of [['x', pairs[i][0]], ['y', pairs[i][1]]]) {
				const el = tid(col + '-input-' + i);
				el.value = v;
				el.dispatchEvent(new Event('input', { bubbles: true }));
			}
		}
		return true;
	})(`+string(js)+`)`)
}

// TestAnalysisSpeed measures, at 1,000 and 10,000 invented readings with a
// constant percentage error (so that the advice tries every remedy: the
// slowest case), the time from an edit of one cell until the page shows
// the new line, checks, advice and plots, each compared with fitcore's
// analysis of the edited readings; and the longest task the page ran
// meanwhile (how long a keystroke could wait). What it asserts is that
// every edit reaches the screen: after each one the slope, the checks'
// slope, the advice, its R² after the remedy and the plot are fitcore's for
// the edited readings, with no "updating" left shown; the typed cell and an
// unknown's readings give fitcore's line and x̂. The times are logged and
// never asserted on.
func TestAnalysisSpeed(t *testing.T) {
	srv := startServer(t)
	for _, n := range []int{1000, 10000} {
		anSpeedAt(t, srv, n)
	}
}

// shownAnalysis is what the screen shows of an analysis, and how many
// milliseconds after the edit (−1: it never matched fitcore's).
type shownAnalysis struct {
	MS        float64 `json:"ms"`
	Slope     string  `json:"slope"`
	Checks    string  `json:"checks"`
	Transform string  `json:"transform"`
	R2After   string  `json:"r2after"`
	Plot      string  `json:"plot"`
	Updating  bool    `json:"updating"`
}

func anSpeedAt(t *testing.T, srv *server, n int) {
	const edits = 12
	b := newBrowser(t, tablet)
	b.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, b, "the app to start", appReady, 60*time.Second)
	pairs := anPercentPairs(n, 5)
	start := time.Now()
	anPaste(t, b, pairs)
	t.Logf("%d readings: pasting them into the grid took %v", n, time.Since(start).Round(time.Millisecond))
	x, y := anParsed(t, pairs)
	rep := anAnalyze(t, x, y, fitcore.Options{})
	anExpect(t, b, "result-slope", "data-value", rep.Slope.Estimate)
	waitFor(t, b, "the advice", `tid("advice")?.dataset.transform !== "pending"`, 20*time.Second)
	if got := attr(t, b, "advice", "data-transform"); got != string(rep.Advice.Remedy) {
		t.Errorf("advice at %d readings = %q, fitcore says %q", n, got, rep.Advice.Remedy)
	}
	eval[bool](t, b, `(() => { window.plLong = []; new PerformanceObserver(l => { for (const e of l.getEntries()) window.plLong.push(Math.round(e.duration)); }).observe({type: 'longtask'}); return true; })()`)
	// Edit y of reading 1 several times; each time wait until the line,
	// the checks, the advice and the plots all show fitcore's analysis of
	// the edited readings.
	var times []float64
	for i := 0; i < edits; i++ {
		v := fmt.Sprintf("%.3f", 2.1+0.01*float64(i))
		pairs[0][1] = v
		x, y = anParsed(t, pairs)
		rep = anAnalyze(t, x, y, fitcore.Options{})
		if rep.Advice == nil || rep.Advice.After == nil {
			t.Fatalf("%d readings: fitcore gives no remedy for readings with a constant percentage error", n)
		}
		want, _ := json.Marshal(map[string]string{
			"slope": numfmt.Full(rep.Slope.Estimate), "r2after": numfmt.Full(rep.Advice.After.RSquared),
			"transform": string(rep.Advice.Remedy),
		})
		got := eval[shownAnalysis](t, b, fmt.Sprintf(`new Promise((resolve) => {
			const want = %s;
			const el = tid('y-input-0');
			const t0 = performance.now();
			const shown = ms => ({ms, slope: tid('result-slope')?.dataset.value || '', checks: tid('checks')?.dataset.slope || '',
				transform: tid('advice')?.dataset.transform || '', r2after: tid('advice-r2-after')?.dataset.value || '',
				plot: tid('plot-fit')?.dataset.slope || '', updating: !tid('result-stale')?.hidden || !tid('plot-stale')?.hidden});
			const done = () => {
				const s = shown(performance.now() - t0);
				if (s.slope === want.slope && s.checks === want.slope && s.transform === want.transform &&
					s.r2after === want.r2after && s.plot === want.slope && !s.updating) { obs.disconnect(); resolve(s); }
			};
			const obs = new MutationObserver(done);
			obs.observe(document.body, { subtree: true, attributes: true, childList: true, characterData: true });
			setTimeout(() => { obs.disconnect(); resolve(shown(-1)); }, 60000);
			el.value = %q;
			el.dispatchEvent(new Event('input', { bubbles: true }));
		})`, want, v))
		if got.MS < 0 {
			t.Fatalf("%d readings, edit %d: the screen never showed fitcore's analysis of the edited readings: shown %+v, fitcore slope %s, advice %s with R² after %s",
				n, i, got, numfmt.Full(rep.Slope.Estimate), rep.Advice.Remedy, numfmt.Full(rep.Advice.After.RSquared))
		}
		ms := got.MS
		times = append(times, ms)
		time.Sleep(300 * time.Millisecond)
	}
	long := eval[[]float64](t, b, `window.plLong`)
	slices.Sort(long)
	slices.Reverse(long)
	sorted := slices.Clone(times)
	slices.Sort(sorted)
	t.Logf("%d readings: edit → line, checks, advice and plots updated (ms): %.1f; median %.0f; tasks over 50 ms meanwhile (how long a keystroke could wait): %.0f", n, times, sorted[len(sorted)/2], long)
	anCheckVerdicts(t, b, rep.Assumptions)
	screenshot(t, b, fmt.Sprintf("analysis-speed-%d", n))

	// Typing: real key presses 60 ms apart into a cell, and for each the
	// time from the key reaching the page to the next frame drawn (what
	// the technician sees as the echo of the key).
	eval[bool](t, b, `(() => { window.plEcho = []; document.addEventListener('keydown', e => { const t0 = performance.now(); requestAnimationFrame(() => window.plEcho.push(Math.round(performance.now() - t0))); }, true); return true; })()`)
	b.do(t, chromedp.Click(sel("y-input-1")))
	eval[bool](t, b, `(tid("y-input-1").select(), true)`)
	for _, k := range "3.14159265" {
		b.do(t, chromedp.KeyEvent(string(k)))
		time.Sleep(60 * time.Millisecond)
	}
	time.Sleep(time.Second)
	echo := eval[[]float64](t, b, `window.plEcho`)
	t.Logf("%d readings: typing 10 keys 60 ms apart, key → next frame (ms): %.0f", n, echo)
	// What was typed is what the line uses.
	pairs[1][1] = valueOf(t, b, "y-input-1")
	x, y = anParsed(t, pairs)
	rep = anAnalyze(t, x, y, fitcore.Options{})
	waitFor(t, b, "the line from the typed cell", fmt.Sprintf(`tid("result-slope")?.dataset.value === %q && tid("advice")?.dataset.transform === %q`,
		numfmt.Full(rep.Slope.Estimate), string(rep.Advice.Remedy)), 10*time.Second)
	if n > 1000 {
		return
	}
	var qt []float64
	for i := 0; i < 5; i++ {
		ms := eval[float64](t, b, fmt.Sprintf(`new Promise((resolve, reject) => {
			const el = tid("inverse-input");
			const t0 = performance.now();
			const want = %q;
			const done = () => {
				const r = tid("inverse-result");
				if (r && r.dataset.m === want) { obs.disconnect(); resolve(performance.now() - t0); }
			};
			const obs = new MutationObserver(done);
			obs.observe(document.body, { subtree: true, attributes: true, childList: true });
			setTimeout(() => { obs.disconnect(); reject(new Error('no x̂ for the unknown\'s readings within 60 s')); }, 60000);
			el.value = el.value + (el.value ? "; " : "") + "50";
			el.dispatchEvent(new Event('input', { bubbles: true }));
		})`, strconv.Itoa(i+1)))
		qt = append(qt, ms)
	}
	t.Logf("unknown's readings typed → x̂ shown at 1,000 readings (ms): %.1f", qt)
	inv := anAnalyze(t, x, y, fitcore.Options{Inverse: []fitcore.InverseQuery{{Y: []float64{50, 50, 50, 50, 50}}}}).Inverse[0]
	anExpect(t, b, "inverse-result", "data-value", inv.X)
	// A tap that changes only what is shown (no analysis): the cost of
	// rendering the page at 1,000 readings, for comparison.
	var rt []float64
	for i := 0; i < 4; i++ {
		ms := eval[float64](t, b, `new Promise((resolve, reject) => {
			const btn = tid("check-spread-more");
			const was = btn.getAttribute('aria-expanded');
			const t0 = performance.now();
			const obs = new MutationObserver(() => {
				if (tid("check-spread-more").getAttribute('aria-expanded') !== was) { obs.disconnect(); resolve(performance.now() - t0); }
			});
			obs.observe(document.body, { subtree: true, attributes: true, childList: true });
			setTimeout(() => { obs.disconnect(); reject(new Error('the tap changed nothing within 60 s')); }, 60000);
			btn.click();
		})`)
		rt = append(rt, ms)
	}
	t.Logf("tap that only re-renders (no analysis) at 1,000 readings (ms): %.1f", rt)
	anExpect(t, b, "result-slope", "data-value", rep.Slope.Estimate)
}

// TestAnalysisInverseUnbounded: on invented readings with no clear slope
// the Fieller interval for x is unbounded (Fieller 1940; fitcore's
// Inverse.Bounded false), and the screen says so in a sentence.
func TestAnalysisInverseUnbounded(t *testing.T) {
	srv := startServer(t)
	b := newBrowser(t, tablet)
	b.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, b, "the app to start", appReady, 60*time.Second)
	pairs := [][2]string{{"1", "5.1"}, {"2", "4.8"}, {"3", "5.3"}, {"4", "4.9"}, {"5", "5.2"}, {"6", "5.0"}}
	anFill(t, b, pairs)
	x, y := anParsed(t, pairs)
	inv := anAnalyze(t, x, y, fitcore.Options{Inverse: []fitcore.InverseQuery{{Y: []float64{5.05}}}}).Inverse[0]
	if inv.Bounded {
		t.Fatal("fitcore gives a bounded interval on a flat line")
	}
	setValue(t, b, "inverse-input", "5,05", "input")
	waitFor(t, b, "the inverse result", `!!tid("inverse-result")`, 10*time.Second)
	if got := attr(t, b, "inverse-result", "data-bounded"); got != "false" {
		t.Errorf("data-bounded = %q, want false", got)
	}
	anExpect(t, b, "inverse-result", "data-value", inv.X)
	if !exists(t, b, "inverse-unbounded") {
		t.Error("no sentence says the interval is unbounded")
	}
}
