package takeoff

import (
	"testing"
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
