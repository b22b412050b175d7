//go:build e2e

package e2e

import (
	"fmt"
	"strconv"
	"testing"
	"time"

	"github.com/chromedp/chromedp"

	"pairline/app/demo"
	"pairline/app/session"
	"pairline/fitcore"
)

// fuOpenTitled opens the first listed session with that title.
func fuOpenTitled(t *testing.T, b *browser, title string) {
	t.Helper()
	if attr(t, b, "sessions-open", "aria-expanded") != "true" {
		click(t, b, "sessions-open")
	}
	waitFor(t, b, "the session list", `!!tid("session-list")`, 10*time.Second)
	ok := eval[bool](t, b, fmt.Sprintf(`(() => {
		for (const li of tids("session-item")) {
			const tt = li.querySelector('.pl-session-title');
			if (tt && tt.textContent === %q) { li.querySelector('[data-testid="session-open"]').click(); return true; }
		}
		return false;
	})()`, title))
	if !ok {
		t.Fatalf("no listed session is titled %q", title)
	}
	waitFor(t, b, "the session "+title, fmt.Sprintf(`tid("session-title").value === %q`, title), 20*time.Second)
}

// fuDemo loads the demo (in a fresh profile) and waits for its first session.
func fuDemo(t *testing.T, b *browser, srv *server) {
	t.Helper()
	b.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, b, "the app to start", appReady, 60*time.Second)
	click(t, b, "demo-open")
	waitFor(t, b, "the demo's first session", fmt.Sprintf(`tid("session-title").value === %q && !!tid("plot-fit")`, demo.Titles[0]), 30*time.Second)
}

// fuReports analyses the embedded demo sessions with fitcore, as the app does.
func fuReports(t *testing.T) ([]*session.Session, []*fitcore.Report) {
	t.Helper()
	ss, err := demo.Sessions(time.Now(), nil)
	if err != nil {
		t.Fatal(err)
	}
	var reps []*fitcore.Report
	for _, s := range ss {
		x, y, _, _ := s.Pairs()
		rep, err := fitcore.Analyze(x, y, s.Settings.Options())
		if err != nil {
			t.Fatal(err)
		}
		reps = append(reps, rep)
	}
	return ss, reps
}

// TestDemo: "Try the demo" adds the four invented sessions; what the screen
// shows of each equals what fitcore computes from the same embedded file,
// and the lessons are visible: A passes, B is advised log–log, C's mistyped
// reading is flagged, D's independence warns or fails. A second tap adds
// new copies and keeps the first ones.
func TestDemo(t *testing.T) {
	srv := startServer(t)
	b := newBrowser(t, tablet)
	fuDemo(t, b, srv)
	ss, reps := fuReports(t)

	count := func() int {
		return eval[int](t, b, `tids("session-item", ' .pl-session-title').filter(e => e.textContent.startsWith("Demo (invented)")).length`)
	}
	waitFor(t, b, "the session list", `!!tid("session-list")`, 10*time.Second)
	if n := count(); n != 4 {
		t.Fatalf("%d demo sessions listed, want 4", n)
	}
	screenshot(t, b, "demo-tablet-list")

	for i, s := range ss {
		rep := reps[i]
		fuOpenTitled(t, b, s.Title)
		waitFor(t, b, "the line", `!!tid("result-slope") && !!tid("plot-fit")`, 20*time.Second)
		// The figures on screen are fitcore's (same embedded readings).
		if got := num(t, b, "result-n"); got != float64(rep.N) {
			t.Errorf("%s: n = %v, want %d", s.Title, got, rep.N)
		}
		if got := num(t, b, "result-slope"); !near(got, rep.Slope.Estimate, 1e-12) {
			t.Errorf("%s: slope %v, fitcore %v", s.Title, got, rep.Slope.Estimate)
		}
		if got := num(t, b, "result-intercept"); !near(got, rep.Intercept.Estimate, 1e-12) {
			t.Errorf("%s: intercept %v, fitcore %v", s.Title, got, rep.Intercept.Estimate)
		}
		if got := attr(t, b, "plot-fit", "data-n"); got != strconv.Itoa(rep.N) {
			t.Errorf("%s: the fit plot draws n = %s, want %d", s.Title, got, rep.N)
		}
		for _, c := range []struct {
			id string
			v  fitcore.Verdict
		}{{"check-linearity", rep.Assumptions.Linearity.Verdict}, {"check-spread", rep.Assumptions.Spread.Verdict},
			{"check-independence", rep.Assumptions.Independence.Verdict}, {"check-normality", rep.Assumptions.Normality.Verdict},
			{"check-influence", rep.Assumptions.Influence.Verdict}} {
			if got := attr(t, b, c.id, "data-verdict"); got != string(c.v) {
				t.Errorf("%s: %s shows %q, fitcore says %q", s.Title, c.id, got, c.v)
			}
		}
		if got := attr(t, b, "advice", "data-transform"); got != string(rep.Advice.Remedy) {
			t.Errorf("%s: advice shows %q, fitcore says %q", s.Title, got, rep.Advice.Remedy)
		}
		screenshot(t, b, fmt.Sprintf("demo-tablet-%d", i+1))
	}
	// The lessons, as the screen states them (the demo's purpose; app/demo's
	// unit test checks fitcore itself).
	if v := reps[0].Acceptance; v == nil || !v.Pass {
		t.Error("demo A does not pass its acceptance criteria")
	}
	if reps[1].Advice.Remedy != fitcore.RemedyLogLog {
		t.Errorf("demo B advice %s, want log_log", reps[1].Advice.Remedy)
	}
	fuOpenTitled(t, b, demo.Titles[2])
	flagged := eval[[]string](t, b, `tids("plot-fit", ' .pl-pt-flag').map(e => e.dataset.row)`)
	if len(flagged) != 1 || flagged[0] != strconv.Itoa(demo.MistypedRow) {
		t.Errorf("demo C flags rows %v on the plot, want only %d (the decimal slip)", flagged, demo.MistypedRow)
	}
	fuOpenTitled(t, b, demo.Titles[3])
	if v := attr(t, b, "check-independence", "data-verdict"); v != "warn" && v != "fail" {
		t.Errorf("demo D independence shows %q, want warn or fail", v)
	}

	// A second tap adds four more, with new IDs; nothing is overwritten.
	click(t, b, "demo-open")
	waitFor(t, b, "eight demo sessions", `tids("session-item", ' .pl-session-title').filter(e => e.textContent.startsWith("Demo (invented)")).length === 8`, 30*time.Second)
	ids := eval[[]string](t, b, `tids("session-item").map(e => e.dataset.id)`)
	seen := map[string]bool{}
	for _, id := range ids {
		if seen[id] {
			t.Errorf("session ID %s listed twice", id)
		}
		seen[id] = true
	}

	pb := newBrowser(t, phone)
	fuDemo(t, pb, srv)
	screenshot(t, pb, "demo-phone")
}
