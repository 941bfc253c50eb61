package las

import (
	"bufio"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/reftest"
	"github.com/dugout-estimating/dugout/internal/units"
)

// sharedLAS returns the path of one of the LiDAR samples in
// shared/data/las (from PDAL/PDAL, BSD licence, Copyright Hobu, Inc.; see
// shared/data/SOURCES.md).
func sharedLAS(tb testing.TB, name string) string {
	tb.Helper()
	return filepath.Join(reftest.SharedDir(tb), "data", "las", name)
}

// sourcesFacts are the facts shared/data/SOURCES.md states for each sample
// (read there with refbench/las2csv.py --info).
var sourcesFacts = []struct {
	file          string
	minor, format uint8
	count         uint64
	classes       map[uint8]uint64
	min, max      [3]float64
	epsg          int
	verticalEPSG  int
	unitM, vUnitM float64
	software      string
	year          uint16
	warnUnitClash bool
	groundCSV     string
	groundMin     [3]float64 // bounds of the class-2 points, SOURCES.md "Ground bounds"
	groundMax     [3]float64
}{
	{
		file: "autzen_trim.las", minor: 2, format: 3, count: 110000,
		classes: map[uint8]uint64{1: 83893, 2: 26107},
		min:     [3]float64{636001.76, 848935.20, 406.26}, max: [3]float64{637179.22, 849497.90, 520.51},
		// User-defined Lambert (ProjectedCSType 32767), unit key 9002 foot;
		// no vertical unit stated.
		epsg: 0, unitM: units.Foot, vUnitM: 0, software: "PDAL 1.0.0", year: 2015,
		groundCSV: "autzen_trim_ground_ft.csv",
		groundMin: [3]float64{636001.76, 848935.85, 406.26}, groundMax: [3]float64{637179.22, 849497.90, 434.06},
	},
	{
		file: "4_6_crop.las", minor: 2, format: 3, count: 23875,
		classes: map[uint8]uint64{1: 14872, 2: 9003},
		min:     [3]float64{1639600.00, 1454500.02, 7077.92}, max: [3]float64{1639799.98, 1454700.00, 7139.70},
		epsg: 2903, verticalEPSG: 5103, unitM: units.USSurveyFoot, vUnitM: units.USSurveyFoot, software: "PDAL 2.7.1", year: 2024,
		groundCSV: "4_6_crop_ground_ftUS.csv",
		groundMin: [3]float64{1639600.00, 1454500.02, 7077.92}, groundMax: [3]float64{1639799.97, 1454700.00, 7093.86},
	},
	{
		file: "mvk-thin.las", minor: 2, format: 1, count: 6280,
		classes: map[uint8]uint64{1: 129, 2: 1693, 4: 141, 5: 578, 9: 37, 12: 3702},
		min:     [3]float64{2045001.76, 1267501.19, 95.79}, max: [3]float64{2049993.92, 1272499.79, 228.73},
		// EPSG 26995 is metric but the unit key says US survey foot: a
		// warning, and the unit key is trusted (SOURCES.md).
		epsg: 26995, unitM: units.USSurveyFoot, vUnitM: units.USSurveyFoot, software: "GeoCue", year: 2010,
		warnUnitClash: true,
		groundCSV:     "mvk-thin_ground_ftUS.csv",
		groundMin:     [3]float64{2045012.10, 1267501.19, 96.05}, groundMax: [3]float64{2049993.92, 1272495.46, 142.48},
	},
}

// hundredths returns v in units of the files' 0.01 scale, rounded: the
// exact stored integer.
func hundredths(v float64) int64 { return int64(math.Round(v * 100)) }

