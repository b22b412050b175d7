package fitcore

import (
	"bufio"
	"encoding/binary"
	"encoding/json"
	"errors"
	"math"
	"math/rand/v2"
	"os"
	"strconv"
	"strings"
	"testing"

	"pairline/app/reftest"
)

// bcGoldenPath is written by testdata/refgen/boxcox_ref.py (statsmodels OLS +
// scipy.optimize under Debian's /usr/bin/python3; versions are in the file).
const bcGoldenPath = "../testdata/golden/boxcox.json"

// bcAlaskaPath is the NIST/SEMATECH e-Handbook Alaska pipeline data set
// (handbook section 4.6.3), read from the shared reference folder.
var bcAlaskaPath = reftest.Find("nist-handbook", "ALASKA_PIPELINE.DAT")

type bcGoldenCase struct {
	Name       string    `json:"name"`
	DataFile   string    `json:"data_file"`
	N          int       `json:"n"`
	Level      float64   `json:"level"`
	X          []float64 `json:"x"`
	Y          []float64 `json:"y"`
	Lambda     float64   `json:"lambda"`
	CILow      float64   `json:"ci_low"`
	CIHigh     float64   `json:"ci_high"`
	ProfileAt  []float64 `json:"profile_at"`
	ProfileRel []float64 `json:"profile_minus_at_1"`
}

type bcGolden struct {
	Source      string         `json:"source"`
	SciPy       string         `json:"scipy"`
	Statsmodels string         `json:"statsmodels"`
	Cases       []bcGoldenCase `json:"cases"`
}

