package design

import (
	"cmp"
	"math"
	"slices"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/grid"
	"github.com/dugout-estimating/dugout/internal/robust"
)

// Inward offsets (erosions) of a simple polygon, found on a raster and
// rebuilt exactly.
//
// The erosion of O by δ is {p ∈ O : dist(p, ∂O) ≥ δ}. Its boundary is made
// of the edges' lines moved inward by δ and of arcs of radius δ around the
// reflex vertices of O. The method:
//
//  1. Sample φ = sd − δ on a raster of erodeCells cells across O's box,
//     where sd is the exact signed distance to ∂O (positive inside). Only
//     the small tiles of the raster that can hold nodes within two cells
//     of the level set get their distances computed and stored (sd is
//     1-Lipschitz, so nodes farther off cannot border a crossing); the
//     rest keep only their sign, so the work goes with the outline's
//     length in cells, not with the raster's area.
//  2. Trace φ = 0 by marching squares over the stored tiles (saddles
//     decided by the exact φ at the cell centre) into closed loops,
//     counter-clockwise, in a fixed order.
//  3. Give each loop vertex the feature of ∂O nearest to it (an edge, or a
//     vertex when the nearest point is one), and move it onto that
//     feature's offset curve: it is then exactly on the erosion boundary.
//  4. Rebuild each loop from its runs of equal feature: a run on an edge is
//     one straight segment; a run on a vertex is an arc, drawn with chords
//     of at most arcStep; consecutive runs meet at the exact intersection
//     of their two curves (line–line, line–circle or circle–circle).
//
// The result is exact except for the arcs, whose chords fall inside the
// true boundary by at most δ·(1 − cos(arcStep/2)) < 0.001·δ. Where a
// rebuilt loop is not a simple polygon, or its area differs from the
// traced loop's by more than two raster cells along its length, the
// projected loop vertices of step 3 are used instead: every vertex still
// lies on the boundary, and corners are cut by at most one raster cell.
// Parts narrower than a raster cell can be missed, and loops under four
// cells across are dropped.

// erodeCells is the raster resolution of [erode], in cells across the
// larger side of the polygon's box.
const erodeCells = 1024

// arcStep is the largest angle subtended by one chord of an offset arc,
// 5° (π/36 rad).
const arcStep = math.Pi / 36

// erode returns the erosion of the counter-clockwise simple ring r by
// delta ≥ 0 (m) as zero or more counter-clockwise rings.
func erode(r geom.Ring, delta float64) []geom.Ring {
	if delta <= 0 {
		return []geom.Ring{r}
	}
	q := newPolygon(r)
	bb := q.box
	hr := max(bb.Width(), bb.Height()) / erodeCells
	lat, err := grid.NewLattice(bb.Expand(2*hr), hr)
	if err != nil {
		return nil // cannot happen: about erodeCells² nodes
	}
	phi := erosionField(q, lat, delta)
	loops := marchLoops(phi, func(p geom.Vec2) float64 { return signedDist(q, p) - delta })
	var out []geom.Ring
	for _, loop := range loops {
		if rr := rebuildLoop(q, loop, delta, hr); rr != nil {
			out = append(out, rr)
		}
	}
	return out
}

// signedDist returns the distance from p to ∂q, positive inside.
func signedDist(q *polygon, p geom.Vec2) float64 {
	d := q.boundaryDist(p)
	if q.contains(p) {
		return d
	}
	return -d
}

// bandTile is the side, in nodes, of the tiles of a [bandField]: small,
// because the band it stores is only four cells wide.
const bandTile = 8

// bandField is φ = sd − δ on a lattice, stored by tiles of bandTile ×
// bandTile nodes: a tile whose bounds put every node farther than two
// cells from the level set holds no values, only the sign of φ there (the
// node value is then ±far); the others, the band around the level set,
// hold every node's exact value. Memory and time go with the length of
// the level set, not with the lattice's area.
type bandField struct {
	lat      grid.Lattice
	tnx, tny int       // tiles across and up
	sign     []int8    // per tile: +1 far inside, −1 far outside, 0 stored
	slot     []int32   // per tile: its block in vals when stored
	vals     []float64 // bandTile² values per stored tile, row by row
	far      float64   // |φ| given to the nodes of an unstored tile
}

// at returns φ at node (i, j).
func (f *bandField) at(i, j int) float64 {
	t := (j/bandTile)*f.tnx + i/bandTile
	if s := f.sign[t]; s != 0 {
		return float64(s) * f.far
	}
	return f.vals[int(f.slot[t])*bandTile*bandTile+(j%bandTile)*bandTile+i%bandTile]
}

