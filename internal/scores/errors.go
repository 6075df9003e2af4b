package scores

import (
	"errors"
	"fmt"
)

// Sentinel errors carried inside a *ParseError; test for them with errors.Is.
var (
	ErrEmpty         = errors.New("empty input, expected a header line")
	ErrNoRows        = errors.New("no data rows after the header")
	ErrNoScoredRows  = errors.New("no row with a score")
	ErrMissingColumn = errors.New("column not found")
	ErrRagged        = errors.New("wrong number of fields")
	ErrBadScore      = errors.New("invalid score")
	ErrBadLabel      = errors.New("unrecognised label")
	ErrBadWeight     = errors.New("invalid weight")
	ErrCorruptGzip   = errors.New("corrupt gzip data")
	ErrGzipTwice     = errors.New("gzip data inside gzip data")
	ErrBadJSON       = errors.New("malformed JSON")
	ErrBadTime       = errors.New("invalid time")
	ErrBlankLine     = errors.New("a line of only spaces or tabs")

	// ErrNeitherLabel marks the cases of a counts table counted with a
	// label that was neither true nor false (its unrecognised column).
	ErrNeitherLabel = errors.New("a label that is neither a true nor a false case")
	// ErrPositiveInCounts: a positive label was given for a counts table,
	// whose counts are by label already.
	ErrPositiveInCounts = errors.New("a counts table counts the labels already: a positive label does not apply")

	// ErrDuplicateColumn: two columns of a header, or two keys of a JSON
	// object, have one name, and which one to read would be a guess.
	ErrDuplicateColumn = errors.New("duplicate column name")
)

// ParseError reports bad input at a place in a file. Line is 1-based and
// counts physical lines of the decompressed input, the header being line 1;
// it is 0 when the error concerns the file as a whole. Column is the column
// (or JSON key) name, empty when the error concerns the whole row.
type ParseError struct {
	File   string
	Line   int
	Column string
	Err    error
}

func (e *ParseError) Error() string {
	msg := e.File
	if e.Line > 0 {
		msg += fmt.Sprintf(":%d", e.Line)
	}
	if e.Column != "" {
		msg += fmt.Sprintf(": column %q", e.Column)
	}
	return msg + ": " + e.Err.Error()
}

func (e *ParseError) Unwrap() error { return e.Err }

// valueError wraps a sentinel with the offending value, as in
// `unrecognised label "maybe"`.
type valueError struct {
	sentinel error
	value    string
	hint     string
	also     error // a second sentinel the error matches, or nil
}

func (e *valueError) Error() string {
	msg := fmt.Sprintf("%v %q", e.sentinel, e.value)
	if e.hint != "" {
		msg += ", " + e.hint
	}
	return msg
}

func (e *valueError) Unwrap() []error {
	if e.also != nil {
		return []error{e.sentinel, e.also}
	}
	return []error{e.sentinel}
}
