package tin

import (
	"math"
	"math/rand/v2"
	"sync"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/robust"
)

// containsClosed reports whether mesh triangle t contains p, boundary
// included (exact orientation).
func containsClosed(m geom.TriMesh, t int, p geom.Vec2) bool {
	a, b, c := m.Triangle(t)
	pa, pb, pc := v2(a.X, a.Y), v2(b.X, b.Y), v2(c.X, c.Y)
	return robust.Orient2D(pa, pb, p) >= 0 && robust.Orient2D(pb, pc, p) >= 0 && robust.Orient2D(pc, pa, p) >= 0
}

// checkLocate compares Locate with a brute-force scan of every triangle (the
// oracle): a located triangle must contain the point, and a point reported
// outside must be in no triangle.
func checkLocate(t *testing.T, s *Surface, queries []geom.Vec2) {
	t.Helper()
	m := s.Mesh()
	for _, p := range queries {
		tri, ok := s.Locate(p.X, p.Y)
		if ok {
			if !containsClosed(m, tri, p) {
				t.Fatalf("Locate(%v) = triangle %d, which does not contain it", p, tri)
			}
			continue
		}
		for k := range m.NumTriangles() {
			if containsClosed(m, k, p) {
				t.Fatalf("Locate(%v) = outside, but triangle %d contains it", p, k)
			}
		}
	}
}

// queriesFor returns random points over (and around) the surface's bounds
// plus every vertex and points on axis-parallel edges' interiors (exactly
// representable midpoints).
func queriesFor(r *rand.Rand, s *Surface, n int) []geom.Vec2 {
	b := s.Bounds().Expand(1)
	var q []geom.Vec2
	for range n {
		q = append(q, v2(b.Min.X+r.Float64()*b.Width(), b.Min.Y+r.Float64()*b.Height()))
	}
	m := s.Mesh()
	for _, v := range m.V {
		q = append(q, v2(v.X, v.Y))
	}
	for t := range m.NumTriangles() {
		for k := range 3 {
			a, c := m.V[m.T[3*t+k]], m.V[m.T[3*t+(k+1)%3]]
			if a.X == c.X || a.Y == c.Y {
				q = append(q, v2((a.X+c.X)/2, (a.Y+c.Y)/2))
			}
		}
	}
	return q
}

func TestLocate(t *testing.T) {
	seed := testSeed(t)
	r := rand.New(rand.NewPCG(seed, 40))
	l := []geom.Vec3{}
	for _, p := range grid(v2(0, 0), 1, 21, 21) {
		if p.X <= 10 || p.Y <= 10 {
			l = append(l, p)
		}
	}
	cases := []struct {
		name string
		s    *Surface
	}{
		{"random", mustBuild(t, randomPoints(r, 2000, v2(0, 0), 50, 30, nil), Options{})},
		{"grid", mustBuild(t, grid(v2(0, 0), 0.5, 30, 30), Options{})},
		{"L trimmed", mustBuild(t, l, Options{MaxEdgeM: 1.5})},
		{"boundary", mustBuild(t, grid(v2(0, 0), 1, 21, 21), Options{Boundary: []geom.Ring{{v2(2, 2), v2(18, 2), v2(10, 10), v2(18, 18), v2(2, 18)}}})},
		{"far", mustBuild(t, randomPoints(r, 2000, v2(5e6, 5e6), 1, 1, nil), Options{})},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			checkLocate(t, tc.s, queriesFor(r, tc.s, 3000))
			fm, err := FromMesh(tc.s.Mesh())
			if err != nil {
				t.Fatal(err)
			}
			checkLocate(t, fm, queriesFor(r, fm, 1000))
		})
	}
}

func TestLocate_NotFinite(t *testing.T) {
	s := mustBuild(t, grid(v2(0, 0), 1, 3, 3), Options{})
	fm, _ := FromMesh(s.Mesh())
	for _, sf := range []*Surface{s, fm} {
		for _, p := range [][2]float64{{math.NaN(), 1}, {1, math.NaN()}, {math.Inf(1), 1}, {1, math.Inf(-1)}} {
			if _, ok := sf.Locate(p[0], p[1]); ok {
				t.Errorf("Locate(%v) ok, want outside", p)
			}
			if z, ok := sf.Elevation(p[0], p[1]); ok || !math.IsNaN(z) {
				t.Errorf("Elevation(%v) = %g, %v; want NaN, false", p, z, ok)
			}
		}
	}
}

// TestElevation_Concurrent: queries do not modify the surface (run with
// -race to check).
func TestElevation_Concurrent(t *testing.T) {
	r := rand.New(rand.NewPCG(testSeed(t), 41))
	s := mustBuild(t, randomPoints(r, 5000, v2(0, 0), 100, 100, planeZ3), Options{})
	var wg sync.WaitGroup
	for g := range 4 {
		wg.Add(1)
		go func() {
			defer wg.Done()
			rr := rand.New(rand.NewPCG(uint64(g), 1))
			for range 5000 {
				x, y := rr.Float64()*100, rr.Float64()*100
				if z, ok := s.Elevation(x, y); ok && math.Abs(z-planeZ3(x, y)) > planeTol {
					t.Errorf("Elevation(%g, %g) = %g", x, y, z)
					return
				}
			}
		}()
	}
	wg.Wait()
}
