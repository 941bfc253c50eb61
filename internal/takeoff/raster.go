package takeoff

import (
	"math"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// raster is a regular grid of a mesh's elevations capped at a level, used
// to scan many cross-sections quickly. Node (i, j) sits at
// (x0 + i·h, y0 + j·h). Each node holds its depth below the cap,
// min(z, cap) − cap ≤ 0: nodes outside the mesh hold 0, and so does every
// query outside the grid. Storing depths makes the capped ground exactly
// flat: bilinear interpolation of four zeros is zero, where interpolating
// four equal elevations can round to just below them and read as lined.
// Values are flat, row by row (index j·nx + i).
type raster struct {
	x0, y0, h float64
	nx, ny    int
	d         []float64
	cap       float64
	// Nodes below the cap lie in columns ia0..ia1 and rows ja0..ja1
	// (ia0 > ia1 when there are none), and inside the convex polygon
	// hx[k]·i + hy[k]·j ≤ hc[k] (grid units, unit normals), whose sides
	// are support lines of those nodes in rasterDirections directions.
	ia0, ia1, ja0, ja1 int
	hx, hy, hc         []float64
}

// maxRasterNodes bounds the raster's memory (8 bytes a node: 64 MB). A mesh
// finer than that is sampled at a coarser spacing; the raster only ranks
// sheet angles, the final sheet is measured on the analytic bowl.
const maxRasterNodes = 8 << 20

// newRaster samples m on a grid of spacing h (widened when the grid would
// exceed maxRasterNodes), each node taking the value of the triangle that
// covers it, capped at cap. Cost O(T + nodes).
func newRaster(m geom.TriMesh, cap, h float64) *raster {
	box := geom.EmptyBox()
	for _, v := range m.V {
		box = box.Extend(v.XY())
	}
	r := &raster{cap: cap, ia0: 0, ia1: -1, ja0: 0, ja1: -1}
	if box.IsEmpty() || !(h > 0) {
		return r
	}
	for {
		r.nx = int(math.Floor(box.Width()/h)) + 2
		r.ny = int(math.Floor(box.Height()/h)) + 2
		if r.nx*r.ny <= maxRasterNodes {
			break
		}
		h *= math.Sqrt(float64(r.nx*r.ny)/maxRasterNodes) * 1.01
	}
	r.x0, r.y0, r.h = box.Min.X, box.Min.Y, h
	r.d = make([]float64, r.nx*r.ny)
	for t := range m.NumTriangles() {
		a, b, c := m.Triangle(t)
		r.fill(a, b, c)
	}
	r.ia0, r.ja0 = r.nx, r.ny
	var ends []geom.Vec2 // each row's first and last node below the cap
	for j := 0; j < r.ny; j++ {
		row := r.d[j*r.nx : (j+1)*r.nx]
		first, last := -1, -1
		for i, d := range row {
			if d < 0 {
				if first < 0 {
					first = i
				}
				last = i
			}
		}
		if first < 0 {
			continue
		}
		r.ia0, r.ia1 = min(r.ia0, first), max(r.ia1, last)
		r.ja0, r.ja1 = min(r.ja0, j), max(r.ja1, j)
		ends = append(ends, geom.Vec2{X: float64(first), Y: float64(j)}, geom.Vec2{X: float64(last), Y: float64(j)})
	}
	if len(ends) > 0 {
		for k := range rasterDirections {
			a := 2 * math.Pi * float64(k) / rasterDirections
			nx, ny := math.Cos(a), math.Sin(a)
			c := math.Inf(-1)
			for _, p := range ends {
				c = max(c, nx*p.X+ny*p.Y)
			}
			r.hx, r.hy, r.hc = append(r.hx, nx), append(r.hy, ny), append(r.hc, c)
		}
	}
	return r
}

// rasterDirections is the number of directions of the polygon that bounds
// the nodes below the cap: each side is a support line of those nodes, so
// the polygon holds their hull and overshoots a round pond by about
// 1/cos(π/16) − 1 = 2 % of its radius.
const rasterDirections = 16

// fill writes the plane of triangle abc into the nodes it covers (boundary
// included, by barycentric coordinates in floating point: a node on a shared
// edge takes either triangle's value, which agree there).
func (r *raster) fill(a, b, c geom.Vec3) {
	det := float64((b.X-a.X)*(c.Y-a.Y)) - float64((c.X-a.X)*(b.Y-a.Y))
	if det == 0 {
		return
	}
	minX := min(a.X, min(b.X, c.X))
	maxX := max(a.X, max(b.X, c.X))
	minY := min(a.Y, min(b.Y, c.Y))
	maxY := max(a.Y, max(b.Y, c.Y))
	i0 := max(0, int(math.Ceil((minX-r.x0)/r.h)))
	i1 := min(r.nx-1, int(math.Floor((maxX-r.x0)/r.h)))
	j0 := max(0, int(math.Ceil((minY-r.y0)/r.h)))
	j1 := min(r.ny-1, int(math.Floor((maxY-r.y0)/r.h)))
	// Barycentric coordinates may round to just below zero on an edge.
	const edgeSlack = -1e-12
	for j := j0; j <= j1; j++ {
		y := r.y0 + float64(j)*r.h
		for i := i0; i <= i1; i++ {
			x := r.x0 + float64(i)*r.h
			l1 := (float64((x-a.X)*(c.Y-a.Y)) - float64((c.X-a.X)*(y-a.Y))) / det
			l2 := (float64((b.X-a.X)*(y-a.Y)) - float64((x-a.X)*(b.Y-a.Y))) / det
			l0 := 1 - l1 - l2
			if l0 < edgeSlack || l1 < edgeSlack || l2 < edgeSlack {
				continue
			}
			z := l0*a.Z + l1*b.Z + l2*c.Z
			r.d[j*r.nx+i] = min(z, r.cap) - r.cap
		}
	}
}

// at returns the bilinear interpolation of the capped grid at p: the cap
// plus the interpolated depth.
func (r *raster) at(p geom.Vec2) float64 {
	return r.cap + r.depthGrid((p.X-r.x0)/r.h, (p.Y-r.y0)/r.h)
}

// depthGrid returns the bilinear interpolation of the depths at a point
// given in grid units: (fx, fy) is node (i, j) + the fractions. It is 0
// outside the grid, and exactly 0 wherever the cell's four nodes are.
func (r *raster) depthGrid(fx, fy float64) float64 {
	if r.nx < 2 || r.ny < 2 {
		return 0
	}
	if !(fx >= 0 && fy >= 0 && fx <= float64(r.nx-1) && fy <= float64(r.ny-1)) {
		return 0
	}
	i := min(int(fx), r.nx-2)
	j := min(int(fy), r.ny-2)
	u, v := fx-float64(i), fy-float64(j)
	k := j*r.nx + i
	d00, d10 := r.d[k], r.d[k+1]
	d01, d11 := r.d[k+r.nx], r.d[k+r.nx+1]
	return (1-v)*((1-u)*d00+u*d10) + v*((1-u)*d01+u*d11)
}

// hullReach is how far, in cells, a point whose bilinear cell has a node
// inside the hull of the nodes below the cap can lie outside that hull:
// the cell's diagonal, √2, rounded up.
const hullReach = 1.5

// activeSteps returns the range [lo, hi] of sample indices i in [0, n]
// whose points (fx0 + i·dfx, fy0 + i·dfy), in grid units, may fall in a
// cell with a node below the cap; every other sample's depth is exactly 0.
// lo > hi when there is none. The range is found from the active columns
// and rows widened by a cell and from the hull of the active nodes widened
// by hullReach, and widened again by one sample for round-off, so it may
// hold a few samples more than needed.
func (r *raster) activeSteps(fx0, fy0, dfx, dfy float64, n int) (lo, hi int) {
	if r.ia0 > r.ia1 {
		return 1, 0
	}
	lo, hi = 0, n
	clip := func(f0, df float64, a, b int) bool {
		// Keep i with a−1 ≤ f0 + i·df ≤ b+1.
		fa, fb := float64(a-1), float64(b+1)
		if df == 0 {
			return f0 >= fa && f0 <= fb
		}
		s0, s1 := (fa-f0)/df, (fb-f0)/df
		if s0 > s1 {
			s0, s1 = s1, s0
		}
		if s1 < -1 || s0 > float64(n)+1 {
			return false
		}
		// Clamped before the conversion: a huge quotient has no int.
		lo = max(lo, int(math.Floor(max(s0, -2)))-1)
		hi = min(hi, int(math.Ceil(min(s1, float64(n)+2)))+1)
		return true
	}
	if !clip(fx0, dfx, r.ia0, r.ia1) || !clip(fy0, dfy, r.ja0, r.ja1) {
		return 1, 0
	}
	// Half-planes n·q ≤ c + hullReach: a + i·b ≤ 0.
	for k := range r.hc {
		a := r.hx[k]*fx0 + r.hy[k]*fy0 - r.hc[k] - hullReach
		b := r.hx[k]*dfx + r.hy[k]*dfy
		switch {
		case b > 0:
			if s := -a / b; s < float64(hi) {
				hi = int(math.Ceil(max(s, -2))) + 1
			}
		case b < 0:
			if s := -a / b; s > float64(lo) {
				lo = int(math.Floor(min(s, float64(n)+2))) - 1
			}
		case a > 0:
			return 1, 0
		}
		if lo > hi {
			return 1, 0
		}
	}
	return lo, hi
}
