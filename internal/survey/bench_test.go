package survey

import (
	"math/rand/v2"
	"path/filepath"
	"slices"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/reftest"
	"github.com/dugout-estimating/dugout/internal/units"
)

// autzenGround is the 26,107-point LiDAR ground CSV of shared/data
// (PDAL sample, BSD licence, Copyright Hobu, Inc.).
func autzenGround(tb testing.TB) string {
	return filepath.Join(reftest.SharedDir(tb), "data", "csv", "autzen_trim_ground_ft.csv")
}

func BenchmarkReadCSV26107(b *testing.B) {
	path := autzenGround(b)
	opt := Options{Units: units.Feet}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Read([]string{path}, opt); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkSummary26107(b *testing.B) {
	s := mustRead(b, Options{Units: units.Feet}, autzenGround(b))
	b.ReportAllocs()
	for b.Loop() {
		_ = s.Summary()
	}
}

// randomPlan returns n seeded positions in a 100 m square.
func randomPlan(n int) []geom.Vec2 {
	rng := rand.New(rand.NewPCG(1, 2))
	pts := make([]geom.Vec2, n)
	for i := range pts {
		pts[i] = geom.Vec2{X: 100 * rng.Float64(), Y: 100 * rng.Float64()}
	}
	return pts
}

func BenchmarkNearestGrid10000(b *testing.B) {
	pts := randomPlan(10000)
	g := newPointGrid(pts)
	var out []neighbour
	b.ReportAllocs()
	for b.Loop() {
		for _, p := range pts[:1000] {
			out = g.nearest(p, SpikeNeighbours, nil, out)
		}
	}
}

// nearestNaive is the baseline: every point's distance, sorted.
func nearestNaive(pts []geom.Vec2, p geom.Vec2, k int) []neighbour {
	all := make([]neighbour, len(pts))
	for i, q := range pts {
		all[i] = neighbour{i, p.DistanceSquared(q)}
	}
	slices.SortFunc(all, func(a, b neighbour) int {
		switch {
		case a.d2 < b.d2 || a.d2 == b.d2 && a.i < b.i:
			return -1
		case a == b:
			return 0
		}
		return 1
	})
	return all[:min(k, len(all))]
}

func BenchmarkNearestNaive10000(b *testing.B) {
	pts := randomPlan(10000)
	b.ReportAllocs()
	for b.Loop() {
		for _, p := range pts[:1000] {
			_ = nearestNaive(pts, p, SpikeNeighbours)
		}
	}
}

// TestNearest_MatchesNaive checks the grid search against the brute-force
// baseline on uniform, clustered and collinear points.
func TestNearest_MatchesNaive(t *testing.T) {
	sets := map[string][]geom.Vec2{"uniform": randomPlan(2000)}
	var line, cluster []geom.Vec2
	for i := range 300 {
		line = append(line, geom.Vec2{X: float64(i) * 0.7, Y: 3})
		cluster = append(cluster, geom.Vec2{X: float64(i%10) * 1e-3, Y: float64(i/10) * 1e-3})
	}
	cluster = append(cluster, geom.Vec2{X: 1000, Y: 1000})
	sets["line"], sets["cluster"] = line, cluster
	for name, pts := range sets {
		g := newPointGrid(pts)
		for i, p := range pts {
			got := g.nearest(p, SpikeNeighbours, nil, nil)
			want := nearestNaive(pts, p, SpikeNeighbours)
			if !slices.Equal(got, want) {
				t.Fatalf("%s point %d: grid %v, naive %v", name, i, got, want)
			}
		}
	}
}

// TestSummary_AutzenGround pins the benchmark data's summary: 26,107
// points, no duplicates (SOURCES.md: all x,y distinct) and the spikes the
// test flags on this LiDAR ground (17, a count of our own test, not an
// outside value).
func TestSummary_AutzenGround(t *testing.T) {
	s := mustRead(t, Options{Units: units.Feet}, autzenGround(t))
	sum := s.Summary()
	if sum.Count != 26107 || len(sum.Duplicates) != 0 || len(sum.Spikes) != 17 {
		t.Errorf("count %d, duplicates %d, spikes %d; want 26107, 0, 17", sum.Count, len(sum.Duplicates), len(sum.Spikes))
	}
}
