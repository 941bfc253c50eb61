package contours_test

import (
	"bufio"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/dugout-estimating/dugout/internal/contours"
	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/reftest"
	"github.com/dugout-estimating/dugout/internal/units"
)

// raster is a north-up grid of samples at pixel centres: pixel (i, j), row
// j counted from the north, has its centre at (x0 + (i+½)·cell,
// y0 + (ny − j − ½)·cell). NaN marks pixels outside the mesh.
type raster struct {
	x0, y0, cell float64
	nx, ny       int
	z            []float64
}

// rasterize samples the linear interpolant of m at the pixel centres of the
// grid (barycentric interpolation in each triangle, the definition of the
// TIN surface), the way ../shared/refbench/ref_contour.sh's scipy path
// samples its TIN.
func rasterize(m geom.TriMesh, x0, y0, cell float64, nx, ny int) raster {
	r := raster{x0: x0, y0: y0, cell: cell, nx: nx, ny: ny, z: make([]float64, nx*ny)}
	for i := range r.z {
		r.z[i] = math.NaN()
	}
	for t := range m.NumTriangles() {
		a, b, c := m.Triangle(t)
		d := 2 * geom.PlanArea(a, b, c)
		if d <= 0 {
			continue
		}
		bx := geom.BoxOf([]geom.Vec2{a.XY(), b.XY(), c.XY()})
		i0 := max(0, int(math.Ceil((bx.Min.X-x0)/cell-0.5)))
		i1 := min(nx-1, int(math.Floor((bx.Max.X-x0)/cell-0.5)))
		k0 := max(0, int(math.Ceil((bx.Min.Y-y0)/cell-0.5))) // rows from the south
		k1 := min(ny-1, int(math.Floor((bx.Max.Y-y0)/cell-0.5)))
		for k := k0; k <= k1; k++ {
			for i := i0; i <= i1; i++ {
				p := geom.Vec2{X: x0 + (float64(i)+0.5)*cell, Y: y0 + (float64(k)+0.5)*cell}
				l1 := b.XY().Sub(p).Cross(c.XY().Sub(p)) / d
				l2 := c.XY().Sub(p).Cross(a.XY().Sub(p)) / d
				l3 := 1 - l1 - l2
				if l1 >= 0 && l2 >= 0 && l3 >= 0 {
					r.z[(ny-1-k)*nx+i] = l1*a.Z + l2*b.Z + l3*c.Z
				}
			}
		}
	}
	return r
}

// at returns the sample of pixel column i, row k counted from the south,
// and whether it has one.
func (r raster) at(i, k int) (float64, bool) {
	if i < 0 || k < 0 || i >= r.nx || k >= r.ny {
		return 0, false
	}
	z := r.z[(r.ny-1-k)*r.nx+i]
	return z, !math.IsNaN(z)
}

// resolves reports whether the raster can show a contour at level through
// p: the square between the four pixel centres around p has samples on
// both sides of the level, so marching squares draws a segment in it. A
// feature of the surface that fits between pixel centres leaves no trace in
// the raster.
func (r raster) resolves(p geom.Vec2, level float64) bool {
	i := int(math.Floor((p.X-r.x0)/r.cell - 0.5))
	k := int(math.Floor((p.Y-r.y0)/r.cell - 0.5))
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, c := range [4][2]int{{i, k}, {i + 1, k}, {i, k + 1}, {i + 1, k + 1}} {
		z, ok := r.at(c[0], c[1])
		if !ok {
			return false
		}
		lo, hi = math.Min(lo, z), math.Max(hi, z)
	}
	return lo < level && level <= hi
}

