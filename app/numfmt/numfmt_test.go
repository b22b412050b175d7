package numfmt

import (
	"fmt"
	"math"
	"strconv"
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
		{1.5e-7, 3, "1.50e-07"},
		{4.2e12, 2, "4.2e+12"},
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
