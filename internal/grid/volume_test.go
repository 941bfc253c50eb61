package grid

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// clipIntegral is an independent reference for the integral of the positive
// part of the affine g(x, y) = g0 + gx·x + gy·y over a convex polygon: clip
// the polygon to g ≥ 0 (Sutherland–Hodgman) and use ∬ g = area · g(centroid),
// exact for affine g (the refbench's method, ../shared/refbench/terrain.py).
func clipIntegral(poly []geom.Vec2, g0, gx, gy float64) (integral, area float64) {
	g := func(p geom.Vec2) float64 { return g0 + gx*p.X + gy*p.Y }
	var out []geom.Vec2
	for i := range poly {
		p, q := poly[i], poly[(i+1)%len(poly)]
		gp, gq := g(p), g(q)
		if gp >= 0 {
			out = append(out, p)
		}
		if (gp >= 0) != (gq >= 0) {
			out = append(out, p.Lerp(q, gp/(gp-gq)))
		}
	}
	if len(out) < 3 {
		return 0, 0
	}
	var a, cx, cy float64
	for i := range out {
		p, q := out[i], out[(i+1)%len(out)]
		c := p.Cross(q)
		a += c
		cx += (p.X + q.X) * c
		cy += (p.Y + q.Y) * c
	}
	a /= 2
	if a == 0 {
		return 0, 0
	}
	c := geom.Vec2{X: cx / (6 * a), Y: cy / (6 * a)}
	return a * g(c), a
}

func TestPositivePart(t *testing.T) {
	rng := rand.New(rand.NewPCG(20240601, 7))
	tri := pts(0, 0, 2, 0.5, 0.7, 1.9)
	area := geom.PlanArea(geom.Vec3{X: 0, Y: 0}, geom.Vec3{X: 2, Y: 0.5}, geom.Vec3{X: 0.7, Y: 1.9})
	for n := 0; n < 2000; n++ {
		// Affine g through three random corner values.
		f := [3]float64{rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64()}
		switch n % 7 {
		case 0:
			f[1] = 0
		case 1:
			f[0], f[2] = 0, 0
		case 2:
			f[2] = f[1]
		}
		g0, gx, gy := affineThrough(tri, f)
		wantI, wantA := clipIntegral(tri, g0, gx, gy)
		gotI, gotA := PositivePart(area, f[0], f[1], f[2])
		if math.Abs(gotI-wantI) > 1e-12*(1+math.Abs(wantI)) || math.Abs(gotA-wantA) > 1e-12*area {
			t.Fatalf("PositivePart(%g, %v) = %g, %g, want %g, %g (clipping)", area, f, gotI, gotA, wantI, wantA)
		}
		wantN, wantNA := clipIntegral(tri, -g0, -gx, -gy)
		p, ng, pa, na := Parts(area, f[0], f[1], f[2])
		if math.Abs(p-wantI) > 1e-12*(1+math.Abs(wantI)) || math.Abs(pa-wantA) > 1e-12*area ||
			math.Abs(ng-wantN) > 1e-12*(1+math.Abs(wantN)) || math.Abs(na-wantNA) > 1e-12*area {
			t.Fatalf("Parts(%g, %v) = %g, %g, %g, %g, want %g, %g, %g, %g (clipping)", area, f, p, ng, pa, na, wantI, wantN, wantA, wantNA)
		}
	}
	if i, a := PositivePart(1, 0, 0, 0); i != 0 || a != 0 {
		t.Errorf("PositivePart(1, 0, 0, 0) = %g, %g, want 0, 0", i, a)
	}
	if i, a := PositivePart(1, 1e-300, 0, -1); i < 0 || a < 0 || a > 1 {
		t.Errorf("PositivePart(tiny) = %g, %g, want small non-negative", i, a)
	}
}

