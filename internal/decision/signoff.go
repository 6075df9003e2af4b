package decision

import (
	"bytes"
	"context"
	"crypto/sha256"
	"errors"
	"fmt"
	"strings"
	"time"

	"github.com/sill-tool/sill/internal/sharedfile"
)

// Verdict is a sign-off's verdict.
type Verdict string

// The verdicts a sign-off may give.
const (
	Approve Verdict = "approve" // the chosen cut may go to production
	Revise  Verdict = "revise"  // change something first (the note says what)
	Reject  Verdict = "reject"  // the cut must not go to production
)

// Verdicts lists the verdicts in the order they are offered.
var Verdicts = []Verdict{Approve, Revise, Reject}

// ErrVerdict: a verdict other than approve, revise or reject.
var ErrVerdict = errors.New("unknown verdict")

// ParseVerdict reads "approve", "revise" or "reject", exactly; anything
// else is an error wrapping ErrVerdict.
func ParseVerdict(text string) (Verdict, error) {
	for _, v := range Verdicts {
		if text == string(v) {
			return v, nil
		}
	}
	return "", fmt.Errorf("%w %q, expected approve, revise or reject", ErrVerdict, text)
}

// SignOff is one person's verdict on the file (an item of key sign_offs).
// Sign-offs are appended and never rewritten: one given before the chosen
// cut changed stays, and Chosen and ChosenScore tell which choice it was
// given for (see File.ForCurrentChoice).
type SignOff struct {
	Name    string    // key name: who signs; never empty
	Role    string    // key role, such as "operations lead"; "" (null) when not given
	Verdict Verdict   // key verdict
	Note    string    // key note; "" (null) when not given
	At      time.Time // key at: when, in RFC 3339 UTC to the second
	// Key is the SHA256 fingerprint of the SSH key the sign-off came
	// through, as ssh-keygen -l prints it ("SHA256:..."); key key, absent
	// when "" (a sign-off given on this machine).
	Key string
	// Chosen and ChosenScore are the chosen candidate's name and score
	// when the sign-off was given (keys chosen, chosen_score).
	Chosen      string
	ChosenScore float64
}

// ForCurrentChoice reports whether s was given for f's chosen candidate
// as it is now: the same name and score.
func (f *File) ForCurrentChoice(s SignOff) bool {
	c, ok := f.ChosenCandidate()
	return ok && s.Chosen == c.Name && s.ChosenScore == c.Cut.Score
}

// NewSignOff returns a sign-off of f's current choice at the time at
// (UTC, to the second). It returns an error wrapping ErrInvalid when name
// is empty or a text holds a line break, and ErrVerdict for an unknown
// verdict.
func (f *File) NewSignOff(name, role string, verdict Verdict, note string, at time.Time) (SignOff, error) {
	c, _ := f.ChosenCandidate()
	s := SignOff{
		Name: strings.TrimSpace(name), Role: strings.TrimSpace(role), Verdict: verdict, Note: strings.TrimSpace(note),
		At: at.UTC().Truncate(time.Second), Chosen: c.Name, ChosenScore: c.Cut.Score,
	}
	return s, s.validate("")
}

// validate reports the first rule s breaks, as a *ParseError at path.
func (s SignOff) validate(path string) error {
	bad := func(key, format string, args ...any) error {
		return &ParseError{Path: join(path, key), Err: fmt.Errorf("%w: "+format, append([]any{ErrInvalid}, args...)...)}
	}
	if _, err := ParseVerdict(string(s.Verdict)); err != nil {
		return &ParseError{Path: join(path, "verdict"), Err: err}
	}
	if s.Name == "" {
		return bad("name", "expected the name of who signs")
	}
	for key, text := range map[string]string{"name": s.Name, "role": s.Role} {
		if strings.ContainsAny(text, "\r\n") {
			return bad(key, "a line break, expected one line")
		}
	}
	if s.At.IsZero() {
		return bad("at", "expected the time of the sign-off")
	}
	if s.Key != "" && !strings.HasPrefix(s.Key, "SHA256:") {
		return bad("key", "%q, expected an SSH key fingerprint such as SHA256:…", s.Key)
	}
	return nil
}

