package survey

import (
	"os"
	"path/filepath"
	"testing"
)

// Each fuzz target feeds arbitrary bytes to one reader, seeded from
// testdata/, and on success checks the set's invariants (finite plan
// positions, counts that add up, a Summary that runs). Crashers found become
// cases in TestFuzzRegressions.

func addSeeds(f *testing.F, names ...string) {
	for _, n := range names {
		b, err := os.ReadFile(filepath.Join("testdata", n))
		if err != nil {
			f.Fatal(err)
		}
		f.Add(b)
	}
}

func fuzzRead(t *testing.T, name string, data []byte, opt Options) {
	s, err := readData(name, data, opt)
	if err != nil {
		return
	}
	checkInvariants(t, s, opt.AllowMissingZ)
}

func FuzzReadCSV(f *testing.F) {
	addSeeds(f, "ts_pnezd.txt", "ts_header_tab.txt", "gps_lonlat.csv")
	f.Add([]byte("id;n;e;z\n1;5000;1000;100\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		fuzzRead(t, "f.txt", data, Options{Columns: "PNEZD", AllowMissingZ: true})
		fuzzRead(t, "f.csv", data, Options{})
	})
}

func FuzzReadGeoJSON(f *testing.F) {
	addSeeds(f, "site.geojson")
	f.Add([]byte(`{"type":"GeometryCollection","geometries":[{"type":"Point","coordinates":[1,2,3]}]}`))
	f.Fuzz(func(t *testing.T, data []byte) {
		fuzzRead(t, "f.geojson", data, Options{AllowMissingZ: true})
		fuzzRead(t, "f.geojson", data, Options{CRS: mustSpec(t, "local")})
	})
}

func FuzzReadGPX(f *testing.F) {
	addSeeds(f, "gps.gpx", "track_noele.gpx")
	f.Fuzz(func(t *testing.T, data []byte) {
		fuzzRead(t, "f.gpx", data, Options{AllowMissingZ: true})
	})
}

func FuzzReadLevels(f *testing.F) {
	addSeeds(f, "levels_loop.csv")
	f.Fuzz(func(t *testing.T, data []byte) {
		fuzzRead(t, "f.csv", data, Options{})
	})
}

// TestFuzzRegressions replays inputs that once broke a reader.
func TestFuzzRegressions(t *testing.T) {
	tests := []struct{ name, file, data string }{
		{"geometry collection nesting", "f.geojson", `{"type":"GeometryCollection","geometries":[{"type":"GeometryCollection","geometries":[]}]}`},
		{"empty point", "f.geojson", `{"type":"Point","coordinates":[]}`},
		{"null features", "f.geojson", `{"type":"FeatureCollection","features":null}`},
		// FuzzReadGeoJSON: a LineString without coordinates has no layout
		// in go-geom, whose Coords then divided by a zero stride.
		{"line without coordinates", "f.geojson", `{"type":"FeatureCollection","features":[{"tYpe":"Feature","geometrY":{"tYpe":"LineString"}}]}`},
		{"bare line without coordinates", "f.geojson", `{"type":"MultiPolygon"}`},
		// Found by reading the code for overflow: the centre of these
		// bounds was +Inf, and every local position -Inf.
		{"coordinates near the float limit", "f.csv", "id,n,e,z\n1,1e308,1e308,1\n2,1.5e308,1.7e308,2\n"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			fuzzRead(t, tc.file, []byte(tc.data), Options{AllowMissingZ: true})
		})
	}
}
