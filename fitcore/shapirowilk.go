package fitcore

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/stat/distuv"
)

// Errors returned by ShapiroWilk.
var (
	errSWTooFew    = errors.New("the Shapiro–Wilk check needs at least 3 values")
	errSWNotFinite = errors.New("a value is not a finite number")
	errSWConstant  = errors.New("all values are the same, so their shape cannot be judged")
)

// swBlock is the largest sample Royston's p-value approximation covers.
const swBlock = 5000

// ShapiroWilk returns the Shapiro–Wilk statistic W and its p-value for the
// hypothesis that x comes from a normal distribution,
//
//	W = (Σ a_i x_(i))² / Σ (x_i − x̄)²,
//
// with x_(i) the ordered values and a the coefficients of Royston's
// approximation: m_i = Φ⁻¹((i − 3/8)/(n + 1/4)), a_n and a_(n−1) from
// Royston's polynomials in u = 1/√n, the others a_i = m_i/ε normalised so that
// Σa_i² = 1. The p-value comes from Royston's normalising transformation of
// ln(1 − W): for 4 ≤ n ≤ 11 via −ln(γ − ln(1 − W)), γ = −2.273 + 0.459n, for
// n ≥ 12 with mean and log-sd polynomials in ln n, and for n = 3 exactly,
// p = (6/π)(asin √W − asin √(3/4)). Sources: Shapiro & Wilk, Biometrika 52
// (1965); Royston, "Approximating the Shapiro–Wilk W-test for non-normality",
// Statistics and Computing 2 (1992); Royston, "Remark AS R94: A remark on
// algorithm AS 181", Applied Statistics 44 (1995). This is the algorithm
// behind scipy.stats.shapiro, which the tests compare with.
//
// For n > 5000 (beyond the range Royston's p approximation was fitted for),
// W is still computed from all n values, but the p-value is computed without
// any randomness as follows: the values are dealt, in entry order, into
// k = ⌈n/5000⌉ interleaved groups (value i goes to group i mod k, so each
// group spans the whole record), each group of 2500–5000 values gets its own
// Royston p, and the k independent p-values are combined by Fisher's method,
// −2 Σ ln p_j ~ χ²(2k) (Fisher, Statistical Methods for Research Workers,
// 1932, §21.1).
//
// The cost is O(n log n) at most (sorting; a radix sort for large n, see
// sortutil.go). ShapiroWilk returns an error for fewer
// than 3 values, non-finite values, or values that are all the same.
func ShapiroWilk(x []float64) (w, p float64, err error) {
	var b ckSortBuf
	return shapiroWilk(x, &b, false)
}

// shapiroWilk is ShapiroWilk with its work space in b. Groups of equal
// size share their coefficients, and so do the calls that share b.
// valid says x is already known to be finite.
func shapiroWilk(x []float64, b *ckSortBuf, valid bool) (w, p float64, err error) {
	w, p, _, err = shapiroWilkIf(x, b, valid, nil)
	return w, p, err
}

// shapiroWilkIf is shapiroWilk, but for n > swBlock, when needW is not
// nil, the p-value of the groups comes first and W (the sort of all n
// values) is worked out only when needW(p) says so; haveW says whether it
// was. Whether the values have no spread (an error) is found, without the
// sort, from their range, as the sort would find it.
func shapiroWilkIf(x []float64, b *ckSortBuf, valid bool, needW func(p float64) bool) (w, p float64, haveW bool, err error) {
	n := len(x)
	if needW == nil || n <= swBlock {
		w, p, err = shapiroWilkAll(x, b, valid)
		return w, p, err == nil, err
	}
	for i := 0; i < n && !valid; i++ {
		if v := x[i]; !ckFinite(v) {
			return 0, 0, false, fmt.Errorf("value %d (%v): %w", i+1, v, errSWNotFinite)
		}
	}
	b.f = ckGrowF64(b.f, n)
	p = swGroupsP(x, b, b.f)
	if !needW(p) {
		// (Values without spread give groups without spread, p = 1.)
		lo, hi := rangeOf(x)
		if rng := hi - lo; !(rng > 0) || !ckFinite(rng) {
			return 0, 0, false, errSWConstant
		}
		return 0, p, false, nil
	}
	s := b.sortedCopy(x)
	w, _, ok := swSorted(s, b.swCoef(n))
	if !ok {
		return 0, 0, false, errSWConstant
	}
	return w, p, true, nil
}

