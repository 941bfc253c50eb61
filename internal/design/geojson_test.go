package design

import (
	"bytes"
	"errors"
	"math"
	"os"
	"strings"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/units"
)

func identity(x, y float64) (geom.Vec2, error) { return geom.Vec2{X: x, Y: y}, nil }

func TestReadZonesGeoJSON(t *testing.T) {
	f, err := os.Open("testdata/kidney_zones.geojson")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	zs, err := ReadZonesGeoJSON(f, "kidney_zones.geojson", identity, units.Metres)
	if err != nil {
		t.Fatal(err)
	}
	if len(zs) != 3 || zs[0].Name != "marginal shelf" || zs[1].DepthM != 0.75 || zs[1].WallSlope != 1.5 || zs[2].Corners != Sharp {
		t.Fatalf("zones = %+v", zs)
	}
	if len(zs[0].Ring) != 28 {
		t.Errorf("shelf has %d vertices, want 28 (closing repeat dropped)", len(zs[0].Ring))
	}
}

func TestReadZonesGeoJSON_Units(t *testing.T) {
	// Feet: bare numbers are feet, strings carry their own unit (the
	// international foot is 0.3048 m and the inch 0.0254 m exactly, NIST
	// SP 811 App. B).
	f, err := os.Open("testdata/zones_feet.geojson")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	toLocal := func(x, y float64) (geom.Vec2, error) { return geom.Vec2{X: x * units.Foot, Y: y * units.Foot}, nil }
	zs, err := ReadZonesGeoJSON(f, "zones_feet.geojson", toLocal, units.Feet)
	if err != nil {
		t.Fatal(err)
	}
	want := []struct {
		name         string
		depth, slope float64
	}{
		{"shelf", 10 * units.Inch, 1},
		{"deep", 2.5 * units.Foot, 1.5},
		{"twin bogs (part 1 of 2)", 0.4 * units.Foot, 2},
		{"twin bogs (part 2 of 2)", 0.4 * units.Foot, 2},
	}
	if len(zs) != len(want) {
		t.Fatalf("got %d zones, want %d", len(zs), len(want))
	}
	for i, w := range want {
		z := zs[i]
		if z.Name != w.name || math.Abs(z.DepthM-w.depth) > 1e-12 || z.WallSlope != w.slope {
			t.Errorf("zone %d = %q depth %g slope %g, want %q %g %g", i, z.Name, z.DepthM, z.WallSlope, w.name, w.depth, w.slope)
		}
	}
	if a := zs[3].Ring.Area(); math.Abs(a-12*units.SquareFoot) > 1e-12 {
		t.Errorf("second bog area = %g m², want 12 ft² = %g m²", a, 12*units.SquareFoot)
	}
}

