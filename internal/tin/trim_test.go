package tin

import (
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// areaTol is the relative tolerance for comparing a trimmed surface's area
// with its boundary polygon's: both are sums of exact-in-reals terms, equal
// to round-off (about n·1e-16); 1e-9 leaves a wide margin.
const areaTol = 1e-9

func relClose(a, b, tol float64) bool {
	return math.Abs(a-b) <= tol*math.Max(math.Abs(a), math.Abs(b))
}

// TestBoundary_Inside: a boundary polygon inside the survey trims the surface
// to exactly the polygon: plan area equals the polygon's shoelace area
// (analytic), queries outside report ok=false, the hull is the polygon.
func TestBoundary_Inside(t *testing.T) {
	seed := testSeed(t)
	r := rand.New(rand.NewPCG(seed, 30))
	pts := randomPoints(r, 3000, v2(0, 0), 100, 100, planeZ3)
	ring := geom.Ring{v2(20, 20), v2(80, 25), v2(70, 60), v2(50, 45), v2(30, 80)} // non-convex, counter-clockwise
	for _, rr := range []geom.Ring{ring, reversed(ring)} {
		s := mustBuild(t, pts, Options{Boundary: []geom.Ring{rr}})
		exactCheck(t, s)
		if got, want := s.PlanArea(), ring.Area(); !relClose(got, want, areaTol) {
			t.Errorf("PlanArea = %.12g, want the polygon's %.12g (seed %d)", got, want, seed)
		}
		if got := s.Hull(); !relClose(got.Area(), ring.Area(), areaTol) || len(got) < len(ring) {
			t.Errorf("Hull area %g with %d vertices, want the polygon (%g)", got.Area(), len(got), ring.Area())
		}
		for range 5000 {
			p := v2(r.Float64()*100, r.Float64()*100)
			z, ok := s.Elevation(p.X, p.Y)
			in := ring.Contains(p)
			if ring.BoundaryDistance(p) < 1e-9 {
				continue // on the boundary: either answer is within round-off
			}
			if ok != in {
				t.Fatalf("Elevation(%g, %g) ok = %v, want %v (seed %d)", p.X, p.Y, ok, in, seed)
			}
			if ok && math.Abs(z-planeZ3(p.X, p.Y)) > planeTol {
				t.Fatalf("Elevation(%g, %g) = %g, want plane %g", p.X, p.Y, z, planeZ3(p.X, p.Y))
			}
		}
		// Boundary vertices lie on the surface (elevation from the plane).
		for _, p := range ring {
			if z, ok := s.Elevation(p.X, p.Y); !ok || math.Abs(z-planeZ3(p.X, p.Y)) > planeTol {
				t.Errorf("Elevation at boundary vertex (%g, %g) = %g, %v", p.X, p.Y, z, ok)
			}
		}
		sum := s.Summary()
		if sum.TrimmedTriangles == 0 || sum.Pieces != 1 || sum.BoundaryRings != 1 {
			t.Errorf("summary %+v", sum)
		}
	}
}

func reversed(r geom.Ring) geom.Ring {
	out := make(geom.Ring, len(r))
	for i, p := range r {
		out[len(r)-1-i] = p
	}
	return out
}

// TestBoundary_Clipped: a boundary larger than the survey trims to the part
// inside the convex hull: here a rectangle overhanging a square survey on
// one side leaves the square ∩ rectangle (analytic area).
func TestBoundary_Clipped(t *testing.T) {
	pts := grid(v2(0, 0), 1, 21, 21) // 0..20 square
	for i := range pts {
		pts[i].Z = pts[i].X
	}
	tests := []struct {
		name string
		ring geom.Ring
		area float64
	}{
		{"overhang", geom.Ring{v2(5, -10), v2(30, -10), v2(30, 15), v2(5, 15)}, 15 * 15},
		{"covers all", geom.Ring{v2(-5, -5), v2(25, -5), v2(25, 25), v2(-5, 25)}, 400},
		{"on the hull", geom.Ring{v2(0, 0), v2(20, 0), v2(20, 20), v2(0, 20)}, 400},
		{"diamond over corners", geom.Ring{v2(10, -10), v2(30, 10), v2(10, 30), v2(-10, 10)}, 400},
		{"inside touching", geom.Ring{v2(0, 0), v2(20, 0), v2(10, 10)}, 100},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			s := mustBuild(t, pts, Options{Boundary: []geom.Ring{tt.ring}})
			if got := s.PlanArea(); !relClose(got, tt.area, areaTol) {
				t.Errorf("PlanArea = %.12g, want %g", got, tt.area)
			}
			// Elevation is unchanged (z = x is linear).
			if z, ok := s.Elevation(10.5, 5.25); !ok || math.Abs(z-10.5) > planeTol {
				t.Errorf("Elevation(10.5, 5.25) = %g, %v", z, ok)
			}
		})
	}
	// Two overlapping rings trim to their union; two apart give two pieces.
	a := geom.Ring{v2(1, 1), v2(9, 1), v2(9, 9), v2(1, 9)}
	b := geom.Ring{v2(5, 5), v2(15, 5), v2(15, 15), v2(5, 15)}
	s := mustBuild(t, pts, Options{Boundary: []geom.Ring{a, b}})
	if got := s.PlanArea(); !relClose(got, 64+100-16, areaTol) {
		t.Errorf("union PlanArea = %g, want 148", got)
	}
	c := geom.Ring{v2(12, 12), v2(19, 12), v2(19, 19), v2(12, 19)}
	s = mustBuild(t, pts, Options{Boundary: []geom.Ring{a, c}})
	if s.Summary().Pieces != 2 || !relClose(s.Hull().Area(), 64, areaTol) {
		t.Errorf("two pieces: pieces %d, hull area %g; want 2 and the larger, 64", s.Summary().Pieces, s.Hull().Area())
	}
	said := false
	for _, w := range s.Warnings() {
		said = said || strings.Contains(w.Msg, "2 separate pieces")
	}
	if !said {
		t.Errorf("warnings %v do not mention the two pieces", s.Warnings())
	}
}

