package survey

import (
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/dugout-estimating/dugout/internal/reftest"
	"github.com/dugout-estimating/dugout/internal/units"
)

// TestSummary_RefbenchTotalStation reads the reference bench's total-station
// set (refbench/gen_terrain.py, run here with its default seed). Its
// generator plants 8 exact duplicates (same x, y, z), 5 re-shots (same x, y,
// z raised 2–5 cm) and 3 near-duplicates 1 mm away; its MANIFEST.json
// counts 602 distinct x,y and 607 distinct x,y,z of 615 rows. The terrain
// is a smooth analytic surface, so no shot is a spike.
func TestSummary_RefbenchTotalStation(t *testing.T) {
	py := reftest.Python(t, "numpy")
	dir := reftest.SharedDir(t)
	out := t.TempDir()
	cmd := exec.Command(py, filepath.Join(dir, "refbench", "gen_terrain.py"), "--sizes", "", "--out", out)
	if b, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("gen_terrain.py: %v\n%s", err, b)
	}
	for _, tc := range []struct {
		file string
		u    units.System
	}{{"total_station_m.csv", units.Metres}, {"total_station_ftUS.csv", units.USFeet}} {
		t.Run(tc.file, func(t *testing.T) {
			s := mustRead(t, Options{Units: tc.u, ConflictTolM: 0.01}, filepath.Join(out, tc.file))
			sum := s.Summary()
			if sum.Count != 615 || sum.ExactDuplicates != 8 || sum.NearDuplicates != 8 {
				t.Errorf("count %d, exact %d, near %d; want 615, 8, 8 (5 re-shots + 3 at 1 mm)", sum.Count, sum.ExactDuplicates, sum.NearDuplicates)
			}
			// Re-shots differ by 2–5 cm: all five exceed a 1 cm conflict
			// tolerance; the 1 mm neighbours differ by far less.
			if len(sum.Conflicts) != 5 {
				t.Errorf("conflicts %d, want 5", len(sum.Conflicts))
			}
			for _, d := range sum.Conflicts {
				if d.PlanDistM != 0 || math.Abs(d.DzM) < 0.02-1e-6 || math.Abs(d.DzM) > 0.05+1e-6 {
					t.Errorf("conflict %+v, want same x,y and 2–5 cm apart", d)
				}
			}
			if len(sum.Spikes) != 0 {
				t.Errorf("spikes %+v on a smooth analytic terrain, want none", sum.Spikes)
			}
		})
	}
}

// TestSummary_RepeatedXYInLiDAR: the all-classes Autzen CSV has 110,000
// rows and 109,993 distinct x,y (shared/data/SOURCES.md), so with a
// duplicate tolerance of zero 7 shots repeat an earlier x,y.
func TestSummary_RepeatedXYInLiDAR(t *testing.T) {
	if testing.Short() {
		t.Skip("110,000 points")
	}
	dir := reftest.SharedDir(t)
	s := mustRead(t, Options{Units: units.Feet, DupTolM: 1e-9}, filepath.Join(dir, "data", "csv", "autzen_trim_all_ft.csv"))
	sum := s.Summary()
	if n := sum.ExactDuplicates + sum.NearDuplicates; sum.Count != 110000 || n != 7 {
		t.Errorf("count %d, repeated x,y %d, want 110000 and 7", sum.Count, n)
	}
}

