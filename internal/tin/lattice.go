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
		j0 := clampIndex(math.Ceil((ylo-y0)*inv)-1, ny)
		j1 := clampIndex(math.Floor((yhi-y0)*inv)+1, ny)
		xlo, xhi := min(a.X, b.X, c.X), max(a.X, b.X, c.X)
		if (xhi-x0)*inv < -1 || (xlo-x0)*inv > float64(nx) {
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
			return leftOrOn(pa, pb, p) && leftOrOn(pb, pc, p) && leftOrOn(pc, pa, p)
		}
		for j := j0; j <= j1; j++ {
			y := nodeY(j)
			if y < ylo || y > yhi {
				continue
			}
			// Floating-point x-range [xl, xr] of the triangle on this row.
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
			// Nodes farther than band from both ends are inside (or
			// outside) for certain; only nodes within band of an end are
			// tested exactly. The nodes inside form one run (a row's nodes
			// share one y and their x grows with i; the triangle is convex).
			band := latticeBandEps * ((xhi - xlo) + math.Abs(xl) + math.Abs(xr))
			first := clampIndex(math.Ceil((xl-band-x0)*inv)-1, nx)
			for first < nx && nodeX(first) < xl-band {
				first++
			}
			last := clampIndex(math.Floor((xr+band-x0)*inv)+1, nx)
			for last >= 0 && nodeX(last) > xr+band {
				last--
			}
			for first <= last && nodeX(first) <= xl+band && !inside(first, j) {
				first++
			}
			for last >= first && nodeX(last) >= xr-band && !inside(last, j) {
				last--
			}
			if first > last {
				continue
			}
			row := out[j*nx : j*nx+nx]
			zr := a.Z + gy*(y-a.Y)
			for i := first; i <= last; i++ {
				row[i] = zr + gx*(nodeX(i)-a.X)
			}
		}
	}
}

// latticeBandEps bounds, relative to the triangle's x-extent plus the
// magnitudes of the row's interval ends, the floating-point error of a row's
// x-interval in SampleLattice. Each end is an edge crossing
// x = p.X + (y−p.Y)(q.X−p.X)/(q.Y−p.Y) with 0 <= (y−p.Y)/(q.Y−p.Y) <= 1:
// five rounded operations on the quotient term give a relative error of at
// most 5ε (ε = 2^-53) on a term of size <= |q.X−p.X|, and the final sum one
// more ε of |x|, so |x − exact| <= 5.01ε|q.X−p.X| + 1.01ε|x|. A band of 16ε
// times (extent + |xl| + |xr|) covers that with a factor of two to spare;
// nodes inside the band are decided by the exact predicates.
const latticeBandEps = 16.0 / (1 << 53)

// clampIndex converts f to an index in [0, n), clamping (NaN gives 0).
func clampIndex(f float64, n int) int {
	switch {
	case !(f > 0):
		return 0
	case f >= float64(n-1):
		return n - 1
	}
	return int(f)
}

// leftOrOn reports whether p is on or to the left of the directed line
// a→b, exactly: the floating-point determinant certified by
// [robust.Orient2DErrBound], else [robust.Orient2D].
func leftOrOn(a, b, p geom.Vec2) bool {
	detleft := float64((a.X - p.X) * (b.Y - p.Y))
	detright := float64((a.Y - p.Y) * (b.X - p.X))
	det := detleft - detright
	bound := robust.Orient2DErrBound * (math.Abs(detleft) + math.Abs(detright))
	if det > bound {
		return true
	}
	if -det > bound {
		return false
	}
	return robust.Orient2D(a, b, p) >= 0
}
