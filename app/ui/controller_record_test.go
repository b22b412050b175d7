package ui

import (
	"errors"
	"testing"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/session"
)

// TestControllerRecord: the record cards' changes go through the controller
// as every other change does: each one that changes the record is a step
// to undo and is handed to the saver; a refused one (a date that is no
// date, a sealed record) changes nothing and adds no step; signing starts
// the undo history again from the sealed state, and "Start revision"
// unlocks the record; the offer of the last record fills only what is
// empty.
func TestControllerRecord(t *testing.T) {
	now := time.Date(2026, 7, 1, 8, 0, 0, 0, time.UTC)
	s, err := session.New("Invented record check", now, nil)
	if err != nil {
		t.Fatal(err)
	}
	for i, p := range [][2]string{{"1", "2.1"}, {"2", "4.0"}, {"3", "6.1"}} {
		s.AddRow(p[0], p[1], now.Add(time.Duration(i)*time.Minute))
	}
	last, err := session.New("Invented last record", now.Add(-24*time.Hour), nil)
	if err != nil {
		t.Fatal(err)
	}
	last.Operator, last.XUnit = "J. Invented", "mS/cm"
	last.Standards = []session.Standard{{Name: "Invented standard 1", Value: "1.413"}}
	k := propController(t, s)
	tests := []struct {
		name   string
		a      RecordAction
		last   *session.Session
		err    error // nil, or the error wanted (errors.Is)
		refuse bool  // an error whose text is for people (no sentinel)
		step   bool  // a step to undo is added
		check  func() string
	}{
		{"field", RecordAction{Kind: raField, Field: session.FieldSite, Value: "Invented intake"}, nil, nil, false, true, func() string {
			if s.Site != "Invented intake" {
				return "site " + s.Site
			}
			return ""
		}},
		{"temperature", RecordAction{Kind: raCondition, Field: session.ConditionTemperature, Value: " 21.5 "}, nil, nil, false, true, func() string {
			if i := conditionIndex(s, session.ConditionTemperature); i < 0 || s.Conditions[i].Value != "21.5" {
				return "the temperature is not recorded as 21.5"
			}
			return ""
		}},
		{"standard", RecordAction{Kind: raStandard, Index: -1, Standard: session.Standard{Name: "Invented buffer"}}, nil, nil, false, true, func() string {
			if len(s.Standards) != 1 || s.Standards[0].Name != "Invented buffer" {
				return "the standard was not added"
			}
			return ""
		}},
		{"expiry no date", RecordAction{Kind: raStdField, Index: 0, Field: "expiry", Value: "next week"}, nil, nil, true, false, func() string {
			if !s.Standards[0].Expiry.IsZero() {
				return "an expiry was set"
			}
			return ""
		}},
		{"expiry", RecordAction{Kind: raStdField, Index: 0, Field: "expiry", Value: "2027-01-31"}, nil, nil, false, true, func() string {
			if s.Standards[0].Expiry.Format("2006-01-02") != "2027-01-31" {
				return "expiry " + s.Standards[0].Expiry.String()
			}
			return ""
		}},
		{"no such standard", RecordAction{Kind: raStdField, Index: 5, Field: "name", Value: "x"}, nil, session.ErrNoSuchRow, false, false, nil},
		{"use last", RecordAction{Kind: raUseLast}, last, nil, false, true, func() string {
			if s.Operator != "J. Invented" || s.XUnit != "mS/cm" || len(s.Standards) != 1 || s.Standards[0].Name != "Invented buffer" {
				return "the last record's operator and unit not taken, or the standard of this one replaced"
			}
			return ""
		}},
		{"seal", RecordAction{Kind: raSeal, Value: "A. Invented"}, nil, nil, false, false, func() string {
			if s.Seal == nil || len(k.unStack) != 0 || k.unlocked != "" {
				return "not sealed, or the undo history not started again"
			}
			return ""
		}},
		{"sealed", RecordAction{Kind: raField, Field: session.FieldSite, Value: "Elsewhere"}, nil, errLocked, false, false, func() string {
			if s.Site != "Invented intake" {
				return "a sealed record was changed"
			}
			return ""
		}},
		{"new revision", RecordAction{Kind: raNewRevision}, nil, nil, false, false, func() string {
			if k.unlocked != s.ID || k.locked() {
				return "the record is still locked"
			}
			return ""
		}},
	}
	for _, tt := range tests {
		depth, hist := len(k.unStack), len(s.History)
		for k.saves.len() > 0 {
			k.saves.next() // what was queued before this change
		}
		err := k.record(tt.a, tt.last, now)
		switch {
		case tt.err != nil && !errors.Is(err, tt.err):
			t.Errorf("%s: error %v, want %v", tt.name, err, tt.err)
		case tt.err == nil && tt.refuse && err == nil:
			t.Errorf("%s: not refused", tt.name)
		case tt.err == nil && !tt.refuse && err != nil:
			t.Errorf("%s: %v", tt.name, err)
		}
		if got := len(k.unStack) > depth; got != tt.step {
			t.Errorf("%s: a step to undo added %v, want %v", tt.name, got, tt.step)
		}
		if err == nil && len(s.History) > hist && !k.saves.pending(s.ID) {
			t.Errorf("%s: the change was not handed to the saver", tt.name)
		}
		if err != nil && len(s.History) != hist {
			t.Errorf("%s: a refused change wrote the history", tt.name)
		}
		if tt.check != nil {
			if msg := tt.check(); msg != "" {
				t.Errorf("%s: %s", tt.name, msg)
			}
		}
	}
	if err := (&controller{}).record(RecordAction{Kind: raField}, nil, now); err != errNoSession {
		t.Error("a controller without a session took a record change")
	}
}

// TestRecordActionThroughShell: a card's change reaches the session through
// the Shell's recordAction and the controller, undo takes it back, and the
// offer of the last record is marked answered when it is used.
func TestRecordActionThroughShell(t *testing.T) {
	c := cardsShell(t)
	c.recordAction(RecordAction{Kind: raField, Field: session.FieldOperator, Value: "B. Invented"})
	if c.ctl.sess.Operator != "B. Invented" || len(c.ctl.unStack) == 0 {
		t.Fatalf("operator %q, %d steps to undo", c.ctl.sess.Operator, len(c.ctl.unStack))
	}
	c.undo(app.Context{}, app.Event{})
	if c.ctl.sess.Operator != "" {
		t.Errorf("undo left the operator %q", c.ctl.sess.Operator)
	}
	c.recordAction(RecordAction{Kind: raUseLast})
	if c.recNoOffer != c.ctl.sess.ID {
		t.Error("the offer of the last record is still shown after it was used")
	}
	c.recordAction(RecordAction{Kind: raStdField, Index: 3, Field: "name"})
	if c.notice == "" {
		t.Error("a refused change said nothing")
	}
}
