package fitcore

import (
	"fmt"
	"math"
	"testing"
)

// benchData is an invented deterministic calibration of n readings with a
// little curvature and uneven scatter (no randomness: a fixed-step sequence).
func benchData(n int) (x, y, r []float64) {
	x = make([]float64, n)
	y = make([]float64, n)
	for i := range x {
		x[i] = float64(i%997) + 0.001*float64(i)
		noise := math.Sin(float64(i)*12.9898) * 0.5
		y[i] = 2 + 0.5*x[i] + 1e-5*x[i]*x[i] + noise*(1+x[i]/500)
	}
	_, _, r, _ = ckLine(x, y, nil, false)
	return
}

var benchSizes = []int{1e3, 1e5, 1e6}

func BenchmarkChecks(b *testing.B) {
	for _, n := range benchSizes {
		x, y, r := benchData(n)
		run := func(name string, f func()) {
			b.Run(fmt.Sprintf("%s/n=%d", name, n), func(b *testing.B) {
				b.ReportAllocs()
				for i := 0; i < b.N; i++ {
					f()
				}
			})
		}
		run("Curvature", func() { CurvatureTest(x, y, nil, 0.95) })
		run("LackOfFit", func() { LackOfFit(x, y, nil, false) })
		run("BreuschPagan", func() { BreuschPagan(x, r) })
		run("White", func() { White(x, r) })
		run("DurbinWatson", func() { DurbinWatson(x, r, false) })
		run("Runs", func() { RunsTest(r) })
		run("ShapiroWilk", func() { ShapiroWilkCheck(r) })
		run("Influence", func() { Influence(x, r, nil, false) })
		run("XExactness", func() { XExactness(x, y, 0.1, 0, 0.95) })
	}
}
