package ui

import (
	"strings"
	"testing"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/numfmt"
	"pairline/app/session"
	"pairline/fitcore"
)

// cardsShell is a Shell natively with a short invented calibration open.
func cardsShell(t *testing.T) *Shell {
	t.Helper()
	t0 := time.Date(2026, 7, 1, 8, 0, 0, 0, time.UTC)
	s, err := session.New("Invented card check", t0, nil)
	if err != nil {
		t.Fatal(err)
	}
	for i, p := range [][2]string{{"1", "2.1"}, {"2", "4.0"}, {"3", "6.1"}, {"4", "7.9"}, {"5", "10.2"}} {
		s.AddRow(p[0], p[1], t0.Add(time.Duration(i)*time.Minute))
	}
	return propShell(t, s)
}

// TestApplyCard: the actions the cards send change the session through the
// controller (the criteria, the settings, a question to the line) or the
// screen's own state (a disclosure), and a value the card's rules refuse
// leaves the session as it was and says why beside the field.
func TestApplyCard(t *testing.T) {
	tests := []struct {
		name  string
		a     CardAction
		check func(c *Shell) string // "" when right
	}{
		{"criterion typed", CardAction{Kind: caCriterion, Key: "min_r2", Text: "0.999"}, func(c *Shell) string {
			if k := c.ctl.criteria(); k.MinRSquared == nil || *k.MinRSquared != 0.999 {
				return "R² at least 0.999 not stored"
			}
			if c.ctl.view.report.Acceptance == nil || len(c.ctl.view.report.Acceptance.Results) != 1 {
				return "the criterion was not judged"
			}
			return ""
		}},
		{"criterion out of range", CardAction{Kind: caCriterion, Key: "min_r2", Text: "2"}, func(c *Shell) string {
			if c.ctl.sess.Settings.Acceptance != nil {
				return "an R² of 2 was stored"
			}
			if !strings.Contains(c.an.anFieldErr["acceptance_min_r2"], "between 0 and 1") {
				return "no reason beside the field: " + c.an.anFieldErr["acceptance_min_r2"]
			}
			return ""
		}},
		{"criterion not a number", CardAction{Kind: caCriterion, Key: "max_residual", Text: "abc"}, func(c *Shell) string {
			if c.ctl.sess.Settings.Acceptance != nil || c.an.anFieldErr["acceptance_max_residual"] == "" {
				return "text that is no number was stored or not refused"
			}
			return ""
		}},
		{"residual in % of the span", CardAction{Kind: caResidualUnit, Key: "percent"}, func(c *Shell) string {
			// Without a residual limit there is nothing to count: the
			// session keeps no criteria.
			if c.ctl.sess.Settings.Acceptance != nil {
				return "a unit alone was stored as criteria"
			}
			c.applyCard(app.Context{}, CardAction{Kind: caCriterion, Key: "max_residual", Text: "1"})
			c.applyCard(app.Context{}, CardAction{Kind: caResidualUnit, Key: "percent"})
			if k := c.ctl.criteria(); !k.MaxResidualPercentOfSpan || k.MaxResidual == nil || *k.MaxResidual != 1 {
				return "the largest residual is not counted in % of the span"
			}
			return ""
		}},
		{"model chip", CardAction{Kind: caSetting, Key: "model:" + string(fitcore.ModelDeming)}, func(c *Shell) string {
			if c.ctl.sess.Settings.Model != fitcore.ModelDeming || c.ctl.view.report.Model != fitcore.ModelDeming {
				return "the Deming fit was not taken"
			}
			return ""
		}},
		{"level chip", CardAction{Kind: caSetting, Key: "level:0.99"}, func(c *Shell) string {
			if c.ctl.sess.Settings.Level != 0.99 || c.ctl.view.report.Level != 0.99 {
				return "the 99 % level was not taken"
			}
			return ""
		}},
		{"level typed out of range", CardAction{Kind: caSettingField, Key: "settings_level", Text: "101"}, func(c *Shell) string {
			if c.ctl.view.report.Level != fitcore.DefaultLevel || c.an.anFieldErr["settings_level"] == "" {
				return "a level of 101 % was stored or not refused"
			}
			return ""
		}},
		{"slope reference typed", CardAction{Kind: caSettingField, Key: "settings_slope_ref", Text: "2"}, func(c *Shell) string {
			if p := c.ctl.sess.Settings.SlopeRef; p == nil || *p != 2 || c.ctl.view.report.Slope.Ref != 2 {
				return "the slope is not tested against 2"
			}
			return ""
		}},
		{"question to the line", CardAction{Kind: caQuery, Key: "predict", Text: "2.5"}, func(c *Shell) string {
			if len(c.an.anPredX) != 1 || c.an.anPredX[0] != 2.5 || c.ctl.view.report.Predictions[0].X != 2.5 {
				return "no prediction at x = 2.5"
			}
			return ""
		}},
		{"disclosure", CardAction{Kind: caToggle, Key: "linearity"}, func(c *Shell) string {
			if !c.an.anOpen["linearity"] {
				return "the numbers of the linearity check are not shown"
			}
			return ""
		}},
		{"revert with nothing applied", CardAction{Kind: caRevertAdvice}, func(c *Shell) string {
			if c.ctl.sess.Settings.Transform != fitcore.TransformNone || c.ctl.sess.Settings.Weights != fitcore.WeightsNone {
				return "the plain line has a transform or weights"
			}
			return ""
		}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			c := cardsShell(t)
			c.applyCard(app.Context{}, tt.a)
			if msg := tt.check(c); msg != "" {
				t.Error(msg)
			}
		})
	}
}

// TestCardsRender: each card draws from its data alone (natively, as go-app
// prerenders), with the numbers fitcore computed in data-value.
func TestCardsRender(t *testing.T) {
	c := cardsShell(t)
	rep := c.ctl.view.report
	cards := []struct {
		name string
		ui   app.UI
		want []string
	}{
		{"line", c.renderLine(), []string{`data-testid="result-slope"`, `data-value="` + numfmt.Full(rep.Slope.Estimate) + `"`}},
		{"checks", c.renderChecks(), []string{`data-testid="check-linearity"`, `data-slope="` + numfmt.Full(rep.Slope.Estimate) + `"`}},
		{"criteria", c.renderAcceptance(), []string{`data-testid="verdict"`, `data-verdict="n/a"`, `data-testid="acceptance-min-r2"`}},
		{"use", c.renderUseLine(), []string{`data-testid="inverse-input"`, `data-testid="limits"`}},
		{"settings", c.renderSettings(), []string{`data-testid="settings-model-ols"`, `an-chip an-chip-on`, `data-field="settings_slope_ref"`}},
		{"advice", c.renderAdvice(), []string{`data-testid="advice"`}},
	}
	for _, k := range cards {
		html := app.HTMLString(k.ui)
		for _, w := range k.want {
			if !strings.Contains(html, w) {
				t.Errorf("%s card: %q not in its markup", k.name, w)
			}
		}
	}
}
