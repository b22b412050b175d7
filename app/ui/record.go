package ui

// The calibration record's cards: who, what and where (identity and
// conditions), the reference standards, the unknown samples and the
// sign-off. Each card is a go-app component of its own: its data come in
// as exported fields (values, no pointer into the session), and what the
// technician does goes out as a RecordAction through OnAction. The Shell
// applies the action to the session through its methods (which write the
// history) and re-analyses; no card holds a pointer back to the Shell.

import (
	"strconv"
	"strings"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/numfmt"
	"pairline/app/session"
)

// Kinds of RecordAction.
const (
	raField       = "field"        // Field (a session.Field… name) set to Value
	raCondition   = "condition"    // condition Index set to Condition (Index −1: add)
	raCondRemove  = "cond-remove"  // condition Index removed
	raStandard    = "standard"     // standard Index set to Standard (Index −1: add)
	raStdRemove   = "std-remove"   // standard Index removed
	raStdField    = "std-field"    // field Field of standard Index set to Value (expiry as yyyy-mm-dd)
	raCondField   = "cond-field"   // field Field (name, value, unit) of condition Index set to Value
	raUnknown     = "unknown"      // unknown Index set to Unknown (Index −1: add)
	raUnkRemove   = "unk-remove"   // unknown Index removed
	raSeal        = "seal"         // sign as performed by Value: seals the record
	raReview      = "review"       // sign as reviewed by Value
	raNewRevision = "new-revision" // unlock a sealed record for its next revision
	raUseLast     = "use-last"     // take the values of the last record of this instrument
)

// RecordAction is one change asked for on a record card.
type RecordAction struct {
	Kind      string
	Field     string
	Index     int
	Value     string
	Condition session.Condition
	Standard  session.Standard
	Unknown   session.Unknown
}

// recordFields are the texts of the identity card.
type recordFields struct {
	Site, Instrument, Serial, InstrumentID, Operator, Notes string
	Interval                                                string // days, as digits; "" = not set
	Temperature, TempUnit                                   string
}

// lastOffer is the last record of the same instrument (and site), offered
// to fill this one.
type lastOffer struct {
	Title, When string
	What        string // what would be taken, in words
}

// identityCard is the card of who, what and where.
type identityCard struct {
	app.Compo

	Fields     recordFields
	Conditions []session.Condition // the conditions other than the temperature, with their index in Index
	Index      []int
	Locked     bool
	Offer      *lastOffer
	OnAction   func(RecordAction)
}

func (r *identityCard) act(a RecordAction) {
	if r.OnAction != nil && !r.Locked {
		r.OnAction(a)
	}
}

func (r *identityCard) text(testid, label, value, field, placeholder string) app.UI {
	return app.Label().Class("pl-rec-field").Body(
		app.Span().Text(label),
		app.Input().Type("text").Value(value).DataSet("testid", testid).Attr("maxlength", strconv.Itoa(session.MaxShortText)).
			Attr("placeholder", placeholder).Disabled(r.Locked).
			OnChange(func(ctx app.Context, e app.Event) {
				r.act(RecordAction{Kind: raField, Field: field, Value: ctx.JSSrc().Get("value").String()})
			}),
	)
}

