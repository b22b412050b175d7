package session

import (
	"fmt"
	"math"
	"strconv"
	"time"
	"unicode/utf8"

	"pairline/fitcore"
)

// Limits on what a session may hold. Encode refuses sessions beyond them and
// Decode refuses files that hold them, so a file the tablet writes is always
// a file the office can read.
const (
	MaxFileSize  = 64 << 20 // bytes in a .pairline file, header and checksum included
	MaxSessions  = 1000     // sessions in one file
	MaxReadings  = 250_000  // readings in one session
	MaxHistory   = 2_000_000
	MaxShortText = 1000  // bytes: title, site, names, units, serial, operator, reasons
	MaxCellText  = 1000  // bytes: the text of an x or y cell
	MaxNoteText  = 4000  // bytes: the note of one reading
	MaxLongText  = 65536 // bytes: session notes, Old/New of a history entry
	MaxFieldName = 64    // bytes: Edit.Field
)

// The range of times a session may hold. Zero times mean "not recorded"
// where the field allows it.
var (
	MinTime = time.Date(1900, 1, 1, 0, 0, 0, 0, time.UTC)
	MaxTime = time.Date(2200, 1, 1, 0, 0, 0, 0, time.UTC)
)

// Validate checks a session against the limits Encode and Decode apply. The
// error wraps ErrInvalidField (or ErrTooLarge) and names the field.
func (s *Session) Validate() error {
	if field, err := s.validate(); err != nil {
		return fmt.Errorf("%s: %w", field, err)
	}
	return nil
}

func invalid(format string, a ...any) error {
	return fmt.Errorf("%w: "+format, append([]any{ErrInvalidField}, a...)...)
}

func checkText(s string, max int) error {
	if len(s) > max {
		return invalid("the text is longer than %d bytes (%d)", max, len(s))
	}
	if !utf8.ValidString(s) {
		return invalid("the text is not valid UTF-8")
	}
	return nil
}

func checkTime(t time.Time, required bool) error {
	if t.IsZero() {
		if required {
			return invalid("the time is missing")
		}
		return nil
	}
	if t.Before(MinTime) || !t.Before(MaxTime) {
		return invalid("the time %s is outside %d–%d", t.UTC().Format(time.RFC3339), MinTime.Year(), MaxTime.Year()-1)
	}
	return nil
}

func checkFinite(v float64) error {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return invalid("the number is not finite (%v)", v)
	}
	return nil
}

func checkNonNeg(v float64) error {
	if err := checkFinite(v); err != nil {
		return err
	}
	if v < 0 {
		return invalid("the number must not be negative (%v)", v)
	}
	return nil
}

func checkOptFinite(p *float64) error {
	if p == nil {
		return nil
	}
	return checkFinite(*p)
}

func isHexID(id string) bool {
	if len(id) != 32 {
		return false
	}
	for i := 0; i < len(id); i++ {
		c := id[i]
		if !('0' <= c && c <= '9' || 'a' <= c && c <= 'f') {
			return false
		}
	}
	return true
}

