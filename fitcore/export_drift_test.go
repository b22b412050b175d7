package fitcore

import "math/rand/v2"

// ChiSquaredDrawsForTest returns n draws of chiSquaredDraw with k degrees
// of freedom (seeded by k), for TestChiSquaredDraws.
func ChiSquaredDrawsForTest(k float64, n int) []float64 {
	rng := rand.New(rand.NewPCG(20261203, uint64(k*1000)))
	x := make([]float64, n)
	for i := range x {
		x[i] = chiSquaredDraw(rng, k)
	}
	return x
}
