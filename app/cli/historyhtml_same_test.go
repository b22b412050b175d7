package cli

import (
	"html"
	"strings"
	"testing"
	"time"

	"pairline/app/history"
	"pairline/app/history/view"
	"pairline/app/wording"
)

// TestHistoryPageSaysWhatTheAppSays: for the invented three-instrument year
// (history.ScenarioRecords, with its acceptance criteria), every sentence
// the app's instrument view shows (view.Build, as app/ui renders it) is on
// the page of `pairline history --html` given the same limits, escaped as
// the page escapes text, and the due marks of the table of contents say the
// same. The expectation is the app's own wording, so the test fails as soon
// as either writer words history on its own again.
func TestHistoryPageSaysWhatTheAppSays(t *testing.T) {
	start := time.Date(2026, 1, 5, 9, 0, 0, 0, time.UTC)
	ss, err := history.ScenarioRecords(2026, start)
	if err != nil {
		t.Fatal(err)
	}
	var sums []history.Summary
	for _, s := range ss {
		sum, err := history.Summarize(s)
		if err != nil {
			t.Fatal(err)
		}
		sums = append(sums, sum)
	}
	for _, now := range []time.Time{start.AddDate(0, 11, 10), start.AddDate(1, 3, 0)} {
		app, err := view.Build(sums, now)
		if err != nil {
			t.Fatal(err)
		}
		if len(app.Items) != 3 {
			t.Fatalf("%d instruments in the app's view, want 3", len(app.Items))
		}
		for _, it := range app.Items {
			// The command's limits are the ones the app took from the
			// newest record that sets them.
			var mine []history.Summary
			var opt history.Options
			for _, s := range sums {
				if s.Key != it.Key {
					continue
				}
				mine = append(mine, s)
				if c := s.Criteria; c != nil {
					opt.SlopeLow, opt.SlopeHigh, opt.InterceptLow, opt.InterceptHigh = c.SlopeLow, c.SlopeHigh, c.InterceptLow, c.InterceptHigh
				}
			}
			opt.Now = now
			ins, err := history.Build(mine, opt)
			if err != nil || len(ins) != 1 {
				t.Fatalf("%s: %d instruments (%v)", it.Key, len(ins), err)
			}
			page := renderPage(t, htmlPage{Now: now, Files: len(mine), Opt: opt, Instances: ins})
			var says []string
			says = append(says, it.Due.Text)
			if it.Compare != nil {
				says = append(says, it.Compare.Headline, it.Compare.Slopes, it.Compare.Coincident)
				for _, d := range it.Compare.Diffs {
					says = append(says, d.Text)
				}
			} else {
				says = append(says, it.CompareWhy)
			}
			for _, d := range it.Drift {
				says = append(says, d.Text)
				if d.Leaves != "" {
					says = append(says, d.Leaves)
				}
			}
			for _, r := range it.Rows {
				says = append(says, r.VerdictText)
				if r.ChangeText != "" {
					says = append(says, r.ChangeText)
				}
			}
			for _, s := range says {
				if s == "" {
					t.Errorf("%s: an empty sentence in the app's view", it.Key)
					continue
				}
				if !strings.Contains(page, html.EscapeString(wording.Visible(s))) {
					t.Errorf("%s on %s: the app says %q, the page does not", it.Key, now.Format("2006-01-02"), s)
				}
			}
			if it.Compare != nil && !strings.Contains(page, `data-testid="hfile-today" data-verdict="`+it.Compare.Verdict+`" data-today="`+it.Compare.Today+`"`) {
				t.Errorf("%s: the page compares other calibrations than the app (%s against %s)", it.Key, it.Compare.Today, it.Compare.Previous)
			}
		}
	}
}
