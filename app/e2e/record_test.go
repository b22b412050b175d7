//go:build e2e

package e2e

import (
	"bytes"
	"encoding/json"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/chromedp"

	"pairline/app/numfmt"
	"pairline/app/session"
	"pairline/fitcore"
)

// Invented calibration of a conductivity probe of the fictional Larkwater
// Valley Water Board against six standards (µS/cm); the readings are made
// up for the test.
var recPairs = [][2]string{
	{"100", "103.1"}, {"250", "256.2"}, {"500", "508.9"}, {"1000", "1013.8"}, {"1413", "1430.1"}, {"2000", "2021.7"},
	{"2500", "2528.0"},
}

const (
	recUnknown     = "Tap 3 (invented)"
	recUnknownRead = "612.0 614.5"
)

// recExpected is fitcore's conversion of the unknown, computed here from
// the same readings and standards through the session's own reading of
// them (session.RecordOptions), for the browser's figures to match.
func recExpected(t *testing.T) fitcore.Inverse {
	t.Helper()
	s, err := session.New("expected", time.Now(), nil)
	if err != nil {
		t.Fatal(err)
	}
	now := time.Now()
	for _, p := range recPairs {
		s.AddRow(p[0], p[1], now)
	}
	for _, st := range []session.Standard{
		{Name: "KCl 500 (invented)", Certificate: "LV-CRM-0500", Value: "500", Uncertainty: "2.5", Expiry: time.Date(2099, 12, 31, 0, 0, 0, 0, time.UTC)},
		{Name: "KCl 1413 (invented)", Certificate: "LV-CRM-1413", Value: "1413", Uncertainty: "5", Expiry: time.Date(2020, 1, 31, 0, 0, 0, 0, time.UTC)},
	} {
		if _, err := s.AddStandard(st, now); err != nil {
			t.Fatal(err)
		}
	}
	if _, err := s.AddUnknown(session.Unknown{Name: recUnknown, Readings: strings.Fields(recUnknownRead)}, now); err != nil {
		t.Fatal(err)
	}
	x, y, _, _ := s.Pairs()
	opt, _, _ := s.RecordOptions(x)
	rep, err := fitcore.Analyze(x, y, opt)
	if err != nil {
		t.Fatal(err)
	}
	if len(rep.Inverse) != 1 || !rep.Inverse[0].Bounded {
		t.Fatalf("fitcore gives %d conversions (%+v), want one bounded", len(rep.Inverse), rep.Inverse)
	}
	return rep.Inverse[0]
}

// inItem sets a field inside the list item of the card (standard-item with
// data-index i) and fires its change event.
func inItem(t *testing.T, b *browser, item string, i int, field, value string) {
	t.Helper()
	eval[bool](t, b, fmt.Sprintf(`(() => { const el = tid(%q, "[data-index='%d'] @%s"); if (!el) throw new Error('no %s in %s %d');
		el.value = %q; el.dispatchEvent(new Event('change', { bubbles: true })); return true; })()`, item, i, field, field, item, i, value))
}

// onScreen says whether the element is wholly inside the viewport.
func onScreen(t *testing.T, b *browser, testid string) bool {
	t.Helper()
	return eval[bool](t, b, fmt.Sprintf(`(() => { const r = tid(%q).getBoundingClientRect();
		return r.width > 0 && r.top >= 0 && r.left >= 0 && r.bottom <= innerHeight && r.right <= innerWidth; })()`, testid))
}

// TestRecord follows one calibration record on a tablet and on a phone:
// the identity card (with conditions) and two standards are filled in, the
// one past its expiry on the day of the readings gets the warning; a named
// unknown sample is converted (figures equal to fitcore's, from the same
// readings and standards), undone and redone, and survives a reload; a
// note per reading survives too. The report and the results CSV carry the
// unknown by name; the report prints to A4 with the title and "Page N of
// M" on every page (checked in the PDF's text, page by page). Sealing
// freezes the inputs, the exported file verifies with `pairline inspect
// --json` (seal_valid), and a change after starting a new revision makes
// revision 2 with a note of what changed while revision 1 stays readable.
func TestRecord(t *testing.T) {
	want := recExpected(t)
	srv := startServer(t)
	for _, v := range []struct {
		name string
		size [2]int64
	}{{"tablet", tablet}, {"phone", phone}} {
		t.Run(v.name, func(t *testing.T) { recordFlow(t, srv, v.name, v.size, want) })
	}
}

