package fitcore

import (
	"fmt"
	"math"
	"strings"
	"sync"
	"sync/atomic"
)

// advise looks for a change of scale or a weighting that cures a spread or
// straightness problem of the fit in before, and recommends one.
//
// Nothing is tried when before.Assumptions.Spread and .Linearity are both
// pass or n/a: the advice is RemedyNone with After nil, and its reason
// claims a straight line or even scatter only for a check that passed
// (adNothingToDo). Otherwise each remedy
// is tried in this fixed order, by refitting with Analyze (intercept model,
// the same level and reference values, SkipAdvice) and re-running all the
// checks (a refit works out only what its Candidate shows, and gives the
// candidate of the full analysis on the remedy's options exactly):
//
//	log_y         ln y on x                   needs every y > 0
//	log_log       ln y on ln x                needs every x > 0 and y > 0
//	sqrt_y        √y on x                     needs every y ≥ 0
//	reciprocal_y  1/y on x                    needs every y > 0
//	box_cox       (y^λ − 1)/λ on x, λ from BoxCoxProfile   needs every y > 0
//	weighted_x2       original units, w = 1/x² (scatter ∝ x)      needs every x ≠ 0
//	weighted_fitted2  original units, w = 1/ŷ², ŷ from a first unweighted
//	                  fit (scatter ∝ the reading)                  needs every ŷ ≠ 0
//	weighted_repeats  original units, w = 1/s²_j, s²_j the variance of the
//	                  repeats at standard j                        needs ≥ 2 readings at
//	                                                               every x, not all equal
//	weighted      original units, w = |x|^(−p), p estimated by Analyze's
//	              WeightsPowerFit (slope of ln e² on ln|x|; Carroll &
//	              Ruppert 1988, §3.3)             needs every x ≠ 0
//
// The weightings are tried only when the spread check flags: a weighting
// is a remedy for growing scatter, not for a bend. Each is judged, like
// every remedy, by the checks of its own fit: for a weighting the spread
// check of the weighted residuals √w·e (the assumption it is meant to
// fix), never by leverage or influence, which weights change by design.
//
// A remedy the readings cannot take is listed with Usable false and a Why
// naming the readings that prevent it; it is never recommended.
//
// Ranking (higher is better; the original fit is scored the same way with no
// preference cost, and a remedy must beat it by at least adMinGain):
//
//	score = 3·(v(spread) + v(linearity))            v: pass 2, warn 1, fail 0, n/a 1
//	      + 0.5·(q(p_BP) + q(p_curvature))          q(p) = min(p, 0.5)/0.5
//	      − 2·(steps by which independence or normality got worse)
//	      − preference cost
//
// so a better verdict always outweighs the p-values, each step by which a
// check elsewhere gets worse costs two thirds of a verdict step, and among
// equally good remedies the simpler and more meaningful scale wins. Preference costs
// (common practice: a log scale reads as a constant percentage error and is
// the usual first choice; an estimated power, of y or of the weights, adds
// uncertainty and is harder to explain; weights from a few repeats are
// themselves noisy): log_y, log_log 0; sqrt_y, weighted_x2,
// weighted_fitted2 0.25; reciprocal_y, weighted_repeats, weighted 0.5;
// box_cox 0.75, plus 0.75 more when its λ
// interval contains 0, ½ or −1 (the plain log, square root or reciprocal then
// does the same job). Box–Cox is not offered at all when its interval
// contains 1 or λ is within 0.1 of 1 (no change of scale worth the name;
// common practice). Ties keep the order above.
//
// Everything is deterministic; no randomness is used.
func advise(x, y []float64, opt Options, before *Report) *Advice {
	return adviseWith(x, y, opt, before, new(anScratch))
}

