package cli

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"pairline/app/numfmt"
	"pairline/app/wording"
	"pairline/fitcore"
)

// summaryRestOracle is summaryRest as it was before it was split into
// blocks (one function of cyclomatic complexity 36), kept unchanged as
// the oracle of TestSummaryRestMatchesOracle and
// FuzzSummaryRestMatchesOracle.
func summaryRestOracle(fr *fitResult, level float64) string {
	r := fr.report
	var b strings.Builder
	w := func(format string, a ...any) { fmt.Fprintf(&b, format, a...) }
	pct := wording.Percent(level)

	origin := r.Model == fitcore.ModelOrigin
	slopeUnit, yUnit := fr.units()
	coefBlock(&b, wording.Slope, r.Slope, level, slopeUnit)
	if !origin {
		coefBlock(&b, wording.Intercept, r.Intercept, level, yUnit)
	}
	w("  %s\n", wording.FitAsAWhole)
	// Three digits with the unit of y, as the line card.
	row(&b, wording.ResidualSD, withUnit(numfmt.Sig(r.ResidualSE, 3), yUnit))
	row(&b, wording.DegreesOfFreedom, wording.DF(r.DF))
	row(&b, wording.CorrelationR, numfmt.Decimals(r.R, 6))
	row(&b, wording.RSquared, numfmt.Decimals(r.RSquared, 6))
	row(&b, wording.AdjRSquared, numfmt.Decimals(r.AdjRSquared, 6))
	row(&b, wording.FLine, numfmt.Sig(r.F, 4))
	row(&b, wording.PofF, wording.P(r.FP))
	if !origin {
		row(&b, wording.Covariance, numfmt.Sig(r.CovSlopeIntercept, 4))
	}
	row(&b, wording.MeanX, num(r.MeanX))
	row(&b, wording.MeanY, num(r.MeanY))
	w("\n")

	w("%s\n", wording.ChecksTitle)
	as := func(label string, a *fitcore.Assumption) {
		if a == nil {
			return
		}
		w("  %s %-38s %s", verdict(a.Verdict), label, oneLine(a.Message))
		if a.Advice != "" {
			w(" What to do: %s", oneLine(a.Advice))
		}
		w("\n")
	}
	for _, a := range fitcore.AssumptionList() {
		as(wording.CheckName(a.ID), a.Get(r))
	}
	w("\n")

	w("%s\n", wording.Tests)
	for _, t := range r.Present() {
		c := t.Check
		stat := ""
		if c.Verdict != fitcore.NA {
			stat = fmt.Sprintf("%s = %s, %s", t.Symbol, numfmt.Sig(c.Statistic, 4), wording.PEq(c.P))
		}
		w("  %s %-20s %-24s %s\n", verdict(c.Verdict), c.Name, stat, oneLine(c.Message))
	}
	w("\n")

	var flagged []fitcore.PointInfluence
	for _, p := range r.Influence {
		if p.Flagged {
			flagged = append(flagged, p)
		}
	}
	if len(flagged) > 0 {
		w("%s\n", wording.StandsOut)
		for _, p := range flagged {
			line := ""
			if p.Index >= 0 && p.Index < len(fr.lines) {
				line = fmt.Sprintf(" (line %d)", fr.lines[p.Index])
			}
			w("  pair %d%s: leverage %s, studentized residual %s, Cook's distance %s",
				p.Index+1, line, numfmt.Sig(p.Leverage, 3), numfmt.Sig(p.Studentized, 3), numfmt.Sig(p.CooksD, 3))
			if len(p.Reasons) > 0 {
				w(" — %s", oneLine(strings.Join(p.Reasons, "; ")))
			}
			w("\n")
		}
		w("\n")
	}

	if r.BoxCox != nil {
		w("Box–Cox λ = %s (%s %s)\n\n", numfmt.Sig(r.BoxCox.Lambda, 3), wording.Interval(level),
			wording.Range(numfmt.Sig(r.BoxCox.CILow, 3), numfmt.Sig(r.BoxCox.CIHigh, 3)))
	}
	if a := r.Advice; a != nil && a.Remedy != "" {
		w("Advice: %s%s. %s\n", wording.Remedy(a.Remedy), remedyFlag(a.Remedy), oneLine(a.Reason))
		if a.After != nil {
			w("  %s\n", beforeAfter(a.Before.Assumptions, a.After.Assumptions))
		}
		for _, c := range a.Candidates {
			if c.Why != "" {
				w("  tried %s: %s\n", wording.Remedy(c.Remedy), oneLine(c.Why))
			}
		}
		w("\n")
	}

	if len(r.Predictions) > 0 {
		w("y at a given x (%s)\n", pct)
		for _, p := range r.Predictions {
			w("  At x = %s: ŷ = %s; %s: %s; %s: %s", wording.Ref(p.X), num(p.Fit),
				wording.MeanReading, wording.Range(num(p.CILow), num(p.CIHigh)),
				wording.NewReading, wording.Range(num(p.PILow), num(p.PIHigh)))
			if p.Message != "" {
				w(" — %s", oneLine(p.Message))
			}
			w("\n")
		}
		w("\n")
	}
	if len(r.Inverse) > 0 {
		w("x from readings (%s)\n", pct)
		for _, v := range r.Inverse {
			// x and its interval to the standard error (numfmt.Estimate), as the coefficients.
			xs, se := numfmt.Estimate(v.X, v.SE, sig)
			w("  An unknown read as %s (mean of %d) is x = %s, %s %s", withUnit(numfmt.Short(v.Y, sig), fr.yUnit), v.M, withUnit(xs, fr.xUnit),
				strings.ToLower(wording.StandardError), withUnit(se, fr.xUnit))
			if v.Bounded {
				lo, _ := numfmt.Estimate(v.Low, v.SE, sig)
				hi, _ := numfmt.Estimate(v.High, v.SE, sig)
				w(", %s %s", wording.Interval(level), withUnit(wording.Range(lo, hi), fr.xUnit))
			} else {
				w(", no finite interval")
			}
			if v.Message != "" {
				w(" — %s", oneLine(v.Message))
			}
			w("\n")
		}
		w("\n")
	}
	if r.Limits != nil {
		// Three digits, as the screen's card of the limits.
		if fr.xUnit != "" {
			w("%s %s, %s %s\n\n", wording.DetectionLimit, withUnit(numfmt.Sig(r.Limits.LOD, 3), fr.xUnit),
				strings.ToLower(wording.QuantitationLimit), withUnit(numfmt.Sig(r.Limits.LOQ, 3), fr.xUnit))
		} else {
			w("%s %s, %s %s (x units)\n\n", wording.DetectionLimit, numfmt.Sig(r.Limits.LOD, 3),
				strings.ToLower(wording.QuantitationLimit), numfmt.Sig(r.Limits.LOQ, 3))
		}
	}
	if acc := r.Acceptance; acc != nil {
		stamp := wording.NotAccepted
		if acc.Pass {
			stamp = wording.Accepted
		}
		w("Acceptance criteria: %s. %s\n", stamp, oneLine(acc.Summary))
		for _, c := range acc.Results {
			out := wording.NotMet
			if c.Pass {
				out = wording.Met
			}
			w("  %s %s (%s): %s\n", out, c.Name, c.Limit, oneLine(c.Reason))
		}
		w("\n")
	}
	if len(r.Notes) > 0 {
		w("Notes\n")
		for _, n := range r.Notes {
			w("  - %s\n", oneLine(n))
		}
		w("\n")
	}
	w("Caution: these statistics describe the readings given. Where the result affects safety\n")
	w("(gas detection, structural loads, drinking water), follow the instrument maker's procedure,\n")
	w("local codes and licensed practice.\n")
	return b.String()
}

