package design

import (
	"math"
	"sync"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// Exact point queries of the bowl, E(p) = W + e(p), sped up by a grid of
// cells per zone floor. Each cell keeps the edges that can be nearest to a
// point in it and whether it lies wholly inside or outside the floor, so a
// query reads a cell and measures a few edges instead of every edge of
// every zone; the values are those of [zoneSet.rel], bit for bit.

// polyIndexCells is the number of grid cells per polygon edge aimed at
// (the grid stays within 4 to 64 cells a side).
const polyIndexCells = 8

// polyIndexPad is the margin, relative to the grid's extent (and to the
// bounds themselves), by which an edge counts as meeting a cell and by
// which the bounds that drop an edge from a cell are widened: 1e-9, far
// above the round-off of a crossing or a distance at local coordinates
// (about 1e-15 relative) and far below any cell.
const polyIndexPad = 1e-9

// Cell states of a polyIndex.
const (
	cellEdge    int8 = iota // an edge passes within the margin of the cell
	cellInside              // wholly inside the polygon
	cellOutside             // wholly outside the polygon
)

// polyIndex answers [polygon.dist] (or, when mitre is set,
// [polygon.mitreDist]) at points of a box around the polygon with the
// same results.
type polyIndex struct {
	q      *polygon
	mitre  bool
	x0, y0 float64 // the grid's lower left corner
	cs     float64 // cell side, m
	nx, ny int
	state  []int8
	// Cell c's candidate edges (or lines) are cand[cfrom[c]:cto[c]]; row j's
	// edges (those whose y-range meets the row) are redge[rstart[j]:
	// rstart[j+1]], for the crossing count in cells an edge meets.
	cfrom, cto, cand []int32
	rstart, redge    []int32
}

// newPolyIndex indexes q over its box grown by reach (m), for distances
// or, with mitre, for mitred distances.
func newPolyIndex(q *polygon, reach float64, mitre bool) *polyIndex {
	box := q.box.Expand(reach)
	w, h := box.Width(), box.Height()
	n := len(q.segs)
	cs := math.Sqrt(w * h / float64(polyIndexCells*n))
	cs = min(max(cs, max(w, h)/64), max(w, h)/4)
	ix := &polyIndex{q: q, mitre: mitre, x0: box.Min.X, y0: box.Min.Y, cs: cs,
		nx: max(1, int(math.Ceil(w/cs))), ny: max(1, int(math.Ceil(h/cs)))}
	pad := polyIndexPad * max(w, h, 1)
	// Rows: the edges whose y-range (padded) meets each row.
	rows := make([][]int32, ix.ny)
	for k := range q.segs {
		a, b := q.pts[k], q.pts[(k+1)%len(q.pts)]
		j0 := ix.row(min(a.Y, b.Y) - pad)
		j1 := ix.row(max(a.Y, b.Y) + pad)
		for j := j0; j <= j1; j++ {
			rows[j] = append(rows[j], int32(k))
		}
	}
	ix.rstart = make([]int32, ix.ny+1)
	for j, r := range rows {
		ix.redge = append(ix.redge, r...)
		ix.rstart[j+1] = int32(len(ix.redge))
	}
	// Cells: a quadtree over the grid narrows each cell's candidates from
	// its parent's. An edge is dropped when its distance to the box
	// exceeds the least, over the edges, of the largest distance from a
	// box corner (distance to a segment is convex, so no point of the box
	// is farther from that edge): it cannot be nearest anywhere in it.
	ix.state = make([]int8, ix.nx*ix.ny)
	ix.cfrom, ix.cto = make([]int32, ix.nx*ix.ny), make([]int32, ix.nx*ix.ny)
	b := &indexBuilder{ix: ix, pad: pad, lo: make([]float64, n)}
	all := b.push(n)
	var lines []int32
	if mitre {
		lines = b.push(n)
	}
	b.walk(0, ix.nx, 0, ix.ny, all, lines)
	return ix
}

// indexBuilder is the scratch of [newPolyIndex]'s quadtree.
type indexBuilder struct {
	ix    *polyIndex
	pad   float64
	lo    []float64
	arena []int32
}

// push appends 0, 1, …, n−1 to the arena and returns them.
func (b *indexBuilder) push(n int) []int32 {
	s := len(b.arena)
	for k := range n {
		b.arena = append(b.arena, int32(k))
	}
	return b.arena[s:len(b.arena):len(b.arena)]
}

// walk narrows the candidates over cells [ci0, ci1) × [cj0, cj1) and
// stores each cell's.
func (b *indexBuilder) walk(ci0, ci1, cj0, cj1 int, segs, lines []int32) {
	ix := b.ix
	q := ix.q
	mark := len(b.arena)
	defer func() { b.arena = b.arena[:mark] }()
	x0, y0 := ix.x0+float64(ci0)*ix.cs, ix.y0+float64(cj0)*ix.cs
	x1, y1 := ix.x0+float64(ci1)*ix.cs, ix.y0+float64(cj1)*ix.cs
	// Segments, by distance.
	ub := math.Inf(1)
	for m, k := range segs {
		s := &q.segs[k]
		b.lo[m] = s.boxDist2(x0, y0, x1, y1)
		ub = min(ub, s.maxCornerDist2(x0, y0, x1, y1))
	}
	keep := ub*(1+polyIndexPad) + b.pad*b.pad
	st := len(b.arena)
	touched := false
	for m, k := range segs {
		if b.lo[m] <= keep {
			b.arena = append(b.arena, k)
			touched = touched || b.lo[m] <= 4*b.pad*b.pad
		}
	}
	segs = b.arena[st:len(b.arena):len(b.arena)]
	// Edge lines, by mitred distance: a linear function's range over the
	// box is spanned by its corner values, so a line whose highest value
	// falls below another's lowest (or below 0) never gives the maximum.
	if ix.mitre {
		floor := 0.0
		for m, k := range lines {
			nx, ny, c := q.nx[k], q.ny[k], q.nc[k]
			floor = max(floor, min(nx*x0, nx*x1)+min(ny*y0, ny*y1)-c)
			b.lo[m] = max(nx*x0, nx*x1) + max(ny*y0, ny*y1) - c
		}
		keepM := floor - b.pad - polyIndexPad*floor
		st := len(b.arena)
		for m, k := range lines {
			if b.lo[m] >= keepM {
				b.arena = append(b.arena, k)
			}
		}
		lines = b.arena[st:len(b.arena):len(b.arena)]
	}
	if ci1-ci0 > 1 || cj1-cj0 > 1 {
		cim, cjm := (ci0+ci1+1)/2, (cj0+cj1+1)/2
		for _, c := range [4][4]int{{ci0, cim, cj0, cjm}, {cim, ci1, cj0, cjm}, {ci0, cim, cjm, cj1}, {cim, ci1, cjm, cj1}} {
			if c[0] < c[1] && c[2] < c[3] {
				b.walk(c[0], c[1], c[2], c[3], segs, lines)
			}
		}
		return
	}
	c := cj0*ix.nx + ci0
	cand := segs
	if ix.mitre {
		cand = lines
	}
	ix.cfrom[c] = int32(len(ix.cand))
	ix.cand = append(ix.cand, cand...)
	ix.cto[c] = int32(len(ix.cand))
	switch {
	case touched:
		ix.state[c] = cellEdge
	case ix.contains(geom.Vec2{X: (x0 + x1) / 2, Y: (y0 + y1) / 2}):
		// No edge comes within pad of the cell, so the crossing rule
		// gives every point of it the same answer.
		ix.state[c] = cellInside
	default:
		ix.state[c] = cellOutside
	}
}

// row returns the grid row of y, clamped to the grid.
func (ix *polyIndex) row(y float64) int {
	return min(max(int(math.Floor((y-ix.y0)/ix.cs)), 0), ix.ny-1)
}

// cell returns the index of the cell holding p, or −1 outside the grid.
func (ix *polyIndex) cell(p geom.Vec2) int {
	fx, fy := (p.X-ix.x0)/ix.cs, (p.Y-ix.y0)/ix.cs
	if !(fx >= 0 && fy >= 0 && fx < float64(ix.nx) && fy < float64(ix.ny)) {
		return -1
	}
	return int(fy)*ix.nx + int(fx)
}

// contains is [polygon.contains] counting crossings over the edges of
// p's row only (the others cannot cross the horizontal line through p).
func (ix *polyIndex) contains(p geom.Vec2) bool {
	q := ix.q
	n := len(q.pts)
	in := false
	j := ix.row(p.Y)
	for _, k := range ix.redge[ix.rstart[j]:ix.rstart[j+1]] {
		a, b := q.pts[k], q.pts[(int(k)+1)%n]
		if (a.Y > p.Y) != (b.Y > p.Y) {
			if x := crossX(a, b, p.Y); x <= p.X {
				in = !in
			}
		}
	}
	return in
}

// dist returns [polygon.dist] of p, except that with far set a point in
// a cell wholly outside gets +Inf (its distance is above zero, and a
// vertical wall needs no more).
func (ix *polyIndex) dist(p geom.Vec2, far bool) float64 {
	c := ix.cell(p)
	if c < 0 {
		return ix.q.dist(p)
	}
	switch ix.state[c] {
	case cellInside:
		return 0
	case cellOutside:
		if far {
			return math.Inf(1)
		}
	default:
		if ix.contains(p) {
			return 0
		}
	}
	return math.Sqrt(minDist2(ix.q.segs, ix.cand[ix.cfrom[c]:ix.cto[c]], p.X, p.Y))
}

// mitreDist returns [polygon.mitreDist] of p.
func (ix *polyIndex) mitreDist(p geom.Vec2) float64 {
	c := ix.cell(p)
	if c < 0 {
		return ix.q.mitreDist(p)
	}
	q := ix.q
	m := 0.0
	for _, k := range ix.cand[ix.cfrom[c]:ix.cto[c]] {
		m = max(m, q.nx[k]*p.X+q.ny[k]*p.Y-q.nc[k])
	}
	return m
}

// bowlIndex holds a polyIndex for each zone's floor.
type bowlIndex struct {
	zs    *zoneSet
	floor []*polyIndex
}

// lazyBowl builds the index on the first query; a Surface shares it.
type lazyBowl struct {
	once sync.Once
	idx  *bowlIndex
}

func (lb *lazyBowl) get(zs *zoneSet) *bowlIndex {
	lb.once.Do(func() { lb.idx = newBowlIndex(zs) })
	return lb.idx
}

func newBowlIndex(zs *zoneSet) *bowlIndex {
	bi := &bowlIndex{zs: zs, floor: make([]*polyIndex, len(zs.z))}
	for i := range zs.z {
		z := &zs.z[i]
		margin := (z.floor.box.Width() + z.floor.box.Height()) / 16
		switch z.kind {
		case kindRound:
			bi.floor[i] = newPolyIndex(z.floor, z.rimR+margin, false)
		case kindSharp:
			bi.floor[i] = newPolyIndex(z.floor, z.rimR*math.Sqrt2+margin, true)
		case kindVertical:
			bi.floor[i] = newPolyIndex(z.floor, margin, false)
		}
	}
	return bi
}

// rel returns e(p) = min_i e_i(p), the value [zoneSet.rel] gives. A zone
// is skipped when the distance from p to its floor's box already puts its
// bowl above the least found so far (by more than round-off).
func (bi *bowlIndex) rel(p geom.Vec2) float64 {
	zs := bi.zs
	e := math.Inf(1)
	for i := range zs.z {
		z := &zs.z[i]
		ix := bi.floor[i]
		switch z.kind {
		case kindSharp:
			e = min(e, -z.depth+ix.mitreDist(p)/z.slope)
		case kindVertical:
			if -z.depth >= e {
				continue
			}
			if ix.dist(p, true) == 0 {
				e = -z.depth
			}
		default:
			// Skip when even −d + |p − box|/s exceeds e: the zone's bowl
			// there is at least that (compared squared).
			if r := (e + z.depth + polyIndexPad*(1+math.Abs(e))) * z.slope; r < 0 {
				continue
			} else if !math.IsInf(r, 1) {
				b := z.floor.box
				dx, dy := max(b.Min.X-p.X, 0, p.X-b.Max.X), max(b.Min.Y-p.Y, 0, p.Y-b.Max.Y)
				if dx*dx+dy*dy > r*r {
					continue
				}
			}
			e = min(e, -z.depth+ix.dist(p, false)/z.slope)
		}
	}
	return e
}
