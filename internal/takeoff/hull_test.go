package takeoff

import (
	"encoding/json"
	"fmt"
	"math"
	"math/big"
	"math/rand/v2"
	"os/exec"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/reftest"
)

// orientRat is the exact orientation by rational arithmetic, the oracle for
// the filtered predicate.
func orientRat(a, b, c geom.Vec2) int {
	r := func(f float64) *big.Rat { return new(big.Rat).SetFloat64(f) }
	bax := new(big.Rat).Sub(r(b.X), r(a.X))
	bay := new(big.Rat).Sub(r(b.Y), r(a.Y))
	cax := new(big.Rat).Sub(r(c.X), r(a.X))
	cay := new(big.Rat).Sub(r(c.Y), r(a.Y))
	return new(big.Rat).Mul(bax, cay).Cmp(new(big.Rat).Mul(bay, cax))
}

func TestOrient_NearCollinear(t *testing.T) {
	// Points a few ulps off the line through two points at UTM-sized
	// coordinates: the float determinant is unreliable there, the filtered
	// predicate must agree with exact rational arithmetic everywhere.
	seed := uint64(20240601)
	rng := rand.New(rand.NewPCG(seed, 1))
	a := geom.Vec2{X: 512345.25, Y: 4512345.5}
	b := geom.Vec2{X: 512400.75, Y: 4512410.125}
	for i := range 20000 {
		f := rng.Float64()*3 - 1
		c := a.Lerp(b, f)
		c.X = math.Nextafter(c.X, c.X+float64(rng.IntN(5)-2))
		for range rng.IntN(4) {
			c.Y = math.Nextafter(c.Y, math.Inf(rng.IntN(2)*2-1))
		}
		if got, want := orient(a, b, c), orientRat(a, b, c); got != want {
			t.Fatalf("case %d (seed %d): orient(%v, %v, %v) = %d, want %d", i, seed, a, b, c, got, want)
		}
	}
}

func TestMinAreaRect_Rotated(t *testing.T) {
	// Points filling a 6 × 2 rectangle turned by 25°: the rectangle itself.
	th := 25 * math.Pi / 180
	u, n := geom.Vec2{X: math.Cos(th), Y: math.Sin(th)}, geom.Vec2{X: -math.Sin(th), Y: math.Cos(th)}
	rng := rand.New(rand.NewPCG(7, 7))
	var pts []geom.Vec2
	for _, c := range [][2]float64{{0, 0}, {6, 0}, {6, 2}, {0, 2}} {
		pts = append(pts, u.Scale(c[0]).Add(n.Scale(c[1])))
	}
	for range 200 {
		pts = append(pts, u.Scale(6*rng.Float64()).Add(n.Scale(2*rng.Float64())))
	}
	r := MinAreaRect(pts)
	if !closeRel(r.LengthM, 6, 1e-12, 0) || !closeRel(r.WidthM, 2, 1e-12, 0) || math.Abs(r.AngleDeg-25) > 1e-9 {
		t.Errorf("MinAreaRect = %+v, want 6 × 2 at 25°", r)
	}
	// Degenerate input.
	if r := MinAreaRect(nil); r != (Rect{}) {
		t.Errorf("MinAreaRect(nil) = %+v", r)
	}
	if r := MinAreaRect([]geom.Vec2{{X: 1, Y: 1}, {X: 1, Y: 1}}); r.LengthM != 0 || r.WidthM != 0 {
		t.Errorf("MinAreaRect(one point) = %+v", r)
	}
	if r := MinAreaRect([]geom.Vec2{{X: 0, Y: 0}, {X: 1, Y: 1}, {X: 3, Y: 3}}); !closeRel(r.LengthM, 3*math.Sqrt2, 1e-12, 0) || r.WidthM != 0 || r.AngleDeg != 45 {
		t.Errorf("MinAreaRect(collinear) = %+v", r)
	}
}

func TestMinAreaRect_Shapely(t *testing.T) {
	// Against Shapely's minimum_rotated_rectangle (GEOS) on random point
	// clouds: the same area and side lengths.
	py := reftest.Python(t, "shapely")
	rng := rand.New(rand.NewPCG(11, 3))
	clouds := make([][]geom.Vec2, 6)
	for k := range clouds {
		clouds[k] = make([]geom.Vec2, 40)
		for i := range clouds[k] {
			clouds[k][i] = geom.Vec2{X: 10 * rng.NormFloat64(), Y: 4*rng.NormFloat64() + 0.5*float64(k)*rng.Float64()}
		}
	}
	js, _ := json.Marshal(clouds)
	script := fmt.Sprintf(`
import json, math
from shapely.geometry import MultiPoint
out = []
for p in json.loads(%q):
    r = MultiPoint([(q["X"], q["Y"]) for q in p]).minimum_rotated_rectangle
    c = list(r.exterior.coords)
    a = math.dist(c[0], c[1]); b = math.dist(c[1], c[2])
    out.append([r.area, max(a, b), min(a, b)])
print(json.dumps(out))`, string(js))
	out, err := exec.Command(py, "-c", script).Output()
	if err != nil {
		t.Fatalf("shapely: %v", err)
	}
	var want [][3]float64
	if err := json.Unmarshal(out, &want); err != nil {
		t.Fatal(err)
	}
	for k, pts := range clouds {
		r := MinAreaRect(pts)
		if w := want[k]; !closeRel(r.AreaM2(), w[0], 1e-9, 0) || !closeRel(r.LengthM, w[1], 1e-9, 0) || !closeRel(r.WidthM, w[2], 1e-9, 0) {
			t.Errorf("cloud %d: MinAreaRect %g × %g (area %g), Shapely %g × %g (area %g)", k, r.LengthM, r.WidthM, r.AreaM2(), w[1], w[2], w[0])
		}
	}
}

func TestNormAngle(t *testing.T) {
	for in, want := range map[float64]float64{0: 0, 180: 0, -90: 90, 270: 90, -1e-14: 0, 179.5: 179.5, 360.25: 0.25} {
		if got := normAngle(in); math.Abs(got-want) > 1e-12 {
			t.Errorf("normAngle(%g) = %g, want %g", in, got, want)
		}
	}
}

func FuzzPresetNames(f *testing.F) {
	for _, s := range []string{"granite", "EPDM 45", "river-rock", "pvc", "geotextile 8oz", "", "x"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		if r, err := RockByName(s); err == nil && !(r.DensityKgM3 > 0) {
			t.Errorf("RockByName(%q) = %+v", s, r)
		}
		if m, err := LinerMaterialByName(s); err == nil && !(m.ThicknessM > 0 && m.DensityKgM3 > 0) {
			t.Errorf("LinerMaterialByName(%q) = %+v", s, m)
		}
		if a, err := AggregateByName(s); err == nil && !(a.BulkDensityKgM3 > 0) {
			t.Errorf("AggregateByName(%q) = %+v", s, a)
		}
		if p, err := PipeMaterialByName(s); err == nil && !(p.C > 0) {
			t.Errorf("PipeMaterialByName(%q) = %+v", s, p)
		}
		if g, err := UnderlaymentByName(s); err == nil && !(g.GramsPerM2 > 0) {
			t.Errorf("UnderlaymentByName(%q) = %+v", s, g)
		}
		_, _ = ParseSheetFlow(s)
	})
}
