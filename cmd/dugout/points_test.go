package main

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/spf13/cobra"

	"github.com/dugout-estimating/dugout/internal/las"
	"github.com/dugout-estimating/dugout/internal/survey"
	"github.com/dugout-estimating/dugout/internal/units"
)

const surveyTestdata = "../../internal/survey/testdata/"

// runPointsCmd runs `dugout points args...` on fake streams.
func runPointsCmd(t *testing.T, app *App, args ...string) (stdout, stderr string, err error) {
	t.Helper()
	var out, errb bytes.Buffer
	if app == nil {
		app = &App{}
	}
	app.IO = &IOStreams{In: strings.NewReader(""), Out: &out, ErrOut: &errb, ErrIsTTY: app.IO != nil && app.IO.ErrIsTTY}
	cmd := newPointsCmd(app)
	cmd.SetArgs(args)
	cmd.SetOut(&out)
	cmd.SetErr(&errb)
	cmd.SilenceUsage = true
	cmd.SilenceErrors = true
	err = cmd.ExecuteContext(context.Background())
	return out.String(), errb.String(), err
}

func TestPoints_Text(t *testing.T) {
	out, stderr, err := runPointsCmd(t, nil, "--units", "ft", "--columns", "pnezd", surveyTestdata+"ts_pnezd.txt")
	if err != nil {
		t.Fatalf("points: %v\n%s", err, stderr)
	}
	// The file's extent by hand: E 1000.000–1012.020, N 5000.000–5015.010,
	// Z 98.402–100.000 ft (testdata/ts_pnezd.txt).
	for _, want := range []string{
		"points      12\n",
		"units       ft\n",
		"crs         local\n",
		"bounds      E 1000.00 to 1012.02, N 5000.00 to 5015.01 (12.02 × 15.01 ft)\n",
		"elevation   98.40 to 100.00 ft\n",
		"breaklines  BL1 (3 points,",
		"duplicates  0 exact, 0 within 0.03 ft\n",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("stdout lacks %q:\n%s", want, out)
		}
	}
	if stderr != "" {
		t.Errorf("stderr = %q, want nothing", stderr)
	}
	// --out-units prints the same survey in metres.
	out, _, err = runPointsCmd(t, nil, "--units", "ft", "--columns", "PNEZD", "--out-units", "m", surveyTestdata+"ts_pnezd.txt")
	if err != nil || !strings.Contains(out, "bounds      E 304.800 to 308.464, N 1524.000 to 1528.575 (3.664 × 4.575 m)") {
		t.Errorf("--out-units m: %v\n%s", err, out)
	}
}

func TestPoints_Deterministic(t *testing.T) {
	// Same inputs and flags give byte-identical stdout, text and JSON.
	args := []string{surveyTestdata + "gps_lonlat.csv", surveyTestdata + "gps.gpx", surveyTestdata + "site.geojson"}
	for _, app := range []func() *App{func() *App { return nil }, func() *App { return &App{JSON: true} }} {
		a, _, err1 := runPointsCmd(t, app(), args...)
		b, _, err2 := runPointsCmd(t, app(), args...)
		if err1 != nil || err2 != nil || a != b || a == "" {
			t.Errorf("two runs: %v %v\n%s\n%s", err1, err2, a, b)
		}
	}
}

func TestPoints_JSON(t *testing.T) {
	app := &App{JSON: true}
	out, _, err := runPointsCmd(t, app, surveyTestdata+"gps_lonlat.csv")
	if err != nil {
		t.Fatal(err)
	}
	var doc map[string]any
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatalf("stdout is not one JSON document: %v\n%s", err, out)
	}
	for _, k := range []string{"schema_version", "count", "bounds", "crs", "units", "warnings", "elevation_min_m", "accuracy", "duplicates", "spikes"} {
		if _, ok := doc[k]; !ok {
			t.Errorf("JSON lacks %q", k)
		}
	}
	if doc["schema_version"] != 1.0 || doc["count"] != 12.0 || doc["units"] != "m" {
		t.Errorf("schema_version %v count %v units %v, want 1, 12, m", doc["schema_version"], doc["count"], doc["units"])
	}
	crs := doc["crs"].(map[string]any)
	if crs["epsg"] != 32615.0 || crs["kind"] != "projected" {
		t.Errorf("crs = %v, want projected EPSG:32615", crs)
	}
	b := doc["bounds"].(map[string]any)
	// The GPS file was made from UTM 15N positions E 512300, N 4876500 on
	// (testdata generator); back through lon/lat at 9 decimals that is
	// within a millimetre.
	if e := b["min_easting_m"].(float64); e < 512299.999 || e > 512300.001 {
		t.Errorf("min_easting_m = %v, want 512300 within 1 mm", e)
	}
	h := doc["accuracy"].(map[string]any)["horizontal"].(map[string]any)
	if h["min_m"] != 0.3 || h["max_m"] != 2.0 {
		t.Errorf("accuracy = %v, want min 0.3 max 2", h)
	}
}

