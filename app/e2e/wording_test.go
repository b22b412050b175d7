//go:build e2e

package e2e

import (
	"bytes"
	"fmt"
	"reflect"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/chromedp"

	"pairline/app/cli"
	"pairline/app/wording"
	"pairline/fitcore"
)

// wdCoefRows are the row labels of a coefficient's table in "More numbers".
func wdCoefRows(t *testing.T, b *browser, id string) []string {
	t.Helper()
	return eval[[]string](t, b, fmt.Sprintf(`tids("coef-%s", ' tbody th').map(th => th.textContent.trim())`, id))
}

// wdWant are the rows the screen shows for a coefficient tested against
// ref: the test against 0 once, and the plain test beside it only when the
// reference differs from 0 (app/wording).
func wdWant(ref string, level float64) []string {
	w := []string{wording.Estimate, wording.Interval(level), wording.StandardError, wording.TestedAgainst,
		wording.TAgainst(ref), wording.PAgainst(ref)}
	if ref != "0" {
		w = append(w, wording.TAgainst("0"), wording.PAgainst("0"))
	}
	return w
}

// wdCLIRows runs `pairline fit` (in process) on the same readings with the
// same reference values and reads the rows of one coefficient block of its
// text summary ("  Intercept", then "    label   value" rows).
func wdCLIRows(t *testing.T, pairs [][2]string, name string, args ...string) []string {
	t.Helper()
	var csv strings.Builder
	csv.WriteString("x,y\n")
	for _, p := range pairs {
		csv.WriteString(p[0] + "," + p[1] + "\n")
	}
	var out, errs bytes.Buffer
	if code := cli.Fit(append(args, "-"), strings.NewReader(csv.String()), &out, &errs); code != cli.ExitOK {
		t.Fatalf("pairline fit: exit %d: %s", code, errs.String())
	}
	lines := strings.Split(out.String(), "\n")
	for i, l := range lines {
		if l != "  "+name {
			continue
		}
		var rows []string
		for _, r := range lines[i+1:] {
			if !strings.HasPrefix(r, "    ") || len(r) < 41 {
				break
			}
			rows = append(rows, strings.TrimRight(r[4:40], " "))
		}
		return rows
	}
	t.Fatalf("pairline fit shows no %q block", name)
	return nil
}

func wdNoRepeats(t *testing.T, what string, rows []string) {
	t.Helper()
	seen := map[string]bool{}
	for _, r := range rows {
		if seen[r] {
			t.Errorf("%s: row %q is shown twice (%q)", what, r, rows)
		}
		seen[r] = true
	}
}

func wdOpenNumbers(t *testing.T, b *browser) {
	t.Helper()
	if !exists(t, b, "more-numbers-body") {
		click(t, b, "more-numbers")
	}
	waitFor(t, b, "More numbers to open", `!!tid("more-numbers-body")`, 5*time.Second)
}

// TestWordingInterceptRows: on an invented conductivity check, the
// intercept block of "More numbers" shows its test against the reference 0
// once (no repeated t and p rows); with a reference of 0.5 it shows the
// test against 0.5 and the plain test against 0. The labels are the
// command's for the same readings, and the numbers fitcore's.
func TestWordingInterceptRows(t *testing.T) {
	srv := startServer(t)
	x, y := anParsed(t, anCalibration)
	for _, size := range []struct {
		name string
		dim  [2]int64
	}{{"tablet", tablet}, {"phone", phone}} {
		t.Run(size.name, func(t *testing.T) {
			b := newBrowser(t, size.dim)
			b.do(t, chromedp.Navigate(srv.URL))
			waitFor(t, b, "the app to start", appReady, 60*time.Second)
			anFill(t, b, anCalibration)
			wdOpenNumbers(t, b)

			rows := wdCoefRows(t, b, "intercept")
			if want := wdWant("0", fitcore.DefaultLevel); !reflect.DeepEqual(rows, want) {
				t.Errorf("intercept rows with reference 0: %q, want %q", rows, want)
			}
			wdNoRepeats(t, "intercept, reference 0", rows)
			if cliRows := wdCLIRows(t, anCalibration, wording.Intercept); !reflect.DeepEqual(rows, cliRows) {
				t.Errorf("the screen's intercept rows %q differ from pairline fit's %q", rows, cliRows)
			}
			if exists(t, b, "result-intercept-t") || exists(t, b, "result-intercept-p") {
				t.Error("the plain intercept test is shown beside the same test against the reference 0")
			}
			rep := anAnalyze(t, x, y, fitcore.Options{})
			anExpect(t, b, "result-intercept-t-ref", "data-value", rep.Intercept.TRef)
			anExpect(t, b, "result-intercept-p-ref", "data-value", rep.Intercept.PRef)
			slope := wdCoefRows(t, b, "slope")
			if want := wdWant("1", fitcore.DefaultLevel); !reflect.DeepEqual(slope, want) {
				t.Errorf("slope rows: %q, want %q", slope, want)
			}
			anExpect(t, b, "result-slope-t", "data-value", rep.Slope.T)
			t.Logf("More numbers start %v px down the page", eval[float64](t, b,
				`tid("more-numbers-body").getBoundingClientRect().top + window.scrollY`))
			screenshot(t, b, "wording-intercept-ref0-"+size.name)

			setValue(t, b, "settings-intercept-ref", "0.5", "change")
			waitFor(t, b, "the intercept tested against 0.5", `tid("result-intercept-ref")?.dataset.value === "0.5"`, 10*time.Second)
			wdOpenNumbers(t, b)
			rows = wdCoefRows(t, b, "intercept")
			if want := wdWant("0.5", fitcore.DefaultLevel); !reflect.DeepEqual(rows, want) {
				t.Errorf("intercept rows with reference 0.5: %q, want %q", rows, want)
			}
			wdNoRepeats(t, "intercept, reference 0.5", rows)
			if cliRows := wdCLIRows(t, anCalibration, wording.Intercept, "--intercept-ref", "0.5"); !reflect.DeepEqual(rows, cliRows) {
				t.Errorf("the screen's intercept rows %q differ from pairline fit --intercept-ref 0.5's %q", rows, cliRows)
			}
			half := 0.5
			rep = anAnalyze(t, x, y, fitcore.Options{InterceptRef: &half})
			anExpect(t, b, "result-intercept-t", "data-value", rep.Intercept.T)
			anExpect(t, b, "result-intercept-p", "data-value", rep.Intercept.P)
			anExpect(t, b, "result-intercept-t-ref", "data-value", rep.Intercept.TRef)
			screenshot(t, b, "wording-intercept-ref05-"+size.name)

			// The report says it in the same words.
			click(t, b, "report-open")
			waitFor(t, b, "the report", `!!tid("report")`, 10*time.Second)
			heads := eval[[]string](t, b, `tids("report", ' table.pl-rt thead')
				.map(h => [...h.querySelectorAll('th')].map(th => th.textContent)).find(r => r[0] === 'Figure') || []`)
			if want := []string{"Figure", wording.Estimate, wording.Interval(fitcore.DefaultLevel), wording.StandardError, wording.TestedAgainst}; !reflect.DeepEqual(heads, want) {
				t.Errorf("the report's coefficient columns %q, want %q", heads, want)
			}
			screenshot(t, b, "wording-report-"+size.name)
		})
	}
}
