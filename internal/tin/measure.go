package tin

import (
	"math"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// gradient returns the plane gradient (dz/dx, dz/dy) of mesh triangle t, or
// ok=false for an index out of range.
func (s *Surface) gradient(t int) (gx, gy float64, ok bool) {
	if t < 0 || t >= s.mesh.NumTriangles() {
		return 0, 0, false
	}
	a, b, c := s.mesh.Triangle(t)
	bx, by, bz := b.X-a.X, b.Y-a.Y, b.Z-a.Z
	cx, cy, cz := c.X-a.X, c.Y-a.Y, c.Z-a.Z
	d := float64(bx*cy) - float64(by*cx)
	gx = (float64(bz*cy) - float64(cz*by)) / d
	gy = (float64(bx*cz) - float64(cx*bz)) / d
	return gx, gy, true
}

// Slope returns the steepest slope of mesh triangle tri as rise over run
// (0 for level ground, 1 for 45°), or NaN for an index out of range.
func (s *Surface) Slope(tri int) (riseRun float64) {
	gx, gy, ok := s.gradient(tri)
	if !ok {
		return math.NaN()
	}
	return math.Hypot(gx, gy)
}

// SlopeDeg returns the steepest slope of mesh triangle tri in degrees from
// horizontal, or NaN for an index out of range.
func (s *Surface) SlopeDeg(tri int) float64 {
	return math.Atan(s.Slope(tri)) * 180 / math.Pi
}

// AspectDeg returns the aspect of mesh triangle tri: the compass direction
// its slope faces (the direction of steepest descent), in degrees clockwise
// from north (+y), in [0, 360): a triangle falling to the east has aspect
// 90. It is NaN for a level triangle, which faces no direction, and for an
// index out of range.
func (s *Surface) AspectDeg(tri int) float64 {
	gx, gy, ok := s.gradient(tri)
	if !ok || (gx == 0 && gy == 0) {
		return math.NaN()
	}
	// Descent direction (-gx, -gy); azimuth = atan2(east, north).
	deg := math.Atan2(-gx, -gy) * 180 / math.Pi
	if deg < 0 {
		deg += 360
	}
	if deg >= 360 {
		deg -= 360
	}
	return deg
}

// PlanArea returns the plan (horizontal) area of the surface in m², summed
// over its triangles with compensated summation.
func (s *Surface) PlanArea() float64 { return s.summary.PlanAreaM2 }

// SurfaceArea returns the 3-D (developed, sloped) area of the surface in m².
func (s *Surface) SurfaceArea() float64 { return s.summary.SurfaceAreaM2 }

// VolumeAbove returns the volume between the surface and the level plane at
// elevation datum where the surface is above it, in m³: the integral of
// max(0, z - datum) over the surface, exact for the piecewise-linear TIN up
// to round-off (compensated summation over triangles in mesh order).
func (s *Surface) VolumeAbove(datum float64) float64 {
	var sum geom.Sum
	m := s.mesh
	for t := range m.NumTriangles() {
		a, b, c := m.Triangle(t)
		sum.Add(positivePart(geom.PlanArea(a, b, c), a.Z-datum, b.Z-datum, c.Z-datum))
	}
	return sum.Value()
}

// positivePart returns the integral of max(0, f) over a triangle of plan
// area area on which f is linear with corner values f1, f2, f3. With the
// values sorted f1 >= f2 >= f3 (analytic; the same case split as the
// reference bench's exact TIN integrator, refbench README, method 5):
//
//	f3 >= 0:       area·(f1+f2+f3)/3
//	f1 <= 0:       0
//	f2 <= 0 < f1:  area·f1³ / (3(f1−f2)(f1−f3))                  (a corner tetrahedron)
//	f3 < 0 < f2:   area·(f1+f2+f3)/3 + area·(−f3)³ / (3(f1−f3)(f2−f3))
func positivePart(area, f1, f2, f3 float64) float64 {
	if f1 < f2 {
		f1, f2 = f2, f1
	}
	if f2 < f3 {
		f2, f3 = f3, f2
	}
	if f1 < f2 {
		f1, f2 = f2, f1
	}
	switch {
	case f3 >= 0:
		return area * (f1 + f2 + f3) / 3
	case f1 <= 0:
		return 0
	case f2 <= 0:
		return area * f1 * f1 * f1 / (3 * (f1 - f2) * (f1 - f3))
	}
	return area*(f1+f2+f3)/3 + area*(-f3)*(-f3)*(-f3)/(3*(f1-f3)*(f2-f3))
}
