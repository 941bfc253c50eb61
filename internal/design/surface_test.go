package design

import (
	"math"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
)

func meshArea(m geom.TriMesh) (plan, surf float64, vol float64) {
	var p, s, v geom.Sum
	for t := 0; t < m.NumTriangles(); t++ {
		a, b, c := m.Triangle(t)
		pa := geom.PlanArea(a, b, c)
		p.Add(pa)
		s.Add(geom.SurfaceArea(a, b, c))
		v.Add(pa * (a.Z + b.Z + c.Z) / 3)
	}
	return p.Value(), s.Value(), v.Value()
}

func TestSurface_Meshes(t *testing.T) {
	g, _, zones := slopedYard()
	s, err := Build(g, Params{Zones: zones[:2], WaterLevelM: 100, FreeboardM: 0.15, BermCrestM: 0.5, BermSlope: 2})
	if err != nil {
		t.Fatal(err)
	}
	// The difference mesh integrates to fill − cut (both are exact
	// integrals of the same interpolant when no wall is vertical).
	_, _, v := meshArea(s.DiffMesh())
	if want := s.FillM3 - s.CutM3; math.Abs(v-want) > 1e-9*(s.CutM3+s.FillM3) {
		t.Errorf("DiffMesh volume = %.12f, want fill − cut = %.12f", v, want)
	}
	// The finished-grade mesh covers the whole lattice.
	l := s.Lattice
	if pa, _, _ := meshArea(s.Mesh()); math.Abs(pa-float64((l.NX-1)*(l.NY-1))*l.CellArea()) > 1e-9*pa {
		t.Errorf("Mesh plan area = %g, want the lattice's", pa)
	}
	bm := s.BowlMesh()
	for tr := 0; tr < bm.NumTriangles(); tr++ {
		a, b, c := bm.Triangle(tr)
		if geom.PlanArea(a, b, c) <= 0 || a.Z > s.RimM+1e-12 || b.Z > s.RimM+1e-12 || c.Z > s.RimM+1e-12 {
			t.Fatalf("BowlMesh triangle %d (%v %v %v) is not counter-clockwise below the rim", tr, a, b, c)
		}
	}
}

func TestSurface_BowlMeshArea(t *testing.T) {
	// The lined area in plan is the rim set {E ≤ R}: for a convex
	// round-cornered zone, Steiner's parallel-set area A + P r + π r² with
	// r = s·(d + f); for sharp corners on a rectangle, (L + 2r)(W + 2r).
	const d, f, s = 0.6, 0.15, 1.5
	r := s * (d + f)
	for _, tc := range []struct {
		name    string
		corners Corners
		want    float64
	}{
		{"round", Round, 12 + 14*r + math.Pi*r*r},
		{"sharp", Sharp, (4 + 2*r) * (3 + 2*r)},
	} {
		t.Run(tc.name, func(t *testing.T) {
			sf, err := Build(plane(50, 0, 0, 40), Params{Zones: []Zone{{Ring: rect(0.05, 0.02, 4.05, 3.02), DepthM: d, WallSlope: s, Corners: tc.corners}},
				WaterLevelM: 50 - f, FreeboardM: f})
			if err != nil {
				t.Fatal(err)
			}
			pa, _, _ := meshArea(sf.BowlMesh())
			if e := relErr(pa, tc.want); e > 0.001 {
				t.Errorf("BowlMesh plan area = %.6f, want %.6f (error %.2g)", pa, tc.want, e)
			}
		})
	}
	// A vertical-walled box: the band that stands for the wall gives the
	// liner's area, floor plus walls, to within the cell.
	sf, err := Build(plane(50, 0, 0, 40), Params{Zones: []Zone{{Ring: rect(0.05, 0.02, 4.05, 3.02), DepthM: d}}, WaterLevelM: 50 - f, FreeboardM: f, CellM: 0.01})
	if err != nil {
		t.Fatal(err)
	}
	_, sa, _ := meshArea(sf.BowlMesh())
	if want := 12 + 14*(d+f); math.Abs(sa-want) > 14*sf.CellM*2 {
		t.Errorf("vertical box liner area = %.4f, want %.4f within %.2g", sa, want, 14*sf.CellM*2)
	}
}

