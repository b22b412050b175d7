//go:build e2e

package e2e

import (
	"bytes"
	"fmt"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/chromedp"

	"pairline/app/demo"
	"pairline/app/numfmt"
)

// TestReport: the report of each demo session carries fitcore's figures and
// verdicts, prints to PDF through Chromium, and saves as one HTML file that
// needs nothing else (opened offline from disk it shows the same report).
func TestReport(t *testing.T) {
	srv := startServer(t)
	b := newBrowser(t, tablet)
	fuDemo(t, b, srv)
	ss, reps := fuReports(t)

	for i, s := range ss {
		rep := reps[i]
		fuOpenTitled(t, b, s.Title)
		start := time.Now()
		click(t, b, "report-open")
		waitFor(t, b, "the report", `!!tid("report", ' @plot-qq')`, 20*time.Second)
		t.Logf("%s: report open in %v", s.Title, time.Since(start).Round(time.Millisecond))
		html := eval[string](t, b, `tid("report").outerHTML`)
		for _, v := range []float64{rep.Slope.Estimate, rep.Intercept.Estimate, rep.RSquared, rep.ResidualSE, rep.Slope.SE} {
			if !strings.Contains(html, `data-value="`+numfmt.Full(v)+`"`) {
				t.Errorf("%s: the report does not show fitcore's %v", s.Title, v)
			}
		}
		if got := attr(t, b, "report-advice", "data-transform"); got != string(rep.Advice.Remedy) {
			t.Errorf("%s: report advice %q, fitcore %q", s.Title, got, rep.Advice.Remedy)
		}
		want := "none"
		if rep.Acceptance != nil {
			want = map[bool]string{true: "pass", false: "fail"}[rep.Acceptance.Pass]
		}
		if got := attr(t, b, "report-verdict", "data-verdict"); got != want {
			t.Errorf("%s: report verdict %q, want %q", s.Title, got, want)
		}
		if i == 0 {
			screenshot(t, b, "report-tablet-demo-a")
		}
		click(t, b, "report-close")
		waitFor(t, b, "the report closed", `!tid("report")`, 10*time.Second)
	}

	// Print demo C (the decimal slip, left out with its reason) to PDF.
	fuOpenTitled(t, b, demo.Titles[2])
	eval[bool](t, b, fmt.Sprintf(`(tid("plot-fit", ' [data-row="%d"]').dispatchEvent(new MouseEvent('click', {bubbles: true})), true)`, demo.MistypedRow))
	waitFor(t, b, "the reading panel", `!!tid("plot-point-reason")`, 10*time.Second)
	b.do(t, chromedp.SendKeys(sel("plot-point-reason"), "decimal point slipped"))
	click(t, b, "plot-point-exclude")
	waitFor(t, b, "the reading left out", `!!tid("plot-fit", ' .pl-pt-excl')`, 10*time.Second)
	click(t, b, "report-open")
	waitFor(t, b, "the report", `!!tid("report", ' @plot-qq')`, 20*time.Second)
	if !strings.Contains(eval[string](t, b, `document.querySelector('.pl-report-readings').textContent`), "Left out: decimal point slipped") {
		t.Error("the report's readings do not mark the left-out reading with its reason")
	}
	pdf, err := chromedp.Run(b.ctx, chromedp.PrintToPDF(chromedp.PDFPaper(chromedp.PaperA4), chromedp.PDFPrintBackground()))
	if err != nil {
		t.Fatalf("printing the report to PDF: %v", err)
	}
	pages := len(regexp.MustCompile(`/Type\s*/Page[^s]`).FindAll(pdf, -1))
	t.Logf("PDF: %d bytes, %d pages", len(pdf), pages)
	if !bytes.HasPrefix(pdf, []byte("%PDF-")) {
		t.Fatalf("the print is not a PDF (starts %q)", pdf[:min(8, len(pdf))])
	}
	if pages < 2 && len(pdf) < 20000 {
		t.Errorf("the PDF has %d page(s) and %d bytes: the report did not print", pages, len(pdf))
	}
	dir := artifactDir(t)
	if err := os.WriteFile(filepath.Join(dir, "report-demo-c.pdf"), pdf, 0o644); err != nil {
		t.Fatal(err)
	}
	t.Logf("PDF: %s", filepath.Join(dir, "report-demo-c.pdf"))

	// Save as HTML: one file, nothing remote, the same report.
	eval[bool](t, b, captureDownloads)
	click(t, b, "report-save-html")
	name, raw := lastDownload(t, b, 1)
	if !strings.HasSuffix(name, ".html") {
		t.Errorf("saved as %q, want an .html name", name)
	}
	file := string(raw)
	for _, bad := range []string{"<script", "<link", " src=", "https://", "@import"} {
		if strings.Contains(file, bad) {
			t.Errorf("the saved report holds %q", bad)
		}
	}
	if n := strings.Count(file, "<svg "); n != 4 {
		t.Errorf("the saved report holds %d plots, want 4", n)
	}
	path := filepath.Join(dir, "report-demo-c.html")
	if err := os.WriteFile(path, raw, 0o644); err != nil {
		t.Fatal(err)
	}
	// Open the file from disk, with no server: it must look like the report.
	fb := newBrowser(t, tablet)
	fb.do(t, chromedp.Navigate("file://"+path))
	waitFor(t, fb, "the saved report", `!!tid("report", ' @plot-fit')`, 20*time.Second)
	if bg := eval[string](t, fb, `getComputedStyle(document.querySelector('.pl-report')).backgroundColor`); bg != "rgb(255, 255, 255)" {
		t.Errorf("the saved report is not styled (background %s): its stylesheet is missing", bg)
	}
	screenshot(t, fb, "report-saved-file")
	if bad := fb.foreign("file://"); len(bad) > 0 {
		t.Errorf("the saved report asked for %v", bad)
	}
}
