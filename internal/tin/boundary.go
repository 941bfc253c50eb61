package tin

import (
	"cmp"
	"math"
	"slices"
	"strconv"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/robust"
)

// ring is a boundary polygon after checking: counter-clockwise, without
// repeated consecutive vertices; orig maps its vertices to the input ring's.
type ring struct {
	pts  geom.Ring
	orig []int
}

// checkRing validates boundary ring ri and returns it cleaned: consecutive
// repeated vertices (including a closing copy of the first) are dropped; a
// ring with fewer than 3 distinct vertices, zero area, a non-finite
// coordinate, or edges that intersect other than at shared ends is an error
// naming the edges (indices into the input ring).
func checkRing(ri int, in geom.Ring) (ring, error) {
	var r ring
	for i, p := range in {
		if !p.IsFinite() || !coordOK(p.X) || !coordOK(p.Y) {
			return r, &BoundaryError{Ring: ri, EdgeA: -1, EdgeB: -1, Msg: "vertex " + strconv.Itoa(i) + " is not finite or outside [MinCoordM, MaxCoordM]", Err: ErrBoundary}
		}
		if len(r.pts) > 0 && r.pts[len(r.pts)-1] == p {
			continue
		}
		r.pts = append(r.pts, p)
		r.orig = append(r.orig, i)
	}
	for len(r.pts) > 1 && r.pts[len(r.pts)-1] == r.pts[0] {
		r.pts = r.pts[:len(r.pts)-1]
		r.orig = r.orig[:len(r.orig)-1]
	}
	if len(r.pts) < 3 {
		return r, &BoundaryError{Ring: ri, EdgeA: -1, EdgeB: -1, Msg: "fewer than 3 distinct vertices", Err: ErrBoundary}
	}
	if i, j, ok := selfIntersection(r.pts); ok {
		return r, &BoundaryError{Ring: ri, EdgeA: r.orig[i], EdgeB: r.orig[j], Err: ErrBoundarySelfIntersect}
	}
	if r.pts.Area() == 0 {
		return r, &BoundaryError{Ring: ri, EdgeA: -1, EdgeB: -1, Msg: "zero area", Err: ErrBoundary}
	}
	if r.pts.Area() < 0 {
		slices.Reverse(r.pts)
		slices.Reverse(r.orig)
		// Edge i now runs from vertex i to i+1 of the reversed ring; errors
		// are reported before this point, so orig only labels vertices.
	}
	return r, nil
}

// selfIntersection returns two edges of the closed ring r that share a point
// other than the common end of neighbouring edges, decided with exact
// orientation tests. Edges are swept in order of their lowest x, so the cost
// is O(m log m) plus the number of pairs whose x ranges overlap.
func selfIntersection(r geom.Ring) (int, int, bool) {
	m := len(r)
	type span struct {
		lo, hi float64
		i      int
	}
	sp := make([]span, m)
	for i := range m {
		a, b := r[i], r[(i+1)%m]
		sp[i] = span{math.Min(a.X, b.X), math.Max(a.X, b.X), i}
	}
	slices.SortFunc(sp, func(a, b span) int { return cmp.Compare(a.lo, b.lo) })
	for k := range sp {
		i := sp[k].i
		for l := k + 1; l < m && sp[l].lo <= sp[k].hi; l++ {
			j := sp[l].i
			a1, a2 := r[i], r[(i+1)%m]
			b1, b2 := r[j], r[(j+1)%m]
			lo, hi := min(i, j), max(i, j)
			switch {
			case hi == lo+1 || (lo == 0 && hi == m-1):
				// Neighbours share one end; they intersect elsewhere
				// only if they overlap along a line (the ring folds back).
				var shared, p, q geom.Vec2
				if (i+1)%m == j {
					shared, p, q = a2, a1, b2
				} else {
					shared, p, q = a1, a2, b1
				}
				if m == 3 {
					continue // a triangle's edges cannot overlap unless it has zero area, checked apart
				}
				if robust.Orient2D(p, shared, q) == 0 && p.Sub(shared).Dot(q.Sub(shared)) > 0 {
					return lo, hi, true
				}
			default:
				if segmentsIntersect(a1, a2, b1, b2) {
					return lo, hi, true
				}
			}
		}
	}
	return 0, 0, false
}

// segmentsIntersect reports whether the closed segments pq and rs share a
// point, exactly.
func segmentsIntersect(p, q, r, s geom.Vec2) bool {
	o1 := robust.Orient2D(p, q, r)
	o2 := robust.Orient2D(p, q, s)
	o3 := robust.Orient2D(r, s, p)
	o4 := robust.Orient2D(r, s, q)
	if o1*o2 < 0 && o3*o4 < 0 {
		return true
	}
	on := func(a, b, c geom.Vec2) bool { // c on segment ab, given collinear
		return math.Min(a.X, b.X) <= c.X && c.X <= math.Max(a.X, b.X) &&
			math.Min(a.Y, b.Y) <= c.Y && c.Y <= math.Max(a.Y, b.Y)
	}
	return (o1 == 0 && on(p, q, r)) || (o2 == 0 && on(p, q, s)) ||
		(o3 == 0 && on(r, s, p)) || (o4 == 0 && on(r, s, q))
}

// hullEdges returns the hull edges of the triangulation, counter-clockwise
// (interior on the left), from its ghost triangles.
func (b *builder) hullEdges() [][2]int32 {
	var out [][2]int32
	for t := int32(0); t < int32(len(b.tri)/3); t++ {
		u, v, w := b.tri[3*t], b.tri[3*t+1], b.tri[3*t+2]
		switch {
		case u < 0:
			out = append(out, [2]int32{w, v})
		case v < 0:
			out = append(out, [2]int32{u, w})
		case w < 0:
			out = append(out, [2]int32{v, u})
		}
	}
	return out
}

