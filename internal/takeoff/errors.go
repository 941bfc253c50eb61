package takeoff

import (
	"errors"
	"fmt"
)

// Sentinel errors. Every error returned by this package wraps one of them.
var (
	// ErrInput is wrapped by errors about the design input (mesh, levels,
	// zones).
	ErrInput = errors.New("takeoff: invalid input")
	// ErrOption is wrapped by errors about an option's value.
	ErrOption = errors.New("takeoff: invalid option")
	// ErrStretch is wrapped when a stone stretch does not lie on the
	// shoreline.
	ErrStretch = errors.New("takeoff: stretch not on the shoreline")
	// ErrStock is wrapped when the stock list of liner sizes is unusable.
	ErrStock = errors.New("takeoff: unusable stock list")
	// ErrPreset is wrapped when a preset name is not known.
	ErrPreset = errors.New("takeoff: unknown preset")
)

// ValueError reports an option or input whose value is out of range. Field
// names the option as a user knows it ("stone thickness"), Want states the
// allowed range with its unit ("> 0 m").
type ValueError struct {
	Field string
	Value float64
	Want  string
	Err   error // ErrOption or ErrInput
}

// Error returns a message such as
// "takeoff: stone thickness must be > 0 m, got -0.1".
func (e *ValueError) Error() string {
	return fmt.Sprintf("takeoff: %s must be %s, got %g", e.Field, e.Want, e.Value)
}

// Unwrap returns the sentinel the error belongs to.
func (e *ValueError) Unwrap() error { return e.Err }

func optionError(field string, v float64, want string) error {
	return &ValueError{Field: field, Value: v, Want: want, Err: ErrOption}
}

func inputError(field string, v float64, want string) error {
	return &ValueError{Field: field, Value: v, Want: want, Err: ErrInput}
}

// StretchError reports a stone stretch that is not on the shoreline: its
// index in the option list, the loop and chainages asked for, and what the
// shoreline offers.
type StretchError struct {
	Index       int     // position in EdgeStoneOptions.Stretches
	Loop        int     // loop asked for
	FromM, ToM  float64 // chainages asked for (m)
	Loops       int     // number of shoreline loops
	LoopLengthM float64 // length of the loop asked for (0 when it does not exist)
	Reason      string
}

// Error describes the stretch and why it is rejected.
func (e *StretchError) Error() string {
	if e.Loop < 0 || e.Loop >= e.Loops {
		return fmt.Sprintf("takeoff: stone stretch %d: loop %d does not exist (the shoreline has %d loops, numbered from 0)",
			e.Index, e.Loop, e.Loops)
	}
	return fmt.Sprintf("takeoff: stone stretch %d: loop %d from %g m to %g m: %s (loop length %.3f m)",
		e.Index, e.Loop, e.FromM, e.ToM, e.Reason, e.LoopLengthM)
}

// Unwrap returns [ErrStretch].
func (e *StretchError) Unwrap() error { return ErrStretch }

// PresetError reports an unknown preset name with the names that are known.
type PresetError struct {
	Kind  string // "rock", "liner material", ...
	Name  string
	Known []string
}

// Error lists the known names.
func (e *PresetError) Error() string {
	return fmt.Sprintf("takeoff: unknown %s %q (known: %s)", e.Kind, e.Name, joinNames(e.Known))
}

// Unwrap returns [ErrPreset].
func (e *PresetError) Unwrap() error { return ErrPreset }

func joinNames(names []string) string {
	s := ""
	for i, n := range names {
		if i > 0 {
			s += ", "
		}
		s += n
	}
	return s
}
