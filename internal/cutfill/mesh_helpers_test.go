package cutfill

import (
	"flag"
	"math"
	"math/rand/v2"
	"os"
	"strconv"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
)

var seedFlag = flag.Uint64("cutfill.seed", 0, "seed for the random surface tests (0: from $CUTFILL_SEED or the default)")

// testSeed returns the seed for randomised tests: the -cutfill.seed flag,
// else $CUTFILL_SEED, else a fixed default. Tests print it on failure.
func testSeed(tb testing.TB) uint64 {
	tb.Helper()
	if *seedFlag != 0 {
		return *seedFlag
	}
	if s := os.Getenv("CUTFILL_SEED"); s != "" {
		v, err := strconv.ParseUint(s, 10, 64)
		if err != nil {
			tb.Fatalf("CUTFILL_SEED=%q: %v", s, err)
		}
		return v
	}
	return 20240601
}

// gridMesh triangulates the rectangle [x0,x1]×[y0,y1] with nx×ny cells. With
// rng != nil, interior vertices are moved by up to jitter×cell size in each
// direction and boundary vertices along the boundary only (jitter < 0.25
// keeps every cell convex), and each cell's diagonal is picked at random.
// Heights come from z.
func gridMesh(x0, y0, x1, y1 float64, nx, ny int, z func(x, y float64) float64, rng *rand.Rand, jitter float64) geom.TriMesh {
	var m geom.TriMesh
	hx, hy := (x1-x0)/float64(nx), (y1-y0)/float64(ny)
	for j := 0; j <= ny; j++ {
		for i := 0; i <= nx; i++ {
			x, y := x0+float64(i)*hx, y0+float64(j)*hy
			if rng != nil {
				if i > 0 && i < nx {
					x += (2*rng.Float64() - 1) * jitter * hx
				}
				if j > 0 && j < ny {
					y += (2*rng.Float64() - 1) * jitter * hy
				}
			}
			if i == nx {
				x = x1
			}
			if j == ny {
				y = y1
			}
			m.V = append(m.V, geom.Vec3{X: x, Y: y, Z: z(x, y)})
		}
	}
	id := func(i, j int) int32 { return int32(j*(nx+1) + i) }
	for j := 0; j < ny; j++ {
		for i := 0; i < nx; i++ {
			a, b, c, d := id(i, j), id(i+1, j), id(i+1, j+1), id(i, j+1)
			if rng != nil && rng.IntN(2) == 1 {
				m.T = append(m.T, a, b, d, b, c, d)
			} else {
				m.T = append(m.T, a, b, c, a, c, d)
			}
		}
	}
	return m
}

// mitredPit returns the mesh of a pit with a flat bottom polygon (convex,
// counter-clockwise) at zb and planar side faces at slope horizontal:vertical
// run, up to the outward offset distance dTop (so the rim is at zb +
// dTop/run): the bottom as a fan plus two triangles per side. Corners are
// mitred (sharp), as the refbench designs define them.
func mitredPit(bottom []geom.Vec2, zb, run, dTop float64) geom.TriMesh {
	n := len(bottom)
	top := offsetMitred(bottom, dTop)
	var m geom.TriMesh
	for _, p := range bottom {
		m.V = append(m.V, geom.Vec3{X: p.X, Y: p.Y, Z: zb})
	}
	for _, p := range top {
		m.V = append(m.V, geom.Vec3{X: p.X, Y: p.Y, Z: zb + dTop/run})
	}
	for i := 1; i+1 < n; i++ {
		m.T = append(m.T, 0, int32(i), int32(i+1))
	}
	for i := range n {
		j := (i + 1) % n
		b0, b1, t0, t1 := int32(i), int32(j), int32(n+i), int32(n+j)
		m.T = append(m.T, t0, b1, b0, t0, t1, b1)
	}
	return m
}

// offsetMitred moves every edge of the convex counter-clockwise polygon p
// outward by d, with sharp corners: vertex i goes to p_i + d·(n₁ + n₂)/(1 +
// n₁·n₂), n₁ and n₂ being the outward unit normals of the edges meeting there
// (the refbench terrain.py Design.offset_polygon rule).
func offsetMitred(p []geom.Vec2, d float64) []geom.Vec2 {
	n := len(p)
	normal := func(i int) geom.Vec2 {
		a, b := p[i], p[(i+1)%n]
		e := b.Sub(a)
		l := e.Norm()
		return geom.Vec2{X: e.Y / l, Y: -e.X / l}
	}
	out := make([]geom.Vec2, n)
	for i := range n {
		n1, n2 := normal((i+n-1)%n), normal(i)
		out[i] = p[i].Add(n1.Add(n2).Scale(d / (1 + n1.Dot(n2))))
	}
	return out
}

// flatMesh is two triangles over the rectangle at height z.
func flatMesh(x0, y0, x1, y1, z float64) geom.TriMesh {
	return planeMesh(x0, y0, x1, y1, func(float64, float64) float64 { return z })
}

// planeMesh is two triangles over the rectangle carrying a linear function.
func planeMesh(x0, y0, x1, y1 float64, z func(x, y float64) float64) geom.TriMesh {
	return geom.TriMesh{
		V: []geom.Vec3{{X: x0, Y: y0, Z: z(x0, y0)}, {X: x1, Y: y0, Z: z(x1, y0)}, {X: x1, Y: y1, Z: z(x1, y1)}, {X: x0, Y: y1, Z: z(x0, y1)}},
		T: []int32{0, 1, 2, 0, 2, 3},
	}
}

// transformMesh returns m moved by (dx, dy, dz) after a rotation by theta
// (radians) about the origin.
func transformMesh(m geom.TriMesh, theta, dx, dy, dz float64) geom.TriMesh {
	s, c := math.Sincos(theta)
	out := geom.TriMesh{V: make([]geom.Vec3, len(m.V)), T: m.T}
	for i, v := range m.V {
		out.V[i] = geom.Vec3{X: c*v.X - s*v.Y + dx, Y: s*v.X + c*v.Y + dy, Z: v.Z + dz}
	}
	return out
}

func transformRing(r geom.Ring, theta, dx, dy float64) geom.Ring {
	s, c := math.Sincos(theta)
	out := make(geom.Ring, len(r))
	for i, v := range r {
		out[i] = geom.Vec2{X: c*v.X - s*v.Y + dx, Y: s*v.X + c*v.Y + dy}
	}
	return out
}

// Named test tolerances.
const (
	// exactRel is for results that are exact up to floating-point round-off
	// on inputs of a few hundred cells (the task sets 1e-9 for the pyramid).
	exactRel = 1e-9
	// swapRel is for the same overlay taken in the other order: the same
	// cells clipped in a different order, so only round-off differs.
	swapRel = 1e-11
)

// closeRel reports whether got is within rel of want, relative to |want|
// with an absolute floor of rel·floor.
func closeRel(got, want, rel, floor float64) bool {
	return math.Abs(got-want) <= rel*math.Max(math.Abs(want), floor)
}
