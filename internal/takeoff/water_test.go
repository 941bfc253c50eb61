package takeoff

import (
	"errors"
	"math"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/units"
)

func TestHazenWilliams_PublishedExample(t *testing.T) {
	// Shammas & Wang, Water Engineering: Hydraulics, Distribution and
	// Treatment (Wiley, 2016), Example 5.36: a 12 in pipe carrying 1 MGD
	// with C = 100 loses 2.07 ft per 1000 ft (read from the pipe-flow
	// diagram and the tables, to three figures; the book also gives
	// 2.07 m per 1000 m in SI). The formula gives 2.096, within the 1.5 %
	// that reading a nomogram to three figures allows.
	const published = 2.07
	q := 1e6 * units.USGallon / 86400 // 1 MGD in m³/s
	si := HeadLossSI(1000, q, 100, 12*units.Inch)
	us := HeadLossUS(1000, q/units.CubicFoot, 100, 1)
	if !closeRel(si, published, 0.015, 0) || !closeRel(us, published, 0.015, 0) {
		t.Errorf("head loss per 1000: SI %.4f m, US %.4f ft, want %.2f (Shammas & Wang Ex. 5.36)", si, us, published)
	}
	// SI and US forms agree (loss per length is unit-free): the printed
	// constants 10.67 and 4.73 and exponents 4.8704 and 4.87 differ by
	// their rounding, up to 0.13 % over these sizes; allow 0.2 %.
	for _, tc := range []struct{ q, c, d float64 }{{0.001, 150, 0.025}, {0.02, 140, 0.1}, {0.3, 130, 0.5}} {
		si := HeadLossSI(100, tc.q, tc.c, tc.d) / 100
		us := HeadLossUS(100/units.Foot, tc.q/units.CubicFoot, tc.c, tc.d/units.Foot) / (100 / units.Foot)
		if !closeRel(si, us, 2e-3, 0) {
			t.Errorf("Q %g C %g d %g: SI slope %.6g vs US slope %.6g", tc.q, tc.c, tc.d, si, us)
		}
	}
}

func TestPipePresets(t *testing.T) {
	// Fair, Geyer & Okun, Water and Wastewater Engineering, Table 5.1 (new
	// pipe): coated cast iron 130, welded steel 140, concrete 140, plastic
	// 140; PVC 150 per AWWA M23 (from memory).
	for name, c := range map[string]float64{"cast iron": 130, "steel": 140, "concrete": 140, "plastic": 140, "PVC": 150} {
		p, err := PipeMaterialByName(name)
		if err != nil || p.C != c {
			t.Errorf("%s: %+v, %v, want C = %g", name, p, err, c)
		}
	}
}

