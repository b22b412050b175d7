package fitcore

import (
	"math"

	"gonum.org/v1/gonum/stat/distuv"
)

// NormalQuantiles returns the n expected standard-normal order statistics
// used as the theoretical axis of a normal Q–Q plot, by Blom's plotting
// positions:
//
//	z_i = Φ⁻¹((i − 3/8) / (n + 1/4)),  i = 1 … n
//
// (G. Blom, Statistical Estimates and Transformed Beta-Variables, Wiley
// 1958). The values are increasing and symmetric about 0. n ≤ 0 gives nil.
func NormalQuantiles(n int) []float64 {
	if n <= 0 {
		return nil
	}
	z := make([]float64, n)
	d := float64(n) + 0.25
	for i := range z {
		p := (float64(i+1) - 0.375) / d
		z[i] = distuv.UnitNormal.Quantile(p)
	}
	// Exact symmetry (the quantile function is not exactly odd in floating
	// point), and an exact 0 in the middle of an odd count.
	for i := 0; i < n/2; i++ {
		a := (z[n-1-i] - z[i]) / 2
		z[i], z[n-1-i] = -a, a
	}
	if n%2 == 1 {
		z[n/2] = 0
	}
	return z
}

// QQPoint is one point of a normal Q–Q plot: the value at position Index of
// the input, its rank from 0 (smallest first) and the theoretical quantile
// for that rank.
type QQPoint struct {
	Index       int     `json:"index"`
	Rank        int     `json:"rank"`
	Sample      float64 `json:"sample"`
	Theoretical float64 `json:"theoretical"`
}

// NormalQQ pairs the values, sorted from the smallest, with the Blom
// quantiles of NormalQuantiles(n) (ties keep their input order). Values that
// are not finite are left out, so the plot never holds NaN or Inf.
func NormalQQ(values []float64) []QQPoint {
	idx := make([]int, 0, len(values))
	fin := make([]float64, 0, len(values))
	for i, v := range values {
		if !math.IsNaN(v) && !math.IsInf(v, 0) {
			idx = append(idx, i)
			fin = append(fin, v+0) // +0 for −0: the two are a tie
		}
	}
	// Positions in ascending order of value, ties by position (the radix
	// sort of the checks: a comparison sort took most of a plot's time at
	// 10,000 readings in the browser).
	var sb ckSortBuf
	order := sb.order(fin)
	z := NormalQuantiles(len(idx))
	out := make([]QQPoint, len(idx))
	for r, k := range order {
		i := idx[k]
		out[r] = QQPoint{Index: i, Rank: r, Sample: values[i], Theoretical: z[r]}
	}
	return out
}
