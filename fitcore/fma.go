package fitcore

import "math"

// fmaSplit is Veltkamp's splitting constant 2^27 + 1 for binary64.
const fmaSplit = 0x1p27 + 1

// fmaEmulated is math.FMA(a, b, c), a·b + c with one rounding, worked out
// from rounded additions and multiplications only, for machines without a
// fused multiply-add (on WebAssembly math.FMA is a software routine on
// 128-bit integer products, several times slower):
//
//	(uh, ul) = a·b exactly         Dekker's product with Veltkamp's split
//	(th, tl) = c + uh exactly      Knuth's 2Sum
//	v        = RO(tl + ul)         rounded to odd: RN, then, when inexact
//	                               and the last bit is even, the neighbour
//	                               toward the error
//	result   = RN(th + v)
//
// (S. Boldo and G. Melquiond, "Emulation of a FMA and correctly rounded
// sums: proved algorithms using rounding to odd", IEEE Transactions on
// Computers 57(4), 2008, the emulated FMA; Dekker 1971 and Knuth, TAOCP
// vol. 2, §4.2.2, for the exact product and sum; from memory). The proof
// needs no underflow or overflow anywhere: outside |a|, |b|, |c|, |a·b| ≤
// 2^900 with a·b ≥ 2^-900 and an odd-rounded sum of 0 or ≥ 2^-900 (a NaN,
// an infinity or a zero product included), math.FMA answers instead. The
// explicit float64 conversions keep the compiler from fusing any step.
func fmaEmulated(a, b, c float64) float64 {
	uh := float64(a * b)
	pu := math.Abs(uh)
	if !(pu >= 0x1p-900 && pu <= 0x1p900 && math.Abs(a) <= 0x1p900 && math.Abs(b) <= 0x1p900 && math.Abs(c) <= 0x1p900) {
		return math.FMA(a, b, c)
	}
	if c == 0 {
		return uh // a·b ± 0 rounded once is a·b rounded
	}
	ah, al := fmaSplitOf(a)
	bh, bl := fmaSplitOf(b)
	ul := float64(float64(float64(float64(ah*bh)-uh)+float64(ah*bl))+float64(al*bh)) + float64(al*bl)
	th, tl := fmaTwoSum(c, uh)
	v, e := fmaTwoSum(tl, ul)
	if v != 0 && math.Abs(v) < 0x1p-900 {
		return math.FMA(a, b, c)
	}
	if e != 0 {
		if bits := math.Float64bits(v); bits&1 == 0 {
			// Inexact with an even last bit: the odd neighbour, on
			// the side of the true sum.
			if (e > 0) == (v > 0) {
				bits++
			} else {
				bits--
			}
			v = math.Float64frombits(bits)
		}
	}
	return th + v
}

// fmaSplitOf is Veltkamp's split: hi + lo = a with hi holding the upper 26
// bits of the significand and lo the rest, so that products of the halves
// are exact.
func fmaSplitOf(a float64) (hi, lo float64) {
	t := float64(fmaSplit * a)
	hi = t - float64(t-a)
	return hi, a - hi
}

// fmaTwoSum is Knuth's 2Sum: s = RN(a + b) and err with s + err = a + b
// exactly.
func fmaTwoSum(a, b float64) (s, err float64) {
	s = a + b
	bv := s - a
	av := s - bv
	return s, float64(a-av) + float64(b-bv)
}
