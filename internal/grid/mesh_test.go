package grid

import (
	"math"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
)

func TestLattice_Mesh(t *testing.T) {
	l, err := NewLattice(box(0, 0, 3, 2), 0.5)
	if err != nil {
		t.Fatal(err)
	}
	z := sample(l, func(p geom.Vec2) float64 { return p.X + 2*p.Y })
	z[l.Index(6, 4)] = math.NaN() // the far corner: its one cell drops out
	m := l.Mesh(z, func(i, j int) bool { return i < 5 || j < 2 })
	cells := 0
	for j := 0; j+1 < l.NY; j++ {
		for i := 0; i+1 < l.NX; i++ {
			if (i < 5 || j < 2) && !(i == 5 && j == 3) {
				cells++
			}
		}
	}
	if m.NumTriangles() != 2*cells {
		t.Fatalf("Mesh has %d triangles, want %d", m.NumTriangles(), 2*cells)
	}
	var area geom.Sum
	edges := map[[2]int32]int{}
	for tr := 0; tr < m.NumTriangles(); tr++ {
		a, b, c := m.Triangle(tr)
		pa := geom.PlanArea(a, b, c)
		if pa <= 0 {
			t.Fatalf("triangle %d is not counter-clockwise (area %g)", tr, pa)
		}
		area.Add(pa)
		for _, v := range []geom.Vec3{a, b, c} {
			if v.Z != v.X+2*v.Y {
				t.Fatalf("vertex %v has wrong z", v)
			}
		}
		for e := 0; e < 3; e++ {
			u, v := m.T[3*tr+e], m.T[3*tr+(e+1)%3]
			edges[[2]int32{u, v}]++
		}
	}
	if want := float64(cells) * l.CellArea(); math.Abs(area.Value()-want) > 1e-12 {
		t.Fatalf("Mesh plan area = %g, want %g", area.Value(), want)
	}
	for e, n := range edges {
		if n != 1 {
			t.Fatalf("directed edge %v used %d times", e, n)
		}
	}
	// Every node but the NaN corner (6, 4) and node (6, 3), whose two cells
	// are both left out.
	if len(m.V) != l.Len()-2 {
		t.Fatalf("Mesh has %d vertices, want %d", len(m.V), l.Len()-2)
	}
	if got := (Lattice{}).Mesh(nil, nil); len(got.V) != 0 || len(got.T) != 0 {
		t.Fatalf("zero Lattice Mesh = %+v, want empty", got)
	}
}
