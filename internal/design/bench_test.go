package design

import (
	"encoding/json"
	"flag"
	"math"
	"os"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/units"
)

var update = flag.Bool("update", false, "rewrite testdata/bench_*.json")

// gridTIN is a stand-in for the TIN package's surface: a TIN on a regular
// grid of nodes (x0 + i·hg, y0 + j·hg), each cell split along its
// (i, j)–(i+1, j+1) diagonal. With 2 × 2 nodes it is a plane as a
// two-triangle mesh. SampleLattice evaluates node by node (what a
// rasteriser does per covered node).
type gridTIN struct {
	x0, y0, hg float64
	nx, ny     int
	z          []float64
}

func newGridTIN(x0, y0, hg float64, nx, ny int, f func(x, y float64) float64) *gridTIN {
	g := &gridTIN{x0: x0, y0: y0, hg: hg, nx: nx, ny: ny, z: make([]float64, nx*ny)}
	for j := 0; j < ny; j++ {
		for i := 0; i < nx; i++ {
			g.z[j*nx+i] = f(x0+float64(i)*hg, y0+float64(j)*hg)
		}
	}
	return g
}

func (g *gridTIN) Elevation(x, y float64) (float64, bool) {
	fx, fy := (x-g.x0)/g.hg, (y-g.y0)/g.hg
	if !(fx >= 0 && fy >= 0 && fx <= float64(g.nx-1) && fy <= float64(g.ny-1)) {
		return math.NaN(), false
	}
	i, j := min(int(fx), g.nx-2), min(int(fy), g.ny-2)
	u, v := fx-float64(i), fy-float64(j)
	k := j*g.nx + i
	z00, z11 := g.z[k], g.z[k+g.nx+1]
	if u >= v {
		return z00 + u*(g.z[k+1]-z00) + v*(z11-g.z[k+1]), true
	}
	return z00 + v*(g.z[k+g.nx]-z00) + u*(z11-g.z[k+g.nx]), true
}

func (g *gridTIN) SampleLattice(x0, y0, h float64, nx, ny int, out []float64) {
	for j := 0; j < ny; j++ {
		y := y0 + float64(j)*h
		for i := 0; i < nx; i++ {
			out[j*nx+i], _ = g.Elevation(x0+float64(i)*h, y)
		}
	}
}

func (g *gridTIN) Bounds() geom.Box {
	return geom.Box{Min: geom.Vec2{X: g.x0, Y: g.y0}, Max: geom.Vec2{X: g.x0 + float64(g.nx-1)*g.hg, Y: g.y0 + float64(g.ny-1)*g.hg}}
}

// benchCase is a design and its ground, shared with scripts/ref_design.py
// (the same JSON is its input) so both time the same work.
type benchCase struct {
	Terrain    benchTerrain `json:"terrain"`
	Zones      []refZone    `json:"zones"`
	WaterLevel float64      `json:"water_level"`
	Freeboard  float64      `json:"freeboard"`
	BermCrest  float64      `json:"berm_crest"`
	BermSlope  float64      `json:"berm_slope"`
	Cell       float64      `json:"cell"`
	Box        [4]float64   `json:"box"` // the work area Build chose
}

type benchTerrain struct {
	Kind    string         `json:"kind"` // "gridtin"
	X0      float64        `json:"x0"`
	Y0      float64        `json:"y0"`
	Hg      float64        `json:"hg"`
	NX      int            `json:"nx"`
	NY      int            `json:"ny"`
	Surface map[string]any `json:"surface"` // "refbench" with u0, v0
}

// refbenchSurface is the refbench site's terrain formula (site.json), in
// local coordinates shifted by (u0, v0).
func refbenchSurface(u0, v0 float64) (func(x, y float64) float64, map[string]any) {
	spec := map[string]any{"kind": "refbench", "z0": 100.0, "gx": 0.02, "gy": 0.01, "a1": 0.5, "l1x": 80.0, "l1y": 60.0,
		"a2": 0.3, "l2x": 45.0, "l2y": 110.0, "u0": u0, "v0": v0}
	k1, l1 := 2*math.Pi/80, 2*math.Pi/60
	k2, l2 := 2*math.Pi/45, 2*math.Pi/110
	return func(x, y float64) float64 {
		u, v := x-u0, y-v0
		return 100 + 0.02*u + 0.01*v + 0.5*math.Sin(k1*u)*math.Cos(l1*v) + 0.3*math.Cos(k2*u+l2*v)
	}, spec
}

func (c *benchCase) terrain() *gridTIN {
	f, _ := refbenchSurface(c.Terrain.Surface["u0"].(float64), c.Terrain.Surface["v0"].(float64))
	t := c.Terrain
	return newGridTIN(t.X0, t.Y0, t.Hg, t.NX, t.NY, f)
}

func (c *benchCase) params() Params {
	p := Params{WaterLevelM: c.WaterLevel, FreeboardM: c.Freeboard, BermCrestM: c.BermCrest, BermSlope: c.BermSlope, CellM: c.Cell}
	for _, z := range c.Zones {
		r := make(geom.Ring, len(z.Ring))
		for i, q := range z.Ring {
			r[i] = geom.Vec2{X: q[0], Y: q[1]}
		}
		corners := Round
		if z.Corners == "sharp" {
			corners = Sharp
		}
		p.Zones = append(p.Zones, Zone{Name: z.Name, Ring: r, DepthM: z.Depth, WallSlope: z.WallSlope, Corners: corners})
	}
	return p
}

