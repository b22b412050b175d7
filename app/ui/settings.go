package ui

import (
	"math"
	"strconv"
	"strings"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/numfmt"
	"pairline/app/session"
	"pairline/app/wording"
	"pairline/fitcore"
)

// analysisUI is the UI-only state of the analysis cards (settings, the full
// numbers, checks, advice, using the line, acceptance). Nothing here is
// stored with the session: the session keeps only its Settings.
type analysisUI struct {
	anMoreOpen  bool            // "More numbers" disclosure
	anOpen      map[string]bool // check rows whose test numbers are shown
	anFieldErr  map[string]string
	anOtherOpen bool // the custom confidence level field is shown

	// Queries of "Use the line": they ride along in the one Analyze run.
	anInvText, anInvErr   string
	anInvY                []float64
	anPredText, anPredErr string
	anPredX               []float64
	anLineX               []float64 // x values of the original-units table (transformed fits)
	anReqSeq              int       // counts query changes, to answer only the latest in big sessions

	// anFieldVals is the text each number field was last rendered with,
	// and anSeenSess the session the fields were last synced for: go-app
	// leaves an input's text in place when its value becomes empty, so
	// resync writes the fields after a change (see resyncInputs).
	anFieldVals map[string]string
	anSeenSess  string
}

// resync writes each number field's rendered text into the page, except
// for fields whose typed text was refused (the text stays for correcting).
func (an *analysisUI) resync(t *criteriaTemplates) {
	doc := app.Window().Get("document")
	for f, v := range an.anFieldVals {
		if an.anFieldErr[f] != "" {
			continue
		}
		el := doc.Call("querySelector", `[data-an="field:`+f+`"]`)
		if el.Truthy() && el.Get("value").String() != v {
			el.Set("value", v)
		}
	}
	if el := doc.Call("querySelector", `[data-testid="template-name"]`); el.Truthy() && el.Get("value").String() != t.name {
		el.Set("value", t.name)
	}
}

// syncOnSwitch resyncs the fields once after another session (open) was
// opened.
func (an *analysisUI) syncOnSwitch(open *session.Session, t *criteriaTemplates) {
	if open == nil || open.ID == an.anSeenSess {
		return
	}
	first := an.anSeenSess == ""
	an.anSeenSess = open.ID
	an.anFieldErr = nil
	if first {
		return
	}
	var fn app.Func
	fn = app.FuncOf(func(this app.Value, args []app.Value) any {
		an.resync(t)
		fn.Release()
		return nil
	})
	app.Window().Call("setTimeout", fn, 0)
}

// queries adds the questions of "Use the line" and, on a transformed
// scale, the x values of the original-units table to the options of the
// one Analyze run of an edit. x are the usable readings.
func (an *analysisUI) queries(o *fitcore.Options, x []float64) {
	if len(an.anInvY) > 0 {
		o.Inverse = []fitcore.InverseQuery{{Y: append([]float64(nil), an.anInvY...)}}
	}
	o.PredictX = append([]float64(nil), an.anPredX...)
	an.anLineX = nil
	if o.Transform != "" && o.Transform != fitcore.TransformNone && len(x) > 0 {
		lo, hi := x[0], x[0]
		for _, v := range x {
			lo, hi = min(lo, v), max(hi, v)
		}
		const k = 5
		for i := range k {
			an.anLineX = append(an.anLineX, lo+(hi-lo)*float64(i)/float64(k-1))
		}
		o.PredictX = append(o.PredictX, an.anLineX...)
	}
}

// anSetSettings stores changed settings in the session (and its history)
// and re-analyses.
func (c *Shell) anSetSettings(ctx app.Context, st session.Settings) {
	if c.ctl.sess == nil || c.refuseLocked() {
		return
	}
	if err := c.ctl.setSettings(st); err != nil {
		c.notice = "This setting could not be used: " + err.Error()
		return
	}
	c.afterChange(ctx)
}

// tidySettings drops what the other settings make meaningless, so that the
// session never stores a combination fitcore.Options.Normalize refuses (and
// a save cannot fail because of it): a Box–Cox power without the Box–Cox
// scale, weights with a line through the origin or a Deming fit.
func tidySettings(st session.Settings) session.Settings {
	if st.Transform != fitcore.TransformBoxCox {
		st.BoxCoxLambda = nil
	}
	if st.Model == fitcore.ModelOrigin || st.Model == fitcore.ModelDeming {
		st.Weights = fitcore.WeightsNone
	}
	return st
}