func TestWaterAndPump_Units(t *testing.T) {
	// 1000 US gallons, one turnover an hour: 1000 gal/h = 16.667 gal/min =
	// 3785.41 L/h (check-values.md §7 [derived]); US gallons per cubic foot
	// = 1728/231 (NIST Handbook 44, App. C: 231 in³ to the gallon).
	v := 1000 * units.USGallon
	w, p, err := WaterAndPump(v, 2, 0.6, 0, 10, WaterOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if !closeRel(w.VolumeGal, 1000, 1e-12, 0) || !closeRel(w.VolumeGal/w.VolumeFt3, 1728.0/231, 1e-12, 0) ||
		!closeRel(w.VolumeL, 3785.411784, 1e-12, 0) {
		t.Errorf("water %+v", w)
	}
	if !closeRel(p.FlowGalPerH, 1000, 1e-12, 0) || !closeRel(p.FlowLPerMin*60, 3785.411784, 1e-12, 0) || p.FlowBasis != "turnover" {
		t.Errorf("pump %+v", p)
	}
	if !closeRel(w.MeanDepthM, v/2, 1e-12, 0) {
		t.Errorf("mean depth %g, want volume / area %g", w.MeanDepthM, v/2)
	}
	// A hose at 7.5 gal/min fills 1000 gal in 133.3 min.
	if !closeRel(w.FillTimeH, 1000/7.5/60, 1e-12, 0) {
		t.Errorf("fill time %g h", w.FillTimeH)
	}
}

func TestWaterAndPump_SpillwayAndHead(t *testing.T) {
	// A 24 in weir at a medium sheet (150 gal/h per inch, common practice)
	// needs 3600 gal/h, more than one turnover of 1000 gal an hour, so the
	// spillway governs. Head: 1.2 m lift + Hazen-Williams over 15 m of pipe
	// and 5 m of fittings.
	v := 1000 * units.USGallon
	o := WaterOptions{SpillwayWidthM: 24 * units.Inch, DischargeHeightM: 1.2, PipeLengthM: 15, FittingsLengthM: 5,
		PipeDiameterM: 0.04, Pipe: "pvc"}
	_, p, err := WaterAndPump(v, 2, 0.6, 0, 10, o)
	if err != nil {
		t.Fatal(err)
	}
	if p.FlowBasis != "spillway" || !closeRel(p.FlowGalPerH, 3600, 1e-12, 0) {
		t.Errorf("flow %g gal/h by %s, want 3600 by spillway", p.FlowGalPerH, p.FlowBasis)
	}
	wantF := HeadLossSI(20, 3600*units.USGallon/3600, 150, 0.04)
	if !closeRel(p.FrictionM, wantF, 1e-12, 0) || !closeRel(p.HeadM, 1.2+wantF, 1e-12, 0) {
		t.Errorf("friction %g, head %g, want %g and %g", p.FrictionM, p.HeadM, wantF, 1.2+wantF)
	}
	elev := 11.5
	o.DischargeHeightM, o.DischargeElevationM = 0, &elev
	if _, p, _ := WaterAndPump(v, 2, 0.6, 0, 10, o); !closeRel(p.StaticLiftM, 1.5, 1e-12, 0) {
		t.Errorf("lift to a surveyed elevation %g, want 1.5", p.StaticLiftM)
	}
}

func TestWaterAndPump_BadInput(t *testing.T) {
	elev := 12.0
	for _, tc := range []struct {
		name string
		o    WaterOptions
	}{
		{"negative turnover", WaterOptions{TurnoverH: -1}},
		{"negative supply", WaterOptions{SupplyM3PerH: -1}},
		{"negative spillway", WaterOptions{SpillwayWidthM: -0.1}},
		{"height and elevation", WaterOptions{DischargeHeightM: 1, DischargeElevationM: &elev}},
		{"pipe without diameter", WaterOptions{PipeLengthM: 10}},
		{"negative pipe", WaterOptions{PipeLengthM: -10, PipeDiameterM: 0.05}},
		{"negative C", WaterOptions{PipeLengthM: 10, PipeDiameterM: 0.05, PipeC: -1}},
	} {
		if _, _, err := WaterAndPump(1, 1, 1, 1, 0, tc.o); !errors.Is(err, ErrOption) {
			t.Errorf("%s: err = %v, want ErrOption", tc.name, err)
		}
	}
	if _, _, err := WaterAndPump(1, 1, 1, 1, 0, WaterOptions{PipeLengthM: 10, PipeDiameterM: 0.05, Pipe: "bamboo"}); !errors.Is(err, ErrPreset) {
		t.Errorf("unknown pipe: err = %v, want ErrPreset", err)
	}
	if _, _, err := WaterAndPump(-1, 1, 1, 1, 0, WaterOptions{}); !errors.Is(err, ErrInput) {
		t.Errorf("negative volume: err = %v, want ErrInput", err)
	}
	// A turnover time of zero is an error where it is computed.
	if _, err := TurnoverFlow(10, 0); !errors.Is(err, ErrOption) {
		t.Errorf("TurnoverFlow(10, 0): err = %v, want ErrOption", err)
	}
}

func TestParseSheetFlow(t *testing.T) {
	for in, want := range map[string]float64{"": 150, "light": 100, "Medium": 150, " heavy ": 200} {
		s, err := ParseSheetFlow(in)
		if err != nil || s.GallonsPerHourPerInch() != want {
			t.Errorf("ParseSheetFlow(%q) = %v, %v", in, s, err)
		}
	}
	if _, err := ParseSheetFlow("torrent"); !errors.Is(err, ErrOption) {
		t.Errorf("ParseSheetFlow(torrent): err = %v", err)
	}
}

func TestVolumeBelow_ParallelSet(t *testing.T) {
	// A flat-floored pit under a convex floor of area A and perimeter P with
	// walls at s: at height h above the floor the water's plan area is the
	// parallel set A + P·s·h + π(s·h)² (Steiner), so the volume to depth d
	// is A·d + P·s·d²/2 + π·s²·d³/3. The lattice interpolates the kinks:
	// within 0.2 % at h = 2 cm.
	const w, d = 100.0, 0.9
	for _, tc := range []struct {
		name string
		r    geom.Ring
		s    float64
	}{
		{"rectangle s=1", rectRing(0.037, 0.011, 4.037, 2.511), 1},
		{"128-gon s=2", ellipseRing(geom.Vec2{X: 1, Y: 2}, 1.7, 1.7, 128), 2},
	} {
		pc := onePond(t, tc.r, w, d, 0.2, tc.s, 0.02)
		A, P := math.Abs(tc.r.Area()), tc.r.Perimeter()
		want := A*d + P*tc.s*d*d/2 + math.Pi*tc.s*tc.s*d*d*d/3
		if got := VolumeBelow(pc.mesh, w); !closeRel(got, want, 2e-3, 0) {
			t.Errorf("%s: VolumeBelow = %.5f m³, want %.5f (parallel sets), rel %.2e", tc.name, got, want, got/want-1)
		}
	}
}

func TestVolumeBelow_Triangle(t *testing.T) {
	// One triangle of plan area 1/2 from z = 0 to 1, exact integrals:
	// full at level 1: ∫(1 − z) = A(1 − 1/3) = 1/3; at level 0.5 only the
	// corner at z = 0 holds water... z = x here: ∫ over x < 0.5 of
	// (0.5 − x)(1 − x) dx = 5/48.
	m := geom.TriMesh{V: []geom.Vec3{{X: 0, Y: 0, Z: 0}, {X: 1, Y: 0, Z: 1}, {X: 0, Y: 1, Z: 0}}, T: []int32{0, 1, 2}}
	if got := VolumeBelow(m, 1); !closeRel(got, 1.0/3, 1e-15, 0) {
		t.Errorf("VolumeBelow(1) = %.17g, want 1/3", got)
	}
	if got := VolumeBelow(m, 0.5); !closeRel(got, 5.0/48, 1e-15, 0) {
		t.Errorf("VolumeBelow(0.5) = %.17g, want 5/48", got)
	}
	if got := VolumeBelow(m, 0); got != 0 {
		t.Errorf("VolumeBelow(0) = %g, want 0", got)
	}
	// Plan and developed areas below 0.5: the strip x < 0.5 of the
	// triangle, 3/8 of plan; the surface z = x has slope factor √2.
	if got := PlanArea(m, 0.5); !closeRel(got, 3.0/8, 1e-15, 0) {
		t.Errorf("PlanArea(0.5) = %g, want 3/8", got)
	}
	if got := DevelopedArea(m, 0.5); !closeRel(got, 3.0/8*math.Sqrt2, 1e-15, 0) {
		t.Errorf("DevelopedArea(0.5) = %g, want 3√2/8", got)
	}
}
