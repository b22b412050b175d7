package cli

import (
	"bytes"
	"fmt"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
	"time"
	"unicode/utf8"

	"pairline/app/history"
	"pairline/app/wording"
	"pairline/fitcore"
)

var htmlScenarioStart = time.Date(2025, 1, 6, 0, 0, 0, 0, time.UTC)

// scenarioInstruments builds the invented three-instrument year (seeded)
// with history.Build at now; sign signs the first ten sessions of each
// instrument as performed and every third as reviewed.
func scenarioInstruments(t testing.TB, now time.Time, sign bool, opt history.Options) []history.Instrument {
	t.Helper()
	ss, err := history.Scenario(2026, htmlScenarioStart, 1)
	if err != nil {
		t.Fatal(err)
	}
	var sums []history.Summary
	for i, s := range ss {
		if sign && i%12 < 10 {
			if err := s.SignPerformed("A. Technician (invented)", s.Created.Add(time.Hour)); err != nil {
				t.Fatal(err)
			}
			if i%3 == 0 {
				if err := s.SignReviewed("B. Reviewer (invented)", s.Created.Add(2*time.Hour)); err != nil {
					t.Fatal(err)
				}
			}
		}
		sum, err := history.Summarize(s)
		if err != nil {
			t.Fatal(err)
		}
		sums = append(sums, sum)
	}
	opt.Now = now
	ins, err := history.Build(sums, opt)
	if err != nil {
		t.Fatal(err)
	}
	return ins
}

func renderPage(t testing.TB, p htmlPage) string {
	t.Helper()
	var b bytes.Buffer
	if err := historyHTML(&b, p); err != nil {
		t.Fatal(err)
	}
	return b.String()
}

// section returns the markup of the instrument section with data-key key.
func section(t *testing.T, page, key string) string {
	t.Helper()
	start := strings.Index(page, `data-testid="hfile-instrument" data-key="`+key+`"`)
	if start < 0 {
		t.Fatalf("no section for %s", key)
	}
	end := strings.Index(page[start:], "</section>")
	return page[start : start+end]
}

var (
	reChange  = regexp.MustCompile(`data-testid="hfile-change" data-session="([^"]*)" data-previous="([^"]*)" data-verdict="([^"]*)"`)
	reSession = regexp.MustCompile(`data-testid="hfile-session" data-id="([^"]*)" data-verdict="([^"]*)"`)
	reAttr    = func(name string) *regexp.Regexp { return regexp.MustCompile(name + `="([^"]*)"`) }
)

