package tin

import (
	"math"
	"math/rand/v2"
	"path/filepath"
	"runtime"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/reftest"
	"github.com/dugout-estimating/dugout/internal/units"
	"github.com/tidwall/rtree"
)

// benchSeed seeds the uniform benchmark points; scripts/bench_tin_gen.go
// generates the same points for the SciPy comparison.
const benchSeed1, benchSeed2 = 20240601, 7

// uniformPoints returns n points uniform on the 200 m × 150 m reference site
// (refbench site.json: origin (1000, 2000)), in the local frame centred on
// the site, with a smooth terrain elevation. scripts/bench_tin_gen.go has
// the same generator.
func uniformPoints(n int) []geom.Vec3 {
	r := rand.New(rand.NewPCG(benchSeed1, benchSeed2))
	pts := make([]geom.Vec3, n)
	for i := range pts {
		x, y := r.Float64()*200-100, r.Float64()*150-75
		pts[i] = geom.Vec3{X: x, Y: y, Z: 100 + 0.02*x + 0.01*y}
	}
	return pts
}

func benchBuild(b *testing.B, pts []geom.Vec3, opt Options) {
	b.ReportAllocs()
	var ms0, ms1 runtime.MemStats
	runtime.ReadMemStats(&ms0)
	var s *Surface
	for b.Loop() {
		var err error
		s, err = Build(pts, opt)
		if err != nil {
			b.Fatal(err)
		}
	}
	runtime.ReadMemStats(&ms1)
	b.ReportMetric(float64(ms1.TotalAlloc-ms0.TotalAlloc)/float64(b.N)/float64(len(pts)), "B/pt")
	b.ReportMetric(float64(s.Summary().Triangles), "triangles")
}

func BenchmarkBuild1e4(b *testing.B) { benchBuild(b, uniformPoints(1e4), Options{}) }
func BenchmarkBuild1e5(b *testing.B) { benchBuild(b, uniformPoints(1e5), Options{}) }
func BenchmarkBuild1e6(b *testing.B) { benchBuild(b, uniformPoints(1e6), Options{}) }

// BenchmarkBuildAutzenGround builds the Autzen LiDAR ground sample (26,107
// points, feet to metres, local frame); TestLiDAR pins its result (52,187
// triangles, as SciPy).
func BenchmarkBuildAutzenGround(b *testing.B) {
	path := filepath.Join(reftest.SharedDir(b), "data", "csv", "autzen_trim_ground_ft.csv")
	benchBuild(b, toLocal(readCSVPoints(b, path, units.Foot)), Options{})
}

// BenchmarkBuildBreaklines1e5 adds 100 breaklines to 1e5 points, each a
// random walk of 40 vertices with 2 m steps (curbs, toes and tops of bank:
// a few cross), and BenchmarkBuildBreaklinesCrossing1e5 50 long random
// lines of 20 vertices crossing each other about 10^5 times (a stress case).
func BenchmarkBuildBreaklines1e5(b *testing.B) {
	r := rand.New(rand.NewPCG(5, 6))
	var bls []Breakline
	for range 100 {
		x, y := r.Float64()*160-80, r.Float64()*110-55
		dir := r.Float64() * 2 * math.Pi
		var p []geom.Vec3
		for range 40 {
			p = append(p, geom.Vec3{X: x, Y: y, Z: 100})
			dir += r.Float64()*0.6 - 0.3
			x = max(-99, min(99, x+2*math.Cos(dir)))
			y = max(-74, min(74, y+2*math.Sin(dir)))
		}
		bls = append(bls, Breakline{Name: "b", Pts: p})
	}
	benchBuild(b, uniformPoints(1e5), Options{Breaklines: bls, ConflictTolM: 1e9})
}

func BenchmarkBuildBreaklinesCrossing1e5(b *testing.B) {
	r := rand.New(rand.NewPCG(5, 6))
	var bls []Breakline
	for range 50 {
		var p []geom.Vec3
		for range 20 {
			p = append(p, geom.Vec3{X: r.Float64()*180 - 90, Y: r.Float64()*130 - 65, Z: 100})
		}
		bls = append(bls, Breakline{Name: "b", Pts: p})
	}
	benchBuild(b, uniformPoints(1e5), Options{Breaklines: bls, ConflictTolM: 1e9})
}

