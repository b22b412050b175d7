package session

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"time"
	"unicode/utf8"

	"pairline/fitcore"
)

// Limits on what Pairline reads and writes. They are the one place these
// numbers are written: Encode refuses sessions beyond them, Decode refuses
// files that hold more, ReadCSV refuses tables past its limits, so a file
// the tablet writes is always a file the office can read, and no file up to
// MaxFileSize makes a reader use more than a few hundred MB or more than a
// few seconds. Past a limit the reader stops with an error that names the
// limit and where it was passed (line and column for CSV, byte offset and
// field for session files); nothing is cut off silently.
const (
	// MaxFileSize is the largest .pairline file (header and checksum
	// included) and the largest CSV or TSV file, in bytes (64 MiB).
	MaxFileSize = 64 << 20
	// MaxSessions is the most sessions one .pairline file holds.
	MaxSessions = 1000
	// MaxReadings is the most readings one session holds, and so the most
	// data rows one CSV import gives.
	MaxReadings = 250_000
	// MaxFileReadings is the most readings all the sessions of one file hold
	// together. Without it the per-session and per-file limits multiply
	// (1,000 sessions × 250,000 readings); with it a decoded file takes at
	// most about 100 bytes of memory per reading.
	MaxFileReadings = 1_000_000
	// MaxHistory is the most history entries one session holds.
	MaxHistory = 2_000_000
	// MaxFileHistory is the most history entries all the sessions of one
	// file hold together.
	MaxFileHistory = 2_000_000
	// MaxShortText is the longest title, site, name, unit, serial number,
	// operator or reason, in bytes.
	MaxShortText = 1000
	// MaxCellText is the longest text of an x or y cell, in bytes.
	MaxCellText = 1000
	// MaxNoteText is the longest note of one reading, in bytes.
	MaxNoteText = 4000
	// MaxLongText is the longest session notes and Old/New text of a history
	// entry, in bytes.
	MaxLongText = 65536
	// MaxFieldName is the longest Edit.Field, in bytes.
	MaxFieldName = 64
	// MaxNumberText is the longest cell text ParseNumber reads as a number,
	// in bytes; longer text is "too long to be a reading".
	MaxNumberText = 256
	// MaxMapKeys is the most keys one MessagePack map of a session file
	// holds. Format 1.1 uses at most 23; the rest is room for keys a newer
	// minor version adds.
	MaxMapKeys = 256
	// MaxKeyLen is the longest map key of a session file, in bytes.
	MaxKeyLen = 64
	// MaxNesting is how deep values of unknown keys may nest in a session
	// file (the reader skips them without recursion past this depth).
	MaxNesting = 32
	// MaxCSVFields is the most fields (cells) one CSV or TSV row holds,
	// delimiters between empty cells included. Spreadsheets that pad rows
	// with empty cells stay far below it; a longer row is refused, not cut.
	MaxCSVFields = 1024
	// MaxCSVFieldLen is the longest single CSV or TSV field, in bytes
	// (quotes included).
	MaxCSVFieldLen = MaxLongText
	// ModifiedSkew is how much earlier than its creation time a session's
	// last change may be stamped. A device clock put back (by the network, or
	// by hand after a time-zone slip) can stamp an edit before the creation
	// time; up to a day of that is accepted, more is refused as a record
	// that cannot be right.
	ModifiedSkew = 24 * time.Hour
	// MaxIntervalDays is the longest calibration interval, in days (about
	// 100 years).
	MaxIntervalDays = 36_525
	// MaxConditions is the most conditions one record holds.
	MaxConditions = 100
	// MaxStandards is the most standards one record holds.
	MaxStandards = 1000
	// MaxUnknowns is the most unknowns one record holds.
	MaxUnknowns = 1000
	// MaxUnknownReadings is the most readings one unknown holds.
	MaxUnknownReadings = 1000
	// MaxSealedRevisions is the most earlier sealed revisions one record
	// keeps. Each holds a frozen copy of the readings, so their readings
	// count towards MaxFileReadings.
	MaxSealedRevisions = 100
	// MaxFileSealedRevisions is the most earlier sealed revisions all the
	// sessions of one file hold together.
	MaxFileSealedRevisions = 10_000
	// MaxFileItems is the most conditions, standards, unknowns and readings
	// of unknowns all the sessions of one file (their sealed revisions
	// included) hold together. Without it the per-record limits multiply
	// (an empty standard takes one byte of a file).
	MaxFileItems = 1_000_000
	// MaxRevision is the highest revision number.
	MaxRevision = 1_000_000
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
	if f, err := s.Content.validate(); err != nil {
		return f, err
	}
	if s.Seal != nil {
		if f, err := s.Seal.validate(); err != nil {
			return "seal." + f, err
		}
	}
	if s.Revision < 0 || s.Revision > MaxRevision {
		return "revision", invalid("the revision %d is not a whole number from 0 to %d", s.Revision, MaxRevision)
	}
	if len(s.Sealed) > MaxSealedRevisions {
		return "sealed", fmt.Errorf("%w: %d earlier sealed revisions, at most %d allowed", ErrTooLarge, len(s.Sealed), MaxSealedRevisions)
	}
	for i := range s.Sealed {
		if f, err := s.Sealed[i].validate(); err != nil {
			return fmt.Sprintf("sealed[%d].%s", i, f), err
		}
	}
	if err := checkTime(s.Created, true); err != nil {
		return "created", err
	}
	if err := checkTime(s.Modified, true); err != nil {
		return "modified", err
	}
	if s.Modified.Before(s.Created.Add(-ModifiedSkew)) {
		return "modified", invalid("the last change (%s) is more than %v before the session was started (%s)",
			s.Modified.UTC().Format(time.RFC3339), ModifiedSkew, s.Created.UTC().Format(time.RFC3339))
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

// Validation checks the limits and the form of the record fields only. It
// does not check a seal's digest: a file whose content no longer matches
// its seal must still open, so that the office sees that it was changed
// (VerifySeal says so and why).

func (in *Instrument) validate() (string, error) {
	if err := checkText(in.ID, MaxShortText); err != nil {
		return "id", err
	}
	if in.IntervalDays < 0 || in.IntervalDays > MaxIntervalDays {
		return "interval_days", invalid("the calibration interval %d is not a whole number of days from 0 to %d", in.IntervalDays, MaxIntervalDays)
	}
	return "", nil
}

func validateLists(cs []Condition, ss []Standard, us []Unknown) (string, error) {
	if len(cs) > MaxConditions {
		return "conditions", fmt.Errorf("%w: %d conditions, at most %d allowed", ErrTooLarge, len(cs), MaxConditions)
	}
	for i, c := range cs {
		for _, f := range []struct{ name, v string }{{"name", c.Name}, {"value", c.Value}, {"unit", c.Unit}} {
			if err := checkText(f.v, MaxShortText); err != nil {
				return fmt.Sprintf("conditions[%d].%s", i, f.name), err
			}
		}
	}
	if len(ss) > MaxStandards {
		return "standards", fmt.Errorf("%w: %d standards, at most %d allowed", ErrTooLarge, len(ss), MaxStandards)
	}
	for i, st := range ss {
		for _, f := range []struct{ name, v string }{{"name", st.Name}, {"certificate", st.Certificate}, {"value", st.Value}, {"uncertainty", st.Uncertainty}} {
			if err := checkText(f.v, MaxShortText); err != nil {
				return fmt.Sprintf("standards[%d].%s", i, f.name), err
			}
		}
		if err := checkTime(st.Expiry, false); err != nil {
			return fmt.Sprintf("standards[%d].expiry", i), err
		}
	}
	if len(us) > MaxUnknowns {
		return "unknowns", fmt.Errorf("%w: %d unknowns, at most %d allowed", ErrTooLarge, len(us), MaxUnknowns)
	}
	for i, u := range us {
		if err := checkText(u.Name, MaxShortText); err != nil {
			return fmt.Sprintf("unknowns[%d].name", i), err
		}
		if len(u.Readings) > MaxUnknownReadings {
			return fmt.Sprintf("unknowns[%d].readings", i), fmt.Errorf("%w: %d readings, at most %d allowed", ErrTooLarge, len(u.Readings), MaxUnknownReadings)
		}
		for j, r := range u.Readings {
			if err := checkText(r, MaxCellText); err != nil {
				return fmt.Sprintf("unknowns[%d].readings[%d]", i, j), err
			}
		}
	}
	return "", nil
}

func (sl *Seal) validate() (string, error) {
	if err := checkText(sl.PerformedBy, MaxShortText); err != nil {
		return "performed_by", err
	}
	if err := checkTime(sl.PerformedAt, false); err != nil {
		return "performed_at", err
	}
	if err := checkText(sl.ReviewedBy, MaxShortText); err != nil {
		return "reviewed_by", err
	}
	if err := checkTime(sl.ReviewedAt, false); err != nil {
		return "reviewed_at", err
	}
	if err := checkText(sl.Digest, MaxShortText); err != nil {
		return "digest", err
	}
	return "", nil
}

func (r *SealedRevision) validate() (string, error) {
	if r.Revision < 0 || r.Revision > MaxRevision {
		return "revision", invalid("the revision %d is not a whole number from 0 to %d", r.Revision, MaxRevision)
	}
	if f, err := r.Seal.validate(); err != nil {
		return "seal." + f, err
	}
	if err := checkText(r.Results, MaxLongText); err != nil {
		return "results", err
	}
	return r.Content.validate()
}

// validate checks the content of a session or of a sealed revision: its
// texts, the instrument, the location, the readings, the settings and the
// record lists; it returns the path of the first field that fails.
func (c *Content) validate() (string, error) {
	short := []struct {
		name string
		v    string
	}{
		{"title", c.Title}, {"site", c.Site}, {"instrument.description", c.Instrument.Description},
		{"instrument.serial", c.Instrument.Serial}, {"operator", c.Operator}, {"x_name", c.XName},
		{"x_unit", c.XUnit}, {"y_name", c.YName}, {"y_unit", c.YUnit},
	}
	for _, f := range short {
		if err := checkText(f.v, MaxShortText); err != nil {
			return f.name, err
		}
	}
	if err := checkText(c.Notes, MaxLongText); err != nil {
		return "notes", err
	}
	if f, err := c.Instrument.validate(); err != nil {
		return "instrument." + f, err
	}
	if c.Location != nil {
		if f, err := c.Location.validate(); err != nil {
			return "location." + f, err
		}
	}
	if len(c.Readings) > MaxReadings {
		return "readings", fmt.Errorf("%w: %d readings, at most %d allowed", ErrTooLarge, len(c.Readings), MaxReadings)
	}
	for i := range c.Readings {
		if f, err := c.Readings[i].validate(); err != nil {
			return fmt.Sprintf("readings[%d].%s", i, f), err
		}
	}
	if f, err := c.Settings.validate(); err != nil {
		return "settings." + f, err
	}
	return validateLists(c.Conditions, c.Standards, c.Unknowns)
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

// validate checks the fit settings with fitcore's one validation of
// options (Options.Normalize: known model, transform and weighting, the
// level from fitcore.MinLevel to fitcore.MaxLevel or 0 for the default, a
// Box–Cox power only with the Box–Cox transform and within
// ±fitcore.MaxBoxCoxLambda, no weights with a line through the origin, …),
// so that a stored session holds only settings the command and the screen
// accept. The field returned is the option's key, which is also its name in
// the session file. The acceptance criteria are checked here.
func (st *Settings) validate() (string, error) {
	if _, err := st.Options().Normalize(); err != nil {
		var oe *fitcore.OptionError
		if errors.As(err, &oe) {
			return oe.Option, fmt.Errorf("%w: %w", ErrInvalidField, oe)
		}
		return "", fmt.Errorf("%w: %w", ErrInvalidField, err)
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
			return "acceptance.min_r_squared", invalid("the smallest R² allowed (%v) must be between 0 and 1", *a.MinRSquared)
		}
		if a.MaxResidual != nil && *a.MaxResidual < 0 {
			return "acceptance.max_residual", invalid("the largest allowed residual %v must not be negative", *a.MaxResidual)
		}
	}
	return "", nil
}
