package session

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"reflect"
	"strings"
	"testing"
	"time"
)

var t0 = time.Date(2025, 3, 14, 8, 30, 0, 0, time.UTC)

func at(min int) time.Time { return t0.Add(time.Duration(min) * time.Minute) }

func newRecord(t testing.TB) *Session {
	t.Helper()
	s, err := New("Record test (invented)", t0, &counter{})
	if err != nil {
		t.Fatal(err)
	}
	return s
}

func lastEdit(s *Session) Edit { return s.History[len(s.History)-1] }

// TestRecordSetters: each setter changes its field and appends entries
// whose Old and New a report can print as they are.
func TestRecordSetters(t *testing.T) {
	type step struct {
		name     string
		do       func(s *Session) error
		field    string
		old, new string
	}
	exp := time.Date(2026, 5, 31, 15, 0, 0, 0, time.FixedZone("x", 3600))
	steps := []step{
		{"instrument id", func(s *Session) error { return s.SetField(FieldInstrumentID, "A-17", at(1)) }, FieldInstrumentID, "", "A-17"},
		{"interval", func(s *Session) error { return s.SetField(FieldIntervalDays, "182", at(1)) }, FieldIntervalDays, "0", "182"},
		{"condition added", func(s *Session) error {
			_, err := s.AddCondition(Condition{Name: ConditionTemperature, Value: "21.4", Unit: "°C"}, at(2))
			return err
		}, EditCondition, "", "condition 1 added: temperature 21.4 °C"},
		{"condition value", func(s *Session) error {
			return s.SetCondition(0, Condition{Name: ConditionTemperature, Value: "21.6", Unit: "°C"}, at(3))
		}, EditCondition, "condition 1 value was 21.4", "condition 1 value set to 21.6"},
		{"standard added", func(s *Session) error {
			_, err := s.AddStandard(Standard{Name: "KCl lot 1", Certificate: "C-2230", Value: "1413", Uncertainty: "7", Expiry: exp}, at(4))
			return err
		}, EditStandard, "", "standard 1 added: KCl lot 1, certificate C-2230, value 1413, uncertainty 7, expiry 2026-05-31"},
		{"standard certificate", func(s *Session) error {
			st := s.Standards[0]
			st.Certificate = "C-2231"
			return s.SetStandard(0, st, at(5))
		}, EditStandard, "standard 1 certificate was C-2230", "standard 1 certificate set to C-2231"},
		{"standard expiry cleared", func(s *Session) error {
			st := s.Standards[0]
			st.Expiry = time.Time{}
			return s.SetStandard(0, st, at(5))
		}, EditStandard, "standard 1 expiry was 2026-05-31", "standard 1 expiry set to not given"},
		{"unknown added", func(s *Session) error {
			_, err := s.AddUnknown(Unknown{Name: "bottle 3", Readings: []string{"612", "615"}}, at(6))
			return err
		}, EditUnknown, "", "unknown 1 added: bottle 3, readings 612; 615"},
		{"unknown readings", func(s *Session) error {
			return s.SetUnknown(0, Unknown{Name: "bottle 3", Readings: []string{"612", "615", "611"}}, at(7))
		}, EditUnknown, "unknown 1 readings was 612; 615", "unknown 1 readings set to 612; 615; 611"},
		{"unknown removed", func(s *Session) error { return s.RemoveUnknown(0, at(8)) }, EditUnknown, "unknown 1 was bottle 3", "unknown 1 removed"},
		{"standard removed", func(s *Session) error { return s.RemoveStandard(0, at(8)) }, EditStandard, "standard 1 was KCl lot 1, certificate C-2231", "standard 1 removed"},
		{"condition removed", func(s *Session) error { return s.RemoveCondition(0, at(8)) }, EditCondition, "condition 1 was temperature 21.6 °C", "condition 1 removed"},
	}
	s := newRecord(t)
	for _, st := range steps {
		n := len(s.History)
		if err := st.do(s); err != nil {
			t.Fatalf("%s: %v", st.name, err)
		}
		if len(s.History) != n+1 {
			t.Fatalf("%s: %d history entries added, want 1", st.name, len(s.History)-n)
		}
		e := lastEdit(s)
		if e.Field != st.field || e.Old != st.old || e.New != st.new || e.Row != -1 {
			t.Errorf("%s: entry %+v, want field %q old %q new %q", st.name, e, st.field, st.old, st.new)
		}
	}
	if s.Instrument.ID != "A-17" || s.Instrument.IntervalDays != 182 || len(s.Conditions)+len(s.Standards)+len(s.Unknowns) != 0 {
		t.Errorf("fields after the steps: %+v", s)
	}
	if err := s.Validate(); err != nil {
		t.Fatal(err)
	}
}

