//go:build !wasm

package fitcore

import "math"

// ckFMA is a·b + c with one rounding: math.FMA, a single instruction on
// the machines the native command runs on (see fma_wasm.go for the
// browser build).
func ckFMA(a, b, c float64) float64 { return math.FMA(a, b, c) }
