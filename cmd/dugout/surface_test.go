package main

import (
	"bytes"
	"context"
	"encoding/json"
	"encoding/xml"
	"errors"
	"flag"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"github.com/spf13/cobra"

	"github.com/dugout-estimating/dugout/internal/reftest"
	"github.com/dugout-estimating/dugout/internal/tin"
	"github.com/dugout-estimating/dugout/internal/units"
)

var update = flag.Bool("update", false, "rewrite the golden files in testdata/")

const (
	demoTS  = "../../testdata/demo/yard_total_station.csv"
	demoGPS = "../../testdata/demo/yard_phone_gps.csv"
)

// relTol compares computed areas and volumes with references computed in
// another program or by hand: 1e-9 of the value, far above float64
// round-off over a few thousand triangles and far below anything a survey
// can tell.
const relTol = 1e-9

// close reports whether got is within rel of want, relative to want with an
// absolute floor of rel.
func close(got, want, rel float64) bool {
	return math.Abs(got-want) <= rel*math.Max(1, math.Abs(want))
}

// runCommand runs the command made by newCmd with args on fake streams;
// tty sets both streams' terminal flags.
func runCommand(t testing.TB, newCmd func(*App) *cobra.Command, app *App, tty bool, args ...string) (stdout, stderr string, err error) {
	t.Helper()
	var out, errb bytes.Buffer
	if app == nil {
		app = &App{}
	}
	app.IO = &IOStreams{In: strings.NewReader(""), Out: &out, ErrOut: &errb, ErrIsTTY: tty, OutIsTTY: tty}
	cmd := newCmd(app)
	cmd.SetArgs(args)
	cmd.SetOut(&out)
	cmd.SetErr(&errb)
	cmd.SilenceUsage = true
	cmd.SilenceErrors = true
	err = cmd.ExecuteContext(context.Background())
	return out.String(), errb.String(), err
}

// runJSON runs a command with --json and decodes its one document.
func runJSON(t testing.TB, newCmd func(*App) *cobra.Command, args ...string) map[string]any {
	t.Helper()
	out, stderr, err := runCommand(t, newCmd, &App{JSON: true}, false, args...)
	if err != nil {
		t.Fatalf("%v: %v\n%s", args, err, stderr)
	}
	var doc map[string]any
	dec := json.NewDecoder(strings.NewReader(out))
	if err := dec.Decode(&doc); err != nil {
		t.Fatalf("stdout is not JSON: %v\n%s", err, out)
	}
	if dec.More() {
		t.Fatalf("stdout holds more than one JSON document:\n%s", out)
	}
	return doc
}

// num returns doc[key] (nested with dots) as a float64.
func num(t testing.TB, doc map[string]any, key string) float64 {
	t.Helper()
	var v any = doc
	for _, k := range strings.Split(key, ".") {
		m, ok := v.(map[string]any)
		if !ok {
			t.Fatalf("JSON %s: %v is not an object", key, v)
		}
		if v, ok = m[k]; !ok {
			t.Fatalf("JSON lacks %s", key)
		}
	}
	f, ok := v.(float64)
	if !ok {
		t.Fatalf("JSON %s = %v, not a number", key, v)
	}
	return f
}