// TestRecordSetterRefusals: values past the limits are refused with the
// item named, nothing changes and nothing is recorded.
func TestRecordSetterRefusals(t *testing.T) {
	long := strings.Repeat("a", MaxShortText+1)
	tests := []struct {
		name string
		do   func(s *Session) error
		want string
	}{
		{"interval negative", func(s *Session) error { return s.SetField(FieldIntervalDays, "-1", at(1)) }, "calibration interval"},
		{"interval words", func(s *Session) error { return s.SetField(FieldIntervalDays, "half a year", at(1)) }, "calibration interval"},
		{"interval too long", func(s *Session) error { return s.SetField(FieldIntervalDays, "36526", at(1)) }, "36525"},
		{"condition name", func(s *Session) error { _, err := s.AddCondition(Condition{Name: long}, at(1)); return err }, "condition 1 name"},
		{"standard certificate", func(s *Session) error { _, err := s.AddStandard(Standard{Certificate: long}, at(1)); return err }, "standard 1 certificate"},
		{"standard expiry", func(s *Session) error {
			_, err := s.AddStandard(Standard{Expiry: time.Date(2300, 1, 1, 0, 0, 0, 0, time.UTC)}, at(1))
			return err
		}, "standard 1 expiry"},
		{"unknown readings", func(s *Session) error {
			_, err := s.AddUnknown(Unknown{Readings: make([]string, MaxUnknownReadings+1)}, at(1))
			return err
		}, "unknown 1 has"},
		{"no such standard", func(s *Session) error { return s.SetStandard(3, Standard{}, at(1)) }, "standard 4"},
		{"no such unknown", func(s *Session) error { return s.RemoveUnknown(0, at(1)) }, "unknown 1"},
	}
	for _, tc := range tests {
		s := newRecord(t)
		err := tc.do(s)
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: error %v, want one naming %q", tc.name, err, tc.want)
		}
		if len(s.History) != 0 {
			t.Errorf("%s: %d history entries after a refusal", tc.name, len(s.History))
		}
	}
	s := newRecord(t)
	for i := 0; i < MaxConditions; i++ {
		if _, err := s.AddCondition(Condition{Name: "c"}, at(1)); err != nil {
			t.Fatal(err)
		}
	}
	if _, err := s.AddCondition(Condition{Name: "c"}, at(1)); !errors.Is(err, ErrBadValue) {
		t.Errorf("condition %d: %v, want ErrBadValue", MaxConditions+1, err)
	}
}

// sealedRecord is a small record signed as performed.
func sealedRecord(t testing.TB) *Session {
	t.Helper()
	s := newRecord(t)
	for i, r := range [][2]string{{"0", "0.3"}, {"100", "101.2"}, {"200", "199.1"}, {"400", "402.5"}} {
		s.AddRow(r[0], r[1], at(1+i))
	}
	if _, err := s.AddStandard(Standard{Name: "std 200", Value: "200", Uncertainty: "0.5"}, at(6)); err != nil {
		t.Fatal(err)
	}
	if err := s.SignPerformed("A. Marsh", at(10)); err != nil {
		t.Fatal(err)
	}
	return s
}

