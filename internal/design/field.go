package design

import (
	"cmp"
	"math"
	"runtime"
	"slices"
	"sync"
	"sync/atomic"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/grid"
)

// rowIndex holds, for every lattice row, the sorted x where a polygon's
// edges cross the row's line. A node is inside the polygon when an odd
// number of crossings lie at or left of it (the rule of [polygon.contains]).
type rowIndex struct {
	start []int32 // row j's crossings are xs[start[j]:start[j+1]]
	xs    []float64
}

func newRowIndex(l grid.Lattice, q *polygon) rowIndex {
	type cross struct {
		j int32
		x float64
	}
	var cs []cross
	n := len(q.pts)
	for k := range q.pts {
		a, b := q.pts[k], q.pts[(k+1)%n]
		if a.Y == b.Y {
			continue
		}
		lo, hi := min(a.Y, b.Y), max(a.Y, b.Y)
		j0 := max(0, int(math.Floor((lo-l.Y0)/l.H))-1)
		j1 := min(l.NY-1, int(math.Ceil((hi-l.Y0)/l.H))+1)
		for j := j0; j <= j1; j++ {
			y := l.Y0 + float64(j)*l.H
			if (a.Y > y) != (b.Y > y) {
				cs = append(cs, cross{int32(j), crossX(a, b, y)})
			}
		}
	}
	slices.SortFunc(cs, func(p, q cross) int {
		if c := cmp.Compare(p.j, q.j); c != 0 {
			return c
		}
		return cmp.Compare(p.x, q.x)
	})
	r := rowIndex{start: make([]int32, l.NY+1), xs: make([]float64, len(cs))}
	for i, c := range cs {
		r.xs[i] = c.x
		r.start[c.j+1]++
	}
	for j := 0; j < l.NY; j++ {
		r.start[j+1] += r.start[j]
	}
	return r
}

// row returns the crossings of row j.
func (r *rowIndex) row(j int) []float64 { return r.xs[r.start[j]:r.start[j+1]] }

// inside reports whether x on row j is inside.
func (r *rowIndex) inside(j int, x float64) bool {
	xs := r.row(j)
	n, _ := slices.BinarySearchFunc(xs, x, func(c, x float64) int {
		if c <= x {
			return -1
		}
		return 1
	})
	return n%2 == 1
}

// field is the water-level-independent part of a design on one lattice:
// the relative bowl e = E − W, the distance ρ to the rim set, which zone
// gives e, and the cells where a vertical wall needs exact treatment.
type field struct {
	zs  *zoneSet
	lat grid.Lattice
	e   []float64 // E − W at the nodes; +Inf where only vertical zones reach and none holds the node
	rho []float64 // distance to the rim set {e ≤ freeboard}, m
	// own is the zone giving e at each node, or −(k+2) where e is +Inf and
	// k is the zone with the nearest rim.
	own    []int32
	splits []split // cells crossed by exactly one vertical zone's outline, by cell index
	multi  int     // cells crossed by two or more vertical zones' outlines (interpolated)
	// crossed lists, for each zone, the cells its outline passes through.
	crossed [][]int32

	floorRows []rowIndex // per zone
	rimRows   []rowIndex // per sharp zone (empty otherwise)

	// band, when above 0, makes a rim-line field (see newRimField): only
	// tiles where e may come within band of the freeboard are evaluated,
	// for e and own alone; the other nodes keep e = NaN.
	band float64

	// coarse, when set, supplies the nodes shared with a lattice of twice
	// the cell (see newFieldFrom): lattice node (i, j) is the global node
	// (gi0 + i, gj0 + j) in units of the cell, and coarse node (ic, jc) the
	// global node (ci0 + ic, cj0 + jc) in units of its cell.
	coarse             *field
	gi0, gj0, ci0, cj0 int

	// drop is the berm's drop below the rim at each node for dropBerm
	// (see grade), nil until first needed.
	drop     []float64
	dropBerm berm
}

// leafSize is the largest tile side, in nodes, whose nodes are evaluated
// directly; bigger tiles are split in four after pruning.
const leafSize = 8

