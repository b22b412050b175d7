package session

import (
	"bytes"
	"crypto/sha256"
	"crypto/subtle"
	"encoding/binary"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"math"
	"slices"
	"strconv"
	"time"
	"unicode/utf8"

	"github.com/vmihailenco/msgpack/v5/msgpcode"

	"pairline/fitcore"
)

// The session file. app/session/FORMAT.md is the full specification; in short:
//
//	offset  size  content
//	0       8     Magic
//	8       2     major format version, big-endian
//	10      2     minor format version, big-endian
//	12      8     body length n, big-endian
//	20      n     body: a MessagePack map holding the sessions
//	20+n    32    SHA-256 of bytes 0 … 20+n−1 (header and body)
const (
	// FileExtension is the file name extension of session files.
	FileExtension = ".pairline"
	// MediaType is the media type of session files.
	MediaType = "application/vnd.pairline.session"
	// FormatMajor and FormatMinor are the version this package writes. A
	// new minor version only adds map keys that older readers may skip; a
	// new major version changes what existing keys mean.
	FormatMajor = 1
	FormatMinor = 1

	headerSize   = 20
	checksumSize = sha256.Size
	maxBodySize  = MaxFileSize - headerSize - checksumSize
	// minSessionSize and minEditSize are the fewest bytes a valid session
	// (a map with an id of 32 characters and the created and modified
	// times) and a valid history entry (a map with "at" and a "field" of at
	// least one character) take: a list that claims more entries than the
	// bytes left could hold so is refused before anything is allocated.
	minSessionSize = 1 + (1 + 2) + (2 + 32) + (1 + 7 + 6) + (1 + 8 + 6)
	minEditSize    = 1 + (1 + 2 + 6) + (1 + 5 + 2)
)

// Magic opens every session file: "PAIRLN", a NUL byte (so text tools treat
// the file as binary) and 0xA7 (so a transfer that strips the 8th bit is
// caught at once).
var Magic = [8]byte{'P', 'A', 'I', 'R', 'L', 'N', 0x00, 0xA7}

// The kinds of damage Decode reports. Every error Decode returns is a
// *FormatError wrapping one of them; test with errors.Is.
var (
	ErrNotSessionFile = errors.New("this is not a Pairline session file")
	ErrNewerVersion   = errors.New("the file was written by a newer version of Pairline; update Pairline to open it")
	ErrChecksum       = errors.New("the file is damaged: its contents do not match the checksum stored in it")
	ErrTruncated      = errors.New("the file is incomplete: it ends too early (was the copy or download cut short?)")
	ErrTooLarge       = errors.New("the file is larger than Pairline accepts")
	ErrInvalidField   = errors.New("the file holds a value Pairline cannot accept")
)

// FormatError is a problem with a session file: where (byte offset from the
// start of the file, and the field's path such as "sessions[0].readings[3].x"
// when known) and what (Err wraps one of the Err… sentinels).
type FormatError struct {
	Offset int64
	Field  string
	Err    error
}

func (e *FormatError) Error() string {
	if e.Field != "" {
		return fmt.Sprintf("%v (at byte %d, in %s)", e.Err, e.Offset, e.Field)
	}
	return fmt.Sprintf("%v (at byte %d)", e.Err, e.Offset)
}

func (e *FormatError) Unwrap() error { return e.Err }

// File is a decoded session file.
type File struct {
	Major    int        `json:"major"`
	Minor    int        `json:"minor"`
	Sessions []*Session `json:"sessions"`
	// Warnings are things the reader should know, such as a newer minor
	// version whose extra details were skipped.
	Warnings []string `json:"warnings"`
	// Checksum is the SHA-256 stored in the file (lowercase hex); Decode
	// returns a File only when the contents match it.
	Checksum string `json:"checksum"`
}

// Encode writes sessions as one session file (format FormatMajor.FormatMinor).
// It refuses to write what Decode would refuse: no sessions, more than
// MaxSessions, more than MaxFileReadings readings or MaxFileHistory history
// entries in all, a session that fails Validate, or a file larger than
// MaxFileSize. The error then wraps ErrInvalidField or ErrTooLarge.
func Encode(w io.Writer, sessions []*Session) error {
	b, err := EncodeBytes(sessions)
	if err != nil {
		return err
	}
	_, err = w.Write(b)
	return err
}

// EncodeBytes is Encode into a new byte slice (no copy of the file).
func EncodeBytes(sessions []*Session) ([]byte, error) { return EncodeAppend(nil, sessions) }

// EncodeAppend is EncodeBytes reusing the memory of buf (its contents are
// replaced): a screen that saves the open session after every edit keeps
// one buffer instead of making and clearing a new one each time.
func EncodeAppend(buf []byte, sessions []*Session) ([]byte, error) {
	if len(sessions) == 0 {
		return nil, invalid("a session file holds at least one session")
	}
	if len(sessions) > MaxSessions {
		return nil, fmt.Errorf("%w: %d sessions, at most %d in one file", ErrTooLarge, len(sessions), MaxSessions)
	}
	seen := make(map[string]bool, len(sessions))
	readings, history, items, sealed := 0, 0, 0, 0
	for i, s := range sessions {
		if s == nil {
			return nil, fmt.Errorf("sessions[%d]: %w", i, invalid("the session is missing"))
		}
		readings, history = readings+s.fileReadings(), history+len(s.History)
		items, sealed = items+s.fileItems(), sealed+len(s.Sealed)
		if items > MaxFileItems {
			return nil, fmt.Errorf("%w: the sessions hold %d conditions, standards, unknowns and readings of unknowns or more, at most %d fit in one file (export fewer sessions at a time)", ErrTooLarge, items, MaxFileItems)
		}
		if sealed > MaxFileSealedRevisions {
			return nil, fmt.Errorf("%w: the sessions hold %d earlier sealed revisions or more, at most %d fit in one file (export fewer sessions at a time)", ErrTooLarge, sealed, MaxFileSealedRevisions)
		}
		if readings > MaxFileReadings {
			return nil, fmt.Errorf("%w: the sessions hold %d readings or more, at most %d fit in one file (export fewer sessions at a time)", ErrTooLarge, readings, MaxFileReadings)
		}
		if history > MaxFileHistory {
			return nil, fmt.Errorf("%w: the sessions hold %d history entries or more, at most %d fit in one file (export fewer sessions at a time)", ErrTooLarge, history, MaxFileHistory)
		}
		if f, err := s.validate(); err != nil {
			return nil, fmt.Errorf("sessions[%d].%s: %w", i, f, err)
		}
		if seen[s.ID] {
			return nil, fmt.Errorf("sessions[%d].id: %w", i, invalid("two sessions share the ID %s", s.ID))
		}
		seen[s.ID] = true
	}
	// Room for the whole file at once: growing the buffer by doubling
	// copied and cleared it several times (measured: a third of a save of
	// 10,000 readings in the browser).
	out := bytes.NewBuffer(buf[:0])
	out.Grow(encodedSizeHint(sessions))
	var header [headerSize]byte
	out.Write(header[:])
	e := newMPWriter(out)
	if err := encodeBundle(e, sessions); err != nil {
		return nil, err
	}
	n := out.Len() - headerSize
	if n > maxBodySize {
		return nil, fmt.Errorf("%w: the sessions need %d bytes, at most %d fit in one file", ErrTooLarge, n+headerSize+checksumSize, MaxFileSize)
	}
	b := out.Bytes()
	copy(b, Magic[:])
	binary.BigEndian.PutUint16(b[8:], FormatMajor)
	binary.BigEndian.PutUint16(b[10:], FormatMinor)
	binary.BigEndian.PutUint64(b[12:], uint64(n))
	sum := sha256.Sum256(b)
	out.Write(sum[:])
	return out.Bytes(), nil
}

