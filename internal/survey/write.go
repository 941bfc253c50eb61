package survey

import (
	"encoding/csv"
	"io"
	"strconv"

	"github.com/dugout-estimating/dugout/internal/units"
)

// WriteCSV writes the points of s in world coordinates of the set's
// coordinate system, in unit system out, as CSV with the header
// id,easting,northing,elevation,description. Numbers are written with the
// fewest digits that read back to the same float64, so reading the file
// with the same units and CRS gives the same points; a missing elevation is
// an empty field.
func WriteCSV(w io.Writer, s *Set, out units.System) error {
	cw := csv.NewWriter(w)
	_ = cw.Write([]string{"id", "easting", "northing", "elevation", "description"})
	num := func(v float64) string { return strconv.FormatFloat(v, 'f', -1, 64) }
	for _, p := range s.Points {
		x, y, z := s.WorldPos(p.P, out)
		zs := ""
		if p.HasZ() {
			zs = num(z)
		}
		// csv.Writer keeps its first error and reports it from Error.
		_ = cw.Write([]string{p.ID, num(x), num(y), zs, p.Code})
	}
	cw.Flush()
	return cw.Error()
}