// bcReadAlaska returns x = lab defect size and y = field defect size from the
// handbook file (columns: field, lab, batch), or skips the test visibly.
func bcReadAlaska(t testing.TB) (x, y []float64) {
	t.Helper()
	f, err := os.Open(reftest.Path(t, "nist-handbook", "ALASKA_PIPELINE.DAT"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		parts := strings.Fields(sc.Text())
		if len(parts) != 3 {
			continue
		}
		var v [3]float64
		ok := true
		for i, p := range parts {
			if v[i], err = strconv.ParseFloat(p, 64); err != nil {
				ok = false
			}
		}
		if ok {
			y = append(y, v[0])
			x = append(x, v[1])
		}
	}
	if err := sc.Err(); err != nil {
		t.Fatalf("reading %s: %v", bcAlaskaPath, err)
	}
	if len(x) != 107 { // the handbook lists 107 defects (4.6.3.1)
		t.Fatalf("read %d pairs from %s, want 107", len(x), bcAlaskaPath)
	}
	return x, y
}

func bcLoadGolden(t *testing.T) bcGolden {
	t.Helper()
	b, err := os.ReadFile(bcGoldenPath)
	if err != nil {
		t.Fatalf("reference file missing (run /usr/bin/python3 testdata/refgen/boxcox_ref.py): %v", err)
	}
	var g bcGolden
	if err := json.Unmarshal(b, &g); err != nil {
		t.Fatalf("%s: %v", bcGoldenPath, err)
	}
	if len(g.Cases) == 0 {
		t.Fatalf("%s has no cases", bcGoldenPath)
	}
	return g
}

// TestBoxCoxProfileReference compares λ̂ and its likelihood-ratio interval
// with the independent statsmodels/scipy computation in boxcox.json (source:
// testdata/refgen/boxcox_ref.py, Box & Cox 1964 eq. 9 in its textbook form).
// Tolerances: λ̂ to 1e-5 (the profile is flat at its top, so both optimizers
// stop near √ε), interval ends to 1e-6 (they are simple roots), profile
// differences ℓ(λ)−ℓ(1) to 1e-7 relative.
func TestBoxCoxProfileReference(t *testing.T) {
	g := bcLoadGolden(t)
	t.Logf("reference: %s (scipy %s, statsmodels %s)", g.Source, g.SciPy, g.Statsmodels)
	for _, c := range g.Cases {
		t.Run(c.Name, func(t *testing.T) {
			x, y := c.X, c.Y
			if c.DataFile != "" {
				x, y = bcReadAlaska(t)
			}
			if len(x) != c.N {
				t.Fatalf("n = %d, reference has %d", len(x), c.N)
			}
			bc, err := BoxCoxProfile(x, y, c.Level)
			if err != nil {
				t.Fatal(err)
			}
			t.Logf("λ = %.7f [%.7f, %.7f]; differences from reference %.1e, %.1e, %.1e", bc.Lambda, bc.CILow, bc.CIHigh,
				bc.Lambda-c.Lambda, bc.CILow-c.CILow, bc.CIHigh-c.CIHigh)
			if d := math.Abs(bc.Lambda - c.Lambda); d > 1e-5 {
				t.Errorf("λ = %.8f, reference %.8f (diff %.2g)", bc.Lambda, c.Lambda, d)
			}
			if d := math.Abs(bc.CILow - c.CILow); d > 1e-6 {
				t.Errorf("interval low = %.8f, reference %.8f (diff %.2g)", bc.CILow, c.CILow, d)
			}
			if d := math.Abs(bc.CIHigh - c.CIHigh); d > 1e-6 {
				t.Errorf("interval high = %.8f, reference %.8f (diff %.2g)", bc.CIHigh, c.CIHigh, d)
			}
			p, err := bcNewProfile(x, y)
			if err != nil {
				t.Fatal(err)
			}
			base := p.loglik(1)
			for i, l := range c.ProfileAt {
				got := p.loglik(l) - base
				want := c.ProfileRel[i]
				if d := math.Abs(got - want); d > 1e-7*math.Max(1, math.Abs(want)) {
					t.Errorf("ℓ(%g) − ℓ(1) = %.10g, reference %.10g", l, got, want)
				}
			}
		})
	}
}

// TestBoxCoxProfileInvariance checks two properties of the Box–Cox estimate
// that follow from the Jacobian term in the likelihood (Box & Cox 1964,
// section 3): λ̂ does not change when y is multiplied by a constant (a change
// of units), nor when x is shifted and rescaled.
func TestBoxCoxProfileInvariance(t *testing.T) {
	g := bcLoadGolden(t)
	for _, c := range g.Cases {
		if c.DataFile != "" {
			continue
		}
		base, err := BoxCoxProfile(c.X, c.Y, c.Level)
		if err != nil {
			t.Fatalf("%s: %v", c.Name, err)
		}
		for _, k := range []float64{1e-6, 25.4, 1e8} {
			ys := make([]float64, len(c.Y))
			xs := make([]float64, len(c.X))
			for i := range ys {
				ys[i] = k * c.Y[i]
				xs[i] = 3 - 0.5*k*c.X[i]
			}
			bc, err := BoxCoxProfile(xs, ys, c.Level)
			if err != nil {
				t.Fatalf("%s ×%g: %v", c.Name, k, err)
			}
			if math.Abs(bc.Lambda-base.Lambda) > 1e-5 || math.Abs(bc.CILow-base.CILow) > 1e-6 || math.Abs(bc.CIHigh-base.CIHigh) > 1e-6 {
				t.Errorf("%s: scaling by %g moved the estimate from %+v to %+v", c.Name, k, *base, *bc)
			}
		}
	}
}

// TestBoxCoxProfileErrors checks that data the method cannot take give an
// error of the right kind, never a number.
func TestBoxCoxProfileErrors(t *testing.T) {
	x5 := []float64{1, 2, 3, 4, 5}
	exact := make([]float64, 10)
	xe := make([]float64, 10)
	for i := range exact {
		xe[i] = float64(i)
		exact[i] = math.Exp(0.3 * float64(i)) // log y exactly linear in x
	}
	tests := []struct {
		name  string
		x, y  []float64
		level float64
		want  error
	}{
		{"negative y", x5, []float64{1, 2, -3, 4, 5}, 0, ErrTransformDomain},
		{"zero y", x5, []float64{1, 2, 0, 4, 5}, 0, ErrTransformDomain},
		{"NaN y", x5, []float64{1, 2, math.NaN(), 4, 5}, 0, ErrNotFinite},
		{"Inf x", []float64{1, 2, math.Inf(1), 4, 5}, x5, 0, ErrNotFinite},
		{"lengths", x5, []float64{1, 2, 3}, 0, ErrLengthMismatch},
		{"two pairs", []float64{1, 2}, []float64{1, 2}, 0, ErrTooFewPoints},
		{"constant x", []float64{2, 2, 2, 2, 2}, []float64{1, 2, 3, 4, 5}, 0, ErrNoSpreadInX},
		{"four pairs (below MinBoxCoxN)", []float64{1, 2, 3, 4}, []float64{1, 2, 4, 5}, 0, ErrTooFewPoints},
		{"three pairs: a zero-width interval before", []float64{1, 2, 3}, []float64{1, 2.1, 2.9}, 0, ErrTooFewPoints},
		{"level 1e-300 (panicked in the χ² quantile)", x5, []float64{1, 2, 4, 4, 5}, 1e-300, ErrBadOption},
		{"level 5e-324", x5, []float64{1, 2, 4, 4, 5}, 5e-324, ErrBadOption},
		{"level NaN", x5, []float64{1, 2, 4, 4, 5}, math.NaN(), ErrBadOption},
		{"constant y", x5, []float64{3, 3, 3, 3, 3}, 0, ErrNoSpreadInY},
		{"level 1", x5, []float64{1, 2, 4, 4, 5}, 1, ErrBadOption},
		{"level negative", x5, []float64{1, 2, 4, 4, 5}, -0.5, ErrBadOption},
		{"exact line on log scale", xe, exact, 0, ErrDegenerate},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			bc, err := BoxCoxProfile(tt.x, tt.y, tt.level)
			if !errors.Is(err, tt.want) {
				t.Fatalf("got %+v, %v; want error %v", bc, err, tt.want)
			}
			if bc != nil {
				t.Errorf("a result came back with the error: %+v", *bc)
			}
			if msg := err.Error(); len(msg) < 20 {
				t.Errorf("error %q is too short to help anyone", msg)
			}
		})
	}
}

