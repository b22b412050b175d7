package ui

// The controller's action for the record cards (record.go, recordui.go):
// identity, conditions, standards, unknown samples, the offer of the last
// record, signing and revisions. Plain Go, as controller.go.

import (
	"strconv"
	"strings"
	"time"

	"pairline/app/session"
)

// record makes the change a record card asked for through the session's
// methods (which write the history), then runs changed as every action
// does (undo step, analysis, save). Signing and starting a revision are
// taken on a sealed record; every other change is refused there
// (errLocked). Signing is no edit to undo: the stacks start again from the
// sealed state. last is the last record of the same instrument, whose
// parts raUseLast copies (nil: nothing to copy). On an error nothing more
// is done: the session keeps what was changed before it, as the history
// says.
func (k *controller) record(a RecordAction, last *session.Session, now time.Time) error {
	if k.sess == nil {
		return errNoSession
	}
	if err := k.recordChange(a, last, now); err != nil {
		return err
	}
	if a.Kind == raSeal || a.Kind == raReview {
		k.undoRestart()
		k.unlocked = ""
	}
	k.changed()
	return nil
}

// recordChange is record's change of the session alone: signing and
// revisions are taken on a sealed record, every other change only on an
// open one (recordEdit).
func (k *controller) recordChange(a RecordAction, last *session.Session, now time.Time) error {
	s := k.sess
	switch a.Kind {
	case raSeal:
		return s.SignPerformed(a.Value, now)
	case raReview:
		return s.SignReviewed(a.Value, now)
	case raNewRevision:
		k.unlocked = s.ID
		return nil
	}
	if k.locked() {
		return errLocked
	}
	return recordEdit(s, a, last, now)
}

// recordEdit makes a change of an open record.
func recordEdit(s *session.Session, a RecordAction, last *session.Session, now time.Time) error {
	switch a.Kind {
	case raField:
		return s.SetField(a.Field, a.Value, now)
	case raCondition:
		if a.Field == session.ConditionTemperature || a.Field == session.ConditionTemperature+"-unit" {
			return recordTemperature(s, a, now)
		}
		return addOrSet(s.AddCondition, s.SetCondition, a.Index, a.Condition, now)
	case raCondRemove:
		return s.RemoveCondition(a.Index, now)
	case raStandard:
		return addOrSet(s.AddStandard, s.SetStandard, a.Index, a.Standard, now)
	case raStdField:
		return recordStdField(s, a, now)
	case raCondField:
		return recordCondField(s, a, now)
	case raStdRemove:
		return s.RemoveStandard(a.Index, now)
	case raUnknown:
		if a.Index < 0 && len(a.Unknown.Readings) == 0 {
			return errNoRepeats
		}
		return addOrSet(s.AddUnknown, s.SetUnknown, a.Index, a.Unknown, now)
	case raUnkRemove:
		return s.RemoveUnknown(a.Index, now)
	case raUseLast:
		return useLast(s, last, now)
	}
	return nil
}

// addOrSet adds v as a new row (index < 0) or sets row index to it, through
// the session's method for the kind of row.
func addOrSet[T any](add func(T, time.Time) (int, error), set func(int, T, time.Time) error, index int, v T, now time.Time) error {
	if index < 0 {
		_, err := add(v, now)
		return err
	}
	return set(index, v, now)
}

// recordTemperature sets the value (a.Field is the condition's name) or the
// unit (the name and "-unit") of the temperature condition, adding it when
// the record has none yet.
func recordTemperature(s *session.Session, a RecordAction, now time.Time) error {
	i := conditionIndex(s, session.ConditionTemperature)
	cd := session.Condition{Name: session.ConditionTemperature}
	if i >= 0 {
		cd = s.Conditions[i]
	}
	if a.Field == session.ConditionTemperature {
		cd.Value = strings.TrimSpace(a.Value)
	} else {
		cd.Unit = strings.TrimSpace(a.Value)
	}
	return addOrSet(s.AddCondition, s.SetCondition, i, cd, now)
}