// Render draws the card.
func (r *identityCard) Render() app.UI {
	f := r.Fields
	return app.Section().Class("pl-card pl-record").Attr("aria-label", "Record").DataSet("testid", "record-card").Body(
		app.H2().Text("Record"),
		anPText("pl-hint", "Who, what and where: filled once per instrument. The values used last time for the same instrument and site are offered."),
		app.If(r.Offer != nil, func() app.UI {
			o := r.Offer
			return app.Div().Class("pl-rec-offer").DataSet("testid", "record-suggest").Body(
				app.P().Text("Last record of this instrument: “"+o.Title+"”, "+o.When+". It had "+o.What+"."),
				anButton("pl-btn", "Use those values", "record-suggest-use").Disabled(r.Locked).
					OnClick(func(ctx app.Context, e app.Event) { r.act(RecordAction{Kind: raUseLast}) }),
			)
		}),
		app.Div().Class("pl-rec-grid").Body(
			r.text("record-site", "Site", f.Site, session.FieldSite, "e.g. Larkwater intake (invented)"),
			r.text("record-instrument", "Instrument", f.Instrument, session.FieldInstrument, "maker and model"),
			r.text("record-serial", "Serial number", f.Serial, session.FieldSerial, ""),
			r.text("record-identifier", "Identifier (asset tag)", f.InstrumentID, session.FieldInstrumentID, ""),
			r.text("record-operator", "Operator", f.Operator, session.FieldOperator, "who took the readings"),
			app.Label().Class("pl-rec-field").Body(
				app.Span().Text("Calibration interval (days)"),
				app.Input().Type("text").Attr("inputmode", "numeric").Value(f.Interval).DataSet("testid", "record-interval").
					Disabled(r.Locked).OnChange(func(ctx app.Context, e app.Event) {
					r.act(RecordAction{Kind: raField, Field: session.FieldIntervalDays, Value: strings.TrimSpace(ctx.JSSrc().Get("value").String())})
				}),
			),
			app.Label().Class("pl-rec-field pl-rec-temp").Body(
				app.Span().Text("Temperature"),
				app.Span().Class("pl-rec-pair").Body(
					app.Input().Type("text").Attr("inputmode", "decimal").Value(f.Temperature).DataSet("testid", "record-temperature").
						Attr("aria-label", "Temperature").Disabled(r.Locked).OnChange(func(ctx app.Context, e app.Event) {
						r.act(RecordAction{Kind: raCondition, Field: session.ConditionTemperature, Value: ctx.JSSrc().Get("value").String()})
					}),
					app.Input().Type("text").Value(f.TempUnit).DataSet("testid", "record-temperature-unit").Class("pl-rec-unit").
						Attr("aria-label", "Unit of the temperature").Attr("placeholder", "°C").Disabled(r.Locked).
						OnChange(func(ctx app.Context, e app.Event) {
							r.act(RecordAction{Kind: raCondition, Field: session.ConditionTemperature + "-unit", Value: ctx.JSSrc().Get("value").String()})
						}),
				),
			),
		),
		app.H3().Text("Other conditions"),
		app.Ul().Class("pl-rec-list").Body(
			app.Range(r.Conditions).Slice(func(i int) app.UI { return r.condition(i) }),
		),
		anButton("pl-btn pl-btn-quiet", "+ Add a condition", "condition-add").Disabled(r.Locked).
			OnClick(func(ctx app.Context, e app.Event) {
				r.act(RecordAction{Kind: raCondition, Index: -1, Condition: session.Condition{}})
			}),
		app.Label().Class("pl-rec-field pl-rec-notes").Body(
			app.Span().Text("Notes"),
			app.Textarea().Text(f.Notes).DataSet("testid", "record-notes").Attr("rows", "3").
				Attr("maxlength", strconv.Itoa(session.MaxLongText)).Disabled(r.Locked).
				OnChange(func(ctx app.Context, e app.Event) {
					r.act(RecordAction{Kind: raField, Field: session.FieldNotes, Value: ctx.JSSrc().Get("value").String()})
				}),
		),
	)
}

