package fitcore

import (
	"bufio"
	"errors"
	"math"
	"os"
	"strconv"
	"strings"
	"testing"

	"pairline/app/reftest"
)

// strdFile is a NIST StRD linear least-squares dataset with its certified
// values (`# certified NAME VALUE` lines) and `y x` data rows.
type strdFile struct {
	cert map[string]float64
	x, y []float64
}

// strdPath is path itself for a file of this repository (../testdata/…),
// else the file of the shared reference data (reftest.Path: skipped, or
// failed in CI, when missing).
func strdPath(t *testing.T, path string) string {
	if strings.HasPrefix(path, "../") {
		return path
	}
	return reftest.Path(t, strings.Split(path, "/")...)
}

func readStRD(t *testing.T, path string) strdFile {
	t.Helper()
	fh, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer fh.Close()
	d := strdFile{cert: map[string]float64{}}
	sc := bufio.NewScanner(fh)
	for sc.Scan() {
		line := strings.TrimSpace(sc.Text())
		if line == "" {
			continue
		}
		if strings.HasPrefix(line, "#") {
			f := strings.Fields(strings.TrimPrefix(line, "#"))
			if len(f) == 3 && f[0] == "certified" {
				v, err := strconv.ParseFloat(f[2], 64)
				if err != nil {
					t.Fatalf("%s: bad certified value %q", path, line)
				}
				d.cert[f[1]] = v
			}
			continue
		}
		f := strings.Fields(line)
		if len(f) != 2 {
			continue
		}
		yv, err1 := strconv.ParseFloat(f[0], 64)
		xv, err2 := strconv.ParseFloat(f[1], 64)
		if err1 != nil || err2 != nil {
			continue // the "y x" header
		}
		d.y = append(d.y, yv)
		d.x = append(d.x, xv)
	}
	if len(d.x) == 0 || len(d.cert) == 0 {
		t.Fatalf("%s: no data or no certified values", path)
	}
	return d
}

// lre is the log relative error, capped at 15 (McCullough 1998).
func lre(got, want float64) float64 {
	if got == want {
		return 15
	}
	var e float64
	if want == 0 {
		e = math.Abs(got)
	} else {
		e = math.Abs(got-want) / math.Abs(want)
	}
	return math.Min(15, -math.Log10(e))
}

// TestStRD checks every certified value of NIST StRD Norris, NoInt1 and
// NoInt2 (source: NIST/ITL Statistical Reference Datasets, linear least
// squares) to a log relative error of at least 13.
func TestStRD(t *testing.T) {
	cases := []struct {
		path   string
		origin bool
	}{
		{"../testdata/strd/Norris.txt", false},
		{"strd/Norris.txt", false},
		{"strd/NoInt1.txt", true},
		{"strd/NoInt2.txt", true},
	}
	for _, c := range cases {
		t.Run(c.path, func(t *testing.T) {
			d := readStRD(t, strdPath(t, c.path))
			opt := Options{SkipAdvice: true}
			if c.origin {
				opt.Model = ModelOrigin
			}
			rep, err := Analyze(d.x, d.y, opt)
			if err != nil {
				t.Fatal(err)
			}
			got := map[string]float64{
				"B0": rep.Intercept.Estimate, "B0_sd": rep.Intercept.SE,
				"B1": rep.Slope.Estimate, "B1_sd": rep.Slope.SE,
				"residual_sd": rep.ResidualSE, "r_squared": rep.RSquared,
				"ss_regression": rep.Anova[0].SS, "ss_residual": rep.Anova[1].SS,
				"df_residual": rep.DF, "f_statistic": rep.F,
			}
			for name, want := range d.cert {
				g, ok := got[name]
				if !ok {
					t.Errorf("certified value %s not checked", name)
					continue
				}
				l := lre(g, want)
				t.Logf("%-14s got %.15g certified %.15g LRE %.1f", name, g, want, l)
				if l < 13 {
					t.Errorf("%s: got %.15g, certified %.15g, LRE %.2f < 13", name, g, want, l)
				}
			}
		})
	}
}

// TestNorrisShifted adds 1.7e9 to Norris x (x as Unix timestamps): the
// slope must keep LRE ≥ 11 against the NIST certified value.
func TestNorrisShifted(t *testing.T) {
	d := readStRD(t, "../testdata/strd/Norris.txt")
	xs := make([]float64, len(d.x))
	for i, v := range d.x {
		xs[i] = v + 1.7e9
	}
	rep, err := Analyze(xs, d.y, Options{SkipAdvice: true})
	if err != nil {
		t.Fatal(err)
	}
	l := lre(rep.Slope.Estimate, d.cert["B1"])
	t.Logf("slope %.15g LRE %.2f", rep.Slope.Estimate, l)
	if l < 11 {
		t.Errorf("shifted Norris slope LRE %.2f < 11", l)
	}
}

