package fitcore

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// dwLineColumnsByStep is dwLineColumns as it was before its steps shared
// sweeps over the readings: each step a pass of its own.
func dwLineColumnsByStep(x []float64, sw func(int) float64) (u1, u2 []float64, ok bool) {
	m, s := ckMeanSD(x)
	if s == 0 || !ckFinite(s) {
		return nil, nil, false
	}
	n := len(x)
	u1 = make([]float64, n)
	u2 = make([]float64, n)
	for t, v := range x {
		st := sw(t)
		u1[t] = st
		u2[t] = st * ((v - m) / s)
	}
	if dwNormalize(u1) == 0 {
		return nil, nil, false
	}
	var before float64
	for _, a := range u2 {
		before += a * a
	}
	for range 2 {
		var dot float64
		for t := range u2 {
			dot += u1[t] * u2[t]
		}
		for t := range u2 {
			u2[t] -= dot * u1[t]
		}
	}
	var after float64
	for _, a := range u2 {
		after += a * a
	}
	if !(math.Sqrt(after) > 1e-10*math.Sqrt(before)) || dwNormalize(u2) == 0 {
		return nil, nil, false
	}
	return u1, u2, true
}

// TestDWLineColumnsSweeps: the Durbin–Watson design's columns, made in
// fewer sweeps, are bit for bit those of the steps one after another
// (dwLineColumnsByStep), with and without weights, on invented x of 3 to
// 5 000 readings: spread, nearly constant (1e-12 of the level), constant,
// two values, and weights over twelve decades; also through a reused
// space.
func TestDWLineColumnsSweeps(t *testing.T) {
	r := rand.New(rand.NewPCG(5, 21))
	var b1, b2 []float64
	for trial := range 300 {
		n := 3 + r.IntN(5000)
		x, w := make([]float64, n), make([]float64, n)
		for i := range x {
			switch trial % 5 {
			case 0, 1:
				x[i] = r.NormFloat64() * 10
			case 2:
				x[i] = 7 + 1e-12*r.Float64()
			case 3:
				x[i] = 3
			case 4:
				x[i] = float64(i % 2)
			}
			w[i] = math.Pow(10, 12*r.Float64()-6)
		}
		for _, ww := range [][]float64{nil, w} {
			sw := dwRootWeights(ww)
			wu1, wu2, wok := dwLineColumnsByStep(x, sw)
			b1, b2 = ckGrowF64(b1, n), ckGrowF64(b2, n)
			for _, in := range [][2][]float64{{nil, nil}, {b1, b2}} {
				gu1, gu2, gok := dwLineColumns(x, sw, in[0], in[1])
				if gok != wok || (wok && (!slices.Equal(gu1, wu1) || !slices.Equal(gu2, wu2))) {
					t.Fatalf("trial %d (n = %d, weighted %v): the columns differ from the steps one after another", trial, n, ww != nil)
				}
			}
		}
	}
}
