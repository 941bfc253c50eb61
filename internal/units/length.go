package units

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"
)

// System is the unit a survey's coordinates are given in, or the unit a user
// wants results printed in. Its zero value is [Metres].
type System int

// The unit systems the tool reads and writes.
const (
	Metres System = iota
	Feet
	USFeet
)

// ParseSystem parses "m", "ft" or "usft" (also "metres", "feet", "ftus").
func ParseSystem(s string) (System, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "m", "metre", "metres", "meter", "meters":
		return Metres, nil
	case "ft", "foot", "feet", "intft":
		return Feet, nil
	case "usft", "ftus", "us-ft", "survey-ft", "ussurveyfoot":
		return USFeet, nil
	}
	return Metres, fmt.Errorf("units: unknown unit system %q (want m, ft or usft)", s)
}

// String returns the flag spelling: "m", "ft" or "usft".
func (s System) String() string {
	switch s {
	case Feet:
		return "ft"
	case USFeet:
		return "usft"
	}
	return "m"
}

// Metres returns the length of one unit of s in metres.
func (s System) Metres() float64 {
	switch s {
	case Feet:
		return Foot
	case USFeet:
		return USSurveyFoot
	}
	return Metre
}

// IsImperial reports whether s is one of the foot systems, so that results
// should be printed in US customary units first.
func (s System) IsImperial() bool { return s == Feet || s == USFeet }

// ErrLength is returned (wrapped) for a length that cannot be parsed.
var ErrLength = errors.New("units: invalid length")

var lengthSuffixes = []struct {
	name string
	m    float64
}{
	// Longest first so that "usft" wins over "ft" and "mm" over "m".
	{"usft", USSurveyFoot},
	{"ftus", USSurveyFoot},
	{"inches", Inch},
	{"inch", Inch},
	{"in", Inch},
	{"\"", Inch},
	{"feet", Foot},
	{"foot", Foot},
	{"ft", Foot},
	{"'", Foot},
	{"yd", Yard},
	{"mm", Millimetre},
	{"cm", Centimetre},
	{"m", Metre},
}

// ParseLength parses a length such as "2ft", "30 in", "0.75m", "9\"" or a bare
// number, and returns it in metres. A bare number is taken in def (the
// survey's unit system). Non-finite values and malformed numbers are errors;
// signs are allowed (the caller checks ranges).
func ParseLength(s string, def System) (float64, error) {
	t := strings.ToLower(strings.TrimSpace(s))
	if t == "" {
		return 0, fmt.Errorf("%w: empty", ErrLength)
	}
	factor := def.Metres()
	for _, suf := range lengthSuffixes {
		if strings.HasSuffix(t, suf.name) {
			t = strings.TrimSpace(strings.TrimSuffix(t, suf.name))
			factor = suf.m
			break
		}
	}
	v, err := ParseNumber(t)
	if err != nil {
		return 0, fmt.Errorf("%w: %q: %w", ErrLength, s, err)
	}
	return v * factor, nil
}

// ErrNumber is returned (wrapped) for text that is not a plain finite decimal
// number.
var ErrNumber = errors.New("not a finite decimal number")

// ParseNumber parses a plain decimal number ("12", "-0.5", "1.2e3"). Unlike
// strconv.ParseFloat it rejects NaN, infinities, hexadecimal floats and
// underscores, none of which belong in a survey file.
func ParseNumber(s string) (float64, error) {
	if s == "" {
		return 0, ErrNumber
	}
	for _, r := range s {
		if !(r >= '0' && r <= '9' || r == '.' || r == '-' || r == '+' || r == 'e' || r == 'E') {
			return 0, ErrNumber
		}
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
		return 0, ErrNumber
	}
	return v, nil
}
