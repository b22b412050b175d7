package session

import (
	"bytes"
	"encoding/json"
	"flag"
	"os"
	"path/filepath"
	"testing"
	"time"

	"pairline/fitcore"
)

// go test ./app/session/ -run TestSampleFile -update rewrites the committed
// test vector from sampleSessions.
var update = flag.Bool("update", false, "rewrite testdata/session/sample.pairline and sample.json")

const (
	samplePath = "../../testdata/session/sample.pairline"
	sampleJSON = "../../testdata/session/sample.json"
)

// counter is a deterministic stand-in for crypto/rand so that the sample
// file is the same on every run.
type counter struct{ n byte }

func (c *counter) Read(p []byte) (int, error) {
	for i := range p {
		c.n += 37
		p[i] = c.n
	}
	return len(p), nil
}

func fptr(v float64) *float64 { return &v }

// sampleSessions builds the invented sample: a conductivity check of an
// invented bench meter against standards, as a technician of the invented
// Larkwater Valley Water Board might record it, plus a second, short
// session. All names, places, serials and readings are invented.
func sampleSessions(t testing.TB) []*Session {
	t.Helper()
	rnd := &counter{}
	t0 := time.Date(2025, 3, 14, 8, 30, 0, 0, time.UTC)
	at := func(min int) time.Time { return t0.Add(time.Duration(min) * time.Minute) }
	s, err := New("Conductivity check, bench meter 2 (invented example)", t0, rnd)
	if err != nil {
		t.Fatal(err)
	}
	must := func(err error) {
		t.Helper()
		if err != nil {
			t.Fatal(err)
		}
	}
	must(s.SetField(FieldSite, "Larkwater Valley Water Board (invented), Heron Ford intake lab", at(1)))
	must(s.SetField(FieldInstrument, "Bench conductivity meter (invented model)", at(1)))
	must(s.SetField(FieldSerial, "LVWB-CM-0042 (invented)", at(1)))
	must(s.SetField(FieldOperator, "A. Marsh (invented)", at(1)))
	must(s.SetField(FieldXName, "Standard", at(2)))
	must(s.SetField(FieldXUnit, "µS/cm", at(2)))
	must(s.SetField(FieldYName, "Meter reading", at(2)))
	must(s.SetField(FieldYUnit, "µS/cm", at(2)))
	must(s.SetField(FieldNotes, "Invented data for the Pairline test vector. Standards at 25 °C.", at(2)))
	must(s.SetLocation(&Location{Lat: 47.6021, Lon: 8.5513, AccuracyM: 12, Taken: at(3)}, at(3)))
	rows := [][2]string{
		{"0", "1.2"}, {"84", "85,9"}, {"147", "146.1 µS/cm"}, {"500", "503"},
		{"1000", "1 004,5"}, {"1413", "1419"}, {"2000", "2.01e3"}, {"2764", "abc"},
	}
	for i, r := range rows {
		s.AddRow(r[0], r[1], at(10+i))
	}
	must(s.SetCell(7, ColumnY, "2771", at(20)))
	must(s.SetCell(3, ColumnNote, "bubble on the cell, re-read", at(21)))
	must(s.Exclude(3, "air bubble on the probe (seen)", at(22)))
	s.AddRow("5000", "", at(23))
	must(s.SetSettings(Settings{Model: "ols", Transform: "none", Level: 0.95, SlopeRef: fptr(1), InterceptRef: fptr(0),
		Acceptance: &fitcoreCriteriaSample}, at(24)))
	// The calibration record (format 1.1): invented asset tag, standards,
	// certificates, lots and uncertainties.
	must(s.SetField(FieldInstrumentID, "LVWB-A-1187 (invented)", at(25)))
	must(s.SetField(FieldIntervalDays, "182", at(25)))
	_, err = s.AddCondition(Condition{Name: ConditionTemperature, Value: "24.8", Unit: "°C"}, at(25))
	must(err)
	_, err = s.AddCondition(Condition{Name: "humidity", Value: "41", Unit: "%"}, at(25))
	must(err)
	for _, st := range []Standard{
		{Name: "KCl 84 lot 7731 (invented)", Certificate: "C-2230 (invented)", Value: "84", Uncertainty: "0.42", Expiry: time.Date(2025, 9, 30, 0, 0, 0, 0, time.UTC)},
		{Name: "KCl 1413 lot 7740 (invented)", Certificate: "C-2231 (invented)", Value: "1413", Uncertainty: "7", Expiry: time.Date(2025, 2, 28, 0, 0, 0, 0, time.UTC)},
		{Name: "KCl 2764 lot 7752 (invented)", Certificate: "C-2232 (invented)", Value: "2764", Uncertainty: "14"},
	} {
		_, err = s.AddStandard(st, at(26))
		must(err)
	}
	_, err = s.AddUnknown(Unknown{Name: "Heron Ford raw water, bottle 3 (invented)", Readings: []string{"612", "615,5", "611"}}, at(27))
	must(err)
	must(s.SignPerformed("A. Marsh (invented)", at(28)))
	must(s.SignReviewed("R. Okafor (invented)", at(40)))
	// A change after the seal starts revision 2, signed again.
	must(s.SetStandard(1, Standard{Name: "KCl 1413 lot 7740 (invented)", Certificate: "C-2231 rev. B (invented)", Value: "1413", Uncertainty: "7",
		Expiry: time.Date(2025, 2, 28, 0, 0, 0, 0, time.UTC)}, at(45)))
	must(s.SignPerformed("A. Marsh (invented)", at(46)))

	s2, err := New("Gauge height against flow, Heron Ford weir (invented)", at(60), rnd)
	if err != nil {
		t.Fatal(err)
	}
	must(s2.SetField(FieldXName, "Gauge height", at(61)))
	must(s2.SetField(FieldXUnit, "m", at(61)))
	must(s2.SetField(FieldYName, "Flow", at(61)))
	must(s2.SetField(FieldYUnit, "m³/s", at(61)))
	must(s2.SetField(FieldDecimalComma, "true", at(61)))
	for i, r := range [][2]string{{"0,42", "1,10"}, {"0,55", "1,92"}, {"0,71", "3,05"}} {
		s2.AddRow(r[0], r[1], at(62+i))
	}
	return []*Session{s, s2}
}