func affineThrough(p []geom.Vec2, f [3]float64) (g0, gx, gy float64) {
	// Solve [1 x y] · (g0 gx gy) = f by Cramer's rule.
	d := (p[1].X-p[0].X)*(p[2].Y-p[0].Y) - (p[2].X-p[0].X)*(p[1].Y-p[0].Y)
	gx = ((f[1]-f[0])*(p[2].Y-p[0].Y) - (f[2]-f[0])*(p[1].Y-p[0].Y)) / d
	gy = ((p[1].X-p[0].X)*(f[2]-f[0]) - (p[2].X-p[0].X)*(f[1]-f[0])) / d
	g0 = f[0] - gx*p[0].X - gy*p[0].Y
	return
}

func TestDiffVolumes_Plane(t *testing.T) {
	// Two planes crossing inside the lattice: their difference is affine, so
	// the interpolant is exact and the volumes equal the clipped-rectangle
	// integrals (area × value at the centroid) to round-off.
	l, err := NewLattice(box(0, 0, 7, 4), 0.1)
	if err != nil {
		t.Fatal(err)
	}
	a := sample(l, func(p geom.Vec2) float64 { return 100 + 0.05*p.X + 0.02*p.Y })
	b := sample(l, func(p geom.Vec2) float64 { return 99.9 + 0.01*p.X + 0.09*p.Y })
	pos, neg := DiffVolumes(l, a, b)
	rect := pts(0, 0, 7, 0, 7, 4, 0, 4)
	wantPos, _ := clipIntegral(rect, 0.1, 0.04, -0.07)
	wantNeg, _ := clipIntegral(rect, -0.1, -0.04, 0.07)
	if math.Abs(pos-wantPos) > 1e-11 || math.Abs(neg-wantNeg) > 1e-11 {
		t.Fatalf("DiffVolumes = %.15g, %.15g, want %.15g, %.15g", pos, neg, wantPos, wantNeg)
	}
	// Swapping the surfaces swaps cut and fill.
	p2, n2 := DiffVolumes(l, b, a)
	if p2 != neg || n2 != pos {
		t.Fatalf("swapped DiffVolumes = %g, %g, want %g, %g", p2, n2, neg, pos)
	}
}

func TestDiffVolumes_Pyramid(t *testing.T) {
	// The interpolant of a single raised node is a pyramid over the six
	// triangles that share the node (a hexagon of area 6 · H²/2), so its
	// volume is base · height / 3 (Euclid, Elements XII.7).
	l, err := NewLattice(box(-2, -2, 2, 2), 0.5)
	if err != nil {
		t.Fatal(err)
	}
	const c = 3.0
	top := make([]float64, l.Len())
	top[l.Index(4, 4)] = c
	zero := make([]float64, l.Len())
	pos, neg := DiffVolumes(l, top, zero)
	if want := 6 * l.CellArea() / 2 * c / 3; math.Abs(pos-want) > 1e-12 || neg != 0 {
		t.Fatalf("pyramid volume = %g, %g, want %g, 0", pos, neg, want)
	}
}

func TestDiffVolumes_NaN(t *testing.T) {
	l, _ := NewLattice(box(0, 0, 2, 2), 1)
	a := []float64{1, 1, 1, 1, 1, 1, 1, 1, math.NaN()}
	b := make([]float64, 9)
	pos, _ := DiffVolumes(l, a, b)
	if pos != 3 { // 3 of the 4 unit cells, each 1 m³
		t.Fatalf("DiffVolumes with one NaN corner = %g, want 3", pos)
	}
}

func BenchmarkDiffVolumes1M(b *testing.B) {
	l, _ := NewLattice(box(0, 0, 99.9, 99.9), 0.1)
	g := sample(l, func(p geom.Vec2) float64 { return math.Sin(p.X) + math.Cos(p.Y) })
	d := sample(l, func(p geom.Vec2) float64 { return 0.01 * p.X })
	b.ReportAllocs()
	for b.Loop() {
		DiffVolumes(l, g, d)
	}
}
