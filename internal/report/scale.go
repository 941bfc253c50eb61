package report

import (
	"math"
	"strconv"

	"github.com/dugout-estimating/dugout/internal/units"
)

// metricScales are the drawing-scale denominators offered to metric users:
// the 1, 2 and 5 series of ISO 5455 "Technical drawings — Scales" (from
// memory), plus 1:25, 1:250 and 1:2500, which site drawings use as well
// (common practice, no source).
var metricScales = []float64{
	10, 20, 25, 50, 100, 200, 250, 500, 1000, 2000, 2500, 5000, 10000, 20000, 50000,
}

// engineerFeetPerInch are the scales of an engineer's (civil) scale, written
// "1 in = N ft": the 10, 20, 30, 40, 50 and 60 divisions of the triangular
// engineer's scale and their multiples of ten (common practice, no source);
// 1 in = 5 ft and 8 ft are added for small yards. The scale is 1:(12·N).
var engineerFeetPerInch = []float64{
	5, 8, 10, 20, 30, 40, 50, 60, 80, 100, 200, 300, 400, 500, 600, 1000, 2000, 5000,
}

// standardScale returns the smallest standard scale denominator for sys that
// is at least need (the denominator at which the drawing just fits). Beyond
// the largest standard scale it returns need rounded up to a value of the
// form {1, 2, 2.5, 5} × 10^k.
func standardScale(need float64, sys units.System) float64 {
	if !(need > 0) || math.IsInf(need, 0) {
		need = 1
	}
	if sys.IsImperial() {
		for _, n := range engineerFeetPerInch {
			if 12*n >= need {
				return 12 * n
			}
		}
		return 12 * niceStep(need/12)
	}
	for _, d := range metricScales {
		if d >= need {
			return d
		}
	}
	return niceStep(need)
}

// scaleLabel writes a scale for the title block: "1:200" for metric
// drawings, and "1 in = 20 ft (1:240)" for feet when the denominator is a
// whole number of feet per inch. The ratio is the same for the international
// and the US survey foot, since the inch is a twelfth of either.
func scaleLabel(denom float64, sys units.System) string {
	ratio := "1:" + trimNum(denom, 1)
	if sys.IsImperial() {
		ftPerIn := denom / 12
		if ftPerIn >= 1 && ftPerIn == math.Round(ftPerIn) {
			return "1 in = " + strconv.FormatFloat(ftPerIn, 'f', 0, 64) + " ft (" + ratio + ")"
		}
	}
	return ratio
}

// trimNum formats v with at most dec decimals and no trailing zeros.
func trimNum(v float64, dec int) string {
	s := strconv.FormatFloat(v, 'f', dec, 64)
	for len(s) > 1 && dec > 0 && s[len(s)-1] == '0' {
		s = s[:len(s)-1]
	}
	if len(s) > 0 && s[len(s)-1] == '.' {
		s = s[:len(s)-1]
	}
	if s == "-0" {
		return "0"
	}
	return s
}

// niceTol is the relative slack of [niceStep] and [niceFloor]: an input
// within 1e-12 of a round value (round-off from a unit conversion) counts as
// that value. It only chooses label steps.
const niceTol = 1e-12

// niceFloor returns the largest value of the form {1, 2, 2.5, 5} × 10^k that
// is at most x (x > 0); it returns 1 for x ≤ 0 or non-finite x.
func niceFloor(x float64) float64 {
	if !(x > 0) || math.IsInf(x, 0) {
		return 1
	}
	e := math.Floor(math.Log10(x))
	base := math.Pow(10, e)
	best := base
	for _, m := range []float64{1, 2, 2.5, 5, 10} {
		if v := m * base; v <= x*(1+niceTol) {
			best = v
		}
	}
	return best
}