// TestHistoryHTMLScenario renders the invented three-instrument year. What
// is expected follows from how Scenario generated the readings, not from
// Pairline's output: the chlorine analyser's slope drifts by −0.048 per
// year (its slope section says "drifting", with −0.048 inside the shown
// interval, and it is projected to leave a lower slope limit of 1.40 about
// (1.5 − 1.40)/0.048 ≈ 2.1 years after the first calibration); the turbidity
// meter is stable (steady, every change "same"); the conductivity probe's
// intercept steps up by 0.8 after month 7, so exactly one change is not
// "same", that of month 8 against month 7, a moved line. The interval is 35
// days, so one day past month 12 + 35 days every instrument is overdue and
// a day before it none is.
func TestHistoryHTMLScenario(t *testing.T) {
	lim := 1.40
	due := htmlScenarioStart.AddDate(0, 11, 35)
	ins := scenarioInstruments(t, due.AddDate(0, 0, 1), true, history.Options{SlopeLow: &lim})
	page := renderPage(t, htmlPage{Now: due.AddDate(0, 0, 1), Files: 36, Opt: history.Options{SlopeLow: &lim}, Instances: ins,
		Skipped: []skippedFile{{"cut.pairline", "the file is incomplete"}}})

	if n := strings.Count(page, `data-testid="hfile-instrument"`); n != 3 {
		t.Fatalf("%d instrument sections, want 3", n)
	}
	for _, key := range []string{"LVWB-TB-01", "LVWB-CL-02", "LVWB-EC-03"} {
		s := section(t, page, key)
		if got := len(reSession.FindAllString(s, -1)); got != 12 {
			t.Errorf("%s: %d calibration rows, want 12", key, got)
		}
		if got := len(reChange.FindAllString(s, -1)); got != 11 {
			t.Errorf("%s: %d comparison rows, want 11", key, got)
		}
		if !strings.Contains(s, `data-testid="hfile-due" data-state="overdue" data-value="2026-01-10" data-days="1"`) {
			t.Errorf("%s: not shown overdue by one day since 2026-01-10", key)
		}
		for _, c := range []string{"slope", "intercept"} {
			id := fmt.Sprintf(`data-testid="hfile-chart-%s-`, c)
			if !strings.Contains(s, id) || !strings.Contains(s, `data-accepted="12" data-not-accepted="0"`) {
				t.Errorf("%s: %s chart missing or not 12 accepted points", key, c)
			}
		}
		// Signed sessions show the names; the last two are not signed.
		if strings.Count(s, "A. Technician (invented)") < 12 || strings.Count(s, "B. Reviewer (invented)") != 4 || strings.Count(s, "not signed") != 2 {
			t.Errorf("%s: signatures not shown as given", key)
		}
	}

	cl := section(t, page, "LVWB-CL-02")
	if !strings.Contains(cl, `data-slope-drift="drifting"`) {
		t.Error("drifting analyser: slope not flagged as drifting")
	}
	m := regexp.MustCompile(`data-testid="hfile-drift-slope" data-verdict="drifting" data-n="12" data-value="([^"]*)" data-low="([^"]*)" data-high="([^"]*)"`).FindStringSubmatch(cl)
	if m == nil {
		t.Fatal("drifting analyser: no drifting slope paragraph")
	}
	var rate, low, high float64
	fmt.Sscan(m[1], &rate)
	fmt.Sscan(m[2], &low)
	fmt.Sscan(m[3], &high)
	if !(low < -0.048 && -0.048 < high && rate < 0) {
		t.Errorf("drifting analyser: rate %g [%g, %g] does not hold the generated −0.048/year", rate, low, high)
	}
	lv := regexp.MustCompile(`data-testid="hfile-leaves" data-which="slope" data-value="([0-9-]+)"`).FindStringSubmatch(cl)
	if lv == nil {
		t.Fatal("drifting analyser: no projected day of leaving the slope limit")
	}
	if d, err := time.Parse("2006-01-02", lv[1]); err != nil || d.Before(time.Date(2026, 6, 1, 0, 0, 0, 0, time.UTC)) || d.After(time.Date(2027, 8, 1, 0, 0, 0, 0, time.UTC)) {
		t.Errorf("drifting analyser: leaves %s, want about 2027-02", lv[1])
	}

	tb := section(t, page, "LVWB-TB-01")
	if !strings.Contains(tb, `data-slope-drift="steady"`) || strings.Contains(tb, "hfile-leaves") {
		t.Error("stable meter: slope not steady, or a leaving day projected")
	}
	for _, c := range reChange.FindAllStringSubmatch(tb, -1) {
		if c[3] != fitcore.LinesSame {
			t.Errorf("stable meter: change %s against %s is %q", c[1], c[2], c[3])
		}
	}
	if !strings.Contains(tb, `data-testid="hfile-today" data-verdict="same"`) {
		t.Error("stable meter: latest comparison not 'same'")
	}

	ec := section(t, page, "LVWB-EC-03")
	sess := reSession.FindAllStringSubmatch(ec, -1)
	var moved []string
	for _, c := range reChange.FindAllStringSubmatch(ec, -1) {
		if c[3] != fitcore.LinesSame {
			moved = append(moved, c[1]+"/"+c[2]+"/"+c[3])
		}
	}
	if want := sess[7][1] + "/" + sess[6][1] + "/" + fitcore.LinesMoved; len(moved) != 1 || moved[0] != want {
		t.Errorf("step probe: changes not 'same': %v, want only %s (month 8 against month 7, line moved)", moved, want)
	}
	// Month 8 against month 7: the intercept stepped by +0.8 mV at slope
	// 1.5 mV per µS/cm, so a response converts with the previous line to
	// about 0.8/1.5 ≈ 0.53 µS/cm more at every x (by construction).
	row := ec[strings.Index(ec, `data-session="`+sess[7][1]+`"`):]
	row = row[:strings.Index(row, "</tr>")]
	for _, d := range reAttr(`class="pl-rnum" data-value`).FindAllStringSubmatch(row, -1)[4:5] {
		var v float64
		fmt.Sscan(d[1], &v)
		if !(v > 0.3 && v < 0.8) {
			t.Errorf("step probe: difference at the middle %g µS/cm, want about +0.53", v)
		}
	}
	// Its intercept stepped once (generated): called shifted, between the
	// days of months 7 and 8, with the warning, and not projected.
	sm := reAttr(`data-testid="hfile-drift-intercept" data-verdict="shifted" data-n="12" data-step-from`).FindStringSubmatch(ec)
	if sm == nil || sm[1] != "2025-07-06" || !strings.Contains(ec, `data-step-to="2025-08-06"`) || !strings.Contains(ec, `data-testid="hfile-shift"`) ||
		!strings.Contains(ec, `data-intercept-drift="shifted"`) || strings.Contains(ec, `data-which="intercept"`) || !strings.Contains(ec, "levels before and after it") {
		t.Errorf("step probe: intercept not shown as one shift between 2025-07-06 and 2025-08-06 without a projection (%v)", sm)
	}

	for _, want := range []string{`data-testid="hfile-caution"`, "drinking water", "instrument maker's", "local codes",
		`data-testid="hfile-skipped"`, "cut.pairline", "the file is incomplete", "days since 2025-01-06",
		"mV per µS/cm", "µg/L", "± "} {
		if !strings.Contains(page, want) {
			t.Errorf("page lacks %q", want)
		}
	}

	// With a lower slope limit of 1.43 the analyser reaches it about
	// (1.5 − 1.43)/0.048 ≈ 1.46 years after the first calibration, within
	// as long again as the year of calibrations: the chart carries the
	// trend on to it; the other instruments get no projection.
	lim143 := 1.43
	ins = scenarioInstruments(t, due, false, history.Options{SlopeLow: &lim143})
	page = renderPage(t, htmlPage{Now: due, Opt: history.Options{SlopeLow: &lim143}, Instances: ins})
	if !strings.Contains(section(t, page, "LVWB-CL-02"), `class="hf-projection"`) || strings.Count(page, `class="hf-projection"`) != 1 {
		t.Error("limit 1.43: the projection to the limit is not drawn once, on the analyser's slope chart")
	}

	// A day before the due day nothing is overdue.
	ins = scenarioInstruments(t, due.AddDate(0, 0, -1), false, history.Options{})
	page = renderPage(t, htmlPage{Now: due.AddDate(0, 0, -1), Instances: ins})
	if strings.Contains(page, `data-state="overdue"`) || strings.Count(page, `data-testid="hfile-due" data-state="due" data-value="2026-01-10"`) != 3 {
		t.Error("a day before the due day: overdue shown, or the due day not shown for all three")
	}
	if strings.Contains(page, "hfile-leaves") || !strings.Contains(page, "No acceptance limits are set on the slope") {
		t.Error("without limits: a leaving day projected, or not said that none is")
	}
}

