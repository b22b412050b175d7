package ui

import (
	"regexp"
	"strconv"
	"strings"
	"testing"
	"time"

	"pairline/app/demo"
	"pairline/app/numfmt"
)

// A saved report is one self-contained file: no script, nothing fetched,
// the four plots inline, the readings with the left-out one marked with
// its reason, and the figures equal to fitcore's.
func TestReportFileSelfContained(t *testing.T) {
	ss, err := demo.Sessions(time.Now(), nil)
	if err != nil {
		t.Fatal(err)
	}
	s := ss[2] // the pressure check with the decimal slip
	if err := s.Exclude(demo.MistypedRow, "decimal point slipped", time.Now()); err != nil {
		t.Fatal(err)
	}
	rep, rows := analyzed(t, s)
	f := rpFile(s, rpBody(s, rep, rows, "", time.Now()))
	for _, bad := range []string{"<script", "<link", " src=", "@import", "https://"} {
		if strings.Contains(f, bad) {
			t.Errorf("the report file holds %q", bad)
		}
	}
	if m := regexp.MustCompile(`url\([^#]`).FindString(f); m != "" {
		t.Errorf("the report file refers to something outside itself: %s", m)
	}
	for _, m := range regexp.MustCompile(`http://[^"' ]*`).FindAllString(f, -1) {
		if m != "http://www.w3.org/2000/svg" {
			t.Errorf("the report file refers to %s", m)
		}
	}
	if n := strings.Count(f, "<svg "); n != 4 {
		t.Errorf("%d plots inline, want 4", n)
	}
	for _, id := range []string{"plot-fit", "plot-residuals", "plot-order", "plot-qq"} {
		if !strings.Contains(f, `data-testid="`+id+`"`) {
			t.Errorf("no %s in the report", id)
		}
	}
	if !strings.Contains(f, "□ Left out: decimal point slipped") {
		t.Error("the left-out reading is not marked with its reason")
	}
	for _, v := range []float64{rep.Slope.Estimate, rep.Intercept.Estimate, rep.RSquared, rep.ResidualSE} {
		if !strings.Contains(f, `data-value="`+numfmt.Full(v)+`"`) {
			t.Errorf("the report does not carry fitcore's %v", v)
		}
	}
	for _, want := range []string{"not a certification", "History of changes", "Larkwater Valley", "Acceptance"} {
		if !strings.Contains(f, want) {
			t.Errorf("the report does not say %q", want)
		}
	}
}

// The report on the screen lists the first readings of a long session and
// leaves a placeholder for the rest; what the placeholder is filled with
// before printing (rpReadingRows from its data-from) makes it the full
// report's table, row for row, the left-out reading and the one that stands
// out included.
func TestReportReadingsShownThenFilled(t *testing.T) {
	ss, err := demo.Sessions(time.Now(), nil)
	if err != nil {
		t.Fatal(err)
	}
	s := ss[2] // the pressure check with the decimal slip
	if err := s.Exclude(demo.MistypedRow, "decimal point slipped", time.Now()); err != nil {
		t.Fatal(err)
	}
	rep, rows := analyzed(t, s)
	now := time.Now()
	n := len(s.Readings)
	shown := demo.MistypedRow // the left-out reading is among the rest
	if shown < 2 || shown >= n-1 {
		t.Fatalf("demo C has %d readings, the slip at row %d: pick another split", n, demo.MistypedRow)
	}
	full := rpBody(s, rep, rows, "", now)
	part := rpBodyView(s, rep, rows, "", now, rpView{shown: shown})
	rowRE := regexp.MustCompile(`<tr[^>]* data-row="(\d+)"><td>`)
	tableRows := func(html string) int {
		i := strings.Index(html, `pl-rt-readings`)
		j := strings.Index(html[i:], `</table>`)
		return len(rowRE.FindAllString(html[i:i+j], -1))
	}
	if got := tableRows(full); got != n {
		t.Errorf("the full report lists %d readings, want %d", got, n)
	}
	if got := tableRows(part); got != shown {
		t.Errorf("the screen's report lists %d readings, want the first %d", got, shown)
	}
	ph := `<tbody data-testid="report-readings-rest" data-from="` + strconv.Itoa(shown) + `"></tbody>`
	if !strings.Contains(part, ph) {
		t.Fatalf("no placeholder %s for the readings not listed", ph)
	}
	for _, want := range []string{`data-testid="report-readings-all"`, "Show all " + strconv.Itoa(n) + " readings", "a printed or saved report lists every one"} {
		if !strings.Contains(part, want) {
			t.Errorf("the screen's report does not offer %q", want)
		}
	}
	if strings.Contains(full, `report-readings-rest`) || strings.Contains(full, `report-readings-all`) {
		t.Error("the full report carries the placeholder or the button")
	}
	var rest rpB
	rpReadingRows(&rest, s, rep, rows, shown, n)
	// The readings table's rows, and the report around the table.
	split := func(html string) (rows, around string) {
		i := strings.Index(html, `pl-rt-readings`)
		i += strings.Index(html[i:], `</thead>`)
		j := i + strings.Index(html[i:], `</table>`)
		rows = strings.NewReplacer(`</thead>`, ``, `<tbody>`, ``, `</tbody>`, ``, ph, ``).Replace(html[i:j])
		k := strings.Index(html, `<p class="pl-report-more"`)
		if k < 0 {
			k = j + len(`</table>`)
		}
		return rows, html[:i] + html[k+strings.Index(html[k:], `</section>`):]
	}
	fullRows, fullAround := split(full)
	partRows, partAround := split(part)
	if partRows+rest.String() != fullRows {
		t.Error("the rows listed on the screen and those filled in before printing are not the full report's rows")
	}
	if partAround != fullAround {
		t.Error("apart from the readings, the screen's report is not the full report")
	}
	if !strings.Contains(rest.String(), "□ Left out: decimal point slipped") {
		t.Error("the rows filled in do not mark the left-out reading with its reason")
	}
}