func recordFlow(t *testing.T, srv *server, name string, size [2]int64, want fitcore.Inverse) {
	b := newBrowser(t, size)
	b.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, b, "the app", appReady, 60*time.Second)
	setValue(t, b, "session-title", "Probe LV-C7 calibration (invented)", "change")
	setValue(t, b, "x-unit", "µS/cm", "change")
	setValue(t, b, "y-unit", "µS/cm", "change")
	anFillRaw(t, b, recPairs)
	waitFor(t, b, "the line", fmt.Sprintf(`tid("result-n")?.dataset.value === "%d"`, len(recPairs)), 20*time.Second)

	// Identity and conditions.
	for _, f := range [][2]string{
		{"record-site", "Larkwater intake (invented)"}, {"record-instrument", "Conductivity probe C7 (invented)"},
		{"record-serial", "LV-C7-0042"}, {"record-identifier", "LVWB-ASSET-117"}, {"record-operator", "R. Okafor (invented)"},
		{"record-notes", "Routine check before the spring run (invented)."},
		{"record-temperature", "21.4"}, {"record-temperature-unit", "°C"},
	} {
		setValue(t, b, f[0], f[1], "change")
	}
	waitFor(t, b, "the temperature kept", `tid("record-temperature").value === "21.4" && tid("record-temperature-unit").value === "°C"`, 10*time.Second)
	click(t, b, "condition-add")
	waitFor(t, b, "a condition", `!!tid("condition-item", "[data-index='1']")`, 10*time.Second)
	for _, f := range [][2]string{{"condition-name", "humidity"}, {"condition-value", "45"}, {"condition-unit", "%"}} {
		inItem(t, b, "condition-item", 1, f[0], f[1])
	}
	waitFor(t, b, "the condition kept", `tid("condition-item", "[data-index='1'] @condition-unit").value === "%"`, 10*time.Second)
	setValue(t, b, "reading-note-2", "fresh buffer (invented)", "change")
	// The card before any undo (whose message floats over the page).
	eval[bool](t, b, `(tid("record-card").scrollIntoView(), true)`)
	shot, err := chromedp.Run(b.ctx, chromedp.Screenshot(sel("record-card")))
	if err != nil {
		t.Fatal(err)
	}
	writeArtifact(t, "record-card-"+name+".png", shot)

	// Two standards; the second expired before the readings were taken.
	click(t, b, "standard-add")
	waitFor(t, b, "one standard", `tids("standard-item").length === 1`, 10*time.Second)
	click(t, b, "standard-add")
	waitFor(t, b, "two standards", `tids("standard-item").length === 2`, 10*time.Second)
	for i, st := range [][5]string{
		{"KCl 500 (invented)", "LV-CRM-0500", "500", "2.5", "2099-12-31"},
		{"KCl 1413 (invented)", "LV-CRM-1413", "1413", "5", "2020-01-31"},
	} {
		for j, f := range []string{"standard-name", "standard-certificate", "standard-value", "standard-uncertainty", "standard-expiry"} {
			inItem(t, b, "standard-item", i, f, st[j])
			waitFor(t, b, f+" kept", fmt.Sprintf(`tid("standard-item", "[data-index='%d'] @%s").value === %q`, i, f, st[j]), 10*time.Second)
		}
	}
	waitFor(t, b, "the expired warning", `!!tid("standard-item", "[data-index='1'] @standard-expired")`, 10*time.Second)
	if exists(t, b, "standard-expired") && eval[bool](t, b, `!!tid("standard-item", "[data-index='0'] @standard-expired")`) {
		t.Error("the standard valid until 2099 is marked expired")
	}

	// Undo takes the expiry back (the field shows it, the warning goes);
	// redo brings both again.
	click(t, b, "undo")
	waitFor(t, b, "the expiry undone", `tid("standard-item", "[data-index='1'] @standard-expiry").value === "" && !tid("standard-expired")`, 10*time.Second)
	click(t, b, "redo")
	waitFor(t, b, "the expiry redone", `tid("standard-item", "[data-index='1'] @standard-expiry").value === "2020-01-31" && !!tid("standard-expired")`, 10*time.Second)
	// The unknown sample.
	typeInto(t, b, "unknown-name", recUnknown)
	typeInto(t, b, "unknown-readings", recUnknownRead)
	click(t, b, "unknown-add")
	item := fmt.Sprintf(`tid("unknown-item", '[data-name=%q]')`, recUnknown)
	waitFor(t, b, "the converted unknown", item+`?.dataset.value`, 10*time.Second)
	checkUnknown := func(when string) {
		t.Helper()
		for _, k := range []struct {
			attr string
			v    float64
		}{{"value", want.X}, {"low", want.Low}, {"high", want.High}} {
			got, err := strconv.ParseFloat(eval[string](t, b, item+`.dataset.`+k.attr), 64)
			if err != nil || !relClose(got, k.v) {
				t.Errorf("%s: the unknown's %s is %v (%v), fitcore gives %v", when, k.attr, got, err, k.v)
			}
		}
	}
	checkUnknown("after adding it")

	// Undo and redo, in words, within reach on the readings and the line.
	click(t, b, "undo")
	waitFor(t, b, "the unknown undone", `!tid("unknown-item")`, 10*time.Second)
	if msg := textOf(t, b, "undo-message"); !strings.Contains(msg, "unknown 1 added") {
		t.Errorf("the undo message says %q, want the unknown named in words", msg)
	}
	click(t, b, "redo")
	waitFor(t, b, "the unknown redone", item, 10*time.Second)
	checkUnknown("after redo")
	for _, card := range []string{"jump-readings", "jump-line"} {
		click(t, b, card)
		time.Sleep(700 * time.Millisecond) // the smooth scroll
		if !onScreen(t, b, "undo") || !onScreen(t, b, "redo") {
			t.Errorf("%s: after %s, undo on screen %v, redo on screen %v", name, card, onScreen(t, b, "undo"), onScreen(t, b, "redo"))
		}
	}
	if shot, err := chromedp.Run(b.ctx, chromedp.Screenshot(chromedp.CSS(`section[aria-label="Readings"]`))); err == nil {
		writeArtifact(t, "record-readings-"+name+".png", shot)
	}
	eval[bool](t, b, `(tid("standard-item").parentElement.closest("section").scrollIntoView(), true)`)
	if shot, err := chromedp.Run(b.ctx, chromedp.Screenshot(chromedp.CSS(`section[aria-label="Standards"]`))); err == nil {
		writeArtifact(t, "record-standards-"+name+".png", shot)
	}

	// A reload keeps everything.
	waitFor(t, b, "the save", `tid("save-status").dataset.state === "saved"`, 10*time.Second)
	b.do(t, chromedp.Reload())
	waitFor(t, b, "the app again", appReady+` && `+item, 60*time.Second)
	checkUnknown("after a reload")
	for _, f := range [][2]string{{"record-site", "Larkwater intake (invented)"}, {"record-operator", "R. Okafor (invented)"}, {"reading-note-2", "fresh buffer (invented)"}} {
		if got := valueOf(t, b, f[0]); got != f[1] {
			t.Errorf("after a reload %s is %q, want %q", f[0], got, f[1])
		}
	}

	// The report.
	click(t, b, "report-open")
	waitFor(t, b, "the report", `!!tid("report", ' @report-signature')`, 20*time.Second)
	row := fmt.Sprintf(`tid("report-unknowns", ' tr[data-name=%q]')`, recUnknown)
	if !eval[bool](t, b, row+`?.innerHTML.includes('data-value="`+numfmt.Full(want.X)+`"') || false`) {
		t.Errorf("the report's unknown row does not carry fitcore's x %v: %s", want.X, eval[string](t, b, `tid("report-unknowns")?.outerHTML || "<missing>"`))
	}
	if rec := eval[string](t, b, `document.querySelector('.pl-rt-meta').textContent`); !strings.Contains(rec, "humidity45 %") || !strings.Contains(rec, "Temperature21.4 °C") {
		t.Errorf("the report's record table lacks the conditions: %q", rec)
	}
	hist := textOf(t, b, "report-history")
	for _, bad := range []string{"exclude_reason", "x_unit", `{"`, "instrument_id"} {
		if strings.Contains(hist, bad) {
			t.Errorf("the report's history shows %q: %s", bad, hist)
		}
	}
	if !strings.Contains(eval[string](t, b, `document.querySelector('.pl-report-readings').textContent`), "fresh buffer (invented)") {
		t.Error("the report's readings do not show the note")
	}
	if name == "tablet" {
		recordPDF(t, b, "Probe LV-C7 calibration (invented)")
	} else {
		if w := eval[float64](t, b, `document.documentElement.scrollWidth`); w > float64(size[0])+2 {
			t.Errorf("the report is %v px wide on a %d px phone", w, size[0])
		}
		// Viewport shots (a phone-long full page is too tall to look at).
		for _, part := range []string{"report", "report-standards", "report-unknowns", "report-left-out", "report-signature"} {
			// report-left-out: the readings table is the section before it.
			eval[bool](t, b, fmt.Sprintf(`((part) => { const el = part === "report-left-out" ? document.querySelector(".pl-report-readings") : tid(part);
				el.scrollIntoView(); scrollBy(0, -190); return true; })(%q)`, part))
			time.Sleep(200 * time.Millisecond)
			if shot, err := chromedp.Run(b.ctx, chromedp.CaptureScreenshot()); err == nil {
				writeArtifact(t, "record-"+part+"-phone.png", shot)
			}
		}
	}
	click(t, b, "report-close")
	waitFor(t, b, "the report closed", `!tid("report")`, 10*time.Second)

	// The results CSV names the unknown with fitcore's figures.
	eval[bool](t, b, captureDownloads)
	click(t, b, "export-results")
	_, csv := lastDownload(t, b, 1)
	if !bytes.Contains(csv, []byte(recUnknown+": x,"+numfmt.Full(want.X))) {
		t.Errorf("the results CSV lacks the unknown with x = %s:\n%s", numfmt.Full(want.X), csv)
	}

	// Seal: everything is frozen.
	typeInto(t, b, "sign-performed", "R. Okafor (invented)")
	click(t, b, "seal")
	waitFor(t, b, "the seal", `/^[0-9a-f]{64}$/.test(tid("sealed")?.dataset.digest || "")`, 10*time.Second)
	if v := attr(t, b, "sealed", "data-valid"); v != "true" {
		t.Errorf("the fresh seal does not verify (data-valid %q)", v)
	}
	for _, id := range []string{"x-input-0", "y-input-1", "reading-note-1", "record-site", "standard-add", "unknown-add", "add-row", "undo", "settings-level-99", "condition-add", "session-title"} {
		if exists(t, b, id) && !eval[bool](t, b, fmt.Sprintf(`tid(%q).matches(':disabled')`, id)) {
			t.Errorf("%s takes input on a sealed record", id)
		}
	}
	if name == "tablet" {
		// The review signs the same content; the digest then covers both.
		sealed := attr(t, b, "sealed", "data-digest")
		typeInto(t, b, "sign-reviewed", "M. Lindqvist (invented)")
		click(t, b, "sign-review")
		waitFor(t, b, "the review", `tid("sealed")?.textContent.includes("Reviewed by M. Lindqvist (invented)")`, 10*time.Second)
		if d := attr(t, b, "sealed", "data-digest"); d == sealed || len(d) != 64 || attr(t, b, "sealed", "data-valid") != "true" {
			t.Errorf("after the review the digest is %q (was %q), valid %q", d, sealed, attr(t, b, "sealed", "data-valid"))
		}
		click(t, b, "export-session")
		_, file := lastDownload(t, b, 2)
		recordInspect(t, file)
	}

	// A new revision: one change, and the note says what changed.
	click(t, b, "revision-start")
	waitFor(t, b, "the inputs open again", `!tid("y-input-1").matches(':disabled')`, 10*time.Second)
	typeInto(t, b, "y-input-1", "256.4")
	waitFor(t, b, "the revision note", `tid("revision-note")?.textContent.includes("revision 2")`, 10*time.Second)
	if note := textOf(t, b, "revision-note"); !strings.Contains(note, "reading 2") || !strings.Contains(note, "256.4") {
		t.Errorf("the revision note says %q, want it to name reading 2 and its new value", note)
	}
	if exists(t, b, "sealed") {
		t.Error("the changed record still shows itself sealed")
	}
	if got := eval[string](t, b, `tid("sealed-revision")?.dataset.revision || ""`); got != "1" {
		t.Errorf("the sealed revision kept readable is %q, want 1", got)
	}
	eval[bool](t, b, `(tid("revision-note").scrollIntoView(), true)`)
	if shot, err := chromedp.Run(b.ctx, chromedp.Screenshot(chromedp.CSS(`section[aria-label="Sign-off"]`))); err == nil {
		writeArtifact(t, "record-signoff-"+name+".png", shot)
	}
	if name == "tablet" {
		// A new record of the same instrument is offered the values of
		// this one.
		click(t, b, "session-new")
		waitFor(t, b, "the new session", `tid("x-input-0").value === "" && !tid("standard-item")`, 10*time.Second)
		setValue(t, b, "record-identifier", "lvwb-asset-117 ", "change")
		waitFor(t, b, "the offer of the last record", `!!tid("record-suggest")`, 20*time.Second)
		if got := textOf(t, b, "record-suggest"); !strings.Contains(got, "Probe LV-C7 calibration (invented)") || !strings.Contains(got, "2 standards") {
			t.Errorf("the offer says %q", got)
		}
		click(t, b, "record-suggest-use")
		waitFor(t, b, "the standards taken over", `tids("standard-item").length === 2`, 10*time.Second)
		if got := valueOf(t, b, "record-operator"); got != "R. Okafor (invented)" {
			t.Errorf("the operator taken over is %q", got)
		}
		if exists(t, b, "record-suggest") {
			t.Error("the offer stays after it was used")
		}
	}
}