func TestRead_SharedSamples(t *testing.T) {
	for _, f := range sourcesFacts {
		t.Run(f.file, func(t *testing.T) {
			path := sharedLAS(t, f.file)
			h, pts, st, err := Read(path, Options{})
			if err != nil {
				t.Fatal(err)
			}
			if h.Major != 1 || h.Minor != f.minor || h.PointFormat != f.format || h.Count != f.count {
				t.Errorf("header version %d.%d format %d count %d, want 1.%d format %d count %d (SOURCES.md)",
					h.Major, h.Minor, h.PointFormat, h.Count, f.minor, f.format, f.count)
			}
			if h.Scale != [3]float64{0.01, 0.01, 0.01} {
				t.Errorf("scale %v, want 0.01 (SOURCES.md)", h.Scale)
			}
			for i := range 3 {
				if hundredths(h.Min[i]) != hundredths(f.min[i]) || hundredths(h.Max[i]) != hundredths(f.max[i]) {
					t.Errorf("%s bounds %v–%v, want %v–%v (SOURCES.md)", axisName[i], h.Min[i], h.Max[i], f.min[i], f.max[i])
				}
			}
			if h.EPSG != f.epsg || h.VerticalEPSG != f.verticalEPSG || h.HorizontalUnitM != f.unitM || h.VerticalUnitM != f.vUnitM {
				t.Errorf("CRS EPSG %d vertical %d units %v/%v m, want %d, %d, %v/%v (SOURCES.md)",
					h.EPSG, h.VerticalEPSG, h.HorizontalUnitM, h.VerticalUnitM, f.epsg, f.verticalEPSG, f.unitM, f.vUnitM)
			}
			if !strings.HasPrefix(h.Software, f.software) || h.CreationYear != f.year {
				t.Errorf("software %q year %d, want %q… %d (SOURCES.md)", h.Software, h.CreationYear, f.software, f.year)
			}
			clash := false
			for _, w := range h.Warnings {
				clash = clash || strings.Contains(w, "unit key is trusted")
			}
			if clash != f.warnUnitClash {
				t.Errorf("unit-clash warning = %v, want %v; warnings %q", clash, f.warnUnitClash, h.Warnings)
			}
			if st.Read != f.count || !st.UsedGroundOnly || st.Kept != f.classes[ClassGround] || len(pts) != int(st.Kept) {
				t.Errorf("stats read %d kept %d ground-only %v, want %d, %d, true (SOURCES.md)", st.Read, st.Kept, st.UsedGroundOnly, f.count, f.classes[ClassGround])
			}
			if len(st.ClassCounts) != len(f.classes) {
				t.Errorf("class counts %v, want %v (SOURCES.md)", st.ClassCounts, f.classes)
			}
			for c, n := range f.classes {
				if st.ClassCounts[c] != n {
					t.Errorf("class %d: %d points, want %d (SOURCES.md)", c, st.ClassCounts[c], n)
				}
			}
			gb := boundsOf(pts)
			for i := range 3 {
				if hundredths(gb[0][i]) != hundredths(f.groundMin[i]) || hundredths(gb[1][i]) != hundredths(f.groundMax[i]) {
					t.Errorf("ground %s bounds %v–%v, want %v–%v (SOURCES.md)", axisName[i], gb[0][i], gb[1][i], f.groundMin[i], f.groundMax[i])
				}
			}
			// The class-2 points match the CSV made by refbench/las2csv.py
			// --class 2, point for point in file order, to the 0.01 scale.
			want := readCSV(t, filepath.Join(reftest.SharedDir(t), "data", "csv", f.groundCSV))
			comparePoints(t, pts, want)
			// Header return counts agree with the records.
			for i, n := range st.ReturnCounts {
				if n != h.ReturnCounts[i] {
					t.Errorf("points with return %d: %d, header says %d", i+1, n, h.ReturnCounts[i])
				}
			}
		})
	}
}

// TestRead_AllClassesCSV compares every point of autzen_trim.las with the
// all-classes CSV written by refbench/las2csv.py.
func TestRead_AllClassesCSV(t *testing.T) {
	_, pts, st, err := Read(sharedLAS(t, "autzen_trim.las"), Options{AllClasses: true})
	if err != nil {
		t.Fatal(err)
	}
	if st.UsedGroundOnly || st.Classes != nil {
		t.Errorf("AllClasses: UsedGroundOnly %v Classes %v, want false, nil", st.UsedGroundOnly, st.Classes)
	}
	comparePoints(t, pts, readCSV(t, filepath.Join(reftest.SharedDir(t), "data", "csv", "autzen_trim_all_ft.csv")))
}

func boundsOf(pts []geom.Vec3) [2][3]float64 {
	b := [2][3]float64{{math.Inf(1), math.Inf(1), math.Inf(1)}, {math.Inf(-1), math.Inf(-1), math.Inf(-1)}}
	for _, p := range pts {
		c := [3]float64{p.X, p.Y, p.Z}
		for i := range 3 {
			b[0][i] = math.Min(b[0][i], c[i])
			b[1][i] = math.Max(b[1][i], c[i])
		}
	}
	return b
}