// TestSummary_AccuracyPercentilesMatchNumpy compares the accuracy summary
// with numpy.percentile (default "linear" method) on seeded values.
func TestSummary_AccuracyPercentilesMatchNumpy(t *testing.T) {
	py := reftest.Python(t, "numpy")
	seed := seedFromEnv(t)
	rng := rand.New(rand.NewPCG(seed, 7))
	var b strings.Builder
	b.WriteString("name,lat,lon,alt,hacc,vacc\n")
	var hs, vs []string
	for i := range 37 {
		h := 0.3 + 1.7*rng.Float64()
		v := 0.5 + 2.5*rng.Float64()
		hs = append(hs, strconv.FormatFloat(h, 'g', -1, 64))
		vs = append(vs, strconv.FormatFloat(v, 'g', -1, 64))
		fmt.Fprintf(&b, "p%d,%.9f,%.9f,200,%s,%s\n", i, 44.04+1e-5*float64(i%6), -92.84+1e-5*float64(i/6), hs[i], vs[i])
	}
	s, err := readString(t, "acc.csv", b.String(), Options{})
	if err != nil {
		t.Fatal(err)
	}
	sum := s.Summary()
	script := "import numpy as np\nfor a in ([" + strings.Join(hs, ",") + "],[" + strings.Join(vs, ",") + "]):\n" +
		"    a = np.array(a); print(repr(a.min()), repr(np.percentile(a, 50)), repr(np.percentile(a, 95)), repr(a.max()))\n"
	out, err := exec.Command(py, "-c", script).Output()
	if err != nil {
		t.Fatalf("numpy: %v", err)
	}
	rows := strings.Split(strings.TrimSpace(string(out)), "\n")
	for i, acc := range []Accuracy{sum.HAcc, sum.VAcc} {
		f := strings.Fields(rows[i])
		got := []float64{acc.MinM, acc.MedianM, acc.P95M, acc.MaxM}
		for j := range f {
			want, _ := strconv.ParseFloat(f[j], 64)
			if !closeTo(got[j], want, 1e-12) {
				t.Errorf("seed %d: accuracy %d stat %d = %v, numpy %v", seed, i, j, got[j], want)
			}
		}
		if acc.N != 37 {
			t.Errorf("N = %d, want 37", acc.N)
		}
	}
}

// seedFromEnv returns the seed for randomised tests: DUGOUT_SEED when set,
// else a fixed one; it is logged so a failure can be replayed.
func seedFromEnv(tb testing.TB) uint64 {
	tb.Helper()
	seed := uint64(20240601)
	if s := os.Getenv("DUGOUT_SEED"); s != "" {
		v, err := strconv.ParseUint(s, 10, 64)
		if err != nil {
			tb.Fatalf("DUGOUT_SEED=%q: %v", s, err)
		}
		seed = v
	}
	tb.Logf("seed %d (set DUGOUT_SEED to change)", seed)
	return seed
}

// syntheticSite returns a CSV of a jittered 1 m grid over a 30 × 20 m site
// on the plane z = 100 + 0.03x − 0.02y with 1 cm normal noise, a 0.6 m step
// (a wall) along x = 15, and extra shots given as "id x y dz" (dz above the
// surface).
func syntheticSite(seed uint64, extra [][4]float64) string {
	rng := rand.New(rand.NewPCG(seed, 11))
	surface := func(x, y float64) float64 {
		z := 100 + 0.03*x - 0.02*y
		if x < 15 {
			z += 0.6
		}
		return z
	}
	var b strings.Builder
	b.WriteString("id,e,n,z\n")
	id := 0
	for j := 0; j <= 20; j++ {
		for i := 0; i <= 30; i++ {
			if i == 15 {
				continue // the wall itself is shot below as two strings
			}
			x := float64(i) + 0.2*(rng.Float64()-0.5)
			y := float64(j) + 0.2*(rng.Float64()-0.5)
			id++
			fmt.Fprintf(&b, "%d,%.4f,%.4f,%.4f\n", id, x, y, surface(x, y)+0.01*rng.NormFloat64())
		}
	}
	for j := 0; j <= 40; j++ { // top and bottom of the wall, 0.5 m apart
		y := 0.5 * float64(j)
		id++
		fmt.Fprintf(&b, "%d,%.4f,%.4f,%.4f\n", id, 14.95, y, surface(14.95, y))
		id++
		fmt.Fprintf(&b, "%d,%.4f,%.4f,%.4f\n", id, 15.05, y, surface(15.05, y))
	}
	for _, e := range extra {
		fmt.Fprintf(&b, "S%d,%.4f,%.4f,%.4f\n", int(e[0]), e[1], e[2], surface(e[1], e[2])+e[3])
	}
	return b.String()
}

