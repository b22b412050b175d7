// Package session holds Pairline's session record (one set of paired
// readings with its metadata, fit settings and edit history), the parser for
// numbers as technicians type them, the .pairline file codec and CSV/TSV
// import and export.
//
// The package is pure Go: no syscall/js, no UI code and no I/O beyond the
// io.Reader and io.Writer it is handed, so the browser build and the native
// `pairline` command read and write exactly the same files.
//
// A session is evidence. Cells keep the text as typed (an invalid cell is
// kept and shown, never silently dropped), excluding a reading keeps it with
// its reason, and every change made through the methods appends an [Edit] to
// the history.
package session

import (
	"crypto/rand"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"strconv"
	"time"
	"unicode/utf8"

	"pairline/fitcore"
)

// Session is one record of paired readings: for example a calibration of one
// instrument against a set of standards, or gauge height against flow at one
// site. Change it through its methods so that History stays complete; the
// fields are exported so that the codec, the UI and tests can read them.
type Session struct {
	ID       string    `json:"id"`       // 32 lowercase hex digits (128 random bits)
	Created  time.Time `json:"created"`  // UTC
	Modified time.Time `json:"modified"` // UTC; time of the last change
	// Content is the current revision's content, the part a seal covers;
	// its fields are the session's own (s.Title, s.Readings, …).
	Content
	History []Edit `json:"history"` // append-only
	// Seal is the signature of the current revision; nil = not sealed.
	Seal *Seal `json:"seal"`
	// Revision is the number of the current revision: 0 for a record never
	// sealed, 1 once it is sealed for the first time, and one more each
	// time a sealed record is changed (see Sealed).
	Revision int `json:"revision"`
	// Sealed holds the earlier sealed revisions, oldest first, frozen as
	// they were sealed, so that a record changed after its seal still shows
	// what was signed.
	Sealed []SealedRevision `json:"sealed"`
}

// Content is what one revision of a record holds and its seal's digest
// covers (with the session's id, creation time and the revision number):
// the identity of the record, the readings, the fit settings and the
// calibration record's lists. Session holds the current revision's content
// and SealedRevision an earlier one's, frozen; the codec writes and reads
// these keys once for both (encodeContent, bodyDecoder.content).
type Content struct {
	Title      string     `json:"title"`
	Site       string     `json:"site"`
	Instrument Instrument `json:"instrument"`
	Operator   string     `json:"operator"`
	XName      string     `json:"x_name"`
	XUnit      string     `json:"x_unit"`
	YName      string     `json:"y_name"`
	YUnit      string     `json:"y_unit"`
	Notes      string     `json:"notes"`
	// DecimalComma says how a cell like "1,234" (a comma followed by exactly
	// three digits, the one case ParseNumber cannot decide alone) is read:
	// nil = not decided, the cell is reported as a problem; true = decimal
	// comma (1.234); false = thousands separator (1234). See ParseNumberHint.
	DecimalComma *bool     `json:"decimal_comma"`
	Location     *Location `json:"location"`
	Readings     []Reading `json:"readings"`
	Settings     Settings  `json:"settings"`
	// Conditions are the conditions the readings were taken in (format 1.1);
	// the temperature is the one named ConditionTemperature.
	Conditions []Condition `json:"conditions"`
	// Standards are the reference standards whose certified values are the
	// known x values (format 1.1).
	Standards []Standard `json:"standards"`
	// Unknowns are samples measured against the fitted line, converted
	// from y readings to x by inverse prediction (format 1.1).
	Unknowns []Unknown `json:"unknowns"`
}

// Instrument identifies the instrument whose readings are recorded.
type Instrument struct {
	Description string `json:"description"`
	Serial      string `json:"serial"`
	// ID is the owner's identifier of the instrument, e.g. its asset tag
	// (format 1.1).
	ID string `json:"id"`
	// IntervalDays is the calibration interval in days; 0 = not set
	// (format 1.1).
	IntervalDays int `json:"interval_days"`
}

