package landxml

import (
	"bytes"
	"errors"
	"flag"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/reftest"
	"github.com/dugout-estimating/dugout/internal/units"
)

var update = flag.Bool("update", false, "rewrite the golden files in testdata")

func v3(x, y, z float64) geom.Vec3 { return geom.Vec3{X: x, Y: y, Z: z} }

// gridMesh returns an nx × ny lattice of vertices 1.25 m apart with a
// sloping, wavy elevation, split into counter-clockwise triangles:
// 2(nx−1)(ny−1) of them.
func gridMesh(nx, ny int) geom.TriMesh {
	var m geom.TriMesh
	m.V = make([]geom.Vec3, 0, nx*ny)
	for j := range ny {
		for i := range nx {
			x, y := 1.25*float64(i)-40, 1.25*float64(j)-30
			m.V = append(m.V, v3(x, y, 100+0.02*x+0.01*y+0.5*math.Sin(x/7)*math.Cos(y/5)))
		}
	}
	m.T = make([]int32, 0, 6*(nx-1)*(ny-1))
	for j := range ny - 1 {
		for i := range nx - 1 {
			a := int32(j*nx + i)
			b, c, d := a+1, a+int32(nx)+1, a+int32(nx)
			m.T = append(m.T, a, b, c, a, c, d)
		}
	}
	return m
}

// TestWrite_RoundTrip writes and reads back in each unit, with a UTM-sized
// frame origin: the mesh returns in world metres within the printed
// precision (half of 10^-Decimals of the unit, plus float64 round-off of
// the conversion).
func TestWrite_RoundTrip(t *testing.T) {
	m := gridMesh(9, 7)
	frame := geom.Frame{Origin: geom.Vec2{X: 494513, Y: 4878339}}
	for _, u := range []Units{Metres, Feet, USFeet} {
		t.Run(u.String(), func(t *testing.T) {
			var buf bytes.Buffer
			opt := WriteOptions{Name: "EG", Description: "existing ground", Units: u, EPSG: 32610, Frame: frame,
				Created: time.Date(2026, 4, 5, 6, 7, 8, 0, time.UTC)}
			if err := Write(&buf, m, opt); err != nil {
				t.Fatal(err)
			}
			got, err := Read(&buf)
			if err != nil {
				t.Fatal(err)
			}
			if len(got) != 1 {
				t.Fatalf("Read returned %d surfaces, want 1", len(got))
			}
			s := got[0]
			if s.Name != "EG" || s.Description != "existing ground" || s.Units != u || s.EPSG != 32610 || len(s.Warnings) != 0 {
				t.Errorf("surface %q %q units %v EPSG %d warnings %q", s.Name, s.Description, s.Units, s.EPSG, s.Warnings)
			}
			tol := 0.5*math.Pow10(-Decimals)*u.Metres() + 1e-9
			if len(s.Mesh.V) != len(m.V) {
				t.Fatalf("%d vertices, want %d", len(s.Mesh.V), len(m.V))
			}
			for i, v := range m.V {
				w := frame.ToWorld(v.XY())
				g := s.Mesh.V[i]
				if math.Abs(g.X-w.X) > tol || math.Abs(g.Y-w.Y) > tol || math.Abs(g.Z-v.Z) > tol {
					t.Fatalf("vertex %d = %v, want (%v, %v, %v) within %g m", i, g, w.X, w.Y, v.Z, tol)
				}
				if s.IDs[i] != int64(i+1) {
					t.Fatalf("vertex %d id %d, want %d", i, s.IDs[i], i+1)
				}
			}
			if !equalInt32(s.Mesh.T, m.T) {
				t.Errorf("triangles differ after the round trip")
			}
		})
	}
}

func equalInt32(a, b []int32) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}