// Writes into a bytes.Buffer cannot fail; the writer's errors are still
// collected, once at the end of each helper.
type enc struct {
	*mpWriter
	err error
}

func (e *enc) str(key, v string) {
	e.key(key)
	e.keep(e.EncodeString(v))
}
func (e *enc) key(k string) { e.keep(e.EncodeString(k)) }
func (e *enc) keep(err error) {
	if e.err == nil {
		e.err = err
	}
}
func (e *enc) f64(key string, v float64) {
	e.key(key)
	e.keep(e.EncodeFloat64(v))
}
func (e *enc) optF64(key string, p *float64) {
	e.key(key)
	if p == nil {
		e.keep(e.EncodeNil())
		return
	}
	e.keep(e.EncodeFloat64(*p))
}
func (e *enc) boolean(key string, v bool) {
	e.key(key)
	e.keep(e.EncodeBool(v))
}
func (e *enc) tm(key string, t time.Time) {
	e.key(key)
	if t.IsZero() {
		e.keep(e.EncodeNil())
		return
	}
	e.keep(e.EncodeTime(t.UTC()))
}
func (e *enc) mapLen(n int) { e.keep(e.EncodeMapLen(n)) }

// encodedSizeHint is a generous guess of the encoded size of sessions: the
// fixed fields, and each reading and history entry with its texts and the
// msgpack keys around them.
func encodedSizeHint(sessions []*Session) int {
	n := headerSize + checksumSize + 64
	for _, s := range sessions {
		n += 1024 + len(s.Title) + len(s.Notes) + len(s.Site)
		n += readingsSizeHint(s.Readings)
		for i := range s.Sealed {
			n += 2048 + readingsSizeHint(s.Sealed[i].Readings) + len(s.Sealed[i].Results)
		}
		n += 64 * s.fileItems()
		for i := range s.History {
			h := &s.History[i]
			n += 64 + len(h.Field) + len(h.Old) + len(h.New)
		}
	}
	return n
}

func readingsSizeHint(rs []Reading) int {
	n := 0
	for i := range rs {
		r := &rs[i]
		n += 96 + len(r.X) + len(r.Y) + len(r.Note) + len(r.ExcludeReason)
	}
	return n
}

// fileReadings is the number of readings s holds, its earlier sealed
// revisions' frozen readings included (MaxFileReadings counts them all).
func (s *Session) fileReadings() int {
	n := len(s.Readings)
	for i := range s.Sealed {
		n += len(s.Sealed[i].Readings)
	}
	return n
}

// fileItems is the number of conditions, standards, unknowns and readings
// of unknowns s holds, its earlier sealed revisions included (for
// MaxFileItems).
func (s *Session) fileItems() int {
	n := listItems(s.Conditions, s.Standards, s.Unknowns)
	for i := range s.Sealed {
		r := &s.Sealed[i]
		n += listItems(r.Conditions, r.Standards, r.Unknowns)
	}
	return n
}

func listItems(c []Condition, st []Standard, u []Unknown) int {
	n := len(c) + len(st) + len(u)
	for i := range u {
		n += len(u[i].Readings)
	}
	return n
}

func encodeBundle(me *mpWriter, sessions []*Session) error {
	e := &enc{mpWriter: me}
	e.mapLen(2)
	e.str("written_by", "pairline")
	e.key("sessions")
	e.keep(e.EncodeArrayLen(len(sessions)))
	for _, s := range sessions {
		encodeSession(e, s)
	}
	return e.err
}

// contentKeys is the number of keys encodeContent writes.
const contentKeys = 16

func encodeSession(e *enc, s *Session) {
	e.mapLen(7 + contentKeys)
	e.str("id", s.ID)
	e.tm("created", s.Created)
	e.tm("modified", s.Modified)
	encodeContent(e, &s.Content)
	e.key("history")
	e.keep(e.EncodeArrayLen(len(s.History)))
	for i := range s.History {
		h := &s.History[i]
		e.mapLen(5)
		e.tm("at", h.At)
		e.str("field", h.Field)
		e.key("row")
		e.keep(e.EncodeInt(int64(h.Row)))
		e.str("old", h.Old)
		e.str("new", h.New)
	}
	e.key("seal")
	if s.Seal == nil {
		e.keep(e.EncodeNil())
	} else {
		encodeSeal(e, s.Seal)
	}
	e.key("revision")
	e.keep(e.EncodeInt(int64(s.Revision)))
	e.key("sealed")
	e.keep(e.EncodeArrayLen(len(s.Sealed)))
	for i := range s.Sealed {
		encodeSealedRevision(e, &s.Sealed[i])
	}
}

// encodeContent writes the contentKeys keys of a revision's content into
// the map of a session or of a sealed revision (the caller counts them in
// its mapLen).
func encodeContent(e *enc, c *Content) {
	e.str("title", c.Title)
	e.str("site", c.Site)
	e.key("instrument")
	encodeInstrument(e, &c.Instrument)
	e.str("operator", c.Operator)
	e.str("x_name", c.XName)
	e.str("x_unit", c.XUnit)
	e.str("y_name", c.YName)
	e.str("y_unit", c.YUnit)
	e.str("notes", c.Notes)
	e.key("decimal_comma")
	encodeOptBool(e, c.DecimalComma)
	e.key("location")
	encodeLocation(e, c.Location)
	e.key("readings")
	encodeReadings(e, c.Readings)
	e.key("settings")
	encodeSettings(e, &c.Settings)
	e.key("conditions")
	encodeConditions(e, c.Conditions)
	e.key("standards")
	encodeStandards(e, c.Standards)
	e.key("unknowns")
	encodeUnknowns(e, c.Unknowns)
}

func encodeInstrument(e *enc, in *Instrument) {
	e.mapLen(4)
	e.str("description", in.Description)
	e.str("serial", in.Serial)
	e.str("id", in.ID)
	e.key("interval_days")
	e.keep(e.EncodeInt(int64(in.IntervalDays)))
}

func encodeOptBool(e *enc, b *bool) {
	if b == nil {
		e.keep(e.EncodeNil())
	} else {
		e.keep(e.EncodeBool(*b))
	}
}

func encodeLocation(e *enc, l *Location) {
	if l == nil {
		e.keep(e.EncodeNil())
		return
	}
	e.mapLen(4)
	e.f64("lat", l.Lat)
	e.f64("lon", l.Lon)
	e.f64("accuracy_m", l.AccuracyM)
	e.tm("taken", l.Taken)
}

func encodeReadings(e *enc, rs []Reading) {
	e.keep(e.EncodeArrayLen(len(rs)))
	for i := range rs {
		r := &rs[i]
		e.mapLen(6)
		e.str("x", r.X)
		e.str("y", r.Y)
		e.str("note", r.Note)
		e.tm("taken", r.Taken)
		e.boolean("excluded", r.Excluded)
		e.str("exclude_reason", r.ExcludeReason)
	}
}