func TestReadZonesGeoJSON_Bad(t *testing.T) {
	sq := `[[0,0],[4,0],[4,3],[0,3],[0,0]]`
	feat := func(props, geom string) string {
		return `{"type":"FeatureCollection","features":[{"type":"Feature","properties":{"name":"z","depth":0.5,"wall_slope":0},"geometry":{"type":"Polygon","coordinates":[` + sq + `]}},` +
			`{"type":"Feature","properties":` + props + `,"geometry":` + geom + `}]}`
	}
	poly := func(rings string) string { return `{"type":"Polygon","coordinates":[` + rings + `]}` }
	ok := `{"depth":0.5,"wall_slope":1,"name":"bad"}`
	tests := []struct {
		name    string
		doc     string
		want    error
		feature int
		text    string
	}{
		{"not json", `{"type":`, ErrGeoJSON, -1, "unexpected end"},
		{"geometry only", `{"type":"Polygon","coordinates":[` + sq + `]}`, ErrGeoJSON, -1, "want FeatureCollection"},
		{"empty", `{"type":"FeatureCollection","features":[]}`, ErrGeoJSON, -1, "no zones"},
		{"point", feat(ok, `{"type":"Point","coordinates":[1,2]}`), ErrGeoJSON, 1, "Point"},
		{"null geometry", feat(ok, `null`), ErrGeoJSON, 1, "no geometry"},
		{"no depth", feat(`{"wall_slope":1}`, poly(sq)), ErrZone, 1, `"depth" is missing`},
		{"no slope", feat(`{"depth":1}`, poly(sq)), ErrZone, 1, "vertical wall"},
		{"deep", feat(`{"depth":"40ft","wall_slope":1}`, poly(sq)), ErrZone, 1, "outside 0 to 10 m"},
		{"negative depth", feat(`{"depth":-0.2,"wall_slope":1}`, poly(sq)), ErrZone, 1, "depth -0.2 m"},
		{"bad depth unit", feat(`{"depth":"2 furlongs","wall_slope":1}`, poly(sq)), ErrZone, 1, "depth"},
		{"flat slope", feat(`{"depth":1,"wall_slope":25}`, poly(sq)), ErrZone, 1, "wall slope 25"},
		{"bad slope", feat(`{"depth":1,"wall_slope":"steep"}`, poly(sq)), ErrZone, 1, "steep"},
		{"slope 2:0", feat(`{"depth":1,"wall_slope":"2:0"}`, poly(sq)), ErrZone, 1, "2:0"},
		{"bad corners", feat(`{"depth":1,"wall_slope":1,"corners":"bevel"}`, poly(sq)), ErrGeoJSON, 1, "bevel"},
		{"name not string", feat(`{"depth":1,"wall_slope":1,"name":3}`, poly(sq)), ErrGeoJSON, 1, "name"},
		{"unclosed", feat(ok, poly(`[[0,0],[4,0],[4,3],[0,3]]`)), ErrZone, 1, "not closed"},
		{"too few", feat(ok, poly(`[[0,0],[4,0],[0,0]]`)), ErrZone, 1, "need at least 4"},
		{"two distinct", feat(ok, poly(`[[0,0],[4,0],[4,0],[0,0]]`)), ErrZone, 1, "2 distinct"},
		{"bow tie", feat(ok, poly(`[[0,0],[4,3],[4,0],[0,3],[0,0]]`)), ErrZone, 1, "crosses itself"},
		{"spike", feat(ok, poly(`[[0,0],[4,0],[4,3],[4,1],[4,5],[0,3],[0,0]]`)), ErrZone, 1, "folds back"},
		{"collinear", feat(ok, poly(`[[0,0],[1,1],[2,2],[0,0]]`)), ErrZone, 1, ""},
		{"hole", feat(ok, poly(sq+`,[[1,1],[2,1],[2,2],[1,1]]`)), ErrZone, 1, "holes"},
		{"short position", feat(ok, poly(`[[0,0],[4],[4,3],[0,0]]`)), ErrGeoJSON, 1, "position 1"},
		{"string coordinate", feat(ok, poly(`[[0,0],["4",0],[4,3],[0,0]]`)), ErrGeoJSON, 1, "coordinates"},
		{"sharp concave", feat(`{"depth":1,"wall_slope":1,"corners":"sharp"}`, poly(`[[0,0],[6,0],[6,2],[2,2],[2,6],[0,6],[0,0]]`)), ErrZone, 1, "convex"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := ReadZonesGeoJSON(strings.NewReader(tc.doc), "zones.geojson", identity, units.Metres)
			if !errors.Is(err, tc.want) {
				t.Fatalf("error = %v, want %v", err, tc.want)
			}
			var fe *FeatureError
			if tc.feature >= 0 && (!errors.As(err, &fe) || fe.Feature != tc.feature || fe.File != "zones.geojson") {
				t.Fatalf("error = %v, want a FeatureError for features[%d]", err, tc.feature)
			}
			if !strings.Contains(err.Error(), tc.text) {
				t.Fatalf("error %q does not mention %q", err, tc.text)
			}
		})
	}
	// A converter error names the position.
	conv := func(x, y float64) (geom.Vec2, error) {
		if x > 3 {
			return geom.Vec2{}, errors.New("east of the zone of the projection")
		}
		return geom.Vec2{X: x, Y: y}, nil
	}
	_, err := ReadZonesGeoJSON(strings.NewReader(feat(ok, poly(sq))), "z.geojson", conv, units.Metres)
	if err == nil || !strings.Contains(err.Error(), "position 1 (4, 0): east of") {
		t.Fatalf("converter error = %v", err)
	}
	// Oversized input.
	big := bytes.Repeat([]byte(" "), MaxZoneFileBytes+1)
	if _, err := ReadZonesGeoJSON(bytes.NewReader(big), "big", identity, units.Metres); !errors.Is(err, ErrGeoJSON) {
		t.Fatalf("oversized file: error = %v, want ErrGeoJSON", err)
	}
}

func TestParseSlope(t *testing.T) {
	for _, tc := range []struct {
		in   string
		want float64
	}{{"2", 2}, {"0", 0}, {"2:1", 2}, {"3:2", 1.5}, {"2H:1V", 2}, {"1V:2H", 2}, {"1v : 3h", 3}, {"0.5", 0.5}} {
		got, err := parseSlope(tc.in)
		if err != nil || got != tc.want {
			t.Errorf("parseSlope(%q) = %g, %v, want %g", tc.in, got, err, tc.want)
		}
	}
	for _, bad := range []string{"", "x", "2:", ":1", "2H:1H", "1:0", "nan", "1e400"} {
		if _, err := parseSlope(bad); err == nil {
			t.Errorf("parseSlope(%q) succeeded", bad)
		}
	}
}

func FuzzReadZonesGeoJSON(f *testing.F) {
	for _, name := range []string{"testdata/kidney_zones.geojson", "testdata/zones_feet.geojson"} {
		b, err := os.ReadFile(name)
		if err != nil {
			f.Fatal(err)
		}
		f.Add(b)
	}
	f.Add([]byte(`{"type":"Feature","properties":{"depth":"9in","wall_slope":"2:1"},"geometry":{"type":"Polygon","coordinates":[[[0,0],[1,0],[0,1],[0,0]]]}}`))
	f.Fuzz(func(t *testing.T, data []byte) {
		zs, err := ReadZonesGeoJSON(bytes.NewReader(data), "fuzz", identity, units.Feet)
		if err != nil {
			return
		}
		if len(zs) == 0 {
			t.Fatal("no zones and no error")
		}
		for i, z := range zs {
			if err := z.Validate(); err != nil {
				t.Fatalf("zone %d read without error but does not validate: %v", i, err)
			}
		}
	})
}