func TestPoints_Export(t *testing.T) {
	dir := t.TempDir()
	dst := filepath.Join(dir, "out.csv")
	_, _, err := runPointsCmd(t, nil, "--units", "ft", "--columns", "PNEZD", "--export", dst, surveyTestdata+"ts_pnezd.txt")
	if err != nil {
		t.Fatal(err)
	}
	b, err := os.ReadFile(dst)
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(string(b), "\n")
	// In feet, because --units says so; world coordinates of the grid.
	if lines[0] != "id,easting,northing,elevation,description" || lines[1] != "1,1000,5000,100,CP1 control nail" {
		t.Errorf("export starts %q, %q", lines[0], lines[1])
	}
	entries, _ := os.ReadDir(dir)
	if len(entries) != 1 {
		t.Errorf("directory holds %v, want only out.csv (no temporary file left)", entries)
	}
	// Read back, the export is the same survey.
	a, err := survey.Read([]string{surveyTestdata + "ts_pnezd.txt"}, survey.Options{Units: units.Feet, Columns: "PNEZD"})
	if err != nil {
		t.Fatal(err)
	}
	c, err := survey.Read([]string{dst}, survey.Options{Units: units.Feet})
	if err != nil {
		t.Fatal(err)
	}
	for i := range a.Points {
		if a.Points[i].P != c.Points[i].P || a.Points[i].Code != c.Points[i].Code {
			t.Errorf("point %d: %+v, exported %+v", i, a.Points[i], c.Points[i])
		}
	}
	// --out-units m overrides, and "-" writes the CSV alone to stdout.
	out, _, err := runPointsCmd(t, nil, "--units", "ft", "--columns", "PNEZD", "--out-units", "m", "--export", "-", surveyTestdata+"ts_pnezd.txt")
	if err != nil || !strings.HasPrefix(out, "id,easting,northing,elevation,description\n1,304.8,1524,30.48,CP1 control nail\n") {
		t.Errorf("--export - in m: %v\n%s", err, out)
	}
	// An export into a missing directory fails without leaving anything.
	if _, _, err := runPointsCmd(t, nil, "--units", "ft", "--columns", "PNEZD", "--export", filepath.Join(dir, "no", "x.csv"), surveyTestdata+"ts_pnezd.txt"); err == nil {
		t.Error("export into a missing directory succeeded")
	}
}

func TestPoints_WarningsAndQuiet(t *testing.T) {
	out, stderr, err := runPointsCmd(t, nil, surveyTestdata+"track_noele.gpx")
	if err != nil {
		t.Fatalf("a GPX without elevations is summarised: %v", err)
	}
	if !strings.Contains(out, "points      5 (5 without elevation)") || !strings.Contains(stderr, "warning: ") || !strings.Contains(stderr, "GPX has no <ele>") {
		t.Errorf("stdout %q stderr %q", out, stderr)
	}
	if strings.Contains(out, "warning:") {
		t.Error("a warning went to stdout")
	}
	_, stderr, err = runPointsCmd(t, &App{Quiet: true}, surveyTestdata+"track_noele.gpx")
	if err != nil || stderr != "" {
		t.Errorf("--quiet: %v, stderr %q", err, stderr)
	}
}

func TestPoints_Progress(t *testing.T) {
	// Progress goes to stderr only when it is a terminal and not --quiet.
	app := &App{IO: &IOStreams{ErrIsTTY: true}}
	_, stderr, err := runPointsCmd(t, app, "--units", "ft", "--columns", "PNEZD", surveyTestdata+"ts_pnezd.txt")
	if err != nil || !strings.Contains(stderr, "reading 100%") {
		t.Errorf("TTY: %v, stderr %q, want progress", err, stderr)
	}
	_, stderr, _ = runPointsCmd(t, nil, "--units", "ft", "--columns", "PNEZD", surveyTestdata+"ts_pnezd.txt")
	if strings.Contains(stderr, "reading") {
		t.Errorf("not a TTY: stderr %q, want no progress", stderr)
	}
}

