package main

import (
	"context"
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/dugout-estimating/dugout/internal/units"
)

// hillCSV is a square pyramid hill: corners at elevation 0 on a 10 × 10
// square at E 1000–1010, N 2000–2010 and the apex at 4 over its centre.
// Its contour at level z is a square ring of half-side 5(4 − z)/4 about the
// centre, so of length 10(4 − z): 30, 20 and 10 at levels 1, 2 and 3
// (analytic; levels 0 and 4 only touch the hill, at its foot and its top).
const hillCSV = "id,easting,northing,elevation,description\n" +
	"1,1000,2000,0,GS\n2,1010,2000,0,GS\n3,1010,2010,0,GS\n4,1000,2010,0,GS\n5,1005,2005,4,GS top\n"

// geoJSONLines decodes a contour GeoJSON file.
type geoJSONLines struct {
	Type     string `json:"type"`
	CRS      string `json:"dugout:crs"`
	Features []struct {
		Geometry struct {
			Type        string       `json:"type"`
			Coordinates [][2]float64 `json:"coordinates"`
		} `json:"geometry"`
		Properties struct {
			Elevation float64 `json:"elevation"`
			Index     bool    `json:"index"`
			Closed    bool    `json:"closed"`
		} `json:"properties"`
	} `json:"features"`
}

func readLines(t *testing.T, path string) geoJSONLines {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var g geoJSONLines
	if err := json.Unmarshal(b, &g); err != nil {
		t.Fatalf("%s: %v", path, err)
	}
	return g
}

func TestContoursCmd_Flags(t *testing.T) {
	var got *contoursOptions
	capture := func(_ context.Context, o *contoursOptions) error { got = o; return nil }
	cmd := contoursCmdWith(&App{}, capture)
	cmd.SetArgs([]string{"site.csv", "--interval", "0.5ft", "--index-every", "4", "--base", "0.25", "--geojson", "c.geojson", "--smooth", "--units", "ft"})
	if err := cmd.Execute(); err != nil {
		t.Fatal(err)
	}
	if got.file != "site.csv" || got.interval != "0.5ft" || got.indexEvery != 4 || got.base != "0.25" || got.geojsonOut != "c.geojson" ||
		!got.smooth || !got.unitsSet || got.survey.units != "ft" {
		t.Errorf("parsed options = %+v", got)
	}
	cmd = contoursCmdWith(&App{}, capture)
	cmd.SetArgs([]string{"site.csv", "--interval", "1"})
	if err := cmd.Execute(); err != nil {
		t.Fatal(err)
	}
	if got.indexEvery != 5 || got.base != "" || got.smooth || got.unitsSet {
		t.Errorf("defaults = %+v", got)
	}
	for _, args := range [][]string{nil, {"a.csv", "b.csv", "--interval", "1"}, {"a.csv", "--index-every", "two"}} {
		cmd := contoursCmdWith(&App{}, capture)
		cmd.SetArgs(args)
		cmd.SilenceErrors, cmd.SilenceUsage = true, true
		if err := cmd.Execute(); exitCodeOf(err) != ExitUsage {
			t.Errorf("contours %v: %v, want a usage error", args, err)
		}
	}
}

func TestContours_Hill(t *testing.T) {
	dir := t.TempDir()
	hill := writeFile(t, dir, "hill.csv", hillCSV)
	doc := runJSON(t, newContoursCmd, hill, "--crs", "local", "--interval", "1", "--index-every", "2")
	for _, k := range []string{"schema_version", "input", "options", "units", "crs", "interval_m", "base_m", "index_every",
		"levels_m", "lines", "closed_rings", "index", "intermediate", "per_level", "warnings"} {
		if _, ok := doc[k]; !ok {
			t.Errorf("JSON lacks %q", k)
		}
	}
	if num(t, doc, "lines") != 3 || num(t, doc, "closed_rings") != 3 || len(doc["levels_m"].([]any)) != 5 {
		t.Errorf("lines %v, closed %v, levels %v: want 3 closed rings of levels 0 to 4", doc["lines"], doc["closed_rings"], doc["levels_m"])
	}
	want := map[float64]float64{1: 30, 2: 20, 3: 10} // 10(4 − z), see hillCSV
	for _, l := range doc["per_level"].([]any) {
		l := l.(map[string]any)
		z, n := l["elevation_m"].(float64), l["length_m"].(float64)
		if !close(n, want[z], relTol) || l["closed_rings"] != 1.0 || l["index"] != (z == 2) {
			t.Errorf("level %v: %v m, %v rings, index %v; want %v m, one ring, index at 2 only", z, n, l["closed_rings"], l["index"], want[z])
		}
	}
	// Index every 2nd level from base 0: level 2, 20 m; 1 and 3 are
	// intermediate, 40 m.
	if !close(num(t, doc, "index.length_m"), 20, relTol) || num(t, doc, "index.lines") != 1 ||
		!close(num(t, doc, "intermediate.length_m"), 40, relTol) || num(t, doc, "intermediate.lines") != 2 {
		t.Errorf("index %v, intermediate %v", doc["index"], doc["intermediate"])
	}
	// From base 0.5: levels 0.5 to 3.5, rings of 35, 25, 15 and 5 m.
	doc = runJSON(t, newContoursCmd, hill, "--crs", "local", "--interval", "1", "--base", "0.5")
	if l := num(t, doc, "intermediate.length_m") + num(t, doc, "index.length_m"); !close(l, 80, relTol) || num(t, doc, "lines") != 4 {
		t.Errorf("base 0.5: %v lines, %v m, want 4 rings and 80 m", doc["lines"], l)
	}
}