func encodeSettings(e *enc, st *Settings) {
	e.mapLen(11)
	e.str("model", string(st.Model))
	e.str("transform", string(st.Transform))
	e.optF64("box_cox_lambda", st.BoxCoxLambda)
	e.str("weights", string(st.Weights))
	e.f64("level", st.Level)
	e.optF64("slope_ref", st.SlopeRef)
	e.optF64("intercept_ref", st.InterceptRef)
	e.f64("variance_ratio", st.VarianceRatio)
	e.f64("x_uncertainty", st.XUncertainty)
	e.f64("y_uncertainty", st.YUncertainty)
	e.key("acceptance")
	if a := st.Acceptance; a == nil {
		e.keep(e.EncodeNil())
	} else {
		e.mapLen(7)
		e.optF64("min_r_squared", a.MinRSquared)
		e.optF64("slope_low", a.SlopeLow)
		e.optF64("slope_high", a.SlopeHigh)
		e.optF64("intercept_low", a.InterceptLow)
		e.optF64("intercept_high", a.InterceptHigh)
		e.optF64("max_residual", a.MaxResidual)
		e.boolean("max_residual_percent_of_span", a.MaxResidualPercentOfSpan)
	}
}

func encodeConditions(e *enc, cs []Condition) {
	e.keep(e.EncodeArrayLen(len(cs)))
	for i := range cs {
		e.mapLen(3)
		e.str("name", cs[i].Name)
		e.str("value", cs[i].Value)
		e.str("unit", cs[i].Unit)
	}
}

func encodeStandards(e *enc, ss []Standard) {
	e.keep(e.EncodeArrayLen(len(ss)))
	for i := range ss {
		st := &ss[i]
		e.mapLen(5)
		e.str("name", st.Name)
		e.str("certificate", st.Certificate)
		e.str("value", st.Value)
		e.str("uncertainty", st.Uncertainty)
		e.tm("expiry", st.Expiry)
	}
}

func encodeUnknowns(e *enc, us []Unknown) {
	e.keep(e.EncodeArrayLen(len(us)))
	for i := range us {
		u := &us[i]
		e.mapLen(2)
		e.str("name", u.Name)
		e.key("readings")
		e.keep(e.EncodeArrayLen(len(u.Readings)))
		for _, r := range u.Readings {
			e.keep(e.EncodeString(r))
		}
	}
}

func encodeSeal(e *enc, sl *Seal) {
	e.mapLen(5)
	e.str("performed_by", sl.PerformedBy)
	e.tm("performed_at", sl.PerformedAt)
	e.str("reviewed_by", sl.ReviewedBy)
	e.tm("reviewed_at", sl.ReviewedAt)
	e.str("digest", sl.Digest)
}

func encodeSealedRevision(e *enc, r *SealedRevision) {
	e.mapLen(3 + contentKeys)
	e.key("revision")
	e.keep(e.EncodeInt(int64(r.Revision)))
	e.key("seal")
	encodeSeal(e, &r.Seal)
	encodeContent(e, &r.Content)
	e.str("results", r.Results)
}

// Decode reads one session file. It reads at most MaxFileSize bytes and
// never allocates more than the bytes it has actually read could hold,
// whatever the length fields claim. It checks, in order: the magic bytes, the
// major version (newer: ErrNewerVersion; this package has no older major
// version to migrate from), the body length, that the file is complete and
// has nothing after the checksum, the SHA-256 checksum, and then every field
// (finite numbers, bounded and valid UTF-8 text, times in MinTime … MaxTime,
// counts within the Max… limits). A newer minor version is read, its unknown
// keys skipped, and a warning added. Errors are *FormatError.
//
// The stages: the header (decodeHeader), the body and checksum
// (decodeRest), the checksum compared, then the sessions (decodeSessions).
func Decode(r io.Reader) (*File, error) {
	var hdr [headerSize]byte
	major, minor, length, err := decodeHeader(r, &hdr)
	if err != nil {
		return nil, err
	}
	body, stored, err := decodeRest(r, length)
	if err != nil {
		return nil, err
	}
	h := sha256.New()
	h.Write(hdr[:])
	h.Write(body)
	if subtle.ConstantTimeCompare(h.Sum(nil), stored) != 1 {
		return nil, &FormatError{Offset: headerSize + int64(length), Field: "checksum", Err: ErrChecksum}
	}
	f := &File{Major: major, Minor: minor, Checksum: hex.EncodeToString(stored)}
	sessions, err := decodeSessions(body)
	if err != nil {
		return nil, err
	}
	f.Sessions = sessions
	if minor > FormatMinor {
		f.Warnings = append(f.Warnings, fmt.Sprintf(
			"The file was written by a newer Pairline (format %d.%d; this one knows %d.%d). "+
				"Everything this version knows was read; newer details were skipped and are lost if you save from here.",
			major, minor, FormatMajor, FormatMinor))
	}
	migrate(f)
	return f, nil
}

// decodeHeader reads the header into hdr and checks it: the magic, the
// major version (one this Pairline reads) and the body length (at most
// maxBodySize).
func decodeHeader(r io.Reader, hdr *[headerSize]byte) (major, minor int, length uint64, err error) {
	n, err := io.ReadFull(r, hdr[:])
	if err != nil && !errors.Is(err, io.ErrUnexpectedEOF) && !errors.Is(err, io.EOF) {
		return 0, 0, 0, &FormatError{Offset: int64(n), Err: fmt.Errorf("%w: the file could not be read: %v", ErrTruncated, err)}
	}
	m := min(n, len(Magic))
	if !bytes.Equal(hdr[:m], Magic[:m]) {
		return 0, 0, 0, &FormatError{Offset: 0, Err: notSessionFile(hdr[:n])}
	}
	if n == 0 {
		return 0, 0, 0, &FormatError{Offset: 0, Err: fmt.Errorf("%w: the file is empty", ErrTruncated)}
	}
	if n < headerSize {
		return 0, 0, 0, &FormatError{Offset: int64(n), Err: fmt.Errorf("%w: the file ends inside its %d-byte header", ErrTruncated, headerSize)}
	}
	major = int(binary.BigEndian.Uint16(hdr[8:]))
	minor = int(binary.BigEndian.Uint16(hdr[10:]))
	if major > FormatMajor {
		return 0, 0, 0, &FormatError{Offset: 8, Field: "major version", Err: fmt.Errorf(
			"%w (the file has format %d.%d; this Pairline reads format %d.x)", ErrNewerVersion, major, minor, FormatMajor)}
	}
	if major < 1 {
		return 0, 0, 0, &FormatError{Offset: 8, Field: "major version", Err: invalid("format version %d.%d was never written by Pairline", major, minor)}
	}
	length = binary.BigEndian.Uint64(hdr[12:])
	if length > maxBodySize {
		return 0, 0, 0, &FormatError{Offset: 12, Field: "body length", Err: fmt.Errorf(
			"%w: it claims %d bytes of contents, at most %d are allowed", ErrTooLarge, length, maxBodySize)}
	}
	return major, minor, length, nil
}

