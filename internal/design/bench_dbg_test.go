package design

import "testing"

func BenchmarkDbg(b *testing.B) {
	shelf := ring(-3, -2, 3, -2, 3.5, 0, 3, 2, -1, 2.2, -3, 1)
	deep := ring(-1.5, -1, 1.5, -1, 1.5, 0.8, -1.5, 0.8)
	p := Params{Zones: []Zone{{Name: "shelf", Ring: shelf, DepthM: 0.3, WallSlope: 1}, {Name: "deep", Ring: deep, DepthM: 0.9, WallSlope: 1.5}},
		WaterLevelM: 100, FreeboardM: 0.15, BermCrestM: 0.5, BermSlope: 2}
	g := plane(100, 0.06, 0.02, 40)
	for b.Loop() {
		Build(g, p)
	}
}
