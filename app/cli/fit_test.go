package cli

import (
	"bufio"
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"pairline/app/numfmt"
	"pairline/app/reftest"
	"pairline/app/session"
	"pairline/app/wording"
	"pairline/fitcore"
)

const csvDir = "../../testdata/csv"

// runFitCmd runs the command and returns exit status, stdout and stderr.
func runFitCmd(t testing.TB, stdin string, args ...string) (int, string, string) {
	t.Helper()
	var out, errb bytes.Buffer
	code := Fit(args, strings.NewReader(stdin), &out, &errb)
	return code, out.String(), errb.String()
}

func decodeReport(t testing.TB, s string) *fitcore.Report {
	t.Helper()
	var r fitcore.Report
	dec := json.NewDecoder(strings.NewReader(s))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&r); err != nil {
		t.Fatalf("output is not one Report JSON object: %v\n%s", err, s)
	}
	return &r
}

func relNear(t testing.TB, what string, got, want, rel float64, src string) {
	t.Helper()
	if math.Abs(got-want) > rel*math.Abs(want) {
		t.Errorf("%s: got %.15g, want %.15g (rel tolerance %g) [%s]", what, got, want, rel, src)
	}
}

type csvExpected struct {
	Source string `json:"source"`
	Cases  []struct {
		File     string   `json:"file"`
		Args     []string `json:"args"`
		NSkipped int      `json:"n_skipped"`
		Fit      struct {
			N           int     `json:"n"`
			Slope       float64 `json:"slope"`
			Intercept   float64 `json:"intercept"`
			SlopeSE     float64 `json:"slope_se"`
			InterceptSE float64 `json:"intercept_se"`
			RSquared    float64 `json:"r_squared"`
			ResidualSE  float64 `json:"residual_se"`
		} `json:"fit"`
	} `json:"cases"`
}

// TestFitCSVDialects runs `fit --json` on each file of testdata/csv and
// compares with statsmodels OLS on the pairs the file was written from
// (testdata/csv/expected.json, written by testdata/refgen/gen_csv_cases.py;
// the readings are invented).
func TestFitCSVDialects(t *testing.T) {
	b, err := os.ReadFile(filepath.Join(csvDir, "expected.json"))
	if err != nil {
		t.Fatal(err)
	}
	var exp csvExpected
	if err := json.Unmarshal(b, &exp); err != nil {
		t.Fatal(err)
	}
	if len(exp.Cases) == 0 {
		t.Fatal("expected.json has no cases")
	}
	for _, c := range exp.Cases {
		t.Run(c.File+strings.Join(c.Args, "_"), func(t *testing.T) {
			src := "statsmodels OLS, " + exp.Source
			args := append([]string{"--json"}, c.Args...)
			args = append(args, filepath.Join(csvDir, c.File))
			code, out, errs := runFitCmd(t, "", args...)
			if code != ExitOK {
				t.Fatalf("exit %d, stderr %q", code, errs)
			}
			r := decodeReport(t, out)
			if r.N != c.Fit.N || r.NSkipped != c.NSkipped {
				t.Errorf("n = %d, n_skipped = %d; want %d, %d [%s]", r.N, r.NSkipped, c.Fit.N, c.NSkipped, src)
			}
			relNear(t, "slope", r.Slope.Estimate, c.Fit.Slope, 1e-9, src)
			relNear(t, "intercept", r.Intercept.Estimate, c.Fit.Intercept, 1e-9, src)
			relNear(t, "slope se", r.Slope.SE, c.Fit.SlopeSE, 1e-9, src)
			relNear(t, "intercept se", r.Intercept.SE, c.Fit.InterceptSE, 1e-9, src)
			relNear(t, "r_squared", r.RSquared, c.Fit.RSquared, 1e-9, src)
			relNear(t, "residual_se", r.ResidualSE, c.Fit.ResidualSE, 1e-9, src)
		})
	}
}