// decodeRest reads the body of length bytes and the stored checksum after
// the header, refusing a file that ends early or goes on after them.
func decodeRest(r io.Reader, length uint64) (body, stored []byte, err error) {
	want := int64(length) + checksumSize
	rest, err := readAtMost(r, want, decodeBufferStart(r))
	got := int64(len(rest))
	if err != nil {
		return nil, nil, &FormatError{Offset: headerSize + got, Err: fmt.Errorf("%w: the file could not be read: %v", ErrTruncated, err)}
	}
	if got < want {
		return nil, nil, &FormatError{Offset: headerSize + got, Err: fmt.Errorf(
			"%w: the file has %d bytes, its header says %d", ErrTruncated, headerSize+got, headerSize+want)}
	}
	var extra [1]byte
	if k, _ := io.ReadFull(r, extra[:]); k > 0 {
		return nil, nil, &FormatError{Offset: headerSize + want, Err: invalid("there are extra bytes after the end of the file")}
	}
	return rest[:length], rest[length:], nil
}

// decodeBufferStart is the size the body's buffer starts at: what the
// reader says it holds (a bytes.Reader in the browser, a file natively),
// never what the header claims, so a 200-byte file claiming 64 MiB gets a
// small buffer; 64 KiB when the reader does not say.
func decodeBufferStart(r io.Reader) int64 {
	start := int64(64 << 10)
	if l, ok := r.(interface{ Len() int }); ok {
		start = int64(l.Len())
	} else if st, ok := r.(interface{ Stat() (fs.FileInfo, error) }); ok {
		if fi, err := st.Stat(); err == nil && fi.Mode().IsRegular() {
			start = fi.Size() - headerSize
		}
	}
	return start
}

// decodeSessions decodes the body's sessions and checks each as Validate
// does, and that no two share an ID.
func decodeSessions(body []byte) ([]*Session, error) {
	d := newBodyDecoder(body)
	sessions, starts, ferr := d.bundle()
	if ferr != nil {
		return nil, ferr
	}
	seen := make(map[string]bool, len(sessions))
	for i, s := range sessions {
		if field, err := s.validate(); err != nil {
			return nil, &FormatError{Offset: starts[i], Field: fmt.Sprintf("sessions[%d].%s", i, field), Err: err}
		}
		if seen[s.ID] {
			return nil, &FormatError{Offset: starts[i], Field: fmt.Sprintf("sessions[%d].id", i), Err: invalid("two sessions share the ID %s", s.ID)}
		}
		seen[s.ID] = true
	}
	return sessions, nil
}

// readAtMost reads up to want bytes from r into a buffer that starts at
// guess bytes (at least 4 KiB) and grows by at most doubling what it has
// actually read, so that memory follows the bytes that exist, whatever
// the header claims. It stops without error at the end of r.
func readAtMost(r io.Reader, want, guess int64) ([]byte, error) {
	buf := make([]byte, 0, max(4<<10, min(want, guess)))
	for int64(len(buf)) < want {
		if len(buf) == cap(buf) {
			buf = slices.Grow(buf, int(min(want-int64(len(buf)), int64(len(buf)))))
		}
		n, err := r.Read(buf[len(buf):min(int64(cap(buf)), want)])
		buf = buf[:len(buf)+n]
		if err == io.EOF {
			return buf, nil
		}
		if err != nil {
			return buf, err
		}
	}
	return buf, nil
}

// migrate brings sessions read from an older minor version up to date.
// A 1.0 file lacks the calibration record of 1.1, whose zero values (no
// conditions, standards, unknowns or seal; revision 0) are what a 1.0
// record means, so there is nothing to do yet.
func migrate(f *File) {}

func notSessionFile(b []byte) error {
	text := len(b) > 0
	for _, c := range b {
		if c < 0x09 || (c > 0x0d && c < 0x20) {
			text = false
		}
	}
	if text && utf8.Valid(b[:max(0, len(b)-utf8.UTFMax)]) {
		return fmt.Errorf("%w: it starts with text (perhaps a CSV file: import it instead of opening it)", ErrNotSessionFile)
	}
	return ErrNotSessionFile
}

// bodyDecoder reads the MessagePack body field by field, straight from the
// bytes of the body. It does not use msgpack's decoding, because that
// pre-allocates slices and strings from the lengths a hostile file claims
// and reads integers into floats with their sign lost; here every length is
// checked against the bytes left and against the limits before anything is
// allocated, and numbers keep their value or are refused.
type bodyDecoder struct {
	b   []byte
	pos int
	// readings and history count the entries of all sessions so far, for
	// MaxFileReadings and MaxFileHistory; listItems and sealed count the
	// record lists and the earlier sealed revisions, for MaxFileItems and
	// MaxFileSealedRevisions.
	readings, history, listItems, sealed int
}

func newBodyDecoder(body []byte) *bodyDecoder { return &bodyDecoder{b: body} }

// off is the file offset of the next unread byte.
func (b *bodyDecoder) off() int64 { return headerSize + int64(b.pos) }

// left is the number of unread bytes.
func (b *bodyDecoder) left() int { return len(b.b) - b.pos }

func (b *bodyDecoder) fail(off int64, field string, err error) *FormatError {
	return &FormatError{Offset: off, Field: field, Err: err}
}

func (b *bodyDecoder) short(off int64, field, want string) *FormatError {
	return b.fail(off, field, invalid("the contents end in the middle of %s", want))
}

// bigEndian reads an n-byte unsigned number (n ≤ 8), or reports false
// when fewer than n bytes are left.
func (b *bodyDecoder) bigEndian(n int) (uint64, bool) {
	if b.left() < n {
		return 0, false
	}
	var v uint64
	for _, c := range b.b[b.pos : b.pos+n] {
		v = v<<8 | uint64(c)
	}
	b.pos += n
	return v, true
}

func (b *bodyDecoder) isNil() bool { return b.pos < len(b.b) && b.b[b.pos] == msgpcode.Nil }

// takeNil passes over a nil, if the next value is one.
func (b *bodyDecoder) takeNil() bool {
	if b.isNil() {
		b.pos++
		return true
	}
	return false
}

// header reads the code of a map, array, string or binary value and its
// length: fixed is the first code of the fixed-length form and fixedMax its
// count (0 when the kind has none), and the codes of the 8-, 16- and 32-bit
// length forms follow (0 for a form the kind lacks). ok is false when the
// next value is of another kind; then nothing is read.
func (b *bodyDecoder) header(fixed, fixedMax, c8, c16, c32 byte) (n int, ok, complete bool) {
	if b.pos >= len(b.b) {
		return 0, false, false
	}
	c := b.b[b.pos]
	var size int
	switch {
	case fixedMax > 0 && c >= fixed && c < fixed+fixedMax:
		b.pos++
		return int(c - fixed), true, true
	case c8 != 0 && c == c8:
		size = 1
	case c == c16:
		size = 2
	case c == c32:
		size = 4
	default:
		return 0, false, true
	}
	b.pos++
	v, done := b.bigEndian(size)
	return int(v), true, done
}

func (b *bodyDecoder) mapHeader(field string) (int, *FormatError) {
	off := b.off()
	n, ok, done := b.header(msgpcode.FixedMapLow, 16, 0, msgpcode.Map16, msgpcode.Map32)
	if !done {
		return 0, b.short(off, field, "a map")
	}
	if !ok {
		return 0, b.fail(off, field, invalid("expected a map"))
	}
	return n, nil
}