// validate returns the path of the first bad field and why.
func (s *Session) validate() (string, error) {
	if !isHexID(s.ID) {
		return "id", invalid("the session ID %q is not 32 lowercase hex digits", truncate(s.ID, 40))
	}
	short := []struct {
		name string
		v    string
	}{
		{"title", s.Title}, {"site", s.Site}, {"instrument.description", s.Instrument.Description},
		{"instrument.serial", s.Instrument.Serial}, {"operator", s.Operator}, {"x_name", s.XName},
		{"x_unit", s.XUnit}, {"y_name", s.YName}, {"y_unit", s.YUnit},
	}
	for _, f := range short {
		if err := checkText(f.v, MaxShortText); err != nil {
			return f.name, err
		}
	}
	if err := checkText(s.Notes, MaxLongText); err != nil {
		return "notes", err
	}
	if err := checkTime(s.Created, true); err != nil {
		return "created", err
	}
	if err := checkTime(s.Modified, true); err != nil {
		return "modified", err
	}
	if s.Location != nil {
		if f, err := s.Location.validate(); err != nil {
			return "location." + f, err
		}
	}
	if len(s.Readings) > MaxReadings {
		return "readings", fmt.Errorf("%w: %d readings, at most %d allowed", ErrTooLarge, len(s.Readings), MaxReadings)
	}
	for i := range s.Readings {
		if f, err := s.Readings[i].validate(); err != nil {
			return fmt.Sprintf("readings[%d].%s", i, f), err
		}
	}
	if f, err := s.Settings.validate(); err != nil {
		return "settings." + f, err
	}
	if len(s.History) > MaxHistory {
		return "history", fmt.Errorf("%w: %d history entries, at most %d allowed", ErrTooLarge, len(s.History), MaxHistory)
	}
	// Each entry names a row that existed when it was made. Rows are only
	// added at the end, except where a FieldRows entry (undo, redo) says
	// the count changed; so, walking back from the last entry, the count
	// after each entry is at most the count of the session, or at most the
	// Old of the nearest FieldRows entry after it. Files without FieldRows
	// entries are checked against the count of the session, as always.
	rows, then := len(s.Readings), false
	for i := len(s.History) - 1; i >= 0; i-- {
		e := &s.History[i]
		if f, err := e.validate(rows, then); err != nil {
			return fmt.Sprintf("history[%d].%s", i, f), err
		}
		if e.Field == FieldRows {
			before, after, f, err := e.rowCounts()
			if err != nil {
				return fmt.Sprintf("history[%d].%s", i, f), err
			}
			if after > rows {
				return fmt.Sprintf("history[%d].new", i), invalid("the count of readings %d is more than the %d there are after it", after, rows)
			}
			rows, then = before, true
		}
	}
	return "", nil
}

// rowCounts reads the counts of a FieldRows entry.
func (e *Edit) rowCounts() (before, after int, field string, err error) {
	if e.Row != -1 {
		return 0, 0, "row", invalid("a change in the count of readings names no row (row %d)", e.Row)
	}
	for _, c := range []struct {
		name string
		text string
		n    *int
	}{{"old", e.Old, &before}, {"new", e.New, &after}} {
		v, perr := strconv.Atoi(c.text)
		if perr != nil || v < 0 || v > MaxReadings || strconv.Itoa(v) != c.text {
			return 0, 0, c.name, invalid("the count of readings %q is not a whole number from 0 to %d", truncate(c.text, 40), MaxReadings)
		}
		*c.n = v
	}
	return before, after, "", nil
}

func truncate(s string, n int) string {
	if len(s) <= n {
		return s
	}
	return s[:n] + "…"
}

func (l *Location) validate() (string, error) {
	if err := checkFinite(l.Lat); err != nil || l.Lat < -90 || l.Lat > 90 {
		return "lat", invalid("the latitude %v is outside −90 … 90 degrees", l.Lat)
	}
	if err := checkFinite(l.Lon); err != nil || l.Lon < -180 || l.Lon > 180 {
		return "lon", invalid("the longitude %v is outside −180 … 180 degrees", l.Lon)
	}
	if err := checkNonNeg(l.AccuracyM); err != nil {
		return "accuracy_m", err
	}
	if err := checkTime(l.Taken, false); err != nil {
		return "taken", err
	}
	return "", nil
}

func (r *Reading) validate() (string, error) {
	if err := checkText(r.X, MaxCellText); err != nil {
		return "x", err
	}
	if err := checkText(r.Y, MaxCellText); err != nil {
		return "y", err
	}
	if err := checkText(r.Note, MaxNoteText); err != nil {
		return "note", err
	}
	if err := checkText(r.ExcludeReason, MaxShortText); err != nil {
		return "exclude_reason", err
	}
	if err := checkTime(r.Taken, false); err != nil {
		return "taken", err
	}
	return "", nil
}

