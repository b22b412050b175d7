package ui

import "github.com/maxence-charriere/go-app/v10/pkg/app"

// anCaution is the note shown beside the verdict: the checks are statistics,
// and where a result feeds safety decisions (gas detectors, structural
// loads, drinking water) the maker's procedure, local codes and licensed
// staff decide.
func anCaution() app.UI {
	return app.Aside().Class("an-caution").DataSet("testid", "caution").Attr("role", "note").Body(
		app.Span().Class("an-caution-icon").Attr("aria-hidden", "true").Text("⚠"),
		app.P().Body(
			app.Strong().Text("Safety work: "),
			app.Span().Text("this is a statistical check of the readings, not a certification. For gas detectors, structural "+
				"loads, drinking water and the like, follow the instrument maker's procedure, local codes and licensed staff."),
		),
	)
}
