package design

import (
	"encoding/json"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/reftest"
)

// The refbench site (testdata/refbench_site.json, a copy of
// ../shared/refbench/site.json): terrain
// T = z0 + gx·u + gy·v + a1 sin(2πu/l1x) cos(2πv/l1y) + a2 cos(2π(u/l2x + v/l2y))
// in site coordinates less the origin, which is our local frame here.
type refSite struct {
	OriginX float64 `json:"origin_x"`
	OriginY float64 `json:"origin_y"`
	Terrain struct {
		Z0, Gx, Gy, A1, L1x, L1y, A2, L2x, L2y float64
	} `json:"terrain"`
	Variants struct {
		FlatZ float64 `json:"flat_z"`
	} `json:"terrain_variants"`
	Designs map[string]json.RawMessage `json:"designs"`
}

type refDesign struct {
	Kind    string       `json:"kind"`
	Polygon [][2]float64 `json:"polygon"`
	Zb      float64      `json:"zb"`
	M       float64      `json:"m"`
}

// refineFloor is the least relative error allowed a Build result in
// comparisons with references: its refinement change estimates the error
// but can come out smaller by luck at coarse cells; the cell choice aims
// at 0.1 %, and results land within a fifth of that.
const refineFloor = 2e-4

func loadRefSite(t *testing.T) refSite {
	t.Helper()
	b, err := os.ReadFile("testdata/refbench_site.json")
	if err != nil {
		t.Fatal(err)
	}
	var s refSite
	if err := json.Unmarshal(b, &s); err != nil {
		t.Fatal(err)
	}
	return s
}

func (s refSite) terrain(variant string) funcTerrain {
	tr := s.Terrain
	k1, l1 := 2*math.Pi/tr.L1x, 2*math.Pi/tr.L1y
	k2, l2 := 2*math.Pi/tr.L2x, 2*math.Pi/tr.L2y
	box := geom.Box{Min: geom.Vec2{X: -100, Y: -100}, Max: geom.Vec2{X: 300, Y: 250}}
	switch variant {
	case "flat":
		return funcTerrain{f: func(x, y float64) float64 { return s.Variants.FlatZ }, box: box}
	case "plane":
		return funcTerrain{f: func(x, y float64) float64 { return tr.Z0 + tr.Gx*x + tr.Gy*y }, box: box}
	}
	return funcTerrain{f: func(x, y float64) float64 {
		return tr.Z0 + tr.Gx*x + tr.Gy*y + tr.A1*math.Sin(k1*x)*math.Cos(l1*y) + tr.A2*math.Cos(k2*x+l2*y)
	}, box: box}
}

func (s refSite) design(t *testing.T, name string) refDesign {
	t.Helper()
	var d refDesign
	if err := json.Unmarshal(s.Designs[name], &d); err != nil {
		t.Fatal(err)
	}
	return d
}

// pit lays a refbench pit design as one zone whose floor is the design's
// bottom at zb, with the water and rim at zb (depth 0, no freeboard): the
// bowl is then zb + dist/m, and since the berm stays below zb and the
// ground is above zb around these pits, the cut is the refbench pit cut
// ∬ max(0, T − (zb + d/m)) of ../shared/refbench/README.md.
func (s refSite) pit(t *testing.T, name, variant string, corners Corners) *Surface {
	t.Helper()
	d := s.design(t, name)
	r := make(geom.Ring, len(d.Polygon))
	for i, p := range d.Polygon {
		r[i] = geom.Vec2{X: p[0] - s.OriginX, Y: p[1] - s.OriginY}
	}
	p := Params{Zones: []Zone{{Name: name, Ring: r, WallSlope: d.M, Corners: corners}}, WaterLevelM: d.Zb}
	sf, err := Build(s.terrain(variant), p)
	if err != nil {
		t.Fatal(err)
	}
	return sf
}

