package takeoff

import (
	"encoding/json"
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// kidney returns a kidney-shaped ring of n vertices, about 2·rx × 2·ry,
// centred at c: an ellipse pinched on one side.
func kidney(c geom.Vec2, rx, ry float64, n int) geom.Ring {
	r := make(geom.Ring, n)
	for i := range r {
		t := 2 * math.Pi * float64(i) / float64(n)
		k := 1 - 0.25*math.Exp(-4*(1-math.Cos(t-math.Pi/2)))
		r[i] = geom.Vec2{X: c.X + rx*math.Cos(t), Y: c.Y + ry*k*math.Sin(t)}
	}
	return r
}

// demoPond is a garden pond of the size the demo site has: a kidney-shaped
// marginal shelf (0.25 m deep, walls 1:1) around a deep zone (0.9 m deep,
// walls 1.5:1), 0.15 m freeboard, on a lattice of cell h. scale multiplies
// every plan dimension (scale 1 is about 7 × 5 m at the rim).
func demoPond(tb testing.TB, scale, h float64) Input {
	tb.Helper()
	const w, fb = 30.0, 0.15
	c := geom.Vec2{X: 0.13, Y: -0.07}
	shelf := Zone{Name: "shelf", Ring: kidney(c, 2.9*scale, 2.0*scale, 96), DepthM: 0.25, WallSlope: 1}
	deep := Zone{Name: "deep", Ring: kidney(c.Add(geom.Vec2{X: 0.1 * scale, Y: -0.2 * scale}), 1.6*scale, 1.0*scale, 64),
		DepthM: 0.9, WallSlope: 1.5}
	b := polyBowl{w: w, zones: []Zone{shelf, deep}}
	box := shelf.Ring.Bounds().Expand(1.2)
	box.Min = box.Min.Sub(geom.Vec2{X: 0.37 * h, Y: 0.19 * h})
	m := latticeMesh(tb, b.BowlAt, box, h, w+fb, 0.5)
	return Input{BowlMesh: m, Bowl: b, Zones: []Zone{shelf, deep}, WaterLevelM: w, RimM: w + fb, MaxCutDepthM: 1.2}
}

func TestCompute_Demo(t *testing.T) {
	in := demoPond(t, 1, 0.05)
	o := Options{
		EdgeStone: &EdgeStoneOptions{Rock: "sandstone", FaceHeightM: 0.2, ThicknessM: 0.3, BoulderPercent: 10},
		Gravel:    []GravelOptions{{Zone: "shelf", ThicknessM: 0.05}, {Zone: "deep", Material: "pea gravel", ThicknessM: 0.05}},
		Water:     WaterOptions{DischargeHeightM: 0.8, PipeLengthM: 8, PipeDiameterM: 0.038},
		Prices:    &PriceList{Currency: "USD", PerSquareFootLiner: 1.2, PerTonStone: 200, PerCrewHour: 70},
	}
	res, err := Compute(in, o)
	if err != nil {
		t.Fatal(err)
	}
	l := res.Liner
	// Consistency: the sheet covers the developed area; the rule of thumb
	// (vertical walls assumed) is larger than the sheet on sloped walls
	// (check-values.md §7: it overestimates on slopes).
	if !(l.SheetAreaM2 > l.LinerAreaM2) || !(l.RuleOfThumbLengthM > l.SheetLengthM) || !(l.RuleOfThumbWidthM > l.SheetWidthM) {
		t.Errorf("liner %+v", l)
	}
	if !(l.SheetLengthM >= l.SheetWidthM) || l.SheetAngleDeg < 0 || l.SheetAngleDeg >= 180 {
		t.Errorf("sheet %g × %g at %g°", l.SheetLengthM, l.SheetWidthM, l.SheetAngleDeg)
	}
	sh := res.Shoreline
	if sh.Loops != 1 || !(sh.LengthM > sh.RuleOfThumbLowM*0.8) {
		t.Errorf("shoreline %+v", sh)
	}
	// Water measured on the mesh when the design gives none: the volume
	// is between the shelf-only and the all-deep prisms.
	if v := res.Water.VolumeM3; !(v > 0.25*sh.WaterAreaM2 && v < 0.9*sh.WaterAreaM2) {
		t.Errorf("water volume %g for area %g", v, sh.WaterAreaM2)
	}
	if res.Stone.Edge == nil || !closeRel(res.Stone.TotalTons, res.Stone.EdgeTons+res.Stone.BoulderTons+res.Stone.GravelTons, 1e-12, 0) {
		t.Errorf("stone %+v", res.Stone)
	}
	if !closeRel(res.Crew.WorkerHours, res.Stone.EdgeTons+res.Stone.GravelTons, 1e-12, 0) {
		t.Errorf("crew %+v: 1 short ton per worker-hour", res.Crew)
	}
	if res.Cost == nil || len(res.Cost.Lines) != 3 {
		t.Errorf("cost %+v", res.Cost)
	}

	// The JSON keys the report and CLI rely on.
	js, err := json.Marshal(res)
	if err != nil {
		t.Fatal(err)
	}
	var top map[string]json.RawMessage
	if err := json.Unmarshal(js, &top); err != nil {
		t.Fatal(err)
	}
	doc := map[string]map[string]any{}
	for _, sec := range []string{"liner", "shoreline", "stone", "crew", "water", "pump"} {
		var m map[string]any
		if err := json.Unmarshal(top[sec], &m); err != nil {
			t.Fatalf("section %s: %v", sec, err)
		}
		doc[sec] = m
	}
	for sec, keys := range map[string][]string{
		"liner": {"developed_area_m2", "sheet_length_m", "sheet_width_m", "sheet_angle_deg", "overlap_m",
			"rule_of_thumb_length_m", "rule_of_thumb_width_m", "stock", "waste_ratio", "weight_kg"},
		"shoreline": {"length_m", "loops", "rule_of_thumb_m", "rule_of_thumb_low_m", "rule_of_thumb_high_m", "bounding_rect_perimeter_m"},
		"stone":     {"edge_tons", "gravel_tons", "total_tons", "edge_tonnes", "gravel_tonnes", "total_tonnes"},
		"crew":      {"hours", "days"},
		"water":     {"volume_m3", "volume_gal", "max_depth_m", "mean_depth_m"},
		"pump":      {"flow_m3_per_h", "head_m"},
	} {
		for _, k := range keys {
			if _, ok := doc[sec][k]; !ok {
				t.Errorf("JSON %s.%s missing", sec, k)
			}
		}
	}
	if !strings.Contains(string(js), `"severity":"danger"`) {
		t.Errorf("cautions without severities: %s", js)
	}
}

func TestCompute_BadInput(t *testing.T) {
	in := demoPond(t, 1, 0.2)
	low := in
	low.RimM = in.WaterLevelM - 0.1
	nan := in
	nan.WaterLevelM = math.NaN()
	zones := in
	zones.TriangleZone = []int{0}
	for _, tc := range []struct {
		name string
		in   Input
		o    Options
		want error
	}{
		{"empty", Input{WaterLevelM: 1, RimM: 1.1}, Options{}, ErrInput},
		{"rim below water", low, Options{}, ErrInput},
		{"NaN level", nan, Options{}, ErrInput},
		{"triangle zones of the wrong length", zones, Options{}, ErrInput},
		{"negative crew", in, Options{Crew: CrewOptions{Size: -1}}, ErrOption},
		{"negative turnover", in, Options{Water: WaterOptions{TurnoverH: -2}}, ErrOption},
		{"stone without thickness", in, Options{EdgeStone: &EdgeStoneOptions{FaceHeightM: 0.2}}, ErrOption},
		{"stretch off the shoreline", in, Options{EdgeStone: &EdgeStoneOptions{FaceHeightM: 0.2, ThicknessM: 0.2,
			Stretches: []Stretch{{Loop: 0, FromM: 0, ToM: 1e4}}}}, ErrStretch},
		{"both price units", in, Options{Prices: &PriceList{PerSquareFootLiner: 1, PerSquareMetreLiner: 1}}, ErrOption},
	} {
		t.Run(tc.name, func(t *testing.T) {
			if _, err := Compute(tc.in, tc.o); !errors.Is(err, tc.want) {
				t.Errorf("Compute: err = %v, want %v", err, tc.want)
			}
		})
	}
}

func TestCompute_WallGravel(t *testing.T) {
	// With triangle owners, gravel on the walls covers the zone's developed
	// area less its floor: for one zone with walls at s, the Steiner wall
	// area (P·sH + π(sH)²)·sqrt(1 + 1/s²), to the lattice's 0.15 %.
	pc := onePond(t, rectRing(0.037, 0.011, 4.037, 2.511), 100, 0.8, 0.15, 1.5, 0.05)
	owner := make([]int, pc.mesh.NumTriangles())
	in := Input{BowlMesh: pc.mesh, TriangleZone: owner, Bowl: pc.bowl, Zones: pc.zones, WaterLevelM: 100, RimM: pc.rim}
	res, err := Compute(in, Options{Gravel: []GravelOptions{{ThicknessM: 0.1, Walls: true}}})
	if err != nil {
		t.Fatal(err)
	}
	g := res.Stone.Gravel[0]
	const s, H = 1.5, 0.95
	wantWall := (13*s*H + math.Pi*s*s*H*H) * math.Sqrt(1+1/(s*s))
	if !closeRel(g.WallAreaM2, wantWall, 1.5e-3, 0) || g.FloorAreaM2 != 10 {
		t.Errorf("gravel %+v, want floor 10 m² and walls %g m²", g, wantWall)
	}
}

func TestCompute_Degenerate(t *testing.T) {
	// One triangle dipping below the rim, and a bowl whose water level is
	// below every vertex: measured without panics, with a warning for the
	// dry bowl. The triangle's water line runs into the mesh's edge: one
	// open line, the water area measured on the mesh.
	one := geom.TriMesh{V: []geom.Vec3{{X: 0, Y: 0, Z: 9}, {X: 2, Y: 0, Z: 10.5}, {X: 0, Y: 2, Z: 10.5}}, T: []int32{0, 1, 2}}
	res, err := Compute(Input{BowlMesh: one, WaterLevelM: 9.5, RimM: 10}, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if sh := res.Shoreline; !(res.Liner.DevelopedAreaM2 > 0) || sh.Loops != 1 || sh.LoopDetail[0].Closed || res.Water.VolumeM3 <= 0 {
		t.Errorf("one triangle: liner %+v shoreline %+v water %+v", res.Liner, res.Shoreline, res.Water)
	}
	dry, err := Compute(Input{BowlMesh: one, WaterLevelM: 8, RimM: 10}, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if dry.Water.VolumeM3 != 0 || len(dry.Warnings) == 0 {
		t.Errorf("dry bowl: water %+v, warnings %q", dry.Water, dry.Warnings)
	}
	if _, err := json.Marshal(dry); err != nil {
		t.Errorf("dry bowl does not marshal: %v", err)
	}
}