// writeFile writes a small fixture into dir and returns its path.
func writeFile(t testing.TB, dir, name, text string) string {
	t.Helper()
	p := filepath.Join(dir, name)
	if err := os.WriteFile(p, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

// checkGolden compares got with testdata/name, rewriting it with -update.
func checkGolden(t *testing.T, name, got string) {
	t.Helper()
	path := filepath.Join("testdata", name)
	if *update {
		if err := os.MkdirAll("testdata", 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(path, []byte(got), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run go test -update to create it)", err)
	}
	if got != string(want) {
		t.Errorf("output differs from %s (go test -update rewrites it):\n--- got\n%s--- want\n%s", path, got, want)
	}
}

// python runs a reference script with Debian's python3 and returns its
// stdout.
func python(t *testing.T, script string, args ...string) string {
	t.Helper()
	py := reftest.Python(t, "numpy", "scipy.spatial", "shapely", "pyproj")
	out, err := exec.Command(py, append([]string{"-c", script}, args...)...).Output()
	if err != nil {
		var ee *exec.ExitError
		if errors.As(err, &ee) {
			t.Fatalf("reference script: %v\n%s", err, ee.Stderr)
		}
		t.Fatalf("reference script: %v", err)
	}
	return string(out)
}

func TestSurfaceCmd_Flags(t *testing.T) {
	var got *surfaceOptions
	capture := func(_ context.Context, o *surfaceOptions) error { got = o; return nil }
	cmd := surfaceCmdWith(&App{}, capture)
	cmd.SetArgs([]string{"a.csv", "b.csv", "--breaklines", "bl1.geojson", "--breaklines", "bl2.csv", "--boundary", "lot.geojson",
		"--max-edge", "15ft", "--merge-tol", "2cm", "--duplicates", "first", "--landxml", "g.xml", "--geojson", "g.geojson",
		"--check", "--units", "ft", "--crs", "local"})
	if err := cmd.Execute(); err != nil {
		t.Fatal(err)
	}
	if len(got.files) != 2 || got.files[1] != "b.csv" || len(got.breaklines) != 2 || got.breaklines[1] != "bl2.csv" ||
		got.boundary != "lot.geojson" || got.maxEdge != "15ft" || got.mergeTol != "2cm" || got.duplicates != "first" ||
		got.landxmlOut != "g.xml" || got.geojsonOut != "g.geojson" || !got.check || !got.unitsSet ||
		got.survey.units != "ft" || got.survey.crs != "local" {
		t.Errorf("parsed options = %+v", got)
	}
	cmd = surfaceCmdWith(&App{}, capture)
	cmd.SetArgs([]string{"a.csv"})
	if err := cmd.Execute(); err != nil {
		t.Fatal(err)
	}
	if got.duplicates != "mean" || got.unitsSet || got.check || got.maxEdge != "" || got.survey.units != "m" || got.survey.crs != "auto" {
		t.Errorf("defaults = %+v", got)
	}
	cmd = surfaceCmdWith(&App{}, capture)
	cmd.SetArgs(nil)
	cmd.SilenceErrors, cmd.SilenceUsage = true, true
	if err := cmd.Execute(); exitCodeOf(err) != ExitUsage {
		t.Errorf("no file: %v, want a usage error", err)
	}
}

func TestSurface_DemoGolden(t *testing.T) {
	// The demo yard in feet: text on a terminal (aligned) and not
	// (key<TAB>value), both stable for the same input.
	for _, tc := range []struct {
		tty    bool
		golden string
	}{{false, "surface_demo.txt"}, {true, "surface_demo_tty.txt"}} {
		out, stderr, err := runCommand(t, newSurfaceCmd, nil, tc.tty, "--units", "ft", demoTS)
		if err != nil {
			t.Fatalf("surface: %v\n%s", err, stderr)
		}
		checkGolden(t, tc.golden, out)
		// The demo's check shot 8 cm low (testdata/demo/README.md) is the
		// one conflicting duplicate; it is named by point id and line.
		if !strings.Contains(stderr, "warning: surface: duplicate shots 292 (") || !strings.Contains(stderr, "line 331) differ in elevation by 0.26 ft") {
			t.Errorf("stderr lacks the conflicting re-shot:\n%s", stderr)
		}
		if strings.Contains(out, "warning:") {
			t.Error("a warning went to stdout")
		}
		// Progress only on a terminal.
		if got := strings.Contains(stderr, "reading 100%"); got != tc.tty {
			t.Errorf("tty %v: progress shown %v", tc.tty, got)
		}
	}
	out, _, _ := runCommand(t, newSurfaceCmd, nil, false, "--units", "ft", demoTS)
	if !strings.Contains(out, "vertices\t325\n") || strings.Contains(out, "  ") {
		t.Errorf("not a terminal: want key<TAB>value lines without padding:\n%s", out)
	}
	out, _, _ = runCommand(t, newSurfaceCmd, nil, true, "--units", "ft", demoTS)
	if !strings.Contains(out, "vertices      325\n") {
		t.Errorf("terminal: want aligned columns:\n%s", out)
	}
}

func TestSurface_DemoJSON(t *testing.T) {
	doc := runJSON(t, newSurfaceCmd, "--units", "ft", demoTS)
	for _, k := range []string{"schema_version", "input", "options", "units", "crs", "frame_origin_m", "vertices", "triangles",
		"hull_vertices", "duplicates", "constraints", "plan_area_m2", "surface_area_m2", "elevation_min_m", "elevation_max_m",
		"longest_edges", "warnings", "outputs"} {
		if _, ok := doc[k]; !ok {
			t.Errorf("JSON lacks %q", k)
		}
	}
	if doc["schema_version"] != 1.0 || doc["units"] != "ft" {
		t.Errorf("schema_version %v units %v", doc["schema_version"], doc["units"])
	}
	// testdata/demo/README.md: 328 shots, BL1 and BL2 of 20 shots each
	// (each vertex merged with its own shot), and three check shots of
	// earlier points (within the 1 cm merge distance).
	if v := num(t, doc, "shots"); v != 328 {
		t.Errorf("shots = %v, want 328", v)
	}
	if v := num(t, doc, "duplicates.breakline_vertices_on_shots"); v != 40 {
		t.Errorf("breakline vertices on shots = %v, want 40", v)
	}
	if v := num(t, doc, "duplicates.merged"); v != 43 {
		t.Errorf("duplicates merged = %v, want 40 breakline vertices and the 3 check shots", v)
	}
	if v := num(t, doc, "duplicates.conflicts"); v != 1 {
		t.Errorf("duplicate conflicts = %v, want 1 (the shot 8 cm low)", v)
	}
	if v := num(t, doc, "constraints.breaklines"); v != 2 {
		t.Errorf("breaklines = %v, want 2", v)
	}
	// Euler's formula for a triangulated disc (no holes, no Steiner
	// vertices here: no splits): T = 2V − 2 − H.
	v, tri, h := num(t, doc, "vertices"), num(t, doc, "triangles"), num(t, doc, "hull_vertices")
	if v != 325 || tri != 2*v-2-h || num(t, doc, "constraints.splits") != 0 {
		t.Errorf("V %v T %v H %v: want V 325 and T = 2V − 2 − H", v, tri, h)
	}
	// The file's own elevation range, 94.526 to 100.259 ft (the lowest and
	// highest Elevation in yard_total_station.csv).
	if lo, hi := num(t, doc, "elevation_min_m")/units.Foot, num(t, doc, "elevation_max_m")/units.Foot; !close(lo, 94.526, 1e-12) || !close(hi, 100.259, 1e-12) {
		t.Errorf("elevation %v to %v ft, want 94.526 to 100.259", lo, hi)
	}
	if edges := doc["longest_edges"].([]any); len(edges) != 5 {
		t.Errorf("longest_edges has %d, want 5", len(edges))
	}
	if w := doc["warnings"].([]any); len(w) != 1 {
		t.Errorf("warnings = %v, want the one conflicting re-shot", w)
	}
}

// refDelaunay computes, with SciPy (Qhull) and NumPy, the Delaunay
// triangulation of a header CSV of Easting, Northing, Elevation in feet
// (comment lines skipped), and prints the triangle count, the convex hull
// area, the 3-D area and the longest edge, in metres.
const refDelaunay = `
import csv, sys
import numpy as np
from scipy.spatial import Delaunay, ConvexHull
rows = [r for r in csv.reader(l for l in open(sys.argv[1]) if not l.startswith('#'))]
h = [c.lower() for c in rows[0]]
ie, i_n, iz = h.index('easting'), h.index('northing'), h.index('elevation')
p = np.array([[float(r[ie]), float(r[i_n]), float(r[iz])] for r in rows[1:]]) * 0.3048
d = Delaunay(p[:, :2])
t = p[d.simplices]
area3 = 0.5 * np.linalg.norm(np.cross(t[:, 1] - t[:, 0], t[:, 2] - t[:, 0]), axis=1).sum()
e = np.concatenate([t[:, [0, 1]], t[:, [1, 2]], t[:, [2, 0]]])
longest = np.hypot(*(e[:, 1, :2] - e[:, 0, :2]).T).max()
print(len(np.unique(p[:, :2], axis=0)), len(d.simplices), repr(ConvexHull(p[:, :2]).volume), repr(area3), repr(longest))
`

func TestSurface_SciPyDelaunay(t *testing.T) {
	// Without breaklines (no point carries the code NONE) and merging only
	// identical positions, the surface is the plain Delaunay
	// triangulation; SciPy's (Qhull) must agree on the counts, the plan area
	// (the convex hull's), the 3-D area and the longest edge.
	out := python(t, refDelaunay, demoTS)
	var n, ntri int
	var hull, area3, longest float64
	if _, err := fmt.Sscan(out, &n, &ntri, &hull, &area3, &longest); err != nil {
		t.Fatalf("reference output %q: %v", out, err)
	}
	doc := runJSON(t, newSurfaceCmd, "--units", "ft", "--breakline-code", "NONE", "--merge-tol", "0", demoTS)
	if v := num(t, doc, "vertices"); int(v) != n {
		t.Errorf("vertices = %v, NumPy distinct positions %d", v, n)
	}
	if v := num(t, doc, "triangles"); int(v) != ntri {
		t.Errorf("triangles = %v, SciPy %d", v, ntri)
	}
	if v := num(t, doc, "plan_area_m2"); !close(v, hull, relTol) {
		t.Errorf("plan area %v m², SciPy ConvexHull %v", v, hull)
	}
	if v := num(t, doc, "surface_area_m2"); !close(v, area3, relTol) {
		t.Errorf("3-D area %v m², SciPy Delaunay %v", v, area3)
	}
	e := doc["longest_edges"].([]any)[0].(map[string]any)["length_m"].(float64)
	if !close(e, longest, relTol) {
		t.Errorf("longest edge %v m, SciPy %v", e, longest)
	}
}

// refGeoJSONArea sums, with Shapely, the plan area of the Polygon features
// of a GeoJSON file; with an EPSG code it first projects lon/lat with
// PROJ (pyproj) into that system. It prints the area, the feature count,
// and the smallest and largest third coordinate.
const refGeoJSONArea = `
import json, sys
from shapely.geometry import shape
from shapely.ops import transform
doc = json.load(open(sys.argv[1]))
tr = None
if len(sys.argv) > 2:
    from pyproj import Transformer
    tr = Transformer.from_crs('EPSG:4326', 'EPSG:' + sys.argv[2], always_xy=True).transform
area, zs = 0.0, []
for f in doc['features']:
    g = shape(f['geometry'])
    zs += [c[2] for c in f['geometry']['coordinates'][0]]
    if tr:
        g = transform(lambda x, y, z=None: tr(x, y), g)
    area += g.area
print(repr(area), len(doc['features']), repr(min(zs)), repr(max(zs)))
`

func TestSurface_GeoJSONAndLandXML(t *testing.T) {
	dir := t.TempDir()
	gj := filepath.Join(dir, "new", "ground.geojson")
	lx := filepath.Join(dir, "new", "ground.xml")
	doc := runJSON(t, newSurfaceCmd, "--units", "ft", demoTS, "--geojson", gj, "--landxml", lx, "--check")
	if doc["checked"] != true {
		t.Errorf("checked = %v, want true", doc["checked"])
	}
	entries, _ := os.ReadDir(filepath.Join(dir, "new"))
	if len(entries) != 2 {
		t.Errorf("output folder holds %v, want the two files and no temporary file", entries)
	}

	// GeoJSON in the survey's grid: feet, said in a dugout:crs member
	// (RFC 7946 §6.1 foreign member), one Polygon per triangle.
	b, err := os.ReadFile(gj)
	if err != nil {
		t.Fatal(err)
	}
	var fc struct {
		Type     string            `json:"type"`
		CRS      string            `json:"dugout:crs"`
		Features []json.RawMessage `json:"features"`
	}
	if err := json.Unmarshal(b, &fc); err != nil {
		t.Fatal(err)
	}
	if fc.Type != "FeatureCollection" || len(fc.Features) != int(num(t, doc, "triangles")) ||
		!strings.Contains(fc.CRS, "local site grid") || !strings.Contains(fc.CRS, "international feet") {
		t.Errorf("GeoJSON: type %q, %d features, dugout:crs %q", fc.Type, len(fc.Features), fc.CRS)
	}
	// Shapely's area of the triangles, in ft², is the plan area.
	out := python(t, refGeoJSONArea, gj)
	var area, zmin, zmax float64
	var nf int
	if _, err := fmt.Sscan(out, &area, &nf, &zmin, &zmax); err != nil {
		t.Fatalf("reference output %q: %v", out, err)
	}
	// Coordinates are written to 1e-4 ft; over the hull's perimeter of
	// about 270 ft that moves the area by at most ~0.03 ft² of 4577.
	const roundedRel = 1e-5
	if want := num(t, doc, "plan_area_m2") / units.SquareFoot; !close(area, want, roundedRel) {
		t.Errorf("Shapely area %v ft², surface plan area %v ft²", area, want)
	}
	if zmin != 94.526 || zmax != 100.259 {
		t.Errorf("GeoJSON elevations %v to %v, want the file's 94.526 to 100.259 ft", zmin, zmax)
	}

	// LandXML: points are "northing easting elevation" (LandXML 1.2) in
	// feet, and the first is CP1 at N 5000.000, E 1000.000, Z 100.000
	// (the survey file's first row).
	f, err := os.Open(lx)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	var x struct {
		Units struct {
			Imperial struct {
				Linear string `xml:"linearUnit,attr"`
			} `xml:"Imperial"`
		} `xml:"Units"`
		Pnts []string `xml:"Surfaces>Surface>Definition>Pnts>P"`
		Fs   []string `xml:"Surfaces>Surface>Definition>Faces>F"`
	}
	if err := xml.NewDecoder(f).Decode(&x); err != nil {
		t.Fatal(err)
	}
	if x.Units.Imperial.Linear != "foot" || len(x.Pnts) != int(num(t, doc, "vertices")) || len(x.Fs) != int(num(t, doc, "triangles")) {
		t.Errorf("LandXML: unit %q, %d points, %d faces", x.Units.Imperial.Linear, len(x.Pnts), len(x.Fs))
	}
	found := false
	for _, p := range x.Pnts {
		if p == "5000.0000 1000.0000 100.0000" {
			found = true
		}
	}
	if !found {
		t.Error("LandXML lacks CP1 at N 5000, E 1000, Z 100 ft")
	}

	// Read back, the LandXML surface is the same surface.
	back := runJSON(t, newSurfaceCmd, lx, "--check")
	for _, k := range []string{"vertices", "triangles", "hull_vertices"} {
		if num(t, back, k) != num(t, doc, k) {
			t.Errorf("LandXML read back: %s = %v, want %v", k, num(t, back, k), num(t, doc, k))
		}
	}
	if back["units"] != "ft" || back["input"].(map[string]any)["format"] != "landxml" {
		t.Errorf("LandXML read back: units %v, input %v", back["units"], back["input"])
	}
	if a, b := num(t, back, "plan_area_m2"), num(t, doc, "plan_area_m2"); !close(a, b, roundedRel) {
		t.Errorf("LandXML read back: plan area %v, want %v", a, b)
	}
}

func TestSurface_LonLatGeoJSON(t *testing.T) {
	// The phone GPS copy of the demo is lon/lat: the surface is built in
	// its UTM zone (15N, EPSG:32615) and the GeoJSON goes back to RFC 7946
	// lon/lat. Projected again by PROJ, the triangles have the plan area
	// of the surface.
	dir := t.TempDir()
	gj := filepath.Join(dir, "gps.geojson")
	doc := runJSON(t, newSurfaceCmd, demoGPS, "--geojson", gj)
	if doc["geographic"] != true || num(t, doc, "crs.epsg") != 32615 {
		t.Fatalf("geographic %v crs %v, want lon/lat projected to EPSG:32615", doc["geographic"], doc["crs"])
	}
	b, err := os.ReadFile(gj)
	if err != nil {
		t.Fatal(err)
	}
	if bytes.Contains(b, []byte("dugout:crs")) {
		t.Error("lon/lat GeoJSON carries a dugout:crs note; RFC 7946 coordinates need none")
	}
	out := python(t, refGeoJSONArea, gj, "32615")
	var area, zmin, zmax float64
	var nf int
	if _, err := fmt.Sscan(out, &area, &nf, &zmin, &zmax); err != nil {
		t.Fatalf("reference output %q: %v", out, err)
	}
	// Lon/lat are written to 1e-9°, about 0.1 mm.
	const roundedRel = 1e-5
	if want := num(t, doc, "plan_area_m2"); !close(area, want, roundedRel) || nf != int(num(t, doc, "triangles")) {
		t.Errorf("PROJ + Shapely: %d triangles, %v m²; surface %v triangles, %v m²", nf, area, num(t, doc, "triangles"), want)
	}
	// RFC 7946 §4: the third element is metres.
	if !close(zmin, num(t, doc, "elevation_min_m"), 1e-6) || !close(zmax, num(t, doc, "elevation_max_m"), 1e-6) {
		t.Errorf("GeoJSON elevations %v to %v m, surface %v to %v", zmin, zmax, doc["elevation_min_m"], doc["elevation_max_m"])
	}
}

func TestSurface_Stdout(t *testing.T) {
	// "-" writes the document alone to stdout.
	out, _, err := runCommand(t, newSurfaceCmd, nil, false, "--units", "ft", demoTS, "--landxml", "-")
	if err != nil || !strings.HasPrefix(out, `<?xml version="1.0" encoding="UTF-8"?>`) || strings.Contains(out, "vertices\t") {
		t.Errorf("--landxml -: %v\n%.200s", err, out)
	}
	out, _, err = runCommand(t, newSurfaceCmd, nil, false, "--units", "ft", demoTS, "--geojson", "-")
	var fc map[string]any
	if err != nil || json.Unmarshal([]byte(out), &fc) != nil || fc["type"] != "FeatureCollection" {
		t.Errorf("--geojson -: %v\n%.200s", err, out)
	}
}

func TestSurface_Deterministic(t *testing.T) {
	// Same inputs and flags: byte-identical stdout and files.
	dir := t.TempDir()
	gj := filepath.Join(dir, "g.geojson")
	lx := filepath.Join(dir, "g.xml")
	var runs [2][3]string
	for i := range runs {
		out, _, err := runCommand(t, newSurfaceCmd, &App{JSON: true}, false, "--units", "ft", demoTS, "--geojson", gj, "--landxml", lx)
		if err != nil {
			t.Fatal(err)
		}
		g, _ := os.ReadFile(gj)
		l, _ := os.ReadFile(lx)
		runs[i] = [3]string{out, string(g), string(l)}
	}
	if runs[0] != runs[1] {
		t.Error("two runs on the same input differ")
	}
}

// squareCSV is a 10 m square of shots at E 1000–1010, N 2000–2010 with a
// centre shot, in a header CSV.
const squareCSV = "id,easting,northing,elevation,description\n" +
	"1,1000,2000,10,GS\n2,1010,2000,10,GS\n3,1010,2010,10,GS\n4,1000,2010,10,GS\n5,1005,2005,11,GS\n"

func TestSurface_Rejected(t *testing.T) {
	tmp := t.TempDir()
	square := writeFile(t, tmp, "square.csv", squareCSV)
	tests := []struct {
		name  string
		files map[string]string
		args  []string
		want  ExitCode
		msg   string
	}{
		{"two points", map[string]string{"a.csv": "id,easting,northing,elevation\n1,0,0,1\n2,5,0,1\n"},
			[]string{"a.csv"}, ExitRejected, "at least 3 shots at different positions"},
		{"two distinct positions", map[string]string{"a.csv": "id,easting,northing,elevation\n1,0,0,1\n2,5,0,1\n3,5,0,1\n"},
			[]string{"a.csv"}, ExitRejected, "at least 3 shots"},
		{"collinear", map[string]string{"a.csv": "id,easting,northing,elevation\n1,0,0,1\n2,5,5,1\n3,10,10,2\n4,20,20,3\n"},
			[]string{"a.csv"}, ExitRejected, "lie on one straight line"},
		{"NaN elevation", map[string]string{"a.csv": "id,easting,northing,elevation\n1,0,0,1\n2,5,0,NaN\n3,0,5,1\n"},
			[]string{"a.csv"}, ExitRejected, "a.csv:3"},
		{"breakline leaves the survey", map[string]string{"bl.geojson": `{"type":"FeatureCollection","features":[
			{"type":"Feature","properties":{"name":"ditch"},"geometry":{"type":"LineString","coordinates":[[1002,2005,10],[1015,2005,10]]}}]}`},
			[]string{square, "--crs", "local", "--breaklines", "bl.geojson"}, ExitRejected, `breakline "ditch" (` + "%s" + `bl.geojson line 2) leaves the surveyed area: its vertex 2 at E 1015.000, N 2005.000 lies 5.000 m outside`},
		{"self-intersecting boundary", map[string]string{"bow.geojson": `{"type":"FeatureCollection","features":[
			{"type":"Feature","properties":{"name":"lot"},"geometry":{"type":"Polygon","coordinates":[[[1001,2001],[1009,2009],[1009,2001],[1001,2009],[1001,2001]]]}}]}`},
			[]string{square, "--crs", "local", "--boundary", "bow.geojson"}, ExitRejected, "crosses or touches itself"},
		{"conflicting duplicates refused", map[string]string{"a.csv": squareCSV + "6,1005.002,2005,11.2,GS check\n"},
			[]string{"a.csv", "--duplicates", "error"}, ExitRejected, "shots at E 1005.000, N 2005.000 differ in elevation by 0.200 m (11.000 to 11.200 m, more than 0.050 m): point 5 ("},
		{"max edge trims everything", nil, []string{square, "--max-edge", "1"}, ExitRejected, "leaves no surface"},
		{"breakline file without lines", map[string]string{"pts.csv": squareCSV}, []string{square, "--breaklines", "pts.csv"}, ExitRejected, "no breakline in the file"},
		{"boundary file without polygon", map[string]string{"pts.csv": squareCSV}, []string{square, "--boundary", "pts.csv"}, ExitRejected, "no polygon"},
		{"bad duplicates", nil, []string{square, "--duplicates", "max"}, ExitUsage, "want mean, first or error"},
		{"bad max edge", nil, []string{square, "--max-edge", "-3ft"}, ExitUsage, "--max-edge must be > 0"},
		{"max edge not a length", nil, []string{square, "--max-edge", "wide"}, ExitUsage, "--max-edge"},
		{"bad merge tolerance", nil, []string{square, "--merge-tol", "-1cm"}, ExitUsage, "--merge-tol must be >= 0"},
		{"bad units", nil, []string{square, "--units", "yd"}, ExitUsage, "--units"},
		{"two outputs to stdout", nil, []string{square, "--landxml", "-", "--geojson", "-"}, ExitUsage, "only one output"},
		{"landxml with boundary", map[string]string{"g.xml": "<LandXML/>"}, []string{"g.xml", "--boundary", "b.geojson"}, ExitUsage, "used as it is"},
		{"missing file", nil, []string{filepath.Join(tmp, "missing.csv")}, ExitFailure, "missing.csv"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			dir := t.TempDir()
			for name, text := range tc.files {
				writeFile(t, dir, name, text)
			}
			var args []string
			for _, a := range tc.args {
				if _, ok := tc.files[a]; ok {
					a = filepath.Join(dir, a)
				}
				args = append(args, a)
			}
			out := filepath.Join(dir, "out", "sub")
			if !strings.Contains(strings.Join(args, " "), " -") {
				args = append(args, "--landxml", filepath.Join(out, "g.xml"), "--geojson", filepath.Join(out, "g.geojson"))
			}
			stdout, _, err := runCommand(t, newSurfaceCmd, nil, false, args...)
			if got := exitCodeOf(err); got != tc.want {
				t.Fatalf("surface %v: error %v gives exit %d, want %d", args, err, got, tc.want)
			}
			msg := tc.msg
			if strings.Contains(msg, "%s") {
				msg = fmt.Sprintf(msg, dir+string(filepath.Separator))
			}
			if !strings.Contains(err.Error(), msg) {
				t.Errorf("error %q lacks %q", err, msg)
			}
			if stdout != "" {
				t.Errorf("stdout = %q, want nothing on error", stdout)
			}
			// Nothing written: not even the output folder is left.
			if _, err := os.Stat(filepath.Join(dir, "out")); !os.IsNotExist(err) {
				t.Errorf("output folder left behind after the error (%v)", err)
			}
		})
	}
	// The typed errors stay in the chain for callers.
	_, _, err := runCommand(t, newSurfaceCmd, nil, false, writeFile(t, tmp, "dup.csv", squareCSV+"6,1005,2005,12,GS\n"), "--duplicates", "error")
	var de *tin.DuplicateError
	if !errors.As(err, &de) || len(de.Indices) != 2 {
		t.Errorf("error %v, want a *tin.DuplicateError of 2 points in the chain", err)
	}
}

func TestSurface_OutputChecks(t *testing.T) {
	dir := t.TempDir()
	square := writeFile(t, dir, "square.csv", squareCSV)
	for _, tc := range []struct {
		name string
		args []string
		msg  string
	}{
		{"same file twice", []string{"--landxml", filepath.Join(dir, "g.out"), "--geojson", filepath.Join(dir, "g.out")}, "name the same file"},
		{"output over the input", []string{"--geojson", square}, "would overwrite an input file"},
		{"output is a folder", []string{"--geojson", dir}, "is a folder"},
		{"stdout with json", []string{"--geojson", "-", "--json"}, "--json needs"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			app := &App{}
			args := append([]string{square}, tc.args...)
			if args[len(args)-1] == "--json" {
				app.JSON = true
				args = args[:len(args)-1]
			}
			_, _, err := runCommand(t, newSurfaceCmd, app, false, args...)
			if exitCodeOf(err) != ExitUsage || !strings.Contains(err.Error(), tc.msg) {
				t.Errorf("%v: %v, want a usage error saying %q", args, err, tc.msg)
			}
		})
	}
	if b, _ := os.ReadFile(square); string(b) != squareCSV {
		t.Error("the input file was changed")
	}
}

func TestSurface_BreaklinesAndBoundary(t *testing.T) {
	// A ridge breakline along the square's diagonal and a boundary of its
	// south-east half: the surface keeps the half triangle, area 50 m².
	dir := t.TempDir()
	square := writeFile(t, dir, "square.csv", squareCSV)
	bl := writeFile(t, dir, "bl.geojson", `{"type":"FeatureCollection","features":[
{"type":"Feature","properties":{"name":"ridge"},"geometry":{"type":"LineString","coordinates":[[1000,2000,10],[1010,2010,10]]}}]}`)
	bd := writeFile(t, dir, "lot.geojson", `{"type":"FeatureCollection","features":[
{"type":"Feature","properties":{"name":"lot"},"geometry":{"type":"Polygon","coordinates":[[[1000,2000],[1010,2000],[1010,2010],[1000,2000]]]}}]}`)
	doc := runJSON(t, newSurfaceCmd, square, "--crs", "local", "--breaklines", bl, "--boundary", bd, "--check")
	if v := num(t, doc, "plan_area_m2"); !close(v, 50, relTol) {
		t.Errorf("plan area %v m², want 50 (half the square)", v)
	}
	if num(t, doc, "constraints.breaklines") != 1 || num(t, doc, "constraints.boundary_rings") != 1 || doc["checked"] != true {
		t.Errorf("constraints %v, checked %v", doc["constraints"], doc["checked"])
	}
	in := doc["input"].(map[string]any)
	if in["boundary_file"] != bd || len(in["breakline_files"].([]any)) != 1 {
		t.Errorf("input echo = %v", in)
	}
}