func readCSV(tb testing.TB, path string) [][3]int64 {
	tb.Helper()
	f, err := os.Open(path)
	if err != nil {
		tb.Fatal(err)
	}
	defer f.Close()
	var out [][3]int64
	sc := bufio.NewScanner(f)
	sc.Scan() // header x,y,z
	for line := 2; sc.Scan(); line++ {
		fs := strings.Split(sc.Text(), ",")
		if len(fs) != 3 {
			tb.Fatalf("%s:%d: %q", path, line, sc.Text())
		}
		var r [3]int64
		for i, s := range fs {
			v, err := strconv.ParseFloat(s, 64)
			if err != nil {
				tb.Fatalf("%s:%d: %v", path, line, err)
			}
			r[i] = hundredths(v)
		}
		out = append(out, r)
	}
	if err := sc.Err(); err != nil {
		tb.Fatal(err)
	}
	return out
}

func comparePoints(tb testing.TB, got []geom.Vec3, want [][3]int64) {
	tb.Helper()
	if len(got) != len(want) {
		tb.Fatalf("%d points, the CSV has %d", len(got), len(want))
	}
	bad := 0
	for i, p := range got {
		g := [3]int64{hundredths(p.X), hundredths(p.Y), hundredths(p.Z)}
		if g != want[i] && bad < 5 {
			tb.Errorf("point %d = %v (hundredths), CSV row %d has %v", i, g, i+2, want[i])
			bad++
		}
	}
}

// las2csvInfo runs refbench/las2csv.py --info (an independent NumPy reader
// written from the ASPRS specification) on path and returns its JSON.
func las2csvInfo(tb testing.TB, path string) map[string]any {
	tb.Helper()
	py := reftest.Python(tb, "numpy")
	script := filepath.Join(reftest.SharedDir(tb), "refbench", "las2csv.py")
	out, err := exec.Command(py, script, path, "--info").Output()
	if err != nil {
		tb.Fatalf("las2csv.py %s --info: %v", path, err)
	}
	var m map[string]any
	if err := json.Unmarshal(out, &m); err != nil {
		tb.Fatalf("las2csv.py output: %v", err)
	}
	return m
}

// TestRead_Las2csv compares the header facts, class counts and point
// bounds with what refbench/las2csv.py --info prints, run live.
func TestRead_Las2csv(t *testing.T) {
	unitNames := map[string]float64{
		"metre": 1, "foot (international, 0.3048 m)": units.Foot, "US survey foot (1200/3937 m)": units.USSurveyFoot,
	}
	for _, f := range sourcesFacts {
		t.Run(f.file, func(t *testing.T) {
			path := sharedLAS(t, f.file)
			ref := las2csvInfo(t, path)
			h, pts, st, err := Read(path, Options{AllClasses: true})
			if err != nil {
				t.Fatal(err)
			}
			checkAgainstLas2csv(t, ref, h, st, pts)
			if u, ok := ref["linear_unit"].(string); ok && unitNames[u] != h.HorizontalUnitM {
				t.Errorf("horizontal unit %v m, las2csv says %q", h.HorizontalUnitM, u)
			}
			if u, ok := ref["vertical_unit"].(string); ok && unitNames[u] != h.VerticalUnitM {
				t.Errorf("vertical unit %v m, las2csv says %q", h.VerticalUnitM, u)
			}
			if e, ok := ref["crs_epsg"].(float64); ok && int(e) != h.EPSG {
				t.Errorf("EPSG %d, las2csv says %v", h.EPSG, e)
			}
			if w, _ := ref["wkt"].(string); strings.TrimSpace(w) != h.WKT {
				t.Errorf("WKT %q, las2csv says %q", h.WKT, w)
			}
			if g, _ := ref["geo_ascii"].(string); g != h.GeoASCII {
				t.Errorf("GeoASCII %q, las2csv says %q", h.GeoASCII, g)
			}
		})
	}
}

