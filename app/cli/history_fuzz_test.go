package cli

import (
	"math"
	"testing"
)

// FuzzLimitPair: limitPair never panics, and what it accepts is finite,
// within ±MaxMagnitude, and ordered LOW < HIGH when both are given.
func FuzzLimitPair(f *testing.F) {
	for _, s := range []string{"", "1.4,", ",2", "1,2", "2,1", "1,2,3", "NaN,", "inf,", "1e400,", " 3 , 4 "} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		lo, hi, err := limitPair(s)
		if err != nil {
			if lo != nil || hi != nil {
				t.Fatalf("%q: limits given with an error", s)
			}
			return
		}
		for _, p := range []*float64{lo, hi} {
			if p != nil && (math.IsNaN(*p) || math.Abs(*p) > 1e150) {
				t.Fatalf("%q: accepted %v", s, *p)
			}
		}
		if lo != nil && hi != nil && !(*lo < *hi) {
			t.Fatalf("%q: low %v not below high %v", s, *lo, *hi)
		}
	})
}