func TestContours_HillFeet(t *testing.T) {
	// The same hill in feet: lengths in feet on stdout, elevations in feet
	// in the GeoJSON, coordinates in the survey's grid, said in the file.
	dir := t.TempDir()
	hill := writeFile(t, dir, "hill.csv", hillCSV)
	gj := filepath.Join(dir, "out", "hill.geojson")
	out, stderr, err := runCommand(t, newContoursCmd, nil, false, hill, "--units", "ft", "--crs", "local", "--interval", "12in", "--geojson", gj)
	if err != nil {
		t.Fatalf("contours: %v\n%s", err, stderr)
	}
	for _, want := range []string{
		"interval\t1.00 ft from base 0.00 ft, index every 5 (5.00 ft)\n",
		"levels\t5, 0.00 to 4.00 ft\n",
		"lines\t3 (3 closed rings)\n",
		"index\t0 lines, 0.00 ft\n",
		"intermediate\t3 lines, 60.00 ft\n",
		"geojson\t" + gj + "\n",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("stdout lacks %q:\n%s", want, out)
		}
	}
	g := readLines(t, gj)
	if g.Type != "FeatureCollection" || len(g.Features) != 3 || !strings.Contains(g.CRS, "local site grid") || !strings.Contains(g.CRS, "international feet") {
		t.Fatalf("GeoJSON: %q, %d features, dugout:crs %q", g.Type, len(g.Features), g.CRS)
	}
	for i, f := range g.Features {
		z := f.Properties.Elevation
		if z != float64(i+1) || !f.Properties.Closed || f.Geometry.Type != "LineString" {
			t.Errorf("feature %d: elevation %v, closed %v, %s; want %d ft, closed LineString", i, z, f.Properties.Closed, f.Geometry.Type, i+1)
		}
		// The ring's corners lie on the diagonals, at half-side 5(4 − z)/4
		// from the centre (1005, 2005) ft.
		s := 5 * (4 - z) / 4
		for _, c := range f.Geometry.Coordinates {
			if !close(math.Abs(c[0]-1005), s, 1e-6) && !close(math.Abs(c[1]-2005), s, 1e-6) {
				t.Errorf("level %v: point %v is not on the square of half-side %v", z, c, s)
			}
		}
	}
}

func TestContours_DemoGolden(t *testing.T) {
	out, stderr, err := runCommand(t, newContoursCmd, nil, false, "--units", "ft", demoTS, "--interval", "0.5")
	if err != nil {
		t.Fatalf("contours: %v\n%s", err, stderr)
	}
	checkGolden(t, "contours_demo.txt", out)

	// Levels land on the user's datum: every elevation is a multiple of
	// 0.5 ft, or of 0.5 ft plus the base.
	dir := t.TempDir()
	for _, tc := range []struct {
		base   string
		offset float64
	}{{"", 0}, {"0.25", 0.25}, {"3in", 0.25}} {
		gj := filepath.Join(dir, "demo.geojson")
		args := []string{"--units", "ft", demoTS, "--interval", "6in", "--geojson", gj}
		if tc.base != "" {
			args = append(args, "--base", tc.base)
		}
		doc := runJSON(t, newContoursCmd, args...)
		g := readLines(t, gj)
		if len(g.Features) != int(num(t, doc, "lines")) || len(g.Features) == 0 {
			t.Errorf("base %q: %d features, %v lines", tc.base, len(g.Features), doc["lines"])
		}
		for _, f := range g.Features {
			k := (f.Properties.Elevation - tc.offset) / 0.5
			if math.Abs(k-math.Round(k)) > 1e-9 {
				t.Errorf("base %q: elevation %v ft is not on the 0.5 ft levels", tc.base, f.Properties.Elevation)
				break
			}
		}
	}
}