func (r *identityCard) condition(i int) app.UI {
	cd := r.Conditions[i]
	idx := r.Index[i]
	scope := app.EventScope(strconv.Itoa(idx))
	// Each field goes out on its own (see standardsCard.item).
	set := func(name, v string) { r.act(RecordAction{Kind: raCondField, Index: idx, Field: name, Value: v}) }
	val := func(ctx app.Context) string { return ctx.JSSrc().Get("value").String() }
	return app.Li().Class("pl-rec-item").DataSet("testid", "condition-item").DataSet("index", strconv.Itoa(idx)).Body(
		app.Input().Type("text").Value(cd.Name).DataSet("testid", "condition-name").Attr("aria-label", "Condition").
			Attr("placeholder", "e.g. humidity").Disabled(r.Locked).
			OnChange(func(ctx app.Context, e app.Event) { set("name", val(ctx)) }, scope),
		app.Input().Type("text").Value(cd.Value).DataSet("testid", "condition-value").Attr("aria-label", "Value").Disabled(r.Locked).
			OnChange(func(ctx app.Context, e app.Event) {
				set("value", val(ctx))
			}, scope),
		app.Input().Type("text").Value(cd.Unit).DataSet("testid", "condition-unit").Attr("aria-label", "Unit").Class("pl-rec-unit").
			Disabled(r.Locked).OnChange(func(ctx app.Context, e app.Event) { set("unit", val(ctx)) }, scope),
		anButton("pl-btn pl-btn-quiet", "Remove", "condition-remove").Disabled(r.Locked).
			OnClick(func(ctx app.Context, e app.Event) {
				r.act(RecordAction{Kind: raCondRemove, Index: idx})
			}, scope),
	)
}

// standardRow is one standard as the card shows it.
type standardRow struct {
	session.Standard
	Expiry  string // yyyy-mm-dd or ""
	Expired string // the warning, "" when in date
}

// standardsCard lists the reference standards.
type standardsCard struct {
	app.Compo

	Standards []standardRow
	Problems  []string // why a standard's value or uncertainty is not used
	Day       string   // the day of the readings, as the expiry is checked against
	Locked    bool
	OnAction  func(RecordAction)
}

func (r *standardsCard) act(a RecordAction) {
	if r.OnAction != nil && !r.Locked {
		r.OnAction(a)
	}
}

// Render draws the card.
func (r *standardsCard) Render() app.UI {
	return app.Section().Class("pl-card pl-standards").Attr("aria-label", "Standards").Body(
		app.H2().Text("Reference standards"),
		anPText("pl-hint", "The standards whose certified values are the known x values. A reading whose x equals a standard's value "+
			"carries that standard's uncertainty into the unknowns' intervals. Expiry is checked against the day of the readings ("+r.Day+")."),
		app.Ul().Class("pl-rec-list").Body(
			app.Range(r.Standards).Slice(func(i int) app.UI { return r.item(i) }),
		),
		app.Range(r.Problems).Slice(func(i int) app.UI {
			return app.P().Class("pl-problem").DataSet("testid", "standard-problem").Text("▲ " + sentence(r.Problems[i]))
		}),
		anButton("pl-btn", "+ Add a standard", "standard-add").Disabled(r.Locked).
			OnClick(func(ctx app.Context, e app.Event) { r.act(RecordAction{Kind: raStandard, Index: -1}) }),
	)
}

func (r *standardsCard) item(i int) app.UI {
	st := r.Standards[i]
	scope := app.EventScope(strconv.Itoa(i))
	// Each field goes out on its own (the Shell sets it on the standard as
	// the session holds it then): a value captured at this render would be
	// stale when the next field is changed before the card is drawn again.
	field := func(testid, label, value, name, mode string) app.UI {
		in := app.Input().Type("text").Value(value).DataSet("testid", testid).Attr("maxlength", strconv.Itoa(session.MaxShortText)).
			Disabled(r.Locked).OnChange(func(ctx app.Context, e app.Event) {
			r.act(RecordAction{Kind: raStdField, Index: i, Field: name, Value: ctx.JSSrc().Get("value").String()})
		}, scope)
		if mode != "" {
			in = in.Attr("inputmode", mode)
		}
		return app.Label().Class("pl-rec-field").Body(app.Span().Text(label), in)
	}
	return app.Li().Class("pl-rec-item pl-std").DataSet("testid", "standard-item").DataSet("index", strconv.Itoa(i)).Body(
		app.Div().Class("pl-rec-grid").Body(
			field("standard-name", "Name or lot", st.Name, "name", ""),
			field("standard-certificate", "Certificate", st.Certificate, "certificate", ""),
			field("standard-value", "Certified value (x units)", st.Value, "value", "decimal"),
			field("standard-uncertainty", "Standard uncertainty (x units)", st.Uncertainty, "uncertainty", "decimal"),
			app.Label().Class("pl-rec-field").Body(
				app.Span().Text("Valid until"),
				app.Input().Type("date").Value(st.Expiry).DataSet("testid", "standard-expiry").Disabled(r.Locked).
					OnChange(func(ctx app.Context, e app.Event) {
						r.act(RecordAction{Kind: raStdField, Index: i, Field: "expiry", Value: ctx.JSSrc().Get("value").String()})
					}, scope),
			),
		),
		app.If(st.Expired != "", func() app.UI {
			return app.P().Class("pl-warn").Attr("role", "alert").DataSet("testid", "standard-expired").Text("⚠ " + st.Expired)
		}),
		anButton("pl-btn pl-btn-quiet", "Remove this standard", "standard-remove").Disabled(r.Locked).
			OnClick(func(ctx app.Context, e app.Event) { r.act(RecordAction{Kind: raStdRemove, Index: i}) }, scope),
	)
}