var fitcoreCriteriaSample = func() (c fitcore.Criteria) {
	c.MinRSquared = fptr(0.995)
	c.SlopeLow, c.SlopeHigh = fptr(0.97), fptr(1.03)
	return c
}()

func TestSampleFile(t *testing.T) {
	var buf bytes.Buffer
	if err := Encode(&buf, sampleSessions(t)); err != nil {
		t.Fatal(err)
	}
	f, err := Decode(bytes.NewReader(buf.Bytes()))
	if err != nil {
		t.Fatal(err)
	}
	js, err := json.MarshalIndent(f, "", "  ")
	if err != nil {
		t.Fatal(err)
	}
	js = append(js, '\n')
	if *update {
		must := func(err error) {
			if err != nil {
				t.Fatal(err)
			}
		}
		must(os.MkdirAll(filepath.Dir(samplePath), 0o755))
		must(os.WriteFile(samplePath, buf.Bytes(), 0o644))
		must(os.WriteFile(sampleJSON, js, 0o644))
	}
	file, err := os.ReadFile(samplePath)
	if err != nil {
		t.Fatalf("%v (run go test -run TestSampleFile -update to create it)", err)
	}
	if !bytes.Equal(file, buf.Bytes()) {
		t.Errorf("Encode no longer writes the committed %s byte for byte; if the format changed on purpose, bump the version and run -update", samplePath)
	}
	want, err := os.ReadFile(sampleJSON)
	if err != nil {
		t.Fatal(err)
	}
	cf, err := Decode(bytes.NewReader(file))
	if err != nil {
		t.Fatalf("decoding the committed sample: %v", err)
	}
	got, _ := json.MarshalIndent(cf, "", "  ")
	got = append(got, '\n')
	if !bytes.Equal(got, want) {
		t.Errorf("decoding %s no longer gives %s", samplePath, sampleJSON)
	}
}