// shapiroWilkAll is shapiroWilk: W from the sort of all values, then p.
func shapiroWilkAll(x []float64, b *ckSortBuf, valid bool) (w, p float64, err error) {
	n := len(x)
	if n < 3 {
		return 0, 0, errSWTooFew
	}
	for i := 0; i < n && !valid; i++ {
		if v := x[i]; !ckFinite(v) {
			return 0, 0, fmt.Errorf("value %d (%v): %w", i+1, v, errSWNotFinite)
		}
	}
	if n <= swBlock {
		s := b.sortedCopy(x)
		w, p, ok := swSorted(s, b.swCoef(n))
		if !ok {
			return 0, 0, errSWConstant
		}
		return w, p, nil
	}
	s := b.sortedCopy(x)
	w, _, ok := swSorted(s, b.swCoef(n))
	if !ok {
		return 0, 0, errSWConstant
	}
	// The sorted sample is no longer needed, so its space holds one group
	// at a time.
	return w, swGroupsP(x, b, s), nil
}

// swGroupsP is the p-value of ShapiroWilk for n > swBlock values: the
// groups' p-values combined by Fisher's method. Group j holds the values
// at positions j, j+k, j+2k, …: n/k of them, one more for j < n mod k;
// space (of n values at least) holds one group at a time.
func swGroupsP(x []float64, b *ckSortBuf, space []float64) float64 {
	n := len(x)
	s := space
	k := (n + swBlock - 1) / swBlock
	var fisher float64
	groups := 0
	for j := range k {
		g := s[:0]
		for i := j; i < n; i += k {
			g = append(g, x[i])
		}
		b.sortInPlace(g)
		_, pj, ok := swSorted(g, b.swCoef(len(g)))
		if !ok {
			// A group with no spread: treat it as uninformative.
			pj = 1
		}
		fisher += -2 * math.Log(math.Max(pj, 1e-300))
		groups++
	}
	return ckChi2SF(fisher, float64(2*groups))
}

// swSorted computes W and Royston's p for sorted s (3 ≤ n) with a =
// swCoefficients(len(s)). ok is false when s has no spread. Following AS
// R94, 1 − W is computed directly as 1 − corr²(a, x) to keep its precision
// when W is close to 1.
func swSorted(s, a []float64) (w, p float64, ok bool) {
	n := len(s)
	rng := s[n-1] - s[0]
	if !(rng > 0) || !ckFinite(rng) {
		return 0, 0, false
	}
	// Centre at the middle value and scale by the range (as AS R94 does), then
	// take the mean in a second pass.
	mid := s[n/2]
	var mean float64
	for _, v := range s {
		mean += (v - mid) / rng
	}
	mean /= float64(n)
	var ssa, ssx, sax float64
	for i, v := range s {
		var ai float64
		switch j := n - 1 - i; {
		case i < j:
			ai = -a[i]
		case i > j:
			ai = a[j]
		}
		xv := (v-mid)/rng - mean
		ssa += ai * ai
		ssx += xv * xv
		sax += ai * xv
	}
	if !(ssx > 0) {
		return 0, 0, false
	}
	r := math.Sqrt(ssa * ssx)
	w1 := (r - sax) * (r + sax) / (ssa * ssx)
	if w1 < 0 {
		w1 = 0
	}
	w = 1 - w1
	return w, swP(n, w, w1), true
}

// swCoefficients returns a_1 … a_⌊n/2⌋ (positive, largest first) of
// Royston (1992, 1995) for the upper half; the lower half is antisymmetric.
func swCoefficients(n int) []float64 {
	half := n / 2
	a := make([]float64, half)
	if n == 3 {
		a[0] = math.Sqrt(0.5)
		return a
	}
	c1 := []float64{0, 0.221157, -0.147981, -2.07119, 4.434685, -2.706056}
	c2 := []float64{0, 0.042981, -0.293762, -1.752461, 5.682633, -3.582633}
	an := float64(n)
	m := a // m_i is computed in place and turned into a_i below
	var summ2 float64
	for i := 0; i < half; i++ {
		m[i] = distuv.UnitNormal.Quantile((float64(i+1) - 0.375) / (an + 0.25))
		summ2 += m[i] * m[i]
	}
	summ2 *= 2
	ssumm2 := math.Sqrt(summ2)
	rsn := 1 / math.Sqrt(an)
	a1 := swPoly(c1, rsn) - m[0]/ssumm2
	var fac float64
	first := 1
	if n > 5 {
		first = 2
		a2 := -m[1]/ssumm2 + swPoly(c2, rsn)
		fac = math.Sqrt((summ2 - 2*m[0]*m[0] - 2*m[1]*m[1]) / (1 - 2*a1*a1 - 2*a2*a2))
		a[1] = a2
	} else {
		fac = math.Sqrt((summ2 - 2*m[0]*m[0]) / (1 - 2*a1*a1))
	}
	a[0] = a1
	for i := first; i < half; i++ {
		a[i] = -m[i] / fac
	}
	return a
}

