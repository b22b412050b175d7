//go:build wasm

package fitcore

// ckFMA is a·b + c with one rounding: fmaEmulated on WebAssembly, which
// has no fused multiply-add instruction (the same value as math.FMA, bit
// for bit, several times faster than its software routine there).
func ckFMA(a, b, c float64) float64 { return fmaEmulated(a, b, c) }