// ConditionTemperature is the Name of the Condition that holds the
// temperature the readings were taken at.
const ConditionTemperature = "temperature"

// Condition is one condition of the readings, as typed: for example
// {"temperature", "21.4", "°C"} or {"humidity", "45", "%"}.
type Condition struct {
	Name  string `json:"name"`
	Value string `json:"value"`
	Unit  string `json:"unit"`
}

// Standard is one reference standard (a certified reference material, a
// buffer lot, a reference weight). Value and Uncertainty are kept as typed;
// a reading whose x equals the parsed Value (exact numeric equality) is a
// reading of this standard (see StandardUncertainties).
type Standard struct {
	Name        string `json:"name"` // standard name or lot
	Certificate string `json:"certificate"`
	Value       string `json:"value"`       // certified value as typed, in x units
	Uncertainty string `json:"uncertainty"` // standard uncertainty as typed, in x units
	// Expiry is the last day the certificate is valid, a UTC date
	// (midnight); zero = not given.
	Expiry time.Time `json:"expiry"`
}

// Unknown is a sample measured with the instrument: its y readings as
// typed, converted to x through the fitted line.
type Unknown struct {
	Name     string   `json:"name"`
	Readings []string `json:"readings"` // y readings as typed
}

// Seal is the signature of one revision of a record. PerformedBy signs that
// the calibration was done as recorded (this seals the record); ReviewedBy,
// possibly later, signs the review. Digest is the SHA-256 of the sealed
// content (SealDigest), as 64 lowercase hex digits; it covers both
// signatures given so far.
type Seal struct {
	PerformedBy string    `json:"performed_by"`
	PerformedAt time.Time `json:"performed_at"` // UTC
	ReviewedBy  string    `json:"reviewed_by"`  // "" = not reviewed yet
	ReviewedAt  time.Time `json:"reviewed_at"`  // UTC; zero = not reviewed yet
	Digest      string    `json:"digest"`
}

// SealedRevision is an earlier sealed revision of a record, kept readable
// after the record was changed: the revision number, its seal and the
// content the seal's digest covers, frozen.
type SealedRevision struct {
	Revision int  `json:"revision"`
	Seal     Seal `json:"seal"`
	Content
	// Results is the summary of the results as they were when the record
	// was sealed (the line, its verdicts), in words; the numbers can be
	// computed again from the frozen content.
	Results string `json:"results"`
}

// Location is where the readings were taken, as reported by the device.
type Location struct {
	Lat       float64   `json:"lat"`        // degrees, WGS 84, −90 … 90
	Lon       float64   `json:"lon"`        // degrees, WGS 84, −180 … 180
	AccuracyM float64   `json:"accuracy_m"` // radius in metres; 0 = unknown
	Taken     time.Time `json:"taken"`      // UTC; zero = unknown
}

// Reading is one pair. X and Y hold the text as typed, so that a cell that
// is not a number is kept and shown; Pairs parses them.
type Reading struct {
	X             string    `json:"x"`
	Y             string    `json:"y"`
	Note          string    `json:"note"`
	Taken         time.Time `json:"taken"` // UTC; zero = not recorded
	Excluded      bool      `json:"excluded"`
	ExcludeReason string    `json:"exclude_reason"`
}

// Settings are the fit settings stored with a session. They map one to one
// onto fitcore.Options (see Options); a nil pointer means fitcore's default.
type Settings struct {
	Model         fitcore.Model        `json:"model"`
	Transform     fitcore.Transform    `json:"transform"`
	BoxCoxLambda  *float64             `json:"box_cox_lambda"`
	Weights       fitcore.WeightScheme `json:"weights"`
	Level         float64              `json:"level"` // 0 < Level < 1; 0 = 0.95
	SlopeRef      *float64             `json:"slope_ref"`
	InterceptRef  *float64             `json:"intercept_ref"`
	VarianceRatio float64              `json:"variance_ratio"`
	XUncertainty  float64              `json:"x_uncertainty"`
	YUncertainty  float64              `json:"y_uncertainty"`
	Acceptance    *fitcore.Criteria    `json:"acceptance"`
}

