package survey

import (
	"errors"
	"math"
	"path/filepath"
	"testing"

	"github.com/dugout-estimating/dugout/internal/las"
	"github.com/dugout-estimating/dugout/internal/reftest"
	"github.com/dugout-estimating/dugout/internal/units"
)

// boundsTol is half the last printed digit of the bounds in
// shared/data/SOURCES.md (two decimals).
const boundsTol = 0.005

func checkBounds(t *testing.T, sum Summary, u units.System, minX, maxX, minY, maxY, minZ, maxZ float64) {
	t.Helper()
	b := sum.Bounds(u)
	f := u.Metres()
	got := []float64{b.Min.X, b.Max.X, b.Min.Y, b.Max.Y, sum.ElevMinM / f, sum.ElevMaxM / f}
	want := []float64{minX, maxX, minY, maxY, minZ, maxZ}
	for i := range got {
		if !closeTo(got[i], want[i], boundsTol) {
			t.Errorf("bounds %v z %v..%v, want x %v..%v y %v..%v z %v..%v", b, got[4], got[5], minX, maxX, minY, maxY, minZ, maxZ)
			return
		}
	}
}

// TestReadLAS_SharedSamples reads the PDAL sample files (BSD licence,
// Copyright Hobu, Inc.; see shared/data/SOURCES.md) and checks the counts,
// bounds and systems that SOURCES.md records for their ground class.
func TestReadLAS_SharedSamples(t *testing.T) {
	dir := reftest.SharedDir(t)
	tests := []struct {
		file                               string
		opt                                Options
		n                                  int
		epsg                               int
		u                                  units.System
		minX, maxX, minY, maxY, minZ, maxZ float64
	}{
		// autzen_trim.las states its system only as WKT (an Oregon GIC
		// Lambert equal to EPSG:2994), so --crs names it.
		{"autzen_trim.las", Options{CRS: mustSpec(t, "EPSG:2994")}, 26107, 2994, units.Feet,
			636001.76, 637179.22, 848935.85, 849497.90, 406.26, 434.06},
		{"4_6_crop.las", Options{}, 9003, 2903, units.USFeet,
			1639600.00, 1639799.97, 1454500.02, 1454700.00, 7077.92, 7093.86},
		// mvk-thin's GeoKey says EPSG:26995 (metres) but its unit key says
		// US survey feet; the unit key is right (SOURCES.md).
		{"mvk-thin.las", Options{}, 1693, 26995, units.USFeet,
			2045012.10, 2049993.92, 1267501.19, 1272495.46, 96.05, 142.48},
	}
	for _, tc := range tests {
		t.Run(tc.file, func(t *testing.T) {
			s := mustRead(t, tc.opt, filepath.Join(dir, "data", "las", tc.file))
			checkInvariants(t, s, false)
			sum := s.Summary()
			if sum.Count != tc.n || s.CRS.EPSG != tc.epsg || s.Units != tc.u || !s.Files[0].LAS.UsedGroundOnly {
				t.Errorf("count %d CRS %v units %v ground-only %v, want %d EPSG:%d %v true", sum.Count, s.CRS, s.Units, s.Files[0].LAS.UsedGroundOnly, tc.n, tc.epsg, tc.u)
			}
			checkBounds(t, sum, tc.u, tc.minX, tc.maxX, tc.minY, tc.maxY, tc.minZ, tc.maxZ)
		})
	}
}

// TestReadLAS_MatchesReferenceCSV compares the LAS reader's ground points
// with the CSV that refbench/las2csv.py (an independent NumPy reader)
// wrote from the same file: the same points in the same order.
func TestReadLAS_MatchesReferenceCSV(t *testing.T) {
	dir := reftest.SharedDir(t)
	opt := Options{Units: units.Feet, CRS: mustSpec(t, "EPSG:2994")}
	l := mustRead(t, opt, filepath.Join(dir, "data", "las", "autzen_trim.las"))
	c := mustRead(t, opt, filepath.Join(dir, "data", "csv", "autzen_trim_ground_ft.csv"))
	if len(l.Points) != len(c.Points) || l.Frame != c.Frame {
		t.Fatalf("LAS %d points frame %v, CSV %d frame %v", len(l.Points), l.Frame, len(c.Points), c.Frame)
	}
	// Both are 0.01 ft quantised; float round-off only.
	const tol = 1e-6 // m
	for i := range l.Points {
		a, b := l.Points[i].P, c.Points[i].P
		if !closeTo(a.X, b.X, tol) || !closeTo(a.Y, b.Y, tol) || !closeTo(a.Z, b.Z, tol) {
			t.Fatalf("point %d: LAS %v, CSV %v", i, a, b)
		}
	}
}

// TestReadLAS_Thin checks that a thinning cell given in metres reaches the
// reader in the file's feet: the kept count equals the number of occupied
// 10 ft cells of the ground points, anchored at the header's minimum x and
// y (636001.76, 848935.20 in SOURCES.md), counted here from the CSV.
func TestReadLAS_Thin(t *testing.T) {
	dir := reftest.SharedDir(t)
	c := mustRead(t, Options{Units: units.Feet, CRS: mustSpec(t, "EPSG:2994")}, filepath.Join(dir, "data", "csv", "autzen_trim_ground_ft.csv"))
	cells := map[[2]int64]bool{}
	for _, p := range c.Points {
		x, y, _ := c.WorldPos(p.P, units.Feet)
		// Nudge by a micro-foot against round-off in the metre round trip
		// of the 0.01 ft values; no value sits that close to a cell edge
		// but those exactly on one.
		cells[[2]int64{int64(math.Floor((x - 636001.76 + 1e-6) / 10)), int64(math.Floor((y - 848935.20 + 1e-6) / 10))}] = true
	}
	opt := Options{CRS: mustSpec(t, "EPSG:2994")}
	opt.LAS.ThinCell = 10 * units.Foot
	opt.LAS.Thin = las.ThinLowest
	s := mustRead(t, opt, filepath.Join(dir, "data", "las", "autzen_trim.las"))
	if len(s.Points) != len(cells) {
		t.Errorf("thinned to %d points, want %d occupied 10 ft cells", len(s.Points), len(cells))
	}
}

func TestReadLAS_Bad(t *testing.T) {
	p := writeTemp(t, "x.laz", "not a point cloud")
	_, err := Read([]string{p}, Options{})
	var pe *ParseError
	if !errors.Is(err, las.ErrLAZ) || !errors.As(err, &pe) || pe.File != p {
		t.Errorf("Read(.laz) = %v, want a ParseError wrapping las.ErrLAZ", err)
	}
	p = writeTemp(t, "x.las", "LASF but far too short")
	if _, err = Read([]string{p}, Options{}); !errors.As(err, &pe) || pe.File != p {
		t.Errorf("Read(truncated .las) = %v, want a ParseError", err)
	}
}
