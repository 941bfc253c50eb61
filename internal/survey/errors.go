package survey

import (
	"errors"
	"fmt"
	"strings"
)

// Sentinel errors. Read returns them wrapped in a *[ParseError] (or, for
// problems across files, wrapped with the file names), so test them with
// errors.Is.
var (
	// ErrSyntax marks a field or structure that cannot be parsed.
	ErrSyntax = errors.New("survey: syntax error")
	// ErrNonFinite marks a NaN or infinite number (including overflow such
	// as 1e400).
	ErrNonFinite = errors.New("survey: value is not a finite number")
	// ErrRange marks a number outside its valid range: a latitude beyond
	// ±90°, a longitude beyond ±180°, a negative accuracy.
	ErrRange = errors.New("survey: value out of range")
	// ErrDuplicatePoint marks one point id used for two different
	// positions in one file.
	ErrDuplicatePoint = errors.New("survey: duplicate point id")
	// ErrEmpty marks a file (or a set of files) with no points: an empty
	// file, a header with no rows, only comments.
	ErrEmpty = errors.New("survey: no points")
	// ErrNotText marks a file that should be text but holds binary data.
	ErrNotText = errors.New("survey: not a text file")
	// ErrFormat marks a file whose format cannot be recognised, or whose
	// extension contradicts its content.
	ErrFormat = errors.New("survey: unrecognised format")
	// ErrColumns marks missing, unknown, repeated or ambiguous columns.
	ErrColumns = errors.New("survey: column error")
	// ErrNoElevation marks points without an elevation when elevations
	// are required (see [Options.AllowMissingZ]).
	ErrNoElevation = errors.New("survey: no elevation")
	// ErrMixedCRS marks files in different coordinate systems, or a mix
	// that cannot be told apart (lon/lat beside an unnamed grid).
	ErrMixedCRS = errors.New("survey: mixed coordinate systems")
	// ErrCRS marks input that cannot be put into the requested coordinate
	// system (lon/lat with --crs local, a geographic EPSG code as the
	// working frame, lon/lat outside the UTM zones).
	ErrCRS = errors.New("survey: coordinate system")
	// ErrLevels marks a level book whose readings are out of order: an
	// intermediate sight or foresight with no instrument height, a first
	// row that is not a backsight on a known elevation.
	ErrLevels = errors.New("survey: level book")
	// ErrTooLarge marks input beyond the size limits ([MaxTextBytes],
	// [MaxLineBytes]).
	ErrTooLarge = errors.New("survey: input too large")
)

// ParseError locates a problem in an input file. Line is 1-based; it is 0
// when the problem concerns the whole file (and for binary formats). Field
// names the column or element as the file spells it, when there is one.
type ParseError struct {
	File  string
	Line  int
	Field string
	Err   error
}

// Error returns "file:line: field: message".
func (e *ParseError) Error() string {
	var b strings.Builder
	b.WriteString(e.File)
	if e.Line > 0 {
		fmt.Fprintf(&b, ":%d", e.Line)
	}
	if e.Field != "" {
		fmt.Fprintf(&b, ": %s", e.Field)
	}
	b.WriteString(": ")
	// The sentinel's "survey: " prefix is redundant once the file is named.
	b.WriteString(strings.TrimPrefix(e.Err.Error(), "survey: "))
	return b.String()
}

// Unwrap returns the underlying error.
func (e *ParseError) Unwrap() error { return e.Err }

// perr builds a *ParseError whose message wraps sentinel with detail.
func perr(file string, line int, field string, sentinel error, format string, args ...any) *ParseError {
	return &ParseError{File: file, Line: line, Field: field,
		Err: fmt.Errorf("%w: "+format, append([]any{sentinel}, args...)...)}
}