// stored reports whether node (i, j) lies in a tile with stored values.
func (f *bandField) stored(i, j int) bool {
	return f.sign[(j/bandTile)*f.tnx+i/bandTile] == 0
}

// erosionField samples φ = sd − δ. A quadtree of tiles narrows the edges
// that can be nearest (as [field.fill] does) and stops at tiles that
// cannot border the level set: sd is 1-Lipschitz, so where its bounds
// over a tile keep it more than two cells from δ no cell of the tile
// meets φ = 0. Each stored node gets the exact value: the least distance
// to the candidate edges, signed by the crossing rule of
// [polygon.contains], the value signedDist gives.
func erosionField(q *polygon, l grid.Lattice, delta float64) *bandField {
	tnx, tny := (l.NX+bandTile-1)/bandTile, (l.NY+bandTile-1)/bandTile
	f := &bandField{lat: l, tnx: tnx, tny: tny, sign: make([]int8, tnx*tny), slot: make([]int32, tnx*tny), far: 4 * l.H}
	// The band runs along the offset curve, no longer than the outline:
	// about three tiles across it per tile of its length.
	est := 3*int(q.pts.Perimeter()/(bandTile*l.H)) + 16
	f.vals = make([]float64, 0, min(est, tnx*tny)*bandTile*bandTile)
	rows := newRowIndex(l, q)
	w := &tileWorker{}
	var walk func(ti0, ti1, tj0, tj1 int, cand []int32)
	walk = func(ti0, ti1, tj0, tj1 int, cand []int32) {
		i0, j0 := ti0*bandTile, tj0*bandTile
		i1, j1 := min(ti1*bandTile, l.NX), min(tj1*bandTile, l.NY)
		x0, y0 := l.X0+float64(i0)*l.H, l.Y0+float64(j0)*l.H
		x1, y1 := l.X0+float64(i1-1)*l.H, l.Y0+float64(j1-1)*l.H
		mark := len(w.arena)
		defer func() { w.arena = w.arena[:mark] }()
		cand, lb2, ub2 := w.eucBounds(q, cand, x0, y0, x1, y1)
		lb, ub := math.Sqrt(lb2), math.Sqrt(ub2)
		// Bounds of sd over the tile, and its sign where uniform.
		uniform := 0.0 // +1 inside, −1 outside, 0 unknown
		sdlo, sdhi := -ub, ub
		if lb > 0 {
			uniform = -1
			sdlo, sdhi = -ub, -lb
			if rows.inside(j0, x0) {
				uniform = 1
				sdlo, sdhi = lb, ub
			}
		}
		var s int8
		switch {
		case sdlo-delta > 2*l.H:
			s = 1
		case sdhi-delta < -2*l.H:
			s = -1
		}
		if s != 0 {
			for tj := tj0; tj < tj1; tj++ {
				for ti := ti0; ti < ti1; ti++ {
					f.sign[tj*tnx+ti] = s
				}
			}
			return
		}
		if ti1-ti0 > 1 || tj1-tj0 > 1 {
			tim, tjm := (ti0+ti1+1)/2, (tj0+tj1+1)/2
			for _, c := range [4][4]int{{ti0, tim, tj0, tjm}, {tim, ti1, tj0, tjm}, {ti0, tim, tjm, tj1}, {tim, ti1, tjm, tj1}} {
				if c[0] < c[1] && c[2] < c[3] {
					walk(c[0], c[1], c[2], c[3], cand)
				}
			}
			return
		}
		f.slot[tj0*tnx+ti0] = int32(len(f.vals) / (bandTile * bandTile))
		base := len(f.vals)
		f.vals = slices.Grow(f.vals, bandTile*bandTile)[:base+bandTile*bandTile]
		for j := j0; j < j1; j++ {
			y := l.Y0 + float64(j)*l.H
			for i := i0; i < i1; i++ {
				x := l.X0 + float64(i)*l.H
				d2 := math.Inf(1)
				for _, c := range cand {
					d2 = min(d2, q.segs[c].dist2(x, y))
				}
				sd := math.Sqrt(d2)
				if uniform < 0 || (uniform == 0 && !rows.inside(j, x)) {
					sd = -sd
				}
				f.vals[base+(j-j0)*bandTile+(i-i0)] = sd - delta
			}
		}
	}
	walk(0, tnx, 0, tny, w.all(len(q.segs)))
	return f
}

