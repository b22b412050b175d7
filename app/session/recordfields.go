package session

import (
	"fmt"
	"strings"
	"time"
)

// The lists of a record (conditions, standards, unknowns) are changed
// through Add…, Set… and Remove… methods. Each records one history entry per
// field that changed, with Old and New in words a report can print, and
// refuses values past the limits Validate applies, so a record changed
// through them always encodes.

func cloneConditions(c []Condition) []Condition {
	if c == nil {
		return nil
	}
	return append([]Condition(nil), c...)
}

func cloneStandards(c []Standard) []Standard {
	if c == nil {
		return nil
	}
	return append([]Standard(nil), c...)
}

func cloneUnknowns(c []Unknown) []Unknown {
	if c == nil {
		return nil
	}
	out := make([]Unknown, len(c))
	for i, u := range c {
		out[i] = Unknown{Name: u.Name, Readings: append([]string(nil), u.Readings...)}
	}
	return out
}

func shortTextErr(what, text string) error {
	if len(text) > MaxShortText {
		return fmt.Errorf("%w: %s is %d bytes long, at most %d are allowed", ErrBadValue, what, len(text), MaxShortText)
	}
	return nil
}

func (c Condition) check(n int) error {
	for _, f := range []struct{ name, v string }{{"name", c.Name}, {"value", c.Value}, {"unit", c.Unit}} {
		if err := shortTextErr(fmt.Sprintf("condition %d %s", n, f.name), f.v); err != nil {
			return err
		}
	}
	return nil
}

func (st Standard) check(n int) error {
	for _, f := range []struct{ name, v string }{{"name", st.Name}, {"certificate", st.Certificate}, {"value", st.Value}, {"uncertainty", st.Uncertainty}} {
		if err := shortTextErr(fmt.Sprintf("standard %d %s", n, f.name), f.v); err != nil {
			return err
		}
	}
	if err := checkTime(st.Expiry, false); err != nil {
		return fmt.Errorf("%w: standard %d expiry: %v", ErrBadValue, n, err)
	}
	return nil
}

func (u Unknown) check(n int) error {
	if err := shortTextErr(fmt.Sprintf("unknown %d name", n), u.Name); err != nil {
		return err
	}
	if len(u.Readings) > MaxUnknownReadings {
		return fmt.Errorf("%w: unknown %d has %d readings, at most %d are allowed", ErrBadValue, n, len(u.Readings), MaxUnknownReadings)
	}
	for j, r := range u.Readings {
		if len(r) > MaxCellText {
			return fmt.Errorf("%w: unknown %d reading %d is %d bytes long, at most %d are allowed", ErrBadValue, n, j+1, len(r), MaxCellText)
		}
	}
	return nil
}

// dateText is a standard's expiry in words: "2027-03-31" or "not given".
func dateText(t time.Time) string {
	if t.IsZero() {
		return "not given"
	}
	return t.UTC().Format("2006-01-02")
}

// conditionText is "temperature 21.4 °C".
func conditionText(c Condition) string {
	return strings.TrimSpace(strings.Join([]string{c.Name, c.Value, c.Unit}, " "))
}

// changeText records one changed field of a list item: "standard 2
// certificate set to C-2231", was "standard 2 certificate was C-2230".
func (s *Session) changeText(now time.Time, kind string, n int, field, old, new string) {
	if old == new {
		return
	}
	s.record(now, kind, -1, fmt.Sprintf("%s %d %s was %s", kind, n, field, quoteEmpty(old)), fmt.Sprintf("%s %d %s set to %s", kind, n, field, quoteEmpty(new)))
}

func quoteEmpty(v string) string {
	if v == "" {
		return "(empty)"
	}
	return v
}

// AddCondition appends a condition and returns its index (from 0).
func (s *Session) AddCondition(c Condition, now time.Time) (int, error) {
	if len(s.Conditions) >= MaxConditions {
		return -1, fmt.Errorf("%w: the record already holds %d conditions, at most %d are allowed", ErrBadValue, len(s.Conditions), MaxConditions)
	}
	n := len(s.Conditions) + 1
	if err := c.check(n); err != nil {
		return -1, err
	}
	s.beforeChange(now)
	s.Conditions = append(s.Conditions, c)
	s.record(now, EditCondition, -1, "", fmt.Sprintf("condition %d added: %s", n, quoteEmpty(conditionText(c))))
	return n - 1, nil
}

// SetCondition replaces condition i (from 0). Each field that changed gets
// its own history entry; setting what it already holds records nothing.
func (s *Session) SetCondition(i int, c Condition, now time.Time) error {
	if i < 0 || i >= len(s.Conditions) {
		return fmt.Errorf("%w: condition %d (the record has %d)", ErrNoSuchRow, i+1, len(s.Conditions))
	}
	if err := c.check(i + 1); err != nil {
		return err
	}
	old := s.Conditions[i]
	if old == c {
		return nil
	}
	s.beforeChange(now)
	s.Conditions[i] = c
	s.changeText(now, EditCondition, i+1, "name", old.Name, c.Name)
	s.changeText(now, EditCondition, i+1, "value", old.Value, c.Value)
	s.changeText(now, EditCondition, i+1, "unit", old.Unit, c.Unit)
	return nil
}

