package tin

import (
	"fmt"
	"math"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/robust"
)

// Constrained edges are inserted one segment at a time. The triangles the
// segment crosses are removed and the two polygons left on either side of it
// are retriangulated by their constrained Delaunay triangulations (M. V.
// Anglada, "An improved incremental algorithm for constructing restricted
// Delaunay triangulations", Computers & Graphics 21(2), 1997; the same
// cavity method as Shewchuk's lecture notes, §3.8). The result is the
// constrained Delaunay triangulation: every unconstrained edge is locally
// Delaunay.
//
// A segment that passes exactly through a vertex is split there. A segment
// that properly crosses an already constrained edge is split at the
// intersection point, which becomes a vertex whose elevation is interpolated
// along the breakline (the mean of the two breaklines' elevations when both
// edges are breaklines; a warning is recorded when they disagree by more
// than the conflict tolerance).

// segment is a constraint awaiting insertion between two vertices.
type segment struct {
	a, b int32
	kind uint8 // flagBreakline or flagBoundary
	line int32 // breakline index, or -1 for a boundary
}

// conKey identifies an undirected constrained edge.
type conKey [2]int32

func keyOf(a, b int32) conKey {
	if a > b {
		a, b = b, a
	}
	return conKey{a, b}
}

// conRec describes an inserted constrained edge.
type conRec struct {
	kind uint8
	line int32
}

// constrainer inserts constraints into a builder.
type constrainer struct {
	b         *builder
	recs      map[conKey]conRec
	splits    int
	tolZ      float64
	names     []string
	warnings  []Warning
	warnCount int
	work      []segment
	budget    int
}

func newConstrainer(b *builder, names []string, tolZ float64) *constrainer {
	c := &constrainer{b: b, recs: make(map[conKey]conRec), tolZ: tolZ, names: names}
	if b.flags == nil {
		b.flags = make([]uint8, len(b.tri), cap(b.tri))
	}
	b.onConstraintSplit = c.splitRecord
	return c
}

// splitRecord keeps the records in step when a point is inserted on a
// constrained edge a–b at p.
func (c *constrainer) splitRecord(a, b, p int32) {
	k := keyOf(a, b)
	r, ok := c.recs[k]
	if !ok {
		return
	}
	delete(c.recs, k)
	c.recs[keyOf(a, p)] = r
	c.recs[keyOf(p, b)] = r
	c.splits++
}

// insertAll inserts the segments (and the pieces they are split into).
func (c *constrainer) insertAll(segs []segment) error {
	// Budget: every split adds at most three pieces; proper crossings
	// between n segments are at most n(n-1)/2. A budget far above that
	// only trips on a runaway loop.
	n := len(segs)
	c.budget = 16*n + 2*n*n + 1024
	for i := len(segs) - 1; i >= 0; i-- {
		c.work = append(c.work, segs[i])
	}
	for len(c.work) > 0 {
		s := c.work[len(c.work)-1]
		c.work = c.work[:len(c.work)-1]
		if c.budget--; c.budget < 0 {
			return fmt.Errorf("%w near (%g, %g)", ErrConstraint, c.b.v[s.a].X, c.b.v[s.a].Y)
		}
		if err := c.insert(s); err != nil {
			return err
		}
	}
	return nil
}

// push queues segments so that the first given is inserted first.
func (c *constrainer) push(segs ...segment) {
	for i := len(segs) - 1; i >= 0; i-- {
		if segs[i].a != segs[i].b {
			c.work = append(c.work, segs[i])
		}
	}
}

// mark sets the constraint on half-edge e and its twin and records it.
func (c *constrainer) mark(e int32, s segment) {
	b := c.b
	f := b.flags[e] | flagConstrained | s.kind
	b.flags[e] = f
	b.flags[b.adj[e]] = f
	k := keyOf(b.tri[e], b.tri[next(e)])
	r, ok := c.recs[k]
	if ok {
		r.kind |= s.kind
		if r.line < 0 {
			r.line = s.line
		}
	} else {
		r = conRec{kind: s.kind, line: s.line}
	}
	c.recs[k] = r
}

// outEdge returns a half-edge leaving vertex a.
func (c *constrainer) outEdge(a int32) (int32, error) {
	kind, e := c.b.locate(c.b.xy(a))
	if kind != locVertex || c.b.tri[e] != a {
		return -1, fmt.Errorf("%w: vertex %d not found in the triangulation", ErrConstraint, a)
	}
	return e, nil
}

