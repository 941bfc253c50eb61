package takeoff

import (
	"fmt"
	"math"
	"slices"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// belowFraction returns the fraction of a planar triangle with corner
// elevations z0, z1, z2 that lies strictly below level. The part below is a
// triangle or a quadrilateral cut by the straight level line, so the same
// fraction applies to plan and 3-D area. A triangle lying exactly at the
// level counts as not below, so that a mesh whose elevations were capped at
// the rim does not count the capped ground as lined.
func belowFraction(z0, z1, z2, level float64) float64 {
	if z0 > z1 {
		z0, z1 = z1, z0
	}
	if z1 > z2 {
		z1, z2 = z2, z1
	}
	if z0 > z1 {
		z0, z1 = z1, z0
	}
	switch {
	case z0 >= level:
		return 0
	case z2 <= level:
		return 1
	case z1 <= level: // only the corner at z2 is above
		a := (z2 - level) / (z2 - z0)
		b := (z2 - level) / (z2 - z1)
		return 1 - a*b
	default: // only the corner at z0 is below
		a := (level - z0) / (z1 - z0)
		b := (level - z0) / (z2 - z0)
		return a * b
	}
}

// DevelopedArea returns the true 3-D area (m²) of the part of m that lies
// below level, each triangle clipped exactly at the level. Triangles are
// summed in index order with a compensated sum. Cost O(triangles).
func DevelopedArea(m geom.TriMesh, level float64) float64 {
	var s geom.Sum
	for t := range m.NumTriangles() {
		a, b, c := m.Triangle(t)
		if f := belowFraction(a.Z, b.Z, c.Z, level); f > 0 {
			s.Add(f * geom.SurfaceArea(a, b, c))
		}
	}
	return s.Value()
}

// PlanArea returns the plan area (m²) of the part of m that lies below
// level, clipped like [DevelopedArea].
func PlanArea(m geom.TriMesh, level float64) float64 {
	var s geom.Sum
	for t := range m.NumTriangles() {
		a, b, c := m.Triangle(t)
		if f := belowFraction(a.Z, b.Z, c.Z, level); f > 0 {
			s.Add(f * math.Abs(geom.PlanArea(a, b, c)))
		}
	}
	return s.Value()
}

// meshCell returns a typical cell size of m: the side of the square whose
// two half-triangles have the mean triangle plan area (exact for a square
// lattice). It is 0 for an empty or flat-in-plan mesh.
func meshCell(m geom.TriMesh) float64 {
	n := m.NumTriangles()
	if n == 0 {
		return 0
	}
	var s geom.Sum
	for t := range n {
		a, b, c := m.Triangle(t)
		s.Add(math.Abs(geom.PlanArea(a, b, c)))
	}
	return math.Sqrt(2 * s.Value() / float64(n))
}

// outlineSeg is one piece of the boundary of the part of a mesh below a
// level: the two ends and the outward direction in plan (away from the part
// below), used to move the ends onto an analytic surface.
type outlineSeg struct {
	a, b geom.Vec2
	out  geom.Vec2
}

// next3 is the next corner of a triangle, (i + 1) mod 3.
var next3 = [3]int{1, 2, 0}

// levelOutline returns the boundary, in plan, of the part of m strictly
// below level: the level crossings inside triangles and the pieces of the
// mesh's own boundary edges that lie below the level (a mesh that stops
// short of the rim). Segments come in triangle order and are not chained.
// Cost O(T).
func levelOutline(m geom.TriMesh, level float64) []outlineSeg {
	var segs []outlineSeg
	for t := range m.NumTriangles() {
		v := [3]geom.Vec3{}
		v[0], v[1], v[2] = m.Triangle(t)
		// Most triangles lie wholly below or above the level.
		if b0, b1, b2 := v[0].Z < level, v[1].Z < level, v[2].Z < level; b0 == b1 && b1 == b2 {
			continue
		}
		var pts [2]geom.Vec2
		k := 0
		for i := range 3 {
			p, q := v[i], v[(i+1)%3]
			pin, qin := p.Z < level, q.Z < level
			if pin == qin || k == 2 {
				continue
			}
			f := (level - p.Z) / (q.Z - p.Z)
			pts[k] = p.XY().Lerp(q.XY(), f)
			k++
		}
		if k != 2 || pts[0] == pts[1] {
			continue
		}
		g := planGradient(v[0], v[1], v[2])
		if g.Norm2() == 0 {
			continue
		}
		segs = append(segs, outlineSeg{a: pts[0], b: pts[1], out: g.Scale(1 / g.Norm())})
	}
	// Boundary edges: a half-edge a→b whose twin b→a no triangle has.
	// Half-edges are bucketed by their origin (a counting sort), so each
	// twin is looked up among the few edges leaving b. Cost O(T).
	nv := len(m.V)
	start := make([]int32, nv+1)
	for _, a := range m.T {
		start[a+1]++
	}
	for i := range nv {
		start[i+1] += start[i]
	}
	fill := slices.Clone(start[:nv])
	to := make([]int32, len(m.T))
	for t := 0; t+2 < len(m.T); t += 3 {
		tri := m.T[t : t+3 : t+3]
		for i, a := range tri {
			b := tri[next3[i]]
			to[fill[a]] = b
			fill[a]++
		}
	}
	for t := 0; t+2 < len(m.T); t += 3 {
		tri := m.T[t : t+3 : t+3]
		for i, a := range tri {
			b := tri[next3[i]]
			if !(m.V[a].Z < level) && !(m.V[b].Z < level) {
				continue
			}
			if slices.Contains(to[start[b]:start[b+1]], a) {
				continue
			}
			p, q := m.V[a], m.V[b]
			if s, ok := edgeBelow(p, q, level); ok {
				d := q.XY().Sub(p.XY())
				// Triangles are counter-clockwise, so the outside of a
				// boundary edge a→b is on its right.
				out := geom.Vec2{X: d.Y, Y: -d.X}
				s.out = out.Scale(1 / out.Norm())
				segs = append(segs, s)
			}
		}
	}
	return segs
}

// edgeBelow returns the piece of edge pq strictly below level.
func edgeBelow(p, q geom.Vec3, level float64) (outlineSeg, bool) {
	pin, qin := p.Z < level, q.Z < level
	switch {
	case !pin && !qin:
		return outlineSeg{}, false
	case pin && qin:
		return outlineSeg{a: p.XY(), b: q.XY()}, p.XY() != q.XY()
	}
	f := (level - p.Z) / (q.Z - p.Z)
	x := p.XY().Lerp(q.XY(), f)
	if pin {
		return outlineSeg{a: p.XY(), b: x}, p.XY() != x
	}
	return outlineSeg{a: x, b: q.XY()}, x != q.XY()
}

// planGradient returns the plan gradient (dz/dx, dz/dy) of the plane through
// a, b and c, or zero for a triangle degenerate in plan.
func planGradient(a, b, c geom.Vec3) geom.Vec2 {
	e1, e2 := b.Sub(a), c.Sub(a)
	det := float64(e1.X*e2.Y) - float64(e1.Y*e2.X)
	if det == 0 {
		return geom.Vec2{}
	}
	gx := (float64(e1.Z*e2.Y) - float64(e2.Z*e1.Y)) / det
	gy := (float64(e2.Z*e1.X) - float64(e1.Z*e2.X)) / det
	return geom.Vec2{X: gx, Y: gy}
}

// Tolerances of the snap onto the analytic bowl.
const (
	// snapTolM ends the bisection: 1 nm, a million times finer than the
	// 1 mm the takeoff promises and still a thousand ulps of a 1 km local
	// coordinate (ulp ≈ 1.1e-13 m).
	snapTolM = 1e-9
	// snapZTolM accepts a contour point as already on the level when the
	// analytic bowl there is within 1 nm of it, which is what linear
	// interpolation gives on a straight wall (only round-off remains).
	snapZTolM = 1e-9
)

// snap moves p onto the level set bowl = level along the line p + t·dir,
// |t| ≤ reach, and reports whether it moved. dir is a unit vector pointing
// uphill (outwards from the bowl). The crossing is bracketed, then found by
// the Illinois variant of regula falsi (a few steps on a smooth wall) that
// falls back to bisection where the bowl jumps (a vertical wall) or is
// infinite. When the bowl is already within snapZTolM of the level at p,
// or no change of sign is found within reach, p is returned unchanged.
func snap(b Bowl, p, dir geom.Vec2, level, reach float64) (geom.Vec2, bool) {
	g := func(t float64) float64 { return b.BowlAt(p.Add(dir.Scale(t))) - level }
	g0 := g(0)
	if math.Abs(g0) <= snapZTolM || math.IsNaN(g0) || reach <= 0 {
		return p, false
	}
	// Above the level the crossing is downhill first; below it, uphill.
	order := [2]float64{-reach, reach}
	if g0 < 0 {
		order = [2]float64{reach, -reach}
	}
	for _, end := range order {
		ge := g(end)
		if math.IsNaN(ge) || (ge > 0) == (g0 > 0) {
			continue
		}
		// lo keeps the sign of g0, hi the other.
		lo, hi, flo, fhi := 0.0, end, g0, ge
		side := 0
		for range 100 {
			if math.Abs(hi-lo) <= snapTolM {
				break
			}
			c := (lo + hi) / 2
			if side != 2 && isFinite(flo) && isFinite(fhi) && fhi != flo {
				if x := (lo*fhi - hi*flo) / (fhi - flo); (x-lo)*(x-hi) < 0 {
					c = x
				}
			}
			fc := g(c)
			if math.Abs(fc) <= snapZTolM {
				return p.Add(dir.Scale(c)), true
			}
			if (fc > 0) == (flo > 0) {
				if side == -1 {
					fhi /= 2
				}
				lo, flo, side = c, fc, -1
			} else {
				if side == 1 {
					flo /= 2
				}
				hi, fhi, side = c, fc, 1
			}
		}
		return p.Add(dir.Scale((lo + hi) / 2)), true
	}
	return p, false
}

// VolumeBelow returns the volume (m³) between the level plane and the part
// of m below it: the water a bowl mesh holds when filled to level. Each
// triangle's share is integrated exactly for its linear surface (a clipped
// triangle is a smaller triangle, or the whole minus one). Cost O(T).
func VolumeBelow(m geom.TriMesh, level float64) float64 {
	var s geom.Sum
	for t := range m.NumTriangles() {
		a, b, c := m.Triangle(t)
		area := math.Abs(geom.PlanArea(a, b, c))
		if area == 0 {
			continue
		}
		g := [3]float64{level - a.Z, level - b.Z, level - c.Z}
		// Sort descending: g[0] >= g[1] >= g[2].
		if g[0] < g[1] {
			g[0], g[1] = g[1], g[0]
		}
		if g[1] < g[2] {
			g[1], g[2] = g[2], g[1]
		}
		if g[0] < g[1] {
			g[0], g[1] = g[1], g[0]
		}
		switch {
		case g[0] <= 0:
			continue
		case g[2] >= 0:
			s.Add(area * (g[0] + g[1] + g[2]) / 3)
		case g[1] <= 0: // one corner under water
			t1 := g[0] / (g[0] - g[1])
			t2 := g[0] / (g[0] - g[2])
			s.Add(area * t1 * t2 * g[0] / 3)
		default: // one corner dry: the whole minus the dry corner's negative part
			s0 := g[2] / (g[2] - g[0])
			s1 := g[2] / (g[2] - g[1])
			s.Add(area*(g[0]+g[1]+g[2])/3 - area*s0*s1*g[2]/3)
		}
	}
	return s.Value()
}

// validateMesh reports the first triangle with an index out of range and
// the first vertex with a non-finite coordinate.
func validateMesh(m geom.TriMesh) error {
	if len(m.T)%3 != 0 {
		return fmt.Errorf("%w: bowl mesh has %d triangle indices, not a multiple of 3", ErrInput, len(m.T))
	}
	for i, v := range m.T {
		if v < 0 || int(v) >= len(m.V) {
			return fmt.Errorf("%w: bowl mesh triangle %d refers to vertex %d of %d", ErrInput, i/3, v, len(m.V))
		}
	}
	for i, v := range m.V {
		if !v.IsFinite() {
			return fmt.Errorf("%w: bowl mesh vertex %d is not finite: (%g, %g, %g)", ErrInput, i, v.X, v.Y, v.Z)
		}
	}
	return nil
}
