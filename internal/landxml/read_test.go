package landxml

import (
	"bytes"
	"errors"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/robust"
	"github.com/dugout-estimating/dugout/internal/units"
)

func readFile(tb testing.TB, name string) []Surface {
	tb.Helper()
	f, err := os.Open(filepath.Join("testdata", name))
	if err != nil {
		tb.Fatal(err)
	}
	defer f.Close()
	s, err := Read(f)
	if err != nil {
		tb.Fatalf("Read(%s): %v", name, err)
	}
	return s
}

// checkMesh asserts the invariants Read promises: indices in range, finite
// vertices, every triangle counter-clockwise by the exact predicate.
func checkMeshInvariants(tb testing.TB, s Surface) {
	tb.Helper()
	m := s.Mesh
	if len(s.IDs) != len(m.V) || len(m.T)%3 != 0 {
		tb.Fatalf("surface %q: %d ids for %d vertices, %d indices", s.Name, len(s.IDs), len(m.V), len(m.T))
	}
	for _, v := range m.V {
		if !v.IsFinite() {
			tb.Fatalf("surface %q: vertex %v", s.Name, v)
		}
	}
	for t := range m.NumTriangles() {
		for k := range 3 {
			if i := m.T[3*t+k]; i < 0 || int(i) >= len(m.V) {
				tb.Fatalf("surface %q: triangle %d index %d of %d", s.Name, t, i, len(m.V))
			}
		}
		a, b, c := m.Triangle(t)
		if robust.Orient2D(a.XY(), b.XY(), c.XY()) != robust.Positive {
			tb.Fatalf("surface %q: triangle %d is not counter-clockwise", s.Name, t)
		}
	}
}

// TestRead_ImperialUSSurveyFoot reads the hand-written testdata document:
// a 100 × 100 ftUS pad with a centre point 10 ftUS up, Units after the
// Surfaces, ids 10, 20, 30, 40, −5 and 99, two clockwise faces and one
// invisible face.
func TestRead_ImperialUSSurveyFoot(t *testing.T) {
	got := readFile(t, "pyramid_usft.xml")
	if len(got) != 1 {
		t.Fatalf("%d surfaces, want 1", len(got))
	}
	s := got[0]
	checkMeshInvariants(t, s)
	if s.Name != "Existing Ground" || s.Description != "pad & mound" || s.Units != USFeet || s.EPSG != 2903 {
		t.Errorf("surface %q %q units %v EPSG %d, want Existing Ground, pad & mound, usft, 2903", s.Name, s.Description, s.Units, s.EPSG)
	}
	if len(s.Mesh.V) != 6 || s.Mesh.NumTriangles() != 4 {
		t.Fatalf("%d points %d faces, want 6 and 4 (the i=\"1\" face skipped)", len(s.Mesh.V), s.Mesh.NumTriangles())
	}
	wantIDs := []int64{10, 20, 30, 40, -5, 99}
	for i, id := range wantIDs {
		if s.IDs[i] != id {
			t.Errorf("IDs = %v, want %v", s.IDs, wantIDs)
			break
		}
	}
	// P id=-5 is "1454550.00 1639650.00 7010.00": northing, easting,
	// elevation in US survey feet (1200/3937 m, 85 FR 62698).
	c := s.Mesh.V[4]
	ftUS := units.USSurveyFoot // a variable, so the products round as at run time
	if want := v3(1639650*ftUS, 1454550*ftUS, 7010*ftUS); c != want {
		t.Errorf("P -5 = %v, want %v (x = easting, y = northing, in metres)", c, want)
	}
	// Analytic: the four faces tile the 100 × 100 ftUS square, so their plan
	// area is 10 000 ftUS²; each is a triangle of base 100 and slant height
	// √(50² + 10²), so the 3-D area is 200·√2600 ftUS².
	var plan, area geom.Sum
	for t := range s.Mesh.NumTriangles() {
		a, b, c := s.Mesh.Triangle(t)
		plan.Add(geom.PlanArea(a, b, c))
		area.Add(geom.SurfaceArea(a, b, c))
	}
	ft2 := units.USSurveyFoot * units.USSurveyFoot
	if want := 10000 * ft2; math.Abs(plan.Value()-want) > 1e-6 {
		t.Errorf("plan area %.6f m², want %.6f", plan.Value(), want)
	}
	if want := 200 * math.Sqrt(2600) * ft2; math.Abs(area.Value()-want) > 1e-6 {
		t.Errorf("surface area %.6f m², want %.6f", area.Value(), want)
	}
	if len(s.Warnings) != 1 || !strings.Contains(s.Warnings[0], "1 invisible") {
		t.Errorf("warnings %q, want one about the invisible face", s.Warnings)
	}
}

