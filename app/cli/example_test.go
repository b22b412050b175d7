package cli_test

import (
	"bytes"
	"encoding/json"
	"fmt"
	"os"
	"strings"

	"pairline/app/cli"
)

// Fit reads a semicolon-separated export with decimal commas (invented
// readings of a fictional Larkwater Valley Water Board meter; the last row
// is incomplete and skipped) and prints the line as JSON. statsmodels OLS
// gives slope 0.999 and intercept 0.021 for these five pairs.
func ExampleFit() {
	csv := "standard;reading\n1;1,02\n2;2,01\n3;3,05\n4;3,98\n5;5,03\n\n6;\n"
	var out bytes.Buffer
	code := cli.Fit([]string{"--json", "-"}, strings.NewReader(csv), &out, os.Stderr)
	var r struct {
		N        int `json:"n"`
		NSkipped int `json:"n_skipped"`
		Slope    struct {
			Estimate float64 `json:"estimate"`
		} `json:"slope"`
		Intercept struct {
			Estimate float64 `json:"estimate"`
		} `json:"intercept"`
	}
	if err := json.Unmarshal(out.Bytes(), &r); err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("exit %d: n = %d, skipped %d, y = %.4f·x + %.4f\n", code, r.N, r.NSkipped, r.Slope.Estimate, r.Intercept.Estimate)
	// Output: exit 0: n = 5, skipped 1, y = 0.9990·x + 0.0210
}
