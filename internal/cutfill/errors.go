package cutfill

import (
	"errors"
	"fmt"
	"strings"
)

// Sentinel errors. Callers test for them with errors.Is; the errors returned
// wrap them in an [*InputError], [*MeshError] or [*BoundaryError] carrying the
// offending value.
var (
	// ErrNegative is wrapped when a volume, area, depth or price is below 0.
	ErrNegative = errors.New("cutfill: must be >= 0")
	// ErrNotPositive is wrapped when a factor or capacity is not above 0.
	ErrNotPositive = errors.New("cutfill: must be > 0")
	// ErrNonFinite is wrapped when a number is NaN or infinite.
	ErrNonFinite = errors.New("cutfill: must be a finite number")
	// ErrHeapBelowStruck is wrapped when a truck's heaped capacity is below
	// its struck capacity.
	ErrHeapBelowStruck = errors.New("cutfill: heaped capacity must be >= struck capacity")
	// ErrUnknownSoil is wrapped by [SoilPreset] for a name it does not know.
	ErrUnknownSoil = errors.New("cutfill: unknown soil")
	// ErrUnknownTruck is wrapped by [TruckPreset] for a name it does not know.
	ErrUnknownTruck = errors.New("cutfill: unknown truck")

	// ErrBadIndex is wrapped when a mesh triangle refers to a vertex that does
	// not exist, or the index slice is not a whole number of triangles.
	ErrBadIndex = errors.New("cutfill: vertex index out of range")
	// ErrClockwise is wrapped when a mesh triangle is wound clockwise in plan
	// by more than round-off (the mesh folds over itself).
	ErrClockwise = errors.New("cutfill: triangle is clockwise")
	// ErrRingTooSmall is wrapped for a boundary ring with fewer than three
	// distinct vertices or zero area.
	ErrRingTooSmall = errors.New("cutfill: boundary ring needs 3 distinct vertices and a nonzero area")
	// ErrRingCrossing is wrapped when a boundary ring crosses or touches
	// itself or another ring.
	ErrRingCrossing = errors.New("cutfill: boundary rings cross")
	// ErrRingNested is wrapped when a boundary ring lies inside another
	// (holes are not supported).
	ErrRingNested = errors.New("cutfill: boundary ring lies inside another")
)

// InputError reports an accounting input that is out of range: Field names
// the [Inputs] field (e.g. "Soil.Swell"), Value is the offending number and
// Unit its unit ("" for a ratio).
type InputError struct {
	Field string
	Value float64
	Unit  string
	Err   error
}

func (e *InputError) Error() string {
	unit := ""
	if e.Unit != "" {
		unit = " " + e.Unit
	}
	return fmt.Sprintf("cutfill: %s %s, got %g%s", e.Field, trimPrefix(e.Err), e.Value, unit)
}

// Unwrap returns the sentinel error.
func (e *InputError) Unwrap() error { return e.Err }

// MeshError reports a bad triangle or vertex in one of the surfaces handed to
// [Compare]. Mesh is "before" or "after"; Triangle and Vertex are indices
// (-1 when not applicable).
type MeshError struct {
	Mesh     string
	Triangle int
	Vertex   int
	Err      error
}

func (e *MeshError) Error() string {
	var b strings.Builder
	fmt.Fprintf(&b, "cutfill: %s surface", e.Mesh)
	if e.Triangle >= 0 {
		fmt.Fprintf(&b, ": triangle %d", e.Triangle)
	}
	if e.Vertex >= 0 {
		fmt.Fprintf(&b, ": vertex %d", e.Vertex)
	}
	fmt.Fprintf(&b, ": %s", trimPrefix(e.Err))
	return b.String()
}

// Unwrap returns the sentinel error.
func (e *MeshError) Unwrap() error { return e.Err }

// BoundaryError reports a bad boundary ring handed to [Compare]: Ring is the
// ring's index, Vertex a vertex (or the first vertex of an edge) within it,
// -1 when not applicable, and Other the other ring involved in a crossing or
// nesting (-1 when none).
type BoundaryError struct {
	Ring, Vertex, Other int
	Err                 error
}

func (e *BoundaryError) Error() string {
	var b strings.Builder
	fmt.Fprintf(&b, "cutfill: boundary ring %d", e.Ring)
	if e.Vertex >= 0 {
		fmt.Fprintf(&b, " at vertex %d", e.Vertex)
	}
	if e.Other >= 0 {
		fmt.Fprintf(&b, " (with ring %d)", e.Other)
	}
	fmt.Fprintf(&b, ": %s", trimPrefix(e.Err))
	return b.String()
}

// Unwrap returns the sentinel error.
func (e *BoundaryError) Unwrap() error { return e.Err }

func trimPrefix(err error) string {
	return strings.TrimPrefix(err.Error(), "cutfill: ")
}
