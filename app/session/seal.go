package session

import (
	"crypto/sha256"
	"encoding/binary"
	"encoding/hex"
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"
	"time"

	"pairline/fitcore"
)

// Errors of sealing and of checking a seal.
var (
	// ErrNotSealed: the record has no seal (it was never signed "performed
	// by", or it was changed after its seal and not signed again).
	ErrNotSealed = errors.New("the record is not sealed")
	// ErrSealBroken: a seal does not match the content it claims to cover.
	ErrSealBroken = errors.New("the seal does not match the record")
	// ErrAlreadySigned: the signature asked for is already there.
	ErrAlreadySigned = errors.New("the record is already signed")
)

// SealEncoding names the byte encoding SealDigest hashes (FORMAT.md,
// "Seal digest"); it is the first item of the encoding.
const SealEncoding = "pairline-seal-1"

// SealDigest returns the SHA-256 (FIPS 180-4) of the canonical encoding of
// the record's sealed content, as 64 lowercase hex digits: the record's
// identity (id, created, revision, title, site, instrument, operator, names
// and units, notes, decimal-comma choice, location), every reading with its
// note, time and exclusion, the fit settings, the conditions, the standards,
// the unknowns and the seal's performed and reviewed names and times.
// The history, the modification time, the earlier sealed revisions and the
// digest itself are not covered. The encoding is specified byte for byte in
// FORMAT.md ("Seal digest") so that anyone can compute it again. It fails
// with ErrNotSealed when the record has no seal.
func (s *Session) SealDigest() (string, error) {
	if s.Seal == nil {
		return "", ErrNotSealed
	}
	return sealDigest(s.ID, s.Created, s.view()), nil
}

// sealDigest is the digest of one revision's content r (its Seal's names
// and times included) of the session with the given id and creation time.
func sealDigest(id string, created time.Time, r *SealedRevision) string {
	sum := sha256.Sum256(sealBytes(id, created, r))
	return hex.EncodeToString(sum[:])
}

