package tin

import (
	"errors"
	"math"
	"math/rand/v2"
	"os/exec"
	"path/filepath"
	"slices"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/reftest"
	"github.com/dugout-estimating/dugout/internal/robust"
)

func TestBuild_BadInput(t *testing.T) {
	nan, inf := math.NaN(), math.Inf(1)
	tests := []struct {
		name string
		pts  []geom.Vec3
		want error
	}{
		{"nil", nil, ErrTooFewPoints},
		{"one", parsePts(t, "0 0 1"), ErrTooFewPoints},
		{"two", parsePts(t, "0 0 1; 1 0 1"), ErrTooFewPoints},
		{"all duplicates", parsePts(t, "2 3 1; 2 3 1; 2 3 1.01; 2 3 1"), ErrTooFewPoints},
		{"two distinct with duplicates", parsePts(t, "0 0 1; 0 0 1; 1 1 1; 1 1 1"), ErrTooFewPoints},
		{"collinear", parsePts(t, "0 0 0; 1 1 0; 2 2 0; 3 3 0; -5 -5 0"), ErrCollinear},
		{"collinear with duplicates", parsePts(t, "0 0 0; 1 1 0; 1 1 0; 2 2 0"), ErrCollinear},
		{"collinear vertical", parsePts(t, "5 0 0; 5 1 0; 5 7 0"), ErrCollinear},
		{"collinear at utm offset", []geom.Vec3{v3(5e6, 5e6, 0), v3(5e6+0.001, 5e6+0.001, 0), v3(5e6+0.002, 5e6+0.002, 0)}, ErrCollinear},
		{"nan x", []geom.Vec3{v3(0, 0, 0), v3(nan, 1, 0), v3(1, 0, 0)}, ErrNonFinite},
		{"inf z", []geom.Vec3{v3(0, 0, 0), v3(0, 1, 0), v3(1, 0, inf)}, ErrNonFinite},
		{"huge", []geom.Vec3{v3(0, 0, 0), v3(0, 1, 0), v3(2e15, 0, 0)}, ErrCoordinateRange},
		{"underflow", []geom.Vec3{v3(0, 0, 0), v3(0, 1, 0), v3(1, 2.2e-308, 0)}, ErrCoordinateRange},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			s, err := Build(tt.pts, Options{})
			if !errors.Is(err, tt.want) {
				t.Fatalf("Build(%v) = %v, %v; want error %v", tt.pts, s, err, tt.want)
			}
		})
	}
	// The non-finite error names the point.
	_, err := Build([]geom.Vec3{v3(0, 0, 0), v3(0, 1, 0), v3(1, nan, 0)}, Options{})
	var pe *PointError
	if !errors.As(err, &pe) || pe.Index != 2 {
		t.Errorf("Build with NaN at point 2: error %v, want *PointError with Index 2", err)
	}
}

func TestBuild_BadOptions(t *testing.T) {
	pts := parsePts(t, "0 0 0; 1 0 0; 0 1 0")
	for _, opt := range []Options{
		{MergeTolM: -1}, {MergeTolM: math.NaN()}, {ConflictTolM: -0.1}, {MaxEdgeM: math.Inf(1)},
		{Duplicates: DupPolicy(7)},
	} {
		if _, err := Build(pts, opt); !errors.Is(err, ErrOption) {
			t.Errorf("Build with %+v: error %v, want ErrOption", opt, err)
		}
	}
}

// TestBuild_DoesNotModifyInput: Build's contract.
func TestBuild_DoesNotModifyInput(t *testing.T) {
	r := rand.New(rand.NewPCG(testSeed(t), 1))
	pts := randomPoints(r, 500, v2(0, 0), 10, 10, func(x, y float64) float64 { return x })
	pts = append(pts, pts[3], pts[7]) // duplicates
	before := slices.Clone(pts)
	bl := []Breakline{{Name: "b", Pts: []geom.Vec3{v3(1, 1, 5), v3(9, 8, 6)}}}
	blBefore := slices.Clone(bl[0].Pts)
	mustBuild(t, pts, Options{Breaklines: bl, MergeTolM: 0.01})
	if !slices.Equal(pts, before) || !slices.Equal(bl[0].Pts, blBefore) {
		t.Errorf("Build modified its input")
	}
}

