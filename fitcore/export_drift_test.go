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

// DriftReferenceForTest is DriftEstimated's reference of |T| drawn from
// draws simulated histories instead of DriftDraws: the p of the observed
// t and the level quantile, for TestDriftEstimatedR.
func DriftReferenceForTest(t, se, df []float64, draws int, tObs, level float64) (p, q float64) {
	w := make([]float64, len(se))
	for i := range se {
		w[i] = 1 / (se[i] * se[i])
	}
	ref := driftSimulate(t, se, df, w, draws, 1)
	p, _ = ref.p(tObs)
	return p, ref.quantile(level)
}
