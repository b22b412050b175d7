package ui

import (
	"sort"
	"strings"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/fitcore"
)

// accTemplate is a named set of acceptance criteria a team reuses. The
// templates live in the browser's localStorage (so they work offline and
// across sessions on one device); the criteria in use are stored with each
// session in its Settings.
type accTemplate struct {
	Name     string           `json:"name"`
	Criteria fitcore.Criteria `json:"criteria"`
}

// accTemplatesKey is the localStorage key of the templates.
const accTemplatesKey = "pairline.acceptance-templates"

// anLoadTemplates reads the saved templates (called once when the app starts).
func (c *Shell) anLoadTemplates(ctx app.Context) {
	var t []accTemplate
	if err := ctx.LocalStorage().Get(accTemplatesKey, &t); err != nil {
		c.anTplMsg = "The saved templates could not be read: " + err.Error()
		return
	}
	c.anTemplates = t
}

func (c *Shell) anStoreTemplates(ctx app.Context) {
	sort.Slice(c.anTemplates, func(i, j int) bool {
		return strings.ToLower(c.anTemplates[i].Name) < strings.ToLower(c.anTemplates[j].Name)
	})
	if err := ctx.LocalStorage().Set(accTemplatesKey, c.anTemplates); err != nil {
		c.anTplMsg = "The templates could not be saved on this device: " + err.Error()
	}
}

// anCriteria returns a copy of the session's criteria (zero when none).
func (c *Shell) anCriteria() fitcore.Criteria { return c.criteria() }

func anCriteriaEmpty(k fitcore.Criteria) bool {
	return k.MinRSquared == nil && k.SlopeLow == nil && k.SlopeHigh == nil &&
		k.InterceptLow == nil && k.InterceptHigh == nil && k.MaxResidual == nil
}

// anSetCriteria stores changed criteria in the session's settings.
func (c *Shell) anSetCriteria(ctx app.Context, k fitcore.Criteria) {
	if c.sess == nil || c.refuseLocked() {
		return
	}
	if err := c.setCriteria(k); err != nil {
		c.notice = "This setting could not be used: " + err.Error()
		return
	}
	c.afterChange(ctx)
}

// renderAcceptance draws the acceptance criteria of the session, the
// templates, the pass/fail stamp with its reasons and the caution.
func (c *Shell) renderAcceptance() app.UI {
	k := c.anCriteria()
	field := func(name, label, hint string, p *float64, set func(*fitcore.Criteria, *float64)) app.UI {
		return c.anNumberField("acceptance_"+name, label, hint, anOptText(p), func(ctx app.Context, v *float64) {
			if name == "min_r2" && v != nil && (*v < 0 || *v > 1) {
				c.anFieldErr["acceptance_"+name] = "Not used: R² lies between 0 and 1 (for example 0.999)."
				return
			}
			if name == "max_residual" && v != nil && *v < 0 {
				c.anFieldErr["acceptance_"+name] = "Not used: give a size, zero or more."
				return
			}
			kk := c.anCriteria()
			set(&kk, v)
			c.anSetCriteria(ctx, kk)
		})
	}
	yu := c.sess.YUnit
	if yu == "" {
		yu = "y units"
	}
	return app.Section().Class("pl-card an-accept").Attr("aria-label", "Acceptance").Body(
		app.H2().Text("Does the line meet your criteria?"),
		c.anStamp(),
		anCaution(),
		app.Div().Class("an-fields").Body(
			field("min_r2", "R² at least", "e.g. 0.999", k.MinRSquared, func(k *fitcore.Criteria, v *float64) { k.MinRSquared = v }),
			field("slope_low", "Slope at least", "empty = no lower limit", k.SlopeLow, func(k *fitcore.Criteria, v *float64) { k.SlopeLow = v }),
			field("slope_high", "Slope at most", "empty = no upper limit", k.SlopeHigh, func(k *fitcore.Criteria, v *float64) { k.SlopeHigh = v }),
			field("intercept_low", "Intercept at least", "empty = no lower limit", k.InterceptLow, func(k *fitcore.Criteria, v *float64) { k.InterceptLow = v }),
			field("intercept_high", "Intercept at most", "empty = no upper limit", k.InterceptHigh, func(k *fitcore.Criteria, v *float64) { k.InterceptHigh = v }),
			field("max_residual", "Largest residual allowed", "empty = not used", k.MaxResidual, func(k *fitcore.Criteria, v *float64) { k.MaxResidual = v }),
		),
		c.anChoice("Largest residual counted", "acceptance-residual-unit", []app.UI{
			c.anChip("acceptance-residual-units", "in "+yu, !k.MaxResidualPercentOfSpan, func(ctx app.Context, e app.Event) {
				kk := c.anCriteria()
				kk.MaxResidualPercentOfSpan = false
				c.anSetCriteria(ctx, kk)
			}),
			c.anChip("acceptance-residual-percent", "in % of the span of y", k.MaxResidualPercentOfSpan, func(ctx app.Context, e app.Event) {
				kk := c.anCriteria()
				kk.MaxResidualPercentOfSpan = true
				c.anSetCriteria(ctx, kk)
			}),
		}),
		c.anTemplatesUI(k),
	)
}

