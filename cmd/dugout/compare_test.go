package main

import (
	"context"
	"errors"
	"fmt"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/dugout-estimating/dugout/internal/survey"
	"github.com/dugout-estimating/dugout/internal/units"
)

// pitCSV writes a survey of a square 10 × 10 (in its unit) at E 1000–1010,
// N 2000–2010, level at 10 except a centre shot at 10 − depth: over the
// square the TIN is a pyramid pit (four triangles from the centre), of
// volume base × height / 3 (Euclid, Elements XII.7), with depth 0 a level
// plane. scale multiplies every coordinate (1/0.3048 writes a metre site
// in feet).
func pitCSV(t *testing.T, dir, name string, depth, scale float64) string {
	t.Helper()
	var b strings.Builder
	b.WriteString("id,easting,northing,elevation,description\n")
	row := func(id int, e, n, z float64) {
		fmt.Fprintf(&b, "%d,%.17g,%.17g,%.17g,GS\n", id, (1000+e)*scale, (2000+n)*scale, z*scale)
	}
	row(1, 0, 0, 10)
	row(2, 10, 0, 10)
	row(3, 10, 10, 10)
	row(4, 0, 10, 10)
	row(5, 5, 5, 10-depth)
	return writeFile(t, dir, name, b.String())
}

func TestCompareCmd_Flags(t *testing.T) {
	var got *compareOptions
	capture := func(_ context.Context, o *compareOptions) error { got = o; return nil }
	cmd := compareCmdWith(&App{}, capture)
	cmd.SetArgs([]string{"before.csv", "after.xml", "--before-units", "ft", "--after-units", "m", "--boundary", "pay.geojson", "--crs", "local"})
	if err := cmd.Execute(); err != nil {
		t.Fatal(err)
	}
	if got.before != "before.csv" || got.after != "after.xml" || got.beforeUnits != "ft" || got.afterUnits != "m" ||
		got.boundary != "pay.geojson" || got.survey.crs != "local" || got.unitsSet {
		t.Errorf("parsed options = %+v", got)
	}
	for _, args := range [][]string{{"one.csv"}, {"a", "b", "c"}} {
		cmd := compareCmdWith(&App{}, capture)
		cmd.SetArgs(args)
		cmd.SilenceErrors, cmd.SilenceUsage = true, true
		if err := cmd.Execute(); exitCodeOf(err) != ExitUsage {
			t.Errorf("compare %v: %v, want a usage error", args, err)
		}
	}
}

func TestCompare_PyramidPit(t *testing.T) {
	// Level ground at 10 m, dug as an inverted pyramid 3 m deep over the
	// 10 × 10 m square: cut = 100 m² × 3 m / 3 = 100 m³ exactly, no fill.
	dir := t.TempDir()
	flat := pitCSV(t, dir, "before.csv", 0, 1)
	pit := pitCSV(t, dir, "after.csv", 3, 1)
	doc := runJSON(t, newCompareCmd, "--crs", "local", flat, pit)
	for _, k := range []string{"schema_version", "before", "after", "options", "units", "crs", "cut_m3", "fill_m3", "net_m3", "area_m2", "warnings"} {
		if _, ok := doc[k]; !ok {
			t.Errorf("JSON lacks %q", k)
		}
	}
	if c, f, n, a := num(t, doc, "cut_m3"), num(t, doc, "fill_m3"), num(t, doc, "net_m3"), num(t, doc, "area_m2"); !close(c, 100, relTol) ||
		!close(f, 0, relTol) || !close(n, 100, relTol) || !close(a, 100, relTol) {
		t.Errorf("cut %v fill %v net %v area %v, want 100 m³, 0, 100 m³ over 100 m²", c, f, n, a)
	}
	if doc["before"].(map[string]any)["input"].(map[string]any)["files"].([]any)[0].(map[string]any)["path"] != flat {
		t.Errorf("before echo = %v", doc["before"])
	}

	// Swapping the surveys swaps cut and fill.
	doc = runJSON(t, newCompareCmd, "--crs", "local", pit, flat)
	if c, f, n := num(t, doc, "cut_m3"), num(t, doc, "fill_m3"), num(t, doc, "net_m3"); !close(c, 0, relTol) || !close(f, 100, relTol) || !close(n, -100, relTol) {
		t.Errorf("swapped: cut %v fill %v net %v, want 0, 100, −100", c, f, n)
	}

	// Within a boundary of one quarter of the square, by symmetry a quarter
	// of the pit: 25 m³ over 25 m².
	quarter := writeFile(t, dir, "quarter.geojson", `{"type":"FeatureCollection","features":[{"type":"Feature","properties":{},
"geometry":{"type":"Polygon","coordinates":[[[1005,2005],[1010,2005],[1010,2010],[1005,2010],[1005,2005]]]}}]}`)
	doc = runJSON(t, newCompareCmd, "--crs", "local", flat, pit, "--boundary", quarter)
	if c, a := num(t, doc, "cut_m3"), num(t, doc, "area_m2"); !close(c, 25, relTol) || !close(a, 25, relTol) || doc["boundary_file"] != quarter {
		t.Errorf("quarter: cut %v over %v m² (boundary %v), want 25 m³ over 25 m²", c, a, doc["boundary_file"])
	}
}