// bigCase builds the large benchmark: a 30 × 20 m pond (an outline with
// two shelves and a deep zone) at a 2 cm lattice on a grid TIN of about a
// million nodes carrying the refbench terrain.
func bigCase(t testing.TB) *benchCase {
	outline := make(geom.Ring, 48)
	for k := range outline {
		a := 2 * math.Pi * float64(k) / 48
		// A rounded rectangle 30 × 20 m (superellipse, exponent 4).
		c, s := math.Cos(a), math.Sin(a)
		outline[k] = geom.Vec2{X: 15 * math.Copysign(math.Pow(math.Abs(c), 0.5), c), Y: 10 * math.Copysign(math.Pow(math.Abs(s), 0.5), s)}
	}
	o := Outline{Ring: outline, Shelves: []Shelf{{WidthM: 0.6, DepthM: 0.3}, {WidthM: 1.0, DepthM: 0.8}}, DeepDepthM: 1.8, WallSlope: 1.5}
	zones, err := o.Zones()
	if err != nil {
		t.Fatal(err)
	}
	f, spec := refbenchSurface(-100, -75)
	c := &benchCase{
		Terrain:    benchTerrain{Kind: "gridtin", X0: -35, Y0: -28, Hg: 0.064, NX: 1094, NY: 876, Surface: spec},
		WaterLevel: math.Round(f(0, 0)*100)/100 - 0.1, Freeboard: 0.15, BermCrest: 0.5, BermSlope: 3, Cell: 0.02,
	}
	for _, z := range zones {
		rz := refZone{Name: z.Name, Depth: z.DepthM, WallSlope: z.WallSlope, Corners: z.Corners.String()}
		for _, p := range z.Ring {
			rz.Ring = append(rz.Ring, [2]float64{p.X, p.Y})
		}
		c.Zones = append(c.Zones, rz)
	}
	return c
}

// demoCase is the small benchmark: the kidney pond of
// testdata/kidney_zones.geojson (about 6 × 4 m) on a 25 × 18 m sloped
// yard given as a TIN of 336 points, auto water level.
func demoCase(t testing.TB) (*gridTIN, Params) {
	f, err := os.Open("testdata/kidney_zones.geojson")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	zones, err := ReadZonesGeoJSON(f, "kidney_zones.geojson", identity, units.Metres)
	if err != nil {
		t.Fatal(err)
	}
	yard := newGridTIN(-12.5, -9, 1.25, 21, 16, func(x, y float64) float64 {
		return 50 + 0.05*x + 0.02*y + 0.1*math.Sin(x/3)*math.Cos(y/4)
	})
	return yard, Params{Zones: zones, Level: LevelAuto, FreeboardM: 0.076, BermCrestM: 0.3, BermSlope: 3}
}

func loadCase(t testing.TB, name string) *benchCase {
	b, err := os.ReadFile(name)
	if err != nil {
		t.Fatal(err)
	}
	var c benchCase
	if err := json.Unmarshal(b, &c); err != nil {
		t.Fatal(err)
	}
	return &c
}

