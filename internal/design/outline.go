package design

import (
	"fmt"
	"math"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// Shelf is one step of a pond's edge: a level floor of the given width at
// the given depth below the water surface.
type Shelf struct{ WidthM, DepthM float64 }

// Outline describes a pond the way many builders do: the water's edge, the
// shelves stepping down from it inwards, and a deep zone in the middle.
type Outline struct {
	// Ring is the water's edge at the water level (local frame, m).
	Ring geom.Ring
	// Shelves run from the edge inwards, each deeper than the last.
	Shelves []Shelf
	// DeepDepthM is the depth of the deep zone, deeper than every shelf.
	DeepDepthM float64
	// WallSlope is the slope of every wall (horizontal per vertical).
	WallSlope float64
	// StepSlopes, when set, gives each wall its own slope: one per shelf,
	// then one for the deep zone (len(Shelves)+1 values).
	StepSlopes []float64
	// Corners applies to every zone; Sharp needs a convex outline.
	Corners Corners
}

// Zones returns the depth zones of o. Zone k's floor is the outline offset
// inward by the horizontal run of the walls and shelves above it:
// Z₁ = erode(O, s₁·d₁), Z_{k+1} = erode(Z_k, w_k + s_{k+1}·(d_{k+1} − d_k)),
// and the deep zone follows the last shelf the same way. Because the bowl
// rises from each floor at the wall slope, the water's edge of the result
// is O itself for a convex outline with sharp corners; with round corners
// the edge rounds off O's convex corners with radius s₁·d₁.
//
// An offset that splits the outline gives several zones of the same step,
// named "shelf 2 (part 1 of 2)" and so on; each continues on its own. A
// part too narrow for the next step simply has no deeper zone. Only when a
// step leaves nothing at all is it an error (wrapping [ErrOffset]). The
// offsets are computed as described in erode.go: exact but for arcs drawn
// with chords of 5°.
func (o Outline) Zones() ([]Zone, error) {
	r, err := cleanRing(o.Ring)
	if err != nil {
		return nil, fmt.Errorf("outline: %w", err)
	}
	if o.Corners == Sharp && !isConvex(r) {
		return nil, fmt.Errorf("%w: outline: sharp corners need a convex outline", ErrZone)
	}
	nsteps := len(o.Shelves) + 1
	slope := func(k int) float64 {
		if o.StepSlopes != nil {
			return o.StepSlopes[k]
		}
		return o.WallSlope
	}
	if o.StepSlopes != nil && len(o.StepSlopes) != nsteps {
		return nil, fmt.Errorf("%w: outline: %d step slopes given for %d shelves and the deep zone", ErrParams, len(o.StepSlopes), nsteps)
	}
	depth := func(k int) float64 {
		if k < len(o.Shelves) {
			return o.Shelves[k].DepthM
		}
		return o.DeepDepthM
	}
	prevD := 0.0
	for k := range nsteps {
		d, s := depth(k), slope(k)
		name := stepName(k, len(o.Shelves))
		switch {
		case math.IsNaN(d) || d <= prevD || d > MaxDepthM:
			return nil, fmt.Errorf("%w: outline: %s depth %g m must be deeper than the step above (%g m) and at most %g m",
				ErrZone, name, d, prevD, MaxDepthM)
		case math.IsNaN(s) || s < 0 || s > MaxWallSlope || s > 0 && s < MinWallSlope:
			return nil, fmt.Errorf("%w: outline: %s wall slope %g must be 0 (vertical) or between %g and %g", ErrZone, name, s, MinWallSlope, MaxWallSlope)
		}
		if k < len(o.Shelves) {
			if w := o.Shelves[k].WidthM; math.IsNaN(w) || math.IsInf(w, 0) || w < 0 {
				return nil, fmt.Errorf("%w: outline: %s width %g m must be 0 or more", ErrZone, name, w)
			}
		}
		prevD = d
	}
	var zones []Zone
	pieces := []geom.Ring{r}
	prevD, prevW := 0.0, 0.0
	for k := range nsteps {
		d, s := depth(k), slope(k)
		off := prevW + s*(d-prevD)
		var next []geom.Ring
		for _, p := range pieces {
			next = append(next, erode(p, off)...)
		}
		name := stepName(k, len(o.Shelves))
		if len(next) == 0 {
			return nil, fmt.Errorf("%w: the %s (depth %g m) would start %.3f m inside the step above, which leaves nothing: the outline is too narrow for its shelves",
				ErrOffset, name, d, off)
		}
		for i, p := range next {
			zn := name
			if len(next) > 1 {
				zn = fmt.Sprintf("%s (part %d of %d)", name, i+1, len(next))
			}
			zones = append(zones, Zone{Name: zn, Ring: p, DepthM: d, WallSlope: s, Corners: o.Corners})
		}
		pieces = next
		prevD = d
		if k < len(o.Shelves) {
			prevW = o.Shelves[k].WidthM
		}
	}
	return zones, nil
}

func stepName(k, shelves int) string {
	if k < shelves {
		return fmt.Sprintf("shelf %d", k+1)
	}
	return "deep zone"
}
