package fitcore

import (
	"math"
	"strings"
	"testing"
)

// An invented 4–20 mA pressure transmitter check (0–100 kPa, two readings
// per point), one reading typed 1.36 for 13.6: the influence check names it
// as a slipped decimal point with the value the line expects.
func TestSlippedDecimal(t *testing.T) {
	x := []float64{0, 25, 50, 60, 75, 100, 0, 25, 50, 60, 75, 100}
	y := []float64{4.01, 8.02, 11.98, 1.36, 16.03, 19.99, 3.99, 7.98, 12.02, 13.61, 15.98, 20.02}
	rep, err := Analyze(x, y, Options{})
	if err != nil {
		t.Fatal(err)
	}
	s := rep.Slip
	if s == nil {
		t.Fatalf("no slipped decimal point found; influence: %q", rep.Assumptions.Influence.Message)
	}
	if s.Index != 3 || s.Factor != 10 || math.Abs(s.Likely-13.6) > 1e-12 {
		t.Errorf("slip %+v, want reading 4 ×10 = 13.6", s)
	}
	// Expected: 4 + 0.16·60 = 13.6 mA (the line of the other readings).
	if s.Expected < 13.5 || s.Expected > 13.7 {
		t.Errorf("expected %g, want about 13.6", s.Expected)
	}
	msg := rep.Assumptions.Influence.Message
	if !strings.HasPrefix(msg, "Reading 4 looks like a slipped decimal point: 1.36 where the line expects about 13.6") {
		t.Errorf("message %q", msg)
	}
	if rep.Assumptions.Influence.Verdict != Fail {
		t.Errorf("influence %s, want fail", rep.Assumptions.Influence.Verdict)
	}
	for _, c := range s.Clears {
		if c == "normality" && !strings.Contains(rep.Assumptions.Normality.Message, "depends on reading 4 alone") {
			t.Errorf("normality clears without reading 4 but does not say so: %q", rep.Assumptions.Normality.Message)
		}
	}
	// The same record typed correctly has no slip.
	y[3] = 13.6
	rep, err = Analyze(x, y, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if rep.Slip != nil {
		t.Errorf("slip %+v in a record without one", rep.Slip)
	}
}