// The changes the settings card offers, as functions of the settings: the
// chips and fields call them, and so do the tests.

// settingsWithModel chooses the model; a weighted model without a
// weighting gets 1/ŷ² (it needs no x other than zero, so a blank standard
// at x = 0 does not stop the fit), any other model drops the weights.
func settingsWithModel(s session.Settings, m fitcore.Model) session.Settings {
	s.Model = m
	switch m {
	case fitcore.ModelWeighted:
		if s.Weights == fitcore.WeightsNone || s.Weights == fitcore.WeightsGiven {
			s.Weights = fitcore.WeightsFitted2
		}
	default:
		s.Weights = fitcore.WeightsNone
	}
	return s
}

// settingsWithWeights chooses a weighting (and with it the weighted model).
func settingsWithWeights(s session.Settings, w fitcore.WeightScheme) session.Settings {
	s.Model, s.Weights = fitcore.ModelWeighted, w
	return s
}

// settingsWithTransform chooses the scale; a Box–Cox power goes with the
// Box–Cox scale only.
func settingsWithTransform(s session.Settings, t fitcore.Transform) session.Settings {
	s.Transform = t
	if t != fitcore.TransformBoxCox {
		s.BoxCoxLambda = nil
	}
	return s
}

// settingsWithLambda sets the Box–Cox power (nil: estimated).
func settingsWithLambda(s session.Settings, p *float64) session.Settings {
	s.BoxCoxLambda = p
	return s
}

// levelRangeText is the hint of the custom level field: the range fitcore
// accepts (fitcore.MinLevel to fitcore.MaxLevel), in percent.
func levelRangeText() string {
	return "between " + numfmt.Full(anPct(fitcore.MinLevel)) + " and " + numfmt.Full(anPct(fitcore.MaxLevel))
}

// levelFromPercent turns a typed level in percent into the fraction the
// session keeps. A level outside fitcore.MinLevel..fitcore.MaxLevel (which
// fitcore.Options.Normalize refuses) gives a message instead. The bounds are
// compared in percent, rounded like the field shows them, so that typing the
// shown upper bound (99.99) is not refused for binary noise in 99.99/100.
func levelFromPercent(p float64) (float64, string) {
	lo, hi := anPct(fitcore.MinLevel), anPct(fitcore.MaxLevel)
	if !(p >= lo && p <= hi) {
		return 0, "Not used: give a level " + levelRangeText() + " %."
	}
	// Rounded to the field's precision (anPct): 99.99 gives 0.9999 exactly.
	l := math.Round(p*1e4) / 1e6
	return math.Min(math.Max(l, fitcore.MinLevel), fitcore.MaxLevel), ""
}

// settingsWithLevel sets the confidence level (a fraction).
func settingsWithLevel(s session.Settings, l float64) session.Settings {
	s.Level = l
	return s
}

// settingsWithVarianceRatio sets Deming's δ (nil: 1).
func settingsWithVarianceRatio(s session.Settings, p *float64) session.Settings {
	s.VarianceRatio = anOr0(p)
	return s
}

// settingsWithSlopeRef sets the value the slope is tested against (nil: 1).
func settingsWithSlopeRef(s session.Settings, p *float64) session.Settings {
	s.SlopeRef = p
	return s
}

// settingsWithInterceptRef sets the value the intercept is tested against (nil: 0).
func settingsWithInterceptRef(s session.Settings, p *float64) session.Settings {
	s.InterceptRef = p
	return s
}

// settingsWithUncertainty sets the standard uncertainty of one x (or y)
// reading (nil: none given).
func settingsWithUncertainty(s session.Settings, x bool, p *float64) session.Settings {
	if x {
		s.XUncertainty = anOr0(p)
	} else {
		s.YUncertainty = anOr0(p)
	}
	return s
}

// parseAs reads one number as the readings of s are read (decimal comma
// allowed).
func parseAs(s *session.Session, text string) (float64, error) {
	if s != nil && s.DecimalComma != nil {
		return session.ParseNumberHint(text, *s.DecimalComma)
	}
	return session.ParseNumber(text)
}