// TestBuild_EulerCount checks t = 2n − 2 − h, where h counts the points on
// the hull boundary, collinear ones included (check-values.md §6,
// [confirmed]: de Berg et al., Computational Geometry, 3rd ed., Thm 9.1),
// and e = 3n − 3 − h, on random sets and on sets with collinear hull runs.
func TestBuild_EulerCount(t *testing.T) {
	seed := testSeed(t)
	r := rand.New(rand.NewPCG(seed, 2))
	cases := map[string][]geom.Vec3{
		"random 3":    randomPoints(r, 3, v2(0, 0), 1, 1, nil),
		"random 10":   randomPoints(r, 10, v2(0, 0), 1, 1, nil),
		"random 1000": randomPoints(r, 1000, v2(0, 0), 100, 50, nil),
		"random far":  randomPoints(r, 1000, v2(5e6, 5e6), 1, 1, nil),
	}
	// A square with many points on each side (collinear hull runs) plus
	// random interior points.
	var sq []geom.Vec3
	for i := range 11 {
		f := float64(i)
		sq = append(sq, v3(f, 0, 0), v3(10, f, 0), v3(10-f, 10, 0), v3(0, 10-f, 0))
	}
	sq = append(sq, randomPoints(r, 100, v2(0.5, 0.5), 9, 9, nil)...)
	cases["square with collinear sides"] = sq
	for name, pts := range cases {
		t.Run(name, func(t *testing.T) {
			s := mustBuild(t, pts, Options{})
			xy := distinctXY(pts)
			n, h := len(xy), hullBoundaryCount(xy)
			sum := s.Summary()
			if sum.Triangles != 2*n-2-h {
				t.Errorf("triangles = %d, want 2n−2−h = %d (n=%d, h=%d, seed %d)", sum.Triangles, 2*n-2-h, n, h, seed)
			}
			if sum.HullVertices != h {
				t.Errorf("hull vertices = %d, want %d", sum.HullVertices, h)
			}
			edges := (3*sum.Triangles + h) / 2
			if edges != 3*n-3-h {
				t.Errorf("edges = %d, want 3n−3−h = %d", edges, 3*n-3-h)
			}
			if sum.Vertices != n {
				t.Errorf("vertices = %d, want %d", sum.Vertices, n)
			}
		})
	}
}

// grid returns an nx × ny grid of spacing h from origin o.
func grid(o geom.Vec2, h float64, nx, ny int) []geom.Vec3 {
	var pts []geom.Vec3
	for j := range ny {
		for i := range nx {
			pts = append(pts, v3(o.X+float64(i)*h, o.Y+float64(j)*h, 0))
		}
	}
	return pts
}

// TestBuild_Degenerate runs configurations where almost every quadrilateral
// is cocircular or every hull run collinear: square grids (at the origin and
// at UTM-sized offsets with millimetre spacing), points on a circle, and
// points closer together than 1e-14. Validate checks the exact empty-circle
// property; the count checks t = 2n − 2 − h (check-values.md §6).
func TestBuild_Degenerate(t *testing.T) {
	var circle []geom.Vec3
	for k := range 64 {
		a := 2 * math.Pi * float64(k) / 64
		circle = append(circle, v3(3*math.Cos(a)+1, 3*math.Sin(a)+1, 0))
	}
	circleCentre := append(slices.Clone(circle), v3(1, 1, 0))
	var close []geom.Vec3
	r := rand.New(rand.NewPCG(testSeed(t), 3))
	for range 50 {
		x, y := r.Float64()*100, r.Float64()*100
		close = append(close, v3(x, y, 0), v3(math.Nextafter(x, 200), y, 0), v3(x+7e-15*64, y+7e-15*64, 0))
	}
	tests := []struct {
		name string
		pts  []geom.Vec3
	}{
		{"grid 30x20", grid(v2(0, 0), 1, 30, 20)},
		{"grid utm mm", grid(v2(5e6, 5e6), 0.001, 25, 25)},
		{"grid utm 1m", grid(v2(4.5e6, 5e6), 1, 25, 25)},
		{"grid 40x3 quarter metre", grid(v2(-3, 7), 0.25, 40, 3)},
		{"circle", circle},
		{"circle and centre", circleCentre},
		{"near-coincident pairs", close},
		{"thin strip", append(grid(v2(0, 0), 1, 200, 2), v3(100.5, 0.5, 0))},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			s := mustBuild(t, tt.pts, Options{})
			xy := distinctXY(tt.pts)
			n, h := len(xy), hullBoundaryCount(xy)
			if got := s.Summary().Triangles; got != 2*n-2-h {
				t.Errorf("triangles = %d, want 2n−2−h = %d (n=%d, h=%d)", got, 2*n-2-h, n, h)
			}
			if got := s.Summary().Vertices; got != n {
				t.Errorf("vertices = %d, want all %d distinct points", got, n)
			}
			exactCheck(t, s)
			// The reference bench's validator (exact rational rechecks of
			// near-zero floating-point results) on the same points.
			if reftest.Required() || pythonOK() {
				path := filepath.Join(t.TempDir(), "pts.csv")
				writePointsCSV(t, path, tt.pts)
				chk := runRefDelaunay(t, path, canonTris(t, s), "")
				if !chk.Valid || chk.DelaunayViolations != 0 {
					t.Errorf("ref_delaunay.py --check: %+v", chk)
				}
			}
		})
	}
}

