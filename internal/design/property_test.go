package design

import (
	"math"
	"testing"

	"pgregory.net/rapid"

	"github.com/dugout-estimating/dugout/internal/geom"
)

func translated(r geom.Ring, d geom.Vec2) geom.Ring {
	out := make(geom.Ring, len(r))
	for i, p := range r {
		out[i] = p.Add(d)
	}
	return out
}

func TestBuild_TranslationInvariant(t *testing.T) {
	// Moving the whole site (zones and ground) moves nothing that matters:
	// by whole metres the lattice keeps its place relative to the design
	// (the cell, 1/16 m, divides a metre exactly) and volumes agree to
	// round-off; by any amount they agree within the lattice's error.
	rapid.Check(t, func(rt *rapid.T) {
		w := rapid.Float64Range(1, 5).Draw(rt, "w")
		h := rapid.Float64Range(1, 4).Draw(rt, "h")
		depth := rapid.Float64Range(0.2, 1.5).Draw(rt, "depth")
		slope := rapid.SampledFrom([]float64{0, 0.05, 0.5, 1, 1.7, 2.5}).Draw(rt, "slope")
		sharp := rapid.Bool().Draw(rt, "sharp")
		gx := rapid.Float64Range(-0.08, 0.08).Draw(rt, "gx")
		gy := rapid.Float64Range(-0.08, 0.08).Draw(rt, "gy")
		whole := rapid.Bool().Draw(rt, "whole")
		var d geom.Vec2
		if whole {
			d = geom.Vec2{X: float64(rapid.IntRange(-300, 300).Draw(rt, "dx")), Y: float64(rapid.IntRange(-300, 300).Draw(rt, "dy"))}
		} else {
			d = geom.Vec2{X: rapid.Float64Range(-300, 300).Draw(rt, "dx"), Y: rapid.Float64Range(-300, 300).Draw(rt, "dy")}
		}
		corners := Round
		if sharp {
			corners = Sharp
		}
		zone := Zone{Ring: ring(0, 0, w, 0, w+0.3*h, h, 0.2, h*0.9), DepthM: depth, WallSlope: slope, Corners: corners}
		p := Params{Zones: []Zone{zone}, WaterLevelM: 20, FreeboardM: 0.1, BermCrestM: 0.3, BermSlope: 2, CellM: 0.0625}
		g := funcTerrain{f: func(x, y float64) float64 { return 20 + gx*x + gy*y }, box: geom.Box{Min: geom.Vec2{X: -40, Y: -40}, Max: geom.Vec2{X: 40, Y: 40}}}
		a, err := Build(g, p)
		if err != nil {
			rt.Fatal(err)
		}
		q := p
		q.Zones = []Zone{zone}
		q.Zones[0].Ring = translated(zone.Ring, d)
		gt := funcTerrain{f: func(x, y float64) float64 { return 20 + gx*(x-d.X) + gy*(y-d.Y) }, box: geom.Box{Min: geom.Vec2{X: -40, Y: -40}.Add(d), Max: geom.Vec2{X: 40, Y: 40}.Add(d)}}
		b, err := Build(gt, q)
		if err != nil {
			rt.Fatal(err)
		}
		tol := func(v float64) float64 {
			if whole {
				return 1e-9 * (1 + v)
			}
			return max(a.RefineChange, b.RefineChange, refineFloor)*v + 1e-9
		}
		for _, c := range []struct {
			what string
			x, y float64
		}{{"cut", a.CutM3, b.CutM3}, {"fill", a.FillM3, b.FillM3}, {"water", a.WaterVolumeM3, b.WaterVolumeM3}} {
			if math.Abs(c.x-c.y) > tol(max(c.x, a.CutM3+a.FillM3)) {
				rt.Fatalf("%s %.9f, translated by %v: %.9f (cells %g, %g)", c.what, c.x, d, c.y, a.CellM, b.CellM)
			}
		}
	})
}

func TestBuild_Converges(t *testing.T) {
	// With the cell fixed, the lattice cut converges to the exact value at
	// second order: each halving cuts the error about fourfold (Steiner's
	// formula for a round-cornered convex zone on flat ground is exact).
	r := ring(0, -2, 2.2, -0.4, 1.4, 2.1, -1.3, 2.2, -2.1, -0.3)
	const s, depth = 1.5, 0.8
	A, P := r.CCW().Area(), r.Perimeter()
	want := A*depth + P*s*depth*depth/2 + math.Pi*s*s*depth*depth*depth/3
	var errs []float64
	for _, h := range []float64{0.2, 0.1, 0.05, 0.025} {
		sf, err := Build(plane(30, 0, 0, 40), Params{Zones: []Zone{{Ring: r, DepthM: depth, WallSlope: s}}, WaterLevelM: 30, CellM: h})
		if err != nil {
			t.Fatal(err)
		}
		if sf.CellM != h {
			t.Errorf("CellM = %g, want %g", sf.CellM, h)
		}
		errs = append(errs, math.Abs(sf.CutM3-want))
	}
	// Second order: three halvings would divide the error by 64; allow for
	// the irregular start at coarse cells.
	for k := 1; k < len(errs); k++ {
		if errs[k] >= errs[k-1] {
			t.Errorf("errors %.3g: not decreasing", errs)
		}
	}
	if errs[3] > errs[0]/16 {
		t.Errorf("errors %.3g over cells 0.2 to 0.025 m: want at least a 16-fold drop", errs)
	}
	t.Logf("errors %.3g", errs)
}
