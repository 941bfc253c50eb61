package tin

import (
	"errors"
	"fmt"
	"math"
	"strings"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// Sentinel errors. Errors returned by this package wrap one of these; use
// [errors.Is] to test for them and [errors.As] for the typed errors below,
// which carry the offending values.
var (
	// ErrTooFewPoints: fewer than three distinct plan positions.
	ErrTooFewPoints = errors.New("tin: fewer than 3 distinct points")
	// ErrCollinear: all distinct points lie on one line, so there is no
	// surface.
	ErrCollinear = errors.New("tin: all points lie on one line")
	// ErrTooManyPoints: more points than [MaxPoints].
	ErrTooManyPoints = errors.New("tin: too many points")
	// ErrNonFinite: a coordinate is NaN or infinite.
	ErrNonFinite = errors.New("non-finite coordinate")
	// ErrCoordinateRange: a plan coordinate is larger in magnitude than
	// [MaxCoordM] (the input cannot be in a local frame) or non-zero and
	// smaller than [MinCoordM].
	ErrCoordinateRange = errors.New("coordinate out of range")
	// ErrDuplicateConflict: under [DupError], duplicate points whose
	// elevations differ by more than the conflict tolerance.
	ErrDuplicateConflict = errors.New("tin: duplicate points with conflicting elevations")
	// ErrBreakline: a breakline is unusable (too few vertices, non-finite).
	ErrBreakline = errors.New("invalid breakline")
	// ErrBreaklineOutside: a breakline leaves the surveyed area.
	ErrBreaklineOutside = errors.New("breakline leaves the surveyed area")
	// ErrBoundary: a boundary polygon is unusable (fewer than 3 vertices,
	// zero area, non-finite).
	ErrBoundary = errors.New("invalid boundary polygon")
	// ErrBoundarySelfIntersect: a boundary polygon crosses or touches
	// itself.
	ErrBoundarySelfIntersect = errors.New("boundary polygon intersects itself")
	// ErrEmptySurface: trimming removed every triangle.
	ErrEmptySurface = errors.New("tin: trimming leaves no surface")
	// ErrOption: an option value is out of range.
	ErrOption = errors.New("tin: invalid option")
	// ErrConstraint: a constraint could not be inserted (too many nested
	// crossings, which only happens with pathological input).
	ErrConstraint = errors.New("tin: constraint insertion did not converge")
	// ErrMesh: a mesh given to [FromMesh] is not a valid 2-manifold
	// triangulation.
	ErrMesh = errors.New("tin: invalid mesh")
	// ErrInvalid: [Surface.Validate] found a broken invariant.
	ErrInvalid = errors.New("tin: invalid surface")
)

// MaxPoints is the largest number of input points plus breakline vertices
// that [Build] accepts. Vertex and half-edge indices are int32 and a
// triangulation of n points has up to 6n half-edges, so the hard limit is
// about 3.5e8; 1e8 leaves room for constraint vertices and is far beyond
// any survey.
const MaxPoints = 100_000_000

// MaxCoordM bounds the magnitude of plan coordinates, in metres. The exact
// predicates multiply up to four coordinate differences (the incircle
// determinant), so coordinates below 1e15 keep every product under 1e62, far
// from float64 overflow; real coordinates, even unshifted world ones (UTM
// northings near 1e7 m), are far smaller.
const MaxCoordM = 1e15

// MinCoordM is the smallest non-zero magnitude of a plan coordinate, in
// metres: below it the exact predicates' products could underflow (package
// robust's domain is zero or 1e-50 to 1e50). No survey coordinate is that
// small; such values only come from arithmetic noise.
const MinCoordM = 1e-50

// coordOK reports whether c is zero or within [MinCoordM, MaxCoordM] in
// magnitude.
func coordOK(c float64) bool {
	a := math.Abs(c)
	return a == 0 || (a >= MinCoordM && a <= MaxCoordM)
}

// PointError reports a problem with input point Index (0-based).
type PointError struct {
	Index int
	P     geom.Vec3
	Err   error
}

// Error names the point, its coordinates and the problem.
func (e *PointError) Error() string {
	return fmt.Sprintf("tin: point %d (%g, %g, %g): %v", e.Index, e.P.X, e.P.Y, e.P.Z, e.Err)
}

// Unwrap returns the underlying error.
func (e *PointError) Unwrap() error { return e.Err }

// DuplicateError reports a duplicate group whose elevations conflict under
// [DupError]: the input indices of its points, their position, elevation
// range and the tolerance.
type DuplicateError struct {
	Indices    []int
	At         geom.Vec2
	ZMinM      float64
	ZMaxM      float64
	TolM       float64
	Breaklines []string // names of breaklines with a vertex in the group
}

// Error names the position, the elevation spread and the points.
func (e *DuplicateError) Error() string {
	var b strings.Builder
	fmt.Fprintf(&b, "tin: duplicate points at (%g, %g) differ in elevation by %.4g m (%g to %g m, conflict tolerance %g m): points", e.At.X, e.At.Y, e.ZMaxM-e.ZMinM, e.ZMinM, e.ZMaxM, e.TolM)
	for i, ix := range e.Indices {
		if i == 10 {
			fmt.Fprintf(&b, " and %d more", len(e.Indices)-10)
			break
		}
		fmt.Fprintf(&b, " %d", ix)
	}
	if len(e.Breaklines) > 0 {
		fmt.Fprintf(&b, ", breaklines %s", strings.Join(e.Breaklines, ", "))
	}
	return b.String()
}

// Unwrap returns [ErrDuplicateConflict].
func (e *DuplicateError) Unwrap() error { return ErrDuplicateConflict }

// BreaklineError reports a problem with breakline Index (0-based in
// [Options.Breaklines]) named Name, at its vertex Vertex (-1 when it concerns
// the whole line). DistM is how far the vertex lies outside the surveyed
// area, for [ErrBreaklineOutside].
type BreaklineError struct {
	Index  int
	Name   string
	Vertex int
	DistM  float64
	Err    error
}

// Error names the breakline, the vertex and the problem (with the distance
// outside the surveyed area for ErrBreaklineOutside).
func (e *BreaklineError) Error() string {
	switch {
	case errors.Is(e.Err, ErrBreaklineOutside):
		return fmt.Sprintf("tin: breakline %q (%d): vertex %d lies %.3f m outside the convex hull of the survey points", e.Name, e.Index, e.Vertex, e.DistM)
	case e.Vertex >= 0:
		return fmt.Sprintf("tin: breakline %q (%d): vertex %d: %v", e.Name, e.Index, e.Vertex, e.Err)
	}
	return fmt.Sprintf("tin: breakline %q (%d): %v", e.Name, e.Index, e.Err)
}

// Unwrap returns the underlying error.
func (e *BreaklineError) Unwrap() error { return e.Err }

// BoundaryError reports a problem with boundary ring Ring (0-based in
// [Options.Boundary]); EdgeA and EdgeB are the indices of two edges that
// intersect (edge i runs from vertex i to vertex i+1, cyclically), or -1.
type BoundaryError struct {
	Ring  int
	EdgeA int
	EdgeB int
	Msg   string
	Err   error
}

// Error names the ring and the intersecting edges or the problem.
func (e *BoundaryError) Error() string {
	if e.EdgeA >= 0 {
		return fmt.Sprintf("tin: boundary %d: edges %d and %d intersect: %v", e.Ring, e.EdgeA, e.EdgeB, e.Err)
	}
	return fmt.Sprintf("tin: boundary %d: %s: %v", e.Ring, e.Msg, e.Err)
}

// Unwrap returns the underlying error.
func (e *BoundaryError) Unwrap() error { return e.Err }

// OptionError reports an option with an invalid value.
type OptionError struct {
	Name  string
	Value float64
}

// Error names the option and its value.
func (e *OptionError) Error() string {
	return fmt.Sprintf("tin: option %s must be a finite number >= 0, got %g", e.Name, e.Value)
}

// Unwrap returns [ErrOption].
func (e *OptionError) Unwrap() error { return ErrOption }

// MeshError reports why a mesh given to [FromMesh] was refused, at triangle
// Triangle (or -1) and vertex Vertex (or -1).
type MeshError struct {
	Triangle int
	Vertex   int
	Msg      string
}

// Error names the triangle or vertex and the problem.
func (e *MeshError) Error() string {
	switch {
	case e.Triangle >= 0:
		return fmt.Sprintf("tin: invalid mesh: triangle %d: %s", e.Triangle, e.Msg)
	case e.Vertex >= 0:
		return fmt.Sprintf("tin: invalid mesh: vertex %d: %s", e.Vertex, e.Msg)
	}
	return "tin: invalid mesh: " + e.Msg
}

// Unwrap returns [ErrMesh].
func (e *MeshError) Unwrap() error { return ErrMesh }

// invalidf returns an error wrapping [ErrInvalid].
func invalidf(format string, args ...any) error {
	return fmt.Errorf("%w: "+format, append([]any{ErrInvalid}, args...)...)
}