// pythonOK reports whether the reference interpreter with SciPy is present
// (tests that only add a reference check to an internal one run it when it
// is, and require it in CI through reftest).
func pythonOK() bool {
	return exec.Command("/usr/bin/python3", "-c", "import numpy, scipy.spatial").Run() == nil
}

// planeZ3 is the test plane z = 100 + 0.02x − 0.035y.
func planeZ3(x, y float64) float64 { return 100 + 0.02*x - 0.035*y }

// planeTol is the tolerance for reproducing a plane: interpolation of a
// linear function is exact in real arithmetic; in float64 the error is a few
// ulps of the elevation (~1e-14 m at 100 m), far inside the 1e-9 m the
// requirement asks for.
const planeTol = 1e-9

// TestBuild_PlaneReproduction: linear interpolation reproduces a linear
// function exactly (analytic), so points sampled on a plane give the plane
// at every query point, through Elevation and SampleLattice.
func TestBuild_PlaneReproduction(t *testing.T) {
	seed := testSeed(t)
	r := rand.New(rand.NewPCG(seed, 4))
	for _, off := range []geom.Vec2{v2(0, 0), v2(-200, 300)} {
		pts := randomPoints(r, 3000, off, 120, 80, planeZ3)
		pts = append(pts, grid(v2(off.X+10, off.Y+10), 2, 20, 20)...)
		for i := range pts[3000:] {
			p := &pts[3000+i]
			p.Z = planeZ3(p.X, p.Y)
		}
		s := mustBuild(t, pts, Options{})
		hull := s.Hull()
		for range 20000 {
			x, y := off.X+r.Float64()*120, off.Y+r.Float64()*80
			z, ok := s.Elevation(x, y)
			if inHull := hull.Contains(v2(x, y)); ok != inHull && hull.BoundaryDistance(v2(x, y)) > 1e-9 {
				t.Fatalf("Elevation(%g, %g) ok = %v, but inside hull = %v (seed %d)", x, y, ok, inHull, seed)
			}
			if ok && math.Abs(z-planeZ3(x, y)) > planeTol {
				t.Fatalf("Elevation(%g, %g) = %.15g, want plane %.15g (seed %d)", x, y, z, planeZ3(x, y), seed)
			}
		}
		// Every input point reproduces its own elevation.
		for i, p := range pts {
			z, ok := s.Elevation(p.X, p.Y)
			if !ok || math.Abs(z-p.Z) > planeTol {
				t.Fatalf("Elevation at input point %d (%g, %g) = %g, %v; want %g", i, p.X, p.Y, z, ok, p.Z)
			}
		}
	}
}