// adviseWith is advise sharing the work space sc of the analysis that
// produced before.
func adviseWith(x, y []float64, opt Options, before *Report, sc *anScratch) *Advice {
	if before == nil {
		return &Advice{Remedy: RemedyNone, Reason: "There is no fitted line to give advice on."}
	}
	ad := &Advice{Before: adSummarize(before)}
	spreadBad := adBad(before.Assumptions.Spread.Verdict)
	lineBad := adBad(before.Assumptions.Linearity.Verdict)
	if !spreadBad && !lineBad {
		ad.Remedy = RemedyNone
		ad.Reason = adNothingToDo(before.Assumptions)
		return ad
	}

	base := adScore(ad.Before, ad.Before, 0)
	best := -1
	tries := []Remedy{RemedyLogY, RemedyLogLog, RemedySqrtY, RemedyReciprocal, RemedyBoxCox}
	if spreadBad {
		tries = append(tries, RemedyWeightedX2, RemedyWeightedFitted, RemedyWeightedRepeats, RemedyWeighted)
	}
	cands := adTryAll(x, y, opt, tries, ad.Before, sc)
	for _, c := range cands {
		ad.Candidates = append(ad.Candidates, c)
		if c.Usable && c.Score >= base+adMinGain && (best < 0 || c.Score > ad.Candidates[best].Score) {
			best = len(ad.Candidates) - 1
		}
	}
	problem := adProblem(spreadBad, lineBad)
	if best < 0 {
		ad.Remedy = RemedyNone
		ad.Reason = problem + " None of the changes of scale or weightings tried made this better without " +
			"causing a new problem, so none is recommended. Look at the plot of the residuals, check the readings " +
			"at the ends of the range, and follow the instrument maker's procedure."
		return ad
	}
	c := ad.Candidates[best]
	after := c.Summary
	ad.Remedy = c.Remedy
	ad.After = &after
	ad.Reason = problem + " " + adHow(c) + " " + adAchieved(ad.Before, after) + " "
	if _, _, ws := c.Remedy.Settings(); ws == WeightsNone {
		ad.Reason += "Predictions are converted back to the original units. "
	}
	ad.Reason += adCaution
	return ad
}

// adTryAll returns adTry of each remedy in tries, in that order. On a
// record of anParallelMin readings or more it refits anAdviceWorkers
// remedies at once, each worker with its own work space (sc and its
// forks), taking the next remedy of the list when it is done; each refit
// computes exactly what it would alone, so the candidates do not depend
// on this.
func adTryAll(x, y []float64, opt Options, tries []Remedy, before CheckSummary, sc *anScratch) []Candidate {
	cands := make([]Candidate, len(tries))
	workers := min(anAdviceWorkers, len(tries))
	if workers < 2 || len(x) < anParallelMin {
		for i, r := range tries {
			cands[i] = adTry(x, y, opt, r, before, sc)
		}
		return cands
	}
	// What every refit reads about x is worked out here, once, before the
	// work spaces are shared or copied.
	sc.orderOf(x)
	scs := []*anScratch{sc}
	for len(scs) < workers {
		scs = append(scs, sc.fork())
	}
	var next atomic.Int32
	var wg sync.WaitGroup
	for _, s := range scs {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for {
				i := int(next.Add(1)) - 1
				if i >= len(tries) {
					return
				}
				cands[i] = adTry(x, y, opt, tries[i], before, s)
			}
		}()
	}
	wg.Wait()
	return cands
}

