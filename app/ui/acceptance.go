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

// criteriaFields are the criteria the card's number fields set, by the
// name of the field (acceptance_NAME), in the order shown.
var criteriaFields = []struct {
	name, label, hint string
	get               func(*fitcore.Criteria) **float64
}{
	{"min_r2", "R² at least", "e.g. 0.999", func(k *fitcore.Criteria) **float64 { return &k.MinRSquared }},
	{"slope_low", "Slope at least", "empty = no lower limit", func(k *fitcore.Criteria) **float64 { return &k.SlopeLow }},
	{"slope_high", "Slope at most", "empty = no upper limit", func(k *fitcore.Criteria) **float64 { return &k.SlopeHigh }},
	{"intercept_low", "Intercept at least", "empty = no lower limit", func(k *fitcore.Criteria) **float64 { return &k.InterceptLow }},
	{"intercept_high", "Intercept at most", "empty = no upper limit", func(k *fitcore.Criteria) **float64 { return &k.InterceptHigh }},
	{"max_residual", "Largest residual allowed", "empty = not used", func(k *fitcore.Criteria) **float64 { return &k.MaxResidual }},
}

// renderAcceptance hands the criteria card its data. The texts of its
// number fields are noted for anResync.
func (c *Shell) renderAcceptance() app.UI {
	k := c.anCriteria()
	if c.anFieldVals == nil {
		c.anFieldVals = map[string]string{}
	}
	for _, f := range criteriaFields {
		c.anFieldVals["acceptance_"+f.name] = anOptText(*f.get(&k))
	}
	card := &criteriaCard{
		Criteria: k, Set: c.sess.Settings.Acceptance != nil, HasLine: c.view.report != nil, Message: c.view.message,
		YUnit: c.sess.YUnit, FieldErr: c.anFieldErr,
		Templates: c.anTemplates, TplName: c.anTplName, TplMsg: c.anTplMsg, TplConfirm: c.anTplConfirmDl,
		OnAction: c.cardAction,
	}
	if c.view.report != nil {
		card.Result = c.view.report.Acceptance
	}
	return card
}

// applyCriteria makes a change asked for on the criteria card: a criterion
// typed (parsed as the readings are, checked, then stored through the
// controller), the unit of the largest residual, or the templates.
func (c *Shell) applyCriteria(ctx app.Context, a CardAction) {
	switch a.Kind {
	case caCriterion:
		c.applyCriterion(ctx, a.Key, a.Text)
	case caResidualUnit:
		kk := c.anCriteria()
		kk.MaxResidualPercentOfSpan = a.Key == "percent"
		c.anSetCriteria(ctx, kk)
	case caTplUse:
		c.useTemplate(ctx, a.Key)
	case caTplDelete:
		c.anTplConfirmDl = a.Key
	case caTplKeep:
		c.anTplConfirmDl = ""
	case caTplDeleteConfirm:
		out := c.anTemplates[:0:0]
		for _, x := range c.anTemplates {
			if x.Name != a.Key {
				out = append(out, x)
			}
		}
		c.anTemplates, c.anTplConfirmDl = out, ""
		c.anStoreTemplates(ctx)
	case caTplName:
		c.anTplName = a.Text
	case caTplSave:
		c.saveTemplate(ctx)
	}
}

// criterionLimit says why value v of criterion key is not used ("" when it
// is fine): R² lies in [0, 1], the largest residual is a size ≥ 0.
func criterionLimit(key string, v *float64) string {
	switch {
	case v == nil:
	case key == "min_r2" && (*v < 0 || *v > 1):
		return "Not used: R² lies between 0 and 1 (for example 0.999)."
	case key == "max_residual" && *v < 0:
		return "Not used: give a size, zero or more."
	}
	return ""
}