// anStamp is the pass/fail stamp: data-verdict pass, fail, or n/a when no
// criteria are set or there is no line.
func (c *Shell) anStamp() app.UI {
	rep := c.view.report
	verdict, icon, word, cls := "n/a", "○", "No criteria set", "an-v-na"
	var res *fitcore.AcceptanceResult
	if rep != nil {
		res = rep.Acceptance
	}
	summary := "Set criteria below, or choose a saved template, to get a pass or fail."
	switch {
	case res != nil && len(res.Results) > 0 && res.Pass:
		verdict, icon, word, cls = "pass", "✔", "Accepted", "an-v-pass"
		summary = res.Summary
	case res != nil && len(res.Results) > 0:
		verdict, icon, word, cls = "fail", "✖", "Not accepted", "an-v-fail"
		summary = res.Summary
	case rep == nil && c.sess.Settings.Acceptance != nil:
		word = "No line to judge yet"
		summary = c.view.message
	}
	var reasons []app.UI
	if res != nil {
		for _, r := range res.Results {
			ic := "✔"
			rc := "an-v-pass"
			if !r.Pass {
				ic, rc = "✖", "an-v-fail"
			}
			reasons = append(reasons, app.Li().Class("an-reason-item "+rc).DataSet("testid", "verdict-reason").
				DataSet("name", r.Name).DataSet("pass", boolText(r.Pass)).Body(
				app.Span().Class("an-badge-icon").Attr("aria-hidden", "true").Text(ic+" "),
				app.Span().Text(r.Reason),
			))
		}
	}
	return app.Div().Class("an-stamp "+cls).DataSet("testid", "verdict").DataSet("verdict", verdict).Attr("role", "status").Body(
		app.P().Class("an-stamp-word").Body(
			app.Span().Class("an-badge-icon").Attr("aria-hidden", "true").Text(icon+" "),
			app.Span().Text(word),
		),
		app.P().Class("an-stamp-summary").Text(summary),
		app.If(len(reasons) > 0, func() app.UI { return app.Ul().Class("an-reasons").Body(reasons...) }),
	)
}

func boolText(b bool) string {
	if b {
		return "true"
	}
	return "false"
}

// anTemplatesUI lists the saved templates (use, delete) and saves the
// current criteria under a name.
func (c *Shell) anTemplatesUI(k fitcore.Criteria) app.UI {
	return app.Div().Class("an-templates").DataSet("testid", "acceptance-templates").Body(
		app.H3().Text("Saved criteria on this device"),
		app.If(len(c.anTemplates) == 0, func() app.UI {
			return app.P().Class("an-hint").Text("None yet. Save the criteria above under a name to reuse them in other sessions.")
		}),
		app.Ul().Class("an-tpl-list").Body(app.Range(c.anTemplates).Slice(func(i int) app.UI {
			t := c.anTemplates[i]
			if c.anTplConfirmDl == t.Name {
				return app.Li().Class("an-tpl an-tpl-confirm").DataSet("testid", "template-item").DataSet("name", t.Name).Body(
					app.Span().Class("an-tpl-name").Text("Delete “"+t.Name+"”?"),
					app.Button().Class("pl-btn pl-btn-danger").Text("Delete").DataSet("testid", "template-delete-confirm").
						DataSet("an", "tpl-delete-confirm:"+t.Name).
						OnClick(c.anOn("tpl-delete-confirm:"+t.Name, func(ctx app.Context, e app.Event) {
							out := c.anTemplates[:0:0]
							for _, x := range c.anTemplates {
								if x.Name != t.Name {
									out = append(out, x)
								}
							}
							c.anTemplates, c.anTplConfirmDl = out, ""
							c.anStoreTemplates(ctx)
						})),
					app.Button().Class("pl-btn pl-btn-quiet").Text("Keep").
						OnClick(func(ctx app.Context, e app.Event) { c.anTplConfirmDl = "" }),
				)
			}
			return app.Li().Class("an-tpl").DataSet("testid", "template-item").DataSet("name", t.Name).Body(
				app.Span().Class("an-tpl-name").Text(t.Name),
				app.Button().Class("pl-btn").Text("Use").DataSet("testid", "template-use").DataSet("an", "tpl-use:"+t.Name).
					OnClick(c.anOn("tpl-use:"+t.Name, func(ctx app.Context, e app.Event) {
						c.anFieldErr = nil
						c.anSetCriteria(ctx, t.Criteria)
						c.anTplMsg = "Criteria “" + t.Name + "” are now used for this session."
					})),
				app.Button().Class("pl-btn pl-btn-quiet").Text("Delete").DataSet("testid", "template-delete").
					DataSet("an", "tpl-delete:"+t.Name).
					OnClick(c.anOn("tpl-delete:"+t.Name, func(ctx app.Context, e app.Event) { c.anTplConfirmDl = t.Name })),
			)
		})),
		app.Div().Class("an-tpl-save").Body(
			app.Input().Type("text").Class("an-input").Value(c.anTplName).
				Attr("aria-label", "Name for these criteria").Attr("placeholder", "Name, e.g. Conductivity, weekly check").
				DataSet("testid", "template-name").
				OnInput(func(ctx app.Context, e app.Event) { c.anTplName = ctx.JSSrc().Get("value").String() }),
			app.Button().Class("pl-btn").Text("Save criteria").DataSet("testid", "template-save").
				Disabled(anCriteriaEmpty(k)).
				OnClick(func(ctx app.Context, e app.Event) {
					name := strings.TrimSpace(c.anTplName)
					if name == "" {
						c.anTplMsg = "Give the criteria a name first."
						return
					}
					kk := c.anCriteria()
					replaced := false
					for i := range c.anTemplates {
						if c.anTemplates[i].Name == name {
							c.anTemplates[i].Criteria, replaced = kk, true
						}
					}
					if !replaced {
						c.anTemplates = append(c.anTemplates, accTemplate{Name: name, Criteria: kk})
					}
					c.anTplName = ""
					c.anTplMsg = "Saved “" + name + "” on this device."
					c.anStoreTemplates(ctx)
				}),
		),
		app.If(c.anTplMsg != "", func() app.UI {
			return app.P().Class("an-hint").Attr("role", "status").DataSet("testid", "template-message").Text(c.anTplMsg)
		}),
	)
}
