package fitcore_test

import (
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"pairline/fitcore"
)

// TestComplete: a report made with SkipAdvice and then completed equals the
// report of one full Analyze, on every golden dataset (NIST StRD and
// handbook files, Anscombe's quartet; see testdata/golden) with its
// golden options and with each change of scale, and on invented records
// whose scatter grows with the reading (so that the advice refits every
// remedy). The comparison is of the whole report as JSON.
func TestComplete(t *testing.T) {
	type rec struct {
		name string
		x, y []float64
		opt  fitcore.Options
	}
	var recs []rec
	for _, g := range loadGoldens(t) {
		for _, gf := range g.Fits {
			recs = append(recs, rec{g.Name + "/" + fitName(gf.Spec), g.X, g.Y, goldenOptions(t, gf.Spec)})
		}
		for _, tr := range []fitcore.Transform{fitcore.TransformLogY, fitcore.TransformLogLog, fitcore.TransformSqrtY, fitcore.TransformReciprocal, fitcore.TransformBoxCox} {
			recs = append(recs, rec{g.Name + "/" + string(tr), g.X, g.Y, fitcore.Options{Transform: tr, PredictX: []float64{g.X[0]}}})
		}
	}
	r := rand.New(rand.NewPCG(3, 9))
	for _, n := range []int{8, 60, 1000} {
		x, y := make([]float64, n), make([]float64, n)
		for i := range x {
			x[i] = 1 + 99*float64(i)/float64(n-1)
			y[i] = 2 * x[i] * (1 + 0.08*r.NormFloat64())
		}
		recs = append(recs, rec{fmt.Sprintf("invented percentage error n=%d", n), x, y, fitcore.Options{Level: 0.99}})
	}
	// Past anParallelMin the full analysis runs its checks side by side
	// and keeps their work space for the refits, while SkipAdvice runs
	// them one after another and lets each one's go (checkRun.lean): the
	// x are out of order and repeated (lack of fit's sort and levels) and
	// one record is weighted (Durbin–Watson's weighted design).
	const big = 30000
	bx, by := make([]float64, big), make([]float64, big)
	for i := range bx {
		bx[i] = float64(1 + r.IntN(400))
		by[i] = 3 + 2*bx[i]*(1+0.05*r.NormFloat64())
	}
	recs = append(recs, rec{"invented shuffled repeats n=30000", bx, by, fitcore.Options{}},
		rec{"invented shuffled repeats n=30000 weighted x2", bx, by, fitcore.Options{Weights: fitcore.WeightsX2}})
	for _, c := range recs {
		full, errFull := fitcore.Analyze(c.x, c.y, c.opt)
		quick := c.opt
		quick.SkipAdvice = true
		part, errPart := fitcore.Analyze(c.x, c.y, quick)
		if (errFull == nil) != (errPart == nil) {
			t.Fatalf("%s: Analyze errors differ: %v / %v", c.name, errFull, errPart)
		}
		if errFull != nil {
			continue
		}
		if part.Advice != nil || part.BoxCox != nil {
			t.Errorf("%s: SkipAdvice still gave the advice or the Box–Cox profile", c.name)
		}
		if err := fitcore.Complete(part, c.x, c.y, quick); err != nil {
			t.Fatalf("%s: Complete: %v", c.name, err)
		}
		a, _ := json.Marshal(full)
		b, _ := json.Marshal(part)
		if string(a) != string(b) {
			t.Errorf("%s: completed report differs from the full analysis\nfull:     %.400s\ncompleted: %.400s", c.name, a, b)
		}
	}
	if err := fitcore.Complete(nil, nil, nil, fitcore.Options{}); err == nil {
		t.Error("Complete(nil) gave no error")
	}
	rep, _ := fitcore.Analyze([]float64{1, 2, 3, 4}, []float64{2, 4.1, 5.9, 8.2}, fitcore.Options{SkipAdvice: true})
	if err := fitcore.Complete(rep, []float64{1, 2, 3}, []float64{2, 4.1, 5.9}, fitcore.Options{}); err == nil {
		t.Error("Complete with other readings than the report's gave no error")
	}
}

// The line and its checks first, the advice a moment later: what a screen
// does to show a big record at once. The readings are an invented
// suspended-solids series whose scatter grows with the level.
func ExampleComplete() {
	x := []float64{5, 10, 20, 40, 80, 160, 320, 640}
	y := []float64{5.2, 9.6, 21.3, 37.1, 86.0, 149, 351, 590}
	rep, err := fitcore.Analyze(x, y, fitcore.Options{SkipAdvice: true})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println("advice before Complete:", rep.Advice == nil)
	if err := fitcore.Complete(rep, x, y, fitcore.Options{}); err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println("advice after Complete:", rep.Advice != nil, "λ found:", rep.BoxCox != nil && !math.IsNaN(rep.BoxCox.Lambda))
	// Output:
	// advice before Complete: true
	// advice after Complete: true λ found: true
}
