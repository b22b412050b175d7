package session_test

import (
	"fmt"
	"time"

	"pairline/app/session"
)

// A technician seals a record, a reviewer signs, and a later correction
// starts revision 2 with the sealed revision kept (invented data).
func ExampleSession_SignPerformed() {
	t0 := time.Date(2025, 3, 14, 8, 30, 0, 0, time.UTC)
	s, _ := session.New("Bench meter 2 (invented)", t0, nil)
	s.AddRow("84", "85.9", t0)
	s.AddRow("1413", "1419", t0)
	s.AddRow("2764", "2771", t0)
	_ = s.SignPerformed("A. Marsh", t0.Add(time.Hour))
	_ = s.SignReviewed("R. Okafor", t0.Add(2*time.Hour))
	ok, _ := s.VerifySeal()
	fmt.Println("revision", s.Revision, "sealed and valid:", ok)

	_ = s.SetCell(1, session.ColumnY, "1418", t0.Add(3*time.Hour))
	ok, err := s.VerifySeal()
	fmt.Println("revision", s.Revision, "valid:", ok, "-", err)
	fmt.Println("kept:", len(s.Sealed), "earlier revision, reviewed by", s.Sealed[0].Seal.ReviewedBy)
	// Output:
	// revision 1 sealed and valid: true
	// revision 2 valid: false - the record is not sealed
	// kept: 1 earlier revision, reviewed by R. Okafor
}

// The history entry of a standard's change reads as a sentence.
func ExampleSession_SetStandard() {
	t0 := time.Date(2025, 3, 14, 8, 30, 0, 0, time.UTC)
	s, _ := session.New("Bench meter 2 (invented)", t0, nil)
	_, _ = s.AddStandard(session.Standard{Name: "KCl 1413 (invented lot)", Certificate: "C-2230", Value: "1413", Uncertainty: "7"}, t0)
	st := s.Standards[0]
	st.Certificate = "C-2231"
	_ = s.SetStandard(0, st, t0.Add(time.Minute))
	e := s.History[len(s.History)-1]
	fmt.Println(e.New)
	// Output:
	// standard 1 certificate set to C-2231
}

// A standard past its expiry on the day of the readings (invented data).
func ExampleSession_ExpiredStandards() {
	t0 := time.Date(2025, 3, 14, 8, 30, 0, 0, time.UTC)
	s, _ := session.New("Bench meter 2 (invented)", t0, nil)
	s.AddRow("1413", "1419", t0)
	_, _ = s.AddStandard(session.Standard{Name: "KCl 1413", Expiry: time.Date(2025, 2, 28, 0, 0, 0, 0, time.UTC)}, t0)
	_, _ = s.AddStandard(session.Standard{Name: "KCl 84", Expiry: time.Date(2025, 3, 14, 0, 0, 0, 0, time.UTC)}, t0)
	for _, e := range s.ExpiredStandards() {
		fmt.Printf("standard %d (%s) expired %s, readings of %s\n", e.Index+1, s.Standards[e.Index].Name,
			e.Expiry.Format("2006-01-02"), e.Day.Format("2006-01-02"))
	}
	// Output:
	// standard 1 (KCl 1413) expired 2025-02-28, readings of 2025-03-14
}

// Readings of a standard get its certified uncertainty (matched by value).
func ExampleSession_StandardUncertainties() {
	s := &session.Session{Content: session.Content{Standards: []session.Standard{{Value: "84", Uncertainty: "0.42"}, {Value: "1413", Uncertainty: "7"}}}}
	u, problems := s.StandardUncertainties([]float64{0, 84, 1413, 1413})
	fmt.Println(u, len(problems))
	// Output:
	// [0 0.42 7 7] 0
}

// The last record of an instrument at a site offers its values again.
func ExampleLastRecordFor() {
	older := &session.Session{Content: session.Content{Title: "March", Site: "Heron Ford", Instrument: session.Instrument{ID: "LVWB-A-1187"}},
		Created: time.Date(2025, 3, 14, 0, 0, 0, 0, time.UTC)}
	newer := &session.Session{Content: session.Content{Title: "September", Site: "Heron Ford", Instrument: session.Instrument{ID: "LVWB-A-1187", IntervalDays: 182}},
		Created: time.Date(2025, 9, 12, 0, 0, 0, 0, time.UTC)}
	last := session.LastRecordFor([]*session.Session{older, newer}, "lvwb-a-1187", "Heron Ford")
	fmt.Println(last.Title, last.Instrument.IntervalDays)
	// Output:
	// September 182
}