// adNothingToDo words the advice when neither spread nor linearity is a
// problem, claiming only what was checked: a straight line and even
// scatter only when those checks passed (an n/a check, for too few
// readings, is said to be unchecked).
func adNothingToDo(a Assumptions) string {
	if a.Spread.Message == NoScatterSentence || a.Linearity.Message == NoScatterSentence {
		return "The readings lie on a straight line to the precision of the arithmetic, so no change of scale or weighting is needed."
	}
	sp, li := a.Spread.Verdict == Pass, a.Linearity.Verdict == Pass
	switch {
	case sp && li:
		return "The scatter about the line is even across the range and the readings follow a straight line, " +
			"so no change of scale or weighting is needed."
	case sp:
		return "No change of scale or weighting is suggested: the scatter about the line is even across the range, " +
			"but whether the readings follow a straight line could not be checked (see “" + NameLinearity + "”)."
	case li:
		return "No change of scale or weighting is suggested: the readings follow a straight line, " +
			"but whether the scatter is even across the range could not be checked (see “" + NameSpread + "”)."
	}
	return "No change of scale or weighting is suggested, but neither the straightness of the line nor the evenness " +
		"of the scatter could be checked (see the checks)."
}

// adMinGain is how much a remedy must improve on the original fit's score to
// be recommended: a quarter of the p-value part, so that a remedy that only
// nudges the p-values without changing any verdict is not worth the change
// of scale (common practice: keep the original units unless there is a
// clear gain).
const adMinGain = 0.25

const adCaution = "Before relying on the results for safety-related work, check them against the " +
	"instrument maker's procedure and local rules."

// adTry fits one remedy and scores it against the original summary, in
// three stages: whether the readings allow the remedy (adDomainOf), the
// options of its refit (adSettings) and the refit and its score (adRefit).
func adTry(x, y []float64, opt Options, r Remedy, before CheckSummary, sc *anScratch) Candidate {
	c := Candidate{Remedy: r}
	if why := adDomainOf(x, y, r, sc); why != "" {
		c.Why = why
		return c
	}
	o, cost, note, why := adSettings(x, y, opt, r, sc, &c)
	if why != "" {
		c.Why = why
		return c
	}
	return adRefit(x, y, o, c, before, cost, note, sc)
}

// adDomainOf returns why the readings cannot take remedy r (a log or
// reciprocal needs values above zero, a square root values at zero or
// above, weights from x values other than zero, weights from repeats two
// readings at every x), or "" when they can.
func adDomainOf(x, y []float64, r Remedy, sc *anScratch) string {
	// (Each value is first tested by a tight loop, allPositive and the
	// like; the sentence naming the readings only when one fails.)
	switch r {
	case RemedyLogY:
		return adDomainIf("A log scale needs every y above zero", "y", y, adPositive, allPositive(y))
	case RemedyLogLog:
		if why := adDomainIf("A log–log scale needs every x above zero", "x", x, adPositive, allPositive(x)); why != "" {
			return why
		}
		return adDomainIf("A log–log scale needs every y above zero", "y", y, adPositive, allPositive(y))
	case RemedySqrtY:
		return adDomainIf("A square-root scale needs every y at zero or above", "y", y, adNonNegative, allNonNegative(y))
	case RemedyReciprocal:
		return adDomainIf("A reciprocal scale needs every y above zero", "y", y, adPositive, allPositive(y))
	case RemedyBoxCox:
		return adDomainIf("The Box–Cox transform needs every y above zero", "y", y, adPositive, allPositive(y))
	case RemedyWeighted:
		return adDomainIf("Weights that follow a power of x need every x other than zero", "x", x, adNonZero, allNonZero(x))
	case RemedyWeightedX2:
		return adDomainIf("Weights 1/x² need every x other than zero", "x", x, adNonZero, allNonZero(x))
	case RemedyWeightedRepeats:
		// Checked on the analysis's sorted order of x first, so that a
		// record without repeats costs no refit (and no second sort).
		if i, ok := adEveryXRepeated(x, sc.orderOf(x)); !ok {
			return fmt.Sprintf("Weights from repeats need at least two readings at every x; reading %d (x = %s) has none beside it.", i+1, ckG4(x[i]))
		}
	}
	return ""
}

