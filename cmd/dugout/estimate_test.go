package main

import (
	"encoding/csv"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/dugout-estimating/dugout/internal/report"
	"github.com/dugout-estimating/dugout/internal/units"
)

const demoSite = "../../testdata/demo/site.toml"

// runEstimateCmd runs `dugout estimate args...` through the root command,
// which gives it the global --json and --quiet flags.
func runEstimateCmd(t *testing.T, app *App, args ...string) (stdout, stderr string, err error) {
	t.Helper()
	return runCommand(t, newRootCmd, app, false, append([]string{"estimate"}, args...)...)
}

func TestEstimate_TextSummary(t *testing.T) {
	out, stderr, err := runEstimateCmd(t, nil, "--site", demoSite)
	if err != nil {
		t.Fatalf("estimate: %v\n%s", err, stderr)
	}
	for _, want := range []string{"Halvorsen-Obi garden pond\n", "WATER LEVEL AND RIM\n", "EARTHWORK AND HAUL\n", "LINER AND UNDERLAYMENT\n",
		"SHORELINE\n", "STONE, GRAVEL AND CREW\n", "WATER AND PUMP\n", "COST\n", "MEASURED AGAINST THE RULES OF THUMB\n", "CAUTIONS\n",
		"\nDate     ", "  ! DANGER: Buried utilities."} {
		if !strings.Contains(out, want) {
			t.Errorf("summary lacks %q", want)
		}
	}
	if strings.Contains(out, "Report written") {
		t.Error("summary lists report files without --report")
	}
	// The same job as JSON: the summary's cut is the JSON's cut_m3 in
	// cubic yards of 0.764554857984 m³ (0.9144³, NBS 1959 yard), to 0.1.
	doc := runJSON(t, newRootCmd, "estimate", "--json", "--site", demoSite)
	cut := num(t, doc, "earthwork.cut_m3") / units.CubicYard
	if want := fmt.Sprintf("%.1f yd³", cut); !strings.Contains(lineOf(out, "Cut (bank)"), want) {
		t.Errorf("cut line %q lacks %q", lineOf(out, "Cut (bank)"), want)
	}
	// Water: US gallons of 231 in³ exactly (NIST Handbook 44 App. C).
	gal := num(t, doc, "water.volume_m3") / (231 * 0.0254 * 0.0254 * 0.0254)
	if want := groupThousands(fmt.Sprintf("%.0f", gal)) + " US gal"; !strings.Contains(lineOf(out, "Water volume"), want) {
		t.Errorf("water line %q lacks %q", lineOf(out, "Water volume"), want)
	}
}

// lineOf returns the first line of s that contains key.
func lineOf(s, key string) string {
	for _, l := range strings.Split(s, "\n") {
		if strings.Contains(l, key) {
			return l
		}
	}
	return ""
}

// groupThousands puts US thousands separators into a whole number.
func groupThousands(s string) string {
	for i := len(s) - 3; i > 0; i -= 3 {
		s = s[:i] + "," + s[i:]
	}
	return s
}

func TestEstimate_JSONWithReport(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "out")
	out, stderr, err := runEstimateCmd(t, nil, "--json", "--site", demoSite, "--report", dir)
	if err != nil {
		t.Fatalf("estimate: %v\n%s", err, stderr)
	}
	// stdout is one JSON document; the list of files went to stderr.
	if !strings.HasPrefix(out, "{") || strings.Count(out, "\n}\n") != 1 || !strings.HasSuffix(out, "}\n") {
		t.Errorf("stdout is not one JSON document:\n%.200s", out)
	}
	for _, name := range []string{"report.html", "plan.svg", "section-a.svg", "section-b.svg", "contours-existing.geojson",
		"contours-design.geojson", "contours-cutfill.geojson", "quantities.json", "quantities.csv", "stakeout.csv", "design-surface.xml"} {
		path := filepath.Join(dir, name)
		if !strings.Contains(stderr, path+"\n") {
			t.Errorf("stderr does not list %s:\n%s", path, stderr)
		}
		if fi, err := os.Stat(path); err != nil || fi.Size() == 0 {
			t.Errorf("%s: %v", name, err)
		}
	}
	// quantities.json is the document printed.
	if b, err := os.ReadFile(filepath.Join(dir, "quantities.json")); err != nil || string(b) != out {
		t.Errorf("quantities.json differs from stdout (%v)", err)
	}
}

func TestEstimate_ReportFolderCheckedFirst(t *testing.T) {
	// A folder that is a file fails before any work, with nothing on
	// stdout.
	file := filepath.Join(t.TempDir(), "file")
	if err := os.WriteFile(file, []byte("x"), 0o644); err != nil {
		t.Fatal(err)
	}
	out, _, err := runEstimateCmd(t, nil, "--site", demoSite, "--report", file)
	if !errors.Is(err, report.ErrOutputDir) || out != "" {
		t.Errorf("estimate --report <file> = %v, stdout %q; want ErrOutputDir and nothing printed", err, out)
	}
	// And a bad site file still fails as input rejected, folder or not.
	_, _, err = runEstimateCmd(t, nil, "--site", filepath.Join(t.TempDir(), "none.toml"))
	var re *RejectedError
	if !errors.As(err, &re) {
		t.Errorf("missing site file: %v, want a *RejectedError", err)
	}
}

func TestEstimate_StakeSpacing(t *testing.T) {
	stakes := func(spacing string) int {
		t.Helper()
		dir := t.TempDir()
		args := []string{"--site", demoSite, "--report", dir}
		if spacing != "" {
			args = append(args, "--stake-spacing", spacing)
		}
		if _, stderr, err := runEstimateCmd(t, nil, args...); err != nil {
			t.Fatalf("estimate %v: %v\n%s", args, err, stderr)
		}
		f, err := os.Open(filepath.Join(dir, "stakeout.csv"))
		if err != nil {
			t.Fatal(err)
		}
		defer f.Close()
		recs, err := csv.NewReader(f).ReadAll()
		if err != nil {
			t.Fatal(err)
		}
		return len(recs) - 1
	}
	// The site file says 3 ft; 6 ft halves the stakes per line, to within
	// one per line (each closed line gets ⌈L/spacing⌉): 4 lines here.
	at3, at6 := stakes(""), stakes("6ft")
	if at6 < at3/2-4 || at6 > at3/2+4 {
		t.Errorf("%d stakes at 6 ft against %d at 3 ft, want about half", at6, at3)
	}
	_, _, err := runEstimateCmd(t, nil, "--site", demoSite, "--report", t.TempDir(), "--stake-spacing", "0")
	var re *RejectedError
	if !errors.As(err, &re) {
		t.Errorf("--stake-spacing 0: %v, want input rejected", err)
	}
}