func TestErrors(t *testing.T) {
	cases := []struct {
		name string
		x, y []float64
		opt  Options
		want error
	}{
		{"two points", []float64{1, 2}, []float64{1, 2}, Options{}, ErrTooFewPoints},
		{"lengths", []float64{1, 2, 3}, []float64{1, 2}, Options{}, ErrLengthMismatch},
		{"x equal", []float64{2, 2, 2}, []float64{1, 2, 3}, Options{}, ErrNoSpreadInX},
		{"y equal", []float64{1, 2, 3}, []float64{5, 5, 5}, Options{}, ErrNoSpreadInY},
		{"NaN", []float64{1, math.NaN(), 3}, []float64{1, 2, 3}, Options{}, ErrNotFinite},
		{"Inf", []float64{1, 2, 3}, []float64{1, math.Inf(1), 3}, Options{}, ErrNotFinite},
		{"bad weight", []float64{1, 2, 3}, []float64{1, 2, 4}, Options{Weights: WeightsGiven, GivenWeights: []float64{1, 0, 1}}, ErrBadWeight},
		{"weights 1/x at 0", []float64{0, 2, 3}, []float64{1, 2, 4}, Options{Weights: WeightsX}, ErrBadWeight},
		{"log of negative", []float64{1, 2, 3}, []float64{1, -2, 4}, Options{Transform: TransformLogY}, ErrTransformDomain},
		{"level", []float64{1, 2, 3}, []float64{1, 2, 4}, Options{Level: 1.5}, ErrBadOption},
		{"no repeats", []float64{1, 1, 2, 3}, []float64{1, 2, 4, 5}, Options{Weights: WeightsRepeats}, ErrNoRepeats},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			c.opt.SkipAdvice = true
			rep, err := Analyze(c.x, c.y, c.opt)
			if !errors.Is(err, c.want) {
				t.Fatalf("got %v, want %v", err, c.want)
			}
			if rep != nil {
				t.Errorf("report returned with error")
			}
			if err.Error() == "" {
				t.Error("empty message")
			}
		})
	}
	var de *DataError
	_, err := Analyze([]float64{1, 2, math.NaN()}, []float64{1, 2, 3}, Options{})
	if !errors.As(err, &de) || de.Index != 2 || de.Column != "x" {
		t.Fatalf("want *DataError at index 2, got %#v", err)
	}
	if !strings.Contains(err.Error(), "pair 3") {
		t.Errorf("message should number the pair from 1: %q", err)
	}
}

// TestStRDScaled: NIST StRD Norris and NoInt1 with x and y multiplied by
// powers of two (up to 2^±450 ≈ 3e±135, inside MaxMagnitude, where the fit
// runs on internally rescaled values) still meet every certified value,
// each scaled by the power of two its units call for (B1 by 2^(ey−ex), B0
// and residual_sd by 2^ey, sums of squares by 2^(2ey)), to an LRE of 12.
func TestStRDScaled(t *testing.T) {
	for _, c := range []struct {
		path   string
		origin bool
	}{{"../testdata/strd/Norris.txt", false}, {"strd/NoInt1.txt", true}} {
		d := readStRD(t, strdPath(t, c.path))
		for _, e := range [][2]int{{300, 300}, {-300, -300}, {450, -200}, {-150, 300}, {-100, 400}} {
			ex, ey := e[0], e[1]
			x, y := make([]float64, len(d.x)), make([]float64, len(d.y))
			for i := range x {
				x[i], y[i] = math.Ldexp(d.x[i], ex), math.Ldexp(d.y[i], ey)
			}
			opt := Options{SkipAdvice: true}
			if c.origin {
				opt.Model = ModelOrigin
			}
			rep, err := Analyze(x, y, opt)
			if err != nil {
				t.Fatalf("%s 2^%d, 2^%d: %v", c.path, ex, ey, err)
			}
			got := map[string]float64{
				"B0": math.Ldexp(rep.Intercept.Estimate, -ey), "B0_sd": math.Ldexp(rep.Intercept.SE, -ey),
				"B1": math.Ldexp(rep.Slope.Estimate, ex-ey), "B1_sd": math.Ldexp(rep.Slope.SE, ex-ey),
				"residual_sd": math.Ldexp(rep.ResidualSE, -ey), "r_squared": rep.RSquared,
				"ss_regression": math.Ldexp(rep.Anova[0].SS, -2*ey), "ss_residual": math.Ldexp(rep.Anova[1].SS, -2*ey),
				"df_residual": rep.DF, "f_statistic": rep.F,
			}
			for name, want := range d.cert {
				if l := lre(got[name], want); l < 12 {
					t.Errorf("%s 2^%d, 2^%d: %s = %.15g, certified %.15g, LRE %.2f < 12", c.path, ex, ey, name, got[name], want, l)
				}
			}
		}
	}
}