// hostile holds text a file can carry that must not act on the page: markup,
// an attribute break-out, a script, bidirectional overrides and isolates,
// terminal escapes, NUL and other controls, C1 controls, line separators.
var hostile = []string{
	`<script>alert(1)</script>`,
	`"><img src=x onerror=alert(1)>`,
	"abc\u202edcba\u2066x\u2069",
	"\x1b[2J\x1b]0;owned\x07",
	"nul\x00 bell\x07 tab\t nl\n cr\r del\x7f",
	"c1\u0085\u009b2J",
	"line\u2028para\u2029",
	`</style><style>*{display:none}</style>`,
	`<!-- <svg onload=alert(1)> -->`,
	`javascript:alert(1) https://example.invalid/x.png`,
}

// tags lists the tags of a page in order, each as its name and the names
// of its attributes (what would change if a text broke out of its place).
// It reads the markup as a browser's tokenizer would for this page: text up
// to "<" followed by a letter or "/", a tag name, attributes whose values
// are double-quoted; a "<!" comment or doctype is kept whole.
func tags(page string) []string {
	var out []string
	isName := func(c byte) bool {
		return c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || c >= '0' && c <= '9' || c == '-' || c == ':'
	}
	for i := 0; i < len(page); i++ {
		if page[i] != '<' || i+1 >= len(page) {
			continue
		}
		j := i + 1
		if page[j] == '!' {
			k := strings.IndexByte(page[j:], '>')
			if k < 0 {
				out = append(out, "!unclosed")
				break
			}
			out = append(out, page[i:j+k+1])
			i = j + k
			continue
		}
		if page[j] == '/' {
			j++
		}
		if j >= len(page) || !(page[j] >= 'a' && page[j] <= 'z' || page[j] >= 'A' && page[j] <= 'Z') {
			continue
		}
		k := j
		for k < len(page) && isName(page[k]) {
			k++
		}
		t := page[i+1 : k]
		for k < len(page) && page[k] != '>' {
			switch c := page[k]; {
			case c == '"':
				e := strings.IndexByte(page[k+1:], '"')
				if e < 0 {
					return append(out, "unclosed quote")
				}
				k += e + 2
			case isName(c):
				a := k
				for k < len(page) && isName(page[k]) {
					k++
				}
				t += " " + page[a:k]
			default:
				k++
			}
		}
		out = append(out, t)
		i = k
	}
	return out
}

