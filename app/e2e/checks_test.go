//go:build e2e

package e2e

import (
	"fmt"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/chromedp"

	"pairline/app/demo"
	"pairline/fitcore"
)

// TestChecksSlippedDecimal: on the invented pressure check with one reading
// typed with a slipped decimal point (demo C), the influence check says so
// in fitcore's words, naming the reading, the value typed and what it
// probably is, and its "What to do" says to correct it.
func TestChecksSlippedDecimal(t *testing.T) {
	srv := startServer(t)
	b := newBrowser(t, phone)
	fuDemo(t, b, srv)
	ss, reps := fuReports(t)
	s, rep := ss[2], reps[2]
	if rep.Slip == nil {
		t.Fatal("fitcore names no slipped decimal point in demo C: the test proves nothing")
	}
	fuOpenTitled(t, b, s.Title)
	waitFor(t, b, "the influence check", `!!tid("check-influence-message")`, 20*time.Second)
	msg := textOf(t, b, "check-influence-message")
	if msg != rep.Assumptions.Influence.Message {
		t.Errorf("the influence check says %q, fitcore %q", msg, rep.Assumptions.Influence.Message)
	}
	typed := s.Readings[demo.MistypedRow].Y
	for _, want := range []string{"slipped decimal point", "Reading " + strconv.Itoa(demo.MistypedRow+1) + " ", typed} {
		if !strings.Contains(msg, want) {
			t.Errorf("the influence check's message lacks %q: %s", want, msg)
		}
	}
	if todo := textOf(t, b, "check-influence-advice"); !strings.Contains(todo, "decimal point slipped, correct it") {
		t.Errorf("the influence check's What to do is %q", todo)
	}
	if got := attr(t, b, "check-influence", "data-verdict"); got != string(rep.Assumptions.Influence.Verdict) {
		t.Errorf("the influence verdict is %q, fitcore %q", got, rep.Assumptions.Influence.Verdict)
	}
	eval[bool](t, b, `(tid("check-influence").scrollIntoView({block: 'center'}), true)`)
	viewShot(t, b, "checks-slip-phone")

	// The reading's panel says it in plain words; the technical figures
	// wait behind "Show the numbers".
	click(t, b, "plot-point-open")
	waitFor(t, b, "the panel on the slipped reading", fmt.Sprintf(`tid("plot-point-panel")?.dataset.row === "%d"`, demo.MistypedRow), 10*time.Second)
	flag := textOf(t, b, "plot-point-flagged")
	for _, want := range []string{"slipped decimal point", typed} {
		if !strings.Contains(flag, want) {
			t.Errorf("the panel's flag line lacks %q: %s", want, flag)
		}
	}
	if shown := eval[string](t, b, `tid("plot-point-panel").innerText`); strings.Contains(shown, "tudentized") || strings.Contains(shown, "Cook") {
		t.Errorf("the panel shows technical terms before \"Show the numbers\": %s", shown)
	}
	eval[bool](t, b, `(tid("plot-point-more").open = true, true)`)
	time.Sleep(200 * time.Millisecond)
	if shown := eval[string](t, b, `tid("plot-point-panel").innerText`); !strings.Contains(shown, "Studentized residual") || !strings.Contains(shown, "How far the line moves") {
		t.Errorf("\"Show the numbers\" does not show the figures with their meanings: %s", shown)
	}
	// Open, the panel still fits the screen and nothing of the page is
	// drawn over it.
	geo := eval[[]float64](t, b, `(() => { const r = tid("plot-point-panel").getBoundingClientRect();
		const pn = tid("plot-point-panel"), inside = [0.1, 0.5, 0.9].every(f => pn.contains(document.elementFromPoint(r.left + 40, r.top + f * r.height)));
		return [r.top, r.bottom, window.visualViewport.height, inside ? 1 : 0, pn.scrollHeight, pn.clientHeight]; })()`)
	t.Logf("the panel with its numbers open: %.0f–%.0f px of %.0f, content %.0f px in %.0f", geo[0], geo[1], geo[2], geo[4], geo[5])
	if geo[0] < 0 || geo[1] > geo[2] || geo[3] != 1 {
		t.Errorf("with its numbers open the panel is at %.0f–%.0f px of %.0f, or covered (inside %v)", geo[0], geo[1], geo[2], geo[3])
	}
	viewShot(t, b, "checks-slip-panel-phone")
}

