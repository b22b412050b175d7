// Package demo holds Pairline's demo: four invented sessions of the
// fictional Larkwater Valley Water Board (its sites, instruments and people
// are invented; no reading comes from a real instrument). The sessions are
// made by Build from a fixed seed; `go run ./testdata/demo` writes them to
// testdata/demo/demo.pairline and app/demo/demo.pairline, and the second
// file is embedded here, so the app and the tests read exactly the same
// records. A unit test checks that the embedded file is what Build makes.
//
// The four sessions and what fitcore should find in each:
//
//	A. Conductivity probe against reference standards: a clean calibration
//	   that passes every check and its acceptance criteria.
//	B. Turbidity (NTU) against suspended solids (mg/L): the scatter grows
//	   with the level and the relation bends; the advice is a log–log fit.
//	C. Pressure transmitter against a dead-weight tester: one reading has a
//	   decimal slip (typed 10 times too small) and is flagged as influential.
//	D. Water-level logger against the staff gauge over six weeks: the logger
//	   drifts, so the residuals in entry order are correlated and the
//	   independence check warns or fails.
package demo

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strconv"
	"time"

	"pairline/app/session"
	"pairline/fitcore"
)

// Seed is the seed of the demo's random numbers (any fixed value would do;
// this one was picked among the first few dozen because fitcore then finds
// in each session exactly the lesson it is meant to show, see the package
// doc and TestDemoVerdicts).
const Seed = 20261216

// Invented marks every demo title and note.
const Invented = "Invented demo data — fictional Larkwater Valley Water Board"

// Titles of the demo sessions, in order.
var Titles = []string{
	"Demo (invented): conductivity probe calibration",
	"Demo (invented): turbidity against suspended solids",
	"Demo (invented): pressure transmitter check",
	"Demo (invented): water-level logger drift",
}

// MistypedRow is the reading of session C with the decimal slip (from 0).
const MistypedRow = 6

// Build makes the four demo sessions from Seed. It is deterministic: the
// same sessions, IDs, times and history every time.
func Build() ([]*session.Session, error) { return build(Seed) }

func build(seed uint64) ([]*session.Session, error) {
	rng := rand.New(rand.NewPCG(seed, seed^0x5eed))
	ids := rand.NewChaCha8([32]byte{'L', 'a', 'r', 'k', 'w', 'a', 't', 'e', 'r'})
	base := time.Date(2026, 3, 9, 8, 30, 0, 0, time.UTC)
	var out []*session.Session
	for i, mk := range []func(*session.Session, *rand.Rand, time.Time) error{conductivity, turbidity, pressure, logger} {
		at := base.Add(time.Duration(i) * 49 * time.Hour)
		s, err := session.New(Titles[i], at, ids)
		if err != nil {
			return nil, err
		}
		if err := mk(s, rng, at); err != nil {
			return nil, fmt.Errorf("demo session %d: %w", i+1, err)
		}
		if err := s.SetField(session.FieldNotes, Invented+". "+s.Notes, at); err != nil {
			return nil, err
		}
		out = append(out, s)
	}
	return out, nil
}

func fields(s *session.Session, at time.Time, kv ...string) error {
	for i := 0; i+1 < len(kv); i += 2 {
		if err := s.SetField(kv[i], kv[i+1], at); err != nil {
			return err
		}
	}
	return nil
}

// text writes a reading the way a technician would type it, with the given
// number of decimals.
func text(v float64, dec int) string { return strconv.FormatFloat(v, 'f', dec, 64) }

func add(s *session.Session, at time.Time, step time.Duration, x, y string) time.Time {
	at = at.Add(step)
	s.AddRow(x, y, at)
	return at
}

func ptr(v float64) *float64 { return &v }

