package design

import (
	"cmp"
	"fmt"
	"math"
	"slices"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/robust"
)

// Corners says how a sloped wall turns a convex corner of its zone.
type Corners int

const (
	// Round corners (the zero value): the wall rises with the Euclidean
	// distance from the zone, so it turns a corner as part of a cone.
	Round Corners = iota
	// Sharp (mitred) corners: one plane per edge, meeting along the corner
	// bisectors. Convex zones only.
	Sharp
)

// String returns "round" or "sharp".
func (c Corners) String() string {
	if c == Sharp {
		return "sharp"
	}
	return "round"
}

// Limits on the numbers a zone may carry. Deeper or flatter designs are
// almost certainly a unit mistake (feet read as metres, a depth typed as an
// elevation).
const (
	// MaxDepthM is the deepest zone floor accepted below the water surface.
	MaxDepthM = 10.0
	// MaxWallSlope is the flattest wall accepted, in horizontal metres per
	// metre of rise.
	MaxWallSlope = 20.0
	// MinWallSlope is the steepest sloped wall accepted, 0.05 (5 cm of run
	// per metre of rise); anything steeper is a vertical wall (slope 0) for
	// every practical purpose, and a lattice could not resolve it.
	MinWallSlope = 0.05
)

// Zone is one depth zone of a pond: a floor outline at a fixed depth below
// the water surface and the wall that rises from its edge.
type Zone struct {
	Name string
	// Ring is the outline of the zone's floor in the local frame (m),
	// either winding, stored open. Consecutive repeated vertices are
	// ignored.
	Ring geom.Ring
	// DepthM is the depth of the floor below the water surface, m (≥ 0).
	DepthM float64
	// WallSlope is the wall's horizontal run per unit of rise (0 = a
	// vertical wall, 2 = 2H:1V).
	WallSlope float64
	// Corners chooses round (cone) or sharp (mitred) corners for a sloped
	// wall; a vertical wall ignores it.
	Corners Corners
}

// Validate reports the first problem that keeps z from being built: a
// non-finite vertex, fewer than 3 distinct vertices, zero area, edges that
// cross or touch other than at their shared vertex, a depth outside
// [0, MaxDepthM], a slope outside [0, MaxWallSlope] or between 0 and
// MinWallSlope, an unknown corner
// option, or sharp corners on a concave outline. Errors wrap [ErrZone].
func (z Zone) Validate() error {
	if _, err := cleanRing(z.Ring); err != nil {
		return err
	}
	if math.IsNaN(z.DepthM) || z.DepthM < 0 || z.DepthM > MaxDepthM {
		return fmt.Errorf("%w: depth %g m is outside 0 to %g m", ErrZone, z.DepthM, MaxDepthM)
	}
	if math.IsNaN(z.WallSlope) || z.WallSlope < 0 || z.WallSlope > MaxWallSlope {
		return fmt.Errorf("%w: wall slope %g (horizontal per vertical) is outside 0 to %g", ErrZone, z.WallSlope, MaxWallSlope)
	}
	if z.WallSlope > 0 && z.WallSlope < MinWallSlope {
		return fmt.Errorf("%w: wall slope %g is steeper than %g: use 0 for a vertical wall", ErrZone, z.WallSlope, MinWallSlope)
	}
	switch z.Corners {
	case Round:
	case Sharp:
		if r, _ := cleanRing(z.Ring); z.WallSlope > 0 && !isConvex(r) {
			return fmt.Errorf("%w: sharp corners need a convex outline; use round corners or split the zone", ErrZone)
		}
	default:
		return fmt.Errorf("%w: unknown corner option %d", ErrZone, int(z.Corners))
	}
	return nil
}