func writeArtifact(t *testing.T, file string, b []byte) {
	t.Helper()
	p := filepath.Join(artifactDir(t), file)
	if err := os.WriteFile(p, b, 0o644); err != nil {
		t.Fatal(err)
	}
	t.Logf("artifact: %s", p)
}

// recordPDF prints the open report to A4 and checks, page by page with
// pdftotext (poppler), that every page carries the title and "Page N of
// M"; pdftoppm renders the pages to PNG for a look.
func recordPDF(t *testing.T, b *browser, title string) {
	t.Helper()
	pdf, err := chromedp.Run(b.ctx, chromedp.PrintToPDF(chromedp.PDFPaper(chromedp.PaperA4), chromedp.PDFPrintBackground(), chromedp.PDFPreferCSSPageSize()))
	if err != nil {
		t.Fatalf("printing the report: %v", err)
	}
	dir := artifactDir(t)
	path := filepath.Join(dir, "record-report.pdf")
	if err := os.WriteFile(path, pdf, 0o644); err != nil {
		t.Fatal(err)
	}
	t.Logf("PDF: %s", path)
	if _, err := exec.LookPath("pdftotext"); err != nil {
		t.Fatalf("pdftotext (poppler-utils) is needed to read the printed pages: %v", err)
	}
	pages := len(regexp.MustCompile(`/Type\s*/Page[^s]`).FindAll(pdf, -1))
	if pages < 2 {
		t.Fatalf("the report printed on %d page(s)", pages)
	}
	for p := 1; p <= pages; p++ {
		out, err := exec.Command("pdftotext", "-f", strconv.Itoa(p), "-l", strconv.Itoa(p), "-layout", path, "-").Output()
		if err != nil {
			t.Fatalf("pdftotext page %d: %v", p, err)
		}
		text := string(out)
		if !strings.Contains(text, title) {
			t.Errorf("printed page %d does not carry the title %q", p, title)
		}
		if want := fmt.Sprintf("Page %d of %d", p, pages); !strings.Contains(text, want) {
			t.Errorf("printed page %d does not say %q", p, want)
		}
	}
	if out, err := exec.Command("pdftoppm", "-png", "-r", "60", path, filepath.Join(dir, "record-report-page")).CombinedOutput(); err != nil {
		t.Errorf("pdftoppm: %v %s", err, out)
	}
	t.Logf("the report printed on %d A4 pages", pages)
}

