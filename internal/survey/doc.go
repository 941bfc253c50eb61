// Package survey reads a contractor's survey into one point model: total
// station and other delimited text exports, phone or handheld GPS (lon/lat
// CSV, GPX 1.1, GeoJSON RFC 7946), laser-level rod readings kept in a level
// book, and LiDAR (ASPRS LAS, through package las). It validates what it
// reads and collects non-fatal findings as warnings.
//
// Coordinate model: every [Point], [Line] and [Polygon] is in the local
// working frame ([geom.Frame]), in metres, x east, y north, z up. World
// coordinates are the projected coordinates of the survey in metres: the
// file's own grid (a total-station frame, a state-plane or UTM zone), or the
// WGS 84 UTM zone that lon/lat input was projected into. The frame origin is
// the centre of the world bounds rounded to a whole metre, so local values
// stay small and exact; [Set.WorldPos] and [WriteCSV] add it back.
//
// Units: input lengths are read in [Options.Units] (metres, international
// feet or US survey feet) unless the format fixes them (GPX and GeoJSON
// altitudes are metres; a LAS header states its own), and converted to
// metres at once with the exact factors of package units.
//
// Errors are *[ParseError] values naming the file, line and field, wrapping
// one of the sentinels below ([ErrSyntax], [ErrNonFinite], ...), so callers
// can use errors.Is and errors.As. The package never prints.
package survey
