package cutfill

import (
	"bufio"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/reftest"
)

// The refbench kit (../shared/refbench, NumPy/SciPy/Shapely) defines a
// synthetic site (site.json), pond and pad designs with mitred side slopes,
// and reference volumes (reference_volumes.json): exact piecewise-linear
// values for a planar terrain, and exact TIN-vs-design values for its
// generated point sets triangulated by scipy.spatial.Delaunay (Qhull). The
// tests below rebuild the designs as meshes and check that Compare
// reproduces those volumes. The kit's own exact methods agree with each
// other to 1e-9 or better (README "Reference methods"); both sides here are
// exact up to round-off and agree to about 1e-14, so 1e-11 leaves room for
// summation order and still catches any real difference.
const refbenchRel = 1e-11

type refSite struct {
	OriginX float64 `json:"origin_x"`
	OriginY float64 `json:"origin_y"`
	Terrain struct {
		Z0 float64 `json:"z0"`
		Gx float64 `json:"gx"`
		Gy float64 `json:"gy"`
	} `json:"terrain"`
	Variants struct {
		FlatZ float64 `json:"flat_z"`
	} `json:"terrain_variants"`
	Designs map[string]json.RawMessage `json:"designs"`
}

type refDesign struct {
	Kind    string       `json:"kind"`
	Polygon [][2]float64 `json:"polygon"`
	Zb      float64      `json:"zb"`
	M       float64      `json:"m"`
}

type refVolumes struct {
	Analytic []struct {
		Design     string   `json:"design"`
		Terrain    string   `json:"terrain"`
		Cut        float64  `json:"cut"`
		Fill       *float64 `json:"fill"`
		FillBottom *float64 `json:"fill_bottom"`
	} `json:"analytic"`
	TinExact []struct {
		Points  string `json:"points"`
		Sha256  string `json:"sha256"`
		Units   string `json:"units"`
		Volumes map[string]struct {
			Cut        float64 `json:"cut"`
			Fill       float64 `json:"fill"`
			FillBottom float64 `json:"fill_bottom"`
		} `json:"volumes"`
	} `json:"tin_exact"`
}

// refFrame is the local frame of the tests: the middle of the site.
var refFrame = geom.Frame{Origin: geom.Vec2{X: 1100, Y: 2075}}

func loadRefbench(tb testing.TB) (dir string, site refSite, designs map[string]refDesign, vols refVolumes) {
	tb.Helper()
	dir = filepath.Join(reftest.SharedDir(tb), "refbench")
	readJSON := func(name string, v any) {
		data, err := os.ReadFile(filepath.Join(dir, name))
		if err != nil {
			tb.Fatal(err)
		}
		if err := json.Unmarshal(data, v); err != nil {
			tb.Fatalf("%s: %v", name, err)
		}
	}
	readJSON("site.json", &site)
	readJSON("reference_volumes.json", &vols)
	designs = map[string]refDesign{}
	for name, raw := range site.Designs {
		if strings.HasPrefix(name, "_") {
			continue
		}
		var d refDesign
		if err := json.Unmarshal(raw, &d); err != nil {
			tb.Fatalf("design %s: %v", name, err)
		}
		designs[name] = d
	}
	return dir, site, designs, vols
}

// localPolygon returns the design polygon in the local frame, counter-
// clockwise.
func (d refDesign) localPolygon() geom.Ring {
	r := make(geom.Ring, len(d.Polygon))
	for i, p := range d.Polygon {
		r[i] = refFrame.ToLocal(geom.Vec2{X: p[0], Y: p[1]})
	}
	return r.CCW()
}

// designReach is how far above and below zb the design meshes reach: beyond
// every ground height of the site (100 ± 6 m), so that they cover all the
// cut and fill.
const designReach = 15.0

