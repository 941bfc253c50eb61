package tin

import (
	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/robust"
)

// The triangulation is built by incremental insertion in spatial (Hilbert)
// order: each point is located by a walk from the previous one, the triangle
// (or edge) containing it is split, and Lawson flips restore the Delaunay
// property (C. L. Lawson, "Software for C1 surface interpolation", 1977;
// Guibas & Stolfi 1985). Every decision is taken by the exact predicates of
// package robust, so degenerate input (collinear runs, cocircular grids,
// points 1e-15 apart, coordinates of 5e6 m with millimetre spacing) gives a
// valid triangulation and no distinct point is ever dropped.
//
// Points outside the current convex hull are handled with ghost triangles:
// every hull edge has a ghost triangle on its outer side whose third vertex
// is the point at infinity (index ghost). The ghost triangle's "circumcircle"
// is the open half-plane beyond its hull edge, so outside insertions and hull
// updates are ordinary splits and flips (Shewchuk, "Lecture notes on Delaunay
// mesh generation", 2012, §3.4). With ghosts every half-edge has a twin.
//
// Representation (see DESIGN.md): triangle t is the vertex triple
// tri[3t], tri[3t+1], tri[3t+2], counter-clockwise; half-edge e = 3t+k runs
// from tri[e] to tri[next(e)]; adj[e] is its twin (the same edge in the
// neighbouring triangle, reversed).

// ghost is the vertex index of the point at infinity.
const ghost int32 = -1

// Half-edge constraint flags.
const (
	flagConstrained uint8 = 1 << iota // edge may not be flipped
	flagBreakline                     // edge lies on a breakline (carries elevations)
	flagBoundary                      // edge lies on a boundary polygon
	flagHull                          // edge lies on the survey's hull, frozen while boundaries are inserted
)

// flagUser marks the constraints the user asked for (what IsConstrained
// reports and what the edge-length trim exempts).
const flagUser = flagBreakline | flagBoundary

// next returns the next half-edge of the same triangle.
func next(e int32) int32 {
	if e%3 == 2 {
		return e - 2
	}
	return e + 1
}

// prev returns the previous half-edge of the same triangle.
func prev(e int32) int32 {
	if e%3 == 0 {
		return e + 2
	}
	return e - 1
}

// builder holds a triangulation under construction.
type builder struct {
	v     []geom.Vec3
	tri   []int32
	adj   []int32
	flags []uint8 // nil until the first constraint
	last  int32   // a real triangle near the last insertion: the walk start
	stack []int32 // edges awaiting a Delaunay test
	rnd   uint32  // state of the walk's pseudo-random edge choice

	// onConstraintSplit is called when a point is inserted on a
	// constrained edge a–b, splitting it at p.
	onConstraintSplit func(a, b, p int32)
}

// xy returns the plan position of vertex i.
func (b *builder) xy(i int32) geom.Vec2 {
	p := &b.v[i]
	return geom.Vec2{X: p.X, Y: p.Y}
}

// isGhost reports whether triangle t has the point at infinity as a vertex.
func (b *builder) isGhost(t int32) bool {
	return b.tri[3*t] < 0 || b.tri[3*t+1] < 0 || b.tri[3*t+2] < 0
}

// newTri appends triangle (a, b, c) with no neighbours and returns its index.
func (b *builder) newTri(p, q, r int32) int32 {
	t := int32(len(b.tri) / 3)
	b.tri = append(b.tri, p, q, r)
	b.adj = append(b.adj, -1, -1, -1)
	if b.flags != nil {
		b.flags = append(b.flags, 0, 0, 0)
	}
	return t
}

// link makes half-edges e and f twins.
func (b *builder) link(e, f int32) {
	b.adj[e] = f
	b.adj[f] = e
}

// flag returns the constraint flags of half-edge e.
func (b *builder) flag(e int32) uint8 {
	if b.flags == nil {
		return 0
	}
	return b.flags[e]
}

// setFlag sets the flags of half-edge e (a no-op without constraints).
func (b *builder) setFlag(e int32, f uint8) {
	if b.flags != nil {
		b.flags[e] = f
	}
}

