package session

import (
	"errors"
	"fmt"
	"math"
	"regexp"
	"strconv"
	"strings"
	"testing"
)

func TestParseNumber(t *testing.T) {
	// Expected values are the plain decimal reading of each text, checked
	// by strconv.ParseFloat on the normalised form (the reference for
	// decimal text); the separator rules are common practice for
	// spreadsheet and instrument exports.
	tests := []struct {
		in   string
		want float64
		err  string // substring of the reason; "" = no error
	}{
		{"3.14", 3.14, ""},
		{"3,14", 3.14, ""},
		{"  -2.5  ", -2.5, ""},
		{"+7", 7, ""},
		{"−0,125", -0.125, ""}, // U+2212 minus
		{"0,123", 0.123, ""},   // a leading 0 cannot start a thousands group
		{"1234,567", 1234.567, ""},
		{"1 234,5", 1234.5, ""},
		{"1\u00a0234,5", 1234.5, ""},
		{"1,234.5", 1234.5, ""},
		{"1.234,5", 1234.5, ""},
		{"1.234.567", 1234567, ""},
		{"1,234,567.25", 1234567.25, ""},
		{"1'234.5", 1234.5, ""},
		{"1.234", 1.234, ""}, // a single dot is a decimal point without a hint
		{".5", 0.5, ""},
		{"-,5", -0.5, ""},
		{"1e3", 1000, ""},
		{"1,5E-3", 0.0015, ""},
		{"2.01e+3", 2010, ""},
		{"12.5 µS/cm", 12.5, ""},
		{"7.1 mg/L", 7.1, ""},
		{"7.1mg/L", 7.1, ""},
		{"20 °C", 20, ""},
		{"45%", 45, ""},
		{"3 em", 3, ""},
		{"1e-400", 0, ""}, // underflow reads as 0, as strconv does
		{"1,234", 0, "could mean 1.234 or 1234"},
		{"", 0, "is empty"},
		{"   ", 0, "is empty"},
		{"abc", 0, "is not a number"},
		{"NaN", 0, "not a finite number"},
		{"-Inf", 0, "not a finite number"},
		{"infinity", 0, "not a finite number"},
		{"1e400", 0, "too large"},
		{"0x1F", 0, "hexadecimal"},
		{"12.5 13.2", 0, "mixes separators"},
		{"12 13", 0, "more than one number"},
		{"12.5 mg 13", 0, "more than one number"},
		{"12;5", 0, "not a unit"},
		{"1,2,3", 0, "groups of three"},
		{"12,34.5", 0, "groups of three"},
		{"1.234,5,6", 0, "mixes separators"},
		{"12.", 0, "separator with no digits"},
		{"3e", 0, "exponent with no digits"},
		{"3e+", 0, "exponent with no digits"},
		{"<0.5", 0, "is a limit"},
		{"-", 0, "sign without a number"},
		{"--5", 0, "not a number"},
		{strings.Repeat("1", MaxNumberText+1), 0, "too long"},
		{"\xff1", 0, "not valid text"},
	}
	for _, tc := range tests {
		got, err := ParseNumber(tc.in)
		if tc.err != "" {
			var ne *NumberError
			if !errors.As(err, &ne) {
				t.Errorf("ParseNumber(%q) = %v, %v; want a *NumberError containing %q", tc.in, got, err, tc.err)
				continue
			}
			if !strings.Contains(ne.Reason, tc.err) || ne.Text != tc.in {
				t.Errorf("ParseNumber(%q) error %q; want text %q and reason containing %q", tc.in, err, tc.in, tc.err)
			}
			continue
		}
		if err != nil || got != tc.want {
			t.Errorf("ParseNumber(%q) = %v, %v; want %v", tc.in, got, err, tc.want)
		}
	}
}