// volumes computes a design's cut, fill (pads) and fill below the bottom
// (pits) against the ground mesh g, the way site.json defines them: a pit
// cuts ∫(T − D)⁺ with D = zb + d/m; a pad also fills ∫((zb − d/m) − T)⁺;
// vertical walls (m = 0) cut ∫_P (T − zb)⁺. The fill below a pit's bottom is
// ∫_P (zb − T)⁺.
func (d refDesign) volumes(tb testing.TB, g geom.TriMesh) (cut, fill, fillBottom float64) {
	tb.Helper()
	p := d.localPolygon()
	box := p.Bounds().Expand(200)
	flat := flatMesh(box.Min.X, box.Min.Y, box.Max.X, box.Max.Y, d.Zb)
	if d.M == 0 {
		r := mustCompare(tb, g, flat, []geom.Ring{p})
		return r.CutM3, 0, r.FillM3
	}
	up := mitredPit(p, d.Zb, d.M, d.M*designReach)
	cut = mustCompare(tb, g, up, nil).CutM3
	if d.Kind == "pad" {
		down := mitredPit(p, d.Zb, -d.M, d.M*designReach)
		fill = mustCompare(tb, g, down, nil).FillM3
	} else {
		fillBottom = mustCompare(tb, g, flat, []geom.Ring{p}).FillM3
	}
	return cut, fill, fillBottom
}

// TestCompare_RefbenchPlaneTerrain checks the flat and planar terrain rows
// of reference_volumes.json (closed form and exact piecewise-linear
// integration by the refbench kit, cross-checked there with Qhull's
// halfspace-intersection volume).
func TestCompare_RefbenchPlaneTerrain(t *testing.T) {
	_, site, designs, vols := loadRefbench(t)
	n := 0
	for _, row := range vols.Analytic {
		if row.Terrain != "flat" && row.Terrain != "plane" {
			continue
		}
		d, ok := designs[row.Design]
		if !ok {
			t.Fatalf("reference row for unknown design %q", row.Design)
		}
		t.Run(row.Design+"/"+row.Terrain, func(t *testing.T) {
			tz := func(x, y float64) float64 {
				if row.Terrain == "flat" {
					return site.Variants.FlatZ
				}
				w := refFrame.ToWorld(geom.Vec2{X: x, Y: y})
				return site.Terrain.Z0 + site.Terrain.Gx*(w.X-site.OriginX) + site.Terrain.Gy*(w.Y-site.OriginY)
			}
			box := d.localPolygon().Bounds().Expand(100)
			g := planeMesh(box.Min.X, box.Min.Y, box.Max.X, box.Max.Y, tz)
			cut, fill, fillBottom := d.volumes(t, g)
			check := func(name string, got float64, want *float64) {
				w := 0.0
				if want != nil {
					w = *want
				}
				if !closeRel(got, w, refbenchRel, 1) {
					t.Errorf("%s %s on %s terrain = %.12g m³, refbench %.12g", row.Design, name, row.Terrain, got, w)
				}
			}
			check("cut", cut, &row.Cut)
			check("fill", fill, row.Fill)
			if d.Kind == "pit" {
				check("fill below bottom", fillBottom, row.FillBottom)
			}
		})
		n++
	}
	if n < 10 {
		t.Errorf("only %d flat/plane reference rows found", n)
	}
}