// insert inserts one segment, or splits it and queues the pieces.
func (c *constrainer) insert(s segment) error {
	b := c.b
	a, z := s.a, s.b
	pa, pz := b.xy(a), b.xy(z)
	e, err := c.outEdge(a)
	if err != nil {
		return err
	}
	// Turn around a until the triangle whose wedge holds the direction of z.
	start := e
	for {
		u, w := b.tri[next(e)], b.tri[prev(e)]
		if u == z {
			c.mark(e, s)
			return nil
		}
		if u >= 0 && w >= 0 {
			pu := b.xy(u)
			o1 := robust.Orient2D(pa, pu, pz)
			if o1 == 0 && pu.Sub(pa).Dot(pz.Sub(pa)) > 0 {
				// u lies on the segment: split there.
				c.splits++
				c.push(segment{a, u, s.kind, s.line}, segment{u, z, s.kind, s.line})
				return nil
			}
			if o1 > 0 && robust.Orient2D(pa, b.xy(w), pz) < 0 {
				break
			}
		}
		e = b.adj[prev(e)]
		if e == start {
			return fmt.Errorf("%w: no triangle at vertex %d faces (%g, %g)", ErrConstraint, a, pz.X, pz.Y)
		}
	}

	// Walk along a→z collecting the crossed triangles and the vertices to
	// the left (L) and right (R) of the segment. The crossed half-edge h
	// always runs from a right vertex to a left one.
	cav := []int32{e / 3}
	var left, right []int32
	h := next(e)
	ru, lw := b.tri[h], b.tri[next(h)]
	left = append(left, lw)
	right = append(right, ru)
	for {
		if b.flags[h]&flagConstrained != 0 {
			return c.cross(s, h)
		}
		g := b.adj[h]
		cav = append(cav, g/3)
		v := b.tri[prev(g)]
		if v == z {
			break
		}
		if v < 0 {
			return fmt.Errorf("%w: segment from vertex %d to %d leaves the hull", ErrConstraint, a, z)
		}
		switch robust.Orient2D(pa, pz, b.xy(v)) {
		case robust.Positive:
			left = append(left, v)
			h = next(g) // ru→v
			lw = v
		case robust.Negative:
			right = append(right, v)
			h = prev(g) // v→lw
			ru = v
		default:
			c.splits++
			c.push(segment{a, v, s.kind, s.line}, segment{v, z, s.kind, s.line})
			return nil
		}
	}
	return c.retriangulate(s, cav, left, right)
}

// cross handles segment s properly crossing the constrained edge of
// half-edge h: the intersection becomes a vertex, and both constraints are
// queued again in pieces.
func (c *constrainer) cross(s segment, h int32) error {
	b := c.b
	u, w := b.tri[h], b.tri[next(h)]
	pa, pz, pu, pw := b.v[s.a], b.v[s.b], b.v[u], b.v[w]
	// Intersection parameters along a→z (t) and u→w (r), in floating point;
	// only the new vertex's position depends on them, topology does not.
	d := geom.Vec2{X: pz.X - pa.X, Y: pz.Y - pa.Y}
	q := geom.Vec2{X: pw.X - pu.X, Y: pw.Y - pu.Y}
	au := geom.Vec2{X: pu.X - pa.X, Y: pu.Y - pa.Y}
	den := d.Cross(q)
	t := clamp01(au.Cross(q) / den)
	r := clamp01(au.Cross(d) / den)
	x := geom.Vec2{X: pa.X + t*d.X, Y: pa.Y + t*d.Y}
	zs := pa.Z + t*(pz.Z-pa.Z)
	zc := pu.Z + r*(pw.Z-pu.Z)
	k := keyOf(u, w)
	old := c.recs[k]
	oldFlags := b.flags[h]
	var z float64
	switch {
	case s.kind&flagBreakline != 0 && oldFlags&flagBreakline != 0:
		z = (zs + zc) / 2
		if math.Abs(zs-zc) > c.tolZ {
			c.warn(Warning{
				Msg: fmt.Sprintf("breaklines %s and %s cross at elevations %.3f m and %.3f m (more than %g m apart); used the mean",
					c.lineName(s.line), c.lineName(old.line), zs, zc, c.tolZ),
				At: x,
			})
		}
	case s.kind&flagBreakline != 0:
		z = zs
	default:
		z = zc
	}
	// Release the old constraint, insert the crossing point, and queue the
	// four pieces.
	b.flags[h] &^= flagConstrained | flagBreakline | flagBoundary
	b.flags[b.adj[h]] = b.flags[h]
	delete(c.recs, k)
	b.v = append(b.v, geom.Vec3{X: x.X, Y: x.Y, Z: z})
	iv := int32(len(b.v) - 1)
	got := b.insert(iv)
	if got != iv {
		b.v = b.v[:iv] // an existing vertex is exactly there
	}
	c.splits++
	oldSeg := segment{kind: old.kind &^ flagConstrained, line: old.line}
	if oldSeg.kind == 0 {
		oldSeg.kind = oldFlags & (flagBreakline | flagBoundary)
	}
	c.push(
		segment{s.a, got, s.kind, s.line}, segment{got, s.b, s.kind, s.line},
		segment{u, got, oldSeg.kind, oldSeg.line}, segment{got, w, oldSeg.kind, oldSeg.line},
	)
	return nil
}