// TestSealLifecycle: signing, reviewing, a change after the seal (a new
// revision, the old one kept and still verifiable) and signing again.
func TestSealLifecycle(t *testing.T) {
	s := sealedRecord(t)
	if s.Revision != 1 || s.Seal == nil || len(s.Seal.Digest) != 64 || lastEdit(s).Field != EditSealed {
		t.Fatalf("after signing: revision %d, seal %+v, last entry %+v", s.Revision, s.Seal, lastEdit(s))
	}
	if ok, err := s.VerifySeal(); !ok || err != nil {
		t.Fatalf("VerifySeal = %v, %v after signing", ok, err)
	}
	if err := s.SignPerformed("B. Other", at(11)); !errors.Is(err, ErrAlreadySigned) {
		t.Errorf("second performed signature: %v", err)
	}
	d1 := s.Seal.Digest
	if err := s.SignReviewed("R. Okafor", at(20)); err != nil {
		t.Fatal(err)
	}
	if s.Seal.Digest == d1 || s.Seal.ReviewedBy != "R. Okafor" || !s.Seal.ReviewedAt.Equal(at(20)) {
		t.Errorf("review did not add to the seal: %+v", s.Seal)
	}
	if ok, err := s.VerifySeal(); !ok {
		t.Fatalf("after the review: %v", err)
	}
	if err := s.SignReviewed("R. Okafor", at(21)); !errors.Is(err, ErrAlreadySigned) {
		t.Errorf("second review: %v", err)
	}
	sealed := *s.Seal
	n := len(s.History)
	if err := s.SetCell(2, ColumnY, "199.4", at(30)); err != nil {
		t.Fatal(err)
	}
	if s.Revision != 2 || s.Seal != nil || len(s.Sealed) != 1 {
		t.Fatalf("after a change: revision %d, seal %v, %d sealed", s.Revision, s.Seal, len(s.Sealed))
	}
	got := s.History[n:]
	if len(got) != 2 || got[0].Field != EditRevision || got[0].Old != "1" || got[0].New != "2" || got[1].Field != "y" || got[1].New != "199.4" {
		t.Errorf("history after the change: %+v", got)
	}
	r := s.Sealed[0]
	if r.Revision != 1 || r.Seal != sealed || r.Readings[2].Y != "199.1" || !strings.Contains(r.Results, "4 pairs used; slope") {
		t.Errorf("frozen revision: %+v", r)
	}
	if ok, err := s.VerifySeal(); ok || !errors.Is(err, ErrNotSealed) {
		t.Errorf("changed record: VerifySeal = %v, %v; want ErrNotSealed", ok, err)
	}
	// Further changes stay in revision 2.
	if err := s.SetField(FieldNotes, "re-read", at(31)); err != nil {
		t.Fatal(err)
	}
	if s.Revision != 2 || len(s.Sealed) != 1 {
		t.Errorf("a second change: revision %d, %d sealed", s.Revision, len(s.Sealed))
	}
	if err := s.SignPerformed("A. Marsh", at(40)); err != nil {
		t.Fatal(err)
	}
	if ok, err := s.VerifySeal(); !ok {
		t.Fatal(err)
	}
	// Through a file and back, everything still verifies.
	b, err := EncodeBytes([]*Session{s})
	if err != nil {
		t.Fatal(err)
	}
	f, err := Decode(bytes.NewReader(b))
	if err != nil {
		t.Fatal(err)
	}
	if ok, err := f.Sessions[0].VerifySeal(); !ok {
		t.Fatalf("after a round trip: %v", err)
	}
}

// TestSealTampered: content changed outside the methods (as an edited file
// would be) still opens; VerifySeal says false and why; a review is refused.
func TestSealTampered(t *testing.T) {
	tamper := []struct {
		name string
		do   func(s *Session)
		want string
	}{
		{"reading", func(s *Session) { s.Readings[1].Y = "100.2" }, "changed after revision 1 was sealed"},
		{"exclusion", func(s *Session) { s.Readings[3].Excluded, s.Readings[3].ExcludeReason = true, "x" }, "changed after"},
		{"standard uncertainty", func(s *Session) { s.Standards[0].Uncertainty = "0.05" }, "changed after"},
		{"performed by", func(s *Session) { s.Seal.PerformedBy = "Someone Else" }, "changed after"},
		{"performed at", func(s *Session) { s.Seal.PerformedAt = s.Seal.PerformedAt.Add(time.Nanosecond) }, "changed after"},
		{"settings", func(s *Session) { s.Settings.Level = 0.99 }, "changed after"},
		{"digest", func(s *Session) { s.Seal.Digest = strings.Repeat("0", 64) }, "digest stored \"0000000000000000…\""},
		{"no signer", func(s *Session) { s.Seal.PerformedBy = "" }, "names no one"},
		{"revision", func(s *Session) { s.Revision = 0 }, "not after"},
	}
	for _, tc := range tamper {
		s := sealedRecord(t)
		tc.do(s)
		b, err := EncodeBytes([]*Session{s})
		if err != nil {
			t.Fatalf("%s: a tampered record must still encode: %v", tc.name, err)
		}
		f, err := Decode(bytes.NewReader(b))
		if err != nil {
			t.Fatalf("%s: a tampered file must still open: %v", tc.name, err)
		}
		ok, err := f.Sessions[0].VerifySeal()
		if ok || !errors.Is(err, ErrSealBroken) || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: VerifySeal = %v, %v; want ErrSealBroken saying %q", tc.name, ok, err, tc.want)
		}
		if err := f.Sessions[0].SignReviewed("R. Okafor", at(50)); err == nil {
			t.Errorf("%s: a broken seal was reviewed", tc.name)
		}
	}
	// An earlier revision changed in the file.
	s := sealedRecord(t)
	if err := s.SetCell(0, ColumnX, "1", at(20)); err != nil {
		t.Fatal(err)
	}
	if err := s.SignPerformed("A. Marsh", at(21)); err != nil {
		t.Fatal(err)
	}
	s.Sealed[0].Readings[0].Y = "0.2"
	if ok, err := s.VerifySeal(); ok || !errors.Is(err, ErrSealBroken) || !strings.Contains(err.Error(), "kept copy of revision 1") {
		t.Errorf("changed earlier revision: %v, %v", ok, err)
	}
}