// TestFitBadInput: unusable input or flags give exit 2 and exactly one line
// on stderr that names the problem (common practice for command-line tools).
func TestFitBadInput(t *testing.T) {
	f := func(name string) string { return filepath.Join(csvDir, name) }
	cases := []struct {
		name  string
		args  []string
		stdin string
		want  string // substring of the stderr line; "" = any
	}{
		{"no rows", []string{f("header_only.csv")}, "", ""},
		{"text only", []string{f("text_only.csv")}, "", ""},
		{"two pairs", []string{f("two_rows.csv")}, "", "at least 3"},
		{"all x equal", []string{f("same_x.csv")}, "", "x values are 5"},
		{"missing file", []string{f("no_such_file.csv")}, "", "cannot open"},
		{"no file", []string{"--json"}, "", "no input file"},
		{"two files", []string{f("quoted.csv"), f("quoted.csv")}, "", "one input file"},
		{"unknown flag", []string{"--bogus", f("quoted.csv")}, "", "bogus"},
		{"bad model", []string{"--model", "cubic", f("quoted.csv")}, "", "--model"},
		{"bad weights", []string{"--weights", "y", f("quoted.csv")}, "", "--weights"},
		{"bad transform", []string{"--transform", "log", f("quoted.csv")}, "", "--transform"},
		{"level as percent", []string{"--level", "95", f("quoted.csv")}, "", "--level"},
		{"origin vs model", []string{"--origin", "--model", "deming", f("quoted.csv")}, "", "contradict"},
		{"weighted without weights", []string{"--model", "weighted", f("quoted.csv")}, "", "--weights"},
		{"bad predict-x", []string{"--predict-x", "abc", f("quoted.csv")}, "", "--predict-x"},
		{"bad inverse-y", []string{"--inverse-y", "6;x", f("quoted.csv")}, "", "--inverse-y"},
		{"unknown column name", []string{"--x-col", "depth", f("columns.csv")}, "", "no such column"},
		{"column zero", []string{"--x-col", "0", f("columns.csv")}, "", "numbered from 1"},
		{"stdin two pairs", []string{"-"}, "1,2\n2,3\n", "at least 3"},
		{"stdin empty", []string{"-"}, "", ""},
		{"bad delimiter", []string{"--delimiter", "|", "-"}, "1,2\n2,3\n3,5\n", "--delimiter"},
		{"bad header choice", []string{"--header", "maybe", "-"}, "1,2\n2,3\n3,5\n", "--header"},
		{"bad decimal-comma choice", []string{"--decimal-comma", "perhaps", "-"}, "1,2\n2,3\n3,5\n", "--decimal-comma"},
		{"unknown y column name", []string{"--y-col", "depth", f("columns.csv")}, "", "no such column"},
		{"same column twice", []string{"--x-col", "2", "--y-col", "2", "-"}, "1,2,3\n2,3,4\n3,5,6\n", "both column 2"},
		{"too few, first skip named", []string{"-"}, "x,y\n1,2\n2,abc\n3,4\n", "(1 row(s) skipped; first: Line 3 skipped: the y cell (column 2) \"abc\""},
		{"empty inverse-y", []string{"--inverse-y", " ", "-"}, "1,2\n2,3\n3,5\n", "holds no reading"},
		{"log of a negative y", []string{"--transform", "log_y", "-"}, "1,-2\n2,3\n3,5\n", "y"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			code, out, errs := runFitCmd(t, c.stdin, c.args...)
			if code != ExitUsage {
				t.Fatalf("exit %d, want %d; stdout %q stderr %q", code, ExitUsage, out, errs)
			}
			if out != "" {
				t.Errorf("stdout should be empty, got %q", out)
			}
			lines := strings.Split(strings.TrimSuffix(errs, "\n"), "\n")
			if len(lines) != 1 || !strings.HasPrefix(lines[0], "pairline fit: ") || !strings.HasSuffix(errs, "\n") {
				t.Errorf("stderr must be one line starting %q, got %q", "pairline fit: ", errs)
			}
			if c.want != "" && !strings.Contains(errs, c.want) {
				t.Errorf("stderr %q does not mention %q", errs, c.want)
			}
		})
	}
}