func TestCompare_Feet(t *testing.T) {
	// The same pit shot in feet: 10 × 10 ft, 3 ft deep, 100 ft³ =
	// 100/27 yd³ = 3.70 yd³ (27 ft³ to the cubic yard).
	dir := t.TempDir()
	flat := pitCSV(t, dir, "before.csv", 0, 1)
	pit := pitCSV(t, dir, "after.csv", 3, 1)
	rows := [][2]string{
		{"cut", "3.70 yd³ (100.0 ft³)"},
		{"fill", "0.00 yd³ (0.0 ft³)"},
		{"common area", "100.0 ft²"},
		{"net", "3.70 yd³ (100.0 ft³) more cut than fill"},
	}
	for _, tty := range []bool{false, true} {
		out, stderr, err := runCommand(t, newCompareCmd, nil, tty, "--units", "ft", "--crs", "local", flat, pit)
		if err != nil {
			t.Fatalf("compare: %v\n%s", err, stderr)
		}
		// key<TAB>value off a terminal, aligned columns on one.
		sep := "\t"
		if tty {
			sep = " +"
		}
		for _, r := range rows {
			re := regexp.MustCompile("(?m)^" + regexp.QuoteMeta(r[0]) + sep + regexp.QuoteMeta(r[1]) + "$")
			if !re.MatchString(out) {
				t.Errorf("tty %v: stdout lacks %s %q:\n%s", tty, r[0], r[1], out)
			}
		}
	}
	doc := runJSON(t, newCompareCmd, "--units", "ft", "--crs", "local", flat, pit)
	if c := num(t, doc, "cut_m3"); !close(c, 100*units.CubicFoot, relTol) || doc["units"] != "ft" {
		t.Errorf("cut %v m³ (units %v), want 100 ft³ = %v m³", c, doc["units"], 100*units.CubicFoot)
	}
	// Without --units, a boundary is read in BEFORE's units: a quarter of
	// the square in feet holds a quarter of the pit, 25 ft³.
	quarter := writeFile(t, dir, "quarter.geojson", `{"type":"FeatureCollection","features":[{"type":"Feature","properties":{},
"geometry":{"type":"Polygon","coordinates":[[[1005,2005],[1010,2005],[1010,2010],[1005,2010],[1005,2005]]]}}]}`)
	doc = runJSON(t, newCompareCmd, "--before-units", "ft", "--after-units", "ft", "--crs", "local", flat, pit, "--boundary", quarter)
	if c := num(t, doc, "cut_m3"); !close(c, 25*units.CubicFoot, relTol) {
		t.Errorf("quarter in feet: cut %v m³, want 25 ft³ = %v m³", c, 25*units.CubicFoot)
	}
}

