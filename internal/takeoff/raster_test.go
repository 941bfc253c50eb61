package takeoff

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// fullWalk is the raster profile's walk over every sample of the line, the
// definition the clipped walk of rasterProfile.develop must reproduce.
func fullWalk(p *rasterProfile, o, u geom.Vec2, t0, t1 float64) float64 {
	r := p.r
	n := max(1, int(math.Ceil((t1-t0)/p.step)))
	dt := (t1 - t0) / float64(n)
	s := o.Add(u.Scale(t0))
	fx0, fy0 := (s.X-r.x0)/r.h, (s.Y-r.y0)/r.h
	dfx, dfy := u.X*dt/r.h, u.Y*dt/r.h
	prev := r.depthGrid(fx0, fy0)
	started := prev < 0
	total, best := 0.0, 0.0
	for i := 1; i <= n; i++ {
		d := r.depthGrid(fx0+float64(i)*dfx, fy0+float64(i)*dfy)
		started = started || d < 0
		if started {
			dz := d - prev
			total += math.Sqrt(dt*dt + dz*dz)
			if d < 0 || prev < 0 {
				best = total
			}
		}
		prev = d
	}
	return best
}

// TestRasterProfile_ClippedWalk checks that skipping the samples outside
// the raster's active range changes no developed length, bit for bit, on
// lines at every angle through, beside and far from an elliptical pond
// with sloped walls and an L-shaped one with vertical walls.
func TestRasterProfile_ClippedWalk(t *testing.T) {
	ell := onePond(t, ellipseRing(geom.Vec2{X: 1, Y: -0.5}, 2.5, 1.5, 40), 10, 0.6, 0.1, 1, 0.05)
	el := geom.Ring{{X: -2, Y: -3}, {X: 3, Y: -3}, {X: 3, Y: -1}, {X: 0, Y: -1}, {X: 0, Y: 2}, {X: -2, Y: 2}}
	for _, pc := range []pondCase{ell, onePond(t, el, 10, 0.6, 0.1, 0, 0.05)} {
		testClippedWalk(t, pc)
	}
}

func testClippedWalk(t *testing.T, pc pondCase) {
	t.Helper()
	ras := newRaster(pc.mesh, pc.rim, 0.025)
	seed := uint64(20260301)
	rng := rand.New(rand.NewPCG(seed, 2))
	for _, step := range []float64{ras.h, 2 * ras.h, 0.7 * ras.h} {
		p := &rasterProfile{r: ras, step: step}
		for k := range 2000 {
			th := rng.Float64() * math.Pi
			u := geom.Vec2{X: math.Cos(th), Y: math.Sin(th)}
			nv := geom.Vec2{X: -u.Y, Y: u.X}
			o := nv.Scale(rng.Float64()*12 - 6).Add(geom.Vec2{X: 1, Y: -0.5})
			t0 := -8 + rng.Float64()*6
			t1 := t0 + rng.Float64()*14
			if got, want := p.develop(o, u, t0, t1), fullWalk(p, o, u, t0, t1); got != want {
				t.Fatalf("case %d (seed %d, step %g): develop = %.17g, full walk %.17g", k, seed, step, got, want)
			}
		}
	}
}

// TestRaster_CapIsFlat checks that the raster reads exactly the cap on the
// capped ground and off the mesh, where four equal node elevations could
// otherwise interpolate to just below the cap.
func TestRaster_CapIsFlat(t *testing.T) {
	pc := onePond(t, rectRing(0, 0, 3, 2), 29.431259746250667, 0.5, 0.0762, 1, 0.05)
	ras := newRaster(pc.mesh, pc.rim, 0.0137)
	seed := uint64(20260302)
	rng := rand.New(rand.NewPCG(seed, 3))
	checked := 0
	for k := range 20000 {
		p := geom.Vec2{X: rng.Float64()*9 - 3, Y: rng.Float64()*8 - 3}
		if pc.bowl.BowlAt(p) < pc.rim+0.2 {
			continue // in or near the lined area
		}
		checked++
		if got := ras.at(p); got != pc.rim {
			t.Fatalf("case %d (seed %d): raster at %v = %.17g, want the cap %.17g", k, seed, p, got, pc.rim)
		}
	}
	if checked < 1000 {
		t.Fatalf("only %d points off the lined area", checked)
	}
}

// BenchmarkRasterProfile64 is one angle of the sheet search's fine scan on
// the raster: 64 parallel sections across a 5 × 3 m elliptical pond at
// 2.5 cm steps.
func BenchmarkRasterProfile64(b *testing.B) {
	pc := onePond(b, ellipseRing(geom.Vec2{X: 1, Y: -0.5}, 2.5, 1.5, 40), 10, 0.6, 0.1, 1, 0.05)
	ras := newRaster(pc.mesh, pc.rim, 0.025)
	p := &rasterProfile{r: ras, step: ras.h}
	pts := make([]geom.Vec2, len(pc.mesh.V))
	for i, v := range pc.mesh.V {
		pts[i] = v.XY()
	}
	hull := convexHull(pts)
	b.ReportAllocs()
	for b.Loop() {
		if longestSection(p, hull, 0.3, 64, false, 0.1) <= 0 {
			b.Fatal("no section")
		}
	}
}
