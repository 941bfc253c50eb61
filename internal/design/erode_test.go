package design

import (
	"math"
	"os"
	"slices"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/grid"
	"github.com/dugout-estimating/dugout/internal/units"
)

// erodeCases are outlines of every kind the erosion meets: convex,
// concave with a reflex corner, a notch narrower than the offset, and a
// dumbbell that splits.
func erodeCases(tb testing.TB) []struct {
	name  string
	r     geom.Ring
	delta float64
} {
	tb.Helper()
	return []struct {
		name  string
		r     geom.Ring
		delta float64
	}{
		{"rectangle", rect(0.3, -0.2, 6.3, 3.8), 0.75},
		{"L", ring(0, 0, 6, 0, 6, 2, 2, 2, 2, 6, 0, 6), 0.5},
		{"notch", ring(0, 0, 4, 0, 4, 1, 2.2, 1.1, 4, 1.2, 4, 3, 0, 3), 0.3},
		{"dumbbell", ring(0, 0, 4, 0, 4, 1.5, 8, 1.5, 8, 0, 12, 0, 12, 4, 8, 4, 8, 2.5, 4, 2.5, 4, 4, 0, 4), 0.75},
		{"kidney", kidneyOutline(tb), 0.25},
	}
}

// kidneyOutline is the outer ring of testdata/kidney_zones.geojson (the
// demo-sized kidney pond's marginal shelf, about 6 × 3.5 m).
func kidneyOutline(tb testing.TB) geom.Ring {
	tb.Helper()
	f, err := os.Open("testdata/kidney_zones.geojson")
	if err != nil {
		tb.Fatal(err)
	}
	defer f.Close()
	zones, err := ReadZonesGeoJSON(f, "kidney_zones.geojson", identity, units.Metres)
	if err != nil {
		tb.Fatal(err)
	}
	r, err := cleanRing(zones[0].Ring)
	if err != nil {
		tb.Fatal(err)
	}
	return r
}

// erodeLattice is the raster erode samples for r.
func erodeLattice(tb testing.TB, r geom.Ring) grid.Lattice {
	tb.Helper()
	bb := r.Bounds()
	hr := max(bb.Width(), bb.Height()) / erodeCells
	l, err := grid.NewLattice(bb.Expand(2*hr), hr)
	if err != nil {
		tb.Fatal(err)
	}
	return l
}

// denseField is φ = sd − δ by brute force at every node (signedDist, the
// definition), stored in every tile.
func denseField(q *polygon, l grid.Lattice, delta float64) *bandField {
	tnx, tny := (l.NX+bandTile-1)/bandTile, (l.NY+bandTile-1)/bandTile
	f := &bandField{lat: l, tnx: tnx, tny: tny, sign: make([]int8, tnx*tny), slot: make([]int32, tnx*tny),
		vals: make([]float64, tnx*tny*bandTile*bandTile), far: 4 * l.H}
	for t := range f.slot {
		f.slot[t] = int32(t)
	}
	for j := 0; j < l.NY; j++ {
		for i := 0; i < l.NX; i++ {
			t := (j/bandTile)*tnx + i/bandTile
			f.vals[t*bandTile*bandTile+(j%bandTile)*bandTile+i%bandTile] = signedDist(q, l.Node(i, j)) - delta
		}
	}
	return f
}

// TestErosionField_MatchesDefinition checks the banded field against the
// signed distance by brute force at every node: a stored node holds
// exactly sd − δ, and a node of an unstored tile lies more than two cells
// from the level set on the side its sign says.
func TestErosionField_MatchesDefinition(t *testing.T) {
	for _, tc := range erodeCases(t) {
		t.Run(tc.name, func(t *testing.T) {
			q := newPolygon(tc.r.CCW())
			l := erodeLattice(t, tc.r)
			f := erosionField(q, l, tc.delta)
			stored := 0
			for j := 0; j < l.NY; j++ {
				for i := 0; i < l.NX; i++ {
					want := signedDist(q, l.Node(i, j)) - tc.delta
					got := f.at(i, j)
					if f.stored(i, j) {
						stored++
						if got != want {
							t.Fatalf("node (%d, %d): φ = %.17g, want %.17g", i, j, got, want)
						}
						continue
					}
					if math.Abs(want) <= 2*l.H || (got > 0) != (want > 0) {
						t.Fatalf("node (%d, %d): unstored with φ = %g (cells %g m), want beyond ±%g on the side of %g", i, j, want, l.H, 2*l.H, got)
					}
				}
			}
			if stored*4 > l.Len() {
				t.Errorf("%d of %d nodes stored: the band should be a small part of the raster", stored, l.Len())
			}
		})
	}
}

// TestMarchLoops_MatchesDense checks that marching only the stored tiles
// traces the same loops, vertex for vertex, as marching the brute-force
// field over every cell.
func TestMarchLoops_MatchesDense(t *testing.T) {
	for _, tc := range erodeCases(t) {
		t.Run(tc.name, func(t *testing.T) {
			q := newPolygon(tc.r.CCW())
			l := erodeLattice(t, tc.r)
			center := func(p geom.Vec2) float64 { return signedDist(q, p) - tc.delta }
			got := marchLoops(erosionField(q, l, tc.delta), center)
			want := marchLoops(denseField(q, l, tc.delta), center)
			if len(got) != len(want) {
				t.Fatalf("%d loops, want %d", len(got), len(want))
			}
			for k := range got {
				if !slices.Equal(got[k], want[k]) {
					t.Errorf("loop %d (%d vertices) differs from the dense one (%d vertices)", k, len(got[k]), len(want[k]))
				}
			}
		})
	}
}

// TestErode_Deterministic checks that erosion gives the same rings, from
// the same first vertex, every time.
func TestErode_Deterministic(t *testing.T) {
	for _, tc := range erodeCases(t) {
		first := erode(tc.r, tc.delta)
		for range 3 {
			again := erode(tc.r, tc.delta)
			if len(again) != len(first) {
				t.Fatalf("%s: %d rings, then %d", tc.name, len(first), len(again))
			}
			for k := range again {
				if !slices.Equal(again[k], first[k]) {
					t.Fatalf("%s: ring %d differs between runs", tc.name, k)
				}
			}
		}
	}
}

// BenchmarkErodeKidney is one inward offset of the demo-sized kidney
// outline on the 1024-cell raster.
func BenchmarkErodeKidney(b *testing.B) {
	r := kidneyOutline(b)
	b.ReportAllocs()
	for b.Loop() {
		if len(erode(r, 0.25)) != 1 {
			b.Fatal("want one ring")
		}
	}
}

// BenchmarkErosionFieldDense is the naive baseline for the banded field:
// the signed distance at every raster node by brute force.
func BenchmarkErosionFieldDense(b *testing.B) {
	r := kidneyOutline(b)
	q := newPolygon(r)
	l := erodeLattice(b, r)
	b.ReportAllocs()
	for b.Loop() {
		denseField(q, l, 0.25)
	}
}

// BenchmarkErosionFieldBand is the banded field of the same offset.
func BenchmarkErosionFieldBand(b *testing.B) {
	r := kidneyOutline(b)
	q := newPolygon(r)
	l := erodeLattice(b, r)
	b.ReportAllocs()
	for b.Loop() {
		erosionField(q, l, 0.25)
	}
}