func (b *bodyDecoder) arrayHeader(field string) (int, *FormatError) {
	off := b.off()
	n, ok, done := b.header(msgpcode.FixedArrayLow, 16, 0, msgpcode.Array16, msgpcode.Array32)
	if !done {
		return 0, b.short(off, field, "a list")
	}
	if !ok {
		return 0, b.fail(off, field, invalid("expected a list"))
	}
	return n, nil
}

// strBytes reads a string of at most max bytes and returns its bytes (part
// of the body, not a copy), checking its length before anything else.
func (b *bodyDecoder) strBytes(field string, key bool, max int) ([]byte, *FormatError) {
	what, name := "text", "the text"
	if key {
		what, name = "a field name", "a field name"
	}
	off := b.off()
	n, ok, done := b.header(msgpcode.FixedStrLow, 32, msgpcode.Str8, msgpcode.Str16, msgpcode.Str32)
	if !done {
		return nil, b.short(off, field, what)
	}
	if !ok {
		b.pos = int(off - headerSize)
		return nil, b.fail(off, field, invalid("expected %s", what))
	}
	if n > max {
		return nil, b.fail(off, field, invalid("%s is longer than %d bytes (%d)", name, max, n))
	}
	if n > b.left() {
		return nil, b.short(off, field, what)
	}
	s := b.b[b.pos : b.pos+n]
	b.pos += n
	if !utf8.Valid(s) {
		return nil, b.fail(off, field, invalid("%s is not valid UTF-8", name))
	}
	return s, nil
}

// knownKeys holds every map key format 1.1 uses, so that reading a key
// needs no new string (a lookup with string(bytes) does not allocate).
var knownKeys = func() map[string]string {
	m := map[string]string{}
	for _, k := range []string{"sessions", "written_by", "id", "title", "created", "modified", "site", "instrument",
		"description", "serial", "operator", "x_name", "x_unit", "y_name", "y_unit", "notes", "decimal_comma",
		"location", "lat", "lon", "accuracy_m", "taken", "readings", "settings", "history", "x", "y", "note",
		"excluded", "exclude_reason", "at", "field", "row", "old", "new", "model", "transform", "box_cox_lambda",
		"weights", "level", "slope_ref", "intercept_ref", "variance_ratio", "x_uncertainty", "y_uncertainty",
		"acceptance", "min_r_squared", "slope_low", "slope_high", "intercept_low", "intercept_high",
		"max_residual", "max_residual_percent_of_span",
		// format 1.1
		"interval_days", "conditions", "standards", "unknowns", "seal", "revision", "sealed", "name", "value",
		"unit", "certificate", "uncertainty", "expiry", "performed_by", "performed_at", "reviewed_by",
		"reviewed_at", "digest", "results"} {
		m[k] = k
	}
	return m
}()

// mapEach reads a map with string keys, calling fn for each key. At most
// MaxMapKeys keys, each at most MaxKeyLen bytes; duplicate keys are refused
// (two values for one field would be ambiguous evidence). The duplicate
// check is linear: a short list for the small maps of format 1.0, a set
// for larger ones.
func (b *bodyDecoder) mapEach(field string, fn func(key, path string) *FormatError) *FormatError {
	off := b.off()
	n, ferr := b.mapHeader(field)
	if ferr != nil {
		return ferr
	}
	if n > MaxMapKeys {
		return b.fail(off, field, fmt.Errorf("%w: the map has %d keys, at most %d are allowed", ErrTooLarge, n, MaxMapKeys))
	}
	if n*2 > b.left() {
		return b.fail(off, field, invalid("the map claims %d entries but only %d bytes are left", n, b.left()))
	}
	var few [24]string
	seen := few[:0]
	var set map[string]struct{}
	if n > len(few) {
		set = make(map[string]struct{}, n)
	}
	for i := 0; i < n; i++ {
		koff := b.off()
		kb, ferr := b.strBytes(field, true, MaxKeyLen)
		if ferr != nil {
			return ferr
		}
		k, ok := knownKeys[string(kb)]
		if !ok {
			k = string(kb)
		}
		dup := false
		if set != nil {
			_, dup = set[k]
			set[k] = struct{}{}
		} else {
			for _, s := range seen {
				dup = dup || s == k
			}
			seen = append(seen, k)
		}
		if dup {
			return b.fail(koff, prefixKey(field, k), invalid("the field appears twice"))
		}
		if ferr := fn(k, ""); ferr != nil {
			ferr.Field = prefixKey(k, ferr.Field)
			return ferr
		}
	}
	return nil
}

// Paths are built only when something fails: each level of the body
// decoder reports its failure with the path below it (empty for a value
// itself), and each enclosing map or list prefixes its key or index.
func prefixKey(key, rest string) string {
	switch {
	case key == "":
		return rest
	case rest == "":
		return key
	case rest[0] == '[':
		return key + rest
	}
	return key + "." + rest
}

func prefixIndex(i int, rest string) string {
	return prefixKey("["+strconv.Itoa(i)+"]", rest)
}

// arrayLen reads an array header, refusing more than max elements, or more
// than the bytes left could hold when each element takes at least minSize
// bytes (the smallest valid encoding of one). nil reads as an empty array.
func (b *bodyDecoder) arrayLen(field string, max, minSize int) (int, *FormatError) {
	off := b.off()
	if b.takeNil() {
		return 0, nil
	}
	n, ferr := b.arrayHeader(field)
	if ferr != nil {
		return 0, ferr
	}
	if n > max {
		return 0, b.fail(off, field, fmt.Errorf("%w: the list has %d entries, at most %d are allowed", ErrTooLarge, n, max))
	}
	if int64(n)*int64(minSize) > int64(b.left()) {
		return 0, b.fail(off, field, invalid("the list claims %d entries but only %d bytes are left (an entry takes at least %d)", n, b.left(), minSize))
	}
	return n, nil
}

func (b *bodyDecoder) str(field string, max int, p *string) *FormatError {
	s, ferr := b.strBytes(field, false, max)
	if ferr != nil {
		return ferr
	}
	*p = string(s)
	return nil
}

// numberSize is the number of bytes after the code c of a number, nil or
// boolean (fixed-size values), and whether c is one of them.
func numberSize(c byte) (int, bool) {
	switch c {
	case msgpcode.Nil, msgpcode.False, msgpcode.True:
		return 0, true
	case msgpcode.Uint8, msgpcode.Int8:
		return 1, true
	case msgpcode.Uint16, msgpcode.Int16:
		return 2, true
	case msgpcode.Float, msgpcode.Uint32, msgpcode.Int32:
		return 4, true
	case msgpcode.Double, msgpcode.Uint64, msgpcode.Int64:
		return 8, true
	}
	return 0, false
}