// recordStdField sets one field of standard a.Index (name, certificate,
// value, uncertainty or expiry as year-month-day; an empty expiry clears it).
func recordStdField(s *session.Session, a RecordAction, now time.Time) error {
	if a.Index < 0 || a.Index >= len(s.Standards) {
		return session.ErrNoSuchRow
	}
	st := s.Standards[a.Index]
	switch a.Field {
	case "name":
		st.Name = a.Value
	case "certificate":
		st.Certificate = a.Value
	case "value":
		st.Value = strings.TrimSpace(a.Value)
	case "uncertainty":
		st.Uncertainty = strings.TrimSpace(a.Value)
	case "expiry":
		d, err := expiryDate(a.Value)
		if err != nil {
			return err
		}
		st.Expiry = d
	default:
		return session.ErrNoSuchField
	}
	return s.SetStandard(a.Index, st, now)
}

// expiryDate reads a standard's expiry date, year-month-day; empty text is
// no date.
func expiryDate(text string) (time.Time, error) {
	v := strings.TrimSpace(text)
	if v == "" {
		return time.Time{}, nil
	}
	d, err := time.Parse("2006-01-02", v)
	if err != nil {
		return time.Time{}, uiError("the expiry date " + strconv.Quote(clip(v, 40)) + " is not a date (year-month-day)")
	}
	return d, nil
}

// recordCondField sets one field of condition a.Index (name, value, unit).
func recordCondField(s *session.Session, a RecordAction, now time.Time) error {
	if a.Index < 0 || a.Index >= len(s.Conditions) {
		return session.ErrNoSuchRow
	}
	cd := s.Conditions[a.Index]
	switch a.Field {
	case "name":
		cd.Name = a.Value
	case "value":
		cd.Value = strings.TrimSpace(a.Value)
	case "unit":
		cd.Unit = strings.TrimSpace(a.Value)
	default:
		return session.ErrNoSuchField
	}
	return s.SetCondition(a.Index, cd, now)
}

// useLast fills the empty parts of record s from l, the last record of
// the same instrument: its identity, interval and operator where s has
// none, the names and units of x and y, the conditions' names and units
// (their values are today's to take), and its standards.
func useLast(s, l *session.Session, now time.Time) error {
	if l == nil {
		return nil
	}
	fill := func(field, have, last string) error {
		if strings.TrimSpace(have) != "" || strings.TrimSpace(last) == "" {
			return nil
		}
		return s.SetField(field, last, now)
	}
	for _, f := range []struct{ field, have, last string }{
		{session.FieldSite, s.Site, l.Site},
		{session.FieldInstrument, s.Instrument.Description, l.Instrument.Description},
		{session.FieldSerial, s.Instrument.Serial, l.Instrument.Serial},
		{session.FieldInstrumentID, s.Instrument.ID, l.Instrument.ID},
		{session.FieldOperator, s.Operator, l.Operator},
		{session.FieldXUnit, s.XUnit, l.XUnit},
		{session.FieldYUnit, s.YUnit, l.YUnit},
	} {
		if err := fill(f.field, f.have, f.last); err != nil {
			return err
		}
	}
	if s.Instrument.IntervalDays == 0 && l.Instrument.IntervalDays > 0 {
		if err := s.SetField(session.FieldIntervalDays, strconv.Itoa(l.Instrument.IntervalDays), now); err != nil {
			return err
		}
	}
	for _, cd := range l.Conditions {
		if conditionIndex(s, strings.TrimSpace(cd.Name)) >= 0 {
			continue
		}
		if _, err := s.AddCondition(session.Condition{Name: cd.Name, Unit: cd.Unit}, now); err != nil {
			return err
		}
	}
	if len(s.Standards) == 0 {
		for _, st := range l.Standards {
			if _, err := s.AddStandard(st, now); err != nil {
				return err
			}
		}
	}
	return nil
}