func TestRead_Variants(t *testing.T) {
	const head = `<?xml version="1.0"?><LandXML xmlns="http://www.landxml.org/schema/LandXML-1.1" version="1.1">`
	two := head + `<Units><Metric linearUnit="meter" areaUnit="squareMeter" volumeUnit="cubicMeter"/></Units><Surfaces>
<Surface name="a"><Definition surfType="TIN"><Pnts><P id="1">0 0 1</P><P id="2">0 1 1</P><P id="3">1 1 1</P><P id="4">1 0 1</P></Pnts>
<Faces><F>1 2 3</F><F>1 3 4</F></Faces></Definition></Surface>
<Surface name="b"><Definition><Pnts><P id="1">0 0 0</P><P id="2">0 2 0</P><P id="3">0 4 0</P><P id="4">2 0 0</P></Pnts>
<Faces><F>1 2 3</F><F>1 2 4</F></Faces></Definition></Surface></Surfaces></LandXML>`
	got, err := Read(strings.NewReader(two))
	if err != nil {
		t.Fatal(err)
	}
	if len(got) != 2 || got[0].Name != "a" || got[1].Name != "b" {
		t.Fatalf("surfaces %+v, want a and b", got)
	}
	for _, s := range got {
		checkMeshInvariants(t, s)
	}
	// In "a", P is northing easting: "0 1 1" is x = 1, y = 0, and the face
	// 1 2 3 = (0,0) (1,0) (1,1) is counter-clockwise as written, while
	// 1 3 4 = (0,0) (1,1) (0,1) is too; "b"'s first face is collinear.
	if a := got[0]; a.Mesh.V[1] != v3(1, 0, 1) || !equalInt32(a.Mesh.T, []int32{0, 1, 2, 0, 2, 3}) {
		t.Errorf("surface a: V[1] = %v, T = %v", a.Mesh.V[1], a.Mesh.T)
	}
	if b := got[1]; b.Mesh.NumTriangles() != 1 || len(b.Warnings) != 1 || !strings.Contains(b.Warnings[0], "1 faces of zero plan area") {
		t.Errorf("surface b: %d triangles, warnings %q, want 1 and one about the collinear face", b.Mesh.NumTriangles(), b.Warnings)
	}

	// No <Units>: metres assumed, with a warning.
	noUnits := head + `<Surfaces><Surface name="n"><Definition surfType="TIN"><Pnts><P id="1">0 0 0</P><P id="2">0 1 0</P><P id="3">1 0 0</P></Pnts>
<Faces><F>1 2 3</F></Faces></Definition></Surface></Surfaces></LandXML>`
	got, err = Read(strings.NewReader(noUnits))
	if err != nil || len(got) != 1 || got[0].Units != Metres || len(got[0].Warnings) != 1 {
		t.Errorf("no Units: %+v, %v", got, err)
	}

	// ISO-8859-1 document: "Étang" in Latin-1 bytes.
	latin := "<?xml version=\"1.0\" encoding=\"ISO-8859-1\"?><LandXML><Units><Imperial linearUnit=\"foot\"/></Units><Surfaces>" +
		"<Surface name=\"\xC9tang\"><Definition surfType=\"TIN\"><Pnts><P id=\"1\">0 0 0</P><P id=\"2\">0 1 0</P><P id=\"3\">1 0 0</P></Pnts>" +
		"<Faces><F>1 2 3</F></Faces></Definition></Surface></Surfaces></LandXML>"
	got, err = Read(strings.NewReader(latin))
	if err != nil || len(got) != 1 || got[0].Name != "Étang" || got[0].Units != Feet || got[0].Mesh.V[1].X != units.Foot {
		t.Errorf("Latin-1 document: %+v, %v", got, err)
	}
}

