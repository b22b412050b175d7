package session

import (
	"bytes"
	"strconv"
	"strings"
	"testing"

	"pairline/fitcore"
)

// TestResultsTable: the results CSV holds fitcore's figures at full
// precision (each cell reads back as the same float64), the units of the
// record, the verdicts and the unknowns, and a title that a spreadsheet
// would run as a formula is neutralised (OWASP guidance on CSV injection,
// as WriteTable does for the readings).
func TestResultsTable(t *testing.T) {
	s := sampleSessions(t)[0]
	if err := s.SetField(FieldTitle, "=HYPERLINK(\"x\")", at(100)); err != nil {
		t.Fatal(err)
	}
	x, y, _, _ := s.Pairs()
	opt, set, _ := s.RecordOptions(x)
	rep, err := fitcore.Analyze(x, y, opt)
	if err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if err := WriteResultsCSV(&buf, s, rep, set); err != nil {
		t.Fatal(err)
	}
	text := buf.String()
	if !strings.HasPrefix(text, "figure,value,unit,detail\n") || !strings.Contains(text, `"'=HYPERLINK(""x"")"`) {
		t.Fatalf("header or neutralised title missing:\n%s", text)
	}
	table := ResultsTable(s, rep, set)
	get := func(name string) []string {
		for _, r := range table {
			if r[0] == name {
				return r
			}
		}
		t.Fatalf("no row %q in\n%s", name, text)
		return nil
	}
	for _, c := range []struct {
		name string
		want float64
		unit string
	}{
		{"slope", rep.Slope.Estimate, "µS/cm/µS/cm"}, {"intercept standard error", rep.Intercept.SE, "µS/cm"},
		{"r squared", rep.RSquared, ""}, {"pairs used (n)", float64(rep.N), ""},
		{"unknown 1 Heron Ford raw water, bottle 3 (invented): x", rep.Inverse[0].X, "µS/cm"},
		{"unknown 1 Heron Ford raw water, bottle 3 (invented): standard uncertainty", rep.Inverse[0].SE, "µS/cm"},
	} {
		r := get(c.name)
		v, err := strconv.ParseFloat(r[1], 64)
		if err != nil || v != c.want || r[2] != c.unit {
			t.Errorf("%s: %q %q, want %v %q", c.name, r[1], r[2], c.want, c.unit)
		}
	}
	if r := get("acceptance"); r[1] != "pass" && r[1] != "fail" {
		t.Errorf("acceptance %q", r)
	}
	if r := get("check: " + rep.Checks.Curvature.Name); r[1] != string(rep.Checks.Curvature.Verdict) {
		t.Errorf("curvature %q", r)
	}
	if !strings.Contains(get("unknown 1 Heron Ford raw water, bottle 3 (invented): standard uncertainty")[3], "from the standards") {
		t.Error("the unknown's uncertainty does not say it includes the standards")
	}
}