// optional parses an optional number for field as the readings of s are
// read: empty text gives nil; a number refused says why in anFieldErr.
func (an *analysisUI) optional(s *session.Session, field, text string) (*float64, bool) {
	if an.anFieldErr == nil {
		an.anFieldErr = map[string]string{}
	}
	delete(an.anFieldErr, field)
	if strings.TrimSpace(text) == "" {
		return nil, true
	}
	v, err := parseAs(s, text)
	if err != nil {
		an.anFieldErr[field] = "Not used: " + err.Error() + "."
		return nil, false
	}
	return &v, true
}

var anModels = []struct {
	m     fitcore.Model
	label string
}{
	{fitcore.ModelOLS, "Least squares"},
	{fitcore.ModelOrigin, "Through zero"},
	{fitcore.ModelWeighted, "Weighted"},
	{fitcore.ModelDeming, "Deming (x has error)"},
}

var anWeightSchemes = []struct {
	w     fitcore.WeightScheme
	label string
}{
	{fitcore.WeightsX, "Scatter ∝ √x (w = 1/x)"},
	{fitcore.WeightsX2, "Scatter ∝ x (w = 1/x²)"},
	{fitcore.WeightsFitted2, "Scatter ∝ fitted y (w = 1/ŷ²)"},
	{fitcore.WeightsRepeats, "From repeats at each x"},
	{fitcore.WeightsPowerFit, "Power of x, estimated"},
}

var anTransforms = []struct {
	t     fitcore.Transform
	label string
}{
	{fitcore.TransformNone, "As read"},
	{fitcore.TransformLogY, "log y"},
	{fitcore.TransformSqrtY, "√y"},
	{fitcore.TransformReciprocal, "1/y"},
	{fitcore.TransformLogLog, "log y, log x"},
	{fitcore.TransformBoxCox, "Power of y (Box–Cox)"},
}

var anLevels = []float64{0.90, 0.95, 0.99}

// renderSettings hands the settings card its data: the settings as fitcore
// reads them (weights imply a weighted model) and the text of each number
// field shown, noted for analysisUI.resync.
func (c *Shell) renderSettings() app.UI {
	c.an.syncOnSwitch(c.ctl.sess, &c.tpl)
	st := c.ctl.sess.Settings
	model, tr := st.Model, st.Transform
	if o, err := st.Options().Normalize(); err == nil {
		model, tr = o.Model, o.Transform // weights imply a weighted model
	}
	if model == "" {
		model = fitcore.ModelOLS
	}
	if tr == "" {
		tr = fitcore.TransformNone
	}
	level := st.Level
	if level == 0 {
		level = fitcore.DefaultLevel
	}
	custom := true
	for _, l := range anLevels {
		if level == l {
			custom = false
		}
	}
	shown := map[string]bool{
		"settings_variance_ratio": model == fitcore.ModelDeming,
		"settings_box_cox_lambda": tr == fitcore.TransformBoxCox,
		"settings_level":          custom || c.an.anOtherOpen,
	}
	fields := map[string]string{}
	for _, f := range settingsFields {
		if show, ok := shown[f.name]; !ok || show {
			fields[f.name] = f.text(st)
		}
	}
	if c.an.anFieldVals == nil {
		c.an.anFieldVals = map[string]string{}
	}
	for f, v := range fields {
		c.an.anFieldVals[f] = v
	}
	return &settingsCard{
		Model: model, Transform: tr, Weights: st.Weights, Level: level, Custom: custom, OtherOpen: c.an.anOtherOpen,
		XUncertain: st.XUncertainty > 0, XUnit: c.ctl.sess.XUnit, YUnit: c.ctl.sess.YUnit,
		Fields: fields, FieldErr: c.an.anFieldErr, OnAction: c.cardAction,
	}
}

// applySetting makes a change asked for on the settings card: a chip (Key
// "model:…", "weights:…", "transform:…", "level:0.95", "level:other") or a
// number field (Key the field's name, Text as typed; parsed as the
// readings are), stored through the controller (anSetSettings).
func (c *Shell) applySetting(ctx app.Context, a CardAction) {
	st := c.ctl.sess.Settings
	if a.Kind == caSetting {
		kind, v, _ := strings.Cut(a.Key, ":")
		switch kind {
		case "model":
			c.anSetSettings(ctx, settingsWithModel(st, fitcore.Model(v)))
		case "weights":
			c.anSetSettings(ctx, settingsWithWeights(st, fitcore.WeightScheme(v)))
		case "transform":
			c.anSetSettings(ctx, settingsWithTransform(st, fitcore.Transform(v)))
		case "level":
			if v == "other" {
				c.an.anOtherOpen = true
				return
			}
			l, err := strconv.ParseFloat(v, 64)
			if err != nil {
				return
			}
			c.an.anOtherOpen = false
			c.anSetSettings(ctx, settingsWithLevel(st, l))
		}
		return
	}
	f, ok := settingsField(a.Key)
	if !ok {
		return
	}
	p, ok := c.an.optional(c.ctl.sess, a.Key, a.Text)
	if !ok {
		return
	}
	next, msg := f.set(st, p)
	switch {
	case msg == errKeep:
	case msg != "":
		c.an.anFieldErr[a.Key] = msg
	default:
		c.anSetSettings(ctx, next)
	}
}

