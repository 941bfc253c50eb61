package takeoff

import (
	"testing"

	"github.com/dugout-estimating/dugout/internal/design"
	"github.com/dugout-estimating/dugout/internal/geom"
)

// benchOptions is a full takeoff: edge stone, gravel, pump circuit, prices.
func benchOptions() Options {
	return Options{
		EdgeStone: &EdgeStoneOptions{Rock: "granite", FaceHeightM: 0.2, ThicknessM: 0.3, BoulderPercent: 10},
		Gravel:    []GravelOptions{{ThicknessM: 0.05}},
		Water:     WaterOptions{DischargeHeightM: 0.8, PipeLengthM: 8, PipeDiameterM: 0.038},
		Prices:    &PriceList{PerSquareFootLiner: 1.2, PerTonStone: 200, PerCrewHour: 70},
	}
}

// BenchmarkTakeoffDemo is a demo-sized garden pond: about 7 × 5 m at the
// rim, two zones, a 5 cm lattice (about 27 000 triangles). Target: under
// 100 ms.
func BenchmarkTakeoffDemo(b *testing.B) {
	in := demoPond(b, 1, 0.05)
	b.ReportMetric(float64(in.BowlMesh.NumTriangles()), "triangles")
	o := benchOptions()
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Compute(in, o); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkTakeoff1e6 is the same pond scaled to about 36 × 25 m on a 5 cm
// lattice: about 1.0e6 triangles. Target: under 2 s for the full takeoff
// including the sheet's angle search.
func BenchmarkTakeoff1e6(b *testing.B) {
	in := demoPond(b, 5.2, 0.05)
	b.ReportMetric(float64(in.BowlMesh.NumTriangles()), "triangles")
	o := benchOptions()
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Compute(in, o); err != nil {
			b.Fatal(err)
		}
	}
}

// demoDesign builds, with the design package, a pond like the demo site's:
// a kidney-shaped outline about 6 × 3.5 m (times scale) of 20 walked
// points, one marginal shelf 0.3 m wide at 0.25 m, the deep zone at
// 0.75 m, walls at 1:1, 0.15 m freeboard, on flat ground at the rim. cell
// 0 lets the design choose its lattice.
func demoDesign(tb testing.TB, scale, cell float64) *design.Surface {
	tb.Helper()
	o := design.Outline{Ring: kidney(geom.Vec2{X: 0.2, Y: 0.1}, 3*scale, 1.75*scale, 20),
		Shelves: []design.Shelf{{WidthM: 0.3 * scale, DepthM: 0.25}}, DeepDepthM: 0.75, WallSlope: 1}
	zones, err := o.Zones()
	if err != nil {
		tb.Fatal(err)
	}
	const w, fb = 100.0, 0.15
	ext := 5 * scale
	g := flatGround{z: w + fb, box: geom.Box{Min: geom.Vec2{X: -ext, Y: -ext}, Max: geom.Vec2{X: ext, Y: ext}}}
	s, err := design.Build(g, design.Params{Zones: zones, WaterLevelM: w, FreeboardM: fb, CellM: cell})
	if err != nil {
		tb.Fatal(err)
	}
	return s
}

// BenchmarkFromDesignDemo runs the takeoff on a demo-like design surface
// built by the design package (its own lattice and analytic bowl),
// including the bowl mesh. Target: under 100 ms.
func BenchmarkFromDesignDemo(b *testing.B) {
	s := demoDesign(b, 1, 0)
	b.ReportMetric(float64(s.BowlMesh().NumTriangles()), "triangles")
	o := benchOptions()
	b.ReportAllocs()
	for b.Loop() {
		if _, err := FromDesign(s, o); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkFromDesign1e6 is the same design scaled 8.7 times on a 5 cm
// lattice: about 1e6 bowl triangles. Target: under 2 s.
func BenchmarkFromDesign1e6(b *testing.B) {
	s := demoDesign(b, 8.7, 0.05)
	b.ReportMetric(float64(s.BowlMesh().NumTriangles()), "triangles")
	o := benchOptions()
	b.ReportAllocs()
	for b.Loop() {
		if _, err := FromDesign(s, o); err != nil {
			b.Fatal(err)
		}
	}
}