// validate checks one history entry; rows is the count of readings it
// may name, then says whether that is the count at an earlier point (a
// FieldRows entry follows) rather than the session's own.
func (e *Edit) validate(rows int, then bool) (string, error) {
	if err := checkTime(e.At, true); err != nil {
		return "at", err
	}
	if e.Field == "" {
		return "field", invalid("the name of the changed field is missing")
	}
	if err := checkText(e.Field, MaxFieldName); err != nil {
		return "field", err
	}
	if e.Row < -1 || e.Row >= rows {
		if then {
			return "row", invalid("row %d did not exist when this change was made (the session had %d rows then)", e.Row, rows)
		}
		return "row", invalid("row %d does not exist (the session has %d rows)", e.Row, rows)
	}
	if err := checkText(e.Old, MaxLongText); err != nil {
		return "old", err
	}
	if err := checkText(e.New, MaxLongText); err != nil {
		return "new", err
	}
	return "", nil
}

var (
	knownModels = map[fitcore.Model]bool{"": true, fitcore.ModelOLS: true, fitcore.ModelOrigin: true,
		fitcore.ModelWeighted: true, fitcore.ModelDeming: true}
	knownTransforms = map[fitcore.Transform]bool{"": true, fitcore.TransformNone: true, fitcore.TransformLogY: true,
		fitcore.TransformSqrtY: true, fitcore.TransformReciprocal: true, fitcore.TransformLogLog: true,
		fitcore.TransformBoxCox: true}
	knownWeights = map[fitcore.WeightScheme]bool{fitcore.WeightsNone: true, fitcore.WeightsGiven: true,
		fitcore.WeightsX: true, fitcore.WeightsX2: true, fitcore.WeightsFitted2: true,
		fitcore.WeightsRepeats: true, fitcore.WeightsPowerFit: true}
)

func (st *Settings) validate() (string, error) {
	if !knownModels[st.Model] {
		return "model", invalid("the fit model %q is not one Pairline knows", truncate(string(st.Model), 40))
	}
	if !knownTransforms[st.Transform] {
		return "transform", invalid("the transform %q is not one Pairline knows", truncate(string(st.Transform), 40))
	}
	if !knownWeights[st.Weights] {
		return "weights", invalid("the weighting %q is not one Pairline knows", truncate(string(st.Weights), 40))
	}
	if err := checkFinite(st.Level); err != nil || st.Level < 0 || st.Level >= 1 {
		return "level", invalid("the confidence level %v must be between 0 and 1 (0 means 0.95)", st.Level)
	}
	for _, f := range []struct {
		name string
		p    *float64
	}{{"box_cox_lambda", st.BoxCoxLambda}, {"slope_ref", st.SlopeRef}, {"intercept_ref", st.InterceptRef}} {
		if err := checkOptFinite(f.p); err != nil {
			return f.name, err
		}
	}
	for _, f := range []struct {
		name string
		v    float64
	}{{"variance_ratio", st.VarianceRatio}, {"x_uncertainty", st.XUncertainty}, {"y_uncertainty", st.YUncertainty}} {
		if err := checkNonNeg(f.v); err != nil {
			return f.name, err
		}
	}
	if a := st.Acceptance; a != nil {
		for _, f := range []struct {
			name string
			p    *float64
		}{{"min_r_squared", a.MinRSquared}, {"slope_low", a.SlopeLow}, {"slope_high", a.SlopeHigh},
			{"intercept_low", a.InterceptLow}, {"intercept_high", a.InterceptHigh}, {"max_residual", a.MaxResidual}} {
			if err := checkOptFinite(f.p); err != nil {
				return "acceptance." + f.name, err
			}
		}
		if a.MinRSquared != nil && (*a.MinRSquared < 0 || *a.MinRSquared > 1) {
			return "acceptance.min_r_squared", invalid("the least R² %v must be between 0 and 1", *a.MinRSquared)
		}
		if a.MaxResidual != nil && *a.MaxResidual < 0 {
			return "acceptance.max_residual", invalid("the largest allowed residual %v must not be negative", *a.MaxResidual)
		}
	}
	return "", nil
}