// errKeep, as the message of a settings field's set, leaves the settings
// as they are without a word (an emptied level field).
const errKeep = "\x00"

// settingsFields are the settings card's number fields: the name (its
// test id with "-" for "_"), label and hint, the text it shows for the
// settings, and the settings with the value typed (nil: emptied), or why
// the value is not used. Adding a numeric setting is an entry here, its
// place in settingsCard.Render and its settingsWith… function.
var settingsFields = []settingField{
	{"settings_variance_ratio", "Variance ratio δ = var(y errors) / var(x errors)", "1 when left empty",
		func(st session.Settings) string { return anZeroText(st.VarianceRatio) },
		func(st session.Settings, p *float64) (session.Settings, string) {
			return settingsWithVarianceRatio(st, p), ""
		}},
	{"settings_box_cox_lambda", "Power λ", "estimated when left empty",
		func(st session.Settings) string { return anOptText(st.BoxCoxLambda) },
		func(st session.Settings, p *float64) (session.Settings, string) { return settingsWithLambda(st, p), "" }},
	{"settings_level", "Confidence level in %", levelRangeText(),
		func(st session.Settings) string {
			if st.Level == 0 {
				return numfmt.Full(anPct(fitcore.DefaultLevel))
			}
			return numfmt.Full(anPct(st.Level))
		},
		func(st session.Settings, p *float64) (session.Settings, string) {
			if p == nil {
				return st, errKeep
			}
			l, msg := levelFromPercent(*p)
			if msg != "" {
				return st, msg
			}
			return settingsWithLevel(st, l), ""
		}},
	{"settings_slope_ref", "Test the slope against", "1 when left empty",
		func(st session.Settings) string { return anOptText(st.SlopeRef) },
		func(st session.Settings, p *float64) (session.Settings, string) {
			return settingsWithSlopeRef(st, p), ""
		}},
	{"settings_intercept_ref", "Test the intercept against", "0 when left empty",
		func(st session.Settings) string { return anOptText(st.InterceptRef) },
		func(st session.Settings, p *float64) (session.Settings, string) {
			return settingsWithInterceptRef(st, p), ""
		}},
	{"settings_x_uncertainty", "Standard uncertainty of one x", "empty = x exact",
		func(st session.Settings) string { return anZeroText(st.XUncertainty) },
		func(st session.Settings, p *float64) (session.Settings, string) {
			return settingsWithUncertainty(st, true, p), ""
		}},
	{"settings_y_uncertainty", "Standard uncertainty of one y", "empty = not given",
		func(st session.Settings) string { return anZeroText(st.YUncertainty) },
		func(st session.Settings, p *float64) (session.Settings, string) {
			return settingsWithUncertainty(st, false, p), ""
		}},
}

// settingField is one number field of the settings card (settingsFields).
type settingField struct {
	name, label, hint string
	text              func(session.Settings) string
	set               func(st session.Settings, p *float64) (session.Settings, string)
}

// settingsField finds the settings card's number field by name.
func settingsField(name string) (f settingField, ok bool) {
	for _, f := range settingsFields {
		if f.name == name {
			return f, true
		}
	}
	return f, false
}

// settingsCard draws the fit settings: model, scale, confidence level,
// reference values and reading uncertainties.
type settingsCard struct {
	app.Compo

	Model     fitcore.Model
	Transform fitcore.Transform
	Weights   fitcore.WeightScheme
	Level     float64
	Custom    bool // Level is none of the chips' (anLevels)
	OtherOpen bool // "Other…" was chosen: the level field is shown

	XUncertain   bool // an x uncertainty is given
	XUnit, YUnit string

	Fields   map[string]string // the text of each number field shown, by name
	FieldErr map[string]string // why a typed value was not used, by field

	OnAction func(CardAction)
}

