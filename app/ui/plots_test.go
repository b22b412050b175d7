package ui

import (
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"
	"time"

	"pairline/app/demo"
	"pairline/app/session"
	"pairline/fitcore"
)

// analyzed runs fitcore on s as the Shell does (with the plot grid).
func analyzed(t testing.TB, s *session.Session) (*fitcore.Report, []int) {
	t.Helper()
	x, y, rows, _ := s.Pairs()
	opt := s.Settings.Options()
	opt.PredictX = append(opt.PredictX, plGrid(x, opt.Transform == fitcore.TransformLogLog)...)
	rep, err := fitcore.Analyze(x, y, opt)
	if err != nil {
		t.Fatal(err)
	}
	return rep, rows
}

// bigSessionOf is an invented straight line with even noise (common practice
// for a load test: the values do not matter, the count does), with a few
// readings left out.
func bigSessionOf(t testing.TB, n int) *session.Session {
	t.Helper()
	now := time.Date(2026, 5, 1, 8, 0, 0, 0, time.UTC)
	s, err := session.New("Invented load test", now, nil)
	if err != nil {
		t.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(1, 2))
	s.Readings = make([]session.Reading, n)
	for i := range s.Readings {
		x := float64(i) / 10
		s.Readings[i] = session.Reading{X: strconv.FormatFloat(x, 'f', 1, 64), Y: strconv.FormatFloat(2*x+1+rng.NormFloat64(), 'f', 3, 64)}
	}
	s.Readings[n/2].Y = "99999" // one wild reading, which must be drawn
	for _, r := range []int{3, 7} {
		if err := s.Exclude(r, "invented reason", now); err != nil {
			t.Fatal(err)
		}
	}
	return s
}

func TestPlotsThinOnlyForDrawing(t *testing.T) {
	s := bigSessionOf(t, 10000)
	rep, rows := analyzed(t, s)
	ps := plBuild(s, rep, rows, -1)
	if ps.Total != rep.N || rep.N != 9998 {
		t.Fatalf("total %d, n %d", ps.Total, rep.N)
	}
	if ps.Drawn > plotMaxDraw || ps.Drawn < plotMaxDraw/2 {
		t.Errorf("drew %d points, want at most %d and not far fewer", ps.Drawn, plotMaxDraw)
	}
	if got := len(ps.Marks["plot-fit"]); got != ps.Drawn+2 || !strings.Contains(ps.Fit, `data-count="`+strconv.Itoa(got)+`"`) {
		t.Errorf("fit plot has %d markers, want %d drawn + 2 left out, and says so in data-count", got, ps.Drawn)
	}
	drawn := func(id string, row int) bool {
		for _, m := range ps.Marks[id] {
			if m.Row == row {
				return true
			}
		}
		return false
	}
	if !drawn("plot-fit", s.Count().Rows/2) {
		t.Error("the wild reading was thinned away")
	}
	for _, p := range rep.Influence {
		if p.Flagged && (!drawn("plot-residuals", rows[p.Index]) || !strings.Contains(ps.Residuals, `data-row="`+strconv.Itoa(rows[p.Index])+`"`)) {
			t.Fatalf("flagged reading %d is not drawn as a flagged marker", rows[p.Index])
		}
	}
	for _, svg := range []string{ps.Fit, ps.Residuals, ps.Order, ps.QQ} {
		if strings.Contains(svg, "NaN") || strings.Contains(svg, "Inf") {
			t.Fatal("non-finite number in a plot")
		}
	}
}

// The band drawn is fitcore's: the grid predictions are the last
// plotGridN of the report, at the grid x values.
func TestPlotBandIsFitcores(t *testing.T) {
	ss, err := demo.Sessions(time.Now(), nil)
	if err != nil {
		t.Fatal(err)
	}
	for _, s := range ss {
		rep, _ := analyzed(t, s)
		band := plBand(rep)
		x, _, _, _ := s.Pairs()
		grid := plGrid(x, false)
		if len(band) != plotGridN {
			t.Fatalf("%s: %d band points", s.Title, len(band))
		}
		for i, p := range band {
			if p.X != grid[i] {
				t.Fatalf("%s: band x %v, grid %v", s.Title, p.X, grid[i])
			}
			if !(p.PILow <= p.CILow && p.CILow <= p.Fit && p.Fit <= p.CIHigh && p.CIHigh <= p.PIHigh) {
				t.Errorf("%s: band at %v not nested: %+v", s.Title, p.X, p)
			}
		}
		// Slope of the drawn line equals the fitted slope (untransformed fits).
		d := (band[plotGridN-1].Fit - band[0].Fit) / (band[plotGridN-1].X - band[0].X)
		if math.Abs(d-rep.Slope.Estimate) > 1e-9*math.Max(1, math.Abs(rep.Slope.Estimate)) {
			t.Errorf("%s: drawn slope %v, fitted %v", s.Title, d, rep.Slope.Estimate)
		}
	}
}

func BenchmarkPlots1000(b *testing.B)  { benchPlots(b, 1000) }
func BenchmarkPlots10000(b *testing.B) { benchPlots(b, 10000) }

func benchPlots(b *testing.B, n int) {
	s := bigSessionOf(b, n)
	rep, rows := analyzed(b, s)
	for b.Loop() {
		_ = plBuild(s, rep, rows, 5)
	}
}

func BenchmarkReport1000(b *testing.B) {
	s := bigSessionOf(b, 1000)
	rep, rows := analyzed(b, s)
	for b.Loop() {
		_ = rpFile(s, rpBody(s, rep, rows, "", time.Now()))
	}
}