// Edit is one entry of a session's history. Row is the reading's index (from
// 0) or −1 when the edit is not about a row. Old and New are the values as
// text.
type Edit struct {
	At    time.Time `json:"at"`
	Field string    `json:"field"`
	Row   int       `json:"row"`
	Old   string    `json:"old"`
	New   string    `json:"new"`
}

// History fields written by Restore.
const (
	// FieldUndo and FieldRedo name the entry of an undo or a redo; its New
	// says in words what was undone or redone ("x of reading 3 typed as
	// 12.5"), its Row is −1.
	FieldUndo = "undo"
	FieldRedo = "redo"
	// FieldRows records a change in the number of readings that no other
	// entry explains: undoing an added reading or a paste takes rows away
	// (and redoing it brings them back). Old and New are the counts before
	// and after, as decimal digits; Row is −1. Entries before it name rows
	// of the count in its Old, entries after it rows of the count in its
	// New (see Validate).
	FieldRows = "rows"
)

// Kinds of history entries (Edit.Field) written by the session's own edits;
// the screen and the report match them by these names, never by literals.
const (
	// EditImport and EditPaste: readings read from a CSV file or pasted;
	// New says in words how many and from where, Row is −1.
	EditImport = "import"
	EditPaste  = "paste"
	// EditRowAdded: an empty reading added at Row (New is "added").
	EditRowAdded = "row"
	// EditExcluded: reading Row left out (New "true") or put back
	// ("false"); EditExcludeReason follows with the reason.
	EditExcluded      = "excluded"
	EditExcludeReason = "exclude_reason"
	// EditSettings: the fit settings changed (Old and New as JSON).
	EditSettings = "settings"
	// EditLocation: where the readings were taken changed.
	EditLocation = "location"
	// EditCondition, EditStandard and EditUnknown: a condition, a standard
	// or an unknown was added, changed or removed. Row is −1; New says in
	// words what happened ("standard 2 certificate set to C-2231",
	// "condition 1 added: temperature 21.4 °C", "unknown 3 removed") and
	// Old what it was before ("standard 2 certificate was C-2230", or "").
	EditCondition = "condition"
	EditStandard  = "standard"
	EditUnknown   = "unknown"
	// EditSealed: the record was sealed (signed "performed by"); New names
	// who signed, the revision and the digest in words, Row is −1.
	EditSealed = "sealed"
	// EditReviewed: the review signature was added to the seal; New names
	// who signed, the revision and the new digest in words.
	EditReviewed = "reviewed"
	// EditRevision: a sealed record was changed, so a new revision began.
	// Old and New are the revision numbers before and after, as decimal
	// digits; Row is −1. The entries after it say what changed since the
	// seal.
	EditRevision = "revision"
)