func (r *settingsCard) act(a CardAction) {
	if r.OnAction != nil {
		r.OnAction(a)
	}
}

// chip is one choice; its data-setting says what it sets, read when it is
// pressed (every chip's handler is the same function literal, and go-app
// keeps an element's first one).
func (r *settingsCard) chip(testid, label string, on bool, setting string) app.UI {
	return anChipUI(testid, label, on).DataSet("setting", setting).OnClick(func(ctx app.Context, e app.Event) {
		r.act(CardAction{Kind: caSetting, Key: ctx.JSSrc().Get("dataset").Get("setting").String()})
	})
}

// field is the number field of settingsFields named field; unit, when
// given, follows its label in brackets.
func (r *settingsCard) field(field, unit string) app.UI {
	f, _ := settingsField(field)
	label := f.label
	if unit != "" {
		label += " " + unit
	}
	return numberField(field, label, f.hint, r.Fields[field], r.FieldErr[field], func(ctx app.Context, e app.Event) {
		src := ctx.JSSrc()
		r.act(CardAction{Kind: caSettingField, Key: src.Get("dataset").Get("field").String(), Text: src.Get("value").String()})
	})
}

// Render draws the card.
func (r *settingsCard) Render() app.UI {
	model, tr, level := r.Model, r.Transform, r.Level
	return app.Section().Class("pl-card an-settings").Attr("aria-label", "Fit settings").DataSet("testid", "settings").Body(
		app.H2().Text("How the line is fitted"),
		anChoice("Model", "settings-model", func() []app.UI {
			out := make([]app.UI, len(anModels))
			for i, m := range anModels {
				out[i] = r.chip("settings-model-"+string(m.m), m.label, model == m.m, "model:"+string(m.m))
			}
			return out
		}()),
		app.If(model == fitcore.ModelWeighted, func() app.UI {
			return anChoice("Weights", "settings-weights", func() []app.UI {
				out := make([]app.UI, len(anWeightSchemes))
				for i, w := range anWeightSchemes {
					out[i] = r.chip("settings-weights-"+string(w.w), w.label, r.Weights == w.w, "weights:"+string(w.w))
				}
				return out
			}())
		}),
		app.If(model == fitcore.ModelDeming, func() app.UI {
			return r.field("settings_variance_ratio", "")
		}),
		anChoice("Scale", "settings-transform", func() []app.UI {
			out := make([]app.UI, len(anTransforms))
			for i, t := range anTransforms {
				out[i] = r.chip("settings-transform-"+string(t.t), t.label, tr == t.t, "transform:"+string(t.t))
			}
			return out
		}()),
		app.If(tr == fitcore.TransformBoxCox, func() app.UI {
			return r.field("settings_box_cox_lambda", "")
		}),
		anChoice("Confidence level", "settings-level", func() []app.UI {
			out := make([]app.UI, 0, len(anLevels)+1)
			for _, l := range anLevels {
				out = append(out, r.chip("settings-level-"+strconv.Itoa(int(l*100+0.5)), anPercent(l), level == l && !r.OtherOpen,
					"level:"+strconv.FormatFloat(l, 'g', -1, 64)))
			}
			out = append(out, r.chip("settings-level-other", "Other…", r.Custom || r.OtherOpen, "level:other"))
			return out
		}()),
		app.If(r.Custom || r.OtherOpen, func() app.UI {
			return r.field("settings_level", "")
		}),
		app.Div().Class("an-fields").Body(
			r.field("settings_slope_ref", ""),
			r.field("settings_intercept_ref", ""),
			r.field("settings_x_uncertainty", anParen(r.XUnit)),
			r.field("settings_y_uncertainty", anParen(r.YUnit)),
		),
		app.If(r.XUncertain, func() app.UI {
			return anPText("an-hint", "With an x uncertainty the checks also test whether x may be treated as exact.")
		}),
	)
}

// numberField is a labelled number input sent on change (Enter or leaving
// the field) to h, which reads the field's name from data-field; the
// data-an key lets analysisUI.resync write the text as stored.
func numberField(field, label, hint, value, problem string, h app.EventHandler) app.UI {
	in := app.Input().Type("text").Class("an-input").Value(value).
		Attr("inputmode", "decimal").Attr("autocomplete", "off").Attr("placeholder", hint).
		DataSet("testid", strings.ReplaceAll(field, "_", "-")).DataSet("an", "field:"+field).DataSet("field", field).
		OnChange(h)
	if problem != "" {
		in = in.Attr("aria-invalid", "true")
	}
	return app.Label().Class("an-field").Body(
		anSpanText("an-field-label", label),
		in,
		app.If(problem != "", func() app.UI { return anSpanText("pl-problem", problem) }),
	)
}

