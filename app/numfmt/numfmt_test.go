package numfmt

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"testing"
)

func TestSig(t *testing.T) {
	cases := []struct {
		v    float64
		sig  int
		want string
	}{
		{1.00211681802045, 6, "1.00212"},
		{-0.262323073774029, 4, "−0.2623"},
		{9.9996, 4, "10.00"},
		{1234567.89, 4, "1235000"},
		{0.000123456, 3, "0.000123"},
		{1.5e-7, 3, "1.50 × 10⁻⁷"},
		{4.2e12, 2, "4.2 × 10¹²"},
		{-7.9e-24, 2, "−7.9 × 10⁻²⁴"},
		{1e100, 1, "1 × 10¹⁰⁰"},
		{0, 3, "0.00"},
		{math.NaN(), 3, "—"},
		{math.Inf(-1), 3, "—"},
	}
	for _, c := range cases {
		if got := Sig(c.v, c.sig); got != c.want {
			t.Errorf("Sig(%v, %d) = %q, want %q", c.v, c.sig, got, c.want)
		}
	}
}

func TestDecimalsAndFull(t *testing.T) {
	if got := Decimals(0.999993745883712, 6); got != "0.999994" {
		t.Errorf("Decimals = %q", got)
	}
	if got := Decimals(-0.0000001, 3); got != "0.000" {
		t.Errorf("negative zero shown as %q", got)
	}
	for _, v := range []float64{0.1, 1.0 / 3, -2.5e-300, 1.7e9 + 0.25} {
		back, err := strconv.ParseFloat(Full(v), 64)
		if err != nil || back != v {
			t.Errorf("Full(%v) = %q does not round-trip", v, Full(v))
		}
	}
}

func TestDigitsOf(t *testing.T) {
	cases := map[string]int{"12.50": 4, "0.003": 1, "1200": 4, "-7,25": 3, "": 0, "0": 1, "1.5e3": 2, "abc": 0}
	for in, want := range cases {
		if got := DigitsOf(in); got != want {
			t.Errorf("DigitsOf(%q) = %d, want %d", in, got, want)
		}
	}
	if Precision(2) != 4 || Precision(5) != 7 || Precision(20) != 10 {
		t.Error("Precision bounds")
	}
}

func FuzzSig(f *testing.F) {
	f.Add(1.5, 3)
	f.Fuzz(func(t *testing.T, v float64, sig int) {
		s := Sig(v, sig)
		if s == "" {
			t.Fatal("empty")
		}
	})
}

func ExampleSig() {
	fmt.Println(Sig(1.00211681802045, 6), Sig(-0.262323073774029, 4))
	// Output: 1.00212 −0.2623
}

// The one p format (common practice for reports: p to two significant
// digits, a floor below which the digits change no decision, no "1.0").
func TestP(t *testing.T) {
	for _, c := range []struct {
		p    float64
		want string
	}{
		{7.9e-24, "< 0.001"}, {0.00099, "< 0.001"}, {0.001, "0.0010"}, {0.0043, "0.0043"},
		{0.0099, "0.0099"}, {0.01, "0.010"}, {0.0496, "0.050"}, {0.0432, "0.043"}, {0.43, "0.43"},
		{0.99, "0.99"}, {0.996, "> 0.99"}, {1, "> 0.99"}, {math.NaN(), "—"}, {-0.1, "—"},
	} {
		if got := P(c.p); got != c.want {
			t.Errorf("P(%v) = %q, want %q", c.p, got, c.want)
		}
	}
	for _, c := range []struct {
		p    float64
		want string
	}{{1e-9, "p < 0.001"}, {0.043, "p = 0.043"}, {0.998, "p > 0.99"}} {
		if got := PEq(c.p); got != c.want {
			t.Errorf("PEq(%v) = %q, want %q", c.p, got, c.want)
		}
	}
}