// hostileInstruments is one instrument of three calibrations whose every
// text field is s.
func hostileInstruments(t testing.TB, s string) []history.Instrument {
	t.Helper()
	var sums []history.Summary
	for m := 0; m < 3; m++ {
		day := htmlScenarioStart.AddDate(0, m, 0)
		x := []float64{0, 10, 20, 40, 80}
		y := []float64{0.51 + 0.01*float64(m), 15.6, 30.4, 60.7, 120.3}
		sums = append(sums, history.Summary{
			ID: s + fmt.Sprint(m), Key: s, Title: s, Site: s, Taken: day, IntervalDays: 30, Digest: fmt.Sprint(m),
			Fitted: true, Slope: 1.5, SlopeSE: 0.01, Intercept: 0.5, InterceptSE: 0.1, Accepted: m != 1, Reason: s, X: x, Y: y,
			SlopeLow: 1.48, SlopeHigh: 1.52, InterceptLow: 0.3, InterceptHigh: 0.7, Level: 0.95, RSquared: 0.999,
			XName: s, XUnit: s, YName: s, YUnit: s, Description: s + "d", Serial: s + "s", Operator: s, PerformedBy: s, ReviewedBy: s,
		})
	}
	ins, err := history.Build(sums, history.Options{Now: htmlScenarioStart.AddDate(0, 4, 0)})
	if err != nil {
		t.Fatal(err)
	}
	return ins
}

// checkEscaped fails when text from s acts on the page: the page must have
// the same tags and attributes as with a plain name, hold no character
// wording.Visible replaces, and be valid UTF-8.
func checkEscaped(t *testing.T, s, page string, want []string) {
	t.Helper()
	got := tags(page)
	if strings.Join(got, "\n") != strings.Join(want, "\n") {
		for i := range min(len(got), len(want)) {
			if got[i] != want[i] {
				t.Fatalf("%q changed the markup: tag %d is %q, with a plain name %q", s, i, got[i], want[i])
			}
		}
		t.Fatalf("%q changed the markup: %d tags, with a plain name %d", s, len(got), len(want))
	}
	if !utf8.ValidString(page) {
		t.Fatalf("%q: the page is not valid UTF-8", s)
	}
	for i, r := range page {
		if r != '\n' && wording.Hidden(r) {
			t.Fatalf("%q: character %U at byte %d reached the page", s, r, i)
		}
	}
}

