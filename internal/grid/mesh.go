package grid

import (
	"math"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// Mesh returns the lattice function z as a [geom.TriMesh]: two
// counter-clockwise triangles per kept cell, split along the same diagonal
// as [DiffVolumes] uses. keepCell(i, j) chooses the cells (nil keeps them
// all); a cell with a non-finite corner value is always left out. Only
// nodes used by a kept cell become vertices, in node order, so the mesh of
// a few cells of a large lattice stays small. It panics if z is shorter
// than l.Len() (a programming error).
func (l Lattice) Mesh(z []float64, keepCell func(i, j int) bool) geom.TriMesh {
	n := l.Len()
	if n == 0 || l.NX < 2 || l.NY < 2 {
		return geom.TriMesh{}
	}
	_ = z[n-1]
	keep := func(i, j int) bool {
		k := l.Index(i, j)
		if !finite(z[k]) || !finite(z[k+1]) || !finite(z[k+l.NX]) || !finite(z[k+l.NX+1]) {
			return false
		}
		return keepCell == nil || keepCell(i, j)
	}
	// First pass: mark used nodes and count cells.
	vid := make([]int32, n)
	cells := 0
	for j := 0; j+1 < l.NY; j++ {
		for i := 0; i+1 < l.NX; i++ {
			if !keep(i, j) {
				continue
			}
			cells++
			k := l.Index(i, j)
			vid[k], vid[k+1], vid[k+l.NX], vid[k+l.NX+1] = 1, 1, 1, 1
		}
	}
	var m geom.TriMesh
	for k := range vid {
		if vid[k] != 0 {
			vid[k] = int32(len(m.V))
			p := l.Node(k%l.NX, k/l.NX)
			m.V = append(m.V, geom.Vec3{X: p.X, Y: p.Y, Z: z[k]})
		} else {
			vid[k] = -1
		}
	}
	m.T = make([]int32, 0, 6*cells)
	for j := 0; j+1 < l.NY; j++ {
		for i := 0; i+1 < l.NX; i++ {
			if !keep(i, j) {
				continue
			}
			k := l.Index(i, j)
			a, b, c, d := vid[k], vid[k+1], vid[k+l.NX+1], vid[k+l.NX]
			m.T = append(m.T, a, b, c, a, c, d)
		}
	}
	return m
}

func finite(f float64) bool { return !math.IsNaN(f) && !math.IsInf(f, 0) }