// sealBytes is the canonical encoding of FORMAT.md, "Seal digest": a
// sequence of items, each
//
//	name SP length SP value LF
//
// where name is ASCII without spaces, length is the byte length of value in
// decimal digits and value is UTF-8 (it may hold spaces and line feeds: the
// length says where it ends).
func sealBytes(id string, created time.Time, r *SealedRevision) []byte {
	n := 4096 + len(r.Notes)
	for i := range r.Readings {
		q := &r.Readings[i]
		n += 200 + len(q.X) + len(q.Y) + len(q.Note) + len(q.ExcludeReason)
	}
	w := &sealWriter{b: make([]byte, 0, n)}
	w.item("format", SealEncoding)
	w.item("id", id)
	w.tm("created", created)
	w.item("revision", strconv.Itoa(r.Revision))
	w.item("title", r.Title)
	w.item("site", r.Site)
	w.item("instrument.description", r.Instrument.Description)
	w.item("instrument.serial", r.Instrument.Serial)
	w.item("instrument.id", r.Instrument.ID)
	w.item("instrument.interval_days", strconv.Itoa(r.Instrument.IntervalDays))
	w.item("operator", r.Operator)
	w.item("x_name", r.XName)
	w.item("x_unit", r.XUnit)
	w.item("y_name", r.YName)
	w.item("y_unit", r.YUnit)
	w.item("notes", r.Notes)
	w.item("decimal_comma", boolPtrText(r.DecimalComma))
	if l := r.Location; l == nil {
		w.item("location", "")
	} else {
		w.item("location", "given")
		w.f64("location.lat", l.Lat)
		w.f64("location.lon", l.Lon)
		w.f64("location.accuracy_m", l.AccuracyM)
		w.tm("location.taken", l.Taken)
	}
	w.item("readings", strconv.Itoa(len(r.Readings)))
	var tb []byte
	for i := range r.Readings {
		q := &r.Readings[i]
		w.itemAt("readings", i, "x", q.X)
		w.itemAt("readings", i, "y", q.Y)
		w.itemAt("readings", i, "note", q.Note)
		tb = tb[:0]
		if !q.Taken.IsZero() {
			tb = q.Taken.UTC().AppendFormat(tb, time.RFC3339Nano)
		}
		w.itemAtBytes("readings", i, "taken", tb)
		w.itemAt("readings", i, "excluded", strconv.FormatBool(q.Excluded))
		w.itemAt("readings", i, "exclude_reason", q.ExcludeReason)
	}
	st := &r.Settings
	w.item("settings.model", string(st.Model))
	w.item("settings.transform", string(st.Transform))
	w.optF64("settings.box_cox_lambda", st.BoxCoxLambda)
	w.item("settings.weights", string(st.Weights))
	w.f64("settings.level", st.Level)
	w.optF64("settings.slope_ref", st.SlopeRef)
	w.optF64("settings.intercept_ref", st.InterceptRef)
	w.f64("settings.variance_ratio", st.VarianceRatio)
	w.f64("settings.x_uncertainty", st.XUncertainty)
	w.f64("settings.y_uncertainty", st.YUncertainty)
	if a := st.Acceptance; a == nil {
		w.item("settings.acceptance", "")
	} else {
		w.item("settings.acceptance", "given")
		w.optF64("settings.acceptance.min_r_squared", a.MinRSquared)
		w.optF64("settings.acceptance.slope_low", a.SlopeLow)
		w.optF64("settings.acceptance.slope_high", a.SlopeHigh)
		w.optF64("settings.acceptance.intercept_low", a.InterceptLow)
		w.optF64("settings.acceptance.intercept_high", a.InterceptHigh)
		w.optF64("settings.acceptance.max_residual", a.MaxResidual)
		w.item("settings.acceptance.max_residual_percent_of_span", strconv.FormatBool(a.MaxResidualPercentOfSpan))
	}
	w.item("conditions", strconv.Itoa(len(r.Conditions)))
	for i, c := range r.Conditions {
		p := "conditions[" + strconv.Itoa(i) + "]."
		w.item(p+"name", c.Name)
		w.item(p+"value", c.Value)
		w.item(p+"unit", c.Unit)
	}
	w.item("standards", strconv.Itoa(len(r.Standards)))
	for i, c := range r.Standards {
		p := "standards[" + strconv.Itoa(i) + "]."
		w.item(p+"name", c.Name)
		w.item(p+"certificate", c.Certificate)
		w.item(p+"value", c.Value)
		w.item(p+"uncertainty", c.Uncertainty)
		w.tm(p+"expiry", c.Expiry)
	}
	w.item("unknowns", strconv.Itoa(len(r.Unknowns)))
	for i, u := range r.Unknowns {
		p := "unknowns[" + strconv.Itoa(i) + "]."
		w.item(p+"name", u.Name)
		w.item(p+"readings", strconv.Itoa(len(u.Readings)))
		for j, v := range u.Readings {
			w.item(p+"readings["+strconv.Itoa(j)+"]", v)
		}
	}
	w.item("performed_by", r.Seal.PerformedBy)
	w.tm("performed_at", r.Seal.PerformedAt)
	w.item("reviewed_by", r.Seal.ReviewedBy)
	w.tm("reviewed_at", r.Seal.ReviewedAt)
	return w.b
}

type sealWriter struct{ b []byte }

// itemAt is item with the name list[i].field, made without a new string.
func (w *sealWriter) itemAt(list string, i int, field, value string) {
	w.name(list, i, field)
	w.b = strconv.AppendInt(w.b, int64(len(value)), 10)
	w.b = append(w.b, ' ')
	w.b = append(w.b, value...)
	w.b = append(w.b, '\n')
}

func (w *sealWriter) itemAtBytes(list string, i int, field string, value []byte) {
	w.name(list, i, field)
	w.b = strconv.AppendInt(w.b, int64(len(value)), 10)
	w.b = append(w.b, ' ')
	w.b = append(w.b, value...)
	w.b = append(w.b, '\n')
}

func (w *sealWriter) name(list string, i int, field string) {
	w.b = append(w.b, list...)
	w.b = append(w.b, '[')
	w.b = strconv.AppendInt(w.b, int64(i), 10)
	w.b = append(w.b, "]."...)
	w.b = append(w.b, field...)
	w.b = append(w.b, ' ')
}

func (w *sealWriter) item(name, value string) {
	w.b = append(w.b, name...)
	w.b = append(w.b, ' ')
	w.b = strconv.AppendInt(w.b, int64(len(value)), 10)
	w.b = append(w.b, ' ')
	w.b = append(w.b, value...)
	w.b = append(w.b, '\n')
}