// RemoveCondition removes condition i (from 0); the ones after it move up.
func (s *Session) RemoveCondition(i int, now time.Time) error {
	if i < 0 || i >= len(s.Conditions) {
		return fmt.Errorf("%w: condition %d (the record has %d)", ErrNoSuchRow, i+1, len(s.Conditions))
	}
	s.beforeChange(now)
	old := s.Conditions[i]
	s.Conditions = append(s.Conditions[:i:i], s.Conditions[i+1:]...)
	s.record(now, EditCondition, -1, fmt.Sprintf("condition %d was %s", i+1, quoteEmpty(conditionText(old))), fmt.Sprintf("condition %d removed", i+1))
	return nil
}

// AddStandard appends a standard and returns its index (from 0). Expiry is
// kept as a UTC date.
func (s *Session) AddStandard(st Standard, now time.Time) (int, error) {
	if len(s.Standards) >= MaxStandards {
		return -1, fmt.Errorf("%w: the record already holds %d standards, at most %d are allowed", ErrBadValue, len(s.Standards), MaxStandards)
	}
	n := len(s.Standards) + 1
	st.Expiry = utcDate(st.Expiry)
	if err := st.check(n); err != nil {
		return -1, err
	}
	s.beforeChange(now)
	s.Standards = append(s.Standards, st)
	s.record(now, EditStandard, -1, "", fmt.Sprintf("standard %d added: %s, certificate %s, value %s, uncertainty %s, expiry %s",
		n, quoteEmpty(st.Name), quoteEmpty(st.Certificate), quoteEmpty(st.Value), quoteEmpty(st.Uncertainty), dateText(st.Expiry)))
	return n - 1, nil
}

// SetStandard replaces standard i (from 0). Each field that changed gets
// its own history entry.
func (s *Session) SetStandard(i int, st Standard, now time.Time) error {
	if i < 0 || i >= len(s.Standards) {
		return fmt.Errorf("%w: standard %d (the record has %d)", ErrNoSuchRow, i+1, len(s.Standards))
	}
	st.Expiry = utcDate(st.Expiry)
	if err := st.check(i + 1); err != nil {
		return err
	}
	old := s.Standards[i]
	if old.Name == st.Name && old.Certificate == st.Certificate && old.Value == st.Value && old.Uncertainty == st.Uncertainty && old.Expiry.Equal(st.Expiry) {
		return nil
	}
	s.beforeChange(now)
	s.Standards[i] = st
	s.changeText(now, EditStandard, i+1, "name", old.Name, st.Name)
	s.changeText(now, EditStandard, i+1, "certificate", old.Certificate, st.Certificate)
	s.changeText(now, EditStandard, i+1, "value", old.Value, st.Value)
	s.changeText(now, EditStandard, i+1, "uncertainty", old.Uncertainty, st.Uncertainty)
	if !old.Expiry.Equal(st.Expiry) {
		s.changeText(now, EditStandard, i+1, "expiry", dateText(old.Expiry), dateText(st.Expiry))
	}
	return nil
}

// RemoveStandard removes standard i (from 0); the ones after it move up.
func (s *Session) RemoveStandard(i int, now time.Time) error {
	if i < 0 || i >= len(s.Standards) {
		return fmt.Errorf("%w: standard %d (the record has %d)", ErrNoSuchRow, i+1, len(s.Standards))
	}
	s.beforeChange(now)
	old := s.Standards[i]
	s.Standards = append(s.Standards[:i:i], s.Standards[i+1:]...)
	s.record(now, EditStandard, -1, fmt.Sprintf("standard %d was %s, certificate %s", i+1, quoteEmpty(old.Name), quoteEmpty(old.Certificate)), fmt.Sprintf("standard %d removed", i+1))
	return nil
}

// AddUnknown appends an unknown and returns its index (from 0).
func (s *Session) AddUnknown(u Unknown, now time.Time) (int, error) {
	if len(s.Unknowns) >= MaxUnknowns {
		return -1, fmt.Errorf("%w: the record already holds %d unknowns, at most %d are allowed", ErrBadValue, len(s.Unknowns), MaxUnknowns)
	}
	n := len(s.Unknowns) + 1
	if err := u.check(n); err != nil {
		return -1, err
	}
	s.beforeChange(now)
	u.Readings = append([]string(nil), u.Readings...)
	s.Unknowns = append(s.Unknowns, u)
	s.record(now, EditUnknown, -1, "", fmt.Sprintf("unknown %d added: %s, readings %s", n, quoteEmpty(u.Name), quoteEmpty(strings.Join(u.Readings, "; "))))
	return n - 1, nil
}

