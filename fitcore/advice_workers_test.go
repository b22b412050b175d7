package fitcore

import (
	"bytes"
	"encoding/json"
	"math"
	"math/rand/v2"
	"testing"
)

// TestAdviceWorkersSameReport: the advice refits its remedies two at a
// time on large records (adTryAll) and works out the Box–Cox profile
// beside them; the whole report, marshalled to JSON, must be byte for byte
// the report of refitting one remedy after another. Invented records of
// 20 000 to 40 000 readings: growing scatter (every remedy refitted), a
// bend, repeats at every x (weights from repeats usable), readings at or
// below zero (the scales that need y > 0 ruled out), x in random order, a
// power law, and a record the advice leaves alone. Run it with -race.
func TestAdviceWorkersSameReport(t *testing.T) {
	if testing.Short() {
		t.Skip("refits 40 000 readings many times")
	}
	r := rand.New(rand.NewPCG(20261202, 13))
	type rec struct {
		name string
		make func(n int) (x, y []float64)
	}
	recs := []rec{
		{"bench record", func(n int) ([]float64, []float64) { x, y, _ := benchData(n); return x, y }},
		{"growing scatter, random order", func(n int) ([]float64, []float64) {
			x, y := make([]float64, n), make([]float64, n)
			for i := range x {
				x[i] = 1 + 499*r.Float64()
				y[i] = 0.98*x[i] + 0.3 + (r.Float64()-0.5)*0.035*x[i]
			}
			return x, y
		}},
		{"repeats at every x", func(n int) ([]float64, []float64) {
			x, y := make([]float64, n), make([]float64, n)
			for i := range x {
				x[i] = float64(1 + i%40)
				y[i] = 3 + 2*x[i] + r.NormFloat64()*0.05*x[i]
			}
			return x, y
		}},
		{"y at or below zero", func(n int) ([]float64, []float64) {
			x, y := make([]float64, n), make([]float64, n)
			for i := range x {
				x[i] = float64(i) / float64(n)
				y[i] = -0.2 + x[i] + 0.3*x[i]*x[i] + r.NormFloat64()*0.02*(1+3*x[i])
			}
			return x, y
		}},
		{"power law", func(n int) ([]float64, []float64) {
			x, y := make([]float64, n), make([]float64, n)
			for i := range x {
				x[i] = 0.5 + 10*r.Float64()
				y[i] = 2 * math.Pow(x[i], 1.7) * math.Exp(0.05*r.NormFloat64())
			}
			return x, y
		}},
		{"nothing to do", func(n int) ([]float64, []float64) {
			x, y := make([]float64, n), make([]float64, n)
			for i := range x {
				x[i] = float64(i)
				y[i] = 5 + 0.1*x[i] + r.NormFloat64()
			}
			return x, y
		}},
	}
	defer func(w int) { anAdviceWorkers = w }(anAdviceWorkers)
	for k, c := range recs {
		n := anParallelMin + k*4000
		x, y := c.make(n)
		report := func(workers int) []byte {
			anAdviceWorkers = workers
			rep, err := Analyze(x, y, Options{})
			if err != nil {
				t.Fatalf("%s: %v", c.name, err)
			}
			b, err := json.Marshal(rep)
			if err != nil {
				t.Fatal(err)
			}
			return b
		}
		one, two := report(1), report(2)
		if !bytes.Equal(one, two) {
			t.Errorf("%s (n = %d): the report with two workers differs from one after another", c.name, n)
		}
		var rep Report
		if err := json.Unmarshal(one, &rep); err != nil {
			t.Fatal(err)
		}
		t.Logf("%s: n = %d, remedy %s, %d candidates", c.name, n, rep.Advice.Remedy, len(rep.Advice.Candidates))
	}
}
