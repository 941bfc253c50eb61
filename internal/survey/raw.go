package survey

import (
	"fmt"
	"math"

	"github.com/dugout-estimating/dugout/internal/crs"
	"github.com/dugout-estimating/dugout/internal/units"
)

// rawFile is one file as read, before coordinate systems are resolved:
// positions are in the file's own terms (lon/lat degrees, or projected
// coordinates in file units).
type rawFile struct {
	info FileInfo
	// geographic: x is longitude and y latitude in degrees.
	geographic bool
	// statedCRS is the coordinate system the file itself names (a LAS
	// header, a GeoJSON "crs" member); nil when it names none.
	statedCRS *crs.CRS
	// hUnitM and vUnitM are metres per coordinate and elevation unit.
	hUnitM, vUnitM float64
	// unitSys is the unit system the file's lengths were read in; ok is
	// false when the file's unit matches none (an odd LAS header).
	unitSys   units.System
	unitSysOK bool
	pts       []rawPoint
	lines     []rawLine
	polys     []rawPoly
	warnings  []Warning
}

type rawPoint struct {
	id         string
	explicitID bool
	x, y, z    float64 // z NaN when missing
	code       string
	hacc, vacc float64 // metres, NaN when missing
	line       int
}

type rawLine struct {
	name, code string
	pts        [][3]float64
	line       int
}

type rawPoly struct {
	name    string
	ring    [][2]float64
	feature int
}

func (f *rawFile) warn(line int, format string, args ...any) {
	f.warnings = append(f.warnings, warnf(f.info.Path, line, format, args...))
}

// newRaw returns a rawFile read in the unit system sys.
func newRaw(path string, format Format, sys units.System) *rawFile {
	return &rawFile{
		info:   FileInfo{Path: path, Format: format},
		hUnitM: sys.Metres(), vUnitM: sys.Metres(),
		unitSys: sys, unitSysOK: true,
	}
}

var nan = math.NaN()

// missingZ applies the elevation policy to a file whose points lack
// elevations: an error naming the first one, unless allowed, in which case
// a warning counting them.
func (f *rawFile) missingZ(opt *Options, why string) error {
	n, first := 0, 0
	for _, p := range f.pts {
		if math.IsNaN(p.z) {
			if n == 0 {
				first = p.line
			}
			n++
		}
	}
	for _, l := range f.lines {
		for _, q := range l.pts {
			if math.IsNaN(q[2]) {
				if n == 0 {
					first = l.line
				}
				n++
				break
			}
		}
	}
	f.info.MissingZ = n
	if n == 0 {
		return nil
	}
	if !opt.AllowMissingZ {
		return perr(f.info.Path, first, "", ErrNoElevation, "%s: elevations are needed to build a surface", why)
	}
	what := plural(n, "point") + " have"
	if n == 1 {
		what = "1 point has"
	}
	f.warn(first, "%s no elevation (%s): kept in plan only; surfaces and volumes need elevations", what, why)
	return nil
}

func warnf(file string, line int, format string, args ...any) Warning {
	return Warning{File: file, Line: line, Msg: fmt.Sprintf(format, args...)}
}
