package survey

import (
	"github.com/dugout-estimating/dugout/internal/crs"
	"github.com/dugout-estimating/dugout/internal/las"
	"github.com/dugout-estimating/dugout/internal/units"
)

// Default tolerances (see [Options]).
const (
	// DefaultDupTolM is the plan distance within which two shots count as
	// the same ground point: 1 cm, about the centring error of a prism pole
	// on a bipod (common practice, no source).
	DefaultDupTolM = 0.01
	// DefaultConflictTolM is the elevation difference beyond which two
	// shots of the same ground point conflict: 5 cm, beyond the few
	// millimetres of a total-station height and the 2–3 cm of RTK GNSS, so a
	// conflict is a blunder (rod on a stake or in a hole), not noise
	// (common practice, no source).
	DefaultConflictTolM = 0.05
)

// Size limits for text input. A survey of a garden pond has hundreds of
// points and a LiDAR tile millions; text beyond these limits is almost
// certainly the wrong file.
const (
	// MaxTextBytes is the largest text file (CSV, GeoJSON, GPX) read: 1 GiB.
	MaxTextBytes = 1 << 30
	// MaxLineBytes is the longest line of a delimited file: 1 MiB.
	MaxLineBytes = 1 << 20
)

// MaxCoordM bounds the magnitude of a world coordinate or elevation, in
// metres: 1e8 m, two and a half times round the Earth. Every real grid
// (UTM northings reach 1e7 m, state-plane feet about 1e7 ft) stays far
// inside, and the bound keeps sums of coordinates, such as the centre of the
// bounds, from overflowing.
const MaxCoordM = 1e8

// Options says how to read survey files. The zero value reads metres with
// --crs auto, the default breakline code "BL" and the default tolerances,
// and rejects points without elevations.
type Options struct {
	// Units is how input coordinates are measured. It does not apply to
	// lon/lat degrees, nor to GPX and GeoJSON altitudes (metres by their
	// specifications), nor to a LAS file whose header states its unit.
	Units units.System
	// CRS is local, EPSG:NNNN or auto. Auto (also the zero Spec) projects
	// lon/lat into the WGS 84 UTM zone of the site's centre and leaves
	// projected input as it is.
	CRS crs.Spec
	// Columns gives the column order of a headerless delimited file, in
	// letters P (point id), N (northing), E (easting), Z (elevation) and D
	// (description): "PNEZD", "PENZD", "NEZ", "ENZ", "PNEZ", "PENZ" and the
	// like. It is required for such a file, since P,N,E and P,E,N orders
	// cannot be told apart from the numbers.
	Columns string
	// BreaklineCodes are the codes whose points are joined into breaklines
	// (case-insensitive; a numeric suffix makes separate strings, see
	// docs/input-formats.md). Nil means {"BL"}; an empty non-nil slice
	// means none.
	BreaklineCodes []string
	// DupTolM is the plan distance within which shots are duplicates
	// (default [DefaultDupTolM]); ConflictTolM the elevation difference
	// beyond which such duplicates conflict (default
	// [DefaultConflictTolM]). Negative values are treated as zero.
	DupTolM, ConflictTolM float64
	// AllowMissingZ keeps points without elevation (Z is NaN), counted
	// and warned about, instead of failing with [ErrNoElevation]. It is
	// meant for checking a file; surfaces and volumes need elevations.
	AllowMissingZ bool
	// LAS is passed to the LAS reader, except that LAS.ThinCell is given
	// in metres here and converted to each file's horizontal unit (from its
	// header, else its EPSG code, else Units).
	LAS las.Options
	// Progress, when set, is called now and then during long reads with
	// the bytes (or points) done and the total.
	Progress func(done, total int64)
}

func (o Options) withDefaults() Options {
	if o.BreaklineCodes == nil {
		o.BreaklineCodes = []string{"BL"}
	}
	if o.DupTolM == 0 {
		o.DupTolM = DefaultDupTolM
	}
	if o.ConflictTolM == 0 {
		o.ConflictTolM = DefaultConflictTolM
	}
	o.DupTolM = max(o.DupTolM, 0)
	o.ConflictTolM = max(o.ConflictTolM, 0)
	return o
}