func clamp01(x float64) float64 {
	switch {
	case x < 0:
		return 0
	case x > 1:
		return 1
	case x == x:
		return x
	}
	return 0.5 // NaN: parallel lines cannot cross properly; keep a midpoint
}

// lineName returns a printable name for breakline i.
func (c *constrainer) lineName(i int32) string {
	if i < 0 || int(i) >= len(c.names) {
		return "(boundary)"
	}
	return fmt.Sprintf("%q", c.names[i])
}

func (c *constrainer) warn(w Warning) {
	c.warnCount++
	if c.warnCount <= maxWarningsPerKind {
		c.warnings = append(c.warnings, w)
	}
}

// outer is a half-edge outside the cavity, keyed by its ends (start, end).
type outer struct {
	from, to int32
	e        int32
}

// retriangulate replaces the cavity triangles cav by the constrained
// Delaunay triangulations of the polygons left and right of segment s.
func (c *constrainer) retriangulate(s segment, cav, left, right []int32) error {
	b := c.b
	inCav := make(map[int32]bool, len(cav))
	for _, t := range cav {
		inCav[t] = true
	}
	var outs []outer
	for _, t := range cav {
		for k := range int32(3) {
			f := b.adj[3*t+k]
			if !inCav[f/3] {
				outs = append(outs, outer{b.tri[f], b.tri[next(f)], f})
			}
		}
	}
	slots := append([]int32(nil), cav...)
	lchain := make([]int32, 0, len(left)+2)
	lchain = append(lchain, s.a)
	lchain = append(lchain, left...)
	lchain = append(lchain, s.b)
	rchain := make([]int32, 0, len(right)+2)
	rchain = append(rchain, s.b)
	for i := len(right) - 1; i >= 0; i-- {
		rchain = append(rchain, right[i])
	}
	rchain = append(rchain, s.a)
	p := polyTriangulator{b: b, slots: slots, outs: outs}
	hl := p.run(lchain)
	hr := p.run(rchain)
	if p.broken || len(p.slots) != 0 || len(p.outs) != 0 {
		// Unreachable for a valid triangulation: the walk recorded every
		// boundary edge and the polygons use exactly the cavity's slots.
		return fmt.Errorf("%w: cavity of segment %d–%d is inconsistent", ErrConstraint, s.a, s.b)
	}
	b.link(hl, hr)
	b.flags[hl], b.flags[hr] = 0, 0
	c.mark(hl, s)
	b.last = hl / 3
	return nil
}

// polyTriangulator triangulates cavity polygons into reused triangle slots.
type polyTriangulator struct {
	b      *builder
	slots  []int32
	outs   []outer
	broken bool // a slot or boundary edge was missing
}

// run triangulates the polygon whose vertices chain[1:len-1] lie strictly
// to the left of the base edge chain[0]→chain[len-1], choosing for each base
// edge the vertex whose circle through the base contains no other chain
// vertex (Anglada 1997), and returns the half-edge chain[0]→chain[len-1] of
// the triangle on the base.
func (p *polyTriangulator) run(chain []int32) int32 {
	b := p.b
	last := len(chain) - 1
	va, vb := chain[0], chain[last]
	ci := 1
	pa, pb := b.xy(va), b.xy(vb)
	for i := 2; i < last; i++ {
		if robust.InCircle(pa, pb, b.xy(chain[ci]), b.xy(chain[i])) > 0 {
			ci = i
		}
	}
	vc := chain[ci]
	if len(p.slots) == 0 {
		p.broken = true
		return 0
	}
	t := p.slots[len(p.slots)-1]
	p.slots = p.slots[:len(p.slots)-1]
	h0, h1, h2 := 3*t, 3*t+1, 3*t+2
	b.tri[h0], b.tri[h1], b.tri[h2] = va, vb, vc
	b.flags[h0], b.flags[h1], b.flags[h2] = 0, 0, 0
	p.attach(h1, chain[ci:])   // edge vb→vc: polygon beyond it has base vc→vb
	p.attach(h2, chain[:ci+1]) // edge vc→va: polygon beyond it has base va→vc
	return h0
}

// attach links half-edge h of a new triangle to the polygon sub beyond it:
// the outer half-edge sub[0]→sub[1] when sub is a single edge, else the base
// of sub's own triangulation.
func (p *polyTriangulator) attach(h int32, sub []int32) {
	b := p.b
	if len(sub) > 2 {
		b.link(h, p.run(sub))
		return
	}
	for i, o := range p.outs {
		if o.from == sub[0] && o.to == sub[1] {
			b.link(h, o.e)
			b.flags[h] = b.flags[o.e]
			p.outs[i] = p.outs[len(p.outs)-1]
			p.outs = p.outs[:len(p.outs)-1]
			return
		}
	}
	p.broken = true
}