// TestSealDigestEncoding pins the canonical encoding of FORMAT.md ("Seal
// digest") on the smallest record: the expected bytes are written out
// here from the specification, item by item, and hashed with
// crypto/sha256 (FIPS 180-4), so a change of the encoding in code that the
// specification does not follow fails.
func TestSealDigestEncoding(t *testing.T) {
	s := &Session{ID: strings.Repeat("ab", 16), Created: time.Date(2025, 1, 2, 3, 4, 5, 600, time.UTC), Revision: 1,
		Content: Content{Title: "T", Readings: []Reading{{X: "1", Y: "2 µS", Taken: time.Date(2025, 1, 2, 3, 5, 0, 0, time.UTC)}},
			Settings:   Settings{Level: 0.95},
			Standards:  []Standard{{Name: "s", Value: "1", Expiry: time.Date(2026, 1, 31, 0, 0, 0, 0, time.UTC)}},
			Unknowns:   []Unknown{{Name: "u", Readings: []string{"3"}}},
			Conditions: []Condition{{Name: "temperature", Value: "20", Unit: "°C"}}},
		Seal: &Seal{PerformedBy: "A", PerformedAt: time.Date(2025, 1, 2, 4, 0, 0, 0, time.UTC)},
	}
	items := []string{
		"format pairline-seal-1", "id " + s.ID, "created 2025-01-02T03:04:05.0000006Z", "revision 1", "title T", "site ",
		"instrument.description ", "instrument.serial ", "instrument.id ", "instrument.interval_days 0", "operator ",
		"x_name ", "x_unit ", "y_name ", "y_unit ", "notes ", "decimal_comma ", "location ", "readings 1",
		"readings[0].x 1", "readings[0].y 2 µS", "readings[0].note ", "readings[0].taken 2025-01-02T03:05:00Z",
		"readings[0].excluded false", "readings[0].exclude_reason ",
		"settings.model ", "settings.transform ", "settings.box_cox_lambda ", "settings.weights ",
		"settings.level 3fee666666666666", "settings.slope_ref ", "settings.intercept_ref ",
		"settings.variance_ratio 0000000000000000", "settings.x_uncertainty 0000000000000000",
		"settings.y_uncertainty 0000000000000000", "settings.acceptance ",
		"conditions 1", "conditions[0].name temperature", "conditions[0].value 20", "conditions[0].unit °C",
		"standards 1", "standards[0].name s", "standards[0].certificate ", "standards[0].value 1",
		"standards[0].uncertainty ", "standards[0].expiry 2026-01-31T00:00:00Z",
		"unknowns 1", "unknowns[0].name u", "unknowns[0].readings 1", "unknowns[0].readings[0] 3",
		"performed_by A", "performed_at 2025-01-02T04:00:00Z", "reviewed_by ", "reviewed_at ",
	}
	var want []byte
	for _, it := range items {
		name, value, _ := strings.Cut(it, " ")
		want = fmt.Appendf(want, "%s %d %s\n", name, len(value), value)
	}
	f := s.freeze()
	if got := sealBytes(s.ID, s.Created, &f); !bytes.Equal(got, want) {
		t.Fatalf("encoding differs from the specification:\n%s\nwant\n%s", got, want)
	}
	sum := sha256.Sum256(want)
	if d, err := s.SealDigest(); err != nil || d != hex.EncodeToString(sum[:]) {
		t.Errorf("SealDigest = %s, %v", d, err)
	}
	s.Seal = nil
	if _, err := s.SealDigest(); !errors.Is(err, ErrNotSealed) {
		t.Errorf("unsealed: %v", err)
	}
}

