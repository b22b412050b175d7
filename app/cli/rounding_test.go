package cli

import (
	"bufio"
	"bytes"
	"fmt"
	"os"
	"strings"
	"testing"
	"time"

	"pairline/app/demo"
	"pairline/app/numfmt"
	"pairline/app/reftest"
	"pairline/app/wording"
	"pairline/fitcore"
)

// norrisCSV is the NIST StRD Norris data as a CSV file with a units row
// (the units are invented for the test: the dataset has none).
func norrisCSV(t *testing.T) string {
	t.Helper()
	b, err := os.ReadFile(reftest.Path(t, "strd", "Norris.txt"))
	if err != nil {
		t.Fatal(err)
	}
	var csv strings.Builder
	csv.WriteString("standard,reading\nµg/L,mV\n")
	sc := bufio.NewScanner(bytes.NewReader(b))
	for sc.Scan() {
		if f := strings.Fields(sc.Text()); len(f) == 2 && !strings.HasPrefix(f[0], "#") {
			fmt.Fprintf(&csv, "%s,%s\n", f[1], f[0]) // file rows are "y x"
		}
	}
	return csv.String()
}

// TestSummaryRoundsToUncertainty: `pairline fit`'s text writes each
// coefficient rounded to its standard error, the standard error to two
// significant digits, with units (GUM, JCGM 100:2008 §7.2.6). Worked by
// hand from the NIST StRD Norris certified values: slope 1.00211681802045,
// SE 0.000429796848199937 → 1.00212 ± 0.00043; intercept −0.262323073774029,
// SE 0.232818234301152 → −0.26 ± 0.23; residual SD 0.884796396144373 →
// 0.885 (three digits, as the line card). The 95 % intervals use
// t(0.975, 34) = 2.03224 (statistical tables): slope 1.00124 to 1.00299,
// intercept −0.74 to 0.21.
func TestSummaryRoundsToUncertainty(t *testing.T) {
	code, out, errs := runFitCmd(t, norrisCSV(t), "-")
	if code != ExitOK {
		t.Fatalf("exit %d: %s", code, errs)
	}
	rowOf := func(label, value string) string { return fmt.Sprintf("    %-36s %s\n", label, value) }
	slope, icpt := out, ""
	if i := strings.Index(out, "  "+wording.Intercept+"\n"); i > 0 {
		slope, icpt = out[:i], out[i:]
	}
	for _, c := range []struct{ block, want string }{
		{slope, rowOf(wording.Estimate, "1.00212 mV per µg/L")},
		{slope, rowOf(wording.StandardError, "0.00043 mV per µg/L")},
		{slope, rowOf(wording.Interval(0.95), "1.00124 to 1.00299 mV per µg/L")},
		{icpt, rowOf(wording.Estimate, "−0.26 mV")},
		{icpt, rowOf(wording.StandardError, "0.23 mV")},
		{icpt, rowOf(wording.Interval(0.95), "−0.74 to 0.21 mV")},
		{icpt, rowOf(wording.ResidualSD, "0.885 mV")},
	} {
		if !strings.Contains(c.block, c.want) {
			t.Errorf("the summary lacks %q:\n%s", c.want, out)
		}
	}
	// An unknown's x and the limits carry the unit of x; x is rounded to
	// its standard error, the limits to three digits (as the screen).
	code, out, errs = runFitCmd(t, norrisCSV(t), "--inverse-y", "500", "-")
	if code != ExitOK {
		t.Fatalf("--inverse-y: exit %d: %s", code, errs)
	}
	_, js, _ := runFitCmd(t, norrisCSV(t), "--inverse-y", "500", "--json", "-")
	r := decodeReport(t, js)
	xs, se := numfmt.Estimate(r.Inverse[0].X, r.Inverse[0].SE, sig)
	if r.Inverse[0].SE < 0.01 || r.Inverse[0].SE > 10 || len(xs) > 8 {
		t.Fatalf("the unknown's x %v ± %v: not the case this test means", r.Inverse[0].X, r.Inverse[0].SE)
	}
	for _, want := range []string{
		"is x = " + xs + " µg/L, " + strings.ToLower(wording.StandardError) + " " + se + " µg/L",
		wording.DetectionLimit + " " + numfmt.Sig(r.Limits.LOD, 3) + " µg/L",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("the summary lacks %q:\n%s", want, out)
		}
	}
	// Full precision stays in --json.
	code, js, errs = runFitCmd(t, norrisCSV(t), "--json", "-")
	if code != ExitOK {
		t.Fatalf("--json: exit %d: %s", code, errs)
	}
	if r := decodeReport(t, js); !strings.Contains(js, numfmt.Full(r.Slope.SE)) || !relClose(r.Slope.Estimate, 1.00211681802045, 1e-12) {
		t.Errorf("--json does not carry the slope in full (%v, SE %v)", r.Slope.Estimate, r.Slope.SE)
	}
}

func relClose(a, b, tol float64) bool {
	d := a - b
	return d <= tol*max(1, b, -b) && -d <= tol*max(1, b, -b)
}

// TestInspectRoundsAsTheLineCard: `pairline inspect` writes the slope and
// intercept of each (invented) demo session as the line card shows them:
// the card's figure (numfmt.Estimate of fitcore's estimate and standard
// error) and unit (wording.SlopeUnit of the session's units, the y unit for
// the intercept), the standard error after "±" there and on its own row here.
func TestInspectRoundsAsTheLineCard(t *testing.T) {
	ss, err := demo.Sessions(time.Now(), nil)
	if err != nil {
		t.Fatal(err)
	}
	path := writeSessionFile(t, t.TempDir(), "demo.pairline", ss)
	var out, errb bytes.Buffer
	if code := Inspect([]string{path}, &out, &errb); code != ExitOK {
		t.Fatalf("exit %d: %s", code, errb.String())
	}
	text := out.String()
	for _, s := range ss {
		x, y, _, _ := s.Pairs()
		rep, err := fitcore.Analyze(x, y, s.Settings.Options())
		if err != nil {
			t.Fatal(err)
		}
		if rep.Transform != "" && rep.Transform != fitcore.TransformNone {
			continue // the card names the fitted scale's units
		}
		i := strings.Index(text, quoted(s.Title))
		if i < 0 {
			t.Fatalf("inspect does not show %q", s.Title)
		}
		part := text[i:]
		for _, c := range []struct {
			name string
			co   fitcore.Coefficient
			unit string
		}{{wording.Slope, rep.Slope, wording.SlopeUnit(s.YUnit, s.XUnit)}, {wording.Intercept, rep.Intercept, s.YUnit}} {
			v, u := numfmt.Estimate(c.co.Estimate, c.co.SE, sig)
			for _, want := range []string{
				"  " + c.name + "\n" + fmt.Sprintf("    %-36s %s\n", wording.Estimate, v+" "+c.unit),
				fmt.Sprintf("    %-36s %s\n", wording.StandardError, u+" "+c.unit),
			} {
				if !strings.Contains(part, want) {
					t.Errorf("%s: inspect lacks %q", s.Title, want)
				}
			}
		}
	}
}