// latticeMesh triangulates the pixel centres of r: every square of four
// valid samples is split along its north-west to south-east diagonal. Its
// linear interpolant equals the raster's along the square sides, where
// marching squares interpolates, and the fixed diagonal settles a saddle
// square the way GDAL's marching squares does: it always separates the
// south-west and north-east corners (alg/marching_squares/square.h,
// "From the two possible saddle configurations, we always return the same
// one"). So its contours have the raster's topology exactly.
func latticeMesh(r raster) geom.TriMesh {
	var m geom.TriMesh
	id := make([]int32, r.nx*r.ny)
	for k := range r.ny {
		for i := range r.nx {
			id[k*r.nx+i] = -1
			if z, ok := r.at(i, k); ok {
				id[k*r.nx+i] = int32(len(m.V))
				m.V = append(m.V, geom.Vec3{X: r.x0 + (float64(i)+0.5)*r.cell, Y: r.y0 + (float64(k)+0.5)*r.cell, Z: z})
			}
		}
	}
	for k := range r.ny - 1 {
		for i := range r.nx - 1 {
			sw, se, ne, nw := id[k*r.nx+i], id[k*r.nx+i+1], id[(k+1)*r.nx+i+1], id[(k+1)*r.nx+i]
			if sw < 0 || se < 0 || ne < 0 || nw < 0 {
				continue
			}
			m.T = append(m.T, sw, se, nw, se, ne, nw)
		}
	}
	return m
}

// gdalNoData is the no-data value written into the grids.
const gdalNoData = -9999

// writeASC writes r as an ESRI ASCII grid, a format GDAL reads (its AAIGrid
// driver), with full precision.
func (r raster) writeASC(path string) error {
	f, err := os.Create(path)
	if err != nil {
		return err
	}
	w := bufio.NewWriter(f)
	fmt.Fprintf(w, "ncols %d\nnrows %d\nxllcorner %.17g\nyllcorner %.17g\ncellsize %.17g\nNODATA_value %d\n",
		r.nx, r.ny, r.x0, r.y0, r.cell, gdalNoData)
	for j := range r.ny {
		for i := range r.nx {
			z := r.z[j*r.nx+i]
			if math.IsNaN(z) {
				z = gdalNoData
			}
			if i > 0 {
				w.WriteByte(' ')
			}
			w.WriteString(strconv.FormatFloat(z, 'g', 17, 64))
		}
		w.WriteByte('\n')
	}
	if err := w.Flush(); err != nil {
		f.Close()
		return err
	}
	return f.Close()
}

type refLine struct {
	level  float64
	pts    []geom.Vec2
	closed bool
}

// gdalContours writes r with elevations multiplied by zScale, runs
// gdal_contour -i interval -off base (in the scaled unit) on it, and
// returns its lines with levels back in metres.
//
// gdal_contour hands the interval and offset to GDAL's contour generator as
// text with six decimals (GDAL 3.6, "LEVEL_INTERVAL=%f"), so they must be
// exact at six decimals in the scaled unit: a 1 ft interval given in metres,
// 0.3048006096..., would become 0.304801 and shift level k by k·4e-7 m.
func gdalContours(t *testing.T, r raster, zScale, interval, base float64) []refLine {
	t.Helper()
	tool := reftest.Tool(t, "gdal_contour")
	dir := t.TempDir()
	asc := filepath.Join(dir, "surface.asc")
	scaled := r
	scaled.z = make([]float64, len(r.z))
	for i, z := range r.z {
		scaled.z[i] = z * zScale
	}
	if err := scaled.writeASC(asc); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(dir, "contours.geojson")
	// AAIGRID_DATATYPE=Float64: GDAL reads decimal ASCII grids as Float32
	// by default, which would round elevations of ~2000 m to 2e-4 m.
	cmd := exec.Command(tool, "--config", "AAIGRID_DATATYPE", "Float64", "-q", "-a", "elev", "-i", strconv.FormatFloat(interval, 'g', 17, 64),
		"-off", strconv.FormatFloat(base, 'g', 17, 64), "-snodata", strconv.Itoa(gdalNoData), "-f", "GeoJSON", asc, out)
	if b, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("gdal_contour: %v\n%s", err, b)
	}
	b, err := os.ReadFile(out)
	if err != nil {
		t.Fatal(err)
	}
	var fc struct {
		Features []struct {
			Geometry struct {
				Type        string
				Coordinates json.RawMessage
			}
			Properties struct{ Elev float64 }
		}
	}
	if err := json.Unmarshal(b, &fc); err != nil {
		t.Fatalf("gdal_contour output: %v", err)
	}
	var lines []refLine
	add := func(lv float64, c [][]float64) {
		l := refLine{level: lv}
		for _, p := range c {
			l.pts = append(l.pts, geom.Vec2{X: p[0], Y: p[1]})
		}
		l.closed = len(l.pts) > 2 && l.pts[0] == l.pts[len(l.pts)-1]
		lines = append(lines, l)
	}
	for _, f := range fc.Features {
		switch f.Geometry.Type {
		case "LineString":
			var c [][]float64
			if err := json.Unmarshal(f.Geometry.Coordinates, &c); err != nil {
				t.Fatal(err)
			}
			add(f.Properties.Elev/zScale, c)
		case "MultiLineString":
			var cs [][][]float64
			if err := json.Unmarshal(f.Geometry.Coordinates, &cs); err != nil {
				t.Fatal(err)
			}
			for _, c := range cs {
				add(f.Properties.Elev/zScale, c)
			}
		default:
			t.Fatalf("gdal_contour wrote a %s", f.Geometry.Type)
		}
	}
	return lines
}

