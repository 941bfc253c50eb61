package tin

import (
	"cmp"
	"math"
	"slices"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/robust"
)

// convexHull returns the vertices of the convex hull of pts,
// counter-clockwise, without collinear boundary points (a single point or
// two for degenerate input). Points strictly inside the octagon of the
// extreme points in the eight compass directions are discarded first (Akl &
// Toussaint, "A fast convex hull algorithm", Inf. Proc. Letters 7, 1978); the
// rest go through Andrew's monotone chain ("Another efficient algorithm for
// convex hulls in two dimensions", Inf. Proc. Letters 9, 1979), with exact
// orientation tests.
func convexHull(pts []geom.Vec3) []geom.Vec2 {
	if len(pts) == 0 {
		return nil
	}
	xy := func(i int) geom.Vec2 { return geom.Vec2{X: pts[i].X, Y: pts[i].Y} }
	// Extremes in the order bottom, bottom-right, right, top-right, top,
	// top-left, left, bottom-left (counter-clockwise).
	dirs := [8]func(p geom.Vec2) float64{
		func(p geom.Vec2) float64 { return -p.Y },
		func(p geom.Vec2) float64 { return p.X - p.Y },
		func(p geom.Vec2) float64 { return p.X },
		func(p geom.Vec2) float64 { return p.X + p.Y },
		func(p geom.Vec2) float64 { return p.Y },
		func(p geom.Vec2) float64 { return p.Y - p.X },
		func(p geom.Vec2) float64 { return -p.X },
		func(p geom.Vec2) float64 { return -p.X - p.Y },
	}
	var ext [8]int
	var best [8]float64
	for k := range best {
		best[k] = math.Inf(-1)
	}
	for i := range pts {
		p := xy(i)
		for k, f := range dirs {
			if v := f(p); v > best[k] {
				best[k], ext[k] = v, i
			}
		}
	}
	var oct []geom.Vec2
	for _, i := range ext {
		p := xy(i)
		if len(oct) == 0 || oct[len(oct)-1] != p {
			oct = append(oct, p)
		}
	}
	for len(oct) > 1 && oct[len(oct)-1] == oct[0] {
		oct = oct[:len(oct)-1]
	}
	inside := func(p geom.Vec2) bool {
		if len(oct) < 3 {
			return false
		}
		for i := range oct {
			if robust.Orient2D(oct[i], oct[(i+1)%len(oct)], p) <= 0 {
				return false
			}
		}
		return true
	}
	var cand []geom.Vec2
	for i := range pts {
		if p := xy(i); !inside(p) {
			cand = append(cand, p)
		}
	}
	slices.SortFunc(cand, func(a, b geom.Vec2) int {
		if c := cmp.Compare(a.X, b.X); c != 0 {
			return c
		}
		return cmp.Compare(a.Y, b.Y)
	})
	cand = slices.Compact(cand)
	if len(cand) < 3 {
		return cand
	}
	h := make([]geom.Vec2, 0, 2*len(cand))
	for _, p := range cand { // lower chain
		for len(h) >= 2 && robust.Orient2D(h[len(h)-2], h[len(h)-1], p) <= 0 {
			h = h[:len(h)-1]
		}
		h = append(h, p)
	}
	lower := len(h) + 1
	for i := len(cand) - 2; i >= 0; i-- { // upper chain
		p := cand[i]
		for len(h) >= lower && robust.Orient2D(h[len(h)-2], h[len(h)-1], p) <= 0 {
			h = h[:len(h)-1]
		}
		h = append(h, p)
	}
	return h[:len(h)-1]
}

// outsideDistance returns 0 when p is inside or on the convex polygon hull
// (counter-clockwise; a point or segment when degenerate), else the distance
// from p to it.
func outsideDistance(hull []geom.Vec2, p geom.Vec2) float64 {
	m := len(hull)
	switch m {
	case 0:
		return math.Inf(1)
	case 1:
		return p.Distance(hull[0])
	}
	in := m >= 3
	best := math.Inf(1)
	for i := range m {
		a, b := hull[i], hull[(i+1)%m]
		if m >= 3 && robust.Orient2D(a, b, p) < 0 {
			in = false
		}
		best = math.Min(best, geom.SegmentDistanceSquared(p, a, b))
	}
	if in || best == 0 {
		return 0
	}
	return math.Sqrt(best)
}