// applyCriterion takes the text typed for criterion key: parsed as the
// readings are, checked (criterionLimit), then stored through the
// controller; a reason beside the field otherwise.
func (c *Shell) applyCriterion(ctx app.Context, key, text string) {
	field := "acceptance_" + key
	v, ok := c.anOptional(field, text)
	if !ok {
		return
	}
	if why := criterionLimit(key, v); why != "" {
		c.anFieldErr[field] = why
		return
	}
	kk := c.anCriteria()
	for _, f := range criteriaFields {
		if f.name == key {
			*f.get(&kk) = v
		}
	}
	c.anSetCriteria(ctx, kk)
}

// useTemplate makes the criteria of the template named name this session's.
func (c *Shell) useTemplate(ctx app.Context, name string) {
	for _, t := range c.anTemplates {
		if t.Name == name {
			c.anFieldErr = nil
			c.anSetCriteria(ctx, t.Criteria)
			c.anTplMsg = "Criteria “" + t.Name + "” are now used for this session."
		}
	}
}

// saveTemplate keeps the session's criteria on the device under the name
// typed, replacing a template of that name.
func (c *Shell) saveTemplate(ctx app.Context) {
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
}

// criteriaCard draws the acceptance criteria of the session, the
// templates, the pass/fail stamp with its reasons and the caution.
type criteriaCard struct {
	app.Compo

	Criteria fitcore.Criteria
	Set      bool                      // the session has criteria
	Result   *fitcore.AcceptanceResult // nil: no line, or no criteria
	HasLine  bool
	Message  string // why there is no line
	YUnit    string
	FieldErr map[string]string // why a typed criterion was not used, by field

	Templates                   []accTemplate
	TplName, TplMsg, TplConfirm string

	OnAction func(CardAction)
}

func (r *criteriaCard) act(a CardAction) {
	if r.OnAction != nil {
		r.OnAction(a)
	}
}

// Render draws the card.
func (r *criteriaCard) Render() app.UI {
	k := r.Criteria
	yu := r.YUnit
	if yu == "" {
		yu = "y units"
	}
	fields := make([]app.UI, len(criteriaFields))
	for i, f := range criteriaFields {
		fields[i] = r.field(f.name, f.label, f.hint, anOptText(*f.get(&k)))
	}
	return app.Section().Class("pl-card an-accept").Attr("aria-label", "Acceptance").Body(
		app.H2().Text("Does the line meet your criteria?"),
		r.stamp(),
		anCaution(),
		app.Div().Class("an-fields").Body(fields...),
		anChoice("Largest residual counted", "acceptance-residual-unit", []app.UI{
			r.chip("acceptance-residual-units", "in "+yu, !k.MaxResidualPercentOfSpan, "units"),
			r.chip("acceptance-residual-percent", "in % of the span of y", k.MaxResidualPercentOfSpan, "percent"),
		}),
		r.templates(),
	)
}

// field is one criterion's number field (numberField).
func (r *criteriaCard) field(name, label, hint, value string) app.UI {
	field := "acceptance_" + name
	return numberField(field, label, hint, value, r.FieldErr[field], func(ctx app.Context, e app.Event) {
		src := ctx.JSSrc()
		name := strings.TrimPrefix(src.Get("dataset").Get("field").String(), "acceptance_")
		r.act(CardAction{Kind: caCriterion, Key: name, Text: src.Get("value").String()})
	})
}

func (r *criteriaCard) chip(testid, label string, on bool, unit string) app.UI {
	return anChipUI(testid, label, on).DataSet("unit", unit).OnClick(func(ctx app.Context, e app.Event) {
		r.act(CardAction{Kind: caResidualUnit, Key: ctx.JSSrc().Get("dataset").Get("unit").String()})
	})
}