// segIndex finds the distance from a point to the nearest of many
// segments, bucketing them on a square grid.
type segIndex struct {
	size    float64
	buckets map[[2]int][][2]geom.Vec2
	reach   float64
}

func newSegIndex(size, reach float64) *segIndex {
	return &segIndex{size: size, reach: reach, buckets: map[[2]int][][2]geom.Vec2{}}
}

func (s *segIndex) key(x, y float64) [2]int {
	return [2]int{int(math.Floor(x / s.size)), int(math.Floor(y / s.size))}
}

func (s *segIndex) add(a, b geom.Vec2) {
	bx := geom.BoxOf([]geom.Vec2{a, b}).Expand(s.reach)
	k0, k1 := s.key(bx.Min.X, bx.Min.Y), s.key(bx.Max.X, bx.Max.Y)
	for i := k0[0]; i <= k1[0]; i++ {
		for j := k0[1]; j <= k1[1]; j++ {
			s.buckets[[2]int{i, j}] = append(s.buckets[[2]int{i, j}], [2]geom.Vec2{a, b})
		}
	}
}

// dist returns the distance from p to the nearest segment, or +Inf when
// none is within reach.
func (s *segIndex) dist(p geom.Vec2) float64 {
	best := math.Inf(1)
	for _, e := range s.buckets[s.key(p.X, p.Y)] {
		best = math.Min(best, geom.SegmentDistanceSquared(p, e[0], e[1]))
	}
	return math.Sqrt(best)
}

// samples returns the points of pts and points every step along its
// segments.
func samples(pts []geom.Vec2, step float64) []geom.Vec2 {
	out := []geom.Vec2{pts[0]}
	for i := 1; i < len(pts); i++ {
		a, b := pts[i-1], pts[i]
		n := int(math.Ceil(a.Distance(b) / step))
		for k := 1; k <= n; k++ {
			out = append(out, a.Lerp(b, float64(k)/float64(n)))
		}
	}
	return out
}

