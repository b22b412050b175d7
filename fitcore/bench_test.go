package fitcore

import (
	"math/rand/v2"
	"strconv"
	"testing"

	"gonum.org/v1/gonum/stat"
)

// lnBenchData is a seeded straight line with normal noise (invented data).
func lnBenchData(n int) (x, y []float64) {
	r := rand.New(rand.NewPCG(1, uint64(n)))
	x = make([]float64, n)
	y = make([]float64, n)
	for i := range n {
		x[i] = float64(i) * 0.01
		y[i] = 2 + 0.5*x[i] + r.NormFloat64()
	}
	return x, y
}

var lnBenchSizes = []int{10, 1000, 10000, 100000, 1000000}

// BenchmarkAnalyze is the full analysis: fit, inference, every check,
// influence, Box–Cox profile and the advice.
func BenchmarkAnalyze(b *testing.B) {
	for _, n := range lnBenchSizes {
		x, y := lnBenchData(n)
		b.Run("n="+strconv.Itoa(n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := Analyze(x, y, Options{}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkAnalyzeAdvice is the full analysis of an invented record whose
// scatter grows along x and that bends slightly (benchData), so the advice
// refits all six remedies and the Box–Cox profile is computed.
func BenchmarkAnalyzeAdvice(b *testing.B) {
	for _, n := range lnBenchSizes[1:] {
		x, y, _ := benchData(n)
		b.Run("n="+strconv.Itoa(n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := Analyze(x, y, Options{}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkFitLine is the plain least-squares fit (slope, intercept, SSE,
// R² with iterative refinement), beside gonum's stat.LinearRegression +
// stat.RSquared on the same data.
func BenchmarkFitLine(b *testing.B) {
	for _, n := range lnBenchSizes {
		x, y := lnBenchData(n)
		b.Run("pairline/n="+strconv.Itoa(n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				var f lineFit
				if err := fitLine(&f, x, y, nil, false); err != nil {
					b.Fatal(err)
				}
				sinkF = 1 - f.sse/f.syy + f.intercept()
			}
		})
		b.Run("gonum/n="+strconv.Itoa(n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				a, s := stat.LinearRegression(x, y, nil, false)
				sinkF = stat.RSquared(x, y, nil, a, s) + a
			}
		})
	}
}

var sinkF float64

// BenchmarkAdviceParts splits BenchmarkAnalyzeAdvice at 10⁶ readings into
// its parts: the analysis without the advice, the Box–Cox profile alone, and
// Complete (the profile and every refit of the advice).
func BenchmarkAdviceParts(b *testing.B) {
	x, y, _ := benchData(1000000)
	b.Run("skip_advice", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			if _, err := Analyze(x, y, Options{SkipAdvice: true}); err != nil {
				b.Fatal(err)
			}
		}
	})
	b.Run("boxcox", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			if _, err := BoxCoxProfile(x, y, 0.95); err != nil {
				b.Fatal(err)
			}
		}
	})
	b.Run("complete", func(b *testing.B) {
		rep, err := Analyze(x, y, Options{SkipAdvice: true})
		if err != nil {
			b.Fatal(err)
		}
		b.ReportAllocs()
		for b.Loop() {
			if err := Complete(rep, x, y, Options{}); err != nil {
				b.Fatal(err)
			}
		}
	})
}
