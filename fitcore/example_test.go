package fitcore_test

import (
	"fmt"

	"math"

	"pairline/fitcore"
)

// A calibration of an invented turbidity probe of the fictional Larkwater
// Valley Water Board: standards (x, NTU) against probe readings (y).
//
// The first two lines agree with statsmodels 0.13 OLS and get_prediction
// on the same numbers (Debian python3-statsmodels).
func ExampleAnalyze() {
	x := []float64{0, 5, 10, 20, 40, 80}
	y := []float64{0.3, 5.1, 10.4, 19.8, 40.9, 79.6}
	rep, err := fitcore.Analyze(x, y, fitcore.Options{
		SkipAdvice: true,
		PredictX:   []float64{30},
		Inverse:    []fitcore.InverseQuery{{Y: []float64{25.2, 25.6}}},
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("slope %.4f ± %.4f, intercept %.3f, R² %.5f\n",
		rep.Slope.Estimate, rep.Slope.SE, rep.Intercept.Estimate, rep.RSquared)
	p := rep.Predictions[0]
	fmt.Printf("at x = 30: y = %.2f, 95 %% prediction interval %.2f to %.2f\n", p.Fit, p.PILow, p.PIHigh)
	inv := rep.Inverse[0]
	fmt.Printf("unknown reading 25.4: x = %.2f (%.2f to %.2f)\n", inv.X, inv.Low, inv.High)
	// Output:
	// slope 0.9947 ± 0.0072, intercept 0.320, R² 0.99979
	// at x = 30: y = 30.16, 95 % prediction interval 28.70 to 31.62
	// unknown reading 25.4: x = 25.21 (24.11 to 26.32)
}

// A reading that is not a number is reported with its position.
func ExampleDataError() {
	_, err := fitcore.Analyze([]float64{1, 2, 3}, []float64{1.1, math.NaN(), 2.9}, fitcore.Options{})
	fmt.Println(err)
	// Output:
	// pair 2: y value NaN: a reading is not a finite number. Correct or remove this reading.
}