func TestCompare_MixedUnitsAndLandXML(t *testing.T) {
	// BEFORE in feet and AFTER in metres of the same metre site: put
	// through world coordinates into one frame, the pit is still 100 m³.
	dir := t.TempDir()
	flatFt := pitCSV(t, dir, "before_ft.csv", 0, 1/units.Foot)
	pit := pitCSV(t, dir, "after_m.csv", 3, 1)
	doc := runJSON(t, newCompareCmd, "--crs", "local", "--before-units", "ft", "--after-units", "m", flatFt, pit)
	if c := num(t, doc, "cut_m3"); !close(c, 100, relTol) {
		t.Errorf("ft before, m after: cut %v m³, want 100", c)
	}
	if doc["units"] != "ft" || doc["before"].(map[string]any)["units"] != "ft" || doc["after"].(map[string]any)["units"] != "m" {
		t.Errorf("units %v, before %v, after %v", doc["units"], doc["before"], doc["after"])
	}

	// The before surface as LandXML (written by surface) against the
	// as-built shots. LandXML keeps 4 decimals of a metre, which moves
	// the corners by up to 0.05 mm: well under 1e-5 of the volume.
	lx := filepath.Join(dir, "before.xml")
	if _, _, err := runCommand(t, newSurfaceCmd, nil, false, "--crs", "local", pitCSV(t, dir, "flat.csv", 0, 1), "--landxml", lx); err != nil {
		t.Fatal(err)
	}
	doc = runJSON(t, newCompareCmd, "--crs", "local", lx, pit)
	if c := num(t, doc, "cut_m3"); !close(c, 100, 1e-5) || doc["before"].(map[string]any)["input"].(map[string]any)["format"] != "landxml" {
		t.Errorf("LandXML before: cut %v m³, want 100; before %v", c, doc["before"])
	}
}

func TestCompare_Rejected(t *testing.T) {
	dir := t.TempDir()
	flat := pitCSV(t, dir, "before.csv", 0, 1)
	pit := pitCSV(t, dir, "after.csv", 3, 1)
	// A copy of the pit 1 km east: same grid, no common area.
	far := writeFile(t, dir, "far.csv", "id,easting,northing,elevation\n1,2000,2000,10\n2,2010,2000,10\n3,2010,2010,10\n")
	// The flat site labelled as a UTM zone, written as LandXML with its
	// EPSG code.
	utmXML := filepath.Join(dir, "utm.xml")
	if _, _, err := runCommand(t, newSurfaceCmd, nil, false, "--crs", "EPSG:32615", flat, "--landxml", utmXML); err != nil {
		t.Fatal(err)
	}
	bow := writeFile(t, dir, "bow.geojson", `{"type":"FeatureCollection","features":[{"type":"Feature","properties":{},
"geometry":{"type":"Polygon","coordinates":[[[1001,2001],[1009,2009],[1009,2001],[1001,2009],[1001,2001]]]}}]}`)
	tests := []struct {
		name string
		args []string
		want ExitCode
		msg  string
	}{
		{"no overlap", []string{"--crs", "local", flat, far}, ExitRejected, "do not overlap"},
		{"different systems", []string{flat, utmXML}, ExitRejected, "before is in local, after in EPSG:32615"},
		{"self-crossing boundary", []string{"--crs", "local", flat, pit, "--boundary", bow}, ExitRejected, "--boundary " + bow},
		{"after too small", []string{"--crs", "local", flat, writeFile(t, dir, "two.csv", "id,easting,northing,elevation\n1,1000,2000,10\n2,1005,2000,9\n")},
			ExitRejected, "after: 2 survey points: a surface needs at least 3"},
		{"bad before units", []string{"--before-units", "yd", flat, pit}, ExitUsage, "--before-units"},
		{"missing after", []string{flat, filepath.Join(dir, "missing.csv")}, ExitFailure, "after: "},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			stdout, _, err := runCommand(t, newCompareCmd, nil, false, tc.args...)
			if got := exitCodeOf(err); got != tc.want {
				t.Fatalf("compare %v: error %v gives exit %d, want %d", tc.args, err, got, tc.want)
			}
			if !strings.Contains(err.Error(), tc.msg) {
				t.Errorf("error %q lacks %q", err, tc.msg)
			}
			if stdout != "" {
				t.Errorf("stdout = %q, want nothing on error", stdout)
			}
		})
	}
	_, _, err := runCommand(t, newCompareCmd, nil, false, flat, utmXML)
	if !errors.Is(err, survey.ErrMixedCRS) {
		t.Errorf("different systems: %v, want survey.ErrMixedCRS in the chain", err)
	}
}