func TestContours_Smooth(t *testing.T) {
	// Cutting a corner never lengthens a line (the triangle inequality),
	// and smoothing neither adds nor drops lines.
	plain := runJSON(t, newContoursCmd, "--units", "ft", demoTS, "--interval", "0.5")
	smooth := runJSON(t, newContoursCmd, "--units", "ft", demoTS, "--interval", "0.5", "--smooth")
	lp := num(t, plain, "index.length_m") + num(t, plain, "intermediate.length_m")
	ls := num(t, smooth, "index.length_m") + num(t, smooth, "intermediate.length_m")
	if num(t, smooth, "lines") != num(t, plain, "lines") || !(ls < lp) {
		t.Errorf("smoothed %v lines, %v m; plain %v lines, %v m", smooth["lines"], ls, plain["lines"], lp)
	}
}

func TestContours_LonLatAndLandXML(t *testing.T) {
	dir := t.TempDir()
	// The phone GPS survey is lon/lat, so the GeoJSON is RFC 7946 lon/lat:
	// within the extent of the file (about 93.1544° W, 42.0233° N,
	// testdata/demo/README.md) and without a CRS note.
	gj := filepath.Join(dir, "gps.geojson")
	if _, stderr, err := runCommand(t, newContoursCmd, &App{Quiet: true}, false, demoGPS, "--interval", "0.5", "--geojson", gj); err != nil {
		t.Fatalf("contours: %v\n%s", err, stderr)
	}
	g := readLines(t, gj)
	if g.CRS != "" || len(g.Features) == 0 {
		t.Fatalf("lon/lat GeoJSON: dugout:crs %q, %d features", g.CRS, len(g.Features))
	}
	for _, f := range g.Features {
		for _, c := range f.Geometry.Coordinates {
			if math.Abs(c[0]+93.1544) > 0.001 || math.Abs(c[1]-42.0233) > 0.001 {
				t.Fatalf("point %v is not near 93.1544° W, 42.0233° N", c)
			}
		}
	}

	// A LandXML surface (the hill, written by surface) gives the hill's
	// contours.
	lx := filepath.Join(dir, "hill.xml")
	if _, _, err := runCommand(t, newSurfaceCmd, nil, false, writeFile(t, dir, "hill.csv", hillCSV), "--crs", "local", "--landxml", lx); err != nil {
		t.Fatal(err)
	}
	doc := runJSON(t, newContoursCmd, lx, "--interval", "1")
	if l := num(t, doc, "intermediate.length_m"); num(t, doc, "lines") != 3 || !close(l, 60, relTol) {
		t.Errorf("LandXML hill: %v lines, %v m, want 3 rings and 60 m", doc["lines"], l)
	}
}

func TestContours_Stdout(t *testing.T) {
	dir := t.TempDir()
	hill := writeFile(t, dir, "hill.csv", hillCSV)
	out, _, err := runCommand(t, newContoursCmd, nil, false, hill, "--interval", "1", "--geojson", "-")
	var g geoJSONLines
	if err != nil || json.Unmarshal([]byte(out), &g) != nil || len(g.Features) != 3 {
		t.Errorf("--geojson -: %v\n%s", err, out)
	}
}

