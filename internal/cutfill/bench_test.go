package cutfill

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// compareNaive is the baseline overlay: every pair of triangles whose boxes
// meet, on one goroutine, with no spatial index.
func compareNaive(tb testing.TB, before, after geom.TriMesh) CompareResult {
	tb.Helper()
	fa, err := prepareMesh("before", before)
	if err != nil {
		tb.Fatal(err)
	}
	fb, err := prepareMesh("after", after)
	if err != nil {
		tb.Fatal(err)
	}
	var acc partial
	w := overlayWorker{after: fb}
	for i := range fa {
		a := &fa[i]
		for j := range fb {
			b := &fb[j]
			if !a.box.Intersects(b.box) {
				continue
			}
			w.c.setTriangle(a.t[0], a.t[1], a.t[2])
			clipTriangle(&w.c, &b.t, &w.tmp)
			if w.c.n >= 3 {
				w.integrate(a, b, &acc)
			}
		}
	}
	return CompareResult{CutM3: acc.cut.Value(), FillM3: acc.fill.Value(), NetM3: acc.net.Value(), AreaM2: acc.area.Value(), Triangles: acc.cells}
}

// TestCompare_MatchesNaive checks the indexed overlay against the brute-force
// one: the same cells, summed in a different order.
func TestCompare_MatchesNaive(t *testing.T) {
	rng := rand.New(rand.NewPCG(testSeed(t), 12))
	a := randomSurface(rng, 30, 20, 23, 17, 0.2)
	b := transformMesh(randomSurface(rng, 30, 20, 19, 21, 0.2), 0.3, 4, -3, 0)
	got, want := mustCompare(t, a, b, nil), compareNaive(t, a, b)
	if !closeRel(got.CutM3, want.CutM3, 1e-12, 1) || !closeRel(got.FillM3, want.FillM3, 1e-12, 1) ||
		!closeRel(got.AreaM2, want.AreaM2, 1e-12, 1) || got.Triangles != want.Triangles {
		t.Errorf("Compare = %+v, naive overlay %+v", got, want)
	}
}

// benchSurfaces returns two unrelated triangulations of the same 500 m × 400
// m site with about n triangles each.
func benchSurfaces(n int) (a, b geom.TriMesh) {
	rng := rand.New(rand.NewPCG(1, 2))
	side := int(math.Sqrt(float64(n) / 2))
	a = randomSurface(rng, 500, 400, side, side, 0.2)
	b = randomSurface(rng, 500, 400, side+7, side-5, 0.2)
	return a, b
}

func benchmarkCompare(b *testing.B, n int, boundary []geom.Ring) {
	m1, m2 := benchSurfaces(n)
	b.ReportAllocs()
	var r CompareResult
	for b.Loop() {
		var err error
		r, err = Compare(m1, m2, boundary)
		if err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(r.Triangles), "cells")
}

func BenchmarkCompare1000(b *testing.B) { benchmarkCompare(b, 1000, nil) }

func BenchmarkCompareNaive1000(b *testing.B) {
	m1, m2 := benchSurfaces(1000)
	b.ReportAllocs()
	for b.Loop() {
		compareNaive(b, m1, m2)
	}
}

// BenchmarkCompare100000 is the task's size: two TINs of about 1e5
// triangles each.
func BenchmarkCompare100000(b *testing.B) { benchmarkCompare(b, 100000, nil) }

// BenchmarkCompareBoundary100000 adds a concave 200-vertex boundary.
func BenchmarkCompareBoundary100000(b *testing.B) {
	var ring geom.Ring
	for i := range 200 {
		th := 2 * math.Pi * float64(i) / 200
		r := 150 + 40*math.Sin(5*th)
		ring = append(ring, geom.Vec2{X: 250 + r*math.Cos(th), Y: 200 + r*math.Sin(th)})
	}
	benchmarkCompare(b, 100000, []geom.Ring{ring})
}

// BenchmarkCompareSameMesh100000 compares a TIN with a copy of itself with
// other heights, the common case of a design draped on the ground's own
// triangles: every clip meets edges exactly, the near-degenerate path.
func BenchmarkCompareSameMesh100000(b *testing.B) {
	m1, _ := benchSurfaces(100000)
	m2 := transformMesh(m1, 0, 0, 0, 0.5)
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Compare(m1, m2, nil); err != nil {
			b.Fatal(err)
		}
	}
}