// TestWrite_Golden pins the exact text of a two-triangle document.
func TestWrite_Golden(t *testing.T) {
	m := geom.TriMesh{
		V: []geom.Vec3{v3(0, 0, 10), v3(3, 0, 10.5), v3(3, 4, 11), v3(-0.00001, 4, 9.25)},
		T: []int32{0, 1, 2, 0, 2, 3},
	}
	var buf bytes.Buffer
	err := Write(&buf, m, WriteOptions{Name: `Pond "A" & <B>`, Units: USFeet, EPSG: 2903,
		Frame: geom.Frame{Origin: geom.Vec2{X: 1000, Y: 2000}}, Created: time.Date(2026, 12, 2, 9, 30, 0, 0, time.UTC)})
	if err != nil {
		t.Fatal(err)
	}
	golden := filepath.Join("testdata", "golden_two_triangles_usft.xml")
	if *update {
		if err := os.WriteFile(golden, buf.Bytes(), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	want, err := os.ReadFile(golden)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(buf.Bytes(), want) {
		t.Errorf("Write output differs from %s (run go test -update to accept):\n%s", golden, buf.Bytes())
	}
	// Vertex 0 in US survey feet (1 ftUS = 1200/3937 m exactly, 85 FR
	// 62698): northing 2000 m = 6561.6667, easting 1000 m = 3280.8333,
	// elevation 10 m = 32.8083 ftUS (32.8084 would be international feet).
	if !strings.Contains(buf.String(), `<P id="1">6561.6667 3280.8333 32.8083</P>`) {
		t.Errorf("vertex 1 not written as northing easting elevation in ftUS:\n%s", buf.String())
	}
}

// TestWrite_PythonXML checks the document with an independent XML parser,
// Python's xml.etree.ElementTree (GDAL has no LandXML TIN driver): it must
// be well-formed, in the LandXML 1.2 namespace, and hold the right numbers
// of P and F elements, the units and the coordinate system.
func TestWrite_PythonXML(t *testing.T) {
	py := reftest.Python(t, "xml.etree.ElementTree")
	m := gridMesh(30, 20)
	path := filepath.Join(t.TempDir(), "eg.xml")
	f, err := os.Create(path)
	if err != nil {
		t.Fatal(err)
	}
	if err := Write(f, m, WriteOptions{Name: "EG & pond", Units: Feet, EPSG: 2994}); err != nil {
		t.Fatal(err)
	}
	if err := f.Close(); err != nil {
		t.Fatal(err)
	}
	script := `
import sys, xml.etree.ElementTree as ET
ns = {"l": "http://www.landxml.org/schema/LandXML-1.2"}
root = ET.parse(sys.argv[1]).getroot()
s = root.find("l:Surfaces/l:Surface", ns)
d = s.find("l:Definition", ns)
p = d.findall("l:Pnts/l:P", ns)
f = d.findall("l:Faces/l:F", ns)
ids = set(e.get("id") for e in p)
bad = sum(1 for e in f for i in e.text.split() if i not in ids)
imp = root.find("l:Units/l:Imperial", ns)
print(root.tag, root.get("version"), s.get("name"), d.get("surfType"), len(p), len(f), bad,
      imp.get("linearUnit"), root.find("l:CoordinateSystem", ns).get("epsgCode"),
      root.find("l:Application", ns).get("name"), sep="|")
`
	out, err := exec.Command(py, "-c", script, path).CombinedOutput()
	if err != nil {
		t.Fatalf("python xml.etree: %v\n%s", err, out)
	}
	want := strings.Join([]string{"{" + Namespace + "}LandXML", "1.2", "EG & pond", "TIN", "600", "1102", "0", "foot", "2994", "dugout"}, "|")
	if got := strings.TrimSpace(string(out)); got != want {
		t.Errorf("xml.etree reads %q, want %q", got, want)
	}
}

func TestWrite_BadMesh(t *testing.T) {
	good := gridMesh(3, 3)
	tests := []struct {
		name string
		m    geom.TriMesh
		opt  WriteOptions
	}{
		{"ragged_triangles", geom.TriMesh{V: good.V, T: good.T[:5]}, WriteOptions{}},
		{"index_too_large", geom.TriMesh{V: good.V, T: []int32{0, 1, 9}}, WriteOptions{}},
		{"negative_index", geom.TriMesh{V: good.V, T: []int32{0, -1, 2}}, WriteOptions{}},
		{"nan_vertex", geom.TriMesh{V: []geom.Vec3{v3(0, 0, math.NaN()), v3(1, 0, 0), v3(0, 1, 0)}, T: []int32{0, 1, 2}}, WriteOptions{}},
		{"inf_origin", good, WriteOptions{Frame: geom.Frame{Origin: geom.Vec2{X: math.Inf(1)}}}},
		{"unknown_units", good, WriteOptions{Units: Units(9)}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			var buf bytes.Buffer
			if err := Write(&buf, tc.m, tc.opt); !errors.Is(err, ErrMesh) || buf.Len() != 0 {
				t.Errorf("Write = %v with %d bytes written, want ErrMesh and nothing written", err, buf.Len())
			}
		})
	}
	// An empty mesh is a valid (empty) surface.
	var buf bytes.Buffer
	if err := Write(&buf, geom.TriMesh{}, WriteOptions{}); err != nil {
		t.Fatalf("Write(empty) = %v", err)
	}
	s, err := Read(&buf)
	if err != nil || len(s) != 1 || len(s[0].Mesh.V) != 0 || len(s[0].Mesh.T) != 0 || s[0].Name != "surface" {
		t.Errorf("empty mesh round trip = %+v, %v", s, err)
	}
}

// failWriter accepts n bytes, then fails.
type failWriter struct{ n int }

var errDisk = errors.New("disk full")

func (w *failWriter) Write(p []byte) (int, error) {
	if len(p) > w.n {
		k := w.n
		w.n = 0
		return k, errDisk
	}
	w.n -= len(p)
	return len(p), nil
}

// TestWrite_StickyError: a failing writer's first error is returned once,
// wrapped, however far into the document it happens.
func TestWrite_StickyError(t *testing.T) {
	m := gridMesh(60, 60) // ~300 kB, several buffer flushes
	for _, n := range []int{0, 100, 70000, 200000} {
		if err := Write(&failWriter{n: n}, m, WriteOptions{}); !errors.Is(err, errDisk) {
			t.Errorf("Write to a writer failing after %d bytes = %v, want errDisk", n, err)
		}
	}
}

func TestUnits(t *testing.T) {
	// Exact factors: 0.3048 m and 1200/3937 m (85 FR 62698).
	for u, want := range map[Units]float64{Metres: 1, Feet: units.Foot, USFeet: units.USSurveyFoot, Units(5): 0} {
		if got := u.Metres(); got != want {
			t.Errorf("%v.Metres() = %v, want %v", u, got, want)
		}
	}
}

// BenchmarkWrite1M writes a 1 000 000-triangle mesh (501 × 1001 vertices).
func BenchmarkWrite1M(b *testing.B) {
	m := gridMesh(501, 1001)
	if m.NumTriangles() != 1000000 {
		b.Fatalf("%d triangles", m.NumTriangles())
	}
	opt := WriteOptions{Name: "EG", Units: USFeet, Frame: geom.Frame{Origin: geom.Vec2{X: 494513, Y: 4878339}}}
	var cw countWriter
	b.ReportAllocs()
	for b.Loop() {
		cw = 0
		if err := Write(&cw, m, opt); err != nil {
			b.Fatal(err)
		}
	}
	b.SetBytes(int64(cw))
}

type countWriter int64

func (c *countWriter) Write(p []byte) (int, error) { *c += countWriter(len(p)); return len(p), nil }

func TestAppendNum(t *testing.T) {
	tests := []struct {
		v    float64
		want string
	}{
		{0, "0.0000"},
		{-0.00001, "0.0000"}, // rounds to zero: no "-0.0000"
		{math.Copysign(0, -1), "0.0000"},
		{-0.00006, "-0.0001"},
		{1454500.00004, "1454500.0000"},
		{4878339.30030, "4878339.3003"},
	}
	for _, tc := range tests {
		if got := string(appendNum(nil, tc.v)); got != tc.want {
			t.Errorf("appendNum(%v) = %q, want %q", tc.v, got, tc.want)
		}
	}
}