func TestParseNumberHint(t *testing.T) {
	tests := []struct {
		in    string
		comma bool
		want  float64
	}{
		{"1,234", true, 1.234},
		{"1,234", false, 1234},
		{"1.234", true, 1234},
		{"1.234", false, 1.234},
		{"-12,500", true, -12.5},
		{"-12,500", false, -12500},
		{"3,14", false, 3.14}, // unambiguous text ignores the hint
		{"3.14", true, 3.14},
		{"1.234,5", false, 1234.5},
		{"1,234.5", true, 1234.5},
	}
	for _, tc := range tests {
		got, err := ParseNumberHint(tc.in, tc.comma)
		if err != nil || got != tc.want {
			t.Errorf("ParseNumberHint(%q, %v) = %v, %v; want %v", tc.in, tc.comma, got, err, tc.want)
		}
	}
}

// plainDecimal is the text strconv.ParseFloat and ParseNumber must agree on.
var plainDecimal = regexp.MustCompile(`^[+-]?(\d+(\.\d+)?|\.\d+)([eE][+-]?\d+)?$`)

func FuzzParseNumber(f *testing.F) {
	for _, s := range []string{"3.14", "3,14", "1 234,5", "1,234.5", "1.234,5", "1,234", "12.5 µS/cm",
		"-1e-3", "NaN", "0x10", "<5", "1e400", ".5", "1'234'567.8", "−2", "7.1mg/L"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		v, err := ParseNumber(s)
		if err != nil {
			var ne *NumberError
			if !errors.As(err, &ne) || ne.Text != s || ne.Reason == "" {
				t.Fatalf("ParseNumber(%q): error %v is not a complete *NumberError", s, err)
			}
		} else if math.IsNaN(v) || math.IsInf(v, 0) {
			t.Fatalf("ParseNumber(%q) = %v, not finite", s, v)
		}
		// Without ambiguity the hint changes nothing for a dot reader.
		if err == nil {
			if w, err2 := ParseNumberHint(s, false); err2 != nil || w != v {
				t.Fatalf("ParseNumber(%q) = %v but ParseNumberHint(false) = %v, %v", s, v, w, err2)
			}
		}
		// Plain decimal text reads exactly as strconv reads it.
		if len(s) <= MaxNumberText && plainDecimal.MatchString(s) {
			w, serr := strconv.ParseFloat(s, 64)
			if serr == nil && (err != nil || v != w) {
				t.Fatalf("ParseNumber(%q) = %v, %v; strconv gives %v", s, v, err, w)
			}
		}
		// A value printed back in Go's shortest form reads back the same.
		if err == nil {
			back := strconv.FormatFloat(v, 'g', -1, 64)
			if w, err := ParseNumberHint(back, false); err != nil || w != v {
				t.Fatalf("%q → %v → %q → %v, %v", s, v, back, w, err)
			}
		}
	})
}

func ExampleParseNumber() {
	for _, s := range []string{"1 234,5", "12.5 µS/cm", "1,234", "n/a"} {
		v, err := ParseNumber(s)
		fmt.Println(v, err)
	}
	// Output:
	// 1234.5 <nil>
	// 12.5 <nil>
	// 0 "1,234" could mean 1.234 or 1234: type it with a decimal point (1.234) or without the separator (1234)
	// 0 "n/a" is not a number
}

func ExampleParseNumberHint() {
	a, _ := ParseNumberHint("1,234", true)
	b, _ := ParseNumberHint("1,234", false)
	fmt.Println(a, b)
	// Output: 1.234 1234
}

func BenchmarkParseNumber(b *testing.B) {
	for i := 0; i < b.N; i++ {
		_, _ = ParseNumber("1 234,567 µS/cm")
	}
}

// BenchmarkParseNumberPlain is the cell most readings are: digits and a dot.
func BenchmarkParseNumberPlain(b *testing.B) {
	for i := 0; i < b.N; i++ {
		_, _ = ParseNumber("1234.5")
	}
}

