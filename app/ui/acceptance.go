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

// criteriaTemplates is the templates kept on the device and the state of
// their part of the criteria card: the name being typed, the last message,
// the template whose deletion is being confirmed. It reads and writes the
// browser's localStorage it is given; the Shell applies a template's
// criteria through the controller.
type criteriaTemplates struct {
	list    []accTemplate
	name    string // the name typed for the criteria to save
	msg     string
	confirm string // name of the template whose deletion is asked
}

// load reads the saved templates (called once when the app starts).
func (t *criteriaTemplates) load(ls app.BrowserStorage) {
	var list []accTemplate
	if err := ls.Get(accTemplatesKey, &list); err != nil {
		t.msg = "The saved templates could not be read: " + err.Error()
		return
	}
	t.list = list
}

// byTemplateName orders templates by name, ignoring case (sort.Interface:
// sort.Slice would add a copy of the sort of its own to app.wasm).
type byTemplateName []accTemplate

func (s byTemplateName) Len() int      { return len(s) }
func (s byTemplateName) Swap(i, j int) { s[i], s[j] = s[j], s[i] }
func (s byTemplateName) Less(i, j int) bool {
	return strings.ToLower(s[i].Name) < strings.ToLower(s[j].Name)
}

// store writes the templates, sorted by name, to ls.
func (t *criteriaTemplates) store(ls app.BrowserStorage) {
	sort.Sort(byTemplateName(t.list))
	if err := ls.Set(accTemplatesKey, t.list); err != nil {
		t.msg = "The templates could not be saved on this device: " + err.Error()
	}
}

// apply makes a change of the templates asked for on the criteria card (a
// CardAction of kind caTplDelete, caTplKeep, caTplDeleteConfirm, caTplName
// or caTplSave; cur is the session's criteria, saved by caTplSave) and
// reports whether a was one of those.
func (t *criteriaTemplates) apply(ls app.BrowserStorage, a CardAction, cur fitcore.Criteria) bool {
	switch a.Kind {
	case caTplDelete:
		t.confirm = a.Key
	case caTplKeep:
		t.confirm = ""
	case caTplDeleteConfirm:
		out := t.list[:0:0]
		for _, x := range t.list {
			if x.Name != a.Key {
				out = append(out, x)
			}
		}
		t.list, t.confirm = out, ""
		t.store(ls)
	case caTplName:
		t.name = a.Text
	case caTplSave:
		t.save(ls, cur)
	default:
		return false
	}
	return true
}

// use returns the criteria of the template named name (false when there is
// none) and says they are now used.
func (t *criteriaTemplates) use(name string) (fitcore.Criteria, bool) {
	for _, x := range t.list {
		if x.Name == name {
			t.msg = "Criteria “" + x.Name + "” are now used for this session."
			return x.Criteria, true
		}
	}
	return fitcore.Criteria{}, false
}

// save keeps the criteria k on the device under the name typed, replacing
// a template of that name.
func (t *criteriaTemplates) save(ls app.BrowserStorage, k fitcore.Criteria) {
	name := strings.TrimSpace(t.name)
	if name == "" {
		t.msg = "Give the criteria a name first."
		return
	}
	replaced := false
	for i := range t.list {
		if t.list[i].Name == name {
			t.list[i].Criteria, replaced = k, true
		}
	}
	if !replaced {
		t.list = append(t.list, accTemplate{Name: name, Criteria: k})
	}
	t.name = ""
	t.msg = "Saved “" + name + "” on this device."
	t.store(ls)
}

func anCriteriaEmpty(k fitcore.Criteria) bool {
	return k.MinRSquared == nil && k.SlopeLow == nil && k.SlopeHigh == nil &&
		k.InterceptLow == nil && k.InterceptHigh == nil && k.MaxResidual == nil
}

// anSetCriteria stores changed criteria in the session's settings.
func (c *Shell) anSetCriteria(ctx app.Context, k fitcore.Criteria) {
	if c.ctl.sess == nil || c.refuseLocked() {
		return
	}
	if err := c.ctl.setCriteria(k); err != nil {
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
// number fields are noted for analysisUI.resync.
func (c *Shell) renderAcceptance() app.UI {
	k := c.ctl.criteria()
	if c.an.anFieldVals == nil {
		c.an.anFieldVals = map[string]string{}
	}
	for _, f := range criteriaFields {
		c.an.anFieldVals["acceptance_"+f.name] = anOptText(*f.get(&k))
	}
	card := &criteriaCard{
		Criteria: k, Set: c.ctl.sess.Settings.Acceptance != nil, HasLine: c.ctl.view.report != nil, Message: c.ctl.view.message,
		YUnit: c.ctl.sess.YUnit, FieldErr: c.an.anFieldErr,
		Templates: c.tpl.list, TplName: c.tpl.name, TplMsg: c.tpl.msg, TplConfirm: c.tpl.confirm,
		OnAction: c.cardAction,
	}
	if c.ctl.view.report != nil {
		card.Result = c.ctl.view.report.Acceptance
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
		kk := c.ctl.criteria()
		kk.MaxResidualPercentOfSpan = a.Key == "percent"
		c.anSetCriteria(ctx, kk)
	case caTplUse:
		// A template's criteria are the session's through the controller.
		if k, ok := c.tpl.use(a.Key); ok {
			c.an.anFieldErr = nil
			c.anSetCriteria(ctx, k)
		}
	default:
		c.tpl.apply(ctx.LocalStorage(), a, c.ctl.criteria())
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
	v, ok := c.an.optional(c.ctl.sess, field, text)
	if !ok {
		return
	}
	if why := criterionLimit(key, v); why != "" {
		c.an.anFieldErr[field] = why
		return
	}
	kk := c.ctl.criteria()
	for _, f := range criteriaFields {
		if f.name == key {
			*f.get(&kk) = v
		}
	}
	c.anSetCriteria(ctx, kk)
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
		anPText("an-stamp-summary", summary),
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
			return anPText("an-hint", "None yet. Save the criteria above under a name to reuse them in other sessions.")
		}),
		app.Ul().Class("an-tpl-list").Body(app.Range(r.Templates).Slice(func(i int) app.UI {
			t := r.Templates[i]
			if r.TplConfirm == t.Name {
				return app.Li().Class("an-tpl an-tpl-confirm").DataSet("testid", "template-item").DataSet("name", t.Name).Body(
					anSpanText("an-tpl-name", "Delete “"+t.Name+"”?"),
					anButton("pl-btn pl-btn-danger", "Delete", "template-delete-confirm").
						DataSet("name", t.Name).DataSet("act", caTplDeleteConfirm).OnClick(named),
					app.Button().Class("pl-btn pl-btn-quiet").Text("Keep").DataSet("act", caTplKeep).OnClick(named),
				)
			}
			return app.Li().Class("an-tpl").DataSet("testid", "template-item").DataSet("name", t.Name).Body(
				anSpanText("an-tpl-name", t.Name),
				anButton("pl-btn", "Use", "template-use").DataSet("name", t.Name).
					DataSet("act", caTplUse).OnClick(named),
				anButton("pl-btn pl-btn-quiet", "Delete", "template-delete").
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
			anButton("pl-btn", "Save criteria", "template-save").
				Disabled(anCriteriaEmpty(r.Criteria)).
				OnClick(func(ctx app.Context, e app.Event) { r.act(CardAction{Kind: caTplSave}) }),
		),
		app.If(r.TplMsg != "", func() app.UI {
			return app.P().Class("an-hint").Attr("role", "status").DataSet("testid", "template-message").Text(r.TplMsg)
		}),
	)
}