// tm writes a time as RFC 3339 in UTC with the fraction of a second to the
// nanosecond and trailing zeros dropped (Go's time.RFC3339Nano), or "" for
// the zero time.
func (w *sealWriter) tm(name string, t time.Time) {
	if t.IsZero() {
		w.item(name, "")
		return
	}
	w.item(name, t.UTC().Format(time.RFC3339Nano))
}

// f64 writes a number as the 16 lowercase hex digits of its IEEE 754
// binary64 bits, big-endian: exact, and the same in every language.
func (w *sealWriter) f64(name string, v float64) {
	var b [8]byte
	binary.BigEndian.PutUint64(b[:], math.Float64bits(v))
	w.item(name, hex.EncodeToString(b[:]))
}

func (w *sealWriter) optF64(name string, p *float64) {
	if p == nil {
		w.item(name, "")
		return
	}
	w.f64(name, *p)
}

func signerName(role, name string) (string, error) {
	name = strings.TrimSpace(name)
	if name == "" {
		return "", fmt.Errorf("%w: give the name of the person who %s", ErrBadValue, role)
	}
	if len(name) > MaxShortText {
		return "", fmt.Errorf("%w: the name is %d bytes long, at most %d are allowed", ErrBadValue, len(name), MaxShortText)
	}
	return name, nil
}

// SignPerformed seals the record: performedBy (the person who did the
// calibration, required) signs at now. The revision becomes 1 for a record
// never sealed (a record changed after a seal is already on its next
// revision), the seal's digest is computed (SealDigest) and the history
// gets an EditSealed entry. A sealed record cannot be signed again; change
// it first (which starts a new revision) or add the review (SignReviewed).
func (s *Session) SignPerformed(performedBy string, now time.Time) error {
	if s.Seal != nil {
		return fmt.Errorf("%w: revision %d was signed by %s on %s", ErrAlreadySigned, s.Revision, s.Seal.PerformedBy, s.Seal.PerformedAt.UTC().Format(time.RFC3339))
	}
	name, err := signerName("performed the calibration", performedBy)
	if err != nil {
		return err
	}
	if s.Revision == 0 {
		s.Revision = 1
	}
	s.Seal = &Seal{PerformedBy: name, PerformedAt: now.UTC()}
	s.Seal.Digest, _ = s.SealDigest()
	s.record(now, EditSealed, -1, "", fmt.Sprintf("revision %d sealed, performed by %s; digest %s", s.Revision, name, s.Seal.Digest))
	return nil
}

// SignReviewed adds the review signature to the seal: reviewedBy signs at
// now, and the digest is computed again so that it covers both signatures.
// The seal must be intact (VerifySeal): a reviewer never signs content
// that was changed after it was sealed. A record already reviewed is not
// reviewed again.
func (s *Session) SignReviewed(reviewedBy string, now time.Time) error {
	if s.Seal == nil {
		return fmt.Errorf("%w: sign it as performed before the review", ErrNotSealed)
	}
	if s.Seal.ReviewedBy != "" {
		return fmt.Errorf("%w: revision %d was reviewed by %s on %s", ErrAlreadySigned, s.Revision, s.Seal.ReviewedBy, s.Seal.ReviewedAt.UTC().Format(time.RFC3339))
	}
	name, err := signerName("reviewed the calibration", reviewedBy)
	if err != nil {
		return err
	}
	if ok, err := s.VerifySeal(); !ok {
		return fmt.Errorf("the review cannot be signed: %w", err)
	}
	old := s.Seal.Digest
	s.Seal.ReviewedBy, s.Seal.ReviewedAt = name, now.UTC()
	s.Seal.Digest, _ = s.SealDigest()
	s.record(now, EditReviewed, -1, "digest "+old, fmt.Sprintf("revision %d reviewed by %s; digest %s", s.Revision, name, s.Seal.Digest))
	return nil
}