// marchLoops traces the closed loops of φ = 0 (φ ≥ 0 inside) by marching
// squares, each counter-clockwise (inside on the left). center gives the
// exact φ at a point, for saddle cells. φ must be negative on the
// lattice's border. Only cells with a corner in a stored tile are visited:
// a cell that φ = 0 crosses has every corner within √2 cells of the level
// set, so in stored tiles. Loops are listed in the order of their first
// lattice edge, each starting there, so the result does not depend on
// anything but φ.
func marchLoops(phi *bandField, center func(geom.Vec2) float64) [][]geom.Vec2 {
	l := phi.lat
	// Edge ids: 2·k for node k → k+1 (horizontal), 2·k+1 for k → k+NX.
	point := func(id int) geom.Vec2 {
		k := id / 2
		m := k + 1
		if id%2 == 1 {
			m = k + l.NX
		}
		a, b := phi.at(k%l.NX, k/l.NX), phi.at(m%l.NX, m/l.NX)
		pa, pb := l.Node(k%l.NX, k/l.NX), l.Node(m%l.NX, m/l.NX)
		return pa.Lerp(pb, a/(a-b))
	}
	type link struct{ from, to int }
	var links []link
	// A stored tile's values with a one-node apron on the right and top,
	// for the cells whose lower-left corner lies in the tile.
	const ts = bandTile + 1
	var tv [ts * ts]float64
	for tj := 0; tj < phi.tny; tj++ {
		for ti := 0; ti < phi.tnx; ti++ {
			if phi.sign[tj*phi.tnx+ti] != 0 {
				continue
			}
			i0, j0 := ti*bandTile, tj*bandTile
			base := int(phi.slot[tj*phi.tnx+ti]) * bandTile * bandTile
			for dj := range ts {
				for di := range ts {
					i, j := i0+di, j0+dj
					switch {
					case i >= l.NX || j >= l.NY:
						tv[dj*ts+di] = math.NaN() // beyond the lattice: never read
					case di < bandTile && dj < bandTile:
						tv[dj*ts+di] = phi.vals[base+dj*bandTile+di]
					default:
						tv[dj*ts+di] = phi.at(i, j)
					}
				}
			}
			for cj := j0; cj < min(j0+bandTile, l.NY-1); cj++ {
				for ci := i0; ci < min(i0+bandTile, l.NX-1); ci++ {
					k := l.Index(ci, cj)
					e := [4]int{2 * k, 2*(k+1) + 1, 2*(k+l.NX) + 0, 2*k + 1}
					// Counter-clockwise corners 00, 10, 11, 01.
					q := (cj-j0)*ts + ci - i0
					v := [4]float64{tv[q], tv[q+1], tv[q+ts+1], tv[q+ts]}
					var in [4]bool
					code := 0
					for m := range 4 {
						in[m] = v[m] >= 0
						if in[m] {
							code |= 1 << m
						}
					}
					if code == 0 || code == 15 {
						continue
					}
					if code == 5 || code == 10 {
						joined := center(l.Node(ci, cj).Add(geom.Vec2{X: l.H / 2, Y: l.H / 2})) >= 0
						switch {
						case code == 5 && joined:
							links = append(links, link{e[0], e[1]}, link{e[2], e[3]})
						case code == 5:
							links = append(links, link{e[0], e[3]}, link{e[2], e[1]})
						case joined:
							links = append(links, link{e[1], e[2]}, link{e[3], e[0]})
						default:
							links = append(links, link{e[1], e[0]}, link{e[3], e[2]})
						}
						continue
					}
					// One run of inside corners: it leaves the cell across the
					// edge after its last corner and enters across the edge
					// before its first.
					var exit, entry int
					for m := range 4 {
						if in[m] && !in[(m+1)%4] {
							exit = e[m]
						}
						if !in[m] && in[(m+1)%4] {
							entry = e[m]
						}
					}
					links = append(links, link{exit, entry})
				}
			}
		}
	}
	// Follow the links into loops, each then turned to start at its lowest
	// edge id and listed in that order.
	byFrom := make(map[int]int32, len(links))
	for n, lk := range links {
		byFrom[lk.from] = int32(n)
	}
	type traced struct {
		first int // lowest edge id
		pts   []geom.Vec2
	}
	var loops []traced
	seen := make([]bool, len(links))
	for s := range links {
		var loop []geom.Vec2
		first, at := math.MaxInt, 0
		for n := s; !seen[n]; {
			seen[n] = true
			if id := links[n].from; id < first {
				first, at = id, len(loop)
			}
			loop = append(loop, point(links[n].from))
			m, ok := byFrom[links[n].to]
			if !ok {
				break
			}
			n = int(m)
		}
		if len(loop) >= 3 {
			loops = append(loops, traced{first, append(loop[at:], loop[:at]...)})
		}
	}
	slices.SortFunc(loops, func(a, b traced) int { return cmp.Compare(a.first, b.first) })
	out := make([][]geom.Vec2, len(loops))
	for i, lp := range loops {
		out[i] = lp.pts
	}
	return out
}