// unknownRow is one unknown sample as the card shows it: its readings and
// fitcore's inverse prediction (Value, Low, High in x units), or why there
// is none.
type unknownRow struct {
	Name     string
	Readings string // the repeats, as typed, joined by "; "
	Has      bool   // a conversion exists
	Value    float64
	Low      float64
	High     float64
	Bounded  bool
	Shown    string // the conversion in words and rounded numbers
	Message  string
}

// unknownsCard lists the unknown samples and takes new ones.
type unknownsCard struct {
	app.Compo

	Unknowns []unknownRow
	Problems []string
	Level    string // "95 %"
	XUnit    string
	Locked   bool
	OnAction func(RecordAction)

	name, readings string // the sample being entered
}

// Render draws the card.
func (r *unknownsCard) Render() app.UI {
	return app.Section().Class("pl-card pl-unknowns").Attr("aria-label", "Unknown samples").Body(
		app.H2().Text("Unknown samples"),
		anPText("pl-hint", "A sample measured with the instrument, converted to x through the line, with its "+r.Level+" interval. "+
			"Give one or more repeat readings, separated by spaces or semicolons."),
		app.Div().Class("pl-rec-grid").Body(
			app.Label().Class("pl-rec-field").Body(
				app.Span().Text("Sample name"),
				app.Input().Type("text").Value(typedValue("unknown-name", r.name)).DataSet("testid", "unknown-name").Attr("maxlength", strconv.Itoa(session.MaxShortText)).
					Disabled(r.Locked).OnInput(func(ctx app.Context, e app.Event) { r.name = takeTyped(ctx.JSSrc()) }),
			),
			app.Label().Class("pl-rec-field").Body(
				app.Span().Text("Readings (y)"),
				app.Input().Type("text").Value(typedValue("unknown-readings", r.readings)).DataSet("testid", "unknown-readings").Attr("inputmode", "decimal").
					Disabled(r.Locked).OnInput(func(ctx app.Context, e app.Event) { r.readings = takeTyped(ctx.JSSrc()) }),
			),
		),
		anButton("pl-btn", "Add sample", "unknown-add").Disabled(r.Locked).
			OnClick(func(ctx app.Context, e app.Event) {
				if r.OnAction == nil || r.Locked {
					return
				}
				u := session.Unknown{Name: strings.TrimSpace(r.name), Readings: splitRepeats(r.readings)}
				r.OnAction(RecordAction{Kind: raUnknown, Index: -1, Unknown: u})
				r.name, r.readings = "", ""
				clearInput(ctx, "unknown-name")
				clearInput(ctx, "unknown-readings")
			}),
		app.Range(r.Problems).Slice(func(i int) app.UI {
			return app.P().Class("pl-problem").DataSet("testid", "unknown-problem").Text("▲ " + sentence(r.Problems[i]))
		}),
		app.Ul().Class("pl-rec-list").Body(app.Range(r.Unknowns).Slice(func(i int) app.UI { return r.item(i) })),
	)
}

