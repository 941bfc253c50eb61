package contours_test

import (
	"math"
	"testing"

	"github.com/dugout-estimating/dugout/internal/contours"
	"github.com/dugout-estimating/dugout/internal/geom"
)

// gridMesh samples f on an nx × ny lattice of vertices with spacing d from
// (x0, y0) and splits every cell into two counter-clockwise triangles along
// its rising (south-west to north-east) diagonal. Vertex (i, j) has index
// j*nx + i.
func gridMesh(nx, ny int, x0, y0, d float64, f func(x, y float64) float64) geom.TriMesh {
	m := geom.TriMesh{V: make([]geom.Vec3, 0, nx*ny), T: make([]int32, 0, 6*(nx-1)*(ny-1))}
	for j := range ny {
		for i := range nx {
			x, y := x0+float64(i)*d, y0+float64(j)*d
			m.V = append(m.V, geom.Vec3{X: x, Y: y, Z: f(x, y)})
		}
	}
	for j := range ny - 1 {
		for i := range nx - 1 {
			a := int32(j*nx + i)
			b, c, e := a+1, a+int32(nx)+1, a+int32(nx)
			m.T = append(m.T, a, b, c, a, c, e)
		}
	}
	return m
}

// fanMesh is a regular n-gon of radius r around a centre vertex: n
// triangles (centre, spoke i, spoke i+1), counter-clockwise. zc is the
// centre's elevation and zr the rim's.
func fanMesh(n int, r, zc, zr float64) geom.TriMesh {
	m := geom.TriMesh{V: []geom.Vec3{{X: 0, Y: 0, Z: zc}}}
	for i := range n {
		a := 2 * math.Pi * float64(i) / float64(n)
		m.V = append(m.V, geom.Vec3{X: r * math.Cos(a), Y: r * math.Sin(a), Z: zr})
	}
	for i := range n {
		m.T = append(m.T, 0, int32(1+i), int32(1+(i+1)%n))
	}
	return m
}

// evalMesh returns the elevation of the linear interpolant of m at p, found
// by brute force over the triangles (barycentric coordinates, with points
// on an edge counted in), and whether p is inside the mesh.
func evalMesh(m geom.TriMesh, p geom.Vec2) (float64, bool) {
	const inside = -1e-12 // barycentric slack for points on an edge (round-off only)
	for t := range m.NumTriangles() {
		a, b, c := m.Triangle(t)
		d := geom.PlanArea(a, b, c) * 2
		if d == 0 {
			continue
		}
		l1 := b.XY().Sub(p).Cross(c.XY().Sub(p)) / d
		l2 := c.XY().Sub(p).Cross(a.XY().Sub(p)) / d
		l3 := 1 - l1 - l2
		if l1 >= inside && l2 >= inside && l3 >= inside {
			return l1*a.Z + l2*b.Z + l3*c.Z, true
		}
	}
	return 0, false
}

// boundaryEdges returns the edges of m used by one triangle only.
func boundaryEdges(m geom.TriMesh) [][2]geom.Vec2 {
	type key struct{ a, b int32 }
	n := map[key]int{}
	for t := range m.NumTriangles() {
		for k := range 3 {
			a, b := m.T[3*t+k], m.T[3*t+(k+1)%3]
			n[key{min(a, b), max(a, b)}]++
		}
	}
	var out [][2]geom.Vec2
	for k, c := range n {
		if c == 1 {
			out = append(out, [2]geom.Vec2{m.V[k.a].XY(), m.V[k.b].XY()})
		}
	}
	return out
}

// onLevelTol is the tolerance for "this point lies on the level set of the
// surface": round-off of one interpolation and one barycentric evaluation,
// relative to the elevations in the test meshes (at most ~1e3 m).
const onLevelTol = 1e-9

// checkLines asserts the invariants every output of Trace must satisfy on
// the mesh m (small enough for brute-force evaluation): points on the level
// set of the surface, no repeated consecutive points, rings closed exactly
// with at least three distinct points, open lines at least two points long
// and ending on the mesh boundary, no segment used twice within a level,
// and the higher ground on the left of every segment (when left says so).
func checkLines(tb testing.TB, m geom.TriMesh, lines []contours.Line, left bool) {
	tb.Helper()
	bnd := boundaryEdges(m)
	onBoundary := func(p geom.Vec2) bool {
		for _, e := range bnd {
			if geom.SegmentDistanceSquared(p, e[0], e[1]) <= 1e-20 {
				return true
			}
		}
		return false
	}
	type seg struct{ a, b geom.Vec2 }
	seen := map[float64]map[seg]bool{}
	for li, l := range lines {
		if len(l.Pts) < 2 {
			tb.Fatalf("line %d at %g: %d points", li, l.Level, len(l.Pts))
		}
		for i, p := range l.Pts {
			z, ok := evalMesh(m, p)
			if !ok || math.Abs(z-l.Level) > onLevelTol*math.Max(1, math.Abs(l.Level)) {
				tb.Fatalf("line %d at %g: point %d %v has z %g (inside %v), want the level", li, l.Level, i, p, z, ok)
			}
			if i > 0 && p == l.Pts[i-1] {
				tb.Fatalf("line %d at %g: point %d %v repeats the one before", li, l.Level, i, p)
			}
		}
		first, last := l.Pts[0], l.Pts[len(l.Pts)-1]
		if l.Closed {
			if first != last || len(l.Pts) < 4 {
				tb.Fatalf("ring %d at %g: first %v last %v, %d points; want closed exactly with >= 3 distinct", li, l.Level, first, last, len(l.Pts))
			}
		} else if !onBoundary(first) || !onBoundary(last) {
			tb.Fatalf("open line %d at %g: ends %v, %v not both on the mesh boundary", li, l.Level, first, last)
		}
		if seen[l.Level] == nil {
			seen[l.Level] = map[seg]bool{}
		}
		for i := 1; i < len(l.Pts); i++ {
			a, b := l.Pts[i-1], l.Pts[i]
			s, r := seg{a, b}, seg{b, a}
			if seen[l.Level][s] || seen[l.Level][r] {
				tb.Fatalf("line %d at %g: segment %v-%v traced twice", li, l.Level, a, b)
			}
			seen[l.Level][s] = true
			if left {
				mid := a.Add(b).Scale(0.5)
				d := b.Sub(a)
				nrm := geom.Vec2{X: -d.Y, Y: d.X}.Scale(1e-4)
				zl, okl := evalMesh(m, mid.Add(nrm))
				zr, okr := evalMesh(m, mid.Sub(nrm))
				if okl && okr && !(zl >= l.Level && zr <= l.Level && zl > zr) {
					tb.Fatalf("line %d at %g: segment %v-%v has z %g on its left and %g on its right, want higher ground on the left", li, l.Level, a, b, zl, zr)
				}
			}
		}
	}
}