// number reads any MessagePack integer or float as a float64. An integer
// that a float64 cannot hold exactly (beyond 2⁵³, such as 2⁶⁴−1) is refused
// rather than rounded or, as a plain conversion would, read as −1.
func (b *bodyDecoder) number(field string) (float64, *FormatError) {
	off := b.off()
	if b.pos >= len(b.b) {
		return 0, b.short(off, field, "a number")
	}
	c := b.b[b.pos]
	switch {
	case c <= msgpcode.PosFixedNumHigh:
		b.pos++
		return float64(c), nil
	case c >= msgpcode.NegFixedNumLow:
		b.pos++
		return float64(int8(c)), nil
	}
	size, isNum := numberSize(c)
	if !isNum || size == 0 {
		return 0, b.fail(off, field, invalid("expected a number"))
	}
	b.pos++
	u, ok := b.bigEndian(size)
	if !ok {
		return 0, b.short(off, field, "a number")
	}
	switch c {
	case msgpcode.Float:
		return float64(math.Float32frombits(uint32(u))), nil
	case msgpcode.Double:
		return math.Float64frombits(u), nil
	case msgpcode.Uint8, msgpcode.Uint16, msgpcode.Uint32, msgpcode.Uint64:
		if f := float64(u); f < 1<<64 && uint64(f) == u {
			return f, nil
		}
		return 0, b.fail(off, field, invalid("the whole number %d is too large to be read exactly", u))
	}
	shift := 64 - 8*size
	v := int64(u<<shift) >> shift // sign-extended
	if f := float64(v); f < 1<<63 && int64(f) == v {
		return f, nil
	}
	return 0, b.fail(off, field, invalid("the whole number %d is too large to be read exactly", v))
}

func (b *bodyDecoder) f64(field string, p *float64) *FormatError {
	off := b.off()
	v, ferr := b.number(field)
	if ferr != nil {
		return ferr
	}
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return b.fail(off, field, invalid("the number is not finite (%v)", v))
	}
	*p = v
	return nil
}

func (b *bodyDecoder) optF64(field string, p **float64) *FormatError {
	if b.takeNil() {
		*p = nil
		return nil
	}
	var v float64
	if ferr := b.f64(field, &v); ferr != nil {
		return ferr
	}
	*p = &v
	return nil
}

func (b *bodyDecoder) boolean(field string, p *bool) *FormatError {
	off := b.off()
	if b.pos >= len(b.b) {
		return b.short(off, field, "true or false")
	}
	switch b.b[b.pos] {
	case msgpcode.True:
		*p = true
	case msgpcode.False:
		*p = false
	default:
		return b.fail(off, field, invalid("expected true or false"))
	}
	b.pos++
	return nil
}

// extHeader reads the header of an extension value: its type and length.
func (b *bodyDecoder) extHeader() (typ int8, n int, ok, complete bool) {
	if b.pos >= len(b.b) {
		return 0, 0, false, false
	}
	c := b.b[b.pos]
	switch c {
	case msgpcode.FixExt1, msgpcode.FixExt2, msgpcode.FixExt4, msgpcode.FixExt8, msgpcode.FixExt16:
		n = 1 << (c - msgpcode.FixExt1)
		b.pos++
	case msgpcode.Ext8, msgpcode.Ext16, msgpcode.Ext32:
		b.pos++
		v, done := b.bigEndian(1 << (c - msgpcode.Ext8))
		if !done {
			return 0, 0, true, false
		}
		n = int(v)
	default:
		return 0, 0, false, true
	}
	if b.pos >= len(b.b) {
		return 0, 0, true, false
	}
	typ = int8(b.b[b.pos])
	b.pos++
	return typ, n, true, true
}

// tm reads a MessagePack timestamp (extension type −1, 4, 8 or 12 bytes) or
// nil (the zero time). Only this form is accepted.
func (b *bodyDecoder) tm(field string, p *time.Time) *FormatError {
	off := b.off()
	if b.takeNil() {
		*p = time.Time{}
		return nil
	}
	id, n, ok, done := b.extHeader()
	switch {
	case !done:
		return b.short(off, field, "a time")
	case !ok || id != -1 || (n != 4 && n != 8 && n != 12):
		return b.fail(off, field, invalid("expected a time"))
	case b.left() < n:
		return b.short(off, field, "a time")
	}
	raw := b.b[b.pos : b.pos+n]
	b.pos += n
	var sec int64
	var nsec uint32
	switch n {
	case 4:
		sec = int64(binary.BigEndian.Uint32(raw[:4]))
	case 8:
		v := binary.BigEndian.Uint64(raw[:8])
		nsec, sec = uint32(v>>34), int64(v&(1<<34-1))
	case 12:
		nsec, sec = binary.BigEndian.Uint32(raw[:4]), int64(binary.BigEndian.Uint64(raw[4:12]))
	}
	if nsec >= 1e9 {
		return b.fail(off, field, invalid("the time has %d nanoseconds", nsec))
	}
	if sec < MinTime.Unix() || sec >= MaxTime.Unix() {
		return b.fail(off, field, invalid("the time is outside %d–%d", MinTime.Year(), MaxTime.Year()-1))
	}
	*p = time.Unix(sec, int64(nsec)).UTC()
	return nil
}

// integer reads a whole number in lo … hi, given as a MessagePack integer
// (or a float with a whole value, as some writers store every number).
func (b *bodyDecoder) integer(field string, lo, hi int64, p *int) *FormatError {
	off := b.off()
	v, ferr := b.number(field)
	if ferr != nil {
		return ferr
	}
	if v != math.Trunc(v) || v < float64(lo) || v > float64(hi) {
		return b.fail(off, field, invalid("%v is not a whole number in %d … %d", v, lo, hi))
	}
	*p = int(v)
	return nil
}

// skip passes over a value of an unknown key, with nesting limited to
// MaxNesting. It allocates nothing: every length is checked against the
// bytes left, and the cost is linear in the bytes skipped.
func (b *bodyDecoder) skip(field string, depth int) *FormatError {
	off := b.off()
	if b.pos >= len(b.b) {
		return b.short(off, field, "a value")
	}
	c := b.b[b.pos]
	if c <= msgpcode.PosFixedNumHigh || c >= msgpcode.NegFixedNumLow {
		b.pos++
		return nil
	}
	n, scalar, done := b.scalarSize(c)
	if !done {
		return b.short(off, field, "a value")
	}
	if !scalar {
		return b.skipContainer(field, depth, off, c)
	}
	if n > b.left() {
		return b.short(off, field, "a value")
	}
	b.pos += n
	return nil
}

// scalarSize is, for a value that starts with byte c and holds no other
// values (a number, string, binary or extension), the bytes left to pass
// over after what it read of its header (scalar). done is false when the
// body ends inside the header.
func (b *bodyDecoder) scalarSize(c byte) (n int, scalar, done bool) {
	if sz, ok := numberSize(c); ok {
		return 1 + sz, true, true
	}
	if k, isStr, done := b.header(msgpcode.FixedStrLow, 32, msgpcode.Str8, msgpcode.Str16, msgpcode.Str32); isStr || !done {
		return k, true, done
	}
	if k, isBin, done := b.header(0, 0, msgpcode.Bin8, msgpcode.Bin16, msgpcode.Bin32); isBin || !done {
		return k, true, done
	}
	if _, k, isExt, done := b.extHeader(); isExt || !done {
		return k, true, done
	}
	return 0, false, true
}

