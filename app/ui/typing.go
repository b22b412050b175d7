package ui

// Keys typed ahead of the app. A text box whose text goes into the app with
// every key (a grid cell, a name, a question to the line) is drawn again
// from the app's copy of that text. go-app takes an input event in one turn
// and draws frames in others, and a frame can come between a key reaching
// the box and the app taking it: writing the app's copy, one key older,
// into the box then loses that key (the next key lands after the older
// text). So each such box remembers, in a property of its element
// (takenProp), the text the app last took from it or wrote into it; while
// the box holds something else, keys are on their way and a redraw leaves
// the box as it is. The waiting input events bring the app's copy up to it.
//
// A handler hands what it took to the app through a dispatch, a turn later,
// so a redraw can also come between the taking and the app's copy holding
// it. Until the app's copy has reached the text taken (pendingProp), a
// redraw that would write an older text keeps the box as it is too; once it
// has, a text the app writes (a box cleared after saving) is shown.

import "github.com/maxence-charriere/go-app/v10/pkg/app"

// takenProp is the property of an input element that holds the text the app
// last took from it (takeTyped) or wrote into it (keepTyped).
const takenProp = "plTaken"

// pendingProp is true on an input element from takeTyped until a redraw
// finds the app's copy equal to the text taken.
const pendingProp = "plTakenPending"

// takeTyped is what an input handler reads: the box's text, noted as taken
// and not yet in the app's copy.
func takeTyped(src app.Value) string {
	v := src.Get("value").String()
	src.Set(takenProp, v)
	src.Set(pendingProp, true)
	return v
}

// keepTyped returns the text a redraw gives the input element el: text (the
// app's copy), unless keys were typed into el since the app last took or
// wrote its text, or the text last taken has not reached the app's copy
// yet; then what el holds. An element not yet on the page (not Truthy), or
// one the app never took from, gets text.
func keepTyped(el app.Value, text string) string {
	if !el.Truthy() {
		return text
	}
	live := el.Get("value").String()
	if taken := el.Get(takenProp); taken.Type() == app.TypeString {
		if live != taken.String() {
			return live
		}
		if el.Get(pendingProp).Truthy() {
			if text != live {
				return live // the dispatch with the text taken is still to come
			}
			el.Set(pendingProp, false)
		}
	}
	el.Set(takenProp, text) // what this redraw writes: nothing runs before the page has it
	return text
}

// typedValue is keepTyped for the input with that data-testid on the page.
// Natively (prerendering) it is text.
func typedValue(testid, text string) string {
	if !app.IsClient {
		return text
	}
	doc := app.Window().Get("document")
	if !doc.Truthy() {
		return text
	}
	return keepTyped(doc.Call("querySelector", `input[data-testid="`+testid+`"]`), text)
}