// zAt returns the elevation of the triangulation at p: interpolated in the
// triangle containing p, or, outside the hull, along the nearest point of
// the hull edge the walk ended at.
func (b *builder) zAt(p geom.Vec2) float64 {
	kind, e := b.locate(p)
	if kind == locOutside {
		// e is in a ghost triangle; find its real edge.
		t := e / 3
		for k := range int32(3) {
			h := 3*t + k
			u, w := b.tri[h], b.tri[next(h)]
			if u >= 0 && w >= 0 {
				a, c := b.v[u], b.v[w]
				ab := geom.Vec2{X: c.X - a.X, Y: c.Y - a.Y}
				s := clamp01(p.Sub(geom.Vec2{X: a.X, Y: a.Y}).Dot(ab) / ab.Norm2())
				return a.Z + s*(c.Z-a.Z)
			}
		}
		return math.NaN()
	}
	t := e / 3
	return planeZ(b.v[b.tri[3*t]], b.v[b.tri[3*t+1]], b.v[b.tri[3*t+2]], p)
}

// planeZ returns the elevation at p of the plane through triangle abc
// (barycentric interpolation; p is normally inside the triangle).
func planeZ(a, b, c geom.Vec3, p geom.Vec2) float64 {
	bx, by := b.X-a.X, b.Y-a.Y
	cx, cy := c.X-a.X, c.Y-a.Y
	px, py := p.X-a.X, p.Y-a.Y
	d := float64(bx*cy) - float64(by*cx)
	lb := (float64(px*cy) - float64(py*cx)) / d
	lc := (float64(bx*py) - float64(by*px)) / d
	return a.Z + lb*(b.Z-a.Z) + lc*(c.Z-a.Z)
}

// insertBoundaries inserts the rings as constraints and returns the hull
// edges of the surveyed area. First the current hull edges are frozen as
// constraints (kind flagHull), so that ring vertices outside the hull do
// not change the triangulation inside it; then the ring vertices are
// inserted (elevations interpolated from the surface, or along the nearest
// hull edge outside it) and the ring edges constrained. Where a ring edge
// crosses the hull, the crossing becomes a vertex shared by both
// constraints, so the boundary and the hull form closed chains of
// constrained edges and every region between them is sealed.
func insertBoundaries(b *builder, c *constrainer, rings []ring) ([][2]int32, error) {
	hull := b.hullEdges()
	segs := make([]segment, 0, len(hull))
	for _, h := range hull {
		segs = append(segs, segment{h[0], h[1], flagHull, -1})
	}
	if err := c.insertAll(segs); err != nil {
		return nil, err
	}
	var ids [][]int32
	for _, r := range rings {
		id := make([]int32, len(r.pts))
		for k, x := range r.pts {
			z := b.zAt(x)
			b.v = append(b.v, geom.Vec3{X: x.X, Y: x.Y, Z: z})
			iv := int32(len(b.v) - 1)
			got := b.insert(iv)
			if got != iv {
				b.v = b.v[:iv]
			}
			id[k] = got
		}
		ids = append(ids, id)
	}
	segs = segs[:0]
	for _, id := range ids {
		for k := range id {
			a, z := id[k], id[(k+1)%len(id)]
			if a != z {
				segs = append(segs, segment{a, z, flagBoundary, -1})
			}
		}
	}
	if err := c.insertAll(segs); err != nil {
		return nil, err
	}
	return hull, nil
}

// classifyInside marks the real triangles inside the union of the rings and
// inside the surveyed area's hull (given by its edges' end positions, taken
// before the rings were inserted). Triangles are grouped into regions that
// no boundary or hull edge separates; each region lies wholly inside or
// outside, and is decided by the centroid of its largest triangle (far from
// the region's edges in relative terms, so the floating-point ring test is
// safe; the hull test is exact).
func classifyInside(b *builder, rings []ring, hull [][2]geom.Vec2) []bool {
	nt := int32(len(b.tri) / 3)
	keep := make([]bool, nt)
	seen := make([]bool, nt)
	var stack, region []int32
	for t0 := range nt {
		if seen[t0] || b.isGhost(t0) {
			continue
		}
		region = region[:0]
		stack = append(stack[:0], t0)
		seen[t0] = true
		best, bestA := t0, -1.0
		for len(stack) > 0 {
			t := stack[len(stack)-1]
			stack = stack[:len(stack)-1]
			region = append(region, t)
			if a := math.Abs(geom.PlanArea(b.v[b.tri[3*t]], b.v[b.tri[3*t+1]], b.v[b.tri[3*t+2]])); a > bestA {
				best, bestA = t, a
			}
			for k := range int32(3) {
				e := 3*t + k
				if b.flags[e]&(flagBoundary|flagHull) != 0 {
					continue
				}
				u := b.adj[e] / 3
				if !seen[u] && !b.isGhost(u) {
					seen[u] = true
					stack = append(stack, u)
				}
			}
		}
		p, q, r := b.v[b.tri[3*best]], b.v[b.tri[3*best+1]], b.v[b.tri[3*best+2]]
		cen := geom.Vec2{X: (p.X + q.X + r.X) / 3, Y: (p.Y + q.Y + r.Y) / 3}
		in := true
		for _, h := range hull {
			if robust.Orient2D(h[0], h[1], cen) < 0 {
				in = false
				break
			}
		}
		if in {
			in = false
			for _, rg := range rings {
				if rg.pts.Contains(cen) {
					in = true
					break
				}
			}
		}
		if in {
			for _, t := range region {
				keep[t] = true
			}
		}
	}
	return keep
}
