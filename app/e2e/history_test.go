//go:build e2e

package e2e

import (
	"fmt"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/chromedp"

	"pairline/app/history"
	"pairline/app/session"
	"pairline/fitcore"
)

// hiSessions is the invented three-instrument year (history.ScenarioRecords:
// a stable turbidity meter, a chlorine analyser whose slope falls by 0.004
// a month, a conductivity probe whose line steps up after month 7), ending
// three days before today, with the turbidity meter's last two months
// missing so that it is overdue (month 10 + 35 days lies in the past).
func hiSessions(t *testing.T) ([]*session.Session, time.Time) {
	t.Helper()
	now := time.Now().UTC()
	start := time.Date(now.Year(), now.Month(), now.Day(), 9, 0, 0, 0, time.UTC).AddDate(0, -11, -3)
	all, err := history.ScenarioRecords(2026, start)
	if err != nil {
		t.Fatal(err)
	}
	var out []*session.Session
	for i, s := range all {
		if s.Instrument.ID == "LVWB-TB-01" && i%12 >= 10 {
			continue
		}
		out = append(out, s)
	}
	return out, start
}

// TestInstrumentHistory loads the invented year into the device as a
// technician would (a bundle file, then one of its sessions again) and
// checks the instrument view against how the data were generated.
func TestInstrumentHistory(t *testing.T) {
	srv := startServer(t)
	for _, size := range []struct {
		name string
		wh   [2]int64
	}{{"tablet", [2]int64{800, 1280}}, {"phone", [2]int64{390, 844}}} {
		t.Run(size.name, func(t *testing.T) { historyFlow(t, srv, size.name, size.wh) })
	}
}