// summaryFit fits invented readings (y = 10 + 2x with a scatter drawn from
// noise, the i-th reading changed by bend, spread and slip as asked) with
// opt, and gives the fit as the command holds it, or nil when Analyze
// refuses the readings.
func summaryFit(n int, noise []byte, bend, spread float64, slip int, opt fitcore.Options, xUnit, yUnit string) *fitResult {
	x, y, lines := make([]float64, n), make([]float64, n), make([]int32, n)
	for i := range n {
		x[i] = float64(i%8) * 2.5
		e := 0.0
		if len(noise) > 0 {
			e = (float64(noise[i%len(noise)]) - 127.5) / 64
		}
		y[i] = 10 + 2*x[i] + bend*x[i]*x[i] + e*(1+spread*x[i])
		if i == slip {
			y[i] /= 10
		}
		lines[i] = int32(i + 2)
	}
	r, err := fitcore.Analyze(x, y, opt)
	if err != nil {
		return nil
	}
	return &fitResult{report: r, lines: lines[:n-n/7], xName: "x", yName: "y", xUnit: xUnit, yUnit: yUnit}
}

func TestSummaryRestMatchesOracle(t *testing.T) {
	ref, lo, hi := 0.999, 1.9, 2.1
	options := []fitcore.Options{
		{},
		{Model: fitcore.ModelOrigin},
		{Model: fitcore.ModelDeming, XUncertainty: 0.1},
		{Weights: fitcore.WeightsX2},
		{Transform: fitcore.TransformLogLog},
		{Transform: fitcore.TransformBoxCox},
		{Level: 0.99, PredictX: []float64{0, 5, 1e6}, Inverse: []fitcore.InverseQuery{{Y: []float64{20}}, {Y: []float64{30, 31}}, {Y: []float64{-1e9}}}},
		{Acceptance: &fitcore.Criteria{MinRSquared: &ref, SlopeLow: &lo, SlopeHigh: &hi}},
	}
	noise := []byte{3, 250, 90, 170, 20, 200, 128, 60, 140, 7, 99}
	seen := map[string]bool{}
	heads := []string{wording.StandsOut, "Box–Cox λ", "Advice:", "y at a given x", "x from readings", "Acceptance criteria", "Notes", wording.DetectionLimit, "(line "}
	for _, opt := range options {
		for _, n := range []int{2, 3, 8, 24} {
			for _, fault := range []struct {
				bend, spread float64
				slip         int
			}{{0, 0, -1}, {0.2, 0, -1}, {0, 2, -1}, {0, 0, 5}} {
				for _, units := range [][2]string{{"", ""}, {"mg/L", "mV"}, {"", "mV"}} {
					fr := summaryFit(n, noise, fault.bend, fault.spread, fault.slip, opt, units[0], units[1])
					if fr == nil {
						continue
					}
					level := fr.report.Level
					got, want := summaryRest(fr, level), summaryRestOracle(fr, level)
					if got != want {
						t.Errorf("n %d %+v %+v:\n got %s\nwant %s", n, opt, fault, got, want)
					}
					for _, h := range heads {
						seen[h] = seen[h] || strings.Contains(got, h)
					}
				}
			}
		}
	}
	// Every block that may be left out must have been written by some case.
	for _, h := range heads {
		if !seen[h] {
			t.Errorf("no case writes %q", h)
		}
	}
}