// TestHistoryHTMLEscaping renders an instrument whose every text (key,
// title, units, operator, signatures, reason, skipped file name and reason)
// is hostile, and compares the page's markup with that of a plain name.
func TestHistoryHTMLEscaping(t *testing.T) {
	plain := tags(renderPage(t, htmlPage{Now: htmlScenarioStart, Instances: hostileInstruments(t, "plainname"), Filter: "plainname",
		Skipped: []skippedFile{{"plainname", "plainname"}}}))
	for _, s := range hostile {
		page := renderPage(t, htmlPage{Now: htmlScenarioStart, Instances: hostileInstruments(t, s), Filter: s,
			Skipped: []skippedFile{{s, s}}})
		checkEscaped(t, s, page, plain)
		for _, bad := range []string{"<script", "<img", "onerror=alert(1)>", "</style><style>", "<svg onload"} {
			if strings.Contains(page, bad) {
				t.Errorf("%q: the page holds %q", s, bad)
			}
		}
	}
	page := renderPage(t, htmlPage{Now: htmlScenarioStart, Instances: hostileInstruments(t, hostile[2])})
	if !strings.Contains(page, `abc\u202edcba\u2066x\u2069`) {
		t.Error("bidirectional controls are not shown as visible escapes")
	}
	page = renderPage(t, htmlPage{Now: htmlScenarioStart, Instances: hostileInstruments(t, hostile[0])})
	if !strings.Contains(page, "&lt;script&gt;alert(1)&lt;/script&gt;") {
		t.Error("markup in a name is not shown as text")
	}
}

// FuzzHistoryHTMLText: whatever text a file carries, the page keeps the
// markup of a plain name and shows no acting character.
func FuzzHistoryHTMLText(f *testing.F) {
	for _, s := range hostile {
		f.Add(s)
	}
	f.Add("\xff\xfe<")
	plain := tags(renderPage(f, htmlPage{Now: htmlScenarioStart, Instances: hostileInstruments(f, "plainname"), Filter: "plainname",
		Skipped: []skippedFile{{"plainname", "plainname"}}}))
	f.Fuzz(func(t *testing.T, s string) {
		if len(s) > 200 {
			return
		}
		page := renderPage(t, htmlPage{Now: htmlScenarioStart, Instances: hostileInstruments(t, s), Filter: s,
			Skipped: []skippedFile{{s, s}}})
		if strings.TrimSpace(s) == "" || strings.EqualFold(strings.TrimSpace(s), "plainname") {
			return // another grouping key, other headings
		}
		checkEscaped(t, s, page, plain)
	})
}

// TestHistoryHTMLSelfContained: the page loads nothing and names no other
// place: no URL of any scheme, no protocol-relative reference, no element
// that fetches (script, link, img, iframe, object, embed, source, video,
// audio, base, form), no CSS import or url() other than a fragment, only
// fragment links, and a Content-Security-Policy that forbids loading.
func TestHistoryHTMLSelfContained(t *testing.T) {
	lim := 1.4
	ins := scenarioInstruments(t, htmlScenarioStart.AddDate(1, 1, 0), true, history.Options{SlopeLow: &lim})
	page := renderPage(t, htmlPage{Now: htmlScenarioStart.AddDate(1, 1, 0), Opt: history.Options{SlopeLow: &lim}, Instances: ins,
		Skipped: []skippedFile{{"a/b.pairline", "not a session file"}}})
	low := strings.ToLower(page)
	for _, bad := range []string{"://", `="//`, "='//", "url(//", "@import", "<script", "<link", "<img", "<iframe", "<object",
		"<embed", "<source", "<video", "<audio", "<base", "<form", "<meta http-equiv=\"refresh\"", "srcset", "src=", "action=",
		"xlink:href", "data:", "javascript:"} {
		if i := strings.Index(low, bad); i >= 0 {
			t.Errorf("the page holds %q at byte %d: …%s…", bad, i, page[max(0, i-40):min(len(page), i+40)])
		}
	}
	for _, m := range regexp.MustCompile(`href="([^"]*)"`).FindAllStringSubmatch(page, -1) {
		if !strings.HasPrefix(m[1], "#") {
			t.Errorf("link to %q: only links within the page are allowed", m[1])
		}
	}
	for _, m := range regexp.MustCompile(`url\(([^)]*)\)`).FindAllStringSubmatch(page, -1) {
		if !strings.HasPrefix(m[1], "#") {
			t.Errorf("url(%s): only fragments are allowed", m[1])
		}
	}
	if !strings.Contains(page, `<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'">`) {
		t.Error("no Content-Security-Policy that forbids loading")
	}
	// Every fragment link has its target.
	for _, m := range regexp.MustCompile(`href="#([^"]*)"`).FindAllStringSubmatch(page, -1) {
		if !strings.Contains(page, `id="`+m[1]+`"`) {
			t.Errorf("link to #%s has no target", m[1])
		}
	}
}

