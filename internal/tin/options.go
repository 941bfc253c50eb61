package tin

import (
	"fmt"
	"strings"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// DupPolicy says how survey points that share a plan position are merged
// into one TIN vertex before triangulation. Its zero value is [DupMean].
type DupPolicy int

// The duplicate policies.
const (
	// DupMean gives the merged vertex the mean elevation of its group.
	DupMean DupPolicy = iota
	// DupFirst keeps the elevation of the group's first point (in input
	// order).
	DupFirst
	// DupError refuses a group whose elevations differ by more than the
	// conflict tolerance; groups that agree are merged as by DupMean.
	DupError
)

// String returns "mean", "first" or "error".
func (p DupPolicy) String() string {
	switch p {
	case DupMean:
		return "mean"
	case DupFirst:
		return "first"
	case DupError:
		return "error"
	}
	return fmt.Sprintf("DupPolicy(%d)", int(p))
}

// ParseDupPolicy parses "mean", "first" or "error" (case and surrounding
// space ignored).
func ParseDupPolicy(s string) (DupPolicy, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "mean":
		return DupMean, nil
	case "first":
		return DupFirst, nil
	case "error":
		return DupError, nil
	}
	return DupMean, fmt.Errorf("%w: duplicate policy %q (want mean, first or error)", ErrOption, s)
}

// DefaultConflictTolM is the elevation spread, in metres, above which the
// points of a duplicate group are said to conflict when
// [Options.ConflictTolM] is zero. 5 cm is about the vertical repeatability
// of RTK GPS topo shots and well above that of a total station or level
// (common practice, no source).
const DefaultConflictTolM = 0.05

// Breakline is a 3-D polyline along which the ground has a sharp change of
// grade (a top or toe of bank, a curb, a ditch flow line). Its vertices
// become TIN vertices with the breakline's elevations and its segments become
// constrained edges. Pts are local-frame metres.
type Breakline struct {
	Name string
	Pts  []geom.Vec3
}

// Options configures [Build]. The zero value triangulates the points as
// they are: exact duplicates merged by their mean elevation, no
// constraints, no trimming (the surface covers the convex hull).
type Options struct {
	// Duplicates is the duplicate-merging policy.
	Duplicates DupPolicy
	// MergeTolM merges positions closer than this distance, in metres, as
	// duplicates; 0 merges exact equality only. Each point joins the
	// earliest group whose first point is within the distance (breakline
	// vertices first, then survey points in input order); the group keeps
	// that first point's plan position.
	MergeTolM float64
	// ConflictTolM is the elevation spread, in metres, above which a
	// duplicate group conflicts; 0 means [DefaultConflictTolM].
	ConflictTolM float64
	// Breaklines are inserted as constrained edges.
	Breaklines []Breakline
	// Boundary trims the surface to the union of these polygons (outer
	// rings, either winding); their edges become constrained edges.
	Boundary []geom.Ring
	// MaxEdgeM trims the surface inwards from its outer boundary, removing
	// boundary triangles that have an unconstrained edge longer than this,
	// in metres; 0 means no trimming by edge length.
	MaxEdgeM float64
}

// conflictTol returns the effective conflict tolerance.
func (o *Options) conflictTol() float64 {
	if o.ConflictTolM == 0 {
		return DefaultConflictTolM
	}
	return o.ConflictTolM
}

// check reports the first invalid option value.
func (o *Options) check() error {
	bad := func(name string, v float64) error {
		return &OptionError{Name: name, Value: v}
	}
	switch {
	case o.Duplicates < DupMean || o.Duplicates > DupError:
		return fmt.Errorf("%w: duplicate policy %d", ErrOption, int(o.Duplicates))
	case !(o.MergeTolM >= 0) || o.MergeTolM > maxFinite:
		return bad("MergeTolM", o.MergeTolM)
	case !(o.ConflictTolM >= 0) || o.ConflictTolM > maxFinite:
		return bad("ConflictTolM", o.ConflictTolM)
	case !(o.MaxEdgeM >= 0) || o.MaxEdgeM > maxFinite:
		return bad("MaxEdgeM", o.MaxEdgeM)
	}
	return nil
}

// maxFinite is the largest float64; comparisons against it reject +Inf.
const maxFinite = 1.7976931348623157e308

// Warning is a non-fatal data issue found while building a surface, such as
// merged duplicates whose elevations disagree. At is where, in the local
// frame.
type Warning struct {
	Msg string
	At  geom.Vec2
	// Conflict describes a duplicate group whose elevations spread more
	// than the conflict tolerance, so that callers can name the shots in
	// their own words and units; nil for other warnings.
	Conflict *Conflict
}

// Conflict is a merged duplicate group whose elevations disagree.
type Conflict struct {
	Points     []int    // indices into the points given to Build
	Breaklines []string // names of breaklines with a vertex in the group
	SpreadM    float64  // highest minus lowest elevation in the group
	TolM       float64  // the conflict tolerance
	KeptZM     float64  // the elevation kept
	Policy     DupPolicy
}