// skipContainer passes over a map or array (starting with byte c at file
// offset off) and every value in it, one level deeper; anything else is a
// type MessagePack does not define.
func (b *bodyDecoder) skipContainer(field string, depth int, off int64, c byte) *FormatError {
	k, isMap, done := b.header(msgpcode.FixedMapLow, 16, 0, msgpcode.Map16, msgpcode.Map32)
	if isMap {
		k *= 2
	} else if done {
		k, isMap, done = b.header(msgpcode.FixedArrayLow, 16, 0, msgpcode.Array16, msgpcode.Array32)
		if done && !isMap {
			return b.fail(off, field, invalid("the value has a type MessagePack does not define (code 0x%02x)", c))
		}
	}
	if !done {
		return b.short(off, field, "a value")
	}
	if depth >= MaxNesting {
		return b.fail(off, field, invalid("values are nested more than %d deep", MaxNesting))
	}
	if k > b.left() {
		return b.fail(off, field, invalid("a value claims %d entries but only %d bytes are left", k, b.left()))
	}
	for i := 0; i < k; i++ {
		if ferr := b.skip(field, depth+1); ferr != nil {
			return ferr
		}
	}
	return nil
}

func (b *bodyDecoder) bundle() ([]*Session, []int64, *FormatError) {
	var sessions []*Session
	var starts []int64
	var have bool
	ferr := b.mapEach("", func(k, path string) *FormatError {
		switch k {
		case "sessions":
			have = true
			n, ferr := b.arrayLen(path, MaxSessions, minSessionSize)
			if ferr != nil {
				return ferr
			}
			sessions = make([]*Session, n)
			starts = make([]int64, n)
			for i := range sessions {
				starts[i] = b.off()
				sessions[i] = new(Session)
				if ferr := b.session("", sessions[i]); ferr != nil {
					ferr.Field = prefixIndex(i, ferr.Field)
					return ferr
				}
			}
			return nil
		case "written_by":
			var s string
			return b.str(path, MaxShortText, &s)
		}
		return b.skip(path, 0)
	})
	if ferr != nil {
		return nil, nil, ferr
	}
	if b.left() > 0 {
		return nil, nil, b.fail(b.off(), "", invalid("there are %d bytes after the contents", b.left()))
	}
	if !have || len(sessions) == 0 {
		return nil, nil, b.fail(headerSize, "sessions", invalid("the file holds no sessions"))
	}
	return sessions, starts, nil
}

func (b *bodyDecoder) session(field string, s *Session) *FormatError {
	return b.mapEach(field, func(k, path string) *FormatError {
		switch k {
		case "id":
			return b.str(path, 32, &s.ID)
		case "created":
			return b.tm(path, &s.Created)
		case "modified":
			return b.tm(path, &s.Modified)
		case "history":
			return b.historyList(path, &s.History)
		case "seal":
			if b.takeNil() {
				s.Seal = nil
				return nil
			}
			s.Seal = new(Seal)
			return b.seal(path, s.Seal)
		case "revision":
			return b.integer(path, 0, MaxRevision, &s.Revision)
		case "sealed":
			return b.sealedList(path, &s.Sealed)
		}
		return b.content(k, path, &s.Content)
	})
}

// content reads the value of key k of a session's or a sealed revision's
// map into c when k is one of the content's keys (encodeContent), and
// skips it otherwise.
func (b *bodyDecoder) content(k, path string, c *Content) *FormatError {
	switch k {
	case "title":
		return b.str(path, MaxShortText, &c.Title)
	case "site":
		return b.str(path, MaxShortText, &c.Site)
	case "instrument":
		return b.instrument(path, &c.Instrument)
	case "operator":
		return b.str(path, MaxShortText, &c.Operator)
	case "x_name":
		return b.str(path, MaxShortText, &c.XName)
	case "x_unit":
		return b.str(path, MaxShortText, &c.XUnit)
	case "y_name":
		return b.str(path, MaxShortText, &c.YName)
	case "y_unit":
		return b.str(path, MaxShortText, &c.YUnit)
	case "notes":
		return b.str(path, MaxLongText, &c.Notes)
	case "decimal_comma":
		return b.optBool(path, &c.DecimalComma)
	case "location":
		return b.location(path, &c.Location)
	case "readings":
		return b.readingList(path, &c.Readings)
	case "settings":
		return b.settings(path, &c.Settings)
	case "conditions":
		return b.conditions(path, &c.Conditions)
	case "standards":
		return b.standards(path, &c.Standards)
	case "unknowns":
		return b.unknowns(path, &c.Unknowns)
	}
	return b.skip(path, 0)
}

// fileCount is a count kept over the whole file: the entries read so far
// into *n, at most limit of them, what names them in the error.
type fileCount struct {
	n     *int
	limit int
	what  string
}

func (b *bodyDecoder) fileReadingsCount() fileCount {
	return fileCount{&b.readings, MaxFileReadings, "readings"}
}
func (b *bodyDecoder) fileHistoryCount() fileCount {
	return fileCount{&b.history, MaxFileHistory, "history entries"}
}
func (b *bodyDecoder) fileSealedCount() fileCount {
	return fileCount{&b.sealed, MaxFileSealedRevisions, "earlier sealed revisions"}
}
func (b *bodyDecoder) fileItemsCount() fileCount {
	return fileCount{&b.listItems, MaxFileItems, "conditions, standards, unknowns and readings of unknowns"}
}

// countedList reads an array of at most max elements (each taking at
// least minSize bytes) into *p, every element read by each; the elements
// count towards the file's count c. An empty array reads as nil when
// emptyNil is set (as a new record holds it), else as an empty slice.
func countedList[T any](b *bodyDecoder, path string, max, minSize int, c fileCount, emptyNil bool, p *[]T, each func(t *T) *FormatError) *FormatError {
	off := b.off()
	n, ferr := b.arrayLen(path, max, minSize)
	if ferr != nil {
		return ferr
	}
	if *c.n += n; *c.n > c.limit {
		return b.fail(off, path, fmt.Errorf("%w: the sessions hold more than %d %s in all", ErrTooLarge, c.limit, c.what))
	}
	if n == 0 && emptyNil {
		*p = nil
		return nil
	}
	list := make([]T, n)
	*p = list
	for i := range list {
		if ferr := each(&list[i]); ferr != nil {
			ferr.Field = prefixIndex(i, ferr.Field)
			return ferr
		}
	}
	return nil
}

// historyList reads a session's history.
func (b *bodyDecoder) historyList(path string, p *[]Edit) *FormatError {
	return countedList(b, path, MaxHistory, minEditSize, b.fileHistoryCount(), false, p,
		func(e *Edit) *FormatError { return b.edit("", e) })
}

// sealedList reads a session's earlier sealed revisions.
func (b *bodyDecoder) sealedList(path string, p *[]SealedRevision) *FormatError {
	return countedList(b, path, MaxSealedRevisions, 1, b.fileSealedCount(), true, p,
		func(r *SealedRevision) *FormatError { return b.sealedRevision("", r) })
}

func (b *bodyDecoder) instrument(field string, in *Instrument) *FormatError {
	return b.mapEach(field, func(k, p string) *FormatError {
		switch k {
		case "description":
			return b.str(p, MaxShortText, &in.Description)
		case "serial":
			return b.str(p, MaxShortText, &in.Serial)
		case "id":
			return b.str(p, MaxShortText, &in.ID)
		case "interval_days":
			return b.integer(p, 0, MaxIntervalDays, &in.IntervalDays)
		}
		return b.skip(p, 0)
	})
}

func (b *bodyDecoder) optBool(field string, p **bool) *FormatError {
	if b.takeNil() {
		*p = nil
		return nil
	}
	var v bool
	if ferr := b.boolean(field, &v); ferr != nil {
		return ferr
	}
	*p = &v
	return nil
}

