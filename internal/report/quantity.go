package report

import (
	"math"
	"strconv"
	"strings"

	"github.com/dugout-estimating/dugout/internal/units"
)

// Row is one labelled value of a report table, already written out: Value
// and Unit in the report's first system (US customary for feet users,
// metric for metric users), Alt the same quantity in the other system with
// its unit ("" when it has none), and an optional Note. [QuantityRow] fills
// one from an SI value; any other row (a count, a price, a crew size) is
// written directly.
type Row struct {
	Label string
	Value string
	Unit  string
	Alt   string
	Note  string
}

// Quantity says what kind of SI value a [QuantityRow] or [Comparison] holds,
// and so which units and decimals it is written with.
type Quantity int

// The kinds of quantity, with the SI unit of the value and the units
// written (US customary / metric):
const (
	Number      Quantity = iota // a plain number, written with 2 decimals and no unit
	Length                      // m: ft (1 decimal) / m (2 decimals)
	Elevation                   // m: ft (2 decimals) / m (3 decimals)
	ShortLength                 // m: in (1 decimal) / mm (0 decimals); overlaps, layer depths
	Area                        // m²: ft² (0 decimals) / m² (1 decimal)
	Volume                      // m³: yd³ (1 decimal) / m³ (2 decimals); earthwork, gravel
	WaterVolume                 // m³: US gal (0 decimals) / L (0 decimals)
	Mass                        // kg: short tons (2 decimals) / t (2 decimals)
	Flow                        // m³/s: US gal/h (0 decimals) / L/h (0 decimals)
)

// quantityUnit is one way of writing a quantity: the SI amount of one unit,
// its symbol and the decimals shown.
type quantityUnit struct {
	si     float64
	symbol string
	dec    int
}

// quantityUnits holds, for each Quantity, the US customary and the metric
// way of writing it. Factors are the exact ones of package units.
var quantityUnits = map[Quantity][2]quantityUnit{
	Number:      {{1, "", 2}, {1, "", 2}},
	Length:      {{units.Foot, "ft", 1}, {units.Metre, "m", 2}},
	Elevation:   {{units.Foot, "ft", 2}, {units.Metre, "m", 3}},
	ShortLength: {{units.Inch, "in", 1}, {units.Millimetre, "mm", 0}},
	Area:        {{units.SquareFoot, "ft²", 0}, {1, "m²", 1}},
	Volume:      {{units.CubicYard, "yd³", 1}, {1, "m³", 2}},
	WaterVolume: {{units.USGallon, "US gal", 0}, {units.Litre, "L", 0}},
	Mass:        {{units.ShortTon, "short tons", 2}, {units.Tonne, "t", 2}},
	Flow:        {{units.GallonPerHour, "US gal/h", 0}, {units.Litre / 3600, "L/h", 0}},
}

// usUnits returns the US customary unit of q for sys; lengths and
// elevations use the US survey foot when sys does, so that they agree with
// the survey's coordinates.
func usUnits(q Quantity, sys units.System) quantityUnit {
	u := quantityUnits[q][0]
	if sys == units.USFeet && (q == Length || q == Elevation) {
		u.si = units.USSurveyFoot
		u.symbol = "ft (US survey)"
	}
	return u
}

// QuantityRow writes an SI value as a [Row]: for feet users (sys Feet or
// USFeet) the US customary amount first and the metric one in Alt, for
// metric users the other way round. A NaN value is written "—" (not
// computed); ±Inf likewise.
func QuantityRow(label string, si float64, q Quantity, sys units.System, note string) Row {
	us, metric := usUnits(q, sys), quantityUnits[q][1]
	first, second := metric, us
	if sys.IsImperial() {
		first, second = us, metric
	}
	r := Row{Label: label, Unit: first.symbol, Note: note}
	if math.IsNaN(si) || math.IsInf(si, 0) {
		r.Value = "—"
		return r
	}
	r.Value = groupDigits(fixed(si/first.si, first.dec), sys)
	if q != Number {
		r.Alt = groupDigits(fixed(si/second.si, second.dec), sys) + " " + second.symbol
	}
	return r
}

// groupDigits inserts thousands separators in a formatted number: a comma
// for feet users (US practice), a narrow no-break space for metric users
// (the SI Brochure, 9th ed. (2019) §5.4.4, asks for a thin space and never a
// comma or point; from memory). Numbers under 10 000 in metric are left
// ungrouped, as the SI Brochure allows for four-digit numbers.
func groupDigits(s string, sys units.System) string {
	sign := ""
	if strings.HasPrefix(s, "-") {
		sign, s = "−", s[1:] // a true minus sign
	}
	intPart, frac := s, ""
	if i := strings.IndexByte(s, '.'); i >= 0 {
		intPart, frac = s[:i], s[i:]
	}
	sep := ","
	if !sys.IsImperial() {
		sep = "\u202f"
		if len(intPart) <= 4 {
			return sign + s
		}
	}
	if len(intPart) <= 3 {
		return sign + s
	}
	var b strings.Builder
	head := len(intPart) % 3
	if head > 0 {
		b.WriteString(intPart[:head])
	}
	for i := head; i < len(intPart); i += 3 {
		if b.Len() > 0 {
			b.WriteString(sep)
		}
		b.WriteString(intPart[i : i+3])
	}
	return sign + b.String() + frac
}

// Comparison sets a measured quantity beside the trade's rule of thumb for
// it, both as SI values of kind Quantity; the report prints both and the
// difference in per cent of the rule.
type Comparison struct {
	Label    string
	Quantity Quantity
	Measured float64 // SI
	Rule     float64 // SI
	RuleText string  // the rule used, e.g. "L + 2·depth + 2·overlap"
	Note     string
}

// DifferencePercent returns (Measured − Rule) / Rule × 100, and false when
// Rule is zero or either value is not finite.
func (c Comparison) DifferencePercent() (float64, bool) {
	if c.Rule == 0 || math.IsNaN(c.Measured) || math.IsNaN(c.Rule) || math.IsInf(c.Measured, 0) || math.IsInf(c.Rule, 0) {
		return 0, false
	}
	return (c.Measured - c.Rule) / c.Rule * 100, true
}

// fmtPercent writes a signed percentage with one decimal, e.g. "+12.5 %" or
// "−19.1 %" (the SI Brochure puts a space before %; from memory).
func fmtPercent(p float64) string {
	s := fixed(p, 1)
	switch {
	case strings.HasPrefix(s, "-"):
		s = "−" + s[1:]
	case s != "0.0":
		s = "+" + s
	}
	return s + "\u00a0%"
}

// Method says how one number of the report was computed and how accurate
// it is.
type Method struct {
	Quantity string
	How      string
	Accuracy string
}

// Caution is one safety or code caution: a short title, the text, and the
// rule it rests on (e.g. "OSHA 29 CFR 1926.651(b)").
type Caution struct {
	Title string
	Text  string
	Rule  string
}

// itoa is strconv.Itoa, kept short for the HTML writer.
func itoa(i int) string { return strconv.Itoa(i) }