// SetUnknown replaces unknown i (from 0): its name and its readings.
func (s *Session) SetUnknown(i int, u Unknown, now time.Time) error {
	if i < 0 || i >= len(s.Unknowns) {
		return fmt.Errorf("%w: unknown %d (the record has %d)", ErrNoSuchRow, i+1, len(s.Unknowns))
	}
	if err := u.check(i + 1); err != nil {
		return err
	}
	old := s.Unknowns[i]
	oldR, newR := strings.Join(old.Readings, "; "), strings.Join(u.Readings, "; ")
	sameReadings := len(old.Readings) == len(u.Readings)
	for j := 0; sameReadings && j < len(u.Readings); j++ {
		sameReadings = old.Readings[j] == u.Readings[j]
	}
	if old.Name == u.Name && sameReadings {
		return nil
	}
	s.beforeChange(now)
	s.Unknowns[i] = Unknown{Name: u.Name, Readings: append([]string(nil), u.Readings...)}
	s.changeText(now, EditUnknown, i+1, "name", old.Name, u.Name)
	if !sameReadings {
		if oldR == newR {
			// Same text joined, different cells (e.g. "1; 2" as one cell):
			// say how many.
			oldR, newR = fmt.Sprintf("%d readings", len(old.Readings)), fmt.Sprintf("%d readings", len(u.Readings))
		}
		s.changeText(now, EditUnknown, i+1, "readings", oldR, newR)
	}
	return nil
}

// RemoveUnknown removes unknown i (from 0); the ones after it move up.
func (s *Session) RemoveUnknown(i int, now time.Time) error {
	if i < 0 || i >= len(s.Unknowns) {
		return fmt.Errorf("%w: unknown %d (the record has %d)", ErrNoSuchRow, i+1, len(s.Unknowns))
	}
	s.beforeChange(now)
	old := s.Unknowns[i]
	s.Unknowns = append(s.Unknowns[:i:i], s.Unknowns[i+1:]...)
	s.record(now, EditUnknown, -1, fmt.Sprintf("unknown %d was %s", i+1, quoteEmpty(old.Name)), fmt.Sprintf("unknown %d removed", i+1))
	return nil
}

// utcDate is t's calendar date (as read in UTC) at midnight UTC; zero stays
// zero.
func utcDate(t time.Time) time.Time {
	if t.IsZero() {
		return t
	}
	t = t.UTC()
	return time.Date(t.Year(), t.Month(), t.Day(), 0, 0, 0, 0, time.UTC)
}

// beforeChange is called by every method that changes the content of a
// record, before it changes it. A sealed record (Seal set) starts a new
// revision: the sealed state is frozen onto Sealed, Revision goes up by
// one, Seal is cleared and the history gets an EditRevision entry, so the
// entries after it say what changed since the seal.
func (s *Session) beforeChange(now time.Time) {
	if s.Seal == nil {
		return
	}
	s.Sealed = append(s.Sealed, s.frozen())
	if len(s.Sealed) > MaxSealedRevisions {
		// The oldest frozen copies go; their seals stay in the history.
		s.Sealed = append(s.Sealed[:0:0], s.Sealed[len(s.Sealed)-MaxSealedRevisions:]...)
	}
	old := s.Revision
	s.Revision++
	s.Seal = nil
	s.record(now, EditRevision, -1, fmt.Sprint(old), fmt.Sprint(s.Revision))
}

// freeze is the current revision, with its seal, as a SealedRevision
// holding its own copy of the content.
func (s *Session) freeze() SealedRevision {
	f := SealedRevision{Revision: s.Revision, Content: s.Content.clone()}
	if s.Seal != nil {
		f.Seal = *s.Seal
	}
	return f
}

// clone is a deep copy of c: the copy shares no slice or pointer with c.
func (c *Content) clone() Content {
	f := *c
	f.Readings = append([]Reading(nil), c.Readings...)
	f.Settings = c.Settings.clone()
	f.Conditions = cloneConditions(c.Conditions)
	f.Standards = cloneStandards(c.Standards)
	f.Unknowns = cloneUnknowns(c.Unknowns)
	if c.DecimalComma != nil {
		d := *c.DecimalComma
		f.DecimalComma = &d
	}
	if c.Location != nil {
		l := *c.Location
		f.Location = &l
	}
	return f
}

// view is the current revision as a SealedRevision that shares the
// session's slices (for reading only, as SealDigest does).
func (s *Session) view() *SealedRevision {
	f := &SealedRevision{Revision: s.Revision, Content: s.Content}
	if s.Seal != nil {
		f.Seal = *s.Seal
	}
	return f
}

// frozen is freeze with the results summary, for the copy kept on Sealed.
func (s *Session) frozen() SealedRevision {
	f := s.freeze()
	f.Results = s.ResultsSummary()
	return f
}
