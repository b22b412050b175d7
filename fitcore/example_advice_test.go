package fitcore_test

import (
	"fmt"

	"pairline/fitcore"
)

// Invented example data (not a real record): the invented Larkwater Valley
// Water Board checks a conductivity meter at its Millrace intake against
// standard solutions from 10 to 2000 µS/cm. The meter's error is about
// 1–2 % of the reading, so the scatter grows with the reading.
var exampleStandards = []float64{10, 15, 22, 33, 47, 68, 100, 150, 220, 330, 470, 680, 1000, 1500, 2000, 2000}
var exampleReadings = []float64{10.08, 14.78, 22.07, 33.63, 46.72, 67.25, 101.2, 149.7, 221.1, 324.4, 476.6, 680.7, 991, 1524, 1974, 2014}

// ExampleBoxCoxProfile estimates the power that makes the meter's scatter
// even and straight. A λ near 1 says the line itself is fine on the original
// scale; the scatter problem then has to be handled by a log–log fit or by
// weighting (see ExampleAdvice).
func ExampleBoxCoxProfile() {
	bc, err := fitcore.BoxCoxProfile(exampleStandards, exampleReadings, 0.95)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("λ = %.2f, 95 %% interval %.2f to %.2f\n", bc.Lambda, bc.CILow, bc.CIHigh)
	// Output:
	// λ = 1.00, 95 % interval 0.98 to 1.02
}

// ExampleAdvice shows the advice Analyze gives when the scatter grows with
// the reading.
func ExampleAdvice() {
	rep, err := fitcore.Analyze(exampleStandards, exampleReadings, fitcore.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	a := rep.Advice
	fmt.Println("spread before:", a.Before.Assumptions.Spread.Verdict)
	fmt.Println("remedy:", a.Remedy)
	if a.After != nil {
		fmt.Println("spread after:", a.After.Assumptions.Spread.Verdict)
	}
	// Output:
	// spread before: warn
	// remedy: log_log
	// spread after: pass
}
