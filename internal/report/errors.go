package report

import (
	"errors"
	"fmt"
)

// Errors returned by the drawing, report and file writers. Callers test for
// them with [errors.Is]; the detailed errors below wrap them.
var (
	// ErrInvalidValue marks a value a drawing or table cannot use: a
	// non-finite coordinate, a negative cell size, a ring with too few
	// vertices. It is wrapped by [*ValueError].
	ErrInvalidValue = errors.New("report: invalid value")

	// ErrNothingToDraw is returned when a plan or section holds no geometry
	// at all.
	ErrNothingToDraw = errors.New("report: nothing to draw")

	// ErrTooLarge is returned when an input exceeds a size limit; it is
	// wrapped by [*SizeError].
	ErrTooLarge = errors.New("report: input too large")

	// ErrExternalReference is returned by [HTML] when a drawing handed to it
	// refers to anything outside the file (a link, an image, a style sheet),
	// which the self-contained report must never do.
	ErrExternalReference = errors.New("report: drawing refers to an outside resource")

	// ErrOutputDir is returned by [CheckOutputDir] when the output folder
	// cannot be created or written.
	ErrOutputDir = errors.New("report: output folder not usable")
)

// ValueError describes one bad input value: Item names where it is (for
// example "existing contour 2, line 0, vertex 5"), Field which value, and
// Reason what is wrong with it.
type ValueError struct {
	Item   string
	Field  string
	Value  float64
	Reason string
}

func (e *ValueError) Error() string {
	return fmt.Sprintf("report: %s: %s = %g: %s", e.Item, e.Field, e.Value, e.Reason)
}

// Unwrap returns [ErrInvalidValue].
func (e *ValueError) Unwrap() error { return ErrInvalidValue }

// SizeError reports an input of N items where at most Limit are accepted.
type SizeError struct {
	What  string
	N     int
	Limit int
}

func (e *SizeError) Error() string {
	return fmt.Sprintf("report: %s: %d is more than the limit of %d", e.What, e.N, e.Limit)
}

// Unwrap returns [ErrTooLarge].
func (e *SizeError) Unwrap() error { return ErrTooLarge }
