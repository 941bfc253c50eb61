package report

import (
	"encoding/csv"
	"io"
	"math"
	"strings"

	"github.com/dugout-estimating/dugout/internal/estimate"
)

// jobCSVExtraDecimals is how many decimals quantities.csv writes beyond
// those printed in the summary and the report: two more, so a spreadsheet
// that adds rows up does not compound the rounding of the printed figures
// (a cubic yard to 0.001, a gallon to 0.01), while the file stays
// readable and its digits do not depend on round-off.
const jobCSVExtraDecimals = 2

// WriteQuantitiesCSV writes every quantity of the estimate r as CSV (RFC
// 4180 quoting, "\n" line ends), one row per quantity with the header
//
//	section,item,value,unit,metric_value,metric_unit,note
//
// value and unit are in the job's units (US customary for feet users, the
// same as metric_value otherwise), metric_value in the SI unit it is printed
// in (m, m², m³, L, t, kg ...). A dimension such as a sheet's length ×
// width gives one row per side, its item naming the side. Counts, hours,
// angles and amounts have the same value in both columns. Numbers are
// written with [jobCSVExtraDecimals] more decimals than the summary prints,
// so the file is deterministic. Rows come in the order of the summary; the
// cost section is there only when the job is priced.
//
// It returns an error wrapping [ErrInvalidValue] for an incomplete result
// and any error of w.
func WriteQuantitiesCSV(w io.Writer, r *estimate.Result) error {
	v, err := newJobView(r)
	if err != nil {
		return err
	}
	cw := csv.NewWriter(w)
	if err := cw.Write([]string{"section", "item", "value", "unit", "metric_value", "metric_unit", "note"}); err != nil {
		return err
	}
	for _, s := range v.sections {
		for i := range s.lines {
			l := &s.lines[i]
			if l.kind == jkText {
				continue
			}
			for k, val := range l.vals {
				item := l.label
				if len(l.vals) > 1 && k < len(l.parts) {
					// "Smallest sheet (length × width)" gives
					// "Smallest sheet, length" and "Smallest sheet,
					// width".
					if i := strings.LastIndex(item, " ("); i > 0 && strings.HasSuffix(item, ")") {
						item = item[:i]
					}
					item += ", " + l.parts[k]
				}
				var first, metric quantityUnit
				var unit, mUnit string
				switch l.kind {
				case jkCount, jkNumber:
					dec := l.dec
					if l.kind == jkNumber && !l.money {
						dec += jobCSVExtraDecimals
					}
					first = quantityUnit{si: 1, dec: dec}
					metric = first
					unit, mUnit = l.unit, l.unit
				default:
					first, _, _ = jobUnits(l.kind, v.sys)
					metric = jobKindUnits[l.kind][1]
					first.dec += jobCSVExtraDecimals
					metric.dec += jobCSVExtraDecimals
					unit, mUnit = first.symbol, metric.symbol
				}
				rec := []string{s.key, csvText(item), csvNumber(val, first), unit, csvNumber(val, metric), mUnit, csvText(l.note)}
				if err := cw.Write(rec); err != nil {
					return err
				}
			}
		}
	}
	cw.Flush()
	return cw.Error()
}

// csvNumber writes v in unit u without digit grouping, "" when not finite.
func csvNumber(v float64, u quantityUnit) string {
	x := v / u.si
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return ""
	}
	return fixed(x, u.dec)
}