func TestContours_Rejected(t *testing.T) {
	tmp := t.TempDir()
	hill := writeFile(t, tmp, "hill.csv", hillCSV)
	line := writeFile(t, tmp, "line.csv", "id,easting,northing,elevation\n1,0,0,1\n2,5,5,1\n3,10,10,2\n")
	tests := []struct {
		name string
		args []string
		want ExitCode
		msg  string
	}{
		{"no interval", []string{hill}, ExitUsage, "--interval is required"},
		{"zero interval", []string{hill, "--interval", "0"}, ExitUsage, "--interval must be > 0"},
		{"negative interval", []string{hill, "--interval", "-1ft"}, ExitUsage, "--interval must be > 0"},
		{"interval not a length", []string{hill, "--interval", "fine"}, ExitUsage, "--interval"},
		// 4 m of relief at 0.1 mm is 40 001 levels, beyond contours.MaxLevels.
		{"interval too small", []string{hill, "--interval", "0.0001"}, ExitUsage, "--interval 0.0001 would make 40001 contour levels between 0.000 and 4.000 m, more than 10000"},
		{"bad base", []string{hill, "--interval", "1", "--base", "low"}, ExitUsage, "--base"},
		{"index every 0", []string{hill, "--interval", "1", "--index-every", "0"}, ExitUsage, "--index-every must be 1 or more"},
		{"collinear", []string{line, "--interval", "1"}, ExitRejected, "lie on one straight line"},
		{"missing file", []string{filepath.Join(tmp, "missing.csv"), "--interval", "1"}, ExitFailure, "missing.csv"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			dir := t.TempDir()
			args := append(tc.args, "--geojson", filepath.Join(dir, "out", "c.geojson"))
			stdout, _, err := runCommand(t, newContoursCmd, nil, false, args...)
			if got := exitCodeOf(err); got != tc.want {
				t.Fatalf("contours %v: error %v gives exit %d, want %d", args, err, got, tc.want)
			}
			if !strings.Contains(err.Error(), tc.msg) {
				t.Errorf("error %q lacks %q", err, tc.msg)
			}
			if stdout != "" {
				t.Errorf("stdout = %q, want nothing on error", stdout)
			}
			if _, err := os.Stat(filepath.Join(dir, "out")); !os.IsNotExist(err) {
				t.Errorf("output folder left behind after the error (%v)", err)
			}
		})
	}
	_, _, err := runCommand(t, newContoursCmd, &App{JSON: true}, false, hill, "--interval", "1", "--geojson", "-")
	if exitCodeOf(err) != ExitUsage {
		t.Errorf("--json with --geojson -: %v, want a usage error", err)
	}
}

func TestContours_RoundOffLevels(t *testing.T) {
	// A pit in feet: corners at 2 ft, the bottom at 0.7 ft. At 0.1 ft the
	// level k = 7 is 7 × 0.030480000000000004 m, one unit in the last place
	// above the bottom's 0.7 × 0.3048 m, so tracing leaves a ring of
	// round-off around the bottom, which is dropped. The rings at 0.8 to
	// 1.9 ft have half-sides 5(z − 0.7)/1.3, so lengths 40(z − 0.7)/1.3,
	// 240 ft in all (analytic), and the square's edge, on the 2 ft level
	// with lower ground inside, is traced too (as package contours
	// documents): 40 ft more.
	dir := t.TempDir()
	pit := writeFile(t, dir, "pit.csv", "id,easting,northing,elevation\n"+
		"1,1000,2000,2\n2,1010,2000,2\n3,1010,2010,2\n4,1000,2010,2\n5,1005,2005,0.7\n")
	doc := runJSON(t, newContoursCmd, pit, "--units", "ft", "--crs", "local", "--interval", "0.1")
	l := (num(t, doc, "index.length_m") + num(t, doc, "intermediate.length_m")) / units.Foot
	if num(t, doc, "lines") != 13 || num(t, doc, "closed_rings") != 13 || !close(l, 280, relTol) {
		t.Errorf("pit: %v lines (%v closed), %v ft; want 13 rings, 280 ft", doc["lines"], doc["closed_rings"], l)
	}
	levels := doc["per_level"].([]any)
	if first := levels[0].(map[string]any)["elevation_m"].(float64) / units.Foot; !close(first, 0.8, 1e-12) {
		t.Errorf("lowest line at %v ft, want 0.8 (no ring of round-off at 0.7)", first)
	}
}

func TestRoundInUnit(t *testing.T) {
	twelveInches := 12.0
	sixInches := 6.0
	tests := []struct {
		name string
		m    float64
		u    units.System
		want float64
	}{
		// 12 × 0.0254 at run time is 0.30479999999999996, not 0.3048.
		{"12in in feet", twelveInches * units.Inch, units.Feet, units.Foot},
		{"6in in feet", sixInches * units.Inch, units.Feet, 0.5 * units.Foot},
		{"0.1 m", 0.1, units.Metres, 0.1},
		{"100 ft datum", 100 * units.Foot, units.Feet, 100 * units.Foot},
		{"negative base", -2.5 * units.USSurveyFoot, units.USFeet, -2.5 * units.USSurveyFoot},
		{"zero", 0, units.Feet, 0},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if got := roundInUnit(tc.m, tc.u); got != tc.want {
				t.Errorf("roundInUnit(%v, %v) = %v, want %v", tc.m, tc.u, got, tc.want)
			}
		})
	}
}
