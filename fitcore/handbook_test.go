package fitcore_test

import (
	"bufio"
	"bytes"
	"math"
	"os"
	"strconv"
	"strings"
	"testing"

	"pairline/app/reftest"
	"pairline/fitcore"
)

// Worked examples of the NIST/SEMATECH e-Handbook of Statistical Methods
// (itl.nist.gov/div898/handbook), on the handbook's own data files as
// distributed on its datasets page, read from ../shared/reference. The
// numeric references are statsmodels/scipy (testdata/golden, checked in
// golden_test.go); these tests check the diagnoses the handbook draws.

// readHandbook reads a Dataplot .DAT file: free text, then rows of
// whitespace-separated numbers. The numbers start after the last line made
// only of dashes (every handbook file has one); rows must all have the same
// number of columns. It skips the test visibly when the file is absent.
func readHandbook(t testing.TB, name string) [][]float64 {
	t.Helper()
	b, err := os.ReadFile(reftest.Path(t, "nist-handbook", name))
	if err != nil {
		t.Fatal(err)
	}
	var lines []string
	sc := bufio.NewScanner(bytes.NewReader(b))
	for sc.Scan() {
		lines = append(lines, strings.TrimRight(sc.Text(), "\r"))
	}
	start := 0
	for i, ln := range lines {
		s := strings.TrimSpace(ln)
		if len(s) >= 3 && strings.Trim(s, "-") == "" {
			start = i + 1
		}
	}
	var rows [][]float64
	for i, ln := range lines[start:] {
		f := strings.Fields(ln)
		if len(f) == 0 {
			continue
		}
		row := make([]float64, len(f))
		for j, s := range f {
			v, err := strconv.ParseFloat(s, 64)
			if err != nil {
				t.Fatalf("%s line %d column %d: %q is not a number", name, start+i+1, j+1, s)
			}
			row[j] = v
		}
		if len(rows) > 0 && len(row) != len(rows[0]) {
			t.Fatalf("%s line %d: %d columns, earlier rows have %d", name, start+i+1, len(row), len(rows[0]))
		}
		rows = append(rows, row)
	}
	if len(rows) == 0 {
		t.Fatalf("%s: no numeric rows", name)
	}
	return rows
}

func columns(rows [][]float64, cx, cy int) (x, y []float64) {
	for _, r := range rows {
		x = append(x, r[cx])
		y = append(y, r[cy])
	}
	return x, y
}

// Handbook 4.6.3 (Alaska pipeline ultrasonic calibration): the field
// readings scatter more for larger defects, so the plain line's spread check
// must not pass, and the advice must find a remedy (transformation or
// weighting, as the handbook does) under which the spread check passes.
func TestHandbookAlaskaPipeline(t *testing.T) {
	const src = "NIST e-Handbook 4.6.3, ALASKA_PIPELINE.DAT"
	rows := readHandbook(t, "ALASKA_PIPELINE.DAT")
	x, y := columns(rows, 1, 0) // x = lab defect size, y = field defect size
	if len(x) != 107 {
		t.Fatalf("read %d rows, the handbook file has 107 [%s]", len(x), src)
	}
	rep, err := fitcore.Analyze(x, y, fitcore.Options{})
	if err != nil {
		t.Fatalf("Analyze: %v [%s]", err, src)
	}
	if v := rep.Assumptions.Spread.Verdict; v == fitcore.Pass || v == fitcore.NA {
		t.Errorf("spread verdict %q (Breusch–Pagan p = %.3g), want warn or fail: the scatter grows with size [%s]",
			v, rep.Checks.BreuschPagan.P, src)
	}
	a := rep.Advice
	if a == nil {
		t.Fatalf("no advice for a spread problem [%s]", src)
	}
	if a.Remedy == fitcore.RemedyNone || a.After == nil {
		t.Fatalf("advice remedy %q after %v (reason %q), want a remedy with its after-summary [%s]",
			a.Remedy, a.After, a.Reason, src)
	}
	if v := a.After.Assumptions.Spread.Verdict; v != fitcore.Pass {
		t.Errorf("after remedy %q the spread verdict is %q (BP p = %.3g), want pass [%s]",
			a.Remedy, v, a.After.BreuschPaganP, src)
	}
	t.Logf("advice: %s — %s", a.Remedy, a.Reason)
}