// Restore makes s hold state: its readings, metadata (the instrument's ID
// and interval included), decimal-comma choice, location, settings,
// conditions, standards and unknowns (state is an earlier or a later copy
// of the same session, as undo and redo keep them; its ID, Created,
// History, Seal, Revision and Sealed are not used: a signature is never
// undone, and restoring a sealed record starts a new revision like any
// change). s keeps its ID, Created and every history entry: the history is
// evidence and is only appended to. It gets one entry, field (FieldUndo or
// FieldRedo), whose New is what (the change undone or redone, in words),
// and, when the number of readings changes, a FieldRows entry with the
// counts before and after, so that every entry of the history names a row
// that existed when it was made.
func (s *Session) Restore(state *Session, field, what string, now time.Time) error {
	if field != FieldUndo && field != FieldRedo {
		return fmt.Errorf("%w: %q is not %q or %q", ErrNoSuchField, field, FieldUndo, FieldRedo)
	}
	if state == nil {
		return fmt.Errorf("%w: there is no state to go back to", ErrBadValue)
	}
	if len(state.Readings) > MaxReadings {
		return fmt.Errorf("%w: the state holds %d readings, at most %d are allowed", ErrBadValue, len(state.Readings), MaxReadings)
	}
	if f, err := state.Settings.validate(); err != nil {
		return fmt.Errorf("%w: settings %s %v", ErrBadValue, f, err)
	}
	if f, err := validateLists(state.Conditions, state.Standards, state.Unknowns); err != nil {
		return fmt.Errorf("%w: %s %v", ErrBadValue, f, err)
	}
	if f, err := state.Instrument.validate(); err != nil {
		return fmt.Errorf("%w: instrument.%s %v", ErrBadValue, f, err)
	}
	if len(what) > MaxLongText {
		n := MaxLongText
		for n > 0 && !utf8.RuneStart(what[n]) {
			n--
		}
		what = what[:n]
	}
	s.beforeChange(now)
	before := len(s.Readings)
	s.Title, s.Site, s.Instrument, s.Operator = state.Title, state.Site, state.Instrument, state.Operator
	s.XName, s.XUnit, s.YName, s.YUnit, s.Notes = state.XName, state.XUnit, state.YName, state.YUnit, state.Notes
	s.DecimalComma = nil
	if state.DecimalComma != nil {
		d := *state.DecimalComma
		s.DecimalComma = &d
	}
	s.Location = nil
	if state.Location != nil {
		l := *state.Location
		s.Location = &l
	}
	s.Readings = append(s.Readings[:0:0], state.Readings...)
	s.Settings = state.Settings.clone()
	s.Conditions = cloneConditions(state.Conditions)
	s.Standards = cloneStandards(state.Standards)
	s.Unknowns = cloneUnknowns(state.Unknowns)
	s.record(now, field, -1, "", what)
	if after := len(s.Readings); after != before {
		s.record(now, FieldRows, -1, strconv.Itoa(before), strconv.Itoa(after))
	}
	return nil
}

// Column names a cell of a reading.
type Column int

// The columns of a reading.
const (
	ColumnX Column = iota
	ColumnY
	ColumnNote
)

// String returns "x", "y" or "note", the names used in the history.
func (c Column) String() string {
	switch c {
	case ColumnX:
		return "x"
	case ColumnY:
		return "y"
	case ColumnNote:
		return "note"
	}
	return "column(" + strconv.Itoa(int(c)) + ")"
}

// CellProblem is a cell that could not be used as a number.
type CellProblem struct {
	Row    int    `json:"row"` // reading index from 0 (for CSV results: see ParsedPairs)
	Column Column `json:"column"`
	Text   string `json:"text"`
	Reason string `json:"reason"` // e.g. "is not a number"; follows the quoted text
}

// String is the sentence shown to the technician, with rows counted from 1.
func (p CellProblem) String() string {
	return fmt.Sprintf("row %d, %s: %q %s", p.Row+1, p.Column, p.Text, p.Reason)
}

// Errors returned by the editing methods.
var (
	ErrNoSuchRow   = errors.New("there is no such row")
	ErrNoSuchField = errors.New("there is no such field")
	ErrBadValue    = errors.New("the value is not allowed")
)

// Names accepted by SetField.
const (
	FieldTitle        = "title"
	FieldSite         = "site"
	FieldInstrument   = "instrument"
	FieldSerial       = "serial"
	FieldOperator     = "operator"
	FieldXName        = "x_name"
	FieldXUnit        = "x_unit"
	FieldYName        = "y_name"
	FieldYUnit        = "y_unit"
	FieldNotes        = "notes"
	FieldDecimalComma = "decimal_comma" // "true", "false" or "" (undecided)
	// FieldInstrumentID is the instrument's identifier (Instrument.ID).
	FieldInstrumentID = "instrument_id"
	// FieldIntervalDays is the calibration interval (Instrument.IntervalDays),
	// given as decimal digits ("" or "0" = not set).
	FieldIntervalDays = "interval_days"
)

// DefaultSettings are the settings of a new session: an unweighted ordinary
// least-squares line at the 95 % level, slope tested against 1 and intercept
// against 0 (fitcore's defaults, written out).
func DefaultSettings() Settings {
	return Settings{Model: fitcore.ModelOLS, Transform: fitcore.TransformNone, Level: fitcore.DefaultLevel}
}