// random returns a pseudo-random number (xorshift32, Marsaglia 2003) used to
// pick the first edge tested in each walk step.
func (b *builder) random() uint32 {
	x := b.rnd
	x ^= x << 13
	x ^= x >> 17
	x ^= x << 5
	b.rnd = x
	return x
}

// init starts the triangulation with the non-degenerate triangle (i, j, k)
// and its three ghost triangles. The points must not be collinear.
func (b *builder) init(i, j, k int32) {
	if robust.Orient2D(b.xy(i), b.xy(j), b.xy(k)) < 0 {
		i, j = j, i
	}
	t := b.newTri(i, j, k)
	g0 := b.newTri(j, i, ghost)
	g1 := b.newTri(k, j, ghost)
	g2 := b.newTri(i, k, ghost)
	b.link(3*t, 3*g0)
	b.link(3*t+1, 3*g1)
	b.link(3*t+2, 3*g2)
	b.link(3*g0+1, 3*g2+2) // i→∞ with ∞→i
	b.link(3*g1+1, 3*g0+2) // j→∞ with ∞→j
	b.link(3*g2+1, 3*g1+2) // k→∞ with ∞→k
	b.last = t
	b.rnd = 0x9e3779b9
}

// locKind says where a located point lies.
type locKind int8

const (
	locInside  locKind = iota // strictly inside triangle e/3
	locEdge                   // on half-edge e, strictly between its ends
	locVertex                 // on vertex tri[e]
	locOutside                // outside the hull: e/3 is a ghost triangle whose hull edge sees p
)

// locate finds p by a remembering stochastic walk (Devillers, Pion &
// Teillaud, "Walking in a triangulation", 2002) from the last insertion. The
// walk crosses an edge only when p lies strictly on its far side (exact
// orientation), never re-crosses the edge it came through, and picks the
// first edge to test at random, so it terminates in constrained
// triangulations too.
func (b *builder) locate(p geom.Vec2) (locKind, int32) {
	t := b.last
	from := int32(-1)
	limit := len(b.tri) + 16
	for steps := 0; steps < limit; steps++ {
		e0 := 3 * t
		r := int32(b.random() % 3)
		var o [3]robust.Sign
		moved := false
		for i := int32(0); i < 3; i++ {
			k := (r + i) % 3
			e := e0 + k
			if e == from {
				o[k] = robust.Positive
				continue
			}
			s := robust.Orient2D(b.xy(b.tri[e]), b.xy(b.tri[next(e)]), p)
			if s < 0 {
				f := b.adj[e]
				if b.isGhost(f / 3) {
					return locOutside, f
				}
				t, from, moved = f/3, f, true
				break
			}
			o[k] = s
		}
		if moved {
			continue
		}
		return classify(e0, o)
	}
	return b.locateScan(p)
}

// classify turns the three edge orientations of a triangle containing p
// (all >= 0) into a location.
func classify(e0 int32, o [3]robust.Sign) (locKind, int32) {
	switch {
	case o[0] != 0 && o[1] != 0 && o[2] != 0:
		return locInside, e0
	case o[0] == 0 && o[1] == 0:
		return locVertex, e0 + 1
	case o[1] == 0 && o[2] == 0:
		return locVertex, e0 + 2
	case o[2] == 0 && o[0] == 0:
		return locVertex, e0
	case o[0] == 0:
		return locEdge, e0
	case o[1] == 0:
		return locEdge, e0 + 1
	}
	return locEdge, e0 + 2
}

// locateScan is the exhaustive fallback of locate, used only if a walk
// exceeds its step limit (which the termination argument rules out).
func (b *builder) locateScan(p geom.Vec2) (locKind, int32) {
	nt := int32(len(b.tri) / 3)
	for t := range nt {
		if b.isGhost(t) {
			continue
		}
		e0 := 3 * t
		var o [3]robust.Sign
		in := true
		for k := range int32(3) {
			o[k] = robust.Orient2D(b.xy(b.tri[e0+k]), b.xy(b.tri[e0+next(k)]), p)
			if o[k] < 0 {
				in = false
				break
			}
		}
		if in {
			return classify(e0, o)
		}
	}
	for t := range nt {
		if !b.isGhost(t) {
			continue
		}
		for k := range int32(3) {
			e := 3*t + k
			if b.tri[e] >= 0 && b.tri[next(e)] >= 0 && robust.Orient2D(b.xy(b.tri[e]), b.xy(b.tri[next(e)]), p) > 0 {
				return locOutside, e
			}
		}
	}
	return locOutside, -1
}

