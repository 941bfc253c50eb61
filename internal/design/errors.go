package design

import (
	"errors"
	"fmt"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// Sentinel errors; the functions of this package wrap them, so callers test
// with errors.Is.
var (
	// ErrZone reports a zone outline, depth, slope or corner option that
	// cannot be built.
	ErrZone = errors.New("design: invalid zone")
	// ErrParams reports a design parameter out of range.
	ErrParams = errors.New("design: invalid parameter")
	// ErrOffSurvey reports earthwork that needs ground beyond the surveyed
	// surface (see [*OffSurveyError]).
	ErrOffSurvey = errors.New("design: the earthwork runs off the surveyed surface")
	// ErrNoBalance reports a balance water level that cannot be found.
	ErrNoBalance = errors.New("design: no water level balances cut and fill")
	// ErrOffset reports an inward offset of an outline that vanishes.
	ErrOffset = errors.New("design: inward offset vanishes")
	// ErrGeoJSON reports a zone file that is not the GeoJSON this package
	// reads.
	ErrGeoJSON = errors.New("design: invalid zone file")
)

// ZoneError locates a problem in one zone of a design.
type ZoneError struct {
	Index int    // position in Params.Zones (0-based)
	Name  string // the zone's name, if any
	Err   error
}

// Error returns the zone's index and name with the problem.
func (e *ZoneError) Error() string {
	if e.Name != "" {
		return fmt.Sprintf("zone %d %q: %v", e.Index, e.Name, e.Err)
	}
	return fmt.Sprintf("zone %d: %v", e.Index, e.Err)
}

// Unwrap returns the underlying error.
func (e *ZoneError) Unwrap() error { return e.Err }

// FeatureError locates a problem in one feature of a GeoJSON zone file.
type FeatureError struct {
	File    string // the name passed to ReadZonesGeoJSON
	Feature int    // index in the "features" array (0-based)
	Name    string // the feature's "name" property, if any
	Err     error
}

// Error returns the file, feature index and name with the problem.
func (e *FeatureError) Error() string {
	loc := fmt.Sprintf("%s: features[%d]", e.File, e.Feature)
	if e.Name != "" {
		loc += fmt.Sprintf(" %q", e.Name)
	}
	return loc + ": " + e.Err.Error()
}

// Unwrap returns the underlying error.
func (e *FeatureError) Unwrap() error { return e.Err }

// OffSurveyError says how far the earthwork would need ground beyond the
// surveyed surface.
type OffSurveyError struct {
	// BeyondM is the largest distance, in metres, from a point that needs
	// ground to the nearest surveyed point of the work area.
	BeyondM float64
	// Box bounds the unsurveyed points that need ground (local frame, m).
	Box geom.Box
	// InBowl reports whether part of the bowl itself (below the rim) is
	// unsurveyed, not just a wall or berm outside it.
	InBowl bool
}

// Error says what needs ground, how far beyond the survey and where.
func (e *OffSurveyError) Error() string {
	what := "the walls or berm"
	if e.InBowl {
		what = "the pond itself"
	}
	return fmt.Sprintf("%v: %s need ground up to %.2f m beyond the survey (x %.2f to %.2f m, y %.2f to %.2f m in the local frame); survey farther out or move the pond",
		ErrOffSurvey, what, e.BeyondM, e.Box.Min.X, e.Box.Max.X, e.Box.Min.Y, e.Box.Max.Y)
}

// Unwrap returns [ErrOffSurvey].
func (e *OffSurveyError) Unwrap() error { return ErrOffSurvey }
