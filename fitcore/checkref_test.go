package fitcore

import (
	"bufio"
	"encoding/json"
	"math"
	"os"
	"strconv"
	"strings"
	"sync"
	"testing"

	"pairline/app/reftest"
)

// Reference values for the assumption checks: testdata/golden/checks.json,
// written by testdata/refgen/checks_ref.py with Debian's python3-statsmodels
// and python3-scipy (versions recorded in the file). NIST data sets are read
// from ../shared/reference (NIST/ITL StRD and the NIST/SEMATECH
// e-Handbook of Statistical Methods); the invented synthetic sets carry their
// values in the JSON.

const refChecksPath = "../testdata/golden/checks.json"

type refNum = *float64 // null in the JSON (NaN/Inf in the reference) → nil

type refCase struct {
	Name     string    `json:"name"`
	Origin   bool      `json:"origin"`
	Weighted bool      `json:"weighted"`
	N        int       `json:"n"`
	ResidSS  float64   `json:"resid_ss"`
	X        []float64 `json:"x"`
	Y        []float64 `json:"y"`
	W        []float64 `json:"w"`
	Source   *struct {
		File   string `json:"file"`
		Reader string `json:"reader"`
		XCol   int    `json:"x_col"`
		YCol   int    `json:"y_col"`
	} `json:"source"`
	Curvature *struct {
		T, P, DF float64
	} `json:"curvature"`
	LackOfFit *struct {
		F     float64 `json:"f"`
		P     float64 `json:"p"`
		DFLOF float64 `json:"df_lof"`
		DFPE  float64 `json:"df_pe"`
	} `json:"lack_of_fit"`
	BreuschPagan struct{ LM, P float64 }  `json:"breusch_pagan"`
	White        *struct{ LM, P float64 } `json:"white"`
	DurbinWatson struct {
		D, Mean, Var, P float64
	} `json:"durbin_watson"`
	Runs struct {
		Z, P       float64
		Runs       int  `json:"runs"`
		Comparable bool `json:"comparable"`
	} `json:"runs"`
	Shapiro   struct{ W, P float64 } `json:"shapiro"`
	Influence struct {
		Leverage    []refNum `json:"leverage"`
		Studentized []refNum `json:"studentized"`
		Cooks       []refNum `json:"cooks"`
		DFFITS      []refNum `json:"dffits"`
		BonfP       []refNum `json:"bonf_p"`
	} `json:"influence"`
}

type refShapiro struct {
	Name string    `json:"name"`
	X    []float64 `json:"x"`
	W    float64   `json:"w"`
	P    float64   `json:"p"`
}

type refXExact struct {
	Name        string    `json:"name"`
	X           []float64 `json:"x"`
	Y           []float64 `json:"y"`
	XU          float64   `json:"xu"`
	YU          float64   `json:"yu"`
	OLSSlope    float64   `json:"ols_slope"`
	OLSSE       float64   `json:"ols_se"`
	DemingSlope float64   `json:"deming_slope"`
	Z           float64   `json:"z"`
}

type refChecks struct {
	Versions map[string]string `json:"versions"`
	Cases    []refCase         `json:"cases"`
	Shapiro  []refShapiro      `json:"shapiro"`
	XExact   []refXExact       `json:"xexact"`
}

var (
	refOnce sync.Once
	refData refChecks
	refErr  error
)

// loadRef reads checks.json once and fills in the data of the NIST cases
// from ../shared/reference. NIST cases whose file is missing keep X = nil;
// refCases skips them with a visible message.
func loadRef(t testing.TB) *refChecks {
	t.Helper()
	refOnce.Do(func() {
		var b []byte
		b, refErr = os.ReadFile(refChecksPath)
		if refErr != nil {
			return
		}
		refErr = json.Unmarshal(b, &refData)
		if refErr != nil {
			return
		}
		for i := range refData.Cases {
			c := &refData.Cases[i]
			if c.Source == nil {
				continue
			}
			x, y, err := readRefColumns(reftest.Find(c.Source.File), c.Source.Reader, c.Source.XCol, c.Source.YCol)
			if err == nil && len(x) == c.N {
				c.X, c.Y = x, y
			}
		}
	})
	if refErr != nil {
		t.Fatalf("reading %s (run /usr/bin/python3 testdata/refgen/checks_ref.py): %v", refChecksPath, refErr)
	}
	return &refData
}

// refCases returns the usable cases, logging a skip for NIST cases whose
// file is absent.
func refCases(t *testing.T) []refCase {
	t.Helper()
	var out []refCase
	for _, c := range loadRef(t).Cases {
		if c.X == nil {
			reftest.Note(t, c.Name, reftest.Find(c.Source.File))
			continue
		}
		out = append(out, c)
	}
	if len(out) == 0 {
		reftest.Skip(t, reftest.Find())
	}
	return out
}

// readRefColumns reads two columns of a NIST file: "strd" files have '#'
// comment lines; "dataplot" files start their numbers after a line of dashes.
func readRefColumns(path, reader string, xc, yc int) (x, y []float64, err error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, nil, err
	}
	defer f.Close()
	sc := bufio.NewScanner(f)
	started := reader == "strd"
	for sc.Scan() {
		s := strings.TrimSpace(sc.Text())
		if !started {
			started = strings.HasPrefix(s, "---")
			continue
		}
		if s == "" || strings.HasPrefix(s, "#") {
			continue
		}
		fs := strings.Fields(s)
		xv, err1 := strconv.ParseFloat(fs[xc], 64)
		yv, err2 := strconv.ParseFloat(fs[yc], 64)
		if err1 != nil || err2 != nil {
			return nil, nil, err1
		}
		x, y = append(x, xv), append(y, yv)
	}
	return x, y, sc.Err()
}

// refResid fits the case's line with ckLine and checks that the residual sum
// of squares matches statsmodels' (so both sides test the same residuals).
func refResid(t *testing.T, c refCase) []float64 {
	t.Helper()
	_, _, r, ok := ckLine(c.X, c.Y, c.W, c.Origin)
	if !ok {
		t.Fatalf("%s: line fit failed", c.Name)
	}
	var ss float64
	for _, v := range r {
		ss += v * v
	}
	if !refClose(ss, c.ResidSS, 1e-9, 1e-20) {
		t.Fatalf("%s: residual SS %.15g, statsmodels %.15g", c.Name, ss, c.ResidSS)
	}
	return r
}

// refClose reports |got − want| ≤ abs + rel·|want|.
func refClose(got, want, rel, abs float64) bool {
	return math.Abs(got-want) <= abs+rel*math.Abs(want)
}

func refCheck(t *testing.T, what string, got, want, rel, abs float64) {
	t.Helper()
	if !refClose(got, want, rel, abs) {
		t.Errorf("%s = %.15g, reference %.15g (rel tol %g, abs tol %g)", what, got, want, rel, abs)
	}
}

// assertFiniteCheck fails when a check lets NaN/Inf through or has no verdict.
func assertFiniteCheck(t testing.TB, c Check) {
	t.Helper()
	for _, v := range []float64{c.Statistic, c.P, c.DF, c.DF2} {
		if !ckFinite(v) {
			t.Fatalf("%s: non-finite value in %+v", c.Name, c)
		}
	}
	if c.P < 0 || c.P > 1 {
		t.Fatalf("%s: p outside [0,1]: %+v", c.Name, c)
	}
	switch c.Verdict {
	case Pass, Warn, Fail, NA:
	default:
		t.Fatalf("%s: bad verdict %q", c.Name, c.Verdict)
	}
	if c.Message == "" {
		t.Fatalf("%s: empty message", c.Name)
	}
}
