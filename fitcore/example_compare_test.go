package fitcore_test

import (
	"fmt"

	"pairline/fitcore"
)

// Two calibrations of an invented chlorine analyser (Larkwater Valley Water
// Board, invented readings): today's readings are last month's shifted up
// by about 0.5 mV at every standard, so the slopes agree and the line moved.
// The printed numbers show the use; they are checked against R in
// history_ref_test.go.
func ExampleCompareLines() {
	x := []float64{0, 0.5, 1, 2, 4}
	last := []float64{0.02, 10.11, 19.93, 40.05, 79.98}
	today := []float64{0.55, 10.58, 20.47, 40.51, 80.49}
	c, err := fitcore.CompareLines(x, last, x, today)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("%s (p equal slopes %.2f, p one line %.1e)\n", c.Verdict, c.PSlopes, c.PCoincident)
	fmt.Printf("at the top of the range the old line reads %.3f too high\n", c.Top.Diff)
	// Output:
	// line moved (p equal slopes 0.92, p one line 4.1e-05)
	// at the top of the range the old line reads 0.025 too high
}