// TestBenchCase pins the big benchmark's inputs (testdata/bench_big.json,
// which scripts/bench_design.sh also hands to the NumPy reference) and
// its work area; -update rewrites the file.
func TestBenchCase(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the 2 cm benchmark surface")
	}
	const name = "testdata/bench_big.json"
	if *update {
		c := bigCase(t)
		s, err := Build(c.terrain(), c.params())
		if err != nil {
			t.Fatal(err)
		}
		b := s.Lattice.Bounds()
		c.Box = [4]float64{b.Min.X, b.Min.Y, b.Max.X, b.Max.Y}
		data, _ := json.MarshalIndent(c, "", " ")
		if err := os.WriteFile(name, append(data, '\n'), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	c := loadCase(t, name)
	s, err := Build(c.terrain(), c.params())
	if err != nil {
		t.Fatal(err)
	}
	b := s.Lattice.Bounds()
	if got := [4]float64{b.Min.X, b.Min.Y, b.Max.X, b.Max.Y}; got != c.Box {
		t.Errorf("work area %v, the case file says %v: rerun with -update", got, c.Box)
	}
	if s.CutM3 <= 0 || s.FillM3 <= 0 || len(s.Warnings) != 0 {
		t.Errorf("cut %g, fill %g, warnings %q", s.CutM3, s.FillM3, s.Warnings)
	}
	t.Logf("cut %.3f fill %.3f water %.3f nodes %d change %.2g", s.CutM3, s.FillM3, s.WaterVolumeM3, s.Lattice.Len(), s.RefineChange)
}

// TestDemoCase pins the demo benchmark's result.
func TestDemoCase(t *testing.T) {
	g, p := demoCase(t)
	s, err := Build(g, p)
	if err != nil {
		t.Fatal(err)
	}
	if s.CutM3 < 5 || s.RefineChange > refineTarget || len(s.Warnings) != 0 {
		t.Errorf("demo: cut %g, change %g, warnings %q", s.CutM3, s.RefineChange, s.Warnings)
	}
	t.Logf("W %.4f cut %.4f fill %.4f water %.4f cell %g change %.2g nodes %d", s.WaterLevelM, s.CutM3, s.FillM3, s.WaterVolumeM3, s.CellM, s.RefineChange, s.Lattice.Len())
}

func BenchmarkBuildDemo(b *testing.B) {
	g, p := demoCase(b)
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Build(g, p); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkBuildDemoFixed(b *testing.B) {
	g, p := demoCase(b)
	p.Level, p.WaterLevelM = LevelFixed, 49.95
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Build(g, p); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkBuildBig2cm(b *testing.B) {
	c := loadCase(b, "testdata/bench_big.json")
	g, p := c.terrain(), c.params()
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Build(g, p); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkBowlNaive is the baseline for the tile pruning: the relative
// bowl at every node of the demo lattice by brute force over all edges.
func BenchmarkBowlNaive(b *testing.B) {
	g, p := demoCase(b)
	s, err := Build(g, p)
	if err != nil {
		b.Fatal(err)
	}
	l := s.Lattice
	b.ReportAllocs()
	for b.Loop() {
		for k := 0; k < l.Len(); k++ {
			s.zs.rel(l.Node(k%l.NX, k/l.NX), -1)
		}
	}
}

// BenchmarkBowlField is the same work with the tile quadtree.
func BenchmarkBowlField(b *testing.B) {
	g, p := demoCase(b)
	s, err := Build(g, p)
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for b.Loop() {
		newField(s.zs, s.Lattice)
	}
}

// TestField_MatchesBruteForce checks the pruned tile evaluation against
// the definition evaluated by brute force at every node: pruning must not
// change a single value.
func TestField_MatchesBruteForce(t *testing.T) {
	_, _, zones := slopedYard()
	zones = append(zones,
		Zone{Name: "vertical L", Ring: ring(4, -3, 7, -3, 7, -1, 5, -1, 5, 1, 4, 1), DepthM: 0.5},
		Zone{Name: "sharp", Ring: ring(-6, 2, -4, 2.5, -4.5, 4), DepthM: 0.4, WallSlope: 0.7, Corners: Sharp})
	zs, err := newZoneSet(zones, 0.12)
	if err != nil {
		t.Fatal(err)
	}
	for _, h := range []float64{0.5, 0.0625, 0.0371} {
		l, err := gridLattice(zs.rimBox().Expand(3), h)
		if err != nil {
			t.Fatal(err)
		}
		fd := newField(zs, l)
		for k := 0; k < l.Len(); k++ {
			p := l.Node(k%l.NX, k/l.NX)
			e, own, rho := zs.rel(p, -1)
			if fd.e[k] != e || fd.rho[k] != rho || (own >= 0 && fd.own[k] != int32(own)) {
				t.Fatalf("h %g node %v: field e %g ρ %g own %d, brute force %g %g %d", h, p, fd.e[k], fd.rho[k], fd.own[k], e, rho, own)
			}
		}
	}
}

// TestField_CoarseNodes checks that a field taking the nodes it shares
// with a field of twice the cell from that field equals the field
// computed afresh, bit for bit, for lattices over different boxes.
func TestField_CoarseNodes(t *testing.T) {
	_, _, zones := slopedYard()
	zones = append(zones,
		Zone{Name: "vertical L", Ring: ring(4, -3, 7, -3, 7, -1, 5, -1, 5, 1, 4, 1), DepthM: 0.5},
		Zone{Name: "sharp", Ring: ring(-6, 2, -4, 2.5, -4.5, 4), DepthM: 0.4, WallSlope: 0.7, Corners: Sharp})
	zs, err := newZoneSet(zones, 0.12)
	if err != nil {
		t.Fatal(err)
	}
	for _, h := range []float64{0.25, 0.0625, 0.05} {
		coarse, err := gridLattice(zs.rimBox().Expand(3+4*h), 2*h)
		if err != nil {
			t.Fatal(err)
		}
		cf := newField(zs, coarse)
		for _, grow := range []float64{1, 3, 5} {
			l, err := gridLattice(zs.rimBox().Expand(grow), h)
			if err != nil {
				t.Fatal(err)
			}
			got, want := newFieldFrom(zs, l, cf), newField(zs, l)
			// 0.05 m is no power of two: its nodes are not exact
			// multiples, and the coarse field must not be taken.
			if taken := got.coarse != nil; taken != (h != 0.05) {
				t.Fatalf("h %g: coarse field taken %v", h, taken)
			}
			for k := range want.e {
				if got.e[k] != want.e[k] || got.rho[k] != want.rho[k] || got.own[k] != want.own[k] {
					t.Fatalf("h %g, box +%g m, node %d: e %g ρ %g own %d, fresh %g %g %d",
						h, grow, k, got.e[k], got.rho[k], got.own[k], want.e[k], want.rho[k], want.own[k])
				}
			}
		}
	}
}