// compareWithGDAL checks that, level by level, the tool's lines and
// GDAL's have the same number of lines and of closed rings, and that every
// point of either lies within tol of the other's lines (a Hausdorff
// distance both ways), except tool points within edge of the raster's
// data boundary, where GDAL's lines stop at the last pixel centres.
//
// Tool points in raster squares that do not straddle the level (resolved
// false) are skipped and counted. With counts false the line counts are
// only logged.
func compareWithGDAL(t *testing.T, ours []contours.Line, theirs []refLine, interval, base, tol float64,
	nearEdge func(geom.Vec2) bool, resolved func(geom.Vec2, float64) bool, counts bool) (st compareStats) {
	t.Helper()
	step := func(lv float64) int64 { return int64(math.Round((lv - base) / interval)) }
	type tally struct{ lines, rings int }
	oursBy, theirsBy := map[int64][]refLine{}, map[int64][]refLine{}
	for _, l := range ours {
		oursBy[step(l.Level)] = append(oursBy[step(l.Level)], refLine{l.Level, l.Pts, l.Closed})
	}
	for _, l := range theirs {
		theirsBy[step(l.level)] = append(theirsBy[step(l.level)], l)
	}
	keys := map[int64]bool{}
	for k := range oursBy {
		keys[k] = true
	}
	for k := range theirsBy {
		keys[k] = true
	}
	count := func(ls []refLine) tally {
		var c tally
		for _, l := range ls {
			c.lines++
			if l.closed {
				c.rings++
			}
		}
		return c
	}
	worst := [2]float64{}
	var nOurs, nTheirs tally
	failed := false
	for k := range keys {
		a, b := oursBy[k], theirsBy[k]
		lv := base + float64(k)*interval
		ca, cb := count(a), count(b)
		nOurs.lines, nOurs.rings = nOurs.lines+ca.lines, nOurs.rings+ca.rings
		nTheirs.lines, nTheirs.rings = nTheirs.lines+cb.lines, nTheirs.rings+cb.rings
		if counts && ca != cb {
			failed = true
			t.Errorf("level %.6g: %d lines (%d closed), gdal_contour %d (%d closed)", lv, ca.lines, ca.rings, cb.lines, cb.rings)
			for who, ls := range [2][]refLine{a, b} {
				for _, l := range ls {
					edge := 0
					for _, p := range l.pts {
						if nearEdge(p) {
							edge++
						}
					}
					bx := geom.BoxOf(l.pts)
					t.Logf("  %d closed %v n %d nearEdge %d box %v", who, l.closed, len(l.pts), edge, bx)
				}
			}
		}
		for dir, pair := range [2][2][]refLine{{a, b}, {b, a}} {
			idx := newSegIndex(4*tol, tol)
			for _, l := range pair[1] {
				for i := 1; i < len(l.pts); i++ {
					idx.add(l.pts[i-1], l.pts[i])
				}
			}
			for _, l := range pair[0] {
				for _, p := range samples(l.pts, tol/4) {
					if dir == 0 && nearEdge(p) {
						continue
					}
					if dir == 0 {
						st.samples++
						if !resolved(p, lv) {
							st.unresolved++
							continue
						}
					}
					d := idx.dist(p)
					worst[dir] = math.Max(worst[dir], math.Min(d, 10*tol))
					if d > tol {
						failed = true
						who := [2]string{"tool point", "gdal_contour point"}[dir]
						t.Errorf("level %.6g: %s %v is %.4g from the other's lines, more than %.4g", lv, who, p, d, tol)
						break
					}
				}
			}
		}
	}
	t.Logf("%d levels; tool %d lines (%d closed), gdal_contour %d (%d closed); largest distance tool→gdal %.4g, gdal→tool %.4g (tolerance %.4g); %d of %d tool samples in squares the raster cannot resolve",
		len(keys), nOurs.lines, nOurs.rings, nTheirs.lines, nTheirs.rings, worst[0], worst[1], tol, st.unresolved, st.samples)
	if failed {
		writeFailure(t, ours, theirs)
	}
	return st
}

type compareStats struct{ samples, unresolved int }

// writeFailure writes both sets of lines to testdata/failure_<test>.geojson
// (local metres), to open beside each other.
func writeFailure(t *testing.T, ours []contours.Line, theirs []refLine) {
	t.Helper()
	var b strings.Builder
	b.WriteString(`{"type":"FeatureCollection","features":[`)
	n := 0
	add := func(src string, lv float64, pts []geom.Vec2) {
		if n > 0 {
			b.WriteString(",")
		}
		n++
		fmt.Fprintf(&b, "\n{\"type\":\"Feature\",\"properties\":{\"source\":%q,\"level\":%.6f},\"geometry\":{\"type\":\"LineString\",\"coordinates\":[", src, lv)
		for i, p := range pts {
			if i > 0 {
				b.WriteString(",")
			}
			fmt.Fprintf(&b, "[%.4f,%.4f]", p.X, p.Y)
		}
		b.WriteString("]}}")
	}
	for _, l := range ours {
		add("tool", l.Level, l.Pts)
	}
	for _, l := range theirs {
		add("gdal_contour", l.level, l.pts)
	}
	b.WriteString("\n]}\n")
	path := filepath.Join("testdata", "failure_"+strings.ReplaceAll(t.Name(), "/", "_")+".geojson")
	if err := os.MkdirAll("testdata", 0o755); err == nil && os.WriteFile(path, []byte(b.String()), 0o644) == nil {
		t.Logf("both sets of lines are in %s", path)
	}
}