// anChoice is a labelled group of mutually exclusive buttons.
func anChoice(label, testid string, chips []app.UI) app.UI {
	return app.Div().Class("an-choice").Attr("role", "group").Attr("aria-label", label).DataSet("testid", testid).Body(
		anSpanText("an-choice-label", label),
		app.Div().Class("an-chips").Body(chips...),
	)
}

// anChipUI is a chip of a choice, on or off; its handler is the caller's.
func anChipUI(testid, label string, on bool) app.HTMLButton {
	cls := "an-chip"
	mark := ""
	if on {
		cls += " an-chip-on"
		mark = "● "
	}
	return app.Button().Class(cls).Text(mark+label).DataSet("testid", testid).
		Attr("aria-pressed", strconv.FormatBool(on))
}

func anOptText(p *float64) string {
	if p == nil {
		return ""
	}
	return numfmt.Full(*p)
}

func anZeroText(v float64) string {
	if v == 0 {
		return ""
	}
	return numfmt.Full(v)
}

func anOr0(p *float64) float64 {
	if p == nil {
		return 0
	}
	return *p
}

func anParen(unit string) string {
	if unit == "" {
		return ""
	}
	return "(" + unit + ")"
}

// anPercent writes a level as "95 %".
func anPercent(level float64) string { return wording.Percent(level) }

// anPct is a level in percent, rounded to hide binary noise (0.9 → 90).
func anPct(level float64) float64 { return math.Round(level*1e6) / 1e4 }

// anScale names the fitted scale of y and x ("ln y", "√y", …) and gives
// the units the coefficients carry on it.
type anScale struct {
	transformed bool
	yName       string // "y" in its unit, or the transformed quantity
	y           string // unit of fitted y values (intercept, residual SD)
	slope       string // unit of the slope
	sq          string // unit of sums of squares
	cov         string // unit of cov(intercept, slope)
}

func anScaleOf(rep *fitcore.Report, xu, yu string) anScale {
	s := anScale{yName: "y"}
	yq, xq := "", ""
	switch rep.Transform {
	case fitcore.TransformLogY:
		yq = "ln y"
	case fitcore.TransformLogLog:
		yq, xq = "ln y", "ln x"
	case fitcore.TransformSqrtY:
		yq = "√y"
	case fitcore.TransformReciprocal:
		yq = "1/y"
	case fitcore.TransformBoxCox:
		yq = "Box–Cox y"
		if rep.TransformLambda != nil {
			yq = "Box–Cox y (λ = " + numfmt.Sig(*rep.TransformLambda, 3) + ")"
		}
	}
	if yq == "" {
		if xu == "" && yu == "" {
			return s
		}
		s.y = yu
		s.slope = wording.SlopeUnit(yu, xu)
		if yu != "" {
			s.sq = "(" + yu + ")²"
			s.cov = s.sq + " per " + unitOr(xu, "x")
		}
		return s
	}
	s.transformed = true
	s.yName = yq
	xs := unitOr(xu, "x")
	if xq != "" {
		xs = xq
	}
	s.y = "in " + yq
	s.slope = yq + " per " + xs
	s.sq = "(" + yq + ")²"
	s.cov = s.sq + " per " + xs
	return s
}