func TestSurface_Queries(t *testing.T) {
	zones := []Zone{
		{Name: "shelf", Ring: rect(-3, -2, 3, 2), DepthM: 0.3, WallSlope: 1},
		{Name: "deep", Ring: rect(-1, -1, 1, 1), DepthM: 1.0},
	}
	s, err := Build(plane(20, 0, 0, 30), Params{Zones: zones, WaterLevelM: 19.9, FreeboardM: 0.1, CellM: 0.05})
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		p    geom.Vec2
		want float64
	}{
		{geom.Vec2{X: 0, Y: 0}, 18.9},              // deep floor
		{geom.Vec2{X: 2, Y: 0}, 19.6},              // shelf floor
		{geom.Vec2{X: 3.5, Y: 0}, 19.6 + 0.5},      // wall, 0.5 m out at 1:1
		{geom.Vec2{X: 4, Y: 3}, 19.6 + math.Sqrt2}, // past the corner: a cone
	} {
		if got := s.BowlAt(tc.p); math.Abs(got-tc.want) > 1e-12 {
			t.Errorf("BowlAt(%v) = %.12f, want %.12f", tc.p, got, tc.want)
		}
	}
	if got, ok := s.FinishedAt(2, 1); !ok || math.Abs(got-19.6) > 1e-12 {
		t.Errorf("FinishedAt(2, 1) = %g, %v, want 19.6", got, ok)
	}
	if got, ok := s.FinishedAt(3.2, 0); !ok || math.Abs(got-19.8) > 1e-9 {
		t.Errorf("FinishedAt(3.2, 0) = %g, %v, want 19.8 on the wall", got, ok)
	}
	l := s.Lattice
	owner := func(x, y float64) int {
		i, j := int(math.Round((x-l.X0)/l.H)), int(math.Round((y-l.Y0)/l.H))
		return s.Owner(l.Index(i, j))
	}
	if o := owner(0, 0); o != 1 {
		t.Errorf("Owner at the centre = %d, want 1 (deep)", o)
	}
	if o := owner(2, 0); o != 0 {
		t.Errorf("Owner on the shelf = %d, want 0", o)
	}
	if o := owner(3.6, 0); o != -1 {
		t.Errorf("Owner outside the rim = %d, want -1", o)
	}
	// Volumes by zone add up to the totals; floors are the outlines less
	// the deeper zone (vertical walls take no extra room).
	var c, f float64
	for _, z := range s.ByZone {
		c += z.CutM3
		f += z.FillM3
	}
	if math.Abs(c-s.CutM3) > 1e-9*s.CutM3 || math.Abs(f-s.FillM3) > 1e-9 {
		t.Errorf("ByZone sums %g, %g, totals %g, %g", c, f, s.CutM3, s.FillM3)
	}
	if e := relErr(s.ByZone[0].FloorAreaM2, 24-4); e > 1e-9 {
		t.Errorf("shelf floor area = %.12f, want 20", s.ByZone[0].FloorAreaM2)
	}
	if e := relErr(s.ByZone[1].FloorAreaM2, 4); e > 1e-12 {
		t.Errorf("deep floor area = %.12f, want 4", s.ByZone[1].FloorAreaM2)
	}
	if s.MaxDepthM != 1 || math.Abs(s.MeanDepthM-s.WaterVolumeM3/s.WaterAreaM2) > 1e-15 {
		t.Errorf("max depth %g, mean depth %g", s.MaxDepthM, s.MeanDepthM)
	}
	// Water: the shelf bowl (Steiner with r up to the water) plus the
	// deep zone's vertical column below the shelf floor (4 m² × 0.7 m).
	A, P, sd := 24.0, 20.0, 0.3
	want := A*sd + P*sd*sd/2 + math.Pi*sd*sd*sd/3 + 4*0.7
	if e := relErr(s.WaterVolumeM3, want); e > 0.001 {
		t.Errorf("water = %.6f, want %.6f", s.WaterVolumeM3, want)
	}
}

