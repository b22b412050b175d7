package fitcore

import (
	"fmt"
	"math"
)

// inverseAt estimates the x behind the mean ȳ0 of m readings of one
// unknown, x̂ = (ȳ0 − b0)/b1, with
//
//	SE(x̂) = s/|b1|·√(1/m + 1/n + (ȳ0 − ȳ)²/(b1²·Sxx))
//
// (Draper & Smith §3.2; NIST/SEMATECH e-Handbook §2.3.6.7.1; for weighted
// and Deming fits the general form √(s²/(m·w(x̂)) + Var(ŷ(x̂)))/|b1|) and the
// Fieller interval: the set of x with
//
//	(ȳ0 − ŷ(x))² ≤ t²·(s²/(m·w) + Var(ŷ(x))),
//
// a quadratic A·u² + B·u + C ≤ 0 in u = x − x̄ with A = b1² − t²·Var(b1).
// It is a bounded interval only when A > 0, that is when the slope differs
// from zero at the level (g = t²·Var(b1)/b1² < 1); otherwise the interval
// is unbounded and Low, High are 0 with a message. Fieller, J. R. Stat.
// Soc. Suppl. 7 (1940); Draper & Smith §3.2.
func (fc *fitContext) inverseAt(q InverseQuery) Inverse {
	inv := Inverse{M: len(q.Y)}
	f, tr := fc.f, fc.tr
	if len(q.Y) == 0 {
		inv.Message = "No readings were given for this unknown."
		return inv
	}
	var sum, sumT lnKSum
	for i, v := range q.Y {
		if !isFiniteNum(v) {
			inv.Message = fmt.Sprintf("Reading %d of this unknown (%s) is not a finite number.", i+1, formatValue(v))
			return inv
		}
		u, ok := tr.fwdY(v)
		if !ok {
			inv.Message = fmt.Sprintf("Reading %d of this unknown (%s) cannot be put on the fitted scale. %s", i+1, formatValue(v), tr.domainSentence())
			return inv
		}
		sum.add(v)
		sumT.add(u)
	}
	m := float64(len(q.Y))
	inv.Y = sum.val() / m
	if f.b1 == 0 {
		inv.Message = "The slope is zero, so no x can be read back from y."
		return inv
	}
	d := sumT.val()/m*f.ky - f.a
	uhat := d / f.b1
	xsHat := f.xc + uhat
	xtHat := xsHat / f.kx
	s2 := f.s2()
	wx, wok := fc.wm.at(xtHat)
	if !wok {
		inv.Message = "The weighting gives no weight at this x, so no uncertainty can be given."
		inv.X = tr.backX(xtHat)
		return inv
	}
	vnew := s2 / (m * wx * f.cw)
	se := math.Sqrt(math.Max(vnew+f.va+2*f.cab*uhat+f.v1*uhat*uhat, 0)) / math.Abs(f.b1) / f.kx
	inv.X = tr.backX(xtHat)
	if tr.kind == TransformLogLog {
		se *= inv.X // delta method: SE(x) = x·SE(ln x)
	}
	inv.SE = se
	var msgs []string
	if fc.wm.scheme != WeightsNone {
		msgs = append(msgs, "the weight of the unknown is taken at the estimated x")
	}
	t := lnTCrit(fc.rep.Level, f.df)
	// The quadratic is divided by b1² and written in v = u/k, with k the
	// power of two at the size of û and of the interval's half-width, so
	// every coefficient is of order one: with a far unknown (ȳ0 of 1e150
	// on a line of slope 1) d² alone would overflow and turn the bounded
	// interval into a false "slope not clearly different from zero".
	g := t * t * f.v1 / (f.b1 * f.b1)                            // Fieller's g
	hw := t * math.Sqrt(math.Max(vnew+f.va, 0)) / math.Abs(f.b1) // half-width at û, internal x units
	k := 1.0
	if m := math.Max(math.Abs(uhat), hw); m > 0 && isFiniteNum(m) {
		_, e := math.Frexp(m)
		k = math.Ldexp(1, e)
	}
	uk := uhat / k
	A := 1 - g
	B := -2 * (uk + t*t*f.cab/(f.b1*f.b1)/k)
	C := uk*uk - (hw/k)*(hw/k)
	disc := B*B - 4*A*C
	if !(A > 0) || !(disc >= 0) || !isFiniteNum(disc) {
		inv.Bounded = false
		msgs = append(msgs, fmt.Sprintf("the slope is not clearly different from zero at the %s level, so the interval for x is unbounded (shown as 0 to 0)", levelText(fc.rep.Level)))
		inv.Message = joinSentences(msgs)
		return inv
	}
	// Stable roots: q = −(B + sign(B)·√disc)/2, v1 = q/A, v2 = C/q.
	sq := math.Sqrt(disc)
	var u1, u2 float64
	if B == 0 {
		u1, u2 = -sq/(2*A), sq/(2*A)
	} else {
		qq := -0.5 * (B + math.Copysign(sq, B))
		u1, u2 = qq/A, C/qq
		if qq == 0 {
			u2 = u1
		}
	}
	u1, u2 = u1*k, u2*k
	if u1 > u2 {
		u1, u2 = u2, u1
	}
	inv.Low = tr.backX((f.xc + u1) / f.kx)
	inv.High = tr.backX((f.xc + u2) / f.kx)
	inv.Bounded = true
	if lo, hi := fc.xRange(); inv.X < lo || inv.X > hi {
		msgs = append(msgs, fmt.Sprintf("x lies outside the calibrated range %s to %s; the line may not hold there", formatValue(lo), formatValue(hi)))
	}
	inv.Message = joinSentences(msgs)
	return inv
}

