package survey

import (
	"errors"
	"math"
	"strings"
	"testing"
)

func TestReadGeoJSON_Site(t *testing.T) {
	s := mustRead(t, Options{}, "testdata/site.geojson")
	checkInvariants(t, s, false)
	if len(s.Points) != 6 || len(s.Boundaries) != 1 {
		t.Fatalf("got %d points, %d boundaries, want 6 and 1", len(s.Points), len(s.Boundaries))
	}
	// The LineString is a breakline; the shots coded BL1 join into another.
	var names []string
	for _, l := range s.Breaklines {
		names = append(names, l.Name)
	}
	if len(s.Breaklines) != 2 || s.Breaklines[0].Name != "toe of wall" || len(s.Breaklines[0].Pts) != 3 || s.Breaklines[1].Name != "BL1" {
		t.Errorf("breaklines %v, want [toe of wall, BL1]", names)
	}
	p := s.Points[0]
	// RFC 7946 §3.1.1: the third position element is the altitude in
	// metres, whatever --units says.
	if p.ID != "1" || p.Code != "CP1 control nail" || p.HAccM != 0.4 || !closeTo(p.P.Z, 240.48, 1e-12) || p.Line != 3 {
		t.Errorf("first point = %+v, want id 1, code, hacc 0.4, z 240.48, line 3", p)
	}
	if s.Points[5].Line != 8 {
		t.Errorf("sixth point on line %d, want 8", s.Points[5].Line)
	}
	b := s.Boundaries[0]
	// The closed GeoJSON ring is stored open.
	if b.Name != "survey limit" || len(b.Ring) != 4 || b.Feature != 8 {
		t.Errorf("boundary = %+v, want survey limit, 4 vertices, feature 8", b)
	}
	if !s.Geographic || s.CRS.EPSG != 32615 {
		t.Errorf("CRS = %v geographic %v, want EPSG:32615", s.CRS, s.Geographic)
	}
}

func TestReadGeoJSON_Projected(t *testing.T) {
	// Not RFC 7946: an old "crs" member and projected values. Accepted
	// only when --crs names the system.
	doc := `{"type":"FeatureCollection","crs":{"type":"name","properties":{"name":"urn:ogc:def:crs:EPSG::2994"}},
"features":[{"type":"Feature","properties":{"name":"a"},"geometry":{"type":"Point","coordinates":[636001.76,848935.85,406.26]}}]}`
	if _, err := readString(t, "p.geojson", doc, Options{}); !errors.Is(err, ErrCRS) {
		t.Fatalf("Read with --crs auto = %v, want ErrCRS", err)
	}
	s, err := readString(t, "p.geojson", doc, Options{CRS: mustSpec(t, "EPSG:2994"), Units: 1})
	if err != nil {
		t.Fatal(err)
	}
	x, y, z := s.WorldPos(s.Points[0].P, 1)
	if s.Geographic || s.CRS.EPSG != 2994 || !closeTo(x, 636001.76, 1e-6) || !closeTo(y, 848935.85, 1e-6) || !closeTo(z, 406.26, 1e-9) {
		t.Errorf("got %v %v %v in %v, want the projected values in EPSG:2994", x, y, z, s.CRS)
	}
	// A bare geometry and a single Feature are documents too.
	for _, d := range []string{`{"type":"Point","coordinates":[-92.8,44.0,200]}`,
		`{"type":"Feature","id":7,"properties":null,"geometry":{"type":"MultiPoint","coordinates":[[-92.8,44.0,200],[-92.8001,44.0,201]]}}`} {
		s, err := readString(t, "g.json", d, Options{})
		if err != nil {
			t.Fatalf("%s: %v", d, err)
		}
		checkInvariants(t, s, false)
	}
}

func TestReadGeoJSON_LocalGrid(t *testing.T) {
	// Small numbers are valid lon/lat; with --crs local they are a site grid.
	doc := `{"type":"Feature","properties":{},"geometry":{"type":"LineString","coordinates":[[10,20,1],[30,40,2]]}}`
	s, err := readString(t, "l.geojson", doc, Options{CRS: mustSpec(t, "local")})
	if err != nil {
		t.Fatal(err)
	}
	if s.Geographic || len(s.Breaklines) != 1 || math.Abs(s.Breaklines[0].Length()-math.Hypot(20, 20)) > 1e-9 {
		t.Errorf("got %+v, want one local breakline of length 28.28", s.Breaklines)
	}
}

func TestReadGeoJSON_Bad(t *testing.T) {
	pt := func(c string) string {
		return `{"type":"FeatureCollection","features":[{"type":"Feature","properties":{},"geometry":{"type":"Point","coordinates":` + c + `}}]}`
	}
	tests := []struct {
		name, doc string
		want      error
	}{
		{"invalid JSON", `{"type":"FeatureCollection","features":[`, ErrSyntax},
		{"array", `[1,2]`, ErrFormat},
		{"no type", `{"features":[]}`, ErrFormat},
		{"unknown type", `{"type":"Topology"}`, ErrFormat},
		{"no features", `{"type":"FeatureCollection"}`, ErrSyntax},
		{"empty features", `{"type":"FeatureCollection","features":[]}`, ErrEmpty},
		{"one coordinate", pt(`[1]`), ErrSyntax},
		{"projected values, auto", pt(`[636001.76,848935.85,406.26]`), ErrCRS},
		{"lat, lon order", pt(`[44.04,-92.84,200]`), ErrCRS},
		{"no altitude", pt(`[-92.84,44.04]`), ErrNoElevation},
		{"not a number", pt(`[-92.84,"44.04",1]`), ErrSyntax},
		{"overflow", pt(`[-92.84,44.04,1e400]`), ErrSyntax},
		{"degenerate ring", `{"type":"Polygon","coordinates":[[[0,0],[1,1],[0,0]]]}`, ErrSyntax},
		{"text after", `{"type":"Point","coordinates":[-92.8,44.0,1]} x`, ErrSyntax},
		{"mixed dimensions", `{"type":"LineString","coordinates":[[-92.8,44.0,1],[-92.8,44.0]]}`, ErrSyntax},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := readString(t, "b.geojson", tc.doc, Options{})
			var pe *ParseError
			if !errors.Is(err, tc.want) || !errors.As(err, &pe) {
				t.Errorf("Read(%s) = %v, want a ParseError wrapping %v", tc.doc, err, tc.want)
			}
		})
	}
	// The swapped order is named in the message.
	_, err := readString(t, "b.geojson", pt(`[44.04,-92.84,200]`), Options{})
	if err == nil || !strings.Contains(err.Error(), "look like [latitude, longitude]") {
		t.Errorf("swapped lon/lat error = %v, want it to say so", err)
	}
}