func historyFlow(t *testing.T, srv *server, name string, size [2]int64) {
	ss, start := hiSessions(t)
	dir := t.TempDir()
	bundle := writeSessions(t, dir, "larkwater-year-invented.pairline", ss...)
	again := writeSessions(t, dir, "again-invented.pairline", ss[3])

	b := newBrowser(t, size)
	b.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, b, "the app to start", appReady, 60*time.Second)
	importPath(t, b, bundle)
	waitFor(t, b, "the import report", `!!tid("import-report") && /Imported 34 sessions/.test(tid("import-report").textContent)`, 30*time.Second)
	// The same session again: the device keeps one (replace = same content).
	importPath(t, b, again)
	click(t, b, "import-replace")
	waitFor(t, b, "the replacement", `!!tid("import-report") && !tid("import-conflict")`, 20*time.Second)

	t0 := time.Now()
	click(t, b, "instruments-open")
	waitFor(t, b, "the instrument list", `tids("instrument-item").length === 3`, 60*time.Second)
	t.Logf("%s: instrument list of 34 sessions shown %v after the tap", name, time.Since(t0).Round(time.Millisecond))
	type item struct{ Key, State, Count string }
	items := eval[[]item](t, b, `tids("instrument-item").map(e => ({Key: e.dataset.key, State: e.dataset.state, Count: e.querySelector('[data-testid="instrument-count"]').dataset.value}))`)
	want := map[string]item{
		"LVWB-CL-02": {"LVWB-CL-02", "ok", "12"},
		"LVWB-EC-03": {"LVWB-EC-03", "ok", "12"},
		"LVWB-TB-01": {"LVWB-TB-01", "overdue", "10"},
	}
	for _, it := range items {
		if it != want[it.Key] {
			t.Errorf("instrument %+v, want %+v", it, want[it.Key])
		}
	}

	// The drifting analyser.
	hiPick(t, b, "LVWB-CL-02")
	if n := eval[int](t, b, `tids("inst-row").length`); n != 12 {
		t.Errorf("analyser: %d calibrations listed, want 12", n)
	}
	rows := eval[[]map[string]string](t, b, `tids("inst-row").map(r => ({id: r.dataset.id, verdict: r.dataset.verdict, signed: r.querySelector('[data-testid="inst-signed"]').textContent, slope: r.querySelector('[data-testid="inst-slope"]').dataset.value}))`)
	var cl []*session.Session
	for _, s := range ss {
		if s.Instrument.ID == "LVWB-CL-02" {
			cl = append(cl, s)
		}
	}
	for i, r := range rows {
		if i >= len(cl) {
			break
		}
		sum, err := history.Summarize(cl[i])
		if err != nil {
			t.Fatal(err)
		}
		if r["id"] != cl[i].ID || r["verdict"] != "accepted" || r["signed"] != "A. Technician (invented)" || r["slope"] != strconv.FormatFloat(sum.Slope, 'g', -1, 64) {
			t.Errorf("analyser row %d: %v, want %s accepted, signed, slope %v", i, r, cl[i].ID, sum.Slope)
		}
	}
	if !exists(t, b, "inst-drift-warning") {
		t.Error("no drift warning on the drifting analyser")
	}
	if st := attr(t, b, "inst-drift-slope", "data-status"); st != "drifting" {
		t.Errorf("analyser slope drift: %q", st)
	}
	lo, hi := hiNum(t, b, "inst-drift-slope", "data-low"), hiNum(t, b, "inst-drift-slope", "data-high")
	if !(lo < -0.004 && -0.004 < hi) {
		t.Errorf("analyser slope per month in [%g, %g], want it to hold the generated −0.004", lo, hi)
	}
	// The generated slope 1.5 − 0.004·m reaches the lower limit 1.40 in month 26.
	truth := start.AddDate(0, 25, 0).Format("2006-01-02")
	llo, lhi := attr(t, b, "inst-leaves-slope", "data-low"), attr(t, b, "inst-leaves-slope", "data-high")
	if !(llo < truth && truth < lhi) {
		t.Errorf("projected leaving of the slope limit in [%s, %s], want it to hold %s", llo, lhi, truth)
	}
	t.Logf("%s: analyser drift %s; leaves %s", name, text(t, b, "inst-drift-slope"), text(t, b, "inst-leaves-slope"))
	if v := attr(t, b, "inst-compare", "data-today"); v != cl[11].ID {
		t.Errorf("today-versus-last compares %s, want the newest %s", v, cl[11].ID)
	}
	t.Logf("%s: today vs last: %s | %s | %s | %s", name, text(t, b, "inst-compare-headline"), text(t, b, "inst-test-slopes"), text(t, b, "inst-test-coincident"), text(t, b, "inst-diff-top"))
	if v := attr(t, b, "inst-chart-slope", "data-limits"); v != "2" {
		t.Errorf("slope chart: %s limits drawn, want 2", v)
	}
	hiShot(t, b, name, "bar", "app-bar")
	hiShot(t, b, name, "analyser", "instruments")
	hiShot(t, b, name, "analyser-compare", "inst-compare")
	hiShot(t, b, name, "analyser-table", "inst-calibrations")

	// Tap month 6 on the slope chart: which session it is, and open it.
	origin := cl[0].ReadingsDay()
	sum6, err := history.Summarize(cl[5])
	if err != nil {
		t.Fatal(err)
	}
	tapPlotAt(t, b, "inst-chart-slope", 12*history.Years(cl[5].ReadingsDay().Sub(origin)), sum6.Slope)
	waitFor(t, b, "the tapped calibration", fmt.Sprintf(`!!tid("inst-point") && tid("inst-point").dataset.id === %q`, cl[5].ID), 10*time.Second)
	if !exists(t, b, "inst-chart-selected") {
		t.Error("no ring around the tapped calibration")
	}
	hiShot(t, b, name, "tapped", "inst-chart-slope")
	click(t, b, "inst-point-open")
	waitFor(t, b, "the tapped session open", fmt.Sprintf(`tid("session-title").value === %q && !tid("instruments")`, cl[5].Title), 20*time.Second)

	// The probe: its line moved between months 7 and 8 and nowhere else.
	t1 := time.Now()
	click(t, b, "instruments-open")
	waitFor(t, b, "the instrument list", `tids("instrument-item").length === 3`, 60*time.Second)
	t.Logf("%s: instrument list shown again %v after the tap (summaries kept)", name, time.Since(t1).Round(time.Millisecond))
	hiPick(t, b, "LVWB-EC-03")
	changes := eval[[]string](t, b, `tids("inst-change").map(e => e.dataset.value)`)
	for i, c := range changes {
		w := "same"
		switch i {
		case 0:
			w = ""
		case 7:
			w = "line moved"
		}
		if c != w {
			t.Errorf("probe month %d against the previous: %q, want %q", i+1, c, w)
		}
	}
	if exists(t, b, "inst-drift-warning") && attr(t, b, "inst-drift-slope", "data-status") == "drifting" {
		t.Error("the probe's slope is called drifting")
	}
	// The invented scenario steps the probe's intercept up once, after
	// month 7 (app/history/scenario.go): the view says it shifted between
	// months 7 and 8, as an alert, with no projected day of leaving a limit.
	if got := attr(t, b, "inst-drift-intercept", "data-status"); got != fitcore.DriftShifted {
		t.Errorf("the probe's intercept is %q over time, want %q (one step after month 7)", got, fitcore.DriftShifted)
	}
	if !exists(t, b, "inst-shift-warning") {
		t.Error("no alert for the probe's shifted intercept")
	} else {
		from, to := attr(t, b, "inst-shift-warning", "data-from"), attr(t, b, "inst-shift-warning", "data-to")
		if from >= to || from == "" {
			t.Errorf("the shift is between %q and %q", from, to)
		}
		if w := textOf(t, b, "inst-shift-warning"); !strings.Contains(w, "jumped between") || !strings.Contains(w, "maker") {
			t.Errorf("the shift alert says %q: want the jump and the maker's procedure", w)
		}
		t.Logf("%s: probe intercept: %s", name, textOf(t, b, "inst-shift-warning"))
	}
	if exists(t, b, "inst-leaves-intercept") {
		t.Error("a day of leaving a limit is projected for the probe's intercept, which shifted once and does not drift")
	}
	hiShot(t, b, name, "probe-shift", "inst-shift-warning")
	hiShot(t, b, name, "probe", "inst-calibrations")

	// The stable meter: overdue, counted once despite the second import.
	hiPick(t, b, "LVWB-TB-01")
	if st := attr(t, b, "inst-due", "data-state"); st != "overdue" {
		t.Errorf("meter due state %q, want overdue", st)
	}
	if n := eval[int](t, b, `tids("inst-row").length`); n != 10 {
		t.Errorf("meter: %d calibrations, want 10 (one imported twice)", n)
	}
	if st := attr(t, b, "inst-drift-slope", "data-status"); st != "steady" {
		t.Errorf("meter slope drift %q, want steady", st)
	}
	t.Logf("%s: meter: %s", name, text(t, b, "inst-due"))
	hiShot(t, b, name, "overdue", "instruments")
	reportAxe(t, "instrument view, "+name+", standard", runAxe(t, b))
	for _, th := range []string{"outdoor", "dark"} {
		setTheme(t, b, th)
		hiShot(t, b, name, "overdue-"+th, "inst-compare")
		reportAxe(t, "instrument view, "+name+", "+th, runAxe(t, b))
	}
	setTheme(t, b, "standard")

	// The session list marks the meter's newest session overdue.
	click(t, b, "sessions-open")
	waitFor(t, b, "the due marks", `tids("session-due").length === 3`, 30*time.Second)
	var meter10 string
	for i, s := range ss {
		if s.Instrument.ID == "LVWB-TB-01" && i%12 == 9 {
			meter10 = s.ID
		}
	}
	st := eval[string](t, b, fmt.Sprintf(`(() => { const li = tids("session-item").find(e => e.dataset.id === %q); const d = li && li.querySelector('[data-testid="session-due"]'); return d ? d.dataset.state : "" })()`, meter10))
	if st != "overdue" {
		t.Errorf("session list: the meter's month 10 is marked %q, want overdue", st)
	}
	hiShot(t, b, name, "list", "session-list")

	// A calibration imported while the instrument view is open shows in it
	// at once; the same file kept twice ("Keep both") counts once.
	all, err := history.ScenarioRecords(2026, start)
	if err != nil {
		t.Fatal(err)
	}
	var month11 *session.Session
	for i, s := range all {
		if s.Instrument.ID == "LVWB-TB-01" && i%12 == 10 {
			month11 = s
		}
	}
	late := writeSessions(t, dir, "meter-month-11-invented.pairline", month11)
	click(t, b, "instruments-open")
	waitFor(t, b, "the instrument list", `tids("instrument-item").length === 3`, 60*time.Second)
	hiPick(t, b, "LVWB-TB-01")
	importPath(t, b, late)
	waitFor(t, b, "month 11 in the open view", `!!tid("instrument-view") && tids("inst-row").length === 11`, 30*time.Second)
	importPath(t, b, late)
	click(t, b, "import-keep-both")
	waitFor(t, b, "the kept copy", `!!tid("import-report") && !tid("import-conflict")`, 20*time.Second)
	waitFor(t, b, "the copy counted once", `tid("inst-duplicates")?.dataset.value === "1" && tids("inst-row").length === 11`, 30*time.Second)
	t.Logf("%s: after keeping both: %s", name, text(t, b, "inst-duplicates"))
	hiShot(t, b, name, "imported-while-open", "instruments")
}