// NewID returns a new session ID: 128 bits from random (crypto/rand.Reader
// when random is nil) as 32 lowercase hex digits.
func NewID(random io.Reader) (string, error) {
	if random == nil {
		random = rand.Reader
	}
	var b [16]byte
	if _, err := io.ReadFull(random, b[:]); err != nil {
		return "", fmt.Errorf("could not make a session ID: the random source failed: %w", err)
	}
	return hex.EncodeToString(b[:]), nil
}

// New returns an empty session with a fresh ID, the given title, Created and
// Modified set to now (in UTC) and DefaultSettings. random may be nil
// (crypto/rand). Creating a session is not an edit, so History starts empty.
func New(title string, now time.Time, random io.Reader) (*Session, error) {
	id, err := NewID(random)
	if err != nil {
		return nil, err
	}
	now = now.UTC()
	return &Session{ID: id, Created: now, Modified: now, Content: Content{Title: title, Settings: DefaultSettings()}}, nil
}

// latest is the latest of its times.
func latest(t time.Time, more ...time.Time) time.Time {
	for _, u := range more {
		if u.After(t) {
			t = u
		}
	}
	return t
}

// TypingWindow is how close together successive changes of one cell must be
// to count as one edit: typing "12.5" key by key is one change from "" to
// "12.5", not four. A pause longer than this starts a new history entry.
const TypingWindow = 20 * time.Second

func (s *Session) record(now time.Time, field string, row int, old, new string) {
	now = now.UTC()
	// The stamp of the last change never goes back: a device clock put back
	// (more than ModifiedSkew before the start would make the record
	// invalid) shows only in the history entry's own time.
	s.Modified = latest(now, s.Modified, s.Created)
	if n := len(s.History); n > 0 && isCellField(field) {
		last := &s.History[n-1]
		if last.Field == field && last.Row == row && last.New == old && now.Sub(last.At) >= 0 && now.Sub(last.At) < TypingWindow {
			last.New, last.At = new, now
			if last.New == last.Old {
				// Typed back to what it was: nothing changed after all.
				s.History = s.History[:n-1]
			}
			return
		}
	}
	s.History = append(s.History, Edit{At: now, Field: field, Row: row, Old: old, New: new})
}

func isCellField(field string) bool {
	return field == ColumnX.String() || field == ColumnY.String() || field == ColumnNote.String()
}

// AddRow appends a reading with the given cell texts and returns its index.
// The history gets a "row" edit and one edit per non-empty cell.
func (s *Session) AddRow(x, y string, now time.Time) int {
	s.beforeChange(now)
	i := len(s.Readings)
	s.Readings = append(s.Readings, Reading{Taken: now.UTC()})
	s.record(now, EditRowAdded, i, "", "added")
	if x != "" {
		s.Readings[i].X = x
		s.record(now, ColumnX.String(), i, "", x)
	}
	if y != "" {
		s.Readings[i].Y = y
		s.record(now, ColumnY.String(), i, "", y)
	}
	return i
}

// SetCell sets the text of one cell. Setting the text it already has changes
// nothing and records nothing.
func (s *Session) SetCell(row int, col Column, text string, now time.Time) error {
	if row < 0 || row >= len(s.Readings) {
		return fmt.Errorf("%w: row %d (the session has %d rows)", ErrNoSuchRow, row+1, len(s.Readings))
	}
	r := &s.Readings[row]
	var p *string
	switch col {
	case ColumnX:
		p = &r.X
	case ColumnY:
		p = &r.Y
	case ColumnNote:
		p = &r.Note
	default:
		return fmt.Errorf("%w: %s", ErrNoSuchField, col)
	}
	if *p == text {
		return nil
	}
	s.beforeChange(now)
	old := *p
	*p = text
	s.record(now, col.String(), row, old, text)
	return nil
}