// TestRead_BadInput is the table of malformed documents: each gives a
// *ParseError naming the element (and point id or face number) and
// wrapping the right sentinel.
func TestRead_BadInput(t *testing.T) {
	wrap := func(def string) string {
		return `<LandXML xmlns="http://www.landxml.org/schema/LandXML-1.2"><Units><Metric linearUnit="meter"/></Units>` +
			"<Surfaces><Surface name=\"s\">\n" + def + "\n</Surface></Surfaces></LandXML>"
	}
	pnts := `<Pnts><P id="1">0 0 0</P><P id="2">0 1 0</P><P id="3">1 0 0</P></Pnts>`
	tests := []struct {
		name    string
		doc     string
		want    error
		element string
		id      string
		line    int
	}{
		{"missing_definition", wrap(`<SourceData/>`), ErrMissing, "Surface", "s", 1},
		{"missing_pnts", wrap(`<Definition surfType="TIN"><Faces/></Definition>`), ErrMissing, "Surface", "s", 1},
		{"missing_faces", wrap(`<Definition surfType="TIN">` + pnts + `</Definition>`), ErrMissing, "Surface", "s", 1},
		{"unknown_point", wrap(`<Definition surfType="TIN">` + pnts + "<Faces><F>1 2 3</F>\n<F>1 2 7</F></Faces></Definition>"), ErrUnknownPoint, "F", "#2", 3},
		{"non_numeric_coordinate", wrap(`<Definition surfType="TIN"><Pnts><P id="1">0 0 0</P><P id="2">0 one 0</P></Pnts><Faces/></Definition>`), ErrSyntax, "P", "2", 2},
		{"nan_coordinate", wrap(`<Definition surfType="TIN"><Pnts><P id="1">0 0 NaN</P></Pnts><Faces/></Definition>`), ErrNonFinite, "P", "1", 2},
		{"inf_coordinate", wrap(`<Definition surfType="TIN"><Pnts><P id="1">-Inf 0 0</P></Pnts><Faces/></Definition>`), ErrNonFinite, "P", "1", 2},
		{"hex_coordinate", wrap(`<Definition surfType="TIN"><Pnts><P id="1">0x10 0 0</P></Pnts><Faces/></Definition>`), ErrSyntax, "P", "1", 2},
		{"two_numbers", wrap(`<Definition surfType="TIN"><Pnts><P id="1">0 0</P></Pnts><Faces/></Definition>`), ErrSyntax, "P", "1", 2},
		{"missing_id", wrap(`<Definition surfType="TIN"><Pnts><P>0 0 0</P></Pnts><Faces/></Definition>`), ErrMissing, "P", "", 2},
		{"non_integer_id", wrap(`<Definition surfType="TIN"><Pnts><P id="a7">0 0 0</P></Pnts><Faces/></Definition>`), ErrSyntax, "P", "a7", 2},
		{"duplicate_id", wrap(`<Definition surfType="TIN"><Pnts><P id="4">0 0 0</P><P id="4">1 0 0</P></Pnts><Faces/></Definition>`), ErrDuplicatePoint, "P", "4", 2},
		{"quad_face", wrap(`<Definition surfType="TIN">` + pnts + `<Faces><F>1 2 3 1</F></Faces></Definition>`), ErrSyntax, "F", "#1", 2},
		{"non_integer_face", wrap(`<Definition surfType="TIN">` + pnts + `<Faces><F>1 2 x</F></Faces></Definition>`), ErrSyntax, "F", "#1", 2},
		{"grid_surface", wrap(`<Definition surfType="grid">` + pnts + `</Definition>`), ErrUnsupported, "Definition", "s", 2},
		{"element_inside_p", wrap(`<Definition surfType="TIN"><Pnts><P id="1">0 <b/>0 0</P></Pnts><Faces/></Definition>`), ErrSyntax, "P", "1", 2},
		{"unit_millimetre", `<LandXML><Units><Metric linearUnit="millimeter"/></Units></LandXML>`, ErrUnsupported, "Metric", "", 1},
		{"imperial_meter", `<LandXML><Units><Imperial linearUnit="meter"/></Units></LandXML>`, ErrUnsupported, "Imperial", "", 1},
		{"units_without_linear", `<LandXML><Units><Metric areaUnit="squareMeter"/></Units></LandXML>`, ErrMissing, "Metric", "", 1},
		{"bad_epsg", `<LandXML><CoordinateSystem epsgCode="EPSG:2903"/></LandXML>`, ErrSyntax, "CoordinateSystem", "", 1},
		{"no_surface", `<LandXML><Units><Metric linearUnit="meter"/></Units></LandXML>`, ErrMissing, "LandXML", "", 0},
		{"wrong_root", `<GeoJSON/>`, ErrSyntax, "GeoJSON", "", 1},
		{"empty", ``, ErrSyntax, "document", "", 0},
		{"not_xml", "x,y,z\n1,2,3\n", ErrSyntax, "document", "", 0},
		{"unclosed", "<LandXML><Surfaces>\n<Surface name=\"s\">", ErrSyntax, "document", "", 2},
		{"mismatched_tag", "<LandXML>\n</Surfaces>", ErrSyntax, "document", "", 2},
		{"unknown_encoding", `<?xml version="1.0" encoding="EBCDIC"?><LandXML/>`, ErrSyntax, "document", "", 1},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			s, err := Read(strings.NewReader(tc.doc))
			if !errors.Is(err, tc.want) {
				t.Fatalf("Read = %v, %v, want %v", s, err, tc.want)
			}
			var pe *ParseError
			if !errors.As(err, &pe) {
				t.Fatalf("Read error %T %v, want *ParseError", err, err)
			}
			if pe.Element != tc.element || pe.ID != tc.id || (tc.line != 0 && pe.Line != tc.line) {
				t.Errorf("ParseError{Line %d, Element %q, ID %q}, want line %d, %q, %q (%v)", pe.Line, pe.Element, pe.ID, tc.line, tc.element, tc.id, err)
			}
			if !strings.HasPrefix(err.Error(), "landxml: ") || strings.Count(err.Error(), "landxml:") != 1 {
				t.Errorf("message %q, want one landxml: prefix", err.Error())
			}
		})
	}
}

