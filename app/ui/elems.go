package ui

import "github.com/maxence-charriere/go-app/v10/pkg/app"

// The element builders below stand for chains of go-app calls that the
// screen repeats dozens of times. Each gives exactly the element the chain
// gives (the same attributes, set in the same order); one call in place of
// three or four makes app.wasm smaller (DEVELOPERS.md, "Fifth cut").

// anButton is app.Button().Class(class).Text(text).DataSet("testid", testid).
func anButton(class, text, testid string) app.HTMLButton {
	return app.Button().Class(class).Text(text).DataSet("testid", testid)
}

// anPText is app.P().Class(class).Text(text).
func anPText(class, text string) app.HTMLP {
	return app.P().Class(class).Text(text)
}

// anSpanText is app.Span().Class(class).Text(text).
func anSpanText(class, text string) app.HTMLSpan {
	return app.Span().Class(class).Text(text)
}
