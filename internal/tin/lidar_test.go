package tin

import (
	"math"
	"path/filepath"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/reftest"
	"github.com/dugout-estimating/dugout/internal/units"
)

// lidarSet is one of the LiDAR ground samples from PDAL's test data
// (shared/data/csv, BSD licence, Copyright Hobu, Inc.; see SOURCES.md) with
// its unit and its row counts as SOURCES.md states them.
var lidarSets = []struct {
	file     string
	unit     float64 // metres per file unit
	rows     int
	distinct int
	tris     int // SciPy's triangle count, refbench ANCHORS.md §1 (centred; valid and Delaunay there)
}{
	{"autzen_trim_ground_ft.csv", units.Foot, 26107, 26107, 52187},
	{"4_6_crop_ground_ftUS.csv", units.USSurveyFoot, 9003, 9003, 17979},
	{"mvk-thin_ground_ftUS.csv", units.USSurveyFoot, 1693, 1693, 3364},
	{"autzen_trim_all_ft.csv", units.Foot, 110000, 109993, 219955},
}

// toLocal shifts world metres to a local frame at the rounded centre of
// their bounding box (geom.FrameAt).
func toLocal(pts []geom.Vec3) []geom.Vec3 {
	b := geom.EmptyBox()
	for _, p := range pts {
		b = b.Extend(v2(p.X, p.Y))
	}
	f := geom.FrameAt(b.Center())
	out := make([]geom.Vec3, len(pts))
	for i, p := range pts {
		l := f.ToLocal(v2(p.X, p.Y))
		out[i] = v3(l.X, l.Y, p.Z)
	}
	return out
}

// TestLiDAR builds TINs of the real ground samples (feet converted with the
// exact factors of package units, then shifted to a local frame): each
// builds and validates, keeps every distinct point, matches 2n − 2 − h
// (check-values.md §6), and reproduces the elevation of every input point
// (a TIN interpolates its vertices; repeated x,y take the group mean). The
// Autzen ground set is also checked by ref_delaunay.py's exact validator
// against the original coordinates.
func TestLiDAR(t *testing.T) {
	dir := filepath.Join(reftest.SharedDir(t), "data", "csv")
	for _, set := range lidarSets {
		t.Run(set.file, func(t *testing.T) {
			if testing.Short() && set.rows > 30000 {
				t.Skip("large set in -short mode")
			}
			path := filepath.Join(dir, set.file)
			pts := toLocal(readCSVPoints(t, path, set.unit))
			if len(pts) != set.rows {
				t.Fatalf("%d rows, want %d", len(pts), set.rows)
			}
			s := mustBuild(t, pts, Options{})
			xy := distinctXY(pts)
			sum := s.Summary()
			if len(xy) != set.distinct || sum.Vertices != set.distinct {
				t.Errorf("distinct %d, vertices %d; want %d", len(xy), sum.Vertices, set.distinct)
			}
			if h := hullBoundaryCount(xy); sum.Triangles != 2*len(xy)-2-h {
				t.Errorf("triangles %d, want %d", sum.Triangles, 2*len(xy)-2-h)
			}
			if sum.Triangles != set.tris {
				t.Errorf("triangles %d, want SciPy's %d", sum.Triangles, set.tris)
			}
			mean := make(map[geom.Vec2][2]float64)
			for _, p := range pts {
				m := mean[v2(p.X, p.Y)]
				mean[v2(p.X, p.Y)] = [2]float64{m[0] + p.Z, m[1] + 1}
			}
			for i, p := range pts {
				m := mean[v2(p.X, p.Y)]
				z, ok := s.Elevation(p.X, p.Y)
				if !ok || math.Abs(z-m[0]/m[1]) > 1e-9 {
					t.Fatalf("point %d (%g, %g): Elevation %g, %v; want %g", i, p.X, p.Y, z, ok, m[0]/m[1])
				}
			}
			if set.file == "autzen_trim_ground_ft.csv" {
				chk := runRefDelaunay(t, path, canonTris(t, s), "")
				if !chk.Valid || chk.DelaunayViolations != 0 {
					t.Errorf("ref_delaunay.py --check: %+v", chk)
				}
			}
		})
	}
}