// The fast path for plain cells gives exactly what the full parser gives,
// under every hint.
func FuzzPlainNumber(f *testing.F) {
	for _, s := range []string{"12.5", "-0.0031", "1200", "+7", "1.234", "0", "-0", "00012.50", "1.2345", "99999999999999999999"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		v, ok := plainNumber(s)
		if !ok {
			return
		}
		if w, err := strconv.ParseFloat(s, 64); err != nil || math.Float64bits(v) != math.Float64bits(w) {
			t.Fatalf("%q: the fast path reads %v, strconv.ParseFloat %v (%v)", s, v, w, err)
		}
		for _, h := range []numberHint{hintNone, hintDot, hintComma} {
			w, _, err := parseNumber(s, h)
			if err != nil {
				t.Fatalf("%q: the fast path reads %v, the full parser refuses it (hint %d): %v", s, v, h, err)
			}
			if math.Float64bits(v) != math.Float64bits(w) {
				t.Fatalf("%q: the fast path reads %v, the full parser %v (hint %d)", s, v, w, h)
			}
		}
	})
}

// TestPlainNumberFastPath: the exact fast path gives strconv.ParseFloat's
// bits at its edges (2^53, 22 digits after the dot, 19 digits) and just
// beyond them, where strconv itself is used.
func TestPlainNumberFastPath(t *testing.T) {
	for _, s := range []string{
		"9007199254740992", "9007199254740993", "9007199254740991.5", "900719925474099.3",
		"0.1", "0.3", "1.7976931348623157", "123456789.0123456", "0.0000000000000000000001",
		"0.00000000000000000000001", "1.0000000000000000000001", "4.9406564584124654",
		"9999999999999999999", "99999999999999999999", "0.12", "-0.12", "+12.25", "00000000000000000012.5",
		"489.1234567", "-73.0000001", "5e3", "1.5.2", "-0", "-0.0", "0.0",
	} {
		v, ok := plainNumber(s)
		w, err := strconv.ParseFloat(s, 64)
		// (plainNumber leaves cells of more than 24 bytes to the full parser.)
		wantOK := err == nil && len(s) <= 24 && !(w == 0 && s[0] == '-') && !strings.ContainsAny(s, "e") && strings.Count(s, ".") <= 1
		if ok != wantOK {
			t.Errorf("%q: ok = %v, want %v", s, ok, wantOK)
			continue
		}
		if ok && math.Float64bits(v) != math.Float64bits(w) {
			t.Errorf("%q: %v (%#x), strconv.ParseFloat %v (%#x)", s, v, math.Float64bits(v), w, math.Float64bits(w))
		}
	}
}

func TestSplitRepeats(t *testing.T) {
	for _, tc := range []struct {
		in   string
		want []string
	}{
		{"12.5", []string{"12.5"}},
		{"12.5;12.7", []string{"12.5", "12.7"}},
		{"12,5 12,7", []string{"12,5", "12,7"}},
		{" 1 ;; 2\t3\n4 ", []string{"1", "2", "3", "4"}},
		{" ; ", nil},
		{"", nil},
	} {
		if got := SplitRepeats(tc.in); strings.Join(got, "|") != strings.Join(tc.want, "|") || len(got) != len(tc.want) {
			t.Errorf("SplitRepeats(%q) = %q, want %q", tc.in, got, tc.want)
		}
	}
}

// decimalCellSeeds are the seeds of FuzzDecimalCell: each form of the
// fast path, the ambiguous form both ways, and the edges where it gives
// the cell to the full parser (2^53, 10^±22, 19 digits, a negative zero).
var decimalCellSeeds = []string{
	"12.5", "12,5", "-0.0031", "1200", "+7", "1.234", "1,234", "12.345e3", "-1,234E-2", "0,125", "0.125",
	"1234,5", "1.5e3", "1,5e-3", "2E+10", "189.590210", "191.2120784", "9007199254740992", "9007199254740993",
	"1e22", "1e23", "1e-22", "1.0e-22", "1234567890123456789", "12345678901234567890", "-0", "-0,0", "0",
	"0e5", "1.", "1,", ".5", "1e", "1e+", "1.2.3", "1,2,3", "1.234,5", "5 mg/L", "00,123", "999,999", "1000,000",
}