func (r *unknownsCard) item(i int) app.UI {
	u := r.Unknowns[i]
	li := app.Li().Class("pl-rec-item pl-unk").DataSet("testid", "unknown-item").DataSet("name", u.Name)
	if u.Has {
		li = li.DataSet("value", numfmt.Full(u.Value))
		if u.Bounded {
			li = li.DataSet("low", numfmt.Full(u.Low)).DataSet("high", numfmt.Full(u.High))
		}
	}
	return li.Body(
		app.Strong().Text(nonEmpty(u.Name, "(no name)")),
		anSpanText("pl-unk-readings", " — readings "+u.Readings),
		app.If(u.Shown != "", func() app.UI { return anPText("pl-unk-result", u.Shown) }),
		app.If(u.Message != "", func() app.UI { return anPText("pl-hint", u.Message) }),
		anButton("pl-btn pl-btn-quiet", "Remove", "unknown-remove").Disabled(r.Locked).
			OnClick(func(ctx app.Context, e app.Event) {
				if r.OnAction != nil && !r.Locked {
					r.OnAction(RecordAction{Kind: raUnkRemove, Index: i})
				}
			}, app.EventScope(strconv.Itoa(i))),
	)
}

// splitRepeats splits typed repeats at spaces and semicolons (a comma may
// be a decimal comma, so it does not separate).
func splitRepeats(s string) []string {
	f := strings.FieldsFunc(s, func(r rune) bool { return r == ';' || r == ' ' || r == '\t' || r == '\n' })
	if len(f) > session.MaxUnknownReadings {
		f = f[:session.MaxUnknownReadings]
	}
	return f
}

func nonEmpty(s, alt string) string {
	if strings.TrimSpace(s) == "" {
		return alt
	}
	return s
}

// clearInput empties an input the component keeps no value for (go-app
// does not clear an input whose value becomes empty: see resyncInputs).
func clearInput(ctx app.Context, testid string) {
	ctx.Defer(func(app.Context) {
		el := app.Window().Get("document").Call("querySelector", `[data-testid="`+testid+`"]`)
		if el.Truthy() {
			el.Set("value", "")
		}
	})
}

// sealInfo is the seal of the record as the sign-off card shows it.
type sealInfo struct {
	Revision     int
	Sealed       bool
	PerformedBy  string
	PerformedAt  string
	ReviewedBy   string
	ReviewedAt   string
	Digest       string
	Valid        bool   // VerifySeal
	Problem      string // why the seal does not verify
	Unlocked     bool   // the technician started the next revision; no change yet
	RevisionNote string // "revision N: changed since revision N−1 was sealed: …"
	Earlier      []earlierRevision
}

// earlierRevision is a sealed revision kept readable.
type earlierRevision struct {
	Revision int
	Signed   string
	Digest   string
	Results  string
	Readings int
}

// signCard is the sign-off: performed by, reviewed by, the seal.
type signCard struct {
	app.Compo

	Seal     sealInfo
	OnAction func(RecordAction)

	performed, reviewed string
}