// FuzzSummaryRestMatchesOracle: summaryRest and the body it was split from
// write the same text for fits of any readings, with any of the parts a
// report may or may not have (limits, notes, flagged readings, units).
func FuzzSummaryRestMatchesOracle(f *testing.F) {
	f.Add(uint8(8), []byte{1, 200, 3}, 0.0, 0.0, int8(-1), uint8(0), "", "", "")
	f.Add(uint8(24), []byte{9, 130, 77, 250}, 0.3, 2.0, int8(5), uint8(0xff), "mg/L", "mV", "a note\nwith a line end")
	f.Fuzz(func(t *testing.T, n uint8, noise []byte, bend, spread float64, slip int8, parts uint8, xUnit, yUnit, note string) {
		if math.IsNaN(bend) || math.IsNaN(spread) || math.Abs(bend) > 1e3 || math.Abs(spread) > 1e3 {
			return
		}
		var opt fitcore.Options
		opt.Model = fitcore.Model("").Values()[int(parts)%4]
		if opt.Model == fitcore.ModelWeighted {
			opt.Weights = fitcore.WeightsX2
		}
		if parts&4 != 0 {
			opt.PredictX, opt.Inverse = []float64{1, 7}, []fitcore.InverseQuery{{Y: []float64{15}}, {Y: []float64{1e12}}}
		}
		if parts&8 != 0 {
			v := 0.99
			opt.Acceptance = &fitcore.Criteria{MinRSquared: &v}
		}
		fr := summaryFit(2+int(n)%60, noise, bend, spread, int(slip), opt, xUnit, yUnit)
		if fr == nil {
			return
		}
		r := fr.report
		if parts&16 != 0 {
			r.Limits = &fitcore.Limits{LOD: bend, LOQ: spread}
		}
		if parts&32 != 0 {
			r.Notes = append(r.Notes, note)
		}
		if parts&64 != 0 && len(r.Influence) > 0 {
			r.Influence[0].Flagged, r.Influence[0].Reasons = true, []string{note, "second"}
		}
		if parts&128 != 0 {
			r.Advice = nil
		}
		if got, want := summaryRest(fr, r.Level), summaryRestOracle(fr, r.Level); got != want {
			t.Fatalf("got %s\nwant %s", got, want)
		}
	})
}
