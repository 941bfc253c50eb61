package design

import (
	"errors"
	"math"
	"testing"
)

func TestErode_Rectangle(t *testing.T) {
	// The erosion of a rectangle by δ is the rectangle shrunk by δ on every
	// side (a convex polygon's inner parallel body is the intersection of
	// its edges' half-planes moved inward).
	r := rect(0.3, -0.2, 6.3, 3.8)
	got := erode(r, 0.75)
	if len(got) != 1 {
		t.Fatalf("erode gave %d rings, want 1", len(got))
	}
	want := rect(1.05, 0.55, 5.55, 3.05)
	if len(got[0]) != 4 {
		t.Fatalf("erode gave %d vertices %v, want 4", len(got[0]), got[0])
	}
	for _, p := range got[0] {
		best := math.Inf(1)
		for _, w := range want {
			best = min(best, p.Distance(w))
		}
		if best > 1e-9 {
			t.Fatalf("vertex %v not at a corner of %v", p, want)
		}
	}
}

// chordLoss bounds the area by which chords of at most arcStep change a
// region bounded by arcs of radius r spanning sweep radians in total:
// each chord cuts a circular segment of area r²(θ − sin θ)/2.
func chordLoss(r, sweep float64) float64 {
	n := math.Ceil(sweep / arcStep)
	return n * r * r * (arcStep - math.Sin(arcStep)) / 2
}

func TestErode_Concave(t *testing.T) {
	// An L made of a 6 × 2 and a 2 × 6 bar, reflex vertex (2, 2), eroded
	// by δ: the union of the two bars' erosions (5 + 5 − 1 = 9 m² for
	// δ = 0.5) plus, at the inner corner, the square [2−δ, 2]² less the
	// quarter disc of radius δ around the reflex vertex (the points there
	// are at least δ from every edge and from the vertex).
	l := ring(0, 0, 6, 0, 6, 2, 2, 2, 2, 6, 0, 6)
	const d = 0.5
	got := erode(l, d)
	if len(got) != 1 {
		t.Fatalf("erode(L) gave %d rings, want 1", len(got))
	}
	want := 9 + d*d - math.Pi*d*d/4
	if a := got[0].Area(); math.Abs(a-want) > chordLoss(d, math.Pi/2)+1e-9 {
		t.Fatalf("erode(L) area = %.9f, want %.9f", a, want)
	}
	// Every vertex lies on the offset curve, at exactly δ from the outline.
	q := newPolygon(l.CCW())
	for _, p := range got[0] {
		if sd := signedDist(q, p); math.Abs(sd-d) > 1e-9 {
			t.Fatalf("vertex %v at distance %g from the outline, want %g", p, sd, d)
		}
	}
}

func TestErode_Notch(t *testing.T) {
	// A 10 × 10 square with a 2 × 3 notch cut into its top side (x 4..6,
	// y 7..10), eroded by 2: the square shrunk to [2, 8]² (36 m²) less the
	// points within 2 of the notch: [4, 6] × [5, 8] (6 m²), [2, 4] × [7, 8]
	// and [6, 8] × [7, 8] (2 m² each) and the two quarter discs of radius 2
	// below the notch's corners (π each).
	n := ring(0, 0, 10, 0, 10, 10, 6, 10, 6, 7, 4, 7, 4, 10, 0, 10)
	q := newPolygon(n.CCW())
	got := erode(n, 2)
	if len(got) != 1 {
		t.Fatalf("erode(notch) gave %d rings, want 1", len(got))
	}
	want := 36 - (6 + 2 + 2 + 2*math.Pi)
	if a := got[0].Area(); math.Abs(a-want) > chordLoss(2, math.Pi)+1e-9 {
		t.Fatalf("erode(notch) area = %.6f, want %.6f", a, want)
	}
	arcs := 0
	for _, p := range got[0] {
		if sd := signedDist(q, p); math.Abs(sd-2) > 1e-9 {
			t.Fatalf("vertex %v at distance %g from the outline, want 2", p, sd)
		}
		if p.Y > 5 && p.Y < 7 {
			arcs++
		}
	}
	if arcs < 2*int(math.Pi/2/arcStep)-2 {
		t.Fatalf("expected two arcs of about %d chords, got %d arc vertices", int(math.Pi/2/arcStep), arcs)
	}
}

func TestErode_SplitsAndVanishes(t *testing.T) {
	// A dumbbell: two 4 × 4 squares joined by a 4 × 1 bar. Eroded by 0.75
	// the bar (half width 0.5) vanishes and two pieces stay: each square's
	// erosion, 2.5 × 2.5, plus a lens where the bar meets the square: for
	// y in (1.5, 2.5) the points up to x = 4 − √(0.75² − (y − y_v)²) are
	// still 0.75 from the bar's corners y_v = 1.5, 2.5, which adds
	// 2·(0.75·0.5 − ∫₀^0.5 √(0.75² − u²) du).
	db := ring(0, 0, 4, 0, 4, 1.5, 8, 1.5, 8, 0, 12, 0, 12, 4, 8, 4, 8, 2.5, 4, 2.5, 4, 4, 0, 4)
	got := erode(db, 0.75)
	if len(got) != 2 {
		t.Fatalf("erode(dumbbell) gave %d rings, want 2", len(got))
	}
	r, a := 0.75, 0.5
	circ := (a*math.Sqrt(r*r-a*a) + r*r*math.Asin(a/r)) / 2
	want := 2.5*2.5 + 2*(r*a-circ)
	sweep := 2 * (math.Pi - math.Atan2(a, -math.Sqrt(r*r-a*a)))
	for _, p := range got {
		if ar := p.Area(); math.Abs(ar-want) > chordLoss(r, sweep)+1e-9 {
			t.Errorf("piece area = %.9f, want %.9f", ar, want)
		}
	}
	if got := erode(rect(0, 0, 2, 1), 0.6); len(got) != 0 {
		t.Fatalf("erode(2 × 1 by 0.6) = %v, want nothing", got)
	}
}