// adSettings returns the options of the refit for remedy r, its cost in
// the score (documented on advise) and the note that tells what it
// assumed; for Box–Cox it also writes c.Lambda, and why is the reason
// when the power found asks for no change of scale.
func adSettings(x, y []float64, opt Options, r Remedy, sc *anScratch, c *Candidate) (o Options, cost float64, note, why string) {
	o = Options{Model: ModelOLS, Level: opt.Level, SlopeRef: opt.SlopeRef, InterceptRef: opt.InterceptRef, SkipAdvice: true}
	switch r {
	case RemedyLogY:
		o.Transform = TransformLogY
	case RemedyLogLog:
		o.Transform = TransformLogLog
	case RemedySqrtY:
		o.Transform = TransformSqrtY
		cost = 0.25
	case RemedyReciprocal:
		o.Transform = TransformReciprocal
		cost = 0.5
	case RemedyBoxCox:
		cost, note, why = adBoxCoxSettings(x, y, opt.Level, sc, c, &o)
	case RemedyWeighted:
		o.Weights = WeightsPowerFit
		o.Model = ModelWeighted
		cost = 0.5
	case RemedyWeightedX2:
		o.Weights, o.Model = WeightsX2, ModelWeighted
		cost = 0.25
		note = "Scatter taken to grow in proportion to x."
	case RemedyWeightedFitted:
		o.Weights, o.Model = WeightsFitted2, ModelWeighted
		cost = 0.25
		note = "Scatter taken to grow in proportion to the reading."
	case RemedyWeightedRepeats:
		o.Weights, o.Model = WeightsRepeats, ModelWeighted
		cost = 0.5
		note = "Scatter taken from the repeats at each standard."
	}
	return o, cost, note, why
}

// adBoxCoxSettings estimates the Box–Cox power λ of the readings (at the
// level), writes it into c.Lambda and sets o to refit at it. It returns
// why instead when λ cannot be estimated or is at or next to 1; the cost
// is 0.75, plus 0.75 when λ's interval contains 0, ½ or −1 (the simpler
// scale the note then names).
func adBoxCoxSettings(x, y []float64, level float64, sc *anScratch, c *Candidate, o *Options) (cost float64, note, why string) {
	bc, err := sc.boxCox(x, y, level)
	if err != nil {
		return 0, "", "The Box–Cox power could not be estimated: " + err.Error() + "."
	}
	lam := bc.Lambda
	c.Lambda = lam
	if (bc.CILow <= 1 && 1 <= bc.CIHigh) || math.Abs(lam-1) < 0.1 {
		// λ = 1 is the scale of the readings themselves, and a power
		// within 0.1 of it is no change a technician could explain: a
		// Box–Cox fit there would only look better by chance.
		return 0, "", fmt.Sprintf("The Box–Cox power λ = %.3g (interval %.3g to %.3g) is at or next to 1: the readings themselves do not ask for a change of scale.", lam, bc.CILow, bc.CIHigh)
	}
	o.Transform = TransformBoxCox
	o.BoxCoxLambda = &lam
	cost = 0.75
	note = fmt.Sprintf("λ = %.3g (%g %% interval %.3g to %.3g).", lam, 100*adLevel(level), bc.CILow, bc.CIHigh)
	for _, s := range []struct {
		lam  float64
		name string
	}{{0, "the plain log scale"}, {0.5, "the square-root scale"}, {-1, "the reciprocal scale"}} {
		if bc.CILow <= s.lam && s.lam <= bc.CIHigh {
			cost += 0.75
			note += fmt.Sprintf(" The interval contains %g, so %s does the same job more simply.", s.lam, s.name)
			break
		}
	}
	return cost, note, ""
}