// rootSize is the side, in nodes, of the tiles handed to workers.
const rootSize = 256

// newField computes the field of zs on l.
func newField(zs *zoneSet, l grid.Lattice) *field { return newFieldFrom(zs, l, nil) }

// newFieldFrom is [newField] taking the nodes it shares with coarse, a
// full field of zs on a lattice of twice the cell, from coarse. When the
// cell is a power of two of metres (as the automatic choice makes it),
// lattice nodes are whole multiples of it, exact in floating point, so a
// shared node has the very same coordinates in both lattices and its
// values, computed exactly from them, are the same: a quarter of the
// nodes come for free. Other cells take nothing from coarse.
func newFieldFrom(zs *zoneSet, l grid.Lattice, coarse *field) *field {
	fd := &field{zs: zs, lat: l}
	if frac, _ := math.Frexp(l.H); frac == 0.5 && coarse != nil && coarse.rho != nil && coarse.zs == zs && coarse.lat.H == 2*l.H {
		fd.coarse = coarse
		fd.gi0, fd.gj0 = int(math.Round(l.X0/l.H)), int(math.Round(l.Y0/l.H))
		fd.ci0, fd.cj0 = int(math.Round(coarse.lat.X0/coarse.lat.H)), int(math.Round(coarse.lat.Y0/coarse.lat.H))
	}
	n := l.Len()
	fd.e = make([]float64, n)
	fd.rho = make([]float64, n)
	fd.own = make([]int32, n)
	fd.floorRows = make([]rowIndex, len(zs.z))
	fd.rimRows = make([]rowIndex, len(zs.z))
	for i := range zs.z {
		z := &zs.z[i]
		fd.floorRows[i] = newRowIndex(l, z.floor)
		if z.kind == kindSharp {
			fd.rimRows[i] = newRowIndex(l, z.rim)
		}
	}
	fd.fill()
	fd.findCrossings()
	return fd
}

// newRimField returns the field of zs on l near the rim line {e =
// freeboard}: e and own are computed exactly, as by [newField], at every
// node of the tiles whose bounds let e come within two cells' rise of the
// freeboard (2h over the steepest sloped wall); every other node has e =
// NaN, and ρ is not computed. A lattice edge the rim line crosses between
// nodes owned by sloped zones has both ends in such tiles, because e rises
// by at most h/s over a cell there. Only the rim line's length is paid
// for, not the lattice's area. zs must have a sloped zone.
func newRimField(zs *zoneSet, l grid.Lattice) *field {
	s := math.Inf(1)
	for i := range zs.z {
		if zs.z[i].kind != kindVertical {
			s = min(s, zs.z[i].slope)
		}
	}
	fd := &field{zs: zs, lat: l, band: 2 * l.H / s}
	n := l.Len()
	fd.e = make([]float64, n)
	for k := range fd.e {
		fd.e[k] = math.NaN()
	}
	fd.own = make([]int32, n)
	fd.floorRows = make([]rowIndex, len(zs.z))
	fd.rimRows = make([]rowIndex, len(zs.z))
	for i := range zs.z {
		z := &zs.z[i]
		fd.floorRows[i] = newRowIndex(l, z.floor)
		if z.kind == kindSharp {
			fd.rimRows[i] = newRowIndex(l, z.rim)
		}
	}
	fd.fill()
	return fd
}

// zc is one zone's state while descending the tile tree: candidate
// segments (or edge lines, for a sharp floor) and whether the tile lies
// wholly inside (1) or outside (2) the floor (or, for sharp zones, the
// rim) polygon, or straddles it (0).
type zc struct {
	zone         int32
	fc, rc       []int32 // floor and rim candidates
	fin, rin     int8
	needE, needR bool
}

type tileWorker struct {
	fd    *field
	arena []int32
	tmp   []float64
	zcs   [][]zc // per depth
	ptr   []int
	par   []bool
	rows  [][]float64
}