// feature names the part of ∂q nearest a point: edge k (k ≥ 0) or vertex
// v (encoded −v−1).
type feature int

func nearestFeature(q *polygon, p geom.Vec2) feature {
	best, bk, bt := math.Inf(1), 0, 0.0
	for k := range q.segs {
		s := &q.segs[k]
		d := s.dist2(p.X, p.Y)
		if d < best {
			t := ((p.X-s.ax)*s.dx + (p.Y-s.ay)*s.dy) * s.inv
			best, bk, bt = d, k, t
		}
	}
	n := len(q.pts)
	switch {
	case bt <= 0:
		return feature(-bk - 1)
	case bt >= 1:
		return feature(-((bk + 1) % n) - 1)
	}
	return feature(bk)
}

// project moves p onto the offset curve of f at distance delta.
func project(q *polygon, f feature, p geom.Vec2, delta float64) geom.Vec2 {
	if f >= 0 {
		nx, ny := -q.nx[f], -q.ny[f] // inward normal
		sd := nx*p.X + ny*p.Y + q.nc[f]
		return geom.Vec2{X: p.X + (delta-sd)*nx, Y: p.Y + (delta-sd)*ny}
	}
	v := q.pts[-f-1]
	d := p.Sub(v)
	n := d.Norm()
	if n == 0 {
		return p
	}
	return v.Add(d.Scale(delta / n))
}

// junction returns the point where the offset curves of features a and b
// meet nearest to near; ok is false when they do not meet.
func junction(q *polygon, a, b feature, delta float64, near geom.Vec2) (geom.Vec2, bool) {
	if a < 0 && b >= 0 {
		a, b = b, a
	}
	switch {
	case a >= 0 && b >= 0: // two lines n·p = c + δ·… (inward offsets)
		n1x, n1y, c1 := -q.nx[a], -q.ny[a], delta-q.nc[a]
		n2x, n2y, c2 := -q.nx[b], -q.ny[b], delta-q.nc[b]
		det := n1x*n2y - n1y*n2x
		if math.Abs(det) < 1e-9 {
			return geom.Vec2{}, false
		}
		return geom.Vec2{X: (c1*n2y - c2*n1y) / det, Y: (n1x*c2 - n2x*c1) / det}, true
	case a >= 0: // line and circle
		nx, ny, c := -q.nx[a], -q.ny[a], delta-q.nc[a]
		v := q.pts[-b-1]
		// Points v + t·(−ny, nx) + s·(nx, ny) with s = c − n·v on the line.
		s := c - (nx*v.X + ny*v.Y)
		r2 := delta*delta - s*s
		if r2 < 0 {
			return geom.Vec2{}, false
		}
		t := math.Sqrt(r2)
		base := geom.Vec2{X: v.X + s*nx, Y: v.Y + s*ny}
		dir := geom.Vec2{X: -ny, Y: nx}
		p1, p2 := base.Add(dir.Scale(t)), base.Sub(dir.Scale(t))
		if p1.DistanceSquared(near) <= p2.DistanceSquared(near) {
			return p1, true
		}
		return p2, true
	default: // two circles of radius δ
		u, v := q.pts[-a-1], q.pts[-b-1]
		d := v.Sub(u)
		l2 := d.Norm2()
		if l2 == 0 || l2 > 4*delta*delta {
			return geom.Vec2{}, false
		}
		m := u.Add(d.Scale(0.5))
		t := math.Sqrt(delta*delta - l2/4)
		dir := geom.Vec2{X: -d.Y, Y: d.X}.Scale(1 / math.Sqrt(l2))
		p1, p2 := m.Add(dir.Scale(t)), m.Sub(dir.Scale(t))
		if p1.DistanceSquared(near) <= p2.DistanceSquared(near) {
			return p1, true
		}
		return p2, true
	}
}

