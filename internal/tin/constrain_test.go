package tin

import (
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/robust"
)

// cdtCheck is a brute-force check of the constrained Delaunay property
// (Chew, "Constrained Delaunay triangulations", Algorithmica 4, 1989): no
// vertex strictly inside a triangle's circumcircle may be visible from the
// triangle, where constrained edges block visibility. Visibility is tested
// from the triangle's centroid, a necessary condition. Quadratic; small
// inputs only.
func cdtCheck(tb testing.TB, s *Surface) {
	tb.Helper()
	m := s.Mesh()
	var cons [][2]geom.Vec2
	for t := range m.NumTriangles() {
		for k := range 3 {
			if s.IsConstrained(t, k) {
				a, b := m.V[m.T[3*t+k]], m.V[m.T[3*t+(k+1)%3]]
				cons = append(cons, [2]geom.Vec2{v2(a.X, a.Y), v2(b.X, b.Y)})
			}
		}
	}
	properCross := func(p, q, a, b geom.Vec2) bool {
		return robust.Orient2D(p, q, a)*robust.Orient2D(p, q, b) < 0 && robust.Orient2D(a, b, p)*robust.Orient2D(a, b, q) < 0
	}
	for t := range m.NumTriangles() {
		a, b, c := m.Triangle(t)
		cen := v2((a.X+b.X+c.X)/3, (a.Y+b.Y+c.Y)/3)
		for _, d := range m.V {
			if filteredInCircle(a, b, c, d) <= 0 {
				continue
			}
			visible := true
			for _, cs := range cons {
				if properCross(cen, v2(d.X, d.Y), cs[0], cs[1]) {
					visible = false
					break
				}
			}
			if visible {
				tb.Fatalf("triangle %d's circumcircle contains visible vertex (%g, %g)", t, d.X, d.Y)
			}
		}
	}
}

// breaklineZ returns the elevation of breakline pts at arc parameter u in
// [0, 1] of segment k (linear interpolation: the definition of a 3-D
// polyline).
func breaklineZ(pts []geom.Vec3, k int, u float64) geom.Vec3 {
	a, b := pts[k], pts[k+1]
	return v3(a.X+u*(b.X-a.X), a.Y+u*(b.Y-a.Y), a.Z+u*(b.Z-a.Z))
}

// breaklineTol: elevations along a constrained edge are interpolated
// linearly by the TIN exactly as along the breakline (analytic), so they
// agree to round-off; 1e-9 m is the plane-reproduction tolerance.
const breaklineTol = planeTol

func TestBreakline_Elevations(t *testing.T) {
	seed := testSeed(t)
	r := rand.New(rand.NewPCG(seed, 20))
	pts := randomPoints(r, 2000, v2(0, 0), 100, 100, func(x, y float64) float64 { return 10 + 0.1*x })
	bl := Breakline{Name: "top of bank", Pts: []geom.Vec3{v3(10, 10, 50), v3(40, 45, 52), v3(60, 40, 49), v3(90, 85, 60)}}
	s := mustBuild(t, pts, Options{Breaklines: []Breakline{bl}})
	exactCheck(t, s)
	// The breakline's vertices are TIN vertices with its elevations, and
	// the surface follows the breakline between them.
	for k := 0; k+1 < len(bl.Pts); k++ {
		for _, u := range []float64{0, 0.013, 0.25, 0.5, 0.77, 1} {
			p := breaklineZ(bl.Pts, k, u)
			z, ok := s.Elevation(p.X, p.Y)
			if !ok || math.Abs(z-p.Z) > breaklineTol {
				t.Errorf("Elevation on breakline segment %d at u=%g (%g, %g) = %g, %v; want %g (seed %d)", k, u, p.X, p.Y, z, ok, p.Z, seed)
			}
		}
	}
	sum := s.Summary()
	if sum.Breaklines != 1 || sum.BreaklineVertices != 4 || sum.ConstraintSegments < 3 {
		t.Errorf("summary: %d breaklines, %d vertices, %d constraint segments; want 1, 4, >= 3", sum.Breaklines, sum.BreaklineVertices, sum.ConstraintSegments)
	}
	if got, want := countConstrained(s), sum.ConstraintSegments; got != want {
		t.Errorf("constrained edges in the mesh = %d, want %d", got, want)
	}
}

// countConstrained counts the undirected constrained edges of the mesh.
func countConstrained(s *Surface) int {
	m := s.Mesh()
	n := 0
	for e := range int32(len(m.T)) {
		if f := s.madj[e]; (f < 0 || f > e) && s.IsConstrained(int(e/3), int(e%3)) {
			n++
		}
	}
	return n
}