// fill computes e, ρ and own at every node. The lattice is cut into root
// tiles shared among workers; each tile descends a quadtree in which a
// zone, and each of its edges, is dropped once bounds over the tile show
// it cannot give the minimum anywhere in it. The bounds: the distance from
// a box to a segment is at least their separation and at most the largest
// distance from a box corner (distance to a segment is convex); a line's
// signed distance over a box lies between its corner values.
func (fd *field) fill() {
	l := fd.lat
	nti, ntj := (l.NX+rootSize-1)/rootSize, (l.NY+rootSize-1)/rootSize
	var next atomic.Int64
	workers := min(runtime.GOMAXPROCS(0), nti*ntj)
	var wg sync.WaitGroup
	for range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			w := &tileWorker{fd: fd}
			root := make([]zc, len(fd.zs.z))
			for {
				t := int(next.Add(1) - 1)
				if t >= nti*ntj {
					return
				}
				ti, tj := t%nti, t/nti
				w.arena = w.arena[:0]
				for i := range fd.zs.z {
					z := &fd.zs.z[i]
					root[i] = zc{zone: int32(i), fc: w.all(len(z.floor.segs))}
					if z.kind == kindSharp {
						root[i].rc = w.all(len(z.rim.segs))
					}
				}
				i0, j0 := ti*rootSize, tj*rootSize
				w.tile(i0, min(i0+rootSize, l.NX), j0, min(j0+rootSize, l.NY), root, 0)
			}
		}()
	}
	wg.Wait()
}

func (w *tileWorker) all(n int) []int32 {
	s := len(w.arena)
	for k := range n {
		w.arena = append(w.arena, int32(k))
	}
	return w.arena[s:len(w.arena):len(w.arena)]
}

// eucBounds narrows the candidate segments of a Euclidean distance over
// the box and returns bounds of the distance to the polygon boundary.
//
// An edge whose bounding box is already farther from the box than the
// best upper bound so far can neither lower that bound (its largest
// corner distance is at least as far) nor be kept nor give the least
// lower bound (which never exceeds the upper one), so its exact
// distances are skipped: the same results for much less work far from
// the polygon.
func (w *tileWorker) eucBounds(q *polygon, cand []int32, x0, y0, x1, y1 float64) (out []int32, lb2, ub2 float64) {
	lb2, ub2 = math.Inf(1), math.Inf(1)
	w.tmp = w.tmp[:0]
	for _, k := range cand {
		s := &q.segs[k]
		bb := s.bboxDist2(x0, y0, x1, y1)
		w.tmp = append(w.tmp, bb)
		if bb <= ub2 {
			ub2 = min(ub2, s.maxCornerDist2(x0, y0, x1, y1))
		}
	}
	st := len(w.arena)
	for m, k := range cand {
		if w.tmp[m] > ub2 {
			continue
		}
		lo := q.segs[k].boxDist2(x0, y0, x1, y1)
		lb2 = min(lb2, lo)
		if lo <= ub2 {
			w.arena = append(w.arena, k)
		}
	}
	return w.arena[st:len(w.arena):len(w.arena)], lb2, ub2
}

// mitreBounds narrows the candidate edge lines of a mitred distance over
// the box and returns bounds of max_k of the lines' signed distances.
func (w *tileWorker) mitreBounds(q *polygon, cand []int32, x0, y0, x1, y1 float64) (out []int32, lo, hi float64) {
	lo, hi = math.Inf(-1), math.Inf(-1)
	w.tmp = w.tmp[:0]
	for _, k := range cand {
		nx, ny, c := q.nx[k], q.ny[k], q.nc[k]
		a := min(nx*x0, nx*x1) + min(ny*y0, ny*y1) - c
		b := max(nx*x0, nx*x1) + max(ny*y0, ny*y1) - c
		w.tmp = append(w.tmp, b)
		lo, hi = max(lo, a), max(hi, b)
	}
	st := len(w.arena)
	for m, k := range cand {
		if w.tmp[m] >= lo {
			w.arena = append(w.arena, k)
		}
	}
	return w.arena[st:len(w.arena):len(w.arena)], lo, hi
}