// conductivity: 7 reference standards (µS/cm) read twice each by a probe
// with a small gain error; the noise is even (SD 3 µS/cm).
func conductivity(s *session.Session, rng *rand.Rand, at time.Time) error {
	s.Notes = "Probe calibrated against certified potassium chloride standards at 25 °C; two readings per standard."
	if err := fields(s, at, session.FieldSite, "Heronford treatment works (invented)",
		session.FieldInstrument, "Field conductivity probe (invented model CP-7)", session.FieldSerial, "LV-CP7-0142",
		session.FieldOperator, "R. Okonkwo (invented)", session.FieldXName, "Reference standard", session.FieldXUnit, "µS/cm",
		session.FieldYName, "Probe reading", session.FieldYUnit, "µS/cm"); err != nil {
		return err
	}
	t := at
	for _, std := range []float64{100, 500, 1000, 1500, 2000, 2500, 3000} {
		for range 2 {
			y := 1.004*std - 1.5 + 3*rng.NormFloat64()
			t = add(s, t, 3*time.Minute, text(std, 0), text(y, 1))
		}
	}
	st := session.DefaultSettings()
	st.Acceptance = &fitcore.Criteria{MinRSquared: ptr(0.999), SlopeLow: ptr(0.98), SlopeHigh: ptr(1.02),
		InterceptLow: ptr(-20), InterceptHigh: ptr(20), MaxResidual: ptr(1), MaxResidualPercentOfSpan: true}
	return s.SetSettings(st, t)
}

// turbidity: grab samples over a season; suspended solids follow a power
// law of turbidity with a multiplicative (percentage) scatter, so on the
// original scales the spread grows with the level and the line bends.
func turbidity(s *session.Session, rng *rand.Rand, at time.Time) error {
	s.Notes = "Grab samples from the river intake over one season; suspended solids by filtration in the board's laboratory."
	if err := fields(s, at, session.FieldSite, "Millbrook river intake (invented)",
		session.FieldInstrument, "Turbidity sonde (invented model TS-2)", session.FieldSerial, "LV-TS2-0031",
		session.FieldOperator, "M. Lindqvist (invented)", session.FieldXName, "Turbidity", session.FieldXUnit, "NTU",
		session.FieldYName, "Suspended solids", session.FieldYUnit, "mg/L"); err != nil {
		return err
	}
	t := at
	for range 32 {
		ntu := math.Exp(math.Log(1.5) + rng.Float64()*(math.Log(450)-math.Log(1.5)))
		ss := 2.1 * math.Pow(ntu, 0.78) * math.Exp(0.14*rng.NormFloat64())
		t = add(s, t, 26*time.Hour, text(ntu, 1), text(ss, 1))
	}
	return nil
}

// pressure: a 0–1000 kPa transmitter against a dead-weight tester, rising
// then falling; reading MistypedRow was typed with its decimal point one
// place to the left (61.24 for 612.4).
func pressure(s *session.Session, rng *rand.Rand, at time.Time) error {
	s.Notes = "As-found check of the transmitter on the Tansy Reach main; readings from the local display."
	if err := fields(s, at, session.FieldSite, "Tansy Reach pumping station (invented)",
		session.FieldInstrument, "Pressure transmitter (invented model PT-40)", session.FieldSerial, "LV-PT40-2207",
		session.FieldOperator, "A. Barros (invented)", session.FieldXName, "Applied pressure", session.FieldXUnit, "kPa",
		session.FieldYName, "Transmitter reading", session.FieldYUnit, "kPa"); err != nil {
		return err
	}
	t := at
	steps := []float64{0, 100, 200, 300, 400, 500, 600, 700, 800, 900, 1000, 750, 500, 250}
	for i, p := range steps {
		y := 0.998*p + 0.6 + 0.5*rng.NormFloat64()
		txt := text(y, 1)
		if i == MistypedRow {
			txt = text(y/10, 2)
		}
		t = add(s, t, 4*time.Minute, text(p, 0), txt)
	}
	return nil
}

// logger: a water-level logger read against the staff gauge on 42 mornings;
// the river rises and falls at random, while the logger's offset wanders
// slowly (a random walk with some pull back), so neighbouring residuals are
// alike.
func logger(s *session.Session, rng *rand.Rand, at time.Time) error {
	s.Notes = "Daily check of the stilling-well logger against the staff gauge, read by the site visitor each morning."
	if err := fields(s, at, session.FieldSite, "Otterpool gauging station (invented)",
		session.FieldInstrument, "Pressure water-level logger (invented model WL-9)", session.FieldSerial, "LV-WL9-0588",
		session.FieldOperator, "J. Haddad (invented)", session.FieldXName, "Staff gauge", session.FieldXUnit, "m",
		session.FieldYName, "Logger level", session.FieldYUnit, "m"); err != nil {
		return err
	}
	t := at
	drift := 0.0
	for range 42 {
		stage := 0.4 + 1.6*rng.Float64()
		drift = 0.85*drift + 0.012*rng.NormFloat64()
		y := stage + 0.015 + drift + 0.002*rng.NormFloat64()
		t = add(s, t, 24*time.Hour, text(stage, 3), text(y, 3))
	}
	return nil
}
