package cli

import (
	"bufio"
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"runtime"
	"strconv"
	"strings"
	"testing"
	"time"

	"pairline/app/session"
	"pairline/fitcore"
)

// bigSessions are four invented sessions (fictional Larkwater Valley Water
// Board) of n readings each: y ≈ 0.98x + 0.3 with a scatter that grows with
// x, so the spread check warns and the advice and the Box–Cox profile run.
func bigSessions(tb testing.TB, n int) []*session.Session {
	tb.Helper()
	var out []*session.Session
	seed := uint64(12345)
	t0 := time.Date(2026, 3, 1, 9, 0, 0, 0, time.UTC)
	for k := 0; k < 4; k++ {
		s, err := session.New(fmt.Sprintf("Invented load test %d (Larkwater Valley Water Board)", k+1), t0,
			bytes.NewReader(bytes.Repeat([]byte{byte(k + 1)}, 64)))
		if err != nil {
			tb.Fatal(err)
		}
		s.Readings = make([]session.Reading, n)
		for i := range s.Readings {
			seed = seed*6364136223846793005 + 1442695040888963407
			u := float64(seed>>11)/(1<<53) - 0.5
			x := 1 + float64(i%500)
			y := 0.98*x + 0.3 + u*0.05*x
			s.Readings[i] = session.Reading{X: strconv.FormatFloat(x, 'f', 2, 64),
				Y: strconv.FormatFloat(y, 'f', 3, 64), Taken: t0.Add(time.Duration(i) * time.Second)}
		}
		out = append(out, s)
	}
	return out
}

// BenchmarkInspectBig: inspect of four sessions of 250,000 readings (about
// 66 MB), text and JSON. It reports allocations; it asserts nothing.
func BenchmarkInspectBig(b *testing.B) {
	path := writeSessionFile(&testing.T{}, b.TempDir(), "big.pairline", bigSessions(b, session.MaxReadings))
	for _, mode := range [][]string{{path}, {"--json", path}} {
		b.Run(fmt.Sprint(len(mode)), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if code := Inspect(mode, io.Discard, io.Discard); code != ExitOK {
					b.Fatal(code)
				}
			}
		})
	}
}

// TestInspectMemoryBound: inspect of a session file of empty readings (the
// cheapest bytes per reading a file can hold) allocates within a small
// multiple of what decoding the file allocates (measured 4.7×; most of it is
// session.PairCache growing its cell table one append at a time).
func TestInspectMemoryBound(t *testing.T) {
	if testing.Short() {
		t.Skip("builds a file of 200,000 readings")
	}
	ss := bigSessions(t, 50_000)
	for _, s := range ss {
		for i := range s.Readings {
			s.Readings[i] = session.Reading{}
		}
	}
	path := writeSessionFile(t, t.TempDir(), "empty.pairline", ss)
	alloc := func(f func()) uint64 {
		var a, b runtime.MemStats
		runtime.GC()
		runtime.ReadMemStats(&a)
		f()
		runtime.ReadMemStats(&b)
		return b.TotalAlloc - a.TotalAlloc
	}
	dec := alloc(func() {
		if _, err := openSessionFile(path); err != nil {
			t.Fatal(err)
		}
	})
	got := alloc(func() {
		if code := Inspect([]string{path}, io.Discard, io.Discard); code != ExitOK {
			t.Fatal(code)
		}
	})
	st, _ := os.Stat(path)
	t.Logf("file %d bytes, decode %d bytes allocated, inspect %d", st.Size(), dec, got)
	if got > 6*dec {
		t.Errorf("inspect allocated %d bytes, more than 6× the %d of decoding %s", got, dec, filepath.Base(path))
	}
}

