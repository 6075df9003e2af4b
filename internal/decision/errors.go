package decision

import (
	"errors"
	"fmt"
)

// Sentinel errors; test for them with errors.Is.
var (
	// ErrDifferentData: Write found an existing decision file chosen on
	// other data (its data.sha256 differs) and was not forced to replace it.
	ErrDifferentData = errors.New("the existing file was made from different data")
	// ErrNotDecisionFile: Write found an existing file that is not a
	// readable decision file and was not forced to replace it.
	ErrNotDecisionFile = errors.New("the existing file is not a readable decision file")

	ErrSyntax        = errors.New("malformed YAML")
	ErrFormat        = errors.New("unknown format")
	ErrMissingKey    = errors.New("missing required key")
	ErrUnknownKey    = errors.New("unknown key")
	ErrType          = errors.New("wrong type")
	ErrNotFinite     = errors.New("expected a finite number")
	ErrUnknownChosen = errors.New("names no candidate")
	ErrInvalid       = errors.New("invalid value")
)

// ParseError reports a decision file that breaks the format. Line is the
// 1-based line of the offending YAML node, 0 when unknown (for example in
// errors from File.Validate). Path is the key path such as
// "candidates[2].score", with list indices counted from 0; it is empty
// when the error concerns the whole document.
//
// The message reads `cut.yaml:14: candidates[2].score: expected a finite
// number, found .nan`.
type ParseError struct {
	File string
	Line int
	Path string
	Err  error
}

func (e *ParseError) Error() string {
	msg := e.File
	if e.Line > 0 {
		msg += fmt.Sprintf(":%d", e.Line)
	}
	if e.Path != "" {
		if msg != "" {
			msg += ": "
		}
		msg += e.Path
	}
	if msg != "" {
		msg += ": "
	}
	return msg + e.Err.Error()
}

func (e *ParseError) Unwrap() error { return e.Err }