// queryPoints returns n query points uniform over the site.
func queryPoints(n int) []geom.Vec2 {
	r := rand.New(rand.NewPCG(11, 12))
	q := make([]geom.Vec2, n)
	for i := range q {
		q[i] = geom.Vec2{X: r.Float64()*200 - 100, Y: r.Float64()*150 - 75}
	}
	return q
}

func benchElevation(b *testing.B, s *Surface) {
	q := queryPoints(1 << 16)
	b.ReportAllocs()
	var sum float64
	i := 0
	for b.Loop() {
		p := q[i&(len(q)-1)]
		if z, ok := s.Elevation(p.X, p.Y); ok {
			sum += z
		}
		i++
	}
	sinkF = sum
	b.ReportMetric(float64(b.N)/b.Elapsed().Seconds(), "queries/s")
}

// BenchmarkElevation1e5 and 1e6: random queries (jump-and-walk from the
// start grid) on surfaces of 1e5 and 1e6 uniform points.
func BenchmarkElevation1e5(b *testing.B) {
	benchElevation(b, mustBuild(b, uniformPoints(1e5), Options{}))
}
func BenchmarkElevation1e6(b *testing.B) {
	s, err := Build(uniformPoints(1e6), Options{})
	if err != nil {
		b.Fatal(err)
	}
	benchElevation(b, s)
}

// BenchmarkElevationBuckets1e5: the same queries through the bucket grid that
// FromMesh surfaces use.
func BenchmarkElevationBuckets1e5(b *testing.B) {
	s, err := FromMesh(mustBuild(b, uniformPoints(1e5), Options{}).Mesh())
	if err != nil {
		b.Fatal(err)
	}
	benchElevation(b, s)
}

// BenchmarkLocateRTree1e5 is the alternative point locator: an R-tree
// (tidwall/rtree) of triangle bounding boxes, searched at the query point,
// each candidate tested exactly. The start grid + walk is faster
// (BenchmarkElevation1e5), so Surface uses it.
func BenchmarkLocateRTree1e5(b *testing.B) {
	s := mustBuild(b, uniformPoints(1e5), Options{})
	m := s.Mesh()
	var tr rtree.RTreeG[int32]
	for t := range m.NumTriangles() {
		p, q, r := m.Triangle(t)
		tr.Insert([2]float64{min(p.X, q.X, r.X), min(p.Y, q.Y, r.Y)}, [2]float64{max(p.X, q.X, r.X), max(p.Y, q.Y, r.Y)}, int32(t))
	}
	qs := queryPoints(1 << 16)
	b.ReportAllocs()
	found := 0
	i := 0
	for b.Loop() {
		p := qs[i&(len(qs)-1)]
		tr.Search([2]float64{p.X, p.Y}, [2]float64{p.X, p.Y}, func(_, _ [2]float64, t int32) bool {
			if containsClosed(m, int(t), p) {
				found++
				return false
			}
			return true
		})
		i++
	}
	sinkF = float64(found)
	b.ReportMetric(float64(b.N)/b.Elapsed().Seconds(), "queries/s")
}

// BenchmarkSampleLattice: a 1000 × 750 lattice (0.2 m) over the 1e5-point
// surface, by scanline rasterisation, and the naive baseline (Elevation at
// every node).
func BenchmarkSampleLattice(b *testing.B) {
	s := mustBuild(b, uniformPoints(1e5), Options{})
	const nx, ny = 1000, 750
	out := make([]float64, nx*ny)
	b.ReportAllocs()
	for b.Loop() {
		s.SampleLattice(-100, -75, 0.2, nx, ny, out)
	}
	b.ReportMetric(float64(b.N)*nx*ny/b.Elapsed().Seconds(), "nodes/s")
}

func BenchmarkSampleLatticeNaive(b *testing.B) {
	s := mustBuild(b, uniformPoints(1e5), Options{})
	const nx, ny = 1000, 750
	out := make([]float64, nx*ny)
	b.ReportAllocs()
	for b.Loop() {
		for j := range ny {
			for i := range nx {
				z, _ := s.Elevation(-100+float64(i)*0.2, -75+float64(j)*0.2)
				out[j*nx+i] = z
			}
		}
	}
	b.ReportMetric(float64(b.N)*nx*ny/b.Elapsed().Seconds(), "nodes/s")
}

var sinkF float64

// BenchmarkBuild1e6Merge1cm: as BenchmarkBuild1e6 with a 1 cm merge
// distance (the project's default for re-shots).
func BenchmarkBuild1e6Merge1cm(b *testing.B) {
	benchBuild(b, uniformPoints(1e6), Options{MergeTolM: 0.01})
}