// adRefit refits the readings with the remedy's options o and fills in c:
// its summary, line and score against before (less cost), or why the
// refit failed.
func adRefit(x, y []float64, o Options, c Candidate, before CheckSummary, cost float64, note string, sc *anScratch) Candidate {
	sc.refit = true
	rep, err := analyze(x, y, o, sc)
	sc.refit = false
	if err != nil {
		if _, _, ws := c.Remedy.Settings(); ws != WeightsNone {
			c.Why = "These weights cannot be used on these readings: " + err.Error() + "."
		} else {
			c.Why = "The refit on this scale failed: " + err.Error() + "."
		}
		return c
	}
	if c.Remedy == RemedyWeighted {
		c.Power = rep.WeightPower
		note = fmt.Sprintf("Scatter taken to grow as |x|^%.2g.", c.Power)
	}
	c.Usable = true
	c.Summary = adSummarize(rep)
	c.Slope = rep.Slope.Estimate
	c.Intercept = rep.Intercept.Estimate
	c.Score = adScore(c.Summary, before, cost)
	c.Why = strings.TrimSpace(fmt.Sprintf("%s: %s; %s: %s; score %.2f. %s",
		NameSpread, c.Summary.Assumptions.Spread.Verdict.Word(), NameLinearity, c.Summary.Assumptions.Linearity.Verdict.Word(), c.Score, note))
	return c
}

// adScore is the ranking score documented on advise.
func adScore(s, before CheckSummary, cost float64) float64 {
	a, b := s.Assumptions, before.Assumptions
	score := 3*(adValue(a.Spread.Verdict)+adValue(a.Linearity.Verdict)) +
		0.5*(adQ(s.BreuschPaganP)+adQ(s.CurvatureP)) - cost
	for _, pair := range [][2]Verdict{
		{a.Independence.Verdict, b.Independence.Verdict},
		{a.Normality.Verdict, b.Normality.Verdict},
	} {
		// Influence is not part of the judgement: weights and changes of
		// scale move the leverage of the ends by design, and an outlier is
		// looked at (and named) before any remedy.
		if d := adRank(pair[0]) - adRank(pair[1]); d > 0 {
			score -= 2 * float64(d)
		}
	}
	return score
}

func adValue(v Verdict) float64 {
	switch v {
	case Pass:
		return 2
	case Fail:
		return 0
	}
	return 1 // warn, or n/a (unknown)
}

// adRank orders verdicts by how bad they are; n/a counts as pass here, so a
// check that could not be run is never taken for a new problem.
func adRank(v Verdict) int {
	switch v {
	case Warn:
		return 1
	case Fail:
		return 2
	}
	return 0
}

func adQ(p float64) float64 {
	if !(p > 0) || math.IsNaN(p) {
		return 0
	}
	return math.Min(p, 0.5) / 0.5
}

func adBad(v Verdict) bool { return v == Warn || v == Fail }

func adLevel(l float64) float64 {
	if l == 0 {
		return DefaultLevel
	}
	return l
}

// adSummarize is the short form of a report used for before and after.
func adSummarize(r *Report) CheckSummary {
	return CheckSummary{
		Assumptions:   r.Assumptions,
		RSquared:      r.RSquared,
		BreuschPaganP: r.Checks.BreuschPagan.P,
		CurvatureP:    r.Checks.Curvature.P,
	}
}

// allNonNegative says whether every value is at zero or above (adNonNegative).
func allNonNegative(v []float64) bool {
	for _, a := range v {
		if !(a >= 0) {
			return false
		}
	}
	return true
}

// allNonZero says whether every value is other than zero (adNonZero).
func allNonZero(v []float64) bool {
	for _, a := range v {
		if a == 0 {
			return false
		}
	}
	return true
}

func adPositive(v float64) bool    { return v > 0 }
func adNonNegative(v float64) bool { return v >= 0 }
func adNonZero(v float64) bool     { return v != 0 }

// adDomain returns "" when every value passes ok, or a sentence naming the
// readings (counted from 1) that do not, with their values.
func adDomain(need, col string, v []float64, ok func(float64) bool) string {
	return adDomainIf(need, col, v, ok, false)
}