// TestBoxCoxProfileExtremeRange checks that y spanning hundreds of decades
// (where y^3 would overflow) still gives finite answers inside the bounds.
func TestBoxCoxProfileExtremeRange(t *testing.T) {
	r := rand.New(rand.NewPCG(11, 12))
	n := 40
	x := make([]float64, n)
	y := make([]float64, n)
	for i := range x {
		x[i] = float64(i)
		y[i] = math.Exp(-300 + 15*float64(i) + r.NormFloat64()) // 1e-130 … 1e123
	}
	bc, err := BoxCoxProfile(x, y, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	// log y is linear in x by construction, so λ̂ must be near 0 (Box & Cox
	// 1964: the estimate recovers the generating scale).
	if !(bc.CILow <= 0 && 0 <= bc.CIHigh) || math.Abs(bc.Lambda) > 0.05 {
		t.Errorf("log-linear data over 250 decades gave %+v, want λ̂ ≈ 0 with 0 inside the interval", *bc)
	}
}

func bcBytesToFloats(b []byte) []float64 {
	var out []float64
	for len(b) >= 8 {
		out = append(out, math.Float64frombits(binary.LittleEndian.Uint64(b)))
		b = b[8:]
	}
	return out
}

// FuzzBoxCoxProfile checks that any input gives either an error or a finite
// λ̂ inside [−3, 3] with CILow ≤ λ̂ ≤ CIHigh, and never panics.
func FuzzBoxCoxProfile(f *testing.F) {
	enc := func(v ...float64) []byte {
		b := make([]byte, 0, 8*len(v))
		for _, a := range v {
			b = binary.LittleEndian.AppendUint64(b, math.Float64bits(a))
		}
		return b
	}
	f.Add(enc(1, 2, 3, 4, 5, 6), enc(1.1, 2.3, 2.9, 4.4, 5.2, 6.8), 0.95)
	f.Add(enc(0, 1, 2), enc(1e-300, 1, 1e300), 0.5)
	f.Add(enc(1, 1, 2), enc(1, 2, 3), 0.99)
	f.Add(enc(1, 2, 3), enc(-1, 2, 3), 0.0)
	f.Fuzz(func(t *testing.T, xb, yb []byte, level float64) {
		x, y := bcBytesToFloats(xb), bcBytesToFloats(yb)
		if len(x) > len(y) {
			x = x[:len(y)]
		}
		bc, err := BoxCoxProfile(x, y, level)
		if err != nil {
			if bc != nil {
				t.Fatalf("result and error together: %+v, %v", *bc, err)
			}
			return
		}
		if !isFiniteNum(bc.Lambda) || !isFiniteNum(bc.CILow) || !isFiniteNum(bc.CIHigh) {
			t.Fatalf("non-finite result %+v", *bc)
		}
		if bc.Lambda < bcLambdaMin || bc.Lambda > bcLambdaMax || bc.CILow > bc.Lambda || bc.CIHigh < bc.Lambda {
			t.Fatalf("inconsistent result %+v", *bc)
		}
	})
}

func bcBenchData(n int) (x, y []float64) {
	r := rand.New(rand.NewPCG(1, 2))
	x = make([]float64, n)
	y = make([]float64, n)
	for i := range x {
		x[i] = 1 + 99*float64(i)/float64(n-1)
		y[i] = 2 * x[i] * (1 + 0.02*r.NormFloat64())
	}
	return x, y
}

func benchmarkBoxCoxProfile(b *testing.B, n int) {
	x, y := bcBenchData(n)
	b.ReportAllocs()
	for b.Loop() {
		if _, err := BoxCoxProfile(x, y, 0.95); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkBoxCoxProfile1e3(b *testing.B) { benchmarkBoxCoxProfile(b, 1000) }
func BenchmarkBoxCoxProfile1e5(b *testing.B) { benchmarkBoxCoxProfile(b, 100000) }