// hiPick opens one instrument's view.
func hiPick(t *testing.T, b *browser, key string) {
	t.Helper()
	ok := eval[bool](t, b, fmt.Sprintf(`(() => { const li = tids("instrument-item").find(e => e.dataset.key === %q); if (!li) return false; li.querySelector('[data-testid="instrument-open"]').click(); return true })()`, key))
	if !ok {
		t.Fatalf("no instrument %s listed", key)
	}
	waitFor(t, b, "the view of "+key, fmt.Sprintf(`!!tid("instrument-view") && tid("instrument-view").dataset.key === %q`, key), 10*time.Second)
}

func hiNum(t *testing.T, b *browser, testid, name string) float64 {
	t.Helper()
	v, err := strconv.ParseFloat(attr(t, b, testid, name), 64)
	if err != nil {
		t.Fatalf("%s %s: %v", testid, name, err)
	}
	return v
}

// hiShot saves what the screen shows with the element of that testid
// scrolled to the top (the viewport, as the technician sees it).
func hiShot(t *testing.T, b *browser, size, what, testid string) {
	t.Helper()
	eval[bool](t, b, fmt.Sprintf(`(() => { const e = tid(%q); if (e) e.scrollIntoView({block: 'start'}); return true })()`, testid))
	time.Sleep(150 * time.Millisecond) // a frame for the scroll (not a measurement)
	buf, err := chromedp.Run(b.ctx, chromedp.CaptureScreenshot())
	if err != nil {
		t.Fatalf("screenshot: %v", err)
	}
	writeArtifact(t, "history-"+size+"-"+what+".png", buf)
}