func (b *bodyDecoder) location(field string, p **Location) *FormatError {
	if b.takeNil() {
		*p = nil
		return nil
	}
	l := new(Location)
	*p = l
	return b.mapEach(field, func(k, p string) *FormatError {
		switch k {
		case "lat":
			return b.f64(p, &l.Lat)
		case "lon":
			return b.f64(p, &l.Lon)
		case "accuracy_m":
			return b.f64(p, &l.AccuracyM)
		case "taken":
			return b.tm(p, &l.Taken)
		}
		return b.skip(p, 0)
	})
}

// readingList reads the readings of a session or of a sealed revision.
func (b *bodyDecoder) readingList(path string, p *[]Reading) *FormatError {
	return countedList(b, path, MaxReadings, 1, b.fileReadingsCount(), false, p,
		func(r *Reading) *FormatError { return b.reading("", r) })
}

// recordList reads an array of at most max maps into *p, each map's keys
// handed to each with the element they fill (each skips the keys it does
// not know); an empty array reads as nil, as a new record holds it. Every
// element counts toward the file's MaxFileItems.
func recordList[T any](b *bodyDecoder, path string, max int, p *[]T, each func(t *T, k, q string) *FormatError) *FormatError {
	return countedList(b, path, max, 1, b.fileItemsCount(), true, p, func(t *T) *FormatError {
		return b.mapEach("", func(k, q string) *FormatError { return each(t, k, q) })
	})
}

func (b *bodyDecoder) conditions(path string, p *[]Condition) *FormatError {
	return recordList(b, path, MaxConditions, p, func(c *Condition, k, q string) *FormatError {
		switch k {
		case "name":
			return b.str(q, MaxShortText, &c.Name)
		case "value":
			return b.str(q, MaxShortText, &c.Value)
		case "unit":
			return b.str(q, MaxShortText, &c.Unit)
		}
		return b.skip(q, 0)
	})
}

func (b *bodyDecoder) standards(path string, p *[]Standard) *FormatError {
	return recordList(b, path, MaxStandards, p, func(st *Standard, k, q string) *FormatError {
		switch k {
		case "name":
			return b.str(q, MaxShortText, &st.Name)
		case "certificate":
			return b.str(q, MaxShortText, &st.Certificate)
		case "value":
			return b.str(q, MaxShortText, &st.Value)
		case "uncertainty":
			return b.str(q, MaxShortText, &st.Uncertainty)
		case "expiry":
			return b.tm(q, &st.Expiry)
		}
		return b.skip(q, 0)
	})
}

func (b *bodyDecoder) unknowns(path string, p *[]Unknown) *FormatError {
	return recordList(b, path, MaxUnknowns, p, func(u *Unknown, k, q string) *FormatError {
		switch k {
		case "name":
			return b.str(q, MaxShortText, &u.Name)
		case "readings":
			return countedList(b, q, MaxUnknownReadings, 1, b.fileItemsCount(), true, &u.Readings,
				func(r *string) *FormatError { return b.str("", MaxCellText, r) })
		}
		return b.skip(q, 0)
	})
}

func (b *bodyDecoder) seal(field string, sl *Seal) *FormatError {
	return b.mapEach(field, func(k, p string) *FormatError {
		switch k {
		case "performed_by":
			return b.str(p, MaxShortText, &sl.PerformedBy)
		case "performed_at":
			return b.tm(p, &sl.PerformedAt)
		case "reviewed_by":
			return b.str(p, MaxShortText, &sl.ReviewedBy)
		case "reviewed_at":
			return b.tm(p, &sl.ReviewedAt)
		case "digest":
			return b.str(p, MaxShortText, &sl.Digest)
		}
		return b.skip(p, 0)
	})
}

func (b *bodyDecoder) sealedRevision(field string, r *SealedRevision) *FormatError {
	return b.mapEach(field, func(k, p string) *FormatError {
		switch k {
		case "revision":
			return b.integer(p, 0, MaxRevision, &r.Revision)
		case "seal":
			return b.seal(p, &r.Seal)
		case "results":
			return b.str(p, MaxLongText, &r.Results)
		}
		return b.content(k, p, &r.Content)
	})
}

func (b *bodyDecoder) reading(field string, r *Reading) *FormatError {
	return b.mapEach(field, func(k, p string) *FormatError {
		switch k {
		case "x":
			return b.str(p, MaxCellText, &r.X)
		case "y":
			return b.str(p, MaxCellText, &r.Y)
		case "note":
			return b.str(p, MaxNoteText, &r.Note)
		case "taken":
			return b.tm(p, &r.Taken)
		case "excluded":
			return b.boolean(p, &r.Excluded)
		case "exclude_reason":
			return b.str(p, MaxShortText, &r.ExcludeReason)
		}
		return b.skip(p, 0)
	})
}

func (b *bodyDecoder) edit(field string, e *Edit) *FormatError {
	return b.mapEach(field, func(k, p string) *FormatError {
		switch k {
		case "at":
			return b.tm(p, &e.At)
		case "field":
			return b.str(p, MaxFieldName, &e.Field)
		case "row":
			return b.integer(p, -1, MaxReadings, &e.Row)
		case "old":
			return b.str(p, MaxLongText, &e.Old)
		case "new":
			return b.str(p, MaxLongText, &e.New)
		}
		return b.skip(p, 0)
	})
}

func (b *bodyDecoder) settings(field string, st *Settings) *FormatError {
	var model, transform, weights string
	ferr := b.mapEach(field, func(k, p string) *FormatError {
		switch k {
		case "model":
			return b.str(p, MaxKeyLen, &model)
		case "transform":
			return b.str(p, MaxKeyLen, &transform)
		case "box_cox_lambda":
			return b.optF64(p, &st.BoxCoxLambda)
		case "weights":
			return b.str(p, MaxKeyLen, &weights)
		case "level":
			return b.f64(p, &st.Level)
		case "slope_ref":
			return b.optF64(p, &st.SlopeRef)
		case "intercept_ref":
			return b.optF64(p, &st.InterceptRef)
		case "variance_ratio":
			return b.f64(p, &st.VarianceRatio)
		case "x_uncertainty":
			return b.f64(p, &st.XUncertainty)
		case "y_uncertainty":
			return b.f64(p, &st.YUncertainty)
		case "acceptance":
			if b.takeNil() {
				st.Acceptance = nil
				return nil
			}
			a := new(fitcore.Criteria)
			st.Acceptance = a
			return b.mapEach(p, func(k, q string) *FormatError {
				switch k {
				case "min_r_squared":
					return b.optF64(q, &a.MinRSquared)
				case "slope_low":
					return b.optF64(q, &a.SlopeLow)
				case "slope_high":
					return b.optF64(q, &a.SlopeHigh)
				case "intercept_low":
					return b.optF64(q, &a.InterceptLow)
				case "intercept_high":
					return b.optF64(q, &a.InterceptHigh)
				case "max_residual":
					return b.optF64(q, &a.MaxResidual)
				case "max_residual_percent_of_span":
					return b.boolean(q, &a.MaxResidualPercentOfSpan)
				}
				return b.skip(q, 0)
			})
		}
		return b.skip(p, 0)
	})
	st.Model = fitcore.Model(model)
	st.Transform = fitcore.Transform(transform)
	st.Weights = fitcore.WeightScheme(weights)
	return ferr
}