// TestRestoreCarriesRecord: undo and redo bring back the record fields, and
// undoing on a sealed record starts a new revision like any change.
func TestRestoreCarriesRecord(t *testing.T) {
	s := newRecord(t)
	state := *s
	state.Instrument = Instrument{ID: "A-1", IntervalDays: 90}
	state.Conditions = []Condition{{Name: "temperature", Value: "20", Unit: "°C"}}
	state.Standards = []Standard{{Name: "s", Value: "1", Uncertainty: "0.1"}}
	state.Unknowns = []Unknown{{Name: "u", Readings: []string{"1", "2"}}}
	if err := s.Restore(&state, FieldRedo, "record fields", at(1)); err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(s.Instrument, state.Instrument) || !reflect.DeepEqual(s.Conditions, state.Conditions) ||
		!reflect.DeepEqual(s.Standards, state.Standards) || !reflect.DeepEqual(s.Unknowns, state.Unknowns) {
		t.Fatalf("restore did not carry the record fields: %+v", s)
	}
	state.Unknowns[0].Readings[0] = "9"
	if s.Unknowns[0].Readings[0] != "1" {
		t.Error("restore shares the readings of an unknown with the state")
	}
	sealed := sealedRecord(t)
	old := *sealed
	old.Standards = nil
	if err := sealed.Restore(&old, FieldUndo, "standard 1 added", at(30)); err != nil {
		t.Fatal(err)
	}
	if sealed.Revision != 2 || sealed.Seal != nil || len(sealed.Sealed) != 1 || len(sealed.Sealed[0].Standards) != 1 {
		t.Errorf("undo on a sealed record: revision %d, seal %v, sealed %+v", sealed.Revision, sealed.Seal, sealed.Sealed)
	}
}

func TestExpiredStandards(t *testing.T) {
	d := func(y int, m time.Month, day int) time.Time { return time.Date(y, m, day, 0, 0, 0, 0, time.UTC) }
	tests := []struct {
		name    string
		created time.Time
		taken   []time.Time
		expiry  []time.Time
		want    []int
	}{
		{"none given", d(2025, 3, 14), nil, []time.Time{{}, {}}, nil},
		{"expires on the day: still valid", d(2025, 3, 14), nil, []time.Time{d(2025, 3, 14)}, nil},
		{"expired the day before", d(2025, 3, 14), nil, []time.Time{d(2025, 3, 13)}, []int{0}},
		{"latest reading decides", d(2025, 3, 1), []time.Time{d(2025, 3, 2).Add(9 * time.Hour), d(2025, 3, 20).Add(23 * time.Hour)},
			[]time.Time{d(2025, 3, 10), d(2025, 3, 20), d(2025, 4, 1)}, []int{0}},
		{"reading without a time: created", d(2025, 3, 14).Add(10 * time.Hour), []time.Time{{}}, []time.Time{d(2025, 3, 13), d(2025, 3, 15)}, []int{0}},
	}
	for _, tc := range tests {
		s := &Session{Created: tc.created}
		for _, tk := range tc.taken {
			s.Readings = append(s.Readings, Reading{Taken: tk})
		}
		for _, e := range tc.expiry {
			s.Standards = append(s.Standards, Standard{Expiry: e})
		}
		var got []int
		for _, e := range s.ExpiredStandards() {
			got = append(got, e.Index)
			if !e.Day.Equal(s.ReadingsDay()) {
				t.Errorf("%s: day %v", tc.name, e.Day)
			}
		}
		if !reflect.DeepEqual(got, tc.want) {
			t.Errorf("%s: expired %v, want %v", tc.name, got, tc.want)
		}
	}
}

func TestLastRecordFor(t *testing.T) {
	mk := func(id, serial, site string, created int) *Session {
		return &Session{Content: Content{Title: fmt.Sprint(created), Instrument: Instrument{ID: id, Serial: serial}, Site: site}, Created: at(created)}
	}
	ss := []*Session{
		mk("A-1", "S1", "Heron Ford", 1), mk("A-1", "S1", "Heron Ford", 5), mk("a-1 ", "", "heron ford", 3),
		mk("", "S2", "Heron Ford", 9), mk("A-1", "S1", "Mill Lane", 10), nil,
	}
	tests := []struct {
		key, site string
		want      string
	}{
		{"A-1", "Heron Ford", "5"}, {" a-1", "HERON FORD ", "5"}, {"A-1", "", "10"}, {"S2", "Heron Ford", "9"},
		{"S1", "Heron Ford", ""}, // S1 has an ID, so its key is the ID
		{"", "Heron Ford", ""}, {"A-9", "", ""},
	}
	for _, tc := range tests {
		got := LastRecordFor(ss, tc.key, tc.site)
		title := ""
		if got != nil {
			title = got.Title
		}
		if title != tc.want {
			t.Errorf("LastRecordFor(%q, %q) = %q, want %q", tc.key, tc.site, title, tc.want)
		}
	}
}

