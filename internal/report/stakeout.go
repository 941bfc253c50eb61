package report

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"strings"
)

// StakeoutRow is one line of the cut sheet: a grade stake with its world
// coordinates, the existing and finished elevations there, and the cut or
// fill, all in the output's length unit (the caller converts). CutFill is
// Finished − Existing: negative is cut (dig), positive is fill.
type StakeoutRow struct {
	ID                 string
	Easting, Northing  float64
	Existing, Finished float64
	CutFill            float64
	Note               string
}

// stakeoutDecimals is the decimals of every number on the cut sheet: 0.001
// of a foot or metre, finer than a grade stake is set (about 0.01 ft or
// 5 mm, common practice, no source), so rounding never shows.
const stakeoutDecimals = 3

// ErrUnitsLabel is returned by [WriteStakeoutCSV] for a units label that is
// empty or not a plain word.
var ErrUnitsLabel = errors.New("report: units label must be a short word of letters, e.g. ft, usft or m")

// WriteStakeoutCSV writes rows as CSV (RFC 4180 quoting, "\n" line ends)
// with the header
//
//	id,easting_<u>,northing_<u>,existing_<u>,finished_<u>,cut_fill_<u>,cut_or_fill,note
//
// where <u> is unitsLabel (e.g. "ft", "usft", "m"). Rows are written in the
// order given, which is the order a crew walks them (the water's edge, then
// each zone's floor edge, then the toe or daylight line). Numbers have [stakeoutDecimals] decimals;
// cut_or_fill is "cut", "fill" or "grade" (no change at that precision).
//
// It returns [ErrUnitsLabel] for a bad label, a [*ValueError] naming the row
// for a non-finite number, and any error of w.
func WriteStakeoutCSV(w io.Writer, rows []StakeoutRow, unitsLabel string) error {
	if unitsLabel == "" || len(unitsLabel) > 8 || strings.IndexFunc(unitsLabel, func(r rune) bool {
		return !(r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z')
	}) >= 0 {
		return fmt.Errorf("%w, got %q", ErrUnitsLabel, unitsLabel)
	}
	for i, r := range rows {
		for _, f := range []struct {
			name string
			v    float64
		}{{"easting", r.Easting}, {"northing", r.Northing}, {"existing", r.Existing}, {"finished", r.Finished}, {"cut/fill", r.CutFill}} {
			if err := finite(fmt.Sprintf("stake-out row %d (%s)", i, r.ID), f.name, f.v); err != nil {
				return err
			}
		}
	}
	cw := csv.NewWriter(w)
	u := unitsLabel
	header := []string{"id", "easting_" + u, "northing_" + u, "existing_" + u, "finished_" + u, "cut_fill_" + u, "cut_or_fill", "note"}
	if err := cw.Write(header); err != nil {
		return err
	}
	for _, r := range rows {
		rec := []string{
			csvText(r.ID),
			fixed(r.Easting, stakeoutDecimals),
			fixed(r.Northing, stakeoutDecimals),
			fixed(r.Existing, stakeoutDecimals),
			fixed(r.Finished, stakeoutDecimals),
			fixed(r.CutFill, stakeoutDecimals),
			cutOrFill(r.CutFill),
			csvText(r.Note),
		}
		if err := cw.Write(rec); err != nil {
			return err
		}
	}
	cw.Flush()
	return cw.Error()
}

// cutOrFill names the action at a stake from its rounded cut/fill.
func cutOrFill(v float64) string {
	s := fixed(v, stakeoutDecimals)
	switch {
	case strings.Trim(s, "-0.") == "":
		return "grade"
	case v < 0:
		return "cut"
	}
	return "fill"
}

// csvText makes free text safe in a CSV cell: invalid UTF-8 and control
// characters are replaced as in [xmlSanitize] (line breaks become spaces, so
// every record is one line), and a cell that a spreadsheet would take for a
// formula (starting with =, +, -, @, or a tab or carriage return) gets a
// leading apostrophe, as the OWASP "CSV Injection" page advises (from
// memory). A stake ID such as "-1" therefore reads "'-1".
func csvText(s string) string {
	s = xmlSanitize(s)
	if s != "" && strings.ContainsRune("=+-@", rune(s[0])) {
		return "'" + s
	}
	return s
}