// TestTrace_GDALAnalytic compares the contours of a TIN of the reference
// bench's synthetic terrain (../shared/refbench/README.md) with those GDAL's
// gdal_contour traces on the same TIN rasterised at a 0.25 m cell: at every
// level the numbers of lines and of closed rings agree, and every point of
// either lies within a cell diagonal of the other's lines (the error of
// marching squares between pixel centres, on which the TIN is sampled
// exactly), except tool points within two cells of the mesh edge, where
// gdal_contour's lines stop at the last pixel centres.
func TestTrace_GDALAnalytic(t *testing.T) {
	const w, h, d = 100.0, 80.0, 2.0 // domain and vertex spacing, m
	const cell = 0.25
	m := gridMesh(int(w/d)+1, int(h/d)+1, 0, 0, d, terrain)
	const interval, base = 0.2, 0.0
	ours, err := contours.Trace(m, opts(interval, base))
	if err != nil {
		t.Fatal(err)
	}
	r := rasterize(m, 0, 0, cell, int(w/cell), int(h/cell))
	theirs := gdalContours(t, r, 1, interval, base)
	nearEdge := func(p geom.Vec2) bool {
		return math.Min(math.Min(p.X, w-p.X), math.Min(p.Y, h-p.Y)) < 2*cell
	}
	compareWithGDAL(t, ours, theirs, interval, base, math.Sqrt2*cell, nearEdge, r.resolves, true)
}

// readXYZ reads an x,y,z CSV with a header line.
func readXYZ(tb testing.TB, path string) [][3]float64 {
	tb.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		tb.Fatal(err)
	}
	var out [][3]float64
	for i, line := range strings.Split(strings.TrimSpace(string(b)), "\n")[1:] {
		f := strings.Split(strings.TrimSpace(line), ",")
		var p [3]float64
		for k := range 3 {
			if p[k], err = strconv.ParseFloat(f[k], 64); err != nil {
				tb.Fatalf("%s line %d: %v", path, i+2, err)
			}
		}
		out = append(out, p)
	}
	return out
}

// scipyTIN triangulates the x, y columns of a CSV with scipy's Delaunay
// (Qhull), centring them first as ../shared/refbench does for Qhull's
// precision, and returns the triangles as vertex indices.
func scipyTIN(t *testing.T, csv string) [][3]int32 {
	t.Helper()
	py := reftest.Python(t, "numpy", "scipy.spatial")
	const script = `
import sys
import numpy as np
from scipy.spatial import Delaunay
a = np.loadtxt(sys.argv[1], delimiter=",", skiprows=1, usecols=(0, 1), ndmin=2)
shift = np.round(0.5 * (a.min(axis=0) + a.max(axis=0)))
for s in Delaunay(a - shift).simplices:
    print(s[0], s[1], s[2])
`
	out, err := exec.Command(py, "-c", script, csv).Output()
	if err != nil {
		t.Fatalf("scipy Delaunay: %v", err)
	}
	var tris [][3]int32
	for _, line := range strings.Split(strings.TrimSpace(string(out)), "\n") {
		var a, b, c int32
		if _, err := fmt.Sscan(line, &a, &b, &c); err != nil {
			t.Fatalf("scipy output %q: %v", line, err)
		}
		tris = append(tris, [3]int32{a, b, c})
	}
	return tris
}

// realTIN is the 4_6_crop LiDAR ground TIN (../shared/data/SOURCES.md, US
// survey feet, triangulated by scipy) in local metres, with the 1 ft contour
// options used against GDAL: levels at whole feet plus 0.005 ft, because the
// elevations are given to 0.01 ft and no vertex should lie exactly on a
// level, where a raster and a TIN settle the tie differently.
func realTIN(t *testing.T) (m geom.TriMesh, o contours.Options, intervalFt, baseFt float64) {
	t.Helper()
	csv := filepath.Join(reftest.SharedDir(t), "data", "csv", "4_6_crop_ground_ftUS.csv")
	pts := readXYZ(t, csv)
	tris := scipyTIN(t, csv)
	ft := units.USSurveyFoot // 1200/3937 m (85 FR 62698)
	world := make([]geom.Vec2, len(pts))
	for i, p := range pts {
		world[i] = geom.Vec2{X: p[0] * ft, Y: p[1] * ft}
	}
	frame := geom.FrameAt(geom.BoxOf(world).Center())
	for i, p := range pts {
		l := frame.ToLocal(world[i])
		m.V = append(m.V, geom.Vec3{X: l.X, Y: l.Y, Z: p[2] * ft})
	}
	for _, c := range tris {
		if geom.PlanArea(m.V[c[0]], m.V[c[1]], m.V[c[2]]) < 0 {
			c[1], c[2] = c[2], c[1]
		}
		m.T = append(m.T, c[0], c[1], c[2])
	}
	intervalFt, baseFt = 1, 0.005
	return m, opts(intervalFt*ft, baseFt*ft), intervalFt, baseFt
}