// AppendSignOff appends s to the decision file at path and returns the
// file as written. It reads the file under the lock of package sharedfile
// and appends to what it finds, so that a sign-off or any other write
// that landed in between is kept; two processes signing at once both land.
// The file is written as sill-cut/2 (a sill-cut/1 file is upgraded).
// Chosen and ChosenScore of s are set from the file as found. The Stamp
// is that of the file written, for a screen's next write to expect.
func AppendSignOff(ctx context.Context, path string, s SignOff) (*File, sharedfile.Stamp, error) {
	var written *File
	stamp, err := sharedfile.Update(ctx, path, sharedfile.Options{}, func(current []byte) ([]byte, error) {
		if current == nil {
			return nil, fmt.Errorf("%s: no decision file to sign", path)
		}
		f, err := Read(bytes.NewReader(current), path)
		if err != nil {
			return nil, err
		}
		c, _ := f.ChosenCandidate()
		s.Chosen, s.ChosenScore = c.Name, c.Cut.Score
		if err := s.validate(fmt.Sprintf("sign_offs[%d]", len(f.SignOffs))); err != nil {
			return nil, err
		}
		f.SignOffs = append(f.SignOffs, s)
		f.Format = Format
		data, err := Marshal(f)
		if err != nil {
			return nil, err
		}
		written = f
		return data, nil
	})
	if err != nil {
		return nil, sharedfile.Stamp{}, fmt.Errorf("sign %s: %w", path, err)
	}
	return written, stamp, nil
}

// Rewrite writes f over the decision file at path that it was read from
// (expect: ReadFileStamped, or the Stamp of the last write), like Write
// with WriteOptions.Expect, except that sign-offs appended to the file
// since are kept: when the file on disk is what was read plus sign-offs
// after f's own, f is written with all of them. Any other change refuses
// the write with an error matching sharedfile.ErrChanged, so that no one
// else's write is lost. force replaces a file that is not a decision file
// on the same data, as WriteOptions.Force does. It returns the Stamp of
// the file written and the sign-offs it holds.
func Rewrite(ctx context.Context, path string, f *File, expect sharedfile.Stamp, force bool) (sharedfile.Stamp, []SignOff, error) {
	if err := f.Validate(); err != nil {
		return sharedfile.Stamp{}, nil, fmt.Errorf("write %s: %w", path, err)
	}
	signOffs := f.SignOffs
	// The checks run in the order of Write's: changed since read first,
	// then the kind of file (sharedfile checks Expect before Kind).
	stamp, err := sharedfile.Update(ctx, path, sharedfile.Options{}, func(current []byte) ([]byte, error) {
		g := *f
		switch {
		case current == nil && !expect.Exists, current != nil && expect.Exists && sha256.Sum256(current) == expect.SHA256:
		case current == nil:
			return nil, fmt.Errorf("%w: removed since it was read", sharedfile.ErrChanged)
		default:
			later, ok := signedSince(current, path, f, expect)
			if !ok || !expect.Exists {
				return nil, fmt.Errorf("%w by more than sign-offs", sharedfile.ErrChanged)
			}
			g.SignOffs = append(append([]SignOff(nil), f.SignOffs...), later...)
		}
		if len(current) > 0 && !force {
			if err := replaceable(current, path, f.Data.SHA256); err != nil {
				return nil, &kindError{err}
			}
		}
		signOffs = g.SignOffs
		return Marshal(&g)
	})
	if err != nil {
		return sharedfile.Stamp{}, nil, err
	}
	return stamp, signOffs, nil
}

// signedSince returns the sign-offs of current after f's own when current
// is the file that expect describes with only those sign-offs appended:
// f's sign-offs first, and the rest of the file, written again without
// the new ones, exactly what was read.
func signedSince(current []byte, path string, f *File, expect sharedfile.Stamp) ([]SignOff, bool) {
	now, err := Read(bytes.NewReader(current), path)
	n := len(f.SignOffs)
	if err != nil || len(now.SignOffs) <= n {
		return nil, false
	}
	for i, s := range f.SignOffs {
		t := now.SignOffs[i]
		if s.Name != t.Name || s.Role != t.Role || s.Verdict != t.Verdict || s.Note != t.Note || !s.At.Equal(t.At) ||
			s.Key != t.Key || s.Chosen != t.Chosen || s.ChosenScore != t.ChosenScore {
			return nil, false
		}
	}
	before := *now
	before.SignOffs = now.SignOffs[:n]
	data, err := Marshal(&before)
	if err != nil || sha256.Sum256(data) != expect.SHA256 {
		return nil, false
	}
	return append([]SignOff(nil), now.SignOffs[n:]...), true
}

// kindError is a refusal of the kind of file found: it matches
// sharedfile.ErrOtherKind as Write's refusals do.
type kindError struct{ err error }

func (e *kindError) Error() string        { return e.err.Error() }
func (e *kindError) Unwrap() error        { return e.err }
func (e *kindError) Is(target error) bool { return target == sharedfile.ErrOtherKind }