// TestSummary_Spikes plants shots on a stake top (+0.45 m), in a hole
// (−0.35 m) and a mistyped elevation (+3 m) on a noisy plane with a wall
// step, and expects exactly those three flagged: not the wall's top and
// bottom strings, not the site's edges.
func TestSummary_Spikes(t *testing.T) {
	seed := seedFromEnv(t)
	extra := [][4]float64{{1, 5.5, 5.5, 0.45}, {2, 22.5, 12.5, -0.35}, {3, 8.5, 16.5, 3}}
	s, err := readString(t, "site.csv", syntheticSite(seed, extra), Options{})
	if err != nil {
		t.Fatal(err)
	}
	sum := s.Summary()
	var got []string
	for _, sp := range sum.Spikes {
		got = append(got, sp.Point.ID)
	}
	if strings.Join(got, " ") != "S1 S2 S3" {
		t.Errorf("seed %d: spikes %v (threshold %v m), want [S1 S2 S3]", seed, sum.Spikes, sum.SpikeThresholdM)
	}
	for _, sp := range sum.Spikes {
		want := map[string]float64{"S1": 0.45, "S2": -0.35, "S3": 3}[sp.Point.ID]
		// The plane through the noisy neighbours predicts within a few cm.
		if !closeTo(sp.ResidualM, want, 0.05) {
			t.Errorf("spike %s residual %.3f m, want about %.2f", sp.Point.ID, sp.ResidualM, want)
		}
	}
	// The noise (1 cm) is far below the floor, which therefore sets T.
	if sum.SpikeThresholdM != SpikeFloorM {
		t.Errorf("threshold %v, want the floor %v", sum.SpikeThresholdM, SpikeFloorM)
	}
	clean, err := readString(t, "site.csv", syntheticSite(seed, nil), Options{})
	if err != nil {
		t.Fatal(err)
	}
	if sp := clean.Summary().Spikes; len(sp) != 0 {
		t.Errorf("seed %d: spikes %+v on the clean site, want none", seed, sp)
	}
}

func TestSummary_SmallSets(t *testing.T) {
	// Degenerate inputs: one point, collinear points; nothing to test for
	// spikes, no panic.
	for _, content := range []string{
		"id,n,e,z\n1,0,0,1\n",
		"id,n,e,z\n1,0,0,1\n2,0,1,1\n3,0,2,1\n4,0,3,9\n5,0,4,1\n6,0,5,1\n7,0,6,1\n8,0,7,1\n9,0,8,1\n10,0,9,1\n",
	} {
		s, err := readString(t, "s.csv", content, Options{})
		if err != nil {
			t.Fatal(err)
		}
		sum := s.Summary()
		if sum.Count != len(s.Points) {
			t.Errorf("Count %d", sum.Count)
		}
	}
	var empty Set
	if sum := empty.Summary(); sum.Count != 0 || !sum.BoundsM.IsEmpty() || !math.IsNaN(sum.ElevMinM) {
		t.Errorf("empty Summary = %+v", sum)
	}
}

func TestSummary_ImplausibleElevations(t *testing.T) {
	tests := []struct {
		name, content, want string
	}{
		// 31 000 "m": a site surveyed in feet or millimetres.
		{"too high", "id,n,e,z\n1,0,0,31000\n2,10,10,31001\n3,20,0,31000.5\n", "above any ground on Earth"},
		{"too low", "id,n,e,z\n1,0,0,-900\n2,10,10,-901\n3,20,0,-900.5\n", "below any dry ground"},
		// 25 m of relief over a 14 m site: millimetres of z on metres?
		{"steeper than 1:1", "id,n,e,z\n1,0,0,100\n2,10,10,125\n3,5,5,110\n", "steeper than 1:1"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			s, err := readString(t, "z.csv", tc.content, Options{})
			if err != nil {
				t.Fatal(err)
			}
			if ws := s.Summary().Warnings; !hasWarning(ws, tc.want) {
				t.Errorf("warnings %v, want %q", ws, tc.want)
			}
		})
	}
	s, err := readString(t, "ok.csv", "id,n,e,z\n1,0,0,100\n2,10,10,101\n3,5,5,100.5\n", Options{})
	if err != nil {
		t.Fatal(err)
	}
	if ws := s.Summary().Warnings; len(ws) != 0 {
		t.Errorf("warnings %v on a plausible site, want none", ws)
	}
}

func TestSummary_LonLat(t *testing.T) {
	s := mustRead(t, Options{}, "testdata/gps_lonlat.csv")
	sum := s.Summary()
	// Back through the UTM inverse to the file's extremes (9 decimals).
	if !closeTo(sum.LonLat.Min.Y, 44.041557380, 1e-9) || !closeTo(sum.LonLat.Min.X, -92.846476700, 1e-9) {
		t.Errorf("LonLat = %v, want the minimum at lon -92.846476700 lat 44.041557380", sum.LonLat)
	}
	if sum.HAcc.N != 12 || sum.HAcc.MinM != 0.3 || sum.HAcc.MaxM != 2.0 || sum.VAcc.MaxM != 3.0 {
		t.Errorf("HAcc %+v VAcc %+v", sum.HAcc, sum.VAcc)
	}
}