func (w *tileWorker) tile(i0, i1, j0, j1 int, parent []zc, depth int) {
	fd := w.fd
	l := fd.lat
	x0, x1 := l.X0+float64(i0)*l.H, l.X0+float64(i1-1)*l.H
	y0, y1 := l.Y0+float64(j0)*l.H, l.Y0+float64(j1-1)*l.H
	for len(w.zcs) <= depth {
		w.zcs = append(w.zcs, nil)
	}
	cur := w.zcs[depth][:0]
	inf := math.Inf(1)
	type bnd struct{ elo, ehi, rlo, rhi float64 }
	var bs [64]bnd
	bounds := bs[:0]
	eUB, rUB := inf, inf
	for _, p := range parent {
		z := &fd.zs.z[p.zone]
		c := zc{zone: p.zone, fin: p.fin, rin: p.rin}
		var b bnd
		switch z.kind {
		case kindSharp:
			var lo, hi float64
			c.fc, lo, hi = w.mitreBounds(z.floor, p.fc, x0, y0, x1, y1)
			b.elo, b.ehi = -z.depth+max(0, lo)/z.slope, -z.depth+max(0, hi)/z.slope
			if c.rin == 1 {
				b.rlo, b.rhi = 0, 0
			} else {
				var lb2, ub2 float64
				c.rc, lb2, ub2 = w.eucBounds(z.rim, p.rc, x0, y0, x1, y1)
				if c.rin == 0 && lb2 > 0 {
					c.rin = 2
					if fd.rimRows[p.zone].inside(j0, x0) {
						c.rin = 1
					}
				}
				switch c.rin {
				case 1:
					b.rlo, b.rhi = 0, 0
				case 2:
					b.rlo, b.rhi = math.Sqrt(lb2), math.Sqrt(ub2)
				default:
					b.rlo, b.rhi = 0, math.Sqrt(ub2)
				}
			}
		default:
			dlo, dhi := 0.0, 0.0
			if c.fin != 1 {
				var lb2, ub2 float64
				c.fc, lb2, ub2 = w.eucBounds(z.floor, p.fc, x0, y0, x1, y1)
				if c.fin == 0 && lb2 > 0 {
					c.fin = 2
					if fd.floorRows[p.zone].inside(j0, x0) {
						c.fin = 1
					}
				}
				switch c.fin {
				case 2:
					dlo, dhi = math.Sqrt(lb2), math.Sqrt(ub2)
				case 0:
					dhi = math.Sqrt(ub2)
				}
			}
			if z.kind == kindVertical {
				switch c.fin {
				case 1:
					b = bnd{-z.depth, -z.depth, 0, 0}
				case 2:
					b = bnd{inf, inf, dlo, dhi}
				default:
					b = bnd{-z.depth, inf, 0, dhi}
				}
			} else {
				b = bnd{-z.depth + dlo/z.slope, -z.depth + dhi/z.slope, max(0, dlo-z.rimR), max(0, dhi-z.rimR)}
			}
		}
		eUB, rUB = min(eUB, b.ehi), min(rUB, b.rhi)
		cur = append(cur, c)
		bounds = append(bounds, b)
	}
	if fd.band > 0 {
		// e over the tile lies between the least lower bound and eUB.
		eLB := inf
		for _, b := range bounds {
			eLB = min(eLB, b.elo)
		}
		if f := fd.zs.freeboard; eLB > f+fd.band || eUB < f-fd.band {
			return
		}
	}
	// Keep a zone where it can give the least e or the least ρ.
	kept := cur[:0]
	for m := range cur {
		c := cur[m]
		b := bounds[m]
		c.needE = b.elo <= eUB && b.elo < inf
		c.needR = b.rlo <= rUB && fd.band == 0
		if c.needE || c.needR {
			kept = append(kept, c)
		}
	}
	w.zcs[depth] = kept
	if i1-i0 <= leafSize && j1-j0 <= leafSize {
		w.leaf(i0, i1, j0, j1, kept)
		return
	}
	im, jm := (i0+i1)/2, (j0+j1)/2
	if i1-i0 <= leafSize {
		im = i1
	}
	if j1-j0 <= leafSize {
		jm = j1
	}
	for _, q := range [4][4]int{{i0, im, j0, jm}, {im, i1, j0, jm}, {i0, im, jm, j1}, {im, i1, jm, j1}} {
		if q[0] < q[1] && q[2] < q[3] {
			w.tile(q[0], q[1], q[2], q[3], w.zcs[depth], depth+1)
		}
	}
}