func TestPoints_Errors(t *testing.T) {
	tmp := t.TempDir()
	bad := filepath.Join(tmp, "bad.csv")
	if err := os.WriteFile(bad, []byte("id,n,e,z\n1,50O0,1000,100\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		name string
		args []string
		want ExitCode
	}{
		{"no files", nil, ExitUsage},
		{"bad units", []string{"--units", "yd", bad}, ExitUsage},
		{"bad crs", []string{"--crs", "UTM15", bad}, ExitUsage},
		{"bad columns", []string{"--columns", "PNEX", bad}, ExitUsage},
		{"bad thin", []string{"--thin", "-1ft", bad}, ExitUsage},
		{"bad thin mode", []string{"--thin", "1ft", "--thin-mode", "max", bad}, ExitUsage},
		{"bad class", []string{"--las-class", "300", bad}, ExitUsage},
		{"class and all", []string{"--las-class", "2", "--las-all-classes", bad}, ExitUsage},
		{"bad out units", []string{"--out-units", "mi", bad}, ExitUsage},
		{"bad breakline code", []string{"--breakline-code", "top wall", bad}, ExitUsage},
		{"rejected data", []string{bad}, ExitRejected},
		{"headerless without columns", []string{surveyTestdata + "ts_pnezd.txt"}, ExitRejected},
		{"missing file", []string{filepath.Join(tmp, "missing.csv")}, ExitFailure},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, _, err := runPointsCmd(t, nil, tc.args...)
			if got := exitCodeOf(err); got != tc.want {
				t.Errorf("points %v: error %v gives exit %d, want %d", tc.args, err, got, tc.want)
			}
		})
	}
	_, _, err := runPointsCmd(t, nil, bad)
	var pe *survey.ParseError
	if !errors.As(err, &pe) || pe.Line != 2 || pe.Field != "n" {
		t.Errorf("rejected error = %v, want the ParseError at line 2, field n", err)
	}
}

// exitCodeOf maps an error to the exit code Main would give it.
func exitCodeOf(err error) ExitCode {
	var fe *FlagError
	var re *RejectedError
	switch {
	case err == nil:
		return ExitOK
	case errors.As(err, &fe) || isCobraUsageError(err):
		return ExitUsage
	case errors.As(err, &re):
		return ExitRejected
	}
	return ExitFailure
}

func TestSurveyFlags_Options(t *testing.T) {
	// Parsed from the command line, repeatable flags accumulate.
	var f surveyFlags
	cmd := &cobra.Command{Use: "x"}
	f.add(cmd)
	if err := cmd.ParseFlags([]string{"--units", "ft", "--las-class", "2", "--las-class", "9", "--breakline-code", "TW", "--breakline-code", "BW", "--thin", "0.5m"}); err != nil {
		t.Fatal(err)
	}
	opt, err := f.options()
	if err != nil || opt.Units != units.Feet || len(opt.LAS.Classes) != 2 || len(opt.BreaklineCodes) != 2 || opt.LAS.ThinCell != 0.5 || opt.LAS.Thin != las.ThinLowest {
		t.Errorf("parsed options = %+v, %v", opt, err)
	}
	g := surveyFlags{units: "usft", crs: "EPSG:2903", columns: "penzd", breaklineCodes: []string{"TW", "BW"},
		lasClasses: []int{2, 9}, thin: "2", thinMode: "mean"}
	opt, err = g.options()
	if err != nil {
		t.Fatal(err)
	}
	if opt.Units != units.USFeet || opt.CRS.CRS.EPSG != 2903 || opt.Columns != "PENZD" || len(opt.BreaklineCodes) != 2 ||
		len(opt.LAS.Classes) != 2 || opt.LAS.Classes[1] != 9 {
		t.Errorf("options = %+v", opt)
	}
	// A bare --thin number is in --units: 2 US survey feet.
	if want := 2 * units.USSurveyFoot; opt.LAS.ThinCell != want {
		t.Errorf("ThinCell = %v m, want %v", opt.LAS.ThinCell, want)
	}
	d := surveyFlags{units: "m", crs: "auto", thinMode: "lowest"}
	opt, err = d.options()
	if err != nil || !opt.CRS.Auto || opt.BreaklineCodes != nil || opt.LAS.ThinCell != 0 {
		t.Errorf("defaults = %+v, %v", opt, err)
	}
}