func (fc *fitContext) inverses() {
	if len(fc.opt.Inverse) == 0 {
		return
	}
	fc.rep.Inverse = make([]Inverse, len(fc.opt.Inverse))
	for i, q := range fc.opt.Inverse {
		inv := fc.inverseAt(q)
		fc.addStandards(&inv)
		fc.rep.Inverse[i] = finiteInverse(inv)
	}
}

// addStandards adds the uncertainty of the known values x_i
// (Options.XStandardUncertainties) to an inverse prediction x̂0 = (ȳ0 −
// b0)/b1, by the law of propagation of uncertainty for uncorrelated
// inputs (JCGM 100:2008 (GUM) §5.1.2, eq. 10):
//
//	u²_std(x̂0) = Σᵢ (∂x̂0/∂xᵢ)² u²(xᵢ).
//
// The readings y and ȳ0 are held fixed. For the least-squares line with
// intercept, with x̄, ȳ the means, Sxx = Σ(xⱼ−x̄)², b1 = Sxy/Sxx and b0 =
// ȳ − b1·x̄:
//
//	∂Sxy/∂xᵢ = yᵢ − ȳ,   ∂Sxx/∂xᵢ = 2(xᵢ − x̄),
//	∂b1/∂xᵢ = ((yᵢ − ȳ) − 2·b1·(xᵢ − x̄))/Sxx,
//	∂b0/∂xᵢ = −b1/n − x̄·∂b1/∂xᵢ,
//	∂x̂0/∂xᵢ = −(∂b0/∂xᵢ + x̂0·∂b1/∂xᵢ)/b1 = 1/n − (x̂0 − x̄)·(∂b1/∂xᵢ)/b1.
//
// For the line through the origin, b1 = Σxy/Σx² and x̂0 = ȳ0/b1:
//
//	∂b1/∂xᵢ = (yᵢ − 2·b1·xᵢ)/Σx²,   ∂x̂0/∂xᵢ = −x̂0·(∂b1/∂xᵢ)/b1.
//
// The result is reported as the combined standard uncertainty SE =
// √(SEFit² + UStandards²) (GUM §5.1.2), with SEFit the fit's own standard
// error, and the interval X ± k·SE with k = t at the level and ν, the
// residual degrees of freedom of the fit. ν is the lower bound of the
// Welch–Satterthwaite effective degrees of freedom (GUM G.4.1: ν_eff =
// SE⁴/(SEFit⁴/ν) ≥ ν, the standards' part counted with infinite degrees of
// freedom as a Type B evaluation from a certificate, GUM G.4.2), so the
// interval is conservative and never narrower than the same interval
// without the standards (with ν_eff, a small standards' part can shrink
// t faster than it grows SE); ν_eff is given in the message. The symmetric
// interval replaces Fieller's because // Fieller's interval has no room for the standards' part. When Fieller's
// interval is unbounded (the slope is not clearly different from zero) it
// stays unbounded. Only ModelOLS and
// ModelOrigin without a transform are handled (the weighted and Deming
// estimators and the transforms have other derivatives); for the others
// the Message says the standards' uncertainties were not included. The sums
// are taken about the mean (or as given for the origin line) in the
// original units, with a compensated sum for the means.
func (fc *fitContext) addStandards(inv *Inverse) {
	us := fc.opt.XStandardUncertainties
	if us == nil || inv.M == 0 || !isFiniteNum(inv.X) || (inv.SE == 0 && inv.Message != "") {
		return
	}
	any := false
	for _, u := range us {
		any = any || u > 0
	}
	if !any {
		return
	}
	o := fc.opt
	if (o.Model != ModelOLS && o.Model != ModelOrigin) || o.Transform != TransformNone || o.Weights != WeightsNone {
		inv.Message = addSentence(inv.Message, "the standard uncertainties of the standards are not included: they are propagated only for an unweighted straight line without a transform")
		return
	}
	x, y := fc.x, fc.y
	n := float64(len(x))
	x0 := inv.X
	var sum float64
	if o.Model == ModelOrigin {
		var sxx, sxy lnKSum
		for i := range x {
			sxx.add(x[i] * x[i])
			sxy.add(x[i] * y[i])
		}
		b1 := sxy.val() / sxx.val()
		for i := range x {
			if us[i] == 0 {
				continue
			}
			db1 := (y[i] - 2*b1*x[i]) / sxx.val()
			d := -x0 * db1 / b1
			sum += d * d * us[i] * us[i]
		}
	} else {
		var sx, sy lnKSum
		for i := range x {
			sx.add(x[i])
			sy.add(y[i])
		}
		mx, my := sx.val()/n, sy.val()/n
		var sxx, sxy lnKSum
		for i := range x {
			dx := x[i] - mx
			sxx.add(dx * dx)
			sxy.add(dx * (y[i] - my))
		}
		b1 := sxy.val() / sxx.val()
		for i := range x {
			if us[i] == 0 {
				continue
			}
			db1 := ((y[i] - my) - 2*b1*(x[i]-mx)) / sxx.val()
			d := 1/n - (x0-mx)*db1/b1
			sum += d * d * us[i] * us[i]
		}
	}
	ustd := math.Sqrt(sum)
	if !isFiniteNum(ustd) {
		return
	}
	fit := inv.SE
	se := math.Hypot(fit, ustd)
	inv.SEFit, inv.UStandards, inv.SE = fit, ustd, se
	nu := fc.f.df
	// ν_eff (for the message only) is capped at 10⁷: the standards' part
	// alone has infinite degrees of freedom.
	nuEff := 1e7
	if fit > 0 {
		r := se / fit
		nuEff = math.Min(nu*r*r*r*r, nuEff)
	}
	if !inv.Bounded {
		// The slope is not clearly different from zero: the interval stays
		// unbounded, as Fieller's says.
		inv.Message = addSentence(inv.Message, "the standard error includes the standard uncertainties of the standards")
		return
	}
	t := lnTCrit(fc.rep.Level, nu)
	inv.Low, inv.High = x0-t*se, x0+t*se
	msg := fmt.Sprintf("the interval is x ± %s·u with u the combined standard uncertainty of the fit and the standards and t at the fit's %s degrees of freedom (conservative: the effective degrees of freedom are %s), not Fieller's", formatValue(math.Round(t*1e4)/1e4), formatValue(nu), formatValue(math.Round(nuEff*10)/10))
	inv.Message = addSentence(inv.Message, msg)
}

// addSentence appends a clause, as a sentence of its own, to a message.
func addSentence(msg, clause string) string {
	if msg == "" {
		return joinSentences([]string{clause})
	}
	return msg + " " + joinSentences([]string{clause})
}

func levelText(level float64) string {
	return formatValue(math.Round(level*1e6)/1e4) + " %"
}