// bowlMeshMap is BowlMesh as first written, keeping its clip points in a
// map keyed by lattice edge: the reference for the flat arrays.
func bowlMeshMap(s *Surface) geom.TriMesh {
	l := s.Lattice
	r := s.RimM
	z := func(k int) float64 {
		if math.IsInf(s.E[k], 1) {
			return r
		}
		return s.E[k]
	}
	var m geom.TriMesh
	nodeV := make([]int32, l.Len()) // vertex index + 1, 0 for none yet
	clipV := map[[2]int]int32{}     // clip points, by lattice edge
	vert := func(k int) int32 {
		if v := nodeV[k]; v > 0 {
			return v - 1
		}
		p := l.Node(k%l.NX, k/l.NX)
		v := int32(len(m.V))
		m.V = append(m.V, geom.Vec3{X: p.X, Y: p.Y, Z: z(k)})
		nodeV[k] = v + 1
		return v
	}
	cut := func(a, b int) int32 {
		key := [2]int{min(a, b), max(a, b)}
		if v, ok := clipV[key]; ok {
			return v
		}
		za, zb := z(a), z(b)
		t := (r - za) / (zb - za)
		if t == 0 {
			return vert(a)
		}
		pa, pb := l.Node(a%l.NX, a/l.NX), l.Node(b%l.NX, b/l.NX)
		p := pa.Lerp(pb, t)
		v := int32(len(m.V))
		m.V = append(m.V, geom.Vec3{X: p.X, Y: p.Y, Z: r})
		clipV[key] = v
		return v
	}
	for cj := 0; cj+1 < l.NY; cj++ {
		for ci := 0; ci+1 < l.NX; ci++ {
			c := ci + cj*l.NX
			nd := [4]int{c, c + 1, c + l.NX, c + l.NX + 1}
			for t := range 2 {
				tri := [3]int{nd[triSlots[t][0]], nd[triSlots[t][1]], nd[triSlots[t][2]]}
				finite := false
				for _, k := range tri {
					finite = finite || s.E[k] <= r
				}
				if !finite {
					continue
				}
				// Clip the triangle to z ≤ r (Sutherland–Hodgman on one
				// level), keeping lattice-edge keys for shared vertices.
				var poly [4]int32
				n := 0
				for e := range 3 {
					a, b := tri[e], tri[(e+1)%3]
					ina, inb := z(a) <= r, z(b) <= r
					if ina {
						poly[n] = vert(a)
						n++
					}
					if ina != inb {
						poly[n] = cut(a, b)
						n++
					}
				}
				for q := 1; q+1 < n; q++ {
					a, b, c := poly[0], poly[q], poly[q+1]
					if geom.PlanArea(m.V[a], m.V[b], m.V[c]) > 0 {
						m.T = append(m.T, a, b, c)
					}
				}
			}
		}
	}
	return m
}

// TestSurface_BowlMeshFlat checks BowlMesh against the map-keyed
// reference: the same vertices and triangles in the same order, on
// sloped, sharp and vertical-walled designs.
func TestSurface_BowlMeshFlat(t *testing.T) {
	g, _, zones := slopedYard()
	zones = append(zones, Zone{Name: "vertical L", Ring: ring(4, -3, 7, -3, 7, -1, 5, -1, 5, 1, 4, 1), DepthM: 0.5})
	for _, h := range []float64{0.125, 0.05} {
		s, err := Build(g, Params{Zones: zones, WaterLevelM: 100, FreeboardM: 0.15, BermCrestM: 0.5, BermSlope: 2, CellM: h})
		if err != nil {
			t.Fatal(err)
		}
		got, want := s.BowlMesh(), bowlMeshMap(s)
		if len(got.V) != len(want.V) || len(got.T) != len(want.T) {
			t.Fatalf("h %g: %d vertices %d indices, reference %d %d", h, len(got.V), len(got.T), len(want.V), len(want.T))
		}
		for i := range got.V {
			if got.V[i] != want.V[i] {
				t.Fatalf("h %g: vertex %d = %v, reference %v", h, i, got.V[i], want.V[i])
			}
		}
		for i := range got.T {
			if got.T[i] != want.T[i] {
				t.Fatalf("h %g: index %d = %d, reference %d", h, i, got.T[i], want.T[i])
			}
		}
	}
}

// BenchmarkBowlMesh is the demo pond's bowl mesh for the liner takeoff.
func BenchmarkBowlMesh(b *testing.B) {
	g, p := demoCase(b)
	s, err := Build(g, p)
	if err != nil {
		b.Fatal(err)
	}
	b.ReportMetric(float64(s.BowlMesh().NumTriangles()), "triangles")
	b.ReportAllocs()
	for b.Loop() {
		s.BowlMesh()
	}
}

// BenchmarkBowlMeshMap is the map-keyed baseline.
func BenchmarkBowlMeshMap(b *testing.B) {
	g, p := demoCase(b)
	s, err := Build(g, p)
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for b.Loop() {
		bowlMeshMap(s)
	}
}