// Handbook 2.3.6 (linear calibration, CALIBRATIONLINE.DAT, first two
// columns): a new reading y' is converted to x' = (y' − a)/b, and its
// interval is where the line's prediction bounds cross y' (the handbook's
// graphical inversion; this equals Fieller's interval).
func TestHandbookCalibrationLineInverse(t *testing.T) {
	const src = "NIST e-Handbook 2.3.6, CALIBRATIONLINE.DAT"
	rows := readHandbook(t, "CALIBRATIONLINE.DAT")
	x, y := columns(rows, 0, 1)
	if len(x) != 40 {
		t.Fatalf("read %d rows, the handbook file has 40 [%s]", len(x), src)
	}
	readings := []float64{2.5, 6.0, 10.0}
	opt := fitcore.Options{}
	for _, r := range readings {
		opt.Inverse = append(opt.Inverse, fitcore.InverseQuery{Y: []float64{r}})
	}
	rep, err := fitcore.Analyze(x, y, opt)
	if err != nil {
		t.Fatalf("Analyze: %v [%s]", err, src)
	}
	if len(rep.Inverse) != len(readings) {
		t.Fatalf("got %d inverse results, want %d [%s]", len(rep.Inverse), len(readings), src)
	}
	a, b := rep.Intercept.Estimate, rep.Slope.Estimate
	for i, r := range readings {
		inv := rep.Inverse[i]
		if want := (r - a) / b; math.Abs(inv.X-want) > 1e-12*math.Abs(want) {
			t.Errorf("y' = %g: x' = %.12g, want (y'−a)/b = %.12g [%s]", r, inv.X, want, src)
		}
		if !inv.Bounded || !(inv.Low < inv.X && inv.X < inv.High) {
			t.Errorf("y' = %g: interval [%g, %g] bounded=%v does not bracket x' = %g [%s]",
				r, inv.Low, inv.High, inv.Bounded, inv.X, src)
			continue
		}
		// At the interval's ends the prediction bounds pass through y'
		// (slope > 0: the upper bound at the low end, the lower at the high end).
		chk, err := fitcore.Analyze(x, y, fitcore.Options{PredictX: []float64{inv.Low, inv.High}, SkipAdvice: true})
		if err != nil {
			t.Fatal(err)
		}
		lo, hi := chk.Predictions[0], chk.Predictions[1]
		if math.Abs(lo.PIHigh-r) > 1e-9 || math.Abs(hi.PILow-r) > 1e-9 {
			t.Errorf("y' = %g: prediction bounds at the interval ends are %.12g and %.12g, want both %g [%s]",
				r, lo.PIHigh, hi.PILow, r, src)
		}
		t.Logf("y' = %g → x' = %.5f, 95 %% interval [%.5f, %.5f]", r, inv.X, inv.Low, inv.High)
	}
}

// Handbook 2.3.6 (load cell calibration with 3 repeats at 11 loads,
// LOADCELL.DAT): the repeats give a pure-error estimate, the lack-of-fit
// test rejects the straight line, and the residuals show curvature (the
// handbook goes on to a quadratic).
func TestHandbookLoadCellLackOfFit(t *testing.T) {
	const src = "NIST e-Handbook 2.3.6, LOADCELL.DAT"
	rows := readHandbook(t, "LOADCELL.DAT")
	x, y := columns(rows, 0, 1)
	if len(x) != 33 {
		t.Fatalf("read %d rows, the handbook file has 33 [%s]", len(x), src)
	}
	rep, err := fitcore.Analyze(x, y, fitcore.Options{})
	if err != nil {
		t.Fatalf("Analyze: %v [%s]", err, src)
	}
	lof := rep.Checks.LackOfFit
	if lof == nil {
		t.Fatalf("no lack-of-fit check although every load is repeated [%s]", src)
	}
	// 11 levels − 2 parameters = 9, 33 readings − 11 levels = 22.
	if lof.DF != 9 || lof.DF2 != 22 {
		t.Errorf("lack-of-fit df = (%g, %g), want (9, 22) [%s]", lof.DF, lof.DF2, src)
	}
	if lof.Verdict != fitcore.Fail || !(lof.P < 0.001) {
		t.Errorf("lack-of-fit F = %g, p = %g, verdict %q; want a fail with p < 0.001 [%s]", lof.Statistic, lof.P, lof.Verdict, src)
	}
	if rep.Checks.Curvature.Verdict != fitcore.Fail {
		t.Errorf("curvature verdict %q (p = %g), want fail [%s]", rep.Checks.Curvature.Verdict, rep.Checks.Curvature.P, src)
	}
	if v := rep.Assumptions.Linearity.Verdict; v != fitcore.Fail {
		t.Errorf("linearity verdict %q, want fail [%s]", v, src)
	}
}

