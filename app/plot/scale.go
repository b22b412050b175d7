// Package plot turns numbers into SVG markup for Pairline's plots: linear
// scales, round-number ticks in 1-2-5 steps, thinning of large data sets for
// drawing, and our own point markers. It is pure Go (strings in, strings
// out), computes no statistics and never emits NaN or Inf into the markup.
package plot

import (
	"math"
	"strconv"

	"pairline/app/numfmt"
)

// Range is a closed interval of data values.
type Range struct{ Lo, Hi float64 }

// Span is Hi − Lo.
func (r Range) Span() float64 { return r.Hi - r.Lo }

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// Extent returns the smallest range holding every finite value of the
// slices; ok is false when there is none.
func Extent(values ...[]float64) (r Range, ok bool) {
	for _, vs := range values {
		for _, v := range vs {
			if !finite(v) {
				continue
			}
			if !ok {
				r, ok = Range{v, v}, true
				continue
			}
			r.Lo, r.Hi = math.Min(r.Lo, v), math.Max(r.Hi, v)
		}
	}
	return r, ok
}

// Include widens r to hold v (ignored when v is not finite).
func (r Range) Include(v float64) Range {
	if !finite(v) {
		return r
	}
	return Range{math.Min(r.Lo, v), math.Max(r.Hi, v)}
}

// Pad widens r by frac of its span on each side. A range of one value is
// widened by frac of its magnitude (or by 1 around 0), so that a scale over
// it is never degenerate.
func (r Range) Pad(frac float64) Range {
	s := r.Span()
	if !(s > 0) || !finite(s) {
		m := math.Max(math.Abs(r.Lo), math.Abs(r.Hi))
		if m == 0 || !finite(m) {
			m = 1
		}
		return Range{r.Lo - m*math.Max(frac, 0.05), r.Hi + m*math.Max(frac, 0.05)}
	}
	return Range{r.Lo - s*frac, r.Hi + s*frac}
}

// Scale maps the data range D linearly onto the drawing interval [P0, P1]
// (P1 may be below P0, as for a y axis drawn downwards).
type Scale struct {
	D      Range
	P0, P1 float64
}

// At returns the drawing coordinate of v: P0 + (v − D.Lo)·(P1 − P0)/(D.Hi − D.Lo).
// A degenerate range maps everything to the middle; a non-finite v maps to P0.
func (s Scale) At(v float64) float64 {
	span := s.D.Span()
	if !(span > 0) || !finite(span) || !finite(v) {
		return (s.P0 + s.P1) / 2
	}
	p := s.P0 + (v-s.D.Lo)*(s.P1-s.P0)/span
	if !finite(p) {
		return s.P0
	}
	return p
}

// NiceStep returns the round-number tick step for a span: of the steps 1,
// 2 or 5 times a power of ten, the one whose count of intervals over the
// span is nearest to target (the larger step on a tie). This is the 1-2-5
// rule of chart axes (common practice). It returns 0 for a span that is not
// positive and finite.
func NiceStep(span float64, target int) float64 {
	if !(span > 0) || !finite(span) {
		return 0
	}
	if target < 1 {
		target = 1
	}
	raw := span / float64(target)
	p := math.Pow(10, math.Floor(math.Log10(raw)))
	if p == 0 || !finite(p) {
		return 0
	}
	best, bestD := 0.0, math.Inf(1)
	for _, m := range []float64{0.5, 1, 2, 5, 10} {
		step := m * p
		if !finite(step) || step == 0 {
			continue
		}
		d := math.Abs(span/step - float64(target))
		if d <= bestD {
			best, bestD = step, d
		}
	}
	return best
}

// Ticks returns the multiples of NiceStep(r.Span(), maxTicks) inside r,
// from the lowest up; none for an empty or non-finite range.
func Ticks(r Range, maxTicks int) []float64 {
	step := NiceStep(r.Span(), maxTicks)
	if step == 0 {
		return nil
	}
	first := math.Ceil(r.Lo/step - 1e-9)
	if math.Abs(first) > 1<<50 || math.Abs(r.Hi/step) > 1<<50 {
		// The span is too narrow for its magnitude (a few units in the last
		// place of float64): successive multiples of the step would round to
		// the same number. The ends are all that can be told apart.
		if r.Lo < r.Hi {
			return []float64{r.Lo, r.Hi}
		}
		return []float64{r.Lo}
	}
	var out []float64
	for k := first; ; k++ {
		v := k * step
		if v > r.Hi+step*1e-9 || len(out) > 4*maxTicks+4 {
			break
		}
		if math.Abs(v) < step*1e-9 {
			v = 0 // no "−0"
		}
		out = append(out, v)
	}
	return out
}

// TickLabel formats a tick value with as many decimals as its step needs
// (0.25 steps show two, 50 steps none); very large or small steps use an
// exponent. Minus signs are real minus signs (app/numfmt).
func TickLabel(v, step float64) string {
	if !finite(v) {
		return "—"
	}
	if !(step > 0) || !finite(step) {
		return numfmt.Sig(v, 3)
	}
	e := math.Floor(math.Log10(step) + 1e-9)
	if e >= 7 || e <= -6 {
		s := strconv.FormatFloat(math.Abs(v), 'e', max(0, int(math.Floor(math.Log10(math.Abs(v)+step)))-int(e)), 64)
		if v == 0 {
			s = "0"
		}
		if v < 0 {
			return "−" + s
		}
		return s
	}
	dec := 0
	if e < 0 {
		dec = int(-e)
	}
	// A step of 2.5×10^k or 0.25 needs one more decimal than its power.
	if r := step / math.Pow(10, e); math.Abs(r-math.Round(r)) > 1e-6 {
		dec++
	}
	return numfmt.Decimals(v, dec)
}
