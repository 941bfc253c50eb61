package las

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/dugout-estimating/dugout/internal/reftest"
	"github.com/dugout-estimating/dugout/internal/units"
)

func TestParseWKT(t *testing.T) {
	tests := []struct {
		name string
		wkt  string
		want wktInfo
	}{
		{
			// WKT 1 as GDAL writes it (OGC 01-009): top-level AUTHORITY last.
			name: "wkt1_utm",
			wkt: `PROJCS["WGS 84 / UTM zone 10N",GEOGCS["WGS 84",DATUM["WGS_1984",SPHEROID["WGS 84",6378137,298.257223563,` +
				`AUTHORITY["EPSG","7030"]],AUTHORITY["EPSG","6326"]],PRIMEM["Greenwich",0],UNIT["degree",0.0174532925199433],` +
				`AUTHORITY["EPSG","4326"]],PROJECTION["Transverse_Mercator"],UNIT["metre",1,AUTHORITY["EPSG","9001"]],AUTHORITY["EPSG","32610"]]`,
			want: wktInfo{epsg: 32610, unitM: 1},
		},
		{
			// ISO 19162 WKT 2: units inside the axes, ID at the end.
			name: "wkt2_axis_units",
			wkt: `PROJCRS["NAD83(HARN) / Oregon GIC Lambert (ft)",BASEGEOGCRS["NAD83(HARN)",DATUM["NAD83 (High Accuracy Reference Network)",` +
				`ELLIPSOID["GRS 1980",6378137,298.257222101,LENGTHUNIT["metre",1]]],ID["EPSG",4152]],CONVERSION["x",METHOD["Lambert Conic Conformal (2SP)"],` +
				`PARAMETER["False easting",1312335.958,LENGTHUNIT["foot",0.3048]]],CS[Cartesian,2],` +
				`AXIS["easting (X)",east,ORDER[1],LENGTHUNIT["foot",0.3048]],AXIS["northing (Y)",north,ORDER[2],LENGTHUNIT["foot",0.3048]],ID["EPSG",2994]]`,
			want: wktInfo{epsg: 2994, unitM: units.Foot},
		},
		{
			name: "compound_with_vertical",
			wkt: `COMPD_CS["x + NAVD88",PROJCS["NAD83(HARN) / New Mexico Central (ftUS)",UNIT["US survey foot",0.3048006096012192],` +
				`AUTHORITY["EPSG","2903"]],VERT_CS["NAVD88 height (ftUS)",VERT_DATUM["North American Vertical Datum 1988",2005],` +
				`UNIT["US survey foot",0.3048006096012192],AUTHORITY["EPSG","6360"]]]`,
			want: wktInfo{epsg: 2903, unitM: units.USSurveyFoot, vertUnitM: units.USSurveyFoot},
		},
		{
			name: "geographic",
			wkt:  `GEOGCS["WGS 84",DATUM["WGS_1984",SPHEROID["WGS 84",6378137,298.257223563]],UNIT["degree",0.0174532925199433],AUTHORITY["EPSG","4326"]]`,
			want: wktInfo{epsg: 4326, geographic: true},
		},
		{name: "escaped_quote", wkt: `PROJCS["a ""b"" c",UNIT["metre",1]]`, want: wktInfo{unitM: 1}},
		{name: "unbalanced", wkt: `PROJCS["x",UNIT["metre",1]`, want: wktInfo{}},
		{name: "unterminated_string", wkt: `PROJCS["x`, want: wktInfo{}},
		{name: "empty", wkt: ``, want: wktInfo{}},
		{name: "too_deep", wkt: strings.Repeat("A[", 100) + strings.Repeat("]", 100), want: wktInfo{}},
		{name: "bad_number", wkt: `PROJCS["x",UNIT["metre","one"],AUTHORITY["EPSG","abc"]]`, want: wktInfo{}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if got := parseWKT(tc.wkt); got != tc.want {
				t.Errorf("parseWKT(%.60q…) = %+v, want %+v", tc.wkt, got, tc.want)
			}
		})
	}
}

// TestParseWKT_SharedFiles reads the WKT files shipped beside the LiDAR
// samples (shared/data/las, from PDAL): autzen-srs.wkt is in international
// feet, mvk-thin.las.wkt in US survey feet ("Foot_US", 0.30480060960121924),
// per shared/data/SOURCES.md; neither carries a top-level EPSG code.
func TestParseWKT_SharedFiles(t *testing.T) {
	dir := filepath.Join(reftest.SharedDir(t), "data", "las")
	for name, want := range map[string]wktInfo{
		"autzen-srs.wkt":   {unitM: units.Foot},
		"mvk-thin.las.wkt": {unitM: units.USSurveyFoot},
	} {
		b, err := os.ReadFile(filepath.Join(dir, name))
		if err != nil {
			t.Fatal(err)
		}
		got := parseWKT(string(b))
		if got.epsg != want.epsg || !sameUnit(got.unitM, want.unitM) || got.geographic {
			t.Errorf("parseWKT(%s) = %+v, want %+v", name, got, want)
		}
	}
}

// FuzzParseWKT checks that the lenient WKT scanner never panics and only
// reports plausible values.
func FuzzParseWKT(f *testing.F) {
	f.Add(`PROJCS["x",UNIT["foot",0.3048],AUTHORITY["EPSG","2994"]]`)
	f.Add(`COMPD_CS["c",PROJCS["p",UNIT["metre",1]],VERT_CS["v",UNIT["foot",0.3048]]]`)
	f.Add(`PROJCRS["p",CS[Cartesian,2],AXIS["e",east,LENGTHUNIT["metre",1]],ID["EPSG",32610]]`)
	f.Add(`GEOGCS["g"(AUTHORITY("EPSG","4326")))`)
	f.Fuzz(func(t *testing.T, s string) {
		w := parseWKT(s)
		if w.epsg < 0 || w.epsg > 32766 || w.unitM < 0 || w.vertUnitM < 0 || !isFinite(w.unitM) || !isFinite(w.vertUnitM) {
			t.Fatalf("parseWKT(%q) = %+v", s, w)
		}
	})
}