// swP is Royston's p-value for W (w1 = 1 − W) at sample size n.
func swP(n int, w, w1 float64) float64 {
	if n == 3 {
		const pi6, stqr = 6 / math.Pi, math.Pi / 3
		return ckClampP(pi6 * (math.Asin(math.Sqrt(w)) - stqr))
	}
	if w1 <= 0 {
		return 1
	}
	y := math.Log(w1)
	an := float64(n)
	var mu, sd float64
	if n <= 11 {
		gamma := -2.273 + 0.459*an
		if y >= gamma {
			return 1e-99 // W is below the smallest value the approximation covers
		}
		y = -math.Log(gamma - y)
		mu = swPoly([]float64{0.544, -0.39978, 0.025054, -6.714e-4}, an)
		sd = math.Exp(swPoly([]float64{1.3822, -0.77857, 0.062767, -0.0020322}, an))
	} else {
		lx := math.Log(an)
		mu = swPoly([]float64{-1.5861, -0.31082, -0.083751, 0.0038915}, lx)
		sd = math.Exp(swPoly([]float64{-0.4803, -0.082676, 0.0030302}, lx))
	}
	return ckClampP(distuv.UnitNormal.Survival((y - mu) / sd))
}

// swPoly evaluates c[0] + c[1]·x + … by Horner's rule.
func swPoly(c []float64, x float64) float64 {
	var r float64
	for i := len(c) - 1; i >= 0; i-- {
		r = r*x + c[i]
	}
	return r
}

// ShapiroWilkCheck runs ShapiroWilk on the residuals and turns the outcome
// into a Check. Verdict (common practice): p < 0.01 fails, p < 0.05 warns.
// With more than 5000 residuals the Message says how the p-value was
// obtained (see ShapiroWilk). Errors become an NA check with the reason.
func ShapiroWilkCheck(resid []float64) Check {
	var b ckSortBuf
	return shapiroWilkCheck(resid, &b, false)
}

// shapiroWilkCheck is ShapiroWilkCheck with its work space in b; valid
// says resid is already known to be finite.
func shapiroWilkCheck(resid []float64, b *ckSortBuf, valid bool) Check {
	return shapiroWilkCheckIf(resid, b, valid, false)
}

// shapiroWilkCheckIf is shapiroWilkCheck; with verdictOnly (an advice
// refit, which takes only the normality assumption, whose Pass has no
// figures) a Pass from the groups' p of more than swBlock residuals is
// given without W, the sort of all of them (Statistic 0 and a message
// saying so). Every other outcome is shapiroWilkCheck's.
func shapiroWilkCheckIf(resid []float64, b *ckSortBuf, valid, verdictOnly bool) Check {
	const name = "Shapiro–Wilk"
	if !valid {
		if s := ckFirstNonFinite("residual", resid); s != "" {
			return ckNA(name, s)
		}
	}
	if len(resid) < 3 {
		return ckNA(name, fmt.Sprintf("The Shapiro–Wilk check needs at least 3 readings; there are %d.", len(resid)))
	}
	var needW func(float64) bool
	if verdictOnly {
		needW = func(p float64) bool { return ckVerdict(p, ckWarnP, ckFailP) != Pass }
	}
	w, p, haveW, err := shapiroWilkIf(resid, b, true, needW)
	if err != nil {
		return ckNA(name, "The residuals are all the same (for example all zero), so their shape cannot be judged.")
	}
	c := Check{Name: name, Statistic: w, P: p, Verdict: ckVerdict(p, ckWarnP, ckFailP)}
	if !haveW {
		c.Message = fmt.Sprintf("The residuals are consistent with a normal (bell-shaped) spread (%s; W not worked out for this verdict).", ckFmtP(p))
		return c
	}
	switch c.Verdict {
	case Fail:
		c.Message = fmt.Sprintf("The residuals do not follow a normal (bell-shaped) spread (W = %.4f, %s).", w, ckFmtP(p))
	case Warn:
		c.Message = fmt.Sprintf("The residuals may not follow a normal (bell-shaped) spread (W = %.4f, %s).", w, ckFmtP(p))
	default:
		c.Message = fmt.Sprintf("The residuals are consistent with a normal (bell-shaped) spread (W = %.4f, %s).", w, ckFmtP(p))
	}
	if n := len(resid); n > swBlock {
		k := (n + swBlock - 1) / swBlock
		c.Message += fmt.Sprintf(" With %d residuals, W uses all of them and the p-value combines %d interleaved groups of at most %d by Fisher's method.", n, k, swBlock)
	}
	return c
}
