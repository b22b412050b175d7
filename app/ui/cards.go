package ui

// The analysis cards' actions (line, checks, advice), as record.go does for
// the record's cards: each card is a go-app component whose data come in
// as exported fields (values and the report, no pointer into the Shell or
// the session), and what the technician does goes out as a CardAction
// through OnAction. The Shell applies it (applyCard): changes of the
// session through the controller's actions, the rest (a disclosure opened,
// a jump to a row) to its own screen state.
//
// A handler reads what it acts on from its component (or the element's
// data attributes) when it runs, not from variables of the render that
// made it: go-app keeps an element's first handler when a new one comes
// from the same function literal, and updates the component's fields in
// place.

import (
	"github.com/maxence-charriere/go-app/v10/pkg/app"
)

// Kinds of CardAction.
const (
	caToggle       = "toggle"        // the disclosure Key is opened or closed ("more-numbers", a check's id)
	caJump         = "jump"          // show the grid's row Row and put the focus on its x cell
	caApplyAdvice  = "advice-apply"  // take the advice's remedy into the settings
	caRevertAdvice = "advice-revert" // back to the plain, unweighted line

	caQuery        = "query"         // the question Key ("inverse", "predict") of "Use the line" typed as Text
	caSetting      = "setting"       // a chip of the settings card: Key "model:…", "weights:…", "transform:…", "level:…"
	caSettingField = "setting-field" // the settings card's number field Key typed as Text

	// The criteria card (acceptance.go).
	caCriterion        = "criterion"          // the criterion Key (a criteriaFields name) typed as Text; "" clears it
	caResidualUnit     = "residual-unit"      // the largest residual counted in Key "units" of y or "percent" of its span
	caTplUse           = "tpl-use"            // use the template named Key
	caTplDelete        = "tpl-delete"         // ask whether to delete the template named Key
	caTplKeep          = "tpl-keep"           // keep it after all
	caTplDeleteConfirm = "tpl-delete-confirm" // delete the template named Key
	caTplName          = "tpl-name"           // the name typed for saving the criteria is Text
	caTplSave          = "tpl-save"           // save the criteria in use under that name
)

// CardAction is one thing asked for on an analysis card.
type CardAction struct {
	Kind string
	Key  string
	Text string // what was typed
	Row  int
}

// cardAction applies what an analysis card asked for, in a turn of its own
// on the Shell's own context (dispatch: the card's element may be gone by
// the time it runs). Every component's OnAction does the same.
func (c *Shell) cardAction(a CardAction) {
	c.dispatch(func(ctx app.Context) { c.applyCard(ctx, a) })
}

// applyCard makes the change of a: the disclosures and the jump are the
// screen's; the advice goes through the controller.
func (c *Shell) applyCard(ctx app.Context, a CardAction) {
	switch a.Kind {
	case caToggle:
		if a.Key == "more-numbers" {
			c.an.anMoreOpen = !c.an.anMoreOpen
			return
		}
		if c.an.anOpen == nil {
			c.an.anOpen = map[string]bool{}
		}
		c.an.anOpen[a.Key] = !c.an.anOpen[a.Key]
	case caJump:
		c.anJump(ctx, a.Row)
	case caApplyAdvice:
		c.anAdvice(ctx, true)
	case caRevertAdvice:
		c.anAdvice(ctx, false)
	case caQuery:
		c.applyQuery(ctx, a)
	default:
		if a.Kind == caSetting || a.Kind == caSettingField {
			c.applySetting(ctx, a)
		} else {
			c.applyCriteria(ctx, a)
		}
		// The number fields show the criteria as stored (a refused text
		// stays for correcting).
		if ctx.Src() != nil {
			ctx.Defer(func(app.Context) { c.an.resync(&c.tpl) })
		}
	}
}

// anJump shows the grid page holding row and puts the focus on its x cell.
func (c *Shell) anJump(ctx app.Context, row int) {
	c.page = row / pageSize
	id := "x-input-" + itoa(row)
	show := func(ctx app.Context) {
		el := app.Window().Get("document").Call("querySelector", `[data-testid="`+id+`"]`)
		if el.Truthy() {
			el.Call("scrollIntoView", map[string]any{"block": "center"})
		}
		focus(id)
	}
	if ctx.Src() == nil {
		return // natively: no page to focus
	}
	ctx.Defer(show)
}
