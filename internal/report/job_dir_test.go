package report

import (
	"bytes"
	"context"
	"encoding/csv"
	"encoding/json"
	"errors"
	"image/png"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"

	"github.com/dugout-estimating/dugout/internal/estimate"
	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/landxml"
	"github.com/dugout-estimating/dugout/internal/reftest"
	"github.com/dugout-estimating/dugout/internal/sitefile"
)

// demoFolderNames are the files of the demo's report folder, in order.
var demoFolderNames = []string{"report.html", "plan.svg", "section-a.svg", "section-b.svg", "contours-existing.geojson",
	"contours-design.geojson", "contours-cutfill.geojson", "quantities.json", "quantities.csv", "stakeout.csv", "design-surface.xml"}

// demoReportDir writes the demo's report folder into a temporary folder
// of the test.
func demoReportDir(tb testing.TB) (string, []string) {
	tb.Helper()
	dir := tb.TempDir()
	files, err := WriteReportDir(dir, demoResult(tb), ReportOptions{Date: demoDate, Footer: "dugout (test)"})
	if err != nil {
		tb.Fatalf("WriteReportDir: %v", err)
	}
	return dir, files
}

func TestWriteReportDir_Files(t *testing.T) {
	dir, files := demoReportDir(t)
	var names []string
	for _, f := range files {
		if filepath.Dir(f) != dir {
			t.Errorf("%s is not in %s", f, dir)
		}
		names = append(names, filepath.Base(f))
	}
	if !slices.Equal(names, demoFolderNames) {
		t.Errorf("files %q, want %q", names, demoFolderNames)
	}
	entries, err := os.ReadDir(dir)
	if err != nil || len(entries) != len(demoFolderNames) {
		t.Errorf("folder holds %d entries (%v), want only the %d files (no temporary ones)", len(entries), err, len(demoFolderNames))
	}
	// The report is self-contained, well-formed XML, and shows the job.
	page, _ := os.ReadFile(filepath.Join(dir, "report.html"))
	low := strings.ToLower(string(page))
	for _, m := range urlMarkers {
		if strings.Contains(low, m) {
			t.Errorf("report.html holds %q", m)
		}
	}
	root := parseXML(t, page)
	var ids []string
	for _, s := range root.find(func(n *xmlNode) bool { return n.Name == "section" }) {
		ids = append(ids, s.Attr["id"])
	}
	if got := strings.Join(ids, " "); got != "summary plan sections quantities rules methods cautions stakeout" {
		t.Errorf("report parts %q", got)
	}
	// quantities.json and .csv are the writers' own output.
	var want bytes.Buffer
	if err := WriteJSON(&want, demoResult(t)); err != nil {
		t.Fatal(err)
	}
	if got, _ := os.ReadFile(filepath.Join(dir, "quantities.json")); !bytes.Equal(got, want.Bytes()) {
		t.Error("quantities.json differs from WriteJSON")
	}
	// Every file is whole: a second run writes the same bytes.
	again := t.TempDir()
	if _, err := WriteReportDir(again, demoResult(t), ReportOptions{Date: demoDate, Footer: "dugout (test)"}); err != nil {
		t.Fatal(err)
	}
	for _, n := range demoFolderNames {
		a, _ := os.ReadFile(filepath.Join(dir, n))
		b, _ := os.ReadFile(filepath.Join(again, n))
		if !bytes.Equal(a, b) {
			t.Errorf("%s differs between two runs", n)
		}
	}
}

func TestWriteReportDir_CheckedFirst(t *testing.T) {
	file := filepath.Join(t.TempDir(), "file")
	if err := os.WriteFile(file, []byte("keep"), 0o644); err != nil {
		t.Fatal(err)
	}
	files, err := WriteReportDir(file, demoResult(t), ReportOptions{})
	if !errors.Is(err, ErrOutputDir) || len(files) != 0 {
		t.Errorf("WriteReportDir(<file>) = %v, %v; want ErrOutputDir and nothing written", files, err)
	}
	// A bad setting fails before anything is written.
	dir := t.TempDir()
	if _, err := WriteReportDir(dir, demoResult(t), ReportOptions{StakeSpacingM: -1}); err == nil {
		t.Error("a negative stake spacing was accepted")
	}
	if entries, _ := os.ReadDir(dir); len(entries) != 0 {
		t.Errorf("a failed report left %d files", len(entries))
	}
}

