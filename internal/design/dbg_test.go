package design

import (
	"testing"
	"time"
)

func TestDbg(t *testing.T) {
	shelf := ring(-3, -2, 3, -2, 3.5, 0, 3, 2, -1, 2.2, -3, 1)
	deep := ring(-1.5, -1, 1.5, -1, 1.5, 0.8, -1.5, 0.8)
	for _, lvl := range []LevelMode{LevelFixed, LevelAuto, LevelBalance} {
		p := Params{Zones: []Zone{{Name: "shelf", Ring: shelf, DepthM: 0.3, WallSlope: 1}, {Name: "deep", Ring: deep, DepthM: 0.9, WallSlope: 1.5}},
			WaterLevelM: 100, FreeboardM: 0.15, BermCrestM: 0.5, BermSlope: 2, Level: lvl, FillPerCut: 0.9}
		t0 := time.Now()
		sf, err := Build(plane(100, 0.06, 0.02, 40), p)
		if err != nil {
			t.Fatal(err)
		}
		t.Logf("%v %v W %.4f cut %.4f fill %.4f cell %g change %.2g water %.4f area %.4f floors %+v lat %dx%d warn %v", lvl, time.Since(t0), sf.WaterLevelM, sf.CutM3, sf.FillM3, sf.CellM, sf.RefineChange, sf.WaterVolumeM3, sf.WaterAreaM2, sf.ByZone, sf.Lattice.NX, sf.Lattice.NY, sf.Warnings)
	}
}
