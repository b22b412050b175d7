package fitcore

import (
	"fmt"
	"math"
	"math/rand/v2"
	"regexp"
	"testing"
)

// refitDWFigures matches the Durbin–Watson figures in a message: up to
// DWExactMax readings a refit, which needs only the verdict, takes the
// exact p only where the beta approximation's is between 0.002 and 0.2
// (DEVELOPERS.md, Durbin–Watson), so there its figures may differ from
// the full analysis's while the verdict cannot.
var refitDWFigures = regexp.MustCompile(`\(Durbin–Watson d = [^)]*\)`)

// TestRefitEqualsFullAnalysis: an advice refit takes shortcuts that only a
// candidate's summary allows (no fitted values or per-reading influence;
// the influence summary skipping readings certainly without a reason; only
// the practical sizes a failed check reads; for more than 5000 residuals a
// Shapiro–Wilk Pass from the groups' p without W). The oracle is the full
// analysis (Analyze, no shortcut) with the remedy's options, summarized
// the same way: every candidate — its summary, slope, intercept, power —
// must be the same, on invented records from 40 to 30 000 readings
// (Shapiro–Wilk by groups from 5001, the refits side by side from 20 000),
// with each remedy's verdicts Pass, Warn and Fail among them.
func TestRefitEqualsFullAnalysis(t *testing.T) {
	if testing.Short() {
		t.Skip("analyses 30 000 readings many times")
	}
	r := rand.New(rand.NewPCG(20261203, 5))
	type rec struct {
		name string
		make func(n int) (x, y []float64)
	}
	recs := []rec{
		{"bench record", func(n int) ([]float64, []float64) { x, y, _ := benchData(n); return x, y }},
		{"growing scatter", func(n int) ([]float64, []float64) {
			x, y := make([]float64, n), make([]float64, n)
			for i := range x {
				x[i] = 1 + 499*r.Float64()
				y[i] = 0.98*x[i] + 0.3 + r.NormFloat64()*0.01*x[i]
			}
			return x, y
		}},
		{"repeats at every x, an outlier", func(n int) ([]float64, []float64) {
			x, y := make([]float64, n), make([]float64, n)
			for i := range x {
				x[i] = float64(1 + i%40)
				y[i] = 3 + 2*x[i] + r.NormFloat64()*0.05*x[i]
			}
			y[n/3] += 40
			return x, y
		}},
		{"power law", func(n int) ([]float64, []float64) {
			x, y := make([]float64, n), make([]float64, n)
			for i := range x {
				x[i] = 0.5 + 10*r.Float64()
				y[i] = 2 * math.Pow(x[i], 1.7) * math.Exp(0.05*r.NormFloat64())
			}
			return x, y
		}},
		{"drift and bend", func(n int) ([]float64, []float64) {
			x, y := make([]float64, n), make([]float64, n)
			for i := range x {
				x[i] = 1 + 9*r.Float64()
				y[i] = 1 + x[i] + 0.02*x[i]*x[i] + 0.3*float64(i)/float64(n) + r.NormFloat64()*0.05*x[i]
			}
			return x, y
		}},
	}
	seen := map[string]bool{} // verdicts of candidates of more than swBlock readings
	for _, n := range []int{40, 6000, 30000} {
		for _, c := range recs {
			x, y := c.make(n)
			before, err := Analyze(x, y, Options{SkipAdvice: true})
			if err != nil {
				t.Fatalf("%s: %v", c.name, err)
			}
			sum := adSummarize(before)
			sc := new(anScratch)
			for _, rm := range []Remedy{RemedyLogY, RemedyLogLog, RemedySqrtY, RemedyReciprocal, RemedyBoxCox,
				RemedyWeightedX2, RemedyWeightedFitted, RemedyWeightedRepeats, RemedyWeighted} {
				got := adTry(x, y, Options{}, rm, sum, sc)
				if !got.Usable {
					continue
				}
				var cc Candidate
				o, cost, _, why := adSettings(x, y, Options{}, rm, new(anScratch), &cc)
				if why != "" {
					t.Fatalf("%s, %s: usable but %s", c.name, rm, why)
				}
				full, err := Analyze(x, y, o)
				if err != nil {
					t.Fatalf("%s, %s: the full analysis failed: %v", c.name, rm, err)
				}
				want := adSummarize(full)
				g, w := fmt.Sprintf("%+v", got.Summary), fmt.Sprintf("%+v", want)
				if n <= DWExactMax {
					g = refitDWFigures.ReplaceAllString(g, "(Durbin–Watson …)")
					w = refitDWFigures.ReplaceAllString(w, "(Durbin–Watson …)")
				}
				if g != w {
					t.Fatalf("%s (n = %d), %s:\nrefit %s\n full %s", c.name, n, rm, g, w)
				}
				if got.Slope != full.Slope.Estimate || got.Intercept != full.Intercept.Estimate ||
					(rm == RemedyWeighted && got.Power != full.WeightPower) ||
					got.Score != adScore(want, sum, cost) {
					t.Fatalf("%s (n = %d), %s: the line or score differs from the full analysis", c.name, n, rm)
				}
				if n > swBlock {
					a := want.Assumptions
					seen["normality "+a.Normality.Verdict.Word()] = true
					seen["influence "+a.Influence.Verdict.Word()] = true
					for _, v := range []Verdict{a.Spread.Verdict, a.Linearity.Verdict, a.Independence.Verdict} {
						seen["sized "+v.Word()] = true
					}
				}
			}
		}
	}
	for _, k := range []string{"normality " + Pass.Word(), "normality " + Fail.Word(), "influence " + Pass.Word(),
		"influence " + Fail.Word(), "sized " + Pass.Word(), "sized " + Warn.Word(), "sized " + Fail.Word()} {
		if !seen[k] {
			t.Errorf("no candidate of more than %d readings had %q: the records do not reach every path (seen %v)", swBlock, k, seen)
		}
	}
}