// Estimates rounded to their uncertainty (GUM, JCGM 100:2008 §7.2.6: the
// uncertainty to two significant digits, the estimate to the same place).
func TestEstimate(t *testing.T) {
	for _, c := range []struct {
		v, u   float64
		vs, us string
	}{
		{1.234567, 0.012345, "1.235", "0.012"},
		{-0.262323, 0.0996, "−0.26", "0.10"},
		{12345.6, 123, "12350", "120"},
		{9.96, 0.05, "9.960", "0.050"},
		{0.00042, 0.03, "0.000", "0.030"},
		{3.14159, 0, "3.142", "0"},
		{3.14159, math.NaN(), "3.142", "—"},
		{2.5e-9, 1.2e-11, "2.500 × 10⁻⁹", "1.2 × 10⁻¹¹"},
		{0, 0.25, "0.00", "0.25"},
	} {
		vs, us := Estimate(c.v, c.u, 4)
		if vs != c.vs || us != c.us {
			t.Errorf("Estimate(%v, %v) = %q, %q; want %q, %q", c.v, c.u, vs, us, c.vs, c.us)
		}
	}
}

func TestShort(t *testing.T) {
	for _, c := range []struct {
		v    float64
		want string
	}{{13.6, "13.6"}, {13.60001, "13.6"}, {2, "2"}, {-0.5, "−0.5"}, {1.2e10, "1.2 × 10¹⁰"}} {
		if got := Short(c.v, 4); got != c.want {
			t.Errorf("Short(%v, 4) = %q, want %q", c.v, got, c.want)
		}
	}
}

func ExampleP() {
	fmt.Println(P(7.9e-24), P(0.0043), P(0.43), P(0.996))
	// Output: < 0.001 0.0043 0.43 > 0.99
}

func ExampleEstimate() {
	v, u := Estimate(1.234567, 0.012345, 6)
	fmt.Println(v, "±", u)
	// Output: 1.235 ± 0.012
}

func ExampleSig_large() {
	fmt.Println(Sig(4.2e12, 2), Sig(-1.5e-7, 3))
	// Output: 4.2 × 10¹² −1.50 × 10⁻⁷
}

// digitsOfByCopy is DigitsOf as first written (the digits copied out, the
// leading zeros trimmed): the reference FuzzDigitsOf holds DigitsOf to.
func digitsOfByCopy(text string) int {
	t := strings.TrimSpace(text)
	if i := strings.IndexAny(t, "eE"); i >= 0 {
		t = t[:i]
	}
	digits := make([]byte, 0, len(t))
	for i := 0; i < len(t); i++ {
		if t[i] >= '0' && t[i] <= '9' {
			digits = append(digits, t[i])
		}
	}
	s := strings.TrimLeft(string(digits), "0")
	if s == "" {
		if len(digits) > 0 {
			return 1
		}
		return 0
	}
	return len(s)
}

// FuzzDigitsOf: counting the digits in place gives what copying them out
// and trimming the leading zeros gives, for any text.
func FuzzDigitsOf(f *testing.F) {
	for _, s := range []string{"12.50", "0.003", "1200", "", "abc", "0", "000.000", " -0,0450e-3 ", "1e5", "E", "٣.5", "0x1F"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		if got, want := DigitsOf(s), digitsOfByCopy(s); got != want {
			t.Errorf("DigitsOf(%q) = %d, by copy %d", s, got, want)
		}
	})
}

// BenchmarkDigitsOf is one reading's two cells.
func BenchmarkDigitsOf(b *testing.B) {
	for b.Loop() {
		_ = DigitsOf("12.345") + DigitsOf("0.00412")
	}
}

// BenchmarkDigitsOfByCopy is the same as first written, for comparison.
func BenchmarkDigitsOfByCopy(b *testing.B) {
	for b.Loop() {
		_ = digitsOfByCopy("12.345") + digitsOfByCopy("0.00412")
	}
}

// TestCount: groups of three from five digits on, the separator the narrow
// no-break space of ISO 80000-1 §7.3.1 (common practice for four digits:
// left together).
func TestCount(t *testing.T) {
	const s = "\u202f"
	for _, c := range []struct {
		n    int
		want string
	}{
		{0, "0"}, {7, "7"}, {999, "999"}, {1000, "1000"}, {9999, "9999"},
		{10000, "10" + s + "000"}, {100000, "100" + s + "000"}, {250000, "250" + s + "000"},
		{1234567, "1" + s + "234" + s + "567"}, {10000000, "10" + s + "000" + s + "000"},
		{-12345, "−12" + s + "345"},
	} {
		if got := Count(c.n); got != c.want {
			t.Errorf("Count(%d) = %q, want %q", c.n, got, c.want)
		}
	}
}

func ExampleCount() {
	fmt.Println(strings.ReplaceAll(Count(10000), "\u202f", "_"), Count(2500))
	// Output: 10_000 2500
}