func TestStandardUncertainties(t *testing.T) {
	comma := true
	tests := []struct {
		name      string
		dc        *bool
		standards []Standard
		x         []float64
		want      []float64
		problems  int
	}{
		{"matched by value", nil, []Standard{{Value: "100", Uncertainty: "0.5"}, {Value: "200.0", Uncertainty: "1"}},
			[]float64{0, 100, 200, 200.0001}, []float64{0, 0.5, 1, 0}, 0},
		{"decimal comma", &comma, []Standard{{Value: "1,5", Uncertainty: "0,01"}}, []float64{1.5, 2}, []float64{0.01, 0}, 0},
		{"no uncertainty: nil", nil, []Standard{{Value: "100"}}, []float64{100}, nil, 0},
		{"nothing matches: nil", nil, []Standard{{Value: "100", Uncertainty: "1"}}, []float64{101}, nil, 0},
		{"same value twice: larger, said", nil, []Standard{{Value: "100", Uncertainty: "1"}, {Value: "1e2", Uncertainty: "2"}}, []float64{100}, []float64{2}, 1},
		{"unreadable and negative", nil, []Standard{{Value: "abc", Uncertainty: "1"}, {Value: "5", Uncertainty: "-1"}, {Value: "6", Uncertainty: "x"}}, []float64{5, 6}, nil, 3},
	}
	for _, tc := range tests {
		s := &Session{Content: Content{DecimalComma: tc.dc, Standards: tc.standards}}
		got, problems := s.StandardUncertainties(tc.x)
		if !reflect.DeepEqual(got, tc.want) || len(problems) != tc.problems {
			t.Errorf("%s: %v, problems %q; want %v and %d problems", tc.name, got, problems, tc.want, tc.problems)
		}
	}
}

func TestUnknownQueries(t *testing.T) {
	s := &Session{Content: Content{Unknowns: []Unknown{
		{Name: "a", Readings: []string{"1", " ", "2.5 µS/cm"}},
		{Name: "b", Readings: []string{"1", "x"}},
		{Name: "c"},
		{Name: "d", Readings: []string{"4"}},
	}}}
	got := s.UnknownQueries()
	if len(got.Queries) != 2 || !reflect.DeepEqual(got.Queries[0].Y, []float64{1, 2.5}) || !reflect.DeepEqual(got.Index, []int{0, 3}) {
		t.Errorf("queries %+v", got)
	}
	if len(got.Problems) != 2 || !strings.Contains(got.Problems[0], `reading 2, "x"`) || !strings.Contains(got.Problems[1], "no readings") {
		t.Errorf("problems %q", got.Problems)
	}
}

// TestResultsSummaryUsesStandards: the summary frozen with a revision is
// fitcore's result for the session's own pairs, unknowns and standards.
func TestResultsSummaryUsesStandards(t *testing.T) {
	s := sealedRecord(t)
	if _, err := s.AddUnknown(Unknown{Name: "u1", Readings: []string{"150"}}, at(20)); err != nil {
		t.Fatal(err)
	}
	sum := s.ResultsSummary()
	if !strings.Contains(sum, `unknown "u1": x `) || !strings.Contains(sum, "4 pairs used") {
		t.Errorf("summary %q", sum)
	}
}

// TestRestoreRefusesLists: a state past the record limits is refused
// before anything changes.
func TestRestoreRefusesLists(t *testing.T) {
	s := newRecord(t)
	state := *s
	state.Standards = make([]Standard, MaxStandards+1)
	if err := s.Restore(&state, FieldUndo, "x", at(1)); !errors.Is(err, ErrBadValue) || len(s.History) != 0 || s.Standards != nil {
		t.Errorf("too many standards: %v, %d entries", err, len(s.History))
	}
	state = *s
	state.Instrument.IntervalDays = -5
	if err := s.Restore(&state, FieldUndo, "x", at(1)); !errors.Is(err, ErrBadValue) {
		t.Errorf("negative interval: %v", err)
	}
}