// TestFitPredictInverse checks --predict-x and --inverse-y against the
// statsmodels line of the invented nitrate file: the fitted value is
// b0 + b1·x, and the inverse of the mean of two repeats is (ȳ − b0)/b1.
func TestFitPredictInverse(t *testing.T) {
	b, err := os.ReadFile(filepath.Join(csvDir, "expected.json"))
	if err != nil {
		t.Fatal(err)
	}
	var exp csvExpected
	if err := json.Unmarshal(b, &exp); err != nil {
		t.Fatal(err)
	}
	want := exp.Cases[1].Fit // semicolon_decimal_comma.csv
	if exp.Cases[1].File != "semicolon_decimal_comma.csv" {
		t.Fatalf("expected.json case order changed: %s", exp.Cases[1].File)
	}
	const src = "statsmodels OLS on invented nitrate readings (testdata/csv/expected.json)"
	code, out, errs := runFitCmd(t, "", "--json", "--predict-x", "2,5", "--predict-x", "9",
		"--inverse-y", "6,0;6,1", "--inverse-y", "3", filepath.Join(csvDir, "semicolon_decimal_comma.csv"))
	if code != ExitOK {
		t.Fatalf("exit %d: %s", code, errs)
	}
	r := decodeReport(t, out)
	if len(r.Predictions) != 2 || len(r.Inverse) != 2 {
		t.Fatalf("got %d predictions, %d inverse results; want 2 and 2", len(r.Predictions), len(r.Inverse))
	}
	for i, x := range []float64{2.5, 9} {
		p := r.Predictions[i]
		relNear(t, fmt.Sprintf("prediction x[%d]", i), p.X, x, 0, src)
		relNear(t, fmt.Sprintf("fit at %g", x), p.Fit, want.Intercept+want.Slope*x, 1e-9, src)
		if !(p.PILow < p.CILow && p.CILow < p.Fit && p.Fit < p.CIHigh && p.CIHigh < p.PIHigh) {
			t.Errorf("at x = %g intervals are not nested: %+v", x, p)
		}
	}
	inv := r.Inverse[0]
	if inv.M != 2 {
		t.Errorf("inverse m = %d, want 2 (\"6,0;6,1\" is two repeats)", inv.M)
	}
	relNear(t, "inverse y mean", inv.Y, 6.05, 1e-12, src)
	relNear(t, "inverse x", inv.X, (6.05-want.Intercept)/want.Slope, 1e-9, src)
	relNear(t, "inverse x (single)", r.Inverse[1].X, (3-want.Intercept)/want.Slope, 1e-9, src)
}

// TestFitSummary checks the readable output names the line's numbers as
// statsmodels computes them (rounded for display by numfmt) and carries the
// safety caution.
func TestFitSummary(t *testing.T) {
	b, err := os.ReadFile(filepath.Join(csvDir, "expected.json"))
	if err != nil {
		t.Fatal(err)
	}
	var exp csvExpected
	if err := json.Unmarshal(b, &exp); err != nil {
		t.Fatal(err)
	}
	c := exp.Cases[0]
	code, out, errs := runFitCmd(t, "", filepath.Join(csvDir, c.File))
	if code != ExitOK {
		t.Fatalf("exit %d: %s", code, errs)
	}
	slope, slopeSE := numfmt.Estimate(c.Fit.Slope, c.Fit.SlopeSE, sig)
	for _, want := range []string{
		slope, slopeSE,
		"nitrate standard mg/L", "photometer mg/L",
		fmt.Sprintf("%s: %d", wording.PairsUsed, c.Fit.N),
		wording.ChecksTitle, wording.Tests, "Caution",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("summary lacks %q:\n%s", want, out)
		}
	}
	if strings.Contains(out, "NaN") || strings.Contains(out, "Inf") {
		t.Errorf("summary shows a non-finite number:\n%s", out)
	}
}

// TestFitNorrisCertified: `fit --json` on the NIST StRD Norris data
// (ozone-monitor calibration) reproduces the certified values.
// Source: NIST/ITL StRD, Norris (../shared/reference/strd/Norris.txt).
// Accuracy: log relative error ≥ 9 digits (rel 1e-9; McCullough 1998
// scores LRE, certified values have 15 digits).
func TestFitNorrisCertified(t *testing.T) {
	const src = "NIST StRD Norris certified values"
	path := reftest.Path(t, "strd", "Norris.txt")
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	cert := map[string]float64{}
	var csv strings.Builder
	csv.WriteString("x,y\n")
	sc := bufio.NewScanner(bytes.NewReader(b))
	for sc.Scan() {
		f := strings.Fields(sc.Text())
		switch {
		case len(f) == 4 && f[0] == "#" && f[1] == "certified":
			v, err := strconv.ParseFloat(f[3], 64)
			if err != nil {
				t.Fatalf("certified %s: %v", f[2], err)
			}
			cert[f[2]] = v
		case len(f) == 2 && !strings.HasPrefix(f[0], "#"):
			fmt.Fprintf(&csv, "%s,%s\n", f[1], f[0]) // file rows are "y x"
		}
	}
	if len(cert) < 10 {
		t.Fatalf("read %d certified values from %s, want 10", len(cert), path)
	}
	code, out, errs := runFitCmd(t, csv.String(), "--json", "-")
	if code != ExitOK {
		t.Fatalf("exit %d: %s", code, errs)
	}
	r := decodeReport(t, out)
	if r.N != 36 {
		t.Errorf("n = %d, want 36 [%s]", r.N, src)
	}
	var ssReg, ssRes float64
	for _, row := range r.Anova {
		switch row.Source {
		case "regression":
			ssReg = row.SS
		case "residual":
			ssRes = row.SS
		}
	}
	for _, c := range []struct {
		name string
		got  float64
	}{
		{"B0", r.Intercept.Estimate},
		{"B0_sd", r.Intercept.SE},
		{"B1", r.Slope.Estimate},
		{"B1_sd", r.Slope.SE},
		{"residual_sd", r.ResidualSE},
		{"r_squared", r.RSquared},
		{"ss_regression", ssReg},
		{"ss_residual", ssRes},
		{"df_residual", r.DF},
		{"f_statistic", r.F},
	} {
		relNear(t, c.name, c.got, cert[c.name], 1e-9, src)
	}
}

