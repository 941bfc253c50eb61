package design

import (
	"math"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/grid"
)

// funcTerrain is a stand-in for the TIN: an analytic surface over a box.
type funcTerrain struct {
	f   func(x, y float64) float64
	box geom.Box
}

func (t funcTerrain) Elevation(x, y float64) (float64, bool) {
	if !t.box.Contains(geom.Vec2{X: x, Y: y}) {
		return math.NaN(), false
	}
	return t.f(x, y), true
}

func (t funcTerrain) SampleLattice(x0, y0, h float64, nx, ny int, out []float64) {
	for j := 0; j < ny; j++ {
		y := y0 + float64(j)*h
		for i := 0; i < nx; i++ {
			out[j*nx+i], _ = t.Elevation(x0+float64(i)*h, y)
		}
	}
}

func (t funcTerrain) Bounds() geom.Box { return t.box }

// plane returns ground z0 + gx·x + gy·y over the box ±half around the
// origin.
func plane(z0, gx, gy, half float64) funcTerrain {
	return funcTerrain{
		f:   func(x, y float64) float64 { return z0 + gx*x + gy*y },
		box: geom.Box{Min: geom.Vec2{X: -half, Y: -half}, Max: geom.Vec2{X: half, Y: half}},
	}
}

// rect returns the counter-clockwise rectangle [x0, x1] × [y0, y1].
func rect(x0, y0, x1, y1 float64) geom.Ring {
	return geom.Ring{{X: x0, Y: y0}, {X: x1, Y: y0}, {X: x1, Y: y1}, {X: x0, Y: y1}}
}

func ring(c ...float64) geom.Ring {
	r := make(geom.Ring, len(c)/2)
	for i := range r {
		r[i] = geom.Vec2{X: c[2*i], Y: c[2*i+1]}
	}
	return r
}

func gridLattice(b geom.Box, h float64) (grid.Lattice, error) { return grid.NewLattice(b, h) }