// Anscombe (1973), "Graphs in statistical analysis", The American
// Statistician 27, on ANSCOMBE.DAT: four data sets with the same line and
// correlation to the digits the file header states (slope 0.5, intercept
// 3.0, r 81.7 %, means 9.0 and 7.5) but different diagnoses: set 1 is a
// plain line, set 2 is curved, set 3 has one outlying point that drags the
// line, set 4 has all its slope from a single high-leverage point.
func TestHandbookAnscombe(t *testing.T) {
	const src = "Anscombe 1973 via NIST e-Handbook ANSCOMBE.DAT"
	rows := readHandbook(t, "ANSCOMBE.DAT")
	reps := make([]*fitcore.Report, 4)
	for k := 0; k < 4; k++ {
		x, y := columns(rows, 2*k, 2*k+1)
		if len(x) != 11 {
			t.Fatalf("set %d: read %d rows, want 11 [%s]", k+1, len(x), src)
		}
		rep, err := fitcore.Analyze(x, y, fitcore.Options{})
		if err != nil {
			t.Fatalf("set %d: Analyze: %v [%s]", k+1, err, src)
		}
		reps[k] = rep
		// Same summary within the rounding of the published figures.
		for _, c := range []struct {
			what      string
			got, want float64
			within    float64
		}{
			{"slope", rep.Slope.Estimate, 0.5, 0.0005},
			{"intercept", rep.Intercept.Estimate, 3.0, 0.005},
			{"r", rep.R, 0.817, 0.001},
			{"mean x", rep.MeanX, 9.0, 0.0005},
			{"mean y", rep.MeanY, 7.5, 0.005},
		} {
			if math.Abs(c.got-c.want) > c.within {
				t.Errorf("set %d: %s = %.5f, want %g ± %g [%s]", k+1, c.what, c.got, c.want, c.within, src)
			}
		}
	}

	if v := reps[0].Assumptions.Linearity.Verdict; v != fitcore.Pass {
		t.Errorf("set 1: linearity %q (curvature p = %.3g), want pass [%s]", v, reps[0].Checks.Curvature.P, src)
	}
	if v := reps[1].Assumptions.Linearity.Verdict; v != fitcore.Fail {
		t.Errorf("set 2: linearity %q (curvature p = %.3g), want fail: the points lie on a parabola [%s]",
			v, reps[1].Checks.Curvature.P, src)
	}
	// Set 3: the point (13, 12.74), index 2, lies far off the line the
	// other ten follow exactly.
	r3 := reps[2]
	if v := r3.Assumptions.Influence.Verdict; v == fitcore.Pass || v == fitcore.NA {
		t.Errorf("set 3: influence %q, want warn or fail [%s]", v, src)
	}
	if len(r3.Influence) == 11 {
		p := r3.Influence[2]
		if !p.Flagged || !(p.OutlierP < 0.05) {
			t.Errorf("set 3: point (13, 12.74) flagged=%v outlier p=%g cook=%g, want flagged with p < 0.05 [%s]",
				p.Flagged, p.OutlierP, p.CooksD, src)
		}
		for i, q := range r3.Influence {
			if i != 2 && math.Abs(q.Studentized) >= math.Abs(p.Studentized) {
				t.Errorf("set 3: point %d has |studentized| %g ≥ the outlier's %g [%s]", i, q.Studentized, p.Studentized, src)
			}
		}
	} else {
		t.Errorf("set 3: %d influence rows, want 11 [%s]", len(r3.Influence), src)
	}
	// Set 4: x = 8 for ten points and 19 for one (index 7), whose leverage is 1.
	r4 := reps[3]
	if v := r4.Assumptions.Influence.Verdict; v == fitcore.Pass || v == fitcore.NA {
		t.Errorf("set 4: influence %q, want warn or fail [%s]", v, src)
	}
	if len(r4.Influence) == 11 {
		p := r4.Influence[7]
		if !p.Flagged || math.Abs(p.Leverage-1) > 1e-9 {
			t.Errorf("set 4: point (19, 12.5) flagged=%v leverage=%g, want flagged with leverage 1 [%s]",
				p.Flagged, p.Leverage, src)
		}
		for i, q := range r4.Influence {
			if math.IsNaN(q.Studentized) || math.IsInf(q.Studentized, 0) || math.IsNaN(q.CooksD) || math.IsInf(q.CooksD, 0) {
				t.Errorf("set 4: point %d carries a non-finite diagnostic %+v", i, q)
			}
		}
	} else {
		t.Errorf("set 4: %d influence rows, want 11 [%s]", len(r4.Influence), src)
	}
}
