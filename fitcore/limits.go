package fitcore

import "math"

// Detection and quantitation limits from the calibration line,
//
//	LOD = 3.3·σ/|b1|,  LOQ = 10·σ/|b1|,
//
// with σ the residual standard error of the line (ICH Q2(R1), Validation of
// Analytical Procedures, §6.3 and §7.3, "based on the standard deviation of
// the response and the slope"). For a weighted fit σ is the standard
// deviation of one reading at the lowest standard, s/√w(x_min). They are
// given only for untransformed fits, in x units, and not when the readings
// have no scatter (NoScatterTol): σ is then a rounding error.
func (fc *fitContext) limits() {
	rep := fc.rep
	if fc.tr.kind != TransformNone || fc.noScatter {
		// No scatter: σ is a rounding error and a "limit" from it would
		// claim a sensitivity the instrument does not have.
		return
	}
	b1 := math.Abs(rep.Slope.Estimate)
	if !(b1 > 0) {
		return
	}
	sigma := rep.ResidualSE
	if fc.wm.scheme != WeightsNone {
		lo, _ := fc.xRange()
		w, ok := fc.wm.at(lo)
		if !ok {
			return
		}
		sigma /= math.Sqrt(w)
	}
	lod, loq := 3.3*sigma/b1, 10*sigma/b1
	if !isFiniteNum(lod) || !isFiniteNum(loq) {
		return
	}
	rep.Limits = &Limits{LOD: lod, LOQ: loq}
}