// insert adds vertex i (already in b.v) to the triangulation and restores
// the (constrained) Delaunay property. It returns the vertex now at i's
// position: i itself, or an existing vertex at exactly the same position (in
// which case nothing changes).
func (b *builder) insert(i int32) int32 {
	p := b.xy(i)
	kind, e := b.locate(p)
	var cand [4]int32
	switch kind {
	case locVertex:
		return b.tri[e]
	case locInside, locOutside:
		cand = b.split3(e/3, i)
	case locEdge:
		cand = b.split4(e, i)
	}
	b.legalize()
	// The split triangles' slots keep i as a vertex through every flip,
	// and a slot that was real stays real: start the next walk there.
	for _, t := range cand {
		if t >= 0 && !b.isGhost(t) {
			b.last = t
			break
		}
	}
	return i
}

// split3 splits triangle t (real or ghost) into three around vertex p and
// queues the three outer edges. It returns the three triangle slots.
func (b *builder) split3(t, p int32) [4]int32 {
	e0, e1, e2 := 3*t, 3*t+1, 3*t+2
	pa, pb, pc := b.tri[e0], b.tri[e1], b.tri[e2]
	a1, a2 := b.adj[e1], b.adj[e2]
	f1, f2 := b.flag(e1), b.flag(e2)
	b.tri[e2] = p // t = (a, b, p)
	t1 := b.newTri(pb, pc, p)
	t2 := b.newTri(pc, pa, p)
	n0, n1, n2 := 3*t1, 3*t1+1, 3*t1+2
	m0, m1, m2 := 3*t2, 3*t2+1, 3*t2+2
	b.link(n0, a1)
	b.link(m0, a2)
	b.link(e1, n2)
	b.link(e2, m1)
	b.link(n1, m2)
	if b.flags != nil {
		b.flags[n0], b.flags[m0] = f1, f2
		b.flags[e1], b.flags[e2] = 0, 0
	}
	b.stack = append(b.stack, e0, n0, m0)
	return [4]int32{t, t1, t2, -1}
}

// split4 splits the two triangles on either side of half-edge e at vertex p,
// which lies on e, and queues the four outer edges. A constrained edge
// stays constrained in its two halves. It returns the four triangle slots.
func (b *builder) split4(e, p int32) [4]int32 {
	f := b.adj[e]
	e1, e2 := next(e), prev(e)
	f1, f2 := next(f), prev(f)
	pa, pb, pc := b.tri[e], b.tri[e1], b.tri[e2]
	pd := b.tri[f2]
	a1, b1 := b.adj[e1], b.adj[f1]
	fe, fa1, fb1 := b.flag(e), b.flag(e1), b.flag(f1)
	b.tri[e1] = p // (a, p, c)
	b.tri[f1] = p // (b, p, d)
	n := b.newTri(p, pb, pc)
	m := b.newTri(p, pa, pd)
	n0, n1, n2 := 3*n, 3*n+1, 3*n+2
	m0, m1, m2 := 3*m, 3*m+1, 3*m+2
	b.link(e, m0)
	b.link(n0, f)
	b.link(e1, n2)
	b.link(f1, m2)
	b.link(n1, a1)
	b.link(m1, b1)
	if b.flags != nil {
		b.flags[e], b.flags[m0], b.flags[n0], b.flags[f] = fe, fe, fe, fe
		b.flags[e1], b.flags[n2], b.flags[f1], b.flags[m2] = 0, 0, 0, 0
		b.flags[n1], b.flags[m1] = fa1, fb1
	}
	if fe&flagConstrained != 0 && b.onConstraintSplit != nil {
		b.onConstraintSplit(pa, pb, p)
	}
	b.stack = append(b.stack, e2, n1, f2, m1)
	return [4]int32{e / 3, f / 3, n, m}
}