// checkAgainstLas2csv compares the fields both readers report.
func checkAgainstLas2csv(tb testing.TB, ref map[string]any, h Header, st Stats, pts []geom.Vec3) {
	tb.Helper()
	num := func(k string) float64 { v, _ := ref[k].(float64); return v }
	str := func(k string) string { v, _ := ref[k].(string); return v }
	if got := strconv.Itoa(int(h.Major)) + "." + strconv.Itoa(int(h.Minor)); got != str("version") {
		tb.Errorf("version %s, las2csv %s", got, str("version"))
	}
	if h.SystemID != str("system_id") || h.Software != str("software") {
		tb.Errorf("system %q software %q, las2csv %q %q", h.SystemID, h.Software, str("system_id"), str("software"))
	}
	if float64(h.CreationDay) != num("creation_day") || float64(h.CreationYear) != num("creation_year") {
		tb.Errorf("created day %d year %d, las2csv %v %v", h.CreationDay, h.CreationYear, num("creation_day"), num("creation_year"))
	}
	if float64(h.HeaderSize) != num("header_size") || float64(h.PointDataOffset) != num("offset_to_points") ||
		float64(h.NumVLRs) != num("n_vlr") || float64(h.PointFormat) != num("point_format") ||
		float64(h.RecordLength) != num("record_length") || float64(h.Count) != num("n_points") {
		tb.Errorf("header size %d offset %d VLRs %d format %d length %d count %d, las2csv %v %v %v %v %v %v",
			h.HeaderSize, h.PointDataOffset, h.NumVLRs, h.PointFormat, h.RecordLength, h.Count,
			num("header_size"), num("offset_to_points"), num("n_vlr"), num("point_format"), num("record_length"), num("n_points"))
	}
	if float64(st.Read) != num("n_points_read") {
		tb.Errorf("read %d points, las2csv %v", st.Read, num("n_points_read"))
	}
	sc, _ := ref["scale"].([]any)
	of, _ := ref["offset"].([]any)
	for i := range 3 {
		if len(sc) != 3 || len(of) != 3 || sc[i].(float64) != h.Scale[i] || of[i].(float64) != h.Offset[i] {
			tb.Errorf("scale %v offset %v, las2csv %v %v", h.Scale, h.Offset, sc, of)
			break
		}
	}
	hb, _ := ref["bounds_header"].(map[string]any)
	db, _ := ref["bounds_data"].(map[string]any)
	b := boundsOf(pts)
	for i, a := range axisName {
		if hb["min"+a] != h.Min[i] || hb["max"+a] != h.Max[i] {
			tb.Errorf("header %s bounds %v–%v, las2csv %v–%v", a, h.Min[i], h.Max[i], hb["min"+a], hb["max"+a])
		}
		// Both compute X·scale + offset in float64, so the data bounds are
		// bit-identical.
		if len(pts) > 0 && (db["min"+a] != b[0][i] || db["max"+a] != b[1][i]) {
			tb.Errorf("data %s bounds %v–%v, las2csv %v–%v", a, b[0][i], b[1][i], db["min"+a], db["max"+a])
		}
	}
	cls, _ := ref["classes"].(map[string]any)
	if len(cls) != len(st.ClassCounts) {
		tb.Errorf("class counts %v, las2csv %v", st.ClassCounts, cls)
	}
	for k, v := range cls {
		c, _ := strconv.Atoi(k)
		if float64(st.ClassCounts[uint8(c)]) != v.(float64) {
			tb.Errorf("class %d: %d points, las2csv %v", c, st.ClassCounts[uint8(c)], v)
		}
	}
}

// TestSynthetic_Las2csv runs refbench/las2csv.py --info on synthetic files
// of each version and several formats (with extra bytes and, for 1.4, a
// WKT record), so that both the test writer and this reader are checked
// against an independent reading of the ASPRS layout.
func TestSynthetic_Las2csv(t *testing.T) {
	cases := []synthFile{
		{Minor: 2, Format: 0},
		{Minor: 2, Format: 2, ExtraBytes: 4},
		{Minor: 3, Format: 3, ExtraBytes: 1},
		{Minor: 4, Format: 1},
		{Minor: 4, Format: 6, WKT: `PROJCS["x",UNIT["metre",1],AUTHORITY["EPSG","32610"]]`},
		{Minor: 4, Format: 7, ExtraBytes: 2},
		{Minor: 4, Format: 8},
	}
	for _, sf := range cases {
		t.Run(fmt.Sprintf("1.%d_format%d", sf.Minor, sf.Format), func(t *testing.T) {
			sf.Scale = [3]float64{0.001, 0.001, 0.0001}
			sf.Offset = [3]float64{600000, 5000000, 100}
			sf.SystemID, sf.Software = "synthetic", "dugout test writer"
			sf.Day, sf.Year = 45, 2026
			sf.Points = samplePoints(25, sf.Format >= 6)
			for i := range sf.Points {
				sf.Points[i].Withheld = false // las2csv does not drop withheld points
			}
			path := writeTemp(t, "synth.las", sf.bytes(t))
			ref := las2csvInfo(t, path)
			h, pts, st, err := Read(path, Options{AllClasses: true})
			if err != nil {
				t.Fatal(err)
			}
			checkAgainstLas2csv(t, ref, h, st, pts)
			if w, _ := ref["wkt"].(string); w != h.WKT {
				t.Errorf("WKT %q, las2csv %q", h.WKT, w)
			}
		})
	}
}