// TestCompare_RefbenchTIN regenerates the kit's random point sets
// (gen_terrain.py, seed 20240601; the sha256 must match the reference),
// triangulates them with scipy.spatial.Delaunay (ref_delaunay.py), and
// checks Compare against the kit's exact TIN-vs-design volumes for every
// design, pads and the concave vertical-wall pond included.
func TestCompare_RefbenchTIN(t *testing.T) {
	dir, _, designs, vols := loadRefbench(t)
	py := reftest.Python(t, "numpy", "scipy.spatial")
	sizes := []string{"1e3"}
	if !testing.Short() {
		sizes = append(sizes, "1e4")
	}
	out := t.TempDir()
	gen := exec.Command(py, filepath.Join(dir, "gen_terrain.py"), "--sizes", strings.Join(sizes, ","), "--out", out)
	if b, err := gen.CombinedOutput(); err != nil {
		t.Fatalf("gen_terrain.py: %v\n%s", err, b)
	}
	for _, size := range sizes {
		name := "terrain_" + size + "_m.csv"
		t.Run(name, func(t *testing.T) {
			idx := -1
			for i, r := range vols.TinExact {
				if r.Points == name && r.Units == "m" {
					idx = i
				}
			}
			if idx < 0 {
				t.Fatalf("no tin_exact reference for %s", name)
			}
			want := vols.TinExact[idx]
			pts := filepath.Join(out, name)
			if got := fileSHA256(t, pts); got != want.Sha256 {
				t.Fatalf("%s: sha256 %s, reference was made from %s: the generator's output changed", name, got, want.Sha256)
			}
			tris := filepath.Join(out, "tris_"+size+".csv")
			del := exec.Command(py, filepath.Join(dir, "ref_delaunay.py"), pts, "--repeat", "1", "--out-tris", tris)
			if b, err := del.CombinedOutput(); err != nil {
				t.Fatalf("ref_delaunay.py: %v\n%s", err, b)
			}
			g := readRefTIN(t, pts, tris)
			for dn, wv := range want.Volumes {
				d, ok := designs[dn]
				if !ok {
					t.Fatalf("reference for unknown design %q", dn)
				}
				cut, fill, fillBottom := d.volumes(t, g)
				for _, c := range []struct {
					q         string
					got, want float64
				}{{"cut", cut, wv.Cut}, {"fill", fill, wv.Fill}, {"fill below bottom", fillBottom, wv.FillBottom}} {
					if !closeRel(c.got, c.want, refbenchRel, 1) {
						t.Errorf("%s %s %s = %.12g m³, refbench exact TIN %.12g", name, dn, c.q, c.got, c.want)
					}
				}
			}
		})
	}
}

func fileSHA256(tb testing.TB, path string) string {
	tb.Helper()
	data, err := os.ReadFile(path)
	if err != nil {
		tb.Fatal(err)
	}
	h := sha256.Sum256(data)
	return hex.EncodeToString(h[:])
}

// readRefTIN reads an x,y,z points CSV (metres) and a triangles CSV (a,b,c:
// 0-based row indices) into a mesh in [refFrame].
func readRefTIN(tb testing.TB, pointsPath, trisPath string) geom.TriMesh {
	tb.Helper()
	var m geom.TriMesh
	readCSV(tb, pointsPath, 3, func(f []float64) {
		p := refFrame.ToLocal(geom.Vec2{X: f[0], Y: f[1]})
		m.V = append(m.V, geom.Vec3{X: p.X, Y: p.Y, Z: f[2]})
	})
	readCSV(tb, trisPath, 3, func(f []float64) {
		for _, v := range f {
			m.T = append(m.T, int32(v))
		}
	})
	return m
}

func readCSV(tb testing.TB, path string, cols int, row func([]float64)) {
	tb.Helper()
	fh, err := os.Open(path)
	if err != nil {
		tb.Fatal(err)
	}
	defer fh.Close()
	sc := bufio.NewScanner(fh)
	sc.Scan() // header
	line := 1
	vals := make([]float64, cols)
	for sc.Scan() {
		line++
		parts := strings.Split(strings.TrimSpace(sc.Text()), ",")
		if len(parts) != cols {
			tb.Fatalf("%s:%d: %d fields, want %d", path, line, len(parts), cols)
		}
		for i, s := range parts {
			v, err := strconv.ParseFloat(s, 64)
			if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
				tb.Fatalf("%s:%d: field %d %q: %v", path, line, i+1, s, err)
			}
			vals[i] = v
		}
		row(vals)
	}
	if err := sc.Err(); err != nil {
		tb.Fatal(fmt.Errorf("read %s: %w", path, err))
	}
}
