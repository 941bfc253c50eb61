package survey

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/dugout-estimating/dugout/internal/units"
)

// TestRead_BadDelimited covers every rejected case of the delimited reader:
// each must be a *ParseError naming the file, the line and (for a value)
// the field, wrapping the right sentinel.
func TestRead_BadDelimited(t *testing.T) {
	hdr := "id,northing,easting,elevation,description\n"
	tests := []struct {
		name    string
		file    string
		content string
		opt     Options
		want    error
		line    int
		field   string
	}{
		{"empty", "e.csv", "", Options{}, ErrEmpty, 0, ""},
		{"blank lines", "e.csv", "\n \r\n\t\n", Options{}, ErrEmpty, 0, ""},
		{"only comments", "e.csv", "# a\n// b\n", Options{}, ErrEmpty, 0, ""},
		{"header only", "e.csv", hdr, Options{}, ErrEmpty, 0, ""},
		{"binary", "e.csv", "PK\x03\x04\x14\x00\x06\x00", Options{}, ErrNotText, 0, ""},
		{"headerless without --columns", "e.txt", "1,5000,1000,100\n", Options{}, ErrColumns, 1, ""},
		{"bad --columns", "e.txt", "1,5000,1000,100\n", Options{Columns: "PNEX"}, ErrColumns, 0, ""},
		{"--columns twice", "e.txt", "1,5000,1000,100\n", Options{Columns: "PNNE"}, ErrColumns, 0, ""},
		{"unknown columns", "e.csv", "foo,bar,baz\n1,2,3\n", Options{}, ErrColumns, 1, ""},
		{"northing without easting", "e.csv", "id,northing,elevation\n1,5000,100\n", Options{}, ErrColumns, 1, "northing"},
		{"repeated role", "e.csv", "id,n,northing,e,z\n1,5000,5000,1000,100\n", Options{}, ErrColumns, 1, "northing"},
		{"non-numeric", "e.csv", hdr + "1,50O0,1000,100,GS\n", Options{}, ErrSyntax, 2, "northing"},
		{"NaN", "e.csv", hdr + "1,5000,1000,NaN,GS\n", Options{}, ErrNonFinite, 2, "elevation"},
		{"Inf", "e.csv", hdr + "1,5000,-Inf,100,GS\n", Options{}, ErrNonFinite, 2, "easting"},
		{"overflow", "e.csv", hdr + "1,5000,1e400,100,GS\n", Options{}, ErrNonFinite, 2, "easting"},
		{"hex", "e.csv", hdr + "1,0x1388,1000,100,GS\n", Options{}, ErrSyntax, 2, "northing"},
		{"underscore", "e.csv", hdr + "1,5_000,1000,100,GS\n", Options{}, ErrSyntax, 2, "northing"},
		{"decimal comma", "e.csv", "id;n;e;z\n1;5000,5;1000;100\n", Options{}, ErrSyntax, 2, "n"},
		{"missing value", "e.csv", hdr + "1,,1000,100,GS\n", Options{}, ErrSyntax, 2, "northing"},
		{"short row", "e.csv", hdr + "1,5000\n", Options{}, ErrSyntax, 2, "easting"},
		{"unterminated quote", "e.csv", hdr + "1,5000,1000,100,\"GS\n", Options{}, ErrSyntax, 2, ""},
		{"too many fields", "e.csv", "id,n,e,z,d,extra\n1,5000,1000,100,GS,,9,9\n", Options{}, ErrSyntax, 2, ""},
		{"latitude out of range", "e.csv", "id,lat,lon,alt\n1,-92.8,44.0,200\n", Options{}, ErrRange, 2, "latitude"},
		{"longitude out of range", "e.csv", "id,lat,lon,alt\n1,44.0,192.8,200\n", Options{}, ErrRange, 2, "longitude"},
		{"negative accuracy", "e.csv", "id,lat,lon,alt,hacc\n1,44.0,-92.8,200,-1\n", Options{}, ErrRange, 2, "hacc"},
		{"duplicate id", "e.csv", hdr + "7,5000,1000,100,GS\n8,5001,1001,100,GS\n7,5002,1000,100,GS\n", Options{}, ErrDuplicatePoint, 4, ""},
		{"no elevation column", "e.csv", "id,n,e\n1,5000,1000\n", Options{}, ErrNoElevation, 2, ""},
		{"JSON in a .csv", "e.csv", `{"type":"Point"}`, Options{}, ErrFormat, 0, ""},
		{"text in a .gpx", "e.gpx", hdr + "1,2,3,4,x\n", Options{}, ErrFormat, 0, ""},
		{"JSON array", "e.json", `[[1,2,3]]`, Options{}, ErrFormat, 1, ""},
		{"lon/lat with --crs local", "e.csv", "id,lat,lon,alt\n1,44.0,-92.8,200\n", Options{CRS: mustSpec(t, "local")}, ErrCRS, 0, ""},
		{"lon/lat into a non-UTM grid", "e.csv", "id,lat,lon,alt\n1,44.0,-92.8,200\n", Options{CRS: mustSpec(t, "EPSG:2994")}, ErrCRS, 0, ""},
		{"--crs EPSG:4326", "e.csv", hdr + "1,5000,1000,100,GS\n", Options{CRS: mustSpec(t, "EPSG:4326")}, ErrCRS, 0, ""},
		{"coordinate beyond any survey", "e.csv", hdr + "1,1e308,1000,100,GS\n", Options{}, ErrRange, 2, ""},
		{"elevation beyond any survey", "e.csv", hdr + "1,5000,1000,-2e8,GS\n", Options{}, ErrRange, 2, ""},
		{"beyond UTM", "e.csv", "id,lat,lon,alt\n1,86.0,10.0,200\n", Options{}, ErrCRS, 0, ""},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			path := writeTemp(t, tc.file, tc.content)
			_, err := Read([]string{path}, tc.opt)
			if !errors.Is(err, tc.want) {
				t.Fatalf("Read = %v, want %v", err, tc.want)
			}
			var pe *ParseError
			if errors.As(err, &pe) {
				if pe.File != path || pe.Line != tc.line || pe.Field != tc.field {
					t.Errorf("ParseError at %s:%d field %q, want %s:%d field %q (%v)", pe.File, pe.Line, pe.Field, path, tc.line, tc.field, err)
				}
			} else if tc.line != 0 || tc.field != "" {
				t.Errorf("Read = %v (%T), want a ParseError", err, err)
			}
		})
	}
}