func TestBoundary_Errors(t *testing.T) {
	pts := grid(v2(0, 0), 1, 5, 5)
	tests := []struct {
		name       string
		ring       geom.Ring
		want       error
		edgeA, edB int
	}{
		{"two vertices", geom.Ring{v2(0, 0), v2(1, 1)}, ErrBoundary, -1, -1},
		{"repeated vertex only", geom.Ring{v2(1, 1), v2(1, 1), v2(1, 1)}, ErrBoundary, -1, -1},
		{"zero area", geom.Ring{v2(0, 0), v2(1, 1), v2(2, 2)}, ErrBoundary, -1, -1},
		{"bow tie", geom.Ring{v2(0, 0), v2(4, 4), v2(4, 0), v2(0, 4)}, ErrBoundarySelfIntersect, 0, 2},
		// Vertex 3 touches edge 0; edges 2 and 3 both end there, and the
		// sweep reports the first pair it meets.
		{"touching vertex", geom.Ring{v2(0, 0), v2(4, 0), v2(4, 4), v2(2, 0), v2(0, 4)}, ErrBoundarySelfIntersect, 0, 3},
		{"fold back", geom.Ring{v2(0, 0), v2(4, 0), v2(2, 0), v2(2, 3)}, ErrBoundarySelfIntersect, 0, 1},
		{"nan", geom.Ring{v2(0, 0), v2(4, 0), v2(math.NaN(), 3)}, ErrBoundary, -1, -1},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := Build(pts, Options{Boundary: []geom.Ring{tt.ring}})
			var be *BoundaryError
			if !errors.Is(err, tt.want) || !errors.As(err, &be) {
				t.Fatalf("Build: error %v, want %v as *BoundaryError", err, tt.want)
			}
			if tt.edgeA >= 0 && (be.EdgeA != tt.edgeA || be.EdgeB != tt.edB) {
				t.Errorf("edges %d, %d; want %d, %d (%v)", be.EdgeA, be.EdgeB, tt.edgeA, tt.edB, err)
			}
		})
	}
	// A boundary that misses the survey leaves nothing.
	_, err := Build(pts, Options{Boundary: []geom.Ring{{v2(10, 10), v2(11, 10), v2(11, 11)}}})
	if !errors.Is(err, ErrEmptySurface) {
		t.Errorf("boundary outside the survey: error %v, want ErrEmptySurface", err)
	}
	// A closing copy of the first vertex is accepted.
	mustBuild(t, pts, Options{Boundary: []geom.Ring{{v2(0, 0), v2(3, 0), v2(3, 3), v2(0, 0)}}})
}

// TestMaxEdge: survey points on an L-shaped site; without trimming the
// convex hull bridges the unsurveyed corner with long triangles. Trimming
// with a maximum edge length removes exactly the bridging triangles: every
// remaining boundary triangle has all unconstrained edges <= L, and the area
// is the L-shape's (analytic, 3/4 of the square for the grid).
func TestMaxEdge(t *testing.T) {
	var pts []geom.Vec3
	for _, p := range grid(v2(0, 0), 1, 21, 21) {
		if p.X <= 10 || p.Y <= 10 {
			pts = append(pts, p)
		}
	}
	full := mustBuild(t, pts, Options{})
	if !relClose(full.PlanArea(), 400-50, areaTol) { // hull cuts the corner diagonally
		t.Fatalf("untrimmed area = %g, want 350", full.PlanArea())
	}
	s := mustBuild(t, pts, Options{MaxEdgeM: 1.5})
	// The L (300 m²) plus the half cell at the inner corner: (10,10),
	// (11,10), (10,11) are all surveyed and 1 m apart.
	if got, want := s.PlanArea(), 400.0-100+0.5; !relClose(got, want, areaTol) {
		t.Errorf("trimmed area = %g, want %g", got, want)
	}
	m := s.Mesh()
	for tr := range m.NumTriangles() {
		for k := range 3 {
			a, b := m.V[m.T[3*tr+k]], m.V[m.T[3*tr+(k+1)%3]]
			if d := math.Hypot(a.X-b.X, a.Y-b.Y); d > 1.5 && s.madj[3*tr+k] < 0 {
				t.Errorf("boundary edge of length %g > 1.5 left", d)
			}
		}
	}
	if _, ok := s.Elevation(15, 15); ok {
		t.Errorf("Elevation(15, 15) in the unsurveyed corner: ok, want outside")
	}
	// Interior triangles are never removed, however long their edges: a
	// hole surrounded by survey keeps its long triangles.
	var ring []geom.Vec3
	for _, p := range grid(v2(0, 0), 1, 21, 21) {
		if p.X < 5 || p.X > 15 || p.Y < 5 || p.Y > 15 || (p.X == 10 && p.Y == 10) {
			ring = append(ring, p)
		}
	}
	s = mustBuild(t, ring, Options{MaxEdgeM: 1.5})
	if !relClose(s.PlanArea(), 400, areaTol) {
		t.Errorf("surface with an interior gap: area %g, want 400 (no interior triangle removed)", s.PlanArea())
	}
	// Everything long: error.
	if _, err := Build(parsePts(t, "0 0 0; 10 0 0; 0 10 0"), Options{MaxEdgeM: 1}); !errors.Is(err, ErrEmptySurface) {
		t.Errorf("all edges too long: error %v, want ErrEmptySurface", err)
	}
}

