// Package web holds the static files served under /web/ (stylesheets and
// icons; the build adds app.wasm). Go code that needs one of them as text
// embeds it from here, so there is one copy of each file.
package web

import _ "embed"

// ReportCSS is web/report.css, the report's stylesheet. The app loads the
// file; a saved report carries this text inline, so it needs nothing else.
//
//go:embed report.css
var ReportCSS string
