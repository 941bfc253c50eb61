package report

import (
	"bytes"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/dugout-estimating/dugout/internal/contours"
	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/reftest"
	"github.com/dugout-estimating/dugout/internal/units"
)

// The -update flag ("go test ./internal/report -run GeoJSON -update")
// rewrites the GeoJSON golden files. golden_test.go may define the same
// flag; whichever file is initialised first defines it and the other reuses
// it.
var _ = defineGeoJSONUpdateFlag()

func defineGeoJSONUpdateFlag() bool {
	if flag.Lookup("update") == nil {
		flag.Bool("update", false, "rewrite the golden files in testdata/")
	}
	return true
}

// geoJSONGolden compares got with testdata/name, or rewrites it under
// -update. On a mismatch the new output is written beside it as
// testdata/failure_<name>, to open side by side with the golden file.
func geoJSONGolden(tb testing.TB, name string, got []byte) {
	tb.Helper()
	path := filepath.Join("testdata", name)
	if f := flag.Lookup("update"); f != nil && f.Value.String() == "true" {
		if err := os.WriteFile(path, got, 0o644); err != nil {
			tb.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(path)
	if err != nil {
		tb.Fatalf("read golden file: %v (go test ./internal/report -run GeoJSON -update creates it)", err)
	}
	fail := filepath.Join("testdata", "failure_"+name)
	if !bytes.Equal(got, want) {
		_ = os.WriteFile(fail, got, 0o644)
		tb.Errorf("%s differs from the golden file; the new output is in %s", name, fail)
		return
	}
	_ = os.Remove(fail)
}

// testMesh is a small hill: a square pyramid on the integer lattice over
// [-2, 2]² (apex 3 m, edges 1 m), 32 counter-clockwise triangles.
func testMesh() geom.TriMesh {
	var m geom.TriMesh
	for j := -2; j <= 2; j++ {
		for i := -2; i <= 2; i++ {
			z := 3 - math.Max(math.Abs(float64(i)), math.Abs(float64(j)))
			m.V = append(m.V, geom.Vec3{X: float64(i), Y: float64(j), Z: z})
		}
	}
	for j := range 4 {
		for i := range 4 {
			a := int32(j*5 + i)
			m.T = append(m.T, a, a+1, a+6, a, a+6, a+5)
		}
	}
	return m
}

// The world frame of the test files: a site in Oregon GIC Lambert (EPSG:2994)
// international feet; the origin is a whole metre as geom.FrameAt makes it.
var testFrame = geom.Frame{Origin: geom.Vec2{X: 193863, Y: 258754}}

func toWorldFeet(p geom.Vec2) (float64, float64) {
	w := testFrame.ToWorld(p)
	return w.X / units.Foot, w.Y / units.Foot
}

// toLonLat is a local tangent-plane approximation around Autzen Stadium
// (44.0582 N, 123.0685 W): good enough to give plausible degrees for the
// format tests; real output goes through package crs.
func toLonLat(p geom.Vec2) (float64, float64) {
	const lat0, lon0 = 44.0582, -123.0685
	const mPerDegLat = 111_132.0 // metres per degree of latitude near 45° (from memory)
	return lon0 + p.X/(mPerDegLat*math.Cos(lat0*math.Pi/180)), lat0 + p.Y/mPerDegLat
}

func traceTestMesh(tb testing.TB) []contours.Line {
	tb.Helper()
	lines, err := contours.Trace(testMesh(), contours.Options{IntervalM: 0.5, BaseM: 0.25, IndexEvery: 2,
		MinLevel: math.NaN(), MaxLevel: math.NaN()})
	if err != nil {
		tb.Fatal(err)
	}
	return lines
}

// TestWriteContoursGeoJSON_Golden pins the bytes of contour files in world
// feet with a CRS note and in lon/lat, and checks them against RFC 7946.
func TestWriteContoursGeoJSON_Golden(t *testing.T) {
	lines := traceTestMesh(t)
	for _, tc := range []struct {
		name  string
		toOut CoordMapper
		z     float64
		meta  GeoJSONMeta
	}{
		{"geojson_contours_ft.geojson", toWorldFeet, 1 / units.Foot, GeoJSONMeta{CRSNote: "EPSG:2994; units ft"}},
		{"geojson_contours_lonlat.geojson", toLonLat, 1, GeoJSONMeta{Geographic: true}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var buf bytes.Buffer
			if err := WriteContoursGeoJSON(&buf, lines, tc.toOut, tc.z, tc.meta); err != nil {
				t.Fatal(err)
			}
			checkRFC7946(t, buf.Bytes(), tc.meta, "LineString")
			fc := decodeFC(t, buf.Bytes())
			if len(fc.Features) != len(lines) {
				t.Fatalf("%d features, want %d", len(fc.Features), len(lines))
			}
			for i, f := range fc.Features {
				var p struct {
					Elevation float64
					Index     bool
					Closed    bool
				}
				if err := json.Unmarshal(f.Properties, &p); err != nil {
					t.Fatal(err)
				}
				l := lines[i]
				if want := l.Level * tc.z; math.Abs(p.Elevation-want) > 0.5e-4 || p.Index != l.Index || p.Closed != l.Closed {
					t.Errorf("feature %d properties %+v, want elevation %g index %v closed %v", i, p, want, l.Index, l.Closed)
				}
				var pos [][]float64
				if err := json.Unmarshal(f.Geometry.Coordinates, &pos); err != nil {
					t.Fatal(err)
				}
				for j, q := range l.Pts {
					x, y := tc.toOut(q)
					half := 0.5 * math.Pow10(-geoJSONLinearDigits)
					if tc.meta.Geographic {
						half = 0.5 * math.Pow10(-geoJSONDegreeDigits)
					}
					if math.Abs(pos[j][0]-x) > half || math.Abs(pos[j][1]-y) > half {
						t.Errorf("feature %d position %d = %v, want (%.10f, %.10f) to %g", i, j, pos[j], x, y, half)
					}
				}
			}
			geoJSONGolden(t, tc.name, buf.Bytes())
			var again bytes.Buffer
			if err := WriteContoursGeoJSON(&again, lines, tc.toOut, tc.z, tc.meta); err != nil || !bytes.Equal(again.Bytes(), buf.Bytes()) {
				t.Errorf("a second write differs (err %v)", err)
			}
		})
	}
}

// TestWriteTrianglesGeoJSON_Golden pins the bytes of a triangle file with z
// in feet and checks it against RFC 7946, including the counter-clockwise
// exterior rings it asks for even when the mapping mirrors the plan.
func TestWriteTrianglesGeoJSON_Golden(t *testing.T) {
	m := testMesh()
	var buf bytes.Buffer
	meta := GeoJSONMeta{CRSNote: "EPSG:2994; units ft"}
	if err := WriteTrianglesGeoJSON(&buf, m, toWorldFeet, 1/units.Foot, meta); err != nil {
		t.Fatal(err)
	}
	checkRFC7946(t, buf.Bytes(), meta, "Polygon")
	fc := decodeFC(t, buf.Bytes())
	if len(fc.Features) != m.NumTriangles() {
		t.Fatalf("%d features, want %d", len(fc.Features), m.NumTriangles())
	}
	for i, f := range fc.Features {
		var rings [][][]float64
		if err := json.Unmarshal(f.Geometry.Coordinates, &rings); err != nil {
			t.Fatal(err)
		}
		a, b, c := m.Triangle(i)
		var want float64 // corner elevations in feet
		for _, v := range []geom.Vec3{a, b, c} {
			want += v.Z / units.Foot
		}
		var got float64
		for _, p := range rings[0][:3] {
			if len(p) != 3 {
				t.Fatalf("feature %d position %v, want x, y, z", i, p)
			}
			got += p[2]
		}
		if math.Abs(got-want) > 2e-4 {
			t.Errorf("feature %d corner elevations sum to %g ft, want %g", i, got, want)
		}
	}
	geoJSONGolden(t, "geojson_triangles_ft.geojson", buf.Bytes())

	mirror := func(p geom.Vec2) (float64, float64) { return -p.X, p.Y }
	buf.Reset()
	if err := WriteTrianglesGeoJSON(&buf, m, mirror, 1, GeoJSONMeta{CRSNote: "mirrored local frame; m"}); err != nil {
		t.Fatal(err)
	}
	checkRFC7946(t, buf.Bytes(), meta, "Polygon")
}

type featureCollection struct {
	Type     string
	CRS      *string `json:"dugout:crs"`
	Features []struct {
		Type     string
		Geometry struct {
			Type        string
			Coordinates json.RawMessage
		}
		Properties json.RawMessage
	}
}

func decodeFC(tb testing.TB, b []byte) featureCollection {
	tb.Helper()
	var fc featureCollection
	if err := json.Unmarshal(b, &fc); err != nil {
		tb.Fatalf("output is not JSON: %v", err)
	}
	return fc
}

// checkRFC7946 checks the rules of RFC 7946 that the writers must keep: a
// FeatureCollection of Features (sections 3.2, 3.3); LineStrings of two or
// more positions (3.1.4); Polygon rings closed, of four or more positions,
// the exterior counter-clockwise (3.1.6); positions of two or three numbers
// (3.1.1), longitude and latitude within range when geographic (4); and the
// foreign member naming the coordinates otherwise (6.1).
func checkRFC7946(tb testing.TB, b []byte, meta GeoJSONMeta, geomType string) {
	tb.Helper()
	fc := decodeFC(tb, b)
	if fc.Type != "FeatureCollection" {
		tb.Fatalf("type %q, want FeatureCollection", fc.Type)
	}
	if !meta.Geographic && (fc.CRS == nil || *fc.CRS == "") {
		tb.Fatal(`non-geographic file has no "dugout:crs" member`)
	}
	pos := func(i int, p []float64) {
		if len(p) < 2 || len(p) > 3 {
			tb.Fatalf("feature %d: position %v", i, p)
		}
		if meta.Geographic && (math.Abs(p[0]) > 180 || math.Abs(p[1]) > 90) {
			tb.Fatalf("feature %d: position %v is not lon/lat", i, p)
		}
	}
	for i, f := range fc.Features {
		if f.Type != "Feature" || f.Geometry.Type != geomType {
			tb.Fatalf("feature %d: %s with %s geometry, want Feature with %s", i, f.Type, f.Geometry.Type, geomType)
		}
		switch geomType {
		case "LineString":
			var ps [][]float64
			if err := json.Unmarshal(f.Geometry.Coordinates, &ps); err != nil || len(ps) < 2 {
				tb.Fatalf("feature %d: LineString coordinates %s (%v)", i, f.Geometry.Coordinates, err)
			}
			var p struct{ Closed bool }
			if err := json.Unmarshal(f.Properties, &p); err != nil {
				tb.Fatal(err)
			}
			first, last := ps[0], ps[len(ps)-1]
			if p.Closed && (first[0] != last[0] || first[1] != last[1]) {
				tb.Fatalf("feature %d: closed %v but first %v last %v", i, p.Closed, first, last)
			}
			for _, q := range ps {
				pos(i, q)
			}
		case "Polygon":
			var rings [][][]float64
			if err := json.Unmarshal(f.Geometry.Coordinates, &rings); err != nil || len(rings) != 1 {
				tb.Fatalf("feature %d: Polygon coordinates %s (%v)", i, f.Geometry.Coordinates, err)
			}
			r := rings[0]
			if len(r) < 4 || r[0][0] != r[len(r)-1][0] || r[0][1] != r[len(r)-1][1] {
				tb.Fatalf("feature %d: ring %v not closed", i, r)
			}
			var area float64
			for k := 1; k < len(r); k++ {
				pos(i, r[k])
				area += r[k-1][0]*r[k][1] - r[k][0]*r[k-1][1]
			}
			if area <= 0 {
				tb.Fatalf("feature %d: exterior ring %v is not counter-clockwise", i, r)
			}
		}
	}
}

// TestGeoJSON_GDAL reads the written files with GDAL's GeoJSON driver
// (ogrinfo), an independent reader: it must accept them, see every
// feature with the geometry type and dimension written, and read back the
// properties.
func TestGeoJSON_GDAL(t *testing.T) {
	ogrinfo := reftest.Tool(t, "ogrinfo")
	dir := t.TempDir()
	lines := traceTestMesh(t)
	for _, tc := range []struct {
		name  string
		write func(*bytes.Buffer) error
		want  []string
	}{
		{"contours.geojson", func(b *bytes.Buffer) error {
			return WriteContoursGeoJSON(b, lines, toLonLat, 1, GeoJSONMeta{Geographic: true})
		}, []string{"Geometry: Line String", fmt.Sprintf("Feature Count: %d", len(lines)), "elevation: Real", "index: Integer(Boolean)", "closed: Integer(Boolean)"}},
		{"triangles.geojson", func(b *bytes.Buffer) error {
			return WriteTrianglesGeoJSON(b, testMesh(), toWorldFeet, 1/units.Foot, GeoJSONMeta{CRSNote: "EPSG:2994; units ft"})
		}, []string{"Geometry: 3D Polygon", "Feature Count: 32", "triangle: Integer"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var buf bytes.Buffer
			if err := tc.write(&buf); err != nil {
				t.Fatal(err)
			}
			path := filepath.Join(dir, tc.name)
			if err := os.WriteFile(path, buf.Bytes(), 0o644); err != nil {
				t.Fatal(err)
			}
			out, err := exec.Command(ogrinfo, "-ro", "-al", "-so", path).CombinedOutput()
			if err != nil {
				t.Fatalf("ogrinfo: %v\n%s", err, out)
			}
			for _, w := range tc.want {
				if !strings.Contains(string(out), w) {
					t.Errorf("ogrinfo output lacks %q:\n%s", w, out)
				}
			}
		})
	}
}

// failWriter fails every write.
type failWriter struct{}

var errDiskFull = errors.New("disk full")

func (failWriter) Write([]byte) (int, error) { return 0, errDiskFull }

// TestGeoJSON_Errors puts bad input through both writers.
func TestGeoJSON_Errors(t *testing.T) {
	good := traceTestMesh(t)
	local := GeoJSONMeta{CRSNote: "local frame; m"}
	nan := math.NaN()
	nanAt := func(p geom.Vec2) (float64, float64) {
		if p.X > 0.5 {
			return nan, p.Y
		}
		return p.X, p.Y
	}
	short := []contours.Line{{Level: 1, Pts: []geom.Vec2{{X: 1, Y: 2}}}}
	badLevel := []contours.Line{{Level: math.Inf(1), Pts: []geom.Vec2{{}, {X: 1}}}}
	mesh := testMesh()
	badIndex := geom.TriMesh{V: mesh.V, T: []int32{0, 1, 99}}
	badZ := geom.TriMesh{V: []geom.Vec3{{}, {X: 1}, {Y: 1, Z: nan}}, T: []int32{0, 1, 2}}
	ragged := geom.TriMesh{V: mesh.V, T: []int32{0, 1}}
	for _, tc := range []struct {
		name string
		err  error
		want error
		msg  string
	}{
		{"no note", WriteContoursGeoJSON(&bytes.Buffer{}, good, nil, 1, GeoJSONMeta{}), ErrNoCRSNote, ""},
		{"zero z scale", WriteContoursGeoJSON(&bytes.Buffer{}, good, nil, 0, local), ErrInvalidValue, "z scale"},
		{"nan coordinate", WriteContoursGeoJSON(&bytes.Buffer{}, good, nanAt, 1, local), ErrInvalidValue, "x = NaN"},
		{"one point", WriteContoursGeoJSON(&bytes.Buffer{}, short, nil, 1, local), ErrInvalidValue, "contour 0"},
		{"infinite level", WriteContoursGeoJSON(&bytes.Buffer{}, badLevel, nil, 1, local), ErrInvalidValue, "elevation"},
		{"not lon/lat", WriteContoursGeoJSON(&bytes.Buffer{}, good, toWorldFeet, 1, GeoJSONMeta{Geographic: true}), ErrInvalidValue, "longitude"},
		{"write fails", WriteContoursGeoJSON(failWriter{}, good, nil, 1, local), errDiskFull, ""},
		{"triangle index", WriteTrianglesGeoJSON(&bytes.Buffer{}, badIndex, nil, 1, local), ErrInvalidValue, "triangle 0"},
		{"triangle z", WriteTrianglesGeoJSON(&bytes.Buffer{}, badZ, nil, 1, local), ErrInvalidValue, "vertex 2"},
		{"ragged mesh", WriteTrianglesGeoJSON(&bytes.Buffer{}, ragged, nil, 1, local), ErrInvalidValue, "multiple of 3"},
		{"triangles write fails", WriteTrianglesGeoJSON(failWriter{}, mesh, nil, 1, local), errDiskFull, ""},
	} {
		t.Run(tc.name, func(t *testing.T) {
			if !errors.Is(tc.err, tc.want) || !strings.Contains(tc.err.Error(), tc.msg) {
				t.Errorf("error %v, want %v mentioning %q", tc.err, tc.want, tc.msg)
			}
		})
	}
}

// TestGeoJSON_Empty checks that no lines and an empty mesh still make
// valid, empty FeatureCollections.
func TestGeoJSON_Empty(t *testing.T) {
	var a, b bytes.Buffer
	if err := WriteContoursGeoJSON(&a, nil, nil, 1, GeoJSONMeta{CRSNote: "local frame; m"}); err != nil {
		t.Fatal(err)
	}
	if err := WriteTrianglesGeoJSON(&b, geom.TriMesh{}, nil, 1, GeoJSONMeta{Geographic: true}); err != nil {
		t.Fatal(err)
	}
	for _, got := range []string{a.String(), b.String()} {
		fc := decodeFC(t, []byte(got))
		if fc.Type != "FeatureCollection" || len(fc.Features) != 0 {
			t.Errorf("empty output %q", got)
		}
	}
	if want := "{\"type\":\"FeatureCollection\",\"dugout:crs\":\"local frame; m\",\"features\":[\n]}\n"; a.String() != want {
		t.Errorf("empty contours = %q, want %q", a.String(), want)
	}
}

// TestFormatFixed checks the number format of elevations: fixed decimals,
// trailing zeros dropped, no negative zero.
func TestFormatFixed(t *testing.T) {
	for _, tc := range []struct {
		v    float64
		want string
	}{
		{100.5, "100.5"}, {100, "100"}, {0, "0"}, {-3.25, "-3.25"}, {1.23456, "1.2346"}, {1e-5, "0"},
	} {
		gw := &geoJSONWriter{}
		if got := formatFixed(gw.round(tc.v, geoJSONElevationDigits), geoJSONElevationDigits); got != tc.want {
			t.Errorf("formatFixed(%g) = %q, want %q", tc.v, got, tc.want)
		}
	}
	if got := formatFixed(new(geoJSONWriter).round(-1e-9, 4), 4); !regexp.MustCompile(`^0$`).MatchString(got) {
		t.Errorf("formatFixed(-1e-9) = %q, want 0", got)
	}
}

// ExampleWriteContoursGeoJSON writes the 1 m contour of a small square
// hill in its local frame.
func ExampleWriteContoursGeoJSON() {
	hill := geom.TriMesh{
		V: []geom.Vec3{{X: 0, Y: 0, Z: 2}, {X: -2, Y: -2}, {X: 2, Y: -2}, {X: 2, Y: 2}, {X: -2, Y: 2}},
		T: []int32{0, 1, 2, 0, 2, 3, 0, 3, 4, 0, 4, 1},
	}
	lines := contours.TraceLevel(hill, 1)
	err := WriteContoursGeoJSON(os.Stdout, lines, nil, 1, GeoJSONMeta{CRSNote: "local frame; units m"})
	if err != nil {
		fmt.Println(err)
	}
	// Output:
	// {"type":"FeatureCollection","dugout:crs":"local frame; units m","features":[
	// {"type":"Feature","geometry":{"type":"LineString","coordinates":[[-1,-1],[1,-1],[1,1],[-1,1],[-1,-1]]},"properties":{"elevation":1,"index":false,"closed":true}}
	// ]}
}

// FuzzWriteContoursGeoJSON checks that any line either is rejected with an
// error or is written as valid RFC 7946 output.
func FuzzWriteContoursGeoJSON(f *testing.F) {
	f.Add(1.0, 0.0, 0.0, 1.0, 1.0, true)
	f.Add(math.NaN(), 0.0, 0.0, 1.0, 1.0, false)
	f.Add(1e308, -1e308, 5e-324, 1.0, -0.0, true)
	f.Add(2.0, 3.0, 4.0, 3.0, 4.0, false)
	f.Fuzz(func(t *testing.T, level, x0, y0, x1, y1 float64, closed bool) {
		lines := []contours.Line{{Level: level, Closed: closed, Pts: []geom.Vec2{{X: x0, Y: y0}, {X: x1, Y: y1}}}}
		var buf bytes.Buffer
		meta := GeoJSONMeta{CRSNote: "local frame; m"}
		if err := WriteContoursGeoJSON(&buf, lines, nil, 1, meta); err != nil {
			return
		}
		if !json.Valid(buf.Bytes()) {
			t.Fatalf("invalid JSON: %s", buf.Bytes())
		}
		checkRFC7946(t, buf.Bytes(), meta, "LineString")
	})
}
