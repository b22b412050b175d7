package fitcore

import (
	"fmt"
	"math"
)

// RunsTest is the Wald–Wolfowitz runs test on the signs of the residuals in
// entry order. Residuals that are exactly zero are dropped. With n₊ positive
// and n₋ negative residuals, N = n₊ + n₋ and R runs (maximal stretches of
// one sign),
//
//	μ = 2n₊n₋/N + 1,  σ² = 2n₊n₋(2n₊n₋ − N) / (N²(N − 1)),
//	z = (R − μ ± c)/σ,  p = 2·Φ(−|z|),
//
// (Wald & Wolfowitz, "On a test whether two samples are from the same
// population", Annals of Mathematical Statistics 11, 1940; Swed & Eisenhart,
// Annals of Mathematical Statistics 14, 1943). For N < 50 a continuity
// correction c = 0.5 moves R − μ towards zero (z = 0 when |R − μ| ≤ 0.5);
// for N ≥ 50, c = 0. This is the SAS convention that statsmodels'
// runstest_1samp also follows; statsmodels differs only when
// 0 < R − μ < 0.5, where it adds instead of subtracting the 0.5.
//
// Too few runs means the residuals sit in blocks on one side of the line
// (curvature or drift); too many means they alternate. The check is NA with a
// reason when fewer than 2 non-zero residuals of each sign remain, or for
// non-finite input. Verdict (common practice): p < 0.01 fails, p < 0.05 warns.
func RunsTest(resid []float64) Check {
	return runsTest(resid, false)
}

// runsTest is RunsTest; valid says resid is already known to be finite.
func runsTest(resid []float64, valid bool) Check {
	const name = "Runs"
	if !valid {
		if s := ckFirstNonFinite("residual", resid); s != "" {
			return ckNA(name, s)
		}
	}
	var npos, nneg, runs float64
	last := 0
	for _, e := range resid {
		s := 0
		switch {
		case e > 0:
			s, npos = 1, npos+1
		case e < 0:
			s, nneg = -1, nneg+1
		default:
			continue
		}
		if s != last {
			runs++
			last = s
		}
	}
	if npos < 2 || nneg < 2 {
		return ckNA(name, fmt.Sprintf("The runs check needs at least 2 residuals above and 2 below the line; there are %.0f above and %.0f below.", npos, nneg))
	}
	n := npos + nneg
	pn := npos * nneg
	mu := 2*pn/n + 1
	v := 2 * pn * (2*pn - n) / (n * n * (n - 1))
	if !(v > 0) {
		return ckNA(name, "Too few residuals of each sign to judge their order.")
	}
	dev := runs - mu
	if n < 50 {
		switch {
		case math.Abs(dev) <= 0.5:
			dev = 0
		case dev > 0:
			dev -= 0.5
		default:
			dev += 0.5
		}
	}
	z := dev / math.Sqrt(v)
	p := ckZ2(z)
	c := Check{Name: name, Statistic: z, P: p, Verdict: ckVerdict(p, ckWarnP, ckFailP)}
	detail := fmt.Sprintf("%.0f runs where about %.1f are expected; z = %.2f, %s", runs, mu, z, ckFmtP(p))
	switch {
	case c.Verdict == Pass:
		c.Message = fmt.Sprintf("The residuals switch sides of the line about as often as chance would have it (%s).", detail)
	case z < 0:
		c.Message = fmt.Sprintf("The residuals sit in long stretches on one side of the line, which points to a bend or a drift (%s).", detail)
	default:
		c.Message = fmt.Sprintf("The residuals flip from one side of the line to the other more often than chance (%s).", detail)
	}
	return c
}
