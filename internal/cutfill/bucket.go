package cutfill

import (
	"math"
	"slices"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// bucketGrid is a uniform grid of square cells over a set of boxes; each cell
// lists, in increasing order, the items whose box touches it. The lists are
// stored flat (start[k]..start[k+1] in items for cell k). It is built once
// and then only read, so any number of goroutines may query it, each with
// its own [bucketQuery].
type bucketGrid struct {
	min    geom.Vec2
	inv    float64 // cells per metre
	nx, ny int
	start  []int
	items  []int32
	nitems int
}

// Grid sizing. The cell side starts at sqrt(area/n), about one item per
// cell, so that an item of typical size touches about four cells. If long
// thin items make the lists too long (more than maxEntriesPerItem entries per
// item on average), the cell side is doubled until they are not.
const (
	maxEntriesPerItem = 16
	maxGridTries      = 40
)

// newBucketGrid indexes boxes (item i has box boxes[i]); empty boxes are
// left out.
func newBucketGrid(boxes []geom.Box) bucketGrid {
	g := bucketGrid{nitems: len(boxes)}
	all := geom.EmptyBox()
	n := 0
	for _, b := range boxes {
		if !b.IsEmpty() {
			all = all.Union(b)
			n++
		}
	}
	if n == 0 {
		return g
	}
	w, h := all.Width(), all.Height()
	side := math.Sqrt(w * h / float64(n))
	if !(side > 0) {
		side = math.Max(w, h) / float64(n)
	}
	if !(side > 0) {
		side = 1
	}
	limit := maxEntriesPerItem*n + 1024
	for try := 0; ; try++ {
		g.min = all.Min
		g.inv = 1 / side
		g.nx = int(math.Min(math.Floor(w*g.inv), float64(4*n))) + 1
		g.ny = int(math.Min(math.Floor(h*g.inv), float64(4*n))) + 1
		total := 0
		for _, b := range boxes {
			if b.IsEmpty() {
				continue
			}
			x0, y0, x1, y1 := g.span(b)
			total += (x1 - x0 + 1) * (y1 - y0 + 1)
		}
		if total <= limit || try == maxGridTries {
			break
		}
		side *= 2
	}
	cells := g.nx * g.ny
	g.start = make([]int, cells+1)
	for _, b := range boxes {
		if b.IsEmpty() {
			continue
		}
		x0, y0, x1, y1 := g.span(b)
		for y := y0; y <= y1; y++ {
			for x := x0; x <= x1; x++ {
				g.start[y*g.nx+x+1]++
			}
		}
	}
	for k := 0; k < cells; k++ {
		g.start[k+1] += g.start[k]
	}
	g.items = make([]int32, g.start[cells])
	fill := slices.Clone(g.start[:cells])
	for i, b := range boxes { // increasing i, so every list is sorted
		if b.IsEmpty() {
			continue
		}
		x0, y0, x1, y1 := g.span(b)
		for y := y0; y <= y1; y++ {
			for x := x0; x <= x1; x++ {
				k := y*g.nx + x
				g.items[fill[k]] = int32(i)
				fill[k]++
			}
		}
	}
	return g
}

// span returns the cell range covering b, clamped to the grid.
func (g *bucketGrid) span(b geom.Box) (x0, y0, x1, y1 int) {
	return g.index(b.Min.X-g.min.X, g.nx), g.index(b.Min.Y-g.min.Y, g.ny),
		g.index(b.Max.X-g.min.X, g.nx), g.index(b.Max.Y-g.min.Y, g.ny)
}

func (g *bucketGrid) index(d float64, n int) int {
	f := math.Floor(d * g.inv)
	switch {
	case !(f > 0): // also NaN
		return 0
	case f >= float64(n-1):
		return n - 1
	}
	return int(f)
}

// bucketQuery holds one goroutine's scratch space for querying a grid.
type bucketQuery struct {
	seen  []uint32
	stamp uint32
	out   []int32
}

func newBucketQuery(g *bucketGrid) *bucketQuery {
	return &bucketQuery{seen: make([]uint32, g.nitems)}
}

// find returns, in increasing order, the items listed in any cell that b
// touches (a superset of the items whose box meets b). The slice is reused
// by the next call.
func (q *bucketQuery) find(g *bucketGrid, b geom.Box) []int32 {
	q.out = q.out[:0]
	if g.nx == 0 || b.IsEmpty() {
		return q.out
	}
	q.stamp++
	if q.stamp == 0 { // wrapped: clear the marks
		clear(q.seen)
		q.stamp = 1
	}
	x0, y0, x1, y1 := g.span(b)
	for y := y0; y <= y1; y++ {
		for x := x0; x <= x1; x++ {
			k := y*g.nx + x
			for _, it := range g.items[g.start[k]:g.start[k+1]] {
				if q.seen[it] != q.stamp {
					q.seen[it] = q.stamp
					q.out = append(q.out, it)
				}
			}
		}
	}
	if x0 != x1 || y0 != y1 {
		slices.Sort(q.out)
	}
	return q.out
}