// legalize empties the edge stack: each queued half-edge e lies opposite the
// new vertex p = tri[prev(e)]; if p is in conflict with the triangle across
// e (inside its circumcircle, or beyond its hull edge for a ghost), e is
// flipped and the two edges now opposite p are queued. Constrained edges
// are never flipped.
func (b *builder) legalize() {
	for len(b.stack) > 0 {
		e := b.stack[len(b.stack)-1]
		b.stack = b.stack[:len(b.stack)-1]
		if b.flags != nil && b.flags[e]&flagConstrained != 0 {
			continue
		}
		f := b.adj[e]
		p := b.tri[prev(e)]
		if !b.conflict(f/3, b.xy(p)) {
			continue
		}
		b.flip(e, f)
		b.stack = append(b.stack, prev(e), next(f)) // the edges now opposite p
	}
}

// legalizeEdges empties the edge stack with Lawson's flip rule for
// arbitrary edges (not tied to a new vertex): an unconstrained edge is
// flipped when the apex across it lies strictly inside its triangle's
// circumcircle (or beyond a ghost's hull edge), and the four outer edges of
// the flipped quadrilateral are queued. Queued entries whose edge a flip has
// moved to another slot may then name a different edge; that is harmless,
// because every moved edge is queued again at its new slot. Lawson's
// algorithm terminates for any starting triangulation.
func (b *builder) legalizeEdges() {
	for len(b.stack) > 0 {
		e := b.stack[len(b.stack)-1]
		b.stack = b.stack[:len(b.stack)-1]
		if b.flags != nil && b.flags[e]&flagConstrained != 0 {
			continue
		}
		f := b.adj[e]
		te, tf := e/3, f/3
		var bad bool
		if b.isGhost(te) {
			bad = b.tri[prev(f)] >= 0 && b.conflict(te, b.xy(b.tri[prev(f)]))
		} else {
			bad = b.tri[prev(e)] >= 0 && b.conflict(tf, b.xy(b.tri[prev(e)]))
		}
		if !bad {
			continue
		}
		b.flip(e, f)
		b.stack = append(b.stack, next(e), prev(e), next(f), prev(f))
	}
}

// conflict reports whether p lies strictly inside the circumcircle of
// triangle t, or, for a ghost triangle, strictly beyond its hull edge.
func (b *builder) conflict(t int32, p geom.Vec2) bool {
	u, v, w := b.tri[3*t], b.tri[3*t+1], b.tri[3*t+2]
	switch {
	case u < 0:
		return robust.Orient2D(b.xy(v), b.xy(w), p) > 0
	case v < 0:
		return robust.Orient2D(b.xy(w), b.xy(u), p) > 0
	case w < 0:
		return robust.Orient2D(b.xy(u), b.xy(v), p) > 0
	}
	return robust.InCircle(b.xy(u), b.xy(v), b.xy(w), p) > 0
}

// flip replaces the diagonal of the quadrilateral formed by the triangles of
// twin half-edges e and f. Before: e's triangle is (a, b, p) with e = a→b,
// f's is (b, a, x) with f = b→a. After: e's slot holds (x, p, a) with e = x→p
// and f's holds (p, x, b) with f = p→x. The edges opposite p are then slots
// prev(e) (a→x) and next(f) (x→b). Outer edges keep their twins and flags.
func (b *builder) flip(e, f int32) {
	e1, e2 := next(e), prev(e)
	f1, f2 := next(f), prev(f)
	pa, pb, pp, px := b.tri[e], b.tri[e1], b.tri[e2], b.tri[f2]
	a1, a2, b1, b2 := b.adj[e1], b.adj[e2], b.adj[f1], b.adj[f2]
	b.tri[e], b.tri[e1], b.tri[e2] = px, pp, pa
	b.tri[f], b.tri[f1], b.tri[f2] = pp, px, pb
	b.link(e1, a2)
	b.link(e2, b1)
	b.link(f1, b2)
	b.link(f2, a1)
	if b.flags != nil {
		g1, g2, h1, h2 := b.flags[e1], b.flags[e2], b.flags[f1], b.flags[f2]
		b.flags[e1], b.flags[e2], b.flags[f1], b.flags[f2] = g2, h1, h2, g1
		b.flags[e], b.flags[f] = 0, 0
	}
}