// leaf evaluates every node of a small tile against the kept zones.
func (w *tileWorker) leaf(i0, i1, j0, j1 int, zs []zc) {
	fd := w.fd
	l := fd.lat
	inf := math.Inf(1)
	if cap(w.ptr) < len(zs) {
		w.ptr, w.par, w.rows = make([]int, len(zs)), make([]bool, len(zs)), make([][]float64, len(zs))
	}
	ptr, par, rows := w.ptr[:len(zs)], w.par[:len(zs)], w.rows[:len(zs)]
	for j := j0; j < j1; j++ {
		y := l.Y0 + float64(j)*l.H
		xs0 := l.X0 + float64(i0)*l.H
		for m := range zs {
			c := &zs[m]
			rows[m] = nil
			var ri *rowIndex
			z := &fd.zs.z[c.zone]
			if z.kind == kindSharp && c.rin == 0 && c.needR {
				ri = &fd.rimRows[c.zone]
			} else if z.kind != kindSharp && c.fin == 0 {
				ri = &fd.floorRows[c.zone]
			}
			if ri != nil {
				xs := ri.row(j)
				k := 0
				for k < len(xs) && xs[k] < xs0 {
					k++
				}
				rows[m], ptr[m], par[m] = xs, k, k%2 == 1
			}
		}
		// Shared nodes of this row: every other one, from the coarse field.
		cl, crow := -1, 0
		if fd.coarse != nil {
			if gj := fd.gj0 + j; gj&1 == 0 {
				if jc := gj/2 - fd.cj0; jc >= 0 && jc < fd.coarse.lat.NY {
					crow = jc * fd.coarse.lat.NX
					cl = fd.coarse.lat.NX
				}
			}
		}
		for i := i0; i < i1; i++ {
			if cl > 0 {
				if gi := fd.gi0 + i; gi&1 == 0 {
					if ic := gi/2 - fd.ci0; ic >= 0 && ic < cl {
						k, kc := l.Index(i, j), crow+ic
						fd.e[k], fd.rho[k], fd.own[k] = fd.coarse.e[kc], fd.coarse.rho[kc], fd.coarse.own[kc]
						continue
					}
				}
			}
			x := l.X0 + float64(i)*l.H
			e, own, rho, rown := inf, int32(-1), inf, int32(-1)
			for m := range zs {
				c := &zs[m]
				if xs := rows[m]; xs != nil {
					for ptr[m] < len(xs) && xs[ptr[m]] <= x {
						par[m] = !par[m]
						ptr[m]++
					}
				}
				z := &fd.zs.z[c.zone]
				var ez, rz float64
				switch z.kind {
				case kindSharp:
					ez = inf
					if c.needE {
						mm := 0.0
						for _, k := range c.fc {
							if v := z.floor.nx[k]*x + z.floor.ny[k]*y - z.floor.nc[k]; v > mm {
								mm = v
							}
						}
						ez = -z.depth + mm/z.slope
					}
					rz = inf
					if c.needR {
						if c.rin == 1 || (c.rin == 0 && par[m]) {
							rz = 0
						} else {
							rz = math.Sqrt(minDist2(z.rim.segs, c.rc, x, y))
						}
					}
				case kindVertical:
					if c.fin == 1 || (c.fin == 0 && par[m]) {
						ez, rz = -z.depth, 0
					} else {
						d2 := minDist2(z.floor.segs, c.fc, x, y)
						if d2 == 0 {
							ez, rz = -z.depth, 0
						} else {
							ez, rz = inf, math.Sqrt(d2)
						}
					}
				default:
					d := 0.0
					if !(c.fin == 1 || (c.fin == 0 && par[m])) {
						d = math.Sqrt(minDist2(z.floor.segs, c.fc, x, y))
					}
					ez, rz = -z.depth+d/z.slope, 0
					if d > z.rimR {
						rz = d - z.rimR
					}
				}
				if c.needE && ez < e {
					e, own = ez, c.zone
				}
				if c.needR && rz < rho {
					rho, rown = rz, c.zone
				}
			}
			k := l.Index(i, j)
			fd.e[k] = e
			if fd.rho != nil {
				fd.rho[k] = rho
			}
			if own < 0 {
				own = -(rown + 2)
			}
			fd.own[k] = own
		}
	}
}