// recordInspect runs `pairline inspect --json` on the session file the
// browser exported and requires its seal to verify.
func recordInspect(t *testing.T, file []byte) {
	t.Helper()
	// The file itself: decoded natively, its seal verifies.
	f := decodeFile(t, file)
	if len(f.Sessions) != 1 {
		t.Fatalf("the exported file holds %d sessions", len(f.Sessions))
	}
	if ok, err := f.Sessions[0].VerifySeal(); !ok {
		t.Errorf("the exported record's seal does not verify: %v", err)
	}
	bin, _ := appPaths(t)
	path := filepath.Join(t.TempDir(), "sealed.pairline")
	if err := os.WriteFile(path, file, 0o644); err != nil {
		t.Fatal(err)
	}
	out, err := exec.Command(bin, "inspect", "--json", path).Output()
	if err != nil {
		t.Fatalf("pairline inspect --json: %v", err)
	}
	var got struct {
		Sessions []map[string]json.RawMessage `json:"sessions"`
	}
	if err := json.Unmarshal(out, &got); err != nil || len(got.Sessions) != 1 {
		t.Fatalf("inspect --json: %v, %d sessions", err, len(got.Sessions))
	}
	v, ok := got.Sessions[0]["seal_valid"]
	if !ok {
		t.Errorf("inspect --json gives no seal_valid for the session (keys: %v)", keysOf(got.Sessions[0]))
		return
	}
	if string(v) != "true" {
		t.Errorf("inspect --json: seal_valid = %s, want true", v)
	}
}