// FuzzDecimalCell: the fast path of a plain decimal cell gives exactly
// what the full parser gives under each hint (value, decimal separator,
// ambiguity) and the bits of strconv.ParseFloat on the same text written
// with a decimal point (the reference for plain decimal text).
func FuzzDecimalCell(f *testing.F) {
	for _, s := range decimalCellSeeds {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		checkDecimalCell(t, s)
	})
}

// TestDecimalCell runs the fuzz test's checks on its seeds, and checks
// that the fast path takes the cells it is for.
func TestDecimalCell(t *testing.T) {
	for _, s := range decimalCellSeeds {
		checkDecimalCell(t, s)
	}
	for _, s := range []string{"12.5", "12,5", "1,234", "1.234", "-1,234E-2", "189.590210", "2E+10", "1e22", "1e-22"} {
		if _, _, _, ok := decimalCell(s); !ok {
			t.Errorf("%q: the fast path left it to the full parser", s)
		}
	}
}

func checkDecimalCell(t *testing.T, s string) {
	t.Helper()
	v, info, alt, ok := decimalCell(s)
	if !ok {
		return
	}
	w, winfo, err := parseNumber(s, hintDot)
	if err != nil || math.Float64bits(v) != math.Float64bits(w) || info != winfo {
		t.Fatalf("%q: the fast path reads %v %+v, the full parser (decimal point) %v %+v %v", s, v, info, w, winfo, err)
	}
	c, _, err := parseNumber(s, hintComma)
	want := v
	if info.ambiguous {
		want = alt
	}
	if err != nil || math.Float64bits(want) != math.Float64bits(c) {
		t.Fatalf("%q: the fast path reads %v with a decimal comma, the full parser %v %v", s, want, c, err)
	}
	for _, dc := range []bool{false, true} {
		h, err := ParseNumberHint(s, dc)
		if n, _, nerr := parseNumber(s, map[bool]numberHint{false: hintDot, true: hintComma}[dc]); err != nil || nerr != nil || math.Float64bits(h) != math.Float64bits(n) {
			t.Fatalf("%q: ParseNumberHint(%v) = %v %v, the full parser %v %v", s, dc, h, err, n, nerr)
		}
	}
	// strconv.ParseFloat on the text with a decimal point, or without
	// the separator where it groups thousands.
	for _, r := range []struct {
		v     float64
		comma bool
	}{{v, false}, {alt, true}} {
		if r.comma && !info.ambiguous {
			continue
		}
		text := s
		if info.ambiguous {
			sep := byte('.')
			if strings.Contains(s, ",") {
				sep = ','
			}
			grouping := (sep == ',') != r.comma
			if grouping {
				text = strings.Replace(s, string(sep), "", 1)
			} else {
				text = strings.Replace(s, string(sep), ".", 1)
			}
		} else {
			text = strings.Replace(s, ",", ".", 1)
		}
		p, err := strconv.ParseFloat(text, 64)
		if err != nil || math.Float64bits(p) != math.Float64bits(r.v) {
			t.Fatalf("%q: the fast path reads %v, strconv.ParseFloat(%q) %v %v", s, r.v, text, p, err)
		}
	}
}

// BenchmarkDecimalCell: the fast path on the cells of `make bench-fit`'s
// file and a few other plain forms.
func BenchmarkDecimalCell(b *testing.B) {
	cells := []string{"189.590210", "191.2120784", "80.664576", "79.1984701", "12,5", "1.234", "-1.5e-3", "1200"}
	for b.Loop() {
		for _, s := range cells {
			decimalCell(s)
		}
	}
}