// TestMaxEdge_ConstraintsExempt: constrained edges are exempt from the
// length test (breaklines and boundary sides are deliberate). Four points in
// a diamond: the Delaunay diagonal (1.8 m) is too long and trimming removes
// everything; with a breakline along the other diagonal (2 m, constrained)
// both triangles stay, their other edges being 1.345 m.
func TestMaxEdge_ConstraintsExempt(t *testing.T) {
	pts := parsePts(t, "0 0 0; 2 0 0; 1 0.9 1; 1 -0.9 1")
	if _, err := Build(pts, Options{MaxEdgeM: 1.5}); !errors.Is(err, ErrEmptySurface) {
		t.Fatalf("without breakline: error %v, want ErrEmptySurface", err)
	}
	bl := Breakline{Name: "crest", Pts: []geom.Vec3{v3(0, 0, 0), v3(2, 0, 0)}}
	s := mustBuild(t, pts, Options{MaxEdgeM: 1.5, Breaklines: []Breakline{bl}})
	if !relClose(s.PlanArea(), 1.8, areaTol) {
		t.Errorf("area = %g, want 1.8", s.PlanArea())
	}
}

// clipConvex clips polygon subj by the convex counter-clockwise polygon
// clip (Sutherland & Hodgman, "Reentrant polygon clipping", CACM 17(1),
// 1974). The area of the result is the area of the intersection even when
// subj is not convex.
func clipConvex(subj, clip geom.Ring) geom.Ring {
	out := subj
	for i := range clip {
		a, b := clip[i], clip[(i+1)%len(clip)]
		in := out
		out = nil
		side := func(p geom.Vec2) float64 { return b.Sub(a).Cross(p.Sub(a)) }
		for k := range in {
			p, q := in[k], in[(k+1)%len(in)]
			sp, sq := side(p), side(q)
			if sp >= 0 {
				out = append(out, p)
			}
			if (sp >= 0) != (sq >= 0) {
				out = append(out, p.Lerp(q, sp/(sp-sq)))
			}
		}
		if len(out) == 0 {
			return nil
		}
	}
	return out
}

// TestBoundary_RandomOverhang: random star-shaped boundaries around a random
// cloud, most overhanging the convex hull at oblique angles. The trimmed
// area must equal the area of ring ∩ hull from Sutherland–Hodgman clipping,
// which fails if a clipped boundary piece stops short of the hull (a gap
// joins the inside to the outside).
func TestBoundary_RandomOverhang(t *testing.T) {
	seed := testSeed(t)
	r := rand.New(rand.NewPCG(seed, 31))
	for k := range 40 {
		var pts []geom.Vec3
		for range 400 {
			a, d := r.Float64()*2*math.Pi, 50*math.Sqrt(r.Float64())
			pts = append(pts, v3(d*math.Cos(a), d*math.Sin(a), 0))
		}
		c := v2(r.Float64()*60-30, r.Float64()*60-30)
		var ring geom.Ring
		m := 3 + r.IntN(8)
		for i := range m {
			a := 2 * math.Pi * (float64(i) + 0.8*r.Float64()) / float64(m)
			d := 10 + r.Float64()*60
			ring = append(ring, v2(c.X+d*math.Cos(a), c.Y+d*math.Sin(a)))
		}
		hull := geom.Ring(convexHull(pts))
		want := clipConvex(ring, hull).Area()
		s, err := Build(pts, Options{Boundary: []geom.Ring{ring}})
		if want < 1e-6 {
			continue // (almost) no overlap: either outcome is fine
		}
		if err != nil {
			t.Fatalf("case %d (seed %d): %v", k, seed, err)
		}
		if err := s.Validate(); err != nil {
			t.Fatalf("case %d: %v", k, err)
		}
		if got := s.PlanArea(); !relClose(got, want, 1e-9) {
			t.Errorf("case %d (seed %d): area %.12g, want ring ∩ hull %.12g", k, seed, got, want)
		}
	}
}