// VerifySeal checks the seals of the record: each earlier sealed revision
// (Sealed) against its frozen content, then the current seal against the
// current content. It returns true and nil when the record is sealed and
// every digest matches. Otherwise it returns false and an error saying why,
// in words: ErrNotSealed when there is no current seal (and every earlier
// revision is intact), ErrSealBroken when a digest does not match (the
// content was changed outside Pairline's methods, or the seal was copied
// from another record) or the revisions are out of order.
func (s *Session) VerifySeal() (bool, error) {
	last := 0
	for i := range s.Sealed {
		r := &s.Sealed[i]
		if r.Revision <= last {
			return false, fmt.Errorf("%w: the earlier sealed revisions are out of order (revision %d after revision %d)", ErrSealBroken, r.Revision, last)
		}
		last = r.Revision
		if r.Seal.PerformedBy == "" {
			return false, fmt.Errorf("%w: earlier revision %d names no one as performed by", ErrSealBroken, r.Revision)
		}
		if got := sealDigest(s.ID, s.Created, r); got != r.Seal.Digest {
			return false, fmt.Errorf("%w: the kept copy of revision %d does not match its seal (digest stored %s, computed from the content %s)",
				ErrSealBroken, r.Revision, shortDigest(r.Seal.Digest), shortDigest(got))
		}
	}
	if s.Seal == nil {
		return false, ErrNotSealed
	}
	if s.Revision <= last {
		return false, fmt.Errorf("%w: the current revision %d is not after the earlier sealed revision %d", ErrSealBroken, s.Revision, last)
	}
	if s.Seal.PerformedBy == "" {
		return false, fmt.Errorf("%w: the seal names no one as performed by", ErrSealBroken)
	}
	if (s.Seal.ReviewedBy == "") != s.Seal.ReviewedAt.IsZero() {
		return false, fmt.Errorf("%w: the review has a name without a time or a time without a name", ErrSealBroken)
	}
	got, _ := s.SealDigest()
	if got != s.Seal.Digest {
		return false, fmt.Errorf("%w: the record was changed after revision %d was sealed, or the seal was altered (digest stored %s, computed from the content %s)",
			ErrSealBroken, s.Revision, shortDigest(s.Seal.Digest), shortDigest(got))
	}
	return true, nil
}

// shortDigest is a digest cut to 16 characters (stored digests come from
// the file and may be anything up to MaxShortText).
func shortDigest(d string) string {
	if d == "" {
		return "(none)"
	}
	return strconv.Quote(truncate(d, 16))
}

// ResultsSummary is the results of the current content in one paragraph of
// words and numbers, as frozen with a sealed revision: the number of pairs
// used, the fitted line and its standard errors, R², the acceptance verdict
// and the converted unknowns. It is computed with fitcore.Analyze on the
// session's own pairs and settings; when the line cannot be fitted it says
// why.
func (s *Session) ResultsSummary() string {
	x, y, _, problems := s.Pairs()
	opt, conv, _ := s.RecordOptions(x)
	opt.SkipAdvice = true
	rep, err := fitcore.Analyze(x, y, opt)
	var b strings.Builder
	fmt.Fprintf(&b, "%d pairs used", len(x))
	if len(problems) > 0 {
		fmt.Fprintf(&b, " (%d cells not numbers)", len(problems))
	}
	if err != nil {
		fmt.Fprintf(&b, "; no line: %v", err)
		return truncate(b.String(), MaxLongText-8)
	}
	g := func(v float64) string { return strconv.FormatFloat(v, 'g', 8, 64) }
	fmt.Fprintf(&b, "; slope %s (SE %s); intercept %s (SE %s); R² %s; residual SE %s",
		g(rep.Slope.Estimate), g(rep.Slope.SE), g(rep.Intercept.Estimate), g(rep.Intercept.SE), g(rep.RSquared), g(rep.ResidualSE))
	if a := rep.Acceptance; a != nil {
		verdict := "fail"
		if a.Pass {
			verdict = "pass"
		}
		fmt.Fprintf(&b, "; acceptance: %s", verdict)
	}
	for i, inv := range rep.Inverse {
		name := s.Unknowns[conv.Index[i]].Name
		fmt.Fprintf(&b, "; unknown %q: x %s (SE %s", truncate(name, 80), g(inv.X), g(inv.SE))
		if inv.Bounded {
			fmt.Fprintf(&b, ", %s to %s", g(inv.Low), g(inv.High))
		}
		b.WriteString(")")
	}
	return truncate(b.String(), MaxLongText-8)
}
