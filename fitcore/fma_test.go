package fitcore

import (
	"math"
	"math/bits"
	"math/rand/v2"
	"testing"
)

// fmaSame: equal bits, or both NaN.
func fmaSame(a, b float64) bool {
	return math.Float64bits(a) == math.Float64bits(b) || (a != a && b != b)
}

// TestFMAEmulatedIsFMA: fmaEmulated gives math.FMA's value bit for bit on
// hand-picked cases (ties, cancellation, signed zeros, the edges of the
// range where it falls back) and on two million seeded triples built to be
// hard: products of random 53-bit significands plus a c that cancels all
// but a few units in the last place, or sits a random number of binades
// below or above the product, or makes c + RN(a·b) a tie that only the
// product's rounding error decides (fmaTieWith). math.FMA here is the machine's fused
// multiply-add (or Go's exact software routine), the reference.
func TestFMAEmulatedIsFMA(t *testing.T) {
	ulp := func(v float64) float64 { return math.Nextafter(math.Abs(v), math.Inf(1)) - math.Abs(v) }
	cases := [][3]float64{
		{1 + 0x1p-52, 1 + 0x1p-52, -1},    // the product's low bits decide
		{1 + 0x1p-27, 1 - 0x1p-27, -1},    // exact cancellation to −2^-54
		{1 + 0x1p-52, 1 - 0x1p-52, 0},     // c = 0: the rounded product
		{3, 1.0 / 3, -1},                  // a tiny residue
		{0x1p-500, 0x1p-500, 1},           // beyond the range: math.FMA
		{0x1p901, 1, -1}, {1, 1, 0x1p901}, // beyond the range
		{0, 5, math.Copysign(0, -1)}, {math.Copysign(0, -1), 5, 0}, {2, 3, math.NaN()},
		{math.Inf(1), 0, 1}, {1e300, 1e10, -1e308},
		{0.1, 10, -1}, {-0.1, 10, 1}, {1 + 0x1p-30, 1 + 0x1p-24, -(1 + 0x1p-24 + 0x1p-30)},
		{0.5 + 0x1p-53, 2, -1}, // a tie in the sum
	}
	for _, c := range cases {
		if got, want := fmaEmulated(c[0], c[1], c[2]), math.FMA(c[0], c[1], c[2]); !fmaSame(got, want) {
			t.Errorf("fmaEmulated(%v, %v, %v) = %v, math.FMA %v", c[0], c[1], c[2], got, want)
		}
	}
	r := rand.New(rand.NewPCG(20261203, 1))
	sig := func() float64 { return 1 + float64(r.Uint64()>>11)*0x1p-53 } // [1, 2), 53 random bits
	for i := range 2_000_000 {
		a := math.Ldexp(sig(), r.IntN(200)-100)
		b := math.Ldexp(sig(), r.IntN(200)-100)
		if r.IntN(2) == 0 {
			a = -a
		}
		p := a * b
		var c float64
		if i%6 == 5 {
			// Significands 1 + j·2^-52 with small j: a product whose error
			// is tiny beside its lowest set bit, so that with a tie in
			// c + RN(a·b) only rounding to odd gets the last bit right
			// (without it about 1 in 10⁴ of these comes out wrong).
			a = math.Copysign(math.Ldexp(1+float64(r.IntN(64)+1)*0x1p-52, r.IntN(40)-20), a)
			b = math.Ldexp(1+float64(r.IntN(64)+1)*0x1p-52, r.IntN(40)-20)
			p = a * b
		}
		switch i % 6 {
		case 0: // cancels all but a few ulps
			c = -p + float64(r.IntN(9)-4)*ulp(p)
		case 1: // far below or above the product
			c = math.Ldexp(sig(), r.IntN(240)-120) * math.Copysign(math.Abs(p), float64(r.IntN(2)*2-1))
		case 2: // about the product's size, either sign
			c = p * (r.Float64()*4 - 2)
		case 3: // a few ulps of the product itself
			c = float64(r.IntN(64)-32) * ulp(p) / 2
		default: // c + RN(a·b) a tie, which only the product's error breaks (4, 5)
			c = fmaTieWith(p, r.Uint64())
		}
		if got, want := fmaEmulated(a, b, c), math.FMA(a, b, c); !fmaSame(got, want) {
			t.Fatalf("triple %d: fmaEmulated(%v, %v, %v) = %v, math.FMA %v", i, a, b, c, got, want)
		}
	}
}

// fmaTieWith returns a c of p's sign, larger than p, whose last place is
// twice p's lowest set bit: c + p then lies halfway between two doubles
// (unless the sum carries into the next binade), the case where rounding
// c + p first and adding the product's error afterwards rounds twice
// (Boldo and Melquiond's reason for rounding to odd).
func fmaTieWith(p float64, u uint64) float64 {
	b := math.Float64bits(p)
	exp := int(b>>52&0x7ff) - 1075 // exponent of the significand's unit bit
	mant := b&(1<<52-1) | 1<<52
	low := exp + bits.TrailingZeros64(mant)
	m := float64(u>>11 | 1<<52) // a 53-bit integer
	return math.Copysign(math.Ldexp(m, low+1), p)
}

// FuzzFMAEmulated: fmaEmulated(a, b, c) is math.FMA(a, b, c) for any three
// float64s.
func FuzzFMAEmulated(f *testing.F) {
	f.Add(1.0+0x1p-52, 1.0+0x1p-52, -1.0)
	f.Add(0.1, 10.0, -1.0)
	f.Add(3.0, 1.0/3, -1.0)
	f.Fuzz(func(t *testing.T, a, b, c float64) {
		if got, want := fmaEmulated(a, b, c), math.FMA(a, b, c); !fmaSame(got, want) {
			t.Fatalf("fmaEmulated(%v, %v, %v) = %v, math.FMA %v", a, b, c, got, want)
		}
	})
}

// BenchmarkFMA compares fmaEmulated with math.FMA (a machine instruction
// here; on WebAssembly a software routine: run this benchmark there with
// GOOS=js GOARCH=wasm and a wasm runner to see the difference that made
// ckFMA use fmaEmulated in the browser).
func BenchmarkFMA(b *testing.B) {
	xs := make([]float64, 1024)
	r := rand.New(rand.NewPCG(1, 2))
	for i := range xs {
		xs[i] = r.Float64()*2 - 1
	}
	b.Run("emulated", func(b *testing.B) {
		s := 0.0
		for b.Loop() {
			for i := 0; i+2 < len(xs); i++ {
				s += fmaEmulated(xs[i], xs[i+1], xs[i+2])
			}
		}
		sinkF = s
	})
	b.Run("math", func(b *testing.B) {
		s := 0.0
		for b.Loop() {
			for i := 0; i+2 < len(xs); i++ {
				s += math.FMA(xs[i], xs[i+1], xs[i+2])
			}
		}
		sinkF = s
	})
}
