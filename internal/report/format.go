package report

import (
	"math"
	"strconv"
	"strings"

	"github.com/dugout-estimating/dugout/internal/units"
)

// lengthUnit returns the short unit word printed after lengths and
// elevations in sys: "ft" for both feet (the title block names which foot),
// "m" otherwise.
func lengthUnit(sys units.System) string {
	if sys.IsImperial() {
		return "ft"
	}
	return "m"
}

// unitsName returns the name of sys for title blocks.
func unitsName(sys units.System) string {
	switch sys {
	case units.Feet:
		return "feet (international foot, 0.3048 m)"
	case units.USFeet:
		return "US survey feet (1200/3937 m)"
	}
	return "metres"
}

// toUserLength converts metres to the length unit of sys.
func toUserLength(m float64, sys units.System) float64 { return m / sys.Metres() }

// fixed formats v with exactly dec decimals, writing negative zero as zero
// so that "-0.00" never appears.
func fixed(v float64, dec int) string {
	s := strconv.FormatFloat(v, 'f', dec, 64)
	if strings.HasPrefix(s, "-") && strings.Trim(s[1:], "0.") == "" {
		return s[1:]
	}
	return s
}

// fmtLevel formats an elevation (m) in the units of sys with two decimals
// and the unit, e.g. "101.25 ft".
func fmtLevel(m float64, sys units.System) string {
	return fixed(toUserLength(m, sys), 2) + " " + lengthUnit(sys)
}

// fmtLevelLabel formats a contour level (m) for a label on the line: the
// shortest of 0, 1 or 2 decimals that shows the level to 0.01 of the unit.
func fmtLevelLabel(m float64, sys units.System) string {
	v := math.Round(toUserLength(m, sys)*100) / 100
	return trimNum(v, 2)
}

// fmtDepth formats a depth or height (m) in sys with two decimals and the
// unit, e.g. "0.75 ft".
func fmtDepth(m float64, sys units.System) string {
	return fixed(toUserLength(m, sys), 2) + " " + lengthUnit(sys)
}