// adDomainIf is adDomain; known says every value is already known to pass
// (a tight loop found it, so the sentence is "").
func adDomainIf(need, col string, v []float64, ok func(float64) bool, known bool) string {
	if known {
		return ""
	}
	var bad []string
	count := 0
	for i, a := range v {
		if ok(a) {
			continue
		}
		count++
		if len(bad) < 3 {
			bad = append(bad, fmt.Sprintf("reading %d has %s = %.6g", i+1, col, a))
		}
	}
	if count == 0 {
		return ""
	}
	s := need + "; " + strings.Join(bad, ", ")
	if count > len(bad) {
		s += fmt.Sprintf(" (and %d more)", count-len(bad))
	}
	return s + "."
}

func adProblem(spread, line bool) string {
	switch {
	case spread && line:
		return "The scatter about the line changes across the range and the readings bend away from a straight line."
	case spread:
		return "The scatter about the line changes across the range, so one ± figure does not fit the whole range."
	}
	return "The readings bend away from a straight line."
}

// adHow says in plain words what the recommended remedy does.
func adHow(c Candidate) string {
	switch c.Remedy {
	case RemedyLogY:
		return "Fit the line to the logarithm of y against x: on a log scale, scatter that grows in proportion to the reading (a constant percentage error) becomes even."
	case RemedyLogLog:
		return "Fit the logarithm of y against the logarithm of x: this evens out a constant percentage error and straightens a response that follows a power of x; a slope of 1 on this scale means y is proportional to x."
	case RemedySqrtY:
		return "Fit the square root of y against x: this evens out scatter that grows with the size of the reading, as with counts."
	case RemedyReciprocal:
		return "Fit 1/y against x: this evens out scatter that grows quickly with the size of the reading."
	case RemedyBoxCox:
		return fmt.Sprintf("Fit y raised to the power %.2g (the Box–Cox transform) against x: this is the power the readings themselves favour.", c.Lambda)
	case RemedyWeighted:
		return fmt.Sprintf("Keep the original units but weight the readings: where the scatter is larger a reading counts for less. The scatter was found to grow about as x to the power %.2g.", c.Power)
	case RemedyWeightedX2:
		return "Keep the original units but weight each reading by 1/x²: where the scatter is larger a reading counts for less, as when the scatter grows in proportion to x."
	case RemedyWeightedFitted:
		return "Keep the original units but weight each reading by 1/ŷ², ŷ from the unweighted line: as when the scatter grows in proportion to the reading."
	case RemedyWeightedRepeats:
		return "Keep the original units but weight each reading by 1/s², s the standard deviation of the repeats at its standard: the scatter measured at each standard sets its weight."
	}
	return ""
}

// adAchieved compares the spread and straightness verdicts before and
// after; a verdict that does not change is said to stay ("“Straight line”
// stays Pass"), never to go from a verdict to the same one.
func adAchieved(before, after CheckSummary) string {
	change := func(name string, b, a Verdict) string {
		if b == a {
			return fmt.Sprintf("“%s” stays %s", name, b.Word())
		}
		return fmt.Sprintf("“%s” goes from %s to %s", name, b.Word(), a.Word())
	}
	return "With this change " + change(NameSpread, before.Assumptions.Spread.Verdict, after.Assumptions.Spread.Verdict) +
		" and " + change(NameLinearity, before.Assumptions.Linearity.Verdict, after.Assumptions.Linearity.Verdict) + "."
}

// adEveryXRepeated says whether every value of x occurs at least twice,
// given the positions of x in ascending order (nil: x is in order); when
// not, i is a reading whose x occurs once.
func adEveryXRepeated(x []float64, order []int32) (i int, ok bool) {
	at := func(k int) int {
		if order == nil {
			return k
		}
		return int(order[k])
	}
	for k := 0; k < len(x); {
		e := k + 1
		for e < len(x) && x[at(e)] == x[at(k)] {
			e++
		}
		if e-k < 2 {
			return at(k), false
		}
		k = e
	}
	return 0, true
}
