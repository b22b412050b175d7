package ui

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"pairline/app/wording"
	"pairline/fitcore"
)

// percentErrorReport is fitcore's analysis of invented readings whose
// scatter is a constant percentage of the reading (so that the advice finds
// a remedy), with a standard uncertainty of x, so that the x-exactness
// check is judged on the line (the refits of the advice do not judge it).
func percentErrorReport(t *testing.T) *fitcore.Report {
	t.Helper()
	r := rand.New(rand.NewPCG(7, 11))
	var x, y []float64
	for i := 0; i < 60; i++ {
		xi := 1 + float64(i%20)*5
		x = append(x, xi)
		y = append(y, 2*xi*math.Exp(0.08*r.NormFloat64()))
	}
	rep, err := fitcore.Analyze(x, y, fitcore.Options{XUncertainty: 0.01})
	if err != nil {
		t.Fatal(err)
	}
	if rep.Advice == nil || rep.Advice.After == nil || rep.Assumptions.XExactness == nil {
		t.Fatal("the invented readings give no remedy, or the x-exactness check was not judged")
	}
	return rep
}

// The report's advice table has a row for every assumption fitcore judged
// both before and after the remedy, in fitcore's order, and none for one
// judged on one side only.
func TestReportAdviceListsEveryAssumption(t *testing.T) {
	rep := percentErrorReport(t)
	var b rpB
	rpAdvice(&b, rep)
	html := b.String()
	at := -1
	for _, as := range fitcore.AssumptionList() {
		name := wording.CheckName(as.ID)
		i := strings.Index(html, `<th scope="row">`+rpEsc(name)+`</th>`)
		both := as.Of(&rep.Advice.Before.Assumptions) != nil && as.Of(&rep.Advice.After.Assumptions) != nil
		if !both {
			if i >= 0 {
				t.Errorf("the report's advice table has a row for %q, judged on one side only", name)
			}
			continue
		}
		if i < 0 {
			t.Errorf("the report's advice table has no row for %q", name)
			continue
		}
		if i < at {
			t.Errorf("%q is out of fitcore's order in the report's advice table", name)
		}
		at = i
	}
}
