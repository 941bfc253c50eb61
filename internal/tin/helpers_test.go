package tin

import (
	"bufio"
	"encoding/csv"
	"encoding/json"
	"flag"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/reftest"
	"github.com/dugout-estimating/dugout/internal/robust"
)

// Random cases are reproducible; the seed can be set with -tin.seed or
// TIN_SEED and is printed by failing tests.
var seedFlag = flag.Uint64("tin.seed", 0, "random seed for the TIN tests (0: fixed default)")

func testSeed(tb testing.TB) uint64 {
	tb.Helper()
	if *seedFlag != 0 {
		return *seedFlag
	}
	if s := os.Getenv("TIN_SEED"); s != "" {
		v, err := strconv.ParseUint(s, 10, 64)
		if err != nil {
			tb.Fatalf("TIN_SEED=%q: %v", s, err)
		}
		return v
	}
	return 20240601
}

// v3 and v2 build points with keyed fields.
func v3(x, y, z float64) geom.Vec3 { return geom.Vec3{X: x, Y: y, Z: z} }
func v2(x, y float64) geom.Vec2    { return geom.Vec2{X: x, Y: y} }

// parsePts parses the compact fixture format "x y z; x y z; ...".
func parsePts(tb testing.TB, s string) []geom.Vec3 {
	tb.Helper()
	var out []geom.Vec3
	for _, f := range strings.Split(s, ";") {
		f = strings.TrimSpace(f)
		if f == "" {
			continue
		}
		w := strings.Fields(f)
		if len(w) != 3 {
			tb.Fatalf("parsePts: %q: want 3 numbers", f)
		}
		var p [3]float64
		for i := range w {
			v, err := strconv.ParseFloat(w[i], 64)
			if err != nil {
				tb.Fatalf("parsePts: %q: %v", f, err)
			}
			p[i] = v
		}
		out = append(out, v3(p[0], p[1], p[2]))
	}
	return out
}

func TestParsePts(t *testing.T) {
	got := parsePts(t, "1 2 3; -4 5.5 6 ;")
	want := []geom.Vec3{v3(1, 2, 3), v3(-4, 5.5, 6)}
	if !slices.Equal(got, want) {
		t.Errorf("parsePts = %v, want %v", got, want)
	}
}

// mustBuild builds and validates a surface.
func mustBuild(tb testing.TB, pts []geom.Vec3, opt Options) *Surface {
	tb.Helper()
	s, err := Build(pts, opt)
	if err != nil {
		tb.Fatalf("Build(%d points): %v", len(pts), err)
	}
	if err := s.Validate(); err != nil {
		tb.Fatalf("Validate after Build(%d points): %v", len(pts), err)
	}
	return s
}

// randomPoints returns n points uniform in [0, w) × [0, h) shifted by off,
// with elevations from f (or 0).
func randomPoints(r *rand.Rand, n int, off geom.Vec2, w, h float64, f func(x, y float64) float64) []geom.Vec3 {
	pts := make([]geom.Vec3, n)
	for i := range pts {
		x, y := off.X+r.Float64()*w, off.Y+r.Float64()*h
		z := 0.0
		if f != nil {
			z = f(x, y)
		}
		pts[i] = v3(x, y, z)
	}
	return pts
}

// hullBoundaryCount counts the input positions on the boundary of the
// convex hull, collinear ones included, by brute force: a point is on the
// boundary when some line through it and another point has every point on
// one closed side. It is the h of t = 2n − 2 − h.
func hullBoundaryCount(pts []geom.Vec2) int {
	h := convexHull(vec3s(pts))
	cnt := 0
	for _, p := range pts {
		for i := range h {
			a, b := h[i], h[(i+1)%len(h)]
			if robust.Orient2D(a, b, p) == 0 &&
				math.Min(a.X, b.X) <= p.X && p.X <= math.Max(a.X, b.X) &&
				math.Min(a.Y, b.Y) <= p.Y && p.Y <= math.Max(a.Y, b.Y) {
				cnt++
				break
			}
		}
	}
	return cnt
}

func vec3s(p []geom.Vec2) []geom.Vec3 {
	out := make([]geom.Vec3, len(p))
	for i, q := range p {
		out[i] = v3(q.X, q.Y, 0)
	}
	return out
}

// distinctXY returns the distinct plan positions of pts.
func distinctXY(pts []geom.Vec3) []geom.Vec2 {
	seen := make(map[geom.Vec2]bool)
	var out []geom.Vec2
	for _, p := range pts {
		q := v2(p.X, p.Y)
		if !seen[q] {
			seen[q] = true
			out = append(out, q)
		}
	}
	return out
}

// canonTris returns the triangles of s as sorted triples of input indices
// (each counter-clockwise, smallest index first), the form ref_delaunay.py
// writes.
func canonTris(tb testing.TB, s *Surface) [][3]int {
	tb.Helper()
	m := s.Mesh()
	out := make([][3]int, 0, m.NumTriangles())
	for t := range m.NumTriangles() {
		var tr [3]int
		for k := range 3 {
			i, ok := s.Source(int(m.T[3*t+k]))
			if !ok {
				tb.Fatalf("vertex %d of triangle %d has no input point", m.T[3*t+k], t)
			}
			tr[k] = i
		}
		for tr[0] > tr[1] || tr[0] > tr[2] {
			tr = [3]int{tr[1], tr[2], tr[0]}
		}
		out = append(out, tr)
	}
	slices.SortFunc(out, func(a, b [3]int) int {
		for k := range 3 {
			if a[k] != b[k] {
				return a[k] - b[k]
			}
		}
		return 0
	})
	return out
}