// rebuildLoop turns a traced loop into an exact ring (see the comment at
// the top of this file), or nil for a loop too small to keep.
func rebuildLoop(q *polygon, loop []geom.Vec2, delta, hr float64) geom.Ring {
	raw := geom.Ring(loop)
	if math.Abs(raw.Area()) < 16*hr*hr {
		return nil
	}
	n := len(loop)
	feat := make([]feature, n)
	proj := make(geom.Ring, n)
	for i, p := range loop {
		feat[i] = nearestFeature(q, p)
		proj[i] = project(q, feat[i], p, delta)
	}
	fallback := func() geom.Ring {
		r := dropCollinear(proj)
		if c, err := cleanRing(r); err == nil {
			return c
		}
		if c, err := cleanRing(raw); err == nil {
			return c
		}
		return nil
	}
	// Start at a change of feature.
	s := -1
	for i := range n {
		if feat[i] != feat[(i+n-1)%n] {
			s = i
			break
		}
	}
	if s < 0 {
		return fallback()
	}
	type run struct {
		f           feature
		first, last int // indices into loop, cyclic
	}
	var runs []run
	for i := 0; i < n; {
		j := i
		for j+1 < n && feat[(s+j+1)%n] == feat[(s+i)%n] {
			j++
		}
		runs = append(runs, run{feat[(s+i)%n], (s + i) % n, (s + j) % n})
		i = j + 1
	}
	nr := len(runs)
	// Junction between run r and run r+1.
	jn := make([]geom.Vec2, nr)
	jok := make([]bool, nr)
	lim := 8 * hr
	for r := range runs {
		a, b := runs[r], runs[(r+1)%nr]
		near := proj[a.last].Add(proj[b.first]).Scale(0.5)
		p, ok := junction(q, a.f, b.f, delta, near)
		if ok && p.Distance(near) <= lim {
			jn[r], jok[r] = p, true
		}
	}
	var out geom.Ring
	for r, ru := range runs {
		start := proj[ru.first]
		if prev := (r + nr - 1) % nr; jok[prev] {
			start = jn[prev]
		}
		end := proj[ru.last]
		if jok[r] {
			end = jn[r]
		}
		out = append(out, start)
		if ru.f < 0 {
			out = append(out, arcPoints(q.pts[-ru.f-1], start, end, proj, ru.first, ru.last, n)...)
		}
		if !jok[r] {
			out = append(out, end)
		}
	}
	out = dropCollinear(out)
	c, err := cleanRing(out)
	if err != nil || math.Abs(c.Area()-math.Abs(raw.Area())) > 2*hr*raw.Perimeter() {
		return fallback()
	}
	return c
}

// arcPoints returns the interior points of the arc around v from start to
// end, turning the way the traced run turns, with chords of at most
// arcStep.
func arcPoints(v, start, end geom.Vec2, proj geom.Ring, first, last, n int) []geom.Vec2 {
	a0 := math.Atan2(start.Y-v.Y, start.X-v.X)
	a1 := math.Atan2(end.Y-v.Y, end.X-v.X)
	r := start.Distance(v)
	// Direction of travel from the run's own points (clockwise around a
	// reflex vertex when they do not say otherwise).
	turn := 0.0
	for i := first; i != last; i = (i + 1) % n {
		p, q := proj[i].Sub(v), proj[(i+1)%n].Sub(v)
		turn += math.Atan2(p.Cross(q), p.Dot(q))
	}
	sweep := a1 - a0
	if turn >= 0 {
		for sweep < 0 {
			sweep += 2 * math.Pi
		}
	} else {
		for sweep > 0 {
			sweep -= 2 * math.Pi
		}
	}
	steps := int(math.Ceil(math.Abs(sweep) / arcStep))
	var out []geom.Vec2
	for k := 1; k < steps; k++ {
		a := a0 + sweep*float64(k)/float64(steps)
		out = append(out, geom.Vec2{X: v.X + r*math.Cos(a), Y: v.Y + r*math.Sin(a)})
	}
	return out
}

// dropCollinear removes vertices that lie on the segment between their
// neighbours (exact test) and repeated vertices.
func dropCollinear(r geom.Ring) geom.Ring {
	out := make(geom.Ring, 0, len(r))
	for _, p := range r {
		if len(out) > 0 && out[len(out)-1] == p {
			continue
		}
		out = append(out, p)
	}
	for len(out) > 1 && out[0] == out[len(out)-1] {
		out = out[:len(out)-1]
	}
	for changed := true; changed && len(out) > 3; {
		changed = false
		for i := 0; i < len(out) && len(out) > 3; i++ {
			a, b, c := out[(i+len(out)-1)%len(out)], out[i], out[(i+1)%len(out)]
			if robust.Orient2D(a, b, c) == robust.Zero && onSegment(b, a, c) {
				out = append(out[:i], out[i+1:]...)
				changed = true
				i--
			}
		}
	}
	return out
}