func TestBreakline_CDT(t *testing.T) {
	seed := testSeed(t)
	r := rand.New(rand.NewPCG(seed, 21))
	pts := randomPoints(r, 300, v2(0, 0), 50, 50, nil)
	var bls []Breakline
	for k := range 6 {
		var p []geom.Vec3
		for range 4 {
			p = append(p, v3(2+r.Float64()*46, 2+r.Float64()*46, float64(k)))
		}
		bls = append(bls, Breakline{Name: "b" + string(rune('0'+k)), Pts: p})
	}
	s := mustBuild(t, pts, Options{Breaklines: bls, ConflictTolM: 100})
	exactCheck(t, s)
	cdtCheck(t, s)
	if s.Summary().ConstraintSplits == 0 {
		t.Errorf("random crossing breaklines gave no splits (seed %d)", seed)
	}
}

// TestBreakline_Crossing: where two breaklines cross, the intersection
// becomes a vertex whose elevation is the mean of the two breaklines'
// interpolated elevations, with a warning when they differ by more than the
// conflict tolerance.
func TestBreakline_Crossing(t *testing.T) {
	pts := grid(v2(0, 0), 2, 11, 11) // 0..20
	for i := range pts {
		pts[i].Z = 1
	}
	// Two diagonals crossing at (10.1, 10.3), placed so that no grid point
	// (even coordinates) lies on either: y − x = 0.2 and x + y = 20.4.
	a := Breakline{Name: "a", Pts: []geom.Vec3{v3(4.1, 4.3, 10), v3(16.1, 16.3, 20)}} // z 15 at the crossing
	tests := []struct {
		name     string
		bz0, bz1 float64
		wantZ    float64
		warn     bool
	}{
		{"agree", 10, 20, 15, false},
		{"differ", 12, 22, 16, true}, // b gives 17 at the crossing
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			b := Breakline{Name: "b", Pts: []geom.Vec3{v3(4.1, 16.3, tt.bz0), v3(16.1, 4.3, tt.bz1)}}
			s := mustBuild(t, pts, Options{Breaklines: []Breakline{a, b}})
			exactCheck(t, s)
			z, ok := s.Elevation(10.1, 10.3)
			if !ok || math.Abs(z-tt.wantZ) > 1e-9 {
				t.Errorf("Elevation at the crossing = %g, %v; want %g", z, ok, tt.wantZ)
			}
			found := false
			for _, v := range s.Mesh().V {
				if math.Abs(v.X-10.1) < 1e-12 && math.Abs(v.Y-10.3) < 1e-12 {
					found = true
				}
			}
			if !found {
				t.Errorf("no vertex at the crossing (10.1, 10.3)")
			}
			var warned bool
			for _, w := range s.Warnings() {
				if strings.Contains(w.Msg, "cross") {
					warned = true
				}
			}
			if warned != tt.warn {
				t.Errorf("crossing warning = %v, want %v (warnings %v)", warned, tt.warn, s.Warnings())
			}
			sum := s.Summary()
			if sum.ConstraintSplits < 1 || sum.ConstraintSegments != 4 {
				t.Errorf("splits = %d, segments = %d; want >= 1 and 4", sum.ConstraintSplits, sum.ConstraintSegments)
			}
		})
	}
}

// TestBreakline_ThroughPoint: a survey point exactly on a breakline splits
// the constraint there (and keeps its own surveyed elevation).
func TestBreakline_ThroughPoint(t *testing.T) {
	pts := parsePts(t, "0 0 0; 10 0 0; 10 10 0; 0 10 0; 5 5 7; 2 8 0; 8 2 0")
	bl := Breakline{Name: "diag", Pts: []geom.Vec3{v3(1, 1, 1), v3(9, 9, 9)}}
	s := mustBuild(t, pts, Options{Breaklines: []Breakline{bl}})
	cdtCheck(t, s)
	if z, ok := s.Elevation(5, 5); !ok || z != 7 {
		t.Errorf("Elevation(5, 5) = %g, %v; want the survey point's 7", z, ok)
	}
	sum := s.Summary()
	if sum.ConstraintSplits != 1 || sum.ConstraintSegments != 2 {
		t.Errorf("splits %d, segments %d; want 1 and 2", sum.ConstraintSplits, sum.ConstraintSegments)
	}
	// Along each half the breakline is linear between its vertex and (5,5).
	if z, ok := s.Elevation(3, 3); !ok || math.Abs(z-4) > 1e-12 {
		t.Errorf("Elevation(3, 3) = %g, %v; want 4 (between 1 at (1,1) and 7 at (5,5))", z, ok)
	}
}

// TestBreakline_OverridesPoint: a breakline vertex at a survey point's
// position takes the breakline's elevation; a difference above the conflict
// tolerance is reported as a warning, or as an error under DupError.
func TestBreakline_OverridesPoint(t *testing.T) {
	pts := parsePts(t, "0 0 0; 10 0 0; 10 10 0; 0 10 0; 5 5 3")
	bl := Breakline{Name: "edge", Pts: []geom.Vec3{v3(5, 5, 3.5), v3(9, 9, 1)}}
	s := mustBuild(t, pts, Options{Breaklines: []Breakline{bl}})
	if z, _ := s.Elevation(5, 5); z != 3.5 {
		t.Errorf("Elevation(5, 5) = %g, want the breakline's 3.5", z)
	}
	if len(s.Warnings()) != 1 || !strings.Contains(s.Warnings()[0].Msg, `breakline "edge"`) {
		t.Errorf("warnings = %v, want one naming the breakline", s.Warnings())
	}
	_, err := Build(pts, Options{Breaklines: []Breakline{bl}, Duplicates: DupError})
	var de *DuplicateError
	if !errors.As(err, &de) || len(de.Indices) != 1 || de.Indices[0] != 4 || len(de.Breaklines) != 1 {
		t.Errorf("DupError: error %v, want *DuplicateError naming point 4 and the breakline", err)
	}
}