// writeBigCSV writes n invented readings (fictional Larkwater Valley Water
// Board, a conductivity probe against standards) to dir/big.csv: x from 1
// to 500, y ≈ 0.98x + 0.3 with a scatter that grows with x, about 24 bytes a
// row. It returns the path and the numbers as written.
func writeBigCSV(tb testing.TB, dir string, n int) (string, []float64, []float64) {
	tb.Helper()
	x, y := make([]float64, n), make([]float64, n)
	b := []byte("standard_uS_cm,probe_uS_cm\n")
	seed := uint64(20261202)
	next := func() float64 {
		seed = seed*6364136223846793005 + 1442695040888963407
		return float64(seed>>11) / (1 << 53)
	}
	for i := range x {
		xi := 1 + 499*next()
		yi := 0.98*xi + 0.3 + (next()-0.5)*0.035*xi
		b = strconv.AppendFloat(b, xi, 'f', 6, 64)
		b = append(b, ',')
		b = strconv.AppendFloat(b, yi, 'f', 7, 64)
		b = append(b, '\n')
		// The numbers as the file holds them.
		x[i], _ = strconv.ParseFloat(strconv.FormatFloat(xi, 'f', 6, 64), 64)
		y[i], _ = strconv.ParseFloat(strconv.FormatFloat(yi, 'f', 7, 64), 64)
	}
	path := filepath.Join(dir, "big.csv")
	if err := os.WriteFile(path, b, 0o644); err != nil {
		tb.Fatal(err)
	}
	return path, x, y
}

// BenchmarkFitBig: `pairline fit` (text report, default options) on a
// million rows; it reports allocations and asserts nothing.
func BenchmarkFitBig(b *testing.B) {
	path, _, _ := writeBigCSV(b, b.TempDir(), 1_000_000)
	b.ReportAllocs()
	for b.Loop() {
		if code := Fit([]string{path}, nil, io.Discard, io.Discard); code != ExitOK {
			b.Fatal(code)
		}
	}
}

// BenchmarkFitBigNoAdvice: `pairline fit --no-advice` (the line and its
// checks, no remedy tried: the work of the pandas + statsmodels script
// `make bench-fit` times beside it) on a million rows; it asserts nothing.
func BenchmarkFitBigNoAdvice(b *testing.B) {
	path, _, _ := writeBigCSV(b, b.TempDir(), 1_000_000)
	b.ReportAllocs()
	for b.Loop() {
		if code := Fit([]string{"--no-advice", path}, nil, io.Discard, io.Discard); code != ExitOK {
			b.Fatal(code)
		}
	}
}

// BenchmarkFitBigJSON: `pairline fit --json` (default options) on a
// million rows, the JSON written to nowhere; it asserts nothing.
func BenchmarkFitBigJSON(b *testing.B) {
	path, _, _ := writeBigCSV(b, b.TempDir(), 1_000_000)
	b.ReportAllocs()
	for b.Loop() {
		if code := Fit([]string{"--json", path}, nil, io.Discard, io.Discard); code != ExitOK {
			b.Fatal(code)
		}
	}
}

// TestFitBigFileEqualsAnalyze: `pairline fit --json` on a file of more rows
// than a session holds gives the report fitcore.Analyze gives on the same
// numbers (parsed here with strconv.ParseFloat, the reference for plain
// decimal text), byte for byte.
func TestFitBigFileEqualsAnalyze(t *testing.T) {
	if testing.Short() {
		t.Skip("fits 300,000 rows twice")
	}
	n := session.MaxReadings + 50_000
	path, x, y := writeBigCSV(t, t.TempDir(), n)
	var out, errOut bytes.Buffer
	if code := Fit([]string{"--json", "--predict-x", "250", path}, nil, &out, &errOut); code != ExitOK {
		t.Fatalf("exit %d: %s", code, errOut.String())
	}
	ff, err := parseFitFlags([]string{"--predict-x", "250", path})
	if err != nil {
		t.Fatal(err)
	}
	opt, err := ff.options()
	if err != nil {
		t.Fatal(err)
	}
	opt.PredictX = []float64{250}
	rep, err := fitcore.Analyze(x, y, opt)
	if err != nil {
		t.Fatal(err)
	}
	var want bytes.Buffer
	bw := bufio.NewWriter(&want)
	if err := writeJSONIndented(bw, rep, "", "  "); err != nil {
		t.Fatal(err)
	}
	bw.WriteString("\n")
	bw.Flush()
	if rep.N != n || !bytes.Equal(out.Bytes(), want.Bytes()) {
		t.Errorf("n = %d; the report of fit (%d bytes) differs from Analyze's (%d bytes)", rep.N, out.Len(), want.Len())
	}
}

