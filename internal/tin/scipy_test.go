package tin

import (
	"math/rand/v2"
	"path/filepath"
	"slices"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/reftest"
)

// TestDelaunay_SciPy compares the triangulation of random points in general
// position with SciPy's scipy.spatial.Delaunay (Qhull), run by the reference
// bench's ref_delaunay.py on the same points (it centres them first, which
// keeps Qhull exact on these sets; refbench README). Points in general
// position have a unique Delaunay triangulation, so the triangle sets must be
// identical. The script's exact validator must also find ours valid and
// Delaunay.
func TestDelaunay_SciPy(t *testing.T) {
	reftest.Python(t, "numpy", "scipy.spatial")
	seed := testSeed(t)
	r := rand.New(rand.NewPCG(seed, 10))
	cases := []struct {
		name string
		pts  []geom.Vec3
	}{
		{"site 2000", randomPoints(r, 2000, v2(1000, 2000), 200, 150, nil)},
		{"unit 20000", randomPoints(r, 20000, v2(-0.5, -0.5), 1, 1, nil)},
		{"far 3000", randomPoints(r, 3000, v2(636000, 849000), 300, 200, nil)},
	}
	if testing.Short() {
		cases = cases[:1]
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			dir := t.TempDir()
			path := filepath.Join(dir, "pts.csv")
			writePointsCSV(t, path, tc.pts)
			ours := canonTris(t, mustBuild(t, tc.pts, Options{}))
			refPath := filepath.Join(dir, "scipy.csv")
			chk := runRefDelaunay(t, path, ours, refPath)
			ref := readTris(t, refPath)
			if !slices.Equal(ours, ref) {
				t.Errorf("triangles differ from SciPy's: %d ours, %d SciPy; %d only ours, %d only SciPy (seed %d)",
					len(ours), len(ref), chk.VsScipyOnlyHere, chk.VsScipyOnlyScipy, seed)
			}
			if !chk.Valid || !chk.Delaunay || chk.DelaunayViolations != 0 {
				t.Errorf("ref_delaunay.py --check: %+v", chk)
			}
		})
	}
}
