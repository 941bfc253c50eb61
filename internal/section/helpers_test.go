package section

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// funcSampler is a Sampler from a function.
type funcSampler func(x, y float64) (float64, bool)

func (f funcSampler) Elevation(x, y float64) (float64, bool) { return f(x, y) }

// meshSampler is a test stand-in for the TIN's point query: brute-force
// point location in a TriMesh, boundary inclusive.
type meshSampler struct{ m geom.TriMesh }

func (s meshSampler) Elevation(x, y float64) (float64, bool) {
	q := geom.Vec3{X: x, Y: y}
	for t := range s.m.NumTriangles() {
		a, b, c := s.m.Triangle(t)
		d := geom.PlanArea(a, b, c)
		wa := geom.PlanArea(q, b, c) / d
		wb := geom.PlanArea(a, q, c) / d
		wc := geom.PlanArea(a, b, q) / d
		const slack = -1e-12 // points on an edge, within round-off
		if wa >= slack && wb >= slack && wc >= slack {
			return wa*a.Z + wb*b.Z + wc*c.Z, true
		}
	}
	return math.NaN(), false
}

// gridMesh triangulates [x0,x1]×[y0,y1] with nx×ny cells, each split along
// the diagonal from its lower-left to its upper-right corner; with rng !=
// nil interior vertices are jittered by up to jitter × cell size (below
// 0.25 keeps cells convex). Heights come from z.
func gridMesh(x0, y0, x1, y1 float64, nx, ny int, z func(x, y float64) float64, rng *rand.Rand, jitter float64) geom.TriMesh {
	var m geom.TriMesh
	hx, hy := (x1-x0)/float64(nx), (y1-y0)/float64(ny)
	for j := 0; j <= ny; j++ {
		for i := 0; i <= nx; i++ {
			x, y := x0+float64(i)*hx, y0+float64(j)*hy
			if rng != nil && i > 0 && i < nx && j > 0 && j < ny {
				x += (2*rng.Float64() - 1) * jitter * hx
				y += (2*rng.Float64() - 1) * jitter * hy
			}
			m.V = append(m.V, geom.Vec3{X: x, Y: y, Z: z(x, y)})
		}
	}
	id := func(i, j int) int32 { return int32(j*(nx+1) + i) }
	for j := 0; j < ny; j++ {
		for i := 0; i < nx; i++ {
			a, b, c, d := id(i, j), id(i+1, j), id(i+1, j+1), id(i, j+1)
			m.T = append(m.T, a, b, c, a, c, d)
		}
	}
	return m
}

// rectPit is a pit with a flat rectangular bottom [x0,x1]×[y0,y1] at -depth
// and planar sides at run horizontal per vertical up to a rim at 0 (sharp
// corners: each side a trapezoid of two triangles).
func rectPit(x0, y0, x1, y1, depth, run float64) geom.TriMesh {
	o := depth * run
	m := geom.TriMesh{V: []geom.Vec3{
		{X: x0, Y: y0, Z: -depth}, {X: x1, Y: y0, Z: -depth}, {X: x1, Y: y1, Z: -depth}, {X: x0, Y: y1, Z: -depth},
		{X: x0 - o, Y: y0 - o}, {X: x1 + o, Y: y0 - o}, {X: x1 + o, Y: y1 + o}, {X: x0 - o, Y: y1 + o},
	}}
	m.T = append(m.T, 0, 1, 2, 0, 2, 3)
	for i := int32(0); i < 4; i++ {
		j := (i + 1) % 4
		m.T = append(m.T, 4+i, j, i, 4+i, 4+j, j)
	}
	return m
}

func closeAbs(got, want, tol float64) bool { return math.Abs(got-want) <= tol }

func vecClose(tb testing.TB, what string, got, want geom.Vec2, tol float64) {
	tb.Helper()
	if got.Distance(want) > tol {
		tb.Errorf("%s = %v, want %v", what, got, want)
	}
}
