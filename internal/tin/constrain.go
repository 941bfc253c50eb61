package tin

import (
	"fmt"
	"math"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/robust"
)

// Constrained edges are inserted one segment at a time, after S. W. Sloan,
// "A fast algorithm for generating constrained Delaunay triangulations",
// Computers & Structures 47(3), 1993: the edges the segment crosses are
// collected by walking along it; each is flipped when its quadrilateral is
// strictly convex (otherwise it waits for its neighbours), until none
// crosses; then Lawson flips over the touched triangles restore the
// constrained Delaunay property (every unconstrained edge locally Delaunay).
// Flipping keeps the triangulation valid at every step, so configurations
// such as a vertex enclosed by the crossed triangles without lying on the
// segment need no special case.
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

	// Buffers reused from segment to segment.
	cav, crossed []int32
	at           map[int32]int
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

	// Walk along a→z collecting the crossed edges. The crossed half-edge h
	// always runs from a vertex right of a→z to one left of it.
	cav := append(c.cav[:0], e/3)
	h := next(e)
	crossed := c.crossed[:0]
	defer func() { c.cav, c.crossed = cav[:0], crossed[:0] }()
	for {
		if b.flags[h]&flagConstrained != 0 {
			return c.cross(s, h)
		}
		crossed = append(crossed, h)
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
			h = next(g) // right end → v
		case robust.Negative:
			h = prev(g) // v → left end
		default:
			c.splits++
			c.push(segment{a, v, s.kind, s.line}, segment{v, z, s.kind, s.line})
			return nil
		}
	}
	return c.flipOut(s, crossed, cav)
}

// flipOut removes the crossed edges by Sloan's flips, marks the segment and
// restores the Delaunay property around it. Flips reuse the two triangle
// slots of the flipped edge, so all work stays in the slots cav.
func (c *constrainer) flipOut(s segment, crossed, cav []int32) error {
	b := c.b
	pa, pz := b.xy(s.a), b.xy(s.b)
	// The queue holds crossed half-edges; a flip moves the quadrilateral's
	// outer edges between its four outer slots, so queued entries that sit
	// in those slots are remapped (at tracks each queued half-edge's
	// position in the queue).
	queue := crossed
	if c.at == nil {
		c.at = make(map[int32]int)
	}
	at := c.at
	clear(at)
	for i, h := range queue {
		at[h] = i
	}
	head := 0
	limit := 16*len(crossed)*len(crossed) + 1024
	for head < len(queue) {
		if limit--; limit < 0 {
			return fmt.Errorf("%w: segment %d–%d: flips do not clear the crossings", ErrConstraint, s.a, s.b)
		}
		e := queue[head]
		delete(at, e)
		head++
		f := b.adj[e]
		e1, e2, f1, f2 := next(e), prev(e), next(f), prev(f)
		p, x := b.tri[e2], b.tri[f2]
		ea, eb := b.tri[e], b.tri[e1]
		convex := robust.Orient2D(b.xy(x), b.xy(p), b.xy(ea)) > 0 && robust.Orient2D(b.xy(p), b.xy(x), b.xy(eb)) > 0
		if !convex {
			at[e] = len(queue)
			queue = append(queue, e)
			continue
		}
		// Contents move: e1→f2, e2→e1, f1→e2, f2→f1 (see flip).
		moved := [4][2]int32{{e1, f2}, {e2, e1}, {f1, e2}, {f2, f1}}
		var pos [4]int
		var had [4]bool
		for k, mv := range moved {
			pos[k], had[k] = at[mv[0]]
			delete(at, mv[0])
		}
		b.flip(e, f)
		for k, mv := range moved {
			if had[k] {
				queue[pos[k]] = mv[1]
				at[mv[1]] = pos[k]
			}
		}
		// The new diagonal x→p is slot e; it still crosses when its ends
		// lie strictly on opposite sides of the segment's line.
		if p != s.a && p != s.b && x != s.a && x != s.b &&
			robust.Orient2D(pa, pz, b.xy(p))*robust.Orient2D(pa, pz, b.xy(x)) < 0 {
			at[e] = len(queue)
			queue = append(queue, e)
		}
	}
	// Mark the segment, then Lawson flips over the touched triangles.
	ab := int32(-1)
	for _, t := range cav {
		for k := range int32(3) {
			h := 3*t + k
			if b.tri[h] == s.a && b.tri[next(h)] == s.b {
				ab = h
			}
		}
	}
	if ab < 0 {
		return fmt.Errorf("%w: segment %d–%d missing after flips", ErrConstraint, s.a, s.b)
	}
	c.mark(ab, s)
	for _, t := range cav {
		b.stack = append(b.stack, 3*t, 3*t+1, 3*t+2)
	}
	b.legalizeEdges()
	b.last = ab / 3
	return nil
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