// anCoefTable is one coefficient: the estimate, its interval (where a
// technician looks first), the standard error, the test against the
// reference value and, only when that reference is not 0, the test against
// 0 (otherwise the two are the same test; rows are never repeated). The
// labels are app/wording's, as in the report and the command.
func anCoefTable(id, name string, k fitcore.Coefficient, unit, lvl string, sig int) app.UI {
	p := "result-" + id + "-"
	ref := wording.Ref(k.Ref)
	rows := []app.UI{
		anRow(p+"estimate", wording.Estimate, k.Estimate, numfmt.Sig(k.Estimate, sig), unit),
		app.Tr().Body(
			app.Th().Attr("scope", "row").Text(lvl+" interval"),
			app.Td().Body(
				anNum(p+"ci-low", k.CILow, numfmt.Sig(k.CILow, sig)),
				app.Span().Text(" to "),
				anNum(p+"ci-high", k.CIHigh, numfmt.Sig(k.CIHigh, sig)),
				app.If(unit != "", func() app.UI { return anSpanText("pl-unit", " "+unit) }),
			),
		),
		anRow(p+"se", wording.StandardError, k.SE, numfmt.Sig(k.SE, 3), unit),
		anRow(p+"ref", wording.TestedAgainst, k.Ref, ref, unit),
		anRow(p+"t-ref", wording.TAgainst(ref), k.TRef, numfmt.Sig(k.TRef, 4), ""),
		anRow(p+"p-ref", wording.PAgainst(ref), k.PRef, anP(k.PRef), ""),
	}
	if wording.ShowPlainTest(k.Ref) {
		zero := wording.Ref(0)
		rows = append(rows,
			anRow(p+"t", wording.TAgainst(zero), k.T, numfmt.Sig(k.T, 4), ""),
			anRow(p+"p", wording.PAgainst(zero), k.P, anP(k.P), ""),
		)
	}
	return app.Table().Class("an-table an-kv").DataSet("testid", "coef-"+id).Body(
		app.Caption().Text(name),
		app.TBody().Body(rows...),
	)
}

func anAnova(rep *fitcore.Report, sig int, sc anScale) app.UI {
	if len(rep.Anova) == 0 {
		return nil
	}
	head := "Sum of squares"
	if sc.sq != "" {
		head += " " + sc.sq
	}
	return anScroll("Analysis of variance").Body(
		app.Table().Class("an-table an-anova").DataSet("testid", "anova").Body(
			app.Caption().Text("Analysis of variance"),
			app.THead().Body(app.Tr().Body(
				app.Th().Text("Source"), app.Th().Text("df"), app.Th().Text(head),
				app.Th().Text("Mean square"), app.Th().Text("F"), app.Th().Text("p"),
			)),
			app.TBody().Body(app.Range(rep.Anova).Slice(func(i int) app.UI {
				r := rep.Anova[i]
				id := "anova-" + strconv.Itoa(i) + "-"
				hasF := r.Source == "regression"
				hasMS := !strings.HasPrefix(r.Source, "total")
				return app.Tr().Body(
					app.Th().Attr("scope", "row").Text(anSource(r.Source)),
					app.Td().Body(anNum(id+"df", r.DF, anDF(r.DF))),
					app.Td().Body(anNum(id+"ss", r.SS, numfmt.Sig(r.SS, sig))),
					app.Td().Body(app.If(hasMS, func() app.UI { return anNum(id+"ms", r.MS, numfmt.Sig(r.MS, sig)) })),
					app.Td().Body(app.If(hasF, func() app.UI { return anNum(id+"f", r.F, numfmt.Sig(r.F, 4)) })),
					app.Td().Body(app.If(hasF, func() app.UI { return anNum(id+"p", r.P, anP(r.P)) })),
				)
			})),
		),
	)
}

func anSource(s string) string {
	switch strings.ToLower(s) {
	case "regression":
		return "Line"
	case "residual":
		return "Scatter about the line"
	case "total":
		return "Total"
	case "total (uncorrected)":
		return "Total (about zero)"
	}
	return s
}

// anRow is one labelled number of a two-column table.
func anRow(testid, label string, v float64, shown, unit string) app.UI {
	return app.Tr().Body(
		app.Th().Attr("scope", "row").Text(label),
		app.Td().Body(
			anNum(testid, v, shown),
			app.If(unit != "", func() app.UI { return anSpanText("pl-unit", " "+unit) }),
		),
	)
}

// anNum shows a number with its full value in data-value.
func anNum(testid string, v float64, shown string) app.UI {
	s := app.Span().Class("an-num").DataSet("value", numfmt.Full(v)).Text(shown)
	if testid != "" {
		s = s.DataSet("testid", testid)
	}
	return s
}

// anFullText writes a value the technician typed (a reference, a query x)
// as given, with a real minus sign (wording.Ref).
func anFullText(v float64) string { return wording.Ref(v) }

// anP writes a p-value: two significant digits, "< 0.0001" below that
// (wording.P, as the report and the command).
func anP(p float64) string { return wording.P(p) }

// anDF writes degrees of freedom: whole numbers as such (wording.DF).
func anDF(df float64) string { return wording.DF(df) }