func TestBuild_RefbenchMitred(t *testing.T) {
	// Reference volumes from ../shared/refbench/reference_volumes.json
	// (copied to testdata): closed forms on flat ground, exact
	// piecewise-linear integration on the plane, fine-TIN Richardson on the
	// full terrain (mitred corners, so Corners: Sharp here), Green's theorem
	// for vertical walls. ANCHORS.md §2 lists the same numbers.
	if testing.Short() {
		t.Skip("refbench designs take a few seconds")
	}
	site := loadRefSite(t)
	b, err := os.ReadFile("testdata/refbench_reference_volumes.json")
	if err != nil {
		t.Fatal(err)
	}
	var refs struct {
		Analytic []struct {
			Design, Terrain, Method string
			Cut                     float64
			Spread                  struct{ Cut float64 } `json:"richardson_spread"`
		}
	}
	if err := json.Unmarshal(b, &refs); err != nil {
		t.Fatal(err)
	}
	for _, ref := range refs.Analytic {
		if site.design(t, ref.Design).Kind != "pit" {
			continue // pads (cut and fill slopes both ways) are not ponds
		}
		t.Run(ref.Design+" "+ref.Terrain, func(t *testing.T) {
			sf := site.pit(t, ref.Design, ref.Terrain, Sharp)
			tol := max(sf.RefineChange, refineFloor)*sf.CutM3 + 3*ref.Spread.Cut + 1e-9
			if math.Abs(sf.CutM3-ref.Cut) > tol {
				t.Errorf("cut = %.6f m³, want %.6f ± %.2g (refbench %s)", sf.CutM3, ref.Cut, tol, ref.Method)
			}
			t.Logf("cut %.6f ref %.6f diff %.2g tol %.2g cell %g", sf.CutM3, ref.Cut, sf.CutM3-ref.Cut, tol, sf.CellM)
		})
	}
}

func TestBuild_RefbenchRound(t *testing.T) {
	// Round-corner references from ../shared/refbench/ref_volume.py
	// --corners round (testdata/refbench_round.json says how they were
	// made): the closed form on flat ground, else the midpoint grid at
	// 0.01 m with its change from 0.02 m as its error.
	if testing.Short() {
		t.Skip("refbench designs take a few seconds")
	}
	site := loadRefSite(t)
	b, err := os.ReadFile("testdata/refbench_round.json")
	if err != nil {
		t.Fatal(err)
	}
	var refs struct {
		Designs []struct {
			Design, Terrain string
			Grid            float64
			GridErr         float64 `json:"grid_err"`
			Exact           *float64
		}
	}
	if err := json.Unmarshal(b, &refs); err != nil {
		t.Fatal(err)
	}
	for _, ref := range refs.Designs {
		t.Run(ref.Design+" "+ref.Terrain, func(t *testing.T) {
			sf := site.pit(t, ref.Design, ref.Terrain, Round)
			want, refErr, how := ref.Grid, ref.GridErr, "midpoint grid h = 0.01 m"
			if ref.Exact != nil {
				want, refErr, how = *ref.Exact, 0, "closed form"
			}
			tol := max(sf.RefineChange, refineFloor)*sf.CutM3 + refErr + 1e-9
			if math.Abs(sf.CutM3-want) > tol {
				t.Errorf("cut = %.6f m³, want %.6f ± %.2g (refbench round, %s)", sf.CutM3, want, tol, how)
			}
			t.Logf("cut %.6f ref %.6f diff %.2g tol %.2g cell %g", sf.CutM3, want, sf.CutM3-want, tol, sf.CellM)
		})
	}
}

// TestBuild_RefbenchRoundLive reruns the reference bench's round-corner
// grid for the garden pond on the full terrain
// (../shared/refbench/ref_volume.py --corners round) and compares.
func TestBuild_RefbenchRoundLive(t *testing.T) {
	if testing.Short() {
		t.Skip("runs the reference bench")
	}
	shared := reftest.SharedDir(t)
	py := reftest.Python(t, "numpy", "scipy", "shapely")
	out := filepath.Join(t.TempDir(), "round.json")
	cmd := exec.Command(py, filepath.Join(shared, "refbench", "ref_volume.py"), "--design", "garden_pond", "--terrain", "full",
		"--corners", "round", "--h", "0.02,0.01", "--h-fine-tin", "", "--json", out)
	if b, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("ref_volume.py: %v: %s", err, b)
	}
	b, err := os.ReadFile(out)
	if err != nil {
		t.Fatal(err)
	}
	var rows []struct {
		Grid struct {
			Levels []struct{ Cut float64 }
		}
	}
	if err := json.Unmarshal(b, &rows); err != nil || len(rows) != 1 || len(rows[0].Grid.Levels) != 2 {
		t.Fatalf("ref_volume.py JSON: %v %s", err, b)
	}
	lv := rows[0].Grid.Levels
	want, refErr := lv[1].Cut, math.Abs(lv[1].Cut-lv[0].Cut)
	sf := loadRefSite(t).pit(t, "garden_pond", "full", Round)
	if tol := max(sf.RefineChange, refineFloor)*sf.CutM3 + refErr; math.Abs(sf.CutM3-want) > tol {
		t.Errorf("cut = %.6f m³, ref_volume.py --corners round %.6f ± %.2g", sf.CutM3, want, tol)
	}
}