// stamp is the pass/fail stamp: data-verdict pass, fail, or n/a when no
// criteria are set or there is no line.
func (r *criteriaCard) stamp() app.UI {
	verdict, icon, word, cls := "n/a", "○", "No criteria set", "an-v-na"
	res := r.Result
	summary := "Set criteria below, or choose a saved template, to get a pass or fail."
	switch {
	case res != nil && len(res.Results) > 0 && res.Pass:
		verdict, icon, word, cls = "pass", "✔", "Accepted", "an-v-pass"
		summary = res.Summary
	case res != nil && len(res.Results) > 0:
		verdict, icon, word, cls = "fail", "✖", "Not accepted", "an-v-fail"
		summary = res.Summary
	case !r.HasLine && r.Set:
		word = "No line to judge yet"
		summary = r.Message
	}
	var reasons []app.UI
	if res != nil {
		for _, x := range res.Results {
			ic := "✔"
			rc := "an-v-pass"
			if !x.Pass {
				ic, rc = "✖", "an-v-fail"
			}
			reasons = append(reasons, app.Li().Class("an-reason-item "+rc).DataSet("testid", "verdict-reason").
				DataSet("name", x.Name).DataSet("pass", boolText(x.Pass)).Body(
				app.Span().Class("an-badge-icon").Attr("aria-hidden", "true").Text(ic+" "),
				app.Span().Text(x.Reason),
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

// templates lists the saved templates (use, delete) and saves the
// current criteria under a name.
func (r *criteriaCard) templates() app.UI {
	// The buttons of an item say what they do in data-act and name their
	// template in data-name, both read when pressed: go-app keeps a
	// button's first handler when the item changes (a "Use" button becomes
	// the confirming "Delete"), since every handler comes from this one
	// function literal.
	named := func(ctx app.Context, e app.Event) {
		ds := ctx.JSSrc().Get("dataset")
		r.act(CardAction{Kind: ds.Get("act").String(), Key: ds.Get("name").String()})
	}
	return app.Div().Class("an-templates").DataSet("testid", "acceptance-templates").Body(
		app.H3().Text("Saved criteria on this device"),
		app.If(len(r.Templates) == 0, func() app.UI {
			return app.P().Class("an-hint").Text("None yet. Save the criteria above under a name to reuse them in other sessions.")
		}),
		app.Ul().Class("an-tpl-list").Body(app.Range(r.Templates).Slice(func(i int) app.UI {
			t := r.Templates[i]
			if r.TplConfirm == t.Name {
				return app.Li().Class("an-tpl an-tpl-confirm").DataSet("testid", "template-item").DataSet("name", t.Name).Body(
					app.Span().Class("an-tpl-name").Text("Delete “"+t.Name+"”?"),
					app.Button().Class("pl-btn pl-btn-danger").Text("Delete").DataSet("testid", "template-delete-confirm").
						DataSet("name", t.Name).DataSet("act", caTplDeleteConfirm).OnClick(named),
					app.Button().Class("pl-btn pl-btn-quiet").Text("Keep").DataSet("act", caTplKeep).OnClick(named),
				)
			}
			return app.Li().Class("an-tpl").DataSet("testid", "template-item").DataSet("name", t.Name).Body(
				app.Span().Class("an-tpl-name").Text(t.Name),
				app.Button().Class("pl-btn").Text("Use").DataSet("testid", "template-use").DataSet("name", t.Name).
					DataSet("act", caTplUse).OnClick(named),
				app.Button().Class("pl-btn pl-btn-quiet").Text("Delete").DataSet("testid", "template-delete").
					DataSet("name", t.Name).DataSet("act", caTplDelete).OnClick(named),
			)
		})),
		app.Div().Class("an-tpl-save").Body(
			app.Input().Type("text").Class("an-input").Value(typedValue("template-name", r.TplName)).
				Attr("aria-label", "Name for these criteria").Attr("placeholder", "Name, e.g. Conductivity, weekly check").
				DataSet("testid", "template-name").
				OnInput(func(ctx app.Context, e app.Event) {
					r.act(CardAction{Kind: caTplName, Text: takeTyped(ctx.JSSrc())})
				}),
			app.Button().Class("pl-btn").Text("Save criteria").DataSet("testid", "template-save").
				Disabled(anCriteriaEmpty(r.Criteria)).
				OnClick(func(ctx app.Context, e app.Event) { r.act(CardAction{Kind: caTplSave}) }),
		),
		app.If(r.TplMsg != "", func() app.UI {
			return app.P().Class("an-hint").Attr("role", "status").DataSet("testid", "template-message").Text(r.TplMsg)
		}),
	)
}