// Render draws the card.
func (r *signCard) Render() app.UI {
	s := r.Seal
	act := func(a RecordAction) {
		if r.OnAction != nil {
			r.OnAction(a)
		}
	}
	return app.Section().Class("pl-card pl-sign").Attr("aria-label", "Sign-off").Body(
		app.H2().Text("Sign-off"),
		app.P().Class("pl-hint").DataSet("testid", "sign-caution").Text("⚠ A seal records who did and who reviewed this record and makes later changes show; "+
			"it is not a certification. For drinking water and other regulated or safety-related measurements, follow the instrument maker's "+
			"calibration procedure, your local codes and the judgement of licensed or accredited staff."),
		app.If(s.RevisionNote != "", func() app.UI {
			return app.P().Class("pl-warn").DataSet("testid", "revision-note").Text(s.RevisionNote)
		}),
		app.If(s.Sealed, func() app.UI {
			return app.Div().Class("pl-sealed").DataSet("testid", "sealed").DataSet("digest", s.Digest).
				DataSet("valid", strconv.FormatBool(s.Valid)).DataSet("revision", strconv.Itoa(s.Revision)).Body(
				app.P().Body(app.Strong().Text("Revision "+strconv.Itoa(s.Revision)+" is sealed.")),
				app.P().Text("Performed by "+s.PerformedBy+", "+s.PerformedAt+"."),
				app.If(s.ReviewedBy != "", func() app.UI { return app.P().Text("Reviewed by " + s.ReviewedBy + ", " + s.ReviewedAt + ".") }),
				anPText("pl-digest", "Digest (SHA-256): "+s.Digest),
				app.If(!s.Valid, func() app.UI {
					return anPText("pl-problem", "▲ The seal does not match the record: "+s.Problem)
				}),
				app.If(!s.Unlocked, func() app.UI {
					return anPText("pl-hint", "The readings, the settings and the results of a sealed record are frozen. "+
						"To change anything, start revision "+strconv.Itoa(s.Revision+1)+": the sealed revision "+strconv.Itoa(s.Revision)+
						" stays in the record as it was signed.")
				}),
				app.If(!s.Unlocked, func() app.UI {
					return anButton("pl-btn", "Start revision "+strconv.Itoa(s.Revision+1), "revision-start").
						OnClick(func(ctx app.Context, e app.Event) { act(RecordAction{Kind: raNewRevision}) })
				}).Else(func() app.UI {
					return app.P().Class("pl-warn").DataSet("testid", "revision-open").Text("Revision " + strconv.Itoa(s.Revision+1) +
						" is open: your next change starts it, and this record then needs a new seal.")
				}),
				app.If(s.ReviewedBy == "", func() app.UI {
					return app.Div().Class("pl-rec-grid").Body(
						app.Label().Class("pl-rec-field").Body(
							app.Span().Text("Reviewed by"),
							app.Input().Type("text").Value(typedValue("sign-reviewed", r.reviewed)).DataSet("testid", "sign-reviewed").
								OnInput(func(ctx app.Context, e app.Event) { r.reviewed = takeTyped(ctx.JSSrc()) }),
						),
						anButton("pl-btn", "Sign the review", "sign-review").
							OnClick(func(ctx app.Context, e app.Event) { act(RecordAction{Kind: raReview, Value: r.reviewed}) }),
					)
				}),
			)
		}).Else(func() app.UI {
			return app.Div().Body(
				anPText("pl-hint", "Sealing signs this revision of the record: the readings, settings, standards, unknowns and results "+
					"as they are now. A change afterwards starts a new revision; the sealed one stays readable."),
				app.Div().Class("pl-rec-grid").Body(
					app.Label().Class("pl-rec-field").Body(
						app.Span().Text("Performed by"),
						app.Input().Type("text").Value(typedValue("sign-performed", r.performed)).DataSet("testid", "sign-performed").
							OnInput(func(ctx app.Context, e app.Event) { r.performed = takeTyped(ctx.JSSrc()) }),
					),
				),
				anButton("pl-btn", "Seal this record", "seal").
					OnClick(func(ctx app.Context, e app.Event) { act(RecordAction{Kind: raSeal, Value: r.performed}) }),
			)
		}),
		app.If(len(s.Earlier) > 0, func() app.UI {
			return app.Details().Class("pl-earlier").DataSet("testid", "sealed-revisions").Body(
				app.Summary().Text("Earlier sealed revisions ("+strconv.Itoa(len(s.Earlier))+")"),
				app.Ul().Body(app.Range(s.Earlier).Slice(func(i int) app.UI {
					e := s.Earlier[i]
					return app.Li().DataSet("testid", "sealed-revision").DataSet("revision", strconv.Itoa(e.Revision)).DataSet("digest", e.Digest).Body(
						app.Strong().Text("Revision "+strconv.Itoa(e.Revision)),
						app.Text(": "+e.Signed+"; "+plCount(e.Readings, "reading")+". "),
						app.Span().Text(e.Results),
					)
				})),
			)
		}),
	)
}