// writeTris writes triangles in ref_delaunay.py's CSV format.
func writeTris(tb testing.TB, path string, tris [][3]int) {
	tb.Helper()
	var b strings.Builder
	b.WriteString("a,b,c\n")
	for _, t := range tris {
		fmt.Fprintf(&b, "%d,%d,%d\n", t[0], t[1], t[2])
	}
	if err := os.WriteFile(path, []byte(b.String()), 0o644); err != nil {
		tb.Fatal(err)
	}
}

// readTris reads ref_delaunay.py's triangle CSV.
func readTris(tb testing.TB, path string) [][3]int {
	tb.Helper()
	f, err := os.Open(path)
	if err != nil {
		tb.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(bufio.NewReader(f)).ReadAll()
	if err != nil {
		tb.Fatal(err)
	}
	var out [][3]int
	for _, r := range rows[1:] {
		var t [3]int
		for k := range 3 {
			if t[k], err = strconv.Atoi(r[k]); err != nil {
				tb.Fatal(err)
			}
		}
		out = append(out, t)
	}
	return out
}

// writePointsCSV writes x,y,z with round-trip precision.
func writePointsCSV(tb testing.TB, path string, pts []geom.Vec3) {
	tb.Helper()
	var b strings.Builder
	b.WriteString("x,y,z\n")
	for _, p := range pts {
		b.WriteString(strconv.FormatFloat(p.X, 'g', -1, 64) + "," + strconv.FormatFloat(p.Y, 'g', -1, 64) + "," + strconv.FormatFloat(p.Z, 'g', -1, 64) + "\n")
	}
	if err := os.WriteFile(path, []byte(b.String()), 0o644); err != nil {
		tb.Fatal(err)
	}
}

// readJSONPoints reads a delaunator fixture: a JSON array of [x, y].
func readJSONPoints(tb testing.TB, path string) []geom.Vec3 {
	tb.Helper()
	data, err := os.ReadFile(path)
	if err != nil {
		tb.Fatal(err)
	}
	var xy [][2]float64
	if err := json.Unmarshal(data, &xy); err != nil {
		tb.Fatalf("%s: %v", path, err)
	}
	out := make([]geom.Vec3, len(xy))
	for i, p := range xy {
		out[i] = v3(p[0], p[1], 0)
	}
	return out
}

// readCSVPoints reads an x,y,z CSV with a header, scaling every coordinate
// by unit (metres per file unit).
func readCSVPoints(tb testing.TB, path string, unit float64) []geom.Vec3 {
	tb.Helper()
	f, err := os.Open(path)
	if err != nil {
		tb.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(bufio.NewReader(f)).ReadAll()
	if err != nil {
		tb.Fatal(err)
	}
	out := make([]geom.Vec3, 0, len(rows)-1)
	for li, r := range rows[1:] {
		var p [3]float64
		for k := range 3 {
			if p[k], err = strconv.ParseFloat(r[k], 64); err != nil {
				tb.Fatalf("%s line %d: %v", path, li+2, err)
			}
		}
		out = append(out, v3(p[0]*unit, p[1]*unit, p[2]*unit))
	}
	return out
}

// refCheck is the result of ref_delaunay.py --check that the tests read.
type refCheck struct {
	Valid                bool    `json:"valid"`
	Delaunay             bool    `json:"delaunay"`
	Triangles            int     `json:"triangles"`
	DistinctUnused       int     `json:"distinct_points_unused"`
	DelaunayViolations   int     `json:"delaunay_violations"`
	CocircularTies       int     `json:"cocircular_ties"`
	AreaRelDiff          float64 `json:"area_rel_diff"`
	VsScipyOnlyHere      int     `json:"vs_scipy_only_here"`
	VsScipyOnlyScipy     int     `json:"vs_scipy_only_scipy"`
	ScipyTriangles       int     `json:"-"`
	DirectedEdgeRepeats  int     `json:"directed_edge_repeats"`
	DegenerateZeroArea   int     `json:"degenerate_zero_area"`
	EdgesOverTwoTriangle int     `json:"edges_over_2_triangles"`
}

// runRefDelaunay runs the reference bench's SciPy (Qhull) Delaunay script
// on the points file: with tris set it also validates that triangulation
// (exact rational predicates) and diffs it against SciPy's; with outTris
// set it writes SciPy's canonical triangles there.
func runRefDelaunay(tb testing.TB, pointsPath string, tris [][3]int, outTris string) refCheck {
	tb.Helper()
	py := reftest.Python(tb, "numpy", "scipy.spatial")
	script := filepath.Join(reftest.SharedDir(tb), "refbench", "ref_delaunay.py")
	dir := tb.TempDir()
	res := filepath.Join(dir, "res.json")
	args := []string{script, pointsPath, "--repeat", "1", "--json", res}
	if tris != nil {
		check := filepath.Join(dir, "ours.csv")
		writeTris(tb, check, tris)
		args = append(args, "--check", check)
	}
	if outTris != "" {
		args = append(args, "--out-tris", outTris)
	}
	out, err := exec.Command(py, args...).CombinedOutput()
	if err != nil {
		tb.Fatalf("ref_delaunay.py: %v\n%s", err, out)
	}
	data, err := os.ReadFile(res)
	if err != nil {
		tb.Fatal(err)
	}
	var r struct {
		Triangles int      `json:"triangles"`
		Check     refCheck `json:"check"`
	}
	if err := json.Unmarshal(data, &r); err != nil {
		tb.Fatal(err)
	}
	r.Check.ScipyTriangles = r.Triangles
	return r.Check
}
