package survey

import (
	"math"
	"strconv"
	"strings"

	"github.com/dugout-estimating/dugout/internal/units"
)

// parseNum parses one numeric field. An empty field, NaN, infinities,
// overflow, hexadecimal and underscores are errors naming file, line and
// field; a decimal comma gets a hint.
func parseNum(file string, line int, field, s string) (float64, error) {
	t := strings.TrimSpace(s)
	if t == "" {
		return 0, perr(file, line, field, ErrSyntax, "no value")
	}
	v, err := units.ParseNumber(t)
	if err == nil {
		return v, nil
	}
	switch l := strings.ToLower(strings.TrimLeft(t, "+-")); l {
	case "nan", "inf", "infinity":
		return 0, perr(file, line, field, ErrNonFinite, "%q", t)
	}
	if f, perr2 := strconv.ParseFloat(t, 64); perr2 != nil && (math.IsInf(f, 0)) {
		return 0, perr(file, line, field, ErrNonFinite, "%q overflows a 64-bit float", t)
	}
	if strings.Count(t, ",") == 1 && !strings.Contains(t, ".") {
		if _, err := units.ParseNumber(strings.Replace(t, ",", ".", 1)); err == nil {
			return 0, perr(file, line, field, ErrSyntax, "%q has a decimal comma: write it with a point", t)
		}
	}
	return 0, perr(file, line, field, ErrSyntax, "%q is not a number", t)
}

// parseOptNum is parseNum for a field that may be empty (NaN then).
func parseOptNum(file string, line int, field, s string) (float64, error) {
	if strings.TrimSpace(s) == "" {
		return nan, nil
	}
	return parseNum(file, line, field, s)
}

// isNumber reports whether s is a plain finite number.
func isNumber(s string) bool {
	_, err := units.ParseNumber(strings.TrimSpace(s))
	return err == nil
}

// checkLonLat validates a geographic position: latitude within ±90°,
// longitude within ±180°. The error says when the two look swapped.
func checkLonLat(file string, line int, lon, lat float64) error {
	if math.Abs(lat) > 90 {
		hint := ""
		if math.Abs(lon) <= 90 && math.Abs(lat) <= 180 {
			hint = " (longitude " + fmtNum(lon) + " would be a valid latitude: are latitude and longitude swapped?)"
		}
		return perr(file, line, "latitude", ErrRange, "%s is outside [-90, 90]%s", fmtNum(lat), hint)
	}
	if math.Abs(lon) > 180 {
		return perr(file, line, "longitude", ErrRange, "%s is outside [-180, 180]", fmtNum(lon))
	}
	return nil
}

func fmtNum(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }
