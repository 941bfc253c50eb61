package tin

import (
	"math/rand/v2"
	"runtime"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
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
