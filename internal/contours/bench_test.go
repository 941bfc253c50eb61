package contours_test

import (
	"math"
	"testing"

	"github.com/dugout-estimating/dugout/internal/contours"
	"github.com/dugout-estimating/dugout/internal/geom"
)

// The benchmark site: the reference bench's synthetic terrain
// (../shared/refbench/README.md) over its 200 m × 150 m site, sampled on an
// 817 × 613 lattice (500 821 vertices, 998 784 triangles), with 100 levels
// at a 0.0575 m interval (99.8775 m to 105.57 m). scripts/bench_contours.sh
// contours a raster of the same samples with gdal_contour; keep the two in
// step.
const (
	benchNX, benchNY = 817, 613
	benchW           = 200.0
	benchInterval    = 0.0575
)

// benchMesh samples the terrain on an nx × ny lattice over the site and
// splits each cell along its north-west to south-east diagonal, the saddle
// choice of GDAL's marching squares (see latticeMesh), so that the TIN and
// gdal_contour's raster of the same samples have the same contours.
func benchMesh(tb testing.TB, nx, ny int) geom.TriMesh {
	tb.Helper()
	d := benchW / float64(nx-1)
	m := gridMesh(nx, ny, 0, 0, d, terrain)
	m.T = m.T[:0]
	for j := range ny - 1 {
		for i := range nx - 1 {
			sw := int32(j*nx + i)
			se, ne, nw := sw+1, sw+int32(nx)+1, sw+int32(nx)
			m.T = append(m.T, sw, se, nw, se, ne, nw)
		}
	}
	return m
}

func benchOptions() contours.Options {
	return contours.Options{IntervalM: benchInterval, MinLevel: math.NaN(), MaxLevel: math.NaN()}
}

func benchTrace(b *testing.B, m geom.TriMesh, o contours.Options, wantLevels int) {
	b.Helper()
	lv, err := contours.Levels(99.8256, 105.6071, o) // the sampled terrain's range
	if err != nil || (wantLevels > 0 && len(lv) != wantLevels) {
		b.Fatalf("levels %d (%v), want %d", len(lv), err, wantLevels)
	}
	var lines []contours.Line
	b.ReportAllocs()
	for b.Loop() {
		lines, err = contours.Trace(m, o)
		if err != nil {
			b.Fatal(err)
		}
	}
	pts := 0
	for _, l := range lines {
		pts += len(l.Pts)
	}
	b.ReportMetric(float64(len(lines)), "lines")
	b.ReportMetric(float64(pts), "points")
}

// BenchmarkTrace1e6 contours the 998 784-triangle bench TIN at 100 levels.
func BenchmarkTrace1e6(b *testing.B) {
	benchTrace(b, benchMesh(b, benchNX, benchNY), benchOptions(), 100)
}

// BenchmarkTrace1e6Smooth is BenchmarkTrace1e6 with smoothing.
func BenchmarkTrace1e6Smooth(b *testing.B) {
	o := benchOptions()
	o.Smooth = true
	benchTrace(b, benchMesh(b, benchNX, benchNY), o, 100)
}

// BenchmarkTrace1e5 contours a 1e5-triangle version of the site (the same
// terrain on a coarser lattice) at the same 100 levels.
func BenchmarkTrace1e5(b *testing.B) {
	benchTrace(b, benchMesh(b, 259, 195), benchOptions(), 100)
}

// BenchmarkTraceLevelEach1e5 is the naive baseline for BenchmarkTrace1e5:
// one TraceLevel per level, each building its own edge table and scanning
// every triangle.
func BenchmarkTraceLevelEach1e5(b *testing.B) {
	m := benchMesh(b, 259, 195)
	lv, err := contours.Levels(99.8256, 105.6071, benchOptions())
	if err != nil {
		b.Fatal(err)
	}
	n := 0
	b.ReportAllocs()
	for b.Loop() {
		n = 0
		for _, z := range lv {
			n += len(contours.TraceLevel(m, z))
		}
	}
	b.ReportMetric(float64(n), "lines")
}

// BenchmarkTraceLattice1e5 contours the integer lattice with integer levels,
// where every contour runs through vertices exactly on its level (the
// degenerate case: repeated points, ridge cancellation).
func BenchmarkTraceLattice1e5(b *testing.B) {
	m := gridMesh(224, 224, 0, 0, 1, func(x, y float64) float64 {
		return math.Round(20 * math.Sin(x/17) * math.Cos(y/23))
	})
	benchTrace(b, m, contours.Options{IntervalM: 1, MinLevel: math.NaN(), MaxLevel: math.NaN()}, 0)
}
