package sitefile

import (
	"fmt"
	"strconv"

	"github.com/dugout-estimating/dugout/internal/units"
)

// Length is a length as written in the site file: a bare number (in the
// site's units) or a string with a unit. The zero Length is unset.
type Length struct {
	Raw string // as written, e.g. "9in" or "2.5"
}

// IsSet reports whether the length was given.
func (l Length) IsSet() bool { return l.Raw != "" }

// Metres converts l to metres, reading a bare number in sys. An unset
// length gives def (already in metres).
func (l Length) Metres(sys units.System, def float64) (float64, error) {
	if !l.IsSet() {
		return def, nil
	}
	return units.ParseLength(l.Raw, sys)
}

// UnmarshalTOML accepts a number or a string.
func (l *Length) UnmarshalTOML(v any) error {
	switch x := v.(type) {
	case string:
		l.Raw = x
	case int64:
		l.Raw = strconv.FormatInt(x, 10)
	case float64:
		l.Raw = strconv.FormatFloat(x, 'g', -1, 64)
	default:
		return fmt.Errorf("want a length (a number or a string like \"9in\"), got %T", v)
	}
	return nil
}

// MarshalText writes the length back as written.
func (l Length) MarshalText() ([]byte, error) { return []byte(l.Raw), nil }

// Number is a plain number or a keyword (such as a water level that is an
// elevation, "auto" or "balance"), kept as written.
type Number = Length