// FuzzRead reads arbitrary documents: never a panic, errors are
// *ParseErrors, and on success every surface keeps Read's invariants.
func FuzzRead(f *testing.F) {
	for _, name := range []string{"pyramid_usft.xml", "golden_two_triangles_usft.xml"} {
		b, err := os.ReadFile(filepath.Join("testdata", name))
		if err != nil {
			f.Fatal(err)
		}
		f.Add(b)
		f.Add(b[:len(b)/2])
	}
	var buf bytes.Buffer
	if err := Write(&buf, gridMesh(4, 3), WriteOptions{Units: Feet, EPSG: 2994}); err != nil {
		f.Fatal(err)
	}
	f.Add(buf.Bytes())
	f.Fuzz(func(t *testing.T, b []byte) {
		got, err := Read(bytes.NewReader(b))
		if err != nil {
			var pe *ParseError
			if !errors.As(err, &pe) {
				t.Fatalf("error %T %v is not a *ParseError", err, err)
			}
			return
		}
		for _, s := range got {
			checkMeshInvariants(t, s)
		}
	})
}

// BenchmarkRead100k reads a 100 000-triangle document written by Write.
func BenchmarkRead100k(b *testing.B) {
	var buf bytes.Buffer
	if err := Write(&buf, gridMesh(201, 251), WriteOptions{Units: Metres}); err != nil {
		b.Fatal(err)
	}
	doc := buf.Bytes()
	b.SetBytes(int64(len(doc)))
	b.ReportAllocs()
	for b.Loop() {
		s, err := Read(bytes.NewReader(doc))
		if err != nil || s[0].Mesh.NumTriangles() != 100000 {
			b.Fatal(err)
		}
	}
}