// TestFitStdinPipe: standard input that cannot seek (a pipe) is kept in a
// temporary file for the second pass and gives the report of the same text
// from a file; the temporary file is removed.
func TestFitStdinPipe(t *testing.T) {
	// Invented readings (Larkwater Valley Water Board).
	csv := "standard;reading\n1;1,02\n2;2,01\n3;3,05\n4;3,98\n5;5,03\n\n6;\n"
	t.Setenv("TMPDIR", t.TempDir())
	var seek, pipe, errOut bytes.Buffer
	if code := Fit([]string{"--json", "-"}, strings.NewReader(csv), &seek, &errOut); code != ExitOK {
		t.Fatalf("seekable: exit %d: %s", code, errOut.String())
	}
	if code := Fit([]string{"--json", "-"}, struct{ io.Reader }{strings.NewReader(csv)}, &pipe, &errOut); code != ExitOK {
		t.Fatalf("pipe: exit %d: %s", code, errOut.String())
	}
	if !bytes.Equal(seek.Bytes(), pipe.Bytes()) {
		t.Errorf("the pipe gave\n%s\nthe seekable reader\n%s", pipe.String(), seek.String())
	}
	if left, _ := os.ReadDir(os.Getenv("TMPDIR")); len(left) != 0 {
		t.Errorf("%d temporary file(s) left behind", len(left))
	}
}

// TestFitNoAdvice: `pairline fit --no-advice` gives the report
// fitcore.Analyze gives with SkipAdvice (the line and every check; no
// advice and no Box–Cox power), its checks are those of the full report,
// and the text says the advice was not worked out instead of naming a
// remedy. The readings (invented, writeBigCSV) scatter more at larger x,
// so the full report does advise a remedy.
func TestFitNoAdvice(t *testing.T) {
	path, x, y := writeBigCSV(t, t.TempDir(), 3000)
	run := func(args ...string) string {
		t.Helper()
		var out, errOut bytes.Buffer
		if code := Fit(append(args, path), nil, &out, &errOut); code != ExitOK {
			t.Fatalf("fit %v: exit %d: %s", args, code, errOut.String())
		}
		return out.String()
	}
	var got fitcore.Report
	if err := json.Unmarshal([]byte(run("--no-advice", "--json")), &got); err != nil {
		t.Fatal(err)
	}
	want, err := fitcore.Analyze(x, y, fitcore.Options{SkipAdvice: true})
	if err != nil {
		t.Fatal(err)
	}
	full, err := fitcore.Analyze(x, y, fitcore.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if full.Advice == nil || full.Advice.Remedy == fitcore.RemedyNone {
		t.Fatalf("the full report advises no remedy for these readings: the test needs one")
	}
	if got.Advice != nil || got.BoxCox != nil {
		t.Errorf("--no-advice: advice %+v, Box–Cox %+v; want neither", got.Advice, got.BoxCox)
	}
	if got.Slope != want.Slope || got.Intercept != want.Intercept || got.N != want.N {
		t.Errorf("--no-advice line %+v %+v (n %d), Analyze's %+v %+v (n %d)", got.Slope, got.Intercept, got.N, want.Slope, want.Intercept, want.N)
	}
	for _, info := range fitcore.CheckList() {
		g, w, f := info.Get(&got), info.Get(want), info.Get(full)
		if (g == nil) != (w == nil) || g != nil && (g.Verdict != w.Verdict || g.Message != w.Message || g.Verdict != f.Verdict || g.Message != f.Message) {
			t.Errorf("check %s: --no-advice %+v; Analyze with SkipAdvice %+v; full %+v", info.ID, g, w, f)
		}
	}
	text := run("--no-advice")
	if !strings.Contains(text, "Advice: not worked out (--no-advice)") || strings.Contains(text, "tried ") {
		t.Errorf("--no-advice text does not say the advice was not worked out, or names remedies tried:\n%s", text)
	}
	if text := run(); !strings.Contains(text, "Advice: ") || strings.Contains(text, "not worked out") {
		t.Errorf("the text without --no-advice has no advice:\n%s", text)
	}
}