// cleanRing returns r counter-clockwise with consecutive repeats (and a
// repeated closing vertex) dropped, after checking that it is a simple
// polygon with at least three distinct vertices and non-zero area.
func cleanRing(r geom.Ring) (geom.Ring, error) {
	out := make(geom.Ring, 0, len(r))
	for i, p := range r {
		if !p.IsFinite() {
			return nil, fmt.Errorf("%w: vertex %d (%g, %g) is not finite", ErrZone, i, p.X, p.Y)
		}
		if len(out) > 0 && out[len(out)-1] == p {
			continue
		}
		out = append(out, p)
	}
	for len(out) > 1 && out[len(out)-1] == out[0] {
		out = out[:len(out)-1]
	}
	if len(out) < 3 {
		return nil, fmt.Errorf("%w: outline has %d distinct vertices, need at least 3", ErrZone, len(out))
	}
	if err := checkSimple(out); err != nil {
		return nil, err
	}
	if out.Area() == 0 {
		return nil, fmt.Errorf("%w: outline has zero area", ErrZone)
	}
	return out.CCW(), nil
}

// checkSimple reports the first pair of edges of the open ring r that
// meet anywhere other than at the vertex two consecutive edges share, or
// consecutive edges that fold back onto each other. Decisions use exact
// orientation tests. Edges are swept in order of their lowest x, so the
// cost is near n log n for ordinary outlines.
func checkSimple(r geom.Ring) error {
	n := len(r)
	type edge struct {
		i          int
		minX, maxX float64
	}
	es := make([]edge, n)
	for i := range r {
		a, b := r[i], r[(i+1)%n]
		es[i] = edge{i, min(a.X, b.X), max(a.X, b.X)}
		// Consecutive edges a→b→c fold back when c lies on the line ab
		// and the direction reverses.
		c := r[(i+2)%n]
		if robust.Orient2D(a, b, c) == robust.Zero && (b.X-a.X)*(c.X-b.X)+(b.Y-a.Y)*(c.Y-b.Y) < 0 {
			return fmt.Errorf("%w: the outline folds back on itself at vertex %d (%g, %g)", ErrZone, (i+1)%n, b.X, b.Y)
		}
	}
	slices.SortFunc(es, func(p, q edge) int { return cmp.Compare(p.minX, q.minX) })
	for s, e := range es {
		a, b := r[e.i], r[(e.i+1)%n]
		for _, f := range es[s+1:] {
			if f.minX > e.maxX {
				break
			}
			if f.i == (e.i+1)%n || e.i == (f.i+1)%n {
				continue // neighbours share a vertex; fold-backs are checked above
			}
			c, d := r[f.i], r[(f.i+1)%n]
			if max(c.Y, d.Y) < min(a.Y, b.Y) || min(c.Y, d.Y) > max(a.Y, b.Y) {
				continue
			}
			if segmentsMeet(a, b, c, d) {
				i, j := min(e.i, f.i), max(e.i, f.i)
				return fmt.Errorf("%w: the outline crosses itself: edge %d (vertex %d to %d) meets edge %d (vertex %d to %d)",
					ErrZone, i, i, (i+1)%n, j, j, (j+1)%n)
			}
		}
	}
	return nil
}

// isConvex reports whether the simple counter-clockwise ring r has no
// reflex vertex (collinear vertices are allowed), decided exactly.
func isConvex(r geom.Ring) bool {
	n := len(r)
	for i := range r {
		if robust.Orient2D(r[(i+n-1)%n], r[i], r[(i+1)%n]) == robust.Negative {
			return false
		}
	}
	return true
}

// onSegment reports whether p, known to be collinear with ab, lies on the
// closed segment ab (exact: comparisons only).
func onSegment(p, a, b geom.Vec2) bool {
	return min(a.X, b.X) <= p.X && p.X <= max(a.X, b.X) && min(a.Y, b.Y) <= p.Y && p.Y <= max(a.Y, b.Y)
}

// segmentsMeet reports whether the closed segments ab and cd share a point,
// decided exactly with [robust.Orient2D].
func segmentsMeet(a, b, c, d geom.Vec2) bool {
	o1, o2 := robust.Orient2D(a, b, c), robust.Orient2D(a, b, d)
	o3, o4 := robust.Orient2D(c, d, a), robust.Orient2D(c, d, b)
	if o1 != o2 && o3 != o4 {
		return true
	}
	switch {
	case o1 == robust.Zero && onSegment(c, a, b):
		return true
	case o2 == robust.Zero && onSegment(d, a, b):
		return true
	case o3 == robust.Zero && onSegment(a, c, d):
		return true
	case o4 == robust.Zero && onSegment(b, c, d):
		return true
	}
	return false
}