// proportionalPairs are six standards from 1 to 50, two readings each
// (entered in rounds), y = 3 + 1.5x with a scatter of 5 % of the level:
// the usual case of a growing scatter. It returns the first record from
// the seed on whose spread fitcore advises a weighted line, and the seed.
func proportionalPairs(t *testing.T, seed uint64) ([][2]string, uint64) {
	t.Helper()
	std := []float64{1, 5, 10, 20, 35, 50}
	for k := seed; k < seed+400; k++ {
		r := rand.New(rand.NewPCG(k, 11))
		var pairs [][2]string
		for round := 0; round < 2; round++ {
			for _, x := range std {
				y := (3 + 1.5*x) * (1 + 0.05*r.NormFloat64())
				pairs = append(pairs, [2]string{strconv.FormatFloat(x, 'f', -1, 64), strconv.FormatFloat(y, 'f', 3, 64)})
			}
		}
		x, y := anParsed(t, pairs)
		rep := anAnalyze(t, x, y, fitcore.Options{})
		if rep.Advice == nil || rep.Assumptions.Spread.Verdict == fitcore.Pass {
			continue
		}
		if m, _, _ := rep.Advice.Remedy.Settings(); m == fitcore.ModelWeighted {
			return pairs, k
		}
	}
	t.Fatalf("no record of seeds %d–%d gets a weighted line as advice", seed, seed+399)
	return nil, 0
}

// TestChecksWeightedRemedy: readings whose scatter grows with the level
// get a weighted line as advice, with the checks before and after as
// fitcore gives them (Advice.Before and After); "use this" fits that
// weighted line (the slope fitcore computes with Remedy.Settings), the
// screen says a weighted line is in use, and undoing it gives back the
// plain line.
func TestChecksWeightedRemedy(t *testing.T) {
	pairs, seed := proportionalPairs(t, 1)
	x, y := anParsed(t, pairs)
	rep := anAnalyze(t, x, y, fitcore.Options{})
	remedy := rep.Advice.Remedy
	t.Logf("seed %d: spread %s, advice %s", seed, rep.Assumptions.Spread.Verdict, remedy)
	srv := startServer(t)
	b := newBrowser(t, tablet)
	b.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, b, "the app to start", appReady, 60*time.Second)
	anFill(t, b, pairs)
	waitFor(t, b, "the advice", fmt.Sprintf(`tid("advice")?.dataset.transform === %q`, string(remedy)), 20*time.Second)
	anCheckVerdicts(t, b, rep.Assumptions)
	var cand fitcore.Candidate
	for _, c := range rep.Advice.Candidates {
		if c.Remedy == remedy {
			cand = c
		}
	}
	anExpect(t, b, "advice-slope-before", "data-value", rep.Slope.Estimate)
	anExpect(t, b, "advice-slope-after", "data-value", cand.Slope)
	for id, ba := range map[string][2]fitcore.Verdict{
		"spread":    {rep.Advice.Before.Assumptions.Spread.Verdict, rep.Advice.After.Assumptions.Spread.Verdict},
		"linearity": {rep.Advice.Before.Assumptions.Linearity.Verdict, rep.Advice.After.Assumptions.Linearity.Verdict},
	} {
		if got := attr(t, b, "advice-row-"+id, "data-before"); got != string(ba[0]) {
			t.Errorf("advice %s before %q, fitcore %q", id, got, ba[0])
		}
		if got := attr(t, b, "advice-row-"+id, "data-after"); got != string(ba[1]) {
			t.Errorf("advice %s after %q, fitcore %q", id, got, ba[1])
		}
	}
	if rep.Advice.After.Assumptions.Spread.Verdict != fitcore.Pass {
		t.Errorf("the weighted line's own spread check is %s, want a pass", rep.Advice.After.Assumptions.Spread.Verdict)
	}
	eval[bool](t, b, `(tid("advice").scrollIntoView({block: 'start'}), true)`)
	viewShot(t, b, "checks-weighted-advice-tablet")

	click(t, b, "advice-apply")
	model, tr, w := remedy.Settings()
	wls := anAnalyze(t, x, y, fitcore.Options{Model: model, Transform: tr, Weights: w})
	waitFor(t, b, "the weighted line", fmt.Sprintf(`tid("result-slope")?.dataset.value === %q`, strconv.FormatFloat(wls.Slope.Estimate, 'g', -1, 64)), 10*time.Second)
	if !relClose(wls.Slope.Estimate, cand.Slope) {
		t.Errorf("the weighted line's slope %v differs from the advice's %v", wls.Slope.Estimate, cand.Slope)
	}
	anCheckVerdicts(t, b, wls.Assumptions)
	if !exists(t, b, "advice-applied") {
		t.Error("after applying, the screen does not say which line is in use")
	} else if got := textOf(t, b, "advice-applied"); !strings.Contains(strings.ToLower(got), "weight") {
		t.Errorf("the applied advice says %q, which does not name the weighting", got)
	}
	viewShot(t, b, "checks-weighted-applied-tablet")
	click(t, b, "advice-revert")
	waitFor(t, b, "the plain line again", fmt.Sprintf(`tid("result-slope")?.dataset.value === %q`, strconv.FormatFloat(rep.Slope.Estimate, 'g', -1, 64)), 10*time.Second)
}
