package tin

import (
	"errors"
	"math"
	"slices"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
	"pgregory.net/rapid"
)

// genPoints draws point sets mixing uniform points, grid-aligned points
// (cocircular and collinear configurations) and exact duplicates.
func genPoints(t *rapid.T, min, max int) []geom.Vec3 {
	n := rapid.IntRange(min, max).Draw(t, "n")
	gridded := rapid.Bool().Draw(t, "gridded")
	pts := make([]geom.Vec3, 0, n)
	for i := range n {
		var p geom.Vec3
		if gridded {
			p = v3(float64(rapid.IntRange(0, 8).Draw(t, "gx")), float64(rapid.IntRange(0, 8).Draw(t, "gy")), 0)
		} else {
			p = v3(rapid.Float64Range(-10, 10).Draw(t, "x"), rapid.Float64Range(-10, 10).Draw(t, "y"), 0)
		}
		if i > 0 && rapid.IntRange(0, 9).Draw(t, "dup") == 0 {
			p = pts[rapid.IntRange(0, i-1).Draw(t, "of")]
		}
		p.Z = rapid.Float64Range(0, 1).Draw(t, "z")
		pts = append(pts, p)
	}
	return pts
}

// TestProperty_Validate: every build of random (often degenerate) input
// either fails with a documented error or passes Validate and the count
// t = 2n − 2 − h (check-values.md §6).
func TestProperty_Validate(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		pts := genPoints(t, 0, 60)
		s, err := Build(pts, Options{Duplicates: DupFirst})
		if errors.Is(err, ErrCoordinateRange) {
			return // rapid likes the smallest normal float: outside the domain
		}
		if err != nil {
			xy := distinctXY(pts)
			if len(convexHull(vec3s(xy))) >= 3 {
				t.Fatalf("Build of %d distinct non-collinear points failed: %v", len(xy), err)
			}
			return
		}
		if err := s.Validate(); err != nil {
			t.Fatal(err)
		}
		xy := distinctXY(pts)
		if got, want := s.Summary().Triangles, 2*len(xy)-2-hullBoundaryCount(xy); got != want {
			t.Fatalf("triangles %d, want %d", got, want)
		}
	})
}

// TestProperty_OrderInvariant: points in general position have a unique
// Delaunay triangulation (check-values.md §6), so any insertion order gives
// the same triangles.
func TestProperty_OrderInvariant(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		n := rapid.IntRange(3, 80).Draw(t, "n")
		pts := make([]geom.Vec3, n)
		for i := range pts {
			pts[i] = v3(rapid.Float64Range(0, 1).Draw(t, "x"), rapid.Float64Range(0, 1).Draw(t, "y"), 0)
		}
		perm := rapid.Permutation(pts).Draw(t, "perm")
		a, err1 := Build(pts, Options{})
		b, err2 := Build(perm, Options{})
		if errors.Is(err1, ErrCoordinateRange) {
			return
		}
		if (err1 == nil) != (err2 == nil) {
			t.Fatalf("errors differ: %v vs %v", err1, err2)
		}
		if err1 != nil {
			return
		}
		// Random reals are in general position with probability one;
		// skip draws that happen to have four cocircular points.
		if hasCocircular(a) {
			return
		}
		if !maps2Equal(triangleSet(a), triangleSet(b)) {
			t.Fatalf("triangulations differ")
		}
	})
}

// hasCocircular reports whether some interior edge of s has its four points
// exactly cocircular (a tie in the Delaunay triangulation).
func hasCocircular(s *Surface) bool {
	m := s.Mesh()
	for e := range int32(len(m.T)) {
		f := s.madj[e]
		if f > e && ratInCircle(m.V[m.T[e]], m.V[m.T[next(e)]], m.V[m.T[prev(e)]], m.V[m.T[prev(f)]]) == 0 {
			return true
		}
	}
	return false
}

// TestProperty_Constraints: random breaklines (crossing each other, through
// vertices, along grid lines) are present as constrained edges after the
// build, the result is a valid constrained Delaunay triangulation, and the
// surface follows each breakline wherever no split put a survey point on
// it.
func TestProperty_Constraints(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		pts := genPoints(t, 3, 40)
		for i := range pts {
			pts[i].Z = 0
		}
		pts = append(pts, v3(-1, -1, 0), v3(11, -1, 0), v3(11, 11, 0), v3(-1, 11, 0))
		nb := rapid.IntRange(1, 4).Draw(t, "breaklines")
		var bls []Breakline
		for k := range nb {
			nv := rapid.IntRange(2, 5).Draw(t, "vertices")
			var bp []geom.Vec3
			for range nv {
				bp = append(bp, v3(float64(rapid.IntRange(0, 20).Draw(t, "bx"))/2, float64(rapid.IntRange(0, 20).Draw(t, "by"))/2, float64(k+1)))
			}
			bls = append(bls, Breakline{Name: "b", Pts: bp})
		}
		s, err := Build(pts, Options{Breaklines: bls, ConflictTolM: 1e9})
		if errors.Is(err, ErrCoordinateRange) {
			return
		}
		if err != nil {
			t.Fatal(err)
		}
		if err := s.Validate(); err != nil {
			t.Fatal(err)
		}
		// Every breakline segment is covered by constrained edges: each
		// sample point along it lies on a constrained edge.
		m := s.Mesh()
		for _, bl := range bls {
			for k := 0; k+1 < len(bl.Pts); k++ {
				a, b := bl.Pts[k], bl.Pts[k+1]
				if a.X == b.X && a.Y == b.Y {
					continue
				}
				for _, u := range []float64{0.25, 0.5, 0.75} {
					p := v2(a.X+u*(b.X-a.X), a.Y+u*(b.Y-a.Y))
					if !onConstrainedEdge(s, m, p) {
						t.Fatalf("breakline point %v is not on a constrained edge", p)
					}
				}
			}
		}
	})
}

// onConstrainedEdge reports whether p lies within round-off of a constrained
// edge of the mesh.
func onConstrainedEdge(s *Surface, m geom.TriMesh, p geom.Vec2) bool {
	for t := range m.NumTriangles() {
		for k := range 3 {
			if !s.IsConstrained(t, k) {
				continue
			}
			a, b := m.V[m.T[3*t+k]], m.V[m.T[3*t+(k+1)%3]]
			if math.Sqrt(geom.SegmentDistanceSquared(p, v2(a.X, a.Y), v2(b.X, b.Y))) < 1e-9 {
				return true
			}
		}
	}
	return false
}

// TestProperty_Inputs: Build never modifies its input.
func TestProperty_Inputs(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		pts := genPoints(t, 0, 30)
		before := slices.Clone(pts)
		_, _ = Build(pts, Options{MergeTolM: rapid.Float64Range(0, 1).Draw(t, "tol")})
		if !slices.Equal(pts, before) {
			t.Fatal("input modified")
		}
	})
}