// TestBuild_HugeOffset: coordinates near 5,000,000 m with millimetre
// spacing, random and grid-aligned, triangulate validly (exact predicates),
// and the triangle count matches 2n − 2 − h (check-values.md §6).
func TestBuild_HugeOffset(t *testing.T) {
	seed := testSeed(t)
	r := rand.New(rand.NewPCG(seed, 5))
	var pts []geom.Vec3
	for range 2000 {
		// Millimetre positions in a 1 m square at 5e6 m.
		pts = append(pts, v3(5e6+float64(r.IntN(1000))*0.001, 5e6+float64(r.IntN(1000))*0.001, r.Float64()))
	}
	s := mustBuild(t, pts, Options{})
	xy := distinctXY(pts)
	n, h := len(xy), hullBoundaryCount(xy)
	if got := s.Summary().Triangles; got != 2*n-2-h {
		t.Errorf("triangles = %d, want %d (seed %d)", got, 2*n-2-h, seed)
	}
	if got := s.Summary().DuplicatesMerged; got != len(pts)-n {
		t.Errorf("duplicates merged = %d, want %d", got, len(pts)-n)
	}
	exactCheck(t, s)
	path := filepath.Join(t.TempDir(), "pts.csv")
	writePointsCSV(t, path, pts)
	if chk := runRefDelaunay(t, path, canonTris(t, s), ""); !chk.Valid || chk.DelaunayViolations != 0 {
		t.Errorf("ref_delaunay.py --check: %+v", chk)
	}
}

// TestBuild_InsertionOrder: a Delaunay triangulation of points in general
// position is unique (check-values.md §6, empty-circumcircle property), so
// building from any permutation of the points gives the same triangles.
func TestBuild_InsertionOrder(t *testing.T) {
	seed := testSeed(t)
	r := rand.New(rand.NewPCG(seed, 6))
	pts := randomPoints(r, 3000, v2(0, 0), 100, 100, nil)
	want := triangleSet(mustBuild(t, pts, Options{}))
	for k := range 3 {
		perm := slices.Clone(pts)
		r.Shuffle(len(perm), func(i, j int) { perm[i], perm[j] = perm[j], perm[i] })
		got := triangleSet(mustBuild(t, perm, Options{}))
		if !maps2Equal(got, want) {
			t.Fatalf("permutation %d (seed %d): triangulation differs", k, seed)
		}
	}
}

// triangleSet returns the triangles of s as sets of plan positions,
// independent of vertex numbering.
func triangleSet(s *Surface) map[[3]geom.Vec2]bool {
	m := s.Mesh()
	out := make(map[[3]geom.Vec2]bool, m.NumTriangles())
	for t := range m.NumTriangles() {
		a, b, c := m.Triangle(t)
		tr := [3]geom.Vec2{v2(a.X, a.Y), v2(b.X, b.Y), v2(c.X, c.Y)}
		less := func(p, q geom.Vec2) bool { return p.X < q.X || (p.X == q.X && p.Y < q.Y) }
		for less(tr[1], tr[0]) || less(tr[2], tr[0]) {
			tr = [3]geom.Vec2{tr[1], tr[2], tr[0]}
		}
		out[tr] = true
	}
	return out
}

func maps2Equal(a, b map[[3]geom.Vec2]bool) bool {
	if len(a) != len(b) {
		return false
	}
	for k := range a {
		if !b[k] {
			return false
		}
	}
	return true
}

// TestBuild_AllTrianglesCCW checks the Mesh contract directly (independent
// of Validate): counter-clockwise triangles, every vertex used.
func TestBuild_AllTrianglesCCW(t *testing.T) {
	r := rand.New(rand.NewPCG(testSeed(t), 7))
	s := mustBuild(t, randomPoints(r, 1000, v2(0, 0), 1, 1, nil), Options{})
	m := s.Mesh()
	used := make([]bool, len(m.V))
	for i := range m.NumTriangles() {
		a, b, c := m.Triangle(i)
		if robust.Orient2D(v2(a.X, a.Y), v2(b.X, b.Y), v2(c.X, c.Y)) != robust.Positive {
			t.Fatalf("triangle %d is not counter-clockwise", i)
		}
		for k := range 3 {
			used[m.T[3*i+k]] = true
		}
	}
	for i, u := range used {
		if !u {
			t.Fatalf("vertex %d unused", i)
		}
	}
}
