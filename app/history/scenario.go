package history

import (
	"fmt"
	"math/rand/v2"
	"strconv"
	"time"

	"pairline/app/session"
	"pairline/fitcore"
)

// ScenarioInstrument describes one invented instrument of Scenario.
type ScenarioInstrument struct {
	ID          string
	Description string
	// Slope per month and a step: after month StepMonth (1-based; 0 = no
	// step) the intercept jumps by Step.
	SlopeDriftPerMonth float64
	StepMonth          int
	Step               float64
	// The quantities and units of the readings (x: the standards, y: the
	// instrument's response).
	XName, XUnit, YName, YUnit string
}

// ScenarioInstruments are the three instruments of the invented Larkwater
// Valley Water Board scenario (INVENTED data): a stable turbidity meter, a
// chlorine analyser whose slope drifts, and a conductivity probe whose
// line moves after a cleaning in month 7 (its intercept steps once: the
// drift calls it shifted, not drifting).
var ScenarioInstruments = []ScenarioInstrument{
	{ID: "LVWB-TB-01", Description: "turbidity meter, Harrow Mill works (invented)",
		XName: "turbidity standard", XUnit: "NTU", YName: "meter signal", YUnit: "mV"},
	{ID: "LVWB-CL-02", Description: "chlorine analyser, Fenwick reservoir (invented)", SlopeDriftPerMonth: -0.004,
		XName: "free chlorine standard", XUnit: "µg/L", YName: "analyser signal", YUnit: "mV"},
	{ID: "LVWB-EC-03", Description: "conductivity probe, Stonebeck intake (invented)", StepMonth: 7, Step: 0.8,
		XName: "conductivity standard", XUnit: "µS/cm", YName: "probe signal", YUnit: "mV"},
}

// Scenario generates monthly calibration sessions over a year for the
// ScenarioInstruments from a fixed seed: 8 standards from 0 to 100 per
// session, y = 0.5 + b·x + step + N(0, 0.15²), b = 1.5 + drift·month. All
// data are INVENTED (the fictional Larkwater Valley Water Board). Equal
// seeds give equal sessions; the IDs come from the seeded generator too.
// copies > 1 adds, for benchmarks, copies of the three instruments with
// keys suffixed "-2", "-3", … and their own seeded readings.
func Scenario(seed uint64, start time.Time, copies int) ([]*session.Session, error) {
	r := rand.New(rand.NewPCG(seed, 0x4c56574221))
	var out []*session.Session
	xs := []float64{0, 5, 10, 20, 40, 60, 80, 100}
	for c := 0; c < max(1, copies); c++ {
		for _, in := range ScenarioInstruments {
			for m := 0; m < 12; m++ {
				day := start.AddDate(0, m, 0).UTC()
				id := in.ID
				if c > 0 {
					id = fmt.Sprintf("%s-%d", in.ID, c+1)
				}
				s, err := session.New(fmt.Sprintf("Monthly check %s, month %d (invented)", id, m+1), day, seededReader{r})
				if err != nil {
					return nil, err
				}
				for _, f := range [][2]string{
					{session.FieldSite, "Larkwater Valley Water Board (invented)"},
					{session.FieldInstrument, in.Description},
					{session.FieldInstrumentID, id},
					{session.FieldIntervalDays, "35"},
					{session.FieldOperator, "A. Technician (invented)"},
					{session.FieldXName, in.XName},
					{session.FieldXUnit, in.XUnit},
					{session.FieldYName, in.YName},
					{session.FieldYUnit, in.YUnit},
				} {
					if err := s.SetField(f[0], f[1], day); err != nil {
						return nil, err
					}
				}
				b := 1.5 + in.SlopeDriftPerMonth*float64(m)
				a := 0.5
				if in.StepMonth > 0 && m+1 > in.StepMonth {
					a += in.Step
				}
				for _, x := range xs {
					y := a + b*x + 0.15*r.NormFloat64()
					s.AddRow(strconv.FormatFloat(x, 'g', -1, 64), strconv.FormatFloat(y, 'f', 3, 64), day)
				}
				for i := range s.Readings {
					s.Readings[i].Taken = day
				}
				out = append(out, s)
			}
		}
	}
	return out, nil
}

// seededReader feeds session.NewID from the seeded generator.
type seededReader struct{ r *rand.Rand }

func (s seededReader) Read(p []byte) (int, error) {
	for i := range p {
		p[i] = byte(s.r.Uint32())
	}
	return len(p), nil
}

// ScenarioLimits are the acceptance limits ScenarioRecords sets on every
// session: slope 1.40–1.60 and intercept −1.0–2.5 (INVENTED; the generated
// lines stay inside them for the year, and the drifting analyser's slope,
// 1.5 − 0.004·month, reaches 1.40 in month 26).
var ScenarioLimits = struct{ SlopeLow, SlopeHigh, InterceptLow, InterceptHigh float64 }{1.40, 1.60, -1.0, 2.5}

// ScenarioRecords is Scenario (one copy) as finished records: the
// acceptance limits of ScenarioLimits on each session, and each sealed by
// its operator an hour after the readings. For the app's tests
// and screenshots. All data are INVENTED.
func ScenarioRecords(seed uint64, start time.Time) ([]*session.Session, error) {
	ss, err := Scenario(seed, start, 1)
	if err != nil {
		return nil, err
	}
	for _, s := range ss {
		day := s.Created
		l := ScenarioLimits
		s.Settings.Acceptance = &fitcore.Criteria{SlopeLow: &l.SlopeLow, SlopeHigh: &l.SlopeHigh,
			InterceptLow: &l.InterceptLow, InterceptHigh: &l.InterceptHigh}
		if err := s.SignPerformed(s.Operator, day.Add(time.Hour)); err != nil {
			return nil, err
		}
	}
	return ss, nil
}