// rasterFor returns the raster of cell size cell over the bounding box of m,
// snapped outward to the cell as ../shared/refbench/ref_contour.sh snaps it.
func rasterFor(m geom.TriMesh, cell float64) raster {
	bx := geom.BoxOf(nil)
	for _, v := range m.V {
		bx = bx.Extend(v.XY())
	}
	x0, y0 := math.Floor(bx.Min.X/cell)*cell, math.Floor(bx.Min.Y/cell)*cell
	nx, ny := int(math.Ceil((bx.Max.X-x0)/cell)), int(math.Ceil((bx.Max.Y-y0)/cell))
	return rasterize(m, x0, y0, cell, nx, ny)
}

// nearBoundary returns a test for "within d of the boundary of m".
func nearBoundary(m geom.TriMesh, d float64) func(geom.Vec2) bool {
	idx := newSegIndex(1, d)
	for _, e := range boundaryEdges(m) {
		idx.add(e[0], e[1])
	}
	return func(p geom.Vec2) bool { return idx.dist(p) < d }
}

// TestTrace_GDALRealTIN compares the 1 ft contours of the real ground TIN
// with gdal_contour's on the same TIN rasterised at 0.1 m. The raster
// cannot show features of the TIN that fit between its pixel centres (rings
// around a single bump, necks thinner than a cell, the tips of sharp bends),
// and this LiDAR surface has many, so line counts are not compared here
// (TestTrace_GDALLattice does that on a surface the raster resolves
// exactly). Every gdal_contour point must lie within a cell diagonal of the
// tool's lines (no tool line is missing), and so must every tool point in a
// raster square whose corners straddle the level (no tool line is
// misplaced); the remaining tool points, in squares the raster sees wholly on
// one side, must be few.
func TestTrace_GDALRealTIN(t *testing.T) {
	m, o, ift, bft := realTIN(t)
	ours, err := contours.Trace(m, o)
	if err != nil {
		t.Fatal(err)
	}
	const cell = 0.1
	r := rasterFor(m, cell)
	theirs := gdalContours(t, r, 1/units.USSurveyFoot, ift, bft)
	st := compareWithGDAL(t, ours, theirs, o.IntervalM, o.BaseM, math.Sqrt2*cell, nearBoundary(m, 3*cell), r.resolves, false)
	// Measured: 583 of 42955 samples (1.4%) fall in unresolved squares.
	if st.unresolved > st.samples/50 {
		t.Errorf("%d of %d tool samples lie where the raster sees no contour, more than 2%%", st.unresolved, st.samples)
	}
}

// TestTrace_GDALLattice compares, on the real ground surface sampled at
// 0.2 m, the tool's contours of the raster's own lattice TIN (see
// latticeMesh) with gdal_contour's contours of that raster: the two describe
// the same surface with the same topology, so at every level the numbers of
// lines and of closed rings agree and every point of either lies within a
// cell diagonal of the other's lines (ends at the data boundary excepted).
func TestTrace_GDALLattice(t *testing.T) {
	m, o, ift, bft := realTIN(t)
	const cell = 0.2
	r := rasterFor(m, cell)
	lattice := latticeMesh(r)
	ours, err := contours.Trace(lattice, o)
	if err != nil {
		t.Fatal(err)
	}
	theirs := gdalContours(t, r, 1/units.USSurveyFoot, ift, bft)
	compareWithGDAL(t, ours, theirs, o.IntervalM, o.BaseM, math.Sqrt2*cell, nearBoundary(lattice, 3*cell), r.resolves, true)
}