// minDist2 returns the least squared distance from (x, y) to the
// candidate segments (+Inf for none). Plain comparisons: the builtin min
// pays for NaN handling that distances never need.
func minDist2(segs []segment, cand []int32, x, y float64) float64 {
	best := math.Inf(1)
	for _, k := range cand {
		if d := segs[k].dist2(x, y); d < best {
			best = d
		}
	}
	return best
}

// volOwner returns the zone that node k's earthwork is booked to: the zone
// giving e, or where only vertical walls reach, the one with the nearest
// rim.
func (fd *field) volOwner(k int) int32 {
	o := fd.own[k]
	if o < 0 {
		o = -o - 2
	}
	return o
}

// cellPad widens, in cell units, the band in which a segment is taken to
// meet a cell, so that round-off never drops a cell the segment touches.
// An extra cell costs only time: its clipped part is empty or whole.
const cellPad = 1e-9

// cellsOnSegment calls fn with the index (ci + cj·NX) of every cell whose
// closed square meets the segment ab, and possibly a neighbour more.
func cellsOnSegment(l grid.Lattice, a, b geom.Vec2, fn func(cell int)) {
	ua, va := (a.X-l.X0)/l.H, (a.Y-l.Y0)/l.H
	ub, vb := (b.X-l.X0)/l.H, (b.Y-l.Y0)/l.H
	du, dv := ub-ua, vb-va
	cj0 := max(0, int(math.Floor(min(va, vb)-cellPad)))
	cj1 := min(l.NY-2, int(math.Floor(max(va, vb)+cellPad)))
	for cj := cj0; cj <= cj1; cj++ {
		lo, hi := float64(cj)-cellPad, float64(cj+1)+cellPad
		t0, t1 := 0.0, 1.0
		if dv != 0 {
			s0, s1 := (lo-va)/dv, (hi-va)/dv
			if s0 > s1 {
				s0, s1 = s1, s0
			}
			t0, t1 = max(t0, s0), min(t1, s1)
			if t0 > t1 {
				continue
			}
		}
		u0, u1 := ua+t0*du, ua+t1*du
		if u0 > u1 {
			u0, u1 = u1, u0
		}
		ci0 := max(0, int(math.Floor(u0-cellPad)))
		ci1 := min(l.NX-2, int(math.Floor(u1+cellPad)))
		for ci := ci0; ci <= ci1; ci++ {
			fn(ci + cj*l.NX)
		}
	}
}

// findCrossings lists the cells each zone outline crosses and prepares the
// cells where exactly one vertical wall passes.
func (fd *field) findCrossings() {
	l := fd.lat
	fd.crossed = make([][]int32, len(fd.zs.z))
	type pair struct{ cell, zone int32 }
	var vert []pair
	for i := range fd.zs.z {
		z := &fd.zs.z[i]
		var cells []int32
		n := len(z.floor.pts)
		for k := range z.floor.pts {
			cellsOnSegment(l, z.floor.pts[k], z.floor.pts[(k+1)%n], func(c int) { cells = append(cells, int32(c)) })
		}
		slices.Sort(cells)
		cells = slices.Compact(cells)
		fd.crossed[i] = cells
		if z.kind == kindVertical {
			for _, c := range cells {
				vert = append(vert, pair{c, int32(i)})
			}
		}
	}
	slices.SortFunc(vert, func(p, q pair) int { return cmp.Compare(p.cell, q.cell) })
	for s := 0; s < len(vert); {
		t := s + 1
		for t < len(vert) && vert[t].cell == vert[s].cell {
			t++
		}
		if t-s == 1 {
			fd.splits = append(fd.splits, fd.newSplit(int(vert[s].cell), int(vert[s].zone)))
		} else {
			fd.multi++
		}
		s = t
	}
}
