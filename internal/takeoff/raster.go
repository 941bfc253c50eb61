package takeoff

import (
	"math"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// raster is a regular grid of a mesh's elevations capped at a level, used
// to scan many cross-sections quickly. Node (i, j) sits at
// (x0 + i·h, y0 + j·h); nodes outside the mesh hold the cap, and so does
// every query outside the grid. Values are flat, row by row (index
// j·nx + i).
type raster struct {
	x0, y0, h float64
	nx, ny    int
	z         []float64
	cap       float64
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
	r := &raster{cap: cap}
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
	r.z = make([]float64, r.nx*r.ny)
	for i := range r.z {
		r.z[i] = cap
	}
	for t := range m.NumTriangles() {
		a, b, c := m.Triangle(t)
		r.fill(a, b, c)
	}
	return r
}

// fill writes the plane of triangle abc into the nodes it covers (boundary
// included, by barycentric coordinates in floating point: a node on a shared
// edge takes either triangle's value, which agree there).
func (r *raster) fill(a, b, c geom.Vec3) {
	det := float64((b.X-a.X)*(c.Y-a.Y)) - float64((c.X-a.X)*(b.Y-a.Y))
	if det == 0 {
		return
	}
	minX := math.Min(a.X, math.Min(b.X, c.X))
	maxX := math.Max(a.X, math.Max(b.X, c.X))
	minY := math.Min(a.Y, math.Min(b.Y, c.Y))
	maxY := math.Max(a.Y, math.Max(b.Y, c.Y))
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
			r.z[j*r.nx+i] = math.Min(z, r.cap)
		}
	}
}

// at returns the bilinear interpolation of the capped grid at p.
func (r *raster) at(p geom.Vec2) float64 {
	return r.atGrid((p.X-r.x0)/r.h, (p.Y-r.y0)/r.h)
}

// atGrid is at for a point given in grid units: (fx, fy) is node
// (i, j) + the fractions.
func (r *raster) atGrid(fx, fy float64) float64 {
	if r.nx < 2 || r.ny < 2 {
		return r.cap
	}
	if !(fx >= 0 && fy >= 0 && fx <= float64(r.nx-1) && fy <= float64(r.ny-1)) {
		return r.cap
	}
	i := min(int(fx), r.nx-2)
	j := min(int(fy), r.ny-2)
	u, v := fx-float64(i), fy-float64(j)
	k := j*r.nx + i
	z00, z10 := r.z[k], r.z[k+1]
	z01, z11 := r.z[k+r.nx], r.z[k+r.nx+1]
	return (1-v)*((1-u)*z00+u*z10) + v*((1-u)*z01+u*z11)
}