// Exclude leaves a reading out of the fit. The reading and its cells stay;
// the reason is kept and shown. A reason is required: a calibration record
// has to say why a point was left out. Excluding an excluded reading with a
// new reason replaces the reason (and records it).
func (s *Session) Exclude(row int, reason string, now time.Time) error {
	if row < 0 || row >= len(s.Readings) {
		return fmt.Errorf("%w: row %d (the session has %d rows)", ErrNoSuchRow, row+1, len(s.Readings))
	}
	if reason == "" {
		return fmt.Errorf("%w: give a reason for leaving out row %d", ErrBadValue, row+1)
	}
	r := &s.Readings[row]
	if !r.Excluded || r.ExcludeReason != reason {
		s.beforeChange(now)
	}
	if !r.Excluded {
		r.Excluded = true
		s.record(now, EditExcluded, row, "false", "true")
	}
	if r.ExcludeReason != reason {
		old := r.ExcludeReason
		r.ExcludeReason = reason
		s.record(now, EditExcludeReason, row, old, reason)
	}
	return nil
}

// Include puts an excluded reading back into the fit and clears its reason
// (the old reason stays in the history).
func (s *Session) Include(row int, now time.Time) error {
	if row < 0 || row >= len(s.Readings) {
		return fmt.Errorf("%w: row %d (the session has %d rows)", ErrNoSuchRow, row+1, len(s.Readings))
	}
	r := &s.Readings[row]
	if !r.Excluded {
		return nil
	}
	s.beforeChange(now)
	r.Excluded = false
	s.record(now, EditExcluded, row, "true", "false")
	if r.ExcludeReason != "" {
		old := r.ExcludeReason
		r.ExcludeReason = ""
		s.record(now, EditExcludeReason, row, old, "")
	}
	return nil
}

// SetField sets one metadata field by name (the Field… constants). Setting
// the value it already has records nothing.
func (s *Session) SetField(name, value string, now time.Time) error {
	if name == FieldIntervalDays {
		n := 0
		if value != "" {
			v, err := strconv.Atoi(value)
			if err != nil || v < 0 || v > MaxIntervalDays {
				return fmt.Errorf("%w: the calibration interval must be a whole number of days from 0 to %d, not %q", ErrBadValue, MaxIntervalDays, value)
			}
			n = v
		}
		if n == s.Instrument.IntervalDays {
			return nil
		}
		s.beforeChange(now)
		old := strconv.Itoa(s.Instrument.IntervalDays)
		s.Instrument.IntervalDays = n
		s.record(now, name, -1, old, strconv.Itoa(n))
		return nil
	}
	if name == FieldDecimalComma {
		var nv *bool
		switch value {
		case "":
		case "true", "false":
			b := value == "true"
			nv = &b
		default:
			return fmt.Errorf("%w: decimal_comma must be \"true\", \"false\" or empty, not %q", ErrBadValue, value)
		}
		old := boolPtrText(s.DecimalComma)
		if old == value {
			return nil
		}
		s.beforeChange(now)
		s.DecimalComma = nv
		s.record(now, name, -1, old, value)
		return nil
	}
	var p *string
	switch name {
	case FieldTitle:
		p = &s.Title
	case FieldSite:
		p = &s.Site
	case FieldInstrument:
		p = &s.Instrument.Description
	case FieldSerial:
		p = &s.Instrument.Serial
	case FieldInstrumentID:
		p = &s.Instrument.ID
	case FieldOperator:
		p = &s.Operator
	case FieldXName:
		p = &s.XName
	case FieldXUnit:
		p = &s.XUnit
	case FieldYName:
		p = &s.YName
	case FieldYUnit:
		p = &s.YUnit
	case FieldNotes:
		p = &s.Notes
	default:
		return fmt.Errorf("%w: %q", ErrNoSuchField, name)
	}
	if *p == value {
		return nil
	}
	s.beforeChange(now)
	old := *p
	*p = value
	s.record(now, name, -1, old, value)
	return nil
}

func boolPtrText(b *bool) string {
	if b == nil {
		return ""
	}
	return strconv.FormatBool(*b)
}

