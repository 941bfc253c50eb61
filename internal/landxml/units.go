package landxml

import (
	"fmt"

	"github.com/dugout-estimating/dugout/internal/units"
)

// Units is the linear unit of a LandXML document. Its zero value is
// [Metres].
type Units int

// The linear units written and read.
const (
	// Metres is <Metric linearUnit="meter">.
	Metres Units = iota
	// Feet is <Imperial linearUnit="foot">, the international foot of
	// 0.3048 m.
	Feet
	// USFeet is <Imperial linearUnit="USSurveyFoot">, 1200/3937 m.
	USFeet
)

// String returns "m", "ft" or "usft".
func (u Units) String() string {
	switch u {
	case Feet:
		return "ft"
	case USFeet:
		return "usft"
	case Metres:
		return "m"
	}
	return fmt.Sprintf("Units(%d)", int(u))
}

// Metres returns the length of one unit in metres (exact factors from
// package units), or 0 for an invalid value.
func (u Units) Metres() float64 {
	switch u {
	case Metres:
		return units.Metre
	case Feet:
		return units.Foot
	case USFeet:
		return units.USSurveyFoot
	}
	return 0
}

// linearUnits maps the LandXML 1.2 linearUnit values this package reads
// (schema types metLinear and impLinear) to a [Units].
var linearUnits = map[string]Units{
	"meter":        Metres,
	"foot":         Feet,
	"USSurveyFoot": USFeet,
}
