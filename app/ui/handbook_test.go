package ui

import (
	"os"
	"strings"
	"testing"
	"time"

	"pairline/app/reftest"
	"pairline/app/session"
	"pairline/app/wording"
	"pairline/fitcore"
)

// handbookSession reads a NIST e-Handbook Dataplot file (free text, a line
// of dashes, then rows of numbers) into a session, x from column cx and y
// from column cy, keeping the numbers' text as written. It skips visibly
// when the reference files are not beside the repository.
func handbookSession(t *testing.T, name string, cx, cy int) *session.Session {
	t.Helper()
	b, err := os.ReadFile(reftest.Path(t, "nist-handbook", name))
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.ReplaceAll(string(b), "\r", ""), "\n")
	start := 0
	for i, ln := range lines {
		if s := strings.TrimSpace(ln); len(s) >= 3 && strings.Trim(s, "-") == "" {
			start = i + 1
		}
	}
	now := time.Date(2026, 8, 1, 9, 0, 0, 0, time.UTC)
	s, err := session.New("NIST e-Handbook "+name, now, nil)
	if err != nil {
		t.Fatal(err)
	}
	for _, ln := range lines[start:] {
		f := strings.Fields(ln)
		if len(f) > max(cx, cy) {
			s.AddRow(f[cx], f[cy], now)
		}
	}
	return s
}

// TestHandbookAlaskaReport: NIST e-Handbook §4.6.3 (Alaska pipeline,
// ALASKA_PIPELINE.DAT: field defect size y against lab size x) finds the
// scatter growing with size. What the plots and the report show of it are
// fitcore's verdicts and advice, and the diagnosis is the handbook's.
func TestHandbookAlaskaReport(t *testing.T) {
	const src = "NIST e-Handbook 4.6.3, ALASKA_PIPELINE.DAT"
	s := handbookSession(t, "ALASKA_PIPELINE.DAT", 1, 0)
	rep, rows := analyzed(t, s)
	if rep.N != 107 {
		t.Fatalf("n = %d, the handbook file has 107 pairs [%s]", rep.N, src)
	}
	if v := rep.Assumptions.Spread.Verdict; v == fitcore.Pass || v == fitcore.NA {
		t.Errorf("spread %s, want warn or fail: the scatter grows with size [%s]", v, src)
	}
	ps := plBuild(s, rep, rows, -1)
	if got := len(ps.Marks["plot-fit"]); got != 107 || !strings.Contains(ps.Fit, `data-count="107"`) {
		t.Errorf("the fit plot draws %d readings, want 107 [%s]", got, src)
	}
	if !strings.Contains(ps.ResSum, plVerdictOf(wording.CheckSpread, rep.Assumptions.Spread.Verdict)) {
		t.Errorf("the residual plot's summary does not give fitcore's spread verdict: %s", ps.ResSum)
	}
	body := rpBody(s, rep, rows, "", time.Now())
	row := `<th scope="row">` + wording.CheckSpread + `</th><td>` + rpVerdict(rep.Assumptions.Spread.Verdict) + `</td>`
	if !strings.Contains(body, row) {
		t.Errorf("the report's spread row is not fitcore's verdict %s [%s]", rep.Assumptions.Spread.Verdict, src)
	}
	if !strings.Contains(body, `data-transform="`+string(rep.Advice.Remedy)+`"`) {
		t.Errorf("the report's advice is not fitcore's %s [%s]", rep.Advice.Remedy, src)
	}
	t.Logf("%s: spread %s, advice %s", src, rep.Assumptions.Spread.Verdict, rep.Advice.Remedy)
}