// SetLocation sets (or, with nil, clears) where the readings were taken.
func (s *Session) SetLocation(loc *Location, now time.Time) error {
	if loc != nil {
		if f, err := loc.validate(); err != nil {
			return fmt.Errorf("%w: location %s %v", ErrBadValue, f, err)
		}
		c := *loc
		c.Taken = c.Taken.UTC()
		loc = &c
	}
	old, new := loc0Text(s.Location), loc0Text(loc)
	if old == new {
		return nil
	}
	s.beforeChange(now)
	s.Location = loc
	s.record(now, EditLocation, -1, old, new)
	return nil
}

func loc0Text(l *Location) string {
	if l == nil {
		return ""
	}
	b, _ := json.Marshal(l)
	return string(b)
}

// SetSettings replaces the fit settings. The history records old and new
// settings as JSON. Settings with values fitcore would refuse (a level
// outside (0, 1), a negative uncertainty, a model it does not know, …) are
// refused here.
func (s *Session) SetSettings(st Settings, now time.Time) error {
	if f, err := st.validate(); err != nil {
		return fmt.Errorf("%w: settings %s %v", ErrBadValue, f, err)
	}
	st = st.clone()
	old, new := settingsText(s.Settings), settingsText(st)
	if old == new {
		return nil
	}
	s.beforeChange(now)
	s.Settings = st
	s.record(now, EditSettings, -1, old, new)
	return nil
}

func settingsText(st Settings) string {
	b, _ := json.Marshal(st)
	return string(b)
}

func copyFloat(p *float64) *float64 {
	if p == nil {
		return nil
	}
	v := *p
	return &v
}

func (st Settings) clone() Settings {
	c := st
	c.BoxCoxLambda = copyFloat(st.BoxCoxLambda)
	c.SlopeRef = copyFloat(st.SlopeRef)
	c.InterceptRef = copyFloat(st.InterceptRef)
	if st.Acceptance != nil {
		a := *st.Acceptance
		a.MinRSquared = copyFloat(a.MinRSquared)
		a.SlopeLow = copyFloat(a.SlopeLow)
		a.SlopeHigh = copyFloat(a.SlopeHigh)
		a.InterceptLow = copyFloat(a.InterceptLow)
		a.InterceptHigh = copyFloat(a.InterceptHigh)
		a.MaxResidual = copyFloat(a.MaxResidual)
		c.Acceptance = &a
	}
	return c
}

// Options converts the settings to the options of fitcore.Analyze. Pointer
// fields are copied, so changing the options later does not change the
// session. The session holds no per-reading weights, so WeightsGiven is
// passed on without GivenWeights (fitcore then reports the missing weights).
func (st Settings) Options() fitcore.Options {
	c := st.clone()
	return fitcore.Options{
		Model:         c.Model,
		Transform:     c.Transform,
		BoxCoxLambda:  c.BoxCoxLambda,
		Weights:       c.Weights,
		Level:         c.Level,
		SlopeRef:      c.SlopeRef,
		InterceptRef:  c.InterceptRef,
		VarianceRatio: c.VarianceRatio,
		XUncertainty:  c.XUncertainty,
		YUncertainty:  c.YUncertainty,
		Acceptance:    c.Acceptance,
	}
}

// Pairs parses the cells with ParseNumberHint (using DecimalComma when set,
// ParseNumber otherwise) and returns the usable pairs: readings that are not
// excluded and whose x and y cells are both numbers, with their row indexes.
// Every cell of a non-excluded reading that is not a number gives a
// CellProblem. A reading with both cells empty is an unfinished row, not a
// problem, and is skipped silently; one empty cell beside a filled one is a
// problem ("is empty"). Excluded readings are neither used nor checked.
func (s *Session) Pairs() (x, y []float64, rows []int, problems []CellProblem) {
	var pc PairCache
	return pc.Pairs(s)
}

func reasonOf(err error) string {
	var ne *NumberError
	if errors.As(err, &ne) {
		return ne.Reason
	}
	return err.Error()
}

