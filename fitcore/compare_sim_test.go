package fitcore_test

import (
	"math/rand/v2"
	"testing"

	"pairline/fitcore"
)

// simLine draws readings y = a + b·x + N(0, sd²) at x = 0, 10, …, 10·(k−1)
// (invented, seeded data).
func simLine(r *rand.Rand, k int, a, b, sd float64) (x, y []float64) {
	for i := 0; i < k; i++ {
		xi := 10 * float64(i)
		x = append(x, xi)
		y = append(y, a+b*xi+sd*r.NormFloat64())
	}
	return x, y
}

// TestCompareLinesFalseAlarmRate measures the verdict's false-alarm rate on
// identical lines. The verdict is a closed test at CompareAlpha, so the rate
// must be CompareAlpha = 1 %; with 4,000 seeded trials the binomial standard
// error is 0.16 %, and the band [0.5 %, 1.6 %] is about ±3.5 standard errors
// (common practice for a seeded simulation bound). A second table entry
// measures the detection rate of a 2 % slope change and of a shift of the
// line, which must be high for the design used (8 readings per line).
func TestCompareLinesFalseAlarmRate(t *testing.T) {
	cases := []struct {
		name           string
		b2, a2         float64
		want           string // verdict counted
		minRate, maxRt float64
	}{
		{"identical lines", 2, 1, "", 0.005, 0.016},
		{"slope up 2 %", 2.04, 1, fitcore.LinesSlopeChanged, 0.9, 1},
		{"line shifted by 3 sd", 2, 1.3, fitcore.LinesMoved, 0.9, 1},
	}
	const trials = 4000
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			r := rand.New(rand.NewPCG(12, 2026))
			hits := 0
			for i := 0; i < trials; i++ {
				x1, y1 := simLine(r, 8, 1, 2, 0.1)
				x2, y2 := simLine(r, 8, tc.a2, tc.b2, 0.1)
				c, err := fitcore.CompareLines(x1, y1, x2, y2)
				if err != nil {
					t.Fatal(err)
				}
				if tc.want == "" && c.Verdict != fitcore.LinesSame || tc.want != "" && c.Verdict == tc.want {
					hits++
				}
			}
			rate := float64(hits) / trials
			t.Logf("%s: rate %.4f over %d trials", tc.name, rate, trials)
			if rate < tc.minRate || rate > tc.maxRt {
				t.Errorf("rate %.4f outside [%g, %g]", rate, tc.minRate, tc.maxRt)
			}
		})
	}
}