// FuzzFit feeds arbitrary bytes as the CSV input: the command must not
// panic, must exit 0 or 2, and on success print valid JSON.
func FuzzFit(f *testing.F) {
	for _, name := range []string{"bom_header.csv", "semicolon_decimal_comma.csv", "blank_incomplete.csv", "quoted.csv"} {
		b, err := os.ReadFile(filepath.Join(csvDir, name))
		if err == nil {
			f.Add(b)
		}
	}
	f.Add([]byte("1;2\n2;4,1\n3;5,9\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		var out, errb bytes.Buffer
		code := Fit([]string{"--json", "-"}, bytes.NewReader(data), &out, &errb)
		switch code {
		case ExitOK:
			if !json.Valid(out.Bytes()) {
				t.Fatalf("invalid JSON for input %q", data)
			}
		case ExitUsage:
			if strings.Count(errb.String(), "\n") != 1 {
				t.Fatalf("stderr not one line: %q", errb.String())
			}
		default:
			t.Fatalf("exit %d for input %q", code, data)
		}
	})
}

func BenchmarkFitJSON(b *testing.B) {
	data, err := os.ReadFile(filepath.Join(csvDir, "columns.csv"))
	if err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		var out, errb bytes.Buffer
		if Fit([]string{"--json", "--x-col", "2", "--y-col", "4", "-"}, bytes.NewReader(data), &out, &errb) != ExitOK {
			b.Fatal(errb.String())
		}
	}
}

// TestFitHelp: --help prints the usage on stdout and succeeds (common
// practice for command-line tools).
func TestFitHelp(t *testing.T) {
	for _, arg := range []string{"--help", "-h"} {
		code, out, errs := runFitCmd(t, "", arg)
		if code != ExitOK || !strings.HasPrefix(out, "usage: pairline fit") || errs != "" {
			t.Errorf("%s: exit %d, stdout %.40q, stderr %q", arg, code, out, errs)
		}
	}
}

// TestInverseRepeatsSplitLikeTheScreen: --inverse-y splits repeats with
// session.SplitRepeats, the rule of the screen's "Use the line", so
// "6,0 6,1", "6,0;6,1" and "6,0 ; 6,1" give the same unknown (the expected
// mean of the two repeats is the statsmodels line's inverse, as in
// TestFitPredictInverse).
func TestInverseRepeatsSplitLikeTheScreen(t *testing.T) {
	var first []byte
	for _, in := range []string{"6,0;6,1", "6,0 6,1", " 6,0 ; 6,1\t"} {
		if got := session.SplitRepeats(in); len(got) != 2 {
			t.Fatalf("SplitRepeats(%q) = %q, want two repeats", in, got)
		}
		code, out, errs := runFitCmd(t, "", "--json", "--inverse-y", in, filepath.Join(csvDir, "semicolon_decimal_comma.csv"))
		if code != ExitOK {
			t.Fatalf("--inverse-y %q: exit %d: %s", in, code, errs)
		}
		r := decodeReport(t, out)
		if len(r.Inverse) != 1 {
			t.Fatalf("--inverse-y %q: %d unknowns", in, len(r.Inverse))
		}
		b, _ := json.Marshal(r.Inverse)
		if first == nil {
			first = b
		} else if string(b) != string(first) {
			t.Errorf("--inverse-y %q gives %s, want %s", in, b, first)
		}
	}
	if code, _, _ := runFitCmd(t, "", "--inverse-y", " ; ", filepath.Join(csvDir, "semicolon_decimal_comma.csv")); code == ExitOK {
		t.Error("--inverse-y with no reading was accepted")
	}
}