func TestBreakline_Errors(t *testing.T) {
	pts := parsePts(t, "0 0 0; 10 0 0; 10 10 0; 0 10 0")
	tests := []struct {
		name   string
		bl     Breakline
		tol    float64
		want   error
		vertex int
		dist   float64
	}{
		{"one vertex", Breakline{Name: "x", Pts: []geom.Vec3{v3(1, 1, 1)}}, 0, ErrBreakline, -1, 0},
		{"nan", Breakline{Name: "x", Pts: []geom.Vec3{v3(1, 1, 1), v3(math.NaN(), 2, 2)}}, 0, ErrNonFinite, 1, 0},
		{"outside", Breakline{Name: "ditch", Pts: []geom.Vec3{v3(1, 1, 1), v3(5, 5, 1), v3(13.2, 5, 1)}}, 0, ErrBreaklineOutside, 2, 3.2},
		{"outside beyond tolerance", Breakline{Name: "ditch", Pts: []geom.Vec3{v3(1, 1, 1), v3(10.5, 5, 1)}}, 0.4, ErrBreaklineOutside, 1, 0.5},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := Build(pts, Options{Breaklines: []Breakline{tt.bl}, MergeTolM: tt.tol})
			var be *BreaklineError
			if !errors.Is(err, tt.want) || !errors.As(err, &be) {
				t.Fatalf("Build: error %v, want %v as *BreaklineError", err, tt.want)
			}
			if be.Name != tt.bl.Name || be.Vertex != tt.vertex || math.Abs(be.DistM-tt.dist) > 1e-12 {
				t.Errorf("error %+v, want name %q vertex %d distance %g", be, tt.bl.Name, tt.vertex, tt.dist)
			}
			if !strings.Contains(err.Error(), tt.bl.Name) {
				t.Errorf("message %q does not name the breakline", err)
			}
		})
	}
	// Within the tolerance a vertex just outside the hull is accepted and
	// extends the surface.
	s := mustBuild(t, pts, Options{Breaklines: []Breakline{{Name: "ok", Pts: []geom.Vec3{v3(1, 1, 1), v3(10.3, 5, 1)}}}, MergeTolM: 0.4})
	if _, ok := s.Elevation(10.2, 5); !ok {
		t.Errorf("Elevation near the accepted breakline vertex: not on the surface")
	}
}

// TestBreakline_Shared: breaklines that share vertices, overlap along a
// segment, or run along the hull are accepted; shared segments are one
// constrained edge.
func TestBreakline_Shared(t *testing.T) {
	pts := grid(v2(0, 0), 1, 11, 11)
	bls := []Breakline{
		{Name: "a", Pts: []geom.Vec3{v3(2.5, 2.5, 1), v3(7.5, 2.5, 1), v3(7.5, 7.5, 1)}},
		{Name: "b", Pts: []geom.Vec3{v3(7.5, 7.5, 1), v3(7.5, 2.5, 1), v3(2.5, 7.5, 1)}}, // shares a segment with a
		{Name: "hull", Pts: []geom.Vec3{v3(0, 0, 0), v3(10, 0, 0), v3(10, 10, 0)}},
		{Name: "closed", Pts: []geom.Vec3{v3(1, 9, 2), v3(3, 9, 2), v3(2, 8.2, 2), v3(1, 9, 2)}},
	}
	s := mustBuild(t, pts, Options{Breaklines: bls})
	cdtCheck(t, s)
}

// TestBreakline_Vertical: a vertical face (two breaklines at the same plan
// position, different elevations — a wall) cannot be represented in a
// 2.5-D TIN; the coinciding vertices merge and the conflict is reported.
func TestBreakline_Vertical(t *testing.T) {
	pts := grid(v2(0, 0), 1, 6, 6)
	bls := []Breakline{
		{Name: "top of wall", Pts: []geom.Vec3{v3(1.5, 1.5, 3), v3(3.5, 1.5, 3)}},
		{Name: "toe of wall", Pts: []geom.Vec3{v3(1.5, 1.5, 1), v3(3.5, 1.5, 1)}},
	}
	s := mustBuild(t, pts, Options{Breaklines: bls})
	if z, _ := s.Elevation(2.5, 1.5); z != 2 {
		t.Errorf("Elevation on the merged wall = %g, want the mean 2", z)
	}
	if s.Summary().DuplicateConflicts != 2 {
		t.Errorf("conflicts = %d, want 2", s.Summary().DuplicateConflicts)
	}
}