func TestOutline_Zones(t *testing.T) {
	// A 8 × 5 m rectangle, one shelf 0.4 m wide at 0.3 m, deep zone 0.9 m,
	// 1:1 walls: Z1 = erode(O, 0.3), deep = erode(Z1, 0.4 + 0.6).
	o := Outline{Ring: rect(0, 0, 8, 5), Shelves: []Shelf{{WidthM: 0.4, DepthM: 0.3}}, DeepDepthM: 0.9, WallSlope: 1, Corners: Sharp}
	zs, err := o.Zones()
	if err != nil {
		t.Fatal(err)
	}
	if len(zs) != 2 || zs[0].Name != "shelf 1" || zs[1].Name != "deep zone" {
		t.Fatalf("Zones = %+v", zs)
	}
	if a := zs[0].Ring.Area(); math.Abs(a-7.4*4.4) > 1e-9 {
		t.Errorf("shelf area = %g, want %g", a, 7.4*4.4)
	}
	if a := zs[1].Ring.Area(); math.Abs(a-5.4*2.4) > 1e-9 {
		t.Errorf("deep area = %g, want %g", a, 5.4*2.4)
	}
	// Flat ground at the water level: the water volume of the stepped
	// sharp-cornered pond by the prismoidal formula (check-values.md §2c):
	// shelf frustum from 7.4 × 4.4 (depth 0.3, s = 1) plus the deep frustum
	// from 5.4 × 2.4 rising 0.6 to the shelf, plus the deep zone's column
	// above the shelf floor, 5.4 × 2.4 … computed as the sum of frusta.
	frustum := func(L, W, s, h float64) float64 { return L*W*h + s*h*h*(L+W) + 4.0/3*s*s*h*h*h }
	want := frustum(7.4, 4.4, 1, 0.3) + frustum(5.4, 2.4, 1, 0.6)
	sf, err := Build(plane(50, 0, 0, 100), Params{Zones: zs, WaterLevelM: 50})
	if err != nil {
		t.Fatal(err)
	}
	if e := relErr(sf.WaterVolumeM3, want); e > 0.001 {
		t.Errorf("water volume = %.6f, want %.6f (prismoidal frusta), error %.2g", sf.WaterVolumeM3, want, e)
	}
	// The shelf's flat floor is 0.4 m wide all round: its area is
	// 7.4 × 4.4 − 6.6 × 3.6.
	if e := relErr(sf.ByZone[0].FloorAreaM2, 7.4*4.4-6.6*3.6); e > 0.001 {
		t.Errorf("shelf floor = %.6f, want %.6f", sf.ByZone[0].FloorAreaM2, 7.4*4.4-6.6*3.6)
	}
	if e := relErr(sf.ByZone[1].FloorAreaM2, 5.4*2.4); e > 1e-9 {
		t.Errorf("deep floor = %.6f, want %.6f", sf.ByZone[1].FloorAreaM2, 5.4*2.4)
	}
	if e := relErr(sf.WaterAreaM2, 40); e > 0.001 {
		t.Errorf("water area = %.6f, want 40 (the outline)", sf.WaterAreaM2)
	}
}

func TestOutline_Errors(t *testing.T) {
	tests := []struct {
		name string
		o    Outline
		want error
	}{
		{"too narrow", Outline{Ring: rect(0, 0, 3, 2), Shelves: []Shelf{{0.5, 0.3}}, DeepDepthM: 1.2, WallSlope: 1}, ErrOffset},
		{"depth order", Outline{Ring: rect(0, 0, 9, 6), Shelves: []Shelf{{0.5, 0.6}}, DeepDepthM: 0.4, WallSlope: 1}, ErrZone},
		{"negative width", Outline{Ring: rect(0, 0, 9, 6), Shelves: []Shelf{{-0.5, 0.3}}, DeepDepthM: 0.8, WallSlope: 1}, ErrZone},
		{"sharp concave", Outline{Ring: ring(0, 0, 6, 0, 6, 2, 2, 2, 2, 6, 0, 6), DeepDepthM: 0.8, WallSlope: 1, Corners: Sharp}, ErrZone},
		{"slopes count", Outline{Ring: rect(0, 0, 9, 6), DeepDepthM: 0.8, StepSlopes: []float64{1, 2}}, ErrParams},
		{"bad ring", Outline{Ring: ring(0, 0, 1, 1, 0, 1, 1, 0), DeepDepthM: 0.8, WallSlope: 1}, ErrZone},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := tc.o.Zones()
			if !errors.Is(err, tc.want) {
				t.Fatalf("Zones() error = %v, want %v", err, tc.want)
			}
		})
	}
}