// TestHistoryHTMLCommand runs `pairline history --html` on files: the page
// is written (replacing an older one), the summary line printed, damaged
// and foreign files and a hostile file name listed on the page, the choice
// of output checked, and a page that cannot be written is an error.
func TestHistoryHTMLCommand(t *testing.T) {
	dir := t.TempDir()
	names := writeScenario(t, dir, 1)
	good, _ := os.ReadFile(names[0])
	if err := os.WriteFile(filepath.Join(dir, "cut.pairline"), good[:len(good)/2], 0o644); err != nil {
		t.Fatal(err)
	}
	evil := filepath.Join(dir, "<b>x\x1b[2J\u202e.pairline")
	if err := os.WriteFile(evil, []byte("not a session"), 0o644); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(t.TempDir(), "history.html")
	if err := os.WriteFile(out, []byte("old page"), 0o644); err != nil {
		t.Fatal(err)
	}
	var so, se bytes.Buffer
	if code := Main([]string{"history", "--html", out, "--slope-limits", "1.40,", dir}, nil, &so, &se); code != ExitOK {
		t.Fatalf("exit %d: %s", code, se.String())
	}
	if !strings.Contains(so.String(), "3 instruments, 36 sessions, 2 files skipped") {
		t.Errorf("stdout: %q", so.String())
	}
	b, err := os.ReadFile(out)
	if err != nil {
		t.Fatal(err)
	}
	page := string(b)
	if !strings.HasPrefix(page, "<!doctype html>") || !strings.HasSuffix(page, "</html>\n") || strings.Count(page, `data-testid="hfile-instrument"`) != 3 {
		t.Fatalf("the page was not written whole (%d bytes)", len(page))
	}
	if strings.Count(page, `data-testid="hfile-skipped-file"`) != 2 || !strings.Contains(page, `&lt;b&gt;x\x1b[2J\u202e.pairline`) || strings.Contains(page, "<b>x") {
		t.Error("the skipped files are not listed, or a file name is not escaped")
	}
	for _, in := range []string{"LVWB-TB-01", "LVWB-CL-02", "LVWB-EC-03"} {
		s := section(t, page, in)
		want := "due"
		if time.Now().After(time.Date(2026, 1, 10, 0, 0, 0, 0, time.UTC)) {
			want = "overdue"
		}
		if !strings.Contains(s, `data-due-state="`+want+`"`) {
			t.Errorf("%s: not %s", in, want)
		}
	}
	entries, _ := os.ReadDir(filepath.Dir(out))
	if len(entries) != 1 {
		t.Errorf("%d files beside the page, want none (no temporary file left)", len(entries)-1)
	}
	// --instrument keeps one; "-" writes to standard output.
	so.Reset()
	if code := Main([]string{"history", "--html", "-", "--instrument", "lvwb-ec-03", dir}, nil, &so, &se); code != ExitOK {
		t.Fatalf("exit %d: %s", code, se.String())
	}
	if n := strings.Count(so.String(), `data-testid="hfile-instrument"`); n != 1 || !strings.Contains(so.String(), `data-key="LVWB-EC-03"`) {
		t.Errorf("--instrument: %d sections", n)
	}
	for _, bad := range [][]string{{"history", "--html", out, "--json", dir}, {"history", "--html", out, "--csv", dir}} {
		if code := Main(bad, nil, &so, &se); code != ExitUsage {
			t.Errorf("%q: exit %d, want %d", bad, code, ExitUsage)
		}
	}
	se.Reset()
	if code := Main([]string{"history", "--html", filepath.Join(dir, "no", "such", "folder", "x.html"), dir}, nil, &so, &se); code != ExitFailure ||
		!strings.Contains(se.String(), "could not write the page") {
		t.Errorf("unwritable page: exit %d, %q", code, se.String())
	}
}

// BenchmarkHistoryHTML10000 writes the page for 10,080 generated files
// (840 instruments).
func BenchmarkHistoryHTML10000(b *testing.B) {
	dir := b.TempDir()
	writeScenario(b, dir, 280)
	out := filepath.Join(b.TempDir(), "h.html")
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		var so, se bytes.Buffer
		if code := Main([]string{"history", "--html", out, dir}, nil, &so, &se); code != ExitOK {
			b.Fatalf("exit %d: %s", code, se.String())
		}
	}
}
