package tin

import (
	"math"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/robust"
)

// SampleLattice samples the surface on a regular lattice of nx × ny nodes:
// out[j*nx+i] is the elevation at (x0+i·h, y0+j·h), or NaN where that node
// is outside the surface. Each triangle is rasterised row by row (scanline)
// instead of locating every node; whether a node near a triangle's edge is
// inside is decided exactly, so every node inside the surface (edges and
// vertices included) gets a value and no node outside does. Node
// coordinates are computed as x0 + float64(i)·h (rounded products, no
// fused multiply-add).
//
// out must have at least nx·ny elements (SampleLattice panics otherwise,
// like an index out of range); with nx or ny <= 0 it does nothing, and with h
// not a positive finite number every node is NaN.
//
// Cost: O(triangles + nodes inside the surface).
func (s *Surface) SampleLattice(x0, y0, h float64, nx, ny int, out []float64) {
	if nx <= 0 || ny <= 0 {
		return
	}
	out = out[:nx*ny]
	nan := math.NaN()
	for k := range out {
		out[k] = nan
	}
	if !(h > 0) || math.IsInf(h, 0) || math.IsNaN(x0) || math.IsNaN(y0) || math.IsInf(x0, 0) || math.IsInf(y0, 0) {
		return
	}
	nodeX := func(i int) float64 { return x0 + float64(float64(i)*h) }
	nodeY := func(j int) float64 { return y0 + float64(float64(j)*h) }
	m := s.mesh
	inv := 1 / h
	for t := range m.NumTriangles() {
		a, b, c := m.Triangle(t)
		pa, pb, pc := geom.Vec2{X: a.X, Y: a.Y}, geom.Vec2{X: b.X, Y: b.Y}, geom.Vec2{X: c.X, Y: c.Y}
		ylo, yhi := min(a.Y, b.Y, c.Y), max(a.Y, b.Y, c.Y)
		j0 := max(0, int(math.Floor((ylo-y0)*inv))-1)
		j1 := min(ny-1, int(math.Ceil((yhi-y0)*inv))+1)
		if j0 > j1 {
			continue
		}
		xlo, xhi := min(a.X, b.X, c.X), max(a.X, b.X, c.X)
		if int(math.Ceil((xhi-x0)*inv))+1 < 0 || int(math.Floor((xlo-x0)*inv))-1 > nx-1 {
			continue
		}
		// Plane z = a.Z + gx(x−a.X) + gy(y−a.Y).
		bx, by, bz := b.X-a.X, b.Y-a.Y, b.Z-a.Z
		cx, cy, cz := c.X-a.X, c.Y-a.Y, c.Z-a.Z
		d := float64(bx*cy) - float64(by*cx)
		gx := (float64(bz*cy) - float64(cz*by)) / d
		gy := (float64(bx*cz) - float64(cx*bz)) / d
		inside := func(i, j int) bool {
			p := geom.Vec2{X: nodeX(i), Y: nodeY(j)}
			return robust.Orient2D(pa, pb, p) >= 0 && robust.Orient2D(pb, pc, p) >= 0 && robust.Orient2D(pc, pa, p) >= 0
		}
		for j := j0; j <= j1; j++ {
			y := nodeY(j)
			if y < ylo || y > yhi {
				continue
			}
			// Floating-point x-range of the triangle on this row, then
			// exact tests to settle its ends.
			xl, xr := math.Inf(1), math.Inf(-1)
			edge := func(p, q geom.Vec2) {
				if (p.Y <= y && y <= q.Y) || (q.Y <= y && y <= p.Y) {
					if p.Y == q.Y {
						xl, xr = min(xl, p.X, q.X), max(xr, p.X, q.X)
						return
					}
					x := p.X + (y-p.Y)*(q.X-p.X)/(q.Y-p.Y)
					xl, xr = min(xl, x), max(xr, x)
				}
			}
			edge(pa, pb)
			edge(pb, pc)
			edge(pc, pa)
			if xl > xr {
				continue
			}
			i0 := max(0, int(math.Floor((xl-x0)*inv))-1)
			i1 := min(nx-1, int(math.Ceil((xr-x0)*inv))+1)
			for i0 <= i1 && !inside(i0, j) {
				i0++
			}
			if i0 > i1 {
				continue
			}
			for !inside(i1, j) {
				i1--
			}
			for i0 > 0 && inside(i0-1, j) {
				i0--
			}
			for i1 < nx-1 && inside(i1+1, j) {
				i1++
			}
			row := out[j*nx : j*nx+nx]
			zr := a.Z + gy*(y-a.Y)
			for i := i0; i <= i1; i++ {
				row[i] = zr + gx*(nodeX(i)-a.X)
			}
		}
	}
}
