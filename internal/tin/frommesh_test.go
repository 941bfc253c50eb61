package tin

import (
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
)

func TestFromMesh_RoundTrip(t *testing.T) {
	r := rand.New(rand.NewPCG(testSeed(t), 70))
	s := mustBuild(t, randomPoints(r, 1000, v2(0, 0), 20, 20, func(x, y float64) float64 { return x * y }), Options{})
	fm, err := FromMesh(s.Mesh())
	if err != nil {
		t.Fatal(err)
	}
	if err := fm.Validate(); err != nil {
		t.Fatal(err)
	}
	for range 2000 {
		x, y := r.Float64()*22-1, r.Float64()*22-1
		z1, ok1 := s.Elevation(x, y)
		z2, ok2 := fm.Elevation(x, y)
		if ok1 != ok2 || (ok1 && math.Abs(z1-z2) > 1e-9) {
			t.Fatalf("Elevation(%g, %g): built %g %v, wrapped %g %v", x, y, z1, ok1, z2, ok2)
		}
	}
	if fm.Summary().Triangles != s.Summary().Triangles || !relClose(fm.PlanArea(), s.PlanArea(), 1e-12) {
		t.Errorf("summaries differ: %+v vs %+v", fm.Summary(), s.Summary())
	}
	if !relClose(fm.Hull().Area(), s.Hull().Area(), 1e-12) {
		t.Errorf("hull areas differ")
	}
}

func TestFromMesh_Repairs(t *testing.T) {
	v := []geom.Vec3{v3(0, 0, 0), v3(1, 0, 0), v3(1, 1, 0), v3(0, 1, 0), v3(2, 0, 0)}
	// Triangle 1 is clockwise; triangle 2 has zero area (collinear).
	m := geom.TriMesh{V: v, T: []int32{0, 1, 2, 0, 3, 2, 0, 1, 4}}
	s, err := FromMesh(m)
	if err != nil {
		t.Fatal(err)
	}
	if err := s.Validate(); err != nil {
		t.Fatal(err)
	}
	if s.Mesh().NumTriangles() != 2 || len(s.Warnings()) != 2 {
		t.Errorf("%d triangles, warnings %v; want 2 and two warnings", s.Mesh().NumTriangles(), s.Warnings())
	}
	if m.T[3] != 0 || m.T[4] != 3 {
		t.Errorf("FromMesh modified its input")
	}
	if i, ok := s.Source(3); !ok || i != 3 {
		t.Errorf("Source(3) = %d, %v; want 3, true", i, ok)
	}
}

func TestFromMesh_Errors(t *testing.T) {
	sq := []geom.Vec3{v3(0, 0, 0), v3(1, 0, 0), v3(1, 1, 0), v3(0, 1, 0), v3(0.5, -1, 0), v3(0.5, 2, 0)}
	tests := []struct {
		name string
		m    geom.TriMesh
		msg  string
	}{
		{"not triples", geom.TriMesh{V: sq, T: []int32{0, 1}}, "multiple of 3"},
		{"index out of range", geom.TriMesh{V: sq, T: []int32{0, 1, 9}}, "out of range"},
		{"negative index", geom.TriMesh{V: sq, T: []int32{0, -1, 2}}, "out of range"},
		{"nan vertex", geom.TriMesh{V: []geom.Vec3{v3(0, 0, 0), v3(1, 0, math.NaN()), v3(0, 1, 0)}, T: []int32{0, 1, 2}}, "non-finite"},
		{"overlap", geom.TriMesh{V: sq, T: []int32{0, 1, 2, 0, 1, 3}}, "same direction"},
		{"three on an edge", geom.TriMesh{V: sq, T: []int32{0, 1, 2, 1, 0, 4, 0, 1, 5}}, "same direction"},
		{"only degenerate", geom.TriMesh{V: sq, T: []int32{0, 0, 1}}, "no triangle"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := FromMesh(tt.m)
			var me *MeshError
			if !errors.As(err, &me) || !errors.Is(err, ErrMesh) || !strings.Contains(err.Error(), tt.msg) {
				t.Errorf("FromMesh: error %v, want *MeshError mentioning %q", err, tt.msg)
			}
		})
	}
}