func TestWriteReportDir_Stakeout(t *testing.T) {
	dir, _ := demoReportDir(t)
	f, err := os.Open(filepath.Join(dir, "stakeout.csv"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if got := strings.Join(recs[0], ","); got != "id,easting_ft,northing_ft,existing_ft,finished_ft,cut_fill_ft,cut_or_fill,note" {
		t.Errorf("header %q", got)
	}
	r := demoResult(t)
	w := r.Design.WaterLevelM / 0.3048 // international foot, 85 FR 62698
	lines := map[string]int{}
	for _, rec := range recs[1:] {
		lines[rec[0][:1]]++
		e, _ := strconv.ParseFloat(rec[1], 64)
		n, _ := strconv.ParseFloat(rec[2], 64)
		// The total-station frame of the demo: E 1000–1082, N 5000–5057
		// ft (testdata/demo/README.md and `dugout points`).
		if e < 1000 || e > 1082 || n < 5000 || n > 5057 {
			t.Errorf("%s at E %v N %v, outside the survey", rec[0], e, n)
		}
		if rec[0][0] == 'W' {
			// The water line is traced on the 31 mm lattice and stakes
			// fall on chords between its points: within 1.5 mm.
			if d, _ := strconv.ParseFloat(rec[4], 64); math.Abs(d-w) > 0.005 {
				t.Errorf("%s: finished %v, want the water level %.3f ft", rec[0], d, w)
			}
		}
	}
	if lines["W"] == 0 || lines["Z"] == 0 || lines["T"] == 0 {
		t.Errorf("stakes per line %v, want water's edge, zone floors and the edge of the work", lines)
	}
}

func TestWriteReportDir_LandXMLVolume(t *testing.T) {
	// An independent reading of design-surface.xml: Python's ElementTree
	// parses the LandXML 1.2 points (northing easting elevation, in feet)
	// and faces, and the water the basin around the lowest point holds
	// below the water level is integrated triangle by triangle (the exact
	// integral of a linear depth clipped at zero); the result must be the
	// design's water volume. This
	// checks the coordinate order, the unit and the frame origin together.
	py := reftest.Python(t, "numpy")
	dir, _ := demoReportDir(t)
	r := demoResult(t)
	script := `
import sys, numpy as np, xml.etree.ElementTree as ET
ns = {"l": "http://www.landxml.org/schema/LandXML-1.2"}
root = ET.parse(sys.argv[1]).getroot()
unit = root.find("l:Units/l:Imperial", ns).get("linearUnit")
assert unit == "foot", unit
ft = 0.3048
pts = {}
for p in root.iter("{%s}P" % ns["l"]):
    n, e, z = map(float, p.text.split())
    pts[p.get("id")] = (e * ft, n * ft, z * ft)
W = float(sys.argv[2])
faces = [tuple(f.text.split()) for f in root.iter("{%s}F" % ns["l"])]
# The pond is the basin under W that holds the lowest point: faces below
# W joined through shared edges (ground outside the berm may lie below W
# too, but the berm crest, above W, separates it).
by_edge = {}
for k, f in enumerate(faces):
    for e in ((f[0], f[1]), (f[1], f[2]), (f[2], f[0])):
        by_edge.setdefault(frozenset(e), []).append(k)
low = min(pts, key=lambda i: pts[i][2])
todo = [k for k, f in enumerate(faces) if low in f]
seen = set(todo)
while todo:
    k = todo.pop()
    f = faces[k]
    for e in ((f[0], f[1]), (f[1], f[2]), (f[2], f[0])):
        for m in by_edge[frozenset(e)]:
            if m not in seen and min(pts[i][2] for i in faces[m]) < W:
                seen.add(m)
                todo.append(m)
total = 0.0
for k in sorted(seen):
    a, b, c = (np.array(pts[i]) for i in faces[k])
    area = abs((b[0]-a[0])*(c[1]-a[1]) - (c[0]-a[0])*(b[1]-a[1])) / 2
    h = sorted([W - a[2], W - b[2], W - c[2]], reverse=True)  # depths, largest first
    h1, h2, h3 = h
    if h3 >= 0:
        total += area * (h1 + h2 + h3) / 3
    elif h1 <= 0:
        pass
    elif h2 <= 0:
        total += area * h1**3 / (3 * (h1 - h2) * (h1 - h3))
    else:
        total += area * ((h1 + h2 + h3) / 3 + (-h3)**3 / (3 * (h1 - h3) * (h2 - h3)))
print(repr(total))
`
	out, err := exec.Command(py, "-c", script, filepath.Join(dir, "design-surface.xml"), strconv.FormatFloat(r.Design.WaterLevelM, 'g', -1, 64)).CombinedOutput()
	if err != nil {
		t.Fatalf("python: %v\n%s", err, out)
	}
	got, err := strconv.ParseFloat(strings.TrimSpace(string(out)), 64)
	if err != nil {
		t.Fatalf("python printed %q", out)
	}
	// Coordinates are written to 0.0001 ft (landxml.Decimals); over a
	// 2.5 ft deep pond that moves the volume by far less than 1e-4 of it.
	if want := r.Design.WaterVolumeM3; math.Abs(got-want) > 1e-4*want {
		t.Errorf("water below %.4f m in design-surface.xml = %.6f m³, want the design's %.6f m³", r.Design.WaterLevelM, got, want)
	}
	// Read back with our own reader: world coordinates in metres.
	f, err := os.Open(filepath.Join(dir, "design-surface.xml"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	ss, err := landxml.Read(f)
	if err != nil || len(ss) != 1 || ss[0].Units != landxml.Feet {
		t.Fatalf("landxml.Read: %v, %d surfaces", err, len(ss))
	}
	b := geom.EmptyBox()
	for _, p := range ss[0].Mesh.V {
		b = b.Extend(p.XY())
	}
	if c := r.Survey.Frame.ToLocal(b.Center()); c.Norm() > 20 {
		t.Errorf("surface centred at local %v: the frame origin was not added", c)
	}
}

func TestWriteReportDir_GeoJSONInGDAL(t *testing.T) {
	// GDAL's GeoJSON driver (RFC 7946) reads every contour file: line
	// strings with an elevation on the contour interval (0.5 ft in the demo
	// site file), and our CRS note as a foreign member.
	py := reftest.Python(t, "osgeo.ogr")
	dir, _ := demoReportDir(t)
	script := `
import sys, json
from osgeo import ogr
for name in sys.argv[1:]:
    ds = ogr.Open(name)
    assert ds is not None, name
    lyr = ds.GetLayer(0)
    n, bad, levels = 0, 0, set()
    for f in lyr:
        g = f.GetGeometryRef()
        if g.GetGeometryType() not in (ogr.wkbLineString, ogr.wkbLineString25D):
            bad += 1
        z = f.GetField("elevation")
        levels.add(round(z * 2) / 2)
        if abs(z * 2 - round(z * 2)) > 1e-6:
            bad += 1
        n += 1
    crs = json.load(open(name)).get("dugout:crs")
    print(name.rsplit("/", 1)[-1], n, bad, len(levels), crs)
`
	var args []string
	for _, n := range []string{"contours-existing.geojson", "contours-design.geojson", "contours-cutfill.geojson"} {
		args = append(args, filepath.Join(dir, n))
	}
	out, err := exec.Command(py, append([]string{"-c", script}, args...)...).CombinedOutput()
	if err != nil {
		t.Fatalf("python: %v\n%s", err, out)
	}
	for _, line := range strings.Split(strings.TrimSpace(string(out)), "\n") {
		f := strings.Fields(line)
		if len(f) < 5 || f[1] == "0" || f[2] != "0" || strings.Join(f[4:], " ") != "local frame; units ft" {
			t.Errorf("GDAL read %q: want features, none off the 0.5 ft interval, and the CRS note", line)
		}
	}
	// Cut/fill lines: level 0 is the edge of the work, one closed line.
	var doc struct {
		Features []struct {
			Properties struct {
				Elevation float64 `json:"elevation"`
				Closed    bool    `json:"closed"`
			} `json:"properties"`
		} `json:"features"`
	}
	b, _ := os.ReadFile(filepath.Join(dir, "contours-cutfill.geojson"))
	if err := json.Unmarshal(b, &doc); err != nil {
		t.Fatal(err)
	}
	zero := 0
	for _, f := range doc.Features {
		if f.Properties.Elevation == 0 {
			zero++
			if !f.Properties.Closed {
				t.Error("the edge of the work is not closed")
			}
		}
	}
	if zero != len(demoResult(t).WorkEdge()) {
		t.Errorf("%d level-0 lines, want the %d lines of the work edge", zero, len(demoResult(t).WorkEdge()))
	}
}

func TestWriteReportDir_Chromium(t *testing.T) {
	// The demo report in headless Chromium: a drawn page with the cut
	// shading of the plan, and no request for anything outside the file.
	bin := reftest.Tool(t, "chromium")
	dir, _ := demoReportDir(t)
	trap := newProxyTrap(t)
	shot := filepath.Join(t.TempDir(), "report.png")
	runChromium(t, bin, chromiumArgs(t.TempDir(), trap.addr(), "--screenshot="+shot, "--window-size=1200,2400", "--hide-scrollbars",
		"file://"+filepath.Join(dir, "report.html"))...)
	f, err := os.Open(shot)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	img, err := png.Decode(f)
	if err != nil {
		t.Fatal(err)
	}
	ink, cut := countInk(img)
	if total := img.Bounds().Dx() * img.Bounds().Dy(); ink < total/50 || cut < 200 {
		t.Errorf("screenshot: %d inked and %d cut-shaded pixels of %d: the page or the plan did not draw", ink, cut, total)
	}
	if reqs := trap.pageRequests(); len(reqs) > 0 {
		t.Errorf("the report made network requests: %q", reqs)
	}
}

func BenchmarkWriteReportDirDemo(b *testing.B) {
	r := demoResult(b)
	dir := b.TempDir()
	b.ReportAllocs()
	for b.Loop() {
		if _, err := WriteReportDir(dir, r, ReportOptions{Date: demoDate}); err != nil {
			b.Fatal(err)
		}
	}
}

func TestWriteReportDir_SiteSections(t *testing.T) {
	// The demo with a section line of its own, given in the survey's
	// coordinates (ft, total-station frame) across the pond from west to
	// east, and the survey points shown on the plan.
	s, err := sitefile.Load(demoSitePath)
	if err != nil {
		t.Fatal(err)
	}
	for _, set := range []string{"report.sections=[[1028.0, 5038.0, 1057.0, 5040.0]]", "report.show_points=true"} {
		if err := s.Set(set); err != nil {
			t.Fatal(err)
		}
	}
	j, err := estimate.FromSite(s)
	if err != nil {
		t.Fatal(err)
	}
	r, err := estimate.Run(context.Background(), j)
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	files, err := WriteReportDir(dir, r, ReportOptions{Date: demoDate})
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Contains(files, filepath.Join(dir, "section-c.svg")) {
		t.Errorf("no section-c.svg among %q", files)
	}
	sec, _ := os.ReadFile(filepath.Join(dir, "section-c.svg"))
	if !bytes.Contains(sec, []byte("Section C–C&#39;")) {
		t.Error("section-c.svg is not section C–C'")
	}
	plan, _ := os.ReadFile(filepath.Join(dir, "plan.svg"))
	if !bytes.Contains(plan, []byte(`class="survey-points"`)) || !bytes.Contains(plan, []byte(">403<")) {
		t.Error("the plan does not show the survey points (point 403 is on the pond outline)")
	}

	// A section line with an odd count of numbers is refused, naming it.
	if err := s.Set("report.sections=[[1028.0, 5038.0, 1057.0]]"); err != nil {
		t.Fatal(err)
	}
	_, err = WriteReportDir(t.TempDir(), r, ReportOptions{Date: demoDate})
	var ve *ValueError
	if !errors.As(err, &ve) || ve.Item != "report.sections[0]" {
		t.Errorf("odd section line: %v, want a *ValueError for report.sections[0]", err)
	}
}