// Counts summarises the readings of a session.
type Counts struct {
	Rows     int `json:"rows"`     // all readings
	Excluded int `json:"excluded"` // left out with a reason
	Blank    int `json:"blank"`    // not excluded, both cells empty
	Usable   int `json:"usable"`   // not excluded, both cells numbers
	Problems int `json:"problems"` // cells that are not numbers
}

// Count returns the reading counts shown beside a session.
func (s *Session) Count() Counts {
	_, _, rows, problems := s.Pairs()
	return s.counts(rows, problems)
}

// Count is s.Count() with the cells read through the cache (only those
// that changed are parsed again).
func (pc *PairCache) Count(s *Session) Counts {
	_, _, rows, problems := pc.Pairs(s)
	return s.counts(rows, problems)
}

// counts is Count from the pairing's rows and problems.
func (s *Session) counts(rows []int, problems []CellProblem) Counts {
	c := Counts{Rows: len(s.Readings), Usable: len(rows), Problems: len(problems)}
	for _, r := range s.Readings {
		switch {
		case r.Excluded:
			c.Excluded++
		case isBlank(r.X) && isBlank(r.Y):
			c.Blank++
		}
	}
	return c
}

// PairCache remembers how each cell of a session was read, so that pairing
// the readings again after an edit parses only the cells that changed: at
// 10,000 readings, parsing every cell on each keystroke costs the browser
// tens of milliseconds. The zero value is ready to use; one cache serves
// one session at a time (a cell is re-read whenever its text, its row or
// the decimal-comma choice differs from what the cache holds).
type PairCache struct {
	mode  int8 // decimal-comma choice the cells were read with: 0 undecided, 1 comma, 2 point
	cells []pairCell
}

type pairCell struct {
	x, y           string
	xv, yv         float64
	xbad, ybad     bool   // the cell is not a number,
	xwhy, ywhy     string // for this reason
	blank, checked bool
}

// Pairs returns what s.Pairs returns (s.Pairs is this with an empty cache),
// reading only the cells whose text changed since the last call with this
// cache.
func (pc *PairCache) Pairs(s *Session) (x, y []float64, rows []int, problems []CellProblem) {
	mode := int8(0)
	parse := ParseNumber
	if s.DecimalComma != nil {
		dc := *s.DecimalComma
		mode = 2
		if dc {
			mode = 1
		}
		parse = func(t string) (float64, error) { return ParseNumberHint(t, dc) }
	}
	if mode != pc.mode {
		pc.mode, pc.cells = mode, nil
	}
	if len(pc.cells) > len(s.Readings) {
		pc.cells = pc.cells[:len(s.Readings)]
	}
	for len(pc.cells) < len(s.Readings) {
		pc.cells = append(pc.cells, pairCell{})
	}
	x = make([]float64, 0, len(s.Readings))
	y = make([]float64, 0, len(s.Readings))
	rows = make([]int, 0, len(s.Readings))
	for i := range s.Readings {
		r := &s.Readings[i]
		c := &pc.cells[i]
		if !c.checked || c.x != r.X || c.y != r.Y {
			*c = pairCell{x: r.X, y: r.Y, checked: true, blank: isBlank(r.X) && isBlank(r.Y)}
			if !c.blank {
				var err error
				if c.xv, err = parse(r.X); err != nil {
					c.xbad, c.xwhy = true, reasonOf(err)
				}
				if c.yv, err = parse(r.Y); err != nil {
					c.ybad, c.ywhy = true, reasonOf(err)
				}
			}
		}
		if r.Excluded || c.blank {
			continue
		}
		if c.xbad {
			problems = append(problems, CellProblem{Row: i, Column: ColumnX, Text: r.X, Reason: c.xwhy})
		}
		if c.ybad {
			problems = append(problems, CellProblem{Row: i, Column: ColumnY, Text: r.Y, Reason: c.ywhy})
		}
		if !c.xbad && !c.ybad {
			x, y, rows = append(x, c.xv), append(y, c.yv), append(rows, i)
		}
	}
	return x, y, rows, problems
}