func TestRead_ErrorMessages(t *testing.T) {
	// Messages name what is wrong with its value and where.
	tests := []struct {
		content string
		want    []string
	}{
		{"id,n,e,z\n1,50O0,1000,100\n", []string{"e.csv:2: n:", `"50O0" is not a number`}},
		{"id,lat,lon,alt\n1,-92.8,44.0,200\n", []string{"latitude", "-92.8 is outside [-90, 90]", "swapped"}},
		{"1,5000,1000,100\n", []string{"e.csv:1:", "--columns"}},
		{"id,n,e,z\n7,5000,1000,100\n7,5002,1000,100\n", []string{"e.csv:3:", `point "7"`, "line 2"}},
		{"id;n;e;z\n1;5000,5;1000;100\n", []string{"decimal comma"}},
	}
	for _, tc := range tests {
		_, err := readString(t, "e.csv", tc.content, Options{})
		if err == nil {
			t.Errorf("Read(%q) succeeded", tc.content)
			continue
		}
		for _, w := range tc.want {
			if !strings.Contains(err.Error(), w) {
				t.Errorf("Read(%q) = %q, want it to contain %q", tc.content, err, w)
			}
		}
	}
}

func TestRead_Files(t *testing.T) {
	if _, err := Read(nil, Options{}); !errors.Is(err, ErrEmpty) {
		t.Errorf("Read(nil) = %v, want ErrEmpty", err)
	}
	if _, err := Read([]string{filepath.Join(t.TempDir(), "missing.csv")}, Options{}); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("Read(missing) = %v, want ErrNotExist", err)
	}
	if _, err := Read([]string{t.TempDir()}, Options{}); !errors.Is(err, ErrFormat) {
		t.Errorf("Read(dir) = %v, want ErrFormat", err)
	}
	var calls int
	_, err := Read([]string{"testdata/ts_pnezd.txt"}, Options{Columns: "PNEZD", Progress: func(done, total int64) {
		calls++
		if done > total {
			t.Errorf("progress %d of %d", done, total)
		}
	}})
	if err != nil || calls == 0 {
		t.Errorf("Read with progress: %v, %d calls", err, calls)
	}
}

func TestRead_MixedCRS(t *testing.T) {
	lonlat := writeTemp(t, "gps.csv", "id,lat,lon,alt\n1,44.0415,-92.8464,240\n")
	grid := writeTemp(t, "ts.csv", "id,n,e,z\n1,5000,1000,100\n")
	if _, err := Read([]string{lonlat, grid}, Options{}); !errors.Is(err, ErrMixedCRS) {
		t.Errorf("lon/lat + unnamed grid = %v, want ErrMixedCRS", err)
	}
	// Named as the UTM zone the lon/lat falls in, the grid joins it.
	utm := writeTemp(t, "utm.csv", "id,n,e,z\n2,4876500,512300,240\n")
	s, err := Read([]string{lonlat, utm}, Options{CRS: mustSpec(t, "EPSG:32615")})
	if err != nil {
		t.Fatal(err)
	}
	if s.CRS.EPSG != 32615 || len(s.Points) != 2 {
		t.Errorf("CRS %v, %d points, want EPSG:32615 and 2", s.CRS, len(s.Points))
	}
	// A LAS-like stated system beside an unstated grid needs --crs.
	a := &rawFile{info: FileInfo{Path: "a.las"}, hUnitM: 1}
	c := mustSpec(t, "EPSG:2994").CRS
	a.statedCRS = &c
	b := &rawFile{info: FileInfo{Path: "b.csv"}, hUnitM: 1}
	if _, _, err := resolveCRS([]*rawFile{a, b}, &Options{}); !errors.Is(err, ErrMixedCRS) || !strings.Contains(err.Error(), "--crs EPSG:2994") {
		t.Errorf("stated + unstated = %v, want ErrMixedCRS suggesting --crs EPSG:2994", err)
	}
	d := mustSpec(t, "EPSG:2903").CRS
	b.statedCRS = &d
	if _, _, err := resolveCRS([]*rawFile{a, b}, &Options{}); !errors.Is(err, ErrMixedCRS) {
		t.Errorf("two stated systems = %v, want ErrMixedCRS", err)
	}
}

func TestRead_UnitsWarning(t *testing.T) {
	// A grid read in feet while the named UTM zone is in metres.
	s, err := readString(t, "u.csv", "id,n,e,z\n1,4876500,512300,240\n", Options{Units: units.Feet, CRS: mustSpec(t, "EPSG:32615")})
	if err != nil {
		t.Fatal(err)
	}
	if !hasWarning(s.Warnings, "read in ft, but EPSG:32615 is in m") {
		t.Errorf("warnings %v, want the unit mismatch", s.Warnings)
	}
}