func keysOf(m map[string]json.RawMessage) []string {
	var k []string
	for s := range m {
		k = append(k, s)
	}
	return k
}

// TestRecordCSV: a logger's CSV with a units row under the header imports
// as readings with those names and units (the units row is no reading);
// a note and a reading left out with its reason go out in the readings
// CSV and come back from it as they were (Pairline's own export), at
// tablet and phone size.
func TestRecordCSV(t *testing.T) {
	srv := startServer(t)
	for _, v := range []struct {
		name string
		size [2]int64
	}{{"tablet", tablet}, {"phone", phone}} {
		t.Run(v.name, func(t *testing.T) { recordCSVFlow(t, srv, v.name, v.size) })
	}
}

func recordCSVFlow(t *testing.T, srv *server, name string, size [2]int64) {
	b := newBrowser(t, size)
	b.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, b, "the app", appReady, 60*time.Second)
	var csv strings.Builder
	csv.WriteString("conductivity standard,probe reading\r\nµS/cm,µS/cm\r\n")
	for _, p := range recPairs {
		csv.WriteString(p[0] + "," + p[1] + "\r\n")
	}
	dir := t.TempDir()
	path := filepath.Join(dir, "logger LV-C7 (invented).csv")
	if err := os.WriteFile(path, []byte(csv.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	importPath(t, b, path)
	waitFor(t, b, "the imported line", fmt.Sprintf(`tid("result-n")?.dataset.value === "%d"`, len(recPairs)), 20*time.Second)
	for _, f := range [][2]string{{"x-name", "conductivity standard"}, {"x-unit", "µS/cm"}, {"y-name", "probe reading"}, {"y-unit", "µS/cm"}, {"x-input-0", "100"}} {
		if got := valueOf(t, b, f[0]); got != f[1] {
			t.Errorf("after the import %s is %q, want %q", f[0], got, f[1])
		}
	}

	// A note, and reading 4 left out through its point on the plot.
	setValue(t, b, "reading-note-2", "fresh buffer, see log (invented)", "change")
	tapPlotAt(t, b, "plot-fit", 1000, 1013.8)
	waitFor(t, b, "the panel of reading 4", `tid("plot-point-panel")?.dataset.row === "3"`, 10*time.Second)
	b.do(t, chromedp.SendKeys(sel("plot-point-reason"), "bubble on the probe"))
	click(t, b, "plot-point-exclude")
	waitFor(t, b, "the line without it", fmt.Sprintf(`tid("result-n")?.dataset.value === "%d"`, len(recPairs)-1), 10*time.Second)

	eval[bool](t, b, captureDownloads)
	click(t, b, "export-csv")
	_, raw := lastDownload(t, b, 1)
	back := filepath.Join(dir, "readings again.csv")
	if err := os.WriteFile(back, raw, 0o644); err != nil {
		t.Fatal(err)
	}
	importPath(t, b, back)
	waitFor(t, b, "the re-imported session", `tid("session-title").value.includes("readings again")`, 20*time.Second)
	waitFor(t, b, "its line", fmt.Sprintf(`tid("result-n")?.dataset.value === "%d"`, len(recPairs)-1), 20*time.Second)
	if got := valueOf(t, b, "reading-note-2"); got != "fresh buffer, see log (invented)" {
		t.Errorf("the note came back as %q", got)
	}
	if got := valueOf(t, b, "x-unit"); got != "µS/cm" {
		t.Errorf("the unit of x came back as %q", got)
	}
	if !eval[bool](t, b, `tid("x-input-3").closest("tr").classList.contains("pl-row-excluded")`) {
		t.Error("reading 4 is not left out after the round trip")
	}
	click(t, b, "report-open")
	waitFor(t, b, "the report", `!!tid("report-left-out")`, 20*time.Second)
	if got := textOf(t, b, "report-left-out"); !strings.Contains(got, "Reading 4 (1000, 1013.8): bubble on the probe") {
		t.Errorf("the report lists as left out: %q", got)
	}
	screenshot(t, b, "record-csv-report-"+name)
}
