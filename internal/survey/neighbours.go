package survey

import (
	"math"
	"slices"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// pointGrid is a uniform bucket grid over plan positions for nearest
// neighbour queries, stored flat (cell c holds idx[start[c]:start[c+1]]).
type pointGrid struct {
	pts    []geom.Vec2
	min    geom.Vec2
	cell   float64
	nx, ny int
	start  []int32
	idx    []int32
}

// pointsPerCell is the mean occupancy the grid aims for: a few points per
// cell keeps both the cell scan and the empty-cell overhead small.
const pointsPerCell = 2

func newPointGrid(pts []geom.Vec2) *pointGrid {
	g := &pointGrid{pts: pts}
	b := geom.BoxOf(pts)
	if b.IsEmpty() {
		return g
	}
	g.min = b.Min
	n := float64(len(pts))
	w, h := b.Width(), b.Height()
	g.cell = math.Sqrt(w * h * pointsPerCell / n)
	if !(g.cell > 0) {
		g.cell = math.Max(w, h) * pointsPerCell / n
	}
	if !(g.cell > 0) {
		g.cell = 1
	}
	// Bound the cell count by the point count, whatever the shape.
	for (w/g.cell+1)*(h/g.cell+1) > 4*n+16 {
		g.cell *= 2
	}
	g.nx = int(w/g.cell) + 1
	g.ny = int(h/g.cell) + 1
	counts := make([]int32, g.nx*g.ny+1)
	for _, p := range pts {
		counts[g.cellIndex(p)+1]++
	}
	for i := 1; i < len(counts); i++ {
		counts[i] += counts[i-1]
	}
	g.start = counts
	g.idx = make([]int32, len(pts))
	fill := slices.Clone(counts[:len(counts)-1])
	for i, p := range pts {
		c := g.cellIndex(p)
		g.idx[fill[c]] = int32(i)
		fill[c]++
	}
	return g
}

func (g *pointGrid) cellXY(p geom.Vec2) (int, int) {
	i := min(max(int((p.X-g.min.X)/g.cell), 0), g.nx-1)
	j := min(max(int((p.Y-g.min.Y)/g.cell), 0), g.ny-1)
	return i, j
}

func (g *pointGrid) cellIndex(p geom.Vec2) int {
	i, j := g.cellXY(p)
	return j*g.nx + i
}

// neighbour is a point index and its squared plan distance.
type neighbour struct {
	i  int
	d2 float64
}

// nearest returns up to k nearest points to p, closest first, leaving out
// every point whose index skip accepts. It scans rings of cells outwards
// and stops once no unscanned cell can hold a closer point: after ring r,
// every unscanned point is at least r·cell away.
func (g *pointGrid) nearest(p geom.Vec2, k int, skip func(i int, d2 float64) bool, out []neighbour) []neighbour {
	out = out[:0]
	if g.nx == 0 || k <= 0 {
		return out
	}
	ci, cj := g.cellXY(p)
	maxR := max(g.nx, g.ny)
	for r := 0; r <= maxR; r++ {
		for j := cj - r; j <= cj+r; j++ {
			if j < 0 || j >= g.ny {
				continue
			}
			step := 1
			if j != cj-r && j != cj+r {
				step = 2 * r // only the ring's left and right cells
			}
			for i := ci - r; i <= ci+r; i += max(step, 1) {
				if i < 0 || i >= g.nx {
					continue
				}
				c := j*g.nx + i
				for _, q := range g.idx[g.start[c]:g.start[c+1]] {
					d2 := p.DistanceSquared(g.pts[q])
					if skip != nil && skip(int(q), d2) {
						continue
					}
					out = insertNeighbour(out, neighbour{int(q), d2}, k)
				}
			}
		}
		if len(out) == k {
			lim := float64(r) * g.cell
			if out[k-1].d2 <= lim*lim {
				break
			}
		}
	}
	return out
}

// insertNeighbour keeps the k closest neighbours sorted by distance (ties
// by index, so that results do not depend on scan order).
func insertNeighbour(out []neighbour, nb neighbour, k int) []neighbour {
	less := func(a, b neighbour) bool { return a.d2 < b.d2 || a.d2 == b.d2 && a.i < b.i }
	if len(out) == k && !less(nb, out[k-1]) {
		return out
	}
	pos := len(out)
	for pos > 0 && less(nb, out[pos-1]) {
		pos--
	}
	if len(out) < k {
		out = append(out, neighbour{})
	}
	copy(out[pos+1:], out[pos:len(out)-1])
	out[pos] = nb
	return out
}
