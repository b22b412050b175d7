package cli

import (
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"pairline/app/wording"
)

// blockLabels reads the labels of one block of the text summary: the rows
// ("    label   value") under the line "  name".
func blockLabels(t *testing.T, out, name string) []string {
	t.Helper()
	lines := strings.Split(out, "\n")
	for i, l := range lines {
		if l != "  "+name {
			continue
		}
		var labels []string
		for _, r := range lines[i+1:] {
			if !strings.HasPrefix(r, "    ") || len(r) < 41 {
				break
			}
			labels = append(labels, strings.TrimRight(r[4:40], " "))
		}
		return labels
	}
	t.Fatalf("no block %q in:\n%s", name, out)
	return nil
}

// coefLabels are the rows of a coefficient as the screen's "More numbers"
// shows them (app/ui anCoefTable, from app/wording): the test against 0
// only when the reference is not 0.
func coefLabels(ref string, level float64) []string {
	l := []string{wording.Estimate, wording.Interval(level), wording.StandardError, wording.TestedAgainst,
		wording.TAgainst(ref), wording.PAgainst(ref)}
	if ref != "0" {
		l = append(l, wording.TAgainst("0"), wording.PAgainst("0"))
	}
	return l
}

// TestFitTextWording: the text summary of `pairline fit` names the line's
// figures with the screen's words (app/wording), in the screen's order,
// and the intercept block has no repeated rows when its reference is 0.
func TestFitTextWording(t *testing.T) {
	file := filepath.Join(csvDir, "quoted.csv")
	cases := []struct {
		name             string
		args             []string
		slope, intercept []string
	}{
		{"default references", nil, coefLabels("1", 0.95), coefLabels("0", 0.95)},
		{"intercept against 0.5, 99 %", []string{"--intercept-ref", "0.5", "--level", "0.99"}, coefLabels("1", 0.99), coefLabels("0.5", 0.99)},
		{"slope against 0", []string{"--slope-ref", "0", "--intercept-ref", "-2"}, coefLabels("0", 0.95), coefLabels("−2", 0.95)},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			code, out, errs := runFitCmd(t, "", append(c.args, file)...)
			if code != ExitOK {
				t.Fatalf("exit %d: %s", code, errs)
			}
			if got := blockLabels(t, out, wording.Slope); !reflect.DeepEqual(got, c.slope) {
				t.Errorf("slope rows %q, want %q", got, c.slope)
			}
			got := blockLabels(t, out, wording.Intercept)
			if !reflect.DeepEqual(got, c.intercept) {
				t.Errorf("intercept rows %q, want %q", got, c.intercept)
			}
			seen := map[string]bool{}
			for _, l := range got {
				if seen[l] {
					t.Errorf("intercept row %q is repeated", l)
				}
				seen[l] = true
			}
			whole := []string{wording.ResidualSD, wording.DegreesOfFreedom, wording.CorrelationR, wording.RSquared,
				wording.AdjRSquared, wording.FLine, wording.PofF, wording.Covariance, wording.MeanX, wording.MeanY}
			if got := blockLabels(t, out, wording.FitAsAWhole); !reflect.DeepEqual(got, whole) {
				t.Errorf("rows of the fit as a whole %q, want %q", got, whole)
			}
			for _, w := range []string{wording.PairsUsed + ": 7", wording.ChecksTitle, wording.CheckLinearity, wording.CheckSpread,
				wording.CheckIndependence, wording.CheckNormality, wording.CheckInfluence, wording.Tests} {
				if !strings.Contains(out, w) {
					t.Errorf("the summary lacks %q", w)
				}
			}
			noForeignPhrases(t, out)
		})
	}
}

// noForeignPhrases fails on the column heads and summary lines the text
// output used to have, which read like another program's model summary
// rather than Pairline's words.
func noForeignPhrases(t *testing.T, out string) {
	t.Helper()
	for _, bad := range []string{"residual standard error", " df ", "std. error", "estimate ", "Straight-line fit",
		"statistic =", " ok ", "WARN", "FAIL ", "model: ", "interval for the line", "is the slope"} {
		if strings.Contains(out, bad) {
			t.Errorf("the output still says %q", bad)
		}
	}
}

// TestInspectTextWording: inspect shows a session's analysis in the same
// words, with an intercept block of six rows (its reference is
// 0 in the invented sample).
func TestInspectTextWording(t *testing.T) {
	readSampleSession(t)
	var out, errs strings.Builder
	if code := Inspect([]string{sampleSession}, &out, &errs); code != ExitOK {
		t.Fatalf("exit %d: %s", code, errs.String())
	}
	if got, want := blockLabels(t, out.String(), wording.Intercept), coefLabels("0", 0.95); !reflect.DeepEqual(got, want) {
		t.Errorf("intercept rows %q, want %q", got, want)
	}
	noForeignPhrases(t, out.String())
}
